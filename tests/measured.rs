//! Measured values against the outside world and the precedence contract: the built-in
//! handbook rows reproduce an independent digitized handbook dataset, the user's value beats
//! the built-in one, `--estimate-only` ignores both, and `phdose db` round-trips its CSV.

use std::path::PathBuf;
use std::process::{Command, Output};

use phdose::acidity::measured::Origin;
use phdose::acidity::{Handbook, Kind, Profile};
use phdose::chem::canon;
use serde_json::Value;

/// IUPAC Digitized pKa Dataset v1.0 (Zheng & Lafontant-Joseph, doi:10.5281/zenodo.7236452),
/// digitized from Serjeant & Dempsey 1979 and Perrin 1965/1972; see the reference README.
const IUPAC: &str = concat!(
    env!("CARGO_MANIFEST_DIR"),
    "/../shared/reference/iupac-pka-calibration.csv"
);

/// The scoring rule of issue 3: an acid value is compared with the lowest acid-site pKa, a base
/// value with the highest base-site pKa.
fn scored(profile: &Profile, kind: Kind) -> Option<f64> {
    let values = profile
        .sites
        .iter()
        .filter(|s| s.kind == kind)
        .map(|s| s.pka);
    match kind {
        Kind::Acid => values.min_by(f64::total_cmp),
        Kind::Base => values.max_by(f64::total_cmp),
    }
}

fn kind(text: &str) -> Kind {
    if text == "acid" {
        Kind::Acid
    } else {
        Kind::Base
    }
}

#[test]
fn builtin_rows_agree_with_the_iupac_digitized_handbook_values() {
    // Every reference molecule that is also in data/measured.csv: phdose with measured values
    // on must land within 0.3 on average (issue 3). The built-in table was written without
    // this file, so this checks the table, the key and the lookup together.
    let handbook = Handbook::builtin_measured().unwrap();
    let mut reader = csv::Reader::from_path(IUPAC).unwrap();
    let (mut n, mut total, mut uncovered) = (0, 0.0, Vec::new());
    for row in reader.records() {
        let row = row.unwrap();
        let (smiles, k, pka) = (&row[1], kind(&row[2]), row[3].parse::<f64>().unwrap());
        let Ok(key) = canon::key(smiles) else {
            continue;
        };
        if !handbook.measured.builtin.contains_key(&key) {
            continue;
        }
        let profile = Profile::new(smiles, &handbook).unwrap();
        // A measured value needs a site of its kind to sit on; the group table decides that.
        let Some(got) = scored(&profile, k) else {
            uncovered.push(smiles.to_string());
            continue;
        };
        assert_eq!(profile.origin, Origin::Measured, "{smiles}");
        total += (got - pka).abs();
        n += 1;
    }
    assert!(
        n >= 30,
        "only {n} reference molecules in the built-in table"
    );
    assert!(
        uncovered.len() * 10 <= n,
        "no site of the kind: {uncovered:?}"
    );
    let mae = total / n as f64;
    eprintln!("built-in rows vs IUPAC dataset: {n} molecules, MAE {mae:.3}");
    assert!(mae <= 0.3, "mean absolute difference {mae:.3} over {n}");
}

/// (spelling, kind, reference pKa, IUPAC dataset id): common compounds written as salts,
/// charged, Kekulé or reordered, so the lookup has to go through the canonical key.
const COMMON: &[(&str, &str, f64, &str)] = &[
    ("CC(=O)C(=O)[O-].[Na+]", "acid", 2.1, "serjeant2136"),
    ("OC(=O)C=C", "acid", 4.25, "serjeant2135"),
    ("CC1=CC=CC=C1C([O-])=O.[K+]", "acid", 3.9, "serjeant3982"),
    ("Fc1ccc(cc1)C(O)=O", "acid", 4.15, "serjeant3552"),
    ("OC(=O)C1=CC=CO1", "acid", 3.18, "serjeant2537"),
    ("Oc1cccc(N(=O)=O)c1", "acid", 8.35, "serjeant2997"),
    ("[O-]c1ccc(C#N)cc1.[Na+]", "acid", 7.97, "serjeant3523"),
    ("OC1=CC=CC=C1C=O", "acid", 8.37, "serjeant3385"),
    ("CC(=O)CC(=O)OCC", "acid", 10.64, "serjeant2876"),
    ("C1CC(=O)NC1=O", "acid", 9.5, "serjeant2360"),
    ("CC[NH3+].[Cl-]", "base", 10.79, "perrin_supp4007"),
    ("CC[NH+](CC)CC.[Cl-]", "base", 10.8, "perrin_supp4042"),
    ("NCCC.Cl", "base", 10.7, "perrin0138"),
    ("[NH3+]CCCC", "base", 10.72, "perrin0232"),
    ("CC(C)[NH2+]C(C)C.[Br-]", "base", 11.05, "perrin0212"),
    ("C(CCC)NCCCC", "base", 11.32, "perrin0246"),
    ("[NH2+]1CCCCC1.[Cl-]", "base", 11.11, "perrin0967"),
    ("N12CCC(CC1)CC2", "base", 10.8, "perrin2087"),
    ("OC(c1ccccc1)C(C)NC.Cl", "base", 9.56, "perrin0759"),
    ("NC1=CC=CC=C1C", "base", 4.43, "perrin0582"),
    ("[NH3+]c1cccc(OC)c1.[Cl-]", "base", 4.2, "perrin_supp4476"),
    ("N(C1=CC=CC=C1)c1ccccc1", "base", 0.79, "perrin0603"),
    ("c1ccc2cc(N)ccc2c1", "base", 4.15, "perrin0864"),
    ("C[c]1[cH][cH][n][cH][cH]1", "base", 6.01, "perrin_supp5242"),
    ("c1ncccc1Cl", "base", 2.84, "perrin1081"),
    ("C1=CC=C2N=CC=CC2=C1", "base", 4.89, "perrin1923"),
    ("CC1=NC=C[NH]1", "base", 7.85, "perrin1411"),
    ("CCC(C)C([NH3+])C([O-])=O", "base", 9.79, "perrin_supp7687"),
    ("OCC(N)C(O)=O", "base", 9.3, "perrin_supp7746"),
    ("[NH3+]CCCC([O-])=O", "base", 10.56, "perrin_supp7546"),
];

#[test]
fn common_compounds_in_any_spelling_come_out_within_0_3_of_handbook_values() {
    let handbook = Handbook::builtin_measured().unwrap();
    let rows = COMMON;
    let mut total = 0.0;
    for &(smiles, k, pka, id) in rows {
        let profile = Profile::new(smiles, &handbook).unwrap();
        assert_eq!(profile.origin, Origin::Measured, "{smiles} ({id})");
        let got = scored(&profile, kind(k)).unwrap();
        total += (got - pka).abs();
    }
    let mae = total / rows.len() as f64;
    assert!(rows.len() >= 30);
    assert!(mae <= 0.3, "mean absolute difference {mae:.3}");
}

#[test]
fn measured_constants_are_macroscopic_and_not_shifted_again() {
    // Glycine 2.34 and 9.60 (CRC Handbook amino acid table, from memory) are what a titration
    // sees; the site interactions are already in them.
    let handbook = Handbook::builtin_measured().unwrap();
    let macro_pka = Profile::new("[NH3+]CC([O-])=O", &handbook)
        .unwrap()
        .constants()
        .macro_pka;
    assert_eq!(macro_pka.len(), 2);
    assert!((macro_pka[0] - 2.34).abs() < 0.01, "{macro_pka:?}");
    assert!((macro_pka[1] - 9.60).abs() < 0.01, "{macro_pka:?}");
}

#[test]
fn estimate_only_handbook_ignores_the_measured_tables() {
    let store = phdose::store::Store::in_memory().unwrap();
    let handbook = Handbook::from_store(&store, true).unwrap();
    let profile = Profile::new("CC(=O)O", &handbook).unwrap();
    assert_eq!(profile.origin, Origin::Estimate);
    assert!(!profile.sites[0].source.starts_with("measured"));
}

// ---- the binary ----

fn temp_db(name: &str) -> PathBuf {
    let dir = std::env::temp_dir().join(format!("phdose-measured-{}-{name}", std::process::id()));
    let _ = std::fs::remove_dir_all(&dir);
    std::fs::create_dir_all(&dir).unwrap();
    dir.join("store.sqlite")
}

fn phdose(db: &PathBuf, args: &[&str]) -> Output {
    Command::new(env!("CARGO_BIN_EXE_phdose"))
        .args(args)
        .arg("--db")
        .arg(db)
        .output()
        .expect("phdose runs")
}

fn ok_text(o: &Output) -> String {
    assert!(
        o.status.success(),
        "failed: {}",
        String::from_utf8_lossy(&o.stderr)
    );
    String::from_utf8_lossy(&o.stdout).into_owned()
}

fn pka_json(db: &PathBuf, args: &[&str]) -> Value {
    let mut all = vec!["pka", "--format", "json"];
    all.extend_from_slice(args);
    serde_json::from_str(&ok_text(&phdose(db, &all))).unwrap()
}

#[test]
fn the_users_value_beats_the_builtin_one_and_estimate_only_ignores_both() {
    let db = temp_db("precedence");
    // Built-in: acetic acid 4.76 (CRC Handbook, from memory; IUPAC dataset agrees).
    let v = pka_json(&db, &["CC(=O)O"]);
    assert_eq!(v[0]["origin"], "measured");
    assert_eq!(v[0]["sites"][0]["pka"], 4.76);
    ok_text(&phdose(
        &db,
        &[
            "db",
            "add",
            "CC(=O)[O-].[Na+]",
            "--pka",
            "4.60",
            "--note",
            "0.1 M KCl",
        ],
    ));
    let v = pka_json(&db, &["OC(C)=O"]);
    assert_eq!(v[0]["origin"], "user");
    assert_eq!(v[0]["sites"][0]["pka"], 4.6);
    assert!(
        v[0]["sites"][0]["source"]
            .as_str()
            .unwrap()
            .starts_with("measured (user): 0.1 M KCl")
    );
    let v = pka_json(&db, &["CC(=O)O", "--estimate-only"]);
    assert_eq!(v[0]["origin"], "estimate");
    let source = v[0]["sites"][0]["source"].as_str().unwrap();
    assert!(!source.starts_with("measured"), "{source}");
    // The JSON contract of `pka` is kept.
    for field in [
        "atom", "group", "kind", "pka", "pka_low", "pka_high", "source",
    ] {
        assert!(v[0]["sites"][0].get(field).is_some(), "{field}");
    }
    assert!(v[0]["error"].is_null());
}

#[test]
fn db_export_import_round_trips_exactly() {
    let db = temp_db("roundtrip");
    ok_text(&phdose(
        &db,
        &[
            "db",
            "add",
            "NCC(=O)O",
            "--pka",
            "acid:2.35,base:9.78",
            "--note",
            "pH-metric, \"run 2\", 25 C",
        ],
    ));
    ok_text(&phdose(&db, &["db", "add", "c1ccncc1", "--pka", "5.2"]));
    let first = ok_text(&phdose(&db, &["db", "export"]));
    assert_eq!(first.lines().count(), 4, "{first}");
    let file = db.with_file_name("values.csv");
    std::fs::write(&file, &first).unwrap();
    let other = temp_db("roundtrip-other");
    ok_text(&phdose(&other, &["db", "import", file.to_str().unwrap()]));
    let second = ok_text(&phdose(&other, &["db", "export"]));
    assert_eq!(first, second);
    let list: Value = serde_json::from_str(&ok_text(&phdose(
        &other,
        &["db", "list", "--format", "json"],
    )))
    .unwrap();
    assert_eq!(list.as_array().unwrap().len(), 3);
    // Importing again replaces rather than duplicates.
    ok_text(&phdose(&other, &["db", "import", file.to_str().unwrap()]));
    assert_eq!(ok_text(&phdose(&other, &["db", "export"])), first);
}

#[test]
fn db_remove_by_id_and_by_any_spelling() {
    let db = temp_db("remove");
    ok_text(&phdose(&db, &["db", "add", "CCN", "--pka", "base:10.7"]));
    ok_text(&phdose(
        &db,
        &["db", "add", "OC(=O)c1ccccc1", "--pka", "4.2"],
    ));
    let list: Value =
        serde_json::from_str(&ok_text(&phdose(&db, &["db", "list", "--format", "json"]))).unwrap();
    let id = list[0]["id"].as_i64().unwrap().to_string();
    ok_text(&phdose(&db, &["db", "remove", &id]));
    ok_text(&phdose(
        &db,
        &["db", "remove", "[O-]C(=O)C1=CC=CC=C1.[Na+]"],
    ));
    assert_eq!(
        ok_text(&phdose(&db, &["db", "export"])),
        "smiles,kind,pka,note,added\n"
    );
}

#[test]
fn db_bad_input_exits_2_and_stores_nothing() {
    let db = temp_db("bad");
    let cases: &[&[&str]] = &[
        &["db", "add", "CC(=O)Xc1ccccc1", "--pka", "4"],
        &["db", "add", "CC(=O)O", "--pka", "four"],
        &["db", "add", "CC(=O)O", "--pka", "4", "--kind", "acdi"],
        &["db", "add", "CC(=O)O", "--pka", "4,5"],
        &["db", "add", "CC(=O)O", "--pka", "40"],
        &["db", "remove", "12345"],
        &["db", "remove", "CCCCCCCCCCO"],
        &["db", "import", "/nonexistent/values.csv"],
    ];
    for args in cases {
        let o = phdose(&db, args);
        assert_eq!(
            o.status.code(),
            Some(2),
            "{args:?}: {}",
            String::from_utf8_lossy(&o.stderr)
        );
        assert!(!String::from_utf8_lossy(&o.stderr).contains("panicked"));
    }
    let bad = db.with_file_name("bad.csv");
    std::fs::write(
        &bad,
        "smiles,kind,pka,note,added\nCCN,base,10.7,,2026-01-05\nCCO,acidic,15,,\n",
    )
    .unwrap();
    let o = phdose(&db, &["db", "import", bad.to_str().unwrap()]);
    assert_eq!(o.status.code(), Some(2));
    assert!(String::from_utf8_lossy(&o.stderr).contains("line 3"));
    assert_eq!(
        ok_text(&phdose(&db, &["db", "export"])),
        "smiles,kind,pka,note,added\n",
        "a bad file imports nothing"
    );
}

#[test]
fn lactim_spellings_key_and_read_as_their_lactams() {
    // 2-Hydroxypyridine and 2,4-dihydroxypyrimidine are the 2-pyridone and uracil they are
    // in water (Beak 1977, from memory): one canonical key, and uracil's built-in value 9.45
    // (CRC Handbook, from memory) is found from the lactim spelling.
    assert_eq!(
        canon::key("Oc1ccccn1").unwrap(),
        canon::key("O=c1cccc[nH]1").unwrap()
    );
    assert_eq!(
        canon::key("Oc1ccnc(O)n1").unwrap(),
        canon::key("O=c1cc[nH]c(=O)[nH]1").unwrap()
    );
    let hb = Handbook::builtin_measured().unwrap();
    let p = Profile::new("Oc1ccnc(O)n1", &hb).unwrap();
    assert_eq!(p.origin, Origin::Measured, "{:?}", p.sites);
    assert!((scored(&p, Kind::Acid).unwrap() - 9.45).abs() < 0.01);
    // A phenol and a 3-hydroxypyridine keep their O-H.
    assert_ne!(
        canon::key("Oc1cccnc1").unwrap(),
        canon::key("O=c1ccc[nH]c1").unwrap_or_default()
    );
}
