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
             "# delay. Drawn from tau = 16 ps, tw = 30 ps, tcq = 45 ps, balance offset 3.2 ps;",
             "# the simulation window ends at 100 ps of extra delay.",
             "offset,delay"]
    for k in range(-12, 13):
        if k == 0:
            continue
        d = 10 ** (-1 - abs(k) * 0.45) * 1e-9 * (30 if k > 0 else 20)
        off = m + (d if k > 0 else -d)
        extra = tau * math.log(tw / (2 * abs(off - m)))
        extra = min(max(extra, 0.0), 100e-12)
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


def main():
    files = {"fit-counts.csv": counts(), "fit-delay.csv": delay(), "fit-comparator.csv": comparator()}
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
