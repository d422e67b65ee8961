//! Proven roots through the Problem (`Problem::roots` with `proven: true`): regions
//! covering the whole range in the caller's unit, roots only where proven, against
//! closed forms and the reference values named beside each check; and beside the
//! sampling scan on the same problem.

use tacit::problem::spec::from_json;
use tacit::problem::{Problem, ProblemSpec, RootsOptions, RootsReport};

fn problem(json: &str) -> Problem {
    let spec: ProblemSpec = from_json("spec", json).expect("a valid spec");
    Problem::compile(&spec).expect("compiles")
}

fn proven() -> RootsOptions {
    RootsOptions {
        proven: true,
        ..RootsOptions::default()
    }
}

/// Proves the roots in [lo, hi] and checks the regions' shape: they cover the range
/// exactly, in order and without gaps; every unique region has a root inside its
/// enclosure and is listed in `roots`; only unique regions are.
fn prove(p: &Problem, lo: f64, hi: f64) -> RootsReport {
    let r = p.roots(lo, hi, &proven()).unwrap();
    assert!(r.proven);
    assert_eq!(r.regions.first().unwrap().lo, lo);
    assert_eq!(r.regions.last().unwrap().hi, hi);
    for w in r.regions.windows(2) {
        assert_eq!(w[0].hi, w[1].lo, "contiguous: {:?}", r.regions);
        assert!(w[0].lo <= w[0].hi);
    }
    let unique: Vec<_> = r.regions.iter().filter(|g| g.kind == "unique").collect();
    assert_eq!(unique.len(), r.roots.len());
    for (g, root) in unique.iter().zip(&r.roots) {
        let [a, b] = g.enclosure.unwrap();
        assert!(a <= g.root.unwrap() && g.root.unwrap() <= b, "{g:?}");
        assert_eq!(root.x, g.root.unwrap());
        assert!(root.converged && root.kind == "proven");
        let cert = root.certificate.as_ref().unwrap();
        assert_eq!(cert.kind, "interval-newton");
        assert_eq!(cert.bracket, Some([a, b]));
    }
    for g in &r.regions {
        assert_eq!(g.kind == "undecided", g.why.is_some(), "{g:?}");
        assert_eq!(g.kind == "unique", g.root.is_some(), "{g:?}");
    }
    r
}

/// The enclosures of the unique roots hold `expected`, one each, in order.
fn holds(source: &str, r: &RootsReport, expected: &[f64]) {
    assert_eq!(r.roots.len(), expected.len(), "{source}: {:?}", r.regions);
    for (root, &want) in r.roots.iter().zip(expected) {
        let [a, b] = root.certificate.as_ref().unwrap().bracket.unwrap();
        assert!(a <= want && want <= b, "{source}: {want} not in [{a}, {b}]");
    }
}

fn undecided(r: &RootsReport) -> Vec<&tacit::problem::report::RegionReport> {
    r.regions.iter().filter(|g| g.kind == "undecided").collect()
}

#[test]
fn a_polynomial_with_close_and_multiple_roots() {
    // (x − 1)(x − 1 − 1e-7)(x − 3)²(x + 2): simple roots −2, 1 and 1 + 1e-7, a double
    // root at 3 (closed form). The double root is undecided, never a root.
    let p = problem(
        r#"{"equations": "(x - 1)*(x - 1 - 1e-7)*(x - 3)^2*(x + 2) = 0", "knowns": {}, "unknown": "x"}"#,
    );
    let r = prove(&p, -5.0, 5.0);
    holds("closed form", &r, &[-2.0, 1.0, 1.0 + 1e-7]);
    for g in &r.roots {
        let [a, b] = g.certificate.as_ref().unwrap().bracket.unwrap();
        assert!(b - a < 1e-13, "enclosure [{a}, {b}] narrow");
    }
    let und = undecided(&r);
    assert_eq!(und.len(), 1, "{:?}", r.regions);
    assert!(und[0].lo <= 3.0 && 3.0 <= und[0].hi);
    assert_eq!(und[0].why, Some("multiple-or-flat"));
    // The sampling scan of the same problem gives roots, not regions.
    let scan = p.roots(-5.0, 5.0, &RootsOptions::default()).unwrap();
    assert!(!scan.proven && scan.regions.is_empty() && scan.proof.is_none());
}

#[test]
fn a_narrow_dip_the_scan_misses_is_proven() {
    // 1 − 2·exp(−((x − c)/w)²), c = 1.0013, w = 1e-3: two roots c ± w·√(ln 2) (closed
    // form), 1.67e-3 apart, inside one spacing of the 400-sample scan, which finds none.
    let p = problem(
        r#"{"equations": "1 - 2*exp(-((x - c)/w)^2) = 0", "knowns": {"c": 1.0013, "w": 1e-3}, "unknown": "x"}"#,
    );
    let scan = p.roots(0.0, 2.0, &RootsOptions::default()).unwrap();
    assert!(scan.roots.is_empty(), "the scan found {:?}", scan.roots);
    let r = prove(&p, 0.0, 2.0);
    let half = 1e-3 * std::f64::consts::LN_2.sqrt();
    holds("closed form", &r, &[1.0013 - half, 1.0013 + half]);
    assert!(undecided(&r).is_empty());
    assert!(r.limits.starts_with("every root in the range is proven"));
    let cost = r.proof.as_ref().unwrap();
    assert_eq!(
        r.evaluations,
        cost.regions_examined + cost.narrowing_slopes + cost.point_enclosures + cost.point_values
    );
}

#[test]
fn colebrook_with_the_pipe_in_inches() {
    // Re = 1e5, ε/D = 1e-4 with D = 10 in and ε = 0.0254 mm: f = 0.018513866077471648
    // (fluids 1.3.1 friction.Colebrook(1e5, 1e-4), as in tests/templates.rs).
    let p = problem(
        r#"{"template": "pipes.colebrook", "unknown": "f",
            "values": {"Re": 1e5, "eps": [0.0254, "mm"], "D": [10, "in"]}}"#,
    );
    let r = prove(&p, 0.005, 0.1);
    holds("fluids 1.3.1 Colebrook", &r, &[0.018513866077471648]);
    assert!(undecided(&r).is_empty(), "{:?}", r.regions);
}

#[test]
fn dispersion_with_the_range_in_feet() {
    // T = 10 s, h = 10 m: L = 92.35581694832746 m (scipy 1.17.1 optimize.brentq on the
    // dispersion relation, as in tests/templates.rs) = 303.0046487806 ft (÷ 0.3048,
    // the international foot, NIST SP 811 B.9). The range and the regions are in ft.
    let p = problem(
        r#"{"template": "coastal.wave-dispersion", "unknown": "L", "resultUnit": "ft",
            "values": {"T": 10, "h": 10}}"#,
    );
    let r = prove(&p, 3.0, 3000.0);
    assert_eq!(r.unit.as_deref(), Some("ft"));
    holds("scipy brentq, in ft", &r, &[92.35581694832746 / 0.3048]);
    let [a, b] = r.roots[0].certificate.as_ref().unwrap().bracket.unwrap();
    assert!(b - a < 1e-10 * 303.0, "[{a}, {b}]");
    assert!(undecided(&r).is_empty(), "{:?}", r.regions);
}

#[test]
fn area_mach_both_branches_with_their_labels() {
    // A/A* = 1.6875, γ = 1.4: the supersonic M = 2 (NACA Report 1135, Table I, to the
    // table's four places) and the subsonic 0.37224448620275025 (scipy 1.17.1
    // optimize.brentq on NACA 1135 eq. 80, as in tests/templates.rs).
    let p = problem(
        r#"{"template": "gas.area-mach", "unknown": "M", "values": {"AR": 1.6875, "g": 1.4}}"#,
    );
    let r = prove(&p, 0.05, 5.0);
    assert_eq!(r.roots.len(), 2, "{:?}", r.regions);
    holds("scipy brentq", &r, &[0.37224448620275025, r.roots[1].x]);
    assert!((r.roots[1].x - 2.0).abs() < 1e-3, "NACA 1135 Table I");
    assert_eq!(r.roots[0].label.as_deref(), Some("subsonic"));
    assert_eq!(r.roots[1].label.as_deref(), Some("supersonic"));
    assert!(undecided(&r).is_empty(), "{:?}", r.regions);
}

#[test]
fn peng_robinson_three_roots_and_the_pole_in_cm3_per_mol() {
    // n-butane at 350 K and 9.4573 bar (Smith, Van Ness & Abbott, 7th ed., Example
    // 3.9), Tc = 425.1 K, Pc = 37.96 bar, ω = 0.200: thermo 0.6.1 eos.PR gives V_l =
    // 1.1259793001103241e-4 and V_g = 2.4865292629750522e-3 m³/mol (as in
    // tests/templates.rs), 112.59793001103241 and 2486.5292629750522 cm³/mol; the
    // middle root is the unstable one. Below the covolume (about 72.4 cm³/mol) P has a
    // pole: undecided, never a root.
    let p = problem(
        r#"{"template": "thermo.peng-robinson", "unknown": "V", "resultUnit": "cm^3/mol",
            "values": {"T": 350, "P": [9.4573, "bar"], "Tc": 425.1, "Pc": [37.96, "bar"], "w": 0.2}}"#,
    );
    let r = prove(&p, 50.0, 10000.0);
    assert_eq!(r.roots.len(), 3, "{:?}", r.regions);
    let close = |got: f64, want: f64| (got - want).abs() < 1e-9 * want;
    assert!(
        close(r.roots[0].x, 1.1259793001103241e-4 * 1e6),
        "{:?}",
        r.roots
    );
    assert!(
        close(r.roots[2].x, 2.4865292629750522e-3 * 1e6),
        "{:?}",
        r.roots
    );
    let und = undecided(&r);
    assert_eq!(und.len(), 1, "{:?}", r.regions);
    assert_eq!(und[0].why, Some("pole"));
    assert!(und[0].hi < r.roots[0].x);
}

#[test]
fn a_temperature_range_in_fahrenheit_converts_with_its_offset() {
    // Counterflow exchanger, ε–NTU: Tho = 320.438352558393 K (ht 1.2.0
    // hx.effectiveness_from_NTU, counterflow, as in tests/templates.rs) =
    // 117.11903460510740 °F ((K − 273.15)·1.8 + 32, NIST SP 811 B.9). The range
    // 68 °F to 194 °F is 20 °C to 90 °C, the inlet temperatures.
    let p = problem(
        r#"{"template": "thermal.hx-effectiveness-ntu", "unknown": "Tho", "resultUnit": "°F",
            "values": {"mh": [1.5, "kg/s"], "cph": [4180, "J/(kg*K)"], "mc": [2.5, "kg/s"],
                       "cpc": [2100, "J/(kg*K)"], "U": [650, "W/(m^2*K)"], "A": [18, "m^2"],
                       "Thi": [90, "°C"], "Tci": [20, "°C"]}}"#,
    );
    let r = prove(&p, 68.0, 194.0);
    let want = (320.438352558393 - 273.15) * 1.8 + 32.0;
    assert_eq!(r.roots.len(), 1, "{:?}", r.regions);
    assert!(
        (r.roots[0].x - want).abs() < 1e-9,
        "{} vs {want}",
        r.roots[0].x
    );
    let [a, b] = r.roots[0].certificate.as_ref().unwrap().bracket.unwrap();
    assert!(a - 1e-9 <= want && want <= b + 1e-9, "[{a}, {b}]");
}

#[test]
fn poles_of_tan_are_undecided() {
    // tan x on [−1, 10]: roots kπ for k = 0..3, poles at π/2 + kπ, k = 0..2 (closed
    // form).
    use std::f64::consts::PI;
    let p = problem(r#"{"equations": "tan(x) = 0", "knowns": {}, "unknown": "x"}"#);
    let r = prove(&p, -1.0, 10.0);
    holds("closed form", &r, &[0.0, PI, 2.0 * PI, 3.0 * PI]);
    let und = undecided(&r);
    assert_eq!(und.len(), 3, "{:?}", r.regions);
    for (g, k) in und.iter().zip(0..) {
        let pole = PI / 2.0 + k as f64 * PI;
        assert!(
            g.lo <= pole && pole <= g.hi && g.why == Some("pole"),
            "{g:?}"
        );
        assert!(g.explanation.unwrap().contains("pole"));
    }
}

#[test]
fn units_of_own_equations_convert_the_range() {
    // x² = a with x in mm and a = 2 m²: x = √2 m = 1414.2135623730951 mm (closed
    // form), and −1414.2… mm.
    let p = problem(
        r#"{"equations": "x^2 = a", "knowns": {"a": [2, "m^2"]}, "unknown": "x", "units": {"x": "mm"}}"#,
    );
    let r = prove(&p, -2000.0, 2000.0);
    let s = 2f64.sqrt() * 1000.0;
    holds("closed form", &r, &[-s, s]);
    assert_eq!(r.unit.as_deref(), Some("mm"));
}

#[test]
fn the_budget_and_bad_options_are_honest() {
    let p = problem(r#"{"equations": "sin(10*x) = 0", "knowns": {}, "unknown": "x"}"#);
    let mut opts = proven();
    opts.max_regions = Some(5.0);
    // sin(10x) = 0 at kπ/10, k = 1..31 in [0.1, 10] (closed form).
    let r = prove(&p, 0.1, 10.0);
    let expected: Vec<f64> = (1..=31)
        .map(|k| k as f64 * std::f64::consts::PI / 10.0)
        .collect();
    holds("closed form", &r, &expected);
    let r = p.roots(0.1, 10.0, &opts).unwrap();
    assert_eq!(r.proof.as_ref().unwrap().regions_examined, 5);
    assert_eq!(r.regions.last().unwrap().why, Some("budget"));
    assert_eq!(r.regions.last().unwrap().hi, 10.0);
    assert!(r.limits.contains("undecided"));
    opts.max_regions = Some(0.0);
    let e = p.roots(0.1, 10.0, &opts).unwrap_err();
    assert!(e.message.contains("options.maxRegions"), "{}", e.message);
    opts.max_regions = None;
    opts.samples = Some(100.0);
    let e = p.roots(0.1, 10.0, &opts).unwrap_err();
    assert!(e.message.contains("options.samples"), "{}", e.message);
    let e = p
        .roots(
            0.1,
            10.0,
            &RootsOptions {
                max_regions: Some(10.0),
                ..RootsOptions::default()
            },
        )
        .unwrap_err();
    assert!(e.message.contains("proven"), "{}", e.message);
    // A request read from JSON names the new fields.
    let o: RootsOptions = from_json("options", r#"{"proven": true, "maxRegions": 100}"#).unwrap();
    assert!(o.proven && o.max_regions == Some(100.0));
}

#[test]
fn a_template_with_auxiliary_unknowns_is_refused_with_the_reason() {
    let p = problem(
        r#"{"template": "structures.beam-frequency-cantilever", "unknown": "fn",
            "useScenarioDefaults": true}"#,
    );
    let e = p.roots(1.0, 100.0, &proven()).unwrap_err();
    assert_eq!(e.code, "needs-one-equation", "{}", e.message);
    assert!(e.message.contains("auxiliary"), "{}", e.message);
}
