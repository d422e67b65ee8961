//! The one driver loop shared by every scalar method.
//!
//! A method is a small state machine ([`ScalarMethod`]): it is told the value at the
//! point it last asked for and answers with the next point to evaluate, or that it is
//! done. Everything else happens here, once: counting evaluations, the budget, keeping
//! the (opt-in, bounded) history, holding the unknown inside its bounds, tracking the
//! best point seen, and **checking every claim of convergence** against the evidence
//! ([`crate::certificate`]): a method may claim, only the driver certifies.
//!
//! Because methods never call f themselves, the same code serves a Rust closure, an
//! ask–tell [`crate::Stepper`] whose values arrive from outside (perhaps days apart),
//! and the range scan. The driver knows no method by name: [`crate::methods`] builds
//! them and hands them over, so the arrows point one way.

use crate::certificate::{assess, Claim, Evidence, Verdict};
use crate::error::InputError;
use crate::outcome::{
    BoundedLog, HistoryRow, Solution, Status, StepKind, HISTORY_HEAD, HISTORY_TAIL,
};
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
    /// The last step of an open method that claims convergence on it (NaN otherwise).
    pub step: f64,
}

impl Finish {
    /// Ends at an evaluated point.
    pub fn at(status: Status, x: f64, fx: f64) -> Ask {
        Ask::Done(Finish {
            status,
            root: x,
            residual: fx,
            residual_at: x,
            step: f64::NAN,
        })
    }

    /// Ends at an evaluated point after a last step of length `step`.
    pub fn stepped(status: Status, x: f64, fx: f64, step: f64) -> Ask {
        Ask::Done(Finish {
            status,
            root: x,
            residual: fx,
            residual_at: x,
            step,
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
/// - A claim of convergence is checked by the driver; report the final bracket through
///   [`ScalarMethod::bracket`] and, for an open method, the last step in [`Finish`].
pub trait ScalarMethod {
    fn step(&mut self, told: Option<(f64, f64)>, ctx: &Context) -> Ask;
    /// The bracket currently known: ends whose values are of opposite sign (either may
    /// be infinite, neither NaN), if a sign change has been seen.
    fn bracket(&self) -> Option<(f64, f64)>;
    /// Iterations completed so far.
    fn iterations(&self) -> usize;
}

/// How the driver runs, besides the method.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Settings {
    pub tol: Tolerances,
    pub bounds: Bounds,
    /// Keep [`HistoryRow`]s (bounded: see [`crate::outcome::HISTORY_HEAD`]).
    pub record_history: bool,
    /// Keep every told (x, f(x)) for a saved record ([`Driver::told`]); memory grows
    /// with the budget, which [`Tolerances::validate`] caps.
    pub keep_told: bool,
}

/// A claim of convergence being checked with extra evaluations.
#[derive(Debug, Clone, Copy)]
struct Checking {
    claim: Claim,
    finish: Finish,
    checks: usize,
}

/// The loop state: ask for a point, take its value, until the method is done and its
/// claim is judged.
pub struct Driver {
    settings: Settings,
    method: Box<dyn ScalarMethod>,
    pending: Option<(f64, StepKind)>,
    evaluations: usize,
    told: Vec<(f64, f64)>,
    evidence: Evidence,
    history: BoundedLog<HistoryRow>,
    last_x: Option<f64>,
    best: Option<(f64, f64)>,
    /// Whether f was evaluated at each bound (the only points clamping can produce).
    lo_evaluated: bool,
    hi_evaluated: bool,
    checking: Option<Checking>,
    /// Checking evaluations made so far.
    checks: usize,
    finished: Option<Solution>,
}

impl Driver {
    /// Starts `method`. `known` are points evaluated before (by a scan, say): they count
    /// as evidence for the certificate but not as evaluations of this solve.
    pub fn new(method: Box<dyn ScalarMethod>, settings: Settings, known: &[(f64, f64)]) -> Driver {
        let mut evidence = Evidence::new();
        for &(x, fx) in known {
            evidence.push(x, fx);
        }
        let mut driver = Driver {
            settings,
            method,
            pending: None,
            evaluations: 0,
            told: Vec::new(),
            evidence,
            history: BoundedLog::new(HISTORY_HEAD, HISTORY_TAIL),
            last_x: None,
            best: None,
            lo_evaluated: false,
            hi_evaluated: false,
            checking: None,
            checks: 0,
            finished: None,
        };
        let ask = driver.method.step(None, &driver.context());
        driver.act(ask);
        driver
    }

    pub fn settings(&self) -> &Settings {
        &self.settings
    }

    fn context(&self) -> Context {
        Context {
            tol: self.settings.tol,
            bounds: self.settings.bounds,
            evaluations: self.evaluations,
        }
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

    /// Every (x, f(x)) told so far, in order (empty unless `keep_told`).
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
        if self.settings.keep_told {
            self.told.push((x, fx));
        }
        self.evidence.push(x, fx);
        self.lo_evaluated |= x == self.settings.bounds.lo;
        self.hi_evaluated |= x == self.settings.bounds.hi;
        if fx.is_finite() && self.best.is_none_or(|(_, fb)| fx.abs() < fb.abs()) {
            self.best = Some((x, fx));
        }
        if self.settings.record_history {
            let step = self.last_x.map_or(f64::NAN, |p| x - p);
            self.history.push(HistoryRow {
                k: self.evaluations,
                x,
                fx,
                step,
                bracket: None,
                kind,
            });
        }
        self.last_x = Some(x);
        if let Some(checking) = self.checking.take() {
            self.continue_check(checking, x, fx);
            return Ok(());
        }
        let ask = self.method.step(Some((x, fx)), &self.context());
        if self.settings.record_history {
            let bracket = self.method.bracket();
            if let Some(row) = self.history.last_mut() {
                row.bracket = bracket;
            }
        }
        self.act(ask);
        Ok(())
    }

    fn act(&mut self, ask: Ask) {
        match ask {
            Ask::Done(finish) => self.judge(finish, 0),
            Ask::Eval(x, kind) => {
                if x.is_nan() {
                    self.finish_at_best(Status::NonFinite);
                } else if self.evaluations >= self.settings.tol.max_evals {
                    self.finish_at_best(Status::BudgetSpent);
                } else {
                    let b = self.settings.bounds;
                    let xc = b.clamp(x);
                    let repeat = xc != x
                        && ((xc == b.lo && self.lo_evaluated) || (xc == b.hi && self.hi_evaluated));
                    if repeat {
                        self.finish_at_best(Status::StuckAtBound);
                    } else {
                        self.pending = Some((xc, kind));
                    }
                }
            }
        }
    }

    /// Judges a method's finish: claims of convergence need a certificate.
    fn judge(&mut self, finish: Finish, checks: usize) {
        let bracket = self.sign_change_bracket();
        let claim = Claim {
            status: finish.status,
            root: finish.root,
            at: finish.residual_at,
            residual: finish.residual,
            bracket,
            step: finish.step,
        };
        self.decide(claim, finish, checks);
    }

    /// The method's bracket, if the values at its ends (when still in the evidence) are
    /// non-zero and of opposite signs: an end where f is exactly zero is not a sign.
    fn sign_change_bracket(&self) -> Option<(f64, f64)> {
        let (lo, hi) = self.method.bracket()?;
        let signed = |x: f64| {
            self.evidence
                .lookup(x)
                .is_none_or(|f| f != 0.0 && !f.is_nan())
        };
        (signed(lo) && signed(hi)).then_some((lo, hi))
    }

    fn decide(&mut self, claim: Claim, finish: Finish, checks: usize) {
        if !claim.status.is_converged() {
            // A sign change was seen: the solve must not end as if none had been.
            let status = match (claim.status, claim.bracket) {
                (Status::NonFinite | Status::NoSignChange, Some(_)) => Status::Discontinuity,
                (s, _) => s,
            };
            self.finish(status, finish, claim.bracket, None);
            return;
        }
        match assess(&claim, &self.evidence, &self.settings.tol, checks) {
            Verdict::Certified(certificate) => {
                self.finish(claim.status, finish, claim.bracket, Some(certificate))
            }
            Verdict::Refused(status) => self.finish(status, finish, claim.bracket, None),
            Verdict::Bracket(lo, hi) => {
                let mut claim = claim;
                claim.bracket = Some((lo, hi));
                self.decide(claim, finish, checks);
            }
            Verdict::Probe(x, kind) => {
                let b = self.settings.bounds;
                let usable = b.contains(x) && self.evidence.lookup(x).is_none() && x.is_finite();
                if !usable {
                    let status = if claim.bracket.is_some() {
                        Status::Discontinuity
                    } else if claim.status == Status::ExactZero {
                        Status::ZeroPlateau
                    } else {
                        Status::LargeResidual
                    };
                    self.finish(status, finish, claim.bracket, None);
                } else if self.evaluations >= self.settings.tol.max_evals {
                    self.finish(Status::BudgetSpent, finish, claim.bracket, None);
                } else {
                    self.checking = Some(Checking {
                        claim,
                        finish,
                        checks: checks + 1,
                    });
                    self.checks += 1;
                    self.pending = Some((x, kind));
                }
            }
        }
    }

    /// A checking evaluation arrived: update the claim (a bracket is halved) and judge
    /// it again.
    fn continue_check(&mut self, checking: Checking, x: f64, fx: f64) {
        let Checking {
            mut claim,
            mut finish,
            checks,
        } = checking;
        if let Some((lo, hi)) = claim.bracket {
            if x > lo && x < hi {
                let flo = self.evidence.lookup(lo).unwrap_or(f64::NAN);
                let fhi = self.evidence.lookup(hi).unwrap_or(f64::NAN);
                if fx.is_nan() || flo.is_nan() || fhi.is_nan() {
                    self.finish(Status::Discontinuity, finish, claim.bracket, None);
                    return;
                }
                if fx == 0.0 {
                    claim.status = Status::ExactZero;
                    claim.root = x;
                    claim.at = x;
                    claim.residual = 0.0;
                    finish.root = x;
                    finish.residual = 0.0;
                    finish.residual_at = x;
                } else {
                    let (a, fa, b, fb) = if (fx < 0.0) == (flo < 0.0) {
                        (x, fx, hi, fhi)
                    } else {
                        (lo, flo, x, fx)
                    };
                    claim.bracket = Some((a, b));
                    let (u, fu) = if fa.abs() <= fb.abs() {
                        (a, fa)
                    } else {
                        (b, fb)
                    };
                    claim.root = u;
                    claim.at = u;
                    claim.residual = fu;
                    finish.root = u;
                    finish.residual = fu;
                    finish.residual_at = u;
                }
            }
        }
        self.decide(claim, finish, checks);
    }

    fn finish_at_best(&mut self, status: Status) {
        let (x, fx) = self
            .best
            .or_else(|| self.evidence.points().last())
            .unwrap_or((f64::NAN, f64::NAN));
        let finish = Finish {
            status,
            root: x,
            residual: fx,
            residual_at: x,
            step: f64::NAN,
        };
        let bracket = self.sign_change_bracket();
        self.finish(status, finish, bracket, None);
    }

    fn finish(
        &mut self,
        status: Status,
        finish: Finish,
        bracket: Option<(f64, f64)>,
        certificate: Option<crate::certificate::Certificate>,
    ) {
        self.pending = None;
        let history = std::mem::replace(&mut self.history, BoundedLog::new(0, 0));
        let (history, history_dropped) = history.into_parts();
        self.finished = Some(Solution {
            root: finish.root,
            residual: finish.residual,
            residual_at: finish.residual_at,
            converged: certificate.is_some(),
            status,
            evaluations: self.evaluations,
            iterations: self.method.iterations(),
            checks: self.checks,
            bracket,
            certificate,
            history,
            history_dropped,
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
        self.finished.take().unwrap_or_else(|| Solution {
            root: f64::NAN,
            residual: f64::NAN,
            residual_at: f64::NAN,
            converged: false,
            status: Status::BudgetSpent,
            evaluations: 0,
            iterations: 0,
            checks: 0,
            bracket: None,
            certificate: None,
            history: Vec::new(),
            history_dropped: 0,
        })
    }

    /// The history recorded so far (empty unless requested), and the rows left out.
    pub fn history(&self) -> (Vec<HistoryRow>, usize) {
        match &self.finished {
            Some(s) => (s.history.clone(), s.history_dropped),
            None => (
                self.history.iter().copied().collect(),
                self.history.dropped(),
            ),
        }
    }
}
