//! The default method for two guesses with no bracket.

use crate::driver::{Ask, Context, Finish, ScalarMethod};
use crate::methods::hybrid::Hybrid;
use crate::outcome::{Status, StepKind};

/// Secant steps counted as unproductive in a row before the secant phase is abandoned.
const MAX_UNPRODUCTIVE: usize = 3;
/// Halvings towards the last good point after one non-finite value.
const MAX_BACKOFFS_IN_A_ROW: usize = 10;
/// Halvings towards a non-finite value, over the whole solve, before the secant phase
/// gives way to the bracket search.
const MAX_BACKOFFS_TOTAL: usize = 30;
/// Evaluations the outward bracket search may spend.
const SEARCH_EVALS: usize = 60;
/// Each outward step is this many times the previous one.
const SEARCH_GROWTH: f64 = 2.0;
/// A secant iteration that settles with no sign change is accepted as a touching root
/// when |f| there is at most this fraction of the largest |f| seen.
pub const TOUCH_REL: f64 = 1e-10;
/// Steps a quarter of the way to zero, per side, before the search crosses zero.
const MAX_TOWARDS_ZERO: usize = 3;
/// Halvings towards a non-finite value (a wall) on one side of the search.
const MAX_WALL_HALVINGS: usize = 10;
/// Confirming probes after a secant step within tolerance, before "stagnated".
const MAX_PROBES: usize = 2;
/// A secant step may be at most this many times the last step, plus
/// `JUMP_SCALE` times the size of the iterates.
const JUMP_STEPS: f64 = 100.0;
const JUMP_SCALE: f64 = 10.0;

#[derive(Debug, Clone, Copy, PartialEq)]
enum Side {
    Left,
    Right,
}

/// Why the last point was asked for.
#[derive(Debug, Clone, Copy, PartialEq)]
enum Purpose {
    Guess0,
    Guess1,
    Rescue,
    Secant,
    Probe,
    Backoff,
    /// Checking that an exact zero at the held point is not an underflowed plateau;
    /// the side is set when the zero came from the search.
    ZeroCheck(f64, Option<Side>),
    Search(Side),
    Inner,
}

/// What the secant phase saw when it was abandoned.
#[derive(Debug, Clone, Copy, PartialEq)]
enum Symptom {
    None,
    Diverging,
    Oscillating,
    Stagnated,
}

/// One side of the outward search.
#[derive(Debug, Clone, Copy)]
struct SearchSide {
    /// Outermost good point on this side, and |f| there.
    edge: f64,
    f_edge: f64,
    /// Whether the last step on this side made |f| smaller.
    improving: bool,
    /// Next outward step length.
    stride: f64,
    /// Nearest non-finite (or underflowed) point beyond `edge`, if any.
    wall: Option<f64>,
    wall_halvings: usize,
    /// Steps that went a quarter of the way to zero instead of crossing it.
    towards_zero: usize,
    open: bool,
}

/// The default for two guesses: secant steps while they make progress, the bracketing
/// hybrid from the moment a sign change is seen, and an outward bracket search when the
/// secant steps stop making progress.
///
/// Algorithm:
/// 1. Evaluate both guesses. A sign change hands both points to the bracketing hybrid
///    ([`crate::methods::hybrid::Hybrid::from_points`]) at once; so does every later
///    point that shows a sign change, with every point evaluated so far passed along
///    for interpolation, so nothing is evaluated twice.
/// 2. Secant steps x₂ = x₁ − f₁(x₁ − x₀)/(f₁ − f₀), each capped in length. A step is
///    productive when |f| shrinks and the step is at most half the step before last
///    (what a converging secant iteration does, superlinearly near a simple root and
///    with ratio ≈ 0.618 per step near a double root). After three unproductive steps
///    in a row the secant phase ends, noting the symptom: diverging (the iterates kept
///    moving away from the guesses: |x| grows while |f| does not shrink as a converging
///    iteration would) or oscillating (the steps kept changing direction).
/// 3. A secant step within the step tolerance is not taken as convergence: a probe just
///    past the estimate must show the sign change that confirms a root, and the hybrid
///    then closes the bracket. After two probes with no sign change the iteration has
///    settled on a touching (even-multiplicity) root or stagnated: it is accepted as
///    converged only when |f| there is at most 1e-10 of the largest |f| seen
///    ([`TOUCH_REL`]), and ends as "stagnated" otherwise.
/// 4. Non-finite values (a domain error) are met by halving back towards the last good
///    point, up to ten times in a row and thirty in all.
/// 5. Outward search from the guesses (from the good points, if a guess is not good):
///    steps that double each time (Numerical Recipes' geometric bracket expansion) on
///    the side with the smaller |f|, the other side getting every third turn; up to 60
///    evaluations, never past a bound. A side about to cross zero while its |f| falls
///    first looks a quarter of the way to zero, up to three times (roots of quantities
///    of one sign often lie at a smaller scale). A side that meets a non-finite value
///    halves towards it instead, up to ten times.
/// 6. An exact zero met outside a bracket is confirmed by one probe next to it (at
///    [`crate::certificate::zero_probe_step`]): if f is zero or underflowed there too,
///    the zero is a plateau (such as x·e⁻ˣ far out), not a root, and is treated like a
///    non-finite value.
/// 7. An infinite value has a sign: with a value of the other sign it is a bracket, and
///    the hybrid takes over (a cable tension whose residual is −∞ at the first guess).
///
/// Each failure ends with its own status: [`Status::Diverging`],
/// [`Status::Oscillating`], [`Status::Stagnated`], [`Status::NoSignChange`],
/// [`Status::NonFinite`], [`Status::StuckAtBound`], [`Status::Flat`] (every value seen
/// was the same), or [`Status::BudgetSpent`] (from the driver). It only reports
/// converged through the hybrid (a bracket within tolerance), on the residual tolerance,
/// at a touching root that passes the test of step 3, or at an exact zero (confirmed as
/// in step 6 unless it is one of the guesses).
///
/// - Order of convergence: the secant's (1 + √5)/2 ≈ 1.618 near a simple root, then
///   that of the hybrid once a bracket is known.
/// - Evaluations: the two guesses, then exactly one per step.
/// - With `is_bracket`, the two points are taken as a bracket: no secant phase and no
///   search outside them (a missing sign change ends as [`Status::NoSignChange`]); a
///   non-finite end is backed off from, inside the bracket.
/// - References: the secant method, Süli & Mayers, *An Introduction to Numerical
///   Analysis* (2003) §1.5; switching to a bracketing method on a sign change, Brent,
///   *Algorithms for Minimization without Derivatives* (1973) ch. 4; geometric bracket
///   expansion, Press et al., *Numerical Recipes* (3rd ed., 2007) §9.1.
///
/// ```
/// use tacit::{solve, MethodKind, Options, Start};
/// let options = Options { method: MethodKind::Auto, ..Options::default() };
/// // The plain secant runs away from 2, 3 on x·e⁻ˣ; the default finds the root at 0.
/// let s = solve(Start::Guesses(2.0, 3.0), &options, |x| x * (-x).exp()).unwrap();
/// assert!(s.converged);
/// assert!(s.root.abs() < 1e-12);
/// ```
pub struct Auto {
    a: f64,
    b: f64,
    is_bracket: bool,
    /// Every evaluated point, in order.
    points: Vec<(f64, f64)>,
    purpose: Purpose,
    // Secant phase: (x0, f0) older, (x1, f1) newer, both good.
    x0: f64,
    f0: f64,
    x1: f64,
    f1: f64,
    /// |dx| of the last two steps, newest first.
    steps: [f64; 2],
    last_dx: f64,
    unproductive: usize,
    moving_away: usize,
    alternating: usize,
    probes: usize,
    /// The secant step found within tolerance, for the claim of a touching root.
    small_step: f64,
    backoffs_in_a_row: usize,
    backoffs_total: usize,
    backoff_good: (f64, f64),
    backoff_bad: f64,
    pressed_bound: usize,
    symptom: Symptom,
    nonfinite_seen: bool,
    plateau_seen: bool,
    bound_hit: bool,
    rescue_k: usize,
    // Search phase.
    left: SearchSide,
    right: SearchSide,
    last_side: Side,
    /// Evaluations in a row on `last_side`, to give the other side a turn after two.
    same_side_run: usize,
    search_evals: usize,
    inner: Option<Box<dyn ScalarMethod>>,
    iterations: usize,
}

/// A value the method can use: finite and not zero (zeros are handled on arrival).
fn good(f: f64) -> bool {
    f.is_finite() && f != 0.0
}

/// Fractions of [a, b] tried when both guesses are non-finite.
const RESCUE: [f64; 7] = [0.5, 0.25, 0.75, 0.125, 0.375, 0.625, 0.875];

impl Auto {
    pub fn new(a: f64, b: f64, is_bracket: bool) -> Auto {
        let closed = SearchSide {
            edge: f64::NAN,
            f_edge: f64::NAN,
            improving: false,
            stride: 0.0,
            wall: None,
            wall_halvings: 0,
            towards_zero: 0,
            open: false,
        };
        Auto {
            a,
            b,
            is_bracket,
            points: Vec::new(),
            purpose: Purpose::Guess0,
            x0: f64::NAN,
            f0: f64::NAN,
            x1: f64::NAN,
            f1: f64::NAN,
            steps: [(b - a).abs(), f64::INFINITY],
            last_dx: b - a,
            unproductive: 0,
            moving_away: 0,
            alternating: 0,
            probes: 0,
            small_step: f64::NAN,
            backoffs_in_a_row: 0,
            backoffs_total: 0,
            backoff_good: (f64::NAN, f64::NAN),
            backoff_bad: f64::NAN,
            pressed_bound: 0,
            symptom: Symptom::None,
            nonfinite_seen: false,
            plateau_seen: false,
            bound_hit: false,
            rescue_k: 0,
            left: closed,
            right: closed,
            last_side: Side::Left,
            same_side_run: 0,
            search_evals: 0,
            inner: None,
            iterations: 0,
        }
    }

    fn lookup(&self, x: f64) -> Option<f64> {
        self.points
            .iter()
            .find(|&&(t, _)| t == x)
            .map(|&(_, fx)| fx)
    }

    fn seen(&self, x: f64) -> bool {
        self.lookup(x).is_some()
    }

    /// The good point with the smallest |f|, else the first point.
    fn best(&self) -> (f64, f64) {
        self.points
            .iter()
            .copied()
            .filter(|&(_, f)| good(f))
            .min_by(|p, q| p.1.abs().total_cmp(&q.1.abs()))
            .or_else(|| self.points.first().copied())
            .unwrap_or((self.a, f64::NAN))
    }

    fn ask(&mut self, x: f64, kind: StepKind, purpose: Purpose) -> Ask {
        self.purpose = purpose;
        Ask::Eval(x, kind)
    }

    /// Hands over to the bracketing hybrid if the newest good point (x, fx) makes a
    /// sign change with an earlier one.
    fn try_bracket(&mut self, x: f64, fx: f64, ctx: &Context) -> Option<Ask> {
        let mut partner: Option<(f64, f64)> = None;
        for &(t, ft) in &self.points {
            if ft != 0.0 && super::opposite(ft, fx) && t != x {
                // The nearest opposite-sign point gives the tightest bracket, since no
                // sign change existed before this point arrived.
                if partner.is_none_or(|(p, _)| (t - x).abs() < (p - x).abs()) {
                    partner = Some((t, ft));
                }
            }
        }
        let (xo, fo) = partner?;
        let others: Vec<(f64, f64)> = self
            .points
            .iter()
            .copied()
            .filter(|&(t, ft)| ft != 0.0 && t != x && t != xo)
            .collect();
        let mut inner = bracketing(x, fx, xo, fo, &others);
        let ask = inner.step(None, ctx);
        self.inner = Some(inner);
        Some(self.forward(ask, ctx))
    }

    /// Passes the hybrid's request on, answering from memory any point already evaluated.
    fn forward(&mut self, mut ask: Ask, ctx: &Context) -> Ask {
        for _ in 0..10_000 {
            match ask {
                Ask::Eval(x, kind) => match (self.lookup(x), self.inner.as_mut()) {
                    (Some(fx), Some(inner)) => ask = inner.step(Some((x, fx)), ctx),
                    _ => return self.ask(x, kind, Purpose::Inner),
                },
                done => return done,
            }
        }
        let (x, fx) = self.best();
        Finish::at(Status::Stagnated, x, fx)
    }

    /// The next secant step from (x0, f0) and (x1, f1), or the switch to the search.
    fn secant_next(&mut self, ctx: &Context) -> Ask {
        let (x0, f0, x1, f1) = (self.x0, self.f0, self.x1, self.f1);
        if f1 == f0 {
            // Equal values: the secant line is flat. Far below the scale of f seen, that
            // is rounding noise at a root (claimed, for the driver to check beyond it);
            // otherwise a plateau to search past.
            if f1.abs() <= TOUCH_REL * self.largest_good() {
                self.small_step = (x1 - x0).abs();
                return self.stagnated();
            }
            return self.start_search(ctx);
        }
        let mut x2 = x1 - f1 * ((x1 - x0) / (f1 - f0));
        if !x2.is_finite() {
            return self.start_search(ctx);
        }
        let cap = JUMP_STEPS * (x1 - x0).abs() + JUMP_SCALE * x0.abs().max(x1.abs());
        if (x2 - x1).abs() > cap {
            x2 = x1 + cap.copysign(x2 - x1);
        }
        let tol = ctx.tol.x_tol(x2);
        if (x2 - x1).abs() <= tol {
            return self.probe(x2, tol, ctx);
        }
        if !ctx.bounds.contains(x2) {
            let at_bound = ctx.bounds.clamp(x2);
            if !self.seen(at_bound) {
                x2 = at_bound;
            } else {
                self.pressed_bound += 1;
                x2 = x1 + (at_bound - x1) / 2.0;
                if self.pressed_bound >= 2 || x2 == x1 {
                    self.bound_hit = true;
                    return self.start_search(ctx);
                }
            }
        }
        if self.seen(x2) {
            return self.start_search(ctx);
        }
        self.ask(x2, StepKind::Secant, Purpose::Secant)
    }

    /// A secant step within tolerance: look just past the estimate for the sign change
    /// that confirms the root.
    fn probe(&mut self, x2: f64, tol: f64, ctx: &Context) -> Ask {
        let dir = if x2 != self.x1 {
            x2 - self.x1
        } else {
            self.x1 - self.x0
        };
        let t = tol
            .max(4.0 * f64::EPSILON * x2.abs())
            .max(f64::MIN_POSITIVE);
        let p = ctx.bounds.clamp(x2 + t.copysign(dir));
        self.small_step = (x2 - self.x1).abs().max(t);
        if self.probes >= MAX_PROBES || self.seen(p) || !p.is_finite() {
            return self.stagnated();
        }
        self.ask(p, StepKind::Secant, Purpose::Probe)
    }

    /// Secant steps within tolerance, but no sign change around them. That is claimed
    /// as a touching (even-multiplicity) root when |f| has fallen to [`TOUCH_REL`] of the
    /// largest |f| seen (the driver then checks that |f| shrank with the steps), and is
    /// stagnation otherwise.
    /// The largest |f| among the good points seen.
    fn largest_good(&self) -> f64 {
        self.points
            .iter()
            .filter(|p| good(p.1))
            .fold(0.0f64, |m, p| m.max(p.1.abs()))
    }

    fn stagnated(&mut self) -> Ask {
        self.symptom = Symptom::Stagnated;
        let (x, fx) = self.best();
        let largest = self.largest_good();
        let status = if fx.abs() <= TOUCH_REL * largest {
            Status::ConvergedStep
        } else {
            Status::Stagnated
        };
        Finish::stepped(status, x, fx, self.small_step)
    }

    /// A good value arrived from a secant step or probe, with no sign change.
    fn secant_told(&mut self, x: f64, fx: f64, ctx: &Context) -> Ask {
        if self.purpose == Purpose::Probe {
            self.probes += 1;
            if self.probes >= MAX_PROBES {
                return self.stagnated();
            }
            self.shift(x, fx);
            return self.secant_next(ctx);
        }
        let dx = x - self.x1;
        let contracting = dx.abs() <= 0.5 * self.steps[1];
        let productive = fx.abs() < self.f1.abs() && contracting;
        let centre = 0.5 * (self.a + self.b);
        let away = (x - centre).abs() > (self.x1 - centre).abs();
        let turned = (dx < 0.0) != (self.last_dx < 0.0);
        if productive {
            self.unproductive = 0;
            self.moving_away = 0;
            self.alternating = 0;
        } else {
            self.unproductive += 1;
            self.moving_away = if away { self.moving_away + 1 } else { 0 };
            self.alternating = if turned { self.alternating + 1 } else { 0 };
        }
        self.steps = [dx.abs(), self.steps[0]];
        self.last_dx = dx;
        self.shift(x, fx);
        if self.unproductive >= MAX_UNPRODUCTIVE {
            self.symptom = if self.moving_away >= MAX_UNPRODUCTIVE {
                Symptom::Diverging
            } else if self.alternating >= MAX_UNPRODUCTIVE - 1 {
                Symptom::Oscillating
            } else {
                Symptom::None
            };
            return self.start_search(ctx);
        }
        self.secant_next(ctx)
    }

    fn shift(&mut self, x: f64, fx: f64) {
        self.x0 = self.x1;
        self.f0 = self.f1;
        self.x1 = x;
        self.f1 = fx;
    }

    /// Halve back from the non-finite point `bad` towards the good point `good_pt`.
    fn backoff(&mut self, good_pt: (f64, f64), bad: f64, ctx: &Context) -> Ask {
        self.nonfinite_seen = true;
        self.backoff_good = good_pt;
        self.backoff_bad = bad;
        let x = good_pt.0 + (bad - good_pt.0) / 2.0;
        if self.backoffs_in_a_row >= MAX_BACKOFFS_IN_A_ROW
            || self.backoffs_total >= MAX_BACKOFFS_TOTAL
            || x == good_pt.0
            || x == bad
            || self.seen(x)
        {
            return self.start_search(ctx);
        }
        self.backoffs_in_a_row += 1;
        self.backoffs_total += 1;
        self.ask(x, StepKind::Backtrack, Purpose::Backoff)
    }

    /// Begins the outward search for a sign change from the guesses (or, when a guess
    /// is not good, from the hull of the good points).
    fn start_search(&mut self, ctx: &Context) -> Ask {
        let guesses_good =
            self.points.len() >= 2 && good(self.points[0].1) && good(self.points[1].1);
        let (lo, hi) = if guesses_good {
            (self.a.min(self.b), self.a.max(self.b))
        } else {
            let goods = self.points.iter().filter(|p| good(p.1));
            let lo = goods.clone().map(|p| p.0).fold(f64::INFINITY, f64::min);
            let hi = goods.map(|p| p.0).fold(f64::NEG_INFINITY, f64::max);
            (lo, hi)
        };
        if lo.is_nan() || hi.is_nan() || lo > hi {
            return self.fail(ctx);
        }
        let stride = (hi - lo).max((self.b - self.a).abs());
        // Walls are the nearest bad points beyond the start; when the guesses are good
        // the secant phase may have left bad points far out, which also count.
        let wall_left = self
            .points
            .iter()
            .filter(|p| !good(p.1) && p.0 < lo)
            .map(|p| p.0)
            .fold(None, |w: Option<f64>, t| Some(w.map_or(t, |w| w.max(t))));
        let wall_right = self
            .points
            .iter()
            .filter(|p| !good(p.1) && p.0 > hi)
            .map(|p| p.0)
            .fold(None, |w: Option<f64>, t| Some(w.map_or(t, |w| w.min(t))));
        let f_at = |x: f64| self.lookup(x).unwrap_or(f64::NAN).abs();
        let (f_lo, f_hi) = (f_at(lo), f_at(hi));
        self.left = SearchSide {
            edge: lo,
            f_edge: f_lo,
            improving: true,
            stride,
            wall: wall_left,
            wall_halvings: 0,
            towards_zero: 0,
            open: !self.is_bracket || wall_left.is_some(),
        };
        self.right = SearchSide {
            edge: hi,
            f_edge: f_hi,
            improving: true,
            stride,
            wall: wall_right,
            wall_halvings: 0,
            towards_zero: 0,
            open: !self.is_bracket || wall_right.is_some(),
        };
        self.same_side_run = 0;
        self.search_next(ctx)
    }

    fn side_mut(&mut self, side: Side) -> &mut SearchSide {
        match side {
            Side::Left => &mut self.left,
            Side::Right => &mut self.right,
        }
    }

    fn search_next(&mut self, ctx: &Context) -> Ask {
        for _ in 0..1_000 {
            if self.search_evals >= SEARCH_EVALS || (!self.left.open && !self.right.open) {
                return self.fail(ctx);
            }
            // The side whose end has the smaller |f| goes first (Numerical Recipes'
            // rule), but after two turns in a row the other side gets one, so a side
            // where f only creeps towards zero (an asymptote) cannot take them all.
            let preferred = if self.left.f_edge <= self.right.f_edge {
                Side::Left
            } else {
                Side::Right
            };
            let wanted = if self.same_side_run >= 2 {
                match self.last_side {
                    Side::Left => Side::Right,
                    Side::Right => Side::Left,
                }
            } else {
                preferred
            };
            let side = match (wanted, self.left.open, self.right.open) {
                (Side::Left, true, _) | (Side::Right, true, false) => Side::Left,
                _ => Side::Right,
            };
            let bounds = ctx.bounds;
            let s = *self.side_mut(side);
            let x = if let Some(w) = s.wall {
                let x = s.edge + (w - s.edge) / 2.0;
                let st = self.side_mut(side);
                st.wall_halvings += 1;
                if st.wall_halvings > MAX_WALL_HALVINGS || x == s.edge || x == w {
                    st.open = false;
                    continue;
                }
                x
            } else {
                let mut x = match side {
                    Side::Left => s.edge - s.stride,
                    Side::Right => s.edge + s.stride,
                };
                let st = self.side_mut(side);
                if s.edge != 0.0
                    && (x < 0.0) != (s.edge < 0.0)
                    && st.improving
                    && st.towards_zero < MAX_TOWARDS_ZERO
                {
                    // Quantities of one sign (a diameter, a rate) often have their root
                    // at a smaller scale: while |f| keeps falling on this side, look a
                    // quarter of the way to zero before crossing it.
                    st.towards_zero += 1;
                    x = s.edge / 4.0;
                } else {
                    st.stride *= SEARCH_GROWTH;
                }
                if !x.is_finite() || !st.stride.is_finite() {
                    st.open = false;
                    continue;
                }
                if bounds.contains(x) {
                    x
                } else {
                    let xb = bounds.clamp(x);
                    if xb == s.edge || self.seen(xb) {
                        self.bound_hit = true;
                        self.side_mut(side).open = false;
                        continue;
                    }
                    xb
                }
            };
            if self.seen(x) {
                if s.wall.is_some() {
                    self.side_mut(side).open = false;
                }
                continue;
            }
            if side == self.last_side {
                self.same_side_run += 1;
            } else {
                self.last_side = side;
                self.same_side_run = 1;
            }
            self.search_evals += 1;
            let kind = if s.wall.is_some() {
                StepKind::Backtrack
            } else {
                StepKind::BracketSearch
            };
            return self.ask(x, kind, Purpose::Search(side));
        }
        self.fail(ctx)
    }

    fn search_told(&mut self, side: Side, x: f64, fx: f64, ctx: &Context) -> Ask {
        let st = self.side_mut(side);
        if good(fx) {
            st.improving = fx.abs() < st.f_edge;
            st.edge = x;
            st.f_edge = fx.abs();
        } else {
            st.wall = Some(x);
        }
        if !fx.is_finite() {
            self.nonfinite_seen = true;
        }
        self.search_next(ctx)
    }

    /// No sign change could be found: the most specific status observed.
    fn fail(&mut self, _ctx: &Context) -> Ask {
        // Runaway steps are called divergence only when the best point is also the
        // outermost one; a smallest |f| inside the explored range is a minimum that does
        // not reach zero, which the no-sign-change diagnosis describes.
        let (best_x, best_f) = self.best();
        let informative = || self.points.iter().filter(|&&(_, ft)| good(ft) && ft != 0.0);
        // Points beyond the best one, on either side, that are no better than it.
        let beyond_no_better = |side: f64| {
            informative().all(|&(t, ft)| (t - best_x) * side <= 0.0 || ft.abs() <= best_f.abs())
        };
        let outermost = beyond_no_better(1.0) || beyond_no_better(-1.0);
        let status = match self.symptom {
            Symptom::Diverging if outermost => Status::Diverging,
            Symptom::Oscillating => Status::Oscillating,
            _ if self.nonfinite_seen => Status::NonFinite,
            _ if self.bound_hit || self.pressed_bound > 0 => Status::StuckAtBound,
            Symptom::Stagnated => Status::Stagnated,
            Symptom::None | Symptom::Diverging => {
                let mut goods = self.points.iter().filter(|p| good(p.1));
                let first = goods.next().map(|p| p.1);
                if first.is_some() && goods.all(|p| Some(p.1) == first) {
                    Status::Flat
                } else {
                    Status::NoSignChange
                }
            }
        };
        let (x, fx) = self.best();
        Finish::at(status, x, fx)
    }

    /// Both guesses evaluated, no zero, no sign change.
    fn after_guesses(&mut self, ctx: &Context) -> Ask {
        let (a, fa) = self.points[0];
        let (b, fb) = self.points[1];
        match (good(fa), good(fb)) {
            (true, true) => {
                if self.is_bracket {
                    let (x, fx) = self.best();
                    return Finish::at(Status::NoSignChange, x, fx);
                }
                // The newer point is the one with the smaller |f|.
                let ((x0, f0), (x1, f1)) = if fa.abs() < fb.abs() {
                    ((b, fb), (a, fa))
                } else {
                    ((a, fa), (b, fb))
                };
                self.x0 = x0;
                self.f0 = f0;
                self.x1 = x1;
                self.f1 = f1;
                self.last_dx = x1 - x0;
                self.secant_next(ctx)
            }
            (true, false) if !self.is_bracket => self.backoff((a, fa), b, ctx),
            (false, true) if !self.is_bracket => self.backoff((b, fb), a, ctx),
            (true, false) | (false, true) => {
                self.nonfinite_seen = true;
                self.start_search(ctx)
            }
            (false, false) => {
                self.nonfinite_seen = true;
                self.rescue(ctx)
            }
        }
    }

    /// Both guesses are non-finite: try points between them.
    fn rescue(&mut self, ctx: &Context) -> Ask {
        while self.rescue_k < RESCUE.len() {
            let x = self.a + (self.b - self.a) * RESCUE[self.rescue_k];
            self.rescue_k += 1;
            if !self.seen(x) {
                return self.ask(x, StepKind::Backtrack, Purpose::Rescue);
            }
        }
        self.fail(ctx)
    }
}

/// The bracketing method the default hands over to.
fn bracketing(a: f64, fa: f64, b: f64, fb: f64, others: &[(f64, f64)]) -> Box<dyn ScalarMethod> {
    Box::new(Hybrid::from_points(a, fa, b, fb, others))
}

impl ScalarMethod for Auto {
    fn step(&mut self, told: Option<(f64, f64)>, ctx: &Context) -> Ask {
        let Some((x, fx)) = told else {
            return self.ask(self.a, StepKind::Initial, Purpose::Guess0);
        };
        self.points.push((x, fx));
        let purpose = self.purpose;
        if !matches!(purpose, Purpose::Guess0 | Purpose::Guess1 | Purpose::Inner) {
            self.iterations += 1;
        }
        if let Some(inner) = self.inner.as_mut() {
            let ask = inner.step(Some((x, fx)), ctx);
            return self.forward(ask, ctx);
        }
        if fx == 0.0 {
            match purpose {
                Purpose::Guess0 | Purpose::Guess1 | Purpose::ZeroCheck(..) => {}
                _ => {
                    // Confirm with one probe close by, towards the nearest other point.
                    let near = self
                        .points
                        .iter()
                        .filter(|p| p.0 != x && p.1.is_finite())
                        .min_by(|p, q| (p.0 - x).abs().total_cmp(&(q.0 - x).abs()))
                        .map(|p| p.0);
                    let h = crate::certificate::zero_probe_step(x, &ctx.tol);
                    let check = near.map(|n| x + h.copysign(n - x));
                    match check {
                        Some(c) if c != x && !self.seen(c) && ctx.bounds.contains(c) => {
                            let side = match purpose {
                                Purpose::Search(s) => Some(s),
                                _ => None,
                            };
                            return self.ask(c, StepKind::Probe, Purpose::ZeroCheck(x, side));
                        }
                        _ => {}
                    }
                }
            }
            if !matches!(purpose, Purpose::ZeroCheck(..)) {
                return Finish::at(Status::ExactZero, x, fx);
            }
        }
        if let Purpose::ZeroCheck(z, side) = purpose {
            // A normal value next to the zero confirms it; zero or an underflowed
            // (subnormal) value there means a plateau.
            if fx.is_finite() && fx.abs() >= f64::MIN_POSITIVE {
                return Finish::at(Status::ExactZero, z, 0.0);
            }
            // Zero again nearby: an underflowed plateau, not a root.
            self.plateau_seen = true;
            if !fx.is_finite() {
                self.nonfinite_seen = true;
            }
            return match side {
                Some(s) => self.search_told(s, x, fx, ctx),
                None => self.start_search(ctx),
            };
        }
        if good(fx) && fx.abs() <= ctx.tol.f_abs {
            return Finish::at(Status::ConvergedResidual, x, fx);
        }
        if !fx.is_nan() && fx != 0.0 {
            // A finite or infinite value: either has a sign, so either may bracket.
            if let Some(ask) = self.try_bracket(x, fx, ctx) {
                return ask;
            }
        }
        match purpose {
            Purpose::Guess0 => {
                let b = self.b;
                self.ask(b, StepKind::Initial, Purpose::Guess1)
            }
            Purpose::Guess1 => self.after_guesses(ctx),
            Purpose::Rescue => {
                if good(fx) {
                    self.start_search(ctx)
                } else {
                    self.rescue(ctx)
                }
            }
            Purpose::Secant | Purpose::Probe => {
                if good(fx) {
                    self.backoffs_in_a_row = 0;
                    self.secant_told(x, fx, ctx)
                } else {
                    let good_pt = (self.x1, self.f1);
                    self.backoff(good_pt, x, ctx)
                }
            }
            Purpose::Backoff => {
                if good(fx) {
                    self.backoffs_in_a_row = 0;
                    let (xg, fg) = self.backoff_good;
                    self.x0 = xg;
                    self.f0 = fg;
                    self.x1 = x;
                    self.f1 = fx;
                    self.steps = [(x - xg).abs(), f64::INFINITY];
                    self.last_dx = x - xg;
                    if self.is_bracket {
                        return self.start_search(ctx);
                    }
                    self.secant_next(ctx)
                } else {
                    let good_pt = self.backoff_good;
                    self.backoff(good_pt, x, ctx)
                }
            }
            Purpose::Search(side) => self.search_told(side, x, fx, ctx),
            // Both are handled above; ending here would be a logic error, so stop honestly.
            Purpose::ZeroCheck(..) | Purpose::Inner => self.fail(ctx),
        }
    }

    fn bracket(&self) -> Option<(f64, f64)> {
        self.inner.as_ref().and_then(|m| m.bracket())
    }

    fn iterations(&self) -> usize {
        self.iterations + self.inner.as_ref().map_or(0, |m| m.iterations())
    }
}
