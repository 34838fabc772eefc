//! Substituent constants and linear free-energy series, as compiled from
//! `data/substituents.csv` and `data/series.csv`: Hammett sigma (meta, para, para-minus, ortho)
//! and Taft sigma* per substituent, and per series its rho, base value and the rules it follows.

use crate::chem::smarts::Pattern;
use crate::error::{Error, Result};

/// Where a substituent row's anchor atom sits relative to the atom being corrected.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Position {
    /// Bonded to the ring or chain atom (chloro, nitro, methyl ...).
    Attached,
    /// A ring member itself (an aza nitrogen in place of a ring C-H).
    Ring,
}

/// One compiled substituent row.
#[derive(Debug, Clone)]
pub struct Substituent {
    pub name: String,
    pub pattern: Pattern,
    pub position: Position,
    pub sigma_m: Option<f64>,
    pub sigma_p: Option<f64>,
    pub sigma_minus: Option<f64>,
    pub sigma_o: Option<f64>,
    /// Taft sigma*; `None` on a saturated carbon means "follow the chain".
    pub sigma_star: Option<f64>,
    /// Ortho constant next to a ring aza site (2-substituted pyridinium ions); `None` means
    /// `sigma_o` serves.
    pub sigma_o_aza: Option<f64>,
    /// sigma* as an ammonium ion feels it, where the acid-derived one falls short; `None`
    /// means `sigma_star` serves.
    pub sigma_star_ammonium: Option<f64>,
    /// Para constant at a pyridine-type ring N site (4-substituted pyridinium ions) where
    /// `sigma_p` falls short; `None` means `sigma_p` serves.
    pub sigma_p_aza: Option<f64>,
    pub source: String,
}

/// Standard deviation of a series without its own: Perrin, Dempsey & Serjeant 1981 find most
/// Hammett and Taft pKa equations good to 0.2-0.4 (from memory).
pub const DEFAULT_SD: f64 = 0.4;

/// Which substituent constant a series takes.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Constant {
    Hammett,
    /// Hammett constants on a five-membered heteroaromatic ring that holds the site: every
    /// other ring member and its substituents count with sigma_m (no para position exists).
    HammettFive,
    Taft,
}

/// Which constant a para substituent takes.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Para {
    /// sigma_p.
    Sigma,
    /// sigma-minus where the row has one (the site's charge conjugates with the ring: a
    /// phenoxide or thiophenoxide); a donor's sigma-minus is what it does to such an anion.
    Minus,
    /// sigma-minus for acceptors, sigma_p for donors (a neutral site whose lone pair
    /// conjugates with the ring, as in anilines: a para donor there acts with its full
    /// sigma_p, p-anisidine 5.34 and p-toluidine 5.08 against aniline 4.60, rho 2.89, give
    /// -0.26 and -0.17; Perrin 1965, from memory).
    MinusForAcceptors,
}

/// One compiled series row.
#[derive(Debug, Clone)]
pub struct Series {
    pub name: String,
    pub constant: Constant,
    pub rho: f64,
    /// pKa at zero sigma sum.
    pub base: f64,
    /// Which constant para substituents take.
    pub para: Para,
    /// Extra pKa change per ortho substituent, beyond its sigma_o.
    pub ortho_shift: f64,
    /// Factor per intervening saturated carbon (Taft series).
    pub attenuation: f64,
    /// Standard deviation of the series' equation, pK units.
    pub sd: f64,
    /// Lowest sum of the donating (negative) sigma* terms (Taft series of ammonium ions:
    /// alkyl groups stop raising the pKa beyond a plateau, beside withdrawing groups too).
    pub sigma_floor: Option<f64>,
    /// A Taft series for the groups on the site atom besides its ring (Hammett series only):
    /// the N-alkyl groups of N-alkylanilinium ions.
    pub side: Option<String>,
    pub source: String,
}

/// A stored substituent row, before compiling.
#[derive(Debug, Clone, serde::Deserialize)]
pub struct SubstituentRow {
    pub name: String,
    pub smarts: String,
    pub position: String,
    pub sigma_m: Option<f64>,
    pub sigma_p: Option<f64>,
    pub sigma_minus: Option<f64>,
    pub sigma_o: Option<f64>,
    pub sigma_star: Option<f64>,
    pub source: String,
    #[serde(default)]
    pub sigma_o_aza: Option<f64>,
    #[serde(default)]
    pub sigma_star_ammonium: Option<f64>,
    #[serde(default)]
    pub sigma_p_aza: Option<f64>,
}

/// A stored series row, before compiling.
#[derive(Debug, Clone, serde::Deserialize)]
pub struct SeriesRow {
    pub name: String,
    pub constant: String,
    pub rho: f64,
    pub base: f64,
    pub para: Option<String>,
    pub ortho_shift: Option<f64>,
    pub attenuation: Option<f64>,
    pub source: String,
    /// Standard deviation of the equation (pK units); missing means `DEFAULT_SD`.
    #[serde(default)]
    pub sd: Option<f64>,
    /// Lowest sum of sigma* (Taft series only); missing means none.
    #[serde(default)]
    pub sigma_floor: Option<f64>,
    /// Taft series for the site atom's other groups (Hammett series only); missing means none.
    #[serde(default)]
    pub side: Option<String>,
}

impl SubstituentRow {
    /// Compiles the SMARTS and checks the row; a bad built-in row is an internal error.
    pub fn compile(self) -> Result<Substituent> {
        let bad = |why: String| Error::Internal(format!("substituent '{}': {why}", self.name));
        let pattern = Pattern::parse(&self.smarts).map_err(|e| bad(e.to_string()))?;
        let position = match self.position.as_str() {
            "attached" => Position::Attached,
            "ring" => Position::Ring,
            other => return Err(bad(format!("unknown position '{other}'"))),
        };
        if self.sigma_m.is_none() || self.sigma_p.is_none() {
            return Err(bad("sigma_m and sigma_p are required".into()));
        }
        Ok(Substituent {
            name: self.name,
            pattern,
            position,
            sigma_m: self.sigma_m,
            sigma_p: self.sigma_p,
            sigma_minus: self.sigma_minus,
            sigma_o: self.sigma_o,
            sigma_star: self.sigma_star,
            sigma_o_aza: self.sigma_o_aza,
            sigma_star_ammonium: self.sigma_star_ammonium,
            sigma_p_aza: self.sigma_p_aza,
            source: self.source,
        })
    }
}

impl SeriesRow {
    /// Checks the row; a bad built-in row is an internal error.
    pub fn compile(self) -> Result<Series> {
        let bad = |why: String| Error::Internal(format!("series '{}': {why}", self.name));
        let constant = match self.constant.as_str() {
            "hammett" => Constant::Hammett,
            "taft" => Constant::Taft,
            other => return Err(bad(format!("unknown constant '{other}'"))),
        };
        let mut constant = constant;
        let para = match self.para.as_deref() {
            None | Some("") | Some("sigma_p") => Para::Sigma,
            Some("sigma_minus") => Para::Minus,
            Some("sigma_minus_acceptors") => Para::MinusForAcceptors,
            Some("five_ring") if constant == Constant::Hammett => {
                constant = Constant::HammettFive;
                Para::Sigma
            }
            Some(other) => return Err(bad(format!("unknown para constant '{other}'"))),
        };
        let attenuation = match (constant, self.attenuation) {
            (Constant::Taft, Some(a)) if a > 0.0 && a < 1.0 => a,
            (Constant::Taft, _) => {
                return Err(bad("a taft series needs 0 < attenuation < 1".into()));
            }
            (_, a) => a.unwrap_or(0.0),
        };
        if self.sigma_floor.is_some() && constant != Constant::Taft {
            return Err(bad("sigma_floor belongs to taft series only".into()));
        }
        let side = self.side.filter(|name| !name.is_empty());
        if side.is_some() && constant != Constant::Hammett {
            return Err(bad("side belongs to hammett series only".into()));
        }
        let sd = match self.sd {
            Some(sd) if sd.is_finite() && sd >= 0.0 => sd,
            Some(sd) => return Err(bad(format!("sd {sd} must be finite and >= 0"))),
            None => DEFAULT_SD,
        };
        Ok(Series {
            name: self.name,
            constant,
            rho: self.rho,
            base: self.base,
            para,
            ortho_shift: self.ortho_shift.unwrap_or(0.0),
            attenuation,
            sd,
            sigma_floor: self.sigma_floor,
            side,
            source: self.source,
        })
    }
}

impl Substituent {
    /// The Hammett constant for a ring distance (1 ortho, 2 meta, 3 para) and whether it is a
    /// stand-in (sigma_p for a missing sigma_o). `ring_n_site`: the site is a pyridine-type
    /// ring N itself (not a lactam N-H), where an ortho group takes `sigma_o_aza` and a para
    /// group `sigma_p_aza` when it has one.
    pub fn sigma_at(&self, distance: usize, para: Para, ring_n_site: bool) -> (f64, bool) {
        let para = || {
            let donor = self.sigma_p.is_some_and(|p| p < 0.0);
            match para {
                Para::Minus => self.sigma_minus.or(self.sigma_p),
                Para::MinusForAcceptors if !donor => self.sigma_minus.or(self.sigma_p),
                _ => self.sigma_p,
            }
            .unwrap_or(0.0)
        };
        match distance {
            1 if ring_n_site && self.sigma_o_aza.is_some() => {
                (self.sigma_o_aza.unwrap_or(0.0), false)
            }
            1 => match self.sigma_o {
                Some(s) => (s, false),
                None => (para(), true),
            },
            2 => (self.sigma_m.unwrap_or(0.0), false),
            _ if ring_n_site && self.sigma_p_aza.is_some() => {
                (self.sigma_p_aza.unwrap_or(0.0), false)
            }
            _ => (para(), false),
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn row(position: &str) -> SubstituentRow {
        SubstituentRow {
            name: "nitro".into(),
            smarts: "[N+](=O)[O-]".into(),
            position: position.into(),
            sigma_m: Some(0.71),
            sigma_p: Some(0.78),
            sigma_minus: Some(1.27),
            sigma_o: None,
            sigma_star: Some(4.0),
            source: "test row".into(),
            sigma_o_aza: None,
            sigma_star_ammonium: None,
            sigma_p_aza: None,
        }
    }

    #[test]
    fn sigma_minus_is_used_only_where_the_series_asks() {
        let s = row("attached").compile().unwrap();
        assert_eq!(s.sigma_at(3, Para::Minus, false), (1.27, false));
        assert_eq!(s.sigma_at(3, Para::MinusForAcceptors, false), (1.27, false));
        assert_eq!(s.sigma_at(3, Para::Sigma, false), (0.78, false));
        assert_eq!(s.sigma_at(2, Para::Minus, false), (0.71, false));
        // No sigma_o: the para value stands in and says so.
        assert_eq!(s.sigma_at(1, Para::Sigma, false), (0.78, true));
        // A donor keeps sigma_p where only acceptors take sigma-minus.
        let mut donor = row("attached");
        (donor.sigma_p, donor.sigma_minus) = (Some(-0.27), Some(-0.10));
        let d = donor.compile().unwrap();
        assert_eq!(d.sigma_at(3, Para::Minus, false), (-0.10, false));
        assert_eq!(
            d.sigma_at(3, Para::MinusForAcceptors, false),
            (-0.27, false)
        );
    }

    #[test]
    fn bad_rows_are_internal_errors() {
        assert!(row("sideways").compile().is_err());
        let mut r = row("ring");
        r.smarts = "[N+](".into();
        assert!(r.compile().is_err());
    }
}
