//! The SAR converter's input fields: one vocabulary for the URL, the CLI options and JSON.
//! The latch's own fields (tau or its devices, vmin, gain) are the comparator's.

pub use crate::latch::{CL, G0, GAIN, GM, TAU, VMIN};
use crate::params::FieldSpec;
use crate::units::Dim;

/// `bits`: the converter's resolution B.
pub const BITS: FieldSpec = FieldSpec {
    name: "bits",
    dim: Dim::Count,
    help: "resolution B in bits (1 to 16)",
    limits: (1.0, 16.0),
    usual: (4.0, 16.0),
};
/// `timing`: how the decisions are timed.
pub const TIMING: FieldSpec = FieldSpec {
    name: "timing",
    dim: Dim::Choice,
    help: "sync (a clock period per bit) or async (one budget shared by all decisions)",
    limits: (0.0, 0.0),
    usual: (0.0, 0.0),
};
/// `vfs`: the full scale.
pub const VFS: FieldSpec = FieldSpec {
    name: "vfs",
    dim: Dim::Voltage,
    help: "full-scale input range, at the comparator's input",
    limits: (1e-12, 1e4),
    usual: (1e-3, 10.0),
};
/// `fs`: conversions per second.
pub const FS: FieldSpec = FieldSpec {
    name: "fs",
    dim: Dim::Frequency,
    help: "sample rate (conversions per second)",
    limits: (1e-9, 1e13),
    usual: (1e3, 2e10),
};
/// `tbit`: regeneration time per bit (sync).
pub const TBIT: FieldSpec = FieldSpec {
    name: "tbit",
    dim: Dim::Time,
    help: "regeneration time each decision gets (sync)",
    limits: (1e-21, 1e3),
    usual: (1e-12, 1e-6),
};
/// `consume`: how a late decision is used (sync).
pub const CONSUME: FieldSpec = FieldSpec {
    name: "consume",
    dim: Dim::Choice,
    help: "benign (one capture latch feeds the DAC and the register) or hard (they can disagree) (sync)",
    limits: (0.0, 0.0),
    usual: (0.0, 0.0),
};
/// `tconv`: the time for all decisions of a conversion (async).
pub const TCONV: FieldSpec = FieldSpec {
    name: "tconv",
    dim: Dim::Time,
    help: "conversion time available for the decisions (async)",
    limits: (1e-21, 1e3),
    usual: (1e-11, 1e-4),
};
/// `tfix`: the fixed time each step takes besides its decision (async).
pub const TFIX: FieldSpec = FieldSpec {
    name: "tfix",
    dim: Dim::Time,
    help: "fixed time per bit besides the decision: DAC settling, logic (async)",
    limits: (0.0, 1e3),
    usual: (1e-12, 1e-6),
};
/// `fill`: what a timed-out conversion writes (async).
pub const FILL: FieldSpec = FieldSpec {
    name: "fill",
    dim: Dim::Choice,
    help: "reset (the timed-out bit and the rest stay 0) or midpoint (it is set to 1, the rest 0) (async)",
    limits: (0.0, 0.0),
    usual: (0.0, 0.0),
};
/// `sigma-n`: comparator noise, input-referred (optional).
pub const SIGMA_N: FieldSpec = FieldSpec {
    name: "sigma-n",
    dim: Dim::Voltage,
    help: "comparator noise, input-referred rms (optional: a parked input)",
    limits: (1e-21, 1e4),
    usual: (1e-7, 1e-1),
};
/// `static`: a parked input's code (optional, with sigma-n).
pub const STATIC: FieldSpec = FieldSpec {
    name: "static",
    dim: Dim::Count,
    help: "a parked (DC) input at this threshold code, 1 to 2^B - 1 (with sigma-n)",
    limits: (1.0, 65535.0),
    usual: (1.0, 65535.0),
};
/// `margin-lsb`: the error size that counts (optional).
pub const MARGIN_LSB: FieldSpec = FieldSpec {
    name: "margin-lsb",
    dim: Dim::Count,
    help: "code errors of at least this many LSB count (a receiver's decision margin; default 1)",
    limits: (1.0, 32768.0),
    usual: (1.0, 32768.0),
};
/// `target-ber`: largest rate of counted errors per conversion (optional).
pub const TARGET_BER: FieldSpec = FieldSpec {
    name: "target-ber",
    dim: Dim::Ratio,
    help: "largest rate of counted code errors per conversion (optional)",
    limits: (1e-300, 1.0),
    usual: (1e-20, 1e-3),
};
/// `target-fit`: largest rate of counted errors in FIT (optional).
pub const TARGET_FIT: FieldSpec = FieldSpec {
    name: "target-fit",
    dim: Dim::Ratio,
    help: "largest rate of counted code errors in FIT, per 1e9 hours (optional, instead of target-ber)",
    limits: (1e-300, 1e300),
    usual: (1e-9, 1e5),
};

/// The input fields of the converter calculator, in display order.
pub const FIELDS: &[FieldSpec] = &[
    BITS, TIMING, TAU, CL, GM, G0, VMIN, GAIN, VFS, FS, TBIT, CONSUME, TCONV, TFIX, FILL, SIGMA_N,
    STATIC, MARGIN_LSB, TARGET_BER, TARGET_FIT,
];
