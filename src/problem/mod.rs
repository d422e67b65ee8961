//! One compiled problem, end to end: a bundled template or an equation set of one's
//! own, checked and compiled once ([`Problem::compile`]), then solved, evaluated,
//! sampled, scanned for every root, swept and differentiated as often as wanted.
//!
//! Units are converted once on the way in (every known and the unknown's guesses and
//! bounds to SI) and once on the way out (every x of every result to the unit the
//! caller chose); the solve in between knows no units. The page and the bindings hold
//! no numerics: what they show comes from here.
//!
//! ```
//! use tacit::problem::{Problem, ProblemSpec, SolveOptions};
//! let spec: ProblemSpec = tacit::problem::spec::from_json("spec",
//!     r#"{"equations": "h = L*f*v^2/(2*g*D)", "knowns": {"h": 3, "L": 100, "f": 0.02, "g": 9.81, "D": 0.1},
//!        "unknown": "v", "units": {"v": "m/s"}}"#).unwrap();
//! let p = Problem::compile(&spec).unwrap();
//! let r = p.solve(&SolveOptions::default()).unwrap();
//! assert!(r.converged);
//! assert!((r.root.unwrap() - (3.0 * 2.0 * 9.81 * 0.1 / (100.0 * 0.02f64)).sqrt()).abs() < 1e-9);
//! ```

pub mod report;
pub mod spec;

use std::collections::BTreeMap;

use crate::equations::quantities::{self, VariableUnits};
use crate::equations::{default_guesses, EquationSet, SetSolution, UnknownSpec};
use crate::error::InputError;
use crate::methods::{Options, Start};
use crate::outcome::Status;
use crate::roots_in_range::{roots_in_range, ScanOptions, MAX_SAMPLES};
use crate::templates::{self, TemplateRequest, TemplateSolution};
use crate::tolerances::Bounds;
use crate::units;

pub use report::{
    CertificateReport, Conversion, HistoryReport, RangeRootReport, RootsReport, SampleReport,
    SolveReport, SweepReport,
};
pub use spec::{Known, ProblemSpec, Quantity, RootsOptions, SolveOptions, SweepSpec, UnknownInput};

/// Longest equation text accepted, in characters.
pub const MAX_EQUATION_CHARS: usize = 100_000;
/// Most points of one sweep.
pub const MAX_SWEEP_POINTS: usize = 100_000;
/// Most points of one sample of f.
pub const MAX_SAMPLE_POINTS: usize = 100_000;
/// Longest name or unit accepted.
pub const MAX_NAME_CHARS: usize = 200;

/// A compiled problem.
pub struct Problem {
    kind: Kind,
}

enum Kind {
    Template(Box<templates::Compiled>),
    Equations(Box<Equations>),
}

/// An equation set with its knowns, unknowns and units, checked.
struct Equations {
    set: EquationSet,
    /// Knowns in their units (as `units` says).
    knowns: Vec<(String, f64)>,
    /// Unknowns with guesses and bounds in their units.
    unknowns: Vec<UnknownSpec>,
    units: VariableUnits,
    /// The unit text of every name that has one.
    unit_text: BTreeMap<String, String>,
}

fn short(text: &str, place: &str) -> Result<(), InputError> {
    if text.chars().count() > MAX_NAME_CHARS {
        return Err(InputError::new(
            "bad-request",
            format!("{place} is longer than {MAX_NAME_CHARS} characters"),
        ));
    }
    Ok(())
}

impl Problem {
    /// Checks and compiles a problem. Errors name the value and the place.
    pub fn compile(spec: &ProblemSpec) -> Result<Problem, InputError> {
        match (&spec.template, &spec.equations) {
            (Some(id), None) => Problem::template(spec, id),
            (None, Some(text)) => Problem::equations(spec, text),
            (Some(_), Some(_)) => Err(InputError::new(
                "bad-request",
                "spec: give either template or equations, not both",
            )),
            (None, None) => Err(InputError::new(
                "bad-request",
                "spec: give a template id (template) or an equation text (equations)",
            )),
        }
    }

    fn template(spec: &ProblemSpec, id: &str) -> Result<Problem, InputError> {
        short(id, "spec.template")?;
        for (field, given) in [
            ("equations", spec.equations.is_some()),
            ("knowns", spec.knowns.is_some()),
            ("units", spec.units.is_some()),
            ("unknowns", spec.unknowns.is_some()),
        ] {
            if given {
                return Err(InputError::new(
                    "bad-request",
                    format!("spec.{field} belongs to equations of one's own, not to a template"),
                ));
            }
        }
        let unknown = spec.unknown.as_deref().ok_or_else(|| {
            InputError::new(
                "no-unknown",
                "spec.unknown is missing: name the template's variable to solve for",
            )
        })?;
        short(unknown, "spec.unknown")?;
        let t = templates::find(id);
        let mut values = Vec::new();
        for (symbol, known) in spec.values.iter().flatten() {
            short(symbol, "a name in spec.values")?;
            let place = format!("spec.values.{symbol}");
            let unit_of = || {
                t.and_then(|t| {
                    t.variable(symbol).map(|v| v.unit.clone()).or_else(|| {
                        t.list
                            .as_ref()
                            .filter(|l| &l.symbol == symbol)
                            .map(|l| l.unit.clone())
                    })
                })
                .ok_or_else(|| {
                    InputError::new(
                        "unknown-variable",
                        format!("{place} names no variable of template {id}"),
                    )
                })
            };
            match known {
                Known::One(q) => {
                    let unit = match q.unit() {
                        Some(u) => {
                            short(u, &format!("{place}.unit"))?;
                            u.to_string()
                        }
                        None => unit_of()?,
                    };
                    values.push((symbol.clone(), q.value(), unit));
                }
                Known::List(items) => {
                    let unit = unit_of()?;
                    for v in items {
                        values.push((symbol.clone(), *v, unit.clone()));
                    }
                }
            }
        }
        if let Some(u) = &spec.result_unit {
            short(u, "spec.resultUnit")?;
        }
        let req = TemplateRequest {
            id: id.to_string(),
            values,
            unknown: unknown.to_string(),
            result_unit: spec.result_unit.clone(),
            guesses: None,
            options: Options::default(),
            sensitivities: false,
            branch: spec.branch.clone(),
            use_scenario_defaults: spec.use_scenario_defaults,
        };
        Ok(Problem {
            kind: Kind::Template(Box::new(templates::compile(&req)?)),
        })
    }

    fn equations(spec: &ProblemSpec, text: &str) -> Result<Problem, InputError> {
        for (field, given) in [
            ("values", spec.values.is_some()),
            ("resultUnit", spec.result_unit.is_some()),
            ("branch", spec.branch.is_some()),
            ("useScenarioDefaults", spec.use_scenario_defaults),
        ] {
            if given {
                return Err(InputError::new(
                    "bad-request",
                    format!("spec.{field} belongs to a template, not to equations of one's own"),
                ));
            }
        }
        let chars = text.chars().count();
        if chars > MAX_EQUATION_CHARS {
            return Err(InputError::new(
                "equation-too-long",
                format!(
                    "the equation text has {chars} characters; the limit is {MAX_EQUATION_CHARS}"
                ),
            ));
        }
        let set = EquationSet::parse(text)?;
        let mut unit_text: BTreeMap<String, String> = BTreeMap::new();
        for (name, unit) in spec.units.iter().flatten() {
            short(name, "a name in spec.units")?;
            short(unit, &format!("spec.units.{name}"))?;
            unit_text.insert(name.clone(), unit.clone());
        }
        // Knowns: a number is in its variable's unit; {value, unit} converts to it, or
        // gives the variable its unit when it has none.
        let mut knowns: Vec<(String, f64)> = Vec::new();
        for (name, q) in spec.knowns.iter().flatten() {
            short(name, "a name in spec.knowns")?;
            let place = format!("spec.knowns.{name}");
            let v = q.value();
            if !v.is_finite() {
                return Err(InputError::new(
                    "non-finite-input",
                    format!("{place} must be a finite number, got {v}"),
                ));
            }
            let value = match (q.unit(), unit_text.get(name)) {
                (None, _) => v,
                (Some(u), Some(own)) => units::convert(v, u, own)
                    .map_err(|e| InputError::new(e.code, format!("{place}: {}", e.message)))?,
                (Some(u), None) => {
                    short(u, &format!("{place}.unit"))?;
                    unit_text.insert(name.clone(), u.to_string());
                    v
                }
            };
            knowns.push((name.clone(), value));
        }
        let given: Vec<&str> = knowns.iter().map(|(n, _)| n.as_str()).collect();
        let mut unknowns: Vec<UnknownSpec> = Vec::new();
        match (&spec.unknowns, &spec.unknown) {
            (Some(_), Some(_)) => {
                return Err(InputError::new(
                    "bad-request",
                    "spec: give unknown (one) or unknowns (a list), not both",
                ))
            }
            (Some(list), None) => {
                if list.len() > crate::equations::solve::MAX_UNKNOWNS {
                    return Err(InputError::new(
                        "too-many-unknowns",
                        format!(
                            "{} unknowns asked for; at most {} are solved together",
                            list.len(),
                            crate::equations::solve::MAX_UNKNOWNS
                        ),
                    ));
                }
                for (i, u) in list.iter().enumerate() {
                    let place = format!("spec.unknowns[{i}]");
                    short(u.name(), &format!("{place}.name"))?;
                    let mut s = UnknownSpec::named(u.name());
                    if let UnknownInput::Spec(o) = u {
                        if let Some(unit) = &o.unit {
                            short(unit, &format!("{place}.unit"))?;
                            if let Some(own) = unit_text.get(&o.name) {
                                if own != unit {
                                    return Err(InputError::new(
                                        "bad-request",
                                        format!("{place}.unit \"{unit}\" differs from spec.units.{} \"{own}\"", o.name),
                                    ));
                                }
                            }
                            unit_text.insert(o.name.clone(), unit.clone());
                        }
                        s.guesses = o.guesses;
                        s.bounds = spec::bounds(o.bounds, &format!("{place}.bounds"))?;
                    }
                    unknowns.push(s);
                }
            }
            (None, Some(name)) => {
                short(name, "spec.unknown")?;
                unknowns.push(UnknownSpec::named(name));
            }
            (None, None) => {
                for v in set.variables() {
                    if !given.contains(&v.as_str()) {
                        unknowns.push(UnknownSpec::named(&v));
                    }
                }
                if unknowns.is_empty() {
                    return Err(InputError::new(
                        "no-unknown",
                        "spec: every variable has a value; leave one out or name it in unknown",
                    ));
                }
            }
        }
        let named: Vec<&str> = knowns
            .iter()
            .map(|(n, _)| n.as_str())
            .chain(unknowns.iter().map(|u| u.name.as_str()))
            .collect();
        let pairs: Vec<(String, String)> = unit_text
            .iter()
            .map(|(n, u)| (n.clone(), u.clone()))
            .collect();
        let checked = VariableUnits::new(&set, &pairs, &named)?;
        // Names are checked against the set here, once, so that later calls cannot fail
        // on them.
        crate::equations::solve::check_names(&set, &knowns, &unknowns)?;
        Ok(Problem {
            kind: Kind::Equations(Box::new(Equations {
                set,
                knowns,
                unknowns,
                units: checked,
                unit_text,
            })),
        })
    }

    /// The one unknown's name, if the problem has exactly one.
    pub fn unknown(&self) -> Option<&str> {
        match &self.kind {
            Kind::Template(c) => Some(&c.unknown.symbol),
            Kind::Equations(e) => match e.unknowns.as_slice() {
                [one] => Some(&one.name),
                _ => None,
            },
        }
    }

    /// The unit of the one unknown's values, if it has one.
    pub fn unit(&self) -> Option<String> {
        match &self.kind {
            Kind::Template(c) => Some(c.unit.clone()),
            Kind::Equations(e) => {
                let name = self.unknown()?;
                e.unit_text.get(name).cloned()
            }
        }
    }

    /// The one unknown's conversion from SI to its unit.
    fn conversion(&self) -> Result<Conversion, InputError> {
        match &self.kind {
            Kind::Template(c) => {
                let row = units::unit_in(&c.unit, &c.unknown.dimension)?;
                Ok(Conversion {
                    factor: row.factor,
                    offset: row.offset,
                })
            }
            Kind::Equations(e) => Ok(match self.unknown().and_then(|n| e.units.unit(n)) {
                Some(u) => Conversion {
                    factor: u.factor,
                    offset: u.offset,
                },
                None => Conversion::NONE,
            }),
        }
    }

    fn one_unknown(&self, what: &str) -> Result<&str, InputError> {
        self.unknown().ok_or_else(|| {
            InputError::new(
                "needs-one-unknown",
                format!("{what} needs a problem with one unknown; this one has several"),
            )
        })
    }

    /// Solves the problem.
    pub fn solve(&self, opts: &SolveOptions) -> Result<SolveReport, InputError> {
        let options = opts.options("options")?;
        match &self.kind {
            Kind::Template(c) => {
                let compiled = c.with_options(options, opts.sensitivities, opts.guesses)?;
                let outcome = compiled.solve()?;
                let solution = compiled.report(outcome)?;
                Ok(self.template_report(solution, &self.conversion()?))
            }
            Kind::Equations(e) => {
                let mut unknowns = e.unknowns.clone();
                if let Some(g) = opts.guesses {
                    match unknowns.as_mut_slice() {
                        [one] => one.guesses = Some(g),
                        _ => {
                            return Err(InputError::new(
                                "bad-request",
                                "options.guesses is for one unknown; give each unknown its guesses in the spec",
                            ))
                        }
                    }
                }
                let s = quantities::solve_in_units(
                    &e.set,
                    &e.knowns,
                    &unknowns,
                    &options,
                    opts.sensitivities,
                    &e.units,
                )?;
                Ok(self.equations_report(e, s))
            }
        }
    }

    fn equations_report(&self, e: &Equations, s: SetSolution) -> SolveReport {
        let c = self.conversion().unwrap_or(Conversion::NONE);
        let one = self.unknown().map(str::to_string);
        // solve_in_units gave the history and bracket in the unknown's unit already;
        // the certificate is still in SI.
        let mut r = set_report(&s, &Conversion::NONE, &c);
        if let (Some(name), Some(&(_, v))) = (&one, s.unknowns.first()) {
            r.unknown = Some(name.clone());
            r.root = Some(v);
            r.root_si = Some(e.units.to_si(name, v));
            r.unit = e.unit_text.get(name).cloned();
        }
        r.units = e
            .unit_text
            .iter()
            .map(|(n, u)| (n.clone(), u.clone()))
            .collect();
        r
    }

    fn template_report(&self, t: TemplateSolution, c: &Conversion) -> SolveReport {
        let mut r = set_report(&t.solution, c, c);
        // The template's solve is in SI throughout: convert the unknown's values.
        let name = t
            .solution
            .unknowns
            .first()
            .map(|(n, _)| n.clone())
            .unwrap_or_default();
        let root_si = t.solution.unknowns.first().map_or(f64::NAN, |u| u.1);
        for (n, v) in t.solution.unknowns.iter() {
            if n == &name {
                r.unknowns.insert(n.clone(), t.value);
            } else {
                r.unknowns.insert(n.clone(), *v);
            }
        }
        r.unknown = Some(name.clone());
        r.root = Some(t.value);
        r.value = Some(t.value);
        r.root_si = Some(root_si);
        r.unit = Some(t.unit.clone());
        r.units.insert(name, t.unit.clone());
        r.branch = t.branch;
        r.other_roots = t
            .other_roots
            .iter()
            .map(|o| report::OtherRootReport {
                value: o.value,
                label: o.label.clone(),
            })
            .collect();
        r.scan_evaluations = t.scan_evaluations;
        r.notes = t.notes;
        r.caution = t.caution;
        r.outputs = t
            .outputs
            .iter()
            .map(|o| report::OutputReport {
                symbol: o.symbol.clone(),
                meaning: o.meaning.clone(),
                value: o.value,
                unit: o.unit.clone(),
            })
            .collect();
        r
    }

    /// The residual as a function of the one unknown in SI, and its conversion.
    fn residual_fn(&self, what: &str) -> Result<(ResidualFn<'_>, Conversion), InputError> {
        let c = self.conversion()?;
        match &self.kind {
            Kind::Template(t) => Ok((t.residual()?, c)),
            Kind::Equations(e) => {
                let name = self.one_unknown(what)?;
                let knowns: Vec<(String, f64)> = e
                    .knowns
                    .iter()
                    .map(|(n, v)| (n.clone(), e.units.to_si(n, *v)))
                    .collect();
                let f = e.set.residual_fn(&knowns, name)?;
                Ok((Box::new(f), c))
            }
        }
    }

    /// The residual at x (in the unknown's unit); NaN where it is not defined.
    pub fn residual(&self, x: f64) -> Result<f64, InputError> {
        crate::error::require_finite(x, "x")?;
        let (mut f, c) = self.residual_fn("residual")?;
        Ok(f(c.to_si(x)))
    }

    /// f at `n` evenly spaced points from `lo` to `hi` (the unknown's unit), for a plot.
    pub fn sample(&self, lo: f64, hi: f64, n: usize) -> Result<SampleReport, InputError> {
        check_range(lo, hi)?;
        if !(2..=MAX_SAMPLE_POINTS).contains(&n) {
            return Err(InputError::new(
                "bad-samples",
                format!("points must be from 2 to {MAX_SAMPLE_POINTS}, got {n}"),
            ));
        }
        let (mut f, c) = self.residual_fn("sample")?;
        let mut x = Vec::with_capacity(n);
        let mut fs = Vec::with_capacity(n);
        for i in 0..n {
            let xi = if i + 1 == n {
                hi
            } else {
                lo + (hi - lo) * (i as f64 / (n - 1) as f64)
            };
            x.push(xi);
            fs.push(f(c.to_si(xi)));
        }
        Ok(SampleReport {
            unit: self.unit(),
            x,
            f: fs,
        })
    }

    /// Every root from `lo` to `hi` (the unknown's unit), each with its certificate and,
    /// for a template that names its branches, its label.
    pub fn roots(&self, lo: f64, hi: f64, opts: &RootsOptions) -> Result<RootsReport, InputError> {
        check_range(lo, hi)?;
        let samples = match opts.samples {
            None => ScanOptions::default().samples,
            Some(n) if n.fract() == 0.0 && (3.0..=MAX_SAMPLES as f64).contains(&n) => n as usize,
            Some(n) => {
                return Err(InputError::new(
                    "bad-samples",
                    format!(
                        "options.samples must be a whole number from 3 to {MAX_SAMPLES}, got {n}"
                    ),
                ))
            }
        };
        let scan = ScanOptions {
            samples,
            tol: spec::TolerancesInput::read(opts.tolerances.as_ref(), "options.tolerances")?,
        };
        let (mut f, c) = self.residual_fn("roots")?;
        let (a, b) = (c.to_si(lo), c.to_si(hi));
        let found = roots_in_range(a.min(b), a.max(b), &scan, &mut f)?;
        let xs: Vec<f64> = found
            .roots
            .iter()
            .filter(|r| r.converged)
            .map(|r| r.x)
            .collect();
        let labels = match &self.kind {
            Kind::Template(t) => t.label_roots(&xs),
            Kind::Equations(_) => vec![None; xs.len()],
        };
        Ok(RootsReport::from_scan(&found, &c, labels, self.unit()))
    }

    /// Starts a sweep; [`Sweep::advance`] runs it in chunks.
    pub fn sweep(&self, spec: &SweepSpec) -> Result<Sweep<'_>, InputError> {
        Sweep::new(Held::Borrowed(self), spec)
    }
}

/// The residual as a function of the unknown in SI.
type ResidualFn<'a> = Box<dyn FnMut(f64) -> f64 + 'a>;

fn check_range(lo: f64, hi: f64) -> Result<(), InputError> {
    crate::error::require_finite(lo, "range lower end")?;
    crate::error::require_finite(hi, "range upper end")?;
    if lo >= hi {
        return Err(InputError::new(
            "bad-range",
            format!("the range lower end {lo} must be below the upper end {hi}"),
        ));
    }
    Ok(())
}

/// The report of an equation set's solve: `c` converts the scalar solve's x values
/// (history, bracket) and `cert` its certificate's, from SI to the unknown's unit.
fn set_report(s: &SetSolution, c: &Conversion, cert: &Conversion) -> SolveReport {
    let scalar = s.scalar.as_ref();
    SolveReport {
        converged: s.converged,
        status: s.status.code(),
        message: s.status.diagnosis(),
        certificate: match s.blocks.as_slice() {
            [only] => only.certificate.as_ref().map(|k| match &s.scalar {
                Some(_) => CertificateReport::scalar(k, cert),
                None => CertificateReport::system(k),
            }),
            _ => None,
        },
        unknown: None,
        root: None,
        value: None,
        unit: None,
        root_si: None,
        unknowns: s.unknowns.iter().cloned().collect(),
        units: BTreeMap::new(),
        residual: s.residuals.iter().fold(0.0f64, |m, r| {
            if r.is_nan() || m.is_nan() {
                f64::NAN
            } else {
                m.max(r.abs())
            }
        }),
        residuals: s.residuals.clone(),
        evaluations: s.evaluations,
        iterations: s.iterations,
        checks: scalar.map_or(0, |x| x.checks),
        bracket: scalar.and_then(|x| c.pair_from_si(x.bracket)),
        history: scalar.map_or_else(Vec::new, |x| HistoryReport::rows(&x.history, c)),
        history_dropped: scalar.map_or(0, |x| x.history_dropped),
        system_history: s.system.as_ref().map_or_else(Vec::new, |x| {
            x.history
                .iter()
                .map(|r| report::SystemHistoryReport {
                    k: r.k,
                    x: r.x.clone(),
                    residual_norm: r.residual_norm,
                    kind: r.kind.code(),
                })
                .collect()
        }),
        definitions: s.definitions.iter().cloned().collect(),
        sensitivities: s
            .sensitivities
            .iter()
            .map(|d| report::SensitivityReport {
                unknown: d.unknown.clone(),
                input: d.input.clone(),
                derivative: d.derivative,
                relative: d.relative,
            })
            .collect(),
        sensitivity_evaluations: s.sensitivity_evaluations,
        blocks: s
            .blocks
            .iter()
            .map(|b| report::BlockReport {
                unknowns: b.unknowns.clone(),
                equations: b.equations.clone(),
                converged: b.converged,
                status: b.status.code(),
                evaluations: b.evaluations,
                iterations: b.iterations,
                certificate: b.certificate.as_ref().map(|k| {
                    if b.unknowns.len() == 1 && s.blocks.len() == 1 {
                        CertificateReport::scalar(k, cert)
                    } else {
                        CertificateReport::system(k)
                    }
                }),
            })
            .collect(),
        ..SolveReport::default()
    }
}

/// A sweep in progress: the unknown solved at evenly spaced values of one known, each
/// from the previous root, reusing the compiled problem. Run it in chunks with
/// [`Sweep::advance`] so that a page can show progress and cancel.
pub struct Sweep<'p> {
    problem: Held<'p>,
    input: String,
    /// The input's conversion to SI.
    input_conv: Conversion,
    values: Vec<f64>,
    options: Options,
    first: (f64, f64),
    report: SweepReport,
    prev: Option<f64>,
    before: Option<f64>,
}

/// The problem a sweep runs on: borrowed, or shared with a handle that outlives the
/// borrow (the bindings' sweep handle).
enum Held<'p> {
    Borrowed(&'p Problem),
    Shared(std::rc::Rc<Problem>),
}

impl std::ops::Deref for Held<'_> {
    type Target = Problem;
    fn deref(&self) -> &Problem {
        match self {
            Held::Borrowed(p) => p,
            Held::Shared(p) => p,
        }
    }
}

impl Sweep<'static> {
    /// A sweep that shares the problem, so that it can be kept apart from it.
    pub fn shared(
        problem: std::rc::Rc<Problem>,
        spec: &SweepSpec,
    ) -> Result<Sweep<'static>, InputError> {
        Sweep::new(Held::Shared(problem), spec)
    }
}

impl<'p> Sweep<'p> {
    fn new(held: Held<'p>, spec: &SweepSpec) -> Result<Sweep<'p>, InputError> {
        let problem: &Problem = &held;
        let name = problem.one_unknown("a sweep")?.to_string();
        short(&spec.input, "sweep.input")?;
        crate::error::require_finite(spec.from, "sweep.from")?;
        crate::error::require_finite(spec.to, "sweep.to")?;
        let n = spec.points;
        if !(n.fract() == 0.0 && (2.0..=MAX_SWEEP_POINTS as f64).contains(&n)) {
            return Err(InputError::new(
                "bad-request",
                format!(
                    "sweep.points must be a whole number from 2 to {MAX_SWEEP_POINTS}, got {n}"
                ),
            ));
        }
        let n = n as usize;
        let log = match spec.spacing.as_deref() {
            None | Some("linear") => false,
            Some("log") => {
                if !(spec.from > 0.0 && spec.to > 0.0) {
                    return Err(InputError::new(
                        "bad-request",
                        "sweep.spacing \"log\" needs from and to above zero",
                    ));
                }
                true
            }
            Some(other) => {
                return Err(InputError::new(
                    "bad-request",
                    format!("sweep.spacing must be \"linear\" or \"log\", got \"{other}\""),
                ))
            }
        };
        let values: Vec<f64> = (0..n)
            .map(|i| {
                let t = i as f64 / (n - 1) as f64;
                if i + 1 == n {
                    spec.to
                } else if log {
                    (spec.from.ln() + t * (spec.to.ln() - spec.from.ln())).exp()
                } else {
                    spec.from + t * (spec.to - spec.from)
                }
            })
            .collect();
        let (input_conv, input_unit) = match &problem.kind {
            Kind::Template(t) => {
                let var = t.t.variable(&spec.input).ok_or_else(|| {
                    InputError::new(
                        "unknown-variable",
                        format!(
                            "sweep.input \"{}\" is no variable of template {}",
                            spec.input, t.t.id
                        ),
                    )
                })?;
                if var.symbol == name {
                    return Err(InputError::new(
                        "bad-request",
                        "sweep.input is the unknown itself; sweep one of the knowns",
                    ));
                }
                // from and to are in the unit the input was given in (its default
                // unit when it was not given).
                let unit = t
                    .req
                    .values
                    .iter()
                    .find(|(s, _, _)| s == &spec.input)
                    .map_or_else(|| var.unit.clone(), |(_, _, u)| u.clone());
                let row = units::unit_in(&unit, &var.dimension)?;
                (
                    Conversion {
                        factor: row.factor,
                        offset: row.offset,
                    },
                    Some(unit),
                )
            }
            Kind::Equations(e) => {
                if !e.knowns.iter().any(|(n, _)| n == &spec.input) {
                    return Err(InputError::new(
                        "unknown-variable",
                        format!("sweep.input \"{}\" is not one of the knowns", spec.input),
                    ));
                }
                let conv = match e.units.unit(&spec.input) {
                    Some(u) => Conversion {
                        factor: u.factor,
                        offset: u.offset,
                    },
                    None => Conversion::NONE,
                };
                (conv, e.unit_text.get(&spec.input).cloned())
            }
        };
        let solve = SolveOptions {
            method: spec.method.clone(),
            tolerances: spec.tolerances.clone(),
            ..SolveOptions::default()
        };
        let options = solve.options("sweep")?;
        let c = problem.conversion()?;
        let first = match (spec.guesses, &problem.kind) {
            (Some((a, b)), _) => (c.to_si(a), c.to_si(b)),
            (None, Kind::Template(t)) => t.start_guesses(),
            (None, Kind::Equations(e)) => {
                let u = &e.unknowns[0];
                match u.guesses {
                    Some((a, b)) => (e.units.to_si(&name, a), e.units.to_si(&name, b)),
                    None => default_guesses(e.units_bounds(&name, u.bounds)),
                }
            }
        };
        let (unit, input) = (problem.unit(), spec.input.clone());
        Ok(Sweep {
            problem: held,
            input,
            input_conv,
            report: SweepReport {
                input_name: spec.input.clone(),
                input_unit,
                unit,
                unknown: Some(name.clone()),
                points: n,
                ..SweepReport::default()
            },
            values,
            options,
            first,
            prev: None,
            before: None,
        })
    }

    pub fn is_done(&self) -> bool {
        self.report.done >= self.values.len()
    }

    /// Solves up to `chunk` more points; the report so far.
    pub fn advance(&mut self, chunk: usize) -> Result<&SweepReport, InputError> {
        let c = self.problem.conversion()?;
        let end = (self.report.done + chunk.max(1)).min(self.values.len());
        let bounds = self.problem.bounds_si();
        for i in self.report.done..end {
            let v = self.values[i];
            let v_si = self.input_conv.to_si(v);
            let (a, b) = match self.prev {
                Some(p) => continuation_guesses(p, self.before, bounds).unwrap_or(self.first),
                None => self.first,
            };
            let (root, status, evals) =
                self.problem
                    .solve_at(&self.input, v_si, (a, b), &self.options)?;
            if status.is_converged() {
                self.before = self.prev;
                self.prev = Some(root);
            }
            self.report.input.push(v);
            self.report.root.push(c.from_si(root));
            self.report.status.push(status.code());
            self.report.converged.push(status.is_converged());
            self.report.evaluations.push(evals);
            self.report.total_evaluations += evals;
            self.report.done = i + 1;
        }
        Ok(&self.report)
    }

    pub fn report(&self) -> &SweepReport {
        &self.report
    }
}

/// Two starting points for the next solve of a sweep: the previous root and a step
/// along the trend of the last two roots (or a small relative step), kept in bounds.
fn continuation_guesses(prev: f64, before: Option<f64>, bounds: Bounds) -> Option<(f64, f64)> {
    let trend = before
        .map(|b| prev - b)
        .filter(|d| d.is_finite() && *d != 0.0);
    let step = trend.unwrap_or(1e-4 * prev.abs().max(1.0));
    let a = bounds.clamp(prev);
    for b in [
        a + step,
        a - step,
        a + 1e-4 * a.abs().max(1.0),
        a - 1e-4 * a.abs().max(1.0),
    ] {
        let b = bounds.clamp(b);
        if b != a && b.is_finite() {
            return Some((a, b));
        }
    }
    None
}

impl Problem {
    /// The one unknown's bounds in SI.
    fn bounds_si(&self) -> Bounds {
        match &self.kind {
            Kind::Template(t) => t.bounds,
            Kind::Equations(e) => match e.unknowns.as_slice() {
                [u] => e.units_bounds(&u.name, u.bounds),
                _ => Bounds::UNBOUNDED,
            },
        }
    }

    /// Solves with the known `input` at `v_si` from guesses `g` (SI): the root in SI,
    /// the status and the evaluations.
    fn solve_at(
        &self,
        input: &str,
        v_si: f64,
        g: (f64, f64),
        options: &Options,
    ) -> Result<(f64, Status, usize), InputError> {
        match &self.kind {
            Kind::Template(t) => {
                let mut req = t.req.clone();
                let var = t.t.variable(input).ok_or_else(|| {
                    InputError::new("unknown-variable", format!("no variable \"{input}\""))
                })?;
                let value = units::from_si_in(v_si, &var.unit, &var.dimension)?;
                req.values.retain(|(s, _, _)| s != input);
                req.values
                    .push((input.to_string(), value, var.unit.clone()));
                req.options = *options;
                req.guesses = Some((
                    units::from_si_in(g.0, &t.unit, &t.unknown.dimension)?,
                    units::from_si_in(g.1, &t.unit, &t.unknown.dimension)?,
                ));
                req.use_scenario_defaults = true;
                let compiled = templates::compile(&req)?;
                let outcome = compiled.solve()?;
                let s = outcome.solution();
                let root = s.unknowns.first().map_or(f64::NAN, |u| u.1);
                Ok((root, s.status, s.evaluations))
            }
            Kind::Equations(e) => {
                let name = &e.unknowns[0].name;
                let knowns: Vec<(String, f64)> = e
                    .knowns
                    .iter()
                    .map(|(n, v)| {
                        let si = if n == input {
                            v_si
                        } else {
                            e.units.to_si(n, *v)
                        };
                        (n.clone(), si)
                    })
                    .collect();
                let mut f = e.set.residual_fn(&knowns, name)?;
                let bounds = e.units_bounds(name, e.unknowns[0].bounds);
                let opts = Options { bounds, ..*options };
                let (a, b) = (bounds.clamp(g.0), bounds.clamp(g.1));
                let (a, b) = if a == b {
                    default_guesses(bounds)
                } else {
                    (a, b)
                };
                let s = crate::stepper::solve(Start::Guesses(a, b), &opts, &mut f)?;
                Ok((s.root, s.status, s.evaluations))
            }
        }
    }
}

impl Equations {
    /// An unknown's bounds in SI.
    fn units_bounds(&self, name: &str, b: Bounds) -> Bounds {
        let (lo, hi) = (self.units.to_si(name, b.lo), self.units.to_si(name, b.hi));
        Bounds {
            lo: lo.min(hi),
            hi: lo.max(hi),
        }
    }
}
