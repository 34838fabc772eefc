//! The built-in reagent tables in the store: refreshed from `data/reagents.csv` and
//! `data/reagent_stocks.csv`, and read back as `Reagent`s with their stock forms.

use rusqlite::Transaction;
use rusqlite::types::Value;

use super::Store;
use crate::equilibrium::Reagent;
use crate::equilibrium::reagent::{
    REAGENT_COLUMNS, REAGENT_STOCKS_CSV, REAGENTS_CSV, STOCK_COLUMNS,
};
use crate::error::{Error, Result};

/// Columns stored as numbers (the rest are text); an empty CSV field is NULL.
const NUMERIC: [&str; 10] = [
    "molar_mass_g_mol",
    "mildness",
    "strong_cations",
    "strong_anions",
    "carbonate",
    "top_charge",
    "solubility_g_100g",
    "molar",
    "percent_w_w",
    "density_g_ml",
];

/// Rewrites `builtin_reagents` and `builtin_reagent_stocks` from the embedded CSV files.
/// The tables are checked by loading them as reagents first, so a bad row never reaches
/// the store.
pub fn refresh(tx: &Transaction) -> Result<()> {
    Reagent::load_all(REAGENTS_CSV, REAGENT_STOCKS_CSV)?;
    tx.execute("DELETE FROM builtin_reagent_stocks", [])?;
    tx.execute("DELETE FROM builtin_reagents", [])?;
    fill(tx, "builtin_reagents", &REAGENT_COLUMNS, REAGENTS_CSV)?;
    fill(
        tx,
        "builtin_reagent_stocks",
        &STOCK_COLUMNS,
        REAGENT_STOCKS_CSV,
    )
}

fn fill(tx: &Transaction, table: &str, columns: &[&str], csv_text: &str) -> Result<()> {
    let placeholders: Vec<String> = (1..=columns.len() + 1).map(|i| format!("?{i}")).collect();
    let mut insert = tx.prepare(&format!(
        "INSERT INTO {table} (position, {}) VALUES ({})",
        columns.join(", "),
        placeholders.join(", ")
    ))?;
    let mut reader = csv::ReaderBuilder::new()
        .comment(Some(b'#'))
        .from_reader(csv_text.as_bytes());
    for (i, row) in reader.records().enumerate() {
        let row = row.map_err(|e| Error::Internal(format!("{table}: {e}")))?;
        let mut values = vec![Value::Integer(i as i64)];
        for (column, field) in columns.iter().zip(row.iter()) {
            let field = field.trim();
            values.push(if field.is_empty() {
                Value::Null
            } else if NUMERIC.contains(column) {
                match field.parse::<f64>() {
                    Ok(v) => Value::Real(v),
                    Err(_) => {
                        return Err(Error::Internal(format!(
                            "{table}: {column} '{field}' is not a number"
                        )));
                    }
                }
            } else {
                Value::Text(field.to_string())
            });
        }
        insert.execute(rusqlite::params_from_iter(values))?;
    }
    Ok(())
}

/// Every row of `table` as text in the order of `columns` (NULL as empty text; numbers in
/// Rust's shortest round-trip form, so they read back to the same double).
fn rows(store: &Store, table: &str, columns: &[&str]) -> Result<Vec<Vec<String>>> {
    let mut stmt = store.connection().prepare(&format!(
        "SELECT {} FROM {table} ORDER BY position",
        columns.join(", ")
    ))?;
    let rows = stmt.query_map([], |r| {
        (0..columns.len())
            .map(|i| {
                Ok(match r.get::<_, Value>(i)? {
                    Value::Null => String::new(),
                    Value::Integer(v) => v.to_string(),
                    Value::Real(v) => format!("{v}"),
                    Value::Text(t) => t,
                    Value::Blob(_) => String::new(),
                })
            })
            .collect::<rusqlite::Result<Vec<String>>>()
    })?;
    Ok(rows.collect::<rusqlite::Result<_>>()?)
}

impl Store {
    /// The built-in reagents with their stock forms, in table order.
    pub fn reagents(&self) -> Result<Vec<Reagent>> {
        let reagents = rows(self, "builtin_reagents", &REAGENT_COLUMNS)?;
        let stocks = rows(self, "builtin_reagent_stocks", &STOCK_COLUMNS)?;
        Reagent::from_rows(&reagents, &stocks)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn store_reagents_equal_the_embedded_tables() {
        let store = Store::in_memory().unwrap();
        let from_store = store.reagents().unwrap();
        let builtin = Reagent::builtin().unwrap();
        assert_eq!(from_store, builtin);
        assert!(from_store.len() >= 13);
    }
}
