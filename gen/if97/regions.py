"""Region selection for IAPWS-IF97 in (p, T), IAPWS R7-97(2012) section 2 and Fig. 1.

Offers, in SI units (Pa, K), numpy arrays in and out with broadcasting:

* ``region_pT(p, T, phase=None)``   int array of region numbers 1, 2, 3, 5; 0 outside IF97
* ``valid_pT(p, T)``                bool mask of IF97's range of validity
* ``out_of_range_message(p, T)``    readable text naming variable, value and valid range
  for the points outside it ('' when all are valid)
* ``check_pT(p, T)``                raise ValueError with that text if any point is outside

Range of validity: p > 0 and 273.15 K <= T <= 1073.15 K with p <= 100 MPa, or
1073.15 K < T <= 2273.15 K with p <= 50 MPa.

Rules, for valid points:

* region 5: T > 1073.15 K;
* region 1: T <= 623.15 K and p >= p_sat(T);
* region 3: 623.15 K < T <= 863.15 K and p >= p_B23(T) (points on B23 belong to region 3);
* region 2: everything else up to 1073.15 K (p < p_sat(T) below 623.15 K, p < p_B23(T)
  between 623.15 K and 863.15 K, any p from 863.15 K to 1073.15 K).

At exactly 623.15 K region 1 takes the point (its range includes 623.15 K, region 3 starts
above it). On the saturation line itself (T <= 623.15 K and p == p_sat(T) exactly, as
computed by ``region4.saturation_pressure``) the default is the liquid side, region 1;
``phase="vapor"`` picks the vapour side, region 2, and ``phase="liquid"`` states the
default. ``phase`` only matters for points exactly on the line.
"""

import numpy as np

from .b23 import b23_pressure
from .constants import P_MAX, P_MAX_5, T_13, T_MAX, T_MAX_25, T_MIN
from .region4 import saturation_pressure

#: upper temperature of region 3 (where the B23 line reaches 100 MPa), K
T_23_MAX = 863.15

_PHASES = {None: None, "liquid": "liquid", "vapor": "vapor", "vapour": "vapor"}


def _pair(p, T):
    return np.broadcast_arrays(np.asarray(p, dtype=float), np.asarray(T, dtype=float))


def valid_pT(p, T):
    """True where (p, T) lies in IF97's range of validity (see module docstring)."""
    p, T = _pair(p, T)
    low = (T >= T_MIN) & (T <= T_MAX_25) & (p <= P_MAX)
    high = (T > T_MAX_25) & (T <= T_MAX) & (p <= P_MAX_5)
    return (p > 0.0) & (low | high)


def region_pT(p, T, phase=None):
    """IF97 region number (int8: 1, 2, 3, 5; 0 outside validity) of each (p, T) point.

    ``phase`` ("liquid", default, or "vapor") decides points exactly on the saturation
    line below 623.15 K: region 1 or region 2.
    """
    if phase not in _PHASES:
        raise ValueError(f"phase must be 'liquid' or 'vapor', not {phase!r}")
    vapor = _PHASES[phase] == "vapor"
    p, T = _pair(p, T)
    valid = valid_pT(p, T)
    out = np.zeros(p.shape, dtype=np.int8)

    low = valid & (T <= T_13)
    psat = saturation_pressure(np.where(low, T, T_13))
    liquid = (p > psat) | ((p == psat) & (not vapor))
    out[low & liquid] = 1
    out[low & ~liquid] = 2

    mid = valid & (T > T_13) & (T <= T_23_MAX)
    above = p >= b23_pressure(np.where(mid, T, T_23_MAX))
    out[mid & above] = 3
    out[mid & ~above] = 2

    out[valid & (T > T_23_MAX) & (T <= T_MAX_25)] = 2
    out[valid & (T > T_MAX_25)] = 5
    return out[()] if out.ndim == 0 else out


def _fmt_p(p):
    if not np.isfinite(p):
        return f"{p} Pa"
    return f"{p:.6g} Pa ({p / 1e6:.6g} MPa)"


def _point_message(p, T):
    """Why one (p, T) point is outside IF97, or '' if it is inside."""
    if not np.isfinite(T):
        return f"T = {T} K is not a finite temperature; valid: {T_MIN} K <= T <= {T_MAX} K"
    if not np.isfinite(p):
        return f"p = {p} Pa is not a finite pressure; valid: 0 < p <= {P_MAX / 1e6:g} MPa"
    if T < T_MIN or T > T_MAX:
        return f"T = {T:.6g} K is outside {T_MIN} K <= T <= {T_MAX} K"
    if p <= 0.0:
        return f"p = {_fmt_p(p)} is not above 0; valid: 0 < p"
    if T <= T_MAX_25 and p > P_MAX:
        return (f"p = {_fmt_p(p)} is above {P_MAX / 1e6:g} MPa, the limit for "
                f"{T_MIN} K <= T <= {T_MAX_25} K (here T = {T:.6g} K)")
    if T > T_MAX_25 and p > P_MAX_5:
        return (f"p = {_fmt_p(p)} is above {P_MAX_5 / 1e6:g} MPa, the limit for "
                f"{T_MAX_25} K < T <= {T_MAX} K (here T = {T:.6g} K)")
    return ""


def out_of_range_message(p, T, max_points=10):
    """Readable description of the (p, T) points outside IF97's range of validity.

    One line per offending point (up to ``max_points``, then a count of the rest), each
    naming the variable, its value and the valid range, with the point's index for array
    input. Returns '' when every point is valid.
    """
    p, T = _pair(p, T)
    bad = np.flatnonzero(~valid_pT(p, T).ravel())
    if bad.size == 0:
        return ""
    pf, Tf = p.ravel(), T.ravel()
    lines = []
    for k in bad[:max_points]:
        idx = tuple(int(i) for i in np.unravel_index(k, p.shape))
        where = "" if not idx else f"point {idx[0] if len(idx) == 1 else idx}: "
        lines.append(where + _point_message(float(pf[k]), float(Tf[k])))
    if bad.size > max_points:
        lines.append(f"... and {bad.size - max_points} more points outside IF97's range")
    return "\n".join(lines)


def check_pT(p, T):
    """Raise ValueError naming the out-of-range points if any (p, T) is outside IF97."""
    msg = out_of_range_message(p, T)
    if msg:
        raise ValueError("outside the IAPWS-IF97 range of validity:\n" + msg)
