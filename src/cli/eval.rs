//! `dressing eval`: a factor of a model at rapidities, with the branch,
//! the error estimate and the representation used, optionally checked a
//! second, independent way.

use super::Report;
use crate::factor::Method;
use crate::model::{Evaluation, Model, Piece};
use crate::num::ComplexField;
use crate::precision::Prec;
use clap::{Args, ValueEnum};
use num_complex::Complex64;
use rayon::prelude::*;
use rug::Complex;
use std::fmt::Write as _;

/// Arguments of `dressing eval`.
#[derive(Args, Debug, Clone)]
pub struct EvalArgs {
    /// The model file (TOML, see docs/model-format.md).
    pub model: String,
    /// Which factor (default: the first in the file).
    #[arg(long)]
    pub factor: Option<String>,
    /// A rapidity: 0.3, 0.3+1.2i, i*pi/3, 2.5-0.1i, or an expression in the
    /// model's parameters (repeatable).
    #[arg(long = "at", allow_hyphen_values = true)]
    pub at: Vec<String>,
    /// A file of rapidities, one per line (`#` starts a comment).
    #[arg(long)]
    pub points: Option<String>,
    /// A line of rapidities FROM:TO, with --n points; the phase is continued along it.
    #[arg(long, allow_hyphen_values = true)]
    pub line: Option<String>,
    /// Number of points on --line.
    #[arg(long, default_value_t = 11)]
    pub n: usize,
    /// Decimal digits wanted. 12 or fewer uses the double path (f64), whose
    /// error estimates typically leave 12 to 14 digits; more uses MPFR.
    #[arg(long, default_value_t = 12)]
    pub digits: u64,
    /// Representation for the gamma products.
    #[arg(long, value_enum, default_value_t = MethodArg::Auto)]
    pub method: MethodArg,
    /// Also compute each value a second, independent way and report the digits of agreement.
    #[arg(long)]
    pub verify: bool,
    /// Redefine a parameter, NAME=EXPR (repeatable).
    #[arg(long = "set", allow_hyphen_values = true)]
    pub set: Vec<String>,
    /// Print JSON (full precision, numbers as decimal strings).
    #[arg(long)]
    pub json: bool,
}

/// Requests of at most this many digits run on the double path.
pub(crate) const DOUBLE_DIGITS: u64 = 12;

/// `--method`.
#[derive(Clone, Copy, Debug, ValueEnum, PartialEq, Eq)]
pub enum MethodArg {
    /// Chosen per point from its position and the estimated cost.
    Auto,
    /// Explicit factors plus the analytic tail.
    Product,
    /// The Malmstén integral, continued outside its strip.
    Integral,
}

impl From<MethodArg> for Method {
    fn from(m: MethodArg) -> Method {
        match m {
            MethodArg::Auto => Method::Auto,
            MethodArg::Product => Method::Product,
            MethodArg::Integral => Method::Integral,
        }
    }
}

/// One evaluated point, as text at the requested digits.
struct Row {
    input: String,
    result: Result<Shown, String>,
    verify: Option<Result<(String, f64), String>>,
}

struct Shown {
    theta: (String, String),
    value: (String, String),
    log: (String, String),
    modulus: String,
    phase: String,
    radius: String,
    digits: f64,
    bits: u32,
    turns: i64,
    pieces: Vec<(String, String)>,
    log_rug: Complex,
}

fn show<C: ComplexField>(e: &Evaluation<C>, digits: usize) -> Shown {
    let parts = |v: &C| {
        let c = v.to_complex();
        (
            c.real().to_string_radix(10, Some(digits)),
            c.imag().to_string_radix(10, Some(digits)),
        )
    };
    let logc = e.log.value.to_complex();
    let modulus = rug::Float::with_val(logc.prec().0, logc.real()).exp();
    Shown {
        theta: parts(&e.theta),
        value: parts(&e.value.value),
        log: parts(&e.log.value),
        modulus: modulus.to_string_radix(10, Some(digits)),
        phase: logc.imag().to_string_radix(10, Some(digits)),
        radius: e.log.radius.to_string(),
        digits: e.value.correct_digits(),
        bits: e.log.prec,
        turns: e.turns,
        pieces: e
            .pieces
            .iter()
            .map(|p| (p.kind.to_string(), p.how.clone()))
            .collect(),
        log_rug: logc,
    }
}

fn parse_set(set: &[String]) -> Result<Vec<(String, String)>, String> {
    set.iter()
        .map(|s| match s.split_once('=') {
            Some((k, v)) if !k.trim().is_empty() => {
                Ok((k.trim().to_string(), v.trim().to_string()))
            }
            _ => Err(format!("--set {s}: write NAME=EXPR, e.g. --set g=0.3")),
        })
        .collect()
}

/// Loads a model file and applies `--set NAME=EXPR` overrides.
pub(crate) fn load_model(path: &str, set: &[String]) -> Result<Model, String> {
    let overrides = parse_set(set)?;
    let model = Model::load(path).map_err(|e| e.to_string())?;
    if overrides.is_empty() {
        Ok(model)
    } else {
        model.with_parameters(&overrides).map_err(|e| e.to_string())
    }
}

/// The factor named by `--factor`, or the model's first factor.
pub(crate) fn pick_factor(model: &Model, factor: &Option<String>) -> Result<String, String> {
    match factor {
        Some(f) => {
            model.factor(f).map_err(|e| format!("--factor {f}: {e}"))?;
            Ok(f.clone())
        }
        // A model always has at least one factor (the loader refuses none).
        None => model
            .factors()
            .first()
            .map(|f| f.name().to_string())
            .ok_or_else(|| format!("{}: the model has no factors", model.file())),
    }
}

/// Reads `--line FROM:TO`: two rapidities (numbers or expressions in the
/// model's parameters) at `wp` bits.
pub(crate) fn parse_line(model: &Model, line: &str, wp: u32) -> Result<(Complex, Complex), String> {
    let (a, b) = line
        .split_once(':')
        .ok_or_else(|| format!("--line {line}: write FROM:TO, e.g. --line -3:3"))?;
    let from = model
        .rapidity(a, wp)
        .map_err(|e| format!("--line {line}: cannot read `{a}`: {e}"))?;
    let to = model
        .rapidity(b, wp)
        .map_err(|e| format!("--line {line}: cannot read `{b}`: {e}"))?;
    Ok((from, to))
}

/// Reads `--points FILE`: one rapidity per line, `#` comments.
fn read_points(path: &str) -> Result<Vec<(String, String)>, String> {
    let text = std::fs::read_to_string(path)
        .map_err(|e| format!("--points {path}: cannot read the file: {e}"))?;
    Ok(text
        .lines()
        .enumerate()
        .filter_map(|(i, l)| {
            let l = l.split('#').next().unwrap_or("").trim();
            (!l.is_empty()).then(|| (format!("{path}:{}", i + 1), l.to_string()))
        })
        .collect())
}

/// Whether a second, independent representation exists for every gamma
/// product of the factor (then `--verify` compares product and integral
/// forms; otherwise it recomputes at 64 more bits).
fn has_integral(model: &Model, factor: &str) -> bool {
    model.factor(factor).is_ok_and(|f| {
        f.pieces().iter().any(|p| matches!(p, Piece::Product(_)))
            && f.pieces().iter().all(|p| match p {
                Piece::Product(g) => g.strip().is_some(),
                _ => true,
            })
    })
}

pub(crate) fn eval_cmd(args: &EvalArgs) -> Result<Report, String> {
    let prec = Prec::digits(args.digits).map_err(|e| format!("--digits {}: {e}", args.digits))?;
    let overrides = parse_set(&args.set)?;
    let model = Model::load(&args.model).map_err(|e| e.to_string())?;
    let model = if overrides.is_empty() {
        model
    } else {
        model
            .with_parameters(&overrides)
            .map_err(|e| e.to_string())?
    };
    let factor = pick_factor(&model, &args.factor)?;
    let mut inputs: Vec<(String, String)> = args
        .at
        .iter()
        .map(|a| (format!("--at {a}"), a.clone()))
        .collect();
    if let Some(p) = &args.points {
        inputs.extend(read_points(p)?);
    }
    if inputs.is_empty() && args.line.is_none() {
        return Err(
            "give the rapidities: --at θ (repeatable), --points FILE or --line FROM:TO \
                    --n N"
                .into(),
        );
    }
    let double = args.digits <= DOUBLE_DIGITS;
    let wp = prec.bits() + 32;
    let method: Method = args.method.into();
    let digits = args.digits as usize;
    let mut thetas: Vec<(String, Complex)> = Vec::new();
    for (label, text) in &inputs {
        let t = model
            .rapidity(text, wp)
            .map_err(|e| format!("{label}: cannot read the rapidity `{text}`: {e}"))?;
        thetas.push((text.clone(), t));
    }
    let evaluate = |t: &Complex, m: Method, p: Prec| -> Result<Shown, String> {
        if double && p.bits() <= 53 {
            let z = Complex64::new(t.real().to_f64(), t.imag().to_f64());
            model
                .evaluate(&factor, &z, Prec::DOUBLE, m)
                .map(|e| show(&e, 17))
                .map_err(|e| e.to_string())
        } else {
            model
                .evaluate(&factor, &Complex::with_val(p.bits() + 32, t), p, m)
                .map(|e| show(&e, digits.max(17)))
                .map_err(|e| e.to_string())
        }
    };
    let independent = has_integral(&model, &factor);
    let verify = |t: &Complex, first: &Shown| -> Result<(String, f64), String> {
        let (m2, p2, how) = if independent {
            // The other representation than the one the first value used.
            let used_integral = first
                .pieces
                .iter()
                .any(|(kind, how)| kind == "gamma-product" && how.starts_with("integral"));
            let m2 = if used_integral {
                Method::Product
            } else {
                Method::Integral
            };
            let how = if m2 == Method::Integral {
                "integral form"
            } else {
                "product form"
            };
            (m2, prec, how.to_string())
        } else {
            (
                method,
                Prec::from_bits(prec.bits() as u64 + 64).map_err(|e| e.to_string())?,
                "the same representations at 64 more bits".to_string(),
            )
        };
        let second = evaluate(t, m2, p2)?;
        let d = Complex::with_val(wp + 64, &first.log_rug - &second.log_rug);
        let agree = if d.is_zero() {
            args.digits as f64
        } else {
            -(d.abs().real().to_f64().log10())
        };
        Ok((how, agree))
    };

    let mut rows: Vec<Row> = thetas
        .par_iter()
        .map(|(text, t)| {
            let result = evaluate(t, method, prec);
            let verify = match (&result, args.verify) {
                (Ok(first), true) => Some(verify(t, first)),
                _ => None,
            };
            Row {
                input: text.clone(),
                result,
                verify,
            }
        })
        .collect();
    if let Some(line) = &args.line {
        let (from, to) = parse_line(&model, line, wp)?;
        let out = if double {
            let c = |z: &Complex| Complex64::new(z.real().to_f64(), z.imag().to_f64());
            model
                .evaluate_line(&factor, &c(&from), &c(&to), args.n, Prec::DOUBLE, method)
                .map_err(|e| format!("--line {line}: {e}"))?
                .into_iter()
                .map(|r| r.map(|e| show(&e, 17)).map_err(|e| e.to_string()))
                .collect::<Vec<_>>()
        } else {
            model
                .evaluate_line(&factor, &from, &to, args.n, prec, method)
                .map_err(|e| format!("--line {line}: {e}"))?
                .into_iter()
                .map(|r| r.map(|e| show(&e, digits)).map_err(|e| e.to_string()))
                .collect::<Vec<_>>()
        };
        for (j, result) in out.into_iter().enumerate() {
            let verify = match (&result, args.verify) {
                (Ok(first), true) => {
                    let t = model
                        .rapidity(&format!("{}+{}*i", first.theta.0, first.theta.1), wp)
                        .map_err(|e| e.to_string());
                    Some(t.and_then(|t| verify(&t, first)))
                }
                _ => None,
            };
            let input = match &result {
                Ok(s) => {
                    let im = trim(&s.theta.1, 6);
                    format!(
                        "{}{}{}i   (line point {j})",
                        trim(&s.theta.0, 6),
                        if im.starts_with('-') { "" } else { "+" },
                        im
                    )
                }
                Err(_) => format!("line point {j}"),
            };
            rows.push(Row {
                input,
                result,
                verify,
            });
        }
    }
    let failed = rows.iter().any(|r| r.result.is_err());
    let stdout = if args.json {
        json(&model, &factor, args, &rows)
    } else {
        text(&model, &factor, args, &rows)
    };
    Ok(Report { stdout, failed })
}

fn text(model: &Model, factor: &str, args: &EvalArgs, rows: &[Row]) -> String {
    let mut out = String::new();
    let f = model.factor(factor).expect("checked");
    let _ = writeln!(
        out,
        "factor `{factor}` of {}{}; z = {}; {} digits requested; --method {:?}",
        model.file(),
        model.name().map(|n| format!(" ({n})")).unwrap_or_default(),
        model.scale().1,
        args.digits,
        args.method
    );
    if let Some((lo, hi)) = f.strip() {
        let _ = writeln!(
            out,
            "integral representation converges for {lo:.6} < Im θ < {hi:.6}"
        );
    }
    let _ = writeln!(
        out,
        "log S is continued from the base point θ = {} along straight segments",
        model.base()
    );
    for r in rows {
        let _ = writeln!(out, "\nθ = {}", r.input);
        match &r.result {
            Err(e) => {
                let _ = writeln!(out, "  not computed: {e}");
            }
            Ok(s) => {
                let d = args.digits as usize;
                let c = |(re, im): &(String, String)| {
                    let im = trim(im, d);
                    if let Some(abs) = im.strip_prefix('-') {
                        format!("{} - {abs}i", trim(re, d))
                    } else {
                        format!("{} + {}i", trim(re, d), im)
                    }
                };
                let _ = writeln!(out, "  S        = {}", c(&s.value));
                let _ = writeln!(
                    out,
                    "  log S    = {}{}",
                    c(&s.log),
                    if s.turns != 0 {
                        format!("   ({:+} × 2πi from the principal sum)", s.turns)
                    } else {
                        String::new()
                    }
                );
                let _ = writeln!(
                    out,
                    "  |S|      = {}    phase = {}",
                    trim(&s.modulus, d),
                    trim(&s.phase, d)
                );
                let _ = writeln!(
                    out,
                    "  error    ≈ {} in log S  (S to {:.1} digits, {} bits)",
                    s.radius, s.digits, s.bits
                );
                if s.digits + 0.5 < args.digits as f64 {
                    let _ = writeln!(
                        out,
                        "  warning: only {:.1} of the {} digits requested can be trusted here",
                        s.digits, args.digits
                    );
                }
                for (kind, how) in &s.pieces {
                    let _ = writeln!(out, "  {kind:<14} {how}");
                }
            }
        }
        match &r.verify {
            Some(Ok((how, agree))) => {
                let _ = writeln!(out, "  verify: {how} agrees to {agree:.1} digits");
            }
            Some(Err(e)) => {
                let _ = writeln!(out, "  verify: the second computation failed: {e}");
            }
            None => {}
        }
    }
    out
}

/// A decimal string cut to `d` significant digits (keeping the exponent).
fn trim(s: &str, d: usize) -> String {
    let (mant, exp) = match s.find('e') {
        Some(i) => (&s[..i], &s[i..]),
        None => (s, ""),
    };
    let mut out = String::new();
    let mut count = 0;
    for ch in mant.chars() {
        if ch.is_ascii_digit() {
            if count >= d {
                continue;
            }
            if count > 0 || ch != '0' {
                count += 1;
            }
        }
        out.push(ch);
    }
    format!("{out}{exp}")
}

fn json(model: &Model, factor: &str, args: &EvalArgs, rows: &[Row]) -> String {
    let mut points = Vec::new();
    for r in rows {
        let mut o = serde_json::Map::new();
        o.insert("input".into(), r.input.clone().into());
        match &r.result {
            Err(e) => {
                o.insert("error".into(), e.clone().into());
            }
            Ok(s) => {
                let pair = |(re, im): &(String, String)| serde_json::json!({"re": re, "im": im});
                o.insert("theta".into(), pair(&s.theta));
                o.insert("value".into(), pair(&s.value));
                o.insert("log".into(), pair(&s.log));
                o.insert("modulus".into(), s.modulus.clone().into());
                o.insert("phase".into(), s.phase.clone().into());
                o.insert("error_estimate".into(), s.radius.clone().into());
                o.insert(
                    "correct_digits".into(),
                    serde_json::json!((s.digits * 10.0).round() / 10.0),
                );
                o.insert("precision_bits".into(), s.bits.into());
                o.insert("turns".into(), s.turns.into());
                o.insert(
                    "pieces".into(),
                    s.pieces
                        .iter()
                        .map(|(k, h)| serde_json::json!({"kind": k, "representation": h}))
                        .collect::<Vec<_>>()
                        .into(),
                );
            }
        }
        match &r.verify {
            Some(Ok((how, agree))) => {
                o.insert(
                    "verify".into(),
                    serde_json::json!({"second_way": how, "agreeing_digits": (agree * 10.0).round() / 10.0}),
                );
            }
            Some(Err(e)) => {
                o.insert("verify".into(), serde_json::json!({"error": e}));
            }
            None => {}
        }
        points.push(serde_json::Value::Object(o));
    }
    let doc = serde_json::json!({
        "model": model.file(),
        "factor": factor,
        "digits": args.digits,
        "method": format!("{:?}", args.method).to_lowercase(),
        "base_point": model.base().to_string(),
        "points": points,
    });
    serde_json::to_string_pretty(&doc).unwrap_or_default() + "\n"
}
