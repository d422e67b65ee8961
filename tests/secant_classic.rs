//! The classic secant method, exactly as in the textbooks.

use tacit::{solve, MethodKind, Options, Start, Status};

fn secant() -> Options {
    Options {
        method: MethodKind::Secant,
        ..Options::default()
    }
}

/// Calls f and counts the calls.
fn counted(
    f: impl Fn(f64) -> f64,
) -> (impl FnMut(f64) -> f64, std::rc::Rc<std::cell::Cell<usize>>) {
    let n = std::rc::Rc::new(std::cell::Cell::new(0));
    let m = n.clone();
    (
        move |x| {
            m.set(m.get() + 1);
            f(x)
        },
        n,
    )
}

/// One new evaluation per iteration plus f(x1) before the loop (common practice, no source),
/// plus the driver's checks of a claim of convergence (at most one here: a point just
/// beyond the estimate).
fn check_iterations_plus_one(name: &str, f: fn(f64) -> f64, a: f64, b: f64) {
    let (g, calls) = counted(f);
    let s = solve(Start::Guesses(a, b), &secant(), g).unwrap();
    assert!(s.iterations >= 1, "{name}: no iteration");
    assert!(s.checks <= 1, "{name}: {} checks", s.checks);
    assert_eq!(
        s.evaluations,
        s.iterations + 1 + s.checks,
        "{name}: evaluations {} != iterations {} + 1 + checks {} (status {:?})",
        s.evaluations,
        s.iterations,
        s.checks,
        s.status
    );
    assert_eq!(calls.get(), s.evaluations, "{name}: counted calls");
}

#[test]
fn evaluations_are_iterations_plus_one() {
    // Functions: common practice, no source.
    check_iterations_plus_one("x^2 - 2", |x| x * x - 2.0, 1.0, 2.0);
    check_iterations_plus_one("cos x - x", |x| x.cos() - x, 0.5, 0.8);
    check_iterations_plus_one("x^3 - 2x - 5", |x| x * x * x - 2.0 * x - 5.0, 2.0, 3.0);
    check_iterations_plus_one("e^x - 2", |x| x.exp() - 2.0, 0.0, 1.0);
    // A run that ends on the budget, not on convergence.
    check_iterations_plus_one("x e^-x runaway", |x| x * (-x).exp(), 2.0, 3.0);
}

#[test]
fn converges_to_the_textbook_root() {
    // Wallis's equation x^3 - 2x - 5 = 0, root 2.0945514815423265 (recalled from memory).
    let s = solve(Start::Guesses(2.0, 3.0), &secant(), |x| {
        x * x * x - 2.0 * x - 5.0
    })
    .unwrap();
    assert!(s.converged);
    assert!(
        (s.root - 2.094_551_481_542_326_5).abs() < 1e-12,
        "{}",
        s.root
    );
}

#[test]
fn equal_guesses_are_an_error_naming_them() {
    let e = solve(Start::Guesses(1.5, 1.5), &secant(), |x| x - 1.0).unwrap_err();
    assert_eq!(e.code, "equal-guesses");
    assert!(e.message.contains("first guess"), "{}", e.message);
    assert!(e.message.contains("second guess"), "{}", e.message);
    assert!(e.message.contains("1.5"), "{}", e.message);
}

#[test]
fn equal_values_give_flat() {
    // f(-1) == f(1) for an even function: the secant line is horizontal.
    let s = solve(Start::Guesses(-1.0, 1.0), &secant(), |x| x * x - 4.0).unwrap();
    assert_eq!(s.status, Status::Flat);
    assert!(!s.converged);
    assert_eq!(s.evaluations, 2);
    // A constant function is flat from the first iteration.
    let s = solve(Start::Guesses(6.0, 8.0), &secant(), |_| 5.0).unwrap();
    assert_eq!(s.status, Status::Flat);
    assert!(!s.converged);
}
