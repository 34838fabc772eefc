//! Buffer recipes against the outside world: standard buffer solutions and published buffer
//! mixture tables (each check names its source; values recalled are marked `from memory`),
//! and an independent Henderson–Hasselbalch-plus-Davies calculation written here.
//!
//! Standards are defined in mol/kg of water; at these dilutions mol/L differs by under 0.3 %,
//! i.e. under 0.002 in pH, far inside the 0.05 tolerance.

use phdose::buffer::{BufferSystem, Method, Mixture, Request, capacity, make};
use phdose::chem::elements;
use phdose::equilibrium::{Activity, Conditions, Reagent};

const TOLERANCE: f64 = 0.05;

fn systems() -> Vec<BufferSystem> {
    BufferSystem::builtin().unwrap()
}

fn system(name: &str) -> BufferSystem {
    BufferSystem::find(&systems(), name).unwrap().clone()
}

fn davies(t: f64) -> Conditions {
    Conditions::new(t).unwrap().with_activity(Activity::Davies)
}

/// pH of one litre holding `mol` of each named form of `sys` at `t` °C.
fn ph_of(sys: &str, parts: &[(&str, f64)], t: f64) -> f64 {
    let s = system(sys);
    let mix = parts.iter().fold(Mixture::empty(1.0), |m, (name, mol)| {
        m.with_form(s.form(name).unwrap(), *mol)
    });
    mix.solve(&s, &davies(t)).unwrap().ph
}

fn check(what: &str, got: f64, want: f64) {
    assert!(
        (got - want).abs() <= TOLERANCE,
        "{what}: computed pH {got:.3}, published {want:.3}"
    );
}

#[test]
fn nist_equimolal_phosphate_standard() {
    // 0.025 m KH2PO4 + 0.025 m Na2HPO4: pH 6.865 at 25 °C and 6.840 at 37 °C. R. G. Bates,
    // Determination of pH: Theory and Practice, 2nd ed. (Wiley 1973), table of NBS standards;
    // also R. P. Buck et al., Pure Appl. Chem. 74 (2002) 2169 (from memory).
    let parts = [("kh2po4", 0.025), ("na2hpo4", 0.025)];
    check(
        "phosphate 1:1, 25 °C",
        ph_of("phosphate", &parts, 25.0),
        6.865,
    );
    check(
        "phosphate 1:1, 37 °C",
        ph_of("phosphate", &parts, 37.0),
        6.840,
    );
}

#[test]
fn nist_physiological_phosphate_standard() {
    // 0.008695 m KH2PO4 + 0.03043 m Na2HPO4: pH 7.413 at 25 °C. Bates (1973), NBS standard
    // table (from memory).
    let parts = [("kh2po4", 0.008695), ("na2hpo4", 0.03043)];
    check("phosphate 1:3.5", ph_of("phosphate", &parts, 25.0), 7.413);
}

#[test]
fn nist_borax_standard() {
    // 0.01 m Na2B4O7·10H2O: pH 9.180 at 25 °C. Bates (1973), NBS standard table (from memory).
    check("borax", ph_of("borate", &[("borax", 0.01)], 25.0), 9.180);
}

#[test]
fn nist_carbonate_standard() {
    // 0.025 m NaHCO3 + 0.025 m Na2CO3: pH 10.012 at 25 °C. Bates (1973), NBS standard table
    // (from memory).
    let parts = [("nahco3", 0.025), ("na2co3", 0.025)];
    check("carbonate 1:1", ph_of("carbonate", &parts, 25.0), 10.012);
}

#[test]
fn nist_tris_standard() {
    // 0.01667 m Tris + 0.05 m Tris·HCl: pH 7.699 at 25 °C. NBS SRM 922/923 certificate; Bates
    // (1973) (from memory).
    let parts = [("tris", 0.01667), ("tris.hcl", 0.05)];
    check("Tris 1:3", ph_of("tris", &parts, 25.0), 7.699);
}

#[test]
fn acetate_secondary_standard() {
    // 0.1 m acetic acid + 0.1 m sodium acetate: pH 4.652 at 25 °C. Bates (1973), table of
    // secondary standards (from memory).
    let parts = [("acetic_acid", 0.1), ("naoac", 0.1)];
    check("acetate 0.1/0.1", ph_of("acetate", &parts, 25.0), 4.652);
}

#[test]
fn gomori_sodium_phosphate_table() {
    // x mL 0.2 M NaH2PO4 + y mL 0.2 M Na2HPO4, diluted to 200 mL (0.1 M phosphate), 25 °C:
    // G. Gomori, Methods Enzymol. 1 (1955) 138, as reprinted in laboratory handbooks
    // (from memory).
    for (ph, x, y) in [
        (6.0, 87.7, 12.3),
        (7.0, 39.0, 61.0),
        (7.4, 19.0, 81.0),
        (8.0, 5.3, 94.7),
    ] {
        // Per litre after dilution: mL × 0.2 M / 200 mL.
        let parts = [("nah2po4", x * 0.2 / 200.0), ("na2hpo4", y * 0.2 / 200.0)];
        check(
            &format!("Gomori phosphate {x}/{y}"),
            ph_of("phosphate", &parts, 25.0),
            ph,
        );
    }
}

#[test]
fn acetate_mixture_table() {
    // x mL 0.2 M acetic acid + y mL 0.2 M sodium acetate, diluted to 100 mL (0.1 M acetate):
    // the Walpole acetate table as given by Gomori, Methods Enzymol. 1 (1955) 138 (from memory).
    for (ph, x, y) in [(4.0, 41.0, 9.0), (5.0, 14.8, 35.2)] {
        let parts = [("acetic_acid", x * 0.2 / 100.0), ("naoac", y * 0.2 / 100.0)];
        check(
            &format!("acetate {x}/{y}"),
            ph_of("acetate", &parts, 25.0),
            ph,
        );
    }
}

fn request(ph: f64, conc: f64, t: f64, method: Method) -> Request {
    Request {
        ph,
        conc_mol_l: conc,
        volume_l: 1.0,
        conditions: davies(t),
        method,
        forms: vec![],
        titrant: None,
        stock_conc_mol_l: None,
    }
}

/// Davies log10 γ for charge z at ionic strength i, A at 25 °C = 0.5114 (Robinson and Stokes,
/// Electrolyte Solutions, 2nd ed. 1959, from memory) with the 0.3 of Davies (1962).
fn log_gamma(z: f64, i: f64, a: f64) -> f64 {
    -a * z * z * (i.sqrt() / (1.0 + i.sqrt()) - 0.3 * i)
}

#[test]
fn pair_recipe_agrees_with_henderson_hasselbalch_plus_davies() {
    // Independent calculation: the weighed masses back to moles, the ionic strength from the
    // ions as weighed (Na+, H2PO4-, HPO4 2-; no shift by dissociation), then
    // pH = pKa2 + log10([HPO4]/[H2PO4]) + log γ(2-) - log γ(1-).
    let sys = system("phosphate");
    let recipe = make(&sys, &request(7.2, 0.05, 25.0, Method::Pair), &[]).unwrap();
    let acid = &recipe.components[0];
    let base = &recipe.components[1];
    assert_eq!(
        (acid.name.as_str(), base.name.as_str()),
        ("nah2po4.h2o", "na2hpo4.7h2o")
    );
    let n_acid = acid.mass_g.unwrap() / 137.99; // NaH2PO4·H2O, g/mol (suppliers' label)
    let n_base = base.mass_g.unwrap() / 268.07; // Na2HPO4·7H2O, g/mol (suppliers' label)
    let i = 0.5 * ((n_acid + 2.0 * n_base) + n_acid + 4.0 * n_base);
    let a = 0.5114;
    let hh = 7.198 + (n_base / n_acid).log10() + log_gamma(2.0, i, a) - log_gamma(1.0, i, a);
    assert!((recipe.ph - 7.2).abs() < 1e-6);
    assert!(
        (hh - recipe.ph).abs() < 0.01,
        "HH+Davies {hh:.4} vs {:.4}",
        recipe.ph
    );
    assert!((recipe.ionic_strength - i).abs() / i < 0.01);
}

#[test]
fn tris_titration_agrees_with_henderson_hasselbalch_plus_davies_at_37_c() {
    // Tris·HCl titrated with 1 M NaOH to pH 7.4 at 37 °C. Independent calculation: pKa at
    // 37 °C by van 't Hoff from 8.072 and ΔH 47.45 kJ/mol (Goldberg et al. 2002, from memory);
    // [Tris] = NaOH added, [TrisH+] = the rest; I = [TrisH+] + [Na+] ... as the Cl- count:
    // I = ½ ([TrisH+] + [Cl-] + [Na+]) = ½ (n_acid + C + n_NaOH); the Davies A at 37 °C is
    // 0.5229 (Robinson and Stokes 1959 table, from memory).
    let sys = system("tris");
    let recipe = make(
        &sys,
        &request(7.4, 0.05, 37.0, Method::Titrate),
        &Reagent::builtin().unwrap(),
    )
    .unwrap();
    let form = &recipe.components[0];
    let naoh = &recipe.components[1];
    assert_eq!(
        (form.name.as_str(), naoh.name.as_str()),
        ("tris.hcl", "naoh")
    );
    let c = 0.05;
    let n_base = naoh.volume_ml.unwrap() / 1e3 * 1.0;
    let n_acid = c - n_base;
    let r_ln10 = 8.314_462_618 * 10f64.ln();
    let pka = 8.072 + 47.45e3 / r_ln10 * (1.0 / 310.15 - 1.0 / 298.15);
    let i = 0.5 * (n_acid + c + n_base);
    let hh = pka + (n_base / n_acid).log10() - log_gamma(1.0, i, 0.5229);
    assert!((hh - 7.4).abs() < 0.01, "HH+Davies {hh:.4}");
    // Made up at 25 °C the same solution reads about 0.31 higher (ΔpKa of Tris, 12 K).
    let ph25 = recipe.ph_at_25c.unwrap();
    assert!((ph25 - 7.4 - 0.32).abs() < 0.03, "{ph25}");
}

#[test]
fn capacity_peaks_near_the_pka_at_the_van_slyke_value() {
    // Van Slyke (1922): at pH = pKa an ideal monoprotic buffer has β = ln10 · C / 4.
    let sys = system("hepes");
    let mut r = request(7.564, 0.1, 25.0, Method::Pair);
    r.conditions = Conditions::standard();
    let recipe = make(&sys, &r, &[]).unwrap();
    let want = 10f64.ln() * 0.1 / 4.0;
    assert!(
        (recipe.capacity / want - 1.0).abs() < 0.01,
        "{}",
        recipe.capacity
    );
    let mix = Mixture::empty(1.0)
        .with_form(sys.form("hepes").unwrap(), 0.05)
        .with_form(sys.form("hepes.na").unwrap(), 0.05);
    let beta = capacity(&mix, &sys, &Conditions::standard()).unwrap();
    assert!((beta / want - 1.0).abs() < 0.01);
}

#[test]
fn the_three_recipes_make_the_same_solution() {
    let sys = system("phosphate");
    let reagents = Reagent::builtin().unwrap();
    let pair = make(&sys, &request(6.8, 0.1, 25.0, Method::Pair), &reagents).unwrap();
    let stocks = make(&sys, &request(6.8, 0.1, 25.0, Method::Stocks), &reagents).unwrap();
    assert_eq!(pair.components[0].mol, stocks.components[0].mol);
    assert!((stocks.water_ml.unwrap()).abs() < 1e-6);
    let total: f64 = stocks.components.iter().map(|c| c.volume_ml.unwrap()).sum();
    assert!((total - 1000.0).abs() < 1e-6);
    let titrated = make(&sys, &request(6.8, 0.1, 25.0, Method::Titrate), &reagents).unwrap();
    assert!((titrated.ph - 6.8).abs() < 1e-6);
    assert!((titrated.ionic_strength - pair.ionic_strength).abs() < 0.01);
}

#[test]
fn warnings_for_a_far_pka_and_an_insoluble_salt() {
    let sys = system("phosphate");
    let far = make(&sys, &request(9.5, 0.05, 25.0, Method::Pair), &[]).unwrap();
    assert!(
        far.warnings.iter().any(|w| w.contains("nearest pKa")),
        "{:?}",
        far.warnings
    );
    // 0.6 M Na2HPO4 is above its solubility (7.7 g/100 g water at 20 °C, about 0.54 M).
    let mut r = request(7.0, 0.1, 25.0, Method::Stocks);
    r.stock_conc_mol_l = Some(0.6);
    let strong = make(&sys, &r, &[]).unwrap();
    assert!(
        strong.warnings.iter().any(|w| w.contains("solubility")),
        "{:?}",
        strong.warnings
    );
}

/// Molar mass of a formula like `Na2HPO4·7H2O` from phdose's atomic weights, written here.
fn formula_mass(formula: &str) -> f64 {
    formula
        .split('·')
        .map(|part| {
            let digits: String = part.chars().take_while(|c| c.is_ascii_digit()).collect();
            let times: f64 = digits.parse().unwrap_or(1.0);
            let mut rest = &part[digits.len()..];
            let mut sum = 0.0;
            while !rest.is_empty() {
                let sym_len = 1 + rest[1..]
                    .chars()
                    .take_while(|c| c.is_ascii_lowercase())
                    .count();
                let (symbol, after) = rest.split_at(sym_len);
                let count_len = after.chars().take_while(|c| c.is_ascii_digit()).count();
                let count: f64 = after[..count_len].parse().unwrap_or(1.0);
                sum += elements::by_symbol(symbol).unwrap().weight * count;
                rest = &after[count_len..];
            }
            times * sum
        })
        .sum()
}

#[test]
fn form_molar_masses_match_their_formulas_and_labels() {
    // Recomputed from the formula with the IUPAC 2021 weights; suppliers' labels (common
    // practice): NaH2PO4·H2O 137.99, Na2HPO4·7H2O 268.07, Tris 121.14, Tris·HCl 157.60,
    // sodium acetate trihydrate 136.08.
    for s in systems() {
        for f in &s.forms {
            let m = formula_mass(&f.formula.replace("·HCl", "·H1Cl"));
            assert!((m - f.molar_mass_g_mol).abs() < 0.01, "{}: {m}", f.name);
        }
    }
    for (sys, form, label) in [
        ("phosphate", "nah2po4.h2o", 137.99),
        ("phosphate", "na2hpo4.7h2o", 268.07),
        ("tris", "tris", 121.14),
        ("tris", "tris.hcl", 157.60),
        ("acetate", "naoac.3h2o", 136.08),
    ] {
        let m = system(sys).form(form).unwrap().molar_mass_g_mol;
        assert!((m - label).abs() < 0.015, "{form}: {m}");
    }
}
