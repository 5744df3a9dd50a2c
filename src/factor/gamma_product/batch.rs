//! Many rapidities at once: one call, shared node tables, and on the double
//! path a common uniform grid for points on a line.

use super::trapezoid::{class_sum, fixed_part, layout, result, Sums};
use super::{name_rapidity, FactorValue, GammaProduct, Method, Representation, Result};
use crate::num::ComplexField;
use crate::precision::Prec;
use num_complex::Complex64;

impl GammaProduct {
    /// `log F` at each rapidity of `thetas`, as [`log_value`](Self::log_value)
    /// would return it one by one (the node tables and coefficient caches
    /// are shared, so after the first point none are rebuilt).
    ///
    /// ```
    /// use dressing::factor::{known::sine_gordon_soliton, Method};
    /// use dressing::Prec;
    /// use num_complex::Complex64;
    /// let f = sine_gordon_soliton(1.0).unwrap();
    /// let th = [Complex64::new(0.1, 0.2), Complex64::new(2.0, -0.3)];
    /// let v = f.log_values(&th, Prec::DOUBLE, Method::Auto);
    /// let one = f.log_value(&th[1], Prec::DOUBLE, Method::Auto).unwrap();
    /// assert!((v[1].as_ref().unwrap().log.value - one.log.value).norm() < 1e-13);
    /// ```
    pub fn log_values<C: ComplexField>(
        &self,
        thetas: &[C],
        prec: Prec,
        method: Method,
    ) -> Vec<Result<FactorValue<C>>> {
        thetas
            .iter()
            .map(|t| self.log_value(t, prec, method))
            .collect()
    }

    /// `log F` at `n` equally spaced rapidities from `from` to `to`
    /// (inclusive; `n = 1` gives `from`) at double precision.
    ///
    /// Where the integrand is even and every point of the line lies in the
    /// strip, one uniform grid serves the whole line (docs/math.md §4b):
    /// its step, length and first polynomial nodes are chosen once for the
    /// worst point (the decay `min Re c_j` is concave and `max |Im c_j|`
    /// convex along a line, so both are extreme at the ends), and each point
    /// costs only its geometric sequences. Each value carries the error
    /// estimate of the uniform rule at its own point. Otherwise, and for a
    /// point whose estimate misses the target on the common grid, the point
    /// is evaluated by [`log_value`](Self::log_value) with `method`
    /// ([`Method::Auto`] chooses per point).
    ///
    /// ```
    /// use dressing::factor::{known::sine_gordon_soliton, Method};
    /// use dressing::Prec;
    /// use num_complex::Complex64;
    /// let f = sine_gordon_soliton(2.0 * std::f64::consts::PI / 7.0).unwrap();
    /// let line = f.log_values_on_line((-5.0, 0.2), (5.0, 0.2), 101, Method::Auto);
    /// let one = f.log_value(&Complex64::new(0.0, 0.2), Prec::DOUBLE, Method::Auto).unwrap();
    /// let mid = line[50].as_ref().unwrap();
    /// assert!((mid.log.value - one.log.value).norm() <= (mid.log.radius + one.log.radius).to_f64());
    /// ```
    pub fn log_values_on_line(
        &self,
        from: (f64, f64),
        to: (f64, f64),
        n: usize,
        method: Method,
    ) -> Vec<Result<FactorValue<Complex64>>> {
        let prec = Prec::DOUBLE;
        let step = if n > 1 {
            (
                (to.0 - from.0) / (n - 1) as f64,
                (to.1 - from.1) / (n - 1) as f64,
            )
        } else {
            (0.0, 0.0)
        };
        let thetas: Vec<Complex64> = (0..n)
            .map(|k| Complex64::new(from.0 + step.0 * k as f64, from.1 + step.1 * k as f64))
            .collect();
        let per_point = |t: &Complex64| self.log_value(t, prec, method);
        if n == 0 || method == Method::Product || !thetas.iter().all(|t| t.is_finite()) {
            return thetas.iter().map(per_point).collect();
        }
        let Some(terms) = self.grid_terms() else {
            return thetas.iter().map(per_point).collect();
        };
        let zs: Vec<Complex64> = thetas.iter().map(|t| self.scale.z_of(t)).collect();
        let ends = [zs[0], zs[n - 1]];
        let lay = layout(&terms, &ends, 0, false);
        let grid = lay.and_then(|l| self.grid(&terms, l.level, l.nodes).ok());
        let (Some(lay), Some(grid)) = (lay, grid) else {
            return thetas.iter().map(per_point).collect();
        };
        // Auto: the line goes to the uniform rule where it beats the product
        // form at its first point.
        if method == Method::Auto && self.plan_z(&zs[0], None, prec).method != Method::Integral {
            return thetas.iter().map(per_point).collect();
        }
        thetas
            .iter()
            .zip(&zs)
            .map(|(t, &z)| {
                let mut s = Sums::default();
                fixed_part(&terms, &grid, &lay, z, &mut s, false);
                for (c, &sigma) in terms.sigma_classes().iter().enumerate() {
                    class_sum(
                        &grid,
                        c,
                        sigma,
                        terms.minus(c),
                        z,
                        lay.small + 1,
                        lay.nodes,
                        &mut s,
                        false,
                    );
                }
                let (v, met) = result(&s, &lay, prec);
                if met && v.value.is_finite() {
                    Ok(FactorValue {
                        log: v,
                        representation: Representation::Integral { peeled: 0 },
                    })
                } else {
                    per_point(t).map_err(|e| name_rapidity(e, t))
                }
            })
            .collect()
    }
}
