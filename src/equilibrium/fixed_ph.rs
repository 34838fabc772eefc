//! The dose read the other way round: with the pH held at the target, the charge balance is a
//! function of the reagent amount alone, so the amount is one bracketed root, with no pH solve
//! per trial amount.
//!
//! At a fixed pH (-log10 a(H+)) and fixed activity coefficients every species fraction is
//! fixed: the solutes' charges and neutral fractions, each reagent system's mean charge, the
//! carbonate fractions. The amount n then enters only through totals that are linear in n
//! (strong ions, carbon, the reagent's own system) and through the volume V0 + n/c of a
//! solution stock (concentrations, the two-layer share of each solute, the vented CO2 cap).
//! The residual's sign at the target tells on which side of the answer n lies (the pH moves
//! monotonically with n, and the residual falls with pH), so bisection-safe root steps find
//! the one n. With Davies activities the ionic strength is iterated around that root, as
//! `solve.rs` iterates it around the pH.

use super::AqueousLayer;
use super::activity::Gammas;
use super::carbonate::CarbonateSpecies;
use super::microstates::Table;
use super::reagent::{Reagent, Stock};
use super::solve::{aqueous_mol, at_temperature, mean_square_charge, tables};
use super::species::SoluteState;
use super::water::{Activity, Conditions};
use crate::error::Result;

/// Relative change in ionic strength at which the iteration stops (as in `solve.rs`).
const I_TOLERANCE: f64 = 1e-12;

/// Everything about the layer plus reagent that does not depend on the amount, at the target
/// pH and one set of activity coefficients.
struct AtTarget<'a> {
    layer: &'a AqueousLayer,
    reagent: &'a Reagent,
    /// 1/c of a solution stock, L/mol (0 for a solid).
    litres_per_mol: f64,
    /// Index of the reagent's own system in `layer.polyprotics`.
    system: Option<usize>,
    ph: f64,
    conditions: &'a Conditions,
    gammas: Gammas,
    h: f64,
    oh: f64,
    solutes: Vec<SoluteState>,
    /// Mean squared charge of each solute.
    square_charges: Vec<f64>,
    /// (mean charge, mean squared charge) of each reagent system.
    systems: Vec<(f64, f64)>,
}

impl<'a> AtTarget<'a> {
    fn new(
        layer: &'a AqueousLayer,
        tables: &[Table],
        reagent: &'a Reagent,
        litres_per_mol: f64,
        ph: f64,
        conditions: &'a Conditions,
        gammas: Gammas,
    ) -> AtTarget<'a> {
        let lg = |z: i32| gammas.log10_gamma(z);
        let g1 = gammas.gamma(1);
        let (solutes, squares): (Vec<SoluteState>, Vec<Option<f64>>) = layer
            .solutes
            .iter()
            .zip(tables)
            .map(|(s, t)| s.state_and_square_in(t, ph, &lg))
            .unzip();
        let square_charges = layer
            .solutes
            .iter()
            .zip(&solutes)
            .zip(tables)
            .zip(squares)
            .map(|(((p, st), t), sq)| mean_square_charge(p, t, ph, (st.mean_charge, sq), &lg))
            .collect();
        let system = reagent
            .system
            .as_ref()
            .and_then(|s| layer.polyprotics.iter().position(|p| p.name == s.name));
        AtTarget {
            layer,
            reagent,
            litres_per_mol,
            system,
            ph,
            conditions,
            gammas,
            // The same expressions as `solve.rs`'s snapshot, so both agree to the last digit.
            h: 10f64.powf(-ph) / g1,
            oh: 10f64.powf(ph - conditions.pkw()) / g1,
            solutes,
            square_charges,
            systems: layer
                .polyprotics
                .iter()
                .map(|p| p.charge_moments(ph, &lg))
                .collect(),
        }
    }

    fn volume(&self, mol: f64) -> f64 {
        self.layer.volume_l + mol * self.litres_per_mol
    }

    fn carbonate(&self, mol: f64) -> CarbonateSpecies {
        let lg = |z: i32| self.gammas.log10_gamma(z);
        let total = self.layer.carbonate_mol + mol * self.reagent.carbonate;
        CarbonateSpecies::in_layer(total, self.volume(mol), self.ph, self.conditions, &lg)
    }

    /// Σ total · (first, second) charge moment of the reagent systems, mol.
    fn systems(&self, mol: f64) -> (f64, f64) {
        let mut sum = (0.0, 0.0);
        for (k, (p, m)) in self.layer.polyprotics.iter().zip(&self.systems).enumerate() {
            let total = p.total_mol + if Some(k) == self.system { mol } else { 0.0 };
            sum.0 += total * m.0;
            sum.1 += total * m.1;
        }
        sum
    }

    /// Positive minus negative charge, mol/L, with `mol` of reagent added.
    fn residual(&self, mol: f64) -> f64 {
        let v = self.volume(mol);
        let solutes: f64 = self
            .layer
            .solutes
            .iter()
            .zip(&self.solutes)
            .map(|(p, st)| aqueous_mol(p, st, v) * st.mean_charge)
            .sum();
        let strong = self.layer.strong_cations_mol + mol * self.reagent.strong_cations
            - self.layer.strong_anions_mol
            - mol * self.reagent.strong_anions;
        self.h - self.oh
            + (strong + solutes + self.systems(mol).0 + self.carbonate(mol).charge_mol()) / v
    }

    /// Ionic strength, mol/L, with `mol` of reagent added.
    fn ionic_strength(&self, mol: f64) -> f64 {
        let v = self.volume(mol);
        let solutes: f64 = self
            .layer
            .solutes
            .iter()
            .zip(&self.solutes)
            .zip(&self.square_charges)
            .map(|((p, st), sq)| aqueous_mol(p, st, v) * sq)
            .sum();
        let moles = self.layer.strong_cations_mol
            + self.layer.strong_anions_mol
            + mol * (self.reagent.strong_cations + self.reagent.strong_anions)
            + solutes
            + self.systems(mol).1
            + self.carbonate(mol).square_charge_mol();
        0.5 * (self.h + self.oh + moles / v)
    }

    /// The amount that closes the balance at these activities, or `None` when no bracket
    /// shows up (the caller then takes the pH-solving route). `direction` is +1 when the
    /// reagent raises the pH; `max_mol` caps a solid.
    fn amount(&self, direction: f64, max_mol: Option<f64>) -> Result<Option<f64>> {
        let g = |mol: f64| -> Result<f64> { Ok(direction * self.residual(mol)) };
        let g_lo = g(0.0)?;
        // Already past the target (or NaN): no bracket from zero.
        if g_lo >= 0.0 || g_lo.is_nan() {
            return Ok(None);
        }
        let bracket = match max_mol {
            Some(max) => Some((max, g(max)?)).filter(|&(_, gx)| gx >= 0.0),
            None => {
                let mut hi = 1e-6 * self.layer.volume_l;
                let mut found = None;
                while hi.is_finite() {
                    let g_hi = g(hi)?;
                    if g_hi.is_nan() {
                        break;
                    }
                    if g_hi >= 0.0 {
                        found = Some((hi, g_hi));
                        break;
                    }
                    hi *= 2.0;
                }
                found
            }
        };
        let Some(hi) = bracket else {
            return Ok(None);
        };
        let (lo, hi) = super::root::shrink(g, (0.0, g_lo), hi, |_, gx| gx == 0.0)?;
        let mol = 0.5 * (lo + hi);
        Ok(mol.is_finite().then_some(mol))
    }
}

/// Reagent amount that brings `layer` to `target` pH, solved at that pH; `None` when the
/// direct route finds no bracket or its ionic strength does not settle.
pub(super) fn amount_at_ph(
    layer: &AqueousLayer,
    reagent: &Reagent,
    stock: &Stock,
    target: f64,
    direction: f64,
    max_mol: Option<f64>,
    conditions: &Conditions,
) -> Result<Option<f64>> {
    // The reagent's own system joins the layer (at nothing) so that its constants move to
    // the temperature with the rest.
    let base = at_temperature(
        &super::dose::with_reagent(layer, reagent, &Stock::Solid, 0.0),
        conditions,
    );
    let tables = tables(&base);
    let litres_per_mol = match stock {
        Stock::Solution { molar } => 1.0 / molar,
        Stock::Solid => 0.0,
    };
    let at = |gammas: Gammas| {
        AtTarget::new(
            &base,
            &tables,
            reagent,
            litres_per_mol,
            target,
            conditions,
            gammas,
        )
    };
    if conditions.activity() == Activity::Ideal {
        return at(Gammas::Ideal).amount(direction, max_mol);
    }
    let a = conditions.davies_a();
    let close = |a: f64, b: f64| (a - b).abs() <= I_TOLERANCE * a.abs().max(b.abs()) + 1e-300;
    let mut i = 0.0;
    let mut last = None;
    for _ in 0..60 {
        let state = at(Gammas::Davies {
            a,
            ionic_strength: i,
        });
        let Some(mol) = state.amount(direction, max_mol)? else {
            return Ok(None);
        };
        let next = state.ionic_strength(mol);
        if close(next, i) {
            return Ok(Some(mol));
        }
        let step = last.map_or(next, |l| super::root::secant_fixed_point(l, (i, next)));
        (i, last) = (step, Some((i, next)));
    }
    Ok(None)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::equilibrium::carbonate::Co2Mode;
    use crate::equilibrium::dose::with_reagent;
    use crate::equilibrium::reagent::StockForm;
    use crate::equilibrium::solve::solve_ph;
    use crate::equilibrium::species::{Protolyte, Site};

    /// The amount found at the target pH, checked by the forward route (an independent
    /// calculation): solving the pH of the layer with that amount gives the target back.
    fn check(layer: &AqueousLayer, name: &str, form: StockForm, target: f64, c: &Conditions) {
        let all = Reagent::builtin().unwrap();
        let reagent = Reagent::find(&all, name).unwrap();
        let offer = reagent.offer(&form).unwrap();
        let start = solve_ph(layer, c).unwrap().ph;
        let direction = if target > start { 1.0 } else { -1.0 };
        let max = match offer.stock {
            Stock::Solid => Some(reagent.solubility_mol_l().unwrap() * layer.volume_l),
            _ => None,
        };
        let mol = amount_at_ph(layer, reagent, &offer.stock, target, direction, max, c)
            .unwrap()
            .expect("a bracket at the target");
        let ph = solve_ph(&with_reagent(layer, reagent, &offer.stock, mol), c)
            .unwrap()
            .ph;
        assert!((ph - target).abs() < 1e-9, "{name}: pH {ph} vs {target}");
    }

    #[test]
    fn forward_solve_returns_the_target() {
        let davies = Conditions::standard().with_activity(Activity::Davies);
        // An amine and an acid shared with an organic layer, vented CO2, Davies activities.
        let layer = AqueousLayer {
            solutes: vec![
                Protolyte::new(2e-3, vec![Site::base(10.7)], 0.0).with_organic(300.0, 0.03),
                Protolyte::new(1e-3, vec![Site::acid(4.2)], 0.0).with_organic(50.0, 0.03),
            ],
            strong_anions_mol: 1e-3,
            ..AqueousLayer::water(0.05)
        };
        let vented = davies.clone().with_co2(Co2Mode::Vented);
        check(&layer, "naoh", StockForm::Molar(1.0), 11.0, &davies);
        check(&layer, "hcl", StockForm::Molar(1.0), 2.5, &davies);
        check(&layer, "nahco3", StockForm::Saturated, 7.5, &vented);
        check(
            &layer,
            "naoh",
            StockForm::Solid,
            9.0,
            &Conditions::standard(),
        );
    }
}
