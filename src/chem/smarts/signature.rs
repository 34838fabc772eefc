//! A coarse, cheap description of atoms for screening: a molecule atom's aromaticity, formal
//! charge, hydrogen count, degree, connections and ring membership as one bit per property,
//! and for a query atom the set of those bits its expression can accept.
//!
//! A molecule atom whose bits are not all accepted fails the query atom's test, so the test is
//! skipped; an atom that passes still gets the full test. Query sets are supersets: `!`
//! accepts everything, `,` takes the union per property (the product of unions holds the
//! union of products), `&` and `;` the intersection.

use super::query::{AtomExpr, AtomPrim, Expr};

/// (first bit, number of bits) of each property; the last bit of a count is "this or more".
const AROMATIC: (u32, u32) = (0, 2);
/// Charge -2 or less, -1, 0, +1, +2 or more.
const CHARGE: (u32, u32) = (2, 5);
const HYDROGENS: (u32, u32) = (7, 5);
const DEGREE: (u32, u32) = (12, 6);
const CONNECTIONS: (u32, u32) = (18, 7);
/// Not in a ring, in a ring.
const RING: (u32, u32) = (25, 2);
const PROPERTIES: [(u32, u32); 6] = [AROMATIC, CHARGE, HYDROGENS, DEGREE, CONNECTIONS, RING];

/// Whether a query atom's accepted bits allow only aromatic atoms.
pub fn aromatic_only(accepted: u64) -> bool {
    accepted & mask(AROMATIC) == bit(AROMATIC, 1)
}

/// Every bit of every property: what a query atom accepts when nothing narrows it.
pub const ANY: u64 = (1 << 27) - 1;

fn mask((start, len): (u32, u32)) -> u64 {
    ((1u64 << len) - 1) << start
}

/// The bit of `value` in a property, counts past its last bit falling into the last.
fn bit((start, len): (u32, u32), value: usize) -> u64 {
    1 << (start + value.min(len as usize - 1) as u32)
}

/// Accepts only `value` of one property, anything of the others.
fn only(property: (u32, u32), value: usize) -> u64 {
    ANY & !mask(property) | bit(property, value)
}

/// The bits of one molecule atom. `hydrogens` counts hydrogens kept as atoms too (as the
/// SMARTS `H` test does).
pub fn of_atom(
    aromatic: bool,
    charge: i8,
    hydrogens: usize,
    degree: usize,
    connections: usize,
    in_ring: bool,
) -> u64 {
    bit(AROMATIC, aromatic as usize)
        | bit(CHARGE, (charge as i32 + 2).clamp(0, 4) as usize)
        | bit(HYDROGENS, hydrogens)
        | bit(DEGREE, degree)
        | bit(CONNECTIONS, connections)
        | bit(RING, in_ring as usize)
}

/// Whether a query atom accepting `query` may accept a molecule atom with bits `atom`.
pub fn accepts(query: u64, atom: u64) -> bool {
    query & atom == atom
}

/// Whether some molecule atom could pass `query`, given `present`, the union of the bits of
/// every atom: each property needs a value both accepted and present (a screen per property,
/// so it may pass where no single atom does).
pub fn possible(query: u64, present: u64) -> bool {
    let both = query & present;
    PROPERTIES.iter().all(|&p| both & mask(p) != 0)
}

/// What a pattern atom with `bonds` pattern bonds accepts for its shape alone: every pattern
/// bond takes a molecule bond of its own, so at least that many neighbours; and one on a
/// pattern cycle lies on a molecule cycle, so in a ring.
pub fn of_shape(bonds: usize, on_cycle: bool) -> u64 {
    let (start, len) = DEGREE;
    let fewer: u64 = (0..bonds.min(len as usize - 1)).fold(0, |m, d| m | bit(DEGREE, d));
    debug_assert!(fewer & !mask((start, len)) == 0);
    let shape = ANY & !fewer;
    if on_cycle {
        shape & only(RING, 1)
    } else {
        shape
    }
}

/// What `expr` can accept; `recursive(r)` gives the bits the first atom of recursive pattern
/// `r` accepts (an atom passing `$(...)` passes that pattern's first atom).
pub fn of_expr(expr: &AtomExpr, recursive: &dyn Fn(usize) -> u64) -> u64 {
    match expr {
        Expr::Prim(p) => of_prim(p, recursive),
        Expr::Not(_) => ANY,
        Expr::And(es) => es.iter().fold(ANY, |m, e| m & of_expr(e, recursive)),
        Expr::Or(es) => es.iter().fold(0, |m, e| m | of_expr(e, recursive)),
    }
}

fn of_prim(prim: &AtomPrim, recursive: &dyn Fn(usize) -> u64) -> u64 {
    let count = |n: u8| n as usize;
    match *prim {
        AtomPrim::Aromatic => only(AROMATIC, 1),
        AtomPrim::Aliphatic => only(AROMATIC, 0),
        AtomPrim::Element {
            aromatic: Some(a), ..
        } => only(AROMATIC, a as usize),
        AtomPrim::Charge(c) => only(CHARGE, (c as i32 + 2).clamp(0, 4) as usize),
        AtomPrim::TotalH(n) => only(HYDROGENS, count(n)),
        AtomPrim::Degree(n) => only(DEGREE, count(n)),
        AtomPrim::Connectivity(n) => only(CONNECTIONS, count(n)),
        // `R0`, `r0`, `x0`: in no ring; any other ring count, size or ring-bond count: in one.
        AtomPrim::RingCount(Some(0))
        | AtomPrim::RingSize(Some(0))
        | AtomPrim::RingBonds(Some(0)) => only(RING, 0),
        AtomPrim::RingCount(_) | AtomPrim::RingSize(_) | AtomPrim::RingBonds(_) => only(RING, 1),
        AtomPrim::Recursive(r) => recursive(r),
        _ => ANY,
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn prim(p: AtomPrim) -> AtomExpr {
        Expr::Prim(p)
    }

    #[test]
    fn atoms_pass_the_queries_that_describe_them() {
        // A ring NH of pyrrole: aromatic, neutral, one H, two heavy neighbours, three in all.
        let nh = of_atom(true, 0, 1, 2, 3, true);
        let none = |_| ANY;
        let query = Expr::And(vec![
            prim(AtomPrim::Element {
                number: 7,
                aromatic: Some(true),
            }),
            prim(AtomPrim::TotalH(1)),
            prim(AtomPrim::Connectivity(3)),
            prim(AtomPrim::RingSize(Some(5))),
        ]);
        assert!(accepts(of_expr(&query, &none), nh));
        let amine = prim(AtomPrim::Element {
            number: 7,
            aromatic: Some(false),
        });
        assert!(!accepts(of_expr(&amine, &none), nh));
        assert!(!accepts(
            of_expr(&prim(AtomPrim::RingCount(Some(0))), &none),
            nh
        ));
        assert!(!accepts(of_expr(&prim(AtomPrim::Charge(1)), &none), nh));
        // `!` and `,` never reject what one of their terms accepts.
        let not = Expr::Not(Box::new(prim(AtomPrim::Aromatic)));
        assert!(accepts(of_expr(&not, &none), nh));
        let or = Expr::Or(vec![prim(AtomPrim::Charge(1)), prim(AtomPrim::TotalH(1))]);
        assert!(accepts(of_expr(&or, &none), nh));
        // Counts past the last bit share it: H5 is screened as "4 or more".
        let many = of_atom(false, -3, 5, 7, 9, false);
        assert!(accepts(of_expr(&prim(AtomPrim::TotalH(4)), &none), many));
        assert!(accepts(of_expr(&prim(AtomPrim::Charge(-2)), &none), many));
        // Shape: three pattern bonds need three neighbours; a pattern cycle needs a ring.
        assert!(!accepts(of_shape(3, false), nh));
        assert!(accepts(of_shape(2, true), nh));
        assert!(!accepts(
            of_shape(1, true),
            of_atom(false, 0, 3, 1, 4, false)
        ));
        assert!(accepts(of_shape(9, false), many));
        assert!(possible(ANY, nh));
        assert!(!possible(only(RING, 0), nh));
    }
}
