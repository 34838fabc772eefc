//! Carbonic acid: dissolved inorganic carbon shared between CO2(aq) (with H2CO3, written
//! H2CO3*), HCO3- and CO3-- by the two acid constants at the layer's temperature, and what
//! happens to the CO2 (design §3):
//!
//! - `closed`: all carbon stays in the layer;
//! - `vented`: dissolved CO2 cannot exceed saturation under 1 atm of CO2 (Henry's constant);
//!   the excess leaves as gas, as from a separatory funnel vented often;
//! - `air`: dissolved CO2 is in equilibrium with the CO2 of air, so CO2 leaves an acidic
//!   layer and an alkaline one takes it up (slowly, in practice).
//!
//! Carbon that stays is min(C_T, C_cap(pH)) with C_cap = [CO2]sat·V/α0(pH) rising with pH, so
//! the negative charge carried still rises with pH and the charge balance stays monotone.

use super::polyprotic::{fractions as stepwise_fractions, pow10};
use super::water::Conditions;
use crate::error::{Error, Result};

/// What becomes of CO2 formed in the layer.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Co2Mode {
    Closed,
    Vented,
    Air,
}

impl Co2Mode {
    /// Reads `closed`, `vented` or `air`.
    pub fn parse(text: &str) -> Result<Co2Mode> {
        match text.trim().to_ascii_lowercase().as_str() {
            "closed" => Ok(Co2Mode::Closed),
            "vented" => Ok(Co2Mode::Vented),
            "air" => Ok(Co2Mode::Air),
            _ => Err(Error::Input(format!(
                "--co2 '{text}': use closed, vented or air"
            ))),
        }
    }

    pub fn as_str(&self) -> &'static str {
        match self {
            Co2Mode::Closed => "closed",
            Co2Mode::Vented => "vented",
            Co2Mode::Air => "air",
        }
    }
}

/// Fractions of carbon as (H2CO3*, HCO3-, CO3--) at `ph`, ideal activities; they sum to 1.
pub fn fractions(ph: f64, conditions: &Conditions) -> (f64, f64, f64) {
    fractions_with(ph, conditions, &|_| 0.0)
}

/// The same with activity coefficients 10^lg(z).
pub fn fractions_with(
    ph: f64,
    conditions: &Conditions,
    lg: &dyn Fn(i32) -> f64,
) -> (f64, f64, f64) {
    let pks = [conditions.carbonate_pk1(), conditions.carbonate_pk2()];
    let f = stepwise_fractions(ph, 0, &pks, lg);
    (f[0], f[1], f[2])
}

/// Carbonate species in a layer, in moles.
#[derive(Debug, Clone, PartialEq)]
pub struct CarbonateSpecies {
    /// Dissolved CO2 (with the little H2CO3).
    pub co2_mol: f64,
    pub bicarbonate_mol: f64,
    pub carbonate_mol: f64,
    /// CO2 that left as gas (vented, air), mol.
    pub released_mol: f64,
    /// CO2 taken up from air (air mode, alkaline layers), mol.
    pub absorbed_mol: f64,
}

impl CarbonateSpecies {
    /// Splits `total_mol` of carbon at `ph`, closed system, ideal activities.
    pub fn at(total_mol: f64, ph: f64, conditions: &Conditions) -> CarbonateSpecies {
        let (a0, a1, a2) = fractions(ph, conditions);
        CarbonateSpecies {
            co2_mol: total_mol * a0,
            bicarbonate_mol: total_mol * a1,
            carbonate_mol: total_mol * a2,
            released_mol: 0.0,
            absorbed_mol: 0.0,
        }
    }

    /// The species when `total_mol` of carbon was put into `volume_l` of layer at `ph`, under
    /// the CO2 mode of `conditions`, with activity coefficients 10^lg(z).
    pub fn in_layer(
        total_mol: f64,
        volume_l: f64,
        ph: f64,
        conditions: &Conditions,
        lg: &dyn Fn(i32) -> f64,
    ) -> CarbonateSpecies {
        if total_mol == 0.0 && conditions.co2_mode() != Co2Mode::Air {
            // No carbon and none taken from air: nothing to split (the solver asks this at
            // every trial pH of a layer without carbonate).
            return CarbonateSpecies {
                co2_mol: 0.0,
                bicarbonate_mol: 0.0,
                carbonate_mol: 0.0,
                released_mol: 0.0,
                absorbed_mol: 0.0,
            };
        }
        let (a0, a1, a2) = fractions_with(ph, conditions, lg);
        // Saturation concentration of CO2(aq) (neutral: γ = 1), and the total carbon that
        // would sit with it at this pH, as log10 to stay finite at any pH.
        let saturation = match conditions.co2_mode() {
            Co2Mode::Closed => None,
            Co2Mode::Vented => Some(conditions.co2_henry()),
            Co2Mode::Air => Some(conditions.co2_henry() * conditions.co2_air_atm()),
        };
        let stays = match saturation {
            None => total_mol,
            Some(s) => {
                let cap = pow10((s * volume_l).log10() - a0.log10());
                match conditions.co2_mode() {
                    Co2Mode::Air => cap,
                    _ => total_mol.min(cap),
                }
            }
        };
        CarbonateSpecies {
            co2_mol: stays * a0,
            bicarbonate_mol: stays * a1,
            carbonate_mol: stays * a2,
            released_mol: (total_mol - stays).max(0.0),
            absorbed_mol: (stays - total_mol).max(0.0),
        }
    }

    /// Negative charge carried, in moles of charge.
    pub fn charge_mol(&self) -> f64 {
        -(self.bicarbonate_mol + 2.0 * self.carbonate_mol)
    }

    /// Σ c z² contribution, in moles (divide by the volume for mol/L).
    pub fn square_charge_mol(&self) -> f64 {
        self.bicarbonate_mol + 4.0 * self.carbonate_mol
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn equal_pairs_at_each_pk() {
        let c = Conditions::standard();
        let (a0, a1, _) = fractions(c.carbonate_pk1(), &c);
        assert!((a0 / a1 - 1.0).abs() < 1e-3, "{a0} {a1}");
        let (_, a1, a2) = fractions(c.carbonate_pk2(), &c);
        assert!((a1 / a2 - 1.0).abs() < 1e-3);
    }

    #[test]
    fn bicarbonate_peaks_midway() {
        // Maximum of HCO3- at (pK1 + pK2)/2 (common practice: amphiprotic species).
        let c = Conditions::standard();
        let mid = (c.carbonate_pk1() + c.carbonate_pk2()) / 2.0;
        let at = |ph: f64| fractions(ph, &c).1;
        assert!(at(mid) > at(mid - 0.01) && at(mid) > at(mid + 0.01));
        // Independent formula: a1 = K1 h / (h² + K1 h + K1 K2).
        let (k1, k2, h) = (
            10f64.powf(-c.carbonate_pk1()),
            10f64.powf(-c.carbonate_pk2()),
            10f64.powf(-mid),
        );
        let want = k1 * h / (h * h + k1 * h + k1 * k2);
        assert!((at(mid) - want).abs() < 1e-12);
    }

    #[test]
    fn extremes_are_finite_and_sum_to_one() {
        let c = Conditions::standard();
        for ph in [-500.0, -4.0, 0.0, 7.0, 14.0, 20.0, 500.0] {
            let (a0, a1, a2) = fractions(ph, &c);
            assert!(a0.is_finite() && a1.is_finite() && a2.is_finite());
            assert!((a0 + a1 + a2 - 1.0).abs() < 1e-14);
        }
        assert!(fractions(-500.0, &c).0 > 0.999);
        assert!(fractions(500.0, &c).2 > 0.999);
        let s = CarbonateSpecies::at(2.0, 30.0, &c);
        assert!((s.charge_mol() + 4.0).abs() < 1e-12);
        let air = c.clone().with_co2(Co2Mode::Air);
        for ph in [-200.0, 200.0] {
            let s = CarbonateSpecies::in_layer(1.0, 1.0, ph, &air, &|_| 0.0);
            assert!(s.charge_mol().is_finite(), "{ph}");
        }
    }

    #[test]
    fn venting_caps_dissolved_co2_at_saturation() {
        // 0.1 mol carbon in 1 L at pH 4: nearly all CO2(aq), far above the 0.034 M that
        // 1 atm of CO2 holds at 25 °C; the rest leaves.
        let c = Conditions::standard().with_co2(Co2Mode::Vented);
        let s = CarbonateSpecies::in_layer(0.1, 1.0, 4.0, &c, &|_| 0.0);
        assert!((s.co2_mol - c.co2_henry()).abs() < 1e-12);
        let kept = s.co2_mol + s.bicarbonate_mol + s.carbonate_mol;
        assert!((kept + s.released_mol - 0.1).abs() < 1e-12);
        // Below saturation nothing leaves.
        let s = CarbonateSpecies::in_layer(1e-3, 1.0, 4.0, &c, &|_| 0.0);
        assert_eq!(s.released_mol, 0.0);
        // In air, pH 4 water keeps only KH · 420e-6 atm of CO2.
        let a = Conditions::standard().with_co2(Co2Mode::Air);
        let s = CarbonateSpecies::in_layer(1e-3, 1.0, 4.0, &a, &|_| 0.0);
        assert!((s.co2_mol - a.co2_henry() * 420e-6).abs() < 1e-12);
        assert!(Co2Mode::parse("Vented").unwrap() == Co2Mode::Vented);
        assert!(Co2Mode::parse("open").is_err());
    }
}
