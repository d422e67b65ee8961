//! Native solves per second through the JSON facade, the counterpart of the wasm figure
//! printed by `scripts/bench-wasm.mjs` (which runs this example and prints both).
//!
//! `cargo run --release --example bench_native_solve -- [seconds]` prints one JSON line
//! per workload: `{"name", "solves", "seconds", "solvesPerSecond"}`.

use std::time::{Duration, Instant};

use tacit::api::json as api;

/// The workloads, shared with scripts/bench-wasm.mjs (same JSON requests).
const TEMPLATE: &str = r#"{"id":"pipes.colebrook","values":{"Re":360000,"eps":{"value":0.15,"unit":"mm"},"D":{"value":300,"unit":"mm"}},"unknown":"f"}"#;
const EQUATION: &str = r#"{"equations":"1/sqrt(f) = -2*log10(eps/(3.7*D) + 2.51/(Re*sqrt(f)))","knowns":{"Re":360000,"eps":0.00015,"D":0.3},"unknowns":[{"name":"f","guesses":[0.008,0.08],"bounds":[0.002,0.2]}]}"#;
const OPTIONS: &str = r#"{"guesses":[0.008,0.08]}"#;

/// Timed rounds per workload; the best is printed (as in scripts/bench-wasm.mjs), so
/// that other work on a shared machine lowers the figure less.
const ROUNDS: u32 = 3;

fn rate(name: &str, budget: Duration, mut run: impl FnMut()) {
    let warm = Instant::now();
    while warm.elapsed() < Duration::from_millis(300) {
        run();
    }
    let mut best = 0.0f64;
    let mut total = 0u64;
    for _ in 0..ROUNDS {
        let start = Instant::now();
        let mut n = 0u64;
        while start.elapsed() < budget / ROUNDS {
            for _ in 0..50 {
                run();
            }
            n += 50;
        }
        total += n;
        best = best.max(n as f64 / start.elapsed().as_secs_f64());
    }
    println!(
        "{{\"name\":\"{name}\",\"solves\":{total},\"seconds\":{},\"solvesPerSecond\":{best}}}",
        budget.as_secs_f64()
    );
}

fn main() {
    let seconds: f64 = std::env::args()
        .nth(1)
        .and_then(|s| s.parse().ok())
        .unwrap_or(1.0);
    let budget = Duration::from_secs_f64(seconds);
    rate("template", budget, || {
        std::hint::black_box(api::solve_template(std::hint::black_box(TEMPLATE)).unwrap());
    });
    rate("equation", budget, || {
        std::hint::black_box(api::solve_equation(std::hint::black_box(EQUATION)).unwrap());
    });
    rate("function", budget, || {
        let out = api::solve_function(std::hint::black_box(OPTIONS), |f: f64| {
            1.0 / f.sqrt() + 2.0 * (0.15e-3 / (3.7 * 0.3) + 2.51 / (360000.0 * f.sqrt())).log10()
        });
        std::hint::black_box(out.unwrap());
    });
}
