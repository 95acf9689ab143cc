//! The `inkfit` binary: parse arguments, run, map the outcome to an exit code.

use std::io::{BufWriter, ErrorKind, Write};
use std::process::ExitCode;

use clap::Parser;
use inkfit::cli::{self, Cli};

fn main() -> ExitCode {
    let cli = match Cli::try_parse() {
        Ok(cli) => cli,
        Err(e) => return argument_error(&e),
    };
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

/// Help and version go to stdout as clap writes them; every other argument
/// error is one line on stderr, exit 2.
fn argument_error(e: &clap::Error) -> ExitCode {
    use clap::error::ErrorKind as K;
    if matches!(e.kind(), K::DisplayHelp | K::DisplayVersion) {
        let _ = e.print();
        return ExitCode::SUCCESS;
    }
    if e.kind() == K::DisplayHelpOnMissingArgumentOrSubcommand {
        let _ = e.print();
        return ExitCode::from(2);
    }
    // Point to the subcommand's own help when one was named.
    let sub = std::env::args()
        .nth(1)
        .filter(|a| <Cli as clap::CommandFactory>::command().find_subcommand(a).is_some());
    let help = match sub {
        Some(s) => format!("see 'inkfit {s} --help'"),
        None => "see 'inkfit --help'".to_string(),
    };
    eprintln!("inkfit: error: {}; {help}", one_line(&e.to_string()));
    ExitCode::from(2)
}

/// clap's message without its usage block and tips, on one line: what was
/// wrong and the values it accepts.
fn one_line(text: &str) -> String {
    let mut out = String::new();
    let mut in_usage = false;
    for line in text.lines() {
        let t = line.trim();
        if t.starts_with("Usage:") {
            in_usage = true;
            continue;
        }
        if t.is_empty() {
            in_usage = false;
            continue;
        }
        if in_usage || t.starts_with("For more information") || t.starts_with("tip:") {
            continue;
        }
        if !out.is_empty() {
            out.push_str(if out.ends_with(':') { " " } else { "; " });
        }
        out.push_str(t.strip_prefix("error: ").unwrap_or(t));
    }
    out
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
