//! Interacting sites in the aqueous equilibrium, checked against handbook constants and
//! against microstate sums written out here by hand: zwitterions, charge balance with coupled
//! sites, activity weights by charge, and the edges (no site, more sites than microstates).

use std::process::Command;

use phdose::acidity::{Handbook, Profile};
use phdose::equilibrium::{AqueousLayer, Conditions, Coupling, Protolyte, Site, solve_ph};

fn profile(smiles: &str) -> Profile {
    Profile::new(smiles, &Handbook::builtin().unwrap()).unwrap()
}

/// Glycine as two coupled sites: amine 7.66 (glycine methyl ester, the ammonium with the COOH
/// intact; Perrin 1965, from memory) and COOH 2.34 + 9.60 - 7.66 = 4.28, coupled by the
/// distance-3 opposite-charge shift of data/site_interactions.csv.
fn glycine(total_mol: f64) -> Protolyte {
    let p = profile("NCC(=O)O");
    let shift = p.parent_couplings(0)[0].shift;
    Protolyte::new(total_mol, vec![Site::base(7.66), Site::acid(4.28)], 0.0)
        .with_couplings(vec![Coupling { a: 0, b: 1, shift }])
}

#[test]
fn glycine_at_ph_6_is_a_zwitterion_not_a_neutral_molecule() {
    // Independent calculation from the handbook macroscopic constants 2.34 and 9.60 (CRC
    // Handbook, from memory) and the microconstant k_N = 10^-7.66 of the cation losing its
    // ammonium proton first: the cation gives the uncharged form with k_N and the zwitterion
    // with K1 - k_N, so [N] = k_N h / (h² + K1 h + K1 K2) of the total.
    let ph: f64 = 6.0;
    let h = 10f64.powf(-ph);
    let (k1, k2, kn) = (10f64.powf(-2.34), 10f64.powf(-9.60), 10f64.powf(-7.66));
    let denominator = h * h + k1 * h + k1 * k2;
    let neutral = kn * h / denominator;
    let zwitterion = (k1 - kn) * h / denominator;
    let state = glycine(1e-3).state(ph);
    assert!(
        (state.fraction_neutral.log10() - neutral.log10()).abs() < 0.1,
        "{} vs {neutral}",
        state.fraction_neutral
    );
    assert!(state.fraction_neutral < 1e-4);
    assert!(zwitterion > 0.99 && state.mean_charge.abs() < 0.01);
    // Both sites ionized together: the zwitterion share is at least the overlap.
    let f = &state.fraction_ionized;
    assert!(f[0] + f[1] - 1.0 > 0.99 * zwitterion - 1e-9);
}

#[test]
fn glycine_from_smiles_is_a_zwitterion_whatever_the_estimates() {
    // Whatever the two estimates, an amine far above a carboxylic acid gives a molecule that is
    // charged at both ends near pH 6 (common practice): almost none of it is extractable.
    let p = profile("NCC(=O)O");
    let (solutes, _, _) = p.protolytes(1e-3);
    let s = solutes[0].state(6.0);
    assert!(s.fraction_neutral < 1e-3, "{}", s.fraction_neutral);
    assert!(s.mean_charge.abs() < 0.05);
}

#[test]
fn charge_balance_closes_with_coupled_sites() {
    // 1 mmol glycine and 0.3 mmol NaOH in 50 mL. At the solved pH the charge balance, summed
    // here over glycine's four microstates written out by hand, must close.
    let c = Conditions::standard();
    let gly = glycine(1e-3);
    let shift = gly.couplings[0].shift;
    let mut layer = AqueousLayer {
        solutes: vec![gly],
        ..AqueousLayer::water(0.05)
    };
    layer.strong_cations_mol = 0.3e-3;
    let eq = solve_ph(&layer, &c).unwrap();
    let ph = eq.ph;
    let cation = 10f64.powf(7.66 - ph);
    let neutral = 1.0;
    let zwitterion = 10f64.powf((7.66 - ph) + (ph - 4.28) + shift);
    let anion = 10f64.powf(ph - 4.28);
    let mean = (cation - anion) / (cation + neutral + zwitterion + anion);
    let h = 10f64.powf(-ph);
    let balance = h + 0.3e-3 / 0.05 + 1e-3 / 0.05 * mean - c.kw() / h;
    assert!(balance.abs() < 1e-9, "residual {balance} at pH {ph}");
    // Past the first equivalence region, on the zwitterion/anion buffer: pH near pK2 less a
    // bit (0.3 of 1 base equivalent: pH ≈ 9.60 + log(0.3/0.7), Henderson–Hasselbalch).
    assert!(
        (ph - (9.60 + (0.3f64 / 0.7).log10())).abs() < 0.15,
        "pH {ph}"
    );
}

#[test]
fn activity_coefficients_weight_each_charge_level() {
    // With log10 γ(z) = -0.1 z², each microstate weight is divided by its γ: the cation and the
    // anion gain 10^0.1 against the zwitterion and the uncharged form.
    let gly = glycine(1e-3);
    let shift = gly.couplings[0].shift;
    let ph = 3.0;
    let g = |z: i32| -0.1 * (z * z) as f64;
    let s = gly.state_with(ph, &g);
    let cation = 10f64.powf(7.66 - ph + 0.1);
    let zwitterion = 10f64.powf(7.66 - 4.28 + shift);
    let anion = 10f64.powf(ph - 4.28 + 0.1);
    let total = cation + 1.0 + zwitterion + anion;
    assert!((s.mean_charge - (cation - anion) / total).abs() < 1e-12);
    assert!((s.fraction_neutral - 1.0 / total).abs() < 1e-15);
    assert_eq!(gly.state(ph), gly.state_with(ph, &|_| 0.0));
}

#[test]
fn mean_charge_falls_as_ph_rises() {
    // EDTA, lysine, ethylenediamine: mean charge never rises with pH (its slope is
    // -ln 10 times the variance of the charge).
    for smiles in [
        "OC(=O)CN(CC(=O)O)CCN(CC(=O)O)CC(=O)O",
        "NC(CCCCN)C(=O)O",
        "NCCN",
    ] {
        let (solutes, _, _) = profile(smiles).protolytes(1e-3);
        let mut last = f64::INFINITY;
        for k in 0..=160 {
            let z = solutes[0].mean_charge(-1.0 + 0.1 * k as f64);
            assert!(z <= last + 1e-12, "{smiles}");
            last = z;
        }
    }
}

#[test]
fn no_site_and_twelve_sites() {
    let ethane = profile("CC");
    let k = ethane.constants();
    assert!(k.macro_pka.is_empty() && k.sites.is_empty());
    let (solutes, _, _) = ethane.protolytes(1e-3);
    assert_eq!(solutes[0].fraction_neutral(7.0), 1.0);

    // Twelve carboxylic acids on one chain: beyond the microstate limit, sites become
    // independent and the report says so.
    let smiles = "C(C(=O)O)".repeat(12);
    let p = profile(&smiles);
    assert_eq!(p.sites.len(), 12);
    let k = p.constants();
    assert_eq!(k.macro_pka.len(), 12);
    assert!(k.note.is_some());
    let (solutes, cations, anions) = p.protolytes(1e-4);
    let layer = AqueousLayer {
        solutes,
        strong_cations_mol: cations,
        strong_anions_mol: anions,
        ..AqueousLayer::water(0.1)
    };
    let eq = solve_ph(&layer, &Conditions::standard()).unwrap();
    assert!(eq.ph.is_finite() && eq.ph < 7.0);
}

#[test]
fn pka_json_reports_macro_and_site_constants() {
    let db = std::env::temp_dir().join(format!("phdose-interplay-{}", std::process::id()));
    std::fs::create_dir_all(&db).unwrap();
    let out = Command::new(env!("CARGO_BIN_EXE_phdose"))
        .args(["--format", "json", "pka", "NCCN"])
        .arg("--db")
        .arg(db.join("store.sqlite"))
        .output()
        .unwrap();
    assert!(
        out.status.success(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    let v: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    let r = &v[0];
    for key in ["smiles", "sites", "error", "macro_pka", "site_constants"] {
        assert!(r.get(key).is_some(), "missing {key}");
    }
    // Ethylenediamine 9.93 and 6.85 (CRC Handbook, from memory): whatever the estimate of
    // the two equal amines, the constants lie ΔpK ≈ 3.08 apart.
    let m: Vec<f64> = r["macro_pka"]
        .as_array()
        .unwrap()
        .iter()
        .map(|x| x.as_f64().unwrap())
        .collect();
    assert_eq!(m.len(), 2);
    assert!(((m[1] - m[0]) - (9.93 - 6.85)).abs() < 0.5, "{m:?}");
    assert_eq!(r["site_constants"].as_array().unwrap().len(), 2);
    assert!(r.get("note").is_none(), "one list of notes only: {r}");
    assert!(r["notes"].as_array().unwrap().is_empty(), "{r}");
}

#[test]
fn pka_json_says_in_notes_when_sites_are_independent() {
    // Twelve carboxylic acids: beyond the microstate limit, the one `notes` list says so.
    let db = std::env::temp_dir().join(format!("phdose-interplay-12-{}", std::process::id()));
    std::fs::create_dir_all(&db).unwrap();
    let out = Command::new(env!("CARGO_BIN_EXE_phdose"))
        .args(["--format", "json", "pka"])
        .arg("C(C(=O)O)".repeat(12))
        .arg("--db")
        .arg(db.join("store.sqlite"))
        .output()
        .unwrap();
    assert!(out.status.success());
    let v: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    let r = &v[0];
    assert!(r.get("note").is_none(), "{r}");
    let notes: Vec<&str> = r["notes"]
        .as_array()
        .unwrap()
        .iter()
        .map(|n| n.as_str().unwrap())
        .collect();
    assert!(
        notes.iter().any(|n| n.contains("treated as independent")),
        "{notes:?}"
    );
}

#[test]
fn phosphoric_acid_keeps_its_three_handbook_constants() {
    // Phosphoric acid 2.15, 7.20, 12.35 (Serjeant & Dempsey 1979, from memory). The group table
    // gives its hydroxyls as successive constants, so the site coupling must not add the
    // charge repulsion a second time.
    let macros = profile("OP(=O)(O)O").constants().macro_pka;
    let expected = [2.15, 7.20, 12.35];
    assert_eq!(macros.len(), 3, "{macros:?}");
    for (got, want) in macros.iter().zip(expected) {
        assert!((got - want).abs() < 0.2, "{macros:?}");
    }
}

#[test]
fn sites_on_one_aromatic_ring_interact_through_their_sigma_change() {
    // Handbook macroscopic constants (Serjeant & Dempsey 1979; Perrin 1965; from memory).
    // Two sites meta or para on one ring: the second ionization feels the first through the
    // change of its Hammett sigma (data/ionized_sigma.csv), not the aliphatic distance table.
    for (smiles, handbook, tolerance) in [
        ("O=C(O)c1ccc(C(=O)O)cc1", [3.54, 4.46], 0.2),
        ("O=C(O)c1cccc(C(=O)O)c1", [3.70, 4.60], 0.25),
        ("Nc1ccc(C(=O)O)cc1", [2.41, 4.87], 0.2),
        ("O=C(O)c1cccnc1", [2.07, 4.85], 0.4),
    ] {
        let got = profile(smiles).constants().macro_pka;
        assert_eq!(got.len(), 2, "{smiles}: {got:?}");
        for (g, w) in got.iter().zip(handbook) {
            assert!(
                (g - w).abs() <= tolerance,
                "{smiles}: {got:?} vs {handbook:?}"
            );
        }
    }
    // p-Phenylenediamine 6.31 and 2.97: the second protonation meets an NH3+ para to it
    // (sigma_p 0.60), which the electrostatic distance table (about 0.8) badly under-counts.
    let got = profile("Nc1ccc(N)cc1").constants().macro_pka;
    assert!((got[0] - 2.97).abs() < 0.5, "{got:?}");
    // Nicotine 8.02 and 3.12: the pyridine N meta to a ring carbon that bears the protonated
    // pyrrolidine (CH2NH2 to CH2NMe3+ as the sigma change); the distance table gave 4.6.
    let got = profile("CN1CCC[C@H]1c1cccnc1").constants().macro_pka;
    assert!((got[0] - 3.12).abs() < 0.4, "{got:?}");
}
