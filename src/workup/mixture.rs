//! A mixture of compounds as the user gave them (SMILES and amount), ready for two layers:
//! each compound's profile (sites), molar mass, moles, and per titrating parent the solvent's
//! partition coefficient (octanol logP, handbook or Wildman–Crippen, converted by the
//! solvent's relation where one is published, otherwise octanol standing in, flagged).
//!
//! Solutes of the [`TwoLayers`] are the parents of every member in order; [`Mixture::owner`]
//! maps a solute back to its member and [`Member::main`] is the parent that stands for the
//! member in reports (the one with most atoms).

use super::adjust::SoluteInput;
use super::layers::TwoLayers;
use crate::acidity::{Handbook, Profile};
use crate::chem::formula::molar_mass;
use crate::equilibrium::AqueousLayer;
use crate::error::{Error, Result};
use crate::partition::measured::{OctanolLogP, octanol_log_p};
use crate::partition::solvents::is_hydrogen_bond_donor;
use crate::partition::solvents::{Basis, Solvent, SolventLogP};

/// The partition coefficient of one parent's neutral form.
#[derive(Debug, Clone, PartialEq)]
pub struct Partition {
    pub octanol: OctanolLogP,
    pub solvent: SolventLogP,
    /// A permanent ion (quaternary ammonium ...) never leaves water.
    pub permanent_ion: bool,
}

impl Partition {
    /// Solvent/water log P for the layers; minus infinity for a permanent ion.
    pub fn log_p(&self) -> f64 {
        if self.permanent_ion {
            f64::NEG_INFINITY
        } else {
            self.solvent.log_p
        }
    }

    /// Whether octanol stands in for the solvent.
    pub fn octanol_stand_in(&self) -> bool {
        self.solvent.basis == Basis::OctanolStandIn
    }
}

/// One compound of the mixture.
#[derive(Debug, Clone)]
pub struct Member {
    /// As the user gave it.
    pub smiles: String,
    pub profile: Profile,
    pub molar_mass_g_mol: f64,
    pub amount_mol: f64,
    /// One per parent, in the compound's parent order.
    pub partitions: Vec<Partition>,
    /// Index of the parent that stands for the compound (most atoms).
    pub main: usize,
}

impl Member {
    /// Reads `input` (amounts given as a concentration refer to `water_l`) and finds its
    /// partition coefficients for `solvent`.
    pub fn new(
        input: &SoluteInput,
        handbook: &Handbook,
        solvent: &Solvent,
        water_l: f64,
    ) -> Result<Member> {
        let mut profile = Profile::new(&input.smiles, handbook)?;
        if let Some(values) = &input.pka_override {
            profile.override_pkas(values)?;
        }
        let molar_mass_g_mol = molar_mass(&profile.molecule);
        let amount_mol = input
            .amount
            .to_moles(Some(molar_mass_g_mol), Some(water_l))
            .map_err(|e| match e {
                Error::Input(m) => Error::Input(format!("amount of {}: {m}", input.smiles)),
                other => other,
            })?;
        let neutral = &profile.compound.neutral;
        let partitions = profile
            .compound
            .parents
            .iter()
            .map(|parent| {
                let octanol = octanol_log_p(neutral, &parent.atoms, handbook.estimate_only)?;
                let solvent = solvent.log_p(
                    octanol.log_p,
                    is_hydrogen_bond_donor(neutral, &parent.atoms),
                );
                Ok(Partition {
                    octanol,
                    solvent,
                    permanent_ion: parent.permanent_charge != 0,
                })
            })
            .collect::<Result<Vec<_>>>()?;
        let main = profile.compound.main_parent().unwrap_or(0);
        Ok(Member {
            smiles: input.smiles.clone(),
            profile,
            molar_mass_g_mol,
            amount_mol,
            partitions,
            main,
        })
    }

    /// The main parent's partition, if the compound has a parent at all.
    pub fn main_partition(&self) -> Option<&Partition> {
        self.partitions.get(self.main)
    }
}

/// The compounds of a workup and the solvent they meet.
#[derive(Debug, Clone)]
pub struct Mixture {
    pub members: Vec<Member>,
    pub solvent: Solvent,
}

impl Mixture {
    /// Reads every input; at least one is needed.
    pub fn new(
        inputs: &[SoluteInput],
        handbook: &Handbook,
        solvent: &Solvent,
        water_l: f64,
    ) -> Result<Mixture> {
        if inputs.is_empty() {
            return Err(Error::Input(
                "give at least one --solute SMILES AMOUNT".into(),
            ));
        }
        let members = inputs
            .iter()
            .map(|i| Member::new(i, handbook, solvent, water_l))
            .collect::<Result<Vec<_>>>()?;
        Ok(Mixture {
            members,
            solvent: solvent.clone(),
        })
    }

    /// Member index of each solute of the layers, in solute order.
    pub fn owners(&self) -> Vec<usize> {
        self.members
            .iter()
            .enumerate()
            .flat_map(|(m, member)| std::iter::repeat_n(m, member.partitions.len()))
            .collect()
    }

    /// Solute index of each member's main parent.
    pub fn main_solutes(&self) -> Vec<usize> {
        let mut start = 0;
        self.members
            .iter()
            .map(|m| {
                let i = start + m.main;
                start += m.partitions.len();
                i
            })
            .collect()
    }

    /// The whole mixture in moles per solute (each parent carries its compound's amount).
    pub fn initial_moles(&self) -> Vec<f64> {
        self.members
            .iter()
            .flat_map(|m| std::iter::repeat_n(m.amount_mol, m.partitions.len()))
            .collect()
    }

    /// Two layers holding `moles` of each solute (both layers together) over `aqueous`
    /// (water, reagent), with the strong ions of the members' counter-ions added when
    /// `counterions` (the salts' ions are in the water the first time it meets the mixture).
    pub fn layers(
        &self,
        aqueous: &AqueousLayer,
        organic_l: f64,
        moles: &[f64],
        counterions: bool,
    ) -> Result<TwoLayers> {
        let mut layer = aqueous.clone();
        let mut log_p = Vec::new();
        let mut k = 0;
        for m in &self.members {
            let (solutes, cations, anions) = m.profile.protolytes(1.0);
            for (mut p, partition) in solutes.into_iter().zip(&m.partitions) {
                p.total_mol = *moles.get(k).ok_or_else(|| {
                    Error::Internal("fewer amounts than solutes in the mixture".into())
                })?;
                layer.solutes.push(p);
                log_p.push(partition.log_p());
                k += 1;
            }
            if counterions {
                layer.strong_cations_mol += cations * m.amount_mol;
                layer.strong_anions_mol += anions * m.amount_mol;
            }
        }
        TwoLayers::new(layer, organic_l, log_p)
    }

    /// Notes on where the partition coefficients come from.
    pub fn partition_notes(&self) -> Vec<String> {
        let mut notes = Vec::new();
        let stand_in: Vec<&str> = self
            .members
            .iter()
            .filter(|m| m.partitions.iter().any(Partition::octanol_stand_in))
            .map(|m| m.smiles.as_str())
            .collect();
        if !stand_in.is_empty() {
            let spread = self.solvent.log_uncertainty;
            notes.push(format!(
                "No published relation converts octanol logP to {}: octanol/water logP stands \
                 in (± {spread} log units) for {}.",
                self.solvent.name,
                stand_in.join(", ")
            ));
        } else if self.solvent.relation.is_some() {
            notes.push(format!(
                "logP converted from octanol to {} by its Collander relation (± {} log units).",
                self.solvent.name, self.solvent.log_uncertainty
            ));
        }
        let estimated: Vec<&str> = self
            .members
            .iter()
            .filter(|m| m.partitions.iter().any(|p| !p.octanol.measured))
            .map(|m| m.smiles.as_str())
            .collect();
        if !estimated.is_empty() {
            notes.push(format!(
                "Octanol logP estimated by Wildman–Crippen atom contributions for {}.",
                estimated.join(", ")
            ));
        }
        notes
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::partition::solvents;
    use crate::units::Amount;

    fn input(smiles: &str, mmol: f64) -> SoluteInput {
        SoluteInput {
            smiles: smiles.into(),
            amount: Amount::Moles(mmol * 1e-3),
            pka_override: None,
        }
    }

    #[test]
    fn salts_bring_their_ions_once() {
        let handbook = Handbook::builtin().unwrap();
        let dcm = solvents::find("dcm").unwrap();
        let mix = Mixture::new(
            &[input("CC[NH+](CC)CC.[Cl-]", 2.0), input("CCOC(C)=O", 1.0)],
            &handbook,
            dcm,
            0.05,
        )
        .unwrap();
        assert_eq!(mix.owners(), vec![0, 1]);
        let first = mix
            .layers(&AqueousLayer::water(0.05), 0.05, &mix.initial_moles(), true)
            .unwrap();
        assert!((first.aqueous.strong_anions_mol - 2e-3).abs() < 1e-15);
        let later = mix
            .layers(
                &AqueousLayer::water(0.05),
                0.05,
                &mix.initial_moles(),
                false,
            )
            .unwrap();
        assert_eq!(later.aqueous.strong_anions_mol, 0.0);
        // Octanol stands in for dichloromethane, and the notes say so.
        assert!(mix.members[0].partitions[0].octanol_stand_in());
        assert!(mix.partition_notes()[0].contains("stands in"));
    }

    #[test]
    fn permanent_ions_stay_in_water() {
        let handbook = Handbook::builtin().unwrap();
        let ether = solvents::find("ether").unwrap();
        let mix =
            Mixture::new(&[input("C[N+](C)(C)C.[Cl-]", 1.0)], &handbook, ether, 0.05).unwrap();
        assert_eq!(mix.members[0].partitions[0].log_p(), f64::NEG_INFINITY);
    }
}
