//! The Barnes G function and its logarithm.
//!
//! **Branch.** [`log_barnes_g`] is analytic on `C \ (−∞, 0]`, real for
//! `z > 0`, and satisfies `log G(z+1) = log G(z) + log Γ(z)` with the
//! principal log-gamma (DLMF 5.17.1); on the negative axis it takes the
//! limit from the upper half-plane, as [`log_gamma`](super::log_gamma) does.
//!
//! **Method.** Shift `z → v + 1 = z + r` until `|v|` passes the asymptotic
//! radius, and use
//! `log G(v+1) = (v²/2 − 1/12) ln v − 3v²/4 + (v/2) ln 2π + ζ'(−1)
//!  + Σ_{k≥1} B_{2k+2} / (4k(k+1) v^{2k})` (DLMF 5.17.5 written with
//! `ln A = 1/12 − ζ'(−1)` and Stirling for `ln Γ(v+1)`), then
//! `log G(z) = log G(z+r) − r log Γ(z) − Σ_{k=1}^{r−1} ln P_k` with
//! `P_k = Π_{j<k} (z+j)` on the branch continuous from the positive axis.
//! The cost grows linearly with `−Re z` (no reflection formula is used).
//!
//! **Error estimate.** The first neglected term times `sec^{2N+2}(½ arg v)`
//! (as for Stirling's series), plus the rounding estimate; cancellation (near
//! the zeros of log G at z = 1, 2, 3) raises the working precision on the
//! arbitrary path and is an absolute error on the double path.

use super::{
    adaptive, asymptotic_radius, check_arg, constant, log2_bernoulli_even, log2_sec2_half_arg,
    nonpositive_integer, pole_guard, real_poly_at, shift_for, show, Core,
};
use crate::error::{Error, Result};
use crate::num::tables::{constant as k, TableKind};
use crate::num::{ComplexField, RealField};
use crate::precision::{Approx, Prec, Radius};
use crate::special::with_even_bernoulli;
use num_complex::Complex64;
use rug::{Integer, Rational};

/// The farthest left `Re z` accepted (the shift is linear in `−Re z`).
pub const MIN_REAL_PART: f64 = -1.0e5;

/// `B_{2k+2}/(4k(k+1))` for k = 1, 2, … (entry k−1).
fn build_coeffs<R: RealField>(prec: u32, len: usize) -> Vec<R> {
    with_even_bernoulli(len + 1, |b| {
        (1..=len)
            .map(|kk| {
                let d = Integer::from(4 * kk as u64 * (kk as u64 + 1));
                R::from_rational(&Rational::from(&b[kk + 1] / d), prec)
            })
            .collect()
    })
}

fn check<C: ComplexField>(function: &'static str, z: &C, prec: Prec) -> Result<()> {
    check_arg(function, "z", z, prec)?;
    if z.re_f64() < MIN_REAL_PART {
        return Err(Error::Domain {
            function,
            message: format!(
                "Re z = {:e} is left of the supported {MIN_REAL_PART:e} (the cost grows with −Re z); \
                 use the recurrence G(z+1) = Γ(z) G(z) analytically first",
                z.re_f64()
            ),
        });
    }
    Ok(())
}

/// log G(z), the logarithm of the Barnes G function on its continuous branch.
///
/// Errors: [`Error::Zero`] of order `n + 1` at `z = −n` (n = 0, 1, …).
///
/// ```
/// use dressing::{special::log_barnes_g, Prec};
/// use num_complex::Complex64;
/// // G(4) = 1!·2! = 2 (DLMF 5.17.2)
/// let r = log_barnes_g(&Complex64::new(4.0, 0.0), Prec::DOUBLE).unwrap();
/// assert!((r.value.re - 2f64.ln()).abs() < 1e-14);
/// ```
pub fn log_barnes_g<C: ComplexField>(z: &C, prec: Prec) -> Result<Approx<C>> {
    check("log_barnes_g", z, prec)?;
    if let Some(n) = nonpositive_integer(z) {
        return Err(Error::Zero {
            function: "log_barnes_g",
            order: (1 - n) as u32,
            at: show(z),
        });
    }
    if z.im().is_zero() && matches!(crate::num::exact_integer(&z.re()), Some(1..=3)) {
        // G(1) = G(2) = G(3) = 1 (DLMF 5.17.2): log G is exactly 0 there, which
        // no amount of working precision would show by cancellation.
        return Ok(super::exact_zero(prec));
    }
    if C::MAX_PREC.is_some() {
        // Plain doubles with an absolute error estimate; log G cancels up to
        // ~7 bits between its asymptotic part and the shift, so where that
        // leaves less than the 1e-14 relative target the point is redone on
        // MPFR at 53 bits + guard.
        let lower = z.im_f64() < 0.0;
        let (v, e) = double_kernel(Complex64::new(z.re_f64(), z.im_f64().abs()));
        if v.re.is_finite() && v.im.is_finite() {
            let v = if lower { v.conj() } else { v };
            let r = Approx::new(
                C::from_f64(v.re, v.im, 53),
                Radius::from_f64(e + f64::EPSILON * v.norm()),
                53,
            );
            return super::refine_double(r, z, log_barnes_g);
        }
        return super::on_mpfr(z, prec, log_barnes_g);
    }
    let zero = C::Real::from_f64(0.0, 53);
    let lower = z.im() < zero;
    let zu = if lower { z.clone().conj() } else { z.clone() };
    let guard = 24 + 2 * pole_guard(&zu) + 2 * zu.log2_abs().max(1.0).log2().ceil() as u32;
    let approx = adaptive(prec, guard, |wp| eval(&zu.with_prec(wp), wp));
    Ok(if lower {
        approx.map(|v| v.conj())
    } else {
        approx
    })
}

/// G(z), the Barnes G function (entire): exactly 0 at `z = 0, −1, −2, …`.
///
/// ```
/// use dressing::{special::barnes_g, Prec};
/// let r = barnes_g(&rug::Complex::with_val(128, 5), Prec::digits(30).unwrap()).unwrap();
/// assert_eq!(r.value.real().to_f64(), 12.0); // G(5) = 1!·2!·3!
/// ```
pub fn barnes_g<C: ComplexField>(z: &C, prec: Prec) -> Result<Approx<C>> {
    check("barnes_g", z, prec)?;
    if nonpositive_integer(z).is_some() {
        return Ok(super::exact_zero(prec));
    }
    // |log G| ~ |z|² ln|z|/2: its absolute error becomes the relative error of G.
    let l2 = z.log2_abs().max(1.0);
    let guard = (2.0 * l2 + l2.log2().max(0.0)).ceil() as u32 + 8;
    super::exp_of_log(
        z,
        prec,
        guard,
        false,
        "barnes_g",
        "use log_barnes_g, or the arbitrary-precision path",
        log_barnes_g,
    )
}

fn eval<C: ComplexField>(z: &C, wp: u32) -> Core<C> {
    let zero = C::Real::from_f64(0.0, wp);
    let one = C::from_i64(1, wp);
    // v = z − 1 + r with |v| past the radius and Re v ≥ 0.
    let r = shift_for(&(z.clone() - &one), asymptotic_radius(wp));
    let v = z.clone().add_i64(r - 1);
    let ln_v = v.ln();
    let log2_v = v.log2_abs();
    let log2_sec2 = log2_sec2_half_arg(&v);
    let log2_term = |kk: usize| {
        log2_bernoulli_even(kk + 1)
            - (4.0 * kk as f64 * (kk as f64 + 1.0)).log2()
            - 2.0 * kk as f64 * log2_v
            + (kk + 1) as f64 * log2_sec2
    };
    let n_terms = if wp <= 53 {
        10
    } else {
        let mut n = 1;
        while log2_term(n + 1) > -(wp as f64) - 4.0 && n < 8 * wp as usize {
            n += 1;
        }
        n
    };
    let trunc = Radius::from_log2(log2_term(n_terms + 1));
    let inv_v2 = v.clone().square().recip();
    let series = C::Real::with_table(
        TableKind::BarnesG,
        wp,
        n_terms,
        build_coeffs::<C::Real>,
        |c| real_poly_at(&c[..n_terms], &inv_v2) * &inv_v2,
    );
    let ln_2pi: C::Real = constant(k::LN_2PI, wp);
    let zp: C::Real = constant(k::ZETA_PRIME_MINUS_ONE, wp);
    let v2 = v.clone().square();
    let twelfth = C::from_i64(1, wp).div_i64(12);
    let main = (v2.clone().mul_pow2(-1) - &twelfth) * &ln_v - &v2.clone().mul_i64(3).div_i64(4)
        + &v.clone().mul_real(&ln_2pi).mul_pow2(-1);
    let mut mag = main.log2_abs().max(0.0);
    let mut value = (main + &series).add_real(&zp);
    let mut ops = n_terms + 12;
    if r > 0 {
        // − r log Γ(z) − Σ_{k=1}^{r−1} ln P_k
        let lg = super::loggamma::log_gamma_core(z, wp);
        mag = mag.max(lg.mag_log2 + (r as f64).log2());
        value -= &lg.value.mul_i64(r);
        let pi: C::Real = constant(k::PI, wp);
        let mut prod = C::from_i64(1, wp);
        let mut crossings = 0i64;
        // Σ_k ln P_k = Ln(Π_k P_k) + 2πi·(crossings summed + a wrap count
        // settled in f64 from the principal arguments of the P_k).
        let mut big = C::from_i64(1, wp);
        let mut arg_sum = 0.0f64;
        let mut turns = 0i64;
        let double = wp <= 53;
        let mut direct = C::from_reals(zero.clone(), zero.clone());
        for kk in 1..r {
            let before_upper = prod.im() >= zero;
            prod *= &z.clone().add_i64(kk - 1);
            if before_upper && prod.im() < zero {
                crossings += 1;
            }
            turns += crossings;
            if double {
                direct += &prod.ln();
            } else {
                arg_sum += prod.arg_f64();
                big *= &prod;
            }
        }
        let sum_ln = if double {
            direct
        } else {
            let ln_big = big.ln();
            let wraps = ((arg_sum - ln_big.im_f64()) / (2.0 * std::f64::consts::PI)).round() as i64;
            ln_big + &C::from_reals(zero.clone(), pi.clone().mul_i64(2 * wraps))
        };
        let turn = C::from_reals(zero.clone(), pi.mul_i64(2 * turns));
        mag = mag.max(sum_ln.log2_abs());
        value = value - &sum_ln - &turn;
        ops += lg.ops + 3 * r as usize;
    }
    if z.im().is_zero() && z.re() < zero && r > 0 {
        // On the cut (limit from above): ln(x + j + i0) = ln|x + j| + iπ for
        // x + j < 0, so the imaginary part is known exactly.
        let n_neg = super::loggamma::exact_ceil_neg(&z.re());
        let sum_min: i64 = (1..r).map(|kk| kk.min(n_neg)).sum();
        let pi: C::Real = constant(k::PI, wp);
        value = C::from_reals(value.re(), pi.mul_i64(r * n_neg - sum_min));
    }
    Core {
        value,
        trunc,
        mag_log2: mag,
        ops,
    }
}

/// log G(z) at double precision with an estimate of its *absolute* error
/// (the relative accuracy of G), for sums of logarithms such as Barnes
/// factors of a scalar factor, where relative accuracy of log G itself near
/// its zeros does not matter: no recomputation on MPFR. `None` at a zero of
/// G, left of `MIN_REAL_PART`, or out of the double range.
pub(crate) fn log_barnes_g_f64_absolute(z: Complex64) -> Option<(Complex64, f64)> {
    if !(z.re.is_finite() && z.im.is_finite()) || z.re < MIN_REAL_PART {
        return None;
    }
    if z.im == 0.0 && z.re <= 0.0 && z.re == z.re.round() {
        return None;
    }
    let (v, e) = double_kernel(Complex64::new(z.re, z.im.abs()));
    let v = if z.im < 0.0 { v.conj() } else { v };
    (v.re.is_finite() && v.im.is_finite() && e.is_finite())
        .then_some((v, e + f64::EPSILON * v.norm()))
}

/// Terms of the asymptotic series on the double path (|v| ≥ 8: the 11th
/// term is below 10⁻¹⁸).
const DOUBLE_TERMS: usize = 10;

/// `ln 2π` and `ζ'(−1)` (DLMF 25.6.11; values from mpmath 1.4.1).
const LN_2PI: f64 = 1.837_877_066_409_345_5;
const ZETA_PRIME_MINUS_ONE: f64 = -0.165_421_143_700_450_93;

/// log G(z) on the double path for `Im z ≥ 0`, in plain `f64`: the same
/// shift and asymptotic series as `eval`, the products `P_k` on their
/// continuous branch by counting crossings of the negative axis, and the
/// exact imaginary part on the cut. Returns the value and an estimate of
/// its *absolute* error: the first neglected term times `sec^{2N+2}(½ arg v)`
/// plus `2^−53` times the sizes of the terms summed (scaled by the number of
/// operations), which is where the cancellation shows.
fn double_kernel(z: Complex64) -> (Complex64, f64) {
    const EPS: f64 = f64::EPSILON;
    let one = Complex64::new(1.0, 0.0);
    let r = shift_for(&(z - one), asymptotic_radius(53));
    let v = z + (r - 1) as f64;
    let abs_v = v.norm();
    let ln_v = Complex64::new(abs_v.ln(), v.im.atan2(v.re));
    let inv_v2 = one / (v * v);
    let c = coeffs_f64();
    let mut acc = Complex64::new(c[DOUBLE_TERMS - 1], 0.0);
    for ck in c[..DOUBLE_TERMS - 1].iter().rev() {
        acc = acc * inv_v2 + ck;
    }
    let series = acc * inv_v2;
    let v2 = v * v;
    let main = (v2 * 0.5 - 1.0 / 12.0) * ln_v - v2 * 0.75 + v * (0.5 * LN_2PI);
    let mut value = main + series + ZETA_PRIME_MINUS_ONE;
    // The largest term summed (the generic code's rounding model:
    // operations × 2^−53 × largest term), and log Γ's own error.
    let mut mag = main.norm().max(1.0);
    let mut extra = 0.0;
    if r > 0 {
        // − r log Γ(z) − Σ_{k=1}^{r−1} ln P_k
        let lg = super::log_gamma(&z, Prec::DOUBLE).map(|a| (a.value, a.radius.to_f64()));
        let Ok((lg, lg_err)) = lg else {
            return (Complex64::new(f64::NAN, f64::NAN), f64::INFINITY);
        };
        value -= lg * r as f64;
        mag = mag.max(r as f64 * lg.norm());
        extra += r as f64 * lg_err;
        let mut prod = one;
        let mut crossings = 0i64;
        let mut turns = 0i64;
        let mut sum_ln = Complex64::new(0.0, 0.0);
        for kk in 1..r {
            let before_upper = prod.im >= 0.0;
            prod *= z + (kk - 1) as f64;
            if before_upper && prod.im < 0.0 {
                crossings += 1;
            }
            turns += crossings;
            let l = prod.ln();
            mag = mag.max(l.norm());
            sum_ln += l;
        }
        let turn = Complex64::new(0.0, 2.0 * std::f64::consts::PI * turns as f64);
        value = value - sum_ln - turn;
        mag = mag.max(turn.norm());
        if z.im == 0.0 && z.re < 0.0 {
            // On the cut (limit from above): ln(x + j + i0) = ln|x + j| + iπ
            // for x + j < 0, so the imaginary part is known exactly.
            let n_neg = (-z.re).ceil() as i64;
            let sum_min: i64 = (1..r).map(|kk| kk.min(n_neg)).sum();
            value.im = std::f64::consts::PI * (r * n_neg - sum_min) as f64;
        }
    }
    let sec2 = 2.0 * abs_v / (abs_v + v.re);
    let nt = DOUBLE_TERMS as i32 + 1;
    let trunc = c[DOUBLE_TERMS].abs() * abs_v.powi(-2 * nt) * sec2.powi(nt + 1);
    let ops = (DOUBLE_TERMS + 12) as f64 + 3.0 * r as f64;
    (value, trunc + extra + EPS * mag * (4.0 + ops.sqrt()))
}

/// `B_{2k+2}/(4k(k+1))` in `f64`, `DOUBLE_TERMS + 1` of them.
fn coeffs_f64() -> &'static [f64] {
    static T: std::sync::OnceLock<Vec<f64>> = std::sync::OnceLock::new();
    T.get_or_init(|| build_coeffs::<f64>(53, DOUBLE_TERMS + 1))
}
