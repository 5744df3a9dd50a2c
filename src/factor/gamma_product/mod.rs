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
//!   rest into the strip), which is the continuation. Steps that are exact
//!   rational multiples of one another are first brought to a common step by
//!   Gauss's multiplication formula (`analysis`, docs/math.md §4a). The
//!   z-independent parts of the integrand are cached per node (`integral`);
//!   on the double path an even integrand in its strip is summed on a
//!   uniform grid with geometric sequences for the exponentials
//!   (`trapezoid`, docs/math.md §4b).
//! * **Choice** ([`Method::Auto`]): the cheaper by the cost model of `cost`
//!   ([`GammaProduct::plan`] reports it); many points at once: `batch`.

mod analysis;
mod batch;
mod cost;
mod derivative;
mod integral;
mod product;
mod trapezoid;

pub use cost::{Cost, Detail, Plan};

use super::coef::Coef;
use crate::error::{Error, Result};
use crate::num::{ComplexField, RealField};
use crate::precision::{Approx, Prec};
use rug::Float;
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

    /// `dz/dθ`, a constant (1, `1/(iπ)` or `1/(2πi)`) at `wp` bits.
    ///
    /// ```
    /// use dressing::factor::Scale;
    /// use num_complex::Complex64;
    /// let d: Complex64 = Scale::OverIPi.dz_dtheta(53);
    /// assert!((d - Complex64::new(0.0, -1.0 / std::f64::consts::PI)).norm() < 1e-16);
    /// ```
    pub fn dz_dtheta<C: ComplexField>(self, wp: u32) -> C {
        // z is linear in θ, so its value at θ = 1 is the derivative.
        self.z_of(&C::from_i64(1, wp))
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
    /// Choose the representation with the smaller estimated cost at this
    /// point and precision ([`GammaProduct::plan`]; the cost model is in
    /// docs/performance.md). Both give the same value within their radii.
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
    /// Whether all steps are equal.
    pub common_step: bool,
    /// Where the steps differ but are exact rational multiples of one
    /// another: the common step they were reduced to for the integral form
    /// (Gauss's multiplication formula, docs/math.md §4a).
    pub reduction: Option<StepReduction>,
}

/// Steps `a_j = m_j a₀` brought to the common step `a₀` (their greatest
/// common divisor as rationals) by Gauss's multiplication formula.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct StepReduction {
    /// The common step `a₀`.
    pub step: String,
    /// `m_j = a_j / a₀` for each term, in order.
    pub multiples: Vec<u32>,
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
    coeffs: CoefCache,
    /// The common-step terms of the integral form, or why there are none.
    kernel: std::result::Result<Kernel, String>,
    /// ζ(m, K) for m = 2.. at (precision, K).
    zetas: RwLock<ZetaCache>,
    /// Per-precision tables of the product form's tail.
    tails: product::TailCache,
    /// z-independent integrand data at the quadrature nodes.
    nodes: integral::NodeCache,
    /// Uniform grids of the even double-precision integral.
    grids: trapezoid::GridCache,
    /// (a, b, s) per term as `f64`, for planning.
    terms_f64: std::sync::OnceLock<Vec<(f64, f64, f64)>>,
}

/// The integral form's product: one common step, `Σ n = 0` unless
/// normalised.
struct Kernel {
    terms: Vec<GammaTerm>,
    coeffs: CoefCache,
    /// Whether the Malmstén integrand is even in t (docs/math.md §4b).
    even: bool,
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

type CoefCache = RwLock<HashMap<u32, Arc<Vec<Abs>>>>;

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
        let convergence = analysis::analyse(&terms, normalise_at.is_some());
        if let Some(c) = convergence.conditions.iter().find(|c| !c.holds) {
            return Err(Error::Divergent {
                condition: c.formula.to_string(),
                value: format!("{:e}", c.value),
                hint: format!(
                    "{}; change the powers, offsets or slopes so that it vanishes{}",
                    c.meaning,
                    // Normalising removes only the z-independent conditions
                    // (those without the slopes s).
                    if normalise_at.is_none() && !c.formula.contains('s') {
                        ", or normalise the product at a reference rapidity"
                    } else {
                        ""
                    }
                ),
            });
        }
        let kernel =
            analysis::common_step_terms(&terms, &convergence, normalise_at.is_some()).map(|kt| {
                Kernel {
                    even: analysis::integrand_is_even(&kt),
                    terms: kt,
                    coeffs: RwLock::new(HashMap::new()),
                }
            });
        Ok(GammaProduct {
            terms,
            scale,
            theta0: normalise_at,
            convergence,
            coeffs: RwLock::new(HashMap::new()),
            kernel,
            zetas: RwLock::new(HashMap::new()),
            tails: Default::default(),
            nodes: Default::default(),
            grids: Default::default(),
            terms_f64: Default::default(),
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
    /// incommensurate steps, `Σ n ≠ 0` without normalisation, or `z = θ`).
    pub fn strip(&self) -> Option<(f64, f64)> {
        let kernel = self.kernel.as_ref().ok()?;
        let per = self.scale.re_z_per_im_theta()?;
        let c = coeffs_of(&kernel.coeffs, &kernel.terms, 64);
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

    /// Whether the integral form is available (see [`strip`](Self::strip)).
    pub fn integral_available(&self) -> bool {
        self.kernel.is_ok()
    }

    /// (a, b, s) per term as `f64` (from 128-bit values).
    fn terms_f64(&self) -> &[(f64, f64, f64)] {
        self.terms_f64.get_or_init(|| {
            self.coeffs_at(128)
                .iter()
                .map(|(a, b, s)| (a.to_f64(), b.to_f64(), s.to_f64()))
                .collect()
        })
    }

    fn coeffs_at(&self, wp: u32) -> Arc<Vec<Abs>> {
        coeffs_of(&self.coeffs, &self.terms, wp)
    }

    /// The kernel, or the error saying why the integral form is unavailable.
    fn kernel(&self) -> Result<&Kernel> {
        self.kernel.as_ref().map_err(|why| Error::Domain {
            function: "GammaProduct::log_value",
            message: why.clone(),
        })
    }

    /// z (and z₀) at working precision for a rapidity.
    fn z_and_z0<C: ComplexField>(&self, theta: &C, wp: u32) -> (C, Option<C>) {
        let th = theta.with_prec(wp);
        let z = self.scale.z_of(&th);
        let z0 = self.theta0.map(|(x, y)| {
            let t0 = C::from_f64(x, y, wp);
            self.scale.z_of(&t0)
        });
        (z, z0)
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
        let wp = working_bits::<C>(prec);
        let (z, z0) = self.z_and_z0(theta, wp);
        let chosen = match method {
            Method::Auto => self.plan_z(&z, z0.as_ref(), prec).method,
            m => m,
        };
        let run = |m: Method| match m {
            Method::Integral => {
                self.kernel()?;
                if C::MAX_PREC.is_some() {
                    self.integral_double(theta, &z, prec)
                } else {
                    self.integral_form(&z, z0.as_ref(), wp, prec)
                }
            }
            _ => self.product_form(&z, z0.as_ref(), wp, prec),
        };
        let r = match (run(chosen), method) {
            // Auto falls back on the other representation where the chosen
            // one cannot deliver (far out, the quadrature's oscillation or
            // the product's factor cap), and says so if both fail.
            (Err(first @ (Error::NoConvergence { .. } | Error::Domain { .. })), Method::Auto)
                if self.integral_available() =>
            {
                let other = if chosen == Method::Integral {
                    Method::Product
                } else {
                    Method::Integral
                };
                run(other).map_err(|second| Error::Domain {
                    function: "GammaProduct::log_value",
                    message: format!(
                        "neither representation reaches the requested accuracy at θ = {}; \
                         {} form: {first}; {} form: {second}. The rapidity is too far out \
                         (|θ| = {:.3e}) for this factor and precision: evaluate nearer the \
                         origin or use the factor's asymptotics",
                        theta.to_decimal(17),
                        method_name(chosen),
                        method_name(other),
                        theta.log2_abs().exp2()
                    ),
                })
            }
            (r, _) => r,
        };
        r.map_err(|e| name_rapidity(e, theta))
    }
}

fn method_name(m: Method) -> &'static str {
    match m {
        Method::Integral => "integral",
        _ => "product",
    }
}

/// The working precision of an evaluation at `prec` on the path of `C`.
fn working_bits<C: ComplexField>(prec: Prec) -> u32 {
    match C::MAX_PREC {
        Some(m) => m,
        None => prec.bits() + 24,
    }
}

/// (a, b, s) of `terms` at `wp` bits, cached.
fn coeffs_of(cache: &CoefCache, terms: &[GammaTerm], wp: u32) -> Arc<Vec<Abs>> {
    if let Some(c) = cache.read().expect("poisoned").get(&wp) {
        return Arc::clone(c);
    }
    let v: Vec<_> = terms
        .iter()
        .map(|t| (t.step.value(wp), t.offset.value(wp), t.slope.value(wp)))
        .collect();
    let v = Arc::new(v);
    cache.write().expect("poisoned").insert(wp, Arc::clone(&v));
    v
}

/// Names the rapidity in pole and zero reports.
fn name_rapidity<C: ComplexField>(e: Error, theta: &C) -> Error {
    {
        match e {
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
        }
    }
}
