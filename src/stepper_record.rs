//! The JSON record of an ask–tell [`Stepper`]: its set-up and every value told so far.
//!
//! Non-finite numbers are written as the strings `"NaN"`, `"Infinity"` and
//! `"-Infinity"`, since JSON has no such numbers. Restoring replays the told values
//! through a fresh method and checks that each saved point is the one the method asks for.

use serde_json::{json, Map, Value};

use crate::error::InputError;
use crate::methods::{MethodKind, Options, Start};
use crate::stepper::Stepper;
use crate::tolerances::MAX_EVALS;
use crate::tolerances::{Bounds, Tolerances};

const FORMAT: &str = "tacit-stepper";
/// Version 2: claims of convergence are checked by the driver, which may ask for
/// checking points, and the methods treat infinite values and NaN gaps differently.
/// Version 3: the bracketing hybrid (also inside `auto`) follows a schedule that bounds
/// its evaluations and takes multiple-root steps, so it asks for other points.
const VERSION: u64 = 3;

fn num(v: f64) -> Value {
    if v.is_nan() {
        json!("NaN")
    } else if v == f64::INFINITY {
        json!("Infinity")
    } else if v == f64::NEG_INFINITY {
        json!("-Infinity")
    } else {
        json!(v)
    }
}

fn bad(what: impl Into<String>) -> InputError {
    InputError::new(
        "bad-saved-stepper",
        format!("saved stepper is not valid: {}", what.into()),
    )
}

fn read_num(v: &Value, place: &str) -> Result<f64, InputError> {
    match v {
        Value::Number(n) => n
            .as_f64()
            .ok_or_else(|| bad(format!("{place} is not a number"))),
        Value::String(s) => match s.as_str() {
            "NaN" => Ok(f64::NAN),
            "Infinity" => Ok(f64::INFINITY),
            "-Infinity" => Ok(f64::NEG_INFINITY),
            _ => Err(bad(format!("{place} is the string \"{s}\", not a number"))),
        },
        _ => Err(bad(format!("{place} is missing or not a number"))),
    }
}

fn field<'a>(obj: &'a Map<String, Value>, key: &str) -> Result<&'a Value, InputError> {
    obj.get(key)
        .ok_or_else(|| bad(format!("field \"{key}\" is missing")))
}

fn pair(v: &Value, place: &str) -> Result<(f64, f64), InputError> {
    match v.as_array().map(|a| a.as_slice()) {
        Some([a, b]) => Ok((
            read_num(a, &format!("{place}[0]"))?,
            read_num(b, &format!("{place}[1]"))?,
        )),
        _ => Err(bad(format!("{place} must be a list of two numbers"))),
    }
}

pub(crate) fn save(stepper: &Stepper) -> String {
    let o = stepper.options();
    let (start_key, (a, b)) = match stepper.start() {
        Start::Guesses(a, b) => ("guesses", (a, b)),
        Start::Bracket(a, b) => ("bracket", (a, b)),
    };
    let points: Vec<Value> = stepper
        .told()
        .iter()
        .map(|&(x, fx)| json!([num(x), num(fx)]))
        .collect();
    json!({
        "format": FORMAT,
        "version": VERSION,
        "method": o.method.code(),
        "start": { start_key: [num(a), num(b)] },
        "tolerances": {
            "x_abs": num(o.tol.x_abs),
            "x_rel": num(o.tol.x_rel),
            "f_abs": num(o.tol.f_abs),
            "max_evals": o.tol.max_evals,
        },
        "bounds": [num(o.bounds.lo), num(o.bounds.hi)],
        "history": o.record_history,
        "points": points,
    })
    .to_string()
}

pub(crate) fn restore(text: &str) -> Result<Stepper, InputError> {
    let value: Value = serde_json::from_str(text).map_err(|e| bad(format!("not JSON ({e})")))?;
    let obj = value
        .as_object()
        .ok_or_else(|| bad("the top level is not an object"))?;
    if field(obj, "format")?.as_str() != Some(FORMAT) {
        return Err(bad(format!("field \"format\" is not \"{FORMAT}\"")));
    }
    if field(obj, "version")?.as_u64() != Some(VERSION) {
        return Err(bad(format!("field \"version\" is not {VERSION}")));
    }
    let method = MethodKind::from_code(
        field(obj, "method")?
            .as_str()
            .ok_or_else(|| bad("field \"method\" is not a string"))?,
    )
    .map_err(|e| bad(e.message))?;
    let start_obj = field(obj, "start")?
        .as_object()
        .ok_or_else(|| bad("field \"start\" is not an object"))?;
    let start = if let Some(g) = start_obj.get("guesses") {
        let (a, b) = pair(g, "start.guesses")?;
        Start::Guesses(a, b)
    } else if let Some(g) = start_obj.get("bracket") {
        let (a, b) = pair(g, "start.bracket")?;
        Start::Bracket(a, b)
    } else {
        return Err(bad(
            "field \"start\" has neither \"guesses\" nor \"bracket\"",
        ));
    };
    let t = field(obj, "tolerances")?
        .as_object()
        .ok_or_else(|| bad("field \"tolerances\" is not an object"))?;
    let max_evals = field(t, "max_evals")?
        .as_u64()
        .filter(|&n| n <= MAX_EVALS as u64)
        .ok_or_else(|| {
            bad(format!(
                "tolerances.max_evals is not a whole number up to {MAX_EVALS}"
            ))
        })? as usize;
    let tol = Tolerances {
        x_abs: read_num(field(t, "x_abs")?, "tolerances.x_abs")?,
        x_rel: read_num(field(t, "x_rel")?, "tolerances.x_rel")?,
        f_abs: read_num(field(t, "f_abs")?, "tolerances.f_abs")?,
        max_evals,
    };
    let (lo, hi) = pair(field(obj, "bounds")?, "bounds")?;
    let record_history = field(obj, "history")?
        .as_bool()
        .ok_or_else(|| bad("field \"history\" is not true or false"))?;
    let options = Options {
        method,
        tol,
        bounds: Bounds { lo, hi },
        record_history,
    };
    let points = field(obj, "points")?
        .as_array()
        .ok_or_else(|| bad("field \"points\" is not a list"))?;
    let mut stepper = Stepper::new(start, &options).map_err(|e| bad(e.message))?;
    for (i, p) in points.iter().enumerate() {
        let (x, fx) = pair(p, &format!("points[{i}]"))?;
        match stepper.next_point() {
            Some(asked) if asked.to_bits() == x.to_bits() => stepper.tell(fx)?,
            Some(asked) => {
                return Err(bad(format!(
                    "points[{i}] was saved at x = {x}, but replaying the solve asks for x = {asked}; the record was changed"
                )))
            }
            None => {
                return Err(bad(format!(
                    "points[{i}] comes after the solve had already finished; the record was changed"
                )))
            }
        }
    }
    Ok(stepper)
}
