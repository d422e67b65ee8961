//! Sensitivities of the unknowns to the given values, by the implicit function theorem.
//!
//! At a solution the residuals satisfy F(u, p) = 0, with u the unknowns and p the given
//! values. Differentiating, J_u · du/dp = -J_p, so the derivative matrix is
//! `S = -J_u⁻¹ J_p`, found by Gaussian elimination with partial pivoting. The relative
//! sensitivity `(du/dp)(p/u)` is the percentage change of u per 1 % change of p
//! (NaN when u = 0).
//!
//! **Jacobians by forward-mode differentiation** ([`Method::ForwardMode`], the one
//! every solve of an equation text or a template uses). The equations are compiled
//! programs, so column j of [u p] is one run of every equation with dual numbers
//! ([`crate::equations::Dual`]) seeded along z_j: exact up to rounding, with no step
//! to choose and no evaluation of f at a point, so `sensitivity_evaluations` is 0; the
//! runs are counted in `sensitivity_runs` (n + m of them for n unknowns and m knowns).
//!
//! **Jacobians by central differences** ([`Method::CentralDifferences`]), for functions
//! that are not programs (a JavaScript callback) and as an independent check in the
//! tests. Column j is `(F(z + h e_j) - F(z - h e_j)) / (z_j+h - (z_j-h))` with
//! `h = ε^(1/3)·|z_j|` (about 6.1e-6 relative; `ε^(1/3)` when z_j = 0), ε the machine
//! epsilon. That step balances the O(h²) truncation error against the O(ε/h) rounding
//! error, leaving about 10 correct digits for smooth residuals (common practice, no
//! source). The divisor is the difference of the two points actually evaluated, so the
//! rounding of z ± h does not bias the slope. When the whole set was one scalar
//! problem, J_u may be the slope of a secant through two points the solver already
//! evaluated ([`slope_from_history`]). Each column costs 2 evaluations of every
//! equation, counted in `sensitivity_evaluations`.

use super::dual::Dual;
use super::set::Layout;
use crate::error::InputError;
use crate::outcome::HistoryRow;

/// The derivative of one unknown with respect to one given value.
#[derive(Debug, Clone, PartialEq)]
pub struct Sensitivity {
    pub unknown: String,
    pub input: String,
    /// d unknown / d input.
    pub derivative: f64,
    /// (d unknown / d input) · input / unknown: % change of the unknown per % of the input.
    pub relative: f64,
}

/// The largest acceptable estimated relative error of a re-used secant slope.
pub const REUSE_TOLERANCE: f64 = 1e-5;

/// The secant slope through two evaluated points near `root` (among the last eight
/// with finite values), when its estimated relative error is within [`REUSE_TOLERANCE`].
pub fn slope_from_history(rows: &[HistoryRow], root: f64) -> Option<f64> {
    let scale = if root != 0.0 { root.abs() } else { 1.0 };
    let pts: Vec<(f64, f64)> = rows
        .iter()
        .rev()
        .filter(|r| r.x.is_finite() && r.fx.is_finite())
        .take(8)
        .map(|r| (r.x, r.fx))
        .collect();
    let mut best: Option<(f64, f64)> = None;
    for (i, &(xi, fi)) in pts.iter().enumerate() {
        for &(xj, fj) in &pts[i + 1..] {
            if xi == xj {
                continue;
            }
            let d = (xi - root).abs().max((xj - root).abs()) / scale;
            let w = (xi - xj).abs() / scale;
            let est = d + 1e-15 / w;
            let slope = (fi - fj) / (xi - xj);
            if est <= REUSE_TOLERANCE
                && slope.is_finite()
                && slope != 0.0
                && best.is_none_or(|(e, _)| est < e)
            {
                best = Some((est, slope));
            }
        }
    }
    best.map(|(_, s)| s)
}

/// The finite-difference step for a value `z`.
pub fn step(z: f64) -> f64 {
    let c = f64::EPSILON.cbrt();
    if z == 0.0 {
        c
    } else {
        c * z.abs()
    }
}

/// How the Jacobians of the sensitivities are computed.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Method {
    /// One run of the program with dual numbers per column: exact up to rounding.
    ForwardMode,
    /// Two evaluations per column (see the module documentation).
    CentralDifferences,
}

impl Method {
    pub fn code(self) -> &'static str {
        match self {
            Method::ForwardMode => "forward-mode",
            Method::CentralDifferences => "central-differences",
        }
    }
}

/// What the sensitivities cost.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub struct Cost {
    /// Evaluations of every equation at a point (central differences only).
    pub evaluations: usize,
    /// Runs of every equation with dual numbers (forward mode only).
    pub runs: usize,
}

/// Sensitivities of the `unknowns` (name and solved value) of `set` to every one of
/// the `knowns`, computed with `method`, in unknown-major order, and their cost.
///
/// ```
/// use tacit::equations::EquationSet;
/// use tacit::equations::sensitivity::{sensitivities_at, Method};
/// // x = a·b: dx/da = b, dx/db = a.
/// let set = EquationSet::parse("x = a*b").unwrap();
/// let knowns = [("a".to_string(), 3.0), ("b".to_string(), 5.0)];
/// let (s, cost) = sensitivities_at(&set, &knowns, &[("x".into(), 15.0)], Method::ForwardMode).unwrap();
/// assert_eq!((s[0].derivative, s[1].derivative), (5.0, 3.0));
/// assert_eq!((cost.evaluations, cost.runs), (0, 3));
/// ```
pub fn sensitivities_at(
    set: &super::EquationSet,
    knowns: &[(String, f64)],
    unknowns: &[(String, f64)],
    method: Method,
) -> Result<(Vec<Sensitivity>, Cost), InputError> {
    let specs: Vec<super::UnknownSpec> = unknowns
        .iter()
        .map(|(n, _)| super::UnknownSpec::named(n))
        .collect();
    let plan = super::solve::check_names(set, knowns, &specs)?;
    let names: Vec<String> = unknowns.iter().map(|(n, _)| n.clone()).collect();
    let layout = set.layout(plan.variables.clone(), &names);
    let slots: Vec<usize> = names
        .iter()
        .map(|n| layout.require_slot(n))
        .collect::<Result<_, _>>()?;
    let mut values = plan.values.clone();
    for (&s, (_, v)) in slots.iter().zip(unknowns) {
        values[s] = *v;
    }
    compute(&layout, &values, &names, &slots, knowns, None, method)
}

/// Sensitivities of `names` (at variable slots `slots`) to every known, at the
/// solution `values` (indexed by variable slot). Returns them (unknown-major order)
/// and what they cost.
pub(crate) fn compute(
    layout: &Layout<'_>,
    values: &[f64],
    names: &[String],
    slots: &[usize],
    knowns: &[(String, f64)],
    history: Option<&[HistoryRow]>,
    method: Method,
) -> Result<(Vec<crate::equations::Sensitivity>, Cost), InputError> {
    let n = names.len();
    let m = knowns.len();
    if m == 0 {
        return Ok((Vec::new(), Cost::default()));
    }
    let mut live: Vec<usize> = slots.to_vec();
    for (k, _) in knowns {
        live.push(layout.require_slot(k)?);
    }
    let equations = layout_equations(layout);
    let mut block = layout.block(values, &live, u128::MAX, &equations)?;
    let z0: Vec<f64> = live.iter().map(|&s| values[s]).collect();
    let mut cost = Cost::default();
    // jac[i][j] = dF_i / dz_j, z = (u, p).
    let mut jac = vec![vec![0.0; n + m]; n];
    match method {
        Method::ForwardMode => {
            let mut z: Vec<Dual<f64>> = z0.iter().map(|&v| Dual::fixed(v)).collect();
            let (mut scratch, mut stack, mut out) = (Vec::new(), Vec::new(), Vec::new());
            for j in 0..n + m {
                z[j] = Dual::variable(z0[j]);
                block.eval_all(&z, &mut scratch, &mut stack, &mut out);
                z[j] = Dual::fixed(z0[j]);
                cost.runs += 1;
                for (row, d) in jac.iter_mut().zip(&out) {
                    row[j] = d.d;
                }
            }
        }
        Method::CentralDifferences => {
            let mut z = z0.clone();
            let mut fp = vec![0.0; n];
            let mut fm = vec![0.0; n];
            for j in 0..n + m {
                if j < n && n == 1 {
                    if let Some(s) = history.and_then(|h| slope_from_history(h, z0[0])) {
                        jac[0][0] = s;
                        continue;
                    }
                }
                let h = step(z0[j]);
                let (xp, xm) = (z0[j] + h, z0[j] - h);
                z[j] = xp;
                block.eval(&z, &mut fp);
                z[j] = xm;
                block.eval(&z, &mut fm);
                z[j] = z0[j];
                cost.evaluations += 2;
                for i in 0..n {
                    jac[i][j] = (fp[i] - fm[i]) / (xp - xm);
                }
            }
        }
    }
    // Solve J_u S = -J_p.
    let mut a: Vec<Vec<f64>> = jac.iter().map(|r| r[..n].to_vec()).collect();
    let mut b: Vec<Vec<f64>> = jac
        .iter()
        .map(|r| r[n..].iter().map(|v| -v).collect())
        .collect();
    let solved = gauss(&mut a, &mut b);
    let mut out = Vec::with_capacity(n * m);
    for (i, name) in names.iter().enumerate() {
        for (j, (input, p)) in knowns.iter().enumerate() {
            let derivative = if solved { b[i][j] } else { f64::NAN };
            let u = z0[i];
            let relative = if u != 0.0 {
                derivative * p / u
            } else {
                f64::NAN
            };
            out.push(crate::equations::Sensitivity {
                unknown: name.clone(),
                input: input.clone(),
                derivative,
                relative,
            });
        }
    }
    Ok((out, cost))
}

fn layout_equations(layout: &Layout<'_>) -> Vec<usize> {
    layout.equation_statements()
}

/// Gaussian elimination with partial pivoting: solves A X = B in place (X in `b`).
/// False when A is singular or not finite.
#[allow(clippy::needless_range_loop)] // dense elimination reads best with indices
fn gauss(a: &mut [Vec<f64>], b: &mut [Vec<f64>]) -> bool {
    let n = a.len();
    for c in 0..n {
        let Some(p) = (c..n).max_by(|&i, &j| a[i][c].abs().total_cmp(&a[j][c].abs())) else {
            return false;
        };
        let pivot = a[p][c];
        if pivot == 0.0 || !pivot.is_finite() {
            return false;
        }
        a.swap(c, p);
        b.swap(c, p);
        for r in 0..n {
            if r == c {
                continue;
            }
            let f = a[r][c] / a[c][c];
            if f == 0.0 {
                continue;
            }
            for k in c..n {
                a[r][k] -= f * a[c][k];
            }
            for k in 0..b[r].len() {
                b[r][k] -= f * b[c][k];
            }
        }
    }
    for r in 0..n {
        let d = a[r][r];
        for v in b[r].iter_mut() {
            *v /= d;
        }
    }
    b.iter().flatten().all(|v| v.is_finite())
}
