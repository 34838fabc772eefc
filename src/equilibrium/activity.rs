//! Activity coefficients by the Davies equation,
//! log10 γ = -A z² (√I / (1 + √I) - 0.3 I),
//! with the Debye–Hückel A worked out at the layer's temperature from the permittivity and
//! density of water (see `water::Conditions::davies_a`). Ionic strength I = ½ Σ c z², mol/L.
//!
//! Davies is a good approximation up to about 0.5 M; above that the coefficients are held at
//! their 0.5 M values (the Davies curve turns upward there and would soon exceed 1) and the
//! report warns that the activities are rough.

/// The 0.3 of the Davies equation: C. W. Davies, *Ion Association* (Butterworths, 1962),
/// replacing the 0.2 of J. Chem. Soc. 1938, 2093.
const DAVIES_LINEAR: f64 = 0.3;

/// Ionic strength above which Davies is no longer trustworthy, mol/L: about 0.5 M (W. Stumm
/// and J. J. Morgan, *Aquatic Chemistry*, 3rd ed. 1996, table 3.3; from memory).
pub const DAVIES_LIMIT_M: f64 = 0.5;

/// Debye–Hückel constant for log10 γ in (mol/kg)^-1/2:
/// A = 1.82483e6 √ρ / (ε T)^{3/2}, ρ in g/mL, ε relative permittivity, T in K — the
/// combination of fundamental constants used by e.g. A. H. Truesdell and B. F. Jones,
/// J. Res. U.S. Geol. Surv. 2 (1974) 233 (from memory).
pub fn debye_huckel_a(temperature_k: f64, permittivity: f64, density_g_ml: f64) -> f64 {
    1.82483e6 * density_g_ml.sqrt() / (permittivity * temperature_k).powf(1.5)
}

/// The activity model at one set of conditions.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Gammas {
    /// Every γ = 1.
    Ideal,
    /// Davies with this A and ionic strength (mol/L).
    Davies { a: f64, ionic_strength: f64 },
}

impl Gammas {
    /// log10 γ of an ion of charge `z`.
    pub fn log10_gamma(&self, z: i32) -> f64 {
        match *self {
            Gammas::Ideal => 0.0,
            Gammas::Davies { a, ionic_strength } => {
                let i = ionic_strength.clamp(0.0, DAVIES_LIMIT_M);
                let s = i.sqrt();
                -a * (z * z) as f64 * (s / (1.0 + s) - DAVIES_LINEAR * i)
            }
        }
    }

    /// γ of an ion of charge `z`.
    pub fn gamma(&self, z: i32) -> f64 {
        10f64.powf(self.log10_gamma(z))
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn davies_limits() {
        let g = Gammas::Davies {
            a: 0.51,
            ionic_strength: 0.0,
        };
        assert_eq!(g.log10_gamma(2), 0.0);
        assert_eq!(Gammas::Ideal.gamma(3), 1.0);
        // Charge enters squared: log γ(2) = 4 log γ(1).
        let g = Gammas::Davies {
            a: 0.51,
            ionic_strength: 0.05,
        };
        assert!((g.log10_gamma(2) - 4.0 * g.log10_gamma(-1)).abs() < 1e-15);
        assert_eq!(g.log10_gamma(0), 0.0);
        // Held at the 0.5 M value beyond it.
        let at = |i: f64| {
            Gammas::Davies {
                a: 0.51,
                ionic_strength: i,
            }
            .gamma(1)
        };
        assert_eq!(at(0.5), at(3.0));
        assert!(at(0.5) < at(0.01) && at(0.01) < 1.0);
    }
}
