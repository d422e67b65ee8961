use tacit::{solve, MethodKind, Options, Start};
fn main() {
    for (a, b, f) in [(1.0, 1.2, (|x: f64| x.sin() - 0.5 * x) as fn(f64) -> f64), (-3.0, -2.0, |x: f64| x * x * x - 2.0 * x - 5.0)] {
        for m in [MethodKind::Auto, MethodKind::Secant] {
            let o = Options { method: m, ..Options::default() }.with_history();
            let s = solve(Start::Guesses(a, b), &o, f).unwrap();
            println!("{:?} {:?} {}", m, s.status, s.evaluations);
            for r in &s.history { println!("   {:>3} {:<24e} {:<24e} {:<18} {:?}", r.k, r.x, r.fx, r.kind.code(), r.bracket); }
        }
    }
}
