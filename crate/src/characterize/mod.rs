//! Characterisation: tau and the metastability window extracted from the engineer's own
//! data, with honest intervals, ready to carry into the calculators.
//!
//! `fields` names the inputs, `input` reads the experiment and its table, `counts`,
//! `delay` and `decision` fit the three experiments (`line` is their least squares), and
//! `report` gives the estimates, readouts, links and plots.

pub mod counts;
pub mod decision;
pub mod delay;
pub mod fields;
pub mod input;
pub mod line;
pub mod report;

use crate::calculator::{Calculator, Outcome};
use crate::chart::Plot;
use crate::error::{ParamError, ParamErrorKind, ParamErrors};
use crate::params::{FieldSpec, RawInputs};

pub use fields::FIELDS;
pub use input::FitCase;
pub use report::{evaluate, Fit, FitReport, Fitted};

/// The fitting calculator (`latchwise fit`, `characterize.html`).
pub struct FitCalculator;

/// The corner name, if given: a word a corners table can hold (no comma, quote or line
/// break; at most 40 characters).
fn read_corner(raw: &RawInputs) -> Result<Option<String>, ParamError> {
    let Some(text) = raw.get_nonblank(fields::CORNER.name).map(str::trim) else {
        return Ok(None);
    };
    if text.chars().count() > 40 || text.contains([',', ';', '"', '\t', '\n', '\r', '#']) {
        return Err(ParamError::new(
            fields::CORNER.name,
            ParamErrorKind::Unfittable(format!(
                "'{}' cannot name a corner: use at most 40 characters, without , ; # \" or \
                 line breaks",
                crate::error::short(text)
            )),
        ));
    }
    Ok(Some(text.to_string()))
}

/// Runs the fit a case asks for.
///
/// # Errors
/// An `Unfittable` error on the `data` field, saying why the data cannot give the fit.
pub fn fit(case: FitCase) -> Result<Fitted, ParamError> {
    fit_named(case, None)
}

/// As [`fit`], the result to be named `corner` as a budget corner.
///
/// # Errors
/// As [`fit`].
pub fn fit_named(case: FitCase, corner: Option<String>) -> Result<Fitted, ParamError> {
    let fit = match &case {
        FitCase::Counts {
            counts,
            fclk,
            fdata,
            ..
        } => counts::fit(counts, fclk.get(), fdata.get())
            .map(Fit::Counts)
            .map_err(|p| p.message()),
        FitCase::Delay {
            offset,
            delay,
            tcq,
            log_law,
            ..
        } => if *log_law {
            delay::fit_log(offset, delay, tcq.map(|t| t.get()))
        } else {
            delay::fit_coth(offset, delay, tcq.map(|t| t.get()))
        }
        .map(Fit::Delay),
        FitCase::Comparator { vin, time, .. } => decision::fit(vin, time).map(Fit::Comparator),
    };
    match fit {
        Ok(fit) => Ok(Fitted {
            case,
            fit,
            corner,
            worst_at: None,
        }),
        Err(why) => Err(ParamError::new(
            fields::DATA.name,
            ParamErrorKind::Unfittable(why),
        )),
    }
}

impl Calculator for FitCalculator {
    const NAME: &'static str = "fit";
    const TITLE: &'static str = "Characterise: tau and the window from data";
    const SUMMARY: &'static str = "tau and the window from counts, delay or comparator sweeps";
    const PAGE: &'static str = "characterize.html";
    const FIELDS: &'static [FieldSpec] = FIELDS;
    const OPERANDS: &'static [&'static str] = &["kind", "data"];
    const HELP: &'static str = "\
Usage: latchwise fit counts FILE --fclk F --fdata F [--window tw|t0] [--corner NAME]
       latchwise fit delay FILE [--tcq T] [--method coth|log] [--corner NAME]
       latchwise fit comparator FILE
       (FILE is a CSV with a header row; - reads standard input)

Experiments:
  counts      columns tr, failures, duration: failures counted at several resolution
              times; Poisson maximum likelihood of mu = duration fclk fdata w exp(-tr/tau),
              zero counts used as they are, 95 % profile-likelihood intervals, the joint
              uncertainty (sd_ln_tau, sd_ln_tw, corr_ln_tau_ln_tw, for the budget's
              --tau-sigma, --tw-sigma, --tau-tw-corr), deviance and its p-value.
              --window t0 when tr counts from the clock edge. Durations take s, min,
              h or d.
  delay       columns offset, delay: a simulated sweep of data-to-clock offset against
              clock-to-output delay; fits the whole sweep to tcq + tau ln(1 + k /
              (exp(k |offset - m| / ds) - 1)), tw = 2 ds (k = 2: ln coth), tcq too unless
              --tcq is given; --method log fits the log law over the regenerative region
              and reports the local slope's drift. Window convention: the extra delay
              near the balance point is tau ln(tw / (2 |offset - m|)); a flow without the
              2 has w = tw/2. --worst-at T sets the tr of the pessimistic link's point.
  comparator  columns vin, time: decision time against input; least squares of
              time = tau ln(v0/vin), v0 = vmin/gain, with Student-t intervals.

Cells take engineering notation with units (1.2ns, 40 mV); # lines are comments; comma,
semicolon or tab separated. Every problem is reported with its line and column.

tr_max_s is the longest resolution time the data cover: beyond it the exponential is
extrapolated (the synchronizer's --tr-max and a corner's tr_max say by how much).
--corner NAME prints the fit as a corners CSV row with its header (corner, tau, tw or
t0, tr_max) instead of the report, to append to a budget's corners file.

Example:
  latchwise fit counts lab-counts.csv --fclk 1GHz --fdata 100MHz
";

    type Case = Fitted;
    type Report = FitReport;

    fn read(raw: &RawInputs) -> Result<Fitted, ParamErrors> {
        let corner = read_corner(raw);
        let case = FitCase::from_inputs(raw);
        match (case, corner) {
            (Ok(case), Ok(corner)) => {
                let mut r = crate::params::FieldReader::new(raw);
                let worst_at = r.optional(&fields::WORST_AT, crate::quantity::Time::positive);
                if r.has_errors() {
                    return Err(r.into_errors());
                }
                let worst_at = worst_at.map(crate::quantity::Time::get);
                let mut f = fit_named(case, corner).map_err(|e| ParamErrors(vec![e]))?;
                f.worst_at = worst_at;
                Ok(f)
            }
            (Err(mut e), Err(c)) => {
                e.0.push(c);
                Err(e)
            }
            (Err(e), _) => Err(e),
            (_, Err(c)) => Err(ParamErrors(vec![c])),
        }
    }

    fn replaces_text_report(report: &FitReport) -> Option<String> {
        report.corner_csv.clone()
    }

    fn evaluate(case: &Fitted) -> FitReport {
        report::evaluate(case)
    }

    fn outcome(report: &FitReport) -> Outcome {
        report.outcome()
    }

    fn plots(case: &Fitted, _report: &Self::Report) -> Vec<Plot> {
        report::plots(case)
    }
}
