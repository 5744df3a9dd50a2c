//! Complex special functions on both numeric paths.

mod bernoulli;

pub use bernoulli::bernoulli;
pub(crate) use bernoulli::with_even_bernoulli;
