//! A compound's acid-base profile: the structure as written, its split into titrating parents
//! and counter-ions, and the sites of each parent.

use super::estimate::estimate_sites;
use super::group::{Kind, NEUTRAL_ABOVE, NEUTRAL_BELOW};
use super::handbook::Handbook;
use super::measured::Origin;
use super::sites::Site;
use crate::chem::components::{Compound, split};
use crate::chem::molecule::Molecule;
use crate::equilibrium::{self, Protolyte, SiteKind};
use crate::error::Result;

/// Everything phdose knows about one input structure.
#[derive(Debug, Clone)]
pub struct Profile {
    /// The SMILES exactly as the user gave it.
    pub smiles: String,
    /// The molecule as written (charges, counter-ions and all).
    pub molecule: Molecule,
    pub compound: Compound,
    /// Sites of all parents, by atom index of the written molecule.
    pub sites: Vec<Site>,
    /// Groups of the parents whose constant lies beyond water's range (ketone and amide O,
    /// alcohols...): they stay neutral in water, so they are never sites, but a handbook lists
    /// their constants.
    pub neutral_groups: Vec<Site>,
    /// Whether the pKa values are the user's, handbook values or estimates.
    pub origin: Origin,
    /// The same per parent: measured constants are macroscopic, so the site interactions of
    /// `interplay` are not added to them again.
    pub parent_origins: Vec<Origin>,
    /// Remarks on how stored values were matched to sites.
    pub notes: Vec<String>,
}

impl Profile {
    /// Reads `smiles` and finds its sites in the handbook.
    pub fn new(smiles: &str, handbook: &Handbook) -> Result<Profile> {
        let molecule = Molecule::from_smiles(smiles)?;
        let compound = split(&molecule)?;
        let (neutral_groups, mut sites): (Vec<Site>, Vec<Site>) =
            estimate_sites(&compound.neutral, &handbook.groups, &handbook.estimator)
                .into_iter()
                .filter(|s| compound.parents.iter().any(|p| p.atoms.contains(&s.atom)))
                .partition(|s| {
                    // A correction can bring such a group into the workup range: it titrates.
                    s.beyond_water && !(NEUTRAL_BELOW..=NEUTRAL_ABOVE).contains(&s.pka)
                });
        // A stored measured value beats the estimate (design §3), unless --estimate-only.
        let applied = handbook.measured.apply(&compound, &mut sites);
        Ok(Profile {
            smiles: smiles.to_string(),
            molecule,
            compound,
            sites,
            neutral_groups,
            origin: applied.origin,
            parent_origins: applied.parents,
            notes: applied.notes,
        })
    }

    /// The sites that belong to parent `i`.
    pub fn parent_sites(&self, i: usize) -> Vec<&Site> {
        let atoms = &self.compound.parents[i].atoms;
        self.sites
            .iter()
            .filter(|s| atoms.contains(&s.atom))
            .collect()
    }

    /// The titrating species of `amount_mol` of this compound, for the charge balance: one
    /// protolyte per parent, and the strong ions (cations, anions in moles of charge) its
    /// counter-ions bring.
    pub fn protolytes(&self, amount_mol: f64) -> (Vec<Protolyte>, f64, f64) {
        let c = &self.compound;
        let solutes = c
            .parents
            .iter()
            .enumerate()
            .map(|(i, parent)| {
                let sites = self
                    .parent_sites(i)
                    .iter()
                    .map(|s| equilibrium::Site {
                        kind: match s.kind {
                            Kind::Acid => SiteKind::Acid,
                            Kind::Base => SiteKind::Base,
                        },
                        pka: s.pka,
                        dpka_dt: None,
                    })
                    .collect();
                Protolyte::new(amount_mol, sites, parent.permanent_charge as f64)
                    .with_couplings(self.parent_couplings(i))
            })
            .collect();
        (
            solutes,
            c.strong_cations * amount_mol,
            c.strong_anions * amount_mol,
        )
    }

    /// Replaces the pKa of every site, in atom order, with user-given values (`--pka`).
    pub fn override_pkas(&mut self, values: &[f64]) -> Result<()> {
        if values.len() != self.sites.len() {
            let found: Vec<String> = self
                .sites
                .iter()
                .map(|s| {
                    format!(
                        "atom {} {} ({}, pKa {:.2})",
                        s.atom,
                        s.group,
                        s.kind.as_str(),
                        s.pka
                    )
                })
                .collect();
            return Err(crate::Error::Input(format!(
                "--pka for {} gives {} value(s) but phdose finds {} site(s){}{}",
                self.smiles,
                values.len(),
                self.sites.len(),
                if found.is_empty() { "" } else { ": " },
                found.join("; ")
            )));
        }
        for (site, &v) in self.sites.iter_mut().zip(values) {
            site.pka = v;
            site.pka_low = v;
            site.pka_high = v;
            site.source = "given with --pka".into();
        }
        self.origin = Origin::User;
        Ok(())
    }
}
