//! Testing a proposed CDD factor c(θ) on top of a model's factor F:
//! does c solve the homogeneous version of every declared equation F
//! enters, which poles and zeros does it add in the physical strip (and
//! with which residue sign of F·c), and what does it change at θ = 0, at
//! θ → ±∞ and in the total phase shift along the real line.

use super::{check_equation, CheckOptions, Entry, Equation, EquationReport};
use crate::error::{Error, Result};
use crate::expr::{Expr, Node};
use crate::factor::Method;
use crate::model::Model;
use crate::poles::contour::{laurent_coefficient, winding};
use crate::poles::scan_axis;
use crate::precision::Prec;
use num_complex::Complex64;
use rug::Rational;
use std::f64::consts::PI;

/// The name the candidate gets inside the extended model.
const CANDIDATE: &str = "cdd_candidate";

/// A pole (order > 0) or zero (order < 0) the candidate adds at θ = iu in
/// the physical strip 0 < u < π.
#[derive(Clone, Debug)]
pub struct Added {
    /// u/π as a decimal.
    pub u_over_pi: f64,
    /// u/π exactly, when the candidate's blocks are rational.
    pub exact: Option<Rational>,
    /// Order in the candidate: > 0 pole, < 0 zero.
    pub order: i64,
    /// Order of the dressed product F·c there (F's own poles and zeros
    /// counted by the argument principle on a small circle).
    pub dressed_order: i64,
    /// For a simple pole of F·c: `−i·Res` and its error estimate.
    pub neg_i_residue: Option<(Complex64, f64)>,
}

/// What the candidate changes; see the module documentation.
#[derive(Clone, Debug)]
pub struct CddReport {
    /// The factor F the candidate multiplies.
    pub target: String,
    /// The candidate as written.
    pub candidate: String,
    /// How poles were found: `exact (standard blocks)` or `scan`.
    pub located_by: &'static str,
    /// The homogeneous equations (right-hand side 1, F replaced by c).
    pub equations: Vec<EquationReport>,
    /// Poles and zeros of c in the physical strip.
    pub added: Vec<Added>,
    /// c(0), when θ = 0 is regular.
    pub at_zero: Option<Complex64>,
    /// c(−L) and c(+L) at L = 30.
    pub limits: (Option<Complex64>, Option<Complex64>),
    /// δ(+L) − δ(−L) of c along the real line, δ = −i log c continued.
    pub phase_change: Option<f64>,
}

/// `Π block(α_j)^{n_j}`, if the candidate is a product of standard blocks.
fn blocks(node: &Node) -> Option<Vec<(Expr, i64)>> {
    fn one(node: &Node, sign: i64) -> Option<Vec<(Expr, i64)>> {
        match node {
            Node::UserCall(name, args) if name == "block" && args.len() == 1 => {
                Some(vec![(Expr::from_node(args[0].clone()), sign)])
            }
            Node::Pow(base, exp) => {
                let n = match &**exp {
                    Node::Number(q) if q.value().is_integer() => q.value().numer().to_i64()?,
                    Node::Neg(inner) => match &**inner {
                        Node::Number(q) if q.value().is_integer() => -q.value().numer().to_i64()?,
                        _ => return None,
                    },
                    _ => return None,
                };
                one(base, sign * n)
            }
            Node::Product(fs) => {
                let mut v = Vec::new();
                for f in fs {
                    v.extend(one(&f.node, if f.inverted { -sign } else { sign })?);
                }
                Some(v)
            }
            _ => None,
        }
    }
    one(node, 1)
}

/// The TOML of the candidate factor: standard blocks as a `cdd` piece,
/// anything else as an expression piece with `block(α)` written out.
fn candidate_toml(expr: &Expr) -> Result<(String, bool)> {
    if let Some(bs) = blocks(expr.node()) {
        let list: Vec<String> = bs
            .iter()
            .map(|(a, n)| format!("{{ alpha = '{a}', power = {n} }}"))
            .collect();
        return Ok((
            format!(
                "[[factor]]\nname = \"{CANDIDATE}\"\n[[factor.piece]]\nkind = \"cdd\"\nblocks = [ {} ]\n",
                list.join(", ")
            ),
            true,
        ));
    }
    if expr.user_functions().iter().any(|f| f == "block") {
        return Err(Error::Domain {
            function: "CDD candidate",
            message: format!(
                "`{expr}`: `block(α)` may only appear in a product of blocks with integer \
                 powers; write other candidates out, e.g. (sinh(theta) + i*sin(pi*a))/(sinh(theta) - i*sin(pi*a))"
            ),
        });
    }
    Ok((
        format!(
            "[[factor]]\nname = \"{CANDIDATE}\"\n[[factor.piece]]\nkind = \"expression\"\nvalue = '{expr}'\n"
        ),
        false,
    ))
}

/// `u/π` of the poles (order +1) and zeros (−1) of f_α in 0 < u < π:
/// sinh(iu) = ±i sin πα ⇒ sin u = ± sin πα.
fn block_points(alpha: &Rational) -> Vec<(Rational, i64)> {
    // Reduction modulo 2 into [0, 2).
    let mod2 = |q: Rational| -> Rational {
        let fl = Rational::from(&q / 2u32).floor();
        q - fl * 2u32
    };
    let a = mod2(alpha.clone());
    let one = Rational::from(1);
    // poles u/π ∈ {a, 1 − a}, zeros u/π ∈ {−a, 1 + a}, each modulo 2.
    let cands = [
        (a.clone(), 1),
        (Rational::from(&one - &a), 1),
        (Rational::from(-&a), -1),
        (Rational::from(&one + &a), -1),
    ];
    let mut out: Vec<(Rational, i64)> = Vec::new();
    for (u, o) in cands {
        let u = mod2(u);
        if u > 0 && u < 1 {
            match out.iter_mut().find(|(v, _)| *v == u) {
                Some(e) => e.1 += o,
                None => out.push((u, o)),
            }
        }
    }
    out
}

/// Tests `candidate` (an expression in θ and the parameters; `block(α)`
/// is the standard block f_α) as a CDD factor on `target`.
///
/// Poles and zeros of a product of blocks are enumerated exactly (for
/// rational α); for any other candidate the imaginary axis is scanned for
/// sharp extrema of log |c| and each is confirmed, and located, by the
/// argument principle on a small circle. Off-axis points are not searched.
/// Residues of F·c come from the trapezoidal rule on a circle of radius
/// 10⁻³, the error estimate from halving the radius.
///
/// ```
/// use dressing::equations::{analyse_cdd, CheckOptions};
/// use dressing::model::Model;
/// let m = Model::from_toml(r#"
///     [[factor]]
///     name = "S"
///     [[factor.piece]]
///     kind = "cdd"
///     blocks = [ { alpha = "1/5" } ]
///     [[equation]]
///     name = "unitarity"
///     product = [ { factor = "S", at = "theta" }, { factor = "S", at = "-theta" } ]
/// "#, "m.toml").unwrap();
/// let r = analyse_cdd(&m, "S", "block(1/3)", &CheckOptions::new(20).unwrap()).unwrap();
/// assert!(r.equations[0].passed);
/// assert_eq!(r.added.len(), 2); // poles at iπ/3 and 2iπ/3
/// ```
pub fn analyse_cdd(
    model: &Model,
    target: &str,
    candidate: &str,
    opts: &CheckOptions,
) -> Result<CddReport> {
    model.factor(target)?;
    let expr = Expr::parse(candidate)?;
    let (toml, exact_blocks) = candidate_toml(&expr)?;
    let ext = model.with_extra_toml(&toml).map_err(|e| match e {
        Error::Model { message, .. } => Error::Domain {
            function: "CDD candidate",
            message: format!("`{candidate}`: {message}"),
        },
        other => other,
    })?;
    // Homogeneous equations: the entries of F, with c in place of F.
    let mut equations = Vec::new();
    for eq in model.equations() {
        let entries: Vec<Entry> = eq
            .entries
            .iter()
            .filter(|e| e.factor == target)
            .map(|e| Entry {
                factor: CANDIDATE.into(),
                ..e.clone()
            })
            .collect();
        if entries.is_empty() {
            continue;
        }
        let h = Equation {
            name: format!("{} (homogeneous)", eq.name),
            description: eq.description.clone(),
            entries,
            rhs: Expr::parse("1").expect("literal"),
        };
        equations.push(check_equation(&ext, &h, opts));
    }
    let cand = ext.factor(CANDIDATE)?;
    let f = ext.factor(target)?;
    let log_c = |t: Complex64| {
        cand.log_sum::<Complex64>(&t, Prec::DOUBLE, Method::Auto)
            .ok()
            .map(|s| s.log.value)
    };
    let dressed = |t: Complex64| -> Option<Complex64> {
        let a = f
            .log_sum::<Complex64>(&t, Prec::DOUBLE, Method::Auto)
            .ok()?;
        Some((a.log.value + log_c(t)?).exp())
    };
    // Poles and zeros of c in the physical strip.
    let mut points: Vec<(f64, Option<Rational>, i64)> = Vec::new();
    let located_by;
    if exact_blocks {
        located_by = "exact (standard blocks)";
        let vals = model.parameters().at(128)?;
        for (a, n) in blocks(expr.node()).unwrap_or_default() {
            let q = a.to_rational(|p| model.parameters().exact(p).cloned());
            let pts: Vec<(f64, Option<Rational>, i64)> = match q {
                Some(q) => block_points(&q)
                    .into_iter()
                    .map(|(u, o)| (u.to_f64(), Some(u), o * n))
                    .collect(),
                None => {
                    let v: rug::Complex = a.eval(&**vals, 128)?;
                    // A rational stand-in with the same position (to 1e-30).
                    let q = Rational::from_f64(v.real().to_f64()).unwrap_or_default();
                    block_points(&q)
                        .into_iter()
                        .map(|(u, o)| (u.to_f64(), None, o * n))
                        .collect()
                }
            };
            for (u, e, o) in pts {
                match points.iter_mut().find(|p| (p.0 - u).abs() < 1e-12) {
                    Some(p) => p.2 += o,
                    None => points.push((u, e, o)),
                }
            }
        }
        points.retain(|p| p.2 != 0);
    } else {
        located_by = "scan of the imaginary axis (argument principle on small circles)";
        points = scan_axis(&log_c, (0.0, 1.0))
            .into_iter()
            .map(|(u, o)| (u, None, o))
            .collect();
    }
    let mut added = Vec::new();
    for (u, exact, order) in points {
        let c0 = Complex64::new(0.0, PI * u);
        let r = 1e-3;
        let log_dressed = |t: Complex64| dressed(t).map(|v| v.ln());
        let dressed_order = winding(&log_dressed, c0, r, 256)
            .map(|w| w.0)
            .unwrap_or(order);
        let neg_i_residue = (dressed_order == 1)
            .then(|| {
                laurent_coefficient::<Complex64>(&|t: &Complex64| dressed(*t), &c0, r, 1, 128, 1.0)
            })
            .flatten()
            .map(|(res, err)| (Complex64::new(0.0, -1.0) * res, err));
        added.push(Added {
            u_over_pi: u,
            exact,
            order,
            dressed_order,
            neg_i_residue,
        });
    }
    added.sort_by(|a, b| a.u_over_pi.total_cmp(&b.u_over_pi));
    let value = |t: f64| log_c(Complex64::new(t, 0.0)).map(|l| l.exp());
    let line = ext.evaluate_line(
        CANDIDATE,
        &Complex64::new(-30.0, 0.0),
        &Complex64::new(30.0, 0.0),
        601,
        Prec::DOUBLE,
        Method::Auto,
    );
    let phase_change = line.ok().and_then(|pts| {
        let a = pts.first()?.as_ref().ok()?.phase();
        let b = pts.last()?.as_ref().ok()?.phase();
        Some(b - a)
    });
    Ok(CddReport {
        target: target.to_string(),
        candidate: candidate.to_string(),
        located_by,
        equations,
        added,
        at_zero: value(0.0),
        limits: (value(-30.0), value(30.0)),
        phase_change,
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    /// f_α has poles at u = πα and π(1 − α) and zeros at −πα, π(1 + α)
    /// (mod 2π): common practice (solve sinh(iu) = ±i sin πα).
    #[test]
    fn block_poles_and_zeros() {
        let p = block_points(&Rational::from((1, 3)));
        assert_eq!(
            p,
            vec![(Rational::from((1, 3)), 1), (Rational::from((2, 3)), 1)]
        );
        let z = block_points(&Rational::from((-1, 4)));
        assert_eq!(
            z,
            vec![(Rational::from((1, 4)), -1), (Rational::from((3, 4)), -1)]
        );
        // α = 1/2: a double pole at u = π/2.
        assert_eq!(
            block_points(&Rational::from((1, 2))),
            vec![(Rational::from((1, 2)), 2)]
        );
    }
}
