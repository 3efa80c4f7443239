//! The whole-design budget: every crossing of a chip at every corner, the total against a
//! FIT budget, the cheapest fix, the fleet and the spread under uncertainty (domain notes
//! section 7).
//!
//! `fields` names the inputs, `input` reads the design and its corners, `rollup` holds the
//! arithmetic (totals, fix plan, percentiles), `report` the results, readouts and plots.

pub mod fields;
pub mod input;
pub mod report;
pub mod rollup;
pub mod row;

use crate::calculator::{Calculator, Outcome, RowFigures, RowsApart, TextTable};
use crate::chart::Plot;
use crate::error::ParamErrors;
use crate::params::{FieldSpec, RawInputs};

pub use fields::FIELDS;
pub use input::BudgetCase;
pub use report::{evaluate, BudgetReport};

/// The budget calculator (`latchwise budget`, `budget.html`).
pub struct BudgetCalculator;

impl Calculator for BudgetCalculator {
    const NAME: &'static str = "budget";
    const TITLE: &'static str = "Design budget: every crossing, every corner";
    const SUMMARY: &'static str = "a whole design's crossings against a FIT budget";
    const PAGE: &'static str = "budget.html";
    const FIELDS: &'static [FieldSpec] = FIELDS;
    const OPERANDS: &'static [&'static str] = &["design"];
    const HELP: &'static str = "\
Usage: latchwise budget DESIGN.csv [--corners FILE | --tau T --tw W|--t0 W --tsu T --tcq T]
                        [--budget-fit F] [--devices N --service-years Y]
                        [--tau-sigma S --tw-sigma S [--tau-tw-corr R]]
                        [--signoff p95|nominal]
                        [--results FILE.csv] [--all-rows] [--json]

DESIGN.csv: one row per crossing, and each row is a synchronizer case: every input of
'latchwise sync' is a column by the same name (tau (one, or one per hop: \"14ps,22ps\"),
tw or t0, tsu, tcq, fclk, fdata, stages or tr, crossing with flaunch/activity,
increments or transfers, ratio, jitter, phase, tau-master, tau-slave, duty, tw2), held
to the same limits and read by the same model. The design's own columns: name (unique),
count (identical instances, default 1: it multiplies the rate and the flip-flops), width
(flip-flops per stage of one instance: a 5-bit Gray pointer is crossing gray, width 5;
a stage costs count x width flip-flops in the fix plan), max_stages (the plan never
passes it), cell (a cell class), domain (the sampling clock's domain), launch_domain
(a signal's launching clock's domain), and columns of your own named note or note:WORD
(note:owner, note:waiver), kept with each row in every export.

The corners file: corner, tau, tw or t0, tsu, tcq, one row per named corner; optionally
hours (each corner's share of service time, summing to 1, weighting the fleet figures);
per cell class tau@CLASS, tw@CLASS, t0@CLASS, tsu@CLASS, tcq@CLASS; per clock domain
fclk@DOMAIN and flaunch@DOMAIN. At each corner a row takes what it does not give itself
from its class's columns, else the corner's; its fclk from its domain's column; a
signal's launch clock from flaunch@ (else fclk@) of its launch domain. A row's own tau or
window holds at every corner (the report lists such rows). Without a corners file the
options give one corner, 'given'.
Comma, semicolon or tab separated, # comments, cells in engineering notation; every
problem is reported with its file, line and column.

Rates of independent crossings add. The worst corner is the one with the largest total.
With a budget, the fix plan adds stages where they remove the most FIT per added
flip-flop, one at a time, until every corner is within the budget (rows given by tr are
left alone). --tau-sigma and --tw-sigma are the standard deviations of ln tau and ln tw,
shared by every row, and --tau-tw-corr their correlation (as a fit of both from the same
lab data reports it, corr_ln_tau_ln_tw); the report gives the median and the 95th
percentile of the worst total by quadrature, and the 95th percentile then decides the verdict, the exit status
and the fix plan (--signoff nominal: the nominal total decides instead).

The text report lists the 20 largest crossings at the worst corner (--all-rows: every
one), and each row's warnings as 'latchwise sync' gives them for its own inputs.
--results FILE.csv writes every crossing at every corner: name, notes, corner, log10_fit,
fit, share (of that corner's total), stages, stages_after_fix, flip_flops_added. The JSON
opens with version and input_sha256 (a digest of the arguments and the files' bytes);
its rows carry width, flip_flops, fdata_hz, clock_factor, cell, domain, notes, warnings
and the row at every corner.

Example:
  latchwise budget examples/budget-design.csv --corners examples/budget-corners.csv \\
                   --budget-fit 10 --tau-sigma 0.05
";

    type Case = BudgetCase;
    type Report = BudgetReport;

    fn read(raw: &RawInputs) -> Result<BudgetCase, ParamErrors> {
        BudgetCase::from_inputs(raw)
    }

    fn evaluate(case: &BudgetCase) -> BudgetReport {
        report::evaluate(case)
    }

    fn outcome(report: &BudgetReport) -> Outcome {
        report.outcome()
    }

    fn plots(case: &BudgetCase, report: &BudgetReport) -> Vec<Plot> {
        report::plots(case, report)
    }

    fn figures(case: &BudgetCase, report: &BudgetReport) -> Vec<RowFigures> {
        report::figures(case, report)
    }

    fn results_csv(case: &BudgetCase, report: &BudgetReport) -> Option<String> {
        Some(report::results_csv(case, report))
    }

    fn text_table(report: &BudgetReport, most: Option<usize>) -> Option<TextTable> {
        Some(report::text_table(report, most))
    }

    fn rows_apart<W: RowsApart<BudgetReport>>(report: &mut BudgetReport, w: W) -> W::Out {
        let rows = std::mem::take(&mut report.rows);
        let out = w.apart(report, "rows", &rows);
        report.rows = rows;
        out
    }
}
