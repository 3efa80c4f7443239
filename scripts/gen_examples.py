#!/usr/bin/env python3
"""Writes the demo data sets of the fit page and `latchwise fit` under examples/: invented
for the demo (our own scenario), drawn from known parameters with seeded noise so that the
files regenerate unchanged. Run with --check to compare instead of writing.

The scenario: a synchronizer flip-flop of a made-up low-power process, characterised three
ways: failure counts on a tester, a simulated delay sweep, and a comparator's decision-time
sweep from the same library's sense amplifier.
"""
import math
import random
import sys
from pathlib import Path

OUT = Path(__file__).resolve().parent.parent / "examples"


def poisson(rng, mu):
    # Knuth's method below 30, a normal approximation rounded (never negative) above.
    if mu < 30:
        limit, k, p = math.exp(-mu), 0, rng.random()
        while p > limit:
            k += 1
            p *= rng.random()
        return k
    return max(0, round(rng.gauss(mu, math.sqrt(mu))))


def counts():
    rng = random.Random(20261202)
    tau, tw, fclk, fdata = 18e-12, 22e-12, 1e9, 50e6
    lines = ["# Demo (invented): failure counts of a synchronizer flip-flop on a tester.",
             "# Drawn from tau = 18 ps, tw = 22 ps at fclk = 1 GHz, fdata = 50 MHz.",
             "tr,failures,duration"]
    for tr_ps, dur in [(100, 1), (140, 1), (180, 2), (220, 10), (260, 30), (300, 100), (340, 300), (380, 600)]:
        mu = dur * fclk * fdata * tw * math.exp(-tr_ps * 1e-12 / tau)
        lines.append(f"{tr_ps}ps,{poisson(rng, mu)},{dur}s")
    return "\n".join(lines) + "\n"


def delay():
    rng = random.Random(7)
    tau, tw, tcq, m = 16e-12, 30e-12, 45e-12, 3.2e-12
    lines = ["# Demo (invented): a simulated sweep of data-to-clock offset against clock-to-output",
             "# delay. Drawn from tcq + tau ln coth(|offset - m| / (tw/2)) with tau = 16 ps,",
             "# tw = 30 ps, tcq = 45 ps, balance offset m = 3.2 ps; the simulation window ends at",
             "# 100 ps of extra delay.",
             "offset,delay"]
    for k in range(-12, 13):
        if k == 0:
            continue
        d = 10 ** (-1 - abs(k) * 0.45) * 1e-9 * (30 if k > 0 else 20)
        off = m + (d if k > 0 else -d)
        x = abs(off - m) / (tw / 2)
        e = math.exp(-2 * x)
        extra = tau * (math.log1p(e) - math.log1p(-e))
        extra = min(extra, 100e-12)
        lines.append(f"{off * 1e12:.6f}ps,{(tcq + extra) * 1e12 + rng.gauss(0, 0.15):.3f}ps")
    return "\n".join(lines) + "\n"


def comparator():
    rng = random.Random(11)
    tau, v0 = 14e-12, 0.1
    lines = ["# Demo (invented): decision time of a sense amplifier against input.",
             "# Drawn from tau = 14 ps, v0 = vmin/gain = 100 mV, 0.4 ps of timing noise.",
             "vin,time"]
    for e in range(-6, -1):
        for m in (1, 3):
            vin = m * 10 ** e
            t = tau * math.log(v0 / vin) + rng.gauss(0, 0.4e-12)
            lines.append(f"{vin:g}V,{t * 1e12:.3f}ps")
    return "\n".join(lines) + "\n"


def budget_design():
    """The demo chip: its crossings as the engineer knows them (kinds, pointer widths, a
    related clock, a fast pad cell class)."""
    return """# Demo (invented): the clock-domain crossings of a made-up chip with a 1.2 GHz core,
# a 400 MHz fabric and a 125 MHz peripheral block. count is instances: a bus
# synchronized bit by bit counts its width. A Gray pointer counts one instance of
# its width; a handshake's rate is twice its transfers; a signal's is its activity
# times its launching clock; the fast pad cell is its own class (tau@fastsync).
name,fclk,fdata,stages,count,width,crossing,increments,transfers,flaunch,activity,ratio,jitter,cell,note
core_irq_sync,1.2GHz,2MHz,2,16,1,,,,,,,,,
core_dbg_req,1.2GHz,100kHz,2,1,1,,,,,,,,,
core_fifo_wptr,1.2GHz,,2,1,5,gray,200MHz,,,,,,,write pointer of the fabric-to-core FIFO
core_fifo_rptr,400MHz,,2,1,5,gray,300MHz,,,,,,,
core_cfg_bus,1.2GHz,1MHz,2,32,1,,,,,,,,,
core_reset_sync,1.2GHz,10Hz,3,1,1,,,,,,,,,
core_pwr_ack,1.2GHz,1kHz,2,4,1,,,,,,,,,
fabric_dma_req,400MHz,,2,8,1,handshake,,25MHz,,,,,,four-phase request
fabric_dma_ack,1.2GHz,,2,8,1,handshake,,25MHz,,,,,,four-phase acknowledge
fabric_status,400MHz,5MHz,2,24,1,,,,,,,,,
fabric_err_flags,400MHz,10kHz,2,12,1,,,,,,,,,
fabric_tlm_ptr,400MHz,,2,1,4,gray,60MHz,,,,,,,
periph_uart_rx,125MHz,1MHz,2,2,1,,,,,,,,,
periph_gpio_in,125MHz,,2,48,1,signal,,,50MHz,0.1,,,,
periph_spi_ack,400MHz,10MHz,2,4,1,,,,,,5/16,20ps,,related: a 125 MHz clock from the same PLL
periph_timer_evt,1.2GHz,1MHz,2,6,1,,,,,,,,,
periph_wdog_kick,125MHz,1kHz,2,1,1,,,,,,,,,
periph_fifo_wptr,400MHz,,2,1,5,gray,25MHz,,,,,,,
periph_fifo_rptr,125MHz,,2,1,5,gray,25MHz,,,,,,,
periph_cfg_bus,125MHz,100kHz,2,16,1,,,,,,,,,
io_pad_sync_fast,1.2GHz,300MHz,3,8,1,,,,,,,,fastsync,
io_pad_sync_slow,125MHz,20MHz,2,8,1,,,,,,,,,
io_test_mode,125MHz,1Hz,2,3,1,,,,,,,,,
io_pll_lock,400MHz,10Hz,2,1,1,,,,,,,,,
"""


def budget_corners():
    return """# Demo (invented): three corners of the made-up process. At the low supply the
# cold corner is the slowest to regenerate. The fast pad synchronizer cell is its
# own class: its tau scales with the corner like the library's, from 11 ps.
corner,tau,tw,tsu,tcq,tau@fastsync
typical,12ps,20ps,25ps,40ps,11ps
slow_hot,18ps,26ps,35ps,60ps,16ps
low_v_cold,24ps,30ps,40ps,70ps,21ps
"""


# The supply demo (invented): a synchronizer flip-flop of a made-up low-power process,
# its tau from the EKV interpolation of the drain current at the metastable point VDD/2
# (tau = C / gm), characterised at three voltages at -40 and 125 degrees C; and the DVFS
# table of the cluster it sits in.
K_Q = 8.617333262e-5  # Boltzmann constant over the electron charge, V/K


def ekv(vdd, temp_c):
    t = temp_c + 273.15
    ut = K_Q * t
    n = 1.35
    vt = 0.32 - 1.0e-3 * (temp_c + 40)  # the threshold falls about 1 mV/K
    i_s = 2.0e-4 * (t / 300) ** -1.5 * (ut / (K_Q * 300)) ** 2  # mobility falls when hot
    x = (vdd / 2 - vt) / (2 * n * ut)
    soft = math.log1p(math.exp(x))
    gm = i_s * soft / (1 + math.exp(-x)) / (n * ut)
    tau = 1.776e-13 / gm
    # A gate's delay for tsu and tcq: C VDD / I(VDD).
    xd = (vdd - vt) / (2 * n * ut)
    delay = 8.96e-13 * vdd / (i_s * math.log1p(math.exp(xd)) ** 2)
    return tau, delay


def sig3(v):
    return float(f"{v:.3g}")


def supply_char():
    lines = ["# Demo (invented): a synchronizer flip-flop characterised at three supply voltages,",
             "# at -40 and 125 degrees C (EKV drain-current model, scripts/gen_examples.py).",
             "vdd,temp,tau,tw,tsu,tcq"]
    for temp in (-40, 125):
        for vdd in (0.6, 0.75, 0.9):
            tau, d = ekv(vdd, temp)
            lines.append(f"{vdd},{temp},{sig3(tau * 1e12)}ps,{sig3(1.6 * tau * 1e12)}ps,"
                         f"{sig3(0.6 * d * 1e12)}ps,{sig3(d * 1e12)}ps")
    return "\n".join(lines) + "\n"


def supply_points():
    return ("# Demo (invented): the DVFS table of the cluster the crossing samples into.\n"
            "name,vdd,fclk,residency\n"
            "turbo,0.95,1.4GHz,0.05\n"
            "nominal,0.8,1GHz,0.6\n"
            "eco,0.6,350MHz,0.3\n"
            "standby,0.5,60MHz,0.05\n")


def main():
    files = {"fit-counts.csv": counts(), "fit-delay.csv": delay(), "fit-comparator.csv": comparator(),
             "budget-design.csv": budget_design(), "budget-corners.csv": budget_corners(),
             "supply-char.csv": supply_char(), "supply-points.csv": supply_points()}
    if "--check" in sys.argv:
        for name, text in files.items():
            if (OUT / name).read_text() != text:
                sys.exit(f"examples/{name} differs from what the generator writes")
        print("examples up to date")
        return
    OUT.mkdir(exist_ok=True)
    for name, text in files.items():
        (OUT / name).write_text(text)
        print(f"wrote examples/{name}")


if __name__ == "__main__":
    main()
