#!/usr/bin/env python3
"""How long an audit takes, and what it finds on a plain table, for the README.

Run from the repository root:  python bench/audit.py
Prints the wall time (median of 3) of auditing a 1,000-row one-input table and a 100 x 100
grid, each with 100,000 verification points (targets: under 2 s and under 10 s on 2 cores),
then the error found in a uniform 1-bar-step linear saturation-temperature table over 1-20 bar.
Every table is printed from the h2olut IF97 core. A measurement script, not a test: it exits 0
whatever the figures are.
"""

import os
import statistics
import time

import numpy as np

from gen import audit as A
from gen import quantities as Q

REPEATS = 3


def median_time(fn):
    times = []
    result = None
    for _ in range(REPEATS):
        t0 = time.perf_counter()
        result = fn()
        times.append(time.perf_counter() - t0)
    return statistics.median(times), result


def tsat_csv(p_bar, decimals=4):
    t = Q.evaluate("saturation_temperature", pressure=p_bar * 1e5) - 273.15
    return "p [bar],T [degC]\n" + "\n".join(f"{a:.6g},{b:.{decimals}f}" for a, b in zip(p_bar, t))


def grid_csv(p_bar, t_degc):
    z = Q.evaluate("density", pressure=p_bar[:, None] * 1e5, temperature=t_degc[None, :] + 273.15)
    lines = ["p/T," + ",".join(f"{t:.6g}" for t in t_degc)]
    lines += [f"{p:.6g}," + ",".join(f"{v:.7g}" for v in row) for p, row in zip(p_bar, z)]
    return "\n".join(lines)


def main():
    print(f"h2olut audit benchmark ({os.cpu_count()} CPUs visible), median of {REPEATS} runs")

    rows = np.geomspace(0.01, 200.0, 1000)
    text = tsat_csv(rows)
    spec = A.audit_spec("saturation_temperature", ["pressure"], ["bar"], "degC", "linear",
                        "float32", suggest=False)
    t1, a1 = median_time(lambda: A.audit_bytes(text, "tsat_1000.csv", spec))
    print(f"1-D, 1000 rows (0.01-200 bar, log-spaced), linear float32: {t1:.2f} s "
          f"(target < 2 s), {a1.verification['points']} points, max error "
          f"{a1.verification['max_error']:.3g} K at {a1.verification['at']:.6g} bar")
    spec_r = A.audit_spec("saturation_temperature", ["pressure"], ["bar"], "degC", "linear",
                          "float32", suggest=True)
    t1r, a1r = median_time(lambda: A.audit_bytes(text, "tsat_1000.csv", spec_r))
    print(f"  the same with the replacement built: {t1r:.2f} s; "
          f"{a1r.replacement['line']}")

    p = np.linspace(1.0, 100.0, 100)
    t = np.linspace(350.0, 800.0, 100)
    gtext = grid_csv(p, t)
    gspec = A.audit_spec("density", ["pressure", "temperature"], ["bar", "degC"], "kg/m^3",
                         "bilinear", "float32", tolerance_rel=1e-3)
    t2, a2 = median_time(lambda: A.audit_bytes(gtext, "rho_100x100.csv", gspec))
    v = a2.verification
    print(f"2-D, 100 x 100 grid (1-100 bar x 350-800 degC, superheated steam), bilinear "
          f"float32: {t2:.2f} s (target < 10 s), {v['points']} points, max error "
          f"{v['max_error'] * 100:.3g} % at {v['at'][0]:.6g} bar, {v['at'][1]:.6g} degC")

    p1 = np.arange(1.0, 21.0)
    ex = A.audit_spec("saturation_temperature", ["pressure"], ["bar"], "degC", "linear",
                      "float32", suggest=True)
    a3 = A.audit_bytes(tsat_csv(p1, decimals=3), "tsat_1bar.csv", ex)
    v = a3.verification
    f = A.core_function(ex)
    seg = int(np.searchsorted(p1, v["at"])) - 1
    mids = 0.5 * (p1[:-1] + p1[1:])
    mid_err = np.abs(a3.table(mids) - f(mids))
    print("example for the README: uniform 1-bar-step linear saturation-temperature table, "
          "1-20 bar, float32, 20 rows, 160 bytes")
    print(f"  max error {v['max_error']:.3f} K at {v['at']:.4f} bar (in the {p1[seg]:g}-"
          f"{p1[seg + 1]:g} bar interval), signed {v['signed_error_at_max']:+.3f} K; "
          f"{v['points']} points")
    print(f"  error at the interval midpoints: {mid_err[0]:.3f} K (1-2 bar), "
          f"{mid_err[4]:.3f} K (5-6 bar), {mid_err[-1]:.3f} K (19-20 bar)")
    print(f"  {a3.replacement['line']}")


if __name__ == "__main__":
    main()
