//! Special-function benchmarks on the points scripts/peer_timing.py times
//! for mpmath and python-flint: z1 = 2.7+1.3i (generic), z2 = −7.3+0.4i
//! (left half-plane, reflection), z3 = 10⁶+10⁶i (large).

use criterion::{criterion_group, criterion_main, BenchmarkId, Criterion};
use dressing::special::{digamma, log_barnes_g, log_gamma};
use dressing::Prec;
use num_complex::Complex64;
use rug::Complex;
use std::hint::black_box;
use std::time::Duration;

const POINTS: [(&str, f64, f64); 3] = [("z1", 2.7, 1.3), ("z2", -7.3, 0.4), ("z3", 1e6, 1e6)];

fn log_gamma_double(c: &mut Criterion) {
    let mut g = c.benchmark_group("log_gamma/double");
    g.measurement_time(Duration::from_secs(2))
        .warm_up_time(Duration::from_millis(300));
    for (name, x, y) in POINTS {
        let z = Complex64::new(x, y);
        g.bench_function(name, |b| {
            b.iter(|| log_gamma(black_box(&z), Prec::DOUBLE).unwrap())
        });
    }
    g.finish();
}

fn log_gamma_mp(c: &mut Criterion) {
    let mut g = c.benchmark_group("log_gamma/mp");
    g.measurement_time(Duration::from_secs(2))
        .warm_up_time(Duration::from_millis(300))
        .sample_size(20);
    for digits in [50u64, 100, 300, 1000] {
        let prec = Prec::digits(digits).unwrap();
        for (name, x, y) in POINTS {
            let z = Complex::with_val(prec.bits(), (x, y));
            g.bench_with_input(BenchmarkId::new(name, digits), &z, |b, z| {
                b.iter(|| log_gamma(black_box(z), prec).unwrap())
            });
        }
    }
    g.finish();
}

fn others_50_digits(c: &mut Criterion) {
    let mut g = c.benchmark_group("other/50digits");
    g.measurement_time(Duration::from_secs(2))
        .warm_up_time(Duration::from_millis(300));
    let prec = Prec::digits(50).unwrap();
    let z = Complex::with_val(prec.bits(), (2.7, 1.3));
    g.bench_function("digamma/z1", |b| {
        b.iter(|| digamma(black_box(&z), prec).unwrap())
    });
    g.bench_function("log_barnes_g/z1", |b| {
        b.iter(|| log_barnes_g(black_box(&z), prec).unwrap())
    });
    let zd = Complex64::new(2.7, 1.3);
    g.bench_function("digamma/double/z1", |b| {
        b.iter(|| digamma(black_box(&zd), Prec::DOUBLE).unwrap())
    });
    g.finish();
}

criterion_group!(benches, log_gamma_double, log_gamma_mp, others_50_digits);
criterion_main!(benches);
