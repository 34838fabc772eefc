//! Repeated portions: an organic layer washed with fresh aqueous portions, or an aqueous
//! layer extracted with fresh organic portions. Each portion is shaken to equilibrium with
//! the partition inside the charge balance ([`super::layers::equilibrate`]), so a portion's
//! pH follows from what is left to neutralize: a second portion of the same bicarbonate
//! solution meets less acid than the first and ends at a higher pH.
//!
//! - [`wash`]: the first portion is the two layers as given (counter-ions and reagent in the
//!   water); every later portion is `fresh` (the same water and reagent) against what the
//!   organic layer still holds. The portions are combined into one aqueous fraction.
//! - [`extract`]: the aqueous layer stays (its volume, strong ions and what is left of its
//!   carbon after venting); every portion of organic solvent is fresh.

use super::layers::{TwoLayerState, TwoLayers, equilibrate};
use crate::equilibrium::{AqueousLayer, Conditions};
use crate::error::{Error, Result};

/// The result of several portions.
#[derive(Debug, Clone, PartialEq)]
pub struct Portions {
    /// Each portion's equilibrium, in order.
    pub states: Vec<TwoLayerState>,
    /// Per solute (the layers' order): moles in the combined aqueous portions (`wash`) or
    /// left in the one aqueous layer (`extract`).
    pub aqueous_mol: Vec<f64>,
    /// Per solute: moles left in the one organic layer (`wash`) or in the combined organic
    /// portions (`extract`).
    pub organic_mol: Vec<f64>,
    /// CO2 that left as gas over all portions, mol.
    pub co2_released_mol: f64,
}

impl Portions {
    /// No portion yet, for `n` solutes.
    fn empty(n: usize) -> Portions {
        Portions {
            states: Vec::new(),
            aqueous_mol: vec![0.0; n],
            organic_mol: vec![0.0; n],
            co2_released_mol: 0.0,
        }
    }

    /// Share of solute `i` in the aqueous fraction.
    pub fn fraction_aqueous(&self, i: usize) -> f64 {
        let total = self.aqueous_mol[i] + self.organic_mol[i];
        if total > 0.0 {
            self.aqueous_mol[i] / total
        } else {
            0.0
        }
    }
}

fn check_count(count: u32) -> Result<()> {
    if count == 0 || count > 20 {
        return Err(Error::Input(format!(
            "the number of portions must be 1 to 20, not {count}"
        )));
    }
    Ok(())
}

/// Washes the organic layer of `first` with `count` aqueous portions: `first` itself, then
/// `count - 1` portions of `fresh` (water and reagent, no solutes), each against the organic
/// layer as the previous portion left it.
pub fn wash(
    first: &TwoLayers,
    fresh: &AqueousLayer,
    count: u32,
    conditions: &Conditions,
) -> Result<Portions> {
    check_count(count)?;
    if !fresh.solutes.is_empty() {
        return Err(Error::Input(
            "a fresh wash portion holds water and reagent only; the solutes come from the \
             organic layer"
                .into(),
        ));
    }
    let n = first.aqueous.solutes.len();
    let mut layers = first.clone();
    let mut out = Portions::empty(n);
    for k in 0..count {
        let state = equilibrate(&layers, conditions)?;
        for (i, s) in state.shares.iter().enumerate() {
            out.aqueous_mol[i] += s.aqueous_mol;
            out.organic_mol[i] = s.organic_mol;
        }
        out.co2_released_mol += state.equilibrium.carbonate.released_mol;
        if k + 1 < count {
            let mut next = fresh.clone();
            next.solutes = layers
                .aqueous
                .solutes
                .iter()
                .zip(&state.shares)
                .map(|(p, s)| {
                    let mut p = p.clone();
                    p.total_mol = s.organic_mol;
                    p
                })
                .collect();
            layers.aqueous = next;
        }
        out.states.push(state);
    }
    Ok(out)
}

/// Extracts the aqueous layer of `first` with `count` portions of organic solvent of
/// `first.organic_l` each: `first` itself, then fresh solvent against the same water.
pub fn extract(first: &TwoLayers, count: u32, conditions: &Conditions) -> Result<Portions> {
    check_count(count)?;
    let n = first.aqueous.solutes.len();
    let mut layers = first.clone();
    let mut out = Portions::empty(n);
    for _ in 0..count {
        let state = equilibrate(&layers, conditions)?;
        let carbon = &state.equilibrium.carbonate;
        for (i, s) in state.shares.iter().enumerate() {
            out.organic_mol[i] += s.organic_mol;
            out.aqueous_mol[i] = s.aqueous_mol;
            layers.aqueous.solutes[i].total_mol = s.aqueous_mol;
        }
        out.co2_released_mol += carbon.released_mol;
        // Carbon that left as gas is gone; what stays is dissolved.
        layers.aqueous.carbonate_mol =
            carbon.co2_mol + carbon.bicarbonate_mol + carbon.carbonate_mol;
        out.states.push(state);
    }
    Ok(out)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::equilibrium::{Activity, Protolyte, Site};

    fn ideal() -> Conditions {
        Conditions::standard().with_activity(Activity::Ideal)
    }

    /// n washes of a neutral compound (logP 0.5, Vo 40 mL, Va 20 mL per portion): each
    /// portion leaves D·Vo/(D·Vo + Va) in the organic layer, so three leave that cubed
    /// (distribution law, common practice), computed here by hand.
    #[test]
    fn n_washes_multiply() {
        let (p, vo, va) = (10f64.powf(0.5), 0.040, 0.020);
        let aqueous = AqueousLayer {
            solutes: vec![Protolyte::new(1e-3, vec![], 0.0)],
            ..AqueousLayer::water(va)
        };
        let first = TwoLayers::new(aqueous, vo, vec![0.5]).unwrap();
        let w = wash(&first, &AqueousLayer::water(va), 3, &ideal()).unwrap();
        let keep = p * vo / (p * vo + va);
        assert!((w.organic_mol[0] - 1e-3 * keep.powi(3)).abs() < 1e-15);
        assert!((w.aqueous_mol[0] + w.organic_mol[0] - 1e-3).abs() < 1e-15);
        assert_eq!(w.states.len(), 3);
    }

    /// pH-dependent D over several portions: an acid (pKa 4.0, logP 3, 0.10 mmol in 50 mL
    /// organic) washed twice with 20 mL of 5 mM NaOH. The second portion meets less acid and
    /// ends at a higher pH. Each portion leaves D·Vo/(D·Vo + Va) of what it met in the organic
    /// layer, with D = P/(1 + 10^(pH - pKa)) (Henderson–Hasselbalch) at that portion's pH,
    /// multiplied here by hand.
    #[test]
    fn ph_dependent_d_per_portion() {
        let fresh = AqueousLayer {
            strong_cations_mol: 1e-4,
            ..AqueousLayer::water(0.02)
        };
        let first_layer = AqueousLayer {
            solutes: vec![Protolyte::new(1e-4, vec![Site::acid(4.0)], 0.0)],
            ..fresh.clone()
        };
        let first = TwoLayers::new(first_layer, 0.05, vec![3.0]).unwrap();
        let w = wash(&first, &fresh, 2, &ideal()).unwrap();
        assert!(w.states[1].ph > w.states[0].ph + 0.5);
        let mut left = 1e-4;
        for s in &w.states {
            let d = 1e3 / (1.0 + 10f64.powf(s.ph - 4.0));
            left *= d * 0.05 / (d * 0.05 + 0.02);
        }
        assert!((w.organic_mol[0] / left - 1.0).abs() < 1e-9);
        assert!((w.aqueous_mol[0] + w.organic_mol[0] - 1e-4).abs() < 1e-16);
        let with_solute = AqueousLayer {
            solutes: vec![Protolyte::new(1e-4, vec![], 0.0)],
            ..AqueousLayer::water(0.02)
        };
        assert!(wash(&first, &with_solute, 2, &ideal()).is_err());
    }

    /// Extraction with fresh solvent: a neutral compound logP 1, Va 50 mL, Vo 25 mL: each
    /// portion leaves 1/(1 + 10·0.5) = 1/6 in water; two leave 1/36.
    #[test]
    fn fresh_solvent_portions() {
        let aqueous = AqueousLayer {
            solutes: vec![Protolyte::new(1e-3, vec![], 0.0)],
            ..AqueousLayer::water(0.05)
        };
        let first = TwoLayers::new(aqueous, 0.025, vec![1.0]).unwrap();
        let e = extract(&first, 2, &ideal()).unwrap();
        assert!((e.aqueous_mol[0] - 1e-3 / 36.0).abs() < 1e-15);
        assert!((e.fraction_aqueous(0) - 1.0 / 36.0).abs() < 1e-12);
        assert!(extract(&first, 0, &ideal()).is_err());
    }
}
