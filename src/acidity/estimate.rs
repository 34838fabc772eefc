//! The pKa estimate of a site: its group's typical value corrected for substituents by the
//! group's linear free-energy series (Hammett or Taft), with a range that widens as the
//! corrections grow, are summed, or rest on stand-in constants.
//!
//! With a parent compound on the group row the estimate is
//! `pka(group) - rho * (sum sigma(molecule) - sum sigma(parent))`, so the group's own atoms
//! cancel; without one it is `base(series) - rho * sum sigma`.

use std::collections::HashMap;

use super::group::{Group, Kind};
use super::lookup::Lookup;
use super::sites::{RingSite, Site, find_sites_in};
use super::substituent::{Constant, Series, SeriesRow, Substituent, SubstituentRow};
use super::{hammett, taft};
use crate::chem::molecule::Molecule;
use crate::chem::smarts::{Pattern, Target};
use crate::error::{Error, Result};

/// Relative error of a sigma value and of a rho outside their calibration sets: each good to
/// about 10 % (Perrin, Dempsey & Serjeant 1981 quote estimates as good to a few tenths for one
/// or two substituents; from memory). Each term's sigma errs on its own; the series' rho errs
/// once for the whole net shift.
const WIDEN_PER_SHIFT: f64 = 0.10;
/// The two-sided 90 % point of the normal distribution: ranges are nominal 90 % intervals.
pub(crate) const Z90: f64 = 1.645;
/// Extra half-width per ortho substituent (proximity effects beyond sigma_o; common practice).
const WIDEN_ORTHO: f64 = 0.30;
/// Extra half-width, in sigma units times rho, where sigma_p stands in for a missing sigma_o.
const WIDEN_STAND_IN: f64 = 0.25;
/// Extra half-width per substituent with no tabulated constant.
const WIDEN_UNKNOWN: f64 = 0.40;
/// Net corrections beyond this many pKa units are extrapolations: widen by a further share.
const EXTRAPOLATION_START: f64 = 3.0;
const WIDEN_EXTRAPOLATION: f64 = 0.15;

/// The series row whose rho turns the Hammett sigma sum of an aryl group's ring substituents
/// into a change of that group's sigma* (data/series.csv).
const ARYL_SIGMA_STAR: &str = "aryl_sigma_star";

/// One substituent's contribution.
#[derive(Debug, Clone, PartialEq)]
pub struct Term {
    /// Position and substituent name ("p-nitro") or the Taft group.
    pub label: String,
    pub sigma: f64,
    /// pKa change (-rho * sigma, plus any ortho shift).
    pub shift: f64,
    pub ortho: bool,
    /// sigma_p used in place of a missing sigma_o.
    pub stand_in: bool,
    /// sigma_m of an ortho/para ring substituent: what a donor keeps when another donor
    /// already conjugates with the site.
    pub inductive: Option<f64>,
}

impl Term {
    /// A term with no ortho, stand-in or donor-saturation facts: `sigma` times the series' rho.
    pub fn plain(label: String, sigma: f64, rho: f64) -> Term {
        Term {
            label,
            sigma,
            shift: -rho * sigma,
            ortho: false,
            stand_in: false,
            inductive: None,
        }
    }
}

/// The substituent terms found around one site.
#[derive(Debug, Clone, Default, PartialEq)]
pub struct Correction {
    pub terms: Vec<Term>,
    /// Substituents with no tabulated constant.
    pub unknown: usize,
    /// For a six-membered-ring Hammett correction: the ring atom the terms are counted from.
    pub ipso: Option<usize>,
    /// The sd of a side series whose terms are among `terms` (0 without one) and the pKa
    /// change those terms make.
    pub side_sd: f64,
    pub side_shift: f64,
    /// How many of `terms` the side series gave.
    pub side_terms: usize,
}

impl Correction {
    fn sum_sigma(&self) -> f64 {
        self.terms.iter().map(|t| t.sigma).sum()
    }
    fn shift(&self) -> f64 {
        self.terms.iter().map(|t| t.shift).sum()
    }
}

/// A group's series with its parent's correction precomputed.
#[derive(Debug, Clone)]
struct GroupSeries {
    series: usize,
    parent: Option<Correction>,
}

/// The compiled substituent and series tables, and which series each group follows.
#[derive(Debug, Clone, Default)]
pub struct Estimator {
    pub substituents: Vec<Substituent>,
    pub series: Vec<Series>,
    /// Per group (same order as the handbook's groups).
    links: Vec<Option<GroupSeries>>,
    /// Index of the `ARYL_SIGMA_STAR` series, if the table has it.
    aryl: Option<usize>,
    /// Per series (same order): the index of its side series, if it names one.
    sides: Vec<Option<usize>>,
}

impl Estimator {
    /// Compiles the tables and links every group row that names a series (`group.series`),
    /// computing its parent's substituent terms once.
    pub fn new(
        substituents: Vec<SubstituentRow>,
        series: Vec<SeriesRow>,
        groups: &[Group],
    ) -> Result<Estimator> {
        let mut e = Estimator {
            substituents: substituents
                .into_iter()
                .map(SubstituentRow::compile)
                .collect::<Result<_>>()?,
            series: series
                .into_iter()
                .map(SeriesRow::compile)
                .collect::<Result<_>>()?,
            links: Vec::new(),
            aryl: None,
            sides: Vec::new(),
        };
        let by_name: HashMap<&str, usize> = e
            .series
            .iter()
            .enumerate()
            .map(|(i, s)| (s.name.as_str(), i))
            .collect();
        e.sides = e
            .series
            .iter()
            .map(|s| {
                let Some(name) = &s.side else {
                    return Ok(None);
                };
                match by_name.get(name.as_str()) {
                    Some(&i) if e.series[i].constant == Constant::Taft => Ok(Some(i)),
                    _ => Err(Error::Internal(format!(
                        "series '{}' names side series '{name}', which is not a taft series",
                        s.name
                    ))),
                }
            })
            .collect::<Result<_>>()?;
        let mut links = Vec::with_capacity(groups.len());
        for g in groups {
            let Some(name) = &g.series else {
                links.push(None);
                continue;
            };
            let &series = by_name.get(name.as_str()).ok_or_else(|| {
                Error::Internal(format!("group '{}' names unknown series '{name}'", g.name))
            })?;
            let parent = match &g.parent {
                Some(smiles) => Some(e.parent_correction(g, series, smiles)?),
                None => None,
            };
            links.push(Some(GroupSeries { series, parent }));
        }
        e.links = links;
        e.aryl = by_name.get(ARYL_SIGMA_STAR).copied();
        Ok(e)
    }

    fn parent_correction(&self, g: &Group, series: usize, smiles: &str) -> Result<Correction> {
        let bad =
            |why: String| Error::Internal(format!("group '{}' parent {smiles}: {why}", g.name));
        let mol = Molecule::from_smiles(smiles).map_err(|e| bad(e.to_string()))?;
        let matched = g
            .pattern
            .first_match(&mol)
            .ok_or_else(|| bad("the group's pattern does not match its parent".into()))?;
        let site = matched[g.site];
        let look = Lookup::new(&mol, &self.substituents);
        let mut c = self
            .correction(&mol, site, series, g.kind == Some(Kind::Base), &look)
            .ok_or_else(|| bad("no correction can be computed for the parent".into()))?;
        c.unknown += self.blind_spots(&mol, site, &matched, series, &c);
        Ok(c)
    }

    /// Groups a ring series cannot see: on the atoms of a Hammett group's match that lie off
    /// its ring (the CH2 of a phenylacetic acid, the hydrate carbon of a quinazoline hydrate),
    /// anything but a plain alkyl carbon, a ring atom or the side series' N-alkyl groups. Each
    /// counts as a group without constants. Taft series walk every group on their centre.
    fn blind_spots(
        &self,
        mol: &Molecule,
        site: usize,
        matched: &[usize],
        series: usize,
        c: &Correction,
    ) -> usize {
        let anchor = match self.series[series].constant {
            Constant::Taft => return 0,
            Constant::Hammett => c.ipso,
            Constant::HammettFive => Some(site),
        };
        let Some(anchor) = anchor else {
            return 0;
        };
        let rings = &mol.rings.rings;
        let ring_atoms: Vec<usize> = rings
            .iter()
            .filter(|r| r.contains(&anchor))
            .flat_map(|r| {
                rings
                    .iter()
                    .filter(|f| f.iter().any(|a| r.contains(a)))
                    .flatten()
            })
            .copied()
            .collect();
        let side = self.sides[series].is_some();
        let off_ring = matched
            .iter()
            .copied()
            // The side series walks the site atom's own groups.
            .filter(|&a| !(ring_atoms.contains(&a) || side && a == site));
        groups_beyond(mol, matched, off_ring, |_, x| ring_atoms.contains(&x)).len()
    }

    /// The series that carries aryl ring substituents into sigma* (`ARYL_SIGMA_STAR`).
    fn aryl(&self) -> Option<&Series> {
        self.aryl.map(|i| &self.series[i])
    }

    /// The substituent terms of `site` by series `series`; `cation` when the site's charged
    /// form is a cation (a base group), whose Taft groups take their ammonium-ion sigma*.
    fn correction(
        &self,
        mol: &Molecule,
        site: usize,
        series: usize,
        cation: bool,
        look: &Lookup,
    ) -> Option<Correction> {
        let s = &self.series[series];
        match s.constant {
            Constant::Hammett => {
                let mut c = hammett::correct(mol, site, s, look)?;
                if let Some(side) = self.sides[series] {
                    self.add_side(mol, site, &self.series[side], look, &mut c);
                }
                Some(c)
            }
            Constant::HammettFive => hammett::correct_five(mol, site, s, look),
            Constant::Taft => Some(taft::correct(mol, site, s, cation, self.aryl(), look)),
        }
    }

    /// The side series' Taft terms for the groups on a site bonded straight to its ring.
    fn add_side(
        &self,
        mol: &Molecule,
        site: usize,
        side: &Series,
        look: &Lookup,
        c: &mut Correction,
    ) {
        let bonded = |i: usize| mol.adjacency[site].iter().any(|&(x, _)| x == i);
        let Some(ipso) = c.ipso.filter(|&i| i != site && bonded(i)) else {
            return;
        };
        let s = taft::side(mol, site, ipso, side, self.aryl(), look);
        c.unknown += s.unknown;
        c.side_sd = side.sd;
        c.side_shift = s.shift();
        c.side_terms = s.terms.len();
        c.terms.extend(s.terms);
    }

    /// Corrects `site` (found with `groups[g]`) in place.
    fn apply(&self, mol: &Molecule, site: &mut Site, group: &Group, g: usize, look: &Lookup) {
        // Without a series, or where the series' ring is not there (a thienylacetic acid for
        // the phenylacetic series), the group's own value stands and what surrounds the match
        // widens the range uncorrected.
        let uncorrected = |site: &mut Site, source: String| {
            site.source = source;
            let n = uncorrected_substituents(mol, &site.matched, &group.pattern);
            if n > 0 {
                let widen = n as f64 * WIDEN_UNKNOWN;
                site.pka_low -= widen;
                site.pka_high += widen;
                site.source
                    .push_str(&format!("; {n} substituent(s) without a correction"));
            }
        };
        let Some(Some(link)) = self.links.get(g) else {
            uncorrected(site, format!("estimate: {}; {}", group.name, group.source));
            return;
        };
        let series = &self.series[link.series];
        let cation = group.kind == Some(Kind::Base);
        let Some(mut c) = self.correction(mol, site.atom, link.series, cation, look) else {
            let source = format!(
                "estimate: {} (no {} ring found); {}",
                group.name, series.name, group.source
            );
            uncorrected(site, source);
            return;
        };
        c.unknown += self.blind_spots(mol, site.atom, &site.matched, link.series, &c);
        let (base, shift) = match &link.parent {
            Some(p) => (group.pka, c.shift() - p.shift()),
            None => (series.base, c.shift()),
        };
        let pka = base + shift;
        let (spread_low, spread_high) = widen_range(group, series, &c, link.parent.as_ref(), pka);
        site.pka = pka;
        site.pka_low = pka - spread_low;
        site.pka_high = pka + spread_high;
        site.ring_corrected = series.constant != Constant::Taft;
        if series.constant == Constant::Hammett {
            site.ring = c.ipso.map(|ipso| RingSite {
                rho: series.rho,
                ipso,
                para: series.para,
            });
        }
        site.source = describe(group, series, &c, link.parent.as_ref());
    }
}

/// The distinct neighbours of `from` (atoms of the match `matched`) that are neither matched nor
/// plain alkyl carbons nor `skip(atom, neighbour)`: the groups a group's constants leave out.
fn groups_beyond(
    mol: &Molecule,
    matched: &[usize],
    from: impl Iterator<Item = usize>,
    skip: impl Fn(usize, usize) -> bool,
) -> Vec<usize> {
    let mut seen: Vec<usize> = Vec::new();
    for a in from {
        for &(x, _) in &mol.adjacency[a] {
            if !matched.contains(&x)
                && !seen.contains(&x)
                && !skip(a, x)
                && !plain_alkyl(mol, x, matched)
            {
                seen.push(x);
            }
        }
    }
    seen
}

/// A saturated carbon bonded to nothing but saturated carbons and the group's matched atoms:
/// an alkyl group the group's own spread covers.
fn plain_alkyl(mol: &Molecule, x: usize, matched: &[usize]) -> bool {
    mol.is_saturated_carbon(x)
        && mol.adjacency[x]
            .iter()
            .all(|&(y, _)| matched.contains(&y) || mol.is_saturated_carbon(y))
}

/// Substituents on the atoms of a group that has no series, so the estimate cannot correct for
/// them: atoms bonded to the group's matched atoms that are neither part of the match nor a
/// plain alkyl carbon (saturated, bonded to no heteroatom or unsaturated atom besides the
/// group), and for an aryl neighbour what its ring holds besides phenyl's carbons. Each widens
/// the range as a substituent without constants does in a series.
fn uncorrected_substituents(mol: &Molecule, matched: &[usize], pattern: &Pattern) -> usize {
    // Where the pattern asks for an aromatic atom (the aryl of an arylacetic acid or a
    // benzamidine), its ring is the group's own phenyl: only what that ring holds besides
    // phenyl's carbons counts.
    let aryl = |a: usize| {
        matched
            .iter()
            .position(|&m| m == a)
            .is_some_and(|k| pattern.requires_aromatic(k))
    };
    let own_ring = |a: usize, x: usize| {
        aryl(a)
            && mol.atoms[x].aromatic
            && mol
                .rings
                .rings
                .iter()
                .any(|r| r.contains(&a) && r.contains(&x))
    };
    let seen = groups_beyond(mol, matched, matched.iter().copied(), own_ring);
    let mut beyond = 0;
    for &a in matched.iter().filter(|&&a| aryl(a)) {
        let others: Vec<usize> = matched.iter().copied().filter(|&m| m != a).collect();
        beyond += hammett::pendant_aryl_unknowns(mol, a, &others);
    }
    // An aryl neighbour also brings its ring's hetero members and groups (a pyrazinyl group is
    // more than one unknown).
    beyond += seen
        .iter()
        .map(|&x| hammett::pendant_aryl_unknowns(mol, x, matched))
        .sum::<usize>();
    seen.len() + beyond
}

/// Half-widths below and above a corrected estimate, as a nominal 90 % interval: the group's
/// own documented spread and the method's error (the series' standard deviation,
/// `WIDEN_PER_SHIFT` of each term's shift for its sigma, and `WIDEN_PER_SHIFT` of the net shift
/// for the rho they share, independent, so summed in quadrature) combine in quadrature; ortho,
/// stand-in, unknown and extrapolation allowances are systematic and add.
/// A site that is its group's parent compound keeps the group's spread.
fn widen_range(
    group: &Group,
    series: &Series,
    c: &Correction,
    parent: Option<&Correction>,
    pka: f64,
) -> (f64, f64) {
    let sq = |c: &Correction| -> f64 {
        c.terms
            .iter()
            .map(|t| (WIDEN_PER_SHIFT * t.shift).powi(2))
            .sum()
    };
    let orthos = |c: &Correction| c.terms.iter().filter(|t| t.ortho).count() as f64;
    let (mut term_sq, mut systematic) = (sq(c), orthos(c) * WIDEN_ORTHO);
    let mut net = c.shift();
    if let Some(p) = parent {
        // The parent's own terms are exact by construction.
        term_sq = (term_sq - sq(p)).max(0.0);
        systematic = (systematic - orthos(p) * WIDEN_ORTHO).max(0.0);
        net -= p.shift();
    }
    // A side series counts with its sd where its terms differ from the parent's.
    let side_net = c.side_shift - parent.map_or(0.0, |p| p.side_shift);
    let side_sd = if side_net.abs() > 0.01 {
        c.side_sd
    } else {
        0.0
    };
    // The rho error scales the net shift as a whole.
    term_sq += (WIDEN_PER_SHIFT * net).powi(2);
    let from_series_base = parent.is_none() && (series.base - group.pka).abs() > 0.01;
    // A substituent whose sigma is near zero (CH2OH, SMe para) still rests on the equation:
    // more terms than the parent has means a corrected estimate.
    // (The side series' groups on the site atom are in its base compound, N,N-dimethylaniline.)
    let own = |c: &Correction| c.terms.len() - c.side_terms;
    let more_terms = own(c) > parent.map_or(0, own);
    let corrected = net.abs() > 0.01 || term_sq > 1e-6 || from_series_base || more_terms;
    let method = if corrected {
        Z90 * (series.sd.powi(2) + side_sd.powi(2) + term_sq).sqrt()
    } else {
        0.0
    };
    systematic += c.terms.iter().filter(|t| t.stand_in).count() as f64
        * WIDEN_STAND_IN
        * series.rho.abs().min(3.0);
    // Groups without constants that the parent has too are in its measured value.
    let unknown = c.unknown.saturating_sub(parent.map_or(0, |p| p.unknown));
    systematic += unknown as f64 * WIDEN_UNKNOWN;
    let extrapolated = (pka - group.pka).abs() - EXTRAPOLATION_START;
    if extrapolated > 0.0 {
        systematic += WIDEN_EXTRAPOLATION * extrapolated;
    }
    let side = |spread: f64| (spread.powi(2) + method.powi(2)).sqrt() + systematic;
    (
        side(group.pka - group.pka_low),
        side(group.pka_high - group.pka),
    )
}

fn describe(group: &Group, series: &Series, c: &Correction, parent: Option<&Correction>) -> String {
    let law = match series.constant {
        Constant::Hammett => "Hammett",
        Constant::HammettFive => "Hammett (five-membered ring)",
        Constant::Taft => "Taft",
    };
    let sigma = match series.constant {
        Constant::Hammett | Constant::HammettFive => "sigma",
        Constant::Taft => "sigma*",
    };
    let terms: Vec<String> = c
        .terms
        .iter()
        .filter(|t| t.sigma != 0.0)
        .map(|t| format!("{} {:.2}", t.label, t.sigma))
        .collect();
    let reference = match parent {
        Some(p) => format!(" against parent {:.2}", p.sum_sigma()),
        None => String::new(),
    };
    format!(
        "estimate: {} + {law} rho {:.2}, sum {sigma} {:.2}{reference}{}{}",
        group.name,
        series.rho,
        c.sum_sigma(),
        if terms.is_empty() {
            String::new()
        } else {
            format!(" ({})", terms.join(", "))
        },
        // As the range counts them: not those the parent compound has too.
        match c.unknown.saturating_sub(parent.map_or(0, |p| p.unknown)) {
            0 => String::new(),
            n => format!(", {n} group(s) without constants"),
        },
    )
}

/// The sites of `mol` with corrected pKa estimates, sorted by atom index.
pub fn estimate_sites(mol: &Molecule, groups: &[Group], estimator: &Estimator) -> Vec<Site> {
    // One prepared molecule for the group and the substituent patterns.
    let target = Target::new(mol);
    let mut sites = find_sites_in(&target, groups);
    if sites.is_empty() {
        return sites;
    }
    let look = Lookup::with_target(target, &estimator.substituents);
    for site in &mut sites {
        if let Some(g) = groups.iter().position(|g| g.name == site.group) {
            estimator.apply(mol, site, &groups[g], g, &look);
        }
    }
    sites
}
