//! Carbonic acid in a closed system: all dissolved inorganic carbon stays in the layer and is
//! shared between CO2(aq) (with H2CO3, written H2CO3*), HCO3- and CO3-- by the two acid
//! constants at the layer's temperature (see `water::Conditions`).

use super::water::Conditions;

/// Fractions of total carbonate as (H2CO3*, HCO3-, CO3--) at `ph`; they sum to 1.
///
/// Terms h², K1·h, K1·K2 are formed as base-10 logarithms and scaled by the largest, so no
/// pH, however extreme, overflows or loses the dominant species.
pub fn fractions(ph: f64, conditions: &Conditions) -> (f64, f64, f64) {
    let (pk1, pk2) = (conditions.carbonate_pk1(), conditions.carbonate_pk2());
    let logs = [-2.0 * ph, -pk1 - ph, -pk1 - pk2];
    let top = logs.iter().cloned().fold(f64::NEG_INFINITY, f64::max);
    let terms = logs.map(|l| 10f64.powf(l - top));
    let sum: f64 = terms.iter().sum();
    (terms[0] / sum, terms[1] / sum, terms[2] / sum)
}

/// Carbonate species in a layer, in moles.
#[derive(Debug, Clone, PartialEq)]
pub struct CarbonateSpecies {
    /// Dissolved CO2 (with the little H2CO3): what can leave as gas.
    pub co2_mol: f64,
    pub bicarbonate_mol: f64,
    pub carbonate_mol: f64,
}

impl CarbonateSpecies {
    /// Splits `total_mol` of carbon at `ph`.
    pub fn at(total_mol: f64, ph: f64, conditions: &Conditions) -> CarbonateSpecies {
        let (a0, a1, a2) = fractions(ph, conditions);
        CarbonateSpecies {
            co2_mol: total_mol * a0,
            bicarbonate_mol: total_mol * a1,
            carbonate_mol: total_mol * a2,
        }
    }

    /// Negative charge carried, in moles of charge.
    pub fn charge_mol(&self) -> f64 {
        -(self.bicarbonate_mol + 2.0 * self.carbonate_mol)
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
    }
}
