//! Forward-mode derivatives (`equations::Dual`): against mpmath's numerical
//! differentiation at high precision for every function of the language and four
//! residuals of engineering practice (tests/reference/dual_values.py), against central
//! differences on random smooth expressions, and by properties: the value part is the
//! point value bit for bit, and over a box the interval derivative encloses the point
//! derivative at every point.

use proptest::prelude::*;
use tacit::equations::{Dual, Expression, Interval, Program};

mod common;
use common::{expression, value};

/// (expression in x, x, derivative), from tests/reference/dual_values.py:
/// mpmath 1.4.1, mp.dps = 40, mp.diff.
#[allow(clippy::approx_constant)]
const DERIVATIVES: &[(&str, f64, f64)] = &[
    ("sqrt(x)", 0.3, 0.9128709291752769),
    ("sqrt(x)", 2.0, 0.3535533905932738),
    ("sqrt(x)", 1000000.0, 0.0005),
    ("cbrt(x)", 0.3, 0.7438143889801884),
    ("cbrt(x)", -2.0, 0.20998684164914552),
    ("exp(x)", -1.0, 0.36787944117144233),
    ("exp(x)", 3.0, 20.085536923187668),
    ("ln(x)", 0.3, 3.3333333333333335),
    ("ln(x)", 5.0, 0.2),
    ("expm1(x)", 1e-08, 1.00000001),
    ("expm1(x)", 2.0, 7.38905609893065),
    ("log1p(x)", 1e-08, 0.9999999900000001),
    ("log1p(x)", -0.5, 2.0),
    ("log10(x)", 0.3, 1.4476482730108395),
    ("log10(x)", 5.0, 0.08685889638065036),
    ("log2(x)", 0.3, 4.8089834696298785),
    ("log2(x)", 5.0, 0.28853900817779266),
    ("abs(x)", -2.0, -1.0),
    ("abs(x)", 3.0, 1.0),
    ("sin(x)", 0.3, 0.955336489125606),
    ("sin(x)", 4.0, -0.6536436208636119),
    ("cos(x)", 0.3, -0.29552020666133955),
    ("cos(x)", 4.0, 0.7568024953079282),
    ("tan(x)", 0.3, 1.095688915322547),
    ("tan(x)", 1.5, 199.85004452649247),
    ("sec(x)", 0.3, 0.3237982146926581),
    ("sec(x)", 1.5, 199.34941748777328),
    ("csc(x)", 0.3, -10.93911032442689),
    ("csc(x)", 3.0, 49.7112539028375),
    ("cot(x)", 0.3, -11.450531251495654),
    ("cot(x)", 3.0, -50.21376836040873),
    ("asin(x)", 0.3, 1.0482848367219182),
    ("asin(x)", -0.9, 2.294157338705618),
    ("acos(x)", 0.3, -1.0482848367219182),
    ("acos(x)", -0.9, -2.294157338705618),
    ("atan(x)", 0.3, 0.9174311926605505),
    ("atan(x)", 10.0, 0.009900990099009901),
    ("sinh(x)", 0.3, 1.0453385141288605),
    ("sinh(x)", -3.0, 10.067661995777765),
    ("cosh(x)", 0.3, 0.3045202934471426),
    ("cosh(x)", -3.0, -10.017874927409903),
    ("tanh(x)", 0.3, 0.9151369618266292),
    ("tanh(x)", -3.0, 0.00986603716544019),
    ("asinh(x)", 0.3, 0.9578262852211514),
    ("asinh(x)", -30.0, 0.03331483023263848),
    ("acosh(x)", 1.5, 0.8944271909999159),
    ("acosh(x)", 30.0, 0.033351867298253506),
    ("atanh(x)", 0.3, 1.098901098901099),
    ("atanh(x)", -0.9, 5.263157894736843),
    ("deg(x)", 0.3, 57.29577951308232),
    ("rad(x)", 30.0, 0.017453292519943295),
    ("x^3", 1.7, 8.67),
    ("x^2.5", 1.7, 5.541322044422251),
    ("2^x", 1.7, 2.2520418337495354),
    ("x^x", 1.7, 3.7725316434003777),
    ("atan2(x, 2)", 1.7, 0.29027576197387517),
    ("atan2(2, x)", -1.7, -0.29027576197387517),
    ("hypot(x, 2)", 1.7, 0.6476484200955405),
    ("npv(x, -100, 60, 70)", 0.08, -162.57684296093075),
    (
        "1/sqrt(x) + 2*log10(4.6e-5/(3.7*0.3) + 2.51/(2e5*sqrt(x)))",
        0.02,
        -191.57894157504234,
    ),
    (
        "(1/x)*((2/(1.4 + 1))*(1 + (1.4 - 1)/2*x^2))^((1.4 + 1)/(2*(1.4 - 1))) - 2",
        2.2,
        1.7782479338842978,
    ),
    (
        "(1/0.013)*((3 + 2*x)*x)*(((3 + 2*x)*x)/(3 + 2*x*sqrt(1 + 2^2)))^(2/3)*sqrt(0.0005) - 12",
        1.2,
        15.508600226514806,
    ),
    (
        "x/4e-3*(1 + 0.01*0.1/0.07^2*sec(5/(2*0.07)*sqrt(x/(2e11*4e-3)))) - 2.5e8",
        200000.0,
        321.1998744188791,
    ),
];

fn program(text: &str, names: &[&str]) -> Program {
    Expression::parse(text).unwrap().compile(names).unwrap()
}

#[test]
fn derivatives_match_high_precision_numerical_differentiation() {
    for &(text, x, want) in DERIVATIVES {
        let d = program(text, &["x"]).derivative(&[x], 0);
        let err = (d.d - want).abs() / want.abs().max(1e-300);
        assert!(
            err < 1e-12,
            "{text} at {x}: {} against {want} (rel. error {err:e})",
            d.d
        );
    }
}

#[test]
fn the_gradient_holds_each_partial_derivative() {
    // f = x^2·y + sin(y)/z: closed form ∂f/∂x = 2xy, ∂f/∂y = x² + cos(y)/z,
    // ∂f/∂z = −sin(y)/z².
    let p = program("x^2*y + sin(y)/z", &["x", "y", "z"]);
    let (x, y, z) = (1.5, 0.7, 2.5);
    let mut g = [0.0; 3];
    let v = p.gradient(&[x, y, z], &mut g);
    assert_eq!(v, p.eval(&[x, y, z]));
    let want = [2.0 * x * y, x * x + y.cos() / z, -y.sin() / (z * z)];
    for (got, want) in g.iter().zip(want) {
        assert!((got - want).abs() <= 1e-15 * want.abs().max(1.0), "{g:?}");
    }
}

#[test]
fn parts_that_do_not_depend_on_the_variable_have_zero_derivative() {
    // sqrt(k) at k = 0 has an infinite derivative in k, but none in x.
    let p = program("x + sqrt(k)", &["x", "k"]);
    assert_eq!(p.derivative(&[2.0, 0.0], 0).d, 1.0);
    assert_eq!(p.derivative(&[2.0, 0.0], 1).d, f64::INFINITY);
    // Kinks and steps at a point: abs takes sign(x), steps have slope 0.
    let p = program("abs(x) + floor(x) + when(x, x^2, -x)", &["x"]);
    assert_eq!(p.derivative(&[-2.0], 0).d, -1.0 + 0.0 - 1.0);
    assert_eq!(p.derivative(&[3.0], 0).d, 1.0 + 6.0);
    let p = program("min(x, 2*x, 5) + max(x, 1) + clamp(3*x, 0, 1)", &["x"]);
    assert_eq!(p.derivative(&[0.25], 0).d, 1.0 + 0.0 + 3.0);
    assert_eq!(p.derivative(&[-1.0], 0).d, 2.0 + 0.0 + 0.0);
}

/// Random expressions of smooth functions on their domains: x stays positive where a
/// logarithm or root needs it.
fn smooth() -> impl Strategy<Value = String> {
    let leaf = prop_oneof![
        Just("x".to_string()),
        Just("y".to_string()),
        (1u32..20).prop_map(|n| format!("{n}")),
        (1u32..9).prop_map(|n| format!("0.{n}")),
    ];
    leaf.prop_recursive(5, 32, 4, |inner| {
        prop_oneof![
            (
                inner.clone(),
                prop::sample::select(vec!["+", "-", "*"]),
                inner.clone()
            )
                .prop_map(|(a, op, b)| format!("({a} {op} {b})")),
            (inner.clone(), inner.clone()).prop_map(|(a, b)| format!("({a})/(1 + ({b})^2)")),
            (inner.clone(), 2u32..5).prop_map(|(a, k)| format!("({a})^{k}")),
            (
                prop::sample::select(vec!["sin", "cos", "atan", "tanh", "exp", "asinh"]),
                inner.clone()
            )
                .prop_map(|(f, a)| format!("{f}(0.3*({a}))")),
            (
                prop::sample::select(vec!["sqrt", "ln", "cbrt"]),
                inner.clone()
            )
                .prop_map(|(f, a)| format!("{f}(1 + ({a})^2)")),
            (inner.clone(), inner).prop_map(|(a, b)| format!("hypot({a}, {b})")),
        ]
    })
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(1500))]

    #[test]
    fn derivatives_agree_with_central_differences(
        text in smooth(), x in -2.0f64..2.0, y in -2.0f64..2.0
    ) {
        // Central differences at h and h/2 (common practice, no source); where the two
        // agree to 1e-7 the function is smooth there at that scale, and where rounding
        // noise is small the derivative must agree with the finer one to 1e-6
        // (relative, or absolute below 1).
        let p = program(&text, &["x", "y"]);
        let d = p.derivative(&[x, y], 0).d;
        let cd = |h: f64| (p.eval(&[x + h, y]) - p.eval(&[x - h, y])) / (2.0 * h);
        let (c1, c2) = (cd(1e-4), cd(5e-5));
        let scale = c2.abs().max(1.0);
        prop_assume!(c1.is_finite() && c2.is_finite() && (c1 - c2).abs() <= 1e-7 * scale);
        // Rounding of f itself, divided by the step, must be far below the tolerance.
        let noise = f64::EPSILON * p.eval(&[x, y]).abs().max(1.0) / 5e-5;
        prop_assume!(noise <= 1e-8 * scale);
        prop_assert!((d - c2).abs() <= 1e-6 * scale, "{text} at ({x}, {y}): AD {d}, differences {c2}");
    }

    #[test]
    fn the_value_part_is_the_point_value(
        text in expression(), x in value(), y in value(), z in value()
    ) {
        let p = program(&text, &["x", "y", "z"]);
        let got = p.derivative(&[x, y, z], 1).v;
        let want = p.eval(&[x, y, z]);
        prop_assert!(got.to_bits() == want.to_bits() || (got.is_nan() && want.is_nan()),
            "{text}: dual value {got:e}, point value {want:e}");
    }

    #[test]
    fn interval_derivatives_enclose_point_derivatives(
        text in expression(),
        (xa, xb) in (value(), value()),
        y in value(), z in value(),
        t in prop::collection::vec(0.0f64..=1.0, 4),
    ) {
        let p = program(&text, &["x", "y", "z"]);
        let (lo, hi) = (xa.min(xb), xa.max(xb));
        let slots = [
            Dual::variable(Interval::new(lo, hi)),
            Dual::fixed(Interval::point(y)),
            Dual::fixed(Interval::point(z)),
        ];
        let mut stack = vec![Dual::fixed(Interval::point(0.0)); p.stack_size()];
        let enclosure = p.run(&slots, &mut stack);
        for &ti in &t {
            let x = (lo + ti * (hi - lo)).clamp(lo, hi);
            let d = p.derivative(&[x, y, z], 0);
            prop_assert!(enclosure.v.contains(d.v), "{text}: value {} at {x} outside {:?}", d.v, enclosure.v);
            // Where the value is undefined the derivative means nothing.
            prop_assert!(
                d.v.is_nan() || enclosure.d.contains(d.d),
                "{text}: derivative {} at {x} outside {:?} over [{lo}, {hi}]", d.d, enclosure.d
            );
        }
    }
}
