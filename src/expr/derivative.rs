//! Symbolic differentiation of the syntax tree, for the kernel
//! `d/dθ log S` of expression pieces (no finite differences).
//!
//! The rules are the textbook ones (chain, product and quotient rules; the
//! derivatives of the elementary functions, DLMF 4.20–4.35; ψ = Γ'/Γ,
//! DLMF 5.2.2; ψ⁽ⁿ⁾' = ψ⁽ⁿ⁺¹⁾; `d/dw log G(w) = (w − 1)ψ(w) − w + (1 + ln 2π)/2`,
//! from DLMF 5.17.4 differentiated). Exact zeros are propagated so that the
//! result stays the size of the input.

use super::node::{Builtin, Factor, Node, Number, Term};
/// What cannot be differentiated, in words.
type Result<T> = std::result::Result<T, String>;

/// `d node / dx`, where `wrt` gives the derivative of each variable that
/// depends on x (e.g. `theta → 1`, `z → 1/(i*pi)`); every other name is a
/// constant. `Ok(None)` is an exact zero.
pub(crate) fn derivative(node: &Node, wrt: &[(&str, Node)]) -> Result<Option<Node>> {
    Ok(match node {
        Node::Number(_) | Node::I | Node::Pi => None,
        Node::Var(name) => wrt.iter().find(|(n, _)| n == name).map(|(_, d)| d.clone()),
        Node::Neg(x) => derivative(x, wrt)?.map(neg),
        Node::Sum(terms) => {
            let mut out = Vec::new();
            for t in terms {
                if let Some(d) = derivative(&t.node, wrt)? {
                    out.push(Term {
                        negated: t.negated,
                        node: d,
                    });
                }
            }
            sum(out)
        }
        Node::Product(factors) => product_rule(factors, wrt)?,
        Node::Pow(b, e) => {
            let db = derivative(b, wrt)?;
            let de = derivative(e, wrt)?;
            match (db, de) {
                (None, None) => None,
                // (b^e)' = e b^(e−1) b'  for constant e
                (Some(db), None) => Some(mul(vec![
                    (**e).clone(),
                    pow((**b).clone(), add((**e).clone(), -1)),
                    db,
                ])),
                // (b^e)' = b^e (e' log b + e b'/b)
                (db, Some(de)) => {
                    let mut terms = vec![Term {
                        negated: false,
                        node: mul(vec![de, call(Builtin::Log, (**b).clone())]),
                    }];
                    if let Some(db) = db {
                        terms.push(Term {
                            negated: false,
                            node: Node::Product(vec![
                                plain((**e).clone()),
                                plain(db),
                                inv((**b).clone()),
                            ]),
                        });
                    }
                    Some(mul(vec![node.clone(), sum(terms).expect("non-empty")]))
                }
            }
        }
        Node::Call(f, args) => call_rule(*f, args, wrt)?,
        Node::UserCall(name, _) => {
            return Err(format!(
                "cannot differentiate the call of `{name}`: only built-in functions have \
                 derivatives here"
            ))
        }
    })
}

/// `d log(node) / dx`, simplified where the logarithm splits: a product
/// gives `Σ ± dlog f_i`, a constant power `n·dlog b`, `exp(u)` gives `du`,
/// a negation nothing new; anything else is `d node / node`. Besides being
/// shorter, this keeps the error of `value'/value` from being the sum of
/// two large, correlated errors (`d/dθ log e^{i g sinh θ}` is
/// `i g cosh θ`, not `e^{…}·i g cosh θ / e^{…}`).
pub(crate) fn log_derivative(node: &Node, wrt: &[(&str, Node)]) -> Result<Option<Node>> {
    match node {
        Node::Neg(x) => log_derivative(x, wrt),
        Node::Product(factors) => {
            let mut terms = Vec::new();
            for f in factors {
                if let Some(d) = log_derivative(&f.node, wrt)? {
                    terms.push(Term {
                        negated: f.inverted,
                        node: d,
                    });
                }
            }
            Ok(sum(terms))
        }
        Node::Pow(b, e) if derivative(e, wrt)?.is_none() => {
            Ok(log_derivative(b, wrt)?.map(|d| mul(vec![(**e).clone(), d])))
        }
        Node::Call(Builtin::Exp, args) => derivative(&args[0], wrt),
        other => {
            Ok(derivative(other, wrt)?.map(|d| Node::Product(vec![plain(d), inv(other.clone())])))
        }
    }
}

fn call_rule(f: Builtin, args: &[Node], wrt: &[(&str, Node)]) -> Result<Option<Node>> {
    if f == Builtin::Polygamma {
        if derivative(&args[0], wrt)?.is_some() {
            return Err("polygamma(n, z) cannot be differentiated in its order n".into());
        }
        let Some(du) = derivative(&args[1], wrt)? else {
            return Ok(None);
        };
        let next = Node::Call(
            Builtin::Polygamma,
            vec![add(args[0].clone(), 1), args[1].clone()],
        );
        return Ok(Some(mul(vec![next, du])));
    }
    let u = &args[0];
    let Some(du) = derivative(u, wrt)? else {
        return Ok(None);
    };
    let c = |b: Builtin| call(b, u.clone());
    let outer = match f {
        Builtin::Exp => c(Builtin::Exp),
        Builtin::Log => return Ok(Some(Node::Product(vec![plain(du), inv(u.clone())]))),
        Builtin::Sqrt => {
            return Ok(Some(Node::Product(vec![
                plain(du),
                inv(Node::Number(Number::int(2))),
                inv(c(Builtin::Sqrt)),
            ])))
        }
        Builtin::Sin => c(Builtin::Cos),
        Builtin::Cos => neg(c(Builtin::Sin)),
        Builtin::Tan => {
            return Ok(Some(Node::Product(vec![
                plain(du),
                inv(pow(c(Builtin::Cos), Node::Number(Number::int(2)))),
            ])))
        }
        Builtin::Sinh => c(Builtin::Cosh),
        Builtin::Cosh => c(Builtin::Sinh),
        Builtin::Tanh => {
            return Ok(Some(Node::Product(vec![
                plain(du),
                inv(pow(c(Builtin::Cosh), Node::Number(Number::int(2)))),
            ])))
        }
        Builtin::Gamma => mul(vec![c(Builtin::Gamma), c(Builtin::Digamma)]),
        Builtin::RGamma => neg(mul(vec![c(Builtin::RGamma), c(Builtin::Digamma)])),
        Builtin::LogGamma => c(Builtin::Digamma),
        Builtin::Digamma => Node::Call(
            Builtin::Polygamma,
            vec![Node::Number(Number::int(1)), u.clone()],
        ),
        Builtin::BarnesG => mul(vec![c(Builtin::BarnesG), log_barnes_prime(u)]),
        Builtin::LogBarnesG => log_barnes_prime(u),
        Builtin::Polygamma => unreachable!("handled above"),
    };
    Ok(Some(mul(vec![outer, du])))
}

/// `(u − 1)ψ(u) − u + (1 + log(2π))/2`.
fn log_barnes_prime(u: &Node) -> Node {
    let half = |n: Node| Node::Product(vec![plain(n), inv(Node::Number(Number::int(2)))]);
    let two_pi = mul(vec![Node::Number(Number::int(2)), Node::Pi]);
    Node::Sum(vec![
        Term {
            negated: false,
            node: mul(vec![add(u.clone(), -1), call(Builtin::Digamma, u.clone())]),
        },
        Term {
            negated: true,
            node: u.clone(),
        },
        Term {
            negated: false,
            node: half(add(call(Builtin::Log, two_pi), 1)),
        },
    ])
}

/// The product rule over `f₀ · f₁ / f₂ …`: `Σ_i (±f_i'/f_i)·Π`, written
/// without dividing by a multiplied factor (so zeros of a factor are no
/// division by zero): a multiplied factor's term is `f_i' · Π_{j≠i}`, a
/// divided one's `−f_i' / f_i · Π`.
fn product_rule(factors: &[Factor], wrt: &[(&str, Node)]) -> Result<Option<Node>> {
    let mut terms = Vec::new();
    for (i, f) in factors.iter().enumerate() {
        let Some(d) = derivative(&f.node, wrt)? else {
            continue;
        };
        let mut rest: Vec<Factor> = factors
            .iter()
            .enumerate()
            .filter(|(j, _)| *j != i)
            .map(|(_, g)| g.clone())
            .collect();
        if f.inverted {
            // (1/g)' = −g'/g²
            rest.push(inv(f.node.clone()));
            rest.push(inv(f.node.clone()));
        }
        rest.insert(0, plain(d));
        terms.push(Term {
            negated: f.inverted,
            node: Node::Product(rest),
        });
    }
    Ok(sum(terms))
}

fn plain(node: Node) -> Factor {
    Factor {
        inverted: false,
        node,
    }
}

fn inv(node: Node) -> Factor {
    Factor {
        inverted: true,
        node,
    }
}

fn neg(node: Node) -> Node {
    match node {
        Node::Neg(x) => *x,
        other => Node::Neg(Box::new(other)),
    }
}

fn mul(nodes: Vec<Node>) -> Node {
    let mut nodes: Vec<Node> = nodes
        .into_iter()
        .filter(|n| !matches!(n, Node::Number(x) if x.is_int(1)))
        .collect();
    match nodes.len() {
        0 => Node::Number(Number::int(1)),
        1 => nodes.pop().expect("one"),
        _ => Node::Product(nodes.into_iter().map(plain).collect()),
    }
}

fn sum(terms: Vec<Term>) -> Option<Node> {
    match terms.len() {
        0 => None,
        1 if !terms[0].negated => Some(terms.into_iter().next().expect("one").node),
        1 => Some(neg(terms.into_iter().next().expect("one").node)),
        _ => Some(Node::Sum(terms)),
    }
}

/// `node + k` for a small integer k.
fn add(node: Node, k: i32) -> Node {
    Node::Sum(vec![
        Term {
            negated: false,
            node,
        },
        Term {
            negated: k < 0,
            node: Node::Number(Number::int(k.unsigned_abs())),
        },
    ])
}

fn pow(b: Node, e: Node) -> Node {
    Node::Pow(Box::new(b), Box::new(e))
}

fn call(f: Builtin, u: Node) -> Node {
    Node::Call(f, vec![u])
}
