//! Molecules: reading SMILES, rings, aromaticity, elements and formulas, SMARTS matching,
//! lactim-lactam tautomers.

pub mod aromaticity;
pub mod canon;
pub mod components;
pub mod elements;
pub mod formula;
pub mod kekule;
pub mod molecule;
pub mod rings;
pub mod smarts;
pub mod smiles;
pub mod tautomer;
