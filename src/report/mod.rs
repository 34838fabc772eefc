//! Turning results into text: aligned tables, CSV and JSON, and the number formats a chemist
//! reads (mmol, mg, mL with sensible significant figures).

use serde::Serialize;
use tabled::settings::Style;
use tabled::{Table, Tabled};

use crate::error::{Error, Result};

pub mod html;
pub mod ionization;
pub mod plot;
pub mod svg;

/// An aligned table of `rows` in the project's look.
pub fn table<T: Tabled>(rows: &[T]) -> String {
    let mut t = Table::new(rows);
    t.with(Style::rounded());
    format!("{t}\n")
}

/// An aligned table with columns known only at run time (one per compound, say).
pub fn grid(header: Vec<String>, rows: Vec<Vec<String>>) -> String {
    let mut b = tabled::builder::Builder::default();
    b.push_record(header);
    for row in rows {
        b.push_record(row);
    }
    let mut t = b.build();
    t.with(Style::rounded());
    format!("{t}\n")
}

/// CSV with a header row.
pub fn csv<T: Serialize>(rows: &[T]) -> Result<String> {
    let mut w = csv::Writer::from_writer(Vec::new());
    for row in rows {
        w.serialize(row)
            .map_err(|e| Error::Internal(format!("csv: {e}")))?;
    }
    let bytes = w
        .into_inner()
        .map_err(|e| Error::Internal(format!("csv: {e}")))?;
    String::from_utf8(bytes).map_err(|e| Error::Internal(format!("csv: {e}")))
}

/// Pretty JSON followed by a newline.
pub fn json<T: Serialize + ?Sized>(value: &T) -> Result<String> {
    serde_json::to_string_pretty(value)
        .map(|s| s + "\n")
        .map_err(|e| Error::Internal(format!("json: {e}")))
}

/// One compact JSON object per line.
pub fn jsonl<T: Serialize>(values: &[T]) -> Result<String> {
    let mut out = String::new();
    for v in values {
        out += &serde_json::to_string(v).map_err(|e| Error::Internal(format!("json: {e}")))?;
        out.push('\n');
    }
    Ok(out)
}

/// A number with `sig` significant figures, without exponent for lab-sized values.
pub fn sig(x: f64, sig: usize) -> String {
    if !x.is_finite() {
        return "-".into();
    }
    if x == 0.0 {
        return "0".into();
    }
    let magnitude = x.abs().log10().floor() as i32;
    let decimals = (sig as i32 - 1 - magnitude).max(0) as usize;
    format!("{x:.decimals$}")
}

/// What to measure out for a dose, as it is read at the bench: `4.12 mL of 1M citric_acid`,
/// `10.0 mL of saturated nahco3`, `527 mg of solid naoh`; `None` for a dose known only as an
/// amount of substance.
pub fn dose_measure(
    stock_volume_ml: Option<f64>,
    mass_g: Option<f64>,
    stock: &str,
    reagent: &str,
) -> Option<String> {
    use crate::units::{fmt_mass, fmt_volume};
    match (stock_volume_ml, mass_g) {
        (Some(ml), _) => {
            let stock = if stock == "sat" { "saturated" } else { stock };
            Some(format!("{} of {stock} {reagent}", fmt_volume(ml / 1e3)))
        }
        (None, Some(g)) => Some(format!("{} of solid {reagent}", fmt_mass(g))),
        (None, None) => None,
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn significant_figures() {
        assert_eq!(sig(1.23456, 3), "1.23");
        assert_eq!(sig(0.0012345, 3), "0.00123");
        assert_eq!(sig(1234.6, 3), "1235"); // integer digits are kept, never rounded away
        assert_eq!(sig(0.0, 3), "0");
    }
}
