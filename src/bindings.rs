//! The wasm32 binding layer: reads requests from JavaScript objects and writes results
//! as JavaScript objects (`serde-wasm-bindgen`), calls [`crate::api`], and turns
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

/// Reads a request of type `T` from a JavaScript object, naming the place of a bad
/// field (`request.tolerances.xRel`). Anything but a plain object is a `bad-type`.
fn read<T: serde::de::DeserializeOwned>(value: JsValue, what: &str) -> Result<T, JsValue> {
    if !value.is_object() || js_sys::Array::is_array(&value) || value.is_function() {
        let got = if value.is_null() {
            "null".to_string()
        } else if js_sys::Array::is_array(&value) {
            "a list".to_string()
        } else {
            type_name(&value)
        };
        return Err(to_js(InputError::new(
            "bad-type",
            format!("{what} must be an object, got {got}"),
        )));
    }
    strict::TEXT_LEFT.with(|left| left.set(crate::api::MAX_REQUEST_BYTES));
    strict::PATH.with(|p| p.borrow_mut().clear());
    strict::ERROR_PATH.with(|p| p.borrow_mut().take());
    let result = T::deserialize(strict::JsReader(value));
    result.map_err(|e| {
        let path = strict::ERROR_PATH
            .with(|p| p.borrow_mut().take())
            .unwrap_or_default();
        to_js(crate::problem::spec::bad_field(what, &path, e.to_string()))
    })
}

/// A serde reader of JavaScript values for requests. serde-wasm-bindgen's reader reads
/// only the fields a struct declares (its issue 39), so `deny_unknown_fields` could not
/// refuse a misspelt option; this one hands every own key of an object to serde, reads
/// numbers as numbers (NaN and ±Infinity included), copies at most `MAX_REQUEST_BYTES`
/// characters of text out of one request (counted before each copy, so that one long
/// string shared by many fields cannot fill the memory), and walks a value only as deep as the
/// request's types go (skipped values are not walked at all).
///
/// It tracks the place of a bad field itself (`PATH`, `ERROR_PATH`; written as
/// serde_path_to_error writes a path) rather than through serde_path_to_error's wrappers,
/// and sorts a value by kind in one function that is not generic (`classify`): both keep
/// the wasm from carrying a copy of the reader per request type and per wrapper.
mod strict {
    use js_sys::{Array, JsString, Reflect};
    use serde::de::{self, DeserializeSeed, Visitor};
    use std::cell::RefCell;
    use std::fmt;
    use wasm_bindgen::prelude::*;
    use wasm_bindgen::{JsCast, JsValue};

    // Every reach into a request object goes through an import that catches: a Proxy
    // or a getter that throws gives an error, not an exception through Rust frames.
    #[wasm_bindgen]
    extern "C" {
        #[wasm_bindgen(catch, js_namespace = Object, js_name = keys)]
        fn object_keys(o: &JsValue) -> Result<Array, JsValue>;
    }

    fn get(target: &JsValue, key: &JsValue) -> Result<JsValue, Error> {
        Reflect::get(target, key)
            .map_err(|_| Error("a field that cannot be read (its getter threw)".into()))
    }

    /// A list's length, read through a catching import.
    fn length(a: &JsValue) -> Result<u32, Error> {
        let n = get(a, &JsValue::from_str("length"))?
            .as_f64()
            .unwrap_or(0.0);
        if !(n >= 0.0 && n <= u32::MAX as f64) {
            return Err(Error("a list whose length cannot be read".into()));
        }
        Ok(n as u32)
    }

    #[derive(Debug)]
    pub struct Error(String);

    impl fmt::Display for Error {
        fn fmt(&self, f: &mut fmt::Formatter) -> fmt::Result {
            f.write_str(&self.0)
        }
    }

    impl std::error::Error for Error {}

    impl de::Error for Error {
        fn custom<T: fmt::Display>(msg: T) -> Self {
            Error(msg.to_string())
        }
    }

    pub struct JsReader(pub JsValue);

    thread_local! {
        /// Characters of text the request being read may still copy.
        pub static TEXT_LEFT: std::cell::Cell<usize> = const { std::cell::Cell::new(0) };
        /// The place being read: a field name or a list index for each level.
        pub static PATH: RefCell<Vec<Segment>> = const { RefCell::new(Vec::new()) };
        /// The place of the first (innermost) error, written as `tolerances.xRel` or
        /// `values[2]`, empty at the top.
        pub static ERROR_PATH: RefCell<Option<String>> = const { RefCell::new(None) };
        /// Whether the value last read reached its visitor (a key that did is named in
        /// the place of an error, one that did not is `?`).
        static VISITED: std::cell::Cell<bool> = const { std::cell::Cell::new(false) };
    }

    pub enum Segment {
        Key(String),
        Index(u32),
        /// A key that could not be read.
        Unknown,
    }

    /// Notes the place of an error, unless an inner level has already noted its own.
    #[inline(never)]
    fn note_error() {
        ERROR_PATH.with(|e| {
            let mut e = e.borrow_mut();
            if e.is_none() {
                let mut out = String::new();
                PATH.with(|p| {
                    for (i, seg) in p.borrow().iter().enumerate() {
                        match seg {
                            Segment::Index(n) => {
                                out.push('[');
                                out.push_str(&n.to_string());
                                out.push(']');
                            }
                            Segment::Key(k) => {
                                if i > 0 {
                                    out.push('.');
                                }
                                out.push_str(k);
                            }
                            Segment::Unknown => {
                                if i > 0 {
                                    out.push('.');
                                }
                                out.push('?');
                            }
                        }
                    }
                });
                *e = Some(out);
            }
        });
    }

    /// Runs `read` one level down at `seg`, noting the place if it fails.
    fn at<T>(seg: Segment, read: impl FnOnce() -> Result<T, Error>) -> Result<T, Error> {
        PATH.with(|p| p.borrow_mut().push(seg));
        let r = read();
        if r.is_err() {
            note_error();
        }
        PATH.with(|p| p.borrow_mut().pop());
        r
    }

    /// A JavaScript value sorted by what a visitor is given for it.
    enum Kind {
        Unit,
        Bool(bool),
        Number(f64),
        Text(String),
        List(Seq),
        Object(Map),
        Other(JsValue),
    }

    /// Sorts a value by kind, copying text within the request's limit. Not generic, so
    /// that there is one copy of it.
    #[inline(never)]
    fn classify(v: JsValue) -> Result<Kind, Error> {
        if v.is_null() || v.is_undefined() {
            return Ok(Kind::Unit);
        }
        if let Some(b) = v.as_bool() {
            return Ok(Kind::Bool(b));
        }
        if let Some(x) = v.as_f64() {
            return Ok(Kind::Number(x));
        }
        if let Some(s) = v.dyn_ref::<JsString>() {
            let n = s.length() as usize;
            let left = TEXT_LEFT.with(|l| l.get());
            if n > left {
                return Err(Error(format!(
                    "a text of {n} characters, beyond the limit of {} characters of text in one request",
                    crate::api::MAX_REQUEST_BYTES
                )));
            }
            TEXT_LEFT.with(|l| l.set(left - n));
            return match s.as_string() {
                Some(text) => Ok(Kind::Text(text)),
                None => Err(Error("a text that is not valid Unicode".into())),
            };
        }
        if Array::is_array(&v) {
            let len = length(&v)?;
            return Ok(Kind::List(Seq { a: v, i: 0, len }));
        }
        if v.is_object() && !v.is_function() {
            let keys = object_keys(&v)
                .map_err(|_| Error("an object whose fields cannot be listed".into()))?;
            let len = keys.length();
            return Ok(Kind::Object(Map {
                obj: v,
                keys,
                i: 0,
                len,
                value: None,
                key: String::new(),
            }));
        }
        Ok(Kind::Other(v))
    }

    fn unexpected(v: &JsValue) -> de::Unexpected<'static> {
        if v.is_null() || v.is_undefined() {
            de::Unexpected::Unit
        } else if Array::is_array(v) {
            de::Unexpected::Seq
        } else if v.is_function() {
            de::Unexpected::Other("a function")
        } else {
            de::Unexpected::Map
        }
    }

    impl<'de> de::Deserializer<'de> for JsReader {
        type Error = Error;

        fn deserialize_any<V: Visitor<'de>>(self, visitor: V) -> Result<V::Value, Error> {
            let kind = classify(self.0)?;
            VISITED.with(|v| v.set(true));
            match kind {
                Kind::Unit => visitor.visit_unit(),
                Kind::Bool(b) => visitor.visit_bool(b),
                Kind::Number(x) => visitor.visit_f64(x),
                Kind::Text(text) => visitor.visit_string(text),
                Kind::List(seq) => visitor.visit_seq(seq),
                Kind::Object(map) => visitor.visit_map(map),
                Kind::Other(v) => Err(de::Error::invalid_type(unexpected(&v), &visitor)),
            }
        }

        fn deserialize_option<V: Visitor<'de>>(self, visitor: V) -> Result<V::Value, Error> {
            if self.0.is_null() || self.0.is_undefined() {
                visitor.visit_none()
            } else {
                visitor.visit_some(self)
            }
        }

        fn deserialize_tuple<V: Visitor<'de>>(
            self,
            len: usize,
            visitor: V,
        ) -> Result<V::Value, Error> {
            if Array::is_array(&self.0) {
                let n = length(&self.0)?;
                if n as usize != len {
                    return Err(Error(format!("expected a list of {len} items, got {n}")));
                }
            }
            self.deserialize_any(visitor)
        }

        fn deserialize_ignored_any<V: Visitor<'de>>(self, visitor: V) -> Result<V::Value, Error> {
            visitor.visit_unit()
        }

        serde::forward_to_deserialize_any! {
            bool i8 i16 i32 i64 i128 u8 u16 u32 u64 u128 f32 f64 char str string
            bytes byte_buf unit unit_struct newtype_struct seq tuple_struct
            map struct enum identifier
        }
    }

    struct Seq {
        a: JsValue,
        i: u32,
        len: u32,
    }

    impl<'de> de::SeqAccess<'de> for Seq {
        type Error = Error;
        fn next_element_seed<T: DeserializeSeed<'de>>(
            &mut self,
            seed: T,
        ) -> Result<Option<T::Value>, Error> {
            if self.i >= self.len {
                return Ok(None);
            }
            let i = self.i;
            self.i += 1;
            let item = match get(&self.a, &JsValue::from(i)) {
                Ok(item) => item,
                Err(e) => {
                    note_error();
                    return Err(e);
                }
            };
            at(Segment::Index(i), || {
                seed.deserialize(JsReader(item)).map(Some)
            })
        }
        fn size_hint(&self) -> Option<usize> {
            Some((self.len - self.i) as usize)
        }
    }

    struct Map {
        obj: JsValue,
        keys: Array,
        i: u32,
        len: u32,
        value: Option<JsValue>,
        /// The key whose value is next.
        key: String,
    }

    impl<'de> de::MapAccess<'de> for Map {
        type Error = Error;
        fn next_key_seed<K: DeserializeSeed<'de>>(
            &mut self,
            seed: K,
        ) -> Result<Option<K::Value>, Error> {
            if self.i >= self.len {
                return Ok(None);
            }
            let key = self.keys.get(self.i);
            self.i += 1;
            // As serde_path_to_error places it: an error in reading a key is at that key
            // if the key reached its visitor, else at `?`.
            let name = key.as_string().unwrap_or_default();
            VISITED.with(|v| v.set(false));
            let read = match get(&self.obj, &key) {
                Ok(value) => {
                    self.value = Some(value);
                    seed.deserialize(JsReader(key)).map(Some)
                }
                Err(e) => Err(e),
            };
            if read.is_err() {
                let seg = if VISITED.with(|v| v.get()) {
                    Segment::Key(name)
                } else {
                    Segment::Unknown
                };
                return at(seg, || read);
            }
            self.key = name;
            read
        }
        fn next_value_seed<V: DeserializeSeed<'de>>(&mut self, seed: V) -> Result<V::Value, Error> {
            let value = self.value.take().unwrap_or(JsValue::UNDEFINED);
            let key = std::mem::take(&mut self.key);
            at(Segment::Key(key), || seed.deserialize(JsReader(value)))
        }
    }
}

/// A result as a JavaScript value: maps as plain objects (names stay strings), `None`
/// as `null`, numbers as numbers (NaN and ±Infinity included).
fn write<T: serde::Serialize>(value: &T) -> Result<JsValue, JsValue> {
    let serializer = serde_wasm_bindgen::Serializer::new()
        .serialize_maps_as_objects(true)
        .serialize_missing_as_null(true);
    value.serialize(&serializer).map_err(|e| {
        to_js(InputError::new(
            "internal",
            format!("the result cannot be written: {e}"),
        ))
    })
}

/// Reads a request, calls the core, writes the result.
fn call<T: serde::de::DeserializeOwned, R: serde::Serialize>(
    request: JsValue,
    what: &str,
    run: impl FnOnce(&T) -> Result<R, InputError>,
) -> Result<JsValue, JsValue> {
    let request: T = read(request, what)?;
    write(&run(&request).map_err(to_js)?)
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
// Requests as JavaScript objects

#[wasm_bindgen(js_name = solveEquation)]
pub fn solve_equation(request: JsValue) -> Result<JsValue, JsValue> {
    call(request, "request", api::solve_equation)
}

#[wasm_bindgen(js_name = solveTemplate)]
pub fn solve_template(request: JsValue) -> Result<JsValue, JsValue> {
    call(request, "request", api::solve_template)
}

/// Every template with its full metadata.
#[wasm_bindgen(js_name = catalogue)]
pub fn catalogue() -> Result<JsValue, JsValue> {
    write(&api::catalogue())
}

#[wasm_bindgen(js_name = sweep)]
pub fn sweep(request: JsValue) -> Result<JsValue, JsValue> {
    call(request, "request", api::sweep)
}

#[wasm_bindgen(js_name = findRoots)]
pub fn find_roots(request: JsValue) -> Result<JsValue, JsValue> {
    call(request, "request", api::find_roots)
}

/// `{ok, variables, definitions, equations}` or `{ok: false, code, message, position, caret}`.
#[wasm_bindgen(js_name = checkEquation)]
pub fn check_equation(text: JsValue) -> Result<JsValue, JsValue> {
    let text = string_arg(&text, "the equation text")?;
    write(&api::check_equation(&text))
}

// ---------------------------------------------------------------------------------------
// A compiled problem and its sweeps

/// A compiled problem; the wrapper's `Problem` class holds one.
#[wasm_bindgen(js_name = ProblemHandle)]
pub struct ProblemHandle(api::ProblemSession);

#[wasm_bindgen(js_class = ProblemHandle)]
impl ProblemHandle {
    pub fn compile(spec: JsValue) -> Result<ProblemHandle, JsValue> {
        let spec: crate::problem::ProblemSpec = read(spec, "spec")?;
        api::ProblemSession::compile(&spec)
            .map(ProblemHandle)
            .map_err(to_js)
    }

    /// The one unknown's name, or undefined with several.
    #[wasm_bindgen(getter)]
    pub fn unknown(&self) -> Option<String> {
        self.0.unknown()
    }

    /// The unit of the one unknown's values, or undefined with none.
    #[wasm_bindgen(getter)]
    pub fn unit(&self) -> Option<String> {
        self.0.unit()
    }

    pub fn solve(&self, options: JsValue) -> Result<JsValue, JsValue> {
        call(options, "options", |o| self.0.solve(o))
    }

    pub fn residual(&self, x: JsValue) -> Result<f64, JsValue> {
        let x = number_arg(&x, "x")?;
        self.0.residual(x).map_err(to_js)
    }

    pub fn sample(&self, lo: JsValue, hi: JsValue, n: JsValue) -> Result<JsValue, JsValue> {
        let lo = number_arg(&lo, "lo")?;
        let hi = number_arg(&hi, "hi")?;
        let n = number_arg(&n, "n")?;
        write(&self.0.sample(lo, hi, n).map_err(to_js)?)
    }

    pub fn roots(&self, lo: JsValue, hi: JsValue, options: JsValue) -> Result<JsValue, JsValue> {
        let lo = number_arg(&lo, "lo")?;
        let hi = number_arg(&hi, "hi")?;
        call(options, "options", |o| self.0.roots(lo, hi, o))
    }

    pub fn sensitivities(&self, options: JsValue) -> Result<JsValue, JsValue> {
        call(options, "options", |o| self.0.sensitivities(o))
    }

    /// Starts the uncertainty of the answer; its Monte Carlo trials run in chunks.
    #[wasm_bindgen(js_name = startUncertainty)]
    pub fn start_uncertainty(&self, options: JsValue) -> Result<UncertaintyHandle, JsValue> {
        let options: crate::problem::SolveOptions = read(options, "options")?;
        self.0
            .start_uncertainty(&options)
            .map(UncertaintyHandle)
            .map_err(to_js)
    }

    #[wasm_bindgen(js_name = startSweep)]
    pub fn start_sweep(&self, spec: JsValue) -> Result<SweepHandle, JsValue> {
        let spec: crate::problem::SweepSpec = read(spec, "sweep")?;
        self.0.start_sweep(&spec).map(SweepHandle).map_err(to_js)
    }
}

/// A sweep run in chunks; each `advance` gives only its new points.
#[wasm_bindgen(js_name = SweepHandle)]
pub struct SweepHandle(api::SweepSession);

#[wasm_bindgen(js_class = SweepHandle)]
impl SweepHandle {
    pub fn advance(&mut self, chunk: JsValue) -> Result<JsValue, JsValue> {
        let chunk = number_arg(&chunk, "chunk")?;
        write(&self.0.advance(chunk).map_err(to_js)?)
    }

    #[wasm_bindgen(getter)]
    pub fn done(&self) -> usize {
        self.0.done()
    }

    #[wasm_bindgen(getter)]
    pub fn points(&self) -> usize {
        self.0.points()
    }

    #[wasm_bindgen(getter)]
    pub fn finished(&self) -> bool {
        self.0.is_done()
    }
}

/// The uncertainty of an answer, its Monte Carlo trials run in chunks.
#[wasm_bindgen(js_name = UncertaintyHandle)]
pub struct UncertaintyHandle(api::UncertaintySession);

#[wasm_bindgen(js_class = UncertaintyHandle)]
impl UncertaintyHandle {
    /// Runs up to `chunk` more trials; the trials done.
    pub fn advance(&mut self, chunk: JsValue) -> Result<usize, JsValue> {
        let chunk = number_arg(&chunk, "chunk")?;
        self.0.advance(chunk).map_err(to_js)
    }

    #[wasm_bindgen(getter)]
    pub fn done(&self) -> usize {
        self.0.done()
    }

    #[wasm_bindgen(getter)]
    pub fn trials(&self) -> usize {
        self.0.trials()
    }

    #[wasm_bindgen(getter)]
    pub fn finished(&self) -> bool {
        self.0.is_done()
    }

    pub fn report(&self) -> Result<JsValue, JsValue> {
        write(&self.0.report())
    }
}

// ---------------------------------------------------------------------------------------
// Templates of one's own

/// Reads and checks an exchange file of own templates (its text); the templates.
#[wasm_bindgen(js_name = readOwnTemplates)]
pub fn read_own_templates(text: JsValue) -> Result<JsValue, JsValue> {
    // Measured before it is copied out of JavaScript (UTF-16 units; at most 3 bytes
    // of UTF-8 each).
    if let Some(s) = text.dyn_ref::<js_sys::JsString>() {
        let units = s.length() as usize;
        if units > api::MAX_REQUEST_BYTES {
            return Err(to_js(InputError::new(
                "bad-request",
                format!(
                    "the own-template file has {units} characters; the limit is {}",
                    api::MAX_REQUEST_BYTES
                ),
            )));
        }
    }
    let text = string_arg(&text, "the own-template file")?;
    write(&api::read_own_templates(&text).map_err(to_js)?)
}

/// Checks one own template; gives it back as read.
#[wasm_bindgen(js_name = checkOwnTemplate)]
pub fn check_own_template(template: JsValue) -> Result<JsValue, JsValue> {
    call(template, "template", api::check_own_template)
}

/// Writes own templates ({templates}) as an exchange file's text.
#[wasm_bindgen(js_name = writeOwnTemplates)]
pub fn write_own_templates(request: JsValue) -> Result<String, JsValue> {
    let list: api::OwnTemplateList = read(request, "request")?;
    api::write_own_templates(&list).map_err(to_js)
}

// ---------------------------------------------------------------------------------------
// Scalar and system callbacks

/// Solves F(x) = 0 for a JavaScript `F(x: Float64Array) => Float64Array` (the wrapper
/// adapts plain arrays). After the first failed call F is not called again.
#[wasm_bindgen(js_name = solveSystemFunction)]
pub fn solve_system_function(f: JsValue, request: JsValue) -> Result<JsValue, JsValue> {
    let _nesting = Nesting::enter()?;
    let f = function_arg(f, "F")?;
    let request: api::SystemCall = read(request, "options")?;
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
    write(&result.map_err(to_js)?)
}

/// All roots in a range of a JavaScript `f(x: number) => number`. After the first failed
/// call f is not called again.
#[wasm_bindgen(js_name = findRootsFunction)]
pub fn find_roots_function(f: JsValue, request: JsValue) -> Result<JsValue, JsValue> {
    let _nesting = Nesting::enter()?;
    let f = function_arg(f, "f")?;
    let request: api::FunctionRootsCall = read(request, "request")?;
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
    write(&result.map_err(to_js)?)
}

// ---------------------------------------------------------------------------------------
// The ask–tell stepper

/// The ask–tell stepper; the wrapper's `Stepper` class holds one.
#[wasm_bindgen(js_name = StepperHandle)]
pub struct StepperHandle(api::StepperSession);

#[wasm_bindgen(js_class = StepperHandle)]
impl StepperHandle {
    pub fn create(request: JsValue) -> Result<StepperHandle, JsValue> {
        let request: api::ScalarCall = read(request, "options")?;
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

    /// The result once done, else undefined.
    pub fn result(&self) -> Result<JsValue, JsValue> {
        match self.0.result() {
            Some(r) => write(&r),
            None => Ok(JsValue::UNDEFINED),
        }
    }

    /// The history rows so far (empty unless history was asked for).
    pub fn history(&self) -> Result<JsValue, JsValue> {
        write(&self.0.history())
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

/// Every dimension with its units: `[{dimension, units}]`.
#[wasm_bindgen(js_name = unitsCatalogue)]
pub fn units_catalogue() -> Result<JsValue, JsValue> {
    write(&api::units_catalogue())
}
