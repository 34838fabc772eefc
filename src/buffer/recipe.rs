//! A buffer recipe: the request (system, pH, total concentration, volume, temperature, how it
//! is to be made) and the answer a prep room weighs and pipettes from, with the solution's
//! ionic strength, buffer capacity and the warnings that go with it.

use serde::Serialize;

use super::mixture::{Mixture, capacity};
use super::system::{BufferForm, BufferSystem};
use super::{pair, stocks, titrate};
use crate::equilibrium::{Conditions, DAVIES_LIMIT_M, Equilibrium, Reagent, StockForm};
use crate::error::{Error, Result};

/// How the buffer is made.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
#[serde(rename_all = "lowercase")]
pub enum Method {
    /// Weigh the acid form and the base form.
    Pair,
    /// Weigh one form and titrate with a strong acid or base stock to the pH.
    Titrate,
    /// Mix two stock solutions (and water to volume).
    Stocks,
}

impl Method {
    pub fn as_str(&self) -> &'static str {
        match self {
            Method::Pair => "pair",
            Method::Titrate => "titrate",
            Method::Stocks => "stocks",
        }
    }

    pub fn parse(text: &str) -> Result<Method> {
        match text.trim().to_ascii_lowercase().as_str() {
            "pair" => Ok(Method::Pair),
            "titrate" => Ok(Method::Titrate),
            "stocks" => Ok(Method::Stocks),
            other => Err(Error::Input(format!(
                "unknown recipe '{other}'; recipes: pair, titrate, stocks"
            ))),
        }
    }
}

/// Lowest and highest target pH a buffer recipe accepts (aqueous buffers, common practice).
pub const PH_RANGE: (f64, f64) = (0.0, 14.0);
/// Highest total concentration accepted, mol/L: beyond it no activity model here holds.
pub const MAX_CONC_MOL_L: f64 = 5.0;

/// What the user asks for.
#[derive(Debug, Clone, PartialEq)]
pub struct Request {
    pub ph: f64,
    /// Total concentration of the buffer system (all its forms), mol/L.
    pub conc_mol_l: f64,
    pub volume_l: f64,
    pub conditions: Conditions,
    pub method: Method,
    /// Forms chosen by name (pair/stocks: two; titrate: one); empty for the defaults.
    pub forms: Vec<String>,
    /// Titrant name and stock (`naoh`, 1 M); `None` picks NaOH or HCl 1 M.
    pub titrant: Option<(String, StockForm)>,
    /// Molarity of each stock solution (formula units of its form), for `stocks`.
    pub stock_conc_mol_l: Option<f64>,
}

impl Request {
    /// Rejects targets and amounts no recipe can make sense of.
    pub fn validate(&self) -> Result<()> {
        let (lo, hi) = PH_RANGE;
        if !(lo..=hi).contains(&self.ph) {
            return Err(Error::Input(format!(
                "target pH {} is outside {lo}-{hi}, where buffers are made",
                self.ph
            )));
        }
        if !(self.conc_mol_l > 0.0 && self.conc_mol_l <= MAX_CONC_MOL_L) {
            return Err(Error::Input(format!(
                "buffer concentration must lie between 0 and {MAX_CONC_MOL_L} M, not {} M",
                self.conc_mol_l
            )));
        }
        if !(self.volume_l.is_finite() && self.volume_l > 0.0) {
            return Err(Error::Input("volume must be positive".into()));
        }
        if let Some(s) = self.stock_conc_mol_l
            && !(s.is_finite() && s > 0.0)
        {
            return Err(Error::Input("stock concentration must be positive".into()));
        }
        Ok(())
    }

    /// Moles of the system in the final volume.
    pub fn system_mol(&self) -> f64 {
        self.conc_mol_l * self.volume_l
    }
}

/// One thing to weigh, measure or pipette.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Component {
    /// Short name (`nah2po4.h2o`, `naoh`).
    pub name: String,
    /// What the bottle says.
    pub label: String,
    pub formula: String,
    /// `acid form`, `base form`, `form`, `titrant`, `stock`.
    pub role: String,
    /// Moles of formula units (of the stock's solute for a stock solution).
    pub mol: f64,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub mass_g: Option<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub volume_ml: Option<f64>,
    /// For solutions: their molarity.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub stock_molar: Option<f64>,
}

impl Component {
    /// `mol` of a form as weighed (solids) or measured (liquids).
    pub fn of_form(form: &BufferForm, role: &str, mol: f64) -> Component {
        let grams = mol * form.molar_mass_g_mol;
        let (mass_g, volume_ml) = match form.liquid {
            Some((percent, density)) => (None, Some(grams / (percent / 100.0) / density)),
            None => (Some(grams), None),
        };
        Component {
            name: form.name.clone(),
            label: form.label.clone(),
            formula: form.formula.clone(),
            role: role.into(),
            mol,
            mass_g,
            volume_ml,
            stock_molar: None,
        }
    }
}

/// How to make one stock solution for the `stocks` recipe.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct StockPrep {
    pub name: String,
    pub label: String,
    pub formula: String,
    pub molar: f64,
    /// Per litre of stock: grams to weigh (solids) or mL to measure (liquids).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub mass_g_per_l: Option<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub volume_ml_per_l: Option<f64>,
}

/// The answer.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Recipe {
    pub system: String,
    pub system_label: String,
    /// Where the constants come from.
    pub source: String,
    /// The constants are phdose's estimate for a SMILES, not a buffer table.
    pub estimated: bool,
    pub recipe: Method,
    pub temperature_c: f64,
    pub activity: String,
    pub target_ph: f64,
    /// pH of the recipe as solved (equals the target to the bisection's precision).
    pub ph: f64,
    /// The same solution at 25 °C, when the buffer is for another temperature: the pH to
    /// read when it is adjusted at room temperature.
    pub ph_at_25c: Option<f64>,
    pub conc_mol_l: f64,
    pub volume_ml: f64,
    /// Ionic strength, mol/L.
    pub ionic_strength: f64,
    /// Buffer capacity β = dC_base/dpH, mol/L per pH unit.
    pub capacity: f64,
    /// Stepwise pKa at the temperature.
    pub pkas: Vec<f64>,
    pub components: Vec<Component>,
    /// Stock solutions to prepare first (`stocks` recipe).
    pub stocks: Vec<StockPrep>,
    /// Water to add after the components (`stocks`), or the volume to make up to.
    pub water_ml: Option<f64>,
    pub warnings: Vec<String>,
    pub notes: Vec<String>,
}

/// What a recipe method hands back: the components, the mixture they make and its state.
pub struct Made {
    pub components: Vec<Component>,
    /// (form, its molarity in the final solution or in its stock) for the solubility check.
    pub dissolved: Vec<(BufferForm, f64)>,
    pub mixture: Mixture,
    pub equilibrium: Equilibrium,
    pub stocks: Vec<StockPrep>,
    pub water_ml: Option<f64>,
    pub notes: Vec<String>,
}

/// Makes the recipe: `catalogue` supplies the titrants (NaOH, HCl stocks).
pub fn make(system: &BufferSystem, request: &Request, catalogue: &[Reagent]) -> Result<Recipe> {
    request.validate()?;
    let c = &request.conditions;
    let made = match request.method {
        Method::Pair => pair::make(system, request)?,
        Method::Titrate => titrate::make(system, request, catalogue)?,
        Method::Stocks => stocks::make(system, request)?,
    };
    let pkas = system.pkas_at(c.temperature_k());
    let beta = capacity(&made.mixture, system, c)?;
    let ph_at_25c = if (c.temperature_c() - 25.0).abs() > 1e-9 {
        let room = Conditions::new(25.0)?.with_activity(c.activity());
        Some(made.mixture.solve(system, &room)?.ph)
    } else {
        None
    };
    let warnings = warnings(system, request, &made, &pkas);
    let mut notes = made.notes;
    if system.estimated {
        notes.push(format!(
            "constants from {}, not a buffer table; check the pH with a meter",
            system.source
        ));
    }
    if let Some(ph25) = ph_at_25c {
        notes.push(format!(
            "made up at 25 °C the same solution reads pH {ph25:.2}: adjust to that reading \
             when the pH is set at room temperature"
        ));
    }
    Ok(Recipe {
        system: system.name.clone(),
        system_label: system.label.clone(),
        source: system.source.clone(),
        estimated: system.estimated,
        recipe: request.method,
        temperature_c: c.temperature_c(),
        activity: c.activity().as_str().into(),
        target_ph: request.ph,
        ph: made.equilibrium.ph,
        ph_at_25c,
        conc_mol_l: request.conc_mol_l,
        volume_ml: request.volume_l * 1e3,
        ionic_strength: made.equilibrium.ionic_strength,
        capacity: beta,
        pkas,
        components: made.components,
        stocks: made.stocks,
        water_ml: made.water_ml,
        warnings,
        notes,
    })
}

fn warnings(system: &BufferSystem, request: &Request, made: &Made, pkas: &[f64]) -> Vec<String> {
    let mut out = Vec::new();
    let nearest = pkas
        .iter()
        .map(|p| (p - request.ph).abs())
        .fold(f64::INFINITY, f64::min);
    if nearest > 1.0 {
        out.push(format!(
            "pH {:.2} is {:.1} units from the nearest pKa of {} ({}): little buffering there; \
             choose a system with a pKa within one unit",
            request.ph,
            nearest,
            system.name,
            pkas.iter()
                .map(|p| format!("{p:.2}"))
                .collect::<Vec<_>>()
                .join(", ")
        ));
    }
    for (form, molar) in &made.dissolved {
        if let (Some(limit), Some((_, t))) = (form.solubility_mol_l(), form.solubility)
            && *molar > limit
        {
            out.push(format!(
                "{} at {:.3} M exceeds its solubility (about {:.3} M at {t} °C): it will not \
                 all dissolve",
                form.label, molar, limit
            ));
        }
    }
    if made.equilibrium.ionic_strength > DAVIES_LIMIT_M {
        out.push(format!(
            "ionic strength {:.2} M is beyond the Davies equation's range (about {DAVIES_LIMIT_M} \
             M): the pH is rough; check it with a meter",
            made.equilibrium.ionic_strength
        ));
    }
    if system.estimated && (request.conditions.temperature_c() - 25.0).abs() > 1e-9 {
        out.push(
            "no temperature coefficients for a structure given as SMILES: its 25 °C constants are \
             used at every temperature"
                .into(),
        );
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn method_names() {
        assert_eq!(Method::parse("Pair").unwrap(), Method::Pair);
        assert_eq!(Method::parse("stocks").unwrap(), Method::Stocks);
        assert!(matches!(Method::parse("mix"), Err(Error::Input(_))));
    }

    #[test]
    fn requests_out_of_range_are_refused() {
        let base = Request {
            ph: 7.0,
            conc_mol_l: 0.1,
            volume_l: 1.0,
            conditions: Conditions::standard(),
            method: Method::Pair,
            forms: vec![],
            titrant: None,
            stock_conc_mol_l: None,
        };
        assert!(base.validate().is_ok());
        for bad in [
            Request {
                ph: 15.0,
                ..base.clone()
            },
            Request {
                conc_mol_l: 0.0,
                ..base.clone()
            },
            Request {
                conc_mol_l: 9.0,
                ..base.clone()
            },
            Request {
                volume_l: f64::NAN,
                ..base.clone()
            },
        ] {
            assert!(matches!(bad.validate(), Err(Error::Input(_))));
        }
    }
}
