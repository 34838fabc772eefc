//! Formula and molar mass checked against RDKit: tests/reference/formula.csv holds
//! `rdMolDescriptors.CalcMolFormula` and `Descriptors.MolWt` for each SMILES, written by
//! tests/reference/make_formula_fixture.py (RDKit's version is in the fixture header).

use phdose::chem::formula::{formula, molar_mass};
use phdose::chem::molecule::Molecule;

const FIXTURE: &str = include_str!("reference/formula.csv");

/// RDKit prints carbon-free formulas with hydrogen first (`HBr`); the Hill system, which
/// phdose follows, orders them alphabetically (`BrH`). Formulas with carbon are left alone.
fn rdkit_to_hill(formula: &str) -> String {
    let (body, charge) = match formula.find(['+', '-']) {
        Some(i) => formula.split_at(i),
        None => (formula, ""),
    };
    let mut parts: Vec<(String, String)> = Vec::new();
    for c in body.chars() {
        if c.is_ascii_uppercase() || c == '*' {
            parts.push((c.to_string(), String::new()));
        } else if c.is_ascii_lowercase() {
            parts.last_mut().unwrap().0.push(c);
        } else {
            parts.last_mut().unwrap().1.push(c);
        }
    }
    if parts.iter().any(|(e, _)| e == "C") {
        return formula.to_string();
    }
    parts.sort();
    parts
        .iter()
        .map(|(e, n)| format!("{e}{n}"))
        .collect::<String>()
        + charge
}

#[test]
fn formula_and_molar_mass_match_rdkit() {
    let mut reader = csv::ReaderBuilder::new()
        .comment(Some(b'#'))
        .from_reader(FIXTURE.as_bytes());
    let mut rows = 0;
    let mut wrong = Vec::new();
    for record in reader.records() {
        let r = record.unwrap();
        let (name, smiles, expected) = (&r[0], &r[1], &r[2]);
        let expected_mass: f64 = r[3].parse().unwrap();
        let mol = Molecule::from_smiles(smiles)
            .unwrap_or_else(|e| panic!("{name} ({smiles}) does not parse: {e}"));
        let found = formula(&mol);
        let expected = &rdkit_to_hill(expected);
        if found != *expected {
            wrong.push(format!(
                "{name} {smiles}: formula RDKit {expected}, phdose {found}"
            ));
        }
        let mass = molar_mass(&mol);
        if (mass - expected_mass).abs() > 0.001 {
            wrong.push(format!(
                "{name} {smiles}: mass RDKit {expected_mass}, phdose {mass}"
            ));
        }
        rows += 1;
    }
    assert!(rows >= 40, "fixture has only {rows} rows");
    assert!(
        wrong.is_empty(),
        "{} mismatches:\n{}",
        wrong.len(),
        wrong.join("\n")
    );
}
