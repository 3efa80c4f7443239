//! The regenerating latch that the comparator and the SAR converter share: its input
//! fields (tau or the devices that give it, the decision level and the gain), where tau
//! came from, and the one reading of tau from those fields.

use serde::Serialize;

use crate::error::{ParamError, ParamErrorKind};
use crate::params::{FieldReader, FieldSpec};
use crate::quantity::{Capacitance, Conductance, Time};
use crate::units::Dim;

/// `tau`: regeneration time constant (or give cl, gm, g0).
pub const TAU: FieldSpec = FieldSpec {
    name: "tau",
    dim: Dim::Time,
    help: "regeneration time constant (or give cl, gm, g0)",
    limits: (1e-21, 1e6),
    usual: (3e-13, 1e-9),
};
/// `cl`: capacitance on each regenerating node.
pub const CL: FieldSpec = FieldSpec {
    name: "cl",
    dim: Dim::Capacitance,
    help: "capacitance on each regenerating node",
    limits: (1e-24, 1.0),
    usual: (1e-17, 1e-11),
};
/// `gm`: transconductance of the cross-coupled pair (gmn + gmp).
pub const GM: FieldSpec = FieldSpec {
    name: "gm",
    dim: Dim::Conductance,
    help: "transconductance of the cross-coupled pair (gmn + gmp)",
    limits: (1e-18, 1e6),
    usual: (1e-6, 1.0),
};
/// `g0`: total positive conductance on the node.
pub const G0: FieldSpec = FieldSpec {
    name: "g0",
    dim: Dim::Conductance,
    help: "total positive conductance on the node",
    limits: (1e-18, 1e6),
    usual: (1e-9, 1.0),
};
/// `vmin`: output difference that counts as a decision.
pub const VMIN: FieldSpec = FieldSpec {
    name: "vmin",
    dim: Dim::Voltage,
    help: "output difference that counts as a decision",
    limits: (1e-21, 1e6),
    usual: (1e-4, 10.0),
};
/// `gain`: preamplifier gain before the latch (1 for a bare latch).
pub const GAIN: FieldSpec = FieldSpec {
    name: "gain",
    dim: Dim::Ratio,
    help: "preamplifier gain before the latch (1 for a bare latch)",
    limits: (1e-6, 1e9),
    usual: (0.5, 1e4),
};

/// Where tau came from.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
#[serde(tag = "source", rename_all = "lowercase")]
pub enum TauSource {
    /// Given directly.
    Given,
    /// Computed as `cl / (gm - g0)`.
    Devices {
        /// Node capacitance, F.
        cl: f64,
        /// Transconductance, S.
        gm: f64,
        /// Node conductance, S.
        g0: f64,
    },
}

/// Regeneration time constant of a cross-coupled latch.
///
/// # Formula
/// `tau = C / (gm - G0)`
///
/// # Errors
/// `NotRegenerative` (on field `gm`) when `gm <= g0`.
///
/// # Examples
/// ```
/// use latchwise::latch::tau_from_devices;
/// let tau = tau_from_devices(10e-15, 1e-3, 0.2e-3).unwrap();
/// assert!((tau - 12.5e-12).abs() < 1e-24);
/// assert!(tau_from_devices(10e-15, 1e-3, 1e-3).is_err());
/// ```
///
/// # References
/// Razavi, "Design of Analog CMOS Integrated Circuits", comparator chapter (recalled).
pub fn tau_from_devices(cl: f64, gm: f64, g0: f64) -> Result<f64, ParamError> {
    if gm <= g0 {
        return Err(ParamError::new(
            GM.name,
            ParamErrorKind::NotRegenerative { gm, g0 },
        ));
    }
    Ok(cl / (gm - g0))
}

/// Reads tau, given as `tau` or by the devices `cl`, `gm` and `g0` (not both), recording
/// every error on `r`. A device tau outside tau's own limits is refused on `cl`.
pub fn read_tau(r: &mut FieldReader) -> Option<(Time, TauSource)> {
    let devices = [&CL, &GM, &G0].into_iter().any(|f| r.has(f));
    let (tau, source) = if r.has(&TAU) && devices {
        r.push(ParamError::new(
            TAU.name,
            ParamErrorKind::Conflict("cl, gm, g0"),
        ));
        return None;
    } else if devices {
        let cl = r.required(&CL, Capacitance::positive);
        let gm = r.required(&GM, Conductance::positive);
        let g0 = r.required(&G0, Conductance::non_negative);
        let (cl, gm, g0) = (cl?.get(), gm?.get(), g0?.get());
        match tau_from_devices(cl, gm, g0) {
            Ok(t) => (t, TauSource::Devices { cl, gm, g0 }),
            Err(e) => {
                r.push(e);
                return None;
            }
        }
    } else {
        return r
            .required(&TAU, Time::positive)
            .map(|t| (t, TauSource::Given));
    };
    let usable = tau >= TAU.limits.0 && tau <= TAU.limits.1;
    match (Time::positive(TAU.name, tau), usable) {
        (Ok(t), true) => Some((t, source)),
        _ => {
            // cl / (gm - g0) overflowed or underflowed: say so on the inputs.
            r.push(ParamError::new(
                CL.name,
                ParamErrorKind::OutOfRange {
                    value: tau,
                    range: "giving a tau from 1e-21 s to 1e6 s",
                },
            ));
            None
        }
    }
}
