//! `phdose curve`: fraction ionized (or mean charge) and logD of each compound against pH, as
//! a table on standard output and, with `--svg`, as a figure.

use std::path::PathBuf;

use serde::Serialize;

use super::{Cli, Format, open_store};
use crate::acidity::interplay::SiteConstant;
use crate::acidity::{Handbook, Profile};
use crate::error::{Error, ParseError, Result};
use crate::partition::measured::{OctanolLogP, octanol_log_p};
use crate::report::ionization::{self, Compound, Contrast, Options, Point};
use crate::report::{self, sig};
use crate::units;

#[derive(Debug, clap::Args)]
pub struct Args {
    /// Structures as SMILES; each gets its own curve.
    #[arg(required = true)]
    pub smiles: Vec<String>,
    /// Write the figure to this SVG file.
    #[arg(long, value_name = "FILE")]
    pub svg: Option<PathBuf>,
    /// pH values to mark with a vertical line, separated by commas (`7.4` or `2,8.5`).
    #[arg(long, value_name = "PH[,PH...]", allow_hyphen_values = true)]
    pub mark: Option<String>,
    /// Lowest pH shown (default 0).
    #[arg(
        long,
        value_name = "PH",
        default_value = "0",
        allow_hyphen_values = true
    )]
    pub from: String,
    /// Highest pH shown (default 14).
    #[arg(
        long,
        value_name = "PH",
        default_value = "14",
        allow_hyphen_values = true
    )]
    pub to: String,
    /// pH step of the printed table (default 1).
    #[arg(long, value_name = "PH", default_value = "1")]
    pub step: String,
    /// Mean charge per molecule instead of fraction ionized (figure and table).
    #[arg(long)]
    pub charge: bool,
    /// Use the group estimates only, ignoring stored measured values.
    #[arg(long)]
    pub estimate_only: bool,
}

/// One compound with its curve on the table grid (JSON).
#[derive(Debug, Serialize)]
pub struct CurveOut {
    pub smiles: String,
    /// Per site: `atom`, `kind`, `pka_micro`, `pka_in_molecule` (as `phdose pka` gives them).
    pub sites: Vec<SiteConstant>,
    pub macro_pka: Vec<f64>,
    pub logp: Option<f64>,
    /// Where `logp` comes from: `measured: <handbook>` or the estimate's method.
    pub logp_source: Option<String>,
    pub points: Vec<Point>,
}

/// The widest-gap window, naming the compounds by their SMILES (JSON).
#[derive(Debug, Serialize)]
pub struct GapOut {
    pub first: String,
    pub second: String,
    pub ph: f64,
    pub difference: f64,
    pub ph_low: f64,
    pub ph_high: f64,
}

/// The whole JSON document.
#[derive(Debug, Serialize)]
pub struct CurveReport {
    pub compounds: Vec<CurveOut>,
    pub widest_gap: Option<GapOut>,
    pub svg: Option<String>,
}

/// A CSV row: one compound at one pH.
#[derive(Debug, Serialize)]
struct CsvRow<'a> {
    smiles: &'a str,
    ph: f64,
    fraction_ionized: f64,
    fraction_neutral: f64,
    mean_charge: f64,
    logd: Option<f64>,
}

/// One pH value from a flag.
fn one_ph(text: &str, flag: &str) -> Result<f64> {
    match units::parse_ph_list(text)?.as_slice() {
        [ph] => Ok(*ph),
        _ => Err(Error::Input(format!("{flag} takes one pH, not '{text}'"))),
    }
}

/// Reads the range, step and marks, rejecting an empty range or a mark outside it.
fn options(args: &Args) -> Result<(Options, f64)> {
    let from = one_ph(&args.from, "--from")?;
    let to = one_ph(&args.to, "--to")?;
    if from >= to {
        return Err(Error::Input(format!(
            "--from {from} must be below --to {to}"
        )));
    }
    let step: f64 = args
        .step
        .trim()
        .parse()
        .map_err(|_| ParseError::new("pH step", &args.step, 0, "expected a positive number"))?;
    if !(step.is_finite() && step > 0.0 && (to - from) / step <= 10_000.0) {
        return Err(Error::Input(format!(
            "--step must be positive and give at most 10000 rows, not {}",
            args.step
        )));
    }
    let marks = match &args.mark {
        Some(text) => units::parse_ph_list(text)?,
        None => vec![],
    };
    if let Some(m) = marks.iter().find(|m| **m < from || **m > to) {
        return Err(Error::Input(format!(
            "--mark {m} lies outside the pH range {from}..{to}"
        )));
    }
    let o = Options {
        from,
        to,
        charge: args.charge,
        marks,
        // `curve` has no --temp: the pKa values are the 25 °C ones.
        temperature_c: 25.0,
    };
    Ok((o, step))
}

/// Octanol/water logP of the neutral parent (a stored handbook value unless
/// `--estimate-only`, else the Wildman–Crippen estimate); `None` for a mixture of several
/// parents, whose logD as one curve would mean nothing.
pub(crate) fn logp_of(profile: &Profile, estimate_only: bool) -> Result<Option<OctanolLogP>> {
    match profile.compound.parents.as_slice() {
        [parent] => Ok(Some(octanol_log_p(
            &profile.compound.neutral,
            &parent.atoms,
            estimate_only,
        )?)),
        _ => Ok(None),
    }
}

/// The table grid: `from`, `from + step`, ... up to `to` (included when it falls on a step).
fn grid(o: &Options, step: f64) -> Vec<f64> {
    let n = ((o.to - o.from) / step + 1e-9).floor() as usize;
    (0..=n).map(|i| o.from + step * i as f64).collect()
}

pub fn run(args: &Args, cli: &Cli) -> Result<String> {
    let (o, step) = options(args)?;
    let handbook = Handbook::from_store(&open_store(&cli.db)?, args.estimate_only)?;
    let mut compounds = Vec::with_capacity(args.smiles.len());
    for smiles in &args.smiles {
        let profile = Profile::new(smiles, &handbook)?;
        let logp = logp_of(&profile, args.estimate_only)?;
        let mut compound = Compound::new(&profile, logp.as_ref().map(|l| l.log_p));
        compound.logp_source = logp.map(|l| l.source);
        compounds.push(compound);
    }
    let svg_path = match &args.svg {
        Some(path) => {
            let chart = ionization::chart(&compounds, &o);
            let text = format!(
                "<?xml version=\"1.0\" encoding=\"UTF-8\"?>\n{}",
                chart.to_svg()
            );
            std::fs::write(path, text)
                .map_err(|e| Error::Input(format!("cannot write {}: {e}", path.display())))?;
            Some(path.display().to_string())
        }
        None => None,
    };
    let phs = grid(&o, step);
    let gap = ionization::widest_gap(&compounds, o.from, o.to);
    match cli.format {
        Format::Table => Ok(table(&compounds, &phs, gap, &o, svg_path.as_deref())),
        Format::Csv => report::csv(&csv_rows(&compounds, &phs)),
        Format::Json => report::json(&document(&compounds, &phs, gap, svg_path)),
        Format::Jsonl => report::jsonl(&document(&compounds, &phs, gap, svg_path).compounds),
    }
}

fn document(
    compounds: &[Compound],
    phs: &[f64],
    gap: Option<Contrast>,
    svg: Option<String>,
) -> CurveReport {
    CurveReport {
        compounds: compounds
            .iter()
            .map(|c| CurveOut {
                smiles: c.smiles.clone(),
                sites: c.constants.clone(),
                macro_pka: c.macro_pka.clone(),
                logp: c.logp,
                logp_source: c.logp_source.clone(),
                points: phs.iter().map(|&ph| c.at(ph)).collect(),
            })
            .collect(),
        widest_gap: gap.map(|g| GapOut {
            first: compounds[g.first].smiles.clone(),
            second: compounds[g.second].smiles.clone(),
            ph: g.ph,
            difference: g.difference,
            ph_low: g.ph_low,
            ph_high: g.ph_high,
        }),
        svg,
    }
}

fn csv_rows<'a>(compounds: &'a [Compound], phs: &[f64]) -> Vec<CsvRow<'a>> {
    let mut rows = Vec::new();
    for c in compounds {
        for &ph in phs {
            let p = c.at(ph);
            rows.push(CsvRow {
                smiles: &c.smiles,
                ph,
                fraction_ionized: p.fraction_ionized,
                fraction_neutral: p.fraction_neutral,
                mean_charge: p.mean_charge,
                logd: p.logd,
            });
        }
    }
    rows
}

/// A wide table: one row per pH, per compound a column of fraction ionized (or mean charge)
/// and, when its logP is known, one of logD.
fn table(
    compounds: &[Compound],
    phs: &[f64],
    gap: Option<Contrast>,
    o: &Options,
    svg: Option<&str>,
) -> String {
    let mut header = vec!["pH".to_string()];
    for c in compounds {
        let label = ionization::short_label(&c.smiles);
        let what = if o.charge { "mean charge" } else { "ionized" };
        header.push(format!("{label}\n{what}"));
        if c.logp.is_some() {
            header.push(format!("{label}\nlogD"));
        }
    }
    let rows = phs
        .iter()
        .map(|&ph| {
            let mut row = vec![units::fmt_ph(ph)];
            for c in compounds {
                let p = c.at(ph);
                row.push(if o.charge {
                    ionization::signed(p.mean_charge, 3)
                } else {
                    format!("{:.3}", p.fraction_ionized)
                });
                if c.logp.is_some() {
                    // No neutral form (a permanent charge): no logD at any pH.
                    row.push(p.logd.map_or("-".into(), |d| format!("{d:.2}")));
                }
            }
            row
        })
        .collect();
    let mut out = report::grid(header, rows);
    if let Some(g) = gap {
        out += &format!(
            "Widest gap in fraction ionized: {} vs {}, {} at pH {} (window pH {}-{}).\n",
            compounds[g.first].smiles,
            compounds[g.second].smiles,
            sig(g.difference, 3),
            units::fmt_ph(g.ph),
            units::fmt_ph(g.ph_low),
            units::fmt_ph(g.ph_high)
        );
    }
    if compounds.iter().any(|c| c.logp.is_none()) {
        out += "logD needs a logP; none is known for the compounds without a logD column.\n";
    }
    if let Some(path) = svg {
        out += &format!("SVG written to {path}\n");
    }
    out
}
