//! Compiled evaluation: meval's RPN translated once into a compact stack program.
//!
//! Variables are resolved to slot numbers (or to fixed values) at compile time, so an
//! evaluation does no name lookup, no hashing and no allocation: it walks a `Vec<Op>`
//! over a caller-provided stack.
//!
//! **Bit-identical to meval.** Each operation does exactly what
//! `meval::Expr::eval_with_context` does for the same RPN token (`left.powf(right)` for
//! `^`, `left % right` for `%`, the same function pointers as
//! [`super::functions::reference_context`]). The two rewrites the compiler makes keep
//! every bit:
//! - *fused operands*: `x * 2.5` becomes one `MulConst(2.5)` instead of a push and a
//!   multiply; the same `left * right` is computed;
//! - *folding*: an operation whose operands are all fixed values is computed once at
//!   compile time with the same Rust operation, and its result stored.
//!
//! Unary plus is dropped (meval pushes the value back unchanged).

use super::functions::{self, Implementation};
use super::parse::Expression;
use crate::error::InputError;
use meval::tokenizer::{Operation, Token};

/// What a name resolves to at compile time.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Operand {
    /// Read from this slot at every evaluation.
    Slot(usize),
    /// A fixed value, folded into the program.
    Value(f64),
}

#[derive(Debug, Clone, Copy)]
enum Op {
    Load(u32),
    Const(f64),
    Add,
    Sub,
    Mul,
    Div,
    Rem,
    Pow,
    Neg,
    AddConst(f64),
    SubConst(f64),
    MulConst(f64),
    DivConst(f64),
    PowConst(f64),
    AddLoad(u32),
    SubLoad(u32),
    MulLoad(u32),
    DivLoad(u32),
    PowLoad(u32),
    Call1(fn(f64) -> f64),
    Call2(fn(f64, f64) -> f64),
    Call3(fn(f64, f64, f64) -> f64),
    CallN(fn(&[f64]) -> f64, u32),
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
/// [`Program::eval`] (allocates a stack; for one-off use).
#[derive(Debug, Clone)]
pub struct Program {
    ops: Vec<Op>,
    depth: usize,
    slots: usize,
}

impl Program {
    /// Translates meval RPN. `resolve` maps each variable name to a slot or a fixed
    /// value; `None` is an unknown variable.
    pub fn compile(
        rpn: &[Token],
        resolve: &mut dyn FnMut(&str) -> Option<Operand>,
    ) -> Result<Program, CompileError> {
        let mut b = Builder {
            ops: Vec::with_capacity(rpn.len()),
            depth: 0,
            max_depth: 0,
            slots: 0,
        };
        for token in rpn {
            match token {
                Token::Number(v) => b.push(Op::Const(*v)),
                Token::Var(name) => match resolve(name) {
                    Some(Operand::Slot(s)) => {
                        let s32 =
                            u32::try_from(s).map_err(|_| CompileError::Malformed("slot"))?;
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
                    b.call(f.implementation, *n)?
                }
                _ => return Err(CompileError::Malformed("unexpected token")),
            }
        }
        if b.depth != 1 {
            return Err(CompileError::Malformed("operands left over"));
        }
        Ok(Program {
            ops: b.ops,
            depth: b.max_depth,
            slots: b.slots,
        })
    }

    /// The stack length [`Program::eval_with`] needs.
    pub fn stack_size(&self) -> usize {
        self.depth
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

    /// Evaluates with a fresh stack.
    pub fn eval(&self, slots: &[f64]) -> f64 {
        let mut stack = vec![0.0; self.depth];
        self.eval_with(slots, &mut stack)
    }

    /// Evaluates with `slots` and a stack of at least [`Program::stack_size`]; NaN if
    /// either is too short (never panics).
    #[inline]
    pub fn eval_with(&self, slots: &[f64], stack: &mut [f64]) -> f64 {
        if slots.len() < self.slots || stack.len() < self.depth || self.depth == 0 {
            return f64::NAN;
        }
        let load = |s: u32| slots[s as usize];
        let mut sp = 0usize;
        for op in &self.ops {
            match *op {
                Op::Load(s) => {
                    stack[sp] = load(s);
                    sp += 1;
                }
                Op::Const(v) => {
                    stack[sp] = v;
                    sp += 1;
                }
                Op::Add => {
                    sp -= 1;
                    stack[sp - 1] += stack[sp];
                }
                Op::Sub => {
                    sp -= 1;
                    stack[sp - 1] -= stack[sp];
                }
                Op::Mul => {
                    sp -= 1;
                    stack[sp - 1] *= stack[sp];
                }
                Op::Div => {
                    sp -= 1;
                    stack[sp - 1] /= stack[sp];
                }
                Op::Rem => {
                    sp -= 1;
                    stack[sp - 1] %= stack[sp];
                }
                Op::Pow => {
                    sp -= 1;
                    stack[sp - 1] = stack[sp - 1].powf(stack[sp]);
                }
                Op::Neg => stack[sp - 1] = -stack[sp - 1],
                Op::AddConst(c) => stack[sp - 1] += c,
                Op::SubConst(c) => stack[sp - 1] -= c,
                Op::MulConst(c) => stack[sp - 1] *= c,
                Op::DivConst(c) => stack[sp - 1] /= c,
                Op::PowConst(c) => stack[sp - 1] = stack[sp - 1].powf(c),
                Op::AddLoad(s) => stack[sp - 1] += load(s),
                Op::SubLoad(s) => stack[sp - 1] -= load(s),
                Op::MulLoad(s) => stack[sp - 1] *= load(s),
                Op::DivLoad(s) => stack[sp - 1] /= load(s),
                Op::PowLoad(s) => stack[sp - 1] = stack[sp - 1].powf(load(s)),
                Op::Call1(f) => stack[sp - 1] = f(stack[sp - 1]),
                Op::Call2(f) => {
                    sp -= 1;
                    stack[sp - 1] = f(stack[sp - 1], stack[sp]);
                }
                Op::Call3(f) => {
                    sp -= 2;
                    stack[sp - 1] = f(stack[sp - 1], stack[sp], stack[sp + 1]);
                }
                Op::CallN(f, n) => {
                    let n = n as usize;
                    let r = f(&stack[sp - n..sp]);
                    sp -= n - 1;
                    stack[sp - 1] = r;
                }
            }
        }
        stack[0]
    }
}

struct Builder {
    ops: Vec<Op>,
    depth: usize,
    max_depth: usize,
    slots: usize,
}

fn apply(op: Operation, left: f64, right: f64) -> f64 {
    match op {
        Operation::Plus => left + right,
        Operation::Minus => left - right,
        Operation::Times => left * right,
        Operation::Div => left / right,
        Operation::Rem => left % right,
        Operation::Pow => left.powf(right),
    }
}

impl Builder {
    fn push(&mut self, op: Op) {
        self.ops.push(op);
        self.depth += 1;
        self.max_depth = self.max_depth.max(self.depth);
    }

    fn need(&self, n: usize) -> Result<(), CompileError> {
        if self.depth < n {
            Err(CompileError::Malformed("missing operands"))
        } else {
            Ok(())
        }
    }

    /// The fixed values on top of the stack when the last `n` operations are constants.
    /// (An operand on the stack is constant only if one `Const` produced it, so the top
    /// `n` operands are constant exactly when the last `n` operations are `Const`.)
    fn constant_tail(&self, n: usize) -> Option<Vec<f64>> {
        if self.ops.len() < n {
            return None;
        }
        self.ops[self.ops.len() - n..]
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
            self.ops.truncate(self.ops.len() - 2);
            self.depth -= 2;
            self.push(Op::Const(apply(op, v[0], v[1])));
            return Ok(());
        }
        let last = self.ops.last().copied();
        let fused = match (op, last) {
            (Operation::Plus, Some(Op::Const(c))) => Some(Op::AddConst(c)),
            (Operation::Minus, Some(Op::Const(c))) => Some(Op::SubConst(c)),
            (Operation::Times, Some(Op::Const(c))) => Some(Op::MulConst(c)),
            (Operation::Div, Some(Op::Const(c))) => Some(Op::DivConst(c)),
            (Operation::Pow, Some(Op::Const(c))) => Some(Op::PowConst(c)),
            (Operation::Plus, Some(Op::Load(s))) => Some(Op::AddLoad(s)),
            (Operation::Minus, Some(Op::Load(s))) => Some(Op::SubLoad(s)),
            (Operation::Times, Some(Op::Load(s))) => Some(Op::MulLoad(s)),
            (Operation::Div, Some(Op::Load(s))) => Some(Op::DivLoad(s)),
            (Operation::Pow, Some(Op::Load(s))) => Some(Op::PowLoad(s)),
            _ => None,
        };
        match fused {
            Some(f) => {
                self.ops.pop();
                self.ops.push(f);
            }
            None => self.ops.push(match op {
                Operation::Plus => Op::Add,
                Operation::Minus => Op::Sub,
                Operation::Times => Op::Mul,
                Operation::Div => Op::Div,
                Operation::Rem => Op::Rem,
                Operation::Pow => Op::Pow,
            }),
        }
        self.depth -= 1;
        Ok(())
    }

    fn negate(&mut self) -> Result<(), CompileError> {
        self.need(1)?;
        if let Some(Op::Const(v)) = self.ops.last_mut() {
            *v = -*v;
        } else {
            self.ops.push(Op::Neg);
        }
        Ok(())
    }

    fn call(&mut self, imp: Implementation, n: usize) -> Result<(), CompileError> {
        if n == 0 {
            return Err(CompileError::Malformed("call without arguments"));
        }
        self.need(n)?;
        if let Some(v) = self.constant_tail(n) {
            self.ops.truncate(self.ops.len() - n);
            self.depth -= n;
            self.push(Op::Const(imp.call(&v)));
            return Ok(());
        }
        let op = match (imp, n) {
            (Implementation::One(f), 1) => Op::Call1(f),
            (Implementation::Two(f), 2) => Op::Call2(f),
            (Implementation::Three(f), 3) => Op::Call3(f),
            (Implementation::Many(f), n) => {
                Op::CallN(f, u32::try_from(n).map_err(|_| CompileError::Malformed("arity"))?)
            }
            _ => return Err(CompileError::Malformed("argument count")),
        };
        self.ops.push(op);
        self.depth -= n - 1;
        Ok(())
    }
}
