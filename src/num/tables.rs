//! Per-precision tables of constants and series coefficients.
//!
//! Series coefficients (Stirling, Euler–Maclaurin) and constants (π, ln 2π)
//! are computed once per precision and shared. The double path keeps one
//! lock-free slot per table; the arbitrary-precision path keeps a map keyed
//! by precision. A table can grow: asking for more entries than cached
//! rebuilds it at the larger length.

use std::collections::HashMap;
use std::sync::{Arc, OnceLock, RwLock};

/// Which table.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash)]
#[repr(u8)]
pub enum TableKind {
    /// `B_{2k} / (2k (2k − 1))`, k = 1, 2, … (log Γ Stirling series).
    StirlingLogGamma = 0,
    /// `B_{2k} / (2k)`, k = 1, 2, … (ψ asymptotic series).
    StirlingDigamma = 1,
    /// `B_{2k} / (2k)!`, k = 1, 2, … (Euler–Maclaurin).
    EulerMaclaurin = 2,
    /// `B_{2k+2} / (2k (2k + 2))`, k = 1, 2, … (log G asymptotic series).
    BarnesG = 3,
    /// Constants: `[π, ln 2π, ½ ln 2π, γ, ζ'(−1)]`.
    Constants = 4,
    /// `ζ(k) − 1` for k = 0, 1, 2, … (entries 0 and 1 unused).
    ZetaMinusOne = 5,
}

const N_KINDS: usize = 6;

/// Indices into the [`TableKind::Constants`] table.
pub(crate) mod constant {
    pub const PI: usize = 0;
    pub const LN_2PI: usize = 1;
    pub const HALF_LN_2PI: usize = 2;
    pub const EULER_GAMMA: usize = 3;
    pub const ZETA_PRIME_MINUS_ONE: usize = 4;
    pub const COUNT: usize = 5;
}

/// Tables keyed by (kind, precision).
type PrecMap<R> = HashMap<(u8, u32), Arc<Vec<R>>>;

/// A cache of tables for one real type.
pub(crate) struct TableCache<R> {
    /// Used when the type has one fixed precision (the double path).
    fixed: [OnceLock<Vec<R>>; N_KINDS],
    /// Keyed by (kind, precision).
    by_prec: RwLock<PrecMap<R>>,
}

impl<R: Clone + Send + Sync + 'static> TableCache<R> {
    pub(crate) fn new() -> Self {
        TableCache {
            fixed: std::array::from_fn(|_| OnceLock::new()),
            by_prec: RwLock::new(HashMap::new()),
        }
    }

    /// A table of at least `len` entries for a fixed-precision type.
    /// `build(len)` must return at least `len` entries; the fixed slot is
    /// built once with `fixed_len` entries, so `len` must not exceed it.
    pub(crate) fn fixed(
        &self,
        kind: TableKind,
        fixed_len: usize,
        build: impl FnOnce(usize) -> Vec<R>,
    ) -> &[R] {
        self.fixed[kind as usize].get_or_init(|| build(fixed_len))
    }

    /// A table of at least `len` entries at precision `prec`.
    pub(crate) fn get(
        &self,
        kind: TableKind,
        prec: u32,
        len: usize,
        build: impl FnOnce(usize) -> Vec<R>,
    ) -> Arc<Vec<R>> {
        let key = (kind as u8, prec);
        if let Some(t) = self.by_prec.read().expect("table cache poisoned").get(&key) {
            if t.len() >= len {
                return Arc::clone(t);
            }
        }
        // Grow geometrically so repeated small extensions stay cheap.
        let old = self
            .by_prec
            .read()
            .expect("table cache poisoned")
            .get(&key)
            .map_or(0, |t| t.len());
        let want = len.max(old * 3 / 2).max(8);
        let t = Arc::new(build(want));
        self.by_prec
            .write()
            .expect("table cache poisoned")
            .insert(key, Arc::clone(&t));
        t
    }
}
