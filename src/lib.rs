//! phdose: from structures (SMILES) to pKa values, aqueous equilibria and the reagent amounts
//! a bench chemist weighs for an acid-base workup or a buffer.
//!
//! Data flow (design §1): SMILES -> [`chem::molecule::Molecule`] -> sites from the group table in
//! the [`store`] -> [`equilibrium`] (charge balance, solve pH or reagent amount) -> [`report`].

pub mod acidity;
pub mod buffer;
pub mod chem;
pub mod cli;
pub mod equilibrium;
pub mod error;
pub mod partition;
pub mod report;
pub mod store;
pub mod units;
pub mod workup;

pub use error::{Error, ParseError, Result};
