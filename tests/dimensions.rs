//! Units in the equation language and the dimension check: the dimension of every unit,
//! units written on numbers, the label `SI:`, the check's errors with their positions,
//! and solves with variables in chosen units against the same solves done in SI by hand.
//!
//! Sources are named beside each check. Conversion factors typed here are from NIST SP
//! 811 (2008) Appendix B.8 (seven figures) or exact by definition; the dimensions of the
//! derived SI units from the SI Brochure (9th ed., 2019) Table 4.

use std::collections::HashMap;
use std::time::{Duration, Instant};

use tacit::dimension::Dimension;
use tacit::equations::dimensions::{self, rule, Rule};
use tacit::equations::functions::FUNCTIONS;
use tacit::equations::quantities::{solve_in_units, VariableUnits};
use tacit::equations::{caret, solve_set, EquationSet, Expression, SetSolution, UnknownSpec};
use tacit::units::{self, parse_unit, UNITS};
use tacit::{templates, InputError, Options};

fn dim(name: &str) -> Dimension {
    Dimension::named(name).unwrap_or_else(|| panic!("no dimension {name}"))
}

/// Runs the check of `text` with `(name, dimension name)` pairs.
fn check(text: &str, given: &[(&str, &str)]) -> Result<(), InputError> {
    let set = EquationSet::parse(text)?;
    let map: HashMap<String, Dimension> =
        given.iter().map(|(n, d)| (n.to_string(), dim(d))).collect();
    dimensions::check(&set, &map, &[]).map(|_| ())
}

/// The error of checking `text`, which must have `code` and `position`.
fn check_error(text: &str, given: &[(&str, &str)], code: &str, position: usize) -> InputError {
    let e = check(text, given).expect_err(text);
    assert_eq!(
        (e.code, e.position),
        (code, Some(position)),
        "{text}: {}",
        e.message
    );
    e
}

/// `result` must be an error with `code` at `position`, its message containing `words`.
fn expect_error<T>(
    result: Result<T, InputError>,
    text: &str,
    code: &str,
    position: usize,
    words: &str,
) {
    let Err(e) = result else {
        panic!("{text}: expected an error {code}");
    };
    assert_eq!(
        (e.code, e.position),
        (code, Some(position)),
        "{text}: {}",
        e.message
    );
    assert!(e.message.contains(words), "{text}: {}", e.message);
}

fn close(a: f64, b: f64, rel: f64) -> bool {
    (a - b).abs() <= rel * b.abs().max(f64::MIN_POSITIVE)
}

// ---------------------------------------------------------------------------------------
// Units and their dimensions

#[test]
fn every_dimension_of_the_table_and_the_catalogue_has_exponents() {
    for d in units::dimensions() {
        assert!(Dimension::named(d).is_some(), "unit dimension {d}");
    }
    for t in templates::all() {
        let names = t
            .variables
            .iter()
            .map(|v| &v.dimension)
            .chain(t.outputs.iter().map(|o| &o.dimension))
            .chain(t.auxiliary.iter().map(|a| &a.dimension))
            .chain(t.list.iter().map(|l| &l.dimension));
        for d in names {
            assert!(Dimension::named(d).is_some(), "{}: dimension {d}", t.id);
        }
    }
}

#[test]
fn derived_si_units_in_base_units() {
    // SI Brochure (9th ed., 2019) Table 4, "expressed in terms of SI base units", and
    // Table 5 for the derived units without special names.
    let cases = [
        ("N", "m·kg·s^-2"),
        ("Pa", "kg·m^-1·s^-2"),
        ("J", "m^2·kg·s^-2"),
        ("W", "m^2·kg·s^-3"),
        ("V", "m^2·kg·s^-3·A^-1"),
        ("ohm", "m^2·kg·s^-3·A^-2"),
        ("Hz", "s^-1"),
        ("m^2/s", "m^2·s^-1"),
        ("Pa*s", "kg·m^-1·s^-1"),
        ("W/(m*K)", "m·kg·s^-3·K^-1"),
        ("W/(m^2*K)", "kg·s^-3·K^-1"),
        ("J/(kg*K)", "m^2·s^-2·K^-1"),
        ("kg/m^3", "kg·m^-3"),
        ("m^3/mol", "m^3·mol^-1"),
        ("rad", "1"),
    ];
    for (unit, base) in cases {
        assert_eq!(
            parse_unit(unit).unwrap().dimension.base_units(),
            base,
            "{unit}"
        );
    }
    // Manning's n in its SI form, s/m^(1/3) (V. T. Chow, Open-Channel Hydraulics, 1959, 5-6).
    assert_eq!(dim("manning_n").base_units(), "s·m^(-1/3)");
}

#[test]
fn every_unit_symbol_agrees_with_its_parts() {
    // Read as a compound of the table's own units (the parentheses keep the whole-text
    // lookup from finding the row), each symbol must have the dimension its row's
    // dimension name says, and the same factor: lbf/ft^3 is lbf over ft cubed.
    // Two rows are written with a part that is not a unit of the table on its own: the
    // millipascal and the pound-mole.
    let whole_only = ["mPa*s", "ft^3/lbmol"];
    for row in UNITS {
        let parts = parse_unit(&format!("({})", row.symbol));
        if whole_only.contains(&row.symbol) {
            assert_eq!(parts.unwrap_err().code, "unknown-unit", "{}", row.symbol);
            continue;
        }
        let parts = parts.unwrap_or_else(|e| panic!("{}: {}", row.symbol, e.message));
        assert_eq!(
            parts.dimension,
            dim(row.dimension),
            "{} ({})",
            row.symbol,
            row.dimension
        );
        assert!(
            close(parts.factor, row.factor, 2e-16 * 4.0),
            "{}: parts give {}, the row {}",
            row.symbol,
            parts.factor,
            row.factor
        );
    }
    // Rows that share a symbol share a dimension (K, m^2/s, mm^2/s).
    for a in UNITS {
        for b in UNITS {
            if a.symbol == b.symbol {
                assert_eq!(dim(a.dimension), dim(b.dimension), "{}", a.symbol);
            }
        }
    }
}

#[test]
fn dimensions_in_words() {
    let cases = [
        ("volume_flow", "a volume flow"),
        ("length", "a length"),
        ("angle", "dimensionless"),
        ("dimensionless", "dimensionless"),
        ("temperature_difference", "a temperature"),
        ("diffusivity", "a kinematic viscosity or diffusivity"),
        ("manning_n", "a Manning roughness"),
        ("money", "money"),
    ];
    for (name, words) in cases {
        assert_eq!(dim(name).in_words(), words, "{name}");
    }
    // No name: a product of base units, positive exponents first.
    let d = parse_unit("kg*m^3").unwrap().dimension;
    assert_eq!(d.in_words(), "m^3·kg");
    let d = parse_unit("s/m^(1/2)").unwrap().dimension;
    assert_eq!(d.in_words(), "s·m^(-1/2)");
}

#[test]
fn compound_units_convert_at_the_nist_factor() {
    // NIST SP 811 (2008) B.8, seven figures.
    let cases = [
        ("ft^3/min", 4.719_474e-4, "cubic foot per minute"),
        ("mi^2", 2.589_988e6, "square mile"),
        ("in^3", 1.638_706e-5, "cubic inch"),
        ("ft*lbf/s", 1.355_818, "foot pound-force per second"),
        ("lbf*s^2/ft", 1.459_390e1, "slug (lbf·s²/ft)"),
        ("Btu/lb", 2.326e3, "Btu(IT) per pound, exact"),
        ("gal/h", 1.051_503e-6, "gallon (U.S.) per hour"),
        ("lb/(ft*s)", 1.488_164, "pound per foot second"),
        ("in^3/min", 2.731_177e-7, "cubic inch per minute"),
    ];
    for (unit, want, what) in cases {
        let got = parse_unit(unit).unwrap();
        assert!(
            close(got.factor, want, 0.6e-6),
            "{unit}: {} against NIST {what} {want}",
            got.factor
        );
        assert_eq!(got.offset, 0.0);
    }
    // Inside a compound unit a temperature is an interval (SI Brochure 2.3.1): a
    // coefficient per °C is one per kelvin.
    let per_c = parse_unit("W/(m^2*°C)").unwrap();
    assert_eq!((per_c.factor, per_c.offset), (1.0, 0.0));
    assert_eq!(per_c.dimension, dim("heat_transfer_coefficient"));
    let per_f = parse_unit("Btu/(h*ft^2*degF)").unwrap();
    assert!(
        close(per_f.factor, 5.678_263, 0.6e-6),
        "NIST B.8 Btu/(h·ft²·°F)"
    );
    // Alone, a reading keeps its offset (NIST B.9).
    assert!(close(
        parse_unit("degF").unwrap().to_si(32.0),
        273.15,
        1e-15
    ));
    // Powers: ², ^-1, ^0.5, ^(1/3).
    assert_eq!(parse_unit("m²").unwrap().dimension, dim("area"));
    assert_eq!(parse_unit("s^-1").unwrap().dimension, dim("frequency"));
    assert_eq!(parse_unit("m^0.5*m^(3/2)").unwrap().dimension, dim("area"));
    assert_eq!(
        parse_unit("(m^3/s)^2/m^6").unwrap().dimension,
        dim("frequency")
            .pow(tacit::dimension::Ratio::integer(2))
            .unwrap()
    );
}

#[test]
fn bad_units_are_clear_errors() {
    let cases: &[(&str, &str, usize, &str)] = &[
        ("kg*furlong", "unknown-unit", 3, "`furlong`"),
        ("W/m^2/K", "ambiguous-unit", 5, "W/(m^2*K)"),
        ("J/kg*K", "ambiguous-unit", 4, "parentheses"),
        ("m^", "bad-unit", 1, "^(1/3)"),
        ("m^(1/0)", "bad-unit", 1, "^(1/3)"),
        ("(m*s", "bad-unit", 0, "never closed"),
        ("m*s)", "bad-unit", 3, "no matching"),
        ("kg m", "bad-unit", 3, "operator is missing"),
        ("m*", "bad-unit", 2, "missing"),
        ("*m", "bad-unit", 0, "missing"),
        ("1000/s", "unknown-unit", 0, "a number is not a unit"),
        ("", "empty-unit", 0, "empty"),
        ("()", "bad-unit", 1, "missing"),
    ];
    for &(text, code, position, words) in cases {
        expect_error(parse_unit(text), text, code, position, words);
    }
    let long = "m*".repeat(200) + "m";
    assert_eq!(parse_unit(&long).unwrap_err().code, "unit-too-long");
    // Exponents that overflow the fractions are an error, not a panic.
    let e = parse_unit("m^(1/4000000000)^(1/4000000000)").unwrap_err();
    assert_eq!(e.code, "bad-unit");
    assert_eq!(
        parse_unit("m^99999999999999999999").unwrap_err().code,
        "bad-unit"
    );
}

// ---------------------------------------------------------------------------------------
// Units on numbers in the text

fn value_of(text: &str, x: f64) -> f64 {
    let e = Expression::parse(text).unwrap_or_else(|e| panic!("{text}: {}", e.message));
    e.compile(&["x"]).unwrap().eval(&[x])
}

#[test]
fn numbers_with_units_are_their_si_values() {
    // Factors exact by definition (NIST SP 811 B.8: in, ft, gn, lb; B.9 temperatures).
    let cases = [
        ("9.80665[m/s^2]", 9.806_65),
        ("1[gn]", 9.806_65),
        ("1[in]", 0.0254),
        ("2 [ft]", 0.6096),
        ("1e3[mm]", 1.0),
        (".5[km]", 500.0),
        ("-40[degC]", 233.15),
        ("-40[°F]", 233.15),
        ("2*-40[degC]", 466.3),
        ("x - 40[degC]", 300.0 - 313.15),
        ("x*-1[degC]", 300.0 * 272.15),
        ("32[degF]", 273.15),
        ("18[Δ°F]", 10.0),
        ("100[%]", 1.0),
        ("8.314462618[J/(mol*K)]", 8.314_462_618),
        ("1[lbf*s^2/ft]", 14.593_902_937_206_364),
        ("-2[m]", -2.0),
        ("2^-1[m]", 0.5),
    ];
    for (text, want) in cases {
        let got = value_of(text, 300.0);
        assert!(close(got, want, 1e-15), "{text}: {got}, expected {want}");
    }
    // A number with a unit is exactly the bits of its SI value.
    assert_eq!(value_of("1[m]", 0.0).to_bits(), 1f64.to_bits());
    assert_eq!(value_of("0.1[m]", 0.0).to_bits(), 0.1f64.to_bits());
    assert_eq!(
        value_of("1.380649e-23[J/K]", 0.0).to_bits(),
        1.380649e-23f64.to_bits()
    );
}

#[test]
fn bad_units_in_the_text_are_errors_with_positions() {
    let cases: &[(&str, &str, usize, &str)] = &[
        (
            "y = 2[furlong]",
            "unknown-unit",
            6,
            "in the unit of the number 2",
        ),
        ("y = 2[m", "unbalanced-brackets", 5, "never closed"),
        ("y = 2[m\n]", "unbalanced-brackets", 5, "never closed"),
        ("y = x[m]", "unexpected-character", 5, "right after"),
        ("y = [m]", "unexpected-character", 4, "right after"),
        ("y = 2[]", "empty-unit", 6, "empty"),
        ("y = 2[ ]", "empty-unit", 6, "empty"),
        ("y = 2[m/s/s]", "ambiguous-unit", 9, "parentheses"),
        ("y = 2[m] 3", "missing-operator", 9, "operator is missing"),
        ("y = 2[m][s]", "unexpected-character", 8, "right after"),
        ("y = 1e308[km]", "bad-number", 4, "too large"),
    ];
    for &(text, code, position, words) in cases {
        expect_error(EquationSet::parse(text), text, code, position, words);
    }
    let text = "y = 2[furlong]";
    let e = EquationSet::parse(text).unwrap_err();
    assert_eq!(caret(text, e.position.unwrap()), "y = 2[furlong]\n      ^");
}

#[test]
fn the_si_label() {
    let set = EquationSet::parse("SI: y = 10.67*x\nSI : z := 2*y\nw = z").unwrap();
    assert_eq!(set.equation_count(), 2);
    assert_eq!(set.definition_names(), ["z"]);
    // `SI :=` defines a name SI; `SI` elsewhere is a variable.
    let set = EquationSet::parse("SI := 3\ny = SI*x").unwrap();
    assert_eq!(set.definition_names(), ["SI"]);
    let cases: &[(&str, &str, usize)] = &[
        ("SI:", "missing-operand", 0),
        ("y = 1\nSI:  # nothing", "missing-operand", 6),
        ("si: y = x", "unexpected-character", 2),
        ("y: x = 1", "unexpected-character", 1),
        ("y = SI: x", "unexpected-character", 6),
        ("x SI: y = 1", "unexpected-character", 4),
        ("SI: SI: y = 1", "unexpected-character", 6),
    ];
    for &(text, code, position) in cases {
        let e = EquationSet::parse(text).expect_err(text);
        assert_eq!(
            (e.code, e.position),
            (code, Some(position)),
            "{text}: {}",
            e.message
        );
    }
    assert_eq!(
        Expression::parse("SI: x").unwrap_err().code,
        "not-an-expression"
    );
}

// ---------------------------------------------------------------------------------------
// The check

#[test]
fn the_two_sides_must_agree() {
    let text = "V := Q/A\nhf = Q";
    let e = check_error(
        text,
        &[("Q", "volume_flow"), ("A", "area"), ("hf", "length")],
        "dimension-mismatch",
        12,
    );
    assert_eq!(
        e.message,
        "left side is a length, right side is a volume flow; at 12"
    );
    assert_eq!(caret(text, 12), "hf = Q\n   ^");
    // A definition used on one side carries its dimension.
    check_error(
        "V := Q/A\nhf = V",
        &[("Q", "volume_flow"), ("A", "area"), ("hf", "length")],
        "dimension-mismatch",
        12,
    );
    assert!(check(
        "V := Q/A\nhf = V^2/(2*g)",
        &[
            ("Q", "volume_flow"),
            ("A", "area"),
            ("hf", "length"),
            ("g", "acceleration")
        ]
    )
    .is_ok());
}

#[test]
fn sums_and_differences_must_agree() {
    let e = check_error(
        "y = L + Q",
        &[("L", "length"), ("Q", "volume_flow")],
        "dimension-mismatch",
        6,
    );
    assert_eq!(
        e.message,
        "left of `+` is a length, right of `+` is a volume flow; at 6"
    );
    let e = check_error(
        "y = T - 1",
        &[("T", "temperature")],
        "dimension-mismatch",
        6,
    );
    assert_eq!(
        e.message,
        "left of `-` is a temperature, right of `-` is dimensionless; at 6"
    );
    check_error(
        "y = L % t",
        &[("L", "length"), ("t", "time")],
        "dimension-mismatch",
        6,
    );
    // The first error in the text is the one reported.
    check_error(
        "a = L + t\nb = t - L",
        &[("L", "length"), ("t", "time")],
        "dimension-mismatch",
        6,
    );
}

#[test]
fn functions_that_need_a_pure_number_say_so() {
    let mut pure = 0;
    for f in FUNCTIONS {
        let Some(Rule::PureNumber) = rule(f.name) else {
            continue;
        };
        pure += 1;
        let text = format!("y = {}(L)", f.name);
        let e = check_error(&text, &[("L", "length")], "dimensionless-argument", 4);
        assert_eq!(
            e.message,
            format!(
                "`{}` needs a dimensionless argument, but it is given a length; at 4",
                f.name
            )
        );
        // A ratio of lengths is a pure number.
        assert!(check(
            &format!("y = {}(L/D)", f.name),
            &[("L", "length"), ("D", "length"), ("y", "dimensionless")]
        )
        .is_ok());
    }
    assert!(pure >= 25, "{pure} functions need a pure number");
    let e = check_error(
        "y = npv(r, c0, c1)",
        &[("r", "length")],
        "dimensionless-argument",
        4,
    );
    assert!(e.message.contains("rate"), "{}", e.message);
    // The exponent of ^ is an argument that must be a pure number too.
    check_error("y = 2^L", &[("L", "length")], "dimensionless-argument", 5);
    let e = check_error("y = L^n", &[("L", "length")], "dimensionless-argument", 5);
    assert!(e.message.contains("not a constant number"), "{}", e.message);
}

#[test]
fn every_function_has_a_dimension_rule() {
    for f in FUNCTIONS {
        assert!(rule(f.name).is_some(), "{} has no dimension rule", f.name);
    }
}

#[test]
fn roots_and_powers() {
    let g = [
        ("A", "area"),
        ("D", "length"),
        ("V", "volume"),
        ("Q", "volume_flow"),
        ("n", "manning_n"),
        ("t", "time"),
        ("x", "dimensionless"),
    ];
    for ok in [
        "D = sqrt(4*A/pi)",
        "D = cbrt(V)",
        "A = D^2",
        "V = A^1.5",
        "D = A^(1/2)",
        "D = V^(2/6)",
        "D = V^((2/6)^1)",
        "n = t/D^(1/3)",
        "Q = 1/n*A*(A/D)^(2/3)*sqrt(x)",
        "A = D^2*x^x",
        "D = (A*D^-1)^1",
        "x = (D/D)^x",
    ] {
        if let Err(e) = check(ok, &g) {
            panic!("{ok}: {}", e.message);
        }
    }
    let e = check_error("A = sqrt(D)", &g, "dimension-mismatch", 2);
    assert_eq!(
        e.message,
        "left side is an area, right side is m^(1/2); at 2"
    );
    check_error("Q = D^2.5", &g, "dimension-mismatch", 2);
    check_error("D = D^x", &g, "dimensionless-argument", 5);
}

#[test]
fn alike_arguments() {
    let g = [
        ("L", "length"),
        ("Q", "volume_flow"),
        ("y", "length"),
        ("t", "time"),
    ];
    for f in ["max", "min", "hypot"] {
        let e = check_error(&format!("y = {f}(L, Q)"), &g, "dimension-mismatch", 4);
        assert_eq!(
            e.message,
            format!("the arguments of `{f}` differ: a length and a volume flow; at 4")
        );
    }
    check_error("a = atan2(L, Q)", &g, "dimension-mismatch", 4);
    check_error("y = clamp(L, 0, Q)", &g, "dimension-mismatch", 4);
    check_error("y = when(t, L, Q)", &g, "dimension-mismatch", 4);
    check_error("y = npv(0.1, L, Q)", &g, "dimension-mismatch", 4);
    for ok in [
        "y = max(L, 2*L, y)",
        "y = hypot(L, y)",
        "y = clamp(L, 0, y)",
        "y = when(t, L, y)",
        "y = abs(L)",
        "y = L*sign(t)",
        "y = L*atan2(L, y)",
        "y = npv(0.1, L, y, -L)",
    ] {
        if let Err(e) = check(ok, &g) {
            panic!("{ok}: {}", e.message);
        }
    }
}

#[test]
fn unknown_dimensions_give_no_false_errors() {
    // Only a partly known text: x has no unit. Nothing here is inconsistent for every
    // dimension x could have, so nothing is reported.
    for ok in [
        "y = x*L",
        "y = x + L",
        "y = sqrt(x)*L",
        "y = x^2.5",
        "y = exp(x)*L",
        "y = max(x, L)",
        "L - x*y = 0",
        "y = when(x, L, x)",
    ] {
        if let Err(e) = check(ok, &[("L", "length"), ("y", "length")]) {
            panic!("{ok}: {}", e.message);
        }
    }
    // No units at all: every template's text passes, labels or not.
    for t in templates::all() {
        let text = t.equations.replace("SI: ", "").replace("{c}", "c0, c1");
        let set = EquationSet::parse(&text).unwrap();
        let declared: Vec<&str> = t.variables.iter().map(|v| v.symbol.as_str()).collect();
        dimensions::check(&set, &HashMap::new(), &declared)
            .unwrap_or_else(|e| panic!("{}: {}", t.id, e.message));
    }
    // What is known still decides: x + L is a length whatever x is.
    check_error(
        "y = x + L",
        &[("L", "length"), ("y", "time")],
        "dimension-mismatch",
        2,
    );
}

#[test]
fn zero_fits_any_dimension() {
    for ok in [
        "L - D = 0",
        "L = 0",
        "0 = L + 0*x",
        "y = L + 0",
        "y = L - 0.0e3",
    ] {
        if let Err(e) = check(ok, &[("L", "length"), ("D", "length"), ("y", "length")]) {
            panic!("{ok}: {}", e.message);
        }
    }
    // A bare expression means `= 0`.
    assert!(check("L - D", &[("L", "length"), ("D", "length")]).is_ok());
}

#[test]
fn a_definition_must_match_its_unit() {
    let set = EquationSet::parse("V := Q/A\nhf = V^2/(2*1[gn])").unwrap();
    let units = [
        ("Q".to_string(), "gpm".to_string()),
        ("A".to_string(), "ft^2".to_string()),
        ("hf".to_string(), "ft".to_string()),
        ("V".to_string(), "ft/s".to_string()),
    ];
    let checked = VariableUnits::new(&set, &units, &[]).unwrap();
    assert_eq!(
        checked.definition_dimensions,
        [("V".to_string(), Some(dim("velocity")))]
    );
    let mut wrong = units.to_vec();
    wrong[3].1 = "L/s".into();
    let e = VariableUnits::new(&set, &wrong, &[]).unwrap_err();
    assert_eq!((e.code, e.position), ("dimension-mismatch", Some(0)));
    assert_eq!(
        e.message,
        "`V` is a volume flow by its unit, but its definition gives a velocity; at 0"
    );
}

/// Hazen–Williams in its SI form, as an engineer would type it: 10.67 carries units
/// (m^0.63·s^1.852 for hf in m, Q in m³/s, D in m) that the text does not write.
const HAZEN_WILLIAMS: &str = "hf = 10.67*L*Q^1.852/(C^1.852*D^4.8704)";

fn hw_units() -> Vec<(String, String)> {
    [
        ("hf", "ft"),
        ("L", "ft"),
        ("Q", "gpm"),
        ("D", "in"),
        ("C", "1"),
    ]
    .iter()
    .map(|(n, u)| (n.to_string(), u.to_string()))
    .collect()
}

#[test]
fn an_empirical_relation_is_refused_unless_labelled() {
    let set = EquationSet::parse(HAZEN_WILLIAMS).unwrap();
    let e = VariableUnits::new(&set, &hw_units(), &[]).unwrap_err();
    assert_eq!((e.code, e.position), ("dimension-mismatch", Some(3)));
    assert!(
        e.message
            .starts_with("left side is a length, right side is m^(")
            && e.message.contains("label an empirical statement SI:"),
        "{}",
        e.message
    );
    // Labelled, it is accepted, and solved in SI: the same head loss as the SI form
    // evaluated by hand with inputs converted by the exact factors (NIST SP 811 B.8:
    // 1 ft = 0.3048 m, 1 in = 0.0254 m, 1 gal = 3.785411784e-3 m³).
    let set = EquationSet::parse(&format!("SI: {HAZEN_WILLIAMS}")).unwrap();
    let units = VariableUnits::new(&set, &hw_units(), &[]).unwrap();
    let knowns =
        [("L", 2000.0), ("Q", 500.0), ("C", 130.0), ("D", 8.0)].map(|(n, v)| (n.to_string(), v));
    let s = solve_in_units(
        &set,
        &knowns,
        &[UnknownSpec::named("hf")],
        &Options::default(),
        false,
        &units,
    )
    .unwrap();
    let (l, q, d): (f64, f64, f64) = (
        2000.0 * 0.3048,
        500.0 * 3.785_411_784e-3 / 60.0,
        8.0 * 0.0254,
    );
    let hf_m = 10.67 * l * q.powf(1.852) / (130f64.powf(1.852) * d.powf(4.8704));
    assert!(
        close(s.unknowns[0].1, hf_m / 0.3048, 1e-12),
        "{:?}",
        s.unknowns
    );
    // The bundled template, which is the same SI form, agrees (its units: m, L/s, mm).
    let mut r = templates::TemplateRequest::new("pipes.hazen-williams", "hf");
    r.values = vec![
        ("L".into(), 2000.0, "ft".into()),
        ("Q".into(), 500.0, "gpm".into()),
        ("C".into(), 130.0, "1".into()),
        ("D".into(), 8.0, "in".into()),
    ];
    r.result_unit = Some("ft".into());
    let t = templates::solve_template(&r).unwrap();
    assert!(
        close(t.value, s.unknowns[0].1, 1e-12),
        "{} against {:?}",
        t.value,
        s.unknowns
    );
}

#[test]
fn a_number_with_its_unit_needs_no_label() {
    let g = [
        ("hf", "length"),
        ("f", "dimensionless"),
        ("L", "length"),
        ("D", "length"),
        ("V", "velocity"),
    ];
    assert!(check("hf = f*(L/D)*V^2/(2*9.80665[m/s^2])", &g).is_ok());
    assert!(check("hf = f*(L/D)*V^2/(2*32.174[ft/s^2])", &g).is_ok());
    let e = check_error("hf = f*(L/D)*V^2/(2*9.80665)", &g, "dimension-mismatch", 3);
    assert!(e.message.contains("9.80665[m/s^2]"), "{}", e.message);
    // The wrong unit on the number is caught too.
    check_error(
        "hf = f*(L/D)*V^2/(2*9.80665[m/s])",
        &g,
        "dimension-mismatch",
        3,
    );
}

#[test]
fn catalogue_templates_use_the_label_where_numbers_carry_units() {
    let mut labelled = 0;
    for t in templates::all() {
        if !t.equations.contains("SI: ") {
            continue;
        }
        labelled += 1;
        // Without the labels the check refuses the template: each label is needed.
        let text = t.equations.replace("SI: ", "");
        let declared: Vec<&str> = t.variables.iter().map(|v| v.symbol.as_str()).collect();
        let set = EquationSet::parse_declaring(&text, &declared).unwrap();
        let e = templates::check_dimensions(t, &set).expect_err(&t.id);
        assert_eq!(e.code, "dimension-mismatch", "{}: {}", t.id, e.message);
    }
    assert_eq!(labelled, 9);
    // Manning's equation needs none: with n in s/m^(1/3) its SI form is consistent.
    for id in [
        "channels.manning-rectangular",
        "channels.manning-trapezoidal",
        "channels.manning-circular",
    ] {
        let t = templates::find(id).unwrap();
        assert!(!t.equations.contains("SI:"), "{id}");
    }
    assert!(templates::check_catalogue().is_empty());
}

#[test]
fn long_texts_are_checked_without_deep_recursion() {
    let cases = [
        "y = ".to_string() + &"x+".repeat(100_000) + "x",
        "y = ".to_string() + &"x^".repeat(100_000) + "x",
        "y = ".to_string() + &"-".repeat(200_000) + "x",
        "y = ".to_string() + &"(".repeat(100) + "x" + &")".repeat(100),
    ];
    for text in cases {
        let start = Instant::now();
        check(&text, &[("y", "length"), ("x", "length")]).ok();
        assert!(
            start.elapsed() < Duration::from_secs(5),
            "took {:?}",
            start.elapsed()
        );
    }
}

// ---------------------------------------------------------------------------------------
// Solving in units

fn solve(
    text: &str,
    units: &[(&str, &str)],
    knowns: &[(&str, f64)],
    unknowns: &[UnknownSpec],
    options: &Options,
    sensitivities: bool,
) -> Result<SetSolution, InputError> {
    let set = EquationSet::parse(text)?;
    let units: Vec<(String, String)> = units
        .iter()
        .map(|(n, u)| (n.to_string(), u.to_string()))
        .collect();
    let knowns: Vec<(String, f64)> = knowns.iter().map(|(n, v)| (n.to_string(), *v)).collect();
    let mut named: Vec<&str> = knowns.iter().map(|(n, _)| n.as_str()).collect();
    named.extend(unknowns.iter().map(|u| u.name.as_str()));
    let checked = VariableUnits::new(&set, &units, &named)?;
    solve_in_units(&set, &knowns, unknowns, options, sensitivities, &checked)
}

#[test]
fn conversions_through_every_dimension_the_templates_use() {
    // y = x with x in one unit and y in another: the answer is the conversion. The
    // factors themselves are checked against NIST in tests/units.rs; this checks the
    // way through a solve (direction, offsets) for every unit of every dimension used.
    let mut used: Vec<&str> = Vec::new();
    for t in templates::all() {
        for d in t
            .variables
            .iter()
            .map(|v| v.dimension.as_str())
            .chain(t.outputs.iter().map(|o| o.dimension.as_str()))
        {
            if !used.contains(&d) {
                used.push(d);
            }
        }
    }
    assert!(used.len() >= 25, "{used:?}");
    let mut pairs = 0;
    for d in &used {
        let list = units::units_of(d);
        for from in &list {
            for to in &list {
                let s = solve(
                    "y = x",
                    &[("x", from), ("y", to)],
                    &[("x", 3.7)],
                    &[UnknownSpec::named("y")],
                    &Options::default(),
                    false,
                )
                .unwrap_or_else(|e| panic!("{d}: {from} to {to}: {}", e.message));
                let want = units::convert(3.7, from, to).unwrap();
                assert!(
                    close(s.unknowns[0].1, want, 1e-12),
                    "{d}: 3.7 {from} = {want} {to}, got {:?}",
                    s.unknowns
                );
                pairs += 1;
            }
        }
        // A unit of another dimension is a mismatch.
        let other = if *d == "length" { "kg" } else { "m" };
        let e = solve(
            "y = x",
            &[("x", list[0]), ("y", other)],
            &[("x", 1.0)],
            &[UnknownSpec::named("y")],
            &Options::default(),
            false,
        )
        .unwrap_err();
        if dim(d) != parse_unit(other).unwrap().dimension {
            assert_eq!(e.code, "dimension-mismatch", "{d}");
        }
    }
    assert!(pairs > 500, "{pairs}");
}

#[test]
fn temperature_readings_and_differences() {
    // NIST SP 811 (2008) B.9: a reading converts with its offset, an interval without.
    let s = solve(
        "dT = T2 - T1",
        &[("T1", "degF"), ("T2", "degF"), ("dT", "Δ°F")],
        &[("T1", 50.0), ("T2", 80.0)],
        &[UnknownSpec::named("dT")],
        &Options::default(),
        false,
    )
    .unwrap();
    assert!(close(s.unknowns[0].1, 30.0, 1e-12), "{:?}", s.unknowns);
    // The same difference asked in kelvin and in Δ°C.
    for unit in ["K", "Δ°C"] {
        let s = solve(
            "dT = T2 - T1",
            &[("T1", "degF"), ("T2", "degC"), ("dT", unit)],
            &[("T1", 50.0), ("T2", 20.0)],
            &[UnknownSpec::named("dT")],
            &Options::default(),
            false,
        )
        .unwrap();
        assert!(
            close(s.unknowns[0].1, 10.0, 1e-12),
            "{unit}: {:?}",
            s.unknowns
        );
    }
    // An unknown reading comes back with its offset: the temperature 10 Δ°C above 50 °F.
    let s = solve(
        "T2 = T1 + dT",
        &[("T1", "degF"), ("T2", "degC"), ("dT", "Δ°C")],
        &[("T1", 50.0), ("dT", 10.0)],
        &[UnknownSpec::named("T2").with_bounds(-50.0, 100.0)],
        &Options::default(),
        false,
    )
    .unwrap();
    assert!(close(s.unknowns[0].1, 20.0, 1e-12), "{:?}", s.unknowns);
}

/// The worked example: pipe flow in US units, own equations. Invented inputs: 450 gpm
/// of water in a 6.065-inch bore, 1200 ft long, roughness 0.0018 in, kinematic
/// viscosity 1.217e-5 ft²/s.
const PIPE: &str = "V := Q/(pi*D^2/4)
Re := V*D/nu
1/sqrt(f) = -2*log10(eps/(3.7*D) + 2.51/(Re*sqrt(f)))
hf = f*(L/D)*V^2/(2*1[gn])";

const PIPE_UNITS: [(&str, &str); 7] = [
    ("Q", "gpm"),
    ("D", "in"),
    ("L", "ft"),
    ("eps", "in"),
    ("nu", "ft^2/s"),
    ("hf", "ft"),
    ("V", "ft/s"),
];

/// fluids 1.3.1 friction.Colebrook with scipy 1.17.1 constants (gallon, minute, inch,
/// foot, g): see tests/reference/own_equation_units.py.
const REF_HF_FT: f64 = 16.24076213109194;
const REF_F: f64 = 0.01762501179470149;
const REF_V_FTS: f64 = 4.997358494603029;

/// The friction factor as an unknown, with a start and bounds a practitioner would give.
fn friction_factor() -> UnknownSpec {
    UnknownSpec::named("f")
        .with_guesses(0.01, 0.03)
        .with_bounds(1e-3, 0.1)
}

fn value(s: &SetSolution, name: &str) -> f64 {
    s.unknowns
        .iter()
        .chain(s.definitions.iter())
        .find(|(n, _)| n == name)
        .unwrap_or_else(|| panic!("no {name}"))
        .1
}

#[test]
fn pipe_flow_in_us_units_against_a_reference_library() {
    let pipe = [
        ("D", 6.065),
        ("L", 1200.0),
        ("eps", 0.0018),
        ("nu", 1.217e-5),
    ];
    let solve_us = |given: (&str, f64), other: UnknownSpec| {
        let mut knowns = pipe.to_vec();
        knowns.push(given);
        let unknowns = [friction_factor(), other];
        let s = solve(
            PIPE,
            &PIPE_UNITS,
            &knowns,
            &unknowns,
            &Options::default(),
            false,
        )
        .unwrap();
        assert!(s.converged, "{:?}", s.status);
        s
    };
    let s = solve_us(("Q", 450.0), UnknownSpec::named("hf"));
    let (hf, f, v) = (value(&s, "hf"), value(&s, "f"), value(&s, "V"));
    assert!(
        close(hf, REF_HF_FT, 1e-10),
        "hf {hf} ft against fluids {REF_HF_FT}"
    );
    assert!(close(f, REF_F, 1e-10), "f {f} against fluids {REF_F}");
    assert!(close(v, REF_V_FTS, 1e-12), "V {v} ft/s");

    // The inverse problem, fully implicit: the flow that loses the reference head.
    let q = UnknownSpec::named("Q")
        .with_guesses(300.0, 600.0)
        .with_bounds(1.0, 1e4);
    let us = solve_us(("hf", REF_HF_FT), q);
    let q_us = value(&us, "Q");
    assert!(close(q_us, 450.0, 1e-9), "Q {q_us} gpm");

    // The same solve in SI, converted by hand with the exact factors (NIST SP 811 B.8:
    // 1 in = 0.0254 m, 1 ft = 0.3048 m, 1 gal = 231 in³, 1 min = 60 s) and the text
    // with 9.80665 typed bare, no units anywhere.
    let set = EquationSet::parse(&PIPE.replace("1[gn]", "9.80665")).unwrap();
    let (inch, ft) = (0.0254, 0.3048);
    let gpm = 231.0 * inch * inch * inch / 60.0;
    let knowns: Vec<(String, f64)> = [
        ("hf", REF_HF_FT * ft),
        ("D", 6.065 * inch),
        ("L", 1200.0 * ft),
        ("eps", 0.0018 * inch),
        ("nu", 1.217e-5 * ft * ft),
    ]
    .map(|(n, v)| (n.to_string(), v))
    .to_vec();
    let q = UnknownSpec::named("Q")
        .with_guesses(300.0 * gpm, 600.0 * gpm)
        .with_bounds(gpm, 1e4 * gpm);
    let si = solve_set(
        &set,
        &knowns,
        &[friction_factor(), q],
        &Options::default(),
        false,
    )
    .unwrap();
    let q_si = value(&si, "Q") / gpm;
    assert!(
        close(q_us, q_si, 1e-12),
        "Q {q_us} gpm against {q_si} by hand"
    );
    assert_eq!(
        us.evaluations, si.evaluations,
        "the same solve, in SI both times"
    );
}

#[test]
fn history_brackets_and_sensitivities_come_back_in_units() {
    // A = pi*D^2/4 with A in in² and D in in: 12.566370614359172 in² is a 4-inch bore.
    let options = Options {
        record_history: true,
        ..Options::default()
    };
    let s = solve(
        "A = pi*D^2/4",
        &[("A", "in^2"), ("D", "in")],
        &[("A", 4.0 * std::f64::consts::PI)],
        &[UnknownSpec::named("D")
            .with_guesses(1.0, 2.0)
            .with_bounds(0.0, 100.0)],
        &options,
        true,
    )
    .unwrap();
    assert!(close(s.unknowns[0].1, 4.0, 1e-12), "{:?}", s.unknowns);
    let sol = s.scalar.as_ref().unwrap();
    assert_eq!(
        sol.history[0].x, 1.0,
        "the first point is the guess, in inches"
    );
    assert!(
        close(sol.history[1].step, 1.0, 1e-12),
        "step {} in",
        sol.history[1].step
    );
    assert!(close(sol.root, 4.0, 1e-12));
    if let Some((lo, hi)) = sol.bracket {
        assert!(
            lo <= 4.0 + 1e-9 && 4.0 - 1e-9 <= hi,
            "bracket {lo}..{hi} in"
        );
    }
    // dD/dA = 2/(pi*D) in per in², relative 1/2 (D = sqrt(4A/pi)).
    let d = &s.sensitivities[0];
    assert!(
        close(d.derivative, 2.0 / (std::f64::consts::PI * 4.0), 1e-6),
        "{d:?}"
    );
    assert!(close(d.relative, 0.5, 1e-6), "{d:?}");
}

#[test]
fn unit_errors_name_the_variable() {
    let err = |units: &[(&str, &str)]| {
        solve(
            "y = 2*x",
            units,
            &[("x", 1.0)],
            &[UnknownSpec::named("y")],
            &Options::default(),
            false,
        )
        .unwrap_err()
    };
    let e = err(&[("z", "m")]);
    assert_eq!(e.code, "unknown-variable");
    assert!(e.message.contains("`z`"), "{}", e.message);
    let e = err(&[("x", "furlong")]);
    assert_eq!(e.code, "unknown-unit");
    assert!(e.message.starts_with("the unit of `x`:"), "{}", e.message);
    let e = err(&[("x", "m"), ("y", "m^2")]);
    assert_eq!((e.code, e.position), ("dimension-mismatch", Some(2)));
    assert_eq!(
        e.message,
        "left side is an area, right side is a length; at 2"
    );
}
