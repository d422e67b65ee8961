//! The wasm32 binding layer: converts JavaScript values, calls [`crate::api`], and turns
//! [`InputError`]s into JavaScript `Error`s with a stable `code` (and `position` for
//! equation errors). No numerical logic lives here.
//!
//! Every export takes `JsValue`s and checks their types itself, so that calling the raw
//! exports with anything at all gives an error, never a trap. Calls into JavaScript
//! (the callbacks of `solveSystemFunction` and `findRootsFunction`) go through imports
//! that catch exceptions, so a throwing callback cannot unwind through Rust frames.
//!
//! The panic hook reports any panic that remains (a bug) with its message: on the
//! console, and through `lastPanic()` for the JavaScript wrapper, which turns the trap
//! that follows into a `TacitError` with code `internal-panic`.

use std::cell::RefCell;

use js_sys::{Float64Array, Function, Reflect};
use wasm_bindgen::prelude::*;
use wasm_bindgen::JsCast;

use crate::api;
use crate::error::InputError;

#[wasm_bindgen]
extern "C" {
    #[wasm_bindgen(js_namespace = console, js_name = error)]
    fn console_error(message: &str);
}

thread_local! {
    static LAST_PANIC: RefCell<Option<String>> = const { RefCell::new(None) };
    /// Solves running now, one inside another's callback when above 1.
    static DEPTH: std::cell::Cell<usize> = const { std::cell::Cell::new(0) };
}

/// Solves that may run one inside another's callback (a callback that itself starts a
/// solve). Each level holds Rust frames on the wasm stack, which would overflow (a trap
/// that kills the instance) at about a thousand levels.
pub const MAX_NESTING: usize = 32;

/// Counts a solve that calls back into JavaScript for as long as it runs.
struct Nesting;

impl Nesting {
    fn enter() -> Result<Nesting, JsValue> {
        let depth = DEPTH.with(|d| d.get());
        if depth >= MAX_NESTING {
            return Err(to_js(InputError::new(
                "nesting-too-deep",
                format!(
                    "solves nested {MAX_NESTING} deep (a callback that starts a solve, whose callback starts another…); at most {MAX_NESTING} levels are allowed"
                ),
            )));
        }
        DEPTH.with(|d| d.set(depth + 1));
        Ok(Nesting)
    }
}

impl Drop for Nesting {
    fn drop(&mut self) {
        DEPTH.with(|d| d.set(d.get().saturating_sub(1)));
    }
}

#[wasm_bindgen(start)]
fn install_panic_hook() {
    std::panic::set_hook(Box::new(|info| {
        let message = format!("tacit: internal error (please report): {info}");
        console_error(&message);
        LAST_PANIC.with(|slot| {
            if let Ok(mut slot) = slot.try_borrow_mut() {
                *slot = Some(message);
            }
        });
    }));
}

/// The message of the last panic, if one happened. After a panic the instance must be
/// replaced; the wrapper reads this to say why.
#[wasm_bindgen(js_name = lastPanic)]
pub fn last_panic() -> Option<String> {
    LAST_PANIC.with(|slot| slot.try_borrow().ok().and_then(|s| s.clone()))
}

/// The crate version.
#[wasm_bindgen(js_name = version)]
pub fn version() -> String {
    env!("CARGO_PKG_VERSION").to_string()
}

fn set(target: &JsValue, key: &str, value: &JsValue) {
    // Setting a property of a fresh Error object cannot fail; ignore the Result anyway.
    let _ = Reflect::set(target, &JsValue::from_str(key), value);
}

/// An `InputError` as a JavaScript `Error` with `code` and, when known, `position`.
fn to_js(e: InputError) -> JsValue {
    let err = js_sys::Error::new(&e.message);
    err.set_name("TacitError");
    let value: JsValue = err.into();
    set(&value, "code", &JsValue::from_str(e.code));
    if let Some(p) = e.position {
        set(&value, "position", &JsValue::from_f64(p as f64));
    }
    value
}

fn type_name(v: &JsValue) -> String {
    v.js_typeof()
        .as_string()
        .unwrap_or_else(|| "unknown".into())
}

fn wrong_type(what: &str, expected: &str, got: &JsValue) -> JsValue {
    to_js(InputError::new(
        "bad-type",
        format!("{what} must be {expected}, got {}", type_name(got)),
    ))
}

fn string_arg(v: &JsValue, what: &str) -> Result<String, JsValue> {
    v.as_string().ok_or_else(|| wrong_type(what, "a string", v))
}

fn number_arg(v: &JsValue, what: &str) -> Result<f64, JsValue> {
    v.as_f64().ok_or_else(|| wrong_type(what, "a number", v))
}

fn function_arg(v: JsValue, what: &str) -> Result<Function, JsValue> {
    v.dyn_into::<Function>()
        .map_err(|v| wrong_type(what, "a function", &v))
}

fn json_call(
    request: &JsValue,
    call: impl FnOnce(&str) -> Result<String, InputError>,
) -> Result<String, JsValue> {
    let request = string_arg(request, "the request (a JSON string)")?;
    call(&request).map_err(to_js)
}

/// A failed callback: the JavaScript value it threw, or a description of its bad answer.
enum CallbackFailure {
    Threw(JsValue),
    Bad(String),
}

fn callback_error(failure: CallbackFailure) -> JsValue {
    match failure {
        CallbackFailure::Threw(thrown) => {
            // A nested solve that was refused for its depth: pass that error on as it
            // is, so the outermost caller learns why.
            let code = Reflect::get(&thrown, &JsValue::from_str("code"))
                .ok()
                .and_then(|c| c.as_string());
            if code.as_deref() == Some("nesting-too-deep") {
                return thrown;
            }
            let detail = thrown
                .dyn_ref::<js_sys::Error>()
                .and_then(|e| e.message().as_string())
                .or_else(|| thrown.as_string())
                .unwrap_or_else(|| type_name(&thrown));
            let err = to_js(InputError::new(
                "callback-threw",
                format!("the function threw an exception: {detail}"),
            ));
            set(&err, "cause", &thrown);
            err
        }
        CallbackFailure::Bad(message) => to_js(InputError::new("callback-bad-value", message)),
    }
}

// ---------------------------------------------------------------------------------------
// Requests as JSON text

#[wasm_bindgen(js_name = solveEquation)]
pub fn solve_equation(request: JsValue) -> Result<String, JsValue> {
    json_call(&request, api::solve_equation)
}

#[wasm_bindgen(js_name = solveTemplate)]
pub fn solve_template(request: JsValue) -> Result<String, JsValue> {
    json_call(&request, api::solve_template)
}

/// Every template with its full metadata, as JSON.
#[wasm_bindgen(js_name = catalogue)]
pub fn catalogue() -> String {
    api::catalogue()
}

#[wasm_bindgen(js_name = sweep)]
pub fn sweep(request: JsValue) -> Result<String, JsValue> {
    json_call(&request, api::sweep)
}

#[wasm_bindgen(js_name = findRoots)]
pub fn find_roots(request: JsValue) -> Result<String, JsValue> {
    json_call(&request, api::find_roots)
}

/// `{ok, variables, definitions, equations}` or `{ok: false, code, message, position, caret}`.
#[wasm_bindgen(js_name = checkEquation)]
pub fn check_equation(text: JsValue) -> Result<String, JsValue> {
    let text = string_arg(&text, "the equation text")?;
    Ok(api::check_equation(&text))
}

// ---------------------------------------------------------------------------------------
// Scalar and system callbacks

/// Solves F(x) = 0 for a JavaScript `F(x: Float64Array) => Float64Array` (the wrapper
/// adapts plain arrays). After the first failed call F is not called again.
#[wasm_bindgen(js_name = solveSystemFunction)]
pub fn solve_system_function(f: JsValue, request: JsValue) -> Result<String, JsValue> {
    let _nesting = Nesting::enter()?;
    let f = function_arg(f, "F")?;
    let request = string_arg(&request, "the options (a JSON string)")?;
    let mut failure: Option<CallbackFailure> = None;
    let result = api::solve_system_function(&request, |x, out| {
        if failure.is_none() {
            match f.call1(&JsValue::UNDEFINED, &Float64Array::from(x).into()) {
                Ok(v) => match v.dyn_into::<Float64Array>() {
                    Ok(a) if a.length() as usize == out.len() => {
                        a.copy_to(out);
                        return;
                    }
                    Ok(a) => {
                        failure = Some(CallbackFailure::Bad(format!(
                            "F returned {} values for {} unknowns",
                            a.length(),
                            out.len()
                        )))
                    }
                    Err(v) => {
                        failure = Some(CallbackFailure::Bad(format!(
                            "F must return a Float64Array, got {}",
                            type_name(&v)
                        )))
                    }
                },
                Err(thrown) => failure = Some(CallbackFailure::Threw(thrown)),
            }
        }
        out.fill(f64::NAN);
    });
    if let Some(failure) = failure {
        return Err(callback_error(failure));
    }
    result.map_err(to_js)
}

/// All roots in a range of a JavaScript `f(x: number) => number`. After the first failed
/// call f is not called again.
#[wasm_bindgen(js_name = findRootsFunction)]
pub fn find_roots_function(f: JsValue, request: JsValue) -> Result<String, JsValue> {
    let _nesting = Nesting::enter()?;
    let f = function_arg(f, "f")?;
    let request = string_arg(&request, "the request (a JSON string)")?;
    let mut failure: Option<CallbackFailure> = None;
    let result = api::find_roots_function(&request, |x| {
        if failure.is_some() {
            return f64::NAN;
        }
        match f.call1(&JsValue::UNDEFINED, &JsValue::from_f64(x)) {
            Ok(v) => match v.as_f64() {
                Some(fx) => return fx,
                None => {
                    failure = Some(CallbackFailure::Bad(format!(
                        "f({x}) must return a number, got {}",
                        type_name(&v)
                    )))
                }
            },
            Err(thrown) => failure = Some(CallbackFailure::Threw(thrown)),
        }
        f64::NAN
    });
    if let Some(failure) = failure {
        return Err(callback_error(failure));
    }
    result.map_err(to_js)
}

// ---------------------------------------------------------------------------------------
// The ask–tell stepper

/// The ask–tell stepper; the wrapper's `Stepper` class holds one.
#[wasm_bindgen(js_name = StepperHandle)]
pub struct StepperHandle(api::StepperSession);

#[wasm_bindgen(js_class = StepperHandle)]
impl StepperHandle {
    pub fn create(request: JsValue) -> Result<StepperHandle, JsValue> {
        let request = string_arg(&request, "the stepper options (a JSON string)")?;
        api::StepperSession::create(&request)
            .map(StepperHandle)
            .map_err(to_js)
    }

    pub fn restore(json: JsValue) -> Result<StepperHandle, JsValue> {
        let json = string_arg(&json, "the saved stepper (a JSON string)")?;
        api::StepperSession::restore(&json)
            .map(StepperHandle)
            .map_err(to_js)
    }

    /// The x to evaluate next, or undefined when done.
    pub fn next(&self) -> Option<f64> {
        self.0.next_point()
    }

    /// The kind of step behind the pending point.
    #[wasm_bindgen(js_name = nextKind)]
    pub fn next_kind(&self) -> Option<String> {
        self.0.next_kind().map(|k| k.code().to_string())
    }

    pub fn tell(&mut self, fx: JsValue) -> Result<(), JsValue> {
        let fx = number_arg(&fx, "the value told")?;
        self.0.tell(fx).map_err(to_js)
    }

    #[wasm_bindgen(getter)]
    pub fn done(&self) -> bool {
        self.0.is_done()
    }

    #[wasm_bindgen(getter)]
    pub fn evaluations(&self) -> usize {
        self.0.evaluations()
    }

    /// The result as JSON once done.
    pub fn result(&self) -> Option<String> {
        self.0.result()
    }

    /// The history rows so far as JSON (empty unless history was asked for).
    pub fn history(&self) -> String {
        self.0.history()
    }

    pub fn save(&self) -> String {
        self.0.save()
    }
}

// ---------------------------------------------------------------------------------------
// Units

#[wasm_bindgen(js_name = convertUnit)]
pub fn convert_unit(value: JsValue, from: JsValue, to: JsValue) -> Result<f64, JsValue> {
    let value = number_arg(&value, "value")?;
    let from = string_arg(&from, "from")?;
    let to = string_arg(&to, "to")?;
    api::convert_unit(value, &from, &to).map_err(to_js)
}

/// Every dimension with its units: `[{dimension, units}]` as JSON.
#[wasm_bindgen(js_name = unitsCatalogue)]
pub fn units_catalogue() -> String {
    api::units_catalogue()
}
