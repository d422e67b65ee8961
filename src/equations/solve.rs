//! Solving a set for any of its variables.
//!
//! **Plan.** The equations and unknowns are matched (each unknown to an equation that
//! contains it) and split into blocks in dependency order: a block is a group of
//! unknowns that must be solved together, and it depends only on knowns and on
//! unknowns of earlier blocks. A block of one unknown is a scalar problem and goes to
//! [`crate::solve`] (the default method, [`MethodKind::Auto`](crate::MethodKind::Auto):
//! secant steps, the bracketing hybrid once a sign change is seen). A block of several
//! goes to Broyden's method ([`crate::broyden::solve_system`]).
//!
//! **Default starting points** when an unknown has no guesses (with `lo`, `hi` its
//! bounds; `m(v) = max(1, |v|)`):
//! - both bounds finite: `lo + (hi - lo)/3` and `lo + 2(hi - lo)/3`, inside the range so
//!   that an end where the equation is undefined (a diameter of 0) is not evaluated;
//! - only `lo` finite: `a = lo + m(lo)` and `a + 0.1 m(a)` (for `lo = 0`: 1 and 1.1);
//! - only `hi` finite: `a = hi - m(hi)` and `a - 0.1 m(a)`;
//! - unbounded: 1 and 1.1.
//!
//! Broyden starts from the first of the two.

use std::collections::{HashMap, HashSet};

use super::sensitivity::{self, Sensitivity};
use super::set::{EquationSet, Layout};
use super::system::{self, SystemOptions, SystemSolution};
use crate::error::InputError;
use crate::methods::{Options, Start};
use crate::outcome::{Solution, Status};
use crate::tolerances::Bounds;

/// The most unknowns solved together in one set.
pub const MAX_UNKNOWNS: usize = 100;

/// The most given values sensitivities are computed for (two evaluations of the whole
/// set each).
pub const MAX_SENSITIVITY_INPUTS: usize = 1000;

/// An unknown to solve for, with optional starting guesses and bounds.
#[derive(Debug, Clone, PartialEq)]
pub struct UnknownSpec {
    pub name: String,
    /// Two starting points; `None` uses the documented defaults.
    pub guesses: Option<(f64, f64)>,
    pub bounds: Bounds,
}

impl UnknownSpec {
    /// An unbounded unknown with default guesses.
    pub fn named(name: &str) -> UnknownSpec {
        UnknownSpec {
            name: name.to_string(),
            guesses: None,
            bounds: Bounds::UNBOUNDED,
        }
    }

    pub fn with_guesses(mut self, a: f64, b: f64) -> UnknownSpec {
        self.guesses = Some((a, b));
        self
    }

    pub fn with_bounds(mut self, lo: f64, hi: f64) -> UnknownSpec {
        self.bounds = Bounds { lo, hi };
        self
    }
}

/// One block of the plan, as solved.
#[derive(Debug, Clone, PartialEq)]
pub struct BlockReport {
    pub unknowns: Vec<String>,
    /// 0-based indices of the equations (in text order) solved in this block.
    pub equations: Vec<usize>,
    pub converged: bool,
    pub status: Status,
    pub evaluations: usize,
    pub iterations: usize,
    /// The evidence for this block's convergence ([`crate::certificate`]).
    pub certificate: Option<crate::Certificate>,
}

/// The result of [`solve_set`]. `converged` is true only if every block converged.
#[derive(Debug, Clone, PartialEq)]
pub struct SetSolution {
    /// The unknowns in the order they were asked for.
    pub unknowns: Vec<(String, f64)>,
    /// The residual of each equation in text order, as last evaluated by the solver.
    pub residuals: Vec<f64>,
    pub converged: bool,
    /// The status of the first block that did not converge, else of the last block.
    pub status: Status,
    /// Evaluations made by the solvers (one evaluation = one block's residuals once).
    pub evaluations: usize,
    pub iterations: usize,
    /// The scalar solution when the whole set was one scalar problem.
    pub scalar: Option<Solution>,
    /// Broyden's solution when the whole set was one coupled block.
    pub system: Option<SystemSolution>,
    /// Every definition at the final values, in text order.
    pub definitions: Vec<(String, f64)>,
    /// d unknown / d known for every pair (empty unless asked for and converged).
    pub sensitivities: Vec<Sensitivity>,
    /// Evaluations of the whole set at a point made for the sensitivities, beyond the
    /// solve's: 0, since the Jacobians are taken by forward-mode differentiation.
    pub sensitivity_evaluations: usize,
    /// Runs of the whole set with dual numbers made for the sensitivities (one per
    /// unknown and per known; see [`super::sensitivity`]).
    pub sensitivity_runs: usize,
    /// The blocks in the order solved.
    pub blocks: Vec<BlockReport>,
}

/// Names checked against a set: which are variables, their slot values.
pub(crate) struct NamePlan {
    /// The set's variables plus the constants the caller shadows.
    pub variables: Vec<String>,
    /// Value per variable slot; NaN for unknowns.
    pub values: Vec<f64>,
}

/// Checks knowns and unknowns against the set's names: every value finite, no name
/// twice, every name used by the set, and every variable given a value or unknown.
pub(crate) fn check_names(
    set: &EquationSet,
    knowns: &[(String, f64)],
    unknowns: &[UnknownSpec],
) -> Result<NamePlan, InputError> {
    let mut variables = set.variables();
    let constants: HashSet<String> = set.constants_used().into_iter().collect();
    let definitions: HashSet<String> = set.definition_names().into_iter().collect();
    let known_vars: HashSet<String> = variables.iter().cloned().collect();
    let mut seen: HashSet<&str> = HashSet::new();
    let all = knowns
        .iter()
        .map(|(n, _)| (n.as_str(), "a value"))
        .chain(unknowns.iter().map(|u| (u.name.as_str(), "an unknown")));
    for (name, role) in all {
        if !seen.insert(name) {
            return Err(InputError::new(
                "duplicate-name",
                format!("`{name}` is given more than once (as {role} and before)"),
            ));
        }
        if definitions.contains(name) {
            let mut e = InputError::new(
                "defined-name",
                format!(
                    "`{name}` is defined in the text with := and cannot also be given as {role}"
                ),
            );
            e.position = set.position_of(name);
            return Err(e);
        }
        if constants.contains(name) {
            // The caller shadows the constant: it becomes a variable.
            variables.push(name.to_string());
        } else if !known_vars.contains(name) {
            return Err(InputError::new(
                "unused-name",
                format!("`{name}` is given as {role} but appears in no equation or definition"),
            ));
        }
    }
    for (name, v) in knowns {
        if !v.is_finite() {
            return Err(InputError::new(
                "non-finite-input",
                format!("the value of `{name}` must be a finite number, got {v}"),
            ));
        }
    }
    let given: HashMap<&str, f64> = knowns.iter().map(|(n, v)| (n.as_str(), *v)).collect();
    let unknown_names: HashSet<&str> = unknowns.iter().map(|u| u.name.as_str()).collect();
    let mut values = vec![f64::NAN; variables.len()];
    for (i, v) in variables.iter().enumerate() {
        if let Some(x) = given.get(v.as_str()) {
            values[i] = *x;
        } else if !unknown_names.contains(v.as_str()) {
            let mut e = InputError::new(
                "missing-value",
                format!("no value is given for `{v}`, and it is not an unknown"),
            );
            e.position = set.position_of(v);
            return Err(e);
        }
    }
    Ok(NamePlan { variables, values })
}

/// The documented default starting points inside `bounds`.
pub fn default_guesses(bounds: Bounds) -> (f64, f64) {
    let m = |v: f64| v.abs().max(1.0);
    let (lo, hi) = (bounds.lo, bounds.hi);
    match (lo.is_finite(), hi.is_finite()) {
        (true, true) => (lo + (hi - lo) / 3.0, lo + 2.0 * (hi - lo) / 3.0),
        (true, false) => {
            let a = lo + m(lo);
            (a, a + 0.1 * m(a))
        }
        (false, true) => {
            let a = hi - m(hi);
            (a, a - 0.1 * m(a))
        }
        (false, false) => (1.0, 1.1),
    }
}

/// The bounds of an unknown: its own, within those of `options`.
fn unknown_bounds(spec: &UnknownSpec, options: &Options) -> Result<Bounds, InputError> {
    spec.bounds.validate().map_err(|e| InputError {
        message: format!("unknown `{}`: {}", spec.name, e.message),
        ..e
    })?;
    let lo = spec.bounds.lo.max(options.bounds.lo);
    let hi = spec.bounds.hi.min(options.bounds.hi);
    if lo > hi {
        return Err(InputError::new(
            "bad-bounds",
            format!(
                "the bounds of `{}` [{}, {}] do not overlap the solver bounds [{}, {}]",
                spec.name, spec.bounds.lo, spec.bounds.hi, options.bounds.lo, options.bounds.hi
            ),
        ));
    }
    Ok(Bounds { lo, hi })
}

fn start_points(spec: &UnknownSpec, bounds: Bounds) -> Result<(f64, f64), InputError> {
    let Some((a, b)) = spec.guesses else {
        return Ok(default_guesses(bounds));
    };
    for (which, v) in [("first", a), ("second", b)] {
        if !v.is_finite() {
            return Err(InputError::new(
                "non-finite-input",
                format!(
                    "the {which} guess for `{}` must be finite, got {v}",
                    spec.name
                ),
            ));
        }
        if !bounds.contains(v) {
            return Err(InputError::new(
                "start-outside-bounds",
                format!(
                    "the {which} guess {v} for `{}` lies outside its bounds [{}, {}]",
                    spec.name, bounds.lo, bounds.hi
                ),
            ));
        }
    }
    if a == b {
        return Err(InputError::new(
            "equal-guesses",
            format!(
                "the two guesses for `{}` must differ, both are {a}",
                spec.name
            ),
        ));
    }
    Ok((a, b))
}

/// Solves `set` for `unknowns`, every other variable taking its value from `knowns`.
///
/// `options` gives the scalar method, the tolerances and budget (per block), bounds
/// applied to every unknown on top of its own, and whether to keep the history.
/// With `sensitivities`, the derivative of every unknown with respect to every known
/// is added (see [`super::sensitivity`]).
///
/// ```
/// use tacit::equations::{solve_set, EquationSet, UnknownSpec};
/// let set = EquationSet::parse("A := pi*D^2/4\nQ = V*A").unwrap();
/// let knowns = [("Q".to_string(), 0.1), ("V".to_string(), 2.0)];
/// let s = solve_set(&set, &knowns, &[UnknownSpec::named("D")], &Default::default(), false)
///     .unwrap();
/// assert!(s.converged);
/// let d = s.unknowns[0].1;
/// assert!((d - (4.0 * 0.1 / (2.0 * std::f64::consts::PI)).sqrt()).abs() < 1e-12);
/// ```
pub fn solve_set(
    set: &EquationSet,
    knowns: &[(String, f64)],
    unknowns: &[UnknownSpec],
    options: &Options,
    sensitivities: bool,
) -> Result<SetSolution, InputError> {
    options.tol.validate()?;
    options.bounds.validate()?;
    let n_eq = set.equation_count();
    if unknowns.is_empty() {
        return Err(InputError::new(
            "no-unknown",
            "no unknown is named: say which variable to solve for",
        ));
    }
    if unknowns.len() > MAX_UNKNOWNS {
        return Err(InputError::new(
            "too-many-unknowns",
            format!(
                "{} unknowns asked for; at most {MAX_UNKNOWNS} are solved together",
                unknowns.len()
            ),
        ));
    }
    let plan = check_names(set, knowns, unknowns)?;
    if sensitivities && knowns.len() > MAX_SENSITIVITY_INPUTS {
        return Err(InputError::new(
            "too-many-inputs",
            format!(
                "sensitivities were asked for {} given values; the limit is {MAX_SENSITIVITY_INPUTS}",
                knowns.len()
            ),
        ));
    }
    if unknowns.len() != n_eq {
        let names: Vec<&str> = unknowns.iter().map(|u| u.name.as_str()).collect();
        return Err(InputError::new(
            "count-mismatch",
            format!(
                "{} unknown{} ({}) but {} equation{}: n unknowns need n equations",
                names.len(),
                if names.len() == 1 { "" } else { "s" },
                names.join(", "),
                n_eq,
                if n_eq == 1 { "" } else { "s" }
            ),
        ));
    }
    let mut bounds = Vec::with_capacity(unknowns.len());
    let mut starts = Vec::with_capacity(unknowns.len());
    for u in unknowns {
        let b = unknown_bounds(u, options)?;
        starts.push(start_points(u, b)?);
        bounds.push(b);
    }
    let names: Vec<String> = unknowns.iter().map(|u| u.name.clone()).collect();
    let layout = set.layout(plan.variables.clone(), &names);
    let slots: Vec<usize> = names
        .iter()
        .map(|n| layout.require_slot(n))
        .collect::<Result<_, _>>()?;
    let equations = set.equation_indices();
    let blocks = plan_blocks(set, &layout, &equations, &names)?;

    let mut values = plan.values.clone();
    let mut residuals = vec![f64::NAN; equations.len()];
    let mut reports = Vec::new();
    let mut scalar = None;
    let mut system_solution = None;
    let mut status = Status::ConvergedStep;
    let mut converged = true;
    let mut evaluations = 0;
    let mut iterations = 0;
    let single = blocks.len() == 1;
    for (block_unknowns, block_eqs) in &blocks {
        let live: Vec<usize> = block_unknowns.iter().map(|&k| slots[k]).collect();
        let mask = block_unknowns.iter().fold(0u128, |m, &k| m | (1u128 << k));
        let stmt: Vec<usize> = block_eqs.iter().map(|&e| equations[e]).collect();
        let mut block = layout.block(&values, &live, mask, &stmt)?;
        let report_names: Vec<String> = block_unknowns.iter().map(|&k| names[k].clone()).collect();
        let (block_status, evals, iters, certificate) = if let [k] = block_unknowns.as_slice() {
            let opts = Options {
                bounds: bounds[*k],
                record_history: options.record_history,
                ..*options
            };
            let (a, b) = starts[*k];
            let sol = crate::stepper::solve(Start::Guesses(a, b), &opts, |x| block.eval_one(x))?;
            values[slots[*k]] = sol.root;
            residuals[block_eqs[0]] = sol.residual;
            let out = (sol.status, sol.evaluations, sol.iterations, sol.certificate);
            if single {
                scalar = Some(sol);
            }
            out
        } else {
            let x0: Vec<f64> = block_unknowns.iter().map(|&k| starts[k].0).collect();
            let opts = SystemOptions {
                tol: options.tol,
                bounds: block_unknowns.iter().map(|&k| bounds[k]).collect(),
                record_history: options.record_history,
            };
            let sol = system::solve_system(&x0, &opts, |x, out| block.eval(x, out))?;
            for (j, &k) in block_unknowns.iter().enumerate() {
                values[slots[k]] = sol.x.get(j).copied().unwrap_or(f64::NAN);
            }
            for (j, &e) in block_eqs.iter().enumerate() {
                residuals[e] = sol.residuals.get(j).copied().unwrap_or(f64::NAN);
            }
            let out = (sol.status, sol.evaluations, sol.iterations, sol.certificate);
            if single {
                system_solution = Some(sol);
            }
            out
        };
        evaluations += evals;
        iterations += iters;
        let ok = certificate.is_some();
        reports.push(BlockReport {
            unknowns: report_names,
            equations: block_eqs.clone(),
            converged: ok,
            status: block_status,
            evaluations: evals,
            iterations: iters,
            certificate,
        });
        status = block_status;
        if !ok {
            converged = false;
            // Later blocks depend on this one: their unknowns stay NaN.
            break;
        }
    }
    let unknown_values: Vec<(String, f64)> = names
        .iter()
        .zip(&slots)
        .map(|(n, &s)| (n.clone(), values[s]))
        .collect();
    // At the final values even when not converged (NaN where an unknown was not reached).
    let definitions = layout.definition_values(&values)?;
    let (sens, cost) = if sensitivities && converged {
        sensitivity::compute(
            &layout,
            &values,
            &names,
            &slots,
            knowns,
            None,
            sensitivity::Method::ForwardMode,
        )?
    } else {
        (Vec::new(), sensitivity::Cost::default())
    };
    Ok(SetSolution {
        unknowns: unknown_values,
        residuals,
        converged,
        status,
        evaluations,
        iterations,
        scalar,
        system: system_solution,
        definitions,
        sensitivities: sens,
        sensitivity_evaluations: cost.evaluations,
        sensitivity_runs: cost.runs,
        blocks: reports,
    })
}

/// A block of the plan: unknown indices and equation indices.
type Block = (Vec<usize>, Vec<usize>);

/// Splits the problem into blocks (unknown indices, equation indices), in the order to
/// solve them, or says why the equations cannot determine the unknowns.
#[allow(clippy::needless_range_loop)] // matrices of small n, indexed both ways
fn plan_blocks(
    set: &EquationSet,
    layout: &Layout<'_>,
    equations: &[usize],
    names: &[String],
) -> Result<Vec<Block>, InputError> {
    let n = names.len();
    // contains[e][k]: equation e depends on unknown k.
    let contains: Vec<Vec<bool>> = equations
        .iter()
        .map(|&i| (0..n).map(|k| layout.deps[i] >> k & 1 == 1).collect())
        .collect();
    for (e, row) in contains.iter().enumerate() {
        if !row.iter().any(|&b| b) {
            let at = set.statement(equations[e]).position;
            return Err(InputError::at(
                "equation-without-unknown",
                format!(
                    "equation {} contains none of the unknowns ({}), so it cannot be solved",
                    e + 1,
                    names.join(", ")
                ),
                at,
            ));
        }
    }
    for (k, name) in names.iter().enumerate() {
        if !contains.iter().any(|row| row[k]) {
            let mut err = InputError::new(
                "unknown-not-in-equations",
                format!("the unknown `{name}` appears in no equation"),
            );
            err.position = set.position_of(name);
            return Err(err);
        }
    }
    // Match each equation to an unknown it contains (augmenting paths).
    let mut eq_of: Vec<Option<usize>> = vec![None; n];
    for e in 0..n {
        let mut seen = vec![false; n];
        if !augment(e, &contains, &mut eq_of, &mut seen) {
            return Err(InputError::at(
                "structurally-singular",
                format!(
                    "the equations cannot determine the unknowns ({}): equation {} adds no \
                     unknown that the others leave free",
                    names.join(", "),
                    e + 1
                ),
                set.statement(equations[e]).position,
            ));
        }
    }
    let mut unknown_of = vec![0; n];
    for (k, e) in eq_of.iter().enumerate() {
        if let Some(e) = e {
            unknown_of[*e] = k;
        }
    }
    // Equation e needs equation f when e contains the unknown matched to f.
    let mut reach: Vec<Vec<bool>> = (0..n)
        .map(|e| {
            (0..n)
                .map(|f| e == f || contains[e][unknown_of[f]])
                .collect()
        })
        .collect();
    for m in 0..n {
        for e in 0..n {
            if reach[e][m] {
                for f in 0..n {
                    if reach[m][f] {
                        reach[e][f] = true;
                    }
                }
            }
        }
    }
    let mut assigned = vec![false; n];
    let mut blocks: Vec<(usize, Vec<usize>)> = Vec::new();
    for e in 0..n {
        if assigned[e] {
            continue;
        }
        let members: Vec<usize> = (0..n).filter(|&f| reach[e][f] && reach[f][e]).collect();
        for &f in &members {
            assigned[f] = true;
        }
        let reached = reach[e].iter().filter(|&&b| b).count();
        blocks.push((reached, members));
    }
    // What a block needs reaches strictly fewer equations, so this puts it first.
    blocks.sort_by_key(|(reached, members)| (*reached, members[0]));
    Ok(blocks
        .into_iter()
        .map(|(_, eqs)| {
            let mut ks: Vec<usize> = eqs.iter().map(|&e| unknown_of[e]).collect();
            ks.sort_unstable();
            (ks, eqs)
        })
        .collect())
}

/// Kuhn's augmenting path from equation `e` (depth at most the number of unknowns).
fn augment(
    e: usize,
    contains: &[Vec<bool>],
    eq_of: &mut [Option<usize>],
    seen: &mut [bool],
) -> bool {
    for k in 0..eq_of.len() {
        if contains[e][k] && !seen[k] {
            seen[k] = true;
            let free = match eq_of[k] {
                None => true,
                Some(f) => augment(f, contains, eq_of, seen),
            };
            if free {
                eq_of[k] = Some(e);
                return true;
            }
        }
    }
    false
}
