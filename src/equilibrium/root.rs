//! The one root of a monotone function inside a bracket, found to neighbouring doubles.
//!
//! Plain bisection needs about 60 halvings to reach neighbouring doubles; the nested solves
//! (pH inside ionic strength inside reagent amount) multiply that. Here each step takes the
//! secant point of the bracket (Illinois variant: the end that stays twice in a row has its
//! value halved, so neither end sticks), falls back to bisection whenever two steps have not
//! halved the bracket, and stops at the same place bisection does: two neighbouring doubles
//! with the sign change between them, or an exact zero. The bracket is never lost, so the
//! guarantees of bisection (always ends, always inside) stay.

use crate::error::Result;

/// Shrinks `[lo, hi]`, with `g(lo) < 0 <= g(hi)` given as `g_lo` and `g_hi`, until `stop`
/// accepts a point or no double lies between the ends. Returns the final bracket (both ends
/// equal when a point was accepted). `g` may fail; the error is passed on.
pub(crate) fn shrink(
    mut g: impl FnMut(f64) -> Result<f64>,
    (mut lo, mut g_lo): (f64, f64),
    (mut hi, mut g_hi): (f64, f64),
    stop: impl Fn(f64, f64) -> bool,
) -> Result<(f64, f64)> {
    // Which end moved last: -1 low, +1 high, 0 none yet.
    let mut moved = 0;
    let mut width_two_ago = hi - lo;
    let mut width_one_ago = hi - lo;
    for step in 0..400 {
        let mid = 0.5 * (lo + hi);
        if mid <= lo || mid >= hi {
            break;
        }
        let secant = lo - g_lo * (hi - lo) / (g_hi - g_lo);
        let slow = step >= 2 && hi - lo > 0.5 * width_two_ago;
        let x = if !slow && secant > lo && secant < hi {
            secant
        } else {
            mid
        };
        let gx = g(x)?;
        if gx.is_nan() {
            // Let the caller's own check report it at this point.
            return Ok((x, x));
        }
        if stop(x, gx) {
            return Ok((x, x));
        }
        width_two_ago = width_one_ago;
        if gx < 0.0 {
            lo = x;
            g_lo = gx;
            if moved == -1 {
                g_hi *= 0.5;
            }
            moved = -1;
        } else {
            hi = x;
            g_hi = gx;
            if moved == 1 {
                g_lo *= 0.5;
            }
            moved = 1;
        }
        width_one_ago = hi - lo;
    }
    Ok((lo, hi))
}

/// The next guess for a fixed point x = f(x) from two points `(x, f(x))`: the secant root of
/// f(x) - x through them (a few steps where plain iteration, x <- f(x), takes a dozen), or
/// plain iteration when the secant is flat, not finite or negative (an ionic strength is
/// never negative).
pub(crate) fn secant_fixed_point((x0, f0): (f64, f64), (x1, f1): (f64, f64)) -> f64 {
    let (g0, g1) = (f0 - x0, f1 - x1);
    let x = x1 - g1 * (x1 - x0) / (g1 - g0);
    if x.is_finite() && x >= 0.0 { x } else { f1 }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// The bracket bisection would end with: neighbouring doubles around the sign change.
    fn bisect(g: impl Fn(f64) -> f64, mut lo: f64, mut hi: f64) -> (f64, f64) {
        loop {
            let mid = 0.5 * (lo + hi);
            if mid <= lo || mid >= hi {
                return (lo, hi);
            }
            if g(mid) < 0.0 {
                lo = mid;
            } else {
                hi = mid;
            }
        }
    }

    #[test]
    fn ends_where_bisection_ends_in_far_fewer_steps() {
        // A charge balance shape: 10^-x minus a sigmoid, steep and flat by turns.
        let g =
            |x: f64| 1e-3 / (1.0 + 10f64.powf(4.76 - x)) + 10f64.powf(x - 14.0) - 10f64.powf(-x);
        let mut calls = 0;
        let (lo, hi) = shrink(
            |x| {
                calls += 1;
                Ok(g(x))
            },
            (-4.0, g(-4.0)),
            (20.0, g(20.0)),
            |_, gx| gx == 0.0,
        )
        .unwrap();
        assert_eq!((lo, hi), bisect(g, -4.0, 20.0));
        assert!(calls < 40, "{calls} evaluations");
    }

    #[test]
    fn an_exact_zero_stops_at_once() {
        let (lo, hi) = shrink(|x| Ok(x - 1.0), (0.0, -1.0), (2.0, 1.0), |_, gx| gx == 0.0).unwrap();
        assert_eq!((lo, hi), (1.0, 1.0));
    }
}
