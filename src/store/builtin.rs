//! The built-in tables: `data/*.csv` embedded at build time, loaded into `builtin_*` tables
//! when the store's recorded data version differs from this program's.

use rusqlite::{Connection, OptionalExtension, TransactionBehavior, params};
use serde::Deserialize;

use crate::error::{Error, Result};

/// `data/groups.csv`: ionizable groups with typical pKa, range and source.
pub const GROUPS_CSV: &str = include_str!("../../data/groups.csv");

/// The data version of this build: a hash of every embedded table, so any edit of a CSV file
/// refreshes the built-in rows of existing stores on their next use.
pub fn data_version() -> String {
    format!(
        "{}-{:016x}",
        env!("CARGO_PKG_VERSION"),
        fnv1a(&[
            GROUPS_CSV,
            super::substituents::SUBSTITUENTS_CSV,
            super::substituents::SERIES_CSV,
            super::measured::MEASURED_CSV,
            crate::chem::canon::KEY_VERSION,
            crate::equilibrium::reagent::REAGENTS_CSV,
            crate::equilibrium::reagent::REAGENT_STOCKS_CSV,
            crate::buffer::system::BUFFERS_CSV,
            crate::buffer::system::BUFFER_FORMS_CSV,
        ])
    )
}

fn fnv1a(parts: &[&str]) -> u64 {
    // FNV-1a 64-bit: stable across builds and platforms, unlike std's hasher.
    let mut hash: u64 = 0xcbf2_9ce4_8422_2325;
    for part in parts {
        for byte in part.bytes().chain(std::iter::once(0)) {
            hash ^= byte as u64;
            hash = hash.wrapping_mul(0x0000_0100_0000_01b3);
        }
    }
    hash
}

#[derive(Debug, Deserialize)]
struct GroupRow {
    name: String,
    smarts: String,
    site: i64,
    kind: String,
    pka: Option<f64>,
    pka_low: Option<f64>,
    pka_high: Option<f64>,
    source: String,
}

/// Rewrites the built-in tables if the store's data version is not this build's.
pub fn refresh(conn: &mut Connection) -> Result<()> {
    let version = data_version();
    let stored = |c: &Connection| -> Result<Option<String>> {
        Ok(c.query_row(
            "SELECT value FROM store_meta WHERE key = 'data_version'",
            [],
            |r| r.get(0),
        )
        .optional()?)
    };
    if stored(conn)?.as_deref() == Some(version.as_str()) {
        return Ok(());
    }
    // Take the write lock, then look again: another process may have refreshed meanwhile.
    let tx = conn.transaction_with_behavior(TransactionBehavior::Immediate)?;
    if stored(&tx)?.as_deref() == Some(version.as_str()) {
        return Ok(());
    }
    tx.execute("DELETE FROM builtin_groups", [])?;
    {
        let mut insert = tx.prepare(
            "INSERT INTO builtin_groups
             (priority, name, smarts, site, kind, pka, pka_low, pka_high, source)
             VALUES (?1, ?2, ?3, ?4, ?5, ?6, ?7, ?8, ?9)",
        )?;
        let mut reader = csv::ReaderBuilder::new()
            .comment(Some(b'#'))
            .from_reader(GROUPS_CSV.as_bytes());
        for (i, row) in reader.deserialize::<GroupRow>().enumerate() {
            let g = row.map_err(|e| Error::Internal(format!("data/groups.csv: {e}")))?;
            insert.execute(params![
                i as i64, g.name, g.smarts, g.site, g.kind, g.pka, g.pka_low, g.pka_high, g.source
            ])?;
        }
    }
    super::substituents::refresh(&tx)?;
    super::measured::refresh(&tx)?;
    super::reagents::refresh(&tx)?;
    super::buffers::refresh(&tx)?;
    tx.execute(
        "INSERT INTO store_meta (key, value) VALUES ('data_version', ?1)
         ON CONFLICT(key) DO UPDATE SET value = excluded.value",
        [&version],
    )?;
    tx.commit()?;
    Ok(())
}
