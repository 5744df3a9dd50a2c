//! Node tables of the three double-exponential maps and their cache.
//!
//! A table holds the nodes of one level (`h = 2^-k`) of one map at one
//! working precision, on the standard variable: the distance of the node to
//! the endpoint it approaches (`1 − |u|` on `[−1, 1]`, `y` on `[0, ∞)`) and
//! the weight `dx/dt` of the map. Level 0 holds `t = 0, ±1, ±2, …`; level
//! `k ≥ 1` only the odd multiples `±(2j − 1)·2^-k`, so the sum of levels
//! `0..=k` is the trapezoidal sum with step `2^-k`.

use crate::num::RealField;
use rug::float::Constant;
use rug::Float;
use std::any::{Any, TypeId};
use std::collections::HashMap;
use std::hash::{BuildHasherDefault, Hasher};
use std::sync::{Arc, RwLock};

/// The tables reach at least where the node's distance to its endpoint falls
/// below `2^(−DEPTH·wp)`, so that an endpoint singularity `d^(−α)` with
/// `α < 1 − 1/DEPTH` still has negligible tails (`d^(1−α) < 2^−wp`).
pub(crate) const DEPTH: u32 = 4;

/// The exp-exp map's right end: at least `x = EXP_REACH · wp`, enough for
/// integrands decaying like `e^(−c x)` with `c ≥ ln 2 / EXP_REACH ≈ 0.011`.
pub(crate) const EXP_REACH: u32 = 64;

/// Which map.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash)]
pub(crate) enum Kind {
    /// `u = tanh(π/2 sinh t)` on `[−1, 1]`.
    TanhSinh,
    /// `y = exp(π/2 sinh t)` on `[0, ∞)`.
    ExpSinh,
    /// `y = exp(t − e^−t)` on `[0, ∞)`.
    ExpExp,
}

impl Kind {
    /// The reach `T` of a side (`plus`: t > 0) at working precision `wp`:
    /// the first integer `t` where the node is as deep as required (distance
    /// `2^(−DEPTH·wp)`, or `x = EXP_REACH·wp` on the right of exp-exp). A
    /// table holds the nodes with `0 < |t| ≤ T`, so level 0 has a node at
    /// exactly `±T`, whose term measures the truncation error, and the
    /// reach does not depend on the level.
    pub fn reach(self, plus: bool, wp: u32) -> u32 {
        let deep = (DEPTH * wp) as f64;
        let log2e = std::f64::consts::LOG2_E;
        let half_pi = std::f64::consts::FRAC_PI_2;
        let deep_enough = |t: f64| -> bool {
            match (self, plus) {
                // log2(1 − |u|) = log2(2/(e^{2s} + 1)) ≈ 1 − 2s·log2 e
                (Kind::TanhSinh, _) => 1.0 - 2.0 * half_pi * t.sinh() * log2e <= -deep,
                // log2 y = ±s·log2 e
                (Kind::ExpSinh, _) => half_pi * t.sinh() * log2e >= deep,
                // x = exp(t − e^−t)
                (Kind::ExpExp, true) => t - (-t).exp() >= ((EXP_REACH * wp) as f64).ln(),
                // log2 x = −(t + e^t)·log2 e
                (Kind::ExpExp, false) => (t + t.exp()) * log2e >= deep,
            }
        };
        let mut t = 1u32;
        while !deep_enough(t as f64) {
            t += 1;
        }
        t
    }
}

/// The number of nodes of one side at `level` with `|t| ≤ reach`: `t = j`
/// (level 0) or `t = (2j − 1)·2^-level`, `j = 1, 2, …`.
fn count(level: u32, reach: u32) -> usize {
    if level == 0 {
        reach as usize
    } else {
        (reach as usize) << (level - 1)
    }
}

/// One level of one map: `(distance, weight)` pairs in increasing `|t|`.
pub(crate) struct Table<R> {
    /// The node at `t = 0` (level 0 only).
    pub center: Option<(R, R)>,
    /// Nodes at `t > 0`.
    pub plus: Vec<(R, R)>,
    /// Nodes at `t < 0`; `None` where the map is symmetric (tanh-sinh), so
    /// the minus side is the plus side mirrored.
    pub minus: Option<Vec<(R, R)>>,
}

impl<R> Table<R> {
    /// The minus side (the plus side where the map is symmetric).
    pub fn minus(&self) -> &[(R, R)] {
        self.minus.as_deref().unwrap_or(&self.plus)
    }
}

#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash)]
struct Key {
    kind: Kind,
    real: TypeId,
    wp: u32,
    level: u32,
}

type Entry = Arc<dyn Any + Send + Sync>;

/// FNV-1a: the keys are a few small integers, looked up once per level, and
/// need no protection against collisions by an adversary.
#[derive(Default)]
struct Fnv(u64);

impl Hasher for Fnv {
    fn finish(&self) -> u64 {
        self.0
    }
    fn write(&mut self, bytes: &[u8]) {
        let mut h = if self.0 == 0 {
            0xcbf2_9ce4_8422_2325
        } else {
            self.0
        };
        for b in bytes {
            h = (h ^ *b as u64).wrapping_mul(0x0100_0000_01b3);
        }
        self.0 = h;
    }
}

/// Tables by (map, real type, working precision, level), shared between
/// threads. A missing table is built outside the lock; two threads asking for
/// the same missing table at once may both build it, and the first insert wins.
#[derive(Default)]
pub(crate) struct Cache {
    map: RwLock<HashMap<Key, Entry, BuildHasherDefault<Fnv>>>,
}

impl Cache {
    /// The table, from the cache, by rounding a cached table of higher
    /// precision, or computed afresh.
    pub fn get<R: RealField>(&self, kind: Kind, wp: u32, level: u32) -> Arc<Table<R>> {
        let key = Key {
            kind,
            real: TypeId::of::<R>(),
            wp,
            level,
        };
        let higher = {
            let map = self.map.read().unwrap_or_else(|e| e.into_inner());
            if let Some(t) = map.get(&key) {
                return downcast(t.clone());
            }
            // The nearest cached precision above `wp` with the same grid.
            map.iter()
                .filter(|(k, _)| {
                    k.kind == kind && k.real == key.real && k.level == level && k.wp > wp
                })
                .min_by_key(|(k, _)| k.wp)
                .map(|(_, t)| t.clone())
        };
        let table: Table<R> = match higher {
            Some(t) => round_table(&downcast::<R>(t), kind, wp, level),
            None => compute::<R>(kind, wp, level),
        };
        let entry: Entry = Arc::new(table);
        let mut map = self.map.write().unwrap_or_else(|e| e.into_inner());
        downcast(map.entry(key).or_insert(entry).clone())
    }

    /// Number of cached tables.
    pub fn len(&self) -> usize {
        self.map.read().unwrap_or_else(|e| e.into_inner()).len()
    }

    /// Drops every table.
    pub fn clear(&self) {
        self.map.write().unwrap_or_else(|e| e.into_inner()).clear();
    }
}

fn downcast<R: RealField>(e: Entry) -> Arc<Table<R>> {
    e.downcast::<Table<R>>()
        .unwrap_or_else(|_| unreachable!("cache keys carry the TypeId of the table's real type"))
}

/// A table of higher precision rounded to `wp` bits and cut to the reach of
/// `wp` (the grid of a level does not depend on the precision; only the
/// reach does).
fn round_table<R: RealField>(t: &Table<R>, kind: Kind, wp: u32, level: u32) -> Table<R> {
    let side = |v: &[(R, R)], plus: bool| -> Vec<(R, R)> {
        v.iter()
            .take(count(level, kind.reach(plus, wp)))
            .map(|(d, w)| (d.with_prec(wp), w.with_prec(wp)))
            .collect()
    };
    Table {
        center: t
            .center
            .as_ref()
            .map(|(d, w)| (d.with_prec(wp), w.with_prec(wp))),
        plus: side(&t.plus, true),
        minus: t.minus.as_ref().map(|m| side(m, false)),
    }
}

/// `x` (computed with extra bits) rounded into `R` at `wp` bits.
fn to_real<R: RealField>(x: &Float, wp: u32) -> R {
    R::from_float(&Float::with_val(wp, x))
}

/// Computes one level's nodes in MPFR with extra bits and rounds them.
fn compute<R: RealField>(kind: Kind, wp: u32, level: u32) -> Table<R> {
    // Extra bits cover the recurrence for e^t (one rounding per step, at most
    // ~2^(level+4) steps) and the few operations per node.
    let p = wp + 32 + level;
    let pi = Float::with_val(p, Constant::Pi);
    let half_pi = Float::with_val(p, &pi / 2u32);
    let one = Float::with_val(p, 1u32);

    // t_j = t0 + j·step.
    let (t0, step) = if level == 0 {
        (Float::with_val(p, 1u32), Float::with_val(p, 1u32))
    } else {
        (
            Float::with_val(p, Float::i_exp(1, -(level as i32))),
            Float::with_val(p, Float::i_exp(1, 1 - level as i32)),
        )
    };
    let e_step = step.exp();
    let mut et = t0.exp();

    let center = (level == 0).then(|| match kind {
        Kind::TanhSinh | Kind::ExpSinh => (one.clone(), half_pi.clone()),
        Kind::ExpExp => {
            let x = Float::with_val(p, -1i32).exp();
            let w = Float::with_val(p, &x * 2u32);
            (x, w)
        }
    });

    let n_plus = count(level, kind.reach(true, wp));
    let n_minus = if kind == Kind::TanhSinh {
        0
    } else {
        count(level, kind.reach(false, wp))
    };
    let mut plus = Vec::with_capacity(n_plus);
    let mut minus = Vec::with_capacity(n_minus);
    for j in 0..n_plus.max(n_minus) {
        let iet = Float::with_val(p, one.clone() / &et);
        match kind {
            Kind::TanhSinh => {
                // s = π/2 sinh t, q = e^−2s; d = 1 − tanh s = 2q/(1+q),
                // w = (π/2) cosh t / cosh² s = 2π cosh t · q/(1+q)².
                let sinh = Float::with_val(p, &et - &iet) / 2u32;
                let cosh = Float::with_val(p, &et + &iet) / 2u32;
                let s = Float::with_val(p, &half_pi * &sinh);
                let q = Float::with_val(p, -(s * 2u32)).exp();
                let q1 = Float::with_val(p, &q + 1u32);
                let d = Float::with_val(p, &q * 2u32) / &q1;
                let w = Float::with_val(p, &pi * 2u32) * cosh * &q / q1.square();
                plus.push((to_real::<R>(&d, wp), to_real::<R>(&w, wp)));
            }
            Kind::ExpSinh => {
                // y± = e^±s, w± = (π/2) cosh t · y±.
                let sinh = Float::with_val(p, &et - &iet) / 2u32;
                let cosh = Float::with_val(p, &et + &iet) / 2u32;
                let s = Float::with_val(p, &half_pi * &sinh);
                let yp = s.exp();
                let ym = Float::with_val(p, one.clone() / &yp);
                let c = Float::with_val(p, &half_pi * &cosh);
                let wp_ = Float::with_val(p, &c * &yp);
                let wm = Float::with_val(p, &c * &ym);
                plus.push((to_real::<R>(&yp, wp), to_real::<R>(&wp_, wp)));
                minus.push((to_real::<R>(&ym, wp), to_real::<R>(&wm, wp)));
            }
            Kind::ExpExp => {
                // y(t) = exp(t − e^−t), w(t) = y(t)·(1 + e^−t):
                // y+ = e^t · exp(−e^−t), y− = e^−t · exp(−e^t).
                if j < n_plus {
                    let yp = Float::with_val(p, -iet.clone()).exp() * &et;
                    let w = Float::with_val(p, &iet + 1u32) * &yp;
                    plus.push((to_real::<R>(&yp, wp), to_real::<R>(&w, wp)));
                }
                if j < n_minus {
                    let ym = Float::with_val(p, -et.clone()).exp() * &iet;
                    let w = Float::with_val(p, &et + 1u32) * &ym;
                    minus.push((to_real::<R>(&ym, wp), to_real::<R>(&w, wp)));
                }
            }
        }
        et *= &e_step;
    }
    Table {
        center: center.map(|(d, w)| (to_real::<R>(&d, wp), to_real::<R>(&w, wp))),
        plus,
        minus: (kind != Kind::TanhSinh).then_some(minus),
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn tanh_sinh_level0_matches_direct_formula() {
        let t: Table<f64> = compute(Kind::TanhSinh, 53, 0);
        let (d, w) = t.plus[0];
        let s = std::f64::consts::FRAC_PI_2 * 1f64.sinh();
        assert!((d - (1.0 - s.tanh())).abs() < 1e-15);
        let wd = std::f64::consts::FRAC_PI_2 * 1f64.cosh() / s.cosh().powi(2);
        assert!((w - wd).abs() < 1e-15);
    }

    #[test]
    fn reach_is_deep_enough() {
        for wp in [53, 365, 1000] {
            let deep = -((DEPTH * wp) as f64);
            let t: Table<Float> = compute(Kind::TanhSinh, wp, 0);
            let last = &t.plus.last().unwrap().0;
            assert!(last.log2_abs() <= deep);
            let before = &t.plus[t.plus.len() - 2].0;
            assert!(before.log2_abs() > deep);
            let t: Table<Float> = compute(Kind::ExpExp, wp, 0);
            assert!(t.minus().last().unwrap().0.log2_abs() <= deep);
            assert!(t.plus.last().unwrap().0.to_f64() >= (EXP_REACH * wp) as f64);
            let t: Table<f64> = compute(Kind::ExpSinh, wp.min(53), 0);
            assert!(t.plus.last().unwrap().0.is_finite());
        }
    }

    #[test]
    fn rounding_a_higher_table_matches_direct() {
        let c = Cache::default();
        let hi: Arc<Table<Float>> = c.get(Kind::ExpSinh, 400, 2);
        let lo: Arc<Table<Float>> = c.get(Kind::ExpSinh, 200, 2);
        let direct: Table<Float> = compute(Kind::ExpSinh, 200, 2);
        assert!(hi.plus.len() > lo.plus.len());
        assert_eq!(lo.plus.len(), count(2, Kind::ExpSinh.reach(true, 200)));
        assert_eq!(lo.plus.len(), direct.plus.len());
        assert_eq!(lo.minus().len(), direct.minus().len());
        for (a, b) in lo.plus.iter().zip(&direct.plus) {
            // Double rounding (432 → 400 → 200 bits) may move the last bit.
            let rel = |x: &Float, y: &Float| Float::with_val(300, x - y).log2_abs() - y.log2_abs();
            assert!(rel(&a.0, &b.0) <= -199.0);
            assert!(rel(&a.1, &b.1) <= -199.0);
        }
    }
}
