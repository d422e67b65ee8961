//! Evaluation counts of the bracketing methods on the published test sets.
//!
//! Run with `cargo run --release --example bench_methods`. Figures, not timings: every
//! count is the exact number of calls of f. The last line is
//! `aps154 total evaluations: N` for the default bracketing method (`MethodKind::Hybrid`).

#[path = "../tests/fixtures/aps748.rs"]
mod aps748;
#[path = "../tests/fixtures/candidates.rs"]
mod candidates;
#[path = "../tests/fixtures/chandrupatla.rs"]
mod chandrupatla;

use std::cell::Cell;

use candidates::{drive, Brent, Chandrupatla, Toms748};
use tacit::driver::ScalarMethod;
use tacit::methods::bisection::Bisection;
use tacit::methods::hybrid::Hybrid;
use tacit::methods::illinois::Illinois;
use tacit::{solve, MethodKind, Options, Start, Tolerances};

/// Table II of the APS paper, tolerance 0: totals and per-formula figures.
const PUBLISHED_TOMS748_TOTAL: usize = 2884;
const PUBLISHED_BRENT_TOTAL: usize = 3008;
const PUBLISHED_TOMS748_PER_FORMULA: f64 = 225.4;
const PUBLISHED_BRENT_PER_FORMULA: f64 = 216.0;

type Build = fn(f64, f64) -> Box<dyn ScalarMethod>;

const CANDIDATES: [(&str, Build); 7] = [
    ("hybrid (default)", |a, b| Box::new(Hybrid::new(a, b))),
    ("TOMS 748", |a, b| Box::new(Toms748::new(a, b).published())),
    ("TOMS 748 + split/zero", |a, b| Box::new(Toms748::new(a, b))),
    ("Brent-Dekker", |a, b| Box::new(Brent::new(a, b))),
    ("Chandrupatla", |a, b| Box::new(Chandrupatla::new(a, b))),
    ("Illinois", |a, b| Box::new(Illinois::new(a, b))),
    ("bisection", |a, b| Box::new(Bisection::new(a, b))),
];

struct Figures {
    total: usize,
    per_formula: f64,
    unconverged: usize,
    /// Evaluations and cases per formula (index 1–15).
    evals: [usize; 16],
    cases: [usize; 16],
}

fn aps_figures(build: Build, tol: Tolerances) -> Figures {
    let mut evals = [0usize; 16];
    let mut cases = [0usize; 16];
    let mut unconverged = 0;
    for c in aps748::APS_CASES.iter() {
        let mut m = build(c.a, c.b);
        let run = drive(m.as_mut(), tol, |x| c.f(x));
        if !run.status.is_converged() {
            unconverged += 1;
        }
        evals[c.formula as usize] += run.xs.len();
        cases[c.formula as usize] += 1;
    }
    Figures {
        total: evals.iter().sum(),
        per_formula: (1..=15).map(|j| evals[j] as f64 / cases[j] as f64).sum(),
        unconverged,
        evals,
        cases,
    }
}

fn chandrupatla_total(build: Build, tol: Tolerances) -> (usize, usize) {
    let mut total = 0;
    let mut unconverged = 0;
    for c in chandrupatla::CHANDRUPATLA_CASES.iter() {
        let mut m = build(c.a, c.b);
        let run = drive(m.as_mut(), tol, |x| c.f(x));
        if !run.status.is_converged() {
            unconverged += 1;
        }
        total += run.xs.len();
    }
    (total, unconverged)
}

/// The default method through the public driver, counted by a wrapper around f.
fn aps_total_through_driver(tol: Tolerances) -> usize {
    let options = Options {
        method: MethodKind::Hybrid,
        tol,
        ..Options::default()
    };
    let mut total = 0;
    for c in aps748::APS_CASES.iter() {
        let calls = Cell::new(0usize);
        let s = solve(Start::Bracket(c.a, c.b), &options, |x| {
            calls.set(calls.get() + 1);
            c.f(x)
        })
        .expect("valid case");
        assert_eq!(s.evaluations, calls.get());
        assert!(s.converged, "{:?}", s.status);
        total += calls.get();
    }
    total
}

/// Hook for the open-start comparison (no-bracket default against plain secant over
/// about 30 two-guess starts); filled in `examples/bench_open.rs` by the open methods.
fn open_starts_comparison() {
    println!("open starts: see `cargo run --release --example bench_open`");
}

fn main() {
    let tol = Tolerances {
        x_abs: 0.0,
        x_rel: 4.0 * f64::EPSILON,
        f_abs: 0.0,
        max_evals: 10_000,
    };
    println!(
        "Alefeld-Potra-Shi test set (ACM TOMS 21(3) 1995, Algorithm 748): 15 formulas, 154 cases"
    );
    println!(
        "tolerance: x_rel = 4*eps, x_abs = 0, f_abs = 0 (stop when b - a <= 8 eps |x|, no float \
         lies between the ends, or f = 0)"
    );
    println!(
        "published figures (paper's Table II) are at tolerance 0, i.e. the paper's own floor \
         of about 2*eps*|x|; ours stop at a bracket of 8*eps*|x|, slightly earlier"
    );
    println!(
        "left end of problems 14 and 15: {} (SciPy's table has -1000)",
        aps748::LEFT_14_15
    );
    println!(
        "per formula = sum over the 15 formulas of (evaluations / cases of that formula), i.e. \
         15 x the mean over formulas: our reading of the paper's per-formula figure (see the \
         Brent-Dekker row against the published Brent row)"
    );
    println!(
        "x_abs = 0: the roots at zero (problems 3 and 13) end by an exact zero at x = 0, so no \
         absolute floor is needed"
    );
    println!();
    println!(
        "{:<24} {:>7} {:>12} {:>12}",
        "method", "total", "per formula", "unconverged"
    );
    let figures: Vec<Figures> = CANDIDATES
        .iter()
        .map(|&(_, build)| aps_figures(build, tol))
        .collect();
    let default_total = figures[0].total;
    for ((name, _), f) in CANDIDATES.iter().zip(&figures) {
        println!(
            "{:<24} {:>7} {:>12.1} {:>12}",
            name, f.total, f.per_formula, f.unconverged
        );
    }
    println!(
        "{:<24} {:>7} {:>12.1} {:>12}",
        "published TOMS 748", PUBLISHED_TOMS748_TOTAL, PUBLISHED_TOMS748_PER_FORMULA, "-"
    );
    println!(
        "{:<24} {:>7} {:>12.1} {:>12}",
        "published Brent", PUBLISHED_BRENT_TOTAL, PUBLISHED_BRENT_PER_FORMULA, "-"
    );
    let h = &figures[0];
    println!(
        "hybrid against the published figures: total {} vs {} (TOMS 748) and {} (Brent); \
         per formula {:.1} vs {:.1} and {:.1}",
        h.total,
        PUBLISHED_TOMS748_TOTAL,
        PUBLISHED_BRENT_TOTAL,
        h.per_formula,
        PUBLISHED_TOMS748_PER_FORMULA,
        PUBLISHED_BRENT_PER_FORMULA
    );
    println!();
    println!("per formula, evaluations / cases = mean:");
    print!("{:<8}", "formula");
    for (name, _) in CANDIDATES.iter().take(5) {
        print!(" {:>22}", name);
    }
    println!();
    for j in 1..=15 {
        print!("{:<8}", j);
        for f in figures.iter().take(5) {
            let cell = format!(
                "{}/{} = {:.1}",
                f.evals[j],
                f.cases[j],
                f.evals[j] as f64 / f.cases[j] as f64
            );
            print!(" {:>22}", cell);
        }
        println!();
    }
    println!();

    let paper = Tolerances {
        x_abs: chandrupatla::PAPER_X_ABS,
        x_rel: chandrupatla::PAPER_X_REL,
        f_abs: 0.0,
        max_evals: 10_000,
    };
    println!(
        "Chandrupatla test set (Adv. Eng. Software 28 (1997) 145-149): 45 cases, published total {}",
        chandrupatla::PUBLISHED_TOTAL
    );
    println!(
        "{:<24} {:>18} {:>12} {:>18}",
        "method", "paper's tolerance", "unconverged", "x_rel = 4 eps"
    );
    for (name, build) in CANDIDATES {
        let (t_paper, u_paper) = chandrupatla_total(build, paper);
        let (t_eps, _) = chandrupatla_total(build, tol);
        println!("{:<24} {:>18} {:>12} {:>18}", name, t_paper, u_paper, t_eps);
    }
    println!(
        "(paper's tolerance: |b - a| < 4e-10 |x| + 1e-5, as SciPy restates it; the \
         Chandrupatla row reproducing {} checks that transcription)",
        chandrupatla::PUBLISHED_TOTAL
    );
    println!();
    open_starts_comparison();
    println!();
    let through_driver = aps_total_through_driver(tol);
    assert_eq!(through_driver, default_total);
    println!("aps154 total evaluations: {through_driver}");
}
