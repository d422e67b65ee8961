//! What the bracketing methods share: the midpoint, and the gap of undefined values
//! (NaN) that a bracket may hold.
//!
//! A NaN inside a bracket [lo, hi] marks a domain wall: f has no sign there. The sign
//! change lies in the defined stretch to the left of the gap, in the one to its right,
//! or across the gap itself. [`Gap::next_point`] halves the wider defined stretch until
//! a point of the other sign turns up (a bracket free of the gap again) or both walls
//! are located to tolerance; then f changes sign across a stretch where it is not
//! defined, which the solve reports as a discontinuity, not a root.

/// The midpoint of [a, b], without overflow for ends near ±f64::MAX.
pub fn midpoint(a: f64, b: f64) -> f64 {
    let m = a + (b - a) / 2.0;
    if m.is_finite() {
        m
    } else {
        a / 2.0 + b / 2.0
    }
}

/// Points inside a bracket where f was NaN: the outermost ones, assumed to bound one
/// contiguous undefined stretch.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Gap {
    pub lo: f64,
    pub hi: f64,
}

impl Gap {
    pub fn at(x: f64) -> Gap {
        Gap { lo: x, hi: x }
    }

    /// Takes in another undefined point.
    pub fn widen(&mut self, x: f64) {
        self.lo = self.lo.min(x);
        self.hi = self.hi.max(x);
    }

    /// The gap once the bracket has become [lo, hi]: `None` when it lies outside.
    pub fn within(self, lo: f64, hi: f64) -> Option<Gap> {
        (self.lo > lo && self.hi < hi).then_some(self)
    }

    /// The next point to evaluate: the midpoint of the wider defined stretch between
    /// the bracket's ends and the gap whose width is still above twice the tolerance.
    /// `None` when both walls are located.
    pub fn next_point(self, lo: f64, hi: f64, tol: impl Fn(f64) -> f64) -> Option<f64> {
        let open = |a: f64, b: f64| {
            let m = midpoint(a, b);
            (m > a && m < b && b - a > 2.0 * tol(m)).then_some((b - a, m))
        };
        match (open(lo, self.lo), open(self.hi, hi)) {
            (Some((wl, ml)), Some((wr, mr))) => Some(if wl >= wr { ml } else { mr }),
            (Some((_, m)), None) | (None, Some((_, m))) => Some(m),
            (None, None) => None,
        }
    }
}

/// A bracket with one end undefined (NaN): the search moves in from that end (the
/// wall) until a value of the other sign than the defined end turns up, which makes a
/// proper bracket, or the wall is located to tolerance.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct WallSeek {
    /// The innermost point known to be undefined.
    pub wall: f64,
    /// The innermost defined point, and its value (non-zero, not NaN).
    pub far: f64,
    pub f_far: f64,
}

/// What a value told to a [`WallSeek`] leads to.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Sought {
    /// Keep looking.
    Continue,
    /// A bracket: (x, f(x)) and the defined end, of opposite signs.
    Bracket((f64, f64), (f64, f64)),
    /// f is exactly zero here.
    Zero(f64),
}

impl WallSeek {
    /// From the bracket's two ends if exactly one is NaN and the other has a sign.
    pub fn from_ends(a: (f64, f64), b: (f64, f64)) -> Option<WallSeek> {
        let defined = |f: f64| !f.is_nan() && f != 0.0;
        match (a.1.is_nan(), b.1.is_nan()) {
            (true, false) if defined(b.1) => Some(WallSeek {
                wall: a.0,
                far: b.0,
                f_far: b.1,
            }),
            (false, true) if defined(a.1) => Some(WallSeek {
                wall: b.0,
                far: a.0,
                f_far: a.1,
            }),
            _ => None,
        }
    }

    /// The next point, or `None` when the wall is located.
    pub fn next_point(&self, tol: impl Fn(f64) -> f64) -> Option<f64> {
        let m = midpoint(self.wall, self.far);
        let (lo, hi) = (self.wall.min(self.far), self.wall.max(self.far));
        (m > lo && m < hi && hi - lo > 2.0 * tol(m)).then_some(m)
    }

    pub fn tell(&mut self, x: f64, fx: f64) -> Sought {
        if fx == 0.0 {
            Sought::Zero(x)
        } else if fx.is_nan() {
            self.wall = x;
            Sought::Continue
        } else if (fx < 0.0) != (self.f_far < 0.0) {
            Sought::Bracket((x, fx), (self.far, self.f_far))
        } else {
            self.far = x;
            self.f_far = fx;
            Sought::Continue
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn midpoint_without_overflow() {
        assert_eq!(midpoint(-f64::MAX, f64::MAX), 0.0);
        assert_eq!(midpoint(1.0, 2.0), 1.5);
    }

    #[test]
    fn gap_walls_are_located() {
        // f undefined on (1, 2) inside the bracket [0, 3]: halving the defined
        // stretches closes on both walls.
        let mut g = Gap::at(1.5);
        let (mut lo, mut hi) = (0.0f64, 3.0f64);
        let tol = |_x: f64| 1e-9;
        let mut n = 0;
        while let Some(x) = g.next_point(lo, hi, tol) {
            n += 1;
            assert!(n < 200);
            if x > 1.0 && x < 2.0 {
                g.widen(x);
            } else if x <= 1.0 {
                lo = x;
            } else {
                hi = x;
            }
        }
        assert!(
            (g.lo - 1.0).abs() < 1e-8 && (g.hi - 2.0).abs() < 1e-8,
            "{g:?}"
        );
        assert!(g.within(lo, hi).is_some());
    }
}
