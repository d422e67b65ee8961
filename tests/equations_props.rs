//! Properties of the equation language over many random inputs:
//! - any string is read to `Ok` or `Err`, never a panic, in bounded time;
//! - compiled programs are bit-identical to the general-purpose reference library
//!   meval (`meval::Expr::eval_with_context`, crates.io `meval` 0.2) on the same text,
//!   when they have no power that the language multiplies out
//!   ([`tacit::equations::functions::power`]); every program is bit-identical to a plain
//!   walk of meval's own RPN with that power (`walk_rpn` below), which checks the
//!   compiler's folding, fusing and sharing.

use std::time::{Duration, Instant};

use proptest::prelude::*;

mod common;
use common::{expression, value};
use tacit::equations::functions::reference_context;
use tacit::equations::{solve_set, EquationSet, Expression, UnknownSpec};
use tacit::Options;

/// A hang guard, not a speed goal: one case must not take seconds.
const HANG: Duration = Duration::from_secs(5);

/// Reads `text` every way the language offers; only panics or hangs can fail this.
fn read_every_way(text: &str) {
    let start = Instant::now();
    let _ = tacit::equations::caret(text, text.chars().count() / 2);
    if let Ok(e) = Expression::parse(text) {
        let names = e.names();
        let refs: Vec<&str> = names.iter().map(|s| s.as_str()).collect();
        if let Ok(p) = e.compile(&refs) {
            let _ = p.eval(&vec![0.5; refs.len()]);
        }
    }
    let _ = tacit::units::parse_unit(text);
    if let Ok(set) = EquationSet::parse(text) {
        // The dimension check, with some names given dimensions.
        let mut given = std::collections::HashMap::new();
        for (name, d) in [("x", "length"), ("y", "time"), ("z", "manning_n")] {
            given.insert(
                name.to_string(),
                tacit::dimension::Dimension::named(d).unwrap(),
            );
        }
        let _ = tacit::equations::dimensions::check(&set, &given, &[]);
        let vars = set.variables();
        if let Some((first, rest)) = vars.split_first() {
            let knowns: Vec<(String, f64)> = rest.iter().map(|v| (v.clone(), 1.5)).collect();
            let _ = solve_set(
                &set,
                &knowns,
                &[UnknownSpec::named(first)],
                &Options::default(),
                true,
            );
            let _ = set.residual_fn(&knowns, first).map(|mut f| f(0.25));
        }
    }
    assert!(
        start.elapsed() < HANG,
        "{text:?} took {:?}",
        start.elapsed()
    );
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(1500))]

    #[test]
    fn any_unicode_string_is_ok_or_err(text in any::<String>()) {
        read_every_way(&text);
    }

    #[test]
    fn strings_of_the_language_alphabet_are_ok_or_err(
        text in "[a-zSI0-9 .+\\-*/%^(),=:;#\n\t\\[\\]°²]{0,120}"
    ) {
        read_every_way(&text);
    }

    #[test]
    fn near_miss_texts_are_ok_or_err(
        text in "(x|y|e|pi|sin\\(|hypot\\(|npv\\(|when\\(|\\(|\\)|,|\\+|-|\\*|/|\\^|=|:=|;|\\.5|2e|1e3| |SI:|\\[|\\]|\\[m\\]|\\[degC\\]|\\[m/s\\^\\(1/3\\)\\]|\\[ft\\*lbf/s\\]){0,40}"
    ) {
        read_every_way(&text);
    }
}

/// Same bits, or both NaN (NaN payloads are not part of the language).
fn same(a: f64, b: f64) -> bool {
    a.to_bits() == b.to_bits() || (a.is_nan() && b.is_nan())
}

/// The value of meval's RPN walked one token at a time, as meval's own
/// `eval_with_context` does, but with the language's `^` (`functions::power`): no
/// folding, fusing or sharing.
fn walk_rpn(e: &Expression, vars: &[(&str, f64)]) -> f64 {
    use meval::tokenizer::{Operation, Token};
    let mut stack: Vec<f64> = Vec::new();
    for token in e.meval().iter() {
        match token {
            Token::Number(v) => stack.push(*v),
            Token::Var(name) => stack.push(
                vars.iter()
                    .find(|(n, _)| n == name)
                    .map(|&(_, v)| v)
                    .or_else(|| tacit::equations::functions::constant(name))
                    .unwrap(),
            ),
            Token::Unary(Operation::Minus) => {
                let a = stack.pop().unwrap();
                stack.push(-a)
            }
            Token::Unary(_) => {}
            Token::Binary(op) => {
                let r = stack.pop().unwrap();
                let l = stack.pop().unwrap();
                stack.push(match op {
                    Operation::Plus => l + r,
                    Operation::Minus => l - r,
                    Operation::Times => l * r,
                    Operation::Div => l / r,
                    Operation::Rem => l % r,
                    Operation::Pow => tacit::equations::functions::power(l, r),
                })
            }
            Token::Func(name, Some(n)) => {
                let args = stack.split_off(stack.len() - n);
                let f = tacit::equations::functions::find(name).unwrap();
                stack.push(f.func.call(&args))
            }
            t => panic!("unexpected token {t:?}"),
        }
    }
    stack.pop().unwrap()
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(2000))]

    #[test]
    fn compiled_programs_are_bit_identical_to_meval(
        text in expression(), x in value(), y in value(), z in value()
    ) {
        let e = Expression::parse(&text).unwrap();
        let program = e.compile(&["x", "y", "z"]).unwrap();
        let vars = vec![("x", x), ("y", y), ("z", z)];
        let ctx = reference_context();
        let got = program.eval(&[x, y, z]);
        let walked = walk_rpn(&e, &vars);
        prop_assert!(same(got, walked), "{text}: compiled {got:e}, walked {walked:e}");
        if !program.has_multiplied_powers() {
            let reference = e.meval().eval_with_context((&vars, &ctx)).unwrap();
            prop_assert!(same(got, reference), "{text}: compiled {got:e}, meval {reference:e}");
            // meval on the original text too, where meval reads it (it refuses `.5`).
            if let Ok(original) = text.parse::<meval::Expr>() {
                let r2 = original.eval_with_context((&vars, &ctx)).unwrap();
                prop_assert!(same(got, r2), "{text}: compiled {got:e}, meval(original) {r2:e}");
            }
        }
    }

    #[test]
    fn repeated_subexpressions_computed_once_are_bit_identical_to_meval(
        a in expression(), b in expression(), x in value(), y in value(), z in value()
    ) {
        // Shared subexpressions are computed once and kept (common subexpressions).
        let text = format!("({a})*({a}) + sin({a}) - ({b})^({a}) + hypot({b}, {b})");
        let e = Expression::parse(&text).unwrap();
        let program = e.compile(&["x", "y", "z"]).unwrap();
        let vars = vec![("x", x), ("y", y), ("z", z)];
        let got = program.eval(&[x, y, z]);
        let walked = walk_rpn(&e, &vars);
        prop_assert!(same(got, walked), "{text}: compiled {got:e}, walked {walked:e}");
    }

    #[test]
    fn folded_residuals_are_bit_identical_to_a_plain_walk(
        d in expression(), lhs in expression(), rhs in expression(),
        x in value(), y in value(), z in value()
    ) {
        // x is the unknown; y and z are folded into the program, as is `d` unless it uses x.
        let text = format!("d := {d}\n{lhs} + d = {rhs}");
        let set = EquationSet::parse(&text).unwrap();
        let mut knowns = Vec::new();
        for v in set.variables() {
            match v.as_str() {
                "y" => knowns.push(("y".to_string(), y)),
                "z" => knowns.push(("z".to_string(), z)),
                _ => {}
            }
        }
        let vars = vec![("x", x), ("y", y), ("z", z)];
        let dv = walk_rpn(set.definitions()[0].1, &vars);
        let vars_d = vec![("x", x), ("y", y), ("z", z), ("d", dv)];
        let reference = walk_rpn(set.equations()[0], &vars_d);
        if set.variables().iter().any(|v| v == "x") {
            let mut f = set.residual_fn(&knowns, "x").unwrap();
            let got = f(x);
            prop_assert!(same(got, reference), "{text}: compiled {got:e}, walked {reference:e}");
        }
    }
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(1000))]

    /// A text with no units (none given, none on its numbers) always passes the
    /// dimension check, which is why a request without units skips it.
    #[test]
    fn texts_without_units_pass_the_dimension_check(a in expression(), b in expression()) {
        let set = EquationSet::parse(&format!("d := {b}\n{a} = d*x")).unwrap();
        let r = tacit::equations::dimensions::check(&set, &Default::default(), &[]);
        prop_assert!(r.is_ok(), "{a} = {b}: {:?}", r.err());
    }
}

#[test]
fn long_legal_inputs_are_read_and_solved_without_deep_recursion() {
    // Near the size limit, shapes that would overflow a recursive parser or compiler:
    // long operator chains, a long chain of definitions, many equations.
    let mut defs = String::from("a0 := x\n");
    for i in 1..12_000 {
        defs.push_str(&format!("a{i} := a{}+1\n", i - 1));
    }
    defs.push_str("a11999 = 3\n");
    let cases = [
        ("x+".repeat(120_000) + "x", Some(0.0)),
        ("x^".repeat(120_000) + "x - 1", Some(1.0)),
        ("-".repeat(240_000) + "x - 2", Some(2.0)),
        (defs, Some(3.0 - 11_999.0)),
    ];
    for (text, root) in cases {
        let start = Instant::now();
        let set = EquationSet::parse(&text).unwrap();
        let s = solve_set(
            &set,
            &[],
            &[UnknownSpec::named("x")],
            &Options::default(),
            true,
        )
        .unwrap();
        if let Some(r) = root {
            assert!(s.converged, "{:?}", s.status);
            assert!(
                (s.unknowns[0].1 - r).abs() <= 1e-9 * r.abs().max(1.0),
                "{:?}",
                s.unknowns
            );
        }
        assert!(start.elapsed() < HANG * 4, "took {:?}", start.elapsed());
    }
}

/// A power folded at compile time (`pi ^ ceil(pi)` is `pi^4`, multiplied out by
/// `functions::power`) counts as a multiplied power, so the comparison with meval's
/// `powf` above knows to skip it (found by the property test above).
#[test]
fn folded_multiplied_powers_are_reported() {
    for (text, multiplied) in [
        ("pi ^ ceil(pi)", true),
        ("2 ^ 0.5", true),
        ("2 ^ 2.5", false),
        ("x ^ 2", true),
    ] {
        let e = Expression::parse(text).unwrap();
        let program = e.compile(&["x", "y", "z"]).unwrap();
        assert_eq!(program.has_multiplied_powers(), multiplied, "{text}");
    }
}
