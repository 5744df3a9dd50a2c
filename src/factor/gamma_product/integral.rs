//! Integral form (docs/math.md §4–5): Malmstén's integral over the common
//! step, continued outside its strip by taking out the first factors.
//!
//! The integrand is `Σ_j n_j e^{−c_j t} / D(t)`, `D(t) = t(1 − e^{−at})(1 − e^{−t})`,
//! `c_j = b_j + s_j z`. Everything but `e^{−s_j z t}` is independent of z,
//! so each node keeps, per distinct `|s| = σ`, the weights
//! `W_±(t) = Σ_{s_j = ±σ} n_j e^{−b_j t}/D(t)` (and the z₀ part of a
//! normalised product), computed once per precision and number of factors
//! taken out ([`NodeCache`]). A point then costs, per node and per σ, one
//! real exponential, one sine–cosine pair and (if both signs occur) one
//! division: with `u = e^{−σ z t} = e^{−σxt}(cos σyt − i sin σyt)`,
//! `W₊u + W₋/u = cos(σyt)(A + B) + i sin(σyt)(B − A)`, `A = W₊e^{−σxt}`,
//! `B = W₋e^{σxt}`, all in real arithmetic.
//!
//! On the double path an integrand even in t (docs/math.md §4b) inside its
//! strip goes to the uniform trapezoidal rule of [`super::trapezoid`];
//! otherwise the double-exponential rule runs on MPFR at 53 + 24 bits.

use super::product::TermSet;
use super::{
    working_bits, Abs, Error, FactorValue, GammaProduct, Representation, Result, MAX_EXPLICIT,
};
use crate::num::{ComplexField, RealField};
use crate::precision::{Approx, Prec, Radius};
use crate::quadrature::{default_rule, Domain};
use crate::special::finish;
use num_complex::Complex64;
use rug::{Complex, Float, Integer};
use std::any::Any;
use std::cell::RefCell;
use std::collections::HashMap;
use std::sync::{Arc, RwLock};

/// The real part every `c_j` must reach after taking out factors.
pub(super) const MARGIN: f64 = 0.25;

type NodeMap<T> = Arc<HashMap<u64, Arc<T>>>;
/// Node maps by (working precision, factors taken out).
type NodeMaps = RwLock<HashMap<(u32, usize), NodeMap<NodeData<Float>>>>;

/// z-independent integrand data at the quadrature nodes, by (working
/// precision, factors taken out) and then by the node (the bits of `t` as
/// an `f64`: distinct for distinct nodes of every level up to 16).
#[derive(Default)]
pub(super) struct NodeCache {
    mp: NodeMaps,
}

/// The data at one node.
struct NodeData<R> {
    /// Bits the node's arithmetic is carried at (MPFR path).
    hi: u32,
    /// `σ·t` per slope class.
    st: Vec<R>,
    /// `(W₊, W₋)` per slope class.
    w: Vec<(R, R)>,
    /// The slope-0 terms and the normalisation part: `(re, im)`.
    w0: (R, R),
}

/// The distinct `|s|` of a term set, and each term's class and sign.
struct Classes {
    sigma: Vec<Float>,
    /// `Some((class, positive))`, `None` for slope 0.
    of: Vec<Option<(usize, bool)>>,
}

impl Classes {
    fn new(coeffs: &[Abs]) -> Classes {
        let mut sigma: Vec<Float> = Vec::new();
        let mut of = Vec::with_capacity(coeffs.len());
        for (_, _, s) in coeffs {
            if s.is_zero() {
                of.push(None);
                continue;
            }
            let a = Float::with_val(s.prec(), s.abs_ref());
            let i = match sigma.iter().position(|x| *x == a) {
                Some(i) => i,
                None => {
                    sigma.push(a);
                    sigma.len() - 1
                }
            };
            of.push(Some((i, *s > 0)));
        }
        Classes { sigma, of }
    }
}

/// Extra bits at node t: the numerator cancels to `O(t³)` from terms of
/// size `O(1)` below t = 1 (docs/math.md §4).
fn extra_bits(t: f64) -> u32 {
    if t >= 1.0 {
        8
    } else {
        3 * ((1.0 / t).log2().ceil() as u32) + 16
    }
}

/// `t(1 − e^{−at})(1 − e^{−t})` without cancellation.
pub(super) fn denominator(t: &Float, a: &Float) -> Float {
    let p = t.prec();
    let at = Float::with_val(p, a * t);
    let d1 = -Float::with_val(p, -at).exp_m1();
    let d2 = -Float::with_val(p, -t).exp_m1();
    Float::with_val(p, t * &d1) * d2
}

/// Computes the node data at `t` (MPFR at `hi` bits).
fn node_data(
    t: &Float,
    hi: u32,
    coeffs: &[Abs],
    powers: &[i64],
    classes: &Classes,
    peel: usize,
    z0: Option<&Complex>,
) -> NodeData<Float> {
    let t = Float::with_val(hi, t);
    let a = Float::with_val(hi, &coeffs[0].0);
    let inv_d = Float::with_val(hi, denominator(&t, &a).recip_ref());
    let zero = || Float::new(hi);
    let mut w = vec![(zero(), zero()); classes.sigma.len()];
    let mut w0 = (zero(), zero());
    let shift = Float::with_val(hi, &a * Integer::from(peel));
    for (j, (_, b, s)) in coeffs.iter().enumerate() {
        let n = powers[j];
        let b = Float::with_val(hi, b + &shift);
        let e = Float::with_val(hi, -Float::with_val(hi, &b * &t)).exp() * n;
        match classes.of[j] {
            Some((i, true)) => w[i].0 += &e,
            Some((i, false)) => w[i].1 += &e,
            None => w0.0 += &e,
        }
        if let Some(z0) = z0 {
            // −n e^{−c⁰ t}, c⁰ = b + s z₀
            let c0 = Complex::with_val(hi, z0 * Float::with_val(hi, s)) + &b;
            let e0 = Complex::with_val(hi, -(c0 * &t)).exp() * n;
            w0.0 -= e0.real();
            w0.1 -= e0.imag();
        }
    }
    for (p, m) in w.iter_mut() {
        *p *= &inv_d;
        *m *= &inv_d;
    }
    w0.0 *= &inv_d;
    w0.1 *= &inv_d;
    let st = classes
        .sigma
        .iter()
        .map(|s| Float::with_val(hi, s * &t))
        .collect();
    NodeData { hi, st, w, w0 }
}

/// `Σ_σ W₊e^{−σzt} + W₋e^{σzt} + W₀` at one node (MPFR).
fn node_value(d: &NodeData<Float>, x: &Float, y: &Float, out_prec: u32) -> Complex {
    let hi = d.hi;
    let mut re = d.w0.0.clone();
    let mut im = d.w0.1.clone();
    for (st, (wp, wm)) in d.st.iter().zip(&d.w) {
        let ex = Float::with_val(hi, -Float::with_val(hi, st * x)).exp();
        let (sn, cs) = Float::with_val(hi, st * y).sin_cos(Float::new(hi));
        let a = Float::with_val(hi, wp * &ex);
        let b = if wm.is_zero() {
            Float::new(hi)
        } else {
            Float::with_val(hi, wm / &ex)
        };
        re += Float::with_val(hi, &a + &b) * &cs;
        im += Float::with_val(hi, &b - &a) * &sn;
    }
    Complex::with_val(out_prec, (re, im))
}

/// `C` as a concrete type, when it is one.
fn downcast<C: ComplexField, T: 'static + Clone>(z: &C) -> Option<T> {
    (z as &dyn Any).downcast_ref::<T>().cloned()
}

/// A concrete value as `C` (which it is).
fn upcast<C: ComplexField, T: 'static>(v: Approx<T>) -> Approx<C> {
    let Approx {
        value,
        radius,
        prec,
    } = v;
    let value = *(Box::new(value) as Box<dyn Any>)
        .downcast::<C>()
        .unwrap_or_else(|_| unreachable!("called with the matching type"));
    Approx::new(value, radius, prec)
}

impl GammaProduct {
    /// Factors to take out so that every `Re(c_j + a K) ≥ margin` (also at z₀).
    pub(super) fn peel_count(
        coeffs: &[Abs],
        z: (f64, f64),
        z0: Option<(f64, f64)>,
        margin: f64,
    ) -> Result<usize> {
        let mut peel = 0usize;
        for (a, b, s) in coeffs.iter() {
            let (a, b, s) = (a.to_f64(), b.to_f64(), s.to_f64());
            let mut re_c = b + s * z.0;
            if let Some(z0) = z0 {
                re_c = re_c.min(b + s * z0.0);
            }
            if re_c < margin {
                let need = ((margin - re_c) / a).ceil();
                if need.is_nan() || need > MAX_EXPLICIT as f64 {
                    return Err(Error::Domain {
                        function: "GammaProduct::log_value",
                        message: format!(
                            "continuing the integral here would take out about {need:.0e} factors \
                             (the cap is {MAX_EXPLICIT}); the rapidity is too far from the strip"
                        ),
                    });
                }
                peel = peel.max(need as usize);
            }
        }
        Ok(peel)
    }

    pub(super) fn integral_form<C: ComplexField>(
        &self,
        z: &C,
        z0: Option<&C>,
        wp: u32,
        prec: Prec,
    ) -> Result<FactorValue<C>> {
        let kernel = self.kernel()?;
        let coeffs = super::coeffs_of(&kernel.coeffs, &kernel.terms, wp);
        let zf = (z.re_f64(), z.im_f64());
        let z0f = z0.map(|w| (w.re_f64(), w.im_f64()));
        if C::MAX_PREC.is_some() {
            return Err(Error::Domain {
                function: "GammaProduct::integral_form",
                message: "the double path's double-exponential integral runs on MPFR \
                          (GammaProduct::integral_double)"
                    .into(),
            });
        }
        let peel = Self::peel_count(&coeffs, zf, z0f, MARGIN)?;
        let (explicit, rad_explicit) = if peel > 0 {
            self.explicit(TermSet::Kernel, z, z0, peel, wp)?
        } else {
            (C::from_i64(0, wp), Radius::ZERO)
        };
        // c'_j = c_j + a·peel (and at z₀), with weights n_j: for the Taylor
        // series near t = 0.
        let mut exps: Vec<(C, i64)> = Vec::new();
        for (j, (a, b, s)) in coeffs.iter().enumerate() {
            let n = kernel.terms[j].power;
            let b2 = C::Real::from_float(&Float::with_val(wp, a * Integer::from(peel)))
                + &C::Real::from_float(b);
            let s = C::Real::from_float(s);
            exps.push((z.clone().mul_real(&s).add_real(&b2), n));
            if let Some(z0) = z0 {
                exps.push((z0.clone().mul_real(&s).add_real(&b2), -n));
            }
        }
        let powers: Vec<i64> = kernel.terms.iter().map(|t| t.power).collect();
        let integral: Approx<C> = {
            let zz: Complex = downcast::<C, Complex>(z).expect("the MPFR path");
            let exps_mp: Vec<(Complex, i64)> = exps
                .iter()
                .map(|(c, n)| (downcast::<C, Complex>(c).expect("the MPFR path"), *n))
                .collect();
            let z0_mp = z0.map(|w| downcast::<C, Complex>(w).expect("the MPFR path"));
            upcast::<C, Complex>(self.malmsten_mp(
                &coeffs,
                &powers,
                &exps_mp,
                &zz,
                z0_mp.as_ref(),
                peel,
                wp,
                prec,
            )?)
        };
        let value = explicit + &integral.value;
        let rad = rad_explicit + integral.radius;
        Ok(FactorValue {
            log: finish(value, rad, prec),
            representation: Representation::Integral { peeled: peel },
        })
    }

    /// The integral on the double path: the uniform rule where it applies,
    /// otherwise the double-exponential rule on MPFR at 53 + 24 bits from
    /// the exact rapidity (the cancellation near t = 0 needs more bits than
    /// a double has), rounded at the end.
    pub(super) fn integral_double<C: ComplexField>(
        &self,
        theta: &C,
        z: &C,
        prec: Prec,
    ) -> Result<FactorValue<C>> {
        let kernel = self.kernel()?;
        if kernel.even {
            if let Some(v) =
                self.trapezoid_point(Complex64::new(z.re_f64(), z.im_f64()), prec, false)?
            {
                return Ok(FactorValue {
                    log: upcast::<C, Complex64>(v),
                    representation: Representation::Integral { peeled: 0 },
                });
            }
        }
        let w = working_bits::<Complex>(prec);
        let th = Complex::with_val(w, (theta.re_f64(), theta.im_f64()));
        let v = self.log_value::<Complex>(&th, prec, super::Method::Integral)?;
        let (re, im) = (v.log.value.real().to_f64(), v.log.value.imag().to_f64());
        let round = Complex::with_val(w, &v.log.value - &Complex::with_val(53, (re, im)));
        Ok(FactorValue {
            log: Approx::new(
                C::from_f64(re, im, 53),
                v.log.radius + Radius::from_log2(round.log2_abs()),
                53,
            ),
            representation: v.representation,
        })
    }

    /// The MPFR path: Taylor series below `t_s`, cached node data above.
    #[allow(clippy::too_many_arguments)]
    fn malmsten_mp(
        &self,
        coeffs: &[Abs],
        powers: &[i64],
        exps: &[(Complex, i64)],
        z: &Complex,
        z0: Option<&Complex>,
        peel: usize,
        wp: u32,
        prec: Prec,
    ) -> Result<Approx<Complex>> {
        let a = Float::with_val(wp, &coeffs[0].0);
        let (g_ser, t_s) = taylor_series(exps, &a, wp);
        // Node data from coefficients at the highest node precision, so that
        // the power sums of the c_j vanish to that precision.
        let hi_max = wp + extra_bits(t_s);
        let kernel = self.kernel()?;
        let coeffs_hi = super::coeffs_of(&kernel.coeffs, &kernel.terms, hi_max);
        let classes = Classes::new(&coeffs_hi);
        let snapshot = self
            .nodes
            .mp
            .read()
            .expect("poisoned")
            .get(&(wp, peel))
            .cloned()
            .unwrap_or_default();
        let fresh: RefCell<Vec<(u64, Arc<NodeData<Float>>)>> = RefCell::new(Vec::new());
        let ts = Float::with_val(wp, t_s);
        let x = Float::with_val(wp, z.real());
        let y = Float::with_val(wp, z.imag());
        let f = |t: &Float| -> Complex {
            if *t < ts {
                let mut acc = Complex::new(wp);
                for c in g_ser.iter().rev() {
                    acc *= t;
                    acc += c;
                }
                return acc;
            }
            let key = t.to_f64().to_bits();
            let d = match snapshot.get(&key) {
                Some(d) => Arc::clone(d),
                None => {
                    let d = Arc::new(node_data(
                        t,
                        wp + extra_bits(t.to_f64()),
                        &coeffs_hi,
                        powers,
                        &classes,
                        peel,
                        z0,
                    ));
                    fresh.borrow_mut().push((key, Arc::clone(&d)));
                    d
                }
            };
            node_value(&d, &x, &y, t.prec())
        };
        // log F is wanted to an absolute accuracy (it is the relative
        // accuracy of F), so a value that vanishes — log F(0) = 0 for a
        // unitary product, where the integrand is identically 0 — is not
        // chased to a relative accuracy it cannot have.
        let rule = default_rule().with_abs_tol(Radius::from_log2(-(prec.bits() as f64) - 8.0));
        let r = rule.integrate(f, &Domain::HalfLineExpDecay(Float::new(wp)), prec);
        let fresh = fresh.into_inner();
        if !fresh.is_empty() {
            let mut map = self.nodes.mp.write().expect("poisoned");
            let entry = map.entry((wp, peel)).or_default();
            let m = Arc::make_mut(entry);
            m.extend(fresh);
        }
        r
    }
}

/// The Taylor series of the integrand at t = 0 and its radius of use `t_s`:
/// `N(t)/t³ = Σ_{m≥3} (−1)^m P_m t^{m−3}/m!`, `P_m = Σ n_j c_j^m`, times
/// `[t/(1 − e^{−t})]·[t/(1 − e^{−at})] = Σ (−1)^i B_i t^i/i! · (1/a)Σ (−1)^i B_i (at)^i/i!`.
fn taylor_series(exps: &[(Complex, i64)], a: &Float, wp: u32) -> (Vec<Complex>, f64) {
    let c_max = exps
        .iter()
        .map(|(c, _)| c.log2_abs().exp2())
        .fold(1.0f64, f64::max);
    let a64 = a.to_f64();
    // Series radius: Q(t) has poles at 2πi/a and 2πi; e^{ct} terms grow like |c|^m.
    let g_bits = ((wp as f64).sqrt().ceil()).max(8.0);
    let t_s = (2f64.powf(-g_bits))
        .min(0.5 / a64.max(1.0))
        .min(0.25 / c_max);
    let n_series = ((wp as f64 + 16.0) / (1.0 / t_s).log2()).ceil() as usize + 2;
    let mm = n_series + 3;
    let mut p_m = vec![Complex::new(wp); mm + 1];
    for (c, n) in exps {
        let mut pw = Complex::with_val(wp, *n);
        for slot in p_m.iter_mut() {
            *slot += &pw;
            pw *= c;
        }
    }
    let mut a_ser = Vec::with_capacity(n_series);
    let mut fact = Float::with_val(wp, 6u32); // 3!
    for (m, pm) in p_m.iter().enumerate().take(mm).skip(3) {
        if m > 3 {
            fact *= m as u32;
        }
        let mut v = Complex::with_val(wp, pm / &fact);
        if m % 2 == 1 {
            v = -v;
        }
        a_ser.push(v);
    }
    let one = Float::with_val(wp, 1);
    // t/(1 − e^{−t}) and t/(1 − e^{−at}) = (1/a)·(at)/(1 − e^{−at})
    let b1 = super::product::bernoulli_series(one.clone(), &one, true, n_series, wp);
    let b2 = super::product::bernoulli_series(
        Float::with_val(wp, one / a),
        &Float::with_val(wp, a),
        true,
        n_series,
        wp,
    );
    let mut q = vec![Float::new(wp); n_series];
    for i in 0..n_series {
        for k in 0..=i {
            q[i] += Float::with_val(wp, &b1[k] * &b2[i - k]);
        }
    }
    let mut g_ser = vec![Complex::new(wp); n_series];
    for i in 0..n_series {
        for k in 0..=i {
            g_ser[i] += Complex::with_val(wp, &a_ser[k] * &q[i - k]);
        }
    }
    (g_ser, t_s)
}
