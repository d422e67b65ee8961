//! One compiled Problem: every number in the caller's units, no silent defaults, typed
//! requests whose errors name the place.

use tacit::problem::spec::from_json;
use tacit::problem::{Problem, ProblemSpec, RootsOptions, SolveOptions, SweepSpec};

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

fn close(a: f64, b: f64, rel: f64) -> bool {
    (a - b).abs() <= rel * b.abs().max(1e-300)
}

#[test]
fn a_template_reports_every_x_in_the_result_unit() {
    // Peng–Robinson for propane (Tc = 369.83 K, Pc = 42.48 bar, ω = 0.152, the demo
    // scenario's values) at 300 K and 9 bar, molar volume asked in cm³/mol: the root,
    // the unknowns, the bracket, the history and the other roots in cm³/mol, the SI
    // value only under rootSi (the mixed-unit report of the Problem issue).
    let p = problem(
        r#"{"template": "thermo.peng-robinson", "unknown": "V", "resultUnit": "cm^3/mol",
            "values": {"T": 300, "P": [9, "bar"], "Tc": 369.83, "Pc": 42.48, "w": 0.152}}"#,
    );
    let r = p
        .solve(&SolveOptions {
            history: true,
            ..SolveOptions::default()
        })
        .unwrap();
    assert!(r.converged, "{r:?}");
    let v = r.root.unwrap();
    assert_eq!(r.unit.as_deref(), Some("cm^3/mol"));
    assert_eq!(r.unknowns["V"], v, "unknowns in the same unit as root");
    assert!(
        close(r.root_si.unwrap(), v * 1e-6, 1e-12),
        "rootSi in m³/mol"
    );
    // Ideal gas RT/P = 8.314462618·300/9e5 m³/mol = 2771 cm³/mol (CODATA 2018 R); the
    // vapour-like root of a real gas lies below it.
    assert!(v > 2000.0 && v < 2771.5, "{v}");
    let last = r.history.last().unwrap();
    assert!(
        close(last.x, v, 1e-6),
        "history in cm³/mol: {} vs {v}",
        last.x
    );
    if let Some([lo, hi]) = r.bracket {
        assert!(lo <= v && v <= hi, "bracket in cm³/mol");
    }
    let c = r.certificate.as_ref().unwrap();
    if let Some([lo, hi]) = c.bracket {
        assert!(
            lo <= v * (1.0 + 1e-9) && v * (1.0 - 1e-9) <= hi,
            "certificate in cm³/mol: {c:?}"
        );
    }
    for o in &r.other_roots {
        assert!(
            o.value > 10.0 && o.value < 3000.0,
            "other roots in cm³/mol: {o:?}"
        );
        assert!(o.label.is_some());
    }
}

#[test]
fn a_missing_known_is_an_error_naming_every_one() {
    // solveTemplate({id: "pipes.colebrook", values: {Re: 1e5}, unknown: "f"}) used a
    // roughness and diameter nobody gave (the Problem issue).
    let e =
        compile_error(r#"{"template": "pipes.colebrook", "values": {"Re": 1e5}, "unknown": "f"}"#);
    assert_eq!(e.code, "missing-value");
    assert!(
        e.message.contains("eps") && e.message.contains("D"),
        "{}",
        e.message
    );
    // The demo scenario stays available to those who ask for it.
    let p = problem(
        r#"{"template": "pipes.colebrook", "values": {"Re": 1e5}, "unknown": "f", "useScenarioDefaults": true}"#,
    );
    assert!(p.solve(&SolveOptions::default()).unwrap().converged);
}

#[test]
fn a_value_given_for_the_unknown_is_its_first_guess_and_says_so() {
    let p = problem(
        r#"{"template": "pipes.colebrook", "unknown": "f",
            "values": {"f": 0.02, "Re": 360000, "eps": [0.15, "mm"], "D": [300, "mm"]}}"#,
    );
    let r = p.solve(&SolveOptions::default()).unwrap();
    assert!(r.converged);
    assert!(
        r.notes.iter().any(|n| n.contains("first guess")),
        "{:?}",
        r.notes
    );
    // Colebrook (1939), evaluated here at the answer.
    let f = r.root.unwrap();
    let res = 1.0 / f.sqrt() + 2.0 * (0.15e-3 / (3.7 * 0.3) + 2.51 / (360000.0 * f.sqrt())).log10();
    assert!(res.abs() < 1e-9, "{res}");
}

#[test]
fn own_equations_in_their_units_everywhere() {
    // Darcy–Weisbach solved for the velocity in ft/s with the head in ft, the length in
    // ft, the diameter in inches (common practice, no source: h = f L v²/(2 g D)).
    let p = problem(
        r#"{"equations": "h = f*L*v^2/(2*g*D)",
            "knowns": {"h": [10, "ft"], "f": 0.02, "L": [1000, "ft"], "g": [9.80665, "m/s^2"], "D": [6, "in"]},
            "unknowns": [{"name": "v", "guesses": [1, 20], "unit": "ft/s"}]}"#,
    );
    let r = p
        .solve(&SolveOptions {
            history: true,
            ..SolveOptions::default()
        })
        .unwrap();
    assert!(r.converged);
    let v = r.root.unwrap();
    let (h, l, d, g): (f64, f64, f64, f64) =
        (10.0 * 0.3048, 1000.0 * 0.3048, 6.0 * 0.0254, 9.80665);
    let v_si = (h * 2.0 * g * d / (0.02 * l)).sqrt();
    assert!(close(v, v_si / 0.3048, 1e-10), "{v} ft/s");
    assert_eq!(r.unit.as_deref(), Some("ft/s"));
    assert!(close(r.root_si.unwrap(), v_si, 1e-10));
    assert!(close(r.history.last().unwrap().x, v, 1e-6));
    let c = r.certificate.unwrap();
    if let Some([lo, hi]) = c.bracket {
        assert!(
            lo <= v * (1.0 + 1e-9) && v * (1.0 - 1e-9) <= hi,
            "{lo} {hi} {v}"
        );
    }
    // The residual, a sample and the roots of the same compiled problem, in ft/s.
    assert!(p.residual(v).unwrap().abs() < 1e-9);
    let s = p.sample(1.0, 20.0, 5).unwrap();
    assert_eq!(s.x, vec![1.0, 5.75, 10.5, 15.25, 20.0]);
    let roots = p.roots(0.1, 30.0, &RootsOptions::default()).unwrap();
    assert_eq!(roots.roots.len(), 1);
    assert!(close(roots.roots[0].x, v, 1e-9), "{:?}", roots.roots);
}

#[test]
fn template_roots_come_with_their_branch_labels() {
    // Area–Mach relation at A/A* = 2, γ = 1.4: M = 0.3059 subsonic and 2.197 supersonic
    // (NACA Report 1135, 1953, isentropic table; recalled from memory to 4 digits).
    let p =
        problem(r#"{"template": "gas.area-mach", "unknown": "M", "values": {"AR": 2, "g": 1.4}}"#);
    let r = p.roots(1e-3, 10.0, &RootsOptions::default()).unwrap();
    let found: Vec<(f64, Option<&str>)> = r
        .roots
        .iter()
        .filter(|r| r.converged)
        .map(|r| (r.x, r.label.as_deref()))
        .collect();
    assert_eq!(found.len(), 2, "{found:?}");
    assert!(
        (found[0].0 - 0.3059).abs() < 5e-4 && found[0].1 == Some("subsonic"),
        "{found:?}"
    );
    assert!(
        (found[1].0 - 2.197).abs() < 5e-4 && found[1].1 == Some("supersonic"),
        "{found:?}"
    );
}

#[test]
fn a_sweep_runs_in_chunks_on_the_compiled_problem() {
    // x² = a for a from 1 to 4: x = √a (closed form).
    let p = problem(
        r#"{"equations": "x^2 = a", "knowns": {"a": 1}, "unknowns": [{"name": "x", "guesses": [1, 2], "bounds": [0, null]}]}"#,
    );
    let mut s = p
        .sweep(&SweepSpec {
            input: "a".into(),
            from: 1.0,
            to: 4.0,
            points: 31.0,
            spacing: None,
            method: None,
            tolerances: None,
            guesses: None,
        })
        .unwrap();
    let mut chunks = 0;
    while !s.is_done() {
        s.advance(7).unwrap();
        chunks += 1;
    }
    assert_eq!(chunks, 5);
    let r = s.report();
    assert_eq!(r.input.len(), 31);
    for (a, x) in r.input.iter().zip(&r.root) {
        assert!(close(*x, a.sqrt(), 1e-12), "{a}: {x}");
    }
    assert!(r.converged.iter().all(|&c| c));
}

#[test]
fn requests_are_typed_and_errors_name_the_place() {
    let e = compile_error(r#"{"equations": "x = 1", "tolerance": 3}"#);
    assert_eq!(e.code, "bad-request");
    assert!(e.message.contains("tolerance"), "{}", e.message);
    let e = compile_error(r#"{"equations": "x^2 = a", "knowns": {"a": "two"}}"#);
    assert!(e.message.contains("spec.knowns.a"), "{}", e.message);
    // A name stays a name: "NaN" and "Infinity" as names are not numbers (the Problem
    // issue: the JSON decoder turned these strings into numbers even where they were
    // names).
    let p = problem(r#"{"equations": "y = Infinity*x", "knowns": {"Infinity": 2, "y": 6}}"#);
    let r = p.solve(&SolveOptions::default()).unwrap();
    assert_eq!(r.unknown.as_deref(), Some("x"));
    assert!(close(r.root.unwrap(), 3.0, 1e-12));
    let e = compile_error(r#"{"equations": 5}"#);
    assert!(e.message.contains("spec.equations"), "{}", e.message);
    let e = compile_error(r#"{"template": "pipes.colebrook", "equations": "x = 1"}"#);
    assert!(e.message.contains("not both"), "{}", e.message);
}

#[test]
fn a_template_sweep_takes_its_input_in_the_unit_it_was_given_in() {
    // Colebrook with D given in inches, swept in inches: the same friction factor as a
    // solve at the last diameter given in mm (1 in = 25.4 mm exactly, NIST SP 811 B.8).
    let p = problem(
        r#"{"template": "pipes.colebrook", "unknown": "f",
            "values": {"Re": 360000, "eps": [0.15, "mm"], "D": [12, "in"]}}"#,
    );
    let mut s = p
        .sweep(&SweepSpec {
            input: "D".into(),
            from: 6.0,
            to: 12.0,
            points: 4.0,
            spacing: None,
            method: None,
            tolerances: None,
            guesses: None,
        })
        .unwrap();
    let r = s.advance(10).unwrap().clone();
    assert_eq!(r.input_unit.as_deref(), Some("in"));
    assert_eq!(r.input, vec![6.0, 8.0, 10.0, 12.0]);
    let at_end = problem(
        r#"{"template": "pipes.colebrook", "unknown": "f",
            "values": {"Re": 360000, "eps": [0.15, "mm"], "D": [304.8, "mm"]}}"#,
    )
    .solve(&SolveOptions::default())
    .unwrap();
    assert!(close(r.root[3], at_end.root.unwrap(), 1e-10), "{r:?}");
}

#[test]
fn a_templates_outputs_come_in_the_units_asked_for() {
    // Hazen–Williams with US inputs: the mean velocity V = 4Q/(πD²) asked in ft/s
    // (closed form; 1 ft = 0.3048 m, 1 in = 0.0254 m, 1 gal = 3.785411784 L, NIST SP
    // 811 Appendix B).
    let spec = r#"{"template": "pipes.hazen-williams", "unknown": "hf", "resultUnit": "ft",
        "values": {"L": [1500, "ft"], "Q": [600, "gpm"], "C": 120, "D": [8, "in"]},
        "outputUnits": {"V": "ft/s"}}"#;
    let r = problem(spec).solve(&SolveOptions::default()).unwrap();
    assert!(r.converged);
    let v = r.outputs.iter().find(|o| o.symbol == "V").unwrap();
    assert_eq!(v.unit, "ft/s");
    let q = 600.0 * 3.785411784e-3 / 60.0;
    let d = 8.0 * 0.0254;
    let want = 4.0 * q / (std::f64::consts::PI * d * d) / 0.3048;
    assert!(close(v.value, want, 1e-12), "{} vs {want}", v.value);
    // Without it, the template's display unit.
    let plain = spec.replace(r#""outputUnits": {"V": "ft/s"}"#, r#""outputUnits": {}"#);
    let r = problem(&plain).solve(&SolveOptions::default()).unwrap();
    let v = r.outputs.iter().find(|o| o.symbol == "V").unwrap();
    assert_eq!(v.unit, "m/s");
    // A unit of another dimension, or a symbol the template does not show, is refused.
    let e = compile_error(&spec.replace("ft/s", "gpm"));
    assert!(e.message.contains("spec.outputUnits.V"), "{}", e.message);
    let e = compile_error(&spec.replace(r#""V": "ft/s""#, r#""Z": "ft/s""#));
    assert!(e.message.contains("spec.outputUnits.Z"), "{}", e.message);
}

#[test]
fn a_scans_limits_are_worded_in_the_unknowns_unit() {
    // x in mm scanned from 0 to 400 mm at 400 samples: the range and the spacing (400/399
    // mm, arithmetic) are written in mm, not in SI metres.
    let p = problem(
        r#"{"equations": "x^2 = a", "knowns": {"a": 0.01}, "units": {"x": "mm", "a": "m^2"}, "unknown": "x"}"#,
    );
    let r = p.roots(0.0, 400.0, &RootsOptions::default()).unwrap();
    assert!(
        r.limits
            .starts_with("Scanned 0 to 400 mm at 400 evenly spaced samples, 1.00251 mm apart."),
        "{}",
        r.limits
    );
    assert!((r.roots[0].x - 100.0).abs() < 1e-9);
}
