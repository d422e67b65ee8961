//! Properties over random input (proptest): no input, finite or not, makes any method
//! panic or spend more evaluations than its budget; invalid set-ups give `Err`.

use std::cell::Cell;

use proptest::prelude::*;
use tacit::broyden::{solve_system, SystemOptions};
use tacit::roots_in_range::{roots_in_range, ScanOptions};
use tacit::{solve, Bounds, MethodKind, Options, Start, Tolerances};

/// A small family of functions, some with NaN, poles, plateaus or no root.
fn family(kind: u8, c: f64, x: f64) -> f64 {
    match kind % 14 {
        0 => c * x - 1.0,
        1 => x * x - c,
        2 => (x * c).sin(),
        3 => x.sqrt() - c,
        4 => x.ln() - c,
        5 => 1.0 / (x - c),
        6 => f64::NAN,
        7 => x.exp() - c,
        8 => c,
        9 => (x - c) * (x - c),
        10 => x.powi(20) - c,
        11 => {
            if x > c {
                f64::NAN
            } else {
                x - c + 0.5
            }
        }
        12 => (x * 1e3).sin() * 1e-3 + x - c,
        _ => x * (-x).exp() - c * 1e-3,
    }
}

/// Numbers of every kind: ordinary, huge, tiny, infinite, NaN.
fn number() -> impl Strategy<Value = f64> {
    prop_oneof![
        4 => -10.0..10.0f64,
        1 => -1e300..1e300f64,
        1 => -1e-300..1e-300f64,
        1 => any::<f64>(),
        1 => Just(f64::NAN),
        1 => Just(f64::INFINITY),
        1 => Just(f64::NEG_INFINITY),
        1 => Just(0.0),
    ]
}

fn tolerance() -> impl Strategy<Value = f64> {
    prop_oneof![
        4 => 0.0..1e-3f64,
        1 => Just(0.0),
        1 => Just(-1e-9),
        1 => Just(f64::NAN),
        1 => Just(f64::INFINITY),
        1 => 0.0..10.0f64,
    ]
}

fn tolerances() -> impl Strategy<Value = Tolerances> {
    (tolerance(), tolerance(), tolerance(), 0usize..300).prop_map(
        |(x_abs, x_rel, f_abs, max_evals)| Tolerances {
            x_abs,
            x_rel,
            f_abs,
            max_evals,
        },
    )
}

fn tolerances_valid(t: &Tolerances) -> bool {
    [t.x_abs, t.x_rel, t.f_abs]
        .iter()
        .all(|v| v.is_finite() && *v >= 0.0)
        && t.max_evals >= 2
}

fn bounds() -> impl Strategy<Value = Bounds> {
    prop_oneof![
        2 => Just(Bounds::UNBOUNDED),
        2 => (-10.0..0.0f64, 0.0..10.0f64).prop_map(|(lo, hi)| Bounds { lo, hi }),
        1 => (number(), number()).prop_map(|(lo, hi)| Bounds { lo, hi }),
    ]
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(256))]

    #[test]
    fn scalar_methods_never_panic_nor_overspend(
        a in number(),
        b in number(),
        is_bracket in any::<bool>(),
        kind in any::<u8>(),
        c in number(),
        tol in tolerances(),
        bounds in bounds(),
        method_index in 0usize..5,
    ) {
        let method = MethodKind::ALL[method_index];
        let start = if is_bracket { Start::Bracket(a, b) } else { Start::Guesses(a, b) };
        let options = Options { method, tol, bounds, record_history: kind % 2 == 0 };
        let calls = Cell::new(0usize);
        let result = solve(start, &options, |x| {
            calls.set(calls.get() + 1);
            family(kind, c, x)
        });
        let valid = a.is_finite()
            && b.is_finite()
            && a != b
            && tolerances_valid(&tol)
            && !bounds.lo.is_nan()
            && !bounds.hi.is_nan()
            && bounds.lo <= bounds.hi
            && bounds.contains(a)
            && bounds.contains(b);
        match result {
            Ok(s) => {
                prop_assert!(valid, "accepted an invalid set-up: {start:?} {tol:?} {bounds:?}");
                prop_assert!(s.evaluations <= tol.max_evals, "{} > {}", s.evaluations, tol.max_evals);
                prop_assert_eq!(s.evaluations, calls.get());
                prop_assert_eq!(s.converged, s.status.is_converged());
                if options.record_history {
                    prop_assert_eq!(s.history.len(), s.evaluations);
                }
                for row in &s.history {
                    prop_assert!(bounds.contains(row.x), "evaluated outside the bounds: {}", row.x);
                }
            }
            Err(e) => {
                prop_assert!(!valid, "rejected a valid set-up: {}", e.message);
                prop_assert_eq!(calls.get(), 0);
                prop_assert!(!e.message.is_empty());
            }
        }
    }

    #[test]
    fn range_scan_never_panics_nor_overspends(
        lo in number(),
        hi in number(),
        samples in 0usize..600,
        kind in any::<u8>(),
        c in number(),
        tol in tolerances(),
    ) {
        let calls = Cell::new(0usize);
        let options = ScanOptions { samples, tol };
        let result = roots_in_range(lo, hi, &options, |x| {
            calls.set(calls.get() + 1);
            family(kind, c, x)
        });
        match result {
            Ok(r) => {
                prop_assert!(lo.is_finite() && hi.is_finite() && lo < hi && tolerances_valid(&tol));
                prop_assert_eq!(r.evaluations, calls.get());
                // Samples, then at most one budget per refinement; refinements come from
                // sign changes (at most samples - 1) and dips (two brackets each).
                prop_assert!(r.evaluations <= samples + 3 * samples * tol.max_evals);
                prop_assert!(r.roots.windows(2).all(|w| w[0].x < w[1].x), "sorted, no duplicates");
                for root in &r.roots {
                    prop_assert!(root.x >= lo && root.x <= hi, "root {} outside the range", root.x);
                }
                prop_assert!(!r.limits.is_empty());
            }
            Err(e) => {
                prop_assert_eq!(calls.get(), 0);
                prop_assert!(!e.message.is_empty());
            }
        }
    }

    #[test]
    fn broyden_never_panics_nor_overspends(
        x0 in prop::collection::vec(number(), 0..4),
        kinds in prop::collection::vec(any::<u8>(), 4),
        c in number(),
        tol in tolerances(),
        bounded in any::<bool>(),
    ) {
        let n = x0.len();
        let options = SystemOptions {
            tol,
            bounds: if bounded { vec![Bounds { lo: -5.0, hi: 5.0 }; n] } else { Vec::new() },
            record_history: kinds[0] % 2 == 0,
        };
        let calls = Cell::new(0usize);
        let result = solve_system(&x0, &options, |x, out| {
            calls.set(calls.get() + 1);
            let s: f64 = x.iter().sum();
            for (i, o) in out.iter_mut().enumerate() {
                *o = family(kinds[i], c, x[i]) + 0.1 * s;
            }
        });
        match result {
            Ok(s) => {
                prop_assert!(n > 0 && tolerances_valid(&tol) && x0.iter().all(|v| v.is_finite()));
                prop_assert!(s.evaluations <= tol.max_evals, "{} > {}", s.evaluations, tol.max_evals);
                prop_assert_eq!(s.evaluations, calls.get());
                prop_assert_eq!(s.converged, s.status.is_converged());
                prop_assert_eq!(s.x.len(), n);
                if bounded {
                    prop_assert!(s.x.iter().all(|v| (-5.0..=5.0).contains(v)));
                }
            }
            Err(e) => {
                prop_assert_eq!(calls.get(), 0);
                prop_assert!(!e.message.is_empty());
            }
        }
    }
}
