//! Recipe (c): mix two stock solutions, the acid form and the base form, and make up to volume
//! with water. The final solution is the one of recipe (a); only the way of measuring changes.
//! Each stock holds `--stock-conc` of its form (formula units per litre), by default the
//! concentration that needs no water (the buffer's own, per unit of the system).

use super::pair;
use super::recipe::{Component, Made, Request, StockPrep};
use super::system::BufferForm;
use super::system::BufferSystem;
use crate::error::{Error, Result};

fn prep(form: &BufferForm, molar: f64) -> StockPrep {
    let grams = molar * form.molar_mass_g_mol;
    let (mass_g_per_l, volume_ml_per_l) = match form.liquid {
        Some((percent, density)) => (None, Some(grams / (percent / 100.0) / density)),
        None => (Some(grams), None),
    };
    StockPrep {
        name: form.name.clone(),
        label: form.label.clone(),
        formula: form.formula.clone(),
        molar,
        mass_g_per_l,
        volume_ml_per_l,
    }
}

fn stock_component(form: &BufferForm, role: &str, mol: f64, molar: f64) -> Component {
    Component {
        name: form.name.clone(),
        label: format!("{molar:.4} M {}", form.label),
        formula: form.formula.clone(),
        role: role.into(),
        mol,
        mass_g: None,
        volume_ml: Some(mol / molar * 1e3),
        stock_molar: Some(molar),
    }
}

/// Recipe (c).
pub fn make(system: &BufferSystem, request: &Request) -> Result<Made> {
    let p = pair::solve(system, request)?;
    let molar = |f: &BufferForm| {
        request
            .stock_conc_mol_l
            .unwrap_or(request.conc_mol_l / f.units)
    };
    let (ma, mb) = (molar(&p.acid), molar(&p.base));
    let acid = stock_component(&p.acid, "acid stock", p.acid_mol, ma);
    let base = stock_component(&p.base, "base stock", p.base_mol, mb);
    let used_ml = acid.volume_ml.unwrap_or(0.0) + base.volume_ml.unwrap_or(0.0);
    let total_ml = request.volume_l * 1e3;
    if used_ml > total_ml * (1.0 + 1e-9) {
        return Err(Error::Unreachable(format!(
            "the stocks are too dilute: {used_ml:.1} mL of them would be needed for \
             {total_ml:.1} mL of buffer; give a higher --stock-conc"
        )));
    }
    let water = (total_ml - used_ml).max(0.0);
    Ok(Made {
        components: vec![acid, base],
        dissolved: vec![(p.acid.clone(), ma), (p.base.clone(), mb)],
        mixture: p.mixture,
        equilibrium: p.equilibrium,
        stocks: vec![prep(&p.acid, ma), prep(&p.base, mb)],
        water_ml: Some(water),
        notes: vec![if water > 0.05 {
            format!("mix the two stocks and add {water:.1} mL of water ({total_ml:.0} mL in all)")
        } else {
            "mix the two stocks; no water is needed".to_string()
        }],
    })
}
