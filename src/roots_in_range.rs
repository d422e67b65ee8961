//! All roots of f in an interval: sample, refine every sign change with the bracketing
//! hybrid, and look for touching (even-multiplicity) roots at near-zero minima of |f|.

use crate::driver::{Ask, Context, ScalarMethod};
use crate::error::{require_finite, InputError};
use crate::methods::hybrid::Hybrid;
use crate::tolerances::{Bounds, Tolerances};

/// Largest number of samples accepted (a guard against a runaway request).
pub const MAX_SAMPLES: usize = 1_000_000;

/// A touching root is accepted when |f| at the refined minimum is at most this many
/// times the largest |f| among the samples (or at most `tol.f_abs`); the same test as
/// the default method's for a touching root.
pub const TOUCH_REL: f64 = crate::methods::auto::TOUCH_REL;

/// How to scan.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct ScanOptions {
    /// Evenly spaced samples, both ends included. Default 400.
    pub samples: usize,
    /// Tolerances of each refinement; `max_evals` is the budget of each one.
    pub tol: Tolerances,
}

impl Default for ScanOptions {
    fn default() -> Self {
        ScanOptions {
            samples: 400,
            tol: Tolerances::default(),
        }
    }
}

/// How a root showed itself.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub enum RootKind {
    /// f changes sign across it (odd multiplicity).
    SignChange,
    /// f touches zero without changing sign (even multiplicity).
    Touching,
}

impl RootKind {
    pub fn code(self) -> &'static str {
        match self {
            RootKind::SignChange => "sign-change",
            RootKind::Touching => "touching",
        }
    }
}

/// One root found in the range.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct RangeRoot {
    pub x: f64,
    pub fx: f64,
    pub kind: RootKind,
    /// True when the refinement converged (for a touching root: the minimum was located
    /// to tolerance and passed the near-zero test).
    pub converged: bool,
}

/// Every root found, sorted by x, with what the scan could and could not see.
#[derive(Debug, Clone, PartialEq)]
pub struct RangeRoots {
    pub roots: Vec<RangeRoot>,
    /// Exact number of calls of f, samples included.
    pub evaluations: usize,
    pub samples: usize,
    /// Distance between neighbouring samples.
    pub spacing: f64,
    /// The limits of the scan, in plain words.
    pub limits: String,
}

/// Finds the roots of f in [lo, hi].
///
/// Algorithm:
/// 1. Evaluate f at `samples` evenly spaced points, ends included (spacing
///    h = (hi − lo)/(samples − 1)). A sample where f is exactly zero is a root.
/// 2. Every neighbouring pair with finite values of opposite sign is refined with the
///    bracketing hybrid ([`Hybrid::from_points`], which reuses both samples and the
///    neighbours beyond them). A "root" where |f| ends larger than at both samples is
///    a jump or pole (such as tan x at π/2), not a root, and is left out.
/// 3. Every interior sample where |f| is a local minimum with no sign change on either
///    side, and where the parabola through the three samples dips below half of the
///    middle value, is refined by golden-section search for the minimum of |f| in the
///    two spacings around it. It is reported as a touching root when
///    |f(min)| <= max(tol.f_abs, 1e-10 × the largest sampled |f|) ([`TOUCH_REL`]); if the
///    search meets a sign change instead, both sign changes are refined as above.
///
/// Evaluations: `samples`, plus at most `tol.max_evals` per refinement. No point is
/// evaluated twice. Limits: two roots closer than about h (a pair of sign changes
/// inside one spacing cancels), or a touching root whose dip does not show as a local
/// minimum among the samples, can be missed; the returned `limits` says so with the
/// figures of this scan.
///
/// Golden-section search: Kiefer (1953); Press et al., *Numerical Recipes* (3rd ed.,
/// 2007) §10.2.
///
/// ```
/// use tacit::roots_in_range::{roots_in_range, RootKind, ScanOptions};
/// // (x − 1)² (x − 3): a touching root at 1 and a simple one at 3.
/// let r = roots_in_range(0.0, 4.0, &ScanOptions::default(), |x| (x - 1.0).powi(2) * (x - 3.0)).unwrap();
/// assert_eq!(r.roots.len(), 2);
/// assert_eq!(r.roots[0].kind, RootKind::Touching);
/// assert!((r.roots[1].x - 3.0).abs() < 1e-12);
/// ```
pub fn roots_in_range(
    lo: f64,
    hi: f64,
    options: &ScanOptions,
    mut f: impl FnMut(f64) -> f64,
) -> Result<RangeRoots, InputError> {
    require_finite(lo, "range lower end")?;
    require_finite(hi, "range upper end")?;
    if lo >= hi {
        return Err(InputError::new(
            "bad-range",
            format!("the range lower end {lo} must be below the upper end {hi}"),
        ));
    }
    options.tol.validate()?;
    let n = options.samples;
    if !(3..=MAX_SAMPLES).contains(&n) {
        return Err(InputError::new(
            "bad-samples",
            format!("samples must be from 3 to {MAX_SAMPLES}, got {n}"),
        ));
    }
    let h = (hi - lo) / (n - 1) as f64;
    if !h.is_finite() || h <= 0.0 {
        return Err(InputError::new(
            "bad-range",
            format!("the range [{lo}, {hi}] is too wide or too narrow to sample {n} times"),
        ));
    }
    let mut xs: Vec<f64> = (0..n).map(|i| lo + h * i as f64).collect();
    xs[n - 1] = hi;
    xs.dedup();
    if xs.len() < n {
        return Err(InputError::new(
            "bad-range",
            format!(
                "the range [{lo}, {hi}] holds fewer than {n} distinct numbers; use fewer samples"
            ),
        ));
    }
    let mut evals = 0usize;
    let mut call = |x: f64| {
        evals += 1;
        f(x)
    };
    let fs: Vec<f64> = xs.iter().map(|&x| call(x)).collect();

    let scale = fs
        .iter()
        .filter(|v| v.is_finite())
        .fold(0.0f64, |m, v| m.max(v.abs()));
    let touch_limit = options.tol.f_abs.max(TOUCH_REL * scale);
    let mut roots = Vec::new();
    let mut jumps = 0usize;
    let mut unsettled = 0usize;
    let nonfinite = fs.iter().filter(|v| !v.is_finite()).count();
    let sample = |i: usize| (xs[i], fs[i]);
    let finite_nonzero = |v: f64| v.is_finite() && v != 0.0;

    for i in 0..n {
        if fs[i] == 0.0 {
            let left = i.checked_sub(1).map(|j| fs[j]);
            let right = fs.get(i + 1).copied();
            let kind = match (left, right) {
                (Some(l), Some(r))
                    if finite_nonzero(l) && finite_nonzero(r) && (l < 0.0) == (r < 0.0) =>
                {
                    RootKind::Touching
                }
                _ => RootKind::SignChange,
            };
            roots.push(RangeRoot {
                x: xs[i],
                fx: 0.0,
                kind,
                converged: true,
            });
        }
    }

    let refine_bracket =
        |a: (f64, f64), b: (f64, f64), others: &[(f64, f64)], call: &mut dyn FnMut(f64) -> f64| {
            let mut method = Hybrid::from_points(a.0, a.1, b.0, b.1, others);
            let mut known: Vec<(f64, f64)> = vec![a, b];
            known.extend_from_slice(others);
            drive(&mut method, &mut known, &options.tol, call)
        };

    for i in 0..n - 1 {
        let (fa, fb) = (fs[i], fs[i + 1]);
        if finite_nonzero(fa) && finite_nonzero(fb) && (fa < 0.0) != (fb < 0.0) {
            let mut others = Vec::new();
            if i > 0 && fs[i - 1].is_finite() {
                others.push(sample(i - 1));
            }
            if i + 2 < n && fs[i + 2].is_finite() {
                others.push(sample(i + 2));
            }
            let (x, fx, converged) = refine_bracket(sample(i), sample(i + 1), &others, &mut call);
            if fx.abs() > fa.abs().max(fb.abs()) {
                jumps += 1;
                continue;
            }
            if !converged {
                unsettled += 1;
            }
            roots.push(RangeRoot {
                x,
                fx,
                kind: RootKind::SignChange,
                converged,
            });
        }
    }

    for i in 1..n - 1 {
        let (fl, fm, fr) = (fs[i - 1], fs[i], fs[i + 1]);
        if !(finite_nonzero(fl) && finite_nonzero(fm) && finite_nonzero(fr)) {
            continue;
        }
        let sign = fm.signum();
        if fl.signum() != sign || fr.signum() != sign {
            continue;
        }
        // Work with g = |f| on this stretch, since f keeps one sign here.
        let (gl, gm, gr) = (fl.abs(), fm.abs(), fr.abs());
        if !(gm < gl && gm <= gr) {
            continue;
        }
        let Some(dip) = parabola_minimum(xs[i - 1], gl, xs[i], gm, xs[i + 1], gr) else {
            continue;
        };
        if dip > 0.5 * gm {
            continue;
        }
        let found = golden_minimum(
            sample(i - 1),
            sample(i),
            sample(i + 1),
            &options.tol,
            &mut call,
        );
        match found {
            Minimum::At(x, fx, located) => {
                if fx.abs() <= touch_limit {
                    roots.push(RangeRoot {
                        x,
                        fx,
                        kind: RootKind::Touching,
                        converged: located || fx == 0.0,
                    });
                }
            }
            Minimum::SignChange(p) => {
                // Two simple roots inside one dip: refine both.
                for (a, b) in [(sample(i - 1), p), (p, sample(i + 1))] {
                    let (a, b) = if a.0 < b.0 { (a, b) } else { (b, a) };
                    let (x, fx, converged) = refine_bracket(a, b, &[], &mut call);
                    if !converged {
                        unsettled += 1;
                    }
                    roots.push(RangeRoot {
                        x,
                        fx,
                        kind: RootKind::SignChange,
                        converged,
                    });
                }
            }
            Minimum::Gave => {}
        }
    }

    roots.sort_by(|p, q| p.x.total_cmp(&q.x));
    roots.dedup_by(|later, earlier| later.x == earlier.x);

    let mut limits = format!(
        "Scanned [{lo}, {hi}] at {n} evenly spaced samples, {h:e} apart. Roots closer \
         together than about {h:e} may be missed (two sign changes within one spacing \
         cancel out), and so may a touching root whose dip does not show as a local \
         minimum of |f| among the samples, or that lies within one spacing of either end. \
         A touching root is accepted when |f| at its refined minimum is at most \
         {touch_limit:e} (1e-10 times the largest sampled |f|, or the residual tolerance)."
    );
    if nonfinite > 0 {
        limits.push_str(&format!(
            " f was not finite at {nonfinite} of the samples; roots next to those were not sought."
        ));
    }
    if jumps > 0 {
        limits.push_str(&format!(
            " {jumps} sign change(s) were jumps or poles (|f| grew as the bracket shrank), not roots, and are not listed."
        ));
    }
    if unsettled > 0 {
        limits.push_str(&format!(
            " {unsettled} refinement(s) used up their budget of {} evaluations and are marked not converged.",
            options.tol.max_evals
        ));
    }
    Ok(RangeRoots {
        roots,
        evaluations: evals,
        samples: n,
        spacing: h,
        limits,
    })
}

/// Runs a scalar method with a local budget, answering from `known` any point already
/// evaluated. Returns (root, f(root), converged).
fn drive(
    method: &mut dyn ScalarMethod,
    known: &mut Vec<(f64, f64)>,
    tol: &Tolerances,
    f: &mut dyn FnMut(f64) -> f64,
) -> (f64, f64, bool) {
    let mut used = 0usize;
    let mut ctx = Context {
        tol: *tol,
        bounds: Bounds::UNBOUNDED,
        evaluations: 0,
    };
    let mut ask = method.step(None, &ctx);
    let mut best = known
        .iter()
        .copied()
        .filter(|p| p.1.is_finite())
        .min_by(|p, q| p.1.abs().total_cmp(&q.1.abs()))
        .unwrap_or((f64::NAN, f64::NAN));
    for _ in 0..(tol.max_evals + 10_000) {
        match ask {
            Ask::Done(finish) => {
                return (finish.root, finish.residual, finish.status.is_converged());
            }
            Ask::Eval(x, _) => {
                let fx = match known.iter().find(|p| p.0 == x) {
                    Some(p) => p.1,
                    None => {
                        if used >= tol.max_evals || x.is_nan() {
                            return (best.0, best.1, false);
                        }
                        used += 1;
                        let fx = f(x);
                        known.push((x, fx));
                        fx
                    }
                };
                if fx.is_finite() && fx.abs() < best.1.abs() {
                    best = (x, fx);
                }
                ctx.evaluations = used;
                ask = method.step(Some((x, fx)), &ctx);
            }
        }
    }
    (best.0, best.1, false)
}

/// The lowest value of the parabola through three points, if it opens upwards.
fn parabola_minimum(x0: f64, y0: f64, x1: f64, y1: f64, x2: f64, y2: f64) -> Option<f64> {
    let d01 = (y1 - y0) / (x1 - x0);
    let d12 = (y2 - y1) / (x2 - x1);
    let a = (d12 - d01) / (x2 - x0);
    if a.is_nan() || a <= 0.0 {
        return None;
    }
    let b = d01 - a * (x0 + x1);
    let c = y0 - a * x0 * x0 - b * x0;
    let v = c - b * b / (4.0 * a);
    v.is_finite().then_some(v)
}

enum Minimum {
    /// The minimum of |f| (x, f(x)); true when located to tolerance.
    At(f64, f64, bool),
    /// A point where f has the opposite sign: two sign changes.
    SignChange((f64, f64)),
    /// Non-finite values: no conclusion.
    Gave,
}

/// Golden-section search for the minimum of |f| on [l, r] starting from the interior
/// sample m. Stops when the interval is within the step tolerance or its relative
/// width reaches √eps (a minimum cannot be located more finely in floating point), or
/// when |f| falls to the residual tolerance.
fn golden_minimum(
    l: (f64, f64),
    m: (f64, f64),
    r: (f64, f64),
    tol: &Tolerances,
    f: &mut dyn FnMut(f64) -> f64,
) -> Minimum {
    const G: f64 = 0.381_966_011_250_105_1; // (3 − √5)/2
    let sign = m.1.signum();
    let (mut a, mut b) = (l.0, r.0);
    let (mut x, mut fx) = (m.0, m.1.abs());
    let mut fx_signed = m.1;
    let mut used = 0usize;
    while used < tol.max_evals {
        let width_tol = tol
            .x_tol(x)
            .max(f64::EPSILON.sqrt() * x.abs())
            .max(f64::MIN_POSITIVE);
        if b - a <= 2.0 * width_tol {
            return Minimum::At(x, fx_signed, true);
        }
        // Probe the larger part.
        let u = if x - a > b - x {
            x - G * (x - a)
        } else {
            x + G * (b - x)
        };
        if u <= a || u >= b || u == x {
            return Minimum::At(x, fx_signed, true);
        }
        used += 1;
        let fu_signed = f(u);
        if !fu_signed.is_finite() {
            return Minimum::Gave;
        }
        if fu_signed == 0.0 {
            return Minimum::At(u, 0.0, true);
        }
        if fu_signed.signum() != sign {
            return Minimum::SignChange((u, fu_signed));
        }
        let fu = fu_signed.abs();
        if fu < fx {
            if u < x {
                b = x;
            } else {
                a = x;
            }
            x = u;
            fx = fu;
            fx_signed = fu_signed;
            if fx <= tol.f_abs {
                return Minimum::At(x, fx_signed, true);
            }
        } else if u < x {
            a = u;
        } else {
            b = u;
        }
    }
    Minimum::At(x, fx_signed, false)
}
