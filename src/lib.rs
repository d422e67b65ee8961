//! tacit: an offline solver for implicit design equations.
//!
//! The core is pure Rust with no JavaScript types and no I/O:
//! - [`driver`]: the one driver loop, which also judges every claim of convergence;
//! - [`certificate`]: the evidence a converged answer must carry;
//! - [`methods`]: the scalar methods as small state machines, and the choice of one;
//! - [`stepper`]: [`solve`] with a closure and the ask–tell [`Stepper`];
//! - [`outcome`]: the result type and honest statuses;
//! - [`tolerances`]: tolerances, budget and bounds.
//!
//! The wasm32 binding layer lives in `bindings` and is compiled only for wasm32.

pub mod api;
#[cfg(target_arch = "wasm32")]
pub mod bindings;
pub mod broyden;
pub mod certificate;
pub mod dimension;
pub mod driver;
pub mod equations;
pub mod error;
pub mod methods;
pub mod outcome;
pub mod problem;
pub mod proven_roots;
pub mod roots_in_range;
pub mod stepper;
mod stepper_record;
pub mod templates;
pub mod tolerances;
pub mod uncertainty;
pub mod units;

pub use certificate::{Certificate, CertificateKind};
pub use error::InputError;
pub use methods::{MethodKind, Options, Start};
pub use outcome::{HistoryRow, Solution, Status, StepKind};
pub use stepper::{solve, Stepper};
pub use tolerances::{Bounds, Tolerances};
