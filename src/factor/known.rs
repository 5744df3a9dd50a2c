//! Published factors, ready-made, for checks and as starting points.

use super::coef::Coef;
use super::gamma_product::{GammaProduct, GammaTerm, Scale};
use crate::error::{Error, Result};
use rug::float::Constant;
use rug::Float;

/// The sine-Gordon soliton–soliton scalar factor `−S₀(θ)` of
/// Zamolodchikov & Zamolodchikov, Ann. Phys. 120 (1979) 253, as a gamma
/// product in `z = θ/(iπ)` with `p = π/ξ` (docs/math.md §6):
///
/// `−S₀ = Π_k Γ(1+2pk−pz) Γ(2p+2pk−pz) Γ(1+p+2pk+pz) Γ(p+2pk+pz)
///        / [Γ(1+2pk+pz) Γ(2p+2pk+pz) Γ(1+p+2pk−pz) Γ(p+2pk−pz)]`.
///
/// Its integral form converges for `|Im θ| < min(ξ, π)`.
///
/// ```
/// use dressing::factor::{known::sine_gordon_soliton, Method};
/// use dressing::Prec;
/// let f = sine_gordon_soliton(2.0 * std::f64::consts::PI / 7.0).unwrap();
/// // S₀(0) = −1: log(−S₀(0)) = 0.
/// let v = f.log_value(&num_complex::Complex64::new(0.0, 0.0), Prec::DOUBLE, Method::Product).unwrap();
/// assert!(v.log.value.norm() < 1e-14);
/// ```
pub fn sine_gordon_soliton(xi: f64) -> Result<GammaProduct> {
    if !(xi.is_finite() && xi > 0.0) {
        return Err(Error::Domain {
            function: "sine_gordon_soliton",
            message: format!("the coupling ξ = {xi} must be positive and finite"),
        });
    }
    let p = move |prec: u32| Float::with_val(prec, Constant::Pi) / Float::with_val(prec, xi);
    let coef =
        move |label: &str, f: fn(Float) -> Float| Coef::computed(label, move |prec| f(p(prec)));
    let t = |b: Coef, s: Coef, n: i64| GammaTerm::new(coef("2p", |p| p * 2u32), b, s, n);
    let one = || Coef::integer(1);
    let pp = || coef("p", |p| p);
    let mp = || coef("-p", |p| -p);
    let two_p = || coef("2p", |p| p * 2u32);
    let one_p = || coef("1+p", |p| p + 1u32);
    GammaProduct::new(
        vec![
            t(one(), mp(), 1),
            t(two_p(), mp(), 1),
            t(one_p(), pp(), 1),
            t(pp(), pp(), 1),
            t(one(), pp(), -1),
            t(two_p(), pp(), -1),
            t(one_p(), mp(), -1),
            t(pp(), mp(), -1),
        ],
        Scale::OverIPi,
        None,
    )
}
