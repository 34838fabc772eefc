//! The cautions that go with a reagent, stock and situation, from `data/cautions.csv`:
//! hazards of the reagent and stock, gas pressure when CO2 forms, which layer is which with a
//! chlorinated solvent, and last, always, the deferral to local rules, the SDS and lab practice.

use serde::Deserialize;

use crate::error::{Error, Result};

/// The embedded cautions table.
pub const CAUTIONS_CSV: &str = include_str!("../../data/cautions.csv");

#[derive(Debug, Deserialize)]
struct Row {
    reagent: String,
    stock: String,
    when: String,
    solvents: String,
    text: String,
}

/// What is happening beyond the reagent and stock themselves.
#[derive(Debug, Clone, Default, PartialEq)]
pub struct Situation {
    /// CO2 gas is formed (carbonate meets acid).
    pub gas: bool,
    /// The organic solvent in contact, when known.
    pub solvent: Option<String>,
}

/// Cautions for `reagent` used as `stock`; `gas` says whether CO2 is formed. The general
/// deferral to local rules always comes last.
pub fn cautions(reagent: &str, stock: &str, gas: bool) -> Result<Vec<String>> {
    cautions_for(reagent, stock, &Situation { gas, solvent: None })
}

/// Cautions for `reagent` used as `stock` in `situation`, deferral last.
pub fn cautions_for(reagent: &str, stock: &str, situation: &Situation) -> Result<Vec<String>> {
    let rows: Vec<Row> = csv::ReaderBuilder::new()
        .comment(Some(b'#'))
        .from_reader(CAUTIONS_CSV.as_bytes())
        .deserialize()
        .collect::<std::result::Result<_, _>>()
        .map_err(|e| Error::Internal(format!("data/cautions.csv: {e}")))?;
    let solvent = situation
        .solvent
        .as_deref()
        .map(|s| s.trim().to_ascii_lowercase());
    let applies = |r: &Row| {
        let when = match r.when.as_str() {
            "always" => true,
            "gas" => situation.gas,
            "solvent" => solvent
                .as_deref()
                .is_some_and(|s| r.solvents.split(';').any(|x| x.trim() == s)),
            _ => false,
        };
        (r.reagent == reagent || r.reagent == "*") && (r.stock == stock || r.stock == "*") && when
    };
    let is_deferral = |r: &Row| r.reagent == "*" && r.when == "always";
    let (general, specific): (Vec<&Row>, Vec<&Row>) = rows
        .iter()
        .filter(|r| applies(r))
        .partition(|r| is_deferral(r));
    Ok(specific
        .into_iter()
        .chain(general)
        .map(|r| r.text.clone())
        .collect())
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn bicarbonate_warns_about_gas_only_when_gas_forms() {
        let with_gas = cautions("nahco3", "sat", true).unwrap();
        assert!(with_gas.iter().any(|c| c.contains("vent")));
        let without = cautions("nahco3", "sat", false).unwrap();
        assert!(!without.iter().any(|c| c.contains("vent")));
        assert!(without.last().unwrap().contains("SDS"));
        assert!(with_gas.last().unwrap().contains("SDS"));
    }

    #[test]
    fn concentrated_acid_says_acid_into_water() {
        let c = cautions("hcl", "37%", false).unwrap();
        assert!(
            c.iter()
                .any(|c| c.contains("adding the acid slowly to water"))
        );
        assert!(c.iter().any(|c| c.contains("corrosive")));
        let c = cautions("h2so4", "96%", false).unwrap();
        assert!(c.iter().any(|c| c.contains("never water to the acid")));
    }

    #[test]
    fn naoh_pellets_warn_about_heat() {
        let c = cautions("naoh", "solid", false).unwrap();
        assert!(c.iter().any(|c| c.contains("heat")));
        assert!(c.iter().any(|c| c.contains("corrosive")));
    }

    #[test]
    fn chlorinated_solvent_is_the_lower_layer() {
        let s = Situation {
            gas: false,
            solvent: Some("Dichloromethane".into()),
        };
        let c = cautions_for("hcl", "1M", &s).unwrap();
        assert!(c.iter().any(|c| c.contains("lower one")), "{c:?}");
        let s = Situation {
            gas: false,
            solvent: Some("ethyl acetate".into()),
        };
        let c = cautions_for("hcl", "1M", &s).unwrap();
        assert!(!c.iter().any(|c| c.contains("lower one")));
    }
}
