//! Gamma-product factors: product form vs integral form vs a published
//! integral representation, continuation outside the strip, convergence
//! analysis.

mod common;

use common::*;
use dressing::factor::{Coef, GammaProduct, GammaTerm, Method, Representation, Scale};
use dressing::num::ComplexField;
use dressing::quadrature::{default_rule, Domain};
use dressing::{Error, Prec};
use rug::float::Constant;
use rug::{Complex, Float};

/// The sine-Gordon soliton–soliton factor as a gamma product
/// (`factor::known::sine_gordon_soliton`; derived from the integral below by
/// Malmstén's formula, docs/math.md §6): the numbers, not the derivation,
/// are the check.
fn sine_gordon(xi: f64) -> GammaProduct {
    dressing::factor::known::sine_gordon_soliton(xi).unwrap()
}

/// −i ∫₀^∞ (dt/t) sinh(t(π−ξ)/2) sin(θt) / (sinh(ξt/2) cosh(πt/2)): log of
/// −S₀(θ), the integral representation of Zamolodchikov & Zamolodchikov,
/// Ann. Phys. 120 (1979) 253 (as quoted in the project's issue; written
/// from memory there), valid for |Im θ| < min(ξ, π). Evaluated with the
/// crate's quadrature directly, independently of the factor code.
fn zz_integral(xi: f64, theta: &Complex, digits: u32) -> Complex {
    let p = bits(digits) + 40;
    let xi_f = Float::with_val(p, xi);
    let pi = Float::with_val(p, Constant::Pi);
    let th = Complex::with_val(p, theta);
    let f = |t: &Float| -> Complex {
        let q = t.prec();
        let num = (Float::with_val(q, Float::with_val(q, &pi - &xi_f) * t) / 2u32).sinh();
        let den = (Float::with_val(q, &xi_f * t) / 2u32).sinh()
            * (Float::with_val(q, &pi * t) / 2u32).cosh();
        let s = Complex::with_val(q, &th * t).sin();
        s * (num / (den * t))
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

/// Π_k Γ(k+1+z)Γ(k+1−z)/(Γ(2k+1+z)Γ(2k+1−z))², normalised at 0: steps 1
/// and 2, and every normalised condition holds (Σ n s = 0, Σ n s ln a = 0,
/// Σ n s²/a = 2 − 4/2 = 0, Σ n s(2b−1)/a = 0).
fn mixed_step_product() -> GammaProduct {
    let t = |a: i64, b: i64, s: i64, n: i64| {
        GammaTerm::new(Coef::integer(a), Coef::integer(b), Coef::integer(s), n)
    };
    GammaProduct::new(
        vec![
            t(1, 1, 1, 1),
            t(1, 1, -1, 1),
            t(2, 1, 1, -2),
            t(2, 1, -1, -2),
        ],
        Scale::Unit,
        Some((0.0, 0.0)),
    )
    .unwrap()
}

/// Π_k Γ(k+1+z)Γ(k+1−z)/(Γ(πk+1+√π z)Γ(πk+1−√π z)), normalised at 0:
/// steps 1 and π (computed coefficients, incommensurate).
fn incommensurate_product() -> GammaProduct {
    let pi = || Coef::computed("pi", |p| Float::with_val(p, Constant::Pi));
    let rpi = |sign: i32| {
        Coef::computed("±sqrt(pi)", move |p| {
            Float::with_val(p, Constant::Pi).sqrt() * sign
        })
    };
    let one = || Coef::integer(1);
    GammaProduct::new(
        vec![
            GammaTerm::new(one(), one(), Coef::integer(1), 1),
            GammaTerm::new(one(), one(), Coef::integer(-1), 1),
            GammaTerm::new(pi(), one(), rpi(1), -1),
            GammaTerm::new(pi(), one(), rpi(-1), -1),
        ],
        Scale::Unit,
        Some((0.0, 0.0)),
    )
    .unwrap()
}

fn log_minus_s0(f: &GammaProduct, theta: &Complex, digits: u32, m: Method) -> Complex {
    f.log_value(theta, Prec::digits(digits as u64).unwrap(), m)
        .unwrap()
        .log
        .value
}

fn assert_agree(a: &Complex, b: &Complex, digits: u32, what: &str) {
    // exp(log) agreement: compare logs modulo 2πi.
    let d = Complex::with_val(a.prec().0, a - b);
    let two_pi = Float::with_val(a.prec().0, Constant::Pi) * 2u32;
    let k = (d.imag().to_f64() / two_pi.to_f64()).round();
    let d = d - Complex::with_val(a.prec().0, (0, two_pi * k));
    let l = d.log2_abs() * std::f64::consts::LOG10_2;
    assert!(
        l < -(digits as f64) + 1.0,
        "{what}: agree only to 10^{l:.1}\n {}\n {}",
        a.to_decimal(40),
        b.to_decimal(40)
    );
}

#[test]
fn sine_gordon_product_integral_and_literature_agree_to_50_digits() {
    // ξ below 1, the benchmark 2π/7, and one above π/2 (check from the issue).
    for xi in [0.8, 2.0 * std::f64::consts::PI / 7.0, 2.2] {
        let f = sine_gordon(xi);
        let strip = f.strip().unwrap();
        let edge = xi.min(std::f64::consts::PI);
        assert!(
            (strip.1 - edge).abs() < 1e-12 && (strip.0 + edge).abs() < 1e-12,
            "strip {strip:?}"
        );
        for (x, y) in [
            (0.7, 0.2),
            (0.0, 0.1),
            (-1.3, -0.35 * edge),
            (3.0, 0.6 * edge),
        ] {
            let theta = Complex::with_val(256, (x, y));
            let lit = zz_integral(xi, &theta, 50);
            let prod = log_minus_s0(&f, &theta, 50, Method::Product);
            let int = log_minus_s0(&f, &theta, 50, Method::Integral);
            assert_agree(
                &prod,
                &lit,
                50,
                &format!("product vs ZZ integral, ξ={xi}, θ={x}+{y}i"),
            );
            assert_agree(
                &int,
                &lit,
                50,
                &format!("integral vs ZZ integral, ξ={xi}, θ={x}+{y}i"),
            );
        }
    }
}

#[test]
fn continuation_outside_the_strip_matches_product() {
    let xi = 2.0 * std::f64::consts::PI / 7.0;
    let f = sine_gordon(xi);
    for (x, y) in [(0.4, 1.5), (-0.7, 2.9), (1.1, -4.0), (0.2, 7.3)] {
        let theta = Complex::with_val(256, (x, y));
        let r = f
            .log_value(&theta, Prec::digits(40).unwrap(), Method::Integral)
            .unwrap();
        assert!(matches!(r.representation, Representation::Integral { peeled } if peeled > 0));
        let prod = log_minus_s0(&f, &theta, 40, Method::Product);
        assert_agree(
            &r.log.value,
            &prod,
            40,
            &format!("continued integral vs product at {x}+{y}i"),
        );
    }
}

#[test]
fn divergent_products_are_rejected_with_the_failed_condition() {
    // Π_k Γ(k+1+z)/Γ(k+1): the k-th factor grows like ln k (Σ n·s ≠ 0).
    let t = |b: i64, s: i64, n: i64| {
        GammaTerm::new(Coef::integer(1), Coef::integer(b), Coef::integer(s), n)
    };
    let e = GammaProduct::new(vec![t(1, 1, 1), t(1, 0, -1)], Scale::Unit, Some((0.0, 0.0)))
        .unwrap_err();
    match &e {
        Error::Divergent { condition, .. } => assert_eq!(condition, "Σ n·s = 0"),
        other => panic!("{other:?}"),
    }
    assert!(e.to_string().contains("diverges"), "{e}");
    // Π_k Γ(k+1+z)Γ(k+1−z)/Γ(k+1)²: converges only like Σ z²/k — diverges.
    let e = GammaProduct::new(
        vec![t(1, 1, 1), t(1, -1, 1), t(1, 0, -2)],
        Scale::Unit,
        None,
    )
    .unwrap_err();
    assert!(matches!(e, Error::Divergent { .. }), "{e:?}");
}

#[test]
fn poles_and_zeros_are_reported_with_their_order() {
    // −S₀ has Γ(1 − pz) in the numerator: a pole at z = 1/p, θ = iξ, and
    // Γ(1 + pz) in the denominator: a zero at θ = −iξ (no other gamma of the
    // product is singular there; common practice: read off the arguments).
    let xi = 2.0 * std::f64::consts::PI / 7.0;
    let f = sine_gordon(xi);
    for m in [Method::Product, Method::Integral] {
        let e = f
            .log_value(&num_complex::Complex64::new(0.0, xi), Prec::DOUBLE, m)
            .unwrap_err();
        assert!(matches!(e, Error::Pole { order: 1, .. }), "{e:?}");
        assert!(e.to_string().contains("pole of order 1 at θ ="), "{e}");
        let th = Complex::with_val(300, (0.0, xi));
        let e = f.log_value(&th, Prec::digits(60).unwrap(), m).unwrap_err();
        assert!(matches!(e, Error::Pole { order: 1, .. }), "{e:?}");
        let e = f
            .log_value(&num_complex::Complex64::new(0.0, -xi), Prec::DOUBLE, m)
            .unwrap_err();
        assert!(matches!(e, Error::Zero { order: 1, .. }), "{e:?}");
    }
    // Next to the pole the value is finite and large, not an error.
    let near = num_complex::Complex64::new(0.0, xi + 1e-9);
    let v = f.log_value(&near, Prec::DOUBLE, Method::Product).unwrap();
    assert!(v.log.value.re > 15.0);
}

#[test]
fn bad_input_to_gamma_products() {
    let t = |a: i64, b: i64, s: i64, n: i64| {
        GammaTerm::new(Coef::integer(a), Coef::integer(b), Coef::integer(s), n)
    };
    // A non-positive step.
    let e = GammaProduct::new(vec![t(0, 1, 1, 1), t(0, 1, -1, -1)], Scale::Unit, None).unwrap_err();
    assert!(
        matches!(e, Error::Domain { .. }) && e.to_string().contains("positive"),
        "{e}"
    );
    // No terms.
    assert!(matches!(
        GammaProduct::new(vec![], Scale::Unit, None),
        Err(Error::Domain { .. })
    ));
    // A non-finite rapidity.
    let f = sine_gordon(1.0);
    let e = f
        .log_value(
            &num_complex::Complex64::new(f64::NAN, 0.0),
            Prec::DOUBLE,
            Method::Auto,
        )
        .unwrap_err();
    assert!(matches!(e, Error::NonFinite { .. }), "{e:?}");
    // The integral form where steps are incommensurate (1 and π): a clear
    // refusal. Normalised at 0, every normalised condition holds:
    // Σ n s = 0 and Σ n s ln a = 0 (slopes in ± pairs), Σ n s²/a = 2 − 2π/π = 0,
    // Σ n s(2b−1)/a = 0 (pairs with the same b).
    let g = incommensurate_product();
    assert!(g.strip().is_none() && g.convergence().reduction.is_none());
    let e = g
        .log_value(
            &num_complex::Complex64::new(0.1, 0.0),
            Prec::DOUBLE,
            Method::Integral,
        )
        .unwrap_err();
    assert!(e.to_string().contains("common step"), "{e}");
    // The product form still works there, and Auto uses it.
    for m in [Method::Product, Method::Auto] {
        assert!(g
            .log_value(&num_complex::Complex64::new(0.1, 0.0), Prec::DOUBLE, m)
            .is_ok());
    }
}

/// Π_k Γ(k+¼+z)Γ(k+¾−z)Γ(k+¾+z)Γ(k+¼−z) / (Γ(k+½+z)Γ(k+½−z))², z = θ,
/// normalised at 0.
fn quarter_product() -> GammaProduct {
    let q = |n: i64, d: i64| Coef::rational(n, d);
    let t = |b: Coef, s: i64, n: i64| GammaTerm::new(Coef::integer(1), b, Coef::integer(s), n);
    GammaProduct::new(
        vec![
            t(q(1, 4), 1, 1),
            t(q(3, 4), -1, 1),
            t(q(3, 4), 1, 1),
            t(q(1, 4), -1, 1),
            t(q(1, 2), 1, -2),
            t(q(1, 2), -1, -2),
        ],
        Scale::Unit,
        Some((0.0, 0.0)),
    )
    .unwrap()
}

#[test]
fn crossing_symmetric_tail_with_vanishing_odd_terms() {
    // Π_k Γ(k+¼+z)Γ(k+¾−z)Γ(k+¾+z)Γ(k+¼−z) / (Γ(k+½+z)Γ(k+½−z))², normalised
    // at 0: offsets pair as (c, 1−c), so every odd tail coefficient vanishes.
    // A stopping rule that trusts one small term stops too early here
    // (found in review); product and integral must still agree.
    let f = quarter_product();
    for digits in [30u32, 60] {
        let theta = Complex::with_val(bits(digits) + 30, (0.3, 0.2));
        let p = f
            .log_value(
                &theta,
                Prec::digits(digits as u64).unwrap(),
                Method::Product,
            )
            .unwrap();
        let i = f
            .log_value(
                &theta,
                Prec::digits(digits as u64).unwrap(),
                Method::Integral,
            )
            .unwrap();
        assert_agree(
            &p.log.value,
            &i.log.value,
            digits,
            &format!("{digits} digits"),
        );
        let d = Complex::with_val(theta.prec().0, &p.log.value - &i.log.value);
        // The two error estimates together cover the difference.
        assert!(d.log2_abs() <= (p.log.radius + i.log.radius).log2() + 1.0);
    }
}

#[test]
fn rapidities_too_far_out_are_refused_quickly() {
    let f = sine_gordon(1.0);
    let e = f
        .log_value(
            &num_complex::Complex64::new(1e25, 0.0),
            Prec::DOUBLE,
            Method::Product,
        )
        .unwrap_err();
    assert!(
        matches!(e, Error::Domain { .. }) && e.to_string().contains("explicit factors"),
        "{e}"
    );
    let e = f
        .log_value(
            &num_complex::Complex64::new(0.0, 1e25),
            Prec::DOUBLE,
            Method::Integral,
        )
        .unwrap_err();
    assert!(e.to_string().contains("too far"), "{e}");
}

#[test]
fn rational_products_are_decided_exactly() {
    // Integer coefficients: every condition decided in exact arithmetic.
    let t = |a: i64, b: i64, s: i64, n: i64| {
        GammaTerm::new(Coef::integer(a), Coef::integer(b), Coef::integer(s), n)
    };
    let f = GammaProduct::new(
        vec![
            t(4, 1, -2, 1),
            t(4, 4, -2, 1),
            t(4, 3, 2, 1),
            t(4, 2, 2, 1),
            t(4, 1, 2, -1),
            t(4, 4, 2, -1),
            t(4, 3, -2, -1),
            t(4, 2, -2, -1),
        ],
        Scale::OverIPi,
        None,
    )
    .unwrap();
    assert!(f
        .convergence()
        .conditions
        .iter()
        .all(|c| c.exact && c.holds));
    // Steps 1 and 2 with logarithms: Σ n s ln a = (1 − 1)·ln 1 + (−2 + 2)·ln 2 = 0 exactly.
    let g = mixed_step_product();
    assert!(g
        .convergence()
        .conditions
        .iter()
        .all(|c| c.exact && c.holds));
    // A computed coefficient (π/ξ) falls back to the numerical decision.
    let sg = sine_gordon(0.8);
    assert!(sg
        .convergence()
        .conditions
        .iter()
        .all(|c| !c.exact && c.holds));
}

#[test]
fn commensurate_steps_reduced_by_gauss_multiplication() {
    // Steps 1 and 2 (exact): reduced to step 1, the step-2 terms split in two
    // by Gauss's multiplication formula (DLMF 5.5.6); product vs integral to
    // 40 digits in the strip (|Re z| < 1) and outside it (factors taken out).
    let g = mixed_step_product();
    let red = g.convergence().reduction.clone().unwrap();
    assert_eq!(red.step, "1");
    assert_eq!(red.multiples, vec![1, 1, 2, 2]);
    for (x, y) in [
        (0.3, 0.2),
        (-0.6, 1.5),
        (0.05, -3.0),
        (2.5, 0.1),
        (-3.7, 0.4),
    ] {
        let theta = Complex::with_val(256, (x, y));
        let p = g
            .log_value(&theta, Prec::digits(40).unwrap(), Method::Product)
            .unwrap();
        let i = g
            .log_value(&theta, Prec::digits(40).unwrap(), Method::Integral)
            .unwrap();
        assert!(matches!(i.representation, Representation::Integral { .. }));
        assert_agree(
            &p.log.value,
            &i.log.value,
            40,
            &format!("steps 1 and 2 at {x}+{y}i"),
        );
        let d = Complex::with_val(256, &p.log.value - &i.log.value);
        assert!(d.log2_abs() <= (p.log.radius + i.log.radius).log2() + 1.0);
    }
}

#[test]
fn auto_agrees_with_both_methods_and_switches_by_cost() {
    let f = sine_gordon(2.0 * std::f64::consts::PI / 7.0);
    // In the strip at double precision the uniform-grid integral is the
    // cheaper; outside it (factors taken out, the double-exponential rule
    // near t = 0) the product form is.
    let inside = f.plan((0.7, 0.2), Prec::DOUBLE).unwrap();
    assert_eq!(inside.method, Method::Integral, "{inside}");
    let outside = f.plan((0.7, 1.0), Prec::DOUBLE).unwrap();
    assert_eq!(outside.method, Method::Product, "{outside}");
    assert!(outside.integral.unwrap().micros > outside.product.unwrap().micros);
    // Far from the origin along the real axis the product form needs many
    // more factors; the integral stays cheap.
    let far = f.plan((25.0, 0.1), Prec::DOUBLE).unwrap();
    assert_eq!(far.method, Method::Integral, "{far}");
    assert!(far.to_string().contains("chose the integral form"));
    for (x, y) in [(0.7, 0.2), (0.7, 1.0), (-3.0, 0.5), (0.2, 7.3)] {
        for digits in [15u32, 30] {
            let prec = if digits == 15 {
                Prec::DOUBLE
            } else {
                Prec::digits(30).unwrap()
            };
            let get = |m: Method| -> (Complex, f64) {
                if digits == 15 {
                    let v = f
                        .log_value(&num_complex::Complex64::new(x, y), prec, m)
                        .unwrap();
                    (
                        Complex::with_val(128, (v.log.value.re, v.log.value.im)),
                        v.log.radius.to_f64(),
                    )
                } else {
                    let v = f
                        .log_value(&Complex::with_val(128, (x, y)), prec, m)
                        .unwrap();
                    (v.log.value, v.log.radius.to_f64())
                }
            };
            let (a, ra) = get(Method::Auto);
            for m in [Method::Product, Method::Integral] {
                let (b, rb) = get(m);
                let d = Complex::with_val(128, &a - &b).abs().real().to_f64();
                assert!(
                    d <= ra + rb,
                    "Auto vs {m:?} at {x}+{y}i, {digits} digits: {d:e} > {ra:e} + {rb:e}"
                );
            }
        }
    }
}

#[test]
fn double_path_radii_cover_the_error() {
    // Reference: the product form at 40 digits (an independent method). The
    // double path's integral (uniform grid in the strip, double-exponential
    // outside) and product form must each be within their radius, and the
    // radius must be small (about 14 digits).
    let prods = [
        sine_gordon(2.0 * std::f64::consts::PI / 7.0),
        sine_gordon(0.8),
        sine_gordon(2.2),
    ];
    let pts = [
        (0.7, 0.2),
        (0.0, 0.0),
        (1e-3, 1e-3),
        (-2.0, -0.7),
        (4.0, 0.6),
        (12.0, -0.3),
        (-30.0, 0.05),
        (0.3, 1.9),
        (-1.0, -4.0),
    ];
    for f in &prods {
        for (x, y) in pts {
            let exact = f
                .log_value(
                    &Complex::with_val(200, (x, y)),
                    Prec::digits(40).unwrap(),
                    Method::Product,
                )
                .unwrap()
                .log
                .value;
            let ex = num_complex::Complex64::new(exact.real().to_f64(), exact.imag().to_f64());
            for m in [Method::Integral, Method::Product, Method::Auto] {
                let v = f
                    .log_value(&num_complex::Complex64::new(x, y), Prec::DOUBLE, m)
                    .unwrap();
                let err = (v.log.value - ex).norm();
                let r = v.log.radius.to_f64();
                assert!(err <= r, "{m:?} at {x}+{y}i: error {err:e} > radius {r:e}");
                assert!(
                    r <= 1e-11 * ex.norm().max(1.0),
                    "{m:?} at {x}+{y}i: radius {r:e}"
                );
            }
        }
    }
    // A product whose integrand is not even (offsets ¼, ¾ with step 1): the
    // double-exponential rule on the double path.
    let g = quarter_product();
    for (x, y) in [(0.1, 0.05), (0.2, -1.0), (-0.15, 3.0)] {
        let exact = g
            .log_value(
                &Complex::with_val(200, (x, y)),
                Prec::digits(40).unwrap(),
                Method::Product,
            )
            .unwrap()
            .log
            .value;
        let ex = num_complex::Complex64::new(exact.real().to_f64(), exact.imag().to_f64());
        let v = g
            .log_value(
                &num_complex::Complex64::new(x, y),
                Prec::DOUBLE,
                Method::Integral,
            )
            .unwrap();
        let err = (v.log.value - ex).norm();
        assert!(
            err <= v.log.radius.to_f64(),
            "{x}+{y}i: {err:e} > {:e}",
            v.log.radius.to_f64()
        );
    }
}

#[test]
fn batches_match_point_by_point() {
    let f = sine_gordon(2.0 * std::f64::consts::PI / 7.0);
    // A line in the strip (one grid), and one leaving it (fallback per point).
    for (from, to, n) in [
        ((-6.0, 0.3), (6.0, -0.4), 241),
        ((0.5, -0.2), (0.5, 2.5), 23),
    ] {
        let line = f.log_values_on_line(from, to, n, Method::Auto);
        assert_eq!(line.len(), n);
        let step = (
            (to.0 - from.0) / (n - 1) as f64,
            (to.1 - from.1) / (n - 1) as f64,
        );
        for (k, v) in line.iter().enumerate() {
            let th =
                num_complex::Complex64::new(from.0 + step.0 * k as f64, from.1 + step.1 * k as f64);
            let v = v.as_ref().unwrap();
            let exact = f
                .log_value(
                    &Complex::with_val(200, (th.re, th.im)),
                    Prec::digits(30).unwrap(),
                    Method::Product,
                )
                .unwrap()
                .log
                .value;
            let ex = num_complex::Complex64::new(exact.real().to_f64(), exact.imag().to_f64());
            let err = (v.log.value - ex).norm();
            assert!(
                err <= v.log.radius.to_f64(),
                "line point {k} ({th}): {err:e} > {:e}",
                v.log.radius.to_f64()
            );
            let one = f.log_value(&th, Prec::DOUBLE, Method::Auto).unwrap();
            assert!(
                (one.log.value - v.log.value).norm() <= (one.log.radius + v.log.radius).to_f64()
            );
        }
    }
    let ths: Vec<Complex> = [(0.1, 0.2), (2.0, 1.5), (-4.0, -0.1)]
        .iter()
        .map(|p| Complex::with_val(200, *p))
        .collect();
    let many = f.log_values(&ths, Prec::digits(40).unwrap(), Method::Auto);
    for (th, v) in ths.iter().zip(&many) {
        let one = f
            .log_value(th, Prec::digits(40).unwrap(), Method::Product)
            .unwrap();
        assert_agree(
            &one.log.value,
            &v.as_ref().unwrap().log.value,
            40,
            "log_values",
        );
    }
}

/// The divergence hint suggests normalising only where that helps: a
/// failed condition with the slopes in it (here Σ n·s = −2 for
/// Γ(k+½−z)/Γ(k+½+z)) depends on z and survives normalisation.
#[test]
fn divergence_hint_offers_normalisation_only_where_it_helps() {
    let t = |s: i64, n: i64| {
        GammaTerm::new(Coef::integer(1), Coef::rational(1, 2), Coef::integer(s), n)
    };
    let e = GammaProduct::new(vec![t(-1, 1), t(1, -1)], Scale::Unit, None)
        .unwrap_err()
        .to_string();
    assert!(e.contains("Σ n·s = 0"), "{e}");
    assert!(!e.contains("normalise"), "{e}");
    // Π_k Γ(k+1)/Γ(k+2) fails a z-independent condition, which normalising lifts.
    let u =
        |b: i64, n: i64| GammaTerm::new(Coef::integer(1), Coef::integer(b), Coef::integer(0), n);
    let e = GammaProduct::new(vec![u(1, 1), u(2, -1)], Scale::Unit, None)
        .unwrap_err()
        .to_string();
    assert!(e.contains("normalise"), "{e}");
}
