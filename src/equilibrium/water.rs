//! Water and the conditions of a calculation: temperature, activity model, and the equilibrium
//! constants that hold at that temperature (Kw, carbonic acid), read from
//! `data/aqueous_constants.csv` where each row names its source.

use crate::error::{Error, Result};

const CONSTANTS_CSV: &str = include_str!("../../data/aqueous_constants.csv");

/// How activities are taken. Only ideal (all activity coefficients 1, pH = -log10 [H+]) is
/// implemented; the Davies equation is planned.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Activity {
    Ideal,
}

/// Temperature and activity model, with the constants looked up for that temperature.
#[derive(Debug, Clone, PartialEq)]
pub struct Conditions {
    temperature_c: f64,
    activity: Activity,
    pkw: f64,
    carbonate_pk1: f64,
    carbonate_pk2: f64,
}

impl Conditions {
    /// Conditions at `temperature_c` with ideal activities. Temperatures without tabulated
    /// constants (everything but 25 °C for now) give `Error::Input`.
    pub fn new(temperature_c: f64) -> Result<Conditions> {
        Ok(Conditions {
            temperature_c,
            activity: Activity::Ideal,
            pkw: constant("pkw", temperature_c)?,
            carbonate_pk1: constant("carbonate_pk1", temperature_c)?,
            carbonate_pk2: constant("carbonate_pk2", temperature_c)?,
        })
    }

    /// 25 °C, ideal activities: the one set of conditions every table covers.
    pub fn standard() -> Conditions {
        // The embedded table is part of the program; a failure here is a build fault that
        // the unit tests below catch.
        Conditions::new(25.0).expect("data/aqueous_constants.csv covers 25 °C")
    }

    pub fn temperature_c(&self) -> f64 {
        self.temperature_c
    }

    pub fn activity(&self) -> Activity {
        self.activity
    }

    /// -log10 Kw.
    pub fn pkw(&self) -> f64 {
        self.pkw
    }

    /// Ion product of water, mol²/L².
    pub fn kw(&self) -> f64 {
        10f64.powf(-self.pkw)
    }

    /// pKa of CO2(aq) (written H2CO3*) to HCO3-.
    pub fn carbonate_pk1(&self) -> f64 {
        self.carbonate_pk1
    }

    /// pKa of HCO3- to CO3--.
    pub fn carbonate_pk2(&self) -> f64 {
        self.carbonate_pk2
    }
}

/// One constant from the embedded table at a temperature (matched to 0.01 °C).
fn constant(name: &str, temperature_c: f64) -> Result<f64> {
    if !temperature_c.is_finite() {
        return Err(Error::Input("temperature must be a finite number".into()));
    }
    let mut reader = csv::Reader::from_reader(CONSTANTS_CSV.as_bytes());
    let mut tabulated = Vec::new();
    for row in reader.records() {
        let row = row.map_err(|e| Error::Internal(format!("aqueous_constants.csv: {e}")))?;
        if &row[0] != name {
            continue;
        }
        let parse = |i: usize| -> Result<f64> {
            row[i].parse().map_err(|_| {
                Error::Internal(format!("aqueous_constants.csv: bad number '{}'", &row[i]))
            })
        };
        let t = parse(1)?;
        if (t - temperature_c).abs() < 0.01 {
            return parse(2);
        }
        tabulated.push(t);
    }
    if tabulated.is_empty() {
        return Err(Error::Internal(format!(
            "aqueous_constants.csv has no '{name}'"
        )));
    }
    let list: Vec<String> = tabulated.iter().map(|t| format!("{t} °C")).collect();
    Err(Error::Input(format!(
        "temperature {temperature_c} °C is not supported yet: {name} is tabulated at {} only",
        list.join(", ")
    )))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn neutral_water_at_25_c() {
        let c = Conditions::standard();
        // Bandura & Lvov (2006): pKw 13.995 at 25 °C, so neutral pH is 7.00 to two decimals.
        assert!((c.pkw() / 2.0 - 7.0).abs() < 0.005);
        assert!((c.kw() - 1.0116e-14).abs() < 1e-17);
        assert_eq!(c.activity(), Activity::Ideal);
        assert_eq!(c.temperature_c(), 25.0);
    }

    #[test]
    fn carbonic_acid_constants() {
        let c = Conditions::standard();
        // Harned & Davis (1943), Harned & Scholes (1941): 6.35 and 10.33 to two decimals.
        assert!((c.carbonate_pk1() - 6.35).abs() < 0.005);
        assert!((c.carbonate_pk2() - 10.33).abs() < 0.005);
    }

    #[test]
    fn other_temperatures_are_not_supported_yet() {
        match Conditions::new(37.0) {
            Err(Error::Input(m)) => assert!(m.contains("not supported yet"), "{m}"),
            other => panic!("expected Error::Input, got {other:?}"),
        }
        assert!(matches!(Conditions::new(f64::NAN), Err(Error::Input(_))));
    }
}
