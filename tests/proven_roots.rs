//! Proven roots in a range (`proven_roots`): regions covering the range, each unique
//! (with an enclosure that must hold the reference root), none, or undecided with a
//! reason; against closed forms, published values and reference libraries named beside
//! each check, and beside the sampling scan (`roots_in_range`).

use tacit::equations::EquationSet;
use tacit::proven_roots::{
    proven_roots, proven_roots_of_set, FromClosures, ProofOptions, ProvenRoots, RegionKind,
    Undecided,
};
use tacit::roots_in_range::{roots_in_range, ScanOptions};
use tacit::templates;

/// Proves the roots of `text` (one unknown `x` unless `unknown` says otherwise).
fn prove(text: &str, knowns: &[(&str, f64)], unknown: &str, lo: f64, hi: f64) -> ProvenRoots {
    let set = EquationSet::parse(text).unwrap();
    let knowns: Vec<(String, f64)> = knowns.iter().map(|&(n, v)| (n.to_string(), v)).collect();
    let r = proven_roots_of_set(&set, &knowns, unknown, lo, hi, &ProofOptions::default()).unwrap();
    covers(&r, lo, hi);
    r
}

/// The regions cover [lo, hi] in order, without gaps, and each unique region's
/// enclosure lies in it and holds its root.
fn covers(r: &ProvenRoots, lo: f64, hi: f64) {
    assert_eq!(r.regions.first().unwrap().lo, lo);
    assert_eq!(r.regions.last().unwrap().hi, hi);
    for w in r.regions.windows(2) {
        assert_eq!(w[0].hi, w[1].lo, "contiguous: {:?}", r.regions);
    }
    for g in r.roots() {
        let e = g.enclosure.unwrap();
        assert!(g.lo <= e.lo && e.hi <= g.hi, "{g:?}");
        assert!(e.contains(g.root.unwrap()), "{g:?}");
    }
    for g in &r.regions {
        assert_eq!(g.kind == RegionKind::Undecided, g.why.is_some(), "{g:?}");
        assert_eq!(g.kind == RegionKind::Unique, g.root.is_some(), "{g:?}");
    }
}

/// The proven roots' enclosures hold the expected roots, one each, in order; each
/// enclosure is at most `width` wide (relative to max(1, |root|)).
fn check(source: &str, r: &ProvenRoots, expected: &[f64], width: f64) {
    let roots: Vec<_> = r.roots().collect();
    assert_eq!(
        roots.len(),
        expected.len(),
        "{source}: proven {:?}",
        r.regions
    );
    for (g, &want) in roots.iter().zip(expected) {
        let e = g.enclosure.unwrap();
        assert!(e.contains(want), "{source}: {want} not in {e:?}");
        assert!(
            e.width() <= width * want.abs().max(1.0),
            "{source}: enclosure {e:?} wider than {width}"
        );
    }
}

fn scan(text: &str, knowns: &[(&str, f64)], unknown: &str, lo: f64, hi: f64) -> Vec<f64> {
    let set = EquationSet::parse(text).unwrap();
    let knowns: Vec<(String, f64)> = knowns.iter().map(|&(n, v)| (n.to_string(), v)).collect();
    let mut f = set.residual_fn(&knowns, unknown).unwrap();
    let r = roots_in_range(lo, hi, &ScanOptions::default(), &mut f).unwrap();
    r.roots.iter().map(|g| g.x).collect()
}

#[test]
fn wilkinson_polynomial_product_and_expanded() {
    // (x−1)(x−2)…(x−10): roots 1 to 10 in closed form (J. H. Wilkinson, Rounding Errors
    // in Algebraic Processes, 1963; recalled from memory).
    let product: Vec<String> = (1..=10).map(|k| format!("(x - {k})")).collect();
    let r = prove(&product.join("*"), &[], "x", 0.5, 10.5);
    let expected: Vec<f64> = (1..=10).map(f64::from).collect();
    check("Wilkinson product", &r, &expected, 1e-13);
    assert_eq!(r.undecided().count(), 0);
    // (x−1)…(x−7) with its coefficients written out (expanded by hand, each one
    // checked by the roots): the dependency problem makes enclosures wide, bisection
    // still separates every root.
    let text = "x^7 - 28*x^6 + 322*x^5 - 1960*x^4 + 6769*x^3 - 13132*x^2 + 13068*x - 5040";
    let r = prove(text, &[], "x", 0.5, 7.5);
    let expected: Vec<f64> = (1..=7).map(f64::from).collect();
    check("Wilkinson degree 7 expanded", &r, &expected, 1e-9);
}

#[test]
fn two_close_roots_are_separated() {
    // (x − 1)(x − 1 − 1e-7): roots 1 and 1 + 1e-7 (closed form).
    let text = "(x - 1)*(x - 1 - 1e-7)";
    let r = prove(text, &[], "x", 0.0, 2.0);
    check("close roots", &r, &[1.0, 1.0 + 1e-7], 4e-15);
    assert_eq!(r.undecided().count(), 0, "{:?}", r.regions);
}

#[test]
fn two_roots_within_one_sample_spacing_the_scan_misses_are_proven() {
    // A narrow dip: 1 − 2·exp(−((x − c)/w)²) with c = 1.0013, w = 1e-3 has its two
    // roots at c ± w·√(ln 2) (closed form), 1.67e-3 apart, inside one spacing (5.0e-3)
    // of the default scan, whose samples all lie near 1: it reports no root at all.
    let (c, w) = (1.0013, 1e-3);
    let text = "1 - 2*exp(-((x - c)/w)^2)";
    let knowns = [("c", c), ("w", w)];
    let scanned = scan(text, &knowns, "x", 0.0, 2.0);
    assert!(scanned.is_empty(), "the scan found {scanned:?}");
    let r = prove(text, &knowns, "x", 0.0, 2.0);
    let half = w * std::f64::consts::LN_2.sqrt();
    check("narrow dip", &r, &[c - half, c + half], 4e-15);
    assert_eq!(r.undecided().count(), 0, "{:?}", r.regions);
}

#[test]
fn a_multiple_root_is_undecided_never_a_root() {
    // (x − 1)²(x − 3): a double root at 1 and a simple one at 3 (closed form).
    let r = prove("(x - 1)^2*(x - 3)", &[], "x", 0.0, 4.0);
    check("double root", &r, &[3.0], 1e-13);
    let und: Vec<_> = r.undecided().collect();
    assert_eq!(und.len(), 1, "{:?}", r.regions);
    assert!(und[0].lo <= 1.0 && 1.0 <= und[0].hi);
    assert_eq!(und[0].why, Some(Undecided::FlatOrMultiple));
    assert!(und[0].hi - und[0].lo < 1e-6);
}

#[test]
fn poles_are_undecided_and_never_roots() {
    // tan x on [−1, 10]: roots kπ for k = 0..3, poles at π/2 + kπ for k = 0..2
    // (closed form).
    use std::f64::consts::PI;
    let r = prove("tan(x)", &[], "x", -1.0, 10.0);
    check("tan", &r, &[0.0, PI, 2.0 * PI, 3.0 * PI], 1e-13);
    let poles: Vec<_> = r.undecided().collect();
    assert_eq!(poles.len(), 3, "{:?}", r.regions);
    for (g, k) in poles.iter().zip(0..) {
        let pole = PI / 2.0 + k as f64 * PI;
        assert!(g.lo <= pole && pole <= g.hi, "{g:?}");
        assert_eq!(g.why, Some(Undecided::Pole));
    }
    // The scan agrees on the roots.
    let scanned = scan("tan(x)", &[], "x", -1.0, 10.0);
    assert_eq!(scanned.len(), 4, "{scanned:?}");
    // 1/(x − a): no root, a pole at a.
    let r = prove("1/(x - a)", &[("a", 2.0)], "x", 0.0, 4.0);
    assert_eq!(r.roots().count(), 0);
    let und: Vec<_> = r.undecided().collect();
    assert_eq!(und.len(), 1);
    assert!(und[0].lo <= 2.0 && 2.0 <= und[0].hi && und[0].why == Some(Undecided::Pole));
}

#[test]
fn a_jump_through_zero_is_not_a_root() {
    // when(x − 1, 1, −1) changes sign at 1 without a root (closed form): the proof says
    // it may jump there; it reports no root.
    let r = prove("when(x - 1, 1, -1)", &[], "x", 0.0, 2.0);
    assert_eq!(r.roots().count(), 0, "{:?}", r.regions);
    let und: Vec<_> = r.undecided().collect();
    assert_eq!(und.len(), 1);
    assert_eq!(und[0].why, Some(Undecided::Jump));
    // Where f is undefined there is no root either: sqrt(x) − 1 on [−1, 4] has its one
    // root at 1 (closed form).
    let r = prove("sqrt(x) - 1", &[], "x", -1.0, 4.0);
    check("sqrt", &r, &[1.0], 1e-15);
    assert_eq!(r.undecided().count(), 0, "{:?}", r.regions);
}

/// A catalogue template's equations with knowns in SI units.
fn template(id: &str) -> String {
    templates::find(id).unwrap().equations.clone()
}

#[test]
fn colebrook_friction_factor() {
    // fluids 1.3.1 friction.Colebrook(1e5, 1e-4) = 0.018513866077471648 (as in
    // tests/templates.rs).
    let knowns = [("Re", 1e5), ("eps", 1e-4), ("D", 1.0)];
    let r = prove(&template("pipes.colebrook"), &knowns, "f", 0.005, 0.1);
    check("Colebrook", &r, &[0.018513866077471648], 1e-13);
    assert_eq!(r.undecided().count(), 0);
}

#[test]
fn water_wave_dispersion() {
    // T = 10 s, h = 10 m: L = 92.35581694832746 m (scipy 1.17.1 optimize.brentq on the
    // dispersion relation, as in tests/templates.rs), the one root for L > 0.
    let knowns = [("T", 10.0), ("h", 10.0)];
    let r = prove(
        &template("coastal.wave-dispersion"),
        &knowns,
        "L",
        1.0,
        1000.0,
    );
    check("dispersion", &r, &[92.35581694832746], 1e-11);
    assert_eq!(r.undecided().count(), 0);
}

#[test]
fn area_mach_subsonic_and_supersonic_branches() {
    // A/A* = 1.6875, γ = 1.4: M = 2 (NACA Report 1135, Table I) and the subsonic
    // 0.37224448620275025 (scipy 1.17.1 optimize.brentq on NACA 1135 eq. 80, as in
    // tests/templates.rs).
    let knowns = [("AR", 1.6875), ("g", 1.4)];
    let r = prove(&template("gas.area-mach"), &knowns, "M", 0.05, 5.0);
    check("area-Mach", &r, &[0.37224448620275025, 2.0], 1e-4);
    let roots: Vec<f64> = r.roots().map(|g| g.root.unwrap()).collect();
    assert!((roots[0] - 0.37224448620275025).abs() < 1e-12, "{roots:?}");
    // Table I gives A/A* = 1.6875 to four places at M = 2: the root lies within the
    // table's rounding of 2.
    assert!((roots[1] - 2.0).abs() < 1e-3, "{roots:?}");
    assert_eq!(r.undecided().count(), 0);
}

#[test]
fn peng_robinson_liquid_and_vapour_branches() {
    // n-butane at 350 K and 9.4573 bar (Smith, Van Ness & Abbott, 7th ed., Example
    // 3.9), Tc = 425.1 K, Pc = 37.96 bar, ω = 0.200. thermo 0.6.1 eos.PR: V_l =
    // 1.1259793001103241e-4, V_g = 2.4865292629750522e-3 m³/mol (as in
    // tests/templates.rs); the middle root is the unstable one.
    let knowns = [
        ("T", 350.0),
        ("P", 9.4573e5),
        ("Tc", 425.1),
        ("Pc", 37.96e5),
        ("w", 0.200),
    ];
    // From below the covolume b ≈ 7.24e-5 m³/mol, where P has a pole.
    let r = prove(&template("thermo.peng-robinson"), &knowns, "V", 5e-5, 1e-2);
    let roots: Vec<f64> = r.roots().map(|g| g.root.unwrap()).collect();
    assert_eq!(roots.len(), 3, "{:?}", r.regions);
    assert!(
        (roots[0] - 1.1259793001103241e-4).abs() < 1e-9 * 1.126e-4,
        "{roots:?}"
    );
    assert!(
        (roots[2] - 2.4865292629750522e-3).abs() < 1e-9 * 2.487e-3,
        "{roots:?}"
    );
    assert!(roots[0] < roots[1] && roots[1] < roots[2]);
    let pole: Vec<_> = r.undecided().collect();
    assert_eq!(pole.len(), 1, "{:?}", r.regions);
    assert_eq!(pole[0].why, Some(Undecided::Pole));
}

#[test]
fn closures_work_as_well_as_equation_texts() {
    // x³ − 2 through three closures: the real root 2^(1/3) (closed form).
    use tacit::equations::{Dual, Expression, Interval};
    let p = Expression::parse("x^3 - 2")
        .unwrap()
        .compile(&["x"])
        .unwrap();
    let mut f = FromClosures {
        value: |x: f64| p.eval(&[x]),
        interval: |x: Interval| p.eval_interval(&[x]),
        slope: |x: Interval| {
            let mut stack = vec![Dual::fixed(Interval::point(0.0)); p.stack_size()];
            p.run(&[Dual::variable(x)], &mut stack)
        },
    };
    let r = proven_roots(-5.0, 5.0, &ProofOptions::default(), &mut f).unwrap();
    covers(&r, -5.0, 5.0);
    check("cube root", &r, &[2f64.cbrt()], 4e-15);
}

#[test]
fn the_budget_ends_the_search_honestly() {
    let opts = ProofOptions {
        max_regions: 5,
        ..ProofOptions::default()
    };
    let set = EquationSet::parse("sin(10*x)").unwrap();
    let r = proven_roots_of_set(&set, &[], "x", 0.1, 10.0, &opts).unwrap();
    covers(&r, 0.1, 10.0);
    assert_eq!(r.regions_examined, 5);
    let last = r.regions.last().unwrap();
    assert_eq!(last.why, Some(Undecided::Budget));
    // Bad options are errors that name the value.
    let bad = ProofOptions {
        max_regions: 0,
        ..ProofOptions::default()
    };
    let e = proven_roots_of_set(&set, &[], "x", 0.0, 1.0, &bad).unwrap_err();
    assert!(e.message.contains("max_regions"), "{}", e.message);
    let e = proven_roots_of_set(&set, &[], "x", 1.0, 0.0, &ProofOptions::default()).unwrap_err();
    assert_eq!(e.code, "bad-range");
}
