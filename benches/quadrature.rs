//! Double-exponential quadrature: the oscillating scalar-factor integral
//! `∫_0^∞ sin(θt)/sinh(t) dt` (θ = 0.5 + 0.3i) at 15 digits on the double
//! path and at 50 and 100 digits with rug, and `integrate_many` over 100
//! values of θ at double precision. Nodes are cached by the rule, so after
//! the warm-up these time the integration alone; `cold` includes building
//! the node tables.

use criterion::{criterion_group, criterion_main, BenchmarkId, Criterion};
use dressing::quadrature::{default_rule, Domain, DoubleExponential};
use dressing::Prec;
use num_complex::Complex64;
use rug::{Complex, Float};
use std::hint::black_box;
use std::time::Duration;

fn sin_over_sinh_mp(theta: &Complex) -> impl Fn(&Float) -> Complex + '_ {
    move |t: &Float| {
        let p = t.prec();
        Complex::with_val(p, theta * t).sin() / Float::with_val(p, t.sinh_ref())
    }
}

fn single(c: &mut Criterion) {
    let mut g = c.benchmark_group("sin_over_sinh");
    g.sample_size(10).measurement_time(Duration::from_secs(3));
    let th = Complex64::new(0.5, 0.3);
    let p15 = Prec::digits(15).unwrap();
    for (name, dom) in [
        ("exp-exp", Domain::HalfLineExpDecay(0.0)),
        ("exp-sinh", Domain::HalfLine(0.0)),
    ] {
        g.bench_function(BenchmarkId::new(name, "15 digits f64"), |b| {
            b.iter(|| {
                default_rule()
                    .integrate(|t: &f64| (th * t).sin() / t.sinh(), black_box(&dom), p15)
                    .unwrap()
            })
        });
    }
    let theta = Complex::with_val(400, (0.5, 0.3));
    for digits in [50u64, 100] {
        let prec = Prec::digits(digits).unwrap();
        let dom = Domain::HalfLineExpDecay(Float::new(400));
        g.bench_function(
            BenchmarkId::new("exp-exp", format!("{digits} digits rug")),
            |b| {
                b.iter(|| {
                    default_rule()
                        .integrate(sin_over_sinh_mp(&theta), black_box(&dom), prec)
                        .unwrap()
                })
            },
        );
    }
    let prec = Prec::digits(100).unwrap();
    let dom = Domain::HalfLine(Float::new(400));
    g.bench_function(BenchmarkId::new("exp-sinh", "100 digits rug"), |b| {
        b.iter(|| {
            default_rule()
                .integrate(sin_over_sinh_mp(&theta), black_box(&dom), prec)
                .unwrap()
        })
    });
    let dom = Domain::HalfLineExpDecay(Float::new(400));
    g.bench_function(BenchmarkId::new("exp-exp cold", "100 digits rug"), |b| {
        b.iter(|| {
            DoubleExponential::new()
                .integrate(sin_over_sinh_mp(&theta), black_box(&dom), prec)
                .unwrap()
        })
    });
    g.finish();
}

fn many(c: &mut Criterion) {
    let mut g = c.benchmark_group("integrate_many");
    g.sample_size(20).measurement_time(Duration::from_secs(3));
    let thetas: Vec<Complex64> = (0..100)
        .map(|j| Complex64::new(0.05 + 0.02 * j as f64, 0.003 * j as f64))
        .collect();
    let dom = Domain::HalfLineExpDecay(0.0);
    g.bench_function("100 thetas, double", |b| {
        b.iter(|| {
            default_rule()
                .integrate_many(
                    |t: &f64, out: &mut [Complex64]| {
                        let sh = t.sinh();
                        for (o, z) in out.iter_mut().zip(&thetas) {
                            *o = (z * t).sin() / sh;
                        }
                    },
                    thetas.len(),
                    black_box(&dom),
                    Prec::DOUBLE,
                )
                .unwrap()
        })
    });
    g.bench_function("100 thetas, double, one at a time", |b| {
        b.iter(|| {
            thetas
                .iter()
                .map(|z| {
                    default_rule()
                        .integrate(
                            |t: &f64| (z * t).sin() / t.sinh(),
                            black_box(&dom),
                            Prec::DOUBLE,
                        )
                        .unwrap()
                })
                .collect::<Vec<_>>()
        })
    });
    g.finish();
}

criterion_group!(benches, single, many);
criterion_main!(benches);
