//! A compound's acid-base profile: the structure as written, its split into titrating parents
//! and counter-ions, and the sites of each parent.

use super::group::Group;
use super::sites::{Site, find_sites};
use crate::chem::components::{Compound, split};
use crate::chem::molecule::Molecule;
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
}

impl Profile {
    /// Reads `smiles` and finds its sites with `groups`.
    pub fn new(smiles: &str, groups: &[Group]) -> Result<Profile> {
        let molecule = Molecule::from_smiles(smiles)?;
        let compound = split(&molecule)?;
        let sites = find_sites(&compound.neutral, groups)
            .into_iter()
            .filter(|s| compound.parents.iter().any(|p| p.atoms.contains(&s.atom)))
            .collect();
        Ok(Profile {
            smiles: smiles.to_string(),
            molecule,
            compound,
            sites,
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
        Ok(())
    }
}
