//! Quantities in and out: amounts (`2.5mmol`, `150mg`, `0.1M`, `1.2equiv`), volumes (`50mL`),
//! pH lists (`2,8,12`) and temperatures (`25`), read with the byte position of any bad
//! character, and printed back in lab units with three significant figures.
//!
//! Numbers stay typed (`Amount`, `Volume`) until the edge: conversion to moles needs the molar
//! mass (for masses) or the layer volume (for concentrations), which only the caller knows.

use crate::error::{Error, ParseError, Result};

/// An amount of a compound as the user wrote it.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Amount {
    /// Moles.
    Moles(f64),
    /// Grams.
    Grams(f64),
    /// Concentration in mol/L; becomes moles with the layer volume.
    Molar(f64),
    /// Equivalents relative to a reference amount the caller chooses.
    Equivalents(f64),
}

impl Amount {
    /// Moles of this amount, given the compound's molar mass (g/mol) and the volume of the
    /// layer it is dissolved in (L). Equivalents are relative and must be resolved by the
    /// caller, so they give `Error::Input`.
    pub fn to_moles(&self, molar_mass_g_mol: Option<f64>, volume_l: Option<f64>) -> Result<f64> {
        match *self {
            Amount::Moles(n) => Ok(n),
            Amount::Grams(g) => match molar_mass_g_mol {
                Some(m) if m.is_finite() && m > 0.0 => Ok(g / m),
                _ => Err(Error::Input(
                    "a mass needs the compound's molar mass to become moles".into(),
                )),
            },
            Amount::Molar(c) => match volume_l {
                Some(v) if v.is_finite() && v > 0.0 => Ok(c * v),
                _ => Err(Error::Input(
                    "a concentration needs the layer volume to become moles".into(),
                )),
            },
            Amount::Equivalents(_) => Err(Error::Input(
                "equivalents are relative: give the reference amount in moles".into(),
            )),
        }
    }
}

/// A volume in litres.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Volume {
    pub litres: f64,
}

/// A unit name, its factor to the base unit, and the `Amount` variant it makes.
type AmountUnit = (&'static str, f64, fn(f64) -> Amount);

/// Units an amount may carry, with the factor to the base unit of its `Amount` variant.
const AMOUNT_UNITS: &[AmountUnit] = &[
    ("mol", 1.0, Amount::Moles),
    ("mmol", 1e-3, Amount::Moles),
    ("umol", 1e-6, Amount::Moles),
    ("µmol", 1e-6, Amount::Moles),
    ("μmol", 1e-6, Amount::Moles),
    ("g", 1.0, Amount::Grams),
    ("mg", 1e-3, Amount::Grams),
    ("M", 1.0, Amount::Molar),
    ("mM", 1e-3, Amount::Molar),
    ("uM", 1e-6, Amount::Molar),
    ("µM", 1e-6, Amount::Molar),
    ("μM", 1e-6, Amount::Molar),
    ("equiv", 1.0, Amount::Equivalents),
    ("eq", 1.0, Amount::Equivalents),
];

const VOLUME_UNITS: &[(&str, f64)] = &[
    ("L", 1.0),
    ("mL", 1e-3),
    ("uL", 1e-6),
    ("µL", 1e-6),
    ("μL", 1e-6),
];

/// Reads an unsigned decimal number (`12`, `0.5`, `.5`, `2e-3`) starting at `start`.
/// Returns the value and the byte offset just after it.
fn read_number(
    what: &'static str,
    text: &str,
    start: usize,
) -> std::result::Result<(f64, usize), ParseError> {
    let bytes = text.as_bytes();
    let mut i = start;
    if i < bytes.len() && (bytes[i] == b'-' || bytes[i] == b'+') {
        let message = if bytes[i] == b'-' {
            "must not be negative"
        } else {
            "expected a number without sign"
        };
        return Err(ParseError::new(what, text, i, message));
    }
    let digits_start = i;
    while i < bytes.len() && bytes[i].is_ascii_digit() {
        i += 1;
    }
    if i < bytes.len() && bytes[i] == b'.' {
        i += 1;
        while i < bytes.len() && bytes[i].is_ascii_digit() {
            i += 1;
        }
    }
    let mantissa = &text[digits_start..i];
    if !mantissa.bytes().any(|b| b.is_ascii_digit()) {
        return Err(ParseError::new(what, text, start, "expected a number"));
    }
    // An exponent only when `e` is followed by a digit (or a sign and a digit), so that
    // `2eq` reads as 2 equivalents.
    if i < bytes.len() && (bytes[i] == b'e' || bytes[i] == b'E') {
        let mut j = i + 1;
        if j < bytes.len() && (bytes[j] == b'-' || bytes[j] == b'+') {
            j += 1;
        }
        if j < bytes.len() && bytes[j].is_ascii_digit() {
            while j < bytes.len() && bytes[j].is_ascii_digit() {
                j += 1;
            }
            i = j;
        }
    }
    let value: f64 = text[digits_start..i]
        .parse()
        .map_err(|_| ParseError::new(what, text, start, "expected a number"))?;
    if !value.is_finite() {
        return Err(ParseError::new(what, text, start, "number is too large"));
    }
    Ok((value, i))
}

fn skip_spaces(text: &str, mut i: usize) -> usize {
    while i < text.len() && text.as_bytes()[i] == b' ' {
        i += 1;
    }
    i
}

/// Reads `NUMBER UNIT` (space between them optional) and returns value, unit text and the
/// unit's byte position. Leading and trailing spaces are tolerated.
fn read_quantity<'t>(
    what: &'static str,
    text: &'t str,
) -> std::result::Result<(f64, usize, &'t str, usize), ParseError> {
    let start = skip_spaces(text, 0);
    let (value, after) = read_number(what, text, start)?;
    let unit_start = skip_spaces(text, after);
    let unit = text[unit_start..].trim_end_matches(' ');
    Ok((value, start, unit, unit_start))
}

fn unknown_unit(
    what: &'static str,
    text: &str,
    position: usize,
    unit: &str,
    known: &[&str],
) -> ParseError {
    let message = if unit.is_empty() {
        format!("missing unit; expected one of {}", known.join(", "))
    } else {
        format!(
            "unknown unit '{unit}'; expected one of {}",
            known.join(", ")
        )
    };
    ParseError::new(what, text, position, message)
}

/// Reads an amount: `2.5mmol`, `3 mmol`, `0.30g`, `150mg`, `0.1M`, `50mM`, `1.1equiv`.
/// A zero amount is rejected: a compound that is not there has no place in a layer.
pub fn parse_amount(text: &str) -> std::result::Result<Amount, ParseError> {
    const WHAT: &str = "amount";
    let (value, number_at, unit, unit_at) = read_quantity(WHAT, text)?;
    let Some(&(_, factor, make)) = AMOUNT_UNITS.iter().find(|(name, _, _)| *name == unit) else {
        let known: Vec<&str> = AMOUNT_UNITS.iter().map(|(n, _, _)| *n).collect();
        return Err(unknown_unit(WHAT, text, unit_at, unit, &known));
    };
    if value == 0.0 {
        return Err(ParseError::new(
            WHAT,
            text,
            number_at,
            "amount must be greater than zero",
        ));
    }
    Ok(make(value * factor))
}

/// Reads a volume: `50mL`, `0.5L`, `250uL` (or `µL`). Zero is rejected.
pub fn parse_volume(text: &str) -> std::result::Result<Volume, ParseError> {
    const WHAT: &str = "volume";
    let (value, number_at, unit, unit_at) = read_quantity(WHAT, text)?;
    let Some(&(_, factor)) = VOLUME_UNITS.iter().find(|(name, _)| *name == unit) else {
        let known: Vec<&str> = VOLUME_UNITS.iter().map(|(n, _)| *n).collect();
        return Err(unknown_unit(WHAT, text, unit_at, unit, &known));
    };
    if value == 0.0 {
        return Err(ParseError::new(
            WHAT,
            text,
            number_at,
            "volume must be greater than zero",
        ));
    }
    Ok(Volume {
        litres: value * factor,
    })
}

/// Lowest and highest pH accepted as input: the span where "pH" still means something for
/// aqueous work (common practice).
pub const PH_MIN: f64 = -2.0;
pub const PH_MAX: f64 = 16.0;

/// Reads one pH value, or a comma-separated list (`2,8,12`), each within -2..16.
pub fn parse_ph_list(text: &str) -> std::result::Result<Vec<f64>, ParseError> {
    const WHAT: &str = "pH";
    let mut values = Vec::new();
    let mut item_start = 0;
    for item in text.split(',') {
        let lead = item.len() - item.trim_start_matches(' ').len();
        let at = item_start + lead;
        let bytes = text.as_bytes();
        // pH may be negative, so a leading minus is part of the number here.
        let negative = at < text.len() && bytes[at] == b'-';
        let number_at = if negative { at + 1 } else { at };
        let (magnitude, after) = read_number(WHAT, text, number_at)?;
        let end = item_start + item.trim_end_matches(' ').len();
        if after < end {
            return Err(ParseError::new(
                WHAT,
                text,
                after,
                "unexpected character after the pH",
            ));
        }
        let value = if negative { -magnitude } else { magnitude };
        if !(PH_MIN..=PH_MAX).contains(&value) {
            return Err(ParseError::new(
                WHAT,
                text,
                at,
                format!("pH {value} is outside {PH_MIN}..{PH_MAX}"),
            ));
        }
        values.push(value);
        item_start += item.len() + 1;
    }
    Ok(values)
}

/// Reads a temperature in °C (`25`, `25C`, `25 °C`), within the liquid range of water.
pub fn parse_temperature(text: &str) -> std::result::Result<f64, ParseError> {
    const WHAT: &str = "temperature";
    let start = skip_spaces(text, 0);
    let bytes = text.as_bytes();
    let negative = start < text.len() && bytes[start] == b'-';
    let (magnitude, after) = read_number(WHAT, text, if negative { start + 1 } else { start })?;
    let unit_at = skip_spaces(text, after);
    let unit = text[unit_at..].trim_end_matches(' ');
    if !matches!(unit, "" | "C" | "°C") {
        return Err(unknown_unit(WHAT, text, unit_at, unit, &["C", "°C"]));
    }
    let value = if negative { -magnitude } else { magnitude };
    // Liquid water at 1 atm (common practice).
    if !(0.0..=100.0).contains(&value) {
        return Err(ParseError::new(
            WHAT,
            text,
            start,
            "temperature must lie between 0 and 100 °C",
        ));
    }
    Ok(value)
}

/// Formats `value` with three significant figures in the largest unit of `scale` (largest
/// first: factor, name) where it reads as at least 1.
fn fmt_sig3(value: f64, scale: &[(f64, &str)]) -> String {
    let smallest = scale[scale.len() - 1];
    if !value.is_finite() {
        return "n/a".to_string();
    }
    if value == 0.0 {
        return format!("0 {}", scale[0].1);
    }
    let sign = if value < 0.0 { "-" } else { "" };
    let magnitude = value.abs();
    for (i, &(factor, name)) in scale.iter().enumerate() {
        let in_unit = magnitude / factor;
        if in_unit >= 1.0 || i == scale.len() - 1 {
            let text = sig3(in_unit);
            // Rounding can carry 999.7 mmol to "1000": move up one unit instead.
            if i > 0 && text.parse::<f64>().unwrap_or(0.0) >= 1000.0 {
                let (bigger, bigger_name) = scale[i - 1];
                return format!("{sign}{} {bigger_name}", sig3(magnitude / bigger));
            }
            return format!("{sign}{text} {name}");
        }
    }
    format!("{sign}{} {}", sig3(magnitude / smallest.0), smallest.1)
}

/// Three significant figures, no exponent.
fn sig3(x: f64) -> String {
    let exponent = x.log10().floor() as i32;
    let decimals = (2 - exponent).max(0) as usize;
    let rounded = format!("{x:.decimals$}");
    // 9.996 rounds to "10.00": one digit too many, so format for the next decade.
    if rounded.parse::<f64>().unwrap_or(0.0) >= 10f64.powi(exponent + 1) {
        let fewer = (1 - exponent).max(0) as usize;
        return format!("{x:.fewer$}");
    }
    rounded
}

/// pH with two decimals, never "-0.00".
pub fn fmt_ph(ph: f64) -> String {
    let text = format!("{ph:.2}");
    if text == "-0.00" {
        "0.00".to_string()
    } else {
        text
    }
}

/// Moles for the bench: `0.0030` -> `"3.00 mmol"`.
pub fn fmt_moles(mol: f64) -> String {
    fmt_sig3(
        mol,
        &[(1.0, "mol"), (1e-3, "mmol"), (1e-6, "µmol"), (1e-9, "nmol")],
    )
}

/// Mass for the balance: `0.25` -> `"250 mg"`.
pub fn fmt_mass(grams: f64) -> String {
    fmt_sig3(grams, &[(1.0, "g"), (1e-3, "mg"), (1e-6, "µg")])
}

/// Volume for the pipette or cylinder: `0.0125` -> `"12.5 mL"`.
pub fn fmt_volume(litres: f64) -> String {
    fmt_sig3(litres, &[(1.0, "L"), (1e-3, "mL"), (1e-6, "µL")])
}

#[cfg(test)]
mod tests {
    use super::*;

    fn close(a: f64, b: f64) -> bool {
        (a - b).abs() <= 1e-12 * b.abs().max(1e-300)
    }

    #[test]
    fn reads_amounts_in_every_unit() {
        let cases = [
            ("2.5mmol", Amount::Moles(2.5e-3)),
            ("3 mmol", Amount::Moles(3e-3)),
            (" 1mol ", Amount::Moles(1.0)),
            ("40umol", Amount::Moles(40e-6)),
            ("40µmol", Amount::Moles(40e-6)),
            ("0.30g", Amount::Grams(0.30)),
            ("150mg", Amount::Grams(0.150)),
            ("0.1M", Amount::Molar(0.1)),
            ("50mM", Amount::Molar(0.05)),
            ("1.2equiv", Amount::Equivalents(1.2)),
            ("2eq", Amount::Equivalents(2.0)),
            ("2e-3mol", Amount::Moles(2e-3)),
            (".5mmol", Amount::Moles(5e-4)),
        ];
        for (text, want) in cases {
            let got = parse_amount(text).unwrap();
            let ok = match (got, want) {
                (Amount::Moles(a), Amount::Moles(b))
                | (Amount::Grams(a), Amount::Grams(b))
                | (Amount::Molar(a), Amount::Molar(b))
                | (Amount::Equivalents(a), Amount::Equivalents(b)) => close(a, b),
                _ => false,
            };
            assert!(ok, "{text}: {got:?} != {want:?}");
        }
    }

    #[test]
    fn bad_amounts_point_at_the_character() {
        let cases = [
            ("", 0),
            ("mmol", 0),
            ("-2mmol", 0),
            ("  -2mmol", 2),
            ("2.5xyz", 3),
            ("2.5 kg", 4),
            ("0mmol", 0),
            ("2.5", 3),
            ("nan mmol", 0),
            ("1e999mol", 0),
        ];
        for (text, position) in cases {
            let err = parse_amount(text).unwrap_err();
            assert_eq!(err.position, position, "{text}: {err}");
            assert_eq!(err.what, "amount");
        }
    }

    #[test]
    fn amounts_become_moles() {
        // 150 mg of a compound of 150 g/mol is 1 mmol.
        let n = Amount::Grams(0.150).to_moles(Some(150.0), None).unwrap();
        assert!(close(n, 1e-3));
        let n = Amount::Molar(0.1).to_moles(None, Some(0.05)).unwrap();
        assert!(close(n, 5e-3));
        assert!(Amount::Grams(1.0).to_moles(None, None).is_err());
        assert!(Amount::Molar(1.0).to_moles(Some(1.0), None).is_err());
        assert!(
            Amount::Equivalents(1.0)
                .to_moles(Some(1.0), Some(1.0))
                .is_err()
        );
    }

    #[test]
    fn reads_volumes() {
        assert!(close(parse_volume("50mL").unwrap().litres, 0.05));
        assert!(close(parse_volume("0.5L").unwrap().litres, 0.5));
        assert!(close(parse_volume("250uL").unwrap().litres, 250e-6));
        assert!(close(parse_volume("250µL").unwrap().litres, 250e-6));
        assert_eq!(parse_volume("50ml").unwrap_err().position, 2);
        assert_eq!(parse_volume("0mL").unwrap_err().position, 0);
        assert_eq!(parse_volume("-5mL").unwrap_err().position, 0);
    }

    #[test]
    fn reads_ph_lists() {
        assert_eq!(parse_ph_list("2,8,12").unwrap(), vec![2.0, 8.0, 12.0]);
        assert_eq!(parse_ph_list("-1.5, 7").unwrap(), vec![-1.5, 7.0]);
        assert_eq!(parse_ph_list("2,17").unwrap_err().position, 2);
        assert_eq!(parse_ph_list("2,8x").unwrap_err().position, 3);
        assert_eq!(parse_ph_list("2,,3").unwrap_err().position, 2);
        assert_eq!(parse_ph_list("-3").unwrap_err().position, 0);
    }

    #[test]
    fn reads_temperatures() {
        assert_eq!(parse_temperature("25").unwrap(), 25.0);
        assert_eq!(parse_temperature("37 °C").unwrap(), 37.0);
        assert_eq!(parse_temperature("25F").unwrap_err().position, 2);
        assert_eq!(parse_temperature("150").unwrap_err().position, 0);
    }

    #[test]
    fn formats_three_significant_figures() {
        assert_eq!(fmt_moles(0.0030), "3.00 mmol");
        assert_eq!(fmt_moles(0.0125), "12.5 mmol");
        assert_eq!(fmt_moles(2.5e-5), "25.0 µmol");
        assert_eq!(fmt_moles(1.5), "1.50 mol");
        assert_eq!(fmt_moles(0.9996), "1.00 mol");
        assert_eq!(fmt_moles(0.0), "0 mol");
        assert_eq!(fmt_mass(0.25), "250 mg");
        assert_eq!(fmt_mass(4.2), "4.20 g");
        assert_eq!(fmt_volume(0.0125), "12.5 mL");
        assert_eq!(fmt_volume(0.05), "50.0 mL");
        assert_eq!(fmt_volume(2.5e-4), "250 µL");
        assert_eq!(fmt_volume(0.009996), "10.0 mL");
        assert_eq!(fmt_volume(f64::NAN), "n/a");
        assert_eq!(fmt_ph(-0.001), "0.00");
        assert_eq!(fmt_ph(-0.006), "-0.01");
        assert_eq!(fmt_ph(8.314), "8.31");
    }
}
