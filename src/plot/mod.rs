//! Plots of a factor: the phase portrait of S(θ) over the physical strip
//! ([`phase_portrait`]), |S| and the continuous phase along the real line
//! ([`real_line_plot`]), and log|S| along the imaginary axis
//! ([`axis_plot`]).
//!
//! Each writes one file, SVG or PNG by the extension of the path it is
//! given, and returns the path written. Text is drawn without system fonts:
//! SVG files carry `<text>` elements that the viewer renders; PNG files use
//! a built-in 8×8 bitmap font (Latin and Greek). A phase portrait in an SVG
//! file is embedded as a PNG image, so the file stays small.
//!
//! The colouring of a phase portrait is [`colour_of`]: hue from arg S,
//! lightness from log|S| in contour-like terraces; points where the factor
//! cannot be evaluated (its poles and zeros) are grey ([`NEUTRAL`]).
//!
//! ```
//! use dressing::model::Model;
//! use dressing::plot::{phase_portrait, Mark, MarkKind};
//! let model = Model::from_toml(r#"
//!     [[factor]]
//!     name = "S"
//!     [[factor.piece]]
//!     kind = "cdd"
//!     blocks = [ { alpha = "1/3" } ]
//! "#, "inline.toml").unwrap();
//! let pole = Mark {
//!     theta: (0.0, std::f64::consts::PI / 3.0),
//!     kind: MarkKind::Pole,
//!     order: 1,
//!     label: "iπ/3".into(),
//! };
//! let out = std::env::temp_dir().join("dressing-doc-cdd-strip.svg");
//! let written = phase_portrait(&model, "S", (-3.0, 3.0), (-0.5, 3.7), (240, 180), &[pole], &out)
//!     .unwrap();
//! let svg = std::fs::read_to_string(&written).unwrap();
//! assert!(svg.starts_with("<svg") && svg.contains("phase portrait of S"));
//! ```

mod colour;
mod lines;
mod phase;
mod raster;

pub use colour::{colour_of, lightness, BAND, NEUTRAL};
pub use lines::{axis_plot, real_line_plot, AXIS_CLIP};
pub use phase::{phase_grid, phase_portrait, PhaseGrid, INTERPOLATION_TOLERANCE};

use crate::error::{Error, Result};
use plotters::coord::Shift;
use plotters::prelude::*;
use std::path::{Path, PathBuf};

/// Whether a marked point is a pole or a zero.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum MarkKind {
    /// A pole of the factor: drawn as ×.
    Pole,
    /// A zero of the factor: drawn as ○.
    Zero,
}

/// A point to mark on a plot: a pole or a zero of the factor.
#[derive(Clone, Debug, PartialEq)]
pub struct Mark {
    /// The rapidity, (Re θ, Im θ).
    pub theta: (f64, f64),
    /// Pole or zero.
    pub kind: MarkKind,
    /// Its order (shown in the label when it is not 1).
    pub order: i64,
    /// A label drawn beside the mark; may be empty.
    pub label: String,
}

impl Mark {
    /// The text drawn beside the mark: the label, and the order when it is
    /// not 1.
    pub fn text(&self) -> String {
        match (self.label.is_empty(), self.order) {
            (true, 1) => String::new(),
            (true, n) => format!("order {n}"),
            (false, 1) => self.label.clone(),
            (false, n) => format!("{} (order {n})", self.label),
        }
    }
}

/// The file format of a plot, from the extension of its path.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Format {
    /// Scalable vector graphics (`.svg`), for a browser.
    Svg,
    /// A PNG image (`.png`).
    Png,
}

impl Format {
    /// `.svg` or `.png` (in any case); anything else is an
    /// [`Error::Domain`] naming the path.
    ///
    /// ```
    /// use dressing::plot::Format;
    /// use std::path::Path;
    /// assert_eq!(Format::of(Path::new("a/b.SVG")).unwrap(), Format::Svg);
    /// assert_eq!(Format::of(Path::new("b.png")).unwrap(), Format::Png);
    /// assert!(Format::of(Path::new("b.pdf")).is_err());
    /// ```
    pub fn of(path: &Path) -> Result<Format> {
        match path
            .extension()
            .and_then(|e| e.to_str())
            .map(|e| e.to_ascii_lowercase())
            .as_deref()
        {
            Some("svg") => Ok(Format::Svg),
            Some("png") => Ok(Format::Png),
            _ => Err(Error::Domain {
                function: "plot",
                message: format!(
                    "cannot write `{}`: the file name must end in .svg or .png",
                    path.display()
                ),
            }),
        }
    }
}

/// Checks a range `(a, b)` of a plot: finite, `a < b`.
pub(crate) fn check_range(function: &'static str, what: &str, r: (f64, f64)) -> Result<()> {
    if !r.0.is_finite() || !r.1.is_finite() {
        return Err(Error::Domain {
            function,
            message: format!(
                "the range of {what} [{}, {}] is not finite; give finite bounds",
                r.0, r.1
            ),
        });
    }
    if r.0 >= r.1 {
        return Err(Error::Domain {
            function,
            message: format!(
                "the range of {what} [{}, {}] is empty or inverted; give A < B",
                r.0, r.1
            ),
        });
    }
    Ok(())
}

/// Smallest and largest image sizes accepted, in pixels.
pub const MIN_SIZE: (u32, u32) = (160, 120);
/// See [`MIN_SIZE`].
pub const MAX_SIZE: (u32, u32) = (8000, 8000);

/// Checks an image size and the output path (its format, and that its
/// folder exists) before anything is computed.
pub(crate) fn check_output(function: &'static str, size: (u32, u32), out: &Path) -> Result<Format> {
    if size.0 < MIN_SIZE.0 || size.1 < MIN_SIZE.1 || size.0 > MAX_SIZE.0 || size.1 > MAX_SIZE.1 {
        return Err(Error::Domain {
            function,
            message: format!(
                "image size {}x{} is outside {}x{} to {}x{} pixels",
                size.0, size.1, MIN_SIZE.0, MIN_SIZE.1, MAX_SIZE.0, MAX_SIZE.1
            ),
        });
    }
    let format = Format::of(out)?;
    if let Some(dir) = out.parent() {
        if !dir.as_os_str().is_empty() && !dir.is_dir() {
            return Err(Error::Domain {
                function,
                message: format!(
                    "cannot write `{}`: `{}` is not an existing folder",
                    out.display(),
                    dir.display()
                ),
            });
        }
    }
    if out.is_dir() {
        return Err(Error::Domain {
            function,
            message: format!("cannot write `{}`: it is a folder", out.display()),
        });
    }
    Ok(format)
}

/// An RGB image to put at pixel `(x, y)` of the figure, under what is drawn
/// after it.
pub(crate) struct Raster {
    pub x: i32,
    pub y: i32,
    pub w: u32,
    pub h: u32,
    pub rgb: Vec<u8>,
}

/// Where rasters go: blitted at once into a bitmap, or kept to be embedded
/// in the SVG text as PNG images.
pub(crate) struct Rasters {
    embed_later: bool,
    kept: Vec<Raster>,
}

impl Rasters {
    pub(crate) fn put<DB: DrawingBackend>(
        &mut self,
        root: &DrawingArea<DB, Shift>,
        r: Raster,
    ) -> std::result::Result<(), String> {
        if self.embed_later {
            self.kept.push(r);
            Ok(())
        } else {
            let el = BitMapElement::with_owned_buffer((r.x, r.y), (r.w, r.h), r.rgb)
                .ok_or("raster of the wrong size")?;
            root.draw(&el).map_err(|e| e.to_string())
        }
    }
}

/// A figure that can be drawn on any backend.
pub(crate) trait Figure {
    fn draw<DB: DrawingBackend>(
        &self,
        root: &DrawingArea<DB, Shift>,
        rasters: &mut Rasters,
    ) -> std::result::Result<(), String>;
}

/// Font sizes (pixels): title, axis descriptions, tick labels, legend.
pub(crate) const TITLE: f64 = 20.0;
pub(crate) const DESC: f64 = 16.0;
pub(crate) const TICKS: f64 = 13.0;
pub(crate) const LEGEND: f64 = 14.0;
pub(crate) const FAMILY: &str = "sans-serif";

/// Font and layout sizes for an image: the base sizes above are for
/// 800×600 pixels, scaled with the image (by 0.75 to 3).
#[derive(Clone, Copy, Debug)]
pub(crate) struct Sizes {
    k: f64,
}

impl Sizes {
    pub(crate) fn of<DB: DrawingBackend>(root: &DrawingArea<DB, Shift>) -> Sizes {
        let (w, h) = root.dim_in_pixel();
        Sizes {
            k: (w as f64 / 800.0).min(h as f64 / 600.0).clamp(0.75, 3.0),
        }
    }
    pub(crate) fn title(self) -> f64 {
        TITLE * self.k
    }
    pub(crate) fn desc(self) -> f64 {
        DESC * self.k
    }
    pub(crate) fn ticks(self) -> f64 {
        TICKS * self.k
    }
    pub(crate) fn legend(self) -> f64 {
        LEGEND * self.k
    }
    /// Width of the y label area: tick labels up to `widest` and the
    /// rotated description, as the backend measures them.
    pub(crate) fn y_area<DB: DrawingBackend>(
        self,
        root: &DrawingArea<DB, Shift>,
        widest: &str,
    ) -> u32 {
        let t = root
            .estimate_text_size(
                widest,
                &(FAMILY, self.ticks()).into_font().into_text_style(root),
            )
            .map_or(self.px(40), |s| s.0);
        let d = root
            .estimate_text_size(
                "Ag",
                &(FAMILY, self.desc()).into_font().into_text_style(root),
            )
            .map_or(self.px(16), |s| s.1);
        t + d + self.px(16)
    }

    /// Height of the x label area: tick labels and the description.
    pub(crate) fn x_area<DB: DrawingBackend>(self, root: &DrawingArea<DB, Shift>) -> u32 {
        let t = root
            .estimate_text_size(
                "0",
                &(FAMILY, self.ticks()).into_font().into_text_style(root),
            )
            .map_or(self.px(13), |s| s.1);
        let d = root
            .estimate_text_size(
                "Ag",
                &(FAMILY, self.desc()).into_font().into_text_style(root),
            )
            .map_or(self.px(16), |s| s.1);
        t + d + self.px(16)
    }

    /// `n` pixels at 800×600, scaled.
    pub(crate) fn px(self, n: u32) -> u32 {
        (n as f64 * self.k).round() as u32
    }
}

/// The sample drawn before a legend entry.
#[derive(Clone, Copy, Debug)]
pub(crate) enum Swatch {
    /// A line, dashed or not.
    Line(RGBColor, bool),
    /// ×.
    Cross(RGBColor),
    /// ○.
    Circle(RGBColor),
}

/// Which corner of the plotting area a legend goes in.
#[derive(Clone, Copy, Debug)]
pub(crate) enum Corner {
    UpperRight,
    LowerRight,
}

/// Draws a legend box in a corner of the plotting area `plot` (pixel
/// ranges), sized from the backend's own text measurements (plotters'
/// legend uses a font estimate that does not match the PNG font).
pub(crate) fn legend<DB: DrawingBackend>(
    root: &DrawingArea<DB, Shift>,
    plot: &(std::ops::Range<i32>, std::ops::Range<i32>),
    corner: Corner,
    entries: &[(Swatch, String)],
    z: Sizes,
) -> std::result::Result<(), String> {
    use plotters::style::text_anchor::{HPos, Pos, VPos};
    if entries.is_empty() {
        return Ok(());
    }
    let e = |e: DrawingAreaErrorKind<DB::ErrorType>| e.to_string();
    let style = (FAMILY, z.legend())
        .into_font()
        .into_text_style(root)
        .pos(Pos::new(HPos::Left, VPos::Center));
    let mut tw = 0i32;
    let mut th = 0i32;
    for (_, t) in entries {
        let (w, h) = root.estimate_text_size(t, &style).map_err(e)?;
        tw = tw.max(w as i32);
        th = th.max(h as i32);
    }
    let pad = z.px(8) as i32;
    let sw = z.px(24) as i32;
    let row = th + z.px(6) as i32;
    let (bw, bh) = (
        pad + sw + pad + tw + pad,
        pad + row * entries.len() as i32 + pad / 2,
    );
    let inset = z.px(8) as i32;
    let x0 = plot.0.end - inset - bw;
    let y0 = match corner {
        Corner::UpperRight => plot.1.start + inset,
        Corner::LowerRight => plot.1.end - inset - bh,
    };
    root.draw(&Rectangle::new(
        [(x0, y0), (x0 + bw, y0 + bh)],
        WHITE.mix(0.88).filled(),
    ))
    .map_err(e)?;
    root.draw(&Rectangle::new([(x0, y0), (x0 + bw, y0 + bh)], BLACK))
        .map_err(e)?;
    let r = (z.px(5) as i32).max(3);
    for (k, (swatch, text)) in entries.iter().enumerate() {
        let y = y0 + pad + row * k as i32 + row / 2 - pad / 4;
        let (xa, xb) = (x0 + pad, x0 + pad + sw);
        let width = z.px(2).max(1);
        match *swatch {
            Swatch::Line(c, false) => root
                .draw(&PathElement::new(
                    vec![(xa, y), (xb, y)],
                    c.stroke_width(width),
                ))
                .map_err(e)?,
            Swatch::Line(c, true) => {
                let dash = (sw / 4).max(2);
                let mut x = xa;
                while x < xb {
                    root.draw(&PathElement::new(
                        vec![(x, y), ((x + dash).min(xb), y)],
                        c.stroke_width(width),
                    ))
                    .map_err(e)?;
                    x += 2 * dash;
                }
            }
            Swatch::Cross(c) => root
                .draw(&Cross::new(((xa + xb) / 2, y), r, c.stroke_width(width)))
                .map_err(e)?,
            Swatch::Circle(c) => root
                .draw(&Circle::new(
                    ((xa + xb) / 2, y),
                    r as u32,
                    c.stroke_width(width),
                ))
                .map_err(e)?,
        }
        root.draw(&Text::new(text.clone(), (xb + pad, y), style.clone()))
            .map_err(e)?;
    }
    Ok(())
}

/// Draws `fig` at `size` and writes it to `out` in `format`.
pub(crate) fn render(
    function: &'static str,
    fig: &impl Figure,
    size: (u32, u32),
    format: Format,
    out: &Path,
) -> Result<PathBuf> {
    let drawing = |e: String| Error::Domain {
        function,
        message: format!("drawing `{}` failed: {e}", out.display()),
    };
    let bytes: Vec<u8> = match format {
        Format::Svg => {
            let mut text = String::new();
            let mut rasters = Rasters {
                embed_later: true,
                kept: Vec::new(),
            };
            {
                let root = SVGBackend::with_string(&mut text, size).into_drawing_area();
                fig.draw(&root, &mut rasters).map_err(drawing)?;
                root.present().map_err(|e| drawing(e.to_string()))?;
            }
            embed_rasters(&text, &rasters.kept)
                .map_err(drawing)?
                .into_bytes()
        }
        Format::Png => {
            let mut buf = vec![255u8; size.0 as usize * size.1 as usize * 3];
            let mut rasters = Rasters {
                embed_later: false,
                kept: Vec::new(),
            };
            {
                let root = raster::PngBackend::new(&mut buf, size).into_drawing_area();
                fig.draw(&root, &mut rasters).map_err(drawing)?;
                root.present().map_err(|e| drawing(e.to_string()))?;
            }
            encode_png(&buf, size).map_err(drawing)?
        }
    };
    std::fs::write(out, bytes).map_err(|e| Error::Domain {
        function,
        message: format!("cannot write `{}`: {e}", out.display()),
    })?;
    Ok(out.to_path_buf())
}

/// PNG bytes of an RGB buffer.
pub(crate) fn encode_png(rgb: &[u8], (w, h): (u32, u32)) -> std::result::Result<Vec<u8>, String> {
    use image::ImageEncoder;
    let mut out = Vec::new();
    image::codecs::png::PngEncoder::new(&mut out)
        .write_image(rgb, w, h, image::ColorType::Rgb8)
        .map_err(|e| e.to_string())?;
    Ok(out)
}

/// Inserts the rasters as `<image>` elements after the first element of
/// the SVG document (the background), so that everything else is drawn over
/// them.
fn embed_rasters(svg: &str, rasters: &[Raster]) -> std::result::Result<String, String> {
    if rasters.is_empty() {
        return Ok(svg.to_string());
    }
    let start = svg.find("<svg").ok_or("no <svg> element")?;
    let open_end = start + svg[start..].find('>').ok_or("unterminated <svg>")? + 1;
    let first_end = open_end + svg[open_end..].find("/>").ok_or("no background element")? + 2;
    let mut images = String::new();
    for r in rasters {
        let png = encode_png(&r.rgb, (r.w, r.h))?;
        images.push_str(&format!(
            "\n<image x=\"{}\" y=\"{}\" width=\"{}\" height=\"{}\" preserveAspectRatio=\"none\" \
             style=\"image-rendering:pixelated\" href=\"data:image/png;base64,{}\"/>",
            r.x,
            r.y,
            r.w,
            r.h,
            base64(&png)
        ));
    }
    let mut out = String::with_capacity(svg.len() + images.len());
    out.push_str(&svg[..first_end]);
    out.push_str(&images);
    out.push_str(&svg[first_end..]);
    Ok(out)
}

/// Standard base64 with padding.
fn base64(data: &[u8]) -> String {
    const ALPHABET: &[u8; 64] = b"ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz0123456789+/";
    let mut out = String::with_capacity(data.len().div_ceil(3) * 4);
    for chunk in data.chunks(3) {
        let b = [
            chunk[0],
            chunk.get(1).copied().unwrap_or(0),
            chunk.get(2).copied().unwrap_or(0),
        ];
        let n = (b[0] as u32) << 16 | (b[1] as u32) << 8 | b[2] as u32;
        for k in 0..4 {
            if k <= chunk.len() {
                out.push(ALPHABET[(n >> (18 - 6 * k) & 63) as usize] as char);
            } else {
                out.push('=');
            }
        }
    }
    out
}

/// A y range for `values` with a margin; a flat or empty set gets a range
/// around its value.
pub(crate) fn padded_range(values: impl Iterator<Item = f64>) -> (f64, f64) {
    let (mut lo, mut hi) = (f64::INFINITY, f64::NEG_INFINITY);
    for v in values.filter(|v| v.is_finite()) {
        lo = lo.min(v);
        hi = hi.max(v);
    }
    if lo > hi {
        return (-1.0, 1.0);
    }
    let scale = lo.abs().max(hi.abs());
    if hi - lo <= 1e-9 * scale.max(1e-300) || hi - lo < 1e-12 {
        let pad = (0.05 * scale).max(1e-3);
        return (lo - pad, hi + pad);
    }
    let pad = 0.06 * (hi - lo);
    (lo - pad, hi + pad)
}

/// The title's model part: `[model] name`, or the file name.
pub(crate) fn model_label(model: &crate::model::Model) -> String {
    model.name().unwrap_or(model.file()).to_string()
}

/// Splits `points` into runs of consecutive finite values.
pub(crate) fn finite_runs(points: &[(f64, f64)]) -> Vec<Vec<(f64, f64)>> {
    let mut runs = Vec::new();
    let mut run = Vec::new();
    for &(x, y) in points {
        if x.is_finite() && y.is_finite() {
            run.push((x, y));
        } else if !run.is_empty() {
            runs.push(std::mem::take(&mut run));
        }
    }
    if !run.is_empty() {
        runs.push(run);
    }
    runs
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn base64_matches_rfc4648() {
        assert_eq!(base64(b""), "");
        assert_eq!(base64(b"f"), "Zg==");
        assert_eq!(base64(b"fo"), "Zm8=");
        assert_eq!(base64(b"foo"), "Zm9v");
        assert_eq!(base64(b"foobar"), "Zm9vYmFy");
    }

    #[test]
    fn ranges() {
        assert!(check_range("t", "x", (0.0, 1.0)).is_ok());
        assert!(check_range("t", "x", (1.0, 0.0)).is_err());
        assert!(check_range("t", "x", (f64::NAN, 0.0)).is_err());
        let (a, b) = padded_range([1.0, 1.0 + 1e-16].into_iter());
        assert!(a < 1.0 && b > 1.0 && b - a > 0.01);
        assert_eq!(padded_range(std::iter::empty()), (-1.0, 1.0));
    }
}
