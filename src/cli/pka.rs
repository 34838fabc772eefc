//! `phdose pka`: the ionizable sites of each structure with pKa, range and source.

use serde::Serialize;
use tabled::Tabled;

use super::batch::{self, Entry};
use super::{Cli, Format, open_store};
use crate::acidity::interplay::SiteConstant;
use crate::acidity::measured::Origin;
use crate::acidity::{Handbook, Kind, Profile, Site};
use crate::error::Result;
use crate::report;

#[derive(Debug, clap::Args)]
pub struct Args {
    #[command(flatten)]
    pub structures: batch::Structures,
    /// Use the group estimates only, ignoring stored measured values.
    #[arg(long)]
    pub estimate_only: bool,
}

/// The JSON object for one input structure (design §5).
#[derive(Debug, Serialize)]
pub struct PkaResult {
    pub smiles: String,
    pub sites: Vec<Site>,
    /// Recognized groups whose constant lies beyond water's range (ketone O, alcohol O-H...):
    /// they stay neutral at every workup pH and are never sites; listed with that constant.
    pub neutral_groups: Vec<Site>,
    /// `user`, `measured` (built-in handbook row) or `estimate`; `mixed` when the parents of
    /// one input differ. Each site's `source` names the value it carries.
    pub origin: Origin,
    /// How stored values were matched to sites, and when sites had to be treated as
    /// independent (too many for microstates), when that needed saying.
    pub notes: Vec<String>,
    pub error: Option<String>,
    /// Macroscopic pKa values (what a titration sees), ascending; sites interact.
    pub macro_pka: Vec<f64>,
    /// Per site: microscopic pKa and the pH of half ionization in the molecule.
    pub site_constants: Vec<SiteConstant>,
}

#[derive(Tabled, Serialize)]
struct Row {
    smiles: String,
    atom: String,
    group: String,
    kind: String,
    pka: String,
    pka_low: String,
    pka_high: String,
    /// pH at which the site is half ionized in the molecule (other sites titrating too).
    in_molecule: String,
    /// Macroscopic constants of the compound, on its first row.
    macro_pka: String,
    source: String,
}

/// Sites of one SMILES, or the error that stopped reading it.
pub fn annotate(smiles: &str, handbook: &Handbook) -> Result<PkaResult> {
    let profile = Profile::new(smiles, handbook)?;
    let constants = profile.constants();
    let mut notes = profile.notes;
    notes.extend(constants.note);
    Ok(PkaResult {
        smiles: smiles.to_string(),
        sites: profile.sites,
        neutral_groups: profile.neutral_groups,
        origin: profile.origin,
        notes,
        error: None,
        macro_pka: constants.macro_pka,
        site_constants: constants.sites,
    })
}

fn rows(results: &[PkaResult]) -> Vec<Row> {
    let mut rows = Vec::new();
    for r in results {
        let blank = |text: &str| Row {
            smiles: r.smiles.clone(),
            atom: String::new(),
            group: text.to_string(),
            kind: String::new(),
            pka: String::new(),
            pka_low: String::new(),
            pka_high: String::new(),
            in_molecule: String::new(),
            macro_pka: String::new(),
            source: String::new(),
        };
        if let Some(e) = &r.error {
            rows.push(blank(&format!("error: {}", e.lines().next().unwrap_or(""))));
        } else if r.sites.is_empty() {
            rows.push(blank("no ionizable site in water"));
        }
        let macro_pka: Vec<String> = r.macro_pka.iter().map(|p| format!("{p:.2}")).collect();
        for (k, s) in r.sites.iter().enumerate() {
            let in_molecule = r
                .site_constants
                .iter()
                .find(|c| c.atom == s.atom)
                .and_then(|c| c.pka_in_molecule)
                .map(|p| format!("{p:.2}"))
                .unwrap_or_default();
            rows.push(Row {
                smiles: r.smiles.clone(),
                atom: s.atom.to_string(),
                group: s.group.clone(),
                kind: s.kind.as_str().into(),
                pka: format!("{:.2}", s.pka),
                pka_low: format!("{:.2}", s.pka_low),
                pka_high: format!("{:.2}", s.pka_high),
                in_molecule,
                macro_pka: if k == 0 {
                    macro_pka.join(", ")
                } else {
                    String::new()
                },
                source: s.source.clone(),
            });
        }
    }
    rows
}

/// Notes printed under the table, one line each, naming the structure.
fn notes(results: &[PkaResult]) -> String {
    results
        .iter()
        .flat_map(|r| {
            let neutral = r.neutral_groups.iter().map(|s| {
                let (verb, strong) = match s.kind {
                    Kind::Acid => ("loses a proton", "base"),
                    Kind::Base => ("takes a proton", "acid"),
                };
                format!(
                    "stays neutral in water: {} (atom {}) {verb} only in strong {strong}, \
                     pKa {:.1} ({:.1} to {:.1})",
                    s.group, s.atom, s.pka, s.pka_low, s.pka_high
                )
            });
            r.notes
                .iter()
                .cloned()
                .chain(neutral)
                .map(move |n| format!("note: {}: {n}\n", r.smiles))
        })
        .collect()
}

/// The result row of a structure that could not be read.
fn failed(smiles: &str, error: String) -> PkaResult {
    PkaResult {
        smiles: smiles.to_string(),
        sites: vec![],
        neutral_groups: vec![],
        origin: Origin::Estimate,
        notes: vec![],
        error: Some(error),
        macro_pka: vec![],
        site_constants: vec![],
    }
}

/// One batch row: its sites, or its error in the row.
pub fn annotate_entry(entry: &Entry, handbook: &Handbook) -> PkaResult {
    match &entry.error {
        Some(e) => failed(&entry.smiles, e.clone()),
        None => annotate(&entry.smiles, handbook)
            .unwrap_or_else(|e| failed(&entry.smiles, e.to_string())),
    }
}

pub fn run(args: &Args, cli: &Cli) -> Result<String> {
    let structures = &args.structures;
    structures.require_some()?;
    let handbook = Handbook::from_store(&open_store(&cli.db)?, args.estimate_only)?;
    let streamed = structures.stream(
        cli.format,
        |entry| annotate_entry(entry, &handbook),
        |results: &[PkaResult]| rows(results),
        notes,
    )?;
    if streamed {
        return Ok(String::new());
    }
    // Typed on the command line: stop at the first bad structure and point at it.
    let results = structures
        .smiles
        .iter()
        .map(|smiles| annotate(smiles, &handbook))
        .collect::<Result<Vec<_>>>()?;
    match cli.format {
        Format::Table => Ok(report::table(&rows(&results)) + &notes(&results)),
        Format::Csv => report::csv(&rows(&results)),
        Format::Json => report::json(&results),
        Format::Jsonl => report::jsonl(&results),
    }
}
