//! Reading SMARTS atoms: the organic-subset shorthand (`C`, `c`, `Cl`, `*`, `a`, `A`) and
//! bracket atoms with their primitives (`#7`, `H2`, `D3`, `X4`, `R`, `r6`, `x2`, `v3`, `+`,
//! `13`, `$(...)`) joined by `!`, `&` (or nothing), `,` and `;`, then an optional `:map`.
//!
//! Two readings follow RDKit where Daylight's text leaves room: an `H` first in the bracket and
//! followed by `]`, a charge or a map (`[H]`, `[2H+]`) is the element hydrogen, any other `H`
//! is a hydrogen count (`[H2]`, `[CH]`); two-letter symbols are read greedily (`[Cr]`
//! chromium), except those past lawrencium (`[Nh]` is N with an implicit H).

use super::parse::Parser;
use super::query::{AtomExpr, AtomPrim, Expr, QueryAtom};
use super::symbols::{aromatic_number, atomic_number};
use crate::error::ParseError;

impl Parser<'_> {
    /// Reads one atom, bracketed or not.
    pub fn atom(&mut self) -> Result<QueryAtom, ParseError> {
        if self.peek() == Some(b'[') {
            return self.bracket_atom();
        }
        let position = self.pos;
        let two = self.text.get(self.pos..self.pos + 2);
        let (prim, len) = match (self.peek(), two) {
            (_, Some("Cl")) => (element(17, false), 2),
            (_, Some("Br")) => (element(35, false), 2),
            (Some(b'*'), _) => (AtomPrim::Any, 1),
            (Some(b'a'), _) => (AtomPrim::Aromatic, 1),
            (Some(b'A'), _) => (AtomPrim::Aliphatic, 1),
            (Some(c @ (b'B' | b'C' | b'N' | b'O' | b'P' | b'S' | b'F' | b'I')), _) => {
                let n = atomic_number(&(c as char).to_string()).expect("organic subset");
                (element(n, false), 1)
            }
            (Some(c @ (b'b' | b'c' | b'n' | b'o' | b'p' | b's')), _) => {
                let n = aromatic_number(&(c as char).to_string()).expect("aromatic subset");
                (element(n, true), 1)
            }
            _ => return Err(self.unexpected("an atom")),
        };
        self.pos += len;
        Ok(QueryAtom {
            expr: Expr::Prim(prim),
            map: None,
            position,
        })
    }

    fn bracket_atom(&mut self) -> Result<QueryAtom, ParseError> {
        let position = self.pos;
        self.pos += 1;
        self.hydrogen_at = self.leading_hydrogen();
        if matches!(self.peek(), Some(b']') | None) {
            return Err(self.unexpected("an atom primitive"));
        }
        let expr = self.low_and()?;
        self.hydrogen_at = None;
        let mut map = None;
        if self.peek() == Some(b':') {
            self.pos += 1;
            map = Some(
                self.number()?
                    .ok_or_else(|| self.unexpected("an atom map number"))?,
            );
        }
        if self.peek() != Some(b']') {
            return Err(self.unexpected("']'"));
        }
        self.pos += 1;
        Ok(QueryAtom {
            expr,
            map,
            position,
        })
    }

    /// Position of an `H` that names the element: first in the bracket (after an isotope)
    /// and followed by `]`, a charge or an atom map.
    fn leading_hydrogen(&self) -> Option<usize> {
        let mut at = self.pos;
        while self.bytes.get(at).is_some_and(u8::is_ascii_digit) {
            at += 1;
        }
        let next = self.bytes.get(at + 1).copied();
        (self.bytes.get(at) == Some(&b'H') && matches!(next, Some(b']' | b'+' | b'-' | b':')))
            .then_some(at)
    }

    /// `;`: the loosest "and".
    fn low_and(&mut self) -> Result<AtomExpr, ParseError> {
        let mut terms = vec![self.or()?];
        while self.peek() == Some(b';') {
            self.pos += 1;
            terms.push(self.or()?);
        }
        Ok(Expr::join(terms, Expr::And))
    }

    fn or(&mut self) -> Result<AtomExpr, ParseError> {
        let mut terms = vec![self.high_and()?];
        while self.peek() == Some(b',') {
            self.pos += 1;
            terms.push(self.high_and()?);
        }
        Ok(Expr::join(terms, Expr::Or))
    }

    /// `&` or primitives written side by side.
    fn high_and(&mut self) -> Result<AtomExpr, ParseError> {
        let mut terms = vec![self.not()?];
        loop {
            match self.peek() {
                Some(b'&') => {
                    self.pos += 1;
                    terms.push(self.not()?);
                }
                None | Some(b']' | b';' | b',' | b':') => break,
                Some(_) => terms.push(self.not()?),
            }
        }
        Ok(Expr::join(terms, Expr::And))
    }

    fn not(&mut self) -> Result<AtomExpr, ParseError> {
        if self.peek() == Some(b'!') {
            self.pos += 1;
            return Ok(Expr::Not(Box::new(self.not()?)));
        }
        Ok(Expr::Prim(self.primitive()?))
    }

    fn primitive(&mut self) -> Result<AtomPrim, ParseError> {
        let at = self.pos;
        let Some(c) = self.peek() else {
            return Err(self.unexpected("an atom primitive"));
        };
        if c.is_ascii_digit() {
            let n = self.number()?.expect("digit seen");
            let n = u16::try_from(n).map_err(|_| self.error(at, "isotope too large"))?;
            return Ok(AtomPrim::Isotope(n));
        }
        self.pos += 1;
        match c {
            b'*' => Ok(AtomPrim::Any),
            b'#' => {
                let n = self
                    .number()?
                    .ok_or_else(|| self.unexpected("an atomic number"))?;
                let n = u8::try_from(n)
                    .ok()
                    .filter(|&n| n <= 118)
                    .ok_or_else(|| self.error(at + 1, "no such atomic number"))?;
                Ok(AtomPrim::Element {
                    number: n,
                    aromatic: None,
                })
            }
            b'+' | b'-' => self.charge(c, at),
            b'@' => {
                // Chirality is read and ignored: RDKit matches without stereo by default.
                while matches!(self.peek(), Some(b'@' | b'?')) {
                    self.pos += 1;
                }
                Ok(AtomPrim::Chirality)
            }
            b'$' => self.recursive(at),
            b'A'..=b'Z' | b'a'..=b'z' => {
                self.pos -= 1;
                self.letter_primitive()
            }
            _ => {
                self.pos = at;
                Err(self.unexpected("an atom primitive"))
            }
        }
    }

    /// `+`, `++`, `+2`, `-`, `--`, `-3`, `+0`.
    fn charge(&mut self, sign: u8, at: usize) -> Result<AtomPrim, ParseError> {
        let magnitude = match self.number()? {
            Some(n) => n,
            None => {
                let mut n = 1;
                while self.peek() == Some(sign) {
                    self.pos += 1;
                    n += 1;
                }
                n
            }
        };
        let magnitude = i8::try_from(magnitude).map_err(|_| self.error(at, "charge too large"))?;
        Ok(AtomPrim::Charge(if sign == b'-' {
            -magnitude
        } else {
            magnitude
        }))
    }

    /// `$(` pattern `)`.
    fn recursive(&mut self, at: usize) -> Result<AtomPrim, ParseError> {
        if self.peek() != Some(b'(') {
            return Err(self.unexpected("'(' after '$'"));
        }
        self.pos += 1;
        let outer_hydrogen = self.hydrogen_at.take();
        let graph = self.graph(true)?;
        self.hydrogen_at = outer_hydrogen;
        if self.peek() != Some(b')') {
            return Err(self.error(at, "unclosed '$('"));
        }
        self.pos += 1;
        self.recursive.push(graph);
        Ok(AtomPrim::Recursive(self.recursive.len() - 1))
    }

    /// Element symbols and the lettered primitives (`H`, `h`, `D`, `X`, `R`, `r`, `x`, `v`,
    /// `a`, `A`).
    fn letter_primitive(&mut self) -> Result<AtomPrim, ParseError> {
        let at = self.pos;
        let c = self.bytes[at];
        if self.hydrogen_at == Some(at) {
            self.pos += 1;
            return Ok(element(1, false));
        }
        let two = self.text.get(at..at + 2).unwrap_or("");
        let one = &self.text[at..at + 1];
        if c.is_ascii_uppercase() {
            if let Some(n) = atomic_number(two).filter(|_| two.len() == 2) {
                self.pos += 2;
                return Ok(element(n, false));
            }
        } else if let Some(n) = aromatic_number(two).filter(|_| two.len() == 2) {
            self.pos += 2;
            return Ok(element(n, true));
        }
        self.pos += 1;
        let count = |p: &mut Self| -> Result<Option<u8>, ParseError> {
            let start = p.pos;
            p.number()?
                .map(|n| u8::try_from(n).map_err(|_| p.error(start, "count too large")))
                .transpose()
        };
        Ok(match c {
            b'H' => AtomPrim::TotalH(count(self)?.unwrap_or(1)),
            b'h' => AtomPrim::ImplicitH(count(self)?),
            b'D' => AtomPrim::Degree(count(self)?.unwrap_or(1)),
            b'X' => AtomPrim::Connectivity(count(self)?.unwrap_or(1)),
            b'v' => AtomPrim::Valence(count(self)?.unwrap_or(1)),
            b'R' => AtomPrim::RingCount(count(self)?),
            b'r' => AtomPrim::RingSize(count(self)?),
            b'x' => AtomPrim::RingBonds(count(self)?),
            b'a' => AtomPrim::Aromatic,
            b'A' => AtomPrim::Aliphatic,
            _ => {
                if let Some(n) = atomic_number(one) {
                    element(n, false)
                } else if let Some(n) = aromatic_number(one) {
                    element(n, true)
                } else {
                    self.pos = at;
                    return Err(self.unexpected("an atom primitive"));
                }
            }
        })
    }
}

fn element(number: u8, aromatic: bool) -> AtomPrim {
    AtomPrim::Element {
        number,
        aromatic: Some(aromatic),
    }
}

#[cfg(test)]
mod tests {
    use super::super::parse::parse_pattern;
    use super::*;
    use AtomPrim::*;

    fn expr(text: &str) -> AtomExpr {
        parse_pattern(text).unwrap().0.atoms[0].expr.clone()
    }

    fn prim(p: AtomPrim) -> AtomExpr {
        Expr::Prim(p)
    }

    fn el(number: u8, aromatic: Option<bool>) -> AtomExpr {
        prim(Element { number, aromatic })
    }

    #[test]
    fn organic_subset_outside_brackets() {
        assert_eq!(expr("C"), el(6, Some(false)));
        assert_eq!(expr("c"), el(6, Some(true)));
        assert_eq!(expr("Cl"), el(17, Some(false)));
        assert_eq!(expr("Br"), el(35, Some(false)));
        assert_eq!(expr("*"), prim(Any));
        assert_eq!(expr("a"), prim(Aromatic));
        assert_eq!(expr("A"), prim(Aliphatic));
        assert_eq!(parse_pattern("CCl").unwrap().0.atoms.len(), 2);
    }

    #[test]
    fn bracket_symbols() {
        assert_eq!(expr("[#6]"), el(6, None));
        assert_eq!(expr("[se]"), el(34, Some(true)));
        assert_eq!(expr("[Na]"), el(11, Some(false)));
        assert_eq!(expr("[Cr]"), el(24, Some(false)));
        assert_eq!(
            expr("[Nh]"),
            Expr::And(vec![el(7, Some(false)), prim(ImplicitH(None))])
        );
    }

    #[test]
    fn hydrogen_as_element_or_count() {
        assert_eq!(expr("[H]"), el(1, Some(false)));
        assert_eq!(
            expr("[2H+]"),
            Expr::And(vec![prim(Isotope(2)), el(1, Some(false)), prim(Charge(1))])
        );
        assert_eq!(expr("[H2]"), prim(TotalH(2)));
        assert_eq!(
            expr("[CH]"),
            Expr::And(vec![el(6, Some(false)), prim(TotalH(1))])
        );
        assert_eq!(
            expr("[H,C]"),
            Expr::Or(vec![prim(TotalH(1)), el(6, Some(false))])
        );
    }

    #[test]
    fn counts_and_their_defaults() {
        assert_eq!(expr("[D]"), prim(Degree(1)));
        assert_eq!(expr("[X4]"), prim(Connectivity(4)));
        assert_eq!(expr("[v]"), prim(Valence(1)));
        assert_eq!(expr("[R]"), prim(RingCount(None)));
        assert_eq!(expr("[R0]"), prim(RingCount(Some(0))));
        assert_eq!(expr("[r6]"), prim(RingSize(Some(6))));
        assert_eq!(expr("[x2]"), prim(RingBonds(Some(2))));
        assert_eq!(expr("[h]"), prim(ImplicitH(None)));
        assert_eq!(
            expr("[13C]"),
            Expr::And(vec![prim(Isotope(13)), el(6, Some(false))])
        );
    }

    #[test]
    fn charges() {
        assert_eq!(expr("[+]"), prim(Charge(1)));
        assert_eq!(expr("[++]"), prim(Charge(2)));
        assert_eq!(expr("[+2]"), prim(Charge(2)));
        assert_eq!(expr("[-]"), prim(Charge(-1)));
        assert_eq!(expr("[--]"), prim(Charge(-2)));
        assert_eq!(expr("[-3]"), prim(Charge(-3)));
        assert_eq!(expr("[+0]"), prim(Charge(0)));
    }

    #[test]
    fn logic_precedence() {
        // [C,N;!H0&X3] = (C or N) and ((not H0) and X3)
        assert_eq!(
            expr("[C,N;!H0&X3]"),
            Expr::And(vec![
                Expr::Or(vec![el(6, Some(false)), el(7, Some(false))]),
                Expr::And(vec![
                    Expr::Not(Box::new(prim(TotalH(0)))),
                    prim(Connectivity(3))
                ]),
            ])
        );
        // [CH2,NX3] = (C and H2) or (N and X3)
        assert_eq!(
            expr("[CH2,NX3]"),
            Expr::Or(vec![
                Expr::And(vec![el(6, Some(false)), prim(TotalH(2))]),
                Expr::And(vec![el(7, Some(false)), prim(Connectivity(3))]),
            ])
        );
        assert_eq!(
            expr("[!!C]"),
            Expr::Not(Box::new(Expr::Not(Box::new(el(6, Some(false))))))
        );
    }

    #[test]
    fn maps_chirality_and_recursion() {
        let (g, rec) = parse_pattern("[C@@H:7]-[$([OH]),$(O=*)]").unwrap();
        assert_eq!(g.atoms[0].map, Some(7));
        assert_eq!(
            g.atoms[0].expr,
            Expr::And(vec![el(6, Some(false)), prim(Chirality), prim(TotalH(1))])
        );
        assert_eq!(
            g.atoms[1].expr,
            Expr::Or(vec![prim(Recursive(0)), prim(Recursive(1))])
        );
        assert_eq!(rec.len(), 2);
        assert_eq!(rec[1].atoms.len(), 2);
        // Nested recursion collects every level into one list.
        let (_, rec) = parse_pattern("[$(C[$(N)])]").unwrap();
        assert_eq!(rec.len(), 2);
    }

    #[test]
    fn errors_point_at_the_offending_character() {
        let at = |t: &str| parse_pattern(t).unwrap_err().position;
        assert_eq!(at("[]"), 1);
        assert_eq!(at("[C"), 2);
        assert_eq!(at("[C;]"), 3);
        assert_eq!(at("[Q]"), 1);
        assert_eq!(at("[#]"), 2);
        assert_eq!(at("[#300]"), 2);
        assert_eq!(at("[C:]"), 3);
        assert_eq!(at("[C:1C]"), 4);
        assert_eq!(at("[$(C]"), 4);
        assert_eq!(at("[$C]"), 2);
        assert_eq!(at("C[C&]"), 4);
        assert_eq!(at("[C?]"), 2);
        assert_eq!(at("x"), 0);
        assert_eq!(at("[+999]"), 1);
    }
}
