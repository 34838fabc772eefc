//! `plan` and two-layer `adjust`: the classic acid-base separation scheme (common practice:
//! an amine goes into dilute acid, a carboxylic acid into a mild base, a phenol only into
//! strong base, a neutral compound stays in the organic layer), reproduced by the planner
//! from the model; a pair it cannot split; and the command-line contracts with exit codes.

mod common;

use std::process::Output;

use phdose::acidity::Handbook;
use phdose::equilibrium::{Conditions, Reagent};
use phdose::units::Amount;
use phdose::workup::adjust::SoluteInput;
use phdose::workup::plan::{PlanRequest, plan};
use serde_json::Value;

fn solute(smiles: &str, mmol: f64) -> SoluteInput {
    SoluteInput {
        smiles: smiles.into(),
        amount: Amount::Moles(mmol * 1e-3),
        pka_override: None,
    }
}

fn request(solutes: Vec<SoluteInput>, solvent: &str) -> PlanRequest {
    PlanRequest {
        solutes,
        solvent: solvent.into(),
        organic_l: 0.060,
        water_l: None,
        keep: None,
        conditions: Conditions::standard(),
    }
}

const ACID: &str = "Cc1ccc(cc1)C(=O)O"; // 4-methylbenzoic acid
const PHENOL: &str = "Oc1ccc(Cl)cc1"; // 4-chlorophenol
const AMINE: &str = "CNCc1ccccc1"; // N-benzylmethylamine
const ESTER: &str = "CCOC(=O)c1ccc(C)cc1"; // ethyl 4-methylbenzoate

/// Four compounds, four fractions, each >= 95 % pure by mass (issue 5 item 6); the amine
/// leaves with acid, the carboxylic acid at a lower pH than the phenol, the ester stays.
#[test]
fn four_compounds_four_fractions() {
    let handbook = Handbook::builtin_measured().unwrap();
    let catalogue = Reagent::builtin().unwrap();
    let mut r = request(
        vec![
            solute(ACID, 2.0),
            solute(PHENOL, 2.0),
            solute(AMINE, 2.0),
            solute(ESTER, 2.0),
        ],
        "ethyl acetate",
    );
    r.keep = Some(ESTER.into());
    let p = plan(&r, &handbook, &catalogue).unwrap();
    assert_eq!(p.fractions.len(), 4, "{:#?}", p.fractions);
    for f in &p.fractions {
        assert_eq!(f.smiles.len(), 1, "{f:?}");
        assert!(f.purity >= 0.95, "{f:?}");
        assert!(f.recovery >= 0.9, "{f:?}");
    }
    let step_of = |smiles: &str| p.steps.iter().find(|s| s.moves == vec![smiles.to_string()]);
    let (amine, acid, phenol) = (
        step_of(AMINE).unwrap(),
        step_of(ACID).unwrap(),
        step_of(PHENOL).unwrap(),
    );
    assert!(amine.ph < 7.0 && acid.ph > 6.0 && phenol.ph > acid.ph + 2.0);
    assert_eq!(p.fractions.last().unwrap().layer, "organic");
    assert_eq!(p.fractions.last().unwrap().smiles, vec![ESTER.to_string()]);
    // Each step's reagent amount includes what the solutes consume: the acid step needs at
    // least the 2 mmol of carboxylic acid in base.
    assert!(acid.reagent_mol >= 2e-3 * 0.5, "{}", acid.reagent_mol);
    // Every aqueous fraction can be brought back: acidified or basified, then extracted.
    assert_eq!(p.recoveries.len(), 3);
    for rec in &p.recoveries {
        assert!(rec.extracted > 0.9, "{rec:?}");
    }
    let amine_back = p
        .recoveries
        .iter()
        .find(|x| x.smiles == vec![AMINE.to_string()]);
    assert!(amine_back.unwrap().ph > 10.0);
    assert!(
        p.notes
            .iter()
            .any(|n| n.contains("(kept) ends in the organic"))
    );
}

/// Benzoic acid (pKa 4.20) and 4-methylbenzoic acid (4.36) (CRC Handbook values, from
/// memory): no pH separates them, and the plan says so.
#[test]
fn two_acids_with_nearly_equal_pka_are_not_separated() {
    let handbook = Handbook::builtin_measured().unwrap();
    let catalogue = Reagent::builtin().unwrap();
    let r = request(
        vec![solute("OC(=O)c1ccccc1", 2.0), solute(ACID, 2.0)],
        "ether",
    );
    let p = plan(&r, &handbook, &catalogue).unwrap();
    assert!(
        p.notes.iter().any(|n| n.starts_with("No pH separates")),
        "{:?}",
        p.notes
    );
    assert_eq!(p.fractions.len(), 1);
    assert_eq!(p.fractions[0].smiles.len(), 2);
}

/// Glycine is a zwitterion at every pH: it never leaves water, and the plan says so.
#[test]
fn zwitterion_never_leaves_water() {
    let handbook = Handbook::builtin_measured().unwrap();
    let catalogue = Reagent::builtin().unwrap();
    let r = request(vec![solute("NCC(=O)O", 1.0), solute(ESTER, 1.0)], "ether");
    let p = plan(&r, &handbook, &catalogue).unwrap();
    assert!(
        p.notes
            .iter()
            .any(|n| n.contains("NCC(=O)O will not leave water")),
        "{:?}",
        p.notes
    );
}

#[test]
fn plan_json_keys_and_exit_codes() {
    let o = phdose(
        "json",
        &[
            "plan",
            "--solute",
            AMINE,
            "2mmol",
            "--solute",
            ESTER,
            "2mmol",
            "--organic",
            "50mL",
            "--solvent",
            "dcm",
            "--format",
            "json",
        ],
    );
    assert!(o.status.success(), "{}", String::from_utf8_lossy(&o.stderr));
    let v: Value = serde_json::from_slice(&o.stdout).unwrap();
    let step = &v["steps"][0];
    for key in ["ph", "reagent", "reagent_mol", "moves"] {
        assert!(!step[key].is_null(), "{key}");
    }
    assert_eq!(step["moves"][0], AMINE);
    for f in v["fractions"].as_array().unwrap() {
        for key in ["layer", "smiles", "purity", "recovery"] {
            assert!(!f[key].is_null(), "{key}");
        }
    }
    assert!(v["notes"].is_array());
    assert_eq!(v["organic_layer"], "lower");
    assert!(v["cautions"].to_string().contains("lower one"));

    let bad = phdose(
        "bad",
        &[
            "plan",
            "--solute",
            ESTER,
            "1mmol",
            "--organic",
            "50mL",
            "--solvent",
            "benzine",
        ],
    );
    assert_eq!(bad.status.code(), Some(2));
    let err = String::from_utf8_lossy(&bad.stderr);
    assert!(
        err.contains("unknown solvent") && err.contains("toluene"),
        "{err}"
    );
    let keep = phdose(
        "keep",
        &[
            "plan",
            "--solute",
            ESTER,
            "1mmol",
            "--organic",
            "50mL",
            "--solvent",
            "ether",
            "--keep",
            "CCO",
        ],
    );
    assert_eq!(keep.status.code(), Some(2));
}

/// adjust with two layers: a carboxylic acid at pH 8 in bicarbonate leaves the organic layer;
/// the shares add up, the layer positions and the chlorinated-solvent caution are there.
#[test]
fn adjust_two_layers_json() {
    let o = phdose(
        "adjust",
        &[
            "adjust",
            "--solute",
            ACID,
            "1mmol",
            "--solute",
            ESTER,
            "1mmol",
            "--water",
            "30mL",
            "--organic",
            "40mL",
            "--solvent",
            "dcm",
            "--to-ph",
            "7.5",
            "--reagent",
            "nahco3",
            "--washes",
            "2",
            "--format",
            "json",
        ],
    );
    assert!(o.status.success(), "{}", String::from_utf8_lossy(&o.stderr));
    let v: Value = serde_json::from_slice(&o.stdout).unwrap();
    let solutes = v["solutes"].as_array().unwrap();
    for s in solutes {
        let (a, b) = (
            s["fraction_aqueous"].as_f64().unwrap(),
            s["fraction_organic"].as_f64().unwrap(),
        );
        assert!((a + b - 1.0).abs() < 1e-12);
    }
    assert!(solutes[0]["fraction_aqueous"].as_f64().unwrap() > 0.99);
    assert!(solutes[1]["fraction_aqueous"].as_f64().unwrap() < 0.05);
    assert_eq!(v["layers"]["organic"], "lower");
    assert_eq!(v["washes"].as_array().unwrap().len(), 2);
    assert!(v["cautions"].to_string().contains("lower one"));
}

fn phdose(name: &str, args: &[&str]) -> Output {
    common::phdose("plan", name, args)
}
