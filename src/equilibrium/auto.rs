//! `--reagent auto`: the mildest reagent of the table that brings a layer to a target pH with
//! an amount a chemist would actually add. Used by `adjust` (one layer, or two through the
//! contacted aqueous layer) and by `plan` (each wash step and each recovery), so the two
//! commands agree on the reagent for the same layer and target.
//!
//! Mildest alone is not enough: a weak acid far from its own pKa reaches a low pH only in
//! bulk (glacial acetic acid takes a basic layer to pH 2 only with tens of millilitres and
//! hundreds of equivalents), which no one pours into a funnel. So a reagent and stock count
//! only when the dose is [`Practical`]; the ones passed over are named with what they would
//! need. When no stock is practical, the one that exceeds the limits least is taken and the
//! reason says so.

use super::AqueousLayer;
use super::dose::{Dose, dose, reach};
use super::reagent::{Reagent, Role, Stock, StockForm, StockOffer};
use super::solve::solve_ph;
use super::water::Conditions;
use crate::error::{Error, Result};
use crate::units::{fmt_mass, fmt_moles, fmt_ph, fmt_volume};

/// Share of the layer's volume that a stock solution may add (common practice: more than
/// half again the layer dilutes what is being washed and overfills a separatory funnel).
const MAX_STOCK_SHARE: f64 = 0.5;
/// Equivalents per mole of solute a practical dose may bring: what the solutes can take, a
/// few equivalents (common practice: 1-3 equivalents plus an excess).
const MAX_EQUIVALENTS: f64 = 5.0;
/// Reagent per litre of layer on top of that, mol/L: what the water itself needs. 0.2 M of a
/// strong acid or base covers pH 0.7 to 13.3; a weak one far from its pKa needs much more
/// (Henderson-Hasselbalch), which is exactly what this limit is meant to turn down.
const SLACK_MOL_L: f64 = 0.2;

/// The largest dose a chemist would add to a layer to change its pH: at most half the layer's
/// volume of stock solution, and at most 5 equivalents of the solutes plus 0.2 mol per litre
/// of layer.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Practical {
    /// Stock solution, L.
    pub max_stock_l: f64,
    /// Reagent, mol.
    pub max_mol: f64,
    /// Solutes in the layer, mol (for the equivalents of a report).
    pub solute_mol: f64,
}

impl Practical {
    /// The limits for `layer` (its volume before the reagent; every solute's total amount,
    /// both layers together when the layer is a contacted one).
    pub fn for_layer(layer: &AqueousLayer) -> Practical {
        let solute_mol: f64 = layer.solutes.iter().map(|p| p.total_mol).sum();
        Practical {
            max_stock_l: MAX_STOCK_SHARE * layer.volume_l,
            max_mol: MAX_EQUIVALENTS * solute_mol + SLACK_MOL_L * layer.volume_l,
            solute_mol,
        }
    }

    /// How far `dose` goes past the limits: at most 1 when it is practical.
    fn excess(&self, dose: &Dose) -> f64 {
        let volume = dose.stock_volume_l.unwrap_or(0.0) / self.max_stock_l.max(1e-300);
        let amount = dose.reagent_mol / self.max_mol.max(1e-300);
        volume.max(amount)
    }

    /// True when `dose` stays within both limits.
    pub fn allows(&self, dose: &Dose) -> bool {
        self.excess(dose) <= 1.0
    }

    /// What `dose` would take, for a note: `66.6 mL of 100% (1163 equiv)`.
    fn describe(&self, dose: &Dose) -> String {
        let what = match (dose.stock_volume_l, dose.solid_mass_g) {
            (Some(v), _) => format!("{} of {}", fmt_volume(v), dose.stock),
            (None, Some(g)) => format!("{} of solid", fmt_mass(g)),
            (None, None) => fmt_moles(dose.reagent_mol),
        };
        if self.solute_mol > 0.0 {
            format!("{what} ({:.0} equiv)", dose.reagent_mol / self.solute_mol)
        } else {
            what
        }
    }
}

/// The reagent and stock `--reagent auto` settled on, the dose it takes, and why.
#[derive(Debug, Clone, PartialEq)]
pub struct AutoChoice {
    pub reagent: Reagent,
    pub stock: StockOffer,
    /// The dose that reaches the target with this reagent and stock.
    pub dose: Dose,
    /// One sentence for the report, naming the milder reagents passed over and why.
    pub reason: String,
}

/// Stocks of `reagent` in the order they are tried: 1 M, saturated, the solid, then the
/// rest from the most dilute solution up.
pub fn stocks_in_order(reagent: &Reagent) -> Vec<&StockOffer> {
    let rank = |s: &StockOffer| match (s.form, s.stock) {
        (StockForm::Molar(m), _) if (m - 1.0).abs() < 1e-12 => (0, 0.0),
        (StockForm::Saturated, _) => (1, 0.0),
        (_, Stock::Solid) => (2, 0.0),
        (_, Stock::Solution { molar }) => (3, molar),
    };
    let mut all: Vec<&StockOffer> = reagent.stocks.iter().collect();
    all.sort_by(|a, b| {
        let (ra, rb) = (rank(a), rank(b));
        ra.0.cmp(&rb.0).then(ra.1.total_cmp(&rb.1))
    });
    all
}

/// A reagent that reaches the target, with the dose it takes.
struct Found {
    reagent: Reagent,
    stock: StockOffer,
    dose: Dose,
    /// [`Practical::excess`] of the dose: at most 1 when practical.
    excess: f64,
}

/// The mildest reagent of `catalogue` (lowest `mildness` of the role the target needs: a
/// base to go up, an acid to go down) with a stock that reaches `target_ph` with a
/// [`Practical`] dose; when none is practical, the reaching one that exceeds the limits least.
pub fn choose_auto(
    layer: &AqueousLayer,
    target_ph: f64,
    conditions: &Conditions,
    catalogue: &[Reagent],
) -> Result<AutoChoice> {
    let start = solve_ph(layer, conditions)?.ph;
    let role = if target_ph >= start {
        Role::Base
    } else {
        Role::Acid
    };
    let what = match role {
        Role::Base => "base",
        Role::Acid => "acid",
    };
    let limits = Practical::for_layer(layer);
    let within = format!(
        "a practical amount (at most {} of stock and {})",
        fmt_volume(limits.max_stock_l),
        fmt_moles(limits.max_mol)
    );
    let mut candidates: Vec<&Reagent> = catalogue.iter().filter(|r| r.role == role).collect();
    candidates.sort_by_key(|r| r.mildness);
    let mut passed = Passed::default();
    let mut fallback: Option<Found> = None;
    for reagent in candidates {
        let Some(found) = least_excess(layer, reagent, target_ph, conditions, &limits) else {
            passed.cannot.push(reagent.name.clone());
            continue;
        };
        if found.excess <= 1.0 {
            let reason = format!(
                "{} ({}) is the mildest listed {what} (mildness rank {}) that takes the layer \
                 from pH {} to {} with {within}{}",
                reagent.name,
                found.stock.label(),
                reagent.mildness,
                fmt_ph(start),
                fmt_ph(target_ph),
                passed.sentence(target_ph)
            );
            return Ok(found.choice(reason));
        }
        passed.too_much.push(format!(
            "{} would need {} to reach pH {}",
            reagent.name,
            limits.describe(&found.dose),
            fmt_ph(target_ph)
        ));
        if fallback.as_ref().is_none_or(|f| found.excess < f.excess) {
            fallback = Some(found);
        }
    }
    match fallback {
        Some(f) => {
            let reason = format!(
                "no listed {what} takes the layer from pH {} to {} with {within}; {} ({}) needs \
                 the least beyond it: {}{}",
                fmt_ph(start),
                fmt_ph(target_ph),
                f.reagent.name,
                f.stock.label(),
                limits.describe(&f.dose),
                passed.sentence(target_ph)
            );
            Ok(f.choice(reason))
        }
        None => Err(Error::Unreachable(format!(
            "pH {} is out of reach from pH {} with every listed {what} ({})",
            fmt_ph(target_ph),
            fmt_ph(start),
            passed.cannot.join(", ")
        ))),
    }
}

/// The first practical stock of `reagent` (in [`stocks_in_order`]) that reaches `target_ph`,
/// else the reaching one that exceeds the limits least; `None` when no stock reaches it.
fn least_excess(
    layer: &AqueousLayer,
    reagent: &Reagent,
    target_ph: f64,
    conditions: &Conditions,
    limits: &Practical,
) -> Option<Found> {
    let mut least: Option<Found> = None;
    for offer in stocks_in_order(reagent) {
        // A stock whose reach cannot be worked out (a solid without a solubility) is simply
        // not tried; the reach test is cheap, the dose is a bisection.
        let reaches = reach(layer, reagent, offer, conditions).is_ok_and(|r| r.contains(target_ph));
        if !reaches {
            continue;
        }
        let Ok(dose) = dose(layer, reagent, offer, target_ph, conditions) else {
            continue;
        };
        let found = Found {
            reagent: reagent.clone(),
            stock: offer.clone(),
            excess: limits.excess(&dose),
            dose,
        };
        if found.excess <= 1.0 {
            return Some(found);
        }
        if least.as_ref().is_none_or(|l| found.excess < l.excess) {
            least = Some(found);
        }
    }
    least
}

impl Found {
    fn choice(self, reason: String) -> AutoChoice {
        AutoChoice {
            reagent: self.reagent,
            stock: self.stock,
            dose: self.dose,
            reason,
        }
    }
}

/// The milder reagents passed over: those that cannot reach the target with any stock, and
/// those that would need an impractical amount (with that amount).
#[derive(Default)]
struct Passed {
    cannot: Vec<String>,
    too_much: Vec<String>,
}

impl Passed {
    /// `; passed over: nh4cl, nah2po4 cannot reach pH 2.00; acetic_acid would need ...`.
    fn sentence(&self, target_ph: f64) -> String {
        let mut parts = Vec::new();
        if !self.cannot.is_empty() {
            parts.push(format!(
                "{} cannot reach pH {}",
                self.cannot.join(", "),
                fmt_ph(target_ph)
            ));
        }
        parts.extend(self.too_much.iter().cloned());
        if parts.is_empty() {
            String::new()
        } else {
            format!("; passed over: {}", parts.join("; "))
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::equilibrium::species::{Protolyte, Site};

    /// 1 mmol triethylamine in 50 mL water; triethylammonium pKa 10.75 (CRC Handbook, from
    /// memory).
    fn amine_layer() -> AqueousLayer {
        let mut layer = AqueousLayer::water(0.05);
        layer
            .solutes
            .push(Protolyte::new(1e-3, vec![Site::base(10.75)], 0.0));
        layer
    }

    fn choose(target: f64) -> AutoChoice {
        let catalogue = Reagent::builtin().unwrap();
        choose_auto(&amine_layer(), target, &Conditions::standard(), &catalogue).unwrap()
    }

    #[test]
    fn limits_follow_the_layer() {
        // 5 equiv of 1 mmol plus 0.2 M over 50 mL = 5 + 10 mmol; half of 50 mL.
        let p = Practical::for_layer(&amine_layer());
        assert!((p.max_mol - 0.015).abs() < 1e-12, "{}", p.max_mol);
        assert!((p.max_stock_l - 0.025).abs() < 1e-12);
    }

    #[test]
    fn weak_acid_far_from_its_pka_is_passed_over() {
        // To hold pH 2 with acetic acid (pKa 4.76, CRC Handbook, from memory) the acetate
        // must at least balance the 1 mmol of triethylammonium, and each acetate comes with
        // h/Ka acids left whole (Henderson-Hasselbalch): total acid >= 1 mmol·(1 + h/Ka),
        // far above the 15 mmol a practical dose allows.
        let floor = 1e-3 * (1.0 + 10f64.powf(4.76 - 2.0));
        assert!(floor > Practical::for_layer(&amine_layer()).max_mol);
        let c = choose(2.0);
        assert_ne!(c.reagent.name, "acetic_acid");
        assert!(
            Practical::for_layer(&amine_layer()).allows(&c.dose),
            "{:?}",
            c.dose
        );
        assert!((c.dose.ph - 2.0).abs() < 1e-6);
        assert!(c.reason.contains("acetic_acid would need"), "{}", c.reason);
        assert!(c.reason.contains("to reach pH 2.00"), "{}", c.reason);
    }

    #[test]
    fn strong_acid_target_takes_hydrochloric_acid() {
        // pH 1 needs 0.1 M of free acid: beyond what a hydrogen sulfate (pKa2 1.99) gives
        // at a practical amount; hydrochloric acid 1 M does it with a few mL.
        let c = choose(1.0);
        assert_eq!(c.reagent.name, "hcl", "{}", c.reason);
        assert!(c.dose.stock_volume_l.unwrap() < 0.025);
    }

    #[test]
    fn mild_target_keeps_a_mild_reagent() {
        // pH 7 is within a unit of dihydrogen phosphate's pKa2 (7.2, CRC Handbook, from
        // memory): a few mmol do it. Ammonium (pKa 9.24) would leave 10^(9.24-7) ≈ 170 NH4+
        // per NH3 it forms (Henderson-Hasselbalch), so it is passed over.
        let c = choose(7.0);
        assert_eq!(c.reagent.name, "nah2po4", "{}", c.reason);
        assert!(c.reason.contains("nh4cl"), "{}", c.reason);
        assert!((c.dose.ph - 7.0).abs() < 1e-6);
    }

    #[test]
    fn nothing_practical_takes_the_least_excess() {
        // pH 14 in 50 mL needs about 1 M hydroxide, far above 0.2 M of slack: no base is
        // practical, the choice still comes with the reason.
        let c = choose(14.0);
        assert!(c.reason.starts_with("no listed base"), "{}", c.reason);
        assert!(!Practical::for_layer(&amine_layer()).allows(&c.dose));
    }
}
