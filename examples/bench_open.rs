//! The no-bracket default (Auto) against the plain secant over two-guess starts.
//!
//! `cargo run --release --example bench_open`
//!
//! A case counts as solved when the method reports converged AND its root agrees with
//! the reference root to 1e-8 (relative, or absolute below 1). Each reference root is
//! computed by bisection on the bracket given with the case, a method that cannot fail
//! on a sign change. Default tolerances (x_rel = 1e-12, budget 200), except where a
//! case's root is at zero, where x_abs = 1e-12 as well.

use tacit::{solve, MethodKind, Options, Start, Tolerances};

struct Case {
    name: &'static str,
    /// Where the function comes from.
    source: &'static str,
    f: fn(f64) -> f64,
    guesses: (f64, f64),
    /// Brackets around the roots the case accepts, for the reference roots.
    brackets: &'static [(f64, f64)],
}

const CASES: &[Case] = &[
    Case {
        name: "x^2 - 2",
        source: "common practice, no source",
        f: |x| x * x - 2.0,
        guesses: (1.0, 2.0),
        brackets: &[(1.0, 2.0)],
    },
    Case {
        name: "x^2 - 2 (far)",
        source: "common practice, no source",
        f: |x| x * x - 2.0,
        guesses: (10.0, 11.0),
        brackets: &[(1.0, 2.0)],
    },
    Case {
        name: "cos x - x",
        source: "Burden & Faires, Numerical Analysis, secant example (recalled from memory)",
        f: |x| x.cos() - x,
        guesses: (0.5, std::f64::consts::FRAC_PI_4),
        brackets: &[(0.0, 1.0)],
    },
    Case {
        name: "x^3 + 4x^2 - 10",
        source: "Burden & Faires, Numerical Analysis, bisection example (recalled from memory)",
        f: |x| x * x * x + 4.0 * x * x - 10.0,
        guesses: (1.0, 1.1),
        brackets: &[(1.0, 2.0)],
    },
    Case {
        name: "x^3 - 2x - 5",
        source: "Wallis's equation, Newton's classic example (recalled from memory)",
        f: |x| x * x * x - 2.0 * x - 5.0,
        guesses: (2.0, 3.0),
        brackets: &[(2.0, 3.0)],
    },
    Case {
        name: "x^3 - 2x - 5 (far)",
        source: "Wallis's equation (recalled from memory)",
        f: |x| x * x * x - 2.0 * x - 5.0,
        guesses: (-3.0, -2.0),
        brackets: &[(2.0, 3.0)],
    },
    Case {
        name: "e^x - 2",
        source: "common practice, no source",
        f: |x| x.exp() - 2.0,
        guesses: (0.0, 0.1),
        brackets: &[(0.0, 1.0)],
    },
    Case {
        name: "x e^-x",
        source: "SciPy issue tracker, secant runs away (recalled from memory)",
        f: |x| x * (-x).exp(),
        guesses: (2.0, 3.0),
        brackets: &[(-1.0, 1.0)],
    },
    Case {
        name: "atan x",
        source: "common practice, no source (Newton/secant diverge from |x| > 1.39)",
        f: |x| x.atan(),
        guesses: (1.5, 2.0),
        brackets: &[(-1.0, 1.0)],
    },
    Case {
        name: "sin x",
        source: "common practice, no source",
        f: |x| x.sin(),
        guesses: (3.0, 3.5),
        brackets: &[(3.0, 3.5)],
    },
    Case {
        name: "x^10 - 1",
        source: "common practice, no source (flat start)",
        f: |x| x.powi(10) - 1.0,
        guesses: (0.1, 0.2),
        brackets: &[(0.5, 1.5)],
    },
    Case {
        name: "Kepler M=1, e=0.9",
        source: "Kepler's equation E - e sin E = M (common practice, no source)",
        f: |x| x - 0.9 * x.sin() - 1.0,
        guesses: (0.0, 0.1),
        brackets: &[(0.0, 3.0)],
    },
    Case {
        name: "Colebrook Re=1e5",
        source: "Colebrook (1939) equation, relative roughness 1e-4",
        f: |l| 1.0 / l.sqrt() + 2.0 * (1e-4 / 3.7 + 2.51 / (1e5 * l.sqrt())).log10(),
        guesses: (0.01, 0.02),
        brackets: &[(0.005, 0.1)],
    },
    Case {
        name: "x e^x - 1",
        source: "the omega constant (common practice, no source)",
        f: |x| x * x.exp() - 1.0,
        guesses: (2.0, 3.0),
        brackets: &[(0.0, 1.0)],
    },
    Case {
        name: "(x-1)^3 (odd triple)",
        source: "common practice, no source (multiple root)",
        f: |x| (x - 1.0).powi(3),
        guesses: (1.5, 2.0),
        brackets: &[(0.0, 3.0)],
    },
    Case {
        name: "tanh x - 0.5",
        source: "common practice, no source (flat tails)",
        f: |x| x.tanh() - 0.5,
        guesses: (2.0, 3.0),
        brackets: &[(0.0, 1.0)],
    },
    Case {
        name: "ln x",
        source: "common practice, no source (NaN for x < 0)",
        f: |x| x.ln(),
        guesses: (3.0, 4.0),
        brackets: &[(0.5, 2.0)],
    },
    Case {
        name: "sqrt x - 0.5",
        source: "common practice, no source (NaN for x < 0)",
        f: |x| x.sqrt() - 0.5,
        guesses: (4.0, 3.0),
        brackets: &[(0.0, 1.0)],
    },
    Case {
        name: "diode current",
        source: "Shockley diode law, Is = 1e-12 A, Vt = 25.852 mV, I = 1 mA",
        f: |v| 1e-12 * ((v / 0.025852).exp() - 1.0) - 1e-3,
        guesses: (0.6, 0.7),
        brackets: &[(0.3, 0.7)],
    },
    Case {
        name: "2 - 1/x",
        source: "common practice, no source (pole at 0)",
        f: |x| 2.0 - 1.0 / x,
        guesses: (2.0, 3.0),
        brackets: &[(0.1, 1.0)],
    },
    Case {
        name: "x^5 - x - 1",
        source: "common practice, no source",
        f: |x| x.powi(5) - x - 1.0,
        guesses: (0.0, 0.5),
        brackets: &[(1.0, 2.0)],
    },
    Case {
        name: "x^3 - x - 1",
        source: "the plastic number (common practice, no source)",
        f: |x| x * x * x - x - 1.0,
        guesses: (0.5, 0.6),
        brackets: &[(1.0, 2.0)],
    },
    Case {
        name: "x / (1 + x^2)",
        source: "common practice, no source (secant runs away for |x| > 1)",
        f: |x| x / (1.0 + x * x),
        guesses: (2.0, 3.0),
        brackets: &[(-1.0, 1.0)],
    },
    Case {
        name: "cbrt x",
        source: "common practice, no source (Newton diverges on the cube root)",
        f: |x| x.cbrt(),
        guesses: (1.0, 2.0),
        brackets: &[(-1.0, 1.0)],
    },
    Case {
        name: "sin x - x/2",
        source: "common practice, no source",
        f: |x| x.sin() - 0.5 * x,
        guesses: (1.0, 1.2),
        brackets: &[(1.0, 3.0)],
    },
    Case {
        name: "cosh x - 2",
        source: "common practice, no source",
        f: |x| x.cosh() - 2.0,
        guesses: (0.2, 0.3),
        brackets: &[(1.0, 2.0)],
    },
    Case {
        name: "e^-x^2 - 0.1 ",
        source: "common practice, no source (flat tails)",
        f: |x| (-x * x).exp() - 0.1,
        guesses: (3.0, 3.5),
        brackets: &[(1.0, 2.0)],
    },
    Case {
        name: "x^20 - 1",
        source: "common practice, no source (steep, flat near 0)",
        f: |x| x.powi(20) - 1.0,
        guesses: (0.5, 0.6),
        brackets: &[(0.5, 1.5)],
    },
    Case {
        name: "exp(1/x) - 2 ",
        source: "common practice, no source",
        f: |x| (1.0 / x).exp() - 2.0,
        guesses: (5.0, 6.0),
        brackets: &[(1.0, 2.0)],
    },
    Case {
        name: "Lambert w e^w = 10",
        source: "Lambert W(10) (common practice, no source)",
        f: |w| w * w.exp() - 10.0,
        guesses: (4.0, 5.0),
        brackets: &[(1.0, 2.0)],
    },
    Case {
        name: "x^2 - 4 (zero slope)",
        source: "common practice, no source (guesses symmetric about the minimum)",
        f: |x| x * x - 4.0,
        guesses: (-1.0, 1.0),
        brackets: &[(1.0, 3.0), (-3.0, -1.0)],
    },
    Case {
        name: "10^x - 1e6",
        source: "common practice, no source (steep)",
        f: |x| 10f64.powf(x) - 1e6,
        guesses: (0.0, 1.0),
        brackets: &[(5.0, 7.0)],
    },
];

fn reference(lo: f64, hi: f64, f: fn(f64) -> f64) -> f64 {
    let options = Options {
        method: MethodKind::Bisection,
        tol: Tolerances {
            x_abs: 1e-15,
            x_rel: 1e-15,
            f_abs: 0.0,
            max_evals: 400,
        },
        ..Options::default()
    };
    solve(Start::Bracket(lo, hi), &options, f)
        .expect("reference bracket is valid")
        .root
}

fn main() {
    println!("no-bracket default (auto) versus the plain secant, two guesses each");
    println!("solved = converged and root within 1e-8 of a reference root (bisection on the case's brackets)");
    println!();
    println!(
        "{:<24} {:>16} {:>6} {:>18} {:>6} {:>18}",
        "case", "guesses", "auto", "auto status", "secant", "secant status"
    );
    let mut totals = [(0usize, 0usize, 0usize); 2];
    // Evaluations on the cases that both methods solve.
    let mut both = [0usize; 2];
    for c in CASES {
        let refs: Vec<f64> = c
            .brackets
            .iter()
            .map(|&(lo, hi)| reference(lo, hi, c.f))
            .collect();
        let near_zero = refs.iter().any(|r| r.abs() < 1e-6);
        let mut cells = Vec::new();
        let mut row = [(false, 0usize); 2];
        for (i, method) in [MethodKind::Auto, MethodKind::Secant]
            .into_iter()
            .enumerate()
        {
            let tol = Tolerances {
                x_abs: if near_zero { 1e-12 } else { 0.0 },
                ..Tolerances::default()
            };
            let options = Options {
                method,
                tol,
                ..Options::default()
            };
            let (a, b) = c.guesses;
            let s = solve(Start::Guesses(a, b), &options, c.f).expect("valid start");
            let solved = s.converged
                && refs
                    .iter()
                    .any(|r| (s.root - r).abs() <= 1e-8 * r.abs().max(1.0));
            totals[i].1 += s.evaluations;
            row[i] = (solved, s.evaluations);
            if solved {
                totals[i].0 += 1;
                totals[i].2 += s.evaluations;
            }
            cells.push(format!(
                "{:>6} {:>18}",
                format!("{}{}", s.evaluations, if solved { "" } else { "*" }),
                s.status.code()
            ));
        }
        if row[0].0 && row[1].0 {
            both[0] += row[0].1;
            both[1] += row[1].1;
        }
        println!(
            "{:<24} {:>16} {} {}",
            c.name,
            format!("{}, {}", c.guesses.0, c.guesses.1),
            cells[0],
            cells[1]
        );
    }
    println!();
    println!("(* = not solved: not converged, or converged to the wrong place)");
    println!("sources:");
    for c in CASES {
        println!("  {:<24} {}", c.name, c.source);
    }
    println!();
    let n = CASES.len();
    for (i, name) in ["auto", "secant"].into_iter().enumerate() {
        println!(
            "{name:<7} solved {:>2} of {n}; evaluations: {} in all, {} on the solved cases",
            totals[i].0, totals[i].1, totals[i].2
        );
    }
    println!(
        "on the cases both solve: auto {} evaluations, secant {}",
        both[0], both[1]
    );
}
