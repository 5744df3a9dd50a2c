//! The crate's one error type.
//!
//! Every failure a caller can cause comes back as a variant of [`Error`] whose
//! message says what was wrong and what to change; the library never panics on
//! bad input and never passes a NaN or an infinity off as a number.

use std::fmt;

/// What went wrong, with enough detail to act on.
#[derive(Clone, Debug, PartialEq)]
pub enum Error {
    /// An argument was NaN or infinite.
    NonFinite {
        /// The function that was called.
        function: &'static str,
        /// Which argument.
        argument: &'static str,
    },
    /// A precision of zero bits or digits was asked for.
    ZeroPrecision,
    /// More precision was asked for than the documented cap.
    PrecisionTooHigh {
        /// Requested bits.
        requested_bits: u64,
        /// The cap, [`crate::precision::Prec::MAX_BITS`].
        max_bits: u32,
    },
    /// The double-precision path was asked for more than 53 bits.
    DoubleTooPrecise {
        /// Requested bits.
        requested_bits: u32,
    },
    /// The argument is a pole of the function (or of the function whose
    /// logarithm is taken).
    Pole {
        /// The function that was called.
        function: &'static str,
        /// Order of the pole.
        order: u32,
        /// Where, as text.
        at: String,
    },
    /// The argument is a zero of the function whose logarithm was asked for.
    Zero {
        /// The function that was called.
        function: &'static str,
        /// Order of the zero.
        order: u32,
        /// Where, as text.
        at: String,
    },
    /// A result does not fit the floating-point range of the path used.
    Overflow {
        /// The function that was called.
        function: &'static str,
        /// What to do instead.
        hint: &'static str,
    },
    /// An iterative method stopped before reaching the requested accuracy.
    NoConvergence {
        /// The method or function.
        what: String,
        /// The best error estimate reached, as text.
        achieved: String,
        /// What to change.
        hint: String,
    },
    /// An infinite product (or sum) does not converge.
    Divergent {
        /// The failed condition, e.g. `Σ n·s = 0`.
        condition: String,
        /// Its value.
        value: String,
        /// What it means and what to change.
        hint: String,
    },
    /// An argument outside the documented domain.
    Domain {
        /// The function that was called.
        function: &'static str,
        /// What is wrong and what is accepted.
        message: String,
    },
    /// A model file (see docs/model-format.md) is malformed or inconsistent.
    Model {
        /// File, line and column (`model.toml:12:5`), or the file alone.
        location: String,
        /// What is wrong and what to change.
        message: String,
    },
    /// An expression (see [`crate::expr`]) failed to parse or to evaluate.
    /// Displays as the source with a caret under `column` when it is known
    /// ([`crate::expr::render`]).
    Expression {
        /// Where the expression came from (file and line), if given.
        location: Option<String>,
        /// The expression's source text.
        expr: String,
        /// 1-based column in characters, when the problem has one.
        column: Option<usize>,
        /// What is wrong and what was expected.
        message: String,
    },
}

impl fmt::Display for Error {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            Error::NonFinite { function, argument } => write!(
                f,
                "{function}: argument `{argument}` is NaN or infinite; pass a finite number"
            ),
            Error::ZeroPrecision => write!(
                f,
                "a precision of 0 was requested; ask for at least 1 bit (or 1 decimal digit)"
            ),
            Error::PrecisionTooHigh {
                requested_bits,
                max_bits,
            } => write!(
                f,
                "precision of {requested_bits} bits requested, above the cap of {max_bits} bits \
                 (about {} digits); ask for fewer digits",
                (*max_bits as f64 * std::f64::consts::LOG10_2) as u64
            ),
            Error::DoubleTooPrecise { requested_bits } => write!(
                f,
                "the double-precision path carries 53 bits but {requested_bits} were requested; \
                 use the arbitrary-precision type (rug::Complex) for more"
            ),
            Error::Pole {
                function,
                order,
                at,
            } => write!(f, "{function}: pole of order {order} at {at}"),
            Error::Zero {
                function,
                order,
                at,
            } => write!(
                f,
                "{function}: zero of order {order} at {at}; its logarithm is singular there"
            ),
            Error::Overflow { function, hint } => {
                write!(f, "{function}: result overflows the number range; {hint}")
            }
            Error::NoConvergence {
                what,
                achieved,
                hint,
            } => write!(
                f,
                "{what} did not reach the requested accuracy (best error estimate {achieved}); {hint}"
            ),
            Error::Domain { function, message } => write!(f, "{function}: {message}"),
            Error::Model { location, message } => write!(f, "{location}: {message}"),
            Error::Expression {
                location,
                expr,
                column,
                message,
            } => f.write_str(&crate::expr::render(
                expr,
                *column,
                message,
                location.as_deref(),
            )),
            Error::Divergent {
                condition,
                value,
                hint,
            } => write!(
                f,
                "the infinite product diverges: the condition {condition} fails (its value is {value}); {hint}"
            ),
        }
    }
}

impl std::error::Error for Error {}

/// Shorthand used throughout the crate.
pub type Result<T> = std::result::Result<T, Error>;
