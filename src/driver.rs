//! The one driver loop shared by every scalar method.
//!
//! A method is a small state machine ([`ScalarMethod`]): it is told the value at the
//! point it last asked for and answers with the next point to evaluate, or that it is
//! done. Everything else happens here, once: counting evaluations, the budget, keeping
//! the (opt-in) history, holding the unknown inside its bounds, refusing non-finite
//! points, and tracking the best point seen.
//!
//! Because methods never call f themselves, the same code serves a Rust closure
//! ([`solve`]) and an ask–tell [`Stepper`] whose values arrive from outside, perhaps days
//! apart. A stepper is saved as its set-up plus the values told so far; restoring replays
//! those values through a fresh method, which is deterministic, so nothing is evaluated
//! again and a tampered record is detected when the replay asks for a different point.

use crate::error::{require_finite, InputError};
use crate::methods;
use crate::outcome::{HistoryRow, Solution, Status, StepKind};
use crate::tolerances::{Bounds, Tolerances};

/// What a method wants next.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Ask {
    /// Evaluate f at this point.
    Eval(f64, StepKind),
    /// Finished.
    Done(Finish),
}

/// How a method ended.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Finish {
    pub status: Status,
    pub root: f64,
    /// f at `residual_at` (equal to `root` unless the method returns an unevaluated estimate).
    pub residual: f64,
    pub residual_at: f64,
}

impl Finish {
    /// Ends at an evaluated point.
    pub fn at(status: Status, x: f64, fx: f64) -> Ask {
        Ask::Done(Finish {
            status,
            root: x,
            residual: fx,
            residual_at: x,
        })
    }
}

/// What a method may read on each step.
#[derive(Debug, Clone, Copy)]
pub struct Context {
    pub tol: Tolerances,
    pub bounds: Bounds,
    /// Evaluations made so far.
    pub evaluations: usize,
}

/// A scalar root-finding method, written as a state machine.
///
/// Contract:
/// - `step(None, ..)` is called once, first; afterwards `step(Some((x, fx)), ..)` gives
///   the point actually evaluated (the driver may have clamped it into the bounds) and
///   its value, which may be NaN or infinite.
/// - Never ask for a point already evaluated: carry values forward.
/// - Ask only for points inside `ctx.bounds`.
pub trait ScalarMethod {
    fn step(&mut self, told: Option<(f64, f64)>, ctx: &Context) -> Ask;
    /// The bracket currently known, if a sign change has been seen.
    fn bracket(&self) -> Option<(f64, f64)>;
    /// Iterations completed so far.
    fn iterations(&self) -> usize;
}

/// The methods a caller can choose.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub enum MethodKind {
    /// The default: secant steps while they make progress, the bracketing hybrid once a
    /// sign change is seen, an outward bracket search when none is.
    Auto,
    /// The classic secant method, exactly as in the textbooks.
    Secant,
    /// The bracketing hybrid that cannot diverge; needs a sign change.
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
    /// Keep one [`HistoryRow`] per evaluation. Off by default; costs nothing when off.
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
    let mut stepper = Stepper::new(start, options)?;
    while let Some(x) = stepper.next_point() {
        let fx = f(x);
        stepper.tell(fx)?;
    }
    Ok(stepper.into_solution())
}

/// An ask–tell driver: [`Stepper::next_point`] says where to evaluate, [`Stepper::tell`]
/// records the value. [`solve`] is a loop over it.
pub struct Stepper {
    start: Start,
    options: Options,
    method: Box<dyn ScalarMethod>,
    pending: Option<(f64, StepKind)>,
    evaluations: usize,
    /// Every told (x, f(x)), in order: the record that [`Stepper::save`] writes.
    told: Vec<(f64, f64)>,
    history: Vec<HistoryRow>,
    best: Option<(f64, f64)>,
    finished: Option<Solution>,
}

impl Stepper {
    pub fn new(start: Start, options: &Options) -> Result<Stepper, InputError> {
        validate(start, options)?;
        let method = methods::build(options.method, start, options);
        let mut stepper = Stepper {
            start,
            options: *options,
            method,
            pending: None,
            evaluations: 0,
            told: Vec::new(),
            history: Vec::new(),
            best: None,
            finished: None,
        };
        stepper.advance(None);
        Ok(stepper)
    }

    pub fn options(&self) -> &Options {
        &self.options
    }

    pub fn start(&self) -> Start {
        self.start
    }

    /// The point to evaluate next, or `None` when the solve is finished.
    pub fn next_point(&self) -> Option<f64> {
        self.pending.map(|(x, _)| x)
    }

    /// The kind of step that produced the pending point.
    pub fn next_kind(&self) -> Option<StepKind> {
        self.pending.map(|(_, k)| k)
    }

    pub fn is_done(&self) -> bool {
        self.finished.is_some()
    }

    pub fn evaluations(&self) -> usize {
        self.evaluations
    }

    /// Every (x, f(x)) told so far, in order.
    pub fn told(&self) -> &[(f64, f64)] {
        &self.told
    }

    /// Records f at the pending point. NaN and infinity are accepted (the method backs
    /// off); telling when nothing is pending is an error.
    pub fn tell(&mut self, fx: f64) -> Result<(), InputError> {
        let Some((x, kind)) = self.pending.take() else {
            return Err(InputError::new(
                "nothing-pending",
                "the solve is finished; there is no point waiting for a value",
            ));
        };
        self.evaluations += 1;
        self.told.push((x, fx));
        if fx.is_finite() && self.best.is_none_or(|(_, fb)| fx.abs() < fb.abs()) {
            self.best = Some((x, fx));
        }
        if self.options.record_history {
            let step = self.history.last().map_or(f64::NAN, |r| x - r.x);
            self.history.push(HistoryRow {
                k: self.evaluations,
                x,
                fx,
                step,
                bracket: None,
                kind,
            });
        }
        self.advance(Some((x, fx)));
        Ok(())
    }

    fn advance(&mut self, told: Option<(f64, f64)>) {
        let ctx = Context {
            tol: self.options.tol,
            bounds: self.options.bounds,
            evaluations: self.evaluations,
        };
        let ask = self.method.step(told, &ctx);
        if self.options.record_history {
            if let Some(row) = self.history.last_mut() {
                row.bracket = self.method.bracket();
            }
        }
        match ask {
            Ask::Done(finish) => self.finish(finish),
            Ask::Eval(x, kind) => {
                if x.is_nan() {
                    self.finish_at_best(Status::NonFinite);
                } else if self.evaluations >= self.options.tol.max_evals {
                    self.finish_at_best(Status::BudgetSpent);
                } else {
                    let xc = self.options.bounds.clamp(x);
                    if xc != x && self.told.iter().any(|&(t, _)| t == xc) {
                        self.finish_at_best(Status::StuckAtBound);
                    } else {
                        self.pending = Some((xc, kind));
                    }
                }
            }
        }
    }

    fn finish_at_best(&mut self, status: Status) {
        let (x, fx) = self
            .best
            .or_else(|| self.told.last().copied())
            .unwrap_or((f64::NAN, f64::NAN));
        self.finish(Finish {
            status,
            root: x,
            residual: fx,
            residual_at: x,
        });
    }

    fn finish(&mut self, finish: Finish) {
        self.pending = None;
        self.finished = Some(Solution {
            root: finish.root,
            residual: finish.residual,
            residual_at: finish.residual_at,
            converged: finish.status.is_converged(),
            status: finish.status,
            evaluations: self.evaluations,
            iterations: self.method.iterations(),
            bracket: self.method.bracket(),
            history: std::mem::take(&mut self.history),
        });
    }

    /// The result, once done.
    pub fn solution(&self) -> Option<&Solution> {
        self.finished.as_ref()
    }

    /// The result; if the solve is unfinished, the best point so far with status
    /// `BudgetSpent` (it is not converged).
    pub fn into_solution(mut self) -> Solution {
        if self.finished.is_none() {
            self.finish_at_best(Status::BudgetSpent);
        }
        self.finished.take().expect("finished above")
    }

    /// The history recorded so far (empty unless requested).
    pub fn history(&self) -> &[HistoryRow] {
        match &self.finished {
            Some(s) => &s.history,
            None => &self.history,
        }
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
