//! The residual of one equation as a function of its unknown, evaluated as a point, an
//! interval, a derivative or a slope: what proofs of roots and the propagation of
//! uncertainty need of an equation text.
//!
//! ```
//! use tacit::equations::{EquationSet, Interval};
//! let set = EquationSet::parse("x^2 = a").unwrap();
//! let mut r = set.residual(&[("a".into(), 2.0)], "x", &["a"]).unwrap();
//! assert_eq!(r.value(3.0), 7.0);
//! assert_eq!(r.derivative(3.0).d, 6.0);
//! let mut g = [0.0; 2];
//! r.gradient(3.0, &mut g);
//! assert_eq!(g, [6.0, -1.0]); // d/dx and d/da
//! assert!(r.interval(Interval::new(1.0, 2.0)).contains(0.5));
//! ```

use super::dual::Dual;
use super::interval::Interval;
use super::set::{Block, EquationSet};
use super::solve::{check_names, UnknownSpec};
use crate::error::InputError;

/// The most knowns kept variable in a [`Residual`].
pub const MAX_LIVE_KNOWNS: usize = 127;

/// Scratch buffers for one kind of number.
struct Scratch<N> {
    live: Vec<N>,
    slots: Vec<N>,
    stack: Vec<N>,
}

impl<N> Scratch<N> {
    fn new() -> Scratch<N> {
        Scratch {
            live: Vec::new(),
            slots: Vec::new(),
            stack: Vec::new(),
        }
    }
}

/// F(x, k): the residual of a set's one equation in its unknown x, with some knowns k
/// kept variable ("live") so that they can be changed ([`Residual::set_knowns`]) and
/// differentiated ([`Residual::gradient`]); every other known is folded in.
pub struct Residual {
    block: Block,
    /// Live values: the unknown, then the live knowns.
    live: Vec<f64>,
    names: Vec<String>,
    out: [f64; 1],
    intervals: Scratch<Interval>,
    duals: Scratch<Dual<f64>>,
    slopes: Scratch<Dual<Interval>>,
    evaluations: usize,
}

impl EquationSet {
    /// The residual of this set's one equation as a function of `unknown`, with every
    /// other variable given in `knowns`; the knowns named in `live` stay variable
    /// (at most [`MAX_LIVE_KNOWNS`]).
    pub fn residual(
        &self,
        knowns: &[(String, f64)],
        unknown: &str,
        live: &[&str],
    ) -> Result<Residual, InputError> {
        let n = self.equation_count();
        if n != 1 {
            return Err(InputError::new(
                "equation-count",
                format!("a residual of one unknown needs exactly one equation; this text has {n}"),
            ));
        }
        if live.len() > MAX_LIVE_KNOWNS {
            return Err(InputError::new(
                "too-many-inputs",
                format!(
                    "{} knowns are to stay variable; the limit is {MAX_LIVE_KNOWNS}",
                    live.len()
                ),
            ));
        }
        let spec = [UnknownSpec::named(unknown)];
        let plan = check_names(self, knowns, &spec)?;
        for (i, name) in live.iter().enumerate() {
            if !knowns.iter().any(|(k, _)| k == name) {
                return Err(InputError::new(
                    "unknown-variable",
                    format!("`{name}` is to stay variable but is not among the knowns"),
                ));
            }
            if live[..i].contains(name) {
                return Err(InputError::new(
                    "duplicate-name",
                    format!("`{name}` is named twice among the knowns that stay variable"),
                ));
            }
        }
        let mut order = vec![unknown.to_string()];
        order.extend(live.iter().map(|s| s.to_string()));
        let layout = self.layout(plan.variables.clone(), &order);
        let slots = order
            .iter()
            .map(|name| layout.require_slot(name))
            .collect::<Result<Vec<usize>, InputError>>()?;
        let mask = if order.len() >= 128 {
            u128::MAX
        } else {
            (1u128 << order.len()) - 1
        };
        let block = layout.block(&plan.values, &slots, mask, &self.equation_indices())?;
        let mut values = vec![f64::NAN];
        for name in live {
            let v = knowns
                .iter()
                .find(|(k, _)| k == name)
                .map(|&(_, v)| v)
                .unwrap_or(f64::NAN);
            values.push(v);
        }
        Ok(Residual {
            block,
            live: values,
            names: live.iter().map(|s| s.to_string()).collect(),
            out: [f64::NAN],
            intervals: Scratch::new(),
            duals: Scratch::new(),
            slopes: Scratch::new(),
            evaluations: 0,
        })
    }
}

impl Residual {
    /// The knowns that stay variable, in the order of [`Residual::set_knowns`] and of
    /// the gradient after d/dx.
    pub fn live_knowns(&self) -> &[String] {
        &self.names
    }

    /// The current values of the live knowns.
    pub fn knowns(&self) -> &[f64] {
        &self.live[1..]
    }

    /// Sets the live knowns (in the order of [`Residual::live_knowns`]; extra values
    /// are ignored).
    pub fn set_knowns(&mut self, values: &[f64]) {
        for (slot, &v) in self.live[1..].iter_mut().zip(values) {
            *slot = v;
        }
    }

    /// Evaluations of any kind made so far.
    pub fn evaluations(&self) -> usize {
        self.evaluations
    }

    /// F(x) at the current knowns.
    pub fn value(&mut self, x: f64) -> f64 {
        self.evaluations += 1;
        self.live[0] = x;
        self.block.eval(&self.live, &mut self.out);
        self.out[0]
    }

    /// An enclosure of F over `x` (the knowns as points).
    pub fn interval(&mut self, x: Interval) -> Interval {
        self.evaluations += 1;
        let s = &mut self.intervals;
        s.live.clear();
        s.live.push(x);
        s.live
            .extend(self.live[1..].iter().map(|&v| Interval::point(v)));
        self.block.eval_first(&s.live, &mut s.slots, &mut s.stack)
    }

    /// F and dF/dx at `x`.
    pub fn derivative(&mut self, x: f64) -> Dual<f64> {
        self.derivative_along(x, 0)
    }

    /// F and its derivative along live value `seed` (0: x, i: the i-th live known).
    fn derivative_along(&mut self, x: f64, seed: usize) -> Dual<f64> {
        self.evaluations += 1;
        self.live[0] = x;
        let s = &mut self.duals;
        s.live.clear();
        s.live.extend(self.live.iter().enumerate().map(|(i, &v)| {
            if i == seed {
                Dual::variable(v)
            } else {
                Dual::fixed(v)
            }
        }));
        self.block.eval_first(&s.live, &mut s.slots, &mut s.stack)
    }

    /// F at `x` and its gradient: dF/dx, then dF/dk for each live known, into
    /// `gradient` (as long as 1 + the live knowns; one evaluation per entry).
    pub fn gradient(&mut self, x: f64, gradient: &mut [f64]) -> f64 {
        let mut value = f64::NAN;
        for (i, g) in gradient.iter_mut().enumerate().take(self.live.len()) {
            let d = self.derivative_along(x, i);
            value = d.v;
            *g = d.d;
        }
        value
    }

    /// Enclosures of F and dF/dx over `x` (the knowns as points).
    pub fn slope(&mut self, x: Interval) -> Dual<Interval> {
        self.evaluations += 1;
        let s = &mut self.slopes;
        s.live.clear();
        s.live.push(Dual::variable(x));
        s.live.extend(
            self.live[1..]
                .iter()
                .map(|&v| Dual::fixed(Interval::point(v))),
        );
        self.block.eval_first(&s.live, &mut s.slots, &mut s.stack)
    }
}
