//! Checks the equations of examples/lantern.toml through the library API.
//!
//! Run with `cargo run --release --example check_lantern`.

use dressing::equations::{check_equation, CheckOptions};
use dressing::model::Model;

fn main() -> Result<(), Box<dyn std::error::Error>> {
    let model = Model::load(concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/examples/lantern.toml"
    ))?;
    let opts = CheckOptions::new(30)?;
    for eq in model.equations() {
        let r = check_equation(&model, eq, &opts);
        let (worst, at) = match &r.worst {
            Some((w, region)) => (
                w.relative,
                format!("{} ({region})", w.theta.to_string_radix(10, Some(6))),
            ),
            None => (f64::NAN, "-".into()),
        };
        println!(
            "{:<18} {:>3} points, worst |L/R - 1| = {worst:.1e} at {at}: {}",
            r.name,
            r.checked,
            if r.passed { "pass" } else { "FAIL" }
        );
    }
    Ok(())
}
