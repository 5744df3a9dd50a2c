//! The continuous branch of `log S`.
//!
//! A factor's logarithm is computed as the sum of its pieces' principal
//! logarithms, which jumps by multiples of 2πi wherever one of them crosses
//! its cut. The branch users want is the one continuous along a path: at
//! the model's base point θ_b it is the sum of principal logarithms, and
//! from there it is continued along the straight segment to θ (or along a
//! polyline through a list of points). Continuation is done at double
//! precision, where it is cheap: the segment is bisected until, on every
//! piece, the phase changes by less than 0.5 rad in each half and the two
//! halves agree with the whole (so no full turn can hide between samples).
//! Poles and zeros often sit on the segment itself (on the imaginary axis,
//! for θ = iu); then the segment is displaced by η = 10⁻³(1 + |to − from|)
//! to the right (+Re θ; upwards, +Im θ, for a horizontal segment) and joined
//! to its ends by short steps, so singular points on the segment are passed
//! on the left and points on the imaginary axis are reached from Re θ > 0.
//! The high-precision value is then moved by the multiple of 2πi that puts
//! it nearest the continued double value.

use crate::error::{Error, Result};
use num_complex::Complex64;
use std::f64::consts::PI;

/// Deepest bisection: segments shorter than 2⁻⁴⁰ of the path mean the path
/// runs into a pole or zero.
const MAX_DEPTH: u32 = 40;
/// Segments the path is cut into before any bisection.
const INITIAL_SEGMENTS: usize = 8;
/// Largest phase change accepted on one half-segment, in radians (without
/// the kernel).
const MAX_STEP: f64 = 0.5;
/// Largest disagreement, mod 2π, between the phase change and the kernel's
/// trapezoidal integral over a half-segment, in radians.
const MAX_RESIDUAL: f64 = 0.25;

/// A factor at double precision on the path: the sum of principal logs and,
/// when available, the kernel `d/dθ log S`.
pub(crate) type Sample = (Complex64, Option<Complex64>);

/// What continuation evaluates.
pub(crate) type LogEval<'a> = dyn Fn(Complex64) -> Result<Sample> + Sync + 'a;

fn wrap(d: f64) -> f64 {
    d - 2.0 * PI * (d / (2.0 * PI)).round()
}

/// Continues `Im log` from `from` (where it is `im_from`, on the branch
/// being continued) to `to` along the straight segment. `eval` gives the
/// sum of principal logs at double precision. Returns the continued
/// imaginary part at `to`.
pub(crate) fn continue_phase(
    eval: &LogEval,
    from: Complex64,
    im_from: f64,
    to: Complex64,
) -> Result<f64> {
    match straight(eval, from, im_from, to) {
        Ok(im) => Ok(im),
        Err(first) => {
            let d = to - from;
            let eta = 1e-3 * (1.0 + d.norm());
            let shift = if d.re.abs() > 1e3 * d.im.abs() {
                Complex64::new(0.0, eta)
            } else {
                Complex64::new(eta, 0.0)
            };
            let a = straight(eval, from, im_from, from + shift);
            let b = a.and_then(|im| straight(eval, from + shift, im, to + shift));
            b.and_then(|im| straight(eval, to + shift, im, to))
                .map_err(|_| first)
        }
    }
}

pub(crate) fn straight(
    eval: &LogEval,
    from: Complex64,
    im_from: f64,
    to: Complex64,
) -> Result<f64> {
    let at = |t: f64| from + (to - from) * t;
    let len = to - from;
    // (Im log, d/dt log) at t ∈ [0, 1].
    let phase = |t: f64| -> Result<(f64, Option<Complex64>)> {
        eval(at(t))
            .map(|(l, k)| (l.im, k.map(|k| k * len)))
            .map_err(|e| match e {
                Error::Pole { .. } | Error::Zero { .. } | Error::Domain { .. } => Error::Domain {
                    function: "branch continuation",
                    message: format!(
                        "the straight path from θ = {} to θ = {} meets a singular point near \
                         θ = {} ({e}); choose another base point (`base` in [rapidity]) so the \
                         path avoids it",
                        show(from),
                        show(to),
                        show(at(t))
                    ),
                },
                other => other,
            })
    };
    let mut im = im_from;
    let mut t0 = 0.0;
    let mut p0 = phase(0.0)?;
    for s in 1..=INITIAL_SEGMENTS {
        let t1 = s as f64 / INITIAL_SEGMENTS as f64;
        let p1 = phase(t1)?;
        im += segment(&phase, t0, p0, t1, p1, 0)?;
        t0 = t1;
        p0 = p1;
    }
    Ok(im)
}

/// A phase sample: `Im log` and, when known, `d/dt log` along the path.
type PhaseAt = (f64, Option<Complex64>);

/// The change of the phase over a half-segment of length `dt`, when the
/// kernel decides it: `|dt·k| < 1` at both ends and the wrapped change
/// within `MAX_RESIDUAL` of the trapezoidal estimate.
fn decided(a: PhaseAt, b: PhaseAt, dt: f64) -> Option<f64> {
    let (ka, kb) = (a.1?, b.1?);
    if (ka * dt).norm() >= 1.0 || (kb * dt).norm() >= 1.0 {
        return None;
    }
    let estimate = ((ka + kb) * (0.5 * dt)).im;
    let residual = wrap(b.0 - a.0 - estimate);
    (residual.abs() < MAX_RESIDUAL).then_some(estimate + residual)
}

/// The continuous change of the phase from t0 to t1.
fn segment(
    phase: &dyn Fn(f64) -> Result<PhaseAt>,
    t0: f64,
    p0: PhaseAt,
    t1: f64,
    p1: PhaseAt,
    depth: u32,
) -> Result<f64> {
    let tm = 0.5 * (t0 + t1);
    let pm = phase(tm)?;
    let dt = 0.5 * (t1 - t0);
    if p0.1.is_some() && pm.1.is_some() && p1.1.is_some() {
        if let (Some(a), Some(b)) = (decided(p0, pm, dt), decided(pm, p1, dt)) {
            return Ok(a + b);
        }
    } else {
        let (d1, d2, d) = (wrap(pm.0 - p0.0), wrap(p1.0 - pm.0), wrap(p1.0 - p0.0));
        if d1.abs() < MAX_STEP && d2.abs() < MAX_STEP && (d1 + d2 - d).abs() < 1e-9 {
            return Ok(d1 + d2);
        }
    }
    if depth >= MAX_DEPTH {
        return Err(Error::Domain {
            function: "branch continuation",
            message: "the phase turns too fast along the path (it passes very close to a pole \
                      or zero); choose another base point (`base` in [rapidity]) or another \
                      point"
                .into(),
        });
    }
    Ok(segment(phase, t0, p0, tm, pm, depth + 1)? + segment(phase, tm, pm, t1, p1, depth + 1)?)
}

fn show(z: Complex64) -> String {
    format!("{}{:+}i", z.re, z.im)
}

/// The multiple of 2π to add to `principal_im` to come nearest `continued_im`.
pub(crate) fn turns(principal_im: f64, continued_im: f64) -> i64 {
    ((continued_im - principal_im) / (2.0 * PI)).round() as i64
}

#[cfg(test)]
mod tests {
    use super::*;

    /// e^{iωθ} with ω = 4π + 0.2 per unit: every sample of an 8-piece grid and
    /// its halvings sees a change of about 0.2 mod 2π, so sampling alone
    /// would follow a phase of 0.2 rad per unit; the kernel iω says it is
    /// 4π + 0.2. Common practice: phase unwrapping with the derivative.
    #[test]
    fn a_phase_turning_by_whole_turns_between_samples_is_followed() {
        let w = 8.0 * (4.0 * PI + 0.2);
        let f = |t: Complex64| -> Result<Sample> {
            let l = Complex64::new(0.0, w) * t;
            let principal = Complex64::new(0.0, wrap(l.im));
            Ok((principal, Some(Complex64::new(0.0, w))))
        };
        let im =
            continue_phase(&f, Complex64::new(0.0, 0.0), 0.0, Complex64::new(1.0, 0.0)).unwrap();
        assert!((im - w).abs() < 1e-9, "{im} vs {w}");
    }

    /// log of z ↦ z² − 1 … as the principal log of (θ − 1)(θ + 1)·… : the
    /// product of principal logs of (θ − a) around the unit circle gains 2π
    /// per enclosed zero. Common practice: the argument principle.
    #[test]
    fn winds_around_zeros() {
        let f = |t: Complex64| -> Result<Sample> { Ok(((t - 0.5).ln() + (t + 0.5).ln(), None)) };
        // Along a path from 2i down to −2i passing left of both zeros:
        let from = Complex64::new(-1.0, 2.0);
        let im0 = f(from).unwrap().0.im;
        let mid = continue_phase(&f, from, im0, Complex64::new(-1.0, -2.0)).unwrap();
        let end = continue_phase(
            &f,
            Complex64::new(-1.0, -2.0),
            mid,
            Complex64::new(1.0, -2.0),
        )
        .unwrap();
        let back =
            continue_phase(&f, Complex64::new(1.0, -2.0), end, Complex64::new(1.0, 2.0)).unwrap();
        let closed = continue_phase(&f, Complex64::new(1.0, 2.0), back, from).unwrap();
        // counter-clockwise around two zeros: +4π
        assert!((closed - im0 - 4.0 * PI).abs() < 1e-12, "{closed} {im0}");
    }

    /// A zero on the segment itself is passed on its left: the path is
    /// moved to Re θ > 0, so arg(θ − i/2) goes −π/2 → 0 → π/2.
    #[test]
    fn singular_point_on_the_segment_is_passed_on_the_left() {
        let f = |t: Complex64| -> Result<Sample> {
            if (t - Complex64::new(0.0, 0.5)).norm() == 0.0 {
                return Err(Error::Zero {
                    function: "test",
                    order: 1,
                    at: String::new(),
                });
            }
            let d = t - Complex64::new(0.0, 0.5);
            Ok((d.ln(), Some(1.0 / d)))
        };
        let from = Complex64::new(0.0, 0.0);
        let im = continue_phase(&f, from, f(from).unwrap().0.im, Complex64::new(0.0, 2.0)).unwrap();
        assert!((im - PI / 2.0).abs() < 1e-12, "{im}");
    }
}
