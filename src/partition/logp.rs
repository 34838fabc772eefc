//! Octanol/water logP by Wildman–Crippen atom typing (S. A. Wildman and G. M. Crippen,
//! J. Chem. Inf. Comput. Sci. 1999, 39, 868-873): every atom, hydrogens included, takes the
//! first type in `data/crippen.csv` whose SMARTS matches it, and logP is the sum of the types'
//! contributions. Molar refractivity comes from the same typing.
//!
//! Hydrogens are folded into their heavy atom in a [`Molecule`], so a hydrogen is typed by the
//! table's `on_heavy_atom` test on the atom it sits on; every hydrogen of one atom gets the same
//! type. Hydrogens kept as atoms (isotope labels such as `[2H]`) are typed by the published
//! pattern directly.
//!
//! ```
//! use phdose::chem::molecule::Molecule;
//! use phdose::partition::logp::crippen_logp;
//! // Benzene: six C18 aromatic CH carbons (0.1581) and six H1 hydrogens (0.123).
//! let benzene = Molecule::from_smiles("c1ccccc1").unwrap();
//! let logp = crippen_logp(&benzene).unwrap();
//! assert!((logp - 6.0 * (0.1581 + 0.123)).abs() < 1e-9);
//! ```

use std::borrow::Cow;
use std::sync::OnceLock;

use serde::Deserialize;

use crate::chem::molecule::{Molecule, Order};
use crate::chem::smarts::{Pattern, Target};
use crate::error::{Error, Result};

/// The embedded atom-type table.
pub const CRIPPEN_CSV: &str = include_str!("../../data/crippen.csv");

#[derive(Debug, Deserialize)]
struct Row {
    #[serde(rename = "type")]
    kind: String,
    smarts: String,
    on_heavy_atom: String,
    logp: f64,
    mr: Option<f64>,
    #[allow(dead_code)]
    source: String,
}

/// One row of the table, compiled.
#[derive(Debug)]
pub struct AtomType {
    /// Type label (`C18`, `H1`, `N11`, ...); several rows may share one.
    pub label: String,
    /// The published pattern (for hydrogen types, with the hydrogen first).
    pub pattern: Pattern,
    /// For hydrogen types: the test rooted on the heavy atom the hydrogen sits on.
    pub on_heavy_atom: Option<Pattern>,
    pub logp: f64,
    pub mr: f64,
}

impl AtomType {
    fn is_hydrogen_type(&self) -> bool {
        self.on_heavy_atom.is_some()
    }
}

/// The compiled table, in file order.
pub fn atom_types() -> Result<&'static [AtomType]> {
    static TABLE: OnceLock<std::result::Result<Vec<AtomType>, String>> = OnceLock::new();
    TABLE
        .get_or_init(|| load(CRIPPEN_CSV).map_err(|e| e.to_string()))
        .as_deref()
        .map_err(|e| Error::Internal(format!("data/crippen.csv: {e}")))
}

fn load(text: &str) -> Result<Vec<AtomType>> {
    let rows: Vec<Row> = csv::ReaderBuilder::new()
        .comment(Some(b'#'))
        .from_reader(text.as_bytes())
        .deserialize()
        .collect::<std::result::Result<_, _>>()
        .map_err(|e| Error::Internal(e.to_string()))?;
    rows.into_iter()
        .map(|r| {
            let on_heavy_atom = if r.on_heavy_atom.is_empty() {
                None
            } else {
                Some(Pattern::parse(&r.on_heavy_atom)?)
            };
            Ok(AtomType {
                label: r.kind,
                pattern: Pattern::parse(&r.smarts)?,
                on_heavy_atom,
                logp: r.logp,
                mr: r.mr.unwrap_or(0.0),
            })
        })
        .collect()
}

/// The types found for one atom of a molecule.
#[derive(Debug, Clone, PartialEq)]
pub struct AtomContribution {
    /// Type of the atom itself (`None`: no row matches, contributes nothing).
    pub heavy: Option<usize>,
    /// Type shared by the hydrogens folded into the atom (`None` when it has none).
    pub hydrogen: Option<usize>,
    pub hydrogens: u8,
    /// logP of the atom plus its hydrogens.
    pub logp: f64,
    /// Molar refractivity of the atom plus its hydrogens (cm³/mol).
    pub mr: f64,
}

/// Types every atom (index = molecule atom index) and its hydrogens.
pub fn atom_contributions(mol: &Molecule) -> Result<Vec<AtomContribution>> {
    let table = atom_types()?;
    let mol = charge_separated(mol);
    let target = Target::new(&mol);
    let first = |atom: usize, hydrogen_rows: bool, rooted: bool| {
        table.iter().position(|t| {
            if t.is_hydrogen_type() != hydrogen_rows {
                return false;
            }
            let pattern = match (&t.on_heavy_atom, rooted) {
                (Some(p), true) => p,
                _ => &t.pattern,
            };
            pattern.is_match_at(&target, atom)
        })
    };
    let mut out = Vec::with_capacity(mol.atoms.len());
    for (i, atom) in mol.atoms.iter().enumerate() {
        // A hydrogen kept as an atom is typed by the published H patterns themselves.
        let heavy = first(i, atom.element == 1, false);
        let hydrogens = atom.hydrogens();
        let hydrogen = if hydrogens > 0 {
            first(i, true, true)
        } else {
            None
        };
        let value = |f: fn(&AtomType) -> f64| {
            heavy.map_or(0.0, |t| f(&table[t]))
                + hydrogen.map_or(0.0, |t| f(&table[t]) * hydrogens as f64)
        };
        out.push(AtomContribution {
            heavy,
            hydrogen,
            hydrogens,
            logp: value(|t| t.logp),
            mr: value(|t| t.mr),
        });
    }
    Ok(out)
}

/// Writes five-valent neutral nitrogen in its charge-separated Lewis form before typing:
/// `O=N(=O)c1ccccc1` is nitrobenzene `O=[N+]([O-])c1ccccc1`, `CN(C)(C)=O` an N-oxide and
/// `CN=N#N` an azide `CN=[N+]=[N-]`. The atom types were fitted on the charge-separated forms
/// (types N13, N14, O5), and RDKit's MolLogP applies the same correction when reading SMILES.
fn charge_separated(mol: &Molecule) -> Cow<'_, Molecule> {
    let mut out = Cow::Borrowed(mol);
    for n in 0..mol.atoms.len() {
        let atom = &mol.atoms[n];
        if atom.element != 7 || atom.charge != 0 || atom.aromatic || mol.valence(n) != 5 {
            continue;
        }
        // A terminal neutral O on a double bond (nitro, N-oxide), else a terminal N on a
        // triple bond (azide).
        let partner = mol.adjacency[n].iter().find_map(|&(nb, b)| {
            let (other, bond) = (&mol.atoms[nb], &mol.bonds[b]);
            let lone = other.charge == 0 && mol.degree(nb) == 1 && !bond.aromatic;
            match (other.element, bond.order) {
                (8, Order::Double) | (7, Order::Triple) if lone => Some((nb, b)),
                _ => None,
            }
        });
        if let Some((nb, b)) = partner {
            let m = out.to_mut();
            m.atoms[n].charge = 1;
            m.atoms[nb].charge = -1;
            m.bonds[b].order = match m.bonds[b].order {
                Order::Triple => Order::Double,
                _ => Order::Single,
            };
        }
    }
    out
}

/// Wildman–Crippen logP of the whole molecule as written (every component, charges as given).
pub fn crippen_logp(mol: &Molecule) -> Result<f64> {
    Ok(atom_contributions(mol)?.iter().map(|c| c.logp).sum())
}

/// Wildman–Crippen logP of some atoms of a molecule (one component), typed in the whole.
pub fn crippen_logp_of(mol: &Molecule, atoms: &[usize]) -> Result<f64> {
    let all = atom_contributions(mol)?;
    Ok(atoms
        .iter()
        .filter_map(|&a| all.get(a))
        .map(|c| c.logp)
        .sum())
}

/// Wildman–Crippen molar refractivity (cm³/mol) of the whole molecule.
pub fn crippen_mr(mol: &Molecule) -> Result<f64> {
    Ok(atom_contributions(mol)?.iter().map(|c| c.mr).sum())
}

#[cfg(test)]
mod tests {
    use super::*;

    fn logp(smiles: &str) -> f64 {
        crippen_logp(&Molecule::from_smiles(smiles).unwrap()).unwrap()
    }

    fn label(mol: &Molecule, atom: usize) -> (String, Option<String>) {
        let table = atom_types().unwrap();
        let c = &atom_contributions(mol).unwrap()[atom];
        (
            table[c.heavy.unwrap()].label.clone(),
            c.hydrogen.map(|h| table[h].label.clone()),
        )
    }

    #[test]
    fn table_loads_in_file_order() {
        let table = atom_types().unwrap();
        assert_eq!(table[0].label, "C1");
        assert!(table.iter().any(|t| t.label == "HS"));
        assert!(table.iter().filter(|t| t.is_hydrogen_type()).count() >= 9);
    }

    /// Ethanol by hand from the table: CH3 next to C is C1, CH2 next to O is C3, OH oxygen O2;
    /// five H1 on carbon and one alcohol H2.
    #[test]
    fn ethanol_by_hand() {
        let expected = 0.1441 - 0.2035 - 0.2893 + 5.0 * 0.123 - 0.2677;
        assert!((logp("CCO") - expected).abs() < 1e-9);
        let mol = Molecule::from_smiles("CCO").unwrap();
        assert_eq!(label(&mol, 2), ("O2".into(), Some("H2".into())));
    }

    /// Acid H (H4 on O next to C=O), amine H (H3), water's H (H2 through the other H), H-Cl (H2).
    #[test]
    fn polar_hydrogen_types() {
        let acid = Molecule::from_smiles("CC(=O)O").unwrap();
        assert_eq!(label(&acid, 3).1.as_deref(), Some("H4"));
        let amine = Molecule::from_smiles("CN").unwrap();
        assert_eq!(label(&amine, 1), ("N1".into(), Some("H3".into())));
        let water = Molecule::from_smiles("O").unwrap();
        assert_eq!(label(&water, 0), ("O2".into(), Some("H2".into())));
        // The aromatic N-H is an N-H (H3), not the "other" H2 (see data/crippen.csv).
        let pyrrole = Molecule::from_smiles("c1cc[nH]c1").unwrap();
        assert_eq!(label(&pyrrole, 3), ("N11".into(), Some("H3".into())));
        let hcl = Molecule::from_smiles("Cl").unwrap();
        assert_eq!(label(&hcl, 0), ("Cl".into(), Some("H2".into())));
    }

    #[test]
    fn charged_atoms_take_their_ionic_types() {
        let acetate = Molecule::from_smiles("CC(=O)[O-]").unwrap();
        assert_eq!(label(&acetate, 3).0, "O12");
        let chloride = Molecule::from_smiles("[Cl-]").unwrap();
        assert_eq!(label(&chloride, 0).0, "Hal");
        let ammonium = Molecule::from_smiles("C[NH3+]").unwrap();
        assert_eq!(label(&ammonium, 1), ("N10".into(), Some("H3".into())));
    }

    /// Nitrobenzene spelled with five-valent N is typed as the charge-separated form.
    #[test]
    fn pentavalent_nitro_is_charge_separated() {
        assert!((logp("O=N(=O)c1ccccc1") - logp("O=[N+]([O-])c1ccccc1")).abs() < 1e-12);
        assert!((logp("CN=N#N") - logp("CN=[N+]=[N-]")).abs() < 1e-12);
    }

    #[test]
    fn component_sum_equals_whole_for_a_single_component() {
        let mol = Molecule::from_smiles("CC(=O)[O-].[Na+]").unwrap();
        let whole = crippen_logp(&mol).unwrap();
        let parts =
            crippen_logp_of(&mol, &[0, 1, 2, 3]).unwrap() + crippen_logp_of(&mol, &[4]).unwrap();
        assert!((whole - parts).abs() < 1e-12);
    }
}
