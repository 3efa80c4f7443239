//! The budget's input fields: one vocabulary for the URL, the CLI options and JSON.

use crate::crossing::fields as sync;
use crate::params::FieldSpec;
use crate::units::Dim;

/// The design: one row per crossing.
pub const DESIGN: FieldSpec = FieldSpec {
    name: "design",
    dim: Dim::Text,
    help: "the crossings, CSV, one synchronizer case per row: name, count, width, \
           max_stages, cell, domain, launch_domain, every input of the synchronizer by \
           its name (fclk, fdata or a crossing kind, stages or tr, tau...), note columns",
    limits: (0.0, 0.0),
    usual: (0.0, 0.0),
};
/// The corners: one row per named corner.
pub const CORNERS: FieldSpec = FieldSpec {
    name: "corners",
    dim: Dim::Text,
    help: "the corners, CSV: corner, tau, tw or t0, tsu, tcq, optional hours (shares of \
           service time, summing to 1), tau@CLASS and its kin per cell class, \
           fclk@DOMAIN and flaunch@DOMAIN per clock domain; instead of --tau, --tw ...",
    limits: (0.0, 0.0),
    usual: (0.0, 0.0),
};
/// tau of the one corner given by options: the crossing's field, with its limits.
pub const TAU: FieldSpec = FieldSpec {
    help: "without corners: tau of the one corner 'given'",
    ..sync::TAU
};
/// tw of the one corner given by options.
pub const TW: FieldSpec = FieldSpec {
    help: "without corners: the window tw",
    ..sync::TW
};
/// t0 of the one corner given by options.
pub const T0: FieldSpec = FieldSpec {
    help: "without corners: the window t0 (instead of tw)",
    ..sync::T0
};
/// tsu of the one corner given by options.
pub const TSU: FieldSpec = FieldSpec {
    help: "without corners: setup time",
    ..sync::TSU
};
/// tcq of the one corner given by options.
pub const TCQ: FieldSpec = FieldSpec {
    help: "without corners: clock-to-output delay",
    ..sync::TCQ
};
/// The FIT budget.
pub const BUDGET_FIT: FieldSpec = FieldSpec {
    name: "budget-fit",
    dim: Dim::Ratio,
    help: "the chip's FIT budget for these crossings (optional)",
    limits: (1e-300, 1e300),
    usual: (1e-6, 1e4),
};
/// Devices in the field: the crossing's own fleet field.
pub const DEVICES: FieldSpec = sync::DEVICES;
/// Operating years per device.
pub const SERVICE_YEARS: FieldSpec = sync::SERVICE_YEARS;
/// Systematic uncertainty of tau.
pub const TAU_SIGMA: FieldSpec = FieldSpec {
    name: "tau-sigma",
    dim: Dim::Ratio,
    help: "standard deviation of ln(tau), shared by every row (optional)",
    limits: (1e-9, 2.0),
    usual: (0.005, 0.3),
};
/// Systematic uncertainty of the window.
pub const TW_SIGMA: FieldSpec = FieldSpec {
    name: "tw-sigma",
    dim: Dim::Ratio,
    help: "standard deviation of ln(tw), shared by every row (optional)",
    limits: (1e-9, 5.0),
    usual: (0.01, 1.0),
};

/// Correlation of ln tau and ln tw.
pub const TAU_TW_CORR: FieldSpec = FieldSpec {
    name: "tau-tw-corr",
    dim: Dim::Ratio,
    help: "correlation of ln(tau) and ln(tw), above -1 and below 1 (a fit of both from \
           the same lab data reports it; optional, 0 by default)",
    limits: (1e-12, 1.0),
    usual: (1e-3, 0.99),
};

/// Which statistic of the worst total decides the verdict.
pub const SIGNOFF: FieldSpec = FieldSpec {
    name: "signoff",
    dim: Dim::Choice,
    help: "the figure the verdict, exit status and fix plan use: p95 (the 95th percentile \
           under the sigmas; the default when a sigma is given) or nominal",
    limits: (0.0, 0.0),
    usual: (0.0, 0.0),
};

/// The input fields of the budget, in display order.
pub const FIELDS: &[FieldSpec] = &[
    DESIGN,
    CORNERS,
    TAU,
    TW,
    T0,
    TSU,
    TCQ,
    BUDGET_FIT,
    DEVICES,
    SERVICE_YEARS,
    TAU_SIGMA,
    TW_SIGMA,
    TAU_TW_CORR,
    SIGNOFF,
];
