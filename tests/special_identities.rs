//! Special functions against identities from the NIST Digital Library of
//! Mathematical Functions (DLMF, https://dlmf.nist.gov), equation numbers
//! beside each check, and against independent methods inside the crate
//! (asymptotic series vs Euler–Maclaurin, analytic vs numerical derivative).

mod common;

use common::*;
use dressing::num::ComplexField;
use dressing::special::*;
use dressing::Prec;
use num_complex::Complex64;
use rug::float::Constant;
use rug::{Complex, Float};

const DIGITS: [u32; 5] = [30, 50, 100, 300, 1000];

/// Test points spread over the regions the implementation treats differently
/// (shifted Stirling, reflection, large |z|, near the negative axis).
fn points() -> Vec<(f64, f64)> {
    vec![
        (0.3, 0.7),
        (2.7, 1.3),
        (-2.2, 0.4),
        (-7.3, 0.4),
        (-12.6, -3.1),
        (15.0, -40.0),
        (0.01, 200.0),
        (1234.5, 0.25),
    ]
}

fn mp(x: f64, y: f64, prec: u32) -> Complex {
    Complex::with_val(prec, (x, y))
}

fn prec(d: u32) -> Prec {
    Prec::digits(d as u64).unwrap()
}

/// Agreement to `digits` significant digits, with `slack` digits allowed for
/// the arithmetic of the identity itself.
fn assert_close(got: &Complex, want: &Complex, digits: u32, slack: f64, what: &str) {
    let rel = log2_rel(got, want, 0.0) * std::f64::consts::LOG10_2;
    assert!(
        rel <= -(digits as f64) + slack,
        "{what}: agreement only 10^{rel:.1} at {digits} digits\n got  {}\n want {}",
        got.to_decimal(40),
        want.to_decimal(40)
    );
}

#[test]
fn recurrence_log_gamma() {
    // DLMF 5.5.1 in log form: log Γ(z+1) = log Γ(z) + ln z on the principal
    // branches (both sides analytic off the negative axis).
    for &d in &DIGITS {
        let p = bits(d) + 20;
        for (x, y) in points() {
            let z = mp(x, y, p);
            let a = log_gamma(&(z.clone() + 1u32), prec(d + 5)).unwrap().value;
            let b = log_gamma(&z, prec(d + 5)).unwrap().value + z.clone().ln();
            assert_close(&a, &b, d, 0.5, &format!("5.5.1 at {x}+{y}i"));
        }
    }
}

#[test]
fn reflection_gamma() {
    // DLMF 5.5.3: Γ(z) Γ(1−z) = π / sin(πz).
    for &d in &DIGITS {
        let p = bits(d) + 20;
        for (x, y) in [(0.3, 0.7), (-2.2, 0.4), (-7.3, 0.4), (3.9, -2.5)] {
            let z = mp(x, y, p);
            let one_minus = Complex::with_val(p, 1u32 - &z);
            let lhs = gamma(&z, prec(d + 5)).unwrap().value
                * gamma(&one_minus, prec(d + 5)).unwrap().value;
            let pi = Float::with_val(p, Constant::Pi);
            let rhs = Complex::with_val(p, &pi / Complex::with_val(p, &z * &pi).sin());
            assert_close(&lhs, &rhs, d, 1.0, &format!("5.5.3 at {x}+{y}i"));
        }
    }
}

#[test]
fn duplication_gamma() {
    // DLMF 5.5.5: Γ(2z) = π^{−1/2} 2^{2z−1} Γ(z) Γ(z+½).
    for &d in &DIGITS {
        let p = bits(d) + 20;
        for (x, y) in [(0.3, 0.7), (2.7, 1.3), (-3.7, 0.9), (11.0, -6.0)] {
            let z = mp(x, y, p);
            let lhs = gamma(&Complex::with_val(p, &z * 2u32), prec(d + 5))
                .unwrap()
                .value;
            let half = Complex::with_val(p, &z + 0.5f64);
            let g =
                gamma(&z, prec(d + 5)).unwrap().value * gamma(&half, prec(d + 5)).unwrap().value;
            let two = Complex::with_val(p, 2u32);
            let pow = two.pow(&(Complex::with_val(p, &z * 2u32) - 1u32));
            let sqrt_pi = Float::with_val(p, Constant::Pi).sqrt();
            let rhs = g * pow / sqrt_pi;
            assert_close(&lhs, &rhs, d, 1.0, &format!("5.5.5 at {x}+{y}i"));
        }
    }
}

#[test]
fn gamma_half_squared_is_pi() {
    // DLMF 5.4.6: Γ(1/2) = √π.
    for &d in &DIGITS {
        let p = bits(d) + 20;
        let g = gamma(&mp(0.5, 0.0, p), prec(d)).unwrap();
        let sq = Complex::with_val(p, &g.value * &g.value);
        let pi = Complex::with_val(p, Constant::Pi);
        assert_close(&sq, &pi, d, 0.5, "Γ(1/2)² = π");
        assert!(g.correct_digits() >= d as f64 - 0.01);
    }
}

#[test]
fn digamma_at_one_is_minus_euler() {
    // DLMF 5.4.12: ψ(1) = −γ; γ from MPFR and from mpmath (tests/data/constants.tsv).
    let consts = table("constants.tsv");
    let mpmath_euler = &consts.iter().find(|r| r[0] == "euler").unwrap()[2];
    for &d in &DIGITS {
        let p = bits(d) + 20;
        let psi = digamma(&mp(1.0, 0.0, p), prec(d)).unwrap().value;
        let want = Complex::with_val(p, -float(mpmath_euler, p));
        assert_close(&psi, &want, d, 0.5, "ψ(1) = −γ");
        let mpfr = Complex::with_val(p, -Float::with_val(p, Constant::Euler));
        assert_close(&psi, &mpfr, d, 0.5, "ψ(1) = −γ (MPFR)");
    }
}

#[test]
fn barnes_g_half_closed_form() {
    // DLMF 5.17.7 (from memory): G(1/2) = 2^{1/24} e^{1/8} π^{−1/4} A^{−3/2},
    // with Glaisher's A from mpmath 1.4.1 (tests/data/constants.tsv).
    let consts = table("constants.tsv");
    let a_str = &consts.iter().find(|r| r[0] == "glaisher").unwrap()[2];
    for &d in &DIGITS {
        let p = bits(d) + 20;
        let lg = log_barnes_g(&mp(0.5, 0.0, p), prec(d)).unwrap().value;
        let a = float(a_str, p);
        let want = Float::with_val(p, 2u32).ln() / 24u32 + Float::with_val(p, 1u32) / 8u32
            - Float::with_val(p, Constant::Pi).ln() / 4u32
            - a.ln() * 1.5f64;
        assert_close(&lg, &Complex::with_val(p, want), d, 0.5, "log G(1/2)");
    }
}

#[test]
fn glaisher_and_zeta_prime_against_mpmath() {
    // mpmath 1.4.1 glaisher and zeta(-1, derivative=1), 1050 digits.
    let consts = table("constants.tsv");
    for &d in &DIGITS {
        let p = bits(d) + 20;
        for (name, got) in [
            ("glaisher", glaisher(prec(d)).value),
            ("zeta_prime_minus1", zeta_prime_minus_one(prec(d)).value),
        ] {
            let want = float(&consts.iter().find(|r| r[0] == name).unwrap()[2], p);
            let rel = Float::with_val(p, (Float::with_val(p, &got - &want) / &want).abs());
            assert!(
                rel.to_f64() <= 10f64.powi(-(d as i32))
                    || rel.clone().log10().to_f64() <= -(d as f64),
                "{name} at {d} digits: relative error {rel}"
            );
        }
    }
}

#[test]
fn barnes_recurrence() {
    // DLMF 5.17.1: G(z+1) = Γ(z) G(z), in log form on the principal branches.
    for &d in &[30u32, 50, 100, 300] {
        let p = bits(d) + 20;
        for (x, y) in [
            (0.3, 0.7),
            (2.7, 1.3),
            (-2.2, 0.4),
            (-7.3, 0.4),
            (6.0, -9.0),
        ] {
            let z = mp(x, y, p);
            let a = log_barnes_g(&(z.clone() + 1u32), prec(d + 5))
                .unwrap()
                .value;
            let b = log_barnes_g(&z, prec(d + 5)).unwrap().value
                + log_gamma(&z, prec(d + 5)).unwrap().value;
            assert_close(&a, &b, d, 1.0, &format!("5.17.1 at {x}+{y}i"));
        }
    }
}

#[test]
fn polygamma_equals_hurwitz_zeta() {
    // DLMF 25.11.12: ψ⁽ⁿ⁾(a) = (−1)^{n+1} n! ζ(n+1, a). The two sides come
    // from different methods (shift + asymptotic series vs Euler–Maclaurin).
    for &d in &[30u32, 50, 100, 300] {
        let p = bits(d) + 20;
        for n in 1u32..=5 {
            for (x, y) in [(0.3, 0.7), (2.7, 1.3), (-2.2, 0.4), (40.0, -3.0)] {
                let a = mp(x, y, p);
                let psi = polygamma(n, &a, prec(d)).unwrap().value;
                let s = Complex::with_val(p, n + 1);
                let zeta = hurwitz_zeta(&s, &a, prec(d)).unwrap().value;
                let fact = Float::with_val(p, rug::Integer::from(rug::Integer::factorial(n)));
                let rhs = zeta * fact * if n % 2 == 1 { 1i32 } else { -1i32 };
                assert_close(&psi, &rhs, d, 1.0, &format!("25.11.12 n={n} at {x}+{y}i"));
            }
        }
    }
}

#[test]
fn digamma_is_derivative_of_log_gamma() {
    // Analytic ψ against the central difference (log Γ(z+h) − log Γ(z−h))/(2h),
    // whose error is h²|ψ''|/6: with h = 10^-40 at 120 digits, agreement to 70.
    let d = 120;
    let p = bits(d) + 20;
    let h = Float::with_val(p, Float::parse("1e-40").unwrap());
    for (x, y) in points() {
        let z = mp(x, y, p);
        let zp = Complex::with_val(p, &z + &h);
        let zm = Complex::with_val(p, &z - &h);
        let num = (log_gamma(&zp, prec(d)).unwrap().value - log_gamma(&zm, prec(d)).unwrap().value)
            / Float::with_val(p, &h * 2u32);
        let psi = digamma(&z, prec(d)).unwrap().value;
        assert_close(&psi, &num, 70, 0.5, &format!("ψ = d log Γ at {x}+{y}i"));
    }
}

#[test]
fn polygamma_reflection_branch_agrees_with_shift() {
    // The reflection branch (Re z < −5) against the shift branch evaluated at
    // the same points through the recurrence DLMF 5.15.5:
    // ψ⁽ⁿ⁾(z) = ψ⁽ⁿ⁾(z+m) − (−1)^n n! Σ_{k<m} (z+k)^{−n−1}.
    let d = 50;
    let p = bits(d) + 20;
    for n in 0u32..=4 {
        for (x, y) in [(-7.3, 0.4), (-12.6, -3.1), (-30.5, 0.0)] {
            let z = mp(x, y, p);
            let m = 40i32;
            let shifted = polygamma(n, &Complex::with_val(p, &z + m), prec(d + 10))
                .unwrap()
                .value;
            let mut sum = Complex::with_val(p, 0);
            for k in 0..m {
                let t = Complex::with_val(p, &z + k);
                sum += rug::ops::Pow::pow(t, -(n as i32) - 1);
            }
            let fact = Float::with_val(p, rug::Integer::from(rug::Integer::factorial(n)));
            let sign = if n % 2 == 0 { 1i32 } else { -1i32 };
            let via_shift = shifted - sum * fact * sign;
            let direct = polygamma(n, &z, prec(d)).unwrap().value;
            assert_close(
                &direct,
                &via_shift,
                d,
                1.0,
                &format!("reflection n={n} at {x}+{y}i"),
            );
        }
    }
}

#[test]
fn bernoulli_against_mpmath() {
    // mpmath 1.4.1 bernfrac (tests/data/bernoulli.tsv), exact rationals.
    for row in table("bernoulli.tsv") {
        let n: u32 = row[0].parse().unwrap();
        let want = rug::Rational::from((
            row[1].parse::<rug::Integer>().unwrap(),
            row[2].parse::<rug::Integer>().unwrap(),
        ));
        assert_eq!(bernoulli(n), want, "B_{n}");
    }
}

#[test]
fn double_path_matches_arbitrary_path_on_identities() {
    // The double path on the recurrence (DLMF 5.5.1) and ψ(1) = −γ (5.4.12).
    let z = Complex64::new(2.5, 0.75);
    let a = log_gamma(&(z + 1.0), Prec::DOUBLE).unwrap().value;
    let b = log_gamma(&z, Prec::DOUBLE).unwrap().value + z.ln();
    assert!((a - b).norm() < 1e-14 * a.norm());
    let psi = digamma(&Complex64::new(1.0, 0.0), Prec::DOUBLE)
        .unwrap()
        .value;
    assert!((psi.re + 0.577_215_664_901_532_9).abs() < 1e-15);
}
