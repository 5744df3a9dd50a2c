//! Double-exponential quadrature.
