//! Buffer systems and the forms they are sold in: stepwise constants with their enthalpies, the
//! charge of each species, and per form the hydrate, molar mass and counter-ions. Facts come
//! from `data/buffers.csv` and `data/buffer_forms.csv` (each row with its source), through the
//! store's `builtin_buffers` tables, or from a SMILES (`from_smiles.rs`).
//!
//! A form is described by what it brings per formula unit — moles of the system, of strong
//! cations (Na+, K+) and of strong anions (Cl-) — because that is all the charge balance needs:
//! the protonation of the system part follows from electroneutrality. Its *level* is the mean
//! number of protons the system part has lost from the most protonated species
//! (NaH2PO4: 1, Na2HPO4: 2, borax: 0.5).

use serde::Deserialize;

use crate::equilibrium::Polyprotic;
use crate::error::{Error, Result};

/// The built-in tables, embedded in the binary.
pub const BUFFERS_CSV: &str = include_str!("../../data/buffers.csv");
pub const BUFFER_FORMS_CSV: &str = include_str!("../../data/buffer_forms.csv");

/// One row of `data/buffers.csv` (and of the store's `builtin_buffers`).
#[derive(Debug, Clone, PartialEq, Deserialize)]
pub struct SystemRow {
    pub name: String,
    pub aliases: Option<String>,
    pub label: String,
    pub species: String,
    pub charges: String,
    pub pkas: String,
    pub dh_kj_mol: Option<String>,
    pub source: String,
}

/// One row of `data/buffer_forms.csv` (and of `builtin_buffer_forms`).
#[derive(Debug, Clone, PartialEq, Deserialize)]
pub struct FormRow {
    pub system: String,
    pub name: String,
    pub label: String,
    pub formula: String,
    pub hydrate_water: f64,
    pub molar_mass_g_mol: f64,
    pub units: f64,
    pub strong_cations: f64,
    pub strong_anions: f64,
    pub percent_w_w: Option<f64>,
    pub density_g_ml: Option<f64>,
    pub solubility_g_100g: Option<f64>,
    pub solubility_t_c: Option<f64>,
    pub titrate_with: Option<String>,
    pub source: String,
}

/// A form a buffer component is bought in.
#[derive(Debug, Clone, PartialEq)]
pub struct BufferForm {
    /// Short name used on the command line (`nah2po4.h2o`).
    pub name: String,
    /// What the bottle says (`sodium dihydrogen phosphate monohydrate`).
    pub label: String,
    /// Formula as written on the bottle, hydrate water included (`NaH2PO4·H2O`).
    pub formula: String,
    pub hydrate_water: f64,
    pub molar_mass_g_mol: f64,
    /// Moles of the system per formula unit (4 for borax).
    pub units: f64,
    pub strong_cations: f64,
    pub strong_anions: f64,
    /// For liquids: % w/w and density (g/mL), so the amount is measured by volume.
    pub liquid: Option<(f64, f64)>,
    /// Solubility: grams of the anhydrous salt per 100 g water, at °C.
    pub solubility: Option<(f64, f64)>,
    /// Titrants prep rooms use with this form (`naoh`, `hcl`).
    pub titrate_with: Vec<String>,
    /// Not a table row: a salt phdose assumes for a SMILES system.
    pub assumed: bool,
    pub source: String,
}

/// An acid-base system a buffer is made of.
#[derive(Debug, Clone, PartialEq)]
pub struct BufferSystem {
    pub name: String,
    pub aliases: Vec<String>,
    pub label: String,
    /// Species from the most protonated down, with their charges.
    pub species: Vec<String>,
    pub charges: Vec<i32>,
    /// Stepwise pKa at 25 °C, ascending.
    pub pkas: Vec<f64>,
    /// Ionization enthalpy of each step, kJ/mol, where known.
    pub dh_kj_mol: Vec<Option<f64>>,
    /// Sold forms, in order of preference.
    pub forms: Vec<BufferForm>,
    /// Where the constants come from (a table row's source, or the pKa estimate).
    pub source: String,
    /// Constants from phdose's own estimate (a SMILES system), not a buffer table.
    pub estimated: bool,
}

fn list(text: &str) -> impl Iterator<Item = &str> {
    text.split(';').map(str::trim).filter(|s| !s.is_empty())
}

fn numbers(system: &str, what: &str, text: &str) -> Result<Vec<f64>> {
    list(text)
        .map(|v| {
            v.parse::<f64>()
                .ok()
                .filter(|x| x.is_finite())
                .ok_or_else(|| Error::Internal(format!("buffer {system}: {what} '{v}'")))
        })
        .collect()
}

impl BufferForm {
    /// Mean protons lost from the most protonated species per unit of the system.
    pub fn level(&self, top_charge: i32) -> f64 {
        top_charge as f64 + (self.strong_cations - self.strong_anions) / self.units
    }

    /// Molar mass without the hydrate water, g/mol.
    pub fn anhydrous_molar_mass(&self) -> f64 {
        // Water 18.015 g/mol from the IUPAC 2021 atomic weights of H and O in data/elements.csv.
        self.molar_mass_g_mol - 18.015 * self.hydrate_water
    }

    /// Highest concentration in water, mol of formula units per litre, roughly (the solubility
    /// per 100 g of water taken per 100 mL of solution): good enough to warn.
    pub fn solubility_mol_l(&self) -> Option<f64> {
        self.solubility
            .map(|(g, _)| g * 10.0 / self.anhydrous_molar_mass())
    }

    fn from_row(row: &FormRow) -> Result<BufferForm> {
        let bad = |what: &str| Error::Internal(format!("buffer form {}: {what}", row.name));
        if !(row.molar_mass_g_mol > 0.0 && row.units > 0.0) {
            return Err(bad("molar mass and units must be positive"));
        }
        if row.strong_cations < 0.0 || row.strong_anions < 0.0 || row.hydrate_water < 0.0 {
            return Err(bad("negative counts"));
        }
        let liquid = match (row.percent_w_w, row.density_g_ml) {
            (Some(p), Some(d)) if p > 0.0 && d > 0.0 => Some((p, d)),
            (None, None) => None,
            _ => return Err(bad("a liquid needs both percent_w_w and density_g_ml")),
        };
        Ok(BufferForm {
            name: row.name.clone(),
            label: row.label.clone(),
            formula: row.formula.clone(),
            hydrate_water: row.hydrate_water,
            molar_mass_g_mol: row.molar_mass_g_mol,
            units: row.units,
            strong_cations: row.strong_cations,
            strong_anions: row.strong_anions,
            liquid,
            solubility: row
                .solubility_g_100g
                .map(|g| (g, row.solubility_t_c.unwrap_or(20.0))),
            titrate_with: row
                .titrate_with
                .as_deref()
                .map(|t| list(t).map(str::to_string).collect())
                .unwrap_or_default(),
            assumed: false,
            source: row.source.clone(),
        })
    }
}

impl BufferSystem {
    /// Charge of the most protonated species.
    pub fn top_charge(&self) -> i32 {
        self.charges[0]
    }

    /// The system as the equilibrium engine takes it, with `total_mol` of it.
    pub fn polyprotic(&self, total_mol: f64) -> Polyprotic {
        Polyprotic {
            name: self.name.clone(),
            total_mol,
            top_charge: self.top_charge(),
            pkas: self.pkas.clone(),
            dh_kj_mol: self.dh_kj_mol.clone(),
        }
    }

    /// Stepwise pKa values at `temperature_k` (van 't Hoff where the enthalpy is known).
    pub fn pkas_at(&self, temperature_k: f64) -> Vec<f64> {
        self.polyprotic(0.0).pkas_at(temperature_k)
    }

    /// The form called `name` (case-insensitive), or an error listing the forms.
    pub fn form(&self, name: &str) -> Result<&BufferForm> {
        self.forms
            .iter()
            .find(|f| f.name.eq_ignore_ascii_case(name.trim()))
            .ok_or_else(|| {
                Error::Input(format!(
                    "{} is not a form of {}; forms: {}",
                    name,
                    self.name,
                    self.forms
                        .iter()
                        .map(|f| f.name.as_str())
                        .collect::<Vec<_>>()
                        .join(", ")
                ))
            })
    }

    /// The preferred form at each protonation level, lowest level first.
    pub fn default_forms(&self) -> Vec<&BufferForm> {
        let top = self.top_charge();
        let mut out: Vec<&BufferForm> = Vec::new();
        for f in &self.forms {
            if !out
                .iter()
                .any(|g| (g.level(top) - f.level(top)).abs() < 1e-9)
            {
                out.push(f);
            }
        }
        out.sort_by(|a, b| a.level(top).total_cmp(&b.level(top)));
        out
    }

    /// Checks the constants and charges fit together.
    pub fn validate(&self) -> Result<()> {
        let bad = |what: String| Error::Internal(format!("buffer {}: {what}", self.name));
        let n = self.pkas.len();
        if n == 0 || self.charges.len() != n + 1 || self.species.len() != n + 1 {
            return Err(bad(format!(
                "{} pKa values need {} species and charges",
                n,
                n + 1
            )));
        }
        if self.dh_kj_mol.len() != n {
            return Err(bad("one enthalpy (or none) per step".into()));
        }
        if self.charges.windows(2).any(|w| w[1] != w[0] - 1) {
            return Err(bad("each step must lower the charge by one".into()));
        }
        if self.pkas.windows(2).any(|w| w[1] < w[0]) {
            return Err(bad("pKa values must ascend".into()));
        }
        Ok(())
    }

    /// Builds the systems from table rows (the forms rows name their system).
    pub fn from_rows(systems: &[SystemRow], forms: &[FormRow]) -> Result<Vec<BufferSystem>> {
        let mut out = Vec::new();
        for row in systems {
            let pkas = numbers(&row.name, "pKa", &row.pkas)?;
            let dh = match row.dh_kj_mol.as_deref() {
                None => vec![None; pkas.len()],
                Some(text) => text
                    .split(';')
                    .map(|v| match v.trim() {
                        "" => Ok(None),
                        v => v.parse::<f64>().map(Some).map_err(|_| {
                            Error::Internal(format!("buffer {}: enthalpy '{v}'", row.name))
                        }),
                    })
                    .collect::<Result<_>>()?,
            };
            let system = BufferSystem {
                name: row.name.clone(),
                aliases: row
                    .aliases
                    .as_deref()
                    .map(|a| list(a).map(str::to_string).collect())
                    .unwrap_or_default(),
                label: row.label.clone(),
                species: list(&row.species).map(str::to_string).collect(),
                charges: numbers(&row.name, "charge", &row.charges)?
                    .iter()
                    .map(|&c| c as i32)
                    .collect(),
                pkas,
                dh_kj_mol: dh,
                forms: forms
                    .iter()
                    .filter(|f| f.system == row.name)
                    .map(BufferForm::from_row)
                    .collect::<Result<_>>()?,
                source: row.source.clone(),
                estimated: false,
            };
            system.validate()?;
            if system.forms.is_empty() {
                return Err(Error::Internal(format!("buffer {}: no forms", row.name)));
            }
            out.push(system);
        }
        if let Some(f) = forms
            .iter()
            .find(|f| !systems.iter().any(|s| s.name == f.system))
        {
            return Err(Error::Internal(format!(
                "buffer form {} names an unknown system {}",
                f.name, f.system
            )));
        }
        Ok(out)
    }

    /// Reads the two CSV texts.
    pub fn load_all(systems_csv: &str, forms_csv: &str) -> Result<Vec<BufferSystem>> {
        BufferSystem::from_rows(&read_rows(systems_csv)?, &read_rows(forms_csv)?)
    }

    /// The built-in systems embedded in the binary.
    pub fn builtin() -> Result<Vec<BufferSystem>> {
        BufferSystem::load_all(BUFFERS_CSV, BUFFER_FORMS_CSV)
    }

    /// The system called `name` or one of its aliases (case-insensitive); the error lists
    /// every system.
    pub fn find<'a>(systems: &'a [BufferSystem], name: &str) -> Result<&'a BufferSystem> {
        let key = name.trim().to_ascii_lowercase();
        systems
            .iter()
            .find(|s| s.name == key || s.aliases.iter().any(|a| a.eq_ignore_ascii_case(&key)))
            .ok_or_else(|| {
                Error::Input(format!(
                    "unknown buffer system '{name}'; systems: {} (or give a SMILES)",
                    systems
                        .iter()
                        .map(|s| s.name.as_str())
                        .collect::<Vec<_>>()
                        .join(", ")
                ))
            })
    }
}

/// Rows of a `#`-commented CSV text.
pub fn read_rows<T: for<'de> Deserialize<'de>>(text: &str) -> Result<Vec<T>> {
    csv::ReaderBuilder::new()
        .comment(Some(b'#'))
        .from_reader(text.as_bytes())
        .deserialize()
        .collect::<std::result::Result<_, _>>()
        .map_err(|e| Error::Internal(format!("buffer table: {e}")))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn every_builtin_system_loads_with_forms_on_both_sides() {
        let systems = BufferSystem::builtin().unwrap();
        for name in [
            "acetate",
            "citrate",
            "phosphate",
            "carbonate",
            "borate",
            "tris",
            "hepes",
            "mes",
            "mops",
            "glycine",
            "ammonia",
            "formate",
            "succinate",
        ] {
            let s = BufferSystem::find(&systems, name).unwrap();
            assert!(s.default_forms().len() >= 2, "{name}");
            assert!(s.dh_kj_mol.iter().all(Option::is_some), "{name}");
        }
    }

    #[test]
    fn levels_follow_from_the_counter_ions() {
        let systems = BufferSystem::builtin().unwrap();
        let p = BufferSystem::find(&systems, "phosphate").unwrap();
        let top = p.top_charge();
        assert_eq!(p.form("nah2po4.h2o").unwrap().level(top), 1.0);
        assert_eq!(p.form("Na2HPO4.7H2O").unwrap().level(top), 2.0);
        let b = BufferSystem::find(&systems, "borax").unwrap();
        assert_eq!(b.form("borax").unwrap().level(b.top_charge()), 0.5);
        let t = BufferSystem::find(&systems, "TRIS").unwrap();
        assert_eq!(t.form("tris.hcl").unwrap().level(t.top_charge()), 0.0);
        assert_eq!(t.form("tris").unwrap().level(t.top_charge()), 1.0);
        let defaults: Vec<&str> = p.default_forms().iter().map(|f| f.name.as_str()).collect();
        assert_eq!(
            defaults,
            ["h3po4", "nah2po4.h2o", "na2hpo4.7h2o", "na3po4.12h2o"]
        );
    }

    #[test]
    fn unknown_names_list_what_exists() {
        let systems = BufferSystem::builtin().unwrap();
        let Err(Error::Input(msg)) = BufferSystem::find(&systems, "bogus") else {
            panic!("expected an input error")
        };
        assert!(msg.contains("phosphate") && msg.contains("hepes"));
        let p = BufferSystem::find(&systems, "phosphate").unwrap();
        assert!(matches!(p.form("nacl"), Err(Error::Input(_))));
    }

    #[test]
    fn inconsistent_rows_are_refused() {
        let row = SystemRow {
            name: "x".into(),
            aliases: None,
            label: "x".into(),
            species: "HA;A-".into(),
            charges: "0;-2".into(),
            pkas: "4".into(),
            dh_kj_mol: None,
            source: "test".into(),
        };
        assert!(BufferSystem::from_rows(&[row], &[]).is_err());
    }
}
