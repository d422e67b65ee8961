//! The equation language: precedence, numbers, statements, names, and errors that point
//! at the problem. Expected values of plain arithmetic are common mathematical
//! convention (no source); positions are character offsets into the text.
//!
//! Precedence, tightest first: ( ) and calls; ^ (right-assoc); unary - +; * / % (left);
//! + - (left).

use tacit::equations::{caret, EquationSet, Expression, MAX_DEPTH, MAX_TEXT_BYTES};
use tacit::InputError;

fn value(text: &str) -> f64 {
    let e = Expression::parse(text).unwrap_or_else(|e| panic!("{text}: {e:?}"));
    e.compile(&[]).unwrap().eval(&[])
}

fn value_with(text: &str, names: &[&str], values: &[f64]) -> f64 {
    Expression::parse(text)
        .unwrap()
        .compile(names)
        .unwrap()
        .eval(values)
}

/// Checks one value, naming the convention it follows.
fn check(text: &str, expected: f64, why: &str) {
    let got = value(text);
    assert_eq!(
        got, expected,
        "{text} should be {expected} ({why}), got {got}"
    );
}

fn err(text: &str) -> InputError {
    match EquationSet::parse(text) {
        Ok(_) => panic!("{text:?} should be refused"),
        Err(e) => e,
    }
}

/// Checks an error's code and position, and that the message mentions `mention`.
fn check_err(text: &str, code: &str, position: usize, mention: &str) {
    let e = err(text);
    assert_eq!(e.code, code, "{text:?}: {e:?}");
    assert_eq!(e.position, Some(position), "{text:?}: {e:?}");
    assert!(
        e.message.contains(mention),
        "{text:?}: message {:?} should mention {mention:?}",
        e.message
    );
}

#[test]
fn power_binds_tighter_than_unary_minus_and_is_right_associative() {
    // Common mathematical convention, no source.
    check("-2^2", -4.0, "-(2^2)");
    check("2^3^2", 512.0, "2^(3^2)");
    check("(2^3)^2", 64.0, "parentheses first");
    check("(-2)^2", 4.0, "parentheses first");
    check("2^-1", 0.5, "a sign after ^ belongs to the exponent");
    check("2^-3^2", 2f64.powf(-9.0), "2^(-(3^2))");
    check("-2*3", -6.0, "unary minus then product");
    check("2*3^2", 18.0, "^ before *");
    check("2+3*4", 14.0, "* before +");
    check("1-2-3", -4.0, "- is left-associative");
    check("8/4/2", 1.0, "/ is left-associative");
    check("7%4", 3.0, "remainder");
    check("-7%4", -3.0, "remainder takes the sign of the dividend");
    check("--2", 2.0, "two unary minuses");
    check("-+2", -2.0, "unary plus changes nothing");
    check("2*-3", -6.0, "a sign after an operator");
    check("1 - -1", 2.0, "binary then unary minus");
}

#[test]
fn numbers_in_every_written_form() {
    check(".5", 0.5, "leading dot");
    check("-.5", -0.5, "leading dot after a sign");
    check(".5e1", 5.0, "leading dot with exponent");
    check("5.", 5.0, "trailing dot");
    check("1e3", 1000.0, "exponent");
    check("1E-3", 0.001, "capital E, negative exponent");
    check("2.5e+2", 250.0, "explicit plus in exponent");
    check("0.1+0.2", 0.1 + 0.2, "same rounding as Rust");
}

#[test]
fn constants_and_shadowing() {
    check("pi", std::f64::consts::PI, "constant pi");
    check("e", std::f64::consts::E, "constant e");
    // A variable named e wins over the constant (eccentricity in column formulas).
    assert_eq!(value_with("e*2", &["e"], &[0.25]), 0.5);
    let set = EquationSet::parse("y = e*x").unwrap();
    assert_eq!(set.variables(), ["y", "x"]);
    assert_eq!(set.constants_used(), ["e"]);
    let declared = EquationSet::parse_declaring("y = e*x", &["e"]).unwrap();
    assert_eq!(declared.variables(), ["y", "e", "x"]);
    assert!(declared.constants_used().is_empty());
    // A definition shadows a constant too.
    let defined = EquationSet::parse("pi := 3\ny = pi").unwrap();
    assert_eq!(defined.variables(), ["y"]);
}

#[test]
fn functions_of_the_language() {
    // Identities of common practice, no source; exact where the operation is exact.
    check("log10(1000)", 3.0, "log10");
    check("sec(0)", 1.0, "1/cos 0");
    check("csc(pi/2)", 1.0, "1/sin(pi/2)");
    check(
        "cot(pi/4)",
        1.0 / (std::f64::consts::PI / 4.0).tan(),
        "1/tan",
    );
    check("asinh(0)", 0.0, "asinh");
    check("acosh(1)", 0.0, "acosh");
    check("atanh(0)", 0.0, "atanh");
    check("hypot(3, 4)", 5.0, "3-4-5 triangle");
    check("sign(-3) + sign(0) + sign(2)", 0.0, "-1 + 0 + 1");
    check("min(3, 1, 2)", 1.0, "min");
    check("max(3, 1, 2)", 3.0, "max");
    check("clamp(5, 0, 2)", 2.0, "clamp above");
    check("clamp(-5, 0, 2)", 0.0, "clamp below");
    check("when(1, 10, 20)", 10.0, "t > 0");
    check("when(0, 10, 20)", 20.0, "t = 0 is not > 0");
    check("when(-1, 10, 20)", 20.0, "t < 0");
    // npv(r, c0..cn) = Σ c_k/(1+r)^k; at r = 0 it is the plain sum.
    check("npv(0, -100, 60, 60)", 20.0, "undiscounted sum");
    check("npv(1, 8, 8, 8)", 14.0, "8 + 4 + 2");
    assert!(
        value("clamp(1, 2, 0)").is_nan(),
        "reversed limits give NaN, not a panic"
    );
    assert!(
        value("when(0/0, 1, 2)").is_nan(),
        "an undefined condition is NaN"
    );
    assert!(value("max(1, 0/0)").is_nan(), "NaN propagates through max");
}

#[test]
fn cancellation_free_forms_match_the_standard_library() {
    // Reference: Rust's standard library f64::exp_m1 and f64::ln_1p (libm), which keep
    // full relative precision for small arguments where exp(x) - 1 and ln(1 + x) lose it.
    for x in [1e-300, -1e-17, 1e-10, -3e-8, 0.5, -0.75, 7.0, 700.0] {
        check(&format!("expm1({x:e})"), f64::exp_m1(x), "std exp_m1");
        check(&format!("log1p({x:e})"), f64::ln_1p(x), "std ln_1p");
    }
    // At 1e-10 the naive forms have lost about six digits; the new ones have not.
    let naive = value("exp(1e-10) - 1");
    let exact = value("expm1(1e-10)");
    assert!(
        (naive - 1e-10).abs() > 1e-18,
        "naive form is visibly off: {naive:e}"
    );
    assert!(
        (exact - 1.00000000005e-10).abs() < 1e-25,
        "expm1(1e-10) = {exact:e}"
    );
    assert!(value("log1p(-1)").is_infinite() && value("log1p(-2)").is_nan());
}

#[test]
fn statements_comments_and_definitions() {
    let text = "# pipe flow\nA := pi*D^2/4   # area\nQ = V*A; hf = k*V^2\n\n  \n";
    let set = EquationSet::parse(text).unwrap();
    assert_eq!(set.equation_count(), 2);
    assert_eq!(set.definition_names(), ["A"]);
    assert_eq!(set.variables(), ["D", "Q", "V", "hf", "k"]);
    // A bare expression means "= 0".
    let bare = EquationSet::parse("x^2 - 2").unwrap();
    assert_eq!(bare.equations()[0].normalised(), "x^2-2");
    // lhs = rhs becomes the residual (lhs)-(rhs).
    let eq = EquationSet::parse("y = 2*x").unwrap();
    assert_eq!(eq.equations()[0].normalised(), "(y)-(2*x)");
    // Definitions are ordered by dependency, not by text.
    let set = EquationSet::parse("c := b*2\nb := a+1\ny = c").unwrap();
    let order: Vec<&str> = set.definitions().iter().map(|(n, _)| *n).collect();
    assert_eq!(order, ["b", "c"]);
}

#[test]
fn errors_name_the_problem_and_the_place() {
    check_err("", "empty-input", 0, "no equation");
    check_err("   \t  ", "empty-input", 0, "no equation");
    check_err("# only a comment\n\n;;", "empty-input", 0, "no equation");
    check_err("y = 2*x +", "missing-operand", 9, "`+`");
    check_err("y = (x + 1", "unbalanced-parentheses", 4, "never closed");
    check_err("y = x + 1)", "unbalanced-parentheses", 9, "no matching");
    check_err("y = 2 x", "missing-operator", 6, "the number 2 and `x`");
    check_err("y = foo(x)", "unknown-function", 4, "`foo`");
    check_err("y = log(x)", "unknown-function", 4, "log10");
    check_err(
        "y = hypot(x)",
        "wrong-argument-count",
        4,
        "takes 2 arguments, got 1",
    );
    check_err(
        "y = sin(x, 2)",
        "wrong-argument-count",
        4,
        "takes 1 argument, got 2",
    );
    check_err("y = clamp()", "wrong-argument-count", 4, "got none");
    check_err("y = npv(0.1)", "wrong-argument-count", 4, "at least 2");
    check_err("y = ()", "missing-operand", 4, "empty parentheses");
    check_err("y = x, 2", "unexpected-comma", 5, "`,`");
    check_err("a = b = c", "too-many-equals", 6, "at most one");
    check_err("= 3", "missing-operand", 0, "left of =");
    check_err("y =", "missing-operand", 2, "right of =");
    check_err("y == 3", "unknown-operator", 2, "single =");
    check_err("y = 2**3", "unknown-operator", 5, "^");
    check_err("y = x < 3", "unknown-operator", 6, "when(");
    check_err("y = 2e", "bad-number", 5, "`2e`");
    check_err("y = 1e999", "bad-number", 4, "too large");
    check_err("y = . + 1", "bad-number", 4, "lone");
    check_err("y = x $ 2", "unexpected-character", 6, "`$`");
    check_err("y = [x]", "unexpected-character", 4, "( and )");
    check_err("a + b := 3", "bad-definition", 6, "single name");
    check_err("k :=", "bad-definition", 2, "nothing after");
    check_err("k := 1\nk := 2", "duplicate-definition", 7, "twice");
    check_err(
        "a := b\nb := a + 1\ny = a",
        "circular-definition",
        0,
        "a uses b uses a",
    );
    check_err(
        "y = 1\nz := z + 1",
        "circular-definition",
        6,
        "`z` depends on itself",
    );
    check_err("y : 3", "unexpected-character", 2, ":=");
}

#[test]
fn positions_count_characters_not_bytes() {
    // "é" is two bytes in UTF-8 but one character.
    let text = "# café\ny = 2 +";
    let e = err(text);
    assert_eq!(e.position, Some(14));
    assert_eq!(caret(text, 14), "y = 2 +\n       ^");
}

#[test]
fn caret_marks_the_column_on_the_right_line() {
    assert_eq!(caret("a = 1\nb = foo(2)", 10), "b = foo(2)\n    ^");
    assert_eq!(caret("x +", 3), "x +\n   ^");
    assert_eq!(caret("\tx $", 3), "\tx $\n\t  ^");
    assert_eq!(caret("", 0), "\n^");
}

#[test]
fn a_megabyte_is_refused_by_its_size() {
    let text = "x+".repeat(512 * 1024) + "1";
    assert!(text.len() > MAX_TEXT_BYTES);
    let e = err(&text);
    assert_eq!(e.code, "input-too-long");
    assert!(e.message.contains(&text.len().to_string()), "{}", e.message);
    assert!(Expression::parse(&text).is_err());
}

#[test]
fn deep_nesting_is_refused_at_the_limit() {
    let deep = "(".repeat(100_000) + "1" + &")".repeat(100_000);
    let e = err(&deep);
    assert_eq!(e.code, "too-deep");
    assert_eq!(e.position, Some(MAX_DEPTH), "{e:?}");
    let calls = "sin(".repeat(100_000) + "1" + &")".repeat(100_000);
    assert_eq!(err(&calls).code, "input-too-long");
    let calls = "sin(".repeat(30_000) + "1" + &")".repeat(30_000);
    assert_eq!(err(&calls).code, "too-deep");
    // Just inside the limit is fine.
    let ok = "(".repeat(MAX_DEPTH) + "1" + &")".repeat(MAX_DEPTH);
    assert_eq!(value(&ok), 1.0);
}

#[test]
fn long_flat_input_within_the_limit_is_read_in_bounded_time() {
    // Some 30,000 distinct names: read without quadratic work.
    let text: String = (0..30_000)
        .map(|i| format!("a{i}"))
        .collect::<Vec<_>>()
        .join("+");
    assert!(text.len() < MAX_TEXT_BYTES);
    let set = EquationSet::parse(&text).unwrap();
    assert_eq!(set.variables().len(), 30_000);
}

#[test]
fn names_may_match_functions_when_not_called() {
    // `sec` as seconds: a name is a function only when followed by `(`.
    assert_eq!(value_with("sec*2 + sec(0)", &["sec"], &[3.0]), 7.0);
}

#[test]
fn a_repeated_subexpression_is_computed_once() {
    // sqrt(f) twice in the Colebrook residual: the second is fetched, not recomputed.
    let text = "1/sqrt(f) + 2*log10(k/3.7 + 2.51/(Re*sqrt(f)))";
    let e = Expression::parse(text).unwrap();
    let once = Expression::parse("1/s + 2*log10(k/3.7 + 2.51/(Re*s))").unwrap();
    let p = e.compile(&["f", "k", "Re"]).unwrap();
    let q = once.compile(&["s", "k", "Re"]).unwrap();
    // One square root in the program (its Debug form names each operation); the same
    // value as with the root taken by hand.
    assert_eq!(format!("{p:?}").matches("Sqrt").count(), 1, "{p:?}");
    assert_eq!(format!("{q:?}").matches("Sqrt").count(), 0, "{q:?}");
    let f: f64 = 0.02;
    assert_eq!(p.eval(&[f, 1e-3, 1e5]), q.eval(&[f.sqrt(), 1e-3, 1e5]));
}
