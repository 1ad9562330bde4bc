"""Two-input tables: phase-aware domains, the stored grid, fitting with error control, choice.

A single-phase table of two inputs (pressure and temperature, or pressure and specific enthalpy
or entropy for the backward temperature) must not reach across the saturation line, where the
properties jump. So the grid is not laid over the raw inputs but over pressure and a second
coordinate measured from saturation:

* ``offset``: superheat ``v - S(p)`` on the vapour side, subcooling ``S(p) - v`` on the liquid
  side, where S(p) is the saturation value of the second input (T_sat, h'', h', s'', s');
* ``normalized``: ``(v - near(p)) / (far(p) - near(p))``, 0 at the limit nearest saturation and
  1 at the other one; this maps a range with one absolute and one relative limit (for example
  from T_sat + 5 K up to 450 degC) onto a rectangle, at the price of one division per call;
* ``raw``: ``v`` itself, for ranges with two absolute limits (supercritical tables).

With one absolute and one relative limit the ``offset`` coordinate is also offered: its y axis
then runs to the largest distance over the pressure range and the absolute limit is applied by
clamping v first, so part of the grid is never reached (stored but unused, no division).

The run time needs S(p): a one-input table built by :func:`gen.build.build_table` (in the same
format, emitted with the one-input macro); its bytes are counted in the grid's storage and its
error reaches the verified total error, since verification runs the whole emulated function.

Offers
    ``Domain2D``, ``make_domain(...)``, ``check_domain(dom, tol_kind, tol)``, ``DomainError``
    ``saturation_helper(dom, fmt, tol, goal)``   the S(p) table (a :class:`gen.build.Table`)
    ``GridAxis``, ``Grid2D``                     the stored grid (checked constructors)
    ``fit_grid(problem, method, layouts, coord)`` one candidate, with error control
    ``verify_grid(grid, problem, n, seed)``       dense verification in the target arithmetic
    ``build_grid(dom, tol_kind, tol, ...)``       candidates, choice for a goal, verification
    ``GridTable``                                 what ``build_grid`` returns
    ``grid_c_context(gt, function)``              the dict ``templates/c_grid2d.j2`` renders
    ``estimated_ops(grid)``                       rough operations per call, for ranking

Methods: ``bilinear`` (four nodes per cell) and ``bicubic`` (four-node Lagrange interpolation
per axis over a 4x4 stencil of node values: continuous across cell edges, error of order h^4,
one stored value per node). Axes: ``free`` lines (binary search) or ``uniform`` ones (O(1)
index). Every fit is checked on points that are never its nodes, in the target arithmetic
emulated operation by operation (:mod:`gen.arith2d`); every maximum error here is the largest
of the points named, a sampled measurement and not a bound.

Everything that decides emitted bits is elementwise numpy in a fixed order (no BLAS) on fixed
point sets from seeded generators.
"""

import hashlib
import math
import time
from dataclasses import dataclass, field

import numpy as np

from .. import arith, arith2d
from .. import quantities as Q
from .piecewise import Piecewise1D

PHASES = ("vapor", "liquid", "supercritical")
SECOND_INPUTS = ("temperature", "specific_enthalpy", "specific_entropy")
METHODS = ("bilinear", "bicubic")
AXIS_LAYOUTS = ("free", "uniform")
COORDS = ("raw", "offset", "normalized")
POLICIES = ("clamp", "nan")
GOALS = ("smallest", "fastest")

#: saturation value of the second input on each side
_SAT_QUANTITY = {
    ("temperature", "vapor"): "saturation_temperature",
    ("temperature", "liquid"): "saturation_temperature",
    ("specific_enthalpy", "vapor"): "saturated_vapor_enthalpy",
    ("specific_enthalpy", "liquid"): "saturated_liquid_enthalpy",
    ("specific_entropy", "vapor"): "saturated_vapor_entropy",
    ("specific_entropy", "liquid"): "saturated_liquid_entropy",
}
_KIND = {"temperature": "temperature", "specific_enthalpy": "specific_energy",
         "specific_entropy": "specific_entropy", "pressure": "pressure"}
_WORDS = {"temperature": "temperature", "specific_enthalpy": "specific enthalpy",
          "specific_entropy": "specific entropy"}
_SYMBOL = {"temperature": "T_sat", "specific_enthalpy": "h_sat", "specific_entropy": "s_sat"}

#: share of the tolerance given to the saturation helper's error (propagated through the grid)
HELPER_SHARE = 0.15
#: a candidate's check-set maximum must stay below this share of the tolerance
ACCEPT = 0.95
#: most lines per axis, and most nodes, of any candidate
MAX_LINES = 2048
MAX_NODES = 400_000
#: random check points per problem (fit control; never verification points)
CHECK_POINTS = 48_000
#: a step of the core across a region boundary above this share of the tolerance is refused
STEP_SHARE = 0.25
#: relative cost of a division against an add or multiply, for ranking only (small
#: single-precision FPUs take about ten times longer; common practice, no source)
SLOW_OP = 8


class DomainError(ValueError):
    """A two-input range that cannot be tabulated as asked; one-line message."""


# ---------------------------------------------------------------------------------------------
# domains


@dataclass(frozen=True)
class Domain2D:
    """Where a two-input table is valid, in the user's units.

    ``p_lo``/``p_hi``: pressure range in ``p_unit``. The second input (``second``, in
    ``v_unit``) runs between ``near``, the limit nearest saturation, and ``far``; each is a
    distance from saturation (superheat above S(p) on the vapour side, subcooling below it on
    the liquid side) when ``near_rel``/``far_rel`` is true, else an absolute value. A
    ``supercritical`` domain takes absolute limits (``near`` the lower one). Unit maps: SI =
    value * scale + offset (differences use the scale alone).
    """
    quantity: str
    phase: str
    p_lo: float
    p_hi: float
    near: float
    far: float
    near_rel: bool = True
    far_rel: bool = False
    second: str = "temperature"
    p_unit: str = "Pa"
    p_scale: float = 1.0
    p_offset: float = 0.0
    v_unit: str = "K"
    v_scale: float = 1.0
    v_offset: float = 0.0
    out_unit: str = ""
    out_scale: float = 1.0
    out_offset: float = 0.0

    def __post_init__(self):
        if self.quantity not in Q.CATALOGUE:
            raise DomainError(f"unknown quantity {self.quantity!r}")
        if self.phase not in PHASES:
            raise DomainError(f"phase must be one of {', '.join(PHASES)}, not {self.phase!r}")
        if self.second not in SECOND_INPUTS:
            raise DomainError(f"second input must be one of {', '.join(SECOND_INPUTS)}, "
                              f"not {self.second!r}")
        q = Q.CATALOGUE[self.quantity]
        if ("pressure", self.second) not in q.inputs:
            want = " or ".join("(" + ", ".join(t) + ")" for t in q.inputs)
            raise DomainError(f"{self.quantity} takes {want}, not (pressure, {self.second})")
        for k in ("p_lo", "p_hi", "near", "far"):
            v = getattr(self, k)
            if isinstance(v, bool) or not isinstance(v, (int, float)) or not math.isfinite(v):
                raise DomainError(f"{k} must be a finite number, not {v!r}")
        if not self.p_lo < self.p_hi:
            raise DomainError(f"pressure range must increase: {self.p_lo:g} to {self.p_hi:g} "
                              f"{self.p_unit}")
        if self.phase == "supercritical" and (self.near_rel or self.far_rel):
            raise DomainError("a supercritical table takes absolute limits of its second input")

    def __repr__(self):
        def lim(v, rel):
            return f"S(p){'+' if self.phase == 'vapor' else '-'}{v:g}" if rel else f"{v:g}"
        return (f"Domain2D({self.quantity!r}, {self.phase!r}, p {self.p_lo:g}..{self.p_hi:g} "
                f"{self.p_unit}, {self.second} {lim(self.near, self.near_rel)}.."
                f"{lim(self.far, self.far_rel)} {self.v_unit})")

    @property
    def side(self):
        return {"vapor": 1, "liquid": -1, "supercritical": 0}[self.phase]

    @property
    def sat_quantity(self):
        return _SAT_QUANTITY.get((self.second, self.phase))

    # unit maps
    def p_si(self, p):
        return np.asarray(p, dtype=np.float64) * self.p_scale + self.p_offset

    def v_si(self, v):
        return np.asarray(v, dtype=np.float64) * self.v_scale + self.v_offset

    def v_user(self, si):
        return (np.asarray(si, dtype=np.float64) - self.v_offset) / self.v_scale

    def sat(self, p):
        """Exact saturation value of the second input at pressure ``p`` (user units)."""
        si = Q.evaluate(self.sat_quantity, pressure=self.p_si(p), mask=True)
        return self.v_user(si)

    def limits(self, p):
        """(near, far) values of the second input at pressure ``p``, exact, user units."""
        p = np.asarray(p, dtype=np.float64)
        sgn = self.side
        S = self.sat(p) if (self.near_rel or self.far_rel) else None
        near = S + sgn * self.near if self.near_rel else np.full(p.shape, float(self.near))
        far = S + sgn * self.far if self.far_rel else np.full(p.shape, float(self.far))
        return near, far

    def core(self, p, v):
        """The core's value at (p, v) in the output unit; NaN where the core has none.

        Points within round-off of saturation are moved a hair (2e-13 relative) to the
        domain's side, so that the core does not take them for the other phase."""
        psi = self.p_si(p)
        vsi = self.v_si(v)
        if self.side:
            ssi = self.v_si(self.sat(p))
            hair = np.abs(ssi) * 2e-13 + 1e-12
            if self.side > 0:
                vsi = np.where(vsi < ssi + hair, np.maximum(vsi, ssi + hair), vsi)
            else:
                vsi = np.where(vsi > ssi - hair, np.minimum(vsi, ssi - hair), vsi)
        kw = {"pressure": psi, self.second: vsi}
        phase = {"vapor": "vapor", "liquid": "liquid"}.get(self.phase)
        if Q.CATALOGUE[self.quantity].family == "single_phase":
            y = Q.evaluate(self.quantity, mask=True, phase=phase, **kw)
        else:
            y = Q.evaluate(self.quantity, mask=True, **kw)
        return (np.asarray(y, dtype=np.float64) - self.out_offset) / self.out_scale


def make_domain(quantity, phase, p_lo, p_hi, near, far, *, near_rel, far_rel,
                second="temperature", p_unit="Pa", v_unit=None, out_unit=None):
    """A :class:`Domain2D` with unit maps from unit names (spelled as the units library does)."""
    from .. import units as U
    v_unit = v_unit if v_unit is not None else U.DIMENSIONS[_KIND[second]]
    kind = Q.CATALOGUE[quantity].kind
    out_unit = out_unit if out_unit is not None else U.DIMENSIONS[kind]
    ps, po = U.to_si_map(p_unit, "pressure")
    vs, vo = U.to_si_map(v_unit, _KIND[second])
    os_, oo = U.to_si_map(out_unit, kind)
    return Domain2D(quantity=quantity, phase=phase, p_lo=float(p_lo), p_hi=float(p_hi),
                    near=float(near), far=float(far), near_rel=bool(near_rel),
                    far_rel=bool(far_rel), second=second, p_unit=p_unit, p_scale=ps,
                    p_offset=po, v_unit=v_unit, v_scale=vs, v_offset=vo, out_unit=out_unit,
                    out_scale=os_, out_offset=oo)


def _g(v):
    return f"{float(v):.6g}"


def _pt(dom, p):
    return f"{_g(p)} {dom.p_unit}"


def _vt(dom, v):
    return f"{_g(v)} {dom.v_unit}"


def _describe_limit(dom, which):
    v, rel = (dom.near, dom.near_rel) if which == "near" else (dom.far, dom.far_rel)
    if not rel:
        return _vt(dom, v)
    sym = _SYMBOL[dom.second]
    return f"{sym}(p) {'+' if dom.side > 0 else '-'} {_g(v)} {dom.v_unit}"


def describe_domain(dom):
    """One line in the user's units, e.g. 'pressure 0.1 to 4 MPa; temperature from ...'."""
    side = {"vapor": "vapour side of saturation", "liquid": "liquid side of saturation",
            "supercritical": "no saturation inside"}[dom.phase]
    return (f"pressure {_g(dom.p_lo)} to {_g(dom.p_hi)} {dom.p_unit}; {_WORDS[dom.second]} "
            f"from {_describe_limit(dom, 'near')} to {_describe_limit(dom, 'far')} ({side})")


#: region boundaries in (p, T) where IF97 changes equations inside single-phase states:
#: name, SI pressure range, T(p)
def _boundaries():
    from ..if97 import b23
    from ..if97.constants import P_MAX, P_MAX_5, T_13, T_MAX_25
    p13 = Q.SATURATION_SWITCH["pressure"]
    return [
        ("the region 2/3 boundary (B23)", (p13, P_MAX), lambda p: b23.b23_temperature(p)),
        ("the region 1/3 boundary (623.15 K)", (p13, P_MAX), lambda p: np.full(p.shape, T_13)),
        ("the region 2/5 boundary (1073.15 K)", (1e-3, P_MAX_5),
         lambda p: np.full(p.shape, T_MAX_25)),
    ]


def check_domain(dom, tol_kind=None, tol=None):
    """Refuse a domain that crosses saturation, reaches the critical point, leaves IF97's
    validity or crosses a region boundary where the quantity steps by more than
    ``STEP_SHARE`` of the tolerance. Raises :class:`DomainError` (one line naming the corner or
    edge in the user's units); returns a list of notes otherwise."""
    from ..if97.constants import PC, T_MAX, T_MAX_25, T_MIN, TC
    notes = []
    p_lo_si, p_hi_si = float(dom.p_si(dom.p_lo)), float(dom.p_si(dom.p_hi))
    pu = lambda si: (si - dom.p_offset) / dom.p_scale  # noqa: E731
    vu = lambda si: float(dom.v_user(si))  # noqa: E731
    if p_lo_si <= 0:
        raise DomainError(f"pressure {_pt(dom, dom.p_lo)} is not above zero (absolute)")
    if dom.phase != "supercritical":
        if p_lo_si < Q.P_SAT_MIN:
            raise DomainError(
                f"low-pressure edge {_pt(dom, dom.p_lo)} is below the lowest saturation pressure "
                f"{_pt(dom, pu(Q.P_SAT_MIN))} (273.15 K), where a {dom.phase} table is measured "
                f"from; use a supercritical (absolute) range there")
        if p_hi_si >= PC:
            raise DomainError(
                f"high-pressure edge {_pt(dom, dom.p_hi)} reaches the critical pressure "
                f"{_pt(dom, pu(PC))}: a {dom.phase} table must stay below it (above it, use "
                f"phase supercritical with absolute limits)")
        for which in ("near", "far"):
            v, rel = (dom.near, dom.near_rel) if which == "near" else (dom.far, dom.far_rel)
            if rel and v < 0:
                raise DomainError(f"{which} limit {_describe_limit(dom, which)} must be a "
                                  f"distance of zero or more from saturation")
    else:
        if p_hi_si > 100e6:
            raise DomainError(f"high-pressure edge {_pt(dom, dom.p_hi)} is above IF97's "
                              f"{_pt(dom, pu(100e6))}")
        t_lo, t_hi = sorted((float(dom.v_si(dom.near)), float(dom.v_si(dom.far))))
        if dom.second == "temperature":
            if not (p_lo_si > PC or t_lo > TC):
                raise DomainError(
                    f"a supercritical table needs p above {_pt(dom, pu(PC))} or T above "
                    f"{_vt(dom, vu(TC))} everywhere; the corner (p = {_pt(dom, dom.p_lo)}, "
                    f"T = {_vt(dom, vu(t_lo))}) is neither: use phase vapor or liquid")
            if t_lo < T_MIN or t_hi > T_MAX or (t_hi > T_MAX_25 and p_hi_si > 50e6):
                raise DomainError(
                    f"temperature {_vt(dom, vu(t_lo))} to {_vt(dom, vu(t_hi))} at up to "
                    f"{_pt(dom, dom.p_hi)} leaves IF97's validity (273.15 to 1073.15 K up to "
                    f"100 MPa, to 2273.15 K up to 50 MPa)")
        elif not p_lo_si > PC:
            raise DomainError(f"a supercritical table from ({_pt(dom, dom.p_lo)}, "
                              f"{_WORDS[dom.second]}) needs p above {_pt(dom, pu(PC))}")
    # sides of saturation and order of the limits, corner by corner
    if dom.side:
        ps_user = np.array([dom.p_lo, dom.p_hi], dtype=np.float64)
        pdense = np.concatenate([ps_user, np.linspace(dom.p_lo, dom.p_hi, 257)])
        S = dom.sat(pdense)
        near, far = dom.limits(pdense)
        sgn = dom.side
        word = _WORDS[dom.second]
        bad = np.nonzero((near - S) * sgn < 0)[0]
        if bad.size:
            k = int(bad[np.argmin((near[bad] - S[bad]) * sgn)])
            edge = "lower" if sgn > 0 else "upper"
            rel = "below" if sgn > 0 else "above"
            raise DomainError(
                f"the range crosses the saturation line: at p = {_pt(dom, pdense[k])} the "
                f"{edge} {word} limit {_vt(dom, near[k])} is {rel} saturation "
                f"({_SYMBOL[dom.second]} = {_vt(dom, S[k])}); a {dom.phase} table must stay "
                f"on one side")
        bad = np.nonzero((far - near) * sgn <= 0)[0]
        if bad.size:
            k = int(bad[0])
            raise DomainError(
                f"at p = {_pt(dom, pdense[k])} the {word} limits are empty or reversed: from "
                f"{_describe_limit(dom, 'near')} = {_vt(dom, near[k])} to "
                f"{_describe_limit(dom, 'far')} = {_vt(dom, far[k])}")
        if dom.second == "temperature":
            tfar = dom.v_si(far)
            k = int(np.argmax(tfar) if sgn > 0 else np.argmin(tfar))
            lim = T_MAX_25 if p_hi_si > 50e6 else T_MAX
            if sgn > 0 and tfar[k] > lim:
                raise DomainError(
                    f"at p = {_pt(dom, pdense[k])} the upper temperature {_vt(dom, far[k])} is "
                    f"above IF97's {_vt(dom, vu(lim))}")
            if sgn < 0 and tfar[k] < T_MIN:
                raise DomainError(
                    f"at p = {_pt(dom, pdense[k])} the lower temperature {_vt(dom, far[k])} is "
                    f"below IF97's {_vt(dom, vu(T_MIN))}")
    # the core must give a value everywhere (IF97's validity, the backward equations' range)
    pp, vv = domain_grid(dom, 49, 49)
    fv = dom.core(pp, vv)
    bad = np.nonzero(~np.isfinite(fv))[0]
    if bad.size:
        k = int(bad[0])
        raise DomainError(f"the core has no value at (p = {_pt(dom, pp[k])}, "
                          f"{_WORDS[dom.second]} = {_vt(dom, vv[k])}): outside IF97's validity")
    # region boundaries: where the core steps
    if dom.second == "temperature":
        for name, (b_lo, b_hi), tb in _boundaries():
            lo, hi = max(p_lo_si, b_lo), min(p_hi_si, b_hi)
            if lo >= hi:
                continue
            psi = np.linspace(lo, hi, 129)
            p_user = pu(psi)
            tv = dom.v_user(tb(psi))
            near, far = dom.limits(p_user)
            inside = (tv - np.minimum(near, far) > 0) & (np.maximum(near, far) - tv > 0)
            if not inside.any():
                continue
            p_in, t_in = p_user[inside], tv[inside]
            dv = np.abs(t_in) * 1e-9 + 1e-9
            below = dom.core(p_in, t_in - dv)
            above = dom.core(p_in, t_in + dv)
            step = np.abs(above - below)
            rel = step / (np.abs(below) if tol_kind == "rel" else 1.0)
            k = int(np.argmax(rel))
            if tol is not None and rel[k] > STEP_SHARE * tol:
                raise DomainError(
                    f"the range crosses {name} near (p = {_pt(dom, p_in[k])}, T = "
                    f"{_vt(dom, t_in[k])}), where the core's {dom.quantity.replace('_', ' ')} "
                    f"steps by {step[k]:.3g} {dom.out_unit} ({rel[k] / tol:.2g} of the "
                    f"tolerance); split the range there")
            notes.append(f"crosses {name}; the core steps by at most {step[k]:.3g} "
                         f"{dom.out_unit} there, which the grid interpolates across")
    return notes


def domain_grid(dom, n_p, n_v, p_log=None):
    """(p, v) flattened: ``n_p`` pressures (log-spaced where the range spans over 4x) by
    ``n_v`` values from the near to the far limit at each, ends included; exact, user units."""
    if p_log is None:
        p_log = dom.p_lo > 0 and dom.p_hi / dom.p_lo > 4.0 and dom.p_offset == 0.0
    ps = np.geomspace(dom.p_lo, dom.p_hi, n_p) if p_log else np.linspace(dom.p_lo, dom.p_hi, n_p)
    ps[0], ps[-1] = dom.p_lo, dom.p_hi
    s = np.linspace(0.0, 1.0, n_v)
    near, far = dom.limits(ps)
    P = np.repeat(ps, n_v)
    V = (near[:, None] + s[None, :] * (far - near)[:, None]).ravel()
    return P, V


# ---------------------------------------------------------------------------------------------
# the saturation helper S(p)


def saturation_helper(dom, fmt, tol_abs, goal="smallest", verify_points=20_000, name="sat"):
    """The run-time S(p) as a verified one-input table (:class:`gen.build.Table`).

    Built by :func:`gen.build.build_table` over the grid's pressure range with an absolute
    tolerance ``tol_abs`` in the second input's unit, restricted to the piecewise layouts
    (``binade`` where the pressure is positive, and ``free``) so that the one-input C macro
    renders it; the better one for ``goal`` is returned."""
    from ..build import BuildError, build_table
    from ..build import estimated_ops as ops1
    from ..spec import InputSpec, TableSpec
    if dom.sat_quantity is None:
        return None
    inp = InputSpec(quantity="pressure", unit=dom.p_unit, lo=float(dom.p_lo), hi=float(dom.p_hi),
                    scale=dom.p_scale, offset=dom.p_offset)
    layouts = (["binade", "free"] if dom.p_lo > 0 else ["free"])
    best, last = None, None
    for layout in layouts:
        ts = TableSpec(name=name, function=f"h2olut_{name}", quantity=dom.sat_quantity,
                       description="saturation helper of a two-input table", inputs=(inp,),
                       output_unit=dom.v_unit, out_scale=dom.v_scale, out_offset=dom.v_offset,
                       tol_kind="abs", tol_value=float(tol_abs), arithmetic=fmt,
                       policy="clamp", goal=goal, layout=layout, verify_points=verify_points)
        try:
            t = build_table(ts)
        except BuildError as e:
            last = e
            continue
        pw = t.piecewise
        key = ((pw.storage_bytes, ops1(pw)) if goal == "smallest"
               else (ops1(pw), pw.storage_bytes))
        if best is None or key < best[0]:
            best = (key, t)
    if best is None:
        raise DomainError(f"the saturation helper ({dom.sat_quantity} within "
                          f"{tol_abs:.3g} {dom.v_unit}) cannot be built: {last}")
    return best[1]


def sat_runtime(pw):
    """Keyword arguments of :func:`gen.arith.evaluate` for a one-input table, in its format."""
    ft = arith.FORMATS[pw.fmt]
    return {"fmt": pw.fmt, "layout": pw.layout, "lo": pw.lo, "hi": pw.hi, "policy": pw.policy,
            "coef": pw.coef.astype(ft),
            "x": None if pw.x is None else np.asarray(pw.x).astype(ft),
            "inv_w": None if pw.inv_w is None else np.asarray(pw.inv_w).astype(ft),
            "x0": None if pw.x0 is None else ft(pw.x0),
            "inv_h": None if pw.inv_h is None else ft(pw.inv_h), "k": pw.k, "key0": pw.key0}


# ---------------------------------------------------------------------------------------------
# the stored grid


def _is_format(a, fmt):
    a = np.asarray(a, dtype=np.float64)
    return bool(np.all(arith.to_format(a, fmt).astype(np.float64) == a))


@dataclass(frozen=True)
class GridAxis:
    """One axis of a rectilinear grid.

    ``lines``: the n node coordinates, increasing (float64 holding format values on a ``free``
    axis; ``x0 + k / inv_h`` on a ``uniform`` one). ``lo``/``hi``: the axis range the run time
    clamps to. Run-time constants: ``iw[i] = 1 / (lines[i+1] - lines[i])`` (free, bilinear),
    ``den[s, k] = 1 / prod_{m != k} (lines[s+k] - lines[s+m])`` for the stencil s..s+3 (free,
    bicubic), ``x0``/``inv_h`` (uniform), all in the format."""
    layout: str
    lines: np.ndarray
    lo: float
    hi: float
    iw: np.ndarray = None
    den: np.ndarray = None
    x0: float = None
    inv_h: float = None

    def __post_init__(self):
        if self.layout not in AXIS_LAYOUTS:
            raise ValueError(f"axis layout must be one of {AXIS_LAYOUTS}, not {self.layout!r}")
        x = np.asarray(self.lines, dtype=np.float64)
        if x.ndim != 1 or x.size < 2:
            raise ValueError("an axis needs at least 2 lines")
        bad = np.nonzero(np.diff(x) <= 0)[0]
        if bad.size:
            j = int(bad[0]) + 1
            raise ValueError(f"lines must increase: lines[{j}]={x[j]!r} <= lines[{j - 1}]="
                             f"{x[j - 1]!r}")
        if self.layout == "uniform" and (self.x0 is None or self.inv_h is None):
            raise ValueError("a uniform axis needs x0 and inv_h")
        if self.layout == "free" and self.iw is None and self.den is None:
            raise ValueError("a free axis needs iw (bilinear) or den (bicubic)")
        if self.iw is not None and np.shape(self.iw) != (x.size - 1,):
            raise ValueError(f"iw must have n-1 = {x.size - 1} values, not {np.shape(self.iw)}")
        if self.den is not None and np.shape(self.den) != (x.size - 3, 4):
            raise ValueError(f"den must have shape ({x.size - 3}, 4), not {np.shape(self.den)}")

    @property
    def n(self):
        return int(np.asarray(self.lines).size)

    def __repr__(self):
        return f"GridAxis({self.layout!r}, n={self.n}, lo={self.lo!r}, hi={self.hi!r})"

    def stored_values(self, method):
        """Values this axis keeps in tables (the constants of a uniform axis live in code)."""
        if self.layout == "uniform":
            return 0
        if method == "bilinear":
            return 2 * (self.n - 1)      # lines[0..n-2] and iw[0..n-2]
        return self.n + 4 * (self.n - 3)  # all lines and four reciprocals per stencil

    def runtime(self, fmt):
        ft = arith.FORMATS[fmt]
        d = {"layout": self.layout, "n": self.n,
             "lines": np.asarray(self.lines).astype(ft) if self.layout == "free" else None,
             "iw": None if self.iw is None else np.asarray(self.iw).astype(ft),
             "den": None if self.den is None else np.asarray(self.den).astype(ft),
             "x0": None if self.x0 is None else ft(self.x0),
             "inv_h": None if self.inv_h is None else ft(self.inv_h)}
        return d


def free_axis(lines, method, fmt):
    """A free axis on format-valued ``lines`` with its run-time reciprocals."""
    x = arith.to_format(np.asarray(lines, dtype=np.float64), fmt).astype(np.float64)
    iw = den = None
    if method == "bilinear":
        iw = arith.to_format(1.0 / np.diff(x), fmt).astype(np.float64)
    else:
        n = x.size
        den = np.zeros((max(n - 3, 0), 4))
        for k in range(4):
            prod = np.ones(n - 3)
            for m in range(4):
                if m != k:
                    prod = prod * (x[k:n - 3 + k] - x[m:n - 3 + m])
            den[:, k] = 1.0 / prod
        den = arith.to_format(den, fmt).astype(np.float64)
    return GridAxis("free", x, float(x[0]), float(x[-1]), iw=iw, den=den)


def uniform_axis(lo, hi, n, fmt):
    """A uniform axis of ``n`` lines over [lo, hi] (format values): node k at x0 + k / inv_h."""
    ft = arith.FORMATS[fmt]
    x0 = float(ft(lo))
    hi = float(ft(hi))
    inv_h = float(ft((n - 1) / (hi - x0)))
    lines = x0 + np.arange(n, dtype=np.float64) / inv_h
    return GridAxis("uniform", lines, x0, hi, x0=x0, inv_h=inv_h)


@dataclass(frozen=True)
class Grid2D:
    """A fitted two-input table exactly as the target stores and evaluates it.

    ``z[i, j]``: node values (format) at (x.lines[i], y.lines[j]); x is pressure (user unit),
    y the second coordinate ``coord`` (see the module docstring). ``method``: ``bilinear`` or
    ``bicubic``. ``side``: +1 vapour side, -1 liquid side, 0 no saturation inside. ``near``/
    ``far`` with ``near_rel``/``far_rel``: the second input's limits (format values; distances
    from saturation where relative). ``helper``: the S(p) table (:class:`Piecewise1D`), needed
    when ``side`` is not 0. ``transform``: None or ``times_p`` (the grid holds value / p).
    Storage counts the helper's values too."""
    method: str
    fmt: str
    x: GridAxis
    y: GridAxis
    z: np.ndarray
    coord: str
    side: int
    near: float
    far: float
    near_rel: bool
    far_rel: bool
    helper: Piecewise1D = None
    policy: str = "clamp"
    transform: str = None
    notes: dict = field(default_factory=dict, compare=False)

    def __post_init__(self):
        if self.method not in METHODS:
            raise ValueError(f"method must be one of {METHODS}, not {self.method!r}")
        if self.fmt not in arith.FORMATS:
            raise ValueError(f"fmt must be one of {tuple(arith.FORMATS)}, not {self.fmt!r}")
        if self.coord not in COORDS:
            raise ValueError(f"coord must be one of {COORDS}, not {self.coord!r}")
        if self.policy not in POLICIES:
            raise ValueError(f"policy must be one of {POLICIES}, not {self.policy!r}")
        if self.side not in (-1, 0, 1):
            raise ValueError(f"side must be -1, 0 or +1, not {self.side!r}")
        if self.transform not in (None, "times_p"):
            raise ValueError(f"transform must be None or 'times_p', not {self.transform!r}")
        need = 4 if self.method == "bicubic" else 2
        for name, ax in (("x", self.x), ("y", self.y)):
            if ax.n < need:
                raise ValueError(f"{self.method} needs at least {need} lines on {name}, not {ax.n}")
            if ax.layout == "free":
                if not _is_format(ax.lines, self.fmt):
                    raise ValueError(f"free {name} lines must be {self.fmt} values")
                if self.method == "bilinear" and ax.iw is None:
                    raise ValueError(f"bilinear on a free {name} axis needs iw")
                if self.method == "bicubic" and ax.den is None:
                    raise ValueError(f"bicubic on a free {name} axis needs den")
        z = np.asarray(self.z)
        if z.shape != (self.x.n, self.y.n):
            raise ValueError(f"z must have shape ({self.x.n}, {self.y.n}), not {z.shape}")
        if not np.all(np.isfinite(z)):
            i, j = np.argwhere(~np.isfinite(z))[0]
            raise ValueError(f"z[{i}, {j}] is not finite")
        if not _is_format(z, self.fmt):
            raise ValueError(f"z must hold {self.fmt} values")
        uses_sat = self.coord != "raw" or self.near_rel or self.far_rel or self.side != 0
        if uses_sat and self.helper is None:
            raise ValueError("this grid needs the saturation helper (side, coordinate or a "
                             "relative limit)")
        if self.side == 0 and (self.near_rel or self.far_rel or self.coord != "raw"):
            raise ValueError("a grid with no saturation side takes raw coordinates and absolute "
                             "limits")
        if self.helper is not None and self.helper.fmt != self.fmt:
            raise ValueError("the helper must be in the grid's format")

    def __repr__(self):
        return (f"Grid2D(method={self.method!r}, fmt={self.fmt!r}, x={self.x!r}, y={self.y!r}, "
                f"coord={self.coord!r}, side={self.side:+d}, helper={self.helper!r}, "
                f"storage_bytes={self.storage_bytes})")

    @property
    def nx(self):
        return self.x.n

    @property
    def ny(self):
        return self.y.n

    @property
    def itemsize(self):
        return np.dtype(arith.FORMATS[self.fmt]).itemsize

    def grid_values(self):
        """Values of the grid's own tables (nodes and free-axis constants)."""
        return int(np.asarray(self.z).size + self.x.stored_values(self.method)
                   + self.y.stored_values(self.method))

    def stored_values(self):
        """Everything the target keeps in tables for this function, the helper included
        (range limits and uniform-axis constants are folded into code, not counted)."""
        return self.grid_values() + (self.helper.stored_values() if self.helper else 0)

    @property
    def storage_bytes(self):
        return self.stored_values() * self.itemsize

    @property
    def p_lo(self):
        return self.x.lo

    @property
    def p_hi(self):
        return self.x.hi

    def runtime(self):
        """The plain dict :mod:`gen.arith2d` evaluates (all numbers in the format)."""
        ft = arith.FORMATS[self.fmt]
        return {"fmt": self.fmt, "method": self.method, "policy": self.policy,
                "side": self.side, "coord": self.coord, "transform": self.transform,
                "near": ft(self.near), "far": ft(self.far), "near_rel": self.near_rel,
                "far_rel": self.far_rel, "p_lo": ft(self.x.lo), "p_hi": ft(self.x.hi),
                "y_lo": ft(self.y.lo), "y_hi": ft(self.y.hi),
                "x": self.x.runtime(self.fmt), "y": self.y.runtime(self.fmt),
                "z": np.asarray(self.z).astype(ft),
                "sat": None if self.helper is None else sat_runtime(self.helper)}

    def __call__(self, p, v, fused=False):
        """The emitted function, emulated in the target arithmetic (``fused``: with FMA)."""
        return arith2d.evaluate2d(p, v, self.runtime(), fused)

    def status(self, p, v):
        return arith2d.status2d(p, v, self.runtime())


def estimated_ops(g):
    """Rough operations of one call (compares, adds, multiplies, loads; a division counts
    ``SLOW_OP``), for ranking candidates; the helper's own estimate is included."""
    from ..build import estimated_ops as ops1
    n = 2 + 4 + 2                      # NaN tests, clamp p, clamp y
    if g.helper is not None and (g.coord != "raw"):
        n += ops1(g.helper) + 2
    n += {"raw": 0, "offset": 1 + 2 * (not g.near_rel) + 2 * (not g.far_rel),
          "normalized": 4 + SLOW_OP}[g.coord]
    for ax in (g.x, g.y):
        if ax.layout == "free":
            n += 3 * max(1, math.ceil(math.log2(max(ax.n - 1, 2))))
        else:
            n += 5
        if g.method == "bicubic":
            n += 4 + 14 + (4 if ax.layout == "free" else 0)
        else:
            n += 4
    n += 4 + 6 if g.method == "bilinear" else 16 + 31
    n += 1 if g.transform else 0
    return int(n)
