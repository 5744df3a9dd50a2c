//! The expression language of model files: elementary prefactors, parameter
//! definitions, CDD blocks and equation right-hand sides.
//!
//! An [`Expr`] is parsed once and evaluated many times, on either numeric
//! path ([`num_complex::Complex64`] or [`rug::Complex`] at a working
//! precision), with the names it uses bound by an [`Env`] and calls of
//! names that are not built-ins resolved by the caller's [`Functions`].
//!
//! ```
//! use dressing::expr::Expr;
//! use num_complex::Complex64;
//! let e = Expr::parse("(sinh(theta) + i*sin(pi*a)) / (sinh(theta) - i*sin(pi*a))").unwrap();
//! let env = [("theta", Complex64::new(0.7, 0.0)), ("a", Complex64::new(0.25, 0.0))];
//! let s: Complex64 = e.eval(&env, 53).unwrap();
//! assert!((s.norm() - 1.0).abs() < 1e-15); // a CDD factor is a phase for real θ
//! ```
//!
//! # Grammar
//!
//! In EBNF; whitespace may appear between any two tokens.
//!
//! ```text
//! expr    = term { ("+" | "-") term } ;
//! term    = unary { ("*" | "/") unary } ;
//! unary   = ("-" | "+") unary | power ;
//! power   = primary [ "^" unary ] ;
//! primary = number
//!         | name [ "(" [ expr { "," expr } ] ")" ]
//!         | "(" expr ")" ;
//! number  = digit { digit } [ "." digit { digit } ]
//!           [ ("e" | "E") [ "+" | "-" ] digit { digit } ] ;
//! name    = ( letter | "_" ) { letter | digit | "_" }
//!         | "θ" | "ξ" | "α" | "β" | "γ" | "λ" | "μ" | "ν" | "π" ;
//! ```
//!
//! `letter` and `digit` are ASCII. A Greek letter is a name by itself (`θ2`
//! is two names, hence an error); `π` means `pi`, and the minus sign `−`
//! (U+2212) is read as `-`. The names `i` and `pi` are the constants; the
//! names of the built-ins below are reserved for them. Any other name
//! followed by `(` is a *user function call* ([`Node::UserCall`]), resolved
//! at evaluation; any other name alone is a parameter ([`Node::Var`]).
//! There is no implicit multiplication: `2pi` is an error that suggests
//! `2*pi`. Literals are exact decimals: `0.25` is 1/4, `1e-3` is 1/1000.
//! Nesting is limited to [`MAX_DEPTH`] levels.
//!
//! # Precedence
//!
//! | level | operators | associativity |
//! |---|---|---|
//! | 1 (loosest) | `+`, `-` (binary) | left: `1-2-3` = −4 |
//! | 2 | `*`, `/` | left: `8/4/2` = 1 |
//! | 3 | `-`, `+` (unary) | prefix: `-x^2` = −(x²) |
//! | 4 (tightest) | `^` | right: `2^3^2` = 2⁹ = 512; the exponent may carry a sign: `2^-1` |
//!
//! # Built-in functions
//!
//! | name | value | branch, poles |
//! |---|---|---|
//! | `exp(z)` | eᶻ | entire |
//! | `log(z)` | log z | principal, Im ∈ (−π, π]; the negative axis belongs to the upper side; `log(0)` is an error |
//! | `sqrt(z)` | √z | principal, Re ≥ 0; negative axis as for `log` |
//! | `sin`, `cos`, `tan` | | `tan = −i·tanh(iz)`, finite for large Im z |
//! | `sinh`, `cosh`, `tanh` | | `tanh` finite for large Re z |
//! | `gamma(z)` | Γ(z) | poles at 0, −1, −2, … → [`Error::Pole`] |
//! | `rgamma(z)` | 1/Γ(z) | entire |
//! | `loggamma(z)` | log Γ(z) | principal (cut along the negative axis, upper side on it) |
//! | `digamma(z)` | ψ(z) | poles at 0, −1, … → [`Error::Pole`] |
//! | `polygamma(n, z)` | ψ⁽ⁿ⁾(z) | `n` must evaluate to an integer 0 ≤ n ≤ 200 |
//! | `barnesg(z)` | G(z) | entire |
//! | `logbarnesg(z)` | log G(z) | continuous branch, real on the positive axis; zeros of G → [`Error::Zero`] |
//!
//! `a^b` is the principal power `exp(b log a)`, except that an integer
//! exponent (exactly, at run time) is computed by repeated squaring, so
//! `(-2)^3` is exactly −8. The special functions are those of
//! [`crate::special`], evaluated at `Prec::from_bits(wp)` (53 bits on the
//! double path); their error radius is not propagated.
//!
//! # Accuracy and cost
//!
//! Evaluation walks the tree; nothing is allocated on the double path
//! (except the argument list of a user function call). Every operation is
//! done at the working precision `wp`, so a result carries the rounding
//! errors of its operations and the conditioning of the formula: `wp` is a
//! working precision, not a guarantee on the result. On the MPC path `exp`,
//! `sin`, `cos` (hence `sinh`, `cosh`, `tan`, `tanh` and non-integer
//! powers) are composed from MPFR's real functions and division is done as
//! `a·conj(b)/|b|²`: a few ulps instead of MPC's correct rounding, faster,
//! and without MPC's slow cases (seconds for arguments like
//! `10⁻¹⁰⁰⁰⁰⁰(1+i)`). Repeated subexpressions are evaluated each time they
//! occur.
//!
//! # Errors
//!
//! All failures are [`Error`] values, never panics, NaN or infinity.
//! Syntax errors and errors that can be pinned to a name come back as
//! [`Error::Expression`] with a 1-based column counted in characters, and
//! display as the source line with a caret under the column:
//!
//! ```
//! use dressing::expr::Expr;
//! let err = Expr::parse("θ + (a*)").unwrap_err();
//! assert_eq!(
//!     err.to_string(),
//!     "θ + (a*)\n       ^ unexpected ')' — expected a number, a name or '('"
//! );
//! ```
//!
//! Evaluation errors name what failed: an unknown parameter (listing the
//! known ones), an unknown function (listing the built-ins), division by an
//! exact zero, an operation that overflowed or produced NaN; the special
//! functions' own errors ([`Error::Pole`], [`Error::Zero`], …) pass through
//! unchanged, as do errors returned by user functions. [`with_location`]
//! prefixes a file name and line for model-file loaders, keeping the caret
//! aligned.
//!
//! # Analysis
//!
//! [`Expr::free_variables`], [`Expr::user_functions`], [`Expr::depends_on`],
//! [`Expr::affine_in`] (is it `a + b·θ`?), [`Expr::to_rational`] (the exact
//! value, when there is one), and `Display`, which prints a canonical form
//! that parses back to the same tree.

mod analysis;
mod bound;
mod derivative;
mod display;
mod eval;
mod lexer;
mod mpc;
mod node;
mod parser;

pub use node::{Builtin, Factor, Node, Number, Term};

use crate::error::{Error, Result};
use crate::num::ComplexField;
use num_complex::Complex64;
use rug::Rational;
use std::collections::{BTreeMap, BTreeSet, HashMap};
use std::fmt;
use std::hash::BuildHasher;

/// Deepest nesting the parser accepts (parentheses, unary signs, powers and
/// calls inside one another). Long sums and products do not nest.
pub const MAX_DEPTH: usize = 200;

/// A parsed expression: its tree and the text it came from.
///
/// Equality compares trees, not texts: `a+b` equals `a + b`.
#[derive(Clone, Debug)]
pub struct Expr {
    node: Node,
    source: String,
}

impl PartialEq for Expr {
    fn eq(&self, other: &Self) -> bool {
        self.node == other.node
    }
}

impl Expr {
    /// Parses `text`.
    ///
    /// Errors: [`Error::Expression`] with the column of the problem.
    ///
    /// ```
    /// use dressing::expr::Expr;
    /// assert!(Expr::parse("gamma(1/2)^2 / pi").is_ok());
    /// let err = Expr::parse("2pi").unwrap_err().to_string();
    /// assert!(err.contains("write `2*pi`"), "{err}");
    /// ```
    pub fn parse(text: &str) -> Result<Expr> {
        match parser::parse(text) {
            Ok(node) => Ok(Expr {
                node,
                source: text.to_string(),
            }),
            Err(f) => Err(Error::Expression {
                location: None,
                expr: text.to_string(),
                column: Some(f.col),
                message: f.message,
            }),
        }
    }

    /// The expression of a syntax tree (its source is the canonical form).
    ///
    /// ```
    /// use dressing::expr::{Expr, Node};
    /// assert_eq!(Expr::from_node(Node::Pi).to_string(), "pi");
    /// ```
    pub fn from_node(node: Node) -> Expr {
        let source = display::show(&node);
        Expr { node, source }
    }

    /// The syntax tree.
    ///
    /// ```
    /// use dressing::expr::{Expr, Node};
    /// assert_eq!(*Expr::parse("π").unwrap().node(), Node::Pi);
    /// ```
    pub fn node(&self) -> &Node {
        &self.node
    }

    /// The text it was parsed from (for expressions made by
    /// [`Expr::affine_in`], their canonical form).
    ///
    /// ```
    /// use dressing::expr::Expr;
    /// assert_eq!(Expr::parse(" a+b ").unwrap().source(), " a+b ");
    /// ```
    pub fn source(&self) -> &str {
        &self.source
    }

    /// The value at the point `env`, with working precision `wp` bits
    /// (ignored on the double path). Parameters are rounded to `wp` bits
    /// when they carry another precision. Any user function call is an error
    /// (use [`Expr::eval_with`]).
    ///
    /// Errors: see the module docs; on the MPC path also those of
    /// [`crate::Prec::from_bits`] for an invalid `wp`.
    ///
    /// ```
    /// use dressing::expr::Expr;
    /// use rug::Complex;
    /// // e^{iπ} = cos π + i sin π = −1 (DLMF 4.14.3), at 50 digits
    /// let e = Expr::parse("exp(i*pi)").unwrap();
    /// let v: Complex = e.eval(&(), 170).unwrap();
    /// assert!(Complex::with_val(170, &v + 1).abs().real().to_f64() < 1e-50);
    /// ```
    pub fn eval<C, E>(&self, env: &E, wp: u32) -> Result<C>
    where
        C: ComplexField,
        E: Env<C> + ?Sized,
    {
        self.eval_with(env, &NoFunctions, wp)
    }

    /// As [`Expr::eval`], with user function calls resolved by `functions`.
    ///
    /// ```
    /// use dressing::expr::Expr;
    /// use dressing::Result;
    /// use num_complex::Complex64;
    /// let e = Expr::parse("S(theta + i*pi) * S(theta)").unwrap();
    /// let s = |name: &str, args: &[Complex64]| -> Option<Result<Complex64>> {
    ///     (name == "S").then(|| Ok(args[0].tanh()))
    /// };
    /// let theta = Complex64::new(0.3, 0.0);
    /// let v: Complex64 = e.eval_with(&[("theta", theta)], &s, 53).unwrap();
    /// let want = (theta + Complex64::i() * std::f64::consts::PI).tanh() * theta.tanh();
    /// assert!((v - want).norm() < 1e-15);
    /// ```
    pub fn eval_with<C, E, F>(&self, env: &E, functions: &F, wp: u32) -> Result<C>
    where
        C: ComplexField,
        E: Env<C> + ?Sized,
        F: Functions<C> + ?Sized,
    {
        let (wp, prec) = eval::precision::<C>(wp)?;
        let ctx = eval::Ctx {
            path: std::marker::PhantomData,
            expr: self,
            env,
            funcs: functions,
            wp,
            prec,
        };
        ctx.eval(&self.node)
    }

    /// The derivative with respect to a variable x, given the derivative of
    /// each name that depends on x (`wrt`); every other name is a constant.
    /// Symbolic: chain, product and quotient rules and the derivatives of
    /// the built-ins (see `derivative.rs`); an exact zero is `Ok(None)`.
    ///
    /// Errors: [`Error::Expression`] for a call of a user function, or
    /// `polygamma` with an order that depends on x.
    ///
    /// ```
    /// use dressing::expr::{Expr, Node};
    /// use num_complex::Complex64;
    /// let e = Expr::parse("theta^2 * exp(a*theta) / sinh(theta)").unwrap();
    /// let d = e.derivative(&[("theta", Expr::parse("1").unwrap().node().clone())]).unwrap().unwrap();
    /// let (t, a) = (Complex64::new(0.7, 0.2), Complex64::new(0.3, 0.0));
    /// let got: Complex64 = d.eval(&[("theta", t), ("a", a)], 53).unwrap();
    /// let want = (2.0 * t + a * t * t - t * t * t.cosh() / t.sinh()) * (a * t).exp() / t.sinh();
    /// assert!((got - want).norm() < 1e-14);
    /// assert!(Expr::parse("a + pi").unwrap().derivative(&[("theta", Node::I)]).unwrap().is_none());
    /// ```
    pub fn derivative(&self, wrt: &[(&str, Node)]) -> Result<Option<Expr>> {
        self.differentiated(derivative::derivative(&self.node, wrt))
    }

    /// A derivative's tree as an expression, or why there is none.
    fn differentiated(&self, d: std::result::Result<Option<Node>, String>) -> Result<Option<Expr>> {
        d.map(|d| d.map(Expr::from_node))
            .map_err(|message| Error::Expression {
                location: None,
                expr: self.source.clone(),
                column: None,
                message,
            })
    }

    /// `d/dx log(expr)`, with the logarithm split over products, constant
    /// powers and `exp` before differentiating (see `derivative.rs`);
    /// `wrt` as for [`Expr::derivative`].
    ///
    /// ```
    /// use dressing::expr::{Expr, Node};
    /// let e = Expr::parse("exp(i*g*sinh(theta)) * theta^2").unwrap();
    /// let one = Expr::parse("1").unwrap().node().clone();
    /// let d = e.log_derivative(&[("theta", one)]).unwrap().unwrap();
    /// assert_eq!(d.to_string(), "cosh(theta)*i*g + 2*(1/theta)");
    /// ```
    pub fn log_derivative(&self, wrt: &[(&str, Node)]) -> Result<Option<Expr>> {
        self.differentiated(derivative::log_derivative(&self.node, wrt))
    }

    /// The value at double precision with a running error bound (see
    /// `bound.rs`): `Some((value, bound))` where the expression uses only
    /// arithmetic, integer powers and elementary functions, each applied
    /// clearly away from its singularities; `None` otherwise. The value is
    /// that of [`Expr::eval`]; `exact` names the variables that carry no
    /// error of their own.
    ///
    /// ```
    /// use dressing::expr::Expr;
    /// use num_complex::Complex64;
    /// let e = Expr::parse("sinh(theta)/(1 + theta^2)").unwrap();
    /// let t = Complex64::new(0.7, 0.2);
    /// let (v, b) = e.eval_with_bound(&[("theta", t)], &|n| n == "theta").unwrap();
    /// let want = t.sinh() / (1.0 + t * t);
    /// assert!((v - want).norm() <= b && b < 1e-14);
    /// assert!(Expr::parse("gamma(theta)").unwrap().eval_with_bound(&[("theta", t)], &|_| true).is_none());
    /// ```
    pub fn eval_with_bound<E>(
        &self,
        env: &E,
        exact: &dyn Fn(&str) -> bool,
    ) -> Option<(Complex64, f64)>
    where
        E: Env<Complex64> + ?Sized,
    {
        let (b, e) = bound::bound(&self.node, env, exact)?;
        let v: Complex64 = self.eval(env, 53).ok()?;
        // The bound is for the walk's own value; the evaluator's may differ
        // by the rounding of a different formula (tanh, sinh).
        Some((v, e + (v - b).norm() + f64::EPSILON * v.norm()))
    }

    /// The names of the parameters used, sorted (constants and function
    /// names excluded).
    ///
    /// ```
    /// use dressing::expr::Expr;
    /// let e = Expr::parse("sinh(theta) + i*sin(pi*a) + S(b)").unwrap();
    /// let v: Vec<String> = e.free_variables().into_iter().collect();
    /// assert_eq!(v, ["a", "b", "theta"]);
    /// ```
    pub fn free_variables(&self) -> BTreeSet<String> {
        analysis::free_variables(&self.node)
    }

    /// The names of the user functions called, sorted.
    ///
    /// ```
    /// use dressing::expr::Expr;
    /// let e = Expr::parse("S(theta + i*pi) / sigma(theta, 2) + gamma(a)").unwrap();
    /// let f: Vec<String> = e.user_functions().into_iter().collect();
    /// assert_eq!(f, ["S", "sigma"]);
    /// ```
    pub fn user_functions(&self) -> BTreeSet<String> {
        analysis::user_functions(&self.node)
    }

    /// Whether the parameter `name` occurs.
    ///
    /// ```
    /// use dressing::expr::Expr;
    /// assert!(Expr::parse("S(2*theta)").unwrap().depends_on("theta"));
    /// assert!(!Expr::parse("i*pi").unwrap().depends_on("theta"));
    /// ```
    pub fn depends_on(&self, name: &str) -> bool {
        analysis::depends_on(&self.node, name)
    }

    /// `Some((a, b))` when the expression is `a + b·var` with `a`, `b` free
    /// of `var`, read off the tree: sums, negations, products in which
    /// `var` occurs in one multiplied (not divided) factor, and `x^1`. Any
    /// other occurrence of `var` — under a built-in or user function, in a
    /// divisor, a power or in two factors (`theta*theta`) — gives `None`.
    /// An expression free of `var` gives `Some((expr, 0))`.
    ///
    /// ```
    /// use dressing::expr::Expr;
    /// let e = Expr::parse("(theta + 2*i*pi/3)/2").unwrap();
    /// let (a, b) = e.affine_in("theta").unwrap();
    /// assert_eq!(a.to_string(), "2*i*pi/3/2");
    /// assert_eq!(b.to_string(), "1/2");
    /// assert!(Expr::parse("1/theta").unwrap().affine_in("theta").is_none());
    /// ```
    pub fn affine_in(&self, var: &str) -> Option<(Expr, Expr)> {
        let (a, b) = analysis::affine(&self.node, var)?;
        Some((Expr::from_node(a), Expr::from_node(b)))
    }

    /// The exact value, when the expression is built from literals, `+ - * /`,
    /// integer powers and parameters that `env` gives as rationals. `None`
    /// otherwise: `i`, `pi`, any function, a parameter `env` has no value
    /// for, a non-integer exponent, **division by zero** (also `0^-1`), or a
    /// power whose result would exceed 2²⁰ bits.
    ///
    /// ```
    /// use dressing::expr::Expr;
    /// use rug::Rational;
    /// use std::collections::HashMap;
    /// let params = HashMap::from([("a".to_string(), Rational::from((1, 3)))]);
    /// let e = Expr::parse("2*a^2 + 0.25 - 1e-3").unwrap();
    /// let q = e.to_rational(|name| params.get(name).cloned()).unwrap();
    /// assert_eq!(q, Rational::from((2 * 1000 + 9 * 249, 9 * 1000)));
    /// assert_eq!(Expr::parse("1/(a-a)").unwrap().to_rational(|n| params.get(n).cloned()), None);
    /// assert_eq!(Expr::parse("sqrt(4)").unwrap().to_rational(|_| None), None);
    /// ```
    pub fn to_rational<F>(&self, env: F) -> Option<Rational>
    where
        F: Fn(&str) -> Option<Rational>,
    {
        analysis::rational(&self.node, &env)
    }

    /// Column of the first occurrence of `name` in the source, as a call
    /// (followed by `(`) or as a parameter.
    fn column_of(&self, name: &str, as_call: bool) -> Option<usize> {
        let toks = lexer::lex(&self.source).ok()?;
        toks.windows(2).find_map(|w| {
            let is_call = w[1].tok == lexer::Tok::LParen;
            match &w[0].tok {
                lexer::Tok::Name(n) if w[0].text == name || n == name => {
                    (is_call == as_call).then_some(w[0].col)
                }
                _ => None,
            }
        })
    }
}

impl fmt::Display for Expr {
    /// The canonical form: `Expr::parse(&e.to_string())` gives the same tree.
    ///
    /// ```
    /// use dressing::expr::Expr;
    /// let e = Expr::parse("-(x)^2 + 2.50*θ/(1 + a) - -b").unwrap();
    /// assert_eq!(e.to_string(), "-x^2 + 2.5*θ/(1 + a) - (-b)");
    /// assert_eq!(Expr::parse(&e.to_string()).unwrap(), e);
    /// ```
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        display::write_node(&self.node, f)
    }
}

impl std::str::FromStr for Expr {
    type Err = Error;

    /// Same as [`Expr::parse`].
    ///
    /// ```
    /// let e: dressing::expr::Expr = "1 + 2".parse().unwrap();
    /// assert_eq!(e.to_string(), "1 + 2");
    /// ```
    fn from_str(s: &str) -> Result<Expr> {
        Expr::parse(s)
    }
}

/// Named values for evaluation.
///
/// Implemented for `HashMap` and `BTreeMap` keyed by `String` or `&str`, for
/// slices, arrays and vectors of `(name, value)` pairs (a linear search,
/// fastest for a handful of names), and for `()` (no names).
///
/// ```
/// use dressing::expr::{Env, Expr};
/// use num_complex::Complex64;
/// use std::collections::HashMap;
/// let env = HashMap::from([("a".to_string(), Complex64::new(2.0, 0.0))]);
/// assert_eq!(Env::<Complex64>::names(&env), ["a"]);
/// let v: Complex64 = Expr::parse("a^2").unwrap().eval(&env, 53).unwrap();
/// assert_eq!(v.re, 4.0);
/// ```
pub trait Env<C> {
    /// The value of `name`, if it has one.
    fn get(&self, name: &str) -> Option<&C>;
    /// All names with a value (for error messages).
    fn names(&self) -> Vec<String>;
}

impl<C, S: BuildHasher> Env<C> for HashMap<String, C, S> {
    fn get(&self, name: &str) -> Option<&C> {
        HashMap::get(self, name)
    }
    fn names(&self) -> Vec<String> {
        self.keys().cloned().collect()
    }
}

impl<C, S: BuildHasher> Env<C> for HashMap<&str, C, S> {
    fn get(&self, name: &str) -> Option<&C> {
        HashMap::get(self, name)
    }
    fn names(&self) -> Vec<String> {
        self.keys().map(|k| k.to_string()).collect()
    }
}

impl<C> Env<C> for BTreeMap<String, C> {
    fn get(&self, name: &str) -> Option<&C> {
        BTreeMap::get(self, name)
    }
    fn names(&self) -> Vec<String> {
        self.keys().cloned().collect()
    }
}

impl<C> Env<C> for BTreeMap<&str, C> {
    fn get(&self, name: &str) -> Option<&C> {
        BTreeMap::get(self, name)
    }
    fn names(&self) -> Vec<String> {
        self.keys().map(|k| k.to_string()).collect()
    }
}

impl<C, S: AsRef<str>> Env<C> for [(S, C)] {
    fn get(&self, name: &str) -> Option<&C> {
        self.iter()
            .find(|(k, _)| k.as_ref() == name)
            .map(|(_, v)| v)
    }
    fn names(&self) -> Vec<String> {
        self.iter().map(|(k, _)| k.as_ref().to_string()).collect()
    }
}

impl<C, S: AsRef<str>, const N: usize> Env<C> for [(S, C); N] {
    fn get(&self, name: &str) -> Option<&C> {
        Env::get(self.as_slice(), name)
    }
    fn names(&self) -> Vec<String> {
        Env::<C>::names(self.as_slice())
    }
}

impl<C, S: AsRef<str>> Env<C> for Vec<(S, C)> {
    fn get(&self, name: &str) -> Option<&C> {
        Env::get(self.as_slice(), name)
    }
    fn names(&self) -> Vec<String> {
        Env::<C>::names(self.as_slice())
    }
}

impl<C> Env<C> for () {
    fn get(&self, _name: &str) -> Option<&C> {
        None
    }
    fn names(&self) -> Vec<String> {
        Vec::new()
    }
}

/// Resolves calls of names that are not built-ins (`S(theta + i*pi)`).
///
/// `call` returns `None` for a name it does not know (the evaluation then
/// fails naming it and listing the built-ins), else the value or an error,
/// which is passed on unchanged. Any closure
/// `Fn(&str, &[C]) -> Option<Result<C>>` is one; [`NoFunctions`] knows no
/// names.
///
/// ```
/// use dressing::expr::{Expr, Functions};
/// use dressing::Result;
/// use num_complex::Complex64;
/// struct Twice;
/// impl Functions<Complex64> for Twice {
///     fn call(&self, name: &str, args: &[Complex64]) -> Option<Result<Complex64>> {
///         (name == "twice" && args.len() == 1).then(|| Ok(args[0] * 2.0))
///     }
/// }
/// let v: Complex64 = Expr::parse("twice(3)").unwrap().eval_with(&(), &Twice, 53).unwrap();
/// assert_eq!(v.re, 6.0);
/// ```
pub trait Functions<C> {
    /// The value of `name(args…)`, or `None` if `name` is unknown.
    fn call(&self, name: &str, args: &[C]) -> Option<Result<C>>;
}

impl<C, F> Functions<C> for F
where
    F: Fn(&str, &[C]) -> Option<Result<C>>,
{
    fn call(&self, name: &str, args: &[C]) -> Option<Result<C>> {
        self(name, args)
    }
}

/// Knows no user functions.
///
/// ```
/// use dressing::expr::{Expr, NoFunctions};
/// use num_complex::Complex64;
/// let r: dressing::Result<Complex64> = Expr::parse("S(1)").unwrap().eval_with(&(), &NoFunctions, 53);
/// assert!(r.unwrap_err().to_string().contains("unknown function `S`"));
/// ```
#[derive(Clone, Copy, Debug, Default)]
pub struct NoFunctions;

impl<C> Functions<C> for NoFunctions {
    fn call(&self, _name: &str, _args: &[C]) -> Option<Result<C>> {
        None
    }
}

/// Renders an expression error: with a column, the source on one line and a
/// caret under the column followed by the message on the next; without one,
/// the message followed by the source. A `location` (such as
/// `model.toml:12`) is put in front, followed by `": "`, and the caret
/// line is indented to stay under the column. This is the `Display` of
/// [`Error::Expression`].
///
/// ```
/// use dressing::expr::render;
/// assert_eq!(
///     render("1 +", Some(4), "expected a number", Some("m.toml:3")),
///     "m.toml:3: 1 +\n             ^ expected a number"
/// );
/// assert_eq!(render("a/b", None, "division by zero", None), "division by zero, in `a/b`");
/// ```
pub fn render(
    source: &str,
    column: Option<usize>,
    message: &str,
    location: Option<&str>,
) -> String {
    let prefix = location.map(|l| format!("{l}: ")).unwrap_or_default();
    let flat: String = source
        .chars()
        .map(|c| if c == '\n' || c == '\r' { ' ' } else { c })
        .collect();
    match column {
        Some(col) => {
            let pad: String = prefix
                .chars()
                .chain(flat.chars().take(col.saturating_sub(1)))
                .map(|c| if c == '\t' { '\t' } else { ' ' })
                .collect();
            let extra = col.saturating_sub(1).saturating_sub(flat.chars().count());
            format!("{prefix}{flat}\n{pad}{}^ {message}", " ".repeat(extra))
        }
        None => format!("{prefix}{message}, in `{flat}`"),
    }
}

/// `err` with `location` (a file name and line, say) attached when it is an
/// [`Error::Expression`]; other errors are returned unchanged.
///
/// ```
/// use dressing::expr::{with_location, Expr};
/// let err = with_location(Expr::parse("sin(").unwrap_err(), "model.toml:7");
/// assert_eq!(
///     err.to_string(),
///     "model.toml:7: sin(\n                  ^ expected a number, a name or '(' but the expression ended"
/// );
/// ```
pub fn with_location(err: Error, location: &str) -> Error {
    match err {
        Error::Expression {
            expr,
            column,
            message,
            ..
        } => Error::Expression {
            location: Some(location.to_string()),
            expr,
            column,
            message,
        },
        other => other,
    }
}
