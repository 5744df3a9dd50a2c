//! `dressing poles`: the table of poles and zeros of a factor.

use super::Report;
use crate::poles::{analyse, Axis, PointReport, PoleOptions, Singular};
use crate::precision::Prec;
use clap::Args;
use std::fmt::Write as _;

/// Arguments of `dressing poles`.
#[derive(Args, Debug, Clone)]
pub struct PolesArgs {
    /// The model file.
    pub model: String,
    /// Which factor (default: the first).
    #[arg(long)]
    pub factor: Option<String>,
    /// The window FROM:TO in u/π on the imaginary axis θ = iu (in θ when z = theta).
    #[arg(long, allow_hyphen_values = true, default_value = "-0.5:1.5")]
    pub window: String,
    /// Masses m1,m2 of the scattering particles, for bound-state masses.
    #[arg(long)]
    pub masses: Option<String>,
    /// Decimal digits of the residues (12 or fewer: double precision).
    #[arg(long, default_value_t = 12)]
    pub digits: u64,
    /// Count zeros minus poles in a rectangle RE0:RE1,IM0:IM1 by the argument principle (repeatable).
    #[arg(long = "region", allow_hyphen_values = true)]
    pub regions: Vec<String>,
    /// Track the poles in the physical strip as a parameter moves: NAME=FROM:TO:STEPS.
    #[arg(long, allow_hyphen_values = true)]
    pub scan: Option<String>,
    /// Redefine a parameter, NAME=EXPR (repeatable).
    #[arg(long = "set", allow_hyphen_values = true)]
    pub set: Vec<String>,
    /// Print JSON.
    #[arg(long)]
    pub json: bool,
}

fn pair(text: &str, sep: char, what: &str, example: &str) -> Result<(f64, f64), String> {
    let bad = || format!("{what} {text}: write two numbers separated by `{sep}`, e.g. {example}");
    let (a, b) = text.split_once(sep).ok_or_else(bad)?;
    let a: f64 = a.trim().parse().map_err(|_| bad())?;
    let b: f64 = b.trim().parse().map_err(|_| bad())?;
    Ok((a, b))
}

pub(crate) fn poles_cmd(args: &PolesArgs) -> Result<Report, String> {
    let model = super::eval::load_model(&args.model, &args.set)?;
    let factor = super::eval::pick_factor(&model, &args.factor)?;
    let window = pair(&args.window, ':', "--window", "--window 0:1")?;
    let masses = match &args.masses {
        Some(m) => Some(pair(m, ',', "--masses", "--masses 1,1")?),
        None => None,
    };
    let prec = if args.digits <= 12 {
        Prec::DOUBLE
    } else {
        Prec::digits(args.digits).map_err(|e| format!("--digits {}: {e}", args.digits))?
    };
    let opts = PoleOptions {
        window,
        prec,
        masses,
    };
    if let Some(scan) = &args.scan {
        return scan_cmd(&model, &factor, scan, &opts);
    }
    let (points, cancelled) =
        analyse(&model, &factor, &opts).map_err(|e| format!("--window {}: {e}", args.window))?;
    let mut counts = Vec::new();
    for r in &args.regions {
        let reg = crate::equations::Region::parse(r).map_err(|e| format!("--region {r}: {e}"))?;
        let n = crate::poles::count_in_rectangle(&model, &factor, reg.re, reg.im)
            .map_err(|e| format!("--region {r}: {e}"))?;
        counts.push((r.clone(), n));
    }
    let mismatch = points
        .iter()
        .any(|p| p.numerical_order.is_some_and(|o| o != p.point.order));
    let mut stdout = if args.json {
        json(&factor, args, &points, &cancelled)
    } else {
        text(&model, &factor, args, &points, &cancelled)
    };
    if !counts.is_empty() && !args.json {
        stdout.push('\n');
        for (r, n) in &counts {
            let _ = writeln!(
                stdout,
                "rectangle {r}: zeros − poles = {n} (argument principle along its boundary)"
            );
        }
    }
    Ok(Report {
        stdout,
        failed: mismatch,
    })
}

fn kind(p: &Singular) -> &'static str {
    if p.order > 0 {
        "pole"
    } else {
        "zero"
    }
}

fn text(
    model: &crate::model::Model,
    factor: &str,
    args: &PolesArgs,
    points: &[PointReport],
    cancelled: &[Singular],
) -> String {
    let mut out = String::new();
    let axis = points
        .first()
        .map(|p| p.point.axis)
        .unwrap_or(Axis::Imaginary);
    let coord = match axis {
        Axis::Imaginary => "u/π",
        Axis::Real => "θ",
    };
    let _ = writeln!(
        out,
        "poles and zeros of `{factor}` ({}) with {coord} in [{}]{}",
        model.file(),
        args.window,
        if axis == Axis::Imaginary {
            ", on the imaginary axis θ = iu"
        } else {
            ", on the real axis"
        }
    );
    let _ = writeln!(
        out,
        "\n{:>14}  {:<5} {:>5} {:>8}  {:>22} {:>8}  {:<6} {:<5} {}",
        coord,
        "kind",
        "order",
        "checked",
        "residue / leading c.",
        "± error",
        "strip",
        "−i·Res",
        if args.masses.is_some() { "m_b" } else { "" }
    );
    for p in points {
        let checked = match p.numerical_order {
            Some(o) if o == p.point.order => "yes".to_string(),
            Some(o) => format!("no ({o})"),
            None => "-".into(),
        };
        let (lead, err) = match p.leading {
            Some((c, e)) => {
                if c.im.abs() < 1e-12 * c.norm() {
                    (format!("{:.10e}", c.re), format!("{e:.0e}"))
                } else if c.re.abs() < 1e-12 * c.norm() {
                    (format!("{:.10e}i", c.im), format!("{e:.0e}"))
                } else {
                    (format!("{:.4e}{:+.4e}i", c.re, c.im), format!("{e:.0e}"))
                }
            }
            None => ("-".into(), "-".into()),
        };
        let sign = match p.neg_i_residue {
            Some(r) if r > 0.0 => "+",
            Some(_) => "−",
            None => "",
        };
        let mass = p.mass.map(|m| format!("{m:.10}")).unwrap_or_default();
        let _ = writeln!(
            out,
            "{:>14}  {:<5} {:>5} {:>8}  {:>22} {:>8}  {:<6} {:<5} {}",
            p.point.coordinate_text(),
            kind(&p.point),
            p.point.order.abs(),
            checked,
            lead,
            err,
            if p.in_strip { "yes" } else { "no" },
            sign,
            mass
        );
    }
    if points.is_empty() {
        let _ = writeln!(out, "{:>14}  (none in the window)", "");
    }
    if !cancelled.is_empty() {
        let _ = writeln!(
            out,
            "\ncancelled (the pieces' orders add up to 0, no pole or zero there):"
        );
        for c in cancelled {
            let parts: Vec<String> = c
                .contributions
                .iter()
                .map(|(l, o)| format!("{l} {o:+}"))
                .collect();
            let _ = writeln!(
                out,
                "  {coord} = {}: {}",
                c.coordinate_text(),
                parts.join(", ")
            );
        }
    }
    let _ = writeln!(
        out,
        "\norders: enumerated from the pieces, checked by the argument principle on a small circle; \
         residues by the trapezoidal rule on that circle."
    );
    out
}

fn json(factor: &str, args: &PolesArgs, points: &[PointReport], cancelled: &[Singular]) -> String {
    let pts: Vec<serde_json::Value> = points
        .iter()
        .map(|p| {
            serde_json::json!({
                "axis": format!("{:?}", p.point.axis).to_lowercase(),
                "coordinate": p.point.coordinate,
                "exact": p.point.exact.as_ref().map(|q| q.to_string()),
                "kind": kind(&p.point),
                "order": p.point.order.abs(),
                "numerical_order": p.numerical_order.map(|o| o.abs()),
                "leading_coefficient": p.leading.map(|(c, e)| serde_json::json!({"re": c.re, "im": c.im, "error": e})),
                "leading_coefficient_full": p.leading_full.as_ref().map(|c| serde_json::json!({"re": c.real().to_string_radix(10, Some(args.digits as usize)), "im": c.imag().to_string_radix(10, Some(args.digits as usize))})),
                "in_physical_strip": p.in_strip,
                "neg_i_residue": p.neg_i_residue,
                "bound_state_mass": p.mass,
                "contributions": p.point.contributions.iter().map(|(l, o)| serde_json::json!({"piece": l, "order": o})).collect::<Vec<_>>(),
            })
        })
        .collect();
    let canc: Vec<serde_json::Value> = cancelled
        .iter()
        .map(|c| serde_json::json!({"coordinate": c.coordinate, "exact": c.exact.as_ref().map(|q| q.to_string())}))
        .collect();
    let doc = serde_json::json!({
        "factor": factor,
        "window": args.window,
        "points": pts,
        "cancelled": canc,
    });
    serde_json::to_string_pretty(&doc).unwrap_or_default() + "\n"
}

/// `--scan NAME=FROM:TO:STEPS`: the strip's poles at each value, with the
/// events between consecutive values.
fn scan_cmd(
    model: &crate::model::Model,
    factor: &str,
    scan: &str,
    opts: &PoleOptions,
) -> Result<Report, String> {
    let bad = || format!("--scan {scan}: write NAME=FROM:TO:STEPS, e.g. --scan g=0.1:0.9:9");
    let (name, range) = scan.split_once('=').ok_or_else(bad)?;
    let parts: Vec<&str> = range.split(':').collect();
    if parts.len() != 3 {
        return Err(bad());
    }
    // The ends are read exactly (0.1 is 1/10, 2/3 is 2/3), and so are the
    // values in between: coincidences at round values are then exact.
    let exact = |t: &str| {
        crate::expr::Expr::parse(t.trim())
            .ok()
            .and_then(|e| e.to_rational(|_| None))
            .ok_or_else(bad)
    };
    let (from_q, to_q) = (exact(parts[0])?, exact(parts[1])?);
    let steps: usize = parts[2].trim().parse().map_err(|_| bad())?;
    if !(2..=10_000).contains(&steps) {
        return Err(bad());
    }
    if !model.parameters().names().any(|n| n == name) {
        return Err(format!(
            "--scan {scan}: `{name}` is not a parameter of the model; the parameters are: {}",
            model.parameters().names().collect::<Vec<_>>().join(", ")
        ));
    }
    let (from, to) = (show_rational(&from_q), show_rational(&to_q));
    let mut out = String::new();
    let _ = writeln!(
        out,
        "poles of `{factor}` in the physical strip as {name} goes from {from} to {to} ({steps} values); u/π per value"
    );
    // (value, poles in the strip, whether poles met zeros there)
    let mut prev: Option<(String, Vec<f64>, bool)> = None;
    let mut opts = opts.clone();
    opts.window = (0.0, 1.0);
    for j in 0..steps {
        let q =
            rug::Rational::from(&to_q - &from_q) * rug::Rational::from((j, steps - 1)) + &from_q;
        let v = show_rational(&q);
        let m = match model.with_parameters(&[(name.to_string(), q.to_string())]) {
            Ok(m) => m,
            Err(e) => {
                let _ = writeln!(out, "  {name} = {v:<10} not computed: {e}");
                continue;
            }
        };
        let (points, cancelled) = match analyse(&m, factor, &opts) {
            Ok(r) => r,
            Err(e) => {
                let _ = writeln!(out, "  {name} = {v:<10} not computed: {e}");
                continue;
            }
        };
        // Poles counted with their orders, so two poles merging into a
        // double pole are not read as one leaving.
        let poles: Vec<f64> = points
            .iter()
            .filter(|p| p.point.order > 0 && p.in_strip)
            .flat_map(|p| std::iter::repeat_n(p.point.coordinate, p.point.order as usize))
            .collect();
        let list: Vec<String> = points
            .iter()
            .filter(|p| p.point.order > 0 && p.in_strip)
            .map(|p| {
                let s = match p.neg_i_residue {
                    Some(r) if r > 0.0 => "+",
                    Some(_) => "−",
                    None => "",
                };
                let order = if p.point.order > 1 {
                    format!(" (order {})", p.point.order)
                } else {
                    String::new()
                };
                format!("{:.6}{s}{order}", p.point.coordinate)
            })
            .collect();
        let _ = writeln!(
            out,
            "  {name} = {v:<10} {}",
            if list.is_empty() {
                "(none)".into()
            } else {
                list.join("  ")
            }
        );
        let mut collided = false;
        for c in cancelled
            .iter()
            .filter(|c| c.coordinate > 0.0 && c.coordinate < 1.0)
        {
            collided = true;
            let _ = writeln!(
                out,
                "      a pole and a zero collide at u/π = {} ({name} = {v})",
                c.coordinate_text()
            );
        }
        if let Some((pv, pp, was_collided)) = &prev {
            let (now, before) = (poles.len(), pp.len());
            let line = if now < before && collided {
                format!(
                    "{} pole(s) fewer at {name} = {v}: cancelled by the zero(s) they meet",
                    before - now
                )
            } else if now > before && *was_collided {
                format!(
                    "{} pole(s) back after the collision at {name} = {pv}",
                    now - before
                )
            } else if now > before {
                format!(
                    "{} pole(s) entered the strip between {name} = {pv} and {v}",
                    now - before
                )
            } else if now < before {
                format!(
                    "{} pole(s) left the strip between {name} = {pv} and {v}",
                    before - now
                )
            } else {
                String::new()
            };
            if !line.is_empty() {
                let _ = writeln!(out, "      {line}");
            }
        }
        prev = Some((v, poles, collided));
    }
    Ok(Report {
        stdout: out,
        failed: false,
    })
}

/// A scan value: its decimal expansion when that ends within 12 digits,
/// otherwise the fraction and a decimal approximation.
fn show_rational(q: &rug::Rational) -> String {
    let mut den = q.denom().clone();
    for p in [2u32, 5] {
        while den.is_divisible_u(p) {
            den /= p;
        }
    }
    // Nearest double (Rational::to_f64 truncates).
    let x = rug::Float::with_val(53, q).to_f64();
    if den == 1 {
        let d = format!("{x}");
        let digits = d.chars().filter(|c| c.is_ascii_digit()).count();
        if digits <= 12 {
            return d;
        }
    }
    format!("{q} ≈ {x:.6}")
}
