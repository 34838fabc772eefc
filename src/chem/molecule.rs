//! The molecular graph phdose works on: atoms with element, charge, isotope and hydrogen
//! counts, bonds with Kekulé orders and perceived aromaticity, ring membership.
//!
//! A `Molecule` is built from SMILES through purr (see `Molecule::from_smiles`); a Kekulé and an
//! aromatic spelling of one structure give the same `Molecule` apart from atom order.

/// One heavy atom (explicit plain `[H]` atoms are folded into their neighbour's count).
#[derive(Debug, Clone, PartialEq)]
pub struct Atom {
    /// Atomic number; 0 for `*`.
    pub element: u8,
    /// Mass number when written (`[13C]`), else `None`.
    pub isotope: Option<u16>,
    /// Formal charge.
    pub charge: i8,
    /// Hydrogens implied by the organic subset (valence rules).
    pub implicit_hydrogens: u8,
    /// Hydrogens written inside brackets (`[NH3+]`) or as folded `[H]` atoms.
    pub explicit_hydrogens: u8,
    /// Aromatic after perception (not as written).
    pub aromatic: bool,
    /// Byte offset of the atom in the SMILES text, for messages.
    pub position: usize,
}

impl Atom {
    /// Total hydrogen count.
    pub fn hydrogens(&self) -> u8 {
        self.implicit_hydrogens + self.explicit_hydrogens
    }
}

/// Bond order in the Kekulé form; aromaticity is a separate flag.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Order {
    Single,
    Double,
    Triple,
    Quadruple,
}

impl Order {
    /// Bond multiplicity (1-4).
    pub fn value(self) -> u8 {
        match self {
            Order::Single => 1,
            Order::Double => 2,
            Order::Triple => 3,
            Order::Quadruple => 4,
        }
    }
}

/// A bond between two atoms (indices into `Molecule::atoms`).
#[derive(Debug, Clone, PartialEq)]
pub struct Bond {
    pub a: usize,
    pub b: usize,
    /// Kekulé order (aromatic bonds get an alternating single/double assignment).
    pub order: Order,
    /// Aromatic after perception.
    pub aromatic: bool,
}

impl Bond {
    /// The atom at the other end from `atom`.
    pub fn other(&self, atom: usize) -> usize {
        if self.a == atom { self.b } else { self.a }
    }
}

/// Ring membership from the smallest set of smallest rings (SSSR).
#[derive(Debug, Clone, PartialEq, Default)]
pub struct Rings {
    /// Each ring as its atoms in cycle order.
    pub rings: Vec<Vec<usize>>,
    /// Each ring as its bond indices.
    pub ring_bonds: Vec<Vec<usize>>,
}

/// A molecule: atoms, bonds, adjacency and rings.
#[derive(Debug, Clone, PartialEq)]
pub struct Molecule {
    pub atoms: Vec<Atom>,
    pub bonds: Vec<Bond>,
    /// For each atom: (neighbour atom, bond index), in SMILES order.
    pub adjacency: Vec<Vec<(usize, usize)>>,
    pub rings: Rings,
}

impl Molecule {
    /// A saturated carbon: not aromatic, single bonds only (an alkyl group's atoms).
    pub fn is_saturated_carbon(&self, atom: usize) -> bool {
        let a = &self.atoms[atom];
        a.element == 6
            && !a.aromatic
            && self.adjacency[atom]
                .iter()
                .all(|&(_, b)| self.bonds[b].order == Order::Single)
    }

    /// Number of heavy-atom neighbours (SMARTS `D`).
    pub fn degree(&self, atom: usize) -> usize {
        self.adjacency[atom].len()
    }

    /// Neighbours including hydrogens (SMARTS `X`).
    pub fn connectivity(&self, atom: usize) -> usize {
        self.degree(atom) + self.atoms[atom].hydrogens() as usize
    }

    /// Sum of bond orders including hydrogens (SMARTS `v`); Kekulé orders are used, so an
    /// aromatic carbon in benzene has valence 4.
    pub fn valence(&self, atom: usize) -> usize {
        let bonds: usize = self.adjacency[atom]
            .iter()
            .map(|&(_, b)| self.bonds[b].order.value() as usize)
            .sum();
        bonds + self.atoms[atom].hydrogens() as usize
    }

    /// Number of SSSR rings that contain the atom (SMARTS `R<n>`).
    pub fn ring_count(&self, atom: usize) -> usize {
        self.rings
            .rings
            .iter()
            .filter(|r| r.contains(&atom))
            .count()
    }

    /// Size of the smallest SSSR ring that contains the atom (SMARTS `r<n>`).
    pub fn smallest_ring(&self, atom: usize) -> Option<usize> {
        self.rings
            .rings
            .iter()
            .filter(|r| r.contains(&atom))
            .map(|r| r.len())
            .min()
    }

    /// Number of ring bonds at the atom (SMARTS `x<n>`).
    pub fn ring_connectivity(&self, atom: usize) -> usize {
        self.adjacency[atom]
            .iter()
            .filter(|&&(_, b)| self.bond_in_ring(b))
            .count()
    }

    /// Whether the bond lies in any ring (SMARTS `@`).
    pub fn bond_in_ring(&self, bond: usize) -> bool {
        self.rings.ring_bonds.iter().any(|r| r.contains(&bond))
    }

    /// Connected components (dot-separated parts), each as its atoms in ascending order; the
    /// components are listed in the order of their first atom.
    pub fn components(&self) -> Vec<Vec<usize>> {
        let mut seen = vec![false; self.atoms.len()];
        let mut out = Vec::new();
        for start in 0..self.atoms.len() {
            if seen[start] {
                continue;
            }
            seen[start] = true;
            let mut stack = vec![start];
            let mut part = Vec::new();
            while let Some(a) = stack.pop() {
                part.push(a);
                for &(nb, _) in &self.adjacency[a] {
                    if !seen[nb] {
                        seen[nb] = true;
                        stack.push(nb);
                    }
                }
            }
            part.sort_unstable();
            out.push(part);
        }
        out
    }

    /// Net formal charge.
    pub fn charge(&self) -> i32 {
        self.atoms.iter().map(|a| a.charge as i32).sum()
    }
}
