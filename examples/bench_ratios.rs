//! The native side of `scripts/bench-ratios.mjs`, which runs this example between its own
//! wasm rounds and prints the wasm/native ratios.
//!
//! The same jobs as the JavaScript conveniences do them, through the core as a Rust caller
//! would: a template solve and a text-equation solve (the request compiled into a
//! `Problem` and solved, every call), a solve of a Rust closure, a 1000-point sweep (the
//! problem compiled once per sweep), and the cost of one evaluation of the compiled
//! residual (`Problem::sample` over 100 000 points).
//!
//! `cargo run --release --example bench_ratios -- [seconds per workload]` prints one JSON
//! line per workload: `{"name", "perSecond", ...}` (the best of 3 rounds, after a warm-up).

use std::time::{Duration, Instant};

use tacit::problem::spec::{from_json, SolveOptions, SweepSpec};
use tacit::problem::{Problem, ProblemSpec};
use tacit::{MethodKind, Options, Start, Tolerances};

/// The workloads, shared with scripts/bench-ratios.mjs (the same requests).
const TEMPLATE: &str = r#"{"template":"pipes.colebrook","values":{"Re":360000,"eps":{"value":0.15,"unit":"mm"},"D":{"value":300,"unit":"mm"}},"unknown":"f"}"#;
const EQUATION: &str = r#"{"equations":"1/sqrt(f) = -2*log10(eps/(3.7*D) + 2.51/(Re*sqrt(f)))","knowns":{"Re":360000,"eps":0.00015,"D":0.3},"unknowns":[{"name":"f","guesses":[0.008,0.08],"bounds":[0.002,0.2]}]}"#;
/// The sweep's problem: Re is the swept input (its value here is replaced point by point).
const SWEEP_PROBLEM: &str = r#"{"equations":"1/sqrt(f) = -2*log10(eps/(3.7*D) + 2.51/(Re*sqrt(f)))","knowns":{"Re":10000,"eps":0.00015,"D":0.3},"unknowns":[{"name":"f","guesses":[0.008,0.08],"bounds":[0.002,0.2]}]}"#;
const SWEEP: &str = r#"{"input":"Re","from":10000,"to":10000000,"points":1000}"#;
const SAMPLE_POINTS: usize = 100_000;

const ROUNDS: u32 = 3;

/// Best rate over ROUNDS rounds of `budget / ROUNDS`, after a 200 ms warm-up.
fn rate(budget: Duration, mut run: impl FnMut()) -> f64 {
    let warm = Instant::now();
    while warm.elapsed() < Duration::from_millis(200) {
        run();
    }
    let mut best = 0.0f64;
    for _ in 0..ROUNDS {
        let start = Instant::now();
        let mut n = 0u64;
        while start.elapsed() < budget / ROUNDS || n == 0 {
            run();
            n += 1;
        }
        best = best.max(n as f64 / start.elapsed().as_secs_f64());
    }
    best
}

fn colebrook(f: f64) -> f64 {
    1.0 / f.sqrt() + 2.0 * (0.15e-3 / (3.7 * 0.3) + 2.51 / (360000.0 * f.sqrt())).log10()
}

fn main() {
    let seconds: f64 = std::env::args()
        .nth(1)
        .and_then(|s| s.parse().ok())
        .unwrap_or(1.0);
    let budget = Duration::from_secs_f64(seconds);
    let template: ProblemSpec = from_json("request", TEMPLATE).unwrap();
    let equation: ProblemSpec = from_json("request", EQUATION).unwrap();
    let sweep_problem: ProblemSpec = from_json("request", SWEEP_PROBLEM).unwrap();
    let sweep_spec: SweepSpec = from_json("request", SWEEP).unwrap();
    let solve_options = SolveOptions::default();

    let solve = |spec: &ProblemSpec| {
        let p = Problem::compile(std::hint::black_box(spec)).unwrap();
        let r = p.solve(&solve_options).unwrap();
        assert!(r.converged);
        std::hint::black_box(r);
    };
    let per_second = rate(budget, || solve(&template));
    println!("{{\"name\":\"template\",\"perSecond\":{per_second}}}");
    let per_second = rate(budget, || solve(&equation));
    println!("{{\"name\":\"equation\",\"perSecond\":{per_second}}}");

    let options = Options {
        method: MethodKind::Auto,
        tol: Tolerances::default(),
        bounds: tacit::Bounds::UNBOUNDED,
        record_history: false,
    };
    let per_second = rate(budget, || {
        let s = tacit::solve(Start::Guesses(0.008, 0.08), &options, |f| {
            colebrook(std::hint::black_box(f))
        })
        .unwrap();
        std::hint::black_box(s);
    });
    println!("{{\"name\":\"function\",\"perSecond\":{per_second}}}");

    let mut evaluations = 0;
    let per_second = rate(budget, || {
        let p = Problem::compile(std::hint::black_box(&sweep_problem)).unwrap();
        let mut sweep = p.sweep(&sweep_spec).unwrap();
        while !sweep.is_done() {
            sweep.advance(1000).unwrap();
        }
        evaluations = sweep.report().total_evaluations;
        assert!(sweep.report().converged.iter().all(|&c| c));
    });
    println!("{{\"name\":\"sweep\",\"perSecond\":{per_second},\"points\":1000,\"evaluations\":{evaluations}}}");

    let p = Problem::compile(&equation).unwrap();
    let per_second = rate(budget, || {
        std::hint::black_box(p.sample(0.01, 0.05, SAMPLE_POINTS).unwrap());
    });
    println!("{{\"name\":\"sample\",\"perSecond\":{per_second},\"points\":{SAMPLE_POINTS}}}");
}
