//! Illinois false position.

use super::bracket::{midpoint, Gap, Sought, WallSeek};
use crate::driver::{Ask, Context, Finish, ScalarMethod};
use crate::outcome::{Status, StepKind};

/// Illinois false position: regula falsi on a bracket [a, b] with f(a)·f(b) < 0, where an
/// end that is kept twice in a row has its stored value halved before the next step.
///
/// Algorithm: c = b − f(b)(b − a)/(f(b) − f(a)); evaluate f(c) and replace the end of the
/// same sign. When the new point replaces the same end as the step before, the value
/// stored at the retained end is halved, which breaks the one-sided stagnation of plain
/// regula falsi.
///
/// - Order of convergence: 3^(1/3) ≈ 1.442 per evaluation near a simple root (Dowell &
///   Jarratt 1971).
/// - Evaluations: two for the ends (none with [`Illinois::from_bracket`]), then one per
///   iteration.
/// - Cannot diverge: every point lies strictly inside the current bracket, which is
///   nudged towards a bisection when a step would land on an end.
/// - Stops when the bracket is within 2·tol(u), when no float lies strictly between its
///   ends, on |f(u)| ≤ f_abs, or on f = 0 exactly; u, the end with the smaller |f|, is the
///   root returned.
/// - A NaN inside the bracket is handled as in bisection ([`Gap`]): the defined
///   stretches beside the undefined gap are halved until the bracket is free of it or
///   its walls are located (a discontinuity, not a root).
/// - Reference: M. Dowell, P. Jarratt, "A modified regula falsi method for computing the
///   root of an equation", BIT 11 (1971), pp. 168–174.
#[derive(Debug, Clone)]
pub struct Illinois {
    a: f64,
    fa: f64,
    b: f64,
    fb: f64,
    /// Values used in the interpolation (halved by the Illinois rule).
    ga: f64,
    gb: f64,
    /// Which end the last point replaced: -1 for a, +1 for b, 0 none yet.
    side: i8,
    phase: u8,
    iterations: usize,
    gap: Option<Gap>,
    /// Searching in from an undefined end for a value of the other sign.
    seek: Option<WallSeek>,
}

impl Illinois {
    pub fn new(a: f64, b: f64) -> Illinois {
        Illinois {
            a,
            fa: f64::NAN,
            b,
            fb: f64::NAN,
            ga: f64::NAN,
            gb: f64::NAN,
            side: 0,
            phase: 0,
            iterations: 0,
            gap: None,
            seek: None,
        }
    }

    /// Starts from a bracket whose end values are already known (no re-evaluation).
    pub fn from_bracket(a: f64, fa: f64, b: f64, fb: f64) -> Illinois {
        let mut m = Illinois::new(a, b);
        m.fa = fa;
        m.fb = fb;
        m.phase = 2;
        m
    }

    fn best(&self) -> (f64, f64) {
        super::better((self.a, self.fa), (self.b, self.fb))
    }

    fn start(&mut self, ctx: &Context) -> Ask {
        if self.a > self.b {
            std::mem::swap(&mut self.a, &mut self.b);
            std::mem::swap(&mut self.fa, &mut self.fb);
        }
        self.ga = self.fa;
        self.gb = self.fb;
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
        let (u, fu) = self.best();
        if fu == 0.0 {
            return Finish::at(Status::ExactZero, u, fu);
        }
        if fu.abs() <= ctx.tol.f_abs {
            return Finish::at(Status::ConvergedResidual, u, fu);
        }
        let (a, b) = (self.a, self.b);
        if let Some(gap) = self.gap {
            return match gap.next_point(a, b, |m| ctx.tol.x_tol(m)) {
                Some(m) => Ask::Eval(m, StepKind::Backtrack),
                None => Finish::at(Status::Discontinuity, u, fu),
            };
        }
        let m = midpoint(a, b);
        let tol = ctx.tol.x_tol(u);
        if m <= a || m >= b || b - a <= 2.0 * tol {
            return Finish::at(Status::ConvergedStep, u, fu);
        }
        let mut c = b - self.gb * (b - a) / (self.gb - self.ga);
        let mut kind = StepKind::FalsePosition;
        if !(c > a && c < b) {
            c = m;
            kind = StepKind::Bisection;
        }
        // Keep at least 0.7·tol from the ends so that the last step closes the bracket.
        let delta = 0.7 * tol;
        if b - a <= 4.0 * delta {
            c = m;
        } else if c < a + delta {
            c = a + delta;
        } else if c > b - delta {
            c = b - delta;
        }
        if c <= a || c >= b {
            c = m;
        }
        Ask::Eval(c, kind)
    }
}

impl ScalarMethod for Illinois {
    fn step(&mut self, told: Option<(f64, f64)>, ctx: &Context) -> Ask {
        match (self.phase, told) {
            (0, None) => {
                self.phase = 1;
                Ask::Eval(self.a, StepKind::Initial)
            }
            (1, Some((x, fx))) => {
                self.a = x;
                self.fa = fx;
                if fx == 0.0 {
                    self.phase = 3;
                    return Finish::at(Status::ExactZero, x, fx);
                }
                self.phase = 2;
                Ask::Eval(self.b, StepKind::Initial)
            }
            (2, told) => {
                if let Some((x, fx)) = told {
                    self.b = x;
                    self.fb = fx;
                }
                self.phase = 3;
                self.start(ctx)
            }
            (_, Some((c, fc))) => {
                self.iterations += 1;
                if let Some(seek) = self.seek.as_mut() {
                    match seek.tell(c, fc) {
                        Sought::Continue => return self.seek_next(ctx),
                        Sought::Zero(z) => return Finish::at(Status::ExactZero, z, 0.0),
                        Sought::Bracket(p, q) => {
                            self.seek = None;
                            ((self.a, self.fa), (self.b, self.fb)) =
                                if p.0 < q.0 { (p, q) } else { (q, p) };
                            self.ga = self.fa;
                            self.gb = self.fb;
                            self.side = 0;
                            return self.next(ctx);
                        }
                    }
                }
                if fc.is_nan() {
                    match self.gap.as_mut() {
                        Some(g) => g.widen(c),
                        None => self.gap = Some(Gap::at(c)),
                    }
                    return self.next(ctx);
                }
                // Infinite values keep their sign but would spoil the line: halve towards
                // the midpoint by giving the line a finite stand-in.
                let g = if fc.is_finite() {
                    fc
                } else {
                    fc.signum() * f64::MAX / 4.0
                };
                if fc.signum() == self.fa.signum() {
                    self.a = c;
                    self.fa = fc;
                    self.ga = g;
                    if self.side == -1 {
                        self.gb /= 2.0;
                    }
                    self.side = -1;
                } else {
                    self.b = c;
                    self.fb = fc;
                    self.gb = g;
                    if self.side == 1 {
                        self.ga /= 2.0;
                    }
                    self.side = 1;
                }
                self.gap = self.gap.and_then(|g| g.within(self.a, self.b));
                self.next(ctx)
            }
            (_, None) => {
                let (x, fx) = self.best();
                Finish::at(Status::NonFinite, x, fx)
            }
        }
    }

    fn bracket(&self) -> Option<(f64, f64)> {
        if self.phase >= 3 && super::opposite(self.fa, self.fb) {
            Some((self.a, self.b))
        } else {
            None
        }
    }

    fn iterations(&self) -> usize {
        self.iterations
    }
}
