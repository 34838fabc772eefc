//! `phdose check FILE.toml`: simulates a written workup step by step and reports the pH, where
//! each compound goes, and the problems found (exit 4 when there are any).

use std::path::PathBuf;

use serde::Serialize;

use super::{Cli, Format, open_store};
use crate::acidity::Handbook;
use crate::error::{Error, Result};
use crate::report;
use crate::units::{fmt_ph, fmt_volume};
use crate::workup::procedure::{self, Report};

#[derive(Debug, clap::Args)]
pub struct Args {
    /// The procedure file (TOML; the format is described in the README under `phdose check`).
    #[arg(value_name = "FILE")]
    pub file: PathBuf,
    /// Ignore stored measured values and use the group estimates.
    #[arg(long)]
    pub estimate_only: bool,
    /// Also write a printable report (one self-contained HTML file, A4) to FILE; written when
    /// problems are found as well.
    #[arg(long, value_name = "FILE")]
    pub html: Option<PathBuf>,
}

/// Reads the file and builds the report data (also what an HTML report starts from).
pub fn report_for(args: &Args, cli: &Cli) -> Result<Report> {
    let text = std::fs::read_to_string(&args.file)
        .map_err(|e| Error::Input(format!("cannot read {}: {e}", args.file.display())))?;
    let store = open_store(&cli.db)?;
    let handbook = Handbook::from_store(&store, args.estimate_only)?;
    let catalogue = store.reagents()?;
    procedure::check(&text, &handbook, &catalogue)
}

pub fn run(args: &Args, cli: &Cli) -> Result<String> {
    let r = report_for(args, cli)?;
    super::html::check(args, cli, &r)?;
    let text = match cli.format {
        Format::Table => table(&r),
        Format::Csv => report::csv(&csv_rows(&r))?,
        Format::Json | Format::Jsonl => {
            let mut t = report::json(&r)?;
            if cli.format == Format::Jsonl {
                t = serde_json::to_string(&r).map_err(|e| Error::Internal(e.to_string()))? + "\n";
            }
            t
        }
    };
    if r.problems.is_empty() {
        Ok(text)
    } else {
        Err(Error::Problems {
            count: r.problems.len(),
            report: text,
        })
    }
}

/// One CSV row per step.
#[derive(Serialize)]
struct CsvRow {
    step: usize,
    line: usize,
    action: &'static str,
    did: String,
    ph: Option<f64>,
    reagent_mmol: Option<f64>,
    co2_released_ml: f64,
    problems: String,
}

fn csv_rows(r: &Report) -> Vec<CsvRow> {
    r.steps
        .iter()
        .map(|s| CsvRow {
            step: s.step,
            line: s.line,
            action: s.action,
            did: s.did.clone(),
            ph: s.ph,
            reagent_mmol: s.reagent_mol.map(|m| m * 1e3),
            co2_released_ml: s.co2_released_ml,
            problems: s
                .problems
                .iter()
                .map(|p| p.message.clone())
                .collect::<Vec<_>>()
                .join(" | "),
        })
        .collect()
}

fn where_text(s: &procedure::report::LayerReport, name: &str) -> Option<String> {
    let h = s.compounds.iter().find(|h| h.name == name)?;
    (h.percent >= 0.05).then(|| {
        let label = if s.layer == "funnel" {
            format!("{} (funnel)", s.phase)
        } else {
            format!("`{}`", s.layer)
        };
        format!("{label} {:.1}%", h.percent)
    })
}

fn table(r: &Report) -> String {
    let mut out = String::new();
    if let Some(t) = &r.title {
        out += &format!("{t}\n");
    }
    out += &format!(
        "Solvent {}, {} °C, CO2 {}; product: {}\n",
        r.solvent,
        r.temperature_c,
        r.co2_mode,
        r.product.as_deref().unwrap_or("not named")
    );
    let names: Vec<String> = r.start.layers.first().map_or(Vec::new(), |l| {
        l.compounds.iter().map(|h| h.name.clone()).collect()
    });
    let mut rows = Vec::new();
    for s in &r.steps {
        let places: Vec<String> = names
            .iter()
            .map(|n| {
                let here: Vec<String> = s.layers.iter().filter_map(|l| where_text(l, n)).collect();
                format!("{n}: {}", here.join(", "))
            })
            .collect();
        let mut did = s.did.clone();
        if s.co2_released_ml > 0.5 {
            did += &format!(" (CO2 {})", fmt_volume(s.co2_released_ml / 1e3));
        }
        rows.push(vec![
            s.step.to_string(),
            did,
            s.ph.map(fmt_ph).unwrap_or_else(|| "-".into()),
            places.join("\n"),
            s.problems.len().to_string(),
        ]);
    }
    out += &report::grid(
        ["step", "does", "pH", "where each compound is", "problems"]
            .map(String::from)
            .to_vec(),
        rows,
    );
    if let Some(end) = &r.end {
        out += &format!(
            "In hand at the end ({} layer, {}):",
            end.layer.phase,
            fmt_volume(end.layer.volume_ml / 1e3)
        );
        for h in &end.layer.compounds {
            out += &format!(" {} {:.1}%;", h.name, h.percent);
        }
        if let Some(p) = end.product_purity_pct {
            out += &format!(" product purity {p:.1} mol%");
        }
        out += "\n";
    }
    if r.problems.is_empty() {
        out += "No problems found.\n";
    } else {
        out += &format!("Problems ({}):\n", r.problems.len());
        for p in &r.problems {
            out += &format!(
                "  step {} (line {}): {}\n    fix: {}\n",
                p.step, p.line, p.message, p.fix
            );
        }
    }
    let mut cautions: Vec<&String> = r.steps.iter().flat_map(|s| s.cautions.iter()).collect();
    cautions.extend(r.cautions.iter());
    let mut seen = std::collections::HashSet::new();
    cautions.retain(|c| seen.insert(c.as_str()));
    if !cautions.is_empty() {
        out += "Cautions:\n";
        for c in cautions {
            out += &format!("  - {c}\n");
        }
    }
    for n in &r.notes {
        out += &format!("Note: {n}\n");
    }
    out
}
