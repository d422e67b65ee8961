//! Evaluations per second: compiled programs against hand-written Rust and meval's
//! `eval_with_context`, side by side in one run, on five expressions of engineering
//! practice.
//!
//! `cargo run --release --example bench_eval`
//!
//! Columns (evaluations per second):
//! - `meval`: `Expr::eval_with_context` with the variables in a `Vec<(&str, f64)>` or a
//!   `meval::Context` (an FNV hash map), whichever is faster;
//! - `before`: the compiled program as it was before issue 15 (`previous.rs`), every
//!   variable in a slot;
//! - `program`: the compiled program now, every variable in a slot (the same work as
//!   meval and as the hand-written Rust);
//! - `residual`: `EquationSet::residual_fn`, the form a solve uses: the givens folded in;
//! - `native`: the same expression as hand-written Rust, compiled by LLVM: the most any
//!   evaluator that calls the same math functions could reach.
//!
//! Then how many times slower than `native` each evaluator is (`×native`: before,
//! program, residual; the goal of issue 15 is 1.3 or less) and how many times faster
//! than meval the program is. Every value is checked before timing: the program and
//! the residual give the same bits, and the same bits as meval unless the expression has
//! a power that [`tacit::equations::functions::power`] multiplies out (then within
//! 4e-16 relative).

use std::hint::black_box;
use std::time::{Duration, Instant};

use tacit::equations::functions::reference_context;
use tacit::equations::{EquationSet, Expression, Operand};

mod previous;

struct Case {
    name: &'static str,
    text: String,
    /// The same expression as hand-written Rust, compiled by LLVM: the floor set by the
    /// arithmetic and the math library themselves. A speed reference only (LLVM may
    /// rewrite `powf(x, 2.0)` as `x * x`, so its last bit is not checked).
    native: fn(&[f64]) -> f64,
    /// Variable values; the first is the one that changes between evaluations.
    values: Vec<(String, f64)>,
}

fn cases() -> Vec<Case> {
    let v = |pairs: &[(&str, f64)]| -> Vec<(String, f64)> {
        pairs.iter().map(|&(n, x)| (n.to_string(), x)).collect()
    };
    let mut npv_terms = vec!["c0".to_string()];
    let mut npv_values = vec![("r".to_string(), 0.07), ("c0".to_string(), -1000.0)];
    for k in 1..30 {
        npv_terms.push(format!("c{k}/(1 + r)^{k}"));
        npv_values.push((format!("c{k}"), 80.0 + k as f64));
    }
    vec![
        Case {
            name: "Colebrook residual",
            text: "1/sqrt(f) + 2*log10(eps/(3.7*D) + 2.51/(Re*sqrt(f)))".into(),
            native: |v| {
                let (f, eps, d, re) = (v[0], v[1], v[2], v[3]);
                1.0 / f.sqrt() + 2.0 * (eps / (3.7 * d) + 2.51 / (re * f.sqrt())).log10()
            },
            values: v(&[("f", 0.02), ("eps", 4.6e-5), ("D", 0.3), ("Re", 2.0e5)]),
        },
        Case {
            name: "Manning, trapezoidal channel",
            text: "(1/n)*((b + z*y)*y)*(((b + z*y)*y)/(b + 2*y*sqrt(1 + z^2)))^(2/3)*sqrt(S) - Q"
                .into(),
            native: |v| {
                let (y, n, b, z, s, q) = (v[0], v[1], v[2], v[3], v[4], v[5]);
                (1.0 / n)
                    * ((b + z * y) * y)
                    * (((b + z * y) * y) / (b + 2.0 * y * (1.0 + z.powf(2.0)).sqrt()))
                        .powf(2.0 / 3.0)
                    * s.sqrt()
                    - q
            },
            values: v(&[
                ("y", 1.2),
                ("n", 0.013),
                ("b", 3.0),
                ("z", 2.0),
                ("S", 0.0005),
                ("Q", 12.0),
            ]),
        },
        Case {
            name: "isentropic area-Mach",
            text: "(1/M)*((2/(k + 1))*(1 + (k - 1)/2*M^2))^((k + 1)/(2*(k - 1))) - AR".into(),
            native: |v| {
                let (m, k, ar) = (v[0], v[1], v[2]);
                (1.0 / m)
                    * ((2.0 / (k + 1.0)) * (1.0 + (k - 1.0) / 2.0 * m.powf(2.0)))
                        .powf((k + 1.0) / (2.0 * (k - 1.0)))
                    - ar
            },
            values: v(&[("M", 2.2), ("k", 1.4), ("AR", 2.0)]),
        },
        Case {
            name: "secant formula, column",
            text: "P/A*(1 + e*c/r^2*sec(L/(2*r)*sqrt(P/(E*A)))) - smax".into(),
            native: |v| {
                let (p, a, e, c, r, l, em, smax) = (v[0], v[1], v[2], v[3], v[4], v[5], v[6], v[7]);
                p / a
                    * (1.0
                        + e * c / r.powf(2.0)
                            * (1.0 / (l / (2.0 * r) * (p / (em * a)).sqrt()).cos()))
                    - smax
            },
            values: v(&[
                ("P", 2.0e5),
                ("A", 4.0e-3),
                ("e", 0.01),
                ("c", 0.1),
                ("r", 0.07),
                ("L", 5.0),
                ("E", 2.0e11),
                ("smax", 2.5e8),
            ]),
        },
        Case {
            name: "NPV, 30 cash flows (sum)",
            text: npv_terms.join(" + "),
            native: |v| {
                let r = v[0];
                let mut sum = v[1];
                for k in 1..30 {
                    sum += v[k + 1] / (1.0 + r).powf(k as f64);
                }
                sum
            },
            values: npv_values,
        },
    ]
}

/// Many short rounds: on a shared machine, the best short run is the least disturbed.
const ROUNDS: usize = 25;

/// Evaluations per second of `f`, run for about `budget`.
fn rate(budget: Duration, mut f: impl FnMut(usize) -> f64) -> f64 {
    let mut n = 1000usize;
    loop {
        let start = Instant::now();
        let mut acc = 0.0;
        for i in 0..n {
            acc += f(i);
        }
        black_box(acc);
        let t = start.elapsed();
        if t >= budget {
            return n as f64 / t.as_secs_f64();
        }
        n *= 4;
    }
}

/// The changing value at step i: tiny relative changes, so nothing can be hoisted.
fn wiggle(base: f64, i: usize) -> f64 {
    base * (1.0 + (i % 1024) as f64 * 1e-12)
}

fn main() {
    let budget = Duration::from_millis(8);
    let functions = reference_context();
    println!(
        "{:<30} {:>10} {:>10} {:>10} {:>10} {:>10} | {:>24} | {:>8}",
        "expression",
        "meval/s",
        "before/s",
        "program/s",
        "residual/s",
        "native/s",
        "×native: before prog resid",
        "÷meval"
    );
    let mut worst_program = 0f64;
    let mut worst_residual = 0f64;
    for case in cases() {
        let expr = Expression::parse(&case.text).expect("benchmark text parses");
        let names: Vec<&str> = case.values.iter().map(|(n, _)| n.as_str()).collect();
        let program = expr.compile(&names).expect("compiles");
        let before = previous::Program::compile(&expr.meval()[..], &mut |name| {
            names.iter().position(|n| *n == name).map(Operand::Slot)
        })
        .expect("the previous compiler reads it");
        let mut slots: Vec<f64> = case.values.iter().map(|(_, x)| *x).collect();
        let mut stack = vec![0.0; program.stack_size()];
        let mut before_stack = vec![0.0; before.stack_size()];
        let mut vars: Vec<(&str, f64)> =
            case.values.iter().map(|(n, x)| (n.as_str(), *x)).collect();
        let mut map = reference_context();
        for (n, x) in &case.values {
            map.var(n.clone(), *x);
        }
        let set = EquationSet::parse_declaring(&case.text, &names).expect("set parses");
        let (unknown, base) = (case.values[0].0.clone(), case.values[0].1);
        let mut residual = set
            .residual_fn(&case.values[1..], &unknown)
            .expect("residual compiles");

        // Check before timing.
        for i in [0usize, 7, 1000] {
            let x = wiggle(base, i);
            vars[0].1 = x;
            slots[0] = x;
            let m = expr.meval().eval_with_context((&vars, &functions)).unwrap();
            let b = before.eval_with(&slots, &mut before_stack);
            let p = program.eval_with(&slots, &mut stack);
            let r = residual(x);
            assert_eq!(m.to_bits(), b.to_bits(), "{}: before differs", case.name);
            if program.has_multiplied_powers() {
                assert!(
                    (m - p).abs() <= 4e-16 * m.abs(),
                    "{}: program differs",
                    case.name
                );
            } else {
                assert_eq!(m.to_bits(), p.to_bits(), "{}: program differs", case.name);
            }
            assert_eq!(p.to_bits(), r.to_bits(), "{}: residual differs", case.name);
        }

        // Rounds, interleaved, best of each: the machine may be shared, and the best
        // of several short runs is the least disturbed one.
        let (mut meval_vec, mut meval_map, mut old, mut compiled, mut folded, mut native) =
            (0f64, 0f64, 0f64, 0f64, 0f64, 0f64);
        let mut nv = slots.clone();
        for _ in 0..ROUNDS {
            meval_vec = meval_vec.max(rate(budget, |i| {
                vars[0].1 = wiggle(base, i);
                expr.meval()
                    .eval_with_context((&vars, &functions))
                    .unwrap_or(f64::NAN)
            }));
            meval_map = meval_map.max(rate(budget, |i| {
                map.var(unknown.as_str(), wiggle(base, i));
                expr.meval().eval_with_context(&map).unwrap_or(f64::NAN)
            }));
            old = old.max(rate(budget, |i| {
                slots[0] = wiggle(base, i);
                before.eval_with(&slots, &mut before_stack)
            }));
            compiled = compiled.max(rate(budget, |i| {
                slots[0] = wiggle(base, i);
                program.eval_with(&slots, &mut stack)
            }));
            folded = folded.max(rate(budget, |i| residual(wiggle(base, i))));
            native = native.max(rate(budget, |i| {
                nv[0] = wiggle(base, i);
                (case.native)(black_box(&nv))
            }));
        }
        let meval_best = meval_vec.max(meval_map);
        worst_program = worst_program.max(native / compiled);
        worst_residual = worst_residual.max(native / folded);
        println!(
            "{:<30} {:>10.3e} {:>10.3e} {:>10.3e} {:>10.3e} {:>10.3e} | {:>8.2} {:>7.2} {:>7.2} | {:>7.1}x",
            case.name,
            meval_best,
            old,
            compiled,
            folded,
            native,
            native / old,
            native / compiled,
            native / folded,
            compiled / meval_best,
        );
    }

    // The same cash flows through the language's npv() function.
    let mut args = vec!["r".to_string()];
    args.extend((0..30).map(|k| format!("c{k}")));
    let text = format!("npv({})", args.join(", "));
    let e = Expression::parse(&text).expect("npv text parses");
    let names: Vec<&str> = args.iter().map(|s| s.as_str()).collect();
    let p = e.compile(&names).expect("npv compiles");
    let mut slots: Vec<f64> = vec![0.07, -1000.0];
    slots.extend((1..30).map(|k| 80.0 + k as f64));
    let mut stack = vec![0.0; p.stack_size()];
    let mut npv_rate = 0f64;
    for _ in 0..ROUNDS {
        npv_rate = npv_rate.max(rate(budget, |i| {
            slots[0] = wiggle(0.07, i);
            p.eval_with(&slots, &mut stack)
        }));
    }
    println!(
        "{:<30} {:>10} {:>10} {:>10.3e}",
        "NPV, 30 cash flows (npv())", "", "", npv_rate
    );
    println!(
        "\nslowest against hand-written Rust: program {worst_program:.2}x, residual \
         {worst_residual:.2}x (goal of issue 15: 1.3x or less)"
    );
}
