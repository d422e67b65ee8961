//! The per-point cost of a sweep against the cost of its evaluations, side by side in
//! one run (these machines are shared and noisy: read the ratios, not the times).
//!
//! `cargo run --release --example bench_sweep`
//!
//! For each case: a 1000-point sweep through `Problem::sweep` (the problem compiled
//! once, the sweep advanced in chunks of 100), its time per point and evaluations per
//! point; the time of one evaluation of the same residual (`Problem::sample` over
//! 100 000 points of the unknown's range); and the ratio of the time per point to the
//! evaluations' own time (evaluations per point × time per evaluation). The goal is a
//! ratio of at most 3: the overhead of a point at most twice its evaluations' cost.

use std::hint::black_box;
use std::time::{Duration, Instant};

use tacit::problem::spec::from_json;
use tacit::problem::{Problem, ProblemSpec, SweepSpec};

struct Case {
    name: &'static str,
    spec: &'static str,
    sweep: &'static str,
    /// The unknown's range for the evaluation timing, in its unit.
    range: (f64, f64),
}

const CASES: &[Case] = &[
    Case {
        name: "template pipes.colebrook, f over Re",
        spec: r#"{"template":"pipes.colebrook","unknown":"f","values":{"Re":360000,"eps":[0.15,"mm"],"D":[300,"mm"]}}"#,
        sweep: r#"{"input":"Re","from":10000,"to":10000000,"points":1000,"spacing":"log"}"#,
        range: (0.002, 0.2),
    },
    Case {
        name: "template pipes.colebrook, f over D [mm]",
        spec: r#"{"template":"pipes.colebrook","unknown":"f","values":{"Re":360000,"eps":[0.15,"mm"],"D":[300,"mm"]}}"#,
        sweep: r#"{"input":"D","from":20,"to":2000,"points":1000}"#,
        range: (0.002, 0.2),
    },
    Case {
        name: "text equation (Colebrook), f over Re",
        spec: r#"{"equations":"1/sqrt(f) = -2*log10(eps/(3.7*D) + 2.51/(Re*sqrt(f)))","knowns":{"Re":10000,"eps":0.00015,"D":0.3},"unknowns":[{"name":"f","guesses":[0.008,0.08],"bounds":[0.002,0.2]}]}"#,
        sweep: r#"{"input":"Re","from":10000,"to":10000000,"points":1000,"spacing":"log"}"#,
        range: (0.002, 0.2),
    },
    Case {
        name: "text equation with units, v over h [cm]",
        spec: r#"{"equations":"h = L*f*v^2/(2*g*D)","knowns":{"h":300,"L":100,"f":0.02,"g":9.81,"D":0.1},"unknown":"v","units":{"v":"m/s","h":"cm","L":"m","g":"m/s^2","D":"m"}}"#,
        sweep: r#"{"input":"h","from":10,"to":1000,"points":1000}"#,
        range: (0.1, 10.0),
    },
];

const ROUNDS: usize = 5;
const SAMPLE_POINTS: usize = 100_000;

/// The best time of `ROUNDS` runs of `run`, after one warm-up run.
fn best(mut run: impl FnMut()) -> Duration {
    run();
    (0..ROUNDS)
        .map(|_| {
            let t = Instant::now();
            run();
            t.elapsed()
        })
        .min()
        .unwrap_or_default()
}

fn main() {
    println!(
        "{:<42} {:>11} {:>10} {:>10} {:>10} {:>9}",
        "sweep of 1000 points", "µs/point", "evals/pt", "ns/eval", "evals µs", "ratio"
    );
    for case in CASES {
        let spec: ProblemSpec = from_json("spec", case.spec).expect("a valid spec");
        let problem = Problem::compile(&spec).expect("compiles");
        let sweep: SweepSpec = from_json("sweep", case.sweep).expect("a valid sweep");
        let mut evaluations = 0;
        let mut points = 0;
        let sweep_time = best(|| {
            let mut s = problem.sweep(&sweep).expect("a sweep");
            while !s.is_done() {
                s.advance(100).expect("a chunk");
            }
            let r = s.report();
            evaluations = r.total_evaluations;
            points = r.points;
            black_box(r);
        });
        let eval_time = best(|| {
            black_box(
                problem
                    .sample(case.range.0, case.range.1, SAMPLE_POINTS)
                    .expect("a sample"),
            );
        });
        let per_point = sweep_time.as_secs_f64() / points as f64;
        let per_eval = eval_time.as_secs_f64() / SAMPLE_POINTS as f64;
        let evals = evaluations as f64 / points as f64;
        let own = evals * per_eval;
        println!(
            "{:<42} {:>11.2} {:>10.2} {:>10.1} {:>10.3} {:>9.1}",
            case.name,
            per_point * 1e6,
            evals,
            per_eval * 1e9,
            own * 1e6,
            per_point / own
        );
    }
    println!(
        "ratio: time per point / (evaluations per point × time per evaluation); goal ≤ 3 \
         (overhead ≤ 2× the evaluations' own cost). The evaluation time is Problem::sample's \
         per point, which includes its unit conversion and the storing of x and f."
    );
}
