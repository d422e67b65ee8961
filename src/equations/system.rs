//! The system solver used for blocks of coupled unknowns: Broyden's method.

pub use crate::broyden::{solve_system, SystemHistoryRow, SystemOptions, SystemSolution};
