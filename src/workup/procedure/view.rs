//! Turns the funnel, the layers set aside and those thrown away into report rows: per layer,
//! the moles of each compound and their share of the start amount.

use super::funnel::{Phase, PhaseKind};
use super::model::Step;
use super::report::{Holding, LayerReport, StepReport};
use super::simulate::Run;

/// An empty report for `step`, filled in as the step runs.
pub fn blank(step: &Step) -> StepReport {
    StepReport {
        step: step.number,
        line: step.line,
        action: step.action.verb(),
        note: step.note.clone(),
        did: String::new(),
        ph: None,
        portion_ph: Vec::new(),
        reagent_mol: None,
        co2_released_ml: 0.0,
        layers: Vec::new(),
        problems: Vec::new(),
        cautions: Vec::new(),
    }
}

/// One layer (or several pooled under one label).
pub fn layer(run: &Run, label: &str, phases: &[&Phase]) -> LayerReport {
    let kinds: Vec<bool> = phases.iter().map(|p| p.is_organic()).collect();
    let phase = match (kinds.iter().all(|&o| o), kinds.iter().all(|&o| !o)) {
        (true, _) => "organic",
        (_, true) => "aqueous",
        _ => "mixed",
    };
    let compounds = run
        .procedure
        .mixture
        .compounds
        .iter()
        .enumerate()
        .map(|(ci, c)| {
            let slot = run.slots.iter().position(|s| s.compound == ci && s.main);
            let mol: f64 = slot.map_or(0.0, |i| phases.iter().map(|p| p.slot_mol[i]).sum());
            Holding {
                name: c.name.clone(),
                smiles: c.smiles.clone(),
                mol,
                percent: 100.0 * mol / c.amount_mol,
            }
        })
        .collect();
    let ph = match phases {
        [one] if matches!(one.kind, PhaseKind::Aqueous) => one.ph,
        _ => None,
    };
    LayerReport {
        layer: label.to_string(),
        phase,
        volume_ml: 1e3 * phases.iter().map(|p| p.volume_l()).sum::<f64>(),
        ph,
        compounds,
    }
}

/// Every layer at this moment: the funnel's, each set aside, and all thrown away so far.
pub fn layers(run: &Run) -> Vec<LayerReport> {
    let mut out = Vec::new();
    if let Some(o) = &run.funnel.organic {
        out.push(layer(run, "funnel", &[o]));
    }
    if let Some(a) = &run.funnel.aqueous {
        out.push(layer(run, "funnel", &[a]));
    }
    for (name, d) in &run.held {
        let phases: Vec<&Phase> = d.phases.iter().collect();
        out.push(layer(run, name, &phases));
    }
    let thrown: Vec<&Phase> = run.gone.iter().flat_map(|d| d.phases.iter()).collect();
    if !thrown.is_empty() {
        out.push(layer(run, "discarded", &thrown));
    }
    out
}
