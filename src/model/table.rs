//! Tables for other codes: `S`, the continuous `log S` and the kernel
//! `d/dθ log S` at equally spaced points of a line, computed in parallel.
//!
//! The branch is fixed with the kernel itself: between neighbouring points
//! `p, q` the change of `log S` is `(q − p)(k_p + k_q)/2` up to the
//! trapezoidal error, so the multiple of 2πi to add to the difference of
//! principal sums is the one that brings it nearest that estimate. The step
//! is accepted when the estimate is clearly decisive — the residual is below
//! 0.25 rad and `|q − p|·|k| < 1` at both ends, so no pole or zero is nearer
//! than about `0.87|q − p|` to the segment and the phase cannot turn by a
//! full 2π unseen — and otherwise that segment is continued by bisection
//! like [`Model::evaluate`] (module `branch`). One log and one kernel per
//! point, instead of the 17 or more values a bisected segment costs.

use super::{branch, Evaluation, Model};
use crate::error::{Error, Result};
use crate::factor::Method;
use crate::num::ComplexField;
use crate::precision::{Approx, Prec};
use num_complex::Complex64;
use rayon::prelude::*;
use std::f64::consts::PI;

/// One point of a table.
#[derive(Clone, Debug)]
pub struct TableRow<C> {
    /// `S`, `log S` on the branch continuous along the line, the error
    /// estimates and the representations used.
    pub eval: Evaluation<C>,
    /// `d/dθ log S`, with its error estimate; the TBA kernel is `−i` times it.
    pub kernel: Approx<C>,
}

impl<C: ComplexField> TableRow<C> {
    /// The kernel `φ(θ) = −i d/dθ log S` as a double (real on the real line
    /// for a unitary, real-analytic factor).
    pub fn phi(&self) -> Complex64 {
        Complex64::new(self.kernel.value.im_f64(), -self.kernel.value.re_f64())
    }
}

/// Residual (rad) below which the trapezoidal estimate decides a step.
const DECISIVE: f64 = 0.25;

impl Model {
    /// The factor at `n ≥ 2` equally spaced points from `from` to `to`,
    /// with the kernel `d/dθ log S` at each ([`super::Factor::log_derivative`]);
    /// `log S` is continuous along the line (continued from the base point
    /// to `from`). Each entry is the point and its row, or the error where
    /// the point is a pole or zero.
    ///
    /// ```
    /// use dressing::model::Model;
    /// use dressing::factor::Method;
    /// use dressing::Prec;
    /// use num_complex::Complex64;
    /// let m = Model::from_toml("[[factor]]\nname = \"S\"\n[[factor.piece]]\nkind = \"cdd\"\nblocks = [{ alpha = \"2/3\" }]\n", "m.toml").unwrap();
    /// let (a, b) = (Complex64::new(-2.0, 0.0), Complex64::new(2.0, 0.0));
    /// let rows = m.tabulate("S", &a, &b, 41, Prec::DOUBLE, Method::Auto).unwrap();
    /// // Lee–Yang: φ(0) = −4√3/3 (Al. B. Zamolodchikov 1990).
    /// let (theta, row) = &rows[20];
    /// assert_eq!(theta.re, 0.0);
    /// let mid = row.as_ref().unwrap();
    /// assert!((mid.phi().re + 4.0 * 3f64.sqrt() / 3.0).abs() < 1e-14);
    /// ```
    pub fn tabulate<C: ComplexField>(
        &self,
        factor: &str,
        from: &C,
        to: &C,
        n: usize,
        prec: Prec,
        method: Method,
    ) -> Result<Vec<(C, Result<TableRow<C>>)>> {
        let f = self.factor(factor)?;
        let points = super::line_points("Model::tabulate", from, to, n)?;
        let computed: Vec<Result<(super::LogSum<C>, Approx<C>)>> = points
            .par_iter()
            .map(|t| {
                let sum = f.log_sum(t, prec, method)?;
                let k = f.log_derivative(t, prec)?;
                Ok((sum, k))
            })
            .collect();
        let eval = |t: Complex64| f.branch_sample(t);
        let c64 = |v: &C| Complex64::new(v.re_f64(), v.im_f64());
        // The continued Im log S at each point (an error where the point
        // itself or its continuation failed).
        let mut phases: Vec<Result<f64>> = Vec::with_capacity(n);
        // (point, kernel, continued phase) of the last point with a phase.
        let mut last: Option<(Complex64, Complex64, f64)> = None;
        for (t, c) in points.iter().zip(&computed) {
            let here = c64(t);
            let Ok((sum, k)) = c else {
                phases.push(Err(Error::Domain {
                    function: "Model::tabulate",
                    message: "not computed".into(),
                }));
                continue;
            };
            let principal = sum.log.value.im_f64();
            let kernel = c64(&k.value);
            let im = match last {
                None => branch::continue_phase(&eval, self.base_f64, f.base_phase, here),
                Some((p, p_kernel, prev_im)) => {
                    let h = here - p;
                    // The representative of the principal phase nearest
                    // the previous phase plus the trapezoidal change.
                    let target = prev_im + (h * (p_kernel + kernel) * 0.5).im;
                    let m = ((target - principal) / (2.0 * PI)).round();
                    let candidate = principal + 2.0 * PI * m;
                    let decisive = (candidate - target).abs() < DECISIVE
                        && (h * p_kernel).norm() < 1.0
                        && (h * kernel).norm() < 1.0;
                    if decisive {
                        Ok(candidate)
                    } else {
                        branch::continue_phase(&eval, p, 0.0, here).map(|d| prev_im + d)
                    }
                }
            };
            if let Ok(v) = im {
                last = Some((here, kernel, v));
            }
            phases.push(im);
        }
        Ok(points
            .iter()
            .zip(computed)
            .zip(phases)
            .map(|((t, c), im)| {
                let row = c.and_then(|(sum, kernel)| {
                    Ok(TableRow {
                        eval: self.finish(t, sum, im?),
                        kernel,
                    })
                });
                (t.clone(), row)
            })
            .collect())
    }
}
