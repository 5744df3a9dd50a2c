//! `dressing table`: a factor and its kernel on a line, as CSV, TSV or
//! JSON for Bethe–Yang, TBA and form-factor codes.

use super::eval::{parse_line, DOUBLE_DIGITS};
use super::{MethodArg, Report};
use crate::error::Error;
use crate::factor::Method;
use crate::model::{Model, TableRow};
use crate::num::ComplexField;
use crate::precision::{Approx, Prec};
use clap::{Args, ValueEnum};
use num_complex::Complex64;
use rug::{Complex, Float};
use std::fmt::Write as _;

/// Arguments of `dressing table`.
#[derive(Args, Debug, Clone)]
pub struct TableArgs {
    /// The model file.
    pub model: String,
    /// Which factor (default: the first).
    #[arg(long)]
    pub factor: Option<String>,
    /// The line FROM:TO of rapidities (numbers or expressions, e.g. -8:8 or -2+0.1i:2+0.1i).
    #[arg(long, allow_hyphen_values = true)]
    pub line: String,
    /// Number of equally spaced points, both ends included.
    #[arg(long, default_value_t = 101)]
    pub n: usize,
    /// Decimal digits (12 or fewer: the double path, whose estimates
    /// usually guarantee 11 to 13; more: MPFR).
    #[arg(long, default_value_t = 10)]
    pub digits: u64,
    /// Output format.
    #[arg(long, value_enum, default_value_t = TableFormat::Csv)]
    pub format: TableFormat,
    /// Representation for the gamma products.
    #[arg(long, value_enum, default_value_t = MethodArg::Auto)]
    pub method: MethodArg,
    /// Redefine a parameter, NAME=EXPR (repeatable).
    #[arg(long = "set", allow_hyphen_values = true)]
    pub set: Vec<String>,
}

/// `--format`.
#[derive(Clone, Copy, Debug, ValueEnum, PartialEq, Eq)]
pub enum TableFormat {
    /// Comma-separated, one header row.
    Csv,
    /// Tab-separated, with `#` comment lines saying what was computed.
    Tsv,
    /// One JSON document with the settings and one object per point.
    Json,
}

/// The columns, in order, with what they hold (also printed in TSV and JSON).
const COLUMNS: &[(&str, &str)] = &[
    ("theta_re", "Re θ"),
    ("theta_im", "Im θ"),
    ("S_re", "Re S"),
    ("S_im", "Im S"),
    ("S_abs", "|S|"),
    ("delta_re", "Re δ, δ = −i log S on the branch continuous along the line: the phase"),
    ("delta_im", "Im δ = −ln|S|"),
    ("phi_re", "Re φ, φ = −i d/dθ log S (the TBA kernel), computed analytically"),
    ("phi_im", "Im φ"),
    ("err_log", "error estimate of log S (absolute), hence of δ"),
    ("err_phi", "error estimate of φ (absolute)"),
    ("digits", "decimal digits guaranteed by the estimates: of S, and of φ relative to max(|φ|, 1); the smaller"),
    ("status", "ok, or why the point has no values (a pole, a zero, …)"),
];

/// One row as text fields: θ, then the values (none at a pole or zero).
struct Fields {
    theta: (String, String),
    values: Option<[String; 10]>,
    status: String,
}

/// A number as table text: the shortest round-trip decimal on the double
/// path, `digits` digits otherwise; no "-0" (a signed zero says nothing a
/// reader of a table needs).
fn number(x: &Float, double: bool, digits: usize) -> String {
    if x.is_zero() {
        "0".to_string()
    } else if double {
        format!("{:e}", x.to_f64())
    } else {
        x.to_string_radix(10, Some(digits))
    }
}

/// (Re θ, Im θ) as table text.
fn theta_text<C: ComplexField>(theta: &C, digits: usize) -> (String, String) {
    let double = C::MAX_PREC.is_some();
    let t = theta.to_complex();
    (
        number(t.real(), double, digits),
        number(t.imag(), double, digits),
    )
}

fn fields<C: ComplexField>(row: &TableRow<C>, digits: usize, requested: u64) -> Fields {
    let double = C::MAX_PREC.is_some();
    let num = |x: &Float| number(x, double, digits);
    let e = &row.eval;
    let p = e.log.prec;
    let value = e.value.value.to_complex();
    let log = e.log.value.to_complex();
    let k = row.kernel.value.to_complex();
    let neg = |x: &Float| Float::with_val(p, -x);
    let correct = e.value.correct_digits().min(kernel_digits(&row.kernel));
    let status = if correct + 0.5 < requested as f64 {
        format!("only {correct:.1} digits")
    } else {
        "ok".to_string()
    };
    let (theta_re, theta_im) = theta_text(&e.theta, digits);
    Fields {
        theta: (theta_re, theta_im),
        values: Some([
            num(value.real()),
            num(value.imag()),
            num(&Float::with_val(p, log.real()).exp()),
            // δ = −i log S: Re δ = Im log S, Im δ = −Re log S; likewise φ.
            num(log.imag()),
            num(&neg(log.real())),
            num(k.imag()),
            num(&neg(k.real())),
            format!("{:.2e}", e.log.radius.to_f64()),
            format!("{:.2e}", row.kernel.radius.to_f64()),
            format!("{correct:.1}"),
        ]),
        status,
    }
}

/// Digits of the kernel that its estimate guarantees, relative to
/// `max(|φ|, 1)`: where φ decays (large |θ|) its absolute error is what a
/// TBA or Bethe–Yang code feels.
fn kernel_digits<C: ComplexField>(k: &Approx<C>) -> f64 {
    let scale_l2 = k.value.log2_abs().max(0.0);
    let cap = k.prec as f64 * std::f64::consts::LOG10_2;
    ((scale_l2 - k.radius.log2()) * std::f64::consts::LOG10_2).min(cap)
}

/// A short status for a point without values.
fn failure(e: &Error) -> String {
    match e {
        Error::Pole { order, .. } => format!("pole of order {order}"),
        Error::Zero { order, .. } => format!("zero of order {order}"),
        other => other.to_string(),
    }
}

fn csv_field(s: &str) -> String {
    if s.contains([',', '"', '\n']) {
        format!("\"{}\"", s.replace('"', "\"\""))
    } else {
        s.to_string()
    }
}

pub(crate) fn table_cmd(args: &TableArgs) -> Result<Report, String> {
    let prec = Prec::digits(args.digits).map_err(|e| format!("--digits {}: {e}", args.digits))?;
    let model = super::eval::load_model(&args.model, &args.set)?;
    let factor = super::eval::pick_factor(&model, &args.factor)?;
    if args.n < 2 {
        return Err(format!("--n {}: a table needs at least 2 points", args.n));
    }
    if args.n > MAX_POINTS {
        return Err(format!(
            "--n {}: at most {MAX_POINTS} points per table; split the line into several tables",
            args.n
        ));
    }
    let wp = prec.bits() + 32;
    let (from, to) = parse_line(&model, &args.line, wp)?;
    let method: Method = args.method.into();
    let digits = args.digits as usize;
    let double = args.digits <= DOUBLE_DIGITS;
    let rows: Vec<Result<Fields, Failed>> = if double {
        let c = |z: &Complex| Complex64::new(z.real().to_f64(), z.imag().to_f64());
        collect(
            &model,
            &factor,
            &c(&from),
            &c(&to),
            args,
            Prec::DOUBLE,
            method,
            17,
        )?
    } else {
        collect(&model, &factor, &from, &to, args, prec, method, digits)?
    };
    let failed = rows.iter().any(|r| r.is_err());
    let rows: Vec<Fields> = rows
        .into_iter()
        .map(|r| {
            r.unwrap_or_else(|(theta, status)| Fields {
                theta,
                values: None,
                status,
            })
        })
        .collect();
    let stdout = match args.format {
        TableFormat::Csv => delimited(&rows, ",", None),
        TableFormat::Tsv => delimited(&rows, "\t", Some(header(&model, &factor, args, prec))),
        TableFormat::Json => json(&model, &factor, args, prec, &rows),
    };
    Ok(Report { stdout, failed })
}

/// A point without values: θ as text, and why.
type Failed = ((String, String), String);

/// The most points one table may have.
pub const MAX_POINTS: usize = 10_000_000;

#[allow(clippy::too_many_arguments)]
fn collect<C: ComplexField>(
    model: &Model,
    factor: &str,
    from: &C,
    to: &C,
    args: &TableArgs,
    prec: Prec,
    method: Method,
    digits: usize,
) -> Result<Vec<Result<Fields, Failed>>, String> {
    let rows = model
        .tabulate(factor, from, to, args.n, prec, method)
        .map_err(|e| format!("--line {}: {e}", args.line))?;
    // Formatting is a fifth of a double-path table: in parallel too.
    use rayon::prelude::*;
    Ok(rows
        .into_par_iter()
        .map(|(theta, r)| match r {
            Ok(row) => Ok(fields(&row, digits, args.digits)),
            Err(e) => Err((theta_text(&theta, digits), failure(&e))),
        })
        .collect())
}

fn header(model: &Model, factor: &str, args: &TableArgs, prec: Prec) -> String {
    let mut h = String::new();
    let _ = writeln!(
        h,
        "# factor `{factor}` of {}; z = {}; line {} with {} points; {} digits ({} bits)",
        model.file(),
        model.scale().1,
        args.line,
        args.n,
        args.digits,
        if args.digits <= DOUBLE_DIGITS {
            53
        } else {
            prec.bits()
        }
    );
    let _ = writeln!(
        h,
        "# log S continued from the base point θ = {} to the first point, then along the line",
        model.base()
    );
    for (name, what) in COLUMNS {
        let _ = writeln!(h, "# {name}: {what}");
    }
    h
}

fn delimited(rows: &[Fields], sep: &str, header: Option<String>) -> String {
    let mut out = header.unwrap_or_default();
    let names: Vec<&str> = COLUMNS.iter().map(|c| c.0).collect();
    let _ = writeln!(out, "{}", names.join(sep));
    for r in rows {
        let mut cells = vec![r.theta.0.clone(), r.theta.1.clone()];
        match &r.values {
            Some(v) => cells.extend(v.iter().cloned()),
            None => cells.extend(std::iter::repeat_n(String::new(), COLUMNS.len() - 3)),
        }
        let status = if sep == "," {
            csv_field(&r.status)
        } else {
            r.status.replace(['\t', '\n'], " ")
        };
        cells.push(status);
        let _ = writeln!(out, "{}", cells.join(sep));
    }
    out
}

fn json(model: &Model, factor: &str, args: &TableArgs, prec: Prec, rows: &[Fields]) -> String {
    let double = args.digits <= DOUBLE_DIGITS;
    let value = |s: &str| -> serde_json::Value {
        // Numbers on the double path; decimal strings (all digits) otherwise.
        match (double, s.parse::<f64>()) {
            (true, Ok(x)) if x.is_finite() => serde_json::json!(x),
            _ => serde_json::json!(s),
        }
    };
    let points: Vec<serde_json::Value> = rows
        .iter()
        .map(|r| {
            let mut o = serde_json::Map::new();
            o.insert("theta_re".into(), value(&r.theta.0));
            o.insert("theta_im".into(), value(&r.theta.1));
            if let Some(v) = &r.values {
                for ((name, _), cell) in COLUMNS[2..].iter().zip(v.iter()) {
                    let cell = if name.starts_with("err") || *name == "digits" {
                        serde_json::json!(cell.parse::<f64>().unwrap_or(f64::NAN))
                    } else {
                        value(cell)
                    };
                    o.insert(name.to_string(), cell);
                }
            }
            o.insert("status".into(), r.status.clone().into());
            serde_json::Value::Object(o)
        })
        .collect();
    let doc = serde_json::json!({
        "model": model.file(),
        "factor": factor,
        "z": model.scale().1,
        "line": args.line,
        "n": args.n,
        "digits": args.digits,
        "precision_bits": if double { 53 } else { prec.bits() },
        "base_point": model.base().to_string(),
        "columns": COLUMNS.iter().map(|(n, w)| serde_json::json!({"name": n, "meaning": w})).collect::<Vec<_>>(),
        "points": points,
    });
    serde_json::to_string_pretty(&doc).unwrap_or_default() + "\n"
}
