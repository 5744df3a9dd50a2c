//! The colouring of a phase portrait: hue from arg S, lightness from log|S|.

use num_complex::Complex64;
use std::f64::consts::{PI, TAU};

/// The colour of points where the factor could not be evaluated (poles,
/// zeros, failures): a neutral grey, which no value of S is given (every
/// other colour is fully saturated).
pub const NEUTRAL: [u8; 3] = [150, 150, 150];

/// Width in log|S| of one lightness band of the portrait: the band edges are
/// the level lines |S| = e^{(n + 1/2)·BAND}, n integer.
pub const BAND: f64 = 0.5;

/// The colour of a point of a phase portrait where `log S = log_s`.
///
/// * **Hue** is arg S = Im log S, taken modulo 2π: red at arg S = 0, yellow
///   at π/3, green at 2π/3, cyan at π, blue at 4π/3 (= −2π/3), magenta at
///   5π/3. Going once around a simple zero counter-clockwise runs through the
///   colours in that order; around a simple pole, in the reverse order.
/// * **Lightness** is a strictly increasing function of log|S| = Re log S:
///   dark where |S| is small, pale where it is large, mid-tone (pure hue) at
///   |S| = 1. It rises in terraces of width [`BAND`] in log|S| — steeply
///   near the level lines |S| = e^{(n+1/2)·BAND}, slowly in between — so
///   the level lines of |S| show as contour-like bands while the lightness
///   still never decreases as |S| grows.
///
/// A NaN or infinite `log_s` gives [`NEUTRAL`].
///
/// ```
/// use dressing::plot::colour_of;
/// use num_complex::Complex64;
/// assert_eq!(colour_of(Complex64::new(0.0, 0.0)), [255, 0, 0]); // S = 1: pure red
/// let dark = colour_of(Complex64::new(-3.0, 0.0));
/// let pale = colour_of(Complex64::new(3.0, 0.0));
/// assert!(dark[0] < 255 && pale[1] > 0 && pale[2] > 0);
/// ```
pub fn colour_of(log_s: Complex64) -> [u8; 3] {
    if !log_s.re.is_finite() || !log_s.im.is_finite() {
        return NEUTRAL;
    }
    let hue = log_s.im.rem_euclid(TAU) / TAU;
    hsl_to_rgb(hue, 1.0, lightness(log_s.re))
}

/// The lightness (0 to 1) given to log|S| = `x`: strictly increasing, from
/// 0.1 as x → −∞ to 0.9 as x → +∞, 0.5 at x = 0.
pub fn lightness(x: f64) -> f64 {
    // x − c·(BAND/2π)·sin(2πx/BAND), c < 1, is strictly increasing with
    // derivative between 1 − c and 1 + c: terraces of width BAND.
    const C: f64 = 0.9;
    let w = TAU / BAND;
    let t = x - C * (w * x).sin() / w;
    0.5 + 0.4 * (2.0 / PI) * (t / 3.0).atan()
}

/// HSL (each in [0, 1]; hue wraps) to 8-bit RGB.
pub(crate) fn hsl_to_rgb(h: f64, s: f64, l: f64) -> [u8; 3] {
    let l = l.clamp(0.0, 1.0);
    let s = s.clamp(0.0, 1.0);
    let q = if l < 0.5 {
        l * (1.0 + s)
    } else {
        l + s - l * s
    };
    let p = 2.0 * l - q;
    let channel = |t: f64| {
        let t = t.rem_euclid(1.0);
        let v = if t < 1.0 / 6.0 {
            p + (q - p) * 6.0 * t
        } else if t < 0.5 {
            q
        } else if t < 2.0 / 3.0 {
            p + (q - p) * (2.0 / 3.0 - t) * 6.0
        } else {
            p
        };
        (v * 255.0).round().clamp(0.0, 255.0) as u8
    };
    [channel(h + 1.0 / 3.0), channel(h), channel(h - 1.0 / 3.0)]
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn primaries() {
        assert_eq!(hsl_to_rgb(0.0, 1.0, 0.5), [255, 0, 0]);
        assert_eq!(hsl_to_rgb(1.0 / 3.0, 1.0, 0.5), [0, 255, 0]);
        assert_eq!(hsl_to_rgb(2.0 / 3.0, 1.0, 0.5), [0, 0, 255]);
    }

    #[test]
    fn lightness_is_increasing() {
        let mut last = lightness(-50.5);
        for j in -5000..5000 {
            let l = lightness(j as f64 * 0.01);
            assert!(l > last, "at {}", j as f64 * 0.01);
            last = l;
        }
        assert!((lightness(0.0) - 0.5).abs() < 1e-15);
    }
}
