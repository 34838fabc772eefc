//! Solver guarantees on random systems (proptest): 0-10 solutes with 0-4 sites each,
//! 1 µmol-1 mol, 1 mL-10 L, targets pH -1 to 15, every reagent and stock, every CO2 mode,
//! both activity models, 0-60 °C. The solved layer closes its charge balance to 1e-9
//! relative (summed here from the reported species), nothing is NaN, nothing panics, and the
//! pH moves one way only as a reagent is added (more base, higher pH; exactly with ideal
//! activities, up to the Davies salt effect otherwise).

use phdose::Error;
use phdose::equilibrium::dose::with_reagent;
use phdose::equilibrium::{
    Activity, AqueousLayer, Co2Mode, Conditions, Equilibrium, Protolyte, Reagent, Role, Site,
    SiteKind, Stock, at_temperature, dose, solve_ph,
};
use proptest::prelude::*;
use proptest::test_runner::Config;

fn log_uniform(lo: f64, hi: f64) -> impl Strategy<Value = f64> {
    (lo.log10()..hi.log10()).prop_map(|x| 10f64.powf(x))
}

fn site() -> impl Strategy<Value = Site> {
    (any::<bool>(), -1.0..15.0f64).prop_map(|(acid, pka)| {
        if acid {
            Site::acid(pka)
        } else {
            Site::base(pka)
        }
    })
}

fn solute() -> impl Strategy<Value = Protolyte> {
    (
        log_uniform(1e-6, 1.0),
        prop::collection::vec(site(), 0..=4),
        -1i32..=1,
    )
        .prop_map(|(mol, sites, fixed)| Protolyte::new(mol, sites, fixed as f64))
}

fn amount_or_zero() -> impl Strategy<Value = f64> {
    prop_oneof![Just(0.0), log_uniform(1e-6, 1.0)]
}

fn layer() -> impl Strategy<Value = AqueousLayer> {
    (
        log_uniform(1e-3, 10.0),
        prop::collection::vec(solute(), 0..=10),
        amount_or_zero(),
        amount_or_zero(),
        amount_or_zero(),
    )
        .prop_map(
            |(volume_l, solutes, cations, anions, carbon)| AqueousLayer {
                solutes,
                strong_cations_mol: cations,
                strong_anions_mol: anions,
                carbonate_mol: carbon,
                ..AqueousLayer::water(volume_l)
            },
        )
}

fn conditions() -> impl Strategy<Value = Conditions> {
    (0.0..60.0f64, any::<bool>(), 0usize..3).prop_map(|(t, ideal, co2)| {
        let activity = if ideal {
            Activity::Ideal
        } else {
            Activity::Davies
        };
        let co2 = [Co2Mode::Closed, Co2Mode::Vented, Co2Mode::Air][co2];
        Conditions::new(t)
            .unwrap()
            .with_activity(activity)
            .with_co2(co2)
    })
}

/// Positive and negative charge, mol/L, summed from what the solver reports.
fn charges(layer: &AqueousLayer, eq: &Equilibrium) -> (f64, f64) {
    let v = layer.volume_l;
    let (mut pos, mut neg) = (eq.hydrogen_mol_l, eq.hydroxide_mol_l);
    pos += layer.strong_cations_mol / v;
    neg += layer.strong_anions_mol / v;
    let mut add = |moles_of_charge: f64| {
        if moles_of_charge > 0.0 {
            pos += moles_of_charge / v;
        } else {
            neg -= moles_of_charge / v;
        }
    };
    for (s, st) in layer.solutes.iter().zip(&eq.solutes) {
        add(s.total_mol * st.mean_charge);
    }
    for (p, z) in layer.polyprotics.iter().zip(&eq.polyprotic_charges) {
        add(p.total_mol * z);
    }
    add(-eq.carbonate.bicarbonate_mol);
    add(-2.0 * eq.carbonate.carbonate_mol);
    (pos, neg)
}

/// Everything the layer holds that could carry charge, mol/L of charge at most: the scale of
/// the rounding left in a charge sum of doubles (a 1 mol solute in 1 mL nearly neutral at this
/// pH still rounds at 1e-16 of its 1000 M).
fn gross_charge(layer: &AqueousLayer) -> f64 {
    let solutes: f64 = layer
        .solutes
        .iter()
        .map(|s| s.total_mol * (s.sites.len() as f64 + s.fixed_charge.abs()))
        .sum();
    let systems: f64 = layer
        .polyprotics
        .iter()
        .map(|p| p.total_mol * (p.pkas.len() as f64 + p.top_charge.abs() as f64))
        .sum();
    (layer.strong_cations_mol
        + layer.strong_anions_mol
        + 2.0 * layer.carbonate_mol
        + solutes
        + systems)
        / layer.volume_l
}

fn check_closed(layer: &AqueousLayer, eq: &Equilibrium, c: &Conditions) {
    assert!(eq.ph.is_finite() && eq.ionic_strength.is_finite());
    let at = at_temperature(layer, c);
    let (pos, neg) = charges(&at, eq);
    assert!(pos.is_finite() && neg.is_finite());
    // Closed to 1e-9 of the charge present, or to the rounding of doubles on what the layer
    // holds, whichever is larger (the solver stops at neighbouring doubles of the pH).
    let rounding = 64.0 * f64::EPSILON * gross_charge(&at);
    assert!(
        (pos - neg).abs() <= 1e-9 * (pos + neg) + rounding,
        "pH {}: {pos} vs {neg}",
        eq.ph
    );
}

/// The largest charge any species of the layer can carry: strong ions 1, carbonate 2, each
/// solute and pooled weak system from its most protonated to its least protonated form.
fn max_charge(layer: &AqueousLayer) -> f64 {
    let mut z: f64 = 1.0;
    if layer.carbonate_mol > 0.0 {
        z = z.max(2.0);
    }
    for s in &layer.solutes {
        let bases = s.sites.iter().filter(|x| x.kind == SiteKind::Base).count() as f64;
        let acids = s.sites.len() as f64 - bases;
        z = z
            .max((s.fixed_charge + bases).abs())
            .max((s.fixed_charge - acids).abs());
    }
    for p in &layer.polyprotics {
        let top = p.top_charge as f64;
        z = z.max(top.abs()).max((top - p.pkas.len() as f64).abs());
    }
    z
}

fn config() -> Config {
    Config {
        cases: 40,
        failure_persistence: None,
        ..Config::default()
    }
}

proptest! {
    #![proptest_config(config())]

    #[test]
    fn every_layer_and_reagent_closes_its_charge_balance(
        layer in layer(),
        c in conditions(),
        pick in any::<prop::sample::Index>(),
        stock_pick in any::<prop::sample::Index>(),
        fraction in log_uniform(1e-4, 1.0),
        target in -1.0..15.0f64,
    ) {
        let catalogue = Reagent::builtin().unwrap();
        let reagent = &catalogue[pick.index(catalogue.len())];
        let offer = &reagent.stocks[stock_pick.index(reagent.stocks.len())];
        let eq = solve_ph(&layer, &c).unwrap();
        check_closed(&layer, &eq, &c);
        // Some reagent added: still closes.
        let added = with_reagent(&layer, reagent, &offer.stock, fraction);
        let eq = solve_ph(&added, &c).unwrap();
        check_closed(&added, &eq, &c);
        // Dosing to a target lands on it or says why not; never NaN, never a panic.
        match dose(&layer, reagent, offer, target, &c) {
            Ok(d) => {
                prop_assert!(d.reagent_mol.is_finite() && d.reagent_mol >= 0.0);
                prop_assert!((d.ph - target).abs() < 1e-6);
                let after = with_reagent(&layer, reagent, &offer.stock, d.reagent_mol);
                check_closed(&after, &d.equilibrium, &c);
            }
            Err(Error::Unreachable(m)) | Err(Error::Input(m)) => prop_assert!(!m.is_empty()),
            Err(e) => prop_assert!(false, "unexpected error {e}"),
        }
    }

    #[test]
    fn adding_reagent_moves_the_ph_one_way(
        layer in layer(),
        c in conditions(),
        pick in any::<prop::sample::Index>(),
        stock_pick in any::<prop::sample::Index>(),
    ) {
        let catalogue = Reagent::builtin().unwrap();
        let reagent = &catalogue[pick.index(catalogue.len())];
        let offer = &reagent.stocks[stock_pick.index(reagent.stocks.len())];
        let scale = layer.volume_l;
        let layers: Vec<AqueousLayer> = [0.0, 1e-5, 1e-4, 1e-3, 1e-2, 1e-1, 1.0]
            .iter()
            .map(|f| with_reagent(&layer, reagent, &offer.stock, f * scale))
            .collect();
        let phs: Vec<f64> = layers.iter().map(|l| solve_ph(l, &c).unwrap().ph).collect();
        let steps: Vec<f64> = phs.windows(2).map(|w| w[1] - w[0]).collect();
        // With ideal activities the one-way rule is exact (the sign of dpH/dn is that of the
        // stock's own charge residual, which cannot change before the pH reaches the stock's
        // own pH). With Davies activities the salt a reagent adds also lowers the activity
        // coefficients until they are held at 0.5 M, a real salt effect of at most
        // |log10 γ| ≈ 0.15 z² at 0-60 °C for an ion of charge z (Davies: log γ scales with
        // z²): reversals up to that size, for the most highly charged species present
        // (HPO4 2- and PO4 3- move the phosphate constants by far more than 0.15), are allowed.
        let z = layers.iter().map(max_charge).fold(1.0, f64::max);
        let slack = match c.activity() {
            Activity::Ideal => 1e-7,
            Activity::Davies => 0.15 * z * z,
        };
        let up = steps.iter().all(|d| *d >= -slack);
        let down = steps.iter().all(|d| *d <= slack);
        // Venting breaks the rule on purpose: the water a solution brings can hold dissolved
        // CO2 that would otherwise have left, so carbonic acid stays behind and the pH may dip
        // before the reagent wins (the layer's carbonate is a reservoir, not a per-litre
        // property of the stock).
        let reservoir = c.co2_mode() == Co2Mode::Vented
            && layers.iter().any(|l| l.carbonate_mol > 0.0);
        prop_assert!(up || down || reservoir, "{} {}: {phs:?}", reagent.name, offer.label());
        // A strong base weighed in as a solid only ever raises the pH (a solution may be more
        // dilute than the layer and lower it towards its own pH, which is the one-way rule).
        let strong_base = reagent.role == Role::Base && reagent.system.is_none() && reagent.carbonate == 0.0;
        if strong_base && offer.stock == Stock::Solid && c.activity() == Activity::Ideal {
            prop_assert!(up, "{}: {phs:?}", reagent.name);
        }
    }
}
