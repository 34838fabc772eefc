//! The procedure file as TOML gives it: every value wrapped in `Spanned` so that a later check
//! (unknown reagent, bad amount, a key that does not belong to a step) can point at the line and
//! column where it was written. The keys are documented in README.md (`phdose check`).
//!
//! Unknown keys are refused by serde (`deny_unknown_fields`) with the span of the key; keys that
//! exist but do not belong to the step's action are refused by [`RawStep::keys`] and the reader.

use serde::Deserialize;
use toml::Spanned;

/// The whole file.
#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RawProcedure {
    pub title: Option<Spanned<String>>,
    /// Name of the compound the procedure is meant to deliver (one of `mixture.compound`).
    pub product: Option<Spanned<String>>,
    pub mixture: Spanned<RawMixture>,
    #[serde(default)]
    pub step: Vec<Spanned<RawStep>>,
}

/// What is in the flask before the first step.
#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RawMixture {
    /// Organic solvent (name or alias from `data/solvents.csv`).
    pub solvent: Spanned<String>,
    /// Volume of the organic solution (`60mL`).
    pub volume: Spanned<String>,
    /// Water already present (a quench), optional.
    pub water: Option<Spanned<String>>,
    /// °C, default 25.
    pub temperature: Option<Spanned<f64>>,
    /// `closed`, `vented` (default) or `air`.
    pub co2: Option<Spanned<String>>,
    /// Activity coefficients 1 instead of Davies.
    pub ideal: Option<Spanned<bool>>,
    #[serde(default)]
    pub compound: Vec<Spanned<RawCompound>>,
}

/// One compound of the mixture.
#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RawCompound {
    pub name: Spanned<String>,
    pub smiles: Spanned<String>,
    /// `2.5mmol`, `0.61g`, `150mg`.
    pub amount: Spanned<String>,
}

/// One step; which keys apply depends on `do`.
#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RawStep {
    #[serde(rename = "do")]
    pub action: Spanned<String>,
    /// Free text shown beside the step.
    pub note: Option<Spanned<String>>,
    pub reagent: Option<Spanned<String>>,
    pub stock: Option<Spanned<String>>,
    pub volume: Option<Spanned<String>>,
    pub amount: Option<Spanned<String>>,
    pub portions: Option<Spanned<i64>>,
    pub keep: Option<Spanned<String>>,
    pub set_aside: Option<Spanned<String>>,
    pub layers: Option<Spanned<Vec<Spanned<String>>>>,
    pub to_ph: Option<Spanned<f64>>,
    pub ph_at_least: Option<Spanned<f64>>,
    pub ph_at_most: Option<Spanned<f64>>,
    pub solvent: Option<Spanned<String>>,
    pub agent: Option<Spanned<String>>,
}

impl RawStep {
    /// The keys written in this step (besides `do` and `note`), each with the byte offset of
    /// its value.
    pub fn keys(&self) -> Vec<(&'static str, usize)> {
        let at = |s: &std::ops::Range<usize>| s.start;
        let mut out = Vec::new();
        let mut push = |name: &'static str, span: Option<std::ops::Range<usize>>| {
            if let Some(s) = span {
                out.push((name, at(&s)));
            }
        };
        push("reagent", self.reagent.as_ref().map(Spanned::span));
        push("stock", self.stock.as_ref().map(Spanned::span));
        push("volume", self.volume.as_ref().map(Spanned::span));
        push("amount", self.amount.as_ref().map(Spanned::span));
        push("portions", self.portions.as_ref().map(Spanned::span));
        push("keep", self.keep.as_ref().map(Spanned::span));
        push("set_aside", self.set_aside.as_ref().map(Spanned::span));
        push("layers", self.layers.as_ref().map(Spanned::span));
        push("to_ph", self.to_ph.as_ref().map(Spanned::span));
        push("ph_at_least", self.ph_at_least.as_ref().map(Spanned::span));
        push("ph_at_most", self.ph_at_most.as_ref().map(Spanned::span));
        push("solvent", self.solvent.as_ref().map(Spanned::span));
        push("agent", self.agent.as_ref().map(Spanned::span));
        out
    }
}

/// The keys each action accepts (besides `do` and `note`).
pub fn allowed_keys(action: &str) -> Option<&'static [&'static str]> {
    Some(match action {
        "add" => &[
            "reagent",
            "stock",
            "volume",
            "amount",
            "ph_at_least",
            "ph_at_most",
        ],
        "separate" => &["keep", "set_aside"],
        "wash" => &[
            "reagent",
            "stock",
            "volume",
            "amount",
            "portions",
            "set_aside",
            "ph_at_least",
            "ph_at_most",
        ],
        "acidify" | "basify" => &["reagent", "stock", "volume", "amount", "to_ph"],
        "extract" => &["solvent", "volume", "portions", "keep", "set_aside"],
        "combine" => &["layers", "set_aside"],
        "dry" => &["agent"],
        "concentrate" => &[],
        _ => return None,
    })
}

/// Every action, in the order the README lists them.
pub const ACTIONS: [&str; 9] = [
    "add",
    "separate",
    "wash",
    "acidify",
    "basify",
    "extract",
    "combine",
    "dry",
    "concentrate",
];

/// The byte offset of the key whose value starts at `value_at`: back over `=` and blanks to
/// the bare key. Falls back to the value itself for quoted or dotted keys.
pub fn key_position(text: &str, value_at: usize) -> usize {
    let bytes = text.as_bytes();
    let mut i = value_at.min(bytes.len());
    while i > 0 && matches!(bytes[i - 1], b' ' | b'\t') {
        i -= 1;
    }
    if i == 0 || bytes[i - 1] != b'=' {
        return value_at;
    }
    i -= 1;
    while i > 0 && matches!(bytes[i - 1], b' ' | b'\t') {
        i -= 1;
    }
    let end = i;
    while i > 0 && (bytes[i - 1].is_ascii_alphanumeric() || matches!(bytes[i - 1], b'_' | b'-')) {
        i -= 1;
    }
    if i == end { value_at } else { i }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn key_position_walks_back_over_equals() {
        let text = "[[step]]\ndo = \"add\"\nportions  =  3\n";
        let value = text.find('3').unwrap();
        assert_eq!(key_position(text, value), text.find("portions").unwrap());
        // A value that is not after `=` (an array element) stays where it is.
        let text = "layers = [\"a\", \"b\"]";
        let b = text.find("\"b\"").unwrap();
        assert_eq!(key_position(text, b), b);
    }

    #[test]
    fn every_action_has_its_keys() {
        for a in ACTIONS {
            assert!(allowed_keys(a).is_some(), "{a}");
        }
        assert!(allowed_keys("shake").is_none());
    }
}
