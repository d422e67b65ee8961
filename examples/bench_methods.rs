//! Evaluation counts of the bracketing methods on the published test sets.
//!
//! Run with `cargo run --release --example bench_methods`. Figures, not timings: every
//! count is the exact number of calls of f. The last line is
//! `aps154 total evaluations: N` for the default bracketing method (`MethodKind::Hybrid`).

#[path = "../tests/fixtures/aps748.rs"]
mod aps748;
#[path = "../tests/fixtures/aps748_bands.rs"]
mod aps748_bands;
#[path = "../tests/fixtures/candidates.rs"]
mod candidates;
#[path = "../tests/fixtures/chandrupatla.rs"]
mod chandrupatla;
#[path = "../tests/fixtures/engineering.rs"]
mod engineering;
#[path = "../tests/fixtures/interpolation_traps.rs"]
mod interpolation_traps;

use std::cell::Cell;
use std::collections::HashMap;
use std::io::Write;
use std::process::{Command, Stdio};

use candidates::{drive, Brent, Chandrupatla, PreviousHybrid, Toms748};
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

const CANDIDATES: [(&str, Build); 8] = [
    ("hybrid (default)", |a, b| Box::new(Hybrid::new(a, b))),
    ("hybrid before bound", |a, b| {
        Box::new(PreviousHybrid::new(a, b))
    }),
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

/// One case of the side-by-side comparison: a formula the Python script also knows
/// (`family` and three parameters), its bracket and reference root.
struct Case {
    set: &'static str,
    family: &'static str,
    p: [f64; 3],
    a: f64,
    b: f64,
    root: f64,
    /// Distance from the root within which f in double precision may have the wrong sign.
    band: f64,
    f: Box<dyn Fn(f64) -> f64>,
}

const SETS: [&str; 3] = ["engineering", "APS, left -1e4", "APS, left -1000"];

fn comparison_cases() -> Vec<Case> {
    let mut cases = Vec::new();
    for c in engineering::ENGINEERING_CASES.iter() {
        cases.push(Case {
            set: SETS[0],
            family: c.family.code(),
            p: c.p,
            a: c.a,
            b: c.b,
            root: c.root,
            band: c.band,
            f: Box::new(move |x| c.f(x)),
        });
    }
    for (set, left) in [(SETS[1], -1e4), (SETS[2], -1000.0)] {
        for (c, &band) in aps748::APS_CASES.iter().zip(&aps748_bands::APS_BANDS) {
            let mut c = *c;
            if c.a == aps748::LEFT_14_15 {
                c.a = left;
            }
            cases.push(Case {
                set,
                family: "aps",
                p: [c.formula as f64, c.p, c.q],
                a: c.a,
                b: c.b,
                root: c.root,
                band,
                f: Box::new(move |x| c.f(x)),
            });
        }
    }
    cases
}

/// The benchmark's stopping rule for every method: the final bracket no wider than
/// 4 eps |x| + 4 tiny (our stop is `b - a <= 2 (x_abs + x_rel |x|)`), no stop on |f|
/// other than an exact zero.
fn same_rule() -> Tolerances {
    Tolerances {
        x_abs: 2.0 * f64::MIN_POSITIVE,
        x_rel: 2.0 * f64::EPSILON,
        f_abs: 0.0,
        max_evals: 10_000,
    }
}

/// Whether a root is right: within the final bracket's allowed width of the reference,
/// plus the case's rounding band and two units in the last place of the reference.
fn root_is_right(case: &Case, x: f64) -> bool {
    let allowed = 6.0 * f64::EPSILON * case.root.abs() + 4.0 * f64::MIN_POSITIVE + case.band;
    (x - case.root).abs() <= allowed
}

/// A count with its verdict: converged (certified, for our methods) and the root right.
#[derive(Debug, Clone, Copy)]
struct Counted {
    evals: usize,
    root: f64,
    ok: bool,
}

/// Our methods through the public driver (every convergence certified), counted by a
/// wrapper around f.
fn ours(method: MethodKind, case: &Case) -> Counted {
    let options = Options {
        method,
        tol: same_rule(),
        ..Options::default()
    };
    let calls = Cell::new(0usize);
    let s = solve(Start::Bracket(case.a, case.b), &options, |x| {
        calls.set(calls.get() + 1);
        (case.f)(x)
    })
    .expect("valid case");
    assert_eq!(s.evaluations, calls.get());
    Counted {
        evals: calls.get(),
        root: s.root,
        ok: s.converged && root_is_right(case, s.root),
    }
}

/// A comparison method through the candidates' plain loop (no certificate).
fn candidate(build: Build, case: &Case) -> Counted {
    let mut m = build(case.a, case.b);
    let run = drive(m.as_mut(), same_rule(), |x| (case.f)(x));
    Counted {
        evals: run.xs.len(),
        root: run.root,
        ok: run.status.is_converged() && root_is_right(case, run.root),
    }
}

/// The Python interpreter to ask: `TACIT_PYTHON` or `python3`.
fn python() -> String {
    std::env::var("TACIT_PYTHON").unwrap_or_else(|_| "python3".to_string())
}

/// SciPy's counts by (set, index, method), and the versions line; `Err` says why the
/// comparison is skipped.
type ScipyCounts = HashMap<(String, usize, String), Counted>;

fn scipy_counts(cases: &[Case]) -> Result<(ScipyCounts, String), String> {
    let py = python();
    let probe = Command::new(&py)
        .args(["-c", "import scipy.optimize.elementwise, numpy"])
        .stderr(Stdio::null())
        .status()
        .map_err(|e| format!("no Python ({py}: {e})"))?;
    if !probe.success() {
        return Err(format!(
            "{py} has no SciPy with `optimize.elementwise` (1.15 or later)"
        ));
    }
    let dir = concat!(env!("CARGO_MANIFEST_DIR"), "/tests/reference");
    let mut child = Command::new(&py)
        .arg("bench_scipy.py")
        .current_dir(dir)
        .stdin(Stdio::piped())
        .stdout(Stdio::piped())
        .spawn()
        .map_err(|e| format!("could not run bench_scipy.py: {e}"))?;
    let mut input = String::new();
    for (i, c) in cases.iter().enumerate() {
        input.push_str(&format!(
            "{}\t{}\t{}\t{:?}\t{:?}\t{:?}\t{:?}\t{:?}\n",
            c.set, i, c.family, c.p[0], c.p[1], c.p[2], c.a, c.b
        ));
    }
    child
        .stdin
        .take()
        .ok_or("no stdin")?
        .write_all(input.as_bytes())
        .map_err(|e| e.to_string())?;
    let out = child.wait_with_output().map_err(|e| e.to_string())?;
    if !out.status.success() {
        return Err("bench_scipy.py failed".to_string());
    }
    let text = String::from_utf8_lossy(&out.stdout);
    let mut counts = HashMap::new();
    let mut versions = String::new();
    for line in text.lines() {
        if let Some(v) = line.strip_prefix("# versions: ") {
            versions = v.to_string();
            continue;
        }
        let cols: Vec<&str> = line.split('\t').collect();
        if cols.len() != 6 {
            return Err(format!("unexpected line from bench_scipy.py: {line}"));
        }
        let i: usize = cols[1].parse().map_err(|_| format!("bad index: {line}"))?;
        let evals: usize = cols[3].parse().map_err(|_| format!("bad count: {line}"))?;
        let x: f64 = cols[4].parse().unwrap_or(f64::NAN);
        let ok = cols[5] == "1" && root_is_right(&cases[i], x);
        counts.insert(
            (cols[0].to_string(), i, cols[2].to_string()),
            Counted { evals, root: x, ok },
        );
    }
    if counts.len() != 3 * cases.len() {
        return Err(format!(
            "bench_scipy.py answered {} of {} runs",
            counts.len(),
            3 * cases.len()
        ));
    }
    Ok((counts, versions))
}

const OURS: [(&str, MethodKind); 3] = [
    ("hybrid", MethodKind::Hybrid),
    ("bisection", MethodKind::Bisection),
    ("Illinois", MethodKind::Illinois),
];
const THEIRS: [(&str, Build); 2] = [
    ("prev. hybrid", |a, b| Box::new(PreviousHybrid::new(a, b))),
    ("Chandrupatla*", |a, b| Box::new(Chandrupatla::new(a, b))),
];
const SCIPY: [&str; 3] = ["find_root", "brentq", "toms748"];

/// Totals of one column over one set: evaluations and the runs not converged or wrong.
#[derive(Default, Clone, Copy)]
struct Total {
    evals: usize,
    bad: usize,
}

fn side_by_side() {
    let cases = comparison_cases();
    println!(
        "Side by side, one stopping rule for every method: final bracket no wider than \
         4 eps |x| + 4 tiny, no stop on |f| but an exact zero; exact counts through a \
         counting wrapper; every root checked against the reference (within the allowed \
         width, the case's rounding band and 2 ulp). Ours through the public driver (each \
         convergence certified); * = transcription in tests/fixtures/candidates.rs."
    );
    let scipy = scipy_counts(&cases);
    let mut names: Vec<&str> = OURS.iter().map(|m| m.0).collect();
    names.extend(THEIRS.iter().map(|m| m.0));
    if scipy.is_ok() {
        names.extend(SCIPY);
    }
    // rows[i][column]
    let rows: Vec<Vec<Counted>> = cases
        .iter()
        .enumerate()
        .map(|(i, c)| {
            let mut row: Vec<Counted> = OURS.iter().map(|&(_, m)| ours(m, c)).collect();
            row.extend(THEIRS.iter().map(|&(_, b)| candidate(b, c)));
            if let Ok((counts, _)) = &scipy {
                for m in SCIPY {
                    row.push(counts[&(c.set.to_string(), i, m.to_string())]);
                }
            }
            row
        })
        .collect();
    match &scipy {
        Ok((_, versions)) => println!("SciPy: {versions}"),
        Err(why) => println!("SciPy comparison skipped: {why}"),
    }
    print!("{:<18} {:>5}", "set", "cases");
    for n in &names {
        print!(" {:>13}", n);
    }
    if scipy.is_ok() {
        print!(" {:>16}", "hybrid/best SciPy");
    }
    println!();
    for set in SETS {
        let idx: Vec<usize> = (0..cases.len()).filter(|&i| cases[i].set == set).collect();
        let mut totals = vec![Total::default(); names.len()];
        for &i in &idx {
            for (t, c) in totals.iter_mut().zip(&rows[i]) {
                t.evals += c.evals;
                t.bad += usize::from(!c.ok);
            }
        }
        print!("{:<18} {:>5}", set, idx.len());
        for t in &totals {
            let cell = if t.bad == 0 {
                format!("{}", t.evals)
            } else {
                format!("{} ({} bad)", t.evals, t.bad)
            };
            print!(" {:>13}", cell);
        }
        if scipy.is_ok() {
            let first = OURS.len() + THEIRS.len();
            let best = totals[first..].iter().map(|t| t.evals).min().unwrap_or(0);
            print!(" {:>16.3}", totals[0].evals as f64 / best as f64);
        }
        println!();
    }
    println!("(bad = not converged, or a root farther from the reference than allowed)");
    for (i, row) in rows.iter().enumerate() {
        for (n, r) in names.iter().zip(row) {
            if !r.ok {
                let c = &cases[i];
                println!(
                    "  bad: {n} on {} case {i} ({} {:?}, [{:?}, {:?}]): {:?} after {}, reference {:?}",
                    c.set, c.family, c.p, c.a, c.b, r.root, r.evals, c.root
                );
            }
        }
    }
    println!();
    println!("engineering set, case by case:");
    print!("{:<44}", "case");
    for n in &names {
        print!(" {:>13}", n);
    }
    println!();
    for (i, c) in cases.iter().enumerate().filter(|(_, c)| c.set == SETS[0]) {
        print!("{:<44}", engineering::ENGINEERING_CASES[i].name);
        let _ = c;
        for r in &rows[i] {
            let cell = if r.ok {
                format!("{}", r.evals)
            } else {
                format!("{}!", r.evals)
            };
            print!(" {:>13}", cell);
        }
        println!();
    }
    println!();
}

/// The bound on the traps built to defeat interpolation: the hybrid's evaluations
/// against bisection's on the same function, under the benchmark's stopping rule.
fn traps_against_bisection() {
    let mut worst_excess = (i64::MIN, String::new());
    let mut worst_ratio = (0.0f64, String::new());
    let (mut ours_total, mut bisection_total, mut runs) = (0usize, 0usize, 0usize);
    for trap in interpolation_traps::TRAPS.iter() {
        for &(a, b) in interpolation_traps::BRACKETS.iter() {
            for &at in interpolation_traps::ROOT_AT.iter() {
                let r = a + at * (b - a);
                let f = |x: f64| trap.eval(x, r);
                let ours = drive(&mut Hybrid::new(a, b), same_rule(), f).xs.len();
                let halving = drive(&mut Bisection::new(a, b), same_rule(), f).xs.len();
                let what = format!(
                    "{} on [{a}, {b}], root {r}: {ours} against {halving}",
                    trap.name
                );
                let excess = ours as i64 - halving as i64;
                if excess > worst_excess.0 {
                    worst_excess = (excess, what.clone());
                }
                let ratio = ours as f64 / halving as f64;
                if ratio > worst_ratio.0 {
                    worst_ratio = (ratio, what);
                }
                ours_total += ours;
                bisection_total += halving;
                runs += 1;
            }
        }
    }
    println!(
        "Functions built to defeat interpolation (tests/fixtures/interpolation_traps.rs): \
         {} traps x {} brackets x {} roots = {runs} runs at the same stopping rule",
        interpolation_traps::TRAPS.len(),
        interpolation_traps::BRACKETS.len(),
        interpolation_traps::ROOT_AT.len()
    );
    println!(
        "hybrid {ours_total} evaluations, bisection {bisection_total}; bound: bisection + {}",
        tacit::methods::hybrid::SLACK + 1
    );
    println!(
        "worst excess over bisection: {} ({})",
        worst_excess.0, worst_excess.1
    );
    println!(
        "worst ratio to bisection: {:.3} ({})",
        worst_ratio.0, worst_ratio.1
    );
    println!();
}

fn main() {
    side_by_side();
    traps_against_bisection();
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
