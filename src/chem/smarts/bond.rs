//! Reading SMARTS bonds: `-` `=` `#` `:` `~` `@` (ring bond), `/` and `\` (read as single;
//! stereo is ignored), with `!`, `&` (or nothing), `,` and `;` as for atoms. A bond left
//! unwritten between two atoms means "single or aromatic" (`BondPrim::Implicit`).

use super::parse::Parser;
use super::query::{BondExpr, BondPrim, Expr};
use crate::error::ParseError;

fn bond_primitive(c: u8) -> Option<BondPrim> {
    Some(match c {
        b'-' | b'/' | b'\\' => BondPrim::Single,
        b'=' => BondPrim::Double,
        b'#' => BondPrim::Triple,
        b':' => BondPrim::Aromatic,
        b'~' => BondPrim::Any,
        b'@' => BondPrim::Ring,
        _ => return None,
    })
}

impl Parser<'_> {
    /// Whether a bond expression starts here.
    pub fn at_bond(&self) -> bool {
        self.peek()
            .is_some_and(|c| c == b'!' || bond_primitive(c).is_some())
    }

    /// Reads a bond expression (the caller has checked `at_bond`).
    pub fn bond_expr(&mut self) -> Result<BondExpr, ParseError> {
        let mut terms = vec![self.bond_or()?];
        while self.peek() == Some(b';') {
            self.pos += 1;
            terms.push(self.bond_or()?);
        }
        Ok(Expr::join(terms, Expr::And))
    }

    fn bond_or(&mut self) -> Result<BondExpr, ParseError> {
        let mut terms = vec![self.bond_and()?];
        while self.peek() == Some(b',') {
            self.pos += 1;
            terms.push(self.bond_and()?);
        }
        Ok(Expr::join(terms, Expr::Or))
    }

    fn bond_and(&mut self) -> Result<BondExpr, ParseError> {
        let mut terms = vec![self.bond_not()?];
        loop {
            if self.peek() == Some(b'&') {
                self.pos += 1;
                terms.push(self.bond_not()?);
            } else if self.at_bond() {
                terms.push(self.bond_not()?);
            } else {
                break;
            }
        }
        Ok(Expr::join(terms, Expr::And))
    }

    fn bond_not(&mut self) -> Result<BondExpr, ParseError> {
        match self.peek() {
            Some(b'!') => {
                self.pos += 1;
                Ok(Expr::Not(Box::new(self.bond_not()?)))
            }
            Some(c) if bond_primitive(c).is_some() => {
                self.pos += 1;
                // `/?` and `\?` (unspecified direction) are single bonds too.
                if matches!(c, b'/' | b'\\') && self.peek() == Some(b'?') {
                    self.pos += 1;
                }
                Ok(Expr::Prim(bond_primitive(c).expect("checked")))
            }
            _ => Err(self.unexpected("a bond primitive")),
        }
    }
}

#[cfg(test)]
mod tests {
    use super::super::parse::parse_pattern;
    use super::*;
    use BondPrim::*;

    fn bond(text: &str) -> BondExpr {
        parse_pattern(text).unwrap().0.bonds[0].expr.clone()
    }

    #[test]
    fn primitives() {
        assert_eq!(bond("CC"), Expr::Prim(Implicit));
        assert_eq!(bond("C-C"), Expr::Prim(Single));
        assert_eq!(bond("C=C"), Expr::Prim(Double));
        assert_eq!(bond("C#N"), Expr::Prim(Triple));
        assert_eq!(bond("c:c"), Expr::Prim(Aromatic));
        assert_eq!(bond("C~C"), Expr::Prim(Any));
        assert_eq!(bond("C@C"), Expr::Prim(Ring));
        assert_eq!(bond("C/C"), Expr::Prim(Single));
        assert_eq!(bond("C\\C"), Expr::Prim(Single));
    }

    #[test]
    fn logic() {
        assert_eq!(bond("C!@C"), Expr::Not(Box::new(Expr::Prim(Ring))));
        assert_eq!(
            bond("C-@C"),
            Expr::And(vec![Expr::Prim(Single), Expr::Prim(Ring)])
        );
        assert_eq!(
            bond("C-,:C"),
            Expr::Or(vec![Expr::Prim(Single), Expr::Prim(Aromatic)])
        );
        assert_eq!(
            bond("C=,#;!@C"),
            Expr::And(vec![
                Expr::Or(vec![Expr::Prim(Double), Expr::Prim(Triple)]),
                Expr::Not(Box::new(Expr::Prim(Ring))),
            ])
        );
    }

    #[test]
    fn errors_point_at_the_offending_character() {
        let at = |t: &str| parse_pattern(t).unwrap_err().position;
        assert_eq!(at("C-,C"), 3);
        assert_eq!(at("C!C"), 2);
        assert_eq!(at("C=;"), 3);
    }
}
