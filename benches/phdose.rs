//! Criterion benches of the hot paths: SMILES parsing (molecule building with rings,
//! aromaticity and hydrogens), site finding (every SMARTS of the group table), the full pKa
//! profile, Crippen logP, and the `adjust` solve with ten solutes.
//!
//! Structures: the first 200 SMILES of the IUPAC calibration set
//! (../shared/reference/iupac-pka-calibration.csv). Run with `cargo bench`; a quick look:
//! `cargo bench -- --quick`.

use std::hint::black_box;

use clap::Parser;
use criterion::{Criterion, criterion_group, criterion_main};
use phdose::acidity::{Handbook, Profile, find_sites};
use phdose::chem::components::split;
use phdose::chem::molecule::Molecule;
use phdose::cli::{Cli, Command};
use phdose::partition::logp::crippen_logp;
use phdose::store::Store;

/// The allocator the phdose binary ships with (src/main.rs), so the figures are the program's.
#[global_allocator]
static GLOBAL: mimalloc::MiMalloc = mimalloc::MiMalloc;

fn calibration_smiles() -> Vec<String> {
    let path = concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/../shared/reference/iupac-pka-calibration.csv"
    );
    let mut reader = csv::Reader::from_path(path).expect("calibration set");
    let column = reader
        .headers()
        .unwrap()
        .iter()
        .position(|h| h == "smiles")
        .unwrap();
    reader
        .records()
        .map(|r| r.unwrap()[column].to_string())
        .filter(|s| Molecule::from_smiles(s).is_ok())
        .take(200)
        .collect()
}

fn benches(c: &mut Criterion) {
    let smiles = calibration_smiles();
    let molecules: Vec<Molecule> = smiles
        .iter()
        .map(|s| Molecule::from_smiles(s).unwrap())
        .collect();
    let handbook = Handbook::builtin_measured().unwrap();

    c.bench_function("parse 200 SMILES", |b| {
        b.iter(|| {
            for s in &smiles {
                black_box(Molecule::from_smiles(black_box(s)).unwrap());
            }
        })
    });
    c.bench_function("find sites in 200 molecules", |b| {
        b.iter(|| {
            for m in &molecules {
                black_box(find_sites(m, &handbook.groups));
            }
        })
    });
    c.bench_function("pKa profile of 200 SMILES", |b| {
        b.iter(|| {
            for s in &smiles {
                let p = Profile::new(s, &handbook).unwrap();
                black_box(p.constants());
            }
        })
    });
    c.bench_function("Crippen logP of 200 molecules", |b| {
        b.iter(|| {
            for m in &molecules {
                let neutral = split(m).unwrap().neutral;
                black_box(crippen_logp(&neutral).unwrap());
            }
        })
    });

    // Ten solutes of a crude mixture (acids, bases, a zwitterion, a salt) brought to pH 8.
    let solutes = [
        "OC(=O)c1ccc(Cl)cc1",
        "CCN(CC)CC",
        "Oc1ccccc1",
        "c1ccncc1",
        "NCC(=O)O",
        "CC(=O)O",
        "Nc1ccccc1",
        "OC(=O)CCC(=O)O",
        "CCN(CC)CC.Cl",
        "c1c[nH]cn1",
    ];
    let mut argv = vec!["phdose".to_string(), "adjust".into()];
    for s in solutes {
        argv.extend(["--solute".into(), s.into(), "1mmol".into()]);
    }
    argv.extend(
        [
            "--water",
            "50mL",
            "--to-ph",
            "8",
            "--reagent",
            "naoh",
            "--stock",
            "1M",
        ]
        .map(String::from),
    );
    let cli = Cli::try_parse_from(&argv).unwrap();
    let Command::Adjust(args) = &cli.command else {
        unreachable!()
    };
    let request = phdose::cli::adjust::request(args).unwrap();
    let catalogue = Store::in_memory().unwrap().reagents().unwrap();
    c.bench_function("adjust 10 solutes to pH 8", |b| {
        b.iter(|| {
            black_box(phdose::workup::adjust::adjust(&request, &handbook, &catalogue).unwrap())
        })
    });
}

criterion_group! {
    name = hot_paths;
    // Short runs: the machine is shared; the ratios, not the last digit, are what we read.
    config = Criterion::default()
        .warm_up_time(std::time::Duration::from_millis(500))
        .measurement_time(std::time::Duration::from_secs(2))
        .sample_size(20);
    targets = benches
}
criterion_main!(hot_paths);
