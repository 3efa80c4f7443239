//! The synchronizer's input fields: one vocabulary for the URL, the CLI options and JSON.

use crate::params::FieldSpec;
use crate::units::Dim;

/// Regeneration time constant.
pub const TAU: FieldSpec = FieldSpec {
    name: "tau",
    dim: Dim::Time,
    help: "regeneration time constant",
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
];
