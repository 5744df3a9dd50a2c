//! The Hurwitz zeta function ζ(s, a) by Euler–Maclaurin summation.
//!
//! `ζ(s, a) = Σ_{k<M} (a+k)^{−s} + (a+M)^{1−s}/(s−1) + ½(a+M)^{−s}
//!  + Σ_{j=1}^{J} B_{2j}/(2j)! · (s)_{2j−1} (a+M)^{−s−2j+1} + R`
//! (DLMF 25.11.1 with the Euler–Maclaurin formula DLMF 2.10.1), where
//! `(s)_m = s(s+1)…(s+m−1)`. `M` is chosen so that `|a + M|` passes the
//! asymptotic radius plus `|s|/2`, `J` from the size of the first neglected term;
//! the estimate of `|R|` is that term times `|s + 2J + 1| / (Re s + 2J + 1)`.
//!
//! Powers are principal: for integer `s` any `a` off the poles works; for
//! other `s` we require `Re a > 0`, where the principal powers are the
//! standard definition.

use super::{adaptive, asymptotic_radius, check_arg, log2_bernoulli_even, log2_factorial, Core};
use crate::error::{Error, Result};
use crate::num::tables::TableKind;
use crate::num::{exact_integer, ComplexField, RealField};
use crate::precision::{Approx, Prec, Radius};
use crate::special::with_even_bernoulli;
use rug::{Integer, Rational};

/// `B_{2j}/(2j)!` for j = 1, 2, … (entry j−1): Euler–Maclaurin and polygamma series.
pub(crate) fn build_em<R: RealField>(prec: u32, len: usize) -> Vec<R> {
    with_even_bernoulli(len, |b| {
        (1..=len)
            .map(|j| {
                let f = Integer::from(Integer::factorial(2 * j as u32));
                R::from_rational(&Rational::from(&b[j] / f), prec)
            })
            .collect()
    })
}

/// The farthest left `Re a` accepted (the direct part of the sum has about
/// `−Re a` terms).
pub const MIN_REAL_PART: f64 = -1.0e5;

/// The Hurwitz zeta function ζ(s, a) = Σ_{k≥0} (a + k)^{−s}.
///
/// Errors: [`Error::Pole`] at `s = 1`, and of order `s` at `a = 0, −1, −2, …`
/// for integer `s ≥ 1`; [`Error::Domain`] for non-integer `s` with `Re a ≤ 0`.
///
/// ```
/// use dressing::{special::hurwitz_zeta, Prec};
/// use num_complex::Complex64;
/// // ζ(2, 1) = π²/6 (DLMF 25.6.1)
/// let r = hurwitz_zeta(&Complex64::new(2.0, 0.0), &Complex64::new(1.0, 0.0), Prec::DOUBLE).unwrap();
/// assert!((r.value.re - std::f64::consts::PI.powi(2) / 6.0).abs() < 1e-15);
/// ```
pub fn hurwitz_zeta<C: ComplexField>(s: &C, a: &C, prec: Prec) -> Result<Approx<C>> {
    check_arg("hurwitz_zeta", "s", s, prec)?;
    check_arg("hurwitz_zeta", "a", a, prec)?;
    let s_int = if s.im().is_zero() {
        exact_integer(&s.re())
    } else {
        None
    };
    if s_int == Some(1) {
        return Err(Error::Pole {
            function: "hurwitz_zeta",
            order: 1,
            at: "s = 1".into(),
        });
    }
    let a_pole = super::nonpositive_integer(a);
    match s_int {
        Some(n) if n >= 1 && a_pole.is_some() => {
            return Err(Error::Pole {
                function: "hurwitz_zeta",
                order: n as u32,
                at: format!("a = {}", a_pole.unwrap_or(0)),
            })
        }
        None if a.re_f64() <= 0.0 => {
            return Err(Error::Domain {
                function: "hurwitz_zeta",
                message: "for non-integer s the parameter a must have Re a > 0".into(),
            })
        }
        _ => {}
    }
    if a.re_f64() < MIN_REAL_PART {
        return Err(Error::Domain {
            function: "hurwitz_zeta",
            message: format!(
                "Re a = {:e} is left of the supported {MIN_REAL_PART:e} (the direct sum grows with \
                 −Re a); shift a with ζ(s, a) = ζ(s, a + m) + Σ_{{k<m}} (a + k)^(−s) analytically first",
                a.re_f64()
            ),
        });
    }
    let guard = 24 + super::pole_guard(a) + s.log2_abs().max(1.0).log2().ceil() as u32;
    Ok(adaptive(prec, guard, |wp| {
        euler_maclaurin(&s.with_prec(wp), s_int, &a.with_prec(wp), wp)
    }))
}

/// `x^{−s}` on the principal branch, by repeated squaring for integer `s`.
fn pow_neg<C: ComplexField>(x: &C, s: &C, s_int: Option<i64>) -> C {
    match s_int {
        Some(n) => x.powi(-n),
        None => (-(s.clone()) * &x.ln()).exp(),
    }
}

fn euler_maclaurin<C: ComplexField>(s: &C, s_int: Option<i64>, a: &C, wp: u32) -> Core<C> {
    let s_abs = s.log2_abs().exp2();
    let sigma = s.re_f64();
    let radius = asymptotic_radius(wp) + s_abs / 2.0;
    let mut m = (radius - a.re_f64()).ceil().max(0.0) as i64;
    if a.im_f64().abs() > radius {
        m = m.min((-a.re_f64()).ceil().max(0.0) as i64);
    }
    let n_big = a.clone().add_i64(m);
    let log2_n = n_big.log2_abs();
    let arg_n = n_big.arg_f64();
    // |N^{−s−m}| = |N|^{−Re s − m} e^{Im s · arg N}
    let log2_pow =
        |extra: f64| -(sigma + extra) * log2_n + s.im_f64() * arg_n * std::f64::consts::LOG2_E;
    // log2 |B_{2j}/(2j)! (s)_{2j−1} N^{−s−2j+1}|
    let mut log2_rising = s.log2_abs(); // (s)_1
    let mut rising_at = 1usize; // (s)_{rising_at}
    let mut term_log2 = |j: usize| {
        while rising_at < 2 * j - 1 {
            log2_rising += s.clone().add_i64(rising_at as i64).log2_abs();
            rising_at += 1;
        }
        log2_bernoulli_even(j) - log2_factorial(2.0 * j as f64)
            + log2_rising
            + log2_pow(2.0 * j as f64 - 1.0)
    };
    let head_log2 = log2_pow(0.0).max(log2_pow(-1.0));
    let target = head_log2 - wp as f64 - 4.0;
    let mut j_terms = 1usize;
    while term_log2(j_terms + 1) > target && j_terms < 8 * wp as usize {
        j_terms += 1;
    }
    let next = term_log2(j_terms + 1);
    let factor = ((s_abs + 2.0 * j_terms as f64 + 1.0) / (sigma + 2.0 * j_terms as f64 + 1.0))
        .abs()
        .max(1.0);
    let trunc = Radius::from_log2(next + factor.log2());

    let zero = C::Real::from_f64(0.0, wp);
    let mut direct = C::from_reals(zero.clone(), zero.clone());
    let mut mag = f64::NEG_INFINITY;
    for kk in 0..m {
        let t = pow_neg(&a.clone().add_i64(kk), s, s_int);
        mag = mag.max(t.log2_abs());
        direct += &t;
    }
    let n_pow_s = pow_neg(&n_big, s, s_int); // N^{−s}
    let one = C::from_i64(1, wp);
    let integral = n_big.clone() * &n_pow_s / &(s.clone() - &one); // N^{1−s}/(s−1)
    let half = n_pow_s.clone().mul_pow2(-1);
    // Σ_j B_{2j}/(2j)! (s)_{2j−1} N^{−s−2j+1}: term ratio (s+2j−1)(s+2j)/N².
    let inv_n = n_big.clone().recip();
    let inv_n2 = inv_n.clone().square();
    let tail = C::Real::with_table(
        TableKind::EulerMaclaurin,
        wp,
        j_terms,
        build_em::<C::Real>,
        |c| {
            let mut sum = C::from_reals(zero.clone(), zero.clone());
            let mut p = n_pow_s.clone() * &inv_n * s; // (s)_1 N^{−s−1}
            for j in 1..=j_terms {
                sum += &p.clone().mul_real(&c[j - 1]);
                let a1 = s.clone().add_i64(2 * j as i64 - 1);
                let a2 = s.clone().add_i64(2 * j as i64);
                p = p * &a1 * &a2 * &inv_n2;
            }
            sum
        },
    );
    mag = mag
        .max(integral.log2_abs())
        .max(half.log2_abs())
        .max(tail.log2_abs());
    let value = direct + &integral + &half + &tail;
    Core {
        value,
        trunc,
        mag_log2: mag,
        ops: m as usize * 8 + j_terms * 4 + 10,
    }
}
