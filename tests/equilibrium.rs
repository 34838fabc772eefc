//! Lab-notebook checks of the aqueous equilibrium and dosing against textbook values and
//! against exact calculations written out here, independently of the solver.

use phdose::Error;
use phdose::equilibrium::dose::with_reagent;
use phdose::equilibrium::{
    AqueousLayer, Conditions, Protolyte, Reagent, Site, SiteKind, Stock, StockForm, StockOffer,
    dose, dose_with_alternatives, reachable_range, solve_ph,
};

fn reagent(name: &str, form: StockForm) -> (Vec<Reagent>, Reagent, StockOffer) {
    let all = Reagent::builtin().unwrap();
    let r = Reagent::find(&all, name).unwrap().clone();
    let s = r.offer(&form).unwrap().clone();
    (all, r, s)
}

/// Weak acid at total concentration `c` with `na` mol/L strong base: the exact cubic
/// h³ + (Ka + Na) h² + (Na Ka - Kw - C Ka) h - Ka Kw = 0, solved by Newton from h = Ka
/// (from above, where the cubic is convex, so Newton converges monotonically).
fn weak_acid_exact_h(pka: f64, c: f64, na: f64, kw: f64) -> f64 {
    let ka = 10f64.powf(-pka);
    let p = |h: f64| h.powi(3) + (ka + na) * h * h + (na * ka - kw - c * ka) * h - ka * kw;
    let dp = |h: f64| 3.0 * h * h + 2.0 * (ka + na) * h + (na * ka - kw - c * ka);
    let mut h = c.max(ka) + 1.0;
    for _ in 0..200 {
        h -= p(h) / dp(h);
    }
    h
}

#[test]
fn acetic_acid_tenth_molar() {
    // 0.1 M acetic acid, pKa 4.76: pH 2.88 (textbook value; common practice).
    let c = Conditions::standard();
    let layer = AqueousLayer {
        solutes: vec![Protolyte::new(0.01, vec![Site::acid(4.76)], 0.0)],
        ..AqueousLayer::water(0.1)
    };
    let eq = solve_ph(&layer, &c).unwrap();
    assert!((eq.ph - 2.88).abs() < 0.005, "pH {}", eq.ph);
    let exact = -weak_acid_exact_h(4.76, 0.1, 0.0, c.kw()).log10();
    assert!((eq.ph - exact).abs() < 1e-9, "{} vs {exact}", eq.ph);
    // About 1.3 % ionized at this pH, from the same exact h.
    let h = 10f64.powf(-exact);
    let ka = 10f64.powf(-4.76);
    assert!((eq.solutes[0].fraction_ionized[0] - ka / (ka + h)).abs() < 1e-9);
}

#[test]
fn half_neutralized_weak_acid_sits_at_its_pka() {
    // 1 mmol acid (pKa 4.76) with 0.5 mmol NaOH in 100 mL: Henderson–Hasselbalch says
    // pH = pKa; the exact cubic differs by a few thousandths at 0.01 M.
    let c = Conditions::standard();
    let mut layer = AqueousLayer {
        solutes: vec![Protolyte::new(1e-3, vec![Site::acid(4.76)], 0.0)],
        ..AqueousLayer::water(0.1)
    };
    layer.strong_cations_mol = 0.5e-3;
    let eq = solve_ph(&layer, &c).unwrap();
    let exact = -weak_acid_exact_h(4.76, 0.01, 0.005, c.kw()).log10();
    assert!((eq.ph - exact).abs() < 1e-9, "{} vs {exact}", eq.ph);
    assert!((eq.ph - 4.76).abs() < 0.01);

    // The inverse: solid NaOH to pH = pKa takes about half an equivalent.
    let (_, naoh, solid) = reagent("naoh", StockForm::Solid);
    let free_acid = AqueousLayer {
        strong_cations_mol: 0.0,
        ..layer
    };
    let d = dose(&free_acid, &naoh, &solid, 4.76, &c).unwrap();
    // Exact: Na = Kw/h - h + C·Ka/(Ka + h) at h = 10^-4.76, times V.
    let h = 10f64.powf(-4.76);
    let want = (c.kw() / h - h + 0.01 * 0.5) * 0.1;
    assert!(
        (d.reagent_mol / want - 1.0).abs() < 1e-6,
        "{} vs {want}",
        d.reagent_mol
    );
    assert!((d.reagent_mol / 0.5e-3 - 1.0).abs() < 0.01);
}

#[test]
fn one_millimole_hcl_in_100_ml() {
    // 1.0 mmol HCl in 100 mL of water: 0.010 M, pH 2.00 with ideal activities.
    let c = Conditions::standard();
    let (_, hcl, _) = reagent("hcl", StockForm::Molar(1.0));
    let layer = with_reagent(&AqueousLayer::water(0.1), &hcl, &Stock::Solid, 1e-3);
    let eq = solve_ph(&layer, &c).unwrap();
    assert!((eq.ph - 2.00).abs() < 0.001, "pH {}", eq.ph);
}

/// 1 mmol of an amine (conjugate acid pKa 10.6) with 1 mmol Cl- in 50 mL, i.e. its
/// hydrochloride. At the target h the charge balance is linear in the NaOH added n:
/// h + n/V' + n_am·f(BH+)/V' = Kw/h + n_Cl/V', V' = V + n/molar (molar = ∞ for a solid).
fn amine_hydrochloride_naoh(h: f64, kw: f64, molar: Option<f64>) -> f64 {
    let (n_am, n_cl, v) = (1e-3, 1e-3, 0.05);
    let f_bh = 1.0 / (1.0 + 10f64.powf(-10.6) / h);
    let e = kw / h - h;
    let dilution = molar.map_or(0.0, |m| e / m);
    (n_cl - n_am * f_bh + e * v) / (1.0 - dilution)
}

#[test]
fn amine_hydrochloride_to_ph_12() {
    let c = Conditions::standard();
    let layer = AqueousLayer {
        solutes: vec![Protolyte::new(1e-3, vec![Site::base(10.6)], 0.0)],
        strong_anions_mol: 1e-3,
        ..AqueousLayer::water(0.05)
    };
    let h = 1e-12;
    // One equivalent of NaOH frees the amine (less the part still protonated at pH 12), plus
    // the free hydroxide of the final solution: f(BH+) = h / (h + Ka), Ka = 10^-10.6.
    let f_bh = h / (h + 10f64.powf(-10.6));
    let free_oh = (c.kw() / h - h) * 0.05;
    let solid_want = 1e-3 * (1.0 - f_bh) + free_oh;
    assert!((amine_hydrochloride_naoh(h, c.kw(), None) / solid_want - 1.0).abs() < 1e-12);

    let (_, naoh, solid) = reagent("naoh", StockForm::Solid);
    let d = dose(&layer, &naoh, &solid, 12.0, &c).unwrap();
    assert!(
        (d.reagent_mol / solid_want - 1.0).abs() < 1e-6,
        "{} vs {solid_want}",
        d.reagent_mol
    );
    assert!((d.ph - 12.0).abs() < 1e-6);
    // At pH 12 the amine is 96 % free base: 1/(1 + 10^(10.6-12)).
    let free_base = 1.0 / (1.0 + 10f64.powf(10.6 - 12.0));
    assert!((d.equilibrium.solutes[0].fraction_neutral - free_base).abs() < 1e-9);

    // 1 M NaOH adds its own volume, which dilutes the hydroxide: a little more is needed.
    let (_, _, one_molar) = reagent("naoh", StockForm::Molar(1.0));
    let d1 = dose(&layer, &naoh, &one_molar, 12.0, &c).unwrap();
    let want = amine_hydrochloride_naoh(h, c.kw(), Some(1.0));
    assert!(
        (d1.reagent_mol / want - 1.0).abs() < 1e-6,
        "{} vs {want}",
        d1.reagent_mol
    );
    assert!(d1.reagent_mol > d.reagent_mol);
    assert!((d1.stock_volume_l.unwrap() - want).abs() < 1e-9);
    assert!((d1.final_volume_l - (0.05 + want)).abs() < 1e-9);
    assert!((d1.reagent_mol_l - want / (0.05 + want)).abs() < 1e-9);
}

#[test]
fn saturated_bicarbonate_stops_near_8_3() {
    // Bicarbonate alone cannot lift the pH much above ~8.3 (common practice). Independent
    // estimate for c M NaHCO3: h = sqrt(K1 (K2 c + Kw) / (K1 + c)) (the usual amphiprotic
    // approximation, good to well under 0.01 pH at 1 M).
    let c = Conditions::standard();
    let (all, bicarb, sat) = reagent("nahco3", StockForm::Saturated);
    let layer = AqueousLayer {
        strong_anions_mol: 1e-3,
        ..AqueousLayer::water(0.05)
    };
    let (start, limit) = reachable_range(&layer, &bicarb, &sat, &c).unwrap();
    // 1 mmol HCl in 50 mL is 0.020 M: h² - 0.02 h - Kw = 0, pH 1.70.
    let h0 = 0.01 + (0.01f64 * 0.01 + c.kw()).sqrt();
    assert!((start + h0.log10()).abs() < 1e-9, "start {start}");
    let molar = match sat.stock {
        Stock::Solution { molar } => molar,
        Stock::Solid => unreachable!("sat is a solution"),
    };
    let (k1, k2) = (
        10f64.powf(-c.carbonate_pk1()),
        10f64.powf(-c.carbonate_pk2()),
    );
    let h = (k1 * (k2 * molar + c.kw()) / (k1 + molar)).sqrt();
    assert!(
        (limit + h.log10()).abs() < 0.01,
        "limit {limit} vs {}",
        -h.log10()
    );
    assert!((8.2..8.45).contains(&limit));

    match dose_with_alternatives(&layer, &bicarb, &sat, 9.0, &c, &all) {
        Err(Error::Unreachable(m)) => {
            assert!(m.contains("nahco3 (sat)"), "{m}");
            assert!(m.contains("from pH 1.70"), "{m}");
            assert!(m.contains(&format!("at most {limit:.2}")), "{m}");
            assert!(m.contains("naoh (solid"), "{m}");
            assert!(!m.contains("hcl"), "{m}");
        }
        other => panic!("expected Unreachable, got {other:?}"),
    }

    // Within reach, the carbon added stays (closed system) and the pH lands on target.
    let d = dose(&layer, &bicarb, &sat, 7.0, &c).unwrap();
    assert!((d.ph - 7.0).abs() < 1e-6);
    let carb = &d.equilibrium.carbonate;
    let total = carb.co2_mol + carb.bicarbonate_mol + carb.carbonate_mol;
    assert!((total / d.reagent_mol - 1.0).abs() < 1e-12);
    // More than one equivalent: the acid is neutralized and CO2 stays dissolved as a buffer.
    assert!(d.reagent_mol > 1e-3 && carb.co2_mol > 0.9e-3);
}

#[test]
fn acid_into_water_cannot_reach_base_range() {
    let c = Conditions::standard();
    let (all, hcl, stock) = reagent("hcl", StockForm::Molar(1.0));
    match dose_with_alternatives(&AqueousLayer::water(0.1), &hcl, &stock, 12.0, &c, &all) {
        Err(Error::Unreachable(m)) => {
            assert!(m.contains("pH 12.00 is out of reach with hcl (1M)"), "{m}");
            assert!(m.contains("from pH 7.00 (no reagent)"), "{m}");
            assert!(m.contains("naoh") && m.contains("koh"), "{m}");
        }
        other => panic!("expected Unreachable, got {other:?}"),
    }
    // 0.1 M NaOH tends to its own pH, pKw - 1 (h = Kw/0.1 to 1e-12 relative): 13.5 is beyond.
    let (_, naoh, dilute) = reagent("naoh", StockForm::Molar(0.1));
    let water = AqueousLayer::water(0.1);
    let (_, limit) = reachable_range(&water, &naoh, &dilute, &c).unwrap();
    assert!((limit - (c.pkw() - 1.0)).abs() < 1e-9, "{limit}");
    match dose(&water, &naoh, &dilute, 13.5, &c) {
        Err(Error::Unreachable(m)) => {
            assert!(m.contains(&format!("up to at most {limit:.2}")), "{m}")
        }
        other => panic!("expected Unreachable, got {other:?}"),
    }
}

/// Deterministic pseudo-random numbers (64-bit LCG, Knuth's MMIX constants).
struct Lcg(u64);

impl Lcg {
    fn next(&mut self) -> f64 {
        self.0 = self
            .0
            .wrapping_mul(6364136223846793005)
            .wrapping_add(1442695040888963407);
        (self.0 >> 11) as f64 / (1u64 << 53) as f64
    }

    fn range(&mut self, lo: f64, hi: f64) -> f64 {
        lo + (hi - lo) * self.next()
    }
}

fn random_layer(rng: &mut Lcg) -> AqueousLayer {
    let mut solutes = Vec::new();
    for _ in 0..(rng.next() * 4.0) as usize {
        let sites = (0..(rng.next() * 4.0) as usize)
            .map(|_| Site {
                kind: if rng.next() < 0.5 {
                    SiteKind::Acid
                } else {
                    SiteKind::Base
                },
                pka: rng.range(-1.0, 15.0),
                dpka_dt: None,
            })
            .collect();
        let fixed = (rng.range(-1.5, 1.5)).round();
        solutes.push(Protolyte::new(rng.range(0.0, 5e-3), sites, fixed));
    }
    AqueousLayer {
        volume_l: rng.range(0.005, 1.0),
        solutes,
        strong_cations_mol: rng.range(0.0, 5e-3),
        strong_anions_mol: rng.range(0.0, 5e-3),
        carbonate_mol: if rng.next() < 0.5 {
            rng.range(0.0, 2e-3)
        } else {
            0.0
        },
        polyprotics: Vec::new(),
    }
}

/// Positive and negative charge, mol/L, summed here term by term from the definitions.
fn charges(layer: &AqueousLayer, ph: f64, c: &Conditions) -> (f64, f64) {
    let v = layer.volume_l;
    let h = 10f64.powf(-ph);
    let mut pos = h + layer.strong_cations_mol / v;
    let mut neg = c.kw() / h + layer.strong_anions_mol / v;
    for s in &layer.solutes {
        let n = s.total_mol / v;
        if s.fixed_charge > 0.0 {
            pos += n * s.fixed_charge;
        } else {
            neg -= n * s.fixed_charge;
        }
        for site in &s.sites {
            let ka = 10f64.powf(-site.pka);
            match site.kind {
                SiteKind::Acid => neg += n * ka / (ka + h),
                SiteKind::Base => pos += n * h / (ka + h),
            }
        }
    }
    let (k1, k2) = (
        10f64.powf(-c.carbonate_pk1()),
        10f64.powf(-c.carbonate_pk2()),
    );
    let d = h * h + k1 * h + k1 * k2;
    neg += layer.carbonate_mol / v * (k1 * h + 2.0 * k1 * k2) / d;
    (pos, neg)
}

#[test]
fn charge_balance_closes_on_random_layers() {
    let c = Conditions::standard();
    let mut rng = Lcg(20261201);
    for case in 0..300 {
        let layer = random_layer(&mut rng);
        let eq = solve_ph(&layer, &c).unwrap();
        assert!(eq.ph.is_finite());
        let (pos, neg) = charges(&layer, eq.ph, &c);
        assert!(
            (pos - neg).abs() <= 1e-9 * (pos + neg),
            "case {case}: pH {} leaves {pos} vs {neg}",
            eq.ph
        );
        // The root is bracketed: more positive just below, more negative just above.
        let (p_lo, n_lo) = charges(&layer, eq.ph - 1e-8, &c);
        let (p_hi, n_hi) = charges(&layer, eq.ph + 1e-8, &c);
        assert!(p_lo > n_lo && p_hi < n_hi, "case {case}");
    }
}

#[test]
fn dosing_lands_on_target_for_random_layers() {
    let c = Conditions::standard();
    let (_, naoh, naoh_1m) = reagent("naoh", StockForm::Molar(1.0));
    let (_, hcl, hcl_1m) = reagent("hcl", StockForm::Molar(1.0));
    let mut rng = Lcg(7);
    for case in 0..40 {
        let layer = random_layer(&mut rng);
        let start = solve_ph(&layer, &c).unwrap().ph;
        let target = rng.range(1.0, 13.0);
        let (r, s) = if target > start {
            (&naoh, &naoh_1m)
        } else {
            (&hcl, &hcl_1m)
        };
        let d = dose(&layer, r, s, target, &c).unwrap();
        assert!((d.ph - target).abs() < 1e-6, "case {case}");
        // Re-solve independently from the reported amount.
        let again = solve_ph(&with_reagent(&layer, r, &s.stock, d.reagent_mol), &c).unwrap();
        assert!((again.ph - target).abs() < 1e-6, "case {case}");
        let (pos, neg) = charges(
            &with_reagent(&layer, r, &s.stock, d.reagent_mol),
            target,
            &c,
        );
        assert!((pos - neg).abs() <= 1e-5 * (pos + neg), "case {case}");
    }
}
