//! The `ratline` command: parse the command line and hand it to the library.

use clap::Parser;

fn main() -> std::process::ExitCode {
    ratline::cli::run(ratline::cli::args::Cli::parse())
}
