//! What the separatory funnel holds while a procedure runs: at most one organic and one aqueous
//! layer, each with the moles of every compound it holds, and the aqueous layer with its strong
//! ions, carbon and reagent systems. Shaking hands both layers to the two-layer equilibrium of
//! [`crate::workup::layers`] and writes each compound's share back into the layers.
//!
//! Compounds are tracked per titrating parent ("slot"): a salt of two organic parts can split
//! between the layers; a compound's place in reports is that of its main (largest) parent.

use crate::equilibrium::{self, AqueousLayer, Conditions};
use crate::error::Result;
use crate::partition::measured::octanol_log_p;
use crate::partition::solvents::{Solvent, is_hydrogen_bond_donor};
use crate::workup::layers::{self, TwoLayerState, TwoLayers};

use super::model::{Compound, Liquid, Portion};

/// One titrating parent of one compound, with what its partition needs.
#[derive(Debug, Clone)]
pub struct Slot {
    /// Index of the compound in the mixture.
    pub compound: usize,
    /// The parent's protolyte for one mole (sites, couplings, permanent charge).
    pub protolyte: crate::equilibrium::Protolyte,
    /// Octanol/water logP of the neutral parent; `None` for a permanent ion.
    pub log_p_octanol: Option<f64>,
    /// O-H, N-H or S-H on the parent (selects the solvent relation's donor fit).
    pub donor: bool,
    /// The parent that stands for the compound.
    pub main: bool,
}

/// Strong cations and anions (moles of charge) that one mole of a compound brings.
pub type StrongIons = (f64, f64);

/// The slots of every compound, in mixture order, and the strong ions each mole of a compound
/// brings.
pub fn slots(compounds: &[Compound], estimate_only: bool) -> Result<(Vec<Slot>, Vec<StrongIons>)> {
    let mut out = Vec::new();
    let mut ions = Vec::new();
    for (ci, c) in compounds.iter().enumerate() {
        let (protolytes, cations, anions) = c.profile.protolytes(1.0);
        ions.push((cations, anions));
        let parents = &c.profile.compound.parents;
        let main = c.profile.compound.main_parent();
        let neutral = &c.profile.compound.neutral;
        for (pi, (parent, protolyte)) in parents.iter().zip(protolytes).enumerate() {
            let log_p_octanol = if parent.permanent_charge != 0 {
                None
            } else {
                Some(octanol_log_p(neutral, &parent.atoms, estimate_only)?.log_p)
            };
            let donor = is_hydrogen_bond_donor(neutral, &parent.atoms);
            out.push(Slot {
                compound: ci,
                protolyte,
                log_p_octanol,
                donor,
                main: Some(pi) == main,
            });
        }
    }
    Ok((out, ions))
}

/// Organic or aqueous.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum PhaseKind {
    Organic(&'static Solvent),
    Aqueous,
}

/// One liquid layer.
#[derive(Debug, Clone)]
pub struct Phase {
    pub kind: PhaseKind,
    /// Moles of each slot.
    pub slot_mol: Vec<f64>,
    /// Volume (in `volume_l`), strong ions, carbon and reagent systems; no solutes. An organic
    /// layer holds ions only when a salt was charged into it and has met no water yet.
    pub ions: AqueousLayer,
    /// Mass of the layer over its volume, g/mL (which layer is on top).
    pub density_g_ml: f64,
    /// pH at the last shake (aqueous layers).
    pub ph: Option<f64>,
}

impl Phase {
    /// A layer of `volume_l` with nothing dissolved.
    pub fn empty(kind: PhaseKind, volume_l: f64, slots: usize) -> Phase {
        Phase {
            kind,
            slot_mol: vec![0.0; slots],
            ions: AqueousLayer::water(volume_l),
            density_g_ml: match kind {
                PhaseKind::Organic(s) => s.density_g_ml,
                PhaseKind::Aqueous => layers::WATER_DENSITY_G_ML,
            },
            ph: None,
        }
    }

    pub fn volume_l(&self) -> f64 {
        self.ions.volume_l
    }

    pub fn is_organic(&self) -> bool {
        matches!(self.kind, PhaseKind::Organic(_))
    }

    /// Pours `other` into this layer: volumes, moles, ions and reagent systems add up.
    pub fn merge(&mut self, other: Phase) {
        let (v1, v2) = (self.volume_l(), other.volume_l());
        if v1 + v2 > 0.0 {
            self.density_g_ml = (self.density_g_ml * v1 + other.density_g_ml * v2) / (v1 + v2);
        }
        for (a, b) in self.slot_mol.iter_mut().zip(&other.slot_mol) {
            *a += b;
        }
        merge_ions(&mut self.ions, other.ions);
    }

    /// Adds a portion of a liquid (or a solid reagent) to this layer.
    pub fn add(&mut self, portion: &Portion) {
        let before = self.volume_l();
        let (density, added) = match &portion.liquid {
            Liquid::Reagent { reagent, offer } => {
                self.ions =
                    equilibrium::dose::with_reagent(&self.ions, reagent, &offer.stock, portion.mol);
                (portion.liquid.density_g_ml(), portion.volume_l)
            }
            Liquid::Plain(p) => {
                let salt = p.nacl_mol_l * portion.volume_l;
                self.ions.strong_cations_mol += salt;
                self.ions.strong_anions_mol += salt;
                self.ions.volume_l += portion.volume_l;
                (p.density_g_ml, portion.volume_l)
            }
        };
        if before + added > 0.0 {
            self.density_g_ml = (self.density_g_ml * before + density * added) / (before + added);
        }
    }
}

/// Adds the ions, carbon and reagent systems of `other` to `into` (volumes too).
fn merge_ions(into: &mut AqueousLayer, other: AqueousLayer) {
    into.volume_l += other.volume_l;
    into.strong_cations_mol += other.strong_cations_mol;
    into.strong_anions_mol += other.strong_anions_mol;
    into.carbonate_mol += other.carbonate_mol;
    for p in other.polyprotics {
        into.add_polyprotic(p);
    }
}

/// The funnel's content.
#[derive(Debug, Clone, Default)]
pub struct Funnel {
    pub organic: Option<Phase>,
    pub aqueous: Option<Phase>,
}

/// What one shake did.
#[derive(Debug, Clone)]
pub struct Shake {
    pub ph: f64,
    /// CO2 that left as gas, mol.
    pub co2_released_mol: f64,
    pub ionic_strength: f64,
    pub state: TwoLayerState,
}

impl Funnel {
    /// Puts a layer into the funnel, merging it with the layer of its kind already there.
    pub fn pour(&mut self, phase: Phase) {
        let place = if phase.is_organic() {
            &mut self.organic
        } else {
            &mut self.aqueous
        };
        match place {
            Some(p) => p.merge(phase),
            None => *place = Some(phase),
        }
    }

    /// The two layers as [`TwoLayers`] for the solver: every slot's total over both layers,
    /// the aqueous ions (with any ions still held by the organic layer).
    pub fn two_layers(&self, slots: &[Slot]) -> Option<TwoLayers> {
        let aqueous = self.aqueous.as_ref()?;
        let mut layer = aqueous.ions.clone();
        let (organic_l, solvent) = match &self.organic {
            Some(o) => {
                let mut stray = o.ions.clone();
                stray.volume_l = 0.0;
                merge_ions(&mut layer, stray);
                match o.kind {
                    PhaseKind::Organic(s) => (o.volume_l(), Some(s)),
                    PhaseKind::Aqueous => (0.0, None),
                }
            }
            None => (0.0, None),
        };
        let mut log_p = Vec::new();
        for (i, slot) in slots.iter().enumerate() {
            let total = aqueous.slot_mol[i] + self.organic.as_ref().map_or(0.0, |o| o.slot_mol[i]);
            let mut p = slot.protolyte.clone();
            p.total_mol = total;
            layer.solutes.push(p);
            log_p.push(match (slot.log_p_octanol, solvent) {
                (Some(lp), Some(s)) => s.log_p(lp, slot.donor).log_p,
                _ => f64::NEG_INFINITY,
            });
        }
        Some(TwoLayers {
            aqueous: layer,
            organic_l,
            log_p,
        })
    }

    /// Shakes the funnel: both layers come to equilibrium. `None` without an aqueous layer
    /// (nothing to set a pH).
    pub fn shake(&mut self, slots: &[Slot], conditions: &Conditions) -> Result<Option<Shake>> {
        let Some(two) = self.two_layers(slots) else {
            return Ok(None);
        };
        // A solid weighed into a funnel with no water yet has nothing to dissolve in.
        if two.aqueous.volume_l <= 0.0 {
            return Ok(None);
        }
        let state = layers::equilibrate(&two, conditions)?;
        self.settle(&state);
        Ok(Some(Shake {
            ph: state.ph,
            co2_released_mol: state.equilibrium.carbonate.released_mol,
            ionic_strength: state.equilibrium.ionic_strength,
            state,
        }))
    }

    /// Writes an equilibrium back: each slot's moles per layer, stray ions into the water, the
    /// carbon that stayed (vented or taken from air).
    pub fn settle(&mut self, state: &TwoLayerState) {
        let Some(aqueous) = self.aqueous.as_mut() else {
            return;
        };
        if let Some(o) = self.organic.as_mut() {
            let volume = o.volume_l();
            let mut stray = std::mem::replace(&mut o.ions, AqueousLayer::water(volume));
            stray.volume_l = 0.0;
            merge_ions(&mut aqueous.ions, stray);
        }
        for (i, share) in state.shares.iter().enumerate() {
            aqueous.slot_mol[i] = share.aqueous_mol;
            if let Some(o) = self.organic.as_mut() {
                o.slot_mol[i] = share.organic_mol;
            }
        }
        aqueous.ph = Some(state.ph);
        let c = &state.equilibrium.carbonate;
        aqueous.ions.carbonate_mol = c.co2_mol + c.bicarbonate_mol + c.carbonate_mol;
    }

    /// Whether the organic layer floats on the aqueous one.
    pub fn organic_on_top(&self) -> bool {
        match (&self.organic, &self.aqueous) {
            (Some(o), Some(a)) => o.density_g_ml < a.density_g_ml,
            (Some(o), None) => o.density_g_ml < layers::WATER_DENSITY_G_ML,
            _ => true,
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::acidity::{Handbook, Profile};
    use crate::partition::solvents;

    /// Shaking keeps every compound's moles: what leaves one layer is in the other.
    #[test]
    fn shaking_keeps_the_moles() {
        let handbook = Handbook::builtin().unwrap();
        let compounds: Vec<Compound> = [
            ("acid", "OC(=O)c1ccccc1", 2e-3),
            ("amine", "CCN(CC)CC.Cl", 1e-3),
        ]
        .iter()
        .map(|(n, s, mol)| Compound {
            name: n.to_string(),
            smiles: s.to_string(),
            profile: Profile::new(s, &handbook).unwrap(),
            amount_mol: *mol,
        })
        .collect();
        let (slots, ions) = slots(&compounds, true).unwrap();
        assert_eq!(ions[1], (0.0, 1.0), "the hydrochloride brings one chloride");
        let ether = solvents::find("ether").unwrap();
        let mut organic = Phase::empty(PhaseKind::Organic(ether), 0.05, slots.len());
        for (i, s) in slots.iter().enumerate() {
            organic.slot_mol[i] = compounds[s.compound].amount_mol;
        }
        // As a run charges it: the salt's chloride waits in the organic layer for water.
        organic.ions.strong_anions_mol = ions[1].1 * compounds[1].amount_mol;
        let mut funnel = Funnel::default();
        funnel.pour(organic);
        funnel.pour(Phase::empty(PhaseKind::Aqueous, 0.02, slots.len()));
        let shake = funnel
            .shake(&slots, &Conditions::standard())
            .unwrap()
            .unwrap();
        assert!(shake.ph > 0.0 && shake.ph < 14.0);
        for (i, s) in slots.iter().enumerate() {
            let total = funnel.organic.as_ref().unwrap().slot_mol[i]
                + funnel.aqueous.as_ref().unwrap().slot_mol[i];
            let start = compounds[s.compound].amount_mol;
            assert!(
                (total - start).abs() < 1e-12 * start.max(1.0),
                "{total} vs {start}"
            );
        }
        // The chloride met the water.
        assert_eq!(
            funnel.aqueous.as_ref().unwrap().ions.strong_anions_mol,
            1e-3
        );
    }
}
