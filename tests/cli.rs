//! The command line, run as a user would: output and exit status.

mod common;

use std::process::Command;

use common::run_dressing as dressing;

#[test]
fn demo_runs_end_to_end_and_agrees_with_the_commands() {
    let (code, out, _) = dressing(&["demo"]);
    assert_eq!(code, 0, "{out}");
    // The table for other codes: five rows on the screen, 801 in the file.
    assert!(out.contains("theta_re,theta_im,S_re"), "{out}");
    let tsv = out
        .lines()
        .find_map(|l| l.strip_prefix("wrote the same on -8:8 with 801 points to "))
        .unwrap();
    let text = std::fs::read_to_string(tsv.trim()).unwrap();
    let rows: Vec<&str> = text.lines().filter(|l| !l.starts_with('#')).collect();
    assert_eq!(rows.len(), 802);
    assert!(rows[1..].iter().all(|r| r.ends_with("\tok")), "{text}");
    // Evaluation: each value checked by the other representation, to the 30 digits asked.
    assert_eq!(
        out.matches("verify: product form agrees to 3").count()
            + out.matches("verify: integral form agrees to 3").count(),
        3,
        "{out}"
    );
    assert!(
        out.contains("integral continued outside its strip"),
        "{out}"
    );
    // The demo's value at 0.7+0.2i agrees with `dressing eval` at 50 digits.
    let line = out
        .lines()
        .find(|l| l.starts_with("  S        = "))
        .unwrap()
        .to_string();
    let (_, ev, _) = dressing(&[
        "eval",
        &example("lantern.toml"),
        "--at",
        "0.7+0.2i",
        "--digits",
        "50",
    ]);
    let re_demo = line
        .trim_start_matches("  S        = ")
        .split(' ')
        .next()
        .unwrap();
    let mantissa = &re_demo[..25];
    assert!(ev.contains(mantissa), "{re_demo} not in\n{ev}");
    // Equations: all four pass; poles: the expected ones, with their signs.
    assert_eq!(out.matches("  PASS").count(), 4, "{out}");
    assert!(!out.contains("FAIL"), "{out}");
    assert!(
        out.contains("7/40  pole") && out.contains("33/40  pole"),
        "{out}"
    );
    assert!(out.contains("equations kept       3 of 3"), "{out}");
    // Pictures written where it says.
    let dir = std::env::temp_dir().join("dressing-demo");
    for f in ["dressed-strip.svg", "dressed-axis.svg", "lantern.toml"] {
        assert!(dir.join(f).exists(), "{f}");
    }
    // The numeric core: Γ(1/2)² = π (DLMF 5.4.6) and ψ(1) = −γ (DLMF 5.4.12) at 100 digits.
    assert!(
        out.contains("Γ(1/2)² = π (DLMF 5.4.6): agrees to 10"),
        "{out}"
    );
    assert!(
        out.contains("ψ(1) = −γ (DLMF 5.4.12): agrees to 100"),
        "{out}"
    );
}

#[test]
fn special_prints_values_and_json() {
    let (code, out, _) = dressing(&["special", "loggamma", "--at", "0.5", "--digits", "30"]);
    assert_eq!(code, 0);
    // log Γ(1/2) = ln √π = 0.5723649429247000870717136756… (DLMF 5.4.6)
    assert!(out.contains("5.72364942924700087071713675"), "{out}");
    let (code, out, _) = dressing(&["special", "digamma", "--at", "1", "--json"]);
    assert_eq!(code, 0);
    assert!(
        out.trim_start().starts_with('[') && out.contains("\"error_estimate\""),
        "{out}"
    );
}

#[test]
fn user_errors_name_the_option_and_exit_nonzero() {
    let (code, _, err) = dressing(&["special", "gamma", "--at", "-3"]);
    assert_eq!(code, 2);
    assert!(
        err.contains("--at -3") && err.contains("pole of order 1"),
        "{err}"
    );
    let (code, _, err) = dressing(&["special", "gamma", "--at", "2pi"]);
    assert_eq!(code, 2);
    assert!(
        err.contains("--at 2pi") && err.contains("not a number"),
        "{err}"
    );
    let (code, _, err) = dressing(&["special", "gamma", "--at", "1", "--digits", "0"]);
    assert_eq!(code, 2);
    assert!(err.contains("--digits 0"), "{err}");
    let (code, _, err) = dressing(&["special", "gamma", "--at", "1", "--digits", "99999999"]);
    assert_eq!(code, 2);
    assert!(err.contains("fewer digits"), "{err}");
}

fn example(name: &str) -> String {
    format!("{}/examples/{name}", env!("CARGO_MANIFEST_DIR"))
}

/// `dressing eval` works on every example model, on every factor.
#[test]
fn eval_runs_on_every_example_model() {
    let dir = format!("{}/examples", env!("CARGO_MANIFEST_DIR"));
    let mut seen = 0;
    for entry in std::fs::read_dir(dir).unwrap() {
        let path = entry.unwrap().path();
        if path.extension().is_none_or(|e| e != "toml") {
            continue;
        }
        let p = path.to_str().unwrap();
        let model = dressing::model::Model::load(p).unwrap();
        for f in model.factors() {
            let (code, out, err) = dressing(&[
                "eval",
                p,
                "--factor",
                f.name(),
                "--at",
                "0.7+0.2i",
                "--digits",
                "25",
            ]);
            assert_eq!(code, 0, "{p} {}: {out}{err}", f.name());
            assert!(out.contains("S        ="), "{out}");
            seen += 1;
        }
    }
    assert!(seen >= 3);
}

#[test]
fn eval_verify_and_json() {
    let m = example("lantern.toml");
    let (code, out, _) = dressing(&[
        "eval", &m, "--at", "0.7+0.2i", "--at", "i*pi/3", "--digits", "30", "--verify",
    ]);
    assert_eq!(code, 0, "{out}");
    // Product form against the integral form: two independent representations.
    assert_eq!(
        out.matches("verify: integral form agrees to 3").count()
            + out.matches("verify: product form agrees to 3").count(),
        2,
        "{out}"
    );
    let (code, out, _) = dressing(&["eval", &m, "--at", "0.5", "--digits", "40", "--json"]);
    assert_eq!(code, 0);
    let v: serde_json::Value = serde_json::from_str(&out).unwrap();
    let p = &v["points"][0];
    // Full precision as decimal strings.
    let re = p["value"]["re"].as_str().unwrap();
    assert!(re.len() >= 40, "{re}");
    assert!(p["correct_digits"].as_f64().unwrap() >= 39.0);
    assert_eq!(p["pieces"][0]["kind"], "gamma-product");
}

#[test]
fn eval_points_file_line_and_set() {
    let m = example("lantern.toml");
    let dir = std::env::temp_dir().join(format!("dressing-cli-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let pts = dir.join("points.txt");
    std::fs::write(
        &pts,
        "# rapidities\n0.1\n0.2+0.1i  # inline comment\n\ni*pi/5\n",
    )
    .unwrap();
    let (code, out, _) = dressing(&[
        "eval",
        &m,
        "--points",
        pts.to_str().unwrap(),
        "--set",
        "g=1/4",
    ]);
    assert_eq!(code, 0, "{out}");
    assert_eq!(out.matches("\nθ = ").count(), 3, "{out}");
    let (code, out, _) = dressing(&["eval", &m, "--line=-2:2", "--n", "5", "--json"]);
    assert_eq!(code, 0);
    let v: serde_json::Value = serde_json::from_str(&out).unwrap();
    assert_eq!(v["points"].as_array().unwrap().len(), 5);
    let bad = dir.join("bad.txt");
    std::fs::write(&bad, "0.1\n0.3+\n").unwrap();
    let (code, _, err) = dressing(&["eval", &m, "--points", bad.to_str().unwrap()]);
    assert_eq!(code, 2);
    assert!(err.contains("bad.txt:2"), "{err}");
}

#[test]
fn eval_errors_exit_nonzero_with_the_place() {
    let m = example("lantern.toml");
    // A pole: reported as a pole with its order, exit status 1.
    let (code, out, _) = dressing(&[
        "eval", &m, "--factor", "lamp", "--at", "-i*pi*g", "--digits", "20",
    ]);
    assert_eq!(code, 1, "{out}");
    assert!(out.contains("pole of order 1"), "{out}");
    let (code, _, err) = dressing(&["eval", "/nonexistent.toml", "--at", "1"]);
    assert_eq!(code, 2);
    assert!(err.contains("cannot read"), "{err}");
    let (code, _, err) = dressing(&["eval", &m, "--factor", "nope", "--at", "1"]);
    assert_eq!(code, 2);
    assert!(err.contains("sigma, dressed, lamp"), "{err}");
    let (code, _, err) = dressing(&["eval", &m, "--at", "1", "--digits", "999999"]);
    assert_eq!(code, 2);
    assert!(err.contains("--digits"), "{err}");
    let (code, _, err) = dressing(&["eval", &m]);
    assert_eq!(code, 2);
    assert!(err.contains("--at"), "{err}");
    let (code, _, err) = dressing(&["eval", &m, "--at", "1", "--set", "g"]);
    assert_eq!(code, 2);
    assert!(err.contains("NAME=EXPR"), "{err}");
    let dir = std::env::temp_dir().join(format!("dressing-cli-bad-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let f = dir.join("bad.toml");
    std::fs::write(&f, "[[factor]]\nname = \"S\"\n[[factor.piece]]\nkind = \"cdd\"\nblocks = [{ alpha = \"1/3 +\" }]\n").unwrap();
    let (code, _, err) = dressing(&["eval", f.to_str().unwrap(), "--at", "1"]);
    assert_eq!(code, 2);
    assert!(err.contains("bad.toml:5:"), "{err}");
}

#[test]
fn check_passes_on_the_example_and_fails_on_a_wrong_equation() {
    let m = example("lantern.toml");
    let (code, out, _) = dressing(&["check", &m, "--digits", "30", "--points", "3"]);
    assert_eq!(code, 0, "{out}");
    assert_eq!(out.matches("  PASS").count(), 4, "{out}");
    assert!(out.contains("not a proof"), "{out}");
    let (code, out, _) = dressing(&[
        "check",
        &m,
        "--equation",
        "crossing",
        "--json",
        "--region",
        "-1:1,4:5",
        "--seed",
        "7",
    ]);
    assert_eq!(code, 0, "{out}");
    let v: serde_json::Value = serde_json::from_str(&out).unwrap();
    assert_eq!(v["equations"][0]["passed"], true);
    // A wrong right-hand side: exit status 1.
    let dir = std::env::temp_dir().join(format!("dressing-check-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let f = dir.join("wrong.toml");
    std::fs::write(
        &f,
        "[[factor]]\nname = \"S\"\n[[factor.piece]]\nkind = \"cdd\"\nblocks = [{ alpha = \"1/3\" }]\n\
         [[equation]]\nname = \"bad\"\nproduct = [{ factor = \"S\", at = \"theta\" }]\nequals = \"2\"\n",
    )
    .unwrap();
    let (code, out, _) = dressing(&["check", f.to_str().unwrap()]);
    assert_eq!(code, 1, "{out}");
    assert!(out.contains("FAIL"), "{out}");
    // Bad options.
    let (code, _, err) = dressing(&["check", &m, "--region", "1:2"]);
    assert_eq!(code, 2);
    assert!(err.contains("RE0:RE1,IM0:IM1"), "{err}");
    let (code, _, err) = dressing(&["check", &m, "--equation", "nope"]);
    assert_eq!(code, 2);
    assert!(err.contains("unitarity, crossing"), "{err}");
}

#[test]
fn cdd_reports_a_verdict_and_fails_when_an_equation_breaks() {
    let m = example("lantern.toml");
    let (code, out, _) = dressing(&[
        "cdd",
        &m,
        "--candidate",
        "block(1/3)",
        "--digits",
        "20",
        "--points",
        "2",
    ]);
    assert_eq!(code, 0, "{out}");
    assert!(
        out.contains("θ = iπ·1/3") && out.contains("sign +"),
        "{out}"
    );
    assert!(out.contains("equations kept       3 of 3"), "{out}");
    let (code, out, _) = dressing(&[
        "cdd",
        &m,
        "--candidate",
        "exp(theta)",
        "--points",
        "2",
        "--json",
    ]);
    assert_eq!(code, 1, "{out}");
    let v: serde_json::Value = serde_json::from_str(&out).unwrap();
    assert_eq!(v["equations"][1]["kept"], false);
    let (code, _, err) = dressing(&["cdd", &m, "--candidate", "1 +"]);
    assert_eq!(code, 2);
    assert!(err.contains("--candidate"), "{err}");
}

#[test]
fn poles_table_and_json() {
    let m = example("lantern.toml");
    let (code, out, _) = dressing(&[
        "poles", &m, "--factor", "dressed", "--window", "0:1", "--masses", "1,1",
    ]);
    assert_eq!(code, 0, "{out}");
    // The CDD block f_{g/2}, g = 7/20, adds a pole at u/π = 7/40.
    assert!(out.contains("7/40  pole"), "{out}");
    let (code, out, _) = dressing(&["poles", &m, "--json", "--digits", "20"]);
    assert_eq!(code, 0);
    let v: serde_json::Value = serde_json::from_str(&out).unwrap();
    assert!(!v["points"].as_array().unwrap().is_empty());
    let (code, _, err) = dressing(&["poles", &m, "--window", "1:0"]);
    assert_eq!(code, 2);
    assert!(err.contains("inverted"), "{err}");
    let (code, _, err) = dressing(&["poles", &m, "--masses", "1"]);
    assert_eq!(code, 2);
    assert!(err.contains("--masses"), "{err}");
}

#[test]
fn poles_scan_and_region() {
    let sg = format!(
        "{}/tests/data/models/sine-gordon.toml",
        env!("CARGO_MANIFEST_DIR")
    );
    let (code, out, _) = dressing(&["poles", &sg, "--scan", "xi=0.5:2.5:5"]);
    assert_eq!(code, 0, "{out}");
    assert!(out.contains("left the strip"), "{out}");
    let (code, _, err) = dressing(&["poles", &sg, "--scan", "xi=0.5:2.5"]);
    assert_eq!(code, 2);
    assert!(err.contains("NAME=FROM:TO:STEPS"), "{err}");
    let m = example("lantern.toml");
    let (code, out, _) = dressing(&["poles", &m, "--region=-1:1,0.1:3"]);
    assert_eq!(code, 0);
    assert!(out.contains("zeros − poles ="), "{out}");
}

/// Every subcommand's `--help` carries an example, and the example runs
/// (from a scratch folder, so `plot` writes its picture there).
#[test]
fn every_subcommand_help_has_an_example_that_runs() {
    let root = env!("CARGO_MANIFEST_DIR");
    let scratch = std::env::temp_dir().join(format!("dressing-help-{}", std::process::id()));
    std::fs::create_dir_all(&scratch).unwrap();
    for sub in [
        "demo", "special", "eval", "check", "cdd", "poles", "plot", "table",
    ] {
        let (code, help, _) = dressing(&[sub, "--help"]);
        assert_eq!(code, 0);
        let line = help
            .lines()
            .find_map(|l| l.trim().strip_prefix("Example: dressing "))
            .unwrap_or_else(|| panic!("`dressing {sub} --help` has no example:\n{help}"))
            .replace("examples/", &format!("{root}/examples/"));
        let args = common::shell_words(&line);
        let out = Command::new(env!("CARGO_BIN_EXE_dressing"))
            .args(&args)
            .current_dir(&scratch)
            .output()
            .unwrap();
        assert!(
            out.status.success(),
            "the example of `{sub}` fails: {line}\n{}",
            String::from_utf8_lossy(&out.stderr)
        );
    }
    let _ = std::fs::remove_dir_all(&scratch);
}
