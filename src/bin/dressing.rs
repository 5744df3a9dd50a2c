//! The `dressing` command-line tool; see `dressing --help`.

use clap::Parser;

fn main() -> std::process::ExitCode {
    let cli = dressing::cli::Cli::parse();
    match dressing::cli::run(cli) {
        Ok(report) => {
            print!("{}", report.stdout);
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
