//! Two liquid layers: how much of a compound goes into the organic layer.
//!
//! Only the neutral species crosses (design §3). Its octanol/water partition coefficient P comes
//! from a handbook value when one is stored ([`measured`]) and otherwise from the
//! Wildman–Crippen estimate ([`logp`]); [`solvents`] converts it to the solvent actually used;
//! [`distribution`] turns P and the neutral fraction into D, wash fractions and layer balances.

pub mod distribution;
pub mod logp;
pub mod measured;
pub mod solvents;
