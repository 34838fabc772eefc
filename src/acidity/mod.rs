//! Acidity: which atoms of a molecule gain or lose a proton in water, and their pKa values.

pub mod estimate;
pub mod group;
pub mod hammett;
pub mod handbook;
pub mod interplay;
pub mod lookup;
pub mod measured;
pub mod profile;
pub mod reading;
pub mod sites;
pub mod substituent;
pub mod taft;

pub use group::{Group, Kind};
pub use handbook::Handbook;
pub use profile::Profile;
pub use sites::{Site, find_sites, find_sites_in};
