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
    let cyclomatic = (mol.bonds.len() + component_count(mol)).saturating_sub(n);
    let mut rings = Rings::default();
    if cyclomatic == 0 {
        return rings;
    }
    let candidates = candidates(mol);

    let words = mol.bonds.len().div_ceil(64);
    let mut basis = Gf2Basis::default();
    for (_, _, cycle) in candidates {
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

/// Number of connected components (as `Molecule::components().len()`, without listing them).
fn component_count(mol: &Molecule) -> usize {
    let mut seen = vec![false; mol.atoms.len()];
    let mut stack = Vec::new();
    let mut count = 0;
    for start in 0..mol.atoms.len() {
        if seen[start] {
            continue;
        }
        count += 1;
        seen[start] = true;
        stack.push(start);
        while let Some(a) = stack.pop() {
            for &(nb, _) in &mol.adjacency[a] {
                if !seen[nb] {
                    seen[nb] = true;
                    stack.push(nb);
                }
            }
        }
    }
    count
}

/// The atom set of a cycle, for telling cycles found from several roots apart: a bit mask
/// while the molecule fits in one (no allocation), else the sorted atoms.
#[derive(PartialEq, Eq, Hash)]
enum CycleKey {
    Mask(u128),
    Sorted(Vec<usize>),
}

/// The atoms left after repeatedly removing atoms with at most one neighbour left: ring atoms
/// and the chains joining ring systems. No cycle passes through a removed atom, and no shortest
/// path between two kept atoms does either, so the candidates are the same as over the whole
/// molecule, found in the same order, at a fraction of the cost for substituted rings.
fn cyclic_core(mol: &Molecule) -> Vec<bool> {
    let mut degree: Vec<usize> = mol.adjacency.iter().map(Vec::len).collect();
    let mut kept = vec![true; mol.atoms.len()];
    let mut stack: Vec<usize> = (0..mol.atoms.len()).filter(|&a| degree[a] <= 1).collect();
    while let Some(a) = stack.pop() {
        if !kept[a] {
            continue;
        }
        kept[a] = false;
        for &(nb, _) in &mol.adjacency[a] {
            if kept[nb] {
                degree[nb] -= 1;
                if degree[nb] == 1 {
                    stack.push(nb);
                }
            }
        }
    }
    kept
}

/// A candidate cycle with where it was found: (root atom, closing bond, atoms in cycle order).
type Candidate = (usize, usize, Vec<usize>);

/// Horton candidate cycles without duplicates, smallest first (ties in the order Horton's
/// loop over roots and bonds finds them). Each connected piece of the cyclic core is searched
/// on its own; a piece that is one simple cycle (every atom with two core neighbours, as in
/// any isolated ring or macrocycle) gives the same cycle from every root, so only its first
/// root is tried — this keeps a 1,000-atom macrocycle linear instead of cubic.
fn candidates(mol: &Molecule) -> Vec<Candidate> {
    let core = cyclic_core(mol);
    let mut piece = vec![usize::MAX; mol.atoms.len()];
    let mut out = Vec::new();
    for start in 0..mol.atoms.len() {
        if !core[start] || piece[start] != usize::MAX {
            continue;
        }
        // Flood the piece holding `start`.
        let mut atoms = vec![start];
        piece[start] = start;
        let mut i = 0;
        while i < atoms.len() {
            for &(nb, _) in &mol.adjacency[atoms[i]] {
                if core[nb] && piece[nb] == usize::MAX {
                    piece[nb] = start;
                    atoms.push(nb);
                }
            }
            i += 1;
        }
        let kept: Vec<bool> = piece.iter().map(|&p| p == start).collect();
        let simple_cycle = atoms
            .iter()
            .all(|&a| mol.adjacency[a].iter().filter(|&&(nb, _)| kept[nb]).count() == 2);
        atoms.sort_unstable();
        let roots = if simple_cycle {
            &atoms[..1]
        } else {
            &atoms[..]
        };
        out.extend(candidates_over(mol, &kept, roots));
    }
    out.sort_by_key(|(v, bond, cycle)| (cycle.len(), *v, *bond));
    out
}

/// The candidates through the `kept` atoms only, rooted at `roots` (ascending), in Horton's
/// order (root, then bond index).
fn candidates_over(mol: &Molecule, kept: &[bool], roots: &[usize]) -> Vec<Candidate> {
    let bonds: Vec<(usize, usize, usize)> = mol
        .bonds
        .iter()
        .enumerate()
        .map(|(i, b)| (i, b.a, b.b))
        .filter(|&(_, a, b)| kept[a] && kept[b])
        .collect();
    let mut seen: HashSet<CycleKey> = HashSet::new();
    let small = mol.atoms.len() <= 128;
    let mut out = Vec::new();
    // Marks of the atoms on the path from x to the root, by round (no clearing between bonds).
    let mut on_px = vec![usize::MAX; mol.atoms.len()];
    let mut round = 0;
    // Buffers reused over roots and bonds (this loop runs for every ring atom of every row).
    let (mut parent, mut queue) = (Vec::new(), VecDeque::new());
    let (mut px, mut py) = (Vec::new(), Vec::new());
    for &v in roots {
        shortest_path_tree(mol, v, kept, &mut parent, &mut queue);
        for &(i, x, y) in &bonds {
            if parent[x].is_none() || parent[y].is_none() {
                continue;
            }
            // A bond of the tree itself closes no cycle (the paths below would overlap or be
            // too short); most bonds are tree bonds, so they are passed over before the paths.
            if parent[x] == Some(y) || parent[y] == Some(x) {
                continue;
            }
            path_to_root(&parent, x, &mut px);
            path_to_root(&parent, y, &mut py);
            // The two paths may meet only at v, and the bond must not be a tree edge.
            round += 1;
            for &a in &px {
                on_px[a] = round;
            }
            if py[..py.len() - 1].iter().any(|&a| on_px[a] == round) {
                continue;
            }
            if px.len() + py.len() < 4 {
                continue;
            }
            // Cycle order: v .. x, then y .. (before v).
            let around = || px.iter().rev().chain(&py[..py.len() - 1]).copied();
            let key = if small {
                CycleKey::Mask(around().fold(0u128, |m, a| m | 1 << a))
            } else {
                let mut key: Vec<usize> = around().collect();
                key.sort_unstable();
                CycleKey::Sorted(key)
            };
            if seen.insert(key) {
                out.push((v, i, around().collect()));
            }
        }
    }
    out
}

/// Breadth-first tree from `root` over the `kept` atoms, into `parent`: `parent[a] = Some(p)`
/// (the root is its own parent); atoms not reached stay `None`.
fn shortest_path_tree(
    mol: &Molecule,
    root: usize,
    kept: &[bool],
    parent: &mut Vec<Option<usize>>,
    queue: &mut VecDeque<usize>,
) {
    parent.clear();
    parent.resize(mol.atoms.len(), None);
    parent[root] = Some(root);
    queue.clear();
    queue.push_back(root);
    while let Some(a) = queue.pop_front() {
        for &(nb, _) in &mol.adjacency[a] {
            if kept[nb] && parent[nb].is_none() {
                parent[nb] = Some(a);
                queue.push_back(nb);
            }
        }
    }
}

/// Atoms from `a` up to and including the root, into `path`.
fn path_to_root(parent: &[Option<usize>], mut a: usize, path: &mut Vec<usize>) {
    path.clear();
    path.push(a);
    while let Some(p) = parent[a] {
        if p == a {
            break;
        }
        path.push(p);
        a = p;
    }
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
    fn the_cyclic_core_gives_the_same_candidates_in_the_same_order() {
        // Horton over the whole molecule, every atom a root, sorted by length (stable): the
        // plain method, against the pruned and per-piece search.
        for smiles in [
            "CC(C)Cc1ccc(cc1)C(C)C(=O)O",
            "OC(=O)c1ccc2ccccc2c1CCN",
            "C1CC2CCC1C2CC(N)C3CC3",
            "c1ccccc1CCc1ccncc1.OCC1CCOCC1",
            "C12C3C4C1C5C2C3C45",
            "C1CC11CC1",
            "C1CCCCCCCCCCC1CC1CCC1",
            "CCO",
        ] {
            let mol = Molecule::from_smiles(smiles).unwrap();
            let all = vec![true; mol.atoms.len()];
            let roots: Vec<usize> = (0..mol.atoms.len()).collect();
            let mut plain = super::candidates_over(&mol, &all, &roots);
            plain.sort_by_key(|c| c.2.len());
            assert_eq!(super::candidates(&mol), plain, "{smiles}");
        }
    }

    #[test]
    fn a_large_macrocycle_is_one_ring() {
        let smiles = format!("C1{}C1", "C".repeat(500));
        assert_eq!(sizes(&smiles), vec![502]);
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
