//! The templates at the edges of their range: the cases where cancellation, a pole in
//! the unknown, a 0/0 limit, a bound or a scan range narrower than the inputs allow,
//! or the default start, used to give a wrong answer or none. Each check names its
//! source; the 50-digit and library values come from tests/reference/edge_values.py
//! (mpmath 1.4.1, scipy 1.17.1, fluids 1.3.1, ht 1.2.0, thermo 0.6.1,
//! numpy-financial 1.0.0).

use tacit::templates::{solve_template, TemplateRequest, TemplateSolution};

fn request(id: &str, unknown: &str, values: &[(&str, f64, &str)]) -> TemplateRequest {
    let mut req = TemplateRequest::new(id, unknown);
    req.values = values
        .iter()
        .map(|(s, v, u)| (s.to_string(), *v, u.to_string()))
        .collect();
    req
}

fn solve(id: &str, unknown: &str, values: &[(&str, f64, &str)]) -> TemplateSolution {
    match solve_template(&request(id, unknown, values)) {
        Ok(s) => s,
        Err(e) => panic!("{id} for {unknown}: {}", e.message),
    }
}

/// Converged, and within `rel` of `want`.
fn check(what: &str, s: &TemplateSolution, want: f64, rel: f64, source: &str) {
    assert!(
        s.solution.converged,
        "{what}: not converged ({}); notes {:?}; source: {source}",
        s.solution.status.code(),
        s.notes
    );
    let err = (s.value - want).abs() / want.abs();
    assert!(
        err <= rel,
        "{what}: got {}, reference {want} (relative error {err:e} > {rel:e}); source: {source}",
        s.value
    );
}

fn output(s: &TemplateSolution, symbol: &str) -> f64 {
    s.outputs
        .iter()
        .find(|o| o.symbol == symbol)
        .unwrap_or_else(|| panic!("no output {symbol} in {:?}", s.outputs))
        .value
}

fn other(s: &TemplateSolution, label: &str) -> f64 {
    s.other_roots
        .iter()
        .find(|o| o.label.as_deref() == Some(label))
        .unwrap_or_else(|| {
            panic!(
                "no {label} root in {:?}; notes {:?}",
                s.other_roots, s.notes
            )
        })
        .value
}

const MPMATH: &str = "mpmath 1.4.1 findroot, 50 digits (edge_values.py)";

#[test]
fn catenary_at_low_tension_from_the_default_start() {
    // Span 50 m, sag 2 m, 20 N/m: H about 3.1 kN, below the 7 kN under which every
    // cable used to fail from the typical guesses (f is -inf at the first of them).
    // The rest are cables from a footbridge stay to a long service span.
    for (span, sag, w, h) in [
        (50.0, 2.0, 20.0, 3131.644052193656),
        (50.0, 0.5, 20.0, 12501.66631124988),
        (120.0, 6.0, 15.0, 4514.920771679809),
        (300.0, 30.0, 50.0, 18994.865405998324),
        (8.0, 0.2, 400.0, 16013.315598811723),
        (30.0, 1.2, 5.0, 469.74660782904846),
    ] {
        let s = solve(
            "mechanics.catenary-span-sag",
            "H",
            &[("S", span, "m"), ("s", sag, "m"), ("w", w, "N/m")],
        );
        check(
            &format!("H for span {span} m, sag {sag} m, {w} N/m"),
            &s,
            h / 1000.0,
            1e-11,
            MPMATH,
        );
    }
    let s = solve(
        "mechanics.catenary-span-length",
        "H",
        &[("S", 50.0, "m"), ("Lc", 51.0, "m"), ("w", 20.0, "N/m")],
    );
    check("H from length", &s, 1.447685864091836, 1e-11, MPMATH);
}

#[test]
fn taut_catenary_keeps_its_digits() {
    // wS/2H about 7e-5: cosh(x) - 1 keeps about 8 digits there; 2 sinh²(x/2) keeps
    // them all.
    let s = solve(
        "mechanics.catenary-span-sag",
        "H",
        &[("S", 30.0, "m"), ("s", 0.0005, "m"), ("w", 50.0, "N/m")],
    );
    check("taut H", &s, 11250000.004166666 / 1000.0, 1e-12, MPMATH);
    let s = solve(
        "mechanics.catenary-span-sag",
        "s",
        &[("S", 30.0, "m"), ("H", 11250.0, "kN"), ("w", 50.0, "N/m")],
    );
    check("taut sag", &s, 0.0005000000001851852, 1e-12, MPMATH);
}

#[test]
fn plane_wall_initial_temperature_has_no_pole() {
    // The trust issue's case: Tinf = 10 degC, T = 0 degC, the scenario wall; the answer
    // is near -53 degC (it was "converged" at 10 degC, the pole of (T - Tinf)/(Ti - Tinf)).
    // One-term solution of Incropera et al. (6th ed.) eq. 5.40, eigenvalue in 50 digits.
    for (t, ti) in [
        (0.0, -53.15071664765748),
        (7.0, -8.945214994297244),
        (9.9, 9.368492833523424),
    ] {
        let s = solve(
            "thermal.plane-wall-transient",
            "Ti",
            &[("Tinf", 10.0, "°C"), ("T", t, "°C")],
        );
        check(&format!("Ti for T = {t} degC"), &s, ti, 1e-10, MPMATH);
    }
}

#[test]
fn plane_wall_eigenvalue_at_large_biot_numbers() {
    // Bi = 1e9: zeta1 = pi/2 - 1.57e-9, beyond the old bound 1.5707963.
    let s = solve(
        "thermal.plane-wall-transient",
        "T",
        &[
            ("h", 1e6, "W/(m^2*K)"),
            ("L", 100.0, "m"),
            ("k", 0.1, "W/(m*K)"),
            ("alpha", 1.0, "mm^2/s"),
            ("t", 1.0, "h"),
            ("x", 0.0, "m"),
        ],
    );
    check("T at Bi = 1e9", &s, 67.29572861930404, 1e-12, MPMATH);
    let u = output(&s, "u");
    assert!(
        (u - 1.5707963252241002e-09).abs() <= 1e-12 * 1.6e-9,
        "pi/2 - zeta1 = {u}; {MPMATH}"
    );
    let c1 = output(&s, "C1");
    assert!(
        (c1 - 1.2732395447351628).abs() <= 1e-14,
        "C1 = {c1}; {MPMATH}"
    );
}

#[test]
fn plane_wall_position_outside_the_wall_is_refused() {
    // x is measured from the midplane, so x <= L (Incropera section 5.5; the geometry).
    let e = solve_template(&request(
        "thermal.plane-wall-transient",
        "T",
        &[("x", 150.0, "mm"), ("L", 100.0, "mm")],
    ))
    .unwrap_err();
    assert_eq!(e.code, "outside-validity");
    assert!(e.message.contains("outside the wall"), "{}", e.message);
}

#[test]
fn wavelength_of_long_waves() {
    // A 20-minute tsunami in 4 km of water, and a semidiurnal tide: beyond the old cap
    // of 100 km on L.
    for (period, depth, want) in [
        (1200.0, 4000.0, 237225.44092779484),
        (44640.0, 4000.0, 8841255.36198977),
    ] {
        let s = solve(
            "coastal.wave-dispersion",
            "L",
            &[("T", period, "s"), ("h", depth, "m")],
        );
        check(&format!("L for T = {period} s"), &s, want, 1e-12, MPMATH);
    }
}

#[test]
fn balanced_heat_exchanger() {
    // Cr = 1 exactly: effectiveness NTU/(1 + NTU) (ht 1.2.0
    // hx.effectiveness_from_NTU(NTU, 1, 'counterflow')); the LMTD template, whose
    // log-mean difference is 0/0 there, gives the same outlet.
    let balanced = [
        ("mh", 2.0, "kg/s"),
        ("cph", 4.19, "kJ/(kg*K)"),
        ("mc", 2.0, "kg/s"),
        ("cpc", 4.19, "kJ/(kg*K)"),
        ("U", 900.0, "W/(m^2*K)"),
        ("A", 25.0, "m^2"),
        ("Thi", 80.0, "°C"),
        ("Tci", 15.0, "°C"),
    ];
    let ht = "ht 1.2.0 hx.effectiveness_from_NTU, Cr = 1";
    for id in ["thermal.hx-effectiveness-ntu", "thermal.hx-lmtd"] {
        let s = solve(id, "Tho", &balanced);
        check(id, &s, 32.63924870466321, 1e-12, ht);
    }
    let s = solve("thermal.hx-effectiveness-ntu", "Tho", &balanced);
    let eff = output(&s, "eff");
    assert!((eff - 0.7286269430051814).abs() < 1e-14, "eff {eff}; {ht}");
    // Solved for the area at Cr = 1, from the explicit NTU relation as the starter.
    let mut v: Vec<_> = balanced.iter().filter(|x| x.0 != "A").copied().collect();
    v.push(("Tho", 32.63924870466321, "°C"));
    let s = solve("thermal.hx-effectiveness-ntu", "A", &v);
    check("A at Cr = 1", &s, 25.0, 1e-10, ht);
    // Just off Cr = 1: the plain formula loses about six digits there.
    let mut v = balanced.to_vec();
    v[3] = ("cpc", 4.19 * (1.0 + 1e-10), "kJ/(kg*K)");
    let s = solve("thermal.hx-effectiveness-ntu", "Tho", &v);
    check("Tho at Cr = 1 - 1e-10", &s, 32.6392487029378, 1e-13, MPMATH);
}

#[test]
fn area_mach_at_large_ratios_keeps_both_branches() {
    // NACA Report 1135 eq. 80 at A/A* = 1e6: the subsonic root lies below the old scan
    // start of 1e-4, and at gamma = 1.7 the supersonic one above the old bound of 100.
    for (g, sub, sup) in [
        (1.4, 5.7870370370382e-07, 46.375184066314944),
        (1.7, 5.605857035754634e-07, 313.127219481979),
    ] {
        let s = solve("gas.area-mach", "M", &[("AR", 1e6, "1"), ("g", g, "1")]);
        check(&format!("supersonic M, gamma {g}"), &s, sup, 1e-11, MPMATH);
        assert_eq!(s.branch.as_deref(), Some("supersonic"));
        let m = other(&s, "subsonic");
        assert!(
            (m - sub).abs() <= 1e-11 * sub,
            "subsonic {m}, want {sub}; {MPMATH}"
        );
    }
}

#[test]
fn branches_are_labelled_and_chosen() {
    // A/A* = 1.6875 at M = 2 (NACA 1135 Table I, recalled from memory) and its
    // subsonic root 0.37224448620275025 (scipy 1.17.1 brentq, library_values.py).
    let s = solve("gas.area-mach", "M", &[("AR", 1.6875, "1")]);
    assert_eq!(s.branch.as_deref(), Some("supersonic"), "the default");
    assert!(s
        .notes
        .iter()
        .any(|n| n.contains("supersonic root is given by default")));
    let mut req = request("gas.area-mach", "M", &[("AR", 1.6875, "1")]);
    req.branch = Some("subsonic".into());
    let s = solve_template(&req).unwrap();
    check(
        "subsonic M on request",
        &s,
        0.37224448620275025,
        1e-10,
        "scipy 1.17.1 brentq",
    );
    assert_eq!(s.branch.as_deref(), Some("subsonic"));
    assert!((other(&s, "supersonic") - 2.0).abs() < 1e-10);
    // Fanno: subsonic by default (Anderson, Modern Compressible Flow, Table A.4:
    // 4fL*/D = 0.3050 at M = 2; the subsonic root by scipy brentq, library_values.py).
    let s = solve("gas.fanno", "M", &[("fLD", 0.3050, "1")]);
    check(
        "Fanno subsonic",
        &s,
        0.6572566640901881,
        1e-10,
        "scipy 1.17.1 brentq",
    );
    assert_eq!(s.branch.as_deref(), Some("subsonic"));
    let mut req = request("gas.fanno", "M", &[("fLD", 0.3050, "1")]);
    req.branch = Some("supersonic".into());
    let s = solve_template(&req).unwrap();
    assert!((s.value - 2.0).abs() < 1e-3, "{}", s.value);
    // Peng–Robinson: vapour-like by default, liquid-like on request (thermo 0.6.1 eos.PR,
    // n-butane at 350 K and 9.4573 bar, library_values.py).
    let state = [
        ("T", 350.0, "K"),
        ("P", 9.4573, "bar"),
        ("Tc", 425.1, "K"),
        ("Pc", 37.96, "bar"),
        ("w", 0.200, "1"),
    ];
    let mut req = request("thermo.peng-robinson", "V", &state);
    req.result_unit = Some("m^3/mol".into());
    let s = solve_template(&req).unwrap();
    check(
        "vapour-like V",
        &s,
        2.4865292629750522e-3,
        1e-9,
        "thermo 0.6.1 eos.PR V_g",
    );
    assert_eq!(s.branch.as_deref(), Some("vapour-like"));
    assert!((other(&s, "liquid-like") - 1.1259793001103241e-4).abs() < 1e-9 * 1.2e-4);
    other(&s, "unstable middle root");
    req.branch = Some("liquid-like".into());
    let s = solve_template(&req).unwrap();
    check(
        "liquid-like V",
        &s,
        1.1259793001103241e-4,
        1e-9,
        "thermo 0.6.1 eos.PR V_l",
    );
    // A branch the template does not have, and one with no root for these values.
    req.branch = Some("plasma".into());
    let e = solve_template(&req).unwrap_err();
    assert_eq!(e.code, "unknown-branch");
    assert!(e.message.contains("liquid-like") && e.message.contains("vapour-like"));
    let mut req = request("gas.area-mach", "M", &[("AR", 1.6875, "1")]);
    req.branch = Some("vapour-like".into());
    assert_eq!(solve_template(&req).unwrap_err().code, "unknown-branch");
    let mut req = request("pipes.colebrook", "f", &[]);
    req.branch = Some("subsonic".into());
    assert_eq!(solve_template(&req).unwrap_err().code, "no-branches");
    // The default branch of every labelled template is one of its labels, with a
    // reason: checked by check_catalogue (tests/templates.rs, catalogue_is_sound).
}

#[test]
fn peng_robinson_at_high_pressure() {
    // n-butane at 350 K and 3000 bar: Z = 8.2, so the one root lies beyond the old scan
    // end 3RT/P (thermo 0.6.1 eos.PR V_l).
    let mut req = request(
        "thermo.peng-robinson",
        "V",
        &[
            ("T", 350.0, "K"),
            ("P", 3000.0, "bar"),
            ("Tc", 425.1, "K"),
            ("Pc", 37.96, "bar"),
            ("w", 0.200, "1"),
        ],
    );
    req.result_unit = Some("m^3/mol".into());
    let s = solve_template(&req).unwrap();
    check(
        "V at 3000 bar",
        &s,
        7.910861188679029e-05,
        1e-9,
        "thermo 0.6.1 eos.PR V_l",
    );
    assert_eq!(s.branch.as_deref(), Some("single root"), "{:?}", s.notes);
}

#[test]
fn fanno_at_its_special_values() {
    // fL*/D = 0: the inlet is choked, M = 1 (Shapiro vol. 1 ch. 6; the definition of L*).
    let s = solve("gas.fanno", "M", &[("fLD", 0.0, "1")]);
    check("M at fL*/D = 0", &s, 1.0, 1e-15, "the definition of L*");
    // A very long duct: fL*/D = 1e10 (beyond the old bound of 1e8 and scan start 1e-4).
    let s = solve("gas.fanno", "M", &[("fLD", 1e10, "1"), ("g", 1.4, "1")]);
    check(
        "M at fL*/D = 1e10",
        &s,
        8.451542538587321e-06,
        1e-10,
        MPMATH,
    );
}

#[test]
fn prandtl_meyer_beyond_the_air_limit() {
    // With gamma = 1.1 the largest turning angle is 322.4 deg, so 200 deg has a Mach
    // number; the old bound of 130.45 deg was the limit for gamma = 1.4 only.
    let s = solve(
        "gas.prandtl-meyer",
        "M",
        &[("nu", 200.0, "°"), ("g", 1.1, "1")],
    );
    check("M for nu = 200 deg", &s, 8.614956226305477, 1e-11, MPMATH);
    assert!(
        s.notes.iter().all(|n| !n.contains("outside the range")),
        "{:?}",
        s.notes
    );
    // Beyond the largest angle there is no Mach number, and the notes say why.
    let s = solve(
        "gas.prandtl-meyer",
        "M",
        &[("nu", 330.0, "°"), ("g", 1.1, "1")],
    );
    assert!(!s.solution.converged);
    assert!(
        s.notes.iter().any(|n| n.contains("largest turning angle")),
        "{:?}",
        s.notes
    );
}

#[test]
fn loan_at_very_small_rates() {
    // A = P r/(1 - (1 + r)^-N) in 50 digits; at 1e-12 per period the plain form has
    // about four digits left. numpy-financial 1.0.0 pmt(1e-9, 360, -1e6) =
    // 2777.778049371228 is itself 8e-8 off here.
    for (r, want) in [
        (1e-12, 2777.777778279167),
        (1e-9, 2777.778279166697),
        (1e-6, 2778.27919666642),
    ] {
        let s = solve(
            "finance.loan-payment",
            "A",
            &[
                ("r", r * 100.0, "%"),
                ("N", 360.0, "1"),
                ("P", 1e6, "currency"),
            ],
        );
        check(&format!("A at r = {r}"), &s, want, 1e-12, MPMATH);
    }
    // The limit at zero: P/N.
    let s = solve(
        "finance.loan-payment",
        "A",
        &[("r", 0.0, "%"), ("N", 360.0, "1"), ("P", 1e6, "currency")],
    );
    check("A at r = 0", &s, 1e6 / 360.0, 1e-15, "the limit P/N");
    // And back: the rate from a payment a hair above P/N.
    let s = solve(
        "finance.loan-payment",
        "r",
        &[
            ("A", 2777.778279166697, "currency"),
            ("N", 360.0, "1"),
            ("P", 1e6, "currency"),
        ],
    );
    check("r from A", &s, 1e-9 * 100.0, 1e-6, MPMATH);
}

#[test]
fn irr_beyond_the_old_scan() {
    // numpy-financial 1.0.0 irr([-1, 8]) = 7.0 and irr([-100, 3]) = -0.97: outside the
    // old scan from -95 % to 500 %.
    for (flows, want) in [(vec![-1.0, 8.0], 700.0), (vec![-100.0, 3.0], -97.0)] {
        let values: Vec<(&str, f64, &str)> = flows.iter().map(|&c| ("c", c, "currency")).collect();
        let s = solve("finance.irr", "r", &values);
        check("irr", &s, want, 1e-10, "numpy-financial 1.0.0 irr");
        assert!(
            s.notes.iter().any(|n| n.starts_with("Roots of r")),
            "{:?}",
            s.notes
        );
    }
    // 1 - 10x + 16x^2 = (1 - 2x)(1 - 8x) with x = 1/(1 + r): rates of 100 % and 700 %
    // (algebra); both are reported and the answer is flagged as ambiguous.
    let values: Vec<(&str, f64, &str)> = [1.0, -10.0, 16.0]
        .iter()
        .map(|&c| ("c", c, "currency"))
        .collect();
    let s = solve("finance.irr", "r", &values);
    let mut all: Vec<f64> = s.other_roots.iter().map(|o| o.value).collect();
    all.push(s.value);
    all.sort_by(f64::total_cmp);
    assert_eq!(all.len(), 2, "{all:?} {:?}", s.notes);
    assert!(
        (all[0] - 100.0).abs() < 1e-8 && (all[1] - 700.0).abs() < 1e-8,
        "{all:?}"
    );
}

#[test]
fn colebrook_diameter_from_a_starter() {
    // A case the typical guesses missed (stuck at a bound): fluids 1.3.1
    // friction.Colebrook inverted by scipy 1.17.1 brentq (edge_values.py).
    let s = solve(
        "pipes.colebrook",
        "D",
        &[
            ("f", 1.305586e-2, "1"),
            ("Re", 5.221790e5, "1"),
            ("eps", 6.937779e-5, "mm"),
        ],
    );
    check(
        "D",
        &s,
        1292.8800253454293,
        1e-9,
        "fluids 1.3.1 Colebrook + scipy brentq",
    );
}

#[test]
fn serghides_starter_matches_its_published_form() {
    // The starting point shown beside the answer is Serghides (1984), as in fluids 1.3.1
    // friction.Serghides_1.
    for (re, ed, want) in [
        (1e5, 1e-4, 0.01851358983180063),
        (4000.0, 0.05, 0.07698683333829207),
    ] {
        let s = solve(
            "pipes.colebrook",
            "f",
            &[("Re", re, "1"), ("eps", ed, "m"), ("D", 1.0, "m")],
        );
        let start = output(&s, "f_start");
        assert!(
            (start - want).abs() <= 1e-13 * want,
            "Serghides {start}, fluids {want}"
        );
        assert!(s
            .notes
            .iter()
            .any(|n| n.starts_with("Started from Serghides (1984)")));
    }
}

#[test]
fn manning_circular_at_a_very_shallow_depth() {
    // y = 1e-5 m in a 20 m culvert, 5e-7 of the diameter: below the old scan start of
    // 1e-6 D, inside the limits. Manning with the segment geometry in 50 digits (Chow,
    // Open-Channel Hydraulics, Table 2-1).
    let s = solve(
        "channels.manning-circular",
        "y",
        &[
            ("Q", 5.9036569137854266e-09, "m^3/s"),
            ("D", 20.0, "m"),
            ("S", 0.5, "1"),
            ("n", 0.008, "s/m^(1/3)"),
        ],
    );
    check("y", &s, 1e-5, 1e-9, MPMATH);
    assert_eq!(s.branch.as_deref(), Some("the only depth"));
}

#[test]
fn secant_column_above_the_euler_load_is_refused() {
    // The secant formula holds below the Euler load only (Timoshenko and Gere, Theory of
    // Elastic Stability, section 1.4): 400 kN on this column is above Pe = 296 kN.
    let e = solve_template(&request(
        "structures.secant-column",
        "smax",
        &[
            ("P", 400.0, "kN"),
            ("E", 200.0, "GPa"),
            ("A", 3000.0, "mm^2"),
            ("r", 20.0, "mm"),
            ("Le", 3.5, "m"),
        ],
    ))
    .unwrap_err();
    assert_eq!(e.code, "outside-validity");
    assert!(e.message.contains("Euler"), "{}", e.message);
}

#[test]
fn no_root_in_range_is_said() {
    // Colebrook–White has no friction factor for eps/D = 2 (the logarithm's argument
    // exceeds 1, so 1/sqrt(f) would be negative): not converged, and the notes say that
    // no value in the range satisfies the equation (common practice, no source).
    let s = solve(
        "pipes.colebrook",
        "f",
        &[("eps", 20.0, "mm"), ("D", 10.0, "mm")],
    );
    assert!(!s.solution.converged);
    assert!(
        s.notes.iter().any(|n| n.starts_with("No root of f from")),
        "{:?}",
        s.notes
    );
}

#[test]
fn plane_wall_half_thickness_with_no_root_in_range() {
    // T = Tinf with Ti != Tinf needs theta = 0, so cos(zeta1 x/L) = 0 and L = 2 zeta1 x/pi,
    // below x: no half-thickness in the range L >= x (algebra on Incropera eq. 5.40). The
    // coupled solve used to stop on the bound L = x and call it converged.
    let s = solve(
        "thermal.plane-wall-transient",
        "L",
        &[
            ("T", -14.5816, "°C"),
            ("Tinf", -14.5816, "°C"),
            ("Ti", 4019.781, "°C"),
            ("t", 0.792891, "h"),
            ("h", 24896.02, "W/(m^2*K)"),
            ("k", 0.003651761, "W/(m*K)"),
            ("alpha", 0.1489614, "mm^2/s"),
            ("x", 17400.18, "mm"),
        ],
    );
    assert!(!s.solution.converged, "{} {:?}", s.value, s.notes);
}
