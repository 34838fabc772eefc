//! Molecular formula (Hill order) and molar mass.
//!
//! The formula follows the Hill system: carbon first, hydrogen next, the rest alphabetical;
//! without carbon every element alphabetically, hydrogen included (`BrH`, `BH3O3`), and the net
//! charge as a suffix (`C2H8N+`, `O4S-2`). RDKit's `CalcMolFormula` agrees with carbon and puts
//! hydrogen first without it (`HBr`); the tests allow for exactly that difference. Isotope
//! labels count as their element.
//! The molar mass sums standard atomic weights (`data/elements.csv`); a labelled atom such as
//! `[2H]` or `[13C]` weighs its isotope's mass (`data/isotopes.csv`), and an unlisted label falls
//! back to the standard weight.

use super::elements;
use super::molecule::Molecule;
use std::collections::BTreeMap;

/// Hydrogen's atomic number, also used for implicit and bracket hydrogens.
const HYDROGEN: u8 = 1;

/// The molecular formula of the whole molecule (all components) in Hill order with the net
/// charge as a suffix, e.g. `C2H3NaO2`, `C2H8N+`, `O4S-2`.
pub fn formula(mol: &Molecule) -> String {
    let all: Vec<usize> = (0..mol.atoms.len()).collect();
    let mut text = hill_formula_of(mol, &all);
    match mol.charge() {
        0 => {}
        1 => text.push('+'),
        -1 => text.push('-'),
        q if q > 0 => text.push_str(&format!("+{q}")),
        q => text.push_str(&format!("-{}", -q)),
    }
    text
}

/// The Hill formula of some atoms of `mol` (one component, say), without charge: carbon
/// first and hydrogen next when carbon is present, otherwise every element alphabetically
/// (hydrochloric acid is `ClH`).
pub fn hill_formula_of(mol: &Molecule, atoms: &[usize]) -> String {
    let mut counts: BTreeMap<String, usize> = BTreeMap::new();
    let mut dummies = 0;
    for &a in atoms {
        let atom = &mol.atoms[a];
        *counts.entry("H".to_string()).or_default() += atom.hydrogens() as usize;
        match atom.element {
            0 => dummies += 1,
            z => {
                let symbol = elements::by_number(z).map_or("?", |e| e.symbol.as_str());
                *counts.entry(symbol.to_string()).or_default() += 1;
            }
        }
    }
    counts.retain(|_, n| *n > 0);
    let mut text = String::new();
    let mut push = |symbol: &str, n: usize| {
        text.push_str(symbol);
        if n > 1 {
            text.push_str(&n.to_string());
        }
    };
    let carbon = counts.remove("C");
    if let Some(c) = carbon {
        push("C", c);
        if let Some(h) = counts.remove("H") {
            push("H", h);
        }
    }
    for (symbol, n) in &counts {
        push(symbol, *n);
    }
    if dummies > 0 {
        push("*", dummies);
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
        assert_eq!(f("Br"), "BrH"); // no carbon: strictly alphabetical (RDKit prints HBr)
        assert_eq!(f("OB(O)O"), "BH3O3");
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
