//! phdose: from structures (SMILES) to pKa values, aqueous equilibria and the reagent amounts
//! a bench chemist weighs for an acid-base workup or a buffer.

pub mod chem;
pub mod equilibrium;
pub mod error;
pub mod units;

pub use error::{Error, ParseError, Result};
