//! Templates of one's own: the exchange file, its checks, and solving one.

use tacit::problem::{Problem, SolveOptions};

fn close(got: f64, want: f64, rel: f64) {
    assert!(
        (got - want).abs() <= rel * want.abs(),
        "got {got}, want {want}"
    );
}
use tacit::templates::own::{read_file, write_file, OwnTemplate, OwnVariable, FORMAT, VERSION};

/// A firm's own relation in US units (the demo scenario's pump main): Darcy–Weisbach
/// head loss with the flow written through the mean velocity.
fn head_loss() -> OwnTemplate {
    let var = |name: &str, meaning: &str, unit: Option<&str>, value: Option<f64>| OwnVariable {
        name: name.into(),
        meaning: meaning.into(),
        unit: unit.map(Into::into),
        value,
        bounds: None,
        guesses: None,
    };
    let mut q = var("Q", "flow", Some("gpm"), None);
    q.bounds = Some((Some(0.0), None));
    q.guesses = Some((100.0, 500.0));
    OwnTemplate {
        id: "my.head-loss".into(),
        title: "Head loss in the pump main".into(),
        description: "Darcy–Weisbach, friction factor given".into(),
        equations: "# head loss\nh = f*L/D*v^2/(2*g)\nv := Q/(pi*D^2/4)".into(),
        variables: vec![
            var("h", "head loss", Some("ft"), Some(12.0)),
            var("f", "friction factor", Some("1"), Some(0.02)),
            var("L", "length", Some("ft"), Some(1500.0)),
            var("D", "inside diameter", Some("in"), Some(8.0)),
            var("g", "gravity", Some("ft/s^2"), Some(32.174)),
            q,
        ],
        unknown: Some("Q".into()),
        validity: "turbulent flow, full pipe".into(),
        source: "Darcy–Weisbach (textbook form)".into(),
    }
}

#[test]
fn an_own_template_solves_in_its_units() {
    let t = head_loss();
    t.check("template").unwrap();
    let spec = t.problem_spec("Q").unwrap();
    let p = Problem::compile(&spec).unwrap();
    let r = p.solve(&SolveOptions::default()).unwrap();
    assert!(r.converged, "{r:?}");
    // Closed form: v = sqrt(2 g h D / (f L)), Q = v·πD²/4; factors from NIST SP 811
    // Appendix B (1 ft = 0.3048 m, 1 in = 0.0254 m, 1 gal = 3.785411784e-3 m³).
    let (ft, inch, gal): (f64, f64, f64) = (0.3048, 0.0254, 3.785411784e-3);
    let (h, l, d, g, f) = (12.0 * ft, 1500.0 * ft, 8.0 * inch, 32.174 * ft, 0.02);
    let v = (2.0 * g * h * d / (f * l)).sqrt();
    let q_gpm = v * std::f64::consts::PI * d * d / 4.0 / gal * 60.0;
    let root = r.root.unwrap();
    close(root, q_gpm, 1e-9);
}

#[test]
fn a_file_round_trips() {
    let text = write_file(&[head_loss()]).unwrap();
    assert!(text.contains(&format!("\"format\": \"{FORMAT}\"")));
    assert!(text.contains(&format!("\"version\": {VERSION}")));
    let back = read_file(&text).unwrap();
    assert_eq!(back, vec![head_loss()]);
}

fn file_with(edit: impl FnOnce(&mut serde_json::Value)) -> String {
    let mut v: serde_json::Value =
        serde_json::from_str(&write_file(&[head_loss()]).unwrap()).unwrap();
    edit(&mut v);
    v.to_string()
}

fn refused(text: &str) -> tacit::error::InputError {
    match read_file(text) {
        Ok(t) => panic!("accepted: {t:?}"),
        Err(e) => e,
    }
}

#[test]
fn bad_files_are_refused_naming_the_place() {
    let e = refused(&file_with(|v| v["format"] = "something-else".into()));
    assert!(e.message.starts_with("format:"), "{}", e.message);

    let e = refused(&file_with(|v| v["version"] = 2.into()));
    assert!(e.message.contains("newer"), "{}", e.message);

    let e = refused(&file_with(|v| {
        v["templates"][0]["variables"][1]["colour"] = "red".into()
    }));
    assert!(
        e.message.contains("templates[0].variables[1]"),
        "{}",
        e.message
    );
    assert!(e.message.contains("colour"), "{}", e.message);

    let e = refused(&file_with(|v| {
        v["templates"][0]["variables"][3]["unit"] = "furlongs".into()
    }));
    assert!(
        e.message.contains("templates[0].variables[3].unit"),
        "{}",
        e.message
    );

    let e = refused(&file_with(|v| {
        v["templates"][0]["variables"][2]["unit"] = "gpm".into()
    }));
    assert_eq!(e.code, "dimension-mismatch", "{}", e.message);
    assert!(
        e.message.starts_with("templates[0].equations"),
        "{}",
        e.message
    );
    assert!(e.position.is_some());

    let e = refused(&file_with(|v| {
        v["templates"][0]["equations"] = "h = f*L/D*v^2/(2*g".into()
    }));
    assert!(
        e.message.starts_with("templates[0].equations"),
        "{}",
        e.message
    );

    let e = refused(&file_with(|v| {
        v["templates"][0]["id"] = "pipes.colebrook".into()
    }));
    assert!(e.message.contains("bundled"), "{}", e.message);

    let e = refused(&file_with(|v| v["templates"][0]["id"] = "my pump".into()));
    assert!(e.message.starts_with("templates[0].id"), "{}", e.message);

    let e = refused(&file_with(|v| {
        let vars = v["templates"][0]["variables"].as_array_mut().unwrap();
        vars.remove(1);
    }));
    assert!(e.message.contains("lists no entry for f"), "{}", e.message);

    let e = refused(&file_with(|v| {
        v["templates"][0]["variables"][5]["guesses"] = serde_json::json!([-5, 10])
    }));
    assert!(
        e.message.starts_with("templates[0].variables[5].guesses"),
        "{}",
        e.message
    );

    let e = refused(&file_with(|v| {
        let t = v["templates"][0].clone();
        v["templates"].as_array_mut().unwrap().push(t);
    }));
    assert!(
        e.message.contains("templates[1].id") && e.message.contains("twice"),
        "{}",
        e.message
    );

    let e = refused("{\"format\": \"tacit-own-templates\"");
    assert_eq!(e.code, "bad-request");
}

#[test]
fn missing_saved_values_are_named_not_filled() {
    let mut t = head_loss();
    t.variables[1].value = None;
    t.variables[3].value = None;
    let e = t.problem_spec("Q").unwrap_err();
    assert_eq!(e.code, "missing-value");
    assert!(e.message.contains("f, D"), "{}", e.message);
    // Any variable can be the unknown: D from the others (Q now saved).
    let mut t = head_loss();
    t.variables[5].value = Some(1000.0);
    t.variables[3].value = None;
    t.variables[3].guesses = Some((6.0, 10.0));
    let p = Problem::compile(&t.problem_spec("D").unwrap()).unwrap();
    let r = p.solve(&SolveOptions::default()).unwrap();
    assert!(r.converged);
    // Back-substitution into the first test's closed form (algebra, no source needed):
    // D⁵ = 8 f L Q² / (π² g h), in SI, then to inches (NIST SP 811 factors).
    let (ft, inch, gal): (f64, f64, f64) = (0.3048, 0.0254, 3.785411784e-3);
    let q = 1000.0 * gal / 60.0;
    let d5 =
        8.0 * 0.02 * 1500.0 * ft * q * q / (std::f64::consts::PI.powi(2) * 32.174 * ft * 12.0 * ft);
    close(r.root.unwrap(), d5.powf(0.2) / inch, 1e-9);
}
