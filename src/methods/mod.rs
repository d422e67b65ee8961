//! The scalar methods, each a small [`ScalarMethod`] state machine run by
//! [`crate::driver`]. This module owns the choice of method ([`MethodKind`]), the start
//! ([`Start`]), the options ([`Options`]) and construction ([`build`]); the driver only
//! knows the trait.

pub mod auto;
pub mod bisection;
pub mod bracket;
pub mod hybrid;
pub mod illinois;
pub mod secant;

use crate::driver::{Ask, Finish, ScalarMethod, Settings};
use crate::error::{require_finite, InputError};
use crate::outcome::Status;
use crate::tolerances::{Bounds, Tolerances};

/// The methods a caller can choose.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub enum MethodKind {
    /// The default: secant steps while they make progress, the bracketing hybrid once a
    /// sign change is seen, an outward bracket search when none is.
    Auto,
    /// The classic secant method, exactly as in the textbooks.
    Secant,
    /// The bracketing hybrid that cannot diverge and never needs more than bisection's
    /// count plus [`hybrid::SLACK`] + 1 evaluations; needs a sign change.
    Hybrid,
    Bisection,
    /// Illinois false position.
    Illinois,
}

impl MethodKind {
    pub const ALL: [MethodKind; 5] = [
        MethodKind::Auto,
        MethodKind::Secant,
        MethodKind::Hybrid,
        MethodKind::Bisection,
        MethodKind::Illinois,
    ];

    pub fn code(self) -> &'static str {
        match self {
            MethodKind::Auto => "auto",
            MethodKind::Secant => "secant",
            MethodKind::Hybrid => "hybrid",
            MethodKind::Bisection => "bisection",
            MethodKind::Illinois => "illinois",
        }
    }

    pub fn from_code(code: &str) -> Result<MethodKind, InputError> {
        MethodKind::ALL
            .into_iter()
            .find(|m| m.code() == code)
            .ok_or_else(|| {
                InputError::new(
                    "unknown-method",
                    format!(
                        "unknown method \"{code}\"; choose one of auto, secant, hybrid, bisection, illinois"
                    ),
                )
            })
    }
}

/// Where a solve starts: two guesses (no sign change needed) or a bracket.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Start {
    Guesses(f64, f64),
    Bracket(f64, f64),
}

impl Start {
    pub fn points(self) -> (f64, f64) {
        match self {
            Start::Guesses(a, b) | Start::Bracket(a, b) => (a, b),
        }
    }
}

/// Everything that configures a scalar solve besides f.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Options {
    pub method: MethodKind,
    pub tol: Tolerances,
    pub bounds: Bounds,
    /// Keep one [`crate::HistoryRow`] per evaluation (bounded). Off by default; costs
    /// nothing when off.
    pub record_history: bool,
}

impl Default for Options {
    fn default() -> Self {
        Options {
            method: MethodKind::Auto,
            tol: Tolerances::default(),
            bounds: Bounds::UNBOUNDED,
            record_history: false,
        }
    }
}

impl Options {
    pub fn with_history(mut self) -> Self {
        self.record_history = true;
        self
    }

    /// The driver's settings for these options.
    pub fn settings(&self, keep_told: bool) -> Settings {
        Settings {
            tol: self.tol,
            bounds: self.bounds,
            record_history: self.record_history,
            keep_told,
        }
    }
}

/// Checks the set-up and names the first bad value.
pub fn validate(start: Start, options: &Options) -> Result<(), InputError> {
    options.tol.validate()?;
    options.bounds.validate()?;
    let (a, b) = start.points();
    let (wa, wb) = match start {
        Start::Guesses(..) => ("first guess", "second guess"),
        Start::Bracket(..) => ("bracket lower end", "bracket upper end"),
    };
    require_finite(a, wa)?;
    require_finite(b, wb)?;
    if a == b {
        return Err(InputError::new(
            "equal-guesses",
            format!("the two starting points must differ, but {wa} and {wb} are both {a}"),
        ));
    }
    for (w, v) in [(wa, a), (wb, b)] {
        if !options.bounds.contains(v) {
            return Err(InputError::new(
                "start-outside-bounds",
                format!(
                    "{w} {v} lies outside the bounds [{}, {}] of the unknown",
                    options.bounds.lo, options.bounds.hi
                ),
            ));
        }
    }
    Ok(())
}

/// Builds the method state for a validated start.
pub fn build(kind: MethodKind, start: Start) -> Box<dyn ScalarMethod> {
    let (a, b) = start.points();
    match kind {
        MethodKind::Secant => Box::new(secant::Secant::new(a, b)),
        MethodKind::Hybrid => Box::new(hybrid::Hybrid::new(a, b)),
        MethodKind::Illinois => Box::new(illinois::Illinois::new(a, b)),
        MethodKind::Bisection => Box::new(bisection::Bisection::new(a, b)),
        MethodKind::Auto => Box::new(auto::Auto::new(a, b, matches!(start, Start::Bracket(..)))),
    }
}

/// Of two evaluated points, the one with the smaller |f|.
pub(crate) fn better(a: (f64, f64), b: (f64, f64)) -> (f64, f64) {
    if a.1.abs() <= b.1.abs() {
        a
    } else {
        b
    }
}

/// The checks every bracketing method makes once both ends are evaluated: an exact zero
/// at an end, a NaN at an end, or ends of one sign finish the solve. `None` means the
/// ends bracket a sign change (an infinite value has a sign, so it may bracket).
pub(crate) fn check_bracket_ends(a: (f64, f64), b: (f64, f64)) -> Option<Ask> {
    for (x, fx) in [a, b] {
        if fx == 0.0 {
            return Some(Finish::at(Status::ExactZero, x, fx));
        }
    }
    if a.1.is_nan() || b.1.is_nan() {
        let (x, fx) = if a.1.is_nan() { b } else { a };
        return Some(Finish::at(Status::NonFinite, x, fx));
    }
    if a.1.signum() == b.1.signum() {
        let (x, fx) = better(a, b);
        return Some(Finish::at(Status::NoSignChange, x, fx));
    }
    None
}

/// Whether two values have opposite signs by their sign bits (either may be infinite or
/// a signed zero, neither NaN).
pub(crate) fn opposite(fa: f64, fb: f64) -> bool {
    !fa.is_nan() && !fb.is_nan() && fa.is_sign_negative() != fb.is_sign_negative()
}
