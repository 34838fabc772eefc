//! Distribution between an aqueous and an organic layer (design §3, two phases).
//!
//! Only the neutral species crosses into the organic layer, so the distribution ratio
//! D = [compound]org / [compound]aq (all forms) is P · f_neutral(pH), and
//! logD(pH) = log10(P · f_neutral(pH)). At equilibrium the share left in water is
//! Va / (Va + D·Vo) = 1 / (1 + D·Vo/Va) whichever layer the compound started in; repeated
//! portions of fresh solvent multiply those shares. Volumes may be in any one unit.

/// D from logP and the neutral fraction at the pH of the aqueous layer.
pub fn distribution_ratio(log_p: f64, fraction_neutral: f64) -> f64 {
    10f64.powf(log_p) * fraction_neutral.clamp(0.0, 1.0)
}

/// logD = log10(P · f_neutral); minus infinity when no neutral form exists at all
/// (a permanent cation, or a compound fully ionized to machine precision).
pub fn log_d(log_p: f64, fraction_neutral: f64) -> f64 {
    let f = fraction_neutral.clamp(0.0, 1.0);
    if f == 0.0 {
        f64::NEG_INFINITY
    } else {
        log_p + f.log10()
    }
}

/// logD at a pH, given the compound's neutral fraction as a function of pH.
pub fn log_d_at(log_p: f64, ph: f64, fraction_neutral: impl Fn(f64) -> f64) -> f64 {
    log_d(log_p, fraction_neutral(ph))
}

/// Share of a compound in the aqueous layer at equilibrium: 1 / (1 + D·Vo/Va).
pub fn fraction_aqueous(d: f64, organic_volume: f64, aqueous_volume: f64) -> f64 {
    let d = d.max(0.0);
    let (vo, va) = (organic_volume.max(0.0), aqueous_volume.max(0.0));
    if va == 0.0 {
        // No water: everything is in the organic layer (or nowhere to go if neither exists).
        return if vo == 0.0 { 1.0 } else { 0.0 };
    }
    1.0 / (1.0 + d * vo / va)
}

/// Share of a compound in the organic layer at equilibrium: D·Vo / (Va + D·Vo).
pub fn fraction_organic(d: f64, organic_volume: f64, aqueous_volume: f64) -> f64 {
    1.0 - fraction_aqueous(d, organic_volume, aqueous_volume)
}

/// An aqueous solution extracted with `portions` fresh organic portions of `organic_volume`
/// each: the share still in the water at the end.
pub fn left_in_water_after_extractions(
    d: f64,
    organic_volume: f64,
    aqueous_volume: f64,
    portions: u32,
) -> f64 {
    fraction_aqueous(d, organic_volume, aqueous_volume).powi(portions as i32)
}

/// An organic layer washed with `portions` fresh aqueous portions of `aqueous_volume` each:
/// the share still in the organic layer at the end (the rest is in the combined washes).
pub fn left_in_organic_after_washes(
    d: f64,
    organic_volume: f64,
    aqueous_volume: f64,
    portions: u32,
) -> f64 {
    fraction_organic(d, organic_volume, aqueous_volume).powi(portions as i32)
}

/// Amounts of one compound in the two layers.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct LayerAmounts {
    /// mol in the aqueous layer (all protonation states).
    pub aqueous_mol: f64,
    /// mol in the organic layer (neutral form only).
    pub organic_mol: f64,
}

impl LayerAmounts {
    /// Total moles; the quantity every split keeps.
    pub fn total(&self) -> f64 {
        self.aqueous_mol + self.organic_mol
    }

    /// mol/L in water, given the aqueous volume in litres.
    pub fn aqueous_concentration(&self, aqueous_volume_l: f64) -> f64 {
        if aqueous_volume_l > 0.0 {
            self.aqueous_mol / aqueous_volume_l
        } else {
            0.0
        }
    }

    /// mol/L in the organic layer, given its volume in litres.
    pub fn organic_concentration(&self, organic_volume_l: f64) -> f64 {
        if organic_volume_l > 0.0 {
            self.organic_mol / organic_volume_l
        } else {
            0.0
        }
    }

    /// Shakes the two layers to equilibrium at distribution ratio `d`: the same total moles,
    /// shared as `fraction_aqueous` says.
    pub fn equilibrate(&self, d: f64, organic_volume: f64, aqueous_volume: f64) -> LayerAmounts {
        split(self.total(), d, organic_volume, aqueous_volume)
    }
}

/// Shares `total_mol` of one compound between the layers at equilibrium.
pub fn split(total_mol: f64, d: f64, organic_volume: f64, aqueous_volume: f64) -> LayerAmounts {
    let aqueous_mol = total_mol * fraction_aqueous(d, organic_volume, aqueous_volume);
    LayerAmounts {
        aqueous_mol,
        organic_mol: total_mol - aqueous_mol,
    }
}

/// The D that leaves a share `fraction_in_water` of the compound in water: the inverse of
/// `fraction_aqueous`, used to ask which pH a separation needs.
pub fn ratio_for_aqueous_share(
    fraction_in_water: f64,
    organic_volume: f64,
    aqueous_volume: f64,
) -> Option<f64> {
    if !(fraction_in_water > 0.0 && fraction_in_water <= 1.0) || organic_volume <= 0.0 {
        return None;
    }
    Some((1.0 / fraction_in_water - 1.0) * aqueous_volume / organic_volume)
}

#[cfg(test)]
mod tests {
    use super::*;
    use approx::assert_relative_eq;

    /// One wash, by hand: D = 9 with equal volumes leaves 1/10 in water, 9/10 in the organic.
    #[test]
    fn one_wash_equal_volumes() {
        assert_relative_eq!(fraction_aqueous(9.0, 50.0, 50.0), 0.1, epsilon = 1e-15);
        assert_relative_eq!(fraction_organic(9.0, 50.0, 50.0), 0.9, epsilon = 1e-15);
        // Halving the organic volume: 1/(1 + 9·25/50) = 1/5.5.
        assert_relative_eq!(
            fraction_aqueous(9.0, 25.0, 50.0),
            1.0 / 5.5,
            epsilon = 1e-15
        );
    }

    /// Three extractions with a third of the solvent each beat one with all of it
    /// (common practice): D = 4, Va = 30, Vo = 30 at once leaves 1/5 = 0.2; three portions of
    /// 10 leave (1/(1 + 4/3))^3 = (3/7)^3 ≈ 0.0787.
    #[test]
    fn n_extractions_multiply() {
        let once = left_in_water_after_extractions(4.0, 30.0, 30.0, 1);
        let thrice = left_in_water_after_extractions(4.0, 10.0, 30.0, 3);
        assert_relative_eq!(once, 0.2, epsilon = 1e-15);
        assert_relative_eq!(thrice, (3.0f64 / 7.0).powi(3), epsilon = 1e-15);
        assert!(thrice < once);
        assert_eq!(left_in_water_after_extractions(4.0, 10.0, 30.0, 0), 1.0);
    }

    /// Washing an organic layer: D = 0.25 (mostly ionized), Vo = 40, Va = 20 per wash; each
    /// wash keeps D·Vo/(D·Vo + Va) = 10/30 in the organic, two washes 1/9.
    #[test]
    fn n_washes_of_an_organic_layer() {
        assert_relative_eq!(
            left_in_organic_after_washes(0.25, 40.0, 20.0, 2),
            1.0 / 9.0,
            epsilon = 1e-15
        );
    }

    /// A monoprotic acid with pKa 4.2 and logP 1.9 (benzoic acid-like numbers, for the
    /// arithmetic only): f_neutral = 1/(1 + 10^(pH - pKa)) written here independently.
    #[test]
    fn ph_dependent_distribution() {
        let (log_p, pka) = (1.9, 4.2);
        let f = |ph: f64| 1.0 / (1.0 + 10f64.powf(ph - pka));
        // At pH = pKa half is neutral: logD = logP - log10 2.
        assert_relative_eq!(
            log_d_at(log_p, pka, f),
            log_p - 2f64.log10(),
            epsilon = 1e-12
        );
        // Three units above the pKa: logD ≈ logP - 3 (exactly logP - log10(1 + 1000)).
        assert_relative_eq!(
            log_d_at(log_p, pka + 3.0, f),
            log_p - 1001f64.log10(),
            epsilon = 1e-12
        );
        // D from the same pieces, and the wash it implies at pH 8 with equal volumes.
        let d = distribution_ratio(log_p, f(8.0));
        let expected = 1.0 / (1.0 + 10f64.powf(1.9) / (1.0 + 10f64.powf(3.8)));
        assert_relative_eq!(fraction_aqueous(d, 1.0, 1.0), expected, epsilon = 1e-12);
        assert!(fraction_aqueous(d, 1.0, 1.0) > 0.98);
    }

    #[test]
    fn permanent_ion_never_leaves_water() {
        assert_eq!(log_d(3.0, 0.0), f64::NEG_INFINITY);
        assert_eq!(distribution_ratio(3.0, 0.0), 0.0);
        assert_eq!(fraction_aqueous(0.0, 100.0, 10.0), 1.0);
    }

    /// Mass balance: each split and re-equilibration keeps the compound's total moles.
    #[test]
    fn layers_keep_total_moles() {
        let start = LayerAmounts {
            aqueous_mol: 0.004,
            organic_mol: 0.001,
        };
        let after = start.equilibrate(3.0, 0.05, 0.1);
        assert_relative_eq!(after.total(), 0.005, epsilon = 1e-18);
        assert_relative_eq!(
            after.organic_concentration(0.05) / after.aqueous_concentration(0.1),
            3.0,
            epsilon = 1e-12
        );
        let again = after.equilibrate(3.0, 0.05, 0.1);
        assert_relative_eq!(again.aqueous_mol, after.aqueous_mol, epsilon = 1e-18);
    }

    #[test]
    fn inverse_of_the_aqueous_share() {
        let d = ratio_for_aqueous_share(0.1, 50.0, 50.0).unwrap();
        assert_relative_eq!(d, 9.0, epsilon = 1e-12);
        assert_eq!(ratio_for_aqueous_share(0.0, 50.0, 50.0), None);
        assert_eq!(ratio_for_aqueous_share(0.5, 0.0, 50.0), None);
    }

    #[test]
    fn no_water_means_all_organic() {
        assert_eq!(fraction_aqueous(2.0, 10.0, 0.0), 0.0);
        assert_eq!(split(1.0, 2.0, 10.0, 0.0).organic_mol, 1.0);
    }
}
