//! Aromaticity perception on the Kekulé form, after RDKit's default model for ordinary organic
//! molecules.
//!
//! Each ring atom offers a number of pi electrons: one for a double bond inside a ring, none for
//! a double bond leaving the ring to N, O or S (the carbonyl of 2-pyridone or uracil), two for a
//! lone pair (pyrrole N, furan O, thiophene S, a carbanion), none for a carbocation's empty
//! orbital; an sp3 atom offers none at all and breaks the ring. A ring with 4n+2 electrons is
//! aromatic (Hückel); so is a fused system of rings sharing bonds whose atoms together hold
//! 4n+2 (azulene), in which case the bonds inside the envelope become aromatic but the shared
//! bonds stay as they are, as RDKit does.

use super::elements;
use super::molecule::{Molecule, Order};

/// Rings in one fused system beyond which only small subsets are tried (2^12 subsets at most).
const MAX_SUBSET_RINGS: usize = 12;

/// Sets `Atom::aromatic` and `Bond::aromatic` from the Kekulé bond orders and the SSSR.
pub fn perceive(mol: &mut Molecule) {
    for atom in mol.atoms.iter_mut() {
        atom.aromatic = false;
    }
    for bond in mol.bonds.iter_mut() {
        bond.aromatic = false;
    }
    let offer: Vec<Option<u32>> = (0..mol.atoms.len()).map(|i| pi_electrons(mol, i)).collect();
    let rings: Vec<usize> = (0..mol.rings.rings.len())
        .filter(|&r| mol.rings.rings[r].iter().all(|&a| offer[a].is_some()))
        .collect();

    let mut aromatic_ring = vec![false; mol.rings.rings.len()];
    for &r in &rings {
        let total: u32 = mol.rings.rings[r]
            .iter()
            .map(|&a| offer[a].unwrap_or(0))
            .sum();
        if huckel(total) {
            aromatic_ring[r] = true;
            mark(mol, &[r], false);
        }
    }
    for system in fused_systems(mol, &rings) {
        for subset in connected_subsets(mol, &system) {
            if subset.iter().all(|&r| aromatic_ring[r]) {
                continue;
            }
            let mut atoms: Vec<usize> = subset
                .iter()
                .flat_map(|&r| mol.rings.rings[r].iter().copied())
                .collect();
            atoms.sort_unstable();
            atoms.dedup();
            let total: u32 = atoms.iter().map(|&a| offer[a].unwrap_or(0)).sum();
            if huckel(total) {
                mark(mol, &subset, true);
            }
        }
    }
}

/// 4n+2 with n >= 0.
fn huckel(electrons: u32) -> bool {
    electrons >= 2 && (electrons - 2).is_multiple_of(4)
}

/// Pi electrons atom `i` offers to a ring, or `None` when it cannot be part of an aromatic ring.
fn pi_electrons(mol: &Molecule, i: usize) -> Option<u32> {
    let atom = &mol.atoms[i];
    // Elements that take part in aromatic rings of ordinary organic molecules (common practice:
    // B, C, N, O, P, S, As, Se, Te, as in RDKit's default model).
    const AROMATIC_ELEMENTS: [u8; 9] = [5, 6, 7, 8, 15, 16, 33, 34, 52];
    if !AROMATIC_ELEMENTS.contains(&atom.element) || mol.ring_connectivity(i) < 2 {
        return None;
    }
    if mol.connectivity(i) > 3 {
        return None; // sp3 (or hypervalent) centre
    }
    // A radical (valence below the charge-adjusted default, e.g. a nitrenium `[N+]` with two
    // bonds) is left out, as RDKit does.
    let defaults = elements::valences_with_charge(atom.element, atom.charge);
    if defaults
        .first()
        .is_some_and(|&v| mol.valence(i) < v as usize)
    {
        return None;
    }
    let multiple: Vec<usize> = mol.adjacency[i]
        .iter()
        .map(|&(_, b)| b)
        .filter(|&b| mol.bonds[b].order != Order::Single)
        .collect();
    match multiple.as_slice() {
        [] => lone_pair_electrons(mol, i),
        [b] if mol.bonds[*b].order == Order::Double => {
            if mol.bond_in_ring(*b) {
                return Some(1);
            }
            // An exocyclic double bond to a more electronegative atom takes the electron away
            // (RDKit's rule). N, O and S are the partners more electronegative than C on the
            // Pauling scale (from memory); the rule is checked by tests/aromaticity.rs.
            const PULLING: [u8; 3] = [7, 8, 16];
            let partner = mol.atoms[mol.bonds[*b].other(i)].element;
            if PULLING.contains(&partner) && partner != atom.element {
                Some(0)
            } else {
                Some(1)
            }
        }
        _ => None,
    }
}

/// Electrons of a ring atom with only single bonds: a lone pair gives two, an empty orbital none.
fn lone_pair_electrons(mol: &Molecule, i: usize) -> Option<u32> {
    let atom = &mol.atoms[i];
    let valence = mol.valence(i);
    match (atom.element, atom.charge, valence) {
        (6, -1, 3) => Some(2),               // carbanion (cyclopentadienide)
        (6, 1, 3) => Some(0),                // carbocation (tropylium)
        (5, 0, 3) => Some(0),                // borole-type boron: empty orbital
        (7 | 15 | 33, 0, 3) => Some(2),      // pyrrole-type N, phosphole P
        (7, -1, 2) => Some(2),               // azanide in tetrazolide, imidazolide
        (8 | 16 | 34 | 52, 0, 2) => Some(2), // furan O, thiophene S
        _ => None,
    }
}

/// Marks the atoms of the rings aromatic, and their bonds; with `envelope_only`, a bond shared
/// by two rings of the set is left alone (the fusion bond of azulene).
fn mark(mol: &mut Molecule, rings: &[usize], envelope_only: bool) {
    for &r in rings {
        for &a in &mol.rings.rings[r] {
            mol.atoms[a].aromatic = true;
        }
        for &b in &mol.rings.ring_bonds[r] {
            let shared = rings
                .iter()
                .filter(|&&s| mol.rings.ring_bonds[s].contains(&b))
                .count();
            if !envelope_only || shared == 1 {
                mol.bonds[b].aromatic = true;
            }
        }
    }
}

/// Whether two rings share a bond.
fn fused(mol: &Molecule, r: usize, s: usize) -> bool {
    mol.rings.ring_bonds[r]
        .iter()
        .any(|b| mol.rings.ring_bonds[s].contains(b))
}

/// Groups of candidate rings connected through shared bonds, with two rings or more.
fn fused_systems(mol: &Molecule, rings: &[usize]) -> Vec<Vec<usize>> {
    let mut seen = vec![false; rings.len()];
    let mut systems = Vec::new();
    for start in 0..rings.len() {
        if seen[start] {
            continue;
        }
        seen[start] = true;
        let mut system = vec![rings[start]];
        let mut k = 0;
        while k < system.len() {
            for j in 0..rings.len() {
                if !seen[j] && fused(mol, system[k], rings[j]) {
                    seen[j] = true;
                    system.push(rings[j]);
                }
            }
            k += 1;
        }
        if system.len() > 1 {
            systems.push(system);
        }
    }
    systems
}

/// Subsets of two or more rings of a fused system that are themselves connected by shared bonds.
/// Large systems are limited to subsets of up to three rings.
fn connected_subsets(mol: &Molecule, system: &[usize]) -> Vec<Vec<usize>> {
    let n = system.len();
    let max_size = if n <= MAX_SUBSET_RINGS { n } else { 3 };
    let mut out = Vec::new();
    let mut current = Vec::new();
    grow_subsets(system, 0, max_size, &mut current, &mut out);
    out.retain(|s| s.len() >= 2 && is_connected(mol, s));
    out.sort_by_key(|s| s.len());
    out
}

fn grow_subsets(
    system: &[usize],
    from: usize,
    max_size: usize,
    current: &mut Vec<usize>,
    out: &mut Vec<Vec<usize>>,
) {
    for k in from..system.len() {
        current.push(system[k]);
        out.push(current.clone());
        if current.len() < max_size {
            grow_subsets(system, k + 1, max_size, current, out);
        }
        current.pop();
    }
}

fn is_connected(mol: &Molecule, rings: &[usize]) -> bool {
    let mut reached = vec![false; rings.len()];
    reached[0] = true;
    let mut stack = vec![0];
    while let Some(k) = stack.pop() {
        for j in 0..rings.len() {
            if !reached[j] && fused(mol, rings[k], rings[j]) {
                reached[j] = true;
                stack.push(j);
            }
        }
    }
    reached.iter().all(|&r| r)
}

#[cfg(test)]
mod tests {
    use crate::chem::molecule::Molecule;

    fn aromatic_atoms(smiles: &str) -> Vec<usize> {
        let mol = Molecule::from_smiles(smiles).unwrap();
        (0..mol.atoms.len())
            .filter(|&i| mol.atoms[i].aromatic)
            .collect()
    }

    #[test]
    fn huckel_counts() {
        assert!(super::huckel(2) && super::huckel(6) && super::huckel(10));
        assert!(!super::huckel(0) && !super::huckel(4) && !super::huckel(8));
    }

    #[test]
    fn kekule_benzene_is_aromatic_cyclooctatetraene_is_not() {
        assert_eq!(aromatic_atoms("C1=CC=CC=C1"), vec![0, 1, 2, 3, 4, 5]);
        assert!(aromatic_atoms("C1=CC=CC=CC=C1").is_empty());
        assert!(aromatic_atoms("O=C1C=CC(=O)C=C1").is_empty()); // p-benzoquinone
        assert!(aromatic_atoms("C1=CCC=C1").is_empty()); // cyclopentadiene: sp3 CH2
    }

    #[test]
    fn azulene_fusion_bond_stays_non_aromatic() {
        // Independent count: 10 pi electrons over the 5+7 envelope, 11 bonds, one shared.
        let mol = Molecule::from_smiles("C1=CC2=CC=CC=CC2=C1").unwrap();
        assert!(mol.atoms.iter().all(|a| a.aromatic));
        assert_eq!(mol.bonds.iter().filter(|b| b.aromatic).count(), 10);
    }
}
