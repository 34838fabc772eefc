//! The local SQLite store: where it lives, opening and migrating it, and refreshing the
//! built-in tables from the `data/*.csv` files embedded in the binary.
//!
//! Built-in tables (`builtin_*`) are rewritten whenever the program's data version changes;
//! the user's own tables are never touched by that refresh.

pub mod buffers;
pub mod builtin;
pub mod measured;
pub mod migrate;
pub mod reagents;
pub mod substituents;

use std::path::{Path, PathBuf};

use rusqlite::{Connection, OpenFlags};

use crate::acidity::group::Group;
use crate::error::{Error, Result};

/// An open, migrated store with up-to-date built-in tables.
pub struct Store {
    conn: Connection,
    path: PathBuf,
}

/// Where the store lives when `--db` is not given: `$PHDOSE_DB`, else the platform data
/// directory (`$XDG_DATA_HOME/phdose/phdose.sqlite`, `~/.local/share/phdose/phdose.sqlite`).
pub fn default_path() -> Result<PathBuf> {
    if let Some(p) = std::env::var_os("PHDOSE_DB").filter(|p| !p.is_empty()) {
        return Ok(PathBuf::from(p));
    }
    let base = match std::env::var_os("XDG_DATA_HOME").filter(|p| !p.is_empty()) {
        Some(dir) => PathBuf::from(dir),
        None => match std::env::var_os("HOME").filter(|p| !p.is_empty()) {
            Some(home) => PathBuf::from(home).join(".local").join("share"),
            None => {
                return Err(Error::Store(
                    "no HOME or XDG_DATA_HOME to place the store in; pass --db PATH or set \
                     PHDOSE_DB"
                        .into(),
                ));
            }
        },
    };
    Ok(base.join("phdose").join("phdose.sqlite"))
}

impl Store {
    /// Opens (creating if needed) the store at `path`, migrates it and refreshes the built-in
    /// tables. A file that is not a phdose store is reported and left untouched.
    pub fn open(path: &Path) -> Result<Store> {
        if let Some(dir) = path.parent().filter(|d| !d.as_os_str().is_empty()) {
            std::fs::create_dir_all(dir).map_err(|e| {
                Error::Store(format!("cannot create the folder {}: {e}", dir.display()))
            })?;
        }
        let flags = OpenFlags::SQLITE_OPEN_READ_WRITE | OpenFlags::SQLITE_OPEN_CREATE;
        let conn = Connection::open_with_flags(path, flags)
            .map_err(|e| Error::Store(format!("cannot open {}: {e}", path.display())))?;
        Self::prepare(conn, path)
    }

    /// An in-memory store with the built-in tables, for tests and one-off runs.
    pub fn in_memory() -> Result<Store> {
        Self::prepare(Connection::open_in_memory()?, Path::new(":memory:"))
    }

    fn prepare(mut conn: Connection, path: &Path) -> Result<Store> {
        let foreign = |e: rusqlite::Error| {
            Error::Store(format!(
                "{} is not a phdose store ({e}); it was left untouched — pass another --db PATH",
                path.display()
            ))
        };
        conn.busy_timeout(std::time::Duration::from_secs(5))
            .map_err(foreign)?;
        // Reading the schema fails on a file that is not SQLite at all; checking the tables
        // catches a SQLite file of some other program before we write anything into it.
        let tables: Vec<String> = conn
            .prepare("SELECT name FROM sqlite_master WHERE type = 'table'")
            .and_then(|mut s| s.query_map([], |r| r.get(0))?.collect())
            .map_err(foreign)?;
        if !tables.is_empty() && !tables.iter().any(|t| t == "schema_migrations") {
            return Err(Error::Store(format!(
                "{} holds a database that phdose did not make (tables: {}); it was left \
                 untouched — pass another --db PATH",
                path.display(),
                tables.join(", ")
            )));
        }
        if path != Path::new(":memory:") {
            check_intact(&conn, path)?;
            // WAL lets readers run beside a writer; with the busy timeout, two phdose processes
            // writing at once queue instead of failing (set only after the checks above, since
            // it writes the file header).
            retry_busy(|| {
                conn.pragma_update_and_check(None, "journal_mode", "WAL", |r| r.get::<_, String>(0))
            })?;
        }
        retry_busy(|| migrate::migrate(&mut conn))?;
        retry_busy(|| builtin::refresh(&mut conn))?;
        Ok(Store {
            conn,
            path: path.to_path_buf(),
        })
    }

    /// The file this store lives in.
    pub fn path(&self) -> &Path {
        &self.path
    }

    /// The built-in group table, in priority order.
    pub fn groups(&self) -> Result<Vec<Group>> {
        let mut stmt = self.conn.prepare(
            "SELECT name, smarts, site, kind, pka, pka_low, pka_high, source
             FROM builtin_groups ORDER BY priority",
        )?;
        let rows = stmt.query_map([], |r| {
            Ok((
                r.get::<_, String>(0)?,
                r.get::<_, String>(1)?,
                r.get::<_, i64>(2)?,
                r.get::<_, String>(3)?,
                r.get::<_, Option<f64>>(4)?,
                r.get::<_, Option<f64>>(5)?,
                r.get::<_, Option<f64>>(6)?,
                r.get::<_, String>(7)?,
            ))
        })?;
        let mut groups = Vec::new();
        for row in rows {
            let (name, smarts, site, kind, pka, low, high, source) = row?;
            groups.push(Group::new(
                name, &smarts, site, &kind, pka, low, high, source,
            )?);
        }
        Ok(groups)
    }

    /// The underlying connection, for the other store modules.
    pub fn connection(&self) -> &Connection {
        &self.conn
    }
}

/// Refuses a damaged database file before anything is written to it: SQLite's quick check reads
/// every page, so a truncated or overwritten file is reported here, not half-way through an
/// upgrade.
fn check_intact(conn: &Connection, path: &Path) -> Result<()> {
    let damaged = |detail: String| {
        Error::Store(format!(
            "{} is damaged ({detail}); it was left untouched — restore it from a copy (`phdose \
             db export` writes your values as CSV) or pass another --db PATH",
            path.display()
        ))
    };
    let report: Vec<String> = conn
        .prepare("PRAGMA quick_check(3)")
        .and_then(|mut s| s.query_map([], |r| r.get(0))?.collect())
        .map_err(|e| damaged(e.to_string()))?;
    match report.as_slice() {
        [ok] if ok == "ok" => Ok(()),
        lines => Err(damaged(lines.join("; "))),
    }
}

/// Whether an error is another process holding the database lock beyond the busy timeout
/// (or a read snapshot gone stale under WAL), which is worth trying again.
fn is_busy(e: &Error) -> bool {
    matches!(e, Error::Store(m) if m.contains("database is locked") || m.contains("database table is locked"))
}

/// Runs `f` again (up to 5 times, with a short pause) while the database is busy.
pub fn retry_busy<T, E: Into<Error>>(
    mut f: impl FnMut() -> std::result::Result<T, E>,
) -> Result<T> {
    let mut attempt = 0;
    loop {
        match f().map_err(Into::into) {
            Err(e) if attempt < 5 && is_busy(&e) => {
                attempt += 1;
                std::thread::sleep(std::time::Duration::from_millis(20 * attempt));
            }
            other => return other,
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn every_builtin_group_row_compiles() {
        let groups = Store::in_memory().unwrap().groups().unwrap();
        assert!(groups.len() >= 40, "{} rows", groups.len());
    }

    #[test]
    fn a_data_refresh_leaves_other_tables_alone() {
        let dir = std::env::temp_dir().join(format!("phdose-store-{}", std::process::id()));
        let path = dir.join("s.sqlite");
        let _ = std::fs::remove_file(&path);
        {
            let store = Store::open(&path).unwrap();
            let c = store.connection();
            c.execute_batch(
                "CREATE TABLE user_notes (note TEXT);
                 INSERT INTO user_notes VALUES ('my own row');
                 UPDATE store_meta SET value = 'old' WHERE key = 'data_version';
                 DELETE FROM builtin_groups;",
            )
            .unwrap();
        }
        let store = Store::open(&path).unwrap();
        assert!(
            !store.groups().unwrap().is_empty(),
            "built-in rows refreshed"
        );
        let note: String = store
            .connection()
            .query_row("SELECT note FROM user_notes", [], |r| r.get(0))
            .unwrap();
        assert_eq!(note, "my own row");
        std::fs::remove_dir_all(&dir).ok();
    }
}
