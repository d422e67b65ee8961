//! All roots of f in an interval: sample, refine every sign change with the bracketing
//! hybrid through the driver (so each root carries a certificate, and poles and jumps
//! are told apart from roots), and look for touching (even-multiplicity) roots at
//! minima of |f| that fall towards zero like a double root's.

use crate::certificate::{self, Certificate, CertificateKind, Claim, Evidence, Verdict};
use crate::driver::{Driver, Settings};
use crate::error::{require_finite, InputError};
use crate::methods::hybrid::Hybrid;
use crate::outcome::Status;
use crate::tolerances::{Bounds, Tolerances};

/// Largest number of samples accepted (a guard against a runaway request).
pub const MAX_SAMPLES: usize = 1_000_000;

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
    /// True exactly when `certificate` is `Some`.
    pub converged: bool,
    /// The evidence that this is a root ([`crate::certificate`]).
    pub certificate: Option<Certificate>,
}

/// Every root found, sorted by x, with what the scan could and could not see.
#[derive(Debug, Clone, PartialEq)]
pub struct RangeRoots {
    pub roots: Vec<RangeRoot>,
    /// Sign changes that are poles or jumps, not roots: the final bracket of each.
    pub discontinuities: Vec<(f64, f64)>,
    /// Exact number of calls of f, samples included.
    pub evaluations: usize,
    pub samples: usize,
    /// Distance between neighbouring samples.
    pub spacing: f64,
    /// The limits of the scan, in plain words.
    pub limits: String,
}

/// A touching root's |f| at its located minimum may be at most this many times what a
/// double root would give there: `4·min(|f(left)|, |f(right)|)·(w/h)²`.
pub const TOUCH_FACTOR: f64 = 4.0;

/// Finds the roots of f in [lo, hi].
///
/// Algorithm:
/// 1. Evaluate f at `samples` evenly spaced points, ends included (spacing
///    h = (hi − lo)/(samples − 1)).
/// 2. A sample where f is exactly zero is a root when the samples beside it have
///    opposite signs, or when a point right next to it (the certificate's check, one
///    evaluation) has a normal non-zero value; zeros from underflow or rounding (a run
///    of zero samples far out on an asymptote) are not roots.
/// 3. Every neighbouring pair with values of opposite sign (an infinite value has a
///    sign) is refined with the bracketing hybrid ([`Hybrid::from_points`], which reuses
///    both samples and the neighbours beyond them) through the [`Driver`], so each root
///    carries its certificate. A sign change where |f| does not shrink as the bracket
///    closes is a pole or a jump (tan x at π/2, a step): it is listed in
///    `discontinuities`, not among the roots.
/// 4. Every interior sample where |f| is a local minimum with no sign change on either
///    side, and where the parabola through the three samples dips below half of the
///    middle value, is refined by golden-section search for the minimum of |f| in the
///    two spacings around it, located to a width w. It is a touching root when |f|
///    there is at most [`TOUCH_FACTOR`]·min(|f(left)|, |f(right)|)·(w/h)², where h is the
///    distance to those samples: |f| falls towards zero at least as fast as a double
///    root's; a minimum of |f| above zero, however small against the largest |f| in the
///    range, does not. If the search meets a sign change instead, both sign changes are
///    refined as in 3.
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

    let mut roots = Vec::new();
    let mut discontinuities = Vec::new();
    let mut unsettled = 0usize;
    let nonfinite = fs.iter().filter(|v| !v.is_finite()).count();
    let sample = |i: usize| (xs[i], fs[i]);
    let finite_nonzero = |v: f64| v.is_finite() && v != 0.0;
    let signed = |v: f64| !v.is_nan() && v != 0.0;
    let range = Bounds { lo, hi };

    for i in 0..n {
        if fs[i] != 0.0 {
            continue;
        }
        let left = i.checked_sub(1).map(sample);
        let right = (i + 1 < n).then(|| sample(i + 1));
        if left.is_some_and(|p| p.1 == 0.0) && right.is_some_and(|p| p.1 == 0.0) {
            continue; // inside a run of zeros: a plateau, not a located root
        }
        let mut known: Vec<(f64, f64)> = [left, right].into_iter().flatten().collect();
        known.push(sample(i));
        let Some(certificate) = certify_zero(xs[i], &known, range, &options.tol, &mut call) else {
            continue;
        };
        let kind = match (left, right) {
            (Some(l), Some(r))
                if finite_nonzero(l.1) && finite_nonzero(r.1) && (l.1 < 0.0) == (r.1 < 0.0) =>
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
            certificate: Some(certificate),
        });
    }

    let mut take = |refined: Refined, roots: &mut Vec<RangeRoot>| match refined {
        Refined::Root(root) => {
            if !root.converged {
                unsettled += 1;
            }
            roots.push(root);
        }
        Refined::Discontinuity(bracket) => discontinuities.push(bracket),
    };

    for i in 0..n - 1 {
        let (fa, fb) = (fs[i], fs[i + 1]);
        if signed(fa) && signed(fb) && (fa < 0.0) != (fb < 0.0) {
            let mut others = Vec::new();
            if i > 0 && fs[i - 1].is_finite() {
                others.push(sample(i - 1));
            }
            if i + 2 < n && fs[i + 2].is_finite() {
                others.push(sample(i + 2));
            }
            let refined = refine(
                sample(i),
                sample(i + 1),
                &others,
                range,
                &options.tol,
                &mut call,
            );
            take(refined, &mut roots);
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
            Minimum::At { x, fx, width } => {
                let h = (x - xs[i - 1]).min(xs[i + 1] - x);
                let certificate = if fx == 0.0 {
                    let known = [sample(i - 1), (x, 0.0), sample(i + 1)];
                    certify_zero(x, &known, range, &options.tol, &mut call)
                } else {
                    certify_touching(x, fx, width, h, gl.min(gr), &options.tol)
                };
                if let Some(certificate) = certificate {
                    roots.push(RangeRoot {
                        x,
                        fx,
                        kind: RootKind::Touching,
                        converged: true,
                        certificate: Some(certificate),
                    });
                }
            }
            Minimum::SignChange(p) => {
                // Two simple roots inside one dip: refine both.
                for (a, b) in [(sample(i - 1), p), (p, sample(i + 1))] {
                    let (a, b) = if a.0 < b.0 { (a, b) } else { (b, a) };
                    let refined = refine(a, b, &[], range, &options.tol, &mut call);
                    take(refined, &mut roots);
                }
            }
            Minimum::Gave => {}
        }
    }

    roots.sort_by(|p, q| p.x.total_cmp(&q.x));
    roots.dedup_by(|later, earlier| later.x == earlier.x);
    discontinuities.sort_by(|p, q| p.0.total_cmp(&q.0));

    let mut limits = format!(
        "Scanned [{lo}, {hi}] at {n} evenly spaced samples, {h:e} apart. Roots closer \
         together than one spacing may be missed (two sign changes within one spacing \
         cancel out), and so may a touching root whose dip does not show as a local \
         minimum of |f| among the samples, or that lies within one spacing of either end. \
         A touching root is accepted only when |f| falls towards zero at its minimum at \
         least as fast as a double root's."
    );
    if nonfinite > 0 {
        limits.push_str(&format!(
            " f was not finite at {nonfinite} of the samples; roots next to those were not sought."
        ));
    }
    if !discontinuities.is_empty() {
        limits.push_str(&format!(
            " {} sign change(s) were poles or jumps (|f| did not shrink as the bracket closed), not roots; they are listed apart.",
            discontinuities.len()
        ));
    }
    if unsettled > 0 {
        limits.push_str(&format!(
            " {unsettled} refinement(s) ended without a certificate (budget of {} evaluations, or undefined values) and are marked not converged.",
            options.tol.max_evals
        ));
    }
    Ok(RangeRoots {
        roots,
        discontinuities,
        evaluations: evals,
        samples: n,
        spacing: h,
        limits,
    })
}

/// What refining one sign change gave.
enum Refined {
    Root(RangeRoot),
    /// A pole or a jump: the final bracket.
    Discontinuity((f64, f64)),
}

/// Refines the sign change between the samples a and b with the bracketing hybrid,
/// through the driver (so the root carries its certificate).
fn refine(
    a: (f64, f64),
    b: (f64, f64),
    others: &[(f64, f64)],
    range: Bounds,
    tol: &Tolerances,
    call: &mut dyn FnMut(f64) -> f64,
) -> Refined {
    let method = Hybrid::from_points(a.0, a.1, b.0, b.1, others);
    let mut known = vec![a, b];
    known.extend_from_slice(others);
    let settings = Settings {
        tol: *tol,
        bounds: range,
        record_history: false,
        keep_told: false,
    };
    let mut driver = Driver::new(Box::new(method), settings, &known);
    while let Some(x) = driver.next_point() {
        let fx = call(x);
        if driver.tell(fx).is_err() {
            break;
        }
    }
    let s = driver.into_solution();
    if s.status == Status::Discontinuity {
        return Refined::Discontinuity(s.bracket.unwrap_or((a.0, b.0)));
    }
    Refined::Root(RangeRoot {
        x: s.root,
        fx: s.residual,
        kind: RootKind::SignChange,
        converged: s.converged,
        certificate: s.certificate,
    })
}

/// The certificate of an exact zero at x found among `known` points, making the one
/// checking evaluation the certificate may ask for.
fn certify_zero(
    x: f64,
    known: &[(f64, f64)],
    range: Bounds,
    tol: &Tolerances,
    call: &mut dyn FnMut(f64) -> f64,
) -> Option<Certificate> {
    let mut evidence = Evidence::new();
    for &(t, ft) in known {
        evidence.push(t, ft);
    }
    let claim = Claim {
        status: Status::ExactZero,
        root: x,
        at: x,
        residual: 0.0,
        bracket: None,
        step: f64::NAN,
    };
    for checks in 0..=1 {
        match certificate::assess(&claim, &evidence, tol, checks) {
            Verdict::Certified(c) => return Some(c),
            Verdict::Refused(_) | Verdict::Bracket(..) => return None,
            Verdict::Probe(p, _) => {
                let p = if range.contains(p) { p } else { 2.0 * x - p };
                if !range.contains(p) || evidence.lookup(p).is_some() {
                    return None;
                }
                evidence.push(p, call(p));
            }
        }
    }
    None
}

/// The certificate of a touching root: |f| at the minimum, located to a width w, is at
/// most [`TOUCH_FACTOR`]·|f(sample)|·(w/h)², the sample being the nearer one's value
/// `f_side` at distance h; or within the residual tolerance.
fn certify_touching(
    x: f64,
    fx: f64,
    w: f64,
    h: f64,
    f_side: f64,
    tol: &Tolerances,
) -> Option<Certificate> {
    let m = fx.abs();
    if m <= tol.f_abs {
        return Some(Certificate {
            kind: CertificateKind::Residual,
            residual: m,
            bound: tol.f_abs,
            bracket: None,
            width: 0.0,
            reference: None,
        });
    }
    let w = w.max(f64::MIN_POSITIVE);
    let bound = TOUCH_FACTOR * f_side * (w / h) * (w / h);
    (m <= bound && h > 0.0).then_some(Certificate {
        kind: CertificateKind::Touching,
        residual: m,
        bound,
        bracket: None,
        width: w,
        reference: Some((x + h, f_side)),
    })
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
    /// The minimum of |f|: (x, f(x)) and the width of the interval it was located in.
    At { x: f64, fx: f64, width: f64 },
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
            return Minimum::At {
                x,
                fx: fx_signed,
                width: b - a,
            };
        }
        // Probe the larger part.
        let u = if x - a > b - x {
            x - G * (x - a)
        } else {
            x + G * (b - x)
        };
        if u <= a || u >= b || u == x {
            return Minimum::At {
                x,
                fx: fx_signed,
                width: b - a,
            };
        }
        used += 1;
        let fu_signed = f(u);
        if !fu_signed.is_finite() {
            return Minimum::Gave;
        }
        if fu_signed == 0.0 {
            return Minimum::At {
                x: u,
                fx: 0.0,
                width: 0.0,
            };
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
                return Minimum::At {
                    x,
                    fx: fx_signed,
                    width: b - a,
                };
            }
        } else if u < x {
            a = u;
        } else {
            b = u;
        }
    }
    // Budget spent: report the interval reached; the touching test judges it.
    Minimum::At {
        x,
        fx: fx_signed,
        width: b - a,
    }
}
