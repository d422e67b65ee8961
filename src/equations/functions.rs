//! The functions and constants of the equation language, as one table.
//!
//! The same table feeds the parser (names and argument counts), the compiled programs
//! (the implementations) and the reference context handed to meval in tests and the
//! benchmark, so a compiled program and meval call exactly the same Rust code.

use std::f64::consts;

/// How many arguments a function takes.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Arity {
    Exact(usize),
    AtLeast(usize),
}

impl Arity {
    pub fn accepts(self, n: usize) -> bool {
        match self {
            Arity::Exact(k) => n == k,
            Arity::AtLeast(k) => n >= k,
        }
    }

    /// "1 argument", "2 arguments", "at least 2 arguments".
    pub fn describe(self) -> String {
        let plural = |k: usize| if k == 1 { "argument" } else { "arguments" };
        match self {
            Arity::Exact(k) => format!("{k} {}", plural(k)),
            Arity::AtLeast(k) => format!("at least {k} {}", plural(k)),
        }
    }
}

/// One function of the language.
#[derive(Clone, Copy)]
pub struct Function {
    pub name: &'static str,
    pub arity: Arity,
    /// Which function: the compiled programs and every evaluator over them (point,
    /// interval, dual numbers) dispatch on this.
    pub func: Func,
    /// One line for the language table.
    pub summary: &'static str,
}

/// The named constants. A variable or definition of the same name shadows them.
pub const CONSTANTS: &[(&str, f64, &str)] = &[
    ("pi", consts::PI, "π = 3.14159…"),
    ("e", consts::E, "Euler's number 2.71828…"),
];

/// The value of a named constant.
pub fn constant(name: &str) -> Option<f64> {
    CONSTANTS
        .iter()
        .find(|(n, _, _)| *n == name)
        .map(|&(_, v, _)| v)
}

fn sec(x: f64) -> f64 {
    1.0 / x.cos()
}
fn csc(x: f64) -> f64 {
    1.0 / x.sin()
}
fn cot(x: f64) -> f64 {
    1.0 / x.tan()
}
fn degrees(x: f64) -> f64 {
    x.to_degrees()
}
fn radians(x: f64) -> f64 {
    x.to_radians()
}

/// Inverse hyperbolic cosine by the steps of fdlibm's `e_acosh.c` (Sun Microsystems,
/// 1993; FreeBSD msun): accurate near 1, where the standard library's
/// ln(x + √(x − 1)·√(x + 1)) loses digits (4e-12 relative at x = 1 + 1e-10 against
/// mpmath; `tests/interval_props.rs`).
fn acosh(x: f64) -> f64 {
    if x.is_nan() || x < 1.0 {
        f64::NAN
    } else if x >= 268_435_456.0 {
        // 2^28 ≤ x: x + √(x² − 1) is 2x to double precision.
        if x.is_infinite() {
            x
        } else {
            x.ln() + std::f64::consts::LN_2
        }
    } else if x > 2.0 {
        (2.0 * x - 1.0 / (x + (x * x - 1.0).sqrt())).ln()
    } else {
        let t = x - 1.0;
        (t + (2.0 * t + t * t).sqrt()).ln_1p()
    }
}

/// -1, 0 or +1 (0 for both zeros), NaN for NaN.
fn sign(x: f64) -> f64 {
    if x > 0.0 {
        1.0
    } else if x < 0.0 {
        -1.0
    } else if x == 0.0 {
        0.0
    } else {
        f64::NAN
    }
}

/// `x` limited to `[lo, hi]`; NaN if any argument is NaN or `lo > hi`
/// (never panics, unlike `f64::clamp`).
fn clamp(x: f64, lo: f64, hi: f64) -> f64 {
    if x.is_nan() || lo.is_nan() || hi.is_nan() || lo > hi {
        f64::NAN
    } else {
        x.max(lo).min(hi)
    }
}

/// `a` if `t > 0`, else `b`; NaN when `t` is NaN, so an undefined condition is never
/// silently taken as false.
fn when(t: f64, a: f64, b: f64) -> f64 {
    if t.is_nan() {
        f64::NAN
    } else if t > 0.0 {
        a
    } else {
        b
    }
}

/// The largest argument; NaN if any is NaN.
fn max_of(xs: &[f64]) -> f64 {
    let mut m = f64::NEG_INFINITY;
    for &x in xs {
        if x.is_nan() {
            return f64::NAN;
        }
        if x > m {
            m = x;
        }
    }
    m
}

/// The smallest argument; NaN if any is NaN.
fn min_of(xs: &[f64]) -> f64 {
    let mut m = f64::INFINITY;
    for &x in xs {
        if x.is_nan() {
            return f64::NAN;
        }
        if x < m {
            m = x;
        }
    }
    m
}

/// `npv(rate, c0, c1, ..., cn)` = Σ c_k / (1 + rate)^k, by Horner's rule from the last
/// cash flow: one division and one addition per cash flow.
fn npv(args: &[f64]) -> f64 {
    let Some((&rate, flows)) = args.split_first() else {
        return f64::NAN;
    };
    let g = 1.0 + rate;
    let mut acc = 0.0;
    for &c in flows.iter().rev() {
        acc = acc / g + c;
    }
    acc
}

/// A function of the language, by identity. The point value of each is below
/// ([`Func::call`]); the interval and dual-number evaluators give their own meaning to
/// the same names, so a new function must be added to every `match` on `Func`.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub enum Func {
    Sqrt,
    Cbrt,
    Exp,
    Ln,
    Expm1,
    Log1p,
    Log10,
    Log2,
    Abs,
    Sin,
    Cos,
    Tan,
    Sec,
    Csc,
    Cot,
    Asin,
    Acos,
    Atan,
    Sinh,
    Cosh,
    Tanh,
    Asinh,
    Acosh,
    Atanh,
    Deg,
    Rad,
    Floor,
    Ceil,
    Round,
    Sign,
    Signum,
    Atan2,
    Hypot,
    Clamp,
    When,
    Min,
    Max,
    Npv,
}

impl Func {
    /// The value of a one-argument function; NaN for a function of another arity.
    #[inline]
    pub fn apply1(self, x: f64) -> f64 {
        match self {
            Func::Sqrt => x.sqrt(),
            Func::Cbrt => x.cbrt(),
            Func::Exp => x.exp(),
            Func::Ln => x.ln(),
            Func::Expm1 => x.exp_m1(),
            Func::Log1p => x.ln_1p(),
            Func::Log10 => x.log10(),
            Func::Log2 => x.log2(),
            Func::Abs => x.abs(),
            Func::Sin => x.sin(),
            Func::Cos => x.cos(),
            Func::Tan => x.tan(),
            Func::Sec => sec(x),
            Func::Csc => csc(x),
            Func::Cot => cot(x),
            Func::Asin => x.asin(),
            Func::Acos => x.acos(),
            Func::Atan => x.atan(),
            Func::Sinh => x.sinh(),
            Func::Cosh => x.cosh(),
            Func::Tanh => x.tanh(),
            Func::Asinh => x.asinh(),
            Func::Acosh => acosh(x),
            Func::Atanh => x.atanh(),
            Func::Deg => degrees(x),
            Func::Rad => radians(x),
            Func::Floor => x.floor(),
            Func::Ceil => x.ceil(),
            Func::Round => x.round(),
            Func::Sign => sign(x),
            Func::Signum => x.signum(),
            Func::Min | Func::Max => self.call(&[x]),
            _ => f64::NAN,
        }
    }

    /// The value of a two-argument function; NaN for a function of another arity.
    #[inline]
    pub fn apply2(self, a: f64, b: f64) -> f64 {
        match self {
            Func::Atan2 => a.atan2(b),
            Func::Hypot => a.hypot(b),
            Func::Min | Func::Max | Func::Npv => self.call(&[a, b]),
            _ => f64::NAN,
        }
    }

    /// The value of a three-argument function; NaN for a function of another arity.
    #[inline]
    pub fn apply3(self, a: f64, b: f64, c: f64) -> f64 {
        match self {
            Func::Clamp => clamp(a, b, c),
            Func::When => when(a, b, c),
            Func::Min | Func::Max | Func::Npv => self.call(&[a, b, c]),
            _ => f64::NAN,
        }
    }

    /// The value at `args`; NaN when the count does not suit the function.
    pub fn call(self, args: &[f64]) -> f64 {
        match (self, args) {
            (Func::Min, [_, ..]) => min_of(args),
            (Func::Max, [_, ..]) => max_of(args),
            (Func::Npv, [_, _, ..]) => npv(args),
            (Func::Min | Func::Max | Func::Npv, _) => f64::NAN,
            (_, [x]) => self.apply1(*x),
            (_, [a, b]) => self.apply2(*a, *b),
            (_, [a, b, c]) => self.apply3(*a, *b, *c),
            _ => f64::NAN,
        }
    }
}

/// The integer exponents that `^` computes by multiplication rather than by `powf`
/// (see [`power`]).
pub const MULTIPLIED_EXPONENTS: std::ops::RangeInclusive<i32> = -1..=4;

/// The exponent as an integer when `^` computes it by multiplication.
#[inline]
pub fn multiplied_exponent(y: f64) -> Option<i32> {
    // `as` truncates; comparing back is exact for these small values (no libm call).
    if (-1.0..=4.0).contains(&y) && (y as i32) as f64 == y {
        Some(y as i32)
    } else {
        None
    }
}

/// `x^n` for `n` in [`MULTIPLIED_EXPONENTS`], by multiplication; `powf` otherwise.
#[inline]
pub fn power_int(x: f64, n: i32) -> f64 {
    match n {
        -1 => 1.0 / x,
        0 => 1.0,
        1 => x,
        2 => x * x,
        3 => x * x * x,
        4 => {
            let s = x * x;
            s * s
        }
        _ => x.powf(n as f64),
    }
}

/// The language's power `x^y`.
///
/// For `y` in {−1, 0, 1, 2, ½} the result is the correctly rounded value of xʸ (one
/// IEEE operation: `1/x`, `x*x`, `sqrt`), with IEEE `pow`'s special cases (`x^0` is 1
/// even for NaN; `(-0)^½` is +0 and `(−∞)^½` is +∞). For `y` = 3 and 4 it is `x*x*x`
/// and `(x*x)*(x*x)`: two roundings, so within 2 and 3 units in the last place of the
/// exact power (not correctly rounded). Every other `y` is `x.powf(y)`.
///
/// **A deliberate difference from `powf`** (and from meval, which uses `powf` for every
/// `^`): a multiplication costs a few cycles where `powf` costs some forty, and integer
/// powers are the common case in engineering formulas. The platform `pow` is not
/// correctly rounded either: glibc 2.36's differs from `x*x` for `y = 2` in about 4 of
/// 10 000 random arguments (by one unit in the last place); the wasm32 math library
/// (a port of musl/FreeBSD's `e_pow.c`) computes `y = 2` as `x*x` and `y = −1` as `1/x`
/// itself. `tests/equations_power.rs` checks the error bounds against a double-double
/// reference and against `powf`.
#[inline]
pub fn power(x: f64, y: f64) -> f64 {
    if let Some(n) = multiplied_exponent(y) {
        power_int(x, n)
    } else if y == 0.5 {
        if x == f64::NEG_INFINITY {
            f64::INFINITY
        } else {
            // + 0.0 turns the −0 of sqrt(−0) into pow's +0.
            x.sqrt() + 0.0
        }
    } else {
        x.powf(y)
    }
}

macro_rules! f1 {
    ($name:expr, $f:ident, $doc:expr) => {
        Function {
            name: $name,
            arity: Arity::Exact(1),
            func: Func::$f,
            summary: $doc,
        }
    };
}

/// Every function of the language.
pub const FUNCTIONS: &[Function] = &[
    f1!("sqrt", Sqrt, "square root"),
    f1!("cbrt", Cbrt, "cube root"),
    f1!("exp", Exp, "e to the power x"),
    f1!("ln", Ln, "natural logarithm"),
    f1!(
        "expm1",
        Expm1,
        "e^x − 1, exact for small x (no cancellation)"
    ),
    f1!(
        "log1p",
        Log1p,
        "ln(1 + x), exact for small x (no cancellation)"
    ),
    f1!("log10", Log10, "base-10 logarithm"),
    f1!("log2", Log2, "base-2 logarithm"),
    f1!("abs", Abs, "absolute value"),
    f1!("sin", Sin, "sine (radians)"),
    f1!("cos", Cos, "cosine (radians)"),
    f1!("tan", Tan, "tangent (radians)"),
    f1!("sec", Sec, "secant, 1/cos x"),
    f1!("csc", Csc, "cosecant, 1/sin x"),
    f1!("cot", Cot, "cotangent, 1/tan x"),
    f1!("asin", Asin, "inverse sine (radians)"),
    f1!("acos", Acos, "inverse cosine (radians)"),
    f1!("atan", Atan, "inverse tangent (radians)"),
    f1!("sinh", Sinh, "hyperbolic sine"),
    f1!("cosh", Cosh, "hyperbolic cosine"),
    f1!("tanh", Tanh, "hyperbolic tangent"),
    f1!("asinh", Asinh, "inverse hyperbolic sine"),
    f1!("acosh", Acosh, "inverse hyperbolic cosine"),
    f1!("atanh", Atanh, "inverse hyperbolic tangent"),
    f1!("deg", Deg, "radians to degrees"),
    f1!("rad", Rad, "degrees to radians"),
    f1!("floor", Floor, "largest integer ≤ x"),
    f1!("ceil", Ceil, "smallest integer ≥ x"),
    f1!("round", Round, "nearest integer, halves away from zero"),
    f1!("sign", Sign, "-1, 0 or 1"),
    f1!("signum", Signum, "-1 or 1 by the sign bit (signum(0) = 1)"),
    Function {
        name: "atan2",
        arity: Arity::Exact(2),
        func: Func::Atan2,
        summary: "atan2(y, x): angle of the point (x, y), radians",
    },
    Function {
        name: "hypot",
        arity: Arity::Exact(2),
        func: Func::Hypot,
        summary: "hypot(a, b) = sqrt(a² + b²) without overflow",
    },
    Function {
        name: "clamp",
        arity: Arity::Exact(3),
        func: Func::Clamp,
        summary: "clamp(x, lo, hi): x limited to [lo, hi]; NaN if lo > hi",
    },
    Function {
        name: "when",
        arity: Arity::Exact(3),
        func: Func::When,
        summary: "when(t, a, b): a if t > 0, else b (NaN if t is NaN)",
    },
    Function {
        name: "min",
        arity: Arity::AtLeast(1),
        func: Func::Min,
        summary: "smallest argument (NaN if any is NaN)",
    },
    Function {
        name: "max",
        arity: Arity::AtLeast(1),
        func: Func::Max,
        summary: "largest argument (NaN if any is NaN)",
    },
    Function {
        name: "npv",
        arity: Arity::AtLeast(2),
        func: Func::Npv,
        summary: "npv(rate, c0, …, cn) = Σ c_k / (1 + rate)^k",
    },
];

/// The function of this name.
pub fn find(name: &str) -> Option<&'static Function> {
    FUNCTIONS.iter().find(|f| f.name == name)
}

/// A meval context holding exactly this language's constants and functions, for
/// comparing compiled programs with `meval::Expr::eval_with_context` (tests, benchmark).
/// Combine it with the variables, variables first so that they shadow the constants:
/// `expr.eval_with_context((&vars, &reference_context()))`.
pub fn reference_context() -> meval::Context<'static> {
    let mut ctx = meval::Context::empty();
    for &(name, value, _) in CONSTANTS {
        ctx.var(name, value);
    }
    for f in FUNCTIONS {
        let func = f.func;
        match f.arity {
            Arity::Exact(k) => {
                ctx.funcn(f.name, move |xs: &[f64]| func.call(xs), k);
            }
            Arity::AtLeast(k) => {
                ctx.funcn(f.name, move |xs: &[f64]| func.call(xs), k..);
            }
        }
    }
    ctx
}
