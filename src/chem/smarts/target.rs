//! A molecule prepared for matching: neighbours sorted by atom index (so that matches come out
//! in a fixed order) and ring facts per atom and bond computed once, not once per query atom.
//! Build one `Target` per molecule and run every pattern of a table against it.

use super::signature;
use crate::chem::molecule::{Molecule, Order};

/// What one pattern atom can accept, coarsely: its elements (one bit per atomic number) and
/// its coarse atom properties.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Screen {
    pub(crate) elements: u128,
    pub(crate) signature: u64,
}

/// A molecule with the facts SMARTS primitives ask about, computed once.
#[derive(Debug, Clone)]
pub struct Target<'m> {
    pub(crate) mol: &'m Molecule,
    /// (neighbour, bond index), ascending by neighbour.
    /// Of atom `a`: `neighbours[start[a]..start[a + 1]]` (one list for the whole molecule,
    /// not one allocation per atom).
    neighbours: Vec<(usize, usize)>,
    start: Vec<usize>,
    ring_count: Vec<usize>,
    /// Smallest SSSR ring size, 0 when the atom is in no ring.
    smallest_ring: Vec<usize>,
    ring_bonds: Vec<usize>,
    bond_in_ring: Vec<bool>,
    /// One bit per atomic number present.
    pub(crate) elements: u128,
    /// Per atom: hydrogens, counting those kept as atoms (`[2H]`), as SMARTS `H` counts them.
    pub(crate) total_h: Vec<u16>,
    /// Per atom: the coarse properties of `signature`.
    pub(crate) signature: Vec<u64>,
    /// Per atom: the bit of its element (all bits past the table's 128), side by side with
    /// `signature` so the screens read two arrays and not the atoms.
    element_bit: Vec<u128>,
    /// The union of every atom's `signature`.
    pub(crate) present: u64,
}

impl<'m> Target<'m> {
    pub fn new(mol: &'m Molecule) -> Self {
        let n = mol.atoms.len();
        let mut neighbours = Vec::with_capacity(2 * mol.bonds.len());
        let mut start = Vec::with_capacity(n + 1);
        for list in &mol.adjacency {
            start.push(neighbours.len());
            let from = neighbours.len();
            neighbours.extend_from_slice(list);
            neighbours[from..].sort_unstable();
        }
        start.push(neighbours.len());
        let mut ring_count = vec![0; n];
        let mut smallest_ring = vec![0; n];
        for ring in &mol.rings.rings {
            for &a in ring {
                ring_count[a] += 1;
                if smallest_ring[a] == 0 || ring.len() < smallest_ring[a] {
                    smallest_ring[a] = ring.len();
                }
            }
        }
        let mut bond_in_ring = vec![false; mol.bonds.len()];
        for &b in mol.rings.ring_bonds.iter().flatten() {
            bond_in_ring[b] = true;
        }
        let ring_bonds = mol
            .adjacency
            .iter()
            .map(|list| list.iter().filter(|&&(_, b)| bond_in_ring[b]).count())
            .collect();
        let elements = mol
            .atoms
            .iter()
            .filter(|a| a.element < 128)
            .fold(0u128, |m, a| m | 1 << a.element);
        let total_h: Vec<u16> = (0..n)
            .map(|a| {
                let kept = mol.adjacency[a]
                    .iter()
                    .filter(|&&(nb, _)| mol.atoms[nb].element == 1)
                    .count();
                mol.atoms[a].hydrogens() as u16 + kept as u16
            })
            .collect();
        let signature: Vec<u64> = (0..n)
            .map(|a| {
                let atom = &mol.atoms[a];
                signature::of_atom(
                    atom.aromatic,
                    atom.charge,
                    total_h[a] as usize,
                    mol.degree(a),
                    mol.connectivity(a),
                    ring_count[a] > 0,
                )
            })
            .collect();
        let present = signature.iter().fold(0, |m, s| m | s);
        let element_bit = mol
            .atoms
            .iter()
            .map(|a| match a.element {
                e @ 0..128 => 1u128 << e,
                _ => u128::MAX,
            })
            .collect();
        Target {
            mol,
            elements,
            total_h,
            signature,
            present,
            element_bit,
            neighbours,
            start,
            ring_count,
            smallest_ring,
            ring_bonds,
            bond_in_ring,
        }
    }

    pub fn molecule(&self) -> &'m Molecule {
        self.mol
    }

    pub fn atom_count(&self) -> usize {
        self.mol.atoms.len()
    }

    /// (neighbour, bond index) of `atom`, ascending by neighbour.
    pub(crate) fn neighbours_of(&self, atom: usize) -> &[(usize, usize)] {
        &self.neighbours[self.start[atom]..self.start[atom + 1]]
    }

    /// Whether `atom` passes a pattern atom's cheap screens (see `Pattern::screen`); `false`
    /// means the pattern atom cannot stand on it.
    pub fn passes(&self, atom: usize, screen: Screen) -> bool {
        self.element_in(atom, screen.elements)
            && signature::accepts(screen.signature, self.signature[atom])
    }

    /// Whether the element of `atom` is among the bits of `allowed`.
    pub(crate) fn element_in(&self, atom: usize, allowed: u128) -> bool {
        let bit = self.element_bit[atom];
        allowed & bit != 0 || bit == u128::MAX
    }

    /// The screening facts of `atom`: its element bit and coarse properties. Atoms with equal
    /// facts pass and fail the same screens.
    pub fn screen_facts(&self, atom: usize) -> (u128, u64) {
        (self.element_bit[atom], self.signature[atom])
    }

    /// `passes` on facts from `screen_facts`.
    pub fn facts_pass((element_bit, sig): (u128, u64), screen: Screen) -> bool {
        (screen.elements & element_bit != 0 || element_bit == u128::MAX)
            && signature::accepts(screen.signature, sig)
    }

    /// Number of SSSR rings holding the atom.
    pub fn ring_count(&self, atom: usize) -> usize {
        self.ring_count[atom]
    }

    /// Size of the smallest SSSR ring holding the atom, 0 outside rings.
    pub fn smallest_ring(&self, atom: usize) -> usize {
        self.smallest_ring[atom]
    }

    /// Number of ring bonds at the atom.
    pub fn ring_bonds(&self, atom: usize) -> usize {
        self.ring_bonds[atom]
    }

    pub fn bond_in_ring(&self, bond: usize) -> bool {
        self.bond_in_ring[bond]
    }

    /// The bond joining two atoms, if any.
    pub fn bond_between(&self, a: usize, b: usize) -> Option<usize> {
        self.neighbours_of(a)
            .iter()
            .find(|&&(n, _)| n == b)
            .map(|&(_, bond)| bond)
    }

    /// Whether the bond is a plain (non-aromatic) bond of the given order.
    pub(crate) fn plain(&self, bond: usize, order: Order) -> bool {
        let b = &self.mol.bonds[bond];
        !b.aromatic && b.order == order
    }
}

#[cfg(test)]
pub(crate) mod tests {
    use super::*;
    use crate::chem::molecule::{Atom, Bond, Rings};

    /// A hand-built molecule for matcher tests: `(element, aromatic, hydrogens, charge)` per
    /// atom, `(a, b, order, aromatic)` per bond, rings as atom cycles (ring bonds derived).
    pub fn molecule(
        atoms: &[(u8, bool, u8, i8)],
        bonds: &[(usize, usize, u8, bool)],
        rings: &[&[usize]],
    ) -> Molecule {
        let atoms: Vec<Atom> = atoms
            .iter()
            .enumerate()
            .map(|(i, &(element, aromatic, h, charge))| Atom {
                element,
                isotope: None,
                charge,
                implicit_hydrogens: h,
                explicit_hydrogens: 0,
                aromatic,
                position: i,
            })
            .collect();
        let bonds: Vec<Bond> = bonds
            .iter()
            .map(|&(a, b, order, aromatic)| Bond {
                a,
                b,
                order: match order {
                    1 => Order::Single,
                    2 => Order::Double,
                    3 => Order::Triple,
                    _ => Order::Quadruple,
                },
                aromatic,
            })
            .collect();
        let mut adjacency = vec![Vec::new(); atoms.len()];
        for (i, b) in bonds.iter().enumerate() {
            adjacency[b.a].push((b.b, i));
            adjacency[b.b].push((b.a, i));
        }
        let find = |x: usize, y: usize| {
            bonds
                .iter()
                .position(|b| (b.a == x && b.b == y) || (b.a == y && b.b == x))
                .expect("ring bond exists")
        };
        let ring_bonds = rings
            .iter()
            .map(|r| {
                (0..r.len())
                    .map(|i| find(r[i], r[(i + 1) % r.len()]))
                    .collect()
            })
            .collect();
        Molecule {
            atoms,
            bonds,
            adjacency,
            rings: Rings {
                rings: rings.iter().map(|r| r.to_vec()).collect(),
                ring_bonds,
            },
        }
    }

    /// Naphthalene, Kekulé orders plus aromatic flags, two SSSR rings sharing atoms 4 and 5.
    pub fn naphthalene() -> Molecule {
        let c = (6, true, 1, 0);
        let f = (6, true, 0, 0);
        // 0-1-2-3-4(f)-5(f)-0 ring A with 4,5 fused; ring B 4-6-7-8-9-5
        molecule(
            &[c, c, c, c, f, f, c, c, c, c],
            &[
                (0, 1, 2, true),
                (1, 2, 1, true),
                (2, 3, 2, true),
                (3, 4, 1, true),
                (4, 5, 2, true),
                (5, 0, 1, true),
                (4, 6, 1, true),
                (6, 7, 2, true),
                (7, 8, 1, true),
                (8, 9, 2, true),
                (9, 5, 1, true),
            ],
            &[&[0, 1, 2, 3, 4, 5], &[4, 6, 7, 8, 9, 5]],
        )
    }

    #[test]
    fn ring_facts_agree_with_the_molecule_methods() {
        let mol = naphthalene();
        let t = Target::new(&mol);
        for a in 0..mol.atoms.len() {
            assert_eq!(t.ring_count(a), mol.ring_count(a));
            assert_eq!(t.smallest_ring(a), mol.smallest_ring(a).unwrap_or(0));
            assert_eq!(t.ring_bonds(a), mol.ring_connectivity(a));
        }
        for b in 0..mol.bonds.len() {
            assert_eq!(t.bond_in_ring(b), mol.bond_in_ring(b));
        }
        assert_eq!(t.ring_count(4), 2);
        assert_eq!(t.ring_bonds(4), 3);
        assert_eq!(t.bond_between(4, 5), Some(4));
        assert_eq!(t.bond_between(0, 4), None);
        assert!(t.neighbours_of(5).windows(2).all(|w| w[0].0 < w[1].0));
    }
}
