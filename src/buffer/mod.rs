//! Buffer recipes (`phdose buffer`): a buffer system from the built-in tables
//! (`data/buffers.csv`, `data/buffer_forms.csv`) or from a SMILES, and three ways to make it at
//! a target pH, total concentration, volume and temperature — weigh two forms, titrate one
//! form, or mix two stocks — each solved with the exact equilibrium engine.

pub mod from_smiles;
pub mod mixture;
pub mod pair;
pub mod recipe;
pub mod stocks;
pub mod system;
pub mod titrate;

pub use from_smiles::system_from_smiles;
pub use mixture::{Mixture, capacity};
pub use recipe::{Component, Method, Recipe, Request, StockPrep, make};
pub use system::{BufferForm, BufferSystem};
