//! Units for the variables of an equation set: the dimension check, and the
//! conversion of values to SI for the solve and back to the units asked for.
//!
//! The equations are evaluated in coherent SI units (m, kg, s, A, K, mol), the only
//! system in which a statement labelled `SI:` holds. Each variable (or definition)
//! given a unit converts as `si = value * factor + offset`:
//! - a temperature *reading* in °C or °F converts with its offset (20 °C is 293.15 K),
//!   and comes back with it;
//! - a temperature *difference* is given in K, Δ°C, Δ°F or Δ°R and converts by the
//!   factor alone (a rise of 18 Δ°F is 10 K). Give a difference in °C or °F and it is
//!   taken as a reading: the offset is added, which is wrong for a difference, so a
//!   variable that is a difference must use the Δ units (or K);
//! - a variable with no unit is used as given, in whatever consistent units the
//!   equations assume, and has an unknown dimension for the check.
//!
//! Results come back in the units asked for: the unknowns, the definitions that have a
//! unit, the history (x, step and brackets of a scalar solve; x of a coupled system)
//! and the derivatives of the sensitivities (the relative sensitivities are recomputed
//! from the converted values). Residuals stay in the SI units of each equation. The
//! tolerances apply to the SI values.
//!
//! ```
//! use tacit::equations::{quantities::{solve_in_units, VariableUnits}, EquationSet, UnknownSpec};
//! let set = EquationSet::parse("Q = V*pi*D^2/4").unwrap();
//! let units = VariableUnits::new(&set, &[("Q".into(), "gpm".into()), ("D".into(), "in".into()),
//!                                        ("V".into(), "ft/s".into())], &["Q", "D"]).unwrap();
//! let s = solve_in_units(&set, &[("Q".into(), 100.0), ("D".into(), 4.0)],
//!                        &[UnknownSpec::named("V")], &Default::default(), false, &units).unwrap();
//! // 100 gpm in a 4-inch pipe: 100 * 231 in^3 / 60 s over pi * (2 in)^2, in ft/s.
//! let v = 100.0 * 231.0 / 60.0 / (std::f64::consts::PI * 4.0) / 12.0;
//! assert!((s.unknowns[0].1 - v).abs() < 1e-12 * v);
//! ```

use std::collections::{HashMap, HashSet};

use super::dimensions;
use super::set::EquationSet;
use super::solve::{solve_set, SetSolution, UnknownSpec};
use crate::dimension::Dimension;
use crate::error::InputError;
use crate::methods::Options;
use crate::tolerances::Bounds;
use crate::units::{self, UnitExpression};

/// The most names given a unit in one request.
pub const MAX_UNITS: usize = 1000;

/// The unit of each named variable or definition of a set, checked against the set.
#[derive(Debug, Clone, Default)]
pub struct VariableUnits {
    units: HashMap<String, UnitExpression>,
    /// The dimension found for each definition (`None` where unknown), in text order.
    pub definition_dimensions: Vec<(String, Option<Dimension>)>,
}

impl VariableUnits {
    /// Reads `units` (name, unit text) for `set` and runs the dimension check.
    /// `also_variables` are the names given a value or solved for (see
    /// [`dimensions::check`]). Errors: a name the set does not use (`unknown-variable`),
    /// a name given twice (`duplicate-name`), a unit that cannot be read (its code,
    /// with the name in the message), a dimension error (with its position in the text).
    pub fn new(
        set: &EquationSet,
        units: &[(String, String)],
        also_variables: &[&str],
    ) -> Result<VariableUnits, InputError> {
        if units.len() > MAX_UNITS {
            return Err(InputError::new(
                "too-many-units",
                format!("{} units are given; the limit is {MAX_UNITS}", units.len()),
            ));
        }
        if units.is_empty() && !set.has_numbers_with_units() {
            // Only pure numbers have a dimension then, so no check can fail (see
            // `dimensions`): skip it, as most requests have no units.
            return Ok(VariableUnits {
                units: HashMap::new(),
                definition_dimensions: set
                    .definition_names()
                    .into_iter()
                    .map(|n| (n, None))
                    .collect(),
            });
        }
        let known: HashSet<String> = set
            .variables()
            .into_iter()
            .chain(set.definition_names())
            .chain(set.constants_used())
            .collect();
        let mut parsed: HashMap<String, UnitExpression> = HashMap::new();
        let mut dims: HashMap<String, Dimension> = HashMap::new();
        for (name, text) in units {
            if !known.contains(name) {
                return Err(InputError::new(
                    "unknown-variable",
                    format!("`{name}` is given a unit but appears in no equation or definition"),
                ));
            }
            let unit = units::parse_unit(text).map_err(|e| {
                InputError::new(e.code, format!("the unit of `{name}`: {}", e.message))
            })?;
            dims.insert(name.clone(), unit.dimension);
            if parsed.insert(name.clone(), unit).is_some() {
                return Err(InputError::new(
                    "duplicate-name",
                    format!("`{name}` is given a unit more than once"),
                ));
            }
        }
        let definition_dimensions = dimensions::check(set, &dims, also_variables)?;
        Ok(VariableUnits {
            units: parsed,
            definition_dimensions,
        })
    }

    /// The unit of `name`, if one was given.
    pub fn unit(&self, name: &str) -> Option<&UnitExpression> {
        self.units.get(name)
    }

    /// `value` of `name` in SI (unchanged when `name` has no unit).
    pub fn to_si(&self, name: &str, value: f64) -> f64 {
        self.unit(name).map_or(value, |u| u.to_si(value))
    }

    /// An SI value of `name` in its unit (unchanged when `name` has no unit).
    pub fn from_si(&self, name: &str, value: f64) -> f64 {
        self.unit(name).map_or(value, |u| u.from_si(value))
    }

    /// SI per unit of `name`: the scale of a difference or a step (1 with no unit).
    pub fn factor(&self, name: &str) -> f64 {
        self.unit(name).map_or(1.0, |u| u.factor)
    }

    fn bounds_to_si(&self, name: &str, b: Bounds) -> Bounds {
        let (lo, hi) = (self.to_si(name, b.lo), self.to_si(name, b.hi));
        Bounds {
            lo: lo.min(hi),
            hi: lo.max(hi),
        }
    }

    fn pair_from_si(&self, name: &str, p: Option<(f64, f64)>) -> Option<(f64, f64)> {
        p.map(|(a, b)| (self.from_si(name, a), self.from_si(name, b)))
    }
}

/// Solves `set` with every value, guess and bound in the units of `units` (SI or the
/// caller's own where a name has none), and gives the results in those units; see the
/// module documentation for what is converted.
pub fn solve_in_units(
    set: &EquationSet,
    knowns: &[(String, f64)],
    unknowns: &[UnknownSpec],
    options: &Options,
    sensitivities: bool,
    units: &VariableUnits,
) -> Result<SetSolution, InputError> {
    let knowns_si: Vec<(String, f64)> = knowns
        .iter()
        .map(|(n, v)| (n.clone(), units.to_si(n, *v)))
        .collect();
    for (name, v) in &knowns_si {
        if !v.is_finite() {
            return Err(InputError::new(
                "non-finite-input",
                format!("the value of `{name}` is not finite once converted to SI"),
            ));
        }
    }
    let unknowns_si: Vec<UnknownSpec> = unknowns
        .iter()
        .map(|u| UnknownSpec {
            name: u.name.clone(),
            guesses: u
                .guesses
                .map(|(a, b)| (units.to_si(&u.name, a), units.to_si(&u.name, b))),
            bounds: units.bounds_to_si(&u.name, u.bounds),
        })
        .collect();
    let mut s = solve_set(set, &knowns_si, &unknowns_si, options, sensitivities)?;
    for (name, v) in s.unknowns.iter_mut().chain(s.definitions.iter_mut()) {
        *v = units.from_si(name, *v);
    }
    if let (Some(sol), [(name, _)]) = (s.scalar.as_mut(), s.unknowns.as_slice()) {
        sol.root = units.from_si(name, sol.root);
        sol.residual_at = units.from_si(name, sol.residual_at);
        sol.bracket = units.pair_from_si(name, sol.bracket);
        let factor = units.factor(name);
        for row in &mut sol.history {
            row.x = units.from_si(name, row.x);
            row.step /= factor;
            row.bracket = units.pair_from_si(name, row.bracket);
        }
    }
    if let (Some(sys), [block]) = (s.system.as_mut(), s.blocks.as_slice()) {
        let names = &block.unknowns;
        for (x, name) in sys.x.iter_mut().zip(names) {
            *x = units.from_si(name, *x);
        }
        for row in &mut sys.history {
            for (x, name) in row.x.iter_mut().zip(names) {
                *x = units.from_si(name, *x);
            }
        }
    }
    let value_of = |name: &str| -> Option<f64> {
        s.unknowns
            .iter()
            .chain(knowns.iter())
            .find(|(n, _)| n == name)
            .map(|&(_, v)| v)
    };
    let converted: Vec<(f64, f64)> = s
        .sensitivities
        .iter()
        .map(|d| {
            if units.unit(&d.input).is_none() && units.unit(&d.unknown).is_none() {
                return (d.derivative, d.relative);
            }
            let derivative = d.derivative * units.factor(&d.input) / units.factor(&d.unknown);
            let relative = match (value_of(&d.unknown), value_of(&d.input)) {
                (Some(u), Some(p)) if u != 0.0 => derivative * p / u,
                _ => f64::NAN,
            };
            (derivative, relative)
        })
        .collect();
    for (d, (derivative, relative)) in s.sensitivities.iter_mut().zip(converted) {
        d.derivative = derivative;
        d.relative = relative;
    }
    Ok(s)
}
