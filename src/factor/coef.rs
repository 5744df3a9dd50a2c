//! Real coefficients of factor pieces: exact rationals where possible,
//! otherwise values computed at whatever precision is asked for.

use rug::{Float, Rational};
use std::fmt;
use std::sync::Arc;

/// A real coefficient (a step, offset or slope of a gamma product).
///
/// Exact rationals keep the convergence analysis exact; a computed
/// coefficient (e.g. `π/ξ`) is re-evaluated at each working precision, so
/// a 1000-digit evaluation sees 1000-digit parameters.
///
/// ```
/// use dressing::factor::Coef;
/// let a = Coef::rational(7, 2);
/// assert_eq!(a.value(64).to_f64(), 3.5);
/// let p = Coef::computed("pi/xi", |prec| {
///     let pi = rug::Float::with_val(prec, rug::float::Constant::Pi);
///     pi.clone() / (pi * 2u32 / 7u32)
/// });
/// assert!((p.value(200).to_f64() - 3.5).abs() < 1e-15);
/// assert!(p.exact().is_none());
/// ```
#[derive(Clone)]
pub struct Coef {
    exact: Option<Rational>,
    label: String,
    eval: Arc<dyn Fn(u32) -> Float + Send + Sync>,
}

impl Coef {
    /// The rational `num/den` (`den ≠ 0`; a zero denominator gives 0).
    pub fn rational(num: i64, den: i64) -> Coef {
        let q = if den == 0 {
            Rational::new()
        } else {
            Rational::from((num, den))
        };
        Coef::from_rational(q)
    }

    /// An integer.
    pub fn integer(n: i64) -> Coef {
        Coef::from_rational(Rational::from(n))
    }

    /// An exact rational.
    pub fn from_rational(q: Rational) -> Coef {
        let label = q.to_string();
        let qq = q.clone();
        Coef {
            exact: Some(q),
            label,
            eval: Arc::new(move |prec| Float::with_val(prec, &qq)),
        }
    }

    /// A value computed at the requested precision by `f(prec_bits)`;
    /// `label` is how it is shown in reports.
    pub fn computed(label: &str, f: impl Fn(u32) -> Float + Send + Sync + 'static) -> Coef {
        Coef {
            exact: None,
            label: label.to_string(),
            eval: Arc::new(f),
        }
    }

    /// The value at `prec` bits.
    pub fn value(&self, prec: u32) -> Float {
        (self.eval)(prec)
    }

    /// The exact value, when the coefficient is rational.
    pub fn exact(&self) -> Option<&Rational> {
        self.exact.as_ref()
    }

    /// How the coefficient is written.
    pub fn label(&self) -> &str {
        &self.label
    }
}

impl fmt::Debug for Coef {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        write!(f, "Coef({})", self.label)
    }
}
