//! Reading a SMARTS text into a pattern graph: the chain of atoms, branches, ring closures,
//! dot-separated parts and nested `$(...)` patterns. Atoms are read in `atom.rs`, bonds in
//! `bond.rs`; every error carries the byte position of the offending character.

use super::query::{BondExpr, BondPrim, Expr, QueryBond, QueryGraph};
use crate::error::ParseError;

/// The reading state shared by the graph, atom and bond readers.
pub(crate) struct Parser<'t> {
    pub text: &'t str,
    pub bytes: &'t [u8],
    pub pos: usize,
    /// Every `$(...)` pattern met so far, at any nesting depth.
    pub recursive: Vec<QueryGraph>,
    /// Where, inside the current bracket atom, an `H` names the element hydrogen.
    pub hydrogen_at: Option<usize>,
}

/// A ring-closure digit waiting for its partner.
struct OpenRing {
    label: u32,
    atom: usize,
    bond: Option<BondExpr>,
    position: usize,
}

/// Reads a whole SMARTS text: the main graph and the `$(...)` graphs it refers to.
pub(crate) fn parse_pattern(text: &str) -> Result<(QueryGraph, Vec<QueryGraph>), ParseError> {
    let mut p = Parser {
        text,
        bytes: text.as_bytes(),
        pos: 0,
        recursive: Vec::new(),
        hydrogen_at: None,
    };
    let mut graph = p.graph(false)?;
    // Screens that look into `$(...)` atoms: a nested pattern is read, and pushed, before the
    // pattern holding it, so one pass in index order sees every reference screened already.
    let mut recursive = p.recursive;
    for r in 0..recursive.len() {
        let (done, rest) = recursive.split_at_mut(r);
        rest[0].screen(done);
    }
    graph.screen(&recursive);
    Ok((graph, recursive))
}

impl Parser<'_> {
    pub fn peek(&self) -> Option<u8> {
        self.bytes.get(self.pos).copied()
    }

    pub fn peek_at(&self, offset: usize) -> Option<u8> {
        self.bytes.get(self.pos + offset).copied()
    }

    pub fn error(&self, position: usize, message: impl Into<String>) -> ParseError {
        ParseError::new("SMARTS", self.text, position, message)
    }

    /// Error at the current position, naming the character found there.
    pub fn unexpected(&self, wanted: &str) -> ParseError {
        match self.text[self.pos..].chars().next() {
            Some(c) => self.error(self.pos, format!("unexpected '{c}', expected {wanted}")),
            None => self.error(self.pos, format!("unexpected end, expected {wanted}")),
        }
    }

    /// Reads a run of decimal digits, if any.
    pub fn number(&mut self) -> Result<Option<u32>, ParseError> {
        let start = self.pos;
        let mut value: u32 = 0;
        while let Some(c @ b'0'..=b'9') = self.peek() {
            value = value
                .checked_mul(10)
                .and_then(|v| v.checked_add((c - b'0') as u32))
                .ok_or_else(|| self.error(start, "number too large"))?;
            self.pos += 1;
        }
        Ok((self.pos > start).then_some(value))
    }

    /// Reads one graph up to the end of the text, or (when `nested`) up to the `)` that closes
    /// a `$(`, which is left for the caller.
    pub fn graph(&mut self, nested: bool) -> Result<QueryGraph, ParseError> {
        let start = self.pos;
        let mut g = QueryGraph::default();
        let mut prev: Option<usize> = None;
        let mut branches: Vec<(usize, usize)> = Vec::new(); // (atom, position of '(')
        let mut bond: Option<(BondExpr, usize)> = None;
        let mut rings: Vec<OpenRing> = Vec::new();
        while let Some(c) = self.peek() {
            match c {
                b'(' => {
                    let Some(atom) = prev else {
                        return Err(self.error(self.pos, "branch without an atom before it"));
                    };
                    if bond.is_some() {
                        return Err(self.error(self.pos, "bond before a branch"));
                    }
                    if self.peek_at(1) == Some(b')') {
                        return Err(self.error(self.pos, "empty branch"));
                    }
                    branches.push((atom, self.pos));
                    self.pos += 1;
                }
                b')' => {
                    if let Some((_, at)) = bond {
                        return Err(self.error(at, "bond without an atom after it"));
                    }
                    match branches.pop() {
                        Some((atom, _)) => {
                            prev = Some(atom);
                            self.pos += 1;
                        }
                        None if nested => break,
                        None => return Err(self.error(self.pos, "')' without '('")),
                    }
                }
                b'.' => {
                    if prev.is_none() || bond.is_some() || !branches.is_empty() {
                        return Err(self.error(self.pos, "misplaced '.'"));
                    }
                    prev = None;
                    self.pos += 1;
                }
                b'0'..=b'9' | b'%' => {
                    let at = self.pos;
                    let Some(atom) = prev else {
                        return Err(self.error(at, "ring closure without an atom before it"));
                    };
                    let label = self.ring_label()?;
                    let here = bond.take().map(|(e, _)| e);
                    self.ring_closure(&mut g, &mut rings, label, atom, here, at)?;
                }
                _ if self.at_bond() => {
                    if prev.is_none() {
                        return Err(self.error(self.pos, "bond without an atom before it"));
                    }
                    if bond.is_some() {
                        return Err(self.error(self.pos, "two bonds in a row"));
                    }
                    let at = self.pos;
                    bond = Some((self.bond_expr()?, at));
                }
                _ => {
                    let atom = self.atom()?;
                    let index = g.atoms.len();
                    g.atoms.push(atom);
                    if let Some(before) = prev {
                        let expr = bond
                            .take()
                            .map_or(Expr::Prim(BondPrim::Implicit), |(e, _)| e);
                        g.bonds.push(QueryBond {
                            a: before,
                            b: index,
                            expr,
                        });
                    }
                    prev = Some(index);
                }
            }
        }
        if let Some((_, at)) = bond {
            return Err(self.error(at, "bond without an atom after it"));
        }
        if let Some((_, at)) = branches.last() {
            return Err(self.error(*at, "unclosed branch"));
        }
        if let Some(ring) = rings.first() {
            return Err(self.error(ring.position, "unclosed ring"));
        }
        if g.atoms.is_empty() || prev.is_none() {
            return Err(self.error(self.pos.max(start), "empty pattern or dangling '.'"));
        }
        g.plan();
        Ok(g)
    }

    /// Reads `7`, `%12` or `%(123)`.
    fn ring_label(&mut self) -> Result<u32, ParseError> {
        let at = self.pos;
        if self.peek() != Some(b'%') {
            self.pos += 1;
            return Ok((self.bytes[at] - b'0') as u32);
        }
        self.pos += 1;
        if self.peek() == Some(b'(') {
            self.pos += 1;
            let n = self
                .number()?
                .ok_or_else(|| self.unexpected("a ring number"))?;
            if self.peek() != Some(b')') {
                return Err(self.unexpected("')'"));
            }
            self.pos += 1;
            return Ok(n);
        }
        match (self.peek(), self.peek_at(1)) {
            (Some(a @ b'0'..=b'9'), Some(b @ b'0'..=b'9')) => {
                self.pos += 2;
                Ok(((a - b'0') * 10 + (b - b'0')) as u32)
            }
            _ => Err(self.error(at, "'%' needs two digits")),
        }
    }

    /// Opens ring `label` at `atom`, or closes it with a bond to the atom that opened it.
    fn ring_closure(
        &self,
        g: &mut QueryGraph,
        rings: &mut Vec<OpenRing>,
        label: u32,
        atom: usize,
        bond: Option<BondExpr>,
        at: usize,
    ) -> Result<(), ParseError> {
        let Some(i) = rings.iter().position(|r| r.label == label) else {
            rings.push(OpenRing {
                label,
                atom,
                bond,
                position: at,
            });
            return Ok(());
        };
        let open = rings.remove(i);
        if open.atom == atom || g.bonded(open.atom, atom) {
            return Err(self.error(at, "ring closure repeats a bond"));
        }
        // A bond may be written at either end; written at both, the bond must satisfy both.
        let expr = match (open.bond, bond) {
            (Some(x), Some(y)) => Expr::And(vec![x, y]),
            (Some(x), None) | (None, Some(x)) => x,
            (None, None) => Expr::Prim(BondPrim::Implicit),
        };
        g.bonds.push(QueryBond {
            a: open.atom.min(atom),
            b: open.atom.max(atom),
            expr,
        });
        Ok(())
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn shape(text: &str) -> (usize, Vec<(usize, usize)>) {
        let (g, _) = parse_pattern(text).unwrap();
        (g.atoms.len(), g.bonds.iter().map(|b| (b.a, b.b)).collect())
    }

    fn error_at(text: &str) -> usize {
        parse_pattern(text).unwrap_err().position
    }

    #[test]
    fn chains_branches_and_rings() {
        assert_eq!(shape("CCO"), (3, vec![(0, 1), (1, 2)]));
        assert_eq!(shape("CC(=O)O"), (4, vec![(0, 1), (1, 2), (1, 3)]));
        assert_eq!(shape("C1CC1"), (3, vec![(0, 1), (1, 2), (0, 2)]));
        assert_eq!(shape("C12CC1C2").1.len(), 5);
        assert_eq!(shape("C%10CC%10"), (3, vec![(0, 1), (1, 2), (0, 2)]));
        assert_eq!(shape("C%(123)CC%(123)"), (3, vec![(0, 1), (1, 2), (0, 2)]));
        assert_eq!(shape("C.N"), (2, vec![]));
        let (g, _) = parse_pattern("C.[N]").unwrap();
        let positions: Vec<usize> = g.atoms.iter().map(|a| a.position).collect();
        assert_eq!(positions, vec![0, 2]);
    }

    #[test]
    fn ring_bond_may_be_written_at_either_end() {
        let (g, _) = parse_pattern("C=1CC1").unwrap();
        assert_eq!(g.bonds[2].expr, Expr::Prim(BondPrim::Double));
        let (g, _) = parse_pattern("C1CC=1").unwrap();
        assert_eq!(g.bonds[2].expr, Expr::Prim(BondPrim::Double));
    }

    #[test]
    fn plan_follows_written_order() {
        let (g, _) = parse_pattern("C1CC1.N").unwrap();
        assert_eq!(g.steps[2].parent, Some((1, 1)));
        assert_eq!(g.steps[2].closures, vec![(0, 2)]);
        assert_eq!(g.steps[3].parent, None);
    }

    #[test]
    fn errors_point_at_the_offending_character() {
        assert_eq!(error_at(""), 0);
        assert_eq!(error_at("C("), 1);
        assert_eq!(error_at("CC)"), 2);
        assert_eq!(error_at("C1CC"), 1);
        assert_eq!(error_at("C="), 1);
        assert_eq!(error_at("=C"), 0);
        assert_eq!(error_at("C..C"), 2);
        assert_eq!(error_at("C."), 2);
        assert_eq!(error_at("C()C"), 1);
        assert_eq!(error_at("C11"), 2);
        assert_eq!(error_at("C1C1"), 3, "a second bond between the same atoms");
        assert_eq!(error_at("C%1C"), 1);
        assert_eq!(error_at("CQ"), 1);
        assert_eq!(error_at("C=)"), 1);
    }
}
