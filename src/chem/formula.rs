//! Molecular formula (Hill order) and molar mass.
//!
//! The formula is written the way RDKit's `CalcMolFormula` prints it: carbon first, hydrogen
//! next, the rest alphabetical, and the net charge as a suffix (`C2H8N+`, `O4S-2`). With
//! carbon this is the Hill system; without carbon RDKit still puts hydrogen first (`HBr`,
//! `H3BO3`) where strict Hill order would give `BrH`, and phdose follows RDKit so that the two
//! agree. Isotope labels count as their element.
//! The molar mass sums standard atomic weights (`data/elements.csv`); a labelled atom such as
//! `[2H]` or `[13C]` weighs its isotope's mass (`data/isotopes.csv`), and an unlisted label falls
//! back to the standard weight.

use super::elements;
use super::molecule::Molecule;
use std::collections::BTreeMap;

/// Hydrogen's atomic number, also used for implicit and bracket hydrogens.
const HYDROGEN: u8 = 1;
const CARBON: u8 = 6;

/// The molecular formula of the whole molecule (all components), e.g. `C2H3NaO2`.
pub fn formula(mol: &Molecule) -> String {
    let mut counts: BTreeMap<String, usize> = BTreeMap::new();
    let mut dummies = 0;
    let mut hydrogens = 0;
    let mut carbons = 0;
    for atom in &mol.atoms {
        hydrogens += atom.hydrogens() as usize;
        match atom.element {
            0 => dummies += 1,
            HYDROGEN => hydrogens += 1,
            CARBON => carbons += 1,
            z => {
                let symbol = elements::by_number(z).map_or("?", |e| e.symbol.as_str());
                *counts.entry(symbol.to_string()).or_default() += 1;
            }
        }
    }
    let mut text = String::new();
    let mut push = |symbol: &str, n: usize| {
        if n > 0 {
            text.push_str(symbol);
            if n > 1 {
                text.push_str(&n.to_string());
            }
        }
    };
    push("C", carbons);
    push("H", hydrogens);
    for (symbol, n) in &counts {
        push(symbol, *n);
    }
    push("*", dummies);
    let charge = mol.charge();
    match charge {
        0 => {}
        1 => text.push('+'),
        -1 => text.push('-'),
        q if q > 0 => text.push_str(&format!("+{q}")),
        q => text.push_str(&format!("-{}", -q)),
    }
    text
}

/// Molar mass in g/mol of the whole molecule (all components); `*` atoms weigh nothing.
pub fn molar_mass(mol: &Molecule) -> f64 {
    let hydrogen = elements::atom_mass(HYDROGEN, None).unwrap_or(0.0);
    mol.atoms
        .iter()
        .map(|atom| {
            let own = elements::atom_mass(atom.element, atom.isotope).unwrap_or(0.0);
            own + atom.hydrogens() as f64 * hydrogen
        })
        .sum()
}

#[cfg(test)]
mod tests {
    use super::*;

    fn f(smiles: &str) -> String {
        formula(&Molecule::from_smiles(smiles).unwrap())
    }

    #[test]
    fn hill_order() {
        assert_eq!(f("CCO"), "C2H6O");
        assert_eq!(f("O"), "H2O");
        assert_eq!(f("OS(=O)(=O)O"), "H2O4S");
        assert_eq!(f("Br"), "HBr"); // no carbon: H still first, as RDKit prints it
        assert_eq!(f("ClCCl"), "CH2Cl2");
        assert_eq!(f("[Na+].[Cl-]"), "ClNa");
    }

    #[test]
    fn charge_suffix() {
        assert_eq!(f("CC[NH3+]"), "C2H8N+");
        assert_eq!(f("[O-]S(=O)(=O)[O-]"), "O4S-2");
        assert_eq!(f("[Fe+3]"), "Fe+3");
        assert_eq!(f("CC(=O)[O-].[Na+]"), "C2H3NaO2");
    }

    #[test]
    fn molar_mass_from_the_table() {
        // Water: 2 H + 1 O, recomputed here from the same table.
        let h = elements::by_symbol("H").unwrap().weight;
        let o = elements::by_symbol("O").unwrap().weight;
        let water = molar_mass(&Molecule::from_smiles("O").unwrap());
        assert!((water - (2.0 * h + o)).abs() < 1e-12);
        // Heavy water weighs two deuterium masses instead.
        let d = elements::isotope_mass(1, 2).unwrap();
        let heavy = molar_mass(&Molecule::from_smiles("[2H]O[2H]").unwrap());
        assert!((heavy - (2.0 * d + o)).abs() < 1e-12);
        assert_eq!(f("[2H]O[2H]"), "H2O");
    }
}
