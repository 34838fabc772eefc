//! Wildman–Crippen logP and MR checked against RDKit: tests/reference/logp.csv holds
//! `Crippen.MolLogP` and `Crippen.MolMR` for each SMILES, written by
//! tests/reference/make_logp_fixture.py (RDKit's version is in the fixture header).

use phdose::chem::molecule::Molecule;
use phdose::partition::logp::{crippen_logp, crippen_mr};

const FIXTURE: &str = include_str!("reference/logp.csv");

/// The task's agreement threshold with RDKit (logP units; MR uses the same in cm³/mol).
const TOLERANCE: f64 = 0.01;

#[test]
fn logp_and_mr_match_rdkit() {
    let mut reader = csv::ReaderBuilder::new()
        .comment(Some(b'#'))
        .from_reader(FIXTURE.as_bytes());
    let mut rows = 0;
    let mut wrong = Vec::new();
    let mut worst: f64 = 0.0;
    for record in reader.records() {
        let r = record.unwrap();
        let (name, smiles) = (&r[0], &r[1]);
        let expected_logp: f64 = r[2].parse().unwrap();
        let expected_mr: f64 = r[3].parse().unwrap();
        rows += 1;
        let mol = match Molecule::from_smiles(smiles) {
            Ok(m) => m,
            Err(e) => {
                wrong.push(format!("{name} ({smiles}): does not parse: {e}"));
                continue;
            }
        };
        let logp = crippen_logp(&mol).unwrap();
        let mr = crippen_mr(&mol).unwrap();
        worst = worst.max((logp - expected_logp).abs());
        if (logp - expected_logp).abs() > TOLERANCE {
            wrong.push(format!(
                "{name} ({smiles}): logP {logp:.4}, RDKit {expected_logp:.4}"
            ));
        }
        if (mr - expected_mr).abs() > TOLERANCE {
            wrong.push(format!(
                "{name} ({smiles}): MR {mr:.4}, RDKit {expected_mr:.4}"
            ));
        }
    }
    eprintln!("{rows} molecules, largest logP difference from RDKit {worst:.5}");
    assert!(rows >= 200, "fixture has only {rows} rows");
    assert!(
        wrong.is_empty(),
        "{} of {rows} disagree with RDKit:\n{}",
        wrong.len(),
        wrong.join("\n")
    );
}
