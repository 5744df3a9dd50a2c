//! Double-exponential quadrature at any precision.
//!
//! The integrals behind the scalar factors, such as
//! `∫_0^∞ dt/t · sinh(αt) sin(θt) / (sinh(βt) cosh(γt))`, are smooth,
//! decay exponentially and may oscillate; a few have integrable endpoint
//! singularities. Double-exponential (DE) rules (Takahasi–Mori 1974) handle
//! all of these with one uniform mechanism and converge to hundreds of digits
//! with a few thousand evaluations; the design follows mpmath's
//! `mpmath.calculus.quadrature`: a rule is an object ([`DoubleExponential`])
//! that caches its nodes per precision and estimates its error from
//! successive levels.
//!
//! # Method
//! A change of variables `x = φ(t)` turns `∫ f(x) dx` into
//! `∫_{−∞}^{∞} f(φ(t)) φ'(t) dt`, whose integrand decays double
//! exponentially as `|t| → ∞`; the trapezoidal rule with step `h` then has
//! an error like `exp(−c/h)` (for integrands analytic near the interval), so
//! halving `h` roughly doubles the number of correct digits. The maps
//! ([`Domain`]):
//!
//! * [`Domain::Finite`]`(a, b)`, **tanh-sinh**:
//!   `x = a + (b−a)/2 · (1 + u)`, `u = tanh(π/2 · sinh t)`,
//!   weight `(π/2) cosh t / cosh²(π/2 · sinh t)`. Endpoint singularities
//!   such as `x^{−1/2}` or `log x` are integrated at full accuracy.
//! * [`Domain::HalfLine`]`(a)`, **exp-sinh**: `x = a + exp(π/2 · sinh t)`,
//!   weight `(π/2) cosh t · exp(π/2 · sinh t)`. The right tail of the
//!   transformed integrand decays double exponentially as soon as `f`
//!   decays like a power `x^{−p}`, `p > 1`, and faster for exponential
//!   decay: it is the general-purpose map for `[a, ∞)`.
//! * [`Domain::HalfLineExpDecay`]`(a)`, **exp-exp** (Takahasi–Mori's map for
//!   exponentially decaying integrands): `x = a + exp(t − e^{−t})`, weight
//!   `(1 + e^{−t}) · exp(t − e^{−t})`. For `f ~ e^{−cx}` its right tail
//!   decays like `exp(−c e^t)`, double exponentially as the theory wants,
//!   whereas exp-sinh over-decays (`exp(−c e^{(π/2) sinh t})`), which spaces
//!   its nodes too widely where `f` still matters and oscillates. On
//!   `∫_0^∞ sin(θt)/sinh t dt` it needs a fifth of exp-sinh's evaluations at
//!   100 digits (about 770 against 4070) and 40% at double precision. It
//!   does not suit power-law decay, for
//!   which its tail decays only like `e^{−(p−1)t}`; that case comes back as
//!   [`Error::NoConvergence`](crate::Error::NoConvergence).
//!
//! Near the endpoint `a` both half-line maps cluster nodes double
//! exponentially too, so `x^{−1/2}`-type singularities at `a` are handled.
//!
//! # Endpoints without cancellation
//! The tables store, for each node, the distance to the endpoint it
//! approaches, computed from the `t`-parametrisation directly:
//! `1 − |u| = 2/(exp(2s) + 1)` with `s = π/2 · sinh|t|` for tanh-sinh, and
//! `y = exp(±s)` itself on the half-line. So `x − a` and `b − x` are known to
//! full relative precision even where `x` rounds to `a`. Plain
//! [`DoubleExponential::integrate`] passes `f` only `x`; for integrands
//! singular at a finite endpoint, [`DoubleExponential::integrate_point`]
//! passes a [`Point`] with `x − a` and `b − x` as well (for `a = 0`, `x`
//! itself is accurate, and plain `integrate` suffices).
//!
//! # Levels
//! Level `k` has step `h = 2^{−k}`, `k = 0, 1, …`. Level 0 evaluates
//! `t = 0, ±1, ±2, …`; level `k ≥ 1` only the new, odd multiples of
//! `2^{−k}`, and the level sum is `S_k = S_{k−1}/2 + h · Σ_new w f`, so no
//! evaluation is repeated. The highest level defaults to
//! `8 + ⌈log2(wp/53)⌉` (8 at double precision, 11 at 100 digits; the tests
//! need 4–6 and 6–8) and can be set with
//! [`DoubleExponential::with_max_level`].
//!
//! # Truncation of the t-range
//! Each side of a table reaches to the first integer `T` where the node's
//! distance to its endpoint is below `2^{−4·wp}` (tanh-sinh, and both
//! half-line maps towards `a`), where `exp(π/2 sinh t) ≥ 2^{4·wp}`
//! (exp-sinh towards ∞), or where `x ≥ 64·wp` (exp-exp towards ∞); every
//! level holds the nodes with `|t| ≤ T`. The weights there are far below
//! `2^{−wp}`, and even a singular integrand `|x − a|^{−α}` with `α < 3/4`
//! contributes less than `2^{−wp}` beyond. The sums do not run to the end
//! of the table: each side, outwards from `t = 0`, stops after three
//! consecutive terms `|w f|` below `2^{−wp}` times the largest term seen
//! (for [`integrate_many`](DoubleExponential::integrate_many): for every
//! integrand still converging), so a fast-decaying integrand costs only the
//! nodes it needs and is not evaluated far out, where it might overflow; a
//! NaN or infinite value in such a tail (after a negligible term, or where
//! the last two terms extrapolate to a negligible one) also ends the side.
//! If a side does run to `T`, the neglected tail is estimated from the
//! level-0 terms at `T − 1` and `T` (geometric beyond `T`, which
//! overestimates a DE tail) and added to the error; if it is above the
//! tolerance, the integrand does not decay fast enough (`∫_0^1 dx/x`, or a
//! singularity stronger than `|x − a|^{−3/4}`) and the rule stops at once
//! with [`Error::NoConvergence`](crate::Error::NoConvergence).
//!
//! # Error estimate
//! With `L1 = h Σ |w f|` (the `L1` norm of `f` as the rule sees it),
//! `d1 = |S_k − S_{k−1}|`, `d2 = |S_k − S_{k−2}|` and `r = d/L1`, the
//! discretisation error of `S_k` is estimated in the manner of mpmath's
//! `TanhSinh.estimate_error`: the number of correct bits is expected to
//! grow by the factor `log r1 / log r2` observed between the last two
//! differences, `err ≈ L1 · r1^ρ`. To stay on the safe side of the
//! irregular convergence of DE sums at coarse steps (exp-sinh's especially),
//! `ρ` is the smaller of the factors observed at this level and the one
//! before, less 10%, at least 1, and at most 2 (mpmath's cap) once
//! `r1 ≤ 2^{−24}`, 3/2 before. Levels 1 and 2 use `err ≈ d1`, as does any
//! level where the differences grow or `d1` has reached the rounding floor.
//! Checked on some twenty integrands (those of the tests and others) at
//! 1–300 digits and 5–53 bits, this never fell below the actual error,
//! where mpmath's rule (cap 2, no history) did for a few per cent of the
//! low-precision results. A floor `2^{−wp} · (4 + √N) · L1`
//! accounts for the rounding of `N` terms and of the integrand values
//! (assumed correct to a few units in the last place at the working
//! precision); the tail estimate and the final rounding to `prec` bits are
//! added. The returned radius is the sum of these four.
//!
//! The pass stops when the estimate is below `2^{−prec} · |S_k|`, or below
//! the absolute tolerance of [`DoubleExponential::with_abs_tol`], or below
//! the rounding floor (nothing more can be gained at this precision; this is
//! how the double path stops, and how an integral that vanishes by
//! cancellation ends, with a radius that then exceeds the relative request:
//! check [`Approx::meets`](crate::Approx::meets)), or when `d1` itself has
//! reached the floor. At the highest level without that, the result is
//! [`Error::NoConvergence`](crate::Error::NoConvergence), which states the
//! best estimate and what to change.
//!
//! # Cache
//! The nodes and weights of each (map, real type, working precision, level)
//! are computed once, in MPFR with 32 + level extra bits and rounded (to
//! `f64` on the double path), and kept in the rule behind a `RwLock`; they
//! live on the standard interval (`[−1, 1]` or `[0, ∞)`) and are mapped to
//! `[a, b]` or `[a, ∞)` at each node, so one table serves every interval. A
//! request for a precision below that of a cached table of the same level
//! is served by rounding that table and cutting it to the shorter reach (the
//! grid `t = j·2^{−k}` does not depend on the precision); the rounded table
//! is cached in turn. [`default_rule`] is a process-wide instance; the rule
//! is `Send + Sync`.
//!
//! # Precision and guard bits
//! On the arbitrary-precision path (`rug`), nodes, weights, the points
//! passed to `f` and the sums carry `wp = prec + GUARD_BITS` bits
//! ([`GUARD_BITS`] = 32): the rounding floor is then about `2^{−25}` of the
//! tolerance, leaving room for integrands that lose a few bits. The result
//! is rounded to `prec` bits. On the double path (`Complex64`, `f64` nodes)
//! `wp = 53`: there is no room for guard bits, requests above 53 bits are
//! refused, and the radius is dominated by the rounding floor (about 14–15
//! correct digits).
//!
//! ```
//! use dressing::quadrature::{default_rule, Domain};
//! use dressing::Prec;
//! use rug::{Complex, Float};
//! // ∫_0^∞ sin(θt)/sinh(t) dt = (π/2) tanh(πθ/2)  (Gradshteyn–Ryzhik 3.981.1)
//! let prec = Prec::digits(40).unwrap();
//! let theta = Complex::with_val(200, (0.5, 0.3));
//! let r = default_rule()
//!     .integrate(
//!         |t: &Float| {
//!             let th = Complex::with_val(t.prec(), &theta * t);
//!             th.sin() / Float::with_val(t.prec(), t.sinh_ref())
//!         },
//!         &Domain::HalfLineExpDecay(Float::new(200)),
//!         prec,
//!     )
//!     .unwrap();
//! let half_pi = Float::with_val(200, rug::float::Constant::Pi) / 2u32;
//! let exact = Complex::with_val(200, &theta * &half_pi).tanh() * &half_pi;
//! let err = Complex::with_val(200, &r.value - &exact).abs().real().to_f64();
//! assert!(err <= r.radius.to_f64() && err < 1e-40);
//! ```

mod nodes;
mod rule;

pub use rule::{default_rule, DoubleExponential, GUARD_BITS, MAX_LEVEL_CAP};

use crate::num::RealField;

/// Where to integrate, and with which map.
///
/// ```
/// use dressing::quadrature::Domain;
/// let d: Domain<f64> = Domain::Finite(0.0, 1.0);
/// assert_eq!(d, Domain::Finite(0.0, 1.0));
/// ```
#[derive(Clone, Debug, PartialEq)]
pub enum Domain<R> {
    /// `[a, b]`, by tanh-sinh. `a = b` gives zero; `a > b` is an error.
    Finite(R, R),
    /// `[a, ∞)`, by exp-sinh: for integrands that decay like a power
    /// (faster than `x^{−1.25}` for full accuracy) or faster.
    HalfLine(R),
    /// `[a, ∞)`, by exp-exp: for integrands that decay exponentially,
    /// `e^{−cx}` with `c ≳ 0.011` (rescale `x` otherwise). Fewer evaluations
    /// than [`Domain::HalfLine`] on such integrands, oscillating or not.
    HalfLineExpDecay(R),
}

/// A node as an integrand sees it in
/// [`DoubleExponential::integrate_point`]: the point and its distances to
/// the endpoints, each to full relative precision.
///
/// ```
/// use dressing::quadrature::{default_rule, Domain, Point};
/// use dressing::Prec;
/// use num_complex::Complex64;
/// // ∫_0^1 log(1 − x) dx = −1, with log(1 − x) from b − x
/// let r = default_rule()
///     .integrate_point(
///         |p: &Point<f64>| Complex64::new(p.to_end.unwrap().ln(), 0.0),
///         &Domain::Finite(0.0, 1.0),
///         Prec::DOUBLE,
///     )
///     .unwrap();
/// assert!((r.value.re + 1.0).abs() <= r.radius.to_f64());
/// ```
#[derive(Clone, Debug, PartialEq)]
pub struct Point<R> {
    /// The node `x`.
    pub x: R,
    /// `x − a`, computed without cancellation.
    pub from_start: R,
    /// `b − x` on a finite interval, computed without cancellation; `None`
    /// on a half-line.
    pub to_end: Option<R>,
}

impl<R: RealField> Point<R> {
    /// The distance to the nearer endpoint.
    ///
    /// ```
    /// use dressing::quadrature::Point;
    /// let p = Point { x: 0.75, from_start: 0.75, to_end: Some(0.25) };
    /// assert_eq!(p.distance(), 0.25);
    /// ```
    pub fn distance(&self) -> R {
        match &self.to_end {
            Some(e) if *e < self.from_start => e.clone(),
            _ => self.from_start.clone(),
        }
    }
}
