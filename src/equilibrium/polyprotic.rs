//! Acid-base systems given by macroscopic (stepwise) constants, as handbooks tabulate them for
//! reagents: phosphoric acid (pKa 2.15, 7.20, 12.35), citric acid, ammonium, hydrogen sulfate,
//! acetic acid. Species i has lost i protons from the most protonated form, so its charge is
//! `top_charge - i`; the fractions follow exactly from the stepwise constants (no assumption
//! that sites are independent), with activity coefficients by charge.
//!
//! Temperature: pKa(T) = pKa(25 °C) + ΔH/(R ln 10) · (1/T - 1/298.15 K) (van 't Hoff, ΔH of
//! ionization taken constant); a step without ΔH keeps its 25 °C value.

use crate::error::{Error, Result};

/// Molar gas constant, J mol^-1 K^-1 (CODATA 2018, exact).
pub const GAS_CONSTANT: f64 = 8.314_462_618;
/// The reference temperature of tabulated constants, K.
pub const T_REF_K: f64 = 298.15;

/// A dissolved acid-base system with stepwise constants.
#[derive(Debug, Clone, PartialEq)]
pub struct Polyprotic {
    /// What it is (`phosphate`, `citrate`); additions with the same name are pooled.
    pub name: String,
    /// Total moles in the layer, all forms together.
    pub total_mol: f64,
    /// Charge of the most protonated form (0 for H3PO4, +1 for NH4+, -1 for HSO4-).
    pub top_charge: i32,
    /// Stepwise pKa at 25 °C, ascending.
    pub pkas: Vec<f64>,
    /// Enthalpy of each ionization step, kJ/mol, where known.
    pub dh_kj_mol: Vec<Option<f64>>,
}

/// 10^x with the exponent kept inside the range of a double.
pub(crate) fn pow10(x: f64) -> f64 {
    10f64.powf(x.clamp(-300.0, 300.0))
}

/// Fractions of each form (0 = most protonated) at `ph` = -log10 a(H+), when a form of charge
/// z has activity coefficient 10^lg(z). Worked in logarithms and scaled by the largest term,
/// so no pH, however extreme, overflows.
pub fn fractions(ph: f64, top_charge: i32, pkas: &[f64], lg: &dyn Fn(i32) -> f64) -> Vec<f64> {
    let mut logs = Vec::with_capacity(pkas.len() + 1);
    // acc: log10 of the activity of form i relative to form 0; each form's concentration is
    // its activity over its own γ, so 1/γ is applied per form and never carried along.
    let mut acc = 0.0;
    logs.push(-lg(top_charge));
    for (i, pka) in pkas.iter().enumerate() {
        // [A_i]/[A_{i-1}] = K_i γ_{i-1} / (a_H γ_i); with the 1/γ_i factored per form.
        acc += ph - pka;
        logs.push(acc - lg(top_charge - i as i32 - 1));
    }
    let top = logs.iter().cloned().fold(f64::NEG_INFINITY, f64::max);
    let terms: Vec<f64> = logs.iter().map(|l| 10f64.powf(l - top)).collect();
    let sum: f64 = terms.iter().sum();
    terms.iter().map(|t| t / sum).collect()
}

impl Polyprotic {
    /// Rejects amounts and constants that make no sense.
    pub fn validate(&self) -> Result<()> {
        if !self.total_mol.is_finite() || self.total_mol < 0.0 {
            return Err(Error::Input(format!(
                "{}: amount must be a finite non-negative number of moles, not {}",
                self.name, self.total_mol
            )));
        }
        if self.pkas.iter().any(|p| !p.is_finite()) || self.dh_kj_mol.len() != self.pkas.len() {
            return Err(Error::Input(format!("{}: bad constants", self.name)));
        }
        Ok(())
    }

    /// The stepwise pKa values at `temperature_k`.
    pub fn pkas_at(&self, temperature_k: f64) -> Vec<f64> {
        self.pkas
            .iter()
            .zip(&self.dh_kj_mol)
            .map(|(&pka, dh)| match dh {
                Some(dh) => {
                    pka + dh * 1e3 / (GAS_CONSTANT * std::f64::consts::LN_10)
                        * (1.0 / temperature_k - 1.0 / T_REF_K)
                }
                None => pka,
            })
            .collect()
    }

    /// Fractions of each form at `ph` (constants as stored: shift them first with
    /// `pkas_at` for another temperature).
    pub fn fractions(&self, ph: f64, lg: &dyn Fn(i32) -> f64) -> Vec<f64> {
        fractions(ph, self.top_charge, &self.pkas, lg)
    }

    /// Mean charge per formula unit and mean squared charge (for the ionic strength).
    pub fn charge_moments(&self, ph: f64, lg: &dyn Fn(i32) -> f64) -> (f64, f64) {
        self.fractions(ph, lg)
            .iter()
            .enumerate()
            .fold((0.0, 0.0), |(m, s), (i, f)| {
                let z = (self.top_charge - i as i32) as f64;
                (m + f * z, s + f * z * z)
            })
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn phosphate() -> Polyprotic {
        Polyprotic {
            name: "phosphate".into(),
            total_mol: 1e-3,
            top_charge: 0,
            pkas: vec![2.15, 7.20, 12.35],
            dh_kj_mol: vec![None, Some(3.6), None],
        }
    }

    #[test]
    fn equal_neighbours_at_each_pka() {
        let p = phosphate();
        let f = p.fractions(7.20, &|_| 0.0);
        assert!((f[1] / f[2] - 1.0).abs() < 1e-12);
        assert!((f.iter().sum::<f64>() - 1.0).abs() < 1e-14);
        // Independent formula for the dihydrogen form: a1 = K1 h² / D.
        let h = 10f64.powf(-5.0);
        let k: Vec<f64> = p.pkas.iter().map(|x| 10f64.powf(-x)).collect();
        let d = h.powi(3) + k[0] * h * h + k[0] * k[1] * h + k[0] * k[1] * k[2];
        let f = p.fractions(5.0, &|_| 0.0);
        assert!((f[1] - k[0] * h * h / d).abs() < 1e-14);
    }

    #[test]
    fn charge_moments_and_activity() {
        let p = phosphate();
        // At pH 7.20 half H2PO4- and half HPO4--: mean -1.5, mean square 2.5.
        let (m, s) = p.charge_moments(7.20, &|_| 0.0);
        assert!((m + 1.5).abs() < 1e-3 && (s - 2.5).abs() < 1e-3);
        // With γ the concentration ratio of HPO4-- to H2PO4- is K2 γ1 / (a_H γ2).
        let lg = |z: i32| -0.1 * (z * z) as f64;
        let f = p.fractions(7.20, &lg);
        assert!((f[2] / f[1] - 10f64.powf(-0.1 + 0.4)).abs() < 1e-12);
        for ph in [-400.0, 400.0] {
            assert!(p.fractions(ph, &lg).iter().all(|x| x.is_finite()));
        }
    }

    #[test]
    fn a_cation_acid_feels_the_activity_of_its_own_charge() {
        // NH4+ <-> NH3: [NH3]/[NH4+] = Ka γ(NH4+) / (a_H γ(NH3)) with γ(NH3) = 1, so at
        // pH = pKa the concentration ratio is γ(+1) itself.
        let nh4 = Polyprotic {
            name: "ammonium".into(),
            total_mol: 1e-3,
            top_charge: 1,
            pkas: vec![9.245],
            dh_kj_mol: vec![None],
        };
        let lg = |z: i32| -0.1 * (z * z) as f64;
        let f = nh4.fractions(9.245, &lg);
        assert!((f[1] / f[0] - 10f64.powf(-0.1)).abs() < 1e-12);
    }

    #[test]
    fn van_t_hoff_shift() {
        // ΔH = 3.6 kJ/mol at 37 °C: ΔpKa = 3600/(R ln10) (1/310.15 - 1/298.15) = -0.0244.
        let p = phosphate();
        let at37 = p.pkas_at(310.15);
        let want = 3600.0 / (8.314462618 * 10f64.ln()) * (1.0 / 310.15 - 1.0 / 298.15);
        assert!((at37[1] - 7.20 - want).abs() < 1e-12);
        assert!((want + 0.0244).abs() < 0.0002);
        assert_eq!(at37[0], 2.15);
    }
}
