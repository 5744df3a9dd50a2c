//! Expression evaluation: a typical CDD prefactor
//! `(sinh(theta) + i*sin(pi*a)) / (sinh(theta) - i*sin(pi*a))`, parsed once
//! and evaluated at a point on the double path and on MPC at 15 and 50
//! digits, against the same formula written by hand on each path.

use criterion::{criterion_group, criterion_main, Criterion};
use dressing::expr::Expr;
use dressing::Prec;
use num_complex::Complex64;
use rug::float::Constant;
use rug::Complex;
use std::collections::HashMap;
use std::hint::black_box;
use std::time::Duration;

const CDD: &str = "(sinh(theta) + i*sin(pi*a)) / (sinh(theta) - i*sin(pi*a))";

fn parse(c: &mut Criterion) {
    let mut g = c.benchmark_group("expr/parse");
    g.measurement_time(Duration::from_secs(2))
        .warm_up_time(Duration::from_millis(300));
    g.bench_function("cdd", |b| b.iter(|| Expr::parse(black_box(CDD)).unwrap()));
    g.finish();
}

fn double(c: &mut Criterion) {
    let mut g = c.benchmark_group("expr/double");
    g.measurement_time(Duration::from_secs(2))
        .warm_up_time(Duration::from_millis(300));
    let e = Expr::parse(CDD).unwrap();
    let (theta, a) = (Complex64::new(0.7, 0.1), Complex64::new(0.3, 0.0));
    let env = [("theta", theta), ("a", a)];
    g.bench_function("slice_env", |b| {
        b.iter(|| e.eval::<Complex64, _>(black_box(&env), 53).unwrap())
    });
    let map: HashMap<String, Complex64> =
        HashMap::from([("theta".to_string(), theta), ("a".to_string(), a)]);
    g.bench_function("hashmap_env", |b| {
        b.iter(|| e.eval::<Complex64, _>(black_box(&map), 53).unwrap())
    });
    g.bench_function("handwritten", |b| {
        b.iter(|| {
            let (t, a) = black_box((theta, a));
            let s = t.sinh();
            let q = Complex64::i() * (std::f64::consts::PI * a).sin();
            (s + q) / (s - q)
        })
    });
    g.finish();
}

fn mp(c: &mut Criterion) {
    let mut g = c.benchmark_group("expr/mp");
    g.measurement_time(Duration::from_secs(2))
        .warm_up_time(Duration::from_millis(300));
    let e = Expr::parse(CDD).unwrap();
    for digits in [15u64, 50] {
        let wp = Prec::digits(digits).unwrap().bits();
        let theta = Complex::with_val(wp, (0.7, 0.1));
        let a = Complex::with_val(wp, 0.3);
        let env = [("theta", theta.clone()), ("a", a.clone())];
        g.bench_function(format!("eval/{digits}digits"), |b| {
            b.iter(|| e.eval::<Complex, _>(black_box(&env), wp).unwrap())
        });
        g.bench_function(format!("handwritten/{digits}digits"), |b| {
            b.iter(|| {
                let s = Complex::with_val(wp, black_box(&theta).sinh_ref());
                let pi = Complex::with_val(wp, Constant::Pi);
                let q = Complex::with_val(wp, &pi * black_box(&a))
                    .sin()
                    .mul_i(false);
                Complex::with_val(wp, &s + &q) / Complex::with_val(wp, &s - &q)
            })
        });
    }
    g.finish();
}

criterion_group!(benches, parse, double, mp);
criterion_main!(benches);
