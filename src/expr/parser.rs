//! Recursive-descent parser (grammar in the module docs).

use super::lexer::{fail, lex, Fail, Tok, Token};
use super::node::{Builtin, Factor, Node, Term};
use super::MAX_DEPTH;

/// Parses a whole expression.
pub(crate) fn parse(src: &str) -> Result<Node, Fail> {
    let toks = lex(src)?;
    let mut p = Parser {
        toks,
        pos: 0,
        depth: 0,
    };
    if p.peek() == &Tok::End {
        return fail(
            1,
            "the expression is empty — expected a number, a name or '('",
        );
    }
    let node = p.expr()?;
    match p.peek() {
        Tok::End => Ok(node),
        Tok::RParen => fail(p.col(), "unexpected ')' — there is no '(' to close"),
        Tok::Comma => fail(
            p.col(),
            "unexpected ',' — commas only separate the arguments of a function call",
        ),
        _ => p.unexpected(),
    }
}

struct Parser {
    toks: Vec<Token>,
    pos: usize,
    depth: usize,
}

impl Parser {
    fn peek(&self) -> &Tok {
        &self.toks[self.pos].tok
    }

    fn col(&self) -> usize {
        self.toks[self.pos].col
    }

    fn bump(&mut self) -> Token {
        let t = self.toks[self.pos].clone();
        if self.pos + 1 < self.toks.len() {
            self.pos += 1;
        }
        t
    }

    /// The error for a token that cannot start an operand.
    fn unexpected<T>(&self) -> Result<T, Fail> {
        let t = &self.toks[self.pos];
        if t.tok == Tok::End {
            return fail(
                t.col,
                "expected a number, a name or '(' but the expression ended",
            );
        }
        let mut msg = format!("unexpected '{}' — expected a number, a name or '('", t.text);
        if t.tok == Tok::Star && self.pos > 0 && self.toks[self.pos - 1].tok == Tok::Star {
            msg.push_str(" (powers are written with '^')");
        }
        fail(t.col, msg)
    }

    /// expr = term { ("+" | "-") term }
    fn expr(&mut self) -> Result<Node, Fail> {
        let node = self.term()?;
        let mut terms = vec![Term {
            negated: false,
            node,
        }];
        loop {
            let negated = match self.peek() {
                Tok::Plus => false,
                Tok::Minus => true,
                _ => break,
            };
            self.bump();
            let node = self.term()?;
            terms.push(Term { negated, node });
        }
        Ok(if terms.len() == 1 {
            terms.swap_remove(0).node
        } else {
            Node::Sum(terms)
        })
    }

    /// term = unary { ("*" | "/") unary }
    fn term(&mut self) -> Result<Node, Fail> {
        let node = self.unary()?;
        self.no_juxtaposition()?;
        let mut factors = vec![Factor {
            inverted: false,
            node,
        }];
        loop {
            let inverted = match self.peek() {
                Tok::Star => false,
                Tok::Slash => true,
                _ => break,
            };
            self.bump();
            let node = self.unary()?;
            self.no_juxtaposition()?;
            factors.push(Factor { inverted, node });
        }
        Ok(if factors.len() == 1 {
            factors.swap_remove(0).node
        } else {
            Node::Product(factors)
        })
    }

    /// After an operand, another operand may not follow directly.
    fn no_juxtaposition(&self) -> Result<(), Fail> {
        if matches!(self.peek(), Tok::Number(_) | Tok::Name(_) | Tok::LParen) {
            let prev = &self.toks[self.pos - 1].text;
            let next = &self.toks[self.pos].text;
            return fail(
                self.col(),
                format!(
                    "missing operator before `{next}` — implicit multiplication is not \
                     allowed; write `{prev}*{next}`"
                ),
            );
        }
        Ok(())
    }

    /// unary = ("-" | "+") unary | power
    fn unary(&mut self) -> Result<Node, Fail> {
        self.depth += 1;
        if self.depth > MAX_DEPTH {
            return fail(
                self.col(),
                format!(
                    "the expression is nested too deeply (more than {MAX_DEPTH} levels); \
                     split it into named parts"
                ),
            );
        }
        let out = match self.peek() {
            Tok::Minus => {
                self.bump();
                self.unary().map(|x| Node::Neg(Box::new(x)))
            }
            Tok::Plus => {
                self.bump();
                self.unary()
            }
            _ => self.power(),
        };
        self.depth -= 1;
        out
    }

    /// power = primary [ "^" unary ]
    fn power(&mut self) -> Result<Node, Fail> {
        let base = self.primary()?;
        if self.peek() == &Tok::Caret {
            self.bump();
            let exponent = self.unary()?;
            return Ok(Node::Pow(Box::new(base), Box::new(exponent)));
        }
        Ok(base)
    }

    /// primary = number | name | name "(" [ expr { "," expr } ] ")" | "(" expr ")"
    fn primary(&mut self) -> Result<Node, Fail> {
        match self.peek().clone() {
            Tok::Number(n) => {
                self.bump();
                Ok(Node::Number(n))
            }
            Tok::LParen => {
                let open = self.bump();
                let inner = self.expr()?;
                match self.peek() {
                    Tok::RParen => {
                        self.bump();
                        Ok(inner)
                    }
                    Tok::End => fail(
                        self.col(),
                        format!(
                            "expected ')' to close the '(' at column {}, but the expression ended",
                            open.col
                        ),
                    ),
                    Tok::Comma => fail(
                        self.col(),
                        format!(
                            "unexpected ',' — commas only separate the arguments of a function \
                             call; expected ')' to close the '(' at column {}",
                            open.col
                        ),
                    ),
                    _ => self.unexpected(),
                }
            }
            Tok::Name(name) => {
                let tok = self.bump();
                if self.peek() == &Tok::LParen {
                    self.call(&name, &tok)
                } else {
                    match name.as_str() {
                        "pi" => Ok(Node::Pi),
                        "i" => Ok(Node::I),
                        _ if Builtin::from_name(&name).is_some() => fail(
                            self.col(),
                            format!(
                                "expected '(' after the function name `{name}`, as in {name}(x)"
                            ),
                        ),
                        _ => Ok(Node::Var(name)),
                    }
                }
            }
            _ => self.unexpected(),
        }
    }

    /// A call: the name is consumed, the next token is '('.
    fn call(&mut self, name: &str, tok: &Token) -> Result<Node, Fail> {
        if name == "pi" || name == "i" {
            return fail(
                tok.col,
                format!(
                    "`{}` is a constant, not a function; for a product write `{}*(...)`",
                    tok.text, tok.text
                ),
            );
        }
        let open = self.bump();
        let mut args = Vec::new();
        if self.peek() == &Tok::RParen {
            self.bump();
        } else {
            loop {
                args.push(self.expr()?);
                match self.peek() {
                    Tok::Comma => {
                        self.bump();
                    }
                    Tok::RParen => {
                        self.bump();
                        break;
                    }
                    Tok::End => {
                        return fail(
                            self.col(),
                            format!(
                                "expected ',' or ')' to close the call of `{name}` opened at \
                                 column {}, but the expression ended",
                                open.col
                            ),
                        )
                    }
                    _ => return self.unexpected(),
                }
            }
        }
        match Builtin::from_name(name) {
            Some(b) if b.arity() != args.len() => {
                let n = b.arity();
                fail(
                    tok.col,
                    format!(
                        "`{name}` takes {n} argument{}, but {} {} given",
                        if n == 1 { "" } else { "s" },
                        args.len(),
                        if args.len() == 1 { "was" } else { "were" }
                    ),
                )
            }
            Some(b) => Ok(Node::Call(b, args)),
            None => Ok(Node::UserCall(tok.text.clone(), args)),
        }
    }
}
