//! `phdose adjust`: how much reagent brings an aqueous layer to a target pH.

use serde::Serialize;
use tabled::Tabled;

use super::{Cli, Format, open_store};
use crate::acidity::Handbook;
use crate::equilibrium::{Activity, Co2Mode, Conditions};
use crate::error::{Error, ParseError, Result};
use crate::report::{self, sig};
use crate::units::{self, fmt_moles, fmt_ph, fmt_volume};
use crate::workup::adjust::{Adjustment, Request, SoluteInput, adjust};
use crate::workup::adjust_layers::{OrganicRequest, adjust_with_organic};

#[derive(Debug, clap::Args)]
pub struct Args {
    /// A dissolved compound and its amount (`2.5mmol`, `0.30g`, `150mg`, `0.1M`); repeat for
    /// each. Two values, or one quoted value with a space between them.
    #[arg(long, num_args = 1..=2, value_names = ["SMILES", "AMOUNT"], required = true, action = clap::ArgAction::Append)]
    pub solute: Vec<String>,
    /// Volume of the aqueous layer before any reagent (`50mL`).
    #[arg(long, value_name = "VOLUME")]
    pub water: String,
    /// Target pH, or several separated by commas (`2,8,12`).
    #[arg(long = "to-ph", value_name = "PH", allow_hyphen_values = true)]
    pub to_ph: String,
    /// Reagent name from the table (`hcl`, `h2so4`, `khso4`, `citric_acid`, `acetic_acid`,
    /// `nh4cl`, `nah2po4`, `na2hpo4`, `nahco3`, `na2co3`, `k2co3`, `naoh`, `koh`), or `auto`
    /// for the mildest one that reaches the target.
    #[arg(long, value_name = "NAME")]
    pub reagent: String,
    /// Stock form (`solid`, `1M`, `37%`, `sat`); default 1M, else saturated, else solid.
    #[arg(long, value_name = "FORM")]
    pub stock: Option<String>,
    /// Temperature in °C, 0-60 (default 25).
    #[arg(long, value_name = "C", default_value = "25")]
    pub temp: String,
    /// Ideal solution: activity coefficients 1 (default: Davies equation).
    #[arg(long)]
    pub ideal: bool,
    /// CO2 handling: closed (all carbon stays), vented (dissolved CO2 capped at saturation
    /// under 1 atm CO2, the rest leaves as gas), air (equilibrium with the CO2 of air).
    #[arg(long, value_name = "MODE", default_value = "vented")]
    pub co2: String,
    /// Volume of an organic layer in contact (`50mL`); needs --solvent.
    #[arg(long, value_name = "VOLUME")]
    pub organic: Option<String>,
    /// Organic solvent (`ethyl acetate`, `ether`, `mtbe`, `dcm`, `chloroform`, `toluene`,
    /// `hexane`, `heptane`, `2-methf`, `1-butanol`, `octanol`); needs --organic.
    #[arg(long, value_name = "NAME")]
    pub solvent: Option<String>,
    /// Number of aqueous portions the organic layer meets, each the same water volume with
    /// the same reagent amount (needs --organic; default 1).
    #[arg(long, value_name = "N")]
    pub washes: Option<u32>,
    /// Replace a compound's pKa values (its sites in atom order): `--pka SMILES 4.2,9.8`.
    #[arg(long, num_args = 2, value_names = ["SMILES", "VALUES"], action = clap::ArgAction::Append)]
    pub pka: Vec<String>,
    /// Ignore stored measured values and use the group estimates.
    #[arg(long)]
    pub estimate_only: bool,
    /// Also write a printable report (one self-contained HTML file, A4) to FILE.
    #[arg(long, value_name = "FILE")]
    pub html: Option<std::path::PathBuf>,
}

/// Regroups the `--solute` values into (SMILES, amount) pairs. clap hands them over flat; a
/// value with a space is a whole pair, otherwise a SMILES is followed by its amount.
pub(crate) fn solute_pairs(values: &[String]) -> Result<Vec<(String, String)>> {
    let mut pairs = Vec::new();
    let mut rest = values.iter();
    while let Some(first) = rest.next() {
        let mut words = first.split_whitespace();
        match (words.next(), words.next(), words.next()) {
            (Some(s), Some(a), None) => pairs.push((s.to_string(), a.to_string())),
            (Some(s), None, None) => match rest.next() {
                Some(amount) => pairs.push((s.to_string(), amount.clone())),
                None => {
                    return Err(Error::Input(format!(
                        "--solute {s} needs an amount (`--solute '{s}' 2mmol`)"
                    )));
                }
            },
            _ => {
                return Err(Error::Input(format!(
                    "--solute needs a SMILES and an amount (`--solute 'CCO' 2mmol`), got '{first}'"
                )));
            }
        }
    }
    Ok(pairs)
}

fn parse_pka_values(text: &str) -> Result<Vec<f64>> {
    let mut out = Vec::new();
    let mut offset = 0;
    for part in text.split(',') {
        let value: f64 = part.trim().parse().map_err(|_| {
            ParseError::new(
                "pKa list",
                text,
                offset,
                format!("'{}' is not a number", part.trim()),
            )
        })?;
        if !(-5.0..=20.0).contains(&value) {
            return Err(ParseError::new(
                "pKa list",
                text,
                offset,
                "a pKa must lie between -5 and 20",
            )
            .into());
        }
        out.push(value);
        offset += part.len() + 1;
    }
    Ok(out)
}

/// The organic layer of `--organic VOLUME --solvent NAME [--washes N]`, if given.
pub fn organic_request(args: &Args) -> Result<Option<OrganicRequest>> {
    match (&args.organic, &args.solvent) {
        (None, None) => {
            if args.washes.is_some() {
                return Err(Error::Input(
                    "--washes needs an organic layer: --organic VOLUME --solvent NAME".into(),
                ));
            }
            Ok(None)
        }
        (Some(volume), Some(solvent)) => {
            let washes = args.washes.unwrap_or(1);
            if !(1..=20).contains(&washes) {
                return Err(Error::Input(format!(
                    "--washes must be 1 to 20, not {washes}"
                )));
            }
            // An unknown solvent is refused here, listing the known ones.
            crate::partition::solvents::find(solvent)?;
            Ok(Some(OrganicRequest {
                solvent: solvent.clone(),
                volume_l: units::parse_volume(volume)?.litres,
                washes,
            }))
        }
        (Some(_), None) => Err(Error::Input(
            "--organic needs --solvent NAME (which solvent is the organic layer?)".into(),
        )),
        (None, Some(_)) => Err(Error::Input(
            "--solvent needs --organic VOLUME (how much of it?)".into(),
        )),
    }
}

/// Turns the flags into a request.
pub fn request(args: &Args) -> Result<Request> {
    let co2 = Co2Mode::parse(&args.co2)?;
    let temperature = units::parse_temperature(&args.temp)?;
    let activity = if args.ideal {
        Activity::Ideal
    } else {
        Activity::Davies
    };
    let conditions = Conditions::new(temperature)?
        .with_activity(activity)
        .with_co2(co2);
    let water_l = units::parse_volume(&args.water)?.litres;
    let targets = units::parse_ph_list(&args.to_ph)?;
    let mut solutes = Vec::new();
    for (smiles, amount_text) in solute_pairs(&args.solute)? {
        let amount = units::parse_amount(&amount_text)?;
        solutes.push(SoluteInput {
            smiles,
            amount,
            pka_override: None,
        });
    }
    for pair in args.pka.chunks(2) {
        let [smiles, values] = pair else {
            return Err(Error::Input("--pka takes a SMILES and its values".into()));
        };
        let target = solutes
            .iter_mut()
            .find(|s| &s.smiles == smiles)
            .ok_or_else(|| {
                Error::Input(format!(
                    "--pka names {smiles}, which is not one of the --solute SMILES"
                ))
            })?;
        target.pka_override = Some(parse_pka_values(values)?);
    }
    Ok(Request {
        solutes,
        water_l,
        targets,
        reagent: args.reagent.clone(),
        stock: args.stock.clone(),
        conditions,
    })
}

#[derive(Tabled)]
struct DoseRow {
    #[tabled(rename = "target pH")]
    target_ph: String,
    reagent: String,
    amount: String,
    equiv: String,
    #[tabled(rename = "weigh / measure")]
    measure: String,
    #[tabled(rename = "conc. in layer")]
    conc: String,
    #[tabled(rename = "aqueous volume")]
    volume: String,
    #[tabled(rename = "pH reached")]
    ph: String,
}

/// One CSV row per target, in plain numbers for spreadsheets.
#[derive(Serialize)]
struct CsvRow {
    target_ph: f64,
    ph: f64,
    start_ph: f64,
    reagent: String,
    stock: String,
    reagent_mmol: f64,
    equivalents: Option<f64>,
    reagent_mass_g: Option<f64>,
    stock_volume_ml: Option<f64>,
    reagent_conc_mol_l: f64,
    aqueous_volume_ml: f64,
    ionic_strength: f64,
    co2_released_ml: f64,
}

impl From<&Adjustment> for CsvRow {
    fn from(a: &Adjustment) -> Self {
        CsvRow {
            target_ph: a.target_ph,
            ph: a.ph,
            start_ph: a.start_ph,
            reagent: a.reagent.clone(),
            stock: a.stock.clone(),
            reagent_mmol: a.reagent_mol * 1e3,
            equivalents: a.equivalents,
            reagent_mass_g: a.reagent_mass_g,
            stock_volume_ml: a.stock_volume_ml,
            reagent_conc_mol_l: a.reagent_conc_mol_l,
            aqueous_volume_ml: a.aqueous_volume_ml,
            ionic_strength: a.ionic_strength,
            co2_released_ml: a.co2_released_ml,
        }
    }
}

#[derive(Tabled)]
struct SoluteRow {
    #[tabled(rename = "pH")]
    ph: String,
    smiles: String,
    amount: String,
    sites: String,
    #[tabled(rename = "% neutral")]
    neutral: String,
    #[tabled(rename = "mean charge")]
    charge: String,
}

fn dose_row(a: &Adjustment) -> DoseRow {
    let measure = report::dose_measure(a.stock_volume_ml, a.reagent_mass_g, &a.stock, &a.reagent)
        .unwrap_or_default();
    DoseRow {
        target_ph: fmt_ph(a.target_ph),
        reagent: format!("{} ({})", a.reagent, a.stock),
        amount: fmt_moles(a.reagent_mol),
        equiv: a.equivalents.map(|e| sig(e, 3)).unwrap_or_default(),
        measure,
        conc: format!("{} M", sig(a.reagent_conc_mol_l, 3)),
        volume: fmt_volume(a.aqueous_volume_ml / 1e3),
        ph: fmt_ph(a.ph),
    }
}

fn table(results: &[Adjustment]) -> String {
    let mut out = report::table(&results.iter().map(dose_row).collect::<Vec<_>>());
    let mut rows = Vec::new();
    for a in results {
        for s in &a.solutes {
            let sites = s
                .sites
                .iter()
                .map(|x| format!("{} {} {:.1}", x.group, x.kind.as_str(), x.pka))
                .collect::<Vec<_>>()
                .join("; ");
            rows.push(SoluteRow {
                ph: fmt_ph(a.ph),
                smiles: s.smiles.clone(),
                amount: fmt_moles(s.amount_mol),
                sites: if sites.is_empty() {
                    "none".into()
                } else {
                    sites
                },
                neutral: format!("{:.1}", 100.0 * s.fraction_neutral),
                charge: format!("{:+.2}", s.mean_charge),
            });
        }
    }
    out += &report::table(&rows);
    out += &layer_tables(results);
    if let Some(first) = results.first() {
        out += &format!("Layer before reagent: pH {}\n", fmt_ph(first.start_ph));
        for a in results {
            out += &format!(
                "At pH {}: ionic strength {} M; CO2 ({}) released {} ({}); {} tends to pH {}\n",
                fmt_ph(a.ph),
                sig(a.ionic_strength, 3),
                a.co2_mode,
                fmt_moles(a.co2_released_mol),
                fmt_volume(a.co2_released_ml / 1e3),
                a.reagent,
                fmt_ph(a.reagent_limit_ph)
            );
        }
        for note in &first.notes {
            out += &format!("Note: {note}\n");
        }
        out += "Cautions:\n";
        for c in &first.cautions {
            out += &format!("  - {c}\n");
        }
    }
    out
}

/// Where each compound is with two layers, and the portions of `--washes N`.
fn layer_tables(results: &[Adjustment]) -> String {
    let mut out = String::new();
    for a in results {
        let (Some(layers), Some(portions)) = (&a.layers, &a.washes) else {
            continue;
        };
        let n = portions.len();
        let water = if n > 1 {
            format!("% in the {n} aqueous portions")
        } else {
            "% aqueous".to_string()
        };
        out += &format!(
            "{} {} is the {} layer, water the {} one.\n",
            fmt_volume(layers.organic_volume_ml / 1e3),
            layers.solvent,
            layers.organic,
            layers.aqueous
        );
        let rows = a
            .solutes
            .iter()
            .map(|s| {
                vec![
                    fmt_ph(a.ph),
                    s.smiles.clone(),
                    s.log_d.map_or("none".into(), |d| format!("{d:.2}")),
                    format!("{:.1}", 100.0 * s.fraction_aqueous),
                    format!("{:.1}", 100.0 * s.fraction_organic),
                ]
            })
            .collect();
        let header = ["pH", "smiles", "logD", water.as_str(), "% organic"]
            .iter()
            .map(|h| h.to_string())
            .collect();
        out += &report::grid(header, rows);
        if n > 1 {
            let mut header = vec!["portion".to_string(), "pH".to_string()];
            header.extend(
                a.solutes
                    .iter()
                    .map(|s| format!("% {} (total so far)", s.smiles)),
            );
            let rows = portions
                .iter()
                .map(|p| {
                    let mut row = vec![p.portion.to_string(), fmt_ph(p.ph)];
                    row.extend(p.solutes.iter().map(|x| {
                        format!(
                            "{:.1} ({:.1})",
                            100.0 * x.fraction_this_portion,
                            100.0 * x.fraction_aqueous_cumulative
                        )
                    }));
                    row
                })
                .collect();
            out += &report::grid(header, rows);
        }
    }
    out
}

pub fn run(args: &Args, cli: &Cli) -> Result<String> {
    let request = request(args)?;
    let organic = organic_request(args)?;
    let store = open_store(&cli.db)?;
    let handbook = Handbook::from_store(&store, args.estimate_only)?;
    let catalogue = store.reagents()?;
    let results = match &organic {
        Some(o) => adjust_with_organic(&request, o, &handbook, &catalogue)?,
        None => adjust(&request, &handbook, &catalogue)?,
    };
    super::html::adjust(args, &request, &handbook, &results)?;
    match cli.format {
        Format::Table => Ok(table(&results)),
        Format::Csv => report::csv(&results.iter().map(CsvRow::from).collect::<Vec<_>>()),
        Format::Json if results.len() == 1 => report::json(&results[0]),
        Format::Json => report::json(&results),
        Format::Jsonl => report::jsonl(&results),
    }
}
