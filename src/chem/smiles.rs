//! Reading SMILES into a `Molecule`.
//!
//! purr does the grammar; this module turns its adjacency list into phdose atoms and bonds,
//! folds plain `[H]` atoms into their neighbour (as RDKit does by default), finds the rings,
//! kekulizes aromatic spellings, gives organic-subset atoms their implicit hydrogens and
//! perceives aromaticity, so that every spelling of a structure ends in the same form.
//! Stereo marks are read and ignored.

use super::elements;
use super::molecule::{Atom, Bond, Molecule, Order, Rings};
use super::{aromaticity, kekule, rings};
use crate::error::ParseError;
use purr::feature::{AtomKind, BondKind, BracketSymbol};
use purr::graph::Builder;
use purr::read::{Error as ReadError, Trace, read};
use purr::walk::Follower;

const WHAT: &str = "SMILES";

/// The longest SMILES phdose reads. purr reads a chain by recursion (a few hundred bytes of
/// stack per atom) and ring perception grows with the cube of the ring atoms, so a bound keeps
/// both safe on a worker thread; the compounds of a workup are far shorter (common practice:
/// drug-like molecules stay under ~100 heavy atoms, a few hundred characters).
pub const MAX_SMILES_LEN: usize = 1000;

/// For each atom: (neighbour, bond index), as in `Molecule::adjacency`.
type Adjacency = Vec<Vec<(usize, usize)>>;

impl Molecule {
    /// Reads one SMILES string (several dot-separated components stay in one molecule).
    ///
    /// ```
    /// use phdose::chem::molecule::Molecule;
    /// let phenol = Molecule::from_smiles("c1ccccc1O").unwrap();
    /// assert_eq!(phenol.atoms.len(), 7);
    /// assert!(Molecule::from_smiles("c1cccc1").is_err()); // cannot be kekulized
    /// ```
    pub fn from_smiles(text: &str) -> Result<Molecule, ParseError> {
        if text.trim().is_empty() {
            return Err(ParseError::new(WHAT, text, 0, "empty SMILES"));
        }
        if text.len() > MAX_SMILES_LEN {
            let at = (0..=MAX_SMILES_LEN)
                .rev()
                .find(|&i| text.is_char_boundary(i))
                .unwrap_or(0);
            return Err(ParseError::new(
                WHAT,
                text,
                at,
                format!("longer than {MAX_SMILES_LEN} characters"),
            ));
        }
        let (graph, trace) = read_graph(text)?;
        let position = |i: usize| byte_offset(text, trace.atom(i).map_or(0, |r| r.start));
        let (mut mol, mut organic) = convert(text, &graph, &position)?;
        fold_hydrogens(&mut mol, &mut organic);
        rings::perceive_rings(&mut mol);
        kekule::kekulize(&mut mol, &organic, text)?;
        add_implicit_hydrogens(&mut mol, &organic, text)?;
        aromaticity::perceive(&mut mol);
        kekule::normalize(&mut mol);
        Ok(mol)
    }
}

/// A purr follower that drops stereo configurations before they reach the builder: phdose
/// ignores stereo, and purr's builder cannot invert some rare configurations.
struct StereoBlind(Builder);

impl Follower for StereoBlind {
    fn root(&mut self, root: AtomKind) {
        self.0.root(without_stereo(root))
    }
    fn extend(&mut self, bond_kind: BondKind, atom_kind: AtomKind) {
        self.0.extend(bond_kind, without_stereo(atom_kind))
    }
    fn join(&mut self, bond_kind: BondKind, rnum: purr::feature::Rnum) {
        self.0.join(bond_kind, rnum)
    }
    fn pop(&mut self, depth: usize) {
        self.0.pop(depth)
    }
}

fn without_stereo(mut kind: AtomKind) -> AtomKind {
    if let AtomKind::Bracket { configuration, .. } = &mut kind {
        *configuration = None;
    }
    kind
}

/// Runs purr; syntax errors carry purr's cursor, graph errors the position of the ring bond.
fn read_graph(text: &str) -> Result<(Vec<purr::graph::Atom>, Trace), ParseError> {
    let mut follower = StereoBlind(Builder::new());
    let mut trace = Trace::new();
    // purr may panic on a few malformed inputs; bad input must give an error, not a crash.
    let outcome = std::panic::catch_unwind(std::panic::AssertUnwindSafe(|| {
        read(text, &mut follower, Some(&mut trace))
    }));
    match outcome {
        Ok(Ok(())) => {}
        Ok(Err(ReadError::EndOfLine)) => {
            return Err(ParseError::new(WHAT, text, text.len(), "unexpected end"));
        }
        Ok(Err(ReadError::Character(at))) => {
            let at = byte_offset(text, at);
            return Err(ParseError::new(WHAT, text, at, "unexpected character"));
        }
        Err(_) => return Err(ParseError::new(WHAT, text, 0, "unreadable SMILES")),
    }
    match follower.0.build() {
        Ok(graph) => Ok((graph, trace)),
        Err(purr::graph::Error::Rnum(rid)) => {
            let at = byte_offset(text, trace.rnum(rid).map_or(0, |r| r.start));
            Err(ParseError::new(WHAT, text, at, "ring bond is never closed"))
        }
        Err(purr::graph::Error::Join(sid, _)) => {
            let at = byte_offset(text, trace.atom(sid).map_or(0, |r| r.start));
            Err(ParseError::new(
                WHAT,
                text,
                at,
                "ring bond closed with a different bond order",
            ))
        }
    }
}

/// purr counts its cursor in characters; phdose reports byte offsets.
fn byte_offset(text: &str, char_index: usize) -> usize {
    // Every atom asks: in the usual all-ASCII text a character is a byte, no walk needed.
    if text.is_ascii() {
        return char_index.min(text.len());
    }
    text.char_indices()
        .nth(char_index)
        .map_or(text.len(), |(byte, _)| byte)
}

/// An element symbol written into a few bytes on the stack (every atom of every row has one,
/// and a `String` each was a measurable share of reading).
#[derive(Default)]
struct Symbol {
    bytes: [u8; 8],
    len: usize,
}

impl Symbol {
    /// `written`'s symbol, first letter upper-case (`c` -> `C`, `se` -> `Se`).
    fn of(written: &dyn std::fmt::Display) -> Symbol {
        use std::fmt::Write;
        let mut s = Symbol::default();
        // A symbol longer than the buffer is cut short and then found in no table.
        let _ = write!(s, "{written}");
        s.bytes[..1].make_ascii_uppercase();
        s
    }

    fn as_str(&self) -> &str {
        std::str::from_utf8(&self.bytes[..self.len]).unwrap_or("")
    }
}

impl std::fmt::Write for Symbol {
    fn write_str(&mut self, part: &str) -> std::fmt::Result {
        let end = self.len + part.len();
        if end > self.bytes.len() {
            return Err(std::fmt::Error);
        }
        self.bytes[self.len..end].copy_from_slice(part.as_bytes());
        self.len = end;
        Ok(())
    }
}

/// purr atoms and bonds to phdose ones. Atoms and bonds written aromatic get `aromatic = true`
/// here; the kekulizer turns that into orders. Returns whether each atom is organic-subset
/// (those get implicit hydrogens).
fn convert(
    text: &str,
    graph: &[purr::graph::Atom],
    position: &dyn Fn(usize) -> usize,
) -> Result<(Molecule, Vec<bool>), ParseError> {
    let mut atoms = Vec::with_capacity(graph.len());
    let mut organic = Vec::with_capacity(graph.len());
    for (i, node) in graph.iter().enumerate() {
        let (symbol, isotope, charge, hydrogens, is_organic) = match &node.kind {
            AtomKind::Star => (None, None, 0, 0, false),
            AtomKind::Aliphatic(a) => (Some(Symbol::of(a)), None, 0, 0, true),
            AtomKind::Aromatic(a) => (Some(Symbol::of(a)), None, 0, 0, true),
            AtomKind::Bracket {
                isotope,
                symbol,
                hcount,
                charge,
                ..
            } => {
                let symbol = match symbol {
                    BracketSymbol::Star => None,
                    BracketSymbol::Element(e) => Some(Symbol::of(e)),
                    BracketSymbol::Aromatic(a) => Some(Symbol::of(a)),
                };
                let charge: i8 = charge.as_ref().map_or(0, |c| c.into());
                let hydrogens: u8 = hcount.as_ref().map_or(0, |h| h.into());
                (
                    symbol,
                    isotope.as_ref().map(u16::from),
                    charge,
                    hydrogens,
                    false,
                )
            }
        };
        let element = match symbol {
            None => 0,
            Some(s) => match elements::by_symbol(s.as_str()) {
                Some(e) => e.number,
                None => {
                    let message = format!("element {} is not in phdose's table", s.as_str());
                    return Err(ParseError::new(WHAT, text, position(i), message));
                }
            },
        };
        atoms.push(Atom {
            element,
            isotope,
            charge,
            implicit_hydrogens: 0,
            explicit_hydrogens: hydrogens,
            aromatic: node.kind.is_aromatic(),
            position: position(i),
        });
        organic.push(is_organic);
    }
    let (bonds, adjacency) = convert_bonds(text, graph, &atoms, position)?;
    let mol = Molecule {
        atoms,
        bonds,
        adjacency,
        rings: Rings::default(),
    };
    Ok((mol, organic))
}

/// purr's per-atom bond lists to one bond list plus adjacency (in SMILES order). An elided
/// bond between two aromatic atoms, or a `:` bond, is marked aromatic for the kekulizer.
fn convert_bonds(
    text: &str,
    graph: &[purr::graph::Atom],
    atoms: &[Atom],
    position: &dyn Fn(usize) -> usize,
) -> Result<(Vec<Bond>, Adjacency), ParseError> {
    let mut bonds = Vec::new();
    let mut adjacency: Adjacency = vec![Vec::new(); graph.len()];
    // The bond already made between two atoms: every bond made while reading one of its ends
    // is listed in that end's adjacency, so the two short lists hold it if it exists.
    let made = |adjacency: &Adjacency, (lo, hi): (usize, usize)| {
        let find = |from: usize, to: usize| {
            adjacency[from]
                .iter()
                .find(|&&(nb, _)| nb == to)
                .map(|&(_, b)| b)
        };
        find(lo, hi).or_else(|| find(hi, lo))
    };
    for (i, node) in graph.iter().enumerate() {
        for bond in &node.bonds {
            let j = bond.tid;
            if j >= graph.len() {
                let message = "bond to an atom that does not exist";
                return Err(ParseError::new(WHAT, text, position(i), message));
            }
            let key = (i.min(j), i.max(j));
            let existing = made(&adjacency, key);
            if i == j || (i < j && existing.is_some()) {
                let message = "atom bonded twice to the same neighbour";
                return Err(ParseError::new(WHAT, text, position(i), message));
            }
            let b = match existing {
                Some(b) => b,
                None => {
                    let written_aromatic = match bond.kind {
                        BondKind::Aromatic => true,
                        BondKind::Elided => atoms[i].aromatic && atoms[j].aromatic,
                        _ => false,
                    };
                    let order = match bond.kind {
                        BondKind::Double => Order::Double,
                        BondKind::Triple => Order::Triple,
                        BondKind::Quadruple => Order::Quadruple,
                        _ => Order::Single,
                    };
                    bonds.push(Bond {
                        a: key.0,
                        b: key.1,
                        order,
                        aromatic: written_aromatic,
                    });
                    bonds.len() - 1
                }
            };
            adjacency[i].push((j, b));
        }
    }
    Ok((bonds, adjacency))
}

/// Whether atom `i` is a plain hydrogen (`[H]`: no isotope, charge or H count) with a single
/// bond to one heavy atom.
fn is_foldable_hydrogen(mol: &Molecule, organic: &[bool], i: usize) -> bool {
    let atom = &mol.atoms[i];
    let plain = |a: &Atom| {
        a.element == 1 && a.isotope.is_none() && a.charge == 0 && a.explicit_hydrogens == 0
    };
    if organic[i] || !plain(atom) || mol.adjacency[i].len() != 1 {
        return false;
    }
    let (nb, b) = mol.adjacency[i][0];
    mol.bonds[b].order == Order::Single && !mol.bonds[b].aromatic && mol.atoms[nb].element != 1
}

/// Removes plain `[H]` atoms, counting each on its neighbour, and renumbers what is left.
fn fold_hydrogens(mol: &mut Molecule, organic: &mut Vec<bool>) {
    let fold: Vec<bool> = (0..mol.atoms.len())
        .map(|i| is_foldable_hydrogen(mol, organic, i))
        .collect();
    if !fold.iter().any(|&f| f) {
        return;
    }
    for i in (0..mol.atoms.len()).filter(|&i| fold[i]) {
        let nb = mol.adjacency[i][0].0;
        mol.atoms[nb].explicit_hydrogens += 1;
    }
    let mut new_index = vec![usize::MAX; mol.atoms.len()];
    let mut kept = 0;
    for (i, slot) in new_index.iter_mut().enumerate() {
        if !fold[i] {
            *slot = kept;
            kept += 1;
        }
    }
    let mut atoms = Vec::with_capacity(kept);
    let mut kept_organic = Vec::with_capacity(kept);
    for i in (0..mol.atoms.len()).filter(|&i| !fold[i]) {
        atoms.push(mol.atoms[i].clone());
        kept_organic.push(organic[i]);
    }
    let mut bond_index = vec![usize::MAX; mol.bonds.len()];
    let mut bonds = Vec::new();
    for (b, bond) in mol.bonds.iter().enumerate() {
        if !fold[bond.a] && !fold[bond.b] {
            bond_index[b] = bonds.len();
            bonds.push(Bond {
                a: new_index[bond.a],
                b: new_index[bond.b],
                ..bond.clone()
            });
        }
    }
    let adjacency = (0..mol.adjacency.len())
        .filter(|&i| !fold[i])
        .map(|i| {
            mol.adjacency[i]
                .iter()
                .filter(|&&(nb, _)| !fold[nb])
                .map(|&(nb, b)| (new_index[nb], bond_index[b]))
                .collect()
        })
        .collect();
    mol.atoms = atoms;
    mol.bonds = bonds;
    mol.adjacency = adjacency;
    *organic = kept_organic;
}

/// Elements that never exceed their highest default valence in ordinary molecules; a
/// higher valence on one of these, written without brackets, is a typo. B, C, N, O, F: RDKit
/// 2026.09.1 rejects the same inputs (checked by hand: `CC(C)(C)(C)C` does not parse there).
const STRICT_VALENCE: [u8; 5] = [5, 6, 7, 8, 9];

/// Organic-subset atoms get hydrogens up to their next default valence (OpenSMILES rule),
/// counted on the Kekulé form.
fn add_implicit_hydrogens(
    mol: &mut Molecule,
    organic: &[bool],
    text: &str,
) -> Result<(), ParseError> {
    for (i, _) in organic.iter().enumerate().filter(|&(_, &o)| o) {
        let valence = mol.valence(i);
        let element = mol.atoms[i].element;
        let valences = elements::by_number(element).map_or(&[][..], |e| e.valences.as_slice());
        match valences.iter().find(|&&v| v as usize >= valence) {
            Some(&target) => mol.atoms[i].implicit_hydrogens = (target as usize - valence) as u8,
            None if STRICT_VALENCE.contains(&element) => {
                let message = format!("too many bonds (valence {valence})");
                return Err(ParseError::new(WHAT, text, mol.atoms[i].position, message));
            }
            None => {}
        }
    }
    Ok(())
}

#[cfg(test)]
mod tests {
    use super::*;

    fn hs(smiles: &str) -> Vec<u8> {
        let mol = Molecule::from_smiles(smiles).unwrap();
        mol.atoms.iter().map(|a| a.hydrogens()).collect()
    }

    #[test]
    fn implicit_hydrogens_follow_default_valences() {
        assert_eq!(hs("CCO"), vec![3, 2, 1]);
        assert_eq!(hs("CC(=O)O"), vec![3, 0, 0, 1]);
        assert_eq!(hs("CS(=O)(=O)C"), vec![3, 0, 0, 0, 3]);
        assert_eq!(hs("C[NH3+]"), vec![3, 3]);
        assert_eq!(hs("c1ccncc1"), vec![1, 1, 1, 0, 1, 1]);
        assert_eq!(hs("c1cc[nH]c1"), vec![1, 1, 1, 1, 1]);
    }

    #[test]
    fn plain_explicit_hydrogens_are_folded() {
        let mol = Molecule::from_smiles("[H]OC([H])([H])[H]").unwrap();
        assert_eq!(mol.atoms.len(), 2);
        assert_eq!(hs("[H]OC([H])([H])[H]"), vec![1, 3]);
        // An isotope label keeps the hydrogen as an atom.
        assert_eq!(Molecule::from_smiles("[2H]C").unwrap().atoms.len(), 2);
        // Dihydrogen keeps both atoms.
        assert_eq!(Molecule::from_smiles("[H][H]").unwrap().atoms.len(), 2);
    }

    #[test]
    fn charges_isotopes_and_components() {
        let mol = Molecule::from_smiles("CC(=O)[O-].[Na+]").unwrap();
        assert_eq!(mol.atoms[3].charge, -1);
        assert_eq!(mol.atoms[4].element, 11);
        assert_eq!(mol.components(), vec![vec![0, 1, 2, 3], vec![4]]);
        assert_eq!(mol.charge(), 0);
        let mol = Molecule::from_smiles("[13CH4]").unwrap();
        assert_eq!(mol.atoms[0].isotope, Some(13));
        assert_eq!(mol.atoms[0].hydrogens(), 4);
    }

    #[test]
    fn stereo_marks_are_ignored() {
        let plain = Molecule::from_smiles("CC(N)C(=O)O").unwrap();
        let marked = Molecule::from_smiles("C[C@@H](N)C(=O)O").unwrap();
        let hs = |m: &Molecule| m.atoms.iter().map(|a| a.hydrogens()).collect::<Vec<_>>();
        assert_eq!(hs(&plain), hs(&marked));
        assert!(Molecule::from_smiles("F/C=C/F").is_ok());
    }

    #[test]
    fn errors_carry_positions() {
        let err = |s: &str| Molecule::from_smiles(s).unwrap_err();
        assert_eq!(err("").position, 0);
        assert_eq!(err("CC(C").position, 4);
        assert_eq!(err("CCX").position, 2);
        assert_eq!(err("C1CC").position, 1); // unclosed ring bond
        assert_eq!(err("CC(C)(C)(C)C").position, 1); // five bonds on carbon
        assert_eq!(err("C-1CC=1").position, 4); // ring bond written single, then double
        assert!(err("c1cccc1").message.contains("kekulize"));
        assert!(Molecule::from_smiles("*C").is_ok());
        assert_eq!(err("C12CC12").position, 0); // two bonds between the same atoms
        // A non-ASCII character is reported at its own byte offset.
        assert_eq!(err("éCX").position, 0);
        assert_eq!(err("CC(Cé").position, 4);
    }
}
