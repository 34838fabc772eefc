//! The inverse problem: how much of a reagent, from a given stock, brings a layer to a target
//! pH. A solution stock adds its volume; a solid is capped by its solubility in the layer.
//!
//! The pH moves monotonically with the amount added, from the layer's own pH (nothing added)
//! towards a limit: the stock's own pH for a solution (the mixture becomes the stock), the pH
//! at the solubility limit for a solid. The amount is bracketed by doubling and then bisected,
//! so there is no initial guess to fail.

use super::AqueousLayer;
use super::polyprotic::Polyprotic;
use super::reagent::{Reagent, Stock, StockOffer};
use super::solve::{Equilibrium, solve_ph};
use super::water::Conditions;
use crate::error::{Error, Result};
use crate::units::{PH_MAX, PH_MIN, fmt_ph};

// The reagent choice of `--reagent auto` lives in its own module; these names stay here too.
pub use super::auto::{AutoChoice, Practical, choose_auto, stocks_in_order};

/// The answer to "how much reagent reaches this pH".
#[derive(Debug, Clone, PartialEq)]
pub struct Dose {
    /// Reagent name as in the table (`naoh`).
    pub reagent: String,
    /// Stock label (`1M`, `solid`, `sat`).
    pub stock: String,
    pub reagent_mol: f64,
    /// Volume of stock solution to add, L (solution stocks only).
    pub stock_volume_l: Option<f64>,
    /// Mass to weigh, g (solid stocks only).
    pub solid_mass_g: Option<f64>,
    /// Aqueous volume after the addition, L.
    pub final_volume_l: f64,
    /// pH reached, from a fresh solve at `reagent_mol`.
    pub ph: f64,
    /// Reagent formula units per litre of the final layer, mol/L.
    pub reagent_mol_l: f64,
    /// The final layer's equilibrium.
    pub equilibrium: Equilibrium,
    /// The pH this reagent and stock tend to (solution) or reach at the solubility limit
    /// (solid) in the layer: the second value of [`reachable_range`], worked out on the way.
    pub limit_ph: f64,
}

/// The layer after adding `mol` of `reagent` from `stock`.
pub fn with_reagent(
    layer: &AqueousLayer,
    reagent: &Reagent,
    stock: &Stock,
    mol: f64,
) -> AqueousLayer {
    let mut out = layer.clone();
    out.strong_cations_mol += mol * reagent.strong_cations;
    out.strong_anions_mol += mol * reagent.strong_anions;
    out.carbonate_mol += mol * reagent.carbonate;
    if let Some(system) = &reagent.system {
        out.add_polyprotic(Polyprotic {
            name: system.name.clone(),
            total_mol: mol,
            top_charge: system.top_charge,
            pkas: system.pkas.clone(),
            dh_kj_mol: system.dh_kj_mol.clone(),
        });
    }
    if let Stock::Solution { molar } = stock {
        out.volume_l += mol / molar;
    }
    out
}

/// What a reagent and stock can do to a layer.
pub(super) struct Reach {
    /// pH with nothing added.
    start: f64,
    /// pH approached (solution) or attained at the solubility limit (solid).
    limit: f64,
    /// Largest amount that dissolves (solid stocks), mol.
    max_mol: Option<f64>,
}

impl Reach {
    /// True when some amount gives `target`. A solution only approaches its own pH.
    pub(super) fn contains(&self, target: f64) -> bool {
        let (lo, hi) = (self.start.min(self.limit), self.start.max(self.limit));
        if (target - self.start).abs() <= SAME_PH {
            return true;
        }
        let attained = self.max_mol.is_some();
        (lo..=hi).contains(&target) && (attained || (target - self.limit).abs() > SAME_PH)
    }
}

/// pH difference treated as no change at all.
pub(super) const SAME_PH: f64 = 1e-9;

pub(super) fn reach(
    layer: &AqueousLayer,
    reagent: &Reagent,
    stock: &StockOffer,
    conditions: &Conditions,
) -> Result<Reach> {
    let start = solve_ph(layer, conditions)?.ph;
    match stock.stock {
        Stock::Solution { molar } => {
            let pure_stock = with_reagent(&AqueousLayer::water(1.0), reagent, &Stock::Solid, molar);
            Ok(Reach {
                start,
                limit: solve_ph(&pure_stock, conditions)?.ph,
                max_mol: None,
            })
        }
        Stock::Solid => {
            let solubility = reagent.solubility_mol_l().ok_or_else(|| {
                Error::Input(format!(
                    "{} has no solubility on record, so a solid dose cannot be bounded; offered: {}",
                    reagent.name,
                    reagent.offered_labels().join(", ")
                ))
            })?;
            let max_mol = solubility * layer.volume_l;
            let saturated = with_reagent(layer, reagent, &Stock::Solid, max_mol);
            Ok(Reach {
                start,
                limit: solve_ph(&saturated, conditions)?.ph,
                max_mol: Some(max_mol),
            })
        }
    }
}

/// pH with no reagent and the limit the reagent and stock tend to (or reach, for a solid at
/// its solubility in the layer).
pub fn reachable_range(
    layer: &AqueousLayer,
    reagent: &Reagent,
    stock: &StockOffer,
    conditions: &Conditions,
) -> Result<(f64, f64)> {
    let r = reach(layer, reagent, stock, conditions)?;
    Ok((r.start, r.limit))
}

/// Reagent amount from `stock` that brings `layer` to `target_ph`. A target outside the
/// reachable range gives `Error::Unreachable` stating that range.
pub fn dose(
    layer: &AqueousLayer,
    reagent: &Reagent,
    stock: &StockOffer,
    target_ph: f64,
    conditions: &Conditions,
) -> Result<Dose> {
    if !(PH_MIN..=PH_MAX).contains(&target_ph) {
        return Err(Error::Input(format!(
            "target pH {target_ph} is outside {PH_MIN}..{PH_MAX}"
        )));
    }
    let r = reach(layer, reagent, stock, conditions)?;
    if !r.contains(target_ph) {
        return Err(Error::Unreachable(unreachable_message(
            reagent, stock, &r, target_ph,
        )));
    }
    if (target_ph - r.start).abs() <= SAME_PH {
        return finish(layer, reagent, stock, 0.0, &r, target_ph, conditions);
    }
    // Solved at the target pH first (one root in the amount); should that route find no
    // bracket, or its amount fail the re-solve check, the amount is found by solving the pH
    // at each trial amount, as before.
    let direction = if r.limit > r.start { 1.0 } else { -1.0 };
    let direct = super::fixed_ph::amount_at_ph(
        layer,
        reagent,
        &stock.stock,
        target_ph,
        direction,
        r.max_mol,
        conditions,
    )?;
    if let Some(mol) = direct
        && let Ok(done) = finish(layer, reagent, stock, mol, &r, target_ph, conditions)
    {
        return Ok(done);
    }
    let mol = find_amount(layer, reagent, stock, &r, target_ph, conditions)?;
    finish(layer, reagent, stock, mol, &r, target_ph, conditions)
}

/// Like `dose`, and when the target is out of reach, the message also names which reagents
/// and stocks of `catalogue` would reach it.
pub fn dose_with_alternatives(
    layer: &AqueousLayer,
    reagent: &Reagent,
    stock: &StockOffer,
    target_ph: f64,
    conditions: &Conditions,
    catalogue: &[Reagent],
) -> Result<Dose> {
    match dose(layer, reagent, stock, target_ph, conditions) {
        Err(Error::Unreachable(message)) => {
            let mut helpers = Vec::new();
            for other in catalogue {
                let mut forms = Vec::new();
                for offer in &other.stocks {
                    if other.name == reagent.name && offer.form == stock.form {
                        continue;
                    }
                    // A stock whose reach cannot be worked out is simply not suggested.
                    if let Ok(r) = reach(layer, other, offer, conditions)
                        && r.contains(target_ph)
                    {
                        forms.push(offer.label());
                    }
                }
                if !forms.is_empty() {
                    helpers.push(format!("{} ({})", other.name, forms.join(", ")));
                }
            }
            let tail = match helpers.len() {
                0 => "; none of the listed reagents reaches it".to_string(),
                1 => format!("; {} would reach it", helpers[0]),
                _ => format!("; {} would reach it", helpers.join(" or ")),
            };
            Err(Error::Unreachable(message + &tail))
        }
        other => other,
    }
}

fn unreachable_message(reagent: &Reagent, stock: &StockOffer, r: &Reach, target: f64) -> String {
    let head = format!(
        "pH {} is out of reach with {} ({})",
        fmt_ph(target),
        reagent.name,
        stock.label()
    );
    let (start, limit) = (fmt_ph(r.start), fmt_ph(r.limit));
    let how = if (r.limit - r.start).abs() <= SAME_PH {
        format!("it leaves the layer at pH {start}")
    } else if r.limit > r.start {
        format!("the layer goes from pH {start} (no reagent) up to at most {limit}")
    } else {
        format!("the layer goes from pH {start} (no reagent) down to no lower than {limit}")
    };
    let why = if r.max_mol.is_some() {
        " (solubility limit)"
    } else {
        " (the stock's own pH)"
    };
    format!("{head}: {how}{why}")
}

/// Brackets the amount by doubling (solution) or takes the solubility cap (solid), then
/// bisects until the pH matches.
fn find_amount(
    layer: &AqueousLayer,
    reagent: &Reagent,
    stock: &StockOffer,
    r: &Reach,
    target: f64,
    conditions: &Conditions,
) -> Result<f64> {
    let ph_at = |mol: f64| -> Result<f64> {
        Ok(solve_ph(&with_reagent(layer, reagent, &stock.stock, mol), conditions)?.ph)
    };
    // +1 when adding reagent raises the pH.
    let direction = if r.limit > r.start { 1.0 } else { -1.0 };
    let g = |mol: f64| -> Result<f64> { Ok(direction * (ph_at(mol)? - target)) };
    let (hi, g_hi) = match r.max_mol {
        Some(max) => (max, g(max)?),
        None => {
            // Start at a micromole per litre of layer and double: 1000 doublings cover any
            // amount a double can hold.
            let mut hi = 1e-6 * layer.volume_l;
            let mut found = None;
            for _ in 0..1000 {
                let g_hi = g(hi)?;
                if g_hi >= 0.0 {
                    found = Some((hi, g_hi));
                    break;
                }
                hi *= 2.0;
                if !hi.is_finite() {
                    break;
                }
            }
            found
                .ok_or_else(|| Error::Unreachable(unreachable_message(reagent, stock, r, target)))?
        }
    };
    // The pH is monotone in the amount: shrink the bracket (secant steps, bisection as the
    // fallback) until the pH is the target to 1e-11 or the amounts are neighbouring doubles.
    let (lo, hi) = super::root::shrink(
        g,
        (0.0, direction * (r.start - target)),
        (hi, g_hi),
        |_, gx| gx.abs() < 1e-11,
    )?;
    Ok(0.5 * (lo + hi))
}

/// Re-solves at the amount found and fills in the lab quantities.
fn finish(
    layer: &AqueousLayer,
    reagent: &Reagent,
    stock: &StockOffer,
    mol: f64,
    r: &Reach,
    target: f64,
    conditions: &Conditions,
) -> Result<Dose> {
    let final_layer = with_reagent(layer, reagent, &stock.stock, mol);
    let equilibrium = solve_ph(&final_layer, conditions)?;
    if (equilibrium.ph - target).abs() > 1e-6 {
        return Err(Error::Internal(format!(
            "dosing {} reached pH {} instead of {target}",
            reagent.name, equilibrium.ph
        )));
    }
    let (stock_volume_l, solid_mass_g) = match stock.stock {
        Stock::Solution { molar } => (Some(mol / molar), None),
        Stock::Solid => (None, Some(mol * reagent.molar_mass_g_mol)),
    };
    Ok(Dose {
        reagent: reagent.name.clone(),
        stock: stock.label(),
        reagent_mol: mol,
        stock_volume_l,
        solid_mass_g,
        final_volume_l: final_layer.volume_l,
        ph: equilibrium.ph,
        reagent_mol_l: mol / final_layer.volume_l,
        equilibrium,
        limit_ph: r.limit,
    })
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::equilibrium::reagent::StockForm;

    fn setup(name: &str, form: StockForm) -> (Reagent, StockOffer) {
        let all = Reagent::builtin().unwrap();
        let r = Reagent::find(&all, name).unwrap().clone();
        let s = r.offer(&form).unwrap().clone();
        (r, s)
    }

    #[test]
    fn strong_base_into_strong_acid_exact() {
        // 1 mmol HCl in 50 mL to pH 7.0 with 1 M NaOH: charge balance
        // h + (n + 0)/V' = Kw/h + 1e-3/V' with V' = 0.05 + n/1, solved here for n (linear).
        let c = Conditions::standard();
        let (naoh, one_molar) = setup("naoh", StockForm::Molar(1.0));
        let mut layer = AqueousLayer::water(0.05);
        layer.strong_anions_mol = 1e-3;
        let d = dose(&layer, &naoh, &one_molar, 7.0, &c).unwrap();
        let h = 1e-7;
        let excess = c.kw() / h - h;
        // n = 1e-3 + excess·(0.05 + n)  =>  n = (1e-3 + 0.05·excess) / (1 - excess)
        let want = (1e-3 + 0.05 * excess) / (1.0 - excess);
        assert!(
            (d.reagent_mol / want - 1.0).abs() < 1e-6,
            "{} vs {want}",
            d.reagent_mol
        );
        assert!((d.stock_volume_l.unwrap() - want).abs() < 1e-9);
        assert!((d.final_volume_l - (0.05 + want)).abs() < 1e-9);
        assert!(d.solid_mass_g.is_none());
    }

    #[test]
    fn target_at_current_ph_needs_nothing() {
        let c = Conditions::standard();
        let (hcl, stock) = setup("hcl", StockForm::Molar(1.0));
        let layer = AqueousLayer::water(0.1);
        let here = solve_ph(&layer, &c).unwrap().ph;
        let d = dose(&layer, &hcl, &stock, here, &c).unwrap();
        assert_eq!(d.reagent_mol, 0.0);
        assert_eq!(d.stock_volume_l, Some(0.0));
    }

    #[test]
    fn solid_weighs_in_without_volume() {
        // Solid NaOH into 100 mL water to pH 12: n = (Kw/h - h)·V exactly (no volume change).
        let c = Conditions::standard();
        let (naoh, solid) = setup("naoh", StockForm::Solid);
        let layer = AqueousLayer::water(0.1);
        let d = dose(&layer, &naoh, &solid, 12.0, &c).unwrap();
        let h = 1e-12;
        let want = (c.kw() / h - h) * 0.1;
        assert!((d.reagent_mol / want - 1.0).abs() < 1e-6);
        assert!((d.solid_mass_g.unwrap() - want * naoh.molar_mass_g_mol).abs() < 1e-9);
        assert_eq!(d.final_volume_l, 0.1);
    }

    #[test]
    fn acid_cannot_raise_the_ph() {
        let c = Conditions::standard();
        let (hcl, stock) = setup("hcl", StockForm::Molar(1.0));
        match dose(&AqueousLayer::water(0.1), &hcl, &stock, 9.0, &c) {
            Err(Error::Unreachable(m)) => assert!(m.contains("down to no lower than 0.00"), "{m}"),
            other => panic!("{other:?}"),
        }
        assert!(matches!(
            dose(&AqueousLayer::water(0.1), &hcl, &stock, 20.0, &c),
            Err(Error::Input(_))
        ));
    }

    #[test]
    fn solid_bicarbonate_is_capped_by_its_solubility() {
        // Solid NaHCO3 into 0.02 M HCl (50 mL): at most solubility × volume dissolves. The
        // CO2 from neutralizing the acid stays (closed system), so the layer ends below the
        // (pK1 + pK2)/2 of pure bicarbonate, near pK1 + log10(HCO3- / CO2) (Henderson–
        // Hasselbalch), a little lower still as HCO3- disproportionates to CO2 + CO3--.
        let c = Conditions::standard();
        let (bicarb, solid) = setup("nahco3", StockForm::Solid);
        let layer = AqueousLayer {
            strong_anions_mol: 1e-3,
            ..AqueousLayer::water(0.05)
        };
        let (_, limit) = reachable_range(&layer, &bicarb, &solid, &c).unwrap();
        let cap = bicarb.solubility_mol_l().unwrap() * 0.05;
        let hh = c.carbonate_pk1() + ((cap - 1e-3) / 1e-3).log10();
        assert!(limit < hh && limit > hh - 0.2, "{limit} vs {hh}");
        match dose(&layer, &bicarb, &solid, 9.0, &c) {
            Err(Error::Unreachable(m)) => assert!(m.contains("(solubility limit)"), "{m}"),
            other => panic!("{other:?}"),
        }
        // At the cap itself the solid is reachable (it is attained, not approached).
        let d = dose(&layer, &bicarb, &solid, limit, &c).unwrap();
        assert!(
            (d.reagent_mol / cap - 1.0).abs() < 1e-3,
            "{} vs {cap}",
            d.reagent_mol
        );
    }

    #[test]
    fn solid_without_solubility_is_refused() {
        let c = Conditions::standard();
        let (mut naoh, solid) = setup("naoh", StockForm::Solid);
        naoh.solubility_g_100g = None;
        let layer = AqueousLayer::water(0.1);
        assert!(matches!(
            dose(&layer, &naoh, &solid, 10.0, &c),
            Err(Error::Input(_))
        ));
    }
}
