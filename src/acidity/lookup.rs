//! Which substituent row describes the group hanging off an atom: every substituent pattern is
//! matched once per molecule, and a question "what is attached at atom `a`, coming from `from`"
//! takes the first row (table order) with an embedding anchored on `a` that does not use `from`.

use super::substituent::{Position, Substituent};
use crate::chem::molecule::Molecule;
use crate::chem::smarts::Target;

/// The substituent embeddings of one molecule.
pub struct Lookup<'a> {
    rows: &'a [Substituent],
    /// Per row, every embedding (molecule atoms in pattern order).
    embeddings: Vec<Vec<Vec<usize>>>,
}

impl<'a> Lookup<'a> {
    pub fn new(mol: &Molecule, rows: &'a [Substituent]) -> Lookup<'a> {
        let target = Target::new(mol);
        let embeddings = rows
            .iter()
            .map(|r| r.pattern.anchored_matches_in(&target))
            .collect();
        Lookup { rows, embeddings }
    }

    /// The first row of `position` anchored on `atom` whose embedding avoids `from`.
    pub fn at(
        &self,
        atom: usize,
        from: Option<usize>,
        position: Position,
    ) -> Option<&'a Substituent> {
        self.rows
            .iter()
            .zip(&self.embeddings)
            .filter(|(row, _)| row.position == position)
            .find(|(_, found)| {
                found
                    .iter()
                    .any(|m| m[0] == atom && from.is_none_or(|f| !m.contains(&f)))
            })
            .map(|(row, _)| row)
    }
}
