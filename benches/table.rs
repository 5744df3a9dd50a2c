//! Tables and kernels: `Model::tabulate` of 10 000 points on the real line
//! θ ∈ [−8, 8] at double precision (one iteration = the whole table; warm,
//! with the model reused, and cold, with a fresh model each time), and
//! the kernel alone, `Factor::log_derivative` at θ = 0.7+0.2i, per call, at
//! double precision and at 50 digits. Models: the sine-Gordon test model
//! (factor `minus_S0`, ξ = 2π/7) and the example lantern model (factors
//! `sigma` and `lamp`). scripts/peer_kernel.py times mpmath on the same
//! points (docs/performance.md).

use criterion::{criterion_group, criterion_main, BenchmarkId, Criterion};
use dressing::factor::Method;
use dressing::model::Model;
use dressing::Prec;
use num_complex::Complex64;
use rug::Complex;
use std::hint::black_box;
use std::time::Duration;

/// (label, model file under the crate root, factor).
const CASES: [(&str, &str, &str); 3] = [
    (
        "sine_gordon",
        "tests/data/models/sine-gordon.toml",
        "minus_S0",
    ),
    ("lantern_sigma", "examples/lantern.toml", "sigma"),
    ("lantern_lamp", "examples/lantern.toml", "lamp"),
];

fn load(file: &str) -> Model {
    Model::load(format!("{}/{file}", env!("CARGO_MANIFEST_DIR"))).unwrap()
}

/// 10 000 equally spaced points on θ ∈ [−8, 8], double precision.
fn table(c: &mut Criterion) {
    let mut g = c.benchmark_group("table");
    g.measurement_time(Duration::from_secs(5))
        .warm_up_time(Duration::from_millis(500))
        .sample_size(10);
    let (from, to) = (Complex64::new(-8.0, 0.0), Complex64::new(8.0, 0.0));
    for (label, file, factor) in CASES {
        let m = load(file);
        // Every point must have a value, or the figure would time errors.
        let rows = m
            .tabulate(factor, &from, &to, 10_000, Prec::DOUBLE, Method::Auto)
            .unwrap();
        assert!(rows.iter().all(|r| r.1.is_ok()), "{label}: a point failed");
        // Warm: the model (and its per-factor caches: the uniform grid,
        // tail tables, coefficients) is reused from one iteration to the next.
        g.bench_function(BenchmarkId::new(label, "line_10000"), |b| {
            b.iter(|| {
                m.tabulate(
                    factor,
                    black_box(&from),
                    &to,
                    10_000,
                    Prec::DOUBLE,
                    Method::Auto,
                )
                .unwrap()
            })
        });
        // Cold: a fresh model each time, as `dressing table` has (loading
        // the file included).
        g.bench_function(BenchmarkId::new(label, "line_10000_cold"), |b| {
            b.iter(|| {
                load(file)
                    .tabulate(
                        factor,
                        black_box(&from),
                        &to,
                        10_000,
                        Prec::DOUBLE,
                        Method::Auto,
                    )
                    .unwrap()
            })
        });
    }
    g.finish();
}

/// `Factor::log_derivative` at θ = 0.7+0.2i, double and 50 digits.
fn kernel(c: &mut Criterion) {
    let mut g = c.benchmark_group("kernel");
    g.measurement_time(Duration::from_secs(3))
        .warm_up_time(Duration::from_millis(500))
        .sample_size(10);
    let zd = Complex64::new(0.7, 0.2);
    let p = Prec::digits(50).unwrap();
    let z = Complex::with_val(200, (0.7, 0.2));
    for (label, file, factor) in CASES {
        let m = load(file);
        let f = m.factor(factor).unwrap();
        g.bench_function(BenchmarkId::new(label, 15), |b| {
            b.iter(|| f.log_derivative(black_box(&zd), Prec::DOUBLE).unwrap())
        });
        g.bench_function(BenchmarkId::new(label, 50), |b| {
            b.iter(|| f.log_derivative(black_box(&z), p).unwrap())
        });
    }
    g.finish();
}

criterion_group!(benches, table, kernel);
criterion_main!(benches);
