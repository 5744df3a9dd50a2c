//! Double-exponential quadrature against closed forms, at 100 digits (rug)
//! and at double precision (Complex64). Every test checks that the returned
//! radius bounds the actual error, and at 100 digits that the error is below
//! 10^-100. The source of each closed form is cited beside it.

use dressing::quadrature::{default_rule, Domain, DoubleExponential, Point};
use dressing::{Approx, Error, Prec, Radius};
use num_complex::Complex64;
use rug::float::Constant;
use rug::ops::Pow;
use rug::{Complex, Float};
use std::cell::Cell;

/// Precision of the reference values.
const P: u32 = 500;

fn digits100() -> Prec {
    Prec::digits(100).unwrap()
}

fn pi() -> Float {
    Float::with_val(P, Constant::Pi)
}

fn cr(x: Float) -> Complex {
    Complex::with_val(P, (x, 0))
}

fn evals_note(evals: usize) -> String {
    if evals > 0 {
        format!(", {evals} evaluations")
    } else {
        String::new()
    }
}

/// Checks a 100-digit result: radius ≥ error, error < 10^-100, and a radius
/// that is not absurdly pessimistic.
fn check_mp(name: &str, r: &Approx<Complex>, exact: &Complex, evals: usize) {
    let err = Complex::with_val(P, &r.value - exact).abs().real().clone();
    let err_lg = if err.is_zero() {
        f64::NEG_INFINITY
    } else {
        let (m, e) = err.to_f64_exp();
        m.log2() + e as f64
    };
    let l10 = std::f64::consts::LOG10_2;
    eprintln!(
        "{name:<40} 100 digits: error 10^{:.1}, radius 10^{:.1}{}",
        err_lg * l10,
        r.radius.log10(),
        evals_note(evals)
    );
    assert!(
        err_lg <= r.radius.log2(),
        "{name}: error 10^{:.1} above radius {}",
        err_lg * l10,
        r.radius
    );
    assert!(
        err_lg * l10 < -100.0,
        "{name}: error 10^{:.1}",
        err_lg * l10
    );
    assert!(r.radius.log10() < -99.0, "{name}: radius {}", r.radius);
    assert_eq!(r.prec, digits100().bits());
}

/// Checks a double-precision result: radius ≥ error, error below
/// `1e-14·max(|exact|, 1)`, radius below `1e-13·max(|exact|, 1)`.
fn check_f64(name: &str, r: &Approx<Complex64>, exact: Complex64, evals: usize) {
    let err = (r.value - exact).norm();
    let scale = exact.norm().max(1.0);
    eprintln!(
        "{name:<40} double: error {:.1e}, radius {:.1e}{}",
        err,
        r.radius.to_f64(),
        evals_note(evals)
    );
    assert!(
        err <= r.radius.to_f64(),
        "{name}: error {err:e} above radius {}",
        r.radius
    );
    assert!(err < 1e-14 * scale, "{name}: error {err:e}");
    assert!(
        r.radius.to_f64() < 1e-13 * scale,
        "{name}: radius {}",
        r.radius
    );
    assert_eq!(r.prec, 53);
}

fn mp_zero() -> Float {
    Float::new(P)
}

fn mp_one() -> Float {
    Float::with_val(P, 1)
}

fn c64(x: f64) -> Complex64 {
    Complex64::new(x, 0.0)
}

/// Runs a real integrand at 100 digits on one domain and checks it.
fn mp_case(name: &str, f: impl Fn(&Float) -> Float, domain: Domain<Float>, exact: Float) {
    let n = Cell::new(0);
    let r = default_rule()
        .integrate(
            |x: &Float| {
                n.set(n.get() + 1);
                Complex::with_val(x.prec(), (f(x), 0))
            },
            &domain,
            digits100(),
        )
        .unwrap_or_else(|e| panic!("{name}: {e}"));
    check_mp(name, &r, &cr(exact), n.get());
}

/// Runs a real integrand at double precision on one domain and checks it.
fn f64_case(name: &str, f: impl Fn(f64) -> f64, domain: Domain<f64>, exact: f64) {
    let n = Cell::new(0);
    let r = default_rule()
        .integrate(
            |x: &f64| {
                n.set(n.get() + 1);
                c64(f(*x))
            },
            &domain,
            Prec::DOUBLE,
        )
        .unwrap_or_else(|e| panic!("{name}: {e}"));
    check_f64(name, &r, c64(exact), n.get());
}

// ---------------------------------------------------------------- [0, 1] etc.

/// ∫_0^1 x^{-1/2} dx = 2 (elementary: the antiderivative is 2√x).
#[test]
fn inverse_sqrt_on_unit_interval() {
    mp_case(
        "x^-1/2 on [0,1]",
        |x| x.clone().recip_sqrt(),
        Domain::Finite(mp_zero(), mp_one()),
        Float::with_val(P, 2),
    );
    f64_case(
        "x^-1/2 on [0,1]",
        |x| 1.0 / x.sqrt(),
        Domain::Finite(0.0, 1.0),
        2.0,
    );
}

/// ∫_1^2 (x−1)^{-1/2} dx = 2 (elementary), evaluated from the distance to
/// the endpoint: `x` itself rounds onto 1 long before the weights vanish.
#[test]
fn inverse_sqrt_at_shifted_endpoint_needs_the_distance() {
    let n = Cell::new(0);
    let r = default_rule()
        .integrate_point(
            |p: &Point<Float>| {
                n.set(n.get() + 1);
                Complex::with_val(p.x.prec(), p.from_start.clone().recip_sqrt())
            },
            &Domain::Finite(mp_one(), Float::with_val(P, 2)),
            digits100(),
        )
        .unwrap();
    check_mp(
        "(x-1)^-1/2 on [1,2], point",
        &r,
        &cr(Float::with_val(P, 2)),
        n.get(),
    );

    let n = Cell::new(0);
    let r = default_rule()
        .integrate_point(
            |p: &Point<f64>| {
                n.set(n.get() + 1);
                c64(1.0 / p.from_start.sqrt())
            },
            &Domain::Finite(1.0, 2.0),
            Prec::DOUBLE,
        )
        .unwrap();
    check_f64("(x-1)^-1/2 on [1,2], point", &r, c64(2.0), n.get());

    // From x alone the integrand hits the endpoint and is infinite there:
    // a typed error naming the point.
    let e = default_rule()
        .integrate(
            |x: &f64| c64(1.0 / (x - 1.0).sqrt()),
            &Domain::Finite(1.0, 2.0),
            Prec::DOUBLE,
        )
        .unwrap_err();
    match e {
        Error::Domain { message, .. } => {
            assert!(message.contains("x = 1e0"), "{message}");
            assert!(message.contains("integrate_point"), "{message}");
        }
        e => panic!("unexpected {e:?}"),
    }
}

/// ∫_0^1 x^{-7/10} dx = 10/3 (elementary), a singularity close to the
/// documented limit |x − a|^{-3/4}; and x^{-9/10}, beyond it, is refused
/// with NoConvergence rather than returned with a wrong radius.
#[test]
fn strong_endpoint_singularities() {
    let r = default_rule()
        .integrate(
            |x: &Float| {
                let e = Float::with_val(x.prec(), -7) / 10u32;
                Complex::with_val(x.prec(), x.pow(&e))
            },
            &Domain::Finite(mp_zero(), mp_one()),
            digits100(),
        )
        .unwrap();
    check_mp(
        "x^-7/10 on [0,1]",
        &r,
        &cr(Float::with_val(P, 10) / 3u32),
        0,
    );
    f64_case(
        "x^-7/10 on [0,1]",
        |x| x.powf(-0.7),
        Domain::Finite(0.0, 1.0),
        10.0 / 3.0,
    );
    let e = default_rule()
        .integrate(
            |x: &Float| {
                let e = Float::with_val(x.prec(), -9) / 10u32;
                Complex::with_val(x.prec(), x.pow(&e))
            },
            &Domain::Finite(mp_zero(), mp_one()),
            digits100(),
        )
        .unwrap_err();
    match e {
        Error::NoConvergence { hint, .. } => assert!(hint.contains("3/4"), "{hint}"),
        e => panic!("unexpected {e:?}"),
    }
}

/// ∫_0^1 log x dx = −1 (elementary: x log x − x).
#[test]
fn log_on_unit_interval() {
    mp_case(
        "log x on [0,1]",
        |x| Float::with_val(x.prec(), x.ln_ref()),
        Domain::Finite(mp_zero(), mp_one()),
        Float::with_val(P, -1),
    );
    f64_case("log x on [0,1]", f64::ln, Domain::Finite(0.0, 1.0), -1.0);
}

/// ∫_0^1 log(x)/(1+x) dx = −π²/12 (Gradshteyn–Ryzhik 4.231.1).
#[test]
fn log_over_one_plus_x() {
    let exact = -pi().square() / 12u32;
    mp_case(
        "log x/(1+x) on [0,1]",
        |x| Float::with_val(x.prec(), x.ln_ref()) / (x.clone() + 1u32),
        Domain::Finite(mp_zero(), mp_one()),
        exact.clone(),
    );
    f64_case(
        "log x/(1+x) on [0,1]",
        |x| x.ln() / (1.0 + x),
        Domain::Finite(0.0, 1.0),
        exact.to_f64(),
    );
}

/// ∫_{-1}^1 √(1−x²) dx = π/2 (the area of a half unit disc), from x and from
/// the distances (1 − x² = (x − a)(b − x)).
#[test]
fn half_disc() {
    let exact = pi() / 2u32;
    mp_case(
        "sqrt(1-x^2) on [-1,1]",
        |x| (1u32 - x.clone().square()).sqrt(),
        Domain::Finite(-mp_one(), mp_one()),
        exact.clone(),
    );
    f64_case(
        "sqrt(1-x^2) on [-1,1]",
        |x| (1.0 - x * x).sqrt(),
        Domain::Finite(-1.0, 1.0),
        std::f64::consts::FRAC_PI_2,
    );
    let n = Cell::new(0);
    let r = default_rule()
        .integrate_point(
            |p: &Point<Float>| {
                n.set(n.get() + 1);
                let e = p.to_end.as_ref().unwrap();
                Complex::with_val(p.x.prec(), (p.from_start.clone() * e).sqrt())
            },
            &Domain::Finite(-mp_one(), mp_one()),
            digits100(),
        )
        .unwrap();
    check_mp("sqrt((x+1)(1-x)) on [-1,1], point", &r, &cr(exact), n.get());
}

// ---------------------------------------------------------------- [0, ∞)

/// Both half-line maps, for integrands that decay exponentially.
fn both_half_lines(
    name: &str,
    f: impl Fn(&Float) -> Float + Copy,
    g: fn(f64) -> f64,
    exact: Float,
) {
    mp_case(
        &format!("{name}, exp-sinh"),
        f,
        Domain::HalfLine(mp_zero()),
        exact.clone(),
    );
    mp_case(
        &format!("{name}, exp-exp"),
        f,
        Domain::HalfLineExpDecay(mp_zero()),
        exact.clone(),
    );
    f64_case(
        &format!("{name}, exp-sinh"),
        g,
        Domain::HalfLine(0.0),
        exact.to_f64(),
    );
    f64_case(
        &format!("{name}, exp-exp"),
        g,
        Domain::HalfLineExpDecay(0.0),
        exact.to_f64(),
    );
}

/// ∫_0^∞ e^{-x} x^{-1/2} dx = Γ(1/2) = √π (DLMF 5.2.1 with z = 1/2, and
/// DLMF 5.4.6).
#[test]
fn gamma_one_half() {
    both_half_lines(
        "e^-x x^-1/2 on [0,inf)",
        |x| Float::with_val(x.prec(), -x).exp() * x.clone().recip_sqrt(),
        |x| (-x).exp() / x.sqrt(),
        pi().sqrt(),
    );
}

/// ∫_0^∞ x/(e^x − 1) dx = Γ(2) ζ(2) = π²/6 (DLMF 25.5.1 with s = 2, and
/// DLMF 25.6.1).
#[test]
fn bose_integral_zeta_two() {
    both_half_lines(
        "x/(e^x-1) on [0,inf)",
        |x| x.clone() / Float::with_val(x.prec(), x.exp_m1_ref()),
        |x| x / x.exp_m1(),
        pi().square() / 6u32,
    );
}

/// ∫_0^∞ e^{-x} sin(x)/x dx = arctan(1) = π/4 (Gradshteyn–Ryzhik 3.941.1:
/// ∫_0^∞ e^{-px} sin(qx)/x dx = arctan(q/p)).
#[test]
fn damped_sinc() {
    both_half_lines(
        "e^-x sin(x)/x on [0,inf)",
        |x| Float::with_val(x.prec(), -x).exp() * Float::with_val(x.prec(), x.sin_ref()) / x,
        |x| (-x).exp() * x.sin() / x,
        pi() / 4u32,
    );
}

/// ∫_0^∞ dx/(1+x²) = π/2 (elementary: arctan), algebraic decay: exp-sinh.
#[test]
fn lorentzian_algebraic_decay() {
    mp_case(
        "1/(1+x^2) on [0,inf), exp-sinh",
        |x| 1u32 / (x.clone().square() + 1u32),
        Domain::HalfLine(mp_zero()),
        pi() / 2u32,
    );
    f64_case(
        "1/(1+x^2) on [0,inf), exp-sinh",
        |x| 1.0 / (1.0 + x * x),
        Domain::HalfLine(0.0),
        std::f64::consts::FRAC_PI_2,
    );
}

/// The exp-exp map does not reach far enough for power-law decay, and says
/// so instead of returning a wrong value.
#[test]
fn exp_exp_refuses_power_law_decay() {
    let e = default_rule()
        .integrate(
            |x: &f64| c64(1.0 / (1.0 + x * x)),
            &Domain::HalfLineExpDecay(0.0),
            Prec::DOUBLE,
        )
        .unwrap_err();
    match e {
        Error::NoConvergence { hint, .. } => assert!(hint.contains("HalfLine"), "{hint}"),
        e => panic!("unexpected {e:?}"),
    }
}

/// `sin(θt)/sinh(t)` at 100 digits.
fn sin_over_sinh_mp(theta: &Complex) -> impl Fn(&Float) -> Complex + '_ {
    move |t: &Float| {
        let p = t.prec();
        Complex::with_val(p, theta * t).sin() / Float::with_val(p, t.sinh_ref())
    }
}

/// (π/2) tanh(πθ/2).
fn sin_over_sinh_exact(theta: &Complex) -> Complex {
    let half_pi = pi() / 2u32;
    Complex::with_val(P, theta * &half_pi).tanh() * half_pi
}

/// ∫_0^∞ sin(θt)/sinh(t) dt = (π/2) tanh(πθ/2) (Gradshteyn–Ryzhik 3.981.1
/// with β = 1), the oscillating scalar-factor type, at real θ = 0.7 and
/// complex θ = 0.5 + 0.3i, on both half-line maps.
#[test]
fn sin_over_sinh() {
    for (re, im) in [(0.7, 0.0), (0.5, 0.3)] {
        let theta = Complex::with_val(P, (re, im));
        let exact = sin_over_sinh_exact(&theta);
        for (map, dom) in [
            ("exp-sinh", Domain::HalfLine(mp_zero())),
            ("exp-exp", Domain::HalfLineExpDecay(mp_zero())),
        ] {
            let n = Cell::new(0);
            let f = sin_over_sinh_mp(&theta);
            let r = default_rule()
                .integrate(
                    |t: &Float| {
                        n.set(n.get() + 1);
                        f(t)
                    },
                    &dom,
                    digits100(),
                )
                .unwrap();
            check_mp(
                &format!("sin({re}+{im}i t)/sinh t, {map}"),
                &r,
                &exact,
                n.get(),
            );
        }
        let th = Complex64::new(re, im);
        let ex = Complex64::new(exact.real().to_f64(), exact.imag().to_f64());
        for (map, dom) in [
            ("exp-sinh", Domain::HalfLine(0.0)),
            ("exp-exp", Domain::HalfLineExpDecay(0.0)),
        ] {
            let n = Cell::new(0);
            let r = default_rule()
                .integrate(
                    |t: &f64| {
                        n.set(n.get() + 1);
                        (th * t).sin() / t.sinh()
                    },
                    &dom,
                    Prec::DOUBLE,
                )
                .unwrap();
            check_f64(&format!("sin({re}+{im}i t)/sinh t, {map}"), &r, ex, n.get());
        }
    }
}

/// Eight values of θ in one pass agree with one-at-a-time integration and
/// with Gradshteyn–Ryzhik 3.981.1.
#[test]
fn integrate_many_matches_one_at_a_time() {
    let thetas: Vec<(f64, f64)> = (0..8)
        .map(|j| (0.1 + 0.25 * j as f64, 0.05 * j as f64))
        .collect();
    // 100 digits
    let th: Vec<Complex> = thetas.iter().map(|&z| Complex::with_val(P, z)).collect();
    let dom = Domain::HalfLineExpDecay(mp_zero());
    let many = default_rule()
        .integrate_many(
            |t: &Float, out: &mut [Complex]| {
                let p = t.prec();
                let sh = Float::with_val(p, t.sinh_ref());
                for (o, z) in out.iter_mut().zip(&th) {
                    *o = Complex::with_val(p, z * t).sin() / &sh;
                }
            },
            th.len(),
            &dom,
            digits100(),
        )
        .unwrap();
    for (z, m) in th.iter().zip(&many) {
        let one = default_rule()
            .integrate(sin_over_sinh_mp(z), &dom, digits100())
            .unwrap();
        check_mp("many: theta (100 digits)", m, &sin_over_sinh_exact(z), 0);
        let d = Complex::with_val(P, &m.value - &one.value)
            .abs()
            .real()
            .to_f64();
        assert!(Radius::from_f64(d) <= m.radius + one.radius);
    }
    // double
    let th: Vec<Complex64> = thetas.iter().map(|&(a, b)| Complex64::new(a, b)).collect();
    let dom = Domain::HalfLineExpDecay(0.0);
    let many = default_rule()
        .integrate_many(
            |t: &f64, out: &mut [Complex64]| {
                let sh = t.sinh();
                for (o, z) in out.iter_mut().zip(&th) {
                    *o = (z * t).sin() / sh;
                }
            },
            th.len(),
            &dom,
            Prec::DOUBLE,
        )
        .unwrap();
    for (z, m) in th.iter().zip(&many) {
        let one = default_rule()
            .integrate(|t: &f64| (z * t).sin() / t.sinh(), &dom, Prec::DOUBLE)
            .unwrap();
        let ex = sin_over_sinh_exact(&Complex::with_val(P, (z.re, z.im)));
        let ex = Complex64::new(ex.real().to_f64(), ex.imag().to_f64());
        check_f64("many: theta (double)", m, ex, 0);
        assert!((m.value - one.value).norm() <= m.radius.to_f64() + one.radius.to_f64());
    }
}

// ---------------------------------------------------------------- the cache

/// A fresh rule builds tables; a lower precision is served by rounding the
/// cached higher-precision tables, and the results are as accurate.
#[test]
fn cache_reuse_and_rounding() {
    let rule = DoubleExponential::new();
    let theta = Complex::with_val(P, (0.7, 0.0));
    let dom = Domain::HalfLineExpDecay(mp_zero());
    let hi = rule
        .integrate(sin_over_sinh_mp(&theta), &dom, digits100())
        .unwrap();
    let n = rule.cached_tables();
    assert!(n >= 5);
    let again = rule
        .integrate(sin_over_sinh_mp(&theta), &dom, digits100())
        .unwrap();
    assert_eq!(rule.cached_tables(), n);
    assert_eq!(hi, again);
    let p50 = Prec::digits(50).unwrap();
    let lo = rule.integrate(sin_over_sinh_mp(&theta), &dom, p50).unwrap();
    let exact = sin_over_sinh_exact(&theta);
    let err = Complex::with_val(P, &lo.value - &exact)
        .abs()
        .real()
        .to_f64();
    assert!(err <= lo.radius.to_f64() && err < 1e-50);
    assert!(lo.meets(p50.bits()));
    // And the same 50-digit tables computed directly give the same value.
    let direct = DoubleExponential::new()
        .integrate(sin_over_sinh_mp(&theta), &dom, p50)
        .unwrap();
    let d = Complex::with_val(P, &lo.value - &direct.value)
        .abs()
        .real()
        .to_f64();
    assert!(d <= 1e-50);
}

/// The rule is Send + Sync and gives the same results from several threads.
#[test]
fn shared_between_threads() {
    fn assert_send_sync<T: Send + Sync>(_: &T) {}
    let rule = DoubleExponential::new();
    assert_send_sync(&rule);
    let results: Vec<Approx<Complex64>> = std::thread::scope(|s| {
        let hs: Vec<_> = (0..4)
            .map(|_| {
                s.spawn(|| {
                    rule.integrate(
                        |t: &f64| (Complex64::new(0.5, 0.3) * t).sin() / t.sinh(),
                        &Domain::HalfLineExpDecay(0.0),
                        Prec::DOUBLE,
                    )
                    .unwrap()
                })
            })
            .collect();
        hs.into_iter().map(|h| h.join().unwrap()).collect()
    });
    assert!(results.windows(2).all(|w| w[0] == w[1]));
}

// ---------------------------------------------------------------- bad input

/// ∫_0^1 dx/x diverges: NoConvergence, at both precisions (common practice:
/// a DE rule must not return a finite value for a divergent integral).
#[test]
fn divergent_integral_is_no_convergence() {
    let e = default_rule()
        .integrate(
            |x: &Float| Complex::with_val(x.prec(), x.clone().recip()),
            &Domain::Finite(mp_zero(), mp_one()),
            digits100(),
        )
        .unwrap_err();
    assert!(matches!(e, Error::NoConvergence { .. }), "{e:?}");
    eprintln!("{e}");
    let e = default_rule()
        .integrate(
            |x: &f64| c64(1.0 / x),
            &Domain::Finite(0.0, 1.0),
            Prec::DOUBLE,
        )
        .unwrap_err();
    assert!(matches!(e, Error::NoConvergence { .. }), "{e:?}");
}

/// Too few levels for 100 digits: NoConvergence with the best estimate and a
/// hint naming `with_max_level`.
#[test]
fn max_level_too_small_is_no_convergence() {
    let e = default_rule()
        .with_max_level(3)
        .integrate(
            |x: &Float| Complex::with_val(x.prec(), x.ln_ref()),
            &Domain::Finite(mp_zero(), mp_one()),
            digits100(),
        )
        .unwrap_err();
    eprintln!("{e}");
    match e {
        Error::NoConvergence { achieved, hint, .. } => {
            assert!(hint.contains("with_max_level"), "{hint}");
            assert!(achieved.contains("-1.0000"), "{achieved}");
        }
        e => panic!("unexpected {e:?}"),
    }
}

/// A NaN integrand value is a typed error naming the point.
#[test]
fn nan_integrand_is_an_error() {
    let e = default_rule()
        .integrate(
            |x: &f64| c64(if *x > 0.5 { f64::NAN } else { 1.0 }),
            &Domain::Finite(0.0, 1.0),
            Prec::DOUBLE,
        )
        .unwrap_err();
    match e {
        Error::Domain { message, .. } => {
            assert!(message.contains("NaN") && message.contains("x = "))
        }
        e => panic!("unexpected {e:?}"),
    }
    let e = default_rule()
        .integrate_many(
            |x: &Float, out: &mut [Complex]| {
                out[0] = Complex::with_val(x.prec(), 1);
                out[1] = Complex::with_val(x.prec(), (f64::INFINITY, 0));
            },
            2,
            &Domain::HalfLine(mp_zero()),
            digits100(),
        )
        .unwrap_err();
    match e {
        Error::Domain { message, .. } => assert!(message.contains("integrand 1"), "{message}"),
        e => panic!("unexpected {e:?}"),
    }
}

/// Inverted, non-finite and empty intervals; too much precision on the
/// double path.
#[test]
fn bad_domains() {
    let one = |_: &f64| c64(1.0);
    let r = default_rule();
    assert!(matches!(
        r.integrate(one, &Domain::Finite(1.0, 0.0), Prec::DOUBLE),
        Err(Error::Domain { .. })
    ));
    assert!(matches!(
        r.integrate(one, &Domain::Finite(f64::NAN, 1.0), Prec::DOUBLE),
        Err(Error::NonFinite { argument: "a", .. })
    ));
    assert!(matches!(
        r.integrate(one, &Domain::Finite(0.0, f64::INFINITY), Prec::DOUBLE),
        Err(Error::NonFinite { argument: "b", .. })
    ));
    assert!(matches!(
        r.integrate(one, &Domain::HalfLine(f64::NEG_INFINITY), Prec::DOUBLE),
        Err(Error::NonFinite { argument: "a", .. })
    ));
    assert!(matches!(
        r.integrate(one, &Domain::Finite(0.0, 1.0), Prec::from_bits(60).unwrap()),
        Err(Error::DoubleTooPrecise { requested_bits: 60 })
    ));
    let z = r
        .integrate(one, &Domain::Finite(2.0, 2.0), Prec::DOUBLE)
        .unwrap();
    assert_eq!(z.value, c64(0.0));
    assert!(z.radius.is_zero());
    let mp_inf = Float::with_val(P, f64::INFINITY);
    assert!(matches!(
        r.integrate(
            |x: &Float| Complex::with_val(x.prec(), 1),
            &Domain::HalfLineExpDecay(mp_inf),
            digits100()
        ),
        Err(Error::NonFinite { .. })
    ));
}
