//! Microstates of one molecule's sites: every site is neutral or ionized, so n sites give 2^n
//! forms, and each form's weight follows from the site constants and from pairwise
//! interactions between charged sites. Mean charge, the all-neutral fraction, each site's
//! fraction ionized and the macroscopic (titration) constants all come from these weights.
//!
//! # The weights
//! Take the all-neutral form N (every acid site HA, every base site B) as reference. In a
//! microstate s, ionizing acid site i releases a proton (`pH - pKa_i` in log10 units),
//! ionizing base site i binds one (`pKa_i - pH`). Two ionized sites i, j with charges
//! q_i, q_j (±1) add `-q_i q_j ε_ij`: like charges cost ε_ij, opposite charges gain it
//! (Perrin, Dempsey & Serjeant 1981, ch. 5: the electrostatic term between ionized groups).
//! The site pKa values are therefore microscopic constants with every other site neutral.
//! Statistical factors (log 2 for two equal sites) are not put in by hand: they come out of
//! counting the microstates.
//!
//! With activities, the mass-action law fixes the activity ratio a(s)/a(N). A species of
//! charge z has concentration a/γ_z, so in concentration terms
//!
//! log10 [s]/[N] = Σ_acid ionized (pH - pKa_i) + Σ_base ionized (pKa_i - pH)
//!                 - Σ_pairs q_i q_j ε_ij + log10 γ(z_N) - log10 γ(z_s),
//!
//! where pH = -log10 a(H+). Ionizing a site changes both the charge and the proton count by
//! q_i, so the pH term is `-(z_s - z_N) pH`: a microstate's weight depends on pH only through
//! its charge, and the mean charge falls monotonically with pH (its derivative is
//! `-ln 10 · Var(z)`), which keeps the charge balance bracketable.
//!
//! Above [`MAX_COUPLED_SITES`] sites the 2^n enumeration is too large; the sites are then
//! treated as independent (interactions dropped), but charge levels are still summed exactly
//! so activity coefficients stay right.

use super::species::{Site, SiteKind};

/// Most sites enumerated as microstates (2^10 = 1024 forms).
pub const MAX_COUPLED_SITES: usize = 10;

/// Interaction between two sites of one molecule, in pK units (log10 of the equilibrium
/// factor). `shift` ≥ 0: the penalty when both sites carry like charges, the bonus when they
/// carry opposite charges.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Coupling {
    pub a: usize,
    pub b: usize,
    pub shift: f64,
}

/// Distribution of a molecule over its forms at one pH.
#[derive(Debug, Clone, PartialEq)]
pub struct Distribution {
    /// Mean charge of the sites (fixed charge not included).
    pub mean_site_charge: f64,
    /// Fraction in the all-neutral microstate.
    pub fraction_neutral: f64,
    /// Per site: fraction in the charged form.
    pub fraction_ionized: Vec<f64>,
}

fn charge(site: &Site) -> i32 {
    match site.kind {
        SiteKind::Acid => -1,
        SiteKind::Base => 1,
    }
}

/// log10 of Σ 10^x, kept finite for large exponents.
fn log10_sum(values: impl Iterator<Item = f64> + Clone) -> f64 {
    let max = values.clone().fold(f64::NEG_INFINITY, f64::max);
    if !max.is_finite() {
        return max;
    }
    max + values.map(|x| 10f64.powf(x - max)).sum::<f64>().log10()
}

/// The pH-independent part of each microstate's log10 weight and its site charge, indexed by
/// the bit mask of ionized sites. Each mask extends a smaller one by its lowest set bit, so a
/// table of 2^n entries costs about n·2^n additions.
fn standard_terms(sites: &[Site], couplings: &[Coupling]) -> (Vec<f64>, Vec<i32>) {
    let n = sites.len();
    let mut pair = vec![0.0; n * n];
    for c in couplings {
        if c.a < n && c.b < n && c.a != c.b {
            let sign = -(charge(&sites[c.a]) * charge(&sites[c.b])) as f64;
            pair[c.a * n + c.b] += sign * c.shift;
            pair[c.b * n + c.a] += sign * c.shift;
        }
    }
    let mut terms = vec![0.0; 1 << n];
    let mut charges = vec![0; 1 << n];
    for mask in 1usize..(1 << n) {
        let i = mask.trailing_zeros() as usize;
        let rest = mask & (mask - 1);
        let site = &sites[i];
        let own = match site.kind {
            SiteKind::Acid => -site.pka,
            SiteKind::Base => site.pka,
        };
        let mut interaction = 0.0;
        let mut others = rest;
        while others != 0 {
            let j = others.trailing_zeros() as usize;
            interaction += pair[i * n + j];
            others &= others - 1;
        }
        terms[mask] = terms[rest] + own + interaction;
        charges[mask] = charges[rest] + charge(site);
    }
    (terms, charges)
}

/// Distribution over forms at `ph` (-log10 a(H+)); `log10_gamma(z)` is the activity
/// coefficient of a species of total charge z, `fixed` the charge no pH removes.
pub fn distribution(
    sites: &[Site],
    couplings: &[Coupling],
    fixed: i32,
    ph: f64,
    log10_gamma: &dyn Fn(i32) -> f64,
) -> Distribution {
    Table::new(sites, couplings)
        .distribution(sites, fixed, ph, log10_gamma)
        .0
}

/// The pH-free part of one molecule's microstate weights, worked out once and used at many
/// pH values (a solve evaluates the same solutes dozens of times).
#[derive(Debug, Clone)]
pub(crate) struct Table {
    /// Empty above [`MAX_COUPLED_SITES`] (independent sites, no enumeration).
    terms: Vec<f64>,
    charges: Vec<i32>,
}

impl Table {
    pub(crate) fn new(sites: &[Site], couplings: &[Coupling]) -> Table {
        if sites.len() > MAX_COUPLED_SITES {
            return Table {
                terms: Vec::new(),
                charges: Vec::new(),
            };
        }
        let (terms, charges) = standard_terms(sites, couplings);
        Table { terms, charges }
    }

    /// As [`distribution`], for the `sites` this table was made from, with the mean squared
    /// site charge when the forms were enumerated (for the ionic strength).
    pub(crate) fn distribution(
        &self,
        sites: &[Site],
        fixed: i32,
        ph: f64,
        log10_gamma: &dyn Fn(i32) -> f64,
    ) -> (Distribution, Option<f64>) {
        let n = sites.len();
        if n > MAX_COUPLED_SITES {
            return (
                independent_distribution(sites, fixed, ph, log10_gamma),
                None,
            );
        }
        let (terms, charges) = (&self.terms, &self.charges);
        // γ is looked up once per charge level, not once per microstate (at most 21 levels).
        let lowest = -(n as i32);
        let mut gammas = [0.0; 2 * MAX_COUPLED_SITES + 1];
        for (k, z) in (lowest..=n as i32).enumerate() {
            gammas[k] = log10_gamma(fixed + z);
        }
        let mut weights: Vec<f64> = terms
            .iter()
            .zip(charges)
            .map(|(t, &z)| t - z as f64 * ph - gammas[(z - lowest) as usize])
            .collect();
        // Scaled by the largest weight so no pH overflows; each power is taken once.
        let max = weights.iter().copied().fold(f64::NEG_INFINITY, f64::max);
        let mut sum = 0.0;
        for w in weights.iter_mut() {
            // 10^x as e^(x ln 10): the exponent is at most 0 here, so the rounding of the
            // product costs no more than a few units in the last place, and exp is cheaper.
            *w = ((*w - max) * std::f64::consts::LN_10).exp();
            sum += *w;
        }
        let mut ionized = vec![0.0; n];
        let mut mean = 0.0;
        let mut square = 0.0;
        let mut neutral = 0.0;
        for (mask, w) in weights.iter().enumerate() {
            let pm = w / sum;
            if mask == 0 {
                neutral = pm;
            }
            let z = charges[mask] as f64;
            mean += pm * z;
            square += pm * z * z;
            let mut bits = mask;
            while bits != 0 {
                ionized[bits.trailing_zeros() as usize] += pm;
                bits &= bits - 1;
            }
        }
        let d = Distribution {
            mean_site_charge: mean,
            fraction_neutral: neutral,
            fraction_ionized: ionized,
        };
        (d, Some(square))
    }
}

impl Table {
    /// `distribution(..).fraction_ionized[i]` at ideal activities and no fixed charge, with the
    /// same operations in the same order (so the same value to the last bit), into `weights`
    /// instead of fresh buffers: the half-ionization bisection asks for it dozens of times.
    fn ideal_fraction_ionized(&self, i: usize, ph: f64, weights: &mut Vec<f64>) -> f64 {
        weights.clear();
        weights.extend(
            self.terms
                .iter()
                .zip(&self.charges)
                .map(|(t, &z)| t - z as f64 * ph - 0.0),
        );
        let max = weights.iter().copied().fold(f64::NEG_INFINITY, f64::max);
        let mut sum = 0.0;
        for w in weights.iter_mut() {
            *w = ((*w - max) * std::f64::consts::LN_10).exp();
            sum += *w;
        }
        let mut ionized = 0.0;
        for (mask, w) in weights.iter().enumerate() {
            if mask >> i & 1 == 1 {
                ionized += w / sum;
            }
        }
        ionized
    }
}

/// log10 weights of each site-charge level (index z + n_acid) for independent sites: the
/// product of the per-site factors (1 + 10^term) expanded by charge, an O(n²) convolution.
/// `skip` leaves one site out.
fn charge_levels(sites: &[Site], ph: f64, skip: Option<usize>) -> Vec<f64> {
    let n_acid = sites.iter().filter(|s| s.kind == SiteKind::Acid).count();
    let mut levels = vec![f64::NEG_INFINITY; sites.len() + 1];
    levels[n_acid] = 0.0;
    for (i, s) in sites.iter().enumerate() {
        if Some(i) == skip {
            continue;
        }
        let (term, step): (f64, isize) = match s.kind {
            SiteKind::Acid => (ph - s.pka, -1),
            SiteKind::Base => (s.pka - ph, 1),
        };
        let mut next = vec![f64::NEG_INFINITY; levels.len()];
        for (k, &w) in levels.iter().enumerate() {
            if w == f64::NEG_INFINITY {
                continue;
            }
            let moved = (k as isize + step) as usize;
            next[k] = log10_sum([next[k], w].into_iter());
            next[moved] = log10_sum([next[moved], w + term].into_iter());
        }
        levels = next;
    }
    levels
}

/// Fallback for many sites: independent sites, exact over charge levels.
fn independent_distribution(
    sites: &[Site],
    fixed: i32,
    ph: f64,
    log10_gamma: &dyn Fn(i32) -> f64,
) -> Distribution {
    let n_acid = sites.iter().filter(|s| s.kind == SiteKind::Acid).count() as i32;
    let with_gamma = |levels: Vec<f64>| -> Vec<f64> {
        levels
            .into_iter()
            .enumerate()
            .map(|(k, w)| w - log10_gamma(fixed + k as i32 - n_acid))
            .collect()
    };
    let all = with_gamma(charge_levels(sites, ph, None));
    let total = log10_sum(all.iter().copied());
    let mean = all
        .iter()
        .enumerate()
        .map(|(k, w)| (k as i32 - n_acid) as f64 * 10f64.powf(w - total))
        .sum();
    // The all-neutral form is the only one at the reference level with weight 10^0.
    let neutral = 10f64.powf(-log10_gamma(fixed) - total);
    let ionized = sites
        .iter()
        .enumerate()
        .map(|(i, s)| {
            // Forms with site i ionized: the other sites' levels shifted by i's charge.
            let (term, step) = match s.kind {
                SiteKind::Acid => (ph - s.pka, -1),
                SiteKind::Base => (s.pka - ph, 1),
            };
            let others = charge_levels(sites, ph, Some(i));
            let shifted = others.iter().enumerate().filter_map(|(k, &w)| {
                let level = k as i32 + step;
                (0..=sites.len() as i32)
                    .contains(&level)
                    .then(|| w + term - log10_gamma(fixed + level - n_acid) - total)
            });
            shifted.map(|x| 10f64.powf(x)).sum::<f64>().min(1.0)
        })
        .collect();
    Distribution {
        mean_site_charge: mean,
        fraction_neutral: neutral,
        fraction_ionized: ionized,
    }
}

/// Macroscopic pKa values, in the order the protons come off (most protonated form first):
/// pK for the step from charge level z+1 to z is log10 Z(z+1) - log10 Z(z), where Z(z) sums
/// the pH-free weights of every microstate of that charge (ideal activities, pH 0).
pub fn macro_pkas(sites: &[Site], couplings: &[Coupling]) -> Vec<f64> {
    let n = sites.len();
    let n_acid = sites.iter().filter(|s| s.kind == SiteKind::Acid).count() as i32;
    let levels: Vec<f64> = if n > MAX_COUPLED_SITES {
        charge_levels(sites, 0.0, None)
    } else {
        let (terms, charges) = standard_terms(sites, couplings);
        (0..=n as i32)
            .map(|k| {
                let z = k - n_acid;
                log10_sum(
                    terms
                        .iter()
                        .zip(&charges)
                        .filter(|(_, c)| **c == z)
                        .map(|(t, _)| *t),
                )
            })
            .collect()
    };
    (0..n).rev().map(|k| levels[k + 1] - levels[k]).collect()
}

/// pH at which site `i` is half ionized in the molecule (ideal activities), or `None` if it
/// stays on one side of one half over pH -10..30.
pub fn half_ionization_ph(sites: &[Site], couplings: &[Coupling], i: usize) -> Option<f64> {
    if sites.len() > MAX_COUPLED_SITES {
        // Independent sites with ideal activities: each follows its own constant exactly, and
        // bisecting the O(n^3) distribution for each of n sites took seconds at 60 sites.
        return sites
            .get(i)
            .map(|s| s.pka)
            .filter(|p| (-10.0..30.0).contains(p));
    }
    // One table and one weight buffer for the whole bisection.
    let table = Table::new(sites, couplings);
    let mut weights = Vec::new();
    let mut f = |ph: f64| table.ideal_fraction_ionized(i, ph, &mut weights) - 0.5;
    // An acid site ionizes as pH rises, a base site as it falls.
    let rising = sites.get(i)?.kind == SiteKind::Acid;
    // A site coupled to no other one titrates on its own (the weights factor), half ionized
    // exactly at its constant: a midpoint clearly on one side of it is decided without
    // evaluating the distribution. Near the constant, where rounding could decide, it is
    // evaluated as before, so the bisection takes the same steps and ends on the same value.
    let pka = sites[i].pka;
    let alone = pka.is_finite()
        && !couplings.iter().any(|c| {
            c.a < sites.len() && c.b < sites.len() && c.a != c.b && (c.a == i || c.b == i)
        });
    let (mut lo, mut hi) = (-10.0, 30.0);
    let below = |x: f64| if rising { x < 0.0 } else { x > 0.0 };
    if !below(f(lo)) || below(f(hi)) {
        return None;
    }
    while hi - lo > 1e-6 {
        let mid = 0.5 * (lo + hi);
        let on_the_low_side = if alone && (mid - pka).abs() > CLEARLY_APART {
            mid < pka
        } else {
            below(f(mid))
        };
        if on_the_low_side {
            lo = mid;
        } else {
            hi = mid;
        }
    }
    Some(0.5 * (lo + hi))
}

/// pH distance from a lone site's constant beyond which the side of a half is certain: the
/// fraction then differs from one half by over 5e-10, while the rounding of a sum of at most
/// 2^10 weights stays below 1e-12.
const CLEARLY_APART: f64 = 1e-9;

#[cfg(test)]
mod tests {
    use super::*;

    fn ideal(_: i32) -> f64 {
        0.0
    }

    #[test]
    fn the_bisection_reads_the_same_fractions_as_the_distribution() {
        // Three coupled sites (a diamine and an acid): the buffer-reusing evaluation must give
        // the distribution's fraction to the last bit, so half-ionization pH values stay put.
        let sites = [Site::base(9.9), Site::base(6.8), Site::acid(4.2)];
        let couplings = [
            Coupling {
                a: 0,
                b: 1,
                shift: 1.1,
            },
            Coupling {
                a: 1,
                b: 2,
                shift: 0.6,
            },
        ];
        let table = Table::new(&sites, &couplings);
        let mut weights = Vec::new();
        for k in 0..=80 {
            let ph = -10.0 + 0.5 * k as f64 + 0.01;
            let d = distribution(&sites, &couplings, 0, ph, &ideal);
            for i in 0..sites.len() {
                let f = table.ideal_fraction_ionized(i, ph, &mut weights);
                assert_eq!(
                    f.to_bits(),
                    d.fraction_ionized[i].to_bits(),
                    "pH {ph}, site {i}"
                );
            }
        }
    }

    /// The half-ionization bisection evaluating the distribution at every midpoint.
    fn plain_half_ionization(sites: &[Site], couplings: &[Coupling], i: usize) -> Option<f64> {
        let f = |ph: f64| distribution(sites, couplings, 0, ph, &ideal).fraction_ionized[i] - 0.5;
        let rising = sites[i].kind == SiteKind::Acid;
        let below = |x: f64| if rising { x < 0.0 } else { x > 0.0 };
        let (mut lo, mut hi) = (-10.0, 30.0);
        if !below(f(lo)) || below(f(hi)) {
            return None;
        }
        while hi - lo > 1e-6 {
            let mid = 0.5 * (lo + hi);
            if below(f(mid)) {
                lo = mid;
            } else {
                hi = mid;
            }
        }
        Some(0.5 * (lo + hi))
    }

    #[test]
    fn lone_sites_end_the_bisection_on_the_same_bits() {
        // Constants on the bisection's own midpoints (10, 0, 5, 7.5), next to them, ordinary
        // ones, and ones outside the window; one pair coupled, the rest alone.
        let pkas = [
            10.0,
            0.0,
            5.0,
            7.5,
            10.0 + 1e-12,
            4.999_999_999_9,
            9.44664,
            4.65,
            -12.0,
            31.0,
            29.999_999,
        ];
        for (k, &p) in pkas.iter().enumerate() {
            for sites in [
                vec![Site::acid(p)],
                vec![Site::base(p)],
                vec![Site::acid(p), Site::base(9.1), Site::acid(3.3)],
                vec![Site::base(p), Site::base(p), Site::acid(p - 1.0)],
            ] {
                let couplings = [Coupling {
                    a: 1,
                    b: sites.len() - 1,
                    shift: 0.4 + 0.1 * k as f64,
                }];
                let couplings = if sites.len() > 2 { &couplings[..] } else { &[] };
                for i in 0..sites.len() {
                    let fast = half_ionization_ph(&sites, couplings, i).map(f64::to_bits);
                    let plain = plain_half_ionization(&sites, couplings, i).map(f64::to_bits);
                    assert_eq!(fast, plain, "pKa {p}, site {i} of {sites:?}");
                }
            }
        }
    }

    #[test]
    fn many_independent_sites_half_ionize_at_their_own_constants() {
        // Above MAX_COUPLED_SITES the sites are independent, so each one's half-ionization pH
        // is its pKa (Henderson-Hasselbalch); checked against the bisection of the full
        // distribution for two of them.
        let sites: Vec<Site> = (0..12)
            .map(|k| {
                if k % 2 == 0 {
                    Site::acid(2.0 + k as f64)
                } else {
                    Site::base(3.0 + k as f64)
                }
            })
            .collect();
        for i in [0, 5] {
            let f = |ph: f64| distribution(&sites, &[], 0, ph, &ideal).fraction_ionized[i];
            let p = half_ionization_ph(&sites, &[], i).unwrap();
            assert!((p - sites[i].pka).abs() < 1e-12);
            assert!((f(p) - 0.5).abs() < 1e-9, "site {i}: {}", f(p));
        }
    }

    #[test]
    fn one_site_is_henderson_hasselbalch() {
        let d = distribution(&[Site::acid(4.76)], &[], 0, 5.76, &ideal);
        assert!((d.fraction_ionized[0] - 10.0 / 11.0).abs() < 1e-14);
        assert!((d.fraction_neutral - 1.0 / 11.0).abs() < 1e-14);
        assert_eq!(macro_pkas(&[Site::base(9.25)], &[]), vec![9.25]);
    }

    #[test]
    fn two_equal_uncoupled_sites_differ_by_log4() {
        // Statistics alone: K1 = 2k, K2 = k/2, so pK2 - pK1 = log10 4 (Perrin, Dempsey &
        // Serjeant 1981, statistical factors).
        let m = macro_pkas(&[Site::acid(5.0), Site::acid(5.0)], &[]);
        assert!((m[0] - (5.0 - 2f64.log10())).abs() < 1e-12);
        assert!((m[1] - (5.0 + 2f64.log10())).abs() < 1e-12);
    }

    #[test]
    fn two_site_macro_constants_match_the_closed_form() {
        // Independent calculation: for acid a and base b coupled by ε (opposite charges),
        // Z(+1) = 10^b, Z(0) = 1 + 10^(b - a + ε), Z(-1) = 10^-a.
        let (a, b, e) = (4.3, 7.7, 1.9);
        let sites = [Site::acid(a), Site::base(b)];
        let c = [Coupling {
            a: 0,
            b: 1,
            shift: e,
        }];
        let z0 = (1.0 + 10f64.powf(b - a + e)).log10();
        let m = macro_pkas(&sites, &c);
        assert!((m[0] - (b - z0)).abs() < 1e-12);
        assert!((m[1] - (z0 + a)).abs() < 1e-12);
        // The sum of macro constants equals the sum of the site constants.
        assert!((m[0] + m[1] - a - b).abs() < 1e-12);
    }

    #[test]
    fn activity_weights_by_charge() {
        // One acid site, γ(-1) = 10^-0.1: [A-]/[HA] = 10^(pH - pKa) / γ(-1).
        let g = |z: i32| if z == -1 { -0.1 } else { 0.0 };
        let d = distribution(&[Site::acid(4.0)], &[], 0, 4.0, &g);
        let r: f64 = 10f64.powf(0.1);
        assert!((d.fraction_ionized[0] - r / (1.0 + r)).abs() < 1e-14);
    }

    #[test]
    fn fallback_agrees_with_enumeration_without_couplings() {
        // Eleven sites take the independent path; the same sites without the eleventh, and
        // its own Henderson–Hasselbalch factor, must agree with enumeration (ideal and with
        // a charge-dependent γ).
        let mut sites: Vec<Site> = (0..5).map(|k| Site::acid(3.0 + k as f64)).collect();
        sites.extend((0..5).map(|k| Site::base(6.0 + k as f64)));
        let g = |z: i32| -0.05 * (z * z) as f64;
        let exact = distribution(&sites, &[], 1, 6.3, &g);
        let fallback = independent_distribution(&sites, 1, 6.3, &g);
        assert!((exact.mean_site_charge - fallback.mean_site_charge).abs() < 1e-12);
        assert!((exact.fraction_neutral - fallback.fraction_neutral).abs() < 1e-14);
        for (x, y) in exact
            .fraction_ionized
            .iter()
            .zip(&fallback.fraction_ionized)
        {
            assert!((x - y).abs() < 1e-12);
        }
        let enumerated = macro_pkas(&sites, &[]);
        let levels = charge_levels(&sites, 0.0, None);
        let polynomial: Vec<f64> = (0..sites.len())
            .rev()
            .map(|k| levels[k + 1] - levels[k])
            .collect();
        for (x, y) in enumerated.iter().zip(&polynomial) {
            assert!((x - y).abs() < 1e-10);
        }
    }

    #[test]
    fn no_sites_and_many_sites_do_not_panic() {
        let d = distribution(&[], &[], 2, 7.0, &ideal);
        assert_eq!(d.fraction_neutral, 1.0);
        assert_eq!(d.mean_site_charge, 0.0);
        assert!(macro_pkas(&[], &[]).is_empty());
        let many: Vec<Site> = (0..12).map(|k| Site::acid(2.0 + k as f64)).collect();
        let d = distribution(&many, &[], 0, 7.0, &ideal);
        assert!(d.mean_site_charge.is_finite() && d.fraction_neutral.is_finite());
        assert_eq!(macro_pkas(&many, &[]).len(), 12);
        assert!(half_ionization_ph(&many, &[], 11).is_some());
    }

    #[test]
    fn mean_charge_falls_with_ph() {
        let sites = [
            Site::acid(2.0),
            Site::acid(4.0),
            Site::base(9.0),
            Site::base(9.5),
        ];
        let c = [
            Coupling {
                a: 0,
                b: 2,
                shift: 2.0,
            },
            Coupling {
                a: 2,
                b: 3,
                shift: 1.0,
            },
        ];
        let mut last = f64::INFINITY;
        for k in 0..=140 {
            let ph = -1.0 + 0.1 * k as f64;
            let z = distribution(&sites, &c, 0, ph, &ideal).mean_site_charge;
            assert!(z <= last + 1e-12);
            last = z;
        }
    }
}
