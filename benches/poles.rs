//! Pole maps: the example's `dressed` factor over |Im θ| ≤ 3π (u/π in
//! [−3, 3]) with residues at 30 digits, and at double precision.

use criterion::{criterion_group, criterion_main, Criterion};
use dressing::model::Model;
use dressing::poles::{analyse, PoleOptions};
use dressing::Prec;
use std::hint::black_box;
use std::time::Duration;

fn pole_map(c: &mut Criterion) {
    let m = Model::load(concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/examples/lantern.toml"
    ))
    .unwrap();
    let mut g = c.benchmark_group("poles");
    g.measurement_time(Duration::from_secs(5)).sample_size(10);
    for (name, prec) in [
        ("double", Prec::DOUBLE),
        ("30_digits", Prec::digits(30).unwrap()),
    ] {
        let opts = PoleOptions {
            window: (-3.0, 3.0),
            prec,
            masses: Some((1.0, 1.0)),
        };
        g.bench_function(format!("lantern_dressed_3pi_{name}"), |b| {
            b.iter(|| analyse(&m, "dressed", black_box(&opts)).unwrap())
        });
    }
    g.finish();
}

criterion_group!(benches, pole_map);
criterion_main!(benches);
