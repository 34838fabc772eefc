//! `adjust` with an organic layer in contact (`--organic VOLUME --solvent NAME`): the reagent
//! amount that brings the aqueous layer to each target with the mixture shared between the
//! layers (what the solutes consume and what partitions both counted), then where each
//! compound is. With `--washes N` the organic layer meets N portions of the same aqueous
//! solution: each portion is the same volume of water with the same amount of reagent (the
//! amount the first portion needs to reach the target), as one would make up one wash
//! solution at the bench; later portions meet less of the compounds and their pH is reported
//! as it comes out. `fraction_aqueous` is then the share in all portions together.

use serde::Serialize;

use super::adjust::{Adjustment, Context, Prepared, Request, choose_stock, report};
use super::layers::{self, OrganicLayer};
use super::mixture::Mixture;
use super::washes::{Portions, wash};
use crate::acidity::Handbook;
use crate::equilibrium::{self, AqueousLayer, Reagent};
use crate::error::{Error, Result};
use crate::units::{fmt_ph, fmt_volume};

/// The organic layer and how many aqueous portions it meets.
#[derive(Debug, Clone)]
pub struct OrganicRequest {
    pub solvent: String,
    /// L.
    pub volume_l: f64,
    /// Aqueous portions (1 = one equilibration).
    pub washes: u32,
}

/// The two layers, for the report.
#[derive(Debug, Clone, Serialize)]
pub struct LayersReport {
    pub solvent: String,
    pub organic_volume_ml: f64,
    pub solvent_density_g_ml: f64,
    /// `upper` or `lower`.
    pub organic: &'static str,
    /// `upper` or `lower`.
    pub aqueous: &'static str,
    /// `collander` (published relation to octanol) or `octanol` (octanol stands in).
    pub partition_basis: &'static str,
    /// ± log units quoted with the solvent logP.
    pub log_p_uncertainty: f64,
}

/// One aqueous portion of a series.
#[derive(Debug, Clone, Serialize)]
pub struct PortionReport {
    /// 1, 2, ...
    pub portion: u32,
    pub ph: f64,
    pub aqueous_volume_ml: f64,
    pub co2_released_mol: f64,
    /// Per compound, in input order.
    pub solutes: Vec<PortionShare>,
}

/// One compound after a portion.
#[derive(Debug, Clone, Serialize)]
pub struct PortionShare {
    pub smiles: String,
    /// Share taken up by this portion alone.
    pub fraction_this_portion: f64,
    /// Share in this and the earlier portions together.
    pub fraction_aqueous_cumulative: f64,
}

/// Solves a request with an organic layer: one `Adjustment` per target.
pub fn adjust_with_organic(
    request: &Request,
    organic: &OrganicRequest,
    handbook: &Handbook,
    catalogue: &[Reagent],
) -> Result<Vec<Adjustment>> {
    if request.targets.is_empty() {
        return Err(Error::Input("give a target with --to-ph".into()));
    }
    let layer = OrganicLayer::new(&organic.solvent, organic.volume_l)?;
    let mixture = Mixture::new(&request.solutes, handbook, &layer.solvent, request.water_l)?;
    let water = AqueousLayer::water(request.water_l);
    let first = mixture.layers(&water, layer.volume_l, &mixture.initial_moles(), true)?;
    let conditions = &request.conditions;
    let start = layers::equilibrate(&first, conditions)?;
    let prepared: Vec<Prepared> = mixture
        .members
        .iter()
        .map(|m| Prepared {
            profile: m.profile.clone(),
            amount_mol: m.amount_mol,
        })
        .collect();
    let total_solute_mol: f64 = prepared.iter().map(|p| p.amount_mol).sum();
    let auto = request.reagent.trim().eq_ignore_ascii_case("auto");
    let mut out = Vec::new();
    for &target in &request.targets {
        // `auto` already dosed its choice while choosing; a named reagent is dosed here.
        let (reagent, offer, why, dosed) = if auto {
            let (c, dosed) = layers::choose_auto(&first, target, conditions, catalogue)?;
            (
                c.reagent,
                c.stock,
                Some(format!("auto: {}", c.reason)),
                dosed,
            )
        } else {
            let reagent = Reagent::find(catalogue, &request.reagent)?;
            let offer = choose_stock(reagent, request.stock.as_deref())?;
            let dosed = layers::dose_with_alternatives(
                &first, reagent, offer, target, conditions, catalogue,
            )?;
            (reagent.clone(), offer.clone(), None, dosed)
        };
        let context = Context {
            prepared: &prepared,
            reagent: &reagent,
            conditions,
            start_ph: start.ph,
            limit_ph: dosed.dose.limit_ph,
            total_solute_mol,
            why,
            solvent: Some(layer.solvent.name.clone()),
        };
        let mut adjustment = report(&context, &dosed.dose, target)?;
        let mol = dosed.dose.reagent_mol;
        let with = layers::with_reagent(&first, &reagent, &offer.stock, mol);
        let fresh = equilibrium::dose::with_reagent(&water, &reagent, &offer.stock, mol);
        let portions = wash(&with, &fresh, organic.washes, conditions)?;
        fill_layers(&mut adjustment, &mixture, &layer, &portions, &dosed.state);
        adjustment
            .notes
            .extend(portion_notes(organic, &adjustment, &mixture));
        out.push(adjustment);
    }
    Ok(out)
}

/// Fills each compound's shares, the layers and the portions into the one-layer report.
fn fill_layers(
    a: &mut Adjustment,
    mixture: &Mixture,
    layer: &OrganicLayer,
    portions: &Portions,
    first: &layers::TwoLayerState,
) {
    let mains = mixture.main_solutes();
    for (report, &i) in a.solutes.iter_mut().zip(&mains) {
        report.fraction_aqueous = portions.fraction_aqueous(i);
        report.fraction_organic = 1.0 - report.fraction_aqueous;
        report.log_d = first.shares[i].log_d;
    }
    let basis = if mixture
        .members
        .iter()
        .any(|m| m.partitions.iter().any(|p| p.octanol_stand_in()))
    {
        "octanol"
    } else {
        "collander"
    };
    let organic = layer.position();
    a.layers = Some(LayersReport {
        solvent: layer.solvent.name.clone(),
        organic_volume_ml: layer.volume_l * 1e3,
        solvent_density_g_ml: layer.solvent.density_g_ml,
        organic,
        aqueous: if organic == "upper" { "lower" } else { "upper" },
        partition_basis: basis,
        log_p_uncertainty: layer.solvent.log_uncertainty,
    });
    let mut taken = vec![0.0; mains.len()];
    let reports = portions
        .states
        .iter()
        .enumerate()
        .map(|(k, state)| PortionReport {
            portion: k as u32 + 1,
            ph: state.ph,
            aqueous_volume_ml: state.aqueous_volume_l * 1e3,
            co2_released_mol: state.equilibrium.carbonate.released_mol,
            solutes: mixture
                .members
                .iter()
                .zip(&mains)
                .enumerate()
                .map(|(m, (member, &i))| {
                    let share = state.shares[i].aqueous_mol / member.amount_mol.max(1e-300);
                    taken[m] += share;
                    PortionShare {
                        smiles: member.smiles.clone(),
                        fraction_this_portion: share,
                        fraction_aqueous_cumulative: taken[m],
                    }
                })
                .collect(),
        })
        .collect();
    a.washes = Some(reports);
}

/// What the portions are, and the partition's basis.
fn portion_notes(organic: &OrganicRequest, a: &Adjustment, mixture: &Mixture) -> Vec<String> {
    let mut notes = mixture.partition_notes();
    if let (Some(layers), Some(portions)) = (&a.layers, &a.washes) {
        notes.push(format!(
            "Two layers: {} {} ({} layer) over {} of water ({} layer); only the neutral form \
             crosses.",
            fmt_volume(layers.organic_volume_ml / 1e3),
            layers.solvent,
            layers.organic,
            fmt_volume((a.aqueous_volume_ml - a.stock_volume_ml.unwrap_or(0.0)) / 1e3),
            layers.aqueous
        ));
        if organic.washes > 1 {
            let phs: Vec<String> = portions.iter().map(|p| fmt_ph(p.ph)).collect();
            notes.push(format!(
                "{} portions, each the same water with the same reagent amount (one wash \
                 solution made up for all); the amount is what the first portion needs to \
                 reach the target. pH of the portions: {}.",
                organic.washes,
                phs.join(", ")
            ));
        }
    }
    notes
}
