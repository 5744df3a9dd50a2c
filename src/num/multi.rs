//! The arbitrary-precision path: `rug::Float` (MPFR) and `rug::Complex` (MPC).

use super::tables::{TableCache, TableKind};
use super::{ComplexField, RealField};
use rug::float::Constant;
use rug::ops::Pow;
use rug::{Complex, Float};
use std::sync::OnceLock;

/// The arbitrary-precision complex type, MPC through `rug`.
pub type MpComplex = Complex;

/// `log2 |x|` of an MPFR number from its mantissa and exponent.
fn float_log2_abs(x: &Float) -> f64 {
    if x.is_zero() {
        return f64::NEG_INFINITY;
    }
    if !x.is_finite() {
        return f64::INFINITY;
    }
    let (m, e) = x.to_f64_exp();
    m.abs().log2() + e as f64
}

impl RealField for Float {
    const MAX_PREC: Option<u32> = None;
    #[inline]
    fn prec(&self) -> u32 {
        Float::prec(self)
    }
    fn from_f64(x: f64, prec: u32) -> Self {
        Float::with_val(prec, x)
    }
    fn from_i64(n: i64, prec: u32) -> Self {
        Float::with_val(prec, n)
    }
    fn from_rational(q: &rug::Rational, prec: u32) -> Self {
        Float::with_val(prec, q)
    }
    fn pi(prec: u32) -> Self {
        Float::with_val(prec, Constant::Pi)
    }
    fn to_f64(&self) -> f64 {
        Float::to_f64(self)
    }
    fn log2_abs(&self) -> f64 {
        float_log2_abs(self)
    }
    fn is_finite(&self) -> bool {
        Float::is_finite(self)
    }
    fn is_zero(&self) -> bool {
        Float::is_zero(self)
    }
    fn with_prec(&self, prec: u32) -> Self {
        Float::with_val(prec, self)
    }
    fn mul_pow2(self, e: i32) -> Self {
        self << e
    }
    fn mul_i64(self, n: i64) -> Self {
        self * n
    }
    fn div_i64(self, n: i64) -> Self {
        self / n
    }
    fn add_i64(self, n: i64) -> Self {
        self + n
    }
    fn ln(&self) -> Self {
        self.clone().ln()
    }
    fn exp(&self) -> Self {
        self.clone().exp()
    }
    fn sqrt(&self) -> Self {
        self.clone().sqrt()
    }
    fn sinh_cosh(&self) -> (Self, Self) {
        let mut s = self.clone();
        let mut c = Float::new(Float::prec(self));
        s.sinh_cosh_mut(&mut c);
        (s, c)
    }
    fn tanh(&self) -> Self {
        self.clone().tanh()
    }
    fn abs(&self) -> Self {
        self.clone().abs()
    }
    fn from_float(x: &Float) -> Self {
        x.clone()
    }
    fn with_table<T>(
        kind: TableKind,
        prec: u32,
        len: usize,
        build: impl FnOnce(u32, usize) -> Vec<Self>,
        f: impl FnOnce(&[Self]) -> T,
    ) -> T {
        let t = MP_TABLES
            .get_or_init(TableCache::new)
            .get(kind, prec, len, |n| build(prec, n));
        f(&t)
    }
}

static MP_TABLES: OnceLock<TableCache<Float>> = OnceLock::new();

impl ComplexField for Complex {
    type Real = Float;
    const MAX_PREC: Option<u32> = None;
    #[inline]
    fn prec(&self) -> u32 {
        Complex::prec(self).0
    }
    fn from_f64(re: f64, im: f64, prec: u32) -> Self {
        Complex::with_val(prec, (re, im))
    }
    fn from_i64(n: i64, prec: u32) -> Self {
        Complex::with_val(prec, n)
    }
    fn from_reals(re: Float, im: Float) -> Self {
        let p = re.prec();
        Complex::with_val(p, (re, im))
    }
    fn from_rational(q: &rug::Rational, prec: u32) -> Self {
        Complex::with_val(prec, q)
    }
    fn pi(prec: u32) -> Self {
        Complex::with_val(prec, Constant::Pi)
    }
    fn re(&self) -> Float {
        self.real().clone()
    }
    fn im(&self) -> Float {
        self.imag().clone()
    }
    fn re_f64(&self) -> f64 {
        self.real().to_f64()
    }
    fn im_f64(&self) -> f64 {
        self.imag().to_f64()
    }
    fn log2_abs(&self) -> f64 {
        let a = float_log2_abs(self.real());
        let b = float_log2_abs(self.imag());
        let (hi, lo) = if a >= b { (a, b) } else { (b, a) };
        if lo == f64::NEG_INFINITY || hi == f64::INFINITY {
            return hi;
        }
        hi + 0.5 * (1.0 + (2.0 * (lo - hi)).exp2()).log2()
    }
    fn arg_f64(&self) -> f64 {
        let (re, im) = (self.real(), self.imag());
        if im.is_zero() {
            return if re.is_sign_negative() && !re.is_zero() {
                if im.is_sign_negative() {
                    -std::f64::consts::PI
                } else {
                    std::f64::consts::PI
                }
            } else {
                0.0
            };
        }
        if re.is_zero() {
            return std::f64::consts::FRAC_PI_2.copysign(im.to_f64());
        }
        let (mr, er) = re.to_f64_exp();
        let (mi, ei) = im.to_f64_exp();
        let e = er.max(ei);
        let y = mi * 2f64.powi((ei - e).max(-1100));
        let x = mr * 2f64.powi((er - e).max(-1100));
        y.atan2(x)
    }
    fn is_finite(&self) -> bool {
        self.real().is_finite() && self.imag().is_finite()
    }
    fn is_zero(&self) -> bool {
        self.real().is_zero() && self.imag().is_zero()
    }
    fn with_prec(&self, prec: u32) -> Self {
        Complex::with_val(prec, self)
    }
    fn conj(self) -> Self {
        Complex::conj(self)
    }
    fn mul_i(self) -> Self {
        Complex::mul_i(self, false)
    }
    fn mul_pow2(self, e: i32) -> Self {
        self << e
    }
    fn mul_i64(self, n: i64) -> Self {
        self * n
    }
    fn div_i64(self, n: i64) -> Self {
        self / n
    }
    fn add_i64(self, n: i64) -> Self {
        self + n
    }
    fn mul_real(self, x: &Float) -> Self {
        self * x
    }
    fn add_real(self, x: &Float) -> Self {
        self + x
    }
    fn recip(self) -> Self {
        Complex::recip(self)
    }
    fn square(self) -> Self {
        Complex::square(self)
    }
    fn ln(&self) -> Self {
        self.clone().ln()
    }
    fn exp(&self) -> Self {
        self.clone().exp()
    }
    fn sqrt(&self) -> Self {
        self.clone().sqrt()
    }
    fn sin(&self) -> Self {
        self.clone().sin()
    }
    fn cos(&self) -> Self {
        self.clone().cos()
    }
    fn sin_cos(&self) -> (Self, Self) {
        let mut s = self.clone();
        let mut c = Complex::new(Complex::prec(self));
        s.sin_cos_mut(&mut c);
        (s, c)
    }
    fn pow(&self, w: &Self) -> Self {
        self.clone().pow(w)
    }
    fn to_complex(&self) -> rug::Complex {
        self.clone()
    }
    fn to_decimal(&self, digits: usize) -> String {
        let d = digits.max(1);
        let re = self.real().to_string_radix(10, Some(d));
        let im = self.imag().to_string_radix(10, Some(d));
        if im.starts_with('-') {
            format!("{re} {im}i")
        } else {
            format!("{re} +{im}i")
        }
    }
}
