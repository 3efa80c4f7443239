//! Operating points (domain notes section 10): tau across supply voltage, temperature
//! and ageing by rules that stay on the safe side, and a crossing signed off at every
//! point of a DVFS table, exported as budget corners.
//!
//! `fields` names the inputs, `input` reads the two tables and builds each point's
//! synchronizer case, `model` holds the rules, `report` the results and the corners
//! export, `sweep` the plots.

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
pub use input::{PointCase, SupplyCase};
pub use model::Rule;
pub use report::{evaluate, PointResult, SupplyReport};

/// The supply calculator (`latchwise supply`, `supply.html`).
pub struct SupplyCalculator;

impl Calculator for SupplyCalculator {
    const NAME: &'static str = "supply";
    const TITLE: &'static str = "Operating points: tau across supply and DVFS";
    const SUMMARY: &'static str = "a synchronizer at every operating point of a DVFS table";
    const PAGE: &'static str = "supply.html";
    const FIELDS: &'static [FieldSpec] = FIELDS;
    const OPERANDS: &'static [&'static str] = &["char"];
    const PAGE_TABLE: bool = true;
    const RESULTS_OPTION: &'static str = "corners-out";
    const HELP: &'static str = "\
Usage: latchwise supply CHAR.csv --points POINTS.csv [--ss S] [--dvt V]
                        (--fdata F | --crossing KIND ...) --stages N [--tsu T --tcq T]
                        [--target-years Y | --target-fit F]
                        [--corners-out FILE] [--domain NAME] [--json]

CHAR.csv: vdd, tau, tw or t0, and optionally tsu, tcq, temp (°C), aged (yes/no); one
row per characterised point. POINTS.csv: name, vdd, fclk, and optionally temp,
residency (shares of service time summing to 1). A point without temp is evaluated
at every characterised temperature.

Rules for tau at an operating point (ln tau is convex in VDD, its slope at most
ln10 / (2 ss)):
  characterised  a point at that VDD (and temp), unchanged
  interpolated   ln tau linear in VDD between two characterised voltages (safe)
  bounded        below the lowest V1: tau(V1) * 10^((V1 - V) / (2 ss)); needs --ss
  held           above the highest: its tau
  ageing         with --dvt: tau * 10^(dvt / ss), unless the table is aged
The window, tsu and tcq are interpolated likewise (not proven conservative).
--corners-out writes one budget corner per point and temperature (fclk@DOMAIN with
--domain), ready for `latchwise budget --corners`.

Example:
  latchwise supply examples/supply-char.csv --points examples/supply-points.csv \\
      --ss 62.5mV --dvt 20mV --fdata 20MHz --stages 2 --target-years 1e4
";

    type Case = SupplyCase;
    type Report = SupplyReport;

    fn read(raw: &RawInputs) -> Result<SupplyCase, ParamErrors> {
        SupplyCase::from_inputs(raw)
    }

    fn conflicts(case: &SupplyCase) -> Vec<ParamError> {
        case.conflicts.clone()
    }

    fn evaluate(case: &SupplyCase) -> SupplyReport {
        report::evaluate(case)
    }

    fn outcome(report: &SupplyReport) -> Outcome {
        report.outcome()
    }

    fn plots(case: &SupplyCase, report: &SupplyReport) -> Vec<Plot> {
        let mut v = vec![
            sweep::tau_vs_vdd(case, report),
            sweep::mtbf_vs_vdd(case, report),
        ];
        v.extend(sweep::stages(report));
        v
    }

    fn results_csv(case: &SupplyCase, report: &SupplyReport) -> Option<String> {
        Some(report.corners_csv(case.domain.as_deref()))
    }

    fn text_table(report: &SupplyReport, _most: Option<usize>) -> Option<TextTable> {
        Some(report.point_table())
    }
}
