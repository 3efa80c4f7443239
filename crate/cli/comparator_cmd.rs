//! `latchwise comparator`: metastability error rate of a latched comparator.

use std::process::ExitCode;

use latchwise::comparator::{evaluate, unused_fields, CompCase, CompReport, FIELDS};
use latchwise::synchronizer::CAUTION;

use crate::args::{drive, options_help, Calculator};

/// The help text of `latchwise comparator`.
pub fn help() -> String {
    format!(
        "latchwise comparator - metastability error rate of a latched comparator

Usage: latchwise comparator (--tau T | --cl C --gm G --g0 G) --treg T --vmin V
                            --input MODEL [model options] --fs F [options]

Input models:
  uniform   --lsb V             uniform over thresholds lsb apart (flash; SAR to first order)
  gaussian  --sigma V [--mean V] Gaussian input around the threshold
  nrz       --amp V --sigma V   two-level data at +-amp with Gaussian noise
  pam4      --amp V --sigma V   levels +-amp, +-amp/3; thresholds 0, +-2amp/3
  sine      --amp V --lsb V     full-scale sine (peak amp) into thresholds at k*lsb

Options (names equal the web page's URL keys):
{}  --from-url URL    read parameters from a bookmarked page URL or '?query'
  --json            print one JSON object instead of the report
  --help            this text

Model: vcrit = (vmin/gain) * exp(-treg/tau), treg including extra stages; an input
within +-vcrit of a threshold is undecided. tau = cl/(gm - g0) when given by devices.

Exit status: 0 success, 1 a target was given and is not met, 2 bad input.

Example:
  latchwise comparator --tau 15ps --treg 80ps --vmin 0.4 --gain 4 --input uniform \\
                       --lsb 1mV --fs 5GHz --target-ber 1e-12

Caution: {CAUTION}
",
        options_help(FIELDS)
    )
}

/// Runs the command.
pub fn run(args: &[String]) -> ExitCode {
    drive(
        &Calculator {
            name: "comparator",
            fields: FIELDS,
            help,
            evaluate: |raw| {
                CompCase::from_inputs(raw)
                    .map(|c| evaluate(&c, unused_fields(raw, c.comp.input.name())))
            },
            text: text_report,
            missed: |r| r.meets_target == Some(false),
        },
        args,
    )
}

/// The human-readable report.
fn text_report(report: &CompReport) -> String {
    let mut o = String::from("Comparator metastability\n\nInputs (as understood)\n");
    for (k, v) in &report.inputs {
        o.push_str(&format!("  {k:<28} {v}\n"));
    }
    o.push_str("\nResults\n");
    for r in report.readouts() {
        o.push_str(&format!("  {:<34} {}\n", r.label, r.text));
    }
    for f in &report.unused {
        o.push_str(&format!(
            "\nNote: {f} is not used by the {} input model.",
            report.input_model
        ));
    }
    if !report.warnings.is_empty() {
        o.push_str("\nWarnings\n");
        for w in &report.warnings {
            o.push_str(&format!("  - {w}\n"));
        }
    }
    o.push_str(&format!("\nCaution: {}\n", report.caution));
    o
}
