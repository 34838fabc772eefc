//! Versioned schema migrations. Each `migrations/NNNN_name.sql` file is embedded in the binary
//! and applied once, in order, inside its own transaction; the applied versions are recorded
//! in `schema_migrations`, so a store made by an older phdose upgrades in place and the user's
//! tables are carried along untouched.

use rusqlite::{Connection, TransactionBehavior};

use crate::error::{Error, Result};

/// The embedded migrations, in the order they must be applied.
pub const MIGRATIONS: &[(u32, &str, &str)] = &[
    (
        1,
        "groups",
        include_str!("../../migrations/0001_groups.sql"),
    ),
    (
        2,
        "measured",
        include_str!("../../migrations/0002_measured.sql"),
    ),
    (
        3,
        "substituents",
        include_str!("../../migrations/0003_substituents.sql"),
    ),
    (
        4,
        "reagents",
        include_str!("../../migrations/0004_reagents.sql"),
    ),
    (
        6,
        "buffers",
        include_str!("../../migrations/0006_buffers.sql"),
    ),
    (
        7,
        "series_sd",
        include_str!("../../migrations/0007_series_sd.sql"),
    ),
    (
        8,
        "series_floor",
        include_str!("../../migrations/0008_series_floor.sql"),
    ),
    (
        9,
        "series_side",
        include_str!("../../migrations/0009_series_side.sql"),
    ),
    (
        10,
        "substituent_ammonium",
        include_str!("../../migrations/0010_substituent_ammonium.sql"),
    ),
    (
        11,
        "substituent_para_aza",
        include_str!("../../migrations/0011_substituent_para_aza.sql"),
    ),
];

/// Applies, in order, every migration the store has not recorded (by version, not by the
/// highest number, so a migration numbered below one already applied still runs). Returns how
/// many ran.
pub fn migrate(conn: &mut Connection) -> Result<usize> {
    conn.execute_batch(
        "CREATE TABLE IF NOT EXISTS schema_migrations (
             version    INTEGER PRIMARY KEY,
             name       TEXT NOT NULL,
             applied_at TEXT NOT NULL DEFAULT (datetime('now'))
         );",
    )?;
    let recorded: Vec<u32> = conn
        .prepare("SELECT version FROM schema_migrations")?
        .query_map([], |row| row.get(0))?
        .collect::<std::result::Result<_, _>>()?;
    let newest = recorded.iter().copied().max().unwrap_or(0);
    if let Some(&(latest, _, _)) = MIGRATIONS.last()
        && newest > latest
    {
        return Err(Error::Store(format!(
            "the store was written by a newer phdose (schema version {newest}, this program \
             knows {latest}); use that version or another --db file"
        )));
    }
    let mut applied = 0;
    for &(version, name, sql) in MIGRATIONS.iter().filter(|m| !recorded.contains(&m.0)) {
        // Immediate: take the write lock first, then look again, so two processes opening a new
        // store at once apply each migration once.
        let tx = conn.transaction_with_behavior(TransactionBehavior::Immediate)?;
        let done: bool = tx.query_row(
            "SELECT EXISTS (SELECT 1 FROM schema_migrations WHERE version = ?1)",
            [version],
            |r| r.get(0),
        )?;
        if done {
            continue;
        }
        tx.execute_batch(sql)
            .map_err(|e| Error::Store(format!("migration {version:04}_{name} failed: {e}")))?;
        tx.execute(
            "INSERT INTO schema_migrations (version, name) VALUES (?1, ?2)",
            rusqlite::params![version, name],
        )?;
        tx.commit()?;
        applied += 1;
    }
    Ok(applied)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn migrations_are_numbered_in_order() {
        // Strictly increasing; numbers are reserved per branch, so one may be missing until
        // its branch is merged.
        for pair in MIGRATIONS.windows(2) {
            assert!(
                pair[0].0 < pair[1].0,
                "migration {} out of order",
                pair[1].1
            );
        }
    }

    #[test]
    fn migrating_twice_applies_nothing_the_second_time() {
        let mut conn = Connection::open_in_memory().unwrap();
        assert_eq!(migrate(&mut conn).unwrap(), MIGRATIONS.len());
        assert_eq!(migrate(&mut conn).unwrap(), 0);
    }

    #[test]
    fn a_store_from_a_newer_program_is_refused() {
        let mut conn = Connection::open_in_memory().unwrap();
        migrate(&mut conn).unwrap();
        conn.execute(
            "INSERT INTO schema_migrations (version, name) VALUES (999, 'future')",
            [],
        )
        .unwrap();
        assert!(matches!(migrate(&mut conn), Err(Error::Store(_))));
    }
}
