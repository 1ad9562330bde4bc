"""From a checked table spec to a verified fitted table.

``build_table(ts)`` wraps the core as a function of the user's units, measures the floor that
the number format itself imposes, fits every allowed (layout, degree) candidate with error
control (refitting with a tighter budget until the emulated target arithmetic meets the
tolerance), picks the one that best meets the goal, and verifies it densely.

Offers ``Table``, ``build_table(ts)``, ``BuildError``, ``core_function(ts)``,
``error_scale(kind)``, ``format_floor(...)``, ``format_range(lo, hi, fmt)``,
``monotone_sign(fx)``, ``estimated_ops(pw)``, ``build_helper_table(...)``.
"""

import hashlib
import math
from dataclasses import dataclass, field

import numpy as np

from . import arith
from . import quantities as Q
from .fit import segments as S
from .fit.piecewise import Piecewise1D
from .closedform import closed_form_for
from .verify import order_reversals, verify_table

#: points of the quick verification done for every candidate
QUICK_POINTS = 4_000
#: a candidate is accepted when its quick verification stays below this share of the tolerance
#: (a sampled maximum can miss the true one; the margin keeps the final check honest)
ACCEPT = 0.98
#: goal "smallest" takes the fastest candidate among those storing at most this share more
#: than the fewest bytes found
NEAR_SMALLEST = 0.10
#: most segments any table may have
S_MAX = 4096
#: refits per candidate before it is given up
MAX_REFITS = 6


class BuildError(ValueError):
    """A table that cannot be built as specified; one-line message."""


@dataclass
class Table:
    """One fitted, verified table: the value every emitter and the report read."""
    spec: object                 # gen.spec.TableSpec
    piecewise: Piecewise1D
    verification: dict
    candidates: list
    floor: float                 # error (tolerance units) from input/output rounding alone
    monotone: int                # +1 increasing, -1 decreasing, 0 neither, over the range
    forced_breaks: list = field(default_factory=list)
    notes: list = field(default_factory=list)
    budget: dict = None          # sensor error budget (gen.sensor.budget) when a sensor is given

    @property
    def name(self):
        return self.spec.name


@dataclass
class Table2D:
    """One two-input table: the spec and the chosen, verified grid (gen.fit.grid2d.GridTable)."""
    spec: object
    gt: object
    budget: dict = None          # sensor error budget (gen.sensor.budget_2d) when given

    @property
    def name(self):
        return self.spec.name

    @property
    def verification(self):
        return self.gt.verification

    @property
    def candidates(self):
        return self.gt.candidates

    @property
    def notes(self):
        return self.gt.notes


def build_grid_table(ts, progress=None):
    """Fit and verify a two-input table spec."""
    from .fit.grid2d import DomainError, build_grid
    try:
        gt = build_grid(ts.domain, ts.tol_kind, ts.tol_value, fmt=ts.arithmetic,
                        policy=ts.policy, goal=ts.goal, verify_points=ts.verify_points,
                        progress=(lambda m: progress(f"{ts.name}: {m}")) if progress else None)
    except DomainError as e:
        raise BuildError(f"table {ts.name!r}: {e}") from None
    table = Table2D(spec=ts, gt=gt)
    if ts.sensor is not None:
        from .sensor import budget_2d
        table.budget = budget_2d(table)
    return table


def core_function(ts):
    """The core in the table's units: ``f(x)`` for one input, ``f(a, b)`` for two; NaN where
    the core has no value. ``ts`` needs ``quantity``, ``inputs`` (with ``quantity``, ``scale``,
    ``offset``), ``out_scale`` and ``out_offset`` (a table spec or an audit spec)."""
    ins = ts.inputs
    qid = ts.quantity

    def f(*xs):
        si = {inp.quantity: np.asarray(x, dtype=np.float64) * inp.scale + inp.offset
              for inp, x in zip(ins, xs)}
        y = Q.evaluate(qid, mask=True, **si)
        return (np.asarray(y, dtype=np.float64) - ts.out_offset) / ts.out_scale
    return f


def error_scale(kind):
    """Denominator of the error: 1 for an absolute tolerance, |f| for a relative one.
    The function carries ``relative`` so that fitters can tell the two apart."""
    if kind == "abs":
        def scale(fy):
            return np.ones_like(np.asarray(fy, dtype=np.float64))
    else:
        def scale(fy):
            return np.abs(np.asarray(fy, dtype=np.float64))
    scale.relative = kind != "abs"
    return scale


def _curvature(fx, kind):
    """+1 where f is concave over the whole range (a chord lies below it), -1 convex, else 0;
    for a relative tolerance only where f > 0 throughout."""
    if kind == "rel" and not np.all(fx > 0):
        return 0
    d2 = np.diff(fx, 2)
    if np.all(d2 < 0):
        return 1
    if np.all(d2 > 0):
        return -1
    return 0


def estimated_ops(pw):
    """Rough operation count of one call (compares, multiplies, adds, loads), for ranking."""
    if hasattr(pw, "estimated_ops"):
        return pw.estimated_ops()
    d = pw.degree
    if pw.layout == "free":
        index = 3 * max(1, math.ceil(math.log2(max(pw.nseg, 2))))
    elif pw.layout == "uniform":
        index = 5
    else:
        index = 7
    return 4 + index + 3 + 2 * d


def _seed(ts, salt):
    h = hashlib.sha256(f"{ts.quantity}|{ts.inputs}|{ts.tol_kind}|{ts.tol_value}|"
                       f"{ts.arithmetic}|{salt}".encode()).digest()
    return int.from_bytes(h[:8], "little")


def format_range(lo, hi, fmt):
    """[lo, hi] as format values inside it: each end rounded to ``fmt`` and moved one step
    inward if rounding took it outside."""
    ft = arith.FORMATS[fmt]
    a, b = float(ft(lo)), float(ft(hi))
    if a < lo:
        a = float(np.nextafter(ft(a), ft(np.inf)))
    if b > hi:
        b = float(np.nextafter(ft(b), ft(-np.inf)))
    return a, b


def format_floor(f, scale, lo, hi, fmt):
    """Error from rounding the input and the output to ``fmt`` alone (no approximation)."""
    ft = arith.FORMATS[fmt]
    x = np.linspace(lo, hi, 4097)
    if lo > 0 and hi / lo > 1.5:
        x = np.concatenate([x, np.geomspace(lo, hi, 4097)])
    x = np.unique(x)
    fx = f(x)
    dfdx = np.gradient(fx, x)
    ulp_in = np.spacing(x.astype(ft)).astype(np.float64)
    ulp_out = np.spacing(np.abs(fx).astype(ft)).astype(np.float64)
    return float(np.max((0.5 * ulp_out + 0.5 * np.abs(dfdx) * ulp_in) / scale(fx)))


def _first_upper_float(inp, x, fmt):
    """The smallest input in ``fmt`` on which the core uses the region-3 equation (found by
    bisection on the format's bit patterns around ``x``, the switch in the input's unit)."""
    ft = arith.FORMATS[fmt]
    utype = np.uint32 if fmt == "float32" else np.uint64
    up = lambda a: bool(Q.on_upper_equation(inp.quantity, np.float64(a) * inp.scale + inp.offset))  # noqa: E731
    lo, hi = ft(x * (1 - 1e-6)), ft(x * (1 + 1e-6))
    if x > 0 and not up(lo) and up(hi):
        a, b = int(np.array(lo, ft).view(utype)), int(np.array(hi, ft).view(utype))
        while b - a > 1:
            m = (a + b) // 2
            if up(np.array(m, utype).view(ft)):
                b = m
            else:
                a = m
        return float(np.array(b, utype).view(ft))
    v = ft(x)
    for _ in range(64):
        if up(v):
            break
        v = np.nextafter(v, ft(np.inf))
    for _ in range(64):
        prev = np.nextafter(v, ft(-np.inf))
        if not up(prev):
            break
        v = prev
    return float(v)


def monotone_sign(fx):
    """+1 where ``fx`` strictly increases throughout, -1 decreases, else 0."""
    d = np.diff(fx)
    if np.all(d > 0):
        return 1
    if np.all(d < 0):
        return -1
    return 0


def _fit_candidate(layout, d, f, scale, lo, hi, tol, floor, fmt, monotone, coord, breaks, ts,
                   max_segments=S_MAX, balance=0):
    """Fit one candidate, tightening the budget until the quick verification meets ``tol``.

    Returns (Piecewise1D or None, quick verification, refits, reason when None)."""
    budget = max(tol - 2.0 * floor, 0.3 * tol)
    v = None
    for attempt in range(MAX_REFITS):
        pw = _place(layout, f, scale, lo, hi, d, budget, fmt, monotone, coord, breaks, ts.policy,
                    max_segments, balance)
        if pw is None:
            why = ("stopped: would store more than the best candidate"
                   if max_segments < S_MAX else "tolerance not met within the segment limit")
            return None, v, attempt, why
        pw = S.seal_breakpoints(pw, monotone, skip=breaks)
        v = verify_table(pw, f, scale, QUICK_POINTS, _seed(ts, f"quick{layout}{d}"), monotone,
                         breaks)
        if v["max_error"] <= ACCEPT * tol:
            rev = order_reversals(pw, monotone, breaks)
            if rev:
                return None, v, attempt, (f"{rev} order reversals in {fmt} on a dense sweep "
                                          f"(the property is monotone)")
            return pw, v, attempt, None
        budget *= min(0.8, 0.93 * tol / max(v["max_error"], 1e-300))
        if budget < 0.5 * floor:
            break
    return None, v, MAX_REFITS, "tolerance not met: the format's rounding dominates"


def _place(layout, f, scale, lo, hi, d, budget, fmt, monotone, coord, breaks, policy,
           max_segments=None, balance=0):
    max_segments = max_segments or S_MAX
    if layout == "free" and breaks:
        edges = [lo] + list(breaks) + [hi]
        xs, iws, cs = [], [], []
        for a, b in zip(edges[:-1], edges[1:]):
            r = S.place_free(f, scale, a, b, d, budget, fmt, monotone, coord,
                             max_segments=max_segments, balance=balance)
            if r is None:
                return None
            x, iw, c = r
            xs.append(x if not xs else x[1:])
            iws.append(iw)
            cs.append(c)
        r = (np.concatenate(xs), np.concatenate(iws), np.concatenate(cs))
        pw = S.build_piecewise("free", r, lo, hi, fmt, policy)
        return pw
    pw = S.place(layout, f, scale, lo, hi, d, budget, fmt, monotone, coord, max_segments,
                 balance)
    if pw is None:
        return None
    return Piecewise1D(pw.layout, pw.fmt, pw.lo, pw.hi, pw.coef, policy, pw.x, pw.inv_w,
                       pw.x0, pw.inv_h, pw.k, pw.key0)


def build_table(ts, progress=None):
    """Fit and verify one table spec; raises :class:`BuildError` when it cannot be met."""
    if ts.domain is not None:
        return build_grid_table(ts, progress)
    if ts.phase == "wet":
        from .sensor import budget_2d
        from .wet import build_wet_table
        table = build_wet_table(ts, progress)
        if ts.sensor is not None:
            table.budget = budget_2d(table)
        return table
    inp = ts.inputs[0]
    fmt = ts.arithmetic
    ft = arith.FORMATS[fmt]
    f = core_function(ts)
    scale = error_scale(ts.tol_kind)
    lo, hi = format_range(inp.lo, inp.hi, fmt)
    tol = ts.tol_value
    xs = np.linspace(lo, hi, 4097)
    fx = f(xs)
    if not np.all(np.isfinite(fx)):
        raise BuildError(f"table {ts.name!r}: the core gives no value over part of the range")
    monotone = monotone_sign(fx)
    balance = _curvature(fx, ts.tol_kind)
    floor = format_floor(f, scale, lo, hi, fmt)
    unit = ts.output_unit if ts.tol_kind == "abs" else "(relative)"
    if tol < 3.0 * floor:
        feasible = float(f"{3.0 * floor:.2g}")
        if feasible < 3.0 * floor:
            feasible = float(f"{3.0 * floor * 1.05:.2g}")
        raise BuildError(
            f"table {ts.name!r}: key 'tolerance.{ts.tol_kind}': {tol:g} {unit} is below what "
            f"{fmt} can deliver over {inp.lo:g} to {inp.hi:g} {inp.unit} (input and output "
            f"rounding alone give up to {floor:.2g}); the smallest feasible is {feasible:g}")
    coord = "log" if lo > 0 and hi / lo > 4.0 else "linear"
    breaks = []
    notes = []
    sw = Q.SATURATION_SWITCH.get(inp.quantity)
    smooth = ("saturation_temperature", "saturation_pressure", "surface_tension")
    if sw is not None and ts.quantity not in smooth:
        xb = (sw - inp.offset) / inp.scale
        if lo < xb < hi:
            xb = _first_upper_float(inp, xb, fmt)
            below = np.nextafter(ft(xb), ft(-np.inf)).astype(np.float64)
            step = float(np.abs(f(np.array([xb])) - f(np.array([below])))[0])
            breaks.append(xb)
            notes.append(
                f"IF97 switches from the region 1/2 equations to region 3 along saturation at "
                f"623.15 K ({xb:.9g} {inp.unit}, the first {fmt} input on region 3). Between "
                f"that input and the {fmt} value just below it the core itself steps by "
                f"{step:.3g} {ts.output_unit}. A breakpoint sits exactly there; the table "
                f"follows region 1/2 below it and region 3 from it on.")
    if ts.layout == "closed_form":
        layouts = []
    elif ts.layout:
        layouts = [ts.layout]
    elif ts.goal == "smallest":
        layouts = ["free", "binade", "uniform"]
    else:
        layouts = ["uniform", "binade"]
    if lo <= 0 and "binade" in layouts and not ts.layout:
        layouts.remove("binade")
    # highest degree first: for "smallest", once a lower degree stores more than the one above
    # it, lower ones only store more still (many more segments), so the search stops there
    degrees = [ts.degree] if ts.degree else list(range(5, 0, -1))
    candidates = []
    n = ts.verify_points
    best = None          # (key, index, pw, full verification): passed everything
    met = []             # (key, index, pw) of every candidate that met the quick check
    first_ok = None      # the best within tolerance, should none be free of order reversals
    full = {}            # candidate index -> its full verification (each is run once)

    def verified(idx, pw):
        if idx not in full:
            full[idx] = verify_table(pw, f, scale, n, _seed(ts, "final"), monotone, breaks)
        return full[idx]
    for layout in layouts:
        previous = None
        for d in degrees:
            if progress:
                progress(f"{ts.name}: {layout} degree {d}")
            # for "smallest", a candidate is only worth fitting while it can still store less
            # than the best one so far (its coefficients alone need nseg * (d + 1) values)
            cap = S_MAX
            if ts.goal == "smallest" and best is not None:
                room = int(best[2].storage_bytes * (1 + NEAR_SMALLEST))
                cap = max(1, min(S_MAX, room // (np.dtype(ft).itemsize * (d + 1))))
            pw, v, attempts, why = _fit_candidate(layout, d, f, scale, lo, hi, tol, floor, fmt,
                                                  monotone, coord, breaks, ts, cap, balance)
            row = {"layout": layout, "degree": d, "met": pw is not None}
            idx = len(candidates)
            candidates.append(row)
            if pw is None:
                row["why"] = why
                continue
            row.update({"segments": pw.nseg, "stored_values": pw.stored_values(),
                        "storage_bytes": pw.storage_bytes, "estimated_ops": estimated_ops(pw),
                        "quick_max_error": v["max_error"], "refits": attempts})
            key = ((pw.storage_bytes, estimated_ops(pw)) if ts.goal == "smallest"
                   else (estimated_ops(pw), pw.storage_bytes))
            met.append((key, idx, pw))
            if best is None or key < best[0]:
                # a new leader must pass the full verification (tolerance, and order where
                # the property is monotone) before it counts
                vf = verified(idx, pw)
                within = vf["max_error"] <= tol
                if within and vf.get("monotone_reversals", 0) == 0:
                    best = (key, idx, pw, vf)
                else:
                    row["full_verification"] = (
                        "over tolerance" if not within
                        else f"{vf['monotone_reversals']} order reversals")
                    if within and (first_ok is None or key < first_ok[0]):
                        first_ok = (key, idx, pw, vf)
            if ts.goal == "smallest":
                if previous is not None and pw.storage_bytes > previous:
                    break
                previous = pw.storage_bytes
    cf = closed_form_for(ts, lo, hi) if (ts.layout in (None, "closed_form")
                                         and ts.degree is None) else None
    if cf is not None:
        # IF97's own saturation-line equation in the target arithmetic: a candidate too
        row = {"layout": "closed_form", "degree": "-", "segments": 1,
               "stored_values": cf.stored_values(), "storage_bytes": cf.storage_bytes,
               "estimated_ops": cf.estimated_ops()}
        idx = len(candidates)
        candidates.append(row)
        vf = verified(idx, cf)
        rev = vf.get("monotone_reversals", 0)
        row["met"] = vf["max_error"] <= tol and rev == 0
        row["quick_max_error"] = vf["max_error"]
        key = ((cf.storage_bytes, cf.estimated_ops()) if ts.goal == "smallest"
               else (cf.estimated_ops(), cf.storage_bytes))
        if not row["met"]:
            row["why"] = ("tolerance not met" if vf["max_error"] > tol
                          else f"{rev} order reversals on the full verification")
            if vf["max_error"] <= tol and (first_ok is None or key < first_ok[0]):
                first_ok = (key, idx, cf, vf)
        elif best is None or key < best[0]:
            best = (key, idx, cf, vf)
    if best is not None and ts.goal == "smallest":
        # among candidates that store at most NEAR_SMALLEST more, the one with the fewest
        # operations, if it passes the full verification too
        limit = best[2].storage_bytes * (1 + NEAR_SMALLEST)
        near = sorted((m for m in met if m[2].storage_bytes <= limit
                       and estimated_ops(m[2]) < estimated_ops(best[2])),
                      key=lambda m: (estimated_ops(m[2]), m[2].storage_bytes, m[1]))
        for key, idx, pw in near:
            vf = verified(idx, pw)
            if vf["max_error"] <= tol and vf.get("monotone_reversals", 0) == 0:
                best = (key, idx, pw, vf)
                break
            candidates[idx]["full_verification"] = (
                "over tolerance" if vf["max_error"] > tol
                else f"{vf['monotone_reversals']} order reversals")
    if best is None:
        if first_ok is None:
            raise BuildError(
                f"table {ts.name!r}: no layout/degree met tolerance {tol:g} {unit} on the "
                f"verification within the segment limit; loosen the tolerance or narrow the "
                f"range")
        best = first_ok
        notes.append("No candidate was free of order reversals in the target arithmetic on "
                     "the full verification; the best one within tolerance is used and its "
                     "reversals are counted above.")
    _, idx, pw, v = best
    for i, row in enumerate(candidates):
        row["chosen"] = i == idx
    table = Table(spec=ts, piecewise=pw, verification=v, candidates=candidates, floor=floor,
                  monotone=monotone, forced_breaks=breaks, notes=notes)
    if ts.sensor is not None:
        from .sensor import budget
        table.budget = budget(table, f)
    return table


def build_helper_table(quantity, inp, out_unit, out_scale, out_offset, tol_kind, tol, fmt,
                       goal="smallest", name="helper", verify_points=20_000, layouts=None,
                       degree=None):
    """A one-input table that a larger function keeps beside it (a saturation value of
    pressure, say): built by :func:`build_table` with an explicit piecewise layout for each
    of ``layouts`` (``binade`` where the input is positive, and ``free``, by default) so that
    the one-input C macro renders it, and the better one for ``goal`` returned (``degree``
    fixes the degree, else every degree is tried). Raises
    :class:`BuildError` (the last layout's) when none can be built."""
    from .spec import TableSpec
    if layouts is None:
        layouts = ["binade", "free"] if inp.lo > 0 else ["free"]
    best, last = None, None
    for layout in layouts:
        ts = TableSpec(name=name, function=f"h2olut_{name}", quantity=quantity,
                       description=f"{name}: a helper table of a larger function",
                       inputs=(inp,), output_unit=out_unit, out_scale=out_scale,
                       out_offset=out_offset, tol_kind=tol_kind, tol_value=float(tol),
                       arithmetic=fmt, policy="clamp", goal=goal, layout=layout,
                       degree=degree, verify_points=verify_points)
        try:
            t = build_table(ts)
        except BuildError as e:
            last = e
            continue
        pw = t.piecewise
        key = ((pw.storage_bytes, estimated_ops(pw)) if goal == "smallest"
               else (estimated_ops(pw), pw.storage_bytes))
        if best is None or key < best[0]:
            best = (key, t)
    if best is None:
        raise last
    return best[1]
