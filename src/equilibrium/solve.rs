//! pH of a layer from its charge balance:
//! [H+] + strong cations + Σ positive solute charge = [OH-] + strong anions
//! + Σ negative solute charge + [HCO3-] + 2 [CO3--].
//!
//! At fixed activity coefficients every positive term falls and every negative term rises with
//! pH, so the residual is monotone and bisection inside a bracket always finds the one root:
//! no initial guess, no divergence. With Davies activities the ionic strength is iterated
//! around that bracketed solve: solve pH at I, recompute I from the species, repeat; should the
//! plain iteration not settle, I itself is bisected (I_computed(I) - I changes sign between 0
//! and the largest I the species can give), so the nested solve always ends.
//! pH here means -log10 a(H+).

use super::AqueousLayer;
use super::activity::Gammas;
use super::carbonate::CarbonateSpecies;
use super::microstates::Table;
use super::species::{Protolyte, SoluteState};
use super::water::{Activity, Conditions};
use crate::error::{Error, Result};

/// The solved state of a layer.
#[derive(Debug, Clone, PartialEq)]
pub struct Equilibrium {
    /// -log10 of the H+ activity.
    pub ph: f64,
    pub volume_l: f64,
    /// [H+] and [OH-], mol/L.
    pub hydrogen_mol_l: f64,
    pub hydroxide_mol_l: f64,
    /// One entry per solute, in the layer's order.
    pub solutes: Vec<SoluteState>,
    /// Mean charge per formula unit of each reagent system, in the layer's order.
    pub polyprotic_charges: Vec<f64>,
    /// Carbon species, with the CO2 released to (or taken from) the gas phase.
    pub carbonate: CarbonateSpecies,
    /// Ionic strength, mol/L (self-consistent with the activities used).
    pub ionic_strength: f64,
    /// The activity model as solved (`Ideal`, or Davies with its A and I).
    pub gammas: Gammas,
    /// Charge balance left at the solution, mol/L (positive minus negative); near zero.
    pub charge_residual_mol_l: f64,
}

/// The layer with every constant moved to the temperature of `conditions`: solute sites by
/// their dpKa/dT where given, reagent systems by van 't Hoff.
pub fn at_temperature(layer: &AqueousLayer, conditions: &Conditions) -> AqueousLayer {
    let dt = conditions.temperature_c() - 25.0;
    let mut out = layer.clone();
    if dt == 0.0 {
        return out;
    }
    for solute in &mut out.solutes {
        for site in &mut solute.sites {
            if let Some(slope) = site.dpka_dt {
                site.pka += slope * dt;
            }
        }
    }
    for system in &mut out.polyprotics {
        system.pkas = system.pkas_at(conditions.temperature_k());
        system.dh_kj_mol = vec![None; system.pkas.len()];
    }
    out
}

/// Everything charged in the layer at one pH and one set of activity coefficients.
struct Snapshot {
    h: f64,
    oh: f64,
    solutes: Vec<SoluteState>,
    /// Each solute's mean squared charge, where its forms were enumerated.
    squares: Vec<Option<f64>>,
    polyprotic: Vec<(f64, f64)>,
    carbonate: CarbonateSpecies,
}

/// `tables` holds each solute's microstate table, made once per solve.
fn snapshot(
    layer: &AqueousLayer,
    tables: &[Table],
    ph: f64,
    c: &Conditions,
    g: &Gammas,
) -> Snapshot {
    let lg = |z: i32| g.log10_gamma(z);
    let g1 = g.gamma(1);
    let (solutes, squares) = layer
        .solutes
        .iter()
        .zip(tables)
        .map(|(s, t)| s.state_and_square_in(t, ph, &lg))
        .unzip();
    Snapshot {
        // a(H+) = 10^-pH and a(OH-) = Kw / a(H+), both over γ of a monovalent ion.
        h: 10f64.powf(-ph) / g1,
        oh: 10f64.powf(ph - c.pkw()) / g1,
        solutes,
        squares,
        polyprotic: layer
            .polyprotics
            .iter()
            .map(|p| p.charge_moments(ph, &lg))
            .collect(),
        carbonate: CarbonateSpecies::in_layer(layer.carbonate_mol, layer.volume_l, ph, c, &lg),
    }
}

fn residual(layer: &AqueousLayer, s: &Snapshot) -> f64 {
    let solutes: f64 = layer
        .solutes
        .iter()
        .zip(&s.solutes)
        .map(|(p, st)| aqueous_mol(p, st, layer.volume_l) * st.mean_charge)
        .sum();
    let systems: f64 = layer
        .polyprotics
        .iter()
        .zip(&s.polyprotic)
        .map(|(p, m)| p.total_mol * m.0)
        .sum();
    s.h - s.oh
        + (layer.strong_cations_mol - layer.strong_anions_mol
            + solutes
            + systems
            + s.carbonate.charge_mol())
            / layer.volume_l
}

/// Moles of a solute in the aqueous layer: all of it, or with an organic layer in contact the
/// share its neutral fraction leaves in water. The charge balance counts only these. It stays
/// monotone in pH: d ln f_neutral / dpH = ln 10 · (mean charge), so the share in water falls
/// exactly where the charge per molecule is positive and falling, and rises where it is
/// negative and falling; the product (aqueous charge) falls with pH either way.
pub(super) fn aqueous_mol(p: &Protolyte, st: &SoluteState, volume_l: f64) -> f64 {
    p.total_mol * p.aqueous_share(st.fraction_neutral, volume_l)
}

/// Positive minus negative charge, mol/L, if the layer (constants already at the temperature
/// of `conditions`) had pH `ph`, with ideal activities.
pub fn charge_residual(layer: &AqueousLayer, ph: f64, conditions: &Conditions) -> f64 {
    let tables = tables(layer);
    residual(
        layer,
        &snapshot(layer, &tables, ph, conditions, &Gammas::Ideal),
    )
}

/// Mean squared charge of a solute at `ph`: the variance of its charge is
/// -(1/ln 10) d<z>/dpH at fixed activity coefficients (each proton moves the charge by one),
/// taken by a central difference where the forms were not enumerated (`square` is `None`;
/// otherwise it is the enumerated mean square itself). `table` is the solute's own table.
pub(super) fn mean_square_charge(
    p: &Protolyte,
    table: &Table,
    ph: f64,
    (mean, square): (f64, Option<f64>),
    lg: &dyn Fn(i32) -> f64,
) -> f64 {
    if let Some(square) = square {
        return square;
    }
    const STEP: f64 = 1e-4;
    let up = p.state_in(table, ph + STEP, lg).mean_charge;
    let down = p.state_in(table, ph - STEP, lg).mean_charge;
    let variance = (-(up - down) / (2.0 * STEP) / std::f64::consts::LN_10).max(0.0);
    variance + mean * mean
}

/// Ionic strength, mol/L, of the layer at `ph` with activities `g`. Strong ions count as
/// singly charged (Na+, K+, Cl-): the table's Mg2+/Ca2+/SO4-- are rare in a workup layer.
fn ionic_strength(
    layer: &AqueousLayer,
    tables: &[Table],
    ph: f64,
    c: &Conditions,
    g: &Gammas,
) -> f64 {
    let s = snapshot(layer, tables, ph, c, g);
    let lg = |z: i32| g.log10_gamma(z);
    let solutes: f64 = layer
        .solutes
        .iter()
        .zip(&s.solutes)
        .zip(tables)
        .zip(&s.squares)
        .map(|(((p, st), t), &sq)| {
            aqueous_mol(p, st, layer.volume_l)
                * mean_square_charge(p, t, ph, (st.mean_charge, sq), &lg)
        })
        .sum();
    let systems: f64 = layer
        .polyprotics
        .iter()
        .zip(&s.polyprotic)
        .map(|(p, m)| p.total_mol * m.1)
        .sum();
    let moles = layer.strong_cations_mol
        + layer.strong_anions_mol
        + solutes
        + systems
        + s.carbonate.square_charge_mol();
    0.5 * (s.h + s.oh + moles / layer.volume_l)
}

/// Starting bracket in pH; wide enough for any bench solution.
const BRACKET: (f64, f64) = (-4.0, 20.0);
/// How far the bracket may be widened for absurd inputs, each way. 10^±200 is still a
/// finite double.
const WIDEST: (f64, f64) = (-150.0, 170.0);
/// Relative change in ionic strength at which the iteration stops.
const I_TOLERANCE: f64 = 1e-12;

/// The pH that closes the charge balance at fixed activity coefficients. `guess` (the root of
/// a nearby problem, as in the ionic-strength iteration) only narrows the first bracket; the
/// answer is the same neighbouring doubles either way.
fn bisect_ph(
    layer: &AqueousLayer,
    tables: &[Table],
    c: &Conditions,
    g: &Gammas,
    guess: Option<f64>,
) -> Result<f64> {
    let f = |ph: f64| residual(layer, &snapshot(layer, tables, ph, c, g));
    // The residual falls with pH: positive (or zero) at the low end, negative at the high end.
    let narrow = guess
        .filter(|p| (BRACKET.0..BRACKET.1).contains(p))
        .and_then(|p| {
            [1e-6, 1e-3, 0.3].into_iter().find_map(|step| {
                let (lo, hi) = (p - step, p + step);
                let (f_lo, f_hi) = (f(lo), f(hi));
                (f_lo >= 0.0 && f_hi <= 0.0).then_some(((lo, f_lo), (hi, f_hi)))
            })
        });
    let ((lo, f_lo), (hi, f_hi)) = match narrow {
        Some(bracket) => bracket,
        None => {
            let (mut lo, mut hi) = BRACKET;
            let mut f_lo = f(lo);
            while f_lo < 0.0 {
                lo -= 10.0;
                if lo < WIDEST.0 {
                    return Err(no_balance());
                }
                f_lo = f(lo);
            }
            let mut f_hi = f(hi);
            while f_hi > 0.0 {
                hi += 10.0;
                if hi > WIDEST.1 {
                    return Err(no_balance());
                }
                f_hi = f(hi);
            }
            ((lo, f_lo), (hi, f_hi))
        }
    };
    if f_lo.is_nan() || f_hi.is_nan() {
        return Err(no_balance());
    }
    // Down to neighbouring doubles, as bisection would end: the last digits matter when
    // large, nearly cancelling solute charges meet a small [H+]. The residual falls with pH,
    // so its negative rises through the root.
    let g = |ph: f64| match f(ph) {
        r if r.is_nan() => Err(no_balance()),
        r => Ok(-r),
    };
    let (lo, hi) = super::root::shrink(g, (lo, -f_lo), (hi, -f_hi), |_, g| g == 0.0)?;
    Ok(0.5 * (lo + hi))
}

/// Davies activities with the ionic strength they imply at the pH they give.
fn self_consistent(
    layer: &AqueousLayer,
    tables: &[Table],
    c: &Conditions,
) -> Result<(Gammas, Option<f64>)> {
    let a = c.davies_a();
    let davies = |i: f64| Gammas::Davies {
        a,
        ionic_strength: i,
    };
    // I the species give when the activities are those of `i`; each solve starts next to
    // the pH the last one found.
    let last_ph = std::cell::Cell::new(None);
    let implied = |i: f64| -> Result<f64> {
        let g = davies(i);
        let ph = bisect_ph(layer, tables, c, &g, last_ph.get())?;
        last_ph.set(Some(ph));
        Ok(ionic_strength(layer, tables, ph, c, &g))
    };
    let close = |a: f64, b: f64| (a - b).abs() <= I_TOLERANCE * a.abs().max(b.abs()) + 1e-300;
    let mut i = implied(0.0)?;
    let mut last = (0.0, i);
    for _ in 0..60 {
        let next = implied(i)?;
        if close(next, i) {
            return Ok((davies(next), last_ph.get()));
        }
        (i, last) = (super::root::secant_fixed_point(last, (i, next)), (i, next));
    }
    // Fallback: bisect g(I) = implied(I) - I. g(0) >= 0; the coefficients stop changing past
    // the Davies limit, so implied(I) is constant there and g < 0 beyond that constant.
    let cap = super::activity::DAVIES_LIMIT_M;
    let (mut lo, mut hi) = (0.0, cap.max(implied(cap)?) * (1.0 + 1e-9) + 1e-300);
    for _ in 0..200 {
        let mid = 0.5 * (lo + hi);
        if implied(mid)? > mid {
            lo = mid;
        } else {
            hi = mid;
        }
        if close(lo, hi) {
            break;
        }
    }
    Ok((davies(0.5 * (lo + hi)), last_ph.get()))
}

/// Solves the charge balance of `layer` for its pH under `conditions` (temperature,
/// activity model, CO2 mode).
pub fn solve_ph(layer: &AqueousLayer, conditions: &Conditions) -> Result<Equilibrium> {
    layer.validate()?;
    let layer = at_temperature(layer, conditions);
    let tables = tables(&layer);
    let (gammas, guess) = match conditions.activity() {
        Activity::Ideal => (Gammas::Ideal, None),
        Activity::Davies => self_consistent(&layer, &tables, conditions)?,
    };
    let ph = bisect_ph(&layer, &tables, conditions, &gammas, guess)?;
    let s = snapshot(&layer, &tables, ph, conditions, &gammas);
    Ok(Equilibrium {
        ph,
        volume_l: layer.volume_l,
        hydrogen_mol_l: s.h,
        hydroxide_mol_l: s.oh,
        charge_residual_mol_l: residual(&layer, &s),
        ionic_strength: ionic_strength(&layer, &tables, ph, conditions, &gammas),
        solutes: s.solutes,
        polyprotic_charges: s.polyprotic.iter().map(|m| m.0).collect(),
        carbonate: s.carbonate,
        gammas,
    })
}

/// Each solute's microstate table, in the layer's order.
pub(super) fn tables(layer: &AqueousLayer) -> Vec<Table> {
    layer.solutes.iter().map(Protolyte::table).collect()
}

fn no_balance() -> Error {
    Error::Input(
        "the charge balance has no solution: amounts are far beyond any real solution".into(),
    )
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::equilibrium::species::{Protolyte, Site};

    #[test]
    fn pure_water_is_neutral() {
        let c = Conditions::standard();
        let eq = solve_ph(&AqueousLayer::water(0.1), &c).unwrap();
        assert!((eq.ph - c.pkw() / 2.0).abs() < 1e-9);
    }

    #[test]
    fn strong_acid_exact_quadratic() {
        // 1.0 mmol HCl in 100 mL: h² - c h - Kw = 0, solved here in closed form.
        let c = Conditions::standard();
        let mut layer = AqueousLayer::water(0.1);
        layer.strong_anions_mol = 1e-3;
        let eq = solve_ph(&layer, &c).unwrap();
        let conc = 1e-2;
        let h = conc / 2.0 + (conc * conc / 4.0 + c.kw()).sqrt();
        assert!((eq.ph + h.log10()).abs() < 1e-9);
        assert!((eq.ph - 2.00).abs() < 0.005);
    }

    #[test]
    fn weak_acid_exact_cubic_by_newton() {
        // 0.01 M of an acid pKa 4.2: h³ + Ka h² - (C Ka + Kw) h - Ka Kw = 0, solved by Newton
        // on the polynomial (a different method from the solver's bisection in pH).
        let c = Conditions::standard();
        let (ka, kw, conc) = (10f64.powf(-4.2), c.kw(), 0.01);
        let p = |h: f64| h * h * h + ka * h * h - (conc * ka + kw) * h - ka * kw;
        let dp = |h: f64| 3.0 * h * h + 2.0 * ka * h - (conc * ka + kw);
        let mut h = conc;
        for _ in 0..100 {
            h -= p(h) / dp(h);
        }
        let layer = AqueousLayer {
            solutes: vec![Protolyte::new(conc * 0.5, vec![Site::acid(4.2)], 0.0)],
            ..AqueousLayer::water(0.5)
        };
        let eq = solve_ph(&layer, &c).unwrap();
        assert!(
            (eq.ph + h.log10()).abs() < 1e-9,
            "{} vs {}",
            eq.ph,
            -h.log10()
        );
    }

    #[test]
    fn absurd_amounts_still_solve_or_fail_cleanly() {
        let c = Conditions::standard();
        let mut layer = AqueousLayer::water(1e-6);
        layer.strong_cations_mol = 1e3;
        let eq = solve_ph(&layer, &c).unwrap();
        assert!(eq.ph.is_finite() && eq.ph > 20.0);
        layer.strong_cations_mol = 1e300;
        assert!(matches!(solve_ph(&layer, &c), Err(Error::Input(_))));
        layer.strong_cations_mol = f64::NAN;
        assert!(matches!(solve_ph(&layer, &c), Err(Error::Input(_))));
        let bad_volume = AqueousLayer::water(0.0);
        assert!(matches!(solve_ph(&bad_volume, &c), Err(Error::Input(_))));
    }

    #[test]
    fn davies_strong_acid_closed_form() {
        // 0.01 M HCl with Davies activities: I = 0.01 + [OH-]/... ~ 0.01, so
        // pH = -log10(γ c) with log γ = -A (√I/(1+√I) - 0.3 I), written out here.
        let c = Conditions::standard().with_activity(Activity::Davies);
        let mut layer = AqueousLayer::water(0.1);
        layer.strong_anions_mol = 1e-3;
        let eq = solve_ph(&layer, &c).unwrap();
        let i: f64 = 0.01;
        let lg = -c.davies_a() * (i.sqrt() / (1.0 + i.sqrt()) - 0.3 * i);
        assert!(
            (eq.ph - (2.0 - lg)).abs() < 1e-6,
            "{} vs {}",
            eq.ph,
            2.0 - lg
        );
        assert!((eq.ionic_strength - 0.01).abs() < 1e-8);
        assert!(eq.ph > 2.04 && eq.ph < 2.05);
    }

    #[test]
    fn ionic_strength_counts_charge_squared() {
        // 1 mmol of a diacid fully ionized (pKa 2, 3) with 2 mmol Na+ in 1 L at ideal
        // activities: I = ½ (2e-3 · 1 + 1e-3 · 4) = 3e-3 (plus a trace of OH-).
        let c = Conditions::standard();
        let layer = AqueousLayer {
            solutes: vec![Protolyte::new(
                1e-3,
                vec![Site::acid(2.0), Site::acid(3.0)],
                0.0,
            )],
            strong_cations_mol: 2e-3,
            ..AqueousLayer::water(1.0)
        };
        let eq = solve_ph(&layer, &c).unwrap();
        assert!(
            (eq.ionic_strength - 3e-3).abs() < 2e-6,
            "{}",
            eq.ionic_strength
        );
    }

    #[test]
    fn temperature_moves_neutral_water() {
        // Neutral pH is pKw/2: 7.47 at 0 °C, 6.63 at 50 °C (Harned & Robinson 1940 fit).
        for (t, want) in [(0.0, 7.47), (50.0, 6.63)] {
            let c = Conditions::new(t).unwrap();
            let eq = solve_ph(&AqueousLayer::water(1.0), &c).unwrap();
            assert!((eq.ph - want).abs() < 0.01, "{t}: {}", eq.ph);
        }
    }

    #[test]
    fn site_slopes_apply_away_from_25_c() {
        // A base with dpKa/dT = -0.03 per K is 0.9 units weaker at 55 °C: half protonated at
        // pH 9.1 there.
        let site = Site {
            dpka_dt: Some(-0.03),
            ..Site::base(10.0)
        };
        let layer = AqueousLayer {
            solutes: vec![Protolyte::new(1e-3, vec![site], 0.0)],
            ..AqueousLayer::water(1.0)
        };
        let c = Conditions::new(55.0).unwrap();
        let shifted = at_temperature(&layer, &c);
        assert!((shifted.solutes[0].sites[0].pka - 9.1).abs() < 1e-12);
        assert_eq!(at_temperature(&layer, &Conditions::standard()), layer);
    }
}
