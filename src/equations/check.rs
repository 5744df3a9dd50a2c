//! Checking equations over regions of the plane: sample points, keep
//! those clear of poles and zeros, evaluate both sides, keep the worst.

use super::{Equation, Region, Residual, Sampler};
use crate::model::Model;
use crate::precision::Prec;
use rayon::prelude::*;
use rug::Complex;
use std::f64::consts::PI;

/// What to check, where and how precisely.
#[derive(Clone, Debug)]
pub struct CheckOptions {
    /// Working precision of both sides.
    pub prec: Prec,
    /// Points sampled in each region.
    pub points_per_region: usize,
    /// Seed of the sampler.
    pub seed: u64,
    /// Regions added to the default ones.
    pub regions: Vec<Region>,
    /// Whether to use the default regions (real line, physical strip, bands
    /// beside the integral's strip).
    pub default_regions: bool,
    /// Minimal distance (per unit order) from poles and zeros of either
    /// side; see [`Model::clear_of_singularities`].
    pub margin: f64,
}

impl CheckOptions {
    /// The defaults at `digits` decimal digits: 6 points per region, seed
    /// 1, margin 0.05.
    pub fn new(digits: u64) -> crate::Result<CheckOptions> {
        Ok(CheckOptions {
            prec: Prec::digits(digits)?,
            points_per_region: 6,
            seed: 1,
            regions: Vec::new(),
            default_regions: true,
            margin: 0.05,
        })
    }

    /// The tolerance on `|LHS/RHS − 1|`: `10^−(digits − 3)`, three digits
    /// below the request for the rounding of many factors.
    pub fn tolerance(&self) -> f64 {
        10f64.powf(-(self.prec.decimal_digits() as f64 - 3.0).max(1.0))
    }
}

/// The result for one equation.
#[derive(Clone, Debug)]
pub struct EquationReport {
    /// The equation's name.
    pub name: String,
    /// The equation as text.
    pub text: String,
    /// The worst point and the region it was drawn from.
    pub worst: Option<(Residual, String)>,
    /// Points evaluated.
    pub checked: usize,
    /// Sampled points dropped for being too near a pole or zero.
    pub skipped: usize,
    /// The tolerance used.
    pub tolerance: f64,
    /// Whether every checked point is within the tolerance (and at least one was checked).
    pub passed: bool,
}

/// The default regions for an equation: the real line, the physical strip
/// 0 < Im θ < π, and bands of width 2.4 on both sides of the integral's
/// strip of the factors involved (when they have one).
pub fn default_regions(model: &Model, eq: &Equation) -> Vec<Region> {
    let mut v = vec![
        Region {
            name: "real line".into(),
            re: (-6.0, 6.0),
            im: (0.0, 0.0),
        },
        Region {
            name: "physical strip".into(),
            re: (-3.0, 3.0),
            im: (0.05, PI - 0.05),
        },
    ];
    if let Some((lo, hi)) = model.common_strip(&eq.factors()) {
        if hi.is_finite() {
            v.push(Region {
                name: "band above the integral's strip".into(),
                re: (-3.0, 3.0),
                im: (hi + 0.1, hi + 2.5),
            });
        }
        if lo.is_finite() {
            v.push(Region {
                name: "band below the integral's strip".into(),
                re: (-3.0, 3.0),
                im: (lo - 2.5, lo - 0.1),
            });
        }
    }
    v
}

/// Checks one equation; see [`CheckOptions`].
///
/// ```
/// use dressing::equations::{check_equation, CheckOptions};
/// use dressing::model::Model;
/// let m = Model::from_toml(r#"
///     [[factor]]
///     name = "S"
///     [[factor.piece]]
///     kind = "cdd"
///     blocks = [ { alpha = "1/3" } ]
///     [[equation]]
///     name = "unitarity"
///     product = [ { factor = "S", at = "theta" }, { factor = "S", at = "-theta" } ]
/// "#, "m.toml").unwrap();
/// let r = check_equation(&m, &m.equations()[0], &CheckOptions::new(30).unwrap());
/// assert!(r.passed && r.checked >= 12);
/// ```
pub fn check_equation(model: &Model, eq: &Equation, opts: &CheckOptions) -> EquationReport {
    let mut regions = if opts.default_regions {
        default_regions(model, eq)
    } else {
        Vec::new()
    };
    regions.extend(opts.regions.iter().cloned());
    let mut rng = Sampler::new(opts.seed);
    let mut points = Vec::new();
    let mut skipped = 0usize;
    for r in &regions {
        let mut got = 0;
        let mut tries = 0;
        while got < opts.points_per_region && tries < 20 * opts.points_per_region.max(1) {
            tries += 1;
            let p = rng.point(r);
            if model.clear_of_singularities(eq, p, opts.margin) {
                points.push((p, r.name.clone()));
                got += 1;
            } else {
                skipped += 1;
            }
        }
    }
    let wp = opts.prec.bits() + 32;
    let results: Vec<(Option<Residual>, String)> = points
        .par_iter()
        .map(|(p, region)| {
            let t = Complex::with_val(wp, (p.re, p.im));
            (model.residual(eq, &t, opts.prec).ok(), region.clone())
        })
        .collect();
    let mut checked = 0;
    let mut worst: Option<(Residual, String)> = None;
    for (r, region) in results {
        match r {
            Some(r) => {
                checked += 1;
                if worst.as_ref().is_none_or(|(w, _)| r.relative > w.relative) {
                    worst = Some((r, region));
                }
            }
            None => skipped += 1,
        }
    }
    let tolerance = opts.tolerance();
    let passed = checked > 0
        && worst
            .as_ref()
            .is_some_and(|(w, _)| w.relative.is_finite() && w.relative <= tolerance);
    EquationReport {
        name: eq.name.clone(),
        text: eq.render(),
        worst,
        checked,
        skipped,
        tolerance,
        passed,
    }
}
