//! The handbook phdose consults for pKa values: the group table (estimates) today, with room
//! for substituent constants and measured values. Loaded once per run from the store, so batch
//! work compiles every SMARTS pattern once.

use super::estimate::Estimator;
use super::group::Group;
use crate::error::Result;
use crate::store::Store;

/// Everything a pKa estimate or lookup needs.
#[derive(Debug, Clone)]
pub struct Handbook {
    /// Group rows in priority order.
    pub groups: Vec<Group>,
    /// Substituent constants and series, compiled once, that correct the group values.
    pub estimator: Estimator,
    /// Skip stored measured values and use the estimates alone (`--estimate-only`).
    pub estimate_only: bool,
}

impl Handbook {
    /// Loads the tables from an open store.
    pub fn from_store(store: &Store, estimate_only: bool) -> Result<Handbook> {
        let mut groups = store.groups()?;
        let links = store.group_series()?;
        for g in &mut groups {
            if let Some((series, parent)) = links.get(&g.name) {
                g.series = series.clone();
                g.parent = parent.clone();
            }
        }
        let estimator = Estimator::new(store.substituents()?, store.series()?, &groups)?;
        Ok(Handbook {
            groups,
            estimator,
            estimate_only,
        })
    }

    /// The built-in tables only, from a fresh in-memory store (tests, one-off use).
    pub fn builtin() -> Result<Handbook> {
        Handbook::from_store(&Store::in_memory()?, false)
    }
}
