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
}

/// Finds the root of a decreasing function in [lo, hi] from a start point.
pub fn solve_bracketed(f: impl Fn(f64) -> Evaluation, start: f64, lo: f64, hi: f64) -> Outcome {
    const MAX_ITER: u32 = 200;
    const REL_TOL: f64 = 1e-14;
    let (mut lo, mut hi) = (lo, hi);
    let mut x = if start.is_finite() {
        start.clamp(lo, hi)
    } else {
        0.5 * (lo + hi)
    };
    let mut checked_lo = false;
    let mut checked_hi = false;
    for iter in 1..=MAX_ITER {
        let e = f(x);
        let r = e.residual;
        if !r.is_finite() {
            x = 0.5 * (lo + hi);
            continue;
        }
        if r.abs() <= REL_TOL * e.scale {
            return Outcome {
                x,
                iterations: iter,
                status: Status::Converged,
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
            if r < 0.0 && !checked_lo && lo <= super::PH_MIN {
                checked_lo = true;
                if f(lo).residual < 0.0 {
                    return Outcome {
                        x: lo,
                        iterations: iter,
                        status: Status::BelowBracket,
                    };
                }
            }
            if r > 0.0 && !checked_hi && hi >= super::PH_MAX {
                checked_hi = true;
                if f(hi).residual > 0.0 {
                    return Outcome {
                        x: hi,
                        iterations: iter,
                        status: Status::AboveBracket,
                    };
                }
            }
            next = 0.5 * (lo + hi);
        }
        if (next - x).abs() <= 1e-15 * (1.0 + x.abs()) || hi - lo <= 1e-15 * (1.0 + x.abs()) {
            return Outcome {
                x: next,
                iterations: iter,
                status: Status::Converged,
            };
        }
        x = next;
    }
    Outcome {
        x,
        iterations: MAX_ITER,
        status: Status::IterationLimit,
    }
}
