//! The result of checking a procedure, as data: per step the pH, where every compound is, the
//! problems found and the cautions; then the final layer and every problem again. The CLI
//! prints it as a table or JSON (design §5 keys `steps`, `ph`, `problems`, `step`, `message`);
//! an HTML report can be built from the same [`Report`].

use serde::Serialize;

/// The whole check.
#[derive(Debug, Clone, Serialize)]
pub struct Report {
    pub title: Option<String>,
    pub solvent: String,
    pub temperature_c: f64,
    pub co2_mode: &'static str,
    /// Name of the compound the procedure should deliver.
    pub product: Option<String>,
    /// The flask before the first step.
    pub start: Snapshot,
    pub steps: Vec<StepReport>,
    /// Every problem, in step order.
    pub problems: Vec<Problem>,
    /// What the last step leaves in hand.
    pub end: Option<EndReport>,
    /// Said once for the whole procedure (solvent, local rules).
    pub cautions: Vec<String>,
    pub notes: Vec<String>,
    /// `ok` or `problems`.
    pub verdict: &'static str,
}

/// The layers at one moment.
#[derive(Debug, Clone, Serialize)]
pub struct Snapshot {
    /// pH of the aqueous layer in the funnel, when there is one.
    pub ph: Option<f64>,
    pub layers: Vec<LayerReport>,
}

/// One step.
#[derive(Debug, Clone, Serialize)]
pub struct StepReport {
    /// 1-based, in file order.
    pub step: usize,
    /// Line of the step in the file.
    pub line: usize,
    /// The action word (`add`, `wash`, ...).
    pub action: &'static str,
    pub note: Option<String>,
    /// What was done, in words (`30 mL of sat nahco3, 2 portions`).
    pub did: String,
    /// pH of the aqueous layer in the funnel after the step (the last portion's for washes
    /// and extractions); null where the funnel holds no aqueous layer.
    pub ph: Option<f64>,
    /// pH after each portion (washes, extractions).
    pub portion_ph: Vec<f64>,
    /// Reagent added, mol (for `to_ph`, the amount found).
    pub reagent_mol: Option<f64>,
    /// CO2 released as gas over the step, mL at the temperature and 1 atm.
    pub co2_released_ml: f64,
    pub layers: Vec<LayerReport>,
    pub problems: Vec<Problem>,
    pub cautions: Vec<String>,
}

/// One layer and what it holds.
#[derive(Debug, Clone, Serialize)]
pub struct LayerReport {
    /// `funnel`, a name given with `set_aside`, or `discarded` (everything thrown away so far).
    pub layer: String,
    /// `organic`, `aqueous` or `mixed` (discarded).
    pub phase: &'static str,
    pub volume_ml: f64,
    pub ph: Option<f64>,
    pub compounds: Vec<Holding>,
}

/// How much of one compound a layer holds.
#[derive(Debug, Clone, Serialize)]
pub struct Holding {
    pub name: String,
    /// As written in the file.
    pub smiles: String,
    pub mol: f64,
    /// Of the amount in the mixture at the start.
    pub percent: f64,
}

/// One problem: what is wrong, in plain words, and how to fix it.
#[derive(Debug, Clone, Serialize)]
pub struct Problem {
    pub step: usize,
    pub line: usize,
    /// `shortfall`, `product_discarded`, `product_loss`, `layer_mixup`, `extraction_ph`,
    /// `impurity_left`, `nothing_to_separate`, `wrong_layer`, `unreachable_ph`.
    pub kind: &'static str,
    pub message: String,
    pub fix: String,
}

/// The layer in hand after the last step.
#[derive(Debug, Clone, Serialize)]
pub struct EndReport {
    pub layer: LayerReport,
    /// Product in that layer, % of the start.
    pub product_recovery_pct: Option<f64>,
    /// Product over all compounds in that layer, mol %.
    pub product_purity_pct: Option<f64>,
}
