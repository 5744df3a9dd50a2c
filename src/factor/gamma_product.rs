//! Infinite products of gamma functions,
//! `F(z) = Π_{k≥0} Π_j Γ(a_j k + b_j + s_j z)^{n_j}`, optionally normalised
//! as `F(z)/F(z₀)`, with `z` a fixed multiple of the rapidity θ.
//!
//! See docs/math.md for the derivations. In brief:
//!
//! * **Convergence** (checked when the product is built): with
//!   `c_j = b_j + s_j z`, DLMF 5.11.8 gives for the k-th factor
//!   `Σ_j n_j log Γ(a_j k + c_j) = k ln k Σ n a + k Σ n a (ln a − 1) +
//!   ln k Σ n (c − ½) + Σ n((c − ½) ln a + ½ ln 2π) + (1/k) Σ n B₂(c)/(2a) + O(k⁻²)`;
//!   every coefficient before `O(k⁻²)` must vanish for all z (for a
//!   normalised product, only their z-dependent parts).
//! * **Product form**: `Σ_{k<K}` by [`log_gamma`](crate::special::log_gamma),
//!   plus the tail `Σ_{k≥K}` summed from the same expansion:
//!   `Σ_{m≥3} C_m ζ(m−1, K)`, `C_m = (−1)^m/(m(m−1)) Σ_j n_j B_m(c_j) a_j^{1−m}`
//!   (Hurwitz ζ, [`hurwitz_zeta`](crate::special::hurwitz_zeta)). `K` puts
//!   `a K` past the asymptotic radius, so the cost grows with the digits, not
//!   exponentially. Converges for every z off the poles.
//! * **Integral form** (common step `a`): Malmstén's formula summed over k,
//!   `log F = ∫_0^∞ dt/t · Σ_j n_j (e^{−c_j t} − e^{−c_j⁰ t}) / ((1 − e^{−at})(1 − e^{−t}))`,
//!   valid while every `Re c_j > 0` (a strip in the θ plane). Outside it the
//!   first `K` factors are taken out explicitly (`Γ(w+1) = wΓ(w)` moves the
//!   rest into the strip), which is the continuation.

use super::coef::Coef;
use crate::error::{Error, Result};
use crate::num::{ComplexField, RealField};
use crate::precision::{Approx, Prec, Radius};
use crate::quadrature::{default_rule, Domain};
use crate::special::{asymptotic_radius, finish, hurwitz_zeta, log_gamma};
use rug::float::Constant;
use rug::{Complex, Float, Integer};
use std::collections::HashMap;
use std::fmt;
use std::sync::{Arc, RwLock};

/// One gamma function `Γ(a k + b + s z)^n` of the product.
#[derive(Clone, Debug)]
pub struct GammaTerm {
    /// Step `a > 0` in the product index k.
    pub step: Coef,
    /// Offset `b`.
    pub offset: Coef,
    /// Slope `s` in the product's variable z.
    pub slope: Coef,
    /// Integer power `n`.
    pub power: i64,
}

impl GammaTerm {
    /// `Γ(step·k + offset + slope·z)^power`.
    pub fn new(step: Coef, offset: Coef, slope: Coef, power: i64) -> Self {
        GammaTerm {
            step,
            offset,
            slope,
            power,
        }
    }
}

/// How the product's variable z depends on the rapidity θ.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Scale {
    /// `z = θ/(iπ)`.
    OverIPi,
    /// `z = θ/(2πi)`.
    Over2PiI,
    /// `z = θ`.
    Unit,
}

impl Scale {
    /// z for a given θ.
    pub fn z_of<C: ComplexField>(self, theta: &C) -> C {
        let p = theta.prec();
        match self {
            Scale::Unit => theta.clone(),
            Scale::OverIPi => {
                let pi: C::Real = C::Real::pi(p);
                // θ/(iπ) = −iθ/π
                -(theta.clone().mul_i()).mul_real(&(C::Real::from_f64(1.0, p) / &pi))
            }
            Scale::Over2PiI => {
                let pi: C::Real = C::Real::pi(p);
                -(theta.clone().mul_i()).mul_real(&(C::Real::from_f64(0.5, p) / &pi))
            }
        }
    }

    /// `Re z` per unit of `Im θ` (the strip in z is a strip in θ).
    fn re_z_per_im_theta(self) -> Option<f64> {
        match self {
            Scale::OverIPi => Some(1.0 / std::f64::consts::PI),
            Scale::Over2PiI => Some(0.5 / std::f64::consts::PI),
            Scale::Unit => None,
        }
    }
}

/// Which representation to use.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Method {
    /// Choose automatically: currently the product form, which converges
    /// everywhere and measured faster than the integral at every precision
    /// tried (docs/performance.md); the integral serves as the independent check.
    Auto,
    /// Explicit factors plus the analytic tail.
    Product,
    /// Malmstén integral, with explicit factors taken out outside the strip.
    Integral,
}

/// Which representation produced a value.
#[derive(Clone, Debug, PartialEq, Eq)]
pub enum Representation {
    /// `explicit` factors summed directly, the tail from `tail_terms` terms
    /// of its asymptotic expansion.
    Product {
        /// Factors k < explicit summed by log Γ.
        explicit: usize,
        /// Terms of the tail series.
        tail_terms: usize,
    },
    /// The integral, after taking out the first `peeled` factors.
    Integral {
        /// Factors k < peeled taken out explicitly (0 inside the strip).
        peeled: usize,
    },
}

impl fmt::Display for Representation {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            Representation::Product {
                explicit,
                tail_terms,
            } => write!(
                f,
                "product ({explicit} factors + {tail_terms}-term analytic tail)"
            ),
            Representation::Integral { peeled: 0 } => write!(f, "integral (in its strip)"),
            Representation::Integral { peeled } => write!(
                f,
                "integral continued outside its strip ({peeled} factor{} taken out)",
                if *peeled == 1 { "" } else { "s" }
            ),
        }
    }
}

/// A value of `log F` with the representation used.
#[derive(Clone, Debug)]
pub struct FactorValue<C> {
    /// `log F(z)` (`log F(z)/F(z₀)` when normalised): the sum of principal
    /// log-gammas, with its error estimate.
    pub log: Approx<C>,
    /// How it was computed.
    pub representation: Representation,
}

/// One convergence condition and its value for a product.
#[derive(Clone, Debug)]
pub struct Condition {
    /// The condition, e.g. `Σ n·s = 0`.
    pub formula: &'static str,
    /// What fails without it.
    pub meaning: &'static str,
    /// The value of the left-hand side (should be 0).
    pub value: f64,
    /// Whether it holds. Exactly decided when every coefficient is rational
    /// (logarithms split over a coprime base, see `exact`); otherwise
    /// `|value|` below `2^−180` of the largest summand at 256 bits.
    pub holds: bool,
    /// Whether `holds` was decided exactly.
    pub exact: bool,
}

/// The convergence analysis of a product.
#[derive(Clone, Debug)]
pub struct Convergence {
    /// The conditions checked, in order of the expansion.
    pub conditions: Vec<Condition>,
    /// Whether all steps are equal (the integral form needs it).
    pub common_step: bool,
}

impl Convergence {
    /// Whether every condition holds.
    pub fn converges(&self) -> bool {
        self.conditions.iter().all(|c| c.holds)
    }
}

/// An infinite product of gamma functions; the method is described in
/// docs/math.md and in the [`factor`](crate::factor) module.
///
/// ```
/// use dressing::factor::{Coef, GammaProduct, GammaTerm, Method, Scale};
/// use dressing::Prec;
/// // The sine-Gordon factor at ξ = π/2 (p = 2, step 4), integer coefficients:
/// // Π_k Γ(4k+1−2z)Γ(4k+4−2z)Γ(4k+3+2z)Γ(4k+2+2z)
/// //   / [Γ(4k+1+2z)Γ(4k+4+2z)Γ(4k+3−2z)Γ(4k+2−2z)],  z = θ/(iπ).
/// let t = |b: i64, s: i64, n: i64| GammaTerm::new(Coef::integer(4), Coef::integer(b), Coef::integer(s), n);
/// let f = GammaProduct::new(
///     vec![t(1, -2, 1), t(4, -2, 1), t(3, 2, 1), t(2, 2, 1), t(1, 2, -1), t(4, 2, -1), t(3, -2, -1), t(2, -2, -1)],
///     Scale::OverIPi,
///     None,
/// ).unwrap();
/// let theta = rug::Complex::with_val(128, (0.3, 0.1));
/// let p = f.log_value(&theta, Prec::digits(30).unwrap(), Method::Product).unwrap();
/// let i = f.log_value(&theta, Prec::digits(30).unwrap(), Method::Integral).unwrap();
/// let d = rug::Complex::with_val(128, &p.log.value - &i.log.value);
/// assert!(d.abs().real().to_f64() < 1e-29);
/// ```
pub struct GammaProduct {
    terms: Vec<GammaTerm>,
    scale: Scale,
    theta0: Option<(f64, f64)>,
    convergence: Convergence,
    /// (a, b, s) per term at a working precision.
    coeffs: RwLock<HashMap<u32, Arc<Vec<Abs>>>>,
    /// ζ(m, K) for m = 2.. at (precision, K).
    zetas: RwLock<ZetaCache>,
}

impl fmt::Debug for GammaProduct {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.debug_struct("GammaProduct")
            .field("terms", &self.terms)
            .field("scale", &self.scale)
            .field("normalised_at", &self.theta0)
            .finish()
    }
}

const ANALYSIS_BITS: u32 = 256;

/// The most factors the product form (or the continuation) sums explicitly;
/// beyond it the rapidity is too far out for these representations.
pub const MAX_EXPLICIT: usize = 20_000;

/// (step, offset, slope) of one term at a working precision.
type Abs = (Float, Float, Float);
/// ζ(s, K) tables keyed by (precision, K).
type ZetaCache = HashMap<(u32, u64), Arc<Vec<Float>>>;

impl GammaProduct {
    /// Builds the product and checks that it converges. `normalise_at` is
    /// θ₀ for `F(θ)/F(θ₀)`.
    ///
    /// Errors: [`Error::Divergent`] naming the first failed condition and
    /// its value; [`Error::Domain`] for a non-positive step or no terms.
    pub fn new(
        terms: Vec<GammaTerm>,
        scale: Scale,
        normalise_at: Option<(f64, f64)>,
    ) -> Result<GammaProduct> {
        if terms.is_empty() {
            return Err(Error::Domain {
                function: "GammaProduct::new",
                message: "a gamma product needs at least one gamma term".into(),
            });
        }
        for t in &terms {
            if t.step.value(64) <= 0 {
                return Err(Error::Domain {
                    function: "GammaProduct::new",
                    message: format!(
                        "step {} must be positive (Γ(a k + …) with a > 0)",
                        t.step.label()
                    ),
                });
            }
        }
        if let Some((x, y)) = normalise_at {
            if !x.is_finite() || !y.is_finite() {
                return Err(Error::NonFinite {
                    function: "GammaProduct::new",
                    argument: "normalise_at",
                });
            }
        }
        let convergence = analyse(&terms, normalise_at.is_some());
        if let Some(c) = convergence.conditions.iter().find(|c| !c.holds) {
            return Err(Error::Divergent {
                condition: c.formula.to_string(),
                value: format!("{:e}", c.value),
                hint: format!(
                    "{}; change the powers, offsets or slopes so that it vanishes{}",
                    c.meaning,
                    if normalise_at.is_none() {
                        ", or normalise the product at a reference rapidity"
                    } else {
                        ""
                    }
                ),
            });
        }
        Ok(GammaProduct {
            terms,
            scale,
            theta0: normalise_at,
            convergence,
            coeffs: RwLock::new(HashMap::new()),
            zetas: RwLock::new(HashMap::new()),
        })
    }

    /// The convergence analysis.
    pub fn convergence(&self) -> &Convergence {
        &self.convergence
    }

    /// The terms.
    pub fn terms(&self) -> &[GammaTerm] {
        &self.terms
    }

    /// The strip `lo < Im θ < hi` where the integral form converges without
    /// taking factors out (`None` where the integral form is not available:
    /// different steps, `Σ n ≠ 0` without normalisation, or `z = θ`).
    pub fn strip(&self) -> Option<(f64, f64)> {
        if !self.integral_available() {
            return None;
        }
        let per = self.scale.re_z_per_im_theta()?;
        let c = self.coeffs_at(64);
        // Re c_j = b_j + s_j Re z > 0  for every j.
        let (mut lo, mut hi) = (f64::NEG_INFINITY, f64::INFINITY);
        for (_, b, s) in c.iter() {
            let (b, s) = (b.to_f64(), s.to_f64());
            if s > 0.0 {
                lo = lo.max(-b / s);
            } else if s < 0.0 {
                hi = hi.min(-b / s);
            } else if b <= 0.0 {
                return Some((0.0, 0.0));
            }
        }
        Some((lo / per, hi / per))
    }

    fn integral_available(&self) -> bool {
        self.convergence.common_step
            && (self.theta0.is_some() || self.terms.iter().map(|t| t.power).sum::<i64>() == 0)
    }

    fn coeffs_at(&self, wp: u32) -> Arc<Vec<Abs>> {
        if let Some(c) = self.coeffs.read().expect("poisoned").get(&wp) {
            return Arc::clone(c);
        }
        let v: Vec<_> = self
            .terms
            .iter()
            .map(|t| (t.step.value(wp), t.offset.value(wp), t.slope.value(wp)))
            .collect();
        let v = Arc::new(v);
        self.coeffs
            .write()
            .expect("poisoned")
            .insert(wp, Arc::clone(&v));
        v
    }

    /// `log F(θ)` (or `log F(θ)/F(θ₀)`) at `prec`, by `method`.
    ///
    /// Errors: [`Error::Pole`] / [`Error::Zero`] where θ hits a pole or zero
    /// of the product (orders summed over all gamma functions there);
    /// [`Error::Domain`] where the integral form was forced but is not
    /// available.
    pub fn log_value<C: ComplexField>(
        &self,
        theta: &C,
        prec: Prec,
        method: Method,
    ) -> Result<FactorValue<C>> {
        crate::special::check_arg("GammaProduct::log_value", "theta", theta, prec)?;
        let wp = match C::MAX_PREC {
            Some(m) => m,
            None => prec.bits() + 24,
        };
        let th = theta.with_prec(wp);
        let z = self.scale.z_of(&th);
        let z0 = self.theta0.map(|(x, y)| {
            let t0 = C::from_f64(x, y, wp);
            self.scale.z_of(&t0)
        });
        let method = match method {
            Method::Auto => Method::Product,
            m => m,
        };
        let r = match method {
            Method::Integral => {
                if !self.integral_available() {
                    return Err(Error::Domain {
                        function: "GammaProduct::log_value",
                        message: "the integral form needs one common step (and Σ n = 0 unless the \
                                  product is normalised); use the product form"
                            .into(),
                    });
                }
                self.integral_form(&z, z0.as_ref(), wp, prec)
            }
            _ => self.product_form(&z, z0.as_ref(), wp, prec),
        };
        // Name the rapidity in pole and zero reports.
        r.map_err(|e| match e {
            Error::Pole {
                function, order, ..
            } => Error::Pole {
                function,
                order,
                at: format!("θ = {}", theta.to_decimal(17)),
            },
            Error::Zero {
                function, order, ..
            } => Error::Zero {
                function,
                order,
                at: format!("θ = {}", theta.to_decimal(17)),
            },
            other => other,
        })
    }

    /// Σ_{k<K} Σ_j n_j [log Γ(a_j k + c_j) − log Γ(a_j k + c_j⁰)] with poles detected.
    fn explicit<C: ComplexField>(
        &self,
        z: &C,
        z0: Option<&C>,
        kmax: usize,
        wp: u32,
    ) -> Result<(C, Radius)> {
        let coeffs = self.coeffs_at(wp);
        let inner = Prec::from_bits(wp as u64)?;
        let mut sum = Accumulator::<C>::new(wp);
        let mut rad = Radius::ZERO;
        let mut pole_order = 0i64;
        let mut at_pole = false;
        for (j, (a, b, s)) in coeffs.iter().enumerate() {
            let n = self.terms[j].power;
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
            return Err(match pole_order {
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
            });
        }
        Ok((sum.total(), rad))
    }

    fn product_form<C: ComplexField>(
        &self,
        z: &C,
        z0: Option<&C>,
        wp: u32,
        prec: Prec,
    ) -> Result<FactorValue<C>> {
        let coeffs = self.coeffs_at(wp);
        // K: a_j K past the asymptotic radius and past 2|c_j|.
        let radius = asymptotic_radius(wp);
        let mut kk = 1usize;
        let mut y_max = 0.0f64;
        let mut c_max = 0.0f64;
        for (a, b, s) in coeffs.iter() {
            let (a, b, s) = (a.to_f64(), b.to_f64(), s.to_f64());
            let mut c_abs = 0.0f64;
            for zz in [Some(z), z0].into_iter().flatten() {
                let (x, y) = (b + s * zz.re_f64(), s * zz.im_f64());
                c_abs = c_abs.max(x.hypot(y));
                y_max = y_max.max(y.abs());
                c_max = c_max.max(x.hypot(y) / a);
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
        let a_min = coeffs
            .iter()
            .map(|c| c.0.to_f64())
            .fold(f64::INFINITY, f64::min);
        let target = -(wp as f64) + 8.0;
        let (explicit, rad_explicit, tail, tail_err, m_terms) = loop {
            // Series length: |C_m ζ(m−1,K)| ≲ 2 m! e^{2π max|Im c|} / ((2π)^m m² (aK)^{m−2})
            // (|B_m(c)| grows like m!/(2π)^m · e^{2π|Im c|}, DLMF 24.11.?).
            let ak = a_min * kk as f64;
            let growth = 2.0 * std::f64::consts::PI * y_max * std::f64::consts::LOG2_E;
            let mut m_terms = 3usize;
            loop {
                // |B_m(c)| ≲ 2 m!/(2π)^m e^{2π|Im c|} + (|c| + 1)^m, so a term of the
                // tail is at most about that over m² a^{m−1} K^{m−2}.
                let m = m_terms as f64;
                let bern = (1.0 + crate::special::log2_factorial(m) + growth
                    - m * (2.0 * std::f64::consts::PI).log2())
                .max(m * (c_max + 1.0).log2());
                let l2 = bern - 2.0 * m.log2() - (m - 2.0) * ak.log2();
                if l2 < -(wp as f64) - 8.0 || m_terms > 8 * wp as usize {
                    break;
                }
                m_terms += 1;
            }
            let (explicit, rad_explicit) = self.explicit(z, z0, kk, wp)?;
            let scale = explicit.log2_abs().max(0.0);
            if let Some((tail, tail_err, used)) =
                self.tail(z, z0, kk, 2 * m_terms + 8, target + scale, wp)?
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
    fn tail<C: ComplexField>(
        &self,
        z: &C,
        z0: Option<&C>,
        kk: usize,
        m_cap: usize,
        target: f64,
        wp: u32,
    ) -> Result<Option<(C, Radius, usize)>> {
        let coeffs = self.coeffs_at(wp);
        let mm = m_cap;
        // Group terms by step; per group the generating function
        // G_a(t) = Σ_j n_j (e^{c_j t/a} − e^{c_j⁰ t/a}) · t/(e^{t/a} − 1)
        // has [t^m] = Σ_j n_j a^{1−m} (B_m(c_j) − B_m(c_j⁰)) / m!.
        let mut groups: Vec<(Float, Vec<usize>)> = Vec::new();
        for (j, (a, _, _)) in coeffs.iter().enumerate() {
            match groups.iter_mut().find(|(g, _)| g == a) {
                Some((_, v)) => v.push(j),
                None => groups.push((a.clone(), vec![j])),
            }
        }
        let zero = C::Real::from_f64(0.0, wp);
        let mut g = vec![C::from_reals(zero.clone(), zero.clone()); mm + 1];
        for (a_f, members) in &groups {
            let a = C::Real::from_float(a_f);
            // s(t) = Σ_j n_j e^{c_j t / a}: coefficients (c/a)^m / m!
            let mut s_coef = vec![C::from_reals(zero.clone(), zero.clone()); mm + 1];
            for &j in members {
                let n = self.terms[j].power;
                let (_, b, s) = &coeffs[j];
                let (b, s) = (C::Real::from_float(b), C::Real::from_float(s));
                for (arg_z, sign) in [(Some(z), 1i64), (z0, -1i64)] {
                    let Some(zz) = arg_z else { continue };
                    let c = zz.clone().mul_real(&s).add_real(&b);
                    let ratio = c / &C::from_reals(a.clone(), zero.clone());
                    let mut e = C::from_i64(n * sign, wp);
                    for (m, slot) in s_coef.iter_mut().enumerate() {
                        if m > 0 {
                            e = (e * &ratio).div_i64(m as i64);
                        }
                        *slot += &e;
                    }
                }
            }
            // β(t) = a · (t/a)/(e^{t/a} − 1)
            let inv_a = C::Real::from_f64(1.0, wp) / &a;
            let beta = bernoulli_series(a.clone(), &inv_a, false, mm + 1, wp);
            for m in 0..=mm {
                let mut acc = C::from_reals(zero.clone(), zero.clone());
                for i in 0..=m {
                    acc += &s_coef[m - i].clone().mul_real(&beta[i]);
                }
                g[m] += &acc;
            }
        }
        // C_m = (−1)^m (m−2)! g_m ;  tail = Σ_{m=3}^{M} C_m ζ(m−1, K)
        let zetas = self.zetas_at(wp, kk as u64, mm)?;
        let term_at = |m: usize| -> C {
            let fact = C::Real::from_float(&Float::with_val(
                wp,
                Integer::from(Integer::factorial(m as u32 - 2)),
            ));
            let zeta = C::Real::from_float(&zetas[m - 2]);
            let term = g[m].clone().mul_real(&fact).mul_real(&zeta);
            if m % 2 == 1 {
                -term
            } else {
                term
            }
        };
        let mut sum = C::from_reals(zero.clone(), zero.clone());
        let mut m = 3usize;
        while m < mm {
            let term = term_at(m);
            let next = term_at(m + 1);
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

    /// `ζ(s, K)` for `s = 2..=mm` at entry `s − 1` (entry 0 unused), cached
    /// per (precision, K).
    fn zetas_at(&self, wp: u32, kk: u64, mm: usize) -> Result<Arc<Vec<Float>>> {
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

    fn integral_form<C: ComplexField>(
        &self,
        z: &C,
        z0: Option<&C>,
        wp: u32,
        prec: Prec,
    ) -> Result<FactorValue<C>> {
        let coeffs = self.coeffs_at(wp);
        let a_f = coeffs[0].0.clone();
        // Take out factors until every Re(a K + c_j) ≥ margin (also at z₀).
        let margin = 0.25;
        let mut peel = 0usize;
        for (a, b, s) in coeffs.iter() {
            let (a, b, s) = (a.to_f64(), b.to_f64(), s.to_f64());
            let mut re_c = b + s * z.re_f64();
            if let Some(z0) = z0 {
                re_c = re_c.min(b + s * z0.re_f64());
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
        let (explicit, rad_explicit) = if peel > 0 {
            self.explicit(z, z0, peel, wp)?
        } else {
            (C::from_i64(0, wp), Radius::ZERO)
        };
        // Integrand data: c'_j = c_j + a·peel (and at z₀), with weights n_j.
        let mut exps: Vec<(C, i64)> = Vec::new();
        for (j, (a, b, s)) in coeffs.iter().enumerate() {
            let n = self.terms[j].power;
            let b2 = C::Real::from_float(&Float::with_val(wp, a * Integer::from(peel)))
                + &C::Real::from_float(b);
            let s = C::Real::from_float(s);
            exps.push((z.clone().mul_real(&s).add_real(&b2), n));
            if let Some(z0) = z0 {
                exps.push((z0.clone().mul_real(&s).add_real(&b2), -n));
            }
        }
        let a = C::Real::from_float(&a_f);
        let integral = malmsten_integral(&exps, &a, wp, prec)?;
        let value = explicit + &integral.value;
        let rad = rad_explicit + integral.radius;
        Ok(FactorValue {
            log: finish(value, rad, prec),
            representation: Representation::Integral { peeled: peel },
        })
    }
}

/// `∫_0^∞ dt/t Σ_j n_j e^{−c_j t} / ((1 − e^{−at})(1 − e^{−t}))` for weights
/// whose power sums `Σ n_j c_j^m` vanish for m = 0, 1, 2 (so the integrand
/// is finite at 0). Below `t_s` the integrand is summed from its Taylor
/// series (no cancellation); above it, directly with `3·log2(1/t_s)` extra
/// bits.
fn malmsten_integral<C: ComplexField>(
    exps: &[(C, i64)],
    a: &C::Real,
    wp: u32,
    prec: Prec,
) -> Result<Approx<C>> {
    if C::MAX_PREC.is_some() {
        return malmsten_integral_double(exps, a.to_f64(), prec);
    }
    let zero = C::Real::from_f64(0.0, wp);
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
    let extra = (3.0 * (1.0 / t_s).log2()).ceil() as u32 + 16;
    let hi = if C::MAX_PREC.is_some() {
        53
    } else {
        wp + extra
    };
    // Taylor coefficients: N(t)/t³ = Σ_{m≥3} (−1)^m P_m t^{m−3}/m!,
    // Q(t) = [t/(1−e^{−t})]·[t/(1−e^{−at})]; series of g = (N/t³)·Q.
    let n_series = ((wp as f64 + 16.0) / (1.0 / t_s).log2()).ceil() as usize + 2;
    let mm = n_series + 3;
    let mut p_m = vec![C::from_reals(zero.clone(), zero.clone()); mm + 1];
    for (c, n) in exps {
        let mut pw = C::from_i64(*n, wp);
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
        let mut v = pm
            .clone()
            .mul_real(&C::Real::from_float(&Float::with_val(wp, fact.recip_ref())));
        if m % 2 == 1 {
            v = -v;
        }
        a_ser.push(v);
    }
    let one = C::Real::from_f64(1.0, wp);
    // t/(1 − e^{−t}) and t/(1 − e^{−at}) = (1/a)·(at)/(1 − e^{−at})
    let b1 = bernoulli_series(one.clone(), &one, true, n_series, wp);
    let b2 = bernoulli_series(one.clone() / a, a, true, n_series, wp);
    let mut q = vec![zero.clone(); n_series];
    for i in 0..n_series {
        for k in 0..=i {
            q[i] += &(b1[k].clone() * &b2[i - k]);
        }
    }
    let mut g_ser = vec![C::from_reals(zero.clone(), zero.clone()); n_series];
    for i in 0..n_series {
        for k in 0..=i {
            g_ser[i] += &a_ser[k].clone().mul_real(&q[i - k]);
        }
    }
    let exps_hi: Vec<(C, i64)> = exps.iter().map(|(c, n)| (c.with_prec(hi), *n)).collect();
    let a_hi = a.with_prec(hi);
    let ts = C::Real::from_f64(t_s, wp);
    let rule = default_rule();
    let f = |t: &C::Real| -> C {
        if *t < ts {
            // Horner in t.
            let mut acc = C::from_reals(zero.clone(), zero.clone());
            for c in g_ser.iter().rev() {
                acc = acc.mul_real(t) + c;
            }
            acc
        } else {
            let th = t.with_prec(hi);
            let mut num = C::from_i64(0, hi);
            for (c, n) in &exps_hi {
                let e = (-(c.clone()).mul_real(&th)).exp();
                num += &e.mul_i64(*n);
            }
            let one_h = C::Real::from_f64(1.0, hi);
            let d1 = one_h.clone() - &(-(th.clone() * &a_hi)).exp();
            let d2 = one_h - &(-th.clone()).exp();
            let den = th * &d1 * &d2;
            num.mul_real(&(C::Real::from_f64(1.0, hi) / &den))
                .with_prec(wp)
        }
    };
    rule.integrate(
        f,
        &Domain::HalfLineExpDecay(C::Real::from_f64(0.0, wp)),
        prec,
    )
}

/// The double path of [`malmsten_integral`]: with no guard bits to spare,
/// the cancellation is removed algebraically instead. Since the power sums
/// `Σ n_j c_j^m` vanish for m ≤ 2, `Σ n_j e^{−c_j t} = Σ n_j R₃(c_j t)` with
/// `R₃(x) = e^{−x} − 1 + x − x²/2 = O(x³)`, each term already of the size of
/// the total; `R₃` comes from its Taylor series while `t·max|c_j| ≤ 6`, and
/// beyond that the plain exponentials are summed (the cancellation is over);
/// `1 − e^{−at}` comes from `expm1`.
fn malmsten_integral_double<C: ComplexField>(
    exps: &[(C, i64)],
    a: f64,
    prec: Prec,
) -> Result<Approx<C>> {
    use num_complex::Complex64;
    let cs: Vec<(Complex64, f64)> = exps
        .iter()
        .map(|(c, n)| (Complex64::new(c.re_f64(), c.im_f64()), *n as f64))
        .collect();
    let c_max = cs.iter().map(|(c, _)| c.norm()).fold(0.0f64, f64::max);
    // R₃(x) = Σ_{m≥3} (−x)^m/m! = (−x)³/6 · (1 + (−x)/4 (1 + (−x)/5 (1 + …))),
    // 44 terms: enough for |x| ≤ 6 to 2^−56.
    let r3 = |x: Complex64| -> Complex64 {
        let mut acc = Complex64::new(1.0, 0.0);
        for m in (4..=46).rev() {
            acc = Complex64::new(1.0, 0.0) + acc * (-x) / m as f64;
        }
        acc * (-x * x * x) / 6.0
    };
    let f = |t: &C::Real| -> C {
        let t = t.to_f64();
        let mut num = Complex64::new(0.0, 0.0);
        if t * c_max <= 6.0 {
            // Small t: every term of the remainder form is O(t³) by itself.
            for (c, n) in &cs {
                num += r3(c * t) * *n;
            }
        } else {
            // Large t: the exponentials themselves (their polynomial parts sum
            // to zero exactly, and the cancellation is over by now).
            for (c, n) in &cs {
                num += (-c * t).exp() * *n;
            }
        }
        let den = t * (-(-a * t).exp_m1()) * (-(-t).exp_m1());
        let v = num / den;
        C::from_f64(v.re, v.im, 53)
    };
    // 2^-50 in log F: a relative 1e-15 in F, the double path's accuracy.
    let _ = prec;
    default_rule()
        .with_abs_tol(Radius::from_log2(-50.0))
        .integrate(
            f,
            &Domain::HalfLineExpDecay(C::Real::from_f64(0.0, 53)),
            prec,
        )
}

/// The first `len` coefficients of `scale · Σ_i σ^i B_i (step·t)^i / i!`:
/// with `σ = +1` that is `scale · (step t)/(e^{step t} − 1)`, with `σ = −1`
/// `scale · (step t)/(1 − e^{−step t})` (DLMF 24.2.1).
fn bernoulli_series<R: RealField>(
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
struct Accumulator<C: ComplexField> {
    sum: C,
    comp: (f64, f64),
    double: bool,
}

impl<C: ComplexField> Accumulator<C> {
    fn new(wp: u32) -> Self {
        Accumulator {
            sum: C::from_i64(0, wp),
            comp: (0.0, 0.0),
            double: C::MAX_PREC.is_some(),
        }
    }

    fn add(&mut self, x: C) {
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

    fn total(self) -> C {
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

/// Whether `w` is a pole of Γ up to the rounding of its computation: within
/// `2^(8−wp)` of a non-positive integer, relative to the size `scale` of the
/// pieces `w` was summed from. Nearer than that, but not that near, log Γ
/// itself is accurate and no pole is reported.
fn near_gamma_pole<C: ComplexField>(w: &C, scale: f64, wp: u32) -> bool {
    let x = w.re_f64();
    if x > 0.5 {
        return false;
    }
    let m = x.round();
    let d = w.clone().add_real(&C::Real::from_f64(-m, wp)).log2_abs();
    d < scale.max(1.0).log2() - wp as f64 + 8.0
}

/// The convergence conditions (module docs; docs/math.md §2).
fn analyse(terms: &[GammaTerm], normalised: bool) -> Convergence {
    let p = ANALYSIS_BITS;
    let half = Float::with_val(p, 0.5);
    let ln_2pi = Float::with_val(p, Float::with_val(p, Constant::Pi) * 2u32).ln();
    let vals: Vec<(Float, Float, Float, i64)> = terms
        .iter()
        .map(|t| {
            (
                t.step.value(p),
                t.offset.value(p),
                t.slope.value(p),
                t.power,
            )
        })
        .collect();
    let first_a = &vals[0].0;
    let common_step = vals.iter().all(|(a, ..)| {
        let d = Float::with_val(p, a - first_a).abs();
        d <= Float::with_val(p, first_a.clone().abs() >> 200u32)
    });
    type F = fn(&Float, &Float, &Float, &Float, &Float) -> Float;
    // (formula, meaning, only unnormalised, summand(a, b, s, ½, ln2π) · n)
    let specs: Vec<(&'static str, &'static str, bool, F)> = vec![
        (
            "Σ n·a = 0",
            "the k-th factor grows like k ln k",
            true,
            |a, _, _, _, _| a.clone(),
        ),
        (
            "Σ n·a·ln a = 0",
            "the k-th factor grows like k",
            true,
            |a, _, _, _, _| Float::with_val(a.prec(), a * Float::with_val(a.prec(), a.ln_ref())),
        ),
        (
            "Σ n·(b − ½) = 0",
            "the k-th factor grows like ln k",
            true,
            |_, b, _, h, _| Float::with_val(b.prec(), b - h),
        ),
        (
            "Σ n·s = 0",
            "the k-th factor grows like ln k, with a slope in z",
            false,
            |_, _, s, _, _| s.clone(),
        ),
        (
            "Σ n·((b − ½)·ln a + ½·ln 2π) = 0",
            "the k-th factor tends to a constant ≠ 0",
            true,
            |a, b, _, h, l| {
                let p = a.prec();
                Float::with_val(
                    p,
                    Float::with_val(p, b - h) * Float::with_val(p, a.ln_ref()),
                ) + Float::with_val(p, l * h)
            },
        ),
        (
            "Σ n·s·ln a = 0",
            "the k-th factor tends to a z-dependent constant",
            false,
            |a, _, s, _, _| Float::with_val(a.prec(), s * Float::with_val(a.prec(), a.ln_ref())),
        ),
        (
            "Σ n·B₂(b)/a = 0",
            "the k-th factor falls only like 1/k (the product diverges logarithmically)",
            true,
            |a, b, _, _, _| {
                let p = a.prec();
                let b2 = Float::with_val(p, b * b) - b + Float::with_val(p, 1) / 6u32;
                b2 / a
            },
        ),
        (
            "Σ n·s²/a = 0",
            "the k-th factor falls only like z²/k",
            false,
            |a, _, s, _, _| Float::with_val(a.prec(), s * s) / a,
        ),
        (
            "Σ n·s·(2b − 1)/a = 0",
            "the k-th factor falls only like z/k",
            false,
            |a, b, s, _, _| {
                let p = a.prec();
                Float::with_val(p, s * (Float::with_val(p, b * 2u32) - 1u32)) / a
            },
        ),
    ];
    let mut conditions = Vec::new();
    for (formula, meaning, only_unnorm, f) in specs {
        if only_unnorm && normalised {
            continue;
        }
        let mut sum = Float::with_val(p, 0);
        let mut scale = Float::with_val(p, 1);
        for (a, b, s, n) in &vals {
            let v = f(a, b, s, &half, &ln_2pi) * *n;
            scale = scale.max(&Float::with_val(p, v.clone().abs()));
            sum += v;
        }
        let tol = scale >> 180u32;
        let numeric = Float::with_val(p, sum.clone().abs()) <= tol;
        let exact = exact_condition(formula, terms);
        conditions.push(Condition {
            formula,
            meaning,
            value: sum.to_f64(),
            holds: exact.unwrap_or(numeric),
            exact: exact.is_some(),
        });
    }
    Convergence {
        conditions,
        common_step,
    }
}

/// Exact decision of a convergence condition when every coefficient is
/// rational; `None` where a coefficient is not, or where the logarithms of
/// the steps cannot be split over a coprime integer base.
///
/// A condition is `r₀ + Σ_q r_q ln q + r_π ln π` over a base of pairwise
/// coprime integers `q`; it vanishes iff every coefficient does, since logs of
/// pairwise coprime integers > 1 are linearly independent over Q and π is
/// transcendental (common practice).
fn exact_condition(formula: &str, terms: &[GammaTerm]) -> Option<bool> {
    use rug::Rational;
    let mut vals = Vec::with_capacity(terms.len());
    for t in terms {
        vals.push((
            t.step.exact()?.clone(),
            t.offset.exact()?.clone(),
            t.slope.exact()?.clone(),
            Rational::from(t.power),
        ));
    }
    let half = Rational::from((1, 2));
    let steps: Vec<Rational> = vals.iter().map(|v| v.0.clone()).collect();
    let base = coprime_base(&steps)?;
    // ln a = Σ_q e_q(a) ln q
    let exps = |a: &Rational| -> Vec<i64> {
        base.iter()
            .map(|q| valuation(a.numer(), q) - valuation(a.denom(), q))
            .collect()
    };
    // Every step must factor completely over the base, or no exact decision.
    for a in &steps {
        let e = exps(a);
        let mut num = Integer::from(1);
        let mut den = Integer::from(1);
        for (q, k) in base.iter().zip(&e) {
            let pw = rug::ops::Pow::pow(q.clone(), k.unsigned_abs() as u32);
            if *k > 0 {
                num *= pw;
            } else if *k < 0 {
                den *= pw;
            }
        }
        if Rational::from((num, den)) != a.clone().abs() {
            return None;
        }
    }
    let mut r0 = Rational::new();
    let mut logs = vec![Rational::new(); base.len()];
    let mut ln_pi = Rational::new();
    let mut ln2 = Rational::new();
    for (a, b, s, n) in &vals {
        let add_log = |logs: &mut Vec<Rational>, c: Rational| {
            for (slot, e) in logs.iter_mut().zip(exps(a)) {
                *slot += c.clone() * Rational::from(e);
            }
        };
        match formula {
            "Σ n·a = 0" => r0 += n.clone() * a,
            "Σ n·a·ln a = 0" => add_log(&mut logs, n.clone() * a),
            "Σ n·(b − ½) = 0" => r0 += n.clone() * (b.clone() - &half),
            "Σ n·s = 0" => r0 += n.clone() * s,
            "Σ n·((b − ½)·ln a + ½·ln 2π) = 0" => {
                add_log(&mut logs, n.clone() * (b.clone() - &half));
                ln2 += n.clone() * &half;
                ln_pi += n.clone() * &half;
            }
            "Σ n·s·ln a = 0" => add_log(&mut logs, n.clone() * s),
            "Σ n·B₂(b)/a = 0" => {
                let b2 = b.clone() * b - b + Rational::from((1, 6));
                r0 += n.clone() * b2 / a;
            }
            "Σ n·s²/a = 0" => r0 += n.clone() * s * s / a,
            "Σ n·s·(2b − 1)/a = 0" => {
                r0 += n.clone() * s * (b.clone() * 2u32 - 1u32) / a;
            }
            _ => return None,
        }
    }
    // ln 2 from ln 2π joins the base coefficient of the base element dividing 2.
    if ln2 != 0 {
        match base.iter().position(|q| q.is_divisible_u(2)) {
            Some(i) if base[i] == 2 => logs[i] += &ln2,
            Some(_) => return None,
            None => {
                if ln2 != 0 {
                    return Some(false);
                }
            }
        }
    }
    Some(r0 == 0 && ln_pi == 0 && logs.iter().all(|c| *c == 0))
}

/// A base of pairwise coprime integers > 1 in which every numerator and
/// denominator of `xs` factors (gcd refinement, no factoring needed).
fn coprime_base(xs: &[rug::Rational]) -> Option<Vec<Integer>> {
    let mut base: Vec<Integer> = Vec::new();
    let mut work: Vec<Integer> = xs
        .iter()
        .flat_map(|q| [q.numer().clone().abs(), q.denom().clone()])
        .filter(|x| *x > 1)
        .collect();
    let mut guard = 0;
    while let Some(mut x) = work.pop() {
        guard += 1;
        if guard > 10_000 {
            return None;
        }
        let mut i = 0;
        while i < base.len() && x > 1 {
            let g = Integer::from(x.gcd_ref(&base[i]));
            if g > 1 {
                let b = base.swap_remove(i);
                // split b and x by g; push the parts back for refinement
                let bq = Integer::from(&b / &g);
                x /= &g;
                work.push(g);
                if bq > 1 {
                    work.push(bq);
                }
                i = 0;
                continue;
            }
            i += 1;
        }
        if x > 1 {
            if base.contains(&x) {
                continue;
            }
            base.push(x);
        }
    }
    base.sort();
    base.dedup();
    // pairwise coprime check
    for i in 0..base.len() {
        for j in i + 1..base.len() {
            if Integer::from(base[i].gcd_ref(&base[j])) != 1 {
                return None;
            }
        }
    }
    Some(base)
}

/// The exponent of `q` in `x` where `q` is a base element (so `x` is a
/// product of powers of base elements times a unit).
fn valuation(x: &Integer, q: &Integer) -> i64 {
    let mut x = x.clone().abs();
    let mut e = 0;
    while x > 0 && x.is_divisible(q) {
        x /= q;
        e += 1;
    }
    e
}
