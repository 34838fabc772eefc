//! `phdose buffer`: a buffer recipe for the prep room — what to weigh, titrate or pipette for a
//! target pH, total concentration, volume and temperature.

use serde::Serialize;
use tabled::Tabled;

use super::{Cli, Format, open_store};
use crate::acidity::Handbook;
use crate::buffer::{BufferSystem, Method, Recipe, Request, make, system_from_smiles};
use crate::equilibrium::{Activity, Conditions, StockForm};
use crate::error::{Error, Result};
use crate::report::{self, sig};
use crate::units::{self, Amount, fmt_mass, fmt_moles, fmt_ph, fmt_volume};

#[derive(Debug, clap::Args)]
pub struct Args {
    /// Buffer system: a name from the table (`phosphate`, `tris`, `hepes` ...; see --list) or
    /// a SMILES, whose constants then come from phdose's own pKa estimate.
    #[arg(long, value_name = "NAME|SMILES", required_unless_present = "list")]
    pub system: Option<String>,
    /// Target pH.
    #[arg(
        long,
        value_name = "PH",
        allow_hyphen_values = true,
        required_unless_present = "list"
    )]
    pub ph: Option<String>,
    /// Total concentration of the buffer system, all forms together (`0.1M`, `50mM`).
    #[arg(long, value_name = "AMOUNT", default_value = "0.1M")]
    pub conc: String,
    /// Final volume (`1L`, `500mL`).
    #[arg(long, value_name = "VOLUME", default_value = "1L")]
    pub volume: String,
    /// Temperature the buffer is used at, °C, 0-60 (default 25).
    #[arg(long, value_name = "C", default_value = "25")]
    pub temp: String,
    /// How to make it: pair (weigh acid and base form), titrate (weigh one form, titrate with
    /// a strong acid or base stock), stocks (mix two stock solutions).
    #[arg(long, value_name = "RECIPE", default_value = "pair")]
    pub recipe: String,
    /// Forms to use, by their short names (see --list): two for pair and stocks
    /// (`nah2po4.h2o,na2hpo4.7h2o`), one for titrate (`tris`).
    #[arg(long, value_name = "NAMES")]
    pub forms: Option<String>,
    /// Titrant for --recipe titrate: reagent and stock (`naoh:1M`, `hcl:0.1M`, `naoh`);
    /// default NaOH or HCl 1 M as the pH requires.
    #[arg(long, value_name = "NAME[:STOCK]")]
    pub titrant: Option<String>,
    /// Molarity of each stock solution for --recipe stocks (`0.2M`); default: the buffer's
    /// own concentration, so no water is added.
    #[arg(long, value_name = "AMOUNT")]
    pub stock_conc: Option<String>,
    /// Ideal solution: activity coefficients 1 (default: Davies equation).
    #[arg(long)]
    pub ideal: bool,
    /// For a SMILES system: ignore stored measured values and use the group estimate.
    #[arg(long)]
    pub estimate_only: bool,
    /// List the buffer systems and their forms, and exit.
    #[arg(long)]
    pub list: bool,
    /// Also write a printable report (one self-contained HTML file, A4) to FILE.
    #[arg(long, value_name = "FILE")]
    pub html: Option<std::path::PathBuf>,
}

fn molar(flag: &str, text: &str) -> Result<f64> {
    match units::parse_amount(text)? {
        Amount::Molar(c) => Ok(c),
        _ => Err(Error::Input(format!(
            "{flag} takes a concentration (`0.1M`, `50mM`), not '{text}'"
        ))),
    }
}

fn titrant(text: &str) -> Result<(String, StockForm)> {
    match text.split_once(':') {
        Some((name, stock)) => Ok((name.trim().to_lowercase(), StockForm::parse(stock)?)),
        None => Ok((text.trim().to_lowercase(), StockForm::Molar(1.0))),
    }
}

/// Turns the flags into a request.
pub fn request(args: &Args) -> Result<Request> {
    let ph_text = args.ph.as_deref().unwrap_or_default();
    let ph = match units::parse_ph_list(ph_text)?.as_slice() {
        [one] => *one,
        _ => return Err(Error::Input("--ph takes one value".into())),
    };
    let activity = if args.ideal {
        Activity::Ideal
    } else {
        Activity::Davies
    };
    Ok(Request {
        ph,
        conc_mol_l: molar("--conc", &args.conc)?,
        volume_l: units::parse_volume(&args.volume)?.litres,
        conditions: Conditions::new(units::parse_temperature(&args.temp)?)?.with_activity(activity),
        method: Method::parse(&args.recipe)?,
        forms: args
            .forms
            .as_deref()
            .map(|f| {
                f.split(',')
                    .map(|s| s.trim().to_string())
                    .filter(|s| !s.is_empty())
                    .collect()
            })
            .unwrap_or_default(),
        titrant: args.titrant.as_deref().map(titrant).transpose()?,
        stock_conc_mol_l: args
            .stock_conc
            .as_deref()
            .map(|s| molar("--stock-conc", s))
            .transpose()?,
    })
}

/// The system named, or the structure given as SMILES; an unknown name lists the systems.
pub fn resolve(
    name: &str,
    systems: &[BufferSystem],
    handbook: &dyn Fn() -> Result<Handbook>,
) -> Result<BufferSystem> {
    match BufferSystem::find(systems, name) {
        Ok(s) => Ok(s.clone()),
        Err(Error::Input(unknown)) => match crate::chem::molecule::Molecule::from_smiles(name) {
            Ok(_) => system_from_smiles(name, &handbook()?),
            Err(e) => Err(Error::Input(format!(
                "{unknown}\n(read as a SMILES it fails: {e})"
            ))),
        },
        Err(e) => Err(e),
    }
}

#[derive(Tabled)]
struct ComponentRow {
    role: String,
    name: String,
    #[tabled(rename = "what")]
    label: String,
    formula: String,
    amount: String,
    #[tabled(rename = "weigh / measure")]
    measure: String,
}

#[derive(Tabled)]
struct StockRow {
    stock: String,
    molarity: String,
    #[tabled(rename = "per litre of stock")]
    per_litre: String,
}

fn measure(mass_g: Option<f64>, volume_ml: Option<f64>) -> String {
    match (mass_g, volume_ml) {
        (Some(g), _) => fmt_mass(g),
        (None, Some(ml)) => fmt_volume(ml / 1e3),
        _ => String::new(),
    }
}

fn table(r: &Recipe) -> String {
    let mut out = format!(
        "{} buffer, pH {} at {} °C, {} M, {}: recipe {}\n",
        r.system_label,
        fmt_ph(r.target_ph),
        r.temperature_c,
        sig(r.conc_mol_l, 3),
        fmt_volume(r.volume_ml / 1e3),
        r.recipe.as_str()
    );
    let rows: Vec<ComponentRow> = r
        .components
        .iter()
        .map(|c| ComponentRow {
            role: c.role.clone(),
            name: c.name.clone(),
            label: c.label.clone(),
            formula: c.formula.clone(),
            amount: fmt_moles(c.mol),
            measure: measure(c.mass_g, c.volume_ml),
        })
        .collect();
    out += &report::table(&rows);
    if !r.stocks.is_empty() {
        let rows: Vec<StockRow> = r
            .stocks
            .iter()
            .map(|s| StockRow {
                stock: format!("{} ({})", s.label, s.formula),
                molarity: format!("{} M", sig(s.molar, 3)),
                per_litre: measure(s.mass_g_per_l, s.volume_ml_per_l),
            })
            .collect();
        out += &report::table(&rows);
    }
    out += &format!(
        "pH {} ({} activity); ionic strength {} M; buffer capacity {} M per pH unit\n",
        fmt_ph(r.ph),
        r.activity,
        sig(r.ionic_strength, 3),
        sig(r.capacity, 3)
    );
    out += &format!(
        "pKa at {} °C: {}  (source: {})\n",
        r.temperature_c,
        r.pkas
            .iter()
            .map(|p| format!("{p:.2}"))
            .collect::<Vec<_>>()
            .join(", "),
        r.source
    );
    for w in &r.warnings {
        out += &format!("Warning: {w}\n");
    }
    for n in &r.notes {
        out += &format!("Note: {n}\n");
    }
    out
}

/// One CSV row per component, with the solution's figures repeated for spreadsheets.
#[derive(Serialize)]
struct CsvRow<'a> {
    system: &'a str,
    recipe: Method,
    temperature_c: f64,
    target_ph: f64,
    ph: f64,
    ionic_strength: f64,
    capacity: f64,
    role: &'a str,
    name: &'a str,
    formula: &'a str,
    mol: f64,
    mass_g: Option<f64>,
    volume_ml: Option<f64>,
    stock_molar: Option<f64>,
}

fn csv(r: &Recipe) -> Result<String> {
    let rows: Vec<CsvRow> = r
        .components
        .iter()
        .map(|c| CsvRow {
            system: &r.system,
            recipe: r.recipe,
            temperature_c: r.temperature_c,
            target_ph: r.target_ph,
            ph: r.ph,
            ionic_strength: r.ionic_strength,
            capacity: r.capacity,
            role: &c.role,
            name: &c.name,
            formula: &c.formula,
            mol: c.mol,
            mass_g: c.mass_g,
            volume_ml: c.volume_ml,
            stock_molar: c.stock_molar,
        })
        .collect();
    report::csv(&rows)
}

/// The systems and their forms (`--list`).
#[derive(Serialize)]
struct Listed<'a> {
    name: &'a str,
    label: &'a str,
    pkas: &'a [f64],
    forms: Vec<&'a str>,
    source: &'a str,
}

fn list(systems: &[BufferSystem], format: Format) -> Result<String> {
    let listed: Vec<Listed> = systems
        .iter()
        .map(|s| Listed {
            name: &s.name,
            label: &s.label,
            pkas: &s.pkas,
            forms: s.forms.iter().map(|f| f.name.as_str()).collect(),
            source: &s.source,
        })
        .collect();
    match format {
        Format::Json => report::json(&listed),
        Format::Jsonl => report::jsonl(&listed),
        Format::Table | Format::Csv => {
            let rows = listed
                .iter()
                .map(|l| {
                    vec![
                        l.name.to_string(),
                        l.pkas
                            .iter()
                            .map(|p| format!("{p}"))
                            .collect::<Vec<_>>()
                            .join("; "),
                        l.forms.join(", "),
                    ]
                })
                .collect();
            let header = vec!["system".into(), "pKa (25 °C)".into(), "forms".into()];
            Ok(report::grid(header, rows))
        }
    }
}

pub fn run(args: &Args, cli: &Cli) -> Result<String> {
    let store = open_store(&cli.db)?;
    let systems = store.buffer_systems()?;
    if args.list {
        return list(&systems, cli.format);
    }
    let request = request(args)?;
    let name = args.system.as_deref().unwrap_or_default();
    let handbook = || Handbook::from_store(&store, args.estimate_only);
    let system = resolve(name, &systems, &handbook)?;
    let recipe = make(&system, &request, &store.reagents()?)?;
    super::html::buffer(args, &system, &recipe)?;
    match cli.format {
        Format::Table => Ok(table(&recipe)),
        Format::Csv => csv(&recipe),
        Format::Json => report::json(&recipe),
        Format::Jsonl => report::jsonl(std::slice::from_ref(&recipe)),
    }
}
