//! Failure cases from the issue trackers of general-purpose root-finding libraries.
//! None may report converged, except where the default finds a real root (checked).

use tacit::{solve, Bounds, MethodKind, Options, Start, Status};

fn options(method: MethodKind) -> Options {
    Options {
        method,
        ..Options::default()
    }
}

/// No method may report converged on `f` from `start`.
fn check_never_converged(source: &str, start: Start, f: impl Fn(f64) -> f64) {
    for method in MethodKind::ALL {
        let s = solve(start, &options(method), &f).unwrap();
        assert!(
            !s.converged && !s.status.is_converged(),
            "{source}: {method:?} reported {:?} at {} (f = {})",
            s.status,
            s.root,
            s.residual
        );
        assert!(
            !s.message().starts_with("Converged"),
            "{source}: {method:?}"
        );
    }
}

/// Converged is allowed only at a real root: |f| tiny and, for the default, a bracket
/// or an exact zero to confirm it.
fn check_converged_only_at(source: &str, start: Start, f: impl Fn(f64) -> f64, root: f64) {
    for method in MethodKind::ALL {
        let s = solve(start, &options(method), &f).unwrap();
        if s.converged {
            assert!(
                (s.root - root).abs() <= 1e-9 * root.abs().max(1.0),
                "{source}: {method:?} converged at {} but the root is {root}",
                s.root
            );
            if method == MethodKind::Auto {
                assert!(
                    s.bracket.is_some() || s.status == Status::ExactZero,
                    "{source}: the default converged without a sign change or exact zero"
                );
            }
        }
    }
}

#[test]
fn no_real_root_quartic() {
    // x^4 - x^2 + 1 has no real root; a secant-based solver returned x = 0.0011 with
    // f = 0.99999 as a root. Issue tracker of SciPy, scipy/scipy#6379 ("optimize.newton
    // returns no error and wrong result"), start 0.001 and its automatic second point
    // 0.001 * 1.0001 + 1e-4.
    let f = |x: f64| x.powi(4) - x * x + 1.0;
    check_never_converged(
        "scipy#6379 x^4-x^2+1",
        Start::Guesses(0.001, 0.001 * 1.0001 + 1e-4),
        f,
    );
    check_never_converged("x^4-x^2+1 from 1, 2", Start::Guesses(1.0, 2.0), f);
    check_never_converged("x^4-x^2+1 bracket", Start::Bracket(-3.0, 3.0), f);
    // 1 + x^2 on (10, 20): a bracketing method returned 2.149 for it. Issue tracker of
    // Roots.jl, JuliaMath/Roots.jl#441. And x^2 + 1 on [-1, 1] returned 0: issue tracker
    // of Hail, hail-is/hail#1896.
    check_never_converged("Roots.jl#441 1+x^2", Start::Guesses(10.0, 20.0), |x| {
        1.0 + x * x
    });
    check_never_converged(
        "Roots.jl#441 1+x^2 bracket",
        Start::Bracket(10.0, 20.0),
        |x| 1.0 + x * x,
    );
    check_never_converged("hail#1896 x^2+1", Start::Bracket(-1.0, 1.0), |x| {
        x * x + 1.0
    });
}

#[test]
fn constant_function() {
    // root_scalar(lambda x: 5., x0=6., x1=8.) reported converged at 7.0. Issue tracker of
    // SciPy, scipy/scipy#14486 (comment of 2022-11-26).
    check_never_converged("scipy#14486 constant", Start::Guesses(6.0, 8.0), |_| 5.0);
    check_never_converged(
        "scipy#14486 constant bracket",
        Start::Bracket(6.0, 8.0),
        |_| 5.0,
    );
    let s = solve(Start::Guesses(6.0, 8.0), &options(MethodKind::Auto), |_| {
        5.0
    })
    .unwrap();
    assert_eq!(s.status, Status::Flat, "every value seen was the same");
}

#[test]
fn zero_slope_at_the_start() {
    // Guesses symmetric about a minimum: f1 == f2, the secant line is horizontal
    // (common practice, no source); with no root, nothing may converge.
    check_never_converged("x^2+1 from -1, 1", Start::Guesses(-1.0, 1.0), |x| {
        x * x + 1.0
    });
    check_never_converged("cos x + 1.5 from 0, 0.1", Start::Guesses(0.0, 0.1), |x| {
        x.cos() + 1.5
    });
    // With a root, the classic secant is flat and the default finds one of x = ±2.
    let f = |x: f64| x * x - 4.0;
    let s = solve(Start::Guesses(-1.0, 1.0), &options(MethodKind::Secant), f).unwrap();
    assert_eq!(s.status, Status::Flat);
    let s = solve(Start::Guesses(-1.0, 1.0), &options(MethodKind::Auto), f).unwrap();
    assert!(s.converged && (s.root.abs() - 2.0).abs() < 1e-12, "{s:?}");
    // A saturated logistic: f is flat (0.5) at the second start point, the secant step
    // runs off and "converged" to 8.2e-6 where f = 0.5. Issue tracker of SciPy,
    // scipy/scipy#6379 (comment of 2017-08-17); root 1.4142e-10 in closed form.
    let g = |x: f64| 1.0 / (1.0 + (-1e10 * (x - 1.4142e-10)).exp()) - 0.5;
    check_converged_only_at(
        "scipy#6379 logistic",
        Start::Guesses(2e-10, 2e-10 * 1.0001 + 1e-4),
        g,
        1.4142e-10,
    );
    let s = solve(
        Start::Guesses(2e-10, 2e-10 * 1.0001 + 1e-4),
        &options(MethodKind::Auto),
        g,
    )
    .unwrap();
    assert!(s.converged && (s.root - 1.4142e-10).abs() < 1e-18, "{s:?}");
}

#[test]
fn nan_over_part_of_the_domain() {
    // brentq bailed out with a "root" when f returned NaN. Issue tracker of SciPy,
    // scipy/scipy#3089 ("brentq, nan returns, and bounds"). Here sqrt(x) + 1 is NaN
    // for x < 0 and has no root.
    check_never_converged("scipy#3089 sqrt(x)+1", Start::Guesses(4.0, 3.0), |x| {
        x.sqrt() + 1.0
    });
    check_never_converged("NaN everywhere", Start::Guesses(0.0, 0.1), |_| f64::NAN);
    check_never_converged("NaN at one bracket end", Start::Bracket(-1.0, 3.0), |x| {
        x.sqrt() + 1.0
    });
    let s = solve(Start::Guesses(4.0, 3.0), &options(MethodKind::Auto), |x| {
        x.sqrt() + 1.0
    })
    .unwrap();
    assert_eq!(s.status, Status::NonFinite);
    assert!(
        s.root >= 0.0 && s.residual.is_finite(),
        "reports a good point: {s:?}"
    );
}

#[test]
fn nan_where_backing_off_finds_the_root() {
    // sqrt(x) - 0.5 from 4, 3: the first secant step lands at x < 0 where f is NaN;
    // halving back towards the last good point finds the root 0.25 (closed form). The
    // classic secant gives up there (common practice, no source).
    let f = |x: f64| x.sqrt() - 0.5;
    let s = solve(Start::Guesses(4.0, 3.0), &options(MethodKind::Secant), f).unwrap();
    assert_eq!(s.status, Status::NonFinite);
    let s = solve(Start::Guesses(4.0, 3.0), &options(MethodKind::Auto), f).unwrap();
    assert!(s.converged, "{s:?}");
    assert!((s.root - 0.25).abs() < 1e-12, "{}", s.root);
    // ln x from 3, 4: the same, root 1.
    let s = solve(
        Start::Guesses(3.0, 4.0),
        &options(MethodKind::Auto),
        |x: f64| x.ln(),
    )
    .unwrap();
    assert!(s.converged && (s.root - 1.0).abs() < 1e-12, "{s:?}");
    // A bracket with a NaN end: backing off inside it finds the sign change.
    let s = solve(Start::Bracket(-1.0, 3.0), &options(MethodKind::Auto), f).unwrap();
    assert!(s.converged && (s.root - 0.25).abs() < 1e-12, "{s:?}");
}

#[test]
fn secant_guesses_that_run_away() {
    // x e^-x from 2, 3: secant steps run off towards +infinity, where f -> 0 without a
    // root (issue tracker of SciPy, recalled from memory). The only root is 0.
    let f = |x: f64| x * (-x).exp();
    check_converged_only_at("x e^-x from 2, 3", Start::Guesses(2.0, 3.0), f, 0.0);
    let s = solve(Start::Guesses(2.0, 3.0), &options(MethodKind::Secant), f).unwrap();
    assert!(!s.converged, "the classic secant runs away: {s:?}");
    // With the root excluded by bounds, the default must not converge.
    let bounded = Options {
        bounds: Bounds::new(1.0, 50.0).unwrap(),
        ..options(MethodKind::Auto)
    };
    let s = solve(Start::Guesses(2.0, 3.0), &bounded, f).unwrap();
    assert!(!s.converged, "{s:?}");
    assert!(
        matches!(
            s.status,
            Status::Diverging | Status::StuckAtBound | Status::NoSignChange
        ),
        "{s:?}"
    );
    // e^(-x^2) has no root; f underflows to 0 far out. Common practice, no source.
    check_never_converged("e^-x^2 from 1, 2", Start::Guesses(1.0, 2.0), |x| {
        (-x * x).exp()
    });
    // 1/x has no root; secant iterates grow like Fibonacci numbers.
    check_never_converged("1/x from 1, 2", Start::Guesses(1.0, 2.0), |x| 1.0 / x);
}

#[test]
fn secant_converged_far_from_a_root() {
    // f(x) = 100 e^(-0.03 x) - 100 from 150, 75: root_scalar's secant reported converged
    // at 150, but the root is 0. Issue tracker of SciPy, scipy/scipy#14453.
    let f = |x: f64| 100.0 * (-0.03 * x).exp() - 100.0;
    check_converged_only_at("scipy#14453", Start::Guesses(150.0, 75.0), f, 0.0);
    // x^10 - 1 from 0.1, 0.2 is flat: the plain secant takes one huge step, overflows
    // and "converges" on step (common practice, no source). The default must be at 1.
    let g = |x: f64| x.powi(10) - 1.0;
    let s = solve(Start::Guesses(0.1, 0.2), &options(MethodKind::Auto), g).unwrap();
    assert!(s.converged && (s.root - 1.0).abs() < 1e-12, "{s:?}");
    let certificate = s
        .certificate
        .expect("converged answers carry a certificate");
    assert!(certificate.bracket.is_some(), "confirmed by a sign change");
    // Multiple root: secant crawls (issue tracker of mpmath, mpmath/mpmath#83,
    // (x-1)^100). Here (x-1)^5 from 2, 3; whatever is reported converged must be near 1.
    let h = |x: f64| (x - 1.0).powi(5);
    for method in MethodKind::ALL {
        let s = solve(Start::Guesses(2.0, 3.0), &options(method), h).unwrap();
        if s.converged {
            assert!((s.root - 1.0).abs() < 1e-2, "{method:?}: {s:?}");
        }
    }
}

#[test]
fn touching_root_is_accepted_only_when_f_is_tiny() {
    // (x-1)^2: no sign change; the default accepts it only with |f| <= 1e-10 of the
    // largest |f| seen (common practice, no source).
    let s = solve(Start::Guesses(2.0, 3.0), &options(MethodKind::Auto), |x| {
        (x - 1.0) * (x - 1.0)
    })
    .unwrap();
    assert!(s.converged && (s.root - 1.0).abs() < 1e-6, "{s:?}");
    // (x-1)^2 + 1e-6 has no root: a positive minimum, not a touching root.
    check_never_converged("(x-1)^2 + 1e-6", Start::Guesses(2.0, 3.0), |x| {
        (x - 1.0) * (x - 1.0) + 1e-6
    });
    // With a looser step tolerance (x_rel = 1e-4) the secant settles near 1 in both
    // cases, and only the size of |f| there tells them apart: (x-1)^2 settles where
    // |f| is about 4e-11 of the largest |f| seen (accepted), (x-1)^2 + 1e-8 where it
    // is about 3e-9 (rejected as stagnated). Common practice, no source.
    let loose = Options {
        tol: tacit::Tolerances {
            x_rel: 1e-4,
            ..tacit::Tolerances::default()
        },
        ..options(MethodKind::Auto)
    };
    let s = solve(Start::Guesses(2.0, 3.0), &loose, |x| (x - 1.0) * (x - 1.0)).unwrap();
    assert!(s.converged && (s.root - 1.0).abs() < 1e-4, "{s:?}");
    let s = solve(Start::Guesses(2.0, 3.0), &loose, |x| {
        (x - 1.0) * (x - 1.0) + 1e-8
    })
    .unwrap();
    assert!(!s.converged, "{s:?}");
    assert_eq!(s.status, Status::Stagnated, "{s:?}");
}

#[test]
fn each_failure_has_its_own_status() {
    // Functions: common practice, no source. Each run of the default must end not
    // converged, with the status named, and a diagnosis that says what to try next.
    let bounded = |lo: f64, hi: f64| Options {
        bounds: Bounds::new(lo, hi).unwrap(),
        ..options(MethodKind::Auto)
    };
    let budget = Options {
        tol: tacit::Tolerances {
            max_evals: 5,
            ..tacit::Tolerances::default()
        },
        ..options(MethodKind::Auto)
    };
    type F = fn(f64) -> f64;
    type Case = (&'static str, Options, (f64, f64), F, Status);
    let cases: &[Case] = &[
        (
            "x + 5 in [0, 10]",
            bounded(0.0, 10.0),
            (2.0, 3.0),
            |x| x + 5.0,
            Status::StuckAtBound,
        ),
        (
            "x^2 + 1",
            options(MethodKind::Auto),
            (0.3, 0.5),
            |x| x * x + 1.0,
            Status::Oscillating,
        ),
        (
            "1/x",
            options(MethodKind::Auto),
            (1.0, 2.0),
            |x| 1.0 / x,
            Status::Diverging,
        ),
        (
            "x^3 - 1e6, 5 evaluations",
            budget,
            (1.0, 2.0),
            |x| x.powi(3) - 1e6,
            Status::BudgetSpent,
        ),
        (
            "constant",
            options(MethodKind::Auto),
            (6.0, 8.0),
            |_| 5.0,
            Status::Flat,
        ),
        (
            "exp(x): the estimates run off towards -infinity",
            options(MethodKind::Auto),
            (0.0, 1.0),
            |x| x.exp(),
            Status::Diverging,
        ),
        (
            // Runaway secant steps, but the smallest |f| is an interior minimum above zero:
            // reported as no sign change, not as divergence.
            "(x-1)^4 + 1e-9",
            options(MethodKind::Auto),
            (2.0, 3.0),
            |x| (x - 1.0).powi(4) + 1e-9,
            Status::NoSignChange,
        ),
        (
            "(x-1)^2 + 1e-6",
            options(MethodKind::Auto),
            (2.0, 3.0),
            |x| (x - 1.0) * (x - 1.0) + 1e-6,
            Status::NoSignChange,
        ),
        (
            "sqrt x + 1",
            options(MethodKind::Auto),
            (4.0, 3.0),
            |x| x.sqrt() + 1.0,
            Status::NonFinite,
        ),
    ];
    for (name, opts, (a, b), f, want) in cases {
        let s = solve(Start::Guesses(*a, *b), opts, f).unwrap();
        assert_eq!(s.status, *want, "{name}: {s:?}");
        assert!(!s.converged, "{name}");
        assert!(
            s.message().starts_with("Not converged"),
            "{name}: {}",
            s.message()
        );
        assert!(s.evaluations <= opts.tol.max_evals, "{name}");
    }
}
