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

/// A reagent and the forms it is offered in.
#[derive(Debug, Clone, PartialEq)]
pub struct Reagent {
    /// Short lowercase name used on the command line (`naoh`).
    pub name: String,
    pub formula: String,
    pub molar_mass_g_mol: f64,
    pub role: Role,
    /// Per formula unit: moles of strong positive charge (Na+, K+) it brings.
    pub strong_cations: f64,
    /// Per formula unit: moles of strong negative charge (Cl-).
    pub strong_anions: f64,
    /// Per formula unit: moles of carbonate carbon.
    pub carbonate: f64,
    /// Solubility in water at 20-25 °C, g/L; `None` for a gas or where unknown.
    pub solubility_g_l: Option<f64>,
    pub source: String,
    pub stocks: Vec<StockOffer>,
}

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
    /// `data/reagent_stocks.csv` for the columns).
    pub fn load_all(reagents_csv: &str, stocks_csv: &str) -> Result<Vec<Reagent>> {
        let mut reagents = Vec::new();
        for (line, row) in csv::Reader::from_reader(reagents_csv.as_bytes())
            .records()
            .enumerate()
        {
            let row = row.map_err(|e| bad_table("reagents", line, &e.to_string()))?;
            reagents.push(reagent_from_row(&row).map_err(|m| bad_table("reagents", line, &m))?);
        }
        for (line, row) in csv::Reader::from_reader(stocks_csv.as_bytes())
            .records()
            .enumerate()
        {
            let row = row.map_err(|e| bad_table("reagent_stocks", line, &e.to_string()))?;
            let name = row.get(0).unwrap_or("");
            let Some(reagent) = reagents.iter_mut().find(|r| r.name == name) else {
                return Err(bad_table(
                    "reagent_stocks",
                    line,
                    &format!("unknown reagent '{name}'"),
                ));
            };
            let offer =
                stock_from_row(reagent, &row).map_err(|m| bad_table("reagent_stocks", line, &m))?;
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

    /// Solubility in mol/L, where known.
    pub fn solubility_mol_l(&self) -> Option<f64> {
        self.solubility_g_l.map(|g| g / self.molar_mass_g_mol)
    }
}

fn bad_table(table: &str, line: usize, message: &str) -> Error {
    // Header is line 1, so data record i sits on line i + 2.
    Error::Internal(format!("{table}.csv line {}: {message}", line + 2))
}

fn number(row: &csv::StringRecord, i: usize, column: &str) -> std::result::Result<f64, String> {
    let text = row.get(i).unwrap_or("").trim();
    match text.parse::<f64>() {
        Ok(v) if v.is_finite() && v >= 0.0 => Ok(v),
        _ => Err(format!("{column} '{text}' is not a non-negative number")),
    }
}

fn optional_number(
    row: &csv::StringRecord,
    i: usize,
    column: &str,
) -> std::result::Result<Option<f64>, String> {
    if row.get(i).unwrap_or("").trim().is_empty() {
        Ok(None)
    } else {
        number(row, i, column).map(Some)
    }
}

/// Columns: name, formula, molar_mass_g_mol, role, strong_cations, strong_anions, carbonate,
/// solubility_g_l, source.
fn reagent_from_row(row: &csv::StringRecord) -> std::result::Result<Reagent, String> {
    let text = |i: usize| row.get(i).unwrap_or("").trim().to_string();
    let role = match text(3).as_str() {
        "acid" => Role::Acid,
        "base" => Role::Base,
        other => return Err(format!("role '{other}' is neither acid nor base")),
    };
    let molar_mass = number(row, 2, "molar_mass_g_mol")?;
    if molar_mass == 0.0 {
        return Err("molar mass must be positive".into());
    }
    let source = text(8);
    if source.is_empty() {
        return Err("missing source".into());
    }
    Ok(Reagent {
        name: text(0).to_ascii_lowercase(),
        formula: text(1),
        molar_mass_g_mol: molar_mass,
        role,
        strong_cations: number(row, 4, "strong_cations")?,
        strong_anions: number(row, 5, "strong_anions")?,
        carbonate: number(row, 6, "carbonate")?,
        solubility_g_l: optional_number(row, 7, "solubility_g_l")?,
        source,
        stocks: Vec::new(),
    })
}

/// Columns: reagent, form, molar, percent_w_w, density_g_ml, source. The molarity of a % w/w
/// stock is w/100 · density · 1000 / M; that of a saturated one is solubility / M.
fn stock_from_row(
    reagent: &Reagent,
    row: &csv::StringRecord,
) -> std::result::Result<StockOffer, String> {
    let form_text = row.get(1).unwrap_or("");
    let form = StockForm::parse(form_text).map_err(|e| e.to_string())?;
    let density = optional_number(row, 4, "density_g_ml")?;
    let source = row.get(5).unwrap_or("").trim().to_string();
    if source.is_empty() {
        return Err("missing source".into());
    }
    let stock = match form {
        StockForm::Solid => Stock::Solid,
        StockForm::Molar(m) => Stock::Solution { molar: m },
        StockForm::PercentWw(p) => {
            let d = density.ok_or("a % w/w stock needs its density")?;
            Stock::Solution {
                molar: p / 100.0 * d * 1000.0 / reagent.molar_mass_g_mol,
            }
        }
        StockForm::Saturated => Stock::Solution {
            molar: reagent
                .solubility_mol_l()
                .ok_or("a saturated stock needs the reagent's solubility")?,
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
        match Reagent::find(&all, "h2so4") {
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
        let header = "name,formula,molar_mass_g_mol,role,strong_cations,strong_anions,carbonate,solubility_g_l,source\n";
        let stocks = "reagent,form,molar,percent_w_w,density_g_ml,source\n";
        let no_source = format!("{header}x,X,1,acid,0,1,0,,\n");
        assert!(matches!(
            Reagent::load_all(&no_source, stocks),
            Err(Error::Internal(_))
        ));
        let bad_role = format!("{header}x,X,1,salt,0,1,0,,s\n");
        assert!(matches!(
            Reagent::load_all(&bad_role, stocks),
            Err(Error::Internal(_))
        ));
        let ok = format!("{header}x,X,1,acid,0,1,0,,s\n");
        let orphan = format!("{stocks}y,1M,1,,,s\n");
        assert!(matches!(
            Reagent::load_all(&ok, &orphan),
            Err(Error::Internal(_))
        ));
        let sat_without_solubility = format!("{stocks}x,sat,,,,s\n");
        assert!(Reagent::load_all(&ok, &sat_without_solubility).is_err());
        assert_eq!(Reagent::load_all(&ok, stocks).unwrap().len(), 1);
    }
}
