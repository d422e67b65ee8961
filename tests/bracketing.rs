//! The bracketing methods on the published test sets, with a counting wrapper around f.
//!
//! Sources of the rows: the Alefeld–Potra–Shi set (ACM TOMS 21(3) 1995, Algorithm 748,
//! Table I) in `fixtures/aps748.rs`, and Chandrupatla's set (Advances in Engineering
//! Software 28 (1997) 145–149) in `fixtures/chandrupatla.rs`; each fixture names what it
//! was checked against.

#[path = "fixtures/aps748.rs"]
mod aps748;
#[path = "fixtures/candidates.rs"]
mod candidates;
#[path = "fixtures/chandrupatla.rs"]
mod chandrupatla;
#[path = "fixtures/engineering.rs"]
mod engineering;
#[path = "fixtures/interpolation_traps.rs"]
mod interpolation_traps;

use std::cell::RefCell;

use candidates::{drive, Brent, Chandrupatla, Toms748};
use tacit::driver::ScalarMethod;
use tacit::methods::hybrid::{self, Hybrid};
use tacit::methods::illinois::Illinois;
use tacit::{
    solve, Bounds, CertificateKind, MethodKind, Options, Solution, Start, Status, Tolerances,
};

const BRACKETING: [MethodKind; 3] = [
    MethodKind::Hybrid,
    MethodKind::Bisection,
    MethodKind::Illinois,
];

/// The tolerance of the benchmark: relative 4·eps, no absolute part.
fn tight() -> Tolerances {
    Tolerances {
        x_abs: 0.0,
        x_rel: 4.0 * f64::EPSILON,
        f_abs: 0.0,
        max_evals: 10_000,
    }
}

/// Solves through the public driver with a wrapper that records every x, and checks the
/// evaluation economy: the count reported is the wrapper's count, no x is repeated, and
/// every x lies inside the bounds.
fn counted(
    method: MethodKind,
    start: Start,
    tol: Tolerances,
    bounds: Bounds,
    f: impl Fn(f64) -> f64,
) -> (Solution, Vec<f64>) {
    let xs = RefCell::new(Vec::new());
    let options = Options {
        method,
        tol,
        bounds,
        record_history: false,
    };
    let s = solve(start, &options, |x| {
        xs.borrow_mut().push(x);
        f(x)
    })
    .expect("valid set-up");
    let xs = xs.into_inner();
    assert_eq!(s.evaluations, xs.len(), "{method:?}: reported count");
    assert_no_repeats(&xs, &format!("{method:?}"));
    assert!(
        xs.iter().all(|&x| bounds.contains(x)),
        "{method:?}: left the bounds"
    );
    (s, xs)
}

fn assert_no_repeats(xs: &[f64], who: &str) {
    let mut bits: Vec<u64> = xs.iter().map(|x| (x + 0.0).to_bits()).collect();
    bits.sort_unstable();
    let before = bits.len();
    bits.dedup();
    assert_eq!(
        bits.len(),
        before,
        "{who}: a point was evaluated twice: {xs:?}"
    );
}

/// What a method ended with.
struct Seen {
    root: f64,
    status: Status,
    bracket: Option<(f64, f64)>,
}

impl Seen {
    fn of(s: &Solution) -> Seen {
        Seen {
            root: s.root,
            status: s.status,
            bracket: s.bracket,
        }
    }
}

/// The one check of a test-set row: converged, and the root matches the reference value
/// (`reference` lies in the final bracket, or within the step tolerance of the root, or f
/// is exactly zero at the root, as where x e^(-1/x²) or x^19 underflow).
fn check(
    label: &str,
    who: &str,
    seen: Seen,
    reference: f64,
    tol: Tolerances,
    f: impl Fn(f64) -> f64,
) {
    let Seen {
        root: s_root,
        status,
        bracket,
    } = seen;
    assert!(
        status.is_converged(),
        "{label} {who}: not converged: {status:?}"
    );
    let slack = 4.0 * f64::EPSILON * reference.abs();
    let in_bracket =
        bracket.is_some_and(|(lo, hi)| lo - slack <= reference && reference <= hi + slack);
    let near = (s_root - reference).abs() <= 2.0 * tol.x_tol(s_root) + slack;
    let zero = f(s_root) == 0.0;
    assert!(
        in_bracket || near || zero,
        "{label} {who}: root {s_root} (status {status:?}, bracket {bracket:?}) does not match {reference}"
    );
}

#[test]
fn aps_set_has_15_formulas_and_154_cases() {
    // Counts from the paper's Table I as restated by SciPy's `_APS_TESTS` (154 rows).
    assert_eq!(aps748::APS_CASES.len(), 154);
    let mut formulas: Vec<u8> = aps748::APS_CASES.iter().map(|c| c.formula).collect();
    formulas.dedup();
    assert_eq!(formulas, (1..=15).collect::<Vec<u8>>());
    for (i, c) in aps748::APS_CASES.iter().enumerate() {
        let (fa, fb) = (c.f(c.a), c.f(c.b));
        assert!(
            fa.signum() != fb.signum(),
            "{}: no sign change on [{}, {}]",
            aps748::label(i),
            c.a,
            c.b
        );
        assert!(c.a < c.root && c.root < c.b, "{}", aps748::label(i));
    }
}

#[test]
fn every_bracketing_method_solves_every_aps_case() {
    let tol = tight();
    for method in BRACKETING {
        for (i, c) in aps748::APS_CASES.iter().enumerate() {
            let label = aps748::label(i);
            let (s, _) = counted(
                method,
                Start::Bracket(c.a, c.b),
                tol,
                Bounds::UNBOUNDED,
                |x| c.f(x),
            );
            check(&label, method.code(), Seen::of(&s), c.root, tol, |x| c.f(x));
        }
    }
}

#[test]
fn every_bracketing_method_solves_every_chandrupatla_case() {
    let tol = tight();
    for method in BRACKETING {
        for (i, c) in chandrupatla::CHANDRUPATLA_CASES.iter().enumerate() {
            let label = c.label(i);
            let (s, _) = counted(
                method,
                Start::Bracket(c.a, c.b),
                tol,
                Bounds::UNBOUNDED,
                |x| c.f(x),
            );
            check(&label, method.code(), Seen::of(&s), c.root, tol, |x| c.f(x));
        }
    }
}

#[test]
fn every_bracketing_method_solves_every_engineering_case() {
    // Reference roots: mpmath, 60 digits (tests/reference/engineering_roots.py, versions
    // in the fixture's header). Each root must lie within the final bracket's allowed
    // width of the reference, plus the case's rounding band (where f in double
    // precision has no reliable sign) and two units in the last place.
    let tol = Tolerances {
        x_abs: 2.0 * f64::MIN_POSITIVE,
        x_rel: 2.0 * f64::EPSILON,
        f_abs: 0.0,
        max_evals: 10_000,
    };
    assert!(engineering::ENGINEERING_CASES.len() >= 50);
    for method in BRACKETING {
        for c in engineering::ENGINEERING_CASES.iter() {
            let (s, _) = counted(
                method,
                Start::Bracket(c.a, c.b),
                tol,
                Bounds::UNBOUNDED,
                |x| c.f(x),
            );
            assert!(s.converged, "{} {}: {:?}", c.name, method.code(), s.status);
            let allowed = 6.0 * f64::EPSILON * c.root.abs() + 4.0 * f64::MIN_POSITIVE + c.band;
            assert!(
                (s.root - c.root).abs() <= allowed,
                "{} {}: root {} against {}",
                c.name,
                method.code(),
                s.root,
                c.root
            );
        }
    }
}

#[test]
fn comparison_candidates_solve_both_sets_without_repeats() {
    type Build = fn(f64, f64) -> Box<dyn ScalarMethod>;
    let builds: [(&str, Build); 4] = [
        ("toms748", |a, b| Box::new(Toms748::new(a, b).published())),
        ("toms748+split", |a, b| Box::new(Toms748::new(a, b))),
        ("brent", |a, b| Box::new(Brent::new(a, b))),
        ("chandrupatla", |a, b| Box::new(Chandrupatla::new(a, b))),
    ];
    let tol = tight();
    for (who, build) in builds {
        for (i, c) in aps748::APS_CASES.iter().enumerate() {
            let mut m = build(c.a, c.b);
            let run = drive(m.as_mut(), tol, |x| c.f(x));
            assert_no_repeats(&run.xs, who);
            check(
                &aps748::label(i),
                who,
                Seen {
                    root: run.root,
                    status: run.status,
                    bracket: m.bracket(),
                },
                c.root,
                tol,
                |x| c.f(x),
            );
        }
        for (i, c) in chandrupatla::CHANDRUPATLA_CASES.iter().enumerate() {
            let mut m = build(c.a, c.b);
            let run = drive(m.as_mut(), tol, |x| c.f(x));
            assert_no_repeats(&run.xs, who);
            check(
                &c.label(i),
                who,
                Seen {
                    root: run.root,
                    status: run.status,
                    bracket: m.bracket(),
                },
                c.root,
                tol,
                |x| c.f(x),
            );
        }
    }
}

#[test]
fn chandrupatla_transcription_reproduces_the_published_counts() {
    // Chandrupatla (1997), per-case evaluation counts as tabulated by SciPy
    // (`_CHANDRUPATLA_TESTS`, asserted there by `test_nit_expected`): our transcription of
    // his method, at his tolerance, must use exactly as many evaluations on every case.
    let tol = Tolerances {
        x_abs: chandrupatla::PAPER_X_ABS,
        x_rel: chandrupatla::PAPER_X_REL,
        f_abs: 0.0,
        max_evals: 1000,
    };
    let mut total = 0;
    for (i, c) in chandrupatla::CHANDRUPATLA_CASES.iter().enumerate() {
        let mut m = Chandrupatla::new(c.a, c.b);
        let run = drive(&mut m, tol, |x| c.f(x));
        assert_eq!(run.xs.len(), c.published_evals, "{}", c.label(i));
        total += run.xs.len();
    }
    assert_eq!(total, chandrupatla::PUBLISHED_TOTAL);
}

#[test]
fn hybrid_from_points_never_evaluates_the_given_points() {
    // APS problem 1 (sin x − x/2 on [π/2, π]) with points already known inside and outside
    // the bracket: none is asked again, and the inside one narrows the bracket.
    let c = aps748::APS_CASES[0];
    let f = |x: f64| c.f(x);
    let given = [1.0, 1.7, 2.5, 3.3];
    let others: Vec<(f64, f64)> = given.iter().map(|&x| (x, f(x))).collect();
    let mut h = Hybrid::from_points(c.a, f(c.a), c.b, f(c.b), &others);
    let narrowed = h.bracket().expect("a sign-change bracket");
    assert_eq!(narrowed, (1.7, 2.5), "inside points narrow the bracket");
    let run = drive(&mut h, tight(), f);
    assert!(run.status.is_converged(), "{:?}", run.status);
    assert_no_repeats(&run.xs, "from_points");
    for x in given.iter().chain([c.a, c.b].iter()) {
        assert!(!run.xs.contains(x), "re-evaluated {x}");
    }
    assert!((run.root - c.root).abs() <= 8.0 * f64::EPSILON * c.root);
}

#[test]
fn hybrid_from_points_with_nothing_else_is_the_same_method() {
    // Starting from evaluated ends costs exactly two evaluations fewer.
    let tol = tight();
    for (i, c) in aps748::APS_CASES.iter().enumerate() {
        let mut fresh = Hybrid::new(c.a, c.b);
        let full = drive(&mut fresh, tol, |x| c.f(x));
        let mut known = Hybrid::from_points(c.a, c.f(c.a), c.b, c.f(c.b), &[]);
        let rest = drive(&mut known, tol, |x| c.f(x));
        assert_eq!(rest.xs, full.xs[2..], "{}", aps748::label(i));
    }
}

#[test]
fn illinois_from_bracket_never_evaluates_the_ends() {
    let c = aps748::APS_CASES[29]; // aps.06.00: 2x e^(-1) − 2 e^(-x) + 1 on [0, 1]
    let mut m = Illinois::from_bracket(c.a, c.f(c.a), c.b, c.f(c.b));
    let run = drive(&mut m, tight(), |x| c.f(x));
    assert!(run.status.is_converged());
    assert!(!run.xs.contains(&c.a) && !run.xs.contains(&c.b));
    assert_no_repeats(&run.xs, "illinois");
}

#[test]
fn honest_statuses_at_the_edges() {
    let tol = tight();
    for method in BRACKETING {
        let who = method.code();
        // x⁴ − x² + 1 has no real root (a failure case from root-finder issue trackers).
        let (s, xs) = counted(
            method,
            Start::Bracket(-2.0, 3.0),
            tol,
            Bounds::UNBOUNDED,
            |x| x.powi(4) - x * x + 1.0,
        );
        assert_eq!(s.status, Status::NoSignChange, "{who}");
        assert!(!s.converged && xs.len() == 2, "{who}");
        // An exact zero at the first end: one check next to it confirms it is not an
        // underflowed plateau (issue 9), then the solve ends.
        let (s, xs) = counted(
            method,
            Start::Bracket(1.0, 3.0),
            tol,
            Bounds::UNBOUNDED,
            |x| x - 1.0,
        );
        assert_eq!((s.status, s.root), (Status::ExactZero, 1.0), "{who}");
        assert_eq!(xs.len(), 2, "{who}: the end and one check");
        assert!(
            (xs[1] - 1.0).abs() <= 1e-11,
            "{who}: check next to the zero"
        );
        assert_eq!(
            s.certificate.map(|c| c.kind),
            Some(CertificateKind::ExactZero),
            "{who}"
        );
        // NaN at an end marks a domain wall: the method narrows in from it, finds the
        // sign change at x = 0.5 and converges on the root x = 1 (issue 9, "domain walls").
        let (s, _) = counted(
            method,
            Start::Bracket(-1.0, 2.0),
            tol,
            Bounds::UNBOUNDED,
            |x| {
                if x < 0.0 {
                    f64::NAN
                } else {
                    x - 1.0
                }
            },
        );
        assert!(s.converged, "{who}: {:?}", s.status);
        assert!((s.root - 1.0).abs() <= 1e-12, "{who}");
        // NaN at an end and no sign change in the defined part: not converged, and the
        // wall was located on the way.
        let (s, xs) = counted(
            method,
            Start::Bracket(-1.0, 2.0),
            tol,
            Bounds::UNBOUNDED,
            |x| if x < 0.0 { f64::NAN } else { x + 1.0 },
        );
        assert_eq!(s.status, Status::NonFinite, "{who}");
        assert!(!s.converged);
        let innermost_nan = xs.iter().copied().filter(|&x| x < 0.0).fold(-1.0, f64::max);
        assert!(
            innermost_nan > -1e-9,
            "{who}: wall at 0 located, got {innermost_nan}"
        );
        // A sign change across an undefined stretch (-0.9, 1.9): both walls are located,
        // and the result is a discontinuity, not a root and not "non-finite".
        let (s, _) = counted(
            method,
            Start::Bracket(-1.0, 2.0),
            tol,
            Bounds::UNBOUNDED,
            |x| {
                if x > -0.9 && x < 1.9 {
                    f64::NAN
                } else {
                    x - 0.5
                }
            },
        );
        assert_eq!(s.status, Status::Discontinuity, "{who}");
        assert!(!s.converged);
        let (lo, hi) = s.bracket.expect("the sign change is reported");
        assert!(
            (lo + 0.9).abs() < 1e-9 && (hi - 1.9).abs() < 1e-9,
            "{who}: {lo} {hi}"
        );
        // The residual tolerance.
        let loose = Tolerances { f_abs: 1e-3, ..tol };
        let (s, _) = counted(
            method,
            Start::Bracket(0.0, 2.0),
            loose,
            Bounds::UNBOUNDED,
            |x| x * x - 2.0,
        );
        assert_eq!(s.status, Status::ConvergedResidual, "{who}");
        assert!(s.residual.abs() <= 1e-3);
        // A budget too small is spent, not reported as converged.
        let short = Tolerances {
            max_evals: 5,
            ..tol
        };
        let (s, xs) = counted(
            method,
            Start::Bracket(0.0, 2.0),
            short,
            Bounds::UNBOUNDED,
            |x| x.powi(3) - 2.0,
        );
        assert_eq!((s.status, xs.len()), (Status::BudgetSpent, 5), "{who}");
        // Bounds equal to the bracket: nothing outside them is evaluated (checked in
        // `counted`).
        let bounds = Bounds::new(0.5, 2.0).unwrap();
        let (s, _) = counted(method, Start::Bracket(0.5, 2.0), tol, bounds, |x| {
            x.ln() - 0.25
        });
        assert!(s.converged, "{who}");
        assert!((s.root - 0.25f64.exp()).abs() < 1e-14, "{who}");
    }
}

#[test]
fn hybrid_steps_back_from_a_hole_in_the_domain() {
    // NaN on (0.45, 0.55), root at 0.3 (invented function for the NaN rule): the first
    // split lands in the hole, the method backs off and still converges, never asking a
    // point twice.
    let hole = |x: f64| {
        if x > 0.45 && x < 0.55 {
            f64::NAN
        } else {
            x - 0.3
        }
    };
    let (s, xs) = counted(
        MethodKind::Hybrid,
        Start::Bracket(-1.0, 2.0),
        tight(),
        Bounds::UNBOUNDED,
        hole,
    );
    assert!(s.converged, "{:?}", s.status);
    assert!((s.root - 0.3).abs() <= 1e-15);
    assert!(
        xs.iter().any(|&x| hole(x).is_nan()),
        "the hole was hit: {xs:?}"
    );
}

#[test]
fn solve_to_adjacent_floats_at_tolerance_zero() {
    // x_rel = x_abs = 0: the methods stop only when no float lies between the ends.
    let zero = Tolerances {
        x_abs: 0.0,
        x_rel: 0.0,
        f_abs: 0.0,
        max_evals: 5000,
    };
    for method in BRACKETING {
        let (s, _) = counted(
            method,
            Start::Bracket(1.0, 2.0),
            zero,
            Bounds::UNBOUNDED,
            |x| x * x - 2.0,
        );
        assert!(s.converged, "{method:?}");
        let (lo, hi) = s.bracket.unwrap_or((s.root, s.root));
        assert!(lo.next_up() >= hi, "{method:?}: {lo} {hi}");
    }
}

mod properties {
    use super::*;
    use proptest::prelude::*;

    fn any_end() -> impl Strategy<Value = f64> {
        prop_oneof![
            -1e3..1e3f64,
            proptest::num::f64::NORMAL | proptest::num::f64::SUBNORMAL | proptest::num::f64::ZERO,
            Just(f64::MAX),
            Just(-f64::MAX),
        ]
    }

    proptest! {
        #![proptest_config(ProptestConfig::with_cases(300))]

        /// No bracket and no cubic (some with a NaN stretch) makes a bracketing method
        /// panic, repeat a point, overrun its budget or claim convergence without a sign
        /// change or zero.
        #[test]
        fn bracketing_methods_stay_honest(
            a in any_end(),
            b in any_end(),
            c0 in -10.0..10.0f64,
            c1 in -10.0..10.0f64,
            c3 in -1.0..1.0f64,
            nan_lo in -5.0..5.0f64,
            nan_width in prop_oneof![Just(0.0), 0.0..2.0f64],
            budget in 2usize..60,
        ) {
            prop_assume!(a != b);
            let f = |x: f64| {
                if x > nan_lo && x < nan_lo + nan_width {
                    f64::NAN
                } else {
                    c0 + c1 * x + c3 * x * x * x
                }
            };
            let tol = Tolerances { max_evals: budget, ..tight() };
            for method in BRACKETING {
                let (s, xs) = counted(method, Start::Bracket(a, b), tol, Bounds::UNBOUNDED, f);
                prop_assert!(xs.len() <= budget, "{:?}: {} > {}", method, xs.len(), budget);
                if s.converged && s.status != Status::ExactZero {
                    let (lo, hi) = s.bracket.expect("a converged bracketing solve has a bracket");
                    prop_assert!(f(lo).signum() != f(hi).signum() || f(lo) == 0.0 || f(hi) == 0.0);
                }
            }
        }
    }
}

#[test]
fn interpolating_methods_need_far_fewer_evaluations_than_bisection() {
    // Superlinear interpolation needs far fewer evaluations than bisection's one bit per
    // step (common practice, no source). A guard against a hybrid or Illinois that has
    // quietly fallen back to halving: the figures themselves are printed by
    // `examples/bench_methods.rs`, not asserted here.
    let tol = tight();
    let total = |method: MethodKind| -> usize {
        aps748::APS_CASES
            .iter()
            .map(|c| {
                counted(
                    method,
                    Start::Bracket(c.a, c.b),
                    tol,
                    Bounds::UNBOUNDED,
                    |x| c.f(x),
                )
                .0
                .evaluations
            })
            .sum()
    };
    let bisection = total(MethodKind::Bisection);
    let hybrid = total(MethodKind::Hybrid);
    let illinois = total(MethodKind::Illinois);
    assert!(
        4 * hybrid < bisection,
        "hybrid {hybrid} against bisection {bisection}"
    );
    assert!(
        2 * illinois < bisection,
        "Illinois {illinois} against bisection {bisection}"
    );
}

/// The tolerances the bound is checked at: the benchmark's (final bracket within
/// 4 eps |x| + 4 tiny), the default relative one, and an absolute one.
fn bound_tolerances() -> [Tolerances; 3] {
    let base = Tolerances {
        max_evals: 100_000,
        ..Tolerances::default()
    };
    [
        Tolerances {
            x_abs: 2.0 * f64::MIN_POSITIVE,
            x_rel: 2.0 * f64::EPSILON,
            f_abs: 0.0,
            ..base
        },
        base,
        Tolerances {
            x_abs: 1e-9,
            x_rel: 0.0,
            ..base
        },
    ]
}

#[test]
fn hybrid_never_needs_more_than_bisection_plus_the_slack() {
    // The bound proved in `src/methods/hybrid.rs`: at most bisection's count plus
    // SLACK + 1 on any function with one sign change, checked on functions built to
    // defeat interpolation (`fixtures/interpolation_traps.rs`) at 36 roots each and
    // three tolerances, counted through a counting wrapper.
    let mut worst = (0i64, String::new());
    let mut runs = 0;
    for trap in interpolation_traps::TRAPS.iter() {
        for &(a, b) in interpolation_traps::BRACKETS.iter() {
            for &at in interpolation_traps::ROOT_AT.iter() {
                let r = a + at * (b - a);
                for tol in bound_tolerances() {
                    let f = |x: f64| trap.eval(x, r);
                    let (h, hx) = counted(
                        MethodKind::Hybrid,
                        Start::Bracket(a, b),
                        tol,
                        Bounds::UNBOUNDED,
                        f,
                    );
                    let mut bis = tacit::methods::bisection::Bisection::new(a, b);
                    let bisection = drive(&mut bis, tol, f).xs.len();
                    // The hybrid's own evaluations, without the driver's checks.
                    let own = hx.len() - h.checks;
                    let excess = own as i64 - bisection as i64;
                    runs += 1;
                    if excess > worst.0 {
                        worst = (
                            excess,
                            format!(
                                "{} on [{a}, {b}], r = {r}: {own} against {bisection}",
                                trap.name
                            ),
                        );
                    }
                    assert!(
                        excess <= hybrid::SLACK as i64 + 1,
                        "{} on [{a}, {b}], r = {r}, {tol:?}: hybrid {own}, bisection {bisection}",
                        trap.name
                    );
                }
            }
        }
    }
    assert!(runs > 1000);
    println!("worst excess over bisection: {} ({})", worst.0, worst.1);
}
