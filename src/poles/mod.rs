//! Analytic structure: the poles and zeros of a factor, their orders and
//! leading Laurent coefficients, and what they mean for bound states.
//!
//! **Enumeration** (exact for rational parameters). Γ(a k + b + s z) has
//! poles where `a k + b + s z = −m` (k, m ≥ 0), so for real parameters the
//! singular points of gamma-built pieces lie on a line: the imaginary axis
//! θ = iu for `z = θ/(iπ)` (u/π = z) and `z = θ/(2πi)` (u/π = 2z), the real
//! axis for `z = θ`. Barnes G(w) has zeros at w = −m of order m + 1
//! (DLMF 5.17). The standard block f_α has poles at u/π ≡ α, 1 − α and
//! zeros at u/π ≡ −α, 1 + α (mod 2). The orders are added up over all
//! pieces at each point, so a numerator pole that meets a denominator pole
//! is reported as cancelled, not as a pole. Coincidences are decided exactly
//! when the coefficients are rational, and to a relative 10⁻⁹ otherwise.
//!
//! **Confirmation and discovery.** Every enumerated point is confirmed by
//! the argument principle on a small circle at double precision; expression
//! pieces, which cannot be enumerated, are covered by a scan of the axis for
//! sharp extrema of log |S|, each confirmed and located the same way. The
//! leading Laurent coefficient (the residue of a simple pole) comes from the
//! trapezoidal rule on the circle at the working precision, with an error
//! estimate from halving the number of nodes.

pub mod contour;
mod enumerate;

pub use enumerate::{enumerate, Axis, Singular};

use crate::error::{Error, Result};
use crate::factor::Method;
use crate::model::Model;
use crate::num::ComplexField;
use crate::precision::Prec;
use num_complex::Complex64;
use rug::Complex;
use std::f64::consts::PI;

/// A pole or zero with what is known about it.
#[derive(Clone, Debug)]
pub struct PointReport {
    /// The point, its enumerated order and the pieces that contribute.
    pub point: Singular,
    /// The order found by the argument principle (None if the circle could
    /// not be evaluated).
    pub numerical_order: Option<i64>,
    /// The coefficient of (θ − θ₀)^(−order): the residue of a simple pole.
    pub leading: Option<(Complex64, f64)>,
    /// The same coefficient at the working precision.
    pub leading_full: Option<Complex>,
    /// Whether it lies in the physical strip 0 < Im θ < π.
    pub in_strip: bool,
    /// For a simple pole on the imaginary axis: `−i·Res` (real for a
    /// real-analytic factor) — positive is the usual sign of a bound state
    /// in the direct channel.
    pub neg_i_residue: Option<f64>,
    /// `m_b = sqrt(m₁² + m₂² + 2 m₁ m₂ cos u)` for a simple pole in the
    /// strip, when masses are given.
    pub mass: Option<f64>,
}

/// Options for [`analyse`].
#[derive(Clone, Debug)]
pub struct PoleOptions {
    /// The window on the axis: u/π for the imaginary axis, θ for the real one.
    pub window: (f64, f64),
    /// Precision of the leading coefficients.
    pub prec: Prec,
    /// The masses of the scattering particles, for bound-state readings.
    pub masses: Option<(f64, f64)>,
}

/// Poles and zeros of a factor in a window, enumerated, confirmed and
/// with leading coefficients; see the module documentation.
///
/// ```
/// use dressing::model::Model;
/// use dressing::poles::{analyse, PoleOptions};
/// use dressing::Prec;
/// let m = Model::from_toml(r#"
///     [[factor]]
///     name = "S"
///     [[factor.piece]]
///     kind = "cdd"
///     blocks = [ { alpha = "2/5" } ]
/// "#, "m.toml").unwrap();
/// let opts = PoleOptions { window: (0.0, 1.0), prec: Prec::digits(20).unwrap(), masses: Some((1.0, 1.0)) };
/// let (points, _) = analyse(&m, "S", &opts).unwrap();
/// // poles at θ = 2πi/5 and 3πi/5
/// assert_eq!(points.len(), 2);
/// assert!(points[0].neg_i_residue.unwrap() > 0.0);
/// ```
pub fn analyse(
    model: &Model,
    factor: &str,
    opts: &PoleOptions,
) -> Result<(Vec<PointReport>, Vec<Singular>)> {
    let (lo, hi) = opts.window;
    if !(lo.is_finite() && hi.is_finite()) || lo >= hi {
        return Err(Error::Domain {
            function: "poles",
            message: format!(
                "the window {lo}:{hi} is empty or inverted; give FROM:TO with FROM < TO"
            ),
        });
    }
    if let Some((m1, m2)) = opts.masses {
        if !(m1 > 0.0 && m2 > 0.0 && m1.is_finite() && m2.is_finite()) {
            return Err(Error::Domain {
                function: "poles",
                message: "masses must be positive and finite, e.g. --masses 1,1".into(),
            });
        }
    }
    let f = model.factor(factor)?;
    // Enumerate a wider window so that circle radii see the neighbours
    // just outside the requested one; report only the requested window.
    let pad = 0.25 * (hi - lo) + 0.1;
    let (all, all_cancelled, has_expressions) = enumerate(model, f, (lo - pad, hi + pad))?;
    let inside = |s: &Singular| s.coordinate >= lo && s.coordinate <= hi;
    let (mut points, outside): (Vec<Singular>, Vec<Singular>) = all.into_iter().partition(inside);
    let cancelled: Vec<Singular> = all_cancelled
        .iter()
        .filter(|s| inside(s))
        .cloned()
        .collect();
    let neighbours: Vec<Singular> = outside.into_iter().chain(all_cancelled).collect();
    let log_f = |t: Complex64| {
        f.log_sum::<Complex64>(&t, Prec::DOUBLE, Method::Auto)
            .ok()
            .map(|s| s.log.value)
    };
    // Discovery on the imaginary axis for pieces that cannot be enumerated.
    if has_expressions {
        for (u, order) in scan_axis(&log_f, opts.window) {
            if !points.iter().any(|p| (p.coordinate - u).abs() < 1e-6) {
                points.push(Singular {
                    axis: Axis::Imaginary,
                    coordinate: u,
                    exact: None,
                    order,
                    contributions: vec![("expression (found by scan)".into(), order)],
                });
            }
        }
        points.sort_by(|a, b| a.coordinate.total_cmp(&b.coordinate));
    }
    // With expression pieces the enumerated orders are incomplete: the
    // argument principle decides, and points whose total order is 0 are
    // cancellations.
    let mut cancelled = cancelled;
    if has_expressions {
        let snapshot = points.clone();
        let mut kept = Vec::new();
        for (i, mut p) in points.into_iter().enumerate() {
            let r = (0.25 * gap_of(&snapshot, &neighbours, i)).min(0.05);
            if let Some((w, _)) = contour::winding(&log_f, p.theta(), r, 256) {
                if w != p.order {
                    p.contributions
                        .push(("expression pieces".into(), w - p.order));
                    p.order = w;
                }
            }
            if p.order == 0 {
                cancelled.push(p);
            } else {
                kept.push(p);
            }
        }
        points = kept;
    }
    use rayon::prelude::*;
    let report = |(i, p): (usize, &Singular)| -> PointReport {
        // Circle radius: well inside the gap to the neighbours.
        let gap = gap_of(&points, &neighbours, i).min(1.0);
        let r = (0.25 * gap).min(0.05);
        let theta0 = p.theta();
        let numerical_order = contour::winding(&log_f, theta0, r, 256).map(|(w, _)| w);
        let digits = opts.prec.decimal_digits().max(1) as f64;
        // Geometric convergence at rate r/gap ≤ 1/4: 1.66 nodes per digit.
        let rate = r / gap;
        let n = (((digits + 2.0) * 10f64.ln() / -rate.ln()).ceil() as usize + 8).min(4096) & !1;
        let mut leading_full = None;
        let leading = if opts.prec.bits() <= 53 {
            let g = |t: &Complex64| {
                f.log_sum::<Complex64>(t, Prec::DOUBLE, Method::Auto)
                    .ok()
                    .map(|s| s.log.value.exp())
            };
            contour::laurent_coefficient(&g, &theta0, r, p.order, n, rate)
        } else {
            let wp = opts.prec.bits() + 32;
            let c0 = p.theta_mp(wp);
            // Values 16 bits beyond the request, so that their rounding,
            // amplified by |S| ~ |Res|/r on the circle, stays below it.
            let inner = Prec::from_bits(opts.prec.bits() as u64 + 16).unwrap_or(opts.prec);
            let g = |t: &Complex| {
                f.log_sum::<Complex>(t, inner, Method::Auto)
                    .ok()
                    .map(|s| s.log.value.exp())
            };
            contour::laurent_coefficient(&g, &c0, r, p.order, n, rate).map(|(v, e)| {
                let d = Complex64::new(v.re_f64(), v.im_f64());
                leading_full = Some(v);
                (d, e)
            })
        };
        let in_strip =
            matches!(p.axis, Axis::Imaginary) && p.coordinate > 0.0 && p.coordinate < 1.0;
        let neg_i_residue = match (p.order, p.axis, &leading) {
            (1, Axis::Imaginary, Some((res, _))) => Some(res.im),
            _ => None,
        };
        let mass = match (opts.masses, p.order, in_strip) {
            (Some((m1, m2)), 1, true) => {
                let u = PI * p.coordinate;
                Some(
                    (m1 * m1 + m2 * m2 + 2.0 * m1 * m2 * u.cos())
                        .max(0.0)
                        .sqrt(),
                )
            }
            _ => None,
        };
        PointReport {
            point: p.clone(),
            numerical_order,
            leading_full: leading_full
                .or_else(|| leading.map(|(c, _)| Complex::with_val(53, (c.re, c.im)))),
            leading,
            in_strip,
            neg_i_residue,
            mass,
        }
    };
    let out: Vec<PointReport> = points.par_iter().enumerate().map(report).collect();
    Ok((out, cancelled))
}

/// Distance from point `i` to the nearest other enumerated point.
fn gap_of(points: &[Singular], cancelled: &[Singular], i: usize) -> f64 {
    let p = &points[i];
    points
        .iter()
        .enumerate()
        .filter(|(j, _)| *j != i)
        .map(|(_, q)| q)
        .chain(cancelled.iter())
        .map(|q| (q.coordinate - p.coordinate).abs() * p.axis.unit())
        .fold(f64::INFINITY, f64::min)
}

/// Sharp extrema of log |f| on the imaginary axis in the window (u/π),
/// each confirmed and located by the argument principle: `(u/π, order)`.
pub fn scan_axis(
    log_f: &dyn Fn(Complex64) -> Option<Complex64>,
    window: (f64, f64),
) -> Vec<(f64, i64)> {
    let n = (600.0 * (window.1 - window.0)).ceil().max(60.0) as usize;
    let at = |j: usize| window.0 + (window.1 - window.0) * j as f64 / n as f64;
    let lm: Vec<Option<f64>> = (0..=n)
        .map(|j| log_f(Complex64::new(0.0, PI * at(j))).map(|l| l.re))
        .collect();
    let mut cands = Vec::new();
    for j in 1..n {
        match (lm[j - 1], lm[j], lm[j + 1]) {
            (Some(a), Some(b), Some(c))
                if (b > a && b > c && b > 3.0) || (b < a && b < c && b < -3.0) =>
            {
                cands.push(at(j))
            }
            (_, None, _) => cands.push(at(j)),
            _ => {}
        }
    }
    let r = 2.0 * PI * (window.1 - window.0) / n as f64;
    let mut out: Vec<(f64, i64)> = Vec::new();
    for u in cands {
        if let Some((w, p)) = contour::winding(log_f, Complex64::new(0.0, PI * u), r, 256) {
            // A second, much smaller circle about the first estimate: the
            // midpoint rule's error in the centre scales with the radius.
            let p = match contour::winding(log_f, p, r * 1e-3, 128) {
                Some((w2, p2)) if w2 == w => p2,
                _ => p,
            };
            let u = p.im / PI;
            if w != 0 && u > window.0 && u < window.1 && !out.iter().any(|q| (q.0 - u).abs() < 1e-9)
            {
                out.push((u, w));
            }
        }
    }
    out
}

/// Zeros minus poles (with multiplicity) of a factor inside the rectangle
/// `re.0 < Re θ < re.1`, `im.0 < Im θ < im.1`, by the argument principle:
/// the change of `Im log S` around the boundary, continued at double
/// precision as in [`Model::evaluate`]. A pole or zero on (or within about
/// 2⁻⁴⁰ of) the boundary is an error asking to move the rectangle.
///
/// ```
/// use dressing::model::Model;
/// let m = Model::from_toml("[[factor]]\nname = \"f\"\n[[factor.piece]]\nkind = \"cdd\"\nblocks = [{ alpha = \"1/3\" }]\n", "m.toml").unwrap();
/// // Two poles (iπ/3, 2iπ/3) in the physical strip, no zeros.
/// assert_eq!(dressing::poles::count_in_rectangle(&m, "f", (-1.0, 1.0), (0.1, 3.0)).unwrap(), -2);
/// ```
pub fn count_in_rectangle(
    model: &Model,
    factor: &str,
    re: (f64, f64),
    im: (f64, f64),
) -> Result<i64> {
    if !(re.0 < re.1 && im.0 < im.1 && [re.0, re.1, im.0, im.1].iter().all(|v| v.is_finite())) {
        return Err(Error::Domain {
            function: "poles",
            message: "the rectangle is empty, inverted or not finite; give RE0:RE1,IM0:IM1 with \
                      RE0 < RE1 and IM0 < IM1"
                .into(),
        });
    }
    let f = model.factor(factor)?;
    let eval = |t: Complex64| f.branch_sample(t);
    let corners = [
        Complex64::new(re.0, im.0),
        Complex64::new(re.1, im.0),
        Complex64::new(re.1, im.1),
        Complex64::new(re.0, im.1),
    ];
    let mut phase = eval(corners[0])
        .map_err(|e| boundary_error(corners[0], e))?
        .0
        .im;
    let start = phase;
    for k in 0..4 {
        let (a, b) = (corners[k], corners[(k + 1) % 4]);
        phase =
            crate::model::branch::straight(&eval, a, phase, b).map_err(|e| boundary_error(a, e))?;
    }
    Ok(((phase - start) / (2.0 * PI)).round() as i64)
}

fn boundary_error(at: Complex64, e: Error) -> Error {
    Error::Domain {
        function: "poles",
        message: format!(
            "the rectangle's boundary passes through or very near a pole or zero (edge from \
             θ = {}{:+}i; {e}); move the rectangle",
            at.re, at.im
        ),
    }
}
