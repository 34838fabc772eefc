//! The `plan` report: the mixture and settings as typed, the wash sequence in the order it is
//! done at the bench (pH, reagent and stock volume per portion, portions, what moves), why each
//! pH was chosen, the fractions it leaves (purity, recovery, contents), how to get each
//! compound back, the ionization curves with the step pHs marked, and the notes and cautions.

use super::adjust::{GivenAmount, SoluteCurves, amounts_table, short_ph};
use super::figure::ionization_figure;
use super::{Block, Cell, Report, Section, Table, merge_cautions};
use crate::report::ionization::Compound;
use crate::report::sig;
use crate::units::{fmt_moles, fmt_ph, fmt_volume};
use crate::workup::plan::{Plan, Step};
use crate::workup::plan_recover::Recovery;

/// The run as the user asked for it, in the user's own words.
#[derive(Debug, Clone, Default)]
pub struct PlanInputs {
    /// SMILES exactly as typed and the amount as typed, in order.
    pub solutes: Vec<(String, String)>,
    pub organic: String,
    pub solvent: String,
    /// `--water` as typed; `None`: the default portion.
    pub water: Option<String>,
    pub keep: Option<String>,
    pub temp: String,
    pub ideal: bool,
    pub estimate_only: bool,
}

/// The whole report of `plan`; `solutes` in input order.
pub fn report(inputs: &PlanInputs, plan: &Plan, solutes: &[SoluteCurves]) -> Report {
    let mut r = Report::new("plan", title(inputs, plan));
    r.summary = summary(inputs, plan);
    r.sections.push(Section {
        title: "Inputs".into(),
        blocks: vec![
            Block::Table(solute_table(inputs, plan, solutes)),
            Block::Facts(settings(inputs, plan)),
        ],
    });
    let mut steps = Vec::new();
    if plan.steps.is_empty() {
        steps.push(Block::Text(
            "No wash: no pH separates these compounds (see the notes).".into(),
        ));
    } else {
        steps.push(Block::Table(step_table(plan)));
        steps.push(Block::Table(reason_table(plan)));
        for s in &plan.steps {
            steps.push(Block::Text(format!(
                "Step {}, reagent: {}",
                s.step, s.reagent_reason
            )));
        }
    }
    r.sections.push(Section {
        title: "Wash steps".into(),
        blocks: steps,
    });
    r.sections.push(Section {
        title: "Fractions".into(),
        blocks: vec![
            Block::Table(fraction_table(plan)),
            Block::Table(contents_table(plan, solutes)),
        ],
    });
    if !plan.recoveries.is_empty() {
        let mut blocks = vec![Block::Table(recovery_table(plan))];
        blocks.extend(
            plan.recoveries
                .iter()
                .map(|rec| Block::Text(format!("From {}: {}.", rec.fraction, rec.note))),
        );
        r.sections.push(Section {
            title: "Getting each compound back".into(),
            blocks,
        });
    }
    if !solutes.is_empty() {
        let compounds: Vec<Compound> = solutes.iter().map(|s| s.compound.clone()).collect();
        let marks: Vec<f64> = plan.steps.iter().map(|s| s.ph).collect();
        r.sections.push(Section {
            title: "Ionization against pH".into(),
            blocks: vec![ionization_figure(
                &compounds,
                &marks,
                "Fraction ionized (and octanol/water logD where the logP is known) of each \
                 compound against pH, from its pKa values alone; vertical lines mark the pH of \
                 each wash step. A compound moves into the water where it is mostly ionized; \
                 the tables above come from the exact simulation with both layers.",
            )],
        });
    }
    r.notes = plan.notes.clone();
    r.cautions = merge_cautions([plan.cautions.as_slice()]);
    r
}

fn title(inputs: &PlanInputs, plan: &Plan) -> String {
    let what = match plan.steps.len() {
        0 => "no wash separates".to_string(),
        1 => "one wash step".to_string(),
        n => format!("{n} wash steps"),
    };
    format!(
        "Separating {} compounds from {}: {what}",
        inputs.solutes.len(),
        plan.solvent
    )
}

/// What to measure per portion: `4.12 mL of 1M citric_acid`, `527 mg of solid naoh`.
fn measure(
    stock_volume_ml: Option<f64>,
    mass_g: Option<f64>,
    stock: &str,
    reagent: &str,
) -> String {
    crate::report::dose_measure(stock_volume_ml, mass_g, stock, reagent)
        .unwrap_or_else(|| reagent.to_string())
}

fn step_measure(s: &Step) -> String {
    measure(s.stock_volume_ml, s.reagent_mass_g, &s.stock, &s.reagent)
}

fn recovery_measure(r: &Recovery) -> String {
    measure(r.stock_volume_ml, r.reagent_mass_g, &r.stock, &r.reagent)
}

/// The answer: each step as one sentence, then where the wanted compound ends.
fn summary(inputs: &PlanInputs, plan: &Plan) -> Vec<String> {
    let mut out = Vec::new();
    if plan.steps.is_empty() {
        out.push(format!(
            "No pH separates these compounds by washing: they stay together in {} {}.",
            fmt_volume(plan.organic_volume_ml / 1e3),
            plan.solvent
        ));
    }
    for s in &plan.steps {
        out.push(format!(
            "Step {}: wash at pH {} with {} × ({} water + {}); {} into the water.",
            s.step,
            fmt_ph(s.ph),
            s.portions,
            fmt_volume(s.water_ml / 1e3),
            step_measure(s),
            if s.moves.is_empty() {
                "nothing moves".to_string()
            } else {
                s.moves.join(", ") + if s.moves.len() == 1 { " goes" } else { " go" }
            }
        ));
    }
    if let Some(keep) = &inputs.keep
        && let Some(f) = plan.fractions.iter().find(|f| f.smiles.contains(keep))
    {
        out.push(format!(
            "{keep} (wanted) ends in the {} fraction: {:.1} % of it, {:.1} % pure by mass.",
            f.layer,
            100.0 * f.recovery,
            100.0 * f.purity
        ));
    }
    out
}

/// Each compound's total, mol: the fractions together hold all of it.
fn totals(plan: &Plan, n: usize) -> Vec<f64> {
    (0..n)
        .map(|i| {
            plan.fractions
                .iter()
                .filter_map(|f| f.contents_mol.get(i))
                .sum()
        })
        .collect()
}

fn solute_table(inputs: &PlanInputs, plan: &Plan, solutes: &[SoluteCurves]) -> Table {
    let totals = totals(plan, inputs.solutes.len());
    let rows = inputs
        .solutes
        .iter()
        .enumerate()
        .map(|(i, (smiles, amount))| GivenAmount {
            smiles,
            given: amount.clone(),
            mol: Some(totals[i]),
            molar_mass: solutes.get(i).map(|s| s.molar_mass),
        });
    amounts_table("The mixture, as given", rows)
}

fn settings(inputs: &PlanInputs, plan: &Plan) -> Vec<(String, Cell)> {
    let text = |s: &str| Cell::Text(s.to_string());
    let mut facts = vec![
        (
            "Organic layer".to_string(),
            text(&format!(
                "{} {} ({} layer)",
                inputs.organic, inputs.solvent, plan.organic_layer
            )),
        ),
        (
            "Aqueous portion".to_string(),
            text(&match &inputs.water {
                Some(w) => w.clone(),
                None => format!(
                    "{} (default: half the organic volume)",
                    fmt_volume(plan.water_per_portion_ml / 1e3)
                ),
            }),
        ),
        (
            "Wanted compound".to_string(),
            match &inputs.keep {
                Some(k) => Cell::Code(k.clone()),
                None => text("not named"),
            },
        ),
        (
            "Temperature".to_string(),
            text(&format!("{} °C", inputs.temp)),
        ),
        (
            "Activity model".to_string(),
            text(if inputs.ideal {
                "ideal (activity coefficients 1)"
            } else {
                "Davies equation"
            }),
        ),
    ];
    facts.push((
        "pKa and logP".into(),
        text(if inputs.estimate_only {
            "estimates only"
        } else {
            "stored measured values, else estimates"
        }),
    ));
    facts
}

fn step_table(plan: &Plan) -> Table {
    // Only bicarbonate and carbonate make gas: the column shows when some step does.
    let gas = plan.steps.iter().any(|s| s.co2_released_mol > 0.0);
    // The water per portion goes in the caption when every step uses the same.
    let same_water = plan
        .steps
        .iter()
        .all(|s| (s.water_ml - plan.water_per_portion_ml).abs() < 1e-9);
    let rows = plan
        .steps
        .iter()
        .map(|s| {
            let mut row = vec![Cell::Num(s.step.to_string()), Cell::Key(fmt_ph(s.ph))];
            if !same_water {
                row.push(Cell::Num(fmt_volume(s.water_ml / 1e3)));
            }
            row.extend([
                Cell::Key(step_measure(s)),
                Cell::Num(fmt_moles(s.reagent_mol)),
                Cell::Num(s.portions.to_string()),
                Cell::Num(
                    s.portion_ph
                        .iter()
                        .map(|p| fmt_ph(*p))
                        .collect::<Vec<_>>()
                        .join(", "),
                ),
            ]);
            if gas {
                row.push(Cell::Num(fmt_moles(s.co2_released_mol)));
            }
            row.push(Cell::Code(s.moves.join(", ")));
            row
        })
        .collect();
    let mut header: Vec<String> = vec!["step".into(), "pH".into()];
    if !same_water {
        header.push("water".into());
    }
    header.extend(
        ["stock", "reagent", "portions", "portion pH"]
            .map(String::from)
            .to_vec(),
    );
    if gas {
        header.push("CO2 released".into());
    }
    header.push("moves to water".into());
    Table {
        caption: Some(format!(
            "Each step: portions of {} plus the reagent (amounts per portion), shaken with \
             the {} layer and drawn off",
            if same_water {
                format!("{} water", fmt_volume(plan.water_per_portion_ml / 1e3))
            } else {
                "water".to_string()
            },
            plan.organic_layer
        )),
        header,
        rows,
    }
}

/// Why each pH: every compound still in the organic layer at that step.
fn reason_table(plan: &Plan) -> Table {
    let mut rows = Vec::new();
    for s in &plan.steps {
        for why in &s.why {
            rows.push(vec![
                Cell::Num(s.step.to_string()),
                Cell::Num(fmt_ph(s.ph)),
                Cell::Code(why.smiles.clone()),
                Cell::Num(format!("{:.1} %", 100.0 * why.ionized)),
                Cell::Num(why.log_d.map_or("none".into(), |d| format!("{d:.1}"))),
                Cell::Num(format!("{:.1} %", 100.0 * why.to_water)),
            ]);
        }
    }
    Table {
        caption: Some("Why each pH: the compounds still in the organic layer".into()),
        header: ["step", "pH", "SMILES", "ionized", "logD", "to water"]
            .map(String::from)
            .to_vec(),
        rows,
    }
}

fn fraction_table(plan: &Plan) -> Table {
    let rows = plan
        .fractions
        .iter()
        .map(|f| {
            vec![
                Cell::Text(f.layer.clone()),
                Cell::Code(f.smiles.join(", ")),
                Cell::Key(format!("{:.1} %", 100.0 * f.purity)),
                Cell::Key(format!("{:.1} %", 100.0 * f.recovery)),
            ]
        })
        .collect();
    Table {
        caption: Some("What each fraction is meant to hold".into()),
        header: ["fraction", "holds", "purity (mass)", "recovery"]
            .map(String::from)
            .to_vec(),
        rows,
    }
}

/// Every compound in every fraction, mmol: where the impurities and the losses are.
fn contents_table(plan: &Plan, solutes: &[SoluteCurves]) -> Table {
    let names: Vec<String> = match solutes {
        [] => (1..=plan.fractions.first().map_or(0, |f| f.contents_mol.len()))
            .map(|i| format!("#{i}"))
            .collect(),
        s => s.iter().map(|c| c.compound.smiles.clone()).collect(),
    };
    let rows = plan
        .fractions
        .iter()
        .map(|f| {
            let mut row = vec![Cell::Text(f.layer.clone())];
            row.extend(f.contents_mol.iter().map(|n| Cell::Num(fmt_moles(*n))));
            row
        })
        .collect();
    let mut header = vec!["fraction".to_string()];
    header.extend(names);
    Table {
        caption: Some("Contents of each fraction".into()),
        header,
        rows,
    }
}

fn recovery_table(plan: &Plan) -> Table {
    let rows = plan
        .recoveries
        .iter()
        .map(|r| {
            vec![
                Cell::Text(r.fraction.clone()),
                Cell::Code(r.smiles.join(", ")),
                Cell::Num(short_ph(r.ph)),
                Cell::Key(recovery_measure(r)),
                Cell::Num(format!(
                    "{} × {}",
                    r.solvent_portions,
                    fmt_volume(r.solvent_ml_each / 1e3)
                )),
                Cell::Num(format!("{} %", sig(100.0 * r.extracted, 3))),
                Cell::Key(format!("{} %", sig(100.0 * r.overall, 3))),
            ]
        })
        .collect();
    Table {
        caption: Some(format!(
            "Bring each aqueous fraction to the pH, add the reagent, extract with fresh {}",
            plan.solvent
        )),
        header: [
            "fraction",
            "compounds",
            "to pH",
            "add",
            "extract with",
            "extracted",
            "of the start",
        ]
        .map(String::from)
        .to_vec(),
        rows,
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn a_stock_or_a_solid_reads_as_measured() {
        assert_eq!(
            measure(Some(4.12), None, "1M", "citric_acid"),
            "4.12 mL of 1M citric_acid"
        );
        assert_eq!(
            measure(Some(10.0), None, "sat", "nahco3"),
            "10.0 mL of saturated nahco3"
        );
        assert_eq!(
            measure(None, Some(0.527), "solid", "naoh"),
            "527 mg of solid naoh"
        );
    }
}
