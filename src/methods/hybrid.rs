//! The bracketing hybrid that cannot diverge, with a bound on its evaluations.

use super::bracket::{midpoint, Gap, Sought, WallSeek};
use crate::driver::{Ask, Context, Finish, ScalarMethod};
use crate::outcome::{Status, StepKind};

/// The bracketing hybrid: Chandrupatla's inverse quadratic steps, steps for multiple
/// roots, a scale-aware split, a probe at zero, and a schedule that never lets it need
/// more than bisection's count plus [`SLACK`] + 1 evaluations.
///
/// Chosen by measurement (`examples/bench_methods.rs`, side by side with SciPy's
/// `find_root`, `brentq` and `toms748` under one stopping rule): fewer evaluations than
/// each of them on the Alefeld–Potra–Shi set (both copies of its left ends), on
/// Chandrupatla's set and on our engineering set (`tests/fixtures/engineering.rs`).
///
/// Algorithm. Keep a bracket between x1 (the newest end) and x2 with f(x1)·f(x2) < 0, and
/// x3, the end dropped last. Each step picks a preferred point, then the schedule may
/// move it:
/// - **Simple roots**: with ξ = (x1 − x2)/(x3 − x2) and Φ = (f1 − f2)/(f3 − f2), if
///   Φ² < ξ and (1 − Φ)² < 1 − ξ the inverse quadratic through the three points is
///   monotone over the bracket (Chandrupatla's test): take its zero, kept at least
///   tol(u) from both ends, so a point predicted within tol of an end lands where one
///   evaluation can close the bracket.
/// - **Multiple roots**: fit |f| = K·|x − r|^m to the three points (x1 and x3 on one
///   side, x2 on the other; [`power_exponent`]). When m ≥ [`MULTIPLE_FROM`] at two
///   successive steps (within [`EXPONENTS_AGREE`]), the same test and step run on
///   g = sign(f)·|f|^(1/m), which has a simple root where f has a root of multiplicity
///   m, or the secant on g when the test fails. A triple root then takes a handful of
///   steps instead of bisection's fifty.
/// - **Otherwise split**: the midpoint for ends of similar magnitude; for ends of one
///   sign more than a factor of 8 apart, the midpoint of their binary representations
///   (near the geometric mean); across zero with ends more than a factor of 1000 apart,
///   zero itself. An interpolated point very near zero inside a bracket across zero is
///   replaced by zero: relative convergence towards a root at zero never ends, and one
///   evaluation there either ends the solve or becomes an end.
/// - **Schedule** (the safeguard of ITP: I. F. D. Oliveira and R. H. C. Takahashi, "An
///   enhancement of the bisection method average performance preserving minmax
///   optimality", ACM TOMS 47(1), 2020): with W the width when the bracket was first
///   known, the k-th point after that is moved into [hi − A_k, lo + A_k] with
///   A_k = W·2^(SLACK − k), the points after which either part of the bracket is at most
///   A_k wide. There is no halving guard: a step is never forced to the midpoint while
///   interpolation keeps within the schedule. In particular none is forced once |f(u)|
///   has fallen to the rounding level of f at u, which we take to be the change of f
///   over one tolerance step, |s|·tol(u) with s the secant slope across the bracket:
///   the interpolated point then lies within tol(u) of u, the clamp puts it tol(u)
///   away on the far side, and that one evaluation closes the bracket within the
///   tolerance (a `bracket` certificate, checked by the driver like any other).
///
/// **Bound.** Let f have one sign change in [a, b] and no NaN there (infinite values
/// are allowed), and x_rel ≤ 1/8. Then the hybrid needs at most N + SLACK + 1
/// evaluations, N being what bisection needs on the same f, both counts including the
/// two ends. Proof: the schedule keeps the invariant w_k ≤ A_k for the width after the
/// k-th point, since the new bracket is one of [lo, x] and [x, hi], both at most A_k
/// wide for x in [hi − A_k, lo + A_k]; that interval is not empty because
/// w_(k−1) ≤ A_(k−1) = 2·A_k (when rounding makes it so, the midpoint is taken, which
/// keeps the invariant). Bisection stops after n = N − 2 halvings, when
/// W·2^(−n) ≤ 2·tol(m_b), m_b the midpoint of its last bracket, or when no float lies
/// between its ends. After k = n + SLACK + 1 points, ours is at most
/// W·2^(−n−1) ≤ tol(m_b) wide (or its ends are adjacent floats too). Both brackets
/// contain the sign change, so |u − m_b| ≤ 2·tol(m_b) and
/// tol(u) ≥ tol(m_b)·(1 − 2·x_rel) ≥ tol(m_b)/2: our stop, width ≤ 2·tol(u), holds.
/// Ending earlier (an exact zero, a closed bracket) only lowers the count. The bound
/// is in exact arithmetic; points a few units in the last place apart round, and a
/// test checks the bound on functions built to defeat interpolation
/// (`tests/fixtures/interpolation_traps.rs`). A gap of NaN inside the bracket suspends
/// the schedule, which starts again once the bracket is free of it.
///
/// - NaN at a new point (a hole in the function's domain inside the bracket): the
///   defined stretches beside the undefined gap are halved ([`Gap`]) until the bracket
///   is free of it again or both walls are located, which ends as
///   [`Status::Discontinuity`]. NaN at one end: the search moves in from it
///   ([`WallSeek`]). Infinite values keep their sign: they may be ends of the bracket,
///   and the interpolation then gives way to a split.
/// - Order of convergence: about 1.839 (inverse quadratic) near a simple root, and on
///   g near a root of known odd multiplicity; linear, one split per evaluation, where
///   neither applies; it cannot diverge.
/// - Evaluations: two for the ends (none with [`Hybrid::from_points`]), then one per
///   iteration.
/// - Stops when the bracket is within 2·tol(u) (`tol(x) = x_abs + x_rel·|x|`), when no
///   float lies strictly between its ends, on |f(u)| ≤ f_abs, or on f(u) = 0 exactly; the
///   root returned is u, the end with the smaller |f|. The driver certifies the claim
///   ([`crate::certificate`]).
/// - Every point asked for lies strictly inside the current bracket, which only shrinks,
///   so no point is evaluated twice and the bounds of the unknown are respected.
/// - References: T. R. Chandrupatla, "A new hybrid quadratic/bisection algorithm for
///   finding the zero of a nonlinear function without using derivatives", Advances in
///   Engineering Software 28(3), 1997, pp. 145–149; Oliveira & Takahashi (above) for the
///   schedule. The split, the zero probe and the multiple-root step are this project's.
///
/// ```
/// use tacit::{solve, MethodKind, Options, Start};
/// let options = Options { method: MethodKind::Hybrid, ..Options::default() };
/// let s = solve(Start::Bracket(0.0, 2.0), &options, |x| x * x - 2.0).unwrap();
/// assert!(s.converged);
/// assert!((s.root - 2f64.sqrt()).abs() < 1e-11);
/// // A triple root: far fewer evaluations than bisection's 43 at this tolerance.
/// let s = solve(Start::Bracket(0.0, 3.0), &options, |x| (x - 1.2f64).powi(3)).unwrap();
/// assert!(s.converged && s.evaluations < 25, "{}", s.evaluations);
/// let bisection = Options { method: MethodKind::Bisection, ..options };
/// let b = solve(Start::Bracket(0.0, 3.0), &bisection, |x| (x - 1.2f64).powi(3)).unwrap();
/// assert_eq!(b.evaluations, 43);
/// ```
#[derive(Debug, Clone)]
pub struct Hybrid {
    x1: f64,
    f1: f64,
    x2: f64,
    f2: f64,
    /// The end dropped last, when there is one.
    x3: Option<(f64, f64)>,
    phase: Phase,
    iterations: usize,
    /// The schedule that bounds the evaluations: the width the bracket had when it
    /// started, and the evaluations asked for since.
    start_width: f64,
    scheduled: i32,
    /// The power-law exponent estimated at the last interpolation, if a multiple root's.
    exponent: Option<f64>,
    /// Where f is undefined inside the bracket.
    gap: Option<Gap>,
    /// Searching in from an undefined end for a value of the other sign.
    seek: Option<WallSeek>,
}

#[derive(Debug, Clone, Copy, PartialEq, Eq)]
enum Phase {
    NeedFirst,
    NeedSecond,
    /// Both ends known; nothing asked yet.
    Ready,
    Running,
}

impl Hybrid {
    /// Starts from two ends, evaluated first.
    pub fn new(a: f64, b: f64) -> Hybrid {
        Hybrid {
            x1: a,
            f1: f64::NAN,
            x2: b,
            f2: f64::NAN,
            x3: None,
            phase: Phase::NeedFirst,
            iterations: 0,
            start_width: f64::INFINITY,
            scheduled: 0,
            exponent: None,
            gap: None,
            seek: None,
        }
    }

    /// Starts from an already evaluated sign-change bracket (fa, fb of opposite signs,
    /// either may be infinite), without evaluating a or b again. `others` are further
    /// evaluated points: one inside the bracket narrows it (a NaN one marks a gap); the
    /// nearest finite one outside serves the interpolation. None of them is evaluated
    /// again.
    pub fn from_points(a: f64, fa: f64, b: f64, fb: f64, others: &[(f64, f64)]) -> Hybrid {
        let mut h = Hybrid::new(a, b);
        h.f1 = fa;
        h.f2 = fb;
        h.phase = Phase::Ready;
        if !super::opposite(fa, fb) {
            return h; // `check_start` reports it.
        }
        let (mut lo, mut flo, mut hi, mut fhi) = if a <= b {
            (a, fa, b, fb)
        } else {
            (b, fb, a, fa)
        };
        let mut undefined: Vec<f64> = Vec::new();
        for &(x, fx) in others {
            if x > lo && x < hi {
                if fx.is_nan() {
                    undefined.push(x);
                } else if fx.signum() == flo.signum() && fx != 0.0 {
                    lo = x;
                    flo = fx;
                } else {
                    // Same sign as the upper end, or an exact zero (which ends the solve).
                    hi = x;
                    fhi = fx;
                }
            }
        }
        for x in undefined.into_iter().filter(|&x| x > lo && x < hi) {
            match h.gap.as_mut() {
                Some(g) => g.widen(x),
                None => h.gap = Some(Gap::at(x)),
            }
        }
        let nearest = others
            .iter()
            .copied()
            .filter(|&(x, fx)| x.is_finite() && fx.is_finite() && (x < lo || x > hi))
            .min_by(|p, q| gap(p.0, lo, hi).total_cmp(&gap(q.0, lo, hi)));
        // x1 is the end next to x3, as after a step of the method itself.
        match nearest {
            Some((x, _)) if x > hi => {
                (h.x1, h.f1, h.x2, h.f2) = (hi, fhi, lo, flo);
            }
            _ => {
                (h.x1, h.f1, h.x2, h.f2) = (lo, flo, hi, fhi);
            }
        }
        h.x3 = nearest;
        h
    }

    fn ends(&self) -> (f64, f64) {
        (self.x1.min(self.x2), self.x1.max(self.x2))
    }

    /// The end with the smaller |f|.
    fn best(&self) -> (f64, f64) {
        if self.f1.abs() < self.f2.abs() {
            (self.x1, self.f1)
        } else {
            (self.x2, self.f2)
        }
    }

    /// Checks the two ends once both are known.
    fn check_start(&mut self, ctx: &Context) -> Ask {
        if let Some(seek) = WallSeek::from_ends((self.x1, self.f1), (self.x2, self.f2)) {
            self.seek = Some(seek);
            return self.seek_next(ctx);
        }
        if let Some(done) = super::check_bracket_ends((self.x1, self.f1), (self.x2, self.f2)) {
            return done;
        }
        self.restart_schedule();
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

    /// Takes the value at a new point strictly inside the bracket.
    fn update(&mut self, xt: f64, ft: f64) {
        if ft.signum() == self.f1.signum() {
            self.x3 = Some((self.x1, self.f1));
        } else {
            self.x3 = Some((self.x2, self.f2));
            self.x2 = self.x1;
            self.f2 = self.f1;
        }
        self.x1 = xt;
        self.f1 = ft;
        let (lo, hi) = self.ends();
        self.gap = self.gap.and_then(|g| g.within(lo, hi));
    }

    /// Starts the schedule that bounds the evaluations at the current bracket.
    fn restart_schedule(&mut self) {
        let (lo, hi) = self.ends();
        self.start_width = hi - lo;
        self.scheduled = 0;
    }

    /// Stops, or asks for the next point.
    fn next(&mut self, ctx: &Context) -> Ask {
        let (u, fu) = self.best();
        if fu == 0.0 {
            return Finish::at(Status::ExactZero, u, fu);
        }
        if fu.abs() <= ctx.tol.f_abs {
            return Finish::at(Status::ConvergedResidual, u, fu);
        }
        let (lo, hi) = self.ends();
        if let Some(gap) = self.gap {
            // The schedule starts again once the bracket is free of the gap.
            self.scheduled = -1;
            return match gap.next_point(lo, hi, |m| ctx.tol.x_tol(m)) {
                Some(m) => Ask::Eval(m, StepKind::Backtrack),
                None => Finish::at(Status::Discontinuity, u, fu),
            };
        }
        if self.scheduled < 0 {
            self.restart_schedule();
        }
        let width = hi - lo;
        let mid = midpoint(lo, hi);
        let tol = ctx.tol.x_tol(u);
        if mid <= lo || mid >= hi || width <= 2.0 * tol {
            return Finish::at(Status::ConvergedStep, u, fu);
        }
        let (mut x, kind) = self
            .interpolate(ctx)
            .unwrap_or_else(|| (split_point(lo, hi), StepKind::Bisection));
        if lo < 0.0 && hi > 0.0 && x != 0.0 && x.abs() < 0.01 * hi.min(-lo) {
            x = 0.0;
        }
        self.scheduled += 1;
        x = project(x, lo, hi, allowed_width(self.start_width, self.scheduled));
        if !(x > lo && x < hi) {
            x = mid;
        }
        Ask::Eval(x, kind)
    }

    /// The interpolated point, with its kind, or None to split instead. Near a simple
    /// root: the inverse quadratic when Chandrupatla's test accepts it. Where the three
    /// points follow a power law of exponent m ≥ [`MULTIPLE_FROM`] (a multiple root, or
    /// f flat on one side), the same on g = sign(f)·|f|^(1/m), which has a simple root
    /// there, or the secant on g. A point within tol of an end is moved to tol from
    /// it, so that one evaluation can close the bracket.
    fn interpolate(&mut self, ctx: &Context) -> Option<(f64, StepKind)> {
        let (x3, f3) = self.x3?;
        let (x1, f1, x2, f2) = (self.x1, self.f1, self.x2, self.f2);
        if !(f1.is_finite() && f2.is_finite() && f3.is_finite()) {
            return None;
        }
        let estimate = power_exponent((x1, f1), (x2, f2), (x3, f3)).filter(|&m| m >= MULTIPLE_FROM);
        let previous = std::mem::replace(&mut self.exponent, estimate);
        let m = match (estimate, previous) {
            (Some(m), Some(p)) if (m / p - 1.0).abs() <= EXPONENTS_AGREE => Some(m),
            _ => None,
        };
        let (g1, g2, g3) = match m {
            Some(m) => (root_of(f1, m), root_of(f2, m), root_of(f3, m)),
            None => (f1, f2, f3),
        };
        let (t, kind) = match chandrupatla_t((x1, g1), (x2, g2), (x3, g3)) {
            Some(t) => (t, StepKind::InverseQuadratic),
            None if m.is_some() => (g1 / (g1 - g2), StepKind::Secant),
            None => return None,
        };
        if !t.is_finite() {
            return None;
        }
        // Kept tol from both ends: a point predicted within tol of x1 goes to x1 ± tol,
        // where one evaluation can close the bracket.
        let tl = (ctx.tol.x_tol(self.best().0) / (x2 - x1).abs()).min(0.5);
        Some((x1 + t.clamp(tl, 1.0 - tl) * (x2 - x1), kind))
    }
}

/// Power laws of exponent at least this are treated as multiple roots.
pub const MULTIPLE_FROM: f64 = 2.5;

/// Two successive exponent estimates must agree within this fraction before the
/// multiple-root step is taken: a curved simple root can look like a power law once,
/// a multiple root does so every time.
pub const EXPONENTS_AGREE: f64 = 0.5;

/// Evaluations beyond bisection's count the schedule allows, less one (n₀ of ITP).
pub const SLACK: i32 = 5;

/// The widest the bracket may be after the `k`-th scheduled evaluation: bisection's
/// width after k − [`SLACK`] halvings of the starting width.
fn allowed_width(start: f64, k: i32) -> f64 {
    start * 2f64.powi(SLACK - k)
}

/// Moves x into [hi − allowed, lo + allowed], the points after which either part of the
/// bracket is at most `allowed` wide (the midpoint when rounding leaves none).
fn project(x: f64, lo: f64, hi: f64, allowed: f64) -> f64 {
    if allowed >= hi - lo {
        return x;
    }
    let (left, right) = (hi - allowed, lo + allowed);
    if left > right {
        midpoint(lo, hi)
    } else {
        x.clamp(left, right)
    }
}

/// sign(f)·|f|^(1/m).
fn root_of(f: f64, m: f64) -> f64 {
    f.signum() * f.abs().powf(1.0 / m)
}

/// Chandrupatla's test and step: with x1 the newest end, x2 the other end and x3 the
/// end dropped last, the inverse quadratic through the three points when it is monotone
/// over the bracket, as the fraction t of the way from x1 to x2; None otherwise.
fn chandrupatla_t(p1: (f64, f64), p2: (f64, f64), p3: (f64, f64)) -> Option<f64> {
    let ((x1, f1), (x2, f2), (x3, f3)) = (p1, p2, p3);
    let xi = (x1 - x2) / (x3 - x2);
    let phi = (f1 - f2) / (f3 - f2);
    if !(phi * phi < xi && (1.0 - phi) * (1.0 - phi) < 1.0 - xi) {
        return None;
    }
    let t =
        f1 / (f2 - f1) * f3 / (f2 - f3) + (x3 - x1) / (x2 - x1) * f1 / (f3 - f1) * f2 / (f3 - f2);
    t.is_finite().then_some(t)
}

/// The exponent m of the power law |f| = K·|x − r|^m through three points: x1 and x3 on
/// one side of the root (|f3| > |f1|, x3 farther out), x2 on the other, with r where the
/// secant on |f|^(1/m) between x1 and x2 crosses zero. Solved by bisection on ln m
/// over [1.5, 64]; None when there is no such exponent in that range.
fn power_exponent(p1: (f64, f64), p2: (f64, f64), p3: (f64, f64)) -> Option<f64> {
    let ((x1, f1), (x2, f2), (x3, f3)) = (p1, p2, p3);
    let ratio31 = (f3 / f1).abs();
    let ratio12 = (f1 / f2).abs();
    let outside = (x3 - x1) * (x2 - x1) < 0.0;
    if !(outside && ratio31 > 1.0 && ratio31.is_finite() && ratio12 > 0.0 && ratio12.is_finite()) {
        return None;
    }
    let l31 = ratio31.ln();
    let mismatch = |m: f64| {
        let q = ratio12.powf(1.0 / m);
        let r = x1 + (x2 - x1) * (q / (1.0 + q));
        m * ((x3 - r).abs() / (x1 - r).abs()).ln() - l31
    };
    let (mut a, mut b) = (1.5f64.ln(), 64f64.ln());
    let (fa, fb) = (mismatch(a.exp()), mismatch(b.exp()));
    if !(fa.is_finite() && fb.is_finite()) || (fa < 0.0) == (fb < 0.0) {
        return None;
    }
    for _ in 0..40 {
        let c = 0.5 * (a + b);
        let fc = mismatch(c.exp());
        if !fc.is_finite() {
            return None;
        }
        if (fc < 0.0) == (fa < 0.0) {
            a = c;
        } else {
            b = c;
        }
    }
    Some((0.5 * (a + b)).exp())
}

impl ScalarMethod for Hybrid {
    fn step(&mut self, told: Option<(f64, f64)>, ctx: &Context) -> Ask {
        match (self.phase, told) {
            (Phase::NeedFirst, None) => {
                self.phase = Phase::NeedSecond;
                Ask::Eval(self.x1, StepKind::Initial)
            }
            (Phase::NeedSecond, Some((x, fx))) => {
                self.x1 = x;
                self.f1 = fx;
                if fx == 0.0 {
                    self.phase = Phase::Running;
                    return Finish::at(Status::ExactZero, x, fx);
                }
                self.phase = Phase::Ready;
                Ask::Eval(self.x2, StepKind::Initial)
            }
            (Phase::Ready, told) => {
                if let Some((x, fx)) = told {
                    self.x2 = x;
                    self.f2 = fx;
                }
                self.phase = Phase::Running;
                self.check_start(ctx)
            }
            (Phase::Running, Some((x, fx))) => {
                self.iterations += 1;
                if let Some(seek) = self.seek.as_mut() {
                    match seek.tell(x, fx) {
                        Sought::Continue => return self.seek_next(ctx),
                        Sought::Zero(z) => return Finish::at(Status::ExactZero, z, 0.0),
                        Sought::Bracket((xa, fa), (xb, fb)) => {
                            self.seek = None;
                            (self.x1, self.f1, self.x2, self.f2) = (xa, fa, xb, fb);
                            self.x3 = None;
                            self.restart_schedule();
                            return self.next(ctx);
                        }
                    }
                }
                if fx.is_nan() {
                    // No sign: the bracket stays, the gap grows, the dropped end stays.
                    match self.gap.as_mut() {
                        Some(g) => g.widen(x),
                        None => self.gap = Some(Gap::at(x)),
                    }
                    return self.next(ctx);
                }
                self.update(x, fx);
                self.next(ctx)
            }
            (_, _) => {
                let (u, fu) = self.best();
                Finish::at(Status::NonFinite, u, fu)
            }
        }
    }

    fn bracket(&self) -> Option<(f64, f64)> {
        let known = matches!(self.phase, Phase::Ready | Phase::Running);
        if known && super::opposite(self.f1, self.f2) {
            Some(self.ends())
        } else {
            None
        }
    }

    fn iterations(&self) -> usize {
        self.iterations
    }
}

/// Distance from x to the bracket [lo, hi] (x outside it).
fn gap(x: f64, lo: f64, hi: f64) -> f64 {
    if x < lo {
        lo - x
    } else {
        x - hi
    }
}

/// Where to split [a, b] (a < b): the midpoint for ends of similar magnitude; for ends of
/// one sign more than a factor of 8 apart, the midpoint of their binary representations
/// (near the geometric mean); across zero with ends more than a factor of 1000 apart, zero.
fn split_point(a: f64, b: f64) -> f64 {
    let m = midpoint(a, b);
    if a == 0.0 || b == 0.0 {
        return m;
    }
    let (small, large) = (a.abs().min(b.abs()), a.abs().max(b.abs()));
    if a < 0.0 && b > 0.0 {
        return if large > 1000.0 * small { 0.0 } else { m };
    }
    if large <= 8.0 * small {
        return m;
    }
    let c = from_ordered((to_ordered(a) >> 1) + (to_ordered(b) >> 1));
    if c > a && c < b {
        c
    } else {
        m
    }
}

/// Maps floats to integers in the same order (−0 and +0 both to 0).
fn to_ordered(x: f64) -> i64 {
    let bits = x.to_bits() as i64;
    if bits < 0 {
        -(bits & i64::MAX)
    } else {
        bits
    }
}

fn from_ordered(k: i64) -> f64 {
    if k < 0 {
        f64::from_bits(k.unsigned_abs() | (1u64 << 63))
    } else {
        f64::from_bits(k as u64)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn ordered_round_trip() {
        for x in [-1e4, -1.0, 0.0, 1e-300, 1.5, 3e10] {
            assert_eq!(from_ordered(to_ordered(x)), x);
        }
    }

    #[test]
    fn split_points() {
        // Same sign, six decades each side of 1: near the geometric mean.
        let c = split_point(1e-6, 1e6);
        assert!(c > 0.5 && c < 2.0, "{c}");
        // Similar magnitudes: the midpoint.
        assert_eq!(split_point(1.0, 2.0), 1.5);
        assert_eq!(split_point(-9.0, 31.0), 11.0);
        // Across zero, very different magnitudes: zero.
        assert_eq!(split_point(-1e4, 1e-4), 0.0);
        // One end at zero: the midpoint.
        assert_eq!(split_point(0.0, 1.0), 0.5);
        // Ends near the largest float: no overflow.
        assert_eq!(split_point(-f64::MAX, f64::MAX), 0.0);
    }
}
