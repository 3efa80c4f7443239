//! The fit's input fields: one vocabulary for the URL, the CLI options and JSON.

use crate::params::FieldSpec;
use crate::units::Dim;

/// Which experiment the data come from.
pub const KIND: FieldSpec = FieldSpec {
    name: "kind",
    dim: Dim::Choice,
    help: "the experiment: counts, delay or comparator",
    limits: (0.0, 0.0),
    usual: (0.0, 0.0),
};
/// The data, as CSV with a header row.
pub const DATA: FieldSpec = FieldSpec {
    name: "data",
    dim: Dim::Text,
    help: "the data: CSV with a header row (counts: tr, failures, duration; delay: offset, \
           delay; comparator: vin, time)",
    limits: (0.0, 0.0),
    usual: (0.0, 0.0),
};
/// The sampling clock of a counting experiment.
pub const FCLK: FieldSpec = FieldSpec {
    name: "fclk",
    dim: Dim::Frequency,
    help: "counts: the sampling clock",
    limits: (1e-9, 1e18),
    usual: (1e3, 2e11),
};
/// The data edge rate of a counting experiment.
pub const FDATA: FieldSpec = FieldSpec {
    name: "fdata",
    dim: Dim::Frequency,
    help: "counts: the data transition rate (edges per second)",
    limits: (1e-9, 1e18),
    usual: (1e-3, 2e11),
};
/// Where the resolution time of a counting experiment is counted from.
pub const WINDOW: FieldSpec = FieldSpec {
    name: "window",
    dim: Dim::Choice,
    help: "counts: tw (tr beyond the nominal clock-to-output delay, default) or t0 (tr from \
           the clock edge)",
    limits: (0.0, 0.0),
    usual: (0.0, 0.0),
};
/// The nominal clock-to-output delay of a delay sweep.
pub const TCQ: FieldSpec = FieldSpec {
    name: "tcq",
    dim: Dim::Time,
    help:
        "delay: the nominal clock-to-output delay (default: the delay far from the balance point)",
    limits: (1e-21, 1e6),
    usual: (1e-13, 1e-8),
};

/// How a delay sweep is fitted.
pub const METHOD: FieldSpec = FieldSpec {
    name: "method",
    dim: Dim::Choice,
    help: "delay: coth (the whole sweep, tcq + tau ln coth(|offset - m| / (tw/2)), the \
           default) or log (the log law over the regenerative region only)",
    limits: (0.0, 0.0),
    usual: (0.0, 0.0),
};
/// The resolution time the pessimistic link looks at.
pub const WORST_AT: FieldSpec = FieldSpec {
    name: "worst-at",
    dim: Dim::Time,
    help: "the resolution time at which the joint 95 % region's worst point is taken for \
           the pessimistic link (default: the longest tr the data characterise, tr_max; give the design's)",
    limits: (1e-21, 1e6),
    usual: (1e-12, 1e-5),
};
/// The name the fit takes as a budget corner.
pub const CORNER: FieldSpec = FieldSpec {
    name: "corner",
    dim: Dim::Choice,
    help: "the name of the fit as a budget corner (default lab); on the command line, \
           --corner NAME prints the fit as a corners CSV row with its header instead of \
           the report",
    limits: (0.0, 0.0),
    usual: (0.0, 0.0),
};

/// The input fields of the fit, in display order.
pub const FIELDS: &[FieldSpec] = &[
    KIND, DATA, FCLK, FDATA, WINDOW, TCQ, METHOD, WORST_AT, CORNER,
];
