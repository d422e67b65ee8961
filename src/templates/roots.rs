//! Every root of a template in its range: the scan, the branch labels, the choice of
//! the branch to return, and the second chance after a failed solve.
//!
//! After the solve from the template's start, [`settle`] scans the unknown's range
//! when the template labels its roots (two branches of a gas-dynamics relation, the
//! phases of a cubic equation of state) or when the solve did not converge:
//! - a template with branches returns the branch asked for, else its default branch
//!   (`RootScan::default`); the others are listed with their labels;
//! - a failed solve is tried again from the root the scan found nearest the start, so
//!   that no root in the range is missed; with none found, the notes say that no value
//!   in the range satisfies the equation for these inputs.
//!
//! A root taken from the scan is solved again from two points 1e-7 apart around it, so
//! the answer is the solver's own, with its status and history.

use super::{sig, with_unit, Template, TemplateRequest, Variable};
use crate::equations::{solve_set, EquationSet, SetSolution, UnknownSpec};
use crate::error::InputError;
use crate::methods::{MethodKind, Options, Start};
use crate::outcome::Status;
use crate::tolerances::Bounds;
use crate::units;

use super::RootScan;

/// Samples of the scan made after a failed solve, over the unknown's whole range.
const RESCUE_SAMPLES: usize = 400;
/// The same when each evaluation solves the auxiliaries (a nested solve per sample).
const RESCUE_SAMPLES_NESTED: usize = 80;
/// More sign changes than this in one scan: f is rounding noise about zero there.
const NOISE_ROOTS: usize = 20;
/// Two roots closer than this (relative) are one.
const SAME_ROOT: f64 = 1e-9;
/// Half the distance, relative, between the two points a scanned root is solved from.
const POLISH: f64 = 1e-7;

/// A root found by the scan, in SI, with its branch label.
#[derive(Debug, Clone, PartialEq)]
pub(super) struct Labelled {
    pub x: f64,
    pub label: Option<String>,
}

/// What [`settle`] decided.
pub(super) struct Settled {
    pub solution: SetSolution,
    pub branch: Option<String>,
    /// The other roots, in SI.
    pub others: Vec<Labelled>,
    pub scan_evaluations: usize,
}

/// Labels roots (sorted) by the scan's threshold or by their order.
pub(super) fn label_roots(scan: &RootScan, roots: &[f64]) -> Vec<Option<String>> {
    let n = roots.len();
    roots
        .iter()
        .enumerate()
        .map(|(i, &x)| {
            if let Some(th) = scan.threshold {
                if x < th {
                    scan.below.clone()
                } else {
                    scan.above.clone()
                }
            } else if n == 1 {
                scan.single.clone()
            } else if i == 0 {
                scan.smallest.clone()
            } else if i == n - 1 {
                scan.largest.clone()
            } else {
                scan.middle.clone()
            }
        })
        .collect()
}

/// Every branch label a scan can give.
pub(super) fn branch_labels(scan: &RootScan) -> Vec<&str> {
    [
        &scan.below,
        &scan.above,
        &scan.smallest,
        &scan.middle,
        &scan.largest,
        &scan.single,
    ]
    .into_iter()
    .filter_map(|l| l.as_deref())
    .collect()
}

/// The main equations: the template text without the auxiliaries' own lines.
pub(super) fn main_text(t: &Template, text: &str) -> String {
    text.lines()
        .filter(|line| !t.auxiliary.iter().any(|a| line.trim() == a.equation.trim()))
        .collect::<Vec<_>>()
        .join("\n")
}

/// The template's main equation as a function of the unknown alone (`specs[0]`), the
/// auxiliaries (`specs[1..]`) being solved from their own equations at each value.
pub(super) struct Nested {
    aux_set: EquationSet,
    main_set: EquationSet,
    aux_used: Vec<String>,
    main_used: Vec<String>,
}

impl Nested {
    pub fn new(t: &Template, text: &str) -> Result<Nested, InputError> {
        let declared = t.declared_symbols();
        let aux_text: Vec<&str> = t.auxiliary.iter().map(|a| a.equation.as_str()).collect();
        let aux_set = EquationSet::parse_declaring(&aux_text.join("\n"), &declared)?;
        let main_set = EquationSet::parse_declaring(&main_text(t, text), &declared)?;
        Ok(Nested {
            aux_used: aux_set.variables(),
            main_used: main_set.variables(),
            aux_set,
            main_set,
        })
    }

    /// The auxiliaries with the unknown at `x`, or `None` if their solve fails.
    pub fn aux_at(
        &self,
        x: f64,
        knowns: &[(String, f64)],
        specs: &[UnknownSpec],
        options: &Options,
    ) -> Option<Vec<f64>> {
        let unknown = &specs[0];
        let mut k: Vec<(String, f64)> = knowns
            .iter()
            .filter(|(s, _)| self.aux_used.contains(s))
            .cloned()
            .collect();
        if self.aux_used.contains(&unknown.name) {
            k.push((unknown.name.clone(), x));
        }
        let s = solve_set(&self.aux_set, &k, &specs[1..], options, false).ok()?;
        s.converged
            .then(|| s.unknowns.iter().map(|(_, v)| *v).collect())
    }

    /// The main residual at `x` with the auxiliaries at `aux`.
    pub fn residual(
        &self,
        x: f64,
        aux: &[f64],
        knowns: &[(String, f64)],
        specs: &[UnknownSpec],
    ) -> f64 {
        let mut k: Vec<(String, f64)> = knowns
            .iter()
            .filter(|(s, _)| self.main_used.contains(s))
            .cloned()
            .collect();
        for (spec, &v) in specs[1..].iter().zip(aux) {
            if self.main_used.contains(&spec.name) {
                k.push((spec.name.clone(), v));
            }
        }
        match self.main_set.residual_fn(&k, &specs[0].name) {
            Ok(mut f) => f(x),
            Err(_) => f64::NAN,
        }
    }

    /// The residual at `x`, the auxiliaries solved there (NaN if they cannot be).
    pub fn at(
        &self,
        x: f64,
        knowns: &[(String, f64)],
        specs: &[UnknownSpec],
        options: &Options,
    ) -> f64 {
        self.aux_at(x, knowns, specs, options)
            .map_or(f64::NAN, |aux| self.residual(x, &aux, knowns, specs))
    }
}

/// Where the scan looks, in SI: within the unknown's bounds, split in two at `split`.
struct ScanPlan {
    lo: f64,
    hi: f64,
    log: bool,
    samples: usize,
    split: Option<f64>,
}

/// The scan of the template's `roots` range, or of the whole range after a failure.
fn plan(
    unknown: &Variable,
    bounds: Bounds,
    nested: bool,
    names: &[&str],
    values: &[f64],
    t: &Template,
) -> Result<Option<ScanPlan>, InputError> {
    let plan = match &unknown.roots {
        Some(scan) => {
            let place = format!("root range of {} in template {}", unknown.symbol, t.id);
            let lo = super::eval(&scan.lo, names, values, &place)?.max(bounds.lo);
            let hi = super::eval(&scan.hi, names, values, &place)?.min(bounds.hi);
            let split = match &scan.split {
                Some(s) => Some(super::eval(s, names, values, &place)?),
                None => None,
            };
            ScanPlan {
                lo,
                hi,
                log: scan.log,
                samples: scan.samples.max(10),
                split,
            }
        }
        None => ScanPlan {
            lo: bounds.lo,
            hi: bounds.hi,
            log: bounds.lo > 0.0 && bounds.hi / bounds.lo > 1e3,
            samples: if nested {
                RESCUE_SAMPLES_NESTED
            } else {
                RESCUE_SAMPLES
            },
            split: None,
        },
    };
    let usable = plan.lo.is_finite()
        && plan.hi.is_finite()
        && plan.lo < plan.hi
        && (!plan.log || plan.lo > 0.0);
    Ok(usable.then_some(plan))
}

/// The sign-change roots of `f` in the plan's range, sorted and without repeats, the
/// number of evaluations, and whether f looked like rounding noise about zero.
fn scan(
    plan: &ScanPlan,
    options: &Options,
    f: &mut dyn FnMut(f64) -> f64,
) -> Result<(Vec<f64>, usize, bool), InputError> {
    let mut pieces = vec![(plan.lo, plan.hi)];
    if let Some(s) = plan.split.filter(|s| plan.lo < *s && *s < plan.hi) {
        pieces = vec![(plan.lo, s), (s, plan.hi)];
    }
    let mut roots = Vec::new();
    let mut evaluations = 0;
    let mut changes = 0;
    for (lo, hi) in pieces {
        let piece = scan_piece(lo, hi, plan.samples, plan.log, options, f)?;
        evaluations += piece.evaluations;
        changes += piece.changes;
        roots.extend(piece.roots);
    }
    roots.sort_by(f64::total_cmp);
    roots.dedup_by(|a, b| (*a - *b).abs() <= SAME_ROOT * b.abs().max(f64::MIN_POSITIVE));
    Ok((roots, evaluations, changes > NOISE_ROOTS))
}

/// What one stretch of the scan found.
struct Piece {
    roots: Vec<f64>,
    evaluations: usize,
    /// Sign changes and exact zeros among the samples.
    changes: usize,
}

/// Halvings towards the edge of a region where f is not finite.
const EDGE_HALVINGS: usize = 50;

/// The sign-change roots of `f` on [lo, hi]: `samples` points (in log spacing with
/// `log`), each sign change between finite values refined by the bracketing hybrid,
/// and each edge of a region where f is not finite (NaN, or ±∞ from overflow)
/// approached by halving from the finite side, which shows a sign change lying between
/// the last finite sample and the edge. A refined point where |f| is not below its
/// value at both ends of its bracket is a pole or a jump, not a root, and is left out.
///
/// Evaluations: `samples`, at most `EDGE_HALVINGS` per edge, and each refinement's.
fn scan_piece(
    lo: f64,
    hi: f64,
    samples: usize,
    log: bool,
    options: &Options,
    f: &mut dyn FnMut(f64) -> f64,
) -> Result<Piece, InputError> {
    let n = samples.max(3);
    let (ulo, uhi) = if log { (lo.ln(), hi.ln()) } else { (lo, hi) };
    let xs: Vec<f64> = (0..n)
        .map(|i| match i {
            0 => lo,
            _ if i == n - 1 => hi,
            _ => {
                let u = ulo + (uhi - ulo) * i as f64 / (n - 1) as f64;
                if log {
                    u.exp()
                } else {
                    u
                }
            }
        })
        .collect();
    let fs: Vec<f64> = xs.iter().map(|&x| f(x)).collect();
    let mut piece = Piece {
        roots: Vec::new(),
        evaluations: n,
        changes: 0,
    };
    let mut brackets = Vec::new();
    // An exact zero is a root when it stands alone; a run of zeros is a plateau where f
    // has underflowed (or is zero to rounding), which says nothing about a root.
    for i in 0..n {
        if fs[i] == 0.0 {
            piece.changes += 1;
            let alone = (i == 0 || fs[i - 1] != 0.0) && (i == n - 1 || fs[i + 1] != 0.0);
            if alone {
                piece.roots.push(xs[i]);
            } else {
                piece.changes += NOISE_ROOTS;
            }
        }
    }
    for i in 0..n - 1 {
        let (a, fa, b, fb) = (xs[i], fs[i], xs[i + 1], fs[i + 1]);
        if fa == 0.0 || fb == 0.0 || fa.is_nan() && fb.is_nan() {
            continue;
        }
        if fa.is_finite() && fb.is_finite() {
            if (fa < 0.0) != (fb < 0.0) {
                piece.changes += 1;
                brackets.push((a, fa, b, fb));
            }
            continue;
        }
        // One end is not finite: look next to the edge from the finite side.
        let (g, fg, bad) = if fa.is_finite() {
            (a, fa, b)
        } else {
            (b, fb, a)
        };
        if !fg.is_finite() {
            continue;
        }
        let (w, fw, evals) = approach_edge(f, g, fg, bad);
        piece.evaluations += evals;
        if fw.is_finite() && fw != 0.0 && (fw < 0.0) != (fg < 0.0) {
            piece.changes += 1;
            brackets.push((
                g.min(w),
                if g < w { fg } else { fw },
                g.max(w),
                if g < w { fw } else { fg },
            ));
        } else if fw == 0.0 {
            piece.roots.push(w);
        }
    }
    let refine = Options {
        method: MethodKind::Hybrid,
        bounds: Bounds::UNBOUNDED,
        record_history: false,
        ..*options
    };
    for (a, fa, b, fb) in brackets {
        let sol = crate::stepper::solve(Start::Bracket(a, b), &refine, &mut *f)?;
        piece.evaluations += sol.evaluations;
        if sol.converged && sol.residual.abs() < fa.abs().min(fb.abs()) {
            piece.roots.push(sol.root);
        }
    }
    Ok(piece)
}

/// Halves from `good` (where f is finite) towards `bad` (where it is not), stopping at
/// the first value of the other sign. Returns the last finite point, its value and the
/// evaluations made.
fn approach_edge(
    f: &mut dyn FnMut(f64) -> f64,
    mut good: f64,
    f_good: f64,
    mut bad: f64,
) -> (f64, f64, usize) {
    let mut fg = f_good;
    for k in 0..EDGE_HALVINGS {
        let m = good + (bad - good) / 2.0;
        if m == good || m == bad {
            return (good, fg, k);
        }
        let fm = f(m);
        if fm.is_finite() {
            good = m;
            fg = fm;
            if fm == 0.0 || (fm < 0.0) != (f_good < 0.0) {
                return (good, fg, k + 1);
            }
        } else {
            bad = m;
        }
    }
    (good, fg, EDGE_HALVINGS)
}

fn same_root(a: f64, b: f64) -> bool {
    (a - b).abs() <= 1e-7 * a.abs().max(b.abs()).max(1e-300)
}

/// Everything [`settle`] needs from the solve.
pub(super) struct Context<'a> {
    pub t: &'a Template,
    pub unknown: &'a Variable,
    pub req: &'a TemplateRequest,
    pub text: &'a str,
    pub set: &'a EquationSet,
    pub knowns: &'a [(String, f64)],
    pub specs: &'a [UnknownSpec],
    pub bounds: Bounds,
    /// Names and SI values of every known, for the catalogue's expressions.
    pub names: &'a [&'a str],
    pub values: &'a [f64],
    /// The unit of the answer, for notes.
    pub unit: &'a str,
    /// Whether the start was the template's own (not guesses from the request).
    pub own_start: bool,
}

/// Scans for the other roots and the branch asked for, and tries again after a failed
/// solve; see the module documentation.
pub(super) fn settle(
    cx: &Context,
    solution: SetSolution,
    notes: &mut Vec<String>,
) -> Result<Settled, InputError> {
    let (t, unknown) = (cx.t, cx.unknown);
    let scan_spec = unknown.roots.as_ref();
    if let (Some(b), None) = (&cx.req.branch, scan_spec) {
        return Err(InputError::new(
            "no-branches",
            format!(
                "template {} has one branch for {}; the branch \"{b}\" cannot be chosen",
                t.id, unknown.symbol
            ),
        ));
    }
    if let (Some(b), Some(s)) = (&cx.req.branch, scan_spec) {
        let labels = branch_labels(s);
        if !labels.contains(&b.as_str()) {
            return Err(InputError::new(
                "unknown-branch",
                format!(
                    "template {} has no branch \"{b}\" for {}; its branches are {}",
                    t.id,
                    unknown.symbol,
                    labels.join(", ")
                ),
            ));
        }
    }
    let mut settled = Settled {
        solution,
        branch: None,
        others: Vec::new(),
        scan_evaluations: 0,
    };
    if scan_spec.is_none() && settled.solution.converged {
        return Ok(settled);
    }
    let nested = !t.auxiliary.is_empty();
    let Some(plan) = plan(unknown, cx.bounds, nested, cx.names, cx.values, t)? else {
        if !settled.solution.converged {
            notes.push(format!(
                "No root of {} for these values: the stretch of its range where a root can \
                 lie is empty.",
                unknown.symbol
            ));
        }
        return Ok(settled);
    };
    let nest = if nested {
        Some(Nested::new(t, cx.text)?)
    } else {
        None
    };
    let mut direct = if nested {
        None
    } else {
        Some(cx.set.residual_fn(cx.knowns, &unknown.symbol)?)
    };
    let options = cx.req.options;
    let mut f = |x: f64| match (&mut direct, &nest) {
        (Some(f), _) => f(x),
        (None, Some(n)) => n.at(x, cx.knowns, cx.specs, &options),
        (None, None) => f64::NAN,
    };
    let (roots, evaluations, noisy) = scan(&plan, &options, &mut f)?;
    settled.scan_evaluations = evaluations;
    let labels: Vec<Option<String>> = match scan_spec {
        Some(s) => label_roots(s, &roots),
        None => vec![None; roots.len()],
    };
    let found: Vec<Labelled> = roots
        .iter()
        .zip(labels)
        .map(|(&x, label)| Labelled { x, label })
        .collect();
    let range = format!(
        "{} to {}",
        sig(units::from_si_in(plan.lo, cx.unit, &unknown.dimension)?),
        with_unit(
            units::from_si_in(plan.hi, cx.unit, &unknown.dimension)?,
            cx.unit
        )
    );
    if let Some(s) = scan_spec {
        describe_roots(cx, s, &found, &range, notes)?;
    }
    if noisy && !settled.solution.converged {
        notes.push(format!(
            "With these values the equation holds to rounding over a stretch of the range \
             of {} ({range}): {} is not determined by them.",
            unknown.symbol, unknown.symbol
        ));
        return Ok(settled);
    }
    let target = choose(cx, &settled.solution, &found)?;
    if let Some(x) = target {
        let current = settled.solution.unknowns.first().map_or(f64::NAN, |u| u.1);
        if !(settled.solution.converged && same_root(current, x)) {
            let failed = (!settled.solution.converged)
                .then(|| (settled.solution.status.code(), settled.solution.evaluations));
            let again = polish(cx, x)?;
            if !again.converged {
                let near = with_unit(units::from_si_in(x, cx.unit, &unknown.dimension)?, cx.unit);
                notes.push(match again.status {
                    Status::ZeroPlateau => format!(
                        "With these values the equation holds only to rounding near {near} \
                         (f is zero there and beside it): {} is not determined by them.",
                        unknown.symbol
                    ),
                    Status::Discontinuity => format!(
                        "No root of {} from {range} for these values: the sign change a scan \
                         found near {near} is a pole or a jump, where the equation does not \
                         approach zero.",
                        unknown.symbol
                    ),
                    _ => format!(
                        "A scan of {} from {range} found a sign change near {near}, but the \
                         solve from there did not converge ({}).",
                        unknown.symbol,
                        again.status.code()
                    ),
                });
            } else {
                notes.push(match failed {
                    Some((status, evals)) => format!(
                        "The solve from the template's start ended {status} after {evals} \
                         evaluations; a scan of {} from {range} found a sign change near \
                         {}, and the solve from there converged.",
                        unknown.symbol,
                        with_unit(units::from_si_in(x, cx.unit, &unknown.dimension)?, cx.unit)
                    ),
                    None => format!(
                        "The solve from the start found another root; the {} root was \
                         solved from the scan's estimate.",
                        label_of(&found, x).unwrap_or("chosen")
                    ),
                });
                settled.solution = again;
            }
        }
    }
    if !settled.solution.converged && found.is_empty() && scan_spec.is_none() {
        notes.push(format!(
            "No root of {} from {range} for these values: a scan of {} points across that \
             range found no sign change, so no value of {} in the range satisfies the \
             equation.",
            unknown.symbol, plan.samples, unknown.symbol
        ));
    }
    let root = settled.solution.unknowns.first().map_or(f64::NAN, |u| u.1);
    let converged = settled.solution.converged;
    settled.branch = if converged {
        found
            .iter()
            .find(|r| same_root(r.x, root))
            .and_then(|r| r.label.clone())
    } else {
        None
    };
    settled.others = found
        .into_iter()
        .filter(|r| !(converged && same_root(r.x, root)))
        .collect();
    Ok(settled)
}

fn label_of(found: &[Labelled], x: f64) -> Option<&str> {
    found
        .iter()
        .find(|r| r.x == x)
        .and_then(|r| r.label.as_deref())
}

/// The notes that list the roots of a template with branches.
fn describe_roots(
    cx: &Context,
    scan: &RootScan,
    found: &[Labelled],
    range: &str,
    notes: &mut Vec<String>,
) -> Result<(), InputError> {
    let symbol = &cx.unknown.symbol;
    if found.is_empty() {
        notes.push(format!("No root of {symbol} found from {range}."));
        return Ok(());
    }
    let mut shown = Vec::new();
    for r in found {
        let v = units::from_si_in(r.x, cx.unit, &cx.unknown.dimension)?;
        shown.push(match &r.label {
            Some(l) => format!("{}, {l}", with_unit(v, cx.unit)),
            None => with_unit(v, cx.unit),
        });
    }
    notes.push(format!(
        "Roots of {symbol} from {range}: {}.",
        shown.join("; ")
    ));
    if found.len() > 1 {
        if let Some(s) = &scan.several {
            notes.push(s.clone());
        }
        if let (Some(d), None) = (&scan.default, &cx.req.branch) {
            let why = scan.default_reason.as_deref().unwrap_or("");
            notes.push(
                format!("The {d} root is given by default: {why}")
                    .trim_end()
                    .to_string(),
            );
        }
    }
    Ok(())
}

/// The root to return: the branch asked for (or the default branch), else after a
/// failed solve the root nearest the start.
fn choose(
    cx: &Context,
    solution: &SetSolution,
    found: &[Labelled],
) -> Result<Option<f64>, InputError> {
    let scan = cx.unknown.roots.as_ref();
    let wanted = cx
        .req
        .branch
        .clone()
        .or_else(|| scan.and_then(|s| s.default.clone()));
    if let (Some(w), Some(s)) = (&wanted, scan) {
        let on_branch = found
            .iter()
            .find(|r| r.label.as_deref() == Some(w.as_str()));
        // A single root answers for the smallest or largest branch (one phase).
        let single = (found.len() == 1
            && [&s.smallest, &s.largest]
                .iter()
                .any(|l| l.as_deref() == Some(w)))
        .then(|| &found[0]);
        match on_branch.or(single) {
            Some(r) => return Ok(Some(r.x)),
            None if cx.req.branch.is_some() => {
                let list: Vec<String> = found
                    .iter()
                    .map(|r| {
                        let v = units::from_si_in(r.x, cx.unit, &cx.unknown.dimension)
                            .unwrap_or(f64::NAN);
                        match &r.label {
                            Some(l) => format!("{} ({l})", with_unit(v, cx.unit)),
                            None => with_unit(v, cx.unit),
                        }
                    })
                    .collect();
                return Err(InputError::new(
                    "no-root-on-branch",
                    format!(
                        "no root of {} on the {w} branch for these values in template {}; {}",
                        cx.unknown.symbol,
                        cx.t.id,
                        if list.is_empty() {
                            "no root was found in the range".to_string()
                        } else {
                            format!("the roots found are {}", list.join(", "))
                        }
                    ),
                ));
            }
            None => {}
        }
    }
    if solution.converged || found.is_empty() || !cx.own_start {
        return Ok(None);
    }
    let start = cx.specs[0].guesses.map_or(found[0].x, |g| g.0);
    let distance = |x: f64| {
        if x > 0.0 && start > 0.0 {
            (x / start).ln().abs()
        } else {
            (x - start).abs()
        }
    };
    Ok(found
        .iter()
        .map(|r| r.x)
        .min_by(|a, b| distance(*a).total_cmp(&distance(*b))))
}

/// Solves again from two points just either side of a root the scan found.
fn polish(cx: &Context, x: f64) -> Result<SetSolution, InputError> {
    let d = POLISH
        * x.abs()
            .max(1e-3 * (cx.bounds.hi - cx.bounds.lo).abs().min(1.0));
    let a = cx.bounds.clamp(x - d);
    let b = cx.bounds.clamp(x + d);
    let mut specs = cx.specs.to_vec();
    specs[0].guesses = Some(if a < b {
        (a, b)
    } else {
        (cx.bounds.lo, cx.bounds.hi)
    });
    let mut notes = Vec::new();
    super::solve_coupled(cx.t, cx.set, cx.text, cx.knowns, &specs, cx.req, &mut notes)
}
