//! The SAR converter model against the published-model check values of the converter
//! issue (derived for this project from domain notes section 11; relative 1e-6).

use latchwise::converter::model::{
    async_timeouts, enob_loss, ln_p_static, ln_p_sync, mean_square, sync_hard_errors,
    worst_static_code, Fill,
};

use crate::tolerance::assert_rel;

const REL: f64 = 1e-6;

#[test]
fn asynchronous_timeouts_and_their_errors() {
    // B = 10, T_b = 70 tau, V_x = V_FS (1024 LSB).
    let r = async_timeouts(10, 70.0, 1024.0, Fill::Reset);
    assert_rel("P_meta", r.ln_p_meta.exp(), 1.431045e-10, REL);
    let s = &r.share_by_step;
    assert_rel("share at B", s[9], 0.9996452, REL);
    assert_rel("share at B-1", s[8], 3.545132e-4, REL);
    assert_rel("share at B-2", s[7], 2.51359e-7, REL);
    assert_rel("shares sum to 1", s.iter().sum::<f64>(), 1.0, 1e-12);
    assert_rel(
        "reset P(e != 0)",
        r.ln_p_at_least(1).exp(),
        7.156842e-11,
        REL,
    );
    assert_rel(
        "reset P(|e| >= 2)",
        r.ln_p_at_least(2).exp(),
        2.539571e-14,
        REL,
    );
    assert_rel(
        "reset P(|e| >= 4)",
        r.ln_p_at_least(4).exp(),
        1.802718e-17,
        REL,
    );
    let m = async_timeouts(10, 70.0, 1024.0, Fill::Midpoint);
    assert_rel(
        "midpoint P(|e| >= 2)",
        m.ln_p_at_least(2).exp(),
        9.216604e-15,
        REL,
    );
    // T_b = 60 tau.
    let r = async_timeouts(10, 60.0, 1024.0, Fill::Reset);
    assert_rel("P_meta at 60 tau", r.ln_p_meta.exp(), 3.152086e-6, REL);
    assert_rel(
        "reset P(|e| >= 2) at 60 tau",
        r.ln_p_at_least(2).exp(),
        5.593777e-10,
        REL,
    );
    assert_rel(
        "ENOB loss at 60 tau",
        enob_loss(mean_square(&r.ln_p_error)),
        1.366885e-5,
        REL,
    );
    // B = 8, T_b = 50 tau.
    let r = async_timeouts(8, 50.0, 256.0, Fill::Reset);
    assert_rel("P_meta B 8", r.ln_p_meta.exp(), 1.747649e-8, REL);
    assert_rel("last-step share B 8", r.share_by_step[7], 0.9985809, REL);
    assert_rel(
        "reset P(|e| >= 2) B 8",
        r.ln_p_at_least(2).exp(),
        1.242262e-11,
        REL,
    );
}

#[test]
fn a_parked_input_fails_most_at_the_alternating_code() {
    // B = 10, T_b = 70 tau, sigma-n 0.5 LSB.
    let (code, used) = worst_static_code(10, 1024.0);
    assert_eq!(code, 341); // 0101010101
    assert_rel("E_b + E_a", used, 40.88726, REL);
    let (lp, _) = ln_p_static(10, 70.0, 1024.0, 0.5, code);
    assert_rel("worst static", lp.exp(), 3.713378e-10, REL);
    let (lp, _) = ln_p_static(10, 70.0, 1024.0, 0.5, 512);
    assert_rel("MSB static", lp.exp(), 1.170243e-11, REL);
}

#[test]
fn synchronous_errors_under_hard_consumption() {
    // V_FS 1 V, V_x 0.1 V (102.4 LSB at 10 bits), tau 20 ps, tbit 400 ps, 100 MS/s.
    let ln_p = ln_p_sync(10, 20.0, 102.4);
    let vc = 0.1 * (-20f64).exp();
    assert_rel("v_c", vc, 2.061154e-10, REL);
    let p_meta = 1023.0 * ln_p.exp();
    assert_rel("P_meta", p_meta, 4.21712e-7, REL);
    assert_rel("errors per second", p_meta * 1e8, 42.1712, REL);
    let e = sync_hard_errors(10, ln_p);
    let at_least = |k: u64| e.range(k..).map(|(_, lp)| lp.exp()).sum::<f64>();
    // |e| >= 256 under the stated error model: the MSB step wholly (512 or 511, p) and
    // half of the second step's (256, not 255: half of 2p), 2p in all. The figure
    // 1.236692e-9 = 3p follows its formula (2^(B-k) - 1) p, which counts the second step's
    // 255 as reaching 256 too; E[e^2] and the ENOB figures below agree with the model as
    // stated, so the formula is the odd one out (said on the issue).
    assert_rel("P(|e| >= 256)", at_least(256), 2.0 * ln_p.exp(), 1e-12);
    // P_meta = 1e-9: E[e^2] and the ENOB loss.
    let ln_p = (1e-9f64 / 1023.0).ln();
    let e = sync_hard_errors(10, ln_p);
    assert_rel("E[e^2]", mean_square(&e), 5.074951e-7, REL);
    assert_rel("ENOB loss", enob_loss(mean_square(&e)), 4.392951e-6, REL);
    // The P_meta that loses 0.1 bit, at 8, 10 and 12 bits.
    for (bits, want) in [(8, 9.954290e-5), (10, 2.441704e-5), (12, 6.066849e-6)] {
        let per_p = mean_square(&sync_hard_errors(bits, 0.0));
        let p = (2f64.powf(0.2) - 1.0) / 12.0 / per_p;
        assert_rel(
            "P_meta at 0.1 bit",
            p * (2f64.powi(bits as i32) - 1.0),
            want,
            REL,
        );
    }
}
