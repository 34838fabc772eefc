//! `phdose curve` end to end: the printed table against Henderson–Hasselbalch worked out here,
//! the SVG figure as well-formed XML with one curve per compound, its labels and marks, and
//! the exit code for bad input. Each test uses its own temporary store through `--db`.

use std::path::PathBuf;
use std::process::{Command, Output};

use serde_json::Value;

fn temp_dir(name: &str) -> PathBuf {
    let dir = std::env::temp_dir().join(format!("phdose-curve-{}-{name}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    dir
}

fn phdose(name: &str, args: &[&str]) -> Output {
    Command::new(env!("CARGO_BIN_EXE_phdose"))
        .args(args)
        .arg("--db")
        .arg(temp_dir(name).join("store.sqlite"))
        .output()
        .expect("phdose runs")
}

fn stdout(o: &Output) -> String {
    String::from_utf8_lossy(&o.stdout).into_owned()
}

fn stderr(o: &Output) -> String {
    String::from_utf8_lossy(&o.stderr).into_owned()
}

/// The one pKa `phdose pka` reports for `smiles`, and its kind.
fn single_site(name: &str, smiles: &str) -> (String, f64) {
    let o = phdose(name, &["pka", smiles, "--format", "json"]);
    assert!(o.status.success(), "{}", stderr(&o));
    let v: Value = serde_json::from_slice(&o.stdout).unwrap();
    let sites = v[0]["sites"].as_array().unwrap();
    assert_eq!(sites.len(), 1, "{smiles} should have one site: {v}");
    (
        sites[0]["kind"].as_str().unwrap().to_string(),
        sites[0]["pka"].as_f64().unwrap(),
    )
}

#[test]
fn table_fractions_follow_henderson_hasselbalch_for_one_site_acid_and_base() {
    // Henderson–Hasselbalch (common practice): for an acid HA, [A-]/[HA] = 10^(pH - pKa);
    // for a base B, [BH+]/[B] = 10^(pKa - pH). Fraction ionized = ratio / (1 + ratio).
    let cases = [("CC(=O)O", "acid"), ("CCN", "base")];
    let o = phdose("hh", &["curve", cases[0].0, cases[1].0, "--format", "csv"]);
    assert!(o.status.success(), "{}", stderr(&o));
    let mut reader = csv::Reader::from_reader(o.stdout.as_slice());
    let rows: Vec<csv::StringRecord> = reader.records().map(|r| r.unwrap()).collect();
    assert_eq!(rows.len(), 2 * 15, "pH 0..14 by 1 for each compound");
    for (smiles, kind) in cases {
        let (found_kind, pka) = single_site("hh", smiles);
        assert_eq!(found_kind, kind);
        let mine: Vec<_> = rows.iter().filter(|r| &r[0] == smiles).collect();
        assert_eq!(mine.len(), 15);
        for (i, row) in mine.iter().enumerate() {
            let ph: f64 = row[1].parse().unwrap();
            assert_eq!(ph, i as f64);
            let ratio = match kind {
                "acid" => 10f64.powf(ph - pka),
                _ => 10f64.powf(pka - ph),
            };
            let expected = ratio / (1.0 + ratio);
            let got: f64 = row[2].parse().unwrap();
            assert!(
                (got - expected).abs() < 1e-9,
                "{smiles} at pH {ph}: {got} vs {expected}"
            );
            // Mean charge: -f for the acid, +f for the base.
            let charge: f64 = row[4].parse().unwrap();
            let sign = if kind == "acid" { -1.0 } else { 1.0 };
            assert!((charge - sign * expected).abs() < 1e-9);
        }
    }
}

#[test]
fn default_table_has_a_row_per_ph_and_names_the_svg_file() {
    let dir = temp_dir("table");
    let svg = dir.join("curves.svg");
    let o = phdose(
        "table",
        &["curve", "CC(=O)O", "--svg", svg.to_str().unwrap()],
    );
    assert!(o.status.success(), "{}", stderr(&o));
    let out = stdout(&o);
    for ph in 0..=14 {
        assert!(
            out.contains(&format!("│ {ph}.00 ")),
            "pH {ph} row missing:\n{out}"
        );
    }
    assert!(
        out.contains(&format!("SVG written to {}", svg.display())),
        "{out}"
    );
    assert!(svg.exists());
}

#[test]
fn svg_is_well_formed_with_one_curve_per_compound_its_labels_and_marks() {
    let dir = temp_dir("svg");
    let svg = dir.join("figure.svg");
    let given = ["CC(=O)O", "CCN", "Oc1ccccc1"];
    let mut args = vec!["curve"];
    args.extend(given);
    args.extend(["--mark", "7.4,2", "--svg", svg.to_str().unwrap()]);
    let o = phdose("svg", &args);
    assert!(o.status.success(), "{}", stderr(&o));
    let text = std::fs::read_to_string(&svg).unwrap();
    let doc = roxmltree::Document::parse(&text).expect("well-formed XML");
    let root = doc.root_element();
    assert_eq!(root.tag_name().name(), "svg");
    assert_eq!(
        root.tag_name().namespace(),
        Some("http://www.w3.org/2000/svg")
    );
    assert!(root.attribute("viewBox").is_some());
    // Inline-ready: no ids to clash with another figure on the same page.
    assert!(doc.descendants().all(|n| n.attribute("id").is_none()));

    // Two panels (fraction ionized, then logD: each compound has a neutral parent, so a
    // logP), and each holds exactly one curve per compound.
    let panels: Vec<_> = doc
        .descendants()
        .filter(|n| n.attribute("class") == Some("panel"))
        .collect();
    assert_eq!(panels.len(), 2);
    for panel in &panels {
        let curves = panel
            .descendants()
            .filter(|n| n.tag_name().name() == "path" && n.attribute("class") == Some("curve"))
            .count();
        assert_eq!(curves, given.len());
    }

    let texts: Vec<String> = doc
        .descendants()
        .filter(|n| n.tag_name().name() == "text")
        .map(|n| n.text().unwrap_or("").to_string())
        .collect();
    let has = |needle: &str| texts.iter().any(|t| t.contains(needle));
    for smiles in given {
        // Legend rows carry the SMILES exactly as given.
        assert!(has(smiles), "no label for {smiles}: {texts:?}");
    }
    // Each compound's pKa, as `phdose pka` gives it, labels its curve.
    for smiles in given {
        let (_, pka) = single_site("svg", smiles);
        let label = format!("pKa {pka:.2}");
        let label = label.trim_end_matches('0').trim_end_matches('.');
        assert!(has(label), "no '{label}' in {texts:?}");
    }
    // Two marks, each a labelled vertical line across both panels.
    assert!(has("pH 7.4") && has("pH 2"), "{texts:?}");
    let marks: Vec<_> = doc
        .descendants()
        .filter(|n| n.attribute("class") == Some("mark"))
        .collect();
    assert_eq!(marks.len(), 2 * panels.len());
    for m in &marks {
        assert_eq!(m.attribute("x1"), m.attribute("x2"), "vertical");
    }
    // Three compounds: the widest-gap window is shaded and named.
    assert!(
        doc.descendants()
            .any(|n| n.attribute("class") == Some("band"))
    );
    assert!(has("widest gap"), "{texts:?}");
    assert!(has("logD (octanol/water)"), "{texts:?}");
}

#[test]
fn json_carries_the_smiles_as_given_and_the_widest_gap() {
    let o = phdose(
        "json",
        &["curve", "CC(=O)[O-].[Na+]", "CCN", "--format", "json"],
    );
    assert!(o.status.success(), "{}", stderr(&o));
    let v: Value = serde_json::from_slice(&o.stdout).unwrap();
    assert_eq!(v["compounds"][0]["smiles"], "CC(=O)[O-].[Na+]");
    assert_eq!(v["compounds"][0]["points"].as_array().unwrap().len(), 15);
    // Acetate and ethylamine: the salt's parent is acetic acid, so below its pKa the amine
    // alone is ionized, and above the amine's pKa the acid alone (common practice).
    // logD = logP + log10(fraction neutral) (design §3), at every pH of the table.
    for c in v["compounds"].as_array().unwrap() {
        let logp = c["logp"].as_f64().expect("a neutral parent has a logP");
        assert!(c["logp_source"].is_string());
        for p in c["points"].as_array().unwrap() {
            let f = p["fraction_neutral"].as_f64().unwrap();
            let logd = p["logd"].as_f64().unwrap();
            assert!((logd - (logp + f.log10())).abs() < 1e-9, "{p}");
        }
    }
    let gap = &v["widest_gap"];
    assert_eq!(gap["first"], "CC(=O)[O-].[Na+]");
    assert_eq!(gap["second"], "CCN");
    assert!(gap["difference"].as_f64().unwrap() > 0.95, "{gap}");
}

#[test]
fn bad_input_exits_2() {
    let bad: [&[&str]; 5] = [
        &["curve", "CC(=O)X"],
        &["curve", "CCO", "C1CC"],
        &["curve", "CCO", "--from", "9", "--to", "3"],
        &["curve", "CCO", "--mark", "15", "--to", "14"],
        &["curve", "CCO", "--mark", "7,x"],
    ];
    for args in bad {
        let o = phdose("bad", args);
        assert_eq!(o.status.code(), Some(2), "{args:?}: {}", stderr(&o));
        assert!(!stderr(&o).contains("panicked"));
    }
    // The caret points at the typo.
    let o = phdose("bad", &["curve", "CC(=O)X"]);
    assert!(stderr(&o).contains("position 7"), "{}", stderr(&o));
}
