//! Run-time unit conversion for every dimension the templates use.
//!
//! Each unit is one row of [`UNITS`]: its symbol, the spellings also accepted, its
//! dimension, and how to reach the coherent SI unit of that dimension:
//! `si = value * factor + offset` (the offset is zero except for °C and °F).
//! Every row names the source of its factor: NIST SP 811 (2008) Appendix B.8 for
//! non-SI units, the SI Brochure (9th ed., 2019) Table 7 for SI prefixes and Table 8
//! for the non-SI units accepted for use with the SI. Where a unit is a product of
//! listed units (lbf/ft³ from lbf and ft), the factor is computed from the exact
//! definitions of those units and the row says "derived".
//!
//! Temperature comes in two dimensions: `temperature` (a reading, with offsets: K, °C,
//! °F, °R) and `temperature_difference` (an interval: K, Δ°C, Δ°F, Δ°R).
//!
//! **Conventions**, where a unit name has more than one meaning in use:
//! - the foot, inch, yard and mile are the international ones (1 ft = 0.3048 m exactly),
//!   and so is the acre (43 560 ft², 4046.8564224 m²): the U.S. survey foot was retired
//!   on 2023-01-01 and no unit here is based on it;
//! - the pound is the avoirdupois pound (0.45359237 kg), the pound-force its weight
//!   under standard gravity 9.80665 m/s²;
//! - the gallon is the U.S. liquid gallon (231 in³), not the imperial one;
//! - the horsepower is the mechanical one (550 ft·lbf/s), not the metric or electric;
//! - the Btu is the International Table Btu (1055.05585262 J);
//! - a year is 365 days of 86 400 s (3.1536e7 s), not the Julian year of 365.25 days;
//! - mmHg and ftH2O are the conventional ones of NIST SP 811;
//! - pressures carry no gauge or absolute mark: a value is whatever the equation means.
//!
//! ```
//! use tacit::units;
//! let psi = units::convert(100.0, "kPa", "psi").unwrap();
//! assert!((psi - 14.503_773_8).abs() < 1e-6);
//! assert_eq!(units::convert(0.0, "degC", "K").unwrap(), 273.15);
//! assert!(units::convert(1.0, "m", "kg").is_err());
//! ```

use crate::dimension::{Dimension, Ratio};
use crate::error::{require_finite, InputError};
use std::collections::HashMap;
use std::sync::OnceLock;

/// One unit: `si = value * factor + offset`.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct Unit {
    /// The symbol shown to users.
    pub symbol: &'static str,
    /// Other spellings accepted on input (ASCII forms, Unicode forms).
    pub aliases: &'static [&'static str],
    pub dimension: &'static str,
    pub factor: f64,
    pub offset: f64,
    /// Where the factor comes from.
    pub source: &'static str,
}

const SI: &str = "SI coherent unit (SI Brochure, 9th ed., 2019)";
const PREFIX: &str = "SI prefix (SI Brochure, 9th ed., 2019, Table 7)";
const TABLE8: &str =
    "non-SI unit accepted for use with the SI (SI Brochure, 9th ed., 2019, Table 8)";
const NIST: &str = "NIST SP 811 (2008) Appendix B.8";
const NIST_TEMP: &str = "NIST SP 811 (2008) Appendix B.8 and B.9 (temperature formulas)";
const DERIVED: &str =
    "derived from the exact definitions of its parts in NIST SP 811 (2008) Appendix B.8";
const ACRE_SOURCE: &str =
    "NIST Handbook 44, Appendix C: 1 acre = 43 560 ft^2, with the international \
     foot of NIST SP 811 (2008) Appendix B.8 (the U.S. survey foot was retired on 2023-01-01)";

// Exact definitions the factors are built from (NIST SP 811 (2008) Appendix B.8).
const FT: f64 = 0.3048;
const IN: f64 = 0.0254;
const LB: f64 = 0.453_592_37;
const G_N: f64 = 9.806_65;
const LBF: f64 = LB * G_N;
const BTU_IT: f64 = 1_055.055_852_62;
const HOUR: f64 = 3600.0;
const DAY: f64 = 86_400.0;
/// The year is 365 days of 86 400 s (NIST SP 811 (2008) B.8, "year (365 days)"): the
/// calendar year of engineering practice, not the Julian year of 365.25 days.
const YEAR_365: f64 = 365.0 * DAY;
const GAL_US: f64 = 231.0 * IN * IN * IN;
const DEG_F: f64 = 5.0 / 9.0;

const fn u(
    symbol: &'static str,
    aliases: &'static [&'static str],
    dimension: &'static str,
    factor: f64,
    source: &'static str,
) -> Unit {
    Unit {
        symbol,
        aliases,
        dimension,
        factor,
        offset: 0.0,
        source,
    }
}

/// Every unit, grouped by dimension; the first row of each dimension is its SI unit.
pub static UNITS: &[Unit] = &[
    // length
    u("m", &["metre", "meter"], "length", 1.0, SI),
    u("mm", &[], "length", 1e-3, PREFIX),
    u("cm", &[], "length", 1e-2, PREFIX),
    u("km", &[], "length", 1e3, PREFIX),
    u("um", &["µm", "μm"], "length", 1e-6, PREFIX),
    u("in", &["inch"], "length", IN, NIST),
    u("ft", &["foot", "feet"], "length", FT, NIST),
    u("yd", &["yard"], "length", 0.9144, NIST),
    u("mi", &["mile"], "length", 1609.344, NIST),
    // area
    u("m^2", &["m2", "m²"], "area", 1.0, SI),
    u("mm^2", &["mm2", "mm²"], "area", 1e-6, PREFIX),
    u("cm^2", &["cm2", "cm²"], "area", 1e-4, PREFIX),
    u("ha", &["hectare"], "area", 1e4, TABLE8),
    u("in^2", &["in2", "in²", "sq in"], "area", IN * IN, NIST),
    u("ft^2", &["ft2", "ft²", "sq ft"], "area", FT * FT, NIST),
    // The international acre, 4046.8564224 m^2 exactly; the survey acre (4046.873 m^2)
    // disagreed with the international foot above by 2 parts per million.
    u("acre", &["ac"], "area", 43_560.0 * FT * FT, ACRE_SOURCE),
    // volume
    u("m^3", &["m3", "m³"], "volume", 1.0, SI),
    u("L", &["l", "litre", "liter"], "volume", 1e-3, TABLE8),
    u(
        "ft^3",
        &["ft3", "ft³", "cu ft"],
        "volume",
        FT * FT * FT,
        NIST,
    ),
    u("gal", &["US gal", "gallon"], "volume", GAL_US, NIST),
    // volume flow
    u("m^3/s", &["m3/s", "m³/s", "cumec"], "volume_flow", 1.0, SI),
    u(
        "m^3/h",
        &["m3/h", "m³/h"],
        "volume_flow",
        1.0 / HOUR,
        TABLE8,
    ),
    u("m^3/d", &["m3/d", "m³/d"], "volume_flow", 1.0 / DAY, TABLE8),
    u("L/s", &["l/s"], "volume_flow", 1e-3, TABLE8),
    u("L/min", &["l/min"], "volume_flow", 1e-3 / 60.0, TABLE8),
    u(
        "ft^3/s",
        &["ft3/s", "ft³/s", "cfs"],
        "volume_flow",
        FT * FT * FT,
        NIST,
    ),
    u(
        "gal/min",
        &["gpm", "US gpm"],
        "volume_flow",
        GAL_US / 60.0,
        NIST,
    ),
    // velocity
    u("m/s", &[], "velocity", 1.0, SI),
    u("km/h", &[], "velocity", 1.0 / 3.6, NIST),
    u("ft/s", &["fps"], "velocity", FT, NIST),
    u("mi/h", &["mph"], "velocity", 1609.344 / HOUR, NIST),
    // acceleration
    u("m/s^2", &["m/s2", "m/s²"], "acceleration", 1.0, SI),
    u("ft/s^2", &["ft/s2", "ft/s²"], "acceleration", FT, NIST),
    u("gn", &["g0"], "acceleration", G_N, NIST),
    // mass
    u("kg", &[], "mass", 1.0, SI),
    u("g", &[], "mass", 1e-3, PREFIX),
    u("t", &["tonne"], "mass", 1e3, TABLE8),
    u("lb", &["lbm"], "mass", LB, NIST),
    u("slug", &[], "mass", LBF / FT, NIST),
    // mass flow
    u("kg/s", &[], "mass_flow", 1.0, SI),
    u("kg/h", &[], "mass_flow", 1.0 / HOUR, TABLE8),
    u("lb/s", &["lbm/s"], "mass_flow", LB, NIST),
    u("lb/h", &["lbm/h"], "mass_flow", LB / HOUR, NIST),
    // mass per length
    u("kg/m", &[], "mass_per_length", 1.0, SI),
    u("lb/ft", &["lbm/ft"], "mass_per_length", LB / FT, NIST),
    // force
    u("N", &["newton"], "force", 1.0, SI),
    u("kN", &[], "force", 1e3, PREFIX),
    u("MN", &[], "force", 1e6, PREFIX),
    u("lbf", &[], "force", LBF, NIST),
    u("kip", &[], "force", 1e3 * LBF, NIST),
    u("kgf", &[], "force", G_N, NIST),
    // force per length (distributed load)
    u("N/m", &[], "force_per_length", 1.0, SI),
    u("kN/m", &[], "force_per_length", 1e3, PREFIX),
    u("lbf/ft", &["plf"], "force_per_length", LBF / FT, NIST),
    u("lbf/in", &["pli"], "force_per_length", LBF / IN, NIST),
    u(
        "kip/ft",
        &["klf"],
        "force_per_length",
        1e3 * LBF / FT,
        DERIVED,
    ),
    // pressure and stress
    u("Pa", &["pascal"], "pressure", 1.0, SI),
    u("kPa", &[], "pressure", 1e3, PREFIX),
    u(
        "MPa",
        &["N/mm^2", "N/mm2", "N/mm²"],
        "pressure",
        1e6,
        PREFIX,
    ),
    u("GPa", &[], "pressure", 1e9, PREFIX),
    u("bar", &[], "pressure", 1e5, NIST),
    u("atm", &[], "pressure", 101_325.0, NIST),
    u(
        "psi",
        &["lbf/in^2", "lbf/in2"],
        "pressure",
        LBF / (IN * IN),
        NIST,
    ),
    u(
        "ksi",
        &["kip/in^2", "kip/in2"],
        "pressure",
        1e3 * LBF / (IN * IN),
        NIST,
    ),
    u(
        "psf",
        &["lbf/ft^2", "lbf/ft2"],
        "pressure",
        LBF / (FT * FT),
        NIST,
    ),
    u("mmHg", &[], "pressure", 1.333_224e2, NIST),
    // The symbol ftH2O is NIST's conventional foot of water (not the 39.2 °F one).
    u("ftH2O", &["ft H2O"], "pressure", 2.989_067e3, NIST),
    // unit weight (weight per volume)
    u("N/m^3", &["N/m3", "N/m³"], "unit_weight", 1.0, SI),
    u("kN/m^3", &["kN/m3", "kN/m³"], "unit_weight", 1e3, PREFIX),
    u(
        "lbf/ft^3",
        &["lbf/ft3", "pcf"],
        "unit_weight",
        LBF / (FT * FT * FT),
        DERIVED,
    ),
    // density
    u("kg/m^3", &["kg/m3", "kg/m³"], "density", 1.0, SI),
    u("g/cm^3", &["g/cm3", "g/cm³"], "density", 1e3, PREFIX),
    u(
        "lb/ft^3",
        &["lb/ft3", "lbm/ft^3"],
        "density",
        LB / (FT * FT * FT),
        NIST,
    ),
    // energy
    u("J", &["joule"], "energy", 1.0, SI),
    u("kJ", &[], "energy", 1e3, PREFIX),
    u("MJ", &[], "energy", 1e6, PREFIX),
    u("kWh", &["kW*h"], "energy", 3.6e6, NIST),
    u("Btu", &["BTU", "Btu_IT"], "energy", BTU_IT, NIST),
    u("ft*lbf", &["ft-lbf", "ft·lbf"], "energy", FT * LBF, NIST),
    // power
    u("W", &["watt"], "power", 1.0, SI),
    u("kW", &[], "power", 1e3, PREFIX),
    u("MW", &[], "power", 1e6, PREFIX),
    u("hp", &[], "power", 550.0 * FT * LBF, NIST),
    u("Btu/h", &["BTU/h", "Btuh"], "power", BTU_IT / HOUR, NIST),
    // time
    u("s", &["sec"], "time", 1.0, SI),
    u("ms", &[], "time", 1e-3, PREFIX),
    u("min", &[], "time", 60.0, TABLE8),
    u("h", &["hr", "hour"], "time", HOUR, TABLE8),
    u("d", &["day"], "time", DAY, TABLE8),
    // 365 days: see YEAR_365.
    u("yr", &["year", "a"], "time", YEAR_365, NIST),
    // frequency
    u("Hz", &[], "frequency", 1.0, SI),
    u("kHz", &[], "frequency", 1e3, PREFIX),
    // temperature (a reading)
    u("K", &["kelvin"], "temperature", 1.0, SI),
    Unit {
        symbol: "°C",
        aliases: &["degC", "C", "celsius"],
        dimension: "temperature",
        factor: 1.0,
        offset: 273.15,
        source: NIST_TEMP,
    },
    Unit {
        symbol: "°F",
        aliases: &["degF", "F", "fahrenheit"],
        dimension: "temperature",
        factor: DEG_F,
        offset: 459.67 * DEG_F,
        source: NIST_TEMP,
    },
    u(
        "°R",
        &["degR", "R", "rankine"],
        "temperature",
        DEG_F,
        NIST_TEMP,
    ),
    // temperature difference (an interval)
    u("K", &["kelvin"], "temperature_difference", 1.0, SI),
    u(
        "Δ°C",
        &["delta degC", "ddegC"],
        "temperature_difference",
        1.0,
        NIST_TEMP,
    ),
    u(
        "Δ°F",
        &["delta degF", "ddegF"],
        "temperature_difference",
        DEG_F,
        NIST_TEMP,
    ),
    u(
        "Δ°R",
        &["delta degR", "ddegR"],
        "temperature_difference",
        DEG_F,
        NIST_TEMP,
    ),
    // angle
    u("rad", &["radian"], "angle", 1.0, SI),
    u(
        "°",
        &["deg", "degree"],
        "angle",
        std::f64::consts::PI / 180.0,
        TABLE8,
    ),
    // dynamic viscosity
    u(
        "Pa*s",
        &["Pa.s", "Pa·s", "N*s/m^2"],
        "dynamic_viscosity",
        1.0,
        SI,
    ),
    u(
        "mPa*s",
        &["mPa.s", "mPa·s"],
        "dynamic_viscosity",
        1e-3,
        PREFIX,
    ),
    u("cP", &["centipoise"], "dynamic_viscosity", 1e-3, NIST),
    u("P", &["poise"], "dynamic_viscosity", 0.1, NIST),
    u(
        "lbf*s/ft^2",
        &["lbf·s/ft²"],
        "dynamic_viscosity",
        LBF / (FT * FT),
        NIST,
    ),
    // kinematic viscosity
    u("m^2/s", &["m2/s", "m²/s"], "kinematic_viscosity", 1.0, SI),
    u(
        "mm^2/s",
        &["mm2/s", "mm²/s"],
        "kinematic_viscosity",
        1e-6,
        PREFIX,
    ),
    u("cSt", &["centistokes"], "kinematic_viscosity", 1e-6, NIST),
    u("St", &["stokes"], "kinematic_viscosity", 1e-4, NIST),
    u(
        "ft^2/s",
        &["ft2/s", "ft²/s"],
        "kinematic_viscosity",
        FT * FT,
        NIST,
    ),
    // diffusivity (thermal diffusivity, coefficient of consolidation)
    u("m^2/s", &["m2/s", "m²/s"], "diffusivity", 1.0, SI),
    u("mm^2/s", &["mm2/s", "mm²/s"], "diffusivity", 1e-6, PREFIX),
    u("m^2/d", &["m2/d", "m²/d"], "diffusivity", 1.0 / DAY, TABLE8),
    u(
        "m^2/yr",
        &["m2/yr", "m²/yr", "m^2/year"],
        "diffusivity",
        1.0 / YEAR_365,
        DERIVED,
    ),
    u(
        "ft^2/h",
        &["ft2/h", "ft²/h"],
        "diffusivity",
        FT * FT / HOUR,
        NIST,
    ),
    u(
        "ft^2/d",
        &["ft2/d", "ft²/d"],
        "diffusivity",
        FT * FT / DAY,
        DERIVED,
    ),
    // second moment of area
    u("m^4", &["m4", "m⁴"], "second_moment_of_area", 1.0, SI),
    u(
        "mm^4",
        &["mm4", "mm⁴"],
        "second_moment_of_area",
        1e-12,
        PREFIX,
    ),
    u(
        "cm^4",
        &["cm4", "cm⁴"],
        "second_moment_of_area",
        1e-8,
        PREFIX,
    ),
    u(
        "in^4",
        &["in4", "in⁴"],
        "second_moment_of_area",
        IN * IN * IN * IN,
        NIST,
    ),
    u(
        "ft^4",
        &["ft4", "ft⁴"],
        "second_moment_of_area",
        FT * FT * FT * FT,
        NIST,
    ),
    // heat transfer coefficient
    u(
        "W/(m^2*K)",
        &["W/m^2K", "W/m2K", "W/(m²·K)"],
        "heat_transfer_coefficient",
        1.0,
        SI,
    ),
    u(
        "Btu/(h*ft^2*°F)",
        &["Btu/(h*ft^2*degF)", "Btu/h-ft2-F"],
        "heat_transfer_coefficient",
        BTU_IT / (HOUR * FT * FT * DEG_F),
        NIST,
    ),
    // thermal conductivity
    u(
        "W/(m*K)",
        &["W/mK", "W/(m·K)"],
        "thermal_conductivity",
        1.0,
        SI,
    ),
    u(
        "Btu*ft/(h*ft^2*°F)",
        &["Btu*ft/(h*ft^2*degF)", "Btu/h-ft-F"],
        "thermal_conductivity",
        BTU_IT * FT / (HOUR * FT * FT * DEG_F),
        NIST,
    ),
    // specific heat capacity
    u("J/(kg*K)", &["J/kgK", "J/(kg·K)"], "specific_heat", 1.0, SI),
    u(
        "kJ/(kg*K)",
        &["kJ/kgK", "kJ/(kg·K)"],
        "specific_heat",
        1e3,
        PREFIX,
    ),
    u(
        "Btu/(lb*°F)",
        &["Btu/(lb*degF)", "Btu/lb-F"],
        "specific_heat",
        BTU_IT / (LB * DEG_F),
        NIST,
    ),
    // electric current, potential, resistance
    u("A", &["ampere"], "current", 1.0, SI),
    u("mA", &[], "current", 1e-3, PREFIX),
    u("uA", &["µA", "μA"], "current", 1e-6, PREFIX),
    u("nA", &[], "current", 1e-9, PREFIX),
    u("pA", &[], "current", 1e-12, PREFIX),
    u("V", &["volt"], "voltage", 1.0, SI),
    u("mV", &[], "voltage", 1e-3, PREFIX),
    u("kV", &[], "voltage", 1e3, PREFIX),
    u("ohm", &["Ω", "Ohm"], "resistance", 1.0, SI),
    u("mohm", &["mΩ"], "resistance", 1e-3, PREFIX),
    u("kohm", &["kΩ"], "resistance", 1e3, PREFIX),
    u("Mohm", &["MΩ"], "resistance", 1e6, PREFIX),
    // molar volume
    u("m^3/mol", &["m3/mol", "m³/mol"], "molar_volume", 1.0, SI),
    u(
        "cm^3/mol",
        &["cm3/mol", "cm³/mol"],
        "molar_volume",
        1e-6,
        PREFIX,
    ),
    u("L/mol", &["l/mol"], "molar_volume", 1e-3, TABLE8),
    u(
        "ft^3/lbmol",
        &["ft3/lbmol"],
        "molar_volume",
        FT * FT * FT / (LB * 1e3),
        DERIVED,
    ),
    // Manning's roughness coefficient, in its SI form
    u("s/m^(1/3)", &["s/m^1/3", "SI"], "manning_n", 1.0, SI),
    // pure numbers
    u("1", &["-", ""], "dimensionless", 1.0, SI),
    u(
        "%",
        &["percent"],
        "dimensionless",
        0.01,
        "SI Brochure (9th ed., 2019) 5.4.7",
    ),
    // amount of substance (for compound units such as J/(mol*K))
    u("mol", &["mole"], "amount_of_substance", 1.0, SI),
    u("kmol", &[], "amount_of_substance", 1e3, PREFIX),
    // money: no conversion between currencies
    u("currency", &[], "money", 1.0, "common practice, no source"),
];

/// Every dimension, in table order.
pub fn dimensions() -> Vec<&'static str> {
    let mut out: Vec<&'static str> = Vec::new();
    for unit in UNITS {
        if !out.contains(&unit.dimension) {
            out.push(unit.dimension);
        }
    }
    out
}

/// The symbols of every unit of `dimension` (empty for an unknown dimension); the first
/// is the SI unit.
pub fn units_of(dimension: &str) -> Vec<&'static str> {
    UNITS
        .iter()
        .filter(|unit| unit.dimension == dimension)
        .map(|unit| unit.symbol)
        .collect()
}

/// The SI unit of `dimension`.
pub fn si_unit(dimension: &str) -> Option<&'static str> {
    UNITS
        .iter()
        .find(|unit| unit.dimension == dimension)
        .map(|unit| unit.symbol)
}

/// Spaces dropped and Unicode powers and dots folded, so "m³/s" and "m^3 / s" match.
/// An iterator, so matching against the table allocates nothing.
fn normalized(text: &str) -> impl Iterator<Item = char> + '_ {
    text.chars().flat_map(|c| {
        let folded: &[char] = match c {
            ' ' | '\t' => &[],
            '²' => &['^', '2'],
            '³' => &['^', '3'],
            '⁴' => &['^', '4'],
            '·' | '⋅' => &['*'],
            'μ' => &['µ'],
            _ => return Folded::One(Some(c)),
        };
        Folded::Many(folded.iter().copied())
    })
}

enum Folded {
    One(Option<char>),
    Many(std::iter::Copied<std::slice::Iter<'static, char>>),
}

impl Iterator for Folded {
    type Item = char;
    fn next(&mut self) -> Option<char> {
        match self {
            Folded::One(c) => c.take(),
            Folded::Many(it) => it.next(),
        }
    }
}

fn normalize(text: &str) -> String {
    normalized(text).collect()
}

/// Every row whose symbol or alias is `symbol` (one per dimension it belongs to).
pub fn lookup(symbol: &str) -> Vec<&'static Unit> {
    let wanted = normalize(symbol);
    index().get(&wanted).cloned().unwrap_or_default()
}

/// Every normalised symbol and alias, mapped to its rows in table order; built once.
fn index() -> &'static HashMap<String, Vec<&'static Unit>> {
    static INDEX: OnceLock<HashMap<String, Vec<&'static Unit>>> = OnceLock::new();
    INDEX.get_or_init(|| {
        let mut map: HashMap<String, Vec<&'static Unit>> = HashMap::new();
        for unit in UNITS {
            let mut names: Vec<String> = std::iter::once(unit.symbol)
                .chain(unit.aliases.iter().copied())
                .map(normalize)
                .collect();
            names.dedup();
            for name in names {
                let rows = map.entry(name).or_default();
                if !rows.iter().any(|r| std::ptr::eq(*r, unit)) {
                    rows.push(unit);
                }
            }
        }
        map
    })
}

fn unknown_unit(symbol: &str) -> InputError {
    InputError::new(
        "unknown-unit",
        format!("unknown unit \"{symbol}\"; write it as listed in the unit table, for example m, kPa, ft^3/s, degC"),
    )
}

/// The row for `symbol` within `dimension`, with an error that names both when the
/// unit is unknown or belongs to another dimension.
pub fn unit_in(symbol: &str, dimension: &str) -> Result<&'static Unit, InputError> {
    let known = units_of(dimension);
    if known.is_empty() {
        return Err(InputError::new(
            "unknown-dimension",
            format!("unknown dimension \"{dimension}\""),
        ));
    }
    let rows = lookup(symbol);
    if let Some(row) = rows.iter().find(|row| row.dimension == dimension) {
        return Ok(row);
    }
    let list = known.join(", ");
    match rows.first() {
        Some(row) => Err(InputError::new(
            "incompatible-unit",
            format!(
                "unit \"{symbol}\" is a unit of {}, not of {dimension}; units of {dimension}: {list}",
                row.dimension.replace('_', " ")
            ),
        )),
        None => Err(InputError::new(
            "unknown-unit",
            format!("unknown unit \"{symbol}\" for {dimension}; units of {dimension}: {list}"),
        )),
    }
}

fn first(symbol: &str) -> Result<&'static Unit, InputError> {
    lookup(symbol)
        .into_iter()
        .next()
        .ok_or_else(|| unknown_unit(symbol))
}

/// `value` in `unit` expressed in the SI unit of its dimension.
pub fn to_si(value: f64, unit: &str) -> Result<f64, InputError> {
    let row = first(unit)?;
    Ok(value * row.factor + row.offset)
}

/// A value in SI expressed in `unit`.
pub fn from_si(value: f64, unit: &str) -> Result<f64, InputError> {
    let row = first(unit)?;
    Ok((value - row.offset) / row.factor)
}

/// `value` in `unit` of `dimension`, in SI; the error names the unit and the dimension.
pub fn to_si_in(value: f64, unit: &str, dimension: &str) -> Result<f64, InputError> {
    let row = unit_in(unit, dimension)?;
    Ok(value * row.factor + row.offset)
}

/// A value in SI of `dimension`, expressed in `unit`.
pub fn from_si_in(value: f64, unit: &str, dimension: &str) -> Result<f64, InputError> {
    let row = unit_in(unit, dimension)?;
    Ok((value - row.offset) / row.factor)
}

/// Converts `value` from one unit to another of the same dimension.
pub fn convert(value: f64, from: &str, to: &str) -> Result<f64, InputError> {
    require_finite(value, &format!("the value to convert from {from}"))?;
    let froms = lookup(from);
    if froms.is_empty() {
        return Err(unknown_unit(from));
    }
    let tos = lookup(to);
    if tos.is_empty() {
        return Err(unknown_unit(to));
    }
    for a in &froms {
        if let Some(b) = tos.iter().find(|b| b.dimension == a.dimension) {
            return Ok((value * a.factor + a.offset - b.offset) / b.factor);
        }
    }
    Err(InputError::new(
        "incompatible-unit",
        format!(
            "cannot convert {from} ({}) to {to} ({}): the dimensions differ",
            froms[0].dimension.replace('_', " "),
            tos[0].dimension.replace('_', " ")
        ),
    ))
}

/// The dimension of a row of the table (its dimension name in [`crate::dimension::NAMED`]).
pub fn dimension_of(unit: &Unit) -> Result<Dimension, InputError> {
    Dimension::named(unit.dimension).ok_or_else(|| {
        InputError::new(
            "unknown-dimension",
            format!(
                "the unit {} has a dimension, {}, with no exponents",
                unit.symbol, unit.dimension
            ),
        )
    })
}

/// A unit as written: one unit of the table, or a product and quotient of table units
/// with powers (`kg*m/s^2`, `W/(m^2*K)`, `s/m^(1/3)`, `lbf*s^2/ft`).
///
/// `si = value * factor + offset`. The offset is non-zero only for a temperature
/// reading written alone (`degC`, `°F`); inside a compound unit a temperature unit is an
/// interval (`W/(m^2*°C)` is `W/(m^2*K)`), as the SI Brochure (9th ed., 2019, 2.3.1)
/// writes derived units with the degree Celsius.
#[derive(Debug, Clone, PartialEq)]
pub struct UnitExpression {
    /// The text as given.
    pub text: String,
    pub factor: f64,
    pub offset: f64,
    pub dimension: Dimension,
    /// The table's dimension name when the text is one unit of the table.
    pub dimension_name: Option<&'static str>,
}

impl UnitExpression {
    /// `value` in this unit, in SI.
    pub fn to_si(&self, value: f64) -> f64 {
        value * self.factor + self.offset
    }

    /// A value in SI, in this unit.
    pub fn from_si(&self, value: f64) -> f64 {
        (value - self.offset) / self.factor
    }
}

/// The longest unit text read, in characters.
pub const MAX_UNIT_CHARS: usize = 200;

fn unit_error(code: &'static str, message: String, position: usize) -> InputError {
    InputError::at(code, message, position)
}

/// Reads a unit: a symbol of the table (any spelling it accepts), or else a product
/// and quotient of them. Grammar: units joined by `*` (or `·`) and at most one `/` per
/// level of parentheses, which ends the level (write `W/(m^2*K)`, not `W/m^2/K` or
/// `J/kg*K`: those are ambiguous); a power after a unit or a parenthesis: `^2`, `^-1`,
/// `^0.5`, `^(1/3)`, `²`. Errors carry the character position within `text`.
///
/// ```
/// use tacit::units::parse_unit;
/// let g = parse_unit("ft/s^2").unwrap();
/// assert_eq!(g.factor, 0.3048);
/// let r = parse_unit("J/(mol*K)").unwrap();
/// assert_eq!(r.dimension.in_words(), "m^2·kg·s^-2·K^-1·mol^-1");
/// assert_eq!(parse_unit("degC").unwrap().offset, 273.15);
/// let e = parse_unit("kg*furlong").unwrap_err();
/// assert_eq!((e.code, e.position), ("unknown-unit", Some(3)));
/// ```
pub fn parse_unit(text: &str) -> Result<UnitExpression, InputError> {
    let n = text.chars().count();
    if n > MAX_UNIT_CHARS {
        return Err(unit_error(
            "unit-too-long",
            format!("the unit is {n} characters long; the limit is {MAX_UNIT_CHARS}"),
            0,
        ));
    }
    if text.trim().is_empty() {
        return Err(unit_error(
            "empty-unit",
            "the unit is empty: write one such as m, kPa or m^3/s (1 for a pure number)".into(),
            0,
        ));
    }
    if let Some(row) = lookup(text).first() {
        return Ok(UnitExpression {
            text: text.to_string(),
            factor: row.factor,
            offset: row.offset,
            dimension: dimension_of(row)?,
            dimension_name: Some(row.dimension),
        });
    }
    let (factor, dimension) = compound(text)?;
    if !(factor.is_finite() && factor > 0.0) {
        return Err(unit_error(
            "bad-unit",
            format!("the unit `{text}` is too large or too small to use"),
            0,
        ));
    }
    Ok(UnitExpression {
        text: text.to_string(),
        factor,
        offset: 0.0,
        dimension,
        dimension_name: None,
    })
}

/// One level of parentheses while reading a compound unit.
struct Level {
    factor: f64,
    dimension: Dimension,
    /// Position of its `(` (0 for the whole text).
    open: usize,
    /// A `/` was seen on this level: nothing more may follow the next unit.
    divided: bool,
    /// The next operand divides.
    next_divides: bool,
    /// An operand is expected (at the start and after an operator).
    want_operand: bool,
}

impl Level {
    fn new(open: usize) -> Level {
        Level {
            factor: 1.0,
            dimension: Dimension::NONE,
            open,
            divided: false,
            next_divides: false,
            want_operand: true,
        }
    }
}

fn is_unit_char(c: char) -> bool {
    !(c.is_whitespace() || "*/^()·⋅²³⁴[]".contains(c))
}

fn overflow(text: &str, at: usize) -> InputError {
    unit_error(
        "bad-unit",
        format!("the powers in the unit `{text}` are too large"),
        at,
    )
}

/// A product and quotient of table units with powers: (factor, dimension).
fn compound(text: &str) -> Result<(f64, Dimension), InputError> {
    let chars: Vec<char> = text.chars().collect();
    let mut levels = vec![Level::new(0)];
    // The operand just read (a unit or a closed parenthesis), waiting for a power.
    let mut pending: Option<(f64, Dimension, usize)> = None;
    let mut i = 0;
    let combine = |levels: &mut Vec<Level>, p: (f64, Dimension, usize)| -> Result<(), InputError> {
        let Some(level) = levels.last_mut() else {
            return Ok(());
        };
        let (f, d, at) = p;
        if level.next_divides {
            level.factor /= f;
            level.dimension = level.dimension.div(&d).ok_or_else(|| overflow(text, at))?;
        } else {
            level.factor *= f;
            level.dimension = level.dimension.mul(&d).ok_or_else(|| overflow(text, at))?;
        }
        level.want_operand = false;
        Ok(())
    };
    while i < chars.len() {
        let c = chars[i];
        match c {
            c if c.is_whitespace() => i += 1,
            '(' => {
                if pending.is_some() {
                    return Err(missing_operator(text, i));
                }
                levels.push(Level::new(i));
                i += 1;
            }
            ')' => {
                if let Some(p) = pending.take() {
                    combine(&mut levels, p)?;
                }
                if levels.len() < 2 {
                    return Err(unit_error(
                        "bad-unit",
                        format!("in the unit `{text}`, this `)` has no matching `(`"),
                        i,
                    ));
                }
                let Some(level) = levels.pop() else {
                    return Err(overflow(text, i));
                };
                if level.want_operand {
                    return Err(missing_unit(text, i));
                }
                pending = Some((level.factor, level.dimension, level.open));
                i += 1;
            }
            '*' | '·' | '⋅' | '/' => {
                match pending.take() {
                    Some(p) => combine(&mut levels, p)?,
                    None => return Err(missing_unit(text, i)),
                }
                let Some(level) = levels.last_mut() else {
                    return Err(overflow(text, i));
                };
                if level.divided {
                    return Err(unit_error(
                        "ambiguous-unit",
                        format!(
                            "in the unit `{text}`, `{c}` follows a `/` on the same level, which \
                             reads two ways; group with parentheses, as in W/(m^2*K)"
                        ),
                        i,
                    ));
                }
                level.divided = c == '/';
                level.next_divides = c == '/';
                level.want_operand = true;
                i += 1;
            }
            '^' | '²' | '³' | '⁴' => {
                let Some((f, d, at)) = pending.take() else {
                    return Err(unit_error(
                        "bad-unit",
                        format!("in the unit `{text}`, a power must follow a unit"),
                        i,
                    ));
                };
                let (e, next) = match c {
                    '²' => (Ratio::integer(2), i + 1),
                    '³' => (Ratio::integer(3), i + 1),
                    '⁴' => (Ratio::integer(4), i + 1),
                    _ => exponent(text, &chars, i)?,
                };
                let d = d.pow(e).ok_or_else(|| overflow(text, i))?;
                let f = match e.as_integer().and_then(|k| i32::try_from(k).ok()) {
                    Some(k) => f.powi(k),
                    None => f.powf(e.to_f64()),
                };
                pending = Some((f, d, at));
                i = next;
            }
            '[' | ']' => {
                return Err(unit_error(
                    "bad-unit",
                    format!("`{c}` cannot appear inside a unit"),
                    i,
                ))
            }
            _ => {
                let start = i;
                while i < chars.len() && is_unit_char(chars[i]) {
                    i += 1;
                }
                if pending.is_some() {
                    return Err(missing_operator(text, start));
                }
                let name: String = chars[start..i].iter().collect();
                let Some(row) = lookup(&name).into_iter().next() else {
                    let hint = if name.chars().all(|c| c.is_ascii_digit() || c == '.') {
                        " (a number is not a unit: write the number before the brackets)"
                    } else {
                        ""
                    };
                    return Err(unit_error(
                        "unknown-unit",
                        format!("unknown unit `{name}` in `{text}`{hint}; units are written as in the unit table, for example m, kPa, ft^3/s, degC"),
                        start,
                    ));
                };
                // Inside a compound unit a temperature is an interval: no offset.
                pending = Some((row.factor, dimension_of(row)?, start));
            }
        }
    }
    if let Some(p) = pending.take() {
        combine(&mut levels, p)?;
    }
    if levels.len() > 1 {
        let open = levels.last().map_or(0, |l| l.open);
        return Err(unit_error(
            "bad-unit",
            format!("in the unit `{text}`, this `(` is never closed"),
            open,
        ));
    }
    match levels.pop() {
        Some(level) if !level.want_operand => Ok((level.factor, level.dimension)),
        _ => Err(missing_unit(text, chars.len())),
    }
}

fn missing_unit(text: &str, at: usize) -> InputError {
    unit_error(
        "bad-unit",
        format!("in the unit `{text}`, a unit is missing here"),
        at,
    )
}

fn missing_operator(text: &str, at: usize) -> InputError {
    unit_error(
        "bad-unit",
        format!(
            "in the unit `{text}`, an operator is missing here: write * for a product, as in kN*m"
        ),
        at,
    )
}

/// Reads the power after `^` at `at`: `2`, `-1`, `0.5`, `(1/3)`, `(-2/3)`; returns it and
/// the position after it.
fn exponent(text: &str, chars: &[char], at: usize) -> Result<(Ratio, usize), InputError> {
    let bad = || {
        unit_error(
            "bad-unit",
            format!("in the unit `{text}`, a power is written ^2, ^-1, ^0.5 or ^(1/3)"),
            at,
        )
    };
    let mut i = at + 1;
    let grouped = chars.get(i) == Some(&'(');
    if grouped {
        i += 1;
    }
    let number = |i: &mut usize| -> Option<Ratio> {
        let start = *i;
        if matches!(chars.get(*i), Some('-') | Some('+')) {
            *i += 1;
        }
        while matches!(chars.get(*i), Some(c) if c.is_ascii_digit() || *c == '.') {
            *i += 1;
        }
        let s: String = chars[start..*i].iter().collect();
        let (sign, digits) = match s.strip_prefix('-') {
            Some(rest) => (-1, rest),
            None => (1, s.trim_start_matches('+')),
        };
        Ratio::from_decimal(digits)?.checked_mul(Ratio::integer(sign))
    };
    let mut e = number(&mut i).ok_or_else(bad)?;
    if grouped {
        if chars.get(i) == Some(&'/') {
            i += 1;
            let d = number(&mut i).ok_or_else(bad)?;
            e = e.checked_div(d).ok_or_else(bad)?;
        }
        if chars.get(i) != Some(&')') {
            return Err(bad());
        }
        i += 1;
    }
    Ok((e, i))
}
