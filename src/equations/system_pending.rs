//! Until `crate::broyden` is in the tree: the agreed types of its API (same names and
//! fields), and a solver that refuses. Replaced by `system.rs` (a re-export of
//! `crate::broyden`) as soon as it lands; only blocks of two or more coupled unknowns
//! need it.

use crate::error::InputError;
use crate::outcome::{Status, StepKind};
use crate::tolerances::{Bounds, Tolerances};

#[derive(Debug, Clone, PartialEq, Default)]
pub struct SystemOptions {
    pub tol: Tolerances,
    pub bounds: Vec<Bounds>,
    pub record_history: bool,
}

#[derive(Debug, Clone, PartialEq)]
pub struct SystemHistoryRow {
    pub k: usize,
    pub x: Vec<f64>,
    pub residual_norm: f64,
    pub kind: StepKind,
}

#[derive(Debug, Clone, PartialEq)]
pub struct SystemSolution {
    pub x: Vec<f64>,
    pub residuals: Vec<f64>,
    pub converged: bool,
    pub status: Status,
    pub evaluations: usize,
    pub iterations: usize,
    pub history: Vec<SystemHistoryRow>,
}

pub fn solve_system(
    _x0: &[f64],
    _options: &SystemOptions,
    _f: impl FnMut(&[f64], &mut [f64]),
) -> Result<SystemSolution, InputError> {
    Err(InputError::new(
        "system-solver-unavailable",
        "solving several coupled unknowns together needs the Broyden solver, which is not \
         in this build yet",
    ))
}
