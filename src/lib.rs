//! tacit: an offline solver for implicit design equations.
//!
//! The core is pure Rust with no JavaScript types and no I/O:
//! - [`driver`]: the one driver loop ([`solve`], the ask–tell [`Stepper`]);
//! - [`methods`]: the scalar methods as small state machines;
//! - [`outcome`]: the result type and honest statuses;
//! - [`tolerances`]: tolerances, budget and bounds.
//!
//! The wasm32 binding layer lives in `bindings` and is compiled only for wasm32.

pub mod api;
#[cfg(target_arch = "wasm32")]
pub mod bindings;
pub mod broyden;
pub mod driver;
pub mod equations;
pub mod error;
pub mod methods;
pub mod outcome;
pub mod proven_roots;
pub mod roots_in_range;
mod stepper_record;
pub mod templates;
pub mod tolerances;
pub mod uncertainty;
pub mod units;

pub use driver::{solve, MethodKind, Options, Start, Stepper};
pub use error::InputError;
pub use outcome::{HistoryRow, Solution, Status, StepKind};
pub use tolerances::{Bounds, Tolerances};
