//! Scalar factors and their representations.
//!
//! A factor is built from pieces; the first piece type is the infinite
//! product of gamma functions, [`GammaProduct`], with two independent
//! representations (product with analytic tail; Malmstén integral with
//! continuation) so that each value can be checked by the other.

mod coef;
mod gamma_product;
pub mod known;
mod pieces;

pub use coef::Coef;
pub use gamma_product::{
    Condition, Convergence, Cost, Detail, FactorValue, GammaProduct, GammaTerm, Method, Plan,
    Representation, Scale, StepReduction,
};
pub use pieces::{BarnesFactor, CddBlock, FiniteGamma};
