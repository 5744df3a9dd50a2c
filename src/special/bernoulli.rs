//! Bernoulli numbers as exact rationals, cached.
//!
//! Small indices come from the classical recurrence
//! `Σ_{j=0}^{m} C(m+1, j) B_j = 0`; larger ones from
//! `B_{2k} = (−1)^{k+1} 2 (2k)! ζ(2k) / (2π)^{2k}` (DLMF 24.7.? / 25.6.2)
//! with the denominator fixed exactly by the von Staudt–Clausen theorem
//! (DLMF 24.10.1) and the numerator recovered by rounding a value computed
//! with a margin of 32 bits. Both routes give exact rationals; the tests check
//! they agree where both run and against mpmath's `bernfrac`.

use rug::float::Constant;
use rug::ops::Pow;
use rug::{Float, Integer, Rational};
use std::sync::{OnceLock, RwLock};

/// Below this even index the recurrence is used; at and above it, ζ(2k).
const RECURRENCE_LIMIT: u32 = 64;

fn table() -> &'static RwLock<Vec<Rational>> {
    static T: OnceLock<RwLock<Vec<Rational>>> = OnceLock::new();
    T.get_or_init(|| RwLock::new(Vec::new()))
}

/// The Bernoulli number `B_n` exactly (`B_1 = −1/2`, DLMF 24.2.1).
///
/// ```
/// use dressing::special::bernoulli;
/// use rug::Rational;
/// assert_eq!(bernoulli(12), Rational::from((-691, 2730)));
/// assert_eq!(bernoulli(1), Rational::from((-1, 2)));
/// assert_eq!(bernoulli(7), 0);
/// ```
pub fn bernoulli(n: u32) -> Rational {
    match n {
        0 => Rational::from(1),
        1 => Rational::from((-1, 2)),
        _ if n % 2 == 1 => Rational::new(),
        _ => {
            let k = (n / 2) as usize;
            ensure_even_table(k);
            table().read().expect("bernoulli table poisoned")[k].clone()
        }
    }
}

/// Calls `f` with the cached slice `[B_0, B_2, …, B_{2·k_max}]`, filling the
/// cache first where needed. Used by the asymptotic series so they read the
/// table once without cloning big rationals.
pub(crate) fn with_even_bernoulli<T>(k_max: usize, f: impl FnOnce(&[Rational]) -> T) -> T {
    ensure_even_table(k_max);
    let t = table().read().expect("bernoulli table poisoned");
    f(&t[..=k_max])
}

fn ensure_even_table(k_max: usize) {
    if table().read().expect("bernoulli table poisoned").len() > k_max {
        return;
    }
    let mut t = table().write().expect("bernoulli table poisoned");
    if t.len() > k_max {
        return;
    }
    let start = t.len();
    if start < RECURRENCE_LIMIT as usize / 2 {
        let limit = (RECURRENCE_LIMIT as usize / 2).min(k_max + 1).max(1);
        let all = by_recurrence(2 * (limit as u32 - 1));
        t.clear();
        for k in 0..limit {
            t.push(all[2 * k].clone());
        }
    }
    for k in t.len()..=k_max {
        let b = by_zeta(2 * k as u32);
        t.push(b);
    }
}

/// `B_0 … B_n` from the recurrence, exact (quadratic cost; small `n` only).
pub(crate) fn by_recurrence(n: u32) -> Vec<Rational> {
    let n = n as usize;
    let mut b: Vec<Rational> = Vec::with_capacity(n + 1);
    b.push(Rational::from(1));
    for m in 1..=n {
        // Σ_{j=0}^{m} C(m+1, j) B_j = 0  ⇒  B_m = −(Σ_{j<m} C(m+1, j) B_j)/(m+1)
        let mut s = Rational::new();
        let mut c = Integer::from(1); // C(m+1, 0)
        for (j, bj) in b.iter().enumerate() {
            if !bj.is_zero() {
                s += Rational::from(&c * bj);
            }
            c = c * (m + 1 - j) as u64 / (j + 1) as u64;
        }
        b.push(-s / Integer::from(m + 1));
    }
    b
}

/// The exact denominator of `B_{2k}`: the product of the primes `p` with
/// `(p − 1) | 2k` (von Staudt–Clausen, DLMF 24.10.1).
fn staudt_denominator(two_k: u32) -> Integer {
    let mut divisors = Vec::new();
    let mut d = 1u32;
    while d * d <= two_k {
        if two_k % d == 0 {
            divisors.push(d);
            if d * d != two_k {
                divisors.push(two_k / d);
            }
        }
        d += 1;
    }
    divisors
        .into_iter()
        .filter(|&d| is_prime(d + 1))
        .fold(Integer::from(1), |acc, d| acc * (d + 1))
}

fn is_prime(p: u32) -> bool {
    if p < 2 {
        return false;
    }
    let mut q = 2u32;
    while q * q <= p {
        if p % q == 0 {
            return false;
        }
        q += 1;
    }
    true
}

/// `B_{2k}` from ζ(2k), exact.
pub(crate) fn by_zeta(two_k: u32) -> Rational {
    let k = two_k / 2;
    let den = staudt_denominator(two_k);
    // |numerator| ≈ 2 (2k)! D / (2π)^{2k}; size it in f64 logs.
    let log2_num =
        1.0 + ln_factorial(two_k) / std::f64::consts::LN_2 + den.significant_bits() as f64
            - two_k as f64 * (2.0 * std::f64::consts::PI).log2();
    let prec = (log2_num.max(0.0) as u32) + 48;
    // ζ(2k) by direct summation: stop once n^{-2k} < 2^{-prec-4}. Only used
    // for 2k ≥ RECURRENCE_LIMIT, where a handful of terms suffice.
    let mut zeta = Float::with_val(prec, 1);
    let mut n = 2u32;
    while two_k as f64 * (n as f64).log2() <= prec as f64 + 4.0 {
        zeta += Float::with_val(prec, n).pow(-(two_k as i32));
        n += 1;
    }
    let mut fact = Float::with_val(prec, Integer::from(Integer::factorial(two_k)));
    fact *= 2;
    let two_pi = Float::with_val(prec, Constant::Pi) * 2u32;
    let val = fact * zeta * Float::with_val(prec, &den) / two_pi.pow(two_k);
    let num = val
        .to_integer()
        .expect("finite by construction: factorial over a power of 2π");
    let num = if k % 2 == 1 { num } else { -num };
    Rational::from((num, den))
}

/// `ln n!` in double precision (for sizing only).
fn ln_factorial(n: u32) -> f64 {
    (1..=n).map(|j| (j as f64).ln()).sum()
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn zeta_route_matches_recurrence() {
        // Two independent exact routes must agree bit for bit.
        let rec = by_recurrence(140);
        for two_k in (20..=140).step_by(2) {
            assert_eq!(by_zeta(two_k), rec[two_k as usize], "B_{two_k}");
        }
    }

    #[test]
    fn staudt_examples() {
        // Denominators from DLMF Table 24.2.1 (B_2 … B_12): 6, 30, 42, 30, 66, 2730.
        let want = [6, 30, 42, 30, 66, 2730];
        for (i, w) in want.iter().enumerate() {
            assert_eq!(staudt_denominator(2 * (i as u32 + 1)), *w);
        }
    }
}
