//! The `check` report: the verdict first, then every problem found with its fix set apart,
//! the mixture and the procedure as written, each step with its pH and where each compound is,
//! what is in hand at the end, the ionization curves with the procedure's pHs marked, and the
//! notes and cautions of every step.

use super::figure::ionization_figure;
use super::{Alert, Block, Cell, Report, Section, Table, merge_cautions};
use crate::report::ionization::Compound;
use crate::units::{fmt_moles, fmt_ph, fmt_volume};
use crate::workup::procedure::Report as Checked;
use crate::workup::procedure::report::{EndReport, LayerReport};

/// The run as the user asked for it.
#[derive(Debug, Clone, Default)]
pub struct CheckInputs {
    /// The procedure file as named on the command line.
    pub file: String,
    /// The file's text, exactly as written.
    pub text: String,
    pub estimate_only: bool,
}

/// The whole report of a check; `compounds` are the mixture's, in file order.
pub fn report(inputs: &CheckInputs, checked: &Checked, compounds: &[Compound]) -> Report {
    let title = match &checked.title {
        Some(t) => format!("Check: {t}"),
        None => format!("Check of {}", inputs.file),
    };
    let mut r = Report::new("check", title);
    r.summary = summary(checked);
    if !checked.problems.is_empty() {
        r.sections.push(Section {
            title: format!("Problems found ({})", checked.problems.len()),
            blocks: vec![Block::Alerts(alerts(checked))],
        });
    }
    r.sections.push(Section {
        title: "Inputs".into(),
        blocks: vec![
            Block::Table(mixture_table(checked)),
            Block::Facts(settings(inputs, checked)),
        ],
    });
    r.sections.push(Section {
        title: "Step by step".into(),
        blocks: vec![
            Block::Table(step_table(checked)),
            Block::Table(where_table(checked)),
        ],
    });
    if let Some(end) = &checked.end {
        r.sections.push(Section {
            title: "In hand at the end".into(),
            blocks: vec![Block::Table(end_table(end, checked))],
        });
    }
    if !compounds.is_empty() {
        // Marks to the hundredth: a pH carried through a step unchanged draws one line.
        let marks: Vec<f64> = checked
            .steps
            .iter()
            .filter_map(|s| s.ph)
            .map(|ph| (ph * 100.0).round() / 100.0)
            .collect();
        r.sections.push(Section {
            title: "Ionization against pH".into(),
            blocks: vec![ionization_figure(
                compounds,
                &marks,
                "Fraction ionized (and octanol/water logD where the logP is known) of each \
                 compound against pH, from its pKa values alone; vertical lines mark the pH of \
                 the aqueous layer after each step. The tables above come from the simulation \
                 with both layers.",
            )],
        });
    }
    r.sections.push(Section {
        title: "The procedure as written".into(),
        blocks: vec![Block::Listing(inputs.text.clone())],
    });
    r.notes = checked.notes.clone();
    r.cautions = cautions(checked);
    r
}

/// The verdict, then what the last step leaves in hand.
fn summary(c: &Checked) -> Vec<String> {
    let mut out = Vec::new();
    if c.problems.is_empty() {
        out.push(format!(
            "No problems found in the {} steps of this procedure.",
            c.steps.len()
        ));
    } else {
        // Problems come in step order: neighbours are enough to say each step once.
        let mut steps: Vec<String> = c.problems.iter().map(|p| p.step.to_string()).collect();
        steps.dedup();
        out.push(format!(
            "{} problem{} found (step{} {}): each is listed below with its fix.",
            c.problems.len(),
            if c.problems.len() == 1 { "" } else { "s" },
            if steps.len() == 1 { "" } else { "s" },
            steps.join(", ")
        ));
    }
    if let Some(end) = &c.end {
        let mut line = format!(
            "In hand at the end: the {} layer, {}",
            end.layer.phase,
            fmt_volume(end.layer.volume_ml / 1e3)
        );
        if let (Some(name), Some(rec)) = (&c.product, end.product_recovery_pct) {
            line += &format!(", holding {rec:.1} % of the product ({name})");
            if let Some(p) = end.product_purity_pct {
                line += &format!(" at {p:.1} mol % purity");
            }
        }
        line.push('.');
        out.push(line);
    }
    out
}

fn alerts(c: &Checked) -> Vec<Alert> {
    c.problems
        .iter()
        .map(|p| {
            let action = c
                .steps
                .iter()
                .find(|s| s.step == p.step)
                .map_or(String::new(), |s| format!(", {}", s.action));
            Alert {
                heading: format!(
                    "Step {}{action} (line {}): {}",
                    p.step,
                    p.line,
                    kind_text(p.kind)
                ),
                message: p.message.clone(),
                fix: p.fix.clone(),
            }
        })
        .collect()
}

/// A problem kind in words.
fn kind_text(kind: &str) -> String {
    kind.replace('_', " ")
}

fn mixture_table(c: &Checked) -> Table {
    let rows = c
        .start
        .layers
        .iter()
        .flat_map(|l| l.compounds.iter().map(move |h| (l, h)))
        .map(|(l, h)| {
            let product = c.product.as_deref() == Some(h.name.as_str());
            vec![
                Cell::Text(if product {
                    format!("{} (product)", h.name)
                } else {
                    h.name.clone()
                }),
                Cell::Code(h.smiles.clone()),
                Cell::Num(fmt_moles(h.mol)),
                Cell::Text(l.phase.to_string()),
            ]
        })
        .collect();
    Table {
        caption: Some("The mixture, as written".into()),
        header: ["compound", "SMILES", "amount", "in"]
            .map(String::from)
            .to_vec(),
        rows,
    }
}

fn settings(inputs: &CheckInputs, c: &Checked) -> Vec<(String, Cell)> {
    let text = |s: &str| Cell::Text(s.to_string());
    let volume = c
        .start
        .layers
        .iter()
        .map(|l| format!("{} {}", fmt_volume(l.volume_ml / 1e3), l.phase))
        .collect::<Vec<_>>()
        .join(", ");
    vec![
        ("Procedure file".into(), Cell::Code(inputs.file.clone())),
        ("Solvent".into(), text(&c.solvent)),
        ("At the start".into(), text(&volume)),
        (
            "Temperature".into(),
            text(&format!("{} °C", c.temperature_c)),
        ),
        ("CO2".into(), text(c.co2_mode)),
        (
            "Product".into(),
            text(c.product.as_deref().unwrap_or("not named")),
        ),
        (
            "pKa values".into(),
            text(if inputs.estimate_only {
                "group estimates only"
            } else {
                "stored measured values, else estimates"
            }),
        ),
    ]
}

fn step_table(c: &Checked) -> Table {
    let rows = c
        .steps
        .iter()
        .map(|s| {
            let mut did = s.did.clone();
            if let Some(n) = &s.note {
                did += &format!(" ({n})");
            }
            vec![
                Cell::Num(s.step.to_string()),
                Cell::Num(s.line.to_string()),
                Cell::Text(s.action.to_string()),
                Cell::Text(did),
                Cell::Key(s.ph.map_or("-".into(), fmt_ph)),
                Cell::Num(
                    s.portion_ph
                        .iter()
                        .map(|p| fmt_ph(*p))
                        .collect::<Vec<_>>()
                        .join(", "),
                ),
                Cell::Num(s.reagent_mol.map_or("-".into(), fmt_moles)),
                Cell::Num(if s.co2_released_ml > 0.5 {
                    fmt_volume(s.co2_released_ml / 1e3)
                } else {
                    "-".into()
                }),
                match s.problems.len() {
                    0 => Cell::Num("none".into()),
                    n => Cell::Key(format!("{n} (see Problems)")),
                },
            ]
        })
        .collect();
    Table {
        caption: Some("Each step, with the pH of the aqueous layer in the funnel after it".into()),
        header: [
            "step",
            "line",
            "action",
            "does",
            "pH",
            "portion pH",
            "reagent",
            "CO2",
            "problems",
        ]
        .map(String::from)
        .to_vec(),
        rows,
    }
}

/// Where `name` is after a step: `organic (funnel) 2.0 %, neutrals 98.0 %`.
fn where_text(layers: &[LayerReport], name: &str) -> String {
    let places: Vec<String> = layers
        .iter()
        .filter_map(|l| {
            let h = l.compounds.iter().find(|h| h.name == name)?;
            (h.percent >= 0.05).then(|| {
                let label = if l.layer == "funnel" {
                    format!("{} (funnel)", l.phase)
                } else {
                    l.layer.clone()
                };
                format!("{label} {:.1} %", h.percent)
            })
        })
        .collect();
    if places.is_empty() {
        "-".into()
    } else {
        places.join(", ")
    }
}

fn where_table(c: &Checked) -> Table {
    let names: Vec<String> = c
        .start
        .layers
        .iter()
        .flat_map(|l| l.compounds.iter().map(|h| h.name.clone()))
        .collect();
    let rows = c
        .steps
        .iter()
        .map(|s| {
            let mut row = vec![
                Cell::Num(s.step.to_string()),
                Cell::Num(s.ph.map_or("-".into(), fmt_ph)),
            ];
            row.extend(names.iter().map(|n| Cell::Text(where_text(&s.layers, n))));
            row
        })
        .collect();
    let mut header = vec!["step".to_string(), "pH".to_string()];
    header.extend(names.iter().cloned());
    Table {
        caption: Some(
            "Where each compound is after each step, % of the amount at the start".into(),
        ),
        header,
        rows,
    }
}

fn end_table(end: &EndReport, c: &Checked) -> Table {
    let total: f64 = end.layer.compounds.iter().map(|h| h.mol).sum();
    let rows = end
        .layer
        .compounds
        .iter()
        .map(|h| {
            let product = c.product.as_deref() == Some(h.name.as_str());
            let share = if total > 0.0 {
                100.0 * h.mol / total
            } else {
                0.0
            };
            vec![
                Cell::Text(if product {
                    format!("{} (product)", h.name)
                } else {
                    h.name.clone()
                }),
                Cell::Code(h.smiles.clone()),
                Cell::Num(fmt_moles(h.mol)),
                if product {
                    Cell::Key(format!("{:.1} %", h.percent))
                } else {
                    Cell::Num(format!("{:.1} %", h.percent))
                },
                Cell::Num(format!("{share:.1} mol %")),
            ]
        })
        .collect();
    Table {
        caption: Some(format!(
            "The {} layer in hand ({})",
            end.layer.phase,
            fmt_volume(end.layer.volume_ml / 1e3)
        )),
        header: [
            "compound",
            "SMILES",
            "amount",
            "of the start",
            "of the layer",
        ]
        .map(String::from)
        .to_vec(),
        rows,
    }
}

/// Each step's cautions in step order, then the procedure's own; the procedure's list ends
/// with the deferral to local rules, the SDS and lab practice, which stays last.
fn cautions(c: &Checked) -> Vec<String> {
    // `merge_cautions` takes the deferral from the first list: hand it over first, alone.
    let deferral = c.cautions.len().saturating_sub(1)..c.cautions.len();
    let lists = std::iter::once(&c.cautions[deferral])
        .chain(c.steps.iter().map(|s| s.cautions.as_slice()))
        .chain(std::iter::once(c.cautions.as_slice()));
    merge_cautions(lists)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::workup::procedure::report::{Problem, Snapshot, StepReport};

    fn step(n: usize, cautions: &[&str], problems: Vec<Problem>) -> StepReport {
        StepReport {
            step: n,
            line: 10 * n,
            action: "add",
            note: None,
            did: "10.0 mL of 1M hcl".into(),
            ph: Some(1.0),
            portion_ph: vec![],
            reagent_mol: Some(0.01),
            co2_released_ml: 0.0,
            layers: vec![],
            problems,
            cautions: cautions.iter().map(|c| c.to_string()).collect(),
        }
    }

    fn checked() -> Checked {
        let problem = Problem {
            step: 2,
            line: 20,
            kind: "extraction_ph",
            message: "too low".into(),
            fix: "go higher".into(),
        };
        Checked {
            title: None,
            solvent: "mtbe".into(),
            temperature_c: 25.0,
            co2_mode: "vented",
            product: None,
            start: Snapshot {
                ph: None,
                layers: vec![],
            },
            steps: vec![
                step(1, &["acid burns"], vec![]),
                step(2, &["gas", "acid burns"], vec![problem.clone()]),
            ],
            problems: vec![problem.clone(), problem],
            end: None,
            cautions: vec!["solvent".into(), "defer to the SDS".into()],
            notes: vec![],
            verdict: "problems",
        }
    }

    #[test]
    fn step_cautions_come_first_once_each_and_the_deferral_last() {
        assert_eq!(
            cautions(&checked()),
            ["acid burns", "gas", "solvent", "defer to the SDS"]
        );
    }

    #[test]
    fn the_verdict_names_each_step_with_a_problem_once() {
        let lines = summary(&checked());
        assert_eq!(
            lines[0],
            "2 problems found (step 2): each is listed below with its fix."
        );
        let a = alerts(&checked());
        assert_eq!(a[0].heading, "Step 2, add (line 20): extraction ph");
    }
}
