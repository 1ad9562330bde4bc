#!/usr/bin/env python3
"""Measured figures for float32 wet-steam tables (quality and mixture properties from (p, h)).

Run from the repository root:  python bench/wet.py [--runs N]
Per case: stored bytes of the function built by h2olut (goal "smallest"; every saturation table
it keeps), against the same function built from linear saturation tables (rows placed where
they are needed, linear interpolation between them: a careful hand-made steam table) meeting
the same tolerance on the same verification, and the ratio; the verified error; instructions per call of
the compiled C (valgrind callgrind, difference of two call counts over 1024 fixed points inside
the dome); and the wall time of each build (median of N runs, in this process). A measurement
script, not a test: it exits 0 whatever the figures.
"""

import argparse
import shutil
import statistics
import subprocess
import sys
import tempfile
import time
from pathlib import Path

import numpy as np

HERE = Path(__file__).resolve().parent
sys.path.insert(0, str(HERE.parent))
sys.path.insert(0, str(HERE))

from grids import CALL_N, DRIVER, callgrind  # noqa: E402

from gen.emit.common import template_env  # noqa: E402
from gen.spec import parse_spec  # noqa: E402
from gen.emit.wet import wet_c_context  # noqa: E402
from gen.wet import build_wet_table, verification_inputs  # noqa: E402

CASES = [
    ("quality, 1-40 bar, 0.001", "quality", "{ abs = 0.001 }", "", 1.0, 40.0),
    ("quality, 0.1-160 bar, 0.001", "quality", "{ abs = 0.001 }", "", 0.1, 160.0),
    ("density, 1-40 bar, 0.2 %", "density", "{ rel = 0.002 }", 'output_unit = "kg/m^3"', 1.0,
     40.0),
    ("specific entropy, 1-40 bar, 0.002 kJ/(kg K)", "specific_entropy", "{ abs = 0.002 }",
     'output_unit = "kJ/(kg K)"', 1.0, 40.0),
]

SOURCE = r"""#include <stdint.h>
#include <string.h>
#include <math.h>
#define B_IN_RANGE 0
#define B_BELOW 1
#define B_ABOVE 2
#define B_NOT_A_NUMBER 3
#define B_SUBCOOLED 5
#define B_SUPERHEATED 6
{{ wet_decl(w, "B") }}
{{ wet(w, "B") }}
"""


def spec_of(quantity, tol, extra, lo, hi):
    text = (f'name = "b"\nprefix = "b"\n[[table]]\nname = "wet"\nquantity = "{quantity}"\n'
            f'phase = "wet"\ntolerance = {tol}\n{extra}\n'
            f'pressure = {{ unit = "bar", min = {lo}, max = {hi} }}\n'
            f'specific_enthalpy = {{ unit = "kJ/kg" }}\n')
    return parse_spec(text, "bench.toml").tables[0]


def instructions(wt, workdir, tag):
    cc = shutil.which("gcc") or shutil.which("cc")
    d = Path(workdir) / tag
    d.mkdir(parents=True, exist_ok=True)
    env = template_env()
    src = env.from_string('{% from "c_wet.j2" import wet, wet_decl %}' + SOURCE)
    (d / "w.c").write_text(src.render(w=wet_c_context(wt)))
    P, A, _ = verification_inputs(wt, 1024, 7)
    rows = ",\n".join(f"    {{ {float(np.float32(a)).hex()}f, {float(np.float32(b)).hex()}f }}"
                      for a, b in zip(P[-1024:], A[-1024:]))
    fn = wt.spec.function
    (d / "drv.c").write_text(DRIVER.replace("FN", fn) % rows)
    subprocess.run([cc, "-O2", "-std=c99", "-c", str(d / "w.c"), "-o", str(d / "w.o")],
                   check=True)
    subprocess.run([cc, "-O2", "-std=c99", str(d / "drv.c"), str(d / "w.o"), "-o",
                    str(d / "drv"), "-lm"], check=True)
    a = callgrind(d / "drv", CALL_N[0], 1, fn, d)
    b = callgrind(d / "drv", CALL_N[1], 1, fn, d)
    return (b[1] - a[1]) / (CALL_N[1] - CALL_N[0])


def err_text(ts, e):
    return f"{e * 100:.3g} %" if ts.tol_kind == "rel" else f"{e:.3g}"


def main():
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--runs", type=int, default=3, help="builds per case for the median time")
    args = ap.parse_args()
    print(f"wet-steam tables, float32; build times are medians of {args.runs} runs")
    print(f"{'case':44s} {'bytes':>6s} {'baseline':>9s} {'ratio':>7s} {'max error':>10s} "
          f"{'insns':>6s} {'build s':>8s} {'baseline insns':>15s}")
    with tempfile.TemporaryDirectory() as work:
        for k, (label, q, tol, extra, lo, hi) in enumerate(CASES):
            ts = spec_of(q, tol, extra, lo, hi)
            times = []
            for _ in range(args.runs):
                t0 = time.perf_counter()
                wt = build_wet_table(ts)
                times.append(time.perf_counter() - t0)
            base = build_wet_table(ts, layouts=["free"], degree=1)
            ins = instructions(wt, work, f"w{k}")
            ins_b = instructions(base, work, f"b{k}")
            print(f"{label:44s} {wt.storage_bytes:6d} {base.storage_bytes:9d} "
                  f"{base.storage_bytes / wt.storage_bytes:6.1f}x "
                  f"{err_text(ts, wt.verification['max_error']):>10s} {ins:6.0f} "
                  f"{statistics.median(times):8.2f} {ins_b:15.0f}")
            print("    tables: " + ", ".join(
                f"{role} {t.piecewise.nseg}x{t.piecewise.degree} {t.piecewise.layout}"
                for role, t in wt.members.items())
                + "; baseline: " + ", ".join(f"{role} {t.piecewise.nseg} segments"
                                              for role, t in base.members.items()))
    print("insns: instructions inside the function per call (callgrind, -O2 x86-64, "
          f"(count at N={CALL_N[1]} - count at N={CALL_N[0]}) / {CALL_N[1] - CALL_N[0]}).")
    print("baseline: the same run-time function from degree-1 saturation tables on free "
          "breakpoints (fewest rows), tightened by the same loop until the whole function "
          "meets the tolerance.")
    print("Maximum errors are sampled measurements on 100,000 points, not bounds.")


if __name__ == "__main__":
    main()
