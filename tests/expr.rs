//! The expression language (src/expr): parsing of every construct,
//! precedence, values against closed forms on both paths (the source of each
//! identity beside it: DLMF equation numbers, https://dlmf.nist.gov, or
//! "common practice"), error columns, the analysis helpers, canonical
//! printing, and a deterministic fuzz loop for panics.

use dressing::expr::{with_location, Builtin, Env, Expr, Node};
use dressing::{Error, Result};
use num_complex::Complex64;
use rug::float::Constant;
use rug::{Complex, Float, Rational};
use std::collections::{BTreeMap, HashMap};

const PI: f64 = std::f64::consts::PI;
/// 50 digits need 167 bits; a few more for the identities' own arithmetic.
const WP50: u32 = 180;

fn p(s: &str) -> Expr {
    Expr::parse(s).unwrap_or_else(|e| panic!("`{s}` should parse:\n{e}"))
}

fn c(re: f64, im: f64) -> Complex64 {
    Complex64::new(re, im)
}

fn env64() -> Vec<(&'static str, Complex64)> {
    vec![
        ("a", c(0.3, 0.0)),
        ("b", c(-1.25, 0.5)),
        ("theta", c(0.7, 0.1)),
        ("x", c(3.0, 0.0)),
        ("z", c(0.7, 0.3)),
    ]
}

fn env_mp(wp: u32) -> Vec<(&'static str, Complex)> {
    env64()
        .into_iter()
        .map(|(k, v)| (k, Complex::with_val(wp, (v.re, v.im))))
        .collect()
}

fn d(s: &str) -> Complex64 {
    p(s).eval(&env64(), 53)
        .unwrap_or_else(|e| panic!("`{s}` should evaluate:\n{e}"))
}

fn m(s: &str, wp: u32) -> Complex {
    p(s).eval(&env_mp(wp), wp)
        .unwrap_or_else(|e| panic!("`{s}` should evaluate:\n{e}"))
}

fn assert_d(s: &str, want: Complex64, tol: f64, source: &str) {
    let got = d(s);
    let err = (got - want).norm() / want.norm().max(1.0);
    assert!(
        err <= tol,
        "{source}: `{s}` = {got}, want {want} (rel. error {err:e})"
    );
}

/// `|got − want| ≤ 10^−digits · max(|want|, 1)`.
fn assert_m(got: &Complex, want: &Complex, digits: i32, what: &str) {
    let diff = Complex::with_val(WP50, got - want);
    let scale = Float::with_val(WP50, want.abs_ref()).max(&Float::with_val(WP50, 1));
    let rel = Float::with_val(WP50, diff.abs_ref()) / scale;
    let bound = Float::with_val(WP50, Float::u_pow_u(10, digits as u32)).recip();
    assert!(
        rel <= bound,
        "{what}: off by {} (want {} digits)\n got  {got}\n want {want}",
        rel.to_f64(),
        digits
    );
}

/// The column and message of a parse error.
fn parse_err(s: &str) -> (usize, String) {
    match Expr::parse(s) {
        Ok(e) => panic!("`{s}` should not parse, got {e}"),
        Err(Error::Expression {
            column: Some(col),
            message,
            ..
        }) => (col, message),
        Err(other) => panic!("`{s}`: unexpected error kind {other:?}"),
    }
}

fn eval_err(s: &str) -> Error {
    match p(s).eval::<Complex64, _>(&env64(), 53) {
        Ok(v) => panic!("`{s}` should fail, got {v}"),
        Err(e) => e,
    }
}

fn q(n: i64, den: i64) -> Rational {
    Rational::from((n, den))
}

fn exact(s: &str) -> Option<Rational> {
    p(s).to_rational(|name| match name {
        "a" => Some(q(1, 2)),
        "b" => Some(q(3, 1)),
        "z" => Some(q(0, 1)),
        _ => None,
    })
}

// ---------------------------------------------------------------- parsing

#[test]
fn numbers_are_exact_decimals() {
    for (s, n, den) in [
        ("2", 2, 1),
        ("0.25", 1, 4),
        ("1e-3", 1, 1000),
        ("2.5E+4", 25000, 1),
        ("2.5e4", 25000, 1),
        ("12.50", 25, 2),
        ("0", 0, 1),
        ("007", 7, 1),
        ("1E0", 1, 1),
    ] {
        let Node::Number(x) = p(s).node().clone() else {
            panic!("{s} is not a number node")
        };
        assert_eq!(*x.value(), q(n, den), "{s}");
        assert_eq!(x.to_f64(), s.parse::<f64>().unwrap(), "{s}");
    }
}

#[test]
fn constants_and_names() {
    assert_eq!(*p("i").node(), Node::I);
    assert_eq!(*p("pi").node(), Node::Pi);
    assert_eq!(*p("π").node(), Node::Pi);
    for name in [
        "theta", "a_1", "_x", "Theta2", "θ", "ξ", "α", "β", "γ", "λ", "μ", "ν",
    ] {
        assert_eq!(*p(name).node(), Node::Var(name.into()), "{name}");
    }
    // `pi2` and `ip` are ordinary names, not constants.
    assert_eq!(*p("pi2").node(), Node::Var("pi2".into()));
    assert_eq!(*p("ip").node(), Node::Var("ip".into()));
}

#[test]
fn operators_and_grouping() {
    assert!(matches!(p("a + b - x").node(), Node::Sum(t) if t.len() == 3));
    assert!(matches!(p("a * b / x").node(), Node::Product(f) if f.len() == 3));
    assert!(matches!(p("a ^ b").node(), Node::Pow(..)));
    assert!(matches!(p("-a").node(), Node::Neg(_)));
    assert_eq!(p("+a"), p("a"));
    assert_eq!(p("((a))"), p("a"));
    // U+2212 is read as a minus sign.
    assert_eq!(p("a − b"), p("a - b"));
    // Whitespace is free: spaces, tabs, newlines.
    assert_eq!(p(" \t(a\n+ b ) *x "), p("(a+b)*x"));
}

#[test]
fn every_builtin_parses_as_a_call() {
    for &b in Builtin::ALL {
        let args = if b.arity() == 2 { "1, z" } else { "z" };
        let s = format!("{}({args})", b.name());
        match p(&s).node() {
            Node::Call(got, a) => {
                assert_eq!(*got, b);
                assert_eq!(a.len(), b.arity());
            }
            other => panic!("{s}: {other:?}"),
        }
    }
}

#[test]
fn unknown_names_are_user_calls() {
    match p("S(theta + i*pi)").node() {
        Node::UserCall(name, args) => {
            assert_eq!(name, "S");
            assert_eq!(args.len(), 1);
        }
        other => panic!("{other:?}"),
    }
    assert!(matches!(p("f()").node(), Node::UserCall(n, a) if n == "f" && a.is_empty()));
    assert!(
        Expr::parse("σ(a)").is_err(),
        "σ is not among the Greek names"
    );
    assert!(matches!(p("sigma(a, b, 3)").node(), Node::UserCall(_, a) if a.len() == 3));
    assert!(matches!(p("γ(a)").node(), Node::UserCall(n, _) if n == "γ"));
}

// ------------------------------------------------- precedence, associativity

#[test]
fn precedence_and_associativity() {
    // Common practice (as in mathematics and Fortran/Python): ^ is
    // right-associative and binds tighter than unary minus; + - * / are
    // left-associative.
    for (s, n, den) in [
        ("2^3^2", 512, 1),
        ("-2^2", -4, 1),
        ("1-2-3", -4, 1),
        ("8/4/2", 1, 1),
        ("2*3+4", 10, 1),
        ("2+3*4", 14, 1),
        ("2^-1", 1, 2),
        ("(-2)^2", 4, 1),
        ("2*-3", -6, 1),
        ("--2", 2, 1),
        ("-2^-2", -1, 4),
        ("2^3*2", 16, 1),
        ("2*3^2", 18, 1),
        ("1/2/2^2", 1, 8),
        ("(1-2)-3", -4, 1),
        ("1-(2-3)", 2, 1),
        ("-(2+3)*2", -10, 1),
    ] {
        assert_eq!(exact(s), Some(q(n, den)), "exact value of {s}");
        let v = d(s);
        assert_eq!(v, c(n as f64 / den as f64, 0.0), "double value of {s}");
    }
    // -x^2 = -(x^2) with x = 3.
    assert_eq!(d("-x^2"), c(-9.0, 0.0));
}

// ------------------------------------------------------------ double values

#[test]
fn elementary_values_double() {
    let z = c(0.7, 0.3);
    let i = Complex64::i();
    assert_d("exp(i*pi)", c(-1.0, 0.0), 2e-16, "DLMF 4.14.3 at z = π");
    assert_d(
        "cosh(z)^2 - sinh(z)^2",
        c(1.0, 0.0),
        1e-15,
        "DLMF 4.28.3 (product of both signs)",
    );
    assert_d("cosh(z) + sinh(z)", z.exp(), 1e-15, "DLMF 4.28.3");
    assert_d("sin(i*z)", i * z.sinh(), 1e-15, "DLMF 4.28.8");
    assert_d("cos(i*z)", z.cosh(), 1e-15, "DLMF 4.28.9");
    assert_d("tan(i*z)", i * z.tanh(), 1e-15, "DLMF 4.28.10");
    assert_d("tanh(z)", z.sinh() / z.cosh(), 1e-15, "DLMF 4.28.4");
    assert_d(
        "tanh(2.5 - 0.4*i)",
        c(2.5, -0.4).tanh(),
        1e-15,
        "DLMF 4.28.4",
    );
    assert_d("tanh(-3 + i)", c(-3.0, 1.0).tanh(), 1e-15, "DLMF 4.28.4");
    assert_d("tan(z)", z.sin() / z.cos(), 1e-15, "DLMF 4.14.4");
    assert_d("sqrt(z)^2", z, 1e-15, "DLMF 4.2.5 (principal power)");
    assert_d("exp(log(z))", z, 1e-15, "DLMF 4.2.5");
    assert_d("z^0.5", z.sqrt(), 1e-15, "principal power, DLMF 4.2.26");
    // Principal branches on the negative axis: the upper side (DLMF 4.2.7).
    assert_d("log(-1)", c(0.0, PI), 1e-16, "DLMF 4.2.7");
    assert_d("log(-2)", c(2f64.ln(), PI), 1e-16, "DLMF 4.2.7");
    assert_d(
        "sqrt(-4)",
        c(0.0, 2.0),
        1e-16,
        "principal square root, DLMF 4.2.7 and 4.2.26",
    );
    assert_d(
        "(-8)^(1/3)",
        c(1.0, 3f64.sqrt()),
        1e-15,
        "principal power, DLMF 4.2.26",
    );
    // Integer powers are exact.
    assert_eq!(d("2^10"), c(1024.0, 0.0));
    assert_eq!(d("(-2)^3"), c(-8.0, 0.0));
    assert_eq!(d("i^2"), c(-1.0, 0.0));
    assert_eq!(d("0^2"), c(0.0, 0.0));
    assert_eq!(d("0^0"), c(1.0, 0.0));
    assert_eq!(d("0^0.5"), c(0.0, 0.0));
    // No overflow in tanh, tan and division where the result is finite.
    assert_d("tanh(1000)", c(1.0, 0.0), 0.0, "DLMF 4.28.4, limit");
    assert_d("tanh(-1000 + 2*i)", c(-1.0, 0.0), 0.0, "DLMF 4.28.4, limit");
    assert_d("tan(1000*i)", c(0.0, 1.0), 0.0, "DLMF 4.28.10, limit");
    assert_d("sinh(400)/sinh(400)", c(1.0, 0.0), 1e-15, "common practice");
    assert_d(
        "1e-200/(3e-200*i)",
        c(0.0, -1.0 / 3.0),
        1e-15,
        "common practice",
    );
}

#[test]
fn special_values_double() {
    // The double-path Γ carries ~1e-15 relative error (its radius says 6e-14).
    assert_d("gamma(1/2)^2", c(PI, 0.0), 4e-15, "DLMF 5.4.6");
    assert_d("rgamma(1/2)^2*pi", c(1.0, 0.0), 4e-15, "DLMF 5.4.6");
    assert_eq!(
        d("rgamma(-4)"),
        c(0.0, 0.0),
        "1/Γ vanishes at the poles of Γ (DLMF 5.2.1)"
    );
    assert_d("loggamma(5)", c(24f64.ln(), 0.0), 4e-15, "DLMF 5.4.1");
    assert_d("gamma(5)", c(24.0, 0.0), 4e-15, "DLMF 5.4.1");
    assert_d(
        "digamma(1)",
        c(-0.577_215_664_901_532_9, 0.0),
        4e-15,
        "DLMF 5.4.12",
    );
    assert_d(
        "polygamma(1, 1)",
        c(PI * PI / 6.0, 0.0),
        4e-15,
        "DLMF 5.15.2 with ζ(2) = π²/6",
    );
    assert_d(
        "polygamma(0, 1)",
        c(-0.577_215_664_901_532_9, 0.0),
        4e-15,
        "DLMF 5.4.12",
    );
    assert_d("barnesg(4)", c(2.0, 0.0), 1e-14, "DLMF 5.17.2");
    assert_d("logbarnesg(5)", c(12f64.ln(), 0.0), 1e-14, "DLMF 5.17.2");
}

#[test]
fn cdd_prefactor_is_a_phase() {
    // Common practice: a CDD factor (sinh θ + i sin πa)/(sinh θ − i sin πa)
    // is unitary, |S(θ)| = 1 and S(θ) S(−θ) = 1, for real θ and a.
    let e = p("(sinh(theta) + i*sin(pi*a)) / (sinh(theta) - i*sin(pi*a))");
    let flip = p("(sinh(-theta) + i*sin(pi*a)) / (sinh(-theta) - i*sin(pi*a))");
    for k in 0..20 {
        let theta = -3.0 + 0.31 * k as f64;
        let env = [("theta", c(theta, 0.0)), ("a", c(0.37, 0.0))];
        let s: Complex64 = e.eval(&env, 53).unwrap();
        let t: Complex64 = flip.eval(&env, 53).unwrap();
        assert!(
            (s.norm() - 1.0).abs() < 1e-15,
            "θ = {theta}: |S| = {}",
            s.norm()
        );
        assert!(
            (s * t - 1.0).norm() < 1e-15,
            "θ = {theta}: S(θ)S(−θ) = {}",
            s * t
        );
    }
}

// ------------------------------------------------------------ 50-digit values

#[test]
fn values_at_50_digits() {
    let wp = WP50;
    let one = Complex::with_val(wp, 1);
    let pi = Complex::with_val(wp, Constant::Pi);
    // DLMF 4.14.3: e^{iπ} = cos π + i sin π = −1.
    assert_m(
        &m("exp(i*pi)", wp),
        &Complex::with_val(wp, -1),
        50,
        "DLMF 4.14.3",
    );
    // DLMF 4.28.3, both signs multiplied: cosh² − sinh² = 1.
    assert_m(&m("cosh(z)^2 - sinh(z)^2", wp), &one, 50, "DLMF 4.28.3");
    assert_m(
        &m("cosh(theta) + sinh(theta)", wp),
        &m("exp(theta)", wp),
        50,
        "DLMF 4.28.3",
    );
    // DLMF 5.4.6: Γ(1/2) = √π.
    assert_m(&m("gamma(1/2)^2", wp), &pi, 50, "DLMF 5.4.6");
    assert_m(
        &m("gamma(0.5)", wp),
        &Complex::with_val(wp, pi.sqrt_ref()),
        50,
        "DLMF 5.4.6",
    );
    // DLMF 4.2.7: principal log on the upper side of the cut.
    let ipi = Complex::with_val(wp, (0, Float::with_val(wp, Constant::Pi)));
    assert_m(&m("log(-1)", wp), &ipi, 50, "DLMF 4.2.7");
    // Against MPC's own functions (independent implementations).
    let z = Complex::with_val(wp, (0.7, 0.3));
    for (s, want) in [
        ("sinh(z)", Complex::with_val(wp, z.sinh_ref())),
        ("cosh(z)", Complex::with_val(wp, z.cosh_ref())),
        ("tanh(z)", Complex::with_val(wp, z.tanh_ref())),
        ("tan(z)", Complex::with_val(wp, z.tan_ref())),
        (
            "tanh(3*z)",
            Complex::with_val(wp, Complex::with_val(wp, &z * 3).tanh()),
        ),
        (
            "tanh(-3*z)",
            Complex::with_val(wp, Complex::with_val(wp, &z * -3).tanh()),
        ),
        (
            "tan(5*i*z)",
            Complex::with_val(wp, z.clone().mul_i(false) * 5u32).tan(),
        ),
        ("sqrt(z)", Complex::with_val(wp, z.sqrt_ref())),
        ("log(z)", Complex::with_val(wp, z.ln_ref())),
    ] {
        assert_m(&m(s, wp), &want, 50, &format!("{s} against MPC"));
    }
    // The CDD prefactor against the same formula written in MPC directly.
    let theta = Complex::with_val(wp, (0.7, 0.1));
    let a = Complex::with_val(wp, 0.3);
    let sh = Complex::with_val(wp, theta.sinh_ref());
    let sn = Complex::with_val(wp, Complex::with_val(wp, &pi * &a).sin());
    let isn = sn.mul_i(false);
    let want = Complex::with_val(wp, &sh + &isn) / Complex::with_val(wp, &sh - &isn);
    let got = m(
        "(sinh(theta) + i*sin(pi*a)) / (sinh(theta) - i*sin(pi*a))",
        wp,
    );
    assert_m(&got, &want, 50, "CDD prefactor against MPC");
}

#[test]
fn literals_and_parameters_at_working_precision() {
    // A decimal literal is rounded correctly to the working precision.
    for wp in [64u32, 200, 1000] {
        let v: Complex = p("0.1").eval(&(), wp).unwrap();
        assert_eq!(v.prec(), (wp, wp));
        let want = Float::with_val(wp, Float::parse("0.1").unwrap());
        assert_eq!(*v.real(), want, "0.1 at {wp} bits");
    }
    // Parameters are rounded to the working precision.
    let env = [("a", Complex::with_val(400, 1) / 3u32)];
    let v: Complex = p("a*1").eval(&env, 100).unwrap();
    assert_eq!(v.prec(), (100, 100));
    // The double path ignores wp.
    let v: Complex64 = p("1/3").eval(&(), 100_000).unwrap();
    assert_eq!(v.re, 1.0 / 3.0);
    // An invalid wp on the MPC path is the precision error.
    assert_eq!(
        p("1").eval::<Complex, _>(&(), 0).unwrap_err(),
        Error::ZeroPrecision
    );
}

// ----------------------------------------------------------- error columns

#[test]
fn parse_error_columns() {
    let cases: &[(&str, usize, &str)] = &[
        ("2pi", 2, "write `2*pi`"),
        ("sin(", 5, "but the expression ended"),
        ("1+", 3, "expected a number, a name or '('"),
        (")", 1, "unexpected ')' — expected a number, a name or '('"),
        ("3..2", 3, "expected a digit after the decimal point"),
        ("f(,)", 3, "unexpected ','"),
        ("θ +* 2", 4, "unexpected '*'"),
        ("a + é", 5, "unexpected character 'é'"),
        ("θ + 😀", 5, "unexpected character '😀'"),
        ("2 3", 3, "write `2*3`"),
        ("(a)(b)", 4, "implicit multiplication"),
        ("θ2", 2, "write `θ*2`"),
        ("(1+2", 5, "expected ')' to close the '(' at column 1"),
        ("1+2)", 4, "there is no '(' to close"),
        ("sin 2", 5, "expected '(' after the function name `sin`"),
        ("sin(1, 2)", 1, "`sin` takes 1 argument, but 2 were given"),
        ("polygamma(z)", 1, "`polygamma` takes 2 arguments"),
        ("pi(2)", 1, "`pi` is a constant"),
        ("", 1, "the expression is empty"),
        ("   ", 1, "the expression is empty"),
        ("2**3", 3, "powers are written with '^'"),
        ("1e+", 4, "expected digits for the exponent"),
        ("3.", 3, "expected a digit after the decimal point"),
        (".5", 1, "write 0.5"),
        ("φ + 1", 1, "θξαβγλμν"),
        ("x·y", 2, "write '*'"),
        ("f(1,", 5, "but the expression ended"),
        ("g(1 2)", 5, "write `1*2`"),
        ("(1, 2)", 3, "commas only separate"),
        ("1, 2", 2, "commas only separate"),
        ("1e999999", 1, "number out of range"),
    ];
    for &(src, col, needle) in cases {
        let (got_col, msg) = parse_err(src);
        assert_eq!(got_col, col, "column for `{src}` (message: {msg})");
        assert!(msg.contains(needle), "message for `{src}`: {msg}");
    }
}

#[test]
fn rendered_form_has_a_caret_under_the_column() {
    let e = Expr::parse(")").unwrap_err();
    assert_eq!(
        e.to_string(),
        ")\n^ unexpected ')' — expected a number, a name or '('"
    );
    // Columns count characters, not bytes: θ is one column.
    let e = Expr::parse("θ + θ + )").unwrap_err();
    assert_eq!(
        e.to_string(),
        "θ + θ + )\n        ^ unexpected ')' — expected a number, a name or '('"
    );
    // A location prefix keeps the caret aligned; tabs are kept.
    let e = with_location(Expr::parse("\t2pi").unwrap_err(), "model.toml:4");
    let text = e.to_string();
    let mut lines = text.lines();
    assert_eq!(lines.next(), Some("model.toml:4: \t2pi"));
    assert_eq!(
        lines.next(),
        Some("              \t ^ missing operator before `pi` — implicit multiplication is not allowed; write `2*pi`")
    );
}

#[test]
fn deep_nesting_is_an_error_not_a_crash() {
    let ok = format!("{}1{}", "(".repeat(150), ")".repeat(150));
    assert_eq!(exact(&ok), Some(q(1, 1)));
    let deep = format!("{}1{}", "(".repeat(100_000), ")".repeat(100_000));
    let (_, msg) = parse_err(&deep);
    assert!(msg.contains("nested too deeply"), "{msg}");
    let (_, msg) = parse_err(&"-".repeat(100_000));
    assert!(msg.contains("nested too deeply"), "{msg}");
    let (_, msg) = parse_err(&"2^".repeat(50_000));
    assert!(msg.contains("nested too deeply"), "{msg}");
    // Long sums and products do not nest.
    let long = vec!["1"; 5000].join(" + ");
    assert_eq!(d(&long), c(5000.0, 0.0));
    assert_eq!(p(&long).to_string(), long);
    let long = vec!["x"; 5000].join("/");
    assert!(p(&long).affine_in("x").is_none());
}

#[test]
fn evaluation_errors_name_the_problem() {
    // Unknown parameter: named, with the known ones and a column.
    let env = [("a", c(1.0, 0.0)), ("b", c(2.0, 0.0))];
    let e = p("a + sin(xi)").eval::<Complex64, _>(&env, 53).unwrap_err();
    match &e {
        Error::Expression {
            column, message, ..
        } => {
            assert_eq!(*column, Some(9));
            assert_eq!(message, "unknown parameter `xi` — known: a, b");
        }
        other => panic!("{other:?}"),
    }
    // Unknown function: named, with the list of built-ins and a column.
    let e = p("1 + foo(2)").eval::<Complex64, _>(&(), 53).unwrap_err();
    match &e {
        Error::Expression {
            column, message, ..
        } => {
            assert_eq!(*column, Some(5));
            assert!(
                message.starts_with("unknown function `foo` — the built-ins are exp, log, sqrt")
            );
            assert!(message.contains("logbarnesg"), "{message}");
        }
        other => panic!("{other:?}"),
    }
    // A parameter called like a function gets a hint.
    let msg = eval_err("a(2)").to_string();
    assert!(
        msg.contains("`a` is a parameter — for a product write `a*(...)`"),
        "{msg}"
    );
    // Poles of the special functions are the crate's Error::Pole.
    for s in [
        "gamma(0)",
        "gamma(-2)",
        "gamma(1 - x)",
        "digamma(0)",
        "polygamma(2, -1)",
    ] {
        assert!(matches!(eval_err(s), Error::Pole { .. }), "{s}");
    }
    assert!(matches!(eval_err("logbarnesg(-1)"), Error::Zero { .. }));
    // Division by an exact zero.
    let msg = eval_err("1/(a - a)").to_string();
    assert_eq!(
        msg,
        "division by zero: `a - a` is exactly 0, in `1/(a - a)`"
    );
    assert!(eval_err("0^(-1)").to_string().contains("division by zero"));
    assert!(eval_err("0^(-0.5)").to_string().contains("undefined"));
    assert!(eval_err("log(0)")
        .to_string()
        .contains("`log` of exactly 0"));
    // Overflow on the double path, fine on the MPC path.
    assert!(eval_err("exp(1000)")
        .to_string()
        .contains("`exp` overflowed"));
    assert!(eval_err("1e300*1e300")
        .to_string()
        .contains("the product `1e300*1e300` overflowed"));
    assert!(eval_err("1e400")
        .to_string()
        .contains("does not fit in double precision"));
    assert!((m("exp(1000)*1e-434", 100).real().to_f64() - 1.970_071_114).abs() < 1e-8);
    assert!(m("1e400", 100).real().to_f64().is_infinite());
    // polygamma's order must be a non-negative integer.
    let msg = eval_err("polygamma(0.5, 1)").to_string();
    assert!(msg.contains("must be a non-negative integer"), "{msg}");
    assert!(matches!(
        eval_err("polygamma(201, 1)"),
        Error::Domain { .. }
    ));
    // Too large an argument for the reduction modulo π on the MPC path.
    let r = p("sin(2^100000)").eval::<Complex, _>(&(), 100);
    assert!(r.unwrap_err().to_string().contains("argument too large"));
}

#[test]
fn user_functions_resolve_through_the_callback() {
    let e = p("S(theta + i*pi) * S(theta)");
    let calls = std::cell::Cell::new(0);
    let s = |name: &str, args: &[Complex64]| -> Option<Result<Complex64>> {
        calls.set(calls.get() + 1);
        (name == "S").then(|| Ok(args[0].tanh()))
    };
    let th = c(0.4, 0.0);
    let v: Complex64 = e.eval_with(&[("theta", th)], &s, 53).unwrap();
    let want = (th + Complex64::i() * PI).tanh() * th.tanh();
    assert!((v - want).norm() < 1e-15);
    assert_eq!(calls.get(), 2);
    // Several arguments.
    let f = |_: &str, args: &[Complex64]| Some(Ok(args.iter().sum::<Complex64>()));
    let v: Complex64 = p("F(1, 2, 3) + F()").eval_with(&(), &f, 53).unwrap();
    assert_eq!(v, c(6.0, 0.0));
    // Errors from the callback pass through; NaN from it is an error.
    let bad = |name: &str, _: &[Complex64]| match name {
        "E" => Some(Err(Error::Domain {
            function: "E",
            message: "nope".into(),
        })),
        "N" => Some(Ok(c(f64::NAN, 0.0))),
        _ => None,
    };
    assert!(matches!(
        p("E(1)").eval_with::<Complex64, _, _>(&(), &bad, 53),
        Err(Error::Domain { function: "E", .. })
    ));
    let msg = p("N(1)")
        .eval_with::<Complex64, _, _>(&(), &bad, 53)
        .unwrap_err()
        .to_string();
    assert!(msg.contains("the function `N` produced NaN"), "{msg}");
    // A parameter that is NaN is named.
    let msg = p("2*a")
        .eval::<Complex64, _>(&[("a", c(f64::NAN, 0.0))], 53)
        .unwrap_err()
        .to_string();
    assert!(msg.contains("parameter `a` is NaN or infinite"), "{msg}");
}

#[test]
fn environments() {
    let e = p("a*b");
    let hm: HashMap<String, Complex64> = HashMap::from([
        ("a".to_string(), c(2.0, 0.0)),
        ("b".to_string(), c(3.0, 0.0)),
    ]);
    let hs: HashMap<&str, Complex64> = HashMap::from([("a", c(2.0, 0.0)), ("b", c(3.0, 0.0))]);
    let bt: BTreeMap<String, Complex64> = hm.clone().into_iter().collect();
    let bs: BTreeMap<&str, Complex64> = hs.clone().into_iter().collect();
    let v = vec![
        ("a".to_string(), c(2.0, 0.0)),
        ("b".to_string(), c(3.0, 0.0)),
    ];
    let arr = [("a", c(2.0, 0.0)), ("b", c(3.0, 0.0))];
    let six = c(6.0, 0.0);
    assert_eq!(e.eval::<Complex64, _>(&hm, 53).unwrap(), six);
    assert_eq!(e.eval::<Complex64, _>(&hs, 53).unwrap(), six);
    assert_eq!(e.eval::<Complex64, _>(&bt, 53).unwrap(), six);
    assert_eq!(e.eval::<Complex64, _>(&bs, 53).unwrap(), six);
    assert_eq!(e.eval::<Complex64, _>(&v, 53).unwrap(), six);
    assert_eq!(e.eval::<Complex64, _>(&arr, 53).unwrap(), six);
    assert_eq!(e.eval::<Complex64, _>(&arr[..], 53).unwrap(), six);
    let mut names = Env::<Complex64>::names(&hm);
    names.sort();
    assert_eq!(names, ["a", "b"]);
    let msg = e.eval::<Complex64, _>(&(), 53).unwrap_err().to_string();
    assert!(
        msg.contains("unknown parameter `a` — none are defined"),
        "{msg}"
    );
}

// ------------------------------------------------------------------ analysis

#[test]
fn free_variables_and_user_functions() {
    let e = p("S(theta - α) + gamma(a)*b^2 + i*pi");
    let v: Vec<String> = e.free_variables().into_iter().collect();
    assert_eq!(v, ["a", "b", "theta", "α"]);
    let f: Vec<String> = e.user_functions().into_iter().collect();
    assert_eq!(f, ["S"]);
    assert!(e.depends_on("α"));
    assert!(!e.depends_on("pi"));
    assert!(p("2*pi*i").free_variables().is_empty());
    // Circular definitions are visible: a = b + 1, b = 2*a.
    assert!(p("b + 1").depends_on("b") && p("2*a").depends_on("a"));
}

#[test]
fn affine_decomposition() {
    let i = Complex64::i();
    let cases: &[(&str, &str, &str, Complex64, Complex64)] = &[
        ("i*pi - theta", "i*pi", "-1", i * PI, c(-1.0, 0.0)),
        (
            "(theta + 2*i*pi/3)/2",
            "2*i*pi/3/2",
            "1/2",
            i * PI / 3.0,
            c(0.5, 0.0),
        ),
        (
            "theta/(2*pi*i)",
            "0",
            "1/(2*pi*i)",
            c(0.0, 0.0),
            1.0 / (2.0 * PI * i),
        ),
        ("theta", "0", "1", c(0.0, 0.0), c(1.0, 0.0)),
        ("-theta", "0", "-1", c(0.0, 0.0), c(-1.0, 0.0)),
        ("2 + a", "2 + a", "0", c(2.3, 0.0), c(0.0, 0.0)),
        (
            "3*(theta - 1)*a",
            "3*(-1)*a",
            "3*a",
            c(-0.9, 0.0),
            c(0.9, 0.0),
        ),
        (
            "-(theta + a)/3",
            "-a/3",
            "-1/3",
            c(-0.1, 0.0),
            c(-1.0 / 3.0, 0.0),
        ),
        ("theta^1 + 1", "1", "1", c(1.0, 0.0), c(1.0, 0.0)),
        ("theta - theta", "0", "1 - 1", c(0.0, 0.0), c(0.0, 0.0)),
        ("S(a) + b*theta", "S(a)", "b", c(7.0, 0.0), c(-1.25, 0.5)),
    ];
    let s = |_: &str, _: &[Complex64]| Some(Ok(c(7.0, 0.0)));
    for &(src, a_text, b_text, a_val, b_val) in cases {
        let e = p(src);
        let (a, b) = e
            .affine_in("theta")
            .unwrap_or_else(|| panic!("{src} should be affine in theta"));
        assert_eq!(a.to_string(), a_text, "a of {src}");
        assert_eq!(b.to_string(), b_text, "b of {src}");
        assert!(!a.depends_on("theta") && !b.depends_on("theta"), "{src}");
        let env = env64();
        let av: Complex64 = a.eval_with(&env, &s, 53).unwrap();
        let bv: Complex64 = b.eval_with(&env, &s, 53).unwrap();
        assert!((av - a_val).norm() < 1e-15, "a of {src} = {av}");
        assert!((bv - b_val).norm() < 1e-15, "b of {src} = {bv}");
        // And the decomposition reproduces the expression at another θ.
        for th in [c(0.3, -0.2), c(-2.0, 1.5)] {
            let mut env = env64();
            env.retain(|(k, _)| *k != "theta");
            env.push(("theta", th));
            let full: Complex64 = e.eval_with(&env, &s, 53).unwrap();
            assert!((full - (av + bv * th)).norm() < 1e-14, "{src} at θ = {th}");
        }
    }
    for src in [
        "theta^2",
        "sin(theta)",
        "theta*theta",
        "1/theta",
        "S(theta)",
        "exp(theta)",
        "2^theta",
        "theta^a",
        "a/(1 + theta)",
        "(theta + 1)*(theta - 1)",
        "sqrt(theta)",
    ] {
        assert!(p(src).affine_in("theta").is_none(), "{src} is not affine");
    }
}

#[test]
fn exact_rational_values() {
    for (s, n, den) in [
        ("0.25", 1, 4),
        ("1e-3", 1, 1000),
        ("2.5E+4", 25000, 1),
        ("1/3 + 1/6", 1, 2),
        ("2^-2", 1, 4),
        ("(1/3)^2*9", 1, 1),
        ("a/b", 1, 6),
        ("a^-3", 8, 1),
        ("-(a - b)", 5, 2),
        ("z^0", 1, 1),
        ("0^0", 1, 1),
        ("z^3", 0, 1),
        ("2^(b - 1)", 4, 1),
        ("0.1 + 0.2", 3, 10),
    ] {
        assert_eq!(exact(s), Some(q(n, den)), "{s}");
    }
    for s in [
        "pi",
        "i",
        "i^2",
        "sqrt(4)",
        "exp(0)",
        "S(1)",
        "c",
        "1/0",
        "1/(a - 1/2)",
        "z^-1",
        "0^-1",
        "2^0.5",
        "2^a",
        "2^100000000",
        "10^(10^10)",
    ] {
        assert_eq!(exact(s), None, "{s}");
    }
}

// ------------------------------------------------------------------- display

#[test]
fn canonical_printing() {
    for (src, want) in [
        ("2 * 3", "2*3"),
        ("1e-3", "0.001"),
        ("2.5E+4", "25000"),
        ("1e-30", "1e-30"),
        ("123456789e30", "1.23456789e38"),
        ("0.000001", "0.000001"),
        ("0.0000001", "1e-7"),
        ("12.50", "12.5"),
        ("a - (b - c)", "a - (b - c)"),
        ("a-(-b)", "a - (-b)"),
        ("(a+b)+c", "(a + b) + c"),
        ("(a*b)*c", "(a*b)*c"),
        ("a*(b*c)", "a*(b*c)"),
        ("a/(b*c)", "a/(b*c)"),
        ("-(a*b)", "-(a*b)"),
        ("-a*b", "-a*b"),
        ("(-a)*b", "-a*b"),
        ("a*(-b)", "a*(-b)"),
        ("(-2)^2", "(-2)^2"),
        ("-2^2", "-2^2"),
        ("2^(-1)", "2^(-1)"),
        ("2^-1", "2^(-1)"),
        ("(2^3)^2", "(2^3)^2"),
        ("2^3^2", "2^3^2"),
        ("2^(a+b)", "2^(a + b)"),
        ("(a+b)^2", "(a + b)^2"),
        ("polygamma(1,  z)", "polygamma(1, z)"),
        ("π", "pi"),
        ("θ+ξ", "θ + ξ"),
        ("1−2", "1 - 2"),
        ("--a", "-(-a)"),
        ("+a", "a"),
        ("S( theta + i*pi )", "S(theta + i*pi)"),
        ("f()", "f()"),
    ] {
        let e = p(src);
        assert_eq!(e.to_string(), want, "display of {src}");
        assert_eq!(p(want), e, "{want} parses back to the tree of {src}");
    }
}

// ---------------------------------------------------------------------- fuzz

/// A small deterministic generator (64-bit LCG, Knuth's MMIX constants).
struct Lcg(u64);

impl Lcg {
    fn next(&mut self) -> u64 {
        self.0 = self
            .0
            .wrapping_mul(6_364_136_223_846_793_005)
            .wrapping_add(1_442_695_040_888_963_407);
        self.0 >> 33
    }
    fn below(&mut self, n: usize) -> usize {
        (self.next() % n as u64) as usize
    }
}

const PIECES: &[&str] = &[
    "0",
    "1",
    "2",
    "9",
    "0.5",
    "1e5",
    "1e-5",
    "3.",
    ".",
    "e",
    "E",
    "+",
    "-",
    "*",
    "/",
    "^",
    "(",
    ")",
    "(",
    ")",
    ",",
    " ",
    "a",
    "b",
    "i",
    "pi",
    "π",
    "θ",
    "theta",
    "x",
    "z",
    "sin",
    "cos",
    "tan",
    "tanh",
    "sinh",
    "exp",
    "log",
    "sqrt",
    "gamma",
    "rgamma",
    "loggamma",
    "digamma",
    "polygamma",
    "barnesg",
    "logbarnesg",
    "S",
    "é",
    "😀",
    "−",
    "_",
    "\t",
    "**",
    "1e999",
    "0^",
    "/0",
];

#[test]
fn fuzz_never_panics() {
    let mut rng = Lcg(0x5eed_cafe);
    let s = |name: &str, args: &[Complex64]| -> Option<Result<Complex64>> {
        (name == "S").then(|| Ok(args.iter().sum::<Complex64>() * 0.5))
    };
    let smp = |name: &str, args: &[Complex]| -> Option<Result<Complex>> {
        (name == "S").then(|| {
            let mut acc = Complex::with_val(64, 0);
            for a in args {
                acc += a;
            }
            Ok(acc)
        })
    };
    let env = env64();
    let env_m = env_mp(64);
    let (mut parsed, mut evaluated) = (0, 0);
    for round in 0..20_000 {
        let n = 1 + rng.below(24);
        let text: String = (0..n).map(|_| PIECES[rng.below(PIECES.len())]).collect();
        match Expr::parse(&text) {
            Err(Error::Expression {
                column: Some(col), ..
            }) => {
                assert!(
                    col >= 1 && col <= text.chars().count() + 1,
                    "`{text}`: column {col}"
                );
            }
            Err(other) => panic!("`{text}`: unexpected error {other:?}"),
            Ok(e) => {
                parsed += 1;
                // Canonical printing parses back to the same tree.
                let shown = e.to_string();
                let back = Expr::parse(&shown)
                    .unwrap_or_else(|err| panic!("`{text}` printed as `{shown}`:\n{err}"));
                assert_eq!(back, e, "`{text}` printed as `{shown}`");
                assert_eq!(back.to_string(), shown);
                let _ = e.free_variables();
                let _ = e.to_rational(|_| Some(q(1, 3)));
                if let Some((a, b)) = e.affine_in("theta") {
                    assert!(!a.depends_on("theta") && !b.depends_on("theta"));
                }
                if e.eval_with::<Complex64, _, _>(&env, &s, 53).is_ok() {
                    evaluated += 1;
                }
                if round % 4 == 0 {
                    let _ = e.eval_with::<Complex, _, _>(&env_m, &smp, 64);
                }
            }
        }
    }
    // The generator reaches the evaluator often enough to mean something.
    assert!(
        parsed > 1000 && evaluated > 200,
        "parsed {parsed}, evaluated {evaluated}"
    );
}

/// A random well-formed expression over hostile leaves (zeros, poles,
/// huge and tiny numbers) of at most `depth` levels.
fn generate(rng: &mut Lcg, depth: u32) -> String {
    const LEAVES: &[&str] = &[
        "0", "1", "2", "0.5", "-1", "-3", "1e300", "1e-300", "710", "1e5", "a", "b", "theta", "x",
        "z", "i", "pi", "θ",
    ];
    if depth == 0 || rng.below(4) == 0 {
        return LEAVES[rng.below(LEAVES.len())].to_string();
    }
    let l = generate(rng, depth - 1);
    let r = generate(rng, depth - 1);
    match rng.below(10) {
        0 => format!("({l} + {r})"),
        1 => format!("({l} - {r})"),
        2 => format!("({l} * {r})"),
        3 => format!("({l} / {r})"),
        4 => format!("({l})^({r})"),
        5 => format!("-({l})"),
        6 | 7 => {
            let b = Builtin::ALL[rng.below(Builtin::ALL.len())];
            if b.arity() == 2 {
                let n = ["0", "1", "2", "a", "-1", "201", "1e10"][rng.below(7)];
                format!("{}({n}, {l})", b.name())
            } else {
                format!("{}({l})", b.name())
            }
        }
        8 => format!("S({l}, {r})"),
        _ => format!("{l}^2"),
    }
}

/// Whether a Γ-family function is called.
fn uses_special(n: &Node) -> bool {
    use dressing::expr::{Factor, Term};
    match n {
        Node::Call(b, args) => {
            !matches!(
                b,
                Builtin::Exp
                    | Builtin::Log
                    | Builtin::Sqrt
                    | Builtin::Sin
                    | Builtin::Cos
                    | Builtin::Tan
                    | Builtin::Sinh
                    | Builtin::Cosh
                    | Builtin::Tanh
            ) || args.iter().any(uses_special)
        }
        Node::UserCall(_, args) => args.iter().any(uses_special),
        Node::Neg(x) => uses_special(x),
        Node::Pow(b, e) => uses_special(b) || uses_special(e),
        Node::Sum(ts) => ts.iter().any(|Term { node, .. }| uses_special(node)),
        Node::Product(fs) => fs.iter().any(|Factor { node, .. }| uses_special(node)),
        _ => false,
    }
}

#[test]
fn fuzz_well_formed_hostile_values() {
    let mut rng = Lcg(42);
    let s = |name: &str, args: &[Complex64]| -> Option<Result<Complex64>> {
        (name == "S").then(|| Ok(args.iter().product::<Complex64>()))
    };
    let smp = |name: &str, args: &[Complex]| -> Option<Result<Complex>> {
        (name == "S").then(|| {
            let mut acc = Complex::with_val(args[0].prec().0, 1);
            for a in args {
                acc *= a;
            }
            Ok(acc)
        })
    };
    let mut env = env64();
    env.push(("θ", c(-2.0, 0.0)));
    let mut env_m = env_mp(64);
    env_m.push(("θ", Complex::with_val(64, -2)));
    let (mut ok, mut failed) = (0, 0);
    for round in 0..20_000 {
        let text = generate(&mut rng, 5);
        let e = p(&text);
        assert_eq!(p(&e.to_string()), e, "`{text}` printed as `{e}`");
        match e.eval_with::<Complex64, _, _>(&env, &s, 53) {
            Ok(v) => {
                assert!(v.re.is_finite() && v.im.is_finite(), "`{text}` = {v}");
                ok += 1;
            }
            Err(_) => failed += 1,
        }
        // On the MPC path the Γ-family functions at such arguments (ψ at
        // 1e-7100, log G at 1e-900) can take seconds to minutes; this loop
        // checks the evaluator, so there it calls only the elementary ones.
        if round % 2 == 0 && !uses_special(e.node()) {
            if let Ok(v) = e.eval_with::<Complex, _, _>(&env_m, &smp, 64) {
                assert!(
                    v.real().is_finite() && v.imag().is_finite(),
                    "`{text}` = {v}"
                );
            }
        }
    }
    assert!(ok > 2000 && failed > 2000, "ok {ok}, failed {failed}");
}

/// The running error bound of the double path covers the actual error of
/// the double value, measured against the same expression on MPFR at 200
/// bits, and is not wildly pessimistic. Expressions are the kind of
/// elementary prefactors model files carry (the sinh form of a CDD block,
/// DLMF 4.28; ratios, powers, exponentials of sinh). Points: a seeded
/// grid over the region where the pieces are used.
#[test]
fn running_error_bound_covers_the_double_error() {
    use num_complex::Complex64;
    use rug::Complex;
    let exprs = [
        "(sinh(theta) - i*sin(pi*a))/(sinh(theta) + i*sin(pi*a))",
        "exp(i*a*sinh(theta))",
        "tanh((theta + i*pi*a)/2)/tanh((theta - i*pi*a)/2)",
        "(theta^2 + 1)/(theta^2 - 4)^3",
        "sqrt(1 + sinh(theta)^2) - cosh(theta)",
        "log(cosh(theta)) + cos(theta)^3 - tan(theta/3)",
        "-1",
    ];
    let a = 0.3f64;
    let mut checked = 0;
    let mut worst_ratio = 0.0f64;
    let mut worst = String::new();
    for text in exprs {
        let e = Expr::parse(text).unwrap();
        for i in 0..15 {
            for j in 0..7 {
                let t = Complex64::new(-6.0 + 0.83 * i as f64, -2.9 + 0.97 * j as f64);
                let env = [("theta", t), ("a", Complex64::new(a, 0.0))];
                let Some((v, b)) = e.eval_with_bound(&env, &|n| n == "theta" || n == "a") else {
                    continue;
                };
                let envm = [
                    ("theta", Complex::with_val(200, (t.re, t.im))),
                    ("a", Complex::with_val(200, a)),
                ];
                let want: Complex = e.eval(&envm, 200).unwrap();
                let err = Complex::with_val(200, &want - &Complex::with_val(53, (v.re, v.im)))
                    .abs()
                    .real()
                    .to_f64();
                assert!(
                    err <= b,
                    "{text} at {t}: error {err:e} above the bound {b:e}"
                );
                let scale = want.abs().real().to_f64().max(1.0);
                let ratio = b / err.max(f64::EPSILON * scale);
                if ratio > worst_ratio {
                    worst_ratio = ratio;
                    worst = format!("{text} at {t}: bound {b:e}, error {err:e}, |value| {scale:e}");
                }
                checked += 1;
            }
        }
    }
    assert!(checked > 500, "{checked}");
    // Pessimism: within a factor 10⁴ of the actual error (or of one ulp).
    assert!(
        worst_ratio < 1e4,
        "bound/error up to {worst_ratio:e}: {worst}"
    );
}

/// Where the first-order rules cannot be trusted the bound declines (and
/// the caller evaluates twice instead): an operand of sqrt or log that may
/// lie on either side of the negative axis, tan within its operand's error
/// of a pole, an integer power of an operand known only roughly. Common
/// practice: a running error bound is a first-order estimate.
#[test]
fn running_error_bound_declines_where_first_order_fails() {
    use num_complex::Complex64;
    let at = |text: &str, t: f64| {
        Expr::parse(text)
            .unwrap()
            .eval_with_bound(&[("theta", Complex64::new(t, 0.0))], &|n| n == "theta")
    };
    // θ − 0.1·3 is −5.6e-17 in doubles, within its own rounding of 0.
    assert!(at("sqrt(-1 + i*(theta - 0.1*3))", 0.3).is_none());
    assert!(at("log(-1 + i*(theta - 0.1*3))", 0.3).is_none());
    // 1e12 + θ − 1e12 carries an error of about 1e-4: tan near π/2 declines.
    assert!(at("tan(1e12 + theta - 1e12)", 1.57075).is_none());
    // (1e14 + θ − 1e14)^40: the base is known to about 2%, and 40 × 2% is
    // not first order; (1e12 + θ − 1e12)^40 (2e-4 relative) still is.
    assert!(at("(1e14 + theta - 1e14)^40", 1.3).is_none());
    assert!(at("(1e12 + theta - 1e12)^40", 1.3).is_some());
    // Away from these, the same expressions are bounded.
    assert!(at("sqrt(-1 + i*(theta - 0.1*3))", 0.5).is_some());
    assert!(at("tan(theta)", 1.2).is_some());
}
