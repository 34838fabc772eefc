//! A buffer system for any structure: its macroscopic pKa values from phdose's own estimate
//! (or a stored measured value, as `phdose pka` finds it), the species charges from its sites,
//! and forms to weigh — the compound as written, plus the hydrochlorides and sodium salts of
//! its neutral parent at the other protonation levels, marked as assumed (whether they are
//! sold is for the user to check; `--recipe titrate` needs only the compound as written).

use super::system::{BufferForm, BufferSystem};
use crate::acidity::measured::Origin;
use crate::acidity::{Handbook, Kind, Profile};
use crate::chem::components::{Compound, Parent};
use crate::chem::elements;
use crate::chem::formula::{formula, hill_formula_of, molar_mass};
use crate::error::{Error, Result};

/// Standard atomic weight of an element of the built-in table, g/mol.
fn weight(symbol: &str) -> Result<f64> {
    elements::by_symbol(symbol)
        .map(|e| e.weight)
        .ok_or_else(|| Error::Internal(format!("element {symbol} missing from the table")))
}

fn form(name: String, label: String, formula: String, mass: f64, cat: f64, an: f64) -> BufferForm {
    BufferForm {
        name,
        label,
        formula,
        hydrate_water: 0.0,
        molar_mass_g_mol: mass,
        units: 1.0,
        strong_cations: cat,
        strong_anions: an,
        liquid: None,
        solubility: None,
        titrate_with: vec!["naoh".into(), "hcl".into()],
        assumed: true,
        source: "assumed salt of the structure (phdose)".into(),
    }
}

/// The neutral parent and its HCl and sodium salts at every protonation level but the one
/// written: the parent sits at level `bases`, HCl below it, Na for H above it.
fn assumed_salts(
    smiles: &str,
    compound: &Compound,
    parent: &Parent,
    bases: i32,
    steps: usize,
    given_level: f64,
) -> Result<Vec<BufferForm>> {
    let mut out = Vec::new();
    // The neutral parent sits at level `bases`; HCl below it, Na for H above it.
    let neutral = &compound.neutral;
    let hydrogen = weight("H")?;
    let parent_mass: f64 = parent
        .atoms
        .iter()
        .map(|&a| {
            let atom = &neutral.atoms[a];
            elements::atom_mass(atom.element, atom.isotope).unwrap_or(0.0)
                + atom.hydrogens() as f64 * hydrogen
        })
        .sum();
    let parent_formula = hill_formula_of(neutral, &parent.atoms);
    let hcl = hydrogen + weight("Cl")?;
    let na_for_h = weight("Na")? - hydrogen;
    for level in 0..=steps as i32 {
        if (level as f64 - given_level).abs() < 1e-9 {
            continue;
        }
        let k = (level - bases) as f64;
        let f = match level.cmp(&bases) {
            std::cmp::Ordering::Less => form(
                format!("hcl{}", -k),
                format!("{} HCl salt of {smiles} (assumed)", -k),
                format!("{parent_formula}·{}HCl", -k),
                parent_mass - k * hcl,
                0.0,
                -k,
            ),
            std::cmp::Ordering::Equal => form(
                "neutral".into(),
                format!("{smiles}, neutral form (assumed)"),
                parent_formula.clone(),
                parent_mass,
                0.0,
                0.0,
            ),
            std::cmp::Ordering::Greater => form(
                format!("na{k}"),
                format!("{k} Na salt of {smiles} (assumed)"),
                format!("{parent_formula} -{k}H +{k}Na"),
                parent_mass + k * na_for_h,
                k,
                0.0,
            ),
        };
        out.push(f);
    }
    Ok(out)
}

/// The buffer system of the structure `smiles`.
pub fn system_from_smiles(smiles: &str, handbook: &Handbook) -> Result<BufferSystem> {
    let profile = Profile::new(smiles, handbook)?;
    let compound = &profile.compound;
    let [parent] = compound.parents.as_slice() else {
        return Err(Error::Input(format!(
            "{smiles}: a buffer needs exactly one titrating compound, found {}",
            compound.parents.len()
        )));
    };
    let constants = profile.constants();
    let pkas = constants.macro_pka.clone();
    if pkas.is_empty() {
        return Err(Error::Input(format!(
            "{smiles}: phdose finds no ionizable site, so it cannot buffer"
        )));
    }
    let bases = profile
        .parent_sites(0)
        .iter()
        .filter(|s| s.kind == Kind::Base)
        .count() as i32;
    let top = bases + parent.permanent_charge;
    let charges: Vec<i32> = (0..=pkas.len() as i32).map(|i| top - i).collect();
    let mut given = form(
        smiles.to_string(),
        format!("{smiles} (as written)"),
        formula(&profile.molecule),
        molar_mass(&profile.molecule),
        compound.strong_cations,
        compound.strong_anions,
    );
    given.assumed = false;
    given.source = "the structure as given".into();
    let given_level = given.level(top);
    let mut forms = vec![given];
    if parent.permanent_charge == 0 {
        forms.extend(assumed_salts(
            smiles,
            compound,
            parent,
            bases,
            pkas.len(),
            given_level,
        )?);
    }
    let mut sites: Vec<String> = pkas.iter().map(|p| format!("{p:.2}")).collect();
    if let Some(note) = constants.note {
        sites.push(note);
    }
    let system = BufferSystem {
        name: smiles.to_string(),
        aliases: Vec::new(),
        label: format!("{smiles} (pKa {})", sites.join(", ")),
        species: charges.iter().map(|z| format!("charge {z:+}")).collect(),
        charges,
        dh_kj_mol: vec![None; pkas.len()],
        pkas,
        forms,
        source: match profile.origin {
            Origin::User => "phdose pka: your stored measured value",
            Origin::Measured => "phdose pka: built-in measured value (data/measured.csv)",
            Origin::Estimate | Origin::Mixed => {
                "phdose pka: phdose's own estimate (group values with Hammett/Taft corrections)"
            }
        }
        .into(),
        estimated: true,
    };
    system.validate()?;
    Ok(system)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn a_carboxylic_acid_gives_a_one_step_system_with_its_sodium_salt() {
        let handbook = Handbook::builtin().unwrap();
        let s = system_from_smiles("CCC(=O)O", &handbook).unwrap();
        assert_eq!(s.pkas.len(), 1);
        assert_eq!(s.charges, vec![0, -1]);
        assert!(s.estimated);
        let salt = s.form("na1").unwrap();
        // Sodium propanoate C3H5NaO2: 96.06 g/mol (formula weight, IUPAC 2021 atomic weights).
        assert!((salt.molar_mass_g_mol - 96.06).abs() < 0.01);
        assert_eq!(salt.level(0), 1.0);
    }

    #[test]
    fn an_amine_hydrochloride_keeps_its_written_form() {
        let handbook = Handbook::builtin().unwrap();
        let s = system_from_smiles("CC[NH3+].[Cl-]", &handbook).unwrap();
        assert_eq!(s.charges, vec![1, 0]);
        assert_eq!(s.forms[0].level(1), 0.0);
        assert!(s.form("neutral").is_ok());
        assert!(system_from_smiles("CCCC", &handbook).is_err());
    }
}
