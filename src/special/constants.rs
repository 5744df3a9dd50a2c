//! Constants at any precision: π, ln 2π, Euler's γ, ζ'(−1) and Glaisher's A.
//!
//! π and γ come from MPFR. ζ'(−1) is computed here from `G(1) = 1` and the
//! asymptotic expansion of log G (DLMF 5.17.5): with
//! `log G(N+1) = Σ_{j=1}^{N−1} (N−j) ln j` (exact, from `G(z+1) = Γ(z) G(z)`,
//! DLMF 5.17.1) the expansion at `z = N` leaves ζ'(−1) as the only unknown.
//! Glaisher's constant follows from `ln A = 1/12 − ζ'(−1)` (DLMF 5.17.6).

use crate::num::RealField;
use crate::precision::{Approx, Prec, Radius};
use crate::special::with_even_bernoulli;
use rug::float::Constant;
use rug::ops::Pow;
use rug::{Float, Integer};

pub(crate) use crate::num::tables::constant::COUNT;
use crate::num::tables::constant::*;

/// Builds the constants table at `prec` bits (the length argument is fixed).
pub(crate) fn build<R: RealField>(prec: u32, _len: usize) -> Vec<R> {
    let wp = prec.max(64) + 32;
    let pi = Float::with_val(wp, Constant::Pi);
    let ln_2pi = Float::with_val(wp, &pi * 2u32).ln();
    let half = Float::with_val(wp, &ln_2pi / 2u32);
    let gamma = Float::with_val(wp, Constant::Euler);
    let zp = zeta_prime_minus_one_float(wp);
    let mut v = vec![R::from_f64(0.0, prec); COUNT];
    v[PI] = R::from_float(&Float::with_val(prec, &pi));
    v[LN_2PI] = R::from_float(&Float::with_val(prec, &ln_2pi));
    v[HALF_LN_2PI] = R::from_float(&Float::with_val(prec, &half));
    v[EULER_GAMMA] = R::from_float(&Float::with_val(prec, &gamma));
    v[ZETA_PRIME_MINUS_ONE] = R::from_float(&Float::with_val(prec, &zp));
    v
}

/// ζ'(−1) at `wp` bits (internal; adds its own guard bits).
fn zeta_prime_minus_one_float(wp: u32) -> Float {
    let n = (0.15 * wp as f64).ceil() as u32 + 10;
    let guard = 2 * (32 - n.leading_zeros()) + 24;
    let p = wp + guard;
    // log G(N+1) = ln Π_{j<N} j^(N−j), exactly as an integer.
    let big = balanced_product((1..n).map(|j| Integer::from(j).pow(n - j)).collect());
    let log_g = Float::with_val(p, &big).ln();
    let nf = Float::with_val(p, n);
    let ln_n = Float::with_val(p, nf.ln_ref());
    let pi = Float::with_val(p, Constant::Pi);
    let ln_2pi = Float::with_val(p, &pi * 2u32).ln();
    let n2 = Float::with_val(p, &nf * &nf);
    // (N²/2 − 1/12) ln N − 3N²/4 + (N/2) ln 2π
    let mut main = Float::with_val(p, &n2 / 2u32) - Float::with_val(p, 1) / 12u32;
    main *= &ln_n;
    main -= Float::with_val(p, &n2 * 3u32) / 4u32;
    main += Float::with_val(p, &nf * &ln_2pi) / 2u32;
    // Σ_k B_{2k+2} / (4k(k+1) N^{2k}) until the terms drop below 2^-p.
    let inv_n2 = Float::with_val(p, n2.recip_ref());
    let mut series = Float::with_val(p, 0);
    let mut pow = Float::with_val(p, &inv_n2);
    let mut k = 1usize;
    loop {
        let term = with_even_bernoulli(k + 1, |b| {
            Float::with_val(p, &b[k + 1]) / Integer::from(4 * k as u64 * (k as u64 + 1))
        }) * &pow;
        let small = term.is_zero() || term.clone().abs().log2().to_f64() < -(p as f64) - 8.0;
        series += &term;
        if small || k > 4 * p as usize {
            break;
        }
        pow *= &inv_n2;
        k += 1;
    }
    let zp = log_g - main - series;
    Float::with_val(wp, &zp)
}

fn balanced_product(mut v: Vec<Integer>) -> Integer {
    if v.is_empty() {
        return Integer::from(1);
    }
    while v.len() > 1 {
        let mut next = Vec::with_capacity(v.len().div_ceil(2));
        let mut it = v.into_iter();
        while let Some(a) = it.next() {
            match it.next() {
                Some(b) => next.push(a * b),
                None => next.push(a),
            }
        }
        v = next;
    }
    v.pop().expect("non-empty")
}

fn exact_constant(value: Float, prec: Prec) -> Approx<Float> {
    let out = Float::with_val(prec.bits(), &value);
    let r = Radius::from_log2(out.clone().abs().log2().to_f64() - prec.bits() as f64);
    Approx::new(out, r, prec.bits())
}

/// Euler's constant γ (from MPFR), rounded to `prec`.
///
/// ```
/// let g = dressing::special::euler_gamma(dressing::Prec::digits(30).unwrap());
/// assert!((g.value.to_f64() - 0.5772156649015329).abs() < 1e-16);
/// ```
pub fn euler_gamma(prec: Prec) -> Approx<Float> {
    exact_constant(Float::with_val(prec.bits() + 16, Constant::Euler), prec)
}

/// ζ'(−1) = 1/12 − ln A, computed from the asymptotic expansion of log G.
///
/// ```
/// let z = dressing::special::zeta_prime_minus_one(dressing::Prec::digits(30).unwrap());
/// assert!((z.value.to_f64() + 0.16542114370045092).abs() < 1e-16);
/// ```
pub fn zeta_prime_minus_one(prec: Prec) -> Approx<Float> {
    exact_constant(zeta_prime_minus_one_float(prec.bits() + 16), prec)
}

/// Glaisher's constant A = exp(1/12 − ζ'(−1)) (DLMF 5.17.6).
///
/// ```
/// let a = dressing::special::glaisher(dressing::Prec::digits(30).unwrap());
/// assert!((a.value.to_f64() - 1.2824271291006226).abs() < 1e-15);
/// ```
pub fn glaisher(prec: Prec) -> Approx<Float> {
    let wp = prec.bits() + 16;
    let z = zeta_prime_minus_one_float(wp);
    let a = (Float::with_val(wp, 1) / 12u32 - z).exp();
    exact_constant(a, prec)
}
