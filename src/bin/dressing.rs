//! The `dressing` command-line tool; see `dressing --help`.

use clap::Parser;
use std::io::Write;

fn main() -> std::process::ExitCode {
    let cli = dressing::cli::Cli::parse();
    match dressing::cli::run(cli) {
        Ok(report) => {
            // A reader that stops early (`dressing table … | head`) closes
            // the pipe: that ends the output, it is not an error of ours.
            let mut out = std::io::stdout().lock();
            match out
                .write_all(report.stdout.as_bytes())
                .and_then(|_| out.flush())
            {
                Ok(()) => {}
                Err(e) if e.kind() == std::io::ErrorKind::BrokenPipe => {}
                Err(e) => {
                    eprintln!("error: cannot write the output: {e}");
                    return std::process::ExitCode::from(2);
                }
            }
            if report.failed {
                std::process::ExitCode::from(1)
            } else {
                std::process::ExitCode::SUCCESS
            }
        }
        Err(msg) => {
            eprintln!("error: {msg}");
            std::process::ExitCode::from(2)
        }
    }
}
