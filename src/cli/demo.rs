//! `dressing demo`: the built-in demonstration.

use super::agreement_digits;
use crate::num::ComplexField;
use crate::precision::Prec;
use crate::special;
use rug::Complex;
use std::fmt::Write as _;

/// The built-in demonstration. Until the scalar-factor layers land it shows
/// the numeric core: values with error estimates at two precisions, and
/// identities checked to the digits asked for.
pub(crate) fn demo() -> String {
    let mut out = String::new();
    let _ = writeln!(
        out,
        "dressing demo: the numeric core (special functions with error estimates) and a gamma-product factor\n"
    );
    let points = [(0.5, 3.0), (-7.3, 0.4), (2.0, 1e-8)];
    for digits in [15u64, 50] {
        let prec = Prec::digits(digits).expect("valid");
        for &(x, y) in &points {
            let z = Complex::with_val(prec.bits() + 32, (x, y));
            match special::log_gamma(&z, prec) {
                Ok(r) => {
                    let _ = writeln!(
                        out,
                        "log Γ({x}{y:+}i) at {digits} digits = {}\n    error estimate {}",
                        r.value.to_decimal(digits as usize),
                        r.radius
                    );
                }
                Err(e) => {
                    let _ = writeln!(out, "log Γ({x}{y:+}i): {e}");
                }
            }
        }
    }
    let prec = Prec::digits(100).expect("valid");
    let p = prec.bits() + 32;
    let half = Complex::with_val(p, 0.5);
    let g = special::gamma(&half, prec).map(|g| g.value);
    let pi = Complex::with_val(p, rug::float::Constant::Pi);
    if let Ok(g) = g {
        let agree = agreement_digits(&Complex::with_val(p, &g * &g), &pi);
        let _ = writeln!(
            out,
            "\nΓ(1/2)² = π (DLMF 5.4.6): agrees to {agree:.0} digits at 100 requested"
        );
    }
    if let Ok(psi) = special::digamma(&Complex::with_val(p, 1), prec) {
        let euler = Complex::with_val(p, -rug::Float::with_val(p, rug::float::Constant::Euler));
        let agree = agreement_digits(&psi.value, &euler);
        let _ = writeln!(
            out,
            "ψ(1) = −γ (DLMF 5.4.12): agrees to {agree:.0} digits at 100 requested"
        );
    }
    demo_factor(&mut out);
    out
}

/// The demo's factor section: a published factor (the sine-Gordon soliton
/// factor, a check rather than a model of ours) evaluated in and outside the
/// strip of its integral, by both representations.
fn demo_factor(out: &mut String) {
    use crate::factor::{known::sine_gordon_soliton, Method};
    let xi = 2.0 * std::f64::consts::PI / 7.0;
    let Ok(f) = sine_gordon_soliton(xi) else {
        return;
    };
    let _ = writeln!(
        out,
        "\nGamma-product factor (a published check): sine-Gordon soliton factor, ξ = 2π/7"
    );
    if let Some((lo, hi)) = f.strip() {
        let _ = writeln!(
            out,
            "integral representation converges for {lo:.4} < Im θ < {hi:.4}"
        );
    }
    let prec = Prec::digits(30).expect("valid");
    for (x, y) in [(0.7, 0.2), (0.4, 1.5)] {
        let theta = Complex::with_val(prec.bits() + 32, (x, y));
        let p = f.log_value(&theta, prec, Method::Product);
        let i = f.log_value(&theta, prec, Method::Integral);
        match (p, i) {
            (Ok(p), Ok(i)) => {
                let agree = agreement_digits(&p.log.value, &i.log.value);
                let _ = writeln!(
                    out,
                    "log(−S₀(θ = {x}{y:+}i)) = {}\n    error estimate {}; {}; {} agrees to {agree:.0} digits",
                    p.log.value.to_decimal(30),
                    p.log.radius,
                    p.representation,
                    i.representation
                );
            }
            (Err(e), _) | (_, Err(e)) => {
                let _ = writeln!(out, "θ = {x}{y:+}i: {e}");
            }
        }
    }
}
