//! Extraction solvents (`data/solvents.csv`): density (which layer is on top), mutual
//! solubility with water, and the conversion of an octanol/water logP to the solvent's own
//! partition coefficient.
//!
//! Where a Collander-type fit log P(solvent) = a·log P(octanol) + b is published (Leo, Hansch
//! and Elkins 1971), it is used, with one fit for hydrogen-bond donor solutes and one for the
//! rest; otherwise the octanol value stands in, and the result says so and carries a wider
//! range.

use std::sync::OnceLock;

use serde::Deserialize;

use crate::chem::molecule::Molecule;
use crate::error::{Error, Result};

/// The embedded solvent table.
pub const SOLVENTS_CSV: &str = include_str!("../../data/solvents.csv");

#[derive(Debug, Deserialize)]
struct Row {
    name: String,
    aliases: String,
    smiles: String,
    density_g_ml: f64,
    solvent_in_water_pct: f64,
    water_in_solvent_pct: f64,
    relation: String,
    donor_a: Option<f64>,
    donor_b: Option<f64>,
    acceptor_a: Option<f64>,
    acceptor_b: Option<f64>,
    log_uncertainty: f64,
    source: String,
}

/// A linear free-energy relation log P(solvent) = a·log P(octanol) + b.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Collander {
    pub a: f64,
    pub b: f64,
}

impl Collander {
    pub fn apply(&self, log_p_octanol: f64) -> f64 {
        self.a * log_p_octanol + self.b
    }
}

/// One extraction solvent.
#[derive(Debug, Clone, PartialEq)]
pub struct Solvent {
    pub name: String,
    /// Other names accepted on the command line (lower case).
    pub aliases: Vec<String>,
    pub smiles: String,
    /// g/mL at 20 °C.
    pub density_g_ml: f64,
    /// Solvent dissolved in the water layer, % w/w.
    pub solvent_in_water_pct: f64,
    /// Water dissolved in the solvent layer, % w/w.
    pub water_in_solvent_pct: f64,
    /// Fits for (hydrogen-bond donor solutes, other solutes); `None`: octanol stands in.
    pub relation: Option<(Collander, Collander)>,
    /// Spread to quote with a converted logP (log units).
    pub log_uncertainty: f64,
    pub source: String,
}

/// How a solvent partition coefficient was obtained.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Basis {
    /// From the solvent's published relation to octanol.
    Collander,
    /// The octanol value used as it is: no relation for this solvent.
    OctanolStandIn,
}

/// A logP converted to a solvent.
#[derive(Debug, Clone, PartialEq)]
pub struct SolventLogP {
    pub log_p: f64,
    /// ± this much (log units).
    pub uncertainty: f64,
    pub basis: Basis,
}

impl Solvent {
    /// Converts an octanol/water logP; `donor` selects the fit for solutes with O-H or N-H.
    pub fn log_p(&self, log_p_octanol: f64, donor: bool) -> SolventLogP {
        match &self.relation {
            Some((d, a)) => SolventLogP {
                log_p: if donor { d } else { a }.apply(log_p_octanol),
                uncertainty: self.log_uncertainty,
                basis: Basis::Collander,
            },
            None => SolventLogP {
                log_p: log_p_octanol,
                uncertainty: self.log_uncertainty,
                basis: Basis::OctanolStandIn,
            },
        }
    }

    /// Whether the solvent floats on an aqueous layer of the given density (g/mL; 0.997 for
    /// water at 25 °C, about 1.2 for saturated brine).
    pub fn on_top_of(&self, aqueous_density_g_ml: f64) -> bool {
        self.density_g_ml < aqueous_density_g_ml
    }
}

/// Whether a solute (the `atoms` of one parent of `mol`) counts as a hydrogen-bond donor for
/// the Collander fits: it has an O-H, N-H or S-H (Leo, Hansch and Elkins split their fits
/// between donors and the rest).
pub fn is_hydrogen_bond_donor(mol: &Molecule, atoms: &[usize]) -> bool {
    atoms.iter().any(|&i| {
        let a = &mol.atoms[i];
        matches!(a.element, 7 | 8 | 16) && a.hydrogens() > 0
    })
}

/// Every solvent of the table, in file order.
pub fn solvents() -> Result<&'static [Solvent]> {
    static TABLE: OnceLock<std::result::Result<Vec<Solvent>, String>> = OnceLock::new();
    TABLE
        .get_or_init(load)
        .as_deref()
        .map_err(|e| Error::Internal(format!("data/solvents.csv: {e}")))
}

fn load() -> std::result::Result<Vec<Solvent>, String> {
    let rows: Vec<Row> = csv::ReaderBuilder::new()
        .comment(Some(b'#'))
        .from_reader(SOLVENTS_CSV.as_bytes())
        .deserialize()
        .collect::<std::result::Result<_, _>>()
        .map_err(|e| e.to_string())?;
    rows.into_iter()
        .map(|r| {
            let relation = match r.relation.as_str() {
                "octanol" => None,
                "collander" => match (r.donor_a, r.donor_b, r.acceptor_a, r.acceptor_b) {
                    (Some(da), Some(db), Some(aa), Some(ab)) => {
                        Some((Collander { a: da, b: db }, Collander { a: aa, b: ab }))
                    }
                    _ => return Err(format!("{}: collander row without its fits", r.name)),
                },
                other => return Err(format!("{}: unknown relation `{other}`", r.name)),
            };
            Ok(Solvent {
                aliases: r
                    .aliases
                    .split(';')
                    .map(|s| s.trim().to_lowercase())
                    .filter(|s| !s.is_empty())
                    .collect(),
                name: r.name,
                smiles: r.smiles,
                density_g_ml: r.density_g_ml,
                solvent_in_water_pct: r.solvent_in_water_pct,
                water_in_solvent_pct: r.water_in_solvent_pct,
                relation,
                log_uncertainty: r.log_uncertainty,
                source: r.source,
            })
        })
        .collect()
}

/// Finds a solvent by name or alias (case and surrounding spaces ignored).
pub fn find(name: &str) -> Result<&'static Solvent> {
    let key = name.trim().to_lowercase();
    let table = solvents()?;
    table
        .iter()
        .find(|s| s.name == key || s.aliases.contains(&key))
        .ok_or_else(|| {
            let names: Vec<&str> = table.iter().map(|s| s.name.as_str()).collect();
            Error::Input(format!(
                "unknown solvent `{}`; known: {}",
                name.trim(),
                names.join(", ")
            ))
        })
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn table_loads_with_the_required_solvents() {
        for name in [
            "ethyl acetate",
            "diethyl ether",
            "mtbe",
            "dichloromethane",
            "chloroform",
            "toluene",
            "hexane",
            "heptane",
            "2-methyltetrahydrofuran",
            "1-butanol",
        ] {
            let s = find(name).unwrap();
            assert!(s.density_g_ml > 0.5 && s.density_g_ml < 2.0, "{name}");
            assert!(!s.source.is_empty());
        }
    }

    #[test]
    fn every_solvent_smiles_parses() {
        for s in solvents().unwrap() {
            Molecule::from_smiles(&s.smiles).unwrap_or_else(|e| panic!("{}: {e}", s.name));
        }
    }

    #[test]
    fn aliases_and_unknown_names() {
        assert_eq!(find(" DCM ").unwrap().name, "dichloromethane");
        assert_eq!(find("EtOAc").unwrap().name, "ethyl acetate");
        let err = find("unobtainium").unwrap_err().to_string();
        assert!(err.contains("unknown solvent") && err.contains("toluene"));
    }

    /// Halogenated solvents sink below water, the others float (common practice).
    #[test]
    fn which_layer_is_on_top() {
        let water = 0.997;
        assert!(!find("dcm").unwrap().on_top_of(water));
        assert!(!find("chloroform").unwrap().on_top_of(water));
        for name in ["ether", "etoac", "toluene", "heptane", "mtbe", "2-methf"] {
            assert!(find(name).unwrap().on_top_of(water), "{name}");
        }
    }

    /// The ether fit applied by hand: log P = 1.130·1.46 - 0.170 for phenol (a donor).
    #[test]
    fn collander_conversion_and_octanol_stand_in() {
        let ether = find("diethyl ether").unwrap();
        let phenol = ether.log_p(1.46, true);
        assert_eq!(phenol.basis, Basis::Collander);
        assert!((phenol.log_p - (1.130 * 1.46 - 0.170)).abs() < 1e-12);
        let acceptor = ether.log_p(1.46, false);
        assert!((acceptor.log_p - (1.142 * 1.46 - 1.070)).abs() < 1e-12);
        let etoac = find("ethyl acetate").unwrap().log_p(1.46, true);
        assert_eq!(etoac.basis, Basis::OctanolStandIn);
        assert_eq!(etoac.log_p, 1.46);
        assert!(etoac.uncertainty > phenol.uncertainty);
    }

    #[test]
    fn donors_have_o_h_or_n_h() {
        let m = |s: &str| Molecule::from_smiles(s).unwrap();
        let donor = |smiles: &str| {
            let mol = m(smiles);
            let all: Vec<usize> = (0..mol.atoms.len()).collect();
            is_hydrogen_bond_donor(&mol, &all)
        };
        assert!(donor("Oc1ccccc1"));
        assert!(donor("CC(N)=O"));
        assert!(!donor("CCN(CC)CC"));
        assert!(!donor("CC(C)=O"));
    }
}
