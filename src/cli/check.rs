//! `dressing check`: the model's functional equations, point by point.

use super::Report;
use crate::equations::{check_equation, CheckOptions, EquationReport, Region};
use crate::model::Model;
use clap::Args;
use std::fmt::Write as _;

/// Arguments of `dressing check`.
#[derive(Args, Debug, Clone)]
pub struct CheckArgs {
    /// The model file (TOML, see docs/model-format.md).
    pub model: String,
    /// Check only this equation (default: all).
    #[arg(long)]
    pub equation: Option<String>,
    /// Decimal digits of the working precision; the tolerance is 10^-(digits-3).
    #[arg(long, default_value_t = 30)]
    pub digits: u64,
    /// Points sampled in each region.
    #[arg(long, default_value_t = 6)]
    pub points: usize,
    /// A region RE0:RE1,IM0:IM1 to sample as well (repeatable).
    #[arg(long = "region", allow_hyphen_values = true)]
    pub regions: Vec<String>,
    /// Sample only the --region rectangles, not the default regions.
    #[arg(long)]
    pub only_regions: bool,
    /// Seed of the sampler (the same seed gives the same points).
    #[arg(long, default_value_t = 1)]
    pub seed: u64,
    /// Redefine a parameter, NAME=EXPR (repeatable).
    #[arg(long = "set", allow_hyphen_values = true)]
    pub set: Vec<String>,
    /// Print JSON.
    #[arg(long)]
    pub json: bool,
}

/// The disclaimer every report ends with.
pub const EVIDENCE: &str =
    "A pass is numerical evidence at the sampled points and precision, not a proof.";

pub(crate) fn check_cmd(args: &CheckArgs) -> Result<Report, String> {
    let model = super::eval::load_model(&args.model, &args.set)?;
    let mut opts =
        CheckOptions::new(args.digits).map_err(|e| format!("--digits {}: {e}", args.digits))?;
    if args.points == 0 || args.points > 10_000 {
        return Err(format!(
            "--points {}: give between 1 and 10000 points per region",
            args.points
        ));
    }
    opts.points_per_region = args.points;
    opts.seed = args.seed;
    opts.default_regions = !args.only_regions;
    for r in &args.regions {
        opts.regions
            .push(Region::parse(r).map_err(|e| format!("--region {r}: {e}"))?);
    }
    if opts.regions.is_empty() && !opts.default_regions {
        return Err("--only-regions needs at least one --region RE0:RE1,IM0:IM1".into());
    }
    let eqs: Vec<_> = match &args.equation {
        Some(n) => vec![model
            .equation(n)
            .map_err(|e| format!("--equation {n}: {e}"))?],
        None => model.equations().iter().collect(),
    };
    if eqs.is_empty() {
        return Err(format!(
            "{}: the model declares no [[equation]]; add one (docs/model-format.md)",
            model.file()
        ));
    }
    let reports: Vec<EquationReport> = eqs
        .iter()
        .map(|e| check_equation(&model, e, &opts))
        .collect();
    let failed = reports.iter().any(|r| !r.passed);
    let stdout = if args.json {
        json(&model, args, &reports)
    } else {
        text(&model, args, &opts, &reports)
    };
    Ok(Report { stdout, failed })
}

fn where_(r: &EquationReport) -> (String, String, f64) {
    match &r.worst {
        Some((w, region)) => (
            format!("{}{:+}i", w.theta.real().to_f64(), w.theta.imag().to_f64()),
            region.clone(),
            w.relative,
        ),
        None => ("-".into(), "-".into(), f64::NAN),
    }
}

fn text(
    model: &Model,
    args: &CheckArgs,
    opts: &CheckOptions,
    reports: &[EquationReport],
) -> String {
    let mut out = String::new();
    let _ = writeln!(
        out,
        "equations of {} at {} digits; {} points per region, seed {}, tolerance {:.0e}",
        model.file(),
        args.digits,
        opts.points_per_region,
        opts.seed,
        opts.tolerance()
    );
    for r in reports {
        let (at, region, worst) = where_(r);
        let digits = if worst == 0.0 {
            args.digits as f64
        } else {
            -worst.log10()
        };
        let _ = writeln!(out, "\n{}: {}", r.name, r.text);
        let _ = writeln!(
            out,
            "  {} points checked ({} skipped near poles or zeros)",
            r.checked, r.skipped
        );
        if r.checked == 0 {
            let _ = writeln!(
                out,
                "  no admissible point: every sampled point lies within the margin of a pole or \
                 zero, or could not be evaluated; sample elsewhere with --region"
            );
        }
        if r.worst.is_some() {
            let _ = writeln!(
                out,
                "  worst |LHS/RHS - 1| = {worst:.2e} at θ = {at} ({region}): {digits:.1} digits agree"
            );
            if let Some((w, _)) = &r.worst {
                let _ = writeln!(
                    out,
                    "  log LHS - log RHS (mod 2πi) there = {}",
                    w.log_difference.to_string_radix(10, Some(3))
                );
            }
        }
        let _ = writeln!(out, "  {}", if r.passed { "PASS" } else { "FAIL" });
    }
    let _ = writeln!(out, "\n{EVIDENCE}");
    out
}

fn json(model: &Model, args: &CheckArgs, reports: &[EquationReport]) -> String {
    let eqs: Vec<serde_json::Value> = reports
        .iter()
        .map(|r| {
            let (at, region, worst) = where_(r);
            serde_json::json!({
                "name": r.name,
                "equation": r.text,
                "checked": r.checked,
                "skipped": r.skipped,
                "tolerance": r.tolerance,
                "worst_relative": if worst.is_finite() { serde_json::json!(worst) } else { serde_json::Value::Null },
                "worst_at": at,
                "worst_region": region,
                "passed": r.passed,
            })
        })
        .collect();
    let doc = serde_json::json!({
        "model": model.file(),
        "digits": args.digits,
        "seed": args.seed,
        "equations": eqs,
        "note": EVIDENCE,
    });
    serde_json::to_string_pretty(&doc).unwrap_or_default() + "\n"
}
