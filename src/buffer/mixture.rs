//! A buffer solution as the equilibrium engine sees it: moles of the system, strong cations
//! and strong anions in a volume. Solving it is the engine's charge balance (Davies activity,
//! temperature-shifted constants); this file adds the two questions a recipe asks — which
//! amount of something reaches a target pH (bisection, since the pH rises monotonically with
//! the base added), and how strongly the solution resists a change of pH (buffer capacity).

use super::system::{BufferForm, BufferSystem};
use crate::equilibrium::{AqueousLayer, Conditions, Equilibrium, solve_ph};
use crate::error::{Error, Result};

/// What is dissolved in the final volume.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Mixture {
    pub system_mol: f64,
    pub strong_cations_mol: f64,
    pub strong_anions_mol: f64,
    pub volume_l: f64,
}

impl Mixture {
    /// Nothing yet, in `volume_l`.
    pub fn empty(volume_l: f64) -> Mixture {
        Mixture {
            system_mol: 0.0,
            strong_cations_mol: 0.0,
            strong_anions_mol: 0.0,
            volume_l,
        }
    }

    /// The same with `mol` formula units of `form` added.
    pub fn with_form(mut self, form: &BufferForm, mol: f64) -> Mixture {
        self.system_mol += mol * form.units;
        self.strong_cations_mol += mol * form.strong_cations;
        self.strong_anions_mol += mol * form.strong_anions;
        self
    }

    /// The same with strong base (positive) or strong acid (negative) added, mol.
    pub fn with_strong(mut self, mol: f64) -> Mixture {
        if mol >= 0.0 {
            self.strong_cations_mol += mol;
        } else {
            self.strong_anions_mol -= mol;
        }
        self
    }

    /// The aqueous layer the engine solves.
    pub fn layer(&self, system: &BufferSystem) -> AqueousLayer {
        AqueousLayer {
            strong_cations_mol: self.strong_cations_mol,
            strong_anions_mol: self.strong_anions_mol,
            polyprotics: vec![system.polyprotic(self.system_mol)],
            ..AqueousLayer::water(self.volume_l)
        }
    }

    /// The equilibrium of this solution.
    pub fn solve(&self, system: &BufferSystem, c: &Conditions) -> Result<Equilibrium> {
        solve_ph(&self.layer(system), c)
    }
}

/// Bisection steps on the amount: 2^-80 of the bracket is far below any balance.
const STEPS: usize = 80;
/// pH agreement at which the search stops early.
const PH_TOLERANCE: f64 = 1e-9;

/// The `x` in `lo..=hi` whose mixture `make(x)` has pH `target`, with its equilibrium; the pH
/// must rise with `x`. Outside the reachable range: `Error::Unreachable` naming the range
/// and `what` is varied.
pub fn reach(
    target: f64,
    (lo, hi): (f64, f64),
    system: &BufferSystem,
    c: &Conditions,
    what: &str,
    make: impl Fn(f64) -> Mixture,
) -> Result<(f64, Equilibrium)> {
    let ph = |x: f64| make(x).solve(system, c);
    let (mut a, mut b) = (lo, hi);
    let (low, high) = (ph(a)?, ph(b)?);
    if target < low.ph - 1e-6 || target > high.ph + 1e-6 {
        return Err(Error::Unreachable(format!(
            "pH {target:.2} is outside what {what} reaches: pH {:.2} to {:.2}",
            low.ph, high.ph
        )));
    }
    let mut best = if (low.ph - target).abs() < (high.ph - target).abs() {
        (a, low)
    } else {
        (b, high)
    };
    for _ in 0..STEPS {
        if (best.1.ph - target).abs() < PH_TOLERANCE {
            break;
        }
        let mid = 0.5 * (a + b);
        let eq = ph(mid)?;
        if eq.ph < target {
            a = mid;
        } else {
            b = mid;
        }
        best = (mid, eq);
    }
    Ok(best)
}

/// Buffer capacity β = dC_base/dpH, mol/L per pH unit: the strong base (as its concentration)
/// that moves the pH by one unit, by a central difference of the full equilibrium (activity
/// and all) around the mixture. The step is small against the buffer yet far above rounding.
pub fn capacity(mix: &Mixture, system: &BufferSystem, c: &Conditions) -> Result<f64> {
    let scale =
        (mix.system_mol + mix.strong_cations_mol + mix.strong_anions_mol).max(1e-3 * mix.volume_l);
    let step = 1e-5 * scale;
    let up = mix.with_strong(step).solve(system, c)?.ph;
    let down = mix.with_strong(-step).solve(system, c)?.ph;
    Ok(2.0 * step / mix.volume_l / (up - down))
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::equilibrium::Activity;

    fn acetate() -> BufferSystem {
        let systems = BufferSystem::builtin().unwrap();
        BufferSystem::find(&systems, "acetate").unwrap().clone()
    }

    #[test]
    fn capacity_matches_van_slyke_for_a_monoprotic_buffer() {
        // Van Slyke (1922): β = ln10 (h + Kw/h + C Ka h / (Ka + h)²), ideal solution; written
        // out here independently of the engine.
        let sys = acetate();
        let c = Conditions::standard();
        let form = sys.form("naoac").unwrap().clone();
        let mix = Mixture::empty(1.0)
            .with_form(&form, 0.05)
            .with_strong(-0.03); // 0.05 M acetate, 0.03 M of it protonated by HCl
        let eq = mix.solve(&sys, &c).unwrap();
        let h = 10f64.powf(-eq.ph);
        let ka = 10f64.powf(-4.756);
        let want = std::f64::consts::LN_10 * (h + c.kw() / h + 0.05 * ka * h / (ka + h).powi(2));
        let got = capacity(&mix, &sys, &c).unwrap();
        assert!((got / want - 1.0).abs() < 1e-4, "{got} vs {want}");
    }

    #[test]
    fn reach_finds_the_amount_and_refuses_the_impossible() {
        let sys = acetate();
        let c = Conditions::standard().with_activity(Activity::Davies);
        let form = sys.form("acetic_acid").unwrap().clone();
        let make = |x: f64| Mixture::empty(1.0).with_form(&form, 0.1).with_strong(x);
        let (x, eq) = reach(4.5, (0.0, 0.1), &sys, &c, "NaOH", make).unwrap();
        assert!((eq.ph - 4.5).abs() < 1e-6 && x > 0.0 && x < 0.1);
        assert!(matches!(
            reach(14.5, (0.0, 0.1), &sys, &c, "NaOH", make),
            Err(Error::Unreachable(_))
        ));
    }
}
