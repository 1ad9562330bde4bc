#!/usr/bin/env python3
"""Throughput of the IF97 core against CoolProp's IF97 backend and the iapws package.

Run from the repository root:  python bench/core.py
Times, on the same 1,000,000 seeded random points: density in region 1, density in region 2
and saturation temperature from pressure, for

* h2olut: the region functions (gen.if97.region1.density, region2.density,
  region4.saturation_temperature) and gen.quantities.evaluate (range check, region dispatch);
* CoolProp's IF97 backend ("IF97::Water", package CoolProp on PyPI), PropsSI on numpy arrays;
* the iapws package (PyPI), one state per call, timed on a 2,000-point subsample and scaled
  per point: its public class iapws.IAPWS97, and for information its module-level region
  functions (iapws.iapws97._Region1, _Region2, _TSat_P) without the class's bookkeeping.

Each timing is the median of 5 runs after one warm-up run. Prints microseconds per point, the
throughput ratios ours / CoolProp and ours / iapws against the targets (>= 2x CoolProp,
>= 500x iapws) with PASS or MISS, and the machine. A measurement script, not a test: it exits 0 whatever the
figures are. The environment (e.g. OPENBLAS_CORETYPE) is printed as found and not changed.
"""

import os
import platform
import statistics
import sys
import time

import numpy as np

import CoolProp
import iapws
import iapws.iapws97 as iapws97
from CoolProp.CoolProp import PropsSI

from gen.if97 import region1, region2, region4
from gen.if97.b23 import b23_pressure
from gen.quantities import evaluate

N = 1_000_000
N_IAPWS = 2_000
REPEAT = 5
SEED = 20_250_601
FLUID = "IF97::Water"
CP_P_MIN = 611.213     # lowest pressure CoolProp's IF97 backend accepts, Pa
TARGET_CP = 2.0
TARGET_IAPWS = 500.0


def median_seconds(fn, repeat=REPEAT):
    """Median wall time of ``repeat`` calls after one untimed warm-up call."""
    fn()
    times = []
    for _ in range(repeat):
        t0 = time.perf_counter()
        fn()
        times.append(time.perf_counter() - t0)
    return statistics.median(times)


def cpu_name():
    try:
        with open("/proc/cpuinfo") as f:
            for line in f:
                if line.startswith("model name"):
                    return line.split(":", 1)[1].strip()
    except OSError:
        pass
    return platform.processor() or "unknown CPU"


def points():
    g = np.random.default_rng(SEED)
    # region 1: 273.15 K <= T <= 623.15 K, p_sat(T) <= p <= 100 MPa
    T1 = g.uniform(273.15, 623.15, N)
    ps = np.maximum(region4.saturation_pressure(T1), CP_P_MIN)
    p1 = g.uniform(ps, 100e6)
    # region 2: 273.15 K .. 1073.15 K below p_sat (T <= 623.15 K) or B23 (to 863.15 K),
    # pressure log-uniform from CoolProp's lowest pressure
    T2 = g.uniform(273.151, 1073.15, N)
    top = np.where(T2 <= 623.15, region4.saturation_pressure(np.minimum(T2, 623.15)),
                   np.where(T2 <= 863.15, b23_pressure(np.minimum(T2, 863.15)), 100e6))
    p2 = np.exp(g.uniform(np.log(CP_P_MIN), np.log(top * (1 - 1e-9))))
    # saturation: p log-uniform from CoolProp's lowest pressure to the critical pressure
    p4 = np.exp(g.uniform(np.log(CP_P_MIN), np.log(22.064e6), N))
    sub = g.choice(N, N_IAPWS, replace=False)
    return (p1, T1), (p2, T2), p4, sub


def main():
    (p1, T1), (p2, T2), p4, sub = points()
    cases = []   # (title, rows: [(label, seconds per point, kind)])

    def row(label, seconds, n, kind):
        return (label, seconds / n * 1e6, kind)

    # --- density, region 1
    rows = []
    out = {}

    def ours1():
        out["ours"] = region1.density(p1, T1)
    rows.append(row("h2olut gen.if97.region1.density", median_seconds(ours1), N, "core"))

    def eval1():
        out["eval"] = evaluate("density", pressure=p1, temperature=T1)
    rows.append(row('h2olut evaluate("density") (dispatch)', median_seconds(eval1), N, "eval"))

    def cp1():
        out["cp"] = PropsSI("D", "P", p1, "T", T1, FLUID)
    rows.append(row("CoolProp IF97 PropsSI on arrays", median_seconds(cp1), N, "cp"))

    ps_, Ts_ = p1[sub], T1[sub]
    rows.append(row("iapws IAPWS97(P, T).rho", median_seconds(
        lambda: [iapws.IAPWS97(P=a / 1e6, T=b).rho for a, b in zip(ps_, Ts_)]), N_IAPWS, "iapws"))
    rows.append(row("iapws iapws97._Region1(T, P) (info)", median_seconds(
        lambda: [1.0 / iapws97._Region1(b, a / 1e6)["v"] for a, b in zip(ps_, Ts_)]),
        N_IAPWS, "info"))
    ref_iapws = np.array([iapws.IAPWS97(P=a / 1e6, T=b).rho for a, b in zip(ps_, Ts_)])
    agree = (np.max(np.abs(out["ours"] / out["cp"] - 1)),
             np.max(np.abs(out["eval"] / out["cp"] - 1)),
             np.max(np.abs(out["ours"][sub] / ref_iapws - 1)))
    cases.append(("density, region 1", rows, agree))

    # --- density, region 2
    rows = []
    out = {}

    def ours2():
        out["ours"] = region2.density(p2, T2)
    rows.append(row("h2olut gen.if97.region2.density", median_seconds(ours2), N, "core"))

    def eval2():
        out["eval"] = evaluate("density", pressure=p2, temperature=T2)
    rows.append(row('h2olut evaluate("density") (dispatch)', median_seconds(eval2), N, "eval"))

    def cp2():
        out["cp"] = PropsSI("D", "P", p2, "T", T2, FLUID)
    rows.append(row("CoolProp IF97 PropsSI on arrays", median_seconds(cp2), N, "cp"))

    ps_, Ts_ = p2[sub], T2[sub]
    rows.append(row("iapws IAPWS97(P, T).rho", median_seconds(
        lambda: [iapws.IAPWS97(P=a / 1e6, T=b).rho for a, b in zip(ps_, Ts_)]), N_IAPWS, "iapws"))
    rows.append(row("iapws iapws97._Region2(T, P) (info)", median_seconds(
        lambda: [1.0 / iapws97._Region2(b, a / 1e6)["v"] for a, b in zip(ps_, Ts_)]),
        N_IAPWS, "info"))
    ref_iapws = np.array([iapws.IAPWS97(P=a / 1e6, T=b).rho for a, b in zip(ps_, Ts_)])
    agree = (np.max(np.abs(out["ours"] / out["cp"] - 1)),
             np.max(np.abs(out["eval"] / out["cp"] - 1)),
             np.max(np.abs(out["ours"][sub] / ref_iapws - 1)))
    cases.append(("density, region 2", rows, agree))

    # --- saturation temperature from pressure
    rows = []
    out = {}

    def ours4():
        out["ours"] = region4.saturation_temperature(p4)
    rows.append(row("h2olut gen.if97.region4.saturation_temperature", median_seconds(ours4), N,
                    "core"))

    def eval4():
        out["eval"] = evaluate("saturation_temperature", pressure=p4)
    rows.append(row('h2olut evaluate("saturation_temperature")', median_seconds(eval4), N,
                    "eval"))

    def cp4():
        out["cp"] = PropsSI("T", "P", p4, "Q", 0, FLUID)
    rows.append(row("CoolProp IF97 PropsSI on arrays", median_seconds(cp4), N, "cp"))

    ps_ = p4[sub]
    rows.append(row("iapws IAPWS97(P, x=0).T", median_seconds(
        lambda: [iapws.IAPWS97(P=a / 1e6, x=0).T for a in ps_]), N_IAPWS, "iapws"))
    rows.append(row("iapws iapws97._TSat_P(P) (info)", median_seconds(
        lambda: [iapws97._TSat_P(a / 1e6) for a in ps_]), N_IAPWS, "info"))
    ref_iapws = np.array([iapws97._TSat_P(a / 1e6) for a in ps_])
    agree = (np.max(np.abs(out["ours"] / out["cp"] - 1)),
             np.max(np.abs(out["eval"] / out["cp"] - 1)),
             np.max(np.abs(out["ours"][sub] / ref_iapws - 1)))
    cases.append(("saturation temperature T_sat(p)", rows, agree))

    # --- report
    cores = os.cpu_count()
    try:
        usable = len(os.sched_getaffinity(0))
    except AttributeError:
        usable = cores
    print("h2olut core benchmark")
    print(f"machine: {platform.system()} {platform.machine()}, {cpu_name()}; "
          f"{cores} cores ({usable} usable)")
    print(f"python {platform.python_version()}, numpy {np.__version__}, CoolProp "
          f"{CoolProp.__version__}, iapws {iapws.__version__}")
    print(f"OPENBLAS_CORETYPE={os.environ.get('OPENBLAS_CORETYPE', '<unset>')} (left as found)")
    print(f"points: {N:,} seeded random (seed {SEED}); iapws timed on {N_IAPWS:,} of them and "
          f"scaled per point; median of {REPEAT} runs")
    print()
    width = max(len(r[0]) for _, rows, _ in cases for r in rows)
    for title, rows, agree in cases:
        print(title)
        for label, us, _ in rows:
            print(f"  {label:<{width}}  {us:12.4f} us/point")
        print(f"  same results: ours vs CoolProp max rel. diff {agree[0]:.1e} (core), "
              f"{agree[1]:.1e} (evaluate); vs iapws {agree[2]:.1e}")
        print()
    print("throughput ratios (ours / reference), targets >= "
          f"{TARGET_CP:g}x CoolProp IF97 and >= {TARGET_IAPWS:g}x iapws IAPWS97")
    misses = 0
    for title, rows, _ in cases:
        t = {kind: us for _, us, kind in rows}
        for kind, name in (("core", "core function"), ("eval", "evaluate")):
            r_cp = t["cp"] / t[kind]
            r_ia = t["iapws"] / t[kind]
            v_cp = "PASS" if r_cp >= TARGET_CP else "MISS"
            v_ia = "PASS" if r_ia >= TARGET_IAPWS else "MISS"
            misses += (v_cp == "MISS") + (v_ia == "MISS")
            r_info = t["info"] / t[kind]
            print(f"  {title:<32} {name:<13}  vs CoolProp {r_cp:7.2f}x {v_cp}   "
                  f"vs iapws {r_ia:7.0f}x {v_ia}   (vs iapws region function {r_info:.0f}x, "
                  f"no target)")
    print()
    print(f"{misses} of {2 * 2 * len(cases)} ratios miss their target")
    return 0


if __name__ == "__main__":
    sys.exit(main())
