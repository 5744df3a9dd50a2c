//! The double-exponential rule: levels, error estimate, stopping.

use super::nodes::{Cache, Kind, Table};
use super::{Domain, Point};
use crate::error::{Error, Result};
use crate::num::{ComplexField, RealField};
use crate::precision::{Approx, Prec, Radius};
use std::fmt;
use std::sync::{Arc, OnceLock};

/// Guard bits added to the requested precision on the arbitrary-precision
/// path: nodes, weights and sums are carried at `prec + GUARD_BITS` bits.
/// (The double path has no room for guard bits and works at 53.)
pub const GUARD_BITS: u32 = 32;

/// The highest level [`DoubleExponential::with_max_level`] accepts: step
/// `h = 2^-16`, about 10⁶ nodes per level.
pub const MAX_LEVEL_CAP: u32 = 16;

/// A side of the node range ends after this many consecutive negligible
/// terms.
const QUIET_RUN: u32 = 3;

/// The double-exponential quadrature rule, with its cache of nodes.
///
/// One object serves every domain kind, numeric type and precision: the
/// nodes and weights of each (map, real type, working precision, level) are
/// computed once, on first use, and kept. The rule is `Send + Sync`; clones
/// and the rules made by [`with_max_level`](Self::with_max_level) and
/// [`with_abs_tol`](Self::with_abs_tol) share the cache. Most callers use
/// [`default_rule`].
///
/// See the [module documentation](super) for the method and how the error
/// is estimated.
///
/// ```
/// use dressing::quadrature::{DoubleExponential, Domain};
/// use dressing::Prec;
/// use num_complex::Complex64;
/// let rule = DoubleExponential::new();
/// // ∫_0^1 x² dx = 1/3
/// let r = rule
///     .integrate(|x: &f64| Complex64::new(x * x, 0.0), &Domain::Finite(0.0, 1.0), Prec::DOUBLE)
///     .unwrap();
/// assert!((r.value.re - 1.0 / 3.0).abs() <= r.radius.to_f64());
/// assert!(r.radius.to_f64() < 1e-14);
/// ```
#[derive(Clone)]
pub struct DoubleExponential {
    cache: Arc<Cache>,
    max_level: Option<u32>,
    abs_tol: Radius,
}

impl fmt::Debug for DoubleExponential {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.debug_struct("DoubleExponential")
            .field("max_level", &self.max_level)
            .field("abs_tol", &self.abs_tol)
            .field("cached_tables", &self.cache.len())
            .finish()
    }
}

impl Default for DoubleExponential {
    fn default() -> Self {
        Self::new()
    }
}

/// The process-wide rule, so that every caller shares one node cache.
///
/// ```
/// use dressing::quadrature::{default_rule, Domain};
/// use dressing::Prec;
/// use rug::{Complex, Float};
/// // ∫_0^∞ e^{-x} dx = 1 at 60 digits
/// let r = default_rule()
///     .integrate(
///         |x: &Float| Complex::with_val(x.prec(), -x.clone()).exp(),
///         &Domain::HalfLineExpDecay(Float::new(64)),
///         Prec::digits(60).unwrap(),
///     )
///     .unwrap();
/// assert!(r.meets(Prec::digits(60).unwrap().bits()));
/// assert!(Complex::with_val(300, &r.value - 1u32).abs().real().to_f64() < 1e-60);
/// ```
pub fn default_rule() -> &'static DoubleExponential {
    static RULE: OnceLock<DoubleExponential> = OnceLock::new();
    RULE.get_or_init(DoubleExponential::new)
}

/// The default highest level for a working precision: the error of a DE
/// rule roughly squares with each halving of `h`, so the level needed grows
/// like `log2` of the precision; this leaves two or three levels to spare
/// for the integrands of the tests (levels 4–6 at 53 bits, 6–8 at 365 bits).
fn default_max_level(wp: u32) -> u32 {
    let extra = (wp as f64 / 53.0).log2().ceil().max(0.0) as u32;
    (8 + extra).min(MAX_LEVEL_CAP)
}

impl DoubleExponential {
    /// A rule with an empty cache, the default maximum level and no absolute
    /// tolerance.
    ///
    /// ```
    /// let rule = dressing::quadrature::DoubleExponential::new();
    /// assert_eq!(rule.cached_tables(), 0);
    /// ```
    pub fn new() -> Self {
        DoubleExponential {
            cache: Arc::new(Cache::default()),
            max_level: None,
            abs_tol: Radius::ZERO,
        }
    }

    /// The same rule (sharing the cache) with the highest level set to
    /// `level` (step `2^-level`), capped at [`MAX_LEVEL_CAP`].
    ///
    /// ```
    /// use dressing::quadrature::{default_rule, Domain};
    /// use dressing::{Error, Prec};
    /// use num_complex::Complex64;
    /// let coarse = default_rule().with_max_level(1);
    /// let r = coarse.integrate(|x: &f64| Complex64::new(x.exp(), 0.0), &Domain::Finite(0.0, 1.0), Prec::DOUBLE);
    /// assert!(matches!(r, Err(Error::NoConvergence { .. })));
    /// ```
    pub fn with_max_level(&self, level: u32) -> Self {
        DoubleExponential {
            max_level: Some(level.min(MAX_LEVEL_CAP)),
            ..self.clone()
        }
    }

    /// The same rule (sharing the cache) that also accepts a result whose
    /// estimated absolute error is below `tol`, whatever its relative error
    /// (useful for integrals that vanish or nearly vanish).
    ///
    /// ```
    /// use dressing::quadrature::{default_rule, Domain};
    /// use dressing::{Prec, Radius};
    /// use num_complex::Complex64;
    /// // ∫_{-1}^{1} x³ cos x dx = 0
    /// let rule = default_rule().with_abs_tol(Radius::from_f64(1e-12));
    /// let r = rule
    ///     .integrate(|x: &f64| Complex64::new(x.powi(3) * x.cos(), 0.0), &Domain::Finite(-1.0, 1.0), Prec::DOUBLE)
    ///     .unwrap();
    /// assert!(r.value.re.abs() <= r.radius.to_f64() && r.radius.to_f64() <= 1e-12);
    /// ```
    pub fn with_abs_tol(&self, tol: Radius) -> Self {
        DoubleExponential {
            abs_tol: tol,
            ..self.clone()
        }
    }

    /// The highest level used at a working precision of `working_bits`
    /// (`prec + GUARD_BITS` on the arbitrary-precision path, 53 on the
    /// double path).
    ///
    /// ```
    /// let rule = dressing::quadrature::DoubleExponential::new();
    /// assert_eq!(rule.max_level(53), 8);
    /// assert_eq!(rule.with_max_level(3).max_level(53), 3);
    /// ```
    pub fn max_level(&self, working_bits: u32) -> u32 {
        self.max_level
            .unwrap_or_else(|| default_max_level(working_bits))
    }

    /// How many node tables (one per map, real type, precision and level)
    /// the cache holds.
    ///
    /// ```
    /// use dressing::quadrature::{DoubleExponential, Domain};
    /// use dressing::Prec;
    /// use num_complex::Complex64;
    /// let rule = DoubleExponential::new();
    /// rule.integrate(|x: &f64| Complex64::new(x.cos(), 0.0), &Domain::Finite(0.0, 1.0), Prec::DOUBLE).unwrap();
    /// let n = rule.cached_tables();
    /// assert!(n >= 2);
    /// rule.integrate(|x: &f64| Complex64::new(x.sin(), 0.0), &Domain::Finite(0.0, 2.0), Prec::DOUBLE).unwrap();
    /// assert_eq!(rule.cached_tables(), n); // same nodes, reused
    /// ```
    pub fn cached_tables(&self) -> usize {
        self.cache.len()
    }

    /// Empties the cache (shared with this rule's clones).
    ///
    /// ```
    /// let rule = dressing::quadrature::DoubleExponential::new();
    /// rule.clear_cache();
    /// assert_eq!(rule.cached_tables(), 0);
    /// ```
    pub fn clear_cache(&self) {
        self.cache.clear()
    }

    /// `∫ f(x) dx` over `domain` to `prec` bits (relative), or to the
    /// absolute tolerance of [`with_abs_tol`](Self::with_abs_tol).
    ///
    /// `f` receives the node `x` at the working precision. The result is
    /// rounded to `prec` bits; its radius is the error estimate of the
    /// [module documentation](super) plus that rounding.
    ///
    /// # Errors
    /// [`Error::NonFinite`] for a NaN or infinite endpoint;
    /// [`Error::Domain`] for `a > b`, or when `f` returns NaN or an infinity
    /// (the message names the point); [`Error::DoubleTooPrecise`] for more
    /// than 53 bits on the double path; [`Error::NoConvergence`] when the
    /// highest level is reached without meeting the tolerance, or when the
    /// integrand is not negligible at the end of the node range.
    ///
    /// ```
    /// use dressing::quadrature::{default_rule, Domain};
    /// use dressing::Prec;
    /// use rug::{Complex, Float};
    /// // ∫_0^1 4/(1+x²) dx = π
    /// let prec = Prec::digits(50).unwrap();
    /// let dom = Domain::Finite(Float::with_val(200, 0), Float::with_val(200, 1));
    /// let r = default_rule()
    ///     .integrate(|x: &Float| Complex::with_val(x.prec(), 4u32 / (x.clone().square() + 1u32)), &dom, prec)
    ///     .unwrap();
    /// let pi = Float::with_val(200, rug::float::Constant::Pi);
    /// let err = Complex::with_val(200, &r.value - &pi).abs().real().to_f64();
    /// assert!(err <= r.radius.to_f64() && err < 1e-50);
    /// ```
    pub fn integrate<C, F>(&self, f: F, domain: &Domain<C::Real>, prec: Prec) -> Result<Approx<C>>
    where
        C: ComplexField,
        F: Fn(&C::Real) -> C,
    {
        let mut v = self.run(
            |p: &Point<C::Real>, out: &mut [C]| out[0] = f(&p.x),
            1,
            domain,
            prec,
            "DoubleExponential::integrate",
        )?;
        Ok(v.remove(0))
    }

    /// Like [`integrate`](Self::integrate), but `f` receives the whole
    /// [`Point`]: the node and its distances to the endpoints, computed
    /// without cancellation. Use it for integrands singular at a finite
    /// endpoint, where `x` itself rounds onto the endpoint long before the
    /// weights become negligible.
    ///
    /// ```
    /// use dressing::quadrature::{default_rule, Domain, Point};
    /// use dressing::Prec;
    /// use num_complex::Complex64;
    /// // ∫_1^2 (x−1)^{-1/2} (2−x)^{-1/2} dx = π
    /// let r = default_rule()
    ///     .integrate_point(
    ///         |p: &Point<f64>| Complex64::new(1.0 / (p.from_start * p.to_end.unwrap()).sqrt(), 0.0),
    ///         &Domain::Finite(1.0, 2.0),
    ///         Prec::DOUBLE,
    ///     )
    ///     .unwrap();
    /// let err = (r.value.re - std::f64::consts::PI).abs();
    /// assert!(err <= r.radius.to_f64() && err < 1e-14);
    /// ```
    pub fn integrate_point<C, F>(
        &self,
        f: F,
        domain: &Domain<C::Real>,
        prec: Prec,
    ) -> Result<Approx<C>>
    where
        C: ComplexField,
        F: Fn(&Point<C::Real>) -> C,
    {
        let mut v = self.run(
            |p: &Point<C::Real>, out: &mut [C]| out[0] = f(p),
            1,
            domain,
            prec,
            "DoubleExponential::integrate_point",
        )?;
        Ok(v.remove(0))
    }

    /// `n` integrals over one domain in one pass: `f(x, out)` must write all
    /// `n` integrand values at `x` into `out` (which holds stale values from
    /// the previous node). Every integrand shares the nodes; convergence is
    /// judged for each separately and a component's result is frozen at the
    /// level where it converges; the pass ends when all have converged. A
    /// side of the node range ends when the terms of every unconverged
    /// component are negligible.
    ///
    /// # Errors
    /// As [`integrate`](Self::integrate); the first component that fails
    /// fails the call, and the message says which.
    ///
    /// ```
    /// use dressing::quadrature::{default_rule, Domain};
    /// use dressing::Prec;
    /// use num_complex::Complex64;
    /// // ∫_0^∞ e^{-k x} dx = 1/k, k = 1..4
    /// let r = default_rule()
    ///     .integrate_many(
    ///         |x: &f64, out: &mut [Complex64]| {
    ///             for (k, o) in out.iter_mut().enumerate() {
    ///                 *o = Complex64::new((-(k as f64 + 1.0) * x).exp(), 0.0);
    ///             }
    ///         },
    ///         4,
    ///         &Domain::HalfLineExpDecay(0.0),
    ///         Prec::DOUBLE,
    ///     )
    ///     .unwrap();
    /// for (k, a) in r.iter().enumerate() {
    ///     assert!((a.value.re - 1.0 / (k as f64 + 1.0)).abs() <= a.radius.to_f64());
    /// }
    /// ```
    pub fn integrate_many<C, F>(
        &self,
        mut f: F,
        n: usize,
        domain: &Domain<C::Real>,
        prec: Prec,
    ) -> Result<Vec<Approx<C>>>
    where
        C: ComplexField,
        F: FnMut(&C::Real, &mut [C]),
    {
        self.run(
            |p: &Point<C::Real>, out: &mut [C]| f(&p.x, out),
            n,
            domain,
            prec,
            "DoubleExponential::integrate_many",
        )
    }

    /// The common driver.
    fn run<C, F>(
        &self,
        mut f: F,
        n: usize,
        domain: &Domain<C::Real>,
        prec: Prec,
        function: &'static str,
    ) -> Result<Vec<Approx<C>>>
    where
        C: ComplexField,
        F: FnMut(&Point<C::Real>, &mut [C]),
    {
        let wp = match C::MAX_PREC {
            Some(max) if prec.bits() > max => {
                return Err(Error::DoubleTooPrecise {
                    requested_bits: prec.bits(),
                })
            }
            Some(max) => max,
            None => prec.with_guard(GUARD_BITS),
        };
        let map = match Map::new(domain, wp, function)? {
            Some(m) => m,
            None => {
                let zero = C::from_i64(0, prec.bits());
                let p = zero.prec();
                return Ok(vec![Approx::new(zero, Radius::ZERO, p); n]);
            }
        };
        if n == 0 {
            return Ok(Vec::new());
        }
        let max_level = self.max_level(wp);
        let mut pass = Pass {
            map,
            vals: vec![C::from_i64(0, wp); n],
            comps: (0..n).map(|_| Comp::new(wp)).collect(),
            wp,
            function,
            many: n > 1,
        };
        let prec_bits = prec.bits() as f64;
        let abs_tol = self.abs_tol.log2();
        for level in 0..=max_level {
            let table: Arc<Table<C::Real>> = self.cache.get(pass.map.kind(), wp, level);
            for c in pass.comps.iter_mut() {
                c.tail = c
                    .edge
                    .iter()
                    .flatten()
                    .fold(f64::NEG_INFINITY, |a, &b| a.max(b));
            }
            if let Some((d, w)) = &table.center {
                pass.eval(&mut f, Side::Minus, d, w)?;
            }
            pass.side(&mut f, Side::Plus, &table.plus, level)?;
            pass.side(&mut f, Side::Minus, table.minus(), level)?;

            let scale = pass.map.scale_log2();
            for (i, c) in pass.comps.iter_mut().enumerate() {
                if c.done.is_some() {
                    continue;
                }
                let s = pass.map.scale(c.total.clone()).mul_pow2(-(level as i32));
                c.hist.push(s);
                if c.hist.len() > 3 {
                    c.hist.remove(0);
                }
                let l1 = c.l1.log2() + scale - level as f64;
                let floor = l1 - wp as f64 + (4.0 + (c.terms as f64).sqrt()).log2();
                let tail = c.tail + scale;
                let s = &c.hist[c.hist.len() - 1];
                let tol = (s.log2_abs() - prec_bits).max(abs_tol);
                let accept = tol.max(floor);
                let (est, d1) = estimate(&c.hist, level, l1, floor, &mut c.growth);
                c.best = (est, floor, tail);
                if level == 0 {
                    continue;
                }
                if tail > accept {
                    return Err(pass.map.tail_error(s, c.best, i, n, function));
                }
                if est <= accept || (level >= 2 && d1 <= floor + 1.0) {
                    c.done = Some(finish(s, prec, c.best));
                }
            }
            if pass.comps.iter().all(|c| c.done.is_some()) {
                break;
            }
        }
        let Pass { comps, map, .. } = pass;
        let mut out = Vec::with_capacity(n);
        for (i, c) in comps.into_iter().enumerate() {
            match c.done {
                Some(a) => out.push(a),
                None => {
                    let s = &c.hist[c.hist.len() - 1];
                    return Err(map.level_error(s, c.best, i, n, max_level, function));
                }
            }
        }
        Ok(out)
    }
}

/// The growth factor used is this fraction of the one observed.
const SAFETY: f64 = 0.9;

/// The factor by which the number of correct bits may at most grow per
/// level in the error estimate, given the last difference `r1` (relative,
/// `log2`): 2 (mpmath's cap) once the differences are below `2^-24`, 3/2
/// before, in the pre-asymptotic regime.
fn growth_cap(r1: f64) -> f64 {
    if r1 <= -24.0 {
        2.0
    } else {
        1.5
    }
}

/// The error estimate `(log2 |error of S_k|, log2 |S_k − S_{k−1}|)` from the
/// last (up to three) level sums, with `l1 = log2 Σ h|w f|` as the scale.
///
/// With `r1 = |S_k − S_{k−1}|/L1` and `r2 = |S_k − S_{k−2}|/L1`, both below
/// 1, the error is taken as `L1 · r1^ρ` with `ρ = min(log r1 / log r2, cap)`:
/// the number of correct bits is expected to grow by the factor observed
/// between the last two differences (or, if smaller, by the factor observed
/// at the level before: DE convergence, exp-sinh's in particular, is
/// irregular from level to level), less 10% for safety, as in mpmath's
/// `TanhSinh.estimate_error` (which uses `D1²/D2` in its logarithms and
/// caps the growth at 2). Here the cap is 2 once `r1 ≤ 2^-24`, but 3/2
/// before: in the pre-asymptotic regime the growth observed over coarse
/// steps overstates the next one, and a cap of 2 was seen to underestimate
/// the error of low-precision results. The extrapolation
/// starts at level 3 (so that `S_{k−2}` has `h ≤ 1/2`); before it, and
/// whenever the differences do not decrease, the estimate is
/// `|S_k − S_{k−1}|` itself. Once `|S_k − S_{k−1}|` is at the rounding
/// floor, it is the estimate: the sums have stopped changing. Scaling by
/// `L1` keeps the estimate independent of the scale of `f`.
fn estimate<C: ComplexField>(
    hist: &[C],
    level: u32,
    l1: f64,
    floor: f64,
    growth: &mut f64,
) -> (f64, f64) {
    let k = hist.len();
    if level == 0 || k < 2 {
        return (f64::INFINITY, f64::INFINITY);
    }
    let d1 = (hist[k - 1].clone() - &hist[k - 2]).log2_abs();
    if level < 3 || k < 3 || d1 <= floor + 1.0 {
        return (d1, d1);
    }
    let d2 = (hist[k - 1].clone() - &hist[k - 3]).log2_abs();
    let (r1, r2) = (d1 - l1, d2 - l1);
    if r1 >= 0.0 || r2 >= 0.0 || r1 >= r2 {
        *growth = 1.0;
        return (d1, d1);
    }
    let x = r1 / r2;
    let rho = (SAFETY * x.min(*growth).min(growth_cap(r1))).max(1.0);
    *growth = x;
    (r1 * rho + l1, d1)
}

/// The result of a converged component: the sum rounded to `prec`, with a
/// radius of estimate + rounding floor + tail + final rounding.
fn finish<C: ComplexField>(s: &C, prec: Prec, (est, floor, tail): (f64, f64, f64)) -> Approx<C> {
    let v = s.with_prec(prec.bits());
    let round = (s.clone() - &v).log2_abs();
    let radius = Radius::from_log2(est)
        + Radius::from_log2(floor)
        + Radius::from_log2(tail)
        + Radius::from_log2(round);
    let p = v.prec();
    Approx::new(v, radius, p)
}

/// `Σ 2^lg` kept as `acc · 2^e`, so that magnitudes far outside the `f64`
/// range add up (on the double path a plain sum, `e = 0`).
#[derive(Clone, Copy)]
struct LogSum {
    e: f64,
    acc: f64,
}

impl LogSum {
    fn add_log2(&mut self, lg: f64) {
        if lg == f64::NEG_INFINITY {
            return;
        }
        if self.acc == 0.0 {
            self.e = lg;
            self.acc = 1.0;
            return;
        }
        let d = lg - self.e;
        if d > 64.0 {
            self.acc = self.acc * (-d).exp2() + 1.0;
            self.e = lg;
        } else {
            self.acc += d.exp2();
        }
    }

    fn log2(&self) -> f64 {
        if self.acc == 0.0 {
            f64::NEG_INFINITY
        } else {
            self.e + self.acc.log2()
        }
    }
}

/// Adds `|z|` to `l1` and returns `log2 |z|`. On the double path it uses
/// `|re| + |im|` (within a factor √2 of `|z|`), a plain `f64` sum, and a
/// `log2` read off the exponent bits (within 0.09): these magnitudes only
/// set thresholds and the rounding floor.
#[inline]
fn add_magnitude<C: ComplexField>(z: &C, l1: &mut LogSum) -> f64 {
    if C::MAX_PREC.is_some() {
        let m = z.re_f64().abs() + z.im_f64().abs();
        l1.acc += m;
        fast_log2(m)
    } else {
        let lg = z.log2_abs();
        l1.add_log2(lg);
        lg
    }
}

/// `log2 x` for `x ≥ 0` to within 0.09 (exponent plus `mantissa − 1`).
#[inline]
fn fast_log2(x: f64) -> f64 {
    if x.is_normal() {
        let b = x.to_bits();
        let e = ((b >> 52) & 0x7ff) as i64 - 1023;
        let m = f64::from_bits((b & 0x000f_ffff_ffff_ffff) | 0x3ff0_0000_0000_0000);
        e as f64 + (m - 1.0)
    } else {
        x.log2()
    }
}

/// One integrand's running state.
struct Comp<C> {
    /// `Σ w f` over the nodes of all levels so far (standard variable).
    total: C,
    /// The last level sums `S_k`.
    hist: Vec<C>,
    /// `Σ |w f|`.
    l1: LogSum,
    /// `max log2 |w f|`.
    max_lg: f64,
    /// `log2 |w f|` of the last term.
    last_lg: f64,
    /// `log2 |w f|` of the term before.
    prev_lg: f64,
    /// `log2` of the neglected tail beyond the reach, at this level.
    tail: f64,
    /// The tail beyond the reach of each side (plus, minus) measured at
    /// level 0, whose outermost node is at the reach, where that side ran
    /// to the end of its table.
    edge: [Option<f64>; 2],
    /// Terms summed.
    terms: u64,
    /// The growth of the number of correct bits observed at the last level.
    growth: f64,
    /// `(estimate, floor, tail)` at the last level, `log2`.
    best: (f64, f64, f64),
    /// The result, once converged.
    done: Option<Approx<C>>,
}

impl<C: ComplexField> Comp<C> {
    fn new(wp: u32) -> Self {
        Comp {
            total: C::from_i64(0, wp),
            hist: Vec::with_capacity(4),
            l1: LogSum { e: 0.0, acc: 0.0 },
            max_lg: f64::NEG_INFINITY,
            last_lg: f64::NEG_INFINITY,
            prev_lg: f64::NEG_INFINITY,
            tail: f64::NEG_INFINITY,
            edge: [None, None],
            terms: 0,
            growth: f64::INFINITY,
            best: (f64::INFINITY, f64::INFINITY, f64::INFINITY),
            done: None,
        }
    }

    /// `log2` of the sum of the last term of a side and those beyond it,
    /// taken as geometric with the ratio of the last two terms (an
    /// overestimate for the double-exponential decay of a DE tail; infinite
    /// if the terms do not decrease).
    fn tail_geometric(&self) -> f64 {
        let (last, prev) = (self.last_lg, self.prev_lg);
        if last == f64::NEG_INFINITY {
            return last;
        }
        if !matches!(last.partial_cmp(&prev), Some(std::cmp::Ordering::Less)) {
            return f64::INFINITY;
        }
        last - (-((last - prev).exp2())).ln_1p() * std::f64::consts::LOG2_E
    }
}

#[derive(Clone, Copy)]
enum Side {
    /// `t > 0`: towards `b` (finite) or `∞`.
    Plus = 0,
    /// `t ≤ 0`: towards `a`.
    Minus = 1,
}

struct Pass<C: ComplexField> {
    map: Map<C::Real>,
    vals: Vec<C>,
    comps: Vec<Comp<C>>,
    wp: u32,
    function: &'static str,
    many: bool,
}

impl<C: ComplexField> Pass<C> {
    /// Sums one side of a level, outwards, until `QUIET_RUN` consecutive
    /// negligible terms or the end of the table. A NaN or infinite integrand
    /// value after a negligible term, or where the last two terms extrapolate
    /// to a negligible one ([`Self::next_negligible`]), also ends the side:
    /// the integrand has overflowed in its tail (`sinh x = ∞` in `f64`,
    /// say), where it no longer contributes.
    fn side<F>(
        &mut self,
        f: &mut F,
        side: Side,
        nodes: &[(C::Real, C::Real)],
        level: u32,
    ) -> Result<()>
    where
        F: FnMut(&Point<C::Real>, &mut [C]),
    {
        for c in self.comps.iter_mut() {
            c.last_lg = f64::NEG_INFINITY;
            c.prev_lg = f64::NEG_INFINITY;
        }
        let mut quiet = 0;
        for (d, w) in nodes {
            match self.eval(f, side, d, w) {
                Ok(true) => {
                    quiet += 1;
                    if quiet >= QUIET_RUN {
                        return Ok(());
                    }
                }
                Ok(false) => quiet = 0,
                Err(_) if quiet > 0 || self.next_negligible() => return Ok(()),
                Err(e) => return Err(e),
            }
        }
        // The side ran to its reach: estimate what lies beyond. At level 0
        // the last node is at the reach itself, one unit of t after the one
        // before; at finer levels (only if level 0 ended early) it is
        // within 2^(1−level) of it.
        let s = side as usize;
        for c in self.comps.iter_mut().filter(|c| c.done.is_none()) {
            let tail = c.tail_geometric();
            if level == 0 {
                c.edge[s] = Some(tail);
                c.tail = c.tail.max(tail);
            } else if c.edge[s].is_none() {
                c.tail = c.tail.max(tail + 1.0 - level as f64);
            }
        }
        Ok(())
    }

    /// Whether the next term, extrapolated from the last two of this side, is
    /// negligible for every unconverged component. With `u = log2 |w f|`
    /// measured from twice the largest term (so `u ≤ −1`), a DE tail has
    /// `u` growing geometrically in `|t|` (`u ∝ −e^{|t|}` or faster), so the
    /// next is taken as `u_last · (u_last / u_prev)`.
    fn next_negligible(&self) -> bool {
        let wp = self.wp as f64;
        self.comps.iter().filter(|c| c.done.is_none()).all(|c| {
            let (last, prev) = (c.last_lg - c.max_lg - 1.0, c.prev_lg - c.max_lg - 1.0);
            last < prev && last * (last / prev) <= -wp
        })
    }

    /// Adds one node's terms; returns whether they were negligible for every
    /// unconverged component (below `2^-wp` times the largest term so far).
    fn eval<F>(&mut self, f: &mut F, side: Side, d: &C::Real, w: &C::Real) -> Result<bool>
    where
        F: FnMut(&Point<C::Real>, &mut [C]),
    {
        let p = self.map.point(side, d);
        f(&p, &mut self.vals);
        for (i, (c, v)) in self.comps.iter().zip(&self.vals).enumerate() {
            if c.done.is_none() && !v.is_finite() {
                let which = if self.many {
                    format!("integrand {i}")
                } else {
                    "the integrand".to_string()
                };
                return Err(Error::Domain {
                    function: self.function,
                    message: format!(
                        "{which} is NaN or infinite at {}; make it finite there, or, if it is \
                         singular at an endpoint, compute it from the distance to the endpoint \
                         (DoubleExponential::integrate_point) instead of from x, which rounds \
                         onto the endpoint",
                        self.map.describe(&p)
                    ),
                });
            }
        }
        let wp = self.wp as f64;
        let mut negligible = true;
        for (c, v) in self.comps.iter_mut().zip(&self.vals) {
            if c.done.is_some() {
                continue;
            }
            let term = v.clone().mul_real(w);
            let lg = add_magnitude(&term, &mut c.l1);
            c.total += &term;
            c.terms += 1;
            c.prev_lg = c.last_lg;
            c.last_lg = lg;
            if lg > c.max_lg {
                c.max_lg = lg;
            }
            if !(c.max_lg > f64::NEG_INFINITY && lg <= c.max_lg - wp) {
                negligible = false;
            }
        }
        Ok(negligible)
    }
}

/// A domain mapped onto the standard variable.
enum Map<R> {
    /// `x = a + half·(1 + u)`, `u ∈ [−1, 1]`.
    Finite { a: R, b: R, half: R, two: R },
    /// `x = a + y`, `y ∈ [0, ∞)`.
    Half { a: R, kind: Kind },
}

impl<R: RealField> Map<R> {
    /// Validates the domain; `None` for an empty interval.
    fn new(domain: &Domain<R>, wp: u32, function: &'static str) -> Result<Option<Self>> {
        let finite = |x: &R, argument| {
            if x.is_finite() {
                Ok(x.with_prec(wp))
            } else {
                Err(Error::NonFinite { function, argument })
            }
        };
        Ok(Some(match domain {
            Domain::Finite(a, b) => {
                let (a, b) = (finite(a, "a")?, finite(b, "b")?);
                if a > b {
                    return Err(Error::Domain {
                        function,
                        message: format!(
                            "the interval [a, b] has a > b (a = {}, b = {}); swap the \
                             endpoints and negate the result",
                            fmt_real(&a),
                            fmt_real(&b)
                        ),
                    });
                }
                if a == b {
                    return Ok(None);
                }
                let half = (b.clone() - &a).mul_pow2(-1);
                let two = R::from_i64(2, wp);
                Map::Finite { a, b, half, two }
            }
            Domain::HalfLine(a) => Map::Half {
                a: finite(a, "a")?,
                kind: Kind::ExpSinh,
            },
            Domain::HalfLineExpDecay(a) => Map::Half {
                a: finite(a, "a")?,
                kind: Kind::ExpExp,
            },
        }))
    }

    fn kind(&self) -> Kind {
        match self {
            Map::Finite { .. } => Kind::TanhSinh,
            Map::Half { kind, .. } => *kind,
        }
    }

    /// The point at standard distance `d` from the endpoint on `side`.
    #[inline]
    fn point(&self, side: Side, d: &R) -> Point<R> {
        match self {
            Map::Finite { a, b, half, two } => {
                let near = half.clone() * d;
                let far = (two.clone() - d) * half;
                match side {
                    Side::Minus => Point {
                        x: a.clone() + &near,
                        from_start: near,
                        to_end: Some(far),
                    },
                    Side::Plus => Point {
                        x: b.clone() - &near,
                        from_start: far,
                        to_end: Some(near),
                    },
                }
            }
            Map::Half { a, .. } => Point {
                x: a.clone() + d,
                from_start: d.clone(),
                to_end: None,
            },
        }
    }

    /// `log2` of the factor from the standard variable to `x`.
    fn scale_log2(&self) -> f64 {
        match self {
            Map::Finite { half, .. } => half.log2_abs(),
            Map::Half { .. } => 0.0,
        }
    }

    fn scale<C: ComplexField<Real = R>>(&self, s: C) -> C {
        match self {
            Map::Finite { half, .. } => s.mul_real(half),
            Map::Half { .. } => s,
        }
    }

    fn name(&self) -> String {
        match self {
            Map::Finite { a, b, .. } => {
                format!("tanh-sinh quadrature on [{}, {}]", fmt_real(a), fmt_real(b))
            }
            Map::Half { a, kind } => format!(
                "{} quadrature on [{}, ∞)",
                if *kind == Kind::ExpSinh {
                    "exp-sinh"
                } else {
                    "exp-exp"
                },
                fmt_real(a)
            ),
        }
    }

    fn describe(&self, p: &Point<R>) -> String {
        match &p.to_end {
            Some(e) => format!(
                "x = {} (x − a = {}, b − x = {})",
                fmt_real(&p.x),
                fmt_real(&p.from_start),
                fmt_real(e)
            ),
            None => format!(
                "x = {} (x − a = {})",
                fmt_real(&p.x),
                fmt_real(&p.from_start)
            ),
        }
    }

    fn what(&self, i: usize, n: usize) -> String {
        if n > 1 {
            format!("{} (integrand {i} of {n})", self.name())
        } else {
            self.name()
        }
    }

    fn tail_error<C: ComplexField>(
        &self,
        s: &C,
        best: (f64, f64, f64),
        i: usize,
        n: usize,
        function: &'static str,
    ) -> Error {
        let extra = match self {
            Map::Finite { .. } => "",
            Map::Half {
                kind: Kind::ExpExp, ..
            } => {
                "; HalfLineExpDecay reaches only x ≈ 64·(working bits): for an integrand \
                 decaying like a power, or slower than e^(−x/90), use Domain::HalfLine or rescale x"
            }
            Map::Half { .. } => "; on a half-line the integrand must decay faster than x^(−1.25)",
        };
        let size = if best.2.is_finite() {
            format!("the neglected tail is about 2^{:.0}", best.2)
        } else {
            "the terms grow towards it".to_string()
        };
        Error::NoConvergence {
            what: format!("{} [{function}]", self.what(i, n)),
            achieved: achieved(s, best),
            hint: format!(
                "the integrand is not negligible at the end of the node range ({size}): it is \
                 not integrable there, or an endpoint singularity is stronger than \
                 |x − a|^(−3/4) (split off or transform the singularity){extra}"
            ),
        }
    }

    fn level_error<C: ComplexField>(
        &self,
        s: &C,
        best: (f64, f64, f64),
        i: usize,
        n: usize,
        max_level: u32,
        function: &'static str,
    ) -> Error {
        Error::NoConvergence {
            what: format!("{} [{function}]", self.what(i, n)),
            achieved: achieved(s, best),
            hint: format!(
                "the highest level ({max_level}, step 2^-{max_level}) was reached; split the \
                 interval at interior singularities or kinks, pass the distance to an endpoint \
                 singularity via integrate_point, or raise the level with \
                 DoubleExponential::with_max_level"
            ),
        }
    }
}

fn achieved<C: ComplexField>(s: &C, (est, floor, tail): (f64, f64, f64)) -> String {
    let r = Radius::from_log2(est) + Radius::from_log2(floor) + Radius::from_log2(tail);
    format!("{r}, for the estimate {}", s.to_decimal(17))
}

/// A real number for messages: decimal where `f64` can hold it, else `2^e`.
fn fmt_real<R: RealField>(x: &R) -> String {
    let f = x.to_f64();
    if x.is_zero() || (f != 0.0 && f.is_finite()) {
        format!("{f:e}")
    } else {
        let sign = if f < 0.0 || *x < R::from_i64(0, 53) {
            "−"
        } else {
            ""
        };
        format!("{sign}2^{:.1}", x.log2_abs())
    }
}
