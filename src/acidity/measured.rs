//! Measured values in place of estimates: when a compound's neutral parent is a structure with
//! stored constants (the user's own, else the built-in handbook rows), those constants replace
//! the site estimates, and each site says where its value came from.
//!
//! Stored constants are macroscopic and carry only a kind, not an atom. They are given to the
//! sites of the same kind in pKa order (lowest measured acid constant to the site estimated most
//! acidic, and so on). When the counts differ, the measured values still win: acids are paired
//! from the most acidic site up and bases from the most basic site down, so the first proton
//! lost and the first proton gained are the measured ones; a site left over keeps its estimate
//! and a value left over is kept in a note.

use std::collections::{HashMap, HashSet};
use std::sync::OnceLock;
use std::sync::atomic::{AtomicUsize, Ordering};

use serde::Serialize;

use super::group::Kind;
use super::sites::Site;
use crate::chem::canon::fragment_key;
use crate::chem::components::Compound;
use crate::chem::molecule::Molecule;
use crate::error::Result;
use crate::store::Store;

/// Where a compound's pKa values come from.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
#[serde(rename_all = "lowercase")]
pub enum Origin {
    /// The user's own stored value (`phdose db add`).
    User,
    /// A built-in handbook value (`data/measured.csv`).
    Measured,
    /// The group estimate.
    Estimate,
    /// Several parents of one input with different origins.
    Mixed,
}

/// One stored constant with the text its sites will carry as `source`.
#[derive(Debug, Clone, PartialEq)]
pub struct Stored {
    pub kind: Kind,
    pub pka: f64,
    pub source: String,
}

/// Stored constants by canonical key: the user's and the built-in ones.
///
/// A table read by `from_store` also holds the heavy-atom formulas of its keys, so that a
/// parent whose formula no stored structure has is passed over without computing its key (the
/// key is the costliest step of a batch row). A table built or edited by hand is not screened
/// until `screen_keys` is called: every parent's key is computed.
#[derive(Debug, Clone, Default)]
pub struct MeasuredTable {
    pub user: HashMap<String, Vec<Stored>>,
    pub builtin: HashMap<String, Vec<Stored>>,
    screen: Screen,
}

/// Lookups made without the formula screen before `from_store`'s table builds it: reading
/// every stored key back (about 1.5 ms for the built-in rows) raised the cold start of one
/// `pka CCO` by a third, while a batch pays it once.
const LOOKUPS_BEFORE_SCREEN: usize = 100;

/// The formula screen of a table (see `MeasuredTable`).
#[derive(Debug, Default)]
struct Screen {
    /// Whether the table is to be screened at all.
    wanted: bool,
    /// Lookups made so far without a screen.
    lookups: AtomicUsize,
    /// Formulas of every key of `user` and `builtin`, with the number of keys they were taken
    /// from; `None` when some key could not be read back.
    formulas: OnceLock<Option<(HashSet<Formula>, usize)>>,
}

impl Clone for Screen {
    fn clone(&self) -> Self {
        Screen {
            wanted: self.wanted,
            lookups: AtomicUsize::new(self.lookups.load(Ordering::Relaxed)),
            formulas: self.formulas.clone(),
        }
    }
}

/// Heavy-atom formula, (atomic number, count) ascending, and the heavy-atom degrees (bonds
/// to other heavy atoms), ascending. Hydrogens are left out: a key may carry them as counts or
/// as atoms. Equal keys have equal formulas and degrees, since a key writes every heavy atom
/// of its structure once and every bond between them; the degrees tell most isomers apart.
type Formula = (Vec<(u8, u32)>, Vec<u16>);

/// The `Formula` of `atoms` of `mol` (a whole component: every neighbour is among them).
fn formula(mol: &Molecule, atoms: impl Iterator<Item = usize>) -> Formula {
    let mut counts: Vec<(u8, u32)> = Vec::new();
    let mut degrees = Vec::new();
    for a in atoms.filter(|&a| mol.atoms[a].element != 1) {
        let e = mol.atoms[a].element;
        match counts.binary_search_by_key(&e, |&(el, _)| el) {
            Ok(i) => counts[i].1 += 1,
            Err(i) => counts.insert(i, (e, 1)),
        }
        let heavy = mol.adjacency[a]
            .iter()
            .filter(|&&(nb, _)| mol.atoms[nb].element != 1)
            .count();
        degrees.push(heavy.min(u16::MAX as usize) as u16);
    }
    degrees.sort_unstable();
    (counts, degrees)
}

/// What applying the table did to one input.
#[derive(Debug, Clone, PartialEq)]
pub struct Applied {
    pub origin: Origin,
    /// Origin of each parent's values, in `Compound::parents` order.
    pub parents: Vec<Origin>,
    pub notes: Vec<String>,
}

impl MeasuredTable {
    /// Both tables from the store.
    pub fn from_store(store: &Store) -> Result<MeasuredTable> {
        let mut table = MeasuredTable::default();
        for r in store.user_measured()? {
            let note = if r.note.is_empty() {
                String::new()
            } else {
                format!("{}, ", r.note)
            };
            table.user.entry(r.key).or_default().push(Stored {
                kind: r.kind,
                pka: r.pka,
                source: format!("measured (user): {note}added {} (id {})", r.added, r.id),
            });
        }
        for r in store.builtin_measured()? {
            table.builtin.entry(r.key).or_default().push(Stored {
                kind: r.kind,
                pka: r.pka,
                source: format!("measured: {}, {} °C", r.source, r.temperature),
            });
        }
        // Built on first need (`LOOKUPS_BEFORE_SCREEN`).
        table.screen.wanted = true;
        Ok(table)
    }

    /// Records the formula of every stored key now (see the type doc); call again after
    /// editing `user` or `builtin`. A key that does not read back as SMILES turns it off.
    pub fn screen_keys(&mut self) {
        self.screen = Screen {
            wanted: true,
            lookups: AtomicUsize::new(0),
            formulas: OnceLock::from(self.formulas()),
        };
    }

    fn formulas(&self) -> Option<(HashSet<Formula>, usize)> {
        let keys = self.user.keys().chain(self.builtin.keys());
        let formulas: Option<HashSet<Formula>> = keys
            .map(|k| {
                let mol = Molecule::from_smiles(k).ok()?;
                Some(formula(&mol, 0..mol.atoms.len()))
            })
            .collect();
        formulas.map(|f| (f, self.user.len() + self.builtin.len()))
    }

    /// Whether some stored key may be that of the atoms `atoms` of `mol` (false: none is).
    fn may_hold(&self, mol: &Molecule, atoms: &[usize]) -> bool {
        if self.user.is_empty() && self.builtin.is_empty() {
            // `--estimate-only` runs with an empty table.
            return false;
        }
        if !self.screen.wanted {
            return true;
        }
        let screen = match self.screen.formulas.get() {
            Some(screen) => screen,
            None if self.screen.lookups.fetch_add(1, Ordering::Relaxed) < LOOKUPS_BEFORE_SCREEN => {
                return true;
            }
            None => self.screen.formulas.get_or_init(|| self.formulas()),
        };
        match screen {
            // A count that moved means the maps were edited after screening: trust nothing.
            Some((formulas, n)) if *n == self.user.len() + self.builtin.len() => {
                formulas.contains(&formula(mol, atoms.iter().copied()))
            }
            _ => true,
        }
    }

    /// The constants that apply to a structure key: the user's, else the built-in ones.
    pub fn lookup(&self, key: &str) -> Option<(Origin, &[Stored])> {
        if let Some(v) = self.user.get(key) {
            return Some((Origin::User, v));
        }
        self.builtin
            .get(key)
            .map(|v| (Origin::Measured, v.as_slice()))
    }

    /// Replaces the estimates of every parent that has stored constants.
    pub fn apply(&self, compound: &Compound, sites: &mut [Site]) -> Applied {
        let mut origins = Vec::new();
        let mut notes = Vec::new();
        for parent in &compound.parents {
            if !self.may_hold(&compound.neutral, &parent.atoms) {
                origins.push(Origin::Estimate);
                continue;
            }
            let key = fragment_key(&compound.neutral, &parent.atoms);
            let Some((origin, stored)) = self.lookup(&key) else {
                origins.push(Origin::Estimate);
                continue;
            };
            let mut used = 0;
            for kind in [Kind::Acid, Kind::Base] {
                let mut own: Vec<&mut Site> = sites
                    .iter_mut()
                    .filter(|s| s.kind == kind && parent.atoms.contains(&s.atom))
                    .collect();
                let mut values: Vec<&Stored> = stored.iter().filter(|c| c.kind == kind).collect();
                used += assign(&mut own, &mut values, kind, &mut notes);
            }
            // A stored value that found no site to sit on leaves the estimates in charge.
            origins.push(if used > 0 { origin } else { Origin::Estimate });
        }
        let origin = match origins.split_first() {
            None => Origin::Estimate,
            Some((first, rest)) if rest.iter().all(|o| o == first) => *first,
            Some(_) => Origin::Mixed,
        };
        Applied {
            origin,
            parents: origins,
            notes,
        }
    }
}

/// Pairs the measured constants of one kind with the sites of that kind (module doc); returns
/// how many sites received a measured value.
fn assign(
    sites: &mut [&mut Site],
    values: &mut [&Stored],
    kind: Kind,
    notes: &mut Vec<String>,
) -> usize {
    sites.sort_by(|a, b| a.pka.total_cmp(&b.pka));
    values.sort_by(|a, b| a.pka.total_cmp(&b.pka));
    if sites.is_empty() && !values.is_empty() {
        let list: Vec<String> = values.iter().map(|v| format!("{:.2}", v.pka)).collect();
        notes.push(format!(
            "measured {} pKa {} not used: phdose finds no {} site in this structure",
            kind.as_str(),
            list.join(", "),
            kind.as_str()
        ));
        return 0;
    }
    if values.is_empty() {
        if !sites.is_empty() {
            notes.push(format!(
                "no measured {} constant: {} {} site(s) keep their estimate",
                kind.as_str(),
                sites.len(),
                kind.as_str()
            ));
        }
        return 0;
    }
    if sites.len() != values.len() {
        notes.push(format!(
            "{} measured {} constant(s) but {} {} site(s) found; the measured values are \
             given to the {} sites{}",
            values.len(),
            kind.as_str(),
            sites.len(),
            kind.as_str(),
            if kind == Kind::Acid {
                "most acidic"
            } else {
                "most basic"
            },
            leftover(sites.len(), values, kind),
        ));
    }
    let n = sites.len().min(values.len());
    let (site_range, value_range) = match kind {
        Kind::Acid => (0..n, 0..n),
        Kind::Base => (sites.len() - n..sites.len(), values.len() - n..values.len()),
    };
    for (site, value) in sites[site_range].iter_mut().zip(&values[value_range]) {
        site.pka = value.pka;
        site.pka_low = value.pka;
        site.pka_high = value.pka;
        site.source = value.source.clone();
    }
    n
}

/// The measured values no site received, for the note.
fn leftover(site_count: usize, values: &[&Stored], kind: Kind) -> String {
    if values.len() <= site_count {
        return String::new();
    }
    let extra = values.len() - site_count;
    let unused = match kind {
        Kind::Acid => &values[site_count..],
        Kind::Base => &values[..extra],
    };
    let list: Vec<String> = unused.iter().map(|v| format!("{:.2}", v.pka)).collect();
    format!("; not assigned to any site: pKa {}", list.join(", "))
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::chem::canon::key;
    use crate::chem::components::split;
    use crate::chem::molecule::Molecule;

    fn site(atom: usize, kind: Kind, pka: f64) -> Site {
        Site {
            atom,
            group: "test".into(),
            kind,
            pka,
            pka_low: pka - 1.0,
            pka_high: pka + 1.0,
            source: "estimate".into(),
            beyond_water: false,
            ring_corrected: false,
            ring: None,
            matched: Vec::new(),
        }
    }

    fn stored(kind: Kind, pka: f64, source: &str) -> Stored {
        Stored {
            kind,
            pka,
            source: source.into(),
        }
    }

    /// Glycine, spelled as its hydrochloride: the sites sit on the written atom indices.
    fn glycine() -> Compound {
        split(&Molecule::from_smiles("[NH3+]CC(=O)O.[Cl-]").unwrap()).unwrap()
    }

    #[test]
    fn the_formula_screen_passes_stored_structures_only() {
        let mut table = MeasuredTable::default();
        // Glycine 2.34 and 9.60: CRC Handbook amino acid table (from memory).
        table.builtin.insert(
            key("NCC(=O)O").unwrap(),
            vec![stored(Kind::Acid, 2.34, "handbook")],
        );
        let gly = glycine();
        assert!(!MeasuredTable::default().may_hold(&gly.neutral, &gly.parents[0].atoms));
        table.screen_keys();
        assert!(table.may_hold(&gly.neutral, &gly.parents[0].atoms));
        let mut sites = vec![site(0, Kind::Base, 9.0), site(4, Kind::Acid, 3.5)];
        assert_eq!(table.apply(&gly, &mut sites).origin, Origin::Measured);
        // Alanine has one more carbon: passed over without a key.
        let ala = split(&Molecule::from_smiles("CC(N)C(=O)O").unwrap()).unwrap();
        assert!(!table.may_hold(&ala.neutral, &ala.parents[0].atoms));
        // An isomer with another skeleton (a chain of two-bonded atoms): passed over too.
        let iso = split(&Molecule::from_smiles("NOCC=O").unwrap()).unwrap();
        assert!(!table.may_hold(&iso.neutral, &iso.parents[0].atoms));
        // Explicit hydrogen atoms do not count.
        let gly_h = split(&Molecule::from_smiles("[H]OC(=O)CN").unwrap()).unwrap();
        assert!(table.may_hold(&gly_h.neutral, &gly_h.parents[0].atoms));
        // A table from the store screens once enough lookups were made without.
        let mut lazy = table.clone();
        lazy.screen = Screen {
            wanted: true,
            ..Screen::default()
        };
        for _ in 0..LOOKUPS_BEFORE_SCREEN {
            assert!(lazy.may_hold(&ala.neutral, &ala.parents[0].atoms));
        }
        assert!(!lazy.may_hold(&ala.neutral, &ala.parents[0].atoms));
        assert!(lazy.may_hold(&gly.neutral, &gly.parents[0].atoms));
        // A table edited after screening is no longer screened.
        table
            .user
            .insert("C".into(), vec![stored(Kind::Acid, 50.0, "mine")]);
        assert!(table.may_hold(&ala.neutral, &ala.parents[0].atoms));
    }

    #[test]
    fn values_go_to_sites_by_kind_and_the_user_wins() {
        let mut table = MeasuredTable::default();
        let k = key("NCC(=O)O").unwrap();
        // Glycine 2.34 and 9.60: CRC Handbook amino acid table (from memory).
        table.builtin.insert(
            k.clone(),
            vec![
                stored(Kind::Base, 9.60, "handbook"),
                stored(Kind::Acid, 2.34, "handbook"),
            ],
        );
        let mut sites = vec![site(0, Kind::Base, 9.0), site(4, Kind::Acid, 3.5)];
        let applied = table.apply(&glycine(), &mut sites);
        assert_eq!(applied.origin, Origin::Measured);
        assert!(applied.notes.is_empty());
        assert_eq!((sites[0].pka, sites[1].pka), (9.60, 2.34));
        assert_eq!(sites[1].pka_low, 2.34);
        table.user.insert(
            k,
            vec![
                stored(Kind::Acid, 2.5, "mine"),
                stored(Kind::Base, 9.7, "mine"),
            ],
        );
        let applied = table.apply(&glycine(), &mut sites);
        assert_eq!(applied.origin, Origin::User);
        assert_eq!((sites[0].pka, sites[1].pka), (9.7, 2.5));
        assert_eq!(sites[0].source, "mine");
    }

    #[test]
    fn a_count_mismatch_keeps_the_measured_values_and_says_so() {
        let mut table = MeasuredTable::default();
        let k = key("NCC(=O)O").unwrap();
        table.builtin.insert(
            k,
            vec![
                stored(Kind::Acid, 2.34, "h"),
                stored(Kind::Acid, 13.0, "h"),
                stored(Kind::Base, 9.60, "h"),
            ],
        );
        let mut sites = vec![site(0, Kind::Base, 9.0), site(4, Kind::Acid, 3.5)];
        let applied = table.apply(&glycine(), &mut sites);
        assert_eq!(sites[1].pka, 2.34);
        assert_eq!(applied.notes.len(), 1);
        assert!(applied.notes[0].contains("13.00"), "{:?}", applied.notes);
    }

    #[test]
    fn a_value_without_a_site_of_its_kind_is_reported_not_claimed() {
        let mut table = MeasuredTable::default();
        table.builtin.insert(
            key("NCC(=O)O").unwrap(),
            vec![stored(Kind::Base, 9.60, "h")],
        );
        let mut sites = vec![site(4, Kind::Acid, 3.5)];
        let applied = table.apply(&glycine(), &mut sites);
        assert_eq!(applied.origin, Origin::Estimate);
        assert_eq!(sites[0].pka, 3.5);
        assert_eq!(applied.notes.len(), 2, "{:?}", applied.notes);
        assert!(applied.notes.iter().any(|n| n.contains("not used")));
        assert!(
            applied
                .notes
                .iter()
                .any(|n| n.contains("keep their estimate"))
        );
    }

    #[test]
    fn an_unknown_structure_keeps_its_estimates() {
        let table = MeasuredTable::default();
        let mut sites = vec![site(0, Kind::Base, 9.0)];
        let applied = table.apply(&glycine(), &mut sites);
        assert_eq!(applied.origin, Origin::Estimate);
        assert_eq!(sites[0].pka, 9.0);
    }
}
