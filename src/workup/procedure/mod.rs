//! `phdose check`: a written workup (a TOML file of our own format, see README.md) read,
//! simulated step by step through the two-layer equilibrium, and checked for the mistakes a
//! bench chemist makes: a reagent that runs out before the pH gets where the step wants it, a
//! layer kept or discarded that holds the product, a top/bottom mix-up with a dense solvent,
//! a back-extraction at a pH where the product is still ionized.

pub mod format;
pub mod model;
pub mod read;

pub use model::{Action, Procedure, Step, Which};
pub use read::read;
