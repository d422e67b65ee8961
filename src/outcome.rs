//! The one result type shared by every scalar method, with honest statuses.

use crate::certificate::Certificate;

/// How a solve ended. Only the first three mean the root can be trusted, and only
/// with the [`Certificate`] the driver attaches to them.
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
    /// f changes sign across the final bracket, but |f| does not shrink towards zero
    /// there (or f is undefined between its ends): a pole or a jump, not a root.
    Discontinuity,
    /// The steps fell below the tolerance, but |f| did not shrink with them.
    LargeResidual,
    /// f is exactly zero at the point and next to it as well: an underflowed or
    /// rounded-away stretch, not a located root.
    ZeroPlateau,
}

impl Status {
    pub const ALL: [Status; 14] = [
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
        Status::Discontinuity,
        Status::LargeResidual,
        Status::ZeroPlateau,
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
            Status::Discontinuity => "discontinuity",
            Status::LargeResidual => "large-residual",
            Status::ZeroPlateau => "zero-plateau",
        }
    }

    pub fn from_code(code: &str) -> Option<Status> {
        Status::ALL.into_iter().find(|s| s.code() == code)
    }

    /// A plain-language diagnosis that says what to try next.
    pub fn diagnosis(self) -> &'static str {
        match self {
            Status::ConvergedStep => {
                "Converged: the final bracket or step is within the step tolerance, and |f| \
                 shrank with it."
            }
            Status::ConvergedResidual => {
                "Converged: the residual is within the residual tolerance."
            }
            Status::ExactZero => {
                "Converged: the equation is satisfied exactly at this value, and not merely \
                 by underflow."
            }
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
            Status::Discontinuity => {
                "Not converged: f changes sign here but does not approach zero (or is \
                 undefined between the two sides): a pole or a jump, not a root. Check the \
                 equation near this value, and scan the range to see where f crosses zero."
            }
            Status::LargeResidual => {
                "Not converged: the steps became smaller than the tolerance, but |f| did not \
                 shrink with them. There is no root at this point: a minimum of |f| above \
                 zero, or an asymptote. Scan the range for roots, or try other guesses."
            }
            Status::ZeroPlateau => {
                "Not converged: f is exactly zero here and right next to it as well, which \
                 happens where its terms underflow or round away (far out on an \
                 exponential or an asymptote), not at a root. Try guesses nearer the \
                 expected root, or bounds that exclude this stretch."
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
    /// An evaluation the driver made to check a claim of convergence.
    Check,
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
            StepKind::Check => "check",
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

/// The result of a scalar solve. `converged` is true only when `status` says so, and
/// then `certificate` holds the evidence.
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
    /// Exact number of calls of f, `checks` included.
    pub evaluations: usize,
    pub iterations: usize,
    /// Evaluations the driver made to check the method's claim of convergence
    /// ([`StepKind::Check`]).
    pub checks: usize,
    /// The final bracket, when a sign change is known.
    pub bracket: Option<(f64, f64)>,
    /// The evidence for convergence; `Some` exactly when `converged`.
    pub certificate: Option<Certificate>,
    /// Empty unless history was requested. Long solves keep the first
    /// [`HISTORY_HEAD`] rows and the last [`HISTORY_TAIL`]; `history_dropped` counts
    /// the rows left out between them.
    pub history: Vec<HistoryRow>,
    pub history_dropped: usize,
}

/// Rows of history kept from the start of a long solve.
pub const HISTORY_HEAD: usize = 1000;
/// Rows of history kept from the end of a long solve.
pub const HISTORY_TAIL: usize = 3000;

impl Solution {
    pub fn message(&self) -> &'static str {
        self.status.diagnosis()
    }
}

/// A log that keeps the first `head` entries and the latest `tail`, counting the rest:
/// memory stays bounded however long a solve runs.
#[derive(Debug, Clone)]
pub struct BoundedLog<T> {
    head: Vec<T>,
    tail: std::collections::VecDeque<T>,
    head_cap: usize,
    tail_cap: usize,
    dropped: usize,
}

impl<T> BoundedLog<T> {
    pub fn new(head_cap: usize, tail_cap: usize) -> BoundedLog<T> {
        BoundedLog {
            head: Vec::new(),
            tail: std::collections::VecDeque::new(),
            head_cap,
            tail_cap,
            dropped: 0,
        }
    }

    pub fn push(&mut self, row: T) {
        if self.head.len() < self.head_cap {
            self.head.push(row);
            return;
        }
        if self.tail.len() == self.tail_cap {
            if self.tail.pop_front().is_some() {
                self.dropped += 1;
            } else {
                self.dropped += 1;
                return;
            }
        }
        self.tail.push_back(row);
    }

    /// The newest entry.
    pub fn last_mut(&mut self) -> Option<&mut T> {
        if self.tail.is_empty() {
            self.head.last_mut()
        } else {
            self.tail.back_mut()
        }
    }

    pub fn len(&self) -> usize {
        self.head.len() + self.tail.len()
    }

    pub fn is_empty(&self) -> bool {
        self.len() == 0
    }

    /// Entries left out between the head and the tail.
    pub fn dropped(&self) -> usize {
        self.dropped
    }

    /// The kept entries in order, and how many were left out.
    pub fn into_parts(self) -> (Vec<T>, usize) {
        let mut rows = self.head;
        rows.extend(self.tail);
        (rows, self.dropped)
    }

    /// The kept entries in order.
    pub fn iter(&self) -> impl Iterator<Item = &T> {
        self.head.iter().chain(self.tail.iter())
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn bounded_log_keeps_head_and_tail() {
        let mut log = BoundedLog::new(3, 2);
        for i in 0..10 {
            log.push(i);
        }
        assert_eq!(log.dropped(), 5);
        assert_eq!(log.into_parts(), (vec![0, 1, 2, 8, 9], 5));
        let mut none: BoundedLog<i32> = BoundedLog::new(0, 0);
        none.push(1);
        assert_eq!(none.into_parts(), (vec![], 1));
    }
}
