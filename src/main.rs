//! The `inkfit` binary: parse arguments, run, map the outcome to an exit code.

use std::io::{BufWriter, ErrorKind, Write};
use std::process::ExitCode;

use clap::Parser;
use inkfit::cli::{self, Cli};

fn main() -> ExitCode {
    let cli = Cli::parse();
    let stdout = std::io::stdout();
    let mut out = BufWriter::new(stdout.lock());
    let result = cli::run(cli, &mut out).and_then(|o| out.flush().map(|_| o).map_err(Into::into));
    match result {
        Ok(cli::Outcome::Done) => ExitCode::SUCCESS,
        Ok(cli::Outcome::BeyondTolerance) => ExitCode::from(1),
        Err(e) if is_broken_pipe(e.as_ref()) => ExitCode::SUCCESS,
        Err(e) => {
            eprintln!("inkfit: error: {}", cli::error_chain(e.as_ref()));
            ExitCode::from(2)
        }
    }
}

/// A reader that closed the pipe early (`inkfit … | head`) is not an error.
fn is_broken_pipe(e: &(dyn std::error::Error + 'static)) -> bool {
    let mut cur = Some(e);
    while let Some(err) = cur {
        if let Some(io) = err.downcast_ref::<std::io::Error>() {
            if io.kind() == ErrorKind::BrokenPipe {
                return true;
            }
        }
        cur = err.source();
    }
    false
}
