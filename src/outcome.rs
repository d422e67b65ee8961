//! The one result type shared by every scalar method, with honest statuses.

/// How a solve ended. Only the first three mean the root can be trusted.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub enum Status {
    /// The last step (or the final bracket) is within the step tolerance.
    ConvergedStep,
    /// `|f(root)| <= f_abs`.
    ConvergedResidual,
    /// `f(root) == 0` exactly.
    ExactZero,
    /// The evaluation budget was spent first.
    BudgetSpent,
    /// Two successive values of f were equal, so the secant line is horizontal.
    Flat,
    /// |x| keeps growing while |f| does not shrink.
    Diverging,
    /// The iterates jump back and forth without settling.
    Oscillating,
    /// Steps stopped making progress without meeting the tolerance.
    Stagnated,
    /// The outward search from the guesses found no sign change within its budget or bounds.
    NoSignChange,
    /// f returned NaN or infinity and backing off towards good points did not help.
    NonFinite,
    /// The method kept pushing against a bound of the unknown.
    StuckAtBound,
}

impl Status {
    pub const ALL: [Status; 11] = [
        Status::ConvergedStep,
        Status::ConvergedResidual,
        Status::ExactZero,
        Status::BudgetSpent,
        Status::Flat,
        Status::Diverging,
        Status::Oscillating,
        Status::Stagnated,
        Status::NoSignChange,
        Status::NonFinite,
        Status::StuckAtBound,
    ];

    pub fn is_converged(self) -> bool {
        matches!(
            self,
            Status::ConvergedStep | Status::ConvergedResidual | Status::ExactZero
        )
    }

    /// Stable machine-readable code (used in JSON, bookmarks and the JS API).
    pub fn code(self) -> &'static str {
        match self {
            Status::ConvergedStep => "converged-step",
            Status::ConvergedResidual => "converged-residual",
            Status::ExactZero => "exact-zero",
            Status::BudgetSpent => "budget-spent",
            Status::Flat => "flat",
            Status::Diverging => "diverging",
            Status::Oscillating => "oscillating",
            Status::Stagnated => "stagnated",
            Status::NoSignChange => "no-sign-change",
            Status::NonFinite => "non-finite",
            Status::StuckAtBound => "stuck-at-bound",
        }
    }

    pub fn from_code(code: &str) -> Option<Status> {
        Status::ALL.into_iter().find(|s| s.code() == code)
    }

    /// A plain-language diagnosis that says what to try next.
    pub fn diagnosis(self) -> &'static str {
        match self {
            Status::ConvergedStep => {
                "Converged: the last step was smaller than the step tolerance."
            }
            Status::ConvergedResidual => {
                "Converged: the residual is within the residual tolerance."
            }
            Status::ExactZero => "Converged: the equation is satisfied exactly at this value.",
            Status::BudgetSpent => {
                "Not converged: the evaluation budget ran out. Raise the budget, loosen the \
                 tolerance, or start from guesses closer to the root."
            }
            Status::Flat => {
                "Not converged: the function had the same value at two points, so the secant \
                 line never crosses zero (for a system: the Jacobian is singular). Try guesses \
                 farther apart, or a bracket."
            }
            Status::Diverging => {
                "Not converged: the estimates run away while the residual does not shrink. \
                 There may be no root in this direction; try other guesses, a bracket, or \
                 bounds on the unknown."
            }
            Status::Oscillating => {
                "Not converged: the estimates jump back and forth without settling. Give a \
                 bracket with a sign change, or guesses on either side of the root."
            }
            Status::Stagnated => {
                "Not converged: the steps stopped making progress. The root may be multiple \
                 (a touching root) or the function noisy; try a looser tolerance or scan the \
                 range for roots."
            }
            Status::NoSignChange => {
                "Not converged: no sign change was found near the guesses. The equation may \
                 have no real root here; scan a wider range, or check the given values."
            }
            Status::NonFinite => {
                "Not converged: the function is not defined (NaN or infinity) where the \
                 method had to look. Set bounds on the unknown to keep it in the valid domain."
            }
            Status::StuckAtBound => {
                "Not converged: the method kept pressing against a bound of the unknown. The \
                 root may lie outside the bounds; widen them if that is physical."
            }
        }
    }
}

/// Which kind of step produced an evaluated point.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub enum StepKind {
    /// A starting guess or bracket end supplied by the caller.
    Initial,
    Secant,
    InverseQuadratic,
    /// A higher-order inverse interpolation (cubic or more points).
    InverseCubic,
    Bisection,
    /// False position with the Illinois halving.
    FalsePosition,
    /// Outward search for a sign change.
    BracketSearch,
    /// Backing off towards the last good point after NaN, infinity or a bound.
    Backtrack,
    /// A uniform sample of a range scan.
    Scan,
    /// A finite-difference probe (Jacobians, sensitivities).
    Probe,
}

impl StepKind {
    pub fn code(self) -> &'static str {
        match self {
            StepKind::Initial => "initial",
            StepKind::Secant => "secant",
            StepKind::InverseQuadratic => "inverse-quadratic",
            StepKind::InverseCubic => "inverse-cubic",
            StepKind::Bisection => "bisection",
            StepKind::FalsePosition => "false-position",
            StepKind::BracketSearch => "bracket-search",
            StepKind::Backtrack => "backtrack",
            StepKind::Scan => "scan",
            StepKind::Probe => "probe",
        }
    }
}

/// One row per evaluation.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct HistoryRow {
    /// 1-based evaluation number.
    pub k: usize,
    pub x: f64,
    pub fx: f64,
    /// `x` minus the previously evaluated point (NaN for the first row).
    pub step: f64,
    /// The bracket known after this evaluation, if any.
    pub bracket: Option<(f64, f64)>,
    pub kind: StepKind,
}

/// The result of a scalar solve. `converged` is true only when `status` says so.
#[derive(Debug, Clone, PartialEq)]
pub struct Solution {
    /// The estimate of the root.
    pub root: f64,
    /// f at `residual_at`. Equal to `root` for every method except the classic secant,
    /// whose final estimate is the unevaluated crossing of the last secant line; there
    /// `residual_at` is the last evaluated point.
    pub residual: f64,
    pub residual_at: f64,
    pub converged: bool,
    pub status: Status,
    /// Exact number of calls of f.
    pub evaluations: usize,
    pub iterations: usize,
    /// The final bracket, when a sign change is known.
    pub bracket: Option<(f64, f64)>,
    /// Empty unless history was requested.
    pub history: Vec<HistoryRow>,
}

impl Solution {
    pub fn message(&self) -> &'static str {
        self.status.diagnosis()
    }
}
