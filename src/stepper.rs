//! The public ways to run a scalar solve: [`solve`] with a Rust closure, and the
//! ask–tell [`Stepper`], whose values may arrive from outside days apart and which can
//! be saved and restored ([`crate::stepper_record`]).

use crate::driver::Driver;
use crate::error::InputError;
use crate::methods::{self, Options, Start};
use crate::outcome::{HistoryRow, Solution, StepKind};

/// Solves f(x) = 0 with a Rust closure. The driver calls f exactly
/// `solution.evaluations` times.
///
/// ```
/// use tacit::{solve, Options, Start};
/// let s = solve(Start::Guesses(1.0, 2.0), &Options::default(), |x| x * x - 2.0).unwrap();
/// assert!(s.converged);
/// assert!((s.root - 2f64.sqrt()).abs() < 1e-12);
/// ```
pub fn solve(
    start: Start,
    options: &Options,
    mut f: impl FnMut(f64) -> f64,
) -> Result<Solution, InputError> {
    methods::validate(start, options)?;
    let method = methods::build(options.method, start);
    let mut driver = Driver::new(method, options.settings(false), &[]);
    while let Some(x) = driver.next_point() {
        driver.tell(f(x))?;
    }
    Ok(driver.into_solution())
}

/// An ask–tell solve: [`Stepper::next_point`] says where to evaluate, [`Stepper::tell`]
/// records the value. It keeps every told value so that it can be saved.
pub struct Stepper {
    start: Start,
    options: Options,
    driver: Driver,
}

impl Stepper {
    pub fn new(start: Start, options: &Options) -> Result<Stepper, InputError> {
        methods::validate(start, options)?;
        let method = methods::build(options.method, start);
        Ok(Stepper {
            start,
            options: *options,
            driver: Driver::new(method, options.settings(true), &[]),
        })
    }

    pub fn options(&self) -> &Options {
        &self.options
    }

    pub fn start(&self) -> Start {
        self.start
    }

    /// The point to evaluate next, or `None` when the solve is finished.
    pub fn next_point(&self) -> Option<f64> {
        self.driver.next_point()
    }

    /// The kind of step that produced the pending point.
    pub fn next_kind(&self) -> Option<StepKind> {
        self.driver.next_kind()
    }

    pub fn is_done(&self) -> bool {
        self.driver.is_done()
    }

    pub fn evaluations(&self) -> usize {
        self.driver.evaluations()
    }

    /// Every (x, f(x)) told so far, in order.
    pub fn told(&self) -> &[(f64, f64)] {
        self.driver.told()
    }

    /// Records f at the pending point (NaN and infinity are accepted).
    pub fn tell(&mut self, fx: f64) -> Result<(), InputError> {
        self.driver.tell(fx)
    }

    /// The result, once done.
    pub fn solution(&self) -> Option<&Solution> {
        self.driver.solution()
    }

    /// The result; if the solve is unfinished, the best point so far with status
    /// `BudgetSpent` (it is not converged).
    pub fn into_solution(self) -> Solution {
        self.driver.into_solution()
    }

    /// The history recorded so far (empty unless requested) and the rows left out.
    pub fn history(&self) -> (Vec<HistoryRow>, usize) {
        self.driver.history()
    }

    /// The stepper as JSON: its set-up and the values told so far.
    pub fn save(&self) -> String {
        crate::stepper_record::save(self)
    }

    /// Rebuilds a stepper from [`Stepper::save`] output by replaying the told values.
    /// Nothing is evaluated. A record that does not replay is an error.
    pub fn restore(json: &str) -> Result<Stepper, InputError> {
        crate::stepper_record::restore(json)
    }
}
