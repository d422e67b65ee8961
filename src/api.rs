//! The facade of the JavaScript API: one function per call, typed requests in and
//! typed results out, with camelCase field names.
//!
//! Requests are serde structs that refuse unknown fields; the bindings read them from
//! JavaScript values (`serde-wasm-bindgen`), and [`json`] reads the same structs from
//! JSON text for native callers and tests. Results are serde structs too: numbers stay
//! numbers (NaN and ±Infinity included, in JavaScript), names stay strings.
//!
//! Everything a caller sends is checked here or in [`crate::problem`] before it reaches
//! the core: types, finite numbers, sizes, unknown fields. Nothing reachable from here
//! panics or allocates without bound, which matters on wasm32, where a panic aborts the
//! instance for good. The module knows nothing about JavaScript and is tested natively
//! (`tests/api.rs`).
//!
//! Templates, equation sets, sweeps and range scans all go through one compiled
//! [`Problem`]; the calls here are thin conveniences over it.

use std::collections::BTreeMap;
use std::rc::Rc;

use serde::{Deserialize, Serialize};

use crate::broyden;
use crate::error::InputError;
use crate::methods::{MethodKind, Options, Start};
use crate::outcome::{Solution, StepKind};
use crate::problem::report::{CertificateReport, Conversion, HistoryReport, SystemHistoryReport};
use crate::problem::spec::{
    bounded, BoundsInput, Known, Quantity, TolerancesInput, UncertaintyInput,
    UncertaintyOptionsInput, UnknownInput,
};
use crate::problem::{
    Problem, ProblemSpec, RootsOptions, RootsReport, SampleReport, SolveOptions, SolveReport,
    Sweep, SweepReport, SweepSpec,
};
use crate::roots_in_range::{self, ScanOptions};
use crate::stepper::Stepper;
use crate::templates::own::{self, OwnTemplate};
use crate::tolerances::Bounds;

/// Longest request accepted as JSON text, in bytes.
pub const MAX_REQUEST_BYTES: usize = 4 << 20;
/// Longest equation text accepted, in characters.
pub const MAX_EQUATION_CHARS: usize = crate::problem::MAX_EQUATION_CHARS;
/// Largest evaluation budget accepted.
pub const MAX_EVALS: usize = crate::tolerances::MAX_EVALS;
/// Longest saved stepper accepted: a record of the largest budget fits.
pub const MAX_SAVED_STEPPER_BYTES: usize = 64 << 20;
/// Most unknowns of a system given as a function.
pub const MAX_SYSTEM_UNKNOWNS: usize = 200;
/// Most points in one sweep.
pub const MAX_SWEEP_POINTS: usize = crate::problem::MAX_SWEEP_POINTS;
/// Longest unit symbol accepted, in characters.
pub const MAX_UNIT_CHARS: usize = 64;

fn bad(message: impl Into<String>) -> InputError {
    InputError::new("bad-request", message)
}

/// One type for every scalar function handed to the generic core, so that each core
/// routine is compiled once into the wasm module, not once per closure.
fn erase(f: &mut impl FnMut(f64) -> f64) -> &mut dyn FnMut(f64) -> f64 {
    f
}

// ---------------------------------------------------------------------------------------
// Requests

/// `solveEquation`: a text equation or set, and how to solve it.
#[derive(Debug, Clone, Default, Deserialize)]
#[serde(
    deny_unknown_fields,
    rename_all = "camelCase",
    expecting = "an object {equations, knowns?, unknowns?, units?, method?, tolerances?, history?, sensitivities?}"
)]
pub struct EquationCall {
    pub equations: String,
    #[serde(default, deserialize_with = "bounded::opt_map")]
    pub knowns: Option<BTreeMap<String, Quantity>>,
    #[serde(default, deserialize_with = "bounded::opt_map")]
    pub units: Option<BTreeMap<String, String>>,
    #[serde(default)]
    pub unknown: Option<String>,
    #[serde(default, deserialize_with = "bounded::opt_vec")]
    pub unknowns: Option<Vec<UnknownInput>>,
    #[serde(default)]
    pub method: Option<String>,
    #[serde(default)]
    pub tolerances: Option<TolerancesInput>,
    #[serde(default)]
    pub guesses: Option<(f64, f64)>,
    #[serde(default)]
    pub history: bool,
    #[serde(default)]
    pub sensitivities: bool,
    /// Standard uncertainties of knowns (see [`ProblemSpec::uncertainties`]).
    #[serde(default, deserialize_with = "bounded::opt_map")]
    pub uncertainties: Option<BTreeMap<String, UncertaintyInput>>,
    /// How the uncertainty is computed (see [`SolveOptions::uncertainty`]).
    #[serde(default)]
    pub uncertainty: Option<UncertaintyOptionsInput>,
}

impl EquationCall {
    fn spec(&self) -> ProblemSpec {
        ProblemSpec {
            equations: Some(self.equations.clone()),
            knowns: self.knowns.clone(),
            units: self.units.clone(),
            unknown: self.unknown.clone(),
            unknowns: self.unknowns.clone(),
            uncertainties: self.uncertainties.clone(),
            ..ProblemSpec::default()
        }
    }
}

/// `solveTemplate`: a bundled template, its knowns, its unknown, and how to solve it.
#[derive(Debug, Clone, Default, Deserialize)]
#[serde(
    deny_unknown_fields,
    rename_all = "camelCase",
    expecting = "an object {id, values, unknown, resultUnit?, branch?, useScenarioDefaults?, guesses?, method?, tolerances?, history?, sensitivities?}"
)]
pub struct TemplateCall {
    #[serde(alias = "template")]
    pub id: String,
    #[serde(default, deserialize_with = "bounded::opt_map")]
    pub values: Option<BTreeMap<String, Known>>,
    pub unknown: String,
    #[serde(default)]
    pub result_unit: Option<String>,
    /// The unit to show each auxiliary quantity or output in.
    #[serde(default, deserialize_with = "bounded::opt_map")]
    pub output_units: Option<BTreeMap<String, String>>,
    #[serde(default)]
    pub branch: Option<String>,
    #[serde(default)]
    pub use_scenario_defaults: bool,
    #[serde(default)]
    pub guesses: Option<(f64, f64)>,
    #[serde(default)]
    pub method: Option<String>,
    #[serde(default)]
    pub tolerances: Option<TolerancesInput>,
    #[serde(default)]
    pub history: bool,
    #[serde(default)]
    pub sensitivities: bool,
    /// Standard uncertainties of knowns (see [`ProblemSpec::uncertainties`]).
    #[serde(default, deserialize_with = "bounded::opt_map")]
    pub uncertainties: Option<BTreeMap<String, UncertaintyInput>>,
    /// How the uncertainty is computed (see [`SolveOptions::uncertainty`]).
    #[serde(default)]
    pub uncertainty: Option<UncertaintyOptionsInput>,
}

impl TemplateCall {
    fn spec(&self) -> ProblemSpec {
        ProblemSpec {
            template: Some(self.id.clone()),
            values: self.values.clone(),
            unknown: Some(self.unknown.clone()),
            result_unit: self.result_unit.clone(),
            branch: self.branch.clone(),
            use_scenario_defaults: self.use_scenario_defaults,
            uncertainties: self.uncertainties.clone(),
            output_units: self.output_units.clone(),
            ..ProblemSpec::default()
        }
    }
}

/// `sweep`: a problem (a template or equations, as in [`ProblemSpec`]) and the sweep
/// of one of its knowns. `bounds` bounds the unknown of equations.
#[derive(Debug, Clone, Default, Deserialize)]
#[serde(
    deny_unknown_fields,
    rename_all = "camelCase",
    expecting = "an object {equations or id, knowns or values, unknown?, input, from, to, points, ...}"
)]
pub struct SweepCall {
    #[serde(default, alias = "template")]
    pub id: Option<String>,
    #[serde(default, deserialize_with = "bounded::opt_map")]
    pub values: Option<BTreeMap<String, Known>>,
    #[serde(default)]
    pub result_unit: Option<String>,
    #[serde(default)]
    pub branch: Option<String>,
    #[serde(default)]
    pub use_scenario_defaults: bool,
    #[serde(default)]
    pub equations: Option<String>,
    #[serde(default, deserialize_with = "bounded::opt_map")]
    pub knowns: Option<BTreeMap<String, Quantity>>,
    #[serde(default, deserialize_with = "bounded::opt_map")]
    pub units: Option<BTreeMap<String, String>>,
    #[serde(default)]
    pub unknown: Option<String>,
    #[serde(default)]
    pub bounds: Option<BoundsInput>,
    pub input: String,
    pub from: f64,
    pub to: f64,
    pub points: f64,
    #[serde(default)]
    pub spacing: Option<String>,
    #[serde(default)]
    pub guesses: Option<(f64, f64)>,
    #[serde(default)]
    pub method: Option<String>,
    #[serde(default)]
    pub tolerances: Option<TolerancesInput>,
}

/// `findRoots` of a text equation: the problem and the range `[lo, hi]` in the
/// unknown's unit.
#[derive(Debug, Clone, Default, Deserialize)]
#[serde(
    deny_unknown_fields,
    rename_all = "camelCase",
    expecting = "an object {equations, knowns?, units?, unknown?, range, samples?, tolerances?}"
)]
pub struct RootsCall {
    pub equations: String,
    #[serde(default, deserialize_with = "bounded::opt_map")]
    pub knowns: Option<BTreeMap<String, Quantity>>,
    #[serde(default, deserialize_with = "bounded::opt_map")]
    pub units: Option<BTreeMap<String, String>>,
    #[serde(default)]
    pub unknown: Option<String>,
    pub range: (f64, f64),
    #[serde(default)]
    pub samples: Option<f64>,
    #[serde(default)]
    pub tolerances: Option<TolerancesInput>,
    /// Prove every root (regions unique / none / undecided) instead of sampling.
    #[serde(default)]
    pub proven: bool,
    /// With `proven`: the most regions examined.
    #[serde(default)]
    pub max_regions: Option<f64>,
}

/// `findRoots` of a function: the range and the scan's settings.
#[derive(Debug, Clone, Default, Deserialize)]
#[serde(
    deny_unknown_fields,
    rename_all = "camelCase",
    expecting = "an object {range, samples?, tolerances?}"
)]
pub struct FunctionRootsCall {
    pub range: (f64, f64),
    #[serde(default)]
    pub samples: Option<f64>,
    #[serde(default)]
    pub tolerances: Option<TolerancesInput>,
}

/// A scalar solve of a function (`solveFunction`, `Stepper.create`).
#[derive(Debug, Clone, Default, Deserialize)]
#[serde(
    deny_unknown_fields,
    rename_all = "camelCase",
    expecting = "an object {guesses or bracket, method?, tolerances?, bounds?, history?}"
)]
pub struct ScalarCall {
    #[serde(default)]
    pub guesses: Option<(f64, f64)>,
    #[serde(default)]
    pub bracket: Option<(f64, f64)>,
    #[serde(default)]
    pub method: Option<String>,
    #[serde(default)]
    pub tolerances: Option<TolerancesInput>,
    #[serde(default)]
    pub bounds: Option<BoundsInput>,
    #[serde(default)]
    pub history: bool,
}

/// A system of a function (`solveSystemFunction`).
#[derive(Debug, Clone, Default, Deserialize)]
#[serde(
    deny_unknown_fields,
    rename_all = "camelCase",
    expecting = "an object {x0, tolerances?, bounds?, history?}"
)]
pub struct SystemCall {
    #[serde(deserialize_with = "system_list")]
    pub x0: Vec<f64>,
    #[serde(default)]
    pub tolerances: Option<TolerancesInput>,
    #[serde(default, deserialize_with = "bounded::opt_vec")]
    pub bounds: Option<Vec<BoundsInput>>,
    #[serde(default)]
    pub history: bool,
}

fn system_list<'de, D: serde::Deserializer<'de>>(d: D) -> Result<Vec<f64>, D::Error> {
    bounded::opt_vec(d).map(Option::unwrap_or_default)
}

// ---------------------------------------------------------------------------------------
// Results that are not a problem's

/// The result of a scalar solve of a function or stepper.
#[derive(Debug, Clone, PartialEq, Serialize)]
#[serde(rename_all = "camelCase")]
pub struct ScalarReport {
    pub root: f64,
    pub residual: f64,
    pub residual_at: f64,
    pub converged: bool,
    pub status: &'static str,
    pub message: &'static str,
    pub evaluations: usize,
    pub iterations: usize,
    pub checks: usize,
    pub bracket: Option<[f64; 2]>,
    pub certificate: Option<CertificateReport>,
    pub history: Vec<HistoryReport>,
    pub history_dropped: usize,
}

impl ScalarReport {
    pub fn of(s: &Solution) -> ScalarReport {
        let c = Conversion::NONE;
        ScalarReport {
            root: s.root,
            residual: s.residual,
            residual_at: s.residual_at,
            converged: s.converged,
            status: s.status.code(),
            message: s.message(),
            evaluations: s.evaluations,
            iterations: s.iterations,
            checks: s.checks,
            bracket: s.bracket.map(|(a, b)| [a, b]),
            certificate: s
                .certificate
                .as_ref()
                .map(|k| CertificateReport::scalar(k, &c)),
            history: HistoryReport::rows(&s.history, &c),
            history_dropped: s.history_dropped,
        }
    }
}

/// The result of a system of a function.
#[derive(Debug, Clone, PartialEq, Serialize)]
#[serde(rename_all = "camelCase")]
pub struct SystemReport {
    pub roots: Vec<f64>,
    pub residuals: Vec<f64>,
    pub residual: f64,
    pub converged: bool,
    pub status: &'static str,
    pub message: &'static str,
    pub evaluations: usize,
    pub iterations: usize,
    pub certificate: Option<CertificateReport>,
    pub history: Vec<SystemHistoryReport>,
    pub history_dropped: usize,
}

/// What `checkEquation` says about a text.
#[derive(Debug, Clone, PartialEq, Serialize)]
#[serde(rename_all = "camelCase")]
pub struct CheckReport {
    pub ok: bool,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub variables: Option<Vec<String>>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub definitions: Option<Vec<String>>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub equations: Option<usize>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub code: Option<&'static str>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub message: Option<String>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub position: Option<usize>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub caret: Option<String>,
}

/// One dimension and its units, SI unit first.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct DimensionUnits {
    pub dimension: &'static str,
    pub units: Vec<&'static str>,
}

/// What a problem's `sensitivities` gives: the answer and how it moves with each input.
#[derive(Debug, Clone, PartialEq, Serialize)]
#[serde(rename_all = "camelCase")]
pub struct SensitivitiesReport {
    pub converged: bool,
    pub status: &'static str,
    pub message: &'static str,
    pub root: Option<f64>,
    pub unit: Option<String>,
    pub sensitivities: Vec<crate::problem::report::SensitivityReport>,
    pub evaluations: usize,
}

// ---------------------------------------------------------------------------------------
// Problems

fn solve_options(
    method: &Option<String>,
    tolerances: &Option<TolerancesInput>,
    guesses: Option<(f64, f64)>,
    history: bool,
    sensitivities: bool,
    uncertainty: &Option<UncertaintyOptionsInput>,
) -> SolveOptions {
    SolveOptions {
        method: method.clone(),
        tolerances: tolerances.clone(),
        guesses,
        history,
        sensitivities,
        uncertainty: uncertainty.clone(),
    }
}

/// Solves a text equation or set (a [`Problem`] compiled and solved once).
pub fn solve_equation(req: &EquationCall) -> Result<SolveReport, InputError> {
    let problem = Problem::compile(&req.spec())?;
    problem.solve(&solve_options(
        &req.method,
        &req.tolerances,
        req.guesses,
        req.history,
        req.sensitivities,
        &req.uncertainty,
    ))
}

/// Solves a bundled template (a [`Problem`] compiled and solved once).
pub fn solve_template(req: &TemplateCall) -> Result<SolveReport, InputError> {
    let problem = Problem::compile(&req.spec())?;
    problem.solve(&solve_options(
        &req.method,
        &req.tolerances,
        req.guesses,
        req.history,
        req.sensitivities,
        &req.uncertainty,
    ))
}

/// Solves one unknown at evenly spaced values of one known, each solve starting from
/// the previous root, in one go.
pub fn sweep(req: &SweepCall) -> Result<SweepReport, InputError> {
    let mut knowns = req.knowns.clone();
    if let Some(k) = knowns.as_mut() {
        k.entry(req.input.clone())
            .or_insert(Quantity::Number(req.from));
    } else if req.equations.is_some() {
        knowns = Some(BTreeMap::from([(
            req.input.clone(),
            Quantity::Number(req.from),
        )]));
    }
    let mut spec = ProblemSpec {
        template: req.id.clone(),
        values: req.values.clone(),
        result_unit: req.result_unit.clone(),
        branch: req.branch.clone(),
        use_scenario_defaults: req.use_scenario_defaults,
        equations: req.equations.clone(),
        knowns,
        units: req.units.clone(),
        unknown: req.unknown.clone(),
        unknowns: None,
        uncertainties: None,
        output_units: None,
    };
    if let Some(b) = req.bounds {
        if req.equations.is_none() {
            return Err(bad(
                "request.bounds belongs to equations of one's own; a template's unknown has its own bounds",
            ));
        }
        // The unknown may be implicit: compile once to learn its name.
        let name = Problem::compile(&spec)?
            .unknown()
            .map(str::to_string)
            .ok_or_else(|| {
                InputError::new(
                    "needs-one-unknown",
                    "a sweep needs a problem with one unknown",
                )
            })?;
        spec.unknown = None;
        spec.unknowns = Some(vec![UnknownInput::Spec(
            crate::problem::spec::UnknownObject {
                name,
                guesses: None,
                bounds: Some(b),
                unit: None,
            },
        )]);
    }
    let problem = Problem::compile(&spec)?;
    let mut sweep = problem.sweep(&SweepSpec {
        input: req.input.clone(),
        from: req.from,
        to: req.to,
        points: req.points,
        spacing: req.spacing.clone(),
        method: req.method.clone(),
        tolerances: req.tolerances.clone(),
        guesses: req.guesses,
    })?;
    let points = sweep.report().points;
    Ok(sweep.advance(points)?.clone())
}

/// All roots in a range of a text equation with one unknown.
pub fn find_roots(req: &RootsCall) -> Result<RootsReport, InputError> {
    let spec = ProblemSpec {
        equations: Some(req.equations.clone()),
        knowns: req.knowns.clone(),
        units: req.units.clone(),
        unknown: req.unknown.clone(),
        ..ProblemSpec::default()
    };
    let problem = Problem::compile(&spec)?;
    problem.roots(
        req.range.0,
        req.range.1,
        &RootsOptions {
            samples: req.samples,
            tolerances: req.tolerances.clone(),
            proven: req.proven,
            max_regions: req.max_regions,
        },
    )
}

/// All roots in a range of a Rust closure (the native counterpart of `findRoots` with
/// a JS function).
pub fn find_roots_function(
    req: &FunctionRootsCall,
    mut f: impl FnMut(f64) -> f64,
) -> Result<RootsReport, InputError> {
    let (lo, hi) = req.range;
    crate::error::require_finite(lo, "request.range[0]")?;
    crate::error::require_finite(hi, "request.range[1]")?;
    let mut scan = ScanOptions {
        tol: TolerancesInput::read(req.tolerances.as_ref(), "request.tolerances")?,
        ..ScanOptions::default()
    };
    if let Some(n) = req.samples {
        let max = roots_in_range::MAX_SAMPLES;
        if !(n.fract() == 0.0 && (3.0..=max as f64).contains(&n)) {
            return Err(InputError::new(
                "bad-samples",
                format!("request.samples must be a whole number from 3 to {max}, got {n}"),
            ));
        }
        scan.samples = n as usize;
    }
    let found = roots_in_range::roots_in_range(lo, hi, &scan, erase(&mut f))?;
    let labels = vec![None; found.roots.len()];
    Ok(RootsReport::from_scan(
        &found,
        &Conversion::NONE,
        labels,
        None,
        (lo, hi),
    ))
}

/// A compiled problem kept for many calls (the JS `Problem` class).
pub struct ProblemSession {
    problem: Rc<Problem>,
}

impl ProblemSession {
    pub fn compile(spec: &ProblemSpec) -> Result<ProblemSession, InputError> {
        Ok(ProblemSession {
            problem: Rc::new(Problem::compile(spec)?),
        })
    }

    pub fn problem(&self) -> &Problem {
        &self.problem
    }

    pub fn unknown(&self) -> Option<String> {
        self.problem.unknown().map(str::to_string)
    }

    pub fn unit(&self) -> Option<String> {
        self.problem.unit()
    }

    pub fn solve(&self, opts: &SolveOptions) -> Result<SolveReport, InputError> {
        self.problem.solve(opts)
    }

    pub fn residual(&self, x: f64) -> Result<f64, InputError> {
        self.problem.residual(x)
    }

    /// `n` is a JavaScript number: checked to be a whole number in range first.
    pub fn sample(&self, lo: f64, hi: f64, n: f64) -> Result<SampleReport, InputError> {
        let max = crate::problem::MAX_SAMPLE_POINTS;
        if !(n.fract() == 0.0 && (2.0..=max as f64).contains(&n)) {
            return Err(InputError::new(
                "bad-samples",
                format!("the number of points must be a whole number from 2 to {max}, got {n}"),
            ));
        }
        self.problem.sample(lo, hi, n as usize)
    }

    pub fn roots(&self, lo: f64, hi: f64, opts: &RootsOptions) -> Result<RootsReport, InputError> {
        self.problem.roots(lo, hi, opts)
    }

    /// Solves with sensitivities and gives them with the answer.
    pub fn sensitivities(&self, opts: &SolveOptions) -> Result<SensitivitiesReport, InputError> {
        let r = self.problem.solve(&SolveOptions {
            sensitivities: true,
            ..opts.clone()
        })?;
        Ok(SensitivitiesReport {
            converged: r.converged,
            status: r.status,
            message: r.message,
            root: r.root,
            unit: r.unit,
            sensitivities: r.sensitivities,
            evaluations: r.sensitivity_evaluations,
        })
    }

    /// Starts the uncertainty of the answer (the knowns' `uncertainties`), its Monte
    /// Carlo trials run in chunks by [`UncertaintySession::advance`].
    pub fn start_uncertainty(&self, opts: &SolveOptions) -> Result<UncertaintySession, InputError> {
        Ok(UncertaintySession {
            run: self.problem.uncertainty(opts)?,
        })
    }

    pub fn start_sweep(&self, spec: &SweepSpec) -> Result<SweepSession, InputError> {
        Ok(SweepSession {
            sweep: Sweep::shared(Rc::clone(&self.problem), spec)?,
        })
    }
}

/// The uncertainty of an answer with its Monte Carlo trials run in chunks (the JS
/// `Problem.uncertainty`).
pub struct UncertaintySession {
    run: crate::problem::UncertaintyRun,
}

impl UncertaintySession {
    /// Runs up to `chunk` more trials (a JavaScript number, checked); the trials done.
    pub fn advance(&mut self, chunk: f64) -> Result<usize, InputError> {
        let max = crate::uncertainty::MAX_TRIALS;
        if !(chunk.fract() == 0.0 && (1.0..=max as f64).contains(&chunk)) {
            return Err(InputError::new(
                "bad-request",
                format!("the chunk must be a whole number from 1 to {max}, got {chunk}"),
            ));
        }
        Ok(self.run.advance(chunk as usize))
    }

    pub fn done(&self) -> usize {
        self.run.done()
    }

    pub fn trials(&self) -> usize {
        self.run.trials()
    }

    pub fn is_done(&self) -> bool {
        self.run.is_done()
    }

    /// The law of propagation at once; the Monte Carlo result once every trial is done.
    pub fn report(&self) -> crate::problem::report::UncertaintyReport {
        self.run.report()
    }
}

// ---------------------------------------------------------------------------------------
// Templates of one's own

/// Reads and checks an exchange file of own templates (its text).
pub fn read_own_templates(text: &str) -> Result<Vec<OwnTemplate>, InputError> {
    own::read_file(text)
}

/// Checks one own template (as sent) and gives it back as read.
pub fn check_own_template(t: &OwnTemplate) -> Result<OwnTemplate, InputError> {
    t.check("template")?;
    Ok(t.clone())
}

/// Writes own templates as an exchange file, after checking them.
pub fn write_own_templates(list: &OwnTemplateList) -> Result<String, InputError> {
    own::write_file(list.templates.as_deref().unwrap_or_default())
}

/// `writeOwnTemplates`: the templates to write.
#[derive(Debug, Clone, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct OwnTemplateList {
    #[serde(default, deserialize_with = "bounded::opt_vec")]
    pub templates: Option<Vec<OwnTemplate>>,
}

/// Largest chunk of a sweep advanced by one call.
pub const MAX_SWEEP_CHUNK: usize = MAX_SWEEP_POINTS;

/// A sweep run in chunks (the JS `Problem.sweep`), each call giving only its new points.
pub struct SweepSession {
    sweep: Sweep<'static>,
}

impl SweepSession {
    /// Solves up to `chunk` more points (a JavaScript number, checked) and gives them.
    pub fn advance(&mut self, chunk: f64) -> Result<SweepReport, InputError> {
        if !(chunk.fract() == 0.0 && (1.0..=MAX_SWEEP_CHUNK as f64).contains(&chunk)) {
            return Err(InputError::new(
                "bad-request",
                format!(
                    "the chunk must be a whole number from 1 to {MAX_SWEEP_CHUNK}, got {chunk}"
                ),
            ));
        }
        let from = self.sweep.report().done;
        let r = self.sweep.advance(chunk as usize)?;
        Ok(SweepReport {
            input_name: r.input_name.clone(),
            input_unit: r.input_unit.clone(),
            unit: r.unit.clone(),
            unknown: r.unknown.clone(),
            input: r.input[from..].to_vec(),
            root: r.root[from..].to_vec(),
            status: r.status[from..].to_vec(),
            converged: r.converged[from..].to_vec(),
            evaluations: r.evaluations[from..].to_vec(),
            total_evaluations: r.evaluations[from..].iter().sum(),
            done: r.done,
            points: r.points,
        })
    }

    pub fn is_done(&self) -> bool {
        self.sweep.is_done()
    }

    pub fn done(&self) -> usize {
        self.sweep.report().done
    }

    pub fn points(&self) -> usize {
        self.sweep.report().points
    }
}

// ---------------------------------------------------------------------------------------
// Functions and the ask–tell stepper

/// Reads the start and options of a scalar solve of a function or a stepper.
pub fn scalar_setup(req: &ScalarCall) -> Result<(Start, Options), InputError> {
    let start = match (req.guesses, req.bracket) {
        (Some((a, b)), None) => Start::Guesses(a, b),
        (None, Some((a, b))) => Start::Bracket(a, b),
        (Some(_), Some(_)) => {
            return Err(bad(
                "give either options.guesses or options.bracket, not both",
            ))
        }
        (None, None) => {
            return Err(bad(
                "options.guesses or options.bracket is missing: give two starting points",
            ))
        }
    };
    for (name, p) in [("guesses", req.guesses), ("bracket", req.bracket)] {
        if let Some((a, b)) = p {
            crate::error::require_finite(a, &format!("options.{name}[0]"))?;
            crate::error::require_finite(b, &format!("options.{name}[1]"))?;
        }
    }
    let options = Options {
        method: match &req.method {
            Some(m) => MethodKind::from_code(m)?,
            None => MethodKind::Auto,
        },
        tol: TolerancesInput::read(req.tolerances.as_ref(), "options.tolerances")?,
        bounds: crate::problem::spec::bounds(req.bounds, "options.bounds")?,
        record_history: req.history,
    };
    crate::methods::validate(start, &options)?;
    Ok((start, options))
}

/// Solves f(x) = 0 for a Rust closure (the native counterpart of `solveFunction`).
pub fn solve_function(
    req: &ScalarCall,
    mut f: impl FnMut(f64) -> f64,
) -> Result<ScalarReport, InputError> {
    let (start, options) = scalar_setup(req)?;
    let solution = crate::stepper::solve(start, &options, erase(&mut f))?;
    Ok(ScalarReport::of(&solution))
}

/// The ask–tell stepper behind the JS `Stepper` class.
pub struct StepperSession {
    stepper: Stepper,
}

impl StepperSession {
    pub fn create(req: &ScalarCall) -> Result<StepperSession, InputError> {
        let (start, options) = scalar_setup(req)?;
        Ok(StepperSession {
            stepper: Stepper::new(start, &options)?,
        })
    }

    pub fn restore(json: &str) -> Result<StepperSession, InputError> {
        if json.len() > MAX_SAVED_STEPPER_BYTES {
            return Err(InputError::new(
                "bad-saved-stepper",
                format!(
                    "saved stepper is {} bytes long; the limit is {MAX_SAVED_STEPPER_BYTES}",
                    json.len()
                ),
            ));
        }
        Ok(StepperSession {
            stepper: Stepper::restore(json)?,
        })
    }

    pub fn next_point(&self) -> Option<f64> {
        self.stepper.next_point()
    }

    pub fn next_kind(&self) -> Option<StepKind> {
        self.stepper.next_kind()
    }

    pub fn tell(&mut self, fx: f64) -> Result<(), InputError> {
        self.stepper.tell(fx)
    }

    pub fn is_done(&self) -> bool {
        self.stepper.is_done()
    }

    pub fn evaluations(&self) -> usize {
        self.stepper.evaluations()
    }

    /// The result once done.
    pub fn result(&self) -> Option<ScalarReport> {
        self.stepper.solution().map(ScalarReport::of)
    }

    /// The history rows so far (empty unless history was asked for).
    pub fn history(&self) -> Vec<HistoryReport> {
        HistoryReport::rows(&self.stepper.history().0, &Conversion::NONE)
    }

    /// The set-up and every value told, as JSON text (a record format of its own).
    pub fn save(&self) -> String {
        self.stepper.save()
    }
}

/// Solves F(x) = 0 for n unknowns given as a closure filling n residuals.
pub fn solve_system_function(
    req: &SystemCall,
    mut f: impl FnMut(&[f64], &mut [f64]),
) -> Result<SystemReport, InputError> {
    let x0 = &req.x0;
    if x0.is_empty() || x0.len() > MAX_SYSTEM_UNKNOWNS {
        return Err(bad(format!(
            "options.x0 has {} values; give 1 to {MAX_SYSTEM_UNKNOWNS}",
            x0.len()
        )));
    }
    for (i, x) in x0.iter().enumerate() {
        crate::error::require_finite(*x, &format!("options.x0[{i}]"))?;
    }
    let bounds = match &req.bounds {
        None => Vec::new(),
        Some(b) if b.len() == x0.len() => b
            .iter()
            .enumerate()
            .map(|(i, v)| crate::problem::spec::bounds(Some(*v), &format!("options.bounds[{i}]")))
            .collect::<Result<Vec<Bounds>, _>>()?,
        Some(b) => {
            return Err(bad(format!(
                "options.bounds has {} pairs for {} unknowns; give one [lower, upper] per unknown",
                b.len(),
                x0.len()
            )))
        }
    };
    for (i, (x, b)) in x0.iter().zip(&bounds).enumerate() {
        if !b.contains(*x) {
            return Err(InputError::new(
                "start-outside-bounds",
                format!(
                    "options.x0[{i}] = {x} lies outside options.bounds[{i}] [{}, {}]",
                    b.lo, b.hi
                ),
            ));
        }
    }
    let options = broyden::SystemOptions {
        tol: TolerancesInput::read(req.tolerances.as_ref(), "options.tolerances")?,
        bounds,
        record_history: req.history,
    };
    let s = broyden::solve_system(x0, &options, &mut f as &mut dyn FnMut(&[f64], &mut [f64]))?;
    Ok(SystemReport {
        residual: max_abs(&s.residuals),
        roots: s.x,
        residuals: s.residuals,
        converged: s.converged,
        status: s.status.code(),
        message: s.status.diagnosis(),
        evaluations: s.evaluations,
        iterations: s.iterations,
        certificate: s.certificate.as_ref().map(CertificateReport::system),
        history: s
            .history
            .iter()
            .map(|r| SystemHistoryReport {
                k: r.k,
                x: r.x.clone(),
                residual_norm: r.residual_norm,
                kind: r.kind.code(),
            })
            .collect(),
        history_dropped: s.history_dropped,
    })
}

fn max_abs(v: &[f64]) -> f64 {
    v.iter().fold(0.0f64, |m, r| {
        if r.is_nan() || m.is_nan() {
            f64::NAN
        } else {
            m.max(r.abs())
        }
    })
}

// ---------------------------------------------------------------------------------------
// Catalogue, units, checking a text

/// `snake_case` to `camelCase`, for field names of the catalogue.
fn camel(key: &str) -> String {
    let mut out = String::with_capacity(key.len());
    let mut upper = false;
    for c in key.chars() {
        if c == '_' {
            upper = true;
        } else if upper {
            out.extend(c.to_uppercase());
            upper = false;
        } else {
            out.push(c);
        }
    }
    out
}

fn camel_keys(v: serde_json::Value) -> serde_json::Value {
    use serde_json::Value;
    match v {
        Value::Object(m) => Value::Object(
            m.into_iter()
                .map(|(k, v)| (camel(&k), camel_keys(v)))
                .collect(),
        ),
        Value::Array(a) => Value::Array(a.into_iter().map(camel_keys).collect()),
        other => other,
    }
}

/// Every template with its full metadata, field names in camelCase. Open bounds
/// (infinite) are `null`.
pub fn catalogue() -> serde_json::Value {
    let value = serde_json::to_value(crate::templates::all())
        .unwrap_or(serde_json::Value::Array(Vec::new()));
    camel_keys(value)
}

fn check_unit_text(unit: &str, what: &str) -> Result<(), InputError> {
    let n = unit.chars().count();
    if n > MAX_UNIT_CHARS {
        return Err(InputError::new(
            "unknown-unit",
            format!("{what} unit is {n} characters long; no unit is longer than {MAX_UNIT_CHARS}"),
        ));
    }
    Ok(())
}

/// Converts `value` between two units of the same dimension.
pub fn convert_unit(value: f64, from: &str, to: &str) -> Result<f64, InputError> {
    check_unit_text(from, "the from")?;
    check_unit_text(to, "the to")?;
    crate::error::require_finite(value, "the value to convert")?;
    crate::units::convert(value, from, to)
}

/// Every dimension with its units, SI unit first.
pub fn units_catalogue() -> Vec<DimensionUnits> {
    crate::units::dimensions()
        .into_iter()
        .map(|d| DimensionUnits {
            dimension: d,
            units: crate::units::units_of(d),
        })
        .collect()
}

/// Parses an equation text without solving it; never an error for bad text.
pub fn check_equation(text: &str) -> CheckReport {
    let n = text.chars().count();
    let parsed = if n > MAX_EQUATION_CHARS {
        Err(InputError::new(
            "equation-too-long",
            format!("the equation text is {n} characters long; the limit is {MAX_EQUATION_CHARS}"),
        ))
    } else {
        crate::equations::EquationSet::parse(text)
    };
    match parsed {
        Ok(set) => CheckReport {
            ok: true,
            variables: Some(set.variables()),
            definitions: Some(set.definition_names()),
            equations: Some(set.equation_count()),
            code: None,
            message: None,
            position: None,
            caret: None,
        },
        Err(e) => CheckReport {
            ok: false,
            variables: None,
            definitions: None,
            equations: None,
            code: Some(e.code),
            caret: e.position.map(|p| crate::equations::caret(text, p)),
            message: Some(e.message),
            position: e.position,
        },
    }
}

// ---------------------------------------------------------------------------------------
// JSON text

/// The same calls with JSON text in and out, for native callers and tests. Numbers
/// that are not finite are written as `null` (JSON has none); requests give open
/// bounds as `null`.
pub mod json {
    use super::*;

    pub use super::{
        MAX_EQUATION_CHARS, MAX_EVALS, MAX_REQUEST_BYTES, MAX_SAVED_STEPPER_BYTES, MAX_SWEEP_POINTS,
    };

    /// A result as JSON text. Serialising these plain structs cannot fail; should it,
    /// the error says so rather than panicking.
    pub fn text<T: Serialize>(value: &T) -> Result<String, InputError> {
        serde_json::to_string(value)
            .map_err(|e| InputError::new("internal", format!("the result cannot be written: {e}")))
    }

    fn read<T: for<'de> Deserialize<'de>>(what: &str, text: &str) -> Result<T, InputError> {
        crate::problem::spec::from_json(what, text)
    }

    pub fn solve_equation(request: &str) -> Result<String, InputError> {
        text(&super::solve_equation(&read("request", request)?)?)
    }

    pub fn solve_template(request: &str) -> Result<String, InputError> {
        text(&super::solve_template(&read("request", request)?)?)
    }

    pub fn sweep(request: &str) -> Result<String, InputError> {
        text(&super::sweep(&read("request", request)?)?)
    }

    pub fn find_roots(request: &str) -> Result<String, InputError> {
        text(&super::find_roots(&read("request", request)?)?)
    }

    pub fn find_roots_function(
        request: &str,
        f: impl FnMut(f64) -> f64,
    ) -> Result<String, InputError> {
        text(&super::find_roots_function(&read("request", request)?, f)?)
    }

    pub fn solve_function(request: &str, f: impl FnMut(f64) -> f64) -> Result<String, InputError> {
        text(&super::solve_function(&read("options", request)?, f)?)
    }

    pub fn solve_system_function(
        request: &str,
        f: impl FnMut(&[f64], &mut [f64]),
    ) -> Result<String, InputError> {
        text(&super::solve_system_function(
            &read("options", request)?,
            f,
        )?)
    }

    pub fn check_equation(equation: &str) -> String {
        text(&super::check_equation(equation)).unwrap_or_default()
    }

    pub fn catalogue() -> String {
        super::catalogue().to_string()
    }

    pub fn units_catalogue() -> String {
        text(&super::units_catalogue()).unwrap_or_default()
    }

    pub fn convert_unit(value: f64, from: &str, to: &str) -> Result<f64, InputError> {
        super::convert_unit(value, from, to)
    }

    /// A problem compiled from a JSON spec.
    pub fn problem(spec: &str) -> Result<ProblemSession, InputError> {
        ProblemSession::compile(&read("spec", spec)?)
    }

    /// A stepper from JSON options.
    pub fn stepper(options: &str) -> Result<StepperSession, InputError> {
        StepperSession::create(&read("options", options)?)
    }
}
