//! Poles and zeros: exact enumeration against the argument principle, and
//! against published pole structures.

use dressing::model::Model;
use dressing::poles::{analyse, Axis, PoleOptions};
use dressing::Prec;

fn opts(lo: f64, hi: f64, digits: u64) -> PoleOptions {
    PoleOptions {
        window: (lo, hi),
        prec: if digits <= 12 {
            Prec::DOUBLE
        } else {
            Prec::digits(digits).unwrap()
        },
        masses: Some((1.0, 1.0)),
    }
}

fn model(text: &str) -> Model {
    Model::from_toml(text, "m.toml").unwrap()
}

/// Γ(z) has simple poles at z = −n with residues (−1)ⁿ/n! (DLMF 5.2.1,
/// 5.7.1); 1/Γ is entire. Here z = θ, so the points are on the real axis.
#[test]
fn gamma_poles_and_residues() {
    let m = model(
        "[rapidity]\nz = \"theta\"\nbase = 0.5\n[[factor]]\nname = \"G\"\n[[factor.piece]]\nkind = \"gamma\"\ngammas = [{ arg = \"z\" }]\n\
         [[factor]]\nname = \"R\"\n[[factor.piece]]\nkind = \"gamma\"\ngammas = [{ arg = \"z\", power = -1 }]\n",
    );
    for digits in [12, 30] {
        let (pts, cancelled) = analyse(&m, "G", &opts(-6.5, 0.5, digits)).unwrap();
        assert!(cancelled.is_empty());
        assert_eq!(pts.len(), 7);
        let mut fact = 1.0;
        for (n, p) in pts.iter().rev().enumerate() {
            if n > 0 {
                fact *= n as f64;
            }
            assert_eq!(p.point.axis, Axis::Real);
            assert_eq!(
                p.point.exact.as_ref().unwrap().to_string(),
                format!("{}", -(n as i64))
            );
            assert_eq!((p.point.order, p.numerical_order), (1, Some(1)));
            let want = if n % 2 == 0 { 1.0 } else { -1.0 } / fact;
            let (res, err) = p.leading.unwrap();
            let tol = if digits == 12 { 1e-11 } else { 1e-25 };
            assert!(
                (res.re - want).abs() < tol * want.abs().max(1.0),
                "n = {n}: {res} vs {want}"
            );
            assert!(res.im.abs() < tol && err < tol);
            if digits == 30 {
                // Full precision: the error estimate covers the actual error.
                let full = p.leading_full.clone().unwrap();
                let exact = rug::Float::with_val(200, if n % 2 == 0 { 1 } else { -1 })
                    / rug::Float::with_val(
                        200,
                        rug::Integer::from(rug::Integer::factorial(n as u32)),
                    );
                let d = rug::Float::with_val(200, full.real() - &exact)
                    .abs()
                    .to_f64();
                assert!(
                    d <= err.max(1e-40) && d < 1e-29,
                    "n = {n}: actual {d:e}, estimate {err:e}"
                );
            }
        }
        let (pts, _) = analyse(&m, "R", &opts(-6.5, 0.5, digits)).unwrap();
        assert!(pts.iter().all(|p| p.point.order == -1));
    }
}

/// Sine-Gordon (Zamolodchikov & Zamolodchikov 1979), ξ = 2π/7 (p = 7/2,
/// exact). The breather poles θ = i(π − nξ), n = 1, 2, … < π/ξ, with masses
/// 2M sin(nξ/2), are poles of the soliton–antisoliton transmission amplitude
/// S_T = [sinh(πθ/ξ)/sinh(π(iπ−θ)/ξ)] S₀. The scalar factor S₀ itself has
/// the crossed images θ = inξ: the numbers put them there, and the sinh
/// ratio's zeros at θ = inξ cancel them in S_T.
#[test]
fn sine_gordon_breather_poles() {
    let text = std::fs::read_to_string(concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/tests/data/models/sine-gordon.toml"
    ))
    .unwrap()
    .replace(
        "xi = \"2*pi/7\"\np = \"pi/xi\"",
        "p = \"7/2\"\nxi = \"pi/p\"",
    );
    let text = text.replacen(
        "[[equation]]",
        "[[factor]]\nname = \"S_T\"\n[[factor.piece]]\nkind = \"gamma-product\"\ngammas = [\n  { arg = \"2*p*k + 1 - p*z\" }, { arg = \"2*p*k + 2*p - p*z\" },\n  { arg = \"2*p*k + 1 + p + p*z\" }, { arg = \"2*p*k + p + p*z\" },\n  { arg = \"2*p*k + 1 + p*z\", power = -1 }, { arg = \"2*p*k + 2*p + p*z\", power = -1 },\n  { arg = \"2*p*k + 1 + p - p*z\", power = -1 }, { arg = \"2*p*k + p - p*z\", power = -1 },\n]\n[[factor.piece]]\nkind = \"expression\"\nvalue = \"sinh(pi*theta/xi) / sinh(pi*(i*pi - theta)/xi)\"\n\n[[equation]]",
        1,
    );
    // S_T(0) = 0, so the branch starts elsewhere.
    let text = format!("[rapidity]\nbase = 0.5\n{text}");
    let m = Model::from_toml(&text, "sg.toml").unwrap();
    let xi = 2.0 * std::f64::consts::PI / 7.0;
    // S₀: simple poles at u/π = 2n/7 in the strip.
    let (pts, _) = analyse(&m, "minus_S0", &opts(0.0, 1.0, 20)).unwrap();
    let poles: Vec<String> = pts
        .iter()
        .filter(|p| p.in_strip && p.point.order > 0)
        .map(|p| p.point.coordinate_text())
        .collect();
    assert_eq!(poles, ["2/7", "4/7", "6/7"]);
    assert!(pts.iter().all(|p| p.numerical_order == Some(p.point.order)));
    // S_T: the breathers at u/π = 1 − 2n/7 with masses 2 sin(nξ/2).
    let (pts, cancelled) = analyse(&m, "S_T", &opts(0.0, 1.0, 12)).unwrap();
    for n in 1..=3 {
        let u = 1.0 - 2.0 * n as f64 / 7.0;
        let p = pts
            .iter()
            .find(|p| (p.point.coordinate - u).abs() < 1e-8)
            .unwrap_or_else(|| panic!("no pole at u/π = {u}: {pts:?}"));
        assert_eq!((p.point.order, p.numerical_order), (1, Some(1)), "n = {n}");
        let mass = p.mass.unwrap();
        assert!(
            (mass - 2.0 * (n as f64 * xi / 2.0).sin()).abs() < 1e-6,
            "n = {n}: {mass}"
        );
    }
    // The poles of S₀ at 2n/7 are cancelled in S_T.
    for u in ["2/7", "4/7", "6/7"] {
        assert!(
            cancelled.iter().any(|c| c.coordinate_text() == u),
            "{u}: {cancelled:?}"
        );
    }
}

/// The E8 S-matrix S₁₁ = f_{2/3} f_{2/5} f_{1/15} (A. B. Zamolodchikov, Int.
/// J. Mod. Phys. A 4 (1989) 4235): simple poles at 2πi/3, 2πi/5, iπ/15
/// with −i·Res > 0 giving m₁, m₂ = 2cos(π/5)m₁, m₃ = 2cos(π/30)m₁, and the
/// crossed images 1/3, 3/5, 14/15 with −i·Res < 0. From memory.
#[test]
fn e8_s11_bound_states() {
    let m = model(
        "[[factor]]\nname = \"S11\"\n[[factor.piece]]\nkind = \"cdd\"\nblocks = [{ alpha = \"2/3\" }, { alpha = \"2/5\" }, { alpha = \"1/15\" }]\n",
    );
    let (pts, _) = analyse(&m, "S11", &opts(0.0, 1.0, 30)).unwrap();
    let got: Vec<(String, i64, f64)> = pts
        .iter()
        .map(|p| {
            (
                p.point.coordinate_text(),
                p.point.order,
                p.neg_i_residue.unwrap(),
            )
        })
        .collect();
    assert_eq!(got.len(), 6, "{got:?}");
    let pi = std::f64::consts::PI;
    for (u, sign, mass) in [
        ("2/3", 1.0, Some(1.0)),
        ("2/5", 1.0, Some(2.0 * (pi / 5.0).cos())),
        ("1/15", 1.0, Some(2.0 * (pi / 30.0).cos())),
        ("1/3", -1.0, None),
        ("3/5", -1.0, None),
        ("14/15", -1.0, None),
    ] {
        let p = pts.iter().find(|p| p.point.coordinate_text() == u).unwrap();
        assert_eq!(p.point.order, 1);
        assert!(p.neg_i_residue.unwrap() * sign > 0.0, "{u}");
        if let Some(mb) = mass {
            assert!((p.mass.unwrap() - mb).abs() < 1e-12, "{u}");
        }
    }
}

/// The residue of one block f_α at θ = iπα is 2i·tan(πα) (solve
/// sinh θ = i sin πα; common practice), at 30 digits.
#[test]
fn block_residue_closed_form() {
    let m = model("[[factor]]\nname = \"f\"\n[[factor.piece]]\nkind = \"cdd\"\nblocks = [{ alpha = \"2/5\" }]\n");
    let (pts, _) = analyse(&m, "f", &opts(0.0, 0.5, 30)).unwrap();
    assert_eq!(pts.len(), 1);
    let (res, err) = pts[0].leading.unwrap();
    let want = 2.0 * (2.0 * std::f64::consts::PI / 5.0).tan();
    assert!((res.im - want).abs() < 1e-14 * want && res.re.abs() < 1e-14);
    assert!(err < 1e-25, "{err}");
    // At full precision the error estimate covers the actual error.
    let full = pts[0].leading_full.clone().unwrap();
    let pi = rug::Float::with_val(200, rug::float::Constant::Pi);
    let exact = (pi * 2u32 / 5u32).tan() * 2u32;
    let d = rug::Float::with_val(200, full.imag() - &exact)
        .abs()
        .to_f64();
    assert!(d <= err && d < 1e-29, "actual {d:e}, estimate {err:e}");
}

/// Γ(z + 1/2)/Γ(2z + 1) = √π 2^{−2z}/Γ(z + 1) (DLMF 5.5.5): the numerator
/// poles at z = −1/2 − m meet denominator poles, so none remains; the
/// zeros at z = −1, −2, … are those of 1/Γ(z + 1).
#[test]
fn coincident_poles_cancel() {
    let m = model(
        "[[factor]]\nname = \"F\"\n[[factor.piece]]\nkind = \"gamma\"\ngammas = [{ arg = \"z + 1/2\" }, { arg = \"2*z + 1\", power = -1 }]\n",
    );
    let (pts, cancelled) = analyse(&m, "F", &opts(-3.2, 0.5, 12)).unwrap();
    let zeros: Vec<String> = pts.iter().map(|p| p.point.coordinate_text()).collect();
    assert_eq!(zeros, ["-3", "-2", "-1"]);
    assert!(pts
        .iter()
        .all(|p| p.point.order == -1 && p.numerical_order == Some(-1)));
    let c: Vec<String> = cancelled.iter().map(|p| p.coordinate_text()).collect();
    assert_eq!(c, ["-5/2", "-3/2", "-1/2"]);
}

#[test]
fn expression_pieces_are_found_by_scanning() {
    // An expression with a simple pole at θ = iπ/4 and a zero at iπ/2.
    let m = model(
        "[[factor]]\nname = \"E\"\n[[factor.piece]]\nkind = \"expression\"\nvalue = \"(theta - i*pi/2)/(theta - i*pi/4)\"\n",
    );
    let (pts, _) = analyse(&m, "E", &opts(0.0, 1.0, 12)).unwrap();
    let got: Vec<(f64, i64)> = pts
        .iter()
        .map(|p| (p.point.coordinate, p.point.order))
        .collect();
    assert_eq!(got.len(), 2, "{got:?}");
    assert!((got[0].0 - 0.25).abs() < 1e-8 && got[0].1 == 1);
    assert!((got[1].0 - 0.5).abs() < 1e-8 && got[1].1 == -1);
    // Residue of (θ − iπ/2)/(θ − iπ/4) at iπ/4: −iπ/4.
    let (res, _) = pts[0].leading.unwrap();
    assert!((res.im + std::f64::consts::PI / 4.0).abs() < 1e-10, "{res}");
}

#[test]
fn bad_windows_and_masses() {
    let m = model("[[factor]]\nname = \"f\"\n[[factor.piece]]\nkind = \"cdd\"\nblocks = [{ alpha = \"1/3\" }]\n");
    for w in [(1.0, 0.0), (0.5, 0.5), (f64::NAN, 1.0)] {
        let e = analyse(&m, "f", &opts(w.0, w.1, 12))
            .unwrap_err()
            .to_string();
        assert!(e.contains("empty or inverted"), "{e}");
    }
    let mut o = opts(0.0, 1.0, 12);
    o.masses = Some((-1.0, 1.0));
    assert!(analyse(&m, "f", &o)
        .unwrap_err()
        .to_string()
        .contains("masses"));
    let g = model("[rapidity]\nz = \"theta\"\nbase = 0.5\n[[factor]]\nname = \"G\"\n[[factor.piece]]\nkind = \"gamma\"\ngammas = [{ arg = \"z\" }]\n");
    let e = analyse(&g, "G", &opts(-1e6, 0.5, 12))
        .unwrap_err()
        .to_string();
    assert!(e.contains("narrower"), "{e}");
}

/// Enumeration against the argument principle on a rectangle: zeros minus
/// poles inside must agree (two independent methods).
#[test]
fn rectangle_count_matches_enumeration() {
    let m = Model::load(concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/examples/lantern.toml"
    ))
    .unwrap();
    let pi = std::f64::consts::PI;
    for (factor, lo, hi) in [
        ("sigma", 0.05, 0.95),
        ("dressed", 0.05, 0.95),
        ("dressed", -0.45, 1.4),
    ] {
        let (pts, _) = analyse(&m, factor, &opts(lo, hi, 12)).unwrap();
        let enumerated: i64 = pts.iter().map(|p| -p.point.order).sum();
        let counted =
            dressing::poles::count_in_rectangle(&m, factor, (-0.7, 0.7), (lo * pi, hi * pi))
                .unwrap();
        assert_eq!(counted, enumerated, "{factor} [{lo}, {hi}]");
    }
    // A boundary through the pole at u/π = 7/20 is refused.
    let y = 0.35 * pi;
    let e = dressing::poles::count_in_rectangle(&m, "sigma", (-0.5, 0.5), (y, 2.0))
        .unwrap_err()
        .to_string();
    assert!(e.contains("move the rectangle"), "{e}");
}

/// The coupling scan reads its ends exactly, counts poles with their
/// orders, reports a pole cancelled by a zero as such, and reports a value
/// where the model cannot be built on its own line instead of aborting.
/// The positions are the lantern model's own (poles of the block at g/2 and
/// 1 − g/2, σ's pole at g and zero at 1/2), so the expectations follow
/// from the model file, not from the program.
#[test]
fn scan_is_exact_and_names_cancellations() {
    let run = |scan: &str| {
        let out = std::process::Command::new(env!("CARGO_BIN_EXE_dressing"))
            .args([
                "poles",
                "examples/lantern.toml",
                "--factor",
                "dressed",
                "--scan",
                scan,
            ])
            .current_dir(env!("CARGO_MANIFEST_DIR"))
            .output()
            .unwrap();
        (
            out.status.code(),
            String::from_utf8_lossy(&out.stdout).into_owned(),
        )
    };
    let (code, out) = run("g=1/3:2/3:3");
    assert_eq!(code, Some(0), "{out}");
    assert!(
        out.contains("from 1/3 ≈ 0.333333 to 2/3 ≈ 0.666667"),
        "{out}"
    );
    assert!(
        out.contains("a pole and a zero collide at u/π = 1/2 (g = 0.5)"),
        "{out}"
    );
    assert!(
        out.contains("1 pole(s) fewer at g = 0.5: cancelled"),
        "{out}"
    );
    // At g = 2/3 σ's pole (u/π = g) meets the block's (1 − g/2): order 2.
    assert!(out.contains("0.666667 (order 2)"), "{out}");
    assert!(!out.contains("left the strip"), "{out}");
    let (code, out) = run("g=0.2:0.8:7");
    assert_eq!(code, Some(0));
    assert!(
        out.contains("  g = 0.6 ") && !out.contains("0.6000000000000001"),
        "{out}"
    );
    // g = 0 makes the base point θ = 0 removable for σ: that value alone fails.
    let (code, out) = run("g=0:1:4");
    assert_eq!(code, Some(0), "{out}");
    assert!(out.contains("g = 0          not computed"), "{out}");
    assert!(out.contains("g = 1/3 ≈ 0.333333 0.166667+"), "{out}");
}
