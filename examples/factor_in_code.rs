//! Builds a scalar factor in code, without a model file, and evaluates it
//! at double precision and at 40 digits by both representations.
//!
//! The factor is the lantern model's σ (examples/lantern.toml) at g = 7/20:
//! Π_k Γ(2k+g−z) Γ(2k+2−g−z) Γ(2k+½+z) Γ(2k+3/2+z) / [same with z → −z],
//! z = θ/(iπ).
//!
//! Run with `cargo run --release --example factor_in_code`.

use dressing::factor::{Coef, GammaProduct, GammaTerm, Method, Scale};
use dressing::Prec;
use num_complex::Complex64;

fn main() -> Result<(), Box<dyn std::error::Error>> {
    let g = Coef::rational(7, 20);
    let q = |num: i64, den: i64| Coef::rational(num, den);
    let term = |offset: Coef, slope: i64, power: i64| {
        GammaTerm::new(Coef::integer(2), offset, Coef::integer(slope), power)
    };
    let two_minus_g = Coef::rational(33, 20);
    let mut terms = Vec::new();
    for (offset, sign) in [
        (g.clone(), -1),
        (two_minus_g.clone(), -1),
        (q(1, 2), 1),
        (q(3, 2), 1),
    ] {
        terms.push(term(offset.clone(), sign, 1));
        terms.push(term(offset, -sign, -1));
    }
    let sigma = GammaProduct::new(terms, Scale::OverIPi, None)?;
    println!(
        "convergence decided exactly: {}",
        sigma.convergence().conditions.iter().all(|c| c.exact)
    );
    if let Some((lo, hi)) = sigma.strip() {
        println!("integral form converges for {lo:.6} < Im θ < {hi:.6}");
    }

    // Double precision, the path other codes call millions of times.
    let theta = Complex64::new(0.7, 0.2);
    let v = sigma.log_value(&theta, Prec::DOUBLE, Method::Auto)?;
    println!(
        "log σ(0.7+0.2i) = {:.15} ± {} via {}",
        v.log.value, v.log.radius, v.representation
    );

    // 40 digits, both representations. θ is parsed as the decimal 0.7+0.2i
    // (a pair of f64 literals would be the nearest doubles, off by ~1e-17).
    let prec = Prec::digits(40)?;
    let t = dressing::cli::parse_complex("0.7+0.2i", prec.bits() + 32)?;
    let p = sigma.log_value(&t, prec, Method::Product)?;
    let i = sigma.log_value(&t, prec, Method::Integral)?;
    let d = rug::Complex::with_val(prec.bits(), &p.log.value - &i.log.value);
    println!("product:  {}", p.log.value.to_string_radix(10, Some(40)));
    println!("integral: {}", i.log.value.to_string_radix(10, Some(40)));
    println!("they differ by {:.1e}", d.abs().real().to_f64());
    Ok(())
}
