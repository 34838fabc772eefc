//! Kekulization: turning an aromatic spelling (`c1ccccc1`, `:` bonds) into single and double
//! bonds.
//!
//! First decide which aromatic atoms need a double bond: an atom does when its default valence
//! (shifted by its charge, e.g. N+ like C) leaves room for one more bond after its written bonds
//! and hydrogens. `[nH]`, `o`, `s`, `[cH-]` have no room and keep their lone pair; `c`, `n`,
//! `[n+]`, `[o+]` have room. Then pair those atoms up along aromatic bonds: a perfect matching.
//! Fused 5/7 systems are not bipartite, so the matching is a backtracking search that always
//! extends the atom with the fewest choices left, which settles ordinary molecules at once.

use super::elements;
use super::molecule::{Molecule, Order};
use crate::error::ParseError;

/// Steps the matching search may take before giving up; ordinary molecules need a few hundred.
const SEARCH_BUDGET: usize = 200_000;

/// Replaces written-aromatic bonds (`Bond::aromatic` set by the reader) by a Kekulé assignment
/// and clears the written aromatic flags. `organic[i]` tells whether atom `i` was written
/// without brackets (its hydrogens are not known yet). Rings must already be perceived.
pub fn kekulize(mol: &mut Molecule, organic: &[bool], text: &str) -> Result<(), ParseError> {
    let fail = |atom: usize, why: &str| {
        let message = format!("cannot kekulize: {why}");
        ParseError::new("SMILES", text, mol.atoms[atom].position, message)
    };
    // Aromatic bonds outside rings (the link in biphenyl written `c1ccccc1c1ccccc1`) are single.
    for b in 0..mol.bonds.len() {
        if mol.bonds[b].aromatic && !mol.bond_in_ring(b) {
            mol.bonds[b].aromatic = false;
        }
    }
    for i in 0..mol.atoms.len() {
        if mol.atoms[i].aromatic && !mol.adjacency[i].iter().any(|&(_, b)| mol.bonds[b].aromatic) {
            return Err(fail(i, "aromatic atom outside a ring"));
        }
    }
    let need: Vec<bool> = (0..mol.atoms.len())
        .map(|i| mol.atoms[i].aromatic && needs_double_bond(mol, organic, i))
        .collect();
    let mut mate: Vec<Option<usize>> = vec![None; mol.atoms.len()];
    // Each aromatic system is matched on its own, so that a dead end in one never makes the
    // search retry the choices of another.
    for system in systems(mol, &need) {
        if system.len() % 2 == 1 {
            let atom = *system.last().unwrap_or(&0);
            return Err(fail(atom, "odd number of atoms need a double bond"));
        }
        let mut local = vec![false; need.len()];
        for &a in &system {
            local[a] = true;
        }
        let mut search = Search {
            mol,
            need: &local,
            budget: SEARCH_BUDGET,
            stuck: None,
        };
        match search.extend(&mut mate) {
            Some(true) => {}
            Some(false) => {
                let atom = search.stuck.unwrap_or(system[0]);
                return Err(fail(atom, "no double bond can be placed at this atom"));
            }
            None => {
                return Err(fail(
                    system[0],
                    "the aromatic system is too large to resolve",
                ));
            }
        }
    }
    for bond in mol.bonds.iter_mut() {
        bond.aromatic = false;
    }
    for (i, m) in mate.iter().enumerate() {
        if let Some(b) = *m {
            debug_assert!(mol.bonds[b].a == i || mol.bonds[b].b == i);
            mol.bonds[b].order = Order::Double;
        }
    }
    for atom in mol.atoms.iter_mut() {
        atom.aromatic = false;
    }
    Ok(())
}

/// Re-places the double bonds of perceived aromatic systems by the same deterministic search,
/// so that the Kekulé form depends only on the structure and atom order, not on how the
/// SMILES spelled the double bonds (`C1=CC=CC=C1O` and `c1ccccc1O` end identical).
pub fn normalize(mol: &mut Molecule) {
    let need: Vec<bool> = (0..mol.atoms.len())
        .map(|i| {
            mol.adjacency[i]
                .iter()
                .any(|&(_, b)| mol.bonds[b].aromatic && mol.bonds[b].order == Order::Double)
        })
        .collect();
    // The current assignment proves a matching exists; if the search still gives up, the
    // written one is kept.
    place_double_bonds(mol, &need);
}

/// Places the double bonds of the perceived aromatic bonds anew so that exactly the atoms of
/// `need` carry one, by the deterministic search of `normalize`. Returns false, leaving `mol`
/// unchanged, when no such placement is found.
pub fn place_double_bonds(mol: &mut Molecule, need: &[bool]) -> bool {
    let mut mate: Vec<Option<usize>> = vec![None; mol.atoms.len()];
    let mut search = Search {
        mol,
        need,
        budget: SEARCH_BUDGET,
        stuck: None,
    };
    if search.extend(&mut mate) != Some(true) {
        return false;
    }
    for bond in mol.bonds.iter_mut() {
        if bond.aromatic && bond.order == Order::Double {
            bond.order = Order::Single;
        }
    }
    for m in mate.iter().flatten() {
        mol.bonds[*m].order = Order::Double;
    }
    true
}

/// Atoms that need a double bond, grouped by connection through written-aromatic bonds.
fn systems(mol: &Molecule, need: &[bool]) -> Vec<Vec<usize>> {
    let mut seen = vec![false; need.len()];
    let mut out = Vec::new();
    for start in (0..need.len()).filter(|&i| need[i]) {
        if seen[start] {
            continue;
        }
        seen[start] = true;
        let mut system = vec![start];
        let mut k = 0;
        while k < system.len() {
            for &(nb, b) in &mol.adjacency[system[k]] {
                if need[nb] && !seen[nb] && mol.bonds[b].aromatic {
                    seen[nb] = true;
                    system.push(nb);
                }
            }
            k += 1;
        }
        out.push(system);
    }
    out
}

/// Whether aromatic atom `i` must take one double bond in the Kekulé form.
fn needs_double_bond(mol: &Molecule, organic: &[bool], i: usize) -> bool {
    let atom = &mol.atoms[i];
    // Written aromatic bonds count as single here; the double bond is what we are placing.
    let bonds: usize = mol.adjacency[i]
        .iter()
        .map(|&(_, b)| {
            let bond = &mol.bonds[b];
            if bond.aromatic {
                1
            } else {
                bond.order.value() as usize
            }
        })
        .sum();
    let valence = bonds + atom.explicit_hydrogens as usize;
    let valences = if organic[i] {
        elements::by_number(atom.element).map_or(&[][..], |e| e.valences.as_slice())
    } else {
        elements::valences_with_charge(atom.element, atom.charge)
    };
    valences
        .iter()
        .find(|&&v| v as usize >= valence)
        .is_some_and(|&v| v as usize > valence)
}

/// Backtracking perfect matching over written-aromatic bonds between atoms that need one.
struct Search<'a> {
    mol: &'a Molecule,
    need: &'a [bool],
    budget: usize,
    /// An atom left with no partner at the first dead end, for the error message.
    stuck: Option<usize>,
}

impl Search<'_> {
    /// Bonds by which unmatched atom `i` could still be matched.
    fn options(&self, mate: &[Option<usize>], i: usize) -> Vec<(usize, usize)> {
        self.mol.adjacency[i]
            .iter()
            .filter(|&&(nb, b)| self.mol.bonds[b].aromatic && self.need[nb] && mate[nb].is_none())
            .copied()
            .collect()
    }

    /// `Some(true)` when every needing atom is matched, `Some(false)` when impossible, `None`
    /// when the budget ran out.
    fn extend(&mut self, mate: &mut [Option<usize>]) -> Option<bool> {
        if self.budget == 0 {
            return None;
        }
        self.budget -= 1;
        let mut best: Option<(usize, Vec<(usize, usize)>)> = None;
        for i in 0..mate.len() {
            if !self.need[i] || mate[i].is_some() {
                continue;
            }
            let options = self.options(mate, i);
            if best.as_ref().is_none_or(|(_, o)| options.len() < o.len()) {
                let done = options.is_empty();
                best = Some((i, options));
                if done {
                    break;
                }
            }
        }
        let Some((atom, options)) = best else {
            return Some(true);
        };
        if options.is_empty() {
            self.stuck.get_or_insert(atom);
            return Some(false);
        }
        for (nb, b) in options {
            mate[atom] = Some(b);
            mate[nb] = Some(b);
            match self.extend(mate) {
                Some(false) => {}
                other => return other,
            }
            mate[atom] = None;
            mate[nb] = None;
        }
        Some(false)
    }
}

#[cfg(test)]
mod tests {
    use crate::chem::molecule::{Molecule, Order};

    fn doubles(smiles: &str) -> usize {
        let mol = Molecule::from_smiles(smiles).unwrap();
        mol.bonds
            .iter()
            .filter(|b| b.order == Order::Double)
            .count()
    }

    #[test]
    fn aromatic_spellings_get_alternating_bonds() {
        assert_eq!(doubles("c1ccccc1"), 3);
        assert_eq!(doubles("c1ccc2ccccc2c1"), 5); // naphthalene
        assert_eq!(doubles("c1ccc2cccc2cc1"), 5); // azulene: not bipartite
        assert_eq!(doubles("c1cc[nH]c1"), 2); // pyrrole
        assert_eq!(doubles("c1ccoc1"), 2); // furan
        assert_eq!(doubles("O=c1cccc[nH]1"), 3); // 2-pyridone: C=O plus two ring bonds
        assert_eq!(doubles("[cH-]1cccc1"), 2); // cyclopentadienide
        assert_eq!(doubles("[cH+]1cccccc1"), 3); // tropylium
        assert_eq!(doubles("C[n+]1ccccc1"), 3); // N-methylpyridinium
        assert_eq!(doubles("c1ccccc1-c1ccccc1"), 6); // biphenyl link stays single
        assert_eq!(doubles("c1ccccc1c1ccccc1"), 6);
    }

    #[test]
    fn every_atom_keeps_a_sensible_valence() {
        // Kekulé form: each carbon of pyrene ends with valence 4.
        let mol = Molecule::from_smiles("c1cc2ccc3cccc4ccc(c1)c2c34").unwrap();
        for i in 0..mol.atoms.len() {
            assert_eq!(mol.valence(i), 4, "atom {i}");
        }
    }

    #[test]
    fn impossible_spellings_fail_at_an_atom() {
        for bad in ["c1cccc1", "c1ccnc1", "c1ccccc1c", "Cc"] {
            let err = Molecule::from_smiles(bad).unwrap_err();
            assert!(
                err.message.contains("cannot kekulize"),
                "{bad}: {}",
                err.message
            );
            assert!(err.position < bad.len());
        }
    }
}
