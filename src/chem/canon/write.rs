//! Writing a key graph as SMILES: depth-first in rank order, ring closures with the lowest free
//! digit, bare organic-subset atoms where reading them back gives the same hydrogens. The
//! canonical key is this writer run on canonical ranks; tests run it on random ranks and other
//! spellings (Kekulé, bracketed hydrogens, other digits) to produce every kind of input.

use super::{AROMATIC, Graph};
use crate::chem::elements;

/// How `write` spells a graph. The canonical key uses aromatic atoms and bare atoms where the
/// SMILES rules allow; tests use the other spellings to check that every one reads back to
/// the same key.
#[derive(Debug, Clone, Copy)]
pub struct Style {
    /// Write aromatic rings as Kekulé double and single bonds with upper-case atoms.
    pub kekule: bool,
    /// Put every atom in brackets with its hydrogen count.
    pub brackets: bool,
    /// First ring-closure digit to use (1-9 keep one-digit labels; higher ones use `%nn`).
    pub first_digit: usize,
}

impl Style {
    pub const CANONICAL: Style = Style {
        kekule: false,
        brackets: false,
        first_digit: 1,
    };
}

/// Writes the graph as SMILES: depth-first from the lowest-ranked atom, neighbours in rank
/// order, ring closures labelled with the lowest free digit. `ranks` must give every atom of a
/// connected graph a distinct value; the result depends only on the ranks.
pub fn write(g: &Graph, ranks: &[usize], style: &Style) -> String {
    let n = g.nodes.len();
    if n == 0 {
        return String::new();
    }
    let by_rank = |list: &mut Vec<(usize, usize)>| list.sort_by_key(|&(nb, _)| ranks[nb]);
    // Pass 1: spanning tree and ring closures.
    let root = (0..n).min_by_key(|&i| ranks[i]).unwrap_or(0);
    let mut order = vec![usize::MAX; n];
    let mut children: Vec<Vec<(usize, usize)>> = vec![Vec::new(); n];
    let mut closures: Vec<Vec<(usize, usize)>> = vec![Vec::new(); n];
    let mut edge_used = vec![false; g.edges.len()];
    let mut stack = vec![(root, usize::MAX)];
    let mut next = 0;
    // An explicit stack keeps long chains from exhausting the call stack.
    while let Some((atom, via)) = stack.pop() {
        if order[atom] != usize::MAX {
            continue;
        }
        order[atom] = next;
        next += 1;
        if via != usize::MAX {
            edge_used[via] = true;
            let parent = g.edges[via].a + g.edges[via].b - atom;
            children[parent].push((atom, via));
        }
        let mut around = g.adjacency[atom].clone();
        by_rank(&mut around);
        for &(nb, e) in around.iter().rev() {
            if order[nb] == usize::MAX {
                stack.push((nb, e));
            }
        }
    }
    for (e, edge) in g.edges.iter().enumerate() {
        if !edge_used[e] && order[edge.a] != usize::MAX && order[edge.b] != usize::MAX {
            closures[edge.a].push((edge.b, e));
            closures[edge.b].push((edge.a, e));
        }
    }
    // Children order is the visiting order, which the stack already made rank order; keep
    // only those that were really reached through that edge.
    for list in &mut children {
        list.sort_by_key(|&(c, _)| order[c]);
    }
    for list in &mut closures {
        list.sort_by_key(|&(nb, _)| order[nb]);
    }
    let mut writer = Writer {
        g,
        style,
        order: &order,
        children: &children,
        closures: &closures,
        digit_of_edge: vec![None; g.edges.len()],
        digits_in_use: Vec::new(),
        out: String::new(),
    };
    writer.atom(root);
    writer.out
}

struct Writer<'a> {
    g: &'a Graph,
    style: &'a Style,
    order: &'a [usize],
    children: &'a [Vec<(usize, usize)>],
    closures: &'a [Vec<(usize, usize)>],
    digit_of_edge: Vec<Option<usize>>,
    digits_in_use: Vec<usize>,
    out: String,
}

impl Writer<'_> {
    /// Writes `start` and everything below it; walks the chain of last children in a loop so
    /// only branches recurse.
    fn atom(&mut self, start: usize) {
        let mut atom = start;
        loop {
            self.out.push_str(&atom_symbol(self.g, atom, self.style));
            // Digits closed here are freed only after this atom's openings, so no atom reads
            // like `C11` (close and reopen one label), which some readers take amiss.
            let mut freed = Vec::new();
            for &(nb, e) in &self.closures[atom] {
                if self.order[nb] < self.order[atom] {
                    // Closing: the partner opened it.
                    let digit = self.digit_of_edge[e].unwrap_or(0);
                    self.out.push_str(bond_symbol(self.g, e, self.style));
                    self.out.push_str(&digit_label(digit));
                    freed.push(digit);
                } else {
                    let digit = (self.style.first_digit..)
                        .find(|d| !self.digits_in_use.contains(d) && !freed.contains(d))
                        .unwrap_or(self.style.first_digit);
                    self.digits_in_use.push(digit);
                    self.digit_of_edge[e] = Some(digit);
                    self.out.push_str(&digit_label(digit));
                }
            }
            self.digits_in_use.retain(|d| !freed.contains(d));
            let kids = &self.children[atom];
            let Some((&(last, last_edge), branches)) = kids.split_last() else {
                return;
            };
            for &(child, e) in branches {
                self.out.push('(');
                self.out.push_str(bond_symbol(self.g, e, self.style));
                self.atom(child);
                self.out.push(')');
            }
            self.out
                .push_str(bond_symbol(self.g, last_edge, self.style));
            atom = last;
        }
    }
}

fn digit_label(d: usize) -> String {
    if d < 10 {
        d.to_string()
    } else {
        format!("%{d}")
    }
}

fn bond_symbol(g: &Graph, e: usize, style: &Style) -> &'static str {
    let edge = g.edges[e];
    let both_aromatic = g.nodes[edge.a].aromatic && g.nodes[edge.b].aromatic;
    let written_aromatic = !style.kekule;
    match (edge.kind, edge.order) {
        (AROMATIC, _) if written_aromatic => "",
        (AROMATIC, 2) => "=",
        (AROMATIC, _) => "",
        (1, _) if both_aromatic && written_aromatic => "-",
        (2, _) => "=",
        (3, _) => "#",
        (4, _) => "$",
        _ => "",
    }
}

/// Elements SMILES allows without brackets, and those with a lower-case aromatic form.
const ORGANIC: [u8; 10] = [5, 6, 7, 8, 9, 15, 16, 17, 35, 53];
const AROMATIC_FORM: [u8; 8] = [5, 6, 7, 8, 15, 16, 33, 34];

fn atom_symbol(g: &Graph, i: usize, style: &Style) -> String {
    let node = &g.nodes[i];
    let symbol = elements::by_number(node.element).map_or("*", |e| e.symbol.as_str());
    let lower = node.aromatic && !style.kekule && AROMATIC_FORM.contains(&node.element);
    let symbol = if lower {
        symbol.to_ascii_lowercase()
    } else {
        symbol.to_string()
    };
    if !style.brackets && bare_is_exact(g, i, lower) {
        return symbol;
    }
    let mut text = String::from("[");
    if let Some(iso) = node.isotope {
        text.push_str(&iso.to_string());
    }
    text.push_str(&symbol);
    match node.hydrogens {
        0 => {}
        1 => text.push('H'),
        h => text.push_str(&format!("H{h}")),
    }
    match node.charge {
        0 => {}
        1 => text.push('+'),
        -1 => text.push('-'),
        c if c > 0 => text.push_str(&format!("+{c}")),
        c => text.push_str(&format!("-{}", -c)),
    }
    text.push(']');
    text
}

/// Whether the atom written without brackets reads back with the same hydrogens: an uncharged,
/// unlabelled organic-subset atom whose hydrogens fill it to its next default valence. An
/// aromatic N, O, S or P with hydrogens needs brackets (`[nH]`), since the kekulizer reads a
/// bare one as having none.
fn bare_is_exact(g: &Graph, i: usize, lower: bool) -> bool {
    let node = &g.nodes[i];
    if node.charge != 0 || node.isotope.is_some() || !ORGANIC.contains(&node.element) {
        return false;
    }
    if node.aromatic && !lower && AROMATIC_FORM.contains(&node.element) {
        // Kekulé spelling: plain valence rule applies.
    } else if lower && node.element != 6 && node.element != 5 && node.hydrogens > 0 {
        return false;
    }
    let bonds = g.bond_sum(i);
    let valences = elements::by_number(node.element).map_or(&[][..], |e| e.valences.as_slice());
    match valences.iter().find(|&&v| v as usize >= bonds) {
        Some(&v) => v as usize - bonds == node.hydrogens as usize,
        None => false,
    }
}
