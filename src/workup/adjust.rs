//! Bring one aqueous layer to a target pH: the solutes as the user gave them (SMILES and
//! amount), their sites, the strong ions of their salts, and the reagent amount from a chosen
//! stock that reaches each target, with the species at the end and the cautions.

use serde::Serialize;

use super::cautions::{Situation, cautions_for};
use crate::acidity::{Handbook, Profile, Site};
use crate::chem::formula::molar_mass;
use crate::equilibrium::{
    self, Activity, AqueousLayer, Co2Mode, Conditions, DAVIES_LIMIT_M, Dose, Reagent, StockForm,
    StockOffer,
};
use crate::error::{Error, Result};
use crate::units::{Amount, fmt_moles, fmt_ph, fmt_volume};

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
    /// Reagent name from the table, or `auto` for the mildest one that reaches each target.
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
    /// Fraction in the aqueous layer (1 with one layer); with `--washes N`, in the N
    /// aqueous portions together.
    pub fraction_aqueous: f64,
    /// Fraction in the organic layer (0 with one layer).
    pub fraction_organic: f64,
    /// log10 D at the pH reached (two layers; absent when it never leaves water).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub log_d: Option<f64>,
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
    /// °C.
    pub temperature_c: f64,
    /// `davies` or `ideal`.
    pub activity: &'static str,
    /// Ionic strength of the final layer, mol/L.
    pub ionic_strength: f64,
    /// `closed`, `vented` or `air`.
    pub co2_mode: &'static str,
    /// CO2 that left the layer as gas, mol, and its volume at the temperature and 1 atm.
    pub co2_released_mol: f64,
    pub co2_released_ml: f64,
    /// CO2 taken up from air (`air` mode only), mol.
    pub co2_absorbed_mol: f64,
    /// Dissolved CO2 at the end, mol.
    pub co2_dissolved_mol: f64,
    /// The pH this reagent and stock tend to (solution) or reach at the solubility limit
    /// (solid) in this layer: for bicarbonate, the highest pH it can bring.
    pub reagent_limit_ph: f64,
    pub solutes: Vec<SoluteReport>,
    pub cautions: Vec<String>,
    pub notes: Vec<String>,
    /// The two layers (with `--organic`): solvent, volumes, which is on top.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub layers: Option<super::adjust_layers::LayersReport>,
    /// Each aqueous portion (with `--organic`; one unless `--washes N`).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub washes: Option<Vec<super::adjust_layers::PortionReport>>,
}

/// A solute read and converted to moles.
pub(super) struct Prepared {
    pub(super) profile: Profile,
    pub(super) amount_mol: f64,
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
pub(super) fn choose_stock<'a>(
    reagent: &'a Reagent,
    asked: Option<&str>,
) -> Result<&'a StockOffer> {
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
    let start = equilibrium::solve_ph(&layer, &request.conditions)?;
    let total_solute_mol: f64 = prepared.iter().map(|p| p.amount_mol).sum();
    let auto = request.reagent.trim().eq_ignore_ascii_case("auto");
    request
        .targets
        .iter()
        .map(|&target| {
            // `auto` already dosed its choice while choosing; a named reagent is dosed here.
            let (reagent, why, dose) = if auto {
                let choice =
                    equilibrium::choose_auto(&layer, target, &request.conditions, catalogue)?;
                let why = Some(format!("auto: {}", choice.reason));
                (choice.reagent, why, choice.dose)
            } else {
                let reagent = Reagent::find(catalogue, &request.reagent)?;
                let offer = choose_stock(reagent, request.stock.as_deref())?;
                let dose = equilibrium::dose_with_alternatives(
                    &layer,
                    reagent,
                    offer,
                    target,
                    &request.conditions,
                    catalogue,
                )?;
                (reagent.clone(), None, dose)
            };
            let context = Context {
                prepared: &prepared,
                reagent: &reagent,
                conditions: &request.conditions,
                start_ph: start.ph,
                limit_ph: dose.limit_ph,
                total_solute_mol,
                why,
                solvent: None,
            };
            report(&context, &dose, target)
        })
        .collect()
}

/// What `report` needs besides the dose.
pub(super) struct Context<'a> {
    pub(super) prepared: &'a [Prepared],
    pub(super) reagent: &'a Reagent,
    pub(super) conditions: &'a Conditions,
    pub(super) start_ph: f64,
    pub(super) limit_ph: f64,
    pub(super) total_solute_mol: f64,
    /// Why `auto` chose this reagent.
    pub(super) why: Option<String>,
    /// The organic solvent in contact, if any (for the cautions).
    pub(super) solvent: Option<String>,
}

/// Molar gas constant in L atm mol^-1 K^-1 (CODATA 2018: 8.314462618 J/(mol K) / 101325 Pa).
const GAS_CONSTANT_L_ATM: f64 = 0.082_057_366;

pub(super) fn report(ctx: &Context, dose: &Dose, target: f64) -> Result<Adjustment> {
    let (prepared, reagent, conditions) = (ctx.prepared, ctx.reagent, ctx.conditions);
    let eq = &dose.equilibrium;
    let solutes = solute_reports(prepared, eq);
    let carbon = &eq.carbonate;
    let released_ml = carbon.released_mol * GAS_CONSTANT_L_ATM * conditions.temperature_k() * 1e3;
    // Gas: CO2 left the layer, or (closed) CO2 formed that would leave an open funnel.
    let gas = carbon.released_mol > 0.0
        || (reagent.carbonate > 0.0
            && carbon.co2_mol > 1e-3 * dose.reagent_mol * reagent.carbonate);
    let mut notes = Vec::new();
    if let Some(why) = &ctx.why {
        notes.push(why.clone());
    }
    notes.extend(co2_notes(
        reagent,
        conditions,
        eq,
        released_ml,
        ctx.limit_ph,
    ));
    notes.extend(solute_notes(prepared));
    notes.extend(model_notes(prepared, conditions, eq.ionic_strength));
    let total_solute_mol = ctx.total_solute_mol;
    let start_ph = ctx.start_ph;
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
        temperature_c: conditions.temperature_c(),
        activity: conditions.activity().as_str(),
        ionic_strength: eq.ionic_strength,
        co2_mode: conditions.co2_mode().as_str(),
        co2_released_mol: carbon.released_mol,
        co2_released_ml: released_ml,
        co2_absorbed_mol: carbon.absorbed_mol,
        co2_dissolved_mol: carbon.co2_mol,
        reagent_limit_ph: ctx.limit_ph,
        solutes,
        cautions: cautions_for(
            &reagent.name,
            &dose.stock,
            &Situation {
                gas,
                solvent: ctx.solvent.clone(),
            },
        )?,
        notes,
        layers: None,
        washes: None,
    })
}

/// Each solute at the layer's equilibrium `eq` (one layer: all of it aqueous).
fn solute_reports(prepared: &[Prepared], eq: &equilibrium::Equilibrium) -> Vec<SoluteReport> {
    let mut states = eq.solutes.iter();
    let mut solutes = Vec::new();
    for p in prepared {
        let parents = &p.profile.compound.parents;
        let these: Vec<_> = states.by_ref().take(parents.len()).collect();
        // The main component stands for the compound's extractable share.
        let main = p.profile.compound.main_parent();
        solutes.push(SoluteReport {
            smiles: p.profile.smiles.clone(),
            amount_mol: p.amount_mol,
            sites: p.profile.sites.clone(),
            fraction_neutral: main.map_or(1.0, |i| these[i].fraction_neutral),
            fraction_aqueous: 1.0,
            fraction_organic: 0.0,
            log_d: None,
            mean_charge: these.iter().map(|s| s.mean_charge).sum(),
        });
    }
    solutes
}

/// Salts taken with their counter-ions, and solutes with nothing to titrate.
fn solute_notes(prepared: &[Prepared]) -> Vec<String> {
    let mut notes = Vec::new();
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
    notes
}

/// What the CO2 did, and how far a carbonate reagent can go.
fn co2_notes(
    reagent: &Reagent,
    conditions: &Conditions,
    eq: &equilibrium::Equilibrium,
    released_ml: f64,
    limit_ph: f64,
) -> Vec<String> {
    let mut notes = Vec::new();
    let carbon = &eq.carbonate;
    if carbon.released_mol > 0.0 {
        notes.push(format!(
            "{} of CO2 leaves the layer as gas ({} at {} °C and 1 atm).",
            fmt_moles(carbon.released_mol),
            fmt_volume(released_ml / 1e3),
            conditions.temperature_c()
        ));
    }
    if carbon.absorbed_mol > 0.0 {
        notes.push(format!(
            "At equilibrium with air the layer takes up {} of CO2; an alkaline layer does so \
             slowly (hours), so a fresh one lies between the closed and air results.",
            fmt_moles(carbon.absorbed_mol)
        ));
    }
    if reagent.carbonate > 0.0 {
        match conditions.co2_mode() {
            Co2Mode::Closed => notes.push(
                "CO2 is counted as staying dissolved (closed system); in a vented funnel part of \
                 it leaves as gas and the pH ends somewhat higher."
                    .into(),
            ),
            Co2Mode::Vented => notes.push(
                "Dissolved CO2 is capped at saturation under 1 atm of CO2 (a funnel vented \
                 often); the rest leaves as gas."
                    .into(),
            ),
            Co2Mode::Air => {}
        }
        if reagent.carbonate > 0.0 && reagent.strong_cations == reagent.carbonate {
            notes.push(format!(
                "{} cannot bring this layer above pH {}.",
                reagent.name,
                fmt_ph(limit_ph)
            ));
        }
    }
    notes
}

/// Activity model, temperature and their limits.
fn model_notes(prepared: &[Prepared], conditions: &Conditions, ionic_strength: f64) -> Vec<String> {
    let mut notes = Vec::new();
    match conditions.activity() {
        Activity::Ideal => notes.push(format!(
            "Activity coefficients are taken as 1 (ideal solution) at {} °C.",
            conditions.temperature_c()
        )),
        Activity::Davies => {
            notes.push(format!(
                "Activities by the Davies equation (A = {:.4} at {} °C), ionic strength {} M; \
                 pH is -log10 a(H+).",
                conditions.davies_a(),
                conditions.temperature_c(),
                crate::report::sig(ionic_strength, 3)
            ));
            if ionic_strength > DAVIES_LIMIT_M {
                notes.push(format!(
                    "Warning: ionic strength {} M is above {DAVIES_LIMIT_M} M, where the Davies \
                     equation stops being trustworthy; the activity coefficients are held at \
                     their {DAVIES_LIMIT_M} M values and the pH is rough (a few tenths).",
                    crate::report::sig(ionic_strength, 3)
                ));
            }
        }
    }
    if conditions.temperature_c() != 25.0 {
        let fixed: Vec<&str> = prepared
            .iter()
            .filter(|p| !p.profile.sites.is_empty())
            .map(|p| p.profile.smiles.as_str())
            .collect();
        if !fixed.is_empty() {
            notes.push(format!(
                "No temperature coefficient is known for the sites of {}: their 25 °C pKa \
                 values are used at {} °C.",
                fixed.join(", "),
                conditions.temperature_c()
            ));
        }
    }
    notes
}
