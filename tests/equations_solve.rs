//! Solving equation sets for any variable, against a textbook pipe-sizing example,
//! analytic derivatives, and bad input.
//!
//! Textbook source: F. M. White, *Fluid Mechanics*, 4th ed. (McGraw-Hill, 1999), §6.5
//! "Three types of pipe-flow problems". Its running example is a pipe of d = 0.5 ft,
//! L = 200 ft, ε/d = 0.0008 (ε = 0.0004 ft), ν = 1.1E-5 ft²/s, head loss hf = 4.5 ft,
//! g = 32.2 ft/s²: the type-2 example (find the velocity) gives V ≈ 6.05 ft/s,
//! Re ≈ 274,800, f ≈ 0.0198 (these figures read from a public excerpt of that
//! section); the type-3 example works it backward, finding d ≈ 0.5 ft from
//! Q = 1.18 ft³/s (recalled from memory).
//!
//! Results of pipe sizing support, and do not replace, checks by a licensed
//! professional under local codes.

use tacit::equations::{solve_set, EquationSet, UnknownSpec};
use tacit::{InputError, Options};

/// Darcy–Weisbach plus Colebrook, with velocity and Reynolds number as definitions.
const PIPE: &str = "\
# pipe flow, US customary units
V := Q/(pi*D^2/4)          # mean velocity
Re := V*D/nu               # Reynolds number
hf = f*(L/D)*V^2/(2*g)     # Darcy-Weisbach head loss
1/sqrt(f) = -2*log10(eps/(3.7*D) + 2.51/(Re*sqrt(f)))   # Colebrook
";

/// The same relation as one equation: Darcy–Weisbach solved for f as a definition.
const PIPE_ONE: &str = "\
V := Q/(pi*D^2/4)
Re := V*D/nu
f := 2*g*hf*D/(L*V^2)
1/sqrt(f) = -2*log10(eps/(3.7*D) + 2.51/(Re*sqrt(f)))
";

fn knowns(pairs: &[(&str, f64)]) -> Vec<(String, f64)> {
    pairs.iter().map(|&(n, v)| (n.to_string(), v)).collect()
}

fn value(s: &tacit::equations::SetSolution, name: &str) -> f64 {
    s.unknowns
        .iter()
        .chain(&s.definitions)
        .find(|(n, _)| n == name)
        .map(|&(_, v)| v)
        .unwrap_or_else(|| panic!("no {name} in the solution"))
}

/// Relative closeness, naming the source of the expected value.
fn check_close(got: f64, expected: f64, rel: f64, what: &str) {
    let err = ((got - expected) / expected).abs();
    assert!(
        err <= rel,
        "{what}: got {got}, expected {expected} (relative error {err:e} > {rel:e})"
    );
}

fn solve(
    text: &str,
    given: &[(&str, f64)],
    unknowns: &[UnknownSpec],
) -> tacit::equations::SetSolution {
    let set = EquationSet::parse(text).unwrap();
    let s = solve_set(&set, &knowns(given), unknowns, &Options::default(), false)
        .unwrap_or_else(|e| panic!("{e:?}"));
    assert!(s.converged, "not converged: {:?} {:?}", s.status, s.blocks);
    s
}

#[test]
fn type_2_velocity_from_head_loss_matches_white_section_6_5() {
    // White 4th ed. §6.5 type-2 example: V ≈ 6.05 ft/s, Re ≈ 274,800, f ≈ 0.0198.
    let s = solve(
        PIPE,
        &[
            ("D", 0.5),
            ("hf", 4.5),
            ("L", 200.0),
            ("nu", 1.1e-5),
            ("eps", 0.0004),
            ("g", 32.2),
        ],
        &[
            UnknownSpec::named("Q")
                .with_guesses(0.5, 2.0)
                .with_bounds(1e-6, 100.0),
            UnknownSpec::named("f")
                .with_guesses(0.02, 0.03)
                .with_bounds(1e-4, 1.0),
        ],
    );
    check_close(value(&s, "V"), 6.05, 0.005, "V, White §6.5 type 2");
    check_close(value(&s, "Re"), 274_800.0, 0.005, "Re, White §6.5 type 2");
    check_close(value(&s, "f"), 0.0198, 0.01, "f, White §6.5 type 2");
    assert!(s.system.is_some(), "Q and f are coupled: one Broyden block");
}

#[test]
fn type_3_diameter_from_flow_and_head_loss_matches_white_section_6_5() {
    // White 4th ed. §6.5 type-3 example (recalled from memory): Q = 1.18 ft³/s,
    // hf = 4.5 ft, L = 200 ft, ε = 0.0004 ft, ν = 1.1E-5 ft²/s → d ≈ 0.5 ft.
    let given = [
        ("Q", 1.18),
        ("hf", 4.5),
        ("L", 200.0),
        ("nu", 1.1e-5),
        ("eps", 0.0004),
        ("g", 32.2),
    ];
    // Two equations, two unknowns: D and f together by Broyden.
    let s = solve(
        PIPE,
        &given,
        &[
            UnknownSpec::named("D")
                .with_guesses(0.3, 0.4)
                .with_bounds(0.01, 10.0),
            UnknownSpec::named("f")
                .with_guesses(0.02, 0.03)
                .with_bounds(1e-4, 1.0),
        ],
    );
    check_close(value(&s, "D"), 0.5, 0.01, "d, White §6.5 type 3");
    check_close(value(&s, "f"), 0.0198, 0.01, "f, White §6.5 type 3");
    assert_eq!(s.blocks.len(), 1);
    assert_eq!(s.blocks[0].unknowns, ["D", "f"]);
    // The one-equation form, one unknown, default guesses inside the bounds.
    let one = solve(
        PIPE_ONE,
        &given,
        &[UnknownSpec::named("D").with_bounds(0.01, 10.0)],
    );
    assert!(one.scalar.is_some());
    check_close(
        value(&one, "D"),
        value(&s, "D"),
        1e-9,
        "one-equation form agrees with the pair",
    );
}

#[test]
fn a_set_that_decomposes_is_solved_block_by_block() {
    // Head loss from flow (type 1): Colebrook alone fixes f, then Darcy gives hf.
    let v = 6.05;
    let q = v * std::f64::consts::PI * 0.25 / 4.0;
    let s = solve(
        PIPE,
        &[
            ("D", 0.5),
            ("Q", q),
            ("L", 200.0),
            ("nu", 1.1e-5),
            ("eps", 0.0004),
            ("g", 32.2),
        ],
        &[
            UnknownSpec::named("hf"),
            UnknownSpec::named("f")
                .with_guesses(0.01, 0.05)
                .with_bounds(1e-4, 1.0),
        ],
    );
    assert_eq!(s.blocks.len(), 2, "{:?}", s.blocks);
    assert_eq!(s.blocks[0].unknowns, ["f"]);
    assert_eq!(s.blocks[1].unknowns, ["hf"]);
    assert_eq!(
        s.evaluations,
        s.blocks[0].evaluations + s.blocks[1].evaluations
    );
    check_close(
        value(&s, "hf"),
        4.5,
        0.005,
        "hf, White §6.5 (the 4.5 ft of the example)",
    );
}

#[test]
fn solving_for_each_variable_in_turn_recovers_the_original_values() {
    // Start from the textbook point, find Q (type 2) in the one-equation form, then
    // solve for every variable in turn with the others at that point.
    let base = [
        ("D", 0.5),
        ("hf", 4.5),
        ("L", 200.0),
        ("nu", 1.1e-5),
        ("eps", 0.0004),
        ("g", 32.2),
    ];
    let q = value(
        &solve(
            PIPE_ONE,
            &base,
            &[UnknownSpec::named("Q").with_bounds(1e-6, 100.0)],
        ),
        "Q",
    );
    let mut point: Vec<(&str, f64)> = base.to_vec();
    point.push(("Q", q));
    for &(name, truth) in &point {
        let given: Vec<(&str, f64)> = point.iter().copied().filter(|(n, _)| *n != name).collect();
        let spec = UnknownSpec::named(name)
            .with_guesses(truth * 0.8, truth * 1.25)
            .with_bounds(truth * 0.05, truth * 20.0);
        let s = solve(PIPE_ONE, &given, &[spec]);
        check_close(
            value(&s, name),
            truth,
            1e-9,
            &format!("{name} recovered (one equation)"),
        );
    }
    // The two-equation set, each variable paired with f: some pairs split into two
    // scalar blocks, Q and D are coupled with f and go to Broyden.
    // f at that point, from Darcy–Weisbach: f = 2 g hf D / (L V²).
    let v = q / (std::f64::consts::PI * 0.25 / 4.0);
    let f = 2.0 * 32.2 * 4.5 * 0.5 / (200.0 * v * v);
    for &(name, truth) in &point {
        let given: Vec<(&str, f64)> = point.iter().copied().filter(|(n, _)| *n != name).collect();
        let specs = [
            UnknownSpec::named(name)
                .with_guesses(truth * 0.8, truth * 1.25)
                .with_bounds(truth * 0.05, truth * 20.0),
            UnknownSpec::named("f")
                .with_guesses(0.015, 0.03)
                .with_bounds(1e-4, 1.0),
        ];
        let s = solve(PIPE, &given, &specs);
        check_close(
            value(&s, name),
            truth,
            1e-8,
            &format!("{name} recovered (two equations)"),
        );
        check_close(value(&s, "f"), f, 1e-8, &format!("f recovered with {name}"));
    }
}

#[test]
fn sensitivities_match_analytic_derivatives_darcy_weisbach() {
    // hf = f (L/D) V²/(2g) with V = 4Q/(πD²) gives D = (8 f L Q² / (π² g hf))^(1/5):
    // relative sensitivities are the exponents 2/5, 1/5, 1/5, -1/5, -1/5 (analytic).
    let text = "V := Q/(pi*D^2/4)\nhf = f*(L/D)*V^2/(2*g)";
    let set = EquationSet::parse(text).unwrap();
    let given = knowns(&[
        ("Q", 1.18),
        ("f", 0.0198),
        ("L", 200.0),
        ("g", 32.2),
        ("hf", 4.5),
    ]);
    let s = solve_set(
        &set,
        &given,
        &[UnknownSpec::named("D").with_bounds(0.01, 10.0)],
        &Options::default(),
        true,
    )
    .unwrap();
    assert!(s.converged);
    let d = s.unknowns[0].1;
    let expected = [
        ("Q", 0.4),
        ("f", 0.2),
        ("L", 0.2),
        ("g", -0.2),
        ("hf", -0.2),
    ];
    assert_eq!(s.sensitivities.len(), expected.len());
    for (sens, (input, rel)) in s.sensitivities.iter().zip(expected) {
        assert_eq!(sens.unknown, "D");
        assert_eq!(sens.input, input);
        let p = given.iter().find(|(n, _)| n == input).unwrap().1;
        // Forward-mode derivatives: exact up to rounding and to the root's own
        // tolerance (x_rel = 1e-12); central differences held only 1e-5 here.
        check_close(
            sens.relative,
            rel,
            1e-11,
            &format!("relative dD/d{input}, analytic"),
        );
        check_close(
            sens.derivative,
            rel * d / p,
            1e-11,
            &format!("dD/d{input}, analytic"),
        );
    }
    // No evaluation of f at a point: one run with dual numbers per unknown and known.
    assert_eq!(s.sensitivity_evaluations, 0);
    assert_eq!(s.sensitivity_runs, 1 + 5);
}

#[test]
fn sensitivities_match_analytic_derivatives_colebrook() {
    // With s = 1/√f, A = k/3.7 + 2.51 s/Re and F = s + 2 log10 A = 0 (Colebrook),
    // implicit differentiation by hand gives ds/dp = -(∂F/∂p)/(∂F/∂s), df/dp = -2 s⁻³ ds/dp.
    let set = EquationSet::parse("1/sqrt(f) = -2*log10(k/3.7 + 2.51/(Re*sqrt(f)))").unwrap();
    let (re, k) = (1.0e5, 1.0e-3);
    let given = knowns(&[("Re", re), ("k", k)]);
    let spec = UnknownSpec::named("f").with_bounds(1e-4, 1.0);
    let s = solve_set(&set, &given, &[spec], &Options::default(), true).unwrap();
    assert!(s.converged);
    let f = s.unknowns[0].1;
    let sv = 1.0 / f.sqrt();
    let a = k / 3.7 + 2.51 * sv / re;
    let c = 2.0 / std::f64::consts::LN_10;
    let df_ds = 1.0 + c * (2.51 / re) / a;
    let partial = [
        ("Re", c * (-2.51 * sv / (re * re)) / a),
        ("k", c * (1.0 / 3.7) / a),
    ];
    for (sens, (input, dfp)) in s.sensitivities.iter().zip(partial) {
        assert_eq!(sens.input, input);
        let ds = -dfp / df_ds;
        let expected = -2.0 * sv.powi(-3) * ds;
        check_close(
            sens.derivative,
            expected,
            1e-12,
            &format!("df/d{input}, analytic"),
        );
    }
}

#[test]
fn sensitivities_of_a_coupled_pair_match_analytic_derivatives() {
    // x² + y² = r², y = m x: x = r/√(1+m²), y = m r/√(1+m²) (analytic).
    let set = EquationSet::parse("x^2 + y^2 = r^2\ny = m*x").unwrap();
    let (r, m) = (2.0, 0.75);
    let given = knowns(&[("r", r), ("m", m)]);
    let specs = [
        UnknownSpec::named("x").with_guesses(1.0, 1.1),
        UnknownSpec::named("y").with_guesses(1.0, 1.1),
    ];
    let s = solve_set(&set, &given, &specs, &Options::default(), true).unwrap();
    assert!(s.converged, "{:?}", s.status);
    let w = (1.0 + m * m).sqrt();
    check_close(s.unknowns[0].1, r / w, 1e-10, "x, analytic");
    check_close(s.unknowns[1].1, m * r / w, 1e-10, "y, analytic");
    let expected = [
        ("x", "r", 1.0 / w),
        ("x", "m", -r * m / w.powi(3)),
        ("y", "r", m / w),
        ("y", "m", r / w.powi(3)),
    ];
    for (sens, (u, p, d)) in s.sensitivities.iter().zip(expected) {
        assert_eq!((sens.unknown.as_str(), sens.input.as_str()), (u, p));
        check_close(sens.derivative, d, 1e-10, &format!("d{u}/d{p}, analytic"));
    }
    assert_eq!(s.sensitivity_evaluations, 0, "no evaluation at a point");
    assert_eq!(s.sensitivity_runs, 2 + 2, "one dual run per column");
}

#[test]
fn variables_shadow_constants() {
    // The constant e unless the caller gives e a value.
    let set = EquationSet::parse("y = e*x").unwrap();
    let s = solve_set(
        &set,
        &knowns(&[("y", 1.0)]),
        &[UnknownSpec::named("x")],
        &Options::default(),
        false,
    )
    .unwrap();
    check_close(s.unknowns[0].1, 1.0 / std::f64::consts::E, 1e-12, "x = 1/e");
    let s = solve_set(
        &set,
        &knowns(&[("y", 1.0), ("e", 0.5)]),
        &[UnknownSpec::named("x")],
        &Options::default(),
        false,
    )
    .unwrap();
    check_close(
        s.unknowns[0].1,
        2.0,
        1e-12,
        "x = 1/0.5 with e an eccentricity",
    );
    // e as the unknown: eccentricity in the secant formula for columns,
    // σ = P/A (1 + e c/r² sec(L/(2r) √(P/(E A)))), inverted for e (analytic inverse).
    let column = EquationSet::parse("smax = P/A*(1 + e*c/r^2*sec(L/(2*r)*sqrt(P/(E*A))))").unwrap();
    let (p, a, c, r, l, em, e): (f64, f64, f64, f64, f64, f64, f64) =
        (2.0e5, 4.0e-3, 0.1, 0.07, 5.0, 2.0e11, 0.01);
    let sec = 1.0 / (l / (2.0 * r) * (p / (em * a)).sqrt()).cos();
    let smax = p / a * (1.0 + e * c / (r * r) * sec);
    let given = knowns(&[
        ("smax", smax),
        ("P", p),
        ("A", a),
        ("c", c),
        ("r", r),
        ("L", l),
        ("E", em),
    ]);
    let s = solve_set(
        &column,
        &given,
        &[UnknownSpec::named("e")],
        &Options::default(),
        false,
    )
    .unwrap();
    check_close(s.unknowns[0].1, e, 1e-9, "eccentricity recovered");
}

#[test]
fn residual_fn_evaluates_the_one_equation() {
    let set = EquationSet::parse("A := pi*D^2/4\nQ = V*A").unwrap();
    let mut f = set
        .residual_fn(&knowns(&[("Q", 0.1), ("V", 2.0)]), "D")
        .unwrap();
    let d: f64 = 0.3;
    assert_eq!(f(d), 0.1 - 2.0 * (std::f64::consts::PI * d.powf(2.0) / 4.0));
    let two = EquationSet::parse("x = 1\ny = 2").unwrap();
    assert_eq!(
        two.residual_fn(&[], "x").err().map(|e| e.code),
        Some("equation-count")
    );
}

fn solve_err(text: &str, given: &[(&str, f64)], unknowns: &[UnknownSpec]) -> InputError {
    let set = EquationSet::parse(text).unwrap();
    match solve_set(&set, &knowns(given), unknowns, &Options::default(), false) {
        Ok(s) => panic!("should be refused, got {s:?}"),
        Err(e) => e,
    }
}

#[test]
fn bad_input_is_refused_with_the_value_and_place() {
    let x = || UnknownSpec::named("x");
    let y = || UnknownSpec::named("y");
    let e = solve_err("y = 2*x", &[("y", 1.0)], &[x(), y()]);
    assert_eq!(e.code, "duplicate-name", "{e:?}");
    let e = solve_err("y = 2*x", &[], &[x(), y()]);
    assert_eq!(e.code, "count-mismatch");
    assert!(
        e.message.contains("2 unknowns (x, y) but 1 equation"),
        "{}",
        e.message
    );
    let e = solve_err("y = 2*x", &[("y", 1.0), ("z", 3.0)], &[x()]);
    assert_eq!(e.code, "unused-name");
    assert!(e.message.contains("`z`"), "{}", e.message);
    let e = solve_err("y = 2*x", &[("y", 1.0)], &[UnknownSpec::named("w")]);
    assert_eq!(e.code, "unused-name");
    let e = solve_err("y = 2*x + b", &[("y", 1.0)], &[x()]);
    assert_eq!(e.code, "missing-value");
    assert!(e.message.contains("`b`"), "{}", e.message);
    assert_eq!(e.position, Some(10));
    for bad in [f64::NAN, f64::INFINITY, f64::NEG_INFINITY] {
        let e = solve_err("y = 2*x", &[("y", bad)], &[x()]);
        assert_eq!(e.code, "non-finite-input");
        assert!(e.message.contains("`y`"), "{}", e.message);
    }
    let e = solve_err("A := 2*x\ny = A", &[("y", 1.0), ("A", 3.0)], &[x()]);
    assert_eq!(e.code, "defined-name");
    let e = solve_err("y = 2*x", &[("y", 1.0), ("x", 2.0)], &[]);
    assert_eq!(e.code, "no-unknown");
    // x appears only in a definition no equation uses.
    let e = solve_err("u := x\ny = 2*w", &[("y", 1.0), ("w", 1.0)], &[x()]);
    assert_eq!(e.code, "equation-without-unknown");
    assert_eq!(e.position, Some(7));
    let e = solve_err(
        "u := x\ny = 2*w\nz = w",
        &[("y", 1.0), ("z", 1.0)],
        &[x(), UnknownSpec::named("w")],
    );
    assert_eq!(e.code, "unknown-not-in-equations");
    assert!(e.message.contains("`x`"), "{}", e.message);
    // Two equations in x only, y nowhere but an unused definition: structurally singular.
    let e = solve_err("x = 1\n2*x = 2\nq := y", &[], &[x(), y()]);
    assert_eq!(e.code, "unknown-not-in-equations");
    let e = solve_err(
        "x = 1\n2*x = 2\ny + z = 3",
        &[],
        &[x(), y(), UnknownSpec::named("z")],
    );
    assert_eq!(e.code, "structurally-singular", "{e:?}");
    assert_eq!(e.position, Some(6), "the second equation in x alone");
    let e = solve_err(
        "y = 2*x",
        &[("y", 1.0)],
        &[x().with_guesses(5.0, 6.0).with_bounds(0.0, 1.0)],
    );
    assert_eq!(e.code, "start-outside-bounds");
    assert!(e.message.contains("`x`"), "{}", e.message);
    let e = solve_err("y = 2*x", &[("y", 1.0)], &[x().with_guesses(2.0, 2.0)]);
    assert_eq!(e.code, "equal-guesses");
    let e = solve_err("y = 2*x", &[("y", 1.0)], &[x().with_bounds(3.0, 1.0)]);
    assert_eq!(e.code, "bad-bounds");
    assert!(e.message.contains("`x`"), "{}", e.message);
}

#[test]
fn default_guesses_are_the_documented_ones() {
    use tacit::equations::default_guesses;
    use tacit::Bounds;
    assert_eq!(default_guesses(Bounds::UNBOUNDED), (1.0, 1.1));
    assert_eq!(default_guesses(Bounds { lo: 0.0, hi: 3.0 }), (1.0, 2.0));
    assert_eq!(
        default_guesses(Bounds {
            lo: 0.0,
            hi: f64::INFINITY
        }),
        (1.0, 1.1)
    );
    assert_eq!(
        default_guesses(Bounds {
            lo: 10.0,
            hi: f64::INFINITY
        }),
        (20.0, 22.0)
    );
    assert_eq!(
        default_guesses(Bounds {
            lo: f64::NEG_INFINITY,
            hi: 0.0
        }),
        (-1.0, -1.1)
    );
}

#[test]
fn a_numerically_singular_pair_is_not_converged_and_not_an_error() {
    // x + y = 1 and 2x + 2y = 2 are the same line: Broyden's Jacobian is singular.
    let set = EquationSet::parse("x + y = 1\n2*x + 2*y = 2").unwrap();
    let specs = [UnknownSpec::named("x"), UnknownSpec::named("y")];
    let s = solve_set(&set, &[], &specs, &Options::default(), false).unwrap();
    assert!(!s.converged, "{s:?}");
}

#[test]
fn a_non_converged_block_is_reported_honestly() {
    // x² + 1 = 0 has no real root: not converged, and not an error.
    let set = EquationSet::parse("x^2 + 1 = 0").unwrap();
    let s = solve_set(
        &set,
        &[],
        &[UnknownSpec::named("x")],
        &Options::default(),
        true,
    )
    .unwrap();
    assert!(!s.converged);
    assert!(!s.status.is_converged());
    assert!(s.sensitivities.is_empty());
}

#[test]
fn secant_slopes_are_reused_only_when_accurate() {
    use tacit::equations::sensitivity::slope_from_history;
    use tacit::{HistoryRow, StepKind};
    let row = |x: f64| HistoryRow {
        k: 0,
        x,
        fx: x * x - 4.0, // f'(2) = 4
        step: f64::NAN,
        bracket: None,
        kind: StepKind::Secant,
    };
    // Points 1e-7 and 2e-7 from the root, 1e-7 apart: error estimate ~1e-7 + 1e-8.
    let close = [row(3.0), row(2.0 + 2e-7), row(2.0 + 1e-7)];
    let s = slope_from_history(&close, 2.0).expect("close points are re-used");
    assert!((s - 4.0).abs() < 4.0 * 1e-6, "{s}");
    // Only points 1e-2 away: too far, not re-used.
    assert_eq!(slope_from_history(&[row(2.02), row(1.98)], 2.0), None);
    // Points 1e-14 apart: rounding would dominate, not re-used.
    assert_eq!(slope_from_history(&[row(2.0), row(2.0 + 4e-14)], 2.0), None);
}

#[test]
fn forward_mode_sensitivities_agree_with_central_differences() {
    // The two ways of taking the Jacobians (equations::sensitivity::Method) on White's
    // pipe of §6.5 as one coupled set (four unknowns' worth of definitions, Colebrook
    // and Darcy–Weisbach together): central differences keep about 10 digits (common
    // practice, no source), so they must agree to 1e-7 relative; the forward-mode ones
    // are checked against closed forms in the tests above.
    use tacit::equations::sensitivity::{sensitivities_at, Method};
    let set = EquationSet::parse(PIPE).unwrap();
    let given = knowns(&[
        ("D", 0.5),
        ("L", 200.0),
        ("eps", 0.0004),
        ("nu", 1.1e-5),
        ("hf", 4.5),
        ("g", 32.2),
    ]);
    let specs = [
        UnknownSpec::named("Q").with_guesses(1.0, 1.2),
        UnknownSpec::named("f").with_guesses(0.02, 0.021),
    ];
    let s = solve_set(&set, &given, &specs, &Options::default(), true).unwrap();
    assert!(s.converged, "{:?}", s.status);
    let (by_differences, cost) =
        sensitivities_at(&set, &given, &s.unknowns, Method::CentralDifferences).unwrap();
    assert_eq!(cost.evaluations, 2 * (2 + 6));
    assert_eq!(by_differences.len(), s.sensitivities.len());
    for (exact, diff) in s.sensitivities.iter().zip(&by_differences) {
        assert_eq!((&exact.unknown, &exact.input), (&diff.unknown, &diff.input));
        check_close(
            exact.derivative,
            diff.derivative,
            1e-7,
            &format!(
                "d{}/d{} against central differences",
                exact.unknown, exact.input
            ),
        );
    }
    let (again, cost) = sensitivities_at(&set, &given, &s.unknowns, Method::ForwardMode).unwrap();
    assert_eq!(
        again, s.sensitivities,
        "the same runs give the same numbers"
    );
    assert_eq!((cost.evaluations, cost.runs), (0, 8));
}
