//! Physical dimensions: exponents of the SI base quantities, and their names in words.
//!
//! A [`Dimension`] holds one exponent per base quantity (length, mass, time, electric
//! current, temperature, amount of substance, luminous intensity) plus one for money,
//! which is not an SI quantity but must not mix with the others. Exponents are
//! fractions ([`Ratio`]), so a square root halves them and Manning's n, s/m^(1/3), has
//! a length exponent of -1/3.
//!
//! [`NAMED`] maps every dimension name of the unit table (`"length"`, `"volume_flow"`,
//! …) to its exponents and to the words used in messages ("a volume flow"). An angle is
//! dimensionless (SI Brochure, 9th ed., 2019, 2.3.3: the radian is 1), and a temperature
//! and a temperature difference have the same dimension; the difference between a
//! reading and an interval is a matter of the unit's offset (see `units`).
//!
//! Arithmetic is checked: an exponent that would overflow gives `None`, never a panic.
//!
//! ```
//! use tacit::dimension::{Dimension, Ratio};
//! let flow = Dimension::named("volume_flow").unwrap();
//! let area = Dimension::named("area").unwrap();
//! let velocity = flow.div(&area).unwrap();
//! assert_eq!(velocity, Dimension::named("velocity").unwrap());
//! assert_eq!(velocity.in_words(), "a velocity");
//! let root = area.pow(Ratio::new(1, 2).unwrap()).unwrap();
//! assert_eq!(root.in_words(), "a length");
//! assert_eq!(Dimension::named("manning_n").unwrap().base_units(), "s·m^(-1/3)");
//! ```

use std::fmt;

/// A fraction in lowest terms with a positive denominator.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub struct Ratio {
    num: i64,
    den: i64,
}

fn gcd(mut a: i64, mut b: i64) -> i64 {
    a = a.wrapping_abs();
    b = b.wrapping_abs();
    while b != 0 {
        let r = a % b;
        a = b;
        b = r;
    }
    a
}

impl Ratio {
    pub const ZERO: Ratio = Ratio { num: 0, den: 1 };
    pub const ONE: Ratio = Ratio { num: 1, den: 1 };

    /// `num/den` in lowest terms; `None` when `den` is 0 or a term overflows.
    pub fn new(num: i64, den: i64) -> Option<Ratio> {
        if den == 0 || num == i64::MIN || den == i64::MIN {
            return None;
        }
        let g = gcd(num, den).max(1);
        let (mut n, mut d) = (num / g, den / g);
        if d < 0 {
            n = -n;
            d = -d;
        }
        Some(Ratio { num: n, den: d })
    }

    pub const fn integer(n: i64) -> Ratio {
        Ratio { num: n, den: 1 }
    }

    pub fn numerator(self) -> i64 {
        self.num
    }

    pub fn denominator(self) -> i64 {
        self.den
    }

    pub fn is_zero(self) -> bool {
        self.num == 0
    }

    /// The integer value, when the denominator is 1.
    pub fn as_integer(self) -> Option<i64> {
        (self.den == 1).then_some(self.num)
    }

    pub fn to_f64(self) -> f64 {
        self.num as f64 / self.den as f64
    }

    pub fn checked_add(self, o: Ratio) -> Option<Ratio> {
        let num = self
            .num
            .checked_mul(o.den)?
            .checked_add(o.num.checked_mul(self.den)?)?;
        Ratio::new(num, self.den.checked_mul(o.den)?)
    }

    pub fn checked_neg(self) -> Option<Ratio> {
        Ratio::new(self.num.checked_neg()?, self.den)
    }

    pub fn checked_sub(self, o: Ratio) -> Option<Ratio> {
        self.checked_add(o.checked_neg()?)
    }

    pub fn checked_mul(self, o: Ratio) -> Option<Ratio> {
        Ratio::new(self.num.checked_mul(o.num)?, self.den.checked_mul(o.den)?)
    }

    pub fn checked_div(self, o: Ratio) -> Option<Ratio> {
        if o.num == 0 {
            return None;
        }
        Ratio::new(self.num.checked_mul(o.den)?, self.den.checked_mul(o.num)?)
    }

    /// `self^e` for an integer `e` of at most 64 in size.
    pub fn powi(self, e: i64) -> Option<Ratio> {
        if e.unsigned_abs() > 64 {
            return None;
        }
        let mut out = Ratio::ONE;
        for _ in 0..e.unsigned_abs() {
            out = out.checked_mul(self)?;
        }
        if e < 0 {
            Ratio::ONE.checked_div(out)
        } else {
            Some(out)
        }
    }

    /// The exact value of a decimal number as written (`1.852`, `2.5e+2`, `.5`, `1E-3`),
    /// or `None` if it does not fit.
    pub fn from_decimal(text: &str) -> Option<Ratio> {
        let (mantissa, exponent) = match text.find(['e', 'E']) {
            Some(i) => (&text[..i], text[i + 1..].parse::<i32>().ok()?),
            None => (text, 0),
        };
        let (int, frac) = mantissa.split_once('.').unwrap_or((mantissa, ""));
        if int.is_empty() && frac.is_empty() {
            return None;
        }
        let mut num: i64 = 0;
        for c in int.chars().chain(frac.chars()) {
            let d = c.to_digit(10)? as i64;
            num = num.checked_mul(10)?.checked_add(d)?;
        }
        let scale = exponent.checked_sub(i32::try_from(frac.len()).ok()?)?;
        let ten = |k: u32| 10i64.checked_pow(k);
        if scale >= 0 {
            Ratio::new(num.checked_mul(ten(scale.unsigned_abs())?)?, 1)
        } else {
            Ratio::new(num, ten(scale.unsigned_abs())?)
        }
    }
}

impl fmt::Display for Ratio {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        if self.den == 1 {
            write!(f, "{}", self.num)
        } else {
            write!(f, "({}/{})", self.num, self.den)
        }
    }
}

/// The base quantities, in the order of [`Dimension`]'s exponents, with the symbol of
/// each one's SI unit (money has no SI unit; it is written `currency`).
pub const BASES: [(&str, &str); 8] = [
    ("length", "m"),
    ("mass", "kg"),
    ("time", "s"),
    ("electric current", "A"),
    ("temperature", "K"),
    ("amount of substance", "mol"),
    ("luminous intensity", "cd"),
    ("money", "currency"),
];

/// Exponents of the base quantities of [`BASES`].
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub struct Dimension([Ratio; 8]);

impl Dimension {
    pub const NONE: Dimension = Dimension([Ratio::ZERO; 8]);

    /// The dimension of a name of the unit table (`"length"`, `"volume_flow"`).
    pub fn named(name: &str) -> Option<Dimension> {
        NAMED.iter().find(|n| n.name == name).map(|n| n.dimension)
    }

    /// A product of whole powers of the bases: `exponents[i]` for `BASES[i]`.
    pub const fn from_integers(exponents: [i64; 8]) -> Dimension {
        let mut out = [Ratio::ZERO; 8];
        let mut i = 0;
        while i < 8 {
            out[i] = Ratio::integer(exponents[i]);
            i += 1;
        }
        Dimension(out)
    }

    pub fn exponents(&self) -> &[Ratio; 8] {
        &self.0
    }

    pub fn is_dimensionless(&self) -> bool {
        self.0.iter().all(|r| r.is_zero())
    }

    fn zip(&self, o: &Dimension, f: impl Fn(Ratio, Ratio) -> Option<Ratio>) -> Option<Dimension> {
        let mut out = [Ratio::ZERO; 8];
        for (i, slot) in out.iter_mut().enumerate() {
            *slot = f(self.0[i], o.0[i])?;
        }
        Some(Dimension(out))
    }

    pub fn mul(&self, o: &Dimension) -> Option<Dimension> {
        self.zip(o, Ratio::checked_add)
    }

    pub fn div(&self, o: &Dimension) -> Option<Dimension> {
        self.zip(o, Ratio::checked_sub)
    }

    pub fn pow(&self, e: Ratio) -> Option<Dimension> {
        self.zip(&Dimension::NONE, |a, _| a.checked_mul(e))
    }

    /// As a product of base units: `m^2·s^-1`, `s·m^(-1/3)`, `1` when dimensionless.
    /// Positive exponents come first.
    pub fn base_units(&self) -> String {
        let mut parts: Vec<String> = Vec::new();
        for positive in [true, false] {
            for (i, r) in self.0.iter().enumerate() {
                if r.is_zero() || (r.numerator() > 0) != positive {
                    continue;
                }
                let symbol = BASES[i].1;
                parts.push(if *r == Ratio::ONE {
                    symbol.to_string()
                } else {
                    format!("{symbol}^{r}")
                });
            }
        }
        if parts.is_empty() {
            "1".to_string()
        } else {
            parts.join("·")
        }
    }

    /// In words for messages: "a length", "dimensionless", or else the base units
    /// ("m^2·kg^3").
    pub fn in_words(&self) -> String {
        match NAMED.iter().find(|n| n.dimension == *self) {
            Some(n) => n.words.to_string(),
            None => self.base_units(),
        }
    }
}

/// A dimension name of the unit table.
pub struct NamedDimension {
    pub name: &'static str,
    pub dimension: Dimension,
    /// How messages name it; the first entry of [`NAMED`] with a dimension gives the words.
    pub words: &'static str,
}

const fn named(name: &'static str, words: &'static str, e: [i64; 8]) -> NamedDimension {
    NamedDimension {
        name,
        dimension: Dimension::from_integers(e),
        words,
    }
}

// Exponents of       [ m, kg,  s,  A,  K, mol, cd, ¤]
/// Every dimension name of the unit table, with its exponents and words. Where two
/// names share a dimension, the first gives the words (dimensionless before angle).
pub static NAMED: &[NamedDimension] = &[
    named("dimensionless", "dimensionless", [0, 0, 0, 0, 0, 0, 0, 0]),
    named("angle", "an angle", [0, 0, 0, 0, 0, 0, 0, 0]),
    named("length", "a length", [1, 0, 0, 0, 0, 0, 0, 0]),
    named("area", "an area", [2, 0, 0, 0, 0, 0, 0, 0]),
    named("volume", "a volume", [3, 0, 0, 0, 0, 0, 0, 0]),
    named("volume_flow", "a volume flow", [3, 0, -1, 0, 0, 0, 0, 0]),
    named("velocity", "a velocity", [1, 0, -1, 0, 0, 0, 0, 0]),
    named("acceleration", "an acceleration", [1, 0, -2, 0, 0, 0, 0, 0]),
    named("mass", "a mass", [0, 1, 0, 0, 0, 0, 0, 0]),
    named("mass_flow", "a mass flow", [0, 1, -1, 0, 0, 0, 0, 0]),
    named(
        "mass_per_length",
        "a mass per length",
        [-1, 1, 0, 0, 0, 0, 0, 0],
    ),
    named("force", "a force", [1, 1, -2, 0, 0, 0, 0, 0]),
    named(
        "force_per_length",
        "a force per length",
        [0, 1, -2, 0, 0, 0, 0, 0],
    ),
    named("pressure", "a pressure", [-1, 1, -2, 0, 0, 0, 0, 0]),
    named("unit_weight", "a unit weight", [-2, 1, -2, 0, 0, 0, 0, 0]),
    named("density", "a density", [-3, 1, 0, 0, 0, 0, 0, 0]),
    named("energy", "an energy", [2, 1, -2, 0, 0, 0, 0, 0]),
    named("power", "a power", [2, 1, -3, 0, 0, 0, 0, 0]),
    named("time", "a time", [0, 0, 1, 0, 0, 0, 0, 0]),
    named("frequency", "a frequency", [0, 0, -1, 0, 0, 0, 0, 0]),
    named("temperature", "a temperature", [0, 0, 0, 0, 1, 0, 0, 0]),
    named(
        "temperature_difference",
        "a temperature difference",
        [0, 0, 0, 0, 1, 0, 0, 0],
    ),
    named(
        "dynamic_viscosity",
        "a dynamic viscosity",
        [-1, 1, -1, 0, 0, 0, 0, 0],
    ),
    named(
        "kinematic_viscosity",
        "a kinematic viscosity or diffusivity",
        [2, 0, -1, 0, 0, 0, 0, 0],
    ),
    named("diffusivity", "a diffusivity", [2, 0, -1, 0, 0, 0, 0, 0]),
    named(
        "second_moment_of_area",
        "a second moment of area",
        [4, 0, 0, 0, 0, 0, 0, 0],
    ),
    named(
        "heat_transfer_coefficient",
        "a heat transfer coefficient",
        [0, 1, -3, 0, -1, 0, 0, 0],
    ),
    named(
        "thermal_conductivity",
        "a thermal conductivity",
        [1, 1, -3, 0, -1, 0, 0, 0],
    ),
    named(
        "specific_heat",
        "a specific heat capacity",
        [2, 0, -2, 0, -1, 0, 0, 0],
    ),
    named("current", "an electric current", [0, 0, 0, 1, 0, 0, 0, 0]),
    named("voltage", "a voltage", [2, 1, -3, -1, 0, 0, 0, 0]),
    named("resistance", "a resistance", [2, 1, -3, -2, 0, 0, 0, 0]),
    named(
        "amount_of_substance",
        "an amount of substance",
        [0, 0, 0, 0, 0, 1, 0, 0],
    ),
    named("molar_volume", "a molar volume", [3, 0, 0, 0, 0, -1, 0, 0]),
    NamedDimension {
        name: "manning_n",
        // s/m^(1/3): Manning's n in its SI form.
        dimension: Dimension([
            Ratio { num: -1, den: 3 },
            Ratio::ZERO,
            Ratio::ONE,
            Ratio::ZERO,
            Ratio::ZERO,
            Ratio::ZERO,
            Ratio::ZERO,
            Ratio::ZERO,
        ]),
        words: "a Manning roughness",
    },
    named("money", "money", [0, 0, 0, 0, 0, 0, 0, 1]),
];
