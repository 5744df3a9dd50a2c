//! `dressing plot`: a picture of a factor — its phase portrait over the
//! physical strip, |S| and the phase on the real line, or log|S| on the
//! imaginary axis — written to an SVG or PNG file.

use super::Report;
use crate::plot::{self, Mark, MarkKind};
use crate::precision::Prec;
use clap::{Args, ValueEnum};
use std::f64::consts::PI;
use std::path::PathBuf;
use std::time::Instant;

/// Arguments of `dressing plot`.
#[derive(Args, Debug, Clone)]
pub struct PlotArgs {
    /// The model file (TOML, see docs/model-format.md).
    pub model: String,
    /// What to draw.
    #[arg(long, value_enum)]
    pub kind: PlotKind,
    /// Which factor (default: the first in the file).
    #[arg(long)]
    pub factor: Option<String>,
    /// The file to write, .svg or .png (default: dressing-FACTOR-KIND.svg here).
    #[arg(long)]
    pub out: Option<String>,
    /// Decimal digits for `real` and `axis`: 12 or fewer uses the double path,
    /// more uses MPFR (slower). The `strip` portrait is always computed at
    /// double precision.
    #[arg(long, default_value_t = 12)]
    pub digits: u64,
    /// Redefine a parameter, NAME=EXPR (repeatable).
    #[arg(long = "set", allow_hyphen_values = true)]
    pub set: Vec<String>,
    /// Range of Re θ, A:B (strip: default -3:3; real: the line, default -6:6).
    /// A and B may be expressions in the parameters, e.g. -pi:pi.
    #[arg(long, allow_hyphen_values = true)]
    pub re: Option<String>,
    /// Range of Im θ, C:D (strip: default -0.5:pi+0.5; axis: u in θ = iu,
    /// default 0:pi).
    #[arg(long, allow_hyphen_values = true)]
    pub im: Option<String>,
    /// Image size in pixels, WxH.
    #[arg(long, default_value = "800x600")]
    pub size: String,
}

/// `--kind`.
#[derive(Clone, Copy, Debug, ValueEnum, PartialEq, Eq)]
pub enum PlotKind {
    /// Phase portrait of S(θ) over the physical strip: hue = arg S, lightness = log|S|.
    Strip,
    /// |S| and the continuous phase δ(θ) = Im log S along the real line.
    Real,
    /// log|S| along the imaginary axis θ = iu.
    Axis,
}

impl PlotKind {
    fn name(self) -> &'static str {
        match self {
            PlotKind::Strip => "strip",
            PlotKind::Real => "real",
            PlotKind::Axis => "axis",
        }
    }
}

/// Reads `WxH`.
fn parse_size(text: &str) -> Result<(u32, u32), String> {
    let bad = || {
        format!(
            "--size {text}: write WIDTHxHEIGHT in pixels, e.g. 800x600 (from {}x{} to {}x{})",
            plot::MIN_SIZE.0,
            plot::MIN_SIZE.1,
            plot::MAX_SIZE.0,
            plot::MAX_SIZE.1
        )
    };
    let (w, h) = text.split_once(['x', 'X', '×']).ok_or_else(bad)?;
    let w: u32 = w.trim().parse().map_err(|_| bad())?;
    let h: u32 = h.trim().parse().map_err(|_| bad())?;
    if w < plot::MIN_SIZE.0 || h < plot::MIN_SIZE.1 || w > plot::MAX_SIZE.0 || h > plot::MAX_SIZE.1
    {
        return Err(bad());
    }
    Ok((w, h))
}

/// Reads a range `A:B` of real numbers or real expressions in the
/// parameters; `option` names it in errors.
fn parse_range(
    model: &crate::model::Model,
    option: &str,
    text: &str,
) -> Result<(f64, f64), String> {
    let (a, b) = text
        .split_once(':')
        .ok_or_else(|| format!("{option} {text}: write A:B, e.g. {option} -3:3"))?;
    let read = |s: &str| -> Result<f64, String> {
        let z = model
            .rapidity(s.trim(), 64)
            .map_err(|e| format!("{option} {text}: cannot read `{s}`: {e}"))?;
        let (x, y) = (z.real().to_f64(), z.imag().to_f64());
        if !x.is_finite() || !y.is_finite() {
            return Err(format!(
                "{option} {text}: `{s}` is not a finite number; give finite bounds"
            ));
        }
        if y.abs() > 1e-12 * (1.0 + x.abs()) {
            return Err(format!(
                "{option} {text}: `{s}` = {x}{y:+}i is not real; give real bounds"
            ));
        }
        Ok(x)
    };
    let (a, b) = (read(a)?, read(b)?);
    if a >= b {
        return Err(format!(
            "{option} {text}: the range is empty or inverted ({a} ≥ {b}); give A < B"
        ));
    }
    Ok((a, b))
}

pub(crate) fn plot_cmd(args: &PlotArgs) -> Result<Report, String> {
    let model = super::eval::load_model(&args.model, &args.set)?;
    let factor = super::eval::pick_factor(&model, &args.factor)?;
    let size = parse_size(&args.size)?;
    let prec = Prec::digits(args.digits).map_err(|e| format!("--digits {}: {e}", args.digits))?;
    let prec = if args.digits <= 12 {
        Prec::DOUBLE
    } else {
        prec
    };
    let out = PathBuf::from(
        args.out
            .clone()
            .unwrap_or_else(|| format!("dressing-{factor}-{}.svg", args.kind.name())),
    );
    let with_option = |e: crate::Error| match &args.out {
        Some(o) => format!("--out {o}: {e}"),
        None => e.to_string(),
    };
    let range = |option: &str, given: &Option<String>, default: (f64, f64)| match given {
        Some(t) => parse_range(&model, option, t),
        None => Ok(default),
    };
    let refuse = |option: &str, given: &Option<String>, instead: &str| match given {
        Some(_) => Err(format!(
            "{option} does not apply to --kind {}; {instead}",
            args.kind.name()
        )),
        None => Ok(()),
    };
    // Poles and zeros enumerated from the pieces (expression pieces are not
    // enumerated) in the imaginary range shown.
    let marks_in = |im: (f64, f64)| -> Vec<Mark> {
        let Ok(f) = model.factor(&factor) else {
            return Vec::new();
        };
        match crate::poles::enumerate(&model, f, (im.0 / PI, im.1 / PI)) {
            Ok((points, _, _)) => points
                .iter()
                .map(|p| {
                    let t = p.theta();
                    Mark {
                        theta: (t.re, t.im),
                        kind: if p.order > 0 {
                            MarkKind::Pole
                        } else {
                            MarkKind::Zero
                        },
                        order: p.order.abs(),
                        label: match p.axis {
                            crate::poles::Axis::Imaginary => format!("iπ·{}", p.coordinate_text()),
                            crate::poles::Axis::Real => p.coordinate_text(),
                        },
                    }
                })
                .collect(),
            Err(_) => Vec::new(),
        }
    };
    let start = Instant::now();
    let (written, what) = match args.kind {
        PlotKind::Strip => {
            let re = range("--re", &args.re, (-3.0, 3.0))?;
            let im = range("--im", &args.im, (-0.5, PI + 0.5))?;
            let marks = marks_in(im);
            let w = plot::phase_portrait(&model, &factor, re, im, size, &marks, &out)
                .map_err(with_option)?;
            (
                w,
                format!(
                    "phase portrait of `{factor}`, Re θ ∈ [{}, {}], Im θ ∈ [{}, {}], double precision",
                    fmt(re.0),
                    fmt(re.1),
                    fmt(im.0),
                    fmt(im.1)
                ),
            )
        }
        PlotKind::Real => {
            refuse("--im", &args.im, "the real line has Im θ = 0")?;
            let re = range("--re", &args.re, (-6.0, 6.0))?;
            let w =
                plot::real_line_plot(&model, &factor, re, size, prec, &out).map_err(with_option)?;
            (
                w,
                format!(
                    "|S| and δ(θ) of `{factor}` on θ ∈ [{}, {}]",
                    fmt(re.0),
                    fmt(re.1)
                ),
            )
        }
        PlotKind::Axis => {
            refuse("--re", &args.re, "give the range of u = Im θ with --im")?;
            let u = range("--im", &args.im, (0.0, PI))?;
            let marks = marks_in(u);
            let w = plot::axis_plot(&model, &factor, u, size, prec, &marks, &out)
                .map_err(with_option)?;
            (
                w,
                format!(
                    "log|S| of `{factor}` on θ = iu, u ∈ [{}, {}]",
                    fmt(u.0),
                    fmt(u.1)
                ),
            )
        }
    };
    Ok(format!(
        "wrote {} ({what}; {}x{} pixels, {:.2} s)\n",
        written.display(),
        size.0,
        size.1,
        start.elapsed().as_secs_f64()
    )
    .into())
}

/// A bound, briefly.
fn fmt(x: f64) -> String {
    let s = format!("{x:.6}");
    let s = s.trim_end_matches('0').trim_end_matches('.');
    if s == "-0" {
        "0".into()
    } else {
        s.to_string()
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn sizes() {
        assert_eq!(parse_size("800x600").unwrap(), (800, 600));
        assert_eq!(parse_size("400X300").unwrap(), (400, 300));
        assert!(parse_size("800").is_err());
        assert!(parse_size("0x600").is_err());
        assert!(parse_size("axb").is_err());
    }

    #[test]
    fn bounds() {
        assert_eq!(fmt(3.0), "3");
        assert_eq!(fmt(-0.5), "-0.5");
        assert_eq!(fmt(PI + 0.5), "3.641593");
    }
}
