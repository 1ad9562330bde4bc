#!/usr/bin/env python3
"""Measured figures for four float32 two-input tables built by the grid engine.

Run from the repository root:  python bench/grids.py [--runs N]
Per case, for goal "smallest" and for goal "fastest" (each built on its own, with its own
saturation helper): stored bytes of the chosen table (the helper included) against the
fewest-node uniform bilinear grid in the raw inputs that meets the same tolerance on the same
kind of verification, the ratio, and instructions per call of the compiled C (valgrind
callgrind, difference of two call counts), with a verdict on the two targets (ratio >= 10x and
<= 120 instructions). Two baselines: with the core's value at every node (the other phase where
a node falls beyond saturation; the ratio the target is about), and with the domain phase's own
equation continued past saturation (a careful hand-made table; much smaller). Every candidate of
the "smallest" build is listed with its measured instructions, and the one the "fastest" rule
takes from those same fits is marked. Then the wall time of building all four on two cores for
each goal (median of N runs; the CPU time of each case beside it, since other work on the
machine stretches the wall time). A measurement script, not a test: it exits 0 whatever the
figures.
"""

import argparse
import os
import shutil
import statistics
import subprocess
import sys
import tempfile
import time
from concurrent.futures import ProcessPoolExecutor
from pathlib import Path

import numpy as np

HERE = Path(__file__).resolve().parent
sys.path.insert(0, str(HERE.parent))

from gen import arith  # noqa: E402
from gen.emit.common import template_env  # noqa: E402
from gen.emit.grid2d import grid_c_context  # noqa: E402
from gen.fit import grid2d as G  # noqa: E402

F32 = np.float32
RATIO_TARGET = 10.0
INSN_TARGET = 120.0
BUILD_TARGET = 20.0
CALL_N = (1000, 11000)
WORKERS = 2


def cases():
    """name -> (domain, tolerance kind, tolerance, text)."""
    return {
        "rho_steam": (G.make_domain("density", "vapor", 0.1, 4.0, 5.0, 450.0, near_rel=True,
                                    far_rel=False, p_unit="MPa", v_unit="degC"),
                      "rel", 1e-3, "superheated steam density, 0.1-4 MPa, T_sat+5 K to 450 degC, "
                                   "0.1 %"),
        "h_steam": (G.make_domain("specific_enthalpy", "vapor", 0.1, 4.0, 5.0, 450.0,
                                  near_rel=True, far_rel=False, p_unit="MPa", v_unit="degC",
                                  out_unit="kJ/kg"),
                    "abs", 0.5, "superheated steam enthalpy, same domain, 0.5 kJ/kg"),
        "rho_water": (G.make_domain("density", "liquid", 0.1, 10.0, 5.0, 95.0, near_rel=True,
                                    far_rel=True, p_unit="MPa", v_unit="degC"),
                      "rel", 2e-4, "compressed water density, 0.1-10 MPa, 5-95 K below "
                                   "saturation, 0.02 %"),
        "T_ph": (G.make_domain("temperature", "vapor", 0.1, 4.0, 0.0, 3300.0, near_rel=True,
                               far_rel=False, second="specific_enthalpy", p_unit="MPa",
                               v_unit="kJ/kg", out_unit="degC"),
                 "abs", 0.1, "temperature from (p, h), superheated steam 0.1-4 MPa, h'' to "
                             "3300 kJ/kg, 0.1 K"),
    }


def verdict(ok):
    return "PASS" if ok else "MISS"


def err_text(kind, v, unit):
    return f"{v * 100:.4g} %" if kind == "rel" else f"{v:.4g} {unit}"


def build_one(job):
    name, goal = job
    dom, kind, tol, _ = cases()[name]
    t0, c0 = time.perf_counter(), time.process_time()
    gt = G.build_grid(dom, kind, tol, goal=goal)
    return name, gt, time.perf_counter() - t0, time.process_time() - c0


def build_all(goal="smallest"):
    """All four cases on WORKERS processes; (tables by name, (wall, cpu) seconds per case,
    wall time of the whole)."""
    t0 = time.perf_counter()
    with ProcessPoolExecutor(max_workers=WORKERS) as ex:
        got = list(ex.map(build_one, [(n, goal) for n in
                                      ("T_ph", "rho_steam", "h_steam", "rho_water")]))
    wall = time.perf_counter() - t0
    return {n: gt for n, gt, _, _ in got}, {n: (s, c) for n, _, s, c in got}, wall


# --------------------------------------------------------------------------------------------
# baseline: uniform bilinear in the raw inputs (p, T) or (p, h), float32, O(1) index


def node_function(dom, kind):
    """Node values of a baseline grid: ``core``, the core wherever a node falls (the other
    phase beyond saturation, the plain reading of "a grid in raw (p, T)"); ``continued``, the
    domain phase's own equation continued past saturation (what a careful hand-made table
    would store, and the kindest baseline)."""
    if kind == "core":
        return dom.core
    return lambda p, v: G.extension(dom, p, v)


class Baseline:
    """A raw-input uniform grid as a :class:`gen.fit.grid2d.Grid2D` (coordinate ``raw``,
    no helper), so that it runs through the same emulation."""

    def __init__(self, dom, nx, ny, f, box):
        ft = F32
        self.nx, self.ny = nx, ny
        xa = G.uniform_axis(dom.p_lo, dom.p_hi, nx, "float32")
        ya = G.uniform_axis(box[0], box[1], ny, "float32")
        P = np.repeat(xa.lines, ny)
        V = np.tile(ya.lines, nx)
        z = f(P, V).reshape(nx, ny)
        # nodes no cell of the domain uses may be anything finite
        z = np.where(np.isfinite(z) & (np.abs(z) < 1e30), z, 0.0)
        self.grid = G.Grid2D(method="bilinear", fmt="float32", x=xa, y=ya,
                             z=arith.to_format(z, "float32").astype(np.float64), coord="raw",
                             side=0, near=float(ft(box[0])), far=float(ft(box[1])),
                             near_rel=False, far_rel=False)

    @property
    def storage_bytes(self):
        return 4 * self.nx * self.ny + 4 * 4       # nodes, and x0, inv_h of both axes


def baseline_search(gt, kind):
    """Fewest nx * ny of a raw uniform bilinear grid within tolerance (node values from
    :func:`node_function`), checked on 40 000 seeded domain points plus the cell centres: a
    feasible start by doubling, coordinate descent by bisection on each count, and six other
    aspect ratios; the winner is confirmed on 200 000 more points plus a 3 x 3 sub-grid in
    every cell (ny stepped up while it fails). None when no grid below 4 million nodes meets
    the tolerance."""
    dom = gt.domain
    prob = G.Problem(dom, gt.tol_kind, gt.tol, "float32")
    f = node_function(dom, kind)
    pd = np.linspace(dom.p_lo, dom.p_hi, 2049)
    near, far = dom.limits(pd)
    box = (float(np.min(np.minimum(near, far))), float(np.max(np.maximum(near, far))))
    p, v = prob.random_inputs(40_000, 11)
    # and the edges, with rows just inside the limit nearest saturation, where raw cells that
    # reach across the saturation line hurt first
    pe, ve = prob.edge_inputs(2049)
    pn = (np.geomspace(dom.p_lo, dom.p_hi, 2049) if dom.p_lo > 0
          else np.linspace(dom.p_lo, dom.p_hi, 2049))
    ln, lf = dom.limits(pn)
    rows = [(pn, ln + a * (lf - ln)) for a in (1e-3, 3e-3, 1e-2, 3e-2, 0.1)]
    p = np.concatenate([p, pe] + [r[0] for r in rows])
    v = np.concatenate([v, ve] + [r[1] for r in rows])
    truth = prob.f(p, v)
    sc = prob.scale(truth)
    trials = 0
    limit = 4_000_000

    def inside(P, V):
        n, fa = dom.limits(P)
        return (V >= np.minimum(n, fa)) & (V <= np.maximum(n, fa))

    def err(nx, ny, P=p, V=v, T=truth, S=sc, sub=1):
        nonlocal trials
        trials += 1
        b = Baseline(dom, nx, ny, f, box)
        xs, ys = b.grid.x.lines, b.grid.y.lines
        off = (np.arange(sub) + 0.5) / sub + (0.043 / sub if sub > 1 else 0.0)
        cx = (xs[:-1, None] + np.diff(xs)[:, None] * off[None, :]).ravel()
        cy = (ys[:-1, None] + np.diff(ys)[:, None] * off[None, :]).ravel()
        if cx.size * cy.size > 2_000_000:
            cx = cx[::max(1, int(cx.size * cy.size // 2_000_000))]
        Pc, Vc = np.repeat(cx, cy.size), np.tile(cy, cx.size)
        keep = inside(Pc, Vc)
        Pc, Vc = Pc[keep], Vc[keep]
        Tc = prob.f(Pc, Vc)
        PP, VV = np.concatenate([P, Pc]), np.concatenate([V, Vc])
        TT = np.concatenate([T, Tc])
        SS = np.concatenate([S, prob.scale(Tc)])
        e = np.abs(b.grid(PP, VV).astype(np.float64) - TT) / SS
        return float(np.nanmax(e)), b, int(PP.size)

    cache = {}

    def ok(nx, ny):
        if (nx, ny) not in cache:
            cache[(nx, ny)] = nx * ny <= limit and err(nx, ny)[0] <= gt.tol
        return cache[(nx, ny)]

    def fewest(fixed, axis, hi):
        """Fewest lines on ``axis`` (0: nx, 1: ny) with the other fixed, at most ``hi``."""
        pair = (lambda n: (n, fixed)) if axis == 0 else (lambda n: (fixed, n))
        if not ok(*pair(hi)):
            return None
        lo = 1
        while hi - lo > 1:
            mid = (lo + hi) // 2
            if ok(*pair(mid)):
                hi = mid
            else:
                lo = mid
        return hi

    # a feasible start: both counts doubled from 8 until the tolerance is met
    nx = ny = 8
    while not ok(nx, ny):
        nx, ny = 2 * nx, 2 * ny
        if nx * ny > limit:
            return None
    # coordinate descent, then other aspect ratios at no more nodes than the best
    for _ in range(3):
        nx = fewest(ny, 0, nx)
        ny = fewest(nx, 1, ny)
    for aspect in (0.35, 0.5, 0.7, 1.4, 2.0, 2.8):
        n2 = max(2, int(round(nx * aspect)))
        m2 = fewest(n2, 1, (nx * ny) // n2 + 1)
        if m2 is not None and n2 * m2 < nx * ny:
            nx, ny = n2, m2
            ny = fewest(nx, 1, ny)
            nx = fewest(ny, 0, nx)
    pd_, vd_ = prob.random_inputs(200_000, 12)
    td_ = prob.f(pd_, vd_)
    pd_, vd_ = np.concatenate([pd_, p]), np.concatenate([vd_, v])
    td_ = np.concatenate([td_, truth])
    for _ in range(40):
        e, b, npts = err(nx, ny, pd_, vd_, td_, prob.scale(td_), sub=3)
        if e <= gt.tol:
            break
        nx, ny = nx + max(1, nx // 100), ny + max(1, ny // 100)
    else:
        return None
    e_below = err(nx, ny - 1, pd_, vd_, td_, prob.scale(td_), sub=3)[0]
    return {"nx": nx, "ny": ny, "bytes": b.storage_bytes, "error": e, "points": npts,
            "error_ny_minus_1": e_below, "trials": trials, "box": box}


# --------------------------------------------------------------------------------------------
# instructions per call

DRIVER = r"""#include <stdint.h>
#include <stdlib.h>
float FN(float p, float v);
static const float pts[1024][2] = {
%s
};
volatile float sink;
/* drv N mode: mode 1 calls FN N times over 1024 fixed domain points, mode 0 adds them only */
int main(int argc, char **argv)
{
    long n = argc > 1 ? atol(argv[1]) : 1000, i;
    int mode = argc > 2 ? atoi(argv[2]) : 1;
    float acc = 0.0f;
    if (mode) {
        for (i = 0; i < n; i++) {
            acc += FN(pts[i & 1023][0], pts[i & 1023][1]);
        }
    } else {
        for (i = 0; i < n; i++) {
            acc += pts[i & 1023][0] + pts[i & 1023][1];
        }
    }
    sink = acc;
    return 0;
}
"""

SOURCE = r"""#include <stdint.h>
#include <string.h>
#include <math.h>
#define B_IN_RANGE 0
#define B_BELOW 1
#define B_ABOVE 2
#define B_NOT_A_NUMBER 3
{{ grid2d_decl(g, "B") }}
{{ grid2d(g, "B") }}
"""


def callgrind(exe, n, mode, fn, workdir):
    import re
    out = Path(workdir) / f"cg.{exe.name}.{n}.{mode}"
    subprocess.run(["valgrind", "--tool=callgrind", f"--callgrind-out-file={out}", str(exe),
                    str(n), str(mode)], check=True, capture_output=True, timeout=300)
    total = int(re.search(r"^(?:summary|totals):\s*(\d+)", out.read_text(), re.M).group(1))
    ann = subprocess.run(["callgrind_annotate", "--inclusive=yes", "--threshold=100", str(out)],
                         check=True, capture_output=True, text=True).stdout
    own = 0
    for line in ann.splitlines():
        m = re.match(r"^\s*([\d,]+)\s.*[:\s]" + re.escape(fn) + r"(?:\s|$|'|\[)", line)
        if m:
            own = int(m.group(1).replace(",", ""))
            break
    return total, own


def object_bytes(obj, priv):
    r = subprocess.run(["nm", "-S", str(obj)], capture_output=True, text=True, check=True)
    total = 0
    for line in r.stdout.splitlines():
        parts = line.split()
        if len(parts) == 4 and parts[3].startswith(priv + "_") and parts[2] in "rRdD":
            total += int(parts[1], 16)
    return total


def instructions(gt, workdir, tag):
    """(instructions per call, object table bytes) of the table's compiled C (gcc -O2)."""
    cc = shutil.which("gcc") or shutil.which("cc")
    d = Path(workdir) / tag
    d.mkdir(parents=True, exist_ok=True)
    fn = "b_grid"
    env = template_env()
    src = env.from_string('{% from "c_grid2d.j2" import grid2d, grid2d_decl %}' + SOURCE)
    ctx = grid_c_context(gt, fn, "grid")
    (d / "g.c").write_text(src.render(g=ctx))
    prob = G.Problem(gt.domain, gt.tol_kind, gt.tol, "float32")
    p, v = prob.random_inputs(1024, 7)
    rows = ",\n".join(f"    {{ {float(F32(a)).hex()}f, {float(F32(b)).hex()}f }}"
                      for a, b in zip(p, v))
    (d / "drv.c").write_text(DRIVER.replace("FN", fn) % rows)
    subprocess.run([cc, "-O2", "-std=c99", "-c", str(d / "g.c"), "-o", str(d / "g.o")],
                   check=True)
    subprocess.run([cc, "-O2", "-std=c99", str(d / "drv.c"), str(d / "g.o"), "-o",
                    str(d / "drv"), "-lm"], check=True)
    exe = d / "drv"
    a = callgrind(exe, CALL_N[0], 1, fn, d)
    b = callgrind(exe, CALL_N[1], 1, fn, d)
    return (b[1] - a[1]) / (CALL_N[1] - CALL_N[0]), object_bytes(d / "g.o", ctx["priv"])


# --------------------------------------------------------------------------------------------


def describe(r):
    lay = r["x_layout"] if r["x_layout"] == r["y_layout"] else f"{r['x_layout']}/{r['y_layout']}"
    return f"{r['method']:8s} {lay:7s} {r['coord']:10s}"


def main():
    ap = argparse.ArgumentParser()
    ap.add_argument("--runs", type=int, default=3, help="build runs for the median (default 3)")
    args = ap.parse_args()
    t_start = time.perf_counter()
    print("h2olut bench/grids.py: four float32 two-input tables")
    print(f"machine: {os.cpu_count()} CPUs; load average " +
          " ".join(f"{x:.2f}" for x in os.getloadavg()))
    print()

    # ---- build time, for both goals
    built, meds = {}, {}
    for goal in ("smallest", "fastest"):
        print(f"== build, goal \"{goal}\": all four cases on {WORKERS} worker processes, "
              f"{args.runs} runs ==")
        walls, per_case = [], []
        for _ in range(args.runs):
            tables, secs, wall = build_all(goal)
            walls.append(wall)
            per_case.append(secs)
        built[goal] = tables
        meds[goal] = med = statistics.median(walls)
        for name in cases():
            s = statistics.median(pc[name][0] for pc in per_case)
            c = statistics.median(pc[name][1] for pc in per_case)
            print(f"  {name:10s} {s:6.2f} s, {c:6.2f} s CPU (medians of its own build)")
        print("  all four: runs " + ", ".join(f"{w:.2f} s" for w in walls) +
              f"; median {med:.2f} s (target <= {BUILD_TARGET:g} s) "
              f"{verdict(med <= BUILD_TARGET)}; load average now "
              + " ".join(f"{x:.2f}" for x in os.getloadavg()))
        print()
    tables, fastest = built["smallest"], built["fastest"]

    have_cg = shutil.which("valgrind") is not None and (shutil.which("gcc") or shutil.which("cc"))
    summary = []
    with tempfile.TemporaryDirectory(prefix="h2olut_grids_") as tmp:
        for name, (dom, kind, tol, text) in cases().items():
            gt = tables[name]
            fast = fastest[name]
            print(f"== {name}: {text} ==")
            print(f"  domain: {G.describe_domain(dom)}")
            for note in gt.notes:
                print(f"  note: {note}")
            bases = {}
            for bk, words in (("core", "core values at every node (the other phase beyond "
                                       "saturation)"),
                              ("continued", "nodes beyond saturation from the phase's own "
                                            "continued equation")):
                t0 = time.perf_counter()
                b = baseline_search(gt, bk)
                bases[bk] = b
                if b is None:
                    print(f"  baseline ({words}): none below 4 million nodes")
                    continue
                print(f"  baseline ({words}): uniform bilinear in raw (p, {dom.second}) over "
                      f"{b['box'][0]:.6g}..{b['box'][1]:.6g} {dom.v_unit}: {b['nx']} x {b['ny']} "
                      f"nodes, {b['bytes']} bytes, max error "
                      f"{err_text(kind, b['error'], dom.out_unit)} on {b['points']} points (ny - 1 "
                      f"gives {err_text(kind, b['error_ny_minus_1'], dom.out_unit)}; "
                      f"{b['trials']} trials, {time.perf_counter() - t0:.1f} s)")
            # no raw grid of core values below 4 million nodes: its bytes are at least that
            lower = bases["core"] is None
            base = bases["core"] or {"bytes": 4 * 4_000_000 + 16}
            kindb = bases["continued"] or {"bytes": float("nan")}
            gt_ = "> " if lower else ""
            # the "fastest" rule applied to these same fits (the helper of goal "smallest")
            fi = next(i for i, r in enumerate(gt.choose("fastest").candidates) if r["chosen"])
            print("  candidates of the goal \"smallest\" build (each verified on its own "
                  "points, column 'points'):")
            print(f"  {'candidate':28s} {'nodes':>7s} {'bytes':>6s} {'ratio':>7s} {'ratio2':>7s} "
                  f"{'est.ops':>7s} {'insns':>7s} {'obj.B':>6s} {'points':>7s}  max error")
            measured = {}
            for i, r in enumerate(gt.candidates):
                if not r["met"]:
                    print(f"  {describe(r)}  not met: {r.get('why')}")
                    continue
                g, v = gt.fits[i]
                one = G.GridTable(dom, g, v, gt.candidates, kind, tol, gt.goal, gt.floor,
                                  gt.helper)
                ins, ob = instructions(one, tmp, f"{name}_{i}") if have_cg else (float("nan"), 0)
                measured[i] = ins
                mark = (["smallest"] if r["chosen"] else []) + (["fastest rule"] if i == fi
                                                                 else [])
                print(f"  {describe(r)} {r['nx']:3d}x{r['ny']:<3d} {r['storage_bytes']:6d} "
                      f"{gt_}{base['bytes'] / r['storage_bytes']:6.1f}x "
                      f"{kindb['bytes'] / r['storage_bytes']:6.1f}x {r['estimated_ops']:7d} "
                      f"{ins:7.1f} {ob:6d} {r['points']:7d}  "
                      f"{err_text(kind, r['max_error'], dom.out_unit)}"
                      f"{'  <- ' + ', '.join(mark) if mark else ''}")
            ci = next(i for i, r in enumerate(gt.candidates) if r["chosen"])
            ins_fast = instructions(fast, tmp, f"{name}_fast")[0] if have_cg else float("nan")
            fr = next(r for r in fast.candidates if r["chosen"])
            rs = base["bytes"] / gt.candidates[ci]["storage_bytes"]
            rf = base["bytes"] / fast.grid.storage_bytes
            rs2 = kindb["bytes"] / gt.candidates[ci]["storage_bytes"]
            rf2 = kindb["bytes"] / fast.grid.storage_bytes
            both_s = rs >= RATIO_TARGET and measured[ci] <= INSN_TARGET
            both_f = rf >= RATIO_TARGET and ins_fast <= INSN_TARGET
            both = [i for i in measured if measured[i] <= INSN_TARGET
                    and base["bytes"] / gt.candidates[i]["storage_bytes"] >= RATIO_TARGET]
            print(f"  goal smallest: {describe(gt.candidates[ci]).strip()}, "
                  f"{gt.grid.storage_bytes} bytes, ratio {gt_}{rs:.1f}x (target >= "
                  f"{RATIO_TARGET:g}x) {verdict(rs >= RATIO_TARGET)}, {rs2:.1f}x against the "
                  f"continued-equation baseline; {measured[ci]:.1f} instructions per call "
                  f"(target <= {INSN_TARGET:g}) {verdict(measured[ci] <= INSN_TARGET)}; both "
                  f"targets {verdict(both_s)}; verified on {gt.verification['points']} points")
            print(f"  goal fastest (its own build): {describe(fr).strip()}, "
                  f"{fast.grid.nx} x {fast.grid.ny}, helper "
                  f"{fast.grid.helper.layout if fast.grid.helper else 'none'}, "
                  f"{fast.grid.storage_bytes} bytes, ratio {gt_}{rf:.1f}x "
                  f"{verdict(rf >= RATIO_TARGET)}, {rf2:.1f}x against the continued-equation "
                  f"baseline; {ins_fast:.1f} instructions per call "
                  f"{verdict(ins_fast <= INSN_TARGET)}; max error "
                  f"{err_text(kind, fast.verification['max_error'], dom.out_unit)} on "
                  f"{fast.verification['points']} points; both targets {verdict(both_f)}")
            k = None
            if both:
                k = min(both, key=lambda i: gt.candidates[i]["storage_bytes"])
                r = gt.candidates[k]
                print(f"  smallest candidate above meeting both: {describe(r).strip()}, "
                      f"{r['storage_bytes']} bytes (ratio {gt_}"
                      f"{base['bytes'] / r['storage_bytes']:.1f}x), {measured[k]:.1f} "
                      f"instructions per call")
            else:
                print("  smallest candidate above meeting both: none")
            summary.append({"name": name, "lt": gt_, "both": both_f, "rows": [
                ("smallest", describe(gt.candidates[ci]).strip(), gt.grid.storage_bytes, rs, rs2,
                 measured[ci], both_s),
                ("fastest", describe(fr).strip(), fast.grid.storage_bytes, rf, rf2, ins_fast,
                 both_f)]})
            print()
    print(f"== summary: targets ratio >= {RATIO_TARGET:g}x (against the raw grid of core "
          f"values) and <= {INSN_TARGET:g} instructions per call ==")
    print(f"  {'case':10s} {'goal':9s} {'table':28s} {'bytes':>6s} {'ratio':>10s} "
          f"{'ratio2':>7s} {'insns':>6s}  both targets")
    for s in summary:
        for goal, what, nb, ratio, ratio2, ins, ok in s["rows"]:
            print(f"  {s['name']:10s} {goal:9s} {what:28s} {nb:6d} {s['lt']:>2s}{ratio:7.1f}x "
                  f"{ratio2:6.1f}x {ins:6.1f}  {verdict(ok)}")
    n_ok = sum(s["both"] for s in summary)
    print(f"  goal \"fastest\" meets both targets in {n_ok} of {len(summary)} cases "
          f"(NEAR_FASTEST = {G.NEAR_FASTEST:g}): {verdict(n_ok == len(summary))}")
    for goal in ("smallest", "fastest"):
        print(f"  build of all four, goal \"{goal}\": median {meds[goal]:.2f} s on {WORKERS} "
              f"workers (target <= {BUILD_TARGET:g} s) {verdict(meds[goal] <= BUILD_TARGET)}")
    print("ratio2: against the raw grid with the phase's continued equation at nodes beyond "
          "saturation.")
    print("instructions: gcc -O2 -std=c99 on x86-64, callgrind inclusive count of the function "
          f"(helper inlined), (count at N={CALL_N[1]} - count at N={CALL_N[0]}) / "
          f"{CALL_N[1] - CALL_N[0]}, over 1024 fixed domain points.")
    print("bytes: the table's own arrays and its saturation helper's; 'obj.B' is what nm -S "
          "reports for them in the compiled object. Maximum errors are sampled measurements.")
    print(f"total bench time {time.perf_counter() - t_start:.0f} s")


if __name__ == "__main__":
    main()
