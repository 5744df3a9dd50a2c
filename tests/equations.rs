//! Functional equations checked point by point, against published
//! factors, and the equation syntax's bad input.

use dressing::equations::{check_equation, CheckOptions, Region};
use dressing::model::Model;
use dressing::Prec;
use rug::Complex;

/// The sine-Gordon soliton–soliton factor −S₀ with unitarity, crossing
/// and real analyticity (tests/data/models/sine-gordon.toml, which names
/// its source), at coupling `xi` (an expression).
fn sine_gordon_text(xi: &str) -> String {
    std::fs::read_to_string(concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/tests/data/models/sine-gordon.toml"
    ))
    .unwrap()
    .replace("xi = \"2*pi/7\"", &format!("xi = \"{xi}\""))
}

fn sine_gordon(xi: &str) -> Model {
    Model::from_toml(&sine_gordon_text(xi), "sine-gordon.toml").unwrap()
}

/// Crossing at points where θ lies in the integral's strip |Im θ| < ξ and
/// iπ − θ far outside it, to 50 digits, for ξ below 1, at 2π/7 and above π/2.
#[test]
fn sine_gordon_unitarity_and_crossing_to_50_digits() {
    let prec = Prec::digits(50).unwrap();
    for xi in ["0.6", "2*pi/7", "1.9"] {
        let m = sine_gordon(xi);
        let (lo, hi) = m.factor("minus_S0").unwrap().strip().unwrap();
        for (x, y) in [(0.7, 0.2), (-1.3, 0.05), (0.25, -0.3), (2.0, 0.4)] {
            assert!(y > lo && y < hi);
            // iπ − θ has Im = π − y, outside the strip.
            assert!(std::f64::consts::PI - y > hi + 0.5);
            let t = Complex::with_val(prec.bits() + 32, (x, y));
            for eq in m.equations() {
                let r = m.residual(eq, &t, prec).unwrap();
                assert!(
                    r.digits(60.0) > 49.0,
                    "ξ = {xi}, {} at θ = {x}{y:+}i: {:.1} digits",
                    eq.name,
                    r.digits(60.0)
                );
            }
        }
        // And over the default regions at 30 digits.
        let opts = CheckOptions::new(30).unwrap();
        for eq in m.equations() {
            let r = check_equation(&m, eq, &opts);
            assert!(r.passed && r.checked >= 18, "ξ = {xi} {}: {r:?}", eq.name);
        }
    }
}

/// A crossing factor with the wrong sign of the exponent must fail: the
/// check can fail.
#[test]
fn a_wrong_right_hand_side_fails() {
    // The published factor with two wrong equations added.
    let text = sine_gordon_text("2*pi/7").replace("[[equation]]", "[[ignored]]");
    let text = text[..text.find("[[ignored]]").unwrap()].to_string()
        + r#"
[[equation]]
name = "wrong-crossing"
product = [ { factor = "minus_S0", at = "i*pi - theta" }, { factor = "minus_S0", at = "theta", power = -1 } ]
equals = "sinh(pi*(i*pi - theta)/xi) / sinh(pi*theta/xi)"
[[equation]]
name = "not-real-analytic"
product = [ { factor = "e", at = "theta" }, { factor = "e", at = "-theta", conjugate = true, power = -1 } ]
[[factor]]
name = "e"
[[factor.piece]]
kind = "expression"
value = "exp(theta)"
"#;
    let m = Model::from_toml(&text, "wrong.toml").unwrap();
    let opts = CheckOptions::new(30).unwrap();
    for eq in m.equations() {
        let r = check_equation(&m, eq, &opts);
        assert!(!r.passed, "{}", eq.name);
        assert!(r.worst.unwrap().0.relative > 1e-3);
    }
}

/// The sinh-Gordon S-matrix (Arinshtein, Fateev & Zamolodchikov, Phys.
/// Lett. B 87 (1979) 389), S(θ) = (sinh θ − i sin(πB/2))/(sinh θ + i sin(πB/2)),
/// is the CDD block f_{−B/2}: unitary and crossing-symmetric; its poles
/// θ = −iπB/2 and iπ(1 + B/2) lie outside the physical strip.
#[test]
fn sinh_gordon_block_is_unitary_and_crossing_symmetric() {
    let text = r#"
[parameters]
B = 0.6
[[factor]]
name = "S"
[[factor.piece]]
kind = "cdd"
blocks = [ { alpha = "-B/2" } ]
[[factor]]
name = "closed_form"
[[factor.piece]]
kind = "expression"
value = "(sinh(theta) - i*sin(pi*B/2)) / (sinh(theta) + i*sin(pi*B/2))"
[[equation]]
name = "unitarity"
product = [ { factor = "S", at = "theta" }, { factor = "S", at = "-theta" } ]
[[equation]]
name = "crossing"
product = [ { factor = "S", at = "i*pi - theta" }, { factor = "S", at = "theta", power = -1 } ]
[[equation]]
name = "closed-form"
product = [ { factor = "S", at = "theta" } ]
equals = "closed_form(theta)"
"#;
    let m = Model::from_toml(text, "shg.toml").unwrap();
    let mut opts = CheckOptions::new(40).unwrap();
    opts.regions.push(Region::parse("-2:2,-6:6").unwrap());
    for eq in m.equations() {
        let r = check_equation(&m, eq, &opts);
        assert!(r.passed && r.checked >= 14, "{}: {r:?}", eq.name);
    }
}

/// The equations declared in the example pass at 40 digits (the crossing
/// factor there is derived in the file's comments; both sides are
/// computed independently).
#[test]
fn example_equations_pass() {
    let m = Model::load(concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/examples/lantern.toml"
    ))
    .unwrap();
    assert!(m.equations().len() >= 4);
    let opts = CheckOptions::new(40).unwrap();
    for eq in m.equations() {
        let r = check_equation(&m, eq, &opts);
        assert!(r.passed, "{}: {r:?}", eq.name);
        // The band above the strip is sampled: the hard region.
        assert!(r.checked >= 18);
    }
    // Homogeneous crossing does not hold for sigma (R ≠ 1).
    let h = m.equation("crossing").unwrap().homogeneous();
    assert!(!check_equation(&m, &h, &opts).passed);
}

/// One standard block f_{1/3} and its unitarity.
const ONE_BLOCK: &str = r#"
[[factor]]
name = "S"
[[factor.piece]]
kind = "cdd"
blocks = [ { alpha = "1/3" } ]
[[equation]]
name = "unitarity"
product = [ { factor = "S", at = "theta" }, { factor = "S", at = "-theta" } ]
"#;

#[test]
fn points_near_poles_are_skipped() {
    // f_{1/3} has a pole at θ = iπ/3 and a zero at θ = 2iπ/3 (mod 2πi):
    // a region around the pole loses points to the margin, and none of
    // the kept points is within the margin.
    let m = Model::from_toml(ONE_BLOCK, "m.toml").unwrap();
    let mut opts = CheckOptions::new(30).unwrap();
    opts.default_regions = false;
    opts.points_per_region = 40;
    opts.regions
        .push(Region::parse("-0.05:0.05,1.0:1.1").unwrap());
    let r = check_equation(&m, &m.equations()[0], &opts);
    assert!(r.skipped > 0 && r.passed, "{r:?}");
}

fn err(text: &str) -> String {
    Model::from_toml(text, "m.toml").unwrap_err().to_string()
}

#[test]
fn bad_equations_are_clear_errors() {
    let head = "[[factor]]\nname = \"S\"\n[[factor.piece]]\nkind = \"cdd\"\nblocks = [{ alpha = 0.1 }]\n[[equation]]\nname = \"u\"\n";
    let e = err(&format!(
        "{head}product = [{{ factor = \"T\", at = \"theta\" }}]\n"
    ));
    assert!(
        e.contains("no factor named `T`") && e.contains("m.toml:8:"),
        "{e}"
    );
    let e = err(&format!(
        "{head}product = [{{ factor = \"S\", at = \"theta^2\" }}]\n"
    ));
    assert!(e.contains("affine in theta"), "{e}");
    let e = err(&format!(
        "{head}product = [{{ factor = \"S\", at = \"1\" }}]\n"
    ));
    assert!(e.contains("affine in theta"), "{e}");
    let e = err(&format!(
        "{head}product = [{{ factor = \"S\", at = \"theta\" }}]\nequals = \"R(theta)\"\n"
    ));
    assert!(e.contains("`R(…)`"), "{e}");
    let e = err(&format!(
        "{head}product = [{{ factor = \"S\", at = \"theta\" }}]\nequals = \"q\"\n"
    ));
    assert!(e.contains("`q`"), "{e}");
    // A right-hand side that does not parse: file position and caret.
    let e = err(&format!(
        "{head}product = [{{ factor = \"S\", at = \"theta\" }}]\nequals = \"1 + *\"\n"
    ));
    assert!(e.starts_with("m.toml:9:") && e.contains('^'), "{e}");
    let e = err(&format!("{head}product = []\n"));
    assert!(e.contains("needs `product"), "{e}");
    let e = err(&format!(
        "{head}product = [{{ factor = \"S\", at = \"theta\", shift = 1 }}]\n"
    ));
    assert!(e.contains("shift"), "{e}");
    let e = err(&format!(
        "{head}product = [{{ factor = \"S\", at = \"theta\" }}]\n[[equation]]\nname = \"u\"\nproduct = [{{ factor = \"S\", at = \"theta\" }}]\n"
    ));
    assert!(e.contains("unique"), "{e}");
}

/// A Barnes G ratio F(θ) = G(1−x)G(1/2+x)/(G(1+x)G(1/2−x)), x = θ/(2πi):
/// from G(z+1) = Γ(z)G(z) (DLMF 5.17.1), F(θ)F(−θ) = 1 and
/// F(θ)F(θ+iπ) = Γ(−x)/Γ(1/2+x). Both at 40 digits.
#[test]
fn barnes_ratio_equations_at_40_digits() {
    let text = r#"
[rapidity]
z = "theta/(2*pi*i)"
base = "0.3"
[[factor]]
name = "F"
[[factor.piece]]
kind = "barnes"
gammas = [ { arg = "1 - z" }, { arg = "1/2 + z" }, { arg = "1 + z", power = -1 }, { arg = "1/2 - z", power = -1 } ]
[[equation]]
name = "unitarity"
product = [ { factor = "F", at = "theta" }, { factor = "F", at = "-theta" } ]
[[equation]]
name = "shift"
product = [ { factor = "F", at = "theta" }, { factor = "F", at = "theta + i*pi" } ]
equals = "gamma(-z) / gamma(1/2 + z)"
"#;
    let m = Model::from_toml(text, "barnes.toml").unwrap();
    let mut opts = CheckOptions::new(40).unwrap();
    opts.regions.push(Region::parse("-4:4,-9:9").unwrap());
    for eq in m.equations() {
        let r = check_equation(&m, eq, &opts);
        assert!(r.passed && r.checked >= 18, "{}: {r:?}", eq.name);
        assert!(r.worst.unwrap().0.relative < 1e-38);
    }
}

/// Mutation test: the sine-Gordon factor with p perturbed by one part in
/// 10⁶ while the crossing factor keeps ξ must fail crossing.
#[test]
fn a_perturbed_parameter_fails_crossing() {
    let text = sine_gordon_text("2*pi/7").replace("p = \"pi/xi\"", "p = \"pi/xi*(1 + 1e-6)\"");
    let m = Model::from_toml(&text, "mutant.toml").unwrap();
    let r = check_equation(
        &m,
        m.equation("crossing").unwrap(),
        &CheckOptions::new(30).unwrap(),
    );
    assert!(!r.passed);
    let w = r.worst.unwrap().0.relative;
    assert!(w > 1e-9 && w < 1e-2, "{w}");
    // Unitarity holds for any p: it does not see the mutation.
    assert!(
        check_equation(
            &m,
            m.equation("unitarity").unwrap(),
            &CheckOptions::new(30).unwrap()
        )
        .passed
    );
}

#[test]
fn a_region_with_no_admissible_points_does_not_pass() {
    let m = Model::from_toml(ONE_BLOCK, "m.toml").unwrap();
    let mut opts = CheckOptions::new(20).unwrap();
    opts.default_regions = false;
    // A box of side 2·10⁻⁴ around the pole at iπ/3.
    opts.regions
        .push(Region::parse("-0.0001:0.0001,1.0471:1.0473").unwrap());
    let r = check_equation(&m, &m.equations()[0], &opts);
    assert_eq!(r.checked, 0);
    assert!(!r.passed && r.skipped > 0);
}
