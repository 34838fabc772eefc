//! SMARTS patterns, read and matched by hand: atom and bond primitives with SMARTS logic,
//! branches, ring closures, dot-separated parts and recursive `$(...)` atoms.
//!
//! `Pattern::parse` reads a text once; `matches` lists every embedding in a molecule as
//! molecule atom indices in pattern-atom order. Embeddings that cover the same set of atoms
//! count once (RDKit's default `uniquify`), the first in lexicographic order being kept.
//! Stereo marks (`@`, `/`, `\`) are read and not tested, and atom maps are kept, not matched.
//!
//! ```
//! use phdose::chem::smarts::Pattern;
//! let acid = Pattern::parse("[CX3](=O)[OX2H1]").unwrap();
//! assert_eq!(acid.atom_count(), 3);
//! assert_eq!(Pattern::parse("C(=O").unwrap_err().position, 1);
//! ```

mod atom;
mod bond;
mod matcher;
mod parse;
pub mod query;
mod signature;
mod symbols;
mod target;

use std::collections::HashSet;
use std::str::FromStr;

use crate::chem::molecule::Molecule;
use crate::error::ParseError;
use matcher::Context;
use query::QueryGraph;

pub use target::{Screen, Target};

/// A compiled SMARTS pattern.
#[derive(Debug, Clone, PartialEq)]
pub struct Pattern {
    text: String,
    graph: QueryGraph,
    recursive: Vec<QueryGraph>,
}

impl Pattern {
    /// Reads a SMARTS text; errors carry the byte position of the offending character.
    pub fn parse(text: &str) -> Result<Pattern, ParseError> {
        let (graph, recursive) = parse::parse_pattern(text)?;
        Ok(Pattern {
            text: text.to_string(),
            graph,
            recursive,
        })
    }

    /// The text the pattern was read from.
    pub fn text(&self) -> &str {
        &self.text
    }

    /// Number of pattern atoms (the length of every match).
    pub fn atom_count(&self) -> usize {
        self.graph.atoms.len()
    }

    /// Atom map numbers (`[C:1]`) per pattern atom.
    pub fn atom_maps(&self) -> Vec<Option<u32>> {
        self.graph.atoms.iter().map(|a| a.map).collect()
    }

    /// The query graph (atoms, bonds, expressions), for callers that inspect a pattern.
    pub fn graph(&self) -> &QueryGraph {
        &self.graph
    }

    /// Every embedding with a distinct atom set, in lexicographic order.
    pub fn matches(&self, mol: &Molecule) -> Vec<Vec<usize>> {
        self.matches_in(&Target::new(mol))
    }

    /// As `matches`, on a prepared molecule (prepare once, run many patterns).
    pub fn matches_in(&self, target: &Target) -> Vec<Vec<usize>> {
        let mut found = Vec::new();
        self.for_each_match(target, |m| found.push(m.to_vec()));
        found
    }

    /// Hands `found` every embedding `matches_in` would list, in the same order, without
    /// collecting them (a caller that only looks at each match allocates nothing per match).
    pub fn for_each_match(&self, target: &Target, mut found: impl FnMut(&[usize])) {
        // An atom set is a bit mask while the molecule fits in one; a sorted list otherwise.
        if target.atom_count() <= 128 {
            let mut seen = SeenSets::default();
            self.run(target, None, &mut |m| {
                if seen.insert(m.iter().fold(0u128, |set, &a| set | 1 << a)) {
                    found(m);
                }
                false
            });
        } else {
            let mut seen: HashSet<Vec<usize>> = HashSet::new();
            self.run(target, None, &mut |m| {
                let mut key = m.to_vec();
                key.sort_unstable();
                if seen.insert(key) {
                    found(m);
                }
                false
            });
        }
    }

    /// Whether the first pattern atom may stand on `atom` by the cheap screens (element and
    /// coarse properties). `false` means no embedding starts there; `true` is not a match.
    pub fn may_start_at(&self, target: &Target, atom: usize) -> bool {
        self.may_stand_at(target, 0, atom)
    }

    /// Whether pattern atom `k` may stand on `atom` by the cheap screens: `false` means no
    /// embedding puts it there.
    pub fn may_stand_at(&self, target: &Target, k: usize, atom: usize) -> bool {
        atom < target.atom_count() && target.passes(atom, self.screen(k))
    }

    /// Whether pattern atom `k` can stand only on an aromatic atom (`a`, `c`, `[n;...]`).
    pub fn requires_aromatic(&self, k: usize) -> bool {
        self.graph
            .signatures
            .get(k)
            .is_some_and(|&s| signature::aromatic_only(s))
    }

    /// The cheap screens of pattern atom `k` (everything passes for an atom the pattern does
    /// not have), for `Target::passes`.
    pub fn screen(&self, k: usize) -> Screen {
        Screen {
            elements: self.graph.elements.get(k).copied().unwrap_or(u128::MAX),
            signature: self
                .graph
                .signatures
                .get(k)
                .copied()
                .unwrap_or(signature::ANY),
        }
    }

    /// As `matches_in`, but embeddings count as distinct when they put the first pattern atom
    /// on different atoms: a symmetric pattern such as `C#C` is then found anchored at both
    /// ends (what "which group hangs off this atom" asks).
    pub fn anchored_matches_in(&self, target: &Target) -> Vec<Vec<usize>> {
        let mut found = Vec::new();
        // The first atom and the atom set, as a bit mask while the molecule fits in one.
        if target.atom_count() <= 128 {
            let mut seen = SeenSets::default();
            self.run(target, None, &mut |m| {
                if seen.insert((m[0], m.iter().fold(0u128, |set, &a| set | 1 << a))) {
                    found.push(m.to_vec());
                }
                false
            });
        } else {
            let mut seen: HashSet<Vec<usize>> = HashSet::new();
            self.run(target, None, &mut |m| {
                let mut key = m.to_vec();
                key[1..].sort_unstable();
                if seen.insert(key) {
                    found.push(m.to_vec());
                }
                false
            });
        }
        found
    }

    /// The first embedding `matches` would list, without looking for the rest.
    pub fn first_match(&self, mol: &Molecule) -> Option<Vec<usize>> {
        let mut first = None;
        self.run(&Target::new(mol), None, &mut |m| {
            first = Some(m.to_vec());
            true
        });
        first
    }

    /// Whether the pattern occurs in the molecule at all.
    pub fn is_match(&self, mol: &Molecule) -> bool {
        self.first_match(mol).is_some()
    }

    /// Whether some embedding puts the first pattern atom on `atom` (the test a recursive
    /// `$(...)` makes; also how atom-typing tables such as Wildman-Crippen ask).
    pub fn is_match_at(&self, target: &Target, atom: usize) -> bool {
        if atom >= target.atom_count() {
            return false;
        }
        let mut found = false;
        self.run(target, Some(atom), &mut |_| {
            found = true;
            true
        });
        found
    }

    /// Whether `mapping` (molecule atom per pattern atom) is an embedding of the pattern. Of
    /// several embeddings with one atom set `matches` lists only one; this checks any other.
    pub fn is_embedding(&self, target: &Target, mapping: &[usize]) -> bool {
        let mut ctx = Context::new(target, &self.graph, &self.recursive);
        let main = ctx.main_id();
        ctx.is_embedding(main, mapping)
    }

    fn run(
        &self,
        target: &Target,
        anchor: Option<usize>,
        report: &mut dyn FnMut(&[usize]) -> bool,
    ) {
        // Most patterns of a table fail this screen: reject them before any allocation.
        if Context::screened_out(target, &self.graph) {
            return;
        }
        let mut ctx = Context::new(target, &self.graph, &self.recursive);
        let main = ctx.main_id();
        ctx.search(main, anchor, report);
    }
}

/// Atom sets (bit masks, with the first atom where that counts too) of the matches handed out
/// so far: a few on the stack, as most patterns match a handful of times, and a hash set once
/// there are more.
#[derive(Default)]
struct SeenSets<T> {
    few: [T; 16],
    count: usize,
    many: HashSet<T>,
}

impl<T: Copy + Default + Eq + std::hash::Hash> SeenSets<T> {
    /// Adds `set`; `false` when it was there already.
    fn insert(&mut self, set: T) -> bool {
        if self.count < self.few.len() {
            if self.few[..self.count].contains(&set) {
                return false;
            }
            self.few[self.count] = set;
            self.count += 1;
            return true;
        }
        if self.many.is_empty() {
            self.many.extend(self.few);
        }
        self.many.insert(set)
    }
}

impl FromStr for Pattern {
    type Err = ParseError;

    fn from_str(text: &str) -> Result<Self, Self::Err> {
        Pattern::parse(text)
    }
}

#[cfg(test)]
mod tests {
    use super::target::tests::{molecule, naphthalene};
    use super::*;

    #[test]
    fn aromatic_only_atoms_are_told_apart() {
        let p = Pattern::parse("[CX4H2]a").unwrap();
        assert!(!p.requires_aromatic(0) && p.requires_aromatic(1));
        let p = Pattern::parse("[#6]c[n;X2][C,c]").unwrap();
        assert!(!p.requires_aromatic(0) && p.requires_aromatic(1) && p.requires_aromatic(2));
        assert!(!p.requires_aromatic(3));
    }

    /// Acetic acid, CC(=O)O: methyl 0, carboxyl C 1, carbonyl O 2, hydroxyl O 3.
    fn acetic_acid() -> Molecule {
        molecule(
            &[
                (6, false, 3, 0),
                (6, false, 0, 0),
                (8, false, 0, 0),
                (8, false, 1, 0),
            ],
            &[(0, 1, 1, false), (1, 2, 2, false), (1, 3, 1, false)],
            &[],
        )
    }

    /// Ethylammonium, CC[NH3+], with the three N-H written in brackets.
    fn ethylammonium() -> Molecule {
        let mut mol = molecule(
            &[(6, false, 3, 0), (6, false, 2, 0), (7, false, 0, 1)],
            &[(0, 1, 1, false), (1, 2, 1, false)],
            &[],
        );
        mol.atoms[2].explicit_hydrogens = 3;
        mol
    }

    fn hits(smarts: &str, mol: &Molecule) -> Vec<Vec<usize>> {
        Pattern::parse(smarts).unwrap().matches(mol)
    }

    fn count(smarts: &str, mol: &Molecule) -> usize {
        hits(smarts, mol).len()
    }

    #[test]
    fn carboxylic_acid_group() {
        let acid = acetic_acid();
        assert_eq!(hits("[CX3](=O)[OX2H1]", &acid), vec![vec![1, 2, 3]]);
        assert_eq!(hits("O", &acid), vec![vec![2], vec![3]]);
        assert_eq!(hits("C=O", &acid), vec![vec![1, 2]]);
        assert_eq!(hits("C-O", &acid), vec![vec![1, 3]]);
        assert_eq!(
            hits("CO", &acid),
            vec![vec![1, 3]],
            "implicit bond: single or aromatic"
        );
        assert_eq!(hits("C~O", &acid), vec![vec![1, 2], vec![1, 3]]);
        assert_eq!(hits("[#6]!-[#8]", &acid), vec![vec![1, 2]]);
        assert_eq!(hits("[CH3]", &acid), vec![vec![0]]);
        assert_eq!(hits("[C;D3;v4]", &acid), vec![vec![1]]);
        assert_eq!(hits("[O;X1]", &acid), vec![vec![2]]);
        assert_eq!(count("[a]", &acid), 0);
        assert_eq!(count("[A]", &acid), 4);
    }

    #[test]
    fn same_atom_set_counts_once_and_order_is_lexicographic() {
        let acid = acetic_acid();
        // Three bonds, each found twice (both directions), listed once.
        assert_eq!(hits("*~*", &acid), vec![vec![0, 1], vec![1, 2], vec![1, 3]]);
        // C(C)(O)O: the two O are interchangeable; one embedding kept.
        assert_eq!(hits("C(C)(~O)~O", &acid), vec![vec![1, 0, 2, 3]]);
        let p = Pattern::parse("*~*").unwrap();
        assert_eq!(p.first_match(&acid), Some(vec![0, 1]));
        assert!(p.is_match(&acid));
    }

    #[test]
    fn aromatic_rings_and_ring_primitives() {
        let n = naphthalene();
        assert_eq!(hits("c1ccccc1", &n).len(), 2);
        assert_eq!(hits("c12ccccc1cccc2", &n).len(), 1);
        assert_eq!(hits("[R2]", &n), vec![vec![4], vec![5]]);
        assert_eq!(hits("[x3]", &n), vec![vec![4], vec![5]]);
        assert_eq!(count("[r6]", &n), 10);
        assert_eq!(count("[r5]", &n), 0);
        assert_eq!(count("[R0]", &n), 0);
        assert_eq!(count("[cH]", &n), 8);
        assert_eq!(count("[cH0]", &n), 2);
        assert_eq!(count("c:c", &n), 11);
        assert_eq!(count("cc", &n), 11);
        assert_eq!(count("c@c", &n), 11);
        assert_eq!(count("c!@c", &n), 0);
        assert_eq!(count("c-c", &n), 0, "aromatic bonds are not single");
        assert_eq!(count("c=c", &n), 0, "aromatic bonds are not double");
        assert_eq!(count("C", &n), 0);
        assert_eq!(count("[#6]", &n), 10);
        assert_eq!(count("[c;v4]", &n), 10);
    }

    #[test]
    fn charges_and_hydrogens() {
        let ion = ethylammonium();
        assert_eq!(hits("[NH3+]", &ion), vec![vec![2]]);
        assert_eq!(hits("[N+]", &ion), vec![vec![2]]);
        assert_eq!(hits("[N;+1]", &ion), vec![vec![2]]);
        assert_eq!(count("[N+0]", &ion), 0);
        assert_eq!(hits("[h3]", &ion), vec![vec![0], vec![2]]);
        assert_eq!(hits("[X4;N]", &ion), vec![vec![2]]);
        assert_eq!(
            count("[H]", &ion),
            0,
            "hydrogens are folded into their atoms"
        );
        assert_eq!(count("[#1]", &ion), 0);
        assert_eq!(count("[!#1]", &ion), 3);
        assert_eq!(count("[13C]", &ion), 0);
    }

    #[test]
    fn recursive_atoms() {
        let acid = acetic_acid();
        assert_eq!(hits("[$(C=O)]", &acid), vec![vec![1]]);
        assert_eq!(hits("[$([OH]C=O)]", &acid), vec![vec![3]]);
        assert_eq!(hits("[C;!$(C=O)]", &acid), vec![vec![0]]);
        assert_eq!(hits("[$(C~[$(O=C)])]", &acid), vec![vec![1]]);
        assert_eq!(
            count("[$(C[$(O=C)])]", &acid),
            0,
            "the implicit bond is not double"
        );
        assert_eq!(hits("[O;$(O-C),$(O=C)]", &acid), vec![vec![2], vec![3]]);
    }

    #[test]
    fn dot_separated_parts_match_anywhere() {
        let acid = acetic_acid();
        assert_eq!(
            hits("C.O", &acid),
            vec![vec![0, 2], vec![0, 3], vec![1, 2], vec![1, 3]]
        );
        assert_eq!(
            count("C.C.C", &acid),
            0,
            "more pattern atoms of a kind than exist"
        );
    }

    #[test]
    fn bad_text_is_an_error_value_never_a_panic() {
        let good = "[$([NX3;H2,H1;!$(NC=O)])]C(=O)[O-,OH1].c1cc%10ccc[se]1%10-[13CH2:4]/C=C\\*";
        assert!(Pattern::parse(good).is_ok());
        for end in 0..good.len() {
            let _ = Pattern::parse(&good[..end]);
            let _ = Pattern::parse(&good[end..]);
        }
        for bad in [
            "C\u{394}",
            "[C\u{e9}]",
            "\u{e9}",
            "[#6;\u{394}]",
            "C%\u{394}1",
            "[$(\u{394})]",
        ] {
            let e = Pattern::parse(bad).unwrap_err();
            assert!(
                e.position < bad.len() && bad.is_char_boundary(e.position),
                "{bad}"
            );
        }
    }

    #[test]
    fn anchored_test_and_api() {
        let acid = acetic_acid();
        let t = Target::new(&acid);
        let p: Pattern = "O=C".parse().unwrap();
        assert!(p.is_match_at(&t, 2));
        assert!(!p.is_match_at(&t, 3));
        assert!(!p.is_match_at(&t, 99));
        assert!(p.is_embedding(&t, &[2, 1]));
        assert!(!p.is_embedding(&t, &[3, 1]), "O3-C1 is a single bond");
        assert!(!p.is_embedding(&t, &[2]));
        assert!(!p.is_embedding(&t, &[2, 2]));
        assert!(!p.is_embedding(&t, &[2, 0]), "not bonded");
        let sym = Pattern::parse("O~C~O").unwrap();
        assert_eq!(sym.matches(&acid), vec![vec![2, 1, 3]]);
        assert!(
            sym.is_embedding(&t, &[3, 1, 2]),
            "the mirror embedding is valid too"
        );
        assert_eq!(p.text(), "O=C");
        let mapped = Pattern::parse("[C:1]=[O:2]").unwrap();
        assert_eq!(mapped.atom_maps(), vec![Some(1), Some(2)]);
        assert_eq!(mapped.matches(&acid), vec![vec![1, 2]]);
    }

    #[test]
    fn many_matches_count_each_atom_set_once() {
        // Past the few atom sets kept on the stack: 40 carbons, 39 bonds found both ways.
        let chain = Molecule::from_smiles(&"C".repeat(40)).unwrap();
        assert_eq!(count("C", &chain), 40);
        let bonds = hits("*~*", &chain);
        assert_eq!(bonds.len(), 39);
        assert!(bonds.iter().enumerate().all(|(i, m)| *m == vec![i, i + 1]));
        assert_eq!(count("C~C~C", &chain), 38);
    }

    #[test]
    fn many_dot_separated_parts_end_within_the_step_budget() {
        // Found by fuzzing: ten free atoms can be placed in 20^10 orders. The search stops
        // after STEP_BUDGET placements with what it found instead of running for hours.
        let mol = Molecule::from_smiles("CCCCCCCCCCCCCCCCCCCC").unwrap();
        let p = Pattern::parse("*.*.*.***.*.*.*.*").unwrap();
        let found = p.matches(&mol);
        assert!(!found.is_empty());
        assert!(found.iter().all(|m| m.len() == 10));
    }
}
