//! log Γ, Γ and 1/Γ in the complex plane.
//!
//! **Branch.** [`log_gamma`] is the principal log-gamma: analytic on
//! `C \ (−∞, 0]`, real on the positive axis, with `log Γ(z+1) = log Γ(z) + ln z`
//! (principal logarithm). It is *not* `ln(Γ(z))`, which jumps wherever Γ(z)
//! crosses the negative reals. On the negative real axis the value is the
//! limit from the upper half-plane (`Im z = +0`), so
//! `Im log Γ(x) = −π ⌈−x⌉` there, matching mpmath's `loggamma`.
//!
//! **Method.** For `Re z` not too negative: shift `z → w = z + r` until `|w|`
//! exceeds a radius proportional to the working precision (about `0.15·wp`,
//! optimised offline for `shift + terms`; 8 on the double path), subtract
//! `ln Π (z+k)` with the branch fixed by counting crossings of the negative
//! real axis by the running product, and sum the Stirling series
//! (DLMF 5.11.1). Its remainder is bounded by
//! `|c_{N+1}| / |w|^{2N+1} · sec^{2N+2}(½ arg w)` (DLMF 5.11.ii, with
//! `c_k = B_{2k}/(2k(2k−1))`), which chooses `N`. For `Re z < −T` (T = 8 on
//! the double path, max(40, 0.075·wp) on the arbitrary one, where it starts to pay) the reflection formula
//! `log Γ(z) = ln 2π + iπ(z − ½) − ln(1 − e^{2πiz}) − log Γ(1 − z)` for
//! `Im z ≥ 0` is used; it follows from DLMF 5.5.3 with the branch of
//! `ln(1 − e^{2πiz})` (argument of real part > 0) fixed by continuity from
//! `0 < z < 1`, so it needs no branch correction. Lower half-plane values
//! come from `log Γ(z̄) = conj log Γ(z)`.
//!
//! **Near the zeros at 1 and 2** the double path sums the Taylor series
//! `log Γ(2+ε) = (1−γ)ε + Σ_{k≥2} (−1)^k (ζ(k)−1) ε^k / k` (DLMF 5.7.3) for
//! `|z − 2| < 1`, and `log Γ(1+ε) = log Γ(2+ε) − ln(1+ε)` for `|z − 1| < 0.55`, so the error stays
//! relative. The arbitrary path instead measures the cancellation and
//! recomputes with enough extra bits.
//!
//! **Error estimate.** truncation bound + rounding estimate
//! `(#operations) · 2^−wp · (largest intermediate term)` + final rounding.

use super::{
    adaptive, asymptotic_radius, check_arg, constant, log2_bernoulli_even, log2_sec2_half_arg,
    nonpositive_integer, pole_guard, real_poly_at, reflect_below, shift_for, show, Core,
};
use crate::error::{Error, Result};
use crate::num::tables::{constant as k, TableKind};
use crate::num::{exact_integer, ComplexField, RealField};
use crate::precision::{Approx, Prec, Radius};
use crate::special::with_even_bernoulli;
use num_complex::Complex64;
use rug::Integer;

/// Stirling coefficients `c_k = B_{2k}/(2k(2k−1))`, entry `k−1`.
fn build_stirling<R: RealField>(prec: u32, len: usize) -> Vec<R> {
    with_even_bernoulli(len, |b| {
        (1..=len)
            .map(|kk| {
                let d = Integer::from(2 * kk as u64 * (2 * kk as u64 - 1));
                R::from_rational(&rug::Rational::from(&b[kk] / d), prec)
            })
            .collect()
    })
}

/// `ζ(k) − 1`, entry `k` (entries 0 and 1 are unused zeros).
fn build_zeta_minus_one<R: RealField>(prec: u32, len: usize) -> Vec<R> {
    let wp = prec.max(64) + 16;
    let mut v = vec![R::from_f64(0.0, prec); len.max(2)];
    for (kk, slot) in v.iter_mut().enumerate().skip(2) {
        let s = rug::Complex::with_val(wp, kk as u32);
        let a = rug::Complex::with_val(wp, 2u32);
        let z = super::hurwitz_zeta(&s, &a, Prec::from_bits(wp as u64).expect("small"))
            .expect("ζ(k, 2) is finite for k ≥ 2");
        *slot = R::from_float(z.value.real());
    }
    v
}

/// `log2 |c_k|`, `c_k = B_{2k}/(2k(2k−1))` (planning only).
fn log2_stirling_coeff(kk: usize) -> f64 {
    let n = 2.0 * kk as f64;
    log2_bernoulli_even(kk) - (n * (n - 1.0)).log2()
}

/// Number of Stirling terms used on the double path.
const DOUBLE_TERMS: usize = 10;

/// log Γ(z) for `Im z ≥ 0` at working precision `wp` (z already at `wp`).
fn upper<C: ComplexField>(z: &C, wp: u32) -> Core<C> {
    if z.re_f64() < reflect_below(wp) {
        reflected(z, wp)
    } else {
        shifted_stirling(z, wp)
    }
}

fn shifted_stirling<C: ComplexField>(z: &C, wp: u32) -> Core<C> {
    let r = shift_for(z, asymptotic_radius(wp));
    // Π_{k<r} (z+k), two factors at a time:
    // (z+k)(z+k+1) = z² + (2k+1)z + k(k+1) costs one full multiplication per
    // pair. The branch of Σ ln(z+k) is settled from the f64 arguments.
    let zero = C::Real::from_f64(0.0, wp);
    let mut prod = C::from_i64(1, wp);
    let mut arg_sum = 0.0f64;
    let (zx, zy) = (z.re_f64(), z.im_f64());
    let z2 = z.clone().square();
    let mut kk = 0i64;
    while kk < r {
        arg_sum += zy.atan2(zx + kk as f64);
        if kk + 1 < r {
            arg_sum += zy.atan2(zx + (kk + 1) as f64);
            let pair = (z2.clone() + &z.clone().mul_i64(2 * kk + 1)).add_i64(kk * (kk + 1));
            prod *= &pair;
            kk += 2;
        } else {
            prod *= &z.clone().add_i64(kk);
            kk += 1;
        }
    }
    let w = z.clone().add_i64(r);
    let ln_w = w.ln();
    let inv_w = w.clone().recip();
    let inv_w2 = inv_w.clone().square();
    // Remainder bound: sec²(½ arg w) = 2|w| / (|w| + Re w).
    let log2_w = ln_w.re_f64() * std::f64::consts::LOG2_E;
    let log2_sec2 = log2_sec2_half_arg(&w);
    let bound = |n: usize| {
        log2_stirling_coeff(n + 1) - (2 * n + 1) as f64 * log2_w + (n + 1) as f64 * log2_sec2
    };
    let n_terms = if wp <= 53 {
        DOUBLE_TERMS
    } else {
        let target = -(wp as f64) - 4.0;
        let mut n = 1;
        while bound(n) > target && n < 8 * wp as usize {
            n += 1;
        }
        n
    };
    let trunc = Radius::from_log2(bound(n_terms));
    let series = C::Real::with_table(
        TableKind::StirlingLogGamma,
        wp,
        n_terms,
        build_stirling::<C::Real>,
        |c| real_poly_at(&c[..n_terms], &inv_w2) * &inv_w,
    );
    let half_ln_2pi: C::Real = constant(k::HALF_LN_2PI, wp);
    let pi: C::Real = constant(k::PI, wp);
    let half = C::from_f64(0.5, 0.0, wp);
    let main = (w.clone() - &half) * &ln_w - &w;
    let mag_log2 = main.log2_abs().max(0.0);
    let mut value = (main + &series).add_real(&half_ln_2pi);
    let mut ops = n_terms + 8;
    let mut mag_log2 = mag_log2;
    if r > 0 {
        let ln_p = prod.ln();
        let turns = ((arg_sum - ln_p.im_f64()) / (2.0 * std::f64::consts::PI)).round() as i64;
        let turn = C::from_reals(zero.clone(), pi.mul_i64(2 * turns));
        mag_log2 = mag_log2.max(ln_p.log2_abs());
        value = value - &ln_p - &turn;
        ops += r as usize;
    }
    Core {
        value,
        trunc,
        mag_log2,
        ops,
    }
}

fn reflected<C: ComplexField>(z: &C, wp: u32) -> Core<C> {
    // log Γ(z) = ln 2π + iπ(z − ½) − ln(1 − e^{2πiz}) − log Γ(1 − z),  Im z ≥ 0.
    let m = z.re_f64().round();
    let w = z.clone().add_real(&C::Real::from_f64(-m, wp)); // |Re w| ≤ 1/2 (z − m is periodic-safe)
    let pi: C::Real = constant(k::PI, wp);
    let ln_2pi: C::Real = constant(k::LN_2PI, wp);
    let one_minus_q = if z.im_f64() < 1.0 {
        // −2i e^{iπw} sin(πw): no cancellation as q → 1.
        let piw = w.clone().mul_real(&pi);
        let (s, c) = piw.sin_cos();
        let e = c + &s.clone().mul_i();
        (e * &s).mul_i().mul_i64(-2)
    } else {
        // |q| = e^{−2π Im z} < 1/500: 1 − q directly.
        let q = w.mul_real(&pi).mul_i().mul_i64(2).exp();
        C::from_i64(1, wp) - &q
    };
    let one_minus_z_conj = (C::from_i64(1, wp) - z).conj();
    let other = upper(&one_minus_z_conj, wp);
    let half = C::from_f64(0.5, 0.0, wp);
    let lin = (z.clone() - &half).mul_real(&pi).mul_i();
    let mag_log2 = lin.log2_abs().max(other.mag_log2);
    let value = lin.add_real(&ln_2pi) - &one_minus_q.ln() - &other.value.conj();
    Core {
        value,
        trunc: other.trunc,
        mag_log2,
        ops: other.ops + 12,
    }
}

/// The double path near 1 and 2: Taylor series about 2 (DLMF 5.7.3), used
/// for `|z − 2| < 1` and, through `log Γ(1+ε) = log Γ(2+ε) − ln(1+ε)`, for
/// `|z − 1| < 0.55`. The terms fall like `(|ε|/2)^k`; the length is chosen
/// so the first neglected one is below `2^−56` relative.
fn near_one_two<C: ComplexField>(z: &C) -> Option<(C, Radius)> {
    let (x, y) = (z.re_f64(), z.im_f64());
    let (eps, at_one) = if (x - 1.0) * (x - 1.0) + y * y < 0.3025 {
        (z.clone().add_i64(-1), true)
    } else if (x - 2.0) * (x - 2.0) + y * y < 1.0 {
        (z.clone().add_i64(-2), false)
    } else {
        return None;
    };
    let scale = eps.log2_abs();
    let ratio = scale - 1.0; // log2(|ε|/2) < −1
    let terms = ((-58.0 / ratio).ceil() as usize).clamp(4, 60);
    let gamma: C::Real = constant(k::EULER_GAMMA, 53);
    let one_minus_gamma = C::Real::from_f64(1.0, 53) - &gamma;
    // Horner in ε for Σ_{k≥2} (−1)^k (ζ(k)−1) ε^{k−2}/k, then ·ε + (1−γ), then ·ε.
    let poly = C::Real::with_table(
        TableKind::ZetaMinusOne,
        53,
        terms + 1,
        build_zeta_minus_one::<C::Real>,
        |zm1| {
            let zero = C::Real::from_f64(0.0, 53);
            let mut acc = C::from_reals(zero.clone(), zero);
            for kk in (2..=terms).rev() {
                let d = if kk % 2 == 0 { kk as i64 } else { -(kk as i64) };
                acc = (acc * &eps).add_real(&zm1[kk].clone().div_i64(d));
            }
            (acc * &eps).add_real(&one_minus_gamma)
        },
    );
    let mut value = poly * &eps;
    if at_one {
        value -= &ln_1p(&eps);
    }
    // Rounding: a few ulps of the leading term; truncation below 2^−58 of it.
    let radius = Radius::from_log2(scale - 53.0 + 3.0) + Radius::from_log2(scale - 58.0);
    Some((value, radius))
}

/// `ln(1 + ε)` without cancellation for small `ε` (double path only).
fn ln_1p<C: ComplexField>(eps: &C) -> C {
    let (a, b) = (eps.re_f64(), eps.im_f64());
    let re = 0.5 * (a * (2.0 + a) + b * b).ln_1p();
    let im = b.atan2(1.0 + a);
    C::from_f64(re, im, 53)
}

/// The principal log-gamma function log Γ(z).
///
/// Errors: [`Error::Pole`] at `z = 0, −1, −2, …` (poles of Γ, where log Γ is
/// singular); [`Error::NonFinite`]; [`Error::DoubleTooPrecise`] for more than
/// 53 bits on `Complex64`. Exactly 0 (radius 0) at `z = 1, 2`.
///
/// ```
/// use dressing::{special::log_gamma, Prec};
/// use num_complex::Complex64;
/// // log Γ(1/2) = ln √π (DLMF 5.4.6)
/// let r = log_gamma(&Complex64::new(0.5, 0.0), Prec::DOUBLE).unwrap();
/// assert!((r.value.re - 0.5 * std::f64::consts::PI.ln()).abs() < 1e-15);
/// // On the negative axis: the limit from above, Im = −π⌈−x⌉.
/// let r = log_gamma(&Complex64::new(-2.5, 0.0), Prec::DOUBLE).unwrap();
/// assert!((r.value.im + 3.0 * std::f64::consts::PI).abs() < 1e-14);
/// assert!(log_gamma(&Complex64::new(-3.0, 0.0), Prec::DOUBLE).is_err());
/// ```
pub fn log_gamma<C: ComplexField>(z: &C, prec: Prec) -> Result<Approx<C>> {
    check_arg("log_gamma", "z", z, prec)?;
    if nonpositive_integer(z).is_some() {
        return Err(Error::Pole {
            function: "log_gamma",
            order: 1,
            at: show(z),
        });
    }
    if z.im().is_zero() && matches!(exact_integer(&z.re()), Some(1) | Some(2)) {
        return Ok(super::exact_zero(prec));
    }
    let zero = C::Real::from_f64(0.0, 53);
    let lower = z.im() < zero;
    let zu = if lower { z.clone().conj() } else { z.clone() };
    let approx = if C::MAX_PREC.is_some() {
        let (v, rad) = match near_one_two(&zu) {
            Some(vr) => vr,
            None => {
                let (v, e) = double_kernel(Complex64::new(zu.re_f64(), zu.im_f64()));
                if !(v.re.is_finite() && v.im.is_finite()) {
                    return Err(Error::Overflow {
                        function: "log_gamma",
                        hint:
                            "|log Γ(z)| exceeds the double range; use the arbitrary-precision path",
                    });
                }
                let v = C::from_f64(v.re, v.im, 53);
                (fix_on_cut(&zu, v, 53), Radius::from_f64(e))
            }
        };
        Approx::new(v, rad, 53)
    } else {
        log_gamma_mp(&zu, prec)
    };
    Ok(if lower {
        approx.map(|v| v.conj())
    } else {
        approx
    })
}

/// log Γ(z) for `Im z ≥ 0` at working precision `wp`, with the imaginary
/// part on the negative real axis set exactly to `−π⌈−x⌉` (limit from above).
pub(crate) fn log_gamma_core<C: ComplexField>(z: &C, wp: u32) -> Core<C> {
    let mut core = upper(z, wp);
    core.value = fix_on_cut(z, core.value, wp);
    core
}

/// On the negative real axis, sets `Im log Γ(x) = −π⌈−x⌉` exactly.
fn fix_on_cut<C: ComplexField>(z: &C, v: C, wp: u32) -> C {
    if z.im().is_zero() && z.re() < C::Real::from_f64(0.0, 53) {
        let n = exact_ceil_neg(&z.re());
        C::from_reals(v.re(), C::Real::pi(wp).mul_i64(-n))
    } else {
        v
    }
}

/// `⌈−x⌉` for negative non-integer `x` (the number of negative factors in the shift).
pub(crate) fn exact_ceil_neg<R: RealField>(x: &R) -> i64 {
    let f = x.to_f64();
    let c = (-f).ceil();
    // f64 rounding of an arbitrary-precision x can only matter within one ulp
    // of an integer; settle it exactly.
    let n = c as i64;
    let t = x.clone().add_i64(n);
    if t < R::from_f64(0.0, 53) {
        n + 1
    } else if x.clone().add_i64(n - 1) >= R::from_f64(0.0, 53) {
        n - 1
    } else {
        n
    }
}

/// The double path away from 1 and 2, specialised to `f64` (`Im z ≥ 0`):
/// the same shift + Stirling and reflection as the generic code, with the
/// error estimate kept in plain `f64` and `ln|w|` taken as `½ ln(x² + y²)`,
/// which avoids the generic path's `hypot`/`log2` bookkeeping (about 3× the
/// cost; see docs/architecture.md). Returns the value and an estimate of its
/// absolute error.
fn double_kernel(z: Complex64) -> (Complex64, f64) {
    const EPS: f64 = f64::EPSILON;
    let (x, y) = (z.re, z.im);
    if x < reflect_below(53) {
        // ln 2π + iπ(z − ½) − ln(1 − e^{2πiz}) − conj(log Γ(1 − z̄))
        let m = x.round();
        let w = Complex64::new(x - m, y);
        let pi = std::f64::consts::PI;
        let one_minus_q = if y < 1.0 {
            let piw = w * pi;
            let (s, c) = (piw.sin(), piw.cos());
            (Complex64::new(c.re - s.im, c.im + s.re) * s) * Complex64::new(0.0, -2.0)
        } else {
            Complex64::new(1.0, 0.0) - (Complex64::new(0.0, 2.0 * pi) * w).exp()
        };
        let (other, e) = double_kernel(Complex64::new(1.0 - x, y));
        let lin = Complex64::new(-pi * y + (2.0 * pi).ln(), pi * (x - 0.5));
        let v = lin - one_minus_q.ln() - other.conj();
        let mag = lin.re.abs() + lin.im.abs();
        return (v, e + 8.0 * EPS * mag);
    }
    let r = shift_for(&z, asymptotic_radius(53));
    let mut prod = Complex64::new(1.0, 0.0);
    let mut crossings = 0i64;
    for kk in 0..r {
        let before_upper = prod.im >= 0.0;
        prod *= Complex64::new(x + kk as f64, y);
        if before_upper && prod.im < 0.0 {
            crossings += 1;
        }
    }
    let w = Complex64::new(x + r as f64, y);
    let n2 = w.re * w.re + w.im * w.im;
    let ln_abs = if n2 > 1e-300 && n2 < 1e300 {
        0.5 * n2.ln()
    } else {
        w.norm().ln()
    };
    let ln_w = Complex64::new(ln_abs, w.im.atan2(w.re));
    let inv_w = if n2.is_finite() && n2 > 1e-300 {
        w.conj() / n2
    } else {
        Complex64::new(1.0, 0.0) / w
    };
    let inv_w2 = inv_w * inv_w;
    let c = stirling_f64();
    let mut acc = Complex64::new(c[DOUBLE_TERMS - 1], 0.0);
    for ck in c[..DOUBLE_TERMS - 1].iter().rev() {
        acc = acc * inv_w2 + ck;
    }
    let series = acc * inv_w;
    let main = (w - 0.5) * ln_w - w;
    let mut v = main + series + HALF_LN_2PI;
    let mut mag = main.re.abs() + main.im.abs();
    if r > 0 {
        let lp = Complex64::new(0.5 * prod.norm_sqr().ln(), prod.im.atan2(prod.re));
        v -= lp + Complex64::new(0.0, 2.0 * std::f64::consts::PI * crossings as f64);
        mag += lp.re.abs() + lp.im.abs() + (2.0 * std::f64::consts::PI * crossings as f64);
    }
    // Remainder bound |c_{N+1}| |w|^{−2N−1} sec^{2N+2}(½ arg w) (DLMF 5.11.ii).
    let abs_w = w.norm();
    let sec2 = 2.0 * abs_w / (abs_w + w.re);
    let trunc = c[DOUBLE_TERMS].abs()
        * abs_w.powi(-(2 * DOUBLE_TERMS as i32) - 1)
        * sec2.powi(DOUBLE_TERMS as i32 + 1);
    (v, trunc + EPS * mag * (4.0 + 0.5 * r as f64))
}

/// ½ ln 2π.
const HALF_LN_2PI: f64 = 0.918_938_533_204_672_7;

/// The Stirling coefficients in `f64`, `DOUBLE_TERMS + 1` of them (the last
/// bounds the remainder).
fn stirling_f64() -> &'static [f64] {
    static T: std::sync::OnceLock<Vec<f64>> = std::sync::OnceLock::new();
    T.get_or_init(|| build_stirling::<f64>(53, DOUBLE_TERMS + 1))
}

fn log_gamma_mp<C: ComplexField>(z: &C, prec: Prec) -> Approx<C> {
    let guard = 24 + pole_guard(z) + z.log2_abs().max(1.0).log2().ceil() as u32;
    adaptive(prec, guard, |wp| log_gamma_core(&z.with_prec(wp), wp))
}

/// Γ(z) = exp(log Γ(z)).
///
/// Errors: [`Error::Pole`] (order 1) at `z = 0, −1, −2, …`;
/// [`Error::Overflow`] on the double path when |Γ(z)| exceeds `f64`.
///
/// ```
/// use dressing::{special::gamma, Prec};
/// let g = gamma(&rug::Complex::with_val(100, 5), Prec::digits(25).unwrap()).unwrap();
/// assert_eq!(g.value.real().to_f64(), 24.0);
/// ```
pub fn gamma<C: ComplexField>(z: &C, prec: Prec) -> Result<Approx<C>> {
    check_arg("gamma", "z", z, prec)?;
    if nonpositive_integer(z).is_some() {
        return Err(Error::Pole {
            function: "gamma",
            order: 1,
            at: show(z),
        });
    }
    exp_of_log_gamma(z, prec, false, "gamma")
}

/// 1/Γ(z), entire: exactly 0 at `z = 0, −1, −2, …`.
///
/// ```
/// use dressing::{special::rgamma, Prec};
/// use num_complex::Complex64;
/// let r = rgamma(&Complex64::new(-4.0, 0.0), Prec::DOUBLE).unwrap();
/// assert_eq!(r.value, Complex64::new(0.0, 0.0));
/// assert!(r.radius.is_zero());
/// ```
pub fn rgamma<C: ComplexField>(z: &C, prec: Prec) -> Result<Approx<C>> {
    check_arg("rgamma", "z", z, prec)?;
    if nonpositive_integer(z).is_some() {
        return Ok(super::exact_zero(prec));
    }
    exp_of_log_gamma(z, prec, true, "rgamma")
}

fn exp_of_log_gamma<C: ComplexField>(
    z: &C,
    prec: Prec,
    reciprocal: bool,
    function: &'static str,
) -> Result<Approx<C>> {
    // |log Γ| ~ |z| ln|z|: its absolute error becomes the relative error of Γ.
    let l2 = z.log2_abs().max(1.0);
    let guard = (l2 + l2.log2().max(0.0)).ceil() as u32 + 8;
    super::exp_of_log(
        z,
        prec,
        guard,
        reciprocal,
        function,
        "use log_gamma, or the arbitrary-precision path",
        log_gamma,
    )
}
