//! Exact enumeration of the poles and zeros of gamma-built pieces and CDD
//! blocks in a window (see the module documentation of `poles`).

use crate::error::{Error, Result};
use crate::factor::{Coef, Scale};
use crate::model::{Factor, Model, Piece};
use num_complex::Complex64;
use rug::{Complex, Float, Rational};
use std::f64::consts::PI;

/// The most singular points one enumeration may produce.
const MAX_POINTS: usize = 20_000;

/// Which line the points lie on.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Axis {
    /// θ = iu; the coordinate is u/π.
    Imaginary,
    /// θ real; the coordinate is θ.
    Real,
}

impl Axis {
    /// θ per unit of coordinate, in modulus.
    pub fn unit(self) -> f64 {
        match self {
            Axis::Imaginary => PI,
            Axis::Real => 1.0,
        }
    }
}

/// A pole (order > 0) or zero (order < 0) of a factor, or a cancelled
/// point (order 0) where the pieces' orders add up to nothing.
#[derive(Clone, Debug)]
pub struct Singular {
    /// The line it lies on.
    pub axis: Axis,
    /// u/π on the imaginary axis, θ on the real one.
    pub coordinate: f64,
    /// The coordinate exactly, when the coefficients are rational.
    pub exact: Option<Rational>,
    /// The summed order.
    pub order: i64,
    /// Which pieces contribute, with their orders.
    pub contributions: Vec<(String, i64)>,
}

impl Singular {
    /// The point θ at double precision.
    pub fn theta(&self) -> Complex64 {
        match self.axis {
            Axis::Imaginary => Complex64::new(0.0, PI * self.coordinate),
            Axis::Real => Complex64::new(self.coordinate, 0.0),
        }
    }

    /// The point θ at `wp` bits (exact coordinates are rounded once).
    pub fn theta_mp(&self, wp: u32) -> Complex {
        let x = match &self.exact {
            Some(q) => Float::with_val(wp, q),
            None => Float::with_val(wp, self.coordinate),
        };
        match self.axis {
            Axis::Imaginary => {
                let pi = Float::with_val(wp, rug::float::Constant::Pi);
                Complex::with_val(wp, (Float::new(wp), x * pi))
            }
            Axis::Real => Complex::with_val(wp, (x, Float::new(wp))),
        }
    }

    /// The coordinate as a simple fraction (denominator ≤ 1000) or a decimal.
    pub fn coordinate_text(&self) -> String {
        match &self.exact {
            Some(q) if *q.denom() <= 1000 => q.to_string(),
            _ => format!("{:.10}", self.coordinate),
        }
    }
}

/// A coordinate: exact when every coefficient is.
#[derive(Clone, Debug)]
struct Loc {
    x: f64,
    q: Option<Rational>,
}

fn coef(c: &Coef) -> (f64, Option<Rational>) {
    (c.value(64).to_f64(), c.exact().cloned())
}

/// (step, offset, slope) as (value, exact) pairs, and the power.
type GammaCoefs = (
    (f64, Option<Rational>),
    (f64, Option<Rational>),
    (f64, Option<Rational>),
    i64,
);

/// Points of `Γ(a k + b + s z)^n` (with `barnes`: of `G(…)^n`, zeros of
/// order m + 1 at w = −m) whose z lies in [zlo, zhi].
#[allow(clippy::too_many_arguments)]
fn gamma_points(
    a: (f64, Option<Rational>),
    b: (f64, Option<Rational>),
    s: (f64, Option<Rational>),
    n: i64,
    infinite: bool,
    barnes: bool,
    zwin: (f64, f64),
    out: &mut Vec<(Loc, i64)>,
) -> Result<()> {
    if s.0 == 0.0 {
        return Ok(());
    }
    // t = −s z must equal m + b + a k.
    let (t1, t2) = (-s.0 * zwin.0, -s.0 * zwin.1);
    let (tlo, thi) = (t1.min(t2), t1.max(t2));
    let exact = match (&a.1, &b.1, &s.1) {
        (Some(a), Some(b), Some(s)) => Some((a.clone(), b.clone(), s.clone())),
        _ => None,
    };
    let mut k = 0i64;
    loop {
        let base = b.0 + a.0 * k as f64;
        if base > thi + 1e-9 {
            break;
        }
        let m0 = (tlo - base - 1e-9).ceil().max(0.0) as i64;
        let m1 = (thi - base + 1e-9).floor() as i64;
        for m in m0..=m1 {
            let x = -(m as f64 + base) / s.0;
            let q = exact.as_ref().map(|(a, b, s)| {
                -(Rational::from(m) + b.clone() + a.clone() * Rational::from(k)) / s.clone()
            });
            let order = if barnes { -(m + 1) * n } else { n };
            out.push((Loc { x, q }, order));
            if out.len() > MAX_POINTS {
                return Err(Error::Domain {
                    function: "poles",
                    message: format!(
                        "more than {MAX_POINTS} poles and zeros in the window; choose a narrower \
                         --window"
                    ),
                });
            }
        }
        if !infinite || a.0 <= 0.0 {
            break;
        }
        k += 1;
    }
    Ok(())
}

/// Points of f_α^n on the imaginary axis with u/π in the window.
fn block_points(
    alpha: (f64, Option<Rational>),
    n: i64,
    win: (f64, f64),
    out: &mut Vec<(Loc, i64)>,
) {
    // poles at ±… : u/π ≡ α, 1 − α (mod 2) are poles, −α, 1 + α zeros.
    for (base, sign, order) in [
        (0.0, 1.0, 1),
        (1.0, -1.0, 1),
        (0.0, -1.0, -1),
        (1.0, 1.0, -1),
    ] {
        // u = base + sign·α + 2j
        let u0 = base + sign * alpha.0;
        let j0 = ((win.0 - u0) / 2.0).ceil() as i64;
        let j1 = ((win.1 - u0) / 2.0).floor() as i64;
        for j in j0..=j1 {
            let x = u0 + 2.0 * j as f64;
            let q = alpha.1.as_ref().map(|a| {
                Rational::from(base as i64)
                    + Rational::from(sign as i64) * a.clone()
                    + Rational::from(2 * j)
            });
            out.push((Loc { x, q }, order * n));
        }
    }
}

/// Enumerates the factor's poles and zeros in the window: (points with
/// non-zero order, cancelled points, whether some piece could not be
/// enumerated).
pub fn enumerate(
    model: &Model,
    factor: &Factor,
    window: (f64, f64),
) -> Result<(Vec<Singular>, Vec<Singular>, bool)> {
    let (scale, _) = model.scale();
    // u/π = factor · z (imaginary axis) or θ = z (real axis).
    let (axis, per_z) = match scale {
        Scale::OverIPi => (Axis::Imaginary, 1.0),
        Scale::Over2PiI => (Axis::Imaginary, 2.0),
        Scale::Unit => (Axis::Real, 1.0),
    };
    let zwin = (window.0 / per_z, window.1 / per_z);
    let to_coord = |mut l: Loc| {
        l.x *= per_z;
        l.q = l.q.map(|q| q * Rational::from(per_z as i64));
        l
    };
    let mut raw: Vec<(Axis, Loc, i64, String)> = Vec::new();
    let mut has_expressions = false;
    for (i, piece) in factor.pieces().iter().enumerate() {
        let label = format!("piece {} ({})", i + 1, piece.kind());
        let mut pts = Vec::new();
        // (step, offset, slope, power) of every gamma or G of the piece, and
        // whether its arguments run over k (infinite) and whether it is G.
        let zero = || (0.0, Some(Rational::new()));
        let gammas: Option<(Vec<GammaCoefs>, bool, bool)> = match piece {
            Piece::Product(g) => Some((
                g.terms()
                    .iter()
                    .map(|t| (coef(&t.step), coef(&t.offset), coef(&t.slope), t.power))
                    .collect(),
                true,
                false,
            )),
            Piece::Gamma(g) => Some((
                g.terms()
                    .iter()
                    .map(|(b, s, n)| (zero(), coef(b), coef(s), *n))
                    .collect(),
                false,
                false,
            )),
            Piece::Barnes(g) => Some((
                g.terms()
                    .iter()
                    .map(|(b, s, n)| (zero(), coef(b), coef(s), *n))
                    .collect(),
                false,
                true,
            )),
            _ => None,
        };
        if let Some((terms, infinite, barnes)) = gammas {
            for (a, b, s, n) in terms {
                gamma_points(a, b, s, n, infinite, barnes, zwin, &mut pts)?;
            }
            raw.extend(
                pts.into_iter()
                    .map(|(l, o)| (axis, to_coord(l), o, label.clone())),
            );
            continue;
        }
        match piece {
            Piece::Product(_) | Piece::Gamma(_) | Piece::Barnes(_) => {}
            Piece::Cdd(c) => {
                if axis == Axis::Imaginary {
                    for (a, n) in c.blocks() {
                        block_points(coef(a), *n, window, &mut pts);
                    }
                    raw.extend(
                        pts.into_iter()
                            .map(|(l, o)| (Axis::Imaginary, l, o, label.clone())),
                    );
                } else {
                    has_expressions = true;
                }
            }
            Piece::Expression(_) => has_expressions = true,
        }
    }
    // Add up the orders at coinciding points.
    raw.sort_by(|a, b| a.1.x.total_cmp(&b.1.x));
    let mut merged: Vec<Singular> = Vec::new();
    for (ax, l, o, label) in raw {
        if l.x < window.0 - 1e-12 || l.x > window.1 + 1e-12 {
            continue;
        }
        let same = |s: &Singular| {
            s.axis == ax
                && match (&s.exact, &l.q) {
                    (Some(a), Some(b)) => a == b,
                    _ => (s.coordinate - l.x).abs() <= 1e-9 * (1.0 + l.x.abs()),
                }
        };
        match merged.iter_mut().rev().take(64).find(|s| same(s)) {
            Some(s) => {
                s.order += o;
                if s.exact.is_some() && l.q.is_none() {
                    s.exact = None;
                }
                match s.contributions.iter_mut().find(|c| c.0 == label) {
                    Some(c) => c.1 += o,
                    None => s.contributions.push((label, o)),
                }
            }
            None => merged.push(Singular {
                axis: ax,
                coordinate: l.x,
                exact: l.q,
                order: o,
                contributions: vec![(label, o)],
            }),
        }
    }
    let (points, cancelled): (Vec<_>, Vec<_>) = merged.into_iter().partition(|s| s.order != 0);
    Ok((points, cancelled, has_expressions))
}
