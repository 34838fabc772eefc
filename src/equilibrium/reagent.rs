//! Reagents a chemist adds to move the pH (HCl, NaOH, NaHCO3, ...) and the stock forms they
//! come in (solid, n M, % w/w, saturated). Facts come from `data/reagents.csv` and
//! `data/reagent_stocks.csv` (each row with its source); the store may pass other rows later.

use crate::error::{Error, ParseError, Result};

/// The built-in tables, embedded in the binary.
pub const REAGENTS_CSV: &str = include_str!("../../data/reagents.csv");
pub const REAGENT_STOCKS_CSV: &str = include_str!("../../data/reagent_stocks.csv");

/// Whether a reagent is used to lower (acid) or raise (base) the pH.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Role {
    Acid,
    Base,
}

/// What the user asks for with `--stock`: `solid`, `1M`, `37%`, `sat`.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum StockForm {
    Solid,
    Molar(f64),
    /// Percent by weight.
    PercentWw(f64),
    Saturated,
}

/// How the reagent is added, as the dosing calculation needs it.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Stock {
    /// Weighed in; adds no volume.
    Solid,
    /// A solution of `molar` mol/L; adds its volume.
    Solution { molar: f64 },
}

/// One stock form a reagent is offered in.
#[derive(Debug, Clone, PartialEq)]
pub struct StockOffer {
    pub form: StockForm,
    pub stock: Stock,
    /// Density of a % w/w solution, g/mL.
    pub density_g_ml: Option<f64>,
    pub source: String,
}

/// A weak acid-base system a reagent brings, by its stepwise constants at 25 °C.
#[derive(Debug, Clone, PartialEq)]
pub struct WeakSystem {
    /// Name shared by every reagent that brings it (`phosphate`), so amounts pool.
    pub name: String,
    /// Charge of the most protonated form.
    pub top_charge: i32,
    pub pkas: Vec<f64>,
    /// Enthalpy of each step, kJ/mol, where known.
    pub dh_kj_mol: Vec<Option<f64>>,
}

/// A reagent and the forms it is offered in.
#[derive(Debug, Clone, PartialEq)]
pub struct Reagent {
    /// Short lowercase name used on the command line (`naoh`).
    pub name: String,
    pub formula: String,
    pub molar_mass_g_mol: f64,
    pub role: Role,
    /// Rank among reagents of the same role, 1 = mildest (`--reagent auto`).
    pub mildness: u32,
    /// Per formula unit: moles of strong positive charge (Na+, K+) it brings.
    pub strong_cations: f64,
    /// Per formula unit: moles of strong negative charge (Cl-).
    pub strong_anions: f64,
    /// Per formula unit: moles of carbonate carbon.
    pub carbonate: f64,
    /// A weak system it brings, one per formula unit (phosphate, citrate, ammonium ...).
    pub system: Option<WeakSystem>,
    /// Solubility in water at 20 °C, g per 100 g of water; `None` for a gas, a liquid
    /// miscible with water, or where unknown.
    pub solubility_g_100g: Option<f64>,
    /// Short hazard statement (from suppliers' safety data sheets).
    pub hazards: String,
    pub source: String,
    pub stocks: Vec<StockOffer>,
}

/// Columns of `data/reagents.csv` (and of the store's `builtin_reagents`), in order.
pub const REAGENT_COLUMNS: [&str; 15] = [
    "name",
    "formula",
    "molar_mass_g_mol",
    "role",
    "mildness",
    "strong_cations",
    "strong_anions",
    "carbonate",
    "system",
    "top_charge",
    "pkas",
    "dh_kj_mol",
    "solubility_g_100g",
    "hazards",
    "source",
];

/// Columns of `data/reagent_stocks.csv` (and of `builtin_reagent_stocks`), in order.
pub const STOCK_COLUMNS: [&str; 6] = [
    "reagent",
    "form",
    "molar",
    "percent_w_w",
    "density_g_ml",
    "source",
];

impl StockForm {
    /// Reads `solid`, `sat` (or `saturated`), `1M`, `0.1 M`, `37%`.
    pub fn parse(text: &str) -> std::result::Result<StockForm, ParseError> {
        const WHAT: &str = "stock";
        let trimmed = text.trim();
        let start = text.len() - text.trim_start().len();
        match trimmed.to_ascii_lowercase().as_str() {
            "solid" => return Ok(StockForm::Solid),
            "sat" | "saturated" => return Ok(StockForm::Saturated),
            _ => {}
        }
        let number_end = trimmed
            .find(|c: char| !(c.is_ascii_digit() || c == '.'))
            .unwrap_or(trimmed.len());
        let unit = trimmed[number_end..].trim_start();
        let unit_at = start + trimmed.len() - unit.len();
        let value: f64 = trimmed[..number_end].parse().map_err(|_| {
            ParseError::new(
                WHAT,
                text,
                start,
                "expected solid, sat, a molarity (1M) or a percentage (37%)",
            )
        })?;
        if value <= 0.0 {
            return Err(ParseError::new(
                WHAT,
                text,
                start,
                "concentration must be greater than zero",
            ));
        }
        match unit {
            "M" => Ok(StockForm::Molar(value)),
            "%" if value <= 100.0 => Ok(StockForm::PercentWw(value)),
            "%" => Err(ParseError::new(
                WHAT,
                text,
                start,
                "a percentage cannot exceed 100",
            )),
            _ => Err(ParseError::new(
                WHAT,
                text,
                unit_at,
                "expected M or % after the number",
            )),
        }
    }

    /// The text a chemist would write: `solid`, `1M`, `37%`, `sat`.
    pub fn label(&self) -> String {
        match self {
            StockForm::Solid => "solid".into(),
            StockForm::Molar(m) => format!("{m}M"),
            StockForm::PercentWw(p) => format!("{p}%"),
            StockForm::Saturated => "sat".into(),
        }
    }

    fn same(&self, other: &StockForm) -> bool {
        let near = |a: f64, b: f64| (a - b).abs() <= 1e-9 * a.abs().max(b.abs());
        match (self, other) {
            (StockForm::Molar(a), StockForm::Molar(b)) => near(*a, *b),
            (StockForm::PercentWw(a), StockForm::PercentWw(b)) => near(*a, *b),
            _ => std::mem::discriminant(self) == std::mem::discriminant(other),
        }
    }
}

impl StockOffer {
    /// The label of the form (`1M`, `sat`).
    pub fn label(&self) -> String {
        self.form.label()
    }
}

impl Reagent {
    /// The built-in reagents from the embedded tables.
    pub fn builtin() -> Result<Vec<Reagent>> {
        Reagent::load_all(REAGENTS_CSV, REAGENT_STOCKS_CSV)
    }

    /// Reads reagents and their stock forms from CSV text (see `data/reagents.csv` and
    /// `data/reagent_stocks.csv` for the columns; `#` starts a comment line).
    pub fn load_all(reagents_csv: &str, stocks_csv: &str) -> Result<Vec<Reagent>> {
        let reagents = csv_rows(reagents_csv, "reagents", &REAGENT_COLUMNS)?;
        let stocks = csv_rows(stocks_csv, "reagent_stocks", &STOCK_COLUMNS)?;
        Reagent::from_rows(&reagents, &stocks)
    }

    /// Builds reagents from rows of text in the column order of `REAGENT_COLUMNS` and
    /// `STOCK_COLUMNS` (CSV files and the store both give them so).
    pub fn from_rows(
        reagent_rows: &[Vec<String>],
        stock_rows: &[Vec<String>],
    ) -> Result<Vec<Reagent>> {
        let mut reagents = Vec::new();
        for (line, row) in reagent_rows.iter().enumerate() {
            reagents.push(reagent_from_row(row).map_err(|m| bad_table("reagents", line, &m))?);
        }
        for (line, row) in stock_rows.iter().enumerate() {
            let name = row[0].trim();
            let Some(reagent) = reagents.iter_mut().find(|r| r.name == name) else {
                return Err(bad_table(
                    "reagent_stocks",
                    line,
                    &format!("unknown reagent '{name}'"),
                ));
            };
            let offer =
                stock_from_row(reagent, row).map_err(|m| bad_table("reagent_stocks", line, &m))?;
            reagent.stocks.push(offer);
        }
        Ok(reagents)
    }

    /// The reagent called `name` (case-insensitive), or `Error::Input` listing those offered.
    pub fn find<'a>(reagents: &'a [Reagent], name: &str) -> Result<&'a Reagent> {
        let wanted = name.trim().to_ascii_lowercase();
        reagents.iter().find(|r| r.name == wanted).ok_or_else(|| {
            let names: Vec<&str> = reagents.iter().map(|r| r.name.as_str()).collect();
            Error::Input(format!(
                "unknown reagent '{name}'; offered: {}",
                names.join(", ")
            ))
        })
    }

    /// The offered stock matching `form`, or `Error::Input` listing the forms offered.
    pub fn offer(&self, form: &StockForm) -> Result<&StockOffer> {
        self.stocks
            .iter()
            .find(|s| s.form.same(form))
            .ok_or_else(|| {
                Error::Input(format!(
                    "{} is not offered as {}; offered: {}",
                    self.name,
                    form.label(),
                    self.offered_labels().join(", ")
                ))
            })
    }

    /// Labels of every offered stock, in table order.
    pub fn offered_labels(&self) -> Vec<String> {
        self.stocks.iter().map(StockOffer::label).collect()
    }

    /// Solubility in moles per litre of water (1 kg), where known: how much solid a layer
    /// of that volume takes up.
    pub fn solubility_mol_l(&self) -> Option<f64> {
        self.solubility_g_100g
            .map(|g| g * 10.0 / self.molar_mass_g_mol)
    }
}

fn bad_table(table: &str, line: usize, message: &str) -> Error {
    Error::Internal(format!("{table} row {}: {message}", line + 1))
}

/// The data rows of a CSV table whose header must be exactly `columns`.
fn csv_rows(text: &str, table: &str, columns: &[&str]) -> Result<Vec<Vec<String>>> {
    let mut reader = csv::ReaderBuilder::new()
        .comment(Some(b'#'))
        .from_reader(text.as_bytes());
    let header = reader
        .headers()
        .map_err(|e| bad_table(table, 0, &e.to_string()))?;
    if header.iter().ne(columns.iter().copied()) {
        return Err(Error::Internal(format!(
            "{table}.csv: columns must be {}",
            columns.join(",")
        )));
    }
    reader
        .records()
        .enumerate()
        .map(|(line, row)| {
            let row = row.map_err(|e| bad_table(table, line, &e.to_string()))?;
            Ok(row.iter().map(str::to_string).collect())
        })
        .collect()
}

fn number(row: &[String], i: usize, column: &str) -> std::result::Result<f64, String> {
    let text = row.get(i).map_or("", |s| s.trim());
    match text.parse::<f64>() {
        Ok(v) if v.is_finite() && v >= 0.0 => Ok(v),
        _ => Err(format!("{column} '{text}' is not a non-negative number")),
    }
}

fn optional_number(
    row: &[String],
    i: usize,
    column: &str,
) -> std::result::Result<Option<f64>, String> {
    if row.get(i).is_none_or(|s| s.trim().is_empty()) {
        Ok(None)
    } else {
        number(row, i, column).map(Some)
    }
}

/// A `;`-separated list of numbers; an empty entry is `None`.
fn number_list(text: &str, column: &str) -> std::result::Result<Vec<Option<f64>>, String> {
    text.split(';')
        .map(|part| {
            let part = part.trim();
            if part.is_empty() {
                return Ok(None);
            }
            match part.parse::<f64>() {
                Ok(v) if v.is_finite() => Ok(Some(v)),
                _ => Err(format!("{column}: '{part}' is not a number")),
            }
        })
        .collect()
}

/// The weak system of a reagent row, if its `system` column is filled.
fn system_from_row(row: &[String]) -> std::result::Result<Option<WeakSystem>, String> {
    let text = |i: usize| row.get(i).map_or("", |s| s.trim());
    if text(8).is_empty() {
        return Ok(None);
    }
    let top_charge: i32 = text(9)
        .parse()
        .map_err(|_| format!("top_charge '{}' is not a whole number", text(9)))?;
    let pkas = number_list(text(10), "pkas")?
        .into_iter()
        .collect::<Option<Vec<f64>>>()
        .ok_or("pkas: every step needs a value")?;
    if pkas.windows(2).any(|w| w[0] > w[1]) {
        return Err("pkas must be in ascending order".into());
    }
    let mut dh = if text(11).is_empty() {
        vec![None; pkas.len()]
    } else {
        number_list(text(11), "dh_kj_mol")?
    };
    if dh.len() != pkas.len() {
        return Err(format!(
            "dh_kj_mol has {} entries for {} pKa values",
            dh.len(),
            pkas.len()
        ));
    }
    dh.truncate(pkas.len());
    Ok(Some(WeakSystem {
        name: text(8).to_string(),
        top_charge,
        pkas,
        dh_kj_mol: dh,
    }))
}

/// One row in the order of `REAGENT_COLUMNS`.
fn reagent_from_row(row: &[String]) -> std::result::Result<Reagent, String> {
    if row.len() != REAGENT_COLUMNS.len() {
        return Err(format!("expected {} columns", REAGENT_COLUMNS.len()));
    }
    let text = |i: usize| row[i].trim().to_string();
    let role = match text(3).as_str() {
        "acid" => Role::Acid,
        "base" => Role::Base,
        other => return Err(format!("role '{other}' is neither acid nor base")),
    };
    let molar_mass = number(row, 2, "molar_mass_g_mol")?;
    if molar_mass == 0.0 {
        return Err("molar mass must be positive".into());
    }
    let mildness: u32 = text(4)
        .parse()
        .map_err(|_| format!("mildness '{}' is not a rank", text(4)))?;
    let source = text(14);
    if source.is_empty() {
        return Err("missing source".into());
    }
    Ok(Reagent {
        name: text(0).to_ascii_lowercase(),
        formula: text(1),
        molar_mass_g_mol: molar_mass,
        role,
        mildness,
        strong_cations: number(row, 5, "strong_cations")?,
        strong_anions: number(row, 6, "strong_anions")?,
        carbonate: number(row, 7, "carbonate")?,
        system: system_from_row(row)?,
        solubility_g_100g: optional_number(row, 12, "solubility_g_100g")?,
        hazards: text(13),
        source,
        stocks: Vec::new(),
    })
}

/// One row in the order of `STOCK_COLUMNS`. The molarity of a % w/w stock (or of a
/// saturated one with its mass fraction and density) is w/100 · density · 1000 / M; that of
/// a saturated one without them is the solubility per litre of water.
fn stock_from_row(reagent: &Reagent, row: &[String]) -> std::result::Result<StockOffer, String> {
    if row.len() != STOCK_COLUMNS.len() {
        return Err(format!("expected {} columns", STOCK_COLUMNS.len()));
    }
    let form = StockForm::parse(&row[1]).map_err(|e| e.to_string())?;
    let percent = optional_number(row, 3, "percent_w_w")?;
    let density = optional_number(row, 4, "density_g_ml")?;
    let source = row[5].trim().to_string();
    if source.is_empty() {
        return Err("missing source".into());
    }
    let by_weight = |p: f64, d: f64| p / 100.0 * d * 1000.0 / reagent.molar_mass_g_mol;
    let stock = match form {
        StockForm::Solid => Stock::Solid,
        StockForm::Molar(m) => Stock::Solution { molar: m },
        StockForm::PercentWw(p) => {
            let d = density.ok_or("a % w/w stock needs its density")?;
            Stock::Solution {
                molar: by_weight(p, d),
            }
        }
        StockForm::Saturated => Stock::Solution {
            molar: match (percent, density) {
                (Some(p), Some(d)) => by_weight(p, d),
                _ => reagent
                    .solubility_mol_l()
                    .ok_or("a saturated stock needs the reagent's solubility")?,
            },
        },
    };
    if let Stock::Solution { molar } = stock
        && molar <= 0.0
    {
        return Err("stock concentration must be positive".into());
    }
    Ok(StockOffer {
        form,
        stock,
        density_g_ml: density,
        source,
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn parses_stock_forms() {
        assert_eq!(StockForm::parse("solid").unwrap(), StockForm::Solid);
        assert_eq!(StockForm::parse("sat").unwrap(), StockForm::Saturated);
        assert_eq!(StockForm::parse("1M").unwrap(), StockForm::Molar(1.0));
        assert_eq!(StockForm::parse("0.1 M").unwrap(), StockForm::Molar(0.1));
        assert_eq!(StockForm::parse("37%").unwrap(), StockForm::PercentWw(37.0));
        assert_eq!(StockForm::parse("1mM").unwrap_err().position, 1);
        assert_eq!(StockForm::parse("liquid").unwrap_err().position, 0);
        assert_eq!(StockForm::parse("0M").unwrap_err().position, 0);
        assert_eq!(StockForm::parse("150%").unwrap_err().position, 0);
    }

    #[test]
    fn builtin_tables_load() {
        let all = Reagent::builtin().unwrap();
        for name in ["hcl", "naoh", "nahco3", "koh", "na2co3", "k2co3"] {
            let r = Reagent::find(&all, name).unwrap();
            assert!(!r.source.is_empty() && !r.stocks.is_empty(), "{name}");
        }
        let hcl = Reagent::find(&all, "HCl").unwrap();
        assert_eq!(hcl.role, Role::Acid);
        assert_eq!(hcl.strong_anions, 1.0);
        // IUPAC abridged atomic weights: H 1.0080 + Cl 35.45.
        assert!((hcl.molar_mass_g_mol - (1.0080 + 35.45)).abs() < 1e-9);
    }

    #[test]
    fn concentrated_stocks_get_their_molarity() {
        let all = Reagent::builtin().unwrap();
        let hcl = Reagent::find(&all, "hcl").unwrap();
        let conc = hcl.offer(&StockForm::PercentWw(37.0)).unwrap();
        // Concentrated HCl is about 12 M (common practice).
        match conc.stock {
            Stock::Solution { molar } => assert!((molar - 12.0).abs() < 0.2, "{molar}"),
            Stock::Solid => panic!("37% HCl is a solution"),
        }
        let naoh = Reagent::find(&all, "naoh").unwrap();
        // 50 % NaOH is about 19 M (common practice).
        match naoh.offer(&StockForm::PercentWw(50.0)).unwrap().stock {
            Stock::Solution { molar } => assert!((molar - 19.1).abs() < 0.3, "{molar}"),
            Stock::Solid => panic!("50% NaOH is a solution"),
        }
        let bicarb = Reagent::find(&all, "nahco3").unwrap();
        // Saturated bicarbonate is about 1 M (common practice).
        match bicarb.offer(&StockForm::Saturated).unwrap().stock {
            Stock::Solution { molar } => assert!((0.9..1.3).contains(&molar), "{molar}"),
            Stock::Solid => panic!("sat is a solution"),
        }
    }

    #[test]
    fn unknown_names_list_what_is_offered() {
        let all = Reagent::builtin().unwrap();
        match Reagent::find(&all, "hno3") {
            Err(Error::Input(m)) => assert!(m.contains("naoh") && m.contains("nahco3"), "{m}"),
            other => panic!("{other:?}"),
        }
        let hcl = Reagent::find(&all, "hcl").unwrap();
        match hcl.offer(&StockForm::Solid) {
            Err(Error::Input(m)) => assert!(m.contains("6M") && m.contains("37%"), "{m}"),
            other => panic!("{other:?}"),
        }
    }

    #[test]
    fn bad_tables_are_internal_errors() {
        let header = format!("{}\n", REAGENT_COLUMNS.join(","));
        let stocks = format!("{}\n", STOCK_COLUMNS.join(","));
        let row =
            |role: &str, source: &str| format!("{header}x,X,1,{role},1,0,1,0,,,,,,none,{source}\n");
        assert!(matches!(
            Reagent::load_all(&row("acid", ""), &stocks),
            Err(Error::Internal(_))
        ));
        assert!(matches!(
            Reagent::load_all(&row("salt", "s"), &stocks),
            Err(Error::Internal(_))
        ));
        let ok = row("acid", "s");
        let orphan = format!("{stocks}y,1M,1,,,s\n");
        assert!(matches!(
            Reagent::load_all(&ok, &orphan),
            Err(Error::Internal(_))
        ));
        let sat_without_solubility = format!("{stocks}x,sat,,,,s\n");
        assert!(Reagent::load_all(&ok, &sat_without_solubility).is_err());
        assert_eq!(Reagent::load_all(&ok, &stocks).unwrap().len(), 1);
        let descending = format!("{header}x,X,1,acid,1,0,0,0,w,0,5;3,,,none,s\n");
        assert!(Reagent::load_all(&descending, &stocks).is_err());
        assert!(Reagent::load_all("name,formula\nx,X\n", &stocks).is_err());
    }

    #[test]
    fn weak_reagents_carry_their_constants() {
        let all = Reagent::builtin().unwrap();
        let citric = Reagent::find(&all, "citric_acid").unwrap();
        let sys = citric.system.as_ref().unwrap();
        assert_eq!(sys.pkas.len(), 3);
        assert_eq!(sys.top_charge, 0);
        let nh4cl = Reagent::find(&all, "nh4cl").unwrap();
        assert_eq!(nh4cl.system.as_ref().unwrap().top_charge, 1);
        // Every reagent has a mildness rank, a hazard line and at least one stock.
        for r in &all {
            assert!(
                r.mildness >= 1 && !r.hazards.is_empty() && !r.stocks.is_empty(),
                "{}",
                r.name
            );
        }
    }
}
