//! latchwise: metastability sign-off for synchronizers and latched comparators.
//!
//! The core is pure: models, solvers, sweeps and chart layout, with no I/O. Every
//! calculator has the one shape of [`calculator::Calculator`] and is listed once in
//! [`registry`]; the command-line tool (`crate/cli`) and the WebAssembly binding (`wasm`,
//! built only for `wasm32`) are thin adapters that drive any calculator through it.
//!
//! # Examples
//! ```
//! use latchwise::calculator::Calculator;
//! use latchwise::params::RawInputs;
//! use latchwise::synchronizer::SyncCalculator;
//!
//! let raw = RawInputs::from_query("tau=20ps&tw=40ps&fclk=1GHz&fdata=100MHz&stages=2&tsu=30ps&tcq=50ps");
//! let case = SyncCalculator::read(&raw).unwrap();
//! let report = SyncCalculator::evaluate(&case);
//! // tr = 920 ps, tr/tau = 46: MTBF = exp(46) / (100e6 * 1e9 * 40e-12) s, about 7.5e5 years.
//! assert!((report.log10_mtbf_years - 5.876).abs() < 0.001);
//! ```
#![forbid(unsafe_code)]
#![deny(missing_docs)]
#![deny(clippy::print_stdout, clippy::print_stderr)]

#[cfg(feature = "budget")]
pub mod budget;
pub mod calculator;
#[cfg(feature = "fit")]
pub mod characterize;
pub mod chart;
#[cfg(feature = "comparator")]
pub mod comparator;
#[cfg(feature = "converter")]
pub mod converter;
pub mod crossing;
pub mod digest;
pub mod error;
pub mod json_line;
pub mod latch;
pub mod link;
pub mod numeric;
pub mod params;
pub mod quantity;
pub mod readout;
pub mod registry;
pub mod reliability;
#[cfg(feature = "supply")]
pub mod supply;
#[cfg(feature = "sync")]
pub mod synchronizer;
pub mod table;
pub mod units;

#[cfg(target_arch = "wasm32")]
mod wasm;

/// The test suite's one tolerance policy, shared with the unit tests here.
#[cfg(test)]
#[allow(dead_code)]
#[path = "../../tests/tolerance.rs"]
mod tolerance;
