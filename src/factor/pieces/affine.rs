//! Finite products of gamma and Barnes G functions of affine arguments
//! `w_j = b_j + s_j z`, with `z` a fixed multiple of θ ([`Scale`]).

use super::{
    affine_text, at_theta, check_coef, check_power, log2_add, power_suffix, refine, singular,
};
use crate::error::{Error, Result};
use crate::factor::{Coef, Scale};
use crate::num::{ComplexField, RealField};
use crate::precision::{Approx, Prec, Radius};
use crate::special::{
    check_arg, digamma, log_barnes_g, log_barnes_g_f64_absolute, log_gamma, trigamma_bound_log2,
};
use num_complex::Complex64;
use rug::Float;
use std::collections::HashMap;
use std::f64::consts::{LN_2, PI};
use std::fmt;
use std::sync::{Arc, RwLock};

/// Left of this real part log G is refused (`special::barnes::MIN_REAL_PART`),
/// so no zero of G is looked for there.
const BARNES_MIN_RE: f64 = -1.0e5;

#[derive(Clone, Copy, Debug, PartialEq, Eq)]
enum Kind {
    Gamma,
    Barnes,
}

impl Kind {
    fn symbol(self) -> &'static str {
        match self {
            Kind::Gamma => "Γ",
            Kind::Barnes => "G",
        }
    }
    fn name(self) -> &'static str {
        match self {
            Kind::Gamma => "FiniteGamma",
            Kind::Barnes => "BarnesFactor",
        }
    }
    fn new_name(self) -> &'static str {
        match self {
            Kind::Gamma => "FiniteGamma::new",
            Kind::Barnes => "BarnesFactor::new",
        }
    }
    fn derivative_name(self) -> &'static str {
        match self {
            Kind::Gamma => "FiniteGamma::log_derivative",
            Kind::Barnes => "BarnesFactor::log_derivative",
        }
    }
    fn log_name(self) -> &'static str {
        match self {
            Kind::Gamma => "FiniteGamma::log_value",
            Kind::Barnes => "BarnesFactor::log_value",
        }
    }
}

/// One argument `w = b + s z` of an affine product at a point.
struct Arg<C: ComplexField> {
    w: C,
    n: i64,
    slope: C::Real,
    /// log2 of the size of the terms w was summed from.
    size_l2: f64,
    /// log2 of the distance to the nearest non-positive integer.
    dist_l2: f64,
}

/// (offset, slope) of every term at one working precision.
type Coeffs = Arc<Vec<(Float, Float)>>;

/// The shared implementation: `Π_j F(b_j + s_j z)^{n_j}` with F = Γ or G.
struct Affine {
    kind: Kind,
    terms: Vec<(Coef, Coef, i64)>,
    scale: Scale,
    cache: RwLock<HashMap<u32, Coeffs>>,
}

impl Clone for Affine {
    fn clone(&self) -> Self {
        Affine {
            kind: self.kind,
            terms: self.terms.clone(),
            scale: self.scale,
            cache: RwLock::new(HashMap::new()),
        }
    }
}

impl fmt::Debug for Affine {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.debug_struct(self.kind.name())
            .field("terms", &self.terms)
            .field("scale", &self.scale)
            .finish()
    }
}

impl fmt::Display for Affine {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        for (i, (b, s, n)) in self.terms.iter().enumerate() {
            if i > 0 {
                f.write_str(" · ")?;
            }
            write!(
                f,
                "{}({}){}",
                self.kind.symbol(),
                affine_text(b, s, "z"),
                power_suffix(*n)
            )?;
        }
        Ok(())
    }
}

/// How z is written in terms of θ.
fn scale_text(scale: Scale) -> &'static str {
    match scale {
        Scale::Unit => "θ",
        Scale::OverIPi => "θ/(iπ)",
        Scale::Over2PiI => "θ/(2πi)",
    }
}

impl Affine {
    fn new(kind: Kind, terms: Vec<(Coef, Coef, i64)>, scale: Scale) -> Result<Affine> {
        let function = kind.new_name();
        if terms.is_empty() {
            return Err(Error::Domain {
                function,
                message: format!(
                    "a {} needs at least one term (offset, slope, power)",
                    kind.name()
                ),
            });
        }
        for (i, (b, s, n)) in terms.iter().enumerate() {
            check_coef(function, "offset", b)?;
            check_coef(function, "slope", s)?;
            let what = format!(
                "term {} ({}({}))",
                i + 1,
                kind.symbol(),
                affine_text(b, s, "z")
            );
            check_power(function, &what, *n)?;
        }
        Ok(Affine {
            kind,
            terms,
            scale,
            cache: RwLock::new(HashMap::new()),
        })
    }

    fn describe(&self) -> String {
        format!("{self}, z = {}", scale_text(self.scale))
    }

    fn coeffs_at(&self, wp: u32) -> Coeffs {
        if let Some(c) = self.cache.read().expect("poisoned").get(&wp) {
            return Arc::clone(c);
        }
        let v: Vec<_> = self
            .terms
            .iter()
            .map(|(b, s, _)| (b.value(wp), s.value(wp)))
            .collect();
        let v = Arc::new(v);
        self.cache
            .write()
            .expect("poisoned")
            .insert(wp, Arc::clone(&v));
        v
    }

    fn log_value<C: ComplexField>(&self, theta: &C, prec: Prec) -> Result<Approx<C>> {
        check_arg(self.kind.log_name(), "theta", theta, prec)?;
        refine(prec, theta, |wp, tol_wp| self.eval(theta, prec, wp, tol_wp))
    }

    /// The arguments `w_j = b_j + s_j z` at `wp` bits with their powers
    /// and sizes; the singular-point error if some `w_j` is within the
    /// resolution of `tol_wp` bits of a pole or zero.
    fn arguments<C: ComplexField>(&self, theta: &C, wp: u32, tol_wp: u32) -> Result<Vec<Arg<C>>> {
        let th = theta.with_prec(wp);
        let z = self.scale.z_of(&th);
        let coeffs = self.coeffs_at(wp);
        let mut order = 0i64;
        let mut at_singular = false;
        let mut args = Vec::with_capacity(self.terms.len());
        for ((_, _, n), (b, s)) in self.terms.iter().zip(coeffs.iter()) {
            let (b, s) = (C::Real::from_float(b), C::Real::from_float(s));
            let sz = z.clone().mul_real(&s);
            let size_l2 = sz.log2_abs().max(b.log2_abs()) + 1.0;
            let w = sz.add_real(&b);
            let x = w.re_f64();
            let mut dist_l2 = f64::INFINITY;
            if x <= 0.5 && !(self.kind == Kind::Barnes && x < BARNES_MIN_RE) {
                let m = x.round().min(0.0);
                dist_l2 = w.clone().add_real(&C::Real::from_f64(-m, wp)).log2_abs();
                if dist_l2 < size_l2.max(0.0) - tol_wp as f64 + 8.0 {
                    // Γ has a simple pole at −m, G a zero of order 1 − m.
                    let pole = match self.kind {
                        Kind::Gamma => 1i64,
                        Kind::Barnes => -(1 - m as i64),
                    };
                    at_singular = true;
                    order = order.saturating_add(pole.saturating_mul(*n));
                    continue;
                }
            }
            args.push(Arg {
                w,
                n: *n,
                slope: s,
                size_l2,
                dist_l2,
            });
        }
        if at_singular {
            return Err(singular(self.kind.name(), order, at_theta(theta)));
        }
        Ok(args)
    }

    /// The precision of the special-function calls at `wp` bits.
    fn inner(prec: Prec, wp: u32, double: bool) -> Result<Prec> {
        if double {
            Ok(prec)
        } else {
            Prec::from_bits(wp.min(Prec::MAX_BITS) as u64)
        }
    }

    /// One evaluation at `wp` bits; singular points detected at `tol_wp`.
    fn eval<C: ComplexField>(
        &self,
        theta: &C,
        prec: Prec,
        wp: u32,
        tol_wp: u32,
    ) -> Result<(C, Radius)> {
        let args = self.arguments(theta, wp, tol_wp)?;
        let inner = Self::inner(prec, wp, C::MAX_PREC.is_some())?;
        let mut sum = C::from_i64(0, wp);
        let mut abs_sum = Radius::ZERO;
        let mut rad = Radius::ZERO;
        for Arg {
            w,
            n,
            size_l2,
            dist_l2,
            ..
        } in &args
        {
            let l = match self.kind {
                Kind::Gamma => log_gamma(w, inner),
                // The piece needs log G to an absolute accuracy only.
                Kind::Barnes if C::MAX_PREC.is_some() => {
                    match log_barnes_g_f64_absolute(Complex64::new(w.re_f64(), w.im_f64())) {
                        Some((v, e)) => Ok(Approx::new(
                            C::from_f64(v.re, v.im, 53),
                            Radius::from_f64(e),
                            53,
                        )),
                        None => log_barnes_g(w, inner),
                    }
                }
                Kind::Barnes => log_barnes_g(w, inner),
            }
            .map_err(|e| self.rename(e, theta))?;
            let n_abs = n.unsigned_abs() as f64;
            rad += l.radius.times(n_abs);
            // The rounding of w (θ to wp bits, z from θ, s·z + b): at most
            // about 6·2^−wp of the terms, through the derivative of log F.
            let deriv_l2 = match self.kind {
                Kind::Gamma => psi_bound_log2(w, *dist_l2),
                Kind::Barnes => {
                    let lw = w.log2_abs().max(0.0) + 1.0;
                    log2_add(lw + psi_bound_log2(w, *dist_l2), lw + 1.0)
                }
            };
            rad += Radius::from_log2(size_l2 + 2.6 - wp as f64 + deriv_l2 + n_abs.log2());
            let t = l.value.mul_i64(*n);
            abs_sum += Radius::from_log2(t.log2_abs());
            sum += &t;
        }
        // Rounding of the products n·log F and of the sum.
        rad += Radius::from_log2(abs_sum.log2() - wp as f64 + ((args.len() + 2) as f64).log2());
        Ok((sum, rad))
    }

    fn log_derivative<C: ComplexField>(&self, theta: &C, prec: Prec) -> Result<Approx<C>> {
        check_arg(self.kind.derivative_name(), "theta", theta, prec)?;
        refine(prec, theta, |wp, tol_wp| {
            self.derivative(theta, prec, wp, tol_wp)
        })
    }

    /// `d/dθ Σ_j n_j log F(w_j) = dz/dθ · Σ_j n_j s_j (log F)'(w_j)` at `wp`
    /// bits, with `(log Γ)' = ψ` and `(log G)'(w) = (w − 1)ψ(w) − w +
    /// (1 + ln 2π)/2`.
    fn derivative<C: ComplexField>(
        &self,
        theta: &C,
        prec: Prec,
        wp: u32,
        tol_wp: u32,
    ) -> Result<(C, Radius)> {
        let args = self.arguments(theta, wp, tol_wp)?;
        let inner = Self::inner(prec, wp, C::MAX_PREC.is_some())?;
        let w_l2 = -(wp as f64);
        // (1 + ln 2π)/2
        let c_g = (C::Real::pi(wp).mul_i64(2).ln() + &C::Real::from_f64(1.0, wp)).mul_pow2(-1);
        let mut sum = C::from_i64(0, wp);
        let mut abs_sum = Radius::ZERO;
        let mut rad = Radius::ZERO;
        for Arg {
            w,
            n,
            slope,
            size_l2,
            ..
        } in &args
        {
            let psi = digamma(w, inner).map_err(|e| self.rename(e, theta))?;
            let trigamma_l2 = trigamma_bound_log2(w);
            let (d, d_rad, d_prime_l2) = match self.kind {
                Kind::Gamma => (psi.value, psi.radius, trigamma_l2),
                Kind::Barnes => {
                    let w_m1 = w.clone().add_i64(-1);
                    let wm1_l2 = w_m1.log2_abs();
                    let prod = w_m1 * &psi.value;
                    let r = psi.radius.scale_log2(wm1_l2)
                        + Radius::from_log2(log2_add(prod.log2_abs(), w.log2_abs()) + 2.0 + w_l2);
                    let d = prod - w + &C::from_reals(c_g.clone(), C::Real::from_f64(0.0, wp));
                    // (log G)'' = ψ + (w − 1)ψ' − 1
                    let dp = log2_add(log2_add(psi.value.log2_abs(), wm1_l2 + trigamma_l2), 0.0);
                    (d, r, dp)
                }
            };
            let ns = slope.clone().mul_i64(*n);
            let ns_l2 = ns.log2_abs();
            rad += d_rad.scale_log2(ns_l2);
            rad += Radius::from_log2(size_l2 + 2.6 + w_l2 + d_prime_l2 + ns_l2);
            let t = d.mul_real(&ns);
            abs_sum += Radius::from_log2(t.log2_abs());
            sum += &t;
        }
        rad += Radius::from_log2(abs_sum.log2() + w_l2 + ((args.len() + 2) as f64).log2());
        let dz: C = self.scale.dz_dtheta(wp);
        Ok((sum * &dz, rad.scale_log2(dz.log2_abs())))
    }

    fn rename<C: ComplexField>(&self, e: Error, theta: &C) -> Error {
        match e {
            Error::Pole { order, .. } => Error::Pole {
                function: self.kind.name(),
                order,
                at: at_theta(theta),
            },
            Error::Zero { order, .. } => Error::Zero {
                function: self.kind.name(),
                order,
                at: at_theta(theta),
            },
            other => other,
        }
    }
}

/// `log2` of an estimated bound on `|ψ(w)|` (for error propagation only):
/// `|ψ(w)| ≤ ln(|w| + 2) + π + 2` for `Re w ≥ ½` (DLMF 5.11.2 with its
/// remainder), and the reflection `ψ(w) = ψ(1 − w) − π cot(πw)` (DLMF 5.5.4)
/// otherwise, with `|cot(πw)| ≈ 1/(π·dist)` near a pole at distance `dist`.
fn psi_bound_log2<C: ComplexField>(w: &C, dist_l2: f64) -> f64 {
    let (x, y) = (w.re_f64(), w.im_f64());
    let lw = w.log2_abs().max(0.0);
    let right = |l2: f64| (l2 * LN_2 + 3f64.ln() + PI + 2.0).log2();
    if x >= 0.5 {
        return right(lw);
    }
    let cot_l2 = if dist_l2 < -3.0 {
        -dist_l2 - PI.log2() + 0.5
    } else if y.abs() > 4.0 {
        0.1
    } else {
        let u = Complex64::new(PI * (x - x.round()), PI * y);
        (u.cos().norm() / u.sin().norm()).log2() + 0.1
    };
    log2_add(right(lw + 1.0), PI.log2() + cot_l2)
}

/// A finite product of gamma functions `Π_j Γ(b_j + s_j z)^{n_j}`, with real
/// offsets `b_j` and slopes `s_j` ([`Coef`]), non-zero integer powers `n_j`
/// and `z` a fixed multiple of the rapidity θ ([`Scale`]).
///
/// Its logarithm is the sum of principal log-gammas `Σ_j n_j log Γ(w_j)`
/// ([`log_gamma`](crate::special::log_gamma), analytic on `C \ (−∞, 0]`); the
/// caller fixes branches by path continuation. At a point where some `w_j`
/// are poles of Γ the orders `n_j` are summed over those factors: a pole,
/// a zero, or (total 0) a removable point reported as [`Error::Domain`].
/// The radius covers the factors' radii, the rounding of each `w_j`
/// propagated through `ψ(w_j)`, and the rounding of the sum; on the
/// arbitrary path the working precision is raised until it is below
/// `2^−(prec+4)` of the result.
///
/// ```
/// use dressing::factor::{Coef, FiniteGamma, Scale};
/// use dressing::Prec;
/// use num_complex::Complex64;
/// // Γ(1/2 + z) Γ(1/2 − z) = π / cos πz  (DLMF 5.5.3), z = θ
/// let half = Coef::rational(1, 2);
/// let f = FiniteGamma::new(
///     vec![(half.clone(), Coef::integer(1), 1), (half, Coef::integer(-1), 1)],
///     Scale::Unit,
/// ).unwrap();
/// assert_eq!(f.to_string(), "Γ(1/2 + z) · Γ(1/2 − z)");
/// let z = Complex64::new(0.25, 0.0);
/// let r = f.log_value(&z, Prec::DOUBLE).unwrap();
/// let want = (std::f64::consts::PI / (std::f64::consts::PI * 0.25).cos()).ln();
/// assert!((r.value.re - want).abs() <= r.radius.to_f64() + 1e-15);
/// ```
#[derive(Clone, Debug)]
pub struct FiniteGamma(Affine);

impl FiniteGamma {
    /// `Π_j Γ(b_j + s_j z)^{n_j}` from terms `(b_j, s_j, n_j)`.
    ///
    /// Errors: [`Error::Domain`] for no terms, a power 0 or a power above
    /// 2^20 in size; [`Error::NonFinite`] for an offset or slope that is NaN
    /// or infinite.
    ///
    /// ```
    /// use dressing::factor::{Coef, FiniteGamma, Scale};
    /// let f = FiniteGamma::new(vec![(Coef::integer(1), Coef::integer(-1), -1)], Scale::OverIPi);
    /// assert_eq!(f.unwrap().describe(), "Γ(1 − z)^-1, z = θ/(iπ)");
    /// assert!(FiniteGamma::new(vec![], Scale::Unit).is_err());
    /// assert!(FiniteGamma::new(vec![(Coef::integer(1), Coef::integer(1), 0)], Scale::Unit).is_err());
    /// ```
    pub fn new(terms: Vec<(Coef, Coef, i64)>, scale: Scale) -> Result<FiniteGamma> {
        Affine::new(Kind::Gamma, terms, scale).map(FiniteGamma)
    }

    /// The terms `(offset, slope, power)`.
    ///
    /// ```
    /// use dressing::factor::{Coef, FiniteGamma, Scale};
    /// let f = FiniteGamma::new(vec![(Coef::integer(0), Coef::integer(1), 2)], Scale::Unit).unwrap();
    /// assert_eq!(f.terms()[0].2, 2);
    /// ```
    pub fn terms(&self) -> &[(Coef, Coef, i64)] {
        &self.0.terms
    }

    /// How z depends on θ.
    ///
    /// ```
    /// use dressing::factor::{Coef, FiniteGamma, Scale};
    /// let f = FiniteGamma::new(vec![(Coef::integer(0), Coef::integer(1), 1)], Scale::Over2PiI).unwrap();
    /// assert_eq!(f.scale(), Scale::Over2PiI);
    /// ```
    pub fn scale(&self) -> Scale {
        self.0.scale
    }

    /// `Σ_j n_j log Γ(b_j + s_j z(θ))` at `prec`: the sum of principal
    /// log-gammas (the caller fixes branches by path continuation), with an
    /// estimate of its absolute error.
    ///
    /// Errors: [`Error::Pole`] / [`Error::Zero`] where some `w_j` is a
    /// non-positive integer, with the orders `n_j` summed over the factors
    /// there; [`Error::Domain`] where they cancel (a removable point);
    /// [`Error::NonFinite`]; [`Error::DoubleTooPrecise`] for more than 53 bits
    /// on `Complex64`; [`Error::Overflow`] where log Γ leaves the double range.
    ///
    /// ```
    /// use dressing::factor::{Coef, FiniteGamma, Scale};
    /// use dressing::{Error, Prec};
    /// let g = FiniteGamma::new(vec![(Coef::integer(0), Coef::integer(1), 1)], Scale::Unit).unwrap();
    /// // log Γ(5) = ln 24 at 40 digits
    /// let r = g.log_value(&rug::Complex::with_val(200, 5), Prec::digits(40).unwrap()).unwrap();
    /// let want = rug::Float::with_val(200, 24).ln();
    /// assert!((r.value.real().clone() - want).abs() < 1e-39);
    /// // Γ(z) has a simple pole at z = −3
    /// let e = g.log_value(&num_complex::Complex64::new(-3.0, 0.0), Prec::DOUBLE);
    /// assert!(matches!(e, Err(Error::Pole { order: 1, .. })));
    /// ```
    pub fn log_value<C: ComplexField>(&self, theta: &C, prec: Prec) -> Result<Approx<C>> {
        self.0.log_value(theta, prec)
    }

    /// `d/dθ Σ_j n_j log Γ(w_j) = dz/dθ · Σ_j n_j s_j ψ(w_j)` at `prec`, with
    /// an estimate of its absolute error (the ψ radii, the rounding of each
    /// `w_j` through a bound on ψ', the rounding of the sum).
    ///
    /// Errors: as [`FiniteGamma::log_value`] (the derivative of the
    /// logarithm has a simple pole at every pole or zero of the product).
    ///
    /// ```
    /// use dressing::factor::{Coef, FiniteGamma, Scale};
    /// use dressing::{special::digamma, Prec};
    /// use num_complex::Complex64;
    /// // d/dθ log Γ(1 − 2θ) = −2ψ(1 − 2θ)
    /// let g = FiniteGamma::new(vec![(Coef::integer(1), Coef::integer(-2), 1)], Scale::Unit).unwrap();
    /// let th = Complex64::new(0.3, 0.4);
    /// let d = g.log_derivative(&th, Prec::DOUBLE).unwrap();
    /// let want = -2.0 * digamma(&(1.0 - 2.0 * th), Prec::DOUBLE).unwrap().value;
    /// assert!((d.value - want).norm() <= d.radius.to_f64() + 1e-15);
    /// ```
    pub fn log_derivative<C: ComplexField>(&self, theta: &C, prec: Prec) -> Result<Approx<C>> {
        self.0.log_derivative(theta, prec)
    }

    /// The product as a formula with the definition of z, for reports.
    ///
    /// ```
    /// use dressing::factor::{Coef, FiniteGamma, Scale};
    /// let f = FiniteGamma::new(
    ///     vec![(Coef::rational(1, 2), Coef::integer(1), 2), (Coef::integer(1), Coef::rational(-2, 3), -1)],
    ///     Scale::Unit,
    /// ).unwrap();
    /// assert_eq!(f.describe(), "Γ(1/2 + z)^2 · Γ(1 − 2z/3)^-1, z = θ");
    /// ```
    pub fn describe(&self) -> String {
        self.0.describe()
    }
}

/// The product as a formula in z, e.g. `Γ(1/2 + z)^2 · Γ(1 − z)^-1`.
///
/// ```
/// use dressing::factor::{Coef, FiniteGamma, Scale};
/// let f = FiniteGamma::new(vec![(Coef::integer(0), Coef::integer(-1), 1)], Scale::Unit).unwrap();
/// assert_eq!(format!("{f}"), "Γ(−z)");
/// ```
impl fmt::Display for FiniteGamma {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        fmt::Display::fmt(&self.0, f)
    }
}

/// A finite product of Barnes G functions `Π_j G(b_j + s_j z)^{n_j}`, with
/// real offsets and slopes ([`Coef`]), non-zero integer powers and `z` a
/// fixed multiple of θ ([`Scale`]).
///
/// Its logarithm is `Σ_j n_j log G(w_j)` with the log G of
/// [`log_barnes_g`](crate::special::log_barnes_g) (continuous on
/// `C \ (−∞, 0]`, real for `w > 0`). G is entire, with a zero of order
/// `m + 1` at `w = −m`; as a factor with power `n` that is a zero of order
/// `n(m + 1)` (a pole for `n < 0`).
///
/// ```
/// use dressing::factor::{BarnesFactor, Coef, Scale};
/// use dressing::{special::log_gamma, Prec};
/// // G(1 + z)/G(z) = Γ(z)  (DLMF 5.17.1)
/// let f = BarnesFactor::new(
///     vec![(Coef::integer(1), Coef::integer(1), 1), (Coef::integer(0), Coef::integer(1), -1)],
///     Scale::Unit,
/// ).unwrap();
/// let z = rug::Complex::with_val(200, (0.7, 2.5));
/// let p = Prec::digits(40).unwrap();
/// let a = f.log_value(&z, p).unwrap();
/// let b = log_gamma(&z, p).unwrap();
/// let d = rug::Complex::with_val(200, &a.value - &b.value);
/// assert!(d.abs().real().to_f64() < 1e-38);
/// ```
#[derive(Clone, Debug)]
pub struct BarnesFactor(Affine);

impl BarnesFactor {
    /// `Π_j G(b_j + s_j z)^{n_j}` from terms `(b_j, s_j, n_j)`.
    ///
    /// Errors: as [`FiniteGamma::new`].
    ///
    /// ```
    /// use dressing::factor::{BarnesFactor, Coef, Scale};
    /// let f = BarnesFactor::new(vec![(Coef::rational(3, 2), Coef::integer(-1), 2)], Scale::OverIPi).unwrap();
    /// assert_eq!(f.to_string(), "G(3/2 − z)^2");
    /// ```
    pub fn new(terms: Vec<(Coef, Coef, i64)>, scale: Scale) -> Result<BarnesFactor> {
        Affine::new(Kind::Barnes, terms, scale).map(BarnesFactor)
    }

    /// The terms `(offset, slope, power)`.
    ///
    /// ```
    /// use dressing::factor::{BarnesFactor, Coef, Scale};
    /// let f = BarnesFactor::new(vec![(Coef::integer(2), Coef::integer(1), -1)], Scale::Unit).unwrap();
    /// assert_eq!(f.terms().len(), 1);
    /// ```
    pub fn terms(&self) -> &[(Coef, Coef, i64)] {
        &self.0.terms
    }

    /// How z depends on θ.
    ///
    /// ```
    /// use dressing::factor::{BarnesFactor, Coef, Scale};
    /// let f = BarnesFactor::new(vec![(Coef::integer(2), Coef::integer(1), 1)], Scale::Unit).unwrap();
    /// assert_eq!(f.scale(), Scale::Unit);
    /// ```
    pub fn scale(&self) -> Scale {
        self.0.scale
    }

    /// `Σ_j n_j log G(b_j + s_j z(θ))` at `prec`, with an estimate of its
    /// absolute error; each log G on the branch of
    /// [`log_barnes_g`](crate::special::log_barnes_g) (the caller fixes
    /// branches by path continuation).
    ///
    /// Errors: [`Error::Zero`] / [`Error::Pole`] where some `w_j = −m` is a
    /// zero of G, orders `n_j (m + 1)` summed over the factors there;
    /// [`Error::Domain`] where they cancel, and left of `Re w = −10^5`;
    /// [`Error::NonFinite`]; [`Error::DoubleTooPrecise`].
    ///
    /// ```
    /// use dressing::factor::{BarnesFactor, Coef, Scale};
    /// use dressing::{Error, Prec};
    /// use num_complex::Complex64;
    /// let g = BarnesFactor::new(vec![(Coef::integer(0), Coef::integer(1), 1)], Scale::Unit).unwrap();
    /// // G(4) = 1!·2! = 2 (DLMF 5.17.2)
    /// let r = g.log_value(&Complex64::new(4.0, 0.0), Prec::DOUBLE).unwrap();
    /// assert!((r.value.re - 2f64.ln()).abs() <= r.radius.to_f64() + 1e-15);
    /// // G has a zero of order 3 at −2
    /// let e = g.log_value(&Complex64::new(-2.0, 0.0), Prec::DOUBLE);
    /// assert!(matches!(e, Err(Error::Zero { order: 3, .. })));
    /// ```
    pub fn log_value<C: ComplexField>(&self, theta: &C, prec: Prec) -> Result<Approx<C>> {
        self.0.log_value(theta, prec)
    }

    /// `d/dθ Σ_j n_j log G(w_j) = dz/dθ · Σ_j n_j s_j [(w_j − 1)ψ(w_j) − w_j +
    /// (1 + ln 2π)/2]` at `prec` (DLMF 5.17.4 differentiated), with an
    /// estimate of its absolute error.
    ///
    /// Errors: as [`BarnesFactor::log_value`].
    ///
    /// ```
    /// use dressing::factor::{BarnesFactor, Coef, Scale};
    /// use dressing::{special::digamma, Prec};
    /// use num_complex::Complex64;
    /// // G(1 + z)/G(z) = Γ(z), so the derivative is ψ(z) (DLMF 5.17.1)
    /// let f = BarnesFactor::new(
    ///     vec![(Coef::integer(1), Coef::integer(1), 1), (Coef::integer(0), Coef::integer(1), -1)],
    ///     Scale::Unit,
    /// ).unwrap();
    /// let z = Complex64::new(0.7, 2.5);
    /// let d = f.log_derivative(&z, Prec::DOUBLE).unwrap();
    /// let want = digamma(&z, Prec::DOUBLE).unwrap().value;
    /// assert!((d.value - want).norm() <= d.radius.to_f64() + 1e-14);
    /// ```
    pub fn log_derivative<C: ComplexField>(&self, theta: &C, prec: Prec) -> Result<Approx<C>> {
        self.0.log_derivative(theta, prec)
    }

    /// The product as a formula with the definition of z, for reports.
    ///
    /// ```
    /// use dressing::factor::{BarnesFactor, Coef, Scale};
    /// let f = BarnesFactor::new(vec![(Coef::integer(1), Coef::integer(1), 1)], Scale::Over2PiI).unwrap();
    /// assert_eq!(f.describe(), "G(1 + z), z = θ/(2πi)");
    /// ```
    pub fn describe(&self) -> String {
        self.0.describe()
    }
}

/// The product as a formula in z, e.g. `G(1 + z) · G(z)^-1`.
///
/// ```
/// use dressing::factor::{BarnesFactor, Coef, Scale};
/// let f = BarnesFactor::new(
///     vec![(Coef::integer(1), Coef::integer(1), 1), (Coef::integer(0), Coef::integer(1), -1)],
///     Scale::Unit,
/// ).unwrap();
/// assert_eq!(format!("{f}"), "G(1 + z) · G(z)^-1");
/// ```
impl fmt::Display for BarnesFactor {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        fmt::Display::fmt(&self.0, f)
    }
}
