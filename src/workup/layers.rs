//! Two liquid layers in contact: an aqueous layer (volume, strong ions, carbonate, reagent
//! systems, solutes) and an organic layer (volume, solvent). Design §3, two phases.
//!
//! Each solute's total moles are kept across both layers. Only the neutral species crosses,
//! with the solvent's partition coefficient P, so at a trial pH the aqueous amount is
//! n_total / (1 + P·f_neutral(pH)·Vo/Va); the aqueous charge balance counts only that amount.
//! The partition sits inside the charge balance itself (`Protolyte::organic_capacity_l`,
//! used by `equilibrium::solve_ph`), so the bracketing pH solve and the bracketing reagent
//! dose of [`crate::equilibrium`] are reused as they are: monotone, no initial guess.
//!
//! Public API:
//! - [`OrganicLayer`]: solvent and volume; [`OrganicLayer::new`] looks the solvent up by name
//!   (an unknown name is `Error::Input` listing the known ones).
//! - [`TwoLayers`]: the aqueous layer (each solute's `total_mol` = both layers together), the
//!   organic volume and one solvent/water logP per solute (`f64::NEG_INFINITY` = stays in
//!   water). [`TwoLayers::contacted`] is the aqueous layer with the partition built in, which
//!   any `equilibrium` function accepts.
//! - [`equilibrate`] -> [`TwoLayerState`]: pH and, per solute, [`Share`] (fractions in each
//!   layer, fraction neutral, moles in each, logD).
//! - [`dose`], [`dose_with_alternatives`], [`choose_auto`], [`reachable_range`]: the reagent
//!   amount (or the mildest reagent) that brings the aqueous layer to a pH with the organic
//!   layer present; [`TwoLayerDose`] carries the `equilibrium::Dose` and the final shares.
//! - [`with_reagent`]: the two layers after a fixed amount of reagent.

use crate::equilibrium::{
    self, AqueousLayer, AutoChoice, Conditions, Dose, Equilibrium, Reagent, Stock, StockOffer,
};
use crate::error::{Error, Result};
use crate::partition::distribution::log_d;
use crate::partition::solvents::{self, Solvent};

/// Density of water at 25 °C, g/mL (CRC Handbook, common practice): the aqueous layer's
/// density when deciding which layer is on top.
pub const WATER_DENSITY_G_ML: f64 = 0.997;

/// The organic layer: its solvent and volume.
#[derive(Debug, Clone, PartialEq)]
pub struct OrganicLayer {
    pub solvent: Solvent,
    pub volume_l: f64,
}

impl OrganicLayer {
    /// `volume_l` litres of the solvent named `name` (name or alias, any case).
    pub fn new(name: &str, volume_l: f64) -> Result<OrganicLayer> {
        let solvent = solvents::find(name)?.clone();
        if !volume_l.is_finite() || volume_l <= 0.0 {
            return Err(Error::Input(format!(
                "organic volume must be a positive number of litres, not {volume_l}"
            )));
        }
        Ok(OrganicLayer { solvent, volume_l })
    }

    /// Whether the organic layer floats on water (plain water density; brine is denser still,
    /// so a solvent lighter than water stays on top of brine too).
    pub fn on_top(&self) -> bool {
        self.solvent.on_top_of(WATER_DENSITY_G_ML)
    }

    /// `"upper"` or `"lower"`.
    pub fn position(&self) -> &'static str {
        if self.on_top() { "upper" } else { "lower" }
    }
}

/// An aqueous layer in contact with an organic layer.
#[derive(Debug, Clone, PartialEq)]
pub struct TwoLayers {
    /// Each solute's `total_mol` counts both layers.
    pub aqueous: AqueousLayer,
    /// Organic volume, L.
    pub organic_l: f64,
    /// Solvent/water log10 P of each solute's neutral form, in the order of
    /// `aqueous.solutes`; `f64::NEG_INFINITY` for a solute that never leaves water.
    pub log_p: Vec<f64>,
}

impl TwoLayers {
    /// Checks that there is one logP per solute and a usable organic volume.
    pub fn new(aqueous: AqueousLayer, organic_l: f64, log_p: Vec<f64>) -> Result<TwoLayers> {
        let layers = TwoLayers {
            aqueous,
            organic_l,
            log_p,
        };
        layers.validate()?;
        Ok(layers)
    }

    fn validate(&self) -> Result<()> {
        if !self.organic_l.is_finite() || self.organic_l < 0.0 {
            return Err(Error::Input(format!(
                "organic volume must be a non-negative number of litres, not {}",
                self.organic_l
            )));
        }
        if self.log_p.len() != self.aqueous.solutes.len() {
            return Err(Error::Internal(format!(
                "{} logP value(s) for {} solute(s)",
                self.log_p.len(),
                self.aqueous.solutes.len()
            )));
        }
        if let Some(bad) = self
            .log_p
            .iter()
            .find(|l| l.is_nan() || **l == f64::INFINITY)
        {
            return Err(Error::Input(format!(
                "logP must be a finite number, not {bad}"
            )));
        }
        Ok(())
    }

    /// The aqueous layer with each solute's partition built in (P·Vo as its organic
    /// capacity); what the `equilibrium` solvers take.
    pub fn contacted(&self) -> AqueousLayer {
        let mut layer = self.aqueous.clone();
        for (p, &lp) in layer.solutes.iter_mut().zip(&self.log_p) {
            let partition = if lp == f64::NEG_INFINITY {
                0.0
            } else {
                // 10^308 is the largest finite double; beyond it every molecule is organic
                // anyway.
                10f64.powf(lp.min(300.0))
            };
            *p = p.clone().with_organic(partition, self.organic_l);
        }
        layer
    }
}

/// One solute's place at equilibrium.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct Share {
    pub total_mol: f64,
    pub aqueous_mol: f64,
    pub organic_mol: f64,
    /// aqueous_mol / total_mol (1 for a solute of zero amount with no partition).
    pub fraction_aqueous: f64,
    pub fraction_organic: f64,
    /// Fraction of the aqueous solute in its all-neutral form (the form that crosses).
    pub fraction_neutral: f64,
    /// log10 D = log10(P · f_neutral) at the pH reached; minus infinity when it never leaves
    /// water (serialized as null).
    pub log_d: Option<f64>,
    /// Mean charge of the aqueous solute.
    pub mean_charge: f64,
}

/// Both layers at equilibrium.
#[derive(Debug, Clone, PartialEq)]
pub struct TwoLayerState {
    pub ph: f64,
    pub aqueous_volume_l: f64,
    pub organic_volume_l: f64,
    /// One per solute, in the layer's order.
    pub shares: Vec<Share>,
    /// The aqueous layer's equilibrium (species, ionic strength, carbonate).
    pub equilibrium: Equilibrium,
}

/// Shares of each solute of a contacted layer (`TwoLayers::contacted`, possibly after a
/// reagent) at its solved equilibrium.
pub fn state_of(contacted: &AqueousLayer, eq: &Equilibrium, organic_l: f64) -> TwoLayerState {
    let shares = contacted
        .solutes
        .iter()
        .zip(&eq.solutes)
        .map(|(p, st)| {
            let fraction_aqueous = p.aqueous_share(st.fraction_neutral, eq.volume_l);
            let aqueous_mol = p.total_mol * fraction_aqueous;
            let partition = if organic_l > 0.0 {
                p.organic_capacity_l / organic_l
            } else {
                0.0
            };
            let d = if p.fixed_charge != 0.0 || partition <= 0.0 {
                f64::NEG_INFINITY
            } else {
                log_d(partition.log10(), st.fraction_neutral)
            };
            Share {
                total_mol: p.total_mol,
                aqueous_mol,
                organic_mol: p.total_mol - aqueous_mol,
                fraction_aqueous,
                fraction_organic: 1.0 - fraction_aqueous,
                fraction_neutral: st.fraction_neutral,
                log_d: d.is_finite().then_some(d),
                mean_charge: st.mean_charge,
            }
        })
        .collect();
    TwoLayerState {
        ph: eq.ph,
        aqueous_volume_l: eq.volume_l,
        organic_volume_l: organic_l,
        shares,
        equilibrium: eq.clone(),
    }
}

/// Shakes the two layers to equilibrium: the pH that closes the aqueous charge balance with
/// every solute shared between the layers.
pub fn equilibrate(layers: &TwoLayers, conditions: &Conditions) -> Result<TwoLayerState> {
    layers.validate()?;
    let contacted = layers.contacted();
    let eq = equilibrium::solve_ph(&contacted, conditions)?;
    Ok(state_of(&contacted, &eq, layers.organic_l))
}

/// A reagent dose with an organic layer present.
#[derive(Debug, Clone, PartialEq)]
pub struct TwoLayerDose {
    /// Amount, stock volume or mass, final aqueous volume and equilibrium.
    pub dose: Dose,
    /// Both layers after the dose.
    pub state: TwoLayerState,
}

/// The two layers after `mol` of `reagent` from `stock` went into the aqueous layer.
pub fn with_reagent(layers: &TwoLayers, reagent: &Reagent, stock: &Stock, mol: f64) -> TwoLayers {
    TwoLayers {
        aqueous: equilibrium::dose::with_reagent(&layers.aqueous, reagent, stock, mol),
        ..layers.clone()
    }
}

/// Reads the shares at the dose found: the contacted layer with the reagent in, at the
/// equilibrium the dose solved.
fn finish(layers: &TwoLayers, reagent: &Reagent, stock: &StockOffer, dose: Dose) -> TwoLayerDose {
    let after = with_reagent(layers, reagent, &stock.stock, dose.reagent_mol);
    let state = state_of(&after.contacted(), &dose.equilibrium, layers.organic_l);
    TwoLayerDose { dose, state }
}

/// Reagent amount from `stock` that brings the aqueous layer to `target_ph` with the organic
/// layer present (what the solutes consume included, partition included).
pub fn dose(
    layers: &TwoLayers,
    reagent: &Reagent,
    stock: &StockOffer,
    target_ph: f64,
    conditions: &Conditions,
) -> Result<TwoLayerDose> {
    layers.validate()?;
    let d = equilibrium::dose(&layers.contacted(), reagent, stock, target_ph, conditions)?;
    Ok(finish(layers, reagent, stock, d))
}

/// Like [`dose`]; an unreachable target also names the reagents of `catalogue` that reach it.
pub fn dose_with_alternatives(
    layers: &TwoLayers,
    reagent: &Reagent,
    stock: &StockOffer,
    target_ph: f64,
    conditions: &Conditions,
    catalogue: &[Reagent],
) -> Result<TwoLayerDose> {
    layers.validate()?;
    let d = equilibrium::dose_with_alternatives(
        &layers.contacted(),
        reagent,
        stock,
        target_ph,
        conditions,
        catalogue,
    )?;
    Ok(finish(layers, reagent, stock, d))
}

/// The mildest reagent and stock of `catalogue` that brings the aqueous layer to
/// `target_ph` with a practical amount ([`equilibrium::Practical`], counted on the contacted
/// layer: every solute's total in both layers), with the organic layer present; with the dose
/// it takes.
pub fn choose_auto(
    layers: &TwoLayers,
    target_ph: f64,
    conditions: &Conditions,
    catalogue: &[Reagent],
) -> Result<(AutoChoice, TwoLayerDose)> {
    layers.validate()?;
    let choice = equilibrium::choose_auto(&layers.contacted(), target_ph, conditions, catalogue)?;
    let dose = finish(layers, &choice.reagent, &choice.stock, choice.dose.clone());
    Ok((choice, dose))
}

/// pH with no reagent and the limit `reagent` from `stock` tends to, both layers present.
pub fn reachable_range(
    layers: &TwoLayers,
    reagent: &Reagent,
    stock: &StockOffer,
    conditions: &Conditions,
) -> Result<(f64, f64)> {
    layers.validate()?;
    equilibrium::reachable_range(&layers.contacted(), reagent, stock, conditions)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::equilibrium::{Activity, Protolyte, Site, StockForm};

    fn ideal() -> Conditions {
        Conditions::standard().with_activity(Activity::Ideal)
    }

    /// Henderson–Hasselbalch neutral fraction of a monoprotic acid, written here on its own.
    fn acid_neutral(ph: f64, pka: f64) -> f64 {
        1.0 / (1.0 + 10f64.powf(ph - pka))
    }

    /// A compound with no site: one wash leaves 1/(1 + P·Vo/Va) in water. logP 1, Vo = 30 mL,
    /// Va = 60 mL: 1/(1 + 10·0.5) = 1/6; the pH is that of pure water.
    #[test]
    fn neutral_compound_one_wash() {
        let aqueous = AqueousLayer {
            solutes: vec![Protolyte::new(1e-3, vec![], 0.0)],
            ..AqueousLayer::water(0.060)
        };
        let layers = TwoLayers::new(aqueous, 0.030, vec![1.0]).unwrap();
        let s = equilibrate(&layers, &ideal()).unwrap();
        assert!((s.shares[0].fraction_aqueous - 1.0 / 6.0).abs() < 1e-12);
        assert!((s.shares[0].organic_mol - 1e-3 * 5.0 / 6.0).abs() < 1e-15);
        assert!((s.ph - ideal().pkw() / 2.0).abs() < 1e-9);
        assert_eq!(s.shares[0].log_d, Some(1.0));
    }

    /// Build the layer backwards from a chosen pH: acid HA (pKa 4.2, logP 2) with 50 mL
    /// organic on 100 mL water. At pH 5.0 the aqueous amount is n/(1 + P·f_n·Vo/Va) and the
    /// charge balance h + Na/Va = Kw/h + n_aq·(1 - f_n)/Va gives the Na+ that puts it there;
    /// solving that layer must return pH 5.0, and solid NaOH dosed to pH 5.0 must weigh that.
    #[test]
    fn charge_balance_closes_with_two_layers() {
        let c = ideal();
        let (n, pka, log_p, va, vo, ph) = (2e-3, 4.2, 2.0, 0.100, 0.050, 5.0);
        let f_n = acid_neutral(ph, pka);
        let n_aq = n / (1.0 + 10f64.powf(log_p) * f_n * vo / va);
        let h = 10f64.powf(-ph);
        let sodium = (c.kw() / h - h) * va + n_aq * (1.0 - f_n);
        let plain = AqueousLayer {
            solutes: vec![Protolyte::new(n, vec![Site::acid(pka)], 0.0)],
            ..AqueousLayer::water(va)
        };
        let with_na = AqueousLayer {
            strong_cations_mol: sodium,
            ..plain.clone()
        };
        let layers = TwoLayers::new(with_na, vo, vec![log_p]).unwrap();
        let s = equilibrate(&layers, &c).unwrap();
        assert!((s.ph - ph).abs() < 1e-9, "{}", s.ph);
        assert!((s.shares[0].aqueous_mol - n_aq).abs() < 1e-12);
        assert!((s.shares[0].total_mol - n).abs() < 1e-18);
        assert!(s.equilibrium.charge_residual_mol_l.abs() < 1e-12);

        let all = Reagent::builtin().unwrap();
        let naoh = Reagent::find(&all, "naoh").unwrap();
        let solid = naoh.offer(&StockForm::Solid).unwrap();
        let start = TwoLayers::new(plain, vo, vec![log_p]).unwrap();
        let d = dose(&start, naoh, solid, ph, &c).unwrap();
        assert!((d.dose.reagent_mol / sodium - 1.0).abs() < 1e-6);
        assert!((d.state.shares[0].aqueous_mol - n_aq).abs() < 1e-9);
        // Without the organic layer the same pH needs more base: all the acid is in water.
        let one_layer = TwoLayers::new(start.aqueous.clone(), 0.0, vec![log_p]).unwrap();
        let d1 = dose(&one_layer, naoh, solid, ph, &c).unwrap();
        assert!(d1.dose.reagent_mol > d.dose.reagent_mol);
    }

    /// An amino acid like zwitterion with a huge P and a permanent cation with any P: the
    /// solve never fails, the pH rises with every addition of base, and the permanent
    /// cation stays in water.
    #[test]
    fn monotone_and_robust() {
        let c = Conditions::standard();
        let zwitterion = Protolyte::new(1e-3, vec![Site::acid(2.3), Site::base(9.7)], 0.0);
        let quat = Protolyte::new(1e-3, vec![], 1.0);
        let mut last = f64::NEG_INFINITY;
        for step in 0..30 {
            let aqueous = AqueousLayer {
                solutes: vec![zwitterion.clone(), quat.clone()],
                strong_anions_mol: 2e-3,
                strong_cations_mol: 2e-4 * step as f64,
                ..AqueousLayer::water(0.02)
            };
            let layers = TwoLayers::new(aqueous, 0.2, vec![6.0, 4.0]).unwrap();
            let s = equilibrate(&layers, &c).unwrap();
            assert!(s.ph > last, "step {step}: {} after {last}", s.ph);
            last = s.ph;
            assert_eq!(s.shares[1].fraction_aqueous, 1.0);
            assert_eq!(s.shares[1].log_d, None);
            let total = s.shares[0].aqueous_mol + s.shares[0].organic_mol;
            assert!((total - 1e-3).abs() < 1e-15);
        }
    }

    #[test]
    fn organic_layer_by_name() {
        let dcm = OrganicLayer::new("DCM", 0.05).unwrap();
        assert_eq!(dcm.position(), "lower");
        assert_eq!(
            OrganicLayer::new("etoac", 0.05).unwrap().position(),
            "upper"
        );
        let err = OrganicLayer::new("unobtainium", 0.05)
            .unwrap_err()
            .to_string();
        assert!(err.contains("ethyl acetate"), "{err}");
        assert!(OrganicLayer::new("ether", -1.0).is_err());
        let bad = TwoLayers::new(AqueousLayer::water(0.1), 0.05, vec![1.0]);
        assert!(bad.is_err());
    }
}
