//! The double-precision integral of an even integrand on a uniform grid
//! (docs/math.md §4b).
//!
//! When the Malmstén integrand `f` is even in t (crossing-symmetric
//! products such as the sine-Gordon factor), `∫_0^∞ f = h f(0)/2 + h Σ_{k≥1} f(kh)`
//! up to an error `≤ 2N/(e^{2πd/h} − 1)` (trapezoidal rule on the real line
//! for a function analytic in the strip `|Im t| < d`, with `N` the `L¹`
//! norm on its edges: Trefethen & Weideman, SIAM Review 56 (2014) 385,
//! Thm 5.1). The nearest singularities of `f` are the zeros of
//! `1 − e^{−at}` and `1 − e^{−t}`, at distance `d₀ = 2π/max(a, 1)`. On equally
//! spaced nodes the exponentials are a geometric sequence,
//! `e^{−σz(k+4)h} = e^{−σzkh}·e^{−4σzh}`, so a node costs two complex
//! multiplications per slope class instead of an exponential (four chains
//! interleaved, so that the multiplications do not wait on each other).
//!
//! * **Step.** `h = 2π d'/(52 ln 2 + ln 8 + Y d')`, `d' = 0.9 d₀`,
//!   `Y = max |Im c_j|` (the growth of `e^{−c t}` off the axis), rounded down
//!   to `h₀ 2^{−j/4}` so that grids are cached per level `j`.
//! * **Truncation.** At `T` where `Σ|n_j| e^{−λT}/(λ D(T)) ≤ 2^{−56}`,
//!   `λ = min Re c_j`; that bound joins the radius.
//! * **Near t = 0** the numerator cancels to `O(t³)`. For the first nodes
//!   (`t < 3/max|c_j|`) `f(t) = Σ_l z^l Γ_l(t)` with
//!   `Γ_l(t) = (−t)^l/l! · Σ_j n_j s_j^l e^{−b_j t}/D(t)`, the `Γ_l` computed
//!   once in MPFR: no cancellation at any z.
//! * **Error estimate.** The sum over the even nodes is the rule with step
//!   `2h`; its difference `δ` from the full sum is about the error of the
//!   coarse rule, and the error of the fine rule is then about `δ²/(2N)`,
//!   taken as `16 δ²/L1` (`N ≥ 2·L1` by log-convexity of the `L¹` norms
//!   across the strip). Rounding: `2^{−53}((4 + √K) L1 + 2 Σ_k m_k |h f_k|)`
//!   with `m_k` the multiplications since the last exponential, both over
//!   the sizes of the terms before they cancel (`|W₊||u| + |W₋||v|`).
//!
//! Points where `λ < 0.05`, or that would need more than [`MAX_NODES`]
//! nodes or risk overflow in `e^{σ|x|T}`, are declined (`None`) and go to the
//! double-exponential rule.

use super::{GammaProduct, Result};
use crate::precision::{Approx, Prec, Radius};
use crate::special::finish;
use num_complex::Complex64;
use rug::ops::Pow;
use rug::{Complex, Float, Integer};
use std::collections::HashMap;
use std::sync::{Arc, OnceLock, RwLock};

/// `log2` of the discretisation target the step is chosen for (relative to
/// the edge norm `N`); the error estimate decides whether it was met.
const TARGET_LOG2: f64 = -52.0;
/// `log2` of the truncation target.
const TAIL_LOG2: f64 = -56.0;
/// Highest power of z kept for the first nodes.
const L_MAX: usize = 48;
/// The most nodes a point may use.
pub(super) const MAX_NODES: usize = 20_000;
/// Nodes below this t keep their polynomial coefficients.
const SMALL_T: f64 = 1.5;
/// Smallest `min Re c_j` the uniform grid accepts.
const MIN_DECAY: f64 = 0.05;
/// Chains of the geometric sequences.
const CHAINS: usize = 4;

/// The grids of one product, by level, and its terms in `f64`.
#[derive(Default)]
pub(super) struct GridCache {
    grids: RwLock<HashMap<u32, Arc<Grid>>>,
    terms: OnceLock<Option<Arc<Terms>>>,
}

/// The common-step terms in `f64`, and the constants of the rule.
pub(super) struct Terms {
    a: f64,
    b: Vec<f64>,
    s: Vec<f64>,
    /// `Σ |n_j|`.
    abs_n: f64,
    /// `|s|` per slope class.
    sigma: Vec<f64>,
    /// Each term's class and sign (`None`: slope 0).
    class_of: Vec<Option<(usize, bool)>>,
    /// Whether the class has terms of negative slope.
    has_minus: Vec<bool>,
    /// `d'`, where the step is computed from.
    d: f64,
    /// `h₀`: the step for `Y = 0`.
    h0: f64,
    /// `f(0) = Σ_l q_l z^l − (the same at z₀)`.
    q: [f64; 4],
    f0_z0: Complex64,
    /// z₀ of a normalised product.
    z0: Option<Complex64>,
    /// Terms with slope 0 or a normalisation: a constant part per node.
    has_w0: bool,
}

impl Terms {
    /// `|s|` per slope class.
    pub(super) fn sigma_classes(&self) -> &[f64] {
        &self.sigma
    }

    /// Whether slope class `c` has terms of negative slope.
    pub(super) fn minus(&self, c: usize) -> bool {
        self.has_minus[c]
    }
}

/// One level: nodes `t_k = k h`, `k = 1..=len`, stored at index `k − 1`.
pub(super) struct Grid {
    pub h: f64,
    /// `h W₊(t_k)` and `h W₋(t_k)` per slope class.
    wp: Vec<Vec<f64>>,
    wm: Vec<Vec<f64>>,
    /// `t_k h W±(t_k)`, for the derivative's integrand.
    twp: Vec<Vec<f64>>,
    twm: Vec<Vec<f64>>,
    /// `h (W₀(t_k) − normalisation part)`, when present.
    w0: Vec<Complex64>,
    /// `h Γ_l(t_k)` for the nodes with `t_k ≤ SMALL_T`, and `h f_{z₀}(t_k)`.
    poly: Vec<[f64; L_MAX + 1]>,
    poly_z0: Vec<Complex64>,
}

impl Grid {
    fn len(&self) -> usize {
        self.wp.first().map_or(self.w0.len(), |v| v.len())
    }
}

/// The per-point choices of the rule: step level, node count, first
/// nodes in polynomial form, polynomial degree, truncation bound.
#[derive(Clone, Copy, Debug)]
pub(super) struct Layout {
    pub level: u32,
    pub nodes: usize,
    pub small: usize,
    pub degree: usize,
    pub tail: f64,
}

/// Bits for the node data at t.
fn node_bits(t: f64) -> u32 {
    if t >= 1.0 {
        96
    } else {
        96 + 3 * ((1.0 / t).log2().ceil() as u32)
    }
}

impl GammaProduct {
    /// The f64 view of the kernel, when the uniform rule applies.
    pub(super) fn grid_terms(&self) -> Option<Arc<Terms>> {
        self.grids
            .terms
            .get_or_init(|| {
                let k = self.kernel.as_ref().ok()?;
                if !k.even {
                    return None;
                }
                let c = super::coeffs_of(&k.coeffs, &k.terms, 128);
                let a = c[0].0.to_f64();
                let b: Vec<f64> = c.iter().map(|t| t.1.to_f64()).collect();
                let s: Vec<f64> = c.iter().map(|t| t.2.to_f64()).collect();
                let mut sigma: Vec<f64> = Vec::new();
                let mut has_minus = Vec::new();
                let mut has_w0 = self.theta0.is_some();
                let mut class_of = Vec::with_capacity(s.len());
                for &sj in &s {
                    if sj == 0.0 {
                        has_w0 = true;
                        class_of.push(None);
                        continue;
                    }
                    let i = match sigma.iter().position(|x| *x == sj.abs()) {
                        Some(i) => i,
                        None => {
                            sigma.push(sj.abs());
                            has_minus.push(false);
                            sigma.len() - 1
                        }
                    };
                    if sj < 0.0 {
                        has_minus[i] = true;
                    }
                    class_of.push(Some((i, sj > 0.0)));
                }
                // q_l = −C(3,l) Σ n s^l b^{3−l} / (6a), exactly in MPFR.
                let p = 256;
                let mut q = [0.0; 4];
                for (l, ql) in q.iter_mut().enumerate() {
                    let mut acc = Float::new(p);
                    for (j, (_, bj, sj)) in c.iter().enumerate() {
                        let bj = Float::with_val(p, bj);
                        let sj = Float::with_val(p, sj);
                        let v = Float::with_val(p, sj.pow(l as u32))
                            * Float::with_val(p, bj.pow(3 - l as u32))
                            * k.terms[j].power;
                        acc += v;
                    }
                    let binom = [1u32, 3, 3, 1][l];
                    let a6 = Float::with_val(p, &c[0].0) * 6u32;
                    *ql = (-(acc * binom) / a6).to_f64();
                }
                let z0 = self.theta0.map(|(x, y)| {
                    let t0 = Complex::with_val(128, (x, y));
                    let z = self.scale.z_of(&t0);
                    Complex64::new(z.real().to_f64(), z.imag().to_f64())
                });
                let f0_z0 = z0.map_or(Complex64::new(0.0, 0.0), |w| {
                    Complex64::new(q[0], 0.0) + w * (q[1] + w * (q[2] + w * q[3]))
                });
                let d = 0.9 * 2.0 * std::f64::consts::PI / a.max(1.0);
                let h0 = step_for(d, 0.0);
                let abs_n = k.terms.iter().map(|t| t.power.unsigned_abs() as f64).sum();
                Some(Arc::new(Terms {
                    a,
                    b,
                    s,
                    abs_n,
                    sigma,
                    class_of,
                    has_minus,
                    d,
                    h0,
                    q,
                    f0_z0,
                    z0,
                    has_w0,
                }))
            })
            .clone()
    }

    /// The grid of `level` with at least `len` nodes.
    pub(super) fn grid(&self, terms: &Terms, level: u32, len: usize) -> Result<Arc<Grid>> {
        if let Some(g) = self.grids.grids.read().expect("poisoned").get(&level) {
            if g.len() >= len {
                return Ok(Arc::clone(g));
            }
        }
        // Build (or rebuild, longer: at least twice the old) under the write
        // lock, so that threads arriving together build it once; the others
        // wait for it instead of repeating the MPFR work.
        let mut grids = self.grids.grids.write().expect("poisoned");
        if let Some(g) = grids.get(&level) {
            if g.len() >= len {
                return Ok(Arc::clone(g));
            }
        }
        let want = len
            .max(grids.get(&level).map_or(0, |g| 2 * g.len()))
            .min(MAX_NODES);
        let g = Arc::new(self.build_grid(terms, level, want)?);
        grids.insert(level, Arc::clone(&g));
        Ok(g)
    }

    fn build_grid(&self, terms: &Terms, level: u32, len: usize) -> Result<Grid> {
        let kernel = self.kernel()?;
        let h = terms.h0 * (-(level as f64) / 4.0).exp2();
        let z0 = self.theta0.map(|(x, y)| {
            let t0 = Complex::with_val(256, (x, y));
            self.scale.z_of(&t0)
        });
        let nc = terms.sigma.len();
        let mut wp = vec![Vec::with_capacity(len); nc];
        let mut wm = vec![Vec::with_capacity(len); nc];
        let mut w0 = Vec::new();
        let mut poly = Vec::new();
        let mut poly_z0 = Vec::new();
        for k in 1..=len {
            let tk = k as f64 * h;
            let p = node_bits(tk);
            let coeffs = super::coeffs_of(&kernel.coeffs, &kernel.terms, p + 32);
            let hf = Float::with_val(p, h);
            let t = Float::with_val(p, Float::with_val(p + 64, &hf * Integer::from(k)));
            let a = Float::with_val(p, &coeffs[0].0);
            let scale = Float::with_val(p, &hf / super::integral::denominator(&t, &a));
            let mut cp = vec![Float::new(p); nc];
            let mut cm = vec![Float::new(p); nc];
            let mut c0 = Complex::new(p);
            let mut es = Vec::with_capacity(coeffs.len());
            for (j, (_, b, s)) in coeffs.iter().enumerate() {
                let n = kernel.terms[j].power;
                let e = Float::with_val(p, -Float::with_val(p, b * &t)).exp();
                es.push(e.clone());
                let e = e * n;
                match terms.class_of[j] {
                    Some((i, true)) => cp[i] += &e,
                    Some((i, false)) => cm[i] += &e,
                    None => c0 += &e,
                }
                if let Some(z0) = &z0 {
                    let c = Complex::with_val(p, z0 * s) + b;
                    c0 -= Complex::with_val(p, -(c * &t)).exp() * n;
                }
            }
            for i in 0..nc {
                wp[i].push(Float::with_val(p, &cp[i] * &scale).to_f64());
                wm[i].push(Float::with_val(p, &cm[i] * &scale).to_f64());
            }
            if terms.has_w0 {
                let v = c0 * &scale;
                w0.push(Complex64::new(v.real().to_f64(), v.imag().to_f64()));
            }
            if tk <= SMALL_T {
                // h Γ_l(t) = h (−t)^l/l! Σ_j n_j s_j^l e^{−b_j t}/D(t)
                let mut row = [0.0; L_MAX + 1];
                let mut fact = Float::with_val(p, 1u32);
                let mut mt = Float::with_val(p, 1u32);
                for (l, slot) in row.iter_mut().enumerate() {
                    if l > 0 {
                        fact *= l as u32;
                        mt *= &t;
                        mt = -mt;
                    }
                    let mut acc = Float::new(p);
                    for (j, (_, _, s)) in coeffs.iter().enumerate() {
                        let sl = Float::with_val(p, s.pow(l as u32));
                        acc += sl * &es[j] * kernel.terms[j].power;
                    }
                    *slot = (acc * &mt / &fact * &scale).to_f64();
                }
                poly.push(row);
                let v = match &z0 {
                    Some(z0) => {
                        let mut acc = Complex::new(p);
                        for (j, (_, b, s)) in coeffs.iter().enumerate() {
                            let c = Complex::with_val(p, z0 * s) + b;
                            acc += Complex::with_val(p, -(c * &t)).exp() * kernel.terms[j].power;
                        }
                        acc * &scale
                    }
                    None => Complex::new(p),
                };
                poly_z0.push(Complex64::new(v.real().to_f64(), v.imag().to_f64()));
            }
        }
        let times = |w: &Vec<Vec<f64>>| -> Vec<Vec<f64>> {
            w.iter()
                .map(|v| {
                    v.iter()
                        .enumerate()
                        .map(|(i, x)| (i + 1) as f64 * h * x)
                        .collect()
                })
                .collect()
        };
        let (twp, twm) = (times(&wp), times(&wm));
        Ok(Grid {
            h,
            wp,
            wm,
            twp,
            twm,
            w0,
            poly,
            poly_z0,
        })
    }
}

/// The step for strip half-width `d` and growth `Y` off the axis.
fn step_for(d: f64, y: f64) -> f64 {
    2.0 * std::f64::consts::PI * d / (-TARGET_LOG2 * std::f64::consts::LN_2 + 8f64.ln() + y * d)
}

/// `min Re c_j`, `max |Im c_j|`, `max |c_j|` at z (and z₀).
fn reach(terms: &Terms, z: Complex64) -> (f64, f64, f64) {
    let mut lam = f64::INFINITY;
    let mut ymax = 0.0f64;
    let mut cmax = 0.0f64;
    for w in std::iter::once(z).chain(terms.z0) {
        for (b, s) in terms.b.iter().zip(&terms.s) {
            let c = Complex64::new(b + s * w.re, s * w.im);
            lam = lam.min(c.re);
            ymax = ymax.max(c.im.abs());
            cmax = cmax.max((c.re * c.re + c.im * c.im).sqrt());
        }
    }
    (lam, ymax, cmax)
}

/// The layout of the rule for the points `zs` together (a common grid), or
/// `None` where the uniform rule is declined.
pub(super) fn layout(
    terms: &Terms,
    zs: &[Complex64],
    refine: u32,
    derivative: bool,
) -> Option<Layout> {
    let (mut lam, mut ymax, mut cmin, mut zmax) = (f64::INFINITY, 0.0f64, f64::INFINITY, 0.0f64);
    let mut xmax = 0.0f64;
    for &z in zs {
        let (l, y, c) = reach(terms, z);
        lam = lam.min(l);
        ymax = ymax.max(y);
        cmin = cmin.min(c);
        zmax = zmax.max(z.norm());
        xmax = xmax.max(z.re.abs());
    }
    if lam.is_nan() || lam < MIN_DECAY {
        return None;
    }
    let h_need = step_for(terms.d, ymax);
    let level = (4.0 * (terms.h0 / h_need).log2()).ceil().max(0.0) as u32 + 4 * refine;
    let h = terms.h0 * (-(level as f64) / 4.0).exp2();
    // Truncation: Σ|n| e^{−λT}/(λ D(T)) ≤ 2^TARGET, D(T) ≈ T for T ≥ 3;
    // the derivative's integrand carries an extra factor σ t (σ t ≤ 40 σ_max
    // covers every T used).
    let smax = terms.sigma.iter().fold(0.0f64, |m, s| m.max(*s));
    let weight = if derivative {
        40.0 * smax.max(1.0)
    } else {
        1.0
    };
    let big_l = (weight * terms.abs_n / lam).ln() - TAIL_LOG2 * std::f64::consts::LN_2;
    let mut t = (big_l / lam).max(3.0);
    for _ in 0..3 {
        t = ((big_l - t.ln()) / lam).max(3.0);
    }
    let dt = t * (-(-terms.a * t).exp_m1()) * (-(-t).exp_m1());
    let mut tail = terms.abs_n * (-lam * t).exp() / dt / (-(-lam * h).exp_m1()) * h;
    if derivative {
        tail *= smax * (t + 1.0 / lam);
    }
    let nodes = (t / h).ceil() as usize + 1;
    if nodes > MAX_NODES || smax * xmax * t > 650.0 {
        return None;
    }
    // First nodes in polynomial form: t < 3/max|c|, with σ|z|t ≤ 6.
    let tc = (3.0 / cmin).min(SMALL_T).min(if smax * zmax > 0.0 {
        6.0 / (smax * zmax)
    } else {
        SMALL_T
    });
    let small = ((tc / h).ceil() as usize).saturating_sub(1).min(nodes);
    let x = smax * zmax * small as f64 * h;
    let mut degree = 1usize;
    let mut term = x;
    while degree < L_MAX && term > 1e-19 * (1.0 + x.exp()) {
        degree += 1;
        term *= x / degree as f64;
    }
    Some(Layout {
        level,
        nodes,
        small,
        degree,
        tail,
    })
}

/// Running sums of one point.
#[derive(Default, Clone, Copy)]
pub(super) struct Sums {
    /// `Σ_k h f_k` over all nodes and over the even ones.
    pub all: Complex64,
    pub even: Complex64,
    /// `Σ |h f_k|`.
    pub l1: f64,
    /// `Σ` of the terms' sizes before they cancel in `h f_k`, and the same
    /// weighted by the multiplications `m_k` since the last exponential.
    pub rl1: f64,
    pub ml1: f64,
}

impl Sums {
    fn add(&mut self, k: usize, g: Complex64) {
        self.all += g;
        if k % 2 == 0 {
            self.even += g;
        }
        let m = g.re.abs() + g.im.abs();
        self.l1 += m;
        self.rl1 += m;
    }
}

/// `f(0)`, the first nodes in polynomial form, and the constant part of
/// the other nodes.
///
/// With `derivative`, the same parts of `d/dz` of the integrand: `f(0)' =
/// q₁ + 2q₂z + 3q₃z²`, the polynomial nodes `Σ_l l Γ_l z^{l−1}`, and no
/// constant part (it does not depend on z).
pub(super) fn fixed_part(
    terms: &Terms,
    grid: &Grid,
    lay: &Layout,
    z: Complex64,
    s: &mut Sums,
    derivative: bool,
) {
    let q = &terms.q;
    let f0 = if derivative {
        Complex64::new(q[1], 0.0) + z * (2.0 * q[2] + z * (3.0 * q[3]))
    } else {
        Complex64::new(q[0], 0.0) + z * (q[1] + z * (q[2] + z * q[3])) - terms.f0_z0
    };
    let g0 = f0 * (grid.h / 2.0);
    s.all += g0;
    s.even += g0;
    s.l1 += g0.re.abs() + g0.im.abs();
    s.rl1 += g0.re.abs() + g0.im.abs();
    let za = z.norm();
    for k in 1..=lay.small {
        let row = &grid.poly[k - 1];
        let (g, mag) = if derivative {
            // Σ_{l≥1} l row_l z^{l−1}
            let top = lay.degree.max(1);
            let mut acc = Complex64::new(top as f64 * row[top], 0.0);
            let mut mag = (top as f64 * row[top]).abs();
            for l in (1..top).rev() {
                acc = acc * z + l as f64 * row[l];
                mag = mag * za + (l as f64 * row[l]).abs();
            }
            (acc, mag)
        } else {
            let mut acc = Complex64::new(row[lay.degree], 0.0);
            let mut mag = row[lay.degree].abs();
            for l in (0..lay.degree).rev() {
                acc = acc * z + row[l];
                mag = mag * za + row[l].abs();
            }
            (acc - grid.poly_z0[k - 1], mag + grid.poly_z0[k - 1].norm())
        };
        s.add(k, g);
        // Horner's rounding: a few units of the absolute series.
        s.rl1 += (2.0 * (lay.degree as f64).sqrt() + 1.0) * mag;
    }
    if terms.has_w0 && !derivative {
        for k in lay.small + 1..=lay.nodes {
            s.add(k, grid.w0[k - 1]);
        }
    }
}

/// The result from the sums: `S_h`, with the radius of the module docs, and
/// whether the discretisation estimate met the double path's target
/// (`2^−53 max(L1, 1)`, or the rounding floor).
pub(super) fn result(s: &Sums, lay: &Layout, prec: Prec) -> (Approx<Complex64>, bool) {
    // S_{2h} = 2(h f(0)/2 + Σ_{k even} h f_k): `even` includes h f(0)/2.
    let coarse = s.even * 2.0;
    let d = (s.all - coarse).norm();
    let disc = if d <= s.l1 * (-10f64).exp2() {
        16.0 * d * d / s.l1.max(f64::MIN_POSITIVE)
    } else {
        d
    };
    let eps = f64::EPSILON / 2.0;
    let floor = eps * ((4.0 + (lay.nodes as f64).sqrt()) * s.rl1 + 2.0 * s.ml1);
    let rad = Radius::from_f64(disc) + Radius::from_f64(floor) + Radius::from_f64(lay.tail);
    let met = disc <= floor.max(s.l1.max(1.0) * (-53f64).exp2());
    (finish(s.all, rad, prec), met)
}

/// Adds the nodes `first..=last` of one slope class, with `u = e^{−σzt}`
/// and `v = 1/u` as geometric sequences seeded at `first`. With
/// `derivative` the node values are those of `d/dz` of the integrand: the
/// weights become `−σt W₊` and `+σt W₋`.
#[allow(clippy::too_many_arguments)]
pub(super) fn class_sum(
    grid: &Grid,
    class: usize,
    sigma: f64,
    minus: bool,
    z: Complex64,
    first: usize,
    last: usize,
    s: &mut Sums,
    derivative: bool,
) {
    if first > last {
        return;
    }
    let h = grid.h;
    let m = -z * sigma;
    let t0 = first as f64 * h;
    let d1 = (m * h).exp();
    let d4 = (m * (CHAINS as f64 * h)).exp();
    let mut ur = [0.0; CHAINS];
    let mut ui = [0.0; CHAINS];
    let mut u = (m * t0).exp();
    for r in 0..CHAINS {
        ur[r] = u.re;
        ui[r] = u.im;
        u *= d1;
    }
    let (mut vr, mut vi) = ([0.0; CHAINS], [0.0; CHAINS]);
    let (mut e4r, mut e4i) = (0.0, 0.0);
    if minus {
        let e1 = (-m * h).exp();
        let e4 = (-m * (CHAINS as f64 * h)).exp();
        e4r = e4.re;
        e4i = e4.im;
        let mut v = (-m * t0).exp();
        for r in 0..CHAINS {
            vr[r] = v.re;
            vi[r] = v.im;
            v *= e1;
        }
    }
    // d/dz of the integrand: the weights −σ t W₊ and σ t W₋.
    let (wp, wm, fa, fb) = if derivative {
        (
            &grid.twp[class][first - 1..last],
            &grid.twm[class][first - 1..last],
            -sigma,
            sigma,
        )
    } else {
        (
            &grid.wp[class][first - 1..last],
            &grid.wm[class][first - 1..last],
            1.0,
            1.0,
        )
    };
    let (d4r, d4i) = (d4.re, d4.im);
    let mut accr = [0.0; CHAINS];
    let mut acci = [0.0; CHAINS];
    let mut l1 = [0.0; CHAINS];
    let mut rl1 = [0.0; CHAINS];
    let mut ml1 = 0.0;
    let blocks = wp.len() / CHAINS;
    for blk in 0..blocks {
        let base = blk * CHAINS;
        let mut bl = 0.0;
        for r in 0..CHAINS {
            let (a, b) = (fa * wp[base + r], fb * wm[base + r]);
            let gr = a * ur[r] + b * vr[r];
            let gi = a * ui[r] + b * vi[r];
            accr[r] += gr;
            acci[r] += gi;
            l1[r] += gr.abs() + gi.abs();
            let mag = a.abs() * (ur[r].abs() + ui[r].abs()) + b.abs() * (vr[r].abs() + vi[r].abs());
            rl1[r] += mag;
            bl += mag;
            let (xr, xi) = (ur[r], ui[r]);
            ur[r] = xr * d4r - xi * d4i;
            ui[r] = xr * d4i + xi * d4r;
            if minus {
                let (yr, yi) = (vr[r], vi[r]);
                vr[r] = yr * e4r - yi * e4i;
                vi[r] = yr * e4i + yi * e4r;
            }
        }
        ml1 += (blk + CHAINS) as f64 * bl;
    }
    // The remaining nodes, and the chains' sums by parity of k.
    for (r, i) in (blocks * CHAINS..wp.len()).enumerate() {
        let (a, b) = (fa * wp[i], fb * wm[i]);
        let gr = a * ur[r] + b * vr[r];
        let gi = a * ui[r] + b * vi[r];
        accr[r] += gr;
        acci[r] += gi;
        l1[r] += gr.abs() + gi.abs();
        let mag = a.abs() * (ur[r].abs() + ui[r].abs()) + b.abs() * (vr[r].abs() + vi[r].abs());
        rl1[r] += mag;
        ml1 += (blocks + CHAINS) as f64 * mag;
    }
    for r in 0..CHAINS {
        let g = Complex64::new(accr[r], acci[r]);
        s.all += g;
        if (first + r) % 2 == 0 {
            s.even += g;
        }
        s.l1 += l1[r];
        s.rl1 += rl1[r];
    }
    s.ml1 += ml1;
}

impl GammaProduct {
    /// The even integral at one point on the double path, or `None` where
    /// the uniform rule is declined.
    ///
    /// With `derivative` it is `d/dz log F` by the same rule (the
    /// integrand differentiated under the integral sign).
    pub(super) fn trapezoid_point(
        &self,
        z: Complex64,
        prec: Prec,
        derivative: bool,
    ) -> Result<Option<Approx<Complex64>>> {
        let Some(terms) = self.grid_terms() else {
            return Ok(None);
        };
        // The step is chosen from the distance to the nearest poles; where
        // the estimate says it was too coarse (a large residue there), halve it.
        for refine in 0..3 {
            let Some(lay) = layout(&terms, &[z], refine, derivative) else {
                return Ok(None);
            };
            let grid = self.grid(&terms, lay.level, lay.nodes)?;
            let mut s = Sums::default();
            fixed_part(&terms, &grid, &lay, z, &mut s, derivative);
            for (c, &sigma) in terms.sigma.iter().enumerate() {
                class_sum(
                    &grid,
                    c,
                    sigma,
                    terms.has_minus[c],
                    z,
                    lay.small + 1,
                    lay.nodes,
                    &mut s,
                    derivative,
                );
            }
            let (v, met) = result(&s, &lay, prec);
            if met || refine == 2 {
                return Ok(Some(v));
            }
        }
        unreachable!("the loop returns at its last pass")
    }

    /// The uniform rule's node count at z, if it applies (for the cost model).
    pub(super) fn trapezoid_nodes(&self, z: Complex64) -> Option<usize> {
        let terms = self.grid_terms()?;
        layout(&terms, &[z], 0, false).map(|l| l.nodes)
    }
}
