//! The subgraph matcher: a depth-first backtracking search (VF2-style) that places pattern
//! atoms in written order, each one next to the molecule atom already holding its pattern
//! parent, and checks ring-closure bonds as soon as both ends are placed.
//!
//! Candidates are tried in ascending atom index, so embeddings come out in lexicographic order
//! of their tuples. Atom tests are memoised per (pattern atom, molecule atom) and recursive
//! `$(...)` results per (sub-pattern, molecule atom), for the whole call.

use std::cell::RefCell;

use super::query::{AtomPrim, BondExpr, BondPrim, QueryGraph};
use super::signature;
use super::target::Target;
use crate::chem::molecule::Order;

/// Atom placements one matching call may try. Dot-separated parts can be placed in every order
/// (`*.*.*.*.*.*` on 30 atoms is 30^6 placements), so a search stops here and reports what it
/// found; the group and atom-type tables need a few thousand at most on drug-sized molecules.
/// (RDKit bounds the same search by stopping after 1,000 matches by default.)
const STEP_BUDGET: usize = 2_000_000;

const UNKNOWN: u8 = 0;
const YES: u8 = 1;
const NO: u8 = 2;

/// The buffers of a finished matching call, kept per thread for the next one: a table of a
/// hundred patterns run on every row of a batch would otherwise allocate and free them (memo
/// tables, search states) for each pattern that passes the element screen.
#[derive(Default)]
struct Scratch {
    memo: Vec<Vec<u8>>,
    anchored: Vec<Vec<u8>>,
    spare: Vec<State>,
}

thread_local! {
    static SCRATCH: RefCell<Scratch> = RefCell::new(Scratch::default());
}

/// Everything one matching call shares across its main and recursive searches.
pub(crate) struct Context<'a, 'm> {
    target: &'a Target<'m>,
    main: &'a QueryGraph,
    recursive: &'a [QueryGraph],
    /// Per graph (recursive ones first, main last): atom-test memo, pattern atom × molecule atom.
    /// Empty until the graph's first atom test: most patterns of a table are rejected by the
    /// element screen and never pay for one.
    memo: Vec<Vec<u8>>,
    /// Per recursive graph: does it match anchored at each molecule atom (empty until asked).
    anchored: Vec<Vec<u8>>,
    /// Search buffers handed back by finished searches, so that the anchored searches of a
    /// recursive `$(...)` (one per molecule atom) reuse them instead of allocating.
    spare: Vec<State>,
    /// Placements tried so far, against `STEP_BUDGET`.
    steps: usize,
}

impl<'a, 'm> Context<'a, 'm> {
    pub fn new(target: &'a Target<'m>, main: &'a QueryGraph, recursive: &'a [QueryGraph]) -> Self {
        // A context made while another one of this thread holds the buffers starts empty.
        let mut scratch = SCRATCH
            .try_with(|s| s.try_borrow_mut().map(|mut s| std::mem::take(&mut *s)))
            .ok()
            .and_then(Result::ok)
            .unwrap_or_default();
        // An empty memo table means "not started" (filled on the graph's first atom test).
        for table in [&mut scratch.memo, &mut scratch.anchored] {
            table.iter_mut().for_each(Vec::clear);
        }
        if scratch.memo.len() < recursive.len() + 1 {
            scratch.memo.resize_with(recursive.len() + 1, Vec::new);
        }
        if scratch.anchored.len() < recursive.len() {
            scratch.anchored.resize_with(recursive.len(), Vec::new);
        }
        Context {
            target,
            main,
            recursive,
            memo: scratch.memo,
            anchored: scratch.anchored,
            spare: scratch.spare,
            steps: 0,
        }
    }

    /// Whether `graph` cannot embed in `target` at all: more atoms than the molecule, or an
    /// atom whose allowed elements occur nowhere in it.
    pub fn screened_out(target: &Target, graph: &QueryGraph) -> bool {
        graph.atoms.len() > target.atom_count()
            || graph.elements.iter().any(|&e| e & target.elements == 0)
            || graph
                .signatures
                .iter()
                .any(|&s| !signature::possible(s, target.present))
    }

    /// Index of the main graph in `memo`.
    pub fn main_id(&self) -> usize {
        self.recursive.len()
    }

    fn graph(&self, id: usize) -> &'a QueryGraph {
        if id == self.recursive.len() {
            self.main
        } else {
            &self.recursive[id]
        }
    }

    /// Runs the search for graph `id`; `anchor` pins its first atom. `report` receives each
    /// embedding (pattern atom → molecule atom) and returns `true` to stop.
    pub fn search(
        &mut self,
        id: usize,
        anchor: Option<usize>,
        report: &mut dyn FnMut(&[usize]) -> bool,
    ) {
        let graph = self.graph(id);
        if Self::screened_out(self.target, graph) {
            return;
        }
        let mut state = self.spare.pop().unwrap_or_else(|| State {
            id,
            anchor,
            map: Vec::new(),
            used: Vec::new(),
        });
        state.id = id;
        state.anchor = anchor;
        state.map.clear();
        state.map.resize(graph.atoms.len(), usize::MAX);
        state.used.clear();
        state.used.resize(self.target.atom_count(), false);
        self.extend(&mut state, 0, report);
        self.spare.push(state);
    }

    /// Places pattern atom `k`; returns `true` when the caller asked to stop.
    fn extend(
        &mut self,
        state: &mut State,
        k: usize,
        report: &mut dyn FnMut(&[usize]) -> bool,
    ) -> bool {
        let graph = self.graph(state.id);
        if k == graph.atoms.len() {
            return report(&state.map);
        }
        let target = self.target;
        let (elements, signature) = (graph.elements[k], graph.signatures[k]);
        // The cheap screens (free, element, coarse properties) run here, before a call: most
        // candidates fail them. Each candidate counts as a placement tried, screened or not.
        match graph.steps[k].parent {
            Some((p, qb)) => {
                for &(m, b) in target.neighbours_of(state.map[p]) {
                    if bond_ok(target, &graph.bonds[qb].expr, b)
                        && self.candidate(state, k, m, (elements, signature), report)
                    {
                        return true;
                    }
                }
            }
            None => {
                let range = match state.anchor.filter(|_| k == 0) {
                    Some(a) => a..a + 1,
                    None => 0..target.atom_count(),
                };
                for m in range {
                    if self.candidate(state, k, m, (elements, signature), report) {
                        return true;
                    }
                }
            }
        }
        false
    }

    /// One candidate `m` for pattern atom `k` (its parent bond already passed): counted
    /// against the step budget, screened (free, element, coarse properties), then placed.
    /// Returns `true` when the search is to stop.
    #[inline]
    fn candidate(
        &mut self,
        state: &mut State,
        k: usize,
        m: usize,
        (elements, signature): (u128, u64),
        report: &mut dyn FnMut(&[usize]) -> bool,
    ) -> bool {
        self.steps += 1;
        if self.steps > STEP_BUDGET {
            return true;
        }
        let target = self.target;
        if state.used[m]
            || !target.element_in(m, elements)
            || !signature::accepts(signature, target.signature[m])
        {
            return false;
        }
        self.place(state, k, m, report)
    }

    /// Tries molecule atom `m` for pattern atom `k` (its parent bond and the cheap screens
    /// already passed): atom test, ring-closure bonds, then the rest of the pattern.
    fn place(
        &mut self,
        state: &mut State,
        k: usize,
        m: usize,
        report: &mut dyn FnMut(&[usize]) -> bool,
    ) -> bool {
        let graph = self.graph(state.id);
        if !self.atom_ok(state.id, k, m) {
            return false;
        }
        let target = self.target;
        let closed = graph.steps[k].closures.iter().all(|&(j, qb)| {
            target
                .bond_between(m, state.map[j])
                .is_some_and(|b| bond_ok(target, &graph.bonds[qb].expr, b))
        });
        if !closed {
            return false;
        }
        state.map[k] = m;
        state.used[m] = true;
        let stop = self.extend(state, k + 1, report);
        state.used[m] = false;
        state.map[k] = usize::MAX;
        stop
    }

    /// Whether `mapping` (pattern atom → molecule atom) is an embedding of graph `id`: distinct
    /// atoms, every atom test true, every pattern bond present in the molecule and accepted.
    pub fn is_embedding(&mut self, id: usize, mapping: &[usize]) -> bool {
        let graph = self.graph(id);
        let n = self.target.atom_count();
        if mapping.len() != graph.atoms.len() || mapping.iter().any(|&m| m >= n) {
            return false;
        }
        let mut used = vec![false; n];
        for (k, &m) in mapping.iter().enumerate() {
            if std::mem::replace(&mut used[m], true) || !self.atom_ok(id, k, m) {
                return false;
            }
        }
        let target = self.target;
        graph.bonds.iter().all(|q| {
            target
                .bond_between(mapping[q.a], mapping[q.b])
                .is_some_and(|b| bond_ok(target, &q.expr, b))
        })
    }

    /// Whether pattern atom `k` of graph `id` accepts molecule atom `m` (memoised).
    fn atom_ok(&mut self, id: usize, k: usize, m: usize) -> bool {
        let n = self.target.atom_count();
        let slot = k * n + m;
        if self.memo[id].is_empty() {
            let len = self.graph(id).atoms.len() * n;
            self.memo[id].resize(len, UNKNOWN);
        }
        match self.memo[id][slot] {
            YES => return true,
            NO => return false,
            _ => {}
        }
        let graph = self.graph(id);
        let ok = graph.atoms[k].expr.eval(&mut |p| self.atom_prim(p, m));
        self.memo[id][slot] = if ok { YES } else { NO };
        ok
    }

    fn atom_prim(&mut self, prim: &AtomPrim, m: usize) -> bool {
        let t = self.target;
        let mol = t.mol;
        let atom = &mol.atoms[m];
        let count = |want: Option<u8>, have: usize| match want {
            None => have > 0,
            Some(n) => have == n as usize,
        };
        match *prim {
            AtomPrim::Any | AtomPrim::Chirality => true,
            AtomPrim::Aromatic => atom.aromatic,
            AtomPrim::Aliphatic => !atom.aromatic,
            AtomPrim::Element { number, aromatic } => {
                atom.element == number && aromatic.is_none_or(|a| a == atom.aromatic)
            }
            AtomPrim::Isotope(n) => atom.isotope.unwrap_or(0) == n,
            AtomPrim::Charge(c) => atom.charge == c,
            // RDKit counts hydrogens kept as atoms (`[2H]`) too: `[CH1]` matches the C of
            // `[2H]C(Cl)(Cl)Cl` (checked with RDKit 2026.09.1).
            AtomPrim::TotalH(n) => t.total_h[m] == n as u16,
            // RDKit 2026.09 counts bracket hydrogens as implicit too (checked: `[h3]` matches
            // the N of C[NH3+]), so with hydrogens folded into atoms `h` is the total count.
            AtomPrim::ImplicitH(n) => count(n, atom.hydrogens() as usize),
            AtomPrim::Degree(n) => mol.degree(m) == n as usize,
            AtomPrim::Connectivity(n) => mol.connectivity(m) == n as usize,
            AtomPrim::Valence(n) => mol.valence(m) == n as usize,
            AtomPrim::RingCount(n) => count(n, t.ring_count(m)),
            AtomPrim::RingSize(None) => t.smallest_ring(m) > 0,
            AtomPrim::RingSize(Some(n)) => t.smallest_ring(m) == n as usize,
            AtomPrim::RingBonds(n) => count(n, t.ring_bonds(m)),
            AtomPrim::Recursive(r) => self.recursive_match(r, m),
        }
    }

    /// Whether recursive pattern `r` matches with its first atom on `m` (memoised).
    fn recursive_match(&mut self, r: usize, m: usize) -> bool {
        if self.anchored[r].is_empty() {
            self.anchored[r].resize(self.target.atom_count(), UNKNOWN);
        }
        match self.anchored[r][m] {
            YES => return true,
            NO => return false,
            _ => {}
        }
        let mut found = false;
        self.search(r, Some(m), &mut |_| {
            found = true;
            true
        });
        self.anchored[r][m] = if found { YES } else { NO };
        found
    }
}

impl Drop for Context<'_, '_> {
    fn drop(&mut self) {
        let scratch = Scratch {
            memo: std::mem::take(&mut self.memo),
            anchored: std::mem::take(&mut self.anchored),
            spare: std::mem::take(&mut self.spare),
        };
        // Nothing to keep them in while the thread is ending or another context holds them.
        let _ = SCRATCH.try_with(|s| {
            if let Ok(mut s) = s.try_borrow_mut() {
                *s = scratch;
            }
        });
    }
}

/// The state of one search: which molecule atom holds each placed pattern atom.
struct State {
    id: usize,
    anchor: Option<usize>,
    map: Vec<usize>,
    used: Vec<bool>,
}

fn bond_ok(target: &Target, expr: &BondExpr, bond: usize) -> bool {
    expr.eval(&mut |p| match p {
        BondPrim::Single => target.plain(bond, Order::Single),
        BondPrim::Double => target.plain(bond, Order::Double),
        BondPrim::Triple => target.plain(bond, Order::Triple),
        BondPrim::Aromatic => target.mol.bonds[bond].aromatic,
        BondPrim::Any => true,
        BondPrim::Ring => target.bond_in_ring(bond),
        BondPrim::Implicit => {
            let b = &target.mol.bonds[bond];
            b.aromatic || b.order == Order::Single
        }
    })
}
