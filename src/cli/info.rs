//! `phdose info`: formula in Hill order, molar mass, net charge and components.

use std::path::PathBuf;

use serde::Serialize;
use tabled::Tabled;

use super::{Cli, Format, input};
use crate::chem::components::split;
use crate::chem::formula::{formula, hill_formula_of, molar_mass};
use crate::chem::molecule::Molecule;
use crate::error::{Error, Result};
use crate::report;

#[derive(Debug, clap::Args)]
pub struct Args {
    /// Structures as SMILES.
    pub smiles: Vec<String>,
    /// Read structures from a file (CSV with a `smiles` column, or one per line; `-` = stdin).
    #[arg(long, value_name = "FILE")]
    pub input: Option<PathBuf>,
    /// Ignore stored measured values (accepted for symmetry with `pka`).
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
    components: String,
}

/// Describes one SMILES.
pub fn describe(smiles: &str) -> Result<Info> {
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
    Ok(Info {
        smiles: smiles.to_string(),
        formula: Some(formula(&mol)),
        molar_mass: Some(molar_mass(&mol)),
        charge: Some(mol.charge()),
        components,
        error: None,
    })
}

pub fn run(args: &Args, cli: &Cli) -> Result<String> {
    let batch = args.input.is_some();
    let mut list = args.smiles.clone();
    if let Some(path) = &args.input {
        list.extend(input::read_smiles_file(path)?);
    }
    if list.is_empty() {
        return Err(Error::Input(
            "give at least one SMILES, or --input FILE".into(),
        ));
    }
    let mut infos = Vec::with_capacity(list.len());
    for smiles in &list {
        match describe(smiles) {
            Ok(info) => infos.push(info),
            // Typed on the command line: stop and point at the problem. From a file: keep going.
            Err(e) if !batch => return Err(e),
            Err(e) => infos.push(Info {
                smiles: smiles.clone(),
                formula: None,
                molar_mass: None,
                charge: None,
                components: vec![],
                error: Some(e.to_string()),
            }),
        }
    }
    let rows: Vec<Row> = infos
        .iter()
        .map(|i| Row {
            smiles: i.smiles.clone(),
            formula: i.formula.clone().unwrap_or_default(),
            molar_mass: i.molar_mass.map(|m| format!("{m:.3}")).unwrap_or_default(),
            charge: i.charge.map(|c| c.to_string()).unwrap_or_default(),
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
        .collect();
    match cli.format {
        Format::Table => Ok(report::table(&rows)),
        Format::Csv => report::csv(&rows),
        Format::Json if infos.len() == 1 && !batch => report::json(&infos[0]),
        Format::Json => report::json(&infos),
        Format::Jsonl => report::jsonl(&infos),
    }
}
