//! Water and the conditions of a calculation: temperature (0-60 °C), activity model and CO2
//! handling, with the constants that hold at that temperature — Kw, the carbonic acid
//! constants, Henry's constant of CO2 and the Davies A — from the fits in
//! `data/aqueous_constants.csv`, where each row names its source.

use super::activity::debye_huckel_a;
use super::carbonate::Co2Mode;
use crate::error::{Error, Result};

const CONSTANTS_CSV: &str = include_str!("../../data/aqueous_constants.csv");

/// Kelvin at 0 °C.
pub const ZERO_CELSIUS_K: f64 = 273.15;
/// Temperatures the fits cover together, °C.
pub const T_RANGE_C: (f64, f64) = (0.0, 60.0);

/// How activities are taken.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Activity {
    /// Every activity coefficient 1: pH = -log10 [H+].
    Ideal,
    /// Davies equation, ionic strength iterated to self-consistency.
    Davies,
}

impl Activity {
    pub fn as_str(&self) -> &'static str {
        match self {
            Activity::Ideal => "ideal",
            Activity::Davies => "davies",
        }
    }
}

/// Temperature, activity model and CO2 mode, with the constants worked out for that
/// temperature.
#[derive(Debug, Clone, PartialEq)]
pub struct Conditions {
    temperature_c: f64,
    activity: Activity,
    co2: Co2Mode,
    pkw: f64,
    carbonate_pk1: f64,
    carbonate_pk2: f64,
    co2_henry: f64,
    co2_air_atm: f64,
    davies_a: f64,
}

impl Conditions {
    /// Conditions at `temperature_c` (0-60 °C) with ideal activities and a closed system:
    /// the textbook reference. `with_activity` and `with_co2` change the model.
    pub fn new(temperature_c: f64) -> Result<Conditions> {
        if !temperature_c.is_finite() {
            return Err(Error::Input("temperature must be a finite number".into()));
        }
        let (lo, hi) = T_RANGE_C;
        if !(lo..=hi).contains(&temperature_c) {
            return Err(Error::Input(format!(
                "temperature {temperature_c} °C is outside {lo}-{hi} °C, the range the constants \
                 are fitted over"
            )));
        }
        let table = Table::load()?;
        let t = temperature_c;
        let tk = t + ZERO_CELSIUS_K;
        Ok(Conditions {
            temperature_c: t,
            activity: Activity::Ideal,
            co2: Co2Mode::Closed,
            pkw: -table.value("kw", t)?,
            carbonate_pk1: -table.value("carbonate_k1", t)?,
            carbonate_pk2: -table.value("carbonate_k2", t)?,
            co2_henry: 10f64.powf(table.value("co2_henry", t)?),
            co2_air_atm: table.value("co2_air", t)?,
            davies_a: debye_huckel_a(
                tk,
                table.value("water_dielectric", t)?,
                table.value("water_density", t)?,
            ),
        })
    }

    /// 25 °C, ideal activities, closed system.
    pub fn standard() -> Conditions {
        // The embedded table is part of the program; a failure here is a build fault that
        // the unit tests below catch.
        Conditions::new(25.0).expect("data/aqueous_constants.csv covers 25 °C")
    }

    /// The same conditions with another activity model.
    pub fn with_activity(mut self, activity: Activity) -> Conditions {
        self.activity = activity;
        self
    }

    /// The same conditions with another CO2 mode.
    pub fn with_co2(mut self, co2: Co2Mode) -> Conditions {
        self.co2 = co2;
        self
    }

    pub fn temperature_c(&self) -> f64 {
        self.temperature_c
    }

    pub fn temperature_k(&self) -> f64 {
        self.temperature_c + ZERO_CELSIUS_K
    }

    pub fn activity(&self) -> Activity {
        self.activity
    }

    pub fn co2_mode(&self) -> Co2Mode {
        self.co2
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

    /// Henry's constant of CO2, mol L^-1 atm^-1: dissolved CO2 under 1 atm of CO2.
    pub fn co2_henry(&self) -> f64 {
        self.co2_henry
    }

    /// Partial pressure of CO2 in air, atm.
    pub fn co2_air_atm(&self) -> f64 {
        self.co2_air_atm
    }

    /// Debye–Hückel A of the Davies equation at this temperature.
    pub fn davies_a(&self) -> f64 {
        self.davies_a
    }
}

/// The rows of `data/aqueous_constants.csv`.
struct Table {
    rows: Vec<Row>,
}

struct Row {
    name: String,
    form: String,
    c: [f64; 6],
    d1: f64,
    range: (f64, f64),
}

impl Table {
    fn load() -> Result<Table> {
        let bad = |m: String| Error::Internal(format!("aqueous_constants.csv: {m}"));
        let mut reader = csv::ReaderBuilder::new()
            .comment(Some(b'#'))
            .from_reader(CONSTANTS_CSV.as_bytes());
        let mut rows = Vec::new();
        for record in reader.records() {
            let record = record.map_err(|e| bad(e.to_string()))?;
            let num = |i: usize| -> Result<f64> {
                record[i]
                    .trim()
                    .parse()
                    .map_err(|_| bad(format!("bad number '{}'", &record[i])))
            };
            if record[11].trim().is_empty() {
                return Err(bad(format!("{} has no source", &record[0])));
            }
            rows.push(Row {
                name: record[0].to_string(),
                form: record[1].to_string(),
                c: [num(2)?, num(3)?, num(4)?, num(5)?, num(6)?, num(7)?],
                d1: num(8)?,
                range: (num(9)?, num(10)?),
            });
        }
        Ok(Table { rows })
    }

    /// The function `name` at `t` °C.
    fn value(&self, name: &str, t: f64) -> Result<f64> {
        let row = self
            .rows
            .iter()
            .find(|r| r.name == name)
            .ok_or_else(|| Error::Internal(format!("aqueous_constants.csv has no '{name}'")))?;
        if t < row.range.0 || t > row.range.1 {
            return Err(Error::Input(format!(
                "{name} is fitted over {}-{} °C only, not {t} °C",
                row.range.0, row.range.1
            )));
        }
        let c = &row.c;
        match row.form.as_str() {
            "log10k" => {
                let tk = t + ZERO_CELSIUS_K;
                Ok(c[0] + c[1] * tk + c[2] / tk + c[3] * tk.log10() + c[4] / (tk * tk))
            }
            "rational" => {
                let numerator = c.iter().rev().fold(0.0, |acc, &ci| acc * t + ci);
                Ok(numerator / (1.0 + row.d1 * t))
            }
            "constant" => Ok(c[0]),
            other => Err(Error::Internal(format!(
                "aqueous_constants.csv: unknown form '{other}' for {name}"
            ))),
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn neutral_water_at_25_c() {
        let c = Conditions::standard();
        // Bandura & Lvov (2006): pKw 13.995 at 25 °C, so neutral pH is 7.00 to two decimals.
        assert!((c.pkw() - 13.995).abs() < 0.002, "{}", c.pkw());
        assert!((c.pkw() / 2.0 - 7.0).abs() < 0.005);
        assert_eq!(c.activity(), Activity::Ideal);
        assert_eq!(c.co2_mode(), Co2Mode::Closed);
        assert_eq!(c.temperature_c(), 25.0);
    }

    #[test]
    fn carbonic_acid_constants() {
        let c = Conditions::standard();
        // Harned & Davis (1943), Harned & Scholes (1941): 6.352 and 10.329 at 25 °C.
        assert!(
            (c.carbonate_pk1() - 6.352).abs() < 0.002,
            "{}",
            c.carbonate_pk1()
        );
        assert!(
            (c.carbonate_pk2() - 10.329).abs() < 0.002,
            "{}",
            c.carbonate_pk2()
        );
        // Henry's constant of CO2 at 25 °C: 0.034 mol/(L atm) (Sander 2015 compilation).
        assert!((c.co2_henry() - 0.034).abs() < 0.0005, "{}", c.co2_henry());
    }

    #[test]
    fn water_properties_at_25_c() {
        let table = Table::load().unwrap();
        // Kell (1975): 0.997047 g/mL at 25 °C; Malmberg & Maryott (1956): 78.30.
        assert!((table.value("water_density", 25.0).unwrap() - 0.997047).abs() < 5e-6);
        assert!((table.value("water_dielectric", 25.0).unwrap() - 78.30).abs() < 0.01);
    }

    #[test]
    fn temperatures_outside_the_fits_are_refused() {
        for t in [-5.0, 61.0, f64::NAN] {
            assert!(matches!(Conditions::new(t), Err(Error::Input(_))), "{t}");
        }
        assert!(Conditions::new(0.0).is_ok() && Conditions::new(60.0).is_ok());
    }
}
