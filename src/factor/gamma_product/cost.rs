//! The cost model behind [`Method::Auto`]: for a point and a precision,
//! the estimated time of each representation, from the work it will do and
//! per-operation costs measured on the project's machine
//! (docs/performance.md, "Cost model").
//!
//! * **Product form**: `K·J'` log-gammas (`J'` terms, twice as many when
//!   normalised; `K` as the product form chooses it) plus the tail, `M`
//!   terms: `G·M²/2 + J'·M` multiplications (`G` distinct steps).
//! * **Integral, double path, even integrand in its strip**: the uniform
//!   rule's nodes (known exactly before evaluating) × slope classes × the
//!   cost of a node.
//! * **Integral, double-exponential rule**: an estimated node count at the
//!   working precision × slope classes × (exponential + sine–cosine at the
//!   node precision), plus the factors taken out outside the strip
//!   (`peel·J'` log-gammas) and the Taylor series near 0.
//!
//! The per-operation costs are power laws in the working bits `w`, fitted
//! to measurements at 53, 200–260 and 3400 bits (MPFR 4.2 through `rug`).

use super::product::{series_terms, start_k};
use super::{integral, GammaProduct, Method, Representation, Result};
use crate::num::ComplexField;
use crate::precision::Prec;
use std::fmt;

/// The estimated cost of one representation at one point.
#[derive(Clone, Debug, PartialEq)]
pub struct Cost {
    /// The representation and its size as it would be used.
    pub representation: Representation,
    /// Estimated time in microseconds on the reference machine.
    pub micros: f64,
    /// What the estimate counts (printed in words).
    pub detail: Detail,
}

/// What a [`Cost`] counts. Kept as numbers and put into words only when
/// printed: `Method::Auto` plans every evaluation, and formatting the words
/// each time cost more than some of the evaluations.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum Detail {
    /// `log_gammas` log-gammas and, when estimated, the tail's multiplications.
    Product {
        /// Log-gammas of the explicit factors.
        log_gammas: f64,
        /// Multiplications in the tail (`None`: not estimated).
        multiplications: Option<f64>,
    },
    /// The uniform rule of the double path.
    Uniform {
        /// Nodes.
        nodes: usize,
        /// Slope classes.
        classes: f64,
    },
    /// The double-exponential rule, with the factors taken out.
    DoubleExponential {
        /// Nodes (estimated).
        nodes: f64,
        /// Slope classes.
        classes: f64,
        /// Log-gammas of the factors taken out.
        log_gammas: f64,
        /// Factors taken out.
        peeled: usize,
    },
}

impl fmt::Display for Detail {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match *self {
            Detail::Product {
                log_gammas,
                multiplications: None,
            } => write!(
                f,
                "at least {log_gammas:.0} log-gammas (tail not estimated)"
            ),
            Detail::Product {
                log_gammas,
                multiplications: Some(m),
            } => write!(
                f,
                "{log_gammas:.0} log-gammas + about {m:.0} multiplications in the tail"
            ),
            Detail::Uniform { nodes, classes } => write!(
                f,
                "{nodes} nodes of the uniform rule × {classes:.0} slope class(es)"
            ),
            Detail::DoubleExponential {
                nodes,
                classes,
                log_gammas,
                peeled,
            } => {
                write!(
                    f,
                    "about {nodes:.0} double-exponential nodes × {classes:.0} slope class(es)"
                )?;
                if peeled > 0 {
                    write!(
                        f,
                        " + {log_gammas:.0} log-gammas for the {peeled} factors taken out"
                    )?;
                }
                Ok(())
            }
        }
    }
}

/// What [`Method::Auto`] would do at a point, and why.
#[derive(Clone, Debug, PartialEq)]
pub struct Plan {
    /// The chosen method ([`Method::Product`] or [`Method::Integral`]).
    pub method: Method,
    /// The product form's estimate (`None` where it cannot be used here).
    pub product: Option<Cost>,
    /// The integral form's estimate (`None` where it is not available).
    pub integral: Option<Cost>,
}

impl fmt::Display for Plan {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        let show = |c: &Option<Cost>| match c {
            Some(c) => format!("{} ≈ {:.3} µs ({})", c.representation, c.micros, c.detail),
            None => "not available".to_string(),
        };
        write!(
            f,
            "chose the {}: product form {}; integral form {}",
            if self.method == Method::Integral {
                "integral form"
            } else {
                "product form"
            },
            show(&self.product),
            show(&self.integral)
        )
    }
}

/// µs per log Γ at `w` working bits.
fn log_gamma_us(w: u32) -> f64 {
    if w <= 53 {
        0.18
    } else {
        29.0 * (w as f64 / 200.0).powf(1.44)
    }
}

/// µs per complex multiplication (multiply-add) at `w` bits.
fn mul_us(w: u32) -> f64 {
    if w <= 53 {
        0.004
    } else {
        0.16 * (w as f64 / 200.0).powf(0.67)
    }
}

/// µs per real exponential plus sine–cosine pair at `w` bits.
fn exp_us(w: u32) -> f64 {
    3.2 * (w as f64 / 200.0).powf(1.2)
}

/// µs per node and slope class of the uniform rule.
const UNIFORM_NODE_US: f64 = 0.0030;
/// µs of fixed work per point of the uniform rule (seeds, first nodes).
const UNIFORM_SETUP_US: f64 = 0.25;

/// Nodes the double-exponential rule evaluates on the Malmstén integrand at
/// `w` bits (measured: about 150 at 53 bits, 700 at 200, 7000 at 3400).
fn de_nodes(w: u32) -> f64 {
    150.0 * (w.max(53) as f64 / 53.0).powf(0.93)
}

impl GammaProduct {
    /// What [`Method::Auto`] does at `theta` (as `(Re θ, Im θ)`) and
    /// `prec`: the estimated cost of each representation and the choice.
    /// `prec` above 53 bits is planned for the arbitrary-precision path.
    ///
    /// ```
    /// use dressing::factor::{known::sine_gordon_soliton, Method, Representation};
    /// use dressing::Prec;
    /// let f = sine_gordon_soliton(2.0 * std::f64::consts::PI / 7.0).unwrap();
    /// let p = f.plan((0.7, 0.2), Prec::DOUBLE).unwrap();
    /// assert_eq!(p.method, Method::Integral);
    /// assert!(p.integral.unwrap().micros < p.product.unwrap().micros);
    /// println!("{}", f.plan((0.7, 30.0), Prec::digits(50).unwrap()).unwrap());
    /// ```
    pub fn plan(&self, theta: (f64, f64), prec: Prec) -> Result<Plan> {
        let wp = if prec.bits() <= 53 {
            53
        } else {
            prec.bits() + 24
        };
        let th = rug::Complex::with_val(wp.max(64), theta);
        let (z, z0) = self.z_and_z0(&th, wp.max(64));
        let zf = (z.re_f64(), z.im_f64());
        let z0f = z0.as_ref().map(|w| (w.re_f64(), w.im_f64()));
        Ok(self.plan_f64(zf, z0f, prec, true))
    }

    /// The plan for z (and z₀) at the working precision of `C`.
    pub(super) fn plan_z<C: ComplexField>(&self, z: &C, z0: Option<&C>, prec: Prec) -> Plan {
        let zf = (z.re_f64(), z.im_f64());
        let z0f = z0.map(|w| (w.re_f64(), w.im_f64()));
        self.plan_f64(zf, z0f, prec, false)
    }

    /// With `full` false, the product form's tail is not estimated when its
    /// log-gammas alone already cost more than the integral.
    fn plan_f64(&self, z: (f64, f64), z0: Option<(f64, f64)>, prec: Prec, full: bool) -> Plan {
        let double = prec.bits() <= 53;
        let wp = if double { 53 } else { prec.bits() + 24 };
        let integral = self.integral_cost(z, z0, wp, double);
        let bound = if full {
            None
        } else {
            integral.as_ref().map(|c| c.micros)
        };
        let product = self.product_cost(z, z0, wp, bound);
        let method = match (&product, &integral) {
            (Some(p), Some(i)) if i.micros < p.micros => Method::Integral,
            (None, Some(_)) => Method::Integral,
            _ => Method::Product,
        };
        Plan {
            method,
            product,
            integral,
        }
    }

    fn product_cost(
        &self,
        z: (f64, f64),
        z0: Option<(f64, f64)>,
        wp: u32,
        bound: Option<f64>,
    ) -> Option<Cost> {
        let tf = self.terms_f64();
        let (kk, y_max, c_max) = start_k(tf, z, z0, wp).ok()?;
        let j = (self.terms.len() * if z0.is_some() { 2 } else { 1 }) as f64;
        let lg = kk as f64 * j;
        if let Some(b) = bound {
            if lg * log_gamma_us(wp) > b {
                return Some(Cost {
                    representation: Representation::Product {
                        explicit: kk,
                        tail_terms: 0,
                    },
                    micros: lg * log_gamma_us(wp),
                    detail: Detail::Product {
                        log_gammas: lg,
                        multiplications: None,
                    },
                });
            }
        }
        let a_min = tf.iter().map(|c| c.0).fold(f64::INFINITY, f64::min);
        let m = series_terms(a_min * kk as f64, y_max, c_max, wp);
        let mut steps: Vec<f64> = tf.iter().map(|c| c.0).collect();
        steps.dedup();
        let g = steps.len() as f64;
        let mm = (2 * m + 8) as f64;
        let muls = g * mm * mm / 2.0 + j * mm;
        Some(Cost {
            representation: Representation::Product {
                explicit: kk,
                tail_terms: m,
            },
            micros: lg * log_gamma_us(wp) + muls * mul_us(wp),
            detail: Detail::Product {
                log_gammas: lg,
                multiplications: Some(muls),
            },
        })
    }

    fn integral_cost(
        &self,
        z: (f64, f64),
        z0: Option<(f64, f64)>,
        wp: u32,
        double: bool,
    ) -> Option<Cost> {
        let kernel = self.kernel.as_ref().ok()?;
        if double && kernel.even {
            if let (Some(terms), Some(nodes)) = (
                self.grid_terms(),
                self.trapezoid_nodes(num_complex::Complex64::new(z.0, z.1)),
            ) {
                let classes = terms.sigma_classes().len().max(1) as f64;
                return Some(Cost {
                    representation: Representation::Integral { peeled: 0 },
                    micros: UNIFORM_SETUP_US + nodes as f64 * classes * UNIFORM_NODE_US,
                    detail: Detail::Uniform { nodes, classes },
                });
            }
        }
        let coeffs = super::coeffs_of(&kernel.coeffs, &kernel.terms, wp);
        let mut sigma: Vec<f64> = coeffs
            .iter()
            .map(|c| c.2.to_f64().abs())
            .filter(|s| *s > 0.0)
            .collect();
        sigma.sort_by(f64::total_cmp);
        sigma.dedup();
        let classes = sigma.len().max(1) as f64;
        let peel = Self::peel_count(&coeffs, z, z0, integral::MARGIN).ok()?;
        let j = (kernel.terms.len() * if z0.is_some() { 2 } else { 1 }) as f64;
        // The double path's double-exponential rule runs on MPFR at 53 + 24 bits.
        let wp = if double { 77 } else { wp };
        let nodes = de_nodes(wp);
        // Nodes below t = 1 carry about 3 log2(1/t) + 16 extra bits.
        let node_bits = wp + 24;
        let lg = peel as f64 * j;
        let g = (wp as f64).sqrt();
        let n = (wp as f64 + 16.0) / g + 2.0;
        let series = n * n * mul_us(wp);
        Some(Cost {
            representation: Representation::Integral { peeled: peel },
            micros: nodes * classes * exp_us(node_bits) + lg * log_gamma_us(wp) + series,
            detail: Detail::DoubleExponential {
                nodes,
                classes,
                log_gammas: lg,
                peeled: peel,
            },
        })
    }
}
