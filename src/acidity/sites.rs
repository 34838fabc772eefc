//! Finding sites: every group pattern is matched against the molecule in table order, and the
//! first row that has an atom as its site claims that atom. Rows of kind `none` claim atoms
//! too, which is how amide nitrogens and alcohols are kept from ever being reported as sites;
//! those with a constant beyond water's range come back marked `beyond_water`.

use serde::Serialize;

use super::group::{Group, Kind};
use crate::chem::molecule::Molecule;
use crate::chem::smarts::Target;

/// One ionizable atom with its pKa estimate.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Site {
    /// Atom index in the molecule (heavy atoms in SMILES order).
    pub atom: usize,
    /// Name of the group row that matched.
    pub group: String,
    pub kind: Kind,
    pub pka: f64,
    pub pka_low: f64,
    pub pka_high: f64,
    /// Where the value comes from.
    pub source: String,
    /// A group whose constant lies beyond water's range (`Group::beyond_water`): it stays
    /// neutral in water and is listed beside the sites, never as one.
    #[serde(skip)]
    pub beyond_water: bool,
    /// The estimate carries Hammett terms for the substituents of the site's ring (set by
    /// `estimate`): an always-ionized substituent there (sulfonate) acts through its sigma,
    /// which is the anion's, so the site interplay must not count its charge again.
    #[serde(skip)]
    pub ring_corrected: bool,
    /// For a site on or next to a six-membered aromatic ring corrected by a Hammett series:
    /// that series' rho and the ring atom nearest the site (set by `estimate`), so that the
    /// interplay can weigh another site's ionization on that ring by its change of sigma.
    #[serde(skip)]
    pub ring: Option<RingSite>,
    /// The atoms of the match that claimed the site: where the group has no series, or its
    /// series finds no ring to correct by, what hangs on them widens the range uncorrected.
    #[serde(skip)]
    pub matched: Vec<usize>,
}

/// A Hammett-corrected site's series slope and ring atom (see `Site::ring`).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct RingSite {
    pub rho: f64,
    pub ipso: usize,
    /// Which constant the series takes for para groups.
    pub para: super::substituent::Para,
}

/// The sites of `mol` under `groups` (table order is priority), sorted by atom index.
pub fn find_sites(mol: &Molecule, groups: &[Group]) -> Vec<Site> {
    // Ring facts and sorted neighbours once for the whole table, not once per pattern.
    find_sites_in(&Target::new(mol), groups)
}

/// As `find_sites`, on a molecule already prepared for matching.
pub fn find_sites_in(target: &Target, groups: &[Group]) -> Vec<Site> {
    let mol = target.molecule();
    let mut claimed: Vec<Option<usize>> = vec![None; mol.atoms.len()];
    let mut matched: Vec<Vec<usize>> = vec![Vec::new(); mol.atoms.len()];
    // The screening facts of the atoms not claimed yet, each kind once (a molecule has a few
    // kinds of atom, many times over), redone after each claim.
    let free_kinds = |claimed: &[Option<usize>]| {
        let mut kinds: Vec<(u128, u64)> = Vec::new();
        for a in (0..claimed.len()).filter(|&a| claimed[a].is_none()) {
            let facts = target.screen_facts(a);
            if !kinds.contains(&facts) {
                kinds.push(facts);
            }
        }
        kinds
    };
    let mut free = free_kinds(&claimed);
    for (g, group) in groups.iter().enumerate() {
        // A row can only claim a free atom its site atom may stand on; when there is none
        // left, its matches would all be ignored, so they are not searched for.
        let screen = group.pattern.screen(group.site);
        if !free.iter().any(|&f| Target::facts_pass(f, screen)) {
            continue;
        }
        let mut claims = false;
        group.pattern.for_each_match(target, |m| {
            let atom = m[group.site];
            if claimed[atom].is_none() {
                claimed[atom] = Some(g);
                matched[atom] = m.to_vec();
                claims = true;
            }
        });
        if claims {
            free = free_kinds(&claimed);
        }
    }
    claimed
        .iter()
        .zip(matched)
        .enumerate()
        .filter_map(|(atom, (g, matched))| {
            let group = &groups[(*g)?];
            Some(Site {
                atom,
                group: group.name.clone(),
                kind: group.kind.or(group.beyond_water)?,
                pka: group.pka,
                pka_low: group.pka_low,
                pka_high: group.pka_high,
                source: group.source.clone(),
                beyond_water: group.kind.is_none(),
                ring_corrected: false,
                ring: None,
                matched,
            })
        })
        .collect()
}
