//! The `latchwise` command: a thin adapter from options to the core and back to text or JSON.
#![allow(clippy::print_stdout, clippy::print_stderr)]

mod args;
mod drive;
mod json;

use std::io::Write;
use std::process::ExitCode;

use latchwise::registry::{self, ALL};
use latchwise::reliability::CAUTION;

/// Exit status when a target was given and is not met.
pub const EXIT_TARGET_MISSED: u8 = 1;
/// Exit status for bad input or usage.
pub const EXIT_BAD_INPUT: u8 = 2;

fn usage() -> String {
    let commands: String = ALL
        .iter()
        .map(|c| {
            format!(
                "  latchwise {:<21} {}\n",
                format!("{} [options]", c.name),
                c.summary
            )
        })
        .collect();
    format!(
        "latchwise {} - metastability sign-off for synchronizers and latched comparators

Usage:
{commands}  latchwise help COMMAND          options of a command
  latchwise --version

Values take engineering notation: 20p, 20ps, 20 ps, 2e-11, 0.02ns, 1.5GHz, 250M, 1meg.
Prefixes are case-sensitive (m milli, M mega; meg is mega; u or µ micro).

Exit status: 0 success, 1 a target was given and is not met, 2 bad input or output
that could not be written.

Caution: {CAUTION}
",
        env!("CARGO_PKG_VERSION")
    )
}

fn main() -> ExitCode {
    let mut argv: Vec<String> = Vec::new();
    for (i, a) in std::env::args_os().skip(1).enumerate() {
        match a.into_string() {
            Ok(s) => argv.push(s),
            Err(bad) => {
                drive::complain(&format!(
                    "latchwise: argument {} is not valid UTF-8: {}",
                    i + 1,
                    bad.to_string_lossy()
                ));
                return ExitCode::from(EXIT_BAD_INPUT);
            }
        }
    }
    let Some((cmd, rest)) = argv.split_first() else {
        let _ = std::io::stderr().write_all(usage().as_bytes());
        return ExitCode::from(EXIT_BAD_INPUT);
    };
    if let Some(code) = registry::dispatch(cmd, drive::Run(rest)) {
        return code;
    }
    match cmd.as_str() {
        "help" | "--help" | "-h" => {
            let text = rest
                .first()
                .and_then(|c| registry::dispatch(c, drive::Help))
                .unwrap_or_else(usage);
            drive::said("help", drive::say(&text), ExitCode::SUCCESS)
        }
        "--version" | "-V" => drive::said(
            "--version",
            drive::say(&format!("latchwise {}\n", env!("CARGO_PKG_VERSION"))),
            ExitCode::SUCCESS,
        ),
        other => {
            drive::complain(&format!(
                "latchwise: unknown command '{other}' (try: latchwise help)"
            ));
            ExitCode::from(EXIT_BAD_INPUT)
        }
    }
}
