//! `dressing`: numerics of S-matrix scalar factors (dressing factors and CDD
//! factors) at double and arbitrary precision.
//!
//! The crate is layered. At the bottom, [`precision`] says how precision is
//! requested and how errors are reported, and [`num`] gives one numeric
//! abstraction over `Complex64` and `rug::Complex` so every algorithm is
//! written once. On top of it, [`special`] provides the complex special
//! functions (log Γ, ψ and polygamma, Barnes G, Hurwitz ζ, Bernoulli numbers)
//! and [`quadrature`] the double-exponential rules that the scalar factors'
//! integral representations need.
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
