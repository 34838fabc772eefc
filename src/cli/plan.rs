//! `phdose plan`: a wash sequence that separates a mixture dissolved in an organic solvent,
//! step by step for the bench, then how to get each compound back.

use super::adjust::solute_pairs;
use super::{Cli, Format, open_store};
use crate::acidity::Handbook;
use crate::equilibrium::{Activity, Conditions};
use crate::error::Result;
use crate::report::{self, sig};
use crate::units::{self, fmt_moles, fmt_ph, fmt_volume};
use crate::workup::adjust::SoluteInput;
use crate::workup::plan::{Plan, PlanRequest, Step, plan};

#[derive(Debug, clap::Args)]
pub struct Args {
    /// A compound of the mixture and its amount (`2.5mmol`, `0.30g`, `150mg`); repeat for
    /// each. Two values, or one quoted value with a space between them.
    #[arg(long, num_args = 1..=2, value_names = ["SMILES", "AMOUNT"], required = true, action = clap::ArgAction::Append)]
    pub solute: Vec<String>,
    /// Volume of the organic layer holding the mixture (`50mL`).
    #[arg(long, value_name = "VOLUME")]
    pub organic: String,
    /// Organic solvent (`ethyl acetate`, `ether`, `mtbe`, `dcm`, `chloroform`, `toluene`,
    /// `hexane`, `heptane`, `2-methf`, `1-butanol`).
    #[arg(long, value_name = "NAME")]
    pub solvent: String,
    /// Each aqueous portion (`25mL`); default half the organic volume.
    #[arg(long, value_name = "VOLUME")]
    pub water: Option<String>,
    /// The compound you want (one of the --solute SMILES).
    #[arg(long, value_name = "SMILES")]
    pub keep: Option<String>,
    /// Temperature in °C, 0-60 (default 25).
    #[arg(long, value_name = "C", default_value = "25")]
    pub temp: String,
    /// Ideal solution: activity coefficients 1 (default: Davies equation).
    #[arg(long)]
    pub ideal: bool,
    /// Ignore stored measured values (pKa and logP) and use the estimates.
    #[arg(long)]
    pub estimate_only: bool,
    /// Also write a printable report (one self-contained HTML file, A4) to FILE.
    #[arg(long, value_name = "FILE")]
    pub html: Option<std::path::PathBuf>,
}

/// Turns the flags into a request.
pub fn request(args: &Args) -> Result<PlanRequest> {
    let temperature = units::parse_temperature(&args.temp)?;
    let activity = if args.ideal {
        Activity::Ideal
    } else {
        Activity::Davies
    };
    let conditions = Conditions::new(temperature)?.with_activity(activity);
    let mut solutes = Vec::new();
    for (smiles, amount) in solute_pairs(&args.solute)? {
        solutes.push(SoluteInput {
            smiles,
            amount: units::parse_amount(&amount)?,
            pka_override: None,
        });
    }
    crate::partition::solvents::find(&args.solvent)?;
    Ok(PlanRequest {
        solutes,
        solvent: args.solvent.clone(),
        organic_l: units::parse_volume(&args.organic)?.litres,
        water_l: match &args.water {
            Some(w) => Some(units::parse_volume(w)?.litres),
            None => None,
        },
        keep: args.keep.clone(),
        conditions,
    })
}

fn measure(step: &Step) -> String {
    report::dose_measure(
        step.stock_volume_ml,
        step.reagent_mass_g,
        &step.stock,
        &step.reagent,
    )
    .unwrap_or_default()
}

/// The plan as a chemist follows it at the bench.
pub fn table(p: &Plan) -> String {
    let mut out = format!(
        "Mixture in {} {} ({} layer); each aqueous portion {} of water plus the reagent.\n",
        fmt_volume(p.organic_volume_ml / 1e3),
        p.solvent,
        p.organic_layer,
        fmt_volume(p.water_per_portion_ml / 1e3)
    );
    let header = [
        "step",
        "pH",
        "each portion",
        "portions",
        "portion pH",
        "moves to water",
    ]
    .iter()
    .map(|s| s.to_string())
    .collect();
    let rows = p
        .steps
        .iter()
        .map(|s| {
            vec![
                s.step.to_string(),
                fmt_ph(s.ph),
                format!(
                    "{} water + {} ({})",
                    fmt_volume(s.water_ml / 1e3),
                    measure(s),
                    fmt_moles(s.reagent_mol)
                ),
                s.portions.to_string(),
                s.portion_ph
                    .iter()
                    .map(|x| fmt_ph(*x))
                    .collect::<Vec<_>>()
                    .join(", "),
                s.moves.join(", "),
            ]
        })
        .collect();
    out += &report::grid(header, rows);
    for s in &p.steps {
        let why: Vec<String> = s
            .why
            .iter()
            .map(|r| {
                format!(
                    "{} {:.1} % ionized, logD {}, {:.1} % to water",
                    r.smiles,
                    100.0 * r.ionized,
                    r.log_d.map_or("none".into(), |d| format!("{d:.1}")),
                    100.0 * r.to_water
                )
            })
            .collect();
        out += &format!(
            "Why pH {} (step {}): {}.\n",
            fmt_ph(s.ph),
            s.step,
            why.join("; ")
        );
    }
    let header = ["fraction", "holds", "purity (mass)", "recovery"]
        .iter()
        .map(|s| s.to_string())
        .collect();
    let rows = p
        .fractions
        .iter()
        .map(|f| {
            vec![
                f.layer.clone(),
                f.smiles.join(", "),
                format!("{:.1} %", 100.0 * f.purity),
                format!("{:.1} %", 100.0 * f.recovery),
            ]
        })
        .collect();
    out += &report::grid(header, rows);
    for r in &p.recoveries {
        let amount =
            report::dose_measure(r.stock_volume_ml, r.reagent_mass_g, &r.stock, &r.reagent)
                .unwrap_or_else(|| r.reagent.clone());
        out += &format!(
            "Recover {} from {}: {} ({}); {}; {} % extracted, {} % of the start overall.\n",
            r.smiles.join(", "),
            r.fraction,
            amount,
            fmt_moles(r.reagent_mol),
            r.note,
            sig(100.0 * r.extracted, 3),
            sig(100.0 * r.overall, 3)
        );
    }
    for n in &p.notes {
        out += &format!("Note: {n}\n");
    }
    out += "Cautions:\n";
    for c in &p.cautions {
        out += &format!("  - {c}\n");
    }
    out
}

pub fn run(args: &Args, cli: &Cli) -> Result<String> {
    let request = request(args)?;
    let store = open_store(&cli.db)?;
    let handbook = Handbook::from_store(&store, args.estimate_only)?;
    let catalogue = store.reagents()?;
    let result = plan(&request, &handbook, &catalogue)?;
    super::html::plan(args, &request, &handbook, &result)?;
    match cli.format {
        Format::Table => Ok(table(&result)),
        Format::Csv => report::csv(
            &result
                .fractions
                .iter()
                .map(|f| CsvRow {
                    layer: f.layer.clone(),
                    smiles: f.smiles.join(" "),
                    purity: f.purity,
                    recovery: f.recovery,
                })
                .collect::<Vec<_>>(),
        ),
        Format::Json | Format::Jsonl => report::json(&result),
    }
}

/// One CSV row per fraction.
#[derive(serde::Serialize)]
struct CsvRow {
    layer: String,
    smiles: String,
    purity: f64,
    recovery: f64,
}
