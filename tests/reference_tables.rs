//! Special functions against reference tables computed with mpmath 1.4.1
//! (scripts/gen_reference.py; the tables' headers say how each was made).
//!
//! Double path: complex relative error `|got − ref| / |ref|` at most 1e-14
//! (absolute where |ref| < 1e-3, near zeros of the function). Arbitrary path:
//! relative error below 10^-d at d requested digits. Everywhere: the returned
//! error estimate must cover the actual error.

mod common;

use common::*;
use dressing::num::ComplexField;
use dressing::special::*;
use dressing::{Approx, Prec};
use num_complex::Complex64;
use rug::Complex;

const DOUBLE_TOL: f64 = 1e-14;
const DOUBLE_FLOOR: f64 = 1e-3;

struct Tally {
    name: String,
    worst: f64,
    worst_at: String,
    count: usize,
    failures: Vec<String>,
}

impl Tally {
    fn new(name: &str) -> Self {
        Tally {
            name: name.into(),
            worst: 0.0,
            worst_at: String::new(),
            count: 0,
            failures: Vec::new(),
        }
    }
    fn finish(self, min_rows: usize) {
        eprintln!(
            "{}: {} points, worst relative error {:.2e} at {}",
            self.name, self.count, self.worst, self.worst_at
        );
        assert!(
            self.count >= min_rows,
            "{}: only {} rows",
            self.name,
            self.count
        );
        assert!(
            self.failures.is_empty(),
            "{}: {} failures, first ones:\n{}",
            self.name,
            self.failures.len(),
            self.failures[..self.failures.len().min(12)].join("\n")
        );
    }
}

fn check_double(t: &mut Tally, at: &str, got: &Approx<Complex64>, want: &Complex) {
    t.count += 1;
    let rel = rel_err_f64(got.value, want, DOUBLE_FLOOR);
    if rel > t.worst {
        t.worst = rel;
        t.worst_at = at.to_string();
    }
    let g = Complex::with_val(want.prec().0, (got.value.re, got.value.im));
    let abs = log2_diff(&g, want).exp2();
    if rel.is_nan() || rel > DOUBLE_TOL {
        t.failures.push(format!(
            "{at}: relative error {rel:.2e} (got {}, want {})",
            got.value,
            want.to_decimal(20)
        ));
    } else if abs > got.radius.to_f64() && abs > 0.0 {
        t.failures.push(format!(
            "{at}: error {abs:.2e} exceeds estimate {}",
            got.radius
        ));
    }
}

fn check_mp(t: &mut Tally, at: &str, digits: u32, got: &Approx<Complex>, want: &Complex) {
    t.count += 1;
    let l2 = log2_rel(&got.value, want, -1e9);
    let rel10 = l2 * std::f64::consts::LOG10_2;
    if rel10 > t.worst.log10() || t.worst == 0.0 {
        t.worst = 10f64.powf(rel10);
        t.worst_at = format!("{at} ({digits} digits)");
    }
    let abs_l2 = log2_diff(&got.value, want);
    if rel10 > -(digits as f64) {
        t.failures
            .push(format!("{at}: only 10^{rel10:.1} at {digits} digits"));
    } else if abs_l2 > got.radius.log2() {
        t.failures.push(format!(
            "{at}: error 2^{abs_l2:.1} exceeds estimate 2^{:.1} at {digits} digits",
            got.radius.log2()
        ));
    }
}

fn double_table(file: &str, f: impl Fn(&Complex64) -> Approx<Complex64>, min_rows: usize) {
    let mut t = Tally::new(file);
    for row in table(file) {
        let (region, re, im) = (&row[0], &row[1], &row[2]);
        let z = c64(re, im);
        let want = complex(&row[3], &row[4], 200);
        let got = f(&z);
        check_double(
            &mut t,
            &format!("[{region}] {re}{im:+}i", im = im.parse::<f64>().unwrap()),
            &got,
            &want,
        );
    }
    t.finish(min_rows);
}

#[test]
fn log_gamma_double() {
    double_table(
        "loggamma_double.tsv",
        |z| log_gamma(z, Prec::DOUBLE).unwrap(),
        2000,
    );
}

#[test]
fn digamma_double() {
    double_table(
        "digamma_double.tsv",
        |z| digamma(z, Prec::DOUBLE).unwrap(),
        500,
    );
}

#[test]
fn trigamma_double() {
    double_table(
        "trigamma_double.tsv",
        |z| polygamma(1, z, Prec::DOUBLE).unwrap(),
        500,
    );
}

#[test]
fn log_barnes_g_double() {
    double_table(
        "logbarnesg_double.tsv",
        |z| log_barnes_g(z, Prec::DOUBLE).unwrap(),
        400,
    );
}

#[test]
fn polygamma_double() {
    let mut t = Tally::new("polygamma_double.tsv");
    for row in table("polygamma_double.tsv") {
        let n: u32 = row[0].parse().unwrap();
        let z = c64(&row[2], &row[3]);
        let want = complex(&row[4], &row[5], 200);
        let got = polygamma(n, &z, Prec::DOUBLE).unwrap();
        check_double(
            &mut t,
            &format!("n={n} [{}] {}{}i", row[1], row[2], row[3]),
            &got,
            &want,
        );
    }
    t.finish(400);
}

fn mp_point(re: &str, im: &str, digits: u32) -> Complex {
    Complex::with_val(
        bits(digits) + 16,
        (re.parse::<f64>().unwrap(), im.parse::<f64>().unwrap()),
    )
}

#[test]
fn log_gamma_arbitrary_precision() {
    let mut t = Tally::new("loggamma_mp.tsv");
    let mut seen = std::collections::BTreeSet::new();
    for row in table("loggamma_mp.tsv") {
        let digits: u32 = row[0].parse().unwrap();
        seen.insert(digits);
        let z = mp_point(&row[2], &row[3], digits);
        let want = complex(&row[4], &row[5], bits(digits + 20));
        let got = log_gamma(&z, Prec::digits(digits as u64).unwrap()).unwrap();
        check_mp(
            &mut t,
            &format!("[{}] {}{}i", row[1], row[2], row[3]),
            digits,
            &got,
            &want,
        );
    }
    assert_eq!(
        seen.into_iter().collect::<Vec<_>>(),
        vec![30, 50, 100, 300, 1000]
    );
    t.finish(150);
}

#[test]
fn polygamma_arbitrary_precision() {
    let mut t = Tally::new("polygamma_mp.tsv");
    for row in table("polygamma_mp.tsv") {
        let n: u32 = row[0].parse().unwrap();
        let digits: u32 = row[1].parse().unwrap();
        let z = mp_point(&row[2], &row[3], digits);
        let want = complex(&row[4], &row[5], bits(digits + 20));
        let got = polygamma(n, &z, Prec::digits(digits as u64).unwrap()).unwrap();
        check_mp(
            &mut t,
            &format!("n={n} {}{}i", row[2], row[3]),
            digits,
            &got,
            &want,
        );
    }
    t.finish(100);
}

#[test]
fn log_barnes_g_arbitrary_precision() {
    let mut t = Tally::new("logbarnesg_mp.tsv");
    for row in table("logbarnesg_mp.tsv") {
        let digits: u32 = row[0].parse().unwrap();
        let z = mp_point(&row[2], &row[3], digits);
        let want = complex(&row[4], &row[5], bits(digits + 20));
        let got = log_barnes_g(&z, Prec::digits(digits as u64).unwrap()).unwrap();
        check_mp(
            &mut t,
            &format!("[{}] {}{}i", row[1], row[2], row[3]),
            digits,
            &got,
            &want,
        );
    }
    t.finish(40);
}

#[test]
fn hurwitz_zeta_against_mpmath() {
    let mut t = Tally::new("hurwitz_zeta.tsv");
    let mut td = Tally::new("hurwitz_zeta.tsv (double)");
    for row in table("hurwitz_zeta.tsv") {
        let s: i64 = row[0].parse().unwrap();
        let digits: u32 = row[1].parse().unwrap();
        let at = format!("s={s} a={}{}i", row[2], row[3]);
        if digits <= 15 {
            let a = c64(&row[2], &row[3]);
            let want = complex(&row[4], &row[5], 200);
            let got = hurwitz_zeta(&Complex64::new(s as f64, 0.0), &a, Prec::DOUBLE).unwrap();
            check_double(&mut td, &at, &got, &want);
        } else {
            let a = mp_point(&row[2], &row[3], digits);
            let want = complex(&row[4], &row[5], bits(digits + 20));
            let sc = Complex::with_val(bits(digits) + 16, s);
            let got = hurwitz_zeta(&sc, &a, Prec::digits(digits as u64).unwrap()).unwrap();
            check_mp(&mut t, &at, digits, &got, &want);
        }
    }
    t.finish(50);
    td.finish(50);
}
