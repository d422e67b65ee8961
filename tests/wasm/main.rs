//! The binding layer inside a real wasm32 instance, in Node and in headless Chromium
//! (`scripts/test-wasm.sh` runs both): JavaScript errors with codes, JavaScript
//! callbacks that work, throw or return garbage, the stepper, and the same numbers as
//! the native build.
#![cfg(target_arch = "wasm32")]

use js_sys::{Function, Reflect};
use serde_json::Value;
use tacit::bindings as b;
use wasm_bindgen::{JsCast, JsValue};
use wasm_bindgen_test::wasm_bindgen_test;

fn s(v: &str) -> JsValue {
    JsValue::from_str(v)
}

fn parse(text: &str) -> Value {
    serde_json::from_str(text).expect("valid JSON")
}

fn num(v: &Value) -> f64 {
    v.as_f64().expect("a number")
}

/// The `code` of a thrown JavaScript error, checking it is an `Error` with a message.
fn code_of(e: JsValue) -> String {
    let err = e.dyn_ref::<js_sys::Error>().expect("a JavaScript Error");
    assert!(!String::from(err.message()).is_empty());
    Reflect::get(&e, &s("code"))
        .unwrap()
        .as_string()
        .expect("a string code")
}

fn js_fn(args: &str, body: &str) -> JsValue {
    Function::new_with_args(args, body).into()
}

#[wasm_bindgen_test]
fn errors_are_js_errors_with_a_code_and_position() {
    let e = b::solve_equation(s(r#"{"equations":"y = 2*x +","knowns":{"y":1}}"#)).unwrap_err();
    let position = Reflect::get(&e, &s("position")).unwrap().as_f64();
    assert_eq!(position, Some(9.0));
    assert!(!code_of(e).is_empty());
    assert_eq!(
        code_of(b::convert_unit(s("1"), s("m"), s("mm")).unwrap_err()),
        "bad-type"
    );
    assert_eq!(
        code_of(b::convert_unit(JsValue::NULL, s("m"), s("mm")).unwrap_err()),
        "bad-type"
    );
    assert_eq!(
        code_of(b::solve_equation(JsValue::from_f64(1.0)).unwrap_err()),
        "bad-type"
    );
    assert_eq!(code_of(b::sweep(s("{")).unwrap_err()), "bad-request");
    assert_eq!(code_of(b::find_roots(s("{}")).unwrap_err()), "bad-request");
    assert_eq!(
        code_of(b::solve_template(s(r#"{"id":"none","unknown":"x"}"#)).unwrap_err()),
        "unknown-template"
    );
}

#[wasm_bindgen_test]
fn unit_conversion_matches_nist() {
    // NIST SP 811 (2008) Appendix B.8: 1 psi = 6.894 757 E+03 Pa.
    let pa = b::convert_unit(JsValue::from_f64(1.0), s("psi"), s("Pa")).unwrap();
    assert!((pa - 6.894_757e3).abs() < 1e-3);
}

#[wasm_bindgen_test]
fn text_equation_gives_the_closed_form() {
    // Q = V·πD²/4, so D = sqrt(4Q/(πV)) (closed form, common practice).
    let out = parse(&b::solve_equation(s(r#"{"equations":"Q = V*pi*D^2/4","knowns":{"Q":0.1,"V":2},"unknowns":[{"name":"D","bounds":[0,10]}]}"#)).unwrap());
    let expected = (4.0 * 0.1 / (std::f64::consts::PI * 2.0)).sqrt();
    assert!((num(&out["root"]) - expected).abs() <= 1e-12 * expected);
    assert_eq!(out["converged"], Value::Bool(true));
}

#[wasm_bindgen_test]
fn template_two_branches() {
    // NACA Report 1135 (1953) isentropic table, gamma 1.4, A/A* = 2.0: M = 0.3059 and
    // 2.197 (table values recalled from memory).
    let out = parse(
        &b::solve_template(s(
            r#"{"id":"gas.area-mach","values":{"AR":2,"g":1.4},"unknown":"M"}"#,
        ))
        .unwrap(),
    );
    let mut roots = vec![num(&out["value"])];
    roots.extend(
        out["otherRoots"]
            .as_array()
            .unwrap()
            .iter()
            .map(|o| num(&o["value"])),
    );
    // The default branch of the area-Mach relation is the supersonic one, labelled.
    assert_eq!(out["branch"], "supersonic");
    assert_eq!(out["otherRoots"][0]["label"], "subsonic");
    roots.sort_by(f64::total_cmp);
    assert_eq!(roots.len(), 2);
    assert!((roots[0] - 0.3059).abs() < 5e-4);
    assert!((roots[1] - 2.197).abs() < 2e-3);
    let catalogue = parse(&b::catalogue());
    assert!(!catalogue.as_array().unwrap().is_empty());
}

#[wasm_bindgen_test]
fn js_callbacks_for_systems_and_scans() {
    // x² + y² = 4 and x = y: x = y = √2 (reference: Rust std f64::sqrt).
    let f = js_fn(
        "v",
        "return Float64Array.from([v[0]*v[0] + v[1]*v[1] - 4, v[0] - v[1]]);",
    );
    let out = parse(&b::solve_system_function(f, s(r#"{"x0":[1,2]}"#)).unwrap());
    assert_eq!(out["converged"], Value::Bool(true), "{out}");
    for r in out["roots"].as_array().unwrap() {
        assert!((num(r) - 2f64.sqrt()).abs() < 1e-9);
    }
    // sin has roots 0, π, 2π in [-1, 7] (reference: std::f64::consts::PI).
    let out = parse(
        &b::find_roots_function(js_fn("x", "return Math.sin(x);"), s(r#"{"range":[-1,7]}"#))
            .unwrap(),
    );
    let roots: Vec<f64> = out["roots"]
        .as_array()
        .unwrap()
        .iter()
        .map(|r| num(&r["x"]))
        .collect();
    assert_eq!(roots.len(), 3);
    assert!((roots[1] - std::f64::consts::PI).abs() < 1e-12);
}

#[wasm_bindgen_test]
fn callbacks_that_throw_or_return_garbage() {
    let threw = js_fn("x", "throw new Error('rig offline');");
    let e = b::find_roots_function(threw.clone(), s(r#"{"range":[0,1]}"#)).unwrap_err();
    let cause = Reflect::get(&e, &s("cause")).unwrap();
    assert!(cause.is_instance_of::<js_sys::Error>());
    let message = String::from(e.dyn_ref::<js_sys::Error>().unwrap().message());
    assert!(message.contains("rig offline"), "{message}");
    assert_eq!(code_of(e), "callback-threw");
    let e = b::solve_system_function(threw, s(r#"{"x0":[1]}"#)).unwrap_err();
    assert_eq!(code_of(e), "callback-threw");
    let e =
        b::find_roots_function(js_fn("x", "return 'one';"), s(r#"{"range":[0,1]}"#)).unwrap_err();
    assert_eq!(code_of(e), "callback-bad-value");
    let e =
        b::solve_system_function(js_fn("v", "return [0, 0];"), s(r#"{"x0":[1,2]}"#)).unwrap_err();
    assert_eq!(code_of(e), "callback-bad-value");
    let e = b::solve_system_function(
        js_fn("v", "return new Float64Array(3);"),
        s(r#"{"x0":[1,2]}"#),
    )
    .unwrap_err();
    assert_eq!(code_of(e), "callback-bad-value");
    let e = b::solve_system_function(JsValue::from_f64(3.0), s(r#"{"x0":[1]}"#)).unwrap_err();
    assert_eq!(code_of(e), "bad-type");
    assert_eq!(b::last_panic(), None);
}

#[wasm_bindgen_test]
fn stepper_save_restore_in_wasm() {
    let f = |x: f64| x.cos() - x;
    let mut st = b::StepperHandle::create(s(r#"{"bracket":[0,1]}"#)).unwrap();
    for _ in 0..3 {
        let x = st.next().unwrap();
        st.tell(JsValue::from_f64(f(x))).unwrap();
    }
    let saved = st.save();
    let mut back = b::StepperHandle::restore(s(&saved)).unwrap();
    assert_eq!(back.evaluations(), 3);
    while let Some(x) = back.next() {
        back.tell(JsValue::from_f64(f(x))).unwrap();
    }
    assert!(back.done());
    let out = parse(&back.result().unwrap());
    // cos x = x at 0.739085133215161 (the Dottie number, recalled from memory).
    assert!((num(&out["root"]) - 0.739_085_133_215_161).abs() < 1e-12);
    assert_eq!(code_of(st.tell(s("0.5")).unwrap_err()), "bad-type");
    let tampered = saved.replacen("[[0.0,", "[[0.25,", 1);
    assert_ne!(tampered, saved);
    assert_eq!(
        code_of(b::StepperHandle::restore(s(&tampered)).err().unwrap()),
        "bad-saved-stepper"
    );
    assert_eq!(
        code_of(b::StepperHandle::restore(JsValue::TRUE).err().unwrap()),
        "bad-type"
    );
}

#[wasm_bindgen_test]
fn wallis_cubic_in_wasm() {
    // Wallis's cubic x³ − 2x − 5 = 0 has its real root at 2.0945514815423265 (a classic
    // test equation; value recalled from memory). tests/api.rs checks the same natively.
    let out = b::solve_equation(s(
        r#"{"equations":"x^3 - 2*x - 5","unknowns":[{"name":"x","guesses":[2,3]}]}"#,
    ))
    .unwrap();
    let root = num(&parse(&out)["root"]);
    assert!((root - 2.094_551_481_542_326_5).abs() < 1e-11, "{root}");
}
