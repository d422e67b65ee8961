//! Unit conversion: every unit of the table round-trips through SI at the factor NIST
//! lists, US customary units agree with the international foot and pound, and the
//! errors for unknown and incompatible units.
//!
//! The acre is the international acre: NIST Handbook 44, Appendix C (General Tables of
//! Units of Measurement) defines 1 acre = 43 560 ft², and with the international foot
//! (0.3048 m, NIST SP 811 B.8) that is 4046.8564224 m² exactly. SP 811 (2008) lists only
//! the survey acre (4.046 873 E+03), based on the U.S. survey foot that NIST and NOAA
//! retired on 2023-01-01 (Federal Register 85 FR 62698, 2020; the citation is recalled
//! from memory).
//!
//! Expected factors are typed from NIST SP 811 (2008) Appendix B.8 ("Factors for units
//! listed alphabetically"), which lists seven significant figures and marks exact
//! factors in bold; they were typed from memory of that table, as the search tool did
//! not return its text. Spot checks against public copies of the table found by code
//! search agree for psi (6.894757E+03), mmHg (1.333224E+02), foot of water at 4 °C
//! (2.98898E+03), lb/s (4.535924E-01) and lb/h (1.259979E-04). SI prefixes are from the SI Brochure (9th ed., 2019) Table 7 and
//! the units accepted for use with the SI from its Table 8. Rows marked "derived" are
//! products of listed units and are checked against the product of the listed factors.

use tacit::units::{self, UNITS};

/// (symbol, dimension, factor to SI, exact?, source)
const EXPECTED: &[(&str, &str, f64, bool, &str)] = &[
    ("m", "length", 1.0, true, "SI"),
    ("mm", "length", 1e-3, true, "SI Table 7"),
    ("cm", "length", 1e-2, true, "SI Table 7"),
    ("km", "length", 1e3, true, "SI Table 7"),
    ("um", "length", 1e-6, true, "SI Table 7"),
    ("in", "length", 2.54e-2, true, "NIST B.8 inch"),
    ("ft", "length", 3.048e-1, true, "NIST B.8 foot"),
    ("yd", "length", 9.144e-1, true, "NIST B.8 yard"),
    ("mi", "length", 1.609344e3, true, "NIST B.8 mile"),
    ("m^2", "area", 1.0, true, "SI"),
    ("mm^2", "area", 1e-6, true, "SI Table 7"),
    ("cm^2", "area", 1e-4, true, "SI Table 7"),
    ("ha", "area", 1e4, true, "SI Table 8 hectare"),
    ("in^2", "area", 6.4516e-4, true, "NIST B.8 square inch"),
    ("ft^2", "area", 9.290304e-2, true, "NIST B.8 square foot"),
    (
        "acre",
        "area",
        4.0468564224e3,
        true,
        "NIST HB 44 Appendix C: 1 acre = 43 560 ft^2, international foot (survey foot retired 2023)",
    ),
    ("m^3", "volume", 1.0, true, "SI"),
    ("L", "volume", 1e-3, true, "SI Table 8 litre"),
    ("ft^3", "volume", 2.831685e-2, false, "NIST B.8 cubic foot"),
    (
        "gal",
        "volume",
        3.785412e-3,
        false,
        "NIST B.8 gallon (U.S.)",
    ),
    ("m^3/s", "volume_flow", 1.0, true, "SI"),
    (
        "m^3/h",
        "volume_flow",
        2.777778e-4,
        false,
        "SI Table 8 hour",
    ),
    ("m^3/d", "volume_flow", 1.157407e-5, false, "SI Table 8 day"),
    ("L/s", "volume_flow", 1e-3, true, "SI Table 8 litre"),
    (
        "L/min",
        "volume_flow",
        1.666667e-5,
        false,
        "SI Table 8 litre, minute",
    ),
    (
        "ft^3/s",
        "volume_flow",
        2.831685e-2,
        false,
        "NIST B.8 cubic foot per second",
    ),
    (
        "gal/min",
        "volume_flow",
        6.309020e-5,
        false,
        "NIST B.8 gallon (U.S.) per minute",
    ),
    ("m/s", "velocity", 1.0, true, "SI"),
    (
        "km/h",
        "velocity",
        2.777778e-1,
        false,
        "NIST B.8 kilometer per hour",
    ),
    (
        "ft/s",
        "velocity",
        3.048e-1,
        true,
        "NIST B.8 foot per second",
    ),
    (
        "mi/h",
        "velocity",
        4.4704e-1,
        true,
        "NIST B.8 mile per hour",
    ),
    ("m/s^2", "acceleration", 1.0, true, "SI"),
    (
        "ft/s^2",
        "acceleration",
        3.048e-1,
        true,
        "NIST B.8 foot per second squared",
    ),
    (
        "gn",
        "acceleration",
        9.80665,
        true,
        "NIST B.8 standard acceleration of gravity",
    ),
    ("kg", "mass", 1.0, true, "SI"),
    ("g", "mass", 1e-3, true, "SI Table 7"),
    ("t", "mass", 1e3, true, "SI Table 8 tonne"),
    (
        "lb",
        "mass",
        4.5359237e-1,
        true,
        "NIST B.8 pound (avoirdupois)",
    ),
    ("slug", "mass", 1.459390e1, false, "NIST B.8 slug"),
    ("kg/s", "mass_flow", 1.0, true, "SI"),
    ("kg/h", "mass_flow", 2.777778e-4, false, "SI Table 8 hour"),
    (
        "lb/s",
        "mass_flow",
        4.535924e-1,
        false,
        "NIST B.8 pound per second",
    ),
    (
        "lb/h",
        "mass_flow",
        1.259979e-4,
        false,
        "NIST B.8 pound per hour",
    ),
    ("kg/m", "mass_per_length", 1.0, true, "SI"),
    (
        "lb/ft",
        "mass_per_length",
        1.488164,
        false,
        "NIST B.8 pound per foot",
    ),
    ("N", "force", 1.0, true, "SI"),
    ("kN", "force", 1e3, true, "SI Table 7"),
    ("MN", "force", 1e6, true, "SI Table 7"),
    ("lbf", "force", 4.448222, false, "NIST B.8 pound-force"),
    (
        "kip",
        "force",
        4.448222e3,
        false,
        "NIST B.8 kip (1 kip = 1000 lbf)",
    ),
    ("kgf", "force", 9.80665, true, "NIST B.8 kilogram-force"),
    ("N/m", "force_per_length", 1.0, true, "SI"),
    ("kN/m", "force_per_length", 1e3, true, "SI Table 7"),
    (
        "lbf/ft",
        "force_per_length",
        1.459390e1,
        false,
        "NIST B.8 pound-force per foot",
    ),
    (
        "lbf/in",
        "force_per_length",
        1.751268e2,
        false,
        "NIST B.8 pound-force per inch",
    ),
    (
        "kip/ft",
        "force_per_length",
        1.459390e4,
        false,
        "derived: 1000 x NIST lbf/ft",
    ),
    ("Pa", "pressure", 1.0, true, "SI"),
    ("kPa", "pressure", 1e3, true, "SI Table 7"),
    ("MPa", "pressure", 1e6, true, "SI Table 7"),
    ("GPa", "pressure", 1e9, true, "SI Table 7"),
    ("bar", "pressure", 1e5, true, "NIST B.8 bar"),
    (
        "atm",
        "pressure",
        1.01325e5,
        true,
        "NIST B.8 atmosphere, standard",
    ),
    (
        "psi",
        "pressure",
        6.894757e3,
        false,
        "NIST B.8 pound-force per square inch",
    ),
    (
        "ksi",
        "pressure",
        6.894757e6,
        false,
        "NIST B.8 kip per square inch",
    ),
    (
        "psf",
        "pressure",
        4.788026e1,
        false,
        "NIST B.8 pound-force per square foot",
    ),
    (
        "mmHg",
        "pressure",
        1.333224e2,
        false,
        "NIST B.8 millimeter of mercury, conventional",
    ),
    (
        "ftH2O",
        "pressure",
        2.989067e3,
        false,
        "NIST B.8 foot of water, conventional (ftH2O); recalled from memory (the 39.2 °F entry is 2.98898E+03)",
    ),
    ("N/m^3", "unit_weight", 1.0, true, "SI"),
    ("kN/m^3", "unit_weight", 1e3, true, "SI Table 7"),
    (
        "lbf/ft^3",
        "unit_weight",
        1.570875e2,
        false,
        "derived: NIST lbf / NIST ft^3",
    ),
    ("kg/m^3", "density", 1.0, true, "SI"),
    ("g/cm^3", "density", 1e3, true, "SI Table 7"),
    (
        "lb/ft^3",
        "density",
        1.601846e1,
        false,
        "NIST B.8 pound per cubic foot",
    ),
    ("J", "energy", 1.0, true, "SI"),
    ("kJ", "energy", 1e3, true, "SI Table 7"),
    ("MJ", "energy", 1e6, true, "SI Table 7"),
    ("kWh", "energy", 3.6e6, true, "NIST B.8 kilowatt hour"),
    (
        "Btu",
        "energy",
        1.055056e3,
        false,
        "NIST B.8 British thermal unit (IT)",
    ),
    (
        "ft*lbf",
        "energy",
        1.355818,
        false,
        "NIST B.8 foot pound-force",
    ),
    ("W", "power", 1.0, true, "SI"),
    ("kW", "power", 1e3, true, "SI Table 7"),
    ("MW", "power", 1e6, true, "SI Table 7"),
    (
        "hp",
        "power",
        7.456999e2,
        false,
        "NIST B.8 horsepower (550 ft·lbf/s)",
    ),
    (
        "Btu/h",
        "power",
        2.930711e-1,
        false,
        "NIST B.8 British thermal unit (IT) per hour",
    ),
    ("s", "time", 1.0, true, "SI"),
    ("ms", "time", 1e-3, true, "SI Table 7"),
    ("min", "time", 60.0, true, "SI Table 8 minute"),
    ("h", "time", 3600.0, true, "SI Table 8 hour"),
    ("d", "time", 86400.0, true, "SI Table 8 day"),
    ("yr", "time", 3.1536e7, true, "NIST B.8 year (365 days)"),
    ("Hz", "frequency", 1.0, true, "SI"),
    ("kHz", "frequency", 1e3, true, "SI Table 7"),
    ("K", "temperature", 1.0, true, "SI"),
    (
        "°C",
        "temperature",
        1.0,
        true,
        "NIST B.9 t/°C = T/K - 273.15",
    ),
    (
        "°F",
        "temperature",
        5.555556e-1,
        false,
        "NIST B.9 T/K = (t/°F + 459.67)/1.8",
    ),
    (
        "°R",
        "temperature",
        5.555556e-1,
        false,
        "NIST B.8 degree Rankine",
    ),
    ("K", "temperature_difference", 1.0, true, "SI"),
    (
        "Δ°C",
        "temperature_difference",
        1.0,
        true,
        "NIST B.9 interval of 1 °C = 1 K",
    ),
    (
        "Δ°F",
        "temperature_difference",
        5.555556e-1,
        false,
        "NIST B.8 degree Fahrenheit (interval)",
    ),
    (
        "Δ°R",
        "temperature_difference",
        5.555556e-1,
        false,
        "NIST B.8 degree Rankine (interval)",
    ),
    ("rad", "angle", 1.0, true, "SI"),
    ("°", "angle", 1.745329e-2, false, "NIST B.8 degree (angle)"),
    ("Pa*s", "dynamic_viscosity", 1.0, true, "SI"),
    ("mPa*s", "dynamic_viscosity", 1e-3, true, "SI Table 7"),
    (
        "cP",
        "dynamic_viscosity",
        1.0e-3,
        true,
        "NIST B.8 centipoise",
    ),
    ("P", "dynamic_viscosity", 1.0e-1, true, "NIST B.8 poise"),
    (
        "lbf*s/ft^2",
        "dynamic_viscosity",
        4.788026e1,
        false,
        "NIST B.8 pound-force second per square foot",
    ),
    ("m^2/s", "kinematic_viscosity", 1.0, true, "SI"),
    ("mm^2/s", "kinematic_viscosity", 1e-6, true, "SI Table 7"),
    (
        "cSt",
        "kinematic_viscosity",
        1.0e-6,
        true,
        "NIST B.8 centistokes",
    ),
    ("St", "kinematic_viscosity", 1.0e-4, true, "NIST B.8 stokes"),
    (
        "ft^2/s",
        "kinematic_viscosity",
        9.290304e-2,
        true,
        "NIST B.8 square foot per second",
    ),
    ("m^2/s", "diffusivity", 1.0, true, "SI"),
    ("mm^2/s", "diffusivity", 1e-6, true, "SI Table 7"),
    ("m^2/d", "diffusivity", 1.157407e-5, false, "SI Table 8 day"),
    (
        "m^2/yr",
        "diffusivity",
        3.170979e-8,
        false,
        "derived: NIST year (365 days)",
    ),
    (
        "ft^2/h",
        "diffusivity",
        2.58064e-5,
        true,
        "NIST B.8 square foot per hour",
    ),
    (
        "ft^2/d",
        "diffusivity",
        1.075267e-6,
        false,
        "derived: NIST ft^2 / SI day",
    ),
    ("m^4", "second_moment_of_area", 1.0, true, "SI"),
    ("mm^4", "second_moment_of_area", 1e-12, true, "SI Table 7"),
    ("cm^4", "second_moment_of_area", 1e-8, true, "SI Table 7"),
    (
        "in^4",
        "second_moment_of_area",
        4.162314e-7,
        false,
        "NIST B.8 inch to the fourth power",
    ),
    (
        "ft^4",
        "second_moment_of_area",
        8.630975e-3,
        false,
        "NIST B.8 foot to the fourth power",
    ),
    ("W/(m^2*K)", "heat_transfer_coefficient", 1.0, true, "SI"),
    (
        "Btu/(h*ft^2*°F)",
        "heat_transfer_coefficient",
        5.678263,
        false,
        "NIST B.8 Btu(IT)/(h·ft²·°F)",
    ),
    ("W/(m*K)", "thermal_conductivity", 1.0, true, "SI"),
    (
        "Btu*ft/(h*ft^2*°F)",
        "thermal_conductivity",
        1.730735,
        false,
        "NIST B.8 Btu(IT)·ft/(h·ft²·°F)",
    ),
    ("J/(kg*K)", "specific_heat", 1.0, true, "SI"),
    ("kJ/(kg*K)", "specific_heat", 1e3, true, "SI Table 7"),
    (
        "Btu/(lb*°F)",
        "specific_heat",
        4.1868e3,
        true,
        "NIST B.8 Btu(IT)/(lb·°F)",
    ),
    ("A", "current", 1.0, true, "SI"),
    ("mA", "current", 1e-3, true, "SI Table 7"),
    ("uA", "current", 1e-6, true, "SI Table 7"),
    ("nA", "current", 1e-9, true, "SI Table 7"),
    ("pA", "current", 1e-12, true, "SI Table 7"),
    ("V", "voltage", 1.0, true, "SI"),
    ("mV", "voltage", 1e-3, true, "SI Table 7"),
    ("kV", "voltage", 1e3, true, "SI Table 7"),
    ("ohm", "resistance", 1.0, true, "SI"),
    ("mohm", "resistance", 1e-3, true, "SI Table 7"),
    ("kohm", "resistance", 1e3, true, "SI Table 7"),
    ("Mohm", "resistance", 1e6, true, "SI Table 7"),
    ("m^3/mol", "molar_volume", 1.0, true, "SI"),
    ("cm^3/mol", "molar_volume", 1e-6, true, "SI Table 7"),
    ("L/mol", "molar_volume", 1e-3, true, "SI Table 8 litre"),
    (
        "ft^3/lbmol",
        "molar_volume",
        6.242796e-5,
        false,
        "derived: NIST ft^3 / (1000 NIST lb)",
    ),
    ("mol", "amount_of_substance", 1.0, true, "SI"),
    ("kmol", "amount_of_substance", 1e3, true, "SI Table 7"),
    ("s/m^(1/3)", "manning_n", 1.0, true, "SI"),
    ("1", "dimensionless", 1.0, true, "SI"),
    ("%", "dimensionless", 0.01, true, "SI Brochure 5.4.7"),
    ("currency", "money", 1.0, true, "common practice, no source"),
];

/// NIST lists seven significant figures: a rounded factor is within half a unit of
/// the seventh figure.
fn agrees(got: f64, want: f64, exact: bool) -> bool {
    if exact {
        (got - want).abs() <= 1e-15 * want.abs()
    } else {
        let digits = want.abs().log10().floor();
        (got - want).abs() <= 0.5e-6 * 10f64.powf(digits) * 1.000001
    }
}

/// The offset of a reading unit, typed from NIST SP 811 (2008) B.9:
/// T/K = t/°C + 273.15 and T/K = (t/°F + 459.67)/1.8.
const OFFSETS: &[(&str, f64, &str)] = &[
    ("°C", 273.15, "NIST B.9 T/K = t/°C + 273.15"),
    ("°F", 459.67 / 1.8, "NIST B.9 T/K = (t/°F + 459.67)/1.8"),
];

/// Every unit of the table, through SI and back: `x` units are `x * factor + offset`
/// in SI with the factor typed from its source, and that SI value comes back as `x`.
#[test]
fn every_unit_round_trips_through_si_at_the_nist_factor() {
    let mut missing = Vec::new();
    for unit in UNITS {
        let Some(&(s, d, want, exact, source)) = EXPECTED
            .iter()
            .find(|(s, d, ..)| *s == unit.symbol && *d == unit.dimension)
        else {
            missing.push(format!("{} ({})", unit.symbol, unit.dimension));
            continue;
        };
        let offset = OFFSETS
            .iter()
            .find(|(o, ..)| *o == s && d == "temperature")
            .map_or(0.0, |&(_, o, _)| o);
        for x in [1.0, 12.345, -3.5] {
            // To SI: the factor implied by the conversion is the listed one.
            let si = units::to_si_in(x, s, d).unwrap();
            let expected_si = x * want + offset;
            // (With an offset, compare the SI values: subtracting it loses bits.)
            let to_ok = if offset != 0.0 && exact {
                (si - expected_si).abs() <= 1e-14 * expected_si.abs()
            } else {
                agrees((si - offset) / x, want, exact)
            };
            assert!(
                to_ok,
                "{s} ({d}): {x} {s} is {si} in SI but {source} gives {expected_si}"
            );
            // From SI: the listed SI value of x units comes back as x (to the figures
            // listed), so the factor implied on the way back is the listed one too.
            let back = units::from_si_in(expected_si, s, d).unwrap();
            let from_ok = if offset != 0.0 && exact {
                (back - x).abs() <= 1e-12 * x.abs()
            } else {
                agrees(want * x / back, want, exact)
            };
            assert!(
                from_ok,
                "{s} ({d}): {expected_si} in SI is {back} {s}, not {x} ({source})"
            );
            let again = units::from_si_in(si, s, d).unwrap();
            assert!((again - x).abs() <= 1e-12 * x.abs(), "{s}: {x} -> {again}");
        }
        // The offset itself, for readings: 0 °C is 273.15 K.
        if offset != 0.0 {
            let zero = units::to_si_in(0.0, s, d).unwrap();
            assert!(
                (zero - offset).abs() <= 1e-12 * offset,
                "{s}: 0 is {zero} K"
            );
        }
    }
    assert!(
        missing.is_empty(),
        "units without a checked factor: {missing:?}"
    );
    assert_eq!(
        EXPECTED.len(),
        UNITS.len(),
        "a checked row names no unit of the table"
    );
    for unit in UNITS {
        assert!(!unit.source.is_empty(), "{} has no source", unit.symbol);
    }
}

/// US customary units are built on the international foot and pound: each definition
/// below holds to the last bit or two. Sources: NIST Handbook 44, Appendix C (General
/// Tables of Units of Measurement) for the length, area and volume relations; NIST SP
/// 811 (2008) B.8 for the slug (lbf·s²/ft), the horsepower (550 ft·lbf/s), the kip
/// (1000 lbf) and the Btu(IT)/(lb·°F) (exactly 4186.8 J/(kg·K)).
#[test]
fn us_customary_units_follow_the_international_foot_and_pound() {
    let si = |x: f64, unit: &str| units::to_si(x, unit).unwrap();
    let (ft, inch, lb, lbf, s) = (
        si(1.0, "ft"),
        si(1.0, "in"),
        si(1.0, "lb"),
        si(1.0, "lbf"),
        1.0,
    );
    let cases: &[(&str, f64, &str)] = &[
        ("acre", 43_560.0 * ft * ft, "HB 44 C: 1 acre = 43 560 ft²"),
        ("mi", 5280.0 * ft, "HB 44 C: 1 mi = 5280 ft"),
        ("yd", 3.0 * ft, "HB 44 C: 1 yd = 3 ft"),
        ("ft", 12.0 * inch, "HB 44 C: 1 ft = 12 in"),
        (
            "gal",
            231.0 * inch * inch * inch,
            "HB 44 C: 1 gal = 231 in³",
        ),
        (
            "ft^3",
            1728.0 * inch * inch * inch,
            "HB 44 C: 1 ft³ = 1728 in³",
        ),
        ("slug", lbf * s * s / ft, "SP 811 B.8: slug = lbf·s²/ft"),
        ("hp", 550.0 * ft * lbf / s, "SP 811 B.8: hp = 550 ft·lbf/s"),
        ("kip", 1000.0 * lbf, "SP 811 B.8: kip = 1000 lbf"),
        ("psi", 144.0 * si(1.0, "psf"), "HB 44 C: 1 ft² = 144 in²"),
        ("lbf", lb * 9.80665, "SP 811 B.8: lbf = lb × gn"),
        ("lb/ft^3", lb / (ft * ft * ft), "SP 811 B.8: lb/ft³"),
        (
            "Btu/(lb*°F)",
            4186.8,
            "SP 811 B.8: Btu(IT)/(lb·°F) is exactly 4.1868 E+03",
        ),
        ("ft^2/d", ft * ft / 86_400.0, "SI Table 8: 1 d = 86 400 s"),
        (
            "m^2/yr",
            1.0 / (365.0 * 86_400.0),
            "SP 811 B.8: year (365 days)",
        ),
    ];
    for &(unit, want, source) in cases {
        let got = si(1.0, unit);
        assert!(
            (got - want).abs() <= 4e-16 * want,
            "1 {unit} = {got} in SI, but {source} gives {want}"
        );
    }
}

#[test]
fn temperatures_with_offsets() {
    // NIST SP 811 (2008) B.9: T/K = t/°C + 273.15; T/K = (t/°F + 459.67)/1.8; T/K = (T/°R)/1.8.
    let close = |a: f64, b: f64| (a - b).abs() < 1e-9;
    assert!(close(units::convert(32.0, "°F", "K").unwrap(), 273.15));
    assert!(close(units::convert(212.0, "degF", "degC").unwrap(), 100.0));
    assert!(close(units::convert(-40.0, "°C", "°F").unwrap(), -40.0));
    assert!(close(units::convert(491.67, "°R", "°C").unwrap(), 0.0));
    assert!(close(units::to_si(25.0, "°C").unwrap(), 298.15));
    assert!(close(units::from_si(0.0, "°F").unwrap(), -459.67));
    // An interval has no offset: 18 °F of difference is 10 K.
    assert!(close(units::convert(18.0, "Δ°F", "K").unwrap(), 10.0));
    assert!(close(units::convert(10.0, "Δ°C", "Δ°F").unwrap(), 18.0));
}

#[test]
fn conversions_between_non_si_units() {
    // 1 ksi = 1000 psi and 1 mi = 5280 ft by definition (NIST SP 811 B.8, kip and mile);
    // 1 ft^3/s = 448.83117 gal/min, since 1 ft^3 = 1728/231 = 7.48052 US gal (NIST SP 811
    // B.8 defines the gallon as 231 in^3) and a minute is 60 s.
    assert!((units::convert(1.0, "ksi", "psi").unwrap() - 1000.0).abs() < 1e-9);
    assert!((units::convert(1.0, "cfs", "gpm").unwrap() - 448.831_168_8).abs() < 1e-6);
    assert!((units::convert(1.0, "mi", "ft").unwrap() - 5280.0).abs() < 1e-9);
    // Unicode and ASCII spellings meet.
    assert_eq!(units::convert(2.0, "m³/s", "m^3/s").unwrap(), 2.0);
    assert_eq!(units::convert(5.0, "W/(m²·K)", "W/(m^2*K)").unwrap(), 5.0);
    assert_eq!(units::convert(3.0, "µA", "uA").unwrap(), 3.0);
}

#[test]
fn every_dimension_lists_its_units_si_first() {
    for d in units::dimensions() {
        let list = units::units_of(d);
        assert!(!list.is_empty());
        let si = units::unit_in(list[0], d).unwrap();
        assert_eq!(si.factor, 1.0, "{d}: first unit {} is not SI", list[0]);
        assert_eq!(si.offset, 0.0);
    }
    assert!(units::units_of("flux capacitance").is_empty());
}

#[test]
fn unknown_unit_is_a_clear_error() {
    let e = units::convert(1.0, "furlong", "m").unwrap_err();
    assert_eq!(e.code, "unknown-unit");
    assert!(e.message.contains("\"furlong\""), "{}", e.message);
    let e = units::to_si(1.0, "parsec").unwrap_err();
    assert_eq!(e.code, "unknown-unit");
    let e = units::to_si_in(1.0, "cubits", "length").unwrap_err();
    assert_eq!(e.code, "unknown-unit");
    assert!(
        e.message.contains("\"cubits\"")
            && e.message.contains("length")
            && e.message.contains("ft"),
        "{}",
        e.message
    );
    let e = units::to_si_in(1.0, "m", "no such dimension").unwrap_err();
    assert_eq!(e.code, "unknown-dimension");
}

#[test]
fn incompatible_unit_is_a_clear_error() {
    let e = units::convert(1.0, "psi", "m").unwrap_err();
    assert_eq!(e.code, "incompatible-unit");
    assert!(
        e.message.contains("psi") && e.message.contains("pressure") && e.message.contains("length"),
        "{}",
        e.message
    );
    let e = units::to_si_in(1.0, "kg", "length").unwrap_err();
    assert_eq!(e.code, "incompatible-unit");
    assert!(
        e.message.contains("\"kg\"") && e.message.contains("mass") && e.message.contains("length"),
        "{}",
        e.message
    );
    // A temperature reading is not an interval.
    let e = units::to_si_in(1.0, "°F", "temperature_difference").unwrap_err();
    assert_eq!(e.code, "incompatible-unit");
    let e = units::convert(f64::NAN, "m", "ft").unwrap_err();
    assert_eq!(e.code, "non-finite-input");
}
