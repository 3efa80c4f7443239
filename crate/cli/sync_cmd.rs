//! `latchwise sync`: the synchronizer report as text or JSON.

use std::process::ExitCode;

use latchwise::quantity::{format_duration_log10, format_log10, format_si};
use latchwise::synchronizer::{
    evaluate, SyncCase, SyncReport, Target, TauLimit, CAUTION, FIELDS, YEAR_S,
};

use crate::args::{drive, options_help, Calculator};

/// The help text of `latchwise sync`.
pub fn help() -> String {
    format!(
        "latchwise sync - MTBF and FIT of a flip-flop synchronizer

Usage: latchwise sync --tau T (--tw W | --t0 W) --fclk F --fdata F
                      (--stages N --tsu T --tcq T | --tr T) [options]

Options (names equal the web page's URL keys):
{}  --from-url URL    read parameters from a bookmarked page URL or '?query';
                    options given explicitly override it
  --json            print one JSON object instead of the report
  --help            this text

Model: rate = fdata * fclk * tw * exp(-tr/tau), MTBF = 1/rate, FIT = rate * 3.6e12,
tr = (stages - 1) * (1/fclk - tsu - tcq); with t0 (window counted from the clock edge)
tr = (stages - 1) * (1/fclk - tsu). A year is 365.25 days.

Exit status: 0 success, 1 a target was given and is not met, 2 bad input.

Example:
  latchwise sync --tau 20ps --tw 40ps --fclk 1GHz --fdata 100MHz --stages 2 \\
                 --tsu 30ps --tcq 50ps --target-years 1e6

Caution: {CAUTION}
",
        options_help(FIELDS)
    )
}

/// Runs the command.
pub fn run(args: &[String]) -> ExitCode {
    drive(
        &Calculator {
            name: "sync",
            fields: FIELDS,
            help,
            evaluate: |raw| SyncCase::from_inputs(raw).map(|c| evaluate(&c)),
            text: text_report,
            missed: |r| r.meets_target == Some(false),
        },
        args,
    )
}

fn row(out: &mut String, label: &str, value: &str) {
    out.push_str(&format!("  {label:<28} {value}\n"));
}

/// The human-readable report.
pub fn text_report(r: &SyncReport) -> String {
    let mut o = String::from("Synchronizer MTBF\n\nInputs (as understood)\n");
    for (k, v) in &r.inputs {
        row(&mut o, k, v);
    }
    o.push_str(&format!(
        "  window convention            {}\n\nResults\n",
        if r.convention == "t0" {
            "t0: counted from the clock edge"
        } else {
            "tw: referred to the nominal clock-to-output delay"
        }
    ));
    if let Some(h) = r.hop_time_s {
        row(&mut o, "time per extra stage", &format_si(h, "s"));
    }
    row(
        &mut o,
        "resolution time",
        &format_si(r.resolution_time_s, "s"),
    );
    row(
        &mut o,
        "failure probability / edge",
        &format_log10(r.log10_p_fail, 3),
    );
    row(
        &mut o,
        "failure rate",
        &format!("{} /s", format_log10(r.log10_rate_per_s, 3)),
    );
    row(
        &mut o,
        "MTBF",
        &format!(
            "{}  ({} s)",
            format_duration_log10(r.log10_mtbf_s, YEAR_S.log10()),
            format_log10(r.log10_mtbf_s, 3)
        ),
    );
    row(&mut o, "FIT", &format_log10(r.log10_fit, 3));
    if let (Some(t), Some(met), Some(margin)) = (r.target, r.meets_target, r.margin_decades) {
        let what = match t {
            Target::MtbfYears(y) => format!("MTBF >= {} years", format_log10(y.log10(), 4)),
            Target::Fit(f) => format!("FIT <= {}", format_log10(f.log10(), 4)),
        };
        o.push_str(&format!(
            "\nTarget {what}: {} by {:.2} decades\n",
            if met { "MET" } else { "MISSED" },
            margin.abs()
        ));
        match r.min_stages {
            Some(Some(n)) => row(&mut o, "smallest stage count", &n.to_string()),
            Some(None) => row(&mut o, "smallest stage count", "n/a (tr given explicitly)"),
            None => {}
        }
        match r.max_fclk_hz {
            Some(Some(f)) => row(&mut o, "highest fclk at this depth", &format_si(f, "Hz")),
            Some(None) => row(
                &mut o,
                "highest fclk at this depth",
                "none meets the target",
            ),
            None => {}
        }
        match r.max_tau {
            Some(TauLimit::Max(t)) => row(&mut o, "largest tau at this tr", &format_si(t, "s")),
            Some(TauLimit::Any) => row(
                &mut o,
                "largest tau at this tr",
                "any (met without resolution time)",
            ),
            Some(TauLimit::None) => row(
                &mut o,
                "largest tau at this tr",
                "none (no resolution time)",
            ),
            None => {}
        }
    }
    if let Some(f) = r.fleet {
        o.push_str("\nFleet\n");
        row(
            &mut o,
            "expected failures",
            &format_log10(f.log10_expected_failures, 3),
        );
        row(
            &mut o,
            "P(at least one failure)",
            &format_log10(f.log10_p_any_failure, 3),
        );
    }
    if !r.warnings.is_empty() {
        o.push_str("\nWarnings\n");
        for w in &r.warnings {
            o.push_str(&format!("  - {w}\n"));
        }
    }
    o.push_str(&format!(
        "\nA year is {} days.\nCaution: {}\n",
        r.year_days, r.caution
    ));
    o
}
