//! The double-precision path: `f64` and `Complex64`.

use super::tables::{TableCache, TableKind};
use super::{ComplexField, RealField};
use num_complex::Complex64;
use std::sync::OnceLock;

impl RealField for f64 {
    const MAX_PREC: Option<u32> = Some(53);
    #[inline]
    fn prec(&self) -> u32 {
        53
    }
    #[inline]
    fn from_f64(x: f64, _prec: u32) -> Self {
        x
    }
    #[inline]
    fn from_i64(n: i64, _prec: u32) -> Self {
        n as f64
    }
    fn from_rational(q: &rug::Rational, _prec: u32) -> Self {
        q.to_f64()
    }
    #[inline]
    fn pi(_prec: u32) -> Self {
        std::f64::consts::PI
    }
    #[inline]
    fn to_f64(&self) -> f64 {
        *self
    }
    #[inline]
    fn log2_abs(&self) -> f64 {
        self.abs().log2()
    }
    #[inline]
    fn is_finite(&self) -> bool {
        f64::is_finite(*self)
    }
    #[inline]
    fn is_zero(&self) -> bool {
        *self == 0.0
    }
    #[inline]
    fn with_prec(&self, _prec: u32) -> Self {
        *self
    }
    #[inline]
    fn mul_pow2(self, e: i32) -> Self {
        self * 2f64.powi(e)
    }
    #[inline]
    fn mul_i64(self, n: i64) -> Self {
        self * n as f64
    }
    #[inline]
    fn div_i64(self, n: i64) -> Self {
        self / n as f64
    }
    #[inline]
    fn add_i64(self, n: i64) -> Self {
        self + n as f64
    }
    #[inline]
    fn ln(&self) -> Self {
        f64::ln(*self)
    }
    #[inline]
    fn exp(&self) -> Self {
        f64::exp(*self)
    }
    #[inline]
    fn sqrt(&self) -> Self {
        f64::sqrt(*self)
    }
    #[inline]
    fn sinh_cosh(&self) -> (Self, Self) {
        (f64::sinh(*self), f64::cosh(*self))
    }
    #[inline]
    fn tanh(&self) -> Self {
        f64::tanh(*self)
    }
    #[inline]
    fn abs(&self) -> Self {
        f64::abs(*self)
    }
    fn from_float(x: &rug::Float) -> Self {
        x.to_f64()
    }
    #[inline]
    fn with_table<T>(
        kind: TableKind,
        _prec: u32,
        len: usize,
        build: impl FnOnce(u32, usize) -> Vec<Self>,
        f: impl FnOnce(&[Self]) -> T,
    ) -> T {
        // Double-precision tables are built once, long enough for any 53-bit use.
        let t = F64_TABLES
            .get_or_init(TableCache::new)
            .fixed(kind, F64_TABLE_LEN, |n| build(53, n));
        debug_assert!(t.len() >= len);
        f(t)
    }
}

/// Entries in each double-precision table: more than any 53-bit series uses.
pub(crate) const F64_TABLE_LEN: usize = 64;

static F64_TABLES: OnceLock<TableCache<f64>> = OnceLock::new();

impl ComplexField for Complex64 {
    type Real = f64;
    const MAX_PREC: Option<u32> = Some(53);
    #[inline]
    fn prec(&self) -> u32 {
        53
    }
    #[inline]
    fn from_f64(re: f64, im: f64, _prec: u32) -> Self {
        Complex64::new(re, im)
    }
    #[inline]
    fn from_i64(n: i64, _prec: u32) -> Self {
        Complex64::new(n as f64, 0.0)
    }
    #[inline]
    fn from_reals(re: f64, im: f64) -> Self {
        Complex64::new(re, im)
    }
    #[inline]
    fn re(&self) -> f64 {
        self.re
    }
    #[inline]
    fn im(&self) -> f64 {
        self.im
    }
    #[inline]
    fn re_f64(&self) -> f64 {
        self.re
    }
    #[inline]
    fn im_f64(&self) -> f64 {
        self.im
    }
    #[inline]
    fn log2_abs(&self) -> f64 {
        self.norm().log2()
    }
    #[inline]
    fn arg_f64(&self) -> f64 {
        self.im.atan2(self.re)
    }
    #[inline]
    fn is_finite(&self) -> bool {
        self.re.is_finite() && self.im.is_finite()
    }
    #[inline]
    fn is_zero(&self) -> bool {
        self.re == 0.0 && self.im == 0.0
    }
    #[inline]
    fn with_prec(&self, _prec: u32) -> Self {
        *self
    }
    #[inline]
    fn conj(self) -> Self {
        Complex64::conj(&self)
    }
    #[inline]
    fn mul_i(self) -> Self {
        Complex64::new(-self.im, self.re)
    }
    #[inline]
    fn mul_pow2(self, e: i32) -> Self {
        self * 2f64.powi(e)
    }
    #[inline]
    fn mul_i64(self, n: i64) -> Self {
        self * n as f64
    }
    #[inline]
    fn div_i64(self, n: i64) -> Self {
        self / n as f64
    }
    #[inline]
    fn add_i64(self, n: i64) -> Self {
        Complex64::new(self.re + n as f64, self.im)
    }
    #[inline]
    fn mul_real(self, x: &f64) -> Self {
        self * *x
    }
    #[inline]
    fn add_real(self, x: &f64) -> Self {
        Complex64::new(self.re + *x, self.im)
    }
    #[inline]
    fn recip(self) -> Self {
        Complex64::inv(&self)
    }
    #[inline]
    fn square(self) -> Self {
        self * self
    }
    #[inline]
    fn ln(&self) -> Self {
        Complex64::ln(*self)
    }
    #[inline]
    fn exp(&self) -> Self {
        Complex64::exp(*self)
    }
    #[inline]
    fn sqrt(&self) -> Self {
        Complex64::sqrt(*self)
    }
    #[inline]
    fn sin(&self) -> Self {
        Complex64::sin(*self)
    }
    #[inline]
    fn cos(&self) -> Self {
        Complex64::cos(*self)
    }
    #[inline]
    fn sin_cos(&self) -> (Self, Self) {
        (Complex64::sin(*self), Complex64::cos(*self))
    }
    #[inline]
    fn pow(&self, w: &Self) -> Self {
        if self.is_zero() {
            return Complex64::new(0.0, 0.0);
        }
        (w * Complex64::ln(*self)).exp()
    }
    fn to_complex(&self) -> rug::Complex {
        rug::Complex::with_val(53, (self.re, self.im))
    }
    fn to_decimal(&self, digits: usize) -> String {
        let d = digits.clamp(1, 17);
        format!("{:.*e} {:+.*e}i", d - 1, self.re, d - 1, self.im)
    }
}
