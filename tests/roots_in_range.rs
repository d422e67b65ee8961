//! All roots in a range, against closed forms and well-known polynomials.

use std::cell::Cell;
use std::f64::consts::PI;

use tacit::roots_in_range::{roots_in_range, RangeRoots, RootKind, ScanOptions};

fn scan(lo: f64, hi: f64, samples: usize, f: impl Fn(f64) -> f64) -> RangeRoots {
    let calls = Cell::new(0usize);
    let options = ScanOptions {
        samples,
        ..ScanOptions::default()
    };
    let r = roots_in_range(lo, hi, &options, |x| {
        calls.set(calls.get() + 1);
        f(x)
    })
    .unwrap();
    assert_eq!(r.evaluations, calls.get(), "exact evaluation count");
    assert!(r.roots.windows(2).all(|w| w[0].x < w[1].x), "sorted");
    r
}

/// The roots found are `expected` (in order, each within `within` times max(1, |root|))
/// and of `kinds`.
fn check(source: &str, r: &RangeRoots, expected: &[f64], kinds: &[RootKind], within: f64) {
    let got: Vec<f64> = r.roots.iter().map(|t| t.x).collect();
    assert_eq!(
        got.len(),
        expected.len(),
        "{source}: found {got:?}, expected {expected:?}"
    );
    for (i, (root, &want)) in r.roots.iter().zip(expected).enumerate() {
        assert!(
            (root.x - want).abs() <= within * want.abs().max(1.0),
            "{source}: root {i} at {}, expected {want}",
            root.x
        );
        assert_eq!(root.kind, kinds[i], "{source}: root {i} kind");
        assert!(root.converged, "{source}: root {i} not converged");
    }
}

#[test]
fn cubic_with_known_roots() {
    // (x-1)(x-2)(x-3) = x³ - 6x² + 11x - 6: roots 1, 2, 3 (common practice, no source).
    let r = scan(0.0, 4.0, 400, |x| ((x - 6.0) * x + 11.0) * x - 6.0);
    check(
        "cubic 1, 2, 3",
        &r,
        &[1.0, 2.0, 3.0],
        &[RootKind::SignChange; 3],
        1e-12,
    );
}

#[test]
fn wilkinson_polynomial_of_degree_ten() {
    // Wilkinson's polynomial (x-1)(x-2)...(x-10), roots 1..10 in closed form (J. H.
    // Wilkinson, Rounding Errors in Algebraic Processes, 1963; recalled from memory),
    // evaluated in product form.
    let f = |x: f64| (1..=10).map(|k| x - k as f64).product::<f64>();
    let r = scan(0.5, 10.5, 200, f);
    let expected: Vec<f64> = (1..=10).map(|k| k as f64).collect();
    check(
        "Wilkinson 10",
        &r,
        &expected,
        &[RootKind::SignChange; 10],
        1e-10,
    );
}

#[test]
fn chebyshev_polynomial_nodes() {
    // T7(x) = 64x⁷ - 112x⁵ + 56x³ - 7x has roots cos((2k-1)π/14), k = 1..7 (Abramowitz &
    // Stegun, Handbook of Mathematical Functions, 22.16.4, recalled from memory).
    let t7 = |x: f64| {
        let y = x * x;
        x * (((64.0 * y - 112.0) * y + 56.0) * y - 7.0)
    };
    let r = scan(-1.0, 1.0, 400, t7);
    let mut expected: Vec<f64> = (1..=7)
        .map(|k| ((2 * k - 1) as f64 * PI / 14.0).cos())
        .collect();
    expected.sort_by(f64::total_cmp);
    check(
        "Chebyshev T7",
        &r,
        &expected,
        &[RootKind::SignChange; 7],
        1e-12,
    );
}

#[test]
fn sine_zeros() {
    // sin x = 0 at kπ (closed form); the range starts off a root.
    let r = scan(0.5, 10.0, 400, f64::sin);
    check(
        "sin x",
        &r,
        &[PI, 2.0 * PI, 3.0 * PI],
        &[RootKind::SignChange; 3],
        1e-12,
    );
}

#[test]
fn touching_root_of_a_square() {
    // (x-1)² touches zero at 1 (closed form). A minimum of |f| can only be located to
    // about √eps, hence the tolerance.
    let r = scan(0.0, 3.0, 400, |x| (x - 1.0) * (x - 1.0));
    check("(x-1)^2", &r, &[1.0], &[RootKind::Touching], 1e-7);
    // Between samples: 7 samples on [0, 3] put none at 1.
    let r = scan(0.0, 3.0, 7, |x| (x - 1.0) * (x - 1.0));
    check("(x-1)^2 coarse", &r, &[1.0], &[RootKind::Touching], 1e-7);
    // A touching root beside a simple one: (x-1)²(x-3).
    let r = scan(0.0, 4.0, 400, |x| (x - 1.0) * (x - 1.0) * (x - 3.0));
    check(
        "(x-1)^2 (x-3)",
        &r,
        &[1.0, 3.0],
        &[RootKind::Touching, RootKind::SignChange],
        1e-7,
    );
    // cos x + 1 touches zero at π (closed form).
    let r = scan(0.0, 6.0, 100, |x| x.cos() + 1.0);
    check("cos x + 1", &r, &[PI], &[RootKind::Touching], 1e-7);
}

#[test]
fn positive_minimum_is_not_a_root() {
    // (x-1)² + 1e-3 > 0 everywhere; x⁴ - x² + 1 has no real root.
    let r = scan(0.0, 3.0, 400, |x| (x - 1.0) * (x - 1.0) + 1e-3);
    assert!(r.roots.is_empty(), "{:?}", r.roots);
    let r = scan(-3.0, 3.0, 400, |x| x.powi(4) - x * x + 1.0);
    assert!(r.roots.is_empty(), "{:?}", r.roots);
    // A deep but positive dip: (x-1)² + 1e-9 on [0, 3.1] with 7 samples (none at 1).
    // The dip is refined, and its minimum 1e-9 is above 1e-10 of the largest sample
    // (4.41), the documented threshold for a touching root: no root (common practice,
    // no source).
    let r = scan(0.0, 3.1, 7, |x| (x - 1.0) * (x - 1.0) + 1e-9);
    assert!(r.roots.is_empty(), "{:?}", r.roots);
    assert!(r.evaluations > 7, "the dip was refined: {}", r.evaluations);
    // The same dip 1000 times shallower is still no root: its minimum 1e-12 does not
    // fall towards zero like a double root's, however small it is against the largest
    // sample (the trust issue: a relative threshold called such minima roots).
    let r = scan(0.0, 3.1, 7, |x| (x - 1.0) * (x - 1.0) + 1e-12);
    assert!(r.roots.is_empty(), "{:?}", r.roots);
    // (x-1)² + 1 on [-1e5, 1e5]: |f| = 1 at the minimum, 1e-10 of the largest sample
    // (the trust issue's reproduction): not a root.
    let r = scan(-1e5, 1e5, 400, |x| (x - 1.0) * (x - 1.0) + 1.0);
    assert!(r.roots.is_empty(), "{:?}", r.roots);
    // The true double root (x-1)² on the same samples is found, with its certificate.
    let r = scan(0.0, 3.1, 7, |x| (x - 1.0) * (x - 1.0));
    check("(x-1)^2", &r, &[1.0], &[RootKind::Touching], 1e-5);
    let c = r.roots[0].certificate.expect("certified");
    assert!(c.residual <= c.bound, "{c:?}");
}

#[test]
fn two_roots_inside_one_spacing() {
    // (x-1.1)(x-1.1001): both roots fall between the samples 1 and 1.5, so the samples
    // show no sign change; the dip in |f| gives them away (closed form roots).
    let r = scan(0.0, 3.0, 7, |x| (x - 1.1) * (x - 1.1001));
    check(
        "close pair",
        &r,
        &[1.1, 1.1001],
        &[RootKind::SignChange, RootKind::SignChange],
        1e-12,
    );
}

#[test]
fn poles_are_not_roots() {
    // tan x on [0.1, 5]: a root at π, poles at π/2 and 3π/2 (closed form).
    let r = scan(0.1, 5.0, 400, f64::tan);
    check("tan x", &r, &[PI], &[RootKind::SignChange], 1e-12);
    assert!(r.limits.contains("poles"), "{}", r.limits);
    // A sample exactly at a root: 0 is a sample of [-1, 1] with 3 samples.
    let r = scan(-1.0, 1.0, 3, |x| x);
    check("x", &r, &[0.0], &[RootKind::SignChange], 0.0);
}

#[test]
fn limits_are_stated() {
    let r = scan(0.0, 4.0, 401, |x| x - 2.5);
    assert_eq!(r.samples, 401);
    assert!((r.spacing - 0.01).abs() < 1e-15);
    assert!(
        r.limits.contains("401 evenly spaced samples"),
        "{}",
        r.limits
    );
    assert!(r.limits.contains("may be missed"), "{}", r.limits);
    assert!(r.limits.contains("1e-2"), "{}", r.limits);
    // NaN over part of the range is reported.
    let r = scan(-1.0, 4.0, 101, |x| x.sqrt() - 1.0);
    check("sqrt x - 1", &r, &[1.0], &[RootKind::SignChange], 1e-12);
    assert!(r.limits.contains("not finite"), "{}", r.limits);
}

#[test]
fn bad_ranges_are_errors() {
    let o = ScanOptions::default();
    let e = roots_in_range(2.0, 1.0, &o, |x| x).unwrap_err();
    assert!(
        e.message.contains('2') && e.message.contains('1'),
        "{}",
        e.message
    );
    let e = roots_in_range(f64::NAN, 1.0, &o, |x| x).unwrap_err();
    assert!(e.message.contains("lower end"), "{}", e.message);
    let o2 = ScanOptions { samples: 2, ..o };
    let e = roots_in_range(0.0, 1.0, &o2, |x| x).unwrap_err();
    assert!(
        e.message.contains("samples") && e.message.contains('2'),
        "{}",
        e.message
    );
}
