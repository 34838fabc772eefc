//! The cautions that go with a reagent, stock and situation, from `data/cautions.csv`.

use serde::Deserialize;

use crate::error::{Error, Result};

/// The embedded cautions table.
pub const CAUTIONS_CSV: &str = include_str!("../../data/cautions.csv");

#[derive(Debug, Deserialize)]
struct Row {
    reagent: String,
    stock: String,
    when: String,
    text: String,
}

/// Cautions for `reagent` used as `stock`; `gas` says whether CO2 is formed. The general
/// deferral to local rules always comes last.
pub fn cautions(reagent: &str, stock: &str, gas: bool) -> Result<Vec<String>> {
    let rows: Vec<Row> = csv::ReaderBuilder::new()
        .comment(Some(b'#'))
        .from_reader(CAUTIONS_CSV.as_bytes())
        .deserialize()
        .collect::<std::result::Result<_, _>>()
        .map_err(|e| Error::Internal(format!("data/cautions.csv: {e}")))?;
    let applies = |r: &Row| {
        (r.reagent == reagent || r.reagent == "*")
            && (r.stock == stock || r.stock == "*")
            && (r.when == "always" || (r.when == "gas" && gas))
    };
    let (general, specific): (Vec<&Row>, Vec<&Row>) = rows
        .iter()
        .filter(|r| applies(r))
        .partition(|r| r.reagent == "*");
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
    }

    #[test]
    fn concentrated_acid_says_acid_into_water() {
        let c = cautions("hcl", "37%", false).unwrap();
        assert!(
            c.iter()
                .any(|c| c.contains("adding the acid slowly to water"))
        );
        assert!(c.iter().any(|c| c.contains("corrosive")));
    }
}
