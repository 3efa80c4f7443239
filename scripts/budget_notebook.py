#!/usr/bin/env python3
"""The same roll-up as `latchwise budget`, written as a notebook would (pandas read_csv and
numpy), for the side-by-side timing in scripts/bench-budget. Prints the worst corner and
its log10 total FIT.

Usage: scripts/budget_notebook.py DESIGN.csv CORNERS.csv [--in-process]
"""
import sys

import numpy as np
import pandas as pd

UNITS = {"GHz": 1e9, "MHz": 1e6, "kHz": 1e3, "Hz": 1.0, "ps": 1e-12, "ns": 1e-9, "s": 1.0}


def value(col):
    s = col.astype(str).str.strip()
    num = s.str.extract(r"^([0-9.eE+-]+)")[0].astype(float)
    unit = s.str.extract(r"([a-zA-Z]+)$")[0].map(UNITS).fillna(1.0)
    return num * unit


def main(design, corners):
    d = pd.read_csv(design, comment="#")
    c = pd.read_csv(corners, comment="#")
    fclk, fdata = value(d["fclk"]).to_numpy(), value(d["fdata"]).to_numpy()
    stages, count = d["stages"].to_numpy(float), d["count"].fillna(1).to_numpy(float)
    best = None
    for _, k in c.iterrows():
        tau, tw = value(pd.Series([k["tau"]]))[0], value(pd.Series([k["tw"]]))[0]
        tsu, tcq = value(pd.Series([k["tsu"]]))[0], value(pd.Series([k["tcq"]]))[0]
        tr = (stages - 1) * (1 / fclk - tsu - tcq)
        ln_fit = np.log(count * fdata * fclk * tw * 3.6e12) - tr / tau
        total = np.logaddexp.reduce(ln_fit) / np.log(10)
        if best is None or total > best[1]:
            best = (k["corner"], total)
    print(f"worst corner {best[0]}: log10 total FIT {best[1]:.6f}")


if __name__ == "__main__":
    if len(sys.argv) > 3 and sys.argv[3] == "--in-process":
        # As a notebook that has imported pandas already runs the cell: the median of five
        # runs, timed inside this process after the imports.
        import time

        times = []
        for _ in range(5):
            t0 = time.perf_counter()
            main(sys.argv[1], sys.argv[2])
            times.append(time.perf_counter() - t0)
        print(f"in-process median {sorted(times)[2]:.3f} s")
    else:
        main(sys.argv[1], sys.argv[2])
