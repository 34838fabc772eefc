//! Scores phdose's pKa values on a CSV of measured constants (columns `smiles`, `kind`, `pka`;
//! others ignored). For kind `acid` the molecule's lowest acid constant is compared, for kind
//! `base` its highest base constant, both as a handbook lists them (`Profile::readings`: the
//! macroscopic constant at which the least-charged form, neutral or zwitterion, loses or takes
//! a proton). Prints MAE, RMSE, coverage (a constant of the right kind was found), the share
//! of measured values inside the reported range, the median width of that range, and a
//! per-group breakdown.
//!
//! It also prints the interval scale: the factor by which every range's half-widths would have
//! to grow (or could shrink) for 90 % of the measured values to fall inside.
//!
//! `--handbook` reads the file in the layout of `data/measured.csv` instead (`pka` is a list
//! like `acid:4.2;base:9.8`; each compound gives its lowest acid and highest base constant),
//! and `--exclude OTHER.csv` drops every compound whose canonical key is also in OTHER's
//! `smiles` column: held-out figures for a table that overlaps the calibration set.
//!
//! cargo run --release --example score_pka -- FILE.csv [--estimate-only] [--worst N] [--missing]
//!     [--handbook] [--exclude OTHER.csv]

use std::collections::{BTreeMap, HashSet};
use std::fmt::Write as _;
use std::io::Write as _;

use phdose::acidity::reading::Reading;
use phdose::acidity::{Handbook, Kind, Profile};
use phdose::chem::canon::key;
use phdose::store::Store;
use phdose::store::measured::parse_constants;

/// One measured constant to score: SMILES, kind, pKa.
type Row = (String, Kind, f64);

/// (smiles, kind, pKa) rows of a scoring file, or of a table laid out as `data/measured.csv`
/// (`handbook`): there each compound gives its lowest acid and its highest base constant.
fn read_rows(file: &str, handbook: bool) -> Result<Vec<Row>, Box<dyn std::error::Error>> {
    let mut reader = csv::ReaderBuilder::new()
        .comment(Some(b'#'))
        .from_path(file)?;
    let headers = reader.headers()?.clone();
    let col = |name: &str| {
        headers
            .iter()
            .position(|h| h == name)
            .ok_or(format!("{file} has no '{name}' column"))
    };
    let (c_smiles, c_pka) = (col("smiles")?, col("pka")?);
    let c_kind = if handbook { None } else { Some(col("kind")?) };
    let mut rows = Vec::new();
    for record in reader.records() {
        let record = record?;
        let smiles = record[c_smiles].to_string();
        let Some(c_kind) = c_kind else {
            let constants = parse_constants(&record[c_pka]).map_err(|e| e.to_string())?;
            let pick = |kind: Kind| {
                let values = constants.iter().filter(|c| c.0 == Some(kind)).map(|c| c.1);
                if kind == Kind::Acid {
                    values.reduce(f64::min)
                } else {
                    values.reduce(f64::max)
                }
            };
            for kind in [Kind::Acid, Kind::Base] {
                if let Some(pka) = pick(kind) {
                    rows.push((smiles.clone(), kind, pka));
                }
            }
            continue;
        };
        let kind = match &record[c_kind] {
            "acid" => Kind::Acid,
            "base" => Kind::Base,
            _ => continue,
        };
        if let Ok(pka) = record[c_pka].parse::<f64>() {
            rows.push((smiles, kind, pka));
        }
    }
    Ok(rows)
}

#[derive(Default)]
struct Tally {
    n: usize,
    found: usize,
    abs: f64,
    sq: f64,
    inside: usize,
    widths: Vec<f64>,
    /// |error| over the half-width on the side of the measured value.
    ratios: Vec<f64>,
}

impl Tally {
    fn add(&mut self, hit: Option<(f64, f64, f64)>, truth: f64) {
        self.n += 1;
        if let Some((pka, low, high)) = hit {
            self.found += 1;
            self.abs += (pka - truth).abs();
            self.sq += (pka - truth).powi(2);
            if low <= truth && truth <= high {
                self.inside += 1;
            }
            self.widths.push(high - low);
            let half = if truth < pka { pka - low } else { high - pka };
            self.ratios.push(if half > 0.0 {
                (pka - truth).abs() / half
            } else {
                f64::INFINITY
            });
        }
    }
    /// The factor on every half-width that puts 90 % of the values inside.
    fn scale_for_90(&self) -> f64 {
        let mut r = self.ratios.clone();
        r.sort_by(f64::total_cmp);
        r.get(((r.len() as f64) * 0.9).ceil() as usize - 1)
            .copied()
            .unwrap_or(f64::NAN)
    }
    fn median_width(&self) -> f64 {
        let mut w = self.widths.clone();
        w.sort_by(f64::total_cmp);
        match w.len() {
            0 => 0.0,
            n if n % 2 == 1 => w[n / 2],
            n => 0.5 * (w[n / 2 - 1] + w[n / 2]),
        }
    }
    fn line(&self, name: &str) -> String {
        let f = self.found.max(1) as f64;
        format!(
            "{name:<48} {:>5} {:>6.1} {:>6.2} {:>6.2} {:>6.1} {:>6.2}",
            self.n,
            100.0 * self.found as f64 / self.n.max(1) as f64,
            self.abs / f,
            (self.sq / f).sqrt(),
            100.0 * self.inside as f64 / f,
            self.median_width()
        )
    }
}

fn main() {
    if let Err(e) = run() {
        eprintln!("score_pka: {e}");
        std::process::exit(2);
    }
}

fn run() -> Result<(), Box<dyn std::error::Error>> {
    let args: Vec<String> = std::env::args().skip(1).collect();
    let file = args
        .iter()
        .enumerate()
        .find(|(i, a)| {
            !a.starts_with("--")
                && (*i == 0 || !matches!(args[i - 1].as_str(), "--worst" | "--exclude"))
        })
        .map(|(_, a)| a)
        .ok_or("usage: score_pka FILE.csv [--estimate-only] [--worst N] [--handbook] [--exclude OTHER.csv]")?;
    let estimate_only = args.iter().any(|a| a == "--estimate-only");
    let worst: usize = args
        .iter()
        .position(|a| a == "--worst")
        .and_then(|i| args.get(i + 1))
        .and_then(|n| n.parse().ok())
        .unwrap_or(0);
    let handbook = Handbook::from_store(&Store::in_memory()?, estimate_only)?;
    let option = |name: &str| {
        args.iter()
            .position(|a| a == name)
            .and_then(|i| args.get(i + 1))
    };
    let excluded: HashSet<String> = match option("--exclude") {
        Some(other) => {
            let mut reader = csv::ReaderBuilder::new()
                .comment(Some(b'#'))
                .from_path(other)?;
            let c = reader
                .headers()?
                .iter()
                .position(|h| h == "smiles")
                .ok_or(format!("{other} has no 'smiles' column"))?;
            let mut keys = HashSet::new();
            for record in reader.records() {
                if let Ok(k) = key(&record?[c]) {
                    keys.insert(k);
                }
            }
            keys
        }
        None => HashSet::new(),
    };
    let rows: Vec<Row> = read_rows(file, args.iter().any(|a| a == "--handbook"))?
        .into_iter()
        .filter(|(smiles, ..)| key(smiles).map_or(true, |k| !excluded.contains(&k)))
        .collect();
    let mut all = Tally::default();
    let mut by_group: BTreeMap<String, Tally> = BTreeMap::new();
    let mut misses: Vec<(f64, String)> = Vec::new();
    for (smiles, kind, truth) in &rows {
        let (smiles, kind, truth) = (smiles.as_str(), *kind, *truth);
        let readings: Vec<Reading> = Profile::new(smiles, &handbook)
            .map(|p| {
                (0..p.compound.parents.len())
                    .filter_map(|i| {
                        let r = p.readings(i);
                        if kind == Kind::Acid { r.acid } else { r.base }
                    })
                    .collect()
            })
            .unwrap_or_default();
        let pick = readings.iter().min_by(|a, b| {
            let key = |r: &&Reading| if kind == Kind::Acid { r.pka } else { -r.pka };
            key(a).total_cmp(&key(b))
        });
        let hit = pick.map(|r| (r.pka, r.pka_low, r.pka_high));
        let group = pick.map_or_else(
            || format!("(no {} site)", kind.as_str()),
            |r| r.group.clone(),
        );
        all.add(hit, truth);
        by_group.entry(group.clone()).or_default().add(hit, truth);
        let err = pick.map_or(f64::INFINITY, |r| (r.pka - truth).abs());
        misses.push((
            err,
            format!("{smiles} {} {truth} -> {:?} [{group}]", kind.as_str(), hit),
        ));
    }
    let mut out = String::new();
    writeln!(
        out,
        "{:<48} {:>5} {:>6} {:>6} {:>6} {:>6} {:>6}",
        "group", "n", "cov%", "MAE", "RMSE", "in%", "width"
    )?;
    writeln!(out, "{}", all.line("all"))?;
    writeln!(
        out,
        "interval scale for 90 % inside: {:.2} (1.00 = the ranges as reported)",
        all.scale_for_90()
    )?;
    for (name, t) in &by_group {
        writeln!(out, "{}", t.line(name))?;
    }
    if !args.iter().any(|a| a == "--missing") {
        misses.retain(|m| m.0.is_finite());
    }
    misses.sort_by(|a, b| b.0.total_cmp(&a.0));
    for (_, line) in misses.iter().take(worst) {
        writeln!(out, "{line}")?;
    }
    // A closed pipe (`| head`) ends the output quietly.
    let _ = std::io::stdout().write_all(out.as_bytes());
    Ok(())
}
