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

/// The implementation of a function, by number of arguments.
#[derive(Clone, Copy)]
pub enum Implementation {
    One(fn(f64) -> f64),
    Two(fn(f64, f64) -> f64),
    Three(fn(f64, f64, f64) -> f64),
    Many(fn(&[f64]) -> f64),
}

impl Implementation {
    /// Calls the function on `args`; the caller has checked the count.
    pub fn call(self, args: &[f64]) -> f64 {
        match (self, args) {
            (Implementation::One(f), [a]) => f(*a),
            (Implementation::Two(f), [a, b]) => f(*a, *b),
            (Implementation::Three(f), [a, b, c]) => f(*a, *b, *c),
            (Implementation::Many(f), _) => f(args),
            _ => f64::NAN,
        }
    }
}

/// One function of the language.
#[derive(Clone, Copy)]
pub struct Function {
    pub name: &'static str,
    pub arity: Arity,
    pub implementation: Implementation,
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

macro_rules! f1 {
    ($name:expr, $f:expr, $doc:expr) => {
        Function {
            name: $name,
            arity: Arity::Exact(1),
            implementation: Implementation::One($f),
            summary: $doc,
        }
    };
}

/// Every function of the language.
pub const FUNCTIONS: &[Function] = &[
    f1!("sqrt", f64::sqrt, "square root"),
    f1!("cbrt", f64::cbrt, "cube root"),
    f1!("exp", f64::exp, "e to the power x"),
    f1!("ln", f64::ln, "natural logarithm"),
    f1!(
        "expm1",
        f64::exp_m1,
        "e^x − 1, exact for small x (no cancellation)"
    ),
    f1!(
        "log1p",
        f64::ln_1p,
        "ln(1 + x), exact for small x (no cancellation)"
    ),
    f1!("log10", f64::log10, "base-10 logarithm"),
    f1!("log2", f64::log2, "base-2 logarithm"),
    f1!("abs", f64::abs, "absolute value"),
    f1!("sin", f64::sin, "sine (radians)"),
    f1!("cos", f64::cos, "cosine (radians)"),
    f1!("tan", f64::tan, "tangent (radians)"),
    f1!("sec", sec, "secant, 1/cos x"),
    f1!("csc", csc, "cosecant, 1/sin x"),
    f1!("cot", cot, "cotangent, 1/tan x"),
    f1!("asin", f64::asin, "inverse sine (radians)"),
    f1!("acos", f64::acos, "inverse cosine (radians)"),
    f1!("atan", f64::atan, "inverse tangent (radians)"),
    f1!("sinh", f64::sinh, "hyperbolic sine"),
    f1!("cosh", f64::cosh, "hyperbolic cosine"),
    f1!("tanh", f64::tanh, "hyperbolic tangent"),
    f1!("asinh", f64::asinh, "inverse hyperbolic sine"),
    f1!("acosh", f64::acosh, "inverse hyperbolic cosine"),
    f1!("atanh", f64::atanh, "inverse hyperbolic tangent"),
    f1!("deg", degrees, "radians to degrees"),
    f1!("rad", radians, "degrees to radians"),
    f1!("floor", f64::floor, "largest integer ≤ x"),
    f1!("ceil", f64::ceil, "smallest integer ≥ x"),
    f1!(
        "round",
        f64::round,
        "nearest integer, halves away from zero"
    ),
    f1!("sign", sign, "-1, 0 or 1"),
    f1!(
        "signum",
        f64::signum,
        "-1 or 1 by the sign bit (signum(0) = 1)"
    ),
    Function {
        name: "atan2",
        arity: Arity::Exact(2),
        implementation: Implementation::Two(f64::atan2),
        summary: "atan2(y, x): angle of the point (x, y), radians",
    },
    Function {
        name: "hypot",
        arity: Arity::Exact(2),
        implementation: Implementation::Two(f64::hypot),
        summary: "hypot(a, b) = sqrt(a² + b²) without overflow",
    },
    Function {
        name: "clamp",
        arity: Arity::Exact(3),
        implementation: Implementation::Three(clamp),
        summary: "clamp(x, lo, hi): x limited to [lo, hi]; NaN if lo > hi",
    },
    Function {
        name: "when",
        arity: Arity::Exact(3),
        implementation: Implementation::Three(when),
        summary: "when(t, a, b): a if t > 0, else b (NaN if t is NaN)",
    },
    Function {
        name: "min",
        arity: Arity::AtLeast(1),
        implementation: Implementation::Many(min_of),
        summary: "smallest argument (NaN if any is NaN)",
    },
    Function {
        name: "max",
        arity: Arity::AtLeast(1),
        implementation: Implementation::Many(max_of),
        summary: "largest argument (NaN if any is NaN)",
    },
    Function {
        name: "npv",
        arity: Arity::AtLeast(2),
        implementation: Implementation::Many(npv),
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
        let imp = f.implementation;
        match f.arity {
            Arity::Exact(k) => {
                ctx.funcn(f.name, move |xs: &[f64]| imp.call(xs), k);
            }
            Arity::AtLeast(k) => {
                ctx.funcn(f.name, move |xs: &[f64]| imp.call(xs), k..);
            }
        }
    }
    ctx
}
