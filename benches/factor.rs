//! Gamma-product factor benchmarks: the sine-Gordon soliton factor at
//! ξ = 2π/7, θ = 0.7+0.2i (the point the mpmath/python-flint
//! figures were measured on), by product and integral form.

use criterion::{criterion_group, criterion_main, BenchmarkId, Criterion};
use dressing::factor::{known::sine_gordon_soliton, Method};
use dressing::Prec;
use num_complex::Complex64;
use rug::Complex;
use std::hint::black_box;
use std::time::Duration;

fn sine_gordon(c: &mut Criterion) {
    let f = sine_gordon_soliton(2.0 * std::f64::consts::PI / 7.0).unwrap();
    let mut g = c.benchmark_group("sine_gordon");
    g.measurement_time(Duration::from_secs(3))
        .warm_up_time(Duration::from_millis(500))
        .sample_size(10);
    let zd = Complex64::new(0.7, 0.2);
    for (name, m) in [("product", Method::Product), ("integral", Method::Integral)] {
        g.bench_function(BenchmarkId::new(name, 15), |b| {
            b.iter(|| f.log_value(black_box(&zd), Prec::DOUBLE, m).unwrap())
        });
        for digits in [50u64, 100, 300] {
            let p = Prec::digits(digits).unwrap();
            let z = Complex::with_val(p.bits(), (0.7, 0.2));
            g.bench_function(BenchmarkId::new(name, digits), |b| {
                b.iter(|| f.log_value(black_box(&z), p, m).unwrap())
            });
        }
    }
    g.finish();
}

criterion_group!(benches, sine_gordon);
criterion_main!(benches);
