//! Proven roots against the sampling scan on the same problems, and Monte Carlo
//! throughput of the uncertainty propagation, side by side in one run.
//!
//! `cargo run --release --example bench_proof`
//!
//! For each problem: the roots the sampling scan (`roots_in_range`, 400 samples)
//! reports, its evaluations and time; the proof's unique roots, undecided regions,
//! interval evaluations (`slopes`: enclosures of f and f′ over a region or a narrowing
//! root enclosure; `points`: enclosures of f at a point), and time; and the time of
//! the proof over the scan's. Then, for two models, Monte Carlo
//! trials per second and evaluations per trial. Then the same through the `Problem`
//! (units converted, template compiled once): the proven scan against the sampling
//! scan, and the Monte Carlo run in chunks of 1000 against one go. Last, the
//! sensitivities of a solved set by forward-mode differentiation against central
//! differences: time, evaluations or dual runs, and their largest relative difference.

use std::hint::black_box;
use std::time::{Duration, Instant};

use tacit::equations::EquationSet;
use tacit::proven_roots::{proven_roots_of_set, ProofOptions, ProvenRoots};
use tacit::roots_in_range::{roots_in_range, RangeRoots, ScanOptions};
use tacit::templates;
use tacit::uncertainty::{
    propagate_in_set, Distribution, Standard, UncertainKnown, UncertaintyOptions,
};
use tacit::Bounds;

struct Problem {
    name: &'static str,
    text: String,
    unknown: &'static str,
    knowns: Vec<(String, f64)>,
    range: (f64, f64),
}

fn problem(
    name: &'static str,
    text: &str,
    unknown: &'static str,
    knowns: &[(&str, f64)],
    range: (f64, f64),
) -> Problem {
    Problem {
        name,
        text: text.to_string(),
        unknown,
        knowns: knowns.iter().map(|&(n, v)| (n.to_string(), v)).collect(),
        range,
    }
}

fn template(id: &str) -> String {
    templates::find(id)
        .expect("bundled template")
        .equations
        .clone()
}

fn problems() -> Vec<Problem> {
    let wilkinson: Vec<String> = (1..=10).map(|k| format!("(x - {k})")).collect();
    vec![
        problem(
            "Colebrook, f",
            &template("pipes.colebrook"),
            "f",
            &[("Re", 1e5), ("eps", 1e-4), ("D", 1.0)],
            (0.005, 0.1),
        ),
        problem(
            "wave dispersion, L",
            &template("coastal.wave-dispersion"),
            "L",
            &[("T", 10.0), ("h", 10.0)],
            (1.0, 1000.0),
        ),
        problem(
            "area-Mach, both branches",
            &template("gas.area-mach"),
            "M",
            &[("AR", 1.6875), ("g", 1.4)],
            (0.05, 5.0),
        ),
        problem(
            "Peng-Robinson, V (3 roots, pole)",
            &template("thermo.peng-robinson"),
            "V",
            &[
                ("T", 350.0),
                ("P", 9.4573e5),
                ("Tc", 425.1),
                ("Pc", 37.96e5),
                ("w", 0.2),
            ],
            (5e-5, 1e-2),
        ),
        problem(
            "Wilkinson product, degree 10",
            &wilkinson.join("*"),
            "x",
            &[],
            (0.5, 10.5),
        ),
        problem("tan x (4 roots, 3 poles)", "tan(x)", "x", &[], (-1.0, 10.0)),
        problem(
            "narrow dip (2 roots, 1 spacing)",
            "1 - 2*exp(-((x - 1.0013)/1e-3)^2)",
            "x",
            &[],
            (0.0, 2.0),
        ),
    ]
}

/// Best time of `f` over short rounds (the machine may be shared).
fn best_time<T>(mut f: impl FnMut() -> T) -> (T, Duration) {
    let mut best = Duration::MAX;
    let mut out = f();
    for _ in 0..15 {
        let start = Instant::now();
        let mut n = 0u32;
        while start.elapsed() < Duration::from_millis(4) || n == 0 {
            out = black_box(f());
            n += 1;
        }
        best = best.min(start.elapsed() / n);
    }
    (out, best)
}

fn main() {
    println!(
        "{:<34} | {:>5} {:>6} {:>9} | {:>6} {:>9} {:>8} {:>8} {:>9} | {:>6}",
        "problem",
        "scan",
        "evals",
        "time",
        "proven",
        "undecided",
        "slopes",
        "points",
        "time",
        "×scan"
    );
    for p in problems() {
        let set = EquationSet::parse(&p.text).expect("benchmark text parses");
        let (lo, hi) = p.range;
        let (scan, t_scan): (RangeRoots, Duration) = best_time(|| {
            let mut f = set.residual_fn(&p.knowns, p.unknown).expect("residual");
            roots_in_range(lo, hi, &ScanOptions::default(), &mut f).expect("scan")
        });
        let (proof, t_proof): (ProvenRoots, Duration) = best_time(|| {
            proven_roots_of_set(&set, &p.knowns, p.unknown, lo, hi, &ProofOptions::default())
                .expect("proof")
        });
        println!(
            "{:<34} | {:>5} {:>6} {:>7.1}µs | {:>6} {:>9} {:>8} {:>8} {:>7.1}µs | {:>6.1}",
            p.name,
            scan.roots.len(),
            scan.evaluations,
            t_scan.as_secs_f64() * 1e6,
            proof.roots().count(),
            proof.undecided().count(),
            proof.regions_examined + proof.narrowing_slopes,
            proof.point_enclosures,
            t_proof.as_secs_f64() * 1e6,
            t_proof.as_secs_f64() / t_scan.as_secs_f64()
        );
    }

    println!(
        "\n{:<44} {:>8} {:>12} {:>12} {:>10}",
        "Monte Carlo (100 000 trials)", "failed", "trials/s", "evals/trial", "u_c"
    );
    let gaussian = |name: &str, standard| UncertainKnown {
        name: name.into(),
        standard,
        distribution: Distribution::Gaussian,
    };
    let cases = [
        (
            "Colebrook f: eps ±30 %, Re ±2 %",
            template("pipes.colebrook"),
            "f",
            vec![("Re", 1e5), ("eps", 1e-4), ("D", 1.0)],
            vec![
                gaussian("eps", Standard::Relative(0.3)),
                gaussian("Re", Standard::Relative(0.02)),
            ],
            0.0185,
        ),
        (
            "wave dispersion L: T ±0.2 s, h ±0.3 m",
            template("coastal.wave-dispersion"),
            "L",
            vec![("T", 10.0), ("h", 10.0)],
            vec![
                gaussian("T", Standard::Absolute(0.2)),
                gaussian("h", Standard::Absolute(0.3)),
            ],
            92.0,
        ),
    ];
    for (name, text, unknown, knowns, uncertain, x0) in cases {
        let set = EquationSet::parse(&text).expect("parses");
        let knowns: Vec<(String, f64)> = knowns.iter().map(|&(n, v)| (n.to_string(), v)).collect();
        let options = UncertaintyOptions {
            trials: 100_000,
            ..Default::default()
        };
        let bounds = Bounds {
            lo: 0.0,
            hi: f64::INFINITY,
        };
        let start = Instant::now();
        let r = propagate_in_set(&set, &knowns, unknown, &uncertain, x0, bounds, &options)
            .expect("propagation");
        let t = start.elapsed().as_secs_f64();
        let mc = r.monte_carlo.expect("trials were asked for");
        println!(
            "{:<44} {:>8} {:>12.3e} {:>12.2} {:>10.3e}",
            name,
            mc.failed,
            mc.trials as f64 / t,
            mc.evaluations as f64 / mc.trials as f64,
            r.linear.standard
        );
        if let Some(v) = r.validation {
            println!("    {}", v.message);
        }
    }

    problem_level();
    sensitivities();
}

fn problem_level() {
    use tacit::problem::spec::from_json;
    use tacit::problem::{Problem, ProblemSpec, RootsOptions, SolveOptions};
    let compile = |json: &str| {
        let spec: ProblemSpec = from_json("spec", json).expect("spec");
        Problem::compile(&spec).expect("compiles")
    };
    println!(
        "\n{:<44} {:>6} {:>9} {:>7} {:>10} {:>7} {:>9} {:>6}",
        "through the Problem", "scan", "time", "proven", "undecided", "evals", "time", "×scan"
    );
    let cases = [
        (
            "Peng-Robinson V in cm³/mol, 50..10000",
            r#"{"template": "thermo.peng-robinson", "unknown": "V", "resultUnit": "cm^3/mol",
                "values": {"T": 350, "P": [9.4573, "bar"], "Tc": 425.1, "Pc": [37.96, "bar"], "w": 0.2}}"#,
            (50.0, 10000.0),
        ),
        (
            "Colebrook f, D in inches",
            r#"{"template": "pipes.colebrook", "unknown": "f",
                "values": {"Re": 1e5, "eps": [0.0254, "mm"], "D": [10, "in"]}}"#,
            (0.005, 0.1),
        ),
        (
            "narrow dip, own equation",
            r#"{"equations": "1 - 2*exp(-((x - c)/w)^2) = 0", "knowns": {"c": 1.0013, "w": 1e-3}, "unknown": "x"}"#,
            (0.0, 2.0),
        ),
    ];
    let proven = RootsOptions {
        proven: true,
        ..RootsOptions::default()
    };
    for (name, json, (lo, hi)) in cases {
        let p = compile(json);
        let (scan, t_scan) = best_time(|| p.roots(lo, hi, &RootsOptions::default()).expect("scan"));
        let (proof, t_proof) = best_time(|| p.roots(lo, hi, &proven).expect("proof"));
        let undecided = proof
            .regions
            .iter()
            .filter(|g| g.kind == "undecided")
            .count();
        println!(
            "{:<44} {:>6} {:>7.1}µs {:>7} {:>10} {:>7} {:>7.1}µs {:>6.1}",
            name,
            scan.roots.len(),
            t_scan.as_secs_f64() * 1e6,
            proof.roots.len(),
            undecided,
            proof.evaluations,
            t_proof.as_secs_f64() * 1e6,
            t_proof.as_secs_f64() / t_scan.as_secs_f64()
        );
    }
    println!(
        "\n{:<44} {:>12} {:>12} {:>12} {:>8}",
        "Monte Carlo through the Problem (100 000)",
        "one go /s",
        "chunks /s",
        "evals/trial",
        "chunks×"
    );
    let p = compile(
        r#"{"template": "pipes.colebrook", "unknown": "f",
            "values": {"Re": 1e5, "eps": [0.0254, "mm"], "D": [10, "in"]},
            "uncertainties": {"Re": {"percent": 2}, "eps": {"percent": 30}}}"#,
    );
    let opts: SolveOptions =
        from_json("options", r#"{"uncertainty": {"trials": 100000}}"#).expect("options");
    let start = Instant::now();
    let mut whole = p.uncertainty(&opts).expect("run");
    whole.advance(whole.trials());
    let t_whole = start.elapsed().as_secs_f64();
    let start = Instant::now();
    let mut chunked = p.uncertainty(&opts).expect("run");
    while !chunked.is_done() {
        chunked.advance(1000);
    }
    let t_chunked = start.elapsed().as_secs_f64();
    let r = chunked.report();
    assert_eq!(r, whole.report(), "the same trials either way");
    let mc = r.monte_carlo.expect("done");
    println!(
        "{:<44} {:>12.3e} {:>12.3e} {:>12.2} {:>8.2}",
        "Colebrook f: eps ±30 %, Re ±2 %",
        mc.trials as f64 / t_whole,
        mc.trials as f64 / t_chunked,
        mc.evaluations as f64 / mc.trials as f64,
        t_chunked / t_whole
    );
}

fn sensitivities() {
    use tacit::equations::sensitivity::{sensitivities_at, Method};
    use tacit::equations::{solve_set, UnknownSpec};
    println!(
        "\n{:<44} {:>10} {:>6} {:>10} {:>6} {:>7} {:>10}",
        "sensitivities of a solved set", "forward", "runs", "diff.", "evals", "×fwd", "max |rel|"
    );
    let pipe = "V := Q/(pi*D^2/4)\nRe := V*D/nu\nhf = f*(L/D)*V^2/(2*g)\n1/sqrt(f) = -2*log10(eps/(3.7*D) + 2.51/(Re*sqrt(f)))";
    type Case<'a> = (&'a str, String, Vec<(&'a str, f64)>, Vec<UnknownSpec>);
    let cases: [Case; 2] = [
        (
            "Colebrook f (1 unknown, 3 knowns)",
            template("pipes.colebrook"),
            vec![("Re", 1e5), ("eps", 1e-4), ("D", 1.0)],
            vec![UnknownSpec::named("f").with_bounds(1e-4, 1.0)],
        ),
        (
            "pipe Q and f (2 unknowns, 6 knowns)",
            pipe.to_string(),
            vec![
                ("D", 0.5),
                ("L", 200.0),
                ("eps", 0.0004),
                ("nu", 1.1e-5),
                ("hf", 4.5),
                ("g", 32.2),
            ],
            vec![
                UnknownSpec::named("Q").with_guesses(1.0, 1.2),
                UnknownSpec::named("f").with_guesses(0.02, 0.021),
            ],
        ),
    ];
    for (name, text, knowns, specs) in cases {
        let set = EquationSet::parse(&text).expect("parses");
        let knowns: Vec<(String, f64)> = knowns.iter().map(|&(n, v)| (n.to_string(), v)).collect();
        let s = solve_set(&set, &knowns, &specs, &Default::default(), false).expect("solves");
        let ((exact, fwd), t_fwd) = best_time(|| {
            sensitivities_at(&set, &knowns, &s.unknowns, Method::ForwardMode).expect("fwd")
        });
        let ((diff, cd), t_diff) = best_time(|| {
            sensitivities_at(&set, &knowns, &s.unknowns, Method::CentralDifferences).expect("diff")
        });
        let worst = exact
            .iter()
            .zip(&diff)
            .map(|(a, b)| ((a.derivative - b.derivative) / a.derivative).abs())
            .fold(0.0f64, f64::max);
        println!(
            "{:<44} {:>8.2}µs {:>6} {:>8.2}µs {:>6} {:>7.2} {:>10.1e}",
            name,
            t_fwd.as_secs_f64() * 1e6,
            fwd.runs,
            t_diff.as_secs_f64() * 1e6,
            cd.evaluations,
            t_diff.as_secs_f64() / t_fwd.as_secs_f64(),
            worst
        );
    }
}
