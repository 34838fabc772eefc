//! A row of the group table: a SMARTS pattern, which pattern atom is the site, whether it is
//! an acid or a base, and the handbook pKa with its range and source.

use serde::Serialize;

use crate::chem::smarts::Pattern;
use crate::error::{Error, Result};

/// Acid: the neutral form gives up a proton; base: the neutral form takes one. Either way the
/// pKa is that of the conjugate acid of the pair.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
#[serde(rename_all = "lowercase")]
pub enum Kind {
    Acid,
    Base,
}

impl Kind {
    pub fn as_str(self) -> &'static str {
        match self {
            Kind::Acid => "acid",
            Kind::Base => "base",
        }
    }
}

/// A `none` row's constant must lie below this (a very weak base) ...
pub const NEUTRAL_BELOW: f64 = 1.0;
/// ... or above this (a very weak acid): between them the group would titrate in a workup
/// (pH 1-13; common practice) and belongs in an acid or base row.
pub const NEUTRAL_ABOVE: f64 = 13.0;

/// One compiled group row.
#[derive(Debug, Clone)]
pub struct Group {
    pub name: String,
    pub smarts: String,
    pub pattern: Pattern,
    /// Index of the pattern atom that is the site.
    pub site: usize,
    /// `None` for groups that are recognized but never titrate in water (amides, alcohols...).
    pub kind: Option<Kind>,
    /// For such a group with a known constant, which way it goes beyond water's range: a
    /// constant below `NEUTRAL_BELOW` is a base's (the group takes a proton only in strong
    /// acid: ketones, amide O), one above `NEUTRAL_ABOVE` an acid's (it loses one only in strong
    /// base: alcohols, amide N-H). Such groups are listed beside the sites, never as sites.
    pub beyond_water: Option<Kind>,
    pub pka: f64,
    pub pka_low: f64,
    pub pka_high: f64,
    pub source: String,
    /// The linear free-energy series (`data/series.csv`) that corrects this group's value.
    pub series: Option<String>,
    /// SMILES of the compound whose value `pka` is; corrections are taken against it.
    pub parent: Option<String>,
}

impl Group {
    /// Builds and checks a row as stored; a bad built-in row is an internal error.
    #[allow(clippy::too_many_arguments)]
    pub fn new(
        name: String,
        smarts: &str,
        site: i64,
        kind: &str,
        pka: Option<f64>,
        low: Option<f64>,
        high: Option<f64>,
        source: String,
    ) -> Result<Group> {
        let bad = |why: String| Error::Internal(format!("group '{name}': {why}"));
        let pattern = Pattern::parse(smarts).map_err(|e| bad(e.to_string()))?;
        let site = usize::try_from(site)
            .ok()
            .filter(|&s| s < pattern.atom_count())
            .ok_or_else(|| bad(format!("site {site} is not an atom of the pattern")))?;
        let kind = match kind {
            "acid" => Some(Kind::Acid),
            "base" => Some(Kind::Base),
            "none" => None,
            other => return Err(bad(format!("unknown kind '{other}'"))),
        };
        let (pka, pka_low, pka_high) = match (kind, pka, low, high) {
            (None, None, None, None) => (f64::NAN, f64::NAN, f64::NAN),
            (_, Some(p), Some(l), Some(h)) if l <= p && p <= h => (p, l, h),
            _ => {
                return Err(bad(
                    "a row with a constant needs pka_low <= pka <= pka_high".into(),
                ));
            }
        };
        let beyond_water = match kind {
            Some(_) => None,
            None if pka < NEUTRAL_BELOW => Some(Kind::Base),
            None if pka > NEUTRAL_ABOVE => Some(Kind::Acid),
            None if pka.is_nan() => None,
            None => {
                return Err(bad(format!(
                    "a none row's constant must lie below {NEUTRAL_BELOW} or above \
                     {NEUTRAL_ABOVE}; {pka} titrates in water"
                )));
            }
        };
        Ok(Group {
            name: name.clone(),
            smarts: smarts.to_string(),
            pattern,
            site,
            kind,
            beyond_water,
            pka,
            pka_low,
            pka_high,
            source,
            series: None,
            parent: None,
        })
    }
}
