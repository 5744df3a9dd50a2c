//! Product form with analytic tail (docs/math.md §3).

use super::{Abs, Error, FactorValue, GammaProduct, Representation, Result, MAX_EXPLICIT};
use crate::num::{ComplexField, RealField};
use crate::precision::{Prec, Radius};
use crate::special::{asymptotic_radius, finish, hurwitz_zeta, log_gamma};
use rug::{Complex, Float, Integer};
use std::collections::HashMap;
use std::sync::{Arc, RwLock};

/// Tail tables by (real type, precision, K, length).
pub(super) type TailCache =
    RwLock<HashMap<(std::any::TypeId, u32, u64, usize), Arc<dyn std::any::Any + Send + Sync>>>;

/// One step group of the tail.
struct TailGroup<R> {
    members: Vec<usize>,
    inv_a: R,
    beta: Vec<R>,
}

/// The z-independent tables of the tail (see `tail_tables`).
struct TailTables<R> {
    groups: Vec<TailGroup<R>>,
    weight: Vec<R>,
}

/// Which term set an explicit sum runs over.
#[derive(Clone, Copy)]
pub(super) enum TermSet {
    /// The product's own terms.
    Original,
    /// The common-step terms of the integral form.
    Kernel,
}

impl GammaProduct {
    /// Σ_{k<K} Σ_j n_j [log Γ(a_j k + c_j) − log Γ(a_j k + c_j⁰)] with poles detected.
    pub(super) fn explicit<C: ComplexField>(
        &self,
        set: TermSet,
        z: &C,
        z0: Option<&C>,
        kmax: usize,
        wp: u32,
    ) -> Result<(C, Radius)> {
        let (coeffs, terms) = match set {
            TermSet::Original => (self.coeffs_at(wp), &self.terms),
            TermSet::Kernel => {
                let k = self.kernel()?;
                (super::coeffs_of(&k.coeffs, &k.terms, wp), &k.terms)
            }
        };
        if C::MAX_PREC.is_some() {
            let c = |v: &C| num_complex::Complex64::new(v.re_f64(), v.im_f64());
            let (v, r) = explicit_f64(&coeffs, terms, c(z), z0.map(c), kmax)?;
            return Ok((C::from_f64(v.re, v.im, 53), r));
        }
        let inner = Prec::from_bits(wp as u64)?;
        let mut sum = Accumulator::<C>::new(wp);
        let mut rad = Radius::ZERO;
        let mut pole_order = 0i64;
        let mut at_pole = false;
        for (j, (a, b, s)) in coeffs.iter().enumerate() {
            let n = terms[j].power;
            let (a, b, s) = (
                C::Real::from_float(a),
                C::Real::from_float(b),
                C::Real::from_float(s),
            );
            for k in 0..kmax {
                let base = a.clone().mul_i64(k as i64) + &b;
                for (arg_z, sign) in [(Some(z), 1i64), (z0, -1i64)] {
                    let Some(zz) = arg_z else { continue };
                    let sz = zz.clone().mul_real(&s);
                    let scale = sz.log2_abs().exp2() + base.to_f64().abs();
                    let w = sz.add_real(&base);
                    if near_gamma_pole(&w, scale, wp) {
                        if sign == 1 {
                            pole_order += n;
                            at_pole = true;
                            continue;
                        }
                        return Err(Error::Domain {
                            function: "GammaProduct::log_value",
                            message: "the normalisation point is a pole or zero of the product; \
                                      choose another reference rapidity"
                                .into(),
                        });
                    }
                    let lg = log_gamma(&w, inner)?;
                    rad += lg.radius.times(n.unsigned_abs() as f64);
                    sum.add(lg.value.mul_i64(n * sign));
                }
            }
        }
        if at_pole {
            return Err(singular(pole_order));
        }
        Ok((sum.total(), rad))
    }

    pub(super) fn product_form<C: ComplexField>(
        &self,
        z: &C,
        z0: Option<&C>,
        wp: u32,
        prec: Prec,
    ) -> Result<FactorValue<C>> {
        let zf = (z.re_f64(), z.im_f64());
        let z0f = z0.map(|w| (w.re_f64(), w.im_f64()));
        let tf = self.terms_f64();
        let (mut kk, y_max, c_max) = start_k(tf, zf, z0f, wp)?;
        let a_min = tf.iter().map(|c| c.0).fold(f64::INFINITY, f64::min);
        let target = -(wp as f64) + 8.0;
        let (explicit, rad_explicit, tail, tail_err, m_terms) = loop {
            let m_terms = series_terms(a_min * kk as f64, y_max, c_max, wp);
            let (explicit, rad_explicit) = self.explicit(TermSet::Original, z, z0, kk, wp)?;
            let scale = explicit.log2_abs().max(0.0);
            if let Some((tail, tail_err, used)) =
                self.tail(z, z0, kk, 2 * m_terms + 8, target + scale, wp, false)?
            {
                break (explicit, rad_explicit, tail, tail_err, used);
            }
            if kk > MAX_EXPLICIT {
                return Err(Error::NoConvergence {
                    what: "the analytic tail of the gamma product".into(),
                    achieved: "no usable truncation".into(),
                    hint: "use the integral form, or ask for fewer digits".into(),
                });
            }
            // The tail series never got small enough: more explicit factors.
            kk = kk * 3 / 2 + 1;
        };
        let value = explicit + &tail;
        let mag = value.log2_abs().max(tail.log2_abs());
        let rad = rad_explicit + tail_err + Radius::from_log2(mag - wp as f64 + 4.0);
        Ok(FactorValue {
            log: finish(value, rad, prec),
            representation: Representation::Product {
                explicit: kk,
                tail_terms: m_terms,
            },
        })
    }

    /// Σ_{k≥K} by the asymptotic expansion `Σ_{m≥3} C_m ζ(m−1, K)`, summed
    /// until a term falls below `2^target` (that term, doubled, is the error
    /// estimate); `None` if no term up to `m_cap` does.
    ///
    /// With `derivative` it is `d/dz` of the same tail, term by term:
    /// `dg_m/dz = [t^{m−1}] Σ_j n_j (s_j/a) e^{c_j t/a} β(t)` (docs/math.md §3a).
    #[allow(clippy::too_many_arguments)]
    pub(super) fn tail<C: ComplexField>(
        &self,
        z: &C,
        z0: Option<&C>,
        kk: usize,
        m_cap: usize,
        target: f64,
        wp: u32,
        derivative: bool,
    ) -> Result<Option<(C, Radius, usize)>> {
        let coeffs = self.coeffs_at(wp);
        // Tables are cached per length rounded up to a multiple of 16.
        let mm = m_cap.div_ceil(16) * 16;
        let tables = self.tail_tables::<C::Real>(&coeffs, wp, kk as u64, mm)?;
        let zero = C::Real::from_f64(0.0, wp);
        let czero = C::from_reals(zero.clone(), zero.clone());
        // Per step group the generating function
        // G_a(t) = Σ_j n_j (e^{c_j t/a} − e^{c_j⁰ t/a}) · t/(e^{t/a} − 1)
        // has [t^m] = Σ_j n_j a^{1−m} (B_m(c_j) − B_m(c_j⁰)) / m!.
        // s(t) = Σ_j n_j e^{c_j t / a} per group, coefficients Σ n (c/a)^m / m!,
        // extended one order at a time: only as far as the series is summed.
        // Per term: (group, current coefficient e_m, ratio c/a).
        let mut states: Vec<(usize, C, C)> = Vec::new();
        for (gi, group) in tables.groups.iter().enumerate() {
            for &j in &group.members {
                let n = self.terms[j].power;
                let (_, b, s) = &coeffs[j];
                let (b, s) = (C::Real::from_float(b), C::Real::from_float(s));
                // z₀ is a constant: no part in the derivative.
                let z0 = if derivative { None } else { z0 };
                for (arg_z, sign) in [(Some(z), 1i64), (z0, -1i64)] {
                    let Some(zz) = arg_z else { continue };
                    let ratio = zz.clone().mul_real(&s).add_real(&b).mul_real(&group.inv_a);
                    let mut e = C::from_i64(n * sign, wp);
                    if derivative {
                        e = e.mul_real(&(s.clone() * &group.inv_a));
                    }
                    states.push((gi, e, ratio));
                }
            }
        }
        let mut s_coefs: Vec<Vec<C>> = vec![Vec::with_capacity(mm + 1); tables.groups.len()];
        let mut g: Vec<C> = Vec::with_capacity(mm + 1);
        // g_m = [t^m] Σ_groups s(t)·β(t), β(t) = a · (t/a)/(e^{t/a} − 1).
        let mut extend_to = |m_max: usize, g: &mut Vec<C>| {
            while g.len() <= m_max {
                let m = g.len();
                for sc in s_coefs.iter_mut() {
                    sc.push(czero.clone());
                }
                for (gi, e, ratio) in states.iter_mut() {
                    if m > 0 {
                        *e = (e.clone() * &*ratio).div_i64(m as i64);
                    }
                    s_coefs[*gi][m] += &*e;
                }
                let mut gm = czero.clone();
                for (group, sc) in tables.groups.iter().zip(&s_coefs) {
                    for i in 0..=m {
                        gm += &sc[m - i].clone().mul_real(&group.beta[i]);
                    }
                }
                g.push(gm);
            }
        };
        // C_m ζ(m−1, K) = (−1)^m (m−2)! ζ(m−1, K) g_m ;  tail = Σ_{m≥3} of these.
        let mut term_at = |m: usize| -> C {
            let idx = if derivative { m - 1 } else { m };
            extend_to(idx, &mut g);
            g[idx].clone().mul_real(&tables.weight[m])
        };
        let mut sum = C::from_reals(zero.clone(), zero.clone());
        let mut m = 3usize;
        let mut next = term_at(m);
        while m < mm {
            let term = next;
            next = term_at(m + 1);
            // Stop only when two consecutive terms are small: for crossing-
            // symmetric products every odd (or even) C_m vanishes, and one
            // zero term says nothing about the rest of the series.
            let (size, size_next) = (term.log2_abs(), next.log2_abs());
            if m > 3 && size < target && size_next < target {
                let err = Radius::from_log2(size + 1.0) + Radius::from_log2(size_next + 1.0);
                return Ok(Some((sum, err, m - 3)));
            }
            sum += &term;
            m += 1;
        }
        Ok(None)
    }

    /// The z-independent tables of the tail at (wp, K, length `mm`), cached:
    /// terms grouped by step with the series of `a·(t/a)/(e^{t/a} − 1)`, and
    /// the weights `(−1)^m (m−2)! ζ(m−1, K)`.
    fn tail_tables<R: RealField>(
        &self,
        coeffs: &[Abs],
        wp: u32,
        kk: u64,
        mm: usize,
    ) -> Result<Arc<TailTables<R>>> {
        let key = (std::any::TypeId::of::<R>(), wp, kk, mm);
        if let Some(t) = self.tails.read().expect("poisoned").get(&key) {
            return Ok(Arc::clone(t)
                .downcast::<TailTables<R>>()
                .expect("keyed by type"));
        }
        let mut groups: Vec<(Float, Vec<usize>)> = Vec::new();
        for (j, (a, _, _)) in coeffs.iter().enumerate() {
            match groups.iter_mut().find(|(g, _)| g == a) {
                Some((_, v)) => v.push(j),
                None => groups.push((a.clone(), vec![j])),
            }
        }
        let groups = groups
            .into_iter()
            .map(|(a_f, members)| {
                let a = R::from_float(&a_f);
                let inv_a = R::from_f64(1.0, wp) / &a;
                let beta = bernoulli_series(a, &inv_a, false, mm + 1, wp);
                TailGroup {
                    members,
                    inv_a,
                    beta,
                }
            })
            .collect();
        let zetas = self.zetas_at(wp, kk, mm)?;
        let mut weight = vec![R::from_f64(0.0, wp); 3];
        let mut fact = Float::with_val(wp, 1u32); // (m−2)!
        for m in 3..=mm {
            fact *= (m - 2) as u32;
            let w = Float::with_val(wp, &fact * &zetas[m - 2]);
            weight.push(R::from_float(&if m % 2 == 1 { -w } else { w }));
        }
        let t = Arc::new(TailTables { groups, weight });
        let any: Arc<dyn std::any::Any + Send + Sync> = t.clone();
        self.tails.write().expect("poisoned").insert(key, any);
        Ok(t)
    }

    /// `ζ(s, K)` for `s = 2..=mm` at entry `s − 1` (entry 0 unused), cached
    /// per (precision, K).
    pub(super) fn zetas_at(&self, wp: u32, kk: u64, mm: usize) -> Result<Arc<Vec<Float>>> {
        if let Some(v) = self.zetas.read().expect("poisoned").get(&(wp, kk)) {
            if v.len() >= mm {
                return Ok(Arc::clone(v));
            }
        }
        let p = Prec::from_bits(wp as u64)?;
        let a = Complex::with_val(wp, kk);
        let mut v = vec![Float::new(wp)];
        for s in 2..=mm {
            let z = hurwitz_zeta(&Complex::with_val(wp, s as u32), &a, p)?;
            v.push(z.value.real().clone());
        }
        let v = Arc::new(v);
        self.zetas
            .write()
            .expect("poisoned")
            .insert((wp, kk), Arc::clone(&v));
        Ok(v)
    }
}

/// The first number of explicit factors `K`: `a_j K` past the asymptotic
/// radius and past `2|c_j|`; with `max |Im c_j|` and `max |c_j|/a_j`.
pub(super) fn start_k(
    coeffs: &[(f64, f64, f64)],
    z: (f64, f64),
    z0: Option<(f64, f64)>,
    wp: u32,
) -> Result<(usize, f64, f64)> {
    let radius = asymptotic_radius(wp);
    let mut kk = 1usize;
    let mut y_max = 0.0f64;
    let mut c_max = 0.0f64;
    for &(a, b, s) in coeffs.iter() {
        let mut c_abs = 0.0f64;
        for zz in std::iter::once(z).chain(z0) {
            let (x, y) = (b + s * zz.0, s * zz.1);
            // (x² + y²)^½ rather than hypot: the magnitudes are moderate here
            // (larger ones are refused below) and this is on every call.
            let r = (x * x + y * y).sqrt();
            c_abs = c_abs.max(r);
            y_max = y_max.max(y.abs());
            c_max = c_max.max(r / a);
        }
        let need = ((radius + 2.0 * c_abs) / a).ceil().max(1.0);
        if need.is_nan() || need > MAX_EXPLICIT as f64 {
            return Err(Error::Domain {
                function: "GammaProduct::log_value",
                message: format!(
                    "this rapidity needs about {need:.0e} explicit factors in the product form \
                     (the cap is {MAX_EXPLICIT}); it is too far from the origin for this factor"
                ),
            });
        }
        kk = kk.max(need as usize);
    }
    Ok((kk, y_max, c_max))
}

/// The tail's series length for `a_min K = ak`: `|C_m ζ(m−1,K)| ≲ 2 m!
/// e^{2π max|Im c|} / ((2π)^m m² (aK)^{m−2})` (`|B_m(c)|` grows like
/// `m!/(2π)^m · e^{2π|Im c|}`, DLMF 24.11, or like `(|c| + 1)^m`).
pub(super) fn series_terms(ak: f64, y_max: f64, c_max: f64, wp: u32) -> usize {
    let growth = 2.0 * std::f64::consts::PI * y_max * std::f64::consts::LOG2_E;
    let mut m_terms = 3usize;
    loop {
        let m = m_terms as f64;
        let bern = (1.0 + crate::special::log2_factorial(m) + growth
            - m * (2.0 * std::f64::consts::PI).log2())
        .max(m * (c_max + 1.0).log2());
        let l2 = bern - 2.0 * m.log2() - (m - 2.0) * ak.log2();
        if l2 < -(wp as f64) - 8.0 || m_terms > 8 * wp as usize {
            return m_terms;
        }
        m_terms += 1;
    }
}

/// The first `len` coefficients of `scale · Σ_i σ^i B_i (step·t)^i / i!`:
/// with `σ = +1` that is `scale · (step t)/(e^{step t} − 1)`, with `σ = −1`
/// `scale · (step t)/(1 − e^{−step t})` (DLMF 24.2.1).
pub(super) fn bernoulli_series<R: RealField>(
    scale: R,
    step: &R,
    alternate: bool,
    len: usize,
    wp: u32,
) -> Vec<R> {
    let mut out = Vec::with_capacity(len);
    let mut pw = scale; // scale · step^i
    let mut fact = Integer::from(1);
    for i in 0..len {
        if i > 0 {
            pw *= step;
            fact *= i as u32;
        }
        let bi = crate::special::bernoulli(i as u32);
        let mut q = rug::Rational::from((bi.numer().clone(), bi.denom().clone() * &fact));
        if alternate && i % 2 == 1 {
            q = -q;
        }
        out.push(pw.clone() * &R::from_rational(&q, wp));
    }
    out
}

/// A sum of many log-gammas that largely cancel. On the double path it is
/// compensated (Neumaier's variant of Kahan summation, per component), so
/// the result is the correctly rounded sum of the rounded terms; on the
/// arbitrary path the guard bits already cover it.
pub(super) struct Accumulator<C: ComplexField> {
    sum: C,
    comp: (f64, f64),
    double: bool,
}

impl<C: ComplexField> Accumulator<C> {
    pub(super) fn new(wp: u32) -> Self {
        Accumulator {
            sum: C::from_i64(0, wp),
            comp: (0.0, 0.0),
            double: C::MAX_PREC.is_some(),
        }
    }

    pub(super) fn add(&mut self, x: C) {
        if !self.double {
            self.sum += &x;
            return;
        }
        let two_sum = |s: f64, v: f64, c: &mut f64| {
            let t = s + v;
            *c += if s.abs() >= v.abs() {
                (s - t) + v
            } else {
                (v - t) + s
            };
            t
        };
        let re = two_sum(self.sum.re_f64(), x.re_f64(), &mut self.comp.0);
        let im = two_sum(self.sum.im_f64(), x.im_f64(), &mut self.comp.1);
        self.sum = C::from_f64(re, im, 53);
    }

    pub(super) fn total(self) -> C {
        if self.double {
            C::from_f64(
                self.sum.re_f64() + self.comp.0,
                self.sum.im_f64() + self.comp.1,
                53,
            )
        } else {
            self.sum
        }
    }
}

/// [`GammaProduct::explicit`] on the double path, in plain `f64` with the
/// radius kept linear (the generic code's log-domain radius bookkeeping
/// costs as much as the log-gammas here); the same pole detection, the same
/// compensated sum.
fn explicit_f64(
    coeffs: &[Abs],
    terms: &[super::GammaTerm],
    z: num_complex::Complex64,
    z0: Option<num_complex::Complex64>,
    kmax: usize,
) -> Result<(num_complex::Complex64, Radius)> {
    let mut sum = Accumulator::<num_complex::Complex64>::new(53);
    let mut rad = 0.0f64;
    let mut pole_order = 0i64;
    let mut at_pole = false;
    for (j, (a, b, s)) in coeffs.iter().enumerate() {
        let n = terms[j].power;
        let (a, b, s) = (a.to_f64(), b.to_f64(), s.to_f64());
        for (arg_z, sign) in [(Some(z), 1i64), (z0, -1i64)] {
            let Some(zz) = arg_z else { continue };
            let sz = zz * s;
            let sz_abs = sz.re.abs() + sz.im.abs(); // ≥ |sz|, no hypot
            for k in 0..kmax {
                let base = a * k as f64 + b;
                let w = sz + base;
                if near_gamma_pole(&w, sz_abs + base.abs(), 53) {
                    if sign == 1 {
                        pole_order += n;
                        at_pole = true;
                        continue;
                    }
                    return Err(Error::Domain {
                        function: "GammaProduct::log_value",
                        message: "the normalisation point is a pole or zero of the product; \
                                  choose another reference rapidity"
                            .into(),
                    });
                }
                let lg = log_gamma(&w, Prec::DOUBLE)?;
                rad += lg.radius.to_f64() * n.unsigned_abs() as f64;
                sum.add(lg.value * (n * sign) as f64);
            }
        }
    }
    if at_pole {
        return Err(singular(pole_order));
    }
    Ok((sum.total(), Radius::from_f64(rad)))
}

/// The error at a point where the gammas' pole orders sum to `order`
/// (negative: a zero; zero: a removable point).
pub(super) fn singular(order: i64) -> Error {
    match order {
        o if o > 0 => Error::Pole {
            function: "gamma product",
            order: o as u32,
            at: "this rapidity".into(),
        },
        o if o < 0 => Error::Zero {
            function: "gamma product",
            order: (-o) as u32,
            at: "this rapidity".into(),
        },
        _ => Error::Domain {
            function: "gamma product",
            message: "poles of numerator and denominator gammas cancel here (a removable \
                      point); evaluate at a nearby rapidity"
                .into(),
        },
    }
}

/// Whether `w` is a pole of Γ up to the rounding of its computation: within
/// `2^(8−wp)` of a non-positive integer, relative to the size `scale` of the
/// pieces `w` was summed from. Nearer than that, but not that near, log Γ
/// itself is accurate and no pole is reported.
pub(super) fn near_gamma_pole<C: ComplexField>(w: &C, scale: f64, wp: u32) -> bool {
    let x = w.re_f64();
    if x > 0.5 {
        return false;
    }
    let m = x.round();
    let d = w.clone().add_real(&C::Real::from_f64(-m, wp)).log2_abs();
    d < scale.max(1.0).log2() - wp as f64 + 8.0
}
