//! Compiled evaluation: meval's RPN translated once into a compact stack program.
//!
//! Variables are resolved to slot numbers (or to fixed values) at compile time, so an
//! evaluation does no name lookup, no hashing and no allocation: it walks a `Vec<Op>`
//! over a caller-provided stack.
//!
//! **One program, several kinds of number.** [`Program::run`] walks the program with
//! any [`Number`]; `f64` is the point value ([`Program::eval_with`]). Functions keep
//! their identity ([`Func`]) in the program, so each kind of number gives each function
//! its own meaning.
//!
//! **The point value is meval's, except for `^`.** Each operation does what
//! `meval::Expr::eval_with_context` does for the same RPN token (`left % right` for
//! `%`, the functions of [`super::functions::reference_context`]), except the power:
//! `^` is [`functions::power`], which multiplies for the exponents −1 to 4 (and takes
//! a square root for ½) where meval calls `powf`. For −1, 0, 1, 2 and ½ that is the
//! correctly rounded power; for 3 and 4 it is within 2 and 3 units in the last place
//! (see [`functions::power`]; `tests/equations_power.rs` checks both against a
//! double-double reference and `powf`). Programs without such powers are bit-identical
//! to meval, and the property tests check it. The rewrites the compiler makes keep
//! every bit of that value:
//! - *fused operands*: `x * 2.5` becomes one `MulConst(2.5)` instead of a push and a
//!   multiply, `1/sqrt(f)` a square root then `ConstDiv(1)`; the same `left ⊕ right`
//!   is computed, operands in the same order;
//! - *folding*: an operation whose operands are all fixed values is computed once at
//!   compile time with the same Rust operation, and its result stored;
//! - *sharing*: a subexpression that occurs more than once (`sqrt(f)` twice in the
//!   Colebrook residual) is computed once and kept; every function is pure, so the
//!   kept value has the bits a recomputation would have;
//! - *push forms*: a push of a slot or constant and the operation on it that follows
//!   become one operation (`Load(s), MulConst(c)` is `LoadMulConst(s, c)`): one
//!   dispatch instead of two.
//!
//! Integer powers −1 to 4 become `PowInt(n)` (multiplications), and `^1` is dropped.
//!
//! Unary plus is dropped (meval pushes the value back unchanged).

use super::functions::{self, Func};
use super::parse::Expression;
use crate::error::InputError;
use meval::tokenizer::{Operation, Token};
use std::collections::HashMap;

/// What a name resolves to at compile time.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Operand {
    /// Read from this slot at every evaluation.
    Slot(usize),
    /// A fixed value, folded into the program.
    Value(f64),
}

/// A kind of number a [`Program`] can be run with: the operations of the language.
///
/// `f64` is the point value. Each method gives the meaning of one operation of the language; a
/// constant of the program (a number in the text, a folded known) enters through
/// [`Number::constant`].
pub trait Number: Copy {
    /// A fixed value of the program.
    fn constant(c: f64) -> Self;
    /// The result of a program that cannot run (slots or stack too short).
    fn undefined() -> Self;
    fn neg(self) -> Self;
    fn add(self, rhs: Self) -> Self;
    fn sub(self, rhs: Self) -> Self;
    fn mul(self, rhs: Self) -> Self;
    fn div(self, rhs: Self) -> Self;
    /// Remainder with the sign of the dividend (`%`).
    fn rem(self, rhs: Self) -> Self;
    /// The language's `^`: [`functions::power`].
    fn pow(self, rhs: Self) -> Self;
    /// `^n` with a constant exponent `n` in [`functions::MULTIPLIED_EXPONENTS`]:
    /// [`functions::power_int`].
    fn powi(self, n: i32) -> Self;
    fn call1(self, f: Func) -> Self;
    fn call2(f: Func, a: Self, b: Self) -> Self;
    fn call3(f: Func, a: Self, b: Self, c: Self) -> Self;
    /// A function of any number of arguments (`min`, `max`, `npv`).
    fn call_n(f: Func, args: &[Self]) -> Self;
}

impl Number for f64 {
    #[inline(always)]
    fn constant(c: f64) -> f64 {
        c
    }
    #[inline(always)]
    fn undefined() -> f64 {
        f64::NAN
    }
    #[inline(always)]
    fn neg(self) -> f64 {
        -self
    }
    #[inline(always)]
    fn add(self, rhs: f64) -> f64 {
        self + rhs
    }
    #[inline(always)]
    fn sub(self, rhs: f64) -> f64 {
        self - rhs
    }
    #[inline(always)]
    fn mul(self, rhs: f64) -> f64 {
        self * rhs
    }
    #[inline(always)]
    fn div(self, rhs: f64) -> f64 {
        self / rhs
    }
    #[inline(always)]
    fn rem(self, rhs: f64) -> f64 {
        self % rhs
    }
    #[inline(always)]
    fn pow(self, rhs: f64) -> f64 {
        functions::power(self, rhs)
    }
    #[inline(always)]
    fn powi(self, n: i32) -> f64 {
        functions::power_int(self, n)
    }
    #[inline(always)]
    fn call1(self, f: Func) -> f64 {
        f.apply1(self)
    }
    #[inline(always)]
    fn call2(f: Func, a: f64, b: f64) -> f64 {
        f.apply2(a, b)
    }
    #[inline(always)]
    fn call3(f: Func, a: f64, b: f64, c: f64) -> f64 {
        f.apply3(a, b, c)
    }
    #[inline]
    fn call_n(f: Func, args: &[f64]) -> f64 {
        f.call(args)
    }
}

/// One operation. The top of the stack is kept in a register (`acc`); `Stack` forms take
/// their left operand from the stack, the fused forms take one operand from a constant
/// or a slot (`XConst`: acc ⊕ c, `ConstX`: c ⊕ acc, likewise with a slot).
#[derive(Debug, Clone, Copy)]
enum Op {
    Load(u32),
    Const(f64),
    Neg,
    Add,
    AddConst(f64),
    AddLoad(u32),
    ConstAdd(f64),
    LoadAdd(u32),
    Sub,
    SubConst(f64),
    SubLoad(u32),
    ConstSub(f64),
    LoadSub(u32),
    Mul,
    MulConst(f64),
    MulLoad(u32),
    ConstMul(f64),
    LoadMul(u32),
    Div,
    DivConst(f64),
    DivLoad(u32),
    ConstDiv(f64),
    LoadDiv(u32),
    Rem,
    RemConst(f64),
    RemLoad(u32),
    ConstRem(f64),
    LoadRem(u32),
    Pow,
    PowConst(f64),
    PowLoad(u32),
    ConstPow(f64),
    LoadPow(u32),
    /// `^n` for a constant integer n in [`functions::MULTIPLIED_EXPONENTS`].
    PowInt(i32),
    Sqrt,
    Call1(Func),
    Call2(Func),
    Call3(Func),
    CallN(Func, u32),
    /// Push forms: push, then compute from slots and constants only (`Load(s)` and the
    /// operation after it, fused by [`fuse_pushes`]).
    LoadAddConst(u32, f64),
    LoadSubConst(u32, f64),
    LoadMulConst(u32, f64),
    LoadDivConst(u32, f64),
    ConstSubLoad(f64, u32),
    ConstDivLoad(f64, u32),
    LoadAddLoad(u32, u32),
    LoadSubLoad(u32, u32),
    LoadMulLoad(u32, u32),
    LoadDivLoad(u32, u32),
    LoadPowInt(u32, i32),
    LoadSqrt(u32),
    LoadCall1(u32, Func),
    /// Keep the top in stack cell i (a cell past the operand stack) for a later `Fetch`.
    Store(u32),
    /// Push the value kept in stack cell i.
    Fetch(u32),
}

impl Op {
    /// How many operands the operation takes from the stack (the top included).
    fn operands(self) -> usize {
        match self {
            Op::Load(_)
            | Op::Const(_)
            | Op::Fetch(_)
            | Op::LoadAddConst(..)
            | Op::LoadSubConst(..)
            | Op::LoadMulConst(..)
            | Op::LoadDivConst(..)
            | Op::ConstSubLoad(..)
            | Op::ConstDivLoad(..)
            | Op::LoadAddLoad(..)
            | Op::LoadSubLoad(..)
            | Op::LoadMulLoad(..)
            | Op::LoadDivLoad(..)
            | Op::LoadPowInt(..)
            | Op::LoadSqrt(_)
            | Op::LoadCall1(..) => 0,
            Op::Add | Op::Sub | Op::Mul | Op::Div | Op::Rem | Op::Pow | Op::Call2(_) => 2,
            Op::Call3(_) => 3,
            Op::CallN(_, n) => n as usize,
            _ => 1,
        }
    }
}

/// Why compiling failed.
#[derive(Debug, Clone, PartialEq)]
pub enum CompileError {
    /// A name that the resolver does not know.
    UnknownVariable(String),
    UnknownFunction(String),
    /// The RPN is not a well-formed expression (not expected from checked text).
    Malformed(&'static str),
}

impl CompileError {
    /// An input error pointing at the first use of the name in `expr`.
    pub(crate) fn into_input_error(self, expr: &Expression) -> InputError {
        match self {
            CompileError::UnknownVariable(name) => {
                let message = format!("no value is given for the variable `{name}`");
                match expr.position_of(&name) {
                    Some(p) => InputError::at("missing-value", message, p),
                    None => InputError::new("missing-value", message),
                }
            }
            CompileError::UnknownFunction(name) => InputError::at(
                "unknown-function",
                format!("unknown function `{name}`"),
                expr.position(),
            ),
            CompileError::Malformed(what) => InputError::at(
                "parse-error",
                format!("the expression could not be compiled: {what}"),
                expr.position(),
            ),
        }
    }
}

/// A compiled expression. Evaluate it with [`Program::eval_with`] (no allocation) or
/// [`Program::eval`] (allocates a stack; for one-off use), or with any [`Number`]
/// through [`Program::run`].
#[derive(Debug, Clone)]
pub struct Program {
    ops: Vec<Op>,
    /// The most operands alive at once.
    depth: usize,
    /// Values kept for re-use (common subexpressions).
    kept: usize,
    slots: usize,
    /// A power folded at compile time was multiplied out.
    multiplied_fold: bool,
}

/// The longest right operand moved over when a left operand is fused: keeps compiling
/// linear in the length of the text.
const FUSE_WINDOW: usize = 64;

impl Program {
    /// Translates meval RPN. `resolve` maps each variable name to a slot or a fixed
    /// value; `None` is an unknown variable.
    pub fn compile(
        rpn: &[Token],
        resolve: &mut dyn FnMut(&str) -> Option<Operand>,
    ) -> Result<Program, CompileError> {
        let mut b = Builder {
            ops: Vec::with_capacity(rpn.len()),
            starts: Vec::new(),
            max_depth: 0,
            slots: 0,
            multiplied_fold: false,
        };
        for token in rpn {
            match token {
                Token::Number(v) => b.push(Op::Const(*v)),
                Token::Var(name) => match resolve(name) {
                    Some(Operand::Slot(s)) => {
                        let s32 = u32::try_from(s).map_err(|_| CompileError::Malformed("slot"))?;
                        b.slots = b.slots.max(s + 1);
                        b.push(Op::Load(s32))
                    }
                    Some(Operand::Value(v)) => b.push(Op::Const(v)),
                    None => return Err(CompileError::UnknownVariable(name.clone())),
                },
                Token::Binary(op) => b.binary(*op)?,
                Token::Unary(Operation::Plus) => b.need(1)?,
                Token::Unary(Operation::Minus) => b.negate()?,
                Token::Unary(_) => return Err(CompileError::Malformed("unary operator")),
                Token::Func(name, Some(n)) => {
                    let f = functions::find(name)
                        .ok_or_else(|| CompileError::UnknownFunction(name.clone()))?;
                    if !f.arity.accepts(*n) {
                        return Err(CompileError::Malformed("argument count"));
                    }
                    b.call(f.func, *n)?
                }
                _ => return Err(CompileError::Malformed("unexpected token")),
            }
        }
        if b.starts.len() != 1 {
            return Err(CompileError::Malformed("operands left over"));
        }
        let (ops, depth, kept) = match share_common(b.ops) {
            Ok(shared) => shared,
            Err(ops) => (ops, b.max_depth, 0),
        };
        // A push form needs no more stack than the pair it replaces.
        let ops = fuse_pushes(ops);
        Ok(Program {
            ops,
            depth,
            kept,
            slots: b.slots,
            multiplied_fold: b.multiplied_fold,
        })
    }

    /// The stack length [`Program::eval_with`] needs: the operands, then the kept values.
    pub fn stack_size(&self) -> usize {
        self.depth + 1 + self.kept
    }

    /// The number of slots read (highest slot + 1).
    pub fn slot_count(&self) -> usize {
        self.slots
    }

    /// The value when the program is a constant (everything folded).
    pub fn as_constant(&self) -> Option<f64> {
        match self.ops.as_slice() {
            [Op::Const(v)] => Some(*v),
            _ => None,
        }
    }

    /// Number of operations (for tests of folding).
    pub fn len(&self) -> usize {
        self.ops.len()
    }

    pub fn is_empty(&self) -> bool {
        self.ops.is_empty()
    }

    /// Whether the program raises to a power by multiplication
    /// ([`functions::power`]), where meval would call `powf`.
    pub fn has_multiplied_powers(&self) -> bool {
        self.multiplied_fold
            || self.ops.iter().any(|op| match *op {
                Op::PowInt(_)
                | Op::LoadPowInt(..)
                | Op::Pow
                | Op::PowLoad(_)
                | Op::ConstPow(_)
                | Op::LoadPow(_) => true,
                Op::PowConst(c) => c == 0.5 || functions::multiplied_exponent(c).is_some(),
                _ => false,
            })
    }

    /// Evaluates with a fresh stack.
    pub fn eval(&self, slots: &[f64]) -> f64 {
        let mut stack = vec![0.0; self.stack_size()];
        self.eval_with(slots, &mut stack)
    }

    /// Evaluates with `slots` and a stack of at least [`Program::stack_size`]; NaN if
    /// either is too short (never panics).
    #[inline]
    pub fn eval_with(&self, slots: &[f64], stack: &mut [f64]) -> f64 {
        self.run(slots, stack)
    }

    /// Evaluates with any kind of [`Number`]: `slots` and a stack of at least
    /// [`Program::stack_size`]; [`Number::undefined`] if either is too short (never
    /// panics).
    #[inline]
    pub fn run<N: Number>(&self, slots: &[N], stack: &mut [N]) -> N {
        if slots.len() < self.slots || stack.len() < self.stack_size() || self.ops.is_empty() {
            return N::undefined();
        }
        // `sp` counts the values below the top; `acc` is the top.
        let mut acc = N::constant(0.0);
        let mut sp = 0usize;
        // Pushes the top and makes `$v` (which does not read the top) the new top.
        macro_rules! push {
            ($v:expr) => {{
                let v = $v;
                stack[sp] = acc;
                sp += 1;
                acc = v;
            }};
        }
        for op in &self.ops {
            match *op {
                Op::Load(s) => push!(slots[s as usize]),
                Op::Const(v) => push!(N::constant(v)),
                Op::Neg => acc = acc.neg(),
                Op::Add => {
                    sp -= 1;
                    acc = stack[sp].add(acc);
                }
                Op::AddConst(c) => acc = acc.add(N::constant(c)),
                Op::AddLoad(s) => acc = acc.add(slots[s as usize]),
                Op::ConstAdd(c) => acc = N::constant(c).add(acc),
                Op::LoadAdd(s) => acc = slots[s as usize].add(acc),
                Op::Sub => {
                    sp -= 1;
                    acc = stack[sp].sub(acc);
                }
                Op::SubConst(c) => acc = acc.sub(N::constant(c)),
                Op::SubLoad(s) => acc = acc.sub(slots[s as usize]),
                Op::ConstSub(c) => acc = N::constant(c).sub(acc),
                Op::LoadSub(s) => acc = slots[s as usize].sub(acc),
                Op::Mul => {
                    sp -= 1;
                    acc = stack[sp].mul(acc);
                }
                Op::MulConst(c) => acc = acc.mul(N::constant(c)),
                Op::MulLoad(s) => acc = acc.mul(slots[s as usize]),
                Op::ConstMul(c) => acc = N::constant(c).mul(acc),
                Op::LoadMul(s) => acc = slots[s as usize].mul(acc),
                Op::Div => {
                    sp -= 1;
                    acc = stack[sp].div(acc);
                }
                Op::DivConst(c) => acc = acc.div(N::constant(c)),
                Op::DivLoad(s) => acc = acc.div(slots[s as usize]),
                Op::ConstDiv(c) => acc = N::constant(c).div(acc),
                Op::LoadDiv(s) => acc = slots[s as usize].div(acc),
                Op::Rem => {
                    sp -= 1;
                    acc = stack[sp].rem(acc);
                }
                Op::RemConst(c) => acc = acc.rem(N::constant(c)),
                Op::RemLoad(s) => acc = acc.rem(slots[s as usize]),
                Op::ConstRem(c) => acc = N::constant(c).rem(acc),
                Op::LoadRem(s) => acc = slots[s as usize].rem(acc),
                Op::Pow => {
                    sp -= 1;
                    acc = stack[sp].pow(acc);
                }
                Op::PowConst(c) => acc = acc.pow(N::constant(c)),
                Op::PowLoad(s) => acc = acc.pow(slots[s as usize]),
                Op::ConstPow(c) => acc = N::constant(c).pow(acc),
                Op::LoadPow(s) => acc = slots[s as usize].pow(acc),
                Op::PowInt(n) => acc = acc.powi(n),
                Op::Sqrt => acc = acc.call1(Func::Sqrt),
                Op::Call1(f) => acc = acc.call1(f),
                Op::Call2(f) => {
                    sp -= 1;
                    acc = N::call2(f, stack[sp], acc);
                }
                Op::Call3(f) => {
                    sp -= 2;
                    acc = N::call3(f, stack[sp], stack[sp + 1], acc);
                }
                Op::CallN(f, n) => {
                    let n = n as usize;
                    stack[sp] = acc;
                    acc = N::call_n(f, &stack[sp + 1 - n..=sp]);
                    sp -= n - 1;
                }
                Op::LoadAddConst(s, c) => push!(slots[s as usize].add(N::constant(c))),
                Op::LoadSubConst(s, c) => push!(slots[s as usize].sub(N::constant(c))),
                Op::LoadMulConst(s, c) => push!(slots[s as usize].mul(N::constant(c))),
                Op::LoadDivConst(s, c) => push!(slots[s as usize].div(N::constant(c))),
                Op::ConstSubLoad(c, s) => push!(N::constant(c).sub(slots[s as usize])),
                Op::ConstDivLoad(c, s) => push!(N::constant(c).div(slots[s as usize])),
                Op::LoadAddLoad(s, t) => push!(slots[s as usize].add(slots[t as usize])),
                Op::LoadSubLoad(s, t) => push!(slots[s as usize].sub(slots[t as usize])),
                Op::LoadMulLoad(s, t) => push!(slots[s as usize].mul(slots[t as usize])),
                Op::LoadDivLoad(s, t) => push!(slots[s as usize].div(slots[t as usize])),
                Op::LoadPowInt(s, n) => push!(slots[s as usize].powi(n)),
                Op::LoadSqrt(s) => push!(slots[s as usize].call1(Func::Sqrt)),
                Op::LoadCall1(s, f) => push!(slots[s as usize].call1(f)),
                Op::Store(i) => stack[i as usize] = acc,
                Op::Fetch(i) => push!(stack[i as usize]),
            }
        }
        acc
    }
}

/// `npv(rate, c0, …, cn)` for any [`Number`], by the same steps as the point value
/// (Horner's rule from the last cash flow: `acc / (1 + rate) + c`).
pub(crate) fn npv<N: Number>(args: &[N]) -> N {
    let Some((&rate, flows)) = args.split_first() else {
        return N::undefined();
    };
    let g = N::constant(1.0).add(rate);
    let mut acc = N::constant(0.0);
    for &c in flows.iter().rev() {
        acc = acc.div(g).add(c);
    }
    acc
}

struct Builder {
    ops: Vec<Op>,
    /// For each operand on the compile-time stack, the index of its first operation.
    starts: Vec<usize>,
    max_depth: usize,
    slots: usize,
    /// Whether a folded power was multiplied out (see [`Program::has_multiplied_powers`]).
    multiplied_fold: bool,
}

fn apply(op: Operation, left: f64, right: f64) -> f64 {
    match op {
        Operation::Plus => left + right,
        Operation::Minus => left - right,
        Operation::Times => left * right,
        Operation::Div => left / right,
        Operation::Rem => left % right,
        Operation::Pow => functions::power(left, right),
    }
}

fn fuse_right(op: Operation, operand: Op) -> Option<Op> {
    match (op, operand) {
        (Operation::Plus, Op::Const(c)) => Some(Op::AddConst(c)),
        (Operation::Plus, Op::Load(s)) => Some(Op::AddLoad(s)),
        (Operation::Minus, Op::Const(c)) => Some(Op::SubConst(c)),
        (Operation::Minus, Op::Load(s)) => Some(Op::SubLoad(s)),
        (Operation::Times, Op::Const(c)) => Some(Op::MulConst(c)),
        (Operation::Times, Op::Load(s)) => Some(Op::MulLoad(s)),
        (Operation::Div, Op::Const(c)) => Some(Op::DivConst(c)),
        (Operation::Div, Op::Load(s)) => Some(Op::DivLoad(s)),
        (Operation::Rem, Op::Const(c)) => Some(Op::RemConst(c)),
        (Operation::Rem, Op::Load(s)) => Some(Op::RemLoad(s)),
        (Operation::Pow, Op::Const(c)) => Some(match functions::multiplied_exponent(c) {
            Some(n) => Op::PowInt(n),
            None => Op::PowConst(c),
        }),
        (Operation::Pow, Op::Load(s)) => Some(Op::PowLoad(s)),
        _ => None,
    }
}

fn fuse_left(op: Operation, operand: Op) -> Option<Op> {
    match (op, operand) {
        (Operation::Plus, Op::Const(c)) => Some(Op::ConstAdd(c)),
        (Operation::Plus, Op::Load(s)) => Some(Op::LoadAdd(s)),
        (Operation::Minus, Op::Const(c)) => Some(Op::ConstSub(c)),
        (Operation::Minus, Op::Load(s)) => Some(Op::LoadSub(s)),
        (Operation::Times, Op::Const(c)) => Some(Op::ConstMul(c)),
        (Operation::Times, Op::Load(s)) => Some(Op::LoadMul(s)),
        (Operation::Div, Op::Const(c)) => Some(Op::ConstDiv(c)),
        (Operation::Div, Op::Load(s)) => Some(Op::LoadDiv(s)),
        (Operation::Rem, Op::Const(c)) => Some(Op::ConstRem(c)),
        (Operation::Rem, Op::Load(s)) => Some(Op::LoadRem(s)),
        (Operation::Pow, Op::Const(c)) => Some(Op::ConstPow(c)),
        (Operation::Pow, Op::Load(s)) => Some(Op::LoadPow(s)),
        _ => None,
    }
}

impl Builder {
    fn push(&mut self, op: Op) {
        self.starts.push(self.ops.len());
        self.ops.push(op);
        self.max_depth = self.max_depth.max(self.starts.len());
    }

    fn need(&self, n: usize) -> Result<(), CompileError> {
        if self.starts.len() < n {
            Err(CompileError::Malformed("missing operands"))
        } else {
            Ok(())
        }
    }

    /// The fixed values of the top `n` operands, when each is a single `Const`.
    fn constant_tail(&self, n: usize) -> Option<Vec<f64>> {
        let k = self.starts.len();
        let first = self.starts[k - n];
        if self.ops.len() - first != n {
            return None;
        }
        self.ops[first..]
            .iter()
            .map(|op| match op {
                Op::Const(v) => Some(*v),
                _ => None,
            })
            .collect()
    }

    fn binary(&mut self, op: Operation) -> Result<(), CompileError> {
        self.need(2)?;
        if let Some(v) = self.constant_tail(2) {
            if op == Operation::Pow
                && (v[1] == 0.5 || functions::multiplied_exponent(v[1]).is_some())
            {
                self.multiplied_fold = true;
            }
            self.replace_top(2, Op::Const(apply(op, v[0], v[1])));
            return Ok(());
        }
        let right = self.starts.pop().unwrap_or(0);
        let left = *self.starts.last().unwrap_or(&0);
        let end = self.ops.len();
        // A right operand of one operation: fuse it (acc ⊕ c).
        if end == right + 1 {
            // x^1 is x exactly (IEEE pow), for every x.
            if op == Operation::Pow && matches!(self.ops[right], Op::Const(c) if c == 1.0) {
                self.ops.pop();
                return Ok(());
            }
            if let Some(f) = fuse_right(op, self.ops[right]) {
                self.ops[right] = f;
                return Ok(());
            }
        }
        // A left operand of one operation: move it after the right operand (c ⊕ acc).
        if right == left + 1 && end - right <= FUSE_WINDOW {
            if let Some(f) = fuse_left(op, self.ops[left]) {
                self.ops.remove(left);
                self.ops.push(f);
                return Ok(());
            }
        }
        self.ops.push(match op {
            Operation::Plus => Op::Add,
            Operation::Minus => Op::Sub,
            Operation::Times => Op::Mul,
            Operation::Div => Op::Div,
            Operation::Rem => Op::Rem,
            Operation::Pow => Op::Pow,
        });
        Ok(())
    }

    /// Replaces the top `n` operands (all single constants) by one operation.
    fn replace_top(&mut self, n: usize, op: Op) {
        let k = self.starts.len();
        let first = self.starts[k - n];
        self.ops.truncate(first);
        self.starts.truncate(k - n);
        self.push(op);
    }

    fn negate(&mut self) -> Result<(), CompileError> {
        self.need(1)?;
        if let Some(v) = self.constant_tail(1) {
            self.replace_top(1, Op::Const(-v[0]));
        } else {
            self.ops.push(Op::Neg);
        }
        Ok(())
    }

    fn call(&mut self, func: Func, n: usize) -> Result<(), CompileError> {
        if n == 0 {
            return Err(CompileError::Malformed("call without arguments"));
        }
        self.need(n)?;
        if let Some(v) = self.constant_tail(n) {
            self.replace_top(n, Op::Const(func.call(&v)));
            return Ok(());
        }
        let op = match (func, n) {
            (Func::Min | Func::Max | Func::Npv, n) => Op::CallN(
                func,
                u32::try_from(n).map_err(|_| CompileError::Malformed("arity"))?,
            ),
            (Func::Sqrt, 1) => Op::Sqrt,
            (_, 1) => Op::Call1(func),
            (_, 2) => Op::Call2(func),
            (_, 3) => Op::Call3(func),
            _ => return Err(CompileError::Malformed("argument count")),
        };
        self.ops.push(op);
        let k = self.starts.len();
        self.starts.truncate(k - n + 1);
        Ok(())
    }
}

/// Computes a repeated subexpression once: `sqrt(f)` twice becomes one square root,
/// kept in a stack cell and fetched the second time. Every function is pure, so the
/// value fetched has the same bits as the one recomputed. Returns the new operations,
/// operand depth and number of kept values, or the operations unchanged (`Err`) when
/// nothing repeats.
fn share_common(ops: Vec<Op>) -> Result<(Vec<Op>, usize, usize), Vec<Op>> {
    // The expression as a graph: identical subtrees become one node.
    let mut nodes: Vec<(Op, Vec<usize>)> = Vec::with_capacity(ops.len());
    let mut index: HashMap<String, usize> = HashMap::new();
    let mut stack: Vec<usize> = Vec::new();
    for &op in &ops {
        let k = op.operands();
        if stack.len() < k {
            return Err(ops);
        }
        let children = stack.split_off(stack.len() - k);
        let key = format!("{op:?}{children:?}");
        let id = *index.entry(key).or_insert_with(|| {
            nodes.push((op, children));
            nodes.len() - 1
        });
        stack.push(id);
    }
    let [root] = stack[..] else {
        return Err(ops);
    };
    let mut uses = vec![0usize; nodes.len()];
    uses[root] += 1;
    for (_, children) in &nodes {
        for &c in children {
            uses[c] += 1;
        }
    }
    if !nodes
        .iter()
        .zip(&uses)
        .any(|((_, children), &u)| u > 1 && !children.is_empty())
    {
        return Err(ops);
    }
    // Emit in the original order (post-order, left first), keeping shared values.
    let mut out: Vec<Op> = Vec::with_capacity(ops.len());
    let mut kept_in: Vec<Option<u32>> = vec![None; nodes.len()];
    let mut kept = 0u32;
    let mut work: Vec<(usize, bool)> = vec![(root, false)];
    while let Some((n, expanded)) = work.pop() {
        let (op, children) = &nodes[n];
        if expanded {
            out.push(*op);
            if uses[n] > 1 {
                kept_in[n] = Some(kept);
                out.push(Op::Store(kept));
                kept += 1;
            }
        } else if let Some(t) = kept_in[n] {
            out.push(Op::Fetch(t));
        } else if children.is_empty() {
            out.push(*op);
        } else {
            work.push((n, true));
            for &c in children.iter().rev() {
                work.push((c, false));
            }
        }
    }
    // Operand depth of the new sequence, then kept cells placed after it.
    let (mut depth, mut max_depth) = (0usize, 0usize);
    for op in &out {
        match op {
            Op::Store(_) => {}
            op => {
                depth = depth + 1 - op.operands();
                max_depth = max_depth.max(depth);
            }
        }
    }
    let base = max_depth + 1;
    for op in out.iter_mut() {
        if let Op::Store(t) | Op::Fetch(t) = op {
            *t += base as u32;
        }
    }
    Ok((out, max_depth, kept as usize))
}

/// Fuses a push of a slot or a constant with the operation on it that follows
/// (`Load(s), MulConst(c)` becomes `LoadMulConst(s, c)`): one dispatch instead of two,
/// the same operation on the same operands. `c + x` and `c * x` become `x + c` and
/// `x * c`: IEEE addition and multiplication are commutative, bit for bit. (A push
/// followed by a left-fused form such as `ConstSub` does not occur: the builder fuses a
/// one-operation right operand first.)
fn fuse_pushes(ops: Vec<Op>) -> Vec<Op> {
    let mut out: Vec<Op> = Vec::with_capacity(ops.len());
    let mut i = 0;
    while i < ops.len() {
        let next = ops.get(i + 1).copied();
        let fused = match (ops[i], next) {
            (Op::Load(s), Some(Op::AddConst(c))) => Some(Op::LoadAddConst(s, c)),
            (Op::Load(s), Some(Op::SubConst(c))) => Some(Op::LoadSubConst(s, c)),
            (Op::Load(s), Some(Op::MulConst(c))) => Some(Op::LoadMulConst(s, c)),
            (Op::Load(s), Some(Op::DivConst(c))) => Some(Op::LoadDivConst(s, c)),
            (Op::Load(s), Some(Op::AddLoad(t))) => Some(Op::LoadAddLoad(s, t)),
            (Op::Load(s), Some(Op::SubLoad(t))) => Some(Op::LoadSubLoad(s, t)),
            (Op::Load(s), Some(Op::MulLoad(t))) => Some(Op::LoadMulLoad(s, t)),
            (Op::Load(s), Some(Op::DivLoad(t))) => Some(Op::LoadDivLoad(s, t)),
            (Op::Load(s), Some(Op::PowInt(n))) => Some(Op::LoadPowInt(s, n)),
            (Op::Load(s), Some(Op::Sqrt)) => Some(Op::LoadSqrt(s)),
            (Op::Load(s), Some(Op::Call1(f))) => Some(Op::LoadCall1(s, f)),
            (Op::Const(c), Some(Op::AddLoad(s))) => Some(Op::LoadAddConst(s, c)),
            (Op::Const(c), Some(Op::MulLoad(s))) => Some(Op::LoadMulConst(s, c)),
            (Op::Const(c), Some(Op::SubLoad(s))) => Some(Op::ConstSubLoad(c, s)),
            (Op::Const(c), Some(Op::DivLoad(s))) => Some(Op::ConstDivLoad(c, s)),
            _ => None,
        };
        match fused {
            Some(op) => {
                out.push(op);
                i += 2;
            }
            None => {
                out.push(ops[i]);
                i += 1;
            }
        }
    }
    out
}
