//! Acidity: which atoms of a molecule gain or lose a proton in water, and their pKa values.

pub mod group;
pub mod handbook;
pub mod interplay;
pub mod profile;
pub mod sites;

pub use group::{Group, Kind};
pub use handbook::Handbook;
pub use profile::Profile;
pub use sites::{Site, find_sites};
