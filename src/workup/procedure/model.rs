//! A procedure once read and checked for sense: compounds with their sites, liquids resolved
//! to reagents and stocks, amounts in moles and volumes in litres. The simulation works on
//! these types only; positions in the file are kept as line numbers for the report.

use serde::Deserialize;

use crate::acidity::Profile;
use crate::equilibrium::{Conditions, Reagent, Stock, StockOffer};
use crate::error::{Error, Result};
use crate::partition::solvents::Solvent;

/// The embedded table of neutral liquids (water, brine).
pub const WASH_LIQUIDS_CSV: &str = include_str!("../../../data/wash_liquids.csv");

/// A whole procedure.
#[derive(Debug, Clone)]
pub struct Procedure {
    pub title: Option<String>,
    /// Index into `mixture.compounds` of the compound the procedure should deliver.
    pub product: Option<usize>,
    pub mixture: Mixture,
    pub steps: Vec<Step>,
}

/// The flask before the first step.
#[derive(Debug, Clone)]
pub struct Mixture {
    pub solvent: &'static Solvent,
    /// Organic solution volume, L.
    pub organic_l: f64,
    /// Water already present, L (0 when none).
    pub water_l: f64,
    pub conditions: Conditions,
    pub compounds: Vec<Compound>,
}

/// One compound of the mixture.
#[derive(Debug, Clone)]
pub struct Compound {
    /// The name the file gives it.
    pub name: String,
    /// As written in the file.
    pub smiles: String,
    pub profile: Profile,
    pub amount_mol: f64,
}

/// One step of the procedure.
#[derive(Debug, Clone)]
pub struct Step {
    /// 1-based, in file order.
    pub number: usize,
    /// Line of the step's `do` key.
    pub line: usize,
    pub note: Option<String>,
    pub action: Action,
}

/// Which layer a `keep` names.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Which {
    Organic,
    Aqueous,
    Top,
    Bottom,
}

impl Which {
    pub fn parse(text: &str) -> Option<Which> {
        match text.trim().to_ascii_lowercase().as_str() {
            "organic" => Some(Which::Organic),
            "aqueous" => Some(Which::Aqueous),
            "top" | "upper" => Some(Which::Top),
            "bottom" | "lower" => Some(Which::Bottom),
            _ => None,
        }
    }

    pub fn as_str(&self) -> &'static str {
        match self {
            Which::Organic => "organic",
            Which::Aqueous => "aqueous",
            Which::Top => "top",
            Which::Bottom => "bottom",
        }
    }
}

/// A neutral liquid (water, brine) from `data/wash_liquids.csv`.
#[derive(Debug, Clone, PartialEq, Deserialize)]
pub struct PlainLiquid {
    pub name: String,
    pub aliases: String,
    /// NaCl per litre, mol/L.
    pub nacl_mol_l: f64,
    pub density_g_ml: f64,
    pub source: String,
}

impl PlainLiquid {
    /// Every row of the table.
    pub fn builtin() -> Result<Vec<PlainLiquid>> {
        csv::ReaderBuilder::new()
            .comment(Some(b'#'))
            .from_reader(WASH_LIQUIDS_CSV.as_bytes())
            .deserialize()
            .collect::<std::result::Result<_, _>>()
            .map_err(|e| Error::Internal(format!("data/wash_liquids.csv: {e}")))
    }

    /// Whether `name` is this liquid's name or one of its aliases.
    pub fn answers_to(&self, name: &str) -> bool {
        let key = name.trim().to_ascii_lowercase();
        self.name == key || self.aliases.split(';').any(|a| a.trim() == key)
    }
}

/// What goes into the funnel.
#[derive(Debug, Clone, PartialEq)]
pub enum Liquid {
    Reagent {
        reagent: Box<Reagent>,
        offer: StockOffer,
    },
    Plain(PlainLiquid),
}

impl Liquid {
    /// `nahco3 (sat)`, `brine`.
    pub fn label(&self) -> String {
        match self {
            Liquid::Reagent { reagent, offer } => format!("{} ({})", reagent.name, offer.label()),
            Liquid::Plain(p) => p.name.clone(),
        }
    }

    /// Density of the liquid as added, g/mL (for which layer is on top).
    pub fn density_g_ml(&self) -> f64 {
        match self {
            Liquid::Reagent { offer, .. } => offer.density_g_ml.unwrap_or(1.0),
            Liquid::Plain(p) => p.density_g_ml,
        }
    }
}

/// One addition: a liquid and how much of it.
#[derive(Debug, Clone, PartialEq)]
pub struct Portion {
    pub liquid: Liquid,
    /// Reagent formula units (0 for water and brine), mol.
    pub mol: f64,
    /// Volume the addition brings, L (0 for a solid).
    pub volume_l: f64,
}

impl Portion {
    /// `30 mL of nahco3 (sat)`, `1.20 g of solid naoh`.
    pub fn describe(&self) -> String {
        use crate::units::{fmt_mass, fmt_volume};
        match &self.liquid {
            Liquid::Reagent { reagent, offer } => match offer.stock {
                Stock::Solid => format!(
                    "{} of solid {}",
                    fmt_mass(self.mol * reagent.molar_mass_g_mol),
                    reagent.name
                ),
                Stock::Solution { .. } => format!(
                    "{} of {} {}",
                    fmt_volume(self.volume_l),
                    offer.label(),
                    reagent.name
                ),
            },
            Liquid::Plain(p) => format!("{} of {}", fmt_volume(self.volume_l), p.name),
        }
    }
}

/// The pH a step says it aims for, if it says so.
#[derive(Debug, Clone, Copy, Default, PartialEq)]
pub struct Aim {
    pub at_least: Option<f64>,
    pub at_most: Option<f64>,
}

/// How an acidify or basify step says how much.
#[derive(Debug, Clone, PartialEq)]
pub enum AdjustBy {
    /// Add what it takes to reach this pH.
    ToPh(f64),
    /// Add this much.
    Given(Box<Portion>),
}

/// What a step does.
#[allow(clippy::large_enum_variant)] // a few per file, never moved in bulk
#[derive(Debug, Clone)]
pub enum Action {
    /// Add a liquid or solid to the funnel (and shake).
    Add {
        portion: Portion,
        aim: Aim,
    },
    /// Let the layers part; keep one in the funnel, set the other aside or discard it.
    Separate {
        keep: Which,
        set_aside: Option<String>,
    },
    /// Wash the organic layer in the funnel with `portions` fresh portions.
    Wash {
        portion: Portion,
        portions: u32,
        set_aside: Option<String>,
        aim: Aim,
    },
    /// Bring the aqueous layer in the funnel to an acidic (`raise` false) or basic pH.
    Adjust {
        raise: bool,
        reagent: Box<Reagent>,
        offer: StockOffer,
        by: AdjustBy,
    },
    /// Extract the aqueous layer in the funnel with fresh solvent, `portions` times.
    Extract {
        solvent: &'static Solvent,
        volume_l: f64,
        portions: u32,
        keep: Which,
        set_aside: Option<String>,
    },
    /// Pour named layers into the funnel (the funnel's own content set aside first if named).
    Combine {
        layers: Vec<String>,
        set_aside: Option<String>,
    },
    Dry {
        agent: Option<String>,
    },
    Concentrate,
}

impl Action {
    /// The word used in the file.
    pub fn verb(&self) -> &'static str {
        match self {
            Action::Add { .. } => "add",
            Action::Separate { .. } => "separate",
            Action::Wash { .. } => "wash",
            Action::Adjust { raise: false, .. } => "acidify",
            Action::Adjust { raise: true, .. } => "basify",
            Action::Extract { .. } => "extract",
            Action::Combine { .. } => "combine",
            Action::Dry { .. } => "dry",
            Action::Concentrate => "concentrate",
        }
    }
}
