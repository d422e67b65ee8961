//! The scalar methods, each a small [`ScalarMethod`](crate::driver::ScalarMethod) state
//! machine driven by [`crate::driver`].

pub mod bisection;
pub mod secant;

use crate::driver::{MethodKind, Options, ScalarMethod, Start};

/// Builds the method state for a validated start.
pub(crate) fn build(kind: MethodKind, start: Start, _options: &Options) -> Box<dyn ScalarMethod> {
    let (a, b) = start.points();
    match kind {
        MethodKind::Secant => Box::new(secant::Secant::new(a, b)),
        // Placeholders until the bracketing hybrid, Illinois and the default land.
        MethodKind::Bisection | MethodKind::Hybrid | MethodKind::Illinois | MethodKind::Auto => {
            Box::new(bisection::Bisection::new(a, b))
        }
    }
}
