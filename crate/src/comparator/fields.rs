//! The comparator's input fields: one vocabulary for the URL, the CLI options and JSON.

pub use crate::latch::{CL, G0, GAIN, GM, TAU, VMIN};
use crate::params::FieldSpec;
use crate::units::Dim;

/// `treg`: regeneration time available.
pub const TREG: FieldSpec = FieldSpec {
    name: "treg",
    dim: Dim::Time,
    help: "regeneration time available",
    limits: (1e-21, 1e6),
    usual: (1e-12, 1e-6),
};
/// `extra-stages`: latch or flip-flop stages after the comparator (default 0).
pub const EXTRA_STAGES: FieldSpec = FieldSpec {
    name: "extra-stages",
    dim: Dim::Count,
    help: "latch or flip-flop stages after the comparator (default 0)",
    limits: (1.0, 1000.0),
    usual: (1.0, 12.0),
};
/// `stage-time`: resolution time each extra stage adds.
pub const STAGE_TIME: FieldSpec = FieldSpec {
    name: "stage-time",
    dim: Dim::Time,
    help: "resolution time each extra stage adds",
    limits: (1e-21, 1e6),
    usual: (1e-12, 1e-6),
};
/// `input`: input model: uniform, gaussian, nrz, pam4 or sine.
pub const INPUT: FieldSpec = FieldSpec {
    name: "input",
    dim: Dim::Choice,
    help: "input model: uniform, gaussian, nrz, pam4 or sine",
    limits: (0.0, 0.0),
    usual: (0.0, 0.0),
};
/// `lsb`: threshold spacing (uniform, sine).
pub const LSB: FieldSpec = FieldSpec {
    name: "lsb",
    dim: Dim::Voltage,
    help: "threshold spacing (uniform, sine)",
    limits: (1e-21, 1e6),
    usual: (1e-7, 2.0),
};
/// `amp`: signal amplitude: data levels +-amp (nrz, pam4) or sine peak (sine).
pub const AMP: FieldSpec = FieldSpec {
    name: "amp",
    dim: Dim::Voltage,
    help: "signal amplitude: data levels +-amp (nrz, pam4) or sine peak (sine)",
    limits: (1e-21, 1e6),
    usual: (1e-4, 10.0),
};
/// `sigma`: Gaussian deviation (gaussian) or noise (nrz, pam4).
pub const SIGMA: FieldSpec = FieldSpec {
    name: "sigma",
    dim: Dim::Voltage,
    help: "Gaussian deviation (gaussian) or noise (nrz, pam4)",
    limits: (1e-21, 1e6),
    usual: (1e-7, 2.0),
};
/// `mean`: mean input relative to the threshold (gaussian, default 0).
pub const MEAN: FieldSpec = FieldSpec {
    name: "mean",
    dim: Dim::Voltage,
    help: "mean input relative to the threshold (gaussian, default 0)",
    limits: (1e-21, 1e6),
    usual: (1e-7, 10.0),
};
/// `fs`: decisions per second.
pub const FS: FieldSpec = FieldSpec {
    name: "fs",
    dim: Dim::Frequency,
    help: "decisions per second (symbols per second for pam4)",
    limits: (1e-9, 1e18),
    usual: (1e3, 2e11),
};
/// `target-ber`: largest error ratio allowed (optional).
pub const TARGET_BER: FieldSpec = FieldSpec {
    name: "target-ber",
    dim: Dim::Ratio,
    help: "largest error ratio allowed (optional)",
    limits: (1e-300, 1.0),
    usual: (1e-20, 1e-3),
};
/// `vin`: an input whose decision time to report (optional).
pub const VIN: FieldSpec = FieldSpec {
    name: "vin",
    dim: Dim::Voltage,
    help: "an input whose decision time to report (optional)",
    limits: (1e-21, 1e6),
    usual: (1e-12, 10.0),
};
/// The input fields of the comparator calculator, in display order.
pub const FIELDS: &[FieldSpec] = &[
    TAU,
    CL,
    GM,
    G0,
    TREG,
    EXTRA_STAGES,
    STAGE_TIME,
    VMIN,
    GAIN,
    INPUT,
    LSB,
    AMP,
    SIGMA,
    MEAN,
    FS,
    TARGET_BER,
    VIN,
];
