//! What a handbook lists for a compound: each group's constant as measured in the molecule, and
//! for the compound the lowest constant of an acid group ("acid") and the highest constant of
//! a base group ("base").
//!
//! The constants are the macroscopic ones of the microstate model
//! (`equilibrium::microstates`), so statistical factors and site interactions are in them:
//! glycine reads 2.35 as an acid (its carboxyl, next to the ammonium ion) and 9.6 as a base
//! (its amine, next to the carboxylate). Each macroscopic step is credited to the site that
//! loses the most protonation across it (average protonation of each site within a charge
//! level does not depend on pH).
//!
//! Steps outside the measurable window pH 0-14 (constants there need acidity functions; common
//! practice) are not listed: a sulfonic acid is ionized at every pH where constants are
//! measured. Where a compound then has no listed group of the asked kind, the reading is the
//! step at which its least-charged form (neutral, zwitterion, or the least-charged ion that
//! dominates somewhere in the window) loses a proton (acid) or takes one (base): sulfanilic
//! acid, H3N+-C6H4-SO3-, is listed as an acid by its ammonium constant, and a betaine
//! (Me3N+-CH2-CO2-) as a base by its carboxylate. Where there is still none, the reading is
//! the constant of a group that stays neutral in water (`Profile::neutral_groups`): acetone is
//! listed as a base by its carbonyl O (pKa about -7), ethanol as an acid by its OH (about 16).

use super::estimate::Z90;
use super::group::Kind;
use super::profile::Profile;
use super::sites::Site;
use crate::equilibrium::microstates::{Coupling, MAX_COUPLED_SITES};

/// Relative standard uncertainty of a site-interaction shift (`data/site_interactions.csv`):
/// the handbook pairs behind one distance disagree by about this share (malonic against
/// 1,3-diaminopropane at distance 4, the scaled opposite-charge rows), so a constant moved
/// from its site's own value by the interplay of sites widens its range by this share of the
/// move, as a 1-sigma term in quadrature.
const INTERACTION_REL_SD: f64 = 0.3;

/// The pH window in which aqueous constants are measured directly (common practice).
pub const MEASURABLE: (f64, f64) = (0.0, 14.0);

/// One handbook-style constant with the range of the site credited with it.
#[derive(Debug, Clone, PartialEq)]
pub struct Reading {
    pub pka: f64,
    pub pka_low: f64,
    pub pka_high: f64,
    /// Atom of the site credited with the step.
    pub atom: usize,
    pub group: String,
}

/// The acid and base readings of one parent of a compound.
#[derive(Debug, Clone, PartialEq, Default)]
pub struct Readings {
    /// Macroscopic constants with the index (into the parent's sites) of the credited site,
    /// in the order the protons come off.
    pub steps: Vec<(f64, usize)>,
    pub acid: Option<Reading>,
    pub base: Option<Reading>,
}

/// Per charge level (protons lost, 0 = fully protonated): log10 of its pH-free weight and each
/// site's average protonation (1 = holds its proton). Microstate weights as in
/// `equilibrium::microstates`: an ionized acid site adds -pKa, an ionized base site +pKa, and
/// two ionized sites -q_i q_j shift.
fn levels(sites: &[Site], couplings: &[Coupling]) -> Vec<(f64, Vec<f64>)> {
    let n = sites.len();
    let q = |i: usize| {
        if sites[i].kind == Kind::Acid {
            -1.0
        } else {
            1.0
        }
    };
    let mut pair = vec![0.0; n * n];
    for c in couplings
        .iter()
        .filter(|c| c.a < n && c.b < n && c.a != c.b)
    {
        let v = -q(c.a) * q(c.b) * c.shift;
        pair[c.a * n + c.b] += v;
        pair[c.b * n + c.a] += v;
    }
    let mut logw = vec![0.0; 1 << n];
    for mask in 1usize..(1 << n) {
        let i = mask.trailing_zeros() as usize;
        let rest = mask & (mask - 1);
        let own = match sites[i].kind {
            Kind::Acid => -sites[i].pka,
            Kind::Base => sites[i].pka,
        };
        let pairs: f64 = (0..n)
            .filter(|&j| rest & (1 << j) != 0)
            .map(|j| pair[i * n + j])
            .sum();
        logw[mask] = logw[rest] + own + pairs;
    }
    // A site holds its proton when it is an acid not ionized or a base ionized.
    let holds = |mask: usize, i: usize| (mask & (1 << i) != 0) == (sites[i].kind == Kind::Base);
    let protons = |mask: usize| (0..n).filter(|&i| holds(mask, i)).count();
    (0..=n)
        .map(|lost| {
            let members: Vec<usize> = (0..1usize << n)
                .filter(|&m| protons(m) == n - lost)
                .collect();
            let max = members
                .iter()
                .map(|&m| logw[m])
                .fold(f64::NEG_INFINITY, f64::max);
            let w: Vec<f64> = members.iter().map(|&m| 10f64.powf(logw[m] - max)).collect();
            let total: f64 = w.iter().sum();
            let avg = (0..n)
                .map(|i| {
                    members
                        .iter()
                        .zip(&w)
                        .filter(|(m, _)| holds(**m, i))
                        .map(|(_, x)| x)
                        .sum::<f64>()
                        / total
                })
                .collect();
            (max + total.log10(), avg)
        })
        .collect()
}

/// Macroscopic steps, each with its credited site. Without microstates (too many sites) the
/// sites are taken as independent: each site's own constant is a step.
fn steps(sites: &[Site], couplings: &[Coupling]) -> Vec<(f64, usize)> {
    if sites.len() > MAX_COUPLED_SITES {
        let mut s: Vec<(f64, usize)> = sites.iter().enumerate().map(|(i, s)| (s.pka, i)).collect();
        s.sort_by(|a, b| a.0.total_cmp(&b.0));
        return s;
    }
    let lv = levels(sites, couplings);
    // The step from `lost` to `lost + 1` protons lost: pK = log Z(lost) - log Z(lost + 1).
    (0..sites.len())
        .map(|k| {
            let pk = lv[k].0 - lv[k + 1].0;
            let credited = (0..sites.len())
                .max_by(|&a, &b| {
                    let d = |i: usize| lv[k].1[i] - lv[k + 1].1[i];
                    d(a).total_cmp(&d(b))
                })
                .unwrap_or(0);
            (pk, credited)
        })
        .collect()
}

/// The least-charged level among those that dominate somewhere in `MEASURABLE`; `top` is the
/// charge of the fully protonated form and level k (k protons lost) dominates between
/// step k-1 and step k.
fn reference_level(pkas: &[f64], top: i32) -> usize {
    let (lo, hi) = MEASURABLE;
    (0..=pkas.len())
        .filter(|&k| {
            let from = if k == 0 {
                f64::NEG_INFINITY
            } else {
                pkas[k - 1]
            };
            let to = pkas.get(k).copied().unwrap_or(f64::INFINITY);
            from < hi && to > lo && from < to
        })
        .min_by_key(|&k| (top - k as i32).abs())
        .unwrap_or(0)
}

fn in_window(pka: f64) -> bool {
    (MEASURABLE.0..=MEASURABLE.1).contains(&pka)
}

impl Profile {
    /// Handbook-style readings of parent `i` (see the module comment).
    pub fn readings(&self, i: usize) -> Readings {
        let mut readings = self.titration_readings(i);
        let neutral = self.parent_neutral_groups(i);
        let as_reading = |s: &Site| Reading {
            pka: s.pka,
            pka_low: s.pka_low,
            pka_high: s.pka_high,
            atom: s.atom,
            group: s.group.clone(),
        };
        // As for sites: the lowest acid constant, the highest base constant.
        let pick = |kind: Kind| {
            let of_kind = neutral.iter().filter(|s| s.kind == kind);
            let by_pka = |a: &&&Site, b: &&&Site| a.pka.total_cmp(&b.pka);
            match kind {
                Kind::Acid => of_kind.min_by(by_pka),
                Kind::Base => of_kind.max_by(by_pka),
            }
            .map(|s| as_reading(s))
        };
        readings.acid = readings.acid.or_else(|| pick(Kind::Acid));
        readings.base = readings.base.or_else(|| pick(Kind::Base));
        readings
    }

    /// The groups of parent `i` that stay neutral in water.
    pub fn parent_neutral_groups(&self, i: usize) -> Vec<&Site> {
        let Some(parent) = self.compound.parents.get(i) else {
            return Vec::new();
        };
        self.neutral_groups
            .iter()
            .filter(|s| parent.atoms.contains(&s.atom))
            .collect()
    }

    /// Readings from the titrating sites alone.
    fn titration_readings(&self, i: usize) -> Readings {
        let own: Vec<Site> = self.parent_sites(i).into_iter().cloned().collect();
        if own.is_empty() {
            return Readings::default();
        }
        let mut steps = steps(&own, &self.parent_couplings(i));
        // The model's steps come out ascending; keep them so whatever the rounding.
        steps.sort_by(|a, b| a.0.total_cmp(&b.0));
        let reading = |&(pka, s): &(f64, usize)| {
            let site = &own[s];
            let moved = Z90 * INTERACTION_REL_SD * (pka - site.pka).abs();
            let widen = |half: f64| (half.powi(2) + moved.powi(2)).sqrt();
            Reading {
                pka,
                pka_low: pka - widen(site.pka - site.pka_low),
                pka_high: pka + widen(site.pka_high - site.pka),
                atom: site.atom,
                group: site.group.clone(),
            }
        };
        let own = &own;
        let listed = |kind: Kind| {
            steps
                .iter()
                .filter(move |(p, s)| own[*s].kind == kind && in_window(*p))
        };
        let fixed = self
            .compound
            .parents
            .get(i)
            .map_or(0, |p| p.permanent_charge);
        let top = fixed + own.iter().filter(|s| s.kind == Kind::Base).count() as i32;
        let pkas: Vec<f64> = steps.iter().map(|s| s.0).collect();
        let k = reference_level(&pkas, top);
        let acid = listed(Kind::Acid)
            .next()
            .or_else(|| steps.get(k))
            .map(reading);
        let base = listed(Kind::Base)
            .next_back()
            .or_else(|| k.checked_sub(1).and_then(|j| steps.get(j)))
            .map(reading);
        Readings { steps, acid, base }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn reference_level_is_the_least_charged_dominant_one() {
        // Glycine-like: cation -> zwitterion at 2.35, -> anion at 9.6; top charge +1.
        assert_eq!(reference_level(&[2.35, 9.6], 1), 1);
        // Hydroxyarenesulfonic acid: 0 -> -1 at -2, -1 -> -2 at 9; the neutral form never
        // dominates inside pH 0-14, so the monoanion is the reference.
        assert_eq!(reference_level(&[-2.0, 9.0], 0), 1);
        // A plain base: the neutral form dominates above its pKa.
        assert_eq!(reference_level(&[5.2], 1), 1);
        // No sites at all.
        assert_eq!(reference_level(&[], 0), 0);
    }
}
