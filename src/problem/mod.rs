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
use crate::uncertainty::Distribution;
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
    /// The knowns that carry an uncertainty, in name order.
    uncertain: Vec<Uncertain>,
}

/// A known's standard uncertainty, read and checked.
#[derive(Debug, Clone, PartialEq)]
struct Uncertain {
    name: String,
    /// In the known's unit (`unit`), absolute.
    standard: f64,
    unit: Option<String>,
    /// SI per unit of the known (a difference: no offset).
    factor: f64,
    distribution: Distribution,
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
        let mut p = match (&spec.template, &spec.equations) {
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
        }?;
        p.uncertain = p.read_uncertainties(spec)?;
        Ok(p)
    }

    /// Reads `spec.uncertainties`: each names a known, with an absolute standard
    /// uncertainty in the known's unit or a percentage of its value as given.
    fn read_uncertainties(&self, spec: &ProblemSpec) -> Result<Vec<Uncertain>, InputError> {
        let Some(map) = &spec.uncertainties else {
            return Ok(Vec::new());
        };
        if map.len() > crate::equations::residual::MAX_LIVE_KNOWNS {
            return Err(InputError::new(
                "too-many-inputs",
                format!(
                    "spec.uncertainties names {} knowns; the limit is {}",
                    map.len(),
                    crate::equations::residual::MAX_LIVE_KNOWNS
                ),
            ));
        }
        let mut out = Vec::with_capacity(map.len());
        for (name, given) in map {
            short(name, "a name in spec.uncertainties")?;
            let place = format!("spec.uncertainties.{name}");
            // The known's value as given, its unit, and SI per unit.
            let (value, unit, factor) = self.known_as_given(spec, name, &place)?;
            let (standard, percent, distribution) = match given {
                spec::UncertaintyInput::Standard(u) => (Some(*u), None, None),
                spec::UncertaintyInput::Object(o) => {
                    (o.standard, o.percent, o.distribution.as_deref())
                }
            };
            let standard = match (standard, percent) {
                (Some(u), None) => {
                    if !(u.is_finite() && u >= 0.0) {
                        return Err(InputError::new(
                            "bad-uncertainty",
                            format!("{place} must be a finite number ≥ 0, got {u}"),
                        ));
                    }
                    u
                }
                (None, Some(pc)) => {
                    if !(pc.is_finite() && pc >= 0.0) {
                        return Err(InputError::new(
                            "bad-uncertainty",
                            format!("{place}.percent must be a finite number ≥ 0, got {pc}"),
                        ));
                    }
                    pc / 100.0 * value.abs()
                }
                _ => {
                    return Err(InputError::new(
                        "bad-uncertainty",
                        format!(
                        "{place}: give exactly one of standard (in the known's unit) or percent"
                    ),
                    ))
                }
            };
            let distribution = match distribution {
                None | Some("gaussian") => Distribution::Gaussian,
                Some("rectangular") => Distribution::Rectangular,
                Some(other) => {
                    return Err(InputError::new(
                        "bad-uncertainty",
                        format!("{place}.distribution must be \"gaussian\" or \"rectangular\", got \"{other}\""),
                    ))
                }
            };
            out.push(Uncertain {
                name: name.clone(),
                standard,
                unit,
                factor,
                distribution,
            });
        }
        // The knowns must be variables of the one equation: checked once here.
        let names: Vec<&str> = out.iter().map(|u| u.name.as_str()).collect();
        self.program("an uncertainty", &names)?;
        Ok(out)
    }

    /// A known's value as given, its unit and SI per unit (for an uncertainty).
    fn known_as_given(
        &self,
        spec: &ProblemSpec,
        name: &str,
        place: &str,
    ) -> Result<(f64, Option<String>, f64), InputError> {
        match &self.kind {
            Kind::Template(t) => {
                let var = t.t.variable(name).ok_or_else(|| {
                    InputError::new(
                        "unknown-variable",
                        format!("{place} names no variable of template {}", t.t.id),
                    )
                })?;
                if var.symbol == t.unknown.symbol {
                    return Err(InputError::new(
                        "bad-request",
                        format!("{place}: {name} is the unknown; uncertainties belong to knowns"),
                    ));
                }
                let (value, unit) = match spec.values.as_ref().and_then(|v| v.get(name)) {
                    Some(Known::One(q)) => (q.value(), q.unit().unwrap_or(&var.unit).to_string()),
                    Some(Known::List(_)) => {
                        return Err(InputError::new(
                            "bad-request",
                            format!(
                                "{place}: {name} is a list; give uncertainties of single values"
                            ),
                        ))
                    }
                    None => (var.value, var.unit.clone()),
                };
                let row = units::unit_in(&unit, &var.dimension)
                    .map_err(|e| InputError::new(e.code, format!("{place}: {}", e.message)))?;
                Ok((value, Some(unit), row.factor))
            }
            Kind::Equations(e) => {
                let value = e
                    .knowns
                    .iter()
                    .find(|(n, _)| n == name)
                    .map(|&(_, v)| v)
                    .ok_or_else(|| {
                        InputError::new(
                            "unknown-variable",
                            format!("{place}: {name} is not one of the knowns"),
                        )
                    })?;
                let factor = e.units.unit(name).map_or(1.0, |u| u.factor);
                Ok((value, e.unit_text.get(name).cloned(), factor))
            }
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
            output_units: spec
                .output_units
                .iter()
                .flatten()
                .map(|(s, u)| (s.clone(), u.clone()))
                .collect(),
        };
        Ok(Problem {
            kind: Kind::Template(Box::new(templates::compile(&req)?)),
            uncertain: Vec::new(),
        })
    }

    fn equations(spec: &ProblemSpec, text: &str) -> Result<Problem, InputError> {
        for (field, given) in [
            ("values", spec.values.is_some()),
            ("resultUnit", spec.result_unit.is_some()),
            ("outputUnits", spec.output_units.is_some()),
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
            uncertain: Vec::new(),
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

    /// Solves the problem. When the spec gives `uncertainties` and the solve
    /// converged, the report carries the one unknown's `uncertainty`, with every
    /// Monte Carlo trial run here (see [`Problem::uncertainty`] to run them in chunks).
    pub fn solve(&self, opts: &SolveOptions) -> Result<SolveReport, InputError> {
        let mut report = self.solve_nominal(opts)?;
        if self.uncertain.is_empty() || !report.converged {
            return Ok(report);
        }
        if let (Some(name), Some(root)) = (report.unknown.clone(), report.root_si) {
            let mut run = self.uncertainty_at(root, opts)?;
            run.advance(run.trials());
            report.uncertainty.insert(name, run.report());
        }
        Ok(report)
    }

    /// Starts the uncertainty of the one unknown from the knowns' (`spec.uncertainties`):
    /// solves with `opts`, applies the law of propagation at the root at once, and
    /// leaves the Monte Carlo trials (`opts.uncertainty.trials`) to
    /// [`UncertaintyRun::advance`], in chunks.
    pub fn uncertainty(&self, opts: &SolveOptions) -> Result<UncertaintyRun, InputError> {
        let report = self.solve_nominal(opts)?;
        match (report.converged, report.root_si) {
            (true, Some(root)) => self.uncertainty_at(root, opts),
            _ => Err(InputError::new(
                "not-converged",
                format!(
                    "the uncertainty is taken at the answer, and the solve did not converge \
                     ({}): {}",
                    report.status, report.message
                ),
            )),
        }
    }

    fn uncertainty_at(
        &self,
        root_si: f64,
        opts: &SolveOptions,
    ) -> Result<UncertaintyRun, InputError> {
        use crate::uncertainty::{linear, MonteCarloRun, ResidualModel, UncertainInput};
        if self.uncertain.is_empty() {
            return Err(InputError::new(
                "no-uncertainties",
                "spec.uncertainties gives no known an uncertainty",
            ));
        }
        let options =
            spec::UncertaintyOptionsInput::read(opts.uncertainty.as_ref(), "options.uncertainty")?;
        let names: Vec<&str> = self.uncertain.iter().map(|u| u.name.as_str()).collect();
        let (residual, conversion) = self.program("an uncertainty", &names)?;
        let inputs: Vec<UncertainInput> = self
            .uncertain
            .iter()
            .zip(residual.knowns())
            .map(|(u, &value)| UncertainInput {
                value,
                standard: u.standard * u.factor,
                distribution: u.distribution,
            })
            .collect();
        let mut model = ResidualModel::new(residual, self.bounds_si());
        let linear = linear(&mut model, &inputs, root_si, options.coverage_factor)?;
        let run = MonteCarloRun::new(model, &inputs, root_si, &options)?;
        Ok(UncertaintyRun {
            run,
            linear,
            seed: options.seed,
            digits: options.significant_digits,
            conversion,
            unit: self.unit(),
            uncertain: self.uncertain.clone(),
        })
    }

    fn solve_nominal(&self, opts: &SolveOptions) -> Result<SolveReport, InputError> {
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
    ///
    /// With `opts.proven`, the roots are proven instead ([`Problem::proven_roots`]).
    pub fn roots(&self, lo: f64, hi: f64, opts: &RootsOptions) -> Result<RootsReport, InputError> {
        check_range(lo, hi)?;
        if opts.proven {
            return self.proven_roots(lo, hi, opts);
        }
        if opts.max_regions.is_some() {
            return Err(InputError::new(
                "bad-request",
                "options.maxRegions belongs to a proven scan: add proven: true",
            ));
        }
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
        Ok(RootsReport::from_scan(
            &found,
            &c,
            labels,
            self.unit(),
            (lo, hi),
        ))
    }

    /// The residual of the one equation as a compiled program of the one unknown in
    /// SI, the knowns in SI, those named in `live` kept variable; and the unknown's
    /// conversion. Refused for several unknowns or equations, and for templates that
    /// solve auxiliary equations.
    fn program(
        &self,
        what: &str,
        live: &[&str],
    ) -> Result<(crate::equations::Residual, Conversion), InputError> {
        let c = self.conversion()?;
        match &self.kind {
            Kind::Template(t) => Ok((t.program(live)?, c)),
            Kind::Equations(e) => {
                let name = self.one_unknown(what)?;
                let knowns: Vec<(String, f64)> = e
                    .knowns
                    .iter()
                    .map(|(n, v)| (n.clone(), e.units.to_si(n, *v)))
                    .collect();
                Ok((e.set.residual(&knowns, name, live)?, c))
            }
        }
    }

    /// Every root from `lo` to `hi` (the unknown's unit), proven: regions covering the
    /// range, each holding exactly one root (proven, with its enclosure), none
    /// (proven), or undecided with the reason (see [`crate::proven_roots`]). Nothing
    /// undecided is reported as a root. The range is converted to SI and widened by
    /// one unit in the last place at each end, so that rounding in the conversion
    /// loses no part of it; region ends come back in the unit (the first and last
    /// exactly `lo` and `hi`), and each enclosure is widened outward by one unit in
    /// the last place after its conversion so that it still holds its root.
    pub fn proven_roots(
        &self,
        lo: f64,
        hi: f64,
        opts: &RootsOptions,
    ) -> Result<RootsReport, InputError> {
        use crate::proven_roots::{proven_roots, ProofOptions, RegionKind, MAX_REGIONS};
        check_range(lo, hi)?;
        if opts.samples.is_some() {
            return Err(InputError::new(
                "bad-request",
                "options.samples belongs to the sampling scan; a proven scan takes maxRegions",
            ));
        }
        let mut proof = ProofOptions::default();
        if let Some(n) = opts.max_regions {
            if !(n.fract() == 0.0 && (1.0..=MAX_REGIONS as f64).contains(&n)) {
                return Err(InputError::new(
                    "bad-budget",
                    format!(
                        "options.maxRegions must be a whole number from 1 to {MAX_REGIONS}, got {n}"
                    ),
                ));
            }
            proof.max_regions = n as usize;
        }
        if let Some(t) = &opts.tolerances {
            let tol = spec::TolerancesInput::read(Some(t), "options.tolerances")?;
            if t.x_rel.is_some() {
                proof.x_rel = tol.x_rel;
            }
            if t.x_abs.is_some() {
                proof.x_abs = tol.x_abs;
            }
        }
        let (mut f, c) = self.program("proven roots", &[])?;
        let (a, b) = (c.to_si(lo), c.to_si(hi));
        let (a, b) = (a.min(b).next_down(), a.max(b).next_up());
        if !(a.is_finite() && b.is_finite()) {
            return Err(InputError::new(
                "bad-range",
                format!("the range [{lo}, {hi}] is too large once in SI units"),
            ));
        }
        let found = proven_roots(a, b, &proof, &mut f)?;
        let clamp = |x: f64| c.from_si(x).clamp(lo, hi);
        let unique: Vec<f64> = found.roots().filter_map(|g| g.root).collect();
        let labels = match &self.kind {
            Kind::Template(t) => t.label_roots(&unique),
            Kind::Equations(_) => vec![None; unique.len()],
        };
        let mut labels = labels.into_iter();
        let n = found.regions.len();
        let mut regions = Vec::with_capacity(n);
        let mut roots = Vec::new();
        for (i, g) in found.regions.iter().enumerate() {
            let enclosure = g.enclosure.map(|e| {
                let (p, q) = (c.from_si(e.lo), c.from_si(e.hi));
                [p.min(q).next_down(), p.max(q).next_up()]
            });
            let label = if g.kind == RegionKind::Unique {
                labels.next().flatten()
            } else {
                None
            };
            let root = g.root.map(|x| c.from_si(x));
            let region = report::RegionReport {
                kind: g.kind.code(),
                lo: if i == 0 { lo } else { clamp(g.lo) },
                hi: if i + 1 == n { hi } else { clamp(g.hi) },
                root,
                enclosure,
                residual: g.residual,
                label: label.clone(),
                why: g.why.map(|w| w.code()),
                explanation: g.why.map(|w| w.explain()),
            };
            if let (Some(x), Some([p, q])) = (root, enclosure) {
                let fx = g.residual.unwrap_or(f64::NAN);
                roots.push(RangeRootReport {
                    x,
                    fx,
                    kind: "proven",
                    converged: true,
                    certificate: Some(CertificateReport::proof(fx, [p, q])),
                    label,
                });
            }
            regions.push(region);
        }
        let undecided = found
            .regions
            .iter()
            .filter(|g| g.kind == RegionKind::Undecided)
            .count();
        Ok(RootsReport {
            unit: self.unit(),
            roots,
            discontinuities: Vec::new(),
            evaluations: found.evaluations(),
            samples: 0,
            spacing: 0.0,
            limits: if undecided == 0 {
                "every root in the range is proven: each unique region holds exactly one, \
                 every other region none"
                    .to_string()
            } else {
                format!(
                    "{undecided} region{} undecided (see why): a root there is neither \
                     proven nor excluded; the unique roots are proven",
                    if undecided == 1 { " is" } else { "s are" }
                )
            },
            proven: true,
            regions,
            proof: Some(report::ProofCostReport {
                regions_examined: found.regions_examined,
                narrowing_slopes: found.narrowing_slopes,
                point_enclosures: found.point_enclosures,
                point_values: found.point_values,
            }),
        })
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
        sensitivity_runs: s.sensitivity_runs,
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
    /// What is made once for every point ([`Sweep::advance`]).
    fast: Fast,
    /// The unknown's conversion and bounds in SI.
    conversion: Conversion,
    bounds: Bounds,
}

/// The part of a point's solve made once per sweep: the residual compiled with the
/// swept known kept variable. Each point then gives the same root, status and
/// evaluations as [`Problem::solve_at`], which rebuilds everything (and which a point
/// still takes where the shortcut does not apply).
enum Fast {
    None,
    /// A template: its compiled request solved again at each value.
    Template(Box<templates::PointSolver>),
    /// An equation set: the residual of its one unknown in SI, the swept known live,
    /// and the unknown's bounds in SI.
    Equations(Box<crate::equations::Residual>, Bounds),
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
        let fast = match &problem.kind {
            Kind::Template(t) => t
                .point_solver(&spec.input)
                .map_or(Fast::None, |p| Fast::Template(Box::new(p))),
            Kind::Equations(e) => {
                // As `solve_at` builds it: every known in SI, the swept one live.
                let knowns: Vec<(String, f64)> = e
                    .knowns
                    .iter()
                    .map(|(n, v)| (n.clone(), e.units.to_si(n, *v)))
                    .collect();
                let u = &e.unknowns[0];
                match e.set.residual(&knowns, &u.name, &[spec.input.as_str()]) {
                    Ok(r) => Fast::Equations(Box::new(r), e.units_bounds(&u.name, u.bounds)),
                    Err(_) => Fast::None,
                }
            }
        };
        let bounds = problem.bounds_si();
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
            fast,
            conversion: c,
            bounds,
        })
    }

    pub fn is_done(&self) -> bool {
        self.report.done >= self.values.len()
    }

    /// Solves up to `chunk` more points; the report so far.
    pub fn advance(&mut self, chunk: usize) -> Result<&SweepReport, InputError> {
        let c = self.conversion;
        let end = (self.report.done + chunk.max(1)).min(self.values.len());
        let bounds = self.bounds;
        for i in self.report.done..end {
            let v = self.values[i];
            let v_si = self.input_conv.to_si(v);
            let (a, b) = match self.prev {
                Some(p) => continuation_guesses(p, self.before, bounds).unwrap_or(self.first),
                None => self.first,
            };
            let quick = match &mut self.fast {
                Fast::None => None,
                Fast::Template(p) => {
                    // As solve_at hands them to the template: the value through the
                    // input's unit, the guesses through the result unit.
                    let ic = self.input_conv;
                    let si = ic.to_si(ic.from_si(v_si));
                    p.solve(
                        si,
                        (c.to_si(c.from_si(a)), c.to_si(c.from_si(b))),
                        &self.options,
                    )
                }
                Fast::Equations(r, bounds) => {
                    r.set_knowns(&[v_si]);
                    Some(solve_equation_at(
                        |x| r.value(x),
                        *bounds,
                        (a, b),
                        &self.options,
                    )?)
                }
            };
            let (root, status, evals) = match quick {
                Some(found) => found,
                None => self
                    .problem
                    .solve_at(&self.input, v_si, (a, b), &self.options)?,
            };
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

/// The uncertainty of a problem's one unknown in progress: the law of propagation
/// done, the Monte Carlo trials run in chunks with [`UncertaintyRun::advance`] so that
/// a page can show progress and cancel (as [`Sweep`]). Its work is bounded by
/// `uncertainty::MAX_TRIALS` trials; the values kept for the coverage interval take
/// 8 bytes a trial.
pub struct UncertaintyRun {
    run: crate::uncertainty::MonteCarloRun<crate::uncertainty::ResidualModel>,
    /// In SI.
    linear: crate::uncertainty::LinearPropagation,
    seed: u64,
    digits: u32,
    conversion: Conversion,
    unit: Option<String>,
    uncertain: Vec<Uncertain>,
}

impl UncertaintyRun {
    /// Runs up to `chunk` more trials (at least one while any are left); the trials
    /// done so far.
    pub fn advance(&mut self, chunk: usize) -> usize {
        self.run.advance(chunk)
    }

    pub fn done(&self) -> usize {
        self.run.done()
    }

    /// The trials asked for.
    pub fn trials(&self) -> usize {
        self.run.trials()
    }

    pub fn is_done(&self) -> bool {
        self.run.is_done()
    }

    /// The result in the unknown's unit: the law of propagation at once; the Monte
    /// Carlo result and the JCGM 101 §8 validation once every trial is done.
    pub fn report(&self) -> report::UncertaintyReport {
        use crate::uncertainty::{validate, LinearPropagation, MonteCarlo};
        let c = &self.conversion;
        let l = &self.linear;
        let linear = LinearPropagation {
            value: c.from_si(l.value),
            sensitivities: l
                .sensitivities
                .iter()
                .zip(&self.uncertain)
                .map(|(s, u)| s * u.factor / c.factor)
                .collect(),
            contributions: l
                .contributions
                .iter()
                .map(|v| c.delta_from_si(*v))
                .collect(),
            standard: c.delta_from_si(l.standard),
            coverage_factor: l.coverage_factor,
            expanded: c.delta_from_si(l.expanded),
        };
        let mc = (self.run.trials() > 0 && self.run.is_done()).then(|| {
            let m = self.run.finish();
            MonteCarlo {
                mean: c.from_si(m.mean),
                standard: c.delta_from_si(m.standard),
                interval: (c.from_si(m.interval.0), c.from_si(m.interval.1)),
                histogram: crate::uncertainty::Histogram {
                    lo: c.from_si(m.histogram.lo),
                    hi: c.from_si(m.histogram.hi),
                    ..m.histogram.clone()
                },
                ..m
            }
        });
        let validation = mc.as_ref().and_then(|m| validate(&linear, m, self.digits));
        report::UncertaintyReport {
            unit: self.unit.clone(),
            value: linear.value,
            standard: linear.standard,
            expanded: linear.expanded,
            coverage_factor: linear.coverage_factor,
            contributions: self
                .uncertain
                .iter()
                .zip(linear.sensitivities.iter().zip(&linear.contributions))
                .map(
                    |(u, (&sensitivity, &contribution))| report::ContributionReport {
                        input: u.name.clone(),
                        standard: u.standard,
                        input_unit: u.unit.clone(),
                        distribution: match u.distribution {
                            Distribution::Gaussian => "gaussian",
                            Distribution::Rectangular => "rectangular",
                        },
                        sensitivity,
                        contribution,
                    },
                )
                .collect(),
            monte_carlo: mc.as_ref().map(|m| report::MonteCarloReport {
                trials: m.trials,
                failed: m.failed,
                interval: [m.interval.0, m.interval.1],
                mean: m.mean,
                standard: m.standard,
                seed: self.seed,
                evaluations: m.evaluations,
                histogram: report::HistogramReport {
                    lo: m.histogram.lo,
                    hi: m.histogram.hi,
                    counts: m.histogram.counts.clone(),
                    below: m.histogram.below,
                    above: m.histogram.above,
                },
            }),
            validation: validation.map(|v| report::ValidationReport {
                agrees: v.agrees,
                tolerance: v.tolerance,
                gum_interval: [v.gum_interval.0, v.gum_interval.1],
                d_low: v.d_low,
                d_high: v.d_high,
                message: v.message,
            }),
        }
    }
}

/// Two starting points for the next solve of a sweep: the previous root and a step
/// along the trend of the last two roots (or a small relative step), kept in bounds.
/// All in SI: `prev` and `before` are the last two converged roots; `None` when no
/// second point fits in `bounds` (the sweep then starts from its first guesses).
pub fn continuation_guesses(prev: f64, before: Option<f64>, bounds: Bounds) -> Option<(f64, f64)> {
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
                solve_equation_at(&mut f, bounds, g, options)
            }
        }
    }
}

/// A sweep point of an equation set: `f` in SI from guesses `g` (SI) clamped into
/// `bounds` (the bounds' default guesses where they clamp to one point).
fn solve_equation_at(
    mut f: impl FnMut(f64) -> f64,
    bounds: Bounds,
    g: (f64, f64),
    options: &Options,
) -> Result<(f64, Status, usize), InputError> {
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
