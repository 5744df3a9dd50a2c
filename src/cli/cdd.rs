//! `dressing cdd`: test a proposed CDD factor on a model's factor.

use super::check::EVIDENCE;
use super::Report;
use crate::equations::{analyse_cdd, CddReport, CheckOptions};
use clap::Args;
use num_complex::Complex64;
use std::fmt::Write as _;

/// Arguments of `dressing cdd`.
#[derive(Args, Debug, Clone)]
pub struct CddArgs {
    /// The model file.
    pub model: String,
    /// The candidate: an expression in theta and the parameters, where
    /// block(a) is the standard block (sinh θ + i sin πa)/(sinh θ − i sin πa);
    /// or a file holding such an expression.
    #[arg(long, allow_hyphen_values = true)]
    pub candidate: String,
    /// The factor it multiplies (default: the first factor).
    #[arg(long)]
    pub factor: Option<String>,
    /// Decimal digits for the equation checks.
    #[arg(long, default_value_t = 30)]
    pub digits: u64,
    /// Points per region for the equation checks.
    #[arg(long, default_value_t = 4)]
    pub points: usize,
    /// Redefine a parameter, NAME=EXPR (repeatable).
    #[arg(long = "set", allow_hyphen_values = true)]
    pub set: Vec<String>,
    /// Print JSON.
    #[arg(long)]
    pub json: bool,
}

fn candidate_text(arg: &str) -> Result<String, String> {
    let p = std::path::Path::new(arg);
    if p.is_file() {
        let text = std::fs::read_to_string(p)
            .map_err(|e| format!("--candidate {arg}: cannot read the file: {e}"))?;
        let body: Vec<&str> = text
            .lines()
            .map(|l| l.split('#').next().unwrap_or("").trim())
            .filter(|l| !l.is_empty())
            .collect();
        if body.is_empty() {
            return Err(format!("--candidate {arg}: the file holds no expression"));
        }
        return Ok(body.join(" "));
    }
    Ok(arg.to_string())
}

fn show(c: Option<Complex64>) -> String {
    let num = |x: f64| {
        if x != 0.0 && !(1e-3..1e6).contains(&x.abs()) {
            format!("{x:.6e}")
        } else {
            format!("{x:.6}")
        }
    };
    match c {
        Some(c) if c.im.abs() < 1e-12 * c.norm().max(1e-300) => num(c.re),
        Some(c) => format!(
            "{}{}{}i",
            num(c.re),
            if c.im < 0.0 { "" } else { "+" },
            num(c.im)
        ),
        None => "(singular)".into(),
    }
}

fn u_text(a: &crate::equations::Added) -> String {
    match &a.exact {
        Some(q) if *q.denom() <= 1000 => format!("iπ·{q}"),
        _ => format!("iπ·{:.6}", a.u_over_pi),
    }
}

pub(crate) fn cdd_cmd(args: &CddArgs) -> Result<Report, String> {
    let model = super::eval::load_model(&args.model, &args.set)?;
    let target = super::eval::pick_factor(&model, &args.factor)?;
    let cand = candidate_text(&args.candidate)?;
    let mut opts =
        CheckOptions::new(args.digits).map_err(|e| format!("--digits {}: {e}", args.digits))?;
    if args.points == 0 || args.points > 10_000 {
        return Err(format!(
            "--points {}: give between 1 and 10000",
            args.points
        ));
    }
    opts.points_per_region = args.points;
    let r = analyse_cdd(&model, &target, &cand, &opts)
        .map_err(|e| format!("--candidate {}: {e}", args.candidate))?;
    let failed = r.equations.iter().any(|e| !e.passed);
    let stdout = if args.json {
        json(&r)
    } else {
        text(&model, args, &r)
    };
    Ok(Report { stdout, failed })
}

fn text(model: &crate::model::Model, args: &CddArgs, r: &CddReport) -> String {
    let mut out = String::new();
    let _ = writeln!(
        out,
        "CDD candidate c(θ) = {} on factor `{}` of {}\n",
        r.candidate,
        r.target,
        model.file()
    );
    let _ = writeln!(
        out,
        "homogeneous equations (right-hand side 1, `{}` replaced by c), at {} digits:",
        r.target, args.digits
    );
    if r.equations.is_empty() {
        let _ = writeln!(
            out,
            "  (the model declares no equation involving `{}`)",
            r.target
        );
    }
    for e in &r.equations {
        let worst = e.worst.as_ref().map(|w| w.0.relative).unwrap_or(f64::NAN);
        let _ = writeln!(
            out,
            "  {:<32} worst |LHS − 1| = {:.1e} over {} points   {}",
            e.name,
            worst,
            e.checked,
            if e.passed { "kept" } else { "BROKEN" }
        );
    }
    let _ = writeln!(
        out,
        "\npoles and zeros of c in the physical strip 0 < Im θ < π ({}):",
        r.located_by
    );
    if r.added.is_empty() {
        let _ = writeln!(out, "  none");
    }
    for a in &r.added {
        let kind = if a.order > 0 { "pole" } else { "zero" };
        let mut line = format!(
            "  θ = {:<12} {kind} of order {}; in {}·c: ",
            u_text(a),
            a.order.abs(),
            r.target
        );
        line += &match a.dressed_order {
            0 => "regular (cancels)".to_string(),
            o if o > 0 => format!("pole of order {o}"),
            o => format!("zero of order {}", -o),
        };
        if let Some((res, err)) = a.neg_i_residue {
            let sign = if res.re > 0.0 { "+" } else { "−" };
            let _ = write!(line, ", −i·Res = {:.6} (± {err:.0e}), sign {sign}", res.re);
        }
        let _ = writeln!(out, "{line}");
    }
    let _ = writeln!(out, "\nat the edges:");
    let _ = writeln!(out, "  c(0)   = {}", show(r.at_zero));
    let _ = writeln!(
        out,
        "  c(−30) = {}    c(+30) = {}",
        show(r.limits.0),
        show(r.limits.1)
    );
    if let Some(d) = r.phase_change {
        let _ = writeln!(
            out,
            "  δ(+30) − δ(−30) = {d:.6} = {:.4}·π   (δ = −i log c, continued along the real line)",
            d / std::f64::consts::PI
        );
    }
    let kept = r.equations.iter().filter(|e| e.passed).count();
    let poles: Vec<String> = r
        .added
        .iter()
        .filter(|a| a.dressed_order > 0)
        .map(|a| {
            let s = match a.neg_i_residue {
                Some((res, _)) if res.re > 0.0 => " (+)",
                Some(_) => " (−)",
                None => "",
            };
            format!("{}{s}", u_text(a))
        })
        .collect();
    let _ = writeln!(out, "\nverdict");
    let _ = writeln!(
        out,
        "  equations kept       {kept} of {}",
        r.equations.len()
    );
    let _ = writeln!(
        out,
        "  new poles in strip   {}",
        if poles.is_empty() {
            "none".to_string()
        } else {
            poles.join(", ")
        }
    );
    let _ = writeln!(
        out,
        "  asymptotics          c(±30) = {} / {}; phase change {}",
        show(r.limits.0),
        show(r.limits.1),
        r.phase_change
            .map(|d| format!("{:.4}·π", d / std::f64::consts::PI))
            .unwrap_or_else(|| "not computed".into())
    );
    let _ = writeln!(out, "\n{EVIDENCE}");
    out
}

fn json(r: &CddReport) -> String {
    let c = |v: Option<Complex64>| match v {
        Some(v) => serde_json::json!({"re": v.re, "im": v.im}),
        None => serde_json::Value::Null,
    };
    let doc = serde_json::json!({
        "factor": r.target,
        "candidate": r.candidate,
        "located_by": r.located_by,
        "equations": r.equations.iter().map(|e| serde_json::json!({
            "name": e.name,
            "kept": e.passed,
            "checked": e.checked,
            "worst_relative": e.worst.as_ref().map(|w| w.0.relative),
        })).collect::<Vec<_>>(),
        "added": r.added.iter().map(|a| serde_json::json!({
            "u_over_pi": a.u_over_pi,
            "exact": a.exact.as_ref().map(|q| q.to_string()),
            "order": a.order,
            "dressed_order": a.dressed_order,
            "neg_i_residue": a.neg_i_residue.map(|(v, e)| serde_json::json!({"re": v.re, "im": v.im, "error": e})),
        })).collect::<Vec<_>>(),
        "at_zero": c(r.at_zero),
        "at_minus_30": c(r.limits.0),
        "at_plus_30": c(r.limits.1),
        "phase_change": r.phase_change,
        "note": EVIDENCE,
    });
    serde_json::to_string_pretty(&doc).unwrap_or_default() + "\n"
}
