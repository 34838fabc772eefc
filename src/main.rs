//! The `phdose` binary: parses the command line, runs the library, prints, and maps errors to
//! exit codes in this one place (2 bad input, 3 target not reachable, 4 problems found by
//! `check`, 1 internal error).

use std::io::Write;
use std::process::ExitCode;

use clap::Parser;
use phdose::Error;
use phdose::cli::{self, Cli};

/// mimalloc: the batch path allocates per row (molecule, matches, JSON), and the system
/// allocator's share of that time was about a fifth (measured with perf; README performance).
#[global_allocator]
static GLOBAL: mimalloc::MiMalloc = mimalloc::MiMalloc;

fn main() -> ExitCode {
    let cli = Cli::parse();
    match cli::run(&cli) {
        Ok(text) => print_out(&text),
        Err(Error::Problems { count, report }) => {
            // The report is the answer: it goes to standard output, the verdict to the exit code.
            let printed = print_out(&report);
            eprintln!("phdose: {count} problem(s) found in the procedure");
            if printed != ExitCode::SUCCESS {
                return printed;
            }
            ExitCode::from(exit_code(&Error::Problems { count, report }))
        }
        Err(e) => {
            eprintln!("phdose: {e}");
            ExitCode::from(exit_code(&e))
        }
    }
}

/// Exit code for each kind of failure (the contract in the README).
fn exit_code(e: &Error) -> u8 {
    match e {
        Error::Parse(_) | Error::Input(_) => 2,
        Error::Unreachable(_) => 3,
        Error::Problems { .. } => 4,
        Error::Store(_) | Error::Internal(_) | Error::Io(_) => 1,
    }
}

/// Prints the result; a reader that closed the pipe early (`| head`) is a normal end.
fn print_out(text: &str) -> ExitCode {
    let mut out = std::io::stdout().lock();
    match out.write_all(text.as_bytes()).and_then(|_| out.flush()) {
        Ok(()) => ExitCode::SUCCESS,
        Err(e) if e.kind() == std::io::ErrorKind::BrokenPipe => ExitCode::SUCCESS,
        Err(e) => {
            eprintln!("phdose: {e}");
            ExitCode::from(1)
        }
    }
}
