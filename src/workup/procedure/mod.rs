//! `phdose check`: a written workup (a TOML file of our own format, see README.md) read,
//! simulated step by step through the two-layer equilibrium, and checked for the mistakes a
//! bench chemist makes: a reagent that runs out before the pH gets where the step wants it, a
//! layer kept or discarded that holds the product, a top/bottom mix-up with a dense solvent,
//! a back-extraction at a pH where the product is still ionized.

pub mod checks;
pub mod format;
pub mod funnel;
pub mod model;
pub mod read;
pub mod report;
pub mod simulate;
pub mod view;

pub use model::{Action, Procedure, Step, Which};
pub use read::read;
pub use report::{Problem, Report, StepReport};

use crate::acidity::Handbook;
use crate::equilibrium::Reagent;
use crate::error::Result;
use crate::workup::cautions::{Situation, cautions_for};
use report::{EndReport, Snapshot};
use simulate::Run;

/// Reads `text` as a procedure and checks it: the report data every output format is built
/// from. Problems found are in the report (`verdict` = `problems`), not an error; an error
/// means the file itself could not be read.
pub fn check(text: &str, handbook: &Handbook, catalogue: &[Reagent]) -> Result<Report> {
    let procedure = read(text, handbook, catalogue)?;
    simulate(&procedure, catalogue, handbook.estimate_only)
}

/// Simulates a procedure already read.
pub fn simulate(
    procedure: &Procedure,
    catalogue: &[Reagent],
    estimate_only: bool,
) -> Result<Report> {
    let mut run = Run::new(procedure, catalogue, estimate_only)?;
    let start = Snapshot {
        ph: run.funnel.aqueous.as_ref().and_then(|a| a.ph),
        layers: view::layers(&run),
    };
    run.all()?;
    let mut extra = checks::departures(&run);
    let end_phase = run
        .funnel
        .organic
        .clone()
        .or_else(|| run.funnel.aqueous.clone());
    if let (Some(last), Some(end)) = (procedure.steps.last(), &end_phase)
        && end.is_organic()
        && !run.stopped
    {
        extra.extend(checks::impurities(&run, last, end));
    }
    // Problems found after the run belong to their step's report too.
    for p in &extra {
        if let Some(s) = run.steps.iter_mut().find(|s| s.step == p.step) {
            s.problems.push(p.clone());
        }
    }
    let problems = simulate::all_problems(&run.steps, &[]);
    let end = end_phase.map(|phase| {
        let layer = view::layer(&run, "in hand", &[&phase]);
        let product = procedure.product;
        let total: f64 = layer.compounds.iter().map(|h| h.mol).sum();
        EndReport {
            product_recovery_pct: product.map(|i| layer.compounds[i].percent),
            product_purity_pct: product
                .filter(|_| total > 0.0)
                .map(|i| 100.0 * layer.compounds[i].mol / total),
            layer,
        }
    });
    let mixture = &procedure.mixture;
    let mut cautions = cautions_for(
        "*",
        "*",
        &Situation {
            gas: false,
            solvent: Some(mixture.solvent.name.clone()),
        },
    )?;
    cautions.dedup();
    let mut notes = Vec::new();
    if run.stopped {
        notes.push(
            "The check stopped early: a step could not be carried out (see its problem).".into(),
        );
    }
    Ok(Report {
        title: procedure.title.clone(),
        solvent: mixture.solvent.name.clone(),
        temperature_c: mixture.conditions.temperature_c(),
        co2_mode: mixture.conditions.co2_mode().as_str(),
        product: procedure.product.map(|i| mixture.compounds[i].name.clone()),
        start,
        verdict: if problems.is_empty() {
            "ok"
        } else {
            "problems"
        },
        steps: run.steps,
        problems,
        end,
        cautions,
        notes,
    })
}
