//! `dressing`: numerics of S-matrix scalar factors (dressing factors and CDD
//! factors) at double and arbitrary precision.
//!
//! **Start here: [`model::Model`].** Load a model file (or build one from
//! TOML text), then ask it for a factor's value at a rapidity and a
//! precision, its kernel, the functional equations, and the poles:
//!
//! ```
//! use dressing::equations::{check_equation, CheckOptions};
//! use dressing::factor::Method;
//! use dressing::model::Model;
//! use dressing::poles::{analyse, PoleOptions};
//! use dressing::Prec;
//! use num_complex::Complex64;
//!
//! let model = Model::load(concat!(env!("CARGO_MANIFEST_DIR"), "/examples/lantern.toml")).unwrap();
//!
//! // S at 40 digits on the branch continuous from the base point, with its
//! // error estimate and the representation each piece used.
//! let theta = rug::Complex::with_val(160, (0.7, 0.2));
//! let v = model.evaluate("sigma", &theta, Prec::digits(40).unwrap(), Method::Auto).unwrap();
//! assert!(v.value.correct_digits() >= 39.0);
//!
//! // Hot loops: the sum of principal logs and the kernel d/dθ log S at
//! // double precision, no branch continuation.
//! let f = model.factor("sigma").unwrap();
//! let t = Complex64::new(0.3, 0.0);
//! let log_s = f.log_sum(&t, Prec::DOUBLE, Method::Auto).unwrap().log;
//! let kernel = f.log_derivative(&t, Prec::DOUBLE).unwrap();
//! assert!(log_s.value.re.abs() < 1e-12); // unitary: |S| = 1 on the real line
//! assert!(kernel.radius.to_f64() < 1e-11);
//!
//! // The equations stated in the file, at sampled points.
//! let eq = model.equation("unitarity").unwrap();
//! assert!(check_equation(&model, eq, &CheckOptions::new(30).unwrap()).passed);
//!
//! // Poles and zeros with u/π in [0, 1] on the imaginary axis θ = iu.
//! let opts = PoleOptions { window: (0.0, 1.0), prec: Prec::DOUBLE, masses: Some((1.0, 1.0)) };
//! let (points, _cancelled) = analyse(&model, "dressed", &opts).unwrap();
//! assert!(points.iter().any(|p| p.point.order == 1 && p.neg_i_residue.unwrap_or(0.0) > 0.0));
//! ```
//!
//! Every value is an [`Approx`]: the value, the precision it carries and a
//! [`Radius`] estimating its error. `Complex64` arguments run on the double
//! path (53 bits, pass [`Prec::DOUBLE`]); `rug::Complex` on MPFR at any
//! [`Prec`]. [`model::Model::tabulate`] gives S, the continuous log S and the
//! kernel on a line; `examples/` has a factor built in code without a file
//! (`factor_in_code`), the equation checks (`check_lantern`) and a TBA grid
//! (`tba_kernel`).
//!
//! The crate is layered. At the bottom, [`precision`] says how precision is
//! requested and how errors are reported, and [`num`] gives one numeric
//! abstraction over `Complex64` and `rug::Complex` so every algorithm is
//! written once. On top of it, [`special`] provides the complex special
//! functions (log Γ, ψ and polygamma, Barnes G, Hurwitz ζ, Bernoulli numbers)
//! and [`quadrature`] the double-exponential rules that the scalar factors'
//! integral representations need; [`factor`] the representations of the
//! factors' pieces; [`model`] the model files; [`equations`], [`poles`] and
//! [`plot`] what is done with a factor; [`cli`] the command line.
//!
//! ```
//! use dressing::{special::log_gamma, Prec};
//! let z = rug::Complex::with_val(200, (0.5, 3.0));
//! let r = log_gamma(&z, Prec::digits(50).unwrap()).unwrap();
//! assert!(r.correct_digits() >= 50.0);
//! ```

#![warn(missing_docs)]

pub mod cli;
pub mod equations;
pub mod error;
pub mod expr;
pub mod factor;
pub mod model;
pub mod num;
pub mod plot;
pub mod poles;
pub mod precision;
pub mod quadrature;
pub mod special;

pub use error::{Error, Result};
pub use precision::{Approx, Prec, Radius};
