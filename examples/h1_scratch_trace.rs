#[path = "../tests/fixtures/aps748.rs"]
mod aps748;
use tacit::driver::{Ask, Context, ScalarMethod};
use tacit::methods::hybrid::Hybrid;
use tacit::{Bounds, Tolerances};
fn main() {
    let idx: usize = std::env::args().nth(1).unwrap().parse().unwrap();
    let c = aps748::APS_CASES[idx];
    let tol = Tolerances { x_abs: 0.0, x_rel: 4.0 * f64::EPSILON, f_abs: 0.0, max_evals: 2000 };
    let mut m = Hybrid::new(c.a, c.b);
    let mut n = 0; let mut told = None;
    loop {
        let ctx = Context { tol, bounds: Bounds::UNBOUNDED, evaluations: n };
        match m.step(told, &ctx) {
            Ask::Eval(x, k) => { n += 1; let fx = c.f(x); println!("{n:3} {:?} x={x:e} f={fx:e} br={:?}", k, m.bracket()); told = Some((x, fx)); }
            Ask::Done(fin) => { println!("{:?}", fin); break }
        }
    }
}
