//! pH of a layer from its charge balance:
//! [H+] + strong cations + Σ positive solute charge = [OH-] + strong anions
//! + Σ negative solute charge + [HCO3-] + 2 [CO3--].
//!
//! Every positive term falls and every negative term rises with pH, so the residual is
//! monotone and bisection inside a bracket always finds the one root: no initial guess, no
//! divergence. Terms are formed from 10^(-pH) only inside a bounded pH window, so nothing
//! overflows.

use super::AqueousLayer;
use super::carbonate::CarbonateSpecies;
use super::species::SoluteState;
use super::water::Conditions;
use crate::error::{Error, Result};

/// The solved state of a layer.
#[derive(Debug, Clone, PartialEq)]
pub struct Equilibrium {
    /// -log10 of the H+ activity (concentration, with ideal activities).
    pub ph: f64,
    pub volume_l: f64,
    /// [H+] and [OH-], mol/L.
    pub hydrogen_mol_l: f64,
    pub hydroxide_mol_l: f64,
    /// One entry per solute, in the layer's order.
    pub solutes: Vec<SoluteState>,
    /// Carbon species; in the closed system all of it stays, so `co2_mol` is the CO2 that
    /// remains dissolved.
    pub carbonate: CarbonateSpecies,
    /// Charge balance left at the solution, mol/L (positive minus negative); near zero.
    pub charge_residual_mol_l: f64,
}

/// Positive minus negative charge, mol/L, if the layer had pH `ph`.
pub fn charge_residual(layer: &AqueousLayer, ph: f64, conditions: &Conditions) -> f64 {
    let v = layer.volume_l;
    let h = 10f64.powf(-ph);
    let oh = 10f64.powf(ph - conditions.pkw());
    let solutes: f64 = layer
        .solutes
        .iter()
        .map(|s| s.total_mol * s.mean_charge(ph))
        .sum();
    let carbon = CarbonateSpecies::at(layer.carbonate_mol, ph, conditions).charge_mol();
    h - oh + (layer.strong_cations_mol - layer.strong_anions_mol + solutes + carbon) / v
}

/// Starting bracket in pH; wide enough for any bench solution.
const BRACKET: (f64, f64) = (-4.0, 20.0);
/// How far the bracket may be widened for absurd inputs, each way. 10^±200 is still a
/// finite double.
const WIDEST: (f64, f64) = (-150.0, 170.0);
/// Width in pH at which bisection stops.
const TOLERANCE: f64 = 1e-11;

/// Solves the charge balance of `layer` for its pH.
pub fn solve_ph(layer: &AqueousLayer, conditions: &Conditions) -> Result<Equilibrium> {
    layer.validate()?;
    let f = |ph: f64| charge_residual(layer, ph, conditions);
    let (mut lo, mut hi) = BRACKET;
    // The residual falls with pH: positive at the low end, negative at the high end.
    while f(lo) < 0.0 {
        lo -= 10.0;
        if lo < WIDEST.0 {
            return Err(no_balance());
        }
    }
    while f(hi) > 0.0 {
        hi += 10.0;
        if hi > WIDEST.1 {
            return Err(no_balance());
        }
    }
    while hi - lo > TOLERANCE {
        let mid = 0.5 * (lo + hi);
        let r = f(mid);
        if r == 0.0 {
            (lo, hi) = (mid, mid);
        } else if r > 0.0 {
            lo = mid;
        } else {
            hi = mid;
        }
    }
    let ph = 0.5 * (lo + hi);
    Ok(Equilibrium {
        ph,
        volume_l: layer.volume_l,
        hydrogen_mol_l: 10f64.powf(-ph),
        hydroxide_mol_l: 10f64.powf(ph - conditions.pkw()),
        solutes: layer.solutes.iter().map(|s| s.state(ph)).collect(),
        carbonate: CarbonateSpecies::at(layer.carbonate_mol, ph, conditions),
        charge_residual_mol_l: f(ph),
    })
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
}
