//! Exponentials in bulk: the passes of a likelihood over many rows.

/// `2^(j/16)`, j = 0..15, each the nearest double (from mpmath at 200 bits:
/// `float(mpmath.power(2, mpmath.mpf(j)/16))`).
const TWO_TO_J16: [f64; 16] = [
    1.0,
    1.044_273_782_427_413_8,
    1.090_507_732_665_257_7,
    1.138_788_634_756_691_6,
    1.189_207_115_002_721,
    1.241_857_812_073_484,
    1.296_839_554_651_009_6,
    1.354_255_546_936_892_7,
    std::f64::consts::SQRT_2,
    1.476_826_145_939_499_3,
    1.542_210_825_407_940_7,
    1.610_490_331_949_254_3,
    1.681_792_830_507_429,
    1.756_252_160_373_299_5,
    1.834_008_086_409_342_4,
    1.915_206_561_397_147_4,
];

// ln 2 / 16 in two parts: the first with its low 21 bits zero, so that n times it is
// exact for |n| below 2^14 (n >= -16,360 here).
// (fdlibm's ln2_hi, bits 0x3fe62e42fee00000, and ln2_lo, bits 0x3dea39ef35793c76, each
// written as the shortest decimal that reads back as those bits.)
const STEP_HI: f64 = 0.693_147_180_369_123_8 / 16.0;
const STEP_LO: f64 = 1.908_214_929_270_587_7e-10 / 16.0;

/// `exp(x)` for `x <= 0`, written so that a loop over rows keeps several in flight (plain
/// arithmetic, a lookup in a 16-entry table and integer operations on the bits, no call).
/// The exponent is split as `x = (n/16) ln 2 + r` with `|r| <= ln2/32`; then
/// `exp(x) = 2^(n div 16) 2^((n mod 16)/16) exp(r)`, with `exp(r)` its Taylor series to
/// `r^7` (the remainder, `0.0217^8/8!`, is below 2e-18). Below -708 (where `exp` leaves
/// the normal range) it gives 0: a term that small beside the largest (which a caller
/// scales to 1) changes no sum.
///
/// Accuracy: within 1 unit in the last place of `f64::exp` on `[-708, 0]` (the test below
/// walks the range).
///
/// # References
/// The reduction with `ln 2` split in two parts is Cody and Waite, "Software Manual for the
/// Elementary Functions", Prentice-Hall 1980, chapter 6; the table of `2^(j/N)` is Tang,
/// "Table-driven implementation of the exponential function in IEEE floating-point
/// arithmetic", ACM TOMS 15(2), 1989.
#[inline(always)]
pub fn exp_nonpositive(x: f64) -> f64 {
    // 1.5 * 2^52: adding it rounds to an integer, kept in the low bits of the sum.
    const SHIFT: f64 = 6_755_399_441_055_744.0;
    let x = x.max(-708.0);
    let shifted = x * (16.0 * std::f64::consts::LOG2_E) + SHIFT;
    let n = shifted - SHIFT;
    let r = (x - n * STEP_HI) - n * STEP_LO;
    // The integer n sits in the low bits of `shifted` (offset by those of SHIFT).
    let n_bits = shifted.to_bits().wrapping_sub(SHIFT.to_bits()) as i64;
    let scale = f64::from_bits((((n_bits >> 4) + 1023) as u64) << 52);
    let table = TWO_TO_J16[(n_bits & 15) as usize];
    // sum r^k/k!, k = 1..7, in Estrin's form (pairs, then pairs of pairs), so that the
    // multiplications do not wait on one another as in Horner's chain.
    let r2 = r * r;
    // exp(r) - 1 is summed apart and the 1 added last, as `table + table q`, where its
    // rounding is smallest.
    let low = r + (0.5 + r * (1.0 / 6.0)) * r2;
    let high = (1.0 / 24.0 + r * (1.0 / 120.0)) + (1.0 / 720.0 + r * (1.0 / 5_040.0)) * r2;
    let q = low + high * (r2 * r2);
    let v = (table + table * q) * scale;
    if x > -708.0 {
        v
    } else {
        0.0
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Units in the last place between two positive doubles.
    fn ulps(a: f64, b: f64) -> u64 {
        a.to_bits().abs_diff(b.to_bits())
    }

    #[test]
    fn matches_the_library_exponential_over_its_range() {
        // Source of truth: the platform's `f64::exp` (within 1 ulp on glibc and in Rust's
        // wasm libm). Walk [-708, 0] in uneven steps, and the neighbourhood of every
        // multiple of ln2/32 (where the reduction switches n).
        let mut worst = 0;
        let mut x = 0.0f64;
        while x > -708.0 {
            worst = worst.max(ulps(exp_nonpositive(x), x.exp()));
            x -= 0.000_131_3 * (1.0 + x.abs()).sqrt();
        }
        for n in 0..32_700 {
            let edge = -(n as f64) * std::f64::consts::LN_2 / 32.0;
            for dx in [-1e-12, 0.0, 1e-12] {
                let y = (edge + dx).min(0.0);
                if y > -708.0 {
                    worst = worst.max(ulps(exp_nonpositive(y), y.exp()));
                }
            }
        }
        assert!(worst <= 1, "worst error {worst} ulp");
        assert_eq!(exp_nonpositive(0.0), 1.0);
        assert_eq!(exp_nonpositive(-709.0), 0.0);
        assert_eq!(exp_nonpositive(f64::NEG_INFINITY), 0.0);
        assert_eq!(exp_nonpositive(f64::NAN), 0.0);
        // The two parts of ln 2 are fdlibm's, bit for bit.
        assert_eq!((16.0 * STEP_HI).to_bits(), 0x3fe6_2e42_fee0_0000);
        assert_eq!((16.0 * STEP_LO).to_bits(), 0x3dea_39ef_3579_3c76);
    }
}
