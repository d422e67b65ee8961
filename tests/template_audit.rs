//! The catalogue audit: every template, every allowed unknown, inputs drawn across each
//! variable's bounds, solved from the template's default start and judged here, not
//! by the solver's own `converged`.
//!
//! Each case is checked against an independent solve written in this file: the
//! template's equations are compiled over named slots (auxiliary equations solved by
//! bisection inside each evaluation), the unknown's range (its bounds within its
//! limits, and no range at all when the knowns break one of the template's conditions)
//! is scanned densely for sign changes, and each sign change is bisected to
//! neighbouring floating-point numbers. A sign change among values at the level of
//! rounding of the equation's terms is noise, not a root.
//!
//! A point is a root when its residual is zero, or at most 1e-8 of the scale of the
//! equation's terms (the larger side, or the sum of |terms| split at the top-level + and
//! -), or when f changes sign across it within 4e-12 to 1e-8 relative while |f| there is
//! at most half of |f| on either side (at a pole or a jump it is not). A case is
//! - **converged**: the solver says converged, the answer is a root, and so is every
//!   other root reported;
//! - **refused with a reason**: not converged (or refused as outside the template's
//!   validity or range), the independent solve finds no root, and the notes or the
//!   error say why (no root in the range for these values, a value outside its range, a
//!   condition of validity, or an unknown the values leave undetermined);
//! - **wrong**: converged to a point that is not a root, or another root reported that
//!   is not one;
//! - **missed**: not converged although the independent solve finds a root;
//! - **unexplained**: refused without a reason.
//!
//! Printed beside them: answers where the residual is large against the two sides
//! though the point is a root as evaluated (the formula loses digits there), and
//! refusals with a root beyond the unknown's bounds widened a thousandfold (to spot
//! bounds narrower than the inputs allow).
//!
//! Half the draws are random (a root may or may not exist); the other half are made
//! consistent first, by solving one other variable independently so that the drawn
//! value of the unknown is a root. Draws are log-uniform where a range spans more than
//! two decades (with a tenth of them at exactly zero where the range starts at zero),
//! uniform otherwise; the seed is fixed.
//!
//! Run with `cargo test --release --test template_audit -- --nocapture` to see the
//! counts per template and in total. On the 6176 cases of this seed, the catalogue and
//! solve before this audit (commit e31d2db, the test adapted to its API) gave 4146
//! converged, 85 refused with a reason, 31 wrong, 113 missed and 1801 unexplained;
//! after the fixes of the same branch, 4235 converged, 1941 refused with a reason and
//! none wrong, missed or unexplained.

use std::collections::HashMap;

use tacit::equations::{EquationSet, Expression, Program};
use tacit::templates::{self, solve_template, Template, TemplateRequest};
use tacit::units;

/// Cases per template, shared among its unknowns (at least `MIN_PER_UNKNOWN` each).
const DRAWS_PER_TEMPLATE: usize = 200;
const MIN_PER_UNKNOWN: usize = 12;
/// Samples of the independent scan (fewer when each evaluation solves an auxiliary).
const SCAN: usize = 1000;
const SCAN_NESTED: usize = 300;
/// Bad cases listed per template and kind.
const SHOWN_PER_KIND: usize = 3;
/// More sign changes than this in one scan: f is rounding noise about zero there.
const INDETERMINATE: usize = 20;

/// SplitMix64 (Steele, Lea and Flood, "Fast splittable pseudorandom number
/// generators", OOPSLA 2014): small, fixed-seed, reproducible everywhere.
struct Rng(u64);

impl Rng {
    fn next_u64(&mut self) -> u64 {
        self.0 = self.0.wrapping_add(0x9E37_79B9_7F4A_7C15);
        let mut z = self.0;
        z = (z ^ (z >> 30)).wrapping_mul(0xBF58_476D_1CE4_E5B9);
        z = (z ^ (z >> 27)).wrapping_mul(0x94D0_49BB_1331_11EB);
        z ^ (z >> 31)
    }

    /// Uniform in [0, 1).
    fn unit(&mut self) -> f64 {
        (self.next_u64() >> 11) as f64 / (1u64 << 53) as f64
    }

    fn below(&mut self, n: usize) -> usize {
        (self.next_u64() % n as u64) as usize
    }
}

/// A value in [lo, hi]: log-uniform when the range spans more than two decades above
/// zero (from 1e-6 hi when it starts at zero, with a tenth exactly zero), else uniform.
fn draw(rng: &mut Rng, lo: f64, hi: f64) -> f64 {
    if lo == 0.0 && hi > 0.0 {
        if rng.unit() < 0.1 {
            return 0.0;
        }
        let a = (hi * 1e-6).ln();
        return (a + rng.unit() * (hi.ln() - a)).exp();
    }
    if lo > 0.0 && hi / lo > 100.0 {
        return (lo.ln() + rng.unit() * (hi.ln() - lo.ln())).exp();
    }
    lo + rng.unit() * (hi - lo)
}

/// An auxiliary equation solved inside each evaluation.
struct Aux {
    slot: usize,
    residual: Program,
    lo: f64,
    hi: f64,
    limits: Option<(Program, Program)>,
    /// Whether its equation uses the unknown (else it is solved once per case).
    moves: bool,
}

/// The template's equations compiled over named slots, independently of the solver.
struct Model {
    slots: Vec<f64>,
    index: HashMap<String, usize>,
    defs: Vec<(usize, Program)>,
    lhs: Program,
    rhs: Program,
    /// The terms of both sides (split at the top-level + and -), for the scale.
    terms: Vec<Program>,
    aux: Vec<Aux>,
    /// Auxiliary values for the current knowns, when none moves with the unknown.
    aux_cache: Option<Vec<f64>>,
    stack: Vec<f64>,
    unknown: usize,
    /// Slots of a list input (cash flows c_k of npv(r, c0, ...)).
    list: Vec<usize>,
}

fn strip_comment(line: &str) -> &str {
    line.split('#').next().unwrap_or("").trim()
}

/// The terms of an expression: its text split at the + and - that are binary operators
/// outside parentheses (not signs, not exponents of numbers such as 1e-6).
fn split_terms(text: &str) -> Vec<String> {
    let chars: Vec<char> = text.chars().collect();
    let mut terms = Vec::new();
    let mut depth = 0i32;
    let mut start = 0;
    for (i, &c) in chars.iter().enumerate() {
        match c {
            '(' => depth += 1,
            ')' => depth -= 1,
            '+' | '-' if depth == 0 => {
                let before: Vec<char> = chars[..i]
                    .iter()
                    .rev()
                    .copied()
                    .skip_while(|c| c.is_whitespace())
                    .collect();
                let operand_end = before
                    .first()
                    .is_some_and(|c| c.is_alphanumeric() || matches!(c, '_' | ')' | '.'));
                // The alphanumeric run before the sign: a number if it starts with a digit.
                let run: Vec<char> = chars[..i]
                    .iter()
                    .rev()
                    .copied()
                    .take_while(|c| c.is_alphanumeric() || matches!(c, '_' | '.'))
                    .collect();
                let exponent = matches!(chars[i - 1], 'e' | 'E')
                    && run.last().is_some_and(|c| c.is_ascii_digit() || *c == '.');
                if operand_end && !exponent {
                    terms.push(chars[start..i].iter().collect::<String>());
                    start = i;
                }
            }
            _ => {}
        }
    }
    terms.push(chars[start..].iter().collect());
    terms
        .into_iter()
        .map(|t| t.trim().to_string())
        .filter(|t| !t.is_empty() && t != "+" && t != "-")
        .collect()
}

fn compile(text: &str, names: &[&str]) -> Program {
    Expression::parse(text)
        .unwrap_or_else(|e| panic!("`{text}`: {}", e.message))
        .compile(names)
        .unwrap_or_else(|e| panic!("`{text}`: {}", e.message))
}

impl Model {
    /// The model of `t` for `unknown`, with `list_len` entries in the list input.
    fn new(t: &Template, unknown: &str, list_len: usize) -> Model {
        let mut text = t.equations.clone();
        let mut names: Vec<String> = t.variables.iter().map(|v| v.symbol.clone()).collect();
        names.extend(t.auxiliary.iter().map(|a| a.symbol.clone()));
        if let Some(list) = &t.list {
            let items: Vec<String> = (0..list_len)
                .map(|k| format!("{}{k}", list.symbol))
                .collect();
            text = text.replace(&format!("{{{}}}", list.symbol), &items.join(", "));
            names.extend(items);
        }
        let set =
            EquationSet::parse_declaring(&text, &t.declared_symbols()).expect("catalogue text");
        let definitions: Vec<(String, Expression)> = set
            .definitions()
            .into_iter()
            .map(|(n, e)| (n.to_string(), e.clone()))
            .collect();
        names.extend(definitions.iter().map(|(n, _)| n.clone()));
        let refs: Vec<&str> = names.iter().map(String::as_str).collect();
        let index: HashMap<String, usize> = names
            .iter()
            .enumerate()
            .map(|(i, n)| (n.clone(), i))
            .collect();
        let defs = definitions
            .iter()
            .map(|(n, e)| (index[n], e.compile(&refs).expect("definition compiles")))
            .collect();
        // An `SI:` label (an empirical relation valid in SI only) is not part of the
        // relation itself.
        let unlabel = |l: &str| {
            l.trim()
                .strip_prefix("SI:")
                .unwrap_or(l.trim())
                .trim()
                .to_string()
        };
        let aux_lines: Vec<String> = t.auxiliary.iter().map(|a| unlabel(&a.equation)).collect();
        let main: Vec<String> = text
            .lines()
            .map(|l| unlabel(strip_comment(l)))
            .filter(|l| !l.is_empty() && !l.contains(":=") && !aux_lines.contains(l))
            .collect();
        assert_eq!(main.len(), 1, "{}: one main equation, got {main:?}", t.id);
        let (lhs, rhs) = main[0].split_once('=').unwrap_or((&main[0], "0"));
        let aux = t
            .auxiliary
            .iter()
            .map(|a| {
                let equation = unlabel(&a.equation);
                let (l, r) = equation.split_once('=').unwrap_or((&equation, "0"));
                let residual = compile(&format!("({l}) - ({r})"), &refs);
                Aux {
                    slot: index[&a.symbol],
                    residual,
                    lo: a.bounds[0],
                    hi: a.bounds[1],
                    limits: a
                        .limits
                        .as_ref()
                        .map(|[lo, hi]| (compile(lo, &refs), compile(hi, &refs))),
                    moves: Expression::parse(&equation.replace('=', "-"))
                        .map(|e| e.names().iter().any(|n| n == unknown))
                        .unwrap_or(true),
                }
            })
            .collect();
        let n = names.len();
        let list = (0..list_len)
            .filter_map(|k| {
                let list = t.list.as_ref()?;
                Some(index[&format!("{}{k}", list.symbol)])
            })
            .collect();
        Model {
            slots: vec![f64::NAN; n],
            index,
            defs,
            lhs: compile(lhs, &refs),
            rhs: compile(rhs, &refs),
            terms: split_terms(lhs)
                .iter()
                .chain(&split_terms(rhs))
                .map(|t| compile(t, &refs))
                .collect(),
            aux,
            aux_cache: None,
            stack: vec![0.0; 4096],
            unknown: 0,
            list,
        }
        .for_unknown(unknown)
    }

    fn for_unknown(mut self, unknown: &str) -> Model {
        self.unknown = self.index[unknown];
        self
    }

    fn set(&mut self, symbol: &str, si: f64) {
        let i = self.index[symbol];
        self.slots[i] = si;
        self.aux_cache = None;
    }

    fn run(&mut self, p: &Program) -> f64 {
        p.eval_with(&self.slots, &mut self.stack)
    }

    /// Bisection of an auxiliary equation in its bounds within its limits.
    fn solve_aux(&mut self, k: usize) -> f64 {
        let (mut lo, mut hi) = (self.aux[k].lo, self.aux[k].hi);
        if let Some((l, h)) = self.aux[k].limits.clone() {
            let (l, h) = (self.run(&l), self.run(&h));
            if l.is_finite() {
                lo = lo.max(l);
            }
            if h.is_finite() {
                hi = hi.min(h);
            }
        }
        if lo.is_nan() || hi.is_nan() || lo >= hi {
            return f64::NAN;
        }
        let slot = self.aux[k].slot;
        let residual = self.aux[k].residual.clone();
        let f = |m: &mut Model, x: f64| {
            m.slots[slot] = x;
            m.run(&residual)
        };
        // The first sign change among a few samples, then bisection.
        let n = 64;
        let mut a = lo;
        let mut fa = f(self, a);
        for i in 1..=n {
            let b = if i == n {
                hi
            } else {
                lo + (hi - lo) * i as f64 / n as f64
            };
            let fb = f(self, b);
            if fa == 0.0 {
                return a;
            }
            if fa.is_finite() && fb.is_finite() && (fa < 0.0) != (fb < 0.0) {
                let (mut a, mut b, mut fa) = (a, b, fa);
                for _ in 0..200 {
                    let m = a + (b - a) / 2.0;
                    if m <= a || m >= b {
                        break;
                    }
                    let fm = f(self, m);
                    if fm == 0.0 {
                        return m;
                    }
                    if (fm < 0.0) == (fa < 0.0) {
                        a = m;
                        fa = fm;
                    } else {
                        b = m;
                    }
                }
                return a + (b - a) / 2.0;
            }
            a = b;
            fa = fb;
        }
        f64::NAN
    }

    /// The main equation with the unknown at `x` (SI).
    fn at(&mut self, x: f64) -> At {
        self.slots[self.unknown] = x;
        if !self.aux.is_empty() {
            let moving = self.aux.iter().any(|a| a.moves);
            let values = match (&self.aux_cache, moving) {
                (Some(v), false) => v.clone(),
                _ => {
                    let v: Vec<f64> = (0..self.aux.len()).map(|k| self.solve_aux(k)).collect();
                    if !moving {
                        self.aux_cache = Some(v.clone());
                    }
                    v
                }
            };
            for (k, v) in values.into_iter().enumerate() {
                let s = self.aux[k].slot;
                self.slots[s] = v;
            }
        }
        for i in 0..self.defs.len() {
            let (s, p) = (self.defs[i].0, self.defs[i].1.clone());
            self.slots[s] = self.run(&p);
        }
        let (l, r) = (self.lhs.clone(), self.rhs.clone());
        let (lhs, rhs) = (self.run(&l), self.run(&r));
        let mut terms = lhs.abs().max(rhs.abs());
        let mut sum = 0.0;
        for k in 0..self.terms.len() {
            let p = self.terms[k].clone();
            sum += self.run(&p).abs();
        }
        // The terms of npv(r, c0, c1, ...) are c_k / (1 + r)^k.
        for (k, &slot) in self.list.iter().enumerate() {
            sum += (self.slots[slot] / (1.0 + x).powi(k as i32)).abs();
        }
        if sum.is_finite() {
            terms = terms.max(sum);
        }
        At { lhs, rhs, terms }
    }

    fn residual(&mut self, x: f64) -> f64 {
        let a = self.at(x);
        a.lhs - a.rhs
    }

    /// Whether `x` is a root of the equation as evaluated: the residual is zero, or
    /// small against the equation's terms (1e-8 relative), or f changes sign across
    /// x ± d for some d from 4e-12 to 1e-8 relative (finite on both sides) while |f(x)|
    /// is at most half the larger of |f(x ± d)| (at a pole or a jump it is not).
    fn is_root(&mut self, x: f64, lo: f64, hi: f64) -> bool {
        let a = self.at(x);
        let res = a.lhs - a.rhs;
        if !res.is_finite() || !a.terms.is_finite() {
            return false;
        }
        if res == 0.0 && a.terms > 0.0 {
            return true;
        }
        if res.abs() <= 1e-8 * a.terms {
            return true;
        }
        let size = x.abs().max(1e-9 * (hi - lo).abs()).max(1e-300);
        [4e-12, 1e-11, 1e-10, 1e-9, 1e-8].iter().any(|rel| {
            let d = rel * size;
            let below = self.residual((x - d).max(lo));
            let above = self.residual((x + d).min(hi));
            let change = (below <= 0.0 && above >= 0.0) || (below >= 0.0 && above <= 0.0);
            change
                && below.is_finite()
                && above.is_finite()
                && res.abs() <= 0.5 * below.abs().max(above.abs())
        })
    }

    /// Whether the residual at a root is large against the two sides: the formula
    /// loses digits there (cancellation), though the point is a root as evaluated.
    /// Only where the sides are not themselves small against the terms (an equation
    /// `... = 0`, or a root where the terms cancel).
    fn loses_digits(&mut self, x: f64) -> bool {
        let a = self.at(x);
        let sides = a.lhs.abs().max(a.rhs.abs());
        sides >= 1e-3 * a.terms && (a.lhs - a.rhs).abs() > 1e-6 * sides
    }

    /// The unknown's range: its bounds within its limits, in SI, with the knowns set.
    /// With `widen`, the bounds (not the limits) are widened a thousandfold (or by
    /// their width where they do not start above zero), to see roots just beyond them.
    fn range(&mut self, t: &Template, unknown: &str, widen: bool) -> Option<(f64, f64)> {
        let v = t.variable(unknown)?;
        let b = v.bounds_si().ok()?;
        let (mut lo, mut hi) = (b.lo, b.hi);
        if widen {
            let w = hi - lo;
            (lo, hi) = if lo > 0.0 {
                (lo / 1e3, hi * 1e3)
            } else {
                (lo - w, hi + w)
            };
        }
        if let Some([l, h]) = &v.limits {
            let names = self.names();
            let refs: Vec<&str> = names.iter().map(String::as_str).collect();
            let saved = self.slots[self.unknown];
            self.slots[self.unknown] = f64::NAN;
            let (l, h) = (self.run(&compile(l, &refs)), self.run(&compile(h, &refs)));
            self.slots[self.unknown] = saved;
            if l.is_nan() || h.is_nan() {
                return None;
            }
            if l.is_finite() {
                lo = lo.max(l);
            }
            if h.is_finite() {
                hi = hi.min(h);
            }
        }
        (lo < hi).then_some((lo, hi))
    }

    /// Whether the knowns break one of the template's conditions of validity (those
    /// written in the knowns alone).
    fn outside_validity(&mut self, t: &Template, unknown: &str) -> bool {
        let names = self.names();
        let refs: Vec<&str> = names.iter().map(String::as_str).collect();
        t.requires.iter().any(|r| {
            let e = Expression::parse(&r.holds).expect("condition parses");
            if e.names().iter().any(|n| n == unknown) {
                return false;
            }
            let p = e.compile(&refs).expect("condition compiles");
            self.run(&p) < 0.0
        })
    }

    fn names(&self) -> Vec<String> {
        let mut n: Vec<(&String, &usize)> = self.index.iter().collect();
        n.sort_by_key(|(_, &i)| i);
        n.into_iter().map(|(s, _)| s.clone()).collect()
    }

    /// Every root of the main equation in [lo, hi] by a dense scan and bisection.
    fn roots(&mut self, lo: f64, hi: f64) -> Vec<f64> {
        let n = if self.aux.iter().any(|a| a.moves) {
            SCAN_NESTED
        } else {
            SCAN
        };
        let log = lo > 0.0 && hi / lo > 20.0;
        let point = |i: usize| -> f64 {
            if i == 0 {
                lo
            } else if i == n {
                hi
            } else if log {
                (lo.ln() + (hi.ln() - lo.ln()) * i as f64 / n as f64).exp()
            } else {
                lo + (hi - lo) * i as f64 / n as f64
            }
        };
        let xs: Vec<f64> = (0..=n).map(point).collect();
        let fs: Vec<f64> = xs.iter().map(|&x| self.residual(x)).collect();
        // Values at the level of rounding of the equation's terms say nothing of a root.
        let noise = |m: &mut Model, x: f64, f: f64| f.abs() <= 1e-12 * m.at(x).terms;
        let mut found = Vec::new();
        for i in 0..=n {
            let (x, fx) = (xs[i], fs[i]);
            if fx == 0.0 {
                // An exact zero counts when its neighbours stand clear of rounding.
                let clear = |m: &mut Model, j: Option<usize>| {
                    j.is_none_or(|j| fs[j].is_finite() && !noise(m, xs[j], fs[j]))
                };
                let (before, after) = (i.checked_sub(1), (i < n).then_some(i + 1));
                if clear(self, before) && clear(self, after) && self.is_root(x, lo, hi) {
                    found.push(x);
                }
                continue;
            }
            if i == 0 {
                continue;
            }
            let (a, fa) = (xs[i - 1], fs[i - 1]);
            if fa.is_nan() || fx.is_nan() || fa == 0.0 || (fa < 0.0) == (fx < 0.0) {
                continue;
            }
            let r = self.bisect(a, x, fa);
            let level = self.at(r).terms;
            if fa.abs().max(fx.abs()) > 1e-12 * level && self.is_root(r, lo, hi) {
                found.push(r);
            }
        }
        found
    }

    fn bisect(&mut self, mut a: f64, mut b: f64, mut fa: f64) -> f64 {
        for _ in 0..300 {
            let m = a + (b - a) / 2.0;
            if m <= a || m >= b {
                break;
            }
            let fm = self.residual(m);
            if fm == 0.0 {
                return m;
            }
            if fm.is_nan() {
                break;
            }
            if (fm < 0.0) == (fa < 0.0) {
                a = m;
                fa = fm;
            } else {
                b = m;
            }
        }
        let (ra, rb) = (self.residual(a).abs(), self.residual(b).abs());
        if ra <= rb {
            a
        } else {
            b
        }
    }
}

/// The equation evaluated at a point.
struct At {
    lhs: f64,
    rhs: f64,
    /// The scale of the equation: the largest of |lhs|, |rhs| and the sum of |terms|.
    terms: f64,
}

/// One drawn case: values in each variable's default unit, and the list input.
struct Case {
    values: Vec<(String, f64, String)>,
    list: Vec<f64>,
    /// The drawn unknown when the case was made consistent (SI).
    expected: Option<f64>,
}

#[derive(Default, Clone, Copy)]
struct Counts {
    cases: usize,
    consistent: usize,
    converged: usize,
    converged_not_in_scan: usize,
    refused: usize,
    wrong: usize,
    missed: usize,
    unexplained: usize,
    /// Converged at a root of the formula as evaluated, where it loses digits.
    loses_digits: usize,
    /// The independent scan found f within rounding of zero along much of the range.
    indeterminate: usize,
    /// Not solved, with a root beyond the unknown's bounds (widened a thousandfold).
    beyond: usize,
    evaluations: usize,
}

impl std::ops::AddAssign for Counts {
    fn add_assign(&mut self, o: Counts) {
        self.cases += o.cases;
        self.consistent += o.consistent;
        self.converged += o.converged;
        self.converged_not_in_scan += o.converged_not_in_scan;
        self.refused += o.refused;
        self.wrong += o.wrong;
        self.missed += o.missed;
        self.unexplained += o.unexplained;
        self.loses_digits += o.loses_digits;
        self.indeterminate += o.indeterminate;
        self.beyond += o.beyond;
        self.evaluations += o.evaluations;
    }
}

fn si(t: &Template, symbol: &str, value: f64) -> f64 {
    let v = t.variable(symbol).unwrap();
    units::to_si_in(value, &v.unit, &v.dimension).unwrap()
}

/// Draws every variable (choices for a variable that is only a choice, such as a mode
/// number) and, for a list template, a list of cash flows.
fn draw_all(rng: &mut Rng, t: &Template) -> Case {
    let values = t
        .variables
        .iter()
        .map(|v| {
            let x = if !v.choices.is_empty() && !t.may_solve_for(&v.symbol) {
                v.choices[rng.below(v.choices.len())].value
            } else {
                draw(rng, v.bounds[0], v.bounds[1])
            };
            (v.symbol.clone(), x, v.unit.clone())
        })
        .collect();
    let list = match &t.list {
        None => Vec::new(),
        Some(_) => {
            let n = 2 + rng.below(14);
            let p = draw(rng, 1e2, 1e7);
            let mut flows = vec![-p];
            for _ in 1..n {
                let m = draw(rng, 0.1 * p / n as f64, 10.0 * p / n as f64);
                flows.push(if rng.unit() < 0.85 { m } else { -m });
            }
            flows
        }
    };
    Case {
        values,
        list,
        expected: None,
    }
}

fn model_for(t: &Template, unknown: &str, case: &Case) -> Model {
    let mut m = Model::new(t, unknown, case.list.len());
    for (s, x, _) in &case.values {
        m.set(s, si(t, s, *x));
    }
    if let Some(list) = &t.list {
        for (k, c) in case.list.iter().enumerate() {
            m.set(&format!("{}{k}", list.symbol), *c);
        }
    }
    m
}

/// Makes `case` consistent for `unknown`: another variable is solved independently so
/// that the drawn unknown is a root. False when no other variable has a root.
fn make_consistent(rng: &mut Rng, t: &Template, unknown: &str, case: &mut Case) -> bool {
    // A root exactly at a bound of the unknown is an edge of the range, not a case.
    let var = t.variable(unknown).unwrap();
    if value_of(case, unknown) == var.bounds[0] {
        let x = draw(rng, var.bounds[0], var.bounds[1]).max(var.bounds[1] * 1e-6);
        for entry in case.values.iter_mut() {
            if entry.0 == unknown {
                entry.1 = x;
            }
        }
    }
    let u_si = si(t, unknown, value_of(case, unknown));
    if let Some(list) = &t.list {
        // The first flow that makes the net present value zero at the drawn rate.
        let r = u_si;
        let rest: f64 = case.list[1..]
            .iter()
            .enumerate()
            .map(|(k, c)| c / (1.0 + r).powi(k as i32 + 1))
            .sum();
        case.list[0] = -rest;
        let _ = list;
        case.expected = Some(u_si);
        return true;
    }
    let pivots: Vec<String> = t
        .unknowns
        .iter()
        .filter(|p| *p != unknown)
        .cloned()
        .collect();
    for p in pivots {
        let mut m = model_for(t, &p, case);
        let Some((lo, hi)) = m.range(t, &p, false) else {
            continue;
        };
        let roots = m.roots(lo, hi);
        if roots.is_empty() {
            continue;
        }
        let r = roots[rng.below(roots.len())];
        let v = t.variable(&p).unwrap();
        let in_unit = units::from_si_in(r, &v.unit, &v.dimension).unwrap();
        for entry in case.values.iter_mut() {
            if entry.0 == p {
                entry.1 = in_unit;
            }
        }
        // The unknown must still lie in its range (its limits may move with the pivot).
        let mut check = model_for(t, unknown, case);
        match check.range(t, unknown, false) {
            Some((lo, hi)) if lo <= u_si && u_si <= hi => {
                case.expected = Some(u_si);
                return true;
            }
            _ => return false,
        }
    }
    false
}

fn value_of(case: &Case, symbol: &str) -> f64 {
    case.values.iter().find(|e| e.0 == symbol).unwrap().1
}

/// A note that says why nothing was found.
fn gives_reason(notes: &[String]) -> bool {
    notes.iter().any(|n| {
        n.contains("No root of")
            || n.contains("is not determined by them")
            || n.contains("is outside the range this template takes")
            || n.contains("outside the validity")
    })
}

/// Solves one case and judges it; the last string describes a bad outcome.
fn judge(t: &Template, unknown: &str, case: &Case, counts: &mut Counts, bad: &mut Vec<String>) {
    let failed = counts.refused + counts.unexplained;
    judge_case(t, unknown, case, counts, bad);
    if counts.refused + counts.unexplained > failed {
        let mut m = model_for(t, unknown, case);
        if let Some((lo, hi)) = m.range(t, unknown, true) {
            let roots = m.roots(lo, hi);
            if !roots.is_empty() && roots.len() <= INDETERMINATE {
                counts.beyond += 1;
                bad.push(format!(
                    "{} / {unknown}: beyond: not solved, but roots {roots:?} lie beyond the bounds of {unknown} ({})",
                    t.id,
                    case.values
                        .iter()
                        .filter(|e| e.0 != unknown)
                        .map(|(s, x, u)| format!("{s}={x:.6e} {u}"))
                        .collect::<Vec<_>>()
                        .join(", ")
                ));
            }
        }
    }
}

fn judge_case(
    t: &Template,
    unknown: &str,
    case: &Case,
    counts: &mut Counts,
    bad: &mut Vec<String>,
) {
    counts.cases += 1;
    if case.expected.is_some() {
        counts.consistent += 1;
    }
    let mut req = TemplateRequest::new(&t.id, unknown);
    req.values = case
        .values
        .iter()
        .filter(|e| e.0 != unknown)
        .cloned()
        .collect();
    if let Some(list) = &t.list {
        for c in &case.list {
            req.values
                .push((list.symbol.clone(), *c, "currency".to_string()));
        }
    }
    let mut m = model_for(t, unknown, case);
    let range = m.range(t, unknown, false);
    let roots = match range {
        Some((lo, hi)) if !m.outside_validity(t, unknown) => m.roots(lo, hi),
        _ => Vec::new(),
    };
    // Rounding noise about zero along the range: no root is determined.
    let roots = if roots.len() > INDETERMINATE {
        counts.indeterminate += 1;
        Vec::new()
    } else {
        roots
    };
    let shown: Vec<String> = case
        .values
        .iter()
        .filter(|e| e.0 != unknown)
        .map(|(s, x, u)| format!("{s}={x:e} {u}"))
        .collect();
    let describe = |what: &str| {
        format!(
            "{} / {unknown}: {what}; inputs {}{}; independent roots {:?}{}",
            t.id,
            shown.join(", "),
            if case.list.is_empty() {
                String::new()
            } else {
                format!(", flows {:?}", case.list)
            },
            &roots[..roots.len().min(4)],
            if roots.len() > 4 {
                format!(" and {} more", roots.len() - 4)
            } else {
                String::new()
            }
        )
    };
    let var = t.variable(unknown).unwrap();
    match solve_template(&req) {
        Err(e) => {
            if !roots.is_empty() {
                counts.missed += 1;
                bad.push(describe(&format!("missed: error {} {}", e.code, e.message)));
            } else if e.code == "no-solution-range" || e.code == "outside-validity" {
                counts.refused += 1;
            } else {
                counts.unexplained += 1;
                bad.push(describe(&format!(
                    "unexplained: error {} {}",
                    e.code, e.message
                )));
            }
        }
        Ok(s) => {
            counts.evaluations += s.solution.evaluations;
            let (lo, hi) = range.unwrap_or((f64::NEG_INFINITY, f64::INFINITY));
            let others: Vec<f64> = s
                .other_roots
                .iter()
                .map(|o| units::to_si_in(o.value, &s.unit, &var.dimension).unwrap())
                .collect();
            if let Some(o) = others.iter().find(|&&o| !m.is_root(o, lo, hi)) {
                counts.wrong += 1;
                bad.push(describe(&format!("wrong: other root {o} is no root")));
                return;
            }
            if s.solution.converged {
                let x = s.solution.unknowns[0].1;
                if !m.is_root(x, lo, hi) {
                    let a = m.at(x);
                    counts.wrong += 1;
                    bad.push(describe(&format!(
                        "wrong: converged ({}) at {x}, sides {} and {}, terms {}",
                        s.solution.status.code(),
                        a.lhs,
                        a.rhs,
                        a.terms
                    )));
                    return;
                }
                counts.converged += 1;
                if m.loses_digits(x) {
                    counts.loses_digits += 1;
                    let a = m.at(x);
                    bad.push(describe(&format!(
                        "loses digits: converged at {x}, sides {} and {}",
                        a.lhs, a.rhs
                    )));
                }
                let near = |r: &f64| (x - r).abs() <= 1e-7 * r.abs().max(1e-9 * (hi - lo));
                if !roots.iter().any(near) {
                    counts.converged_not_in_scan += 1;
                }
            } else if !roots.is_empty() {
                counts.missed += 1;
                bad.push(describe(&format!(
                    "missed: {} after {} evaluations; notes {:?}",
                    s.solution.status.code(),
                    s.solution.evaluations,
                    s.notes
                )));
            } else if gives_reason(&s.notes) {
                counts.refused += 1;
            } else {
                counts.unexplained += 1;
                bad.push(describe(&format!(
                    "unexplained: {}; notes {:?}",
                    s.solution.status.code(),
                    s.notes
                )));
            }
        }
    }
}

fn audit_template(rng: &mut Rng, t: &Template, bad: &mut Vec<String>) -> Counts {
    let mut counts = Counts::default();
    let per = (DRAWS_PER_TEMPLATE / t.unknowns.len()).max(MIN_PER_UNKNOWN);
    for u in &t.unknowns {
        for k in 0..per {
            let mut case = draw_all(rng, t);
            if k % 2 == 1 {
                make_consistent(rng, t, u, &mut case);
            }
            judge(t, u, &case, &mut counts, bad);
        }
    }
    counts
}

#[test]
fn catalogue_audit() {
    let mut rng = Rng(0x7AC1_7A0D_17ED_2026);
    let mut total = Counts::default();
    let mut bad = Vec::new();
    println!(
        "{:44} {:>6} {:>6} {:>9} {:>8} {:>6} {:>6} {:>6} {:>6} {:>6} {:>6} {:>7}",
        "template",
        "cases",
        "consis",
        "converged",
        "refused",
        "wrong",
        "missed",
        "unexpl",
        "digits",
        "indet",
        "beyond",
        "mean ev"
    );
    for t in templates::all() {
        let c = audit_template(&mut rng, t, &mut bad);
        println!(
            "{:44} {:>6} {:>6} {:>9} {:>8} {:>6} {:>6} {:>6} {:>6} {:>6} {:>6} {:>7.1}",
            t.id,
            c.cases,
            c.consistent,
            c.converged,
            c.refused,
            c.wrong,
            c.missed,
            c.unexplained,
            c.loses_digits,
            c.indeterminate,
            c.beyond,
            c.evaluations as f64 / c.cases as f64
        );
        total += c;
    }
    println!(
        "audit: {} cases ({} made consistent): {} converged ({} at a root the scan did not \
         list; {} where the formula loses digits), {} refused with a reason, {} wrong, {} \
         missed, {} unexplained; {} cases where f is rounding noise about zero (indeterminate)",
        total.cases,
        total.consistent,
        total.converged,
        total.converged_not_in_scan,
        total.loses_digits,
        total.refused,
        total.wrong,
        total.missed,
        total.unexplained,
        total.indeterminate
    );
    // The first few of each kind per template, wrong answers first.
    for kind in ["wrong", "missed", "unexplained", "loses digits", "beyond"] {
        let mut shown: HashMap<String, usize> = HashMap::new();
        for b in bad.iter().filter(|b| b.contains(&format!(": {kind}"))) {
            let id = b.split(' ').next().unwrap_or("").to_string();
            let n = shown.entry(id).or_default();
            *n += 1;
            if *n <= SHOWN_PER_KIND {
                println!("  {b}");
            }
        }
    }
    assert_eq!(
        total.converged + total.refused + total.wrong + total.missed + total.unexplained,
        total.cases
    );
    assert!(
        total.wrong == 0 && total.missed == 0 && total.unexplained == 0,
        "{} wrong, {} missed, {} unexplained (listed above with --nocapture)",
        total.wrong,
        total.missed,
        total.unexplained
    );
}
