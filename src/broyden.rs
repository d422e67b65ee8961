//! Systems of n equations in n unknowns: Broyden's method, the secant method in n
//! dimensions.

use crate::certificate::{Certificate, CertificateKind, REFERENCE_SPAN};
use crate::error::{require_finite, InputError};
use crate::outcome::{BoundedLog, Status, StepKind};
use crate::tolerances::{Bounds, Tolerances};

/// Largest system accepted (dense n × n Jacobian).
pub const MAX_UNKNOWNS: usize = 500;
/// Halvings of a step before the line search gives up on the current Jacobian.
const MAX_BACKTRACKS: usize = 10;
/// Sufficient decrease of ½‖F‖² along the step (Armijo constant, Dennis & Schnabel §6.3).
const ARMIJO: f64 = 1e-4;
/// Rows of system history kept from the start and from the end of a long solve.
pub const HISTORY_HEAD: usize = 200;
pub const HISTORY_TAIL: usize = 800;
/// Recent points remembered to refuse evaluating one twice.
const RECENT: usize = 64;
/// Accepted iterates remembered for the certificate.
const ITERATES: usize = 32;

/// The budget of a system of n unknowns when the caller left the default of 200: the
/// first Jacobian alone takes n + 1 evaluations, so the default grows with n.
pub fn default_budget(n: usize) -> usize {
    200 + 4 * (n + 1)
}

/// The budget to use: [`default_budget`] when `tol.max_evals` is the default, else
/// what the caller set.
pub fn budget(tol: &Tolerances, n: usize) -> usize {
    if tol.max_evals == Tolerances::default().max_evals {
        default_budget(n).min(crate::tolerances::MAX_EVALS)
    } else {
        tol.max_evals
    }
}

/// How to solve a system. The default: default tolerances, unbounded, no history.
#[derive(Debug, Clone, PartialEq, Default)]
pub struct SystemOptions {
    /// Step tolerance per unknown (`x_abs + x_rel·|x_i|`), residual tolerance on the
    /// largest |F_i|, and the budget of evaluations of F (each evaluation is one call
    /// of F, which fills all n residuals).
    pub tol: Tolerances,
    /// Bounds per unknown; empty means unbounded.
    pub bounds: Vec<Bounds>,
    /// Keep one [`SystemHistoryRow`] per evaluation.
    pub record_history: bool,
}

/// One row per evaluation of F.
#[derive(Debug, Clone, PartialEq)]
pub struct SystemHistoryRow {
    /// 1-based evaluation number.
    pub k: usize,
    pub x: Vec<f64>,
    /// Euclidean norm of F(x) (NaN if some residual is not finite).
    pub residual_norm: f64,
    /// `Initial`, `Probe` (finite-difference Jacobian), `Secant` (a full Broyden step)
    /// or `Backtrack` (a shortened one).
    pub kind: StepKind,
}

/// The result of a system solve. `converged` is true only when `status` says so.
#[derive(Debug, Clone, PartialEq)]
pub struct SystemSolution {
    /// The best point found (the last accepted one).
    pub x: Vec<f64>,
    /// F(x).
    pub residuals: Vec<f64>,
    pub converged: bool,
    pub status: Status,
    /// Exact number of calls of F.
    pub evaluations: usize,
    /// Accepted steps.
    pub iterations: usize,
    /// The evidence for convergence, `Some` exactly when `converged`. For a system the
    /// residual is max |F_i|, `width` the last step (largest component), and
    /// `reference` holds (distance to the reference iterate, max |F_i| there).
    pub certificate: Option<Certificate>,
    /// Empty unless requested; long solves keep the first [`HISTORY_HEAD`] and the
    /// last [`HISTORY_TAIL`] rows.
    pub history: Vec<SystemHistoryRow>,
    /// Rows left out of `history` between the two.
    pub history_dropped: usize,
}

/// Solves F(x) = 0 for n equations in n unknowns, with `f(x, out)` writing F(x) into
/// `out` (length n).
///
/// Algorithm (Broyden's method with a line search):
/// 1. Evaluate F(x₀) and build the initial Jacobian B₀ by forward differences, one
///    evaluation per unknown, with step h_j = √eps·typ_j, taken backwards when a
///    forward step would leave the bounds. typ_j, the unknown's typical size, is the
///    larger of |x_j| and its starting |x_j| (else the largest |x_k| of any unknown,
///    else 1), so an unknown passing near zero keeps a usable step. √eps balances
///    truncation against rounding error for a forward difference (Dennis & Schnabel
///    §5.4, with typ_j in place of their typx). When F does not change at all over
///    that step (an unknown started at 1e-20 or at a subnormal value in an equation
///    whose scale is 1), the step becomes √eps·max(1, largest |x_k|), their default
///    typx = 1; when the change is still within rounding noise (below 1000·eps·|F|), it
///    grows a thousandfold, at most twice.
/// 2. Solve B s = −F by Gaussian elimination with partial pivoting.
/// 3. Try x + λs with λ = 1, projected into the bounds. Accept it when
///    ½‖F(x + λs)‖² <= (1 − 2·1e-4·λ)·½‖F(x)‖²; otherwise halve λ, up to ten times
///    (a non-finite F counts as a failure, so the search backs away from a domain error).
/// 4. On acceptance, Broyden's "good" rank-one update: with s the step taken and
///    y = F_new − F_old, B ← B + (y − B s) sᵀ / (sᵀ s).
/// 5. If the line search fails, or B is singular, rebuild B by finite differences at the
///    current point once; if that does not help either, stop.
///
/// Stops: converged on residual when max |F_i| <= f_abs, exact zero when F = 0, on step
/// when a full step (λ = 1) that did not increase ‖F‖ is within `x_abs + x_rel·typ_i` in
/// every unknown (typ_i as for the Jacobian, so an unknown whose root is 0 still stops)
/// *and* the residual shrank with the steps: max |F| ≤ 4·max |F(x_ref)|·(s/d), with s
/// the last step and x_ref the nearest remembered iterate at least 64 steps away (d),
/// else the start (the scalar step certificate, [`crate::certificate`]); a small step
/// whose residual did not shrink ends as [`Status::LargeResidual`]. The default
/// budget grows with n ([`budget`]). Otherwise: [`Status::BudgetSpent`], [`Status::Flat`] (singular Jacobian
/// even from fresh differences), [`Status::Stagnated`] (no decrease of ‖F‖ along the
/// step even with a fresh Jacobian), [`Status::NonFinite`] (F not finite at the start,
/// or wherever the search looked), [`Status::StuckAtBound`] (the bounds cut the step to
/// nothing).
///
/// - Order of convergence: superlinear near a root with a nonsingular Jacobian
///   (Broyden, Dennis & Moré 1974), not quadratic.
/// - Evaluations: 1 + n to start (and n for each rebuilt Jacobian), then one per trial
///   point: one per iteration when the full step is accepted.
/// - References: C. G. Broyden, "A class of methods for solving nonlinear simultaneous
///   equations", Math. Comp. 19 (1965) 577–593; J. E. Dennis & R. B. Schnabel,
///   *Numerical Methods for Unconstrained Optimization and Nonlinear Equations* (1983),
///   §8.1 and §6.3.
///
/// ```
/// use tacit::broyden::{solve_system, SystemOptions};
/// // x² + y² = 4, x = y: the root (√2, √2).
/// let s = solve_system(&[1.0, 2.0], &SystemOptions::default(), |v, out| {
///     out[0] = v[0] * v[0] + v[1] * v[1] - 4.0;
///     out[1] = v[0] - v[1];
/// })
/// .unwrap();
/// assert!(s.converged);
/// assert!((s.x[0] - 2f64.sqrt()).abs() < 1e-10);
/// ```
pub fn solve_system(
    x0: &[f64],
    options: &SystemOptions,
    f: impl FnMut(&[f64], &mut [f64]),
) -> Result<SystemSolution, InputError> {
    let n = x0.len();
    if n == 0 {
        return Err(InputError::new(
            "no-unknowns",
            "a system needs at least one unknown",
        ));
    }
    if n > MAX_UNKNOWNS {
        return Err(InputError::new(
            "too-many-unknowns",
            format!("a system may have at most {MAX_UNKNOWNS} unknowns, got {n}"),
        ));
    }
    options.tol.validate()?;
    for (i, &v) in x0.iter().enumerate() {
        require_finite(v, &format!("starting value of unknown {}", i + 1))?;
    }
    let bounds: Vec<Bounds> = if options.bounds.is_empty() {
        vec![Bounds::UNBOUNDED; n]
    } else if options.bounds.len() == n {
        options.bounds.clone()
    } else {
        return Err(InputError::new(
            "bad-bounds",
            format!(
                "{} bounds were given for {n} unknowns; give one per unknown or none",
                options.bounds.len()
            ),
        ));
    };
    for (i, b) in bounds.iter().enumerate() {
        b.validate()
            .map_err(|e| InputError::new(e.code, format!("unknown {}: {}", i + 1, e.message)))?;
        if !b.contains(x0[i]) {
            return Err(InputError::new(
                "start-outside-bounds",
                format!(
                    "starting value {} of unknown {} lies outside its bounds [{}, {}]",
                    x0[i],
                    i + 1,
                    b.lo,
                    b.hi
                ),
            ));
        }
    }
    let mut tol = options.tol;
    tol.max_evals = budget(&options.tol, n);
    let mut run = Run {
        n,
        f,
        tol,
        bounds,
        record: options.record_history,
        evaluations: 0,
        history: BoundedLog::new(HISTORY_HEAD, HISTORY_TAIL),
        recent: Vec::new(),
        next_recent: 0,
        iterates: Vec::new(),
        x0: x0.to_vec(),
    };
    Ok(run.solve(x0))
}

struct Run<F> {
    n: usize,
    f: F,
    tol: Tolerances,
    bounds: Vec<Bounds>,
    record: bool,
    evaluations: usize,
    history: BoundedLog<SystemHistoryRow>,
    /// The latest evaluated points (a ring of [`RECENT`]), to refuse repeats: the
    /// Jacobian probes and line-search points that could repeat are all recent.
    recent: Vec<Vec<f64>>,
    next_recent: usize,
    /// Accepted iterates (x, F(x)), a ring of [`ITERATES`] keeping the start, for the
    /// certificate.
    iterates: Vec<(Vec<f64>, Vec<f64>)>,
    x0: Vec<f64>,
}

fn norm(v: &[f64]) -> f64 {
    let m = v.iter().fold(0.0f64, |m, x| m.max(x.abs()));
    if !m.is_finite() {
        return f64::NAN;
    }
    if m == 0.0 {
        return 0.0;
    }
    m * v.iter().map(|x| (x / m) * (x / m)).sum::<f64>().sqrt()
}

enum Eval {
    Done(Vec<f64>),
    /// The budget would be exceeded.
    Budget,
    /// The point was already evaluated.
    Repeat,
}

impl<F: FnMut(&[f64], &mut [f64])> Run<F> {
    /// Unknown j's typical size: its current or starting magnitude, else the largest
    /// magnitude of any unknown now or at the start, else 1.
    fn typical(&self, x: &[f64], j: usize) -> f64 {
        let t = x[j].abs().max(self.x0[j].abs());
        if t > 0.0 {
            return t;
        }
        let overall = x.iter().chain(&self.x0).fold(0.0f64, |m, v| m.max(v.abs()));
        if overall > 0.0 {
            overall
        } else {
            1.0
        }
    }

    /// The step tolerance of unknown j.
    fn x_tol(&self, x: &[f64], j: usize) -> f64 {
        self.tol.x_abs + self.tol.x_rel * self.typical(x, j)
    }

    fn eval(&mut self, x: &[f64], kind: StepKind) -> Eval {
        if self.recent.iter().any(|p| p.as_slice() == x) {
            return Eval::Repeat;
        }
        if self.evaluations >= self.tol.max_evals {
            return Eval::Budget;
        }
        let mut out = vec![f64::NAN; self.n];
        (self.f)(x, &mut out);
        self.evaluations += 1;
        if self.recent.len() < RECENT {
            self.recent.push(x.to_vec());
        } else {
            self.recent[self.next_recent] = x.to_vec();
            self.next_recent = (self.next_recent + 1) % RECENT;
        }
        if self.record {
            self.history.push(SystemHistoryRow {
                k: self.evaluations,
                x: x.to_vec(),
                residual_norm: norm(&out),
                kind,
            });
        }
        Eval::Done(out)
    }

    fn finish(
        &mut self,
        status: Status,
        x: Vec<f64>,
        fx: Vec<f64>,
        iterations: usize,
    ) -> SystemSolution {
        self.finish_certified(status, None, x, fx, iterations)
    }

    fn finish_certified(
        &mut self,
        status: Status,
        certificate: Option<Certificate>,
        x: Vec<f64>,
        fx: Vec<f64>,
        iterations: usize,
    ) -> SystemSolution {
        let history = std::mem::replace(&mut self.history, BoundedLog::new(0, 0));
        let (history, history_dropped) = history.into_parts();
        SystemSolution {
            x,
            residuals: fx,
            converged: certificate.is_some(),
            status,
            evaluations: self.evaluations,
            iterations,
            certificate,
            history,
            history_dropped,
        }
    }

    /// Ends on a claim of convergence, granted only with its certificate.
    fn claim(
        &mut self,
        status: Status,
        step_vec: &[f64],
        x: Vec<f64>,
        fx: Vec<f64>,
        iterations: usize,
    ) -> SystemSolution {
        let step = step_vec.iter().fold(0.0f64, |a, v| a.max(v.abs()));
        let m = fx.iter().fold(0.0f64, |a, v| a.max(v.abs()));
        let certificate = match status {
            Status::ExactZero => Some(Certificate {
                kind: CertificateKind::ExactZero,
                residual: 0.0,
                bound: 0.0,
                bracket: None,
                width: 0.0,
                reference: None,
            }),
            Status::ConvergedResidual => (m <= self.tol.f_abs).then_some(Certificate {
                kind: CertificateKind::Residual,
                residual: m,
                bound: self.tol.f_abs,
                bracket: None,
                width: 0.0,
                reference: None,
            }),
            _ => {
                // Distances in each unknown's own scale, residuals in each equation's
                // own scale (the largest |F_i| remembered), so that unknowns and
                // equations of different sizes weigh alike.
                let n = self.n;
                let typ: Vec<f64> = (0..n).map(|j| self.typical(&x, j)).collect();
                let dist =
                    |p: &[f64]| (0..n).fold(0.0f64, |a, j| a.max((p[j] - x[j]).abs() / typ[j]));
                let scale: Vec<f64> = (0..n)
                    .map(|i| {
                        self.iterates
                            .iter()
                            .fold(fx[i].abs(), |a, (_, f)| a.max(f[i].abs()))
                            .max(f64::MIN_POSITIVE)
                    })
                    .collect();
                let weighted = |f: &[f64]| (0..n).fold(0.0f64, |a, i| a.max(f[i].abs() / scale[i]));
                let wm = weighted(&fx);
                let s_scaled = (0..n).fold(0.0f64, |a, j| a.max(step_vec[j].abs() / typ[j]));
                let far = self
                    .iterates
                    .iter()
                    .map(|(p, f)| (dist(p), weighted(f)))
                    .filter(|&(d, fr)| d >= REFERENCE_SPAN * s_scaled && fr.is_finite())
                    .min_by(|a, b| a.0.total_cmp(&b.0));
                let reference = far.or_else(|| {
                    let start = self.iterates.first()?;
                    let d = dist(&start.0);
                    (d >= 2.0 * s_scaled).then_some((d, weighted(&start.1)))
                });
                reference.and_then(|(d, fr)| {
                    let bound = 4.0 * fr * (s_scaled / d);
                    (wm <= bound).then_some(Certificate {
                        kind: CertificateKind::Step,
                        residual: m,
                        bound: bound * m / wm.max(f64::MIN_POSITIVE),
                        bracket: None,
                        width: step,
                        reference: Some((d, fr)),
                    })
                })
            }
        };
        let status = if certificate.is_some() {
            status
        } else {
            Status::LargeResidual
        };
        self.finish_certified(status, certificate, x, fx, iterations)
    }

    fn remember(&mut self, x: &[f64], fx: &[f64]) {
        if self.iterates.len() >= ITERATES {
            // Keep the start; rotate the rest.
            self.iterates.remove(1);
        }
        self.iterates.push((x.to_vec(), fx.to_vec()));
    }

    /// Forward-difference Jacobian at x (row i, column j = dF_i/dx_j), or the status
    /// that prevents it.
    fn jacobian(&mut self, x: &[f64], fx: &[f64]) -> Result<Vec<f64>, Status> {
        let n = self.n;
        let mut jac = vec![0.0; n * n];
        let f_scale = fx.iter().fold(0.0f64, |a, v| a.max(v.abs()));
        let noise = 1e3 * f64::EPSILON * f_scale;
        let unit_step =
            f64::EPSILON.sqrt() * x.iter().chain(&self.x0).fold(1.0f64, |a, v| a.max(v.abs()));
        for j in 0..n {
            let mut h = (f64::EPSILON.sqrt() * self.typical(x, j)).max(f64::MIN_POSITIVE);
            let mut done = false;
            let mut grown = 0;
            for _attempt in 0..8 {
                let b = self.bounds[j];
                let mut xp = x.to_vec();
                xp[j] = if b.contains(x[j] + h) {
                    x[j] + h
                } else {
                    x[j] - h
                };
                if !b.contains(xp[j]) {
                    return Err(Status::StuckAtBound);
                }
                if xp[j] == x[j] {
                    // Below the spacing of floats at x_j: take the unit-scale step.
                    if h >= unit_step {
                        return Err(Status::StuckAtBound);
                    }
                    h = unit_step;
                    continue;
                }
                let step = xp[j] - x[j];
                match self.eval(&xp, StepKind::Probe) {
                    Eval::Budget => return Err(Status::BudgetSpent),
                    Eval::Repeat => {
                        h *= 1.5;
                        continue;
                    }
                    Eval::Done(fp) => {
                        if fp.iter().any(|v| !v.is_finite()) {
                            return Err(Status::NonFinite);
                        }
                        let change = fp
                            .iter()
                            .zip(fx)
                            .fold(0.0f64, |a, (p, q)| a.max((p - q).abs()));
                        if change == 0.0 && h < unit_step {
                            h = unit_step;
                            continue;
                        }
                        if change > 0.0 && change <= noise && grown < 2 {
                            grown += 1;
                            h *= 1e3;
                            continue;
                        }
                        for i in 0..n {
                            jac[i * n + j] = (fp[i] - fx[i]) / step;
                        }
                        done = true;
                        break;
                    }
                }
            }
            if !done {
                return Err(Status::Stagnated);
            }
        }
        Ok(jac)
    }

    fn solve(&mut self, x0: &[f64]) -> SystemSolution {
        let n = self.n;
        let mut x = x0.to_vec();
        let mut fx = match self.eval(&x, StepKind::Initial) {
            Eval::Done(v) => v,
            _ => return self.finish(Status::BudgetSpent, x, vec![f64::NAN; n], 0),
        };
        if fx.iter().any(|v| !v.is_finite()) {
            return self.finish(Status::NonFinite, x, fx, 0);
        }
        self.remember(&x, &fx);
        let mut iterations = 0usize;
        let mut jac = match self.jacobian(&x, &fx) {
            Ok(j) => j,
            Err(status) => return self.finish(status, x, fx, 0),
        };
        let mut fresh = true;
        loop {
            if fx.iter().all(|&v| v == 0.0) {
                return self.claim(Status::ExactZero, &[], x, fx, iterations);
            }
            if fx.iter().all(|v| v.abs() <= self.tol.f_abs) {
                return self.claim(Status::ConvergedResidual, &[], x, fx, iterations);
            }
            let rhs: Vec<f64> = fx.iter().map(|v| -v).collect();
            let Some(step) = solve_dense(&jac, &rhs, n) else {
                if fresh {
                    return self.finish(Status::Flat, x, fx, iterations);
                }
                match self.jacobian(&x, &fx) {
                    Ok(j) => {
                        jac = j;
                        fresh = true;
                        continue;
                    }
                    Err(status) => return self.finish(status, x, fx, iterations),
                }
            };
            let f_norm = norm(&fx);
            let mut lambda = 1.0;
            let mut accepted = None;
            let mut blocked_at = None;
            let mut nonfinite = false;
            for t in 0..=MAX_BACKTRACKS {
                let trial: Vec<f64> = (0..n)
                    .map(|i| self.bounds[i].clamp(x[i] + lambda * step[i]))
                    .collect();
                if trial == x {
                    blocked_at = Some(t);
                    break;
                }
                let kind = if t == 0 {
                    StepKind::Secant
                } else {
                    StepKind::Backtrack
                };
                match self.eval(&trial, kind) {
                    Eval::Budget => return self.finish(Status::BudgetSpent, x, fx, iterations),
                    Eval::Repeat => {}
                    Eval::Done(ft) => {
                        let ft_norm = norm(&ft);
                        // A full step within the step tolerance that does not make F
                        // worse is accepted: at the root, F is rounding noise and
                        // cannot decrease further.
                        let tiny = t == 0
                            && (0..n).all(|i| (trial[i] - x[i]).abs() <= self.x_tol(&trial, i));
                        if !ft_norm.is_finite() {
                            nonfinite = true;
                        } else if ft_norm * ft_norm
                            <= (1.0 - 2.0 * ARMIJO * lambda) * f_norm * f_norm
                            || (tiny && ft_norm <= f_norm)
                        {
                            accepted = Some((trial, ft, t == 0));
                            break;
                        }
                    }
                }
                lambda *= 0.5;
            }
            let Some((xn, fxn, full)) = accepted else {
                if blocked_at.is_some() {
                    let pressed = (0..n).any(|i| {
                        let b = self.bounds[i];
                        (step[i] < 0.0 && x[i] == b.lo) || (step[i] > 0.0 && x[i] == b.hi)
                    });
                    if pressed {
                        return self.finish(Status::StuckAtBound, x, fx, iterations);
                    }
                    if blocked_at == Some(0) && iterations > 0 {
                        // The full step no longer changes x in floating point.
                        let least: Vec<f64> = x
                            .iter()
                            .zip(&step)
                            .map(|(v, d)| {
                                d.abs()
                                    .max(4.0 * f64::EPSILON * v.abs())
                                    .max(f64::MIN_POSITIVE)
                            })
                            .collect();
                        return self.claim(Status::ConvergedStep, &least, x, fx, iterations);
                    }
                }
                if fresh {
                    let status = if nonfinite {
                        Status::NonFinite
                    } else {
                        Status::Stagnated
                    };
                    return self.finish(status, x, fx, iterations);
                }
                match self.jacobian(&x, &fx) {
                    Ok(j) => {
                        jac = j;
                        fresh = true;
                        continue;
                    }
                    Err(status) => return self.finish(status, x, fx, iterations),
                }
            };
            iterations += 1;
            let s: Vec<f64> = (0..n).map(|i| xn[i] - x[i]).collect();
            let small_step = (0..n).all(|i| s[i].abs() <= self.x_tol(&xn, i));
            // Broyden's good update: B += (y - B s) sᵀ / (sᵀ s).
            let ss: f64 = s.iter().map(|v| v * v).sum();
            if ss > 0.0 {
                for i in 0..n {
                    let bs: f64 = (0..n).map(|j| jac[i * n + j] * s[j]).sum();
                    let r = (fxn[i] - fx[i] - bs) / ss;
                    for j in 0..n {
                        jac[i * n + j] += r * s[j];
                    }
                }
            }
            fresh = false;
            x = xn;
            fx = fxn;
            if small_step && full {
                if fx.iter().all(|&v| v == 0.0) {
                    return self.claim(Status::ExactZero, &[], x, fx, iterations);
                }
                return self.claim(Status::ConvergedStep, &s, x, fx, iterations);
            }
            self.remember(&x, &fx);
        }
    }
}

/// Solves the dense system A s = b (A row-major n × n) by Gaussian elimination with
/// partial pivoting; None when A is singular to working precision.
pub fn solve_dense(a: &[f64], b: &[f64], n: usize) -> Option<Vec<f64>> {
    let mut m = a.to_vec();
    let mut r = b.to_vec();
    let scale = m.iter().fold(0.0f64, |s, v| s.max(v.abs()));
    if scale.is_nan() || scale <= 0.0 || !scale.is_finite() {
        return None;
    }
    for k in 0..n {
        let p = (k..n).max_by(|&i, &j| m[i * n + k].abs().total_cmp(&m[j * n + k].abs()))?;
        let pivot = m[p * n + k];
        if pivot.is_nan() || pivot.abs() <= scale * f64::EPSILON * n as f64 {
            return None;
        }
        if p != k {
            for j in 0..n {
                m.swap(k * n + j, p * n + j);
            }
            r.swap(k, p);
        }
        for i in k + 1..n {
            let factor = m[i * n + k] / pivot;
            if factor != 0.0 {
                for j in k..n {
                    m[i * n + j] -= factor * m[k * n + j];
                }
                r[i] -= factor * r[k];
            }
        }
    }
    let mut x = vec![0.0; n];
    for k in (0..n).rev() {
        let sum: f64 = (k + 1..n).map(|j| m[k * n + j] * x[j]).sum();
        x[k] = (r[k] - sum) / m[k * n + k];
    }
    x.iter().all(|v| v.is_finite()).then_some(x)
}
