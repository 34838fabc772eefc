//! Measured pKa values in the store: the built-in handbook rows (`data/measured.csv`, refreshed
//! with the data version) and the user's own rows (`phdose db`), which no upgrade rewrites.
//!
//! Both tables hold one row per constant, keyed by the canonical structure key of the neutral
//! parent (`chem::canon`), so a value stored for `CC[NH3+].[Cl-]` is found for `NCC`.

use rusqlite::{Connection, params};
use serde::{Deserialize, Serialize};

use super::Store;
use crate::acidity::group::Kind;
use crate::chem::canon;
use crate::error::{Error, ParseError, Result};

/// `data/measured.csv`: handbook pKa values of common lab compounds, with sources.
pub const MEASURED_CSV: &str = include_str!("../../data/measured.csv");

/// One measured constant: which kind of pair and its pKa (that of the conjugate acid).
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct Constant {
    pub kind: Kind,
    pub pka: f64,
}

/// A built-in row.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct BuiltinMeasured {
    pub name: String,
    pub smiles: String,
    pub key: String,
    pub kind: Kind,
    pub pka: f64,
    pub temperature: f64,
    pub source: String,
}

/// A row of the user's own table.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct UserMeasured {
    pub id: i64,
    pub key: String,
    /// The SMILES as the user gave it.
    pub smiles: String,
    pub kind: Kind,
    pub pka: f64,
    pub note: String,
    /// Date the value was added (`YYYY-MM-DD`).
    pub added: String,
}

/// One constant as written, kind optional: `4.2`, `acid:4.2`, `base:9.8`.
pub type WrittenConstant = (Option<Kind>, f64);

/// Reads a list of constants: items separated by `,` or `;`, each `value` or `kind:value`.
/// Errors carry the byte position of the item that could not be read.
pub fn parse_constants(text: &str) -> std::result::Result<Vec<WrittenConstant>, ParseError> {
    const WHAT: &str = "pKa list";
    let mut out = Vec::new();
    let mut start = 0;
    for item in text.split([',', ';']) {
        let lead = item.len() - item.trim_start().len();
        let at = start + lead;
        let trimmed = item.trim();
        start += item.len() + 1;
        if trimmed.is_empty() {
            return Err(ParseError::new(WHAT, text, at, "empty value"));
        }
        let (kind, number, number_at) = match trimmed.split_once(':') {
            Some((k, v)) => {
                let kind = parse_kind(k.trim())
                    .ok_or_else(|| ParseError::new(WHAT, text, at, "kind must be acid or base"))?;
                let offset = at + k.len() + 1 + (v.len() - v.trim_start().len());
                (Some(kind), v.trim(), offset)
            }
            None => (None, trimmed, at),
        };
        let pka: f64 = number
            .parse()
            .ok()
            .filter(|p: &f64| p.is_finite())
            .ok_or_else(|| ParseError::new(WHAT, text, number_at, "not a number"))?;
        // Water-based pKa values outside about -5..25 are not aqueous constants (common practice).
        if !(-5.0..=25.0).contains(&pka) {
            return Err(ParseError::new(
                WHAT,
                text,
                number_at,
                "a pKa in water lies between -5 and 25",
            ));
        }
        out.push((kind, pka));
    }
    Ok(out)
}

/// `acid` or `base`.
pub fn parse_kind(text: &str) -> Option<Kind> {
    match text.to_ascii_lowercase().as_str() {
        "acid" => Some(Kind::Acid),
        "base" => Some(Kind::Base),
        _ => None,
    }
}

#[derive(Debug, Deserialize)]
struct CsvRow {
    name: String,
    smiles: String,
    pka: String,
    temperature: f64,
    source: String,
}

/// The built-in rows as the CSV gives them, keyed; a bad row is an internal error.
pub fn builtin_rows() -> Result<Vec<BuiltinMeasured>> {
    let bad = |what: String| Error::Internal(format!("data/measured.csv: {what}"));
    let mut rows = Vec::new();
    let mut reader = csv::ReaderBuilder::new()
        .comment(Some(b'#'))
        .from_reader(MEASURED_CSV.as_bytes());
    for row in reader.deserialize::<CsvRow>() {
        let row = row.map_err(|e| bad(e.to_string()))?;
        let key = canon::key(&row.smiles).map_err(|e| bad(format!("{}: {e}", row.name)))?;
        let constants = parse_constants(&row.pka).map_err(|e| bad(format!("{}: {e}", row.name)))?;
        for (kind, pka) in constants {
            let kind =
                kind.ok_or_else(|| bad(format!("{}: every value needs a kind", row.name)))?;
            rows.push(BuiltinMeasured {
                name: row.name.clone(),
                smiles: row.smiles.clone(),
                key: key.clone(),
                kind,
                pka,
                temperature: row.temperature,
                source: row.source.clone(),
            });
        }
    }
    Ok(rows)
}

/// Rewrites `builtin_measured` from the CSV and re-keys the user's rows whose key the current
/// method computes differently (their given SMILES, values and notes are left as they are).
/// Runs inside the data-refresh transaction of `builtin::refresh`.
pub(crate) fn refresh(conn: &Connection) -> Result<()> {
    conn.execute("DELETE FROM builtin_measured", [])?;
    let mut insert = conn.prepare(
        "INSERT INTO builtin_measured (name, smiles, key, kind, pka, temperature, source)
         VALUES (?1, ?2, ?3, ?4, ?5, ?6, ?7)",
    )?;
    for r in builtin_rows()? {
        insert.execute(params![
            r.name,
            r.smiles,
            r.key,
            r.kind.as_str(),
            r.pka,
            r.temperature,
            r.source
        ])?;
    }
    let users: Vec<(i64, String, String)> = conn
        .prepare("SELECT id, smiles, key FROM user_measured")?
        .query_map([], |r| Ok((r.get(0)?, r.get(1)?, r.get(2)?)))?
        .collect::<rusqlite::Result<_>>()?;
    for (id, smiles, old) in users {
        if let Ok(new) = canon::key(&smiles)
            && new != old
        {
            conn.execute(
                "UPDATE user_measured SET key = ?1 WHERE id = ?2",
                params![new, id],
            )?;
        }
    }
    Ok(())
}

fn kind_from_sql(text: String) -> rusqlite::Result<Kind> {
    parse_kind(&text).ok_or_else(|| {
        rusqlite::Error::FromSqlConversionFailure(
            0,
            rusqlite::types::Type::Text,
            format!("unknown kind {text}").into(),
        )
    })
}

/// A compound's constants for `Store::put_user_measured`.
#[derive(Debug, Clone)]
pub struct UserEntry {
    pub smiles: String,
    pub constants: Vec<Constant>,
    pub note: String,
    /// `None`: today.
    pub added: Option<String>,
}

impl Store {
    /// Every built-in measured row, in table order.
    pub fn builtin_measured(&self) -> Result<Vec<BuiltinMeasured>> {
        let mut stmt = self.connection().prepare(
            "SELECT name, smiles, key, kind, pka, temperature, source
             FROM builtin_measured ORDER BY id",
        )?;
        let rows = stmt.query_map([], |r| {
            Ok(BuiltinMeasured {
                name: r.get(0)?,
                smiles: r.get(1)?,
                key: r.get(2)?,
                kind: kind_from_sql(r.get(3)?)?,
                pka: r.get(4)?,
                temperature: r.get(5)?,
                source: r.get(6)?,
            })
        })?;
        Ok(rows.collect::<rusqlite::Result<_>>()?)
    }

    /// The user's rows, oldest first.
    pub fn user_measured(&self) -> Result<Vec<UserMeasured>> {
        let mut stmt = self.connection().prepare(
            "SELECT id, key, smiles, kind, pka, note, added FROM user_measured ORDER BY id",
        )?;
        let rows = stmt.query_map([], |r| {
            Ok(UserMeasured {
                id: r.get(0)?,
                key: r.get(1)?,
                smiles: r.get(2)?,
                kind: kind_from_sql(r.get(3)?)?,
                pka: r.get(4)?,
                note: r.get(5)?,
                added: r.get(6)?,
            })
        })?;
        Ok(rows.collect::<rusqlite::Result<_>>()?)
    }

    /// Stores compounds' constants in one transaction. Each entry replaces the user's earlier
    /// rows of the same structure (one compound's constants are given together). Returns the
    /// new row ids and how many earlier rows were replaced.
    pub fn put_user_measured(&self, entries: &[UserEntry]) -> Result<(Vec<i64>, usize)> {
        let tx = self.connection().unchecked_transaction()?;
        let mut ids = Vec::new();
        let mut replaced = 0;
        let mut done_keys: Vec<String> = Vec::new();
        for entry in entries {
            let key = canon::key(&entry.smiles)?;
            // Entries of one import that share a structure add up instead of replacing each
            // other (an export lists one row per constant).
            if !done_keys.contains(&key) {
                replaced += tx.execute("DELETE FROM user_measured WHERE key = ?1", [&key])?;
                done_keys.push(key.clone());
            }
            for c in &entry.constants {
                tx.execute(
                    "INSERT INTO user_measured (key, smiles, kind, pka, note, added)
                     VALUES (?1, ?2, ?3, ?4, ?5, COALESCE(?6, date('now')))",
                    params![
                        key,
                        entry.smiles,
                        c.kind.as_str(),
                        c.pka,
                        entry.note,
                        entry.added
                    ],
                )?;
                ids.push(tx.last_insert_rowid());
            }
        }
        tx.commit()?;
        Ok((ids, replaced))
    }

    /// Removes one of the user's rows by id; returns how many were removed (0 or 1).
    pub fn remove_user_measured_id(&self, id: i64) -> Result<usize> {
        Ok(self
            .connection()
            .execute("DELETE FROM user_measured WHERE id = ?1", [id])?)
    }

    /// Removes every user row of the structure of `smiles` (any spelling).
    pub fn remove_user_measured_smiles(&self, smiles: &str) -> Result<usize> {
        let key = canon::key(smiles)?;
        Ok(self
            .connection()
            .execute("DELETE FROM user_measured WHERE key = ?1", [key])?)
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::store::migrate::MIGRATIONS;

    #[test]
    fn constant_lists_read_with_and_without_kinds() {
        let got = parse_constants("acid:4.2, base:9.8").unwrap();
        assert_eq!(got, vec![(Some(Kind::Acid), 4.2), (Some(Kind::Base), 9.8)]);
        assert_eq!(parse_constants("4.2;9.8").unwrap()[1], (None, 9.8));
        let e = parse_constants("acid:4.2,bse:9").unwrap_err();
        assert_eq!(e.position, 9);
        let e = parse_constants("acid:4.2,base:x").unwrap_err();
        assert_eq!(e.position, 14);
        assert!(parse_constants("4.2,,5").is_err());
        assert!(parse_constants("99").is_err());
    }

    #[test]
    fn builtin_table_is_large_keyed_and_unambiguous() {
        let rows = builtin_rows().unwrap();
        let mut compounds: Vec<(&str, &str)> = rows
            .iter()
            .map(|r| (r.key.as_str(), r.name.as_str()))
            .collect();
        compounds.dedup();
        assert!(compounds.len() >= 150, "{} compounds", compounds.len());
        // Each structure appears in one row only: two names for one key would be ambiguous.
        let mut keys: Vec<&str> = compounds.iter().map(|c| c.0).collect();
        keys.sort();
        let before = keys.len();
        keys.dedup();
        assert_eq!(keys.len(), before, "a structure is listed twice");
        assert!(rows.iter().all(|r| r.source.contains("from memory")));
    }

    /// A store as an older phdose left it: only migration 0001, with its data version.
    fn store_from_first_migration(path: &std::path::Path) {
        let conn = Connection::open(path).unwrap();
        conn.execute_batch(&format!(
            "CREATE TABLE schema_migrations (version INTEGER PRIMARY KEY, name TEXT NOT NULL,
                 applied_at TEXT NOT NULL DEFAULT (datetime('now')));
             {}
             INSERT INTO schema_migrations (version, name) VALUES (1, 'groups');
             INSERT INTO store_meta (key, value) VALUES ('data_version', '0.0.1-old');",
            MIGRATIONS[0].2
        ))
        .unwrap();
    }

    #[test]
    fn a_first_migration_store_upgrades_and_keeps_the_users_rows() {
        let dir = std::env::temp_dir().join(format!("phdose-meas-{}", std::process::id()));
        std::fs::create_dir_all(&dir).unwrap();
        let path = dir.join("old.sqlite");
        let _ = std::fs::remove_file(&path);
        store_from_first_migration(&path);
        let entry = UserEntry {
            smiles: "CC[NH3+].[Cl-]".into(),
            constants: vec![Constant {
                kind: Kind::Base,
                pka: 10.7,
            }],
            note: "titrated 2026-11-02".into(),
            added: Some("2026-11-02".into()),
        };
        let before = {
            let store = Store::open(&path).unwrap();
            assert!(!store.builtin_measured().unwrap().is_empty());
            store.put_user_measured(&[entry]).unwrap();
            store.user_measured().unwrap()
        };
        // A later data refresh (new built-in rows) must leave the user's rows as they were.
        {
            let conn = Connection::open(&path).unwrap();
            conn.execute_batch(
                "UPDATE store_meta SET value = 'stale' WHERE key = 'data_version';
                 DELETE FROM builtin_measured;",
            )
            .unwrap();
        }
        let store = Store::open(&path).unwrap();
        assert_eq!(store.user_measured().unwrap(), before);
        assert_eq!(before[0].key, canon::key("NCC").unwrap());
        assert_eq!(before[0].added, "2026-11-02");
        assert!(store.builtin_measured().unwrap().len() >= 150);
        std::fs::remove_dir_all(&dir).ok();
    }

    #[test]
    fn adding_again_replaces_and_removal_works_by_any_spelling() {
        let store = Store::in_memory().unwrap();
        let entry = |pkas: &[f64]| UserEntry {
            smiles: "OC(=O)c1ccccc1".into(),
            constants: pkas
                .iter()
                .map(|&pka| Constant {
                    kind: Kind::Acid,
                    pka,
                })
                .collect(),
            note: String::new(),
            added: None,
        };
        store.put_user_measured(&[entry(&[4.1])]).unwrap();
        let (_, replaced) = store.put_user_measured(&[entry(&[4.2])]).unwrap();
        assert_eq!(replaced, 1);
        let rows = store.user_measured().unwrap();
        assert_eq!(rows.len(), 1);
        assert_eq!(rows[0].pka, 4.2);
        assert_eq!(rows[0].added.len(), 10, "today's date");
        assert_eq!(
            store
                .remove_user_measured_smiles("[O-]C(=O)C1=CC=CC=C1.[Na+]")
                .unwrap(),
            1
        );
        assert!(store.user_measured().unwrap().is_empty());
    }
}
