//! ψ(z) and the polygamma functions ψ⁽ⁿ⁾(z).
//!
//! **Method.** Shift `z → w = z + r` (DLMF 5.15.5:
//! `ψ⁽ⁿ⁾(z) = ψ⁽ⁿ⁾(z+r) + (−1)^{n+1} n! Σ_{k<r} (z+k)^{−n−1}`) until
//! `|w|` passes the asymptotic radius, then sum the asymptotic series:
//! DLMF 5.11.2 for ψ, DLMF 5.15.8 for n ≥ 1. For `Re z < −T` the reflection
//! formula `ψ⁽ⁿ⁾(z) = (−1)^n ψ⁽ⁿ⁾(1−z) − π dⁿ/dzⁿ cot(πz)` (DLMF 5.15.6,
//! 5.5.4 for n = 0) is used, with `dⁿ/dzⁿ cot(πz) = πⁿ Pₙ(cot πz)`,
//! `P₀(c) = c`, `P_{n+1}(c) = −(1 + c²) Pₙ'(c)`, and `cot(πz) = cot(π(z − m))`
//! for the nearest integer `m`, so no digits are lost near the poles.
//!
//! **Error estimate.** The first neglected term of the series times
//! `sec^{2N+n+1}(½ arg w)` (as for the Stirling series, DLMF 5.11.ii), plus the
//! rounding estimate `(#operations)·2^−wp·(largest term)`; cancellation is
//! detected and the working precision raised (arbitrary path).

use super::{
    adaptive, asymptotic_radius, check_arg, constant, log2_bernoulli_even, log2_factorial,
    log2_sec2_half_arg, nonpositive_integer, pole_guard, real_poly_at, reflect_below, shift_for,
    show, Core,
};
use crate::error::{Error, Result};
use crate::num::tables::{constant as k, TableKind};
use crate::num::{ComplexField, RealField};
use crate::precision::{Approx, Prec, Radius};
use crate::special::with_even_bernoulli;
use num_complex::Complex64;
use rug::{Integer, Rational};

/// The largest order accepted: beyond it the factorials and cot-derivative
/// polynomials grow past what the error model is tested for.
pub const MAX_ORDER: u32 = 200;

/// Terms of the ψ series on the double path (|w| ≥ 8 after the shift:
/// the 11th term is below 2·10⁻¹⁸ there).
const DOUBLE_TERMS: usize = 10;

/// ψ(z) on the double path for `Im z ≥ 0`, specialised to `f64` like
/// log Γ's double kernel: the shift to `|w| ≥ 8` (DLMF 5.15.5 with n = 0),
/// DLMF 5.11.2 with `DOUBLE_TERMS` terms, and for `Re z < −8` the reflection
/// `ψ(z) = ψ(1 − z) − π cot πz` (DLMF 5.5.4) with `cot` reduced by the
/// nearest integer, or written through `q = e^{2πiz}` for `Im z ≥ 1` so it
/// neither overflows nor cancels. Returns the value and an estimate of its
/// absolute error: the first neglected term times `sec^{2N+3}(½ arg w)`
/// (DLMF 5.11.ii) plus the rounding of the terms summed.
fn digamma_double(z: Complex64) -> (Complex64, f64) {
    const EPS: f64 = f64::EPSILON;
    let pi = std::f64::consts::PI;
    let (x, y) = (z.re, z.im);
    if x < reflect_below(53) {
        let m = x.round();
        let w = Complex64::new(x - m, y);
        let cot = if y < 1.0 {
            let u = w * pi;
            u.cos() / u.sin()
        } else {
            let q = (Complex64::new(0.0, 2.0 * pi) * w).exp();
            Complex64::new(0.0, -1.0) * (1.0 + q) / (1.0 - q)
        };
        // ψ(1 − z) = conj ψ(1 − z̄), and 1 − z̄ has Im ≥ 0.
        let (other, e) = digamma_double(Complex64::new(1.0 - x, y));
        let v = other.conj() - cot * pi;
        let sens = pi * pi * w.norm() * (1.0 + cot * cot).norm();
        return (v, e + 8.0 * EPS * (pi * cot.norm() + sens));
    }
    let r = shift_for(&z, asymptotic_radius(53));
    let mut sum = Complex64::new(0.0, 0.0);
    let mut mag = 0.0;
    for kk in 0..r {
        let t = Complex64::new(1.0, 0.0) / Complex64::new(x + kk as f64, y);
        // |re| + |im| bounds the modulus within √2, without hypot.
        mag += t.re.abs() + t.im.abs();
        sum += t;
    }
    let w = Complex64::new(x + r as f64, y);
    let inv_w = Complex64::new(1.0, 0.0) / w;
    let inv_w2 = inv_w * inv_w;
    let c = digamma_f64();
    let mut acc = Complex64::new(c[DOUBLE_TERMS - 1], 0.0);
    for ck in c[..DOUBLE_TERMS - 1].iter().rev() {
        acc = acc * inv_w2 + ck;
    }
    let series = acc * inv_w2;
    let abs_w = w.norm_sqr().sqrt(); // |w| ≥ 8 and moderate here: no overflow
    let ln_w = Complex64::new(abs_w.ln(), w.im.atan2(w.re));
    let v = ln_w - inv_w * 0.5 - series - sum;
    let sec2 = 2.0 * abs_w / (abs_w + w.re);
    let nt = DOUBLE_TERMS as i32 + 1;
    let trunc = c[DOUBLE_TERMS].abs() * abs_w.powi(-2 * nt) * sec2.powf(nt as f64 + 0.5);
    let l1 = |c: Complex64| c.re.abs() + c.im.abs();
    let rounding = EPS * (l1(ln_w) + l1(inv_w) + mag) * (4.0 + 0.5 * r as f64);
    (v, trunc + rounding)
}

/// ψ(z) at double precision with an estimate of its *absolute* error, for
/// sums of many ψ values (kernels of products), where a term's relative
/// accuracy near a zero of ψ does not matter: no recomputation on MPFR.
/// `None` at a pole or where the value leaves the double range.
pub(crate) fn digamma_f64_absolute(z: Complex64) -> Option<(Complex64, f64)> {
    if z.im == 0.0 && z.re <= 0.0 && z.re == z.re.round() {
        return None;
    }
    let (v, e) = digamma_double(Complex64::new(z.re, z.im.abs()));
    let v = if z.im < 0.0 { v.conj() } else { v };
    (v.re.is_finite() && v.im.is_finite()).then_some((v, e + f64::EPSILON * v.norm()))
}

/// `B_{2k}/(2k)` in `f64`, `DOUBLE_TERMS + 1` of them (the last bounds the
/// remainder).
fn digamma_f64() -> &'static [f64] {
    static T: std::sync::OnceLock<Vec<f64>> = std::sync::OnceLock::new();
    T.get_or_init(|| build_digamma_coeffs::<f64>(53, DOUBLE_TERMS + 1))
}

/// `B_{2k}/(2k)` for k = 1, 2, … (entry k−1), the ψ series (DLMF 5.11.2).
fn build_digamma_coeffs<R: RealField>(prec: u32, len: usize) -> Vec<R> {
    with_even_bernoulli(len, |b| {
        (1..=len)
            .map(|kk| R::from_rational(&Rational::from(&b[kk] / Integer::from(2 * kk)), prec))
            .collect()
    })
}

/// ψ(z), the digamma function.
///
/// ```
/// use dressing::{special::digamma, Prec};
/// use num_complex::Complex64;
/// // ψ(1) = −γ (DLMF 5.4.12)
/// let r = digamma(&Complex64::new(1.0, 0.0), Prec::DOUBLE).unwrap();
/// assert!((r.value.re + 0.5772156649015329).abs() < 1e-15);
/// ```
pub fn digamma<C: ComplexField>(z: &C, prec: Prec) -> Result<Approx<C>> {
    polygamma(0, z, prec)
}

/// ψ⁽ⁿ⁾(z), the polygamma function of order `n` (`n = 0` is ψ).
///
/// Errors: [`Error::Pole`] of order `n + 1` at `z = 0, −1, −2, …`;
/// [`Error::Domain`] for `n` above `MAX_ORDER` (200).
///
/// ```
/// use dressing::{special::polygamma, Prec};
/// // ψ⁽¹⁾(1) = π²/6 (DLMF 5.15.2 with ζ(2))
/// let r = polygamma(1, &rug::Complex::with_val(128, 1), Prec::digits(30).unwrap()).unwrap();
/// let want = std::f64::consts::PI.powi(2) / 6.0;
/// assert!((r.value.real().to_f64() - want).abs() < 1e-15);
/// ```
pub fn polygamma<C: ComplexField>(n: u32, z: &C, prec: Prec) -> Result<Approx<C>> {
    check_arg("polygamma", "z", z, prec)?;
    if n > MAX_ORDER {
        return Err(Error::Domain {
            function: "polygamma",
            message: format!("order {n} is above the supported maximum {MAX_ORDER}"),
        });
    }
    if nonpositive_integer(z).is_some() {
        return Err(Error::Pole {
            function: if n == 0 { "digamma" } else { "polygamma" },
            order: n + 1,
            at: show(z),
        });
    }
    if n == 0 && C::MAX_PREC.is_some() {
        let lower = z.im_f64() < 0.0;
        let (v, e) = digamma_double(Complex64::new(z.re_f64(), z.im_f64().abs()));
        let v = if lower { v.conj() } else { v };
        if v.re.is_finite() && v.im.is_finite() {
            let r = Approx::new(
                C::from_f64(v.re, v.im, 53),
                Radius::from_f64(e + f64::EPSILON * v.norm()),
                53,
            );
            return super::refine_double(r, z, |zm, p| polygamma(0, zm, p));
        }
    }
    // Factorials and powers of |z| add to the magnitudes in play.
    let guard = 24 + pole_guard(z) + (log2_factorial(n as f64) / 8.0) as u32;
    let r = adaptive(prec, guard, |wp| eval(n, &z.with_prec(wp), wp));
    // Double path: where the shift or reflection cancelled more than the
    // 1e-14 target allows (high orders near the negative axis), redo the
    // point on MPFR at 53 bits plus guard.
    let r = super::refine_double(r, z, |zm, p| polygamma(n, zm, p))?;
    if !r.value.is_finite() {
        return Err(Error::Overflow {
            function: "polygamma",
            hint: "the value exceeds the double range; use the arbitrary-precision path",
        });
    }
    Ok(r)
}

fn eval<C: ComplexField>(n: u32, z: &C, wp: u32) -> Core<C> {
    if z.re_f64() < reflect_below(wp) {
        reflected(n, z, wp)
    } else {
        shifted(n, z, wp)
    }
}

fn shifted<C: ComplexField>(n: u32, z: &C, wp: u32) -> Core<C> {
    let r = shift_for(z, asymptotic_radius(wp) + n as f64 / 2.0);
    let w = z.clone().add_i64(r);
    let inv_w = w.clone().recip();
    let inv_w2 = inv_w.clone().square();
    let log2_w = w.log2_abs();
    let log2_sec2 = log2_sec2_half_arg(&w);
    let nf = n as f64;
    // |term_k| = |B_{2k}| (2k+n−1)! / (2k)! / |w|^{2k+n}   (n = 0: |B_{2k}|/(2k|w|^{2k}))
    let log2_term = |kk: usize| {
        let m = 2.0 * kk as f64;
        let fact = if n == 0 {
            -m.log2()
        } else {
            log2_factorial(m + nf - 1.0) - log2_factorial(m)
        };
        log2_bernoulli_even(kk) + fact - (m + nf) * log2_w + 0.5 * (m + nf + 1.0) * log2_sec2
    };
    let n_terms = if wp <= 53 {
        12
    } else {
        let target = -(wp as f64) - 4.0 + (log2_factorial(nf) - nf * log2_w).min(0.0);
        let mut t = 1;
        while log2_term(t + 1) > target && t < 8 * wp as usize {
            t += 1;
        }
        t
    };
    let trunc = Radius::from_log2(log2_term(n_terms + 1));
    let zero = C::Real::from_f64(0.0, wp);
    // Σ_k B_{2k}/(2k)! · (2k+n−1)! · w^{−2k} by Horner in w^{−2}, with the
    // integer factor (2k+n−1)! applied per term.
    let series = if n == 0 {
        C::Real::with_table(
            TableKind::StirlingDigamma,
            wp,
            n_terms,
            build_digamma_coeffs::<C::Real>,
            |c| real_poly_at(&c[..n_terms], &inv_w2) * &inv_w2,
        )
    } else {
        C::Real::with_table(
            TableKind::EulerMaclaurin,
            wp,
            n_terms,
            super::hurwitz::build_em::<C::Real>,
            |c| {
                // B_{2k}/(2k)! · (2k+n−1)!
                let coef: Vec<C::Real> = (1..=n_terms)
                    .map(|kk| {
                        let f = Integer::from(Integer::factorial(2 * kk as u32 + n - 1));
                        c[kk - 1].clone() * &C::Real::from_rational(&Rational::from(f), wp)
                    })
                    .collect();
                real_poly_at(&coef, &inv_w2) * &inv_w2
            },
        )
    };
    let nfact = C::Real::from_rational(&Rational::from(Integer::from(Integer::factorial(n))), wp);
    let mut value;
    let mag_log2;
    if n == 0 {
        // ψ(w) ~ ln w − 1/(2w) − Σ B_{2k}/(2k w^{2k})
        let ln_w = w.ln();
        mag_log2 = ln_w.log2_abs().max(-log2_w);
        value = ln_w - &inv_w.clone().mul_pow2(-1) - &series;
    } else {
        // ψ⁽ⁿ⁾(w) ~ (−1)^{n+1} [ (n−1)!/wⁿ + n!/(2w^{n+1}) + Σ B_{2k}(2k+n−1)!/((2k)! w^{2k+n}) ]
        let inv_wn = inv_w.powi(n as i64);
        let nm1 = C::Real::from_rational(
            &Rational::from(Integer::from(Integer::factorial(n - 1))),
            wp,
        );
        let head =
            C::from_reals(nm1, zero.clone()) + &(inv_w.clone().mul_real(&nfact).mul_pow2(-1));
        let inner = (head + &series) * &inv_wn;
        mag_log2 = inner.log2_abs();
        value = if n % 2 == 1 { inner } else { -inner };
    }
    // Recurrence: + (−1)^{n+1} n! Σ_{k<r} (z+k)^{−n−1}
    let mut ops = n_terms * 2 + 8;
    let mut recurrence_mag = f64::NEG_INFINITY;
    if r > 0 {
        let mut sum = C::from_reals(zero.clone(), zero.clone());
        let mut largest = f64::NEG_INFINITY;
        for kk in 0..r {
            let t = z.clone().add_i64(kk).powi(-(n as i64) - 1);
            largest = largest.max(t.log2_abs());
            sum += &t;
        }
        let sum = sum.mul_real(&nfact);
        recurrence_mag = largest + nfact.log2_abs();
        value = if n % 2 == 1 {
            value + &sum
        } else {
            value - &sum
        };
        ops += r as usize * (2 + (32 - (n + 1).leading_zeros()) as usize);
    }
    let mag = mag_log2.max(value.log2_abs()).max(recurrence_mag);
    Core {
        value,
        trunc,
        mag_log2: mag,
        ops,
    }
}

/// Coefficients of `Pₙ(c)` (lowest degree first): `dⁿ/dxⁿ cot x = Pₙ(cot x)`.
fn cot_derivative_poly(n: u32) -> Vec<Integer> {
    let mut p = vec![Integer::from(0), Integer::from(1)]; // P₀ = c
    for _ in 0..n {
        // P' then times −(1 + c²)
        let dp: Vec<Integer> = p
            .iter()
            .enumerate()
            .skip(1)
            .map(|(i, a)| Integer::from(a * i as u64))
            .collect();
        let mut q = vec![Integer::from(0); dp.len() + 2];
        for (i, a) in dp.iter().enumerate() {
            q[i] -= a;
            q[i + 2] -= a;
        }
        p = q;
    }
    p
}

fn reflected<C: ComplexField>(n: u32, z: &C, wp: u32) -> Core<C> {
    let m = z.re_f64().round();
    let w = z.clone().add_real(&C::Real::from_f64(-m, wp));
    let pi: C::Real = constant(k::PI, wp);
    let y = z.im_f64();
    let bits_per_term = 2.0 * std::f64::consts::PI * y.abs() * std::f64::consts::LOG2_E;
    let use_q = if wp <= 53 {
        y.abs() >= 0.5
    } else {
        bits_per_term >= wp as f64 / 40.0
    };
    let (cot_term, mag, ops) = if use_q {
        cot_derivative_by_q(n, &w, &pi, wp)
    } else {
        cot_derivative_by_poly(n, &w, &pi, wp)
    };
    let other = shifted(n, &(C::from_i64(1, wp) - z), wp);
    let refl = if n % 2 == 0 {
        other.value.clone()
    } else {
        -other.value.clone()
    };
    let mag_log2 = other.mag_log2.max(mag);
    Core {
        value: refl - &cot_term,
        trunc: other.trunc,
        mag_log2,
        ops: other.ops + ops,
    }
}

/// `π dⁿ/dzⁿ cot(πz)` as `π^{n+1} Pₙ(cot πw)` (w = z − m), with the size of
/// its largest term (for the cancellation check) and an operation count.
fn cot_derivative_by_poly<C: ComplexField>(
    n: u32,
    w: &C,
    pi: &C::Real,
    wp: u32,
) -> (C, f64, usize) {
    let (s, c) = w.clone().mul_real(pi).sin_cos();
    let cot = c / &s;
    let poly = cot_derivative_poly(n);
    let mut acc = C::from_i64(0, wp);
    let mut mag: f64 = f64::NEG_INFINITY;
    let log2_cot = cot.log2_abs();
    for (i, a) in poly.iter().enumerate().rev() {
        acc *= &cot;
        if *a != 0 {
            mag = mag.max(a.significant_bits() as f64 + i as f64 * log2_cot);
            acc = acc.add_real(&C::Real::from_rational(&Rational::from(a), wp));
        }
    }
    let mut pin1 = pi.clone();
    for _ in 0..n {
        pin1 *= pi;
    }
    let mag = mag + (n + 1) as f64 * pi.log2_abs();
    (acc.mul_real(&pin1), mag, poly.len() * 2 + 10)
}

/// `π dⁿ/dzⁿ cot(πz)` away from the real axis from
/// `cot(πz) = ∓i ∓ 2i Σ_{m≥1} q^m`, `q = e^{±2πiz}` (sign of Im z), so
/// `π dⁿ/dzⁿ cot(πz) = ∓2πi (±2πi)ⁿ Σ_{m≥1} mⁿ q^m` (plus `∓πi` for n = 0):
/// no cancellation, no overflow however large |Im z|.
fn cot_derivative_by_q<C: ComplexField>(n: u32, w: &C, pi: &C::Real, wp: u32) -> (C, f64, usize) {
    let upper = w.im_f64() > 0.0;
    let sign: i64 = if upper { 1 } else { -1 };
    // q = e^{±2πiw}
    let q = w.clone().mul_real(pi).mul_i().mul_i64(2 * sign).exp();
    let log2_q = q.log2_abs();
    let mut sum = C::from_i64(0, wp);
    let mut qm = q.clone();
    let mut m = 1u64;
    let mut first = f64::NEG_INFINITY;
    loop {
        // mⁿ exactly, then rounded once.
        let mn = Integer::from(Integer::u_pow_u(m as u32, n));
        let t = qm
            .clone()
            .mul_real(&C::Real::from_rational(&Rational::from(mn), wp));
        if m == 1 {
            first = t.log2_abs();
        }
        sum += &t;
        let next = (m as f64 + 1.0).log2() * n as f64 + (m + 1) as f64 * log2_q;
        if next < first - wp as f64 - 8.0 || !log2_q.is_finite() || m > 100_000 {
            break;
        }
        qm *= &q;
        m += 1;
    }
    // factor ∓2πi (±2πi)ⁿ
    let two_pi = pi.clone().mul_i64(2);
    let mut factor = C::from_reals(C::Real::from_f64(0.0, wp), two_pi.clone().mul_i64(-sign)); // ∓2πi
    for _ in 0..n {
        factor = factor.mul_real(&two_pi).mul_i().mul_i64(sign);
    }
    let mut v = sum * &factor;
    if n == 0 {
        v += &C::from_reals(C::Real::from_f64(0.0, wp), pi.clone().mul_i64(-sign));
    }
    let mag = v.log2_abs().max(first + factor.log2_abs());
    (v, mag, (m as usize) * 3 + 10)
}

/// `log2` of a bound on `|ψ'(w)|`, for error propagation only: for
/// `Re w = x ≥ ½`, `|ψ'(w)| ≤ |w|^−2 + min(1/x, π/(2|Im w|))` (the series
/// `ψ'(w) = Σ_k (w + k)^−2`, DLMF 5.15.1, bounded by its first term and an
/// integral), and the reflection `ψ'(w) = −ψ'(1 − w) + π²/sin²(πw)`
/// (DLMF 5.15.6) otherwise, with `|ψ'(1 − w)| ≤ π²/2`.
pub(crate) fn trigamma_bound_log2<C: ComplexField>(w: &C) -> f64 {
    trigamma_bound(Complex64::new(w.re_f64(), w.im_f64())).log2()
}

/// The bound of [`trigamma_bound_log2`] itself.
pub(crate) fn trigamma_bound(w: Complex64) -> f64 {
    let pi2 = std::f64::consts::PI.powi(2);
    if w.re >= 0.5 {
        // |ψ'(w)| ≤ Σ_k |w + k|^−2 ≤ |w|^−2 + ∫_0^∞ dk/((x + k)² + y²).
        let tail = (1.0 / w.re).min(std::f64::consts::FRAC_PI_2 / w.im.abs());
        return 1.0 / w.norm_sqr() + tail;
    }
    let u = Complex64::new(
        std::f64::consts::PI * (w.re - w.re.round()),
        std::f64::consts::PI * w.im,
    );
    // |sin u|² = sin²(Re u) + sinh²(Im u)
    let sin2 = (u.re.sin().powi(2) + u.im.sinh().powi(2)).max(1e-300);
    pi2 / 2.0 + pi2 / sin2
}
