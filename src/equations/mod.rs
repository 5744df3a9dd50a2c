//! Functional equations of a model — unitarity, crossing, braiding
//! unitarity, real analyticity — checked point by point anywhere in the
//! rapidity plane.
//!
//! An equation is `Π_j F_j(a_j + b_j θ)^{n_j} = R(θ)`: a product of the
//! model's factors at affine-shifted rapidities with integer powers (an
//! entry may be conjugated, `F(θ̄*)*`, for real analyticity), equal to a
//! right-hand side in the expression language, which may call the model's
//! factors. Both sides are evaluated at the working precision with each
//! factor's own representation switching, so shifted arguments far outside
//! an integral's strip are no obstacle. The residual is
//! `log LHS − log RHS` reduced modulo 2πi; `|LHS/RHS − 1|` and the digits of
//! agreement follow from it. See docs/model-format.md for the syntax.
//!
//! A pass is numerical evidence at the sampled points and precision, not a
//! proof.

mod cdd;
mod check;
mod sample;

pub use cdd::{analyse_cdd, Added, CddReport};
pub use check::{check_equation, default_regions, CheckOptions, EquationReport};
pub use sample::{Region, Sampler};

use crate::error::{Error, Result};
use crate::expr::Expr;
use crate::factor::Method;
use crate::model::Model;
use crate::num::ComplexField;
use crate::precision::{Prec, Radius};
use num_complex::Complex64;
use rug::Complex;

/// One factor of an equation's left-hand side: `F(at)^power`, or with
/// `conjugate`, `F(at*)*^power`.
#[derive(Clone, Debug)]
pub struct Entry {
    /// The factor's name.
    pub factor: String,
    /// Its argument, affine in θ.
    pub at: Expr,
    /// Integer power.
    pub power: i64,
    /// Whether the entry is the Schwarz reflection `F(at*)*`.
    pub conjugate: bool,
}

/// A functional equation `Π entries = rhs`.
#[derive(Clone, Debug)]
pub struct Equation {
    /// Its name (`unitarity`, `crossing`, …).
    pub name: String,
    /// What it says, if the model gives a description.
    pub description: Option<String>,
    /// The left-hand side.
    pub entries: Vec<Entry>,
    /// The right-hand side (`1` for a homogeneous equation).
    pub rhs: Expr,
}

/// Both sides of an equation at one point.
#[derive(Clone, Debug)]
pub struct Residual {
    /// The rapidity.
    pub theta: Complex,
    /// `log LHS − log RHS`, imaginary part reduced to (−π, π].
    pub log_difference: Complex,
    /// `|LHS/RHS − 1|`.
    pub relative: f64,
    /// The summed error estimates of both sides (in the logarithm).
    pub radius: Radius,
}

impl Residual {
    /// Decimal digits to which the two sides agree, `−log10 |LHS/RHS − 1|`
    /// (capped at `cap` where the difference is exactly 0).
    pub fn digits(&self, cap: f64) -> f64 {
        if self.relative == 0.0 {
            cap
        } else {
            (-self.relative.log10()).min(cap)
        }
    }
}

impl Equation {
    /// A homogeneous copy: right-hand side replaced by 1 (what a CDD
    /// factor must satisfy).
    pub fn homogeneous(&self) -> Equation {
        Equation {
            rhs: Expr::parse("1").expect("literal"),
            ..self.clone()
        }
    }

    /// The equation as text, e.g. `sigma(i*pi - theta) · sigma(theta)^-1 = …`.
    pub fn render(&self) -> String {
        let lhs: Vec<String> = self
            .entries
            .iter()
            .map(|e| {
                let base = if e.conjugate {
                    format!("{}(({})*)*", e.factor, e.at)
                } else {
                    format!("{}({})", e.factor, e.at)
                };
                if e.power == 1 {
                    base
                } else {
                    format!("{base}^{}", e.power)
                }
            })
            .collect();
        format!("{} = {}", lhs.join(" · "), self.rhs)
    }

    /// The factors the equation involves (left side and calls on the right).
    pub fn factors(&self) -> Vec<String> {
        let mut v: Vec<String> = self.entries.iter().map(|e| e.factor.clone()).collect();
        v.extend(self.rhs.user_functions());
        v.sort();
        v.dedup();
        v
    }
}

impl Model {
    /// Both sides of `eq` at θ, at `prec` (on the MPFR path).
    ///
    /// Errors: a pole or zero of an entry or of the right-hand side at this
    /// point ([`Error::Pole`], [`Error::Zero`], [`Error::Domain`]); the
    /// checking commands then move to another point.
    pub fn residual(&self, eq: &Equation, theta: &Complex, prec: Prec) -> Result<Residual> {
        let wp = prec.bits() + 32;
        let (scale, _) = self.scale();
        let env = self
            .parameters()
            .bindings(wp, &Complex::with_val(wp, theta), scale)?;
        let mut lhs = Complex::new(wp);
        let mut radius = Radius::ZERO;
        for e in &eq.entries {
            let at: Complex = e.at.eval(&env, wp)?;
            let at = if e.conjugate { at.conj() } else { at };
            let f = self.factor(&e.factor)?;
            let s = f.log_sum(&at, prec, Method::Auto)?;
            let mut l = s.log.value.with_prec(wp);
            if e.conjugate {
                l = l.conj();
            }
            lhs += l.mul_i64(e.power);
            radius += s.log.radius.times(e.power.unsigned_abs() as f64);
        }
        // The right-hand side, at two precisions for its error estimate.
        let rhs = |p: u32| -> Result<Complex> {
            let pr = Prec::from_bits(p as u64)?;
            let env =
                self.parameters()
                    .bindings(p + 16, &Complex::with_val(p + 16, theta), scale)?;
            let calls = |name: &str, args: &[Complex]| -> Option<Result<Complex>> {
                let f = self.factor(name).ok()?;
                Some(if args.len() != 1 {
                    Err(Error::Domain {
                        function: "equation",
                        message: format!("`{name}` takes one argument, the rapidity"),
                    })
                } else {
                    f.log_sum(&args[0], pr, Method::Auto)
                        .map(|s| s.log.value.exp())
                })
            };
            eq.rhs.eval_with(&env, &calls, p + 16)
        };
        let r1 = rhs(prec.bits())?;
        let r2 = rhs(prec.bits() + 32)?;
        if r1.is_zero() {
            return Err(Error::Zero {
                function: "equation right-hand side",
                order: 1,
                at: format!("θ = {}", theta.to_decimal(17)),
            });
        }
        let d = Complex::with_val(wp, &r2 - &r1);
        radius += Radius::from_log2(d.log2_abs() - r2.log2_abs()).times(2.0);
        let mut diff = lhs - r2.ln();
        // Reduce the imaginary part to (−π, π].
        let two_pi = rug::Float::with_val(wp, rug::float::Constant::Pi) * 2u32;
        let turns = (diff.imag().to_f64() / two_pi.to_f64()).round();
        if turns != 0.0 {
            let t = Complex::with_val(wp, (0, two_pi * turns));
            diff -= t;
        }
        let e = Complex::with_val(wp, diff.exp_ref()) - 1u32;
        let relative = e.abs().real().to_f64();
        Ok(Residual {
            theta: theta.clone(),
            log_difference: diff,
            relative,
            radius,
        })
    }

    /// The equations declared in the model file.
    pub fn equations(&self) -> &[Equation] {
        &self.equations
    }

    /// The equation called `name`.
    pub fn equation(&self, name: &str) -> Result<&Equation> {
        self.equations
            .iter()
            .find(|e| e.name == name)
            .ok_or_else(|| Error::Model {
                location: self.file().to_string(),
                message: format!(
                    "no equation named `{name}`; the equations are: {}",
                    if self.equations.is_empty() {
                        "(none)".to_string()
                    } else {
                        self.equations
                            .iter()
                            .map(|e| e.name.as_str())
                            .collect::<Vec<_>>()
                            .join(", ")
                    }
                ),
            })
    }

    /// The intersection of the integral strips of the factors `names`.
    pub fn common_strip(&self, names: &[String]) -> Option<(f64, f64)> {
        let mut out: Option<(f64, f64)> = None;
        for n in names {
            let (lo, hi) = self.factor(n).ok()?.strip()?;
            out = Some(match out {
                None => (lo, hi),
                Some((a, b)) => (a.max(lo), b.min(hi)),
            });
        }
        out
    }

    /// Whether θ keeps the documented margin from every pole and zero of
    /// the entries and of the right-hand side: `|d/dθ log|` of each, at
    /// double precision, is at most `1/margin` (a pole or zero of order n
    /// at distance r contributes about n/r).
    pub fn clear_of_singularities(&self, eq: &Equation, theta: Complex64, margin: f64) -> bool {
        let h = 1e-5;
        let env_at = |t: Complex64| -> Vec<(String, Complex64)> {
            self.parameters()
                .bindings(53, &t, self.scale().0)
                .unwrap_or_default()
        };
        let log_entry = |e: &Entry, t: Complex64| -> Option<Complex64> {
            let at: Complex64 = e.at.eval(&env_at(t), 53).ok()?;
            let at = if e.conjugate { at.conj() } else { at };
            let f = self.factor(&e.factor).ok()?;
            f.log_sum(&at, Prec::DOUBLE, Method::Auto)
                .ok()
                .map(|s| s.log.value)
        };
        let rhs = |t: Complex64| -> Option<Complex64> {
            let calls = |name: &str, args: &[Complex64]| -> Option<Result<Complex64>> {
                let f = self.factor(name).ok()?;
                Some(
                    f.log_sum(&args[0], Prec::DOUBLE, Method::Auto)
                        .map(|s| s.log.value.exp()),
                )
            };
            let v: Complex64 = eq.rhs.eval_with(&env_at(t), &calls, 53).ok()?;
            (v.norm() > 0.0 && v.is_finite()).then(|| v.ln())
        };
        let deriv = |f: &dyn Fn(Complex64) -> Option<Complex64>| -> Option<f64> {
            let (a, b) = (f(theta + h)?, f(theta - h)?);
            // Phases may differ by 2π between the two sides of a cut.
            let mut d = a - b;
            d.im -= 2.0 * std::f64::consts::PI * (d.im / (2.0 * std::f64::consts::PI)).round();
            Some(d.norm() / (2.0 * h))
        };
        for e in &eq.entries {
            match deriv(&|t| log_entry(e, t)) {
                Some(d) if d * margin <= 1.0 => {}
                _ => return false,
            }
        }
        matches!(deriv(&rhs), Some(d) if d * margin <= 1.0)
    }
}
