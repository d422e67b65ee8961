//! The uncertainty of an answer: one unknown x defined implicitly by F(x, k) = 0, with
//! knowns k that carry standard uncertainties.
//!
//! **Law of propagation of uncertainty** (JCGM 100:2008, the GUM, eq. 10, uncorrelated
//! inputs): u_c²(x) = Σ cᵢ² u²(kᵢ), with the sensitivities from the implicit function
//! theorem, cᵢ = ∂x/∂kᵢ = −(∂F/∂kᵢ)/(∂F/∂x), the partial derivatives taken exactly by
//! forward-mode differentiation ([`crate::equations::Dual`]) at the nominal root. The
//! expanded uncertainty is U = k·u_c with the coverage factor k (2 by default; k = 2
//! gives about 95 % coverage when x is close to Gaussian, GUM §6.3.3).
//!
//! **Monte Carlo** (JCGM 101:2008): each of M trials draws every known from its
//! distribution (Gaussian by default, JCGM 101 §6.4.7; or rectangular with the same
//! standard deviation, §6.4.2), solves F(x, k) = 0 starting from the nominal root, and
//! keeps x. Trials in which no root is found are counted, not hidden. The 95 %
//! probabilistically symmetric coverage interval is [x₍ᵣ₎, x₍ᵣ₊q₎] of the sorted values
//! with q = pM rounded and r = (M − q)/2 rounded half up (JCGM 101 §7.7.2; recalled
//! from memory), over the trials that found a root.
//!
//! **Validation** (JCGM 101 §8, with the numerical tolerance of §7.9.2): write u_c as
//! c × 10^l with c an integer of `significant_digits` digits; δ = ½ × 10^l. The GUM
//! interval x ± k₉₅·u_c, with k₉₅ = 1.959963984540054 the 97.5 % point of the
//! Gaussian (scipy 1.17.1 `stats.norm.ppf(0.975)`), is validated when both of its ends
//! lie within δ of the Monte Carlo interval's. Otherwise the result says so: the model
//! is not linear enough over the uncertainties, or x is not Gaussian, and the Monte
//! Carlo interval is the one to use.
//!
//! **Random numbers**: PCG64 (O'Neill, "PCG: a family of simple fast space-efficient
//! statistically good algorithms for random number generation", 2014; the XSL-RR
//! 128/64 generator, as numpy's `PCG64`), checked against numpy's outputs; Gaussians by
//! Marsaglia's polar method (Marsaglia & Bray, SIAM Review 6(3), 1964). Written here, a
//! few lines, rather than taken from a crate: the generator must be seeded, portable
//! and identical on wasm32 and natively, and it adds nothing to the WebAssembly size
//! worth mentioning.
//!
//! Generic over [`ImplicitModel`] (a gradient of F and a "solve for x given k, starting
//! near x0"), so any problem can plug in; [`propagate_in_set`] builds one from an
//! equation text.

use crate::equations::{EquationSet, Residual};
use crate::error::{require_finite, InputError};
use crate::methods::{Options, Start};
use crate::stepper::solve;
use crate::tolerances::Bounds;

/// The most Monte Carlo trials (JCGM 101 §7.2.2 suggests 10⁶); their values are kept
/// for the coverage interval, 8 bytes each.
pub const MAX_TRIALS: usize = 1_000_000;

/// The 97.5 % point of the standard Gaussian (scipy 1.17.1 `stats.norm.ppf(0.975)`).
pub const K95: f64 = 1.959963984540054;

/// What the propagation needs of F(x, k).
pub trait ImplicitModel {
    /// F at (x, k) and its gradient into `gradient`: ∂F/∂x, then ∂F/∂kᵢ in order
    /// (`gradient` is 1 + k.len() long).
    fn gradient(&mut self, x: f64, k: &[f64], gradient: &mut [f64]) -> f64;
    /// A root of F(·, k) near `x0`, or `None` when none is found.
    fn solve(&mut self, k: &[f64], x0: f64) -> Option<f64>;
    /// Evaluations of F made so far (of any kind), for reporting costs; 0 if unknown.
    fn evaluations(&self) -> usize {
        0
    }
}

impl<M: ImplicitModel + ?Sized> ImplicitModel for &mut M {
    fn gradient(&mut self, x: f64, k: &[f64], gradient: &mut [f64]) -> f64 {
        (**self).gradient(x, k, gradient)
    }
    fn solve(&mut self, k: &[f64], x0: f64) -> Option<f64> {
        (**self).solve(k, x0)
    }
    fn evaluations(&self) -> usize {
        (**self).evaluations()
    }
}

/// [`ImplicitModel`] from two closures.
pub struct FromClosures<G, S> {
    pub gradient: G,
    pub solve: S,
}

impl<G, S> ImplicitModel for FromClosures<G, S>
where
    G: FnMut(f64, &[f64], &mut [f64]) -> f64,
    S: FnMut(&[f64], f64) -> Option<f64>,
{
    fn gradient(&mut self, x: f64, k: &[f64], gradient: &mut [f64]) -> f64 {
        (self.gradient)(x, k, gradient)
    }
    fn solve(&mut self, k: &[f64], x0: f64) -> Option<f64> {
        (self.solve)(k, x0)
    }
}

/// The distribution of a known in the Monte Carlo trials.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Distribution {
    /// Gaussian with the value as mean and the standard uncertainty as standard
    /// deviation (JCGM 101 §6.4.7: all that is known is an estimate and its standard
    /// uncertainty).
    Gaussian,
    /// Rectangular (uniform) with the same mean and standard deviation: half-width
    /// √3·u (JCGM 101 §6.4.2).
    Rectangular,
}

/// A known with its standard uncertainty.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct UncertainInput {
    pub value: f64,
    /// Standard uncertainty, in the unit of the value.
    pub standard: f64,
    pub distribution: Distribution,
}

impl UncertainInput {
    /// A Gaussian known with standard uncertainty `u`.
    pub fn absolute(value: f64, u: f64) -> UncertainInput {
        UncertainInput {
            value,
            standard: u,
            distribution: Distribution::Gaussian,
        }
    }

    /// A Gaussian known with a relative standard uncertainty (`0.3` for 30 %).
    pub fn relative(value: f64, relative: f64) -> UncertainInput {
        UncertainInput::absolute(value, relative * value.abs())
    }

    pub fn with_distribution(mut self, distribution: Distribution) -> UncertainInput {
        self.distribution = distribution;
        self
    }
}

/// Settings of the propagation.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct UncertaintyOptions {
    /// The coverage factor of the expanded uncertainty (default 2).
    pub coverage_factor: f64,
    /// Monte Carlo trials (default 100 000; 0 skips the Monte Carlo check; at most
    /// [`MAX_TRIALS`]).
    pub trials: usize,
    /// Seed of the random numbers (default 1).
    pub seed: u64,
    /// Significant digits of u_c that set the validation tolerance (default 2).
    pub significant_digits: u32,
}

impl Default for UncertaintyOptions {
    fn default() -> Self {
        UncertaintyOptions {
            coverage_factor: 2.0,
            trials: 100_000,
            seed: 1,
            significant_digits: 2,
        }
    }
}

/// The GUM result.
#[derive(Debug, Clone, PartialEq)]
pub struct LinearPropagation {
    /// The nominal root.
    pub value: f64,
    /// ∂x/∂kᵢ.
    pub sensitivities: Vec<f64>,
    /// |cᵢ|·u(kᵢ): each known's share of the uncertainty.
    pub contributions: Vec<f64>,
    /// u_c(x).
    pub standard: f64,
    pub coverage_factor: f64,
    /// U = k·u_c.
    pub expanded: f64,
}

/// The Monte Carlo result.
#[derive(Debug, Clone, PartialEq)]
pub struct MonteCarlo {
    pub trials: usize,
    /// Trials in which no root was found (left out of the statistics below).
    pub failed: usize,
    pub mean: f64,
    /// Standard deviation of the values found.
    pub standard: f64,
    /// The 95 % probabilistically symmetric coverage interval.
    pub interval: (f64, f64),
    /// Evaluations of F over all trials.
    pub evaluations: usize,
    /// The values found, counted in [`HISTOGRAM_BINS`] equal bins from the 0.5 % to the
    /// 99.5 % quantile (values beyond either end counted apart), for a plot.
    pub histogram: Histogram,
}

/// Bins of the Monte Carlo histogram.
pub const HISTOGRAM_BINS: usize = 40;

/// Counts of values in equal bins from `lo` to `hi`; `below` and `above` count the
/// values outside. Empty (`counts` all zero, `lo == hi == NaN`) when no value was found.
#[derive(Debug, Clone, PartialEq)]
pub struct Histogram {
    pub lo: f64,
    pub hi: f64,
    pub counts: Vec<usize>,
    pub below: usize,
    pub above: usize,
}

impl Histogram {
    /// The histogram of `sorted` (ascending, finite).
    pub fn of_sorted(sorted: &[f64]) -> Histogram {
        let mut h = Histogram {
            lo: f64::NAN,
            hi: f64::NAN,
            counts: vec![0; HISTOGRAM_BINS],
            below: 0,
            above: 0,
        };
        let n = sorted.len();
        if n == 0 {
            return h;
        }
        let at = |p: f64| sorted[((p * (n - 1) as f64).round() as usize).min(n - 1)];
        let (lo, hi) = (at(0.005), at(0.995));
        h.lo = lo;
        h.hi = hi;
        if hi <= lo {
            // Every value (but the outer 1 %) is the same: one bin holds them.
            for &v in sorted {
                if v < lo {
                    h.below += 1;
                } else if v > hi {
                    h.above += 1;
                } else {
                    h.counts[0] += 1;
                }
            }
            return h;
        }
        let width = (hi - lo) / HISTOGRAM_BINS as f64;
        for &v in sorted {
            if v < lo {
                h.below += 1;
            } else if v > hi {
                h.above += 1;
            } else {
                let i = (((v - lo) / width) as usize).min(HISTOGRAM_BINS - 1);
                h.counts[i] += 1;
            }
        }
        h
    }
}

/// The comparison of JCGM 101 §8.
#[derive(Debug, Clone, PartialEq)]
pub struct Validation {
    /// δ: the numerical tolerance of u_c.
    pub tolerance: f64,
    /// The GUM 95 % interval x ± k₉₅·u_c.
    pub gum_interval: (f64, f64),
    /// Distances between the lower ends and between the upper ends.
    pub d_low: f64,
    pub d_high: f64,
    pub agrees: bool,
    /// In plain words.
    pub message: String,
}

/// Everything the propagation found.
#[derive(Debug, Clone, PartialEq)]
pub struct UncertaintyResult {
    pub linear: LinearPropagation,
    pub monte_carlo: Option<MonteCarlo>,
    pub validation: Option<Validation>,
}

/// The PCG64 generator (XSL-RR 128/64), as numpy's `PCG64`.
#[derive(Debug, Clone)]
pub struct Pcg64 {
    state: u128,
    inc: u128,
    /// A second Gaussian from the polar method, kept for the next call.
    spare: Option<f64>,
}

const PCG_MULTIPLIER: u128 = 0x2360_ED05_1FC6_5DA4_4385_DF64_9FCC_F645;

impl Pcg64 {
    /// From a raw state and increment (made odd), as numpy's `PCG64.state`.
    pub fn from_state(state: u128, inc: u128) -> Pcg64 {
        Pcg64 {
            state,
            inc: inc | 1,
            spare: None,
        }
    }

    /// From a 64-bit seed, spread over the state by SplitMix64 (Steele, Lea & Flood,
    /// OOPSLA 2014).
    pub fn seeded(seed: u64) -> Pcg64 {
        let mut s = seed;
        let mut next = || {
            s = s.wrapping_add(0x9E37_79B9_7F4A_7C15);
            let mut z = s;
            z = (z ^ (z >> 30)).wrapping_mul(0xBF58_476D_1CE4_E5B9);
            z = (z ^ (z >> 27)).wrapping_mul(0x94D0_49BB_1331_11EB);
            z ^ (z >> 31)
        };
        let state = ((next() as u128) << 64) | next() as u128;
        let inc = ((next() as u128) << 64) | next() as u128;
        Pcg64::from_state(state, inc)
    }

    /// The next 64 random bits.
    pub fn next_u64(&mut self) -> u64 {
        self.state = self
            .state
            .wrapping_mul(PCG_MULTIPLIER)
            .wrapping_add(self.inc);
        let rot = (self.state >> 122) as u32;
        let xored = ((self.state >> 64) as u64) ^ (self.state as u64);
        xored.rotate_right(rot)
    }

    /// Uniform on [0, 1) with 53 random bits (numpy's `random()`).
    pub fn uniform(&mut self) -> f64 {
        (self.next_u64() >> 11) as f64 * (1.0 / 9_007_199_254_740_992.0)
    }

    /// A standard Gaussian, by Marsaglia's polar method.
    pub fn gaussian(&mut self) -> f64 {
        if let Some(z) = self.spare.take() {
            return z;
        }
        loop {
            let u = 2.0 * self.uniform() - 1.0;
            let v = 2.0 * self.uniform() - 1.0;
            let s = u * u + v * v;
            if s > 0.0 && s < 1.0 {
                let f = (-2.0 * s.ln() / s).sqrt();
                self.spare = Some(v * f);
                return u * f;
            }
        }
    }

    /// A draw of `input`.
    fn draw(&mut self, input: &UncertainInput) -> f64 {
        match input.distribution {
            Distribution::Gaussian => input.value + input.standard * self.gaussian(),
            Distribution::Rectangular => {
                let half = 3f64.sqrt() * input.standard;
                input.value + half * (2.0 * self.uniform() - 1.0)
            }
        }
    }
}

/// The numerical tolerance δ of `u` with `digits` significant digits (JCGM 101 §7.9.2):
/// u = c × 10^l with c an integer of that many digits, δ = ½ × 10^l.
pub fn numerical_tolerance(u: f64, digits: u32) -> f64 {
    if !(u.is_finite() && u > 0.0) {
        return f64::NAN;
    }
    let l = u.log10().floor() as i32 - (digits.max(1) as i32 - 1);
    0.5 * 10f64.powi(l)
}

/// The 100p % probabilistically symmetric coverage interval of sorted values
/// (JCGM 101 §7.7.2).
fn coverage_interval(sorted: &[f64], p: f64) -> (f64, f64) {
    let m = sorted.len();
    if m == 0 {
        return (f64::NAN, f64::NAN);
    }
    let q = ((p * m as f64) + 0.5).floor() as usize;
    let q = q.min(m - 1);
    let r = (m - q).div_ceil(2).max(1);
    // 1-based ranks r and r + q.
    let lo = sorted[r - 1];
    let hi = sorted[(r + q - 1).min(m - 1)];
    (lo, hi)
}

fn check_options(options: &UncertaintyOptions) -> Result<(), InputError> {
    let k = options.coverage_factor;
    if !(k.is_finite() && k > 0.0) {
        return Err(InputError::new(
            "bad-coverage-factor",
            format!("the coverage factor must be a finite number above 0, got {k}"),
        ));
    }
    if options.trials > MAX_TRIALS {
        return Err(InputError::new(
            "too-many-trials",
            format!(
                "{} Monte Carlo trials asked for; the limit is {MAX_TRIALS}",
                options.trials
            ),
        ));
    }
    if !(1..=6).contains(&options.significant_digits) {
        return Err(InputError::new(
            "bad-digits",
            format!(
                "significant digits must be from 1 to 6, got {}",
                options.significant_digits
            ),
        ));
    }
    Ok(())
}

fn check_inputs(inputs: &[UncertainInput]) -> Result<(), InputError> {
    for (i, input) in inputs.iter().enumerate() {
        require_finite(input.value, &format!("the value of known {}", i + 1))?;
        if !(input.standard.is_finite() && input.standard >= 0.0) {
            return Err(InputError::new(
                "bad-uncertainty",
                format!(
                    "the standard uncertainty of known {} must be a finite number ≥ 0, got {}",
                    i + 1,
                    input.standard
                ),
            ));
        }
    }
    Ok(())
}

/// The uncertainty of the root of `model` from the knowns `inputs`, starting near `x0`.
pub fn propagate<M: ImplicitModel>(
    model: &mut M,
    inputs: &[UncertainInput],
    x0: f64,
    options: &UncertaintyOptions,
) -> Result<UncertaintyResult, InputError> {
    check_options(options)?;
    require_finite(x0, "the starting point")?;
    check_inputs(inputs)?;
    let nominal: Vec<f64> = inputs.iter().map(|i| i.value).collect();
    let Some(x) = model.solve(&nominal, x0) else {
        return Err(InputError::new(
            "no-root",
            format!("no root was found at the nominal values, starting from {x0}"),
        ));
    };
    let linear = linear(model, inputs, x, options.coverage_factor)?;
    if options.trials == 0 {
        return Ok(UncertaintyResult {
            linear,
            monte_carlo: None,
            validation: None,
        });
    }
    let mut run = MonteCarloRun::new(&mut *model, inputs, x, options)?;
    run.advance(options.trials);
    let monte_carlo = run.finish();
    let validation = validate(&linear, &monte_carlo, options.significant_digits);
    Ok(UncertaintyResult {
        linear,
        monte_carlo: Some(monte_carlo),
        validation,
    })
}

/// The law of propagation (GUM eq. 10) at the root `x` of `model` at the nominal
/// values of `inputs`, with coverage factor `k`: one gradient of F by forward-mode
/// differentiation where the model is a program.
pub fn linear<M: ImplicitModel>(
    model: &mut M,
    inputs: &[UncertainInput],
    x: f64,
    k: f64,
) -> Result<LinearPropagation, InputError> {
    check_inputs(inputs)?;
    if !(k.is_finite() && k > 0.0) {
        return Err(InputError::new(
            "bad-coverage-factor",
            format!("the coverage factor must be a finite number above 0, got {k}"),
        ));
    }
    let nominal: Vec<f64> = inputs.iter().map(|i| i.value).collect();
    let mut gradient = vec![0.0; 1 + inputs.len()];
    model.gradient(x, &nominal, &mut gradient);
    let fx = gradient[0];
    if !(fx.is_finite() && fx != 0.0) {
        return Err(InputError::new(
            "singular-root",
            format!(
                "∂F/∂x is {fx} at the root {x}: the root is not simple, and the law of \
                 propagation (a first-order expansion) does not apply"
            ),
        ));
    }
    let sensitivities: Vec<f64> = gradient[1..].iter().map(|g| -g / fx).collect();
    let contributions: Vec<f64> = sensitivities
        .iter()
        .zip(inputs)
        .map(|(c, i)| (c * i.standard).abs())
        .collect();
    let largest = contributions.iter().fold(0.0f64, |m, c| m.max(*c));
    let standard = if largest > 0.0 {
        largest
            * contributions
                .iter()
                .map(|c| (c / largest).powi(2))
                .sum::<f64>()
                .sqrt()
    } else {
        0.0
    };
    Ok(LinearPropagation {
        value: x,
        sensitivities,
        contributions,
        standard,
        coverage_factor: k,
        expanded: k * standard,
    })
}

/// A Monte Carlo propagation in progress, run in chunks ([`MonteCarloRun::advance`])
/// so that a caller can show progress and stop; [`MonteCarloRun::finish`] gives the
/// result over the trials run. Each trial draws every known and solves from the
/// nominal root `x`. The same seed gives the same trials however the run is chunked.
pub struct MonteCarloRun<M: ImplicitModel> {
    model: M,
    inputs: Vec<UncertainInput>,
    x: f64,
    rng: Pcg64,
    k: Vec<f64>,
    values: Vec<f64>,
    failed: usize,
    trials: usize,
    done: usize,
    evaluations: usize,
}

impl<M: ImplicitModel> MonteCarloRun<M> {
    /// A run of `options.trials` trials (at most [`MAX_TRIALS`]) seeded with
    /// `options.seed`.
    pub fn new(
        model: M,
        inputs: &[UncertainInput],
        x: f64,
        options: &UncertaintyOptions,
    ) -> Result<MonteCarloRun<M>, InputError> {
        check_options(options)?;
        check_inputs(inputs)?;
        require_finite(x, "the nominal root")?;
        Ok(MonteCarloRun {
            model,
            inputs: inputs.to_vec(),
            x,
            rng: Pcg64::seeded(options.seed),
            k: vec![0.0; inputs.len()],
            values: Vec::new(),
            failed: 0,
            trials: options.trials,
            done: 0,
            evaluations: 0,
        })
    }

    /// Runs up to `chunk` more trials (at least one while any are left); the trials
    /// done so far.
    pub fn advance(&mut self, chunk: usize) -> usize {
        let end = (self.done + chunk.max(1)).min(self.trials);
        if self.values.capacity() == 0 && end > self.done {
            // Reserved once, bounded by MAX_TRIALS.
            self.values.reserve_exact(self.trials);
        }
        let before = self.model.evaluations();
        for _ in self.done..end {
            for (slot, input) in self.k.iter_mut().zip(&self.inputs) {
                *slot = self.rng.draw(input);
            }
            match self.model.solve(&self.k, self.x) {
                Some(root) if root.is_finite() => self.values.push(root),
                _ => self.failed += 1,
            }
        }
        self.evaluations += self.model.evaluations().saturating_sub(before);
        self.done = end;
        self.done
    }

    /// The model, to compute other things with it.
    pub fn model(&mut self) -> &mut M {
        &mut self.model
    }

    /// Trials done so far.
    pub fn done(&self) -> usize {
        self.done
    }

    /// Trials asked for.
    pub fn trials(&self) -> usize {
        self.trials
    }

    pub fn is_done(&self) -> bool {
        self.done >= self.trials
    }

    /// The result over the trials done so far.
    pub fn finish(&self) -> MonteCarlo {
        let mut values = self.values.clone();
        values.sort_by(f64::total_cmp);
        let n = values.len() as f64;
        let mean = values.iter().sum::<f64>() / n;
        let variance = values.iter().map(|v| (v - mean).powi(2)).sum::<f64>() / (n - 1.0);
        MonteCarlo {
            trials: self.done,
            failed: self.failed,
            mean,
            standard: variance.sqrt(),
            interval: coverage_interval(&values, 0.95),
            evaluations: self.evaluations,
            histogram: Histogram::of_sorted(&values),
        }
    }
}

/// The comparison of JCGM 101 §8 of the law of propagation with a Monte Carlo result
/// (`None` when every trial failed).
pub fn validate(linear: &LinearPropagation, mc: &MonteCarlo, digits: u32) -> Option<Validation> {
    if mc.trials == mc.failed {
        return None;
    }
    let delta = numerical_tolerance(linear.standard, digits);
    let half = K95 * linear.standard;
    let gum = (linear.value - half, linear.value + half);
    let d_low = (gum.0 - mc.interval.0).abs();
    let d_high = (gum.1 - mc.interval.1).abs();
    let agrees = d_low <= delta && d_high <= delta;
    let mut message = if agrees {
        format!(
            "the law of propagation is validated: both ends of its 95 % interval lie within \
             δ = {delta:e} of the Monte Carlo interval's ({d_low:.3e} and {d_high:.3e})"
        )
    } else {
        format!(
            "the law of propagation is not validated: the ends of its 95 % interval lie \
             {d_low:.3e} and {d_high:.3e} from the Monte Carlo interval's, more than \
             δ = {delta:e}; the model is not linear enough over the uncertainties, or the \
             answer is not Gaussian: use the Monte Carlo interval"
        )
    };
    if mc.failed > 0 {
        message.push_str(&format!(
            "; {} of {} trials found no root and are left out",
            mc.failed, mc.trials
        ));
    }
    Some(Validation {
        tolerance: delta,
        gum_interval: gum,
        d_low,
        d_high,
        agrees,
        message,
    })
}

/// A known of an equation text with its uncertainty.
#[derive(Debug, Clone, PartialEq)]
pub struct UncertainKnown {
    pub name: String,
    /// Standard uncertainty: absolute, in the known's unit, or relative to its value.
    pub standard: Standard,
    pub distribution: Distribution,
}

/// A standard uncertainty as given.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Standard {
    Absolute(f64),
    /// A fraction of |value| (`0.3` for 30 %).
    Relative(f64),
}

/// An equation's residual as an [`ImplicitModel`]: gradients by forward-mode
/// differentiation, roots by the default method from x0 and one Newton step from it,
/// within `bounds`. The live knowns of the residual are the uncertain ones, in order.
pub struct ResidualModel {
    residual: Residual,
    options: Options,
}

impl ResidualModel {
    pub fn new(residual: Residual, bounds: Bounds) -> ResidualModel {
        ResidualModel {
            residual,
            options: Options {
                bounds,
                ..Options::default()
            },
        }
    }
}

impl ImplicitModel for ResidualModel {
    fn gradient(&mut self, x: f64, k: &[f64], gradient: &mut [f64]) -> f64 {
        self.residual.set_knowns(k);
        self.residual.gradient(x, gradient)
    }

    fn solve(&mut self, k: &[f64], x0: f64) -> Option<f64> {
        self.residual.set_knowns(k);
        let d = self.residual.derivative(x0);
        if d.v == 0.0 {
            return Some(x0);
        }
        let mut x1 = x0 - d.v / d.d;
        let b = self.options.bounds;
        if !(x1.is_finite() && x1 != x0 && x1 >= b.lo && x1 <= b.hi) {
            x1 = x0 + 1e-3 * x0.abs().max(1e-300);
        }
        let residual = &mut self.residual;
        let s = solve(Start::Guesses(x0, x1), &self.options, |x| residual.value(x)).ok()?;
        s.converged.then_some(s.root)
    }

    fn evaluations(&self) -> usize {
        self.residual.evaluations()
    }
}

/// The uncertainty of `unknown`, defined by the one equation of `set`, from the
/// `knowns` (every other variable), some of which carry uncertainties; `x0` is a
/// start near the nominal root and `bounds` the unknown's bounds.
///
/// ```
/// use tacit::equations::EquationSet;
/// use tacit::uncertainty::*;
/// use tacit::Bounds;
/// // Ohm's law, R = V/I: relative uncertainties add in quadrature (GUM §5.1.6).
/// let set = EquationSet::parse("V = I*R").unwrap();
/// let knowns = [("V".to_string(), 12.0), ("I".to_string(), 2.0)];
/// let u = [
///     UncertainKnown { name: "V".into(), standard: Standard::Relative(0.03), distribution: Distribution::Gaussian },
///     UncertainKnown { name: "I".into(), standard: Standard::Relative(0.04), distribution: Distribution::Gaussian },
/// ];
/// let opts = UncertaintyOptions { trials: 0, ..Default::default() };
/// let r = propagate_in_set(&set, &knowns, "R", &u, 5.0, Bounds::UNBOUNDED, &opts).unwrap();
/// assert!((r.linear.value - 6.0).abs() < 1e-12);
/// assert!((r.linear.standard - 6.0 * 0.05).abs() < 1e-12);
/// ```
pub fn propagate_in_set(
    set: &EquationSet,
    knowns: &[(String, f64)],
    unknown: &str,
    uncertain: &[UncertainKnown],
    x0: f64,
    bounds: Bounds,
    options: &UncertaintyOptions,
) -> Result<UncertaintyResult, InputError> {
    let names: Vec<&str> = uncertain.iter().map(|u| u.name.as_str()).collect();
    let residual = set.residual(knowns, unknown, &names)?;
    let mut inputs = Vec::with_capacity(uncertain.len());
    for (u, &value) in uncertain.iter().zip(residual.knowns()) {
        let standard = match u.standard {
            Standard::Absolute(s) => s,
            Standard::Relative(r) => r * value.abs(),
        };
        inputs.push(UncertainInput {
            value,
            standard,
            distribution: u.distribution,
        });
    }
    let mut model = ResidualModel::new(residual, bounds);
    propagate(&mut model, &inputs, x0, options)
}
