//! The finite pieces of scalar factors (`FiniteGamma`, `BarnesFactor`,
//! `CddBlock`): mpmath 1.4.1 reference tables (tests/data/factor_pieces_*.tsv,
//! scripts/gen_pieces_reference.py), closed forms (DLMF), the functional
//! equations of CDD blocks, poles, zeros and bad input.
//!
//! Errors are measured on the logarithm, absolutely: `|Δ log F|` is the
//! relative error of F. Everywhere the returned radius must cover it.

mod common;

use common::*;
use dressing::factor::{BarnesFactor, CddBlock, Coef, FiniteGamma, Scale};
use dressing::num::ComplexField;
use dressing::special::log_gamma;
use dressing::{Approx, Error, Prec};
use num_complex::Complex64;
use rug::float::Constant;
use rug::{Complex, Float};
use std::f64::consts::PI;

// ---------------------------------------------------------------------------
// the pieces of scripts/gen_pieces_reference.py (same names, same terms)

fn coef(c: &str) -> Coef {
    match c {
        "sqrt2" => Coef::computed("√2", |p| Float::with_val(p, 2).sqrt()),
        "rsqrt2" => Coef::computed("1/√2", |p| Float::with_val(p, 2).sqrt().recip()),
        _ => {
            let (n, d) = c.split_once('/').unwrap_or((c, "1"));
            Coef::rational(n.parse().unwrap(), d.parse().unwrap())
        }
    }
}

fn terms(t: &[(&str, &str, i64)]) -> Vec<(Coef, Coef, i64)> {
    t.iter().map(|(b, s, n)| (coef(b), coef(s), *n)).collect()
}

fn gamma_piece(name: &str) -> FiniteGamma {
    let (scale, t): (Scale, &[(&str, &str, i64)]) = match name {
        "reflect_half" => (Scale::Unit, &[("1/2", "1", 1), ("1/2", "-1", 1)]),
        "gamma" => (Scale::Unit, &[("0", "1", 1)]),
        "sigma" => (
            Scale::Over2PiI,
            &[
                ("1/2", "1", 1),
                ("0", "-1", 1),
                ("1/2", "-1", -1),
                ("0", "1", -1),
            ],
        ),
        "mixed" => (
            Scale::OverIPi,
            &[("1/3", "2", 2), ("2/3", "-1", -1), ("sqrt2", "-1/2", -3)],
        ),
        _ => panic!("unknown gamma piece {name}"),
    };
    FiniteGamma::new(terms(t), scale).unwrap()
}

fn barnes_piece(name: &str) -> BarnesFactor {
    let (scale, t): (Scale, &[(&str, &str, i64)]) = match name {
        "shift" => (Scale::Unit, &[("1", "1", 1), ("0", "1", -1)]),
        "g" => (Scale::Unit, &[("0", "1", 1)]),
        "mixed" => (
            Scale::OverIPi,
            &[("1/2", "1", 2), ("1", "-1", -1), ("3/2", "1/2", 1)],
        ),
        _ => panic!("unknown Barnes piece {name}"),
    };
    BarnesFactor::new(terms(t), scale).unwrap()
}

fn cdd_blocks(name: &str) -> Vec<(&'static str, i64)> {
    match name {
        "lee_yang" => vec![("2/3", 1)],
        "mixed" => vec![("1/5", 2), ("2/5", -1), ("1/2", 1)],
        "irrational" => vec![("rsqrt2", 3), ("-7/3", 1)],
        _ => panic!("unknown CDD piece {name}"),
    }
}

fn cdd_piece(name: &str) -> CddBlock {
    CddBlock::new(
        cdd_blocks(name)
            .into_iter()
            .map(|(a, n)| (coef(a), n))
            .collect(),
    )
    .unwrap()
}

// ---------------------------------------------------------------------------
// measuring

/// Worst errors over a set of points, and the failures.
struct Tally {
    name: String,
    count: usize,
    worst: f64,
    worst_at: String,
    worst_ratio: f64,
    failures: Vec<String>,
}

impl Tally {
    fn new(name: &str) -> Self {
        Tally {
            name: name.into(),
            count: 0,
            worst: f64::NEG_INFINITY,
            worst_at: String::new(),
            worst_ratio: 0.0,
            failures: Vec::new(),
        }
    }

    /// Records the absolute error `2^err_l2` of a log against its radius
    /// (`slack_l2`: the reference's own error), and whether it is within
    /// `2^tol_l2`.
    fn record(&mut self, at: &str, err_l2: f64, radius_l2: f64, slack_l2: f64, tol_l2: f64) {
        self.count += 1;
        if err_l2 > self.worst || self.worst_at.is_empty() {
            self.worst = err_l2;
            self.worst_at = at.to_string();
        }
        let ratio = (err_l2 - radius_l2).exp2();
        if ratio.is_finite() {
            self.worst_ratio = self.worst_ratio.max(ratio);
        }
        let covered = err_l2 <= log2_add(radius_l2, slack_l2) + 1e-9;
        if !covered {
            self.failures.push(format!(
                "{at}: error 2^{err_l2:.1} not covered by radius 2^{radius_l2:.1}"
            ));
        }
        if err_l2 > tol_l2 {
            self.failures.push(format!(
                "{at}: error 2^{err_l2:.1} above the tolerance 2^{tol_l2:.1}"
            ));
        }
    }

    fn finish(self, min_rows: usize) {
        eprintln!(
            "{}: {} points, worst |Δ log| 10^{:.1} at {}, worst error/radius {:.2e}",
            self.name,
            self.count,
            self.worst * std::f64::consts::LOG10_2,
            self.worst_at,
            self.worst_ratio
        );
        assert!(
            self.count >= min_rows,
            "{}: only {} points",
            self.name,
            self.count
        );
        assert!(
            self.failures.is_empty(),
            "{}: {} failures:\n{}",
            self.name,
            self.failures.len(),
            self.failures[..self.failures.len().min(12)].join("\n")
        );
    }
}

fn log2_add(a: f64, b: f64) -> f64 {
    let (hi, lo) = if a >= b { (a, b) } else { (b, a) };
    if hi == f64::NEG_INFINITY {
        return hi;
    }
    hi + (1.0 + (lo - hi).exp2()).log2()
}

fn to_mp(z: Complex64) -> Complex {
    Complex::with_val(53, (z.re, z.im))
}

/// `a − b` with the imaginary part reduced modulo 2π into (−π, π].
fn mod_2pi_i(a: &Complex, b: &Complex) -> Complex {
    let p = a.prec().0.max(b.prec().0) + 64;
    let d = Complex::with_val(p, a - b);
    let two_pi = Float::with_val(p, Constant::Pi) * 2u32;
    let k = (d.imag().to_f64() / (2.0 * PI)).round();
    let shift = Float::with_val(p, &two_pi * k);
    Complex::with_val(p, (d.real().clone(), Float::with_val(p, d.imag() - &shift)))
}

/// One reference row: the point, and the reference log at high precision.
struct Row {
    digits: u32,
    piece: String,
    region: String,
    re: String,
    im: String,
    want: Complex,
}

fn rows(file: &str) -> Vec<Row> {
    table(file)
        .into_iter()
        .map(|r| Row {
            digits: r[0].parse().unwrap(),
            piece: r[1].clone(),
            region: r[2].clone(),
            re: r[3].clone(),
            im: r[4].clone(),
            want: complex(&r[5], &r[6], 300),
        })
        .collect()
}

/// Checks every row of `file` against `eval` on both paths. `tol15` is the
/// accepted error on the double path relative to max(1, |ref|) (log2),
/// `near` the regions where the double path is allowed the conditioning of
/// a nearby singular point instead (error within the radius only).
fn check_table(
    file: &str,
    min_rows: usize,
    near: &[&str],
    eval_d: impl Fn(&str, &Complex64) -> Approx<Complex64>,
    eval_m: impl Fn(&str, &Complex, Prec) -> Approx<Complex>,
) {
    let mut td = Tally::new(&format!("{file} (double path)"));
    let mut tn = Tally::new(&format!("{file} (double path, near poles and zeros)"));
    let mut tm = Tally::new(&format!("{file} (arbitrary precision)"));
    for row in rows(file) {
        let at = format!(
            "{} {} θ = {}{:+}i",
            row.piece,
            row.region,
            row.re,
            row.im.parse::<f64>().unwrap()
        );
        let scale = row.want.log2_abs().max(0.0);
        if row.digits == 15 {
            let th = c64(&row.re, &row.im);
            let got = eval_d(&row.piece, &th);
            let err = log2_diff(&to_mp(got.value), &row.want);
            // Reference written with 40 digits; a double carries 53 bits.
            if near.contains(&row.region.as_str()) {
                tn.record(&at, err, got.radius.log2(), scale - 120.0, f64::INFINITY);
            } else {
                td.record(&at, err, got.radius.log2(), scale - 120.0, scale - 42.0);
            }
        } else {
            let p = Prec::digits(row.digits as u64).unwrap();
            let th = complex(&row.re, &row.im, 53);
            let got = eval_m(&row.piece, &th, p);
            let err = log2_diff(&got.value, &row.want);
            let written = bits(row.digits + 15) as f64;
            tm.record(
                &at,
                err,
                got.radius.log2(),
                scale - written,
                scale - bits(row.digits) as f64,
            );
        }
    }
    td.finish(min_rows / 3);
    if !near.is_empty() {
        tn.finish(4);
    }
    tm.finish(min_rows / 4);
}

// ---------------------------------------------------------------------------
// reference tables

/// Source: mpmath 1.4.1 `loggamma` (and `gamma` as a check in the script),
/// tests/data/factor_pieces_gamma.tsv: 15 digits (double path) and 50.
#[test]
fn finite_gamma_against_mpmath() {
    check_table(
        "factor_pieces_gamma.tsv",
        150,
        &["near_pole"],
        |name, th| gamma_piece(name).log_value(th, Prec::DOUBLE).unwrap(),
        |name, th, p| gamma_piece(name).log_value(th, p).unwrap(),
    );
}

/// Source: mpmath 1.4.1 `barnesg`, with the branch of log G continued as in
/// logbarnesg_mp.tsv; tests/data/factor_pieces_barnes.tsv at 15 and 40 digits.
#[test]
fn barnes_factor_against_mpmath() {
    check_table(
        "factor_pieces_barnes.tsv",
        60,
        &[],
        |name, th| barnes_piece(name).log_value(th, Prec::DOUBLE).unwrap(),
        |name, th, p| barnes_piece(name).log_value(th, p).unwrap(),
    );
}

/// Source: mpmath 1.4.1 `sinh`, `sinpi`, `log` of the block's closed form;
/// tests/data/factor_pieces_cdd.tsv at 15 and 30 digits, including
/// |Re θ| up to 800, θ down to 1e-10, near poles and on both axes.
#[test]
fn cdd_block_against_mpmath() {
    check_table(
        "factor_pieces_cdd.tsv",
        120,
        &["near_pole"],
        |name, th| cdd_piece(name).log_value(th, Prec::DOUBLE).unwrap(),
        |name, th, p| cdd_piece(name).log_value(th, p).unwrap(),
    );
}

// ---------------------------------------------------------------------------
// closed forms

const MP_POINTS: [(f64, f64); 8] = [
    (0.3, 0.2),
    (-7.3, 0.4),
    (12.2, -3.0),
    (-40.1, 0.01),
    (0.05, 25.0),
    (-123.4, -2.5),
    (2.7, 0.0),
    (-3.7, 0.0),
];

/// Source: DLMF 5.5.3, Γ(½ + z)Γ(½ − z) = π / cos(πz) and Γ(z)Γ(1 − z) = π / sin(πz),
/// evaluated with MPC at 400 bits; logs compared modulo 2πi at 50 digits,
/// and on the double path.
#[test]
fn finite_gamma_reflection_closed_forms() {
    let half = gamma_piece("reflect_half");
    let one = FiniteGamma::new(terms(&[("0", "1", 1), ("1", "-1", 1)]), Scale::Unit).unwrap();
    let p = Prec::digits(50).unwrap();
    let mut t = Tally::new("Γ(½+z)Γ(½−z) = π/cos πz, Γ(z)Γ(1−z) = π/sin πz (DLMF 5.5.3)");
    let mut td = Tally::new("the same on the double path");
    for &(x, y) in &MP_POINTS {
        let z = Complex::with_val(53, (x, y));
        let pi = Float::with_val(400, Constant::Pi);
        let piz = Complex::with_val(400, &z * &pi);
        let want_cos = Complex::with_val(400, Complex::with_val(400, &pi) / piz.clone().cos()).ln();
        let want_sin = Complex::with_val(400, Complex::with_val(400, &pi) / piz.sin()).ln();
        for (f, want, what) in [(&half, &want_cos, "cos"), (&one, &want_sin, "sin")] {
            let at = format!("{what} z = {x}{y:+}i");
            let got = f.log_value(&z, p).unwrap();
            let d = mod_2pi_i(&got.value, want);
            let scale = got.value.log2_abs().max(0.0);
            t.record(&at, d.log2_abs(), got.radius.log2(), -300.0, scale - 166.0);
            let gd = f.log_value(&Complex64::new(x, y), Prec::DOUBLE).unwrap();
            let d = mod_2pi_i(&to_mp(gd.value), want);
            td.record(&at, d.log2_abs(), gd.radius.log2(), -300.0, scale - 40.0);
        }
    }
    t.finish(16);
    td.finish(16);
}

/// Source: DLMF 5.17.1, G(1 + z) = Γ(z) G(z): the piece G(1 + z)/G(z) against
/// the crate's log Γ (itself checked against mpmath in reference_tables.rs)
/// at 40 digits, on the same branch (no 2πi ambiguity).
#[test]
fn barnes_recurrence_at_40_digits() {
    let f = barnes_piece("shift");
    let p = Prec::digits(40).unwrap();
    let mut t = Tally::new("G(1+z)/G(z) = Γ(z) (DLMF 5.17.1), 40 digits");
    for &(x, y) in &[
        (0.3, 0.2),
        (-7.3, 0.4),
        (12.2, -3.0),
        (-15.5, -2.0),
        (0.05, 25.0),
        (2.5, 0.0),
        (33.0, 1.0),
        (-0.5, 1e-3),
    ] {
        let z = Complex::with_val(53, (x, y));
        let got = f.log_value(&z, p).unwrap();
        let want = log_gamma(&Complex::with_val(300, &z), Prec::from_bits(300).unwrap()).unwrap();
        let scale = want.value.log2_abs().max(0.0);
        t.record(
            &format!("z = {x}{y:+}i"),
            log2_diff(&got.value, &want.value),
            got.radius.log2(),
            want.radius.log2(),
            scale - bits(40) as f64,
        );
    }
    t.finish(8);
}

/// Block values by both closed forms, with MPC at `prec` bits:
/// Σ n ln((sinh θ + i sin πα)/(sinh θ − i sin πα)) and
/// Σ n ln(tanh((θ + iπα)/2)/tanh((θ − iπα)/2)) (principal ln of each block).
fn cdd_closed_forms(
    blocks: &[(f64, i64)],
    alpha_exact: &[Float],
    th: &Complex,
    prec: u32,
) -> (Complex, Complex) {
    let th = Complex::with_val(prec, th);
    let pi = Float::with_val(prec, Constant::Pi);
    let mut a = Complex::new(prec);
    let mut b = Complex::new(prec);
    for (al, (_, n)) in alpha_exact.iter().zip(blocks) {
        let pa = Float::with_val(prec, &pi * al);
        let is = Complex::with_val(prec, (0, Float::with_val(prec, pa.sin_ref())));
        let sh = th.clone().sinh();
        let f = Complex::with_val(prec, &sh + &is) / Complex::with_val(prec, &sh - &is);
        a += f.ln() * *n;
        let ipa = Complex::with_val(prec, (0, pa));
        let t1 = (Complex::with_val(prec, &th + &ipa) / 2u32).tanh();
        let t2 = (Complex::with_val(prec, &th - &ipa) / 2u32).tanh();
        b += (t1 / t2).ln() * *n;
    }
    (a, b)
}

fn exact_alphas(name: &str, prec: u32) -> (Vec<(f64, i64)>, Vec<Float>) {
    let bl = cdd_blocks(name);
    let floats: Vec<Float> = bl.iter().map(|(a, _)| coef(a).value(prec)).collect();
    (
        bl.iter()
            .zip(&floats)
            .map(|((_, n), f)| (f.to_f64(), *n))
            .collect(),
        floats,
    )
}

const CDD_POINTS: [(f64, f64); 9] = [
    (0.4, 0.3),
    (-1.3, 2.2),
    (1e-7, 3e-8),
    (-2e-4, 0.0),
    (30.0, -1.0),
    (-25.0, 0.7),
    (0.2, 17.0),
    (3.3, -0.01),
    (0.01, 3.1),
];

/// Source: the closed form f_α(θ) = (sinh θ + i sin πα)/(sinh θ − i sin πα)
/// and its E8 form tanh((θ + iπα)/2)/tanh((θ − iπα)/2) (Zamolodchikov,
/// Int. J. Mod. Phys. A 4 (1989) 4235; from memory), both with MPC at 600
/// bits; 50 digits, and the double path.
#[test]
fn cdd_block_closed_forms() {
    let p = Prec::digits(50).unwrap();
    let mut t = Tally::new("CddBlock vs sinh form and tanh form, 50 digits");
    let mut td = Tally::new("CddBlock vs sinh form, double path");
    let mut forms = f64::NEG_INFINITY;
    for name in ["lee_yang", "mixed", "irrational"] {
        let f = cdd_piece(name);
        let (bl, al) = exact_alphas(name, 600);
        for &(x, y) in &CDD_POINTS {
            let th = Complex::with_val(53, (x, y));
            let (a, b) = cdd_closed_forms(&bl, &al, &th, 600);
            // The two closed forms agree (per block modulo 2πi).
            let fd = mod_2pi_i(&a, &b).log2_abs();
            if fd > -550.0 {
                eprintln!(
                    "{name} θ = {x}{y:+}i: sinh form {} tanh form {}",
                    a.to_string_radix(10, Some(20)),
                    b.to_string_radix(10, Some(20))
                );
            }
            forms = forms.max(fd);
            let at = format!("{name} θ = {x}{y:+}i");
            let got = f.log_value(&th, p).unwrap();
            let scale = a.log2_abs().max(0.0);
            t.record(
                &at,
                log2_diff(&got.value, &a),
                got.radius.log2(),
                -500.0,
                a.log2_abs() - 166.0,
            );
            t.record(
                &(at.clone() + " (tanh)"),
                mod_2pi_i(&got.value, &b).log2_abs(),
                got.radius.log2(),
                -500.0,
                scale - 166.0,
            );
            let gd = f.log_value(&Complex64::new(x, y), Prec::DOUBLE).unwrap();
            td.record(
                &at,
                log2_diff(&to_mp(gd.value), &a),
                gd.radius.log2(),
                -500.0,
                scale - 45.0,
            );
        }
    }
    eprintln!("sinh form vs tanh form: worst difference 2^{forms:.0} (mod 2πi)");
    assert!(forms < -550.0);
    t.finish(54);
    td.finish(27);
}

/// Source: Zamolodchikov's E8 S-matrix S₁₁ = f_{2/3} f_{2/5} f_{1/15}
/// (Int. J. Mod. Phys. A 4 (1989) 4235, from memory) in the tanh form, and
/// its pole at θ = 2πi/3 (the particle itself as a bound state).
#[test]
fn e8_s11_tanh_form() {
    let s11 = CddBlock::new(vec![
        (Coef::rational(2, 3), 1),
        (Coef::rational(2, 5), 1),
        (Coef::rational(1, 15), 1),
    ])
    .unwrap();
    let (bl, al) = (
        vec![(0.0, 1), (0.0, 1), (0.0, 1)],
        vec![
            Float::with_val(600, 2) / 3u32,
            Float::with_val(600, 2) / 5u32,
            Float::with_val(600, 1) / 15u32,
        ],
    );
    let p = Prec::digits(50).unwrap();
    for &(x, y) in &CDD_POINTS {
        let th = Complex::with_val(53, (x, y));
        let (_, b) = cdd_closed_forms(&bl, &al, &th, 600);
        let got = s11.log_value(&th, p).unwrap();
        let d = mod_2pi_i(&got.value, &b).log2_abs();
        assert!(d <= got.radius.log2() && d < -160.0, "θ = {x}{y:+}i: 2^{d}");
    }
    let pole = Complex::with_val(400, (0, Float::with_val(400, Constant::Pi) * 2u32 / 3u32));
    assert!(matches!(
        s11.log_value(&pole, p),
        Err(Error::Pole { order: 1, .. })
    ));
}

/// Unitarity f(θ) f(−θ) = 1 and crossing f(iπ − θ) = f(θ) of every block
/// (hence of every product), at 50 digits, logs compared modulo 2πi.
#[test]
fn cdd_unitarity_and_crossing() {
    let p = Prec::digits(50).unwrap();
    let mut t = Tally::new("unitarity and crossing, 50 digits");
    for name in ["lee_yang", "mixed", "irrational"] {
        let f = cdd_piece(name);
        for &(x, y) in &CDD_POINTS {
            let th = Complex::with_val(200, (x, y));
            let minus = Complex::with_val(200, -&th);
            let ipi = Complex::with_val(200, (0, Float::with_val(200, Constant::Pi)));
            let cross = Complex::with_val(200, &ipi - &th);
            let a = f.log_value(&th, p).unwrap();
            let b = f.log_value(&minus, p).unwrap();
            let c = f.log_value(&cross, p).unwrap();
            let zero = Complex::new(200);
            let u = mod_2pi_i(&Complex::with_val(300, &a.value + &b.value), &zero);
            let r = log2_add(a.radius.log2(), b.radius.log2());
            let scale = a.value.log2_abs().max(0.0);
            t.record(
                &format!("unitarity {name} θ = {x}{y:+}i"),
                u.log2_abs(),
                r,
                -400.0,
                scale - 164.0,
            );
            let v = mod_2pi_i(&c.value, &a.value);
            let r = log2_add(a.radius.log2(), c.radius.log2());
            t.record(
                &format!("crossing {name} θ = {x}{y:+}i"),
                v.log2_abs(),
                r,
                -400.0,
                scale - 164.0,
            );
        }
    }
    t.finish(54);
}

/// Large |Re θ| on the double path, where sinh θ overflows: against
/// 2i·arctan(sin πα / sinh θ) with MPC at 256 bits (an exact rewriting of the
/// closed form, DLMF 4.23.26), which MPFR's exponent range evaluates without
/// trouble. At Re θ = 800 the block is 1 to within 1e-340.
#[test]
fn cdd_large_real_part_double() {
    let f = cdd_piece("mixed");
    let (bl, al) = exact_alphas("mixed", 256);
    let mut t = Tally::new("CddBlock at large |Re θ|, double path");
    for &(x, y) in &[
        (800.0, 0.3),
        (-800.0, 1.0),
        (700.5, 0.0),
        (745.3, -2.0),
        (-709.9, 3.0),
        (360.0, 0.1),
        (1.0e4, 2.0),
        (50.0, 1e6),
    ] {
        let got = f.log_value(&Complex64::new(x, y), Prec::DOUBLE).unwrap();
        let th = Complex::with_val(256, (x, y));
        let mut want = Complex::new(256);
        for (a, (_, n)) in al.iter().zip(&bl) {
            let s = Float::with_val(256, Float::with_val(256, Constant::Pi) * a).sin();
            let u = Complex::with_val(256, s) / th.clone().sinh();
            want += Complex::with_val(256, u.atan() * 2u32).mul_i(false) * *n;
        }
        let err = log2_diff(&to_mp(got.value), &want);
        let scale = want.log2_abs();
        t.record(
            &format!("θ = {x}{y:+}i"),
            err,
            got.radius.log2(),
            scale - 200.0,
            (scale - 40.0).max(-1070.0),
        );
        let v = got.value.exp();
        assert!(
            (v - Complex64::new(1.0, 0.0)).norm() <= 2e-16 + want.log2_abs().exp2() * 2.0,
            "f at θ = {x}{y:+}i is {v}"
        );
    }
    t.finish(8);
}

// ---------------------------------------------------------------------------
// poles, zeros, removable points

#[test]
fn poles_zeros_and_cancellations() {
    let g = FiniteGamma::new(terms(&[("0", "1", 1)]), Scale::Unit).unwrap();
    let m3 = Complex64::new(-3.0, 0.0);
    assert!(matches!(
        g.log_value(&m3, Prec::DOUBLE),
        Err(Error::Pole { order: 1, .. })
    ));
    let p = Prec::digits(50).unwrap();
    assert!(matches!(
        g.log_value(&Complex::with_val(200, -3), p),
        Err(Error::Pole { order: 1, .. })
    ));
    // Γ(z)^2 / Γ(1 + z) at −3: 2 − 1 = 1.
    let g2 = FiniteGamma::new(terms(&[("0", "1", 2), ("1", "1", -1)]), Scale::Unit).unwrap();
    assert!(matches!(
        g2.log_value(&m3, Prec::DOUBLE),
        Err(Error::Pole { order: 1, .. })
    ));
    // 1/Γ(z) at 0: a zero.
    let rg = FiniteGamma::new(terms(&[("0", "1", -1)]), Scale::Unit).unwrap();
    assert!(matches!(
        rg.log_value(&Complex64::new(0.0, 0.0), Prec::DOUBLE),
        Err(Error::Zero { order: 1, .. })
    ));
    // Γ(z)/Γ(1 + z) = 1/z is finite at −3: removable.
    let ratio = FiniteGamma::new(terms(&[("0", "1", 1), ("1", "1", -1)]), Scale::Unit).unwrap();
    match ratio.log_value(&m3, Prec::DOUBLE) {
        Err(Error::Domain { message, .. }) => {
            assert!(
                message.contains("removable") && message.contains("nearby"),
                "{message}"
            )
        }
        other => panic!("expected a removable point, got {other:?}"),
    }
    // ... and right next to it the value is −ln(z) = −ln(−3 + ε).
    let near = ratio
        .log_value(&Complex::with_val(200, (-3.0, 1e-30)), p)
        .unwrap();
    let want = Complex::with_val(300, (-3.0, 1e-30)).ln();
    assert!(log2_diff(&near.value, &Complex::with_val(300, -want)) < -150.0);
    // The sigma piece at θ = 0: Γ(−z)/Γ(z) cancels.
    let sigma = gamma_piece("sigma");
    assert!(matches!(
        sigma.log_value(&Complex64::new(0.0, 0.0), Prec::DOUBLE),
        Err(Error::Domain { .. })
    ));
    // Γ(1 − z), z = θ/(iπ), at θ = iπ (z = 1 up to the rounding of π).
    let scaled = FiniteGamma::new(terms(&[("1", "-1", 1)]), Scale::OverIPi).unwrap();
    assert!(matches!(
        scaled.log_value(&Complex64::new(0.0, PI), Prec::DOUBLE),
        Err(Error::Pole { order: 1, .. })
    ));
    let ipi = Complex::with_val(400, (0, Float::with_val(400, Constant::Pi)));
    assert!(matches!(
        scaled.log_value(&ipi, p),
        Err(Error::Pole { order: 1, .. })
    ));

    // Barnes G: a zero of order 3 at −2; its reciprocal a pole of order 3.
    let bg = BarnesFactor::new(terms(&[("0", "1", 1)]), Scale::Unit).unwrap();
    let m2 = Complex64::new(-2.0, 0.0);
    assert!(matches!(
        bg.log_value(&m2, Prec::DOUBLE),
        Err(Error::Zero { order: 3, .. })
    ));
    let rbg = BarnesFactor::new(terms(&[("0", "1", -1)]), Scale::Unit).unwrap();
    assert!(matches!(
        rbg.log_value(&Complex::with_val(100, -2), p),
        Err(Error::Pole { order: 3, .. })
    ));
    // G(1 + z)/G(z) = Γ(z): at −2 the zeros of orders 2 and 3 leave a pole of order 1.
    assert!(matches!(
        barnes_piece("shift").log_value(&m2, Prec::DOUBLE),
        Err(Error::Pole { order: 1, .. })
    ));

    // CDD blocks: f_{1/3} has a pole at iπ/3 and a zero at −iπ/3 (mod 2πi).
    let f = CddBlock::new(vec![(Coef::rational(1, 3), 1)]).unwrap();
    let pi = Float::with_val(600, Constant::Pi);
    let at =
        |num: i32, den: u32| Complex::with_val(600, (0, Float::with_val(600, &pi * num) / den));
    assert!(matches!(
        f.log_value(&at(1, 3), p),
        Err(Error::Pole { order: 1, .. })
    ));
    assert!(matches!(
        f.log_value(&at(2, 3), p),
        Err(Error::Pole { order: 1, .. })
    ));
    assert!(matches!(
        f.log_value(&at(-1, 3), p),
        Err(Error::Zero { order: 1, .. })
    ));
    assert!(matches!(
        f.log_value(&at(7, 3), p),
        Err(Error::Pole { order: 1, .. })
    ));
    assert!(matches!(
        f.log_value(&Complex64::new(0.0, PI / 3.0), Prec::DOUBLE),
        Err(Error::Pole { order: 1, .. })
    ));
    // f_{1/3}^2 at its zero: order 2.
    let f2 = CddBlock::new(vec![(Coef::rational(1, 3), 2)]).unwrap();
    assert!(matches!(
        f2.log_value(&at(-1, 3), p),
        Err(Error::Zero { order: 2, .. })
    ));
    // α = 1/2: the two poles coincide at iπ/2 (sinh θ − i has a double zero).
    let half = CddBlock::new(vec![(Coef::rational(1, 2), 1)]).unwrap();
    assert!(matches!(
        half.log_value(&at(1, 2), p),
        Err(Error::Pole { order: 2, .. })
    ));
    // f_{1/3} · f_{2/3}^{-1} ≡ 1 (sin π/3 = sin 2π/3): removable at iπ/3.
    let one = CddBlock::new(vec![(Coef::rational(1, 3), 1), (Coef::rational(2, 3), -1)]).unwrap();
    assert!(matches!(
        one.log_value(&at(1, 3), p),
        Err(Error::Domain { .. })
    ));
    let v = one
        .log_value(&Complex64::new(0.3, 0.2), Prec::DOUBLE)
        .unwrap();
    assert!(
        v.value.norm() <= v.radius.to_f64() && v.radius.to_f64() < 1e-13,
        "{v:?}"
    );
    // Integer α: the block is 1, exactly.
    let triv = CddBlock::new(vec![(Coef::integer(3), 1)]).unwrap();
    let v = triv
        .log_value(&Complex64::new(0.3, 0.2), Prec::DOUBLE)
        .unwrap();
    assert_eq!(v.value, Complex64::new(0.0, 0.0));
}

// ---------------------------------------------------------------------------
// bad input

#[test]
fn bad_input_is_typed() {
    let nan = || Coef::computed("nan", |p| Float::with_val(p, rug::float::Special::Nan));
    let inf = || Coef::computed("inf", |p| Float::with_val(p, rug::float::Special::Infinity));
    assert!(matches!(
        CddBlock::new(vec![(nan(), 1)]),
        Err(Error::NonFinite {
            argument: "alpha",
            ..
        })
    ));
    assert!(matches!(
        CddBlock::new(vec![(inf(), 1)]),
        Err(Error::NonFinite {
            argument: "alpha",
            ..
        })
    ));
    assert!(matches!(CddBlock::new(vec![]), Err(Error::Domain { .. })));
    assert!(matches!(
        CddBlock::new(vec![(Coef::rational(1, 3), 0)]),
        Err(Error::Domain { .. })
    ));
    assert!(matches!(
        FiniteGamma::new(vec![(nan(), Coef::integer(1), 1)], Scale::Unit),
        Err(Error::NonFinite {
            argument: "offset",
            ..
        })
    ));
    assert!(matches!(
        BarnesFactor::new(vec![(Coef::integer(1), inf(), 1)], Scale::Unit),
        Err(Error::NonFinite {
            argument: "slope",
            ..
        })
    ));
    assert!(matches!(
        FiniteGamma::new(vec![], Scale::Unit),
        Err(Error::Domain { .. })
    ));
    match FiniteGamma::new(terms(&[("0", "1", 1 << 21)]), Scale::Unit) {
        Err(Error::Domain { message, .. }) => assert!(message.contains("cap"), "{message}"),
        other => panic!("{other:?}"),
    }
    // Absurd precisions.
    assert!(matches!(
        Prec::digits(100_000),
        Err(Error::PrecisionTooHigh { .. })
    ));
    assert!(matches!(Prec::digits(0), Err(Error::ZeroPrecision)));
    let f = cdd_piece("lee_yang");
    let g = gamma_piece("mixed");
    let b = barnes_piece("mixed");
    let th = Complex64::new(0.3, 0.1);
    let p30 = Prec::digits(30).unwrap();
    assert!(matches!(
        f.log_value(&th, p30),
        Err(Error::DoubleTooPrecise { .. })
    ));
    assert!(matches!(
        g.log_value(&th, p30),
        Err(Error::DoubleTooPrecise { .. })
    ));
    assert!(matches!(
        b.log_value(&th, p30),
        Err(Error::DoubleTooPrecise { .. })
    ));
    let bad = Complex64::new(f64::NAN, 0.0);
    assert!(matches!(
        f.log_value(&bad, Prec::DOUBLE),
        Err(Error::NonFinite { .. })
    ));
    assert!(matches!(
        g.log_value(&bad, Prec::DOUBLE),
        Err(Error::NonFinite { .. })
    ));
    assert!(matches!(
        b.log_value(&bad, Prec::DOUBLE),
        Err(Error::NonFinite { .. })
    ));
    // Far left of where log G is supported: a Domain error, not a hang.
    let bg = BarnesFactor::new(terms(&[("0", "1", 1)]), Scale::Unit).unwrap();
    assert!(matches!(
        bg.log_value(&Complex64::new(-2.0e5, 1.0), Prec::DOUBLE),
        Err(Error::Domain { .. })
    ));
    // Every message says something to act on.
    let e = CddBlock::new(vec![(Coef::rational(1, 3), 0)]).unwrap_err();
    assert!(e.to_string().contains("drop it"), "{e}");
}

// ---------------------------------------------------------------------------
// reports

#[test]
fn formulas_for_reports() {
    let f = FiniteGamma::new(
        vec![
            (Coef::rational(1, 2), Coef::integer(1), 2),
            (Coef::integer(1), Coef::integer(-1), -1),
        ],
        Scale::OverIPi,
    )
    .unwrap();
    assert_eq!(f.to_string(), "Γ(1/2 + z)^2 · Γ(1 − z)^-1");
    assert_eq!(f.describe(), "Γ(1/2 + z)^2 · Γ(1 − z)^-1, z = θ/(iπ)");
    assert_eq!(
        gamma_piece("mixed").to_string(),
        "Γ(1/3 + 2z)^2 · Γ(2/3 − z)^-1 · Γ(√2 − z/2)^-3"
    );
    assert_eq!(barnes_piece("shift").to_string(), "G(1 + z) · G(z)^-1");
    assert_eq!(
        cdd_piece("irrational").to_string(),
        "f_{(1/√2)}(θ)^3 · f_{−7/3}(θ)"
    );
    assert!(cdd_piece("lee_yang")
        .describe()
        .ends_with("f_α(θ) = (sinh θ + i sin πα)/(sinh θ − i sin πα)"));
}

/// Source: the closed forms above (DLMF 5.5.3; the block's sinh form) with
/// MPC at 3700 bits (4700 for the blocks, where f − 1 ~ e^{−600}): the pieces at 1000 digits.
#[test]
fn thousand_digits() {
    let p = Prec::digits(1000).unwrap();
    let mut t = Tally::new("1000 digits: Γ(½+z)Γ(½−z) = π/cos πz and the CDD closed form");
    let half = gamma_piece("reflect_half");
    for &(x, y) in &[(0.3, 0.2), (-40.1, 0.01), (0.05, 25.0)] {
        let z = Complex::with_val(53, (x, y));
        let pi = Float::with_val(3700, Constant::Pi);
        let piz = Complex::with_val(3700, &z * &pi);
        let want = Complex::with_val(3700, Complex::with_val(3700, &pi) / piz.cos()).ln();
        let got = half.log_value(&z, p).unwrap();
        let scale = got.value.log2_abs().max(0.0);
        let d = mod_2pi_i(&got.value, &want).log2_abs();
        t.record(
            &format!("Γ z = {x}{y:+}i"),
            d,
            got.radius.log2(),
            -3600.0,
            scale - 3322.0,
        );
    }
    let f = cdd_piece("irrational");
    let (bl, al) = exact_alphas("irrational", 4700);
    for &(x, y) in &[(0.4, 0.3), (1e-7, 3e-8), (30.0, -1.0), (-300.0, 2.0)] {
        let th = Complex::with_val(53, (x, y));
        let (a, _) = cdd_closed_forms(&bl, &al, &th, 4700);
        let got = f.log_value(&th, p).unwrap();
        let d = log2_diff(&got.value, &a);
        t.record(
            &format!("CDD θ = {x}{y:+}i"),
            d,
            got.radius.log2(),
            a.log2_abs() - 3650.0,
            a.log2_abs() - 3322.0,
        );
    }
    t.finish(7);
}
