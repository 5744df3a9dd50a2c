//! The precision model.
//!
//! Callers say how many bits (or decimal digits) they want with a [`Prec`];
//! routines add guard bits of their own, work at the higher precision and
//! return an [`Approx`]: the value rounded to the requested precision, the
//! precision it carries, and a [`Radius`], an estimate of `|computed − exact|`.
//!
//! The radius is an *estimate*, not a rigorous ball as in interval
//! arithmetic: truncation errors are bounded from the theory of each method
//! (Stirling remainder bounds, Euler–Maclaurin remainders, convergence of
//! successive quadrature levels) and rounding errors are estimated from the
//! number of operations and the size of the intermediate terms. Tests compare
//! it against independent references.

mod radius;

pub use radius::Radius;

use crate::error::{Error, Result};

/// A requested precision, in bits of the significand.
///
/// ```
/// use dressing::Prec;
/// let p = Prec::digits(50).unwrap();
/// assert_eq!(p.bits(), 167);
/// assert!(Prec::digits(0).is_err());
/// ```
#[derive(Clone, Copy, Debug, PartialEq, Eq, PartialOrd, Ord, Hash)]
pub struct Prec(u32);

impl Prec {
    /// The cap: 70 000 bits, about 21 000 decimal digits. Above it the
    /// Bernoulli tables and shift products grow beyond what this crate is
    /// tuned and tested for.
    pub const MAX_BITS: u32 = 70_000;

    /// IEEE double precision, 53 bits.
    pub const DOUBLE: Prec = Prec(53);

    /// A precision of `bits` bits; errors on 0 or above [`Prec::MAX_BITS`].
    ///
    /// ```
    /// assert_eq!(dressing::Prec::from_bits(200).unwrap().bits(), 200);
    /// ```
    pub fn from_bits(bits: u64) -> Result<Prec> {
        if bits == 0 {
            return Err(Error::ZeroPrecision);
        }
        if bits > Self::MAX_BITS as u64 {
            return Err(Error::PrecisionTooHigh {
                requested_bits: bits,
                max_bits: Self::MAX_BITS,
            });
        }
        Ok(Prec(bits as u32))
    }

    /// Enough bits for `digits` correct significant decimal digits:
    /// `ceil(digits · log2 10)`.
    ///
    /// ```
    /// assert_eq!(dressing::Prec::digits(15).unwrap().bits(), 50);
    /// ```
    pub fn digits(digits: u64) -> Result<Prec> {
        if digits == 0 {
            return Err(Error::ZeroPrecision);
        }
        let bits = (digits as f64 * std::f64::consts::LOG2_10).ceil();
        if bits > Self::MAX_BITS as f64 {
            return Err(Error::PrecisionTooHigh {
                requested_bits: bits as u64,
                max_bits: Self::MAX_BITS,
            });
        }
        Ok(Prec(bits as u32))
    }

    /// The number of bits.
    ///
    /// ```
    /// assert_eq!(dressing::Prec::DOUBLE.bits(), 53);
    /// ```
    pub fn bits(self) -> u32 {
        self.0
    }

    /// The number of decimal digits these bits carry, `floor(bits · log10 2)`.
    ///
    /// ```
    /// assert_eq!(dressing::Prec::DOUBLE.decimal_digits(), 15);
    /// ```
    pub fn decimal_digits(self) -> u32 {
        (self.0 as f64 * std::f64::consts::LOG10_2).floor() as u32
    }

    /// This precision plus `guard` bits (not capped: guard bits are internal).
    pub(crate) fn with_guard(self, guard: u32) -> u32 {
        self.0.saturating_add(guard)
    }
}

/// A computed value together with the precision it carries and an
/// estimate of its absolute error.
///
/// ```
/// use dressing::{special::log_gamma, Prec};
/// use num_complex::Complex64;
/// let r = log_gamma(&Complex64::new(3.0, 0.0), Prec::DOUBLE).unwrap();
/// assert!((r.value.re - 2f64.ln()).abs() <= r.radius.to_f64().max(1e-16));
/// assert_eq!(r.prec, 53);
/// ```
#[derive(Clone, Debug, PartialEq)]
pub struct Approx<T> {
    /// The value, rounded to `prec` bits.
    pub value: T,
    /// Estimated bound on `|value − exact|`.
    pub radius: Radius,
    /// Bits of precision the value carries.
    pub prec: u32,
}

impl<T> Approx<T> {
    /// Builds an approximation.
    pub fn new(value: T, radius: Radius, prec: u32) -> Self {
        Approx {
            value,
            radius,
            prec,
        }
    }

    /// Maps the value, keeping radius and precision (for exact maps such as
    /// conjugation or negation).
    pub fn map<U>(self, f: impl FnOnce(T) -> U) -> Approx<U> {
        Approx {
            value: f(self.value),
            radius: self.radius,
            prec: self.prec,
        }
    }
}

impl<T: crate::num::ComplexField> Approx<T> {
    /// Estimated number of correct significant decimal digits,
    /// `−log10(radius / |value|)`, capped at the digits `prec` carries.
    /// Where the value is zero, the digits of absolute accuracy.
    ///
    /// ```
    /// use dressing::{special::log_gamma, Prec};
    /// let r = log_gamma(&rug::Complex::with_val(200, (2.5, 1.0)), Prec::digits(40).unwrap()).unwrap();
    /// assert!(r.correct_digits() >= 40.0);
    /// ```
    pub fn correct_digits(&self) -> f64 {
        let cap = self.prec as f64 * std::f64::consts::LOG10_2;
        let mag = self.value.log2_abs();
        let rad = self.radius.log2();
        let rel = if mag.is_finite() { rad - mag } else { rad };
        (-rel * std::f64::consts::LOG10_2).min(cap)
    }

    /// Whether the estimated relative error is within `2^-bits` (absolute,
    /// where the value is zero).
    pub fn meets(&self, bits: u32) -> bool {
        self.correct_digits() >= bits as f64 * std::f64::consts::LOG10_2 - 1e-9
    }
}
