//! The binary end to end: output contracts (JSON keys of design §5) and every error path's exit
//! code and message. Each test uses its own temporary store through `--db`.

mod common;
use common::{json, stderr, stdout};

use std::path::PathBuf;
use std::process::{Command, Output};

use serde_json::Value;

#[test]
fn invalid_smiles_exits_2_with_a_caret_under_the_bad_character() {
    let o = phdose("caret", &["info", "CC(=O)Xc1ccccc1"]);
    assert_eq!(o.status.code(), Some(2));
    let err = stderr(&o);
    assert!(err.contains("CC(=O)Xc1ccccc1"), "{err}");
    // The caret line puts `^` under byte 6, the `X`.
    let lines: Vec<&str> = err.lines().collect();
    let smiles_line = lines
        .iter()
        .position(|l| l.contains("CC(=O)Xc1ccccc1"))
        .unwrap();
    let caret_line = lines[smiles_line + 1];
    let col = lines[smiles_line].find("CC(=O)X").unwrap() + 6;
    assert_eq!(caret_line.find('^'), Some(col), "{err}");
}

#[test]
fn unclosed_ring_and_branch_exit_2() {
    for bad in ["C1CC", "CC(C", "c1ccccc1)", ""] {
        let o = phdose("unclosed", &["pka", bad]);
        assert_eq!(o.status.code(), Some(2), "{bad:?}: {}", stderr(&o));
        assert!(!stderr(&o).contains("panicked"));
    }
}

#[test]
fn info_reports_formula_mass_and_charge() {
    // Triethylamine hydrochloride, C6H16ClN; molar mass 137.67 from IUPAC 2021 weights
    // (6 x 12.011 + 16 x 1.008 + 35.45 + 14.007 = 137.653... RDKit gives 137.67, common practice).
    let v = json(&phdose(
        "info",
        &["info", "CCN(CC)CC.Cl", "--format", "json"],
    ));
    assert_eq!(v["formula"], "C6H16ClN");
    assert!(
        (v["molar_mass"].as_f64().unwrap() - 137.67).abs() < 0.02,
        "{v}"
    );
    assert_eq!(v["charge"], 0);
}

#[test]
fn pka_json_has_the_contract_keys_in_input_order() {
    let v = json(&phdose(
        "pka-json",
        &["pka", "CC(=O)O", "CCN", "--format", "json"],
    ));
    let arr = v.as_array().unwrap();
    assert_eq!(arr.len(), 2);
    assert_eq!(arr[0]["smiles"], "CC(=O)O");
    assert_eq!(arr[1]["smiles"], "CCN");
    let site = &arr[0]["sites"][0];
    for key in [
        "atom", "group", "kind", "pka", "pka_low", "pka_high", "source",
    ] {
        assert!(site.get(key).is_some(), "missing {key}: {site}");
    }
    assert_eq!(site["kind"], "acid");
    assert_eq!(site["atom"], 3);
    assert_eq!(arr[1]["sites"][0]["kind"], "base");
    assert!(arr[0]["error"].is_null());
}

#[test]
fn batch_jsonl_keeps_order_and_reports_bad_rows() {
    let dir = temp_db("batch").parent().unwrap().to_path_buf();
    let input = dir.join("in.csv");
    std::fs::write(&input, "id,smiles\n1,OC(=O)c1ccccc1\n2,C1CC\n3,c1ccncc1\n").unwrap();
    let o = phdose(
        "batch",
        &[
            "pka",
            "--input",
            input.to_str().unwrap(),
            "--format",
            "jsonl",
        ],
    );
    assert!(o.status.success(), "{}", stderr(&o));
    let lines: Vec<Value> = stdout(&o)
        .lines()
        .map(|l| serde_json::from_str(l).unwrap())
        .collect();
    assert_eq!(lines.len(), 3);
    assert_eq!(lines[0]["smiles"], "OC(=O)c1ccccc1");
    assert!(lines[0]["error"].is_null());
    assert!(lines[1]["error"].as_str().unwrap().contains("SMILES"));
    assert_eq!(lines[2]["sites"][0]["kind"], "base");
}

#[test]
fn adjust_done_when_example_prints_sites_ph_and_amount() {
    // The acceptance command: 3 mmol 4-chlorobenzoic acid in 40 mL to pH 8 with 1 M NaOH.
    let o = phdose(
        "done-when",
        &[
            "adjust",
            "--solute",
            "OC(=O)c1ccc(Cl)cc1",
            "3mmol",
            "--water",
            "40mL",
            "--to-ph",
            "8",
            "--reagent",
            "naoh",
            "--stock",
            "1M",
            "--format",
            "json",
        ],
    );
    let v = json(&o);
    assert!((v["ph"].as_f64().unwrap() - 8.0).abs() < 1e-6);
    let mol = v["reagent_mol"].as_f64().unwrap();
    // At pH 8 an acid of pKa near 4 is > 99.9 % ionized, so about one equivalent (3 mmol) is
    // needed (independent estimate: n = 3 mmol x f_ionized(8) + free hydroxide, within 1 %).
    assert!((mol - 3.0e-3).abs() < 0.03e-3, "{mol}");
    let ml = v["stock_volume_ml"].as_f64().unwrap();
    assert!((ml - mol * 1e3).abs() < 1e-9, "1 M stock: mL equals mmol");
    assert!((v["aqueous_volume_ml"].as_f64().unwrap() - (40.0 + ml)).abs() < 1e-9);
    assert_eq!(v["solutes"][0]["smiles"], "OC(=O)c1ccc(Cl)cc1");
    assert_eq!(v["solutes"][0]["sites"][0]["kind"], "acid");
    assert!(v["cautions"].as_array().unwrap().len() >= 2);
    assert!(v.get("co2_released_ml").is_some());
    assert!(v["solutes"][0].get("fraction_aqueous").is_some());
}

#[test]
fn amine_hydrochloride_to_ph_12_needs_one_equivalent_plus_free_hydroxide() {
    // Triethylamine hydrochloride, 1.0 mmol in 50 mL, solid NaOH (no volume added).
    // Independent calculation from the charge balance, ideal activities, closed system, 25 °C:
    // Na+ + H+ + BH+ = Cl- + OH-, so
    // n(NaOH) = n(Cl-) - n(BH+) + (OH- - H+) V with BH+ = n / (1 + 10^(12 - pKa)).
    let o = phdose(
        "hcl-salt",
        &[
            "adjust",
            "--solute",
            "CCN(CC)CC.Cl",
            "1mmol",
            "--water",
            "50mL",
            "--to-ph",
            "12",
            "--reagent",
            "naoh",
            "--stock",
            "solid",
            "--ideal",
            "--co2",
            "closed",
            "--format",
            "json",
        ],
    );
    let v = json(&o);
    let pka = v["solutes"][0]["sites"][0]["pka"].as_f64().unwrap();
    let n = 1.0e-3;
    let v_l = 0.050;
    // Kw at 25 °C from the Harned & Robinson (1940) fit, log10 Kw = -4470.99/T + 6.0875 -
    // 0.01706 T (pKw 13.9947; Bandura & Lvov 2006 give 13.995).
    let t = 298.15;
    let kw = 10f64.powf(-4470.99 / t + 6.0875 - 0.01706 * t);
    let bh = n / (1.0 + 10f64.powf(12.0 - pka));
    let expected = n - bh + (kw / 1e-12 - 1e-12) * v_l;
    let got = v["reagent_mol"].as_f64().unwrap();
    assert!(
        ((got - expected) / expected).abs() < 1e-6,
        "got {got}, expected {expected}"
    );
    assert!(v["reagent_mass_g"].as_f64().unwrap() > 0.0);
}

#[test]
fn several_targets_give_an_array_in_order() {
    let v = json(&phdose(
        "multi",
        &[
            "adjust",
            "--solute",
            "CC(=O)O 2mmol",
            "--water",
            "50mL",
            "--to-ph",
            "4,7,10",
            "--reagent",
            "naoh",
            "--format",
            "json",
        ],
    ));
    let arr = v.as_array().unwrap();
    assert_eq!(arr.len(), 3);
    let amounts: Vec<f64> = arr
        .iter()
        .map(|r| r["reagent_mol"].as_f64().unwrap())
        .collect();
    assert!(
        amounts[0] < amounts[1] && amounts[1] < amounts[2],
        "{amounts:?}"
    );
}

#[test]
fn bad_amounts_volumes_ph_and_reagents_exit_2() {
    let base = [
        "adjust",
        "--solute",
        "CCN",
        "1mmol",
        "--water",
        "50mL",
        "--to-ph",
        "3",
        "--reagent",
        "hcl",
    ];
    let cases: Vec<(Vec<&str>, &str)> = vec![
        (
            vec![
                "adjust",
                "--solute",
                "CCN",
                "1mmoll",
                "--water",
                "50mL",
                "--to-ph",
                "3",
                "--reagent",
                "hcl",
            ],
            "amount",
        ),
        (
            vec![
                "adjust",
                "--solute",
                "CCN",
                "1mmol",
                "--water",
                "50 gallons",
                "--to-ph",
                "3",
                "--reagent",
                "hcl",
            ],
            "volume",
        ),
        (
            vec![
                "adjust",
                "--solute",
                "CCN",
                "1mmol",
                "--water",
                "50mL",
                "--to-ph",
                "21",
                "--reagent",
                "hcl",
            ],
            "pH",
        ),
        (
            vec![
                "adjust",
                "--solute",
                "CCN",
                "1mmol",
                "--water",
                "50mL",
                "--to-ph",
                "3",
                "--reagent",
                "vinegar",
            ],
            "vinegar",
        ),
        (
            vec![
                "adjust",
                "--solute",
                "CCN",
                "1mmol",
                "--water",
                "50mL",
                "--to-ph",
                "3",
                "--reagent",
                "hcl",
                "--stock",
                "3.7M",
            ],
            "offered",
        ),
        (
            vec![
                "adjust",
                "--solute",
                "C1CCN",
                "1mmol",
                "--water",
                "50mL",
                "--to-ph",
                "3",
                "--reagent",
                "hcl",
            ],
            "SMILES",
        ),
        (
            [&base[..], &["--organic", "40mL", "--solvent", "benzine"]].concat(),
            "known: ethyl acetate, diethyl ether",
        ),
        (
            [&base[..], &["--organic", "40mL"]].concat(),
            "--organic needs --solvent",
        ),
        ([&base[..], &["--washes", "2"]].concat(), "--washes needs"),
        (
            [
                &base[..],
                &["--organic", "40mL", "--solvent", "ether", "--washes", "0"],
            ]
            .concat(),
            "1 to 20",
        ),
        ([&base[..], &["--temp", "75"]].concat(), "outside 0-60"),
        (
            [&base[..], &["--co2", "open"]].concat(),
            "closed, vented or air",
        ),
        ([&base[..], &["--pka", "CCN", "9.1,3.3"]].concat(), "site"),
    ];
    for (args, needle) in cases {
        let o = phdose("bad", &args);
        assert_eq!(o.status.code(), Some(2), "{args:?}: {}", stderr(&o));
        assert!(stderr(&o).contains(needle), "{args:?}: {}", stderr(&o));
        assert!(!stderr(&o).contains("panicked"));
    }
}

#[test]
fn unreachable_target_exits_3_with_the_range_and_an_alternative() {
    // Saturated NaHCO3 cannot lift a layer much above pH 8.3 (common practice).
    let o = phdose(
        "unreachable",
        &[
            "adjust",
            "--solute",
            "CC(=O)O",
            "1mmol",
            "--water",
            "50mL",
            "--to-ph",
            "11",
            "--reagent",
            "nahco3",
            "--stock",
            "sat",
        ],
    );
    assert_eq!(o.status.code(), Some(3), "{}", stderr(&o));
    let err = stderr(&o);
    assert!(err.contains("naoh"), "{err}");
    // With Davies activities (default) the saturated stock's own pH is 8.1-8.3: the
    // amphiprotic ½(pK1 + pK2) = 8.34 lowered by ½ log γ(CO3--) at its high ionic strength.
    let limit: f64 = err
        .split("at most ")
        .nth(1)
        .and_then(|t| t.split_whitespace().next())
        .and_then(|t| t.parse().ok())
        .unwrap_or_else(|| panic!("no limit in: {err}"));
    assert!((8.0..8.4).contains(&limit), "{err}");
}

#[test]
fn pka_override_replaces_the_estimate() {
    let v = json(&phdose(
        "override",
        &[
            "adjust",
            "--solute",
            "CCN",
            "1mmol",
            "--water",
            "50mL",
            "--to-ph",
            "7",
            "--reagent",
            "hcl",
            "--pka",
            "CCN",
            "10.0",
            "--format",
            "json",
        ],
    ));
    let site = &v["solutes"][0]["sites"][0];
    assert_eq!(site["pka"], 10.0);
    assert_eq!(site["source"], "given with --pka");
}

#[test]
fn demo_runs_end_to_end() {
    let o = phdose("demo", &["demo"]);
    assert!(o.status.success(), "{}", stderr(&o));
    let text = stdout(&o);
    assert!(text.contains("Wash 1") && text.contains("Wash 2"), "{text}");
    assert!(text.contains("SDS"));
    let v = json(&phdose("demo-json", &["demo", "--format", "json"]));
    assert_eq!(v["washes"].as_array().unwrap().len(), 2);
}

#[test]
fn a_foreign_file_at_the_store_path_is_refused_and_left_untouched() {
    let path = temp_db("foreign");
    std::fs::write(&path, b"this is not a database, it is a shopping list\n").unwrap();
    let before = std::fs::read(&path).unwrap();
    let o = Command::new(env!("CARGO_BIN_EXE_phdose"))
        .args(["pka", "CCO", "--db"])
        .arg(&path)
        .output()
        .unwrap();
    assert_eq!(o.status.code(), Some(1), "{}", stderr(&o));
    assert!(stderr(&o).contains("not a phdose store"), "{}", stderr(&o));
    assert_eq!(std::fs::read(&path).unwrap(), before);
}

#[test]
fn info_reports_logp_and_its_source() {
    // Phenol: handbook logP 1.46 (Hansch, Leo & Hoekman 1995, from memory) wins over the
    // estimate; with --estimate-only the Wildman-Crippen value, 1.3922 per RDKit 2026.09.1
    // Crippen.MolLogP (tests/reference/logp.csv).
    let v = json(&phdose(
        "info-logp",
        &["info", "Oc1ccccc1", "--format", "json"],
    ));
    assert_eq!(v["logp"].as_f64(), Some(1.46), "{v}");
    assert!(v["logp_source"].as_str().unwrap().starts_with("measured"));
    let v = json(&phdose(
        "info-logp-est",
        &["info", "Oc1ccccc1", "--estimate-only", "--format", "json"],
    ));
    assert!((v["logp"].as_f64().unwrap() - 1.3922).abs() < 0.001, "{v}");
    assert!(v["logp_source"].as_str().unwrap().starts_with("estimate"));
}

fn temp_db(name: &str) -> PathBuf {
    common::temp_db("cli", name)
}

fn phdose(name: &str, args: &[&str]) -> Output {
    common::phdose("cli", name, args)
}
