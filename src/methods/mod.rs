//! The scalar methods, each a small [`ScalarMethod`](crate::driver::ScalarMethod) state
//! machine driven by [`crate::driver`].

pub mod auto;
pub mod bisection;
pub mod hybrid;
pub mod illinois;
pub mod secant;

use crate::driver::{Ask, Finish, MethodKind, Options, ScalarMethod, Start};
use crate::outcome::Status;

/// Builds the method state for a validated start.
pub(crate) fn build(kind: MethodKind, start: Start, _options: &Options) -> Box<dyn ScalarMethod> {
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
