//! Interval evaluation of a compiled program: an enclosure of every value an expression
//! takes over a box of inputs, with outward rounding, and an honest flag for points
//! where it is undefined.
//!
//! ```
//! use tacit::equations::{Expression, Interval};
//! let p = Expression::parse("x^2 - 2").unwrap().compile(&["x"]).unwrap();
//! let y = p.eval_interval(&[Interval::new(1.0, 2.0)]);
//! assert!(y.lo <= -1.0 && y.hi >= 2.0 && !y.maybe_undefined);
//! assert!(y.contains(p.eval(&[1.5])));
//! ```
//!
//! **What an [`Interval`] promises.** For every point of the input box (each slot
//! anywhere in its interval), the value is either undefined (NaN), and then
//! `maybe_undefined` is set, or it lies in `[lo, hi]`. This holds both for the exact
//! real value of the program's operations (constants as the program holds them: a
//! folded `2/3` is the double nearest 2/3) and for the value the point evaluator
//! computes in floating point, so a proof about the real function can be checked against
//! the numbers the solver sees. Values are extended reals: ±∞ are values (`1/0`
//! overflows to ∞ in the point evaluator), so a bound of ∞ means "∞ may occur".
//! An interval with `lo > hi` has no defined value at all ([`Interval::is_empty`]).
//!
//! **Outward rounding without rounding modes.** WebAssembly (like Rust) only rounds to
//! nearest, so every bound computed by a correctly rounded operation (+, −, ×, ÷, √) is
//! moved one unit in the last place outward ([`f64::next_down`], [`f64::next_up`]):
//! the exact result is within half a unit of the rounded one. A result known to be
//! exact is not moved (a sum that is exactly zero, a product with a zero factor, `abs`,
//! `floor`, `min`). The math library is not correctly rounded: its results (exp, ln,
//! sin, pow, …) are moved outward by [`LIBRARY_ULPS`] units, a margin over the errors
//! glibc documents for double precision ("a few ulp", GNU C Library manual §19.7,
//! *Known Maximum Errors in Math Functions*) and over those of the FreeBSD-derived
//! `libm` that Rust uses on wasm32, which claims less than one ulp for these functions
//! (recalled from its source comments). Functions are monotone between known critical
//! points, so bounds come from the ends of each piece and the extremes in between.
//!
//! **Signed zero.** The point evaluator may produce −0 wherever an interval contains 0
//! (`0 * -1`), and `1/−0` is −∞: a divisor interval that contains 0 therefore gives
//! the whole line, and `signum` over an interval containing 0 gives [−1, 1].
//!
//! Periodic functions: `sin`, `cos` reach ±1 exactly where the interval may hold a
//! crest; `tan`, `cot`, `sec`, `csc` over an interval that may hold a pole are the
//! whole line (they are finite at every double, so not undefined there).

use super::functions::{self, Func};
use super::program::{Number, Program};
use std::f64::consts::{FRAC_PI_2, PI, TAU};

/// How many units in the last place a math-library result is moved outward.
pub const LIBRARY_ULPS: f64 = 8.0;

/// The smallest positive subnormal double.
const TINY: f64 = 5e-324;

/// A closed interval of extended reals enclosing the defined values of an expression
/// over a box, and whether it may be undefined somewhere in the box.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Interval {
    pub lo: f64,
    pub hi: f64,
    /// Some point of the box may give NaN (undefined: `sqrt(-1)`, `0/0`, `∞ − ∞`, …).
    pub maybe_undefined: bool,
}

impl Interval {
    /// No defined value: every point of the box is undefined.
    pub const UNDEFINED: Interval = Interval {
        lo: f64::INFINITY,
        hi: f64::NEG_INFINITY,
        maybe_undefined: true,
    };

    /// No value and nothing undefined: the start of a hull.
    const NOTHING: Interval = Interval {
        lo: f64::INFINITY,
        hi: f64::NEG_INFINITY,
        maybe_undefined: false,
    };

    /// Every extended real.
    pub const WHOLE: Interval = Interval {
        lo: f64::NEG_INFINITY,
        hi: f64::INFINITY,
        maybe_undefined: false,
    };

    /// `[lo, hi]`, every value defined. A NaN bound or `lo > hi` gives
    /// [`Interval::UNDEFINED`].
    pub fn new(lo: f64, hi: f64) -> Interval {
        if lo <= hi {
            Interval {
                lo,
                hi,
                maybe_undefined: false,
            }
        } else {
            Interval::UNDEFINED
        }
    }

    /// The one value `x` (NaN gives [`Interval::UNDEFINED`]).
    pub fn point(x: f64) -> Interval {
        Interval::new(x, x)
    }

    /// The same values, marked as possibly undefined somewhere.
    pub fn or_undefined(self) -> Interval {
        Interval {
            maybe_undefined: true,
            ..self
        }
    }

    fn with_undefined(self, undefined: bool) -> Interval {
        Interval {
            maybe_undefined: self.maybe_undefined || undefined,
            ..self
        }
    }

    /// No defined value in the box.
    pub fn is_empty(self) -> bool {
        self.lo.is_nan() || self.hi.is_nan() || self.lo > self.hi
    }

    /// Whether the value `x` of a point of the box is consistent with this enclosure:
    /// NaN needs `maybe_undefined`, anything else must lie in `[lo, hi]`.
    pub fn contains(self, x: f64) -> bool {
        if x.is_nan() {
            self.maybe_undefined
        } else {
            self.lo <= x && x <= self.hi
        }
    }

    /// Whether 0 lies in `[lo, hi]`.
    pub fn contains_zero(self) -> bool {
        self.lo <= 0.0 && 0.0 <= self.hi
    }

    /// `hi - lo` rounded up (∞ for an unbounded interval, 0 when empty).
    pub fn width(self) -> f64 {
        if self.is_empty() {
            0.0
        } else {
            (self.hi - self.lo).next_up()
        }
    }

    /// The smallest interval holding both.
    pub fn hull(self, other: Interval) -> Interval {
        Interval {
            lo: self.lo.min(other.lo),
            hi: self.hi.max(other.hi),
            maybe_undefined: self.maybe_undefined || other.maybe_undefined,
        }
    }

    /// Defined values in common (empty when disjoint); undefined if either may be.
    pub fn intersect(self, other: Interval) -> Interval {
        let lo = self.lo.max(other.lo);
        let hi = self.hi.min(other.hi);
        let undefined = self.maybe_undefined || other.maybe_undefined;
        if lo <= hi {
            Interval {
                lo,
                hi,
                maybe_undefined: undefined,
            }
        } else {
            Interval::UNDEFINED.with_undefined(undefined)
        }
    }

    fn has_pos_inf(self) -> bool {
        self.hi == f64::INFINITY
    }

    fn has_neg_inf(self) -> bool {
        self.lo == f64::NEG_INFINITY
    }

    fn has_inf(self) -> bool {
        self.has_pos_inf() || self.has_neg_inf()
    }

    /// Largest |x| (0 when empty).
    fn mag(self) -> f64 {
        if self.is_empty() {
            0.0
        } else {
            self.lo.abs().max(self.hi.abs())
        }
    }

    /// Smallest |x| (0 when the interval holds 0).
    fn mig(self) -> f64 {
        if self.contains_zero() {
            0.0
        } else {
            self.lo.abs().min(self.hi.abs())
        }
    }

    /// From bounds computed by correctly rounded operations: one ulp outward. A NaN
    /// bound (a corner such as ∞ − ∞) becomes the infinite one.
    fn rounded(lo: f64, hi: f64, undefined: bool) -> Interval {
        Interval {
            lo: if lo.is_nan() {
                f64::NEG_INFINITY
            } else {
                lo.next_down()
            },
            hi: if hi.is_nan() {
                f64::INFINITY
            } else {
                hi.next_up()
            },
            maybe_undefined: undefined,
        }
    }

    /// From bounds computed by the math library: [`LIBRARY_ULPS`] outward.
    fn library(lo: f64, hi: f64, undefined: bool) -> Interval {
        Interval {
            lo: library_down(lo),
            hi: library_up(hi),
            maybe_undefined: undefined,
        }
    }

    /// Clipped to `[lo, hi]`, bounds that both the exact function and the math library
    /// respect (|sin| ≤ 1, exp ≥ 0, …).
    fn clip(self, lo: f64, hi: f64) -> Interval {
        if self.is_empty() {
            return self;
        }
        Interval {
            lo: self.lo.max(lo),
            hi: self.hi.min(hi),
            maybe_undefined: self.maybe_undefined,
        }
    }
}

/// `x` moved [`LIBRARY_ULPS`] units down (NaN: −∞).
fn library_down(x: f64) -> f64 {
    if x.is_nan() {
        f64::NEG_INFINITY
    } else if x.is_infinite() {
        x.next_down()
    } else {
        (x - (x.abs() * LIBRARY_ULPS * f64::EPSILON + LIBRARY_ULPS * TINY)).next_down()
    }
}

/// `x` moved [`LIBRARY_ULPS`] units up (NaN: +∞).
fn library_up(x: f64) -> f64 {
    -library_down(-x)
}

/// `x` moved `k` units in the last place down (for results of `k` roundings).
fn down_by(x: f64, k: f64) -> f64 {
    if x.is_nan() {
        f64::NEG_INFINITY
    } else if x.is_infinite() {
        x.next_down()
    } else {
        (x - (x.abs() * k * f64::EPSILON + k * TINY)).next_down()
    }
}

fn up_by(x: f64, k: f64) -> f64 {
    -down_by(-x, k)
}

/// Whether `s = a + b` (rounded) is the exact sum: the rounding error of a sum is
/// itself a double, found without error by Knuth's TwoSum (Knuth, TAOCP vol. 2,
/// §4.2.2, Theorem B).
fn sum_is_exact(a: f64, b: f64, s: f64) -> bool {
    if !s.is_finite() {
        return false;
    }
    let bb = s - a;
    let err = (a - (s - bb)) + (b - bb);
    err == 0.0
}

/// Smallest and largest of the values that are not NaN; `None` when all are NaN.
fn min_max(values: &[f64]) -> Option<(f64, f64)> {
    let mut out: Option<(f64, f64)> = None;
    for &v in values {
        if v.is_nan() {
            continue;
        }
        out = Some(match out {
            None => (v, v),
            Some((lo, hi)) => (lo.min(v), hi.max(v)),
        });
    }
    out
}

/// A monotone non-decreasing library function of the defined part `[a, b]`.
fn increasing(x: Interval, f: fn(f64) -> f64, undefined: bool) -> Interval {
    if x.is_empty() {
        return Interval::UNDEFINED;
    }
    Interval::library(f(x.lo), f(x.hi), x.maybe_undefined || undefined)
}

/// A monotone non-increasing library function of `[a, b]`.
fn decreasing(x: Interval, f: fn(f64) -> f64, undefined: bool) -> Interval {
    if x.is_empty() {
        return Interval::UNDEFINED;
    }
    Interval::library(f(x.hi), f(x.lo), x.maybe_undefined || undefined)
}

/// `x` restricted to a domain `[lo, hi]`: the part inside, and whether some of `x`
/// lies outside (where the function is undefined).
fn within(x: Interval, lo: f64, hi: f64) -> (Interval, bool) {
    if x.is_empty() {
        return (x, true);
    }
    let outside = x.lo < lo || x.hi > hi;
    (x.intersect(Interval::new(lo, hi)), outside)
}

/// Whether `[a, b]` may hold a point `c + k·p` for an integer `k`; true whenever
/// rounding leaves it in doubt (and for huge arguments).
fn may_hold(a: f64, b: f64, c: f64, p: f64) -> bool {
    let m = a.abs().max(b.abs());
    if m.is_nan() || m >= 1e12 {
        return true;
    }
    let slack = 16.0 * f64::EPSILON * (m + c.abs()) / p + 1e-300;
    let ka = (a - c) / p - slack;
    let kb = (b - c) / p + slack;
    kb.floor() >= ka.ceil()
}

/// sin or cos of `x`: crests at `crest + 2πk`, troughs at `crest + π + 2πk`.
fn periodic_wave(x: Interval, f: fn(f64) -> f64, crest: f64) -> Interval {
    if x.is_empty() {
        return Interval::UNDEFINED;
    }
    // sin(±∞) is NaN.
    let undefined = x.maybe_undefined || x.has_inf();
    let width = x.hi - x.lo;
    if width.is_nan() || width >= TAU {
        return Interval::new(-1.0, 1.0).with_undefined(undefined);
    }
    let (ya, yb) = (f(x.lo), f(x.hi));
    let hi = if may_hold(x.lo, x.hi, crest, TAU) {
        1.0
    } else {
        library_up(ya.max(yb))
    };
    let lo = if may_hold(x.lo, x.hi, crest + PI, TAU) {
        -1.0
    } else {
        library_down(ya.min(yb))
    };
    Interval {
        lo,
        hi,
        maybe_undefined: undefined,
    }
    .clip(-1.0, 1.0)
}

/// tan (rising between poles at `pole + πk`) or cot (falling between poles).
fn periodic_poles(x: Interval, f: fn(f64) -> f64, pole: f64, rising: bool) -> Interval {
    if x.is_empty() {
        return Interval::UNDEFINED;
    }
    let undefined = x.maybe_undefined || x.has_inf();
    let width = x.hi - x.lo;
    if width.is_nan() || width >= PI || may_hold(x.lo, x.hi, pole, PI) {
        return Interval::WHOLE.with_undefined(undefined);
    }
    let (ya, yb) = (f(x.lo), f(x.hi));
    if rising {
        Interval::library(ya, yb, undefined)
    } else {
        Interval::library(yb, ya, undefined)
    }
}

/// Integer power `x^n` for n ≠ 0 (any size), through `pow` (`powf`, or the
/// multiplications of [`functions::power_int`] for the small exponents), whose result is
/// within `ulps` of the exact power; exact at a base of 0 or ±∞.
fn integer_power(x: Interval, n: f64, pow: impl Fn(f64) -> f64, ulps: f64) -> Interval {
    if x.is_empty() {
        return Interval::UNDEFINED;
    }
    let even = n % 2.0 == 0.0;
    let undefined = x.maybe_undefined;
    // The base of each bound; None: the bound is the exact value beside it.
    let ((lo_base, lo_fixed), (hi_base, hi_fixed)) = if n > 0.0 {
        if !even {
            ((Some(x.lo), 0.0), (Some(x.hi), 0.0))
        } else if x.contains_zero() {
            ((None, 0.0), (Some(x.mag()), 0.0))
        } else {
            ((Some(x.mig()), 0.0), (Some(x.mag()), 0.0))
        }
    } else if even {
        // x^-n ≥ 0, +∞ at 0 (either sign of zero).
        if x.contains_zero() {
            ((Some(x.mag()), 0.0), (None, f64::INFINITY))
        } else {
            ((Some(x.mag()), 0.0), (Some(x.mig()), 0.0))
        }
    } else if x.contains_zero() {
        return Interval::WHOLE.with_undefined(undefined);
    } else {
        ((Some(x.hi), 0.0), (Some(x.lo), 0.0))
    };
    let bound = |base: Option<f64>, fixed: f64, outward: fn(f64, f64) -> f64| match base {
        None => fixed,
        Some(b) if b == 0.0 || b.is_infinite() => pow(b),
        Some(b) => outward(pow(b), ulps),
    };
    Interval {
        lo: bound(lo_base, lo_fixed, down_by),
        hi: bound(hi_base, hi_fixed, up_by),
        maybe_undefined: undefined,
    }
}

/// `x^y` for a fixed exponent `y` ([`functions::power`]).
fn power_point(x: Interval, y: f64) -> Interval {
    if y.is_nan() {
        // pow(1, NaN) = 1; NaN otherwise.
        return if x.lo <= 1.0 && 1.0 <= x.hi {
            Interval::point(1.0).or_undefined()
        } else {
            Interval::UNDEFINED
        };
    }
    if y == 0.0 {
        return Interval::point(1.0);
    }
    if let Some(n) = functions::multiplied_exponent(y) {
        return x.powi(n);
    }
    if x.is_empty() {
        return Interval::UNDEFINED;
    }
    if y.is_infinite() {
        // 0, 1 or ∞ for every base (never NaN for a defined base).
        return Interval::new(0.0, f64::INFINITY).with_undefined(x.maybe_undefined);
    }
    if y == y.trunc() {
        return integer_power(x, y, |b| b.powf(y), LIBRARY_ULPS);
    }
    // A non-integer exponent: defined for x ≥ 0 (and at −∞, where pow is +∞ or +0),
    // monotone there.
    let undefined = x.maybe_undefined || x.lo < 0.0;
    let mut out = Interval::NOTHING;
    if x.hi >= 0.0 {
        let (a, b) = (
            functions::power(x.lo.max(0.0), y),
            functions::power(x.hi, y),
        );
        let (lo, hi) = if y > 0.0 { (a, b) } else { (b, a) };
        out = Interval::library(lo, hi, false).clip(0.0, f64::INFINITY);
    }
    if x.lo == f64::NEG_INFINITY {
        out = out.hull(Interval::point(functions::power(f64::NEG_INFINITY, y)));
    }
    out.with_undefined(undefined)
}

/// `x^y` over a box of both ([`functions::power`]).
fn power_box(x: Interval, y: Interval) -> Interval {
    if y.is_empty() {
        // pow(1, NaN) = 1.
        return power_point(x, f64::NAN);
    }
    if y.lo == y.hi {
        return power_point(x, y.lo).with_undefined(y.maybe_undefined);
    }
    let mut undefined = x.maybe_undefined || y.maybe_undefined;
    // Absorbing cases of pow: x^0 = 1 even for NaN x; 1^y = 1 even for NaN y.
    let mut out = Interval::NOTHING;
    if (x.maybe_undefined && y.contains_zero()) || (y.maybe_undefined && x.lo <= 1.0 && 1.0 <= x.hi)
    {
        out = Interval::point(1.0);
    }
    if x.is_empty() {
        return out.with_undefined(true);
    }
    // x ≥ 0: x^y is monotone in each argument in each quadrant, so its extremes over
    // the box are at the corners (with pow's values at 0 and ∞).
    if x.hi >= 0.0 {
        let (a, b) = (x.lo.max(0.0), x.hi);
        let corners = [a.powf(y.lo), a.powf(y.hi), b.powf(y.lo), b.powf(y.hi)];
        if let Some((lo, hi)) = min_max(&corners) {
            out = out.hull(Interval::library(lo, hi, false).clip(0.0, f64::INFINITY));
        }
    }
    if x.lo < 0.0 {
        // Negative bases: defined only at integer exponents, with either sign, at most
        // the largest |x|^y in size.
        undefined = true;
        if y.lo.ceil() <= y.hi.floor() {
            let (a, b) = ((-x.hi).max(0.0), -x.lo);
            let corners = [a.powf(y.lo), a.powf(y.hi), b.powf(y.lo), b.powf(y.hi)];
            if let Some((_, hi)) = min_max(&corners) {
                let big = library_up(hi);
                out = out.hull(Interval::new(-big, big));
            }
        }
        if x.lo == f64::NEG_INFINITY {
            // pow(−∞, y) is ±0 or ±∞, defined for every y.
            out = out.hull(Interval::WHOLE);
        }
    }
    out.with_undefined(undefined)
}

/// `x % y`: remainder with the sign of the dividend, exact in IEEE arithmetic.
fn remainder(x: Interval, y: Interval) -> Interval {
    if x.is_empty() || y.is_empty() {
        return Interval::UNDEFINED;
    }
    let undefined = x.maybe_undefined || y.maybe_undefined || y.contains_zero() || x.has_inf();
    // |x| below every |y|: the remainder is x itself.
    if !y.contains_zero() && x.mag() < y.mig() {
        return x.with_undefined(undefined);
    }
    let m = y.mag();
    let lo = if x.lo >= 0.0 { 0.0 } else { x.lo.max(-m) };
    let hi = if x.hi <= 0.0 { 0.0 } else { x.hi.min(m) };
    Interval {
        lo,
        hi,
        maybe_undefined: undefined,
    }
}

fn divide(x: Interval, y: Interval) -> Interval {
    if x.is_empty() || y.is_empty() {
        return Interval::UNDEFINED;
    }
    let undefined = x.maybe_undefined
        || y.maybe_undefined
        || (x.contains_zero() && y.contains_zero())
        || (x.has_inf() && y.has_inf());
    if y.contains_zero() {
        // x/±0 is ±∞ with either sign; 0/y is 0.
        if x.lo == 0.0 && x.hi == 0.0 {
            return Interval::point(0.0).with_undefined(undefined);
        }
        return Interval::WHOLE.with_undefined(undefined);
    }
    corners(x, y, |a, b| (a / b, a == 0.0), undefined)
}

/// The hull of `op` at the four corners of a correctly rounded operation, one ulp
/// outward; `op` also says whether its value is exact when it is zero (a zero factor or
/// dividend). Zero bounds stay put unless some corner underflowed to zero.
fn corners(x: Interval, y: Interval, op: fn(f64, f64) -> (f64, bool), undefined: bool) -> Interval {
    let values = [
        op(x.lo, y.lo),
        op(x.lo, y.hi),
        op(x.hi, y.lo),
        op(x.hi, y.hi),
    ];
    let plain = values.map(|(v, _)| v);
    let Some((lo, hi)) = min_max(&plain) else {
        return Interval::UNDEFINED;
    };
    let r = Interval::rounded(lo, hi, undefined);
    if values.iter().any(|&(v, exact)| v == 0.0 && !exact) {
        r
    } else {
        exact_zero(r, lo, hi)
    }
}

/// Undoes the outward move of a bound that is an exact zero.
fn exact_zero(mut r: Interval, lo: f64, hi: f64) -> Interval {
    if lo == 0.0 {
        r.lo = 0.0;
    }
    if hi == 0.0 {
        r.hi = 0.0;
    }
    r
}

fn multiply(x: Interval, y: Interval) -> Interval {
    if x.is_empty() || y.is_empty() {
        return Interval::UNDEFINED;
    }
    let undefined = x.maybe_undefined
        || y.maybe_undefined
        || (x.contains_zero() && y.has_inf())
        || (y.contains_zero() && x.has_inf());
    // A product is an exact zero only with a zero factor.
    let r = corners(x, y, |a, b| (a * b, a == 0.0 || b == 0.0), undefined);
    // 0 · [−∞, ∞]: every corner is NaN, yet 0 times each finite value is 0.
    let zero_times_finite = |z: Interval, o: Interval| z.lo == 0.0 && z.hi == 0.0 && o.lo < o.hi;
    if r.is_empty() && (zero_times_finite(x, y) || zero_times_finite(y, x)) {
        return Interval::point(0.0).with_undefined(undefined);
    }
    r
}

/// `min` or `max` of the arguments (`pick` is `f64::min` or `f64::max`, `start` its
/// identity): exact, and undefined where any argument is.
fn extreme(args: &[Interval], pick: fn(f64, f64) -> f64, start: f64) -> Interval {
    let mut out = Interval {
        lo: start,
        hi: start,
        maybe_undefined: false,
    };
    for a in args {
        if a.is_empty() {
            return Interval::UNDEFINED;
        }
        out.lo = pick(out.lo, a.lo);
        out.hi = pick(out.hi, a.hi);
        out.maybe_undefined |= a.maybe_undefined;
    }
    out
}

/// `when(t, a, b)`: a where t > 0, b where t ≤ 0, undefined where t is.
fn when(t: Interval, a: Interval, b: Interval) -> Interval {
    if t.is_empty() {
        return Interval::UNDEFINED;
    }
    let (take_a, take_b) = (t.hi > 0.0, t.lo <= 0.0);
    let mut out = Interval::NOTHING.with_undefined(t.maybe_undefined);
    if take_a {
        out = out.hull(a);
    }
    if take_b {
        out = out.hull(b);
    }
    out
}

/// `clamp(x, lo, hi)`: `max(x, lo)` then `min(·, hi)`, non-decreasing in each argument;
/// undefined where `lo > hi` or any argument is.
fn clamp(x: Interval, l: Interval, h: Interval) -> Interval {
    if x.is_empty() || l.is_empty() || h.is_empty() {
        return Interval::UNDEFINED;
    }
    let undefined = x.maybe_undefined || l.maybe_undefined || h.maybe_undefined || l.hi > h.lo;
    let f = |x: f64, l: f64, h: f64| x.max(l).min(h);
    Interval {
        lo: f(x.lo, l.lo, h.lo),
        hi: f(x.hi, l.hi, h.hi),
        maybe_undefined: undefined,
    }
}

/// `atan2(y, x)`.
fn atan2(y: Interval, x: Interval) -> Interval {
    if y.is_empty() || x.is_empty() {
        return Interval::UNDEFINED;
    }
    let undefined = y.maybe_undefined || x.maybe_undefined;
    // Across the cut along the negative x axis (or at the origin) every angle occurs,
    // ±π included (atan2(±0, x < 0) = ±π).
    if y.contains_zero() && x.lo <= 0.0 {
        return Interval::library(-PI, PI, undefined);
    }
    // Otherwise the box lies in one open half-plane where atan2 is continuous and
    // monotone in each argument: the extremes are at the corners.
    let corners = [
        y.lo.atan2(x.lo),
        y.lo.atan2(x.hi),
        y.hi.atan2(x.lo),
        y.hi.atan2(x.hi),
    ];
    match min_max(&corners) {
        Some((lo, hi)) => Interval::library(lo, hi, undefined),
        None => Interval::UNDEFINED,
    }
}

/// `hypot(a, b)`, non-decreasing in |a| and |b|; hypot(±∞, NaN) is +∞.
fn hypot(a: Interval, b: Interval) -> Interval {
    let mut out = Interval::NOTHING.with_undefined(a.maybe_undefined || b.maybe_undefined);
    if (a.maybe_undefined && b.has_inf()) || (b.maybe_undefined && a.has_inf()) {
        out = out.hull(Interval::point(f64::INFINITY));
    }
    if a.is_empty() || b.is_empty() {
        return out.with_undefined(true);
    }
    let lo = a.mig().hypot(b.mig());
    let hi = a.mag().hypot(b.mag());
    out.hull(Interval::library(lo, hi, false).clip(0.0, f64::INFINITY))
}

impl Number for Interval {
    fn constant(c: f64) -> Interval {
        Interval::point(c)
    }

    fn undefined() -> Interval {
        Interval::UNDEFINED
    }

    fn neg(self) -> Interval {
        if self.is_empty() {
            return self;
        }
        Interval {
            lo: -self.hi,
            hi: -self.lo,
            maybe_undefined: self.maybe_undefined,
        }
    }

    fn add(self, rhs: Interval) -> Interval {
        if self.is_empty() || rhs.is_empty() {
            return Interval::UNDEFINED;
        }
        let undefined = self.maybe_undefined
            || rhs.maybe_undefined
            || (self.has_pos_inf() && rhs.has_neg_inf())
            || (self.has_neg_inf() && rhs.has_pos_inf());
        let (lo, hi) = (self.lo + rhs.lo, self.hi + rhs.hi);
        // An exact sum (integers, a − a, …) is not moved.
        let lo = if sum_is_exact(self.lo, rhs.lo, lo) {
            lo
        } else if lo.is_nan() {
            f64::NEG_INFINITY
        } else {
            lo.next_down()
        };
        let hi = if sum_is_exact(self.hi, rhs.hi, hi) {
            hi
        } else if hi.is_nan() {
            f64::INFINITY
        } else {
            hi.next_up()
        };
        Interval {
            lo,
            hi,
            maybe_undefined: undefined,
        }
    }

    fn sub(self, rhs: Interval) -> Interval {
        self.add(rhs.neg())
    }

    fn mul(self, rhs: Interval) -> Interval {
        multiply(self, rhs)
    }

    fn div(self, rhs: Interval) -> Interval {
        divide(self, rhs)
    }

    fn rem(self, rhs: Interval) -> Interval {
        remainder(self, rhs)
    }

    fn pow(self, rhs: Interval) -> Interval {
        power_box(self, rhs)
    }

    fn powi(self, n: i32) -> Interval {
        match n {
            0 => Interval::point(1.0),
            1 => self,
            -1 => Interval::point(1.0).div(self),
            // x·x, x·x·x and (x·x)·(x·x): within 1, 2 and 3 roundings of the exact power;
            // one more ulp covers the exact value and the point value alike.
            2..=4 => integer_power(self, n as f64, |b| functions::power_int(b, n), n as f64),
            _ => power_point(self, n as f64),
        }
    }

    fn call1(self, f: Func) -> Interval {
        let x = self;
        match f {
            Func::Sqrt => {
                let (d, out) = within(x, 0.0, f64::INFINITY);
                if d.is_empty() {
                    return Interval::UNDEFINED;
                }
                let r = Interval::rounded(d.lo.sqrt(), d.hi.sqrt(), d.maybe_undefined || out);
                exact_zero(r, d.lo, d.hi).clip(0.0, f64::INFINITY)
            }
            Func::Cbrt => increasing(x, f64::cbrt, false),
            Func::Exp => increasing(x, f64::exp, false).clip(0.0, f64::INFINITY),
            Func::Expm1 => increasing(x, f64::exp_m1, false).clip(-1.0, f64::INFINITY),
            Func::Ln | Func::Log10 | Func::Log2 => {
                let (d, out) = within(x, 0.0, f64::INFINITY);
                let g = match f {
                    Func::Ln => f64::ln,
                    Func::Log10 => f64::log10,
                    _ => f64::log2,
                };
                increasing(d, g, out)
            }
            Func::Log1p => {
                let (d, out) = within(x, -1.0, f64::INFINITY);
                increasing(d, f64::ln_1p, out)
            }
            Func::Abs => {
                if x.is_empty() {
                    return Interval::UNDEFINED;
                }
                Interval {
                    lo: x.mig(),
                    hi: x.mag(),
                    maybe_undefined: x.maybe_undefined,
                }
            }
            Func::Sin => periodic_wave(x, f64::sin, FRAC_PI_2),
            Func::Cos => periodic_wave(x, f64::cos, 0.0),
            Func::Tan => periodic_poles(x, f64::tan, FRAC_PI_2, true),
            Func::Cot => periodic_poles(x, |v| Func::Cot.apply1(v), 0.0, false),
            // 1/cos and 1/sin: the division of the enclosure, as the point value divides.
            Func::Sec => Interval::point(1.0).div(periodic_wave(x, f64::cos, 0.0)),
            Func::Csc => Interval::point(1.0).div(periodic_wave(x, f64::sin, FRAC_PI_2)),
            Func::Asin => {
                let (d, out) = within(x, -1.0, 1.0);
                increasing(d, f64::asin, out)
            }
            Func::Acos => {
                let (d, out) = within(x, -1.0, 1.0);
                decreasing(d, f64::acos, out).clip(0.0, f64::INFINITY)
            }
            Func::Atan => increasing(x, f64::atan, false),
            Func::Sinh => increasing(x, f64::sinh, false),
            Func::Cosh => {
                if x.is_empty() {
                    return Interval::UNDEFINED;
                }
                Interval::library(x.mig().cosh(), x.mag().cosh(), x.maybe_undefined)
                    .clip(1.0, f64::INFINITY)
            }
            Func::Tanh => increasing(x, f64::tanh, false).clip(-1.0, 1.0),
            Func::Asinh => increasing(x, f64::asinh, false),
            Func::Acosh => {
                let (d, out) = within(x, 1.0, f64::INFINITY);
                increasing(d, |v| Func::Acosh.apply1(v), out).clip(0.0, f64::INFINITY)
            }
            Func::Atanh => {
                let (d, out) = within(x, -1.0, 1.0);
                increasing(d, f64::atanh, out)
            }
            Func::Deg => increasing(x, f64::to_degrees, false),
            Func::Rad => increasing(x, f64::to_radians, false),
            // Exact, non-decreasing step functions.
            Func::Floor | Func::Ceil | Func::Round | Func::Sign => {
                if x.is_empty() {
                    return Interval::UNDEFINED;
                }
                Interval {
                    lo: f.apply1(x.lo),
                    hi: f.apply1(x.hi),
                    maybe_undefined: x.maybe_undefined,
                }
            }
            Func::Signum => {
                if x.is_empty() {
                    return Interval::UNDEFINED;
                }
                // By the sign bit: an interval holding 0 may hold −0 and +0.
                Interval {
                    lo: if x.lo <= 0.0 { -1.0 } else { 1.0 },
                    hi: if x.hi >= 0.0 { 1.0 } else { -1.0 },
                    maybe_undefined: x.maybe_undefined,
                }
            }
            Func::Min | Func::Max => Interval::call_n(f, &[x]),
            Func::Atan2 | Func::Hypot | Func::Clamp | Func::When | Func::Npv => Interval::UNDEFINED,
        }
    }

    fn call2(f: Func, a: Interval, b: Interval) -> Interval {
        match f {
            Func::Atan2 => atan2(a, b),
            Func::Hypot => hypot(a, b),
            Func::Min | Func::Max | Func::Npv => Interval::call_n(f, &[a, b]),
            _ => Interval::UNDEFINED,
        }
    }

    fn call3(f: Func, a: Interval, b: Interval, c: Interval) -> Interval {
        match f {
            Func::Clamp => clamp(a, b, c),
            Func::When => when(a, b, c),
            Func::Min | Func::Max | Func::Npv => Interval::call_n(f, &[a, b, c]),
            _ => Interval::UNDEFINED,
        }
    }

    fn call_n(f: Func, args: &[Interval]) -> Interval {
        match (f, args) {
            (Func::Min, [_, ..]) => extreme(args, f64::min, f64::INFINITY),
            (Func::Max, [_, ..]) => extreme(args, f64::max, f64::NEG_INFINITY),
            (Func::Npv, [_, _, ..]) => super::program::npv(args),
            (_, [x]) => x.call1(f),
            (_, [a, b]) => Interval::call2(f, *a, *b),
            (_, [a, b, c]) => Interval::call3(f, *a, *b, *c),
            _ => Interval::UNDEFINED,
        }
    }
}

impl Program {
    /// The enclosure of the program's values over the box `slots` (allocates a stack;
    /// see [`Program::run`] to reuse one).
    pub fn eval_interval(&self, slots: &[Interval]) -> Interval {
        let mut stack = vec![Interval::point(0.0); self.stack_size()];
        self.run(slots, &mut stack)
    }
}
