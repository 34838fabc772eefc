//! Exact aqueous acid-base equilibrium: solutes with ionizable sites, strong ions from
//! reagents and counter-ions, water and carbonic acid, solved for pH by the charge balance;
//! and the inverse problem, how much of a reagent brings a layer to a target pH.

pub mod activity;
pub mod auto;
pub mod carbonate;
pub mod dose;
mod fixed_ph;
pub mod microstates;
pub mod polyprotic;
pub mod reagent;
mod root;
pub mod solve;
pub mod species;
pub mod water;

pub use activity::{DAVIES_LIMIT_M, Gammas};
pub use auto::{AutoChoice, Practical, choose_auto};
pub use carbonate::{CarbonateSpecies, Co2Mode};
pub use dose::{Dose, dose, dose_with_alternatives, reachable_range};
pub use microstates::Coupling;
pub use polyprotic::Polyprotic;
pub use reagent::{Reagent, Role, Stock, StockForm, StockOffer};
pub use solve::{Equilibrium, at_temperature, charge_residual, solve_ph};
pub use species::{Protolyte, Site, SiteKind, SoluteState};
pub use water::{Activity, Conditions};

use crate::error::{Error, Result};

/// One aqueous layer: its volume and everything dissolved in it.
#[derive(Debug, Clone, PartialEq)]
pub struct AqueousLayer {
    pub volume_l: f64,
    pub solutes: Vec<Protolyte>,
    /// Moles of positive charge on ions that never take or lose a proton (Na+, K+): a
    /// formula unit of Na2CO3 counts 2.
    pub strong_cations_mol: f64,
    /// Moles of negative charge on ions of strong acids (Cl-, Br-, NO3-).
    pub strong_anions_mol: f64,
    /// Total dissolved inorganic carbon (CO2 + HCO3- + CO3--), moles.
    pub carbonate_mol: f64,
    /// Acid-base systems with stepwise constants that reagents bring (phosphate, citrate,
    /// ammonium, hydrogen sulfate, acetate), one entry per kind.
    pub polyprotics: Vec<Polyprotic>,
}

impl AqueousLayer {
    /// Adds `mol` of a reagent's weak acid-base system, joining the moles already present
    /// from the same system.
    pub fn add_polyprotic(&mut self, system: Polyprotic) {
        match self.polyprotics.iter_mut().find(|p| p.name == system.name) {
            Some(existing) => existing.total_mol += system.total_mol,
            None => self.polyprotics.push(system),
        }
    }

    /// Pure water of `volume_l` litres.
    pub fn water(volume_l: f64) -> AqueousLayer {
        AqueousLayer {
            volume_l,
            solutes: Vec::new(),
            strong_cations_mol: 0.0,
            strong_anions_mol: 0.0,
            carbonate_mol: 0.0,
            polyprotics: Vec::new(),
        }
    }

    /// Rejects volumes and amounts that would make the balance meaningless (NaN, negative).
    pub fn validate(&self) -> Result<()> {
        if !self.volume_l.is_finite() || self.volume_l <= 0.0 {
            return Err(Error::Input(format!(
                "aqueous volume must be a positive number of litres, not {}",
                self.volume_l
            )));
        }
        for (name, value) in [
            ("strong cations", self.strong_cations_mol),
            ("strong anions", self.strong_anions_mol),
            ("carbonate", self.carbonate_mol),
        ] {
            if !value.is_finite() || value < 0.0 {
                return Err(Error::Input(format!(
                    "{name} must be a finite non-negative number of moles, not {value}"
                )));
            }
        }
        self.polyprotics.iter().try_for_each(Polyprotic::validate)?;
        self.solutes.iter().try_for_each(Protolyte::validate)
    }
}
