//! Evaluation over any [`ComplexField`], by a walk of the tree.
//!
//! On the double path nothing is allocated except for user-function calls
//! (their argument list) and errors; on the MPC path the values themselves
//! allocate, as in hand-written MPC code.

use super::display::show;
use super::node::{Builtin, Node, Number};
use super::{Env, Expr, Functions};
use crate::error::{Error, Result};
use crate::num::{exact_integer, ComplexField, RealField};
use crate::precision::Prec;
use crate::special;
use std::any::Any;
use std::marker::PhantomData;

/// Beyond `|z| = 2^REDUCTION_LIMIT` the MPC path refuses trigonometric and
/// exponential functions of `z`: reducing such an argument modulo π would
/// need that many bits of π.
const REDUCTION_LIMIT: f64 = 65_536.0;

pub(crate) struct Ctx<'a, C, E: ?Sized, F: ?Sized> {
    pub path: PhantomData<fn() -> C>,
    pub expr: &'a Expr,
    pub env: &'a E,
    pub funcs: &'a F,
    pub wp: u32,
    pub prec: Prec,
}

/// Prepares the context: on the double path `wp` is ignored, on the MPC path
/// it must be a valid precision.
pub(crate) fn precision<C: ComplexField>(wp: u32) -> Result<(u32, Prec)> {
    if C::MAX_PREC.is_some() {
        Ok((53, Prec::DOUBLE))
    } else {
        Ok((wp, Prec::from_bits(wp as u64)?))
    }
}

impl<C: ComplexField, E: Env<C> + ?Sized, F: Functions<C> + ?Sized> Ctx<'_, C, E, F> {
    fn err(&self, column: Option<usize>, message: String) -> Error {
        Error::Expression {
            location: None,
            expr: self.expr.source().to_string(),
            column,
            message,
        }
    }

    /// Fails unless `v` is finite; `what` names the operation.
    fn finite(&self, v: C, what: impl FnOnce() -> String) -> Result<C> {
        if v.is_finite() {
            return Ok(v);
        }
        let (re, im) = (v.re_f64(), v.im_f64());
        let nan = !re.is_infinite() && !im.is_infinite();
        let tail = if C::MAX_PREC.is_some() {
            "; the arbitrary-precision path (rug::Complex) has a far wider range"
        } else {
            ""
        };
        Err(self.err(
            None,
            if nan {
                format!("{} produced NaN", what())
            } else {
                format!("{} overflowed the number range{tail}", what())
            },
        ))
    }

    fn zero(&self) -> C {
        C::from_i64(0, self.wp)
    }

    /// `z` with a negative-zero imaginary part made `+0`, so that functions
    /// with a cut on the negative axis take the principal (upper) side.
    fn upper(&self, z: C) -> C {
        if z.im_f64() == 0.0 {
            z + &self.zero()
        } else {
            z
        }
    }

    pub(crate) fn eval(&self, node: &Node) -> Result<C> {
        match node {
            Node::Number(n) => self.number(n),
            Node::I => Ok(C::from_f64(0.0, 1.0, self.wp)),
            Node::Pi => Ok(C::pi(self.wp)),
            Node::Var(name) => self.var(name),
            Node::Neg(x) => Ok(-self.eval(x)?),
            Node::Sum(terms) => {
                let mut acc = self.eval(&terms[0].node)?;
                if terms[0].negated {
                    acc = -acc;
                }
                for t in &terms[1..] {
                    let v = self.eval(&t.node)?;
                    if t.negated {
                        acc -= &v;
                    } else {
                        acc += &v;
                    }
                }
                self.finite(acc, || format!("the sum `{}`", show(node)))
            }
            Node::Product(factors) => {
                let mut acc = self.eval(&factors[0].node)?;
                if factors[0].inverted {
                    acc = self.divide(C::from_i64(1, self.wp), acc, &factors[0].node)?;
                }
                for x in &factors[1..] {
                    let v = self.eval(&x.node)?;
                    if x.inverted {
                        acc = self.divide(acc, v, &x.node)?;
                    } else {
                        acc *= &v;
                    }
                }
                self.finite(acc, || format!("the product `{}`", show(node)))
            }
            Node::Pow(b, e) => {
                let base = self.eval(b)?;
                let exponent = self.eval(e)?;
                self.pow(base, exponent, node)
            }
            Node::Call(f, args) => self.call(*f, args),
            Node::UserCall(name, args) => self.user_call(name, args),
        }
    }

    fn number(&self, n: &Number) -> Result<C> {
        if C::MAX_PREC.is_some() {
            let x = n.to_f64();
            if !x.is_finite() {
                return Err(self.err(
                    None,
                    format!(
                        "the number {} does not fit in double precision; use the \
                         arbitrary-precision path (rug::Complex)",
                        n.text()
                    ),
                ));
            }
            return Ok(C::from_f64(x, 0.0, 53));
        }
        Ok(match n.exact_f64() {
            Some(x) => C::from_f64(x, 0.0, self.wp),
            None => C::from_rational(n.value(), self.wp),
        })
    }

    fn var(&self, name: &str) -> Result<C> {
        let Some(v) = self.env.get(name) else {
            let mut known = self.env.names();
            known.sort();
            let known = if known.is_empty() {
                "none are defined".to_string()
            } else {
                format!("known: {}", known.join(", "))
            };
            return Err(self.err(
                self.expr.column_of(name, false),
                format!("unknown parameter `{name}` — {known}"),
            ));
        };
        if !v.is_finite() {
            return Err(self.err(
                self.expr.column_of(name, false),
                format!("parameter `{name}` is NaN or infinite"),
            ));
        }
        if C::MAX_PREC.is_none() && v.prec() != self.wp {
            return Ok(v.with_prec(self.wp));
        }
        Ok(v.clone())
    }

    fn divide(&self, num: C, den: C, den_node: &Node) -> Result<C> {
        if den.is_zero() {
            return Err(self.err(
                None,
                format!("division by zero: `{}` is exactly 0", show(den_node)),
            ));
        }
        Ok(div(num, den))
    }

    fn pow(&self, base: C, exponent: C, node: &Node) -> Result<C> {
        let int = if exponent.im().is_zero() {
            exact_integer(&exponent.re())
        } else {
            None
        };
        let what = || format!("the power `{}`", show(node));
        if let Some(n) = int {
            if n < 0 && base.is_zero() {
                return Err(self.err(
                    None,
                    format!("division by zero: `{}` has a zero base", show(node)),
                ));
            }
            let v = if n < 0 && C::MAX_PREC.is_none() {
                div(C::from_i64(1, self.wp), base.powi(-n))
            } else {
                base.powi(n)
            };
            return self.finite(v, what);
        }
        if base.is_zero() {
            if exponent.re_f64() > 0.0 {
                return Ok(self.zero());
            }
            return Err(self.err(
                None,
                format!(
                    "`{}`: 0 raised to a power with real part ≤ 0 is undefined",
                    show(node)
                ),
            ));
        }
        let base = self.upper(base);
        if C::MAX_PREC.is_some() {
            return self.finite(base.pow(&exponent), what);
        }
        // exp(w log z), with guard bits for the magnification |w log z| of
        // the rounding error (MPC's own pow can take very long for tiny
        // exponents such as 2^-10⁸, where it looks for exact cases).
        let log_abs = (base.log2_abs() * std::f64::consts::LN_2).hypot(base.arg_f64());
        let mag = (exponent.log2_abs() + log_abs.log2()).clamp(0.0, 64.0);
        let g = self.wp + 10 + mag.ceil() as u32;
        let t = base.with_prec(g).ln() * &exponent.with_prec(g);
        self.reducible(Builtin::Exp, &t)?;
        self.finite(exp(&t).with_prec(self.wp), what)
    }

    /// On the MPC path, refuses arguments too large to reduce modulo π.
    fn reducible(&self, f: Builtin, z: &C) -> Result<()> {
        if C::MAX_PREC.is_none() && z.log2_abs() > REDUCTION_LIMIT {
            return Err(self.err(
                None,
                format!(
                    "`{}`: argument too large (|z| ≈ 2^{:.0}); above 2^{REDUCTION_LIMIT} \
                     its reduction modulo π is not attempted",
                    f.name(),
                    z.log2_abs()
                ),
            ));
        }
        Ok(())
    }

    fn call(&self, f: Builtin, args: &[Node]) -> Result<C> {
        let order = match f {
            Builtin::Polygamma => Some(self.eval(&args[0])?),
            _ => None,
        };
        let z = self.eval(&args[args.len() - 1])?;
        let wp = self.wp;
        let prec = self.prec;
        let name = || format!("`{}`", f.name());
        let v = match f {
            Builtin::Exp => {
                self.reducible(f, &z)?;
                exp(&z)
            }
            Builtin::Log => {
                if z.is_zero() {
                    return Err(self.err(None, "`log` of exactly 0 is singular".into()));
                }
                self.upper(z).ln()
            }
            Builtin::Sqrt => self.upper(z).sqrt(),
            Builtin::Sin | Builtin::Cos => {
                self.reducible(f, &z)?;
                if f == Builtin::Sin {
                    sin(&z)
                } else {
                    cos(&z)
                }
            }
            Builtin::Sinh => {
                self.reducible(f, &z)?;
                sinh(z)
            }
            Builtin::Cosh => {
                self.reducible(f, &z)?;
                cos(&z.mul_i())
            }
            Builtin::Tanh => {
                self.reducible(f, &z)?;
                tanh(z, wp)
            }
            Builtin::Tan => {
                self.reducible(f, &z)?;
                -(tanh(z.mul_i(), wp).mul_i())
            }
            Builtin::Gamma => special::gamma(&z, prec)?.value,
            Builtin::RGamma => special::rgamma(&z, prec)?.value,
            Builtin::LogGamma => special::log_gamma(&self.upper(z), prec)?.value,
            Builtin::Digamma => special::digamma(&z, prec)?.value,
            Builtin::Polygamma => {
                let n = order.unwrap_or_else(|| self.zero());
                let order = if n.im().is_zero() {
                    exact_integer(&n.re()).filter(|&k| (0..=u32::MAX as i64).contains(&k))
                } else {
                    None
                };
                let Some(order) = order else {
                    return Err(self.err(
                        None,
                        format!(
                            "`polygamma(n, z)`: the order n = `{}` must be a non-negative \
                             integer, but it is {}",
                            show(&args[0]),
                            n.to_decimal(6)
                        ),
                    ));
                };
                special::polygamma(order as u32, &z, prec)?.value
            }
            Builtin::BarnesG => special::barnes_g(&z, prec)?.value,
            Builtin::LogBarnesG => special::log_barnes_g(&self.upper(z), prec)?.value,
        };
        self.finite(v, name)
    }

    fn user_call(&self, name: &str, args: &[Node]) -> Result<C> {
        let mut vals = Vec::with_capacity(args.len());
        for a in args {
            vals.push(self.eval(a)?);
        }
        match self.funcs.call(name, &vals) {
            Some(Ok(v)) => self.finite(v, || format!("the function `{name}`")),
            Some(Err(e)) => Err(e),
            None => {
                let hint = if self.env.get(name).is_some() {
                    format!("; `{name}` is a parameter — for a product write `{name}*(...)`")
                } else {
                    String::new()
                };
                Err(self.err(
                    self.expr.column_of(name, true),
                    format!(
                        "unknown function `{name}` — the built-ins are {}{hint}",
                        super::node::builtin_list()
                    ),
                ))
            }
        }
    }
}

/// `num / den` for `den ≠ 0`. On the double path both are first scaled by
/// a power of two where `|den|²` would overflow or underflow (Complex64
/// division forms it). On the MPC path as `num · conj(den) / |den|²`: MPC's
/// correctly rounded division takes milliseconds to seconds when `den` is
/// a power of two plus a tiny imaginary part (80 ms at 1 + 10⁻⁸⁶⁸⁵⁹ i); this
/// way costs a few ulps of normwise error instead.
fn div<C: ComplexField>(num: C, den: C) -> C {
    if C::MAX_PREC.is_some() {
        let m = den.re_f64().abs().max(den.im_f64().abs());
        if !(1e-150..=1e150).contains(&m) {
            let e = -(m.log2().round() as i32);
            return num.mul_pow2(e) / den.mul_pow2(e);
        }
        return num / den;
    }
    let (x, y) = (den.re(), den.im());
    if y.is_zero() {
        let (a, b) = (num.re() / &x, num.im() / &x);
        return C::from_reals(a, b);
    }
    let n = x.clone() * &x + &(y.clone() * &y);
    let p = num * &den.conj();
    C::from_reals(p.re() / &n, p.im() / &n)
}

/// `z` as a `rug::Complex`, on the MPC path.
fn as_mpc<C: ComplexField>(z: &C) -> Option<&rug::Complex> {
    (z as &dyn Any).downcast_ref::<rug::Complex>()
}

/// `v` as a `C`, when `C` is `rug::Complex`.
fn from_mpc<C: ComplexField>(v: rug::Complex) -> Option<C> {
    let mut slot = Some(v);
    (&mut slot as &mut dyn Any)
        .downcast_mut::<Option<C>>()
        .and_then(Option::take)
}

/// `e^z`; on the MPC path through MPFR (see `mpc.rs`).
fn exp<C: ComplexField>(z: &C) -> C {
    as_mpc(z)
        .and_then(|m| from_mpc(super::mpc::exp(m)))
        .unwrap_or_else(|| z.exp())
}

/// `sin z`; on the MPC path through MPFR.
fn sin<C: ComplexField>(z: &C) -> C {
    as_mpc(z)
        .and_then(|m| from_mpc(super::mpc::sin(m)))
        .unwrap_or_else(|| z.sin())
}

/// `cos z`; on the MPC path through MPFR.
fn cos<C: ComplexField>(z: &C) -> C {
    as_mpc(z)
        .and_then(|m| from_mpc(super::mpc::cos(m)))
        .unwrap_or_else(|| z.cos())
}

/// `sinh z = −i sin(iz)` (DLMF 4.28.8).
fn sinh<C: ComplexField>(z: C) -> C {
    -(sin(&z.mul_i()).mul_i())
}

/// `tanh z`: `sinh z / cosh z` for `|Re z| ≤ ½`, else
/// `±(1 − e^{∓2z}) / (1 + e^{∓2z})`, which neither overflows nor cancels.
fn tanh<C: ComplexField>(z: C, wp: u32) -> C {
    let x = z.re_f64();
    if x.abs() <= 0.5 {
        let c = cos(&z.clone().mul_i());
        return div(sinh(z), c);
    }
    let s = if x > 0.0 { z } else { -z };
    let u = exp(&(-(s.mul_pow2(1))));
    let one = C::from_i64(1, wp);
    let t = div(one.clone() - &u, one + &u);
    if x > 0.0 {
        t
    } else {
        -t
    }
}
