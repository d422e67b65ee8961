//! No method evaluates any point twice, and the reported count is exact: a counting
//! wrapper records every x that f is called with.

use std::cell::RefCell;

use tacit::broyden::{solve_system, SystemOptions};
use tacit::roots_in_range::{roots_in_range, ScanOptions};
use tacit::{solve, Bounds, MethodKind, Options, Start, Tolerances};

/// Test functions: common practice, no source; the NaN and no-root ones follow the
/// failure cases of tests/failure_cases.rs.
type Function = fn(f64) -> f64;

const FUNCTIONS: &[(&str, Function)] = &[
    ("x^2 - 2", |x| x * x - 2.0),
    ("cos x - x", |x| x.cos() - x),
    ("x^3 - 2x - 5", |x| x * x * x - 2.0 * x - 5.0),
    ("x e^-x", |x| x * (-x).exp()),
    ("(x-1)^2", |x| (x - 1.0) * (x - 1.0)),
    ("(x-1)^3", |x| (x - 1.0).powi(3)),
    ("x^4 - x^2 + 1", |x| x.powi(4) - x * x + 1.0),
    ("constant", |_| 5.0),
    ("ln x", |x| x.ln()),
    ("sqrt x - 0.5", |x| x.sqrt() - 0.5),
    ("atan x", |x| x.atan()),
    ("tan x", |x| x.tan()),
    ("1/(x-0.3)", |x| 1.0 / (x - 0.3)),
    ("x^20 - 1", |x| x.powi(20) - 1.0),
    ("floor-ish", |x| (4.0 * x).floor() - 2.5),
];

const STARTS: &[(f64, f64)] = &[
    (0.0, 1.0),
    (1.0, 2.0),
    (2.0, 3.0),
    (-3.0, 4.0),
    (0.5, 0.50001),
    (-10.0, -9.0),
    (100.0, 1e4),
];

/// Solves with a recording f and checks the record: no repeats, inside the bounds,
/// and as many calls as reported.
fn check_scalar(method: MethodKind, start: Start, bounds: Bounds, name: &str, f: fn(f64) -> f64) {
    let seen = RefCell::new(Vec::<f64>::new());
    let options = Options {
        method,
        bounds,
        ..Options::default()
    };
    let s = match solve(start, &options, |x| {
        seen.borrow_mut().push(x);
        f(x)
    }) {
        Ok(s) => s,
        Err(e) => panic!(
            "{method:?} {name} {start:?}: a valid set-up was refused: {}",
            e.message
        ),
    };
    let xs = seen.into_inner();
    assert_eq!(
        s.evaluations,
        xs.len(),
        "{method:?} {name} {start:?}: reported {} evaluations, counted {}",
        s.evaluations,
        xs.len()
    );
    for (i, &x) in xs.iter().enumerate() {
        assert!(
            !xs[..i].contains(&x),
            "{method:?} {name} {start:?}: x = {x} evaluated twice (calls {xs:?})"
        );
        assert!(
            bounds.contains(x),
            "{method:?} {name} {start:?}: x = {x} outside the bounds"
        );
    }
}

#[test]
fn scalar_methods_never_repeat_a_point() {
    let bounded = Bounds::new(-5.0, 50.0).unwrap();
    for &(name, f) in FUNCTIONS {
        for &(a, b) in STARTS {
            for method in MethodKind::ALL {
                check_scalar(method, Start::Guesses(a, b), Bounds::UNBOUNDED, name, f);
                check_scalar(method, Start::Bracket(a, b), Bounds::UNBOUNDED, name, f);
                if bounded.contains(a) && bounded.contains(b) {
                    check_scalar(method, Start::Guesses(a, b), bounded, name, f);
                }
            }
        }
    }
}

#[test]
fn range_scan_never_repeats_a_point() {
    for &(name, f) in FUNCTIONS {
        for &(lo, hi, samples) in &[(-4.0, 4.0, 400), (0.0, 3.0, 7), (-1.0, 2.0, 50)] {
            let seen = RefCell::new(Vec::<f64>::new());
            let options = ScanOptions {
                samples,
                ..ScanOptions::default()
            };
            let r = roots_in_range(lo, hi, &options, |x| {
                seen.borrow_mut().push(x);
                f(x)
            })
            .unwrap();
            let xs = seen.into_inner();
            assert_eq!(r.evaluations, xs.len(), "{name}: reported vs counted");
            let mut sorted = xs.clone();
            sorted.sort_by(f64::total_cmp);
            for w in sorted.windows(2) {
                assert!(
                    w[0] != w[1],
                    "{name} [{lo}, {hi}]: x = {} evaluated twice",
                    w[0]
                );
            }
        }
    }
}

#[test]
fn broyden_never_repeats_a_point() {
    // Systems: common practice, no source.
    type System = fn(&[f64], &mut [f64]);
    let systems: &[(&str, System, &[f64])] = &[
        (
            "circle and line",
            |v, o| {
                o[0] = v[0] * v[0] + v[1] * v[1] - 4.0;
                o[1] = v[0] - v[1];
            },
            &[1.0, 2.0],
        ),
        (
            "no solution",
            |v, o| {
                o[0] = v[0] * v[0] + 1.0;
                o[1] = v[1] - 1.0;
            },
            &[1.0, 2.0],
        ),
        (
            "log domain",
            |v, o| {
                o[0] = v[0].ln() + v[1];
                o[1] = v[0] - 2.0 * v[1] - 3.0;
            },
            &[0.5, 0.0],
        ),
        (
            "three unknowns",
            |v, o| {
                o[0] = v[0] + v[1] + v[2] - 6.0;
                o[1] = v[0] * v[1] - 2.0;
                o[2] = v[2].exp() - 20.0;
            },
            &[1.0, 1.0, 1.0],
        ),
    ];
    for &(name, f, x0) in systems {
        for max_evals in [5, 30, 200] {
            let seen = RefCell::new(Vec::<Vec<f64>>::new());
            let options = SystemOptions {
                tol: Tolerances {
                    max_evals,
                    ..Tolerances::default()
                },
                ..SystemOptions::default()
            };
            let s = solve_system(x0, &options, |x, out| {
                seen.borrow_mut().push(x.to_vec());
                f(x, out)
            })
            .unwrap();
            let xs = seen.into_inner();
            assert_eq!(s.evaluations, xs.len(), "{name}: reported vs counted");
            assert!(s.evaluations <= max_evals, "{name}: over budget");
            for (i, x) in xs.iter().enumerate() {
                assert!(!xs[..i].contains(x), "{name}: {x:?} evaluated twice");
            }
        }
    }
}
