//! Stopping tolerances, the evaluation budget and bounds on the unknown, in one place.

use crate::error::InputError;

/// When to stop.
///
/// A step or bracket is small enough when its length is at most
/// `x_abs + x_rel * |x|`; a residual is small enough when `|f(x)| <= f_abs`.
///
/// Defaults (documented in DEVELOPERS.md):
/// - `x_abs = 0`: purely relative, so tiny quantities (a diode's saturation current)
///   are solved to the same relative precision as large ones. A root at exactly zero
///   still ends, because bracketing methods stop when no float lies between the ends.
/// - `x_rel = 1e-12`.
/// - `f_abs = 0`: only an exact zero stops on the residual.
/// - `max_evals = 200`: the budget of function evaluations, initial ones included, and
///   at most [`MAX_EVALS`].
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Tolerances {
    pub x_abs: f64,
    pub x_rel: f64,
    pub f_abs: f64,
    pub max_evals: usize,
}

/// The largest budget accepted. A stepper keeps every told value for its saved record,
/// 16 bytes each, so the budget bounds its memory (16 MB at this limit); no root of one
/// unknown needs more (bisection of the widest double range takes about 2,100).
pub const MAX_EVALS: usize = 1_000_000;

impl Default for Tolerances {
    fn default() -> Self {
        Tolerances {
            x_abs: 0.0,
            x_rel: 1e-12,
            f_abs: 0.0,
            max_evals: 200,
        }
    }
}

impl Tolerances {
    /// The step tolerance at `x`.
    #[inline]
    pub fn x_tol(&self, x: f64) -> f64 {
        self.x_abs + self.x_rel * x.abs()
    }

    /// Rejects negative or NaN tolerances and a zero budget, naming the value.
    pub fn validate(&self) -> Result<(), InputError> {
        for (name, v) in [
            ("x_abs", self.x_abs),
            ("x_rel", self.x_rel),
            ("f_abs", self.f_abs),
        ] {
            if v.is_nan() || v < 0.0 || v.is_infinite() {
                return Err(InputError::new(
                    "bad-tolerance",
                    format!("tolerance {name} must be a finite number >= 0, got {v}"),
                ));
            }
        }
        if self.max_evals < 2 || self.max_evals > MAX_EVALS {
            return Err(InputError::new(
                "bad-tolerance",
                format!(
                    "max_evals must be between 2 and {MAX_EVALS}, got {}",
                    self.max_evals
                ),
            ));
        }
        Ok(())
    }
}

/// Physical bounds on the unknown: no method ever evaluates outside `[lo, hi]`.
/// Either end may be infinite.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Bounds {
    pub lo: f64,
    pub hi: f64,
}

impl Default for Bounds {
    fn default() -> Self {
        Bounds::UNBOUNDED
    }
}

impl Bounds {
    pub const UNBOUNDED: Bounds = Bounds {
        lo: f64::NEG_INFINITY,
        hi: f64::INFINITY,
    };

    /// Bounds `[lo, hi]`, rejecting NaN and reversed ends.
    pub fn new(lo: f64, hi: f64) -> Result<Bounds, InputError> {
        if lo.is_nan() || hi.is_nan() {
            return Err(InputError::new(
                "bad-bounds",
                format!("bounds must be numbers, got lower {lo}, upper {hi}"),
            ));
        }
        if lo > hi {
            return Err(InputError::new(
                "bad-bounds",
                format!("bounds are reversed: lower {lo} is above upper {hi}"),
            ));
        }
        Ok(Bounds { lo, hi })
    }

    #[inline]
    pub fn contains(&self, x: f64) -> bool {
        x >= self.lo && x <= self.hi
    }

    #[inline]
    pub fn clamp(&self, x: f64) -> f64 {
        x.max(self.lo).min(self.hi)
    }

    pub fn validate(&self) -> Result<(), InputError> {
        Bounds::new(self.lo, self.hi).map(|_| ())
    }
}
