//! Smallest set of smallest rings (SSSR), computed as a minimum cycle basis.
//!
//! Horton's method: for every atom `v` and every bond `x-y`, the cycle made of the shortest path
//! `v..x`, the bond, and the shortest path `y..v` is a candidate; a minimum cycle basis is found
//! among these candidates. Candidates are taken smallest first and kept when their bond sets are
//! linearly independent over GF(2) of those already kept, until the basis holds
//! `bonds - atoms + components` rings (the cyclomatic number).

use super::molecule::{Molecule, Rings};
use std::collections::{HashSet, VecDeque};

/// A set of bond indices as a bit vector.
type BondSet = Vec<u64>;

/// Fills `mol.rings` with the SSSR of the current bond graph.
pub fn perceive_rings(mol: &mut Molecule) {
    mol.rings = sssr(mol);
}

/// The SSSR of a molecule: each ring's atoms in cycle order and its bond indices.
pub fn sssr(mol: &Molecule) -> Rings {
    let n = mol.atoms.len();
    let cyclomatic = (mol.bonds.len() + mol.components().len()).saturating_sub(n);
    let mut rings = Rings::default();
    if cyclomatic == 0 {
        return rings;
    }
    let mut candidates = candidates(mol);
    candidates.sort_by_key(|c| c.len());

    let words = mol.bonds.len().div_ceil(64);
    let mut basis = Gf2Basis::default();
    for cycle in candidates {
        if rings.rings.len() == cyclomatic {
            break;
        }
        let bonds = cycle_bonds(mol, &cycle);
        let mut set = vec![0u64; words];
        for &b in &bonds {
            set[b / 64] |= 1 << (b % 64);
        }
        if basis.insert(set) {
            rings.rings.push(cycle);
            rings.ring_bonds.push(bonds);
        }
    }
    rings
}

/// Horton candidate cycles (atoms in cycle order), without duplicates.
fn candidates(mol: &Molecule) -> Vec<Vec<usize>> {
    let mut seen: HashSet<Vec<usize>> = HashSet::new();
    let mut out = Vec::new();
    for v in 0..mol.atoms.len() {
        let parent = shortest_path_tree(mol, v);
        for bond in &mol.bonds {
            let (x, y) = (bond.a, bond.b);
            if parent[x].is_none() || parent[y].is_none() {
                continue;
            }
            let px = path_to_root(&parent, x);
            let py = path_to_root(&parent, y);
            // The two paths may meet only at v, and the bond must not be a tree edge.
            let in_px: HashSet<usize> = px.iter().copied().collect();
            if py[..py.len() - 1].iter().any(|a| in_px.contains(a)) {
                continue;
            }
            if px.len() + py.len() < 4 {
                continue;
            }
            // Cycle order: v .. x, then y .. (before v).
            let mut cycle: Vec<usize> = px.iter().rev().copied().collect();
            cycle.extend(py[..py.len() - 1].iter().copied());
            let mut key = cycle.clone();
            key.sort_unstable();
            if seen.insert(key) {
                out.push(cycle);
            }
        }
    }
    out
}

/// Breadth-first tree from `root`: `parent[a] = Some(p)` (the root is its own parent); atoms in
/// other components stay `None`.
fn shortest_path_tree(mol: &Molecule, root: usize) -> Vec<Option<usize>> {
    let mut parent = vec![None; mol.atoms.len()];
    parent[root] = Some(root);
    let mut queue = VecDeque::from([root]);
    while let Some(a) = queue.pop_front() {
        for &(nb, _) in &mol.adjacency[a] {
            if parent[nb].is_none() {
                parent[nb] = Some(a);
                queue.push_back(nb);
            }
        }
    }
    parent
}

/// Atoms from `a` up to and including the root.
fn path_to_root(parent: &[Option<usize>], mut a: usize) -> Vec<usize> {
    let mut path = vec![a];
    while let Some(p) = parent[a] {
        if p == a {
            break;
        }
        path.push(p);
        a = p;
    }
    path
}

/// Bond indices around a cycle given in atom order.
fn cycle_bonds(mol: &Molecule, cycle: &[usize]) -> Vec<usize> {
    (0..cycle.len())
        .filter_map(|i| {
            let (a, b) = (cycle[i], cycle[(i + 1) % cycle.len()]);
            mol.adjacency[a]
                .iter()
                .find(|&&(nb, _)| nb == b)
                .map(|&(_, bond)| bond)
        })
        .collect()
}

/// Rows in echelon form, each with its pivot bit, for independence tests over GF(2).
#[derive(Default)]
struct Gf2Basis {
    rows: Vec<(usize, BondSet)>,
}

impl Gf2Basis {
    /// Reduces `set` by the rows; keeps it and returns true when something independent is left.
    fn insert(&mut self, mut set: BondSet) -> bool {
        for (pivot, row) in &self.rows {
            if set[pivot / 64] >> (pivot % 64) & 1 == 1 {
                for (w, r) in set.iter_mut().zip(row) {
                    *w ^= r;
                }
            }
        }
        let pivot = set
            .iter()
            .enumerate()
            .find(|(_, w)| **w != 0)
            .map(|(i, w)| i * 64 + w.trailing_zeros() as usize);
        match pivot {
            Some(p) => {
                // Keep the echelon form: clear the new pivot from the older rows.
                for (_, row) in self.rows.iter_mut() {
                    if row[p / 64] >> (p % 64) & 1 == 1 {
                        for (r, w) in row.iter_mut().zip(&set) {
                            *r ^= w;
                        }
                    }
                }
                self.rows.push((p, set));
                true
            }
            None => false,
        }
    }
}

#[cfg(test)]
mod tests {
    use crate::chem::molecule::Molecule;

    fn sizes(smiles: &str) -> Vec<usize> {
        let mol = Molecule::from_smiles(smiles).unwrap();
        let mut s: Vec<usize> = mol.rings.rings.iter().map(|r| r.len()).collect();
        s.sort();
        s
    }

    #[test]
    fn ring_counts_follow_the_cyclomatic_number() {
        assert_eq!(sizes("CCO"), Vec::<usize>::new());
        assert_eq!(sizes("C1CCCCC1"), vec![6]);
        assert_eq!(sizes("c1ccc2ccccc2c1"), vec![6, 6]); // naphthalene
        assert_eq!(sizes("c1ccc2cccc2cc1"), vec![5, 7]); // azulene
        // Norbornane: bicyclo[2.2.1] has two 5-rings, not the 6-ring envelope.
        assert_eq!(sizes("C1CC2CCC1C2"), vec![5, 5]);
        // Cubane: 12 bonds - 8 atoms + 1 = 5 rings, all four-membered.
        assert_eq!(sizes("C12C3C4C1C5C2C3C45"), vec![4, 4, 4, 4, 4]);
        // Spiro and two components.
        assert_eq!(sizes("C1CC11CC1.C1CC1"), vec![3, 3, 3]);
    }

    #[test]
    fn rings_are_in_cycle_order() {
        let mol = Molecule::from_smiles("C1CC2CCC1C2").unwrap();
        for (atoms, bonds) in mol.rings.rings.iter().zip(&mol.rings.ring_bonds) {
            assert_eq!(atoms.len(), bonds.len());
            for (i, &a) in atoms.iter().enumerate() {
                let b = atoms[(i + 1) % atoms.len()];
                assert!(mol.adjacency[a].iter().any(|&(n, _)| n == b));
            }
        }
    }
}
