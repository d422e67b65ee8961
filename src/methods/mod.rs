//! The scalar methods, each a small [`ScalarMethod`](crate::driver::ScalarMethod) state
//! machine driven by [`crate::driver`].

pub mod auto;
pub mod bisection;
pub mod hybrid;
pub mod illinois;
pub mod secant;

use crate::driver::{MethodKind, Options, ScalarMethod, Start};

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
