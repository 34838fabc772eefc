//! Solutes as protolytes: a total amount, ionizable sites, the interactions between them, and
//! a fixed (permanent) charge. Gives, at a pH, each site's fraction ionized, the solute's mean
//! charge, and the fraction of the form with every site neutral (the extractable one). The
//! forms are weighted as microstates (see `microstates.rs`); without couplings the sites are
//! independent.
//!
//! Acid site: HA (0) <-> A- (-1). Base site: B (0) <-> BH+ (+1). In both cases the pKa is that
//! of the conjugate acid, as handbooks tabulate it.

use super::microstates::{self, Coupling};
use crate::error::{Error, Result};

/// Which way a site ionizes.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum SiteKind {
    /// Neutral form gives up a proton.
    Acid,
    /// Neutral form takes one up.
    Base,
}

/// One ionizable site.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Site {
    pub kind: SiteKind,
    /// pKa of the conjugate acid of the pair (HA for an acid, BH+ for a base), at 25 °C.
    pub pka: f64,
    /// dpKa/dT in pKa units per kelvin, where a table gives it (or an enthalpy); `None` keeps
    /// the 25 °C value at every temperature (and the report says so).
    pub dpka_dt: Option<f64>,
}

impl Site {
    pub fn acid(pka: f64) -> Site {
        Site {
            kind: SiteKind::Acid,
            pka,
            dpka_dt: None,
        }
    }

    pub fn base(pka: f64) -> Site {
        Site {
            kind: SiteKind::Base,
            pka,
            dpka_dt: None,
        }
    }

    /// Fraction in the charged form (A- or BH+) at `ph`.
    pub fn fraction_ionized(&self, ph: f64) -> f64 {
        match self.kind {
            // [A-]/[HA] = 10^(pH - pKa)
            SiteKind::Acid => logistic(ph - self.pka),
            // [BH+]/[B] = 10^(pKa - pH)
            SiteKind::Base => logistic(self.pka - ph),
        }
    }

    /// Fraction in the neutral form (HA or B) at `ph`, computed directly rather than as
    /// 1 - ionized so that tiny fractions keep their digits.
    pub fn fraction_neutral(&self, ph: f64) -> f64 {
        match self.kind {
            SiteKind::Acid => logistic(self.pka - ph),
            SiteKind::Base => logistic(ph - self.pka),
        }
    }
}

/// r / (1 + r) with r = 10^x, without overflow: 0 for very negative x, 1 for very positive.
fn logistic(x: f64) -> f64 {
    if x > 0.0 {
        1.0 / (1.0 + 10f64.powf(-x))
    } else {
        let r = 10f64.powf(x);
        r / (1.0 + r)
    }
}

/// A dissolved compound with ionizable sites.
#[derive(Debug, Clone, PartialEq)]
pub struct Protolyte {
    /// Total moles in the layer, all forms together.
    pub total_mol: f64,
    pub sites: Vec<Site>,
    /// Charge that no pH removes (a quaternary ammonium is +1).
    pub fixed_charge: f64,
    /// Pairwise interactions between `sites` (indices into it); empty = independent sites.
    pub couplings: Vec<Coupling>,
    /// P·Vo in litres: an organic layer in contact holds as much of the neutral form as this
    /// volume of water would (P = the solvent/water partition coefficient of the neutral
    /// species, Vo the organic volume). 0 = no organic layer. With it, `total_mol` counts
    /// both layers, and the charge balance sees only the aqueous share (see
    /// [`Protolyte::aqueous_share`]).
    pub organic_capacity_l: f64,
}

/// A protolyte's state at one pH.
#[derive(Debug, Clone, PartialEq)]
pub struct SoluteState {
    /// Average charge per molecule, fixed charge included.
    pub mean_charge: f64,
    /// Fraction with every site in its neutral form.
    pub fraction_neutral: f64,
    /// Per site, in the order of `Protolyte::sites`: fraction in the charged form.
    pub fraction_ionized: Vec<f64>,
}

impl Protolyte {
    pub fn new(total_mol: f64, sites: Vec<Site>, fixed_charge: f64) -> Protolyte {
        Protolyte {
            total_mol,
            sites,
            fixed_charge,
            couplings: Vec::new(),
            organic_capacity_l: 0.0,
        }
    }

    /// The same protolyte shared with an organic layer of `organic_volume_l` litres whose
    /// partition coefficient for the neutral form is `partition` (10^logP of that solvent).
    pub fn with_organic(mut self, partition: f64, organic_volume_l: f64) -> Protolyte {
        self.organic_capacity_l = partition * organic_volume_l;
        self
    }

    /// Share of the compound in an aqueous layer of `volume_l` litres when `fraction_neutral`
    /// of the aqueous compound is neutral: 1 / (1 + P·f_neutral·Vo/Va) (design §3, only the
    /// neutral species crosses). A permanently charged compound stays in water: its
    /// "all sites neutral" form still carries the fixed charge.
    pub fn aqueous_share(&self, fraction_neutral: f64, volume_l: f64) -> f64 {
        if self.organic_capacity_l <= 0.0 || self.fixed_charge != 0.0 {
            return 1.0;
        }
        1.0 / (1.0 + self.organic_capacity_l * fraction_neutral.clamp(0.0, 1.0) / volume_l)
    }

    /// The same protolyte with interactions between its sites.
    pub fn with_couplings(mut self, couplings: Vec<Coupling>) -> Protolyte {
        self.couplings = couplings;
        self
    }

    /// Rejects amounts and constants that would make the charge balance meaningless.
    pub fn validate(&self) -> Result<()> {
        if !self.total_mol.is_finite() || self.total_mol < 0.0 {
            return Err(Error::Input(format!(
                "solute amount must be a finite non-negative number of moles, not {}",
                self.total_mol
            )));
        }
        if !self.fixed_charge.is_finite() {
            return Err(Error::Input("fixed charge must be finite".into()));
        }
        if !self.organic_capacity_l.is_finite() || self.organic_capacity_l < 0.0 {
            return Err(Error::Input(format!(
                "organic capacity (P times organic volume) must be finite and non-negative, not {}",
                self.organic_capacity_l
            )));
        }
        if let Some(site) = self.sites.iter().find(|s| !s.pka.is_finite()) {
            return Err(Error::Input(format!(
                "pKa must be finite, not {}",
                site.pka
            )));
        }
        let n = self.sites.len();
        if let Some(c) = self
            .couplings
            .iter()
            .find(|c| c.a >= n || c.b >= n || c.a == c.b || !c.shift.is_finite())
        {
            return Err(Error::Input(format!(
                "site coupling {}-{} ({}) does not fit {} site(s)",
                c.a, c.b, c.shift, n
            )));
        }
        Ok(())
    }

    /// Average charge per molecule at `ph` (ideal activities).
    pub fn mean_charge(&self, ph: f64) -> f64 {
        self.state(ph).mean_charge
    }

    /// Fraction in the all-neutral microstate at `ph` (ideal activities). For a zwitterion
    /// this is small even where the mean charge is zero.
    pub fn fraction_neutral(&self, ph: f64) -> f64 {
        self.state(ph).fraction_neutral
    }

    /// Everything the report needs about this solute at `ph`, with ideal activities.
    pub fn state(&self, ph: f64) -> SoluteState {
        self.state_with(ph, &|_| 0.0)
    }

    /// State at `ph` = -log10 a(H+), with `log10_gamma(z)` the log10 activity coefficient of
    /// a species of total charge z (fixed charge included). Fractions are of concentrations:
    /// a microstate of charge z weighs 10^(its mass-action term) / γ_z, derived in
    /// `microstates.rs`.
    pub fn state_with(&self, ph: f64, log10_gamma: &dyn Fn(i32) -> f64) -> SoluteState {
        self.state_in(&self.table(), ph, log10_gamma)
    }

    /// The pH-free part of the microstate weights, for [`Protolyte::state_in`].
    pub(crate) fn table(&self) -> microstates::Table {
        microstates::Table::new(&self.sites, &self.couplings)
    }

    /// As [`Protolyte::state_with`], with this protolyte's `table` made beforehand.
    pub(crate) fn state_in(
        &self,
        table: &microstates::Table,
        ph: f64,
        log10_gamma: &dyn Fn(i32) -> f64,
    ) -> SoluteState {
        self.state_and_square_in(table, ph, log10_gamma).0
    }

    /// The state and, where the forms were enumerated, the mean squared charge per molecule
    /// (fixed charge included): E[(q + z)²] = q² + 2q E[z] + E[z²].
    pub(crate) fn state_and_square_in(
        &self,
        table: &microstates::Table,
        ph: f64,
        log10_gamma: &dyn Fn(i32) -> f64,
    ) -> (SoluteState, Option<f64>) {
        let fixed = self.fixed_charge.round() as i32;
        let (d, square) = table.distribution(&self.sites, fixed, ph, log10_gamma);
        let q = self.fixed_charge;
        let square = square.map(|s| q * q + 2.0 * q * d.mean_site_charge + s);
        let state = SoluteState {
            mean_charge: self.fixed_charge + d.mean_site_charge,
            fraction_neutral: d.fraction_neutral,
            fraction_ionized: d.fraction_ionized,
        };
        (state, square)
    }

    /// Macroscopic pKa values, in the order the protons come off.
    pub fn macro_pkas(&self) -> Vec<f64> {
        microstates::macro_pkas(&self.sites, &self.couplings)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn half_ionized_at_the_pka() {
        // Henderson–Hasselbalch: at pH = pKa the two forms are equal.
        assert!((Site::acid(4.76).fraction_ionized(4.76) - 0.5).abs() < 1e-15);
        assert!((Site::base(10.6).fraction_ionized(10.6) - 0.5).abs() < 1e-15);
    }

    #[test]
    fn one_unit_away_is_ten_to_one() {
        // [A-]/[HA] = 10 at pH = pKa + 1: ionized fraction 10/11.
        let f = Site::acid(4.0).fraction_ionized(5.0);
        assert!((f - 10.0 / 11.0).abs() < 1e-15);
        // A base one unit above its pKa is 1/11 protonated.
        let f = Site::base(9.0).fraction_ionized(10.0);
        assert!((f - 1.0 / 11.0).abs() < 1e-15);
    }

    #[test]
    fn extremes_stay_finite() {
        let s = Site::acid(4.0);
        for ph in [-1e6, -400.0, 0.0, 400.0, 1e6] {
            let (a, b) = (s.fraction_ionized(ph), s.fraction_neutral(ph));
            assert!(a.is_finite() && b.is_finite());
            assert!((a + b - 1.0).abs() < 1e-15);
        }
        // Neutral fraction keeps digits far from the pKa: 10^-10 / (1 + 10^-10).
        let tiny = s.fraction_neutral(14.0);
        assert!((tiny / 1e-10 - 1.0).abs() < 1e-9);
    }

    #[test]
    fn zwitterion_like_amino_acid() {
        // Independent carboxylic acid (2.3) and amine (9.7) sites, values as for glycine
        // (common practice). At pH 6 the mean charge is near zero but the all-neutral form
        // is tiny: product of per-site neutral fractions.
        let p = Protolyte::new(1e-3, vec![Site::acid(2.3), Site::base(9.7)], 0.0);
        let st = p.state(6.0);
        let acid_neutral = 1.0 / (1.0 + 10f64.powf(6.0 - 2.3));
        let base_neutral = 1.0 / (1.0 + 10f64.powf(9.7 - 6.0));
        assert!((st.fraction_neutral - acid_neutral * base_neutral).abs() < 1e-18);
        let charge = (1.0 - base_neutral) - (1.0 - acid_neutral);
        assert!((st.mean_charge - charge).abs() < 1e-12);
        assert_eq!(st.fraction_ionized.len(), 2);
    }

    #[test]
    fn fixed_charge_stays() {
        let quat = Protolyte::new(1e-3, vec![], 1.0);
        assert_eq!(quat.mean_charge(1.0), 1.0);
        assert_eq!(quat.mean_charge(13.0), 1.0);
        assert_eq!(quat.fraction_neutral(7.0), 1.0);
    }

    #[test]
    fn activity_moves_the_apparent_pka() {
        // Acid HA (0) <-> A- (-1) with γ(-1) = 10^-0.1: [A-]/[HA] = 10^(pH - pKa) / γ(-1), so
        // at pH = pKa the ionized fraction is 1/(1 + 10^-0.1) (independent arithmetic).
        let p = Protolyte::new(1e-3, vec![Site::acid(4.0)], 0.0);
        let lg = |z: i32| if z == 0 { 0.0 } else { -0.1 * (z * z) as f64 };
        let st = p.state_with(4.0, &lg);
        let r = 10f64.powf(0.1);
        assert!((st.fraction_ionized[0] - r / (1.0 + r)).abs() < 1e-12);
        // A quaternary ammonium acid site (fixed +1): HA+ (+1) <-> A (0), ratio γ(+1)/γ(0).
        let q = Protolyte::new(1e-3, vec![Site::acid(4.0)], 1.0);
        let st = q.state_with(4.0, &lg);
        let r = 10f64.powf(-0.1);
        assert!((st.fraction_ionized[0] - r / (1.0 + r)).abs() < 1e-12);
        assert!((st.mean_charge - (1.0 - r / (1.0 + r))).abs() < 1e-12);
        // With all γ = 1 it is the ideal state.
        assert_eq!(p.state_with(5.0, &|_| 0.0), p.state(5.0));
    }

    #[test]
    fn rejects_nonsense() {
        assert!(Protolyte::new(-1.0, vec![], 0.0).validate().is_err());
        assert!(Protolyte::new(f64::NAN, vec![], 0.0).validate().is_err());
        assert!(
            Protolyte::new(1.0, vec![Site::acid(f64::INFINITY)], 0.0)
                .validate()
                .is_err()
        );
        assert!(
            Protolyte::new(1.0, vec![Site::acid(4.0)], 0.0)
                .validate()
                .is_ok()
        );
    }
}
