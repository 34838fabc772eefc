//! The query tree a SMARTS text becomes: atom and bond primitives joined by SMARTS logic
//! (`!`, `&`, `,`, `;`), and the pattern graph of query atoms and query bonds.
//!
//! The graph keeps the atoms in the order they are written. Because SMARTS is written as a
//! depth-first walk, every atom that does not start a new dot-separated part is bonded to an
//! earlier atom; the matcher relies on that to extend a partial match one written atom at a time.

use super::signature;

/// A logical combination of primitives. `!` binds tightest, then `&` (and implicit and), then
/// `,`, then `;` — the parser builds the tree so that evaluation needs no precedence rules.
#[derive(Debug, Clone, PartialEq)]
pub enum Expr<P> {
    Prim(P),
    Not(Box<Expr<P>>),
    And(Vec<Expr<P>>),
    Or(Vec<Expr<P>>),
}

impl<P> Expr<P> {
    /// Evaluates the expression with `test` deciding each primitive (short-circuiting).
    pub fn eval(&self, test: &mut impl FnMut(&P) -> bool) -> bool {
        match self {
            Expr::Prim(p) => test(p),
            Expr::Not(e) => !e.eval(test),
            Expr::And(es) => es.iter().all(|e| e.eval(test)),
            Expr::Or(es) => es.iter().any(|e| e.eval(test)),
        }
    }

    /// Joins terms with `make` (And/Or), leaving a single term unwrapped.
    pub(crate) fn join(mut terms: Vec<Expr<P>>, make: fn(Vec<Expr<P>>) -> Expr<P>) -> Expr<P> {
        if terms.len() == 1 {
            terms.pop().expect("one term")
        } else {
            make(terms)
        }
    }
}

/// One atom primitive. Counts written without a number take SMARTS defaults (`H` = `H1`,
/// `D` = `D1`, `X` = `X1`, `v` = `v1`); `R`, `r`, `x` and `h` alone mean "at least one", kept
/// as `None`.
#[derive(Debug, Clone, PartialEq)]
pub enum AtomPrim {
    /// `*`
    Any,
    /// `a`
    Aromatic,
    /// `A`
    Aliphatic,
    /// `C`, `c`, `[Na]`, `#6`: atomic number, and whether the atom must be aromatic
    /// (`Some(true)` for lower-case symbols, `Some(false)` for upper-case, `None` for `#n`).
    Element { number: u8, aromatic: Option<bool> },
    /// `[13C]`: mass number.
    Isotope(u16),
    /// `+`, `-2`, `+0`: formal charge.
    Charge(i8),
    /// `H<n>`: total hydrogen count.
    TotalH(u8),
    /// `h<n>`: hydrogens not present as atoms (in a molecule read from SMILES: all of them).
    ImplicitH(Option<u8>),
    /// `D<n>`: explicit connections (heavy-atom neighbours here).
    Degree(u8),
    /// `X<n>`: connections including hydrogens.
    Connectivity(u8),
    /// `v<n>`: total bond order including hydrogens.
    Valence(u8),
    /// `R<n>`: number of SSSR rings holding the atom.
    RingCount(Option<u8>),
    /// `r<n>`: size of the smallest SSSR ring holding the atom (`r0`: in no ring).
    RingSize(Option<u8>),
    /// `x<n>`: number of ring bonds at the atom.
    RingBonds(Option<u8>),
    /// `@`, `@@`: chirality is read and not tested (stereo is ignored, as in RDKit's default).
    Chirality,
    /// `$(...)`: index into `Pattern::recursive`; true when that sub-pattern matches with its
    /// first atom on the tested atom.
    Recursive(usize),
}

/// One bond primitive. `/` and `\` are read as single bonds (stereo is ignored).
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum BondPrim {
    /// `-`, `/`, `\`: a single, non-aromatic bond.
    Single,
    /// `=`
    Double,
    /// `#`
    Triple,
    /// `:`
    Aromatic,
    /// `~`
    Any,
    /// `@`: the bond lies in a ring.
    Ring,
    /// No bond symbol written: single or aromatic.
    Implicit,
}

pub type AtomExpr = Expr<AtomPrim>;
pub type BondExpr = Expr<BondPrim>;

/// A pattern atom.
#[derive(Debug, Clone, PartialEq)]
pub struct QueryAtom {
    pub expr: AtomExpr,
    /// Atom map number (`[C:1]`); kept for callers, not matched.
    pub map: Option<u32>,
    /// Byte offset of the atom in the SMARTS text.
    pub position: usize,
}

/// A pattern bond between two pattern atoms, `a < b` in written order.
#[derive(Debug, Clone, PartialEq)]
pub struct QueryBond {
    pub a: usize,
    pub b: usize,
    pub expr: BondExpr,
}

/// How the matcher places written atom `k`: through a bond to an earlier atom (`parent`),
/// or anywhere when it starts a part; `closures` are the other bonds to earlier atoms.
#[derive(Debug, Clone, PartialEq)]
pub struct Step {
    /// (earlier atom, bond index)
    pub parent: Option<(usize, usize)>,
    /// (earlier atom, bond index)
    pub closures: Vec<(usize, usize)>,
}

/// A connected or dot-separated pattern graph.
#[derive(Debug, Clone, PartialEq, Default)]
pub struct QueryGraph {
    pub atoms: Vec<QueryAtom>,
    pub bonds: Vec<QueryBond>,
    /// One step per atom, in written order.
    pub steps: Vec<Step>,
    /// Per atom: the elements it can match, one bit per atomic number (all bits when the
    /// expression does not pin the element). Lets the matcher skip most atoms untested.
    pub elements: Vec<u128>,
    /// Per atom: the coarse atom properties it can accept (`signature`), the second screen.
    pub signatures: Vec<u64>,
}

impl QueryGraph {
    /// Builds the matching steps once all bonds are known.
    pub(crate) fn plan(&mut self) {
        // Screens that let everything through until `screen` is given the `$(...)` graphs
        // (the reader does that once the whole pattern is read).
        self.elements = vec![u128::MAX; self.atoms.len()];
        self.signatures = vec![signature::ANY; self.atoms.len()];
        self.steps = (0..self.atoms.len())
            .map(|k| {
                let mut earlier = self
                    .bonds
                    .iter()
                    .enumerate()
                    .filter(|(_, b)| b.b == k)
                    .map(|(i, b)| (b.a, i));
                let parent = earlier.next();
                Step {
                    parent,
                    closures: earlier.collect(),
                }
            })
            .collect();
    }

    /// Fills the per-atom screens (`elements`, `signatures`). `recursive` holds the planned
    /// `$(...)` graphs this one refers to, or is empty when they are not known yet (a `$(...)`
    /// atom then accepts everything).
    pub(crate) fn screen(&mut self, recursive: &[QueryGraph]) {
        let first = |r: usize| recursive.get(r).and_then(|g| g.elements.first().copied());
        let first = |r: usize| first(r).unwrap_or(u128::MAX);
        self.elements = self
            .atoms
            .iter()
            .map(|a| allowed_elements(&a.expr, &first))
            .collect();
        let first = |r: usize| recursive.get(r).and_then(|g| g.signatures.first().copied());
        let first = |r: usize| first(r).unwrap_or(signature::ANY);
        let on_cycle = self.atoms_on_cycles();
        self.signatures = (0..self.atoms.len())
            .map(|k| {
                let bonds = self.bonds.iter().filter(|q| q.a == k || q.b == k).count();
                signature::of_expr(&self.atoms[k].expr, &first)
                    & signature::of_shape(bonds, on_cycle[k])
            })
            .collect();
    }

    /// Per atom: whether it lies on a cycle of the pattern graph (has a bond that is no
    /// bridge: removing it leaves its ends connected). Patterns are small; this runs once.
    fn atoms_on_cycles(&self) -> Vec<bool> {
        let n = self.atoms.len();
        let mut around: Vec<Vec<(usize, usize)>> = vec![Vec::new(); n];
        for (i, q) in self.bonds.iter().enumerate() {
            if q.a < n && q.b < n {
                around[q.a].push((q.b, i));
                around[q.b].push((q.a, i));
            }
        }
        let mut on_cycle = vec![false; n];
        let (mut seen, mut stack) = (vec![false; n], Vec::new());
        for (skip, q) in self.bonds.iter().enumerate() {
            if q.a >= n || q.b >= n || (on_cycle[q.a] && on_cycle[q.b]) {
                continue;
            }
            seen.iter_mut().for_each(|s| *s = false);
            seen[q.a] = true;
            stack.push(q.a);
            while let Some(a) = stack.pop() {
                for &(next, i) in &around[a] {
                    if i != skip && !seen[next] {
                        seen[next] = true;
                        stack.push(next);
                    }
                }
            }
            if seen[q.b] {
                on_cycle[q.a] = true;
                on_cycle[q.b] = true;
            }
        }
        on_cycle
    }

    /// Whether atoms `a` and `b` are already bonded in the pattern.
    pub(crate) fn bonded(&self, a: usize, b: usize) -> bool {
        self.bonds
            .iter()
            .any(|q| (q.a == a && q.b == b) || (q.a == b && q.b == a))
    }
}

/// The atomic numbers an atom expression can accept (a superset; exact for element lists).
/// `recursive(r)` gives those of the first atom of `$(...)` pattern `r`.
fn allowed_elements(expr: &AtomExpr, recursive: &dyn Fn(usize) -> u128) -> u128 {
    match expr {
        Expr::Prim(AtomPrim::Element { number, .. }) if *number < 128 => 1u128 << number,
        Expr::Prim(AtomPrim::Recursive(r)) => recursive(*r),
        Expr::Prim(_) | Expr::Not(_) => u128::MAX,
        Expr::And(es) => es
            .iter()
            .fold(u128::MAX, |m, e| m & allowed_elements(e, recursive)),
        Expr::Or(es) => es.iter().fold(0, |m, e| m | allowed_elements(e, recursive)),
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn allowed_elements_follow_the_logic() {
        let el = |n| {
            Expr::Prim(AtomPrim::Element {
                number: n,
                aromatic: None,
            })
        };
        let or = Expr::Or(vec![el(7), el(8)]);
        assert_eq!(allowed_elements(&or, &|_| u128::MAX), 1 << 7 | 1 << 8);
        let and = Expr::And(vec![or.clone(), Expr::Prim(AtomPrim::Charge(0))]);
        assert_eq!(allowed_elements(&and, &|_| u128::MAX), 1 << 7 | 1 << 8);
        assert_eq!(
            allowed_elements(&Expr::Not(Box::new(el(6))), &|_| u128::MAX),
            u128::MAX
        );
        let with_any = Expr::Or(vec![el(6), Expr::Prim(AtomPrim::Aromatic)]);
        assert_eq!(allowed_elements(&with_any, &|_| u128::MAX), u128::MAX);
    }

    #[test]
    fn logic_evaluates_with_short_circuit() {
        let e: Expr<bool> = Expr::Or(vec![
            Expr::And(vec![
                Expr::Prim(true),
                Expr::Not(Box::new(Expr::Prim(false))),
            ]),
            Expr::Prim(false),
        ]);
        let mut calls = 0;
        assert!(e.eval(&mut |p| {
            calls += 1;
            *p
        }));
        assert_eq!(calls, 2, "the Or stops after its first true term");
    }

    #[test]
    fn plan_puts_ring_closures_after_the_parent() {
        // C1CC1: atoms 0-1, 1-2, and the closure 0-2.
        let atom = |p| QueryAtom {
            expr: Expr::Prim(AtomPrim::Any),
            map: None,
            position: p,
        };
        let bond = |a, b| QueryBond {
            a,
            b,
            expr: Expr::Prim(BondPrim::Implicit),
        };
        let mut g = QueryGraph {
            atoms: vec![atom(0), atom(2), atom(3)],
            bonds: vec![bond(0, 1), bond(1, 2), bond(0, 2)],
            steps: vec![],
            elements: vec![],
            signatures: vec![],
        };
        g.plan();
        assert_eq!(g.steps[0].parent, None);
        assert_eq!(g.steps[1].parent, Some((0, 0)));
        assert_eq!(g.steps[2].parent, Some((1, 1)));
        assert_eq!(g.steps[2].closures, vec![(0, 2)]);
        assert!(g.bonded(2, 0));
    }
}
