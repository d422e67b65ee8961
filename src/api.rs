//! The JSON facade: one function per call of the JavaScript API, JSON text in and JSON
//! text out, with camelCase field names.
//!
//! Everything a caller sends is checked here before it reaches the core: types, finite
//! numbers, sizes, unknown fields. Nothing in this module panics on any input, which
//! matters on wasm32, where a panic aborts the instance for good. The wasm32 bindings
//! (`bindings.rs`) only convert JavaScript values and call these functions; the module
//! knows nothing about JavaScript and is tested natively (`tests/api.rs`).
//!
//! Numbers that are not finite are written as the strings `"NaN"`, `"Infinity"` and
//! `"-Infinity"`, since JSON has none; requests may use the same strings (or `null`) for
//! open bounds. The JavaScript wrapper turns them back into numbers.

use serde_json::{json, Map, Value};

use crate::broyden;
use crate::equations::quantities::{self, VariableUnits};
use crate::equations::system::SystemHistoryRow;
use crate::equations::{self, EquationSet, SetSolution, UnknownSpec};
use crate::roots_in_range::{self, RangeRoots, ScanOptions};
use crate::templates::{self, TemplateRequest, TemplateSolution};

use crate::error::InputError;
use crate::methods::{MethodKind, Options, Start};
use crate::outcome::{HistoryRow, Solution, StepKind};
use crate::stepper::Stepper;
use crate::tolerances::{Bounds, Tolerances};

/// Longest request accepted, in bytes.
pub const MAX_REQUEST_BYTES: usize = 4 << 20;
/// Longest equation text accepted, in characters.
pub const MAX_EQUATION_CHARS: usize = 100_000;
/// Largest evaluation budget accepted.
pub const MAX_EVALS: usize = crate::tolerances::MAX_EVALS;
/// Longest saved stepper accepted: a record of the largest budget fits.
pub const MAX_SAVED_STEPPER_BYTES: usize = 64 << 20;

// ---------------------------------------------------------------------------------------
// Writing results

/// A number as JSON; non-finite values become strings.
pub fn num(v: f64) -> Value {
    if v.is_finite() {
        json!(v)
    } else if v.is_nan() {
        json!("NaN")
    } else if v > 0.0 {
        json!("Infinity")
    } else {
        json!("-Infinity")
    }
}

fn nums(v: &[f64]) -> Value {
    Value::Array(v.iter().map(|&x| num(x)).collect())
}

fn pair_value(p: Option<(f64, f64)>) -> Value {
    match p {
        Some((a, b)) => json!([num(a), num(b)]),
        None => Value::Null,
    }
}

fn history_value(rows: &[HistoryRow]) -> Value {
    Value::Array(
        rows.iter()
            .map(|r| {
                json!({
                    "k": r.k,
                    "x": num(r.x),
                    "fx": num(r.fx),
                    "step": num(r.step),
                    "bracket": pair_value(r.bracket),
                    "kind": r.kind.code(),
                })
            })
            .collect(),
    )
}

/// The evidence for a converged answer as a JSON object (null when not converged).
pub fn certificate_value(c: Option<&crate::Certificate>) -> Value {
    match c {
        None => Value::Null,
        Some(c) => json!({
            "kind": c.kind.code(),
            "explanation": c.kind.explanation(),
            "residual": num(c.residual),
            "bound": num(c.bound),
            "bracket": pair_value(c.bracket),
            "width": num(c.width),
            "reference": pair_value(c.reference),
        }),
    }
}

/// A scalar [`Solution`] as a JSON object.
pub fn solution_value(s: &Solution) -> Value {
    json!({
        "root": num(s.root),
        "residual": num(s.residual),
        "residualAt": num(s.residual_at),
        "converged": s.converged,
        "status": s.status.code(),
        "message": s.message(),
        "evaluations": s.evaluations,
        "iterations": s.iterations,
        "checks": s.checks,
        "bracket": pair_value(s.bracket),
        "certificate": certificate_value(s.certificate.as_ref()),
        "history": history_value(&s.history),
        "historyDropped": s.history_dropped,
    })
}

/// Serialises a result value; this cannot fail for values built from `json!`.
fn text_of(v: Value) -> String {
    v.to_string()
}

/// One type for every scalar function handed to the generic core, so that each core
/// routine is compiled once into the wasm module, not once per closure.
fn erase(f: &mut impl FnMut(f64) -> f64) -> &mut dyn FnMut(f64) -> f64 {
    f
}

// ---------------------------------------------------------------------------------------
// Reading requests

fn bad(message: impl Into<String>) -> InputError {
    InputError::new("bad-request", message)
}

fn describe(v: &Value) -> String {
    match v {
        Value::Null => "null".into(),
        Value::Bool(b) => b.to_string(),
        Value::Number(n) => n.to_string(),
        Value::String(s) => {
            let short: String = s.chars().take(40).collect();
            if short.len() < s.len() {
                format!("a string of {} characters", s.chars().count())
            } else {
                format!("the string {short:?}")
            }
        }
        Value::Array(a) => format!("a list of {} items", a.len()),
        Value::Object(_) => "an object".into(),
    }
}

/// Parses the request text, which must be a JSON object.
pub fn parse_request(request: &str) -> Result<Map<String, Value>, InputError> {
    if request.len() > MAX_REQUEST_BYTES {
        return Err(bad(format!(
            "the request is {} bytes long; the limit is {MAX_REQUEST_BYTES}",
            request.len()
        )));
    }
    let value: Value = serde_json::from_str(request)
        .map_err(|e| bad(format!("the request is not valid JSON: {e}")))?;
    match value {
        Value::Object(m) => Ok(m),
        other => Err(bad(format!(
            "the request must be an object, got {}",
            describe(&other)
        ))),
    }
}

/// A JSON object being read, with its place in the request for error messages.
pub struct Fields<'a> {
    map: &'a Map<String, Value>,
    place: String,
}

impl<'a> Fields<'a> {
    pub fn new(map: &'a Map<String, Value>, place: impl Into<String>) -> Self {
        Fields {
            map,
            place: place.into(),
        }
    }

    fn at(&self, key: &str) -> String {
        format!("{}.{key}", self.place)
    }

    /// Rejects fields not in `allowed`, so that a misspelt option is not silently ignored.
    pub fn only(&self, allowed: &[&str]) -> Result<(), InputError> {
        for key in self.map.keys() {
            if !allowed.contains(&key.as_str()) {
                let shown: String = key.chars().take(40).collect();
                return Err(bad(format!(
                    "unknown field {shown:?} in {}; expected one of: {}",
                    self.place,
                    allowed.join(", ")
                )));
            }
        }
        Ok(())
    }

    pub fn get(&self, key: &str) -> Option<&'a Value> {
        self.map.get(key).filter(|v| !v.is_null())
    }

    pub fn has(&self, key: &str) -> bool {
        self.get(key).is_some()
    }

    pub fn string(&self, key: &str) -> Result<Option<&'a str>, InputError> {
        match self.get(key) {
            None => Ok(None),
            Some(Value::String(s)) => Ok(Some(s)),
            Some(v) => Err(bad(format!(
                "{} must be a string, got {}",
                self.at(key),
                describe(v)
            ))),
        }
    }

    pub fn required_string(&self, key: &str) -> Result<&'a str, InputError> {
        self.string(key)?
            .ok_or_else(|| bad(format!("{} is missing", self.at(key))))
    }

    pub fn boolean(&self, key: &str) -> Result<bool, InputError> {
        match self.get(key) {
            None => Ok(false),
            Some(Value::Bool(b)) => Ok(*b),
            Some(v) => Err(bad(format!(
                "{} must be true or false, got {}",
                self.at(key),
                describe(v)
            ))),
        }
    }

    pub fn finite(&self, key: &str) -> Result<Option<f64>, InputError> {
        self.get(key)
            .map(|v| finite_value(v, &self.at(key)))
            .transpose()
    }

    pub fn required_finite(&self, key: &str) -> Result<f64, InputError> {
        self.finite(key)?
            .ok_or_else(|| bad(format!("{} is missing", self.at(key))))
    }

    /// A whole number in `[lo, hi]`.
    pub fn count(&self, key: &str, lo: usize, hi: usize) -> Result<Option<usize>, InputError> {
        let Some(v) = self.get(key) else {
            return Ok(None);
        };
        let x = finite_value(v, &self.at(key))?;
        if x.fract() != 0.0 || x < lo as f64 || x > hi as f64 {
            return Err(bad(format!(
                "{} must be a whole number from {lo} to {hi}, got {x}",
                self.at(key)
            )));
        }
        Ok(Some(x as usize))
    }

    pub fn object(&self, key: &str) -> Result<Option<Fields<'a>>, InputError> {
        match self.get(key) {
            None => Ok(None),
            Some(Value::Object(m)) => Ok(Some(Fields::new(m, self.at(key)))),
            Some(v) => Err(bad(format!(
                "{} must be an object, got {}",
                self.at(key),
                describe(v)
            ))),
        }
    }

    pub fn array(&self, key: &str) -> Result<Option<&'a [Value]>, InputError> {
        match self.get(key) {
            None => Ok(None),
            Some(Value::Array(a)) => Ok(Some(a)),
            Some(v) => Err(bad(format!(
                "{} must be a list, got {}",
                self.at(key),
                describe(v)
            ))),
        }
    }

    /// Two finite numbers `[a, b]`.
    pub fn finite_pair(&self, key: &str) -> Result<Option<(f64, f64)>, InputError> {
        self.get(key)
            .map(|v| finite_pair_value(v, &self.at(key)))
            .transpose()
    }

    pub fn bounds(&self, key: &str) -> Result<Bounds, InputError> {
        match self.get(key) {
            None => Ok(Bounds::UNBOUNDED),
            Some(v) => bounds_value(v, &self.at(key)),
        }
    }

    /// `{name: number}`, names kept in the order given.
    pub fn number_map(&self, key: &str) -> Result<Vec<(String, f64)>, InputError> {
        let Some(obj) = self.object(key)? else {
            return Ok(Vec::new());
        };
        obj.map
            .iter()
            .map(|(name, v)| Ok((name.clone(), finite_value(v, &obj.at(name))?)))
            .collect()
    }
}

/// Reads a finite number. Non-finite values arrive as strings from the JS wrapper.
pub fn finite_value(v: &Value, place: &str) -> Result<f64, InputError> {
    match v {
        Value::Number(n) => n
            .as_f64()
            .filter(|x| x.is_finite())
            .ok_or_else(|| bad(format!("{place} must be a finite number, got {n}"))),
        Value::String(s) if matches!(s.as_str(), "NaN" | "Infinity" | "-Infinity") => {
            Err(InputError::new(
                "non-finite-input",
                format!("{place} must be a finite number, got {s}"),
            ))
        }
        Value::Null => Err(bad(format!("{place} is missing"))),
        other => Err(bad(format!(
            "{place} must be a number, got {}",
            describe(other)
        ))),
    }
}

/// A bound: a number, `null` or a string infinity (the given open end).
fn bound_end(v: &Value, place: &str, open: f64) -> Result<f64, InputError> {
    match v {
        Value::Null => Ok(open),
        Value::String(s) if s == "Infinity" => Ok(f64::INFINITY),
        Value::String(s) if s == "-Infinity" => Ok(f64::NEG_INFINITY),
        other => finite_value(other, place),
    }
}

pub fn bounds_value(v: &Value, place: &str) -> Result<Bounds, InputError> {
    match v.as_array().map(|a| a.as_slice()) {
        Some([lo, hi]) => {
            let lo = bound_end(lo, &format!("{place}[0]"), f64::NEG_INFINITY)?;
            let hi = bound_end(hi, &format!("{place}[1]"), f64::INFINITY)?;
            Bounds::new(lo, hi).map_err(|e| InputError::new(e.code, format!("{place}: {e}")))
        }
        _ => Err(bad(format!(
            "{place} must be a list of two bounds [lower, upper], got {}",
            describe(v)
        ))),
    }
}

pub fn finite_pair_value(v: &Value, place: &str) -> Result<(f64, f64), InputError> {
    match v.as_array().map(|a| a.as_slice()) {
        Some([a, b]) => Ok((
            finite_value(a, &format!("{place}[0]"))?,
            finite_value(b, &format!("{place}[1]"))?,
        )),
        _ => Err(bad(format!(
            "{place} must be a list of two numbers, got {}",
            describe(v)
        ))),
    }
}

/// Reads `tolerances: {xAbs, xRel, fAbs, maxEvals}` over the defaults.
pub fn read_tolerances(f: &Fields) -> Result<Tolerances, InputError> {
    let mut tol = Tolerances::default();
    if let Some(t) = f.object("tolerances")? {
        t.only(&["xAbs", "xRel", "fAbs", "maxEvals"])?;
        for (key, slot) in [
            ("xAbs", &mut tol.x_abs),
            ("xRel", &mut tol.x_rel),
            ("fAbs", &mut tol.f_abs),
        ] {
            if let Some(v) = t.finite(key)? {
                if v < 0.0 {
                    return Err(InputError::new(
                        "bad-tolerance",
                        format!("{} must be >= 0, got {v}", t.at(key)),
                    ));
                }
                *slot = v;
            }
        }
        if let Some(n) = t.count("maxEvals", 2, MAX_EVALS)? {
            tol.max_evals = n;
        }
    }
    tol.validate()?;
    Ok(tol)
}

pub fn read_method(f: &Fields) -> Result<MethodKind, InputError> {
    match f.string("method")? {
        None => Ok(MethodKind::Auto),
        Some(code) => MethodKind::from_code(code),
    }
}

/// Reads method, tolerances, bounds (under `bounds_key`) and history into [`Options`].
pub fn read_options(f: &Fields, bounds_key: Option<&str>) -> Result<Options, InputError> {
    Ok(Options {
        method: read_method(f)?,
        tol: read_tolerances(f)?,
        bounds: match bounds_key {
            Some(k) => f.bounds(k)?,
            None => Bounds::UNBOUNDED,
        },
        record_history: f.boolean("history")?,
    })
}

/// Reads `guesses` or `bracket` (exactly one of them).
pub fn read_start(f: &Fields) -> Result<Start, InputError> {
    match (f.finite_pair("guesses")?, f.finite_pair("bracket")?) {
        (Some((a, b)), None) => Ok(Start::Guesses(a, b)),
        (None, Some((a, b))) => Ok(Start::Bracket(a, b)),
        (Some(_), Some(_)) => Err(bad(format!(
            "give either {0}.guesses or {0}.bracket, not both",
            f.place
        ))),
        (None, None) => Err(bad(format!(
            "{0}.guesses or {0}.bracket is missing: give two starting points",
            f.place
        ))),
    }
}

// ---------------------------------------------------------------------------------------
// Scalar options and the ask–tell stepper

const SCALAR_FIELDS: [&str; 6] = [
    "guesses",
    "bracket",
    "method",
    "tolerances",
    "bounds",
    "history",
];

/// Reads the options of a scalar solve of a JS function or a stepper.
pub fn scalar_setup(request: &str) -> Result<(Start, Options), InputError> {
    let map = parse_request(request)?;
    let f = Fields::new(&map, "options");
    f.only(&SCALAR_FIELDS)?;
    let start = read_start(&f)?;
    let options = read_options(&f, Some("bounds"))?;
    crate::methods::validate(start, &options)?;
    Ok((start, options))
}

/// Solves f(x) = 0 for a Rust closure with options given as JSON (the native
/// counterpart of `solveFunction`).
pub fn solve_function(request: &str, mut f: impl FnMut(f64) -> f64) -> Result<String, InputError> {
    let (start, options) = scalar_setup(request)?;
    let solution = crate::stepper::solve(start, &options, erase(&mut f))?;
    Ok(text_of(solution_value(&solution)))
}

/// The ask–tell stepper behind the JS `Stepper` class.
pub struct StepperSession {
    stepper: Stepper,
}

impl StepperSession {
    pub fn create(request: &str) -> Result<StepperSession, InputError> {
        let (start, options) = scalar_setup(request)?;
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

    /// The result as JSON once done.
    pub fn result(&self) -> Option<String> {
        self.stepper.solution().map(|s| text_of(solution_value(s)))
    }

    /// The history rows so far as a JSON list (empty unless history was asked for).
    pub fn history(&self) -> String {
        text_of(history_value(&self.stepper.history().0))
    }

    pub fn save(&self) -> String {
        self.stepper.save()
    }
}

// ---------------------------------------------------------------------------------------
// Units

/// Longest unit symbol accepted, in characters.
pub const MAX_UNIT_CHARS: usize = 64;

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

/// Every dimension with its units, SI unit first: `[{dimension, units: [..]}]`.
pub fn units_catalogue() -> String {
    let list: Vec<Value> = crate::units::dimensions()
        .into_iter()
        .map(|d| json!({ "dimension": d, "units": crate::units::units_of(d) }))
        .collect();
    text_of(Value::Array(list))
}

// ---------------------------------------------------------------------------------------
// Text equations

fn check_equation_length(text: &str) -> Result<(), InputError> {
    let n = text.chars().count();
    if n > MAX_EQUATION_CHARS {
        return Err(InputError::new(
            "equation-too-long",
            format!("the equation text is {n} characters long; the limit is {MAX_EQUATION_CHARS}"),
        ));
    }
    Ok(())
}

fn parse_set(text: &str) -> Result<EquationSet, InputError> {
    check_equation_length(text)?;
    EquationSet::parse(text)
}

/// Parses an equation text without solving it: `{ok: true, variables, definitions,
/// equations}` or `{ok: false, code, message, position, caret}`.
pub fn check_equation(text: &str) -> String {
    match parse_set(text) {
        Ok(set) => text_of(json!({
            "ok": true,
            "variables": set.variables(),
            "definitions": set.definition_names(),
            "equations": set.equation_count(),
        })),
        Err(e) => text_of(json!({
            "ok": false,
            "code": e.code,
            "message": e.message,
            "position": e.position,
            "caret": e.position.map(|p| equations::caret(text, p)),
        })),
    }
}

fn name_list(names: &[String]) -> String {
    names.join(", ")
}

/// The variables not given a value, for requests that leave the unknowns implicit.
fn implicit_unknowns(set: &EquationSet, given: &[&str]) -> Vec<String> {
    set.variables()
        .into_iter()
        .filter(|v| !given.contains(&v.as_str()))
        .collect()
}

fn the_one_unknown(f: &Fields, set: &EquationSet, given: &[&str]) -> Result<String, InputError> {
    if let Some(name) = f.string("unknown")? {
        return Ok(name.to_string());
    }
    let free = implicit_unknowns(set, given);
    match free.as_slice() {
        [one] => Ok(one.clone()),
        [] => Err(InputError::new(
            "no-unknown",
            format!("{}.unknown is missing and every variable has a value", f.place),
        )),
        _ => Err(InputError::new(
            "no-unknown",
            format!(
                "{}.unknown is missing and several variables have no value ({}); name the one to solve for",
                f.place,
                name_list(&free)
            ),
        )),
    }
}

fn read_unknowns(
    f: &Fields,
    set: &EquationSet,
    knowns: &[(String, f64)],
) -> Result<Vec<UnknownSpec>, InputError> {
    let Some(list) = f.array("unknowns")? else {
        let given: Vec<&str> = knowns.iter().map(|(n, _)| n.as_str()).collect();
        return Ok(implicit_unknowns(set, &given)
            .iter()
            .map(|n| UnknownSpec::named(n))
            .collect());
    };
    if list.len() > equations::solve::MAX_UNKNOWNS {
        return Err(InputError::new(
            "too-many-unknowns",
            format!(
                "{} unknowns asked for; at most {} are solved together",
                list.len(),
                equations::solve::MAX_UNKNOWNS
            ),
        ));
    }
    let mut out = Vec::with_capacity(list.len());
    for (i, item) in list.iter().enumerate() {
        let place = format!("{}.unknowns[{i}]", f.place);
        match item {
            Value::String(name) => out.push(UnknownSpec::named(name)),
            Value::Object(m) => {
                let u = Fields::new(m, place);
                u.only(&["name", "guesses", "bounds"])?;
                out.push(UnknownSpec {
                    name: u.required_string("name")?.to_string(),
                    guesses: u.finite_pair("guesses")?,
                    bounds: u.bounds("bounds")?,
                });
            }
            other => {
                return Err(bad(format!(
                    "{place} must be a name or {{name, guesses, bounds}}, got {}",
                    describe(other)
                )))
            }
        }
    }
    Ok(out)
}

/// System history rows `(k, x, residual norm, kind)` as JSON.
fn system_rows<'a>(rows: impl Iterator<Item = (usize, &'a [f64], f64, StepKind)>) -> Value {
    Value::Array(
        rows.map(|(k, x, norm, kind)| {
            json!({
                "k": k,
                "x": nums(x),
                "residualNorm": num(norm),
                "kind": kind.code(),
            })
        })
        .collect(),
    )
}

fn system_history_value(rows: &[SystemHistoryRow]) -> Value {
    system_rows(
        rows.iter()
            .map(|r| (r.k, r.x.as_slice(), r.residual_norm, r.kind)),
    )
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

fn named_values(pairs: &[(String, f64)]) -> Value {
    Value::Object(pairs.iter().map(|(n, v)| (n.clone(), num(*v))).collect())
}

/// A [`SetSolution`] as a JSON object.
pub fn set_solution_value(s: &SetSolution) -> Value {
    let root = match s.unknowns.as_slice() {
        [(_, v)] => num(*v),
        _ => Value::Null,
    };
    json!({
        "unknowns": named_values(&s.unknowns),
        "root": root,
        "residual": num(max_abs(&s.residuals)),
        "residuals": nums(&s.residuals),
        "converged": s.converged,
        "status": s.status.code(),
        "message": s.status.diagnosis(),
        "evaluations": s.evaluations,
        "iterations": s.iterations,
        "bracket": pair_value(s.scalar.as_ref().and_then(|x| x.bracket)),
        "certificate": certificate_value(match s.blocks.as_slice() {
            [only] => only.certificate.as_ref(),
            _ => None,
        }),
        "history": history_value(s.scalar.as_ref().map_or(&[], |x| &x.history)),
        "historyDropped": s.scalar.as_ref().map_or(0, |x| x.history_dropped),
        "systemHistory": system_history_value(s.system.as_ref().map_or(&[], |x| &x.history)),
        "definitions": named_values(&s.definitions),
        "sensitivities": Value::Array(s.sensitivities.iter().map(|d| json!({
            "unknown": d.unknown,
            "input": d.input,
            "derivative": num(d.derivative),
            "relative": num(d.relative),
        })).collect()),
        "sensitivityEvaluations": s.sensitivity_evaluations,
        "blocks": Value::Array(s.blocks.iter().map(|b| json!({
            "unknowns": b.unknowns,
            "equations": b.equations,
            "converged": b.converged,
            "status": b.status.code(),
            "evaluations": b.evaluations,
            "iterations": b.iterations,
            "certificate": certificate_value(b.certificate.as_ref()),
        })).collect()),
    })
}

const EQUATION_FIELDS: [&str; 8] = [
    "equations",
    "knowns",
    "unknowns",
    "units",
    "method",
    "tolerances",
    "history",
    "sensitivities",
];

/// `{name: unit text}`, names kept in the order given.
fn unit_map(f: &Fields, key: &str) -> Result<Vec<(String, String)>, InputError> {
    let Some(obj) = f.object(key)? else {
        return Ok(Vec::new());
    };
    obj.map
        .iter()
        .map(|(name, v)| match v {
            Value::String(unit) => Ok((name.clone(), unit.clone())),
            other => Err(bad(format!(
                "{} must be a unit such as \"m\" or \"gpm\", got {}",
                obj.at(name),
                describe(other)
            ))),
        })
        .collect()
}

/// Solves a text equation or set: `{equations, knowns?, unknowns?, units?, method?,
/// tolerances?, history?, sensitivities?}`. With `units` (`{name: unit}`), values,
/// guesses and bounds are in those units, the dimensions are checked, the solve runs
/// in SI and the results come back in those units (see `equations::quantities`).
pub fn solve_equation(request: &str) -> Result<String, InputError> {
    let map = parse_request(request)?;
    let f = Fields::new(&map, "request");
    f.only(&EQUATION_FIELDS)?;
    let set = parse_set(f.required_string("equations")?)?;
    let knowns = f.number_map("knowns")?;
    let unknowns = read_unknowns(&f, &set, &knowns)?;
    let options = read_options(&f, None)?;
    let units = unit_map(&f, "units")?;
    let named: Vec<&str> = knowns
        .iter()
        .map(|(n, _)| n.as_str())
        .chain(unknowns.iter().map(|u| u.name.as_str()))
        .collect();
    let checked = VariableUnits::new(&set, &units, &named)?;
    let solution = quantities::solve_in_units(
        &set,
        &knowns,
        &unknowns,
        &options,
        f.boolean("sensitivities")?,
        &checked,
    )?;
    let mut value = set_solution_value(&solution);
    if let (Value::Object(out), false) = (&mut value, units.is_empty()) {
        let echo = units.into_iter().map(|(n, u)| (n, Value::String(u)));
        out.insert("units".into(), Value::Object(echo.collect()));
    }
    Ok(text_of(value))
}

// ---------------------------------------------------------------------------------------
// Sweeps

/// Most points in one sweep.
pub const MAX_SWEEP_POINTS: usize = 100_000;

const SWEEP_FIELDS: [&str; 11] = [
    "equations",
    "knowns",
    "unknown",
    "input",
    "from",
    "to",
    "points",
    "guesses",
    "bounds",
    "method",
    "tolerances",
];

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

/// Solves one unknown at evenly spaced values of one known, each solve starting from
/// the previous root: `{equations, knowns?, unknown?, input, from, to, points, guesses?,
/// bounds?, method?, tolerances?}` gives arrays `input`, `root`, `status`, `converged`,
/// `evaluations`.
pub fn sweep(request: &str) -> Result<String, InputError> {
    let map = parse_request(request)?;
    let f = Fields::new(&map, "request");
    f.only(&SWEEP_FIELDS)?;
    let set = parse_set(f.required_string("equations")?)?;
    let input = f.required_string("input")?;
    let mut knowns: Vec<(String, f64)> = f
        .number_map("knowns")?
        .into_iter()
        .filter(|(n, _)| n != input)
        .collect();
    let given: Vec<&str> = knowns
        .iter()
        .map(|(n, _)| n.as_str())
        .chain([input])
        .collect();
    let unknown = the_one_unknown(&f, &set, &given)?;
    let from = f.required_finite("from")?;
    let to = f.required_finite("to")?;
    let points = f
        .count("points", 2, MAX_SWEEP_POINTS)?
        .ok_or_else(|| bad("request.points is missing"))?;
    let mut options = read_options(&f, Some("bounds"))?;
    options.record_history = false;
    let first = match f.finite_pair("guesses")? {
        Some(g) => g,
        None => equations::default_guesses(options.bounds),
    };
    crate::methods::validate(Start::Guesses(first.0, first.1), &options)?;
    knowns.push((input.to_string(), from));
    let slot = knowns.len() - 1;

    let mut xs = Vec::with_capacity(points);
    let mut roots = Vec::with_capacity(points);
    let mut statuses = Vec::with_capacity(points);
    let mut converged = Vec::with_capacity(points);
    let mut evaluations = Vec::with_capacity(points);
    let mut last: Option<f64> = None;
    let mut before: Option<f64> = None;
    for i in 0..points {
        let value = if i + 1 == points {
            to
        } else {
            from + (to - from) * (i as f64 / (points - 1) as f64)
        };
        knowns[slot].1 = value;
        let mut residual = set.residual_fn(&knowns, &unknown)?;
        let (a, b) = last
            .and_then(|r| continuation_guesses(r, before, options.bounds))
            .unwrap_or(first);
        let s = crate::stepper::solve(Start::Guesses(a, b), &options, erase(&mut residual))
            .map_err(|e| InputError {
                message: format!("at {input} = {value}: {}", e.message),
                ..e
            })?;
        if s.converged {
            before = last;
            last = Some(s.root);
        } else {
            before = None;
            last = None;
        }
        xs.push(value);
        roots.push(s.root);
        statuses.push(s.status.code());
        converged.push(s.converged);
        evaluations.push(s.evaluations);
    }
    Ok(text_of(json!({
        "input": nums(&xs),
        "root": nums(&roots),
        "status": statuses,
        "converged": converged,
        "evaluations": evaluations,
        "totalEvaluations": evaluations.iter().sum::<usize>(),
        "unknown": unknown,
        "inputName": input,
    })))
}

// ---------------------------------------------------------------------------------------
// All roots in a range

const ROOTS_FIELDS: [&str; 6] = [
    "range",
    "equations",
    "knowns",
    "unknown",
    "samples",
    "tolerances",
];

fn scan_setup(f: &Fields) -> Result<(f64, f64, ScanOptions), InputError> {
    let (lo, hi) = f
        .finite_pair("range")?
        .ok_or_else(|| bad(format!("{}.range is missing: give [lower, upper]", f.place)))?;
    let mut scan = ScanOptions {
        tol: read_tolerances(f)?,
        ..ScanOptions::default()
    };
    if let Some(n) = f.count("samples", 3, roots_in_range::MAX_SAMPLES)? {
        scan.samples = n;
    }
    Ok((lo, hi, scan))
}

fn range_roots_value(r: &RangeRoots) -> Value {
    json!({
        "roots": Value::Array(r.roots.iter().map(|root| json!({
            "x": num(root.x),
            "fx": num(root.fx),
            "kind": root.kind.code(),
            "converged": root.converged,
            "certificate": certificate_value(root.certificate.as_ref()),
        })).collect()),
        "discontinuities": Value::Array(r.discontinuities.iter().map(|&b| pair_value(Some(b))).collect()),
        "evaluations": r.evaluations,
        "samples": r.samples,
        "spacing": num(r.spacing),
        "limits": r.limits,
    })
}

/// All roots in a range of a text equation with one unknown: `{range, equations,
/// knowns?, unknown?, samples?, tolerances?}`.
pub fn find_roots(request: &str) -> Result<String, InputError> {
    let map = parse_request(request)?;
    let f = Fields::new(&map, "request");
    f.only(&ROOTS_FIELDS)?;
    let set = parse_set(f.required_string("equations")?)?;
    let knowns = f.number_map("knowns")?;
    let given: Vec<&str> = knowns.iter().map(|(n, _)| n.as_str()).collect();
    let unknown = the_one_unknown(&f, &set, &given)?;
    let (lo, hi, scan) = scan_setup(&f)?;
    let mut residual = set.residual_fn(&knowns, &unknown)?;
    let found = roots_in_range::roots_in_range(lo, hi, &scan, erase(&mut residual))?;
    Ok(text_of(range_roots_value(&found)))
}

/// All roots in a range of a Rust closure (the native counterpart of `findRoots` with a
/// JS function): `{range, samples?, tolerances?}`.
pub fn find_roots_function(
    request: &str,
    mut f: impl FnMut(f64) -> f64,
) -> Result<String, InputError> {
    let map = parse_request(request)?;
    let fields = Fields::new(&map, "request");
    fields.only(&["range", "samples", "tolerances"])?;
    let (lo, hi, scan) = scan_setup(&fields)?;
    let found = roots_in_range::roots_in_range(lo, hi, &scan, erase(&mut f))?;
    Ok(text_of(range_roots_value(&found)))
}

// ---------------------------------------------------------------------------------------
// Systems of a callback

/// Most unknowns of a system given as a function.
pub const MAX_SYSTEM_UNKNOWNS: usize = 200;

/// A system solution as a JSON object.
pub fn system_solution_value(s: &broyden::SystemSolution) -> Value {
    json!({
        "roots": nums(&s.x),
        "residuals": nums(&s.residuals),
        "residual": num(max_abs(&s.residuals)),
        "converged": s.converged,
        "status": s.status.code(),
        "message": s.status.diagnosis(),
        "evaluations": s.evaluations,
        "iterations": s.iterations,
        "certificate": certificate_value(s.certificate.as_ref()),
        "history": system_rows(s.history.iter().map(|r| (r.k, r.x.as_slice(), r.residual_norm, r.kind))),
        "historyDropped": s.history_dropped,
    })
}

/// Solves F(x) = 0 for n unknowns given as a closure filling n residuals:
/// `{x0, tolerances?, bounds?, history?}`.
pub fn solve_system_function(
    request: &str,
    mut f: impl FnMut(&[f64], &mut [f64]),
) -> Result<String, InputError> {
    let map = parse_request(request)?;
    let fields = Fields::new(&map, "options");
    fields.only(&["x0", "tolerances", "bounds", "history"])?;
    let list = fields
        .array("x0")?
        .ok_or_else(|| bad("options.x0 is missing: give one starting value per unknown"))?;
    if list.is_empty() || list.len() > MAX_SYSTEM_UNKNOWNS {
        return Err(bad(format!(
            "options.x0 has {} values; give 1 to {MAX_SYSTEM_UNKNOWNS}",
            list.len()
        )));
    }
    let x0 = list
        .iter()
        .enumerate()
        .map(|(i, v)| finite_value(v, &format!("options.x0[{i}]")))
        .collect::<Result<Vec<f64>, _>>()?;
    let bounds = match fields.array("bounds")? {
        None => Vec::new(),
        Some(b) if b.len() == x0.len() => b
            .iter()
            .enumerate()
            .map(|(i, v)| bounds_value(v, &format!("options.bounds[{i}]")))
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
        tol: read_tolerances(&fields)?,
        bounds,
        record_history: fields.boolean("history")?,
    };
    let solution =
        broyden::solve_system(&x0, &options, &mut f as &mut dyn FnMut(&[f64], &mut [f64]))?;
    Ok(text_of(system_solution_value(&solution)))
}

// ---------------------------------------------------------------------------------------
// Templates

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

fn camel_keys(v: Value) -> Value {
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
pub fn catalogue() -> String {
    let value = serde_json::to_value(templates::all()).unwrap_or(Value::Array(Vec::new()));
    text_of(camel_keys(value))
}

const TEMPLATE_FIELDS: [&str; 11] = [
    "id",
    "useScenarioDefaults",
    "branch",
    "values",
    "unknown",
    "resultUnit",
    "guesses",
    "method",
    "tolerances",
    "history",
    "sensitivities",
];

/// Longest template id or symbol accepted, in characters.
const MAX_NAME_CHARS: usize = 200;

fn short_name<'a>(s: &'a str, place: &str) -> Result<&'a str, InputError> {
    let n = s.chars().count();
    if n > MAX_NAME_CHARS {
        return Err(bad(format!(
            "{place} is {n} characters long; the limit is {MAX_NAME_CHARS}"
        )));
    }
    Ok(s)
}

/// One given value: `{value, unit}`, `[value, unit]`, or a bare number in the
/// variable's default unit.
fn template_value(
    v: &Value,
    place: &str,
    default_unit: Option<&str>,
) -> Result<(f64, String), InputError> {
    match v {
        Value::Object(m) => {
            let f = Fields::new(m, place);
            f.only(&["value", "unit"])?;
            let unit = f.required_string("unit")?;
            check_unit_text(unit, place)?;
            Ok((f.required_finite("value")?, unit.to_string()))
        }
        Value::Array(a) if a.len() == 2 => {
            let value = finite_value(&a[0], &format!("{place}[0]"))?;
            let unit = a[1].as_str().ok_or_else(|| {
                bad(format!(
                    "{place}[1] must be a unit string, got {}",
                    describe(&a[1])
                ))
            })?;
            check_unit_text(unit, place)?;
            Ok((value, unit.to_string()))
        }
        Value::Number(_) | Value::String(_) => {
            let value = finite_value(v, place)?;
            let unit = default_unit.ok_or_else(|| {
                InputError::new(
                    "unknown-variable",
                    format!("{place} names no variable of this template"),
                )
            })?;
            Ok((value, unit.to_string()))
        }
        other => Err(bad(format!(
            "{place} must be {{value, unit}}, [value, unit] or a number, got {}",
            describe(other)
        ))),
    }
}

fn template_values(f: &Fields, id: &str) -> Result<Vec<(String, f64, String)>, InputError> {
    let template = templates::find(id);
    let unit_of = |symbol: &str| {
        template
            .and_then(|t| t.variable(symbol))
            .map(|v| v.unit.as_str())
    };
    let mut out = Vec::new();
    match f.get("values") {
        None => {}
        Some(Value::Object(m)) => {
            let list = template.and_then(|t| t.list.as_ref());
            for (symbol, v) in m {
                let place = format!("request.values.{}", short_name(symbol, "a symbol")?);
                // The list input (cash flows) takes a list of numbers in its default unit.
                if let (Some(list), Value::Array(items)) = (list, v) {
                    if &list.symbol == symbol && items.iter().all(Value::is_number) {
                        for (i, item) in items.iter().enumerate() {
                            let value = finite_value(item, &format!("{place}[{i}]"))?;
                            out.push((symbol.clone(), value, list.unit.clone()));
                        }
                        continue;
                    }
                }
                let (value, unit) = template_value(v, &place, unit_of(symbol))?;
                out.push((symbol.clone(), value, unit));
            }
        }
        Some(Value::Array(items)) => {
            for (i, item) in items.iter().enumerate() {
                let place = format!("request.values[{i}]");
                let Value::Object(m) = item else {
                    return Err(bad(format!(
                        "{place} must be {{symbol, value, unit}}, got {}",
                        describe(item)
                    )));
                };
                let g = Fields::new(m, place.clone());
                g.only(&["symbol", "value", "unit"])?;
                let symbol = short_name(g.required_string("symbol")?, &place)?;
                let value = g.required_finite("value")?;
                let unit = match g.string("unit")? {
                    Some(u) => u,
                    None => unit_of(symbol).ok_or_else(|| {
                        InputError::new(
                            "unknown-variable",
                            format!("{place}.symbol names no variable of this template"),
                        )
                    })?,
                };
                check_unit_text(unit, &place)?;
                out.push((symbol.to_string(), value, unit.to_string()));
            }
        }
        Some(other) => {
            return Err(bad(format!(
                "request.values must be an object {{symbol: {{value, unit}}}} or a list, got {}",
                describe(other)
            )))
        }
    }
    Ok(out)
}

/// A [`TemplateSolution`] as a JSON object: the set solution (unknowns in SI) with
/// `root`/`value` in the result unit, `unit`, `branch` (the label of the root, or
/// null), `otherRoots` (`[{value, label}]`), `scanEvaluations`, `notes`, `caution`,
/// `outputs`.
pub fn template_solution_value(s: &TemplateSolution) -> Value {
    let mut v = set_solution_value(&s.solution);
    if let Value::Object(m) = &mut v {
        m.insert("root".into(), num(s.value));
        m.insert("value".into(), num(s.value));
        m.insert("unit".into(), json!(s.unit));
        m.insert("branch".into(), json!(s.branch));
        m.insert(
            "otherRoots".into(),
            Value::Array(
                s.other_roots
                    .iter()
                    .map(|r| json!({"value": num(r.value), "label": r.label}))
                    .collect(),
            ),
        );
        m.insert("scanEvaluations".into(), json!(s.scan_evaluations));
        m.insert("notes".into(), json!(s.notes));
        m.insert("caution".into(), json!(s.caution));
        m.insert(
            "outputs".into(),
            Value::Array(
                s.outputs
                    .iter()
                    .map(|o| json!({"symbol": o.symbol, "meaning": o.meaning, "value": num(o.value), "unit": o.unit}))
                    .collect(),
            ),
        );
    }
    v
}

/// Reads a template request (the JSON of `solveTemplate`).
pub fn template_request(request: &str) -> Result<TemplateRequest, InputError> {
    let map = parse_request(request)?;
    let f = Fields::new(&map, "request");
    f.only(&TEMPLATE_FIELDS)?;
    let id = short_name(f.required_string("id")?, "request.id")?;
    let unknown = short_name(f.required_string("unknown")?, "request.unknown")?;
    let result_unit = f.string("resultUnit")?;
    if let Some(u) = result_unit {
        check_unit_text(u, "the result")?;
    }
    Ok(TemplateRequest {
        id: id.to_string(),
        values: template_values(&f, id)?,
        unknown: unknown.to_string(),
        result_unit: result_unit.map(str::to_string),
        guesses: f.finite_pair("guesses")?,
        options: read_options(&f, None)?,
        sensitivities: f.boolean("sensitivities")?,
        branch: match f.string("branch")? {
            Some(b) => Some(short_name(b, "request.branch")?.to_string()),
            None => None,
        },
        use_scenario_defaults: f.boolean("useScenarioDefaults")?,
    })
}

/// Solves a bundled template: `{id, values, unknown, resultUnit?, guesses?, branch?,
/// method?, tolerances?, history?, sensitivities?}`.
pub fn solve_template(request: &str) -> Result<String, InputError> {
    let req = template_request(request)?;
    let solution = templates::solve_template(&req)?;
    Ok(text_of(template_solution_value(&solution)))
}
