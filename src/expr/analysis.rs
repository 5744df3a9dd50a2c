//! Static analysis: names used, affine decomposition, exact rational value.

use super::node::{Factor, Node, Number, Term};
use rug::Rational;
use std::collections::BTreeSet;

/// Above this many bits an exact power is not attempted (`to_rational`
/// returns `None`).
pub(crate) const MAX_RATIONAL_BITS: u64 = 1 << 20;

/// Visits every node, parents first.
pub(crate) fn walk<'a>(n: &'a Node, f: &mut impl FnMut(&'a Node)) {
    f(n);
    match n {
        Node::Number(_) | Node::I | Node::Pi | Node::Var(_) => {}
        Node::Neg(x) => walk(x, f),
        Node::Sum(ts) => ts.iter().for_each(|t| walk(&t.node, f)),
        Node::Product(fs) => fs.iter().for_each(|x| walk(&x.node, f)),
        Node::Pow(b, e) => {
            walk(b, f);
            walk(e, f);
        }
        Node::Call(_, args) | Node::UserCall(_, args) => args.iter().for_each(|a| walk(a, f)),
    }
}

pub(crate) fn free_variables(n: &Node) -> BTreeSet<String> {
    let mut out = BTreeSet::new();
    walk(n, &mut |m| {
        if let Node::Var(v) = m {
            out.insert(v.clone());
        }
    });
    out
}

pub(crate) fn user_functions(n: &Node) -> BTreeSet<String> {
    let mut out = BTreeSet::new();
    walk(n, &mut |m| {
        if let Node::UserCall(name, _) = m {
            out.insert(name.clone());
        }
    });
    out
}

pub(crate) fn depends_on(n: &Node, var: &str) -> bool {
    let mut found = false;
    walk(n, &mut |m| {
        if matches!(m, Node::Var(v) if v == var) {
            found = true;
        }
    });
    found
}

fn int(n: u32) -> Node {
    Node::Number(Number::int(n))
}

fn is_int(n: &Node, k: u32) -> bool {
    matches!(n, Node::Number(x) if x.is_int(k))
}

/// `-x`, folding `--x` and `-0`.
pub(crate) fn neg(x: Node) -> Node {
    match x {
        Node::Neg(inner) => *inner,
        z if is_int(&z, 0) => z,
        other => Node::Neg(Box::new(other)),
    }
}

/// A sum of signed terms: nested sums flattened, zeros dropped, a negated
/// first term written as a negation.
pub(crate) fn sum(terms: Vec<Term>) -> Node {
    let mut flat: Vec<Term> = Vec::new();
    for t in terms {
        match t.node {
            Node::Sum(inner) => flat.extend(inner.into_iter().map(|u| Term {
                negated: u.negated != t.negated,
                node: u.node,
            })),
            z if is_int(&z, 0) => {}
            node => flat.push(Term {
                negated: t.negated,
                node,
            }),
        }
    }
    if flat.is_empty() {
        return int(0);
    }
    if flat[0].negated {
        let first = flat.remove(0);
        flat.insert(
            0,
            Term {
                negated: false,
                node: neg(first.node),
            },
        );
    }
    if flat.len() == 1 {
        return flat.swap_remove(0).node;
    }
    Node::Sum(flat)
}

/// A product: nested (multiplied) products flattened, ones dropped, zero
/// if a multiplied factor is zero, never starting with a divisor.
pub(crate) fn product(factors: Vec<Factor>) -> Node {
    let mut flat: Vec<Factor> = Vec::new();
    for x in factors {
        match x.node {
            Node::Product(inner) if !x.inverted => flat.extend(inner),
            o if is_int(&o, 1) => {}
            node => flat.push(Factor {
                inverted: x.inverted,
                node,
            }),
        }
    }
    if flat.iter().any(|x| !x.inverted && is_int(&x.node, 0)) {
        return int(0);
    }
    if let Some(k) = flat.iter().position(|x| !x.inverted) {
        let first = flat.remove(k);
        flat.insert(0, first);
    } else {
        flat.insert(
            0,
            Factor {
                inverted: false,
                node: int(1),
            },
        );
    }
    if flat.len() == 1 {
        return flat.swap_remove(0).node;
    }
    Node::Product(flat)
}

/// `(a, b)` with `n = a + b·var`, both free of `var`.
pub(crate) fn affine(n: &Node, var: &str) -> Option<(Node, Node)> {
    if !depends_on(n, var) {
        return Some((n.clone(), int(0)));
    }
    match n {
        Node::Var(_) => Some((int(0), int(1))),
        Node::Neg(x) => {
            let (a, b) = affine(x, var)?;
            Some((neg(a), neg(b)))
        }
        Node::Sum(terms) => {
            let (mut ra, mut rb) = (Vec::new(), Vec::new());
            for t in terms {
                let (a, b) = affine(&t.node, var)?;
                ra.push(Term {
                    negated: t.negated,
                    node: a,
                });
                rb.push(Term {
                    negated: t.negated,
                    node: b,
                });
            }
            Some((sum(ra), sum(rb)))
        }
        Node::Product(factors) => {
            let mut dependent = factors
                .iter()
                .enumerate()
                .filter(|(_, x)| depends_on(&x.node, var));
            let (k, x) = dependent.next()?;
            if dependent.next().is_some() || x.inverted {
                return None;
            }
            let (a, b) = affine(&x.node, var)?;
            let with = |node: Node| {
                let mut fs = factors.clone();
                fs[k] = Factor {
                    inverted: false,
                    node,
                };
                product(fs)
            };
            Some((with(a), with(b)))
        }
        Node::Pow(base, e) => {
            if depends_on(e, var) || rational(e, &|_| None) != Some(Rational::from(1)) {
                return None;
            }
            affine(base, var)
        }
        _ => None,
    }
}

/// The exact value, when the tree is rational (see `Expr::to_rational`).
pub(crate) fn rational(n: &Node, env: &dyn Fn(&str) -> Option<Rational>) -> Option<Rational> {
    match n {
        Node::Number(x) => Some(x.value().clone()),
        Node::Var(v) => env(v),
        Node::Neg(x) => Some(-rational(x, env)?),
        Node::Sum(terms) => {
            let mut acc = Rational::new();
            for t in terms {
                let v = rational(&t.node, env)?;
                if t.negated {
                    acc -= v;
                } else {
                    acc += v;
                }
            }
            Some(acc)
        }
        Node::Product(factors) => {
            let mut acc = Rational::from(1);
            for x in factors {
                let v = rational(&x.node, env)?;
                if x.inverted {
                    if v == 0 {
                        return None;
                    }
                    acc /= v;
                } else {
                    acc *= v;
                }
            }
            Some(acc)
        }
        Node::Pow(b, e) => {
            let e = rational(e, env)?;
            if *e.denom() != 1 {
                return None;
            }
            let n = e.numer().to_i32()?;
            let b = rational(b, env)?;
            if b == 0 {
                return match n {
                    0 => Some(Rational::from(1)),
                    k if k > 0 => Some(Rational::new()),
                    _ => None,
                };
            }
            let bits = (b.numer().significant_bits() + b.denom().significant_bits()) as u64;
            if bits.saturating_mul(n.unsigned_abs() as u64) > MAX_RATIONAL_BITS {
                return None;
            }
            use rug::ops::Pow;
            Some(b.pow(n))
        }
        Node::I | Node::Pi | Node::Call(..) | Node::UserCall(..) => None,
    }
}
