//! `dressing demo`: the built-in demonstration.

use super::agreement_digits;
use crate::num::ComplexField;
use crate::precision::Prec;
use crate::special;
use rug::Complex;
use std::fmt::Write as _;

/// The invented example model, shipped inside the binary so the demo needs
/// no files; the same text is examples/lantern.toml.
pub const LANTERN: &str = include_str!("../../examples/lantern.toml");

fn section(out: &mut String, title: &str) {
    let _ = writeln!(out, "\n== {title} ==\n");
    eprintln!("dressing demo: {title} …");
}

/// The built-in demonstration, end to end on the invented lantern model:
/// evaluation in and outside the integral's strip with the representation
/// used and a second method, the equation checks, the pole table with
/// bound-state readings, a CDD verdict, a table of the kernel and pictures
/// written to a folder; then
/// the numeric core and a published check.
pub(crate) fn demo() -> super::Report {
    use super::{
        CddArgs, CheckArgs, EvalArgs, MethodArg, PlotArgs, PlotKind, PolesArgs, TableArgs,
        TableFormat,
    };
    let mut out = String::new();
    let mut failed = false;
    let dir = std::env::temp_dir().join("dressing-demo");
    let model = dir.join("lantern.toml");
    let path = model.display().to_string();
    if let Err(e) = std::fs::create_dir_all(&dir).and_then(|_| std::fs::write(&model, LANTERN)) {
        return super::Report {
            stdout: format!("dressing demo: cannot write {}: {e}\n", dir.display()),
            failed: true,
        };
    }
    let _ = writeln!(
        out,
        "dressing demo: the lantern model, an invented integrable model with one coupling g = 0.35.\n\
         Its scalar factor sigma is an infinite product of gamma functions; `dressed` multiplies it\n\
         by a CDD block. The model file was written to {path}: edit it and rerun any command on it."
    );
    let mut run = |out: &mut String, r: Result<super::Report, String>| match r {
        Ok(r) => {
            failed |= r.failed;
            out.push_str(&r.stdout);
        }
        Err(e) => {
            failed = true;
            let _ = writeln!(out, "error: {e}");
        }
    };
    section(
        &mut out,
        "sigma at three rapidities, 30 digits, each checked a second way",
    );
    run(
        &mut out,
        super::eval::eval_cmd(&EvalArgs {
            model: path.clone(),
            factor: None,
            at: vec!["0.7+0.2i".into(), "0.4+1.5i".into(), "i*pi/5".into()],
            points: None,
            line: None,
            n: 11,
            digits: 30,
            method: MethodArg::Auto,
            verify: true,
            set: vec![],
            json: false,
        }),
    );
    section(&mut out, "the functional equations");
    run(
        &mut out,
        super::check::check_cmd(&CheckArgs {
            model: path.clone(),
            equation: None,
            digits: 30,
            points: 4,
            regions: vec![],
            only_regions: false,
            seed: 1,
            set: vec![],
            json: false,
        }),
    );
    section(
        &mut out,
        "poles and zeros of the dressed factor in the physical strip",
    );
    run(
        &mut out,
        super::poles::poles_cmd(&PolesArgs {
            model: path.clone(),
            factor: Some("dressed".into()),
            window: "0:1".into(),
            masses: Some("1,1".into()),
            digits: 12,
            regions: vec![],
            scan: None,
            set: vec![],
            json: false,
        }),
    );
    section(&mut out, "a proposed CDD factor on sigma");
    run(
        &mut out,
        super::cdd::cdd_cmd(&CddArgs {
            model: path.clone(),
            candidate: "block(g/2)".into(),
            factor: Some("sigma".into()),
            digits: 20,
            points: 3,
            set: vec![],
            json: false,
        }),
    );
    section(
        &mut out,
        "the dressed factor and its kernel φ = −i d/dθ log S on the real line, for other codes",
    );
    let table = |line: &str, n: usize, format: TableFormat| TableArgs {
        model: path.clone(),
        factor: Some("dressed".into()),
        line: line.into(),
        n,
        digits: 10,
        format,
        method: MethodArg::Auto,
        set: vec![],
    };
    run(
        &mut out,
        super::table::table_cmd(&table("-2:2", 5, TableFormat::Csv)),
    );
    let tsv = dir.join("dressed-table.tsv");
    let written = super::table::table_cmd(&table("-8:8", 801, TableFormat::Tsv)).and_then(|r| {
        std::fs::write(&tsv, &r.stdout)
            .map_err(|e| format!("cannot write {}: {e}", tsv.display()))?;
        Ok(super::Report {
            stdout: format!(
                "wrote the same on -8:8 with 801 points to {}\n",
                tsv.display()
            ),
            failed: r.failed,
        })
    });
    run(&mut out, written);
    section(&mut out, "pictures");
    for (kind, name) in [(PlotKind::Strip, "strip"), (PlotKind::Axis, "axis")] {
        run(
            &mut out,
            super::plot::plot_cmd(&PlotArgs {
                model: path.clone(),
                kind,
                factor: Some("dressed".into()),
                out: Some(
                    dir.join(format!("dressed-{name}.svg"))
                        .display()
                        .to_string(),
                ),
                digits: 12,
                set: vec![],
                re: None,
                im: None,
                size: "640x480".into(),
            }),
        );
    }
    let _ = writeln!(out, "open them in a browser; they are in {}", dir.display());
    section(&mut out, "the numeric core");
    out.push_str(&core());
    super::Report {
        stdout: out,
        failed,
    }
}

/// Special functions with error estimates, two identities, and the
/// published sine-Gordon factor by both representations.
fn core() -> String {
    let mut out = String::new();
    let points = [(0.5, 3.0), (-7.3, 0.4), (2.0, 1e-8)];
    for digits in [15u64, 50] {
        let prec = Prec::digits(digits).expect("valid");
        for &(x, y) in &points {
            let z = Complex::with_val(prec.bits() + 32, (x, y));
            match special::log_gamma(&z, prec) {
                Ok(r) => {
                    let _ = writeln!(
                        out,
                        "log Γ({x}{y:+}i) at {digits} digits = {}\n    error estimate {}",
                        r.value.to_decimal(digits as usize),
                        r.radius
                    );
                }
                Err(e) => {
                    let _ = writeln!(out, "log Γ({x}{y:+}i): {e}");
                }
            }
        }
    }
    let prec = Prec::digits(100).expect("valid");
    let p = prec.bits() + 32;
    let half = Complex::with_val(p, 0.5);
    let g = special::gamma(&half, prec).map(|g| g.value);
    let pi = Complex::with_val(p, rug::float::Constant::Pi);
    if let Ok(g) = g {
        let agree = agreement_digits(&Complex::with_val(p, &g * &g), &pi);
        let _ = writeln!(
            out,
            "\nΓ(1/2)² = π (DLMF 5.4.6): agrees to {agree:.0} digits at 100 requested"
        );
    }
    if let Ok(psi) = special::digamma(&Complex::with_val(p, 1), prec) {
        let euler = Complex::with_val(p, -rug::Float::with_val(p, rug::float::Constant::Euler));
        let agree = agreement_digits(&psi.value, &euler);
        let _ = writeln!(
            out,
            "ψ(1) = −γ (DLMF 5.4.12): agrees to {agree:.0} digits at 100 requested"
        );
    }
    demo_factor(&mut out);
    out
}

/// The demo's factor section: a published factor (the sine-Gordon soliton
/// factor, a check rather than a model of ours) evaluated in and outside the
/// strip of its integral, by both representations.
fn demo_factor(out: &mut String) {
    use crate::factor::{known::sine_gordon_soliton, Method};
    let xi = 2.0 * std::f64::consts::PI / 7.0;
    let Ok(f) = sine_gordon_soliton(xi) else {
        return;
    };
    let _ = writeln!(
        out,
        "\nGamma-product factor (a published check): sine-Gordon soliton factor, ξ = 2π/7"
    );
    if let Some((lo, hi)) = f.strip() {
        let _ = writeln!(
            out,
            "integral representation converges for {lo:.4} < Im θ < {hi:.4}"
        );
    }
    let prec = Prec::digits(30).expect("valid");
    for (x, y) in [(0.7, 0.2), (0.4, 1.5)] {
        let theta = Complex::with_val(prec.bits() + 32, (x, y));
        let p = f.log_value(&theta, prec, Method::Product);
        let i = f.log_value(&theta, prec, Method::Integral);
        match (p, i) {
            (Ok(p), Ok(i)) => {
                let agree = agreement_digits(&p.log.value, &i.log.value);
                let _ = writeln!(
                    out,
                    "log(−S₀(θ = {x}{y:+}i)) = {}\n    error estimate {}; {}; {} agrees to {agree:.0} digits",
                    p.log.value.to_decimal(30),
                    p.log.radius,
                    p.representation,
                    i.representation
                );
            }
            (Err(e), _) | (_, Err(e)) => {
                let _ = writeln!(out, "θ = {x}{y:+}i: {e}");
            }
        }
    }
}
