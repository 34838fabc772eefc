//! `phdose info`: formula in Hill order, molar mass, net charge, components and the octanol/water
//! logP of the neutral parent (handbook value or Wildman–Crippen estimate, said in `logp_source`).

use serde::Serialize;
use tabled::Tabled;

use super::batch::{self, Entry};
use super::{Cli, Format};
use crate::chem::components::split;
use crate::chem::formula::{formula, hill_formula_of, molar_mass};
use crate::chem::molecule::Molecule;
use crate::error::Result;
use crate::partition::measured::octanol_log_p;
use crate::report;

#[derive(Debug, clap::Args)]
pub struct Args {
    #[command(flatten)]
    pub structures: batch::Structures,
    /// Ignore handbook values (logP here) and use the estimates alone.
    #[arg(long)]
    pub estimate_only: bool,
}

/// One component of the input.
#[derive(Debug, Serialize)]
pub struct Component {
    pub formula: String,
    /// `parent` (titrates) or `counter-ion`.
    pub role: &'static str,
}

/// What `info` reports for one structure.
#[derive(Debug, Serialize)]
pub struct Info {
    pub smiles: String,
    pub formula: Option<String>,
    pub molar_mass: Option<f64>,
    pub charge: Option<i32>,
    pub components: Vec<Component>,
    /// Octanol/water logP of the neutral parent; `None` unless there is exactly one parent.
    pub logp: Option<f64>,
    /// `measured: <handbook>` or `estimate: ...`.
    pub logp_source: Option<String>,
    pub error: Option<String>,
}

#[derive(Tabled, Serialize)]
struct Row {
    smiles: String,
    formula: String,
    #[tabled(rename = "molar mass (g/mol)")]
    #[serde(rename = "molar_mass")]
    molar_mass: String,
    charge: String,
    #[tabled(rename = "logP")]
    #[serde(rename = "logp")]
    logp: String,
    components: String,
}

/// Describes one SMILES.
pub fn describe(smiles: &str) -> Result<Info> {
    describe_with(smiles, false)
}

/// Describes one SMILES; `estimate_only` skips the handbook logP values.
pub fn describe_with(smiles: &str, estimate_only: bool) -> Result<Info> {
    let mol = Molecule::from_smiles(smiles)?;
    let compound = split(&mol)?;
    let components = mol
        .components()
        .into_iter()
        .map(|atoms| Component {
            role: if compound.parents.iter().any(|p| p.atoms == atoms) {
                "parent"
            } else {
                "counter-ion"
            },
            // A parent is named by its neutral form (acetate -> acetic acid, C2H4O2).
            formula: hill_formula_of(&compound.neutral, &atoms),
        })
        .collect();
    let logp = match compound.parents.as_slice() {
        [parent] => Some(octanol_log_p(
            &compound.neutral,
            &parent.atoms,
            estimate_only,
        )?),
        _ => None,
    };
    Ok(Info {
        smiles: smiles.to_string(),
        formula: Some(formula(&mol)),
        molar_mass: Some(molar_mass(&mol)),
        charge: Some(mol.charge()),
        components,
        logp: logp.as_ref().map(|l| l.log_p),
        logp_source: logp.map(|l| l.source),
        error: None,
    })
}

/// The result row of a structure that could not be read.
fn failed(smiles: &str, error: String) -> Info {
    Info {
        smiles: smiles.to_string(),
        formula: None,
        molar_mass: None,
        charge: None,
        components: vec![],
        logp: None,
        logp_source: None,
        error: Some(error),
    }
}

/// One batch row: its description, or its error in the row.
pub fn describe_entry(entry: &Entry, estimate_only: bool) -> Info {
    match &entry.error {
        Some(e) => failed(&entry.smiles, e.clone()),
        None => describe_with(&entry.smiles, estimate_only)
            .unwrap_or_else(|e| failed(&entry.smiles, e.to_string())),
    }
}

fn rows(infos: &[Info]) -> Vec<Row> {
    infos
        .iter()
        .map(|i| Row {
            smiles: i.smiles.clone(),
            formula: i.formula.clone().unwrap_or_default(),
            molar_mass: i.molar_mass.map(|m| format!("{m:.3}")).unwrap_or_default(),
            charge: i.charge.map(|c| c.to_string()).unwrap_or_default(),
            logp: match (i.logp, &i.logp_source) {
                (Some(v), Some(s)) if s.starts_with("measured") => format!("{v:.2} (measured)"),
                (Some(v), _) => format!("{v:.2} (estimate)"),
                _ => String::new(),
            },
            components: match &i.error {
                Some(e) => format!("error: {}", e.lines().next().unwrap_or("")),
                None => i
                    .components
                    .iter()
                    .map(|c| format!("{} ({})", c.formula, c.role))
                    .collect::<Vec<_>>()
                    .join(", "),
            },
        })
        .collect()
}

pub fn run(args: &Args, cli: &Cli) -> Result<String> {
    let structures = &args.structures;
    structures.require_some()?;
    let streamed = structures.stream(
        cli.format,
        |entry| describe_entry(entry, args.estimate_only),
        rows,
        |_: &[Info]| String::new(),
    )?;
    if streamed {
        return Ok(String::new());
    }
    // Typed on the command line: stop at the first bad structure and point at it.
    let infos = structures
        .smiles
        .iter()
        .map(|smiles| describe_with(smiles, args.estimate_only))
        .collect::<Result<Vec<_>>>()?;
    let rows = rows(&infos);
    match cli.format {
        Format::Table => Ok(report::table(&rows)),
        Format::Csv => report::csv(&rows),
        Format::Json if infos.len() == 1 => report::json(&infos[0]),
        Format::Json => report::json(&infos),
        Format::Jsonl => report::jsonl(&infos),
    }
}
