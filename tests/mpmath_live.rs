//! Live comparison with mpmath (the version pinned in scripts/requirements.txt),
//! through scripts/mpmath_oracle.py, at fresh pseudo-random points each seed.
//! Skipped with a note when Python or mpmath is missing, unless
//! DRESSING_REQUIRE_MPMATH=1 (as CI sets it), in which case it fails.

mod common;

use common::*;
use dressing::num::ComplexField;
use dressing::special::*;
use dressing::Prec;
use num_complex::Complex64;
use rug::Complex;
use std::io::{BufRead, BufReader, Write};
use std::process::{Command, Stdio};

struct Oracle {
    child: std::process::Child,
    out: BufReader<std::process::ChildStdout>,
}

impl Oracle {
    fn start() -> Option<Oracle> {
        let script = concat!(env!("CARGO_MANIFEST_DIR"), "/scripts/mpmath_oracle.py");
        let mut child = Command::new("python3")
            .arg(script)
            .stdin(Stdio::piped())
            .stdout(Stdio::piped())
            .stderr(Stdio::inherit())
            .spawn()
            .ok()?;
        let mut out = BufReader::new(child.stdout.take()?);
        let mut first = String::new();
        out.read_line(&mut first).ok()?;
        if !first.starts_with("mpmath ") {
            return None;
        }
        eprintln!("live oracle: {}", first.trim());
        Some(Oracle { child, out })
    }

    fn ask(&mut self, line: &str) -> (String, String) {
        let stdin = self.child.stdin.as_mut().expect("stdin");
        writeln!(stdin, "{line}").unwrap();
        stdin.flush().unwrap();
        let mut ans = String::new();
        self.out.read_line(&mut ans).unwrap();
        assert!(!ans.starts_with("ERR"), "oracle: {ans} for {line}");
        let mut it = ans.split_whitespace();
        (
            it.next().unwrap().to_string(),
            it.next().unwrap().to_string(),
        )
    }
}

fn oracle() -> Option<Oracle> {
    let o = Oracle::start();
    if o.is_none() {
        if std::env::var("DRESSING_REQUIRE_MPMATH").as_deref() == Ok("1") {
            panic!("mpmath is required (DRESSING_REQUIRE_MPMATH=1) but python3 scripts/mpmath_oracle.py did not start; pip install -r scripts/requirements.txt");
        }
        eprintln!("skipping live mpmath comparison: python3 with mpmath not available");
    }
    o
}

/// A small deterministic generator (SplitMix64), so no dependency is needed.
struct Rng(u64);
impl Rng {
    fn next(&mut self) -> f64 {
        self.0 = self.0.wrapping_add(0x9E37_79B9_7F4A_7C15);
        let mut z = self.0;
        z = (z ^ (z >> 30)).wrapping_mul(0xBF58_476D_1CE4_E5B9);
        z = (z ^ (z >> 27)).wrapping_mul(0x94D0_49BB_1331_11EB);
        ((z ^ (z >> 31)) >> 11) as f64 / (1u64 << 53) as f64
    }
    fn point(&mut self) -> (f64, f64) {
        match (self.next() * 4.0) as u32 {
            0 => (self.next() * 40.0 - 20.0, self.next() * 40.0 - 20.0),
            1 => (-self.next() * 50.0, (self.next() - 0.5) * 1e-3),
            2 => ((self.next() - 0.5) * 100.0, (self.next() - 0.5) * 1e4),
            _ => (10f64.powf(self.next() * 8.0), (self.next() - 0.5) * 10.0),
        }
    }
}

fn seed() -> u64 {
    std::env::var("DRESSING_TEST_SEED")
        .ok()
        .and_then(|s| s.parse().ok())
        .unwrap_or(20_261_201)
}

#[test]
fn live_against_mpmath() {
    let Some(mut o) = oracle() else { return };
    let mut rng = Rng(seed());
    let mut checked = 0;
    for _ in 0..60 {
        // Dyadic points k/2^20 have short exact decimal expansions, so the
        // oracle (which reads decimals) sees exactly the binary input.
        let (x, y) = rng.point();
        let q = |v: f64| (v * 1048576.0).round() / 1048576.0;
        let (x, y) = (q(x), q(y));
        if y == 0.0 && x <= 0.0 && x.fract() == 0.0 {
            continue;
        }
        for (func, n) in [
            ("loggamma", 0u32),
            ("digamma", 0),
            ("polygamma", 1),
            ("polygamma", 3),
        ] {
            // Double path (the order goes with polygamma only).
            let extra = if func == "polygamma" {
                format!(" {n}")
            } else {
                String::new()
            };
            let line = format!("{func} 20 {x:.24} {y:.24}{extra}");
            let (re, im) = o.ask(&line);
            let want = complex(&re, &im, 200);
            let z = Complex64::new(x, y);
            let got = match func {
                "loggamma" => log_gamma(&z, Prec::DOUBLE),
                "digamma" => digamma(&z, Prec::DOUBLE),
                _ => polygamma(n, &z, Prec::DOUBLE),
            }
            .unwrap();
            let rel = rel_err_f64(got.value, &want, 1e-3);
            assert!(rel < 1e-14, "{line}: double path relative error {rel:.2e}");
            // Arbitrary path at 60 digits.
            let d = 60;
            let line = format!("{func} {d} {x:.24} {y:.24}{extra}");
            let (re, im) = o.ask(&line);
            let want = complex(&re, &im, bits(d + 10));
            let zm = Complex::with_val(bits(d) + 16, (x, y));
            let p = Prec::digits(d as u64).unwrap();
            let got = match func {
                "loggamma" => log_gamma(&zm, p),
                "digamma" => digamma(&zm, p),
                _ => polygamma(n, &zm, p),
            }
            .unwrap();
            let l = log2_rel(&got.value, &want, -1e9) * std::f64::consts::LOG10_2;
            assert!(
                l < -(d as f64),
                "{line}: only 10^{l:.1}: got {}",
                got.value.to_decimal(30)
            );
            checked += 2;
        }
    }
    eprintln!(
        "live mpmath comparison: {checked} values agree (seed {})",
        seed()
    );
    assert!(checked > 300);
}
