//! The bundled design-equation templates: a catalogue of data, and the solve that
//! reads it.
//!
//! The catalogue is one JSON file, `catalogue.json` beside this file, embedded with
//! `include_str!` and parsed once. The same data feeds the page (through
//! `serde_json::to_string(templates::all())`), the API and the tests. Each
//! [`Template`] carries its equations in our language, its variables with dimensions,
//! units, demo-scenario defaults, physical bounds and typical guesses, the variables
//! it may be solved for, validity notes, a caution where the result is safety-related,
//! and the published source of the equation.
//!
//! [`solve_template`] converts the inputs to SI, refuses knowns outside the template's
//! conditions of validity, starts from the template's explicit approximation of the
//! unknown where it has one (Serghides for Colebrook–White, Hunt for wave dispersion;
//! see [`Starter`]), solves with [`crate::equations::solve_set`], converts the answer to
//! the unit asked for, and adds:
//! - for templates with several roots (both Mach numbers of an area ratio, the
//!   liquid-like and vapour-like volumes of a cubic equation of state, the two depths of
//!   a pipe flowing nearly full), every root in the template's range, each with its
//!   branch label; the answer is the branch asked for, else the template's default
//!   branch (`roots.rs`);
//! - after a failed solve, a scan of the unknown's range and a second solve from the
//!   root it finds, or a note that no value in the range satisfies the equation;
//! - the starting approximation and the explicit approximations a template compares
//!   with (Swamee–Jain, Haaland), with their differences from the answer;
//! - the warnings whose conditions hold (Colebrook below Re 4000, and so on);
//! - the values of the template's intermediate outputs, in their display units.
//!
//! ```
//! use tacit::templates::{solve_template, TemplateRequest};
//! let mut req = TemplateRequest::new("pipes.colebrook", "f");
//! req.values = vec![("Re".into(), 1e5, "1".into()), ("eps".into(), 1e-4, "m".into()),
//!                   ("D".into(), 1.0, "m".into())];
//! let s = solve_template(&req).unwrap();
//! assert!((s.value - 0.018513866077471648).abs() < 1e-12);
//! ```

use std::sync::OnceLock;

use serde::{Deserialize, Serialize};

use crate::equations::{solve_set, EquationSet, Expression, SetSolution, UnknownSpec};
use crate::error::InputError;
use crate::methods::Options;
use crate::outcome::Status;
use crate::tolerances::Bounds;
use crate::units;

pub mod own;
mod roots;

/// The standard caution shown with safety-related results.
pub const CAUTION: &str =
    "Results support, and do not replace, checks by a licensed professional under local codes.";

const CATALOGUE_TEXT: &str = include_str!(concat!(env!("OUT_DIR"), "/catalogue.json"));

/// One bundled template.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Template {
    /// Stable identifier, used in bookmarks: never renamed.
    pub id: String,
    pub title: String,
    pub field: String,
    pub description: String,
    /// The equations in our language, in SI units.
    pub equations: String,
    pub variables: Vec<Variable>,
    /// Quantities solved together with every unknown (a friction factor, an eigenvalue).
    #[serde(default)]
    pub auxiliary: Vec<Auxiliary>,
    /// Definitions of the equations worth showing, with their display units.
    #[serde(default)]
    pub outputs: Vec<Output>,
    /// The variables that may be the unknown (all, unless `unknowns_reason` says why not).
    #[serde(default)]
    pub unknowns: Vec<String>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub unknowns_reason: Option<String>,
    /// Explicit approximations shown beside the implicit answer.
    #[serde(default)]
    pub comparisons: Vec<Comparison>,
    /// Conditions checked after the solve.
    #[serde(default)]
    pub warnings: Vec<Warning>,
    /// Where the equation applies.
    pub validity: Vec<String>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub caution: Option<String>,
    /// The published source of the equation.
    pub source: String,
    /// A list input (cash flows), written `{symbol}` in the equations.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub list: Option<ListInput>,
    /// Conditions on the knowns outside which the equation does not apply; a request
    /// that breaks one is refused (checked only when every name in it is known).
    #[serde(default, skip_serializing_if = "Vec::is_empty")]
    pub requires: Vec<Requirement>,
}

/// A variable of a template. Values, bounds and guesses are in `unit`.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Variable {
    pub symbol: String,
    pub meaning: String,
    pub dimension: String,
    /// The default unit.
    pub unit: String,
    /// The accepted units (all units of the dimension when not restricted).
    #[serde(default)]
    pub units: Vec<String>,
    /// The default value, from the demo scenario.
    pub value: f64,
    /// Physical bounds, in `unit`.
    pub bounds: [f64; 2],
    /// Typical starting guesses, in `unit`.
    pub guesses: [f64; 2],
    /// Common values offered as choices (deflection limits, mode numbers).
    #[serde(default, skip_serializing_if = "Vec::is_empty")]
    pub choices: Vec<Choice>,
    /// Tighter limits when this is the unknown, as expressions in SI of the knowns
    /// (the Euler load for a column's load).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub limits: Option<[String; 2]>,
    /// When this is the unknown, scan this range for every root.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub roots: Option<RootScan>,
    /// When this is the unknown, an explicit approximation to start from.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub starter: Option<Starter>,
}

/// An explicit approximation of a variable from the knowns, used as the first guess
/// when the variable is the unknown (the second guess is taken 1e-6 of it away) and
/// shown beside the answer. `expr` is in SI over the other variables; a value that is
/// not a number or lies outside the range falls back to the typical guesses.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Starter {
    /// How the approximation is shown ("Serghides (1984) explicit").
    pub label: String,
    pub expr: String,
    /// Where the approximation is published, or how it follows from the equation.
    pub source: String,
}

/// A condition on the knowns: `holds` (an expression in SI) must not be negative.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Requirement {
    pub holds: String,
    /// Why, in plain words: the text of the refusal.
    pub text: String,
}

/// A labelled common value of a variable.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Choice {
    pub label: String,
    pub value: f64,
}

/// A quantity solved with every unknown. Bounds and guesses are in SI.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Auxiliary {
    pub symbol: String,
    pub meaning: String,
    pub dimension: String,
    pub unit: String,
    /// The auxiliary's own equation: one line of `equations`, using no definitions.
    /// Solved alone inside the nested solve (see [`solve_template`]).
    pub equation: String,
    pub bounds: [f64; 2],
    pub guesses: [f64; 2],
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub limits: Option<[String; 2]>,
}

/// A definition shown with the result.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Output {
    pub symbol: String,
    pub meaning: String,
    pub dimension: String,
    pub unit: String,
}

/// An explicit formula (in SI, over every variable, auxiliary and definition) shown
/// beside the value of `against`, with the difference.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Comparison {
    /// The name under which the approximate value is listed in the outputs.
    pub symbol: String,
    pub label: String,
    pub expr: String,
    pub against: String,
}

/// `text` is added to the notes when `when` (an expression in SI) is above zero.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Warning {
    pub when: String,
    pub text: String,
}

/// A scan for every root of the template's one equation in its unknown, over
/// `[lo, hi]` (expressions in SI of the knowns, kept within the unknown's range),
/// evenly spaced or in log spacing, with `samples` points on each side of `split` when
/// it is given (a point the roots lie either side of, such as Mach 1).
/// Roots are labelled by `threshold` (`below`/`above`) or by order
/// (`smallest`/`middle`/`largest`, or `single` when there is one); `several` is a note
/// added when more than one root is found. The labels name the branches: `default` is
/// the one returned unless a request asks for another, for the reason `default_reason`.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RootScan {
    pub lo: String,
    pub hi: String,
    pub samples: usize,
    pub log: bool,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub threshold: Option<f64>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub below: Option<String>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub above: Option<String>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub smallest: Option<String>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub middle: Option<String>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub largest: Option<String>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub single: Option<String>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub several: Option<String>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub split: Option<String>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub default: Option<String>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub default_reason: Option<String>,
}

/// A list input: entries `symbol` of a request, in order, replace the defaults.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct ListInput {
    pub symbol: String,
    pub meaning: String,
    pub dimension: String,
    pub unit: String,
    pub values: Vec<f64>,
}

impl Template {
    pub fn variable(&self, symbol: &str) -> Option<&Variable> {
        self.variables.iter().find(|v| v.symbol == symbol)
    }

    /// The symbols declared as variables (so that a variable `e` is not the constant):
    /// the variables and the auxiliary quantities.
    pub fn declared_symbols(&self) -> Vec<&str> {
        self.variables
            .iter()
            .map(|v| v.symbol.as_str())
            .chain(self.auxiliary.iter().map(|a| a.symbol.as_str()))
            .collect()
    }

    /// Whether `symbol` may be the unknown.
    pub fn may_solve_for(&self, symbol: &str) -> bool {
        self.unknowns.iter().any(|u| u == symbol)
    }
}

impl Variable {
    /// The default value in SI.
    pub fn default_si(&self) -> Result<f64, InputError> {
        units::to_si_in(self.value, &self.unit, &self.dimension)
    }

    /// The physical bounds in SI.
    pub fn bounds_si(&self) -> Result<Bounds, InputError> {
        let lo = units::to_si_in(self.bounds[0], &self.unit, &self.dimension)?;
        let hi = units::to_si_in(self.bounds[1], &self.unit, &self.dimension)?;
        Bounds::new(lo.min(hi), lo.max(hi))
    }
}

static CATALOGUE: OnceLock<Result<Vec<Template>, String>> = OnceLock::new();

fn load() -> Result<Vec<Template>, String> {
    let mut list: Vec<Template> =
        serde_json::from_str(CATALOGUE_TEXT).map_err(|e| format!("catalogue.json: {e}"))?;
    for t in &mut list {
        if t.unknowns.is_empty() {
            t.unknowns = t.variables.iter().map(|v| v.symbol.clone()).collect();
        }
        for v in &mut t.variables {
            if v.units.is_empty() {
                v.units = units::units_of(&v.dimension)
                    .into_iter()
                    .map(String::from)
                    .collect();
            }
        }
    }
    Ok(list)
}

/// Every template, parsed once. Empty only if the embedded catalogue does not parse,
/// which [`catalogue_error`] reports (and the tests check never happens).
pub fn all() -> &'static [Template] {
    match CATALOGUE.get_or_init(load) {
        Ok(list) => list,
        Err(_) => &[],
    }
}

/// Why the embedded catalogue could not be read, if it could not.
pub fn catalogue_error() -> Option<&'static str> {
    CATALOGUE
        .get_or_init(load)
        .as_ref()
        .err()
        .map(String::as_str)
}

/// The template with this id.
pub fn find(id: &str) -> Option<&'static Template> {
    all().iter().find(|t| t.id == id)
}

/// A request to solve a template.
#[derive(Debug, Clone, PartialEq)]
pub struct TemplateRequest {
    pub id: String,
    /// (symbol, value, unit). Variables not given take their defaults; entries for the
    /// list symbol, in order, replace the default list.
    pub values: Vec<(String, f64, String)>,
    pub unknown: String,
    /// The unit of the answer; the variable's default unit when `None`.
    pub result_unit: Option<String>,
    /// Two starting guesses in the result unit; the template's starter or typical
    /// guesses when `None`.
    pub guesses: Option<(f64, f64)>,
    pub options: Options,
    pub sensitivities: bool,
    /// The branch wanted, by its label (`subsonic`, `liquid-like`); the template's
    /// default branch when `None`.
    pub branch: Option<String>,
    /// Take the demo scenario's value for every known not given (off: a missing known
    /// is an error naming it).
    pub use_scenario_defaults: bool,
    /// (symbol, unit): the unit to show an auxiliary quantity or output in, instead of
    /// its display unit (checked at compile: a symbol the template shows, a unit of its
    /// dimension).
    pub output_units: Vec<(String, String)>,
}

impl TemplateRequest {
    /// A request with every value at the demo scenario's default.
    pub fn new(id: &str, unknown: &str) -> TemplateRequest {
        TemplateRequest {
            id: id.to_string(),
            values: Vec::new(),
            unknown: unknown.to_string(),
            result_unit: None,
            guesses: None,
            options: Options::default(),
            sensitivities: false,
            branch: None,
            use_scenario_defaults: true,
            output_units: Vec::new(),
        }
    }
}

/// A value shown with the result, in its display unit.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct OutputValue {
    pub symbol: String,
    pub meaning: String,
    pub value: f64,
    pub unit: String,
}

/// Another root of the equation, in the unit of the answer.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct OtherRoot {
    pub value: f64,
    pub label: Option<String>,
}

/// The answer to a [`TemplateRequest`].
#[derive(Debug, Clone, PartialEq)]
pub struct TemplateSolution {
    /// The solve, in SI.
    pub solution: SetSolution,
    /// The unknown in `unit`.
    pub value: f64,
    pub unit: String,
    /// The branch label of the answer, for templates that label their roots.
    pub branch: Option<String>,
    /// Other roots of multi-root templates, in `unit`, sorted, with their labels.
    pub other_roots: Vec<OtherRoot>,
    /// Evaluations spent scanning for roots (for other branches, or after a failed
    /// solve), beyond those of `solution`.
    pub scan_evaluations: usize,
    /// Root labels, comparisons with explicit approximations, warnings that hold.
    pub notes: Vec<String>,
    pub caution: Option<String>,
    /// Auxiliary quantities and outputs at the solution, in their display units.
    pub outputs: Vec<OutputValue>,
}

/// Six significant figures, for notes.
pub fn sig(x: f64) -> String {
    let rounded: f64 = format!("{x:.5e}").parse().unwrap_or(x);
    if rounded == 0.0 || (1e-4..1e9).contains(&rounded.abs()) || !rounded.is_finite() {
        format!("{rounded}")
    } else {
        format!("{rounded:e}")
    }
}

/// A value for notes, with its unit unless it is a pure number.
fn with_unit(x: f64, unit: &str) -> String {
    if unit == "1" {
        sig(x)
    } else {
        format!("{} {unit}", sig(x))
    }
}

/// Evaluates an expression of the catalogue over named SI values.
fn eval(text: &str, names: &[&str], values: &[f64], place: &str) -> Result<f64, InputError> {
    let expr = Expression::parse(text).map_err(|e| {
        InputError::new(
            "catalogue-expression",
            format!("{place}: cannot read `{text}`: {}", e.message),
        )
    })?;
    let program = expr.compile(names).map_err(|e| {
        InputError::new(
            "catalogue-expression",
            format!("{place}: `{text}`: {}", e.message),
        )
    })?;
    Ok(program.eval(values))
}

/// The equation text with the list placeholder expanded, and the list's knowns.
fn expand_list(t: &Template, given: &[f64]) -> (String, Vec<(String, f64)>) {
    let Some(list) = &t.list else {
        return (t.equations.clone(), Vec::new());
    };
    let names: Vec<String> = (0..given.len())
        .map(|k| format!("{}{k}", list.symbol))
        .collect();
    let text = t
        .equations
        .replace(&format!("{{{}}}", list.symbol), &names.join(", "));
    (text, names.into_iter().zip(given.iter().copied()).collect())
}

/// The dimension check of a template's equations (`set`, its text with the list
/// expanded), with the dimension of every variable, auxiliary quantity, output and list
/// entry. Statements whose numbers carry units that are not written are labelled `SI:`
/// in the catalogue, as in an engineer's own equations.
pub fn check_dimensions(
    t: &Template,
    set: &EquationSet,
) -> Result<crate::equations::dimensions::DefinitionDimensions, InputError> {
    let mut dims = std::collections::HashMap::new();
    let mut named: Vec<(String, &str)> = Vec::new();
    named.extend(
        t.variables
            .iter()
            .map(|v| (v.symbol.clone(), v.dimension.as_str())),
    );
    named.extend(
        t.auxiliary
            .iter()
            .map(|a| (a.symbol.clone(), a.dimension.as_str())),
    );
    named.extend(
        t.outputs
            .iter()
            .map(|o| (o.symbol.clone(), o.dimension.as_str())),
    );
    if let Some(l) = &t.list {
        named.extend(
            (0..l.values.len()).map(|k| (format!("{}{k}", l.symbol), l.dimension.as_str())),
        );
    }
    for (symbol, dimension) in named {
        let d = crate::dimension::Dimension::named(dimension).ok_or_else(|| {
            InputError::new(
                "unknown-dimension",
                format!("{symbol}: dimension \"{dimension}\" has no exponents"),
            )
        })?;
        dims.insert(symbol, d);
    }
    crate::equations::dimensions::check(set, &dims, &t.declared_symbols())
}

/// The bounds of an unknown: its physical bounds within its limits, if any.
fn limited(
    bounds: Bounds,
    limits: &Option<[String; 2]>,
    names: &[&str],
    values: &[f64],
    place: &str,
) -> Result<Bounds, InputError> {
    let Some([lo, hi]) = limits else {
        return Ok(bounds);
    };
    let l = eval(lo, names, values, place)?;
    let h = eval(hi, names, values, place)?;
    if l.is_nan() || h.is_nan() {
        // A square root of a negative number or 0/0 in a limit: the knowns admit no
        // solution (a static lift above the pump's shut-off head, say).
        let (which, text) = if l.is_nan() {
            ("lower", lo)
        } else {
            ("upper", hi)
        };
        return Err(InputError::new(
            "no-solution-range",
            format!(
                "{place}: with the given values the {which} limit `{text}` is not a number, \
                 so no solution exists; check the inputs"
            ),
        ));
    }
    let lo = if l.is_finite() {
        bounds.lo.max(l)
    } else {
        bounds.lo
    };
    let hi = if h.is_finite() {
        bounds.hi.min(h)
    } else {
        bounds.hi
    };
    if lo >= hi || lo.is_nan() || hi.is_nan() {
        return Err(InputError::new(
            "no-solution-range",
            format!(
                "{place}: with the given values the admissible range is empty (from {} to {}); \
                 check the inputs",
                sig(l),
                sig(h)
            ),
        ));
    }
    Ok(Bounds { lo, hi })
}

/// Guesses inside `bounds`: the given ones if they lie inside, else points 2 % in
/// from each end.
fn guesses_within(g: (f64, f64), b: Bounds) -> (f64, f64) {
    if b.contains(g.0) && b.contains(g.1) && g.0 != g.1 {
        return g;
    }
    let w = b.hi - b.lo;
    (b.lo + 0.02 * w, b.hi - 0.02 * w)
}

/// Solves a template for one of its variables. See the module documentation.
pub fn solve_template(req: &TemplateRequest) -> Result<TemplateSolution, InputError> {
    let compiled = compile(req)?;
    let settled = compiled.solve()?;
    compiled.report(settled)
}

/// A template request checked and made ready to solve: the template and its unknown,
/// every known in SI, the equations with the list expanded, the unknown's bounds and
/// start in SI. Compiled once, it can be solved, evaluated and scanned many times.
#[derive(Clone)]
pub struct Compiled {
    pub t: &'static Template,
    pub unknown: &'static Variable,
    pub req: TemplateRequest,
    /// The unit of the answer.
    pub unit: String,
    text: String,
    set: EquationSet,
    /// Every known, in SI (list entries included).
    knowns: Vec<(String, f64)>,
    /// The knowns the equations use.
    set_knowns: Vec<(String, f64)>,
    /// The unknown's bounds in SI (its limits applied).
    pub bounds: Bounds,
    specs: Vec<UnknownSpec>,
    start: StartingPoint,
    /// Notes made while compiling (values outside the template's range, the unknown's
    /// own value used as a guess).
    notes: Vec<String>,
}

/// Checks a request and compiles it ([`Compiled`]). Every variable other than the
/// unknown needs a value, unless `use_scenario_defaults` asks for the demo scenario's
/// defaults; every missing one is named. A value given for the unknown itself is its
/// first guess (said in the notes) unless guesses are given.
pub fn compile(req: &TemplateRequest) -> Result<Compiled, InputError> {
    if let Some(err) = catalogue_error() {
        return Err(InputError::new("catalogue", err.to_string()));
    }
    let t = find(&req.id).ok_or_else(|| {
        InputError::new(
            "unknown-template",
            format!("no template has the id \"{}\"", req.id),
        )
    })?;
    let unknown = the_unknown(t, &req.unknown)?;
    for (symbol, u) in &req.output_units {
        let place = format!("spec.outputUnits.{symbol}");
        let dimension = t
            .auxiliary
            .iter()
            .map(|a| (&a.symbol, &a.dimension))
            .chain(t.outputs.iter().map(|o| (&o.symbol, &o.dimension)))
            .find(|(s, _)| *s == symbol)
            .map(|(_, d)| d)
            .ok_or_else(|| {
                InputError::new(
                    "unknown-variable",
                    format!(
                        "{place}: template {} shows no quantity \"{symbol}\" with its result",
                        t.id
                    ),
                )
            })?;
        units::from_si_in(1.0, u, dimension)
            .map_err(|e| InputError::new(e.code, format!("{place}: {}", e.message)))?;
    }
    let unit = req
        .result_unit
        .clone()
        .unwrap_or_else(|| unknown.unit.clone());
    units::unit_in(&unit, &unknown.dimension)?;
    let given = read_knowns(t, unknown, req)?;
    let (text, list_knowns) = expand_list(t, &given.list);
    let mut knowns = given.knowns;
    knowns.extend(list_knowns);
    let set = EquationSet::parse_declaring(&text, &t.declared_symbols())?;
    let used = set.variables();
    let names: Vec<&str> = knowns.iter().map(|(s, _)| s.as_str()).collect();
    let values: Vec<f64> = knowns.iter().map(|(_, v)| *v).collect();
    let place = format!("limits of {} in template {}", unknown.symbol, t.id);
    let bounds = limited(
        unknown.bounds_si()?,
        &unknown.limits,
        &names,
        &values,
        &place,
    )?;
    check_requirements(t, &unknown.symbol, &names, &values)?;
    let mut request = req.clone();
    let mut notes = given.notes;
    if let (None, Some(own)) = (req.guesses, given.own_value) {
        let own_si = units::to_si_in(own.0, &own.1, &unknown.dimension)?;
        if bounds.contains(own_si) {
            let g = units::from_si_in(own_si, &unit, &unknown.dimension)?;
            let step = STARTER_STEP * g.abs().max(1e-300);
            request.guesses = Some((g, g + step));
            notes.push(format!(
                "The value given for {} ({}) was used as the first guess.",
                unknown.symbol,
                with_unit(own.0, &own.1)
            ));
        }
    }
    let start = starting_point(t, unknown, &request, &unit, bounds, &names, &values)?;
    let mut specs = vec![UnknownSpec {
        name: unknown.symbol.clone(),
        guesses: Some(start.guesses),
        bounds,
    }];
    for aux in &t.auxiliary {
        let place = format!("limits of {} in template {}", aux.symbol, t.id);
        let b = limited(
            Bounds::new(aux.bounds[0], aux.bounds[1])?,
            &aux.limits,
            &names,
            &values,
            &place,
        )?;
        specs.push(UnknownSpec {
            name: aux.symbol.clone(),
            guesses: Some(guesses_within((aux.guesses[0], aux.guesses[1]), b)),
            bounds: b,
        });
    }
    let set_knowns: Vec<(String, f64)> = knowns
        .iter()
        .filter(|(s, _)| used.iter().any(|u| u == s))
        .cloned()
        .collect();
    Ok(Compiled {
        t,
        unknown,
        req: request,
        unit,
        text,
        set,
        knowns,
        set_knowns,
        bounds,
        specs,
        start,
        notes,
    })
}

/// A compiled request solved again at other values of one known, for sweeps: the
/// same root, status and evaluations as [`compile`] then [`Compiled::solve`] of the
/// request with that known changed and the guesses given, without parsing the
/// equations, reading the knowns through the unit table or building the residual
/// anew (the known stays a live value of one compiled program).
///
/// It answers only where the full path would return the scalar solve as it is: the
/// solve converged (its certificate accepted by the driver), every check of the
/// knowns, limits, conditions and guesses passed. Everything else (a failed solve,
/// which the full path follows with its scan for a root; any error) is `None`, and
/// the caller takes the full path for that point.
pub struct PointSolver {
    t: &'static Template,
    unknown: &'static Variable,
    /// The unknown's bounds in SI (its limits at the compiled knowns).
    bounds: Bounds,
    /// The known's place in `names` and `values`.
    index: usize,
    names: Vec<String>,
    /// Every known in SI, the swept one as last set.
    values: Vec<f64>,
    residual: crate::equations::Residual,
}

impl PointSolver {
    /// The root (SI), status and evaluations with the known at `si` (SI) and the
    /// solve started from `guesses` (SI), or `None` (see [`PointSolver`]).
    pub fn solve(
        &mut self,
        si: f64,
        guesses: (f64, f64),
        options: &Options,
    ) -> Option<(f64, Status, usize)> {
        let (t, unknown) = (self.t, self.unknown);
        if !si.is_finite() {
            return None;
        }
        self.values[self.index] = si;
        // compile: the unknown's bounds with its limits at these knowns, the conditions.
        let names = || -> Vec<&str> { self.names.iter().map(String::as_str).collect() };
        let bounds = if unknown.limits.is_some() {
            let place = format!("limits of {} in template {}", unknown.symbol, t.id);
            let own = unknown.bounds_si().ok()?;
            limited(own, &unknown.limits, &names(), &self.values, &place).ok()?
        } else {
            self.bounds
        };
        if !t.requires.is_empty() {
            check_requirements(t, &unknown.symbol, &names(), &self.values).ok()?;
        }
        // solve_set: the options, the unknown's bounds within the solver's, the guesses.
        options.tol.validate().ok()?;
        options.bounds.validate().ok()?;
        bounds.validate().ok()?;
        let b = Bounds {
            lo: bounds.lo.max(options.bounds.lo),
            hi: bounds.hi.min(options.bounds.hi),
        };
        let (x0, x1) = guesses;
        if b.lo > b.hi
            || !(x0.is_finite() && x1.is_finite())
            || !(b.contains(x0) && b.contains(x1))
            || x0 == x1
        {
            return None;
        }
        let opts = Options {
            bounds: b,
            record_history: options.record_history,
            ..*options
        };
        self.residual.set_knowns(&[si]);
        let residual = &mut self.residual;
        let sol = crate::stepper::solve(crate::methods::Start::Guesses(x0, x1), &opts, |x| {
            residual.value(x)
        })
        .ok()?;
        // Compiled::solve settles a converged solve of a template without a root scan
        // as it is.
        sol.certificate.as_ref()?;
        Some((sol.root, sol.status, sol.evaluations))
    }
}

/// The variable of `t` named `symbol`, if the template may be solved for it.
fn the_unknown(t: &'static Template, symbol: &str) -> Result<&'static Variable, InputError> {
    let unknown = t.variable(symbol).ok_or_else(|| {
        InputError::new(
            "unknown-variable",
            format!(
                "template {} has no variable \"{symbol}\"; its variables are {}",
                t.id,
                t.variables
                    .iter()
                    .map(|v| v.symbol.as_str())
                    .collect::<Vec<_>>()
                    .join(", ")
            ),
        )
    })?;
    if !t.may_solve_for(&unknown.symbol) {
        let reason = t.unknowns_reason.as_deref().unwrap_or("");
        return Err(InputError::new(
            "not-an-unknown",
            format!(
                "template {} cannot be solved for \"{}\"; choose one of {}. {reason}",
                t.id,
                unknown.symbol,
                t.unknowns.join(", ")
            ),
        ));
    }
    Ok(unknown)
}

/// The knowns of a request, read and checked.
struct Given {
    /// (symbol, SI value) of every variable but the unknown.
    knowns: Vec<(String, f64)>,
    /// The list input in SI.
    list: Vec<f64>,
    /// The value given for the unknown itself, with its unit.
    own_value: Option<(f64, String)>,
    notes: Vec<String>,
}

fn read_knowns(
    t: &'static Template,
    unknown: &Variable,
    req: &TemplateRequest,
) -> Result<Given, InputError> {
    let mut knowns: Vec<(String, f64)> = Vec::new();
    let mut list: Vec<f64> = Vec::new();
    let mut given: Vec<&str> = Vec::new();
    let mut notes: Vec<String> = Vec::new();
    let mut own_value = None;
    for (symbol, value, unit) in &req.values {
        let place = format!("value of {symbol} in template {}", t.id);
        if !value.is_finite() {
            return Err(InputError::new(
                "non-finite-input",
                format!("the {place} must be a finite number, got {value}"),
            ));
        }
        if let Some(l) = t.list.as_ref().filter(|l| &l.symbol == symbol) {
            list.push(units::to_si_in(*value, unit, &l.dimension)?);
            continue;
        }
        let var = t.variable(symbol).ok_or_else(|| {
            InputError::new(
                "unknown-variable",
                format!("template {} has no variable \"{symbol}\"", t.id),
            )
        })?;
        if given.contains(&symbol.as_str()) {
            return Err(InputError::new(
                "duplicate-name",
                format!("{symbol} is given more than once"),
            ));
        }
        given.push(symbol);
        let row = units::unit_in(unit, &var.dimension)?;
        let accepted = var
            .units
            .iter()
            .any(|u| units::unit_in(u, &var.dimension).is_ok_and(|r| r.symbol == row.symbol));
        if !accepted {
            return Err(InputError::new(
                "unit-not-accepted",
                format!(
                    "{symbol} does not take the unit \"{unit}\"; it takes {}",
                    var.units.join(", ")
                ),
            ));
        }
        if symbol == &unknown.symbol {
            own_value = Some((*value, unit.clone()));
            continue;
        }
        let si = units::to_si_in(*value, unit, &var.dimension)?;
        let b = var.bounds_si()?;
        if !b.contains(si) {
            notes.push(format!(
                "{symbol} = {} is outside the range this template takes for {} ({} to {}); \
                 the result may have no physical meaning.",
                with_unit(*value, unit),
                var.meaning,
                sig(var.bounds[0]),
                with_unit(var.bounds[1], &var.unit)
            ));
        }
        knowns.push((symbol.clone(), si));
    }
    let mut missing: Vec<&str> = Vec::new();
    for var in &t.variables {
        if var.symbol != unknown.symbol && !knowns.iter().any(|(s, _)| s == &var.symbol) {
            if req.use_scenario_defaults {
                knowns.push((var.symbol.clone(), var.default_si()?));
            } else {
                missing.push(&var.symbol);
            }
        }
    }
    if let Some(l) = &t.list {
        if list.is_empty() {
            if req.use_scenario_defaults {
                for &v in &l.values {
                    list.push(units::to_si_in(v, &l.unit, &l.dimension)?);
                }
            } else {
                missing.push(&l.symbol);
            }
        }
    }
    if !missing.is_empty() {
        return Err(InputError::new(
            "missing-value",
            format!(
                "template {} solved for {} needs a value for {} ({}); give {}, or ask for \
                 the demo scenario's values with useScenarioDefaults",
                t.id,
                unknown.symbol,
                if missing.len() == 1 {
                    "one more known"
                } else {
                    "every known"
                },
                missing.join(", "),
                if missing.len() == 1 { "it" } else { "them" }
            ),
        ));
    }
    if let Some(l) = &t.list {
        if list.len() < 2 {
            return Err(InputError::new(
                "short-list",
                format!(
                    "template {} needs at least two values of {} ({}), got {}",
                    t.id,
                    l.symbol,
                    l.meaning,
                    list.len()
                ),
            ));
        }
    }
    Ok(Given {
        knowns,
        list,
        own_value,
        notes,
    })
}

/// What [`Compiled::solve`] settled, before it is reported in the user's units.
pub struct Outcome {
    settled: roots::Settled,
    notes: Vec<String>,
}

impl Outcome {
    /// The solve, in SI.
    pub fn solution(&self) -> &SetSolution {
        &self.settled.solution
    }
}

impl Compiled {
    fn names(&self) -> Vec<&str> {
        self.knowns.iter().map(|(s, _)| s.as_str()).collect()
    }

    fn values(&self) -> Vec<f64> {
        self.knowns.iter().map(|(_, v)| *v).collect()
    }

    /// Every known in SI.
    pub fn knowns(&self) -> &[(String, f64)] {
        &self.knowns
    }

    /// The two starting guesses in SI.
    pub fn start_guesses(&self) -> (f64, f64) {
        self.start.guesses
    }

    /// The same problem with other solve options, and other guesses (in the result
    /// unit) when given.
    pub fn with_options(
        &self,
        options: Options,
        sensitivities: bool,
        guesses: Option<(f64, f64)>,
    ) -> Result<Compiled, InputError> {
        let mut c = self.clone();
        c.req.options = options;
        c.req.sensitivities = sensitivities;
        if guesses.is_some() {
            c.req.guesses = guesses;
            let names = self.names();
            let values = self.values();
            c.start = starting_point(
                self.t,
                self.unknown,
                &c.req,
                &self.unit,
                self.bounds,
                &names,
                &values,
            )?;
            c.specs[0].guesses = Some(c.start.guesses);
        }
        Ok(c)
    }

    /// Solves from the compiled start, then settles the branch and the other roots.
    pub fn solve(&self) -> Result<Outcome, InputError> {
        let mut notes = self.notes.clone();
        let names = self.names();
        let values = self.values();
        let solution = solve_coupled(
            self.t,
            &self.set,
            &self.text,
            &self.set_knowns,
            &self.specs,
            &self.req,
            &mut notes,
        )?;
        let cx = roots::Context {
            t: self.t,
            unknown: self.unknown,
            req: &self.req,
            text: &self.text,
            set: &self.set,
            knowns: &self.set_knowns,
            specs: &self.specs,
            bounds: self.bounds,
            names: &names,
            values: &values,
            unit: &self.unit,
            own_start: self.req.guesses.is_none(),
        };
        let settled = roots::settle(&cx, solution, &mut notes)?;
        Ok(Outcome { settled, notes })
    }

    /// The residual of the main equation as a function of the unknown in SI, the
    /// auxiliaries solved from their own equations at each value (NaN where they
    /// cannot be).
    pub fn residual(&self) -> Result<Box<dyn FnMut(f64) -> f64 + '_>, InputError> {
        if self.t.auxiliary.is_empty() {
            let r = self
                .set
                .residual_fn(&self.set_knowns, &self.unknown.symbol)?;
            return Ok(Box::new(r));
        }
        let nested = roots::Nested::new(self.t, &self.text)?;
        Ok(Box::new(move |x| {
            nested.at(x, &self.set_knowns, &self.specs, &self.req.options)
        }))
    }

    /// The main equation as a compiled program of the unknown in SI, the knowns named
    /// in `live` kept variable (see [`crate::equations::Residual`]): for interval and
    /// dual evaluation. Refused for a template that solves auxiliary equations with its
    /// unknown, whose residual is a nested solve and no program.
    pub fn program(&self, live: &[&str]) -> Result<crate::equations::Residual, InputError> {
        if !self.t.auxiliary.is_empty() {
            let names: Vec<&str> = self.t.auxiliary.iter().map(|a| a.symbol.as_str()).collect();
            return Err(InputError::new(
                "needs-one-equation",
                format!(
                    "template {} solves its auxiliary unknowns ({}) together with {}; \
                     proven roots and uncertainties need one equation in one unknown",
                    self.t.id,
                    names.join(", "),
                    self.unknown.symbol
                ),
            ));
        }
        self.set
            .residual(&self.set_knowns, &self.unknown.symbol, live)
    }

    /// A solver of this request at other values of the known `symbol`, for sweeps:
    /// see [`PointSolver`]. `None` where its shortcut does not apply (auxiliary
    /// unknowns, a root scan or a branch asked for, sensitivities, or a known the
    /// equations do not use); the caller then compiles and solves each point in full.
    pub fn point_solver(&self, symbol: &str) -> Option<PointSolver> {
        if !self.t.auxiliary.is_empty()
            || self.unknown.roots.is_some()
            || self.req.branch.is_some()
            || self.req.sensitivities
        {
            return None;
        }
        let index = self.knowns.iter().position(|(s, _)| s == symbol)?;
        let residual = self.program(&[symbol]).ok()?;
        Some(PointSolver {
            t: self.t,
            unknown: self.unknown,
            bounds: self.bounds,
            index,
            names: self.names().into_iter().map(str::to_string).collect(),
            values: self.values(),
            residual,
        })
    }

    /// The branch labels of roots at `xs` (SI, sorted), where the template names them.
    pub fn label_roots(&self, xs: &[f64]) -> Vec<Option<String>> {
        match &self.unknown.roots {
            Some(scan) => roots::label_roots(scan, xs),
            None => vec![None; xs.len()],
        }
    }

    /// The result with the unknown, its other roots and the outputs in their units.
    pub fn report(&self, outcome: Outcome) -> Result<TemplateSolution, InputError> {
        let Outcome { settled, mut notes } = outcome;
        let (t, unknown, unit) = (self.t, self.unknown, self.unit.as_str());
        let solution = settled.solution;
        let root_si = solution.unknowns.first().map_or(f64::NAN, |u| u.1);
        let value = units::from_si_in(root_si, unit, &unknown.dimension)?;
        let mut other_roots = Vec::new();
        for r in &settled.others {
            other_roots.push(OtherRoot {
                value: units::from_si_in(r.x, unit, &unknown.dimension)?,
                label: r.label.clone(),
            });
        }
        other_roots.sort_by(|a, b| a.value.total_cmp(&b.value));
        let start = &self.start;
        if let (Some(s), true) = (&start.starter, solution.converged) {
            notes.push(format!(
                "Started from {}: {} = {} ({} from the implicit value {}).",
                s.label,
                unknown.symbol,
                with_unit(units::from_si_in(s.value, unit, &unknown.dimension)?, unit),
                percent(s.value, root_si),
                with_unit(value, unit)
            ));
        }
        notes.extend(start.note.clone());
        let names = self.names();
        let values = self.values();
        // Values at the solution for comparisons, warnings and outputs.
        let mut all_names: Vec<String> = self.knowns.iter().map(|(s, _)| s.clone()).collect();
        let mut all_values: Vec<f64> = values.clone();
        for (s, v) in solution.unknowns.iter().chain(&solution.definitions) {
            all_names.push(s.clone());
            all_values.push(*v);
        }
        let refs: Vec<&str> = all_names.iter().map(String::as_str).collect();
        let lookup = |s: &str| refs.iter().position(|n| *n == s).map(|i| all_values[i]);
        let mut outputs = Vec::new();
        let mut approximations = Vec::new();
        if solution.converged {
            for c in &t.comparisons {
                let place = format!("comparison in template {}", t.id);
                let approx = eval(&c.expr, &refs, &all_values, &place)?;
                approximations.push(OutputValue {
                    symbol: c.symbol.clone(),
                    meaning: c.label.clone(),
                    value: approx,
                    unit: "1".to_string(),
                });
                if let Some(exact) = lookup(&c.against) {
                    let diff = 100.0 * (approx - exact) / exact;
                    notes.push(format!(
                        "{}: {} = {} ({}{:.3} % from the implicit value {}).",
                        c.label,
                        c.against,
                        sig(approx),
                        if diff >= 0.0 { "+" } else { "" },
                        diff,
                        sig(exact)
                    ));
                }
            }
            for w in &t.warnings {
                let place = format!("warning in template {}", t.id);
                if eval(&w.when, &refs, &all_values, &place)? > 0.0 {
                    notes.push(w.text.clone());
                }
            }
            let shown = t
                .auxiliary
                .iter()
                .map(|a| (&a.symbol, &a.meaning, &a.dimension, &a.unit))
                .chain(
                    t.outputs
                        .iter()
                        .map(|o| (&o.symbol, &o.meaning, &o.dimension, &o.unit)),
                );
            for (symbol, meaning, dimension, unit) in shown {
                let unit = self
                    .req
                    .output_units
                    .iter()
                    .find(|(s, _)| s == symbol)
                    .map_or(unit, |(_, u)| u);
                if let Some(v) = lookup(symbol) {
                    outputs.push(OutputValue {
                        symbol: symbol.clone(),
                        meaning: meaning.clone(),
                        value: units::from_si_in(v, unit, dimension)?,
                        unit: unit.clone(),
                    });
                }
            }
        } else {
            notes.push(format!(
                "Not converged ({}): {}",
                solution.status.code(),
                solution.status.diagnosis()
            ));
            // Warnings written in the knowns alone (a cable shorter than its span) may
            // say why; those that need the unknown are not evaluated at a point that is
            // no root.
            let place = format!("warning in template {}", t.id);
            for w in &t.warnings {
                if eval(&w.when, &names, &values, &place).is_ok_and(|v| v > 0.0) {
                    notes.push(w.text.clone());
                }
            }
        }
        if let (Some(s), true) = (&start.starter, solution.converged) {
            approximations.push(OutputValue {
                symbol: format!("{}_start", unknown.symbol),
                meaning: format!("{} (the starting point)", s.label),
                value: units::from_si_in(s.value, unit, &unknown.dimension)?,
                unit: unit.to_string(),
            });
        }
        outputs.extend(approximations);
        Ok(TemplateSolution {
            solution,
            value,
            unit: unit.to_string(),
            branch: settled.branch,
            other_roots,
            scan_evaluations: settled.scan_evaluations,
            notes,
            caution: t.caution.clone(),
            outputs,
        })
    }
}

/// The difference of `approx` from `exact` in percent, signed, three decimals.
fn percent(approx: f64, exact: f64) -> String {
    let diff = 100.0 * (approx - exact) / exact;
    format!("{}{:.3} %", if diff >= 0.0 { "+" } else { "" }, diff)
}

/// Refuses a request whose knowns break one of the template's conditions of validity.
/// A condition that uses the unknown is left to the unknown's limits.
fn check_requirements(
    t: &Template,
    unknown: &str,
    names: &[&str],
    values: &[f64],
) -> Result<(), InputError> {
    for r in &t.requires {
        let place = format!("condition of template {}", t.id);
        let uses_unknown = Expression::parse(&r.holds)
            .map(|e| e.names().iter().any(|n| n == unknown))
            .unwrap_or(false);
        if uses_unknown {
            continue;
        }
        let v = eval(&r.holds, names, values, &place)?;
        if v < 0.0 {
            return Err(InputError::new(
                "outside-validity",
                format!("template {}: {}", t.id, r.text),
            ));
        }
    }
    Ok(())
}

/// Where the solve starts, and the starter used, if any.
#[derive(Debug, Clone)]
struct StartingPoint {
    guesses: (f64, f64),
    starter: Option<StarterValue>,
    /// Why the starter could not be used, if it could not.
    note: Option<String>,
}

#[derive(Debug, Clone)]
struct StarterValue {
    label: String,
    /// In SI.
    value: f64,
}

/// The request's guesses; else the template's starter and a point 1e-6 of it away;
/// else the template's typical guesses (within the range).
fn starting_point(
    t: &Template,
    unknown: &Variable,
    req: &TemplateRequest,
    unit: &str,
    bounds: Bounds,
    names: &[&str],
    values: &[f64],
) -> Result<StartingPoint, InputError> {
    if let Some((a, b)) = req.guesses {
        return Ok(StartingPoint {
            guesses: (
                units::to_si_in(a, unit, &unknown.dimension)?,
                units::to_si_in(b, unit, &unknown.dimension)?,
            ),
            starter: None,
            note: None,
        });
    }
    let a = units::to_si_in(unknown.guesses[0], &unknown.unit, &unknown.dimension)?;
    let b = units::to_si_in(unknown.guesses[1], &unknown.unit, &unknown.dimension)?;
    let typical = guesses_within((a, b), bounds);
    let Some(starter) = &unknown.starter else {
        return Ok(StartingPoint {
            guesses: typical,
            starter: None,
            note: None,
        });
    };
    let place = format!("starter of {} in template {}", unknown.symbol, t.id);
    let x0 = eval(&starter.expr, names, values, &place)?;
    if !bounds.contains(x0) {
        return Ok(StartingPoint {
            guesses: typical,
            starter: None,
            note: Some(format!(
                "{} gives no value of {} inside its range here ({}), so the solve started \
                 from the template's typical guesses.",
                starter.label,
                unknown.symbol,
                sig(units::from_si_in(x0, unit, &unknown.dimension)?)
            )),
        });
    }
    let step = if x0 != 0.0 {
        STARTER_STEP * x0.abs()
    } else {
        STARTER_STEP * (bounds.hi - bounds.lo).abs().min(1.0)
    };
    let x1 = if bounds.contains(x0 + step) {
        x0 + step
    } else {
        x0 - step
    };
    Ok(StartingPoint {
        guesses: (x0, x1),
        starter: Some(StarterValue {
            label: starter.label.clone(),
            value: x0,
        }),
        note: None,
    })
}

/// The second guess beside a starter, relative to it: close enough that the first
/// secant step is nearly Newton's, far enough that the difference of f is not noise.
/// Chosen by measurement: the 42 Colebrook–White cases of `starters_take_few_evaluations`
/// (tests/templates.rs), solved with the default method straight from the Serghides
/// value, took the fewest evaluations with 1e-6 of the steps 1e-9, 1e-6, 1e-4, 1e-3 and
/// 1e-2 (4.26 on average, against 4.31 to 4.81).
const STARTER_STEP: f64 = 1e-6;

/// Solves the whole set together; with auxiliaries, if that does not converge, solves
/// the unknown alone with the auxiliaries solved inside each evaluation, then polishes
/// the whole set from that point so that the result is the set's own solution.
fn solve_coupled(
    t: &Template,
    set: &EquationSet,
    text: &str,
    knowns: &[(String, f64)],
    specs: &[UnknownSpec],
    req: &TemplateRequest,
    notes: &mut Vec<String>,
) -> Result<SetSolution, InputError> {
    let mut solution = solve_set(set, knowns, specs, &req.options, req.sensitivities)?;
    // A coupled solve that ends exactly on a bound of an unknown may have stopped there
    // for want of room rather than at a root: the nested solve decides.
    let on_bound = solution
        .unknowns
        .iter()
        .zip(specs)
        .any(|((_, v), s)| *v == s.bounds.lo || *v == s.bounds.hi);
    if (solution.converged && !on_bound) || t.auxiliary.is_empty() {
        return Ok(solution);
    }
    let Some(start) = nested_solve(t, text, knowns, specs, &req.options)? else {
        if solution.converged {
            solution.converged = false;
            solution.status = Status::StuckAtBound;
            if let Some(last) = solution.blocks.last_mut() {
                last.converged = false;
                last.status = Status::StuckAtBound;
            }
            if let Some(system) = solution.system.as_mut() {
                system.converged = false;
                system.status = Status::StuckAtBound;
            }
        }
        return Ok(solution);
    };
    let polished: Vec<UnknownSpec> = specs
        .iter()
        .zip(&start)
        .map(|(spec, &x)| {
            let step = 1e-7 * x.abs().max(1e-300);
            let other = if spec.bounds.contains(x + step) {
                x + step
            } else {
                x - step
            };
            UnknownSpec {
                guesses: Some((x, other)),
                ..spec.clone()
            }
        })
        .collect();
    let again = solve_set(set, knowns, &polished, &req.options, req.sensitivities)?;
    if !again.converged {
        return Ok(solution);
    }
    notes.push(
        "Solved by nesting: the auxiliary equations were solved inside each evaluation of \
         the unknown, then the whole set was polished together."
            .to_string(),
    );
    Ok(again)
}

/// Solves for the unknown alone (`specs[0]`), the auxiliaries (`specs[1..]`) being
/// solved from their own equations at each trial value. Returns every unknown's value
/// at the solution, or `None` if the nested solve did not converge.
fn nested_solve(
    t: &Template,
    text: &str,
    knowns: &[(String, f64)],
    specs: &[UnknownSpec],
    options: &Options,
) -> Result<Option<Vec<f64>>, InputError> {
    let nested = roots::Nested::new(t, text)?;
    let unknown = &specs[0];
    let outer = Options {
        bounds: unknown.bounds,
        ..*options
    };
    let (a, b) = unknown
        .guesses
        .unwrap_or((unknown.bounds.lo, unknown.bounds.hi));
    let sol = crate::stepper::solve(crate::methods::Start::Guesses(a, b), &outer, |x| {
        nested.at(x, knowns, specs, options)
    })?;
    if !sol.converged {
        return Ok(None);
    }
    let Some(aux) = nested.aux_at(sol.root, knowns, specs, options) else {
        return Ok(None);
    };
    let mut out = vec![sol.root];
    out.extend(aux);
    Ok(Some(out))
}

/// Checks the catalogue: every id unique, every unit and dimension known, every
/// default inside its bounds, every unknown a variable, every equation text readable
/// and every expression compiling. Returns the problems found (empty when sound).
pub fn check_catalogue() -> Vec<String> {
    let mut problems = Vec::new();
    if let Some(e) = catalogue_error() {
        problems.push(e.to_string());
        return problems;
    }
    let mut ids: Vec<&str> = Vec::new();
    for t in all() {
        let at = |what: String| format!("{}: {what}", t.id);
        if ids.contains(&t.id.as_str()) {
            problems.push(at("duplicate id".into()));
        }
        ids.push(&t.id);
        let mut units_to_check: Vec<(&str, &str)> = Vec::new();
        for v in &t.variables {
            units_to_check.push((&v.unit, &v.dimension));
            for u in &v.units {
                units_to_check.push((u, &v.dimension));
            }
            if !v.units.contains(&v.unit) {
                problems.push(at(format!(
                    "{}: default unit not among accepted units",
                    v.symbol
                )));
            }
            if !(v.bounds[0] <= v.value && v.value <= v.bounds[1]) {
                problems.push(at(format!(
                    "{}: default {} outside bounds",
                    v.symbol, v.value
                )));
            }
            for g in v.guesses {
                if !(v.bounds[0] <= g && g <= v.bounds[1]) {
                    problems.push(at(format!("{}: guess {g} outside bounds", v.symbol)));
                }
            }
        }
        for a in &t.auxiliary {
            units_to_check.push((&a.unit, &a.dimension));
            if !t.equations.lines().any(|l| l.trim() == a.equation.trim()) {
                problems.push(at(format!(
                    "auxiliary {}: its equation is not a line of the equations",
                    a.symbol
                )));
            }
        }
        for o in &t.outputs {
            units_to_check.push((&o.unit, &o.dimension));
        }
        if let Some(l) = &t.list {
            units_to_check.push((&l.unit, &l.dimension));
        }
        for (u, d) in units_to_check {
            if let Err(e) = units::unit_in(u, d) {
                problems.push(at(e.message));
            }
        }
        for u in &t.unknowns {
            if t.variable(u).is_none() {
                problems.push(at(format!("unknown {u} is not a variable")));
            }
        }
        if t.unknowns.len() < t.variables.len() && t.unknowns_reason.is_none() {
            problems.push(at(
                "some variables are not unknowns, with no reason given".into()
            ));
        }
        if t.title.is_empty() || t.description.is_empty() || t.source.is_empty() {
            problems.push(at("title, description and source are required".into()));
        }
        let given: Vec<f64> = t
            .list
            .as_ref()
            .map(|l| l.values.clone())
            .unwrap_or_default();
        let (text, _) = expand_list(t, &given);
        let declared = t.declared_symbols();
        match EquationSet::parse_declaring(&text, &declared) {
            Err(e) => problems.push(at(format!("equations: {}", e.message))),
            Ok(set) => {
                if set.equation_count() != 1 + t.auxiliary.len() {
                    problems.push(at(format!(
                        "{} equations for 1 unknown and {} auxiliaries",
                        set.equation_count(),
                        t.auxiliary.len()
                    )));
                }
                if !t.auxiliary.is_empty() {
                    match EquationSet::parse_declaring(&roots::main_text(t, &text), &declared) {
                        Ok(main) if main.equation_count() == 1 => {}
                        Ok(main) => problems.push(at(format!(
                            "{} main equations once the auxiliaries' lines are removed",
                            main.equation_count()
                        ))),
                        Err(e) => problems.push(at(format!("main equations: {}", e.message))),
                    }
                }
                let defs = set.definition_names();
                for o in &t.outputs {
                    if !defs.contains(&o.symbol) {
                        problems.push(at(format!("output {} is not a definition", o.symbol)));
                    }
                }
                if let Err(e) = check_dimensions(t, &set) {
                    problems.push(at(format!("dimensions: {}", e.message)));
                }
            }
        }
        problems.extend(check_expressions(t).into_iter().map(&at));
        if t.caution.as_deref().is_some_and(|c| c != CAUTION) {
            problems.push(at("caution differs from the standard text".into()));
        }
    }
    problems
}

/// The catalogue's own expressions: every starter compiles over the other variables,
/// every condition and scan expression over the variables, and every branch default
/// is one of the scan's labels.
fn check_expressions(t: &Template) -> Vec<String> {
    let mut problems = Vec::new();
    let all: Vec<&str> = t.variables.iter().map(|v| v.symbol.as_str()).collect();
    let compiles = |text: &str, names: &[&str]| -> Result<(), String> {
        let e = Expression::parse(text).map_err(|e| e.message)?;
        e.compile(names).map(|_| ()).map_err(|e| e.message)
    };
    for v in &t.variables {
        let others: Vec<&str> = all.iter().copied().filter(|s| *s != v.symbol).collect();
        if let Some(st) = &v.starter {
            if let Err(e) = compiles(&st.expr, &others) {
                problems.push(format!("{}: starter: {e}", v.symbol));
            }
            if st.label.is_empty() || st.source.is_empty() {
                problems.push(format!(
                    "{}: a starter needs a label and a source",
                    v.symbol
                ));
            }
        }
        if let Some(scan) = &v.roots {
            for text in [Some(&scan.lo), Some(&scan.hi), scan.split.as_ref()]
                .into_iter()
                .flatten()
            {
                if let Err(e) = compiles(text, &others) {
                    problems.push(format!("{}: root range: {e}", v.symbol));
                }
            }
            let labels = roots::branch_labels(scan);
            match &scan.default {
                Some(d) if !labels.contains(&d.as_str()) => problems.push(format!(
                    "{}: default branch {d} is not one of its labels {labels:?}",
                    v.symbol
                )),
                Some(_) if scan.default_reason.is_none() => {
                    problems.push(format!("{}: the default branch needs a reason", v.symbol))
                }
                _ => {}
            }
        }
    }
    for r in &t.requires {
        if let Err(e) = compiles(&r.holds, &all) {
            problems.push(format!("condition: {e}"));
        }
    }
    problems
}
