//! Reading equation text: our own lexer and grammar check first, then meval.
//!
//! meval's tokenizer has panic paths (whitespace-only input is one) and gives byte
//! offsets at best, so every text goes through this module first:
//!
//! 1. a size limit ([`MAX_TEXT_BYTES`]) before anything else is done;
//! 2. a lexer that knows character positions, accepts a leading dot (`.5`) and names
//!    what it cannot read;
//! 3. an iterative grammar check (no recursion) with a nesting limit ([`MAX_DEPTH`]),
//!    known functions and their argument counts;
//! 4. a normalised text, built from the checked tokens only, handed to
//!    `meval::Expr::from_str` (meval's tokenizer and shunting-yard), whose RPN the
//!    compiler in [`super::program`] reads.
//!
//! **Precedence**, tightest first: parentheses and calls; `^` (right-associative);
//! unary `-` and `+`; `*`, `/`, `%` (left); `+`, `-` (left). So `-2^2` is -4 and
//! `2^3^2` is 512, as in common mathematical convention; this is meval's own order.
//!
//! By the time meval sees a text it is one that meval reads without panicking: no
//! whitespace, numbers in meval's own form, balanced parentheses, no empty calls.

use std::collections::HashSet;
use std::str::FromStr;

use super::functions;
use super::program::{Operand, Program};
use crate::dimension::Dimension;
use crate::error::InputError;
use crate::units;

/// The longest text accepted, in bytes (256 KiB). Longer input is refused before it is read.
pub const MAX_TEXT_BYTES: usize = 262_144;

/// The deepest nesting of parentheses and function calls accepted.
pub const MAX_DEPTH: usize = 100;

#[derive(Debug, Clone, PartialEq)]
pub(crate) enum Tok {
    /// A number, with its text in meval's form (a leading dot gets a `0`).
    Num(String),
    /// A number with a unit, `9.80665[m/s^2]`: its value in SI and its dimension.
    Quantity(Box<Quantity>),
    /// The statement label `SI:`, first in its statement.
    SiLabel,
    Ident(String),
    /// One of `+ - * / % ^`.
    Op(char),
    LParen,
    RParen,
    Comma,
    /// `=`
    Equals,
    /// `:=`
    Define,
    /// A newline or `;`.
    Separator,
}

/// A number written with a unit.
#[derive(Debug, Clone, PartialEq)]
pub(crate) struct Quantity {
    /// As written, `9.80665[m/s^2]`.
    pub written: String,
    /// The value in SI, in meval's form (in parentheses when negative).
    pub si_text: String,
    pub dimension: Dimension,
}

#[derive(Debug, Clone, PartialEq)]
pub(crate) struct Token {
    pub tok: Tok,
    /// Character offset in the whole text.
    pub pos: usize,
}

fn describe(tok: &Tok) -> String {
    match tok {
        Tok::Num(s) => format!("the number {s}"),
        Tok::Quantity(q) => format!("the quantity {}", q.written),
        Tok::SiLabel => "the label `SI:`".into(),
        Tok::Ident(s) => format!("`{s}`"),
        Tok::Op(c) => format!("`{c}`"),
        Tok::LParen => "`(`".into(),
        Tok::RParen => "`)`".into(),
        Tok::Comma => "`,`".into(),
        Tok::Equals => "`=`".into(),
        Tok::Define => "`:=`".into(),
        Tok::Separator => "the end of the statement".into(),
    }
}

/// Refuses text longer than [`MAX_TEXT_BYTES`].
pub(crate) fn check_size(text: &str) -> Result<(), InputError> {
    if text.len() > MAX_TEXT_BYTES {
        return Err(InputError::at(
            "input-too-long",
            format!(
                "the input is {} bytes long; the limit is {} bytes",
                text.len(),
                MAX_TEXT_BYTES
            ),
            0,
        ));
    }
    Ok(())
}

/// Splits text into tokens with character positions. Comments (`#` to the end of the
/// line) and spaces are dropped; newlines and `;` become separators.
pub(crate) fn lex(text: &str) -> Result<Vec<Token>, InputError> {
    check_size(text)?;
    let chars: Vec<char> = text.chars().collect();
    let n = chars.len();
    let mut out = Vec::new();
    let mut i = 0;
    while i < n {
        let c = chars[i];
        let pos = i;
        let next = chars.get(i + 1).copied();
        match c {
            '\n' | ';' => {
                out.push(Token {
                    tok: Tok::Separator,
                    pos,
                });
                i += 1;
            }
            '#' => {
                while i < n && chars[i] != '\n' {
                    i += 1;
                }
            }
            c if c.is_whitespace() => i += 1,
            '0'..='9' | '.' => {
                let (tok, end) = lex_number(&chars, i)?;
                let mut j = end;
                while j < n && (chars[j] == ' ' || chars[j] == '\t') {
                    j += 1;
                }
                if j < n && chars[j] == '[' {
                    let (quantity, after) = lex_unit(&chars, &tok, pos, j, &mut out)?;
                    out.push(quantity);
                    i = after;
                } else {
                    out.push(Token { tok, pos });
                    i = end;
                }
            }
            'a'..='z' | 'A'..='Z' | '_' => {
                let mut j = i + 1;
                while j < n && (chars[j].is_ascii_alphanumeric() || chars[j] == '_') {
                    j += 1;
                }
                let name: String = chars[i..j].iter().collect();
                out.push(Token {
                    tok: Tok::Ident(name),
                    pos,
                });
                i = j;
            }
            '*' if next == Some('*') => {
                return Err(InputError::at(
                    "unknown-operator",
                    "`**` is not an operator here; write powers with ^ (for example x^2)",
                    pos,
                ))
            }
            '+' | '-' | '*' | '/' | '%' | '^' => {
                out.push(Token {
                    tok: Tok::Op(c),
                    pos,
                });
                i += 1;
            }
            '(' | ')' | ',' => {
                let tok = match c {
                    '(' => Tok::LParen,
                    ')' => Tok::RParen,
                    _ => Tok::Comma,
                };
                out.push(Token { tok, pos });
                i += 1;
            }
            '=' if next == Some('=') => {
                return Err(InputError::at(
                    "unknown-operator",
                    "`==` is not an operator; an equation uses a single =",
                    pos,
                ))
            }
            '=' => {
                out.push(Token {
                    tok: Tok::Equals,
                    pos,
                });
                i += 1;
            }
            ':' if next == Some('=') => {
                out.push(Token {
                    tok: Tok::Define,
                    pos,
                });
                i += 2;
            }
            ':' if starts_si_label(&out) => {
                if let Some(last) = out.last_mut() {
                    last.tok = Tok::SiLabel;
                }
                i += 1;
            }
            ':' => {
                return Err(InputError::at(
                    "unexpected-character",
                    "`:` must be followed by `=` (a definition is written name := expression), \
                     or end the label SI: at the start of a statement",
                    pos,
                ))
            }
            '<' | '>' | '!' => {
                return Err(InputError::at(
                    "unknown-operator",
                    format!(
                        "`{c}` is not an operator; comparisons are not part of the language, \
                         write a piecewise relation with when(t, a, b)"
                    ),
                    pos,
                ))
            }
            '[' | ']' => {
                return Err(InputError::at(
                    "unexpected-character",
                    format!(
                        "`{c}` is used only for the unit of a number, right after it, as in \
                         9.80665[m/s^2]; group with ( and ), and give the units of variables \
                         with their values"
                    ),
                    pos,
                ))
            }
            '{' | '}' => {
                return Err(InputError::at(
                    "unexpected-character",
                    format!("`{c}` is not used in equations; group with ( and )"),
                    pos,
                ))
            }
            _ => {
                return Err(InputError::at(
                    "unexpected-character",
                    format!("unexpected character `{}` (U+{:04X})", c, c as u32),
                    pos,
                ))
            }
        }
    }
    Ok(out)
}

/// Whether a `:` now ends the label `SI:`: the last token is the name `SI` and it
/// starts a statement.
fn starts_si_label(out: &[Token]) -> bool {
    match out {
        [.., last] if last.tok != Tok::Ident("SI".into()) => false,
        [_] => true,
        [.., before, _] => before.tok == Tok::Separator,
        [] => false,
    }
}

/// Whether a sign at the end of `out` is a unary one (nothing before it that it could
/// subtract from).
fn sign_is_unary(out: &[Token]) -> bool {
    match out {
        [.., before, _] => !matches!(
            before.tok,
            Tok::Num(_) | Tok::Quantity(_) | Tok::Ident(_) | Tok::RParen
        ),
        _ => true,
    }
}

/// Reads the unit in brackets at `open` after the number `number` (at `pos`) and
/// returns the quantity token and the position after `]`. A temperature reading with
/// an offset (`-40[degC]`) takes a sign written just before it into the reading, so
/// that -40[degC] is 233.15 K, not -(313.15 K).
fn lex_unit(
    chars: &[char],
    number: &Tok,
    pos: usize,
    open: usize,
    out: &mut Vec<Token>,
) -> Result<(Token, usize), InputError> {
    let Tok::Num(text) = number else {
        return Err(InputError::at(
            "bad-number",
            "a unit must follow a number",
            open,
        ));
    };
    let close = chars[open + 1..]
        .iter()
        .position(|&c| matches!(c, ']' | '[' | '\n' | ';' | '#'))
        .map(|k| open + 1 + k);
    let Some(close) = close.filter(|&k| chars[k] == ']') else {
        return Err(InputError::at(
            "unbalanced-brackets",
            "this `[` is never closed: the unit of a number is written in brackets, as in \
             9.80665[m/s^2]",
            open,
        ));
    };
    let unit_text: String = chars[open + 1..close].iter().collect();
    let unit = units::parse_unit(&unit_text).map_err(|e| {
        InputError::at(
            e.code,
            format!("in the unit of the number {text}: {}", e.message),
            open + 1 + e.position.unwrap_or(0),
        )
    })?;
    let mut value: f64 = text.parse().unwrap_or(f64::NAN);
    let mut start = pos;
    let mut sign = "";
    if unit.offset != 0.0 {
        if let Some(Token {
            tok: Tok::Op(c @ ('-' | '+')),
            pos: at,
        }) = out.last().cloned()
        {
            if sign_is_unary(out) {
                out.pop();
                start = at;
                if c == '-' {
                    value = -value;
                    sign = "-";
                }
            }
        }
    }
    let si = unit.to_si(value);
    if !si.is_finite() {
        return Err(InputError::at(
            "bad-number",
            format!("the quantity {text}[{unit_text}] is too large for a 64-bit float in SI"),
            start,
        ));
    }
    let si_text = if si < 0.0 {
        format!("({si:e})")
    } else {
        format!("{si:e}")
    };
    let quantity = Quantity {
        written: format!("{sign}{text}[{unit_text}]"),
        si_text,
        dimension: unit.dimension,
    };
    Ok((
        Token {
            tok: Tok::Quantity(Box::new(quantity)),
            pos: start,
        },
        close + 1,
    ))
}

/// Reads `digits [. digits] [e [+-] digits]` or `. digits [exponent]` starting at `i`.
fn lex_number(chars: &[char], start: usize) -> Result<(Tok, usize), InputError> {
    let n = chars.len();
    let digits = |mut j: usize| {
        while j < n && chars[j].is_ascii_digit() {
            j += 1;
        }
        j
    };
    let mut j = digits(start);
    let int_digits = j - start;
    let mut frac_digits = 0;
    if j < n && chars[j] == '.' {
        let k = digits(j + 1);
        frac_digits = k - (j + 1);
        j = k;
    }
    if int_digits == 0 && frac_digits == 0 {
        return Err(InputError::at(
            "bad-number",
            "a lone `.` is not a number; write 0.5 or .5",
            start,
        ));
    }
    if j < n && (chars[j] == 'e' || chars[j] == 'E') {
        let mut k = j + 1;
        if k < n && (chars[k] == '+' || chars[k] == '-') {
            k += 1;
        }
        let e_end = digits(k);
        if e_end == k {
            let text: String = chars[start..j + 1].iter().collect();
            return Err(InputError::at(
                "bad-number",
                format!(
                    "the number `{text}` has an exponent mark with no digits after it \
                     (write 2e3 for 2000, or 2*e for 2 times the constant e)"
                ),
                j,
            ));
        }
        j = e_end;
    }
    let raw: String = chars[start..j].iter().collect();
    let text = if raw.starts_with('.') {
        format!("0{raw}")
    } else {
        raw
    };
    match f64::from_str(&text) {
        Ok(v) if v.is_finite() => Ok((Tok::Num(text), j)),
        _ => Err(InputError::at(
            "bad-number",
            format!("the number `{text}` is too large for a 64-bit float"),
            start,
        )),
    }
}

/// A function call or a parenthesis still open during the grammar check.
struct Open {
    pos: usize,
    call: Option<(&'static functions::Function, usize)>,
    args: usize,
}

/// Checks that `tokens` form one expression and returns the names used as variables
/// (with the position of their first use, in order of first appearance).
/// `end` is the character position just after the expression, for errors at its end.
pub(crate) fn check_expression(
    tokens: &[Token],
    end: usize,
) -> Result<Vec<(String, usize)>, InputError> {
    let mut names: Vec<(String, usize)> = Vec::new();
    let mut seen: HashSet<&str> = HashSet::new();
    let mut open: Vec<Open> = Vec::new();
    let mut want_operand = true;
    let mut i = 0;
    if tokens.is_empty() {
        return Err(InputError::at(
            "missing-operand",
            "an expression is missing here",
            end,
        ));
    }
    while i < tokens.len() {
        let t = &tokens[i];
        let next = tokens.get(i + 1);
        if want_operand {
            match &t.tok {
                Tok::Num(_) | Tok::Quantity(_) => want_operand = false,
                Tok::Ident(name)
                    if matches!(
                        next,
                        Some(Token {
                            tok: Tok::LParen,
                            ..
                        })
                    ) =>
                {
                    let Some(f) = functions::find(name) else {
                        return Err(unknown_function(name, t.pos));
                    };
                    push_open(&mut open, t.pos, Some(f))?;
                    i += 1; // the `(` belongs to the call
                    if let Some(Token {
                        tok: Tok::RParen, ..
                    }) = tokens.get(i + 1)
                    {
                        return Err(InputError::at(
                            "wrong-argument-count",
                            format!("function `{name}` takes {}, got none", f.arity.describe()),
                            t.pos,
                        ));
                    }
                }
                Tok::Ident(name) => {
                    if seen.insert(name.as_str()) {
                        names.push((name.clone(), t.pos));
                    }
                    want_operand = false;
                }
                Tok::Op('+') | Tok::Op('-') => {}
                Tok::LParen => {
                    if let Some(Token {
                        tok: Tok::RParen, ..
                    }) = next
                    {
                        return Err(InputError::at(
                            "missing-operand",
                            "empty parentheses `()`: an expression is missing inside",
                            t.pos,
                        ));
                    }
                    push_open(&mut open, t.pos, None)?;
                }
                other => {
                    return Err(InputError::at(
                        "missing-operand",
                        format!("an operand is missing before {}", describe(other)),
                        t.pos,
                    ))
                }
            }
        } else {
            match &t.tok {
                Tok::Op(_) => want_operand = true,
                Tok::RParen => {
                    let Some(o) = open.pop() else {
                        return Err(InputError::at(
                            "unbalanced-parentheses",
                            "this `)` has no matching `(`",
                            t.pos,
                        ));
                    };
                    if let Some((f, _)) = o.call {
                        check_arity(f, o.args + 1, o.pos)?;
                    }
                }
                Tok::Comma => match open.last_mut() {
                    Some(o) if o.call.is_some() => {
                        o.args += 1;
                        want_operand = true;
                    }
                    _ => {
                        return Err(InputError::at(
                            "unexpected-comma",
                            "`,` separates the arguments of a function call and is not \
                             allowed here",
                            t.pos,
                        ))
                    }
                },
                other => {
                    let prev = &tokens[i - 1].tok;
                    return Err(InputError::at(
                        "missing-operator",
                        format!(
                            "an operator is missing between {} and {} (write * for a product)",
                            describe(prev),
                            describe(other)
                        ),
                        t.pos,
                    ));
                }
            }
        }
        i += 1;
    }
    if want_operand {
        let last = tokens.last().map(|t| &t.tok);
        let what = last.map(describe).unwrap_or_default();
        return Err(InputError::at(
            "missing-operand",
            format!("the expression ends after {what}, where an operand is expected"),
            end,
        ));
    }
    if let Some(o) = open.last() {
        let what = match o.call {
            Some((f, _)) => format!("the call of `{}`", f.name),
            None => "this `(`".to_string(),
        };
        return Err(InputError::at(
            "unbalanced-parentheses",
            format!("{what} is never closed: a `)` is missing"),
            o.pos,
        ));
    }
    Ok(names)
}

fn push_open(
    open: &mut Vec<Open>,
    pos: usize,
    call: Option<&'static functions::Function>,
) -> Result<(), InputError> {
    if open.len() >= MAX_DEPTH {
        return Err(InputError::at(
            "too-deep",
            format!("parentheses and calls are nested more than {MAX_DEPTH} deep here"),
            pos,
        ));
    }
    open.push(Open {
        pos,
        call: call.map(|f| (f, 0)),
        args: 0,
    });
    Ok(())
}

fn check_arity(f: &functions::Function, n: usize, pos: usize) -> Result<(), InputError> {
    if f.arity.accepts(n) {
        Ok(())
    } else {
        Err(InputError::at(
            "wrong-argument-count",
            format!(
                "function `{}` takes {}, got {}",
                f.name,
                f.arity.describe(),
                n
            ),
            pos,
        ))
    }
}

fn unknown_function(name: &str, pos: usize) -> InputError {
    let hint = match name {
        "log" => " (use ln for the natural logarithm or log10 for base 10)",
        "pow" => " (write powers with ^, for example x^2)",
        "if" | "ifelse" | "cond" => " (use when(t, a, b): a if t > 0, else b)",
        "arcsin" | "arccos" | "arctan" => " (the inverse functions are asin, acos, atan)",
        _ => "",
    };
    InputError::at(
        "unknown-function",
        format!("unknown function `{name}`{hint}"),
        pos,
    )
}

/// The text of checked tokens in meval's form: no spaces, numbers as meval reads them.
pub(crate) fn normalise(tokens: &[Token], out: &mut String) {
    for t in tokens {
        match &t.tok {
            Tok::Num(s) | Tok::Ident(s) => out.push_str(s),
            Tok::Quantity(q) => out.push_str(&q.si_text),
            Tok::Op(c) => out.push(*c),
            Tok::LParen => out.push('('),
            Tok::RParen => out.push(')'),
            Tok::Comma => out.push(','),
            Tok::Equals | Tok::Define | Tok::Separator | Tok::SiLabel => {}
        }
    }
}

/// One checked expression: its normalised text, meval's parse of it, and the names it
/// uses as variables.
#[derive(Debug, Clone)]
pub struct Expression {
    normalised: String,
    expr: meval::Expr,
    /// Names used as variables (constants included), first position, in order of first use.
    names: Vec<(String, usize)>,
    position: usize,
}

impl Expression {
    /// Reads a single expression (no `=`, `:=` or `;`).
    ///
    /// ```
    /// use tacit::equations::Expression;
    /// let e = Expression::parse("-2^2").unwrap();
    /// assert_eq!(e.compile(&[]).unwrap().eval(&[]), -4.0);
    /// ```
    pub fn parse(text: &str) -> Result<Expression, InputError> {
        let tokens = lex(text)?;
        if let Some(t) = tokens.iter().find(|t| {
            matches!(
                t.tok,
                Tok::Equals | Tok::Define | Tok::Separator | Tok::SiLabel
            )
        }) {
            return Err(InputError::at(
                "not-an-expression",
                format!("{} is not allowed in a single expression", describe(&t.tok)),
                t.pos,
            ));
        }
        if tokens.is_empty() {
            return Err(InputError::at("empty-input", "the expression is empty", 0));
        }
        let end = text.chars().count();
        let names = check_expression(&tokens, end)?;
        let mut normalised = String::new();
        normalise(&tokens, &mut normalised);
        Expression::from_checked(normalised, names, 0)
    }

    /// Hands an already checked, normalised text to meval.
    pub(crate) fn from_checked(
        normalised: String,
        names: Vec<(String, usize)>,
        position: usize,
    ) -> Result<Expression, InputError> {
        match meval::Expr::from_str(&normalised) {
            Ok(expr) => Ok(Expression {
                normalised,
                expr,
                names,
                position,
            }),
            // Not expected after the check above; reported rather than trusted.
            Err(e) => Err(InputError::at(
                "parse-error",
                format!("the expression could not be read: {e}"),
                position,
            )),
        }
    }

    /// The text handed to meval.
    pub fn normalised(&self) -> &str {
        &self.normalised
    }

    /// meval's parse of [`Expression::normalised`], for comparisons.
    pub fn meval(&self) -> &meval::Expr {
        &self.expr
    }

    /// meval's RPN tokens.
    pub(crate) fn rpn(&self) -> &[meval::tokenizer::Token] {
        &self.expr
    }

    /// Names used as variables (constants such as `pi` included), in order of first use.
    pub fn names(&self) -> Vec<String> {
        self.names.iter().map(|(n, _)| n.clone()).collect()
    }

    /// The position of the first use of `name`.
    pub fn position_of(&self, name: &str) -> Option<usize> {
        self.names.iter().find(|(n, _)| n == name).map(|&(_, p)| p)
    }

    pub(crate) fn uses(&self) -> &[(String, usize)] {
        &self.names
    }

    /// The character position where the expression's statement starts.
    pub fn position(&self) -> usize {
        self.position
    }

    /// Compiles with `slots[i]` as the variable in slot i. Other names must be constants.
    pub fn compile(&self, slots: &[&str]) -> Result<Program, InputError> {
        Program::compile(self.rpn(), &mut |name| {
            slots
                .iter()
                .position(|s| *s == name)
                .map(Operand::Slot)
                .or_else(|| functions::constant(name).map(Operand::Value))
        })
        .map_err(|e| e.into_input_error(self))
    }
}

/// What a statement says.
#[derive(Debug, Clone, PartialEq)]
pub(crate) enum StatementKind {
    /// `lhs = rhs`, or a bare expression meaning `= 0`; the expression is the residual
    /// `(lhs)-(rhs)`.
    Equation,
    /// `name := expr`.
    Definition(String),
}

#[derive(Debug, Clone)]
pub(crate) struct Statement {
    pub kind: StatementKind,
    /// Character position of the statement's first token (after a label).
    pub position: usize,
    pub expr: Expression,
    /// Labelled `SI:`: it holds in SI units with numbers whose units are not written
    /// (an empirical relation, a physical constant typed bare); the dimension check
    /// takes it on trust.
    pub si_only: bool,
    /// Its tokens (the label left out), for the dimension check.
    pub tokens: Vec<Token>,
}

impl Statement {
    /// The tokens of the two sides: `(left, Some((position of =, right)))` for
    /// `lhs = rhs`, `(expr, None)` for a bare expression, `(body, None)` for a
    /// definition.
    pub(crate) fn sides(&self) -> (&[Token], Option<(usize, &[Token])>) {
        let t = &self.tokens;
        match self.kind {
            StatementKind::Definition(_) => (t.get(2..).unwrap_or(&[]), None),
            StatementKind::Equation => match t.iter().position(|x| x.tok == Tok::Equals) {
                Some(k) => (&t[..k], Some((t[k].pos, &t[k + 1..]))),
                None => (t, None),
            },
        }
    }
}

/// Reads a whole text into statements.
pub(crate) fn statements(text: &str) -> Result<Vec<Statement>, InputError> {
    let tokens = lex(text)?;
    let mut out = Vec::new();
    let mut start = 0;
    for k in 0..=tokens.len() {
        let at_end = k == tokens.len();
        if at_end || tokens[k].tok == Tok::Separator {
            let end = if at_end {
                text.chars().count()
            } else {
                tokens[k].pos
            };
            if k > start {
                out.push(statement(&tokens[start..k], end)?);
            }
            start = k + 1;
        }
    }
    if out.is_empty() {
        return Err(InputError::at(
            "empty-input",
            "the input has no equation: write one such as `y = 2*x + 1`",
            0,
        ));
    }
    Ok(out)
}

fn statement(tokens: &[Token], end: usize) -> Result<Statement, InputError> {
    let (si_only, tokens) = match tokens {
        [label, rest @ ..] if label.tok == Tok::SiLabel => {
            if rest.is_empty() {
                return Err(InputError::at(
                    "missing-operand",
                    "the label SI: is followed by no equation or definition",
                    label.pos,
                ));
            }
            (true, rest)
        }
        _ => (false, tokens),
    };
    let position = tokens[0].pos;
    if let Some(k) = tokens.iter().position(|t| t.tok == Tok::Define) {
        let name =
            match (k, &tokens[0].tok) {
                (1, Tok::Ident(name)) => name.clone(),
                _ => return Err(InputError::at(
                    "bad-definition",
                    "a definition is written `name := expression`, with a single name on the left",
                    tokens[k].pos,
                )),
            };
        let body = &tokens[2..];
        if let Some(t) = body
            .iter()
            .find(|t| matches!(t.tok, Tok::Equals | Tok::Define))
        {
            return Err(InputError::at(
                "bad-definition",
                format!(
                    "{} cannot follow a definition `{name} := …` in the same statement",
                    describe(&t.tok)
                ),
                t.pos,
            ));
        }
        if body.is_empty() {
            return Err(InputError::at(
                "bad-definition",
                format!("the definition of `{name}` has nothing after :="),
                tokens[k].pos,
            ));
        }
        let names = check_expression(body, end)?;
        let mut normalised = String::new();
        normalise(body, &mut normalised);
        return Ok(Statement {
            kind: StatementKind::Definition(name),
            position,
            expr: Expression::from_checked(normalised, names, position)?,
            si_only,
            tokens: tokens.to_vec(),
        });
    }
    let equals: Vec<&Token> = tokens.iter().filter(|t| t.tok == Tok::Equals).collect();
    let mut normalised = String::new();
    let names = match equals.as_slice() {
        [] => {
            let names = check_expression(tokens, end)?;
            normalise(tokens, &mut normalised);
            names
        }
        [eq] => {
            let k = tokens
                .iter()
                .position(|t| t.tok == Tok::Equals)
                .unwrap_or(0);
            let (lhs, rhs) = (&tokens[..k], &tokens[k + 1..]);
            if lhs.is_empty() {
                return Err(InputError::at(
                    "missing-operand",
                    "nothing on the left of =",
                    eq.pos,
                ));
            }
            if rhs.is_empty() {
                return Err(InputError::at(
                    "missing-operand",
                    "nothing on the right of =",
                    eq.pos,
                ));
            }
            let mut names = check_expression(lhs, eq.pos)?;
            let seen: HashSet<String> = names.iter().map(|(n, _)| n.clone()).collect();
            for (n, p) in check_expression(rhs, end)? {
                if !seen.contains(&n) {
                    names.push((n, p));
                }
            }
            normalised.push('(');
            normalise(lhs, &mut normalised);
            normalised.push_str(")-(");
            normalise(rhs, &mut normalised);
            normalised.push(')');
            names
        }
        [_, second, ..] => {
            return Err(InputError::at(
                "too-many-equals",
                "a statement has at most one `=`; put each equation on its own line or \
                 separate them with ;",
                second.pos,
            ))
        }
    };
    Ok(Statement {
        kind: StatementKind::Equation,
        position,
        expr: Expression::from_checked(normalised, names, position)?,
        si_only,
        tokens: tokens.to_vec(),
    })
}

/// The line of `text` holding character `position`, with a `^` under it:
///
/// ```
/// let c = tacit::equations::caret("y = 2*x +", 9);
/// assert_eq!(c, "y = 2*x +\n         ^");
/// ```
pub fn caret(text: &str, position: usize) -> String {
    let mut line_start = 0;
    for (i, c) in text.chars().enumerate() {
        if c == '\n' {
            if position <= i {
                break;
            }
            line_start = i + 1;
        }
    }
    let line: String = text
        .chars()
        .skip(line_start)
        .take_while(|&c| c != '\n')
        .collect();
    let column = position.saturating_sub(line_start);
    // Tabs stay tabs so the caret lines up however the tab is shown.
    let pad: String = line
        .chars()
        .chain(std::iter::repeat(' '))
        .take(column)
        .map(|c| if c == '\t' { '\t' } else { ' ' })
        .collect();
    format!("{line}\n{pad}^")
}
