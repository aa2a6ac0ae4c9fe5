//! A bracketed, safeguarded Newton iteration for one decreasing function: it always returns.

use super::balance::Evaluation;

/// How the iteration ended.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Status {
    /// The residual vanished to rounding.
    Converged,
    /// The function is negative at the lower end: the root lies below the bracket.
    BelowBracket,
    /// The function is positive at the upper end: the root lies above the bracket.
    AboveBracket,
    /// The iteration limit was reached.
    IterationLimit,
}

/// The end point of an iteration.
#[derive(Debug, Clone, Copy)]
pub struct Outcome {
    /// The last iterate.
    pub x: f64,
    /// Iterations used.
    pub iterations: u32,
    /// How it ended.
    pub status: Status,
    /// Ionic strength of the last evaluated state.
    pub ionic_strength: f64,
    /// The evaluation at `x`, when `x` is the point last evaluated.
    pub at_x: Option<Evaluation>,
}

/// Finds the root of a decreasing function in [lo, hi] from a start point.
pub fn solve_bracketed(
    mut f: impl FnMut(f64) -> Evaluation,
    start: f64,
    lo: f64,
    hi: f64,
) -> Outcome {
    const MAX_ITER: u32 = 200;
    const REL_TOL: f64 = 1e-14;
    let (bottom, top) = (lo, hi);
    let (mut lo, mut hi) = (lo, hi);
    let mut x = if start.is_finite() {
        start.clamp(lo, hi)
    } else {
        0.5 * (lo + hi)
    };
    let mut checked_lo = false;
    let mut checked_hi = false;
    let mut ionic = 0.0;
    let done = |x: f64, iterations: u32, status: Status, ionic_strength: f64| Outcome {
        x,
        iterations,
        status,
        ionic_strength,
        at_x: None,
    };
    for iter in 1..=MAX_ITER {
        let e = f(x);
        ionic = e.ionic_strength;
        let r = e.residual;
        if !r.is_finite() {
            x = 0.5 * (lo + hi);
            continue;
        }
        if r.abs() <= REL_TOL * e.scale {
            return Outcome {
                at_x: Some(e),
                ..done(x, iter, Status::Converged, ionic)
            };
        }
        if r > 0.0 {
            lo = x;
        } else {
            hi = x;
        }
        // Newton step on a decreasing function; fall back to bisection outside the bracket.
        let step = if e.derivative < 0.0 {
            -r / e.derivative
        } else {
            f64::NAN
        };
        let mut next = x + step;
        if !next.is_finite() || next <= lo || next >= hi {
            // Check the ends once, so a root outside the bracket is reported rather than chased.
            if r < 0.0 && !checked_lo && lo <= bottom {
                checked_lo = true;
                let e_lo = f(bottom);
                if e_lo.residual < 0.0 {
                    return done(bottom, iter, Status::BelowBracket, e_lo.ionic_strength);
                }
            }
            if r > 0.0 && !checked_hi && hi >= top {
                checked_hi = true;
                let e_hi = f(top);
                if e_hi.residual > 0.0 {
                    return done(top, iter, Status::AboveBracket, e_hi.ionic_strength);
                }
            }
            next = 0.5 * (lo + hi);
        }
        if (next - x).abs() <= 1e-15 * (1.0 + x.abs()) || hi - lo <= 1e-15 * (1.0 + x.abs()) {
            return done(next, iter, Status::Converged, ionic);
        }
        x = next;
    }
    done(x, MAX_ITER, Status::IterationLimit, ionic)
}
