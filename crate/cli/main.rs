//! The `latchwise` command: a thin adapter from options to the core and back to text or JSON.
#![allow(clippy::print_stdout, clippy::print_stderr)]

mod args;
mod comparator_cmd;
mod sync_cmd;

use std::process::ExitCode;

use latchwise::synchronizer::CAUTION;

/// Exit status when a target was given and is not met.
pub const EXIT_TARGET_MISSED: u8 = 1;
/// Exit status for bad input or usage.
pub const EXIT_BAD_INPUT: u8 = 2;

fn usage() -> String {
    format!(
        "latchwise {} - metastability sign-off for synchronizers and latched comparators

Usage:
  latchwise sync [options]        synchronizer MTBF, FIT and depth
  latchwise comparator [options]  comparator metastability error rate against a BER
  latchwise help COMMAND          options of a command
  latchwise --version

Values take engineering notation: 20p, 20ps, 20 ps, 2e-11, 0.02ns, 1.5GHz, 250M, 1meg.
Prefixes are case-sensitive (m milli, M mega; meg is mega; u or µ micro).

Exit status: 0 success, 1 a target was given and is not met, 2 bad input.

Caution: {CAUTION}
",
        env!("CARGO_PKG_VERSION")
    )
}

fn main() -> ExitCode {
    let argv: Vec<String> = std::env::args().skip(1).collect();
    let (cmd, rest) = match argv.split_first() {
        Some((c, r)) => (c.as_str(), r),
        None => {
            eprint!("{}", usage());
            return ExitCode::from(EXIT_BAD_INPUT);
        }
    };
    match cmd {
        "sync" => sync_cmd::run(rest),
        "comparator" => comparator_cmd::run(rest),
        "help" | "--help" | "-h" => match rest.first().map(String::as_str) {
            Some("sync") => {
                print!("{}", sync_cmd::help());
                ExitCode::SUCCESS
            }
            Some("comparator") => {
                print!("{}", comparator_cmd::help());
                ExitCode::SUCCESS
            }
            _ => {
                print!("{}", usage());
                ExitCode::SUCCESS
            }
        },
        "--version" | "-V" => {
            println!("latchwise {}", env!("CARGO_PKG_VERSION"));
            ExitCode::SUCCESS
        }
        other => {
            eprintln!("latchwise: unknown command '{other}' (try: latchwise help)");
            ExitCode::from(EXIT_BAD_INPUT)
        }
    }
}
