//! The compiled program as it was before the speed work of issue 15 (commit e31d2db),
//! kept verbatim but for the imports and the function table below, only so that this
//! benchmark can time the program before and after side by side in one run. The crate
//! does not use it.
//!
//! Before: every `^` is `powf`, functions are called through pointers, and only one
//! operand of an operation is fused with it.

use meval::tokenizer::{Operation, Token};
use std::collections::HashMap;
use tacit::equations::functions::{self, Func};
use tacit::equations::program::{CompileError, Operand};

/// The implementation of a function, by number of arguments (as the table had it).
#[derive(Clone, Copy)]
enum Implementation {
    One(fn(f64) -> f64),
    Two(fn(f64, f64) -> f64),
    Three(fn(f64, f64, f64) -> f64),
    Many(fn(&[f64]) -> f64),
}

impl Implementation {
    fn call(self, args: &[f64]) -> f64 {
        match (self, args) {
            (Implementation::One(f), [a]) => f(*a),
            (Implementation::Two(f), [a, b]) => f(*a, *b),
            (Implementation::Three(f), [a, b, c]) => f(*a, *b, *c),
            (Implementation::Many(f), _) => f(args),
            _ => f64::NAN,
        }
    }

    /// The pointer the table held for `f`: the same Rust function.
    fn of(f: Func) -> Implementation {
        macro_rules! one {
            ($($v:ident),*) => {
                match f {
                    $(Func::$v => return Implementation::One(|x| Func::$v.apply1(x)),)*
                    _ => {}
                }
            };
        }
        one!(
            Sqrt, Cbrt, Exp, Ln, Expm1, Log1p, Log10, Log2, Abs, Sin, Cos, Tan, Sec, Csc, Cot,
            Asin, Acos, Atan, Sinh, Cosh, Tanh, Asinh, Acosh, Atanh, Deg, Rad, Floor, Ceil, Round,
            Sign, Signum
        );
        match f {
            Func::Atan2 => Implementation::Two(|a, b| Func::Atan2.apply2(a, b)),
            Func::Hypot => Implementation::Two(|a, b| Func::Hypot.apply2(a, b)),
            Func::Clamp => Implementation::Three(|a, b, c| Func::Clamp.apply3(a, b, c)),
            Func::When => Implementation::Three(|a, b, c| Func::When.apply3(a, b, c)),
            Func::Min => Implementation::Many(|xs| Func::Min.call(xs)),
            Func::Max => Implementation::Many(|xs| Func::Max.call(xs)),
            _ => Implementation::Many(|xs| Func::Npv.call(xs)),
        }
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
    Call1(fn(f64) -> f64),
    Call2(fn(f64, f64) -> f64),
    Call3(fn(f64, f64, f64) -> f64),
    CallN(fn(&[f64]) -> f64, u32),
    /// Keep the top in stack cell i (a cell past the operand stack) for a later `Fetch`.
    Store(u32),
    /// Push the value kept in stack cell i.
    Fetch(u32),
}

impl Op {
    /// How many operands the operation takes from the stack (the top included).
    fn operands(self) -> usize {
        match self {
            Op::Load(_) | Op::Const(_) | Op::Fetch(_) => 0,
            Op::Add | Op::Sub | Op::Mul | Op::Div | Op::Rem | Op::Pow | Op::Call2(_) => 2,
            Op::Call3(_) => 3,
            Op::CallN(_, n) => n as usize,
            _ => 1,
        }
    }
}

/// A compiled expression. Evaluate it with [`Program::eval_with`] (no allocation) or
/// [`Program::eval`] (allocates a stack; for one-off use).
#[derive(Debug, Clone)]
pub struct Program {
    ops: Vec<Op>,
    /// The most operands alive at once.
    depth: usize,
    /// Values kept for re-use (common subexpressions).
    kept: usize,
    slots: usize,
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
                    b.call(Implementation::of(f.func), *n)?
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
        Ok(Program {
            ops,
            depth,
            kept,
            slots: b.slots,
        })
    }

    /// The stack length [`Program::eval_with`] needs: the operands, then the kept values.
    pub fn stack_size(&self) -> usize {
        self.depth + 1 + self.kept
    }

    /// Evaluates with `slots` and a stack of at least [`Program::stack_size`]; NaN if
    /// either is too short (never panics).
    #[inline]
    // Each operation is written `left ⊕ right` in meval's operand order, on purpose.
    #[allow(clippy::assign_op_pattern)]
    pub fn eval_with(&self, slots: &[f64], stack: &mut [f64]) -> f64 {
        if slots.len() < self.slots || stack.len() < self.stack_size() || self.ops.is_empty() {
            return f64::NAN;
        }
        // `sp` counts the values below the top; `acc` is the top.
        let mut acc = 0.0;
        let mut sp = 0usize;
        for op in &self.ops {
            match *op {
                Op::Load(s) => {
                    stack[sp] = acc;
                    sp += 1;
                    acc = slots[s as usize];
                }
                Op::Const(v) => {
                    stack[sp] = acc;
                    sp += 1;
                    acc = v;
                }
                Op::Neg => acc = -acc,
                Op::Add => {
                    sp -= 1;
                    acc = stack[sp] + acc;
                }
                Op::AddConst(c) => acc = acc + c,
                Op::AddLoad(s) => acc = acc + slots[s as usize],
                Op::ConstAdd(c) => acc = c + acc,
                Op::LoadAdd(s) => acc = slots[s as usize] + acc,
                Op::Sub => {
                    sp -= 1;
                    acc = stack[sp] - acc;
                }
                Op::SubConst(c) => acc = acc - c,
                Op::SubLoad(s) => acc = acc - slots[s as usize],
                Op::ConstSub(c) => acc = c - acc,
                Op::LoadSub(s) => acc = slots[s as usize] - acc,
                Op::Mul => {
                    sp -= 1;
                    acc = stack[sp] * acc;
                }
                Op::MulConst(c) => acc = acc * c,
                Op::MulLoad(s) => acc = acc * slots[s as usize],
                Op::ConstMul(c) => acc = c * acc,
                Op::LoadMul(s) => acc = slots[s as usize] * acc,
                Op::Div => {
                    sp -= 1;
                    acc = stack[sp] / acc;
                }
                Op::DivConst(c) => acc = acc / c,
                Op::DivLoad(s) => acc = acc / slots[s as usize],
                Op::ConstDiv(c) => acc = c / acc,
                Op::LoadDiv(s) => acc = slots[s as usize] / acc,
                Op::Rem => {
                    sp -= 1;
                    acc = stack[sp] % acc;
                }
                Op::RemConst(c) => acc = acc % c,
                Op::RemLoad(s) => acc = acc % slots[s as usize],
                Op::ConstRem(c) => acc = c % acc,
                Op::LoadRem(s) => acc = slots[s as usize] % acc,
                Op::Pow => {
                    sp -= 1;
                    acc = stack[sp].powf(acc);
                }
                Op::PowConst(c) => acc = acc.powf(c),
                Op::PowLoad(s) => acc = acc.powf(slots[s as usize]),
                Op::ConstPow(c) => acc = c.powf(acc),
                Op::LoadPow(s) => acc = slots[s as usize].powf(acc),
                Op::Call1(f) => acc = f(acc),
                Op::Call2(f) => {
                    sp -= 1;
                    acc = f(stack[sp], acc);
                }
                Op::Call3(f) => {
                    sp -= 2;
                    acc = f(stack[sp], stack[sp + 1], acc);
                }
                Op::CallN(f, n) => {
                    let n = n as usize;
                    stack[sp] = acc;
                    acc = f(&stack[sp + 1 - n..=sp]);
                    sp -= n - 1;
                }
                Op::Store(i) => stack[i as usize] = acc,
                Op::Fetch(i) => {
                    stack[sp] = acc;
                    sp += 1;
                    acc = stack[i as usize];
                }
            }
        }
        acc
    }
}

struct Builder {
    ops: Vec<Op>,
    /// For each operand on the compile-time stack, the index of its first operation.
    starts: Vec<usize>,
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
        (Operation::Pow, Op::Const(c)) => Some(Op::PowConst(c)),
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
            self.replace_top(2, Op::Const(apply(op, v[0], v[1])));
            return Ok(());
        }
        let right = self.starts.pop().unwrap_or(0);
        let left = *self.starts.last().unwrap_or(&0);
        let end = self.ops.len();
        // A right operand of one operation: fuse it (acc ⊕ c).
        if end == right + 1 {
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

    fn call(&mut self, imp: Implementation, n: usize) -> Result<(), CompileError> {
        if n == 0 {
            return Err(CompileError::Malformed("call without arguments"));
        }
        self.need(n)?;
        if let Some(v) = self.constant_tail(n) {
            self.replace_top(n, Op::Const(imp.call(&v)));
            return Ok(());
        }
        let op = match (imp, n) {
            (Implementation::One(f), 1) => Op::Call1(f),
            (Implementation::Two(f), 2) => Op::Call2(f),
            (Implementation::Three(f), 3) => Op::Call3(f),
            (Implementation::Many(f), n) => Op::CallN(
                f,
                u32::try_from(n).map_err(|_| CompileError::Malformed("arity"))?,
            ),
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
