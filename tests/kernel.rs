//! The kernel `d/dθ log S` (the TBA kernel is `φ = −i d/dθ log S`),
//! computed analytically piece by piece, against independent methods:
//! a published integral differentiated under the integral sign, closed
//! forms from the TBA literature, and high-precision central differences
//! of `log S` itself.

mod common;

use common::bits;
use dressing::factor::{Method, Scale};
use dressing::model::Model;
use dressing::num::ComplexField;
use dressing::quadrature::{default_rule, Domain};
use dressing::{Approx, Error, Prec};
use num_complex::Complex64;
use rug::float::Constant;
use rug::{Complex, Float};

fn lantern() -> Model {
    Model::load(concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/examples/lantern.toml"
    ))
    .unwrap()
}

fn sine_gordon_model() -> Model {
    Model::load(concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/tests/data/models/sine-gordon.toml"
    ))
    .unwrap()
}

/// `d/dθ log S` by Richardson-extrapolated central differences of the sum
/// of principal logs at `digits + 60` digits, step `h = 10^−(digits/2+12)`:
/// `D(h) = (L(θ+h) − L(θ−h))/2h` has error `O(h²)`, and `(4D(h/2) − D(h))/3`
/// error `O(h⁴)`, far below `10^−digits`.
fn numerical_derivative(model: &Model, factor: &str, theta: &Complex, digits: u32) -> Complex {
    let p = bits(digits + 60);
    let prec = Prec::digits(digits as u64 + 60).unwrap();
    let f = model.factor(factor).unwrap();
    let l = |t: &Complex| {
        f.log_sum(t, prec, Method::Product)
            .unwrap()
            .log
            .value
            .with_prec(p)
    };
    let th = theta.with_prec(p);
    let d = |h: &Float| {
        let plus = Complex::with_val(p, &th + h);
        let minus = Complex::with_val(p, &th - h);
        let mut diff = Complex::with_val(p, l(&plus) - l(&minus));
        // The sum of principal logs may jump by 2πi between θ ± h (on the
        // imaginary axis a real negative factor sits on its cut).
        let two_pi = Float::with_val(p, Constant::Pi) * 2u32;
        let k = (diff.imag().to_f64() / two_pi.to_f64()).round();
        diff -= Complex::with_val(p, (0, two_pi * k));
        diff / Float::with_val(p, h * 2u32)
    };
    let h = Float::with_val(p, 10f64.powi(-(digits as i32 / 2 + 12)));
    let h2 = Float::with_val(p, &h / 2u32);
    let (d1, d2) = (d(&h), d(&h2));
    (d2 * 4u32 - d1) / 3u32
}

/// The double-path kernel `d` is within its radius of the 40-digit one,
/// and the radius is at most `rel` relative to max(|kernel|, 1).
fn within_estimate(what: &str, d: &Approx<Complex64>, hi: &Approx<Complex>, rel: f64) {
    let want = Complex64::new(hi.value.real().to_f64(), hi.value.imag().to_f64());
    let err = (d.value - want).norm();
    assert!(
        err <= d.radius.to_f64() + 1e-300,
        "{what}: double {} vs {want}, err {err:e} > radius {}",
        d.value,
        d.radius
    );
    assert!(
        d.radius.to_f64() <= rel * want.norm().max(1.0),
        "{what}: radius {} above {rel:e} relative",
        d.radius
    );
}

fn abs_diff(a: &Complex, b: &Complex) -> f64 {
    let p = a.prec().0.max(b.prec().0);
    Complex::with_val(p, a - b).abs().real().to_f64()
}

#[test]
fn every_piece_kind_agrees_with_a_central_difference_at_30_digits() {
    // sigma: a gamma product; dressed: gamma product and CDD block; lamp:
    // finite Γ, Barnes G and an expression piece. Points inside and outside
    // the integral's strip (|Im θ| < 0.35π for sigma) and on the real line.
    let m = lantern();
    let p = Prec::digits(30).unwrap();
    for factor in ["sigma", "dressed", "lamp"] {
        for (x, y) in [(0.7, 0.2), (-1.3, 0.0), (0.4, 2.1), (2.5, -3.7), (0.0, 0.5)] {
            let theta = Complex::with_val(200, (x, y));
            let k = m.factor(factor).unwrap().log_derivative(&theta, p).unwrap();
            let want = numerical_derivative(&m, factor, &theta, 30);
            let err = abs_diff(&k.value, &want);
            let scale = want.clone().abs().real().to_f64().max(1.0);
            assert!(
                err < 1e-29 * scale,
                "{factor} at {x}+{y}i: kernel {} vs difference {} (err {err:e})",
                k.value.to_decimal(35),
                want.to_decimal(35)
            );
            assert!(
                err <= k.radius.to_f64() + 1e-45 * scale,
                "{factor} at {x}+{y}i: error {err:e} above the estimate {}",
                k.radius
            );
        }
    }
}

#[test]
fn double_path_kernel_is_within_its_estimate_of_the_40_digit_kernel() {
    let m = lantern();
    for factor in ["sigma", "dressed", "lamp"] {
        let f = m.factor(factor).unwrap();
        for (x, y) in [
            (0.0, 0.0),
            (0.3, 0.0),
            (-4.0, 0.0),
            (12.0, 0.0),
            (0.5, 1.4),
            (1.0, -6.0),
        ] {
            let d = f
                .log_derivative(&Complex64::new(x, y), Prec::DOUBLE)
                .unwrap();
            let hi = f
                .log_derivative(&Complex::with_val(200, (x, y)), Prec::digits(40).unwrap())
                .unwrap();
            within_estimate(&format!("{factor} at {x}+{y}i"), &d, &hi, 1e-11);
        }
    }
}

/// `d/dθ log(−S₀) = −i ∫₀^∞ dt sinh(t(π−ξ)/2) cos(θt) / (sinh(ξt/2) cosh(πt/2))`:
/// the integral representation of Zamolodchikov & Zamolodchikov, Ann. Phys.
/// 120 (1979) 253 (the one tests/factor_gamma_product.rs checks the values
/// against), differentiated under the integral sign; valid for
/// `|Im θ| < min(ξ, π)`.
fn zz_kernel(xi: &Float, theta: &Complex, digits: u32) -> Complex {
    let p = bits(digits) + 40;
    let xi_f = Float::with_val(p, xi);
    let pi = Float::with_val(p, Constant::Pi);
    let th = Complex::with_val(p, theta);
    let f = |t: &Float| -> Complex {
        let q = t.prec();
        let num = (Float::with_val(q, Float::with_val(q, &pi - &xi_f) * t) / 2u32).sinh();
        let den = (Float::with_val(q, &xi_f * t) / 2u32).sinh()
            * (Float::with_val(q, &pi * t) / 2u32).cosh();
        Complex::with_val(q, &th * t).cos() * (num / den)
    };
    let r = default_rule()
        .integrate(
            f,
            &Domain::HalfLineExpDecay(Float::new(p)),
            Prec::digits(digits as u64 + 5).unwrap(),
        )
        .unwrap();
    -ComplexField::mul_i(r.value)
}

#[test]
fn sine_gordon_kernel_agrees_with_the_differentiated_integral_at_50_digits() {
    for xi in [0.8, 2.0 * std::f64::consts::PI / 7.0, 2.2] {
        let f = dressing::factor::known::sine_gordon_soliton(xi).unwrap();
        let edge = xi.min(std::f64::consts::PI);
        for (x, y) in [
            (0.7, 0.2),
            (0.0, 0.0),
            (-1.3, -0.35 * edge),
            (3.0, 0.6 * edge),
        ] {
            let theta = Complex::with_val(256, (x, y));
            let k = f.log_derivative(&theta, Prec::digits(50).unwrap()).unwrap();
            let want = zz_kernel(&Float::with_val(64, xi), &theta, 50);
            let err = abs_diff(&k.value, &want);
            assert!(
                err < 1e-49,
                "ξ={xi} θ={x}+{y}i: {} vs {} ({err:e})",
                k.value.to_decimal(52),
                want.to_decimal(52)
            );
        }
    }
    // The same factor from the model file, where it is −S₀ at ξ = 2π/7.
    let m = sine_gordon_model();
    let theta = Complex::with_val(256, (0.45, 0.1));
    let k = m
        .factor("minus_S0")
        .unwrap()
        .log_derivative(&theta, Prec::digits(40).unwrap())
        .unwrap();
    // ξ = 2π/7 exactly, as the file writes it.
    let xi = Float::with_val(300, Constant::Pi) * 2u32 / 7u32;
    let want = zz_kernel(&xi, &theta, 40);
    assert!(
        abs_diff(&k.value, &want) < 1e-39,
        "{} vs {}",
        k.value.to_decimal(42),
        want.to_decimal(42)
    );
}

#[test]
fn block_kernels_match_the_tba_literature() {
    // Lee–Yang, S = f_{2/3}: φ(θ) = −4√3 cosh θ/(1 + 2 cosh 2θ)
    // (Al. B. Zamolodchikov, Nucl. Phys. B342 (1990) 695; from memory).
    // sinh-Gordon, S = f_{−a}... written as 1/f_a with a = B/2:
    // φ(θ) = 4 sin(πa) cosh θ/(cosh 2θ − cos 2πa) (the same paper's form of
    // the block kernel; from memory, sign for the repulsive 1/f_a).
    let m = Model::from_toml(
        r#"
        [parameters]
        a = 0.3
        [[factor]]
        name = "lee_yang"
        [[factor.piece]]
        kind = "cdd"
        blocks = [ { alpha = "2/3" } ]
        [[factor]]
        name = "sinh_gordon"
        [[factor.piece]]
        kind = "cdd"
        blocks = [ { alpha = "a", power = -1 } ]
        "#,
        "tba.toml",
    )
    .unwrap();
    let s3 = 3f64.sqrt();
    let sa = (std::f64::consts::PI * 0.3).sin();
    let ca = (2.0 * std::f64::consts::PI * 0.3).cos();
    for x in [0.0, 0.37, -1.2, 5.0, 40.0, -300.0] {
        let th = Complex64::new(x, 0.0);
        let ly = m
            .factor("lee_yang")
            .unwrap()
            .log_derivative(&th, Prec::DOUBLE)
            .unwrap();
        let phi = ly.value * Complex64::new(0.0, -1.0);
        let want = if x.abs() > 300.0 {
            0.0
        } else {
            -4.0 * s3 * x.cosh() / (1.0 + 2.0 * (2.0 * x).cosh())
        };
        assert!(phi.im.abs() < 1e-300, "φ must be real on the real line");
        assert!(
            (phi.re - want).abs() <= 1e-14 * want.abs().max(1e-300),
            "LY at {x}: {phi} vs {want}"
        );
        let sg = m
            .factor("sinh_gordon")
            .unwrap()
            .log_derivative(&th, Prec::DOUBLE)
            .unwrap();
        let phi = sg.value * Complex64::new(0.0, -1.0);
        let want = 4.0 * sa * x.cosh() / ((2.0 * x).cosh() - ca);
        assert!(
            (phi.re - want).abs() <= 1e-14 * want.abs().max(1e-300),
            "shG at {x}: {phi} vs {want}"
        );
    }
}

#[test]
fn kernel_at_a_pole_is_reported_as_the_pole_of_the_factor() {
    let m = lantern();
    // dressed has the block's pole at θ = iπg/2, g = 7/20.
    let pole = Complex::with_val(200, (0.0, std::f64::consts::PI * 0.175));
    let e = m
        .factor("dressed")
        .unwrap()
        .log_derivative(&Complex64::new(0.0, pole.imag().to_f64()), Prec::DOUBLE)
        .unwrap_err();
    assert!(matches!(e, Error::Pole { order: 1, .. }), "{e}");
    // sigma: Γ(g − z) has its first pole at z = g, θ = iπg.
    let e = m
        .factor("sigma")
        .unwrap()
        .log_derivative(
            &Complex64::new(0.0, std::f64::consts::PI * 0.35),
            Prec::DOUBLE,
        )
        .unwrap_err();
    assert!(matches!(e, Error::Pole { .. } | Error::Zero { .. }), "{e}");
}

#[test]
fn expression_piece_that_cannot_be_differentiated_says_why() {
    // An expression piece calling a model factor cannot be built at all,
    // so the case left is polygamma with an order depending on θ.
    let m = Model::from_toml(
        "[[factor]]\nname = \"S\"\n[[factor.piece]]\nkind = \"expression\"\nvalue = \"polygamma(theta, 2)\"\n",
        "bad.toml",
    )
    .unwrap();
    let e = m
        .factor("S")
        .unwrap()
        .log_derivative(&Complex64::new(1.0, 0.0), Prec::DOUBLE)
        .unwrap_err();
    assert!(e.to_string().contains("cannot be differentiated"), "{e}");
}

#[test]
fn scale_derivative_is_the_slope_of_z() {
    let th = Complex64::new(0.3, -0.2);
    for s in [Scale::Unit, Scale::OverIPi, Scale::Over2PiI] {
        let d: Complex64 = s.dz_dtheta(53);
        assert!((s.z_of(&th) - d * th).norm() < 1e-16);
    }
}

#[test]
fn sine_gordon_double_kernel_from_the_uniform_grid_is_within_its_estimate() {
    // The sine-Gordon integrand is even, so the double path differentiates
    // the uniform-grid integral under the integral sign; the reference is
    // the 40-digit kernel from the product form.
    for xi in [0.8, 2.0 * std::f64::consts::PI / 7.0, 2.2] {
        let f = dressing::factor::known::sine_gordon_soliton(xi).unwrap();
        let edge = xi.min(std::f64::consts::PI);
        for (x, y) in [
            (0.0, 0.0),
            (0.7, 0.2 * edge),
            (-3.0, -0.5 * edge),
            (8.0, 0.0),
            (20.0, 0.1),
            (1.0, 0.9 * edge),
        ] {
            let d = f
                .log_derivative(&Complex64::new(x, y), Prec::DOUBLE)
                .unwrap();
            let hi = f
                .log_derivative(&Complex::with_val(200, (x, y)), Prec::digits(40).unwrap())
                .unwrap();
            within_estimate(&format!("ξ={xi} θ={x}+{y}i"), &d, &hi, 1e-12);
        }
    }
}

/// A block with sin πα tiny (α = 10⁻⁶, its pole and zero nearly meet at
/// θ = 0): near θ = 0 the kernel's denominator (1 − e²)² + 4e² sin²πα is
/// dominated by the cancelling 1 − e², whose own error the estimate must
/// carry. Double path against 40 digits (the closed form, common practice).
#[test]
fn block_kernel_estimate_covers_the_cancellation_near_zero() {
    let m = Model::from_toml(
        "[[factor]]\nname = \"S\"\n[[factor.piece]]\nkind = \"cdd\"\nblocks = [{ alpha = \"1/1000000\" }]\n",
        "tiny.toml",
    )
    .unwrap();
    let f = m.factor("S").unwrap();
    for x in [1e-3, 3e-5, 1e-6, -2e-6, 0.2] {
        let d = f
            .log_derivative(&Complex64::new(x, 0.0), Prec::DOUBLE)
            .unwrap();
        let hi = f
            .log_derivative(&Complex::with_val(200, (x, 0.0)), Prec::digits(40).unwrap())
            .unwrap();
        let want = Complex64::new(hi.value.real().to_f64(), hi.value.imag().to_f64());
        let err = (d.value - want).norm();
        assert!(
            err <= d.radius.to_f64(),
            "θ = {x}: {} vs {want}, err {err:e} > radius {}",
            d.value,
            d.radius
        );
    }
}
