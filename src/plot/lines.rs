//! Plots along lines: |S| and the continuous phase on the real line, log|S|
//! on the imaginary axis.

use super::{
    check_output, check_range, finite_runs, model_label, padded_range, Corner, Figure, Mark,
    MarkKind, Rasters, Sizes, Swatch, FAMILY,
};
use crate::error::{Error, Result};
use crate::factor::Method;
use crate::model::{Evaluation, Model};
use crate::num::ComplexField;
use crate::precision::Prec;
use num_complex::Complex64;
use plotters::coord::Shift;
use plotters::prelude::*;
use plotters::style::text_anchor::{HPos, Pos, VPos};
use rayon::prelude::*;
use std::path::{Path, PathBuf};

/// Number of sample points for a plot `width` pixels wide.
fn samples(width: u32) -> usize {
    (width as usize).clamp(101, 2001)
}

/// The colour of the |S| curve.
const MODULUS: RGBColor = RGBColor(0, 90, 181);
/// The colour of the phase curve.
const PHASE: RGBColor = RGBColor(200, 70, 0);
/// The colour of the log|S| curve.
const LOG_MODULUS: RGBColor = RGBColor(20, 110, 60);
/// Pole and zero markers.
const POLE: RGBColor = RGBColor(200, 0, 40);
const ZERO: RGBColor = RGBColor(0, 80, 200);

/// Writes |S(θ)| and the continuous phase δ(θ) = Im log S(θ) of the factor
/// `factor` along the real line θ ∈ `re` to `out` (`.svg` or `.png`), two
/// panels one above the other in an image of `size` pixels, and returns the
/// path written.
///
/// The values come from [`Model::evaluate_line`] (so δ is continued along
/// the line from the model's base point, without jumps of 2π) at `prec`:
/// the double path for `prec` ≤ 53 bits, MPFR otherwise. There is one
/// sample per pixel of width (at least 101, at most 2001). Points that fail
/// are left out of the curves.
///
/// Errors ([`Error::Domain`]): a non-finite or inverted range, a bad size,
/// extension or folder, a file that cannot be written, or a line on which
/// no point could be evaluated; [`Error::Model`] for an unknown factor.
///
/// ```
/// use dressing::model::Model;
/// use dressing::plot::real_line_plot;
/// use dressing::Prec;
/// let model = Model::load("examples/lantern.toml").unwrap();
/// let out = std::env::temp_dir().join("dressing-doc-sigma-real.svg");
/// real_line_plot(&model, "sigma", (-6.0, 6.0), (400, 300), Prec::DOUBLE, &out).unwrap();
/// assert!(std::fs::read_to_string(&out).unwrap().contains("δ(θ)"));
/// ```
pub fn real_line_plot(
    model: &Model,
    factor: &str,
    re: (f64, f64),
    size: (u32, u32),
    prec: Prec,
    out: &Path,
) -> Result<PathBuf> {
    const F: &str = "plot::real_line_plot";
    check_range(F, "θ", re)?;
    let format = check_output(F, size, out)?;
    model.factor(factor)?;
    let n = samples(size.0);
    let points: Vec<(f64, f64, f64)> = if prec.bits() <= Prec::DOUBLE.bits() {
        let line = model.evaluate_line(
            factor,
            &Complex64::new(re.0, 0.0),
            &Complex64::new(re.1, 0.0),
            n,
            prec,
            Method::Auto,
        )?;
        collect_line(line)
    } else {
        let wp = prec.bits() + 32;
        let line = model.evaluate_line(
            factor,
            &rug::Complex::with_val(wp, (re.0, 0.0)),
            &rug::Complex::with_val(wp, (re.1, 0.0)),
            n,
            prec,
            Method::Auto,
        )?;
        collect_line(line)
    };
    if points.iter().all(|p| p.1.is_nan()) {
        return Err(Error::Domain {
            function: F,
            message: format!(
                "no point of the line θ ∈ [{}, {}] could be evaluated",
                re.0, re.1
            ),
        });
    }
    let fig = RealLine {
        title: format!("{factor} ({}) on the real line", model_label(model)),
        re,
        modulus: points.iter().map(|p| (p.0, p.1)).collect(),
        phase: points.iter().map(|p| (p.0, p.2)).collect(),
    };
    super::render(F, &fig, size, format, out)
}

/// (θ, |S|, δ) for each point; NaN where the point failed.
fn collect_line<C: ComplexField>(line: Vec<Result<Evaluation<C>>>) -> Vec<(f64, f64, f64)> {
    line.into_iter()
        .map(|r| match r {
            Ok(ev) => (ev.theta.re_f64(), ev.modulus(), ev.phase()),
            Err(_) => (f64::NAN, f64::NAN, f64::NAN),
        })
        .collect()
}

struct RealLine {
    title: String,
    re: (f64, f64),
    modulus: Vec<(f64, f64)>,
    phase: Vec<(f64, f64)>,
}

impl Figure for RealLine {
    fn draw<DB: DrawingBackend>(
        &self,
        root: &DrawingArea<DB, Shift>,
        _rasters: &mut Rasters,
    ) -> std::result::Result<(), String> {
        let e = |e: DrawingAreaErrorKind<DB::ErrorType>| e.to_string();
        let z = Sizes::of(root);
        root.fill(&WHITE).map_err(e)?;
        let area = root
            .titled(&self.title, (FAMILY, z.title()).into_font())
            .map_err(e)?;
        let panels = area.split_evenly((2, 1));
        for (panel, (data, desc, legend, colour)) in panels.iter().zip([
            (&self.modulus, "|S|", "|S(θ)|", MODULUS),
            (&self.phase, "δ(θ)", "δ(θ) = Im log S, continuous", PHASE),
        ]) {
            let y = padded_range(data.iter().map(|p| p.1));
            let mut chart = ChartBuilder::on(panel)
                .margin(10)
                .x_label_area_size(z.x_area(root))
                .y_label_area_size(z.y_area(root, "-00.00"))
                .build_cartesian_2d(self.re.0..self.re.1, y.0..y.1)
                .map_err(e)?;
            chart
                .configure_mesh()
                .light_line_style(RGBColor(235, 235, 235))
                .bold_line_style(RGBColor(210, 210, 210))
                .x_desc("θ")
                .y_desc(desc)
                .label_style((FAMILY, z.ticks()))
                .axis_desc_style((FAMILY, z.desc()))
                .draw()
                .map_err(e)?;
            for run in finite_runs(data) {
                chart
                    .draw_series(LineSeries::new(run, colour.stroke_width(z.px(2).max(1))))
                    .map_err(e)?;
            }
            let plot = chart.plotting_area().get_pixel_range();
            super::legend(
                root,
                &plot,
                Corner::UpperRight,
                &[(Swatch::Line(colour, false), legend.to_string())],
                z,
            )?;
        }
        Ok(())
    }
}

/// log|S| beyond ±this is drawn at ±this (the curve is clipped).
pub const AXIS_CLIP: f64 = 30.0;

/// Writes log|S| along the imaginary axis θ = iu, u ∈ `u`, of the factor
/// `factor` to `out` (`.svg` or `.png`), an image of `size` pixels, and
/// returns the path written.
///
/// log|S| = Re log S does not depend on the branch, so each point is
/// evaluated on its own ([`crate::model::Factor::log_sum`], at `prec`: the
/// double path for `prec` ≤ 53 bits, MPFR otherwise, in parallel). The
/// samples are the midpoints of one cell per pixel of width (at least 101,
/// at most 2001), so the ends of the range, often poles or zeros, are not
/// evaluated. Values beyond ±[`AXIS_CLIP`] are clipped; the curve is broken
/// at points that fail and at the marks. Marks on the axis (Re θ = 0) are
/// drawn as vertical dashed lines with × (pole) or ○ (zero) at the top and
/// their labels; marks off the axis are ignored.
///
/// Errors ([`Error::Domain`]): a non-finite or inverted range, a bad size,
/// extension or folder, a file that cannot be written, or no point that
/// could be evaluated; [`Error::Model`] for an unknown factor.
///
/// ```
/// use dressing::model::Model;
/// use dressing::plot::{axis_plot, Mark, MarkKind};
/// use dressing::Prec;
/// let model = Model::from_toml(
///     "[[factor]]\nname = \"S\"\n[[factor.piece]]\nkind = \"cdd\"\nblocks = [{ alpha = \"1/3\" }]\n",
///     "m.toml",
/// ).unwrap();
/// let pole = Mark { theta: (0.0, std::f64::consts::PI / 3.0), kind: MarkKind::Pole, order: 1,
///                   label: "iπ/3".into() };
/// let out = std::env::temp_dir().join("dressing-doc-cdd-axis.svg");
/// axis_plot(&model, "S", (0.0, std::f64::consts::PI), (400, 300), Prec::DOUBLE, &[pole], &out)
///     .unwrap();
/// assert!(std::fs::read_to_string(&out).unwrap().contains("log|S|"));
/// ```
pub fn axis_plot(
    model: &Model,
    factor: &str,
    u: (f64, f64),
    size: (u32, u32),
    prec: Prec,
    marks: &[Mark],
    out: &Path,
) -> Result<PathBuf> {
    const F: &str = "plot::axis_plot";
    check_range(F, "u = Im θ", u)?;
    let format = check_output(F, size, out)?;
    let f = model.factor(factor)?;
    let n = samples(size.0);
    let us: Vec<f64> = (0..n)
        .map(|j| u.0 + (j as f64 + 0.5) / n as f64 * (u.1 - u.0))
        .collect();
    let values: Vec<f64> = if prec.bits() <= Prec::DOUBLE.bits() {
        us.par_iter()
            .map(|&v| {
                f.log_sum::<Complex64>(&Complex64::new(0.0, v), prec, Method::Auto)
                    .map_or(f64::NAN, |s| s.log.value.re)
            })
            .collect()
    } else {
        let wp = prec.bits() + 32;
        us.par_iter()
            .map(|&v| {
                f.log_sum(&rug::Complex::with_val(wp, (0.0, v)), prec, Method::Auto)
                    .map_or(f64::NAN, |s| s.log.value.re_f64())
            })
            .collect()
    };
    if values.iter().all(|v| !v.is_finite()) {
        return Err(Error::Domain {
            function: F,
            message: format!(
                "no point of the imaginary axis θ = iu, u ∈ [{}, {}], could be evaluated",
                u.0, u.1
            ),
        });
    }
    let on_axis: Vec<Mark> = marks
        .iter()
        .filter(|m| m.theta.0.abs() <= 1e-9 * (1.0 + m.theta.1.abs()))
        .filter(|m| m.theta.1 >= u.0 && m.theta.1 <= u.1)
        .cloned()
        .collect();
    // Break the curve at failures and between samples on either side of a mark.
    let mut points = Vec::with_capacity(2 * n);
    for (j, (&x, &y)) in us.iter().zip(&values).enumerate() {
        if j > 0
            && on_axis
                .iter()
                .any(|m| us[j - 1] < m.theta.1 && m.theta.1 <= x)
        {
            points.push((f64::NAN, f64::NAN));
        }
        points.push((x, y.clamp(-AXIS_CLIP, AXIS_CLIP)));
    }
    let fig = Axis {
        title: format!("{factor} ({}) on the imaginary axis", model_label(model)),
        u,
        points,
        marks: on_axis,
    };
    super::render(F, &fig, size, format, out)
}

struct Axis {
    title: String,
    u: (f64, f64),
    points: Vec<(f64, f64)>,
    marks: Vec<Mark>,
}

impl Figure for Axis {
    fn draw<DB: DrawingBackend>(
        &self,
        root: &DrawingArea<DB, Shift>,
        _rasters: &mut Rasters,
    ) -> std::result::Result<(), String> {
        let e = |e: DrawingAreaErrorKind<DB::ErrorType>| e.to_string();
        let z = Sizes::of(root);
        root.fill(&WHITE).map_err(e)?;
        let area = root
            .titled(&self.title, (FAMILY, z.title()).into_font())
            .map_err(e)?;
        let (lo, hi) = padded_range(self.points.iter().map(|p| p.1).chain([0.0]));
        // Room at the top for the mark symbols and labels.
        let hi = if self.marks.is_empty() {
            hi
        } else {
            hi + 0.12 * (hi - lo)
        };
        let mut chart = ChartBuilder::on(&area)
            .margin(10)
            .margin_right(20)
            .x_label_area_size(z.x_area(root))
            .y_label_area_size(z.y_area(root, "-00.00"))
            .build_cartesian_2d(self.u.0..self.u.1, lo..hi)
            .map_err(e)?;
        chart
            .configure_mesh()
            .light_line_style(RGBColor(235, 235, 235))
            .bold_line_style(RGBColor(210, 210, 210))
            .x_desc("u = Im θ   (θ = iu)")
            .y_desc("log|S|")
            .label_style((FAMILY, z.ticks()))
            .axis_desc_style((FAMILY, z.desc()))
            .draw()
            .map_err(e)?;
        chart
            .draw_series(LineSeries::new(
                vec![(self.u.0, 0.0), (self.u.1, 0.0)],
                RGBColor(120, 120, 120),
            ))
            .map_err(e)?;
        for run in finite_runs(&self.points) {
            chart
                .draw_series(LineSeries::new(
                    run,
                    LOG_MODULUS.stroke_width(z.px(2).max(1)),
                ))
                .map_err(e)?;
        }
        let mut entries = vec![(Swatch::Line(LOG_MODULUS, false), "log|S(iu)|".to_string())];
        let top = hi - 0.05 * (hi - lo);
        let label_style = (FAMILY, z.legend())
            .into_font()
            .into_text_style(root)
            .pos(Pos::new(HPos::Left, VPos::Center));
        for kind in [MarkKind::Pole, MarkKind::Zero] {
            let colour = match kind {
                MarkKind::Pole => POLE,
                MarkKind::Zero => ZERO,
            };
            let these: Vec<&Mark> = self.marks.iter().filter(|m| m.kind == kind).collect();
            for (k, m) in these.iter().enumerate() {
                let x = m.theta.1;
                chart
                    .draw_series(DashedLineSeries::new(
                        vec![(x, lo), (x, top)],
                        z.px(5),
                        z.px(4),
                        colour.stroke_width(z.px(1).max(1)),
                    ))
                    .map_err(e)?;
                if k == 0 {
                    entries.push(match kind {
                        MarkKind::Pole => (Swatch::Cross(colour), "pole".to_string()),
                        MarkKind::Zero => (Swatch::Circle(colour), "zero".to_string()),
                    });
                }
                let size = (z.px(6) as i32).max(4);
                let style = colour.stroke_width(z.px(2).max(1));
                chart
                    .draw_series(std::iter::once(match kind {
                        MarkKind::Pole => Cross::new((x, top), size, style).into_dyn(),
                        MarkKind::Zero => Circle::new((x, top), size, style).into_dyn(),
                    }))
                    .map_err(e)?;
                let text = m.text();
                if !text.is_empty() {
                    let (px, py) = chart.backend_coord(&(x, top));
                    let d = z.px(9) as i32;
                    root.draw(&Text::new(text, (px + d, py), label_style.clone()))
                        .map_err(e)?;
                }
            }
        }
        let plot = chart.plotting_area().get_pixel_range();
        super::legend(root, &plot, Corner::LowerRight, &entries, z)?;
        Ok(())
    }
}
