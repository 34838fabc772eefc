//! Components and salts: a dot-separated SMILES is split into the compound(s) that titrate and
//! the simple counter-ions that only add strong-acid or strong-base equivalents.
//!
//! `CCN(CC)CC.Cl` is triethylamine plus one equivalent of HCl; `CC(=O)[O-].[Na+]` is acetic
//! acid plus one equivalent of NaOH. A charged organic written in its ionized form is turned
//! back into its neutral parent (a protonated N loses its H, an O-/S-/N- anion gains one);
//! whatever charge the written whole still carries is balanced with chloride (positive) or
//! sodium (negative), so `CC[NH3+]` is ethylamine plus one equivalent of HCl. Charges that no
//! proton can remove (quaternary N, nitro groups) stay as the parent's permanent charge.

use std::sync::OnceLock;

use serde::Deserialize;

use super::formula::hill_formula_of;
use super::molecule::Molecule;
use crate::error::{Error, Result};

/// The embedded table of strong counter-ions (`data/counterions.csv`).
pub const COUNTERIONS_CSV: &str = include_str!("../../data/counterions.csv");

#[derive(Debug, Deserialize)]
struct CounterionRow {
    formula: String,
    cations: u32,
    anions: u32,
    name: String,
}

/// A counter-ion recognized in the input.
#[derive(Debug, Clone, PartialEq)]
pub struct Counterion {
    pub name: String,
    pub cations: u32,
    pub anions: u32,
}

/// One titrating component, as atom indices of the whole molecule.
#[derive(Debug, Clone, PartialEq)]
pub struct Parent {
    pub atoms: Vec<usize>,
    /// Charge no proton transfer removes (quaternary ammonium, ...).
    pub permanent_charge: i32,
}

/// A compound as the user wrote it, split for the charge balance.
#[derive(Debug, Clone)]
pub struct Compound {
    /// The neutralized molecule (same atom indices as written) that sites are found on.
    pub neutral: Molecule,
    pub parents: Vec<Parent>,
    pub counterions: Vec<Counterion>,
    /// Strong-cation equivalents (Na+, K+ ...) per formula unit, including the balancing ones.
    pub strong_cations: f64,
    /// Strong-anion equivalents (Cl-, ...) per formula unit, including the balancing ones.
    pub strong_anions: f64,
    /// Set when phdose added a counter-ion to balance a charged input.
    pub balanced_with: Option<String>,
}

/// The counter-ion table, read once per process (batch runs split every row).
fn counterion_table() -> Result<&'static [CounterionRow]> {
    static TABLE: OnceLock<std::result::Result<Vec<CounterionRow>, String>> = OnceLock::new();
    TABLE
        .get_or_init(|| {
            csv::ReaderBuilder::new()
                .comment(Some(b'#'))
                .from_reader(COUNTERIONS_CSV.as_bytes())
                .deserialize()
                .collect::<std::result::Result<_, _>>()
                .map_err(|e| e.to_string())
        })
        .as_deref()
        .map_err(|e| Error::Internal(format!("data/counterions.csv: {e}")))
}

impl Compound {
    /// The parent that stands for the compound (most atoms), e.g. the amine of an amine
    /// hydrochloride or the larger ion of an organic salt; `None` for counter-ions alone.
    pub fn main_parent(&self) -> Option<usize> {
        (0..self.parents.len()).max_by_key(|&i| self.parents[i].atoms.len())
    }
}

/// Most atoms other than hydrogen (`*` included) in one counter-ion of the table, read from
/// the Hill formulas once; `None` when a formula is not plain symbols and counts.
fn largest_counterion() -> Option<usize> {
    static LARGEST: OnceLock<Option<usize>> = OnceLock::new();
    *LARGEST.get_or_init(|| {
        let rows = counterion_table().ok()?;
        rows.iter()
            .map(|r| heavy_atoms_in(&r.formula))
            .try_fold(0, |most, n| Some(most.max(n?)))
    })
}

/// Atoms other than hydrogen in a Hill formula such as `ClHO4` or `C2H3O2`.
fn heavy_atoms_in(formula: &str) -> Option<usize> {
    let bytes = formula.as_bytes();
    let (mut i, mut heavy) = (0, 0);
    while i < bytes.len() {
        let start = i;
        match bytes[i] {
            b'A'..=b'Z' => {
                i += 1;
                while i < bytes.len() && bytes[i].is_ascii_lowercase() {
                    i += 1;
                }
            }
            b'*' => i += 1,
            _ => return None,
        }
        let symbol = &formula[start..i];
        let digits = i;
        while i < bytes.len() && bytes[i].is_ascii_digit() {
            i += 1;
        }
        let count = match &formula[digits..i] {
            "" => 1,
            n => n.parse().ok()?,
        };
        if symbol != "H" {
            heavy += count;
        }
    }
    Some(heavy)
}

/// Splits a parsed molecule into parents and counter-ions (see the module doc).
pub fn split(mol: &Molecule) -> Result<Compound> {
    let table = counterion_table()?;
    // A component with more heavy atoms than any counter-ion is none: its formula, the
    // costliest step here, is not worked out.
    let largest = largest_counterion();
    let mut neutral = mol.clone();
    let mut parents = Vec::new();
    let mut counterions = Vec::new();
    let (mut cations, mut anions) = (0u32, 0u32);
    for atoms in mol.components() {
        let heavy = atoms.iter().filter(|&&a| mol.atoms[a].element != 1).count();
        let row = if largest.is_some_and(|most| heavy > most) {
            None
        } else {
            let formula = hill_formula_of(mol, &atoms);
            table.iter().find(|r| r.formula == formula)
        };
        if let Some(row) = row {
            cations += row.cations;
            anions += row.anions;
            counterions.push(Counterion {
                name: row.name.clone(),
                cations: row.cations,
                anions: row.anions,
            });
            continue;
        }
        for &a in &atoms {
            neutralize_atom(&mut neutral, a);
        }
        let permanent_charge = atoms.iter().map(|&a| neutral.atoms[a].charge as i32).sum();
        parents.push(Parent {
            atoms,
            permanent_charge,
        });
    }
    // Hydroxypyridine-type spellings are read as the pyridones they are in water.
    super::tautomer::prefer_lactams(&mut neutral);
    // Strong ions, permanent charges and the written charge must balance; a written charge
    // left over means the user gave one ion of a salt, so its partner is supplied.
    let written = mol.charge();
    let mut balanced_with = None;
    if written > 0 {
        anions += written as u32;
        balanced_with = Some(format!("{written} equivalent(s) of chloride"));
    } else if written < 0 {
        cations += (-written) as u32;
        balanced_with = Some(format!("{} equivalent(s) of sodium", -written));
    }
    Ok(Compound {
        neutral,
        parents,
        counterions,
        strong_cations: cations as f64,
        strong_anions: anions as f64,
        balanced_with,
    })
}

/// Turns a protonated or deprotonated atom back into its neutral form, in place.
fn neutralize_atom(mol: &mut Molecule, a: usize) {
    let atom = &mol.atoms[a];
    let next_to_cation = mol.adjacency[a]
        .iter()
        .any(|&(n, _)| mol.atoms[n].charge > 0);
    let next_to_anion = mol.adjacency[a]
        .iter()
        .any(|&(n, _)| mol.atoms[n].charge < 0);
    match (atom.element, atom.charge) {
        // N+ or P+ carrying a proton (ammonium, pyridinium, iminium): give the proton back.
        (7 | 15, 1) if atom.hydrogens() > 0 && !next_to_anion => {
            let atom = &mut mol.atoms[a];
            if atom.explicit_hydrogens > 0 {
                atom.explicit_hydrogens -= 1;
            } else {
                atom.implicit_hydrogens -= 1;
            }
            atom.charge = 0;
        }
        // O-, S-, N- that are not half of a zwitterionic spelling (nitro, N-oxide, azide).
        (7 | 8 | 16, -1) if !next_to_cation => {
            let atom = &mut mol.atoms[a];
            atom.explicit_hydrogens += 1;
            atom.charge = 0;
        }
        _ => {}
    }
}

#[cfg(test)]
mod tests {
    #[test]
    fn counter_ion_sizes_are_read_from_their_formulas() {
        assert_eq!(super::heavy_atoms_in("ClHO4"), Some(5));
        assert_eq!(super::heavy_atoms_in("H2O4S"), Some(5));
        assert_eq!(super::heavy_atoms_in("C2H3O2"), Some(4));
        assert_eq!(super::heavy_atoms_in("Na"), Some(1));
        assert_eq!(super::heavy_atoms_in("HI"), Some(1));
        assert_eq!(super::heavy_atoms_in("C*2"), Some(3));
        assert_eq!(super::heavy_atoms_in("Na+"), None);
        // The table's largest counter-ions (perchloric acid, sulfate) have five heavy atoms.
        assert!(super::largest_counterion().is_some_and(|n| n >= 5));
    }
}
