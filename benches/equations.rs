//! Equation checks: the sine-Gordon file (tests/data/models/sine-gordon.toml),
//! three equations at 64 points each and 50 digits, as `dressing check
//! --digits 50 --points 16` runs them (4 regions × 16 points).

use criterion::{criterion_group, criterion_main, Criterion};
use dressing::equations::{check_equation, CheckOptions};
use dressing::model::Model;
use std::hint::black_box;
use std::time::Duration;

fn sine_gordon_check(c: &mut Criterion) {
    let path = concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/tests/data/models/sine-gordon.toml"
    );
    let mut opts = CheckOptions::new(50).unwrap();
    opts.points_per_region = 16;
    let mut g = c.benchmark_group("check");
    g.measurement_time(Duration::from_secs(10))
        .sample_size(10)
        .warm_up_time(Duration::from_secs(1));
    g.bench_function("sine_gordon_3eq_64pts_50digits", |b| {
        b.iter(|| {
            // A fresh model each time: no warm caches of factor coefficients.
            let m = Model::load(path).unwrap();
            for eq in m.equations() {
                let r = check_equation(&m, eq, black_box(&opts));
                assert!(r.passed);
            }
        })
    });
    g.finish();
}

criterion_group!(benches, sine_gordon_check);
criterion_main!(benches);
