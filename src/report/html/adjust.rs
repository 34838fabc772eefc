//! The `adjust` report: the solutes and settings as typed, the reagent to add for each target
//! in lab units, where each compound stands at the pH reached, the ionization curves with the
//! targets marked, and the notes and cautions of the run.

use super::figure::ionization_figure_at;
use super::{Block, Cell, Report, Section, Table, merge_cautions};
use crate::report::ionization::{self, Compound};
use crate::report::sig;
use crate::units::{Amount, fmt_mass, fmt_moles, fmt_ph, fmt_volume};
use crate::workup::adjust::Adjustment;

/// The run as the user asked for it, in the user's own words.
#[derive(Debug, Clone, Default)]
pub struct AdjustInputs {
    /// SMILES exactly as typed and the amount given, in order.
    pub solutes: Vec<(String, Amount)>,
    pub water: String,
    pub to_ph: String,
    pub reagent: String,
    pub stock: Option<String>,
    /// (SMILES, pKa list) as typed with `--pka`.
    pub pka_overrides: Vec<(String, String)>,
    pub estimate_only: bool,
    /// `--organic`, `--solvent` and `--washes` as typed, when a second layer is in contact.
    pub organic: Option<String>,
    pub solvent: Option<String>,
    pub washes: Option<u32>,
}

/// One solute as the report draws it: its curves and molar mass (g/mol), in input order.
#[derive(Debug, Clone)]
pub struct SoluteCurves {
    pub compound: Compound,
    pub molar_mass: f64,
}

/// The whole report for `results` (one per target, in order).
pub fn report(inputs: &AdjustInputs, results: &[Adjustment], solutes: &[SoluteCurves]) -> Report {
    let mut r = Report::new("adjust", title(inputs, results));
    r.summary = results.iter().map(summary_line).collect();
    r.sections.push(Section {
        title: "Inputs".into(),
        blocks: vec![
            Block::Table(solute_table(inputs, results, solutes)),
            Block::Facts(settings(inputs, results)),
        ],
    });
    let mut blocks = vec![Block::Table(dose_table(results))];
    if let Some(first) = results.first() {
        blocks.push(Block::Text(format!(
            "Before any reagent the layer is at pH {}.",
            fmt_ph(first.start_ph)
        )));
    }
    blocks.push(Block::Table(layer_table(results)));
    blocks.push(Block::Table(compound_table(results)));
    r.sections.push(Section {
        title: "Results".into(),
        blocks,
    });
    if !solutes.is_empty() {
        r.sections.push(Section {
            title: "Ionization against pH".into(),
            blocks: vec![figure(results, solutes)],
        });
    }
    r.notes = notes(results);
    r.cautions = merge_cautions(results.iter().map(|a| a.cautions.as_slice()));
    r
}

fn title(inputs: &AdjustInputs, results: &[Adjustment]) -> String {
    let reagents = unique(results.iter().map(|a| &a.reagent));
    let reagent = if reagents.is_empty() {
        inputs.reagent.clone()
    } else {
        reagents.join(", ")
    };
    let targets: Vec<String> = results.iter().map(|a| short_ph(a.target_ph)).collect();
    format!(
        "Bringing the layer to pH {} with {reagent}",
        targets.join(", ")
    )
}

/// A pH as typed by a chemist: `8`, `7.4`, `2.25`.
pub(super) fn short_ph(ph: f64) -> String {
    let s = format!("{ph:.2}");
    s.trim_end_matches('0').trim_end_matches('.').to_string()
}

/// An amount in the unit it was given in.
fn amount_text(amount: &Amount) -> String {
    match *amount {
        Amount::Moles(n) => fmt_moles(n),
        Amount::Grams(g) => fmt_mass(g),
        Amount::Molar(c) => format!("{} M", sig(c, 3)),
        Amount::Equivalents(e) => format!("{} equiv.", sig(e, 3)),
    }
}

/// What to weigh or measure: `3.12 mL of 1M naoh`, `262 mg of solid nahco3`.
fn measure(a: &Adjustment) -> String {
    crate::report::dose_measure(a.stock_volume_ml, a.reagent_mass_g, &a.stock, &a.reagent)
        .unwrap_or_else(|| format!("{} of {}", fmt_moles(a.reagent_mol), a.reagent))
}

fn summary_line(a: &Adjustment) -> String {
    let equiv = a
        .equivalents
        .map(|e| format!(", {} equiv.", sig(e, 3)))
        .unwrap_or_default();
    format!(
        "For pH {}: add {} ({}{equiv}). The layer goes from pH {} to pH {}; final volume {}.",
        short_ph(a.target_ph),
        measure(a),
        fmt_moles(a.reagent_mol),
        fmt_ph(a.start_ph),
        fmt_ph(a.ph),
        fmt_volume(a.aqueous_volume_ml / 1e3)
    )
}

fn solute_table(inputs: &AdjustInputs, results: &[Adjustment], solutes: &[SoluteCurves]) -> Table {
    let amounts = results.first().map(|a| &a.solutes);
    let rows = inputs
        .solutes
        .iter()
        .enumerate()
        .map(|(i, (smiles, amount))| GivenAmount {
            smiles,
            given: amount_text(amount),
            mol: amounts.and_then(|s| s.get(i)).map(|s| s.amount_mol),
            molar_mass: solutes.get(i).map(|s| s.molar_mass),
        });
    amounts_table("Solutes, as given", rows)
}

/// One compound as the user gave it, with the moles that amount came to.
pub(super) struct GivenAmount<'a> {
    pub smiles: &'a str,
    /// The amount exactly as typed.
    pub given: String,
    pub mol: Option<f64>,
    /// g/mol.
    pub molar_mass: Option<f64>,
}

/// The table of compounds as given (SMILES, amount typed, moles, mass, molar mass) that opens
/// the inputs of the `adjust` and `plan` reports.
pub(super) fn amounts_table<'a>(
    caption: &str,
    compounds: impl Iterator<Item = GivenAmount<'a>>,
) -> Table {
    let rows = compounds
        .enumerate()
        .map(|(i, c)| {
            vec![
                Cell::Num(format!("{}", i + 1)),
                Cell::Code(c.smiles.to_string()),
                Cell::Num(c.given),
                Cell::Num(c.mol.map_or("-".into(), fmt_moles)),
                Cell::Num(match (c.mol, c.molar_mass) {
                    (Some(n), Some(m)) => fmt_mass(n * m),
                    _ => "-".into(),
                }),
                Cell::Num(c.molar_mass.map_or("-".into(), |m| format!("{m:.2}"))),
            ]
        })
        .collect();
    Table {
        caption: Some(caption.into()),
        header: [
            "#",
            "SMILES",
            "amount given",
            "amount",
            "mass",
            "molar mass (g/mol)",
        ]
        .map(String::from)
        .to_vec(),
        rows,
    }
}

fn settings(inputs: &AdjustInputs, results: &[Adjustment]) -> Vec<(String, Cell)> {
    let text = |s: &str| Cell::Text(s.to_string());
    let mut facts = vec![("Aqueous layer".to_string(), text(&inputs.water))];
    if let Some(o) = &inputs.organic {
        let solvent = inputs.solvent.as_deref().unwrap_or("?");
        facts.push(("Organic layer".into(), text(&format!("{o} {solvent}"))));
    }
    if let Some(n) = inputs.washes {
        facts.push(("Aqueous portions".into(), text(&n.to_string())));
    }
    facts.extend([
        ("Target pH".to_string(), text(&inputs.to_ph)),
        ("Reagent".to_string(), text(&inputs.reagent)),
        (
            "Stock".to_string(),
            match &inputs.stock {
                Some(s) => text(s),
                None => text(&format!(
                    "{} (default)",
                    unique(results.iter().map(|a| &a.stock)).join(", ")
                )),
            },
        ),
    ]);
    if let Some(a) = results.first() {
        facts.push((
            "Temperature".into(),
            text(&format!("{} °C", a.temperature_c)),
        ));
        facts.push((
            "Activity model".into(),
            text(match a.activity {
                "ideal" => "ideal (activity coefficients 1)",
                _ => "Davies equation",
            }),
        ));
        facts.push((
            "CO2".into(),
            text(match a.co2_mode {
                "closed" => "closed (all carbon stays)",
                "air" => "air (equilibrium with the CO2 of air)",
                _ => "vented (dissolved CO2 capped at 1 atm)",
            }),
        ));
    }
    facts.push((
        "pKa values".into(),
        text(if inputs.estimate_only {
            "group estimates only"
        } else {
            "stored measured values, else estimates"
        }),
    ));
    for (smiles, values) in &inputs.pka_overrides {
        facts.push((
            "pKa given (--pka)".into(),
            Cell::Code(format!("{smiles}: {values}")),
        ));
    }
    facts
}

fn dose_table(results: &[Adjustment]) -> Table {
    let rows = results
        .iter()
        .map(|a| {
            vec![
                Cell::Num(short_ph(a.target_ph)),
                Cell::Key(measure(a)),
                Cell::Num(fmt_moles(a.reagent_mol)),
                Cell::Num(a.equivalents.map_or("-".into(), |e| sig(e, 3))),
                Cell::Key(fmt_ph(a.ph)),
            ]
        })
        .collect();
    Table {
        caption: Some("Reagent to add".into()),
        header: [
            "target pH",
            "weigh / measure",
            "reagent",
            "equiv.",
            "pH reached",
        ]
        .map(String::from)
        .to_vec(),
        rows,
    }
}

fn layer_table(results: &[Adjustment]) -> Table {
    let rows = results
        .iter()
        .map(|a| {
            vec![
                Cell::Num(fmt_ph(a.ph)),
                Cell::Num(fmt_volume(a.aqueous_volume_ml / 1e3)),
                Cell::Num(format!("{} M", sig(a.reagent_conc_mol_l, 3))),
                Cell::Num(format!("{} M", sig(a.ionic_strength, 3))),
                Cell::Num(if a.co2_released_mol > 0.0 {
                    format!(
                        "{} ({})",
                        fmt_volume(a.co2_released_ml / 1e3),
                        fmt_moles(a.co2_released_mol)
                    )
                } else {
                    "none".into()
                }),
                Cell::Num(fmt_ph(a.reagent_limit_ph)),
            ]
        })
        .collect();
    Table {
        caption: Some("The aqueous layer after the addition".into()),
        header: [
            "pH reached",
            "volume",
            "reagent in layer",
            "ionic strength",
            "CO2 released",
            "reagent tends to pH",
        ]
        .map(String::from)
        .to_vec(),
        rows,
    }
}

fn compound_table(results: &[Adjustment]) -> Table {
    let mut rows = Vec::new();
    for a in results {
        for s in &a.solutes {
            let sites = s
                .sites
                .iter()
                .map(|x| format!("{} ({}) {:.1}", x.group, x.kind.as_str(), x.pka))
                .collect::<Vec<_>>()
                .join("; ");
            rows.push(vec![
                Cell::Num(fmt_ph(a.ph)),
                Cell::Code(s.smiles.clone()),
                Cell::Text(if sites.is_empty() {
                    "none".into()
                } else {
                    sites
                }),
                Cell::Num(format!("{:.1} %", 100.0 * s.fraction_neutral)),
                Cell::Num(format!("{:.1} %", 100.0 * (1.0 - s.fraction_neutral))),
                Cell::Num(ionization::signed(s.mean_charge, 2)),
                Cell::Num(format!("{:.1} %", 100.0 * s.fraction_aqueous)),
            ]);
        }
    }
    Table {
        caption: Some("Where each compound stands at the pH reached".into()),
        header: [
            "pH",
            "SMILES",
            "sites: group (kind) pKa",
            "neutral",
            "ionized",
            "mean charge",
            "in water",
        ]
        .map(String::from)
        .to_vec(),
        rows,
    }
}

/// The solutes' ionization curves with each target marked.
fn figure(results: &[Adjustment], solutes: &[SoluteCurves]) -> Block {
    let targets: Vec<f64> = results.iter().map(|a| a.target_ph).collect();
    let compounds: Vec<Compound> = solutes.iter().map(|s| s.compound.clone()).collect();
    let temperature_c = results.first().map_or(25.0, |a| a.temperature_c);
    ionization_figure_at(
        &compounds,
        &targets,
        "Fraction ionized (and logD where the logP is known) of each solute against pH, from \
         its pKa values alone; vertical lines mark the target pH. Other solutes, salt and \
         temperature shift the real layer slightly; the tables above include them.",
        temperature_c,
    )
}

/// Notes shared by every target once; a note that holds for some targets only (the ionic
/// strength differs from one to the next) says which.
fn notes(results: &[Adjustment]) -> Vec<String> {
    let shared = |n: &String| results.iter().all(|a| a.notes.contains(n));
    let mut out = unique(
        results
            .iter()
            .flat_map(|a| a.notes.iter())
            .filter(|n| shared(n)),
    );
    for a in results {
        for n in a.notes.iter().filter(|n| !shared(n)) {
            let line = format!("For pH {}: {n}", short_ph(a.target_ph));
            if !out.contains(&line) {
                out.push(line);
            }
        }
    }
    out
}

/// Each text once, in first-seen order.
pub(super) fn unique<'a>(items: impl Iterator<Item = &'a String>) -> Vec<String> {
    let mut out: Vec<String> = Vec::new();
    for item in items {
        if !out.contains(item) {
            out.push(item.clone());
        }
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn targets_are_written_as_typed() {
        assert_eq!(short_ph(8.0), "8");
        assert_eq!(short_ph(7.4), "7.4");
        assert_eq!(short_ph(2.25), "2.25");
    }

    #[test]
    fn repeated_texts_appear_once_in_order() {
        let a = ["x".to_string(), "y".into(), "x".into(), "z".into()];
        assert_eq!(unique(a.iter()), ["x", "y", "z"]);
    }
}
