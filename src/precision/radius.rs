//! Error magnitudes with an exponent range wide enough for any precision.

use std::fmt;

/// A non-negative error magnitude, stored as its base-2 logarithm so that
/// radii like 10^-1000 (below the range of `f64`) are representable.
///
/// ```
/// use dressing::Radius;
/// let r = Radius::from_f64(1e-20) + Radius::from_log2(-4000.0);
/// assert!((r.to_f64() - 1e-20).abs() < 1e-30);
/// assert!(Radius::from_log2(-4000.0).to_f64() == 0.0);
/// assert_eq!(format!("{}", Radius::from_f64(2.5e-7)), "2.5e-7");
/// ```
#[derive(Clone, Copy, Debug, PartialEq, PartialOrd)]
pub struct Radius(f64);

impl Radius {
    /// Exactly zero.
    pub const ZERO: Radius = Radius(f64::NEG_INFINITY);

    /// From a value; negative inputs are taken by magnitude, NaN becomes infinity
    /// (an error estimate that is unknown is unbounded).
    pub fn from_f64(x: f64) -> Radius {
        if x.is_nan() {
            Radius(f64::INFINITY)
        } else {
            Radius(x.abs().log2())
        }
    }

    /// `2^l`.
    pub fn from_log2(l: f64) -> Radius {
        Radius(if l.is_nan() { f64::INFINITY } else { l })
    }

    /// `log2` of the magnitude (−∞ for zero).
    pub fn log2(self) -> f64 {
        self.0
    }

    /// `log10` of the magnitude.
    pub fn log10(self) -> f64 {
        self.0 * std::f64::consts::LOG10_2
    }

    /// As an `f64`; underflows to 0 and overflows to infinity.
    pub fn to_f64(self) -> f64 {
        self.0.exp2()
    }

    /// Multiplies by `2^e`.
    pub fn scale_log2(self, e: f64) -> Radius {
        Radius(self.0 + e)
    }

    /// Multiplies by a non-negative factor.
    pub fn times(self, factor: f64) -> Radius {
        Radius(self.0 + factor.abs().log2())
    }

    /// Whether this is exactly zero.
    pub fn is_zero(self) -> bool {
        self.0 == f64::NEG_INFINITY
    }

    /// Whether this is finite (a usable estimate).
    pub fn is_finite(self) -> bool {
        self.0 < f64::INFINITY
    }

    /// The larger of two radii.
    pub fn max(self, other: Radius) -> Radius {
        if self.0 >= other.0 {
            self
        } else {
            other
        }
    }
}

impl std::ops::Add for Radius {
    type Output = Radius;
    fn add(self, o: Radius) -> Radius {
        let (hi, lo) = if self.0 >= o.0 {
            (self.0, o.0)
        } else {
            (o.0, self.0)
        };
        if lo == f64::NEG_INFINITY || hi == f64::INFINITY {
            return Radius(hi);
        }
        Radius(hi + (lo - hi).exp2().ln_1p() * std::f64::consts::LOG2_E)
    }
}

impl std::ops::AddAssign for Radius {
    fn add_assign(&mut self, o: Radius) {
        *self = *self + o;
    }
}

impl std::ops::Mul for Radius {
    type Output = Radius;
    fn mul(self, o: Radius) -> Radius {
        if self.is_zero() || o.is_zero() {
            return Radius::ZERO;
        }
        Radius(self.0 + o.0)
    }
}

impl fmt::Display for Radius {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        if self.is_zero() {
            return write!(f, "0");
        }
        if !self.is_finite() {
            return write!(f, "inf");
        }
        let l10 = self.log10();
        let mut e = l10.floor();
        let mut m = 10f64.powf(l10 - e);
        if (m * 10.0).round() >= 100.0 {
            m /= 10.0;
            e += 1.0;
        }
        write!(f, "{:.1}e{}", m, e as i64)
    }
}
