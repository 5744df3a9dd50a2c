//! The outputs pasted in docs/guide.md and README.md are the program's: every ```text
//! block that starts with `$ dressing …` is rerun here and compared line
//! by line, so neither can drift from the program.

mod common;

use std::process::Command;

/// (command, expected output) for every runnable block of a markdown file.
pub fn blocks(text: &str) -> Vec<(String, String)> {
    let mut out = Vec::new();
    let mut lines = text.lines();
    while let Some(l) = lines.next() {
        if l.trim() != "```text" {
            continue;
        }
        let mut body: Vec<&str> = Vec::new();
        for b in lines.by_ref() {
            if b.trim() == "```" {
                break;
            }
            body.push(b);
        }
        if let Some(cmd) = body.first().and_then(|f| f.strip_prefix("$ dressing ")) {
            out.push((cmd.to_string(), body[1..].join("\n")));
        }
    }
    out
}

/// Reruns every block of `file` (relative to the crate root) and compares.
fn check_file(file: &str, at_least: usize) {
    let root = env!("CARGO_MANIFEST_DIR");
    let text = std::fs::read_to_string(format!("{root}/{file}")).unwrap();
    let runs = blocks(&text);
    assert!(runs.len() >= at_least, "{file}: {} blocks", runs.len());
    for (cmd, want) in runs {
        let out = Command::new(env!("CARGO_BIN_EXE_dressing"))
            .args(common::shell_words(&cmd))
            .current_dir(root)
            .output()
            .unwrap();
        let got = String::from_utf8_lossy(&out.stdout);
        let (got, want) = (got.trim_end(), want.trim_end());
        if got != want {
            let first = got
                .lines()
                .zip(want.lines())
                .position(|(a, b)| a != b)
                .unwrap_or(0);
            panic!(
                "`dressing {cmd}` no longer prints what {file} shows (first difference at line \
                 {}):\n--- program ---\n{got}\n--- {file} ---\n{want}\nRun `python3 \
                 scripts/update_docs_outputs.py {file}` after `cargo build --release`, read the \
                 diff and commit it.",
                first + 1
            );
        }
    }
}

#[test]
fn guide_outputs_match_the_program() {
    check_file("docs/guide.md", 4);
}

/// The README's tour: eval, check, poles, cdd and table.
#[test]
fn readme_tour_outputs_match_the_program() {
    check_file("README.md", 5);
}
