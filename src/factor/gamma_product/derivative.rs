//! `d/dθ log F`, the kernel of the product, from the product form
//! differentiated term by term (docs/math.md §3a):
//! `dz/dθ · [Σ_{k<K} Σ_j n_j s_j ψ(a_j k + c_j) + d/dz tail]`, with the tail's
//! derivative summed from the same Bernoulli–Hurwitz expansion as the tail.
//! Analytic everywhere off the poles and zeros, at any precision.

use super::product::{near_gamma_pole, series_terms, singular, start_k, Accumulator};
use super::{working_bits, GammaProduct, MAX_EXPLICIT};
use crate::error::{Error, Result};
use crate::num::{ComplexField, RealField};
use crate::precision::{Approx, Prec, Radius};
use crate::special::{digamma, digamma_f64_absolute, finish, trigamma_bound, trigamma_bound_log2};
use num_complex::Complex64;

impl GammaProduct {
    /// `d/dθ log F(θ)` at `prec` (normalisation does not change it).
    ///
    /// Error estimate: the radii of the ψ values, the rounding of each
    /// argument propagated through a bound on `ψ'`, the rounding of the sum,
    /// and twice the last two tail terms, as for the product form itself.
    ///
    /// Errors: [`Error::Pole`] / [`Error::Zero`] of the product at θ (the
    /// derivative of the logarithm has a simple pole there), with the
    /// orders summed as in [`GammaProduct::log_value`].
    ///
    /// ```
    /// use dressing::factor::{Coef, GammaProduct, GammaTerm, Method, Scale};
    /// use dressing::Prec;
    /// use num_complex::Complex64;
    /// // The sine-Gordon factor at ξ = π/2 (as in the GammaProduct example).
    /// let t = |b: i64, s: i64, n: i64| GammaTerm::new(Coef::integer(4), Coef::integer(b), Coef::integer(s), n);
    /// let f = GammaProduct::new(
    ///     vec![t(1, -2, 1), t(4, -2, 1), t(3, 2, 1), t(2, 2, 1), t(1, 2, -1), t(4, 2, -1), t(3, -2, -1), t(2, -2, -1)],
    ///     Scale::OverIPi,
    ///     None,
    /// ).unwrap();
    /// let th = Complex64::new(0.4, 0.3);
    /// let d = f.log_derivative(&th, Prec::DOUBLE).unwrap();
    /// // Against a central difference of the value.
    /// let h = 1e-5;
    /// let v = |x: Complex64| f.log_value(&x, Prec::DOUBLE, Method::Product).unwrap().log.value;
    /// let fd = (v(th + h) - v(th - h)) / (2.0 * h);
    /// assert!((d.value - fd).norm() < 1e-8);
    /// ```
    pub fn log_derivative<C: ComplexField>(&self, theta: &C, prec: Prec) -> Result<Approx<C>> {
        crate::special::check_arg("GammaProduct::log_derivative", "theta", theta, prec)?;
        let wp = working_bits::<C>(prec);
        let z = self.scale.z_of(&theta.with_prec(wp));
        let dz: C = self.scale.dz_dtheta(wp);
        // Double path, even integrand inside its strip: the integral's
        // uniform grid differentiated under the integral sign (docs/math.md
        // §4b), a few times cheaper than the ψ sums.
        if C::MAX_PREC.is_some() && self.kernel.as_ref().is_ok_and(|k| k.even) {
            let zc = Complex64::new(z.re_f64(), z.im_f64());
            if let Some(v) = self.trapezoid_point(zc, prec, true)? {
                let d = Complex64::new(dz.re_f64(), dz.im_f64());
                let value = v.value * d;
                if value.re.is_finite() && value.im.is_finite() {
                    return Ok(Approx::new(
                        C::from_f64(value.re, value.im, 53),
                        v.radius.scale_log2(d.norm().log2())
                            + Radius::from_f64(f64::EPSILON * value.norm()),
                        53,
                    ));
                }
            }
        }
        let tf = self.terms_f64();
        let (mut kk, y_max, c_max) = start_k(tf, (z.re_f64(), z.im_f64()), None, wp)?;
        let a_min = tf.iter().map(|c| c.0).fold(f64::INFINITY, f64::min);
        let target = -(wp as f64) + 8.0;
        let (explicit, rad_explicit, tail, tail_err) = loop {
            let m_terms = series_terms(a_min * kk as f64, y_max, c_max, wp);
            let (explicit, rad_explicit) = self
                .explicit_digamma(&z, kk, wp)
                .map_err(|e| super::name_rapidity(e, theta))?;
            let scale = explicit.log2_abs().max(0.0);
            if let Some((tail, tail_err, _)) =
                self.tail(&z, None, kk, 2 * m_terms + 8, target + scale, wp, true)?
            {
                break (explicit, rad_explicit, tail, tail_err);
            }
            if kk > MAX_EXPLICIT {
                return Err(Error::NoConvergence {
                    what: "the analytic tail of the gamma product's derivative".into(),
                    achieved: "no usable truncation".into(),
                    hint: "ask for fewer digits".into(),
                });
            }
            kk = kk * 3 / 2 + 1;
        };
        let sum = explicit + &tail;
        let mag = sum.log2_abs().max(tail.log2_abs());
        let rad = (rad_explicit + tail_err + Radius::from_log2(mag - wp as f64 + 4.0))
            .scale_log2(dz.log2_abs());
        Ok(finish(sum * &dz, rad, prec))
    }

    /// `Σ_{k<K} Σ_j n_j s_j ψ(a_j k + c_j)` with its radius; poles and zeros
    /// of the product are detected as in the value's explicit sum.
    fn explicit_digamma<C: ComplexField>(
        &self,
        z: &C,
        kmax: usize,
        wp: u32,
    ) -> Result<(C, Radius)> {
        if C::MAX_PREC.is_some() {
            let (v, r) = self.explicit_digamma_f64(Complex64::new(z.re_f64(), z.im_f64()), kmax)?;
            return Ok((C::from_f64(v.re, v.im, 53), r));
        }
        let coeffs = self.coeffs_at(wp);
        let inner = Prec::from_bits(wp as u64)?;
        let mut sum = Accumulator::<C>::new(wp);
        let mut rad = Radius::ZERO;
        let mut abs_sum = Radius::ZERO;
        let mut order = 0i64;
        let mut at_pole = false;
        let mut count = 0usize;
        for (j, (a, b, s)) in coeffs.iter().enumerate() {
            let n = self.terms[j].power;
            let (a, b, s) = (
                C::Real::from_float(a),
                C::Real::from_float(b),
                C::Real::from_float(s),
            );
            if s.is_zero() {
                continue;
            }
            let sz = z.clone().mul_real(&s);
            let ns = s.clone().mul_i64(n);
            for k in 0..kmax {
                let base = a.clone().mul_i64(k as i64) + &b;
                let scale = sz.log2_abs().exp2() + base.to_f64().abs();
                let w = sz.clone().add_real(&base);
                if near_gamma_pole(&w, scale, wp) {
                    order += n;
                    at_pole = true;
                    continue;
                }
                let psi = digamma(&w, inner)?;
                let t = psi.value.mul_real(&ns);
                let ns_l2 = ns.log2_abs();
                rad += psi.radius.scale_log2(ns_l2);
                // The rounding of w (about 4 ulps of the terms it came from)
                // through |ψ'(w)|.
                rad += Radius::from_log2(
                    scale.max(1.0).log2() + 2.0 - wp as f64 + trigamma_bound_log2(&w) + ns_l2,
                );
                abs_sum += Radius::from_log2(t.log2_abs());
                count += 1;
                sum.add(t);
            }
        }
        if at_pole {
            return Err(singular(order));
        }
        rad += Radius::from_log2(abs_sum.log2() - wp as f64 + ((count + 2) as f64).log2());
        Ok((sum.total(), rad))
    }
}

impl GammaProduct {
    /// [`explicit_digamma`](Self::explicit_digamma) on the double path, in
    /// plain `f64` with the radius kept linear: the generic code's
    /// log-domain bookkeeping costs more than the ψ values here.
    fn explicit_digamma_f64(&self, z: Complex64, kmax: usize) -> Result<(Complex64, Radius)> {
        const EPS: f64 = f64::EPSILON;
        let mut sum = Complex64::new(0.0, 0.0);
        let mut comp = Complex64::new(0.0, 0.0);
        let mut rad = 0.0f64;
        let mut abs_sum = 0.0f64;
        let mut order = 0i64;
        let mut at_pole = false;
        for (j, &(a, b, s)) in self.terms_f64().iter().enumerate() {
            if s == 0.0 {
                continue;
            }
            let n = self.terms[j].power;
            let ns = n as f64 * s;
            let sz = z * s;
            let sz_abs = sz.re.abs() + sz.im.abs(); // ≥ |sz|, no hypot
            for k in 0..kmax {
                let base = a * k as f64 + b;
                let w = sz + base;
                let scale = sz_abs + base.abs();
                if near_gamma_pole(&w, scale, 53) {
                    order += n;
                    at_pole = true;
                    continue;
                }
                let Some((psi, e)) = digamma_f64_absolute(w) else {
                    order += n;
                    at_pole = true;
                    continue;
                };
                let t = psi * ns;
                // ψ's error, and the rounding of w (4 ulps of its terms)
                // through |ψ'(w)|.
                rad += ns.abs() * (e + 4.0 * EPS * scale.max(1.0) * trigamma_bound(w));
                abs_sum += t.re.abs() + t.im.abs();
                // Neumaier summation per component.
                let y = sum + t;
                comp.re += if sum.re.abs() >= t.re.abs() {
                    (sum.re - y.re) + t.re
                } else {
                    (t.re - y.re) + sum.re
                };
                comp.im += if sum.im.abs() >= t.im.abs() {
                    (sum.im - y.im) + t.im
                } else {
                    (t.im - y.im) + sum.im
                };
                sum = y;
            }
        }
        if at_pole {
            return Err(singular(order));
        }
        rad += 2.0 * EPS * abs_sum;
        Ok((sum + comp, Radius::from_f64(rad)))
    }
}
