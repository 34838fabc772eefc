//! The built-in substituent and series tables (`data/substituents.csv`, `data/series.csv`) and
//! the series column of the group table: refreshed with the other built-in tables, read back
//! as rows for the handbook.

use std::collections::HashMap;

use rusqlite::{Transaction, params};
use serde::Deserialize;

use super::Store;
use crate::acidity::substituent::{SeriesRow, SubstituentRow};
use crate::error::{Error, Result};

/// `data/substituents.csv`: Hammett and Taft constants per substituent, with sources.
pub const SUBSTITUENTS_CSV: &str = include_str!("../../data/substituents.csv");
/// `data/series.csv`: rho and base value per linear free-energy series, with sources.
pub const SERIES_CSV: &str = include_str!("../../data/series.csv");

/// A group's series name and parent SMILES, where its row gives them.
pub type GroupLink = (Option<String>, Option<String>);

/// The series columns of `data/groups.csv` (the rest is read by `builtin`).
#[derive(Debug, Deserialize)]
struct GroupSeriesRow {
    name: String,
    series: Option<String>,
    parent: Option<String>,
}

fn reader(text: &str) -> csv::Reader<&[u8]> {
    csv::ReaderBuilder::new()
        .comment(Some(b'#'))
        .from_reader(text.as_bytes())
}

fn csv_error(file: &str) -> impl Fn(csv::Error) -> Error + '_ {
    move |e| Error::Internal(format!("data/{file}: {e}"))
}

/// Rewrites the substituent and series tables and the groups' series columns. Called inside
/// the built-in refresh transaction, after the group rows are written.
pub fn refresh(tx: &Transaction) -> Result<()> {
    tx.execute("DELETE FROM builtin_substituents", [])?;
    tx.execute("DELETE FROM builtin_series", [])?;
    let mut insert = tx.prepare(
        "INSERT INTO builtin_substituents (priority, name, smarts, position, sigma_m, sigma_p,
         sigma_minus, sigma_o, sigma_star, source, sigma_o_aza, sigma_star_ammonium, sigma_p_aza)
         VALUES (?1, ?2, ?3, ?4, ?5, ?6, ?7, ?8, ?9, ?10, ?11, ?12, ?13)",
    )?;
    for (i, row) in reader(SUBSTITUENTS_CSV)
        .deserialize::<SubstituentRow>()
        .enumerate()
    {
        let s = row.map_err(csv_error("substituents.csv"))?;
        insert.execute(params![
            i as i64,
            s.name,
            s.smarts,
            s.position,
            s.sigma_m,
            s.sigma_p,
            s.sigma_minus,
            s.sigma_o,
            s.sigma_star,
            s.source,
            s.sigma_o_aza,
            s.sigma_star_ammonium,
            s.sigma_p_aza
        ])?;
    }
    let mut insert = tx.prepare(
        "INSERT INTO builtin_series (name, constant, rho, base, para, ortho_shift, attenuation,
         source, sd, sigma_floor, side) VALUES (?1, ?2, ?3, ?4, ?5, ?6, ?7, ?8, ?9, ?10, ?11)",
    )?;
    for row in reader(SERIES_CSV).deserialize::<SeriesRow>() {
        let s = row.map_err(csv_error("series.csv"))?;
        insert.execute(params![
            s.name,
            s.constant,
            s.rho,
            s.base,
            s.para,
            s.ortho_shift,
            s.attenuation,
            s.source,
            s.sd,
            s.sigma_floor,
            s.side
        ])?;
    }
    let mut update =
        tx.prepare("UPDATE builtin_groups SET series = ?1, parent = ?2 WHERE name = ?3")?;
    for row in reader(super::builtin::GROUPS_CSV).deserialize::<GroupSeriesRow>() {
        let g = row.map_err(csv_error("groups.csv"))?;
        update.execute(params![g.series, g.parent, g.name])?;
    }
    Ok(())
}

impl Store {
    /// The substituent rows in priority order.
    pub fn substituents(&self) -> Result<Vec<SubstituentRow>> {
        let mut stmt = self.connection().prepare(
            "SELECT name, smarts, position, sigma_m, sigma_p, sigma_minus, sigma_o, sigma_star,
             source, sigma_o_aza, sigma_star_ammonium, sigma_p_aza FROM builtin_substituents
             ORDER BY priority",
        )?;
        let rows = stmt.query_map([], |r| {
            Ok(SubstituentRow {
                name: r.get(0)?,
                smarts: r.get(1)?,
                position: r.get(2)?,
                sigma_m: r.get(3)?,
                sigma_p: r.get(4)?,
                sigma_minus: r.get(5)?,
                sigma_o: r.get(6)?,
                sigma_star: r.get(7)?,
                source: r.get(8)?,
                sigma_o_aza: r.get(9)?,
                sigma_star_ammonium: r.get(10)?,
                sigma_p_aza: r.get(11)?,
            })
        })?;
        Ok(rows.collect::<std::result::Result<_, _>>()?)
    }

    /// The series rows.
    pub fn series(&self) -> Result<Vec<SeriesRow>> {
        let mut stmt = self.connection().prepare(
            "SELECT name, constant, rho, base, para, ortho_shift, attenuation, source, sd,
             sigma_floor, side FROM builtin_series ORDER BY name",
        )?;
        let rows = stmt.query_map([], |r| {
            Ok(SeriesRow {
                name: r.get(0)?,
                constant: r.get(1)?,
                rho: r.get(2)?,
                base: r.get(3)?,
                para: r.get(4)?,
                ortho_shift: r.get(5)?,
                attenuation: r.get(6)?,
                source: r.get(7)?,
                sd: r.get(8)?,
                sigma_floor: r.get(9)?,
                side: r.get(10)?,
            })
        })?;
        Ok(rows.collect::<std::result::Result<_, _>>()?)
    }

    /// Per group name: its series and parent SMILES, where the row names them.
    pub fn group_series(&self) -> Result<HashMap<String, GroupLink>> {
        let mut stmt = self
            .connection()
            .prepare("SELECT name, series, parent FROM builtin_groups")?;
        let rows = stmt.query_map([], |r| {
            let series: Option<String> = r.get(1)?;
            let parent: Option<String> = r.get(2)?;
            Ok((
                r.get::<_, String>(0)?,
                (
                    series.filter(|s| !s.is_empty()),
                    parent.filter(|s| !s.is_empty()),
                ),
            ))
        })?;
        Ok(rows.collect::<std::result::Result<_, _>>()?)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn the_builtin_tables_are_loaded_and_linked() {
        let store = Store::in_memory().unwrap();
        assert!(store.substituents().unwrap().len() >= 40);
        let series = store.series().unwrap();
        let names: Vec<&str> = series.iter().map(|s| s.name.as_str()).collect();
        for (group, (s, _)) in store.group_series().unwrap() {
            if let Some(s) = s {
                assert!(
                    names.contains(&s.as_str()),
                    "group '{group}' names series '{s}'"
                );
            }
        }
    }
}
