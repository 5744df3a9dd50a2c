//! One numeric abstraction for both paths.
//!
//! Every algorithm in the crate is written once, generic over
//! [`ComplexField`], and runs either on [`num_complex::Complex64`] (double
//! precision, for speed inside other codes) or on [`rug::Complex`] (MPC, any
//! precision). The precision of a `rug` value is carried by the value; new
//! constants are made at an explicit precision in bits, which the `f64` path
//! ignores. Ownership-consuming operators (`a * &b`) let `rug` reuse the
//! allocation of `a`, so the generic code allocates no more than hand-written
//! MPC code would.
//!
//! [`RealField`] is the matching real type (`f64`, [`rug::Float`]), used for
//! quadrature nodes and weights and wherever only real arithmetic is needed.

mod double;
mod multi;
#[doc(hidden)]
pub mod tables;

use std::fmt::Debug;
use std::ops::{Add, AddAssign, Div, DivAssign, Mul, MulAssign, Neg, Sub, SubAssign};

/// Real numbers of either path: `f64` or [`rug::Float`].
pub trait RealField:
    Clone
    + Debug
    + Send
    + Sync
    + PartialOrd
    + 'static
    + Add<Output = Self>
    + Sub<Output = Self>
    + Mul<Output = Self>
    + Div<Output = Self>
    + Neg<Output = Self>
    + for<'a> Add<&'a Self, Output = Self>
    + for<'a> Sub<&'a Self, Output = Self>
    + for<'a> Mul<&'a Self, Output = Self>
    + for<'a> Div<&'a Self, Output = Self>
    + for<'a> AddAssign<&'a Self>
    + for<'a> SubAssign<&'a Self>
    + for<'a> MulAssign<&'a Self>
    + for<'a> DivAssign<&'a Self>
{
    /// The greatest precision (bits) this type can carry, if bounded.
    const MAX_PREC: Option<u32>;
    /// Precision in bits (53 for `f64`).
    fn prec(&self) -> u32;
    /// `x` at precision `prec` (exact: every `f64` is representable).
    fn from_f64(x: f64, prec: u32) -> Self;
    /// The integer `n` at precision `prec`.
    fn from_i64(n: i64, prec: u32) -> Self;
    /// The rational `q` at precision `prec`, correctly rounded.
    fn from_rational(q: &rug::Rational, prec: u32) -> Self;
    /// π at precision `prec`.
    fn pi(prec: u32) -> Self;
    /// Rounded to `f64`.
    fn to_f64(&self) -> f64;
    /// `log2 |x|` without overflow (−∞ at zero).
    fn log2_abs(&self) -> f64;
    /// Whether finite.
    fn is_finite(&self) -> bool;
    /// Whether exactly zero.
    fn is_zero(&self) -> bool;
    /// A copy rounded (or extended) to `prec` bits.
    fn with_prec(&self, prec: u32) -> Self;
    /// `x · 2^e`, exact.
    fn mul_pow2(self, e: i32) -> Self;
    /// `x · n`.
    fn mul_i64(self, n: i64) -> Self;
    /// `x / n`.
    fn div_i64(self, n: i64) -> Self;
    /// `x + n`.
    fn add_i64(self, n: i64) -> Self;
    /// Natural logarithm.
    fn ln(&self) -> Self;
    /// Exponential.
    fn exp(&self) -> Self;
    /// Square root.
    fn sqrt(&self) -> Self;
    /// Hyperbolic sine and cosine together.
    fn sinh_cosh(&self) -> (Self, Self);
    /// Hyperbolic tangent.
    fn tanh(&self) -> Self;
    /// Absolute value.
    fn abs(&self) -> Self;
    /// Rounded from an MPFR number (exact for `Float`, nearest for `f64`).
    fn from_float(x: &rug::Float) -> Self;
    /// Calls `f` with a cached table of at least `len` entries of `kind` at
    /// precision `prec`, building it with `build(prec, len)` when missing.
    #[doc(hidden)]
    fn with_table<T>(
        kind: tables::TableKind,
        prec: u32,
        len: usize,
        build: impl FnOnce(u32, usize) -> Vec<Self>,
        f: impl FnOnce(&[Self]) -> T,
    ) -> T;
}

/// Complex numbers of either path: [`num_complex::Complex64`] or
/// [`rug::Complex`].
///
/// ```
/// use dressing::num::ComplexField;
/// fn square_plus_one<C: ComplexField>(z: &C) -> C {
///     z.clone() * z + &C::from_i64(1, z.prec())
/// }
/// let d = square_plus_one(&num_complex::Complex64::new(0.0, 2.0));
/// assert_eq!(d.re, -3.0);
/// let m = square_plus_one(&rug::Complex::with_val(300, (0, 2)));
/// assert_eq!(m.real().to_f64(), -3.0);
/// ```
pub trait ComplexField:
    Clone
    + Debug
    + Send
    + Sync
    + 'static
    + Add<Output = Self>
    + Sub<Output = Self>
    + Mul<Output = Self>
    + Div<Output = Self>
    + Neg<Output = Self>
    + for<'a> Add<&'a Self, Output = Self>
    + for<'a> Sub<&'a Self, Output = Self>
    + for<'a> Mul<&'a Self, Output = Self>
    + for<'a> Div<&'a Self, Output = Self>
    + for<'a> AddAssign<&'a Self>
    + for<'a> SubAssign<&'a Self>
    + for<'a> MulAssign<&'a Self>
    + for<'a> DivAssign<&'a Self>
{
    /// The matching real type.
    type Real: RealField;
    /// The greatest precision (bits) this type can carry, if bounded.
    const MAX_PREC: Option<u32>;

    /// Precision in bits (53 for `Complex64`).
    fn prec(&self) -> u32;
    /// `re + i·im` at precision `prec`.
    fn from_f64(re: f64, im: f64, prec: u32) -> Self;
    /// The integer `n` at precision `prec`.
    fn from_i64(n: i64, prec: u32) -> Self;
    /// `re + i·im` from reals (at the precision of `re`).
    fn from_reals(re: Self::Real, im: Self::Real) -> Self;
    /// The rational `q` at precision `prec`.
    fn from_rational(q: &rug::Rational, prec: u32) -> Self {
        Self::from_reals(
            Self::Real::from_rational(q, prec),
            Self::Real::from_f64(0.0, prec),
        )
    }
    /// π at precision `prec`.
    fn pi(prec: u32) -> Self {
        Self::from_reals(Self::Real::pi(prec), Self::Real::from_f64(0.0, prec))
    }
    /// Real part.
    fn re(&self) -> Self::Real;
    /// Imaginary part.
    fn im(&self) -> Self::Real;
    /// Real part as `f64`.
    fn re_f64(&self) -> f64;
    /// Imaginary part as `f64`.
    fn im_f64(&self) -> f64;
    /// `log2 |z|` without overflow (−∞ at zero).
    fn log2_abs(&self) -> f64;
    /// Principal argument in `(−π, π]` as `f64`, without overflow.
    fn arg_f64(&self) -> f64;
    /// Whether both parts are finite.
    fn is_finite(&self) -> bool;
    /// Whether exactly zero.
    fn is_zero(&self) -> bool;
    /// A copy rounded (or extended) to `prec` bits.
    fn with_prec(&self, prec: u32) -> Self;
    /// Complex conjugate.
    fn conj(self) -> Self;
    /// `i · z`.
    fn mul_i(self) -> Self;
    /// `z · 2^e`, exact.
    fn mul_pow2(self, e: i32) -> Self;
    /// `z · n`.
    fn mul_i64(self, n: i64) -> Self;
    /// `z / n`.
    fn div_i64(self, n: i64) -> Self;
    /// `z + n`.
    fn add_i64(self, n: i64) -> Self;
    /// `z · x` for real `x`.
    fn mul_real(self, x: &Self::Real) -> Self;
    /// `z + x` for real `x`.
    fn add_real(self, x: &Self::Real) -> Self;
    /// `1 / z`.
    fn recip(self) -> Self;
    /// `z²`.
    fn square(self) -> Self;
    /// Principal natural logarithm (imaginary part in `(−π, π]`).
    fn ln(&self) -> Self;
    /// Exponential.
    fn exp(&self) -> Self;
    /// Principal square root.
    fn sqrt(&self) -> Self;
    /// Sine.
    fn sin(&self) -> Self;
    /// Cosine.
    fn cos(&self) -> Self;
    /// Sine and cosine together.
    fn sin_cos(&self) -> (Self, Self);
    /// Principal power `z^w = exp(w log z)`.
    fn pow(&self, w: &Self) -> Self;
    /// Integer power by repeated squaring.
    fn powi(&self, n: i64) -> Self {
        let prec = self.prec();
        if n == 0 {
            return Self::from_i64(1, prec);
        }
        let mut base = if n < 0 {
            self.clone().recip()
        } else {
            self.clone()
        };
        let mut e = n.unsigned_abs();
        let mut acc = Self::from_i64(1, prec);
        loop {
            if e & 1 == 1 {
                acc *= &base;
            }
            e >>= 1;
            if e == 0 {
                break;
            }
            base = base.square();
        }
        acc
    }
    /// Writes the value with `digits` significant digits, as `re + im i`.
    fn to_decimal(&self, digits: usize) -> String;
    /// The value as a [`rug::Complex`], exactly (at the value's own precision).
    fn to_complex(&self) -> rug::Complex;
}

pub use multi::MpComplex;

/// The nearest integer to `x` if `x` is an integer exactly, else `None`.
pub(crate) fn exact_integer<R: RealField>(x: &R) -> Option<i64> {
    let f = x.to_f64();
    if !f.is_finite() || f.abs() > 9.0e15 {
        return None;
    }
    let n = f.round();
    let d = x.clone().add_i64(-(n as i64));
    if d.is_zero() {
        Some(n as i64)
    } else {
        None
    }
}
