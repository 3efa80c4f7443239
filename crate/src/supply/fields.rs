//! The supply calculator's input fields: its two tables, the safety inputs, and the
//! crossing it evaluates at every operating point (the synchronizer's own fields).

pub use crate::crossing::fields::{
    ACTIVITY, CROSSING, FDATA, FLAUNCH, INCREMENTS, STAGES, TARGET_FIT, TARGET_YEARS, TCQ,
    TRANSFERS, TSU,
};
use crate::params::FieldSpec;
use crate::units::Dim;

/// `char`: the characterisation table.
pub const CHAR: FieldSpec = FieldSpec {
    name: "char",
    dim: Dim::Text,
    help: "characterisation table (CSV): vdd, tau, tw or t0, and optionally tsu, tcq, \
           temp, aged (yes/no); one row per characterised point",
    limits: (0.0, 0.0),
    usual: (0.0, 0.0),
};
/// `points`: the operating-point table.
pub const POINTS: FieldSpec = FieldSpec {
    name: "points",
    dim: Dim::Text,
    help: "operating points (CSV): name, vdd, fclk, and optionally temp, residency",
    limits: (0.0, 0.0),
    usual: (0.0, 0.0),
};
/// `ss`: the subthreshold swing at the coldest temperature.
pub const SS: FieldSpec = FieldSpec {
    name: "ss",
    dim: Dim::Voltage,
    help: "subthreshold swing per decade at the coldest temperature, e.g. 80mV (bounds tau \
           below the lowest characterised VDD, and ageing)",
    limits: (1e-3, 1.0),
    usual: (0.055, 0.15),
};
/// `dvt`: the end-of-life threshold shift.
pub const DVT: FieldSpec = FieldSpec {
    name: "dvt",
    dim: Dim::Voltage,
    help: "end-of-life threshold-voltage shift, e.g. 30mV (optional; tau x 10^(dvt/ss))",
    limits: (1e-6, 1.0),
    usual: (1e-3, 0.1),
};
/// `domain`: the clock domain the corners export names.
pub const DOMAIN: FieldSpec = FieldSpec {
    name: "domain",
    dim: Dim::Choice,
    help: "clock domain of the budget design whose clock each exported corner sets \
           (fclk@DOMAIN; optional)",
    limits: (0.0, 0.0),
    usual: (0.0, 0.0),
};

/// The input fields of the supply calculator, in display order.
pub const FIELDS: &[FieldSpec] = &[
    CHAR,
    POINTS,
    SS,
    DVT,
    FDATA,
    CROSSING,
    FLAUNCH,
    ACTIVITY,
    INCREMENTS,
    TRANSFERS,
    STAGES,
    TSU,
    TCQ,
    TARGET_YEARS,
    TARGET_FIT,
    DOMAIN,
];

/// The crossing's fields, passed on to the synchronizer's reader at each point.
pub const CROSSING_FIELDS: &[FieldSpec] = &[
    FDATA,
    CROSSING,
    FLAUNCH,
    ACTIVITY,
    INCREMENTS,
    TRANSFERS,
    STAGES,
    TARGET_YEARS,
    TARGET_FIT,
];
