//! The `dressing` command line.
//!
//! Subcommands: `demo` (the built-in demonstration), `special` (one of the
//! special functions at points and a precision), `eval` (a factor of a
//! model file at rapidities), `check` (the model's functional equations),
//! `cdd` (a proposed CDD factor), `poles` (poles and zeros), `plot` and
//! `table` (a factor and its kernel on a line, for other codes). Every
//! error a user can cause comes back as a message naming the option and what
//! to change, with a non-zero exit status.

mod cdd;
mod check;
mod demo;
mod eval;
mod parse;
mod plot;
mod poles;
mod special;
mod table;

pub use cdd::CddArgs;
pub use check::CheckArgs;
pub use eval::{EvalArgs, MethodArg};
pub use parse::parse_complex;
pub use plot::{PlotArgs, PlotKind};
pub use poles::PolesArgs;
pub use table::{TableArgs, TableFormat};

use crate::num::ComplexField;
use clap::{Parser, Subcommand, ValueEnum};
use rug::Complex;

/// Command-line arguments.
#[derive(Parser, Debug)]
#[command(
    name = "dressing",
    version,
    about = "Numerics of S-matrix scalar factors: dressing and CDD factors",
    long_about = None
)]
pub struct Cli {
    /// What to do.
    #[command(subcommand)]
    pub command: Command,
}

/// Subcommands.
#[derive(Subcommand, Debug)]
pub enum Command {
    /// Run the built-in demonstration and print what it checked.
    ///
    /// Example: dressing demo
    Demo,
    /// Evaluate a special function at one or more points.
    ///
    /// Example: dressing special loggamma --at 0.5+3i --at -7.3+0.4i --digits 50
    Special {
        /// The function.
        function: SpecialFn,
        /// A point, written like 0.3, 2.5-0.1i, 1e-5i (repeatable).
        #[arg(long = "at", required = true, allow_hyphen_values = true)]
        at: Vec<String>,
        /// Decimal digits wanted (1 to about 21000); 15 uses the double path.
        #[arg(long, default_value_t = 15)]
        digits: u64,
        /// Order n for polygamma, or integer s for hurwitz.
        #[arg(long, default_value_t = 1)]
        order: u32,
        /// Print JSON instead of a table.
        #[arg(long)]
        json: bool,
    },
    /// Evaluate a factor of a model file at rapidities.
    ///
    /// Example: dressing eval examples/lantern.toml --at 0.7+0.2i --at i*pi/3 --digits 40 --verify
    Eval(EvalArgs),
    /// Check the model's functional equations (unitarity, crossing, …) at sampled points.
    ///
    /// Example: dressing check examples/lantern.toml --digits 40 --region -1:1,4:6
    Check(CheckArgs),
    /// Test a proposed CDD factor: equations kept, poles added, edge behaviour.
    ///
    /// Example: dressing cdd examples/lantern.toml --candidate "block(1/3)" --factor sigma
    Cdd(CddArgs),
    /// Poles and zeros of a factor: orders, residues, bound-state readings.
    ///
    /// Example: dressing poles examples/lantern.toml --factor dressed --window 0:1 --masses 1,1
    Poles(PolesArgs),
    /// Draw a factor: phase portrait over the strip, the real line, or the imaginary axis (SVG or PNG).
    ///
    /// Example: dressing plot examples/lantern.toml --kind strip --factor sigma --out sigma.svg
    Plot(PlotArgs),
    /// Tabulate a factor on a line for other codes: S, the continuous phase δ and the kernel φ = −i d/dθ log S.
    ///
    /// Example: dressing table examples/lantern.toml --factor dressed --line -8:8 --n 401 --format tsv
    Table(TableArgs),
}

/// The special functions `dressing special` can evaluate.
#[derive(Clone, Copy, Debug, ValueEnum)]
pub enum SpecialFn {
    /// Principal log Γ(z).
    Loggamma,
    /// Γ(z).
    Gamma,
    /// 1/Γ(z).
    Rgamma,
    /// ψ(z).
    Digamma,
    /// ψ⁽ⁿ⁾(z), n from --order.
    Polygamma,
    /// log G(z), Barnes G on its continuous branch.
    Logbarnesg,
    /// G(z).
    Barnesg,
    /// ζ(s, z), integer s from --order.
    Hurwitz,
}

/// What a command produced: the text for standard output, and whether
/// something it was asked to compute failed (exit status 1).
#[derive(Debug, Default)]
pub struct Report {
    /// Standard output.
    pub stdout: String,
    /// Whether a requested computation failed (each failure is described in `stdout`).
    pub failed: bool,
}

impl From<String> for Report {
    fn from(stdout: String) -> Self {
        Report {
            stdout,
            failed: false,
        }
    }
}

/// Runs the command line. `Err` is a usage or input error (exit status 2),
/// with a message naming the option or file and what to change.
pub fn run(cli: Cli) -> Result<Report, String> {
    match cli.command {
        Command::Demo => Ok(demo::demo()),
        Command::Special {
            function,
            at,
            digits,
            order,
            json,
        } => special::special_cmd(function, &at, digits, order, json).map(Into::into),
        Command::Eval(args) => eval::eval_cmd(&args),
        Command::Check(args) => check::check_cmd(&args),
        Command::Cdd(args) => cdd::cdd_cmd(&args),
        Command::Poles(args) => poles::poles_cmd(&args),
        Command::Plot(args) => plot::plot_cmd(&args),
        Command::Table(args) => table::table_cmd(&args),
    }
}

/// Significant decimal digits to which `a` and `b` agree.
pub fn agreement_digits(a: &Complex, b: &Complex) -> f64 {
    let d = Complex::with_val(a.prec().0, a - b);
    if d.is_zero() {
        return a.prec().0 as f64 * std::f64::consts::LOG10_2;
    }
    (b.log2_abs() - d.log2_abs()) * std::f64::consts::LOG10_2
}
