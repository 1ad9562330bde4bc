#!/usr/bin/env python3
"""Measured figures for four float32 saturation tables built by h2olut.

Run from the repository root:  python bench/tables.py
Prints, per case: table size against a hand-made uniform linear table, segment count against a
fine greedy reference, instructions per call of the compiled C (callgrind), and finally the
wall time of ``h2olut build`` on the demo spec. A measurement script, not a test: it exits 0
whatever the figures are.
"""

import os
import re
import shutil
import statistics
import subprocess
import sys
import tempfile
import time
from pathlib import Path

import numpy as np

import gen.build as B
from gen import quantities as Q
from gen.fit import segments as S
from gen.outputs import render_outputs
from gen.spec import parse_spec
from gen.verify import verify_table

HERE = Path(__file__).resolve().parent
DRIVER = HERE / "callcount_main.c"

SPEC = """
name = "bench_tables"
prefix = "bt"
description = "four float32 saturation tables for the benchmark"

[[table]]
name = "tsat"
quantity = "saturation_temperature"
output_unit = "K"
tolerance = { abs = 0.01 }
pressure = { unit = "kPa", min = 1, max = 22000 }
goal = "smallest"

[[table]]
name = "psat"
quantity = "saturation_pressure"
output_unit = "kPa"
tolerance = { rel = 0.0001 }
temperature = { unit = "degC", min = 0.01, max = 373.9 }
goal = "smallest"

[[table]]
name = "rhov"
quantity = "saturated_vapor_density"
output_unit = "kg/m^3"
tolerance = { rel = 0.0005 }
pressure = { unit = "kPa", min = 10, max = 20000 }
goal = "smallest"

[[table]]
name = "latent"
quantity = "latent_heat"
output_unit = "kJ/kg"
tolerance = { abs = 0.1 }
pressure = { unit = "kPa", min = 10, max = 20000 }
goal = "smallest"
"""

#: storage ratio baseline/h2olut each case must reach
RATIO_TARGET = {"tsat": 1000.0, "psat": 10.0, "rhov": 50.0, "latent": 100.0}
GREEDY_TARGET = 1.10
INSN_TARGET = 60.0
DEMO_TARGET = 5.0
CALL_N = (1000, 11000)

F32 = np.float32


def verdict(ok):
    return "PASS" if ok else "MISS"


def tol_text(ts, v, digits=4):
    if ts.tol_kind == "abs":
        return f"{v:.{digits}g} {ts.output_unit}"
    return f"{v * 100:.{digits}g} %"


# --------------------------------------------------------------------------------------------
# building, with the fit budget of every placement call recorded

_CALLS = []
_orig_place = B._place


def _recording_place(*args, **kw):
    pw = _orig_place(*args, **kw)
    layout, d, budget = args[0], args[5], args[6]
    _CALLS.append((layout, d, budget, None if pw is None else pw.nseg))
    return pw


B._place = _recording_place

_VERIFY = []
_orig_verify = B.verify_table


def _recording_verify(pw, f, scale, n, *args, **kw):
    _VERIFY.append((time.perf_counter(), n))
    return _orig_verify(pw, f, scale, n, *args, **kw)


B.verify_table = _recording_verify


def build_case(ts):
    """build_table with timing per candidate; returns (table, seconds, per-candidate times,
    final budget of every (layout, degree))."""
    marks = []

    def progress(msg):
        marks.append((time.perf_counter(), msg))

    del _CALLS[:]
    del _VERIFY[:]
    t0 = time.perf_counter()
    table = B.build_table(ts, progress=progress)
    t1 = time.perf_counter()
    # the full verification of the chosen table starts at the first call with the spec's count
    t_final = next((t for t, n in _VERIFY if n == ts.verify_points), t1)
    spans = []
    for j, (t, msg) in enumerate(marks):
        end = marks[j + 1][0] if j + 1 < len(marks) else t_final
        spans.append((end - t, msg.split(": ", 1)[-1]))
    spans.append((t1 - t_final, "full verification"))
    budgets = {}
    for layout, d, budget, nseg in _CALLS:
        budgets[(layout, d)] = budget     # the last call of a candidate is the one kept
    return table, t1 - t0, spans, budgets


# --------------------------------------------------------------------------------------------
# baseline: uniform linear table in the raw input, N+1 float32 values and 2 constants

class LinearTable:
    def __init__(self, f, lo, hi, n):
        self.n = n
        self.lo, self.hi = F32(lo), F32(hi)
        self.x0 = F32(lo)
        self.inv_h = F32(n / (float(F32(hi)) - float(self.x0)))
        self.nodes = float(self.x0) + np.arange(n + 1) / float(self.inv_h)
        self.y = f(self.nodes).astype(F32)
        if not np.all(np.isfinite(self.y)):
            raise ValueError("core gives no value at a grid node")

    def __call__(self, x):
        """Float32 emulation of  u=(x-x0)*inv_h; i=(int)u; t=u-i; y=Y[i]+t*(Y[i+1]-Y[i])."""
        xf = np.asarray(x).astype(F32)
        xf = np.minimum(np.maximum(xf, self.lo), self.hi)
        u = (xf - self.x0) * self.inv_h
        i = np.minimum(u.astype(np.int64), self.n - 1)
        t = u - i.astype(F32)
        y0 = self.y[i]
        dy = self.y[i + 1] - y0
        return y0 + t * dy

    @property
    def storage_bytes(self):
        return 4 * (self.n + 1) + 4 * 2


def fit_budget(c, layout, d):
    """Float64 fit budget of the kept fit of a candidate; the first budget if none was seen."""
    got = c["budgets"].get((layout, d))
    if got is not None:
        return got
    ts, table = c["ts"], c["table"]
    print(f"        (no placement call recorded for {layout} {d}: using the first budget)")
    return max(ts.tol_value - 2.0 * table.floor, 0.3 * ts.tol_value)


def baseline_points(tab, rng, per_segment, n_random, neighbours):
    lo, hi = float(tab.lo), float(tab.hi)
    a, h = tab.nodes[:-1], 1.0 / float(tab.inv_h)
    parts = [np.array([lo, hi]), a + 0.5 * h]
    for _ in range(per_segment - 1):
        parts.append(a + rng.uniform(0.0, 1.0, a.size) * h)
    if neighbours:
        b = tab.nodes.astype(F32)
        parts += [np.nextafter(b, F32(-np.inf)).astype(np.float64),
                  np.nextafter(b, F32(np.inf)).astype(np.float64)]
    m = n_random // 2
    parts.append(rng.uniform(lo, hi, m))
    parts.append(np.exp(rng.uniform(np.log(lo), np.log(hi), n_random - m)))
    x = np.concatenate(parts)
    return x[(x >= lo) & (x <= hi)]


def baseline_error(f, scale, lo, hi, n, dense=False):
    tab = LinearTable(f, lo, hi, n)
    rng = np.random.default_rng(1234567 + n)
    if dense:
        x = baseline_points(tab, rng, 8, 200_000, True)
    else:
        x = baseline_points(tab, rng, 3, 100_000, False)
    fx = f(x)
    e = np.abs(tab(x).astype(np.float64) - fx) / scale(fx)
    return float(np.max(e)), x.size, tab


def baseline_search(f, scale, lo, hi, tol):
    """Smallest N whose uniform linear table meets tol (bisection on N, then a denser check)."""
    trials = 0
    cache = {}

    def err(n):
        nonlocal trials
        if n not in cache:
            trials += 1
            cache[n] = baseline_error(f, scale, lo, hi, n)[0]
        return cache[n]

    n_lo, n_hi = 0, 16
    while err(n_hi) > tol:
        n_lo, n_hi = n_hi, n_hi * 2
        if n_hi > 1 << 24:
            raise RuntimeError("baseline needs more than 2^24 intervals")
    # the error of a linear table falls as 1/N^2: aim close, then bisect within the bracket
    if n_lo:
        guess = int(n_lo * np.sqrt(err(n_lo) / tol))
        a, b = max(n_lo, int(guess * 0.98)), min(n_hi, int(guess * 1.02) + 1)
        if a > n_lo and err(a) > tol:
            n_lo = a
        if b < n_hi and err(b) <= tol:
            n_hi = b
    while n_hi - n_lo > 1:
        mid = (n_lo + n_hi) // 2
        if err(mid) <= tol:
            n_hi = mid
        else:
            n_lo = mid
    # confirm on a denser point set; step up if the denser set finds more error
    n = n_hi
    while True:
        e, npts, tab = baseline_error(f, scale, lo, hi, n, dense=True)
        trials += 1
        if e <= tol:
            break
        n += max(1, n // 4000)
    e_below = baseline_error(f, scale, lo, hi, n - 1, dense=True)[0] if n > 1 else float("inf")
    return {"n": n, "error": e, "points": npts, "bytes": tab.storage_bytes,
            "error_n_minus_1": e_below, "trials": trials}


# --------------------------------------------------------------------------------------------
# greedy reference: from each start, the longest float32 end whose float64 fit meets the budget,
# searched down to adjacent float32 values (positive inputs: bit order is value order)

def _bits(v):
    return np.asarray(v, dtype=F32).view(np.uint32).astype(np.int64)


def _from_bits(b):
    return np.asarray(b, dtype=np.int64).astype(np.uint32).view(F32).astype(np.float64)


def _accept(f, scale, a, ends, d, budget, monotone):
    _, ok, _, _ = S._free_probe(f, scale, "float32", a, np.asarray(ends, dtype=np.float64), d,
                                budget, monotone)
    return ok


def longest_from(f, scale, a, b, d, budget, monotone, probes=64):
    """End of the longest accepted segment [a, end], end <= b; None if even one ulp fails."""
    if _accept(f, scale, a, [b], d, budget, monotone)[0]:
        return b
    lo_b = int(_bits(np.nextafter(F32(a), F32(np.inf))))
    hi_b = int(_bits(b))
    if not _accept(f, scale, a, _from_bits([lo_b]), d, budget, monotone)[0]:
        return None
    while hi_b - lo_b > 1:
        cand = np.unique(np.round(np.linspace(lo_b, hi_b, probes + 2)).astype(np.int64))
        cand = cand[(cand > lo_b) & (cand < hi_b)]
        ok = _accept(f, scale, a, _from_bits(cand), d, budget, monotone)
        if ok.all():
            lo_b = int(cand[-1])
            continue
        j = int(np.argmin(ok))            # first failing probe
        if j > 0:
            lo_b = int(cand[j - 1])
        hi_b = int(cand[j])
    return float(_from_bits([lo_b])[0])


def greedy_count(f, scale, lo, hi, breaks, d, budget, monotone):
    edges = [lo] + list(breaks) + [hi]
    total = 0
    for a, b in zip(edges[:-1], edges[1:]):
        x = float(F32(a))
        while True:
            end = longest_from(f, scale, x, b, d, budget, monotone)
            if end is None:
                return None, x
            total += 1
            if end >= b:
                break
            x = end
    return total, None


def uniform_ok(f, scale, lo, hi, n, d, budget, monotone):
    x0, inv_h, starts, widths, ta, tb = S.uniform_segments(lo, hi, n, "float32")
    _, _, ok = S._fit_all(f, scale, d, budget, monotone, starts, widths, ta, tb)
    return bool(ok.all())


def binade_ok(f, scale, lo, hi, k, d, budget, monotone):
    key0, n, starts, widths, ta, tb = S.binade_segments(lo, hi, k, "float32")
    _, _, ok = S._fit_all(f, scale, d, budget, monotone, starts, widths, ta, tb)
    return bool(ok.all()), n


def switch_in_user_units(ts):
    inp = ts.inputs[0]
    sw = Q.SATURATION_SWITCH.get(inp.quantity)
    if sw is None:
        return None
    return (sw - inp.offset) / inp.scale


def first_f32_at_or_above(v):
    v32 = F32(v)
    if float(v32) < v:
        v32 = np.nextafter(v32, F32(np.inf))
    return float(v32)


def forced_break_diagnostic(c, f, scale, budget):
    """Where the forced breakpoint sits against the core's own step, and what free gives when
    the breakpoint is moved to the first float32 on the upper equation's side."""
    ts, table = c["ts"], c["table"]
    pw = table.piecewise
    xb = float(table.forced_breaks[0])
    sw = switch_in_user_units(ts)
    if sw is None:
        return
    x3 = np.array([float(np.nextafter(F32(xb), F32(-np.inf))), xb,
                   float(np.nextafter(F32(xb), F32(np.inf)))])
    fx = f(x3)
    below = abs(fx[1] - fx[0]) / float(scale(fx[1:2])[0]) / ts.tol_value
    above = abs(fx[2] - fx[1]) / float(scale(fx[1:2])[0]) / ts.tol_value
    unit = ts.inputs[0].unit
    print(f"        forced break: float32 {xb:.9g} {unit}, core switch at {sw:.9g}; core step "
          f"into the break {below:.2g} tol, out of it to the next float {above:.2g} tol")
    if not (above > 1e-3 and above > 10 * below):
        return
    up = first_f32_at_or_above(sw)
    print("        -> the break is one float32 below the core's step: a segment starting at "
          "the break begins on the lower equation")
    d = pw.degree
    hi = float(pw.hi)
    one = bool(_accept(f, scale, xb, [hi], d, budget, table.monotone)[0])
    coord = "log" if pw.lo > 0 and pw.hi / pw.lo > 4.0 else "linear"
    pf = S.place_free(f, scale, xb, hi, d, budget, "float32", table.monotone, coord)
    print(f"        place_free on [{xb:.9g}, {hi:.9g}] degree {d} at the same budget: "
          f"{'None (gives up)' if pf is None else str(len(pf[2])) + ' segments'}; the whole "
          f"piece as one segment {'passes' if one else 'fails'} the same check")
    ref, stuck = greedy_count(f, scale, pw.lo, pw.hi, [up], d, budget, table.monotone)
    if ref is not None:
        print(f"        free greedy with the break at {up:.9g} (first float32 >= switch), "
              f"degree {d}, same budget: {ref} segments")
    best = None
    t0 = time.perf_counter()
    for dd in range(1, 6):
        res = B._fit_candidate("free", dd, f, scale, pw.lo, pw.hi, ts.tol_value, table.floor,
                               "float32", table.monotone, coord, [up], ts)
        pwf, v = res[0], res[1]
        if pwf is not None and (best is None or pwf.storage_bytes < best[0].storage_bytes):
            best = (pwf, v)
    secs = time.perf_counter() - t0
    if best is None:
        print(f"        h2olut's free candidates with the break at {up:.9g}: none met "
              f"({secs:.1f} s)")
    else:
        pwf, v = best
        print(f"        h2olut's free candidates with the break at {up:.9g}: best degree "
              f"{pwf.degree}, {pwf.nseg} segments, {pwf.storage_bytes} bytes (quick check "
              f"{tol_text(ts, v['max_error'])}) vs chosen {pw.storage_bytes} bytes ({secs:.1f} s)")
        vf = verify_table(pwf, f, scale, ts.verify_points, 20240601, table.monotone, [up])
        print(f"        full check of that table: {tol_text(ts, vf['max_error'])} on "
              f"{vf['points']} points, {vf.get('monotone_reversals', 0)} order reversals")


# --------------------------------------------------------------------------------------------
# instructions per call

def callgrind_counts(exe, n, mode, fn, workdir):
    out = Path(workdir) / f"cg.{exe.name}.{n}.{mode}"
    subprocess.run(["valgrind", "--tool=callgrind", f"--callgrind-out-file={out}", str(exe),
                    str(n), str(mode)], check=True, capture_output=True, timeout=300)
    text = out.read_text()
    m = re.search(r"^(?:summary|totals):\s*(\d+)", text, re.M)
    total = int(m.group(1))
    ann = subprocess.run(["callgrind_annotate", "--inclusive=yes", "--threshold=100", str(out)],
                         check=True, capture_output=True, text=True).stdout
    own = 0
    for line in ann.splitlines():
        m = re.match(r"^\s*([\d,]+)\s.*[:\s]" + re.escape(fn) + r"(?:\s|$|'|\[)", line)
        if m:
            own = int(m.group(1).replace(",", ""))
            break
    return total, own


def perf_works():
    try:
        r = subprocess.run(["perf", "stat", "-x,", "-e", "instructions:u", "true"],
                           capture_output=True, text=True, timeout=30)
    except (OSError, subprocess.SubprocessError):
        return False
    return r.returncode == 0 and "not supported" not in r.stderr and "<not" not in r.stderr


def object_table_bytes(obj, priv):
    """Bytes of the static const arrays of one table in the compiled object (nm -S)."""
    r = subprocess.run(["nm", "-S", str(obj)], capture_output=True, text=True, check=True)
    total = 0
    for line in r.stdout.splitlines():
        parts = line.split()
        if len(parts) == 4 and parts[3].startswith(priv + "_") and parts[2] in "rRdD":
            total += int(parts[1], 16)
    return total


# --------------------------------------------------------------------------------------------

def tree_state():
    """HEAD commit and whether gen/ or templates/ differ from it (figures belong to that)."""
    root = HERE.parent
    try:
        head = subprocess.run(["git", "rev-parse", "--short", "HEAD"], cwd=root, text=True,
                              capture_output=True, check=True).stdout.strip()
        dirty = subprocess.run(["git", "status", "--porcelain", "--", "gen", "templates"],
                               cwd=root, text=True, capture_output=True,
                               check=True).stdout.split("\n")
    except (OSError, subprocess.SubprocessError):
        return "not a git checkout"
    n = sum(1 for line in dirty if line.strip())
    return f"HEAD {head}" + (f", {n} uncommitted changes under gen/ templates/" if n else "")


def main():
    t_start = time.perf_counter()
    spec = parse_spec(SPEC, "bench_tables.toml")
    print("h2olut benchmark: four float32 saturation tables, goal 'smallest'")
    print(f"python {sys.version.split()[0]}, numpy {np.__version__}, {os.cpu_count()} CPUs")
    print(f"tree: {tree_state()}")
    print()

    # ---- build
    print("== build (gen.build.build_table, per table) ==")
    cases = []
    for ts in spec.tables:
        table, secs, spans, budgets = build_case(ts)
        pw = table.piecewise
        v = table.verification
        slow = sorted(spans, reverse=True)[:3]
        print(f"{ts.name:7s} {pw.layout} degree {pw.degree}, {pw.nseg} segments, "
              f"{pw.storage_bytes} bytes; verified max error {tol_text(ts, v['max_error'])} "
              f"(tolerance {tol_text(ts, ts.tol_value)}) on {v['points']} points; "
              f"build {secs:.1f} s")
        print("        slowest steps: " + ", ".join(f"{m} {s:.1f} s" for s, m in slow))
        unmet = {}
        for row in table.candidates:
            if not row["met"]:
                unmet.setdefault(row.get("why", "not met"), []).append(
                    f"{row['layout']}{row['degree']}")
        for why, names in unmet.items():
            print(f"        not kept ({why}): {' '.join(names)}")
        cases.append({"ts": ts, "table": table, "secs": secs, "budgets": budgets})
    print()

    # ---- storage against the uniform linear baseline
    print("== storage: h2olut table vs uniform linear table in the raw input ==")
    print("baseline: N equal intervals over the input range as given, N+1 float32 values Y and")
    print("2 float32 constants (x0, 1/h); y = Y[i] + t*(Y[i+1]-Y[i]) emulated in float32; its")
    print("error measured against the core at every interval middle, 2 more seeded points per")
    print("interval and 100000 random points (half uniform, half log-uniform), smallest N by")
    print("bisection, then confirmed on 8 points per interval, node neighbours and 200000 more.")
    print("Rounding the stored values to float32 moves the maximum by about 1e-3 of it, so")
    print("pass/fail flickers over a few hundredths of a percent of N: N is where the bisection")
    print("lands, the smallest N only to that precision.")
    for c in cases:
        ts, table = c["ts"], c["table"]
        pw = table.piecewise
        f = B.core_function(ts)
        scale = B.error_scale(ts.tol_kind)
        t0 = time.perf_counter()
        base = baseline_search(f, scale, pw.lo, pw.hi, ts.tol_value)
        c["baseline"] = base
        ratio = base["bytes"] / pw.storage_bytes
        target = RATIO_TARGET[ts.name]
        print(f"{ts.name:7s} baseline N={base['n']} ({base['n'] + 1} values, {base['bytes']} "
              f"bytes, max error {tol_text(ts, base['error'], 6)} on {base['points']} points; "
              f"N-1 gives {tol_text(ts, base['error_n_minus_1'], 6)}"
              f"{' (also within)' if base['error_n_minus_1'] <= ts.tol_value else ''}; "
              f"{base['trials']} trials, "
              f"{time.perf_counter() - t0:.1f} s)")
        print(f"        h2olut {pw.storage_bytes} bytes -> ratio {ratio:.1f}x "
              f"(target >= {target:g}x) {verdict(ratio >= target)}")
    print()

    # ---- segment counts against the greedy reference
    print("== segments: chosen table vs fine greedy reference ==")
    print("reference: from each start, the longest segment whose float64 Chebyshev-Lobatto fit of")
    print("the same degree meets the same budget on the same check points (and the same")
    print("monotonicity test), its end searched over float32 values by 64-way sections down to")
    print("adjacent floats; split at the same forced breakpoints. Budget = the float64 fit budget")
    print("of the kept fit of that candidate (after any refits).")
    for c in cases:
        ts, table = c["ts"], c["table"]
        pw = table.piecewise
        f = B.core_function(ts)
        scale = B.error_scale(ts.tol_kind)
        mono = table.monotone
        breaks = table.forced_breaks
        d = pw.degree
        budget = fit_budget(c, pw.layout, d)
        print(f"{ts.name:7s} chosen {pw.layout} degree {d}: {pw.nseg} segments at budget "
              f"{tol_text(ts, budget)}")
        if pw.layout == "free":
            ref, stuck = greedy_count(f, scale, pw.lo, pw.hi, breaks, d, budget, mono)
            if ref is None:
                print(f"        reference greedy: no segment fits from {stuck:.9g}")
            else:
                r = pw.nseg / ref
                print(f"        reference greedy: {ref} segments -> ratio {r:.3f} "
                      f"(target <= {GREEDY_TARGET:g}) {verdict(r <= GREEDY_TARGET)}")
        elif pw.layout == "uniform":
            smaller = [m for m in range(max(1, pw.nseg - 3), pw.nseg)
                       if uniform_ok(f, scale, pw.lo, pw.hi, m, d, budget, mono)]
            best = min(smaller) if smaller else pw.nseg
            r = pw.nseg / best
            print(f"        within the uniform layout: {pw.nseg - 3}..{pw.nseg - 1} equal "
                  f"segments checked, smallest meeting the budget {best} -> ratio {r:.3f} "
                  f"{verdict(r <= GREEDY_TARGET)}")
        else:
            ok_below = pw.k > 0 and binade_ok(f, scale, pw.lo, pw.hi, pw.k - 1, d, budget,
                                              mono)[0]
            print(f"        within the binade layout: k={pw.k} ({2 ** pw.k} per octave); "
                  f"k-1 {'meets the budget too' if ok_below else 'does not exist' if pw.k == 0 else 'fails'}"
                  f" -> ratio 1.000 {verdict(not ok_below)}")
        if pw.layout != "free":
            ref, stuck = greedy_count(f, scale, pw.lo, pw.hi, breaks, d, budget, mono)
            if ref is None:
                print(f"        free greedy, degree {d}, same budget: impossible, no segment "
                      f"fits from {stuck:.9g} {ts.inputs[0].unit}")
            else:
                print(f"        free greedy, degree {d}, same budget: {ref} segments; chosen/free "
                      f"{pw.nseg / ref:.2f} ({pw.layout} stores {pw.storage_bytes} bytes, free "
                      f"would store {ref * (d + 3) * 4}: {pw.layout} keeps no breakpoints)")
            row = next((r for r in table.candidates
                        if r["layout"] == "free" and r["degree"] == d), None)
            if row is not None and row["met"]:
                fb = fit_budget(c, "free", d)
                ref3, _ = greedy_count(f, scale, pw.lo, pw.hi, breaks, d, fb, mono)
                if ref3:
                    r = row["segments"] / ref3
                    print(f"        h2olut's own free candidate, degree {d}: {row['segments']} "
                          f"segments at budget {tol_text(ts, fb)}; reference {ref3} -> ratio "
                          f"{r:.3f} (target <= {GREEDY_TARGET:g}) {verdict(r <= GREEDY_TARGET)}")
            elif row is not None:
                print(f"        h2olut's own free candidate, degree {d}: not met")
        if breaks:
            forced_break_diagnostic(c, f, scale, budget)
    print()

    # ---- instructions per call
    print("== instructions per call (gcc -O2 -std=c99, x86-64, valgrind callgrind) ==")
    tables = [c["table"] for c in cases]
    t0 = time.perf_counter()
    files = render_outputs(spec, tables)
    print(f"render_outputs: {len(files)} files in {time.perf_counter() - t0:.1f} s")
    print(f"perf stat -e instructions: {'usable' if perf_works() else 'not supported here'}; "
          f"using callgrind")
    cc = shutil.which("gcc") or shutil.which("cc")
    if cc is None or shutil.which("valgrind") is None:
        print("no C compiler or valgrind: skipped")
    else:
        with tempfile.TemporaryDirectory(prefix="h2olut_bench_") as tmp:
            for name, data in files.items():
                (Path(tmp) / name).write_bytes(data)
            src = Path(tmp) / f"{spec.name}.c"
            obj = Path(tmp) / f"{spec.name}.o"
            subprocess.run([cc, "-O2", "-std=c99", "-c", str(src), "-o", str(obj)], check=True)
            print(f"{'table':7s} {'per call':>9s} {'driver':>9s} {'program':>9s}  object "
                  f"bytes   verdict")
            for c in cases:
                ts, pw = c["ts"], c["table"].piecewise
                exe = Path(tmp) / f"drv_{ts.name}"
                subprocess.run([cc, "-O2", "-std=c99", f"-DFN={ts.function}",
                                f"-DLO={float(pw.lo)!r}", f"-DHI={float(pw.hi)!r}",
                                str(DRIVER), str(obj), "-o", str(exe)], check=True)
                r = {}
                for n in CALL_N:
                    for mode in (1, 0):
                        r[(n, mode)] = callgrind_counts(exe, n, mode, ts.function, tmp)
                dn = CALL_N[1] - CALL_N[0]
                own = (r[(CALL_N[1], 1)][1] - r[(CALL_N[0], 1)][1]) / dn
                prog = (r[(CALL_N[1], 1)][0] - r[(CALL_N[0], 1)][0]) / dn
                loop = (r[(CALL_N[1], 0)][0] - r[(CALL_N[0], 0)][0]) / dn
                priv = ts.function[:len(ts.function) - len(ts.name) - 1] + "__" + ts.name
                ob = object_table_bytes(obj, priv)
                print(f"{ts.name:7s} {own:9.1f} {loop:9.1f} {prog:9.1f}  {ob:6d} "
                      f"(h2olut says {pw.storage_bytes})  "
                      f"{verdict(own <= INSN_TARGET)} (target <= {INSN_TARGET:g})")
            print("per call: the function's own instructions (callgrind, inclusive),")
            print(f"  (count at N={CALL_N[1]} - count at N={CALL_N[0]}) / {dn}, inputs uniform "
                  f"over the range;")
            print("program: whole-program difference / N (includes making the inputs and the "
                  "loop);")
            print("driver: the same driver with the call replaced by an add (inputs and loop "
                  "only).")
    print()

    # ---- demo build wall time
    print("== h2olut build on the demo spec (wall time, 3 runs) ==")
    exe = shutil.which("h2olut")
    cmd = [exe, "build"] if exe else [sys.executable, "-m", "gen.cli", "build"]
    times = []
    print("load average before: " + " ".join(f"{v:.2f}" for v in os.getloadavg()))
    for _ in range(3):
        with tempfile.TemporaryDirectory(prefix="h2olut_demo_") as tmp:
            t0 = time.perf_counter()
            subprocess.run(cmd + ["--out", tmp], check=True, capture_output=True)
            times.append(time.perf_counter() - t0)
    med = statistics.median(times)
    print("runs: " + ", ".join(f"{t:.2f} s" for t in times))
    print(f"median {med:.2f} s on {os.cpu_count()} CPUs (target <= {DEMO_TARGET:g} s) "
          f"{verdict(med <= DEMO_TARGET)}")
    # where the time goes, in this process (imports already done)
    from gen import cli as C
    from gen.outputs import build_spec
    from gen.spec import load_spec
    demo = load_spec(C._demo_path())
    t0 = time.perf_counter()
    dt = build_spec(demo)
    t1 = time.perf_counter()
    render_outputs(demo, dt)
    t2 = time.perf_counter()
    print(f"in-process split (one run): fit and verify {t1 - t0:.2f} s, render outputs "
          f"(C, Python, report, {len(dt)} error plots) {t2 - t1:.2f} s; the rest of a run is "
          f"interpreter start-up and imports")
    print()
    print(f"total bench time {time.perf_counter() - t_start:.0f} s")


if __name__ == "__main__":
    main()
