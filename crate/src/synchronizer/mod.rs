//! Flip-flop synchronizer MTBF and FIT, target solvers and fleet statistics.
//!
//! The crossing itself (its fields, its reading, its model) is [`crate::crossing`], which
//! the design budget shares; here are `report` (the results, readouts and plots) and
//! `sweep` (the curves plotted).

pub use crate::crossing::{clocks, fields, input, model};
pub mod report;
pub mod sweep;

use crate::calculator::{Calculator, Outcome};
use crate::chart::Plot;
use crate::error::{ParamError, ParamErrors};
use crate::params::{FieldSpec, RawInputs};

pub use fields::FIELDS;
pub use input::SyncCase;
pub use model::{ClockLimit, StagesNeeded, SyncParts, Synchronizer, TauLimit, Window};
pub use report::{evaluate, SyncReport};

/// The synchronizer calculator (`latchwise sync`, `index.html`).
pub struct SyncCalculator;

impl Calculator for SyncCalculator {
    const NAME: &'static str = "sync";
    const TITLE: &'static str = "Synchronizer MTBF";
    const SUMMARY: &'static str = "synchronizer MTBF, FIT and depth";
    const PAGE: &'static str = "index.html";
    const FIELDS: &'static [FieldSpec] = FIELDS;
    const HELP: &'static str = "\
Usage: latchwise sync --tau T (--tw W | --t0 W) --fclk F --fdata F
                      (--stages N --tsu T --tcq T | --tr T) [options]

Model: rate = fdata * fclk * tw * exp(-tr/tau), MTBF = 1/rate, FIT = rate * 3.6e12,
tr = (stages - 1) * (1/fclk - tsu - tcq); with t0 (window counted from the clock edge)
tr = (stages - 1) * (1/fclk - tsu). A year is 365.25 days.

Example:
  latchwise sync --tau 20ps --tw 40ps --fclk 1GHz --fdata 100MHz --stages 2 \\
                 --tsu 30ps --tcq 50ps --target-years 1e6
";

    // The fleet size was called `units` before; old links still carry it.
    const ALIASES: &'static [(&'static str, &'static str)] = &[("units", "devices")];

    type Case = SyncCase;
    type Report = SyncReport;

    fn read(raw: &RawInputs) -> Result<SyncCase, ParamErrors> {
        SyncCase::from_inputs(raw)
    }

    fn conflicts(case: &SyncCase) -> Vec<ParamError> {
        case.conflicts.clone()
    }

    fn evaluate(case: &SyncCase) -> SyncReport {
        report::evaluate(case)
    }

    fn outcome(report: &SyncReport) -> Outcome {
        report.outcome()
    }

    fn plots(case: &SyncCase, _report: &Self::Report) -> Vec<Plot> {
        report::plots(case)
    }
}
