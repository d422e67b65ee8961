//! The language's power `x^y` (`functions::power`): integer exponents −1 to 4 and ½ are
//! computed by multiplication (or a square root) rather than `powf`. These tests check
//! the accuracy that the documentation states, against a double-double reference and
//! against the platform's `powf`, and the special values against IEEE `pow`.
//!
//! References:
//! - error-free products with a fused multiply–add (`TwoProduct`: a·b = p + e exactly
//!   with p = fl(a·b), e = fma(a, b, −p)): Ogita, Rump & Oishi, "Accurate sum and dot
//!   product", SIAM J. Sci. Comput. 26(6), 2005, Algorithm 3.5;
//! - special cases of pow: ISO C99 Annex F.9.4.4 and IEEE 754-2019 §9.2.1 (recalled
//!   from memory: pow(x, ±0) = 1 for any x, even NaN; pow(±0, y) for odd and even y;
//!   pow(−∞, y)); the checks compare with the platform `powf`, which follows them.

use tacit::equations::functions::{power, power_int};
use tacit::equations::Expression;

/// A small seeded generator (xorshift64*, Vigna 2016) for test inputs.
struct Rng(u64);

impl Rng {
    fn next(&mut self) -> u64 {
        self.0 ^= self.0 >> 12;
        self.0 ^= self.0 << 25;
        self.0 ^= self.0 >> 27;
        self.0.wrapping_mul(0x2545_F491_4F6C_DD1D)
    }

    /// A random finite double with |x| between 2^lo and 2^hi, either sign.
    fn float(&mut self, lo: i32, hi: i32) -> f64 {
        let r = self.next();
        let mantissa = 1.0 + (r >> 12) as f64 / (1u64 << 52) as f64;
        let span = (hi - lo) as u64;
        let e = lo + (self.next() % span) as i32;
        let x = mantissa * 2f64.powi(e);
        if r & 1 == 1 {
            -x
        } else {
            x
        }
    }
}

/// One unit in the last place of a normal double.
fn ulp(y: f64) -> f64 {
    let a = y.abs();
    a.next_up() - a
}

/// The exact power xⁿ as an unevaluated sum hi + lo (error below 2^-100 relative),
/// for n = 2, 3, 4, by error-free products.
fn reference(x: f64, n: i32) -> (f64, f64) {
    let p = x * x;
    let e = x.mul_add(x, -p); // x² = p + e exactly
    match n {
        2 => (p, e),
        3 => {
            let q = p * x;
            let f = p.mul_add(x, -q); // p·x = q + f exactly
            (q, f + e * x)
        }
        _ => {
            let q = p * p;
            let f = p.mul_add(p, -q); // p² = q + f exactly
            (q, f + 2.0 * p * e + e * e)
        }
    }
}

/// Error of `got` against the exact value hi + lo, in units in the last place.
fn ulps_from(got: f64, (hi, lo): (f64, f64)) -> f64 {
    ((got - hi) - lo).abs() / ulp(hi)
}

fn ulps_between(a: f64, b: f64) -> f64 {
    (a - b).abs() / ulp(b)
}

#[test]
fn integer_powers_are_within_their_stated_error() {
    // functions::power: n = 2 correctly rounded; n = 3 within 2 and n = 4 within 3 units
    // in the last place of the exact power (two roundings each).
    let mut rng = Rng(0x9E37_79B9_7F4A_7C15);
    let bound = [(2, 0.5), (3, 2.0), (4, 3.0)];
    for (n, max_ulps) in bound {
        let mut worst = 0f64;
        for _ in 0..200_000 {
            let x = rng.float(-200 / n, 200 / n);
            let got = power(x, n as f64);
            assert_eq!(got.to_bits(), power_int(x, n).to_bits());
            let err = ulps_from(got, reference(x, n));
            worst = worst.max(err);
            assert!(err <= max_ulps, "x^{n} at x = {x:e}: {err} ulp");
            // The platform powf is within 1 ulp of the exact value (glibc and musl),
            // so the two differ by at most the sum.
            let pf = x.powf(n as f64);
            assert!(
                ulps_between(got, pf) <= max_ulps + 1.0,
                "x^{n} at x = {x:e}: power {got:e}, powf {pf:e}"
            );
        }
        assert!(
            worst > 0.0,
            "the reference must see some rounding for n = {n}"
        );
    }
}

#[test]
fn reciprocal_and_square_root_are_correctly_rounded() {
    // x^-1 = 1/x and x^0.5 = sqrt(x): one IEEE operation, correctly rounded. The
    // residuals 1 − q·x and x − s² are exact with a fused multiply–add.
    let mut rng = Rng(0xD1B5_4A32_D192_ED03);
    for _ in 0..200_000 {
        let x = rng.float(-500, 500);
        let q = power(x, -1.0);
        let r = (-q).mul_add(x, 1.0); // 1 − q·x exactly
        assert!((r / x).abs() <= 0.5 * ulp(q) * (1.0 + 1e-9), "1/{x:e}");
        assert!(ulps_between(q, x.powf(-1.0)) <= 1.0);
        let a = x.abs();
        let s = power(a, 0.5);
        let r = (-s).mul_add(s, a); // a − s² exactly
        assert!(
            (r / (2.0 * s)).abs() <= 0.5 * ulp(s) * (1.0 + 1e-9),
            "sqrt {a:e}"
        );
        assert!(ulps_between(s, a.powf(0.5)) <= 1.0);
    }
}

#[test]
fn special_values_follow_ieee_pow() {
    // Same bits as the platform powf (NaN: any NaN) for zeros, infinities, NaN, ones,
    // the extremes of the range and the multiplied exponents.
    let xs = [
        0.0,
        -0.0,
        f64::INFINITY,
        f64::NEG_INFINITY,
        f64::NAN,
        1.0,
        -1.0,
        2.0,
        -2.0,
        0.5,
        -0.5,
        f64::MAX,
        -f64::MAX,
        f64::MIN_POSITIVE,
        -f64::MIN_POSITIVE,
        5e-324,
        -5e-324,
        1e200,
        -1e-200,
    ];
    for y in [-1.0, -0.0, 0.0, 1.0, 2.0, 3.0, 4.0, 0.5] {
        for x in xs {
            let (got, want) = (power(x, y), x.powf(y));
            let same = got.to_bits() == want.to_bits() || (got.is_nan() && want.is_nan());
            assert!(same, "{x:e}^{y}: power {got:e}, powf {want:e}");
        }
    }
    // pow(x, ±0) = 1 even for NaN; pow(1, y) = 1 even for NaN (ISO C99 F.9.4.4).
    assert_eq!(power(f64::NAN, 0.0), 1.0);
    assert_eq!(power(1.0, f64::NAN), 1.0);
}

#[test]
fn the_compiled_program_and_folding_use_the_same_power() {
    // `x^3` with x a slot, a folded known, or a literal: the same bits everywhere.
    let x: f64 = 1.234_567_891_234_5;
    let slot = Expression::parse("x^3").unwrap().compile(&["x"]).unwrap();
    let literal = Expression::parse(&format!("{x:e}^3"))
        .unwrap()
        .compile(&[])
        .unwrap();
    let exponent = Expression::parse("x^k")
        .unwrap()
        .compile(&["x", "k"])
        .unwrap();
    let want = x * x * x;
    assert_eq!(slot.eval(&[x]).to_bits(), want.to_bits());
    assert_eq!(
        literal.as_constant().map(f64::to_bits),
        Some(want.to_bits())
    );
    assert_eq!(exponent.eval(&[x, 3.0]).to_bits(), want.to_bits());
    assert!(slot.has_multiplied_powers());
    // x^1 is x; x^0 is 1 even for NaN.
    let one = Expression::parse("x^1 + x^0")
        .unwrap()
        .compile(&["x"])
        .unwrap();
    assert_eq!(one.eval(&[2.5]), 3.5);
    assert!(one.eval(&[f64::NAN]).is_nan());
    let zero = Expression::parse("x^0").unwrap().compile(&["x"]).unwrap();
    assert_eq!(zero.eval(&[f64::NAN]), 1.0);
}
