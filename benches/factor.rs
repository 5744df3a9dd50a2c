//! Gamma-product factor benchmarks: the sine-Gordon soliton factor at
//! ξ = 2π/7, θ = 0.7+0.2i (the point the mpmath/python-flint
//! figures were measured on), by product and integral form and by
//! `Method::Auto`; the distance from the strip (θ = 0.7 + iy); and a batch
//! of 10 000 points on a line at double precision.

use criterion::{criterion_group, criterion_main, BenchmarkId, Criterion};
use dressing::factor::{known::sine_gordon_soliton, Method};
use dressing::Prec;
use num_complex::Complex64;
use rug::Complex;
use std::hint::black_box;
use std::time::Duration;

const METHODS: [(&str, Method); 3] = [
    ("product", Method::Product),
    ("integral", Method::Integral),
    ("auto", Method::Auto),
];

fn sine_gordon(c: &mut Criterion) {
    let f = sine_gordon_soliton(2.0 * std::f64::consts::PI / 7.0).unwrap();
    let mut g = c.benchmark_group("sine_gordon");
    g.measurement_time(Duration::from_secs(3))
        .warm_up_time(Duration::from_millis(500))
        .sample_size(10);
    let zd = Complex64::new(0.7, 0.2);
    for (name, m) in METHODS {
        g.bench_function(BenchmarkId::new(name, 15), |b| {
            b.iter(|| f.log_value(black_box(&zd), Prec::DOUBLE, m).unwrap())
        });
        for digits in [50u64, 100, 300, 1000] {
            // The product form at 1000 digits takes tens of seconds per call
            // (docs/performance.md gives a single timed run).
            if digits == 1000 && m == Method::Product {
                continue;
            }
            let p = Prec::digits(digits).unwrap();
            let z = Complex::with_val(p.bits(), (0.7, 0.2));
            g.bench_function(BenchmarkId::new(name, digits), |b| {
                b.iter(|| f.log_value(black_box(&z), p, m).unwrap())
            });
        }
    }
    g.finish();
}

/// θ = 0.7 + iy: inside the strip (|Im θ| < 2π/7 ≈ 0.898) and outside it.
fn distance_from_strip(c: &mut Criterion) {
    let f = sine_gordon_soliton(2.0 * std::f64::consts::PI / 7.0).unwrap();
    let mut g = c.benchmark_group("sine_gordon_strip");
    g.measurement_time(Duration::from_secs(2))
        .warm_up_time(Duration::from_millis(300))
        .sample_size(10);
    for y in [0.2, 1.0, 3.0, 10.0] {
        let zd = Complex64::new(0.7, y);
        let p = Prec::digits(50).unwrap();
        let z = Complex::with_val(p.bits(), (0.7, y));
        for (name, m) in METHODS {
            g.bench_function(BenchmarkId::new(format!("{name}/15"), y), |b| {
                b.iter(|| f.log_value(black_box(&zd), Prec::DOUBLE, m).unwrap())
            });
            g.bench_function(BenchmarkId::new(format!("{name}/50"), y), |b| {
                b.iter(|| f.log_value(black_box(&z), p, m).unwrap())
            });
        }
    }
    g.finish();
}

/// 10 000 points on θ ∈ [−5, 5] + 0.2i at double precision.
fn batch_line(c: &mut Criterion) {
    let f = sine_gordon_soliton(2.0 * std::f64::consts::PI / 7.0).unwrap();
    let mut g = c.benchmark_group("sine_gordon_batch");
    g.measurement_time(Duration::from_secs(3))
        .warm_up_time(Duration::from_millis(500))
        .sample_size(10);
    g.bench_function("line_10000", |b| {
        b.iter(|| f.log_values_on_line(black_box((-5.0, 0.2)), (5.0, 0.2), 10_000, Method::Auto))
    });
    let pts: Vec<Complex64> = (0..10_000)
        .map(|k| Complex64::new(-5.0 + k as f64 * 1e-3, 0.2))
        .collect();
    g.bench_function("points_10000", |b| {
        b.iter(|| f.log_values(black_box(&pts), Prec::DOUBLE, Method::Auto))
    });
    g.finish();
}

criterion_group!(benches, sine_gordon, distance_from_strip, batch_line);
criterion_main!(benches);
