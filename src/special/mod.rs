//! Complex special functions on both numeric paths.
//!
//! Every function takes the argument and an explicit [`Prec`]; it works at
//! `prec` plus guard bits and returns an [`Approx`](crate::Approx) whose radius estimates
//! the absolute error. On the double path (`Complex64`) the precision must be
//! at most 53 bits. Poles come back as [`Error::Pole`], zeros of a function
//! whose logarithm is asked for as [`Error::Zero`]; never as NaN or infinity.
//!
//! | function | what | method |
//! |---|---|---|
//! | [`log_gamma`] | principal log Γ | shift + Stirling, reflection for Re z ≪ 0, Taylor near 1 and 2 (double path) |
//! | [`gamma`], [`rgamma`] | Γ and 1/Γ | `exp(±log Γ)` |
//! | [`digamma`], [`polygamma`] | ψ⁽ⁿ⁾ | shift + asymptotic series, reflection via cot derivatives |
//! | [`log_barnes_g`], [`barnes_g`] | log G, G | shift + asymptotic series |
//! | [`hurwitz_zeta`] | ζ(s, a) | Euler–Maclaurin |
//! | [`bernoulli`] | B_n exact | recurrence / ζ(2k) with von Staudt–Clausen |

mod barnes;
mod bernoulli;
mod constants;
mod hurwitz;
mod loggamma;
mod polygamma;

pub(crate) use barnes::log_barnes_g_f64_absolute;
pub use barnes::{barnes_g, log_barnes_g};
pub use bernoulli::bernoulli;
pub(crate) use bernoulli::with_even_bernoulli;
pub use constants::{euler_gamma, glaisher, zeta_prime_minus_one};
pub use hurwitz::hurwitz_zeta;
pub use loggamma::{gamma, log_gamma, rgamma};
pub use polygamma::{digamma, polygamma};
pub(crate) use polygamma::{digamma_f64_absolute, trigamma_bound, trigamma_bound_log2};

use crate::error::{Error, Result};
use crate::num::{ComplexField, RealField};
use crate::precision::{Prec, Radius};

/// Validates an argument and a precision for `function` on the path of `C`.
pub(crate) fn check_arg<C: ComplexField>(
    function: &'static str,
    argument: &'static str,
    z: &C,
    prec: Prec,
) -> Result<()> {
    if !z.is_finite() {
        return Err(Error::NonFinite { function, argument });
    }
    check_prec::<C>(prec)
}

/// Validates a precision for the path of `C`.
pub(crate) fn check_prec<C: ComplexField>(prec: Prec) -> Result<()> {
    if let Some(max) = C::MAX_PREC {
        if prec.bits() > max {
            return Err(Error::DoubleTooPrecise {
                requested_bits: prec.bits(),
            });
        }
    }
    Ok(())
}

/// If `z` is exactly a non-positive integer, that integer.
pub(crate) fn nonpositive_integer<C: ComplexField>(z: &C) -> Option<i64> {
    if !z.im().is_zero() {
        return None;
    }
    crate::num::exact_integer(&z.re()).filter(|&n| n <= 0)
}

/// Human-readable location for error messages.
pub(crate) fn show<C: ComplexField>(z: &C) -> String {
    let (re, im) = (z.re_f64(), z.im_f64());
    if im == 0.0 {
        format!("z = {re}")
    } else {
        format!("z = {re}{im:+}i")
    }
}

/// Rounding error estimate: `ops` operations at `wp` bits on terms of size `2^log2_mag`.
pub(crate) fn rounding_radius(log2_mag: f64, wp: u32, ops: usize) -> Radius {
    Radius::from_log2(log2_mag - wp as f64 + ((ops as f64) + 1.0).log2())
}

/// Rounds `v` to `prec` bits and adds the rounding to `radius`.
pub(crate) fn finish<C: ComplexField>(
    v: C,
    radius: Radius,
    prec: Prec,
) -> crate::precision::Approx<C> {
    let out_prec = C::MAX_PREC.unwrap_or(prec.bits());
    let rounded = v.with_prec(out_prec);
    let r = radius + Radius::from_log2(v.log2_abs() - out_prec as f64);
    crate::precision::Approx::new(rounded, r, out_prec)
}

/// Common constants at working precision, from the per-precision table.
pub(crate) fn constant<R: RealField>(index: usize, prec: u32) -> R {
    R::with_table(
        crate::num::tables::TableKind::Constants,
        prec,
        constants::COUNT,
        constants::build::<R>,
        |t| t[index].clone(),
    )
}

/// One evaluation at a fixed working precision, before rounding.
pub(crate) struct Core<C> {
    /// The value at working precision.
    pub value: C,
    /// Truncation error bound.
    pub trunc: Radius,
    /// log2 of the largest intermediate term (for the rounding estimate).
    pub mag_log2: f64,
    /// Rough operation count (for the rounding estimate).
    pub ops: usize,
}

impl<C: ComplexField> Core<C> {
    fn radius(&self, wp: u32) -> Radius {
        self.trunc + rounding_radius(self.mag_log2, wp, self.ops)
    }
}

/// Runs `eval` at `prec + guard` bits; where the result came out much smaller
/// than the terms it was computed from (cancellation), raises the guard by the
/// bits lost and runs again. On the double path runs once at 53 bits.
pub(crate) fn adaptive<C: ComplexField>(
    prec: Prec,
    guard: u32,
    eval: impl Fn(u32) -> Core<C>,
) -> crate::precision::Approx<C> {
    if C::MAX_PREC.is_some() {
        let core = eval(53);
        let r = core.radius(53);
        return finish(core.value, r, prec);
    }
    let mut guard = guard;
    let mut rounds = 0;
    loop {
        let wp = prec.with_guard(guard);
        let core = eval(wp);
        let lost = core.mag_log2 - core.value.log2_abs();
        let cap = 8 * prec.bits() + 256;
        rounds += 1;
        // Three rounds at most: a value that keeps vanishing as the precision
        // grows is (numerically) a zero, and its radius says so in absolute terms.
        if lost.is_finite() && lost > guard as f64 - 12.0 && guard < cap && rounds <= 3 {
            guard = (lost.ceil() as u32 + 24).max(guard + 16).min(cap);
            continue;
        }
        let r = core.radius(wp);
        return finish(core.value, r, prec);
    }
}

/// Guard bits for an argument near a non-positive integer: the distance to
/// it, relative to |z|, must survive rounding z to the working precision.
pub(crate) fn pole_guard<C: ComplexField>(z: &C) -> u32 {
    let m = z.re_f64().round();
    if m >= 0.0 {
        // Near 0 the distance to the pole is |z| itself, which floating
        // point keeps to full relative precision at any magnitude.
        return 0;
    }
    let d = z.clone().add_real(&C::Real::from_f64(-m, 53)).log2_abs();
    (z.log2_abs() - d).max(0.0).ceil() as u32
}

/// `log2 |B_{2k}|` from `|B_{2k}| ≈ 2 (2k)! / (2π)^{2k}` (DLMF 24.9.8); within
/// a fraction of a bit, used only to plan series lengths.
pub(crate) fn log2_bernoulli_even(k: usize) -> f64 {
    let n = 2.0 * k as f64;
    1.0 + log2_factorial(n) - n * (2.0 * std::f64::consts::PI).log2()
}

/// `log2 Γ(x+1)` for real `x ≥ 0` (planning only).
pub(crate) fn log2_factorial(x: f64) -> f64 {
    let (mut y, mut acc) = (x + 1.0, 0.0);
    while y < 8.0 {
        acc -= y.ln();
        y += 1.0;
    }
    let lg = acc + (y - 0.5) * y.ln() - y + 0.918_938_533_204_672_8 + 1.0 / (12.0 * y)
        - 1.0 / (360.0 * y * y * y);
    lg * std::f64::consts::LOG2_E
}

/// `log2 sec²(½ arg w) = log2(2|w| / (|w| + Re w))`, the growth factor of
/// asymptotic remainders off the positive axis.
pub(crate) fn log2_sec2_half_arg<C: ComplexField>(w: &C) -> f64 {
    let a = w.log2_abs().exp2();
    (2.0 * a / (a + w.re_f64())).log2()
}

/// The shift `r ≥ 0` that takes `z` to `Re(z + r) ≥ 0` and `|z + r| ≥ radius`.
///
/// Beyond 53 bits, where the series are long, points with `|Im z|` below
/// three radii are also shifted to `Re(z + r) ≥ |Im z|/2`: near the imaginary
/// axis the remainder factor `sec^{2N}(½ arg w)` grows as fast as the terms
/// fall, and the series would never reach the working precision.
pub(crate) fn shift_for<C: ComplexField>(z: &C, radius: f64) -> i64 {
    let (x, y) = (z.re_f64(), z.im_f64().abs());
    let mut r = if x < 0.0 { (-x).ceil() } else { 0.0 };
    if radius > 8.0 && y < 3.0 * radius && x + r < 0.5 * y {
        r = (0.5 * y - x).ceil();
    }
    if y < radius {
        let need = (radius * radius - y * y).sqrt() - x;
        if need > r {
            r = need.ceil();
        }
    }
    r as i64
}

/// Radius past which asymptotic series are summed: about `0.15·wp` (the
/// optimum of shift count + series length for the Stirling series), 8 on
/// the double path.
pub(crate) fn asymptotic_radius(wp: u32) -> f64 {
    if wp <= 53 {
        8.0
    } else {
        (0.15 * wp as f64).max(8.0)
    }
}

/// Below this real part the reflection formulas are used. Reflection costs
/// a few extra transcendental functions and saves about `−Re z` products of
/// the shift; on MPFR at 50–1000 digits that breaks even near
/// `Re z ≈ −max(40, radius/2)` (measured with benches/special.rs).
pub(crate) fn reflect_below(wp: u32) -> f64 {
    if wp <= 53 {
        -8.0
    } else {
        -(40f64.max(asymptotic_radius(wp) / 2.0))
    }
}

/// `Σ_j c_j u^j` for real coefficients at a complex point, with two real
/// multiplications per coefficient instead of a complex one: the remainder
/// of the polynomial modulo `u² − 2 Re(u) u + |u|²` (Knuth, TAOCP vol. 2,
/// §4.6.4, eq. (3)).
pub(crate) fn real_poly_at<C: ComplexField>(c: &[C::Real], u: &C) -> C {
    let n = c.len();
    let prec = u.prec();
    match n {
        0 => return C::from_i64(0, prec),
        1 => return C::from_reals(c[0].clone(), C::Real::from_f64(0.0, prec)),
        _ => {}
    }
    let (x, y) = (u.re(), u.im());
    let r = x.clone().mul_pow2(1);
    let s = x.clone() * &x + &(y.clone() * &y);
    let mut a = c[n - 1].clone();
    let mut b = c[n - 2].clone();
    for cj in c[..n - 2].iter().rev() {
        let t = a.clone();
        a = b + &(r.clone() * &a);
        b = cj.clone() - &(s.clone() * &t);
    }
    u.clone().mul_real(&a).add_real(&b)
}

/// An exact zero (radius 0) at the precision a result of `prec` carries.
pub(crate) fn exact_zero<C: ComplexField>(prec: Prec) -> crate::precision::Approx<C> {
    let p = C::MAX_PREC.unwrap_or(prec.bits());
    crate::precision::Approx::new(C::from_i64(0, p), Radius::ZERO, p)
}

/// Evaluates `mp` on MPFR at the double input `z` (exactly representable)
/// and rounds the result back to `f64`, adding the rounding to the radius.
pub(crate) fn on_mpfr<C: ComplexField>(
    z: &C,
    prec: Prec,
    mp: impl Fn(&rug::Complex, Prec) -> Result<crate::precision::Approx<rug::Complex>>,
) -> Result<crate::precision::Approx<C>> {
    let zm = rug::Complex::with_val(53, (z.re_f64(), z.im_f64()));
    let m = mp(&zm, prec)?;
    let v = C::from_f64(m.value.real().to_f64(), m.value.imag().to_f64(), 53);
    let rad = m.radius + Radius::from_log2(v.log2_abs() - 53.0);
    Ok(crate::precision::Approx::new(v, rad, 53))
}

/// On the double path, if the estimated relative error exceeds `2^−46`
/// (about 1.4e-14), recomputes with `mp` on MPFR at 53 bits (plus the
/// routine's own guard bits) and rounds back to `f64`. Otherwise returns `r`.
pub(crate) fn refine_double<C: ComplexField>(
    r: crate::precision::Approx<C>,
    z: &C,
    mp: impl Fn(&rug::Complex, Prec) -> Result<crate::precision::Approx<rug::Complex>>,
) -> Result<crate::precision::Approx<C>> {
    if C::MAX_PREC.is_none() || r.radius.log2() - r.value.log2_abs() <= -46.0 {
        return Ok(r);
    }
    on_mpfr(z, Prec::DOUBLE, mp)
}

/// `exp(±L)` for a logarithm `L = log f(z)` computed by `log_f` with `guard`
/// extra bits: the absolute error of `L` becomes the relative error of the
/// result. `Error::Overflow` on the double path past its exponent range.
pub(crate) fn exp_of_log<C: ComplexField>(
    z: &C,
    prec: Prec,
    guard: u32,
    negate: bool,
    function: &'static str,
    hint: &'static str,
    log_f: impl Fn(&C, Prec) -> Result<crate::precision::Approx<C>>,
) -> Result<crate::precision::Approx<C>> {
    let inner = if C::MAX_PREC.is_some() {
        prec
    } else {
        Prec::from_bits(prec.bits() as u64 + guard as u64).map_err(|_| Error::Domain {
            function,
            message: "the argument is too large for the requested precision".into(),
        })?
    };
    let lg = log_f(z, inner)?;
    let arg = if negate { -lg.value } else { lg.value };
    if C::MAX_PREC.is_some() && arg.re_f64() > 709.0 {
        return Err(Error::Overflow { function, hint });
    }
    let v = arg.exp();
    // δf ≈ |f| · δL (+ a few ulps when exponentiating).
    let rel = lg.radius + Radius::from_log2(-(inner.bits() as f64) + 2.0);
    let rad = Radius::from_log2(v.log2_abs() + rel.log2());
    Ok(finish(v, rad, prec))
}
