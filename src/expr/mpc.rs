//! Elementary functions of `rug::Complex` through MPFR's real functions.
//!
//! MPC's correctly rounded `exp`, `sin` and `cos` are slower than composing
//! MPFR's real functions (at 50 digits, MPC's `sin` of a real argument takes
//! 6 µs, MPFR's 1.7 µs), and slow down by orders of magnitude at arguments
//! whose two parts differ in size by many binades (3 ms at `10⁻¹⁰⁰⁰(1+i)`
//! and 64 bits, seconds below `10⁻¹⁰⁰⁰⁰⁰`). Composed from real functions
//! they take microseconds everywhere, with a few ulps of error per part
//! instead of correct rounding; the expression evaluator only promises its
//! working precision.

use rug::{Complex, Float};

fn parts(z: &Complex) -> (u32, &Float, &Float) {
    (z.prec().0, z.real(), z.imag())
}

/// `(sinh y, cosh y)` with `cosh y = √(1 + sinh² y)` (no cancellation;
/// MPFR's joint `sinh_cosh` is slow for tiny `y`).
fn sinh_cosh(y: &Float, p: u32) -> (Float, Float) {
    let sh = Float::with_val(p, y.sinh_ref());
    let ch = (Float::with_val(p, sh.square_ref()) + 1u32).sqrt();
    (sh, ch)
}

/// `e^z = e^x (cos y + i sin y)`.
pub(crate) fn exp(z: &Complex) -> Complex {
    let (p, x, y) = parts(z);
    let e = Float::with_val(p, x.exp_ref());
    if y.is_zero() {
        return Complex::with_val(p, (e, y));
    }
    let (s, c) = Float::with_val(p, y).sin_cos(Float::new(p));
    Complex::with_val(p, (c * &e, s * &e))
}

/// `sin z = sin x cosh y + i cos x sinh y` (addition formula with DLMF
/// 4.28.8–9).
pub(crate) fn sin(z: &Complex) -> Complex {
    let (p, x, y) = parts(z);
    if y.is_zero() {
        return Complex::with_val(p, (x.sin_ref(), y));
    }
    let (s, c) = Float::with_val(p, x).sin_cos(Float::new(p));
    let (sh, ch) = sinh_cosh(y, p);
    Complex::with_val(p, (s * &ch, c * &sh))
}

/// `cos z = cos x cosh y − i sin x sinh y`.
pub(crate) fn cos(z: &Complex) -> Complex {
    let (p, x, y) = parts(z);
    if y.is_zero() {
        return Complex::with_val(p, (x.cos_ref(), Float::with_val(p, -y)));
    }
    let (s, c) = Float::with_val(p, x).sin_cos(Float::new(p));
    let (sh, ch) = sinh_cosh(y, p);
    Complex::with_val(p, (c * &ch, -(s * &sh)))
}
