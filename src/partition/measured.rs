//! Octanol/water logP for a compound: a handbook value from `data/logp_measured.csv` when the
//! structure is there, the Wildman–Crippen estimate otherwise (or with `estimate_only`). The
//! result says which, as pKa values do.
//!
//! Structures are matched by [`lookup_key`], computed the same way for the table's SMILES and
//! for the user's compound, so any spelling of a listed compound finds its row.

use std::collections::HashMap;
use std::sync::OnceLock;

use serde::Deserialize;

use super::logp::crippen_logp_of;
use crate::chem::components::split;
use crate::chem::molecule::Molecule;
use crate::error::{Error, Result};

/// The embedded handbook table.
pub const LOGP_MEASURED_CSV: &str = include_str!("../../data/logp_measured.csv");

/// What `logp_source` says for an estimate.
pub const ESTIMATE_SOURCE: &str =
    "estimate: Wildman-Crippen atom contributions (J. Chem. Inf. Comput. Sci. 1999, 39, 868)";

#[derive(Debug, Deserialize)]
struct Row {
    name: String,
    smiles: String,
    logp: f64,
    source: String,
}

/// One handbook value.
#[derive(Debug, Clone, PartialEq)]
pub struct MeasuredLogP {
    pub name: String,
    pub log_p: f64,
    pub source: String,
}

/// An octanol/water logP with where it came from.
#[derive(Debug, Clone, PartialEq)]
pub struct OctanolLogP {
    pub log_p: f64,
    /// `measured: <handbook>` or the estimate's method ([`ESTIMATE_SOURCE`]).
    pub source: String,
    pub measured: bool,
}

/// The structure key a compound is looked up by: the canonical key of one parent (`atoms`) of
/// `mol`, the same key the measured pKa values use.
pub fn lookup_key(mol: &Molecule, atoms: &[usize]) -> String {
    crate::chem::canon::fragment_key(mol, atoms)
}

/// The handbook table keyed by structure.
fn table() -> Result<&'static HashMap<String, MeasuredLogP>> {
    static TABLE: OnceLock<std::result::Result<HashMap<String, MeasuredLogP>, String>> =
        OnceLock::new();
    TABLE
        .get_or_init(load)
        .as_ref()
        .map_err(|e| Error::Internal(format!("data/logp_measured.csv: {e}")))
}

fn load() -> std::result::Result<HashMap<String, MeasuredLogP>, String> {
    let rows: Vec<Row> = csv::ReaderBuilder::new()
        .comment(Some(b'#'))
        .from_reader(LOGP_MEASURED_CSV.as_bytes())
        .deserialize()
        .collect::<std::result::Result<_, _>>()
        .map_err(|e| e.to_string())?;
    let mut out = HashMap::new();
    for r in rows {
        let mol = Molecule::from_smiles(&r.smiles).map_err(|e| format!("{}: {e}", r.name))?;
        let compound = split(&mol).map_err(|e| format!("{}: {e}", r.name))?;
        let [parent] = compound.parents.as_slice() else {
            return Err(format!("{}: not a single compound", r.name));
        };
        let key = lookup_key(&compound.neutral, &parent.atoms);
        let value = MeasuredLogP {
            name: r.name.clone(),
            log_p: r.logp,
            source: r.source,
        };
        if let Some(old) = out.insert(key, value) {
            return Err(format!("{} and {} share a structure", old.name, r.name));
        }
    }
    Ok(out)
}

/// The handbook value for one parent of a (neutralized) molecule, if listed.
pub fn measured(mol: &Molecule, atoms: &[usize]) -> Result<Option<&'static MeasuredLogP>> {
    Ok(table()?.get(&lookup_key(mol, atoms)))
}

/// logP of one parent: the handbook value unless `estimate_only` or unlisted, else the
/// Wildman–Crippen estimate. `mol` is the neutral form ([`split`]'s `neutral`), since logP
/// belongs to the neutral species.
pub fn octanol_log_p(mol: &Molecule, atoms: &[usize], estimate_only: bool) -> Result<OctanolLogP> {
    if !estimate_only && let Some(m) = measured(mol, atoms)? {
        return Ok(OctanolLogP {
            log_p: m.log_p,
            source: format!("measured: {}", m.source),
            measured: true,
        });
    }
    Ok(OctanolLogP {
        log_p: crippen_logp_of(mol, atoms)?,
        source: ESTIMATE_SOURCE.to_string(),
        measured: false,
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    fn parent_log_p(smiles: &str, estimate_only: bool) -> OctanolLogP {
        let compound = split(&Molecule::from_smiles(smiles).unwrap()).unwrap();
        octanol_log_p(&compound.neutral, &compound.parents[0].atoms, estimate_only).unwrap()
    }

    #[test]
    fn table_loads_with_distinct_structures() {
        assert!(table().unwrap().len() >= 40);
    }

    /// Phenol 1.46 (Hansch, Leo & Hoekman 1995, from memory), whichever way it is written.
    #[test]
    fn handbook_value_wins_for_any_spelling() {
        for smiles in [
            "Oc1ccccc1",
            "C1=CC=CC=C1O",
            "[O-]c1ccccc1.[Na+]",
            "c1cc(O)ccc1",
        ] {
            let p = parent_log_p(smiles, false);
            assert!(p.measured, "{smiles}");
            assert_eq!(p.log_p, 1.46);
            assert!(p.source.starts_with("measured: Hansch"));
        }
    }

    #[test]
    fn estimate_only_and_unlisted_compounds_use_the_estimate() {
        let p = parent_log_p("Oc1ccccc1", true);
        assert!(!p.measured);
        assert_eq!(p.source, ESTIMATE_SOURCE);
        let mol = Molecule::from_smiles("Oc1ccccc1").unwrap();
        assert!((p.log_p - super::super::logp::crippen_logp(&mol).unwrap()).abs() < 1e-12);
        assert!(!parent_log_p("CCCCCCCCCCO", false).measured);
    }

    /// Isomers in the table keep their own values: p-cresol is listed, o-cresol is not;
    /// 1-propanol and 2-propanol differ.
    #[test]
    fn isomers_are_told_apart() {
        assert_eq!(parent_log_p("Cc1ccc(O)cc1", false).log_p, 1.94);
        assert!(!parent_log_p("Cc1ccccc1O", false).measured);
        assert_eq!(parent_log_p("OCCC", false).log_p, 0.25);
        assert_eq!(parent_log_p("CC(O)C", false).log_p, 0.05);
    }

    /// A salt is looked up as its neutral parent: triethylamine hydrochloride -> 1.45.
    #[test]
    fn salts_use_the_neutral_parent() {
        let p = parent_log_p("CC[NH+](CC)CC.[Cl-]", false);
        assert!(p.measured);
        assert_eq!(p.log_p, 1.45);
    }
}

#[cfg(test)]
mod sanity {
    use super::*;
    use crate::partition::logp::crippen_logp;

    /// A slip in a recalled value or a wrong SMILES shows as a large gap to the estimate;
    /// Wildman and Crippen (1999) report a standard error near 0.7 for their method, so a
    /// handbook row more than 1.5 log units from it is suspect.
    #[test]
    fn handbook_rows_agree_roughly_with_the_estimate() {
        let mut far = Vec::new();
        for row in csv::ReaderBuilder::new()
            .comment(Some(b'#'))
            .from_reader(LOGP_MEASURED_CSV.as_bytes())
            .deserialize::<Row>()
        {
            let row = row.unwrap();
            let estimate = crippen_logp(&Molecule::from_smiles(&row.smiles).unwrap()).unwrap();
            if (row.logp - estimate).abs() > 1.5 {
                far.push(format!(
                    "{}: measured {}, estimate {estimate:.2}",
                    row.name, row.logp
                ));
            }
        }
        assert!(far.is_empty(), "{}", far.join("\n"));
    }
}
