//! What every reliability figure shares: the year and FIT units, targets, fleet
//! statistics and the standing caution. Calculators build on this; it knows none of them.

use serde::Serialize;

use crate::readout::Readout;
use crate::units::format_log10;

/// Days per year used throughout: the Julian year.
pub const YEAR_DAYS: f64 = 365.25;
/// Seconds per year used throughout: the Julian year of 365.25 days.
pub const YEAR_S: f64 = YEAR_DAYS * 86400.0;
/// Device-hours in the FIT unit (1e9) times seconds per hour: FIT = rate * 3.6e12.
pub const FIT_PER_RATE: f64 = 3.6e12;

/// The caution shown with every result (domain notes, section 6).
pub const CAUTION: &str = "Results are first-order estimates. tau and tw depend on process, \
voltage, temperature and ageing; use characterised worst-corner values, keep margin, and \
follow the sign-off rules of your design organisation and any functional-safety standard \
that applies.";

/// A reliability target, held as the largest allowed failure rate.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
#[serde(tag = "kind", content = "value", rename_all = "snake_case")]
pub enum Target {
    /// MTBF of at least this many years.
    MtbfYears(f64),
    /// At most this many FIT.
    Fit(f64),
}

impl Target {
    /// log10 of the largest failure rate (per second) that meets the target.
    pub fn log10_max_rate(self) -> f64 {
        match self {
            Target::MtbfYears(y) => -(y.log10() + YEAR_S.log10()),
            Target::Fit(f) => f.log10() - FIT_PER_RATE.log10(),
        }
    }

    /// The target as log10 MTBF in years.
    pub fn log10_mtbf_years(self) -> f64 {
        -self.log10_max_rate() - YEAR_S.log10()
    }
}

/// A fleet of devices each carrying the circuit.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct Fleet {
    /// Number of devices.
    pub devices: u64,
    /// Operating years of each device.
    pub years: f64,
}

/// Expected failures and the probability of at least one, for a fleet.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct FleetOutcome {
    /// log10 of the expected number of failures over the fleet's service.
    pub log10_expected_failures: f64,
    /// log10 of the probability of at least one failure (at most 0).
    pub log10_p_any_failure: f64,
}

impl FleetOutcome {
    /// The fleet figures as readouts, as every calculator with a fleet shows them.
    pub fn readouts(&self) -> [Readout; 2] {
        [
            Readout::new(
                "log10_expected_failures",
                "expected failures in the fleet",
                format_log10(self.log10_expected_failures, 3),
                Some(self.log10_expected_failures),
            ),
            Readout::new(
                "log10_p_any_failure",
                "probability of at least one",
                format_log10(self.log10_p_any_failure, 3),
                Some(self.log10_p_any_failure),
            ),
        ]
    }
}

/// Fleet statistics for a failure rate `10^log10_rate` per second per device.
///
/// # Formula
/// `m = rate * units * years * YEAR_S`; `P(at least one) = 1 - exp(-m)` (Poisson).
pub fn fleet_outcome(log10_rate: f64, fleet: Fleet) -> FleetOutcome {
    let log10_m =
        log10_rate + (fleet.devices as f64).log10() + fleet.years.log10() + YEAR_S.log10();
    FleetOutcome {
        log10_expected_failures: log10_m,
        log10_p_any_failure: log10_one_minus_exp_neg(log10_m),
    }
}

/// log10(1 - exp(-m)) given log10 m, accurate for m from 1e-300000 to 1e300000.
pub fn log10_one_minus_exp_neg(log10_m: f64) -> f64 {
    if log10_m < -300.0 {
        // 1 - exp(-m) = m (1 - m/2 + ...) and m/2 is far below f64 resolution.
        log10_m
    } else if log10_m > 3.0 {
        // exp(-m) < 1e-434: the probability is 1 to f64 precision.
        0.0
    } else {
        (-(-(10f64.powf(log10_m))).exp_m1()).log10()
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::tolerance::{assert_rel, F64_REL};

    #[test]
    fn fleet_probability_limits() {
        assert_eq!(log10_one_minus_exp_neg(-400.0), -400.0);
        assert_eq!(log10_one_minus_exp_neg(5.0), 0.0);
        let m: f64 = 1e-3;
        let want = (1.0 - (-m).exp()).log10();
        assert_rel(
            "m = 1e-3",
            log10_one_minus_exp_neg(m.log10()),
            want,
            F64_REL,
        );
    }
}
