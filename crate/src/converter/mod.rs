//! SAR converters (domain notes section 11): how often a conversion has a late decision,
//! the code errors it leaves by size, parked inputs, and the verdict against a BER or FIT
//! target, for synchronous and asynchronous timing.
//!
//! `fields` names the inputs, `input` reads them into a case, `model` holds the timeout
//! and error model, `report` the results and readouts, `sweep` the curves plotted.

pub mod fields;
pub mod input;
pub mod model;
pub mod report;
pub mod sweep;

use crate::calculator::{Calculator, Outcome, TextTable};
use crate::chart::Plot;
use crate::error::{ParamError, ParamErrors};
use crate::params::{FieldSpec, RawInputs};

pub use fields::FIELDS;
pub use input::{Consume, ConvCase, Target, Timing};
pub use model::Fill;
pub use report::{evaluate, ConvReport, SizeRate};

/// The SAR converter calculator (`latchwise converter`, `converter.html`).
pub struct ConverterCalculator;

impl Calculator for ConverterCalculator {
    const NAME: &'static str = "converter";
    const TITLE: &'static str = "SAR converter code errors";
    const SUMMARY: &'static str = "SAR converter: late decisions and code errors per conversion";
    const PAGE: &'static str = "converter.html";
    const FIELDS: &'static [FieldSpec] = FIELDS;
    const PAGE_TABLE: bool = true;
    const HELP: &'static str = "\
Usage: latchwise converter --bits B --timing sync|async (--tau T | --cl C --gm G --g0 G)
                           --vmin V [--gain G] --vfs V --fs F [timing options] [options]

Timing:
  sync   --tbit T --consume benign|hard
         each decision gets tbit; benign: one capture latch feeds the DAC and the
         register (errors within 1 LSB); hard: they can disagree, or a late bit keeps
         its reset value (errors up to half the full scale)
  async  --tconv T --tfix T --fill reset|midpoint
         the decisions share tconv - bits x tfix; a timed-out bit and the rest stay 0
         (reset), or it is set to 1 and the rest 0 (midpoint)

Model (input spread evenly over the full scale vfs = 2^bits LSB): a decision on a
comparator input r takes tau ln(Vx/|r|), Vx = vmin/gain. Sync: each threshold is late
with p = 2 Vx exp(-tbit/tau) / vfs, so a conversion is late with (2^bits - 1) p. Async:
the exact sum over thresholds of the time left after the easy decisions. A parked input
(--sigma-n, --static) fails at 2 (Vx/sigma-n) phi(0) exp(-(time left)/tau).
The target counts every late decision, or with --margin-lsb K code errors of K LSB or more.

Example:
  latchwise converter --bits 10 --timing async --tau 10ps --vmin 1 --gain 1 --vfs 1 \\
                      --fs 100MHz --tconv 1ns --tfix 30ps --fill reset --target-ber 1e-12
";

    type Case = ConvCase;
    type Report = ConvReport;

    fn read(raw: &RawInputs) -> Result<ConvCase, ParamErrors> {
        ConvCase::from_inputs(raw)
    }

    fn conflicts(case: &ConvCase) -> Vec<ParamError> {
        case.conflicts.clone()
    }

    fn evaluate(case: &ConvCase) -> ConvReport {
        report::evaluate(case)
    }

    fn outcome(report: &ConvReport) -> Outcome {
        report.outcome()
    }

    fn plots(case: &ConvCase, report: &ConvReport) -> Vec<Plot> {
        vec![
            sweep::sizes(report),
            sweep::rate_vs_time(case, report, 200),
            sweep::by_step(report),
        ]
    }

    fn text_table(report: &ConvReport, _most: Option<usize>) -> Option<TextTable> {
        Some(report.size_table())
    }
}
