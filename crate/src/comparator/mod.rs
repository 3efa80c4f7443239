//! Latched-comparator metastability: critical input, error probability per decision for
//! several input models, error rates against a target BER, and the solvers that size
//! regeneration time, tau and extra latch stages.
//!
//! `fields` names the inputs, `input` reads them into a case, `model` holds the physics
//! and the solvers, `report` the results, readouts and plots, `sweep` the curves plotted.

pub mod fields;
pub mod input;
pub mod model;
pub mod report;
pub mod sweep;

use crate::calculator::{Calculator, Outcome};
use crate::chart::Plot;
use crate::error::ParamErrors;
use crate::params::{FieldSpec, RawInputs};

pub use fields::FIELDS;
pub use input::{unused_fields, CompCase, INPUT_CHOICES};
pub use model::{
    decision_time, tau_from_devices, CompParts, Comparator, InputModel, Sizing, TauSource,
    SINE_MAX_THRESHOLDS,
};
pub use report::{evaluate, CompReport};

/// The comparator calculator (`latchwise comparator`, `comparator.html`).
pub struct ComparatorCalculator;

impl Calculator for ComparatorCalculator {
    const NAME: &'static str = "comparator";
    const TITLE: &'static str = "Comparator metastability error rate";
    const SUMMARY: &'static str = "comparator metastability error rate against a BER";
    const PAGE: &'static str = "comparator.html";
    const FIELDS: &'static [FieldSpec] = FIELDS;
    const HELP: &'static str = "\
Usage: latchwise comparator (--tau T | --cl C --gm G --g0 G) --treg T --vmin V
                            --input MODEL [model options] --fs F [options]

Input models:
  uniform   --lsb V              uniform over thresholds lsb apart (flash; SAR to first order)
  gaussian  --sigma V [--mean V] Gaussian input around the threshold
  nrz       --amp V --sigma V    two-level data at +-amp with Gaussian noise
  pam4      --amp V --sigma V    levels +-amp, +-amp/3; thresholds 0, +-2amp/3
  sine      --amp V --lsb V      full-scale sine (peak amp) into thresholds at k*lsb

Model: vcrit = (vmin/gain) * exp(-treg/tau), treg including extra stages; an input
within +-vcrit of a threshold is undecided. tau = cl/(gm - g0) when given by devices.

Example:
  latchwise comparator --tau 15ps --treg 80ps --vmin 0.4 --gain 4 --input uniform \\
                       --lsb 1mV --fs 5GHz --target-ber 1e-12
";

    type Case = CompCase;
    type Report = CompReport;

    fn read(raw: &RawInputs) -> Result<CompCase, ParamErrors> {
        CompCase::from_inputs(raw)
    }

    fn evaluate(case: &CompCase) -> CompReport {
        report::evaluate(case)
    }

    fn outcome(report: &CompReport) -> Outcome {
        report.outcome()
    }

    fn plots(case: &CompCase, _report: &Self::Report) -> Vec<Plot> {
        report::plots(case)
    }
}
