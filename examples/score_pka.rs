//! Scores phdose's pKa values on a CSV of measured constants (columns `smiles`, `kind`, `pka`;
//! others ignored). For kind `acid` the molecule's lowest acid constant is compared, for kind
//! `base` its highest base constant, both as a handbook lists them (`Profile::readings`: the
//! macroscopic constant at which the least-charged form, neutral or zwitterion, loses or takes
//! a proton). Prints MAE, RMSE, coverage (a constant of the right kind was found), the share
//! of measured values inside the reported range, the median width of that range, and a
//! per-group breakdown.
//!
//! cargo run --release --example score_pka -- FILE.csv [--estimate-only] [--worst N] [--missing]

use std::collections::BTreeMap;

use phdose::acidity::reading::Reading;
use phdose::acidity::{Handbook, Kind, Profile};
use phdose::store::Store;

#[derive(Default)]
struct Tally {
    n: usize,
    found: usize,
    abs: f64,
    sq: f64,
    inside: usize,
    widths: Vec<f64>,
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
        }
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
        .find(|a| !a.starts_with("--") && a.parse::<usize>().is_err())
        .ok_or("usage: score_pka FILE.csv [--estimate-only] [--worst N]")?;
    let estimate_only = args.iter().any(|a| a == "--estimate-only");
    let worst: usize = args
        .iter()
        .position(|a| a == "--worst")
        .and_then(|i| args.get(i + 1))
        .and_then(|n| n.parse().ok())
        .unwrap_or(0);
    let handbook = Handbook::from_store(&Store::in_memory()?, estimate_only)?;
    let mut reader = csv::Reader::from_path(file)?;
    let headers = reader.headers()?.clone();
    let col = |name: &str| {
        headers
            .iter()
            .position(|h| h == name)
            .ok_or(format!("{file} has no '{name}' column"))
    };
    let (c_smiles, c_kind, c_pka) = (col("smiles")?, col("kind")?, col("pka")?);
    let mut all = Tally::default();
    let mut by_group: BTreeMap<String, Tally> = BTreeMap::new();
    let mut misses: Vec<(f64, String)> = Vec::new();
    for record in reader.records() {
        let record = record?;
        let smiles = &record[c_smiles];
        let kind = match &record[c_kind] {
            "acid" => Kind::Acid,
            "base" => Kind::Base,
            _ => continue,
        };
        let Ok(truth) = record[c_pka].parse::<f64>() else {
            continue;
        };
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
    println!(
        "{:<48} {:>5} {:>6} {:>6} {:>6} {:>6} {:>6}",
        "group", "n", "cov%", "MAE", "RMSE", "in%", "width"
    );
    println!("{}", all.line("all"));
    for (name, t) in &by_group {
        println!("{}", t.line(name));
    }
    if !args.iter().any(|a| a == "--missing") {
        misses.retain(|m| m.0.is_finite());
    }
    misses.sort_by(|a, b| b.0.total_cmp(&a.0));
    for (_, line) in misses.iter().take(worst) {
        println!("{line}");
    }
    Ok(())
}
