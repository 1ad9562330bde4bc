"""Two-input tables: phase-aware domains, the stored grid, fitting with error control, choice.

A single-phase table of two inputs (pressure and temperature, or pressure and specific enthalpy
or entropy for the backward temperature) must not interpolate across the saturation line, where
the properties jump. The second coordinate of the grid is one of:

* ``offset``: superheat ``v - S(p)`` on the vapour side, subcooling ``S(p) - v`` on the liquid
  side, where S(p) is the saturation value of the second input (T_sat, h'', h', s'', s');
* ``normalized``: ``(v - near(p)) / (far(p) - near(p))``, 0 at the limit nearest saturation and
  1 at the other one; this maps a range with one absolute and one relative limit (for example
  from T_sat + 5 K up to 450 degC) onto a rectangle, at the price of one division per call;
* ``raw``: ``v`` itself. For ranges with two absolute limits (supercritical tables), and for a
  vapour or liquid range lying in one IF97 region (1 or 2): the grid is then a box over the raw
  inputs, v is clamped to the limits at its pressure first, and nodes beyond saturation take the
  phase's own equation continued past it (metastable states near the line; nodes no cell of the
  domain uses are filled). In (p, superheat) the grid inherits the curvature of T_sat(p) along
  p, which the raw box does not have, so for liquids and for T(p, h) it is often the smallest.

With one absolute and one relative limit the ``offset`` coordinate runs to the largest distance
over the pressure range and the absolute limit is applied by clamping v first, so part of the
grid is never reached (stored but unused, no division). Every coordinate that applies is tried.

The run time needs S(p): a one-input table built by :func:`gen.build.build_table` (in the same
format, emitted with the one-input macro); its bytes are counted in the grid's storage and its
error reaches the verified total error, since verification runs the whole emulated function.

Offers
    ``Domain2D``, ``make_domain(...)``, ``check_domain(dom, tol_kind, tol)``, ``DomainError``
    ``saturation_helper(dom, fmt, tol, goal)``   the S(p) table (a :class:`gen.build.Table`)
    ``GridAxis``, ``Grid2D``                     the stored grid (checked constructors)
    ``fit_grid(problem, method, layouts, coord)`` one candidate, with error control
    ``verification_inputs(grid, problem, n, seed)`` at least n points, none of the fit's
    ``verify_grid(grid, problem, n, seed)``       dense verification in the target arithmetic
    ``build_grid(dom, tol_kind, tol, ...)``       candidates, choice for a goal, verification
    ``choose_candidate(rows, goal, max_ops)``     the choice (``NEAR_FASTEST`` for "fastest")
    ``GridTable``                                 what ``build_grid`` returns
    ``estimated_ops(grid)``                       rough operations per call, for ranking

Methods: ``bilinear`` (four nodes per cell) and ``bicubic`` (four-node Lagrange interpolation
per axis over a 4x4 stencil of node values: continuous across cell edges, error of order h^4,
one stored value per node). Axes: ``free`` lines (binary search) or ``uniform`` ones (O(1)
index). Every fit is checked on points that are never its nodes, in the target arithmetic
emulated operation by operation (:mod:`gen.arith2d`); every maximum error here is the largest
of the points named, a sampled measurement and not a bound.

The C and Python views and the plain-text summary live in :mod:`gen.emit.grid2d`.

Everything that decides emitted bits is elementwise numpy in a fixed order (no BLAS) on fixed
point sets from seeded generators.
"""

import hashlib
import math
import time
from dataclasses import dataclass, field
from functools import cached_property

import numpy as np

from .. import arith, arith2d
from .. import quantities as Q
from ..verify import float_neighbours
from .piecewise import Piecewise1D

PHASES = ("vapor", "liquid", "supercritical")
SECOND_INPUTS = ("temperature", "specific_enthalpy", "specific_entropy")
METHODS = ("bilinear", "bicubic")
AXIS_LAYOUTS = ("free", "mapped", "uniform")
#: most bins of a mapped axis
MAX_BINS = 256
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
INPUT_WORDS = {"temperature": "temperature", "specific_enthalpy": "specific enthalpy",
          "specific_entropy": "specific entropy"}
_SYMBOL = {"temperature": "T_sat", "specific_enthalpy": "h_sat", "specific_entropy": "s_sat"}
_LETTER = {"temperature": "T", "specific_enthalpy": "h", "specific_entropy": "s"}

#: share of the tolerance given to the saturation helper's error (propagated through the grid)
HELPER_SHARE = 0.15
#: a candidate's check-set maximum must stay below this share of the tolerance
ACCEPT = 0.95
#: most lines per axis, and most nodes, of any candidate
MAX_LINES = 2048
MAX_NODES = 400_000
#: random check points per problem (fit control; never verification points), and check points
#: along each edge of the domain
CHECK_POINTS = 48_000
CHECK_EDGE_POINTS = 129
#: verification points along each edge: at k / 255 of it, which meets the check points at
#: j / 128 only at the corners (left out there; their format neighbours are verified instead)
EDGE_POINTS = 256
#: the seeded random share of a verification fills it up to the points asked for, and is never
#: less than this share of them however many directed points (lines, cells) a grid has
RANDOM_SHARE_MIN = 0.25
#: a step of the core across a region boundary above this share of the tolerance is refused
STEP_SHARE = 0.25
#: a supercritical range must keep this relative distance from the critical point in pressure
#: or in temperature (properties there are too steep for a grid; a product choice)
CRITICAL_MARGIN = 0.01
#: goal "fastest" takes the candidate storing the fewest bytes among those whose estimated
#: operations per call are at most this share more than the fewest found. Chosen from the four
#: float32 cases of bench/grids.py (callgrind, gcc -O2, x86-64): uniform bilinear grids in the
#: three coordinates are estimated within 0.11 of the fewest and measure 84-115 instructions;
#: bin-mapped bilinear ones are estimated from 0.19 over the fewest on and measure 109-141
#: (over 120 with the free-lines helper of goal "smallest"). Below 0.034 one case keeps a grid
#: of 20 kB, not 10x fewer bytes than a raw uniform grid; 0.15 takes the smaller uniform grids
#: and leaves the mapped ones out.
NEAR_FASTEST = 0.15
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
        if np.size(p) == 0:
            return np.zeros(np.shape(p))
        p = np.asarray(p, dtype=np.float64)
        u, inv = np.unique(p, return_inverse=True)
        si = Q.evaluate(self.sat_quantity, pressure=self.p_si(u), mask=True)
        return self.v_user(np.asarray(si)[inv.reshape(p.shape)])

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

        Temperatures within round-off of saturation are moved a hair (2e-13 relative) to the
        domain's side, so that the core does not take them for the other phase (the backward
        functions already put a saturated h or s on the side asked for)."""
        if np.size(p) == 0:
            return np.zeros(np.shape(p))
        psi = self.p_si(p)
        vsi = self.v_si(v)
        if self.side and self.second == "temperature":
            ssi = self.v_si(self.sat(p))
            hair = np.abs(ssi) * 2e-13 + 1e-12
            close = np.abs(vsi - ssi) < hair
            vsi = np.where(close, ssi + self.side * hair, vsi)
        kw = {"pressure": psi, self.second: vsi}
        phase = {"vapor": "vapor", "liquid": "liquid"}.get(self.phase)
        if Q.CATALOGUE[self.quantity].family == "single_phase":
            y = Q.evaluate(self.quantity, mask=True, phase=phase, **kw)
        else:
            y = Q.evaluate(self.quantity, mask=True, **kw)
        return (np.asarray(y, dtype=np.float64) - self.out_offset) / self.out_scale


def extension(dom, p, v):
    """The domain phase's own IF97 equation at (p, v), continued past saturation (region 2
    for vapour, region 1 for liquid; backward temperature through that region's backward
    equation refined on it), in the output unit. Near saturation it is the metastable state;
    far from it the continued equation is not physical and may be wild (such nodes are never
    used by a cell of the domain, see :meth:`Problem.nodes`)."""
    from ..if97 import core, region1, region2
    reg = region2 if dom.side > 0 else region1
    psi, vsi = dom.p_si(p), dom.v_si(v)
    with np.errstate(all="ignore"):
        if dom.second == "temperature":
            d = reg.props(psi, vsi)
            if dom.quantity == "dynamic_viscosity":
                y = core.transport_viscosity(d["rho"], vsi)
            elif dom.quantity == "thermal_conductivity":
                y = core.transport_conductivity(d["rho"], vsi, d["cp"], d["cv"], d["drhodp"])
            else:
                y = d[Q._PROP_KEY[dom.quantity]]
        elif dom.second == "specific_enthalpy":
            y = reg.temperature_ph(psi, vsi)
        else:
            y = reg.temperature_ps(psi, vsi)
    return (np.asarray(y, dtype=np.float64) - dom.out_offset) / dom.out_scale


def extension_applies(dom):
    """Whether the whole domain lies in the region :func:`extension` continues (the core and
    the continued equation agree to 1e-11 on a sampling of the domain)."""
    if not dom.side or (dom.quantity == "temperature" and dom.second == "temperature"):
        return False
    P, V = domain_grid(dom, 33, 33)
    a, b = dom.core(P, V), extension(dom, P, V)
    return bool(np.all(np.abs(a - b) <= 1e-11 * np.abs(a) + 1e-300))


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
    return (f"pressure {_g(dom.p_lo)} to {_g(dom.p_hi)} {dom.p_unit}; {INPUT_WORDS[dom.second]} "
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
        if not dom.near < dom.far:
            raise DomainError(f"the lower limit {_vt(dom, dom.near)} of a supercritical table must "
                              f"be below its upper limit {_vt(dom, dom.far)}")
        t_lo, t_hi = float(dom.v_si(dom.near)), float(dom.v_si(dom.far))
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
                              f"{INPUT_WORDS[dom.second]}) needs p above {_pt(dom, pu(PC))}")
    # sides of saturation and order of the limits, corner by corner
    if dom.side:
        ps_user = np.array([dom.p_lo, dom.p_hi], dtype=np.float64)
        pdense = np.concatenate([ps_user, np.linspace(dom.p_lo, dom.p_hi, 257)])
        S = dom.sat(pdense)
        near, far = dom.limits(pdense)
        sgn = dom.side
        word = INPUT_WORDS[dom.second]
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
                          f"{INPUT_WORDS[dom.second]} = {_vt(dom, vv[k])}): outside IF97's validity")
    # the critical region: a supercritical table must keep CRITICAL_MARGIN from it
    if dom.phase == "supercritical":
        T = dom.v_si(vv) if dom.second == "temperature" else np.asarray(
            Q.evaluate("temperature", mask=True, pressure=dom.p_si(pp),
                       **{dom.second: dom.v_si(vv)}), dtype=np.float64)
        d = np.maximum(np.abs(dom.p_si(pp) / PC - 1.0), np.abs(T / TC - 1.0))
        k = int(np.nanargmin(d))
        if d[k] < CRITICAL_MARGIN:
            raise DomainError(
                f"the range comes within {d[k] * 100:.2g} % of the critical point "
                f"({_pt(dom, pu(PC))}, {_vt(dom, vu(TC)) if dom.second == 'temperature' else f'{TC:g} K'}) "
                f"at (p = {_pt(dom, pp[k])}, {INPUT_WORDS[dom.second]} = {_vt(dom, vv[k])}); "
                f"properties are too steep to tabulate there: keep "
                f"{CRITICAL_MARGIN * 100:g} % away in pressure or temperature")
    # region boundaries: where the core steps; for a second input other than temperature the
    # boundary temperature is mapped to that input through the core's forward value
    side_phase = dom.phase if dom.phase in ("vapor", "liquid") else None
    for name, (b_lo, b_hi), tb in _boundaries():
        lo, hi = max(p_lo_si, b_lo), min(p_hi_si, b_hi)
        if lo >= hi:
            continue
        psi = np.linspace(lo, hi, 129)
        p_user = pu(psi)
        if dom.second == "temperature":
            tv = dom.v_user(tb(psi))
        else:
            tv = dom.v_user(np.asarray(Q.evaluate(dom.second, mask=True, phase=side_phase,
                                                  pressure=psi, temperature=tb(psi)),
                                       dtype=np.float64))
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
                f"the range crosses {name} near (p = {_pt(dom, p_in[k])}, "
                f"{_LETTER[dom.second]} = {_vt(dom, t_in[k])}), where the core's "
                f"{dom.quantity.replace('_', ' ')} steps by {step[k]:.3g} {dom.out_unit} ({rel[k] / tol:.2g} times the "
                f"tolerance); split the range there")
        notes.append(f"crosses {name}; the core steps by at most {step[k]:.3g} "
                     f"{dom.out_unit} there, which the grid interpolates across")
    return notes


def away_from_saturation(dom, P, V, dp):
    """Step directions (pressure, second input) at (P, V) that move away from the saturation
    line: the second input away from its side, pressure the way that moves S(p) away from v
    (h''(p) is not monotone); 0 (a central difference) on a supercritical table."""
    if not dom.side:
        return 0.0, 0.0
    up = dom.side * (V - dom.sat(P + dp)) >= dom.side * (V - dom.sat(P - dp))
    return np.where(up, 1.0, -1.0), float(dom.side)


def partials(f, P, V, p_dir, v_dir, hp, hv):
    """(df/dp, df/dv) of ``f(P, V)`` by second-order differences: one-sided, stepping ``hp``
    in the direction ``p_dir`` (+1 or -1, or an array of them) and ``hv`` in ``v_dir``, or
    central where the direction is 0; where a one-sided step leaves the core's domain (NaN),
    the other direction is used. A point on the saturation line itself has only one side."""

    def one(g, h, d):
        if np.all(np.asarray(d) == 0):
            return (g(h) - g(-h)) / (2 * h)
        fwd = (-3.0 * g(0.0) + 4.0 * g(d * h) - g(2.0 * d * h)) / (2.0 * d * h)
        back = (-3.0 * g(0.0) + 4.0 * g(-d * h) - g(-2.0 * d * h)) / (-2.0 * d * h)
        return np.where(np.isfinite(fwd), fwd, back)

    return one(lambda k: f(P + k, V), hp, p_dir), one(lambda k: f(P, V + k), hv, v_dir)


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
    """The run-time S(p) as a verified one-input table (:class:`gen.build.Table`), built by
    :func:`gen.build.build_helper_table` over the grid's pressure range with an absolute
    tolerance ``tol_abs`` in the second input's unit."""
    from ..build import BuildError, build_helper_table
    from ..spec import InputSpec
    if dom.sat_quantity is None:
        return None
    inp = InputSpec(quantity="pressure", unit=dom.p_unit, lo=float(dom.p_lo), hi=float(dom.p_hi),
                    scale=dom.p_scale, offset=dom.p_offset)
    try:
        return build_helper_table(dom.sat_quantity, inp, dom.v_unit, dom.v_scale, dom.v_offset,
                                  "abs", tol_abs, fmt, goal, name=name,
                                  verify_points=verify_points)
    except BuildError as e:
        raise DomainError(f"the saturation helper ({dom.sat_quantity} within "
                          f"{tol_abs:.3g} {dom.v_unit}) cannot be built: {e}") from None


# ---------------------------------------------------------------------------------------------
# the stored grid


def _is_format(a, fmt):
    a = np.asarray(a, dtype=np.float64)
    return bool(np.all(arith.to_format(a, fmt).astype(np.float64) == a))


@dataclass(frozen=True, eq=False)
class GridAxis:
    """One axis of a rectilinear grid.

    ``lines``: the n node coordinates, increasing (float64 holding format values on a ``free``
    axis; ``x0 + k / inv_h`` on a ``uniform`` one). ``lo``/``hi``: the axis range the run time
    clamps to. Run-time constants: ``iw[i] = 1 / (lines[i+1] - lines[i])`` (free, bilinear),
    ``den[s, k] = 1 / prod_{m != k} (lines[s+k] - lines[s+m])`` for the stencil s..s+3 (free,
    bicubic), ``x0``/``inv_h`` (uniform), all in the format. A ``mapped`` axis is a free one
    with ``map[k]``, the cell of the lowest input of bin k = (int)((c - b0) * inv_hb), so that
    the run time starts there and steps up at most ``steps`` times (no binary search)."""
    layout: str
    lines: np.ndarray
    lo: float
    hi: float
    iw: np.ndarray = None
    den: np.ndarray = None
    x0: float = None
    inv_h: float = None
    map: np.ndarray = None
    b0: float = None
    inv_hb: float = None
    steps: int = 0

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
        if self.layout in ("free", "mapped") and self.iw is None and self.den is None:
            raise ValueError(f"a {self.layout} axis needs iw (bilinear) or den (bicubic)")
        if self.layout == "mapped":
            if self.map is None or self.b0 is None or self.inv_hb is None:
                raise ValueError("a mapped axis needs map, b0 and inv_hb")
            m = np.asarray(self.map)
            if m.ndim != 1 or m.size < 1 or np.any(np.diff(m) < 0) or m[0] != 0 \
                    or m[-1] > x.size - 2:
                raise ValueError("map must be non-decreasing cell indices from 0 to at most n-2")
        if self.iw is not None and np.shape(self.iw) != (x.size - 1,):
            raise ValueError(f"iw must have n-1 = {x.size - 1} values, not {np.shape(self.iw)}")
        if self.den is not None and np.shape(self.den) != (x.size - 3, 4):
            raise ValueError(f"den must have shape ({x.size - 3}, 4), not {np.shape(self.den)}")

    @property
    def n(self):
        return int(np.asarray(self.lines).size)

    def __repr__(self):
        extra = f", bins={np.asarray(self.map).size}" if self.layout == "mapped" else ""
        return f"GridAxis({self.layout!r}, n={self.n}, lo={self.lo!r}, hi={self.hi!r}{extra})"

    def stored_values(self, method):
        """Format values this axis keeps in tables (the constants of a uniform axis live in
        code; a mapped axis's bin table is counted in :attr:`map_bytes`)."""
        if self.layout == "uniform":
            return 0
        if method == "bilinear":
            return 2 * (self.n - 1)      # lines[0..n-2] and iw[0..n-2]
        return self.n + 4 * (self.n - 3)  # all lines and four reciprocals per stencil

    @property
    def map_itemsize(self):
        return 1 if self.n - 1 <= 256 else 2

    @property
    def map_bytes(self):
        return 0 if self.layout != "mapped" else int(np.asarray(self.map).size) * self.map_itemsize

    def runtime(self, fmt):
        ft = arith.FORMATS[fmt]
        d = {"layout": self.layout, "n": self.n,
             "lines": (np.asarray(self.lines).astype(ft) if self.layout != "uniform" else None),
             "iw": None if self.iw is None else np.asarray(self.iw).astype(ft),
             "den": None if self.den is None else np.asarray(self.den).astype(ft),
             "x0": None if self.x0 is None else ft(self.x0),
             "inv_h": None if self.inv_h is None else ft(self.inv_h)}
        if self.layout == "mapped":
            d.update({"map": np.asarray(self.map, dtype=np.int64), "b0": ft(self.b0),
                      "inv_hb": ft(self.inv_hb)})
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


def _order_keys(a, fmt):
    """Integers in the order of the format's values (for bisection over representable values)."""
    stype, mask = {"float32": (np.int32, 0x7FFFFFFF),
                   "float64": (np.int64, 0x7FFFFFFFFFFFFFFF)}[fmt]
    sbits = np.ascontiguousarray(np.asarray(a).astype(arith.FORMATS[fmt])).view(stype)
    mag = (sbits & stype(mask)).astype(np.int64)
    return np.where(sbits < 0, -mag, mag)


def _from_keys(k, fmt):
    shift, utype = {"float32": (31, np.uint32), "float64": (63, np.uint64)}[fmt]
    k = np.asarray(k, dtype=np.int64)
    mag = np.abs(k).astype(np.uint64)
    bits = np.where(k < 0, mag | np.uint64(1 << shift), mag).astype(utype)
    return bits.view(arith.FORMATS[fmt]).astype(np.float64)


def mapped_axis(ax, fmt, max_bins=MAX_BINS, bins=None):
    """The free axis ``ax`` with a bin table: ``bins`` equal bins (default: as many as make
    every bin no wider than the narrowest cell, at most ``max_bins``). ``map[k]`` is the cell
    of the lowest format value the run time puts in bin k, found by bisection over the
    format's values, so the run time's upward steps never overshoot; ``steps`` is the most
    any input needs."""
    ft = arith.FORMATS[fmt]
    lines = np.asarray(ax.lines, dtype=np.float64)
    lo, hi = float(ft(ax.lo)), float(ft(ax.hi))
    if bins is None:
        narrowest = float(np.min(np.diff(lines)))
        bins = int(min(max_bins, max(lines.size - 1, math.ceil((hi - lo) / narrowest))))
    b0 = lo
    inv_hb = float(ft(bins / (hi - b0)))

    def bin_of(c):
        return arith2d.map_bin(np.asarray(c).astype(ft), ft(b0), ft(inv_hb), bins)

    # lowest format value in [lo, hi] whose bin is at least k, for k = 1..bins-1
    ks = np.arange(1, bins)
    L = np.full(ks.shape, int(_order_keys(np.array([lo]), fmt)[0]))
    H = np.full(ks.shape, int(_order_keys(np.array([hi]), fmt)[0]))
    while True:
        open_ = H - L > 1
        if not open_.any():
            break
        mid = (L + H) // 2
        up = bin_of(_from_keys(mid, fmt)) >= ks
        H = np.where(open_ & up, mid, H)
        L = np.where(open_ & ~up, mid, L)
    starts = np.concatenate([[lo], _from_keys(H, fmt)])
    n = lines.size
    cell = lambda c: np.searchsorted(lines[1:n - 1], c, side="right")  # noqa: E731
    m = cell(starts)
    ends = np.concatenate([_from_keys(H - 1, fmt), [hi]])
    steps = int(np.max(cell(ends) - m)) if bins else 0
    return GridAxis("mapped", lines, ax.lo, ax.hi, iw=ax.iw, den=ax.den, map=m.astype(np.int64),
                    b0=b0, inv_hb=inv_hb, steps=steps)


def uniform_axis(lo, hi, n, fmt):
    """A uniform axis of ``n`` lines over [lo, hi] (format values): node k at x0 + k / inv_h."""
    ft = arith.FORMATS[fmt]
    x0 = float(ft(lo))
    hi = float(ft(hi))
    inv_h = float(ft((n - 1) / (hi - x0)))
    lines = x0 + np.arange(n, dtype=np.float64) / inv_h
    return GridAxis("uniform", lines, x0, hi, x0=x0, inv_h=inv_h)


@dataclass(frozen=True, eq=False)
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
            if ax.layout in ("free", "mapped"):
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
        """Format values of the grid's own tables (nodes and free-axis constants)."""
        return int(np.asarray(self.z).size + self.x.stored_values(self.method)
                   + self.y.stored_values(self.method))

    def stored_values(self):
        """Format values the target keeps in tables for this function, the helper included
        (range limits and uniform-axis constants are folded into code, not counted; the bin
        tables of mapped axes are small integers, counted in :attr:`storage_bytes`)."""
        return self.grid_values() + (self.helper.stored_values() if self.helper else 0)

    @property
    def grid_bytes(self):
        return self.grid_values() * self.itemsize + self.x.map_bytes + self.y.map_bytes

    @property
    def storage_bytes(self):
        """Bytes of every table of this function: grid, bin tables and helper."""
        return self.grid_bytes + (self.helper.storage_bytes if self.helper else 0)

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
                "sat": None if self.helper is None else self.helper.runtime()}

    @cached_property
    def _rt(self):
        return self.runtime()

    def __call__(self, p, v, fused=False):
        """The emitted function, emulated in the target arithmetic (``fused``: with FMA)."""
        return arith2d.evaluate2d(p, v, self._rt, fused)

    def status(self, p, v):
        return arith2d.status2d(p, v, self._rt)


def estimated_ops(g):
    """Rough instructions of one call, for ranking candidates: a model of what gcc -O2 makes
    of the emitted C on x86-64, fitted to callgrind counts of a few grids (within about 20 %
    there); a division counts ``SLOW_OP``. Not a measurement."""
    from ..build import estimated_ops as ops1
    n = 30                                   # NaN tests, clamps, call and return
    if g.helper is not None and (g.coord != "raw" or g.near_rel or g.far_rel):
        n += ops1(g.helper) + 2
    n += {"raw": 2 + 6 * (g.side != 0), "offset": 3 + 2 * (not g.near_rel) + 2 * (not g.far_rel),
          "normalized": 6 + SLOW_OP}[g.coord]
    for ax in (g.x, g.y):
        if ax.layout == "free":
            n += 11 * max(1, math.ceil(math.log2(max(ax.n - 1, 2)))) + 2
        elif ax.layout == "mapped":
            n += 12 + 5 * ax.steps
        else:
            n += 8
        n += 3 if g.method == "bilinear" else 18 + 10
    n += 14 if g.method == "bilinear" else 50
    n += 1 if g.transform else 0
    return int(n)


# ---------------------------------------------------------------------------------------------
# the fitting problem: a domain with its tolerance, format and helper


@dataclass
class PointSet:
    """Points in the domain with everything an error measurement needs.

    ``p``, ``v``: exact inputs (float64, user units); ``x``, ``y``: the run-time coordinates
    the emulated code computes from them (format); ``gx``, ``gy``: their exact grid
    coordinates; ``truth``: the core; ``sc``: the error scale (1 or |truth|)."""
    p: np.ndarray
    v: np.ndarray
    x: np.ndarray
    y: np.ndarray
    gx: np.ndarray
    gy: np.ndarray
    truth: np.ndarray
    sc: np.ndarray

    def take(self, m):
        return PointSet(*(getattr(self, k)[m] for k in
                          ("p", "v", "x", "y", "gx", "gy", "truth", "sc")))

    def join(self, other):
        return PointSet(*(np.concatenate([getattr(self, k), getattr(other, k)]) for k in
                          ("p", "v", "x", "y", "gx", "gy", "truth", "sc")))

    @property
    def size(self):
        return int(self.p.size)


def _seed(*parts):
    h = hashlib.sha256("|".join(str(p) for p in parts).encode()).digest()
    return int.from_bytes(h[:8], "little")


class Problem:
    """What every candidate of one table shares: domain, tolerance, format, policy, helper,
    the exact coordinate maps, a reference sampling and the check points (cached)."""

    def __init__(self, dom, tol_kind, tol, fmt="float32", policy="clamp", helper=None):
        self.dom, self.tol_kind, self.tol = dom, tol_kind, float(tol)
        self.fmt, self.policy = fmt, policy
        self.ft = arith.FORMATS[fmt]
        from ..build import error_scale, format_range
        self.p_lo, self.p_hi = format_range(dom.p_lo, dom.p_hi, fmt)
        self.helper = helper
        self.helper_pw = helper.piecewise if helper is not None else None
        self.sat_rt = self.helper_pw.runtime() if helper is not None else None
        self.side = dom.side
        self.key = repr((dom, tol_kind, tol, fmt, policy))
        self.scale = error_scale(tol_kind)
        self._cache = {}

    # maps ------------------------------------------------------------------------------------
    def f(self, p, v):
        return self.dom.core(p, v)

    def coords(self):
        """Second coordinates worth trying: ``raw`` where the limits are absolute, or where
        the phase's own equation continues past saturation (a box in the raw inputs, with
        nodes beyond the domain from that equation); ``offset`` and ``normalized`` from
        saturation otherwise (``normalized`` only for one absolute and one relative limit)."""
        d = self.dom
        if d.side == 0 or not (d.near_rel or d.far_rel):
            return ["raw"]
        out = ["offset"] if d.near_rel and d.far_rel else ["normalized", "offset"]
        if self.continued():
            out.append("raw")
        return out

    def continued(self):
        """Whether ``raw`` nodes beyond the domain take the phase's continued equation."""
        d = self.dom
        if not (d.side and (d.near_rel or d.far_rel)):
            return False
        if "continued" not in self._cache:
            self._cache["continued"] = extension_applies(d)
        return self._cache["continued"]

    def node_f(self, coord):
        """The function node values come from: the core, or for ``raw`` coordinates of a
        phase domain with a relative limit the phase's continued equation (equal to the core
        inside the domain)."""
        if coord == "raw" and self.continued():
            return lambda p, v: extension(self.dom, p, v)
        return self.f

    def _pdense(self):
        return np.linspace(self.dom.p_lo, self.dom.p_hi, 1025)

    def y_range(self, coord):
        """(lo, hi) of the second coordinate, format values (outward where a limit varies)."""
        if ("yr", coord) in self._cache:
            return self._cache[("yr", coord)]
        d, ft = self.dom, self.ft
        def up(a):
            return float(np.nextafter(ft(a), ft(np.inf))) if float(ft(a)) < a else float(ft(a))

        def dn(a):
            return float(np.nextafter(ft(a), ft(-np.inf))) if float(ft(a)) > a else float(ft(a))

        if coord == "normalized":
            r = (0.0, 1.0)
        elif coord == "raw" and (d.near_rel or d.far_rel):
            near, far = d.limits(self._pdense())
            r = (dn(float(np.min(np.minimum(near, far)))), up(float(np.max(np.maximum(near, far)))))
        elif coord == "raw":
            lo, hi = sorted((float(d.near), float(d.far)))
            r = (up(lo), dn(hi))
        else:
            pd = self._pdense()
            near, far = d.limits(pd)
            S = d.sat(pd)
            dn_near = d.side * (near - S)
            dn_far = d.side * (far - S)
            lo = float(d.near) if d.near_rel else float(np.min(dn_near))
            hi = float(d.far) if d.far_rel else float(np.max(dn_far))
            r = (float(ft(lo)) if d.near_rel else dn(lo), float(ft(hi)) if d.far_rel else up(hi))
        self._cache[("yr", coord)] = r
        return r

    def v_of(self, coord, p, y):
        """Exact second input at grid coordinates (p, y)."""
        d = self.dom
        if coord == "raw":
            return np.asarray(y, dtype=np.float64) + 0.0 * p
        if coord == "offset":
            return d.sat(p) + d.side * np.asarray(y, dtype=np.float64)
        near, far = d.limits(p)
        return near + np.asarray(y, dtype=np.float64) * (far - near)

    def y_of(self, coord, p, v):
        """Exact grid coordinate y of the input (p, v)."""
        d = self.dom
        if coord == "raw":
            return np.asarray(v, dtype=np.float64) + 0.0 * p
        if coord == "offset":
            return d.side * (np.asarray(v, dtype=np.float64) - d.sat(p))
        near, far = d.limits(p)
        return (np.asarray(v, dtype=np.float64) - near) / (far - near)

    def reachable(self, coord, p, y):
        """Whether grid coordinates (p, y) belong to the domain (all, but in ``offset``
        coordinates with an absolute limit)."""
        d = self.dom
        if coord == "raw" and (d.near_rel or d.far_rel):
            near, far = d.limits(p)
            lo, hi = np.minimum(near, far), np.maximum(near, far)
            slack = 1e-9 * (np.abs(lo) + np.abs(hi) + 1.0)
            return (y >= lo - slack) & (y <= hi + slack)
        if coord != "offset" or (d.near_rel and d.far_rel):
            return np.ones(np.shape(p), dtype=bool)
        near, far = d.limits(p)
        S = d.sat(p)
        a, b = d.side * (near - S), d.side * (far - S)
        slack = 1e-9 * (np.abs(a) + np.abs(b) + 1.0)
        return (y >= a - slack) & (y <= b + slack)

    def base_tab(self, coord):
        ft = self.ft
        y_lo, y_hi = self.y_range(coord)
        return {"fmt": self.fmt, "method": None, "policy": self.policy, "side": self.side,
                "coord": coord, "transform": None, "near": ft(self.dom.near),
                "far": ft(self.dom.far), "near_rel": self.dom.near_rel,
                "far_rel": self.dom.far_rel, "p_lo": ft(self.p_lo), "p_hi": ft(self.p_hi),
                "y_lo": ft(y_lo), "y_hi": ft(y_hi), "sat": self.sat_rt}

    # point sets ------------------------------------------------------------------------------
    def pointset(self, coord, p, v, truth=None):
        p = np.asarray(p, dtype=np.float64).ravel()
        v = np.asarray(v, dtype=np.float64).ravel()
        if truth is None:
            truth = self.f(p, v)
        ok = np.isfinite(truth)
        p, v, truth = p[ok], v[ok], truth[ok]
        with np.errstate(invalid="ignore", over="ignore"):
            x, _, y = arith2d.coordinates2d(p, v, self.base_tab(coord))
        return PointSet(p, v, x, y, p.copy(), self.y_of(coord, p, v), truth, self.scale(truth))

    def random_inputs(self, n, seed):
        """``n`` seeded points (p, v) of the domain: half uniform in p, half log-uniform where
        the range allows; the second input uniform between its limits at each p."""
        d = self.dom
        rng = np.random.default_rng(seed)
        if self.p_lo > 0 and self.p_hi / self.p_lo > 1.5 and d.p_offset == 0.0:
            m = n // 2
            p = np.concatenate([rng.uniform(self.p_lo, self.p_hi, m),
                                np.exp(rng.uniform(np.log(self.p_lo), np.log(self.p_hi),
                                                   n - m))])
        else:
            p = rng.uniform(self.p_lo, self.p_hi, n)
        p = np.clip(p, self.p_lo, self.p_hi)
        s = rng.uniform(0.0, 1.0, n)
        near, far = d.limits(p)
        return p, near + s * (far - near)

    def edge_inputs(self, m):
        """Points along the four edges of the domain, corners included."""
        d = self.dom
        s = np.linspace(0.0, 1.0, m)
        ps = np.concatenate([np.linspace(self.p_lo, self.p_hi, m),
                             np.geomspace(self.p_lo, self.p_hi, m) if self.p_lo > 0
                             else np.linspace(self.p_lo, self.p_hi, m)])
        near, far = d.limits(ps)
        pe = np.array([self.p_lo, self.p_hi])
        ne, fe = d.limits(pe)
        P = [ps, ps, np.repeat(pe, m)]
        V = [near, far, (ne[:, None] + s[None, :] * (fe - ne)[:, None]).ravel()]
        return np.concatenate(P), np.concatenate(V)

    def check_inputs(self):
        """(p, v, core) of the fixed check points of this problem's fits: seeded random ones
        and ``CHECK_EDGE_POINTS`` along each edge (never verification points)."""
        base = ("check_inputs",)
        if base not in self._cache:
            p, v = self.random_inputs(CHECK_POINTS, _seed(self.key, "check"))
            pe, ve = self.edge_inputs(CHECK_EDGE_POINTS)
            p, v = np.concatenate([p, pe]), np.concatenate([v, ve])
            self._cache[base] = (p, v, self.f(p, v))
        return self._cache[base]

    def check_set(self, coord):
        """The check inputs as a point set in coordinates ``coord``."""
        k = ("check", coord)
        if k not in self._cache:
            p, v, t = self.check_inputs()
            self._cache[k] = self.pointset(coord, p, v, t)
        return self._cache[k]

    def centers(self, coord, xs, ys, xr=None, yr=None):
        """Cell centres of the grid on lines (xs, ys), inside the domain, as a point set;
        ``xr`` = (a, b) keeps only cells with x between a and b, ``yr`` likewise in y."""
        xc = 0.5 * (xs[1:] + xs[:-1])
        if xr is not None:
            xc = xc[(xc >= xr[0]) & (xc <= xr[1])]
        yc = 0.5 * (ys[1:] + ys[:-1])
        if yr is not None:
            yc = yc[(yc >= yr[0]) & (yc <= yr[1])]
        P = np.repeat(xc, yc.size)
        Y = np.tile(yc, xc.size)
        keep = self.reachable(coord, P, Y)
        P, Y = P[keep], Y[keep]
        return self.pointset(coord, P, self.v_of(coord, P, Y))

    def nodes(self, coord, xs, ys, method="bilinear"):
        """Node values (float64), shape (len(xs), len(ys)). On a grid that reaches beyond the
        domain (``raw`` with a relative limit, ``offset`` with an absolute one), nodes that no
        cell of the domain uses (``method``'s stencils) take the value of the nearest used
        node on their pressure line, so that nothing there is wild or undefined."""
        P = np.repeat(xs, ys.size)
        Y = np.tile(ys, xs.size)
        Z = self.node_f(coord)(P, self.v_of(coord, P, Y)).reshape(xs.size, ys.size)
        if coord == "raw" and self.continued():
            need = self.needed(coord, xs, ys, method)
            Z = _fill(Z, need)
        return Z

    def needed(self, coord, xs, ys, method):
        """Mask (nx, ny) of the nodes some cell meeting the domain uses (with a margin of half
        a percent of the y range around the domain's limits)."""
        d = self.dom
        nx, ny = xs.size, ys.size
        s = np.linspace(0.0, 1.0, 9)
        pp = (xs[:-1, None] + np.diff(xs)[:, None] * s[None, :])
        near, far = d.limits(pp.ravel())
        lo = np.minimum(near, far).reshape(pp.shape).min(axis=1)
        hi = np.maximum(near, far).reshape(pp.shape).max(axis=1)
        m = 0.005 * (ys[-1] - ys[0])
        cell = (ys[None, 1:] >= lo[:, None] - m) & (ys[None, :-1] <= hi[:, None] + m)
        need = np.zeros((nx, ny), dtype=bool)
        ii, jj = np.nonzero(cell)
        if method == "bilinear":
            for a in (0, 1):
                for b in (0, 1):
                    need[ii + a, jj + b] = True
        else:
            sx = np.clip(ii - 1, 0, nx - 4)
            sy = np.clip(jj - 1, 0, ny - 4)
            for a in range(4):
                for b in range(4):
                    need[sx + a, sy + b] = True
        return need

    # reference sampling ----------------------------------------------------------------------
    def reference(self, coord, n=97):
        """(xr, yr, F): the core on an n x n grid of coordinates (log-spaced in p where the
        range spans over 4x), NaN where the grid is outside the domain."""
        k = ("ref", coord, n)
        if k not in self._cache:
            d = self.dom
            if self.p_lo > 0 and self.p_hi / self.p_lo > 4.0 and d.p_offset == 0.0:
                xr = np.geomspace(self.p_lo, self.p_hi, n)
            else:
                xr = np.linspace(self.p_lo, self.p_hi, n)
            xr[0], xr[-1] = self.p_lo, self.p_hi
            y_lo, y_hi = self.y_range(coord)
            yr = np.linspace(y_lo, y_hi, n)
            P = np.repeat(xr, n)
            Y = np.tile(yr, n)
            F = self.node_f(coord)(P, self.v_of(coord, P, Y))
            F = np.where(self.reachable(coord, P, Y), F, np.nan).reshape(n, n)
            self._cache[k] = (xr, yr, F)
        return self._cache[k]

    def curvature(self, coord, k):
        """|k-th derivative| / scale along x and along y on the reference grid: two arrays
        (n_x, n_y), NaN where undefined (k = 2 or 4; divided differences)."""
        key = ("curv", coord, k)
        if key not in self._cache:
            xr, yr, F = self.reference(coord)
            sc = self.scale(F)
            gx = np.full(F.shape, np.nan)
            gy = np.full(F.shape, np.nan)
            h = k // 2
            dx = _derivative(F, xr, k, axis=0)
            dy = _derivative(F, yr, k, axis=1)
            with np.errstate(invalid="ignore", divide="ignore"):
                gx[h:-h, :] = np.abs(dx) / sc[h:-h, :]
                gy[:, h:-h] = np.abs(dy) / sc[:, h:-h]
            self._cache[key] = (gx, gy)
        return self._cache[key]

    def slopes(self, P, V):
        """(|df/dp|, |df/dv|) at domain points (P, V), by :func:`partials` stepping away
        from saturation (:func:`away_from_saturation`)."""
        near, far = self.dom.limits(P)
        dp = 1e-6 * np.abs(P) + 1e-12
        dv = 1e-4 * np.abs(far - near)
        fp, fv = partials(self.f, P, V, *away_from_saturation(self.dom, P, V, dp), dp, dv)
        return np.abs(fp), np.abs(fv)

    def slope_v(self):
        """Largest |df/dv| / scale over the domain (reference sampling): the factor by which
        an error of the saturation helper reaches the output."""
        if "slope_v" not in self._cache:
            P, V = domain_grid(self.dom, 65, 65)
            _, fv = self.slopes(P, V)
            self._cache["slope_v"] = float(np.nanmax(fv / self.scale(self.f(P, V))))
        return self._cache["slope_v"]

    def floor(self):
        """Error (tolerance units) from rounding the inputs, the helper's value and the output
        to the format alone, the largest over a reference sampling of the domain."""
        if "floor" not in self._cache:
            ft = self.ft
            P, V = domain_grid(self.dom, 65, 65)
            F = self.f(P, V)
            fp, fv = self.slopes(P, V)

            def ulp(a):
                return np.spacing(np.abs(np.asarray(a)).astype(ft)).astype(np.float64)

            e = 0.5 * ulp(F) + 0.5 * fp * ulp(P) + 0.5 * fv * ulp(V)
            if self.side:
                e = e + 0.5 * fv * ulp(self.dom.sat(P))
            self._cache["floor"] = float(np.nanmax(e / self.scale(F)))
        return self._cache["floor"]


def _fill(Z, need):
    """Z with every node outside ``need`` set to the nearest needed node of its row."""
    Z = Z.copy()
    j = np.arange(Z.shape[1])
    for i in range(Z.shape[0]):
        k = np.nonzero(need[i])[0]
        if k.size == 0:
            continue
        near = k[np.clip(np.searchsorted(k, j), 0, k.size - 1)]
        left = k[np.clip(np.searchsorted(k, j) - 1, 0, k.size - 1)]
        pick = np.where(np.abs(j - left) <= np.abs(near - j), left, near)
        Z[i] = np.where(need[i], Z[i], Z[i, pick])
    return Z


def _derivative(F, x, k, axis):
    """k-th derivative estimate k! f[x_i..x_i+k] along ``axis`` (divided differences)."""
    G = np.moveaxis(F, axis, 0)
    d = G.copy()
    for level in range(1, k + 1):
        span = (x[level:] - x[:-level])
        d = (d[1:] - d[:-1]) / span[:, None]
    d = d * math.factorial(k)
    return np.moveaxis(d, 0, axis)


# ---------------------------------------------------------------------------------------------
# fitting one candidate

#: per method: order of the error in the cell width, its constant, fewest lines per axis
_ORDER = {"bilinear": (2, 1.0 / 8.0, 2), "bicubic": (4, 1.0 / 24.0, 4)}
#: refinement rounds of a free grid before it is given up
MAX_ROUNDS = 40


def _tab(prob, coord, method, xax, yax, Z):
    tab = prob.base_tab(coord)
    tab.update({"method": method, "x": xax.runtime(prob.fmt), "y": yax.runtime(prob.fmt),
                "z": arith.to_format(Z, prob.fmt)})
    return tab


def _errors(tab, pts):
    """|emulated grid - core| / scale at the point set's run-time coordinates."""
    if pts.size == 0:
        return np.zeros(0)
    with np.errstate(invalid="ignore", over="ignore"):
        y = arith2d.interpolate2d(pts.x, pts.y, tab)
    e = np.abs(y.astype(np.float64) - pts.truth) / pts.sc
    return np.where(np.isfinite(e), e, np.inf)


def _format_lines(lines, fmt):
    return np.unique(arith.to_format(np.asarray(lines, dtype=np.float64), fmt).astype(np.float64))


def _equidistribute(pos, g, k, c, e, lo, hi, fmt, nmin):
    """Free lines on [lo, hi] with c * g * h^k about e in every interval, g sampled at pos."""
    g = np.nan_to_num(np.asarray(g, dtype=np.float64), nan=0.0, posinf=0.0)
    dens = (c * g / e) ** (1.0 / k)
    dens = np.maximum(dens, np.maximum(np.r_[dens[1:], 0.0], np.r_[0.0, dens[:-1]]))
    cum = np.concatenate([[0.0], np.cumsum(0.5 * (dens[1:] + dens[:-1]) * np.diff(pos))])
    n = max(nmin - 1, int(math.ceil(cum[-1])))
    if cum[-1] <= 0:
        lines = np.linspace(lo, hi, nmin)
    else:
        lines = np.interp(np.linspace(0.0, cum[-1], n + 1), cum, pos)
    lines[0], lines[-1] = lo, hi
    return _format_lines(lines, fmt)


def _profile(g, axis):
    with np.errstate(invalid="ignore"):
        m = np.where(np.isnan(g), -np.inf, g).max(axis=1 - axis)
    return np.where(np.isfinite(m), m, 0.0)


def _interp1(nodes_pos, nodes_val, x, method):
    """Float64 one-dimensional interpolation along a stencil (rows), for direction tests."""
    if method == "bilinear":
        t = (x - nodes_pos[:, 0]) / (nodes_pos[:, 1] - nodes_pos[:, 0])
        return nodes_val[:, 0] * (1 - t) + nodes_val[:, 1] * t
    out = np.zeros(x.shape)
    for kk in range(4):
        w = np.ones(x.shape)
        for m in range(4):
            if m != kk:
                w = w * (x - nodes_pos[:, m]) / (nodes_pos[:, kk] - nodes_pos[:, m])
        out = out + w * nodes_val[:, kk]
    return out


def _stencil(lines, c, method):
    """Cell of each coordinate and the node indices of its stencil (rows)."""
    n = lines.size
    i = np.clip(np.searchsorted(lines, c, side="right") - 1, 0, n - 2)
    if method == "bilinear":
        return i, np.stack([i, i + 1], axis=1)
    s = np.clip(i - 1, 0, n - 4)
    return i, np.stack([s, s + 1, s + 2, s + 3], axis=1)


def _directions(prob, coord, method, xs, ys, pts):
    """For the worst point of each failing cell: the 1-D interpolation errors along x and y
    (float64, the core at the stencil nodes through that point); returns cells and both."""
    ix, sx = _stencil(xs, pts.gx, method)
    iy, sy = _stencil(ys, pts.gy, method)
    e = pts.err
    cell = ix * ys.size + iy
    order = np.lexsort((-e, cell))
    first = np.r_[True, cell[order][1:] != cell[order][:-1]]
    w = order[first]
    px, py = pts.gx[w], pts.gy[w]
    kx, ky = sx[w], sy[w]
    m = kx.shape[1]
    Px = xs[kx]
    Vx = prob.v_of(coord, Px.ravel(), np.repeat(py, m)).reshape(Px.shape)
    nf = prob.node_f(coord)
    Fx = nf(Px.ravel(), Vx.ravel()).reshape(Px.shape)
    Yy = ys[ky]
    Py = np.repeat(px, m).reshape(Yy.shape)
    Fy = nf(Py.ravel(), prob.v_of(coord, Py.ravel(), Yy.ravel())).reshape(Yy.shape)
    truth = pts.truth[w]
    sc = pts.sc[w]
    ex = np.abs(_interp1(Px, Fx, px, method) - truth) / sc
    ey = np.abs(_interp1(Yy, Fy, py, method) - truth) / sc
    return ix[w], iy[w], np.nan_to_num(ex, nan=np.inf), np.nan_to_num(ey, nan=np.inf)


def _split(lines, cells, fmt):
    """Lines with the midpoints of the given intervals added (format values)."""
    cells = np.unique(cells)
    mids = arith.to_format(0.5 * (lines[cells] + lines[cells + 1]), fmt).astype(np.float64)
    ok = (mids > lines[cells]) & (mids < lines[cells + 1])
    return np.unique(np.concatenate([lines, mids[ok]])), int(np.sum(ok))


def _check(prob, coord, method, xax, yax, Z, pts, xr=None, yr=None):
    """Errors on the check points (restricted to the window xr x yr) and the cell centres."""
    tab = _tab(prob, coord, method, xax, yax, Z)
    sub = pts
    if xr is not None or yr is not None:
        m = np.ones(pts.size, dtype=bool)
        if xr is not None:
            m &= (pts.gx >= xr[0]) & (pts.gx <= xr[1])
        if yr is not None:
            m &= (pts.gy >= yr[0]) & (pts.gy <= yr[1])
        sub = pts.take(m)
    cen = prob.centers(coord, xax.lines, yax.lines, xr, yr)
    both = sub.join(cen)
    both.err = _errors(tab, both)
    return both


def _fit_free(prob, coord, method, target):
    """Free lines on both axes: equidistributed start, insertion where the check error is
    largest, then removal of every line the check allows. Returns (xs, ys, Z) or a reason."""
    k, c, nmin = _ORDER[method]
    fmt = prob.fmt
    xr, yr, _ = prob.reference(coord)
    gx, gy = prob.curvature(coord, k)
    y_lo, y_hi = prob.y_range(coord)
    xs = _equidistribute(xr, _profile(gx, 0), k, c, target, prob.p_lo, prob.p_hi, fmt, nmin)
    ys = _equidistribute(yr, _profile(gy, 1), k, c, target, y_lo, y_hi, fmt, nmin)
    pts = prob.check_set(coord)
    Z = prob.nodes(coord, xs, ys, method)
    for _ in range(MAX_ROUNDS):
        if not np.all(np.isfinite(Z)):
            return "the core has no value at some grid nodes"
        res = _check(prob, coord, method, free_axis(xs, method, fmt), free_axis(ys, method, fmt),
                     Z, pts)
        bad = res.err > target
        if not bad.any():
            break
        b = res.take(bad)
        b.err = res.err[bad]
        ix, iy, ex, ey = _directions(prob, coord, method, xs, ys, b)
        do_x = ex >= 0.5 * ey
        do_y = ey >= 0.5 * ex
        xs2, nx_new = _split(xs, ix[do_x], fmt)
        ys2, ny_new = _split(ys, iy[do_y], fmt)
        if nx_new + ny_new == 0:
            return "cells cannot be split further in the format"
        if xs2.size > MAX_LINES or ys2.size > MAX_LINES or xs2.size * ys2.size > MAX_NODES:
            return f"more than {MAX_NODES} nodes or {MAX_LINES} lines per axis would be needed"
        xs, ys = xs2, ys2
        Z = prob.nodes(coord, xs, ys, method)
    else:
        return f"tolerance not met after {MAX_ROUNDS} refinement rounds"
    xs, ys, Z = _remove_lines(prob, coord, method, xs, ys, Z, target, pts)
    return xs, ys, Z


def _remove_lines(prob, coord, method, xs, ys, Z, target, pts):
    """Drop, one at a time, every interior line whose removal keeps the check error within
    ``target`` (only the cells the line touches are re-checked)."""
    k, c, nmin = _ORDER[method]
    fmt = prob.fmt
    reach = 1 if method == "bilinear" else 3
    for _ in range(3):
        changed = False
        for axis in (0, 1):
            j = 1
            while True:
                lines = xs if axis == 0 else ys
                if j >= lines.size - 1 or lines.size <= nmin:
                    break
                new = np.delete(lines, j)
                if coord == "raw" and prob.continued():
                    Zn = prob.nodes(coord, new if axis == 0 else xs, ys if axis == 0 else new,
                                    method)
                else:
                    Zn = np.delete(Z, j, axis=axis)
                win = (lines[max(j - reach, 0)], lines[min(j + reach, lines.size - 1)])
                if axis == 0:
                    xa, ya = free_axis(new, method, fmt), free_axis(ys, method, fmt)
                    res = _check(prob, coord, method, xa, ya, Zn, pts, xr=win)
                else:
                    xa, ya = free_axis(xs, method, fmt), free_axis(new, method, fmt)
                    res = _check(prob, coord, method, xa, ya, Zn, pts, yr=win)
                if res.err.size == 0 or np.max(res.err) <= target:
                    if axis == 0:
                        xs = new
                    else:
                        ys = new
                    Z = Zn
                    changed = True
                else:
                    j += 1
        if not changed:
            break
    return xs, ys, Z


def _fit_uniform(prob, coord, method, target):
    """Uniform lines on both axes: the fewest nx * ny meeting ``target`` on the check points
    (a model of the error gives the start; then bisection on ny for a few nx around it).
    Returns (nx, ny, Z) or a reason."""
    k, c, nmin = _ORDER[method]
    fmt = prob.fmt
    gx, gy = prob.curvature(coord, k)
    y_lo, y_hi = prob.y_range(coord)
    Gx = float(np.nanmax(gx)) if np.isfinite(gx).any() else 0.0
    Gy = float(np.nanmax(gy)) if np.isfinite(gy).any() else 0.0
    Lx, Ly = prob.p_hi - prob.p_lo, y_hi - y_lo
    pts = prob.check_set(coord)
    cache = {}

    def model(G, L):
        return max(nmin, int(math.ceil(L * (c * G / (0.5 * target)) ** (1.0 / k))) + 1)

    def trial(nx, ny):
        key = (nx, ny)
        if key not in cache:
            if nx * ny > MAX_NODES or nx > MAX_LINES or ny > MAX_LINES:
                cache[key] = (False, None)
            else:
                xa = uniform_axis(prob.p_lo, prob.p_hi, nx, fmt)
                ya = uniform_axis(y_lo, y_hi, ny, fmt)
                Z = prob.nodes(coord, xa.lines, ya.lines, method)
                if not np.all(np.isfinite(Z)):
                    cache[key] = (False, None)
                    cache["no_value"] = True
                else:
                    res = _check(prob, coord, method, xa, ya, Z, pts)
                    cache[key] = (bool(res.err.size == 0 or np.max(res.err) <= target), Z)
        return cache[key]

    nx0, ny0 = model(Gx, Lx), model(Gy, Ly)
    # smallest common scale of the model's counts that passes
    lo_s, hi_s = 0.0, 1.0
    def scaled(f):
        return max(nmin, int(math.ceil(nx0 * f))), max(nmin, int(math.ceil(ny0 * f)))

    while not trial(*scaled(hi_s))[0]:
        if cache.get("no_value"):
            return "the core has no value at some grid nodes"
        lo_s, hi_s = hi_s, hi_s * 1.6
        if nx0 * ny0 * hi_s * hi_s > MAX_NODES:
            return f"more than {MAX_NODES} nodes would be needed"
    for _ in range(6):
        mid = 0.5 * (lo_s + hi_s)
        if mid * nx0 < nmin and mid * ny0 < nmin:
            break
        if trial(max(nmin, int(math.ceil(nx0 * mid))), max(nmin, int(math.ceil(ny0 * mid))))[0]:
            hi_s = mid
        else:
            lo_s = mid
    nx1 = max(nmin, int(math.ceil(nx0 * hi_s)))
    ny1 = max(nmin, int(math.ceil(ny0 * hi_s)))
    best = (nx1 * ny1, nx1, ny1)

    def min_ny(nx, start):
        hi = start
        while not trial(nx, hi)[0]:
            hi = int(math.ceil(hi * 1.5)) + 1
            if nx * hi > min(MAX_NODES, 4 * best[0]):
                return None
        lo = nmin - 1
        while hi - lo > 1:
            mid = (lo + hi) // 2
            if trial(nx, mid)[0]:
                hi = mid
            else:
                lo = mid
        return hi

    for f in (0.7, 0.85, 1.0, 1.2, 1.45):
        nx = max(nmin, int(round(nx1 * f)))
        ny = min_ny(nx, max(nmin, int(math.ceil(best[0] / nx))))
        if ny is not None and nx * ny < best[0]:
            best = (nx * ny, nx, ny)
    # and the other way round, for the best nx: the fewest nx at its ny
    _, nx, ny = best
    lo = nmin - 1
    hi = nx
    while hi - lo > 1:
        mid = (lo + hi) // 2
        if trial(mid, ny)[0]:
            hi = mid
        else:
            lo = mid
    nx = hi
    ok, Z = trial(nx, ny)
    return nx, ny, Z


def _make_grid(prob, coord, method, xax, yax, Z):
    ft = prob.ft
    return Grid2D(method=method, fmt=prob.fmt, x=xax, y=yax,
                  z=arith.to_format(Z, prob.fmt).astype(np.float64), coord=coord,
                  side=prob.side, near=float(ft(prob.dom.near)), far=float(ft(prob.dom.far)),
                  near_rel=prob.dom.near_rel, far_rel=prob.dom.far_rel, helper=prob.helper_pw,
                  policy=prob.policy)


def fit_grid(prob, method, layouts=("free", "free"), coord=None, verify_points=100_000,
             attempts=4):
    """Fit one candidate and verify it; tighten the check target and refit while the dense
    verification exceeds the tolerance. Returns (Grid2D or None, verification or None,
    info dict with ``why`` when None)."""
    coord = coord or prob.coords()[0]
    if tuple(layouts) not in (("free", "free"), ("uniform", "uniform")):
        raise ValueError(f"layouts must be ('free', 'free') or ('uniform', 'uniform'), "
                         f"not {layouts!r}")
    target = ACCEPT * prob.tol
    info = {"refits": 0}
    t0 = time.perf_counter()
    y_lo, y_hi = prob.y_range(coord)
    for attempt in range(attempts):
        if layouts[0] == "free":
            r = _fit_free(prob, coord, method, target)
            if isinstance(r, str):
                info["why"] = r
                return None, None, info
            xs, ys, Z = r
            xax, yax = free_axis(xs, method, prob.fmt), free_axis(ys, method, prob.fmt)
        else:
            r = _fit_uniform(prob, coord, method, target)
            if isinstance(r, str):
                info["why"] = r
                return None, None, info
            nx, ny, Z = r
            xax = uniform_axis(prob.p_lo, prob.p_hi, nx, prob.fmt)
            yax = uniform_axis(y_lo, y_hi, ny, prob.fmt)
        g = _make_grid(prob, coord, method, xax, yax, Z)
        v = verify_grid(g, prob, verify_points)
        info.update({"refits": attempt, "check_target": target,
                     "seconds": time.perf_counter() - t0})
        if v["max_error"] <= prob.tol:
            return g, v, info
        if not math.isfinite(v["max_error"]):
            break
        target *= min(0.9, 0.97 * prob.tol / v["max_error"])
    info["why"] = (f"verification {v['max_error']:.3g} over tolerance after {attempts} fits")
    return None, v, info


# ---------------------------------------------------------------------------------------------
# dense verification


def _just_inside(a, b, fmt):
    """The format value nearest ``a`` strictly between ``a`` and ``b`` (elementwise)."""
    ft = arith.FORMATS[fmt]
    a = np.asarray(a, dtype=np.float64)
    b = np.asarray(b, dtype=np.float64)
    toward = np.where(b > a, ft(np.inf), ft(-np.inf)).astype(ft)
    c = a.astype(ft)
    for _ in range(2):
        out = (c.astype(np.float64) - a) * (b - a) <= 0
        c = np.where(out, np.nextafter(c, toward), c)
    return c.astype(np.float64)


def _pairs(p, v):
    """Inputs (p, v) as one complex array, for exact set tests of points."""
    return np.asarray(p, dtype=np.float64).ravel() + 1j * np.asarray(v, dtype=np.float64).ravel()


def _hash(p, v):
    """A 64-bit key of each input (p, v), equal for equal inputs (-0.0 taken as 0.0)."""
    a = np.ascontiguousarray(np.asarray(p, dtype=np.float64).ravel() + 0.0).view(np.uint64)
    b = np.ascontiguousarray(np.asarray(v, dtype=np.float64).ravel() + 0.0).view(np.uint64)
    return (a * np.uint64(0x9E3779B97F4A7C15)) ^ b


def _member(p, v, p2, v2):
    """Whether each input (p, v) is exactly one of the inputs (p2, v2): keys first, then the
    values themselves where keys agree."""
    p, v = np.asarray(p, dtype=np.float64).ravel(), np.asarray(v, dtype=np.float64).ravel()
    p2, v2 = np.asarray(p2, dtype=np.float64).ravel(), np.asarray(v2, dtype=np.float64).ravel()
    k1, k2 = _hash(p, v), _hash(p2, v2)
    hit = np.isin(k1, k2)
    if hit.any():
        i = np.nonzero(hit)[0]
        j = np.isin(k2, k1[i])
        hit[i] = np.isin(_pairs(p[i], v[i]), _pairs(p2[j], v2[j]))
    return hit


def corner_inputs(prob):
    """Format neighbours of the domain's four corners, three at each: the second input one
    format step inside its limit at the corner's pressure, and at the pressure one step inside,
    the second input at its limit and one step inside it (the exact corners are check points
    of the fit)."""
    fmt = prob.fmt
    P, V = [], []
    for p0, p1 in ((prob.p_lo, prob.p_hi), (prob.p_hi, prob.p_lo)):
        pin = float(_just_inside(p0, p1, fmt))
        l0 = [float(a[0]) for a in prob.dom.limits(np.array([p0]))]
        li = [float(a[0]) for a in prob.dom.limits(np.array([pin]))]
        for a, b in ((0, 1), (1, 0)):
            P += [p0, pin, pin]
            V += [float(_just_inside(l0[a], l0[b], fmt)), li[a],
                  float(_just_inside(li[a], li[b], fmt))]
    return np.array(P), np.array(V)


def _fixed_inputs(prob, n, seed):
    """The verification inputs that do not depend on the grid, the same for every candidate
    of a problem and cached there: the edges with the corners' neighbours, and a pool of
    ``n + n // 8`` seeded random points in an order that alternates the uniform and the
    log-uniform halves (so that any leading share has both), none of them a check input; each
    with the core's values."""
    key = ("verify_fixed", n, seed)
    if key not in prob._cache:
        pe, ve = prob.edge_inputs(EDGE_POINTS)
        pc, vc = corner_inputs(prob)
        pe, ve = np.concatenate([pe, pc]), np.concatenate([ve, vc])
        m = n + n // 8
        pr, vr = prob.random_inputs(m, seed ^ 0x5EED)
        half = m // 2
        order = np.argsort(np.concatenate([2 * np.arange(half), 2 * np.arange(m - half) + 1]),
                           kind="stable")
        pr, vr = pr[order], vr[order]
        cp, cv, _ = prob.check_inputs()
        ke = ~_member(pe, ve, cp, cv)
        kr = ~_member(pr, vr, cp, cv)
        pe, ve, pr, vr = pe[ke], ve[ke], pr[kr], vr[kr]
        prob._cache[key] = (pe, ve, prob.f(pe, ve), pr, vr, prob.f(pr, vr),
                            int(np.sum(~ke)))
    return prob._cache[key]


def fit_points(g, prob):
    """Inputs (p, v) of the nodes and the cell centres of grid ``g``: where its node values
    came from and where its last fit round checked it (with the problem's check set, the
    points a verification must avoid)."""
    xs, ys = np.asarray(g.x.lines), np.asarray(g.y.lines)
    xc, yc = 0.5 * (xs[1:] + xs[:-1]), 0.5 * (ys[1:] + ys[:-1])
    P = np.concatenate([np.repeat(xs, ys.size), np.repeat(xc, yc.size)])
    Y = np.concatenate([np.tile(ys, xs.size), np.tile(yc, xc.size)])
    return P, prob.v_of(g.coord, P, Y)


def _verification_set(g, prob, n, seed):
    """(P, V, counts, truth, dropped) of :func:`verification_inputs`, with the core's values;
    ``dropped``: inputs left out because they are nodes, cell centres or check points. The
    last set is kept on the problem, for the bit comparison of a mapped variant."""
    last = prob._cache.get("last_verification_set")
    if last is not None and last[0] is g and last[1:3] == (n, seed):
        return last[3]
    out = _new_verification_set(g, prob, n, seed)
    prob._cache["last_verification_set"] = (g, n, seed, out)
    return out


def _new_verification_set(g, prob, n, seed):
    coord, fmt = g.coord, g.fmt
    rng = np.random.default_rng(seed)
    d = prob.dom
    pe, ve, te, pool_p, pool_v, pool_t, dropped = _fixed_inputs(prob, n, seed)
    fp, fv = fit_points(g, prob)
    ke = ~_member(pe, ve, fp, fv)
    dropped += int(np.sum(~ke))
    pe, ve, te = pe[ke], ve[ke], te[ke]
    m = 8
    xl = float_neighbours(g.x.lines, fmt)
    xl = xl[(xl >= prob.p_lo) & (xl <= prob.p_hi)]
    Px = np.repeat(xl, m)
    near, far = d.limits(Px)
    Vx = near + rng.uniform(0.0, 1.0, Px.size) * (far - near)
    y_lo, y_hi = prob.y_range(coord)
    yl = float_neighbours(g.y.lines, fmt)
    yl = yl[(yl >= y_lo) & (yl <= y_hi)]
    Yy = np.repeat(yl, m)
    Py = rng.uniform(prob.p_lo, prob.p_hi, Yy.size)
    keep = prob.reachable(coord, Py, Yy)
    Py, Yy = Py[keep], Yy[keep]
    Vy = prob.v_of(coord, Py, Yy)
    cells = (g.nx - 1) * (g.ny - 1)
    ms = int(min(4, max(1, math.floor(math.sqrt(0.4 * n / cells)))))
    off = (np.arange(ms) + 0.5) / ms + 0.061 / ms
    xs, ys = g.x.lines, g.y.lines
    cx = (xs[:-1, None] + np.diff(xs)[:, None] * off[None, :]).ravel()
    cy = (ys[:-1, None] + np.diff(ys)[:, None] * off[None, :]).ravel()
    Pc = np.repeat(cx, cy.size)
    Yc = np.tile(cy, cx.size)
    keep = prob.reachable(coord, Pc, Yc) & (Pc >= prob.p_lo) & (Pc <= prob.p_hi)
    Pc, Yc = Pc[keep], Yc[keep]
    Vc = prob.v_of(coord, Pc, Yc)
    cp, cv, _ = prob.check_inputs()
    ap, av = np.concatenate([fp, cp]), np.concatenate([fv, cv])
    parts = [(pe, ve, te)]
    for P, V in ((np.concatenate([Px, Py]), np.concatenate([Vx, Vy])), (Pc, Vc)):
        k = ~_member(P, V, ap, av)
        dropped += int(np.sum(~k))
        parts.append((P[k], V[k], prob.f(P[k], V[k])))

    def counted(P, V, T):
        """The points that count towards n: a value of the core, and for policy nan inside
        the run time's own limits (the others are NaN by design, see verify_grid)."""
        ok = np.isfinite(T)
        if g.policy == "nan" and P.size:
            ok &= g.status(P, V) == arith.IN_RANGE
        return ok

    directed = sum(int(np.sum(counted(*q))) for q in parts)
    want = max(n - directed, int(math.ceil(RANDOM_SHARE_MIN * n)))
    free = np.nonzero(~_member(pool_p, pool_v, fp, fv))[0]
    cum = np.cumsum(counted(pool_p[free], pool_v[free], pool_t[free]))
    take = free[:int(np.searchsorted(cum, want)) + 1] if want > 0 else free[:0]
    dropped += int(take[-1]) + 1 - int(take.size) if take.size else 0
    parts.append((pool_p[take], pool_v[take], pool_t[take]))
    counts = {"edges": int(parts[0][0].size), "grid_lines": int(parts[1][0].size),
              "cell_interior": int(parts[2][0].size), "random": int(take.size)}
    P = np.concatenate([a for a, _, _ in parts])
    V = np.concatenate([b for _, b, _ in parts])
    T = np.concatenate([c for _, _, c in parts])
    return P, V, counts, T, dropped


def verification_inputs(g, prob, n, seed):
    """Verification inputs (p, v) for grid ``g`` and a count of each kind: at least ``n``
    that count (a value of the core; for policy ``nan``, inside the run time's own limits too).
    The directed kinds: the four edges with the format neighbours of the corners; every grid
    line with its two format neighbours at seeded random positions along it; a sub-grid inside
    every cell (offsets clear of the cell centre). Then seeded random points (alternately
    uniform and log-uniform in p) fill up to ``n``, and are never fewer than
    ``RANDOM_SHARE_MIN`` of ``n``. None of them is a node, a cell centre or a check point of
    the fit: exact coincidences with those are left out (:func:`fit_points`,
    :meth:`Problem.check_inputs`)."""
    P, V, counts, _, _ = _verification_set(g, prob, n, seed)
    return P, V, counts


def _monotone_sign(a, axis):
    d = np.diff(a, axis=axis)
    d = d[np.isfinite(d)]
    if d.size and np.all(d > 0):
        return 1
    if d.size and np.all(d < 0):
        return -1
    return 0


def _sweeps(prob, lines, m):
    """Sweep inputs of :func:`order_reversals` and the core along them (shared by candidates)."""
    d = prob.dom
    ps = np.linspace(prob.p_lo, prob.p_hi, lines)
    near, far = d.limits(ps)
    vv = np.linspace(0.0, 1.0, m)
    V = near[:, None] + vv[None, :] * (far - near)[:, None]
    P = np.repeat(ps[:, None], m, axis=1)
    f_v = prob.f(P.ravel(), V.ravel()).reshape(P.shape)
    pn, pf_ = d.limits(np.linspace(prob.p_lo, prob.p_hi, 65))
    vlo, vhi = float(np.min(np.minimum(pn, pf_))), float(np.max(np.maximum(pn, pf_)))
    pp = np.linspace(prob.p_lo, prob.p_hi, m)
    nr, fr = d.limits(pp)
    lo_v, hi_v = np.minimum(nr, fr), np.maximum(nr, fr)
    sp_all = []
    for v in np.linspace(vlo, vhi, lines):
        inside = (v >= lo_v) & (v <= hi_v)
        if inside.sum() >= 3:
            p_in = pp[inside]
            sp_all.append((p_in, v, None))
    if sp_all:
        pa = np.concatenate([a for a, _, _ in sp_all])
        va = np.concatenate([np.full(a.shape, v) for a, v, _ in sp_all])
        fa = prob.f(pa, va)
        out, k = [], 0
        for a, v, _ in sp_all:
            out.append((a, v, fa[k:k + a.size]))
            k += a.size
        sp_all = out
    return P, V, f_v, near, far, sp_all


def order_reversals(g, prob, lines=24, m=1024):
    """Reversals of order in the emulated function along sweeps in each input, where the core
    is monotone in that input over the domain: (along p at fixed v, along v at fixed p)."""
    key = ("sweeps", lines, m)
    if key not in prob._cache:
        prob._cache[key] = _sweeps(prob, lines, m)
    P, V, f_v, near, far, sp_all = prob._cache[key]
    sv = _monotone_sign(f_v, 1) * (1 if np.all(far >= near) else -1)
    rev_v = 0
    if sv:
        y = g(P.ravel(), V.ravel()).astype(np.float64).reshape(P.shape)
        rev_v = int(np.sum(np.diff(y, axis=1) * sv * np.sign(far - near)[:, None] < 0))
    rev_p = 0
    signs = {_monotone_sign(fv, 0) for _, _, fv in sp_all}
    sp = signs.pop() if len(signs) == 1 else 0
    if sp:
        for p_in, v, _ in sp_all:
            y = g(p_in, np.full(p_in.shape, v)).astype(np.float64)
            rev_p += int(np.sum(np.diff(y) * sp < 0))
    return {"along_p": rev_p if sp else None, "along_v": rev_v if sv else None}


def verify_grid(g, prob, n=100_000, seed=None):
    """Total error of the emulated function (helper, coordinate, grid, every rounding) at the
    verification inputs (:func:`verification_inputs`: at least ``n`` points), against the
    core. A sampled maximum, not a bound. ``points`` is how many were measured, ``requested``
    the ``n`` asked for, ``left_out`` how many inputs were skipped as nodes, cell centres or
    check points of the fit."""
    seed = _seed(prob.key, "verify") if seed is None else int(seed)
    P, V, counts, truth, dropped = _verification_set(g, prob, n, seed)
    kind = np.repeat(np.arange(len(counts)), list(counts.values()))
    ok = np.isfinite(truth)
    P, V, truth, kind = P[ok], V[ok], truth[ok], kind[ok]
    sc = prob.scale(truth)
    st = g.status(P, V)
    if g.policy == "nan":
        # inside the exact domain but outside it by the run time's own limits (within the
        # helper's error of a limit measured from saturation): NaN by design, counted apart
        keep = st == arith.IN_RANGE
        P, V, truth, kind, sc, st = P[keep], V[keep], truth[keep], kind[keep], sc[keep], st[keep]
    y = g(P, V).astype(np.float64)
    e = (y - truth) / sc
    ae = np.where(np.isfinite(e), np.abs(e), np.inf)
    i = int(np.argmax(ae))
    res = {"points": int(P.size), "max_error": float(ae[i]), "at": (float(P[i]), float(V[i])),
           "signed_error_at_max": float(e[i]), "rms_error": float(np.sqrt(np.mean(e * e))),
           "counts": counts, "seed": seed, "requested": int(n), "left_out": dropped}
    res["max_by_kind"] = {name: float(np.max(ae[kind == j])) if np.any(kind == j) else 0.0
                          for j, name in enumerate(counts)}
    if g.fmt == "float32":
        yf = g(P, V, fused=True).astype(np.float64)
        res["max_error_fused"] = float(np.max(np.abs(yf - truth) / sc))
    res["outside_by_run_time"] = int(np.sum(ok) - np.sum(st == arith.IN_RANGE))
    res["reversals"] = order_reversals(g, prob)
    return res


# ---------------------------------------------------------------------------------------------
# candidates and the choice

#: the candidates tried by default: (method, (x layout, y layout))
CANDIDATES = (("bilinear", ("free", "free")), ("bilinear", ("uniform", "uniform")),
              ("bicubic", ("free", "free")), ("bicubic", ("uniform", "uniform")))


@dataclass
class GridTable:
    """A chosen, verified two-input table with what the report needs beside it."""
    domain: Domain2D
    grid: Grid2D
    verification: dict
    candidates: list
    tol_kind: str
    tol: float
    goal: str
    floor: float
    helper: object = None        # gen.build.Table of S(p), or None
    notes: list = field(default_factory=list)
    seconds: float = 0.0
    fits: list = field(default_factory=list, repr=False)   # (Grid2D or None, verification)

    def __repr__(self):
        return (f"GridTable({self.domain!r}, {self.grid!r}, max_error="
                f"{self.verification['max_error']:.3g})")

    def choose(self, goal, max_ops=None):
        """The same candidates chosen for another ``goal`` (and at most ``max_ops`` estimated
        operations per call, if given): a new GridTable, no refitting."""
        from dataclasses import replace
        if goal not in GOALS:
            raise DomainError(f"goal must be one of {', '.join(GOALS)}, not {goal!r}")
        best = choose_candidate(self.candidates, goal, max_ops)
        if best is None:
            raise DomainError(f"no candidate meets the tolerance within {max_ops} estimated "
                              f"operations")
        rows = [dict(r, chosen=i == best) for i, r in enumerate(self.candidates)]
        g, v = self.fits[best]
        return replace(self, grid=g, verification=v, candidates=rows, goal=goal)


def _mapped_variant(g, v, prob, verify_points):
    """Grid ``g`` with bin tables on both axes, and its verification: the same cells and
    values by construction, which is checked bit for bit on the verification inputs (a full
    verification runs instead should any bit differ)."""
    from dataclasses import replace
    gm = replace(g, x=mapped_axis(g.x, g.fmt), y=mapped_axis(g.y, g.fmt))
    P, V, _ = verification_inputs(g, prob, verify_points, v["seed"])
    a = g(P, V).astype(arith.FORMATS[g.fmt])
    b = gm(P, V).astype(arith.FORMATS[g.fmt])
    if np.array_equal(a.view(np.uint8), b.view(np.uint8)):
        return gm, dict(v, same_bits_as_free=True)
    return gm, verify_grid(gm, prob, verify_points)


def choose_candidate(rows, goal, max_ops=None):
    """Index of the candidate row chosen for ``goal`` among those that met the tolerance (and
    have at most ``max_ops`` estimated operations, if given), or None. "smallest": the fewest
    stored bytes (then the fewest operations). "fastest": the fewest stored bytes among the
    rows whose estimated operations are at most ``NEAR_FASTEST`` more than the fewest (then
    the fewest operations). Ties go to the earlier row."""
    ok = [i for i, r in enumerate(rows)
          if r["met"] and (max_ops is None or r["estimated_ops"] <= max_ops)]
    if not ok:
        return None
    if goal == "fastest":
        fewest = min(rows[i]["estimated_ops"] for i in ok)
        ok = [i for i in ok if rows[i]["estimated_ops"] <= fewest * (1.0 + NEAR_FASTEST)]
    return min(ok, key=lambda i: (rows[i]["storage_bytes"], rows[i]["estimated_ops"]))


def build_grid(dom, tol_kind, tol, fmt="float32", policy="clamp", goal="smallest",
               candidates=CANDIDATES, coords=None, verify_points=100_000, progress=None):
    """Fit every candidate (method x axis layouts x coordinate), verify each on at least
    ``verify_points`` points, and return the one chosen for ``goal`` by
    :func:`choose_candidate` ("smallest": the fewest stored bytes, helper included; "fastest":
    the fewest bytes within ``NEAR_FASTEST`` of the fewest estimated operations per call) as a
    :class:`GridTable`. Raises :class:`DomainError` for a domain or tolerance that cannot be
    met, with a one-line message."""
    t0 = time.perf_counter()
    if tol_kind not in ("abs", "rel") or not (tol > 0):
        raise DomainError(f"tolerance must be abs or rel and positive, not {tol_kind} {tol!r}")
    if goal not in GOALS:
        raise DomainError(f"goal must be one of {', '.join(GOALS)}, not {goal!r}")
    notes = check_domain(dom, tol_kind, tol)
    prob0 = Problem(dom, tol_kind, tol, fmt, policy)
    floor = prob0.floor()
    unit = dom.out_unit if tol_kind == "abs" else "(relative)"
    if tol < 3.0 * floor:
        feasible = float(f"{3.05 * floor:.2g}")
        raise DomainError(
            f"tolerance {tol:g} {unit} is below what {fmt} can deliver over "
            f"{describe_domain(dom)} (input and output rounding alone give up to {floor:.2g}); "
            f"the smallest feasible is {feasible:g}")
    helper = None
    if dom.side:
        tol_v = HELPER_SHARE * tol / max(prob0.slope_v(), 1e-300)
        if progress:
            progress(f"saturation helper within {tol_v:.3g} {dom.v_unit}")
        helper = saturation_helper(dom, fmt, tol_v, goal)
        notes.append(f"saturation helper {dom.sat_quantity} within {tol_v:.3g} {dom.v_unit} "
                     f"(verified {helper.verification['max_error']:.3g}); its error reaches the "
                     f"output through a slope of up to {prob0.slope_v():.3g} per {dom.v_unit} "
                     f"and is part of the verified total")
    prob = Problem(dom, tol_kind, tol, fmt, policy, helper)
    for k in ("floor", "slope_v"):          # all that prob0 has computed
        if k in prob0._cache:
            prob._cache[k] = prob0._cache[k]
    rows, grids = [], []
    for coord in (coords or prob.coords()):
        for method, layouts in candidates:
            if progress:
                progress(f"{method} {layouts[0]}/{layouts[1]} in {coord} coordinates")
            g, v, info = fit_grid(prob, method, layouts, coord, verify_points)
            row = {"method": method, "x_layout": layouts[0], "y_layout": layouts[1],
                   "coord": coord, "met": g is not None, "refits": info.get("refits", 0),
                   "seconds": round(info.get("seconds", 0.0), 3)}
            if g is None:
                row["why"] = info.get("why", "not met")
                if v is not None:
                    row["max_error"] = v["max_error"]
            else:
                row.update({"nx": g.nx, "ny": g.ny, "stored_values": g.stored_values(),
                            "storage_bytes": g.storage_bytes,
                            "grid_bytes": g.grid_bytes,
                            "helper_bytes": g.helper.storage_bytes if g.helper else 0,
                            "estimated_ops": estimated_ops(g), "max_error": v["max_error"],
                            "max_error_fused": v.get("max_error_fused"),
                            "points": v["points"], "reversals": v["reversals"]})
            rows.append(row)
            grids.append((g, v))
            if g is not None and layouts == ("free", "free"):
                gm, vm = _mapped_variant(g, v, prob, verify_points)
                mrow = dict(row, x_layout="mapped", y_layout="mapped", seconds=0.0,
                            storage_bytes=gm.storage_bytes, grid_bytes=gm.grid_bytes,
                            estimated_ops=estimated_ops(gm), max_error=vm["max_error"],
                            max_error_fused=vm.get("max_error_fused"), points=vm["points"],
                            reversals=vm["reversals"],
                            map_steps=[gm.x.steps, gm.y.steps],
                            bins=[int(np.asarray(gm.x.map).size), int(np.asarray(gm.y.map).size)])
                rows.append(mrow)
                grids.append((gm, vm))
    met = [i for i, r in enumerate(rows) if r["met"]]
    if not met:
        why = "; ".join(f"{r['method']} {r['x_layout']} {r['coord']}: {r.get('why')}" for r in rows)
        raise DomainError(f"no candidate met tolerance {tol:g} {unit} over "
                          f"{describe_domain(dom)} ({why})")
    best = choose_candidate(rows, goal)
    for i, r in enumerate(rows):
        r["chosen"] = i == best
    g, v = grids[best]
    return GridTable(domain=dom, grid=g, verification=v, candidates=rows, tol_kind=tol_kind,
                     tol=float(tol), goal=goal, floor=floor, helper=helper, notes=notes,
                     seconds=time.perf_counter() - t0, fits=grids)
