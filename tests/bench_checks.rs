//! Outside checks of the equilibrium engine: each value comes from a named handbook, paper or
//! the common practice of the trade, or from an independent calculation written out here.

use phdose::acidity::Handbook;
use phdose::equilibrium::activity::Gammas;
use phdose::equilibrium::dose::with_reagent;
use phdose::equilibrium::{
    Activity, AqueousLayer, Co2Mode, Conditions, Reagent, Stock, StockForm, solve_ph,
};
use phdose::units::Amount;
use phdose::workup::adjust::{Request, SoluteInput, adjust};

fn reagent(name: &str) -> Reagent {
    Reagent::find(&Reagent::builtin().unwrap(), name)
        .unwrap()
        .clone()
}

fn molar(r: &Reagent, form: StockForm) -> f64 {
    match r.offer(&form).unwrap().stock {
        Stock::Solution { molar } => molar,
        Stock::Solid => panic!("{} {form:?} is a solid", r.name),
    }
}

/// `mol` of reagent `name` dissolved to 1 L.
fn solution(name: &str, mol: f64) -> AqueousLayer {
    with_reagent(
        &AqueousLayer::water(1.0),
        &reagent(name),
        &Stock::Solid,
        mol,
    )
}

fn davies(t: f64) -> Conditions {
    Conditions::new(t).unwrap().with_activity(Activity::Davies)
}

#[test]
fn kw_against_the_published_table() {
    // pKw at 0, 25, 50 °C: H. S. Harned and B. B. Owen, The Physical Chemistry of
    // Electrolytic Solutions (3rd ed., 1958), table 15-4-1A, from the e.m.f. data the fit was
    // made from: 14.9435, 13.9965, 13.2617 (from memory). Bandura & Lvov (2006) at 0.1 MPa:
    // 14.946, 13.995, 13.264 (from memory).
    for (t, harned, bandura) in [
        (0.0, 14.9435, 14.946),
        (25.0, 13.9965, 13.995),
        (50.0, 13.2617, 13.264),
    ] {
        let pkw = Conditions::new(t).unwrap().pkw();
        assert!((pkw - harned).abs() < 0.005, "{t} °C: {pkw} vs {harned}");
        assert!((pkw - bandura).abs() < 0.007, "{t} °C: {pkw} vs {bandura}");
    }
}

#[test]
fn carbonic_acid_with_temperature() {
    // pK1 at 0 and 50 °C: 6.579 and 6.285 (Harned & Davis 1943); pK2: 10.625 and 10.172
    // (Harned & Scholes 1941), all from memory; the Plummer & Busenberg fit reproduces them.
    for (t, pk1, pk2) in [(0.0, 6.579, 10.625), (50.0, 6.285, 10.172)] {
        let c = Conditions::new(t).unwrap();
        assert!(
            (c.carbonate_pk1() - pk1).abs() < 0.01,
            "{t}: {}",
            c.carbonate_pk1()
        );
        assert!(
            (c.carbonate_pk2() - pk2).abs() < 0.01,
            "{t}: {}",
            c.carbonate_pk2()
        );
    }
    // CO2 is less soluble warm: Henry's constant 0.0764 at 0 °C, 0.0194 at 50 °C
    // mol/(kg atm) (Weiss 1974, from memory).
    assert!((Conditions::new(0.0).unwrap().co2_henry() - 0.0764).abs() < 0.002);
    assert!((Conditions::new(50.0).unwrap().co2_henry() - 0.0194).abs() < 0.001);
}

#[test]
fn davies_against_published_tables() {
    // Debye–Hückel A (log10, kg^1/2 mol^-1/2): 0.4918 at 0 °C, 0.5115 at 25 °C, 0.5373 at
    // 50 °C (O. N. Manov, R. G. Bates, W. J. Hamer and S. F. Acree, J. Am. Chem. Soc. 65
    // (1943) 1765; from memory; 0.509 at 25 °C in R. A. Robinson and R. H. Stokes,
    // Electrolyte Solutions, 2nd ed. 1959, appendix 7.1).
    for (t, a) in [(0.0, 0.4918), (25.0, 0.5115), (50.0, 0.5373)] {
        let got = Conditions::new(t).unwrap().davies_a();
        assert!((got - a).abs() < 0.004, "{t} °C: A {got} vs {a}");
    }
    // Mean activity coefficients at 25 °C (Robinson & Stokes 1959, appendix 8.10; from
    // memory): NaCl 0.965, 0.902, 0.778 and HCl 0.965, 0.904, 0.796 at 0.001, 0.01, 0.1 m;
    // CaCl2 0.888, 0.732, 0.518. Davies is an approximation: 2 % for 1:1 up to 0.1 m, 4 %
    // for 2:1.
    let a = Conditions::standard().davies_a();
    let one_one = |m: f64| {
        Gammas::Davies {
            a,
            ionic_strength: m,
        }
        .gamma(1)
    };
    for (m, nacl, hcl) in [
        (0.001, 0.965, 0.965),
        (0.01, 0.902, 0.904),
        (0.1, 0.778, 0.796),
    ] {
        let g = one_one(m);
        assert!((g / nacl - 1.0).abs() < 0.02, "NaCl {m}: {g}");
        assert!((g / hcl - 1.0).abs() < 0.02, "HCl {m}: {g}");
    }
    for (m, cacl2) in [(0.001, 0.888), (0.01, 0.732), (0.1, 0.518)] {
        // γ± of a 2:1 salt: log γ± = |z+ z-| · log γ(1) at I = 3 m.
        let lg = Gammas::Davies {
            a,
            ionic_strength: 3.0 * m,
        }
        .log10_gamma(1);
        let g = 10f64.powf(2.0 * lg);
        assert!((g / cacl2 - 1.0).abs() < 0.04, "CaCl2 {m}: {g}");
    }
}

#[test]
fn stock_molarities_against_density_tables() {
    // CRC Handbook of Chemistry and Physics, concentrative properties of aqueous solutions
    // (from memory): 37 % HCl is 12.0 mol/L, 50 % NaOH 19.1 mol/L at 20 °C; 96 % H2SO4 18.0.
    let hcl = molar(&reagent("hcl"), StockForm::PercentWw(37.0));
    assert!((hcl - 12.0).abs() < 0.1, "{hcl}");
    let naoh = molar(&reagent("naoh"), StockForm::PercentWw(50.0));
    assert!((naoh - 19.1).abs() < 0.1, "{naoh}");
    let h2so4 = molar(&reagent("h2so4"), StockForm::PercentWw(96.0));
    assert!((h2so4 - 18.0).abs() < 0.1, "{h2so4}");
}

#[test]
fn saturated_bicarbonate_is_about_8_3() {
    // pH of saturated NaHCO3 about 8.3 (common practice). Ideal: ½(pK1 + pK2) = 8.34;
    // Davies (held at 0.5 M) brings it down by ½ |log γ(CO3--)| to about 8.1.
    let bicarb = reagent("nahco3");
    let sat = molar(&bicarb, StockForm::Saturated);
    assert!((1.0..1.2).contains(&sat), "{sat} M");
    let layer = solution("nahco3", sat);
    let ideal = solve_ph(&layer, &Conditions::standard()).unwrap().ph;
    assert!((ideal - 8.3).abs() < 0.1, "{ideal}");
    let real = solve_ph(&layer, &davies(25.0).with_co2(Co2Mode::Vented)).unwrap();
    assert!((real.ph - 8.3).abs() < 0.3, "{}", real.ph);
    assert_eq!(real.carbonate.released_mol, 0.0, "below CO2 saturation");
}

#[test]
fn tenth_molar_sodium_carbonate_is_about_11_6() {
    // 0.1 M Na2CO3: pH about 11.6 (common practice; CRC Handbook "pH of common solutions"
    // 11.6, from memory). Ideal: CO3-- + H2O = HCO3- + OH-, Kb = Kw/K2, x²/(0.1 - x) = Kb.
    let c = Conditions::standard();
    let kb = c.kw() / 10f64.powf(-c.carbonate_pk2());
    let x = (-kb + (kb * kb + 4.0 * kb * 0.1).sqrt()) / 2.0;
    let by_hand = c.pkw() + x.log10();
    let layer = solution("na2co3", 0.1);
    let ideal = solve_ph(&layer, &c).unwrap().ph;
    assert!((ideal - by_hand).abs() < 0.005, "{ideal} vs {by_hand}");
    assert!((ideal - 11.6).abs() < 0.1);
    // With Davies activities the same hydrolysis reads x² γ1² / ((0.1 - x) γ2) = Kb with
    // I = 0.3 - x (Na+, CO3--, HCO3-, OH-), iterated here by hand; pH = pKw + log10(γ1 x).
    // Activity lowers the pH by about 0.27, to 11.4.
    let a = c.davies_a();
    let lg = |z: f64, i: f64| -a * z * z * (i.sqrt() / (1.0 + i.sqrt()) - 0.3 * i);
    let (mut x, mut i) = (x, 0.3);
    for _ in 0..100 {
        let k = kb * 10f64.powf(lg(2.0, i) - 2.0 * lg(1.0, i));
        x = (-k + (k * k + 4.0 * k * 0.1).sqrt()) / 2.0;
        i = 0.3 - x;
    }
    let by_hand = c.pkw() + lg(1.0, i) + x.log10();
    let real = solve_ph(&layer, &davies(25.0)).unwrap();
    assert!(
        (real.ph - by_hand).abs() < 0.005,
        "{} vs {by_hand}",
        real.ph
    );
    assert!(
        (real.ionic_strength - i).abs() < 1e-4,
        "{}",
        real.ionic_strength
    );
    assert!((11.3..11.6).contains(&real.ph), "{}", real.ph);
}

#[test]
fn water_under_air_is_5_6() {
    // Pure water in equilibrium with the CO2 of air: pH about 5.6 (common practice). By
    // hand: h² = K1 KH p + Kw.
    let c = Conditions::standard().with_co2(Co2Mode::Air);
    let eq = solve_ph(&AqueousLayer::water(1.0), &c).unwrap();
    let h = (10f64.powf(-c.carbonate_pk1()) * c.co2_henry() * 420e-6 + c.kw()).sqrt();
    // (CO3-- left out by hand moves the pH by 1e-5.)
    assert!((eq.ph + h.log10()).abs() < 5e-5, "{}", eq.ph);
    assert!((eq.ph - 5.6).abs() < 0.05);
    assert!(eq.carbonate.absorbed_mol > 0.0);
}

#[test]
fn bicarbonate_into_acid_vents_co2() {
    // 10 mmol HCl in 50 mL neutralized by 10 mmol solid NaHCO3, funnel vented: the layer
    // keeps CO2 at saturation (KH · 1 atm) and the rest leaves; its volume is nRT/P with
    // R = 0.082057 L atm/(mol K).
    let c = Conditions::standard().with_co2(Co2Mode::Vented);
    let acid = AqueousLayer {
        strong_anions_mol: 10e-3,
        ..AqueousLayer::water(0.05)
    };
    let layer = with_reagent(&acid, &reagent("nahco3"), &Stock::Solid, 10e-3);
    let eq = solve_ph(&layer, &c).unwrap();
    let carbon = &eq.carbonate;
    assert!((carbon.co2_mol - c.co2_henry() * 0.05).abs() < 1e-12);
    let kept = carbon.co2_mol + carbon.bicarbonate_mol + carbon.carbonate_mol;
    assert!((kept + carbon.released_mol - 10e-3).abs() < 1e-15);
    // About 8.3 mmol leave: 10 - 0.034 · 0.05 · (1 + small HCO3- share).
    assert!(
        (carbon.released_mol - 8.3e-3).abs() < 0.1e-3,
        "{}",
        carbon.released_mol
    );
    let ml = carbon.released_mol * 0.082057 * 298.15 * 1e3;
    assert!((ml - 203.0).abs() < 3.0, "{ml} mL");
}

#[test]
fn sulfuric_acid_second_proton() {
    // 0.01 M H2SO4 with pKa2 1.99: h = c + c K2/(K2 + h), i.e. h² + (K2 - c) h - 2 c K2 = 0.
    let (k2, c0) = (10f64.powf(-1.99), 0.01);
    let h = (-(k2 - c0) + ((k2 - c0).powi(2) + 8.0 * c0 * k2).sqrt()) / 2.0;
    let eq = solve_ph(&solution("h2so4", 0.01), &Conditions::standard()).unwrap();
    assert!(
        (eq.ph + h.log10()).abs() < 1e-4,
        "{} vs {}",
        eq.ph,
        -h.log10()
    );
    // Between one and two strong protons: pH 1.85, not 2.00 or 1.70.
    assert!((eq.ph - 1.85).abs() < 0.01);
}

#[test]
fn ammonium_chloride_and_acetic_acid() {
    // 0.1 M NH4Cl: h = sqrt(Ka c) to well under 0.01 pH, pKa 9.245: pH 5.12 (common practice
    // ~5.1). 0.1 M acetic acid pH 2.88 (textbook value, common practice).
    let c = Conditions::standard();
    let nh4 = solve_ph(&solution("nh4cl", 0.1), &c).unwrap().ph;
    assert!((nh4 - (9.245 + 1.0) / 2.0).abs() < 0.01, "{nh4}");
    let acetic = solve_ph(&solution("acetic_acid", 0.1), &c).unwrap().ph;
    assert!((acetic - 2.88).abs() < 0.01, "{acetic}");
}

#[test]
fn phosphate_standard_buffer() {
    // 0.025 M KH2PO4 + 0.025 M Na2HPO4, the phosphate pH standard: pH(S) 6.865 at 25 °C,
    // 6.984 at 0 °C, 6.833 at 50 °C (R. G. Bates, Determination of pH, 2nd ed. 1973, NBS
    // standard reference material 186; from memory). NaH2PO4 stands in for KH2PO4 (the cation
    // does not enter). At 0 and 50 °C constant-ΔH van 't Hoff misses the curvature of pK2(T),
    // so the tolerance is wider there.
    let layer = with_reagent(
        &solution("nah2po4", 0.025),
        &reagent("na2hpo4"),
        &Stock::Solid,
        0.025,
    );
    assert_eq!(layer.polyprotics.len(), 1, "one pooled phosphate system");
    let ideal = solve_ph(&layer, &Conditions::standard()).unwrap().ph;
    assert!(
        (ideal - 7.198).abs() < 0.01,
        "Henderson–Hasselbalch: {ideal}"
    );
    for (t, want, tolerance) in [(25.0, 6.865, 0.02), (0.0, 6.984, 0.05), (50.0, 6.833, 0.05)] {
        let eq = solve_ph(&layer, &davies(t)).unwrap();
        assert!(
            (eq.ph - want).abs() < tolerance,
            "{t} °C: {} vs {want}",
            eq.ph
        );
        assert!(
            (eq.ionic_strength - 0.1).abs() < 0.002,
            "{}",
            eq.ionic_strength
        );
    }
}

/// Bisection on an explicit charge balance (positive minus negative falls with pH).
fn root(f: impl Fn(f64) -> f64) -> f64 {
    let (mut lo, mut hi) = (-2.0, 16.0);
    for _ in 0..200 {
        let mid = 0.5 * (lo + hi);
        if f(mid) > 0.0 {
            lo = mid;
        } else {
            hi = mid;
        }
    }
    0.5 * (lo + hi)
}

/// The start pH and mean charge `adjust` reports for one solute (ideal, closed, 25 °C),
/// with the pKa values it used.
fn start_of(smiles: &str, mmol: f64) -> (f64, f64, Vec<f64>) {
    let handbook = Handbook::builtin().unwrap();
    let request = Request {
        solutes: vec![SoluteInput {
            smiles: smiles.into(),
            amount: Amount::Moles(mmol * 1e-3),
            pka_override: None,
        }],
        water_l: 0.010,
        targets: vec![7.0],
        reagent: "auto".into(),
        stock: None,
        conditions: Conditions::standard(),
    };
    let out = adjust(&request, &handbook, &Reagent::builtin().unwrap())
        .unwrap()
        .remove(0);
    let pkas = out.solutes[0].sites.iter().map(|s| s.pka).collect();
    (out.start_ph, out.solutes[0].mean_charge, pkas)
}

#[test]
fn salts_and_charged_inputs_end_to_end() {
    let kw = Conditions::standard().kw();
    let h = |ph: f64| 10f64.powf(-ph);
    // Triethylamine hydrochloride, 0.1 M: h + BH+ = Cl- + OH-.
    let (ph, _, pk) = start_of("CCN(CC)CC.Cl", 1.0);
    let ka = 10f64.powf(-pk[0]);
    let want = root(|p| h(p) + 0.1 * h(p) / (h(p) + ka) - 0.1 - kw / h(p));
    assert!((ph - want).abs() < 1e-6, "{ph} vs {want}");
    // The same salt written as its ions gives the same layer.
    let (ions, _, _) = start_of("CC[NH+](CC)CC.[Cl-]", 1.0);
    assert!((ions - ph).abs() < 1e-9);
    // Sodium acetate, 0.1 M: Na+ + h = A- + OH-.
    let (ph, _, pk) = start_of("CC(=O)[O-].[Na+]", 1.0);
    let ka = 10f64.powf(-pk[0]);
    let want = root(|p| 0.1 + h(p) - 0.1 * ka / (ka + h(p)) - kw / h(p));
    assert!((ph - want).abs() < 1e-6, "{ph} vs {want}");
    assert!(ph > 8.0, "a carboxylate salt is basic: {ph}");
    // Glycine as zwitterion or neutral spelling: the same compound, mean charge near 0.
    let (zwitter, charge, _) = start_of("[NH3+]CC(=O)[O-]", 1.0);
    let (neutral, _, _) = start_of("NCC(=O)O", 1.0);
    assert!((zwitter - neutral).abs() < 1e-9, "{zwitter} vs {neutral}");
    assert!(charge.abs() < 0.01, "{charge}");
    // Tetramethylammonium chloride: permanent charge balanced by chloride, neutral water.
    let (ph, charge, pk) = start_of("C[N+](C)(C)C.[Cl-]", 1.0);
    assert!(pk.is_empty());
    assert_eq!(charge, 1.0);
    assert!(
        (ph - Conditions::standard().pkw() / 2.0).abs() < 1e-6,
        "{ph}"
    );
}
