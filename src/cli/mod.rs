//! The `dressing` command line.
//!
//! Subcommands so far: `demo` (the built-in demonstration) and `special`
//! (evaluate one of the special functions at points and a precision). Every
//! error a user can cause comes back as a message naming the option and what
//! to change, with a non-zero exit status.

mod parse;

pub use parse::parse_complex;

use crate::num::ComplexField;
use crate::precision::{Approx, Prec};
use crate::special;
use clap::{Parser, Subcommand, ValueEnum};
use rug::Complex;
use std::fmt::Write as _;

/// Command-line arguments.
#[derive(Parser, Debug)]
#[command(
    name = "dressing",
    version,
    about = "Numerics of S-matrix scalar factors: dressing and CDD factors",
    long_about = None
)]
pub struct Cli {
    /// What to do.
    #[command(subcommand)]
    pub command: Command,
}

/// Subcommands.
#[derive(Subcommand, Debug)]
pub enum Command {
    /// Run the built-in demonstration and print what it checked.
    ///
    /// Example: dressing demo
    Demo,
    /// Evaluate a special function at one or more points.
    ///
    /// Example: dressing special loggamma --at 0.5+3i --at -7.3+0.4i --digits 50
    Special {
        /// The function.
        function: SpecialFn,
        /// A point, written like 0.3, 2.5-0.1i, 1e-5i (repeatable).
        #[arg(long = "at", required = true, allow_hyphen_values = true)]
        at: Vec<String>,
        /// Decimal digits wanted (1 to about 21000); 15 uses the double path.
        #[arg(long, default_value_t = 15)]
        digits: u64,
        /// Order n for polygamma, or integer s for hurwitz.
        #[arg(long, default_value_t = 1)]
        order: u32,
        /// Print JSON instead of a table.
        #[arg(long)]
        json: bool,
    },
}

/// The special functions `dressing special` can evaluate.
#[derive(Clone, Copy, Debug, ValueEnum)]
pub enum SpecialFn {
    /// Principal log Γ(z).
    Loggamma,
    /// Γ(z).
    Gamma,
    /// 1/Γ(z).
    Rgamma,
    /// ψ(z).
    Digamma,
    /// ψ⁽ⁿ⁾(z), n from --order.
    Polygamma,
    /// log G(z), Barnes G on its continuous branch.
    Logbarnesg,
    /// G(z).
    Barnesg,
    /// ζ(s, z), integer s from --order.
    Hurwitz,
}

/// Runs the command line; returns what to print on success.
pub fn run(cli: Cli) -> Result<String, String> {
    match cli.command {
        Command::Demo => Ok(demo()),
        Command::Special {
            function,
            at,
            digits,
            order,
            json,
        } => special_cmd(function, &at, digits, order, json),
    }
}

fn eval_special(
    f: SpecialFn,
    z: &Complex,
    order: u32,
    prec: Prec,
) -> crate::Result<Approx<Complex>> {
    match f {
        SpecialFn::Loggamma => special::log_gamma(z, prec),
        SpecialFn::Gamma => special::gamma(z, prec),
        SpecialFn::Rgamma => special::rgamma(z, prec),
        SpecialFn::Digamma => special::digamma(z, prec),
        SpecialFn::Polygamma => special::polygamma(order, z, prec),
        SpecialFn::Logbarnesg => special::log_barnes_g(z, prec),
        SpecialFn::Barnesg => special::barnes_g(z, prec),
        SpecialFn::Hurwitz => {
            let s = Complex::with_val(z.prec().0, order);
            special::hurwitz_zeta(&s, z, prec)
        }
    }
}

fn special_cmd(
    f: SpecialFn,
    at: &[String],
    digits: u64,
    order: u32,
    json: bool,
) -> Result<String, String> {
    let prec = Prec::digits(digits).map_err(|e| format!("--digits {digits}: {e}"))?;
    let wp = prec.bits() + 32;
    let mut out = String::new();
    let mut rows = Vec::new();
    for text in at {
        let z = parse_complex(text, wp).map_err(|e| format!("--at {text}: {e}"))?;
        let r = eval_special(f, &z, order, prec).map_err(|e| format!("--at {text}: {e}"))?;
        rows.push((text.clone(), r));
    }
    if json {
        out.push_str("[\n");
        for (i, (text, r)) in rows.iter().enumerate() {
            let _ = writeln!(
                out,
                "  {{\"at\": \"{text}\", \"re\": \"{}\", \"im\": \"{}\", \"error_estimate\": \"{}\", \"precision_bits\": {}, \"correct_digits\": {:.1}}}{}",
                r.value.real().to_string_radix(10, Some(digits as usize)),
                r.value.imag().to_string_radix(10, Some(digits as usize)),
                r.radius,
                r.prec,
                r.correct_digits(),
                if i + 1 < rows.len() { "," } else { "" }
            );
        }
        out.push_str("]\n");
    } else {
        for (text, r) in &rows {
            let _ = writeln!(
                out,
                "{:?}({text}) = {}\n    error estimate {}  ({:.1} correct digits, {} bits)",
                f,
                r.value.to_decimal(digits as usize),
                r.radius,
                r.correct_digits(),
                r.prec
            );
        }
    }
    Ok(out)
}

/// The built-in demonstration. Until the scalar-factor layers land it shows
/// the numeric core: values with error estimates at two precisions, and
/// identities checked to the digits asked for.
fn demo() -> String {
    let mut out = String::new();
    let _ = writeln!(
        out,
        "dressing demo: the numeric core (special functions with error estimates) and a gamma-product factor\n"
    );
    let points = [(0.5, 3.0), (-7.3, 0.4), (2.0, 1e-8)];
    for digits in [15u64, 50] {
        let prec = Prec::digits(digits).expect("valid");
        for &(x, y) in &points {
            let z = Complex::with_val(prec.bits() + 32, (x, y));
            match special::log_gamma(&z, prec) {
                Ok(r) => {
                    let _ = writeln!(
                        out,
                        "log Γ({x}{y:+}i) at {digits} digits = {}\n    error estimate {}",
                        r.value.to_decimal(digits as usize),
                        r.radius
                    );
                }
                Err(e) => {
                    let _ = writeln!(out, "log Γ({x}{y:+}i): {e}");
                }
            }
        }
    }
    let prec = Prec::digits(100).expect("valid");
    let p = prec.bits() + 32;
    let half = Complex::with_val(p, 0.5);
    let g = special::gamma(&half, prec).map(|g| g.value);
    let pi = Complex::with_val(p, rug::float::Constant::Pi);
    if let Ok(g) = g {
        let agree = agreement_digits(&Complex::with_val(p, &g * &g), &pi);
        let _ = writeln!(
            out,
            "\nΓ(1/2)² = π (DLMF 5.4.6): agrees to {agree:.0} digits at 100 requested"
        );
    }
    if let Ok(psi) = special::digamma(&Complex::with_val(p, 1), prec) {
        let euler = Complex::with_val(p, -rug::Float::with_val(p, rug::float::Constant::Euler));
        let agree = agreement_digits(&psi.value, &euler);
        let _ = writeln!(
            out,
            "ψ(1) = −γ (DLMF 5.4.12): agrees to {agree:.0} digits at 100 requested"
        );
    }
    demo_factor(&mut out);
    out
}

/// The demo's factor section: a published factor (the sine-Gordon soliton
/// factor, a check rather than a model of ours) evaluated in and outside the
/// strip of its integral, by both representations.
fn demo_factor(out: &mut String) {
    use crate::factor::{known::sine_gordon_soliton, Method};
    let xi = 2.0 * std::f64::consts::PI / 7.0;
    let Ok(f) = sine_gordon_soliton(xi) else {
        return;
    };
    let _ = writeln!(
        out,
        "\nGamma-product factor (a published check): sine-Gordon soliton factor, ξ = 2π/7"
    );
    if let Some((lo, hi)) = f.strip() {
        let _ = writeln!(
            out,
            "integral representation converges for {lo:.4} < Im θ < {hi:.4}"
        );
    }
    let prec = Prec::digits(30).expect("valid");
    for (x, y) in [(0.7, 0.2), (0.4, 1.5)] {
        let theta = Complex::with_val(prec.bits() + 32, (x, y));
        let p = f.log_value(&theta, prec, Method::Product);
        let i = f.log_value(&theta, prec, Method::Integral);
        match (p, i) {
            (Ok(p), Ok(i)) => {
                let agree = agreement_digits(&p.log.value, &i.log.value);
                let _ = writeln!(
                    out,
                    "log(−S₀(θ = {x}{y:+}i)) = {}\n    error estimate {}; {}; {} agrees to {agree:.0} digits",
                    p.log.value.to_decimal(30),
                    p.log.radius,
                    p.representation,
                    i.representation
                );
            }
            (Err(e), _) | (_, Err(e)) => {
                let _ = writeln!(out, "θ = {x}{y:+}i: {e}");
            }
        }
    }
}

/// Significant decimal digits to which `a` and `b` agree.
pub fn agreement_digits(a: &Complex, b: &Complex) -> f64 {
    let d = Complex::with_val(a.prec().0, a - b);
    if d.is_zero() {
        return a.prec().0 as f64 * std::f64::consts::LOG10_2;
    }
    (b.log2_abs() - d.log2_abs()) * std::f64::consts::LOG10_2
}
