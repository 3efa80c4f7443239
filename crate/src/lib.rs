//! latchwise: metastability sign-off for synchronizers and latched comparators.
//!
//! The core is pure: models, solvers, sweeps and chart layout, with no I/O. The
//! command-line tool (`crate/cli`) and the WebAssembly binding (`wasm`, built only for
//! `wasm32`) are thin adapters that turn text into typed inputs and format results.
#![forbid(unsafe_code)]
#![deny(missing_docs)]
#![deny(clippy::print_stdout, clippy::print_stderr)]

pub mod chart;
pub mod comparator;
pub mod error;
pub mod normal;
pub mod params;
pub mod quantity;
pub mod readout;
pub mod sweep;
pub mod synchronizer;

#[cfg(target_arch = "wasm32")]
mod wasm;
