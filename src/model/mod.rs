//! Models: scalar factors read from a TOML file (docs/model-format.md),
//! with named parameters, and their evaluation anywhere in the rapidity
//! plane on a continuous branch of the logarithm.
//!
//! ```
//! use dressing::model::Model;
//! use dressing::factor::Method;
//! use dressing::Prec;
//! let model = Model::from_toml(r#"
//!     [parameters]
//!     a = "1/3"
//!     [[factor]]
//!     name = "S"
//!     [[factor.piece]]
//!     kind = "cdd"
//!     blocks = [ { alpha = "a" } ]
//! "#, "inline.toml").unwrap();
//! let theta = rug::Complex::with_val(128, (0.5, 0.0));
//! let v = model.evaluate("S", &theta, Prec::digits(30).unwrap(), Method::Auto).unwrap();
//! // A CDD block is a pure phase on the real line.
//! assert!(v.log.value.real().to_f64().abs() < 1e-29);
//! ```

pub(crate) mod branch;
mod build;
mod factor;
mod params;
mod schema;
mod source;
mod table;

pub use build::KINDS;
pub use factor::{ExpressionPiece, Factor, LogSum, Piece, PieceReport};
pub use params::{Parameters, RESERVED};
pub use table::TableRow;

use crate::error::{Error, Result};
use crate::expr::Expr;
use crate::factor::{Method, Scale};
use crate::num::ComplexField;
use crate::precision::{Approx, Prec, Radius};
use num_complex::Complex64;
use rug::Complex;
use source::Source;
use std::path::Path;
use std::sync::Arc;

/// A loaded model: parameters, the rapidity variable, and named factors.
#[derive(Debug)]
pub struct Model {
    source: Source,
    name: Option<String>,
    description: Option<String>,
    params: Arc<Parameters>,
    scale: Scale,
    z_text: String,
    base: Expr,
    base_f64: Complex64,
    factors: Vec<Factor>,
    pub(crate) equations: Vec<crate::equations::Equation>,
    overrides: Vec<(String, String)>,
}

/// A factor's value at one rapidity.
#[derive(Clone, Debug)]
pub struct Evaluation<C> {
    /// The rapidity.
    pub theta: C,
    /// `log S` on the branch continuous along the straight path from the
    /// model's base point (see [`Model::base`]), with its error estimate.
    pub log: Approx<C>,
    /// `S = exp(log S)`; its radius is `|S|` times the radius of `log S`.
    pub value: Approx<C>,
    /// How many times 2πi was added to the sum of principal logarithms.
    pub turns: i64,
    /// How each piece was computed.
    pub pieces: Vec<PieceReport>,
}

impl<C: ComplexField> Evaluation<C> {
    /// `|S| = exp(Re log S)`, as `f64`.
    pub fn modulus(&self) -> f64 {
        self.log.value.re_f64().exp()
    }

    /// The continuous phase `Im log S`, as `f64`.
    pub fn phase(&self) -> f64 {
        self.log.value.im_f64()
    }
}

impl Model {
    /// Reads and builds the model in the file at `path`.
    ///
    /// Errors: [`Error::Model`] naming the file, line and column of a
    /// malformed, unknown or inconsistent entry; [`Error::Expression`] with
    /// the column of an expression that does not parse.
    pub fn load(path: impl AsRef<Path>) -> Result<Model> {
        let path = path.as_ref();
        let text = std::fs::read_to_string(path).map_err(|e| Error::Model {
            location: path.display().to_string(),
            message: format!("cannot read the model file: {e}"),
        })?;
        Model::from_toml(&text, &path.display().to_string())
    }

    /// Builds a model from TOML text; `name` is used in error locations.
    pub fn from_toml(text: &str, name: &str) -> Result<Model> {
        build::build(
            Source {
                name: name.to_string(),
                text: text.to_string(),
            },
            &[],
        )
    }

    /// The same model with parameters redefined, e.g. `[("g", "0.4")]`:
    /// each value is an expression in the other parameters.
    ///
    /// ```
    /// # use dressing::model::Model;
    /// let m = Model::from_toml("[parameters]\na = 0.25\nb = \"2*a\"\n[[factor]]\nname = \"S\"\n[[factor.piece]]\nkind = \"cdd\"\nblocks = [{ alpha = \"b\" }]\n", "m.toml").unwrap();
    /// let m2 = m.with_parameters(&[("a".to_string(), "1/8".to_string())]).unwrap();
    /// assert_eq!(m2.parameters().exact("b").unwrap().to_string(), "1/4");
    /// assert!(m.with_parameters(&[("c".to_string(), "1".to_string())]).is_err());
    /// ```
    pub fn with_parameters(&self, overrides: &[(String, String)]) -> Result<Model> {
        let mut all = self.overrides.clone();
        for (k, v) in overrides {
            all.retain(|(a, _)| a != k);
            all.push((k.clone(), v.clone()));
        }
        build::build(self.source.clone(), &all)
    }

    /// The same model with `extra` TOML appended (more factors or
    /// equations); errors point into the combined text.
    pub(crate) fn with_extra_toml(&self, extra: &str) -> Result<Model> {
        let mut source = self.source.clone();
        source.text.push('\n');
        source.text.push_str(extra);
        build::build(source, &self.overrides)
    }

    #[allow(clippy::too_many_arguments)]
    pub(crate) fn assemble(
        source: Source,
        name: Option<String>,
        description: Option<String>,
        params: Arc<Parameters>,
        scale: Scale,
        z_text: String,
        base: Expr,
        factors: Vec<Factor>,
        equations: Vec<crate::equations::Equation>,
        overrides: Vec<(String, String)>,
    ) -> Result<Model> {
        let vals = params.at(64)?;
        let b: Complex = base
            .eval(&**vals, 64)
            .map_err(|e| crate::expr::with_location(e, "[rapidity] base"))?;
        let base_f64 = Complex64::new(b.real().to_f64(), b.imag().to_f64());
        let mut m = Model {
            source,
            name,
            description,
            params,
            scale,
            z_text,
            base,
            base_f64,
            factors,
            equations,
            overrides,
        };
        // The base point must be a regular point of every factor; its phase
        // there starts each continuation.
        for f in &mut m.factors {
            f.base_phase = f
                .log_sum::<Complex64>(&m.base_f64, Prec::DOUBLE, Method::Auto)
                .map(|s| s.log.value.im)
                .map_err(|e| Error::Model {
                    location: m.source.name.clone(),
                    message: format!(
                        "factor `{}` cannot be evaluated at the base point θ = {} ({e}); set \
                         another `base` in [rapidity]",
                        f.name, m.base
                    ),
                })?;
        }
        Ok(m)
    }

    /// The file name the model was read from.
    pub fn file(&self) -> &str {
        &self.source.name
    }

    /// `[model] name`, if given.
    pub fn name(&self) -> Option<&str> {
        self.name.as_deref()
    }

    /// `[model] description`, if given.
    pub fn description(&self) -> Option<&str> {
        self.description.as_deref()
    }

    /// The parameters.
    pub fn parameters(&self) -> &Parameters {
        &self.params
    }

    /// The pieces' variable z as a function of θ, and how it was written.
    pub fn scale(&self) -> (Scale, &str) {
        (self.scale, &self.z_text)
    }

    /// The base point θ_b of the continuous branch of `log S`, as written.
    pub fn base(&self) -> &Expr {
        &self.base
    }

    /// The factors, in file order.
    pub fn factors(&self) -> &[Factor] {
        &self.factors
    }

    /// The factor called `name`; the error lists the names there are.
    pub fn factor(&self, name: &str) -> Result<&Factor> {
        self.factors
            .iter()
            .find(|f| f.name == name)
            .ok_or_else(|| Error::Model {
                location: self.source.name.clone(),
                message: format!(
                    "no factor named `{name}`; the factors are: {}",
                    self.factors
                        .iter()
                        .map(|f| f.name.as_str())
                        .collect::<Vec<_>>()
                        .join(", ")
                ),
            })
    }

    /// Reads a rapidity written as a number (`0.3`, `2.5-0.1i`) or as an
    /// expression in the parameters (`i*pi/3`, `0.5 + i*pi*g`), at `wp` bits.
    ///
    /// ```
    /// # use dressing::model::Model;
    /// # let m = Model::from_toml("[parameters]\ng = 0.25\n[[factor]]\nname = \"S\"\n[[factor.piece]]\nkind = \"cdd\"\nblocks = [{ alpha = \"g\" }]\n", "m.toml").unwrap();
    /// let t = m.rapidity("1 + i*pi*g", 128).unwrap();
    /// assert!((t.imag().to_f64() - std::f64::consts::PI / 4.0).abs() < 1e-15);
    /// assert!(m.rapidity("1 + ", 128).is_err());
    /// ```
    pub fn rapidity(&self, text: &str, wp: u32) -> Result<Complex> {
        if let Ok(z) = crate::cli::parse_complex(text, wp) {
            return Ok(z);
        }
        let e = Expr::parse(text)?;
        let vals = self.params.at(wp)?;
        let z: Complex = e.eval(&**vals, wp)?;
        Ok(z)
    }

    /// The factor `name` at θ: `log S` on the continuous branch, `S`, and
    /// how each piece was computed. `method` applies to the gamma products.
    ///
    /// Cost: fixing the branch takes at least 17 double-precision values of
    /// the factor along the path (more near poles). Code that calls a factor
    /// millions of times and needs S rather than a continuous log should
    /// call [`Factor::log_sum`] directly, and code that walks a line should
    /// use [`Model::evaluate_line`].
    ///
    /// Errors: those of [`Factor::log_sum`] (poles and zeros with their
    /// summed orders), and [`Error::Domain`] when the straight path from
    /// the base point meets a pole or zero, so that the branch is not
    /// defined.
    pub fn evaluate<C: ComplexField>(
        &self,
        factor: &str,
        theta: &C,
        prec: Prec,
        method: Method,
    ) -> Result<Evaluation<C>> {
        let f = self.factor(factor)?;
        let sum = f.log_sum(theta, prec, method)?;
        let target = Complex64::new(theta.re_f64(), theta.im_f64());
        let eval = |t: Complex64| f.branch_sample(t);
        let im = branch::continue_phase(&eval, self.base_f64, f.base_phase, target)?;
        Ok(self.finish(theta, sum, im))
    }

    /// The factor at `n ≥ 2` equally spaced points from `from` to `to`
    /// (both included). The branch is continued from the base point to
    /// `from` and then along the line, so the phase is continuous along it.
    /// Points are evaluated in parallel.
    pub fn evaluate_line<C: ComplexField>(
        &self,
        factor: &str,
        from: &C,
        to: &C,
        n: usize,
        prec: Prec,
        method: Method,
    ) -> Result<Vec<Result<Evaluation<C>>>> {
        use rayon::prelude::*;
        let f = self.factor(factor)?;
        let points = line_points("Model::evaluate_line", from, to, n)?;
        let eval = |t: Complex64| f.branch_sample(t);
        let sums: Vec<Result<LogSum<C>>> = points
            .par_iter()
            .map(|t| f.log_sum(t, prec, method))
            .collect();
        // Continue the phase along the polyline base → p0 → p1 → …
        let targets: Vec<Complex64> = points
            .iter()
            .map(|t| Complex64::new(t.re_f64(), t.im_f64()))
            .collect();
        let first = branch::continue_phase(&eval, self.base_f64, f.base_phase, targets[0]);
        // Each step of the line is continued independently (in parallel);
        // the phase increments are then added up in order.
        let steps: Vec<Result<f64>> = targets
            .par_windows(2)
            .map(|w| branch::continue_phase(&eval, w[0], 0.0, w[1]))
            .collect();
        let mut out = Vec::with_capacity(n);
        let mut im = first;
        for (j, (t, s)) in points.iter().zip(sums).enumerate() {
            if j > 0 {
                im = match (im, &steps[j - 1]) {
                    (Ok(a), Ok(d)) => Ok(a + d),
                    (Err(e), _) => Err(e),
                    (_, Err(e)) => Err(e.clone()),
                };
            }
            out.push(match (s, &im) {
                (Ok(s), Ok(im)) => Ok(self.finish(t, s, *im)),
                (Err(e), _) => Err(e),
                (_, Err(e)) => Err(e.clone()),
            });
        }
        Ok(out)
    }

    fn finish<C: ComplexField>(
        &self,
        theta: &C,
        sum: LogSum<C>,
        im_continued: f64,
    ) -> Evaluation<C> {
        let k = branch::turns(sum.log.value.im_f64(), im_continued);
        let p = sum.log.prec;
        let wp = p + 16;
        let mut log = sum.log.value.with_prec(wp);
        if k != 0 {
            let two_pi_i = C::pi(wp).mul_i().mul_i64(2 * k);
            log += &two_pi_i;
        }
        let value = log.exp();
        let vrad = sum
            .log
            .radius
            .scale_log2(value.log2_abs())
            .times(1.0 + sum.log.radius.to_f64().min(1.0))
            + Radius::from_log2(value.log2_abs() - p as f64);
        Evaluation {
            theta: theta.clone(),
            log: Approx::new(log.with_prec(p), sum.log.radius, p),
            value: Approx::new(value.with_prec(p), vrad, p),
            turns: k,
            pieces: sum.pieces,
        }
    }
}

/// `n ≥ 2` equally spaced points from `from` to `to`, both included, at the
/// larger of their precisions.
fn line_points<C: ComplexField>(
    function: &'static str,
    from: &C,
    to: &C,
    n: usize,
) -> Result<Vec<C>> {
    if n < 2 {
        return Err(Error::Domain {
            function,
            message: format!("a line needs at least 2 points, not {n}"),
        });
    }
    let wp = from.prec().max(to.prec());
    let step = (to.with_prec(wp) - &from.with_prec(wp)).div_i64((n - 1) as i64);
    Ok((0..n)
        .map(|j| from.with_prec(wp) + &step.clone().mul_i64(j as i64))
        .collect())
}
