//! The phase portrait of a factor over a rectangle of the rapidity plane.

use super::{
    check_output, check_range, colour_of, model_label, Corner, Figure, Mark, MarkKind, Raster,
    Rasters, Sizes, Swatch, FAMILY, NEUTRAL,
};
use crate::error::Result;
use crate::factor::Method;
use crate::model::{Factor, Model};
use crate::precision::Prec;
use num_complex::Complex64;
use plotters::coord::Shift;
use plotters::prelude::*;
use rayon::prelude::*;
use std::f64::consts::{PI, TAU};
use std::path::{Path, PathBuf};

/// The colours of a phase portrait on a grid of pixels.
#[derive(Clone, Debug)]
pub struct PhaseGrid {
    /// Pixels across.
    pub width: u32,
    /// Pixels down.
    pub height: u32,
    /// The range of Re θ, left to right edge.
    pub re: (f64, f64),
    /// The range of Im θ, bottom to top edge.
    pub im: (f64, f64),
    /// The colours, row by row from the top (Im θ = `im.1`) down, each row
    /// from left (Re θ = `re.0`) to right.
    pub pixels: Vec<[u8; 3]>,
    /// How many pixels could not be evaluated (drawn [`NEUTRAL`]).
    pub failed: usize,
}

impl PhaseGrid {
    /// The rapidity (Re θ, Im θ) at the centre of pixel `(i, j)`: column
    /// `i` from the left, row `j` from the top.
    pub fn theta_at(&self, i: u32, j: u32) -> (f64, f64) {
        theta_at(self.re, self.im, (self.width, self.height), i, j)
    }

    /// The colour of pixel `(i, j)` (column, row from the top).
    pub fn pixel(&self, i: u32, j: u32) -> [u8; 3] {
        self.pixels[(j * self.width + i) as usize]
    }

    /// The grid as packed RGB bytes.
    pub fn rgb(&self) -> Vec<u8> {
        self.pixels.iter().flatten().copied().collect()
    }
}

fn theta_at(re: (f64, f64), im: (f64, f64), (w, h): (u32, u32), i: u32, j: u32) -> (f64, f64) {
    (
        re.0 + (i as f64 + 0.5) / w as f64 * (re.1 - re.0),
        im.1 - (j as f64 + 0.5) / h as f64 * (im.1 - im.0),
    )
}

/// Computes the colours [`colour_of`]`(log S)` of `factor` at the centres
/// of a `size.0 × size.1` grid of pixels covering Re θ ∈ `re`, Im θ ∈ `im`,
/// at double precision ([`Factor::log_sum`] with [`Method::Auto`]), in
/// parallel. Points where the factor cannot be evaluated are [`NEUTRAL`].
///
/// The grid is refined adaptively: log S is evaluated on a lattice of
/// every 8th pixel, and a block of the lattice is filled by bilinear
/// interpolation of log S (its phase unwrapped) only when its corners are
/// all regular, differ by at most 0.5, and the value at its centre agrees
/// with the interpolation to 0.01 ([`INTERPOLATION_TOLERANCE`]); otherwise
/// it is split in four, down to single pixels, which are evaluated. An
/// error of 0.01 in log S moves the hue by 1/600 of a turn, below one step
/// of an 8-bit colour channel. Near poles, zeros and other detail every
/// pixel is evaluated.
///
/// Errors: [`crate::Error::Domain`] for a non-finite or inverted range or an
/// empty grid.
///
/// ```
/// use dressing::model::Model;
/// use dressing::plot::{colour_of, phase_grid};
/// use num_complex::Complex64;
/// let model = Model::from_toml(
///     "[[factor]]\nname = \"S\"\n[[factor.piece]]\nkind = \"expression\"\nlog = \"i*theta\"\n",
///     "m.toml",
/// ).unwrap();
/// let grid = phase_grid(model.factor("S").unwrap(), (-1.0, 1.0), (-1.0, 1.0), (8, 6)).unwrap();
/// let (x, y) = grid.theta_at(2, 1);
/// // log S = iθ = -y + ix, linear, so interpolation is exact
/// let want = colour_of(Complex64::new(-y, x));
/// let got = grid.pixel(2, 1);
/// assert!((0..3).all(|c| (got[c] as i32 - want[c] as i32).abs() <= 1));
/// ```
pub fn phase_grid(
    factor: &Factor,
    re: (f64, f64),
    im: (f64, f64),
    size: (u32, u32),
) -> Result<PhaseGrid> {
    const F: &str = "plot::phase_grid";
    check_range(F, "Re θ", re)?;
    check_range(F, "Im θ", im)?;
    if size.0 == 0 || size.1 == 0 || size.0 > 20_000 || size.1 > 20_000 {
        return Err(crate::Error::Domain {
            function: F,
            message: format!(
                "a grid of {}x{} pixels; give 1 to 20000 each way",
                size.0, size.1
            ),
        });
    }
    let (w, h) = size;
    let ctx = Grid {
        factor,
        re,
        im,
        size,
    };
    // The lattice: every STEP-th pixel, and the last one.
    let lattice = |n: u32| {
        let mut v: Vec<u32> = (0..n).step_by(STEP as usize).collect();
        if *v.last().unwrap_or(&0) != n - 1 {
            v.push(n - 1);
        }
        v
    };
    let (xs, ys) = (lattice(w), lattice(h));
    let values: Vec<Val> = ys
        .par_iter()
        .flat_map_iter(|&j| xs.iter().map(move |&i| (i, j)).collect::<Vec<_>>())
        .map(|(i, j)| ctx.eval(i, j))
        .collect();
    let at = |bx: usize, by: usize| values[by * xs.len() + bx];
    let (nbx, nby) = (
        xs.len().saturating_sub(1).max(1),
        ys.len().saturating_sub(1).max(1),
    );
    let blocks: Vec<(usize, usize)> = (0..nby)
        .flat_map(|by| (0..nbx).map(move |bx| (bx, by)))
        .collect();
    let filled: Vec<(Painted, usize)> = blocks
        .par_iter()
        .map(|&(bx, by)| {
            let (bx1, by1) = ((bx + 1).min(xs.len() - 1), (by + 1).min(ys.len() - 1));
            let mut out = Vec::new();
            let mut failed = 0;
            ctx.block(
                Rect {
                    i0: xs[bx],
                    i1: xs[bx1],
                    j0: ys[by],
                    j1: ys[by1],
                    last_i: bx1 == xs.len() - 1,
                    last_j: by1 == ys.len() - 1,
                },
                [at(bx, by), at(bx1, by), at(bx, by1), at(bx1, by1)],
                &mut out,
                &mut failed,
            );
            (out, failed)
        })
        .collect();
    let mut pixels = vec![NEUTRAL; w as usize * h as usize];
    let mut failed = 0;
    for (out, f) in filled {
        failed += f;
        for (i, j, c) in out {
            pixels[(j * w + i) as usize] = c;
        }
    }
    Ok(PhaseGrid {
        width: w,
        height: h,
        re,
        im,
        pixels,
        failed,
    })
}

/// Spacing of the first lattice of [`phase_grid`], in pixels.
const STEP: u32 = 8;
/// How far (in log S) an interpolated block's centre may be from the
/// interpolation of its corners; see [`phase_grid`].
pub const INTERPOLATION_TOLERANCE: f64 = 0.01;
/// The largest spread of log S over the corners of an interpolated block.
const SPREAD: f64 = 0.5;

/// Pixels (column, row) and their colours.
type Painted = Vec<(u32, u32, [u8; 3])>;

/// log S at a pixel, or `None` where it cannot be evaluated.
type Val = Option<Complex64>;

struct Grid<'a> {
    factor: &'a Factor,
    re: (f64, f64),
    im: (f64, f64),
    size: (u32, u32),
}

/// A block of pixels [i0, i1] × [j0, j1]; it owns [i0, i1) × [j0, j1), and
/// also its last column (row) when `last_i` (`last_j`).
#[derive(Clone, Copy)]
struct Rect {
    i0: u32,
    i1: u32,
    j0: u32,
    j1: u32,
    last_i: bool,
    last_j: bool,
}

impl Rect {
    fn owned(&self) -> impl Iterator<Item = (u32, u32)> {
        let ie = if self.last_i || self.i1 == self.i0 {
            self.i1 + 1
        } else {
            self.i1
        };
        let je = if self.last_j || self.j1 == self.j0 {
            self.j1 + 1
        } else {
            self.j1
        };
        let i0 = self.i0;
        (self.j0..je).flat_map(move |j| (i0..ie).map(move |i| (i, j)))
    }
}

/// `z` moved by a multiple of 2πi to within π of `reference` in phase.
fn unwrap(z: Complex64, reference: Complex64) -> Complex64 {
    let k = ((z.im - reference.im) / TAU).round();
    Complex64::new(z.re, z.im - k * TAU)
}

impl Grid<'_> {
    fn eval(&self, i: u32, j: u32) -> Val {
        let (x, y) = theta_at(self.re, self.im, self.size, i, j);
        let v = self
            .factor
            .log_sum::<Complex64>(&Complex64::new(x, y), Prec::DOUBLE, Method::Auto)
            .ok()?
            .log
            .value;
        (v.re.is_finite() && v.im.is_finite()).then_some(v)
    }

    /// Fills the pixels `r` owns, given log S at its corners
    /// (i0, j0), (i1, j0), (i0, j1), (i1, j1).
    fn block(&self, r: Rect, c: [Val; 4], out: &mut Painted, failed: &mut usize) {
        let (wd, ht) = (r.i1 - r.i0, r.j1 - r.j0);
        let corner = |i: u32, j: u32| -> Option<Val> {
            match (i == r.i0, i == r.i1, j == r.j0, j == r.j1) {
                (true, _, true, _) => Some(c[0]),
                (_, true, true, _) => Some(c[1]),
                (true, _, _, true) => Some(c[2]),
                (_, true, _, true) => Some(c[3]),
                _ => None,
            }
        };
        let mut put = |i: u32, j: u32, v: Val, out: &mut Vec<_>| match v {
            Some(z) => out.push((i, j, colour_of(z))),
            None => {
                *failed += 1;
                out.push((i, j, NEUTRAL))
            }
        };
        if wd <= 1 && ht <= 1 {
            for (i, j) in r.owned() {
                put(i, j, corner(i, j).flatten(), out);
            }
            return;
        }
        // log S at the corners, the edge midpoints and the centre: the
        // corners of the four sub-blocks.
        let (im_, jm) = (r.i0 + wd / 2, r.j0 + ht / 2);
        let is: Vec<u32> = if wd >= 2 {
            vec![r.i0, im_, r.i1]
        } else {
            vec![r.i0, r.i1]
        };
        let js: Vec<u32> = if ht >= 2 {
            vec![r.j0, jm, r.j1]
        } else {
            vec![r.j0, r.j1]
        };
        let vals: Vec<Vec<Val>> = js
            .iter()
            .map(|&j| {
                is.iter()
                    .map(|&i| corner(i, j).unwrap_or_else(|| self.eval(i, j)))
                    .collect()
            })
            .collect();
        let known = |i: u32, j: u32| -> Option<Val> {
            let a = is.iter().position(|&x| x == i)?;
            let b = js.iter().position(|&y| y == j)?;
            Some(vals[b][a])
        };
        // Interpolate if log S is nearly linear on the block: its corners
        // close together, and the midpoints where the interpolation says.
        if let (Some(z0), Some(z1), Some(z2), Some(z3)) = (c[0], c[1], c[2], c[3]) {
            let z = [z0, unwrap(z1, z0), unwrap(z2, z0), unwrap(z3, z0)];
            let spread = z.iter().map(|v| (v - z0).norm()).fold(0.0, f64::max);
            let lerp = |i: u32, j: u32| {
                let t = if wd == 0 {
                    0.0
                } else {
                    (i - r.i0) as f64 / wd as f64
                };
                let u = if ht == 0 {
                    0.0
                } else {
                    (j - r.j0) as f64 / ht as f64
                };
                (z[0] * (1.0 - t) + z[1] * t) * (1.0 - u) + (z[2] * (1.0 - t) + z[3] * t) * u
            };
            let linear = spread <= SPREAD
                && js.iter().zip(&vals).all(|(&j, row)| {
                    is.iter().zip(row).all(|(&i, v)| {
                        v.is_some_and(|v| {
                            (unwrap(v, z0) - lerp(i, j)).norm() <= INTERPOLATION_TOLERANCE
                        })
                    })
                });
            if linear {
                for (i, j) in r.owned() {
                    put(i, j, known(i, j).unwrap_or_else(|| Some(lerp(i, j))), out);
                }
                return;
            }
        }
        if wd <= 2 && ht <= 2 {
            // Every pixel of the block is among those evaluated.
            for (i, j) in r.owned() {
                put(i, j, known(i, j).flatten(), out);
            }
            return;
        }
        // Split in four (or two, for a block one pixel wide or high).
        let cols: Vec<(u32, u32, bool)> = if wd >= 2 {
            vec![(r.i0, im_, false), (im_, r.i1, r.last_i)]
        } else {
            vec![(r.i0, r.i1, r.last_i)]
        };
        let rows: Vec<(u32, u32, bool)> = if ht >= 2 {
            vec![(r.j0, jm, false), (jm, r.j1, r.last_j)]
        } else {
            vec![(r.j0, r.j1, r.last_j)]
        };
        for (b, &(j0, j1, last_j)) in rows.iter().enumerate() {
            for (a, &(i0, i1, last_i)) in cols.iter().enumerate() {
                self.block(
                    Rect {
                        i0,
                        i1,
                        j0,
                        j1,
                        last_i,
                        last_j,
                    },
                    [
                        vals[b][a],
                        vals[b][a + 1],
                        vals[b + 1][a],
                        vals[b + 1][a + 1],
                    ],
                    out,
                    failed,
                );
            }
        }
    }
}

/// Writes the phase portrait of the factor `factor` of `model` over
/// Re θ ∈ `re`, Im θ ∈ `im` to `out` (`.svg` or `.png`), an image of
/// `size` = (width, height) pixels, and returns the path written.
///
/// The portrait is coloured by [`colour_of`]: hue = arg S, lightness rising
/// with log|S| in terraces whose edges are level lines of |S|; grey where
/// the factor cannot be evaluated. It is computed at double precision, one
/// point per pixel of the plotting area. The lines Im θ = 0 and Im θ = π
/// are drawn where they are in range; `marks` are drawn as × (poles) and
/// ○ (zeros) with their labels, and listed in the legend. A colour key
/// (arg S against log|S|) is drawn on the right.
///
/// Errors ([`crate::Error::Domain`]): a non-finite or inverted range, a size
/// outside [`super::MIN_SIZE`]..[`super::MAX_SIZE`], an extension other
/// than `.svg`/`.png`, a folder that does not exist or a file that cannot
/// be written (the message names the path); [`crate::Error::Model`] for an
/// unknown factor.
///
/// ```
/// use dressing::model::Model;
/// use dressing::plot::phase_portrait;
/// let model = Model::load("examples/lantern.toml").unwrap();
/// let out = std::env::temp_dir().join("dressing-doc-lamp-strip.png");
/// let written = phase_portrait(&model, "lamp", (-2.0, 2.0), (-0.5, 3.6), (200, 150), &[], &out)
///     .unwrap();
/// let png = std::fs::read(written).unwrap();
/// assert_eq!(&png[..8], b"\x89PNG\r\n\x1a\n");
/// ```
pub fn phase_portrait(
    model: &Model,
    factor: &str,
    re: (f64, f64),
    im: (f64, f64),
    size: (u32, u32),
    marks: &[Mark],
    out: &Path,
) -> Result<PathBuf> {
    const F: &str = "plot::phase_portrait";
    check_range(F, "Re θ", re)?;
    check_range(F, "Im θ", im)?;
    let format = check_output(F, size, out)?;
    let f = model.factor(factor)?;
    let fig = Strip {
        factor: f,
        title: format!("phase portrait of {factor} ({})", model_label(model)),
        re,
        im,
        marks,
    };
    super::render(F, &fig, size, format, out)
}

struct Strip<'a> {
    factor: &'a Factor,
    title: String,
    re: (f64, f64),
    im: (f64, f64),
    marks: &'a [Mark],
}

/// Width of the colour key on the right, in pixels at 800×600 (no key
/// below 480 pixels of width).
const KEY_WIDTH: u32 = 120;
/// The range of log|S| shown in the colour key.
const KEY_LOG: f64 = 4.0;

impl Figure for Strip<'_> {
    fn draw<DB: DrawingBackend>(
        &self,
        root: &DrawingArea<DB, Shift>,
        rasters: &mut Rasters,
    ) -> std::result::Result<(), String> {
        let e = |e: DrawingAreaErrorKind<DB::ErrorType>| e.to_string();
        let z = Sizes::of(root);
        root.fill(&WHITE).map_err(e)?;
        let (w, _) = root.dim_in_pixel();
        let area = root
            .titled(&self.title, (FAMILY, z.title()).into_font())
            .map_err(e)?;
        let key_width = if w >= 480 { z.px(KEY_WIDTH) } else { 0 };
        let (main, key) = area.split_horizontally(w.saturating_sub(key_width));

        // The portrait.
        let mut chart = ChartBuilder::on(&main)
            .margin(10)
            .x_label_area_size(z.x_area(root))
            .y_label_area_size(z.y_area(root, "-0.5"))
            .build_cartesian_2d(self.re.0..self.re.1, self.im.0..self.im.1)
            .map_err(e)?;
        let (xr, yr) = chart.plotting_area().get_pixel_range();
        let (pw, ph) = ((xr.end - xr.start) as u32, (yr.end - yr.start) as u32);
        if pw == 0 || ph == 0 {
            return Err("the image is too small for the plot".into());
        }
        let grid =
            phase_grid(self.factor, self.re, self.im, (pw, ph)).map_err(|e| e.to_string())?;
        rasters.put(
            root,
            Raster {
                x: xr.start,
                y: yr.start,
                w: pw,
                h: ph,
                rgb: grid.rgb(),
            },
        )?;
        chart
            .configure_mesh()
            .disable_mesh()
            .x_desc("Re θ")
            .y_desc("Im θ")
            .label_style((FAMILY, z.ticks()))
            .axis_desc_style((FAMILY, z.desc()))
            .draw()
            .map_err(e)?;

        let mut entries: Vec<(Swatch, String)> = Vec::new();
        let line = |y: f64| vec![(self.re.0, y), (self.re.1, y)];
        if self.im.0 <= 0.0 && 0.0 <= self.im.1 {
            chart
                .draw_series(LineSeries::new(line(0.0), WHITE.stroke_width(2)))
                .map_err(e)?;
            chart
                .draw_series(LineSeries::new(line(0.0), BLACK.stroke_width(1)))
                .map_err(e)?;
            entries.push((Swatch::Line(BLACK, false), "Im θ = 0".to_string()));
        }
        if self.im.0 <= PI && PI <= self.im.1 {
            chart
                .draw_series(LineSeries::new(line(PI), WHITE.stroke_width(2)))
                .map_err(e)?;
            chart
                .draw_series(DashedLineSeries::new(line(PI), 6, 4, BLACK.stroke_width(1)))
                .map_err(e)?;
            entries.push((Swatch::Line(BLACK, true), "Im θ = π".to_string()));
        }

        // Marks inside the rectangle.
        let inside = |m: &&Mark| {
            let (x, y) = m.theta;
            x >= self.re.0 && x <= self.re.1 && y >= self.im.0 && y <= self.im.1
        };
        for kind in [MarkKind::Pole, MarkKind::Zero] {
            let these: Vec<&Mark> = self
                .marks
                .iter()
                .filter(inside)
                .filter(|m| m.kind == kind)
                .collect();
            if these.is_empty() {
                continue;
            }
            let pts: Vec<(f64, f64)> = these.iter().map(|m| m.theta).collect();
            // A white halo under each symbol, then the symbol.
            let size = (z.px(6) as i32).max(4);
            for style in [
                WHITE.stroke_width(z.px(4).max(3)),
                BLACK.stroke_width(z.px(2).max(1)),
            ] {
                chart
                    .draw_series(pts.iter().map(|&p| symbol(kind, p, size, style)))
                    .map_err(e)?;
            }
            entries.push(match kind {
                MarkKind::Pole => (Swatch::Cross(BLACK), "pole".to_string()),
                MarkKind::Zero => (Swatch::Circle(BLACK), "zero".to_string()),
            });
            let label = (FAMILY, z.legend())
                .into_font()
                .into_text_style(root)
                .pos(Pos::new(HPos::Left, VPos::Bottom));
            for m in these.iter().filter(|m| !m.text().is_empty()) {
                let (x, y) = chart.backend_coord(&m.theta);
                let d = z.px(8) as i32;
                root.draw(&Text::new(m.text(), (x + d, y - d), label.clone()))
                    .map_err(e)?;
            }
        }
        let plot = chart.plotting_area().get_pixel_range();
        super::legend(root, &plot, Corner::UpperRight, &entries, z)?;

        if key_width > 0 {
            // The colour key: arg S (vertical) against log|S| (horizontal).
            let tick = (FAMILY, z.ticks())
                .into_font()
                .into_text_style(root)
                .pos(Pos::new(HPos::Right, VPos::Center));
            let (label_w, label_h) = root.estimate_text_size("-π/2", &tick).map_err(e)?;
            let label_w = label_w + 8;
            let mut k = ChartBuilder::on(&key)
                .margin(10)
                .margin_top(z.px(10) + 2 * label_h)
                .margin_left(4)
                .x_label_area_size(z.x_area(root))
                .y_label_area_size(label_w)
                .build_cartesian_2d(-KEY_LOG..KEY_LOG, -PI..PI)
                .map_err(e)?;
            let (kx, ky) = k.plotting_area().get_pixel_range();
            let (kw, kh) = ((kx.end - kx.start) as u32, (ky.end - ky.start) as u32);
            if kw > 0 && kh > 0 {
                let mut rgb = Vec::with_capacity((kw * kh * 3) as usize);
                for j in 0..kh {
                    for i in 0..kw {
                        let (x, y) = theta_at((-KEY_LOG, KEY_LOG), (-PI, PI), (kw, kh), i, j);
                        rgb.extend_from_slice(&colour_of(Complex64::new(x, y)));
                    }
                }
                rasters.put(
                    root,
                    Raster {
                        x: kx.start,
                        y: ky.start,
                        w: kw,
                        h: kh,
                        rgb,
                    },
                )?;
            }
            k.configure_mesh()
                .disable_mesh()
                .x_labels(0)
                .y_labels(0)
                .x_desc("log|S|")
                .label_style((FAMILY, z.ticks()))
                .axis_desc_style((FAMILY, z.ticks()))
                .draw()
                .map_err(e)?;
            for (v, t) in [
                (PI, "π"),
                (PI / 2.0, "π/2"),
                (0.0, "0"),
                (-PI / 2.0, "-π/2"),
                (-PI, "-π"),
            ] {
                let (x, y) = k.backend_coord(&(-KEY_LOG, v));
                root.draw(&Text::new(t, (x - 4, y), tick.clone()))
                    .map_err(e)?;
            }
            let below = (FAMILY, z.ticks())
                .into_font()
                .into_text_style(root)
                .pos(Pos::new(HPos::Center, VPos::Top));
            for (v, h) in [
                (-KEY_LOG, HPos::Left),
                (0.0, HPos::Center),
                (KEY_LOG, HPos::Right),
            ] {
                let (x, y) = k.backend_coord(&(v, -PI));
                let style = below.clone().pos(Pos::new(h, VPos::Top));
                root.draw(&Text::new(format!("{v}"), (x, y + 6), style))
                    .map_err(e)?;
            }
            let (x, y) = k.backend_coord(&(0.0, PI));
            root.draw(&Text::new(
                "arg S",
                (x, y - label_h as i32 / 2 - 4),
                (FAMILY, z.ticks())
                    .into_font()
                    .into_text_style(root)
                    .pos(Pos::new(HPos::Center, VPos::Bottom)),
            ))
            .map_err(e)?;
        }
        Ok(())
    }
}

/// × for a pole, ○ for a zero, centred at `p`.
fn symbol<C: Clone + 'static, DB: DrawingBackend>(
    kind: MarkKind,
    p: C,
    size: i32,
    style: ShapeStyle,
) -> DynElement<'static, DB, C> {
    match kind {
        MarkKind::Pole => Cross::new(p, size, style).into_dyn(),
        MarkKind::Zero => Circle::new(p, size, style).into_dyn(),
    }
}

use plotters::element::DynElement;
use plotters::style::text_anchor::{HPos, Pos, VPos};
