//! A set of equations and definitions, its names, dependency order and compiled blocks.

use std::collections::{HashMap, HashSet};

use super::functions;
use super::parse::{self, Expression, Statement, StatementKind};
use super::program::{Number, Operand, Program};
use crate::error::InputError;

/// Equations and definitions read from text.
///
/// ```
/// use tacit::equations::EquationSet;
/// let set = EquationSet::parse("A := pi*D^2/4\nQ = V*A").unwrap();
/// assert_eq!(set.variables(), ["D", "Q", "V"]);
/// assert_eq!(set.definition_names(), ["A"]);
/// assert_eq!(set.equation_count(), 1);
/// ```
#[derive(Debug, Clone)]
pub struct EquationSet {
    statements: Vec<Statement>,
    /// Statement indices of the definitions, in an order where each comes after those it uses.
    definition_order: Vec<usize>,
    /// Names declared as variables although they are constants (`e`, `pi`).
    declared: Vec<String>,
    /// Defined name -> statement index.
    defined: HashMap<String, usize>,
}

impl EquationSet {
    /// Reads a text: statements one per line or separated by `;`, `#` comments.
    pub fn parse(text: &str) -> Result<EquationSet, InputError> {
        EquationSet::parse_declaring(text, &[])
    }

    /// As [`EquationSet::parse`], declaring `declared` as variables: a declared `e` or
    /// `pi` is a variable, not the constant.
    pub fn parse_declaring(text: &str, declared: &[&str]) -> Result<EquationSet, InputError> {
        let statements = parse::statements(text)?;
        let mut defined: HashMap<&str, usize> = HashMap::new();
        for (i, s) in statements.iter().enumerate() {
            if let StatementKind::Definition(name) = &s.kind {
                if let Some(&j) = defined.get(name.as_str()) {
                    return Err(InputError::at(
                        "duplicate-definition",
                        format!(
                            "`{name}` is defined twice (first at position {})",
                            statements[j].position
                        ),
                        s.position,
                    ));
                }
                defined.insert(name, i);
            }
        }
        let definition_order = order_definitions(&statements, &defined)?;
        let defined = defined
            .into_iter()
            .map(|(n, i)| (n.to_string(), i))
            .collect();
        Ok(EquationSet {
            statements,
            definition_order,
            declared: declared.iter().map(|s| s.to_string()).collect(),
            defined,
        })
    }

    /// The free variables, in order of first appearance: every name used that is not
    /// defined in the text and is not a constant (a declared constant name counts).
    pub fn variables(&self) -> Vec<String> {
        self.names_where(|name| {
            functions::constant(name).is_none() || self.declared.iter().any(|d| d == name)
        })
    }

    /// Constant names (`e`, `pi`) the text uses as constants. A caller that gives one
    /// of them a value, or names it as an unknown, makes it a variable.
    pub fn constants_used(&self) -> Vec<String> {
        self.names_where(|name| {
            functions::constant(name).is_some() && !self.declared.iter().any(|d| d == name)
        })
    }

    fn names_where(&self, keep: impl Fn(&str) -> bool) -> Vec<String> {
        let mut out: Vec<String> = Vec::new();
        let mut seen: HashSet<&str> = HashSet::new();
        for s in &self.statements {
            for (name, _) in s.expr.uses() {
                if !self.is_defined(name) && keep(name) && seen.insert(name.as_str()) {
                    out.push(name.clone());
                }
            }
        }
        out
    }

    /// Names defined with `:=`, in text order.
    pub fn definition_names(&self) -> Vec<String> {
        self.statements
            .iter()
            .filter_map(|s| match &s.kind {
                StatementKind::Definition(n) => Some(n.clone()),
                StatementKind::Equation => None,
            })
            .collect()
    }

    pub fn equation_count(&self) -> usize {
        self.equations().len()
    }

    /// The residual expressions `(lhs)-(rhs)` of the equations, in text order.
    pub fn equations(&self) -> Vec<&Expression> {
        self.statements
            .iter()
            .filter(|s| s.kind == StatementKind::Equation)
            .map(|s| &s.expr)
            .collect()
    }

    /// The definitions in dependency order (each after the ones it uses).
    pub fn definitions(&self) -> Vec<(&str, &Expression)> {
        self.definition_order
            .iter()
            .map(|&i| match &self.statements[i].kind {
                StatementKind::Definition(n) => (n.as_str(), &self.statements[i].expr),
                StatementKind::Equation => ("", &self.statements[i].expr),
            })
            .collect()
    }

    fn is_defined(&self, name: &str) -> bool {
        self.defined.contains_key(name)
    }

    /// Where `name` is first used, or defined.
    pub fn position_of(&self, name: &str) -> Option<usize> {
        if let Some(&i) = self.defined.get(name) {
            return Some(self.statements[i].position);
        }
        self.statements
            .iter()
            .find_map(|s| s.expr.position_of(name))
    }

    /// The layout of slots for a solve in which `variables` (the set's variables plus
    /// any constants the caller shadows) have values and `unknowns` (at most 128 of
    /// them) are the unknowns.
    pub(crate) fn layout(&self, variables: Vec<String>, unknowns: &[String]) -> Layout<'_> {
        let mut slot: HashMap<String, usize> = HashMap::new();
        for (i, v) in variables.iter().enumerate() {
            slot.insert(v.clone(), i);
        }
        let nv = variables.len();
        let mut def_slot = HashMap::new();
        for (k, &i) in self.definition_order.iter().enumerate() {
            if let StatementKind::Definition(n) = &self.statements[i].kind {
                slot.insert(n.clone(), nv + k);
                def_slot.insert(i, nv + k);
            }
        }
        let unknown_bit: HashMap<&str, u128> = unknowns
            .iter()
            .take(128)
            .enumerate()
            .map(|(k, n)| (n.as_str(), 1u128 << k))
            .collect();
        // Which unknowns each statement depends on, through definitions.
        let mut deps = vec![0u128; self.statements.len()];
        let direct = |i: usize, deps: &[u128]| -> u128 {
            let mut d = 0;
            for (name, _) in self.statements[i].expr.uses() {
                if let Some(&j) = self.defined.get(name) {
                    d |= deps[j];
                } else if let Some(&b) = unknown_bit.get(name.as_str()) {
                    d |= b;
                }
            }
            d
        };
        for &i in &self.definition_order {
            deps[i] = direct(i, &deps);
        }
        for i in 0..self.statements.len() {
            if self.statements[i].kind == StatementKind::Equation {
                deps[i] = direct(i, &deps);
            }
        }
        Layout {
            set: self,
            variables,
            slot,
            def_slot,
            deps,
        }
    }

    fn definition_index(&self, name: &str) -> Option<usize> {
        self.defined.get(name).copied()
    }

    pub(crate) fn equation_indices(&self) -> Vec<usize> {
        (0..self.statements.len())
            .filter(|&i| self.statements[i].kind == StatementKind::Equation)
            .collect()
    }

    pub(crate) fn statement(&self, i: usize) -> &Statement {
        &self.statements[i]
    }

    /// Whether some number in the text is written with a unit (`9.8[m/s^2]`).
    pub fn has_numbers_with_units(&self) -> bool {
        self.statements.iter().any(|s| {
            s.tokens
                .iter()
                .any(|t| matches!(t.tok, parse::Tok::Quantity(_)))
        })
    }

    /// The definition statements in dependency order.
    pub(crate) fn definitions_in_order(&self) -> impl Iterator<Item = &Statement> {
        self.definition_order.iter().map(|&i| &self.statements[i])
    }

    /// The equation statements in text order.
    pub(crate) fn equation_statements(&self) -> impl Iterator<Item = &Statement> {
        self.statements
            .iter()
            .filter(|s| s.kind == StatementKind::Equation)
    }

    /// A compiled residual of the one equation of this set, as a function of `unknown`,
    /// with every other variable given in `knowns`. Definitions that do not depend on
    /// the unknown are computed once here; everything fixed is folded into the program.
    /// For sweeps and scans: each call is one evaluation, with no allocation.
    pub fn residual_fn(
        &self,
        knowns: &[(String, f64)],
        unknown: &str,
    ) -> Result<impl FnMut(f64) -> f64, InputError> {
        let n = self.equation_count();
        if n != 1 {
            return Err(InputError::new(
                "equation-count",
                format!("a residual of one unknown needs exactly one equation; this text has {n}"),
            ));
        }
        let spec = [super::solve::UnknownSpec::named(unknown)];
        let plan = super::solve::check_names(self, knowns, &spec)?;
        let layout = self.layout(plan.variables.clone(), &[unknown.to_string()]);
        let live = [layout.require_slot(unknown)?];
        let mut block = layout.block(&plan.values, &live, 1, &self.equation_indices())?;
        Ok(move |x: f64| block.eval_one(x))
    }
}

/// Orders definitions so that each comes after those it uses (Kahn's algorithm, no
/// recursion), or reports a definition that depends on itself, with the cycle.
fn order_definitions(
    statements: &[Statement],
    defined: &HashMap<&str, usize>,
) -> Result<Vec<usize>, InputError> {
    let defs: Vec<usize> = (0..statements.len())
        .filter(|&i| matches!(statements[i].kind, StatementKind::Definition(_)))
        .collect();
    // uses[i] = definitions that definition i uses.
    let uses = |i: usize| -> Vec<usize> {
        let mut u: Vec<usize> = statements[i]
            .expr
            .uses()
            .iter()
            .filter_map(|(n, _)| defined.get(n.as_str()).copied())
            .collect();
        u.dedup();
        u
    };
    let mut pending: HashMap<usize, usize> = HashMap::new();
    let mut users: HashMap<usize, Vec<usize>> = HashMap::new();
    for &i in &defs {
        let u = uses(i);
        pending.insert(i, u.len());
        for j in u {
            users.entry(j).or_default().push(i);
        }
    }
    let mut ready: Vec<usize> = defs.iter().copied().filter(|i| pending[i] == 0).collect();
    ready.reverse();
    let mut order = Vec::with_capacity(defs.len());
    while let Some(i) = ready.pop() {
        order.push(i);
        if let Some(us) = users.get(&i) {
            for &k in us {
                let c = pending.get_mut(&k).expect("every definition has a count");
                *c -= 1;
                if *c == 0 {
                    ready.push(k);
                }
            }
        }
    }
    if order.len() == defs.len() {
        return Ok(order);
    }
    // Every definition left is on a cycle or depends on one: walk until a repeat.
    let left: Vec<usize> = defs.iter().copied().filter(|i| pending[i] > 0).collect();
    let mut path = vec![left[0]];
    loop {
        let cur = *path.last().expect("path is never empty");
        let next = uses(cur)
            .into_iter()
            .find(|j| pending[j] > 0)
            .unwrap_or(cur);
        if let Some(k) = path.iter().position(|&p| p == next) {
            let cycle: Vec<usize> = path[k..].to_vec();
            let name = |i: usize| match &statements[i].kind {
                StatementKind::Definition(n) => n.clone(),
                StatementKind::Equation => String::new(),
            };
            let mut chain: Vec<String> = cycle.iter().map(|&i| name(i)).collect();
            chain.push(name(cycle[0]));
            let first = cycle[0];
            return Err(InputError::at(
                "circular-definition",
                format!(
                    "the definition of `{}` depends on itself: {}",
                    name(first),
                    chain.join(" uses ")
                ),
                statements[first].position,
            ));
        }
        path.push(next);
    }
}

/// Where every name lives in a solve: variables in slots `0..nv`, definitions after.
pub(crate) struct Layout<'a> {
    set: &'a EquationSet,
    pub variables: Vec<String>,
    slot: HashMap<String, usize>,
    /// Statement index of a definition -> its slot.
    def_slot: HashMap<usize, usize>,
    /// For each statement, a bit per unknown (in the order given to
    /// [`EquationSet::layout`]) it depends on, through definitions.
    pub deps: Vec<u128>,
}

impl Layout<'_> {
    pub fn slot_of(&self, name: &str) -> Option<usize> {
        self.slot.get(name).copied()
    }

    /// The slot of a name already checked to be a variable; an error, never a panic,
    /// if it is not.
    pub fn require_slot(&self, name: &str) -> Result<usize, InputError> {
        self.slot_of(name).ok_or_else(|| {
            InputError::new(
                "unused-name",
                format!("`{name}` appears in no equation or definition"),
            )
        })
    }

    /// Statement indices of the equations, in text order.
    pub fn equation_statements(&self) -> Vec<usize> {
        self.set.equation_indices()
    }

    fn slot_count(&self) -> usize {
        self.variables.len() + self.def_slot.len()
    }

    /// Compiles a block: `live` variable slots change at every evaluation, every other
    /// variable keeps its value from `values` (indexed by variable slot). `live_mask`
    /// has the bits (see [`Layout::deps`]) of the live unknowns: definitions that do not
    /// depend on them are computed here, once. `u128::MAX` makes every definition live
    /// (used when the live slots include knowns).
    pub fn block(
        &self,
        values: &[f64],
        live: &[usize],
        live_mask: u128,
        equations: &[usize],
    ) -> Result<Block, InputError> {
        let nv = self.variables.len();
        let mut slots = vec![f64::NAN; self.slot_count()];
        slots[..nv].copy_from_slice(&values[..nv]);
        let mut live_slot = vec![false; self.slot_count()];
        for &s in live {
            live_slot[s] = true;
        }
        let needed = self.needed_definitions(equations);
        let mut defs = Vec::new();
        let mut depth = 1;
        for &i in &self.set.definition_order {
            let s = self.def_slot[&i];
            if !needed[i] {
                continue;
            }
            let dynamic = live_mask == u128::MAX || self.deps[i] & live_mask != 0;
            let program = self.compile(i, &slots, &live_slot)?;
            if dynamic {
                live_slot[s] = true;
                depth = depth.max(program.stack_size());
                defs.push((s, program));
            } else {
                slots[s] = program.eval(&slots);
            }
        }
        let mut eqs = Vec::new();
        for &i in equations {
            let program = self.compile(i, &slots, &live_slot)?;
            depth = depth.max(program.stack_size());
            eqs.push(program);
        }
        Ok(Block {
            live: live.to_vec(),
            defs,
            eqs,
            slots,
            stack: vec![0.0; depth],
        })
    }

    /// Which statements (definitions) `equations` need, directly or through other
    /// definitions; every definition when `equations` is empty.
    fn needed_definitions(&self, equations: &[usize]) -> Vec<bool> {
        let n = self.set.statements.len();
        if equations.is_empty() {
            return vec![true; n];
        }
        let mut needed = vec![false; n];
        let mark = |i: usize, needed: &mut Vec<bool>| {
            for (name, _) in self.set.statements[i].expr.uses() {
                if let Some(j) = self.set.definition_index(name) {
                    needed[j] = true;
                }
            }
        };
        for &i in equations {
            mark(i, &mut needed);
        }
        // Users come after what they use, so a reverse walk reaches every dependency.
        for &i in self.set.definition_order.iter().rev() {
            if needed[i] {
                mark(i, &mut needed);
            }
        }
        needed
    }

    /// Compiles statement `i`: live slots are read at run time, everything else folded.
    fn compile(&self, i: usize, slots: &[f64], live: &[bool]) -> Result<Program, InputError> {
        let expr = &self.set.statements[i].expr;
        Program::compile(expr.rpn(), &mut |name| match self.slot.get(name) {
            Some(&s) if live[s] => Some(Operand::Slot(s)),
            Some(&s) => Some(Operand::Value(slots[s])),
            None => functions::constant(name).map(Operand::Value),
        })
        .map_err(|e| e.into_input_error(expr))
    }

    /// The values of every definition, in text order, at variable values `values`.
    pub fn definition_values(&self, values: &[f64]) -> Result<Vec<(String, f64)>, InputError> {
        let block = self.block(values, &[], 0, &[])?;
        Ok(self
            .set
            .statements
            .iter()
            .enumerate()
            .filter_map(|(i, s)| match &s.kind {
                StatementKind::Definition(n) => Some((n.clone(), block.slots[self.def_slot[&i]])),
                StatementKind::Equation => None,
            })
            .collect())
    }
}

/// Compiled equations of some live variables: write the live values, run the dynamic
/// definitions in order, then the equations. No allocation per evaluation.
pub(crate) struct Block {
    live: Vec<usize>,
    defs: Vec<(usize, Program)>,
    eqs: Vec<Program>,
    slots: Vec<f64>,
    stack: Vec<f64>,
}

impl Block {
    /// Residuals at live values `x` into `out`.
    pub fn eval(&mut self, x: &[f64], out: &mut [f64]) {
        for (&s, &v) in self.live.iter().zip(x) {
            self.slots[s] = v;
        }
        for (s, p) in &self.defs {
            self.slots[*s] = p.eval_with(&self.slots, &mut self.stack);
        }
        for (o, p) in out.iter_mut().zip(&self.eqs) {
            *o = p.eval_with(&self.slots, &mut self.stack);
        }
    }

    /// The first residual with live values `live` of any [`Number`] kind; `slots` and
    /// `stack` are scratch buffers (filled here, kept by the caller to reuse).
    pub fn eval_first<N: Number>(&self, live: &[N], slots: &mut Vec<N>, stack: &mut Vec<N>) -> N {
        slots.clear();
        slots.extend(self.slots.iter().map(|&v| N::constant(v)));
        stack.clear();
        stack.resize(self.stack.len(), N::constant(0.0));
        for (&s, &v) in self.live.iter().zip(live) {
            slots[s] = v;
        }
        for (s, p) in &self.defs {
            let v = p.run(slots, stack);
            slots[*s] = v;
        }
        match self.eqs.first() {
            Some(p) => p.run(slots, stack),
            None => N::undefined(),
        }
    }

    /// Every residual, into `out`, with live values `live` of any [`Number`] kind;
    /// `slots` and `stack` are scratch buffers (as in [`Block::eval_first`]).
    pub fn eval_all<N: Number>(
        &self,
        live: &[N],
        slots: &mut Vec<N>,
        stack: &mut Vec<N>,
        out: &mut Vec<N>,
    ) {
        slots.clear();
        slots.extend(self.slots.iter().map(|&v| N::constant(v)));
        stack.clear();
        stack.resize(self.stack.len(), N::constant(0.0));
        for (&s, &v) in self.live.iter().zip(live) {
            slots[s] = v;
        }
        for (s, p) in &self.defs {
            let v = p.run(slots, stack);
            slots[*s] = v;
        }
        out.clear();
        for p in &self.eqs {
            out.push(p.run(slots, stack));
        }
    }

    /// The first residual with one live value.
    #[inline]
    pub fn eval_one(&mut self, x: f64) -> f64 {
        if let Some(&s) = self.live.first() {
            self.slots[s] = x;
        }
        for (s, p) in &self.defs {
            self.slots[*s] = p.eval_with(&self.slots, &mut self.stack);
        }
        match self.eqs.first() {
            Some(p) => p.eval_with(&self.slots, &mut self.stack),
            None => f64::NAN,
        }
    }
}
