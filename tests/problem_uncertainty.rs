//! The uncertainty of an answer through the Problem: `uncertainties` on the knowns of
//! a template or of one's own equations, in the known's unit or as a percentage, and
//! the result in the unknown's unit; the Monte Carlo trials in chunks. Against closed
//! forms, the JCGM 101:2008 additive example, and the reference values named beside
//! each check.

use tacit::problem::spec::from_json;
use tacit::problem::{Problem, ProblemSpec, SolveOptions};

fn problem(json: &str) -> Problem {
    let spec: ProblemSpec = from_json("spec", json).expect("a valid spec");
    Problem::compile(&spec).expect("compiles")
}

fn compile_error(json: &str) -> tacit::InputError {
    match from_json::<ProblemSpec>("spec", json) {
        Err(e) => e,
        Ok(spec) => match Problem::compile(&spec) {
            Err(e) => e,
            Ok(_) => panic!("expected an error for {json}"),
        },
    }
}

fn options(json: &str) -> SolveOptions {
    from_json("options", json).expect("valid options")
}

fn close(got: f64, want: f64, rel: f64, what: &str) {
    assert!(
        (got - want).abs() <= rel * want.abs(),
        "{what}: got {got}, expected {want}"
    );
}

#[test]
fn ohms_law_with_percentages_in_milli_units() {
    // R = V/I with V = 12 V ± 3 % and I = 2 A ± 4 %, given in mV and mA, R in ohm:
    // relative standard uncertainties of a quotient add in quadrature (GUM §5.1.6,
    // closed form): u(R)/R = 5 %, R = 6 Ω, u(R) = 0.3 Ω, U = 0.6 Ω with k = 2.
    let p = problem(
        r#"{"equations": "V = I*R", "knowns": {"V": 12000, "I": 2000},
            "units": {"V": "mV", "I": "mA", "R": "ohm"}, "unknown": "R",
            "uncertainties": {"V": {"percent": 3}, "I": {"percent": 4}}}"#,
    );
    let r = p
        .solve(&options(r#"{"uncertainty": {"trials": 20000}}"#))
        .unwrap();
    assert!(r.converged);
    let u = &r.uncertainty["R"];
    assert_eq!(u.unit.as_deref(), Some("ohm"));
    close(u.value, 6.0, 1e-12, "R");
    close(u.standard, 0.3, 1e-12, "u(R), GUM §5.1.6");
    close(u.expanded, 0.6, 1e-12, "U(R), k = 2");
    assert_eq!(u.coverage_factor, 2.0);
    // The knowns' standard uncertainties in their units: 3 % of 12000 mV, 4 % of 2000
    // mA; sensitivities ∂R/∂V = 1/I = 0.5 Ω/V = 5e-4 Ω/mV, ∂R/∂I = −V/I² = −3e-3 Ω/mA
    // (closed form).
    let [iv, vv] = [&u.contributions[0], &u.contributions[1]];
    assert_eq!((iv.input.as_str(), vv.input.as_str()), ("I", "V"));
    close(vv.standard, 360.0, 1e-12, "u(V) in mV");
    close(iv.standard, 80.0, 1e-12, "u(I) in mA");
    assert_eq!(vv.input_unit.as_deref(), Some("mV"));
    close(vv.sensitivity, 5e-4, 1e-12, "∂R/∂V in Ω/mV");
    close(iv.sensitivity, -3e-3, 1e-12, "∂R/∂I in Ω/mA");
    close(vv.contribution, 0.18, 1e-12, "3 % of 6 Ω");
    close(iv.contribution, 0.24, 1e-12, "4 % of 6 Ω");
    let mc = u.monte_carlo.as_ref().unwrap();
    assert_eq!((mc.trials, mc.failed, mc.seed), (20000, 0, 1));
    assert!(mc.interval[0] < 6.0 && 6.0 < mc.interval[1]);
    // ±1.96·0.3 to within the Monte Carlo's scatter and the quotient's skew.
    close(
        mc.interval[1] - mc.interval[0],
        2.0 * 1.96 * 0.3,
        0.05,
        "95 % width",
    );
    assert!(u.validation.is_some());
}

#[test]
fn jcgm_101_additive_model_through_the_problem() {
    // JCGM 101:2008 §9.2.2: Y = X1 + X2 + X3 + X4, each Gaussian with expectation 0
    // and standard deviation 1: u(y) = 2, the GUM 95 % interval ±3.92 (±1.96·2, K95 =
    // 1.959963984540054 from scipy 1.17.1 stats.norm.ppf(0.975)), the Monte Carlo
    // interval the same, and the GUM validated (as the example reports, recalled from
    // memory).
    let p = problem(
        r#"{"equations": "Y = X1 + X2 + X3 + X4", "knowns": {"X1": 0, "X2": 0, "X3": 0, "X4": 0},
            "unknown": "Y", "uncertainties": {"X1": 1, "X2": 1, "X3": 1, "X4": 1}}"#,
    );
    let r = p
        .solve(&options(
            r#"{"uncertainty": {"trials": 200000, "seed": 2008}}"#,
        ))
        .unwrap();
    let u = &r.uncertainty["Y"];
    assert_eq!(u.standard, 2.0);
    let mc = u.monte_carlo.as_ref().unwrap();
    let half = 2.0 * 1.959963984540054;
    assert!((mc.interval[0] + half).abs() < 0.03, "{:?}", mc.interval);
    assert!((mc.interval[1] - half).abs() < 0.03, "{:?}", mc.interval);
    let v = u.validation.as_ref().unwrap();
    assert_eq!(
        v.tolerance, 0.05,
        "δ for u = 2.0 to two digits, JCGM 101 §7.9.2"
    );
    assert!(v.agrees, "{}", v.message);
    // Rectangular inputs of the same deviation (§9.2.3): the exact 97.5 % point of the
    // sum is 3.879406741347821 (mpmath 1.4.1, findroot on the Irwin–Hall CDF).
    let p = problem(
        r#"{"equations": "Y = X1 + X2 + X3 + X4", "knowns": {"X1": 0, "X2": 0, "X3": 0, "X4": 0},
            "unknown": "Y", "uncertainties": {
              "X1": {"standard": 1, "distribution": "rectangular"},
              "X2": {"standard": 1, "distribution": "rectangular"},
              "X3": {"standard": 1, "distribution": "rectangular"},
              "X4": {"standard": 1, "distribution": "rectangular"}}}"#,
    );
    let r = p
        .solve(&options(
            r#"{"uncertainty": {"trials": 200000, "seed": 2008}}"#,
        ))
        .unwrap();
    let mc = r.uncertainty["Y"].monte_carlo.clone().unwrap();
    assert!((mc.interval[1] - 3.879406741347821).abs() < 0.03, "{mc:?}");
    assert_eq!(
        r.uncertainty["Y"].contributions[0].distribution,
        "rectangular"
    );
}

#[test]
fn colebrook_template_with_roughness_known_to_30_percent() {
    // Colebrook–White, Re = 1e5 ± 2 %, ε = 0.0254 mm ± 30 %, D = 10 in: ε/D = 1e-4, f =
    // 0.018513866077471648 (fluids 1.3.1 friction.Colebrook(1e5, 1e-4), as in
    // tests/templates.rs). With s = 1/√f, A = (ε/D)/3.7 + 2.51 s/Re and F = s + 2
    // log10 A = 0, implicit differentiation by hand gives ∂f/∂p = 2 s⁻³ (∂F/∂p)/(∂F/∂s),
    // ∂F/∂s = 1 + c·2.51/(Re A), c = 2/ln 10 (closed form); ∂F/∂ε is per metre, so
    // ∂f/∂ε in mm is that times 1e-3.
    let p = problem(
        r#"{"template": "pipes.colebrook", "unknown": "f",
            "values": {"Re": 1e5, "eps": [0.0254, "mm"], "D": [10, "in"]},
            "uncertainties": {"Re": {"percent": 2}, "eps": {"percent": 30}}}"#,
    );
    let r = p
        .solve(&options(r#"{"uncertainty": {"trials": 20000}}"#))
        .unwrap();
    assert!(r.converged);
    let u = &r.uncertainty["f"];
    let f = 0.018513866077471648f64;
    close(u.value, f, 1e-12, "fluids 1.3.1 Colebrook");
    let (re, d) = (1e5, 0.254);
    let s = 1.0 / f.sqrt();
    let a = 1e-4 / 3.7 + 2.51 * s / re;
    let c = 2.0 / std::f64::consts::LN_10;
    let df_ds = 1.0 + c * 2.51 / (re * a);
    let d_re = 2.0 * s.powi(-3) * (c * (-2.51 * s / (re * re)) / a) / df_ds;
    let d_eps_m = 2.0 * s.powi(-3) * (c / (3.7 * d) / a) / df_ds;
    let by_name = |n: &str| u.contributions.iter().find(|c| c.input == n).unwrap();
    close(by_name("Re").sensitivity, d_re, 1e-9, "∂f/∂Re, closed form");
    close(
        by_name("eps").sensitivity,
        d_eps_m * 1e-3,
        1e-9,
        "∂f/∂ε per mm, closed form",
    );
    assert_eq!(by_name("eps").input_unit.as_deref(), Some("mm"));
    close(
        by_name("eps").standard,
        0.3 * 0.0254,
        1e-12,
        "30 % of ε in mm",
    );
    let want = ((d_re * 2e3).powi(2) + (d_eps_m * 0.3 * 0.0254e-3).powi(2)).sqrt();
    close(
        u.standard,
        want,
        1e-9,
        "GUM eq. 10 with the closed-form sensitivities",
    );
    let mc = u.monte_carlo.as_ref().unwrap();
    assert_eq!(mc.failed, 0);
    assert!(mc.evaluations > 0);
}

#[test]
fn a_temperature_reading_uncertainty_is_a_difference() {
    // Counterflow exchanger, ε–NTU, Tho in °F, Thi = 90 °C ± 0.5 °C: Tho =
    // 320.438352558393 K (ht 1.2.0 hx.effectiveness_from_NTU, counterflow, as in
    // tests/templates.rs). The heat capacity rates and ε do not depend on the
    // temperatures, so Tho = Thi − εCmin/Ch·(Thi − Tci) and ∂Tho/∂Thi = 1 − εCmin/Ch =
    // 1 − (Thi − Tho)/(Thi − Tci) (closed form), 1.8 °F per °C (NIST SP 811 B.9); a
    // temperature uncertainty converts with no offset.
    let p = problem(
        r#"{"template": "thermal.hx-effectiveness-ntu", "unknown": "Tho", "resultUnit": "°F",
            "values": {"mh": [1.5, "kg/s"], "cph": [4180, "J/(kg*K)"], "mc": [2.5, "kg/s"],
                       "cpc": [2100, "J/(kg*K)"], "U": [650, "W/(m^2*K)"], "A": [18, "m^2"],
                       "Thi": [90, "°C"], "Tci": [20, "°C"]},
            "uncertainties": {"Thi": 0.5}}"#,
    );
    let r = p
        .solve(&options(r#"{"uncertainty": {"trials": 0}}"#))
        .unwrap();
    let u = &r.uncertainty["Tho"];
    let tho = 320.438352558393;
    let slope = 1.0 - (363.15 - tho) / 70.0;
    close(
        u.contributions[0].sensitivity,
        1.8 * slope,
        1e-9,
        "∂Tho/∂Thi in °F/°C",
    );
    close(u.standard, 0.5 * 1.8 * slope, 1e-9, "u(Tho) in °F");
    close(u.value, (tho - 273.15) * 1.8 + 32.0, 1e-10, "Tho in °F");
    assert!(
        u.monte_carlo.is_none() && u.validation.is_none(),
        "trials: 0"
    );
}

#[test]
fn monte_carlo_in_chunks_gives_the_same_answer() {
    // The same seed gives the same trials however the run is chunked; progress is
    // reported and the work bounded.
    let json = r#"{"equations": "x*exp(x) = k", "knowns": {"k": 1}, "unknown": "x",
                   "uncertainties": {"k": {"percent": 10}}}"#;
    let p = problem(json);
    let opts = options(r#"{"uncertainty": {"trials": 5000, "seed": 7}}"#);
    let whole = p.solve(&opts).unwrap().uncertainty["x"].clone();
    let mut run = p.uncertainty(&opts).unwrap();
    assert_eq!((run.done(), run.trials()), (0, 5000));
    assert!(run.report().monte_carlo.is_none(), "not finished");
    // The linear part is there at once: dW/dk = W/(k(1 + W)) at k = 1, W(1) =
    // 0.5671432904097838 (scipy 1.17.1 special.lambertw(1)), closed form.
    let w = 0.5671432904097838;
    close(
        run.report().standard,
        0.1 * w / (1.0 + w),
        1e-14,
        "Lambert W",
    );
    let mut steps = 0;
    while !run.is_done() {
        let done = run.advance(700);
        steps += 1;
        assert_eq!(done, (700 * steps).min(5000));
    }
    assert_eq!(steps, 8);
    assert_eq!(run.report(), whole);
    let mc = whole.monte_carlo.unwrap();
    assert_eq!((mc.trials, mc.seed), (5000, 7));
}

#[test]
fn bad_uncertainties_are_refused_with_the_place() {
    let base = |u: &str| {
        format!(
            r#"{{"equations": "x = a*b", "knowns": {{"a": 2, "b": 3}}, "unknown": "x", "uncertainties": {u}}}"#
        )
    };
    for (u, says) in [
        (r#"{"c": 1}"#, "spec.uncertainties.c"),
        (r#"{"x": 1}"#, "spec.uncertainties.x"),
        (r#"{"a": -1}"#, "spec.uncertainties.a"),
        (r#"{"a": {"standard": 1, "percent": 2}}"#, "exactly one"),
        (r#"{"a": {}}"#, "exactly one"),
        (
            r#"{"a": {"percent": 5, "distribution": "triangular"}}"#,
            "distribution",
        ),
        (r#"{"a": "5%"}"#, "spec.uncertainties"),
    ] {
        let e = compile_error(&base(u));
        assert!(e.message.contains(says), "{u}: {}", e.message);
    }
    let p = problem(&base(r#"{"a": 0.1}"#));
    for (o, says) in [
        (
            r#"{"uncertainty": {"trials": 2000000}}"#,
            "options.uncertainty.trials",
        ),
        (
            r#"{"uncertainty": {"trials": 1.5}}"#,
            "options.uncertainty.trials",
        ),
        (
            r#"{"uncertainty": {"coverageFactor": 0}}"#,
            "coverageFactor",
        ),
        (r#"{"uncertainty": {"seed": -1}}"#, "seed"),
    ] {
        let e = p.solve(&options(o)).unwrap_err();
        assert!(e.message.contains(says), "{o}: {}", e.message);
    }
    // A template with auxiliary unknowns is refused with the reason.
    let e = compile_error(
        r#"{"template": "structures.beam-frequency-cantilever", "unknown": "fn",
            "useScenarioDefaults": true, "uncertainties": {"L": 0.01}}"#,
    );
    assert_eq!(e.code, "needs-one-equation", "{}", e.message);
    // Without uncertainties a solve carries none, and the chunked run says why not.
    let p = problem(r#"{"equations": "x = a*b", "knowns": {"a": 2, "b": 3}, "unknown": "x"}"#);
    let r = p.solve(&SolveOptions::default()).unwrap();
    assert!(r.uncertainty.is_empty());
    let e = p.uncertainty(&SolveOptions::default()).err().unwrap();
    assert_eq!(e.code, "no-uncertainties");
}

#[test]
fn the_monte_carlo_histogram_counts_every_value_in_the_unknowns_unit() {
    // JCGM 101:2008 §9.2.2's additive model (four Gaussian inputs, u = 1 each): Y is
    // Gaussian with standard deviation 2. The histogram spans the 0.5 % to 99.5 %
    // quantiles, ±2.576·2 = ±5.15 for a Gaussian (standard normal quantile, common
    // practice, no source), and every trial is counted once; all in mm.
    let p = problem(
        r#"{"equations": "Y = X1 + X2 + X3 + X4", "knowns": {"X1": 0, "X2": 0, "X3": 0, "X4": 0},
            "units": {"Y": "mm", "X1": "mm", "X2": "mm", "X3": "mm", "X4": "mm"}, "unknown": "Y",
            "uncertainties": {"X1": 1, "X2": 1, "X3": 1, "X4": 1}}"#,
    );
    let r = p
        .solve(&options(r#"{"uncertainty": {"trials": 50000, "seed": 7}}"#))
        .unwrap();
    let mc = r.uncertainty["Y"]
        .monte_carlo
        .as_ref()
        .expect("a Monte Carlo result");
    let h = &mc.histogram;
    assert_eq!(h.counts.len(), 40);
    assert_eq!(
        h.counts.iter().sum::<usize>() + h.below + h.above,
        mc.trials - mc.failed
    );
    close(h.lo, -5.15, 0.05, "0.5 % quantile (mm)");
    close(h.hi, 5.15, 0.05, "99.5 % quantile (mm)");
    // Symmetric and peaked in the middle.
    let mid = h.counts[19] + h.counts[20];
    assert!(mid > 4 * (h.counts[0] + h.counts[39]), "{:?}", h.counts);
}
