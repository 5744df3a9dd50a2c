//! Bad input to the special functions: each case returns a typed error whose
//! message says what is wrong and what to do; none panics, none returns NaN.

use dressing::special::*;
use dressing::{Error, Prec};
use num_complex::Complex64;
use rug::Complex;

#[test]
fn nan_and_infinite_arguments() {
    let p = Prec::DOUBLE;
    for z in [
        Complex64::new(f64::NAN, 0.0),
        Complex64::new(0.5, f64::INFINITY),
        Complex64::new(f64::NEG_INFINITY, 1.0),
    ] {
        for (name, r) in [
            ("log_gamma", log_gamma(&z, p).map(|_| ())),
            ("gamma", gamma(&z, p).map(|_| ())),
            ("rgamma", rgamma(&z, p).map(|_| ())),
            ("digamma", digamma(&z, p).map(|_| ())),
            ("polygamma", polygamma(2, &z, p).map(|_| ())),
            ("log_barnes_g", log_barnes_g(&z, p).map(|_| ())),
            (
                "hurwitz_zeta",
                hurwitz_zeta(&Complex64::new(2.0, 0.0), &z, p).map(|_| ()),
            ),
        ] {
            let e = r.unwrap_err();
            assert!(matches!(e, Error::NonFinite { .. }), "{name}: {e:?}");
            assert!(e.to_string().contains("NaN or infinite"), "{name}: {e}");
        }
    }
    let nan = Complex::with_val(64, (f64::NAN, 0.0));
    assert!(matches!(
        log_gamma(&nan, Prec::digits(30).unwrap()),
        Err(Error::NonFinite { .. })
    ));
}

#[test]
fn zero_and_absurd_precision() {
    let e = Prec::digits(0).unwrap_err();
    assert_eq!(e, Error::ZeroPrecision);
    assert!(e.to_string().contains("at least 1"));
    assert!(matches!(Prec::from_bits(0), Err(Error::ZeroPrecision)));
    let e = Prec::digits(10_000_000).unwrap_err();
    assert!(matches!(e, Error::PrecisionTooHigh { .. }));
    assert!(e.to_string().contains("ask for fewer digits"), "{e}");
    assert!(Prec::from_bits(Prec::MAX_BITS as u64).is_ok());
    assert!(Prec::from_bits(Prec::MAX_BITS as u64 + 1).is_err());
}

#[test]
fn double_path_refuses_more_than_53_bits() {
    let e = log_gamma(&Complex64::new(1.5, 0.0), Prec::digits(30).unwrap()).unwrap_err();
    assert!(matches!(
        e,
        Error::DoubleTooPrecise {
            requested_bits: 100
        }
    ));
    assert!(e.to_string().contains("rug::Complex"), "{e}");
}

#[test]
fn poles_are_reported_as_poles() {
    let p = Prec::DOUBLE;
    for n in [0.0, -1.0, -7.0, -100.0] {
        let z = Complex64::new(n, 0.0);
        let e = gamma(&z, p).unwrap_err();
        assert!(matches!(e, Error::Pole { order: 1, .. }), "{e:?}");
        assert!(e.to_string().contains("pole of order 1"), "{e}");
        assert!(matches!(
            log_gamma(&z, p),
            Err(Error::Pole { order: 1, .. })
        ));
        // ψ⁽ⁿ⁾ has a pole of order n+1 (DLMF 5.15.1 with 5.7.6).
        assert!(matches!(digamma(&z, p), Err(Error::Pole { order: 1, .. })));
        assert!(matches!(
            polygamma(3, &z, p),
            Err(Error::Pole { order: 4, .. })
        ));
        // 1/Γ is entire: an exact zero, not an error.
        let r = rgamma(&z, p).unwrap();
        assert_eq!(r.value, Complex64::new(0.0, 0.0));
        assert!(r.radius.is_zero());
    }
    let mp = Complex::with_val(200, -3);
    assert!(matches!(
        gamma(&mp, Prec::digits(50).unwrap()),
        Err(Error::Pole { order: 1, .. })
    ));
}

#[test]
fn barnes_zeros_and_far_left() {
    // G has a zero of order n+1 at −n (DLMF 5.17.2 with 5.17.1).
    for (n, order) in [(0.0, 1), (-1.0, 2), (-4.0, 5)] {
        let e = log_barnes_g(&Complex64::new(n, 0.0), Prec::DOUBLE).unwrap_err();
        assert!(
            matches!(e, Error::Zero { order: o, .. } if o == order),
            "{e:?}"
        );
        let g = barnes_g(&Complex64::new(n, 0.0), Prec::DOUBLE).unwrap();
        assert_eq!(g.value, Complex64::new(0.0, 0.0));
    }
    let e = log_barnes_g(&Complex64::new(-2.0e6, 0.5), Prec::DOUBLE).unwrap_err();
    assert!(matches!(e, Error::Domain { .. }));
    assert!(e.to_string().contains("recurrence"), "{e}");
}

#[test]
fn hurwitz_poles_and_domain() {
    let p = Prec::DOUBLE;
    let one = Complex64::new(1.0, 0.0);
    assert!(matches!(
        hurwitz_zeta(&one, &one, p),
        Err(Error::Pole { order: 1, .. })
    ));
    let e = hurwitz_zeta(&Complex64::new(3.0, 0.0), &Complex64::new(-2.0, 0.0), p).unwrap_err();
    assert!(matches!(e, Error::Pole { order: 3, .. }), "{e:?}");
    let e = hurwitz_zeta(&Complex64::new(2.5, 0.0), &Complex64::new(-0.5, 0.0), p).unwrap_err();
    assert!(matches!(e, Error::Domain { .. }));
    assert!(e.to_string().contains("Re a > 0"), "{e}");
}

#[test]
fn overflow_on_the_double_path() {
    let e = gamma(&Complex64::new(200.0, 0.0), Prec::DOUBLE).unwrap_err();
    assert!(matches!(e, Error::Overflow { .. }));
    assert!(e.to_string().contains("log_gamma"), "{e}");
    // The arbitrary path has the exponent range for it: Γ(200) = 199!.
    let g = gamma(&Complex::with_val(64, 200), Prec::digits(15).unwrap()).unwrap();
    let want = rug::Float::with_val(64, rug::Integer::from(rug::Integer::factorial(199)));
    let rel = ((g.value.real().clone() - &want) / &want).abs();
    assert!(rel.to_f64() < 1e-15);
}

#[test]
fn polygamma_order_cap() {
    let e = polygamma(10_000, &Complex64::new(1.5, 0.0), Prec::DOUBLE).unwrap_err();
    assert!(matches!(e, Error::Domain { .. }));
    assert!(e.to_string().contains("order"), "{e}");
}

#[test]
fn tiny_arguments_near_the_pole_at_zero_stay_cheap() {
    // ψ(z) = −1/z − γ + O(z) (DLMF 5.7.6, common practice): at z = 10^-7100
    // the value is −10^7100 to all digits; no guard bits are needed for the
    // distance to the pole at 0, so this must not escalate the precision.
    let z = Complex::with_val(64, rug::Float::parse("1e-7100").unwrap());
    let r = digamma(&z, Prec::digits(15).unwrap()).unwrap();
    let want = -rug::Float::with_val(64, z.real().recip_ref());
    let rel = ((r.value.real().clone() - &want) / &want).abs();
    assert!(rel.to_f64() < 1e-15, "{rel}");
    let lg = log_gamma(&z, Prec::digits(15).unwrap()).unwrap();
    // log Γ(z) = −ln z − γz + … ≈ 7100 ln 10
    assert!((lg.value.real().to_f64() - 7100.0 * std::f64::consts::LN_10).abs() < 1e-9);
}

#[test]
fn exact_zeros_of_log_barnes_g_are_exact() {
    // G(1) = G(2) = G(3) = 1 (DLMF 5.17.2): no precision escalation there.
    for n in 1..=3 {
        let r = log_barnes_g(&Complex::with_val(1100, n), Prec::digits(300).unwrap()).unwrap();
        assert!(r.value.is_zero() && r.radius.is_zero());
    }
}

#[test]
fn huge_arguments_do_not_panic_or_return_infinity() {
    // |Re z| beyond 2^63 (integer conversions must not overflow).
    let z = Complex64::new(-1e19, 0.5);
    let d = log_gamma(&z, Prec::DOUBLE).unwrap();
    let m = log_gamma(
        &Complex::with_val(64, (-1e19, 0.5)),
        Prec::digits(15).unwrap(),
    )
    .unwrap();
    let rel = ((d.value.re - m.value.real().to_f64()).hypot(d.value.im - m.value.imag().to_f64()))
        / d.value.norm();
    assert!(rel < 1e-13, "double and MPFR paths differ by {rel:e}");
    // |z| near the top of the double range: a finite value with a finite radius …
    let r = log_gamma(&Complex64::new(1e300, 0.5), Prec::DOUBLE).unwrap();
    assert!(r.value.re.is_finite() && r.radius.is_finite());
    // … and past it an Overflow error, not infinity.
    assert!(matches!(
        log_gamma(&Complex64::new(1.7e308, 0.5), Prec::DOUBLE),
        Err(Error::Overflow { .. })
    ));
    assert!(matches!(
        polygamma(200, &Complex64::new(0.001, 0.0), Prec::DOUBLE),
        Err(Error::Overflow { .. })
    ));
}

#[test]
fn hurwitz_far_left_is_refused_not_slow() {
    let e = hurwitz_zeta(
        &Complex64::new(2.0, 0.0),
        &Complex64::new(-1e7, 0.5),
        Prec::DOUBLE,
    )
    .unwrap_err();
    assert!(
        matches!(e, Error::Domain { .. }) && e.to_string().contains("shift a"),
        "{e}"
    );
}
