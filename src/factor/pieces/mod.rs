//! Finite pieces of scalar factors: products of gamma functions
//! ([`FiniteGamma`]), of Barnes G functions ([`BarnesFactor`]) and of CDD
//! blocks ([`CddBlock`]), each factor raised to an integer power.
//!
//! **Branch: the sum of principal logs.** `log_value` returns
//! `Σ_j n_j · log F_j`, where `log F_j` is the standard branch of each factor
//! on its own: the principal log-gamma [`log_gamma`](crate::special::log_gamma)
//! (analytic on `C \ (−∞, 0]`), the log G of
//! [`log_barnes_g`](crate::special::log_barnes_g) (continuous on
//! `C \ (−∞, 0]`, real for `w > 0`), and the principal logarithm of each
//! block value `f_α(θ)` (imaginary part in `(−π, π]`). The exponential of the
//! result is the piece's value; the logarithm as a function of θ jumps by
//! multiples of `2πi` where a factor crosses its cut, and the caller fixes
//! branches by path continuation.
//!
//! **Poles and zeros.** At a point where some factors are singular the
//! orders are summed over all factors there (with their powers): a positive
//! total is [`Error::Pole`], a negative one [`Error::Zero`], and a total of
//! zero (numerator and denominator cancel) is [`Error::Domain`] saying that
//! the point is removable and to evaluate nearby — the convention of
//! [`GammaProduct`](super::GammaProduct). A factor is taken to be singular when
//! its argument is within `2^(8 − wp)` (relative to the size of the terms it
//! was computed from) of a singular point, `wp` being the first working
//! precision (53 bits on the double path, `prec + 24` plus a magnitude guard
//! otherwise); nearer points than that cannot be told apart from the
//! singular point by the arithmetic that produced them.
//!
//! **Error estimate.** The radius is the sum of the factors' own radii
//! (times `|n_j|`), the propagation of the rounding of each argument through
//! the derivative of the factor's logarithm (`ψ` for Γ,
//! `(w − 1)ψ(w) − w + (1 + ln 2π)/2` for log G, `2i/(1 + u²)` for the block),
//! the rounding of the sum and the final rounding. On the arbitrary path the
//! working precision is raised (at most three times) until that radius is
//! below `2^−(prec+4)` of the result, so cancellation between factors and
//! arguments near singular points cost guard bits, not digits.

mod affine;
mod cdd;

pub use affine::{BarnesFactor, FiniteGamma};
pub use cdd::CddBlock;

use super::coef::Coef;
use crate::error::Error;
use crate::num::ComplexField;

/// The largest `|power|` a factor may carry (2^20).
const MAX_POWER: i64 = 1 << 20;

/// Guard bits of the first pass on the arbitrary path.
const BASE_GUARD: u32 = 24;

/// The error for a point where the summed pole order of the singular factors
/// is `order` (negative: a zero; zero: removable).
fn singular(function: &'static str, order: i64, at: String) -> Error {
    match order {
        o if o > 0 => Error::Pole {
            function,
            order: o.min(u32::MAX as i64) as u32,
            at,
        },
        o if o < 0 => Error::Zero {
            function,
            order: (-o).min(u32::MAX as i64) as u32,
            at,
        },
        _ => Error::Domain {
            function,
            message: format!(
                "poles and zeros of the factors cancel at {at} (a removable point); evaluate at \
                 a nearby rapidity"
            ),
        },
    }
}

/// Where a point is, for error messages.
fn at_theta<C: ComplexField>(theta: &C) -> String {
    format!("θ = {}", theta.to_decimal(17))
}

/// Checks a power: non-zero and at most [`MAX_POWER`] in size.
fn check_power(function: &'static str, what: &str, n: i64) -> crate::Result<()> {
    if n == 0 {
        return Err(Error::Domain {
            function,
            message: format!("{what} has power 0: it contributes nothing; drop it"),
        });
    }
    if n.unsigned_abs() > MAX_POWER as u64 {
        return Err(Error::Domain {
            function,
            message: format!(
                "{what} has power {n}, above the cap of {MAX_POWER} in size; split the piece or \
                 reduce the power"
            ),
        });
    }
    Ok(())
}

/// Checks that a coefficient has a finite value.
fn check_coef(function: &'static str, argument: &'static str, c: &Coef) -> crate::Result<()> {
    if c.value(64).is_finite() {
        Ok(())
    } else {
        Err(Error::NonFinite { function, argument })
    }
}

/// `^n` for a power (nothing for 1), as in `Γ(1 − z)^-1`.
fn power_suffix(n: i64) -> String {
    if n == 1 {
        String::new()
    } else {
        format!("^{n}")
    }
}

/// How a coefficient is written: (negative, magnitude text); exact
/// rationals as `3/2`, computed values by their label (parenthesised when
/// it is not a single word).
fn coef_text(c: &Coef) -> (bool, String) {
    match c.exact() {
        Some(q) => (*q < 0, rug::Rational::from(q.abs_ref()).to_string()),
        None => {
            let l = c.label().trim();
            let word = l
                .chars()
                .all(|ch| ch.is_alphanumeric() || ch == '_' || ch == '√');
            (
                false,
                if word {
                    l.to_string()
                } else {
                    format!("({l})")
                },
            )
        }
    }
}

/// `b + s·var`, e.g. `1/2 + z`, `1 − 2z/3`, `−z`, `√2 + (pi/xi)·z`.
fn affine_text(offset: &Coef, slope: &Coef, var: &str) -> String {
    let slope_part = match slope.exact() {
        Some(q) if *q == 0 => None,
        Some(q) => {
            let (num, den) = (q.numer().clone().abs(), q.denom().clone());
            let n = if num == 1 {
                var.to_string()
            } else {
                format!("{num}{var}")
            };
            let t = if den == 1 { n } else { format!("{n}/{den}") };
            Some((*q < 0, t))
        }
        None => {
            let (neg, t) = coef_text(slope);
            Some((neg, format!("{t}·{var}")))
        }
    };
    let offset_part = match offset.exact() {
        Some(q) if *q == 0 => None,
        _ => Some(coef_text(offset)),
    };
    match (offset_part, slope_part) {
        (None, None) => "0".into(),
        (Some((neg, b)), None) => format!("{}{b}", if neg { "−" } else { "" }),
        (None, Some((neg, s))) => format!("{}{s}", if neg { "−" } else { "" }),
        (Some((nb, b)), Some((ns, s))) => format!(
            "{}{b} {} {s}",
            if nb { "−" } else { "" },
            if ns { "−" } else { "+" }
        ),
    }
}

/// Runs `eval(wp, tol_wp)` at `prec + guard` bits (53 on the double path),
/// raising the guard (at most three times) while the radius exceeds
/// `2^−(prec+4)` of the value; singular points are always decided at the
/// first working precision `tol_wp`. Rounds the result to `prec`.
fn refine<C: ComplexField>(
    prec: crate::Prec,
    theta: &C,
    eval: impl Fn(u32, u32) -> crate::Result<(C, crate::Radius)>,
) -> crate::Result<crate::Approx<C>> {
    let double = C::MAX_PREC.is_some();
    let cap = 8 * prec.bits() + 256;
    let mut guard = BASE_GUARD + theta.log2_abs().max(0.0).ceil().min(4096.0) as u32;
    let mut detect_wp = None;
    let mut reruns = 0;
    loop {
        let wp = if double {
            53
        } else {
            prec.bits().saturating_add(guard)
        };
        let tol_wp = *detect_wp.get_or_insert(wp);
        let (value, rad) = eval(wp, tol_wp)?;
        if !double && reruns < 3 && guard < cap && !rad.is_zero() {
            let excess = rad.log2() - (value.log2_abs() - prec.bits() as f64 - 4.0);
            if excess > 0.0 {
                let add = if excess.is_finite() {
                    excess.ceil().min(cap as f64) as u32 + 8
                } else {
                    guard
                };
                guard = guard.saturating_add(add).min(cap);
                reruns += 1;
                continue;
            }
        }
        return Ok(crate::special::finish(value, rad, prec));
    }
}

/// `log2(2^a + 2^b)`.
fn log2_add(a: f64, b: f64) -> f64 {
    let (hi, lo) = if a >= b { (a, b) } else { (b, a) };
    if hi == f64::NEG_INFINITY {
        return hi;
    }
    hi + (1.0 + (lo - hi).exp2()).log2()
}
