//! Interplay between the sites of one molecule: how strongly two ionized sites push on each
//! other, from the number of bonds between them (`data/site_interactions.csv`), and the
//! constants that result: macroscopic pKa values a titration would see, and for each site its
//! microscopic pKa (all other sites neutral) and the pH at which it is half ionized in the
//! molecule.
//!
//! Two sites meta or para to each other on one six-membered aromatic ring interact through the
//! ring instead: one site's series rho times the change of the other's Hammett sigma when it
//! ionizes (`data/ionized_sigma.csv`; NH2 to NH3+, COOH to COO-, OH to O-, ring N to ring NH+,
//! an amine on a carbon next to the ring to its ammonium ion), averaged over both directions
//! where both are known.
//!
//! A site's estimate is taken as its microscopic constant with every other site neutral, so
//! the pKa estimate must not itself count the charge of a neighbouring site; this module adds
//! that charge through the microstates (`equilibrium::microstates`).

use std::collections::VecDeque;
use std::sync::OnceLock;

use serde::{Deserialize, Serialize};

use super::group::Kind;
use super::profile::Profile;
use super::sites::Site as GroupSite;
use super::substituent::Para;
use crate::chem::molecule::Molecule;
use crate::equilibrium::Site;
use crate::equilibrium::microstates::{self, Coupling, MAX_COUPLED_SITES};
use crate::error::{Error, Result};

/// The embedded table of interaction shifts.
pub const SITE_INTERACTIONS_CSV: &str = include_str!("../../data/site_interactions.csv");

/// The embedded table of sigma changes on ionization (`data/ionized_sigma.csv`).
pub const IONIZED_SIGMA_CSV: &str = include_str!("../../data/ionized_sigma.csv");

#[derive(Debug, Deserialize)]
struct IonizedRow {
    group: String,
    reach: usize,
    delta_sigma_m: f64,
    delta_sigma_p: f64,
    delta_sigma_minus: f64,
    delta_sigma_minus_acceptors: f64,
    #[allow(dead_code)]
    source: String,
}

/// A reader for an embedded table: header on the first line, `#` lines are comments.
fn table_reader(text: &str) -> csv::Reader<&[u8]> {
    csv::ReaderBuilder::new()
        .comment(Some(b'#'))
        .from_reader(text.as_bytes())
}

/// One row of `data/ionized_sigma.csv`: group, bonds from the site to its ring atom, and the
/// sigma changes meta and para under each para constant (sigma_p, sigma-minus, sigma-minus
/// for acceptors only).
type Ionized = (String, usize, f64, [f64; 3]);

/// Per group name: the change of its Hammett sigma when the site ionizes.
fn ionized_sigma() -> Result<&'static [Ionized]> {
    static TABLE: OnceLock<std::result::Result<Vec<Ionized>, String>> = OnceLock::new();
    TABLE
        .get_or_init(|| {
            table_reader(IONIZED_SIGMA_CSV)
                .deserialize::<IonizedRow>()
                .map(|r| {
                    let r = r.map_err(|e| e.to_string())?;
                    let para = [
                        r.delta_sigma_p,
                        r.delta_sigma_minus,
                        r.delta_sigma_minus_acceptors,
                    ];
                    if !r.delta_sigma_m.is_finite() || !para.iter().all(|d| d.is_finite()) {
                        return Err(format!("{}: changes must be finite", r.group));
                    }
                    Ok((r.group, r.reach, r.delta_sigma_m, para))
                })
                .collect()
        })
        .as_ref()
        .map(Vec::as_slice)
        .map_err(|e| Error::Internal(format!("data/ionized_sigma.csv: {e}")))
}

/// The interaction of two sites on one six-membered aromatic ring, meta or para to each other,
/// from Hammett constants: site `i`'s rho times the change of `j`'s sigma on ionizing, taken
/// both ways where both are known and averaged. `None` when neither way applies.
fn ring_interaction(mol: &Molecule, i: &GroupSite, j: &GroupSite) -> Option<f64> {
    let table = ionized_sigma().ok()?;
    let one_way = |from: &GroupSite, to: &GroupSite| -> Option<f64> {
        let ring = from.ring?;
        let &(_, reach, m, [p, minus, minus_acceptors]) =
            table.iter().find(|row| row.0 == to.group)?;
        let p = match ring.para {
            Para::Sigma => p,
            Para::Minus => minus,
            Para::MinusForAcceptors => minus_acceptors,
        };
        let (other, bonds) = crate::acidity::hammett::ipso(mol, to.atom)?;
        // The table's change belongs to the group at its own distance from the ring.
        if bonds != reach {
            return None;
        }
        let shared = mol.rings.rings.iter().find(|r| {
            r.len() == 6
                && r.contains(&ring.ipso)
                && r.contains(&other)
                && r.iter().all(|&a| mol.atoms[a].aromatic)
        })?;
        let at = |a: usize| shared.iter().position(|&x| x == a);
        let d = at(ring.ipso)?.abs_diff(at(other)?);
        match d.min(6 - d) {
            2 => Some((ring.rho * m).abs()),
            3 => Some((ring.rho * p).abs()),
            _ => None,
        }
    };
    match (one_way(i, j), one_way(j, i)) {
        (Some(a), Some(b)) => Some((a + b) / 2.0),
        (a, b) => a.or(b),
    }
}

#[derive(Debug, Deserialize)]
struct Row {
    pair: String,
    distance: Option<usize>,
    shift: f64,
    #[allow(dead_code)]
    source: String,
}

/// Shift by distance for like and opposite charges, and the extra-path factor.
#[derive(Debug, Clone, PartialEq)]
pub struct Interactions {
    /// (distance, shift), ascending distance.
    pub like: Vec<(usize, f64)>,
    pub opposite: Vec<(usize, f64)>,
    pub extra_path: f64,
}

impl Interactions {
    /// Parses the embedded table.
    pub fn builtin() -> Result<&'static Interactions> {
        static TABLE: OnceLock<std::result::Result<Interactions, String>> = OnceLock::new();
        TABLE
            .get_or_init(|| Interactions::parse(SITE_INTERACTIONS_CSV))
            .as_ref()
            .map_err(|e| Error::Internal(format!("data/site_interactions.csv: {e}")))
    }

    fn parse(text: &str) -> std::result::Result<Interactions, String> {
        let rows: Vec<Row> = table_reader(text)
            .deserialize()
            .collect::<std::result::Result<_, _>>()
            .map_err(|e| e.to_string())?;
        let mut table = Interactions {
            like: Vec::new(),
            opposite: Vec::new(),
            extra_path: 0.0,
        };
        for row in rows {
            if !row.shift.is_finite() || row.shift < 0.0 {
                return Err(format!("shift {} must be finite and >= 0", row.shift));
            }
            match (row.pair.as_str(), row.distance) {
                ("like", Some(d)) if d > 0 => table.like.push((d, row.shift)),
                ("opposite", Some(d)) if d > 0 => table.opposite.push((d, row.shift)),
                ("extra_path", None) => table.extra_path = row.shift,
                (pair, d) => return Err(format!("unknown row: pair {pair}, distance {d:?}")),
            }
        }
        for list in [&mut table.like, &mut table.opposite] {
            list.sort_by_key(|&(d, _)| d);
            if list.is_empty() {
                return Err("both like and opposite rows are needed".into());
            }
        }
        Ok(table)
    }

    /// Shift between two ionized sites `distance` bonds apart along `paths` shortest paths
    /// (count only paths through non-aromatic atoms; 1 otherwise).
    pub fn shift(&self, like: bool, distance: usize, paths: usize) -> f64 {
        let list = if like { &self.like } else { &self.opposite };
        let one = match list.iter().find(|&&(d, _)| d >= distance) {
            Some(&(d, s)) if d == distance => s,
            // A gap inside the table: linear between neighbours.
            Some(&(d1, s1)) => match list.iter().rev().find(|&&(d, _)| d < distance) {
                Some(&(d0, s0)) => s0 + (s1 - s0) * (distance - d0) as f64 / (d1 - d0) as f64,
                None => s1,
            },
            None => {
                let (d, s) = list[list.len() - 1];
                s * d as f64 / distance.max(1) as f64
            }
        };
        one * (1.0 + self.extra_path * paths.saturating_sub(1) as f64)
    }
}

/// Bond counts and shortest-path counts from `from` to every atom. With `saturated_only`,
/// paths may pass only through non-aromatic atoms (the end atoms may be anything).
fn paths_from(mol: &Molecule, from: usize, saturated_only: bool) -> Vec<Option<(usize, usize)>> {
    let mut best: Vec<Option<(usize, usize)>> = vec![None; mol.atoms.len()];
    best[from] = Some((0, 1));
    let mut queue = VecDeque::from([from]);
    while let Some(a) = queue.pop_front() {
        let (d, count) = best[a].unwrap_or((0, 1));
        if saturated_only && a != from && mol.atoms[a].aromatic {
            continue;
        }
        for &(b, _) in &mol.adjacency[a] {
            match best[b] {
                None => {
                    best[b] = Some((d + 1, count));
                    queue.push_back(b);
                }
                Some((db, cb)) if db == d + 1 => best[b] = Some((db, cb + count)),
                _ => {}
            }
        }
    }
    best
}

/// Couplings between the sites at `atoms` (atom index and kind) of `mol`, indexed like
/// `atoms`. Sites in different components do not interact.
pub fn couplings(mol: &Molecule, atoms: &[(usize, Kind)]) -> Result<Vec<Coupling>> {
    let table = Interactions::builtin()?;
    let mut out = Vec::new();
    for (i, &(a, ka)) in atoms.iter().enumerate() {
        if a >= mol.atoms.len() {
            continue;
        }
        let all = paths_from(mol, a, false);
        let saturated = paths_from(mol, a, true);
        for (j, &(b, kb)) in atoms.iter().enumerate().skip(i + 1) {
            let Some(Some((d, _))) = all.get(b) else {
                continue;
            };
            // Hydroxyls on one central atom (phosphoric, phosphonic acids) carry their
            // successive constants in the group table already; coupling them again would count
            // the repulsion twice.
            if *d == 0 || (*d == 2 && geminal_hydroxyls(mol, a, b)) {
                continue;
            }
            let paths = match saturated[b] {
                Some((ds, count)) if ds == *d => count,
                _ => 1,
            };
            out.push(Coupling {
                a: i,
                b: j,
                shift: table.shift(ka == kb, *d, paths),
            });
        }
    }
    Ok(out)
}

/// Whether `a` and `b` are oxygens bonded to the same central atom (O-X-O).
fn geminal_hydroxyls(mol: &Molecule, a: usize, b: usize) -> bool {
    const OXYGEN: u8 = 8;
    mol.atoms[a].element == OXYGEN
        && mol.atoms[b].element == OXYGEN
        && mol.adjacency[a]
            .iter()
            .any(|&(x, _)| mol.adjacency[b].iter().any(|&(y, _)| x == y))
}

/// One site's constants.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct SiteConstant {
    pub atom: usize,
    pub kind: Kind,
    /// Microscopic pKa with every other site of the molecule neutral (the estimate).
    pub pka_micro: f64,
    /// pH at which this site is half ionized in the molecule, other sites free to titrate.
    pub pka_in_molecule: Option<f64>,
}

/// Constants of a whole compound (all parents).
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Constants {
    /// Macroscopic pKa values, ascending, every parent together.
    pub macro_pka: Vec<f64>,
    pub sites: Vec<SiteConstant>,
    /// Set when a parent has too many sites for microstates.
    pub note: Option<String>,
}

fn equilibrium_site(kind: Kind, pka: f64) -> Site {
    match kind {
        Kind::Acid => Site::acid(pka),
        Kind::Base => Site::base(pka),
    }
}

impl Profile {
    /// Couplings between the sites of parent `i`, in the order of `parent_sites(i)`. The
    /// table is embedded and checked by tests; were it unreadable, sites stay independent.
    pub fn parent_couplings(&self, i: usize) -> Vec<Coupling> {
        // Measured constants are macroscopic: the interaction between the sites is already in
        // them, and coupling them again would push them apart twice.
        if self
            .parent_origins
            .get(i)
            .is_some_and(|o| *o != super::measured::Origin::Estimate)
        {
            return Vec::new();
        }
        let sites = self.parent_sites(i);
        let atoms: Vec<(usize, Kind)> = sites.iter().map(|s| (s.atom, s.kind)).collect();
        // An acid ionized at every measurable pH (sulfonic acid) enters a ring-corrected
        // estimate through its substituent constant, which is the anion's (Hansch, Leo & Taft
        // 1991 tabulate SO3-): its charge is in that estimate already.
        let always_ionized =
            |s: &GroupSite| s.kind == Kind::Acid && s.pka < super::reading::MEASURABLE.0;
        let counted = |a: &GroupSite, b: &GroupSite| always_ionized(a) && b.ring_corrected;
        let mol = &self.compound.neutral;
        couplings(mol, &atoms)
            .unwrap_or_default()
            .into_iter()
            .filter(|c| {
                let (a, b) = (sites[c.a], sites[c.b]);
                !(counted(a, b) || counted(b, a))
            })
            .map(|c| match ring_interaction(mol, sites[c.a], sites[c.b]) {
                Some(shift) => Coupling { shift, ..c },
                None => c,
            })
            .collect()
    }

    /// Macroscopic and per-site constants of every parent.
    pub fn constants(&self) -> Constants {
        let mut out = Constants {
            macro_pka: Vec::new(),
            sites: Vec::new(),
            note: None,
        };
        for i in 0..self.compound.parents.len() {
            let own = self.parent_sites(i);
            let sites: Vec<Site> = own
                .iter()
                .map(|s| equilibrium_site(s.kind, s.pka))
                .collect();
            let coupled = self.parent_couplings(i);
            if sites.len() > MAX_COUPLED_SITES {
                out.note = Some(format!(
                    "{} sites in one molecule: more than {MAX_COUPLED_SITES}, so they are \
                     treated as independent (no interaction between sites)",
                    sites.len()
                ));
            }
            out.macro_pka
                .extend(microstates::macro_pkas(&sites, &coupled));
            for (k, s) in own.iter().enumerate() {
                out.sites.push(SiteConstant {
                    atom: s.atom,
                    kind: s.kind,
                    pka_micro: s.pka,
                    pka_in_molecule: microstates::half_ionization_ph(&sites, &coupled, k),
                });
            }
        }
        out.macro_pka.sort_by(f64::total_cmp);
        out.sites.sort_by_key(|s| s.atom);
        out
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn predict(smiles: &str, sites: &[(usize, Kind, f64)]) -> Vec<f64> {
        let mol = Molecule::from_smiles(smiles).unwrap();
        assert!(
            sites.iter().all(|&(a, _, _)| a < mol.atoms.len()),
            "{smiles}"
        );
        let atoms: Vec<(usize, Kind)> = sites.iter().map(|&(a, k, _)| (a, k)).collect();
        let c = couplings(&mol, &atoms).unwrap();
        let eq: Vec<Site> = sites
            .iter()
            .map(|&(_, k, p)| equilibrium_site(k, p))
            .collect();
        microstates::macro_pkas(&eq, &c)
    }

    const LOG2: f64 = std::f64::consts::LOG10_2;

    fn close(got: &[f64], want: &[f64], tol: f64, what: &str) {
        assert_eq!(got.len(), want.len(), "{what}: {got:?}");
        for (g, w) in got.iter().zip(want) {
            assert!(
                (g - w).abs() <= tol,
                "{what}: got {got:?}, handbook {want:?}"
            );
        }
    }

    #[test]
    fn table_loads_and_falls_with_distance() {
        let t = Interactions::builtin().unwrap();
        for list in [&t.like, &t.opposite] {
            assert!(list.windows(2).all(|w| w[0].1 > w[1].1));
        }
        // Beyond the table: 1/distance from the last row.
        let (d, s) = *t.like.last().unwrap();
        assert!((t.shift(true, 2 * d, 1) - s / 2.0).abs() < 1e-12);
        assert!(t.shift(true, 3, 2) > t.shift(true, 3, 1));
    }

    #[test]
    fn ionized_sigma_rows_name_groups_of_the_group_table() {
        let rows = ionized_sigma().unwrap();
        assert!(!rows.is_empty());
        let groups = crate::store::builtin::GROUPS_CSV;
        for (name, reach, ..) in rows {
            assert!(*reach <= 2, "{name}");
            let listed = groups.lines().any(|l| {
                l.starts_with(&format!("{name},")) || l.starts_with(&format!("\"{name}\","))
            });
            assert!(listed, "{name} is not a row of data/groups.csv");
        }
    }

    #[test]
    fn bad_tables_are_errors() {
        assert!(Interactions::parse("pair,distance,shift,source\nlike,x,1,a\n").is_err());
        assert!(Interactions::parse("pair,distance,shift,source\nlike,1,-1,a\n").is_err());
        assert!(Interactions::parse("pair,distance,shift,source\nlike,1,1,a\n").is_err());
    }

    #[test]
    fn distances_and_ring_paths() {
        let t = Interactions::builtin().unwrap();
        // Ethylenediamine N-C-C-N: 3 bonds, one path.
        let m = Molecule::from_smiles("NCCN").unwrap();
        let c = couplings(&m, &[(0, Kind::Base), (3, Kind::Base)]).unwrap();
        assert_eq!(c[0].shift, t.shift(true, 3, 1));
        // Piperazine: 3 bonds both ways round the ring.
        let m = Molecule::from_smiles("C1CNCCN1").unwrap();
        let c = couplings(&m, &[(2, Kind::Base), (5, Kind::Base)]).unwrap();
        assert_eq!(c[0].shift, t.shift(true, 3, 2));
        // Terephthalic acid: two ways round the benzene ring, but through aromatic atoms.
        let m = Molecule::from_smiles("OC(=O)c1ccc(cc1)C(=O)O").unwrap();
        let c = couplings(&m, &[(0, Kind::Acid), (11, Kind::Acid)]).unwrap();
        assert_eq!(c[0].shift, t.shift(true, 7, 1));
        // Two components never interact.
        let m = Molecule::from_smiles("CC(=O)O.NC").unwrap();
        assert!(
            couplings(&m, &[(3, Kind::Acid), (4, Kind::Base)])
                .unwrap()
                .is_empty()
        );
    }

    #[test]
    fn calibration_pairs_come_back() {
        // The rows of data/site_interactions.csv were read off these pairs; with each site's
        // microscopic constant set from the first handbook constant (statistics removed), the
        // model must return both constants. Values: Perrin 1965; Serjeant & Dempsey 1979;
        // from memory.
        use Kind::{Acid, Base};
        let diacid = |smiles: &str, a: usize, b: usize, pk1: f64| {
            predict(smiles, &[(a, Acid, pk1 + LOG2), (b, Acid, pk1 + LOG2)])
        };
        let diamine = |smiles: &str, a: usize, b: usize, pk_high: f64| {
            let mut m = predict(
                smiles,
                &[(a, Base, pk_high - LOG2), (b, Base, pk_high - LOG2)],
            );
            m.sort_by(f64::total_cmp);
            m
        };
        close(
            &diacid("OC(=O)C(=O)O", 0, 5, 1.25),
            &[1.25, 4.27],
            0.1,
            "oxalic",
        );
        close(
            &diacid("OC(=O)CCC(=O)O", 0, 7, 4.21),
            &[4.21, 5.64],
            0.1,
            "succinic",
        );
        close(
            &diacid("OC(=O)CCCCC(=O)O", 0, 9, 4.43),
            &[4.43, 5.41],
            0.1,
            "adipic",
        );
        close(
            &diamine("NCCN", 0, 3, 9.93),
            &[6.85, 9.93],
            0.1,
            "ethylenediamine",
        );
        close(
            &diamine("C1CNCCN1", 2, 5, 9.73),
            &[5.35, 9.73],
            0.15,
            "piperazine",
        );
        // Glycine: COOH of the uncharged form 2.34 + 9.60 - 7.66 = 4.28, amine 7.66
        // (glycine methyl ester, Perrin 1965, from memory).
        let gly = predict("NCC(=O)O", &[(0, Base, 7.66), (4, Acid, 4.28)]);
        close(&gly, &[2.34, 9.60], 0.1, "glycine");
    }

    #[test]
    fn held_out_diacids_and_diamines() {
        // Not used to build the table. Site constants from the first handbook constant with
        // statistics removed; the second constant is the model's prediction. Tolerance 0.3.
        use Kind::{Acid, Base};
        let diacid = |smiles: &str, a: usize, b: usize, pk1: f64| {
            predict(smiles, &[(a, Acid, pk1 + LOG2), (b, Acid, pk1 + LOG2)])
        };
        // Fumaric 3.02/4.38, terephthalic 3.54/4.46, isophthalic 3.70/4.60: Serjeant &
        // Dempsey 1979, from memory.
        close(
            &diacid("OC(=O)/C=C/C(=O)O", 0, 7, 3.02),
            &[3.02, 4.38],
            0.3,
            "fumaric",
        );
        let tere = diacid("OC(=O)c1ccc(cc1)C(=O)O", 0, 11, 3.54);
        close(&tere, &[3.54, 4.46], 0.3, "terephthalic");
        let iso = diacid("OC(=O)c1cccc(c1)C(=O)O", 0, 11, 3.70);
        close(&iso, &[3.70, 4.60], 0.3, "isophthalic");
        // 1,6-hexanediamine 11.02/10.24: Perrin 1965, from memory.
        let hexa = predict(
            "NCCCCCCN",
            &[(0, Base, 11.02 - LOG2), (7, Base, 11.02 - LOG2)],
        );
        close(&hexa, &[10.24, 11.02], 0.3, "1,6-hexanediamine");
    }

    #[test]
    fn amino_acids_from_their_parts() {
        // Every site constant from a one-site model compound, not from the amino acid itself:
        // alpha-amino acid COOH 4.28 and alpha-ammonium 7.66 as for glycine (above),
        // beta-alanine's from beta-alanine ethyl ester 9.13 (Perrin 1965, from memory),
        // n-hexylamine 10.56, imidazole 6.99 (Perrin 1965, from memory).
        use Kind::{Acid, Base};
        // beta-Alanine 3.55/10.24 (CRC Handbook, from memory); COOH 3.55 + 10.24 - 9.13.
        let ala = predict("NCCC(=O)O", &[(0, Base, 9.13), (5, Acid, 4.66)]);
        close(&ala, &[3.55, 10.24], 0.1, "beta-alanine");
        // Lysine 2.18/8.95/10.53 (CRC Handbook, from memory). Tolerance 0.5.
        let lys = predict(
            "NC(CCCCN)C(=O)O",
            &[(0, Base, 7.66), (6, Base, 10.56), (9, Acid, 4.28)],
        );
        close(&lys, &[2.18, 8.95, 10.53], 0.5, "lysine");
        // Histidine 1.82/6.00/9.17 (CRC Handbook, from memory). Tolerance 0.75: the ring is
        // closer in space to the alpha-ammonium than its five bonds say.
        let his = predict(
            "NC(Cc1cnc[nH]1)C(=O)O",
            &[(0, Base, 7.66), (5, Base, 6.99), (10, Acid, 4.28)],
        );
        close(&his, &[1.82, 6.00, 9.17], 0.75, "histidine");
    }

    #[test]
    fn citric_acid_from_hydroxy_acids() {
        // Citric acid 3.13/4.76/6.40 (Serjeant & Dempsey 1979, from memory). Site constants
        // from one-site analogues: the terminal COOH as 3-hydroxybutanoic acid 4.41, the
        // central one as 2-hydroxy-2-methylpropanoic acid 3.99 (from memory). The mutual
        // pull of the uncharged COOH groups is left to the estimate, so tolerance 0.75.
        use Kind::Acid;
        let cit = predict(
            "OC(=O)CC(O)(CC(=O)O)C(=O)O",
            &[(0, Acid, 4.41), (9, Acid, 4.41), (12, Acid, 3.99)],
        );
        close(&cit, &[3.13, 4.76, 6.40], 0.75, "citric");
    }

    #[test]
    fn edta_like_second_nitrogen_comes_late() {
        // EDTA: four carboxylic acids and two amines. Handbook (Martell & Smith, from memory)
        // 0.0, 1.5, 2.0, 2.66, 6.16, 10.24: the two ammonium constants lie about 4 apart,
        // because the second N sits 3 bonds from the first. Only that split is checked; the
        // amine constants themselves need the estimate's substituent corrections.
        use Kind::{Acid, Base};
        let sites = [
            (0, Acid, 4.28),
            (8, Acid, 4.28),
            (15, Acid, 4.28),
            (19, Acid, 4.28),
            (4, Base, 8.0),
            (11, Base, 8.0),
        ];
        let m = predict("OC(=O)CN(CC(=O)O)CCN(CC(=O)O)CC(=O)O", &sites);
        assert_eq!(m.len(), 6);
        let split = m[5] - m[4];
        assert!((split - (10.24 - 6.16)).abs() < 1.5, "{m:?}");
    }
}
