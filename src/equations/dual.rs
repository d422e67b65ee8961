//! Forward-mode automatic differentiation of a compiled program: dual numbers.
//!
//! A [`Dual`] carries a value and its derivative along one direction (one chosen slot
//! seeded with derivative 1). Running a [`Program`] with duals gives the value, bit for
//! bit the point evaluator's, and the derivative by the chain rule applied to each
//! operation: exact up to rounding, with no step size to choose. One run per direction:
//! [`Program::gradient`] makes one run per slot.
//!
//! ```
//! use tacit::equations::Expression;
//! let p = Expression::parse("x^3 + sin(x)").unwrap().compile(&["x"]).unwrap();
//! let d = p.derivative(&[2.0], 0);
//! assert_eq!(d.v, p.eval(&[2.0]));
//! assert!((d.d - (12.0 + 2f64.cos())).abs() < 1e-14);
//! ```
//!
//! **Over intervals.** `Dual<Interval>` runs the same rules with interval arithmetic: its
//! derivative part encloses f′ over the whole box, the slope that interval Newton
//! methods need. Where a function may jump inside the box (`floor`, `round`, `sign`,
//! `signum`, `%`, the switch of `when`), no slope bounds it: the derivative is the
//! whole line, marked as possibly undefined. Kinks (`abs`, `min`, `max`, `clamp`) are
//! continuous, and their derivative is the hull of the one-sided ones.
//!
//! At a single point a step function has derivative 0 and a kink takes the derivative
//! of the argument chosen (`abs`: `sign(x)`, 0 at 0). A derivative of a part that does
//! not depend on the chosen slot is exactly 0, even where its derivative formula is
//! infinite (`sqrt(k)` at k = 0 when differentiating with respect to x).

use super::functions::Func;
use super::interval::Interval;
use super::program::{npv, Number, Program};

/// What the derivative rules need of the number type beneath a [`Dual`] (`f64` or
/// [`Interval`]) beyond its arithmetic: deciding branches, and jumps.
pub trait Base: Number {
    /// `Some(true)` where `self > 0` everywhere, `Some(false)` where nowhere, `None`
    /// when it depends on the point or is undefined.
    fn positive(self) -> Option<bool>;
    /// `Some(true)` where `self < other` everywhere, `Some(false)` where nowhere.
    fn less(self, other: Self) -> Option<bool>;
    /// Whether the step function `f` (floor, ceil, round, sign, signum) may jump
    /// within `self`.
    fn may_jump(self, f: Func) -> bool;
    /// Whether the integer part toward zero may jump within `self`.
    fn trunc_may_jump(self) -> bool;
    /// Every value the two may take.
    fn hull(self, other: Self) -> Self;
    /// Exactly zero (everywhere).
    fn is_zero(self) -> bool;
    /// A slope nothing bounds (a jump): NaN, or the whole line marked undefined.
    fn unbounded() -> Self;
    /// The integer part, toward zero.
    fn trunc(self) -> Self;
    /// A derivative enclosure with no defined value (its formula is undefined over the
    /// whole box, such as ln of a negative base) becomes [`Base::unbounded`]: the
    /// function may still be defined there, at points where the term vanishes.
    fn or_unbounded(self) -> Self;
}

impl Base for f64 {
    fn positive(self) -> Option<bool> {
        if self.is_nan() {
            None
        } else {
            Some(self > 0.0)
        }
    }
    fn less(self, other: f64) -> Option<bool> {
        if self.is_nan() || other.is_nan() {
            None
        } else {
            Some(self < other)
        }
    }
    fn may_jump(self, _: Func) -> bool {
        false
    }
    fn trunc_may_jump(self) -> bool {
        false
    }
    fn hull(self, _: f64) -> f64 {
        f64::NAN
    }
    fn is_zero(self) -> bool {
        self == 0.0
    }
    fn unbounded() -> f64 {
        f64::NAN
    }
    fn trunc(self) -> f64 {
        f64::trunc(self)
    }
    fn or_unbounded(self) -> f64 {
        self
    }
}

impl Base for Interval {
    fn positive(self) -> Option<bool> {
        if self.maybe_undefined || self.is_empty() {
            None
        } else if self.lo > 0.0 {
            Some(true)
        } else if self.hi <= 0.0 {
            Some(false)
        } else {
            None
        }
    }
    fn less(self, other: Interval) -> Option<bool> {
        if self.maybe_undefined || other.maybe_undefined || self.is_empty() || other.is_empty() {
            None
        } else if self.hi < other.lo {
            Some(true)
        } else if self.lo >= other.hi {
            Some(false)
        } else {
            None
        }
    }
    fn may_jump(self, f: Func) -> bool {
        if self.maybe_undefined || self.is_empty() {
            return true;
        }
        match f {
            Func::Sign | Func::Signum => self.contains_zero(),
            Func::Floor | Func::Ceil | Func::Round => f.apply1(self.lo) != f.apply1(self.hi),
            _ => true,
        }
    }
    fn trunc_may_jump(self) -> bool {
        self.maybe_undefined || self.is_empty() || self.lo.trunc() != self.hi.trunc()
    }
    fn hull(self, other: Interval) -> Interval {
        Interval::hull(self, other)
    }
    fn is_zero(self) -> bool {
        self.lo == 0.0 && self.hi == 0.0 && !self.maybe_undefined
    }
    fn unbounded() -> Interval {
        Interval::WHOLE.or_undefined()
    }
    fn or_unbounded(self) -> Interval {
        if self.is_empty() {
            Interval::unbounded()
        } else {
            self
        }
    }
    fn trunc(self) -> Interval {
        if self.is_empty() {
            return self;
        }
        Interval {
            lo: self.lo.trunc(),
            hi: self.hi.trunc(),
            maybe_undefined: self.maybe_undefined,
        }
    }
}

/// A value and its derivative along one direction.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Dual<T> {
    pub v: T,
    pub d: T,
}

impl<T: Base> Dual<T> {
    /// The chosen variable at `v` (derivative 1).
    pub fn variable(v: T) -> Dual<T> {
        Dual {
            v,
            d: T::constant(1.0),
        }
    }

    /// A quantity that does not depend on the chosen variable.
    pub fn fixed(v: T) -> Dual<T> {
        Dual {
            v,
            d: T::constant(0.0),
        }
    }

    /// `v` with derivative `f′ · self.d` (0 when `self.d` is exactly 0).
    fn chain(self, v: T, slope: impl FnOnce() -> T) -> Dual<T> {
        Dual {
            v,
            d: if self.d.is_zero() {
                T::constant(0.0)
            } else {
                slope().mul(self.d)
            },
        }
    }
}

/// `a · b` where `b` is a derivative part: 0 when `b` is exactly 0.
fn scale<T: Base>(a: T, b: T) -> T {
    if b.is_zero() {
        T::constant(0.0)
    } else {
        a.mul(b)
    }
}

fn c<T: Base>(v: f64) -> T {
    T::constant(v)
}

/// Three-valued "and": false if any is false, true if all are true, else unknown.
fn all(verdicts: impl Iterator<Item = Option<bool>>) -> Option<bool> {
    let mut out = Some(true);
    for v in verdicts {
        match v {
            Some(false) => return Some(false),
            None => out = None,
            Some(true) => {}
        }
    }
    out
}

/// Of several candidates, the derivative of the one chosen; the hull of those that may
/// be chosen when it depends on the point; NaN-like when undefined.
fn chosen<T: Base>(candidates: &[(Option<bool>, T)]) -> T {
    let mut out: Option<T> = None;
    for &(maybe, d) in candidates {
        match maybe {
            Some(false) => {}
            Some(true) => return d,
            None => out = Some(out.map_or(d, |o| o.hull(d))),
        }
    }
    out.unwrap_or_else(T::unbounded)
}

impl<T: Base> Number for Dual<T> {
    fn constant(c: f64) -> Dual<T> {
        Dual::fixed(T::constant(c))
    }

    fn undefined() -> Dual<T> {
        Dual {
            v: T::undefined(),
            d: T::undefined(),
        }
    }

    fn neg(self) -> Dual<T> {
        Dual {
            v: self.v.neg(),
            d: self.d.neg(),
        }
    }

    fn add(self, rhs: Dual<T>) -> Dual<T> {
        Dual {
            v: self.v.add(rhs.v),
            d: self.d.add(rhs.d),
        }
    }

    fn sub(self, rhs: Dual<T>) -> Dual<T> {
        Dual {
            v: self.v.sub(rhs.v),
            d: self.d.sub(rhs.d),
        }
    }

    fn mul(self, rhs: Dual<T>) -> Dual<T> {
        Dual {
            v: self.v.mul(rhs.v),
            d: scale(rhs.v, self.d).add(scale(self.v, rhs.d)),
        }
    }

    fn div(self, rhs: Dual<T>) -> Dual<T> {
        let v = self.v.div(rhs.v);
        // (a/b)′ = (a′ − (a/b)·b′) / b.
        let d = if self.d.is_zero() && rhs.d.is_zero() {
            c(0.0)
        } else {
            self.d.sub(scale(v, rhs.d)).div(rhs.v)
        };
        Dual { v, d }
    }

    fn rem(self, rhs: Dual<T>) -> Dual<T> {
        // a % b = a − trunc(a/b)·b, with a jump wherever trunc(a/b) changes.
        let v = self.v.rem(rhs.v);
        if self.d.is_zero() && rhs.d.is_zero() {
            return Dual::fixed(v);
        }
        let q = self.v.div(rhs.v);
        let d = if q.trunc_may_jump() {
            T::unbounded()
        } else {
            self.d.sub(scale(q.trunc(), rhs.d))
        };
        Dual { v, d }
    }

    fn pow(self, rhs: Dual<T>) -> Dual<T> {
        // (x^y)′ = y·x^(y−1)·x′ + x^y·ln x·y′.
        let v = self.v.pow(rhs.v);
        let mut d: T = c(0.0);
        if !self.d.is_zero() {
            let slope = rhs.v.mul(self.v.pow(rhs.v.sub(c(1.0))));
            d = d.add(slope.mul(self.d).or_unbounded());
        }
        if !rhs.d.is_zero() {
            d = d.add(v.mul(self.v.call1(Func::Ln)).mul(rhs.d).or_unbounded());
        }
        Dual { v, d }
    }

    fn powi(self, n: i32) -> Dual<T> {
        if n == 0 {
            return Dual::fixed(self.v.powi(0));
        }
        let v = self.v.powi(n);
        self.chain(v, || c::<T>(n as f64).mul(self.v.powi(n - 1)))
    }

    fn call1(self, f: Func) -> Dual<T> {
        let x = self.v;
        let v = x.call1(f);
        let one = c::<T>(1.0);
        match f {
            Func::Sqrt => self.chain(v, || c::<T>(0.5).div(v)),
            Func::Cbrt => self.chain(v, || one.div(c::<T>(3.0).mul(v.powi(2)))),
            Func::Exp => self.chain(v, || v),
            Func::Expm1 => self.chain(v, || v.add(one)),
            Func::Ln => self.chain(v, || one.div(x)),
            Func::Log10 => self.chain(v, || one.div(x.mul(c(std::f64::consts::LN_10)))),
            Func::Log2 => self.chain(v, || one.div(x.mul(c(std::f64::consts::LN_2)))),
            Func::Log1p => self.chain(v, || one.div(one.add(x))),
            Func::Abs => self.chain(v, || x.call1(Func::Sign)),
            Func::Sin => self.chain(v, || x.call1(Func::Cos)),
            Func::Cos => self.chain(v, || x.call1(Func::Sin).neg()),
            Func::Tan => self.chain(v, || one.add(v.powi(2))),
            Func::Sec => self.chain(v, || v.mul(x.call1(Func::Tan))),
            Func::Csc => self.chain(v, || v.mul(x.call1(Func::Cot)).neg()),
            Func::Cot => self.chain(v, || one.add(v.powi(2)).neg()),
            Func::Asin => self.chain(v, || one.div(one.sub(x.powi(2)).call1(Func::Sqrt))),
            Func::Acos => self.chain(v, || one.div(one.sub(x.powi(2)).call1(Func::Sqrt)).neg()),
            Func::Atan => self.chain(v, || one.div(one.add(x.powi(2)))),
            Func::Sinh => self.chain(v, || x.call1(Func::Cosh)),
            Func::Cosh => self.chain(v, || x.call1(Func::Sinh)),
            Func::Tanh => self.chain(v, || one.sub(v.powi(2))),
            Func::Asinh => self.chain(v, || one.div(T::call2(Func::Hypot, x, one))),
            Func::Acosh => self.chain(v, || {
                one.div(
                    x.sub(one)
                        .call1(Func::Sqrt)
                        .mul(x.add(one).call1(Func::Sqrt)),
                )
            }),
            Func::Atanh => self.chain(v, || one.div(one.sub(x).mul(one.add(x)))),
            Func::Deg => self.chain(v, || c(180.0f64 / std::f64::consts::PI)),
            Func::Rad => self.chain(v, || c(std::f64::consts::PI / 180.0)),
            Func::Floor | Func::Ceil | Func::Round | Func::Sign | Func::Signum => {
                if self.d.is_zero() {
                    Dual::fixed(v)
                } else if x.may_jump(f) {
                    Dual {
                        v,
                        d: T::unbounded(),
                    }
                } else {
                    Dual::fixed(v)
                }
            }
            Func::Min | Func::Max => Dual::call_n(f, &[self]),
            Func::Atan2 | Func::Hypot | Func::Clamp | Func::When | Func::Npv => Dual::undefined(),
        }
    }

    fn call2(f: Func, a: Dual<T>, b: Dual<T>) -> Dual<T> {
        match f {
            Func::Atan2 => {
                // atan2(y, x)′ = (x·y′ − y·x′) / (x² + y²).
                let (y, x) = (a, b);
                let v = T::call2(f, y.v, x.v);
                if y.d.is_zero() && x.d.is_zero() {
                    return Dual::fixed(v);
                }
                let num = scale(x.v, y.d).sub(scale(y.v, x.d));
                let den = x.v.powi(2).add(y.v.powi(2));
                Dual { v, d: num.div(den) }
            }
            Func::Hypot => {
                let v = T::call2(f, a.v, b.v);
                if a.d.is_zero() && b.d.is_zero() {
                    return Dual::fixed(v);
                }
                let num = scale(a.v, a.d).add(scale(b.v, b.d));
                Dual { v, d: num.div(v) }
            }
            Func::Min | Func::Max | Func::Npv => Dual::call_n(f, &[a, b]),
            _ => Dual::undefined(),
        }
    }

    fn call3(f: Func, a: Dual<T>, b: Dual<T>, c3: Dual<T>) -> Dual<T> {
        match f {
            Func::When => {
                let v = T::call3(f, a.v, b.v, c3.v);
                let d = match a.v.positive() {
                    Some(true) => b.d,
                    Some(false) => c3.d,
                    // A switch inside the box (or an undefined condition): a jump.
                    None => T::unbounded(),
                };
                Dual { v, d }
            }
            Func::Clamp => {
                let (x, lo, hi) = (a, b, c3);
                let v = T::call3(f, x.v, lo.v, hi.v);
                let below = x.v.less(lo.v);
                let above = hi.v.less(x.v);
                let inside = all([below.map(|b| !b), above.map(|b| !b)].into_iter());
                let d = chosen(&[(below, lo.d), (above, hi.d), (inside, x.d)]);
                Dual { v, d }
            }
            Func::Min | Func::Max | Func::Npv => Dual::call_n(f, &[a, b, c3]),
            _ => Dual::undefined(),
        }
    }

    fn call_n(f: Func, args: &[Dual<T>]) -> Dual<T> {
        match (f, args) {
            (Func::Min | Func::Max, [_, ..]) => {
                let values: Vec<T> = args.iter().map(|a| a.v).collect();
                let v = T::call_n(f, &values);
                // `better(p, q)`: p strictly smaller (min) or larger (max) than q.
                let better = |p: T, q: T| if f == Func::Min { p.less(q) } else { q.less(p) };
                // The point value takes the first best argument: i is chosen when it is
                // strictly better than every earlier one and no later one beats it.
                let candidates: Vec<(Option<bool>, T)> = (0..args.len())
                    .map(|i| {
                        let verdicts = (0..args.len()).filter(|&j| j != i).map(|j| {
                            if j < i {
                                better(args[i].v, args[j].v)
                            } else {
                                better(args[j].v, args[i].v).map(|b| !b)
                            }
                        });
                        (all(verdicts), args[i].d)
                    })
                    .collect();
                Dual {
                    v,
                    d: chosen(&candidates),
                }
            }
            (Func::Npv, [_, _, ..]) => npv(args),
            (_, [x]) => x.call1(f),
            (_, [a, b]) => Dual::call2(f, *a, *b),
            (_, [a, b, c3]) => Dual::call3(f, *a, *b, *c3),
            _ => Dual::undefined(),
        }
    }
}

impl Program {
    /// The value and the derivative with respect to slot `seed` at the point `slots`
    /// (allocates; see [`Program::run`] with [`Dual`] slots to reuse buffers).
    pub fn derivative(&self, slots: &[f64], seed: usize) -> Dual<f64> {
        let duals: Vec<Dual<f64>> = slots
            .iter()
            .enumerate()
            .map(|(i, &v)| {
                if i == seed {
                    Dual::variable(v)
                } else {
                    Dual::fixed(v)
                }
            })
            .collect();
        let mut stack = vec![Dual::fixed(0.0); self.stack_size()];
        self.run(&duals, &mut stack)
    }

    /// The value, and the derivative with respect to every slot in `gradient` (one run
    /// per slot; `gradient` as long as the slots).
    pub fn gradient(&self, slots: &[f64], gradient: &mut [f64]) -> f64 {
        let mut duals: Vec<Dual<f64>> = slots.iter().map(|&v| Dual::fixed(v)).collect();
        let mut stack = vec![Dual::fixed(0.0); self.stack_size()];
        let mut value = self.eval(slots);
        for (i, g) in gradient.iter_mut().enumerate().take(slots.len()) {
            duals[i].d = 1.0;
            let r = self.run(&duals, &mut stack);
            duals[i].d = 0.0;
            value = r.v;
            *g = r.d;
        }
        value
    }
}
