use tacit::{solve, MethodKind, Options, Start, Tolerances, Bounds};
fn run(name: &str, start: Start, f: &dyn Fn(f64) -> f64, bounds: Bounds) {
    for m in MethodKind::ALL {
        let o = Options { method: m, bounds, ..Options::default() };
        let s = solve(start, &o, |x| f(x)).unwrap();
        println!("{name:<22} {:<10} {:<20} conv={} root={:e} f={:e} evals={}", m.code(), s.status.code(), s.converged, s.root, s.residual, s.evaluations);
    }
}
fn main() {
    let _ = Tolerances::default();
    let u = Bounds::UNBOUNDED;
    run("x4-x2+1", Start::Guesses(0.001, 0.0011001), &|x: f64| x.powi(4) - x * x + 1.0, u);
    run("x2+1 br", Start::Bracket(-1.0, 1.0), &|x: f64| x * x + 1.0, u);
    run("1+x2 (10,20)", Start::Guesses(10.0, 20.0), &|x: f64| x * x + 1.0, u);
    run("const 5", Start::Guesses(6.0, 8.0), &|_x: f64| 5.0, u);
    run("100e^-.03x-100", Start::Guesses(150.0, 75.0), &|x: f64| 100.0 * (-0.03 * x).exp() - 100.0, u);
    run("logistic 6379", Start::Guesses(2e-10, 2e-10 * 1.0001 + 1e-4), &|x: f64| 1.0 / (1.0 + (-1e10 * (x - 1.4142e-10)).exp()) - 0.5, u);
    run("sqrt(x)+1 NaN", Start::Guesses(4.0, 3.0), &|x: f64| x.sqrt() + 1.0, u);
    run("sqrt(x)-0.5 NaN", Start::Guesses(4.0, 3.0), &|x: f64| x.sqrt() - 0.5, u);
    run("xe^-x", Start::Guesses(2.0, 3.0), &|x: f64| x * (-x).exp(), u);
    run("xe^-x b[0,50]", Start::Guesses(2.0, 3.0), &|x: f64| x * (-x).exp(), Bounds::new(1.0, 50.0).unwrap());
    run("(x-1)^2", Start::Guesses(2.0, 3.0), &|x: f64| (x - 1.0).powi(2), u);
    run("e^-x^2", Start::Guesses(1.0, 2.0), &|x: f64| (-x*x).exp(), u);
    run("zero slope x^2+1", Start::Guesses(-1.0, 1.0), &|x: f64| x*x + 1.0, u);
    run("cos zero slope", Start::Guesses(0.0, 0.1), &|x: f64| x.cos()+1.5, u);
    run("nan everywhere", Start::Guesses(0.0, 0.1), &|_x: f64| f64::NAN, u);
}
