//! Scores phdose's pKa values on a CSV of measured constants (columns `smiles`, `kind`, `pka`;
//! others ignored). For kind `acid` the molecule's lowest acid-site pKa is compared, for kind
//! `base` its highest base-site pKa. Prints MAE, RMSE, coverage (a site of the right kind was
//! found), the share of measured values inside the reported range, and a per-group breakdown.
//!
//! cargo run --release --example score_pka -- FILE.csv [--estimate-only] [--worst N]

use std::collections::BTreeMap;

use phdose::acidity::{Handbook, Kind, Profile};
use phdose::store::Store;

#[derive(Default)]
struct Tally {
    n: usize,
    found: usize,
    abs: f64,
    sq: f64,
    inside: usize,
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
        }
    }
    fn line(&self, name: &str) -> String {
        let f = self.found.max(1) as f64;
        format!(
            "{name:<48} {:>5} {:>6.1} {:>6.2} {:>6.2} {:>6.1}",
            self.n,
            100.0 * self.found as f64 / self.n.max(1) as f64,
            self.abs / f,
            (self.sq / f).sqrt(),
            100.0 * self.inside as f64 / f
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
        let sites = Profile::new(smiles, &handbook)
            .map(|p| p.sites)
            .unwrap_or_default();
        let pick = sites.iter().filter(|s| s.kind == kind).min_by(|a, b| {
            let key = |s: &&phdose::acidity::Site| if kind == Kind::Acid { s.pka } else { -s.pka };
            key(a).total_cmp(&key(b))
        });
        let hit = pick.map(|s| (s.pka, s.pka_low, s.pka_high));
        let group = pick.map_or_else(
            || format!("(no {} site)", kind.as_str()),
            |s| s.group.clone(),
        );
        all.add(hit, truth);
        by_group.entry(group.clone()).or_default().add(hit, truth);
        let err = pick.map_or(f64::INFINITY, |s| (s.pka - truth).abs());
        misses.push((
            err,
            format!("{smiles} {} {truth} -> {:?} [{group}]", kind.as_str(), hit),
        ));
    }
    println!(
        "{:<48} {:>5} {:>6} {:>6} {:>6} {:>6}",
        "group", "n", "cov%", "MAE", "RMSE", "in%"
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
