//! Getting a compound back from the aqueous fraction a plan step put it in: bring the
//! combined portions to the pH where the compound is most extractable (re-acidify a salt of an
//! acid, re-basify a salt of a base), with the mildest reagent that reaches it, then extract
//! with three portions of fresh solvent (half the organic volume each). Simulated with the
//! fraction's real contents: the reagent left over from the wash, the dissolved carbon after
//! venting, the other compounds that came along.

use serde::Serialize;

use super::layers::{self, OrganicLayer};
use super::mixture::Mixture;
use super::plan::{Fraction, max_log_d};
use super::washes::{Portions, extract};
use crate::equilibrium::{self, AqueousLayer, AutoChoice, Conditions, Reagent, Stock, StockOffer};
use crate::error::Result;
use crate::units::fmt_ph;

/// Portions of fresh solvent for the back-extraction (common practice: three).
const BACK_PORTIONS: u32 = 3;
/// logD below which a compound is called poorly extractable.
const POOR_LOG_D: f64 = 0.5;

/// How to get the compounds of one aqueous fraction back.
#[derive(Debug, Clone, Serialize)]
pub struct Recovery {
    /// The fraction (`aqueous (step 1)`).
    pub fraction: String,
    pub smiles: Vec<String>,
    /// pH to bring the fraction to.
    pub ph: f64,
    pub reagent: String,
    pub stock: String,
    pub reagent_mol: f64,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub stock_volume_ml: Option<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub reagent_mass_g: Option<f64>,
    pub solvent_portions: u32,
    pub solvent_ml_each: f64,
    /// Share of the fraction's content of these compounds that the extraction takes.
    pub extracted: f64,
    /// Share of the starting amount recovered in the end (the step's recovery times this).
    pub overall: f64,
    pub co2_released_mol: f64,
    pub note: String,
}

/// The step's reagent, as used: reagent, stock, mol per portion, portions, and whether the
/// salts' counter-ions went with this step (the first one).
pub type StepReagent<'a> = (&'a Reagent, &'a StockOffer, f64, u32, bool);

/// The most extractable pH for `members`: where the least extractable of them has its highest
/// logD; among pH values within 0.01 log units of that (at least 97.7 % of its best), the one nearest `from` (the mildest
/// change).
fn best_ph(mixture: &Mixture, members: &[usize], from: f64) -> f64 {
    let worst = |ph: f64| {
        members
            .iter()
            .map(|&m| {
                let member = &mixture.members[m];
                let (solutes, _, _) = member.profile.protolytes(1.0);
                let f = solutes[member.main].state(ph).fraction_neutral;
                member
                    .main_partition()
                    .map_or(f64::NEG_INFINITY, |p| p.log_p())
                    + f.max(1e-300).log10()
            })
            .fold(f64::INFINITY, f64::min)
    };
    let grid: Vec<f64> = (0..=120).map(|k| 1.0 + 0.1 * k as f64).collect();
    let top = grid
        .iter()
        .map(|&ph| worst(ph))
        .fold(f64::NEG_INFINITY, f64::max);
    grid.into_iter()
        .filter(|&ph| worst(ph) >= top - 0.01)
        .min_by(|a, b| (a - from).abs().total_cmp(&(b - from).abs()))
        .unwrap_or(from)
}

/// The fraction's combined portions as one aqueous layer: the reagent of every portion, the
/// carbon still dissolved after venting (the solutes are added by the caller).
fn combined_portions(portions: &Portions, step: StepReagent) -> AqueousLayer {
    let (reagent, _stock, mol, count, _) = step;
    let volume: f64 = portions.states.iter().map(|s| s.aqueous_volume_l).sum();
    let mut base = equilibrium::dose::with_reagent(
        &AqueousLayer::water(volume),
        reagent,
        &Stock::Solid,
        mol * count as f64,
    );
    base.carbonate_mol = portions
        .states
        .iter()
        .map(|s| {
            let c = &s.equilibrium.carbonate;
            c.co2_mol + c.bicarbonate_mol + c.carbonate_mol
        })
        .sum();
    base
}

/// One sentence: from which pH to which, with what, then the extraction; a warning when the
/// least extractable compound's best logD (`worst`) stays low.
fn recovery_note(
    (here, target): (f64, f64),
    choice: &AutoChoice,
    organic: &OrganicLayer,
    names: &[String],
    worst: f64,
) -> String {
    let direction = if target < here { "acidify" } else { "basify" };
    let mut note = format!(
        "{direction} the combined step portions from pH {} to {} with {} ({}), then extract \
         with {} × {:.0} mL {}",
        fmt_ph(here),
        fmt_ph(target),
        choice.reagent.name,
        choice.stock.label(),
        BACK_PORTIONS,
        organic.volume_l / 2.0 * 1e3,
        organic.solvent.name
    );
    if worst < POOR_LOG_D {
        note += &format!(
            "; {} is poorly extractable (highest logD {worst:.1}): saturate the water with NaCl \
             or evaporate it instead",
            names.join(", ")
        );
    }
    note
}

/// Plans the recovery of `intended` (member indices) from the aqueous fraction `fraction`
/// that `portions` made with `step`.
#[allow(clippy::too_many_arguments)]
pub fn recover(
    mixture: &Mixture,
    organic: &OrganicLayer,
    fraction: &Fraction,
    intended: &[usize],
    portions: &Portions,
    step: StepReagent,
    conditions: &Conditions,
    catalogue: &[Reagent],
) -> Result<Recovery> {
    let with_ions = step.4;
    let base = combined_portions(portions, step);
    let solvent_l = organic.volume_l / 2.0;
    let layers = mixture.layers(&base, solvent_l, &portions.aqueous_mol, with_ions)?;
    let here = layers::equilibrate(&layers, conditions)?.ph;
    let target = best_ph(mixture, intended, here);
    let (choice, dosed) = layers::choose_auto(&layers, target, conditions, catalogue)?;
    let after = layers::with_reagent(
        &layers,
        &choice.reagent,
        &choice.stock.stock,
        dosed.dose.reagent_mol,
    );
    let extraction = extract(&after, BACK_PORTIONS, conditions)?;
    let mains = mixture.main_solutes();
    let in_fraction: f64 = intended.iter().map(|&m| fraction.contents_mol[m]).sum();
    let taken: f64 = intended
        .iter()
        .map(|&m| extraction.organic_mol[mains[m]])
        .sum();
    let extracted = if in_fraction > 0.0 {
        taken / in_fraction
    } else {
        0.0
    };
    let names: Vec<String> = intended
        .iter()
        .map(|&m| mixture.members[m].smiles.clone())
        .collect();
    let worst = intended
        .iter()
        .map(|&m| max_log_d(mixture, m))
        .fold(f64::INFINITY, f64::min);
    let note = recovery_note((here, target), &choice, organic, &names, worst);
    Ok(Recovery {
        fraction: fraction.layer.clone(),
        smiles: names,
        ph: target,
        reagent: choice.reagent.name.clone(),
        stock: choice.stock.label(),
        reagent_mol: dosed.dose.reagent_mol,
        stock_volume_ml: dosed.dose.stock_volume_l.map(|v| v * 1e3),
        reagent_mass_g: dosed.dose.solid_mass_g,
        solvent_portions: BACK_PORTIONS,
        solvent_ml_each: solvent_l * 1e3,
        extracted,
        overall: extracted * fraction.recovery,
        co2_released_mol: extraction.co2_released_mol,
        note,
    })
}
