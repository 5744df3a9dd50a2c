//! Canonical printing: spaces around `+` and `-` only, parentheses only
//! where the tree needs them (and around a negated operand of a sum, product
//! or power, for readability), numbers in canonical decimal form.

use super::node::Node;
use std::fmt::{self, Write};

fn is_atom(n: &Node) -> bool {
    matches!(
        n,
        Node::Number(_) | Node::I | Node::Pi | Node::Var(_) | Node::Call(..) | Node::UserCall(..)
    )
}

fn paren(n: &Node, f: &mut impl Write) -> fmt::Result {
    f.write_char('(')?;
    write_node(n, f)?;
    f.write_char(')')
}

/// Writes `n` in canonical form.
pub(crate) fn write_node(n: &Node, f: &mut impl Write) -> fmt::Result {
    match n {
        Node::Number(x) => f.write_str(&x.text()),
        Node::I => f.write_str("i"),
        Node::Pi => f.write_str("pi"),
        Node::Var(name) => f.write_str(name),
        Node::Neg(x) => {
            f.write_char('-')?;
            neg_operand(x, f)
        }
        Node::Sum(terms) => {
            for (k, t) in terms.iter().enumerate() {
                if k == 0 {
                    if t.negated {
                        f.write_char('-')?;
                        neg_operand(&t.node, f)?;
                    } else if matches!(t.node, Node::Sum(_)) {
                        paren(&t.node, f)?;
                    } else {
                        write_node(&t.node, f)?;
                    }
                    continue;
                }
                f.write_str(if t.negated { " - " } else { " + " })?;
                if matches!(t.node, Node::Sum(_) | Node::Neg(_)) {
                    paren(&t.node, f)?;
                } else {
                    write_node(&t.node, f)?;
                }
            }
            Ok(())
        }
        Node::Product(factors) => {
            for (k, x) in factors.iter().enumerate() {
                if k == 0 {
                    if x.inverted {
                        f.write_str("1/")?;
                    }
                } else {
                    f.write_char(if x.inverted { '/' } else { '*' })?;
                }
                let first_plain = k == 0 && !x.inverted;
                let needs = match &x.node {
                    Node::Sum(_) | Node::Product(_) => true,
                    Node::Neg(_) => !first_plain,
                    _ => false,
                };
                if needs {
                    paren(&x.node, f)?;
                } else {
                    write_node(&x.node, f)?;
                }
            }
            Ok(())
        }
        Node::Pow(b, e) => {
            if is_atom(b) {
                write_node(b, f)?;
            } else {
                paren(b, f)?;
            }
            f.write_char('^')?;
            if is_atom(e) || matches!(**e, Node::Pow(..)) {
                write_node(e, f)
            } else {
                paren(e, f)
            }
        }
        Node::Call(b, args) => call(b.name(), args, f),
        Node::UserCall(name, args) => call(name, args, f),
    }
}

/// The operand of a unary minus.
fn neg_operand(x: &Node, f: &mut impl Write) -> fmt::Result {
    if matches!(x, Node::Sum(_) | Node::Product(_) | Node::Neg(_)) {
        paren(x, f)
    } else {
        write_node(x, f)
    }
}

fn call(name: &str, args: &[Node], f: &mut impl Write) -> fmt::Result {
    f.write_str(name)?;
    f.write_char('(')?;
    for (k, a) in args.iter().enumerate() {
        if k > 0 {
            f.write_str(", ")?;
        }
        write_node(a, f)?;
    }
    f.write_char(')')
}

/// `n` as a string.
pub(crate) fn show(n: &Node) -> String {
    let mut s = String::new();
    let _ = write_node(n, &mut s);
    s
}
