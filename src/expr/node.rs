//! The syntax tree: [`Node`], [`Number`], [`Builtin`].

use rug::{Integer, Rational};

/// A node of the syntax tree of an [`Expr`](super::Expr).
///
/// Sums and products are n-ary, so `a + b − c` is one [`Node::Sum`] of three
/// terms and `8/4/2` one [`Node::Product`] of three factors; parentheses make
/// no node of their own. Unary plus makes no node either.
///
/// ```
/// use dressing::expr::{Expr, Node};
/// let e = Expr::parse("a - b + c").unwrap();
/// match e.node() {
///     Node::Sum(terms) => {
///         let signs: Vec<bool> = terms.iter().map(|t| t.negated).collect();
///         assert_eq!(signs, [false, true, false]);
///     }
///     other => panic!("expected a sum, got {other:?}"),
/// }
/// ```
#[derive(Clone, Debug, PartialEq)]
pub enum Node {
    /// A literal, exactly as written (`0.25` is exactly 1/4).
    Number(Number),
    /// The imaginary unit `i`.
    I,
    /// `pi` or `π`.
    Pi,
    /// A named value: a parameter or a variable, bound at evaluation.
    Var(String),
    /// Unary minus.
    Neg(Box<Node>),
    /// `t₀ ± t₁ ± …`, two or more terms.
    Sum(Vec<Term>),
    /// `f₀ · f₁ / f₂ …`, two or more factors.
    Product(Vec<Factor>),
    /// `base ^ exponent` (principal power; integer exponents exactly).
    Pow(Box<Node>, Box<Node>),
    /// A call of a built-in function, with the number of arguments it takes.
    Call(Builtin, Vec<Node>),
    /// A call of any other name, resolved at evaluation by the caller
    /// ([`Functions`](super::Functions)), e.g. a named factor `S(theta + i*pi)`.
    UserCall(String, Vec<Node>),
}

/// One term of a [`Node::Sum`].
#[derive(Clone, Debug, PartialEq)]
pub struct Term {
    /// Whether the term is subtracted.
    pub negated: bool,
    /// The term.
    pub node: Node,
}

/// One factor of a [`Node::Product`].
#[derive(Clone, Debug, PartialEq)]
pub struct Factor {
    /// Whether the factor divides (`/`) rather than multiplies.
    pub inverted: bool,
    /// The factor.
    pub node: Node,
}

/// A non-negative decimal literal `m · 10^k`, kept exact.
///
/// ```
/// use dressing::expr::{Expr, Node};
/// let e = Expr::parse("2.50e-1").unwrap();
/// let Node::Number(n) = e.node() else { panic!() };
/// assert_eq!(*n.value(), rug::Rational::from((1, 4)));
/// assert_eq!(n.to_f64(), 0.25);
/// assert_eq!(e.to_string(), "0.25");
/// ```
#[derive(Clone, Debug)]
pub struct Number {
    /// Mantissa without trailing zeros (0 for zero).
    mantissa: Integer,
    /// Power of ten (0 for zero).
    exp10: i64,
    /// The exact value.
    value: Rational,
    /// The value rounded to the nearest double (may be infinite or 0).
    approx: f64,
    /// Whether `approx` is the value exactly.
    exact: bool,
}

impl PartialEq for Number {
    fn eq(&self, other: &Self) -> bool {
        self.mantissa == other.mantissa && self.exp10 == other.exp10
    }
}

impl Number {
    /// `mantissa · 10^exp10` (mantissa ≥ 0); `approx` is the correctly
    /// rounded double of the same value.
    pub(crate) fn new(mantissa: Integer, exp10: i64) -> Number {
        let (mut m, mut k) = (mantissa, exp10);
        if m == 0 {
            k = 0;
        } else {
            while m.is_divisible_u(10) {
                m /= 10u32;
                k += 1;
            }
        }
        let p = Integer::from(Integer::u_pow_u(10, k.unsigned_abs() as u32));
        let value = if k >= 0 {
            Rational::from(Integer::from(&m * &p))
        } else {
            Rational::from((m.clone(), p))
        };
        let approx: f64 = format!("{m}e{k}").parse().unwrap_or(f64::NAN);
        let exact = approx.is_finite() && Rational::from_f64(approx).as_ref() == Some(&value);
        Number {
            mantissa: m,
            exp10: k,
            value,
            approx,
            exact,
        }
    }

    /// The integer `n ≥ 0`.
    pub(crate) fn int(n: u32) -> Number {
        Number::new(Integer::from(n), 0)
    }

    /// The exact value.
    pub fn value(&self) -> &Rational {
        &self.value
    }

    /// The nearest double (infinite when out of range).
    pub fn to_f64(&self) -> f64 {
        self.approx
    }

    /// The value as a double when it is one exactly.
    pub(crate) fn exact_f64(&self) -> Option<f64> {
        self.exact.then_some(self.approx)
    }

    /// Whether this is exactly `n`.
    pub(crate) fn is_int(&self, n: u32) -> bool {
        self.exp10 == 0 && self.mantissa == n
    }

    /// Canonical decimal text: plain for moderate exponents, else `d.ddde±k`.
    pub(crate) fn text(&self) -> String {
        let digits = self.mantissa.to_string();
        let n = digits.len() as i64;
        let k = self.exp10;
        if self.mantissa == 0 {
            return "0".into();
        }
        if (0..=20).contains(&k) {
            return format!("{digits}{}", "0".repeat(k as usize));
        }
        if k < 0 {
            let point = n + k;
            if point > 0 {
                let (a, b) = digits.split_at(point as usize);
                return format!("{a}.{b}");
            }
            if point > -6 {
                return format!("0.{}{digits}", "0".repeat((-point) as usize));
            }
        }
        let e = n - 1 + k;
        let (a, b) = digits.split_at(1);
        if b.is_empty() {
            format!("{a}e{e}")
        } else {
            format!("{a}.{b}e{e}")
        }
    }
}

macro_rules! builtins {
    ($($variant:ident => $name:literal, $arity:literal, $doc:literal;)*) => {
        /// The built-in functions. Any other name followed by `(` is a
        /// [`Node::UserCall`].
        ///
        /// ```
        /// use dressing::expr::Builtin;
        /// assert_eq!(Builtin::from_name("loggamma"), Some(Builtin::LogGamma));
        /// assert_eq!(Builtin::Polygamma.arity(), 2);
        /// assert_eq!(Builtin::Sinh.name(), "sinh");
        /// ```
        #[derive(Clone, Copy, Debug, PartialEq, Eq, Hash)]
        pub enum Builtin {
            $(#[doc = $doc] $variant,)*
        }

        impl Builtin {
            /// Every built-in, in the order of the documentation.
            pub const ALL: &'static [Builtin] = &[$(Builtin::$variant,)*];

            /// The name as written in expressions.
            pub fn name(self) -> &'static str {
                match self { $(Builtin::$variant => $name,)* }
            }

            /// How many arguments it takes.
            pub fn arity(self) -> usize {
                match self { $(Builtin::$variant => $arity,)* }
            }

            /// The built-in called `name`, if any.
            pub fn from_name(name: &str) -> Option<Builtin> {
                match name { $($name => Some(Builtin::$variant),)* _ => None }
            }
        }
    };
}

builtins! {
    Exp => "exp", 1, "`exp(z)`.";
    Log => "log", 1, "`log(z)`, principal: imaginary part in (−π, π].";
    Sqrt => "sqrt", 1, "`sqrt(z)`, principal: real part ≥ 0.";
    Sin => "sin", 1, "`sin(z)`.";
    Cos => "cos", 1, "`cos(z)`.";
    Tan => "tan", 1, "`tan(z)`.";
    Sinh => "sinh", 1, "`sinh(z)`.";
    Cosh => "cosh", 1, "`cosh(z)`.";
    Tanh => "tanh", 1, "`tanh(z)`.";
    Gamma => "gamma", 1, "`gamma(z)` = Γ(z); poles at 0, −1, −2, …";
    RGamma => "rgamma", 1, "`rgamma(z)` = 1/Γ(z), entire.";
    LogGamma => "loggamma", 1, "`loggamma(z)`, the principal log Γ (cut along the negative axis).";
    Digamma => "digamma", 1, "`digamma(z)` = ψ(z).";
    Polygamma => "polygamma", 2, "`polygamma(n, z)` = ψ⁽ⁿ⁾(z), n a non-negative integer.";
    BarnesG => "barnesg", 1, "`barnesg(z)` = G(z), entire.";
    LogBarnesG => "logbarnesg", 1, "`logbarnesg(z)` = log G(z), continuous branch real on the positive axis.";
}

/// The list of built-in names, for error messages.
pub(crate) fn builtin_list() -> String {
    Builtin::ALL
        .iter()
        .map(|b| b.name())
        .collect::<Vec<_>>()
        .join(", ")
}
