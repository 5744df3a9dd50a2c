//! Model files: loading, parameters, evaluation on the continuous branch,
//! and every kind of bad input (each must be a clear error, never a panic).

use dressing::factor::{known::sine_gordon_soliton, Method};
use dressing::model::Model;
use dressing::{Error, Prec};
use num_complex::Complex64;
use rug::Complex;

fn lantern() -> Model {
    Model::load(concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/examples/lantern.toml"
    ))
    .unwrap()
}

fn c(prec: u32, x: f64, y: f64) -> Complex {
    Complex::with_val(prec, (x, y))
}

fn digits_apart(a: &Complex, b: &Complex) -> f64 {
    let d = Complex::with_val(a.prec().0, a - b);
    if d.is_zero() {
        return f64::INFINITY;
    }
    -d.abs().real().to_f64().log10()
}

/// A minimal model around one piece table.
fn one_piece(piece: &str) -> String {
    format!("[parameters]\ng = 0.35\n\n[[factor]]\nname = \"S\"\n\n[[factor.piece]]\n{piece}\n")
}

fn err(text: &str) -> String {
    match Model::from_toml(text, "m.toml") {
        Ok(_) => panic!("accepted:\n{text}"),
        Err(e) => e.to_string(),
    }
}

#[test]
fn example_loads_with_exact_parameters() {
    let m = lantern();
    // 0.35 is read as the exact decimal 7/20, and h = 1 − g stays exact.
    assert_eq!(m.parameters().exact("g").unwrap().to_string(), "7/20");
    assert_eq!(m.parameters().exact("h").unwrap().to_string(), "13/20");
    assert_eq!(m.factors().len(), 3);
    // Exact coefficients: the convergence analysis was decided exactly.
    let f = m.factor("sigma").unwrap();
    match &f.pieces()[0] {
        dressing::model::Piece::Product(g) => {
            assert!(g
                .convergence()
                .conditions
                .iter()
                .all(|c| c.exact && c.holds))
        }
        other => panic!("{other:?}"),
    }
}

/// The model's gamma product by its two representations (product form with
/// analytic tail; Malmstén integral, continued outside its strip): an
/// independent-methods check, common practice.
#[test]
fn product_and_integral_agree_in_and_outside_the_strip() {
    let m = lantern();
    let prec = Prec::digits(30).unwrap();
    let (lo, hi) = m.factor("sigma").unwrap().strip().unwrap();
    assert!(lo < 0.0 && hi > 0.0, "{lo} {hi}");
    for (x, y) in [
        (0.7, 0.2),
        (0.3, 0.5 * hi),
        (1.1, hi + 0.4),
        (-0.4, -2.5),
        (0.2, 3.7),
    ] {
        let t = c(prec.bits() + 32, x, y);
        let p = m.evaluate("sigma", &t, prec, Method::Product).unwrap();
        let i = m.evaluate("sigma", &t, prec, Method::Integral).unwrap();
        let d = digits_apart(&p.log.value, &i.log.value);
        assert!(d > 29.0, "θ = {x}{y:+}i: {d} digits");
        assert_eq!(p.turns, i.turns);
        assert!(p.log.correct_digits() >= 29.0);
    }
}

/// Unitarity σ(θ)σ(−θ) = 1 holds by construction (each numerator gamma has
/// its z → −z partner in the denominator): on the continuous branch from
/// θ = 0, log σ(θ) + log σ(−θ) = 0 exactly, not just modulo 2πi.
#[test]
fn unitarity_on_the_continuous_branch() {
    let m = lantern();
    let prec = Prec::digits(40).unwrap();
    for (x, y) in [(0.7, 0.2), (2.5, 1.3), (0.1, 2.9)] {
        let a = m
            .evaluate("sigma", &c(200, x, y), prec, Method::Auto)
            .unwrap();
        let b = m
            .evaluate("sigma", &c(200, -x, -y), prec, Method::Auto)
            .unwrap();
        let s = Complex::with_val(200, &a.log.value + &b.log.value);
        assert!(
            s.clone().abs().real().to_f64() < 1e-38,
            "θ = {x}{y:+}i: {s}"
        );
    }
}

/// The sine-Gordon factor written as a model file agrees with the built-in
/// `known::sine_gordon_soliton` (Zamolodchikov & Zamolodchikov 1979), and
/// a CDD block in the file agrees with its closed form.
#[test]
fn model_file_matches_the_built_in_factor() {
    // ξ is the double nearest 2π/7, written out exactly, as the built-in takes it.
    let xi = 2.0 * std::f64::consts::PI / 7.0;
    let text = format!("[parameters]\nxi = \"{xi:.80}\"\n")
        + r#"
p = "pi/xi"
[[factor]]
name = "minus_S0"
[[factor.piece]]
kind = "gamma-product"
gammas = [
  { arg = "2*p*k + 1 - p*z" }, { arg = "2*p*k + 2*p - p*z" },
  { arg = "2*p*k + 1 + p + p*z" }, { arg = "2*p*k + p + p*z" },
  { arg = "2*p*k + 1 + p*z", power = -1 }, { arg = "2*p*k + 2*p + p*z", power = -1 },
  { step = "2*p", offset = "1 + p", slope = "-p", power = -1 },
  { step = "2*p", offset = "p", slope = "-p", power = -1 },
]
"#;
    let m = Model::from_toml(&text, "sg.toml").unwrap();
    let f = sine_gordon_soliton(xi).unwrap();
    let prec = Prec::digits(50).unwrap();
    let t = c(prec.bits() + 32, 0.7, 0.2);
    let a = m.evaluate("minus_S0", &t, prec, Method::Product).unwrap();
    let b = f.log_value(&t, prec, Method::Product).unwrap();
    assert!(digits_apart(&a.log.value, &b.log.value) > 49.0);
}

#[test]
fn double_path_matches_the_mpfr_path() {
    let m = lantern();
    for name in ["sigma", "dressed", "lamp"] {
        let d = m
            .evaluate(name, &Complex64::new(0.7, 0.2), Prec::DOUBLE, Method::Auto)
            .unwrap();
        let h = m
            .evaluate(
                name,
                &c(128, 0.7, 0.2),
                Prec::digits(30).unwrap(),
                Method::Auto,
            )
            .unwrap();
        let dd = Complex::with_val(128, (d.log.value.re, d.log.value.im));
        let apart = digits_apart(&dd, &h.log.value);
        assert!(apart > 13.0, "{name}: {apart}");
        assert!(d.log.radius.to_f64() < 1e-12, "{name}: {}", d.log.radius);
    }
}

/// Along a line the phase is continuous: consecutive points differ by
/// little even where the sum of principal logs jumps by 2π.
#[test]
fn phase_is_continuous_along_a_line() {
    let m = lantern();
    let pts = m
        .evaluate_line(
            "dressed",
            &Complex64::new(-6.0, 0.0),
            &Complex64::new(6.0, 0.0),
            241,
            Prec::DOUBLE,
            Method::Auto,
        )
        .unwrap();
    let phases: Vec<f64> = pts.iter().map(|r| r.as_ref().unwrap().phase()).collect();
    for w in phases.windows(2) {
        assert!((w[1] - w[0]).abs() < 0.5, "{} → {}", w[0], w[1]);
    }
    // Each point agrees with its own straight-path evaluation up to whole
    // turns around the singular points between the two paths, and exactly
    // in value.
    let one = m
        .evaluate(
            "dressed",
            &Complex64::new(6.0, 0.0),
            Prec::DOUBLE,
            Method::Auto,
        )
        .unwrap();
    let last = pts.last().unwrap().as_ref().unwrap();
    assert!((one.value.value - last.value.value).norm() < 1e-13);
    // Real θ: a unitary, real-analytic factor is a pure phase.
    assert!((last.modulus() - 1.0).abs() < 1e-13);
}

/// Continuation is seamless: along a vertical line crossing the upper edge
/// of the integral's strip, the integral form (direct inside, continued
/// outside) agrees with the product form at every point to the digits
/// requested, on both sides and on the edge.
#[test]
fn crossing_the_strip_edge_is_seamless() {
    let m = lantern();
    let (_, hi) = m.factor("sigma").unwrap().strip().unwrap();
    let prec = Prec::digits(30).unwrap();
    for j in -4..=4 {
        let y = hi + j as f64 * 1e-3;
        let t = c(prec.bits() + 32, 0.6, y);
        let i = m.evaluate("sigma", &t, prec, Method::Integral).unwrap();
        let p = m.evaluate("sigma", &t, prec, Method::Product).unwrap();
        let d = digits_apart(&i.log.value, &p.log.value);
        assert!(d > 29.0, "Im θ = hi {:+e}: {d} digits", j as f64 * 1e-3);
    }
}

#[test]
fn a_pole_is_reported_as_a_pole_with_its_order() {
    // Γ(g + z) has a pole at z = −g, i.e. θ = −iπg; the Barnes ratio
    // G(1+z)/G(1−z) and exp(i g sinh θ) are regular there.
    let m = lantern();
    // exactly −iπ·7/20 at 128 bits
    let pi = rug::Float::with_val(128, rug::float::Constant::Pi);
    let t = Complex::with_val(128, (rug::Float::new(128), -pi * 7u32 / 20u32));
    match m.evaluate("lamp", &t, Prec::digits(20).unwrap(), Method::Auto) {
        Err(Error::Pole { order, .. }) => assert_eq!(order, 1),
        other => panic!("{other:?}"),
    }
}

#[test]
fn parameters_can_be_overridden() {
    let m = lantern();
    let m2 = m
        .with_parameters(&[("g".to_string(), "1/4".to_string())])
        .unwrap();
    assert_eq!(m2.parameters().exact("h").unwrap().to_string(), "3/4");
    let e = m
        .with_parameters(&[("q".to_string(), "1".to_string())])
        .unwrap_err()
        .to_string();
    assert!(e.contains("no parameter `q`") && e.contains("g, h"), "{e}");
}

// ---- bad input: each a clear error naming the place ----

#[test]
fn malformed_toml_names_line_and_column() {
    let e = err("[parameters]\ng = \n");
    assert!(e.starts_with("m.toml:2:"), "{e}");
}

#[test]
fn unknown_keys_are_rejected() {
    let e = err("colour = 1\n");
    assert!(e.contains("colour"), "{e}");
    let e = err(&one_piece(
        "kind = \"cdd\"\nblocks = [{ alpha = 0.1 }]\nwidth = 3",
    ));
    assert!(e.contains("width"), "{e}");
    let e = err(&one_piece(
        "kind = \"cdd\"\nblocks = [{ alpha = 0.1, size = 2 }]",
    ));
    assert!(e.contains("size"), "{e}");
    // A key of another kind of piece.
    let e = err(&one_piece(
        "kind = \"cdd\"\nblocks = [{ alpha = 0.1 }]\nvalue = \"1\"",
    ));
    assert!(
        e.contains("`value` does not belong") && e.contains("blocks"),
        "{e}"
    );
    let e = err(&one_piece("kind = \"sinh\""));
    assert!(
        e.contains("unknown piece kind `sinh`") && e.contains("gamma-product"),
        "{e}"
    );
}

#[test]
fn undefined_and_circular_parameters() {
    let e = err("[parameters]\na = \"b + 1\"\n[[factor]]\nname = \"S\"\n[[factor.piece]]\nkind = \"cdd\"\nblocks = [{ alpha = \"a\" }]\n");
    assert!(e.contains("`b`") && e.contains("not defined"), "{e}");
    assert!(e.starts_with("m.toml:2:"), "{e}");
    let e = err("[parameters]\na = \"c/2\"\nb = \"a + 1\"\nc = \"b\"\n[[factor]]\nname = \"S\"\n[[factor.piece]]\nkind = \"cdd\"\nblocks = [{ alpha = \"a\" }]\n");
    assert!(e.contains("circular definition") && e.contains("→"), "{e}");
    let e = err("[parameters]\npi = 3\n[[factor]]\nname = \"S\"\n[[factor.piece]]\nkind = \"cdd\"\nblocks = [{ alpha = 0.1 }]\n");
    assert!(e.contains("reserved"), "{e}");
}

#[test]
fn expression_errors_point_at_the_column_in_the_file() {
    let text = one_piece("kind = \"gamma\"\ngammas = [{ arg = \"g -* z\" }]");
    let e = err(&text);
    // line 9 of the file; the '*' is at column 23 (`gammas = [{ arg = "g -* z"`)
    assert!(e.starts_with("m.toml:9:23: g -* z"), "{e}");
    assert!(e.contains('^'), "{e}");
}

#[test]
fn bad_gamma_arguments() {
    let e = err(&one_piece(
        "kind = \"gamma\"\ngammas = [{ arg = \"g*z*z\" }]",
    ));
    assert!(e.contains("must have the form"), "{e}");
    let e = err(&one_piece("kind = \"gamma-product\"\ngammas = [{ arg = \"-k + z\" }, { arg = \"-k - z\", power = -1 }]"));
    assert!(e.contains("must be positive"), "{e}");
    let e = err(&one_piece(
        "kind = \"gamma\"\ngammas = [{ arg = \"i + z\" }]",
    ));
    assert!(e.contains("must be real"), "{e}");
    let e = err(&one_piece(
        "kind = \"gamma\"\ngammas = [{ arg = \"theta\" }]",
    ));
    assert!(e.contains("written in z"), "{e}");
    let e = err(&one_piece(
        "kind = \"gamma\"\ngammas = [{ arg = \"z\", power = 0 }]",
    ));
    assert!(e.contains("non-zero integer"), "{e}");
}

#[test]
fn divergent_product_names_the_condition() {
    // Π_k Γ(k + 1 + z)/Γ(k + 1 − z): the 1/k term of Stirling's expansion does not cancel.
    let e = err(&one_piece(
        "kind = \"gamma-product\"\ngammas = [{ arg = \"k + 1 + z\" }, { arg = \"k + 1 - z\", power = -1 }]",
    ));
    assert!(e.contains("diverges") && e.contains("condition"), "{e}");
    assert!(e.starts_with("m.toml:7:"), "{e}");
}

#[test]
fn structural_errors() {
    let e = err("[parameters]\ng = 1\n");
    assert!(e.contains("no factor"), "{e}");
    let e = err("[[factor]]\nname = \"S\"\n");
    assert!(e.contains("has no pieces"), "{e}");
    let e = err("[[factor]]\nname = \"S\"\n[[factor.piece]]\nkind = \"cdd\"\nblocks = [{ alpha = 0.1 }]\n[[factor]]\nname = \"S\"\n[[factor.piece]]\nkind = \"cdd\"\nblocks = [{ alpha = 0.2 }]\n");
    assert!(e.contains("unique"), "{e}");
    let e = err("[rapidity]\nz = \"theta/pi\"\n[[factor]]\nname = \"S\"\n[[factor.piece]]\nkind = \"cdd\"\nblocks = [{ alpha = 0.1 }]\n");
    assert!(e.contains("not one of the supported"), "{e}");
    let e = err(&one_piece(
        "kind = \"expression\"\nvalue = \"1\"\nlog = \"0\"",
    ));
    assert!(e.contains("exactly one of"), "{e}");
}

#[test]
fn base_point_at_a_pole_is_rejected() {
    // Γ(z) has a pole at z = 0, the default base point θ = 0.
    let e = err(&one_piece("kind = \"gamma\"\ngammas = [{ arg = \"z\" }]"));
    assert!(e.contains("base point") && e.contains("pole"), "{e}");
    // Moving the base point fixes it.
    let text = "[rapidity]\nbase = \"i*pi/2\"\n".to_string()
        + &one_piece("kind = \"gamma\"\ngammas = [{ arg = \"z\" }]");
    assert!(Model::from_toml(&text, "m.toml").is_ok());
}

#[test]
fn missing_file_is_an_error() {
    let e = Model::load("/nonexistent/model.toml")
        .unwrap_err()
        .to_string();
    assert!(e.contains("cannot read"), "{e}");
}

/// A Barnes G ratio written as an infinite gamma product (derivation in
/// scripts/gen_barnes_ratio.py: Π_{k<N} Γ(k+x) = G(N+x)/G(x), DLMF 5.17.1,
/// with Prouhet–Tarry–Escott offsets), against mpmath 1.4.1 `barnesg` at 40
/// digits, in the integral's half-plane Im θ > −5π/6 and far outside it,
/// by both representations; and against the model's own `barnes` piece.
#[test]
fn barnes_ratio_against_mpmath_barnesg() {
    let text = r#"
[parameters]
u = "1/2"
lam = "1/3"
[[factor]]
name = "as_product"
[[factor.piece]]
kind = "gamma-product"
gammas = [
  { arg = "k + u + lam + z" }, { arg = "k + u + 5*lam + z" }, { arg = "k + u + 6*lam + z" },
  { arg = "k + u + 2*lam + z", power = -1 }, { arg = "k + u + 3*lam + z", power = -1 },
  { arg = "k + u + 7*lam + z", power = -1 },
]
[[factor]]
name = "as_barnes"
[[factor.piece]]
kind = "barnes"
gammas = [
  { arg = "u + 2*lam + z" }, { arg = "u + 3*lam + z" }, { arg = "u + 7*lam + z" },
  { arg = "u + lam + z", power = -1 }, { arg = "u + 5*lam + z", power = -1 },
  { arg = "u + 6*lam + z", power = -1 },
]
"#;
    let m = Model::from_toml(text, "barnes.toml").unwrap();
    let (lo, hi) = m.factor("as_product").unwrap().strip().unwrap();
    assert!((lo + 5.0 * std::f64::consts::PI / 6.0).abs() < 1e-12 && hi.is_infinite());
    let table = std::fs::read_to_string(concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/tests/data/barnes_ratio.tsv"
    ))
    .unwrap();
    let prec = Prec::digits(40).unwrap();
    let mut outside = 0;
    for line in table.lines().filter(|l| !l.starts_with('#')) {
        let f: Vec<&str> = line.split('\t').collect();
        let (x, y): (f64, f64) = (f[0].parse().unwrap(), f[1].parse().unwrap());
        let want = Complex::with_val(
            200,
            (
                rug::Float::parse(f[2]).unwrap(),
                rug::Float::parse(f[3]).unwrap(),
            ),
        );
        if y < lo {
            outside += 1;
        }
        let t = c(prec.bits() + 32, x, y);
        for (name, method) in [
            ("as_product", Method::Product),
            ("as_product", Method::Integral),
            ("as_barnes", Method::Auto),
        ] {
            let v = m.evaluate(name, &t, prec, method).unwrap();
            let rel = {
                let d = Complex::with_val(200, &v.value.value - &want);
                (d.abs().real().to_f64() / want.clone().abs().real().to_f64()).log10()
            };
            assert!(rel < -39.0, "{name} {method:?} θ = {x}{y:+}i: 10^{rel:.1}");
            assert!(v.value.correct_digits() >= 39.0);
        }
    }
    assert!(outside >= 4);
}

/// Far out on the real line the quadrature cannot resolve the oscillation
/// and the product form would need more factors than its cap; `Auto` tries
/// both and names both failures instead of a quadrature message alone.
#[test]
fn a_rapidity_beyond_both_representations_says_so() {
    let m = lantern();
    let e = m
        .evaluate(
            "sigma",
            &num_complex::Complex64::new(1e6, 0.0),
            Prec::DOUBLE,
            Method::Auto,
        )
        .unwrap_err()
        .to_string();
    assert!(e.contains("neither representation"), "{e}");
    assert!(
        e.contains("integral form") && e.contains("product form"),
        "{e}"
    );
    assert!(e.contains("evaluate nearer the origin"), "{e}");
    // Nearer, Auto still succeeds (the product form, 100 factors).
    assert!(m
        .evaluate(
            "sigma",
            &num_complex::Complex64::new(300.0, 0.0),
            Prec::DOUBLE,
            Method::Auto
        )
        .is_ok());
}

/// A value piece `-1` is the principal logarithm iπ (DLMF 4.2.3: the
/// phase in (−π, π]), not −iπ from the signed zero of `-1 = −(1 + 0i)`.
#[test]
fn a_negative_constant_piece_has_the_principal_logarithm() {
    let m = Model::from_toml(
        "[[factor]]\nname = \"S\"\n[[factor.piece]]\nkind = \"expression\"\nvalue = \"-1\"\n",
        "neg.toml",
    )
    .unwrap();
    let v = m
        .evaluate("S", &Complex64::new(0.3, 0.0), Prec::DOUBLE, Method::Auto)
        .unwrap();
    assert!(
        (v.log.value.im - std::f64::consts::PI).abs() < 1e-15,
        "{}",
        v.log.value
    );
}
