//! `dressing table` and `Model::tabulate`: the phase is continuous across
//! the cuts of the principal logarithm, agrees with the independent
//! bisection continuation of `Model::evaluate`, and integrates the kernel;
//! the formats parse; poles and bad input are reported.

mod common;

use dressing::factor::Method;
use dressing::model::Model;
use dressing::Prec;
use num_complex::Complex64;
use std::process::Command;

use common::run_dressing as dressing;

fn lantern_path() -> String {
    concat!(env!("CARGO_MANIFEST_DIR"), "/examples/lantern.toml").to_string()
}

fn lantern() -> Model {
    Model::load(lantern_path()).unwrap()
}

/// Simpson's rule on equally spaced samples (odd count), the reference
/// for `∫ φ dθ` (common practice).
fn simpson(h: f64, y: &[f64]) -> f64 {
    assert!(y.len() % 2 == 1);
    let n = y.len() - 1;
    let mut s = y[0] + y[n];
    for (i, v) in y.iter().enumerate().take(n).skip(1) {
        s += if i % 2 == 1 { 4.0 } else { 2.0 } * v;
    }
    s * h / 3.0
}

#[test]
fn phase_winds_through_many_cuts_continuously_and_integrates_the_kernel() {
    // lamp = Γ(g+z)/Γ(g−z) · G(1+z)/G(1−z) · exp(i g sinh θ): on [−8, 8] its
    // phase runs over about 2·0.35·sinh 8 ≈ 1000 rad, some 170 turns.
    let m = lantern();
    let (a, b, n) = (-8.0, 8.0, 8001);
    let rows = m
        .tabulate(
            "lamp",
            &Complex64::new(a, 0.0),
            &Complex64::new(b, 0.0),
            n,
            Prec::DOUBLE,
            Method::Auto,
        )
        .unwrap();
    let rows: Vec<_> = rows.into_iter().map(|(_, r)| r.unwrap()).collect();
    let delta: Vec<f64> = rows.iter().map(|r| r.eval.phase()).collect();
    let phi: Vec<f64> = rows.iter().map(|r| r.phi().re).collect();
    let span = delta[n - 1] - delta[0];
    assert!(span.abs() > 900.0, "span {span}");
    let h = (b - a) / (n - 1) as f64;
    for j in 1..n {
        let step = delta[j] - delta[j - 1];
        let expect = 0.5 * h * (phi[j] + phi[j - 1]);
        assert!(
            (step - expect).abs() < 1e-3,
            "jump at θ = {}: Δδ = {step}, trapezoid {expect}",
            a + j as f64 * h
        );
    }
    // δ(b) − δ(a) = ∫ φ dθ (the kernel is −i d/dθ log S and S is unitary
    // on the real line, so δ' = φ).
    let integral = simpson(h, &phi);
    assert!(
        (span - integral).abs() < 1e-6 * span.abs(),
        "span {span} vs ∫φ {integral}"
    );
    // The same branch as `Model::evaluate`, which continues by bisection
    // from the base point along the straight segment to each point.
    for j in [0, 1234, 4000, 6001, n - 1] {
        let t = Complex64::new(a + j as f64 * h, 0.0);
        let e = m.evaluate("lamp", &t, Prec::DOUBLE, Method::Auto).unwrap();
        assert!(
            (e.phase() - delta[j]).abs() < 1e-9,
            "θ = {}: table {} vs evaluate {}",
            t.re,
            delta[j],
            e.phase()
        );
    }
}

#[test]
fn table_at_40_digits_agrees_with_the_double_table() {
    let m = lantern();
    let lo = m
        .tabulate(
            "dressed",
            &Complex64::new(-3.0, 0.1),
            &Complex64::new(3.0, 0.1),
            13,
            Prec::DOUBLE,
            Method::Auto,
        )
        .unwrap();
    let (a, b) = (
        rug::Complex::with_val(200, (-3.0, 0.1)),
        rug::Complex::with_val(200, (3.0, 0.1)),
    );
    let hi = m
        .tabulate(
            "dressed",
            &a,
            &b,
            13,
            Prec::digits(40).unwrap(),
            Method::Auto,
        )
        .unwrap();
    for ((_, l), (_, h)) in lo.iter().zip(&hi) {
        let (l, h) = (l.as_ref().unwrap(), h.as_ref().unwrap());
        let hk = Complex64::new(
            h.kernel.value.real().to_f64(),
            h.kernel.value.imag().to_f64(),
        );
        assert!((l.kernel.value - hk).norm() <= l.kernel.radius.to_f64() + 1e-300);
        assert!(h.kernel.radius.to_f64() < 1e-39 * hk.norm().max(1.0));
        assert!((l.eval.phase() - h.eval.phase()).abs() <= l.eval.log.radius.to_f64());
    }
}

fn rows_of(csv: &str) -> Vec<Vec<String>> {
    csv.lines()
        .map(|l| l.split(',').map(str::to_string).collect())
        .collect()
}

#[test]
fn csv_tsv_and_json_carry_the_same_numbers() {
    let path = lantern_path();
    let args = [
        "table", &path, "--factor", "sigma", "--line", "-2:2", "--n", "5",
    ];
    let (code, csv, err) = dressing(&args);
    assert_eq!(code, 0, "{err}");
    let rows = rows_of(&csv);
    assert_eq!(rows.len(), 6);
    assert_eq!(rows[0][0], "theta_re");
    assert_eq!(rows[0].len(), 13);
    assert!(
        rows[1..].iter().all(|r| r.len() == 13 && r[12] == "ok"),
        "{csv}"
    );
    // The middle point is θ = 0, where the unitary factor is 1 and δ = 0.
    assert_eq!(rows[3][0].parse::<f64>().unwrap(), 0.0);
    assert!((rows[3][2].parse::<f64>().unwrap() - 1.0).abs() < 1e-14);
    let mut t = args.to_vec();
    t.extend(["--format", "tsv"]);
    let (_, tsv, _) = dressing(&t);
    assert!(tsv.starts_with("# factor `sigma`"), "{tsv}");
    let body: Vec<&str> = tsv.lines().filter(|l| !l.starts_with('#')).collect();
    assert_eq!(body.len(), 6);
    assert_eq!(body[2].split('\t').collect::<Vec<_>>(), rows[2]);
    let mut j = args.to_vec();
    j.extend(["--format", "json"]);
    let (_, json, _) = dressing(&j);
    let doc: serde_json::Value = serde_json::from_str(&json).unwrap();
    let p = &doc["points"][1];
    assert_eq!(
        p["phi_re"].as_f64().unwrap(),
        rows[2][7].parse::<f64>().unwrap()
    );
    assert_eq!(doc["precision_bits"], 53);
    assert_eq!(doc["columns"].as_array().unwrap().len(), 13);
    // More digits: decimal strings with all of them.
    j.extend(["--digits", "30"]);
    let (_, json, _) = dressing(&j);
    let doc: serde_json::Value = serde_json::from_str(&json).unwrap();
    let s = doc["points"][1]["phi_re"].as_str().unwrap();
    assert!(
        s.chars().filter(|c| c.is_ascii_digit()).count() >= 30,
        "{s}"
    );
}

#[test]
fn a_point_at_a_pole_is_reported_and_the_exit_status_is_one() {
    // dressed = sigma · f_{g/2}: the block's pole at θ = iπg/2 is the middle
    // point of the line from 0 to iπg.
    let path = lantern_path();
    let (code, csv, _) = dressing(&[
        "table", &path, "--factor", "dressed", "--line", "0:i*pi*g", "--n", "3",
    ]);
    assert_eq!(code, 1, "{csv}");
    let rows = rows_of(&csv);
    assert!(rows[2][12].contains("pole of order 1"), "{csv}");
    // The point is named, its values are empty.
    assert_eq!(rows[2][0], "0");
    assert!((rows[2][1].parse::<f64>().unwrap() - std::f64::consts::PI * 0.175).abs() < 1e-15);
    assert!(rows[2][2..12].iter().all(String::is_empty));
    let (_, json, _) = dressing(&[
        "table", &path, "--factor", "dressed", "--line", "0:i*pi*g", "--n", "3", "--format", "json",
    ]);
    let doc: serde_json::Value = serde_json::from_str(&json).unwrap();
    assert!(doc["points"][1]["theta_im"].as_f64().is_some(), "{json}");
    assert!(doc["points"][1]["phi_re"].is_null(), "{json}");
    assert_eq!(rows[1][12], "ok");
}

#[test]
fn bad_table_input_names_the_option() {
    let path = lantern_path();
    for (args, want) in [
        (vec!["--line", "-2:2", "--n", "1"], "--n 1"),
        (vec!["--line", "-2..2"], "--line -2..2: write FROM:TO"),
        (vec!["--line", "-2:2+"], "cannot read `2+`"),
        (vec!["--line", "-2:2", "--digits", "0"], "--digits 0"),
        (vec!["--line", "-2:2", "--n", "20000000"], "at most"),
        (
            vec!["--line", "-2:2", "--factor", "nope"],
            "no factor named `nope`",
        ),
        (vec!["--line", "-2:2", "--set", "g"], "--set g"),
    ] {
        let mut a = vec!["table", path.as_str()];
        a.extend(args.iter().copied());
        let (code, out, err) = dressing(&a);
        assert_eq!(code, 2, "{args:?}: {out}{err}");
        assert!(err.contains(want), "{args:?}: {err}");
    }
}

/// examples/tba_kernel.rs solves the ground-state TBA equation on the
/// kernel that `Model::tabulate` returns; for Lee–Yang (S = f_{2/3}) the
/// effective central charge tends to 2/5 as r → 0 (Al. B. Zamolodchikov,
/// Nucl. Phys. B342 (1990) 695). `cargo test` builds the examples next to
/// the test binaries; this runs it and reads its output.
#[test]
fn tba_example_reaches_the_lee_yang_central_charge() {
    let exe = std::env::current_exe().unwrap();
    let bin = exe
        .parent()
        .and_then(|d| d.parent())
        .map(|d| d.join("examples").join("tba_kernel"))
        .unwrap();
    let out = Command::new(&bin)
        .output()
        .unwrap_or_else(|e| panic!("run {}: {e} (build it with cargo test)", bin.display()));
    assert!(out.status.success());
    let text = String::from_utf8_lossy(&out.stdout);
    let c = |r: &str| -> f64 {
        let line = text
            .lines()
            .find(|l| l.starts_with("Lee–Yang") && l.contains(&format!("r = {r} ")))
            .unwrap_or_else(|| panic!("no line for r = {r}:\n{text}"));
        line.split("c(r) = ")
            .nth(1)
            .unwrap()
            .split_whitespace()
            .next()
            .unwrap()
            .parse()
            .unwrap()
    };
    assert!((c("1e-5") - 0.4).abs() < 1e-8, "{text}");
    // The approach is from below and monotone in r.
    assert!(
        c("1e0") < c("1e-1") && c("1e-1") < c("1e-3") && c("1e-3") <= 0.4 + 1e-12,
        "{text}"
    );
}

/// A reader that stops early (`dressing table … | head -1`) closes the pipe;
/// the program ends quietly with status 0 instead of panicking.
#[test]
fn a_closed_pipe_ends_the_output_quietly() {
    use std::io::Read;
    use std::process::Stdio;
    let path = lantern_path();
    let mut child = Command::new(env!("CARGO_BIN_EXE_dressing"))
        .args(["table", &path, "--line", "-8:8", "--n", "200000"])
        .stdout(Stdio::piped())
        .stderr(Stdio::piped())
        .spawn()
        .unwrap();
    let mut first = [0u8; 16];
    child.stdout.take().unwrap().read_exact(&mut first).unwrap();
    // The read end is dropped here, before the program writes the rest.
    let out = child.wait_with_output().unwrap();
    assert_eq!(&first[..8], b"theta_re");
    assert_eq!(
        out.status.code(),
        Some(0),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    assert!(!String::from_utf8_lossy(&out.stderr).contains("panicked"));
}
