//! The JSON facade (`tacit::api`), natively: results against outside references, and
//! every kind of bad input answered by an `InputError` that names the value and place.

use serde_json::Value;
use tacit::api::json as api;
use tacit::api::StepperSession;
use tacit::InputError;

fn parse(text: &str) -> Value {
    serde_json::from_str(text).expect("the facade writes valid JSON")
}

fn f64_of(v: &Value) -> f64 {
    match v {
        Value::Number(n) => n.as_f64().unwrap(),
        Value::String(s) if s == "NaN" => f64::NAN,
        Value::String(s) if s == "Infinity" => f64::INFINITY,
        Value::String(s) if s == "-Infinity" => f64::NEG_INFINITY,
        other => panic!("not a number: {other}"),
    }
}

/// The error of `result`, which must have `code` and a message containing every one of `words`.
fn check_error<T>(result: Result<T, InputError>, code: &str, words: &[&str]) {
    let Err(e) = result else {
        panic!("bad input must be an error (expected code {code})");
    };
    assert_eq!(e.code, code, "code of {e:?}");
    for w in words {
        assert!(
            e.message.contains(w),
            "message {:?} should mention {w:?}",
            e.message
        );
    }
}

fn square_minus_two(x: f64) -> f64 {
    x * x - 2.0
}

// ---------------------------------------------------------------------------------------
// Scalar solves of a Rust closure through the JSON options

#[test]
fn solve_function_finds_square_root_of_two() {
    // Reference: Rust std `f64::sqrt` (IEEE 754 correctly rounded square root).
    let out = parse(
        &api::solve_function(r#"{"guesses":[1,2],"history":true}"#, square_minus_two).unwrap(),
    );
    assert_eq!(out["converged"], Value::Bool(true));
    assert!(out["status"].as_str().unwrap().starts_with("converged"));
    let root = f64_of(&out["root"]);
    assert!((root - 2f64.sqrt()).abs() <= 1e-11);
    let history = out["history"].as_array().unwrap();
    assert_eq!(history.len() as u64, out["evaluations"].as_u64().unwrap());
    // The first row has no previous point: its step is NaN, written as null in JSON
    // (a number, NaN, in JavaScript).
    assert_eq!(history[0]["step"], Value::Null);
    assert_eq!(history[0]["kind"], "initial");
    assert!(out["message"].as_str().unwrap().starts_with("Converged"));
}

#[test]
fn solve_function_counts_every_evaluation() {
    let mut calls = 0usize;
    let out = parse(
        &api::solve_function(r#"{"bracket":[0,3],"method":"bisection"}"#, |x| {
            calls += 1;
            square_minus_two(x)
        })
        .unwrap(),
    );
    assert_eq!(out["evaluations"].as_u64().unwrap() as usize, calls);
    assert!(out["bracket"].is_array());
}

#[test]
fn solve_function_respects_tolerances_and_bounds() {
    let out = parse(
        &api::solve_function(
            r#"{"guesses":[1,2],"tolerances":{"maxEvals":3},"bounds":[0,null]}"#,
            square_minus_two,
        )
        .unwrap(),
    );
    assert_eq!(out["evaluations"], 3);
    assert_eq!(out["converged"], false);
    assert_eq!(out["status"], "budget-spent");
}

#[test]
fn scalar_options_are_checked() {
    let f = square_minus_two;
    check_error(
        api::solve_function("", f),
        "bad-request",
        &["options", "EOF"],
    );
    check_error(
        api::solve_function("[1,2]", f),
        "bad-request",
        &["must be an object"],
    );
    check_error(
        api::solve_function("{}", f),
        "bad-request",
        &["guesses", "missing"],
    );
    check_error(
        api::solve_function(r#"{"guesses":[1,2],"bracket":[0,3]}"#, f),
        "bad-request",
        &["not both"],
    );
    check_error(
        api::solve_function(r#"{"guesses":[1,"two"]}"#, f),
        "bad-request",
        &["options.guesses[1]", "\"two\""],
    );
    check_error(
        api::solve_function(r#"{"guesses":[1,null]}"#, f),
        "bad-request",
        &["options.guesses[1]", "null"],
    );
    check_error(
        api::solve_function(r#"{"guesses":[1]}"#, f),
        "bad-request",
        &["options.guesses", "size 2"],
    );
    check_error(
        api::solve_function(r#"{"guesses":[1,1]}"#, f),
        "equal-guesses",
        &["1"],
    );
    check_error(
        api::solve_function(r#"{"guesses":[1,2],"method":"newton"}"#, f),
        "unknown-method",
        &["newton"],
    );
    check_error(
        api::solve_function(r#"{"guesses":[1,2],"tolerance":{}}"#, f),
        "bad-request",
        &["unknown field `tolerance`", "tolerances"],
    );
    check_error(
        api::solve_function(r#"{"guesses":[1,2],"tolerances":{"xRel":-1}}"#, f),
        "bad-tolerance",
        &["options.tolerances.xRel", "-1"],
    );
    check_error(
        api::solve_function(r#"{"guesses":[1,2],"tolerances":{"maxEvals":2.5}}"#, f),
        "bad-tolerance",
        &["maxEvals", "whole number"],
    );
    check_error(
        api::solve_function(r#"{"guesses":[1,2],"tolerances":{"maxEvals":1e300}}"#, f),
        "bad-tolerance",
        &["maxEvals"],
    );
    check_error(
        api::solve_function(r#"{"guesses":[1,2],"bounds":[3,0]}"#, f),
        "bad-bounds",
        &["reversed"],
    );
    check_error(
        api::solve_function(r#"{"guesses":[1,2],"bounds":[5,9]}"#, f),
        "start-outside-bounds",
        &["first guess"],
    );
    check_error(
        api::solve_function(r#"{"guesses":[1,2],"history":"yes"}"#, f),
        "bad-request",
        &["options.history", "expected a boolean"],
    );
}

#[test]
fn deep_nesting_and_huge_requests_are_errors() {
    let deep = format!("{}{}", "[".repeat(100_000), "]".repeat(100_000));
    check_error(
        api::solve_function(&deep, square_minus_two),
        "bad-request",
        &["options"],
    );
    let deep_obj = format!(
        "{{\"guesses\":[1,2],\"bounds\":{}{}}}",
        "{\"a\":".repeat(5000),
        "}".repeat(5000)
    );
    check_error(
        api::solve_function(&deep_obj, square_minus_two),
        "bad-request",
        &[],
    );
    let huge = format!("{{\"method\":\"{}\"}}", "x".repeat(api::MAX_REQUEST_BYTES));
    check_error(
        api::solve_function(&huge, square_minus_two),
        "bad-request",
        &["limit"],
    );
}

// ---------------------------------------------------------------------------------------
// The ask–tell stepper

#[test]
fn stepper_driven_to_the_end_matches_the_closure_solve() {
    let opts = r#"{"bracket":[0,3],"history":true}"#;
    let mut s = api::stepper(opts).unwrap();
    while let Some(x) = s.next_point() {
        s.tell(square_minus_two(x)).unwrap();
    }
    assert!(s.is_done());
    let stepped = parse(&api::text(&s.result().unwrap()).unwrap());
    let direct = parse(&api::solve_function(opts, square_minus_two).unwrap());
    assert_eq!(stepped, direct);
    // Reference: Rust std `f64::sqrt`.
    assert!((f64_of(&stepped["root"]) - 2f64.sqrt()).abs() <= 1e-11);
    check_error(s.tell(0.0), "nothing-pending", &["finished"]);
}

#[test]
fn stepper_saved_mid_way_resumes_without_evaluating_again() {
    let mut s = api::stepper(r#"{"guesses":[1,2]}"#).unwrap();
    for _ in 0..3 {
        let x = s.next_point().unwrap();
        s.tell(square_minus_two(x)).unwrap();
    }
    let saved = s.save();
    let mut r = StepperSession::restore(&saved).unwrap();
    assert_eq!(r.evaluations(), 3);
    assert_eq!(r.next_point(), s.next_point());
    while let Some(x) = r.next_point() {
        r.tell(square_minus_two(x)).unwrap();
    }
    while let Some(x) = s.next_point() {
        s.tell(square_minus_two(x)).unwrap();
    }
    assert_eq!(r.result(), s.result());
}

#[test]
fn tampered_stepper_records_are_errors() {
    let mut s = api::stepper(r#"{"bracket":[0,3]}"#).unwrap();
    let x = s.next_point().unwrap();
    s.tell(square_minus_two(x)).unwrap();
    let saved = s.save();
    let moved = saved.replace("[[0.0,", "[[0.5,");
    assert_ne!(moved, saved);
    check_error(
        StepperSession::restore(&moved),
        "bad-saved-stepper",
        &["points[0]", "changed"],
    );
    check_error(
        StepperSession::restore("{}"),
        "bad-saved-stepper",
        &["format"],
    );
    check_error(
        StepperSession::restore("not json"),
        "bad-saved-stepper",
        &["not JSON"],
    );
    check_error(
        StepperSession::restore(&saved.replace("\"auto\"", "\"fast\"")),
        "bad-saved-stepper",
        &["fast"],
    );
    let huge = "x".repeat(api::MAX_SAVED_STEPPER_BYTES + 1);
    check_error(
        StepperSession::restore(&huge),
        "bad-saved-stepper",
        &["limit"],
    );
}

#[test]
fn stepper_accepts_non_finite_values_and_backs_off() {
    // ln(x) - 1 is undefined for x <= 0; the root is e (Rust std `std::f64::consts::E`).
    let mut s = api::stepper(r#"{"guesses":[-1,5]}"#).unwrap();
    while let Some(x) = s.next_point() {
        s.tell(x.ln() - 1.0).unwrap();
    }
    let out = parse(&api::text(&s.result().unwrap()).unwrap());
    if out["converged"] == Value::Bool(true) {
        assert!((f64_of(&out["root"]) - std::f64::consts::E).abs() < 1e-12);
    } else {
        assert_eq!(out["status"], "non-finite");
    }
}

// ---------------------------------------------------------------------------------------
// Units

#[test]
fn unit_conversion_through_the_facade() {
    // NIST SP 811 (2008) Appendix B.8: 1 psi = 6.894 757 E+03 Pa.
    let psi = api::convert_unit(100.0, "kPa", "psi").unwrap();
    assert!((psi - 100e3 / 6.894_757e3).abs() < 1e-5);
    check_error(
        api::convert_unit(f64::NAN, "m", "mm"),
        "non-finite-input",
        &["NaN"],
    );
    check_error(
        api::convert_unit(1.0, &"m".repeat(1000), "mm"),
        "unknown-unit",
        &["1000 characters"],
    );
    assert!(api::convert_unit(1.0, "m", "kg").is_err());
    let units = parse(&api::units_catalogue());
    assert!(units
        .as_array()
        .unwrap()
        .iter()
        .any(|d| d["dimension"] == "length"));
}

// ---------------------------------------------------------------------------------------
// Text equations, templates, scans, sweeps and systems

#[test]
fn wallis_cubic_natively() {
    // Wallis's cubic x³ − 2x − 5 = 0 has its real root at 2.0945514815423265 (a classic
    // test equation; value recalled from memory). tests/wasm checks the same in wasm32.
    let out = parse(
        &api::solve_equation(
            r#"{"equations":"x^3 - 2*x - 5","unknowns":[{"name":"x","guesses":[2,3]}]}"#,
        )
        .unwrap(),
    );
    assert!((f64_of(&out["root"]) - 2.094_551_481_542_326_5).abs() < 1e-11);
    assert_eq!(out["unknowns"]["x"], out["root"]);
}

#[test]
fn equation_requests_are_checked() {
    check_error(
        api::solve_equation("{}"),
        "bad-request",
        &["request.equations", "missing"],
    );
    check_error(
        api::solve_equation(r#"{"equations":"x^2 = a","knowns":{"a":"2"}}"#),
        "bad-request",
        &["request.knowns.a", "\"2\""],
    );
    check_error(
        api::solve_equation(r#"{"equations":"x^2 = a","knowns":{"a":2},"unknowns":[7]}"#),
        "bad-request",
        &["request.unknowns[0]"],
    );
    check_error(
        api::solve_equation(&format!(
            "{{\"equations\":\"{}\"}}",
            "x".repeat(api::MAX_EQUATION_CHARS + 1)
        )),
        "equation-too-long",
        &["limit"],
    );
    let e = api::solve_equation(r#"{"equations":"y = 2*x +","knowns":{"y":1}}"#)
        .err()
        .unwrap();
    assert_eq!(e.position, Some(9));
}

#[test]
fn solve_equation_in_units() {
    // Q = V*A for the velocity of 100 gpm in a 4-inch bore, in ft/s: 100 gal/min is
    // 100*231/60 in³/s (NIST SP 811 B.8: 1 gal = 231 in³), over pi*2² in², over 12 in/ft.
    let request = r#"{
        "equations": "A := pi*D^2/4\nQ = V*A",
        "knowns": {"Q": 100, "D": 4},
        "units": {"Q": "gpm", "D": "in", "V": "ft/s", "A": "in^2"},
        "unknowns": [{"name": "V", "guesses": [1, 3], "bounds": [0, 100]}],
        "history": true
    }"#;
    let out = parse(&api::solve_equation(request).unwrap());
    let v = 100.0 * 231.0 / 60.0 / (std::f64::consts::PI * 4.0) / 12.0;
    assert!(
        (f64_of(&out["unknowns"]["V"]) - v).abs() < 1e-12 * v,
        "{out}"
    );
    assert_eq!(out["root"], out["unknowns"]["V"]);
    let a = f64_of(&out["definitions"]["A"]);
    assert!(
        (a - 4.0 * std::f64::consts::PI).abs() < 1e-12,
        "A = {a} in²"
    );
    assert_eq!(f64_of(&out["history"][0]["x"]), 1.0, "history in ft/s");
    assert_eq!(out["units"]["V"], "ft/s");

    // A dimension mismatch names both sides and the place.
    let e = api::solve_equation(
        r#"{"equations":"hf = Q","knowns":{"Q":1},"units":{"hf":"ft","Q":"gpm"}}"#,
    )
    .err()
    .unwrap();
    assert_eq!((e.code, e.position), ("dimension-mismatch", Some(3)));
    assert_eq!(
        e.message,
        "left side is a length, right side is a volume flow; at 3"
    );
    let e = api::solve_equation(r#"{"equations":"y = exp(L)","knowns":{"L":1},"units":{"L":"m"}}"#)
        .err()
        .unwrap();
    assert_eq!((e.code, e.position), ("dimensionless-argument", Some(4)));
    // A number with a unit needs no `units` at all; a wrong one is caught without them.
    let out = parse(&api::solve_equation(r#"{"equations":"x = 2[ft] + 6[in]"}"#).unwrap());
    assert!((f64_of(&out["root"]) - 0.762).abs() < 1e-15);
    let e = api::solve_equation(r#"{"equations":"x = 2[ft] + 6[s]"}"#)
        .err()
        .unwrap();
    assert_eq!((e.code, e.position), ("dimension-mismatch", Some(10)));
    // Bad `units` fields.
    check_error(
        api::solve_equation(r#"{"equations":"y = x","knowns":{"x":1},"units":{"x":3}}"#),
        "bad-request",
        &["request.units.x"],
    );
    check_error(
        api::solve_equation(r#"{"equations":"y = x","knowns":{"x":1},"units":["m"]}"#),
        "bad-request",
        &["request.units"],
    );
    check_error(
        api::solve_equation(r#"{"equations":"y = x","knowns":{"x":1},"units":{"x":"cubit"}}"#),
        "unknown-unit",
        &["`x`", "cubit"],
    );
    check_error(
        api::solve_equation(r#"{"equations":"y = x","knowns":{"x":1},"units":{"q":"m"}}"#),
        "unknown-variable",
        &["`q`"],
    );
}

#[test]
fn check_equation_reports_variables_or_a_positioned_error() {
    let ok = parse(&api::check_equation("A := pi*D^2/4\nQ = V*A"));
    assert_eq!(ok["ok"], true);
    assert_eq!(ok["variables"], serde_json::json!(["D", "Q", "V"]));
    assert_eq!(ok["definitions"], serde_json::json!(["A"]));
    let bad = parse(&api::check_equation("y = 2*x +"));
    assert_eq!(bad["ok"], false);
    assert_eq!(bad["position"], 9);
    assert!(bad["caret"].as_str().unwrap().ends_with('^'));
}

#[test]
fn template_with_units_matches_swamee_jain() {
    // Colebrook (1939) solved for f; Swamee and Jain (1976) explicit form is stated to be
    // within about 1 % of it.
    let out = parse(
        &api::solve_template(
            r#"{"id":"pipes.colebrook","values":{"Re":360000,"eps":{"value":0.15,"unit":"mm"},"D":[300,"mm"]},"unknown":"f"}"#,
        )
        .unwrap(),
    );
    assert_eq!(out["converged"], true);
    let f = f64_of(&out["value"]);
    let (re, eps, d) = (360000.0f64, 0.15e-3, 0.3);
    let f_sj = 0.25 / (eps / (3.7 * d) + 5.74 / re.powf(0.9)).log10().powi(2);
    assert!((f - f_sj).abs() < 0.015 * f_sj, "{f} vs {f_sj}");
    check_error(
        api::solve_template(
            r#"{"id":"pipes.colebrook","values":{"D":{"value":"x","unit":"mm"}},"unknown":"f"}"#,
        ),
        "bad-request",
        &["request.values.D.value"],
    );
    check_error(
        api::solve_template(r#"{"id":"pipes.colebrook","values":{"Q":1},"unknown":"f"}"#),
        "unknown-variable",
        &["values.Q"],
    );
}

#[test]
fn catalogue_uses_camel_case() {
    let list = parse(&api::catalogue());
    let text = list.to_string();
    assert!(!list.as_array().unwrap().is_empty());
    assert!(!text.contains("\"unknowns_reason\""));
}

#[test]
fn roots_in_a_range_of_text_and_of_a_closure() {
    // x² = 2 on [-3, 3]: ±√2 (reference: Rust std f64::sqrt).
    let out = parse(&api::find_roots(r#"{"equations":"x^2 = 2","range":[-3,3]}"#).unwrap());
    let xs: Vec<f64> = out["roots"]
        .as_array()
        .unwrap()
        .iter()
        .map(|r| f64_of(&r["x"]))
        .collect();
    assert_eq!(xs.len(), 2);
    assert!((xs[0] + 2f64.sqrt()).abs() < 1e-12 && (xs[1] - 2f64.sqrt()).abs() < 1e-12);
    let out =
        parse(&api::find_roots_function(r#"{"range":[-1,7],"samples":100}"#, f64::sin).unwrap());
    assert_eq!(out["roots"].as_array().unwrap().len(), 3);
    assert_eq!(out["samples"], 100);
    check_error(
        api::find_roots_function(r#"{"range":[0,1],"samples":1e12}"#, f64::sin),
        "bad-samples",
        &["request.samples"],
    );
}

#[test]
fn sweep_continues_from_the_previous_root() {
    let out = parse(
        &api::sweep(r#"{"equations":"x^2 = a","input":"a","from":1,"to":100,"points":12,"guesses":[1,2],"bounds":[0,null]}"#)
            .unwrap(),
    );
    let a = out["input"].as_array().unwrap();
    let roots = out["root"].as_array().unwrap();
    assert_eq!(a.len(), 12);
    for (a, r) in a.iter().zip(roots) {
        // Reference: Rust std f64::sqrt.
        assert!((f64_of(r) - f64_of(a).sqrt()).abs() < 1e-10);
    }
    // Continuation: starting each solve from the previous root costs fewer evaluations
    // than starting every solve from the first guesses.
    let total = out["totalEvaluations"].as_u64().unwrap();
    let cold: u64 = a
        .iter()
        .map(|a| {
            let req = format!(
                r#"{{"equations":"x^2 = a","knowns":{{"a":{a}}},"unknowns":[{{"name":"x","guesses":[1,2],"bounds":[0,null]}}]}}"#
            );
            parse(&api::solve_equation(&req).unwrap())["evaluations"].as_u64().unwrap()
        })
        .sum();
    assert!(total < cold, "continued {total} vs cold {cold}");
    check_error(
        api::sweep(r#"{"equations":"x^2 = a","input":"a","from":1,"to":2,"points":1}"#),
        "bad-request",
        &["sweep.points"],
    );
}

#[test]
fn system_of_a_closure() {
    // x² + y² = 4 and x = y: x = y = √2 (reference: Rust std f64::sqrt).
    let out = parse(
        &api::solve_system_function(r#"{"x0":[1,2],"history":true}"#, |v, out| {
            out[0] = v[0] * v[0] + v[1] * v[1] - 4.0;
            out[1] = v[0] - v[1];
        })
        .unwrap(),
    );
    assert_eq!(out["converged"], true);
    for r in out["roots"].as_array().unwrap() {
        assert!((f64_of(r) - 2f64.sqrt()).abs() < 1e-9);
    }
    assert_eq!(
        out["history"].as_array().unwrap().len() as u64,
        out["evaluations"].as_u64().unwrap()
    );
    let noop = |_: &[f64], _: &mut [f64]| {};
    check_error(
        api::solve_system_function(r#"{"x0":[]}"#, noop),
        "bad-request",
        &["options.x0"],
    );
    check_error(
        api::solve_system_function(r#"{"x0":[1,"NaN"]}"#, noop),
        "bad-request",
        &["options.x0[1]", "NaN"],
    );
    check_error(
        api::solve_system_function(r#"{"x0":[1,2],"bounds":[[0,1]]}"#, noop),
        "bad-request",
        &["options.bounds"],
    );
    check_error(
        api::solve_system_function(r#"{"x0":[5],"bounds":[[0,1]]}"#, noop),
        "start-outside-bounds",
        &["options.x0[0]"],
    );
}
