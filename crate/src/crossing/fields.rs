//! The synchronizer's input fields: one vocabulary for the URL, the CLI options and JSON.

use crate::params::FieldSpec;
use crate::units::Dim;

/// Regeneration time constant.
pub const TAU: FieldSpec = FieldSpec {
    name: "tau",
    dim: Dim::Time,
    help: "regeneration time constant; or one per hop, comma-separated (14ps,22ps)",
    limits: (1e-21, 1e6),
    usual: (3e-13, 1e-9),
};
/// Metastability window referred to tcq.
pub const TW: FieldSpec = FieldSpec {
    name: "tw",
    dim: Dim::Time,
    help: "metastability window, referred to tcq (give tw or t0)",
    limits: (1e-21, 1e6),
    usual: (1e-14, 1e6),
};
/// Metastability window counted from the clock edge.
pub const T0: FieldSpec = FieldSpec {
    name: "t0",
    dim: Dim::Time,
    help: "metastability window counted from the clock edge (instead of tw)",
    limits: (1e-21, 1e6),
    usual: (1e-15, 1e3),
};
/// Sampling clock.
pub const FCLK: FieldSpec = FieldSpec {
    name: "fclk",
    dim: Dim::Frequency,
    help: "sampling (receiving) clock frequency",
    limits: (1e-9, 1e18),
    usual: (1e3, 2e11),
};
/// Data transition rate.
pub const FDATA: FieldSpec = FieldSpec {
    name: "fdata",
    dim: Dim::Frequency,
    help: "data transition rate (edges per second)",
    limits: (1e-9, 1e18),
    usual: (1e-3, 2e11),
};
/// Flip-flops in the chain.
pub const STAGES: FieldSpec = FieldSpec {
    name: "stages",
    dim: Dim::Count,
    help: "flip-flops in the synchronizer chain (1 to 1000)",
    limits: (1.0, 1000.0),
    usual: (1.0, 12.0),
};
/// Setup time of the next flip-flop.
pub const TSU: FieldSpec = FieldSpec {
    name: "tsu",
    dim: Dim::Time,
    help: "setup time of the next flip-flop",
    limits: (1e-21, 1e6),
    usual: (1e-13, 1e-8),
};
/// Nominal clock-to-output delay.
pub const TCQ: FieldSpec = FieldSpec {
    name: "tcq",
    dim: Dim::Time,
    help: "nominal clock-to-output delay (not used with t0)",
    limits: (1e-21, 1e6),
    usual: (1e-13, 1e-8),
};
/// Explicit resolution time.
pub const TR: FieldSpec = FieldSpec {
    name: "tr",
    dim: Dim::Time,
    help: "explicit resolution time (overrides stages, tsu, tcq)",
    limits: (1e-21, 1e6),
    usual: (1e-12, 1e-5),
};
/// The longest resolution time the characterisation covered.
pub const TR_MAX: FieldSpec = FieldSpec {
    name: "tr-max",
    dim: Dim::Time,
    help: "the longest resolution time in the lab data behind tau (optional): a longer \
           one extrapolates the exponential, and the report says by how much",
    limits: (1e-21, 1e6),
    usual: (1e-12, 1e-5),
};
/// MTBF target in years.
pub const TARGET_YEARS: FieldSpec = FieldSpec {
    name: "target-years",
    dim: Dim::Ratio,
    help: "required MTBF in years (optional)",
    limits: (1e-12, 1e300),
    usual: (1e-3, 1e15),
};
/// FIT target.
pub const TARGET_FIT: FieldSpec = FieldSpec {
    name: "target-fit",
    dim: Dim::Ratio,
    help: "allowed FIT (optional, instead of target-years)",
    limits: (1e-300, 1e300),
    usual: (1e-9, 1e5),
};
/// Devices in the field.
pub const DEVICES: FieldSpec = FieldSpec {
    name: "devices",
    dim: Dim::Count,
    help: "devices in the field, for fleet figures (optional)",
    limits: (1.0, 1e12),
    usual: (1.0, 1e11),
};
/// Operating years per device.
pub const SERVICE_YEARS: FieldSpec = FieldSpec {
    name: "service-years",
    dim: Dim::Ratio,
    help: "operating years per device, for fleet figures (optional)",
    limits: (1e-6, 1e4),
    usual: (0.01, 100.0),
};

/// Master latch time constant of a master-slave flip-flop.
pub const TAU_MASTER: FieldSpec = FieldSpec {
    name: "tau-master",
    dim: Dim::Time,
    help: "master latch tau, with tau-slave instead of tau (master-slave chain)",
    limits: (1e-21, 1e6),
    usual: (3e-13, 1e-9),
};
/// Slave latch time constant of a master-slave flip-flop.
pub const TAU_SLAVE: FieldSpec = FieldSpec {
    name: "tau-slave",
    dim: Dim::Time,
    help: "slave latch tau (master-slave chain)",
    limits: (1e-21, 1e6),
    usual: (3e-13, 1e-9),
};
/// Fraction of the period the clock is high.
pub const DUTY: FieldSpec = FieldSpec {
    name: "duty",
    dim: Dim::Ratio,
    help: "fraction of the period the clock is high (master-slave chain, default 0.5)",
    limits: (1e-6, 1.0),
    usual: (0.2, 0.8),
};
/// The window of a two-flip-flop chain.
pub const TW2: FieldSpec = FieldSpec {
    name: "tw2",
    dim: Dim::Time,
    help: "window characterised on a two-flip-flop chain (master-slave bound)",
    limits: (1e-21, 1e6),
    usual: (1e-14, 1e6),
};
/// Launch over sampling frequency, for related clocks.
pub const RATIO: FieldSpec = FieldSpec {
    name: "ratio",
    dim: Dim::Choice,
    help: "related clocks: launch over sampling frequency as P/Q, e.g. 4/5",
    limits: (0.0, 0.0),
    usual: (0.0, 0.0),
};
/// rms of the relative edge jitter of related clocks.
pub const JITTER: FieldSpec = FieldSpec {
    name: "jitter",
    dim: Dim::Time,
    help: "related clocks: rms of the relative edge jitter",
    limits: (1e-21, 1e6),
    usual: (1e-13, 1e-9),
};
/// Static phase of the edge lattice.
pub const PHASE: FieldSpec = FieldSpec {
    name: "phase",
    dim: Dim::Time,
    help: "related clocks: offset of the edges from the sampling edge, below one lattice \
           spacing 1/(P fclk) (default: the worst)",
    limits: (1e-21, 1e6),
    usual: (1e-15, 1e-6),
};
/// What kind of crossing the data rate describes.
pub const CROSSING: FieldSpec = FieldSpec {
    name: "crossing",
    dim: Dim::Choice,
    help: "how the data rate is given: data (fdata), signal, gray or handshake",
    limits: (0.0, 0.0),
    usual: (0.0, 0.0),
};
/// Launch clock of a toggling signal.
pub const FLAUNCH: FieldSpec = FieldSpec {
    name: "flaunch",
    dim: Dim::Frequency,
    help: "crossing=signal: the launching clock",
    limits: (1e-9, 1e18),
    usual: (1e3, 2e11),
};
/// Toggle activity of a signal.
pub const ACTIVITY: FieldSpec = FieldSpec {
    name: "activity",
    dim: Dim::Ratio,
    help: "crossing=signal: toggles per launch clock cycle, 0 to 1",
    limits: (1e-12, 1.0),
    usual: (1e-6, 1.0),
};
/// Increments per second of a Gray-coded pointer.
pub const INCREMENTS: FieldSpec = FieldSpec {
    name: "increments",
    dim: Dim::Frequency,
    help: "crossing=gray: pointer increments per second (the whole pointer)",
    limits: (1e-9, 1e18),
    usual: (1e-3, 2e11),
};
/// Transfers per second of a four-phase handshake.
pub const TRANSFERS: FieldSpec = FieldSpec {
    name: "transfers",
    dim: Dim::Frequency,
    help: "crossing=handshake: transfers per second (each signal toggles twice per transfer)",
    limits: (1e-9, 1e18),
    usual: (1e-3, 2e11),
};

/// The input fields of the synchronizer calculator, in display order.
pub const FIELDS: &[FieldSpec] = &[
    TAU,
    TW,
    T0,
    FCLK,
    FDATA,
    STAGES,
    TSU,
    TCQ,
    TR,
    TARGET_YEARS,
    TARGET_FIT,
    DEVICES,
    SERVICE_YEARS,
    TAU_MASTER,
    TAU_SLAVE,
    DUTY,
    TW2,
    TR_MAX,
    RATIO,
    JITTER,
    PHASE,
    CROSSING,
    FLAUNCH,
    ACTIVITY,
    INCREMENTS,
    TRANSFERS,
];
