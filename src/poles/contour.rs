//! Contour integrals on small circles: the argument principle (order of a
//! pole or zero, and its position), and the leading Laurent coefficient by
//! the trapezoidal rule, which converges geometrically for periodic
//! analytic integrands (common practice; Trefethen & Weideman, SIAM Rev. 56
//! (2014) 385).

use crate::num::{ComplexField, RealField};
use num_complex::Complex64;
use std::f64::consts::PI;

/// Order (poles > 0, zeros < 0) of the singular points inside the circle
/// `|θ − c| = r`, from the winding of `log f` (given on its principal
/// branch; jumps of 2π between samples are removed), and the centre of mass
/// `(1/2πi w)∮ θ d log f`, which is the point itself when there is one.
/// `None` where `log f` could not be evaluated on the circle.
pub fn winding(
    log_f: &dyn Fn(Complex64) -> Option<Complex64>,
    c: Complex64,
    r: f64,
    n: usize,
) -> Option<(i64, Complex64)> {
    let pts: Vec<(Complex64, Complex64)> = (0..=n)
        .map(|j| {
            let t = c + Complex64::from_polar(r, 2.0 * PI * j as f64 / n as f64);
            log_f(t).map(|l| (t, l))
        })
        .collect::<Option<_>>()?;
    let mut turn = 0.0;
    let mut moment = Complex64::new(0.0, 0.0);
    for w in pts.windows(2) {
        let mut d = w[1].1 - w[0].1;
        d.im -= 2.0 * PI * (d.im / (2.0 * PI)).round();
        turn += d.im;
        moment += 0.5 * (w[0].0 + w[1].0) * d;
    }
    let wind = (turn / (2.0 * PI)).round() as i64;
    if wind == 0 {
        return Some((0, c));
    }
    let at = moment / Complex64::new(0.0, 2.0 * PI * wind as f64);
    // d log f winds −2πi around a pole: the order is −wind.
    Some((-wind, at))
}

/// The coefficient of `(θ − c)^(−order)` in the Laurent series of `f` at
/// `c` (the residue for a simple pole, `order = 1`; the leading Taylor
/// coefficient of a zero of order m, `order = −m`), by the `n`-point
/// trapezoidal rule on `|θ − c| = r`, and an error estimate. The rule's
/// error falls like `ρⁿ`, ρ = r/R, where R is the distance to the nearest
/// other singular point; the difference `δ` from the rule on every other
/// node (error ~ ρ^(n/2)) then gives the estimate `10·δ·ρ^(n/2)`, plus the
/// rounding level of the values summed (largest term × 2^−bits × n).
/// `rate` is ρ (pass 1 to get δ itself).
pub fn laurent_coefficient<C: ComplexField>(
    f: &dyn Fn(&C) -> Option<C>,
    c: &C,
    r: f64,
    order: i64,
    n: usize,
    rate: f64,
) -> Option<(C, f64)> {
    let wp = c.prec();
    let pi = C::Real::pi(wp);
    let mut full = C::from_i64(0, wp);
    let mut half = C::from_i64(0, wp);
    let rr = C::Real::from_f64(r, wp);
    // Largest |term| and the fewest bits a value carried: the rounding level.
    let mut big = f64::NEG_INFINITY;
    let mut bits = u32::MAX;
    for j in 0..n {
        // e^{iφ}, φ = 2πj/n
        let phi = pi.clone().mul_i64(2 * j as i64).div_i64(n as i64);
        let e = C::from_reals(C::Real::from_i64(0, wp), phi).exp();
        let d = e.mul_real(&rr);
        let v = f(&(c.clone() + &d))?;
        bits = bits.min(v.prec());
        let term = v * &d.powi(order);
        big = big.max(term.log2_abs());
        if j % 2 == 0 {
            half += &term;
        }
        full += &term;
    }
    let full = full.div_i64(n as i64);
    let half = half.div_i64((n / 2) as i64);
    let delta = (half - &full).log2_abs().exp2();
    // Values rounded to `bits` bits, n of them summed.
    let rounding = (big - bits as f64 + (n as f64).log2() + 1.0).exp2();
    let err = 10.0 * delta * rate.clamp(0.0, 1.0).powi((n / 2) as i32) + rounding;
    Some((full, err))
}
