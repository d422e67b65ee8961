//! The dimension check: every equation's two sides, every sum and difference, and
//! every function argument agree in dimension, given the dimension of some variables.
//!
//! **What is known.** A variable given a unit has that unit's dimension. A bare number
//! is dimensionless, except `0`, which fits any dimension (`x - L = 0`). A number with
//! a unit, `9.80665[m/s^2]`, has the unit's dimension. `pi` and `e` are dimensionless.
//! A definition has the dimension of its expression, or the one its unit says (and the
//! two must agree).
//!
//! **Unknown dimensions are skipped, not guessed.** A variable with no unit has an
//! unknown dimension, and so has any product, quotient or power that involves it; a
//! check with an unknown side passes. A sum takes the dimension of its known terms, so
//! `x + L` is a length when `L` is one, whatever `x` is; and a function that always
//! gives a pure number (`exp`, `ln`, `sin`, …) gives one whatever its argument. So a
//! text with no units at all passes; an error always involves two known dimensions.
//!
//! **Rules.** `+`, `-`, `%` and the two sides of `=`: the same dimension. `*`, `/`:
//! exponents add or subtract. `a^b`: `b` dimensionless; if `a` has a dimension, `b`
//! must be a constant number (`2`, `1.852`, `(2/3)`, `-0.5`) and the exponents of `a`
//! are multiplied by it exactly, as a fraction; otherwise `a` must be dimensionless.
//! Functions: see [`rule`]: `sqrt` and `cbrt` halve and third the exponents; `abs`,
//! `min`, `max`, `hypot`, `clamp` keep the dimension of their (equal) arguments;
//! `when(t, a, b)` that of `a` and `b`; `atan2(y, x)` needs `y` and `x` alike and gives
//! a pure number; `npv(rate, c0, …)` needs a dimensionless rate and alike cash flows;
//! every other function needs a dimensionless argument and gives a pure number (a
//! logarithm, an exponential, a trigonometric function, and `floor`, `round`, `ceil`,
//! whose result would change with the unit).
//!
//! **Trusted statements.** A statement labelled `SI:` holds only in SI units, with
//! numbers whose units are not written (Hazen–Williams' 10.67, Manning's 1.486 in US
//! units, a gas constant typed bare). It is not checked, and a name it defines has the
//! dimension of its unit if one is given, else an unknown one.
//!
//! Errors: `dimension-mismatch` when two dimensions that must agree differ ("left side
//! is a length, right side is a volume flow; at 14"), `dimensionless-argument` when a
//! function or an exponent needs a pure number. Both carry the character position.
//! Every error found is kept; the one returned is the first in the text.
//!
//! The check reads the tokens with its own shunting-yard (same precedence as the
//! language: `^` tightest and right-associative, then unary signs, then `* / %`, then
//! `+ -`), iteratively: no recursion, work and memory linear in the text.

use std::collections::{HashMap, HashSet};

use super::functions::{self, Function};
use super::parse::{Statement, StatementKind, Tok, Token};
use super::set::EquationSet;
use crate::dimension::{Dimension, Ratio};
use crate::error::InputError;

/// How a function treats dimensions.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Rule {
    /// Every argument dimensionless; the result dimensionless.
    PureNumber,
    /// One argument; the result has its exponents divided by the root's degree.
    Root(i64),
    /// Every argument of one dimension; the result of that dimension.
    Alike,
    /// Two arguments of one dimension; the result dimensionless (`atan2`).
    AlikeToPureNumber,
    /// Any argument; the result dimensionless (`sign`).
    SignOf,
    /// `when(t, a, b)`: `a` and `b` alike, the result theirs; `t` any.
    Choice,
    /// `npv(rate, c0, …)`: the rate dimensionless, the cash flows alike, the result theirs.
    PresentValue,
}

/// The dimension rule of a function of the language; `None` for a name that is not
/// one (a test checks every function in [`functions::FUNCTIONS`] has one).
pub fn rule(name: &str) -> Option<Rule> {
    Some(match name {
        "sqrt" => Rule::Root(2),
        "cbrt" => Rule::Root(3),
        "abs" | "min" | "max" | "hypot" | "clamp" => Rule::Alike,
        "atan2" => Rule::AlikeToPureNumber,
        "sign" | "signum" => Rule::SignOf,
        "when" => Rule::Choice,
        "npv" => Rule::PresentValue,
        "exp" | "ln" | "expm1" | "log1p" | "log10" | "log2" | "sin" | "cos" | "tan" | "sec"
        | "csc" | "cot" | "asin" | "acos" | "atan" | "sinh" | "cosh" | "tanh" | "asinh"
        | "acosh" | "atanh" | "deg" | "rad" | "floor" | "ceil" | "round" => Rule::PureNumber,
        _ => return None,
    })
}

/// What the check knows of a subexpression.
#[derive(Debug, Clone, Copy)]
struct Value {
    /// `None`: unknown, or any (a zero).
    dimension: Option<Dimension>,
    /// The exact value, for a constant built from numbers by `+ - * / ^`.
    exact: Option<Ratio>,
}

impl Value {
    const UNKNOWN: Value = Value {
        dimension: None,
        exact: None,
    };

    fn pure(exact: Option<Ratio>) -> Value {
        Value {
            dimension: Some(Dimension::NONE),
            exact,
        }
    }
}

/// One step of the postfix form.
#[derive(Clone, Copy)]
enum Step<'a> {
    Operand(&'a Token),
    Binary(char, usize),
    Negate,
    Call(&'static Function, usize, usize),
}

/// An entry of the operator stack of the shunting-yard.
#[derive(Clone, Copy)]
enum Pending {
    Binary(char, usize),
    Unary(char),
    Paren,
    Call(&'static Function, usize, usize),
}

fn precedence(p: &Pending) -> u8 {
    match p {
        Pending::Binary('+' | '-', _) => 1,
        Pending::Binary('^', _) => 4,
        Pending::Binary(..) => 2,
        Pending::Unary(_) => 3,
        Pending::Paren | Pending::Call(..) => 0,
    }
}

fn emit(p: Pending, out: &mut Vec<Step<'_>>) {
    match p {
        Pending::Binary(op, pos) => out.push(Step::Binary(op, pos)),
        Pending::Unary('-') => out.push(Step::Negate),
        Pending::Call(f, n, pos) => out.push(Step::Call(f, n, pos)),
        Pending::Unary(_) | Pending::Paren => {}
    }
}

/// Postfix form of checked tokens (the grammar check has run: this never fails, and on
/// anything malformed it returns what it has).
fn postfix(tokens: &[Token]) -> Vec<Step<'_>> {
    let mut out = Vec::with_capacity(tokens.len());
    let mut stack: Vec<Pending> = Vec::new();
    let mut want_operand = true;
    let mut i = 0;
    while i < tokens.len() {
        let t = &tokens[i];
        match &t.tok {
            Tok::Ident(name) if matches!(tokens.get(i + 1).map(|t| &t.tok), Some(Tok::LParen)) => {
                if let Some(f) = functions::find(name) {
                    stack.push(Pending::Call(f, 1, t.pos));
                } else {
                    stack.push(Pending::Paren);
                }
                i += 1;
                want_operand = true;
            }
            Tok::Num(_) | Tok::Quantity(_) | Tok::Ident(_) => {
                out.push(Step::Operand(t));
                want_operand = false;
            }
            Tok::Op(c) if want_operand => {
                stack.push(Pending::Unary(*c));
            }
            Tok::Op(c) => {
                let incoming = Pending::Binary(*c, t.pos);
                let p = precedence(&incoming);
                while let Some(top) = stack.last().copied() {
                    let q = precedence(&top);
                    if q == 0 || q < p || (q == p && *c == '^') {
                        break;
                    }
                    stack.pop();
                    emit(top, &mut out);
                }
                stack.push(incoming);
                want_operand = true;
            }
            Tok::LParen => {
                stack.push(Pending::Paren);
                want_operand = true;
            }
            Tok::Comma => {
                while let Some(top) = stack.last_mut() {
                    if let Pending::Call(_, n, _) = top {
                        *n += 1;
                        break;
                    }
                    if matches!(top, Pending::Paren) {
                        break;
                    }
                    if let Some(top) = stack.pop() {
                        emit(top, &mut out);
                    }
                }
                want_operand = true;
            }
            Tok::RParen => {
                while let Some(top) = stack.pop() {
                    match top {
                        Pending::Paren => break,
                        Pending::Call(..) => {
                            emit(top, &mut out);
                            break;
                        }
                        _ => emit(top, &mut out),
                    }
                }
                want_operand = false;
            }
            Tok::Equals | Tok::Define | Tok::Separator | Tok::SiLabel => {}
        }
        i += 1;
    }
    while let Some(top) = stack.pop() {
        emit(top, &mut out);
    }
    out
}

/// The dimensions of the names of a set, as the check sees them.
struct Names<'a> {
    given: &'a HashMap<String, Dimension>,
    /// Definitions checked so far.
    defined: HashMap<String, Option<Dimension>>,
    /// The variables (a constant's name among them is a variable, not the constant).
    variables: HashSet<String>,
}

impl Names<'_> {
    fn of(&self, name: &str) -> Value {
        if let Some(d) = self.defined.get(name) {
            return Value {
                dimension: *d,
                exact: None,
            };
        }
        if let Some(d) = self.given.get(name) {
            return Value {
                dimension: Some(*d),
                exact: None,
            };
        }
        if functions::constant(name).is_some() && !self.variables.contains(name) {
            return Value::pure(None);
        }
        Value::UNKNOWN
    }
}

/// The words for one dimension, `a length`; the caller knows it is known.
fn words(d: &Dimension) -> String {
    d.in_words()
}

/// Said after a mismatch when the statement has a bare number with a decimal point or
/// an exponent (9.80665, 10.67, 1.380649e-23): a likely cause.
const HIDDEN_UNITS_HINT: &str = " (if a number here stands for a quantity with a unit, write \
     the unit after it, as in 9.80665[m/s^2], or label an empirical statement SI:)";

struct Checker<'a, 'n> {
    names: &'n Names<'a>,
    errors: Vec<InputError>,
    /// The statement has a bare number written with a decimal point or an exponent.
    bare_numbers: bool,
}

impl Checker<'_, '_> {
    fn mismatch(&mut self, message: String, pos: usize) {
        let hint = if self.bare_numbers {
            HIDDEN_UNITS_HINT
        } else {
            ""
        };
        self.errors.push(InputError::at(
            "dimension-mismatch",
            format!("{message}; at {pos}{hint}"),
            pos,
        ));
    }

    fn needs_pure_number(&mut self, message: String, pos: usize) {
        self.errors.push(InputError::at(
            "dimensionless-argument",
            format!("{message}; at {pos}"),
            pos,
        ));
    }

    /// The dimension of one expression (one side of an equation, a definition's body).
    fn expression(&mut self, tokens: &[Token]) -> Value {
        let mut stack: Vec<Value> = Vec::new();
        for step in postfix(tokens) {
            let v = match step {
                Step::Operand(t) => self.operand(t),
                Step::Negate => match stack.pop() {
                    Some(v) => Value {
                        exact: v.exact.and_then(Ratio::checked_neg),
                        ..v
                    },
                    None => Value::UNKNOWN,
                },
                Step::Binary(op, pos) => {
                    let (Some(b), Some(a)) = (stack.pop(), stack.pop()) else {
                        return Value::UNKNOWN;
                    };
                    self.binary(op, pos, a, b)
                }
                Step::Call(f, n, pos) => {
                    if n > stack.len() {
                        return Value::UNKNOWN;
                    }
                    let args = stack.split_off(stack.len() - n);
                    self.call(f, pos, &args)
                }
            };
            stack.push(v);
        }
        match stack.as_slice() {
            [v] => *v,
            _ => Value::UNKNOWN,
        }
    }

    fn operand(&mut self, t: &Token) -> Value {
        match &t.tok {
            Tok::Num(text) => {
                let exact = Ratio::from_decimal(text);
                if exact.is_some_and(Ratio::is_zero) || text.parse::<f64>() == Ok(0.0) {
                    Value {
                        dimension: None,
                        exact,
                    }
                } else {
                    Value::pure(exact)
                }
            }
            Tok::Quantity(q) => Value {
                dimension: Some(q.dimension),
                exact: None,
            },
            Tok::Ident(name) => self.names.of(name),
            _ => Value::UNKNOWN,
        }
    }

    fn binary(&mut self, op: char, pos: usize, a: Value, b: Value) -> Value {
        let exact = match (a.exact, b.exact) {
            (Some(x), Some(y)) => match op {
                '+' => x.checked_add(y),
                '-' => x.checked_sub(y),
                '*' => x.checked_mul(y),
                '/' => x.checked_div(y),
                '^' => y.as_integer().and_then(|k| x.powi(k)),
                _ => None,
            },
            _ => None,
        };
        let dimension = match op {
            '+' | '-' | '%' => match (a.dimension, b.dimension) {
                (Some(x), Some(y)) if x != y => {
                    self.mismatch(
                        format!(
                            "left of `{op}` is {}, right of `{op}` is {}",
                            words(&x),
                            words(&y)
                        ),
                        pos,
                    );
                    None
                }
                (x, y) => x.or(y),
            },
            '*' => match (a.dimension, b.dimension) {
                (Some(x), Some(y)) => x.mul(&y),
                _ => None,
            },
            '/' => match (a.dimension, b.dimension) {
                (Some(x), Some(y)) => x.div(&y),
                _ => None,
            },
            '^' => self.power(pos, a, b),
            _ => None,
        };
        Value { dimension, exact }
    }

    fn power(&mut self, pos: usize, base: Value, exponent: Value) -> Option<Dimension> {
        if let Some(e) = exponent.dimension.filter(|d| !d.is_dimensionless()) {
            self.needs_pure_number(
                format!(
                    "the exponent of `^` must be dimensionless, but it is {}",
                    words(&e)
                ),
                pos,
            );
            return None;
        }
        let b = base.dimension?;
        if b.is_dimensionless() {
            return Some(b);
        }
        match exponent.exact {
            Some(e) => b.pow(e),
            None => {
                self.needs_pure_number(
                    format!(
                        "`^` raises {} to an exponent that is not a constant number, so the \
                         result has no fixed dimension: make the base dimensionless (divide it \
                         by a reference value) or the exponent a constant",
                        words(&b)
                    ),
                    pos,
                );
                None
            }
        }
    }

    /// Every known dimension among `args` must be the same; returns it.
    fn alike(&mut self, f: &Function, pos: usize, args: &[Value]) -> Option<Dimension> {
        let mut first: Option<Dimension> = None;
        for a in args {
            match (first, a.dimension) {
                (None, d) => first = d,
                (Some(x), Some(y)) if x != y => {
                    self.mismatch(
                        format!(
                            "the arguments of `{}` differ: {} and {}",
                            f.name,
                            words(&x),
                            words(&y)
                        ),
                        pos,
                    );
                    return None;
                }
                _ => {}
            }
        }
        first
    }

    fn pure_argument(&mut self, f: &Function, pos: usize, which: &str, a: &Value) {
        if let Some(d) = a.dimension.filter(|d| !d.is_dimensionless()) {
            self.needs_pure_number(
                format!(
                    "`{}` needs a dimensionless {which}, but it is given {}",
                    f.name,
                    words(&d)
                ),
                pos,
            );
        }
    }

    fn call(&mut self, f: &'static Function, pos: usize, args: &[Value]) -> Value {
        let dimension = match rule(f.name).unwrap_or(Rule::PureNumber) {
            Rule::PureNumber => {
                for (k, a) in args.iter().enumerate() {
                    let which = if args.len() == 1 {
                        "argument".to_string()
                    } else {
                        format!("argument {}", k + 1)
                    };
                    self.pure_argument(f, pos, &which, a);
                }
                Some(Dimension::NONE)
            }
            Rule::Root(k) => {
                let root = Ratio::new(1, k).unwrap_or(Ratio::ONE);
                args.first()
                    .and_then(|a| a.dimension)
                    .and_then(|d| d.pow(root))
            }
            Rule::Alike => self.alike(f, pos, args),
            Rule::AlikeToPureNumber => {
                self.alike(f, pos, args);
                Some(Dimension::NONE)
            }
            Rule::SignOf => Some(Dimension::NONE),
            Rule::Choice => self.alike(f, pos, args.get(1..).unwrap_or(&[])),
            Rule::PresentValue => {
                if let Some(rate) = args.first() {
                    self.pure_argument(f, pos, "rate (its first argument)", rate);
                }
                self.alike(f, pos, args.get(1..).unwrap_or(&[]))
            }
        };
        let exact = match (f.name, args) {
            ("abs", [a]) => a
                .exact
                .map(|r| Ratio::new(r.numerator().saturating_abs(), r.denominator()).unwrap_or(r)),
            _ => None,
        };
        Value { dimension, exact }
    }
}

/// The dimension each definition of `set` was found to have (`None` where unknown),
/// in text order.
pub type DefinitionDimensions = Vec<(String, Option<Dimension>)>;

/// Checks the dimensions of every statement of `set`, with `given` the dimensions of
/// the names that have a unit (variables, and definitions whose unit is given), and
/// `also_variables` the names the caller gives a value or solves for (so that a given
/// `e` is a variable, not Euler's number). Returns the dimension found for each
/// definition, or the first error in the text.
///
/// ```
/// use std::collections::{HashMap, HashSet};
/// use tacit::dimension::Dimension;
/// use tacit::equations::{dimensions, EquationSet};
/// let set = EquationSet::parse("V := Q/A\nhf = V^2/(2*9.80665[m/s^2])").unwrap();
/// let mut given = HashMap::new();
/// for (name, dim) in [("Q", "volume_flow"), ("A", "area"), ("hf", "length")] {
///     given.insert(name.to_string(), Dimension::named(dim).unwrap());
/// }
/// assert!(dimensions::check(&set, &given, &[]).is_ok());
/// given.insert("hf".to_string(), Dimension::named("volume_flow").unwrap());
/// let e = dimensions::check(&set, &given, &[]).unwrap_err();
/// assert_eq!(e.code, "dimension-mismatch");
/// assert_eq!(e.message, "left side is a volume flow, right side is a length; at 12");
/// ```
pub fn check(
    set: &EquationSet,
    given: &HashMap<String, Dimension>,
    also_variables: &[&str],
) -> Result<DefinitionDimensions, InputError> {
    let mut names = Names {
        given,
        defined: HashMap::new(),
        variables: set.variables().into_iter().collect(),
    };
    let extra = also_variables.iter().map(|s| s.to_string());
    names.variables.extend(given.keys().cloned().chain(extra));
    let mut errors: Vec<InputError> = Vec::new();
    for statement in set.definitions_in_order() {
        let StatementKind::Definition(name) = &statement.kind else {
            continue;
        };
        let declared = given.get(name).copied();
        let found = if statement.si_only {
            None
        } else {
            let mut c = checker(&names, statement);
            let body = c.expression(statement.sides().0).dimension;
            errors.append(&mut c.errors);
            if let (Some(d), Some(b)) = (declared, body) {
                if d != b {
                    errors.push(InputError::at(
                        "dimension-mismatch",
                        format!(
                            "`{name}` is {} by its unit, but its definition gives {}; at {}",
                            words(&d),
                            words(&b),
                            statement.position
                        ),
                        statement.position,
                    ));
                }
            }
            body
        };
        names.defined.insert(name.clone(), declared.or(found));
    }
    for statement in set.equation_statements() {
        if statement.si_only {
            continue;
        }
        let mut c = checker(&names, statement);
        let (left, right) = statement.sides();
        let l = c.expression(left).dimension;
        if let Some((pos, right)) = right {
            let r = c.expression(right).dimension;
            if let (Some(a), Some(b)) = (l, r) {
                if a != b {
                    c.mismatch(
                        format!("left side is {}, right side is {}", words(&a), words(&b)),
                        pos,
                    );
                }
            }
        }
        errors.append(&mut c.errors);
    }
    if let Some(first) = errors.into_iter().min_by_key(|e| e.position) {
        return Err(first);
    }
    let mut out: DefinitionDimensions = Vec::new();
    for name in set.definition_names() {
        let d = names.defined.get(&name).copied().flatten();
        out.push((name, d));
    }
    Ok(out)
}

fn checker<'a, 'n>(names: &'n Names<'a>, statement: &Statement) -> Checker<'a, 'n> {
    let bare_numbers = statement.tokens.iter().any(|t| match &t.tok {
        Tok::Num(s) => s.contains(['.', 'e', 'E']) && s.parse::<f64>().is_ok_and(|v| v != 0.0),
        _ => false,
    });
    Checker {
        names,
        errors: Vec::new(),
        bare_numbers,
    }
}

#[cfg(test)]
mod tests {
    //! The check's own reading of the tokens must have the structure meval gives the
    //! same text: both are evaluated as numbers and compared (meval 0.2, crates.io, is
    //! the general-purpose reference library the language is compiled against).

    use super::{postfix, Step};
    use crate::equations::functions::reference_context;
    use crate::equations::parse::{lex, Tok};

    /// Evaluates the check's postfix form with x = 0.7, y = -1.3, z = 2.1.
    fn evaluate(text: &str) -> f64 {
        let tokens = lex(text).unwrap();
        let mut stack: Vec<f64> = Vec::new();
        for step in postfix(&tokens) {
            let v = match step {
                Step::Operand(t) => match &t.tok {
                    Tok::Num(s) => s.parse().unwrap(),
                    Tok::Ident(n) => match n.as_str() {
                        "x" => 0.7,
                        "y" => -1.3,
                        "z" => 2.1,
                        other => crate::equations::functions::constant(other).unwrap(),
                    },
                    _ => unreachable!(),
                },
                Step::Negate => -stack.pop().unwrap(),
                Step::Binary(op, _) => {
                    let b = stack.pop().unwrap();
                    let a = stack.pop().unwrap();
                    match op {
                        '+' => a + b,
                        '-' => a - b,
                        '*' => a * b,
                        '/' => a / b,
                        '%' => a % b,
                        _ => a.powf(b),
                    }
                }
                Step::Call(f, n, _) => {
                    let args = stack.split_off(stack.len() - n);
                    f.func.call(&args)
                }
            };
            stack.push(v);
        }
        assert_eq!(stack.len(), 1, "{text}");
        stack[0]
    }

    fn meval(text: &str) -> f64 {
        let e: meval::Expr = text.parse().unwrap();
        let vars = vec![("x", 0.7), ("y", -1.3), ("z", 2.1)];
        e.eval_with_context((&vars, &reference_context())).unwrap()
    }

    /// A small deterministic generator of expressions over every operator, sign and
    /// function shape (no dependency on a random-number crate).
    fn generated(count: usize) -> Vec<String> {
        let mut seed: u64 = 0x9e37_79b9_7f4a_7c15;
        let mut next = move |n: u64| {
            seed = seed
                .wrapping_mul(6_364_136_223_846_793_005)
                .wrapping_add(1_442_695_040_888_963_407);
            (seed >> 33) % n
        };
        let mut out = Vec::new();
        for _ in 0..count {
            let mut e = String::new();
            for k in 0..(3 + next(10)) {
                if k > 0 {
                    e.push_str(["+", "-", "*", "/", "^", "%"][next(6) as usize]);
                }
                for _ in 0..next(3) {
                    let prefix = ["-", "+", "(", "-(", "hypot(2,", "sqrt(", "max(1,"];
                    e.push_str(prefix[next(7) as usize]);
                }
                e.push_str(["x", "y", "z", "2", "3", "0.5", "pi", "1.5"][next(8) as usize]);
            }
            // Close whatever was opened, at the end.
            let opened = e.matches('(').count();
            e.push_str(&")".repeat(opened));
            out.push(e);
        }
        out
    }

    #[test]
    fn postfix_has_meval_structure() {
        let fixed = [
            "-2^2",
            "2^3^2",
            "2^-1",
            "2^-3*4",
            "2^-3^2",
            "-x*y",
            "x*-y^z",
            "-x^2+y",
            "x-y-z",
            "x/y/z",
            "x/y*z",
            "x%y*z",
            "--x",
            "-+-x",
            "x^-y^-z",
            "hypot(x,y)^2",
            "-hypot(x,-y)",
            "max(x,y,z)-min(z,y)",
            "when(x-y,x^2,-z)",
            "npv(0.1,x,y,z)",
            "clamp(x,y,z)*2",
            "2*-3",
            "(x+y)^(2/3)",
            "x^(1/3)^2",
            "-(x)^2",
            "sqrt(x)^-2",
            "1/sqrt(x)",
            "x+y*z^2/x-y",
        ];
        let texts: Vec<String> = fixed
            .iter()
            .map(|s| s.to_string())
            .chain(generated(3000))
            .collect();
        for text in &texts {
            let (a, b) = (evaluate(text), meval(text));
            assert!(
                a.to_bits() == b.to_bits() || (a.is_nan() && b.is_nan()),
                "{text}: postfix {a}, meval {b}"
            );
        }
    }
}
