//! Every root of f in a range, with proof: regions that cover the whole range, each
//! either a *unique* root (proven to exist and to be the only one in the region, with an
//! enclosure), *none* (proven: no root), or *undecided*, with the reason.
//!
//! **Method: interval Newton with bisection**, in one dimension (R. E. Moore, *Interval
//! Analysis*, 1966, ch. 7; A. Neumaier, *Interval Methods for Systems of Equations*,
//! 1990, §5.1; recalled from memory). A region X = [a, b] is examined with an
//! enclosure F of f over X and an enclosure D of f′ over X (both outward-rounded: see
//! [`crate::equations::interval`] and [`crate::equations::dual`]):
//! 1. 0 ∉ F: no root in X (*none*).
//!    Where D is bounded, F is narrowed by the mean-value form f(m) + D·(X − m), m the
//!    middle of X (one more enclosure of f at a point).
//! 2. F and D are defined and D bounded over X (f is then Lipschitz, so continuous,
//!    there; a pole makes D unbounded, a jump marks it undefined), 0 ∉ D: f is strictly
//!    monotone on X. With enclosures of f at both ends of opposite strict signs there is
//!    exactly one root (intermediate value theorem): *unique*; of the same strict sign,
//!    none. The root's enclosure is then narrowed by interval Newton steps
//!    N = m − F([m, m])/D, X ← X ∩ N, which never lose the root, until they stop
//!    gaining, D enclosed again over each narrower X. An end where the enclosure of f is
//!    exactly [0, 0] is itself the root.
//! 3. Otherwise X is split (a little off its middle, so that a round number such as a
//!    root at 1.0 does not fall on a split point; a split point whose value encloses 0
//!    is moved) and both parts are examined, down to a width of
//!    `x_abs + x_rel·max(|a|, |b|)`. A region that narrow still undecided says why: a
//!    pole (f unbounded), a place where f is undefined, a jump (no slope bounds f), or
//!    a derivative that may vanish (a multiple root, a tangency, or two roots closer
//!    than the width), or a root within rounding of the region's edge.
//! 4. The budget (`max_regions` examined) ends the search: what is left is undecided
//!    for that reason.
//!
//! Nothing is guessed: an undecided region is never reported as a root. Neighbouring
//! regions of the same kind and reason are merged. Each region examined costs one
//! evaluation of the enclosures of f and f′, and each end or split point one
//! evaluation of the enclosure of f at a point.
//!
//! The function is generic ([`Enclosures`]): an equation text
//! ([`proven_roots_of_set`]), a template's residual, or closures ([`FromClosures`]).

use crate::equations::program::Number;
use crate::equations::{Dual, EquationSet, Interval};
use crate::error::{require_range, InputError};

/// What the proof needs of a function of one variable.
pub trait Enclosures {
    /// f(x) in floating point (for the residual reported at a root).
    fn value(&mut self, x: f64) -> f64;
    /// Enclosures of f and of f′ over `x`.
    fn slope(&mut self, x: Interval) -> Dual<Interval>;
    /// An enclosure of f over `x` (by default the value part of [`Enclosures::slope`]).
    fn interval(&mut self, x: Interval) -> Interval {
        self.slope(x).v
    }
}

/// [`Enclosures`] from three closures: point value, interval value, slope.
pub struct FromClosures<V, I, S> {
    pub value: V,
    pub interval: I,
    pub slope: S,
}

impl<V, I, S> Enclosures for FromClosures<V, I, S>
where
    V: FnMut(f64) -> f64,
    I: FnMut(Interval) -> Interval,
    S: FnMut(Interval) -> Dual<Interval>,
{
    fn value(&mut self, x: f64) -> f64 {
        (self.value)(x)
    }
    fn slope(&mut self, x: Interval) -> Dual<Interval> {
        (self.slope)(x)
    }
    fn interval(&mut self, x: Interval) -> Interval {
        (self.interval)(x)
    }
}

impl Enclosures for crate::equations::Residual {
    fn value(&mut self, x: f64) -> f64 {
        crate::equations::Residual::value(self, x)
    }
    fn slope(&mut self, x: Interval) -> Dual<Interval> {
        crate::equations::Residual::slope(self, x)
    }
    fn interval(&mut self, x: Interval) -> Interval {
        crate::equations::Residual::interval(self, x)
    }
}

/// The largest budget of regions accepted.
pub const MAX_REGIONS: usize = 1_000_000;

/// Budget and resolution of the search.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct ProofOptions {
    /// Regions examined at most (default 20 000, at most [`MAX_REGIONS`]).
    pub max_regions: usize,
    /// A region is not split below `x_abs + x_rel·max(|a|, |b|)` (defaults 1e-12 and
    /// 1e-300).
    pub x_rel: f64,
    pub x_abs: f64,
}

impl Default for ProofOptions {
    fn default() -> Self {
        ProofOptions {
            max_regions: 20_000,
            x_rel: 1e-12,
            x_abs: 1e-300,
        }
    }
}

/// What a region holds.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub enum RegionKind {
    /// Exactly one root, proven, with its enclosure.
    Unique,
    /// No root, proven.
    None,
    /// Not decided; see [`Undecided`].
    Undecided,
}

impl RegionKind {
    pub fn code(self) -> &'static str {
        match self {
            RegionKind::Unique => "unique",
            RegionKind::None => "none",
            RegionKind::Undecided => "undecided",
        }
    }
}

/// Why a region is undecided.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub enum Undecided {
    /// f is unbounded here (a pole).
    Pole,
    /// f may be undefined here (outside the domain of a function, 0/0, …).
    Undefined,
    /// f may jump here (floor, round, sign, a switch of `when`): no slope bounds it.
    Jump,
    /// f′ may vanish here: a multiple root, a tangency, or roots closer than the
    /// resolution.
    FlatOrMultiple,
    /// A root within rounding of the edge of the region (or of the range).
    AtEdge,
    /// The budget of regions ran out before this region was examined to the end.
    Budget,
}

impl Undecided {
    pub fn code(self) -> &'static str {
        match self {
            Undecided::Pole => "pole",
            Undecided::Undefined => "undefined",
            Undecided::Jump => "jump",
            Undecided::FlatOrMultiple => "multiple-or-flat",
            Undecided::AtEdge => "root-at-edge",
            Undecided::Budget => "budget",
        }
    }

    /// In plain words.
    pub fn explain(self) -> &'static str {
        match self {
            Undecided::Pole => "f is unbounded here (a pole)",
            Undecided::Undefined => "f is undefined somewhere here",
            Undecided::Jump => "f may jump here, so no slope bounds it",
            Undecided::FlatOrMultiple => {
                "the derivative may vanish here: a multiple root, a tangency, or roots \
                 closer together than the resolution"
            }
            Undecided::AtEdge => "a root lies within rounding of the edge of this region",
            Undecided::Budget => "the budget of regions ran out before this one was decided",
        }
    }
}

/// One region of the range.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Region {
    pub kind: RegionKind,
    pub lo: f64,
    pub hi: f64,
    /// For a unique root: the best point found (the middle of the enclosure) ...
    pub root: Option<f64>,
    /// ... its enclosure (the root is proven to lie in it) ...
    pub enclosure: Option<Interval>,
    /// ... and f there in floating point.
    pub residual: Option<f64>,
    /// For an undecided region.
    pub why: Option<Undecided>,
}

/// The regions, in order, covering the range, and what the search cost.
#[derive(Debug, Clone, PartialEq)]
pub struct ProvenRoots {
    pub regions: Vec<Region>,
    /// Regions examined (evaluations of the enclosures of f and f′ over a region).
    pub regions_examined: usize,
    /// Evaluations of the enclosures of f and f′ while narrowing roots' enclosures.
    pub narrowing_slopes: usize,
    /// Evaluations of the enclosure of f at a point (ends, split and Newton points).
    pub point_enclosures: usize,
    /// Point values of f (one per root reported).
    pub point_values: usize,
}

impl ProvenRoots {
    /// The unique roots, in order.
    pub fn roots(&self) -> impl Iterator<Item = &Region> {
        self.regions.iter().filter(|r| r.kind == RegionKind::Unique)
    }

    pub fn undecided(&self) -> impl Iterator<Item = &Region> {
        self.regions
            .iter()
            .filter(|r| r.kind == RegionKind::Undecided)
    }

    /// All evaluations of any kind.
    pub fn evaluations(&self) -> usize {
        self.regions_examined + self.narrowing_slopes + self.point_enclosures + self.point_values
    }
}

/// Strict sign of an enclosure: Some(±1) when it excludes 0, Some(0) when it is exactly
/// [0, 0], None otherwise (or undefined).
fn strict_sign(f: Interval) -> Option<i8> {
    if f.maybe_undefined || f.is_empty() {
        None
    } else if f.lo > 0.0 {
        Some(1)
    } else if f.hi < 0.0 {
        Some(-1)
    } else if f.lo == 0.0 && f.hi == 0.0 {
        Some(0)
    } else {
        None
    }
}

struct Search<'a, F: Enclosures> {
    f: &'a mut F,
    options: ProofOptions,
    regions: Vec<Region>,
    examined: usize,
    /// Enclosures of f′ over a narrowing root enclosure.
    slopes: usize,
    points: usize,
    values: usize,
}

impl<F: Enclosures> Search<'_, F> {
    fn at(&mut self, x: f64) -> Interval {
        self.points += 1;
        self.f.interval(Interval::point(x))
    }

    fn push(&mut self, region: Region) {
        if let Some(last) = self.regions.last_mut() {
            let same = last.kind == region.kind && last.why == region.why;
            if same && region.kind != RegionKind::Unique {
                last.hi = region.hi;
                return;
            }
        }
        self.regions.push(region);
    }

    fn plain(kind: RegionKind, lo: f64, hi: f64, why: Option<Undecided>) -> Region {
        Region {
            kind,
            lo,
            hi,
            root: None,
            enclosure: None,
            residual: None,
            why,
        }
    }

    fn too_narrow(&self, a: f64, b: f64) -> bool {
        let limit = self.options.x_abs + self.options.x_rel * a.abs().max(b.abs());
        let m = a + (b - a) * 0.5;
        b - a <= limit || m <= a || m >= b
    }

    /// A split point a little off the middle, moved while f there encloses 0, and the
    /// strict sign of f there.
    fn split(&mut self, a: f64, b: f64) -> (f64, Option<i8>) {
        let mut last = (a + (b - a) * 0.5, None);
        for t in [0.4970703125, 0.5029296875, 0.46875, 0.53125] {
            let m = a + (b - a) * t;
            if m <= a || m >= b {
                break;
            }
            let sign = strict_sign(self.at(m));
            last = (m, sign);
            if sign.is_some_and(|s| s != 0) {
                break;
            }
        }
        last
    }

    /// Narrows the enclosure of the one root of a monotone f in [a, b] (slope
    /// enclosure `d` over [a, b], 0 ∉ d) by interval Newton steps, the slope enclosed
    /// again over each narrower interval (quadratic convergence).
    fn narrow(&mut self, mut y: Interval, mut d: Interval) -> Interval {
        for step in 0..64 {
            let m = y.lo + (y.hi - y.lo) * 0.5;
            if m <= y.lo || m >= y.hi {
                break;
            }
            if step > 0 {
                self.slopes += 1;
                let e = self.f.slope(y).d;
                // A narrower slope is still valid for y ⊆ [a, b]; keep the wider one if
                // the new one is no use.
                if !e.maybe_undefined && !e.contains_zero() && e.lo.is_finite() && e.hi.is_finite()
                {
                    d = e.intersect(d);
                }
            }
            let fm = self.at(m);
            let n = Interval::point(m).sub(fm.div(d));
            let next = y.intersect(n);
            if next.is_empty() || next.maybe_undefined {
                break;
            }
            let gained = next.width() < y.width();
            y = Interval::new(next.lo, next.hi);
            if !gained {
                break;
            }
        }
        y
    }

    fn unique(&mut self, lo: f64, hi: f64, enclosure: Interval) {
        let root = if enclosure.lo == enclosure.hi {
            enclosure.lo
        } else {
            enclosure.lo + (enclosure.hi - enclosure.lo) * 0.5
        };
        self.values += 1;
        let residual = self.f.value(root);
        self.push(Region {
            kind: RegionKind::Unique,
            lo,
            hi,
            root: Some(root),
            enclosure: Some(enclosure),
            residual: Some(residual),
            why: None,
        });
    }

    /// Why a region too narrow to split is undecided.
    fn reason(f: Interval, d: Interval, ends: [Option<i8>; 2]) -> Undecided {
        if f.lo == f64::NEG_INFINITY || f.hi == f64::INFINITY {
            Undecided::Pole
        } else if f.maybe_undefined || f.is_empty() {
            Undecided::Undefined
        } else if d.maybe_undefined {
            Undecided::Jump
        } else if !d.contains_zero() && ends.iter().any(|e| e.is_none()) {
            Undecided::AtEdge
        } else {
            Undecided::FlatOrMultiple
        }
    }

    /// Examines [a, b] and everything in it, left to right, with a stack of regions.
    fn run(&mut self, lo: f64, hi: f64) {
        // (a, b, sign of the enclosure of f at a, at b)
        let fa = self.at(lo);
        let fb = self.at(hi);
        let mut stack: Vec<(f64, f64, Option<i8>, Option<i8>)> =
            vec![(lo, hi, strict_sign(fa), strict_sign(fb))];
        while let Some((a, b, sa, sb)) = stack.pop() {
            if self.examined >= self.options.max_regions {
                self.push(Self::plain(
                    RegionKind::Undecided,
                    a,
                    b,
                    Some(Undecided::Budget),
                ));
                // Everything still on the stack lies to the right, in order.
                while let Some((a, b, _, _)) = stack.pop() {
                    self.push(Self::plain(
                        RegionKind::Undecided,
                        a,
                        b,
                        Some(Undecided::Budget),
                    ));
                }
                break;
            }
            self.examined += 1;
            let x = Interval::new(a, b);
            let e = self.f.slope(x);
            let (mut f, d) = (e.v, e.d);
            // f′ bounded over X (and f defined there): f is Lipschitz, so continuous,
            // on X. A pole makes the enclosure of f′ unbounded; a jump marks it undefined.
            let smooth = !f.maybe_undefined
                && !f.is_empty()
                && !d.maybe_undefined
                && !d.is_empty()
                && d.lo.is_finite()
                && d.hi.is_finite();
            if smooth && f.contains_zero() {
                // The mean-value form f(m) + D·(X − m) also encloses f on X, and is much
                // tighter than f's own enclosure on narrow regions.
                let m = a + (b - a) * 0.5;
                let centred = self.at(m).add(d.mul(x.sub(Interval::point(m))));
                if !centred.maybe_undefined {
                    f = f.intersect(centred);
                }
            }
            if f.is_empty() || !f.contains_zero() {
                // No defined value is 0 (undefined points are not roots).
                self.push(Self::plain(RegionKind::None, a, b, None));
                continue;
            }
            if smooth && !d.contains_zero() {
                match (sa, sb) {
                    (Some(0), _) => {
                        // f(a) = 0 exactly, and f is monotone: a is the only root.
                        self.unique(a, b, Interval::point(a));
                        continue;
                    }
                    (_, Some(0)) => {
                        self.unique(a, b, Interval::point(b));
                        continue;
                    }
                    (Some(x), Some(y)) if x == y => {
                        self.push(Self::plain(RegionKind::None, a, b, None));
                        continue;
                    }
                    (Some(_), Some(_)) => {
                        let y = self.narrow(Interval::new(a, b), d);
                        self.unique(a, b, y);
                        continue;
                    }
                    _ => {}
                }
            }
            if self.too_narrow(a, b) {
                let why = Self::reason(f, d, [sa, sb]);
                self.push(Self::plain(RegionKind::Undecided, a, b, Some(why)));
                continue;
            }
            let (m, sm) = self.split(a, b);
            // Right part first: the left one is examined next.
            stack.push((m, b, sm, sb));
            stack.push((a, m, sa, sm));
        }
    }
}

/// Every root of `f` in `[lo, hi]`, with proof (see the module documentation).
pub fn proven_roots<F: Enclosures>(
    lo: f64,
    hi: f64,
    options: &ProofOptions,
    f: &mut F,
) -> Result<ProvenRoots, InputError> {
    require_range(lo, hi)?;
    if !(1..=MAX_REGIONS).contains(&options.max_regions) {
        return Err(InputError::new(
            "bad-budget",
            format!(
                "max_regions must be from 1 to {MAX_REGIONS}, got {}",
                options.max_regions
            ),
        ));
    }
    for (name, v) in [("x_rel", options.x_rel), ("x_abs", options.x_abs)] {
        if !(v.is_finite() && v >= 0.0) {
            return Err(InputError::new(
                "bad-tolerance",
                format!("{name} must be a finite number ≥ 0, got {v}"),
            ));
        }
    }
    let mut search = Search {
        f,
        options: *options,
        regions: Vec::new(),
        examined: 0,
        slopes: 0,
        points: 0,
        values: 0,
    };
    search.run(lo, hi);
    Ok(ProvenRoots {
        regions: search.regions,
        regions_examined: search.examined,
        narrowing_slopes: search.slopes,
        point_enclosures: search.points,
        point_values: search.values,
    })
}

/// Every root of the one equation of `set` in its `unknown` over `[lo, hi]`, every other
/// variable given in `knowns`.
///
/// ```
/// use tacit::equations::EquationSet;
/// use tacit::proven_roots::{proven_roots_of_set, ProofOptions};
/// let set = EquationSet::parse("x^2 = a").unwrap();
/// let r = proven_roots_of_set(&set, &[("a".into(), 2.0)], "x", -3.0, 3.0, &ProofOptions::default()).unwrap();
/// let roots: Vec<f64> = r.roots().map(|g| g.root.unwrap()).collect();
/// assert_eq!(roots.len(), 2);
/// assert!((roots[1] - 2f64.sqrt()).abs() < 1e-15);
/// ```
pub fn proven_roots_of_set(
    set: &EquationSet,
    knowns: &[(String, f64)],
    unknown: &str,
    lo: f64,
    hi: f64,
    options: &ProofOptions,
) -> Result<ProvenRoots, InputError> {
    let mut residual = set.residual(knowns, unknown, &[])?;
    proven_roots(lo, hi, options, &mut residual)
}
