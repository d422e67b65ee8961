//! What a caller sends: the typed requests of the boundary, read by serde with every
//! unknown field refused. The same structs serve JSON text (native callers, tests) and
//! JavaScript objects (`serde-wasm-bindgen` in the bindings); [`read`] turns a serde
//! error into an [`InputError`] that names the place (`request.tolerances.xRel`).

use std::collections::BTreeMap;

use serde::Deserialize;

use crate::error::InputError;
use crate::methods::{MethodKind, Options};
use crate::tolerances::{Bounds, Tolerances};

/// Reads a request of type `T` from any serde deserializer, naming the place of the
/// first bad field.
pub fn read<'de, T, D>(what: &str, deserializer: D) -> Result<T, InputError>
where
    T: Deserialize<'de>,
    D: serde::Deserializer<'de>,
{
    serde_path_to_error::deserialize(deserializer)
        .map_err(|e| bad_field(what, &e.path().to_string(), e.into_inner().to_string()))
}

/// The error of a request whose field at `path` (as serde_path_to_error writes it:
/// `tolerances.xRel`, `values[2]`, `.` or empty at the top) was refused with `message`.
/// The bindings track the path themselves and share this wording.
pub fn bad_field(what: &str, path: &str, message: String) -> InputError {
    let place = if path == "." || path.is_empty() {
        what.to_string()
    } else if let Some(rest) = path.strip_prefix('.') {
        format!("{what}{rest}")
    } else if path.starts_with('[') {
        format!("{what}{path}")
    } else {
        format!("{what}.{path}")
    };
    // "missing field `x`" names the field: say it where it is missing.
    if let Some(name) = message
        .strip_prefix("missing field `")
        .and_then(|rest| rest.split('`').next())
    {
        return InputError::new("bad-request", format!("{place}.{name} is missing"));
    }
    InputError::new("bad-request", format!("{place}: {message}"))
}

/// Reads a request of type `T` from JSON text.
pub fn from_json<T: for<'de> Deserialize<'de>>(what: &str, text: &str) -> Result<T, InputError> {
    if text.len() > crate::api::MAX_REQUEST_BYTES {
        return Err(InputError::new(
            "bad-request",
            format!(
                "{what} is {} bytes long; the limit is {}",
                text.len(),
                crate::api::MAX_REQUEST_BYTES
            ),
        ));
    }
    // serde's structs would also read a list, item by item, as their fields in order.
    if text.trim_start().starts_with('[') {
        return Err(InputError::new(
            "bad-request",
            format!("{what} must be an object {{…}}, got a list"),
        ));
    }
    let mut de = serde_json::Deserializer::from_str(text);
    let value = read(what, &mut de)?;
    de.end()
        .map_err(|e| InputError::new("bad-request", format!("{what}: {e}")))?;
    Ok(value)
}

/// Most entries of one list or map in a request (knowns, values, units, cash flows,
/// starting values): each is read into memory, so each is bounded.
pub const MAX_ENTRIES: usize = 10_000;

/// A quantity: a number (in the variable's own unit), `{value, unit}` or
/// `[value, unit]`.
#[derive(Debug, Clone, PartialEq)]
pub enum Quantity {
    Number(f64),
    Pair(f64, String),
    Object(QuantityObject),
}

#[derive(Debug, Clone, PartialEq, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct QuantityObject {
    pub value: f64,
    pub unit: String,
}

impl Quantity {
    pub fn value(&self) -> f64 {
        match self {
            Quantity::Number(v) | Quantity::Pair(v, _) => *v,
            Quantity::Object(o) => o.value,
        }
    }

    pub fn unit(&self) -> Option<&str> {
        match self {
            Quantity::Number(_) => None,
            Quantity::Pair(_, u) => Some(u),
            Quantity::Object(o) => Some(&o.unit),
        }
    }
}

/// A template's known: one quantity, or a list of numbers (the list input, such as
/// cash flows, in its own unit).
#[derive(Debug, Clone, PartialEq)]
pub enum Known {
    One(Quantity),
    List(Vec<f64>),
}

/// The number-or-object inputs are read by small visitors rather than `untagged`
/// enums: an untagged enum buffers the whole value first (deep recursion on a deeply
/// nested input) and can only say that no variant matched.
mod visit {
    use super::{Known, Quantity, QuantityObject, MAX_ENTRIES};
    use serde::de::{self, Deserialize, Deserializer, MapAccess, SeqAccess, Visitor};
    use std::fmt;

    /// A number or a string, the items of `[value, unit]` and of a list of numbers.
    pub(super) enum Item {
        Number(f64),
        Text(String),
    }

    impl<'de> Deserialize<'de> for Item {
        fn deserialize<D: Deserializer<'de>>(d: D) -> Result<Item, D::Error> {
            struct V;
            impl<'de> Visitor<'de> for V {
                type Value = Item;
                fn expecting(&self, f: &mut fmt::Formatter) -> fmt::Result {
                    f.write_str("a number or a unit")
                }
                fn visit_f64<E: de::Error>(self, v: f64) -> Result<Item, E> {
                    Ok(Item::Number(v))
                }
                fn visit_i64<E: de::Error>(self, v: i64) -> Result<Item, E> {
                    Ok(Item::Number(v as f64))
                }
                fn visit_u64<E: de::Error>(self, v: u64) -> Result<Item, E> {
                    Ok(Item::Number(v as f64))
                }
                fn visit_str<E: de::Error>(self, v: &str) -> Result<Item, E> {
                    Ok(Item::Text(v.to_string()))
                }
                fn visit_string<E: de::Error>(self, v: String) -> Result<Item, E> {
                    Ok(Item::Text(v))
                }
            }
            d.deserialize_any(V)
        }
    }

    /// What one visitor accepts: a quantity only, or a quantity or a list of numbers.
    struct KnownVisitor {
        lists: bool,
    }

    impl KnownVisitor {
        fn list_of<'de, A: SeqAccess<'de>>(first: f64, mut seq: A) -> Result<Known, A::Error> {
            let mut items = vec![first];
            while let Some(item) = seq.next_element::<f64>()? {
                if items.len() >= MAX_ENTRIES {
                    return Err(de::Error::custom(format!(
                        "a list of more than {MAX_ENTRIES} numbers; the limit is {MAX_ENTRIES}"
                    )));
                }
                items.push(item);
            }
            Ok(Known::List(items))
        }
    }

    impl<'de> Visitor<'de> for KnownVisitor {
        type Value = Known;
        fn expecting(&self, f: &mut fmt::Formatter) -> fmt::Result {
            if self.lists {
                f.write_str("a number, {value, unit}, [value, unit] or a list of numbers")
            } else {
                f.write_str("a number, {value, unit} or [value, unit]")
            }
        }
        fn visit_f64<E: de::Error>(self, v: f64) -> Result<Known, E> {
            Ok(Known::One(Quantity::Number(v)))
        }
        fn visit_i64<E: de::Error>(self, v: i64) -> Result<Known, E> {
            Ok(Known::One(Quantity::Number(v as f64)))
        }
        fn visit_u64<E: de::Error>(self, v: u64) -> Result<Known, E> {
            Ok(Known::One(Quantity::Number(v as f64)))
        }
        fn visit_seq<A: SeqAccess<'de>>(self, mut seq: A) -> Result<Known, A::Error> {
            let first = match seq.next_element::<Item>()? {
                Some(Item::Number(v)) => v,
                Some(Item::Text(_)) => {
                    return Err(de::Error::custom("[value, unit] starts with the number"))
                }
                None => return Err(de::Error::invalid_length(0, &self)),
            };
            match seq.next_element::<Item>()? {
                Some(Item::Text(unit)) => {
                    if seq.next_element::<de::IgnoredAny>()?.is_some() {
                        return Err(de::Error::custom(
                            "[value, unit] has two items; more were given",
                        ));
                    }
                    Ok(Known::One(Quantity::Pair(first, unit)))
                }
                Some(Item::Number(second)) if self.lists => {
                    match KnownVisitor::list_of(second, seq)? {
                        Known::List(mut rest) => {
                            rest.insert(0, first);
                            Ok(Known::List(rest))
                        }
                        one => Ok(one),
                    }
                }
                None if self.lists => Ok(Known::List(vec![first])),
                _ => Err(de::Error::custom("expected [value, unit]")),
            }
        }
        fn visit_map<A: MapAccess<'de>>(self, map: A) -> Result<Known, A::Error> {
            let o = QuantityObject::deserialize(de::value::MapAccessDeserializer::new(map))?;
            Ok(Known::One(Quantity::Object(o)))
        }
    }

    impl<'de> Deserialize<'de> for Known {
        fn deserialize<D: Deserializer<'de>>(d: D) -> Result<Known, D::Error> {
            d.deserialize_any(KnownVisitor { lists: true })
        }
    }

    impl<'de> Deserialize<'de> for Quantity {
        fn deserialize<D: Deserializer<'de>>(d: D) -> Result<Quantity, D::Error> {
            match d.deserialize_any(KnownVisitor { lists: false })? {
                Known::One(q) => Ok(q),
                Known::List(_) => Err(de::Error::custom("expected a quantity, got a list")),
            }
        }
    }

    impl<'de> Deserialize<'de> for super::UnknownInput {
        fn deserialize<D: Deserializer<'de>>(d: D) -> Result<super::UnknownInput, D::Error> {
            struct V;
            impl<'de> Visitor<'de> for V {
                type Value = super::UnknownInput;
                fn expecting(&self, f: &mut fmt::Formatter) -> fmt::Result {
                    f.write_str("a name or {name, guesses?, bounds?, unit?}")
                }
                fn visit_str<E: de::Error>(self, v: &str) -> Result<Self::Value, E> {
                    Ok(super::UnknownInput::Name(v.to_string()))
                }
                fn visit_string<E: de::Error>(self, v: String) -> Result<Self::Value, E> {
                    Ok(super::UnknownInput::Name(v))
                }
                fn visit_map<A: MapAccess<'de>>(self, map: A) -> Result<Self::Value, A::Error> {
                    let o = super::UnknownObject::deserialize(
                        de::value::MapAccessDeserializer::new(map),
                    )?;
                    Ok(super::UnknownInput::Spec(o))
                }
            }
            d.deserialize_any(V)
        }
    }
}

/// Readers of lists and maps that stop at [`MAX_ENTRIES`] (or a smaller limit) instead
/// of growing without bound; for `#[serde(deserialize_with)]`.
pub mod bounded {
    use serde::de::{self, Deserialize, Deserializer, MapAccess, SeqAccess, Visitor};
    use std::collections::BTreeMap;
    use std::fmt;
    use std::marker::PhantomData;

    struct SeqV<T>(usize, PhantomData<T>);

    impl<'de, T: Deserialize<'de>> Visitor<'de> for SeqV<T> {
        type Value = Vec<T>;
        fn expecting(&self, f: &mut fmt::Formatter) -> fmt::Result {
            write!(f, "a list of at most {} items", self.0)
        }
        fn visit_seq<A: SeqAccess<'de>>(self, mut seq: A) -> Result<Vec<T>, A::Error> {
            let mut out = Vec::new();
            while let Some(item) = seq.next_element::<T>()? {
                if out.len() >= self.0 {
                    return Err(de::Error::custom(format!(
                        "more than {} items; the limit is {}",
                        self.0, self.0
                    )));
                }
                out.push(item);
            }
            Ok(out)
        }
    }

    struct MapV<T>(PhantomData<T>);

    impl<'de, T: Deserialize<'de>> Visitor<'de> for MapV<T> {
        type Value = BTreeMap<String, T>;
        fn expecting(&self, f: &mut fmt::Formatter) -> fmt::Result {
            write!(f, "an object of at most {} names", super::MAX_ENTRIES)
        }
        fn visit_map<A: MapAccess<'de>>(self, mut map: A) -> Result<Self::Value, A::Error> {
            let mut out = BTreeMap::new();
            while let Some((k, v)) = map.next_entry::<String, T>()? {
                if out.len() >= super::MAX_ENTRIES {
                    return Err(de::Error::custom(format!(
                        "more than {0} names; the limit is {0}",
                        super::MAX_ENTRIES
                    )));
                }
                out.insert(k, v);
            }
            Ok(out)
        }
    }

    /// A list of at most `MAX_ENTRIES` items.
    pub fn vec<'de, D, T>(d: D) -> Result<Vec<T>, D::Error>
    where
        D: Deserializer<'de>,
        T: Deserialize<'de>,
    {
        Wrap::<Vec<T>>::deserialize(d).map(|w| w.0)
    }

    /// A list of at most `MAX_ENTRIES` items, or absent.
    pub fn opt_vec<'de, D, T>(d: D) -> Result<Option<Vec<T>>, D::Error>
    where
        D: Deserializer<'de>,
        T: Deserialize<'de>,
    {
        Option::<Wrap<Vec<T>>>::deserialize(d).map(|o| o.map(|w| w.0))
    }

    /// An object `{name: T}` of at most `MAX_ENTRIES` names, or absent.
    pub fn opt_map<'de, D, T>(d: D) -> Result<Option<BTreeMap<String, T>>, D::Error>
    where
        D: Deserializer<'de>,
        T: Deserialize<'de>,
    {
        Option::<Wrap<BTreeMap<String, T>>>::deserialize(d).map(|o| o.map(|w| w.0))
    }

    struct Wrap<T>(T);

    impl<'de, T: Deserialize<'de>> Deserialize<'de> for Wrap<Vec<T>> {
        fn deserialize<D: Deserializer<'de>>(d: D) -> Result<Self, D::Error> {
            d.deserialize_seq(SeqV(super::MAX_ENTRIES, PhantomData))
                .map(Wrap)
        }
    }

    impl<'de, T: Deserialize<'de>> Deserialize<'de> for Wrap<BTreeMap<String, T>> {
        fn deserialize<D: Deserializer<'de>>(d: D) -> Result<Self, D::Error> {
            d.deserialize_map(MapV(PhantomData)).map(Wrap)
        }
    }
}

/// Bounds `[lower, upper]`, either end `null` or infinite for none.
pub type BoundsInput = (Option<f64>, Option<f64>);

/// Reads bounds, naming the place.
pub fn bounds(b: Option<BoundsInput>, place: &str) -> Result<Bounds, InputError> {
    let Some((lo, hi)) = b else {
        return Ok(Bounds::UNBOUNDED);
    };
    let lo = lo.unwrap_or(f64::NEG_INFINITY);
    let hi = hi.unwrap_or(f64::INFINITY);
    Bounds::new(lo, hi).map_err(|e| InputError::new(e.code, format!("{place}: {}", e.message)))
}

/// One unknown of an equation set: a name, or `{name, guesses?, bounds?, unit?}`.
#[derive(Debug, Clone, PartialEq)]
pub enum UnknownInput {
    Name(String),
    Spec(UnknownObject),
}

#[derive(Debug, Clone, PartialEq, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct UnknownObject {
    pub name: String,
    #[serde(default)]
    pub guesses: Option<(f64, f64)>,
    #[serde(default)]
    pub bounds: Option<BoundsInput>,
    /// The unit of its guesses, bounds and answer (as `units[name]`).
    #[serde(default)]
    pub unit: Option<String>,
}

impl UnknownInput {
    pub fn name(&self) -> &str {
        match self {
            UnknownInput::Name(n) => n,
            UnknownInput::Spec(s) => &s.name,
        }
    }
}

/// A problem: a bundled template, or a set of equations of one's own.
#[derive(Debug, Clone, PartialEq, Default, Deserialize)]
#[serde(deny_unknown_fields, rename_all = "camelCase")]
pub struct ProblemSpec {
    /// A template's id (`pipes.colebrook`); give it or `equations`.
    #[serde(default, alias = "id")]
    pub template: Option<String>,
    /// The template's knowns in any unit it accepts.
    #[serde(default, deserialize_with = "bounded::opt_map")]
    pub values: Option<BTreeMap<String, Known>>,
    /// The equation text; give it or `template`.
    #[serde(default)]
    pub equations: Option<String>,
    /// The equations' knowns; a number is in `units[name]` (or has no unit).
    #[serde(default, deserialize_with = "bounded::opt_map")]
    pub knowns: Option<BTreeMap<String, Quantity>>,
    /// The unit of each variable of the equations.
    #[serde(default, deserialize_with = "bounded::opt_map")]
    pub units: Option<BTreeMap<String, String>>,
    /// The one unknown (a template's, or an equation's when only one is left).
    #[serde(default)]
    pub unknown: Option<String>,
    /// The equations' unknowns, with guesses and bounds.
    #[serde(default, deserialize_with = "bounded::opt_vec")]
    pub unknowns: Option<Vec<UnknownInput>>,
    /// A template's answer unit (the variable's default unit when absent).
    #[serde(default)]
    pub result_unit: Option<String>,
    /// A template's auxiliary quantities and outputs: the unit to show each in (its
    /// display unit when absent).
    #[serde(default, deserialize_with = "bounded::opt_map")]
    pub output_units: Option<BTreeMap<String, String>>,
    /// A template's branch, by its label.
    #[serde(default)]
    pub branch: Option<String>,
    /// Fill knowns not given from the demo scenario (templates only).
    #[serde(default)]
    pub use_scenario_defaults: bool,
    /// Standard uncertainties of knowns (template values or equation knowns): a
    /// number in the same unit as the known's value, or `{percent}` of the value as
    /// given; see [`UncertaintyInput`].
    #[serde(default)]
    pub uncertainties: Option<BTreeMap<String, UncertaintyInput>>,
}

/// A known's standard uncertainty: a number (in the same unit as the known's value;
/// for a temperature reading such as °C, a difference in that unit), or
/// `{standard?, percent?, distribution?}` with exactly one of `standard` (as the
/// number) or `percent` (of the value as given, in its unit: `{percent: 30}` is
/// ±30 %), and the distribution of the Monte Carlo draws: `"gaussian"` (default;
/// JCGM 101 §6.4.7) or `"rectangular"` (the same standard deviation, JCGM 101
/// §6.4.2).
#[derive(Debug, Clone, PartialEq, Deserialize)]
#[serde(
    untagged,
    expecting = "a standard uncertainty (a number in the known's unit) or {standard?, percent?, distribution?}"
)]
pub enum UncertaintyInput {
    Standard(f64),
    Object(UncertaintyObject),
}

#[derive(Debug, Clone, PartialEq, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct UncertaintyObject {
    #[serde(default)]
    pub standard: Option<f64>,
    #[serde(default)]
    pub percent: Option<f64>,
    #[serde(default)]
    pub distribution: Option<String>,
}

/// How the uncertainty of a solve is computed. Omitted fields keep their defaults.
#[derive(Debug, Clone, PartialEq, Default, Deserialize)]
#[serde(deny_unknown_fields, rename_all = "camelCase")]
pub struct UncertaintyOptionsInput {
    /// The coverage factor of the expanded uncertainty (default 2).
    #[serde(default)]
    pub coverage_factor: Option<f64>,
    /// Monte Carlo trials (default 100 000; 0 for none; at most
    /// [`crate::uncertainty::MAX_TRIALS`]).
    #[serde(default)]
    pub trials: Option<f64>,
    /// Seed of the random numbers (default 1; a whole number from 0 to 2^53).
    #[serde(default)]
    pub seed: Option<f64>,
}

impl UncertaintyOptionsInput {
    /// The core's options, checked.
    pub fn read(
        input: Option<&UncertaintyOptionsInput>,
        place: &str,
    ) -> Result<crate::uncertainty::UncertaintyOptions, InputError> {
        use crate::uncertainty::{UncertaintyOptions, MAX_TRIALS};
        let mut o = UncertaintyOptions::default();
        let Some(i) = input else {
            return Ok(o);
        };
        if let Some(k) = i.coverage_factor {
            if !(k.is_finite() && k > 0.0) {
                return Err(InputError::new(
                    "bad-coverage-factor",
                    format!("{place}.coverageFactor must be a finite number above 0, got {k}"),
                ));
            }
            o.coverage_factor = k;
        }
        if let Some(n) = i.trials {
            if !(n.fract() == 0.0 && (0.0..=MAX_TRIALS as f64).contains(&n)) {
                return Err(InputError::new(
                    "too-many-trials",
                    format!(
                        "{place}.trials must be a whole number from 0 to {MAX_TRIALS}, got {n}"
                    ),
                ));
            }
            o.trials = n as usize;
        }
        if let Some(seed) = i.seed {
            if !(seed.fract() == 0.0 && (0.0..=9_007_199_254_740_992.0).contains(&seed)) {
                return Err(InputError::new(
                    "bad-seed",
                    format!("{place}.seed must be a whole number from 0 to 2^53, got {seed}"),
                ));
            }
            o.seed = seed as u64;
        }
        Ok(o)
    }
}

/// How to solve. Omitted fields keep their defaults.
#[derive(Debug, Clone, PartialEq, Default, Deserialize)]
#[serde(deny_unknown_fields, rename_all = "camelCase")]
pub struct SolveOptions {
    #[serde(default)]
    pub method: Option<String>,
    #[serde(default)]
    pub tolerances: Option<TolerancesInput>,
    /// Two guesses of the one unknown, in its unit.
    #[serde(default)]
    pub guesses: Option<(f64, f64)>,
    #[serde(default)]
    pub history: bool,
    #[serde(default)]
    pub sensitivities: bool,
    /// How the uncertainty is computed when the problem's knowns carry uncertainties.
    #[serde(default)]
    pub uncertainty: Option<UncertaintyOptionsInput>,
}

/// Tolerances as sent; see [`Tolerances`] for the meaning and defaults.
#[derive(Debug, Clone, PartialEq, Default, Deserialize)]
#[serde(deny_unknown_fields, rename_all = "camelCase")]
pub struct TolerancesInput {
    #[serde(default)]
    pub x_abs: Option<f64>,
    #[serde(default)]
    pub x_rel: Option<f64>,
    #[serde(default)]
    pub f_abs: Option<f64>,
    #[serde(default)]
    pub max_evals: Option<f64>,
}

impl TolerancesInput {
    /// The tolerances, checked.
    pub fn read(input: Option<&TolerancesInput>, place: &str) -> Result<Tolerances, InputError> {
        let mut tol = Tolerances::default();
        let Some(t) = input else {
            return Ok(tol);
        };
        for (name, v, slot) in [
            ("xAbs", t.x_abs, &mut tol.x_abs),
            ("xRel", t.x_rel, &mut tol.x_rel),
            ("fAbs", t.f_abs, &mut tol.f_abs),
        ] {
            if let Some(v) = v {
                if !v.is_finite() || v < 0.0 {
                    return Err(InputError::new(
                        "bad-tolerance",
                        format!("{place}.{name} must be a finite number >= 0, got {v}"),
                    ));
                }
                *slot = v;
            }
        }
        if let Some(n) = t.max_evals {
            let max = crate::tolerances::MAX_EVALS;
            if !(n.fract() == 0.0 && n >= 2.0 && n <= max as f64) {
                return Err(InputError::new(
                    "bad-tolerance",
                    format!("{place}.maxEvals must be a whole number from 2 to {max}, got {n}"),
                ));
            }
            tol.max_evals = n as usize;
        }
        tol.validate()?;
        Ok(tol)
    }
}

impl SolveOptions {
    /// The driver's options (bounds are the problem's own).
    pub fn options(&self, place: &str) -> Result<Options, InputError> {
        let method = match &self.method {
            Some(m) => MethodKind::from_code(m)?,
            None => MethodKind::Auto,
        };
        Ok(Options {
            method,
            tol: TolerancesInput::read(self.tolerances.as_ref(), &format!("{place}.tolerances"))?,
            bounds: Bounds::UNBOUNDED,
            record_history: self.history,
        })
    }
}

/// A range scan: `[lo, hi]` in the unknown's unit.
#[derive(Debug, Clone, PartialEq, Default, Deserialize)]
#[serde(deny_unknown_fields, rename_all = "camelCase")]
pub struct RootsOptions {
    /// Uniform samples across the range (default 400).
    #[serde(default)]
    pub samples: Option<f64>,
    #[serde(default)]
    pub tolerances: Option<TolerancesInput>,
    /// Prove the roots: regions covering the range, each `unique` (a root proven, with
    /// its enclosure), `none` (proven) or `undecided` (with why), by interval Newton
    /// with bisection ([`crate::proven_roots`]) instead of the sampling scan. Regions
    /// are not split below `xAbs + xRel·|x|` of the tolerances (in SI).
    #[serde(default)]
    pub proven: bool,
    /// With `proven`: regions examined at most (default 20 000, at most
    /// [`crate::proven_roots::MAX_REGIONS`]).
    #[serde(default)]
    pub max_regions: Option<f64>,
}

/// A sweep: the unknown solved at `points` evenly spaced values of the known `input`
/// from `from` to `to` (in the input's unit), each from the previous root.
#[derive(Debug, Clone, PartialEq, Deserialize)]
#[serde(deny_unknown_fields, rename_all = "camelCase")]
pub struct SweepSpec {
    pub input: String,
    pub from: f64,
    pub to: f64,
    pub points: f64,
    /// Spacing: "linear" (default) or "log".
    #[serde(default)]
    pub spacing: Option<String>,
    #[serde(default)]
    pub method: Option<String>,
    #[serde(default)]
    pub tolerances: Option<TolerancesInput>,
    /// Guesses for the first point, in the unknown's unit.
    #[serde(default)]
    pub guesses: Option<(f64, f64)>,
}
