//! Which substituent row describes the group hanging off an atom: a question "what is attached
//! at atom `a`, coming from `from`" takes the first row (table order) with an embedding
//! anchored on `a` that does not use `from`.
//!
//! A row's embeddings are found the first time a question needs them and kept for the rest of
//! the molecule; a row whose first pattern atom cannot stand on `a` by the cheap screens (element
//! and coarse properties) has no embedding anchored there and is passed over unmatched.

use std::cell::OnceCell;

use super::substituent::{Position, Substituent};
use crate::chem::molecule::Molecule;
use crate::chem::smarts::Target;

/// The substituent embeddings of one molecule, found as asked for.
pub struct Lookup<'a, 'm> {
    rows: &'a [Substituent],
    target: Target<'m>,
    /// Per row, every embedding (molecule atoms in pattern order), once searched.
    embeddings: Vec<OnceCell<Vec<Vec<usize>>>>,
}

impl<'a, 'm> Lookup<'a, 'm> {
    pub fn new(mol: &'m Molecule, rows: &'a [Substituent]) -> Lookup<'a, 'm> {
        Lookup::with_target(Target::new(mol), rows)
    }

    /// As `new`, on a molecule already prepared for matching.
    pub fn with_target(target: Target<'m>, rows: &'a [Substituent]) -> Lookup<'a, 'm> {
        Lookup {
            rows,
            target,
            embeddings: rows.iter().map(|_| OnceCell::new()).collect(),
        }
    }

    /// The first row of `position` anchored on `atom` whose embedding avoids `from`.
    pub fn at(
        &self,
        atom: usize,
        from: Option<usize>,
        position: Position,
    ) -> Option<&'a Substituent> {
        self.at_with(atom, from, position).map(|(row, _)| row)
    }

    /// As `at`, with the embedding that matched (molecule atoms in pattern order).
    pub fn at_with(
        &self,
        atom: usize,
        from: Option<usize>,
        position: Position,
    ) -> Option<(&'a Substituent, &[usize])> {
        let rows = self.rows;
        rows.iter()
            .zip(&self.embeddings)
            .filter(|(row, _)| row.position == position)
            .find_map(|(row, found)| {
                if !row.pattern.may_start_at(&self.target, atom) {
                    return None;
                }
                found
                    .get_or_init(|| row.pattern.anchored_matches_in(&self.target))
                    .iter()
                    .find(|m| m[0] == atom && from.is_none_or(|f| !m.contains(&f)))
                    .map(|m| (row, m.as_slice()))
            })
    }
}
