//! The JSON facade (`tacit::api`), natively: results against outside references, and
//! every kind of bad input answered by an `InputError` that names the value and place.

use serde_json::Value;
use tacit::api::{self, StepperSession};
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
    // The first row has no previous point: its step is NaN, written as a string.
    assert_eq!(history[0]["step"], Value::String("NaN".into()));
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
            r#"{"guesses":[1,2],"tolerances":{"maxEvals":3},"bounds":[0,"Infinity"]}"#,
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
        &["not valid JSON"],
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
        api::solve_function(r#"{"guesses":[1,"NaN"]}"#, f),
        "non-finite-input",
        &["options.guesses[1]", "NaN"],
    );
    check_error(
        api::solve_function(r#"{"guesses":["Infinity",1]}"#, f),
        "non-finite-input",
        &["options.guesses[0]"],
    );
    check_error(
        api::solve_function(r#"{"guesses":[1]}"#, f),
        "bad-request",
        &["two numbers"],
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
        &["unknown field \"tolerance\"", "tolerances"],
    );
    check_error(
        api::solve_function(r#"{"guesses":[1,2],"tolerances":{"xRel":-1}}"#, f),
        "bad-tolerance",
        &["options.tolerances.xRel", "-1"],
    );
    check_error(
        api::solve_function(r#"{"guesses":[1,2],"tolerances":{"maxEvals":2.5}}"#, f),
        "bad-request",
        &["maxEvals", "whole number"],
    );
    check_error(
        api::solve_function(r#"{"guesses":[1,2],"tolerances":{"maxEvals":1e300}}"#, f),
        "bad-request",
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
        &["options.history", "true or false"],
    );
}

#[test]
fn deep_nesting_and_huge_requests_are_errors() {
    let deep = format!("{}{}", "[".repeat(100_000), "]".repeat(100_000));
    check_error(
        api::solve_function(&deep, square_minus_two),
        "bad-request",
        &["JSON"],
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
    let mut s = StepperSession::create(opts).unwrap();
    while let Some(x) = s.next_point() {
        s.tell(square_minus_two(x)).unwrap();
    }
    assert!(s.is_done());
    let stepped = parse(&s.result().unwrap());
    let direct = parse(&api::solve_function(opts, square_minus_two).unwrap());
    assert_eq!(stepped, direct);
    // Reference: Rust std `f64::sqrt`.
    assert!((f64_of(&stepped["root"]) - 2f64.sqrt()).abs() <= 1e-11);
    check_error(s.tell(0.0), "nothing-pending", &["finished"]);
}

#[test]
fn stepper_saved_mid_way_resumes_without_evaluating_again() {
    let mut s = StepperSession::create(r#"{"guesses":[1,2]}"#).unwrap();
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
    let mut s = StepperSession::create(r#"{"bracket":[0,3]}"#).unwrap();
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
    let huge = "x".repeat(api::MAX_REQUEST_BYTES + 1);
    check_error(
        StepperSession::restore(&huge),
        "bad-saved-stepper",
        &["limit"],
    );
}

#[test]
fn stepper_accepts_non_finite_values_and_backs_off() {
    // ln(x) - 1 is undefined for x <= 0; the root is e (Rust std `std::f64::consts::E`).
    let mut s = StepperSession::create(r#"{"guesses":[-1,5]}"#).unwrap();
    while let Some(x) = s.next_point() {
        s.tell(x.ln() - 1.0).unwrap();
    }
    let out = parse(&s.result().unwrap());
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
