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

/// A request object from JSON text (the bindings take JavaScript objects).
fn o(json: &str) -> JsValue {
    js_sys::JSON::parse(json).expect("valid JSON")
}

/// A result object as JSON, for reading in Rust (NaN and Infinity become null).
fn parse(v: &JsValue) -> Value {
    let text = String::from(js_sys::JSON::stringify(v).expect("a JSON-able result"));
    serde_json::from_str(&text).expect("valid JSON")
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
    let e = b::solve_equation(o(r#"{"equations":"y = 2*x +","knowns":{"y":1}}"#)).unwrap_err();
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
    assert_eq!(code_of(b::sweep(s("{")).unwrap_err()), "bad-type");
    assert_eq!(code_of(b::find_roots(o("{}")).unwrap_err()), "bad-request");
    assert_eq!(
        code_of(b::solve_template(o(r#"{"id":"none","unknown":"x"}"#)).unwrap_err()),
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
    let out = parse(&b::solve_equation(o(r#"{"equations":"Q = V*pi*D^2/4","knowns":{"Q":0.1,"V":2},"unknowns":[{"name":"D","bounds":[0,10]}]}"#)).unwrap());
    let expected = (4.0 * 0.1 / (std::f64::consts::PI * 2.0)).sqrt();
    assert!((num(&out["root"]) - expected).abs() <= 1e-12 * expected);
    assert_eq!(out["converged"], Value::Bool(true));
}

#[wasm_bindgen_test]
fn template_two_branches() {
    // NACA Report 1135 (1953) isentropic table, gamma 1.4, A/A* = 2.0: M = 0.3059 and
    // 2.197 (table values recalled from memory).
    let out = parse(
        &b::solve_template(o(
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
    let catalogue = parse(&b::catalogue().unwrap());
    assert!(!catalogue.as_array().unwrap().is_empty());
}

#[wasm_bindgen_test]
fn js_callbacks_for_systems_and_scans() {
    // x² + y² = 4 and x = y: x = y = √2 (reference: Rust std f64::sqrt).
    let f = js_fn(
        "v",
        "return Float64Array.from([v[0]*v[0] + v[1]*v[1] - 4, v[0] - v[1]]);",
    );
    let out = parse(&b::solve_system_function(f, o(r#"{"x0":[1,2]}"#)).unwrap());
    assert_eq!(out["converged"], Value::Bool(true), "{out}");
    for r in out["roots"].as_array().unwrap() {
        assert!((num(r) - 2f64.sqrt()).abs() < 1e-9);
    }
    // sin has roots 0, π, 2π in [-1, 7] (reference: std::f64::consts::PI).
    let out = parse(
        &b::find_roots_function(js_fn("x", "return Math.sin(x);"), o(r#"{"range":[-1,7]}"#))
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
    let e = b::find_roots_function(threw.clone(), o(r#"{"range":[0,1]}"#)).unwrap_err();
    let cause = Reflect::get(&e, &s("cause")).unwrap();
    assert!(cause.is_instance_of::<js_sys::Error>());
    let message = String::from(e.dyn_ref::<js_sys::Error>().unwrap().message());
    assert!(message.contains("rig offline"), "{message}");
    assert_eq!(code_of(e), "callback-threw");
    let e = b::solve_system_function(threw, o(r#"{"x0":[1]}"#)).unwrap_err();
    assert_eq!(code_of(e), "callback-threw");
    let e =
        b::find_roots_function(js_fn("x", "return 'one';"), o(r#"{"range":[0,1]}"#)).unwrap_err();
    assert_eq!(code_of(e), "callback-bad-value");
    let e =
        b::solve_system_function(js_fn("v", "return [0, 0];"), o(r#"{"x0":[1,2]}"#)).unwrap_err();
    assert_eq!(code_of(e), "callback-bad-value");
    let e = b::solve_system_function(
        js_fn("v", "return new Float64Array(3);"),
        o(r#"{"x0":[1,2]}"#),
    )
    .unwrap_err();
    assert_eq!(code_of(e), "callback-bad-value");
    let e = b::solve_system_function(JsValue::from_f64(3.0), o(r#"{"x0":[1]}"#)).unwrap_err();
    assert_eq!(code_of(e), "bad-type");
    assert_eq!(b::last_panic(), None);
}

#[wasm_bindgen_test]
fn stepper_save_restore_in_wasm() {
    let f = |x: f64| x.cos() - x;
    let mut st = b::StepperHandle::create(o(r#"{"bracket":[0,1]}"#)).unwrap();
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
    let out = b::solve_equation(o(
        r#"{"equations":"x^3 - 2*x - 5","unknowns":[{"name":"x","guesses":[2,3]}]}"#,
    ))
    .unwrap();
    let root = num(&parse(&out)["root"]);
    assert!((root - 2.094_551_481_542_326_5).abs() < 1e-11, "{root}");
}

#[wasm_bindgen_test]
fn requests_are_objects_read_strictly() {
    // A misspelt option is refused with its place, not ignored.
    let e = b::solve_equation(o(r#"{"equations":"x^2 = 2","tolerance":{}}"#)).unwrap_err();
    let message = String::from(e.dyn_ref::<js_sys::Error>().unwrap().message());
    assert!(message.contains("tolerance"), "{message}");
    assert_eq!(code_of(e), "bad-request");
    let e = b::solve_equation(o(r#"{"equations":"x^2 = 2","tolerances":{"xrel":1}}"#)).unwrap_err();
    let message = String::from(e.dyn_ref::<js_sys::Error>().unwrap().message());
    assert!(message.contains("request.tolerances"), "{message}");
    // A string where a number belongs names the field.
    let e = b::solve_equation(o(r#"{"equations":"x^2 = a","knowns":{"a":"2"}}"#)).unwrap_err();
    let message = String::from(e.dyn_ref::<js_sys::Error>().unwrap().message());
    assert!(message.contains("request.knowns.a"), "{message}");
    // NaN in a request is a number, and refused as one.
    let req = o(r#"{"equations":"x^2 = a","knowns":{"a":0}}"#);
    let knowns = Reflect::get(&req, &s("knowns")).unwrap();
    Reflect::set(&knowns, &s("a"), &JsValue::from_f64(f64::NAN)).unwrap();
    assert_eq!(
        code_of(b::solve_equation(req).unwrap_err()),
        "non-finite-input"
    );
    // Infinity is an open bound.
    let req = o(r#"{"equations":"x^2 = 2","unknowns":[{"name":"x","bounds":[0,0]}]}"#);
    let u = Reflect::get(
        &js_sys::Array::from(&Reflect::get(&req, &s("unknowns")).unwrap()).get(0),
        &s("bounds"),
    )
    .unwrap();
    Reflect::set(
        &u,
        &JsValue::from_f64(1.0),
        &JsValue::from_f64(f64::INFINITY),
    )
    .unwrap();
    let out = parse(&b::solve_equation(req).unwrap());
    assert!((num(&out["root"]) - 2f64.sqrt()).abs() < 1e-12);
}

#[wasm_bindgen_test]
fn names_stay_strings_and_non_finite_numbers_stay_numbers() {
    // Variables called NaN and Infinity are names; y = Infinity*x has a root at x = 0
    // with y = 0 (the NaN-name case of the Problem issue).
    let out = b::solve_equation(o(
        r#"{"equations":"y = Infinity*x + NaN","knowns":{"y":0,"Infinity":2,"NaN":0},"unknowns":["x"],"sensitivities":true}"#,
    ))
    .unwrap();
    let unknowns = Reflect::get(&out, &s("unknowns")).unwrap();
    assert_eq!(
        Reflect::get(&unknowns, &s("x")).unwrap().as_f64(),
        Some(0.0)
    );
    let sens = js_sys::Array::from(&Reflect::get(&out, &s("sensitivities")).unwrap());
    let inputs: Vec<String> = sens
        .iter()
        .map(|d| {
            Reflect::get(&d, &s("input"))
                .unwrap()
                .as_string()
                .expect("a string name")
        })
        .collect();
    assert!(inputs.iter().any(|n| n == "Infinity"), "{inputs:?}");
    // The first history row's step is the number NaN, not a string.
    let out = b::solve_equation(o(r#"{"equations":"x^2 = 2","history":true}"#)).unwrap();
    let rows = js_sys::Array::from(&Reflect::get(&out, &s("history")).unwrap());
    let step = Reflect::get(&rows.get(0), &s("step")).unwrap();
    assert!(step.as_f64().is_some_and(f64::is_nan), "{step:?}");
}

#[wasm_bindgen_test]
fn a_problem_handle_and_a_sweep_in_chunks() {
    let p = b::ProblemHandle::compile(o(
        r#"{"equations":"x^2 = a","knowns":{"a":2},"unknown":"x","units":{"x":"m"}}"#,
    ))
    .unwrap();
    assert_eq!(p.unknown().as_deref(), Some("x"));
    let r = parse(&p.solve(o(r#"{"guesses":[1,2]}"#)).unwrap());
    assert!((num(&r["root"]) - 2f64.sqrt()).abs() < 1e-12);
    assert_eq!(p.residual(JsValue::from_f64(2.0)).unwrap(), 2.0);
    let sample = parse(
        &p.sample(
            JsValue::from_f64(0.0),
            JsValue::from_f64(2.0),
            JsValue::from_f64(5.0),
        )
        .unwrap(),
    );
    assert_eq!(sample["x"].as_array().unwrap().len(), 5);
    let roots = parse(
        &p.roots(JsValue::from_f64(-3.0), JsValue::from_f64(3.0), o("{}"))
            .unwrap(),
    );
    assert_eq!(roots["roots"].as_array().unwrap().len(), 2);
    // x² = a from a = 1 to 100 in 10 points, three at a time: only new points each time.
    let mut sw = p
        .start_sweep(o(
            r#"{"input":"a","from":1,"to":100,"points":10,"guesses":[1,2]}"#,
        ))
        .unwrap();
    let mut seen = 0;
    while !sw.finished() {
        let part = parse(&sw.advance(JsValue::from_f64(3.0)).unwrap());
        let n = part["input"].as_array().unwrap().len();
        assert!((1..=3).contains(&n));
        for (a, x) in part["input"]
            .as_array()
            .unwrap()
            .iter()
            .zip(part["root"].as_array().unwrap())
        {
            assert!((num(x) - num(a).sqrt()).abs() < 1e-9);
        }
        seen += n;
    }
    assert_eq!(seen, 10);
    assert_eq!(
        code_of(sw.advance(JsValue::from_f64(0.5)).unwrap_err()),
        "bad-request"
    );
    assert_eq!(
        code_of(
            p.sample(
                JsValue::from_f64(0.0),
                JsValue::from_f64(1.0),
                JsValue::from_f64(1e12)
            )
            .unwrap_err()
        ),
        "bad-samples"
    );
}
