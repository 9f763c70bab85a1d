//! The command-line front end: parse (args.rs), load (inputs.rs), run one command, and map the
//! outcome to an exit code: 0 done, 1 tolerance not met (or verify found a mismatch), 2 bad
//! input or usage.

pub mod args;
mod convert;
mod demo;
mod inputs;
mod inspect;
mod outputs;
mod verify;

use std::io::IsTerminal;
use std::process::ExitCode;

use args::{Cli, Command};

/// A failure that ends the command, with its exit code.
#[derive(Debug)]
pub struct CliError {
    pub code: u8,
    pub message: String,
}

impl CliError {
    /// Bad input or usage: exit code 2.
    pub fn input(message: impl Into<String>) -> CliError {
        CliError {
            code: 2,
            message: message.into(),
        }
    }

    pub fn usage(message: impl Into<String>) -> CliError {
        CliError::input(message)
    }
}

/// What a finished command says about its result.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Outcome {
    Done,
    OverTolerance,
    InvalidInputSkipped,
}

impl Outcome {
    fn code(self) -> u8 {
        match self {
            Outcome::Done => 0,
            Outcome::OverTolerance => 1,
            Outcome::InvalidInputSkipped => 2,
        }
    }
}

/// Colour on standard output: only on a terminal, and never when NO_COLOR is set to anything
/// non-empty (no-color.org).
pub fn stdout_color() -> bool {
    std::io::stdout().is_terminal() && std::env::var_os("NO_COLOR").is_none_or(|v| v.is_empty())
}

/// Run a parsed command line.
pub fn run(cli: Cli) -> ExitCode {
    let result = match cli.command {
        Command::Convert(a) => convert::run(*a),
        Command::Verify(a) => verify::run(a),
        Command::Inspect(a) => inspect::run(a),
        Command::Demo(a) => demo::run(a),
    };
    match result {
        Ok(outcome) => ExitCode::from(outcome.code()),
        Err(e) => {
            eprintln!("ratline: {}", e.message);
            ExitCode::from(e.code)
        }
    }
}
