//! Bisection.

use super::bracket::{midpoint, Gap, Sought, WallSeek};
use crate::driver::{Ask, Context, Finish, ScalarMethod};
use crate::outcome::{Status, StepKind};

/// Bisection: halve a bracket [a, b] with f(a)·f(b) < 0, keeping the half whose ends
/// still differ in sign.
///
/// - Order of convergence: linear, the bracket halves with every evaluation.
/// - Evaluations: two for the ends, then one per iteration.
/// - It cannot diverge; it stops when the bracket is within twice the step tolerance or
///   no float lies strictly between its ends. The root returned is the end with the
///   smaller |f|.
/// - A NaN at a midpoint is a domain wall: the defined stretches on either side of the
///   undefined gap are halved ([`Gap`]) until a point of the other sign turns up or
///   both walls are located, which ends as a discontinuity (a sign change across a
///   stretch where f is undefined), not a root.
/// - Reference: Burden & Faires, *Numerical Analysis*, Algorithm 2.1.
#[derive(Debug, Clone)]
pub struct Bisection {
    a: f64,
    fa: f64,
    b: f64,
    fb: f64,
    phase: u8,
    iterations: usize,
    gap: Option<Gap>,
    /// Searching in from an undefined end for a value of the other sign.
    seek: Option<WallSeek>,
}

impl Bisection {
    pub fn new(a: f64, b: f64) -> Bisection {
        let (a, b) = if a <= b { (a, b) } else { (b, a) };
        Bisection {
            a,
            fa: f64::NAN,
            b,
            fb: f64::NAN,
            phase: 0,
            iterations: 0,
            gap: None,
            seek: None,
        }
    }

    /// Starts from a bracket whose end values are already known (no re-evaluation).
    pub fn from_bracket(a: f64, fa: f64, b: f64, fb: f64) -> Bisection {
        let (a, fa, b, fb) = if a <= b {
            (a, fa, b, fb)
        } else {
            (b, fb, a, fa)
        };
        Bisection {
            a,
            fa,
            b,
            fb,
            phase: 2,
            iterations: 0,
            gap: None,
            seek: None,
        }
    }

    fn best(&self) -> (f64, f64) {
        super::better((self.a, self.fa), (self.b, self.fb))
    }

    /// Checks the ends once both are known, then takes the first step.
    fn start(&mut self, ctx: &Context) -> Ask {
        if let Some(seek) = WallSeek::from_ends((self.a, self.fa), (self.b, self.fb)) {
            self.seek = Some(seek);
            return self.seek_next(ctx);
        }
        if let Some(done) = super::check_bracket_ends((self.a, self.fa), (self.b, self.fb)) {
            return done;
        }
        self.next(ctx)
    }

    fn seek_next(&mut self, ctx: &Context) -> Ask {
        let Some(seek) = self.seek else {
            return self.next(ctx);
        };
        match seek.next_point(|m| ctx.tol.x_tol(m)) {
            Some(m) => Ask::Eval(m, StepKind::Backtrack),
            None => Finish::at(Status::NonFinite, seek.far, seek.f_far),
        }
    }

    fn next(&mut self, ctx: &Context) -> Ask {
        let (x, fx) = self.best();
        if fx.abs() <= ctx.tol.f_abs {
            return Finish::at(Status::ConvergedResidual, x, fx);
        }
        if let Some(gap) = self.gap {
            return match gap.next_point(self.a, self.b, |m| ctx.tol.x_tol(m)) {
                Some(m) => Ask::Eval(m, StepKind::Backtrack),
                None => Finish::at(Status::Discontinuity, x, fx),
            };
        }
        let m = midpoint(self.a, self.b);
        if m <= self.a || m >= self.b || self.b - self.a <= 2.0 * ctx.tol.x_tol(m) {
            return Finish::at(Status::ConvergedStep, x, fx);
        }
        Ask::Eval(m, StepKind::Bisection)
    }
}

impl ScalarMethod for Bisection {
    fn step(&mut self, told: Option<(f64, f64)>, ctx: &Context) -> Ask {
        match (self.phase, told) {
            (0, None) => {
                self.phase = 1;
                Ask::Eval(self.a, StepKind::Initial)
            }
            (1, Some((x, fx))) => {
                self.a = x;
                self.fa = fx;
                self.phase = 2;
                if fx == 0.0 {
                    return Finish::at(Status::ExactZero, x, fx);
                }
                self.phase = 3;
                Ask::Eval(self.b, StepKind::Initial)
            }
            (3, Some((x, fx))) => {
                self.b = x;
                self.fb = fx;
                self.phase = 4;
                self.start(ctx)
            }
            (2, None) => {
                self.phase = 4;
                self.start(ctx)
            }
            (_, Some((x, fx))) => {
                self.iterations += 1;
                if let Some(seek) = self.seek.as_mut() {
                    match seek.tell(x, fx) {
                        Sought::Continue => return self.seek_next(ctx),
                        Sought::Zero(z) => return Finish::at(Status::ExactZero, z, 0.0),
                        Sought::Bracket(p, q) => {
                            self.seek = None;
                            ((self.a, self.fa), (self.b, self.fb)) =
                                if p.0 < q.0 { (p, q) } else { (q, p) };
                            return self.next(ctx);
                        }
                    }
                }
                if fx == 0.0 {
                    return Finish::at(Status::ExactZero, x, fx);
                }
                if fx.is_nan() {
                    match self.gap.as_mut() {
                        Some(g) => g.widen(x),
                        None => self.gap = Some(Gap::at(x)),
                    }
                    return self.next(ctx);
                }
                if fx.signum() == self.fa.signum() {
                    self.a = x;
                    self.fa = fx;
                } else {
                    self.b = x;
                    self.fb = fx;
                }
                self.gap = self.gap.and_then(|g| g.within(self.a, self.b));
                self.next(ctx)
            }
            (_, None) => self.next(ctx),
        }
    }

    fn bracket(&self) -> Option<(f64, f64)> {
        if !self.fa.is_nan() && !self.fb.is_nan() && self.fa.signum() != self.fb.signum() {
            Some((self.a, self.b))
        } else {
            None
        }
    }

    fn iterations(&self) -> usize {
        self.iterations
    }
}
