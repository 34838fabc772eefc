//! The built-in buffer tables in the store: refreshed from `data/buffers.csv` and
//! `data/buffer_forms.csv`, and read back as `BufferSystem`s with their forms.

use rusqlite::{Row, Transaction, params};

use super::Store;
use crate::buffer::BufferSystem;
use crate::buffer::system::{BUFFER_FORMS_CSV, BUFFERS_CSV, FormRow, SystemRow, read_rows};
use crate::error::Result;

const SYSTEM_COLUMNS: &str = "name, aliases, label, species, charges, pkas, dh_kj_mol, source";
const FORM_COLUMNS: &str = "system, name, label, formula, hydrate_water, molar_mass_g_mol, \
     units, strong_cations, strong_anions, percent_w_w, density_g_ml, solubility_g_100g, \
     solubility_t_c, titrate_with, source";

/// Rewrites `builtin_buffers` and `builtin_buffer_forms` from the embedded CSV files, after
/// checking that they load as buffer systems (a bad row never reaches the store).
pub fn refresh(tx: &Transaction) -> Result<()> {
    let systems: Vec<SystemRow> = read_rows(BUFFERS_CSV)?;
    let forms: Vec<FormRow> = read_rows(BUFFER_FORMS_CSV)?;
    BufferSystem::from_rows(&systems, &forms)?;
    tx.execute("DELETE FROM builtin_buffer_forms", [])?;
    tx.execute("DELETE FROM builtin_buffers", [])?;
    let mut insert = tx.prepare(&format!(
        "INSERT INTO builtin_buffers (position, {SYSTEM_COLUMNS})
         VALUES (?1, ?2, ?3, ?4, ?5, ?6, ?7, ?8, ?9)"
    ))?;
    for (i, s) in systems.iter().enumerate() {
        insert.execute(params![
            i as i64,
            s.name,
            s.aliases,
            s.label,
            s.species,
            s.charges,
            s.pkas,
            s.dh_kj_mol,
            s.source
        ])?;
    }
    let mut insert = tx.prepare(&format!(
        "INSERT INTO builtin_buffer_forms (position, {FORM_COLUMNS})
         VALUES (?1, ?2, ?3, ?4, ?5, ?6, ?7, ?8, ?9, ?10, ?11, ?12, ?13, ?14, ?15, ?16)"
    ))?;
    for (i, f) in forms.iter().enumerate() {
        insert.execute(params![
            i as i64,
            f.system,
            f.name,
            f.label,
            f.formula,
            f.hydrate_water,
            f.molar_mass_g_mol,
            f.units,
            f.strong_cations,
            f.strong_anions,
            f.percent_w_w,
            f.density_g_ml,
            f.solubility_g_100g,
            f.solubility_t_c,
            f.titrate_with,
            f.source
        ])?;
    }
    Ok(())
}

fn system_row(r: &Row) -> rusqlite::Result<SystemRow> {
    Ok(SystemRow {
        name: r.get(0)?,
        aliases: r.get(1)?,
        label: r.get(2)?,
        species: r.get(3)?,
        charges: r.get(4)?,
        pkas: r.get(5)?,
        dh_kj_mol: r.get(6)?,
        source: r.get(7)?,
    })
}

fn form_row(r: &Row) -> rusqlite::Result<FormRow> {
    Ok(FormRow {
        system: r.get(0)?,
        name: r.get(1)?,
        label: r.get(2)?,
        formula: r.get(3)?,
        hydrate_water: r.get(4)?,
        molar_mass_g_mol: r.get(5)?,
        units: r.get(6)?,
        strong_cations: r.get(7)?,
        strong_anions: r.get(8)?,
        percent_w_w: r.get(9)?,
        density_g_ml: r.get(10)?,
        solubility_g_100g: r.get(11)?,
        solubility_t_c: r.get(12)?,
        titrate_with: r.get(13)?,
        source: r.get(14)?,
    })
}

impl Store {
    /// The built-in buffer systems with their forms, in table order.
    pub fn buffer_systems(&self) -> Result<Vec<BufferSystem>> {
        let c = self.connection();
        let systems = c
            .prepare(&format!(
                "SELECT {SYSTEM_COLUMNS} FROM builtin_buffers ORDER BY position"
            ))?
            .query_map([], system_row)?
            .collect::<rusqlite::Result<Vec<_>>>()?;
        let forms = c
            .prepare(&format!(
                "SELECT {FORM_COLUMNS} FROM builtin_buffer_forms ORDER BY position"
            ))?
            .query_map([], form_row)?
            .collect::<rusqlite::Result<Vec<_>>>()?;
        BufferSystem::from_rows(&systems, &forms)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn store_buffers_equal_the_embedded_tables() {
        let store = Store::in_memory().unwrap();
        let from_store = store.buffer_systems().unwrap();
        assert_eq!(from_store, BufferSystem::builtin().unwrap());
        assert!(from_store.len() >= 13);
    }
}
