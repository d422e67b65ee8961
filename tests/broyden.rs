//! Broyden's method on published worked examples and closed forms.

use std::cell::Cell;

use tacit::broyden::{solve_dense, solve_system, SystemOptions};
use tacit::{Bounds, Status, StepKind, Tolerances};

type System = fn(&[f64], &mut [f64]);

/// Solves and checks the root against `expected` to `within` in every unknown.
fn check(source: &str, f: System, x0: &[f64], expected: &[f64], within: f64) {
    let calls = Cell::new(0usize);
    let s = solve_system(x0, &SystemOptions::default(), |x, out| {
        calls.set(calls.get() + 1);
        f(x, out)
    })
    .unwrap();
    assert!(
        s.converged,
        "{source}: {:?} after {} evaluations at {:?}",
        s.status, s.evaluations, s.x
    );
    assert_eq!(
        s.evaluations,
        calls.get(),
        "{source}: exact evaluation count"
    );
    assert_eq!(s.x.len(), expected.len(), "{source}: number of unknowns");
    for (i, (&got, &want)) in s.x.iter().zip(expected).enumerate() {
        assert!(
            (got - want).abs() <= within,
            "{source}: x[{i}] = {got}, expected {want}"
        );
    }
    let largest = s.residuals.iter().fold(0.0f64, |m, v| m.max(v.abs()));
    assert!(largest < 1e-9, "{source}: residual {largest:e}");
}

#[test]
fn burden_faires_three_by_three() {
    // Burden & Faires, Numerical Analysis, §10.3 (Broyden's method), Example 1, from
    // x0 = (0.1, 0.1, -0.1); solution (0.5, 0, -π/6) in closed form (recalled from memory).
    check(
        "Burden & Faires §10.3 Example 1",
        |x, o| {
            o[0] = 3.0 * x[0] - (x[1] * x[2]).cos() - 0.5;
            o[1] = x[0] * x[0] - 81.0 * (x[1] + 0.1).powi(2) + x[2].sin() + 1.06;
            o[2] = (-x[0] * x[1]).exp() + 20.0 * x[2] + (10.0 * std::f64::consts::PI - 3.0) / 3.0;
        },
        &[0.1, 0.1, -0.1],
        &[0.5, 0.0, -std::f64::consts::PI / 6.0],
        1e-10,
    );
}

#[test]
fn dennis_schnabel_two_by_two() {
    // Dennis & Schnabel (1983), the example system x1 + x2 = 3, x1² + x2² = 9 from
    // (1, 5), solution (0, 3) (recalled from memory; checked by substitution).
    check(
        "Dennis & Schnabel x1 + x2 = 3, x1² + x2² = 9",
        |x, o| {
            o[0] = x[0] + x[1] - 3.0;
            o[1] = x[0] * x[0] + x[1] * x[1] - 9.0;
        },
        &[1.0, 5.0],
        &[0.0, 3.0],
        1e-10,
    );
}

#[test]
fn rosenbrock_as_a_system() {
    // Moré, Garbow & Hillstrom, ACM TOMS 7 (1981), problem 1 (Rosenbrock) as equations
    // 10(x2 - x1²) = 0, 1 - x1 = 0 from (-1.2, 1); solution (1, 1) (recalled from memory).
    check(
        "Moré-Garbow-Hillstrom problem 1",
        |x, o| {
            o[0] = 10.0 * (x[1] - x[0] * x[0]);
            o[1] = 1.0 - x[0];
        },
        &[-1.2, 1.0],
        &[1.0, 1.0],
        1e-10,
    );
}

#[test]
fn circle_and_line() {
    // x² + y² = 4, x = y: (√2, √2) in closed form (common practice, no source).
    check(
        "circle and line",
        |x, o| {
            o[0] = x[0] * x[0] + x[1] * x[1] - 4.0;
            o[1] = x[0] - x[1];
        },
        &[1.0, 2.0],
        &[2f64.sqrt(), 2f64.sqrt()],
        1e-12,
    );
}

#[test]
fn linear_system_is_solved_in_few_steps() {
    // A linear system with the integer solution (1, -2, 3) (common practice, no source):
    // the finite-difference Jacobian is exact up to rounding.
    let f: System = |x, o| {
        o[0] = 2.0 * x[0] + x[1] - x[2] + 3.0;
        o[1] = -3.0 * x[0] - x[1] + 2.0 * x[2] - 5.0;
        o[2] = -2.0 * x[0] + x[1] + 2.0 * x[2] - 2.0;
    };
    check("linear 3x3", f, &[0.0, 0.0, 0.0], &[1.0, -2.0, 3.0], 1e-9);
    let s = solve_system(&[0.0, 0.0, 0.0], &SystemOptions::default(), f).unwrap();
    assert!(s.iterations <= 4, "{} iterations", s.iterations);
}

#[test]
fn gaussian_elimination_needs_pivoting() {
    // [[0, 1], [1, 1]] s = [1, 2] has the solution (1, 1); without row exchanges the
    // first pivot is zero (Golub & Van Loan, Matrix Computations, §3.4, recalled).
    let s = solve_dense(&[0.0, 1.0, 1.0, 1.0], &[1.0, 2.0], 2).unwrap();
    assert!(
        (s[0] - 1.0).abs() < 1e-15 && (s[1] - 1.0).abs() < 1e-15,
        "{s:?}"
    );
    assert!(
        solve_dense(&[1.0, 2.0, 2.0, 4.0], &[1.0, 2.0], 2).is_none(),
        "singular"
    );
}

#[test]
fn bounds_are_respected() {
    // x² = 4 and y = 1 with 1 <= x <= 10: only the root x = 2 is inside.
    let seen = Cell::new(true);
    let options = SystemOptions {
        bounds: vec![Bounds::new(1.0, 10.0).unwrap(), Bounds::UNBOUNDED],
        ..SystemOptions::default()
    };
    let s = solve_system(&[1.0, 0.0], &options, |x, o| {
        if !(1.0..=10.0).contains(&x[0]) {
            seen.set(false);
        }
        o[0] = x[0] * x[0] - 4.0;
        o[1] = x[1] - 1.0;
    })
    .unwrap();
    assert!(seen.get(), "evaluated outside the bounds");
    assert!(s.converged && (s.x[0] - 2.0).abs() < 1e-10, "{s:?}");
    // x + 5 = 0 with 0 <= x <= 10: the root lies outside.
    let options = SystemOptions {
        bounds: vec![Bounds::new(0.0, 10.0).unwrap()],
        ..SystemOptions::default()
    };
    let s = solve_system(&[3.0], &options, |x, o| o[0] = x[0] + 5.0).unwrap();
    assert!(!s.converged);
    assert_eq!(s.status, Status::StuckAtBound, "{s:?}");
    assert_eq!(s.x[0], 0.0);
}

#[test]
fn no_solution_is_not_converged() {
    // x² + 1 = 0 has no real solution (common practice, no source).
    let s = solve_system(&[1.0, 2.0], &SystemOptions::default(), |x, o| {
        o[0] = x[0] * x[0] + 1.0;
        o[1] = x[1] - 1.0;
    })
    .unwrap();
    assert!(!s.converged, "{s:?}");
    assert!(s.evaluations <= 200);
    // F not finite at the start.
    let s = solve_system(&[-1.0], &SystemOptions::default(), |x, o| o[0] = x[0].ln()).unwrap();
    assert_eq!(s.status, Status::NonFinite);
    assert!(!s.converged);
}

#[test]
fn nan_on_the_way_is_backed_off_from() {
    // ln x + y = 0, x - 2y = 3 from (0.5, 0): solution x = 1.5... found numerically;
    // check by substitution that the residuals vanish (common practice, no source).
    let s = solve_system(&[0.5, 0.0], &SystemOptions::default(), |x, o| {
        o[0] = x[0].ln() + x[1];
        o[1] = x[0] - 2.0 * x[1] - 3.0;
    })
    .unwrap();
    assert!(s.converged, "{s:?}");
    assert!((s.x[0].ln() + s.x[1]).abs() < 1e-12);
    assert!((s.x[0] - 2.0 * s.x[1] - 3.0).abs() < 1e-12);
}

#[test]
fn budget_and_history() {
    let f: System = |x, o| {
        o[0] = 3.0 * x[0] - (x[1] * x[2]).cos() - 0.5;
        o[1] = x[0] * x[0] - 81.0 * (x[1] + 0.1).powi(2) + x[2].sin() + 1.06;
        o[2] = (-x[0] * x[1]).exp() + 20.0 * x[2] + (10.0 * std::f64::consts::PI - 3.0) / 3.0;
    };
    let options = SystemOptions {
        tol: Tolerances {
            max_evals: 6,
            ..Tolerances::default()
        },
        record_history: true,
        ..SystemOptions::default()
    };
    let s = solve_system(&[0.1, 0.1, -0.1], &options, f).unwrap();
    assert_eq!(s.status, Status::BudgetSpent);
    assert!(!s.converged);
    assert_eq!(s.evaluations, 6);
    assert_eq!(s.history.len(), 6);
    assert_eq!(s.history[0].kind, StepKind::Initial);
    assert!(s.history[1..4].iter().all(|r| r.kind == StepKind::Probe));
    assert_eq!(s.history[4].kind, StepKind::Secant);
    assert!(s.history.iter().enumerate().all(|(i, r)| r.k == i + 1));
    let s = solve_system(&[0.1, 0.1, -0.1], &SystemOptions::default(), f).unwrap();
    assert!(s.history.is_empty(), "history is opt-in");
}

#[test]
fn bad_input_names_the_value() {
    let f: System = |x, o| o[0] = x[0];
    let e = solve_system(&[], &SystemOptions::default(), f).unwrap_err();
    assert_eq!(e.code, "no-unknowns");
    let e = solve_system(&[1.0, f64::NAN], &SystemOptions::default(), |_, o| {
        o.fill(0.0)
    })
    .unwrap_err();
    assert!(
        e.message.contains("unknown 2") && e.message.contains("NaN"),
        "{}",
        e.message
    );
    let options = SystemOptions {
        bounds: vec![Bounds::UNBOUNDED; 3],
        ..SystemOptions::default()
    };
    let e = solve_system(&[1.0], &options, f).unwrap_err();
    assert!(
        e.message.contains("3 bounds") && e.message.contains("1 unknowns"),
        "{}",
        e.message
    );
    let options = SystemOptions {
        bounds: vec![Bounds { lo: 0.0, hi: 1.0 }],
        ..SystemOptions::default()
    };
    let e = solve_system(&[2.0], &options, f).unwrap_err();
    assert_eq!(e.code, "start-outside-bounds");
    assert!(e.message.contains('2'), "{}", e.message);
    let options = SystemOptions {
        tol: Tolerances {
            x_rel: -1.0,
            ..Tolerances::default()
        },
        ..SystemOptions::default()
    };
    let e = solve_system(&[2.0], &options, f).unwrap_err();
    assert!(e.message.contains("x_rel"), "{}", e.message);
}

#[test]
fn more_garbow_hillstrom_problems() {
    // Moré, Garbow & Hillstrom, "Testing unconstrained optimization software", ACM TOMS
    // 7(1) 1981, problems recalled from memory with their standard starting points.
    let generous = SystemOptions {
        tol: Tolerances {
            max_evals: 500,
            ..Tolerances::default()
        },
        ..SystemOptions::default()
    };
    // Problem 3, Powell badly scaled, from (0, 1): root (1.098159e-5, 9.106146).
    let s = solve_system(&[0.0, 1.0], &generous, |x, o| {
        o[0] = 1e4 * x[0] * x[1] - 1.0;
        o[1] = (-x[0]).exp() + (-x[1]).exp() - 1.0001;
    })
    .unwrap();
    assert!(s.converged, "{s:?}");
    assert!(
        (s.x[0] - 1.098159e-5).abs() < 1e-11 && (s.x[1] - 9.106146).abs() < 1e-5,
        "{:?}",
        s.x
    );
    // Problem 7, helical valley, from (-1, 0, 0): root (1, 0, 0).
    let s = solve_system(&[-1.0, 0.0, 0.0], &generous, |x, o| {
        let turn = (x[1] / x[0]).atan() / (2.0 * std::f64::consts::PI);
        let theta = if x[0] > 0.0 { turn } else { turn + 0.5 };
        o[0] = 10.0 * (x[2] - 10.0 * theta);
        o[1] = 10.0 * ((x[0] * x[0] + x[1] * x[1]).sqrt() - 1.0);
        o[2] = x[2];
    })
    .unwrap();
    assert!(s.converged, "{s:?}");
    assert!(
        (s.x[0] - 1.0).abs() < 1e-10 && s.x[1].abs() < 1e-10 && s.x[2].abs() < 1e-10,
        "{:?}",
        s.x
    );
    // Problem 30, Broyden tridiagonal, n = 10 from all -1: checked by its residuals.
    let s = solve_system(&[-1.0; 10], &generous, |x, o| {
        let n = x.len();
        for i in 0..n {
            let before = if i > 0 { x[i - 1] } else { 0.0 };
            let after = if i + 1 < n { x[i + 1] } else { 0.0 };
            o[i] = (3.0 - 2.0 * x[i]) * x[i] - before - 2.0 * after + 1.0;
        }
    })
    .unwrap();
    assert!(s.converged, "{s:?}");
    assert!(
        s.residuals.iter().all(|r| r.abs() < 1e-10),
        "{:?}",
        s.residuals
    );
}

#[test]
fn local_minimum_of_the_residual_is_not_a_root() {
    // Moré, Garbow & Hillstrom problem 2, Freudenstein and Roth, from (0.5, -2): the
    // root is (5, 4), but the iteration is drawn to the local minimum of ‖F‖ near
    // (11.41, -0.8968), where F ≠ 0 (recalled from memory). Converged only at the root.
    let s = solve_system(&[0.5, -2.0], &SystemOptions::default(), |x, o| {
        o[0] = -13.0 + x[0] + ((5.0 - x[1]) * x[1] - 2.0) * x[1];
        o[1] = -29.0 + x[0] + ((x[1] + 1.0) * x[1] - 14.0) * x[1];
    })
    .unwrap();
    if s.converged {
        assert!(
            (s.x[0] - 5.0).abs() < 1e-9 && (s.x[1] - 4.0).abs() < 1e-9,
            "{s:?}"
        );
    } else {
        assert!(s.residuals.iter().any(|r| r.abs() > 1.0), "{s:?}");
    }
}
