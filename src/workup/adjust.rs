//! Bring one aqueous layer to a target pH: the solutes as the user gave them (SMILES and
//! amount), their sites, the strong ions of their salts, and the reagent amount from a chosen
//! stock that reaches each target, with the species at the end and the cautions.

use serde::Serialize;

use super::cautions::cautions;
use crate::acidity::{Handbook, Profile, Site};
use crate::chem::formula::molar_mass;
use crate::equilibrium::{self, AqueousLayer, Conditions, Dose, Reagent, StockForm, StockOffer};
use crate::error::{Error, Result};
use crate::units::Amount;

/// One solute as given: SMILES, amount, and optional pKa values that replace the estimate.
#[derive(Debug, Clone)]
pub struct SoluteInput {
    pub smiles: String,
    pub amount: Amount,
    pub pka_override: Option<Vec<f64>>,
}

/// Everything `adjust` needs.
#[derive(Debug, Clone)]
pub struct Request {
    pub solutes: Vec<SoluteInput>,
    /// Aqueous volume before any reagent, L.
    pub water_l: f64,
    pub targets: Vec<f64>,
    pub reagent: String,
    /// Stock label (`1M`, `solid`, `sat`, `37%`); `None` picks a usual one.
    pub stock: Option<String>,
    pub conditions: Conditions,
}

/// One solute at the reached pH.
#[derive(Debug, Clone, Serialize)]
pub struct SoluteReport {
    /// As the user gave it.
    pub smiles: String,
    pub amount_mol: f64,
    pub sites: Vec<Site>,
    /// Fraction of the main titrating component in its all-neutral (extractable) form.
    pub fraction_neutral: f64,
    /// Fraction in the aqueous layer (1 with one layer).
    pub fraction_aqueous: f64,
    /// Mean charge per formula unit, counter-ions excluded.
    pub mean_charge: f64,
}

/// The answer for one target pH (JSON keys of design §5).
#[derive(Debug, Clone, Serialize)]
pub struct Adjustment {
    pub target_ph: f64,
    /// pH reached (solved again at the amount found).
    pub ph: f64,
    /// pH of the layer before any reagent.
    pub start_ph: f64,
    pub reagent: String,
    pub stock: String,
    pub reagent_mol: f64,
    /// Reagent moles per mole of all solutes together.
    pub equivalents: Option<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub reagent_mass_g: Option<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub stock_volume_ml: Option<f64>,
    /// Reagent formula units per litre of the final aqueous layer.
    pub reagent_conc_mol_l: f64,
    pub aqueous_volume_ml: f64,
    /// `closed`: all carbon stays in the layer.
    pub co2_mode: &'static str,
    pub co2_released_ml: f64,
    /// Dissolved CO2 at the end, mol (closed mode keeps it in the layer).
    pub co2_dissolved_mol: f64,
    pub solutes: Vec<SoluteReport>,
    pub cautions: Vec<String>,
    pub notes: Vec<String>,
}

/// A solute read and converted to moles.
struct Prepared {
    profile: Profile,
    amount_mol: f64,
}

fn prepare(input: &SoluteInput, handbook: &Handbook, water_l: f64) -> Result<Prepared> {
    let mut profile = Profile::new(&input.smiles, handbook)?;
    if let Some(values) = &input.pka_override {
        profile.override_pkas(values)?;
    }
    let mass = molar_mass(&profile.molecule);
    let amount_mol = input
        .amount
        .to_moles(Some(mass), Some(water_l))
        .map_err(|e| match e {
            Error::Input(m) => Error::Input(format!("amount of {}: {m}", input.smiles)),
            other => other,
        })?;
    Ok(Prepared {
        profile,
        amount_mol,
    })
}

/// The aqueous layer holding the prepared solutes, before any reagent.
fn layer_of(prepared: &[Prepared], water_l: f64) -> AqueousLayer {
    let mut layer = AqueousLayer::water(water_l);
    for p in prepared {
        let (solutes, cations, anions) = p.profile.protolytes(p.amount_mol);
        layer.solutes.extend(solutes);
        layer.strong_cations_mol += cations;
        layer.strong_anions_mol += anions;
    }
    layer
}

/// The stock to use: the one asked for, else 1 M, else saturated, else the solid.
fn choose_stock<'a>(reagent: &'a Reagent, asked: Option<&str>) -> Result<&'a StockOffer> {
    if let Some(text) = asked {
        let form = StockForm::parse(text)?;
        return reagent.offer(&form);
    }
    [
        StockForm::Molar(1.0),
        StockForm::Saturated,
        StockForm::Solid,
    ]
    .iter()
    .find_map(|f| reagent.offer(f).ok())
    .or(reagent.stocks.first())
    .ok_or_else(|| Error::Internal(format!("{} has no stock form", reagent.name)))
}

/// Solves the request: one `Adjustment` per target, in the order given.
pub fn adjust(
    request: &Request,
    handbook: &Handbook,
    catalogue: &[Reagent],
) -> Result<Vec<Adjustment>> {
    if request.solutes.is_empty() {
        return Err(Error::Input(
            "give at least one --solute SMILES AMOUNT".into(),
        ));
    }
    if request.targets.is_empty() {
        return Err(Error::Input("give a target with --to-ph".into()));
    }
    let prepared = request
        .solutes
        .iter()
        .map(|s| prepare(s, handbook, request.water_l))
        .collect::<Result<Vec<_>>>()?;
    let layer = layer_of(&prepared, request.water_l);
    let reagent = Reagent::find(catalogue, &request.reagent)?;
    let offer = choose_stock(reagent, request.stock.as_deref())?;
    let start = equilibrium::solve_ph(&layer, &request.conditions)?;
    let total_solute_mol: f64 = prepared.iter().map(|p| p.amount_mol).sum();
    request
        .targets
        .iter()
        .map(|&target| {
            let dose = equilibrium::dose_with_alternatives(
                &layer,
                reagent,
                offer,
                target,
                &request.conditions,
                catalogue,
            )?;
            report(
                &prepared,
                reagent,
                &dose,
                target,
                start.ph,
                total_solute_mol,
            )
        })
        .collect()
}

fn report(
    prepared: &[Prepared],
    reagent: &Reagent,
    dose: &Dose,
    target: f64,
    start_ph: f64,
    total_solute_mol: f64,
) -> Result<Adjustment> {
    let eq = &dose.equilibrium;
    let mut states = eq.solutes.iter();
    let mut solutes = Vec::new();
    for p in prepared {
        let parents = &p.profile.compound.parents;
        let these: Vec<_> = states.by_ref().take(parents.len()).collect();
        // The main component (most atoms) stands for the compound's extractable share.
        let main = (0..parents.len()).max_by_key(|&i| parents[i].atoms.len());
        solutes.push(SoluteReport {
            smiles: p.profile.smiles.clone(),
            amount_mol: p.amount_mol,
            sites: p.profile.sites.clone(),
            fraction_neutral: main.map_or(1.0, |i| these[i].fraction_neutral),
            fraction_aqueous: 1.0,
            mean_charge: these.iter().map(|s| s.mean_charge).sum(),
        });
    }
    let gas = reagent.carbonate > 0.0
        && eq.carbonate.co2_mol > 1e-3 * dose.reagent_mol * reagent.carbonate;
    let mut notes = Vec::new();
    if reagent.carbonate > 0.0 {
        notes.push(
            "CO2 is counted as staying dissolved (closed system); in an open or vented funnel part \
             of it leaves as gas and the pH ends somewhat higher."
                .to_string(),
        );
    }
    for p in prepared {
        if let Some(b) = &p.profile.compound.balanced_with {
            notes.push(format!(
                "{} carries a charge; taken as its salt with {b}.",
                p.profile.smiles
            ));
        }
        if p.profile.sites.is_empty() {
            notes.push(format!(
                "{} has no site that titrates in water; it stays neutral.",
                p.profile.smiles
            ));
        }
    }
    notes.push("Activity coefficients are taken as 1 (ideal solution) at 25 °C.".to_string());
    Ok(Adjustment {
        target_ph: target,
        ph: dose.ph,
        start_ph,
        reagent: dose.reagent.clone(),
        stock: dose.stock.clone(),
        reagent_mol: dose.reagent_mol,
        equivalents: (total_solute_mol > 0.0).then(|| dose.reagent_mol / total_solute_mol),
        reagent_mass_g: dose.solid_mass_g,
        stock_volume_ml: dose.stock_volume_l.map(|v| v * 1e3),
        reagent_conc_mol_l: dose.reagent_mol_l,
        aqueous_volume_ml: dose.final_volume_l * 1e3,
        co2_mode: "closed",
        co2_released_ml: 0.0,
        co2_dissolved_mol: eq.carbonate.co2_mol,
        solutes,
        cautions: cautions(&reagent.name, &dose.stock, gas)?,
        notes,
    })
}
