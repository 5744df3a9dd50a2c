//! Convergence analysis (docs/math.md §2), and the common-step form the
//! integral needs: steps reduced by Gauss's multiplication formula
//! (docs/math.md §4a), and whether the Malmstén integrand is even in t
//! (docs/math.md §4b).

use super::{Condition, Convergence, GammaTerm, StepReduction, ANALYSIS_BITS};
use crate::factor::coef::Coef;
use rug::float::Constant;
use rug::{Float, Integer, Rational};

/// The convergence conditions (module docs; docs/math.md §2).
pub(super) fn analyse(terms: &[GammaTerm], normalised: bool) -> Convergence {
    let p = ANALYSIS_BITS;
    let half = Float::with_val(p, 0.5);
    let ln_2pi = Float::with_val(p, Float::with_val(p, Constant::Pi) * 2u32).ln();
    let vals: Vec<(Float, Float, Float, i64)> = terms
        .iter()
        .map(|t| {
            (
                t.step.value(p),
                t.offset.value(p),
                t.slope.value(p),
                t.power,
            )
        })
        .collect();
    let first_a = &vals[0].0;
    let common_step = vals.iter().all(|(a, ..)| {
        let d = Float::with_val(p, a - first_a).abs();
        d <= Float::with_val(p, first_a.clone().abs() >> 200u32)
    });
    type F = fn(&Float, &Float, &Float, &Float, &Float) -> Float;
    // (formula, meaning, only unnormalised, summand(a, b, s, ½, ln2π) · n)
    let specs: Vec<(&'static str, &'static str, bool, F)> = vec![
        (
            "Σ n·a = 0",
            "the k-th factor grows like k ln k",
            true,
            |a, _, _, _, _| a.clone(),
        ),
        (
            "Σ n·a·ln a = 0",
            "the k-th factor grows like k",
            true,
            |a, _, _, _, _| Float::with_val(a.prec(), a * Float::with_val(a.prec(), a.ln_ref())),
        ),
        (
            "Σ n·(b − ½) = 0",
            "the k-th factor grows like ln k",
            true,
            |_, b, _, h, _| Float::with_val(b.prec(), b - h),
        ),
        (
            "Σ n·s = 0",
            "the k-th factor grows like ln k, with a slope in z",
            false,
            |_, _, s, _, _| s.clone(),
        ),
        (
            "Σ n·((b − ½)·ln a + ½·ln 2π) = 0",
            "the k-th factor tends to a constant ≠ 0",
            true,
            |a, b, _, h, l| {
                let p = a.prec();
                Float::with_val(
                    p,
                    Float::with_val(p, b - h) * Float::with_val(p, a.ln_ref()),
                ) + Float::with_val(p, l * h)
            },
        ),
        (
            "Σ n·s·ln a = 0",
            "the k-th factor tends to a z-dependent constant",
            false,
            |a, _, s, _, _| Float::with_val(a.prec(), s * Float::with_val(a.prec(), a.ln_ref())),
        ),
        (
            "Σ n·B₂(b)/a = 0",
            "the k-th factor falls only like 1/k (the product diverges logarithmically)",
            true,
            |a, b, _, _, _| {
                let p = a.prec();
                let b2 = Float::with_val(p, b * b) - b + Float::with_val(p, 1) / 6u32;
                b2 / a
            },
        ),
        (
            "Σ n·s²/a = 0",
            "the k-th factor falls only like z²/k",
            false,
            |a, _, s, _, _| Float::with_val(a.prec(), s * s) / a,
        ),
        (
            "Σ n·s·(2b − 1)/a = 0",
            "the k-th factor falls only like z/k",
            false,
            |a, b, s, _, _| {
                let p = a.prec();
                Float::with_val(p, s * (Float::with_val(p, b * 2u32) - 1u32)) / a
            },
        ),
    ];
    let mut conditions = Vec::new();
    for (formula, meaning, only_unnorm, f) in specs {
        if only_unnorm && normalised {
            continue;
        }
        let mut sum = Float::with_val(p, 0);
        let mut scale = Float::with_val(p, 1);
        for (a, b, s, n) in &vals {
            let v = f(a, b, s, &half, &ln_2pi) * *n;
            scale = scale.max(&Float::with_val(p, v.clone().abs()));
            sum += v;
        }
        let tol = scale >> 180u32;
        let numeric = Float::with_val(p, sum.clone().abs()) <= tol;
        let exact = exact_condition(formula, terms);
        conditions.push(Condition {
            formula,
            meaning,
            value: sum.to_f64(),
            holds: exact.unwrap_or(numeric),
            exact: exact.is_some(),
        });
    }
    let reduction = if common_step {
        None
    } else {
        reduce_steps(terms).map(|(step, multiples)| StepReduction {
            step: step.label().to_string(),
            multiples,
        })
    };
    Convergence {
        conditions,
        common_step,
        reduction,
    }
}

/// Exact decision of a convergence condition when every coefficient is
/// rational; `None` where a coefficient is not, or where the logarithms of
/// the steps cannot be split over a coprime integer base.
///
/// A condition is `r₀ + Σ_q r_q ln q + r_π ln π` over a base of pairwise
/// coprime integers `q`; it vanishes iff every coefficient does, since logs of
/// pairwise coprime integers > 1 are linearly independent over Q and π is
/// transcendental (common practice).
fn exact_condition(formula: &str, terms: &[GammaTerm]) -> Option<bool> {
    let mut vals = Vec::with_capacity(terms.len());
    for t in terms {
        vals.push((
            t.step.exact()?.clone(),
            t.offset.exact()?.clone(),
            t.slope.exact()?.clone(),
            Rational::from(t.power),
        ));
    }
    let half = Rational::from((1, 2));
    let steps: Vec<Rational> = vals.iter().map(|v| v.0.clone()).collect();
    let base = coprime_base(&steps)?;
    // ln a = Σ_q e_q(a) ln q
    let exps = |a: &Rational| -> Vec<i64> {
        base.iter()
            .map(|q| valuation(a.numer(), q) - valuation(a.denom(), q))
            .collect()
    };
    // Every step must factor completely over the base, or no exact decision.
    for a in &steps {
        let e = exps(a);
        let mut num = Integer::from(1);
        let mut den = Integer::from(1);
        for (q, k) in base.iter().zip(&e) {
            let pw = rug::ops::Pow::pow(q.clone(), k.unsigned_abs() as u32);
            if *k > 0 {
                num *= pw;
            } else if *k < 0 {
                den *= pw;
            }
        }
        if Rational::from((num, den)) != a.clone().abs() {
            return None;
        }
    }
    let mut r0 = Rational::new();
    let mut logs = vec![Rational::new(); base.len()];
    let mut ln_pi = Rational::new();
    let mut ln2 = Rational::new();
    for (a, b, s, n) in &vals {
        let add_log = |logs: &mut Vec<Rational>, c: Rational| {
            for (slot, e) in logs.iter_mut().zip(exps(a)) {
                *slot += c.clone() * Rational::from(e);
            }
        };
        match formula {
            "Σ n·a = 0" => r0 += n.clone() * a,
            "Σ n·a·ln a = 0" => add_log(&mut logs, n.clone() * a),
            "Σ n·(b − ½) = 0" => r0 += n.clone() * (b.clone() - &half),
            "Σ n·s = 0" => r0 += n.clone() * s,
            "Σ n·((b − ½)·ln a + ½·ln 2π) = 0" => {
                add_log(&mut logs, n.clone() * (b.clone() - &half));
                ln2 += n.clone() * &half;
                ln_pi += n.clone() * &half;
            }
            "Σ n·s·ln a = 0" => add_log(&mut logs, n.clone() * s),
            "Σ n·B₂(b)/a = 0" => {
                let b2 = b.clone() * b - b + Rational::from((1, 6));
                r0 += n.clone() * b2 / a;
            }
            "Σ n·s²/a = 0" => r0 += n.clone() * s * s / a,
            "Σ n·s·(2b − 1)/a = 0" => {
                r0 += n.clone() * s * (b.clone() * 2u32 - 1u32) / a;
            }
            _ => return None,
        }
    }
    // ln 2 from ln 2π joins the base coefficient of the base element dividing 2.
    if ln2 != 0 {
        match base.iter().position(|q| q.is_divisible_u(2)) {
            Some(i) if base[i] == 2 => logs[i] += &ln2,
            Some(_) => return None,
            None => {
                if ln2 != 0 {
                    return Some(false);
                }
            }
        }
    }
    Some(r0 == 0 && ln_pi == 0 && logs.iter().all(|c| *c == 0))
}

/// A base of pairwise coprime integers > 1 in which every numerator and
/// denominator of `xs` factors (gcd refinement, no factoring needed).
fn coprime_base(xs: &[rug::Rational]) -> Option<Vec<Integer>> {
    let mut base: Vec<Integer> = Vec::new();
    let mut work: Vec<Integer> = xs
        .iter()
        .flat_map(|q| [q.numer().clone().abs(), q.denom().clone()])
        .filter(|x| *x > 1)
        .collect();
    let mut guard = 0;
    while let Some(mut x) = work.pop() {
        guard += 1;
        if guard > 10_000 {
            return None;
        }
        let mut i = 0;
        while i < base.len() && x > 1 {
            let g = Integer::from(x.gcd_ref(&base[i]));
            if g > 1 {
                let b = base.swap_remove(i);
                // split b and x by g; push the parts back for refinement
                let bq = Integer::from(&b / &g);
                x /= &g;
                work.push(g);
                if bq > 1 {
                    work.push(bq);
                }
                i = 0;
                continue;
            }
            i += 1;
        }
        if x > 1 {
            if base.contains(&x) {
                continue;
            }
            base.push(x);
        }
    }
    base.sort();
    base.dedup();
    // pairwise coprime check
    for i in 0..base.len() {
        for j in i + 1..base.len() {
            if Integer::from(base[i].gcd_ref(&base[j])) != 1 {
                return None;
            }
        }
    }
    Some(base)
}

/// The exponent of `q` in `x` where `q` is a base element (so `x` is a
/// product of powers of base elements times a unit).
fn valuation(x: &Integer, q: &Integer) -> i64 {
    let mut x = x.clone().abs();
    let mut e = 0;
    while x > 0 && x.is_divisible(q) {
        x /= q;
        e += 1;
    }
    e
}

/// The most gamma terms a step reduction may produce.
pub(super) const MAX_REDUCED_TERMS: u64 = 512;

/// Steps that are all exact rationals, written as integer multiples
/// `a_j = m_j a₀` of their greatest common divisor `a₀ = gcd(numerators) /
/// lcm(denominators)`; `None` if some step is not an exact rational, or if
/// `Σ m_j` exceeds [`MAX_REDUCED_TERMS`].
pub(super) fn reduce_steps(terms: &[GammaTerm]) -> Option<(Coef, Vec<u32>)> {
    let mut steps = Vec::with_capacity(terms.len());
    for t in terms {
        let q = t.step.exact()?.clone();
        if q <= 0 {
            return None;
        }
        steps.push(q);
    }
    let mut num = Integer::new();
    let mut den = Integer::from(1);
    for q in &steps {
        num = num.gcd(q.numer());
        den = den.lcm(q.denom());
    }
    let a0 = Rational::from((num, den));
    let mut multiples = Vec::with_capacity(steps.len());
    let mut total = 0u64;
    for q in &steps {
        let m = Rational::from(q / &a0);
        debug_assert!(*m.denom() == 1);
        let m = m.numer().to_u32()?;
        total += m as u64;
        multiples.push(m);
    }
    (total <= MAX_REDUCED_TERMS).then(|| (Coef::from_rational(a0), multiples))
}

/// `(b + r)/m` or `s/m` as a coefficient: exact when `c` is.
fn scaled(c: &Coef, r: u32, m: u32) -> Coef {
    match c.exact() {
        Some(q) => Coef::from_rational((q.clone() + r) / m),
        None => {
            let c = c.clone();
            Coef::computed(&format!("({} + {r})/{m}", c.label()), move |p| {
                (c.value(p) + r) / m
            })
        }
    }
}

/// The product over a common step `a₀` with the same k-th factors, by Gauss's
/// multiplication formula (DLMF 5.5.6) applied to each `Γ(m a₀ k + c)`:
/// `Γ(m w) = (2π)^{(1−m)/2} m^{m w − ½} Π_{r<m} Γ(w + r/m)`, `w = a₀ k + c/m`,
/// so the term `(m a₀, b, s, n)` becomes the `m` terms `(a₀, (b + r)/m, s/m, n)`.
/// The elementary prefactors multiply the k-th factor by
/// `exp(k a₀ Σ n m ln m + z Σ n s ln m + κ)`; the first two exponents vanish
/// by the convergence conditions and `κ = −(N'/2) ln 2π` with `N' = Σ n m`
/// (docs/math.md §4a), which cancels in a normalised product and vanishes
/// when `N' = 0`. Returns the new terms, or why there is none.
pub(super) fn common_step_terms(
    terms: &[GammaTerm],
    convergence: &Convergence,
    normalised: bool,
) -> std::result::Result<Vec<GammaTerm>, String> {
    let out = if convergence.common_step {
        terms.to_vec()
    } else {
        let Some((a0, multiples)) = reduce_steps(terms) else {
            return Err(
                "the integral form needs one common step, or steps that are exact rational \
                 multiples of one another (reduced to a common step by Gauss's multiplication \
                 formula); use the product form"
                    .into(),
            );
        };
        let mut out = Vec::new();
        for (t, &m) in terms.iter().zip(&multiples) {
            for r in 0..m {
                out.push(GammaTerm::new(
                    a0.clone(),
                    scaled(&t.offset, r, m),
                    scaled(&t.slope, 0, m),
                    t.power,
                ));
            }
        }
        out
    };
    if !normalised && out.iter().map(|t| t.power).sum::<i64>() != 0 {
        return Err(if convergence.common_step {
            "the integral form of an unnormalised product needs Σ n = 0; normalise the \
             product at a reference rapidity, or use the product form"
                .into()
        } else {
            "after reduction to a common step the powers do not sum to zero (Σ n·m ≠ 0), so the \
             k-th factors differ by the constant (2π)^(−Σ n·m / 2); normalise the product at a \
             reference rapidity, or use the product form"
                .into()
        });
    }
    Ok(out)
}

/// Whether the Malmstén integrand of common-step terms is even in t: with
/// `ω = a + 1`, `e^{−ct}/((1 − e^{−at})(1 − e^{−t}))` and the same with
/// `ω − c` are mirror images under `t → −t` up to sign, so the integrand is
/// even iff the powers of `(b, s)` and `(ω − b, −s)` cancel for every pair
/// (docs/math.md §4b). Exact for rational coefficients; otherwise at 256 bits
/// with a tolerance of `2^−180` (a wrong "even" would show in the error
/// estimate, which compares two step sizes).
pub(super) fn integrand_is_even(terms: &[GammaTerm]) -> bool {
    let exact: Option<Vec<(Rational, Rational, Rational, i64)>> = terms
        .iter()
        .map(|t| {
            Some((
                t.step.exact()?.clone(),
                t.offset.exact()?.clone(),
                t.slope.exact()?.clone(),
                t.power,
            ))
        })
        .collect();
    if let Some(v) = exact {
        let omega = Rational::from(&v[0].0 + 1u32);
        // Aggregate powers by (b, s), then check the mirror pairing.
        let mut agg: Vec<(Rational, Rational, i64)> = Vec::new();
        for (_, b, s, n) in &v {
            match agg.iter_mut().find(|(b2, s2, _)| b2 == b && s2 == s) {
                Some(e) => e.2 += n,
                None => agg.push((b.clone(), s.clone(), *n)),
            }
        }
        return agg.iter().all(|(b, s, n)| {
            let mb = Rational::from(&omega - b);
            let ms = Rational::from(-s);
            let m: i64 = agg
                .iter()
                .filter(|(b2, s2, _)| *b2 == mb && *s2 == ms)
                .map(|e| e.2)
                .sum();
            m == -n
        });
    }
    let p = ANALYSIS_BITS;
    let v: Vec<(Float, Float, i64)> = terms
        .iter()
        .map(|t| (t.offset.value(p), t.slope.value(p), t.power))
        .collect();
    let omega = terms[0].step.value(p) + 1u32;
    let close = |x: &Float, y: &Float| {
        let scale = Float::with_val(p, x.clone().abs()).max(&Float::with_val(p, 1));
        Float::with_val(p, x - y).abs() <= (scale >> 180u32)
    };
    let mut agg: Vec<(Float, Float, i64)> = Vec::new();
    for (b, s, n) in &v {
        match agg
            .iter_mut()
            .find(|(b2, s2, _)| close(b2, b) && close(s2, s))
        {
            Some(e) => e.2 += n,
            None => agg.push((b.clone(), s.clone(), *n)),
        }
    }
    agg.iter().all(|(b, s, n)| {
        let mb = Float::with_val(p, &omega - b);
        let ms = Float::with_val(p, -s);
        let m: i64 = agg
            .iter()
            .filter(|(b2, s2, _)| close(b2, &mb) && close(s2, &ms))
            .map(|e| e.2)
            .sum();
        m == -n
    })
}
