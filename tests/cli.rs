//! The command line, run as a user would: output and exit status.

use std::process::Command;

fn dressing(args: &[&str]) -> (i32, String, String) {
    let out = Command::new(env!("CARGO_BIN_EXE_dressing"))
        .args(args)
        .output()
        .expect("the binary runs");
    (
        out.status.code().unwrap_or(-1),
        String::from_utf8_lossy(&out.stdout).into_owned(),
        String::from_utf8_lossy(&out.stderr).into_owned(),
    )
}

#[test]
fn demo_runs_and_its_checks_agree() {
    let (code, out, _) = dressing(&["demo"]);
    assert_eq!(code, 0);
    // Γ(1/2)² = π (DLMF 5.4.6) and ψ(1) = −γ (DLMF 5.4.12) at 100 digits.
    assert!(
        out.contains("Γ(1/2)² = π (DLMF 5.4.6): agrees to 10"),
        "{out}"
    );
    assert!(
        out.contains("ψ(1) = −γ (DLMF 5.4.12): agrees to 100"),
        "{out}"
    );
    // The factor's two representations agree to the 30 digits asked for,
    // in the strip and outside it.
    assert_eq!(out.matches("agrees to 3").count(), 2, "{out}");
    assert!(
        out.contains("integral continued outside its strip"),
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
