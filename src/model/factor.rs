//! A named scalar factor of a model: a product of pieces (infinite gamma
//! products, finite gamma and Barnes G factors, CDD blocks, elementary
//! expressions), evaluated as the sum of the pieces' logarithms with the
//! orders of poles and zeros added up across pieces.

use super::params::Parameters;
use crate::error::{Error, Result};
use crate::expr::Expr;
use crate::factor::{BarnesFactor, CddBlock, FiniteGamma, GammaProduct, Method, Scale};
use crate::num::{ComplexField, RealField};
use crate::precision::{Approx, Prec, Radius};
use num_complex::Complex64;
use rug::Complex;
use std::sync::Arc;

/// One multiplicative piece of a factor.
#[derive(Debug)]
pub enum Piece {
    /// `Π_k Π_j Γ(a_j k + b_j + s_j z)^{n_j}`, possibly normalised.
    Product(Box<GammaProduct>),
    /// `Π_j Γ(b_j + s_j z)^{n_j}`.
    Gamma(FiniteGamma),
    /// `Π_j G(b_j + s_j z)^{n_j}`.
    Barnes(BarnesFactor),
    /// `Π_j f_{α_j}(θ)^{n_j}`, the standard CDD blocks.
    Cdd(CddBlock),
    /// An elementary expression in θ, z and the parameters.
    Expression(ExpressionPiece),
}

/// An elementary prefactor written in the expression language, either as
/// its value or as its logarithm.
#[derive(Debug, Clone)]
pub struct ExpressionPiece {
    /// The expression.
    pub expr: Expr,
    /// Whether `expr` is the logarithm of the piece (else its value).
    pub is_log: bool,
    pub(crate) params: Arc<Parameters>,
    pub(crate) scale: Scale,
    /// `d expr/dθ`, made on first use.
    pub(crate) derivative: std::sync::OnceLock<Result<Option<Expr>>>,
}

/// How one piece was computed at one point.
#[derive(Clone, Debug, PartialEq)]
pub struct PieceReport {
    /// The kind of piece (`gamma-product`, `gamma`, `barnes`, `cdd`, `expression`).
    pub kind: &'static str,
    /// The representation used, in words.
    pub how: String,
}

/// `log S` at one point as the sum of the pieces' logarithms (each on its
/// own principal branch; [`super::Model`] fixes the branch by continuation).
#[derive(Clone, Debug)]
pub struct LogSum<C> {
    /// The sum, with the sum of the pieces' error estimates.
    pub log: Approx<C>,
    /// One report per piece, in order.
    pub pieces: Vec<PieceReport>,
}

/// A scalar factor: a name and a product of pieces.
#[derive(Debug)]
pub struct Factor {
    pub(crate) name: String,
    pub(crate) description: Option<String>,
    pub(crate) pieces: Vec<Piece>,
    /// Im log S at the model's base point (double precision), where the
    /// continuous branch starts; set when the model is assembled.
    pub(crate) base_phase: f64,
}

/// A pole (order > 0) or zero (order < 0) met at a point, or a removable
/// point (order 0) where they cancel.
enum Singular {
    Order(i64),
}

fn singular(e: &Error) -> Option<Singular> {
    match e {
        Error::Pole { order, .. } => Some(Singular::Order(*order as i64)),
        Error::Zero { order, .. } => Some(Singular::Order(-(*order as i64))),
        Error::Domain { message, .. } if message.contains("removable") => Some(Singular::Order(0)),
        _ => None,
    }
}

impl Factor {
    /// The factor's name.
    pub fn name(&self) -> &str {
        &self.name
    }

    /// Its description, if the model gives one.
    pub fn description(&self) -> Option<&str> {
        self.description.as_deref()
    }

    /// The pieces.
    pub fn pieces(&self) -> &[Piece] {
        &self.pieces
    }

    /// The intersection of the strips `lo < Im θ < hi` of the gamma
    /// products' integral forms (`None` if there are no gamma products or
    /// one of them has no integral form).
    pub fn strip(&self) -> Option<(f64, f64)> {
        let mut out: Option<(f64, f64)> = None;
        for p in &self.pieces {
            if let Piece::Product(g) = p {
                let (lo, hi) = g.strip()?;
                out = Some(match out {
                    None => (lo, hi),
                    Some((a, b)) => (a.max(lo), b.min(hi)),
                });
            }
        }
        out
    }

    /// `Σ log(piece)` at θ, at `prec`, with `method` for the gamma products.
    ///
    /// Errors: [`Error::Pole`] / [`Error::Zero`] with the order summed over
    /// all pieces; [`Error::Domain`] at a removable point (the orders
    /// cancel) or where a piece cannot be evaluated.
    pub fn log_sum<C: ComplexField>(
        &self,
        theta: &C,
        prec: Prec,
        method: Method,
    ) -> Result<LogSum<C>> {
        let mut reports = Vec::with_capacity(self.pieces.len());
        let log = self.sum_pieces(theta, prec, |piece| {
            piece.log_value(theta, prec, method).map(|(v, rep)| {
                reports.push(rep);
                v
            })
        })?;
        Ok(LogSum {
            log,
            pieces: reports,
        })
    }

    /// The kernel `d/dθ log S` at θ, at `prec`: the sum of the pieces'
    /// analytic derivatives (ψ sums and the differentiated analytic tail for
    /// gamma products, ψ for Γ and G factors, the closed form for CDD
    /// blocks, the symbolic derivative for expressions), with the sum of
    /// their error estimates. `−i` times it is the TBA kernel φ(θ).
    ///
    /// Errors: as [`Factor::log_sum`] at poles and zeros of the factor,
    /// where the kernel has a simple pole; [`Error::Expression`] for an
    /// expression piece that cannot be differentiated.
    ///
    /// ```
    /// use dressing::model::Model;
    /// use dressing::Prec;
    /// use num_complex::Complex64;
    /// let m = Model::from_toml("[[factor]]\nname = \"S\"\n[[factor.piece]]\nkind = \"cdd\"\nblocks = [{ alpha = \"1/2\" }]\n", "m.toml").unwrap();
    /// // f_{1/2}(θ) = (sinh θ + i)/(sinh θ − i): d/dθ log f = −2i/cosh θ
    /// let th = Complex64::new(0.8, 0.0);
    /// let d = m.factor("S").unwrap().log_derivative(&th, Prec::DOUBLE).unwrap();
    /// assert!((d.value - Complex64::new(0.0, -2.0) / th.cosh()).norm() < 1e-14);
    /// ```
    pub fn log_derivative<C: ComplexField>(&self, theta: &C, prec: Prec) -> Result<Approx<C>> {
        self.sum_pieces(theta, prec, |piece| piece.log_derivative(theta, prec))
    }

    /// The factor at double precision for branch continuation: the sum of
    /// principal logs and the kernel (`None` where a piece cannot be
    /// differentiated; continuation then falls back to sampling alone).
    pub(crate) fn branch_sample(&self, t: num_complex::Complex64) -> Result<super::branch::Sample> {
        let log = self.log_sum(&t, Prec::DOUBLE, Method::Auto)?.log.value;
        let k = self.log_derivative(&t, Prec::DOUBLE).ok().map(|k| k.value);
        Ok((log, k))
    }

    /// `Σ_pieces f(piece)` with the radii added; where pieces are singular
    /// the orders are summed over all of them and the error reports the total.
    fn sum_pieces<C: ComplexField>(
        &self,
        theta: &C,
        prec: Prec,
        mut f: impl FnMut(&Piece) -> Result<Approx<C>>,
    ) -> Result<Approx<C>> {
        let mut total: Option<C> = None;
        let mut radius = Radius::ZERO;
        let mut order = 0i64;
        let mut met = false;
        for piece in &self.pieces {
            match f(piece) {
                Ok(v) => {
                    radius += v.radius;
                    total = Some(match total {
                        None => v.value,
                        Some(t) => t + &v.value,
                    });
                }
                Err(e) => match singular(&e) {
                    Some(Singular::Order(o)) => {
                        met = true;
                        order += o;
                    }
                    None => return Err(e),
                },
            }
        }
        if met {
            let at = format!("θ = {}", theta.to_decimal(17));
            let function = "factor";
            return Err(match order {
                o if o > 0 => Error::Pole {
                    function,
                    order: o as u32,
                    at: format!("{at} (factor `{}`)", self.name),
                },
                o if o < 0 => Error::Zero {
                    function,
                    order: (-o) as u32,
                    at: format!("{at} (factor `{}`)", self.name),
                },
                _ => Error::Domain {
                    function,
                    message: format!(
                        "poles and zeros of the pieces of `{}` cancel at {at} (a removable \
                         point); evaluate at a nearby rapidity",
                        self.name
                    ),
                },
            });
        }
        let p = prec.bits().min(C::MAX_PREC.unwrap_or(u32::MAX));
        let value = total.unwrap_or_else(|| C::from_i64(0, p));
        Ok(Approx::new(value, radius, p))
    }
}

impl Piece {
    /// The kind, as written in model files.
    pub fn kind(&self) -> &'static str {
        match self {
            Piece::Product(_) => "gamma-product",
            Piece::Gamma(_) => "gamma",
            Piece::Barnes(_) => "barnes",
            Piece::Cdd(_) => "cdd",
            Piece::Expression(_) => "expression",
        }
    }

    /// The piece's logarithm at θ.
    pub fn log_value<C: ComplexField>(
        &self,
        theta: &C,
        prec: Prec,
        method: Method,
    ) -> Result<(Approx<C>, PieceReport)> {
        let kind = self.kind();
        let direct = |v: Approx<C>| {
            (
                v,
                PieceReport {
                    kind,
                    how: "closed form".into(),
                },
            )
        };
        match self {
            Piece::Product(g) => {
                let v = g.log_value(theta, prec, method)?;
                Ok((
                    v.log,
                    PieceReport {
                        kind,
                        how: v.representation.to_string(),
                    },
                ))
            }
            Piece::Gamma(g) => g.log_value(theta, prec).map(direct),
            Piece::Barnes(g) => g.log_value(theta, prec).map(direct),
            Piece::Cdd(c) => c.log_value(theta, prec).map(direct),
            Piece::Expression(e) => e.log_value(theta, prec).map(direct),
        }
    }
}

impl Piece {
    /// `d/dθ` of the piece's logarithm at θ (see [`Factor::log_derivative`]).
    pub fn log_derivative<C: ComplexField>(&self, theta: &C, prec: Prec) -> Result<Approx<C>> {
        match self {
            Piece::Product(g) => g.log_derivative(theta, prec),
            Piece::Gamma(g) => g.log_derivative(theta, prec),
            Piece::Barnes(g) => g.log_derivative(theta, prec),
            Piece::Cdd(c) => c.log_derivative(theta, prec),
            Piece::Expression(e) => e.log_derivative(theta, prec),
        }
    }
}

impl ExpressionPiece {
    /// The piece's logarithm at θ: the expression evaluated at the working
    /// precision and again 32 bits higher; the difference (plus a rounding
    /// allowance) is the error estimate, so cancellation inside the formula
    /// shows up in the radius.
    ///
    /// On the double path an expression of arithmetic and elementary
    /// functions is instead evaluated once with a running error bound
    /// ([`Expr::eval_with_bound`]), which costs a few percent of the second
    /// evaluation on MPFR.
    pub fn log_value<C: ComplexField>(&self, theta: &C, prec: Prec) -> Result<Approx<C>> {
        if let Some(r) = self.bounded(&self.expr, theta, None) {
            return Ok(r);
        }
        twice(
            theta,
            prec,
            |t, wp| self.eval_at(t, wp),
            |t, wp| self.eval_at(t, wp),
        )
    }

    /// The double path with a running error bound: the log of `expr` (or
    /// `expr` itself for a log piece), or with `derivative` the kernel
    /// contribution `d` (or `d/expr`). `None` where the bound does not apply
    /// or is too loose to be useful; the caller then evaluates twice.
    fn bounded<C: ComplexField>(
        &self,
        expr: &Expr,
        theta: &C,
        derivative: Option<&Expr>,
    ) -> Option<Approx<C>> {
        C::MAX_PREC?;
        let t = Complex64::new(theta.re_f64(), theta.im_f64());
        let env = self.params.bindings(53, &t, self.scale).ok()?;
        let exact = |n: &str| n == "theta";
        let (v, e) = expr.eval_with_bound(&env, &exact)?;
        let (out, rad) = match (derivative, self.is_log) {
            (None, true) => (v, e),
            (None, false) => {
                let a = v.norm();
                // Near the negative axis the principal log's branch is not
                // decided by the value's accuracy: evaluate twice instead.
                if a == 0.0 || e > 0.25 * a || (v.re < 0.0 && v.im.abs() <= e) {
                    return None;
                }
                let v = if v.im == 0.0 {
                    v + Complex64::new(0.0, 0.0)
                } else {
                    v
                };
                let l = v.ln();
                (l, 2.0 * e / a + 2.0 * f64::EPSILON * (l.norm() + 1.0))
            }
            // `d` is already the derivative of the logarithm.
            (Some(d), true) => d.eval_with_bound(&env, &exact)?,
            (Some(d), false) => {
                if v.norm() == 0.0 || e > 0.25 * v.norm() {
                    return None;
                }
                d.eval_with_bound(&env, &exact)?
            }
        };
        if !(out.re.is_finite() && out.im.is_finite() && rad.is_finite()) {
            return None;
        }
        Some(Approx::new(
            C::from_f64(out.re, out.im, 53),
            Radius::from_f64(rad),
            53,
        ))
    }

    /// `d/dθ` of the piece's logarithm: the symbolic derivative of the
    /// expression for a log piece ([`Expr::derivative`]), of its logarithm
    /// for a value piece ([`Expr::log_derivative`]), with `dz/dθ` from the
    /// model's scale; error estimate as for [`log_value`](Self::log_value).
    ///
    /// Errors: [`Error::Expression`] when the expression calls something
    /// that cannot be differentiated; [`Error::Domain`] at a zero or pole.
    pub fn log_derivative<C: ComplexField>(&self, theta: &C, prec: Prec) -> Result<Approx<C>> {
        let d = self
            .derivative
            .get_or_init(|| {
                let dz = match self.scale {
                    Scale::Unit => "1",
                    Scale::OverIPi => "1/(i*pi)",
                    Scale::Over2PiI => "1/(2*pi*i)",
                };
                let dz = Expr::parse(dz).expect("fixed text").node().clone();
                let one = Expr::parse("1").expect("fixed text").node().clone();
                let wrt = [("theta", one), ("z", dz)];
                // A value piece needs d/dθ of its logarithm.
                if self.is_log {
                    self.expr.derivative(&wrt)
                } else {
                    self.expr.log_derivative(&wrt)
                }
            })
            .clone()?;
        let Some(d) = d else {
            let p = prec.bits().min(C::MAX_PREC.unwrap_or(u32::MAX));
            return Ok(Approx::new(C::from_i64(0, p), Radius::ZERO, p));
        };
        if let Some(r) = self.bounded(&self.expr, theta, Some(&d)) {
            return Ok(r);
        }
        twice(
            theta,
            prec,
            |t, wp| self.derivative_at(&d, t, wp),
            |t, wp| self.derivative_at(&d, t, wp),
        )
    }

    /// `d/dθ` of the logarithm at `wp` bits, from the derivative `d`.
    fn derivative_at<C: ComplexField>(&self, d: &Expr, theta: &C, wp: u32) -> Result<C> {
        let env = self.params.bindings(wp, theta, self.scale)?;
        if !self.is_log {
            // The log-derivative is singular where the value vanishes.
            let v: C = self
                .expr
                .eval(&env, wp)
                .map_err(|e| self.at_pole(e, theta))?;
            if v.is_zero() {
                return Err(self.vanishes(theta));
            }
        }
        d.eval(&env, wp).map_err(|e| self.at_pole(e, theta))
    }

    fn at_pole<C: ComplexField>(&self, e: Error, theta: &C) -> Error {
        match e {
            Error::Expression { message, .. } if message.contains("division by zero") => {
                Error::Domain {
                    function: "expression piece",
                    message: format!(
                        "`{}` divides by zero at θ = {} (a pole of the piece); evaluate at a \
                         nearby rapidity",
                        self.expr,
                        theta.to_decimal(17)
                    ),
                }
            }
            other => other,
        }
    }

    fn vanishes<C: ComplexField>(&self, theta: &C) -> Error {
        Error::Domain {
            function: "expression piece",
            message: format!(
                "`{}` vanishes at θ = {}; its logarithm is singular there",
                self.expr,
                theta.to_decimal(17)
            ),
        }
    }

    fn eval_at<C: ComplexField>(&self, theta: &C, wp: u32) -> Result<C> {
        let env = self.params.bindings(wp, theta, self.scale)?;
        let v: C = self
            .expr
            .eval(&env, wp)
            .map_err(|e| self.at_pole(e, theta))?;
        if self.is_log {
            return Ok(v);
        }
        if v.is_zero() {
            return Err(self.vanishes(theta));
        }
        // The principal logarithm, Im in (−π, π]: a negative real value
        // written as `-1` carries a signed zero, −0i, which would give −iπ.
        let v = if v.im_f64() == 0.0 {
            v + &C::from_i64(0, theta.prec())
        } else {
            v
        };
        Ok(v.ln())
    }
}

/// A piece's quantity at the working precision (`lo`) and again 32 bits
/// higher (`hi`, on MPFR); their difference, doubled, plus a rounding
/// allowance is the error estimate, so cancellation inside the formula shows
/// up in the radius.
fn twice<C: ComplexField>(
    theta: &C,
    prec: Prec,
    lo: impl FnOnce(&C, u32) -> Result<C>,
    hi: impl FnOnce(&Complex, u32) -> Result<Complex>,
) -> Result<Approx<C>> {
    let p = prec.bits().min(C::MAX_PREC.unwrap_or(u32::MAX));
    let wp = match C::MAX_PREC {
        Some(m) => m,
        None => prec.bits() + 16,
    };
    let lo_v: C = lo(theta, wp)?;
    let theta_hi = to_rug(theta, wp + 32);
    let hi_v: Complex = hi(&theta_hi, wp + 32)?;
    let lo_c = to_rug(&lo_v, wp + 32);
    let diff = Complex::with_val(wp + 32, &hi_v - &lo_c);
    let mut radius = Radius::from_log2(diff.log2_abs()).times(2.0);
    radius += Radius::from_log2(lo_v.log2_abs() - p as f64 + 1.0);
    Ok(Approx::new(lo_v, radius, p))
}

/// A `rug` value on either path.
pub(crate) fn from_rug<C: ComplexField>(v: &Complex, wp: u32) -> C {
    if C::MAX_PREC.is_some() {
        // Rounded to nearest, without two MPFR temporaries per call.
        return C::from_f64(v.real().to_f64(), v.imag().to_f64(), 53);
    }
    let re = rug::Float::with_val(wp, v.real());
    let im = rug::Float::with_val(wp, v.imag());
    C::from_reals(C::Real::from_float(&re), C::Real::from_float(&im))
}

/// Either path's value as a `rug` value at `wp` bits.
pub(crate) fn to_rug<C: ComplexField>(v: &C, wp: u32) -> Complex {
    Complex::with_val(wp, v.to_complex())
}
