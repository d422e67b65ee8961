//! The classic secant method.

use crate::driver::{Ask, Context, Finish, ScalarMethod};
use crate::outcome::{Status, StepKind};

/// The classic secant method, exactly as in the textbooks.
///
/// Algorithm: from two distinct guesses x1, x2, draw the line through (x1, f1) and
/// (x2, f2); the next estimate is where it crosses zero,
/// x3 = x2 − f2 (x2 − x1) / (f2 − f1). Drop the oldest point, carry the rest forward,
/// and stop when |x3 − x2| is below the step tolerance.
///
/// - Order of convergence: the golden ratio, (1 + √5)/2 ≈ 1.618, near a simple root.
/// - Evaluations: f(x1) once before the loop, then exactly one, f(x2), per iteration,
///   so a solve uses iterations + 1 evaluations.
/// - No safeguard: it can diverge, oscillate or jump to another root; equal values
///   f2 = f1 end with [`Status::Flat`] rather than a division by zero. Use
///   [`crate::MethodKind::Auto`] for the safeguarded default.
/// - Reference: Süli & Mayers, *An Introduction to Numerical Analysis* (2003), §1.5;
///   Burden & Faires, *Numerical Analysis*, Algorithm 2.4.
///
/// The returned root is the final, unevaluated estimate x3; the solution's residual is
/// f(x2), at `residual_at = x2`. Its claim of convergence is checked by the driver like
/// any other ([`crate::certificate`]): a step below tolerance where |f| has not shrunk
/// (a minimum of |f| above zero, say) is not reported as converged.
#[derive(Debug, Clone)]
pub struct Secant {
    x1: f64,
    f1: f64,
    x2: f64,
    have_f1: bool,
    iterations: usize,
}

impl Secant {
    pub fn new(x1: f64, x2: f64) -> Secant {
        Secant {
            x1,
            f1: f64::NAN,
            x2,
            have_f1: false,
            iterations: 0,
        }
    }
}

impl ScalarMethod for Secant {
    fn step(&mut self, told: Option<(f64, f64)>, ctx: &Context) -> Ask {
        let Some((x, fx)) = told else {
            return Ask::Eval(self.x1, StepKind::Initial);
        };
        if !self.have_f1 {
            self.x1 = x;
            self.f1 = fx;
            self.have_f1 = true;
            if fx == 0.0 {
                return Finish::at(Status::ExactZero, x, fx);
            }
            return Ask::Eval(self.x2, StepKind::Initial);
        }
        // One iteration: f2 has just been evaluated.
        self.x2 = x;
        let f2 = fx;
        self.iterations += 1;
        if f2 == 0.0 {
            return Finish::at(Status::ExactZero, x, f2);
        }
        if !f2.is_finite() || !self.f1.is_finite() {
            return Finish::at(Status::NonFinite, x, f2);
        }
        if f2.abs() <= ctx.tol.f_abs {
            return Finish::at(Status::ConvergedResidual, x, f2);
        }
        if f2 == self.f1 {
            return Finish::at(Status::Flat, x, f2);
        }
        let x3 = self.x2 - f2 * (self.x2 - self.x1) / (f2 - self.f1);
        if !x3.is_finite() {
            return Finish::at(Status::Diverging, x, f2);
        }
        if (x3 - self.x2).abs() < ctx.tol.x_tol(x3) || x3 == self.x2 {
            return Ask::Done(Finish {
                status: Status::ConvergedStep,
                root: x3,
                residual: f2,
                residual_at: self.x2,
                step: (x3 - self.x2).abs(),
            });
        }
        self.x1 = self.x2;
        self.f1 = f2;
        self.x2 = x3;
        Ask::Eval(x3, StepKind::Secant)
    }

    fn bracket(&self) -> Option<(f64, f64)> {
        None
    }

    fn iterations(&self) -> usize {
        self.iterations
    }
}
