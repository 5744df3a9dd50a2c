//! Products of CDD blocks `f_α(θ) = (sinh θ + i sin πα)/(sinh θ − i sin πα)`.
//!
//! **Method.** With `u = sin πα / sinh θ`, `f = (1 + iu)/(1 − iu)`, so
//! `log f = 2i·arctan u` (principal branch after reduction of the imaginary
//! part to `(−π, π]`). `1/sinh θ` comes from `2e/(1 − e²)`, `e = e^{−|θ|}`
//! (sign of `Re θ` taken out), which never overflows and loses nothing for
//! large `|Re θ|`; near `θ = iπk` (`|θ − iπk| < ½`) from the Taylor series of
//! `sinh(θ − iπk)` instead, so small θ costs no cancellation either. Then
//! `|u| ≤ 1/8`: the arctan series in u; `|u| ≥ 8`: `log f = ±iπ − 2i·arctan(1/u)`
//! by the series in `1/u`; in between `ln(1 + iu) − ln(1 − iu)`.
//! `sin πα` is computed on MPFR after exact reduction of α modulo 1 (for
//! rational α), so it is relatively accurate even where it is tiny.

use super::{
    at_theta, check_coef, check_power, coef_text, log2_add, power_suffix, refine, singular,
};
use crate::error::{Error, Result};
use crate::factor::Coef;
use crate::num::{ComplexField, RealField};
use crate::precision::{Approx, Prec, Radius};
use crate::special::check_arg;
use rug::float::Constant;
use rug::{Float, Integer};
use std::collections::HashMap;
use std::f64::consts::{LOG2_E, PI};
use std::fmt;
use std::sync::{Arc, RwLock};

/// One block's α at a working precision.
struct Alpha {
    /// α is an integer exactly: `f_α ≡ 1`.
    trivial: bool,
    /// `sin πα`.
    s: Float,
    /// log2 of the relative error of `s`.
    s_rel_l2: f64,
    /// `r = α − m ∈ [−½, ½]`, m the nearest integer.
    r: Float,
    /// Whether m is odd.
    odd: bool,
}

fn alpha_at(alpha: &Coef, wp: u32) -> Alpha {
    let p = wp + 8;
    let pi = Float::with_val(p, Constant::Pi);
    let (r, odd, s_rel_l2, trivial) = match alpha.exact() {
        Some(q) => {
            let m = q.clone().round();
            let rq = rug::Rational::from(q - &m);
            let odd = m.numer().is_odd();
            (Float::with_val(p, &rq), odd, -(p as f64) + 2.0, rq == 0)
        }
        None => {
            let e = alpha.value(64).get_exp().unwrap_or(0).max(0) as u32;
            let vp = p + 64 + e;
            let v = alpha.value(vp);
            let m = v.clone().round();
            let r = Float::with_val(vp, &v - &m);
            let odd = m.to_integer().is_some_and(|i: Integer| i.is_odd());
            // The error of v, relative to r.
            let rel_r = v.clone().abs().to_f64().max(1.0).log2() - vp as f64 + 1.0
                - r.clone().abs().to_f64().log2();
            let trivial = r.is_zero();
            (
                Float::with_val(p, &r),
                odd,
                log2_add(-(p as f64) + 2.0, rel_r),
                trivial,
            )
        }
    };
    let mut s = Float::with_val(p, &pi * &r).sin();
    if odd {
        s = -s;
    }
    Alpha {
        trivial,
        s,
        s_rel_l2,
        r,
        odd,
    }
}

/// `arctan x = Σ_{m≥0} (−1)^m x^{2m+1}/(2m+1)` for `|x| ≤ 1/8` at `wp` bits:
/// (value, log2 of the truncation bound, terms).
fn atan_series<C: ComplexField>(x: &C, wp: u32) -> (C, f64, usize) {
    let l2x = x.log2_abs();
    if l2x == f64::NEG_INFINITY {
        return (x.clone(), f64::NEG_INFINITY, 0);
    }
    let x2 = x.clone().square();
    let l2x2 = 2.0 * l2x;
    let mut pw = x.clone();
    let mut sum = x.clone();
    let mut m = 0usize;
    while (m as f64 + 1.0) * l2x2 > -(wp as f64) - 4.0 {
        m += 1;
        pw = -(pw * &x2);
        sum += &pw.clone().div_i64(2 * m as i64 + 1);
    }
    // The first neglected term over 1 − |x|² ≥ 63/64.
    (sum, l2x + (m as f64 + 1.0) * l2x2 + 0.1, m + 1)
}

/// `sinh y = Σ y^{2m+1}/(2m+1)!` for `|y| < ½`: (value, log2 truncation, terms).
fn sinh_series<C: ComplexField>(y: &C, wp: u32) -> (C, f64, usize) {
    let l2y = y.log2_abs();
    if l2y == f64::NEG_INFINITY {
        return (y.clone(), f64::NEG_INFINITY, 0);
    }
    let y2 = y.clone().square();
    let mut t = y.clone();
    let mut sum = y.clone();
    let mut l2t = l2y;
    let mut m = 0usize;
    loop {
        let k = (2 * m + 2) * (2 * m + 3);
        let next = l2t + 2.0 * l2y - (k as f64).log2();
        if next < l2y - wp as f64 - 4.0 {
            // The tail is below twice its first term (ratio < 1/24).
            return (sum, next + 1.0, m + 1);
        }
        m += 1;
        t = (t * &y2).div_i64(k as i64);
        sum += &t;
        l2t = next;
    }
}

/// How sinh θ was obtained.
enum Hyp<C> {
    /// `|θ − iπk| < ½`: sinh θ itself, with log2 of its absolute error.
    Sinh(C, f64),
    /// Otherwise: 1/sinh θ, log2 of its relative error, and whether it
    /// underflowed (then log2 |1/sinh θ| is the analytic estimate given).
    Csch(C, f64, Option<f64>),
}

fn hyperbolic<C: ComplexField>(theta: &C, th: &C, wp: u32) -> Hyp<C> {
    let double = C::MAX_PREC.is_some();
    let zero = C::Real::from_f64(0.0, wp);
    let pi = C::Real::pi(wp);
    // Rounding θ to wp bits (only when it carries more).
    let round_l2 = if theta.prec() > wp {
        theta.log2_abs() - wp as f64
    } else {
        f64::NEG_INFINITY
    };
    let k = (th.im_f64() / PI).round();
    if k.abs() < 4.0e15 {
        let red = th.clone() - C::from_reals(zero.clone(), pi.clone() * &C::Real::from_f64(k, wp));
        if red.log2_abs() < -1.0 {
            let (s, trunc, n) = sinh_series(&red, wp);
            let s = if k % 2.0 != 0.0 { -s } else { s };
            // |δθ'| from θ's rounding, πk at wp bits and the subtraction;
            // |cosh θ'| < 1.13.
            let d_red = log2_add(round_l2, (PI * k.abs() + 1.0).log2() + 2.0 - wp as f64);
            let err = log2_add(
                log2_add(d_red + 0.2, trunc),
                s.log2_abs() + ((n + 3) as f64).log2() - wp as f64,
            );
            return Hyp::Sinh(s, err);
        }
    }
    let neg = th.re() < zero;
    let tp = if neg { -th.clone() } else { th.clone() };
    let e = (-tp.clone()).exp();
    let one_m_e2 = -(e.clone().square()).add_i64(-1);
    let csch = (e.mul_pow2(1) / &one_m_e2).with_prec(wp);
    let csch = if neg { -csch } else { csch };
    let analytic = 1.0 - tp.re_f64() * LOG2_E;
    let under = csch.is_zero() || (double && analytic < -1000.0);
    // |δ log sinh θ| ≤ |coth θ|·|δθ| ≤ (1 + |csch θ|)·|δθ|, plus the rounding
    // of exp, e² (relative to 1 − e²) and the quotient.
    let rel = log2_add(
        log2_add(round_l2, -(wp as f64)) + log2_add(0.0, csch.log2_abs()),
        log2_add(4.0 - wp as f64, 1.0 - wp as f64 - one_m_e2.log2_abs()),
    );
    Hyp::Csch(csch, rel, under.then_some(analytic))
}

/// A product of CDD blocks `Π_j f_{α_j}(θ)^{n_j}` with
/// `f_α(θ) = (sinh θ + i sin πα)/(sinh θ − i sin πα)
///        = tanh((θ + iπα)/2) / tanh((θ − iπα)/2)`
/// (the second form is the one of Zamolodchikov's E8 S-matrix, Int. J. Mod.
/// Phys. A 4 (1989) 4235), α real ([`Coef`]), powers non-zero integers.
/// Each block is unitary, `f(θ) f(−θ) = 1`, and crossing symmetric,
/// `f(iπ − θ) = f(θ)`; it has poles at `θ = iπα, iπ(1 − α)` and zeros at
/// `θ = −iπα, −iπ(1 − α)` (mod 2πi), double where α is half an odd integer;
/// for integer α it is identically 1.
///
/// Its logarithm is the sum of principal logs `Σ_j n_j Ln f_{α_j}(θ)` (each
/// `Im Ln f ∈ (−π, π]`); where `Re θ = 0` exactly, `f` is real and `Ln f` is
/// given with imaginary part exactly 0 or π, as for a real argument.
///
/// ```
/// use dressing::factor::{CddBlock, Coef};
/// use dressing::Prec;
/// use num_complex::Complex64;
/// // The Lee–Yang S-matrix f_{2/3}(θ) (Cardy & Mussardo 1989, from memory).
/// let f = CddBlock::new(vec![(Coef::rational(2, 3), 1)]).unwrap();
/// let th = Complex64::new(0.4, 0.3);
/// let r = f.log_value(&th, Prec::DOUBLE).unwrap();
/// let s = (std::f64::consts::PI * 2.0 / 3.0).sin();
/// let i = Complex64::new(0.0, 1.0);
/// let want = ((th.sinh() + i * s) / (th.sinh() - i * s)).ln();
/// assert!((r.value - want).norm() < 1e-14);
/// // Far out, where sinh θ overflows a double, f → 1.
/// let far = f.log_value(&Complex64::new(800.0, 0.5), Prec::DOUBLE).unwrap();
/// assert!(far.value.norm() < 1e-300);
/// ```
pub struct CddBlock {
    blocks: Vec<(Coef, i64)>,
    cache: RwLock<HashMap<u32, Arc<Vec<Alpha>>>>,
}

impl Clone for CddBlock {
    fn clone(&self) -> Self {
        CddBlock {
            blocks: self.blocks.clone(),
            cache: RwLock::new(HashMap::new()),
        }
    }
}

impl fmt::Debug for CddBlock {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.debug_struct("CddBlock")
            .field("blocks", &self.blocks)
            .finish()
    }
}

/// The product as a formula, e.g. `f_{1/3}(θ)^2 · f_{2/5}(θ)^-1`.
///
/// ```
/// use dressing::factor::{CddBlock, Coef};
/// let f = CddBlock::new(vec![(Coef::rational(1, 3), 2), (Coef::rational(-2, 5), -1)]).unwrap();
/// assert_eq!(f.to_string(), "f_{1/3}(θ)^2 · f_{−2/5}(θ)^-1");
/// ```
impl fmt::Display for CddBlock {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        for (i, (a, n)) in self.blocks.iter().enumerate() {
            if i > 0 {
                f.write_str(" · ")?;
            }
            let (neg, t) = coef_text(a);
            write!(
                f,
                "f_{{{}{t}}}(θ){}",
                if neg { "−" } else { "" },
                power_suffix(*n)
            )?;
        }
        Ok(())
    }
}

impl CddBlock {
    /// `Π_j f_{α_j}(θ)^{n_j}` from blocks `(α_j, n_j)`.
    ///
    /// Errors: [`Error::Domain`] for no blocks, a power 0 or a power above
    /// 2^20 in size; [`Error::NonFinite`] for an α that is NaN or infinite.
    ///
    /// ```
    /// use dressing::factor::{CddBlock, Coef};
    /// use dressing::Error;
    /// assert!(CddBlock::new(vec![(Coef::rational(1, 3), 1)]).is_ok());
    /// let nan = Coef::computed("nan", |p| rug::Float::with_val(p, rug::float::Special::Nan));
    /// assert!(matches!(CddBlock::new(vec![(nan, 1)]), Err(Error::NonFinite { .. })));
    /// assert!(matches!(CddBlock::new(vec![]), Err(Error::Domain { .. })));
    /// ```
    pub fn new(blocks: Vec<(Coef, i64)>) -> Result<CddBlock> {
        let function = "CddBlock::new";
        if blocks.is_empty() {
            return Err(Error::Domain {
                function,
                message: "a CddBlock needs at least one block (alpha, power)".into(),
            });
        }
        for (i, (a, n)) in blocks.iter().enumerate() {
            check_coef(function, "alpha", a)?;
            check_power(
                function,
                &format!("block {} (α = {})", i + 1, a.label()),
                *n,
            )?;
        }
        Ok(CddBlock {
            blocks,
            cache: RwLock::new(HashMap::new()),
        })
    }

    /// The blocks `(α, power)`.
    ///
    /// ```
    /// use dressing::factor::{CddBlock, Coef};
    /// let f = CddBlock::new(vec![(Coef::rational(1, 3), -2)]).unwrap();
    /// assert_eq!(f.blocks()[0].1, -2);
    /// ```
    pub fn blocks(&self) -> &[(Coef, i64)] {
        &self.blocks
    }

    /// The product as a formula with the definition of the block, for reports.
    ///
    /// ```
    /// use dressing::factor::{CddBlock, Coef};
    /// let f = CddBlock::new(vec![(Coef::rational(2, 3), 1)]).unwrap();
    /// assert!(f.describe().starts_with("f_{2/3}(θ), f_α(θ) = "));
    /// ```
    pub fn describe(&self) -> String {
        format!("{self}, f_α(θ) = (sinh θ + i sin πα)/(sinh θ − i sin πα)")
    }

    fn alphas_at(&self, wp: u32) -> Arc<Vec<Alpha>> {
        if let Some(c) = self.cache.read().expect("poisoned").get(&wp) {
            return Arc::clone(c);
        }
        let v = Arc::new(self.blocks.iter().map(|(a, _)| alpha_at(a, wp)).collect());
        self.cache
            .write()
            .expect("poisoned")
            .insert(wp, Arc::clone(&v));
        v
    }

    /// `Σ_j n_j Ln f_{α_j}(θ)` at `prec`: the sum of the principal logs of
    /// the blocks (the caller fixes branches by path continuation), with an
    /// estimate of its absolute error.
    ///
    /// Errors: [`Error::Pole`] / [`Error::Zero`] at a pole or zero of some
    /// block, orders (with the powers) summed over all blocks there;
    /// [`Error::Domain`] where they cancel (a removable point);
    /// [`Error::NonFinite`]; [`Error::DoubleTooPrecise`].
    ///
    /// ```
    /// use dressing::factor::{CddBlock, Coef};
    /// use dressing::{Error, Prec};
    /// let f = CddBlock::new(vec![(Coef::rational(1, 3), 1)]).unwrap();
    /// // Unitarity at 50 digits: log f(θ) + log f(−θ) = 0.
    /// let p = Prec::digits(50).unwrap();
    /// let th = rug::Complex::with_val(200, (0.3, 0.2));
    /// let a = f.log_value(&th, p).unwrap();
    /// let b = f.log_value(&rug::Complex::with_val(200, -&th), p).unwrap();
    /// let s = rug::Complex::with_val(200, &a.value + &b.value);
    /// assert!(s.abs().real().to_f64() < 1e-49);
    /// // The pole at θ = iπ/3.
    /// let pole = num_complex::Complex64::new(0.0, std::f64::consts::PI / 3.0);
    /// assert!(matches!(f.log_value(&pole, Prec::DOUBLE), Err(Error::Pole { order: 1, .. })));
    /// ```
    pub fn log_value<C: ComplexField>(&self, theta: &C, prec: Prec) -> Result<Approx<C>> {
        check_arg("CddBlock::log_value", "theta", theta, prec)?;
        refine(prec, theta, |wp, tol_wp| self.eval(theta, wp, tol_wp))
    }

    /// `d/dθ Σ_j n_j log f_{α_j}(θ) = −2i cosh θ Σ_j n_j sin(πα_j)/(sinh²θ +
    /// sin²πα_j)` at `prec`, with an estimate of its absolute error. On the
    /// real line `−i` times it is real: the block's contribution to a TBA
    /// kernel. Computed from `e = e^{−|θ|}` as
    /// `cosh θ/(sinh²θ + s²) = 2e(1 + e²)/((1 − e²)² + 4e²s²)`, which neither
    /// overflows nor cancels for large `|Re θ|`; the radius is the rounding
    /// times the condition number of that denominator, so it grows near the
    /// poles and zeros.
    ///
    /// Errors: as [`CddBlock::log_value`].
    ///
    /// ```
    /// use dressing::factor::{CddBlock, Coef};
    /// use dressing::Prec;
    /// use num_complex::Complex64;
    /// let f = CddBlock::new(vec![(Coef::rational(1, 3), 1)]).unwrap();
    /// let th = Complex64::new(0.4, 0.2);
    /// let d = f.log_derivative(&th, Prec::DOUBLE).unwrap();
    /// let s = (std::f64::consts::PI / 3.0).sin();
    /// let want = Complex64::new(0.0, -2.0 * s) * th.cosh() / (th.sinh().powi(2) + s * s);
    /// assert!((d.value - want).norm() <= d.radius.to_f64() + 1e-15);
    /// ```
    pub fn log_derivative<C: ComplexField>(&self, theta: &C, prec: Prec) -> Result<Approx<C>> {
        check_arg("CddBlock::log_derivative", "theta", theta, prec)?;
        refine(prec, theta, |wp, tol_wp| self.derivative(theta, wp, tol_wp))
    }

    fn derivative<C: ComplexField>(&self, theta: &C, wp: u32, tol_wp: u32) -> Result<(C, Radius)> {
        let th = theta.with_prec(wp);
        let alphas = self.alphas_at(wp);
        self.check_regular(theta, &th, &alphas, wp, tol_wp)?;
        let w = -(wp as f64);
        // g(θ) = cosh θ/(sinh²θ + s²) is even in θ: use Re θ ≥ 0.
        let zero = C::Real::from_f64(0.0, wp);
        let tp = if th.re() < zero {
            -th.clone()
        } else {
            th.clone()
        };
        let e = (-tp).exp();
        let e2 = e.clone().square();
        let one_m_e2 = -(e2.clone().add_i64(-1));
        let one_m_e2_l2 = one_m_e2.log2_abs();
        let a = one_m_e2.square();
        let num = e.clone().mul_pow2(1) * &e2.clone().add_i64(1);
        let (a_l2, e2_l2) = (a.log2_abs(), e2.log2_abs());
        let mut sum = C::from_i64(0, wp);
        let mut rad = Radius::ZERO;
        let mut abs_sum = Radius::ZERO;
        let mut count = 0usize;
        for ((_, n), al) in self.blocks.iter().zip(alphas.iter()) {
            if al.trivial {
                continue;
            }
            count += 1;
            let s = C::Real::from_float(&al.s);
            let s2 = s.clone() * &s;
            let den = a.clone() + &e2.clone().mul_real(&s2).mul_pow2(2);
            // g = num/den; the derivative of the block is −2i s g.
            let g = num.clone() / &den;
            let t = g.mul_real(&s).mul_i().mul_i64(-2 * n);
            let t_l2 = t.log2_abs();
            // Condition of den: (|a| + 4|e²|s²)/|den|, plus s's own error,
            // plus the error of a = (1 − e²)² itself, 2|1 − e²|(1 + |e²|)·2^−wp,
            // which dominates where 1 − e² cancels (θ near 0 or iπ).
            let den_l2 = den.log2_abs();
            let cond_l2 = log2_add(a_l2, e2_l2 + 2.0 + 2.0 * s.log2_abs()) - den_l2;
            let a_err_l2 = 1.0 + one_m_e2_l2 + log2_add(0.0, e2_l2) - den_l2;
            let rel = log2_add(log2_add(cond_l2, a_err_l2) + w + 3.0, al.s_rel_l2 + 1.0);
            rad += Radius::from_log2(t_l2 + log2_add(rel, w + 3.0));
            abs_sum += Radius::from_log2(t_l2);
            sum += &t;
        }
        rad += Radius::from_log2(abs_sum.log2() + w + ((count + 2) as f64).log2());
        Ok((sum, rad))
    }

    /// The singular-point error if θ is within the resolution of `tol_wp`
    /// bits of a pole or zero of some block.
    fn check_regular<C: ComplexField>(
        &self,
        theta: &C,
        th: &C,
        alphas: &[Alpha],
        wp: u32,
        tol_wp: u32,
    ) -> Result<()> {
        let pi = C::Real::pi(wp);
        let two_pi = pi.clone().mul_i64(2);
        let (re_th, im_th) = (th.re(), th.im());
        // Poles iπα, iπ(1 − α) and zeros −iπα, −iπ(1 − α), mod 2πi; with
        // α = m + r, iπα ≡ iπ(r + (m mod 2)).
        let tol_l2 = th.log2_abs().max(2.0) + 1.0 - tol_wp as f64 + 8.0;
        let mut order = 0i64;
        let mut at_singular = false;
        for ((_, n), a) in self.blocks.iter().zip(alphas.iter()) {
            if a.trivial {
                continue;
            }
            let p1 = (C::Real::from_float(&a.r) + &C::Real::from_f64(a.odd as u8 as f64, wp)) * &pi;
            let p2 = pi.clone() - &p1;
            let mut hit = false;
            let mut here = 0i64;
            for (y, o) in [(p1.clone(), 1), (p2.clone(), 1), (-p1, -1), (-p2, -1)] {
                let diff = im_th.clone() - &y;
                let k = (diff.to_f64() / (2.0 * PI)).round();
                let d = diff - &(two_pi.clone() * &C::Real::from_f64(k, wp));
                if C::from_reals(re_th.clone(), d).log2_abs() < tol_l2 {
                    hit = true;
                    here += o;
                }
            }
            if hit {
                at_singular = true;
                order = order.saturating_add(here.saturating_mul(*n));
            }
        }
        if at_singular {
            return Err(singular("CddBlock", order, at_theta(theta)));
        }
        Ok(())
    }

    fn eval<C: ComplexField>(&self, theta: &C, wp: u32, tol_wp: u32) -> Result<(C, Radius)> {
        let th = theta.with_prec(wp);
        let alphas = self.alphas_at(wp);
        let zero = C::Real::from_f64(0.0, wp);
        let pi = C::Real::pi(wp);
        let two_pi = pi.clone().mul_i64(2);
        self.check_regular(theta, &th, &alphas, wp, tol_wp)?;

        let hyp = hyperbolic(theta, &th, wp);
        let w = -(wp as f64);
        let mut sum = C::from_i64(0, wp);
        let mut abs_sum = Radius::ZERO;
        let mut rad = Radius::ZERO;
        let mut count = 0usize;
        for ((_, n), a) in self.blocks.iter().zip(alphas.iter()) {
            if a.trivial {
                continue;
            }
            count += 1;
            let s = C::Real::from_float(&a.s);
            let l2s = s.log2_abs();
            let eps_s = log2_add(a.s_rel_l2, w + 1.0);
            // x = u = sin πα / sinh θ, or x = v = 1/u; its absolute error.
            enum Form {
                U,
                V,
                Mid,
            }
            let (x, dx, form) = match &hyp {
                Hyp::Sinh(sh, d_sh) => {
                    let l2sh = sh.log2_abs();
                    if l2sh <= l2s - 3.0 {
                        let v = sh.clone().mul_real(&(C::Real::from_f64(1.0, wp) / &s));
                        let dv = log2_add(*d_sh - l2s, v.log2_abs() + eps_s);
                        (v, dv, Form::V)
                    } else {
                        let u = sh.clone().recip().mul_real(&s);
                        let du = u.log2_abs() + log2_add(*d_sh - l2sh, eps_s + 1.0);
                        let f = if u.log2_abs() <= -3.0 {
                            Form::U
                        } else {
                            Form::Mid
                        };
                        (u, du, f)
                    }
                }
                Hyp::Csch(c, rel, under) => {
                    let u = c.clone().mul_real(&s);
                    let mut du = u.log2_abs() + log2_add(*rel, eps_s);
                    if let Some(an) = under {
                        du = log2_add(du, l2s + an + 2.0);
                    }
                    let l2u = u.log2_abs();
                    if l2u <= -3.0 {
                        (u, du, Form::U)
                    } else if l2u >= 3.0 {
                        let v = u.recip();
                        let dv = v.log2_abs() + log2_add(du - l2u, w + 1.0);
                        (v, dv, Form::V)
                    } else {
                        (u, du, Form::Mid)
                    }
                }
            };
            let (mut l, r) = match form {
                Form::U => {
                    let (at, trunc, terms) = atan_series(&x, wp);
                    let l = at.clone().mul_i().mul_pow2(1);
                    // d(2i arctan u)/du = 2i/(1 + u²), |1 + u²| ≥ 63/64.
                    let r = log2_add(
                        log2_add(dx + 1.05, trunc + 1.0),
                        at.log2_abs() + 1.0 + w + ((terms + 4) as f64).log2(),
                    );
                    (l, r)
                }
                Form::V => {
                    let (at, trunc, terms) = atan_series(&x, wp);
                    let sigma = if at.re() >= zero { 1 } else { -1 };
                    let l = (-(at.clone().mul_i().mul_pow2(1)))
                        + &C::from_reals(zero.clone(), pi.clone().mul_i64(sigma));
                    let r = log2_add(
                        log2_add(dx + 1.05, trunc + 1.0),
                        log2_add(
                            at.log2_abs() + 1.0 + w + ((terms + 4) as f64).log2(),
                            w + 3.0,
                        ),
                    );
                    (l, r)
                }
                Form::Mid => {
                    let iu = x.clone().mul_i();
                    let plus = iu.clone().add_i64(1);
                    let minus = (-iu).add_i64(1);
                    if plus.is_zero() || minus.is_zero() {
                        // Nearer a zero or pole than the arithmetic resolves.
                        let mult = if (l2s.exp2() - 1.0).abs() < 1e-6 {
                            2
                        } else {
                            1
                        };
                        let o = if minus.is_zero() { mult } else { -mult };
                        return Err(singular("CddBlock", o * n, at_theta(theta)));
                    }
                    let (lp, lm) = (plus.ln(), minus.ln());
                    let (l2p, l2m) = (plus.log2_abs(), minus.log2_abs());
                    let mut l = lp.clone() - &lm;
                    if l.im() > pi {
                        l -= &C::from_reals(zero.clone(), two_pi.clone());
                    } else if l.im() <= -pi.clone() {
                        l += &C::from_reals(zero.clone(), two_pi.clone());
                    }
                    let one_u = log2_add(0.0, x.log2_abs());
                    let round = log2_add(
                        log2_add(one_u - l2p, one_u - l2m),
                        log2_add(log2_add(lp.log2_abs(), lm.log2_abs()), 3.0),
                    ) + 1.0
                        + w;
                    (l, log2_add(dx + 1.0 - l2p - l2m, round))
                }
            };
            // Exact structure: f is real where Re θ = 0, unimodular where Im θ = 0.
            if th.re().is_zero() {
                let im = if l.im().abs() > pi.clone().mul_pow2(-1) {
                    pi.clone()
                } else {
                    zero.clone()
                };
                l = C::from_reals(l.re(), im);
            }
            if th.im().is_zero() {
                l = C::from_reals(zero.clone(), l.im());
            }
            let n_abs = n.unsigned_abs() as f64;
            rad += Radius::from_log2(r + n_abs.log2());
            let t = l.mul_i64(*n);
            abs_sum += Radius::from_log2(t.log2_abs());
            sum += &t;
        }
        rad += Radius::from_log2(abs_sum.log2() + w + ((count + 2) as f64).log2());
        Ok((sum, rad))
    }
}
