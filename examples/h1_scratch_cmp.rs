#[path = "../tests/fixtures/aps748.rs"]
mod aps748;
#[path = "../tests/fixtures/candidates.rs"]
mod candidates;
#[path = "../tests/fixtures/chandrupatla.rs"]
mod chandrupatla;
use candidates::*;
use tacit::driver::ScalarMethod;
use tacit::methods::hybrid::Hybrid;
use tacit::methods::illinois::Illinois;
use tacit::Tolerances;
type Build = fn(f64, f64) -> Box<dyn ScalarMethod>;
fn main() {
    let tol = Tolerances { x_abs: 0.0, x_rel: 4.0 * f64::EPSILON, f_abs: 0.0, max_evals: 10000 };
    let paper = Tolerances { x_abs: 5e-6, x_rel: 2e-10, f_abs: 0.0, max_evals: 10000 };
    let ms: [(&str, Build); 3] = [("hyb", |a, b| Box::new(Hybrid::new(a, b))), ("chnS", |a, b| { let mut c = Chandrupatla::new(a, b); c.scaled = true; Box::new(c) }), ("ill", |a, b| Box::new(Illinois::new(a, b)))];
    for (name, b) in ms {
        let mut ev = [0usize; 16];
        for c in aps748::APS_CASES.iter() { let mut m = b(c.a, c.b); ev[c.formula as usize] += drive(m.as_mut(), tol, |x| c.f(x)).xs.len(); }
        print!("{name:6} APS "); for j in 1..16 { print!("{:5}", ev[j]); } println!();
        let mut ev = [0usize; 10];
        for c in chandrupatla::CHANDRUPATLA_CASES.iter() { let mut m = b(c.a, c.b); ev[c.function as usize] += drive(m.as_mut(), paper, |x| c.f(x)).xs.len(); }
        print!("{name:6} CHN "); for j in 1..10 { print!("{:5}", ev[j]); } println!();
    }
}
