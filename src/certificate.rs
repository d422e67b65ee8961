//! The evidence behind every converged answer, checked in one place.
//!
//! A method may *claim* convergence; the driver grants it only with a [`Certificate`]
//! that a reviewer can check from the numbers it carries. Four kinds:
//!
//! - **bracket**: f changes sign across a final bracket [lo, hi] no wider than the step
//!   tolerance, *and* |f| shrank as the bracket closed. The test: with w the bracket's
//!   width, m = |f| at the root returned (the end with the smaller |f|), and the
//!   *reference* an evaluated point between [`REFERENCE_SPAN`] and
//!   [`REFERENCE_WINDOW`] widths away or the nearest beyond (at distance d, value
//!   f_ref; the one giving the largest bound, so that a flat f whose last values are
//!   rounding noise is judged by the points before the noise),
//!   `m ≤ 2·|f_ref|·(w/d)^(1/3)`. Any root at which f behaves like |x − r|^α with
//!   α ≥ 1/3 (simple roots, cube-root-like ones, multiple roots) passes with room to
//!   spare; at a jump |f| stays put as the bracket closes and at a pole it grows, so
//!   both fail and end as [`Status::Discontinuity`].
//! - **step**: an open method (no sign change seen) took a step s below the tolerance,
//!   *and* a point q evaluated *beyond* the estimate (at least [`BEYOND_MIN`] steps, at
//!   distance d; the driver evaluates one at [`BEYOND_PROBE`] steps if there is none,
//!   and looks sixteen times farther while |f| there has not grown, up to
//!   [`BEYOND_FAR`] steps) shows |f| growing at least in proportion to the distance:
//!   `m ≤ 4·|f(q)|·(s/d)`. A sign change seen out there turns the claim into a bracket,
//!   halved to the tolerance by checking evaluations and then judged as a bracket. The points behind the estimate cannot
//!   check it, since they produced the step. Near a simple root f(q) has the other sign
//!   and about d/s times the residual; near a touching root it grows like d²; along an
//!   asymptote, a decaying exponential or at a minimum of |f| above zero it does not
//!   grow, and the solve ends as [`Status::LargeResidual`].
//! - **residual**: |f(root)| ≤ `f_abs`, the residual tolerance the caller set.
//! - **exact zero**: f(root) = 0 exactly, and either f changes sign around the root
//!   (between the nearest evaluated points on each side, or across the method's
//!   bracket), or an evaluated point within [`zero_probe_step`] of the root, on the
//!   side the solve came from, has a normal (not underflowed) non-zero value. A zero
//!   reached only by underflow or rounding (e⁻ˣ far out, atan x − π/2) fails that
//!   test and ends as [`Status::ZeroPlateau`].
//!
//! - **touching** (range scan only): a minimum of |f| located to a width w that falls
//!   towards zero at least as fast as a double root's
//!   ([`crate::roots_in_range::TOUCH_FACTOR`]).
//!
//! When the evidence is short (no reference far enough away, or an unconfirmed exact
//! zero) the driver asks for a few more evaluations ([`Verdict::Probe`]) before it
//! decides; they appear in the history as [`StepKind::Check`].

use crate::outcome::{Status, StepKind};
use crate::tolerances::Tolerances;

/// The reference point lies at least this many final widths (or steps) from the root.
pub const REFERENCE_SPAN: f64 = 64.0;

/// A point that checks an open method's step lies this many steps beyond the estimate
/// (at least `BEYOND_MIN`, at most `BEYOND_MAX`); a checking evaluation is made at
/// `BEYOND_PROBE` steps when none does.
pub const BEYOND_MIN: f64 = 4.0;
pub const BEYOND_PROBE: f64 = 16.0;
/// The farthest an open method's step is checked: about a million steps (16⁵).
pub const BEYOND_FAR: f64 = 1_048_576.0;

/// A bracket's reference is sought up to this many widths from the root (thirty
/// halvings), and at the nearest point beyond.
pub const REFERENCE_WINDOW: f64 = 1_073_741_824.0;

/// Extra evaluations the driver may spend checking one claim of convergence.
pub const MAX_CHECKS: usize = 24;

/// Which evidence stands behind a converged answer.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub enum CertificateKind {
    Bracket,
    Step,
    Residual,
    ExactZero,
    /// A touching root found by the range scan: a minimum of |f| that falls towards
    /// zero at least as fast as a double root's
    /// ([`crate::roots_in_range::TOUCH_FACTOR`]).
    Touching,
}

impl CertificateKind {
    pub fn code(self) -> &'static str {
        match self {
            CertificateKind::Bracket => "bracket",
            CertificateKind::Step => "step",
            CertificateKind::Residual => "residual",
            CertificateKind::ExactZero => "exact-zero",
            CertificateKind::Touching => "touching",
        }
    }

    /// The certificate in plain words, for the history view and the printed record.
    pub fn explanation(self) -> &'static str {
        match self {
            CertificateKind::Bracket => {
                "f changes sign across a bracket narrower than the tolerance, and |f| shrank \
                 as the bracket closed"
            }
            CertificateKind::Step => {
                "the last step was below the tolerance, and |f| shrank with the steps"
            }
            CertificateKind::Residual => "|f| is within the residual tolerance you set",
            CertificateKind::ExactZero => {
                "f is exactly zero here, and not merely by underflow: it changes sign around \
                 the root or is non-zero right next to it"
            }
            CertificateKind::Touching => {
                "|f| has a minimum here that falls towards zero at least as fast as a double \
                 root's (f touches zero without changing sign)"
            }
        }
    }
}

/// The evidence for a converged answer, with every number a reviewer needs to check it.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Certificate {
    pub kind: CertificateKind,
    /// |f| where the residual was measured.
    pub residual: f64,
    /// The bound the residual met: the shrink bound for `Bracket` and `Step`, `f_abs`
    /// for `Residual`, 0 for `ExactZero`.
    pub bound: f64,
    /// The final bracket (ends of opposite sign), when there is one.
    pub bracket: Option<(f64, f64)>,
    /// The bracket's width (`Bracket`) or the last step (`Step`); 0 otherwise.
    pub width: f64,
    /// The evaluated point (x, f(x)) the shrinking was measured against.
    pub reference: Option<(f64, f64)>,
}

/// An evaluated point (x, f(x)).
pub type Point = (f64, f64);

/// A bounded record of the points evaluated: the first [`Evidence::HEAD`] and the
/// latest [`Evidence::TAIL`]. Memory stays fixed however long a solve runs.
#[derive(Debug, Clone)]
pub struct Evidence {
    head: Vec<(f64, f64)>,
    tail: Vec<(f64, f64)>,
    /// Next slot of `tail` to overwrite once it is full.
    next: usize,
}

impl Default for Evidence {
    fn default() -> Self {
        Evidence::new()
    }
}

impl Evidence {
    pub const HEAD: usize = 64;
    pub const TAIL: usize = 1024;

    pub fn new() -> Evidence {
        Evidence {
            head: Vec::new(),
            tail: Vec::new(),
            next: 0,
        }
    }

    pub fn push(&mut self, x: f64, fx: f64) {
        if self.head.len() < Self::HEAD {
            self.head.push((x, fx));
        } else if self.tail.len() < Self::TAIL {
            self.tail.push((x, fx));
        } else {
            self.tail[self.next] = (x, fx);
            self.next = (self.next + 1) % Self::TAIL;
        }
    }

    /// Every kept point, in no particular order.
    pub fn points(&self) -> impl Iterator<Item = (f64, f64)> + '_ {
        self.head.iter().chain(self.tail.iter()).copied()
    }

    /// The value at x, if x was evaluated and is still kept.
    pub fn lookup(&self, x: f64) -> Option<f64> {
        self.points().find(|p| p.0 == x).map(|p| p.1)
    }

    /// The nearest kept point with a finite value at least `min_distance` from `r`.
    fn reference(&self, r: f64, min_distance: f64) -> Option<(f64, f64)> {
        self.points()
            .filter(|&(x, fx)| fx.is_finite() && x.is_finite() && (x - r).abs() >= min_distance)
            .min_by(|p, q| (p.0 - r).abs().total_cmp(&(q.0 - r).abs()))
    }

    /// The reference for a bracket of width w around r: among the points between
    /// [`REFERENCE_SPAN`]·w and [`REFERENCE_WINDOW`]·w away, and the nearest point
    /// beyond, the one that gives the largest bound |f|·(w/d)^(1/3). Taking the largest
    /// keeps a root whose last evaluations are all rounding noise (a very flat f, where
    /// |f| cannot shrink below the noise) certified by the points before the noise,
    /// while at a jump or a pole, where |f| does not fall towards the root at any
    /// distance, every candidate fails.
    fn shrink_reference(&self, r: f64, w: f64) -> Option<(f64, f64)> {
        let usable = |p: &(f64, f64)| p.1.is_finite() && p.0.is_finite();
        let d = |p: &(f64, f64)| (p.0 - r).abs();
        let score = |p: &(f64, f64)| p.1.abs() * (w / d(p)).cbrt();
        self.points()
            .filter(|p| usable(p) && d(p) >= REFERENCE_SPAN * w && d(p) <= REFERENCE_WINDOW * w)
            .chain(self.reference(r, REFERENCE_WINDOW * w))
            .max_by(|p, q| score(p).total_cmp(&score(q)))
    }

    /// The nearest kept point on each side of r with a non-zero, non-NaN value.
    fn neighbours(&self, r: f64) -> (Option<Point>, Option<Point>) {
        let usable = |p: &(f64, f64)| !p.1.is_nan() && p.1 != 0.0;
        let left = self
            .points()
            .filter(|p| usable(p) && p.0 < r)
            .max_by(|p, q| p.0.total_cmp(&q.0));
        let right = self
            .points()
            .filter(|p| usable(p) && p.0 > r)
            .min_by(|p, q| p.0.total_cmp(&q.0));
        (left, right)
    }

    /// The nearest other kept point to r (any value).
    fn nearest_other(&self, r: f64) -> Option<(f64, f64)> {
        self.points()
            .filter(|p| p.0 != r)
            .min_by(|p, q| (p.0 - r).abs().total_cmp(&(q.0 - r).abs()))
    }
}

/// The distance at which an exact zero at r is confirmed by its neighbour: the step
/// tolerance at r, but at least four units in the last place and at least the
/// smallest normal number.
pub fn zero_probe_step(r: f64, tol: &Tolerances) -> f64 {
    tol.x_tol(r)
        .max(4.0 * f64::EPSILON * r.abs())
        .max(f64::MIN_POSITIVE)
}

/// What the driver does with a method's claim.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Verdict {
    /// Converged, with this evidence.
    Certified(Certificate),
    /// Not converged: the claim failed its test.
    Refused(Status),
    /// The evidence is short: evaluate here (inside the bounds) and ask again.
    Probe(f64, StepKind),
    /// The evidence shows a sign change across [lo, hi] around the claimed root: judge
    /// the claim again as a bracket claim on it.
    Bracket(f64, f64),
}

/// What a method claimed, in the terms the check needs.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Claim {
    pub status: Status,
    /// The root the method returns (an unevaluated estimate for the classic secant).
    pub root: f64,
    /// Where the residual was measured, and its value there.
    pub at: f64,
    pub residual: f64,
    /// The method's final bracket (ends of opposite sign), if any.
    pub bracket: Option<(f64, f64)>,
    /// The last step of an open method (NaN when not known).
    pub step: f64,
}

/// Judges a claim of convergence against the evidence. `checks` is the number of
/// checking evaluations already spent on this claim.
pub fn assess(claim: &Claim, evidence: &Evidence, tol: &Tolerances, checks: usize) -> Verdict {
    let m = claim.residual.abs();
    let r = claim.at;
    match claim.status {
        Status::ConvergedResidual => {
            if m <= tol.f_abs {
                Verdict::Certified(Certificate {
                    kind: CertificateKind::Residual,
                    residual: m,
                    bound: tol.f_abs,
                    bracket: claim.bracket,
                    width: 0.0,
                    reference: None,
                })
            } else {
                Verdict::Refused(Status::LargeResidual)
            }
        }
        Status::ExactZero => assess_zero(claim, evidence, tol, checks),
        Status::ConvergedStep => match claim.bracket {
            Some((lo, hi)) => {
                let w = hi - lo;
                let mid = crate::methods::bracket::midpoint(lo, hi);
                if w > 2.0 * tol.x_tol(mid) && mid > lo && mid < hi {
                    // A bracket found while checking an open method's step: halve it
                    // to the tolerance first.
                    return if checks < MAX_CHECKS {
                        Verdict::Probe(mid, StepKind::Check)
                    } else {
                        Verdict::Refused(Status::Stagnated)
                    };
                }
                match evidence.shrink_reference(r, w) {
                    Some(reference) => {
                        let d = (reference.0 - r).abs();
                        let bound = 2.0 * reference.1.abs() * (w / d).cbrt();
                        if m <= bound {
                            Verdict::Certified(Certificate {
                                kind: CertificateKind::Bracket,
                                residual: m,
                                bound,
                                bracket: Some((lo, hi)),
                                width: w,
                                reference: Some(reference),
                            })
                        } else {
                            Verdict::Refused(Status::Discontinuity)
                        }
                    }
                    None => {
                        // The bracket never shrank much (it started nearly as narrow):
                        // halve it further to see how |f| behaves.
                        let mid = crate::methods::bracket::midpoint(lo, hi);
                        if checks < MAX_CHECKS && mid > lo && mid < hi {
                            Verdict::Probe(mid, StepKind::Check)
                        } else {
                            Verdict::Refused(Status::Discontinuity)
                        }
                    }
                }
            }
            None => assess_step(claim, evidence, tol, checks),
        },
        other => Verdict::Refused(other),
    }
}

/// An open method's claim: a step below tolerance with no sign change in its bracket.
/// The evidence must include a point q *beyond* the estimate (the points behind it
/// produced the step, so they cannot check it) where |f| has grown at least in
/// proportion to the distance: `m ≤ 4·|f(q)|·(s/|q − r|)`. The first look is
/// [`BEYOND_PROBE`] steps out; while |f| there has not grown (at most twice m) the look
/// goes sixteen times farther, up to [`BEYOND_FAR`] steps, so a root whose last values
/// are rounding noise is seen from beyond the noise. A sign change found out there
/// makes the claim a bracket, which is then halved to the tolerance. Along an
/// asymptote, a decaying exponential or at a minimum of |f| above zero |f| never grows
/// enough and the claim fails.
fn assess_step(claim: &Claim, evidence: &Evidence, tol: &Tolerances, checks: usize) -> Verdict {
    let m = claim.residual.abs();
    let r = claim.at;
    let s = if claim.step.is_finite() && claim.step > 0.0 {
        claim.step
    } else {
        zero_probe_step(r, tol)
    };
    let sigma = if claim.root != r && claim.root.is_finite() {
        (claim.root - r).signum()
    } else {
        evidence
            .nearest_other(r)
            .map_or(1.0, |p| if p.0 < r { 1.0 } else { -1.0 })
    };
    let distance = |q: &(f64, f64)| (q.0 - r).abs();
    let beyond: Vec<(f64, f64)> = evidence
        .points()
        .filter(|&(x, fx)| {
            let d = (x - r) * sigma;
            !fx.is_nan() && d >= BEYOND_MIN * s && d <= BEYOND_FAR * s
        })
        .collect();
    let passing = beyond
        .iter()
        .filter(|q| m <= 4.0 * q.1.abs() * (s / distance(q)))
        .min_by(|p, q| distance(p).total_cmp(&distance(q)));
    if let Some(&q) = passing {
        return Verdict::Certified(Certificate {
            kind: CertificateKind::Step,
            residual: m,
            bound: 4.0 * q.1.abs() * (s / distance(&q)),
            bracket: None,
            width: s,
            reference: Some(q),
        });
    }
    let across = beyond
        .iter()
        .filter(|q| q.1 != 0.0 && crate::methods::opposite(q.1, claim.residual))
        .min_by(|p, q| distance(p).total_cmp(&distance(q)));
    if let Some(&q) = across {
        return Verdict::Bracket(r.min(q.0), r.max(q.0));
    }
    let farthest = beyond
        .iter()
        .max_by(|p, q| distance(p).total_cmp(&distance(q)))
        .map(distance);
    let next = match farthest {
        None => BEYOND_PROBE * s,
        Some(d) => 16.0 * d,
    };
    let grown = beyond.iter().any(|q| q.1.abs() > 2.0 * m);
    if checks < MAX_CHECKS && !grown && next <= BEYOND_FAR * s {
        Verdict::Probe(r + sigma * next, StepKind::Check)
    } else {
        Verdict::Refused(Status::LargeResidual)
    }
}

fn assess_zero(claim: &Claim, evidence: &Evidence, tol: &Tolerances, checks: usize) -> Verdict {
    let r = claim.at;
    if claim.residual != 0.0 {
        return Verdict::Refused(Status::LargeResidual);
    }
    let certified = |bracket: Option<(f64, f64)>, reference: Option<(f64, f64)>| {
        Verdict::Certified(Certificate {
            kind: CertificateKind::ExactZero,
            residual: 0.0,
            bound: 0.0,
            bracket,
            width: 0.0,
            reference,
        })
    };
    if let Some((lo, hi)) = claim.bracket {
        if lo < r && r < hi {
            return certified(Some((lo, hi)), None);
        }
    }
    let (left, right) = evidence.neighbours(r);
    if let (Some(l), Some(rt)) = (left, right) {
        if (l.1 < 0.0) != (rt.1 < 0.0) {
            return certified(Some((l.0, rt.0)), None);
        }
    }
    // No sign change around it: a neighbour within the probe step must be non-zero
    // and normal. The neighbour is looked for on the side the solve came from.
    let h = zero_probe_step(r, tol);
    let side = evidence
        .nearest_other(r)
        .map_or(1.0, |p| (p.0 - r).signum());
    let side = if side == 0.0 { 1.0 } else { side };
    let close = evidence
        .points()
        .filter(|p| p.0 != r && (p.0 - r).abs() <= 4.0 * h && (p.0 - r) * side > 0.0)
        .min_by(|p, q| (p.0 - r).abs().total_cmp(&(q.0 - r).abs()));
    match close {
        Some(p) if p.1.is_finite() && p.1.abs() >= f64::MIN_POSITIVE => certified(None, Some(p)),
        Some(p) if p.1.is_nan() => Verdict::Refused(Status::NonFinite),
        Some(_) => Verdict::Refused(Status::ZeroPlateau),
        None if checks < MAX_CHECKS => Verdict::Probe(r + side * h, StepKind::Check),
        None => Verdict::Refused(Status::ZeroPlateau),
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn evidence(points: &[(f64, f64)]) -> Evidence {
        let mut e = Evidence::new();
        for &(x, fx) in points {
            e.push(x, fx);
        }
        e
    }

    #[test]
    fn evidence_memory_is_bounded() {
        let mut e = Evidence::new();
        for i in 0..100_000 {
            e.push(i as f64, 1.0);
        }
        assert_eq!(e.points().count(), Evidence::HEAD + Evidence::TAIL);
        assert_eq!(e.lookup(0.0), Some(1.0));
        assert_eq!(e.lookup(99_999.0), Some(1.0));
        assert_eq!(e.lookup(50_000.0), None);
    }

    #[test]
    fn a_jump_fails_the_bracket_test_and_a_root_passes() {
        // floor(x) - 0.5 bisected towards the jump at 1: |f| stays 0.5 (common practice,
        // no source: the sign of a step function changes without f approaching zero).
        let mut pts = vec![(0.0, -0.5), (2.0, 1.5)];
        let (mut lo, mut hi) = (0.0f64, 2.0f64);
        for _ in 0..45 {
            let m = 0.5 * (lo + hi);
            let fm = m.floor() - 0.5;
            pts.push((m, fm));
            if fm < 0.0 {
                lo = m
            } else {
                hi = m
            }
        }
        let claim = Claim {
            status: Status::ConvergedStep,
            root: hi,
            at: hi,
            residual: 0.5,
            bracket: Some((lo, hi)),
            step: f64::NAN,
        };
        let tol = Tolerances::default();
        assert_eq!(
            assess(&claim, &evidence(&pts), &tol, 0),
            Verdict::Refused(Status::Discontinuity)
        );
        // The same points for x - 1 (a root): certified.
        let pts: Vec<(f64, f64)> = pts.iter().map(|&(x, _)| (x, x - 1.0)).collect();
        let claim = Claim {
            residual: hi - 1.0,
            ..claim
        };
        assert!(matches!(
            assess(&claim, &evidence(&pts), &tol, 0),
            Verdict::Certified(Certificate {
                kind: CertificateKind::Bracket,
                ..
            })
        ));
    }

    #[test]
    fn an_unconfirmed_zero_asks_for_a_neighbour() {
        let tol = Tolerances::default();
        let claim = Claim {
            status: Status::ExactZero,
            root: 2.0,
            at: 2.0,
            residual: 0.0,
            bracket: None,
            step: f64::NAN,
        };
        let e = evidence(&[(1.0, -3.0), (1.5, -1.75), (2.0, 0.0)]);
        match assess(&claim, &e, &tol, 0) {
            Verdict::Probe(x, StepKind::Check) => assert!(x < 2.0 && x > 1.999),
            v => panic!("{v:?}"),
        }
    }
}
