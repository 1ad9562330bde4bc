"""The target arithmetic of a two-input grid: run-time evaluation, operation by operation.

This module is the single definition of what an emitted two-input function computes; the C
template ``templates/c_grid2d.j2`` spells the same steps in the same order. It needs numpy and
the one-input run time (:mod:`gen.arith`) for the saturation helper. The generated Python module
carries this source verbatim after that of ``gen/arith.py``; the import below then finds the
one-input functions in the module itself.

Offers
    ``WRONG_SIDE``                   status: the point lies on the other side of saturation
    ``cell_index(c, ax, fmt)``       bilinear: cell ``i`` and local variable ``t`` on one axis
    ``cubic_weights(c, ax, fmt)``    bicubic: first stencil node ``s`` and four weights
    ``coordinates2d(p, v, tab)``     clamped pressure, saturation value and second coordinate
    ``interpolate2d(x, y, tab)``     the grid's value at run-time coordinates (x, y)
    ``evaluate2d(p, v, tab)``        the whole function: policy, helper, coordinate, grid
    ``status2d(p, v, tab)``          the status code of the ``NAME_status`` variant

``tab`` is a plain dict of target-format numbers (see ``gen.fit.grid2d.Grid2D.runtime``):
``fmt``, ``method`` (``bilinear``/``bicubic``), ``policy`` (``clamp``/``nan``), ``side`` (+1 a
vapour-side table, -1 a liquid-side one, 0 no saturation helper), ``coord`` (``raw``: y = v,
clamped first to the limits at this p on a vapour or liquid table;
``offset``: y = v - S on the vapour side, S - v on the liquid side; ``normalized``:
y = (v - near) / (far - near)), ``near``/``far`` (limits of the second input; with ``near_rel``/
``far_rel`` they are distances from saturation, else absolute values), ``p_lo``/``p_hi``,
``y_lo``/``y_hi`` (first and last grid line of y), axes ``x`` and ``y`` (dicts: ``layout``
``free``, ``mapped`` or ``uniform``, ``n`` lines, ``lines``, ``iw`` reciprocal widths, ``den``
reciprocal Lagrange denominators, ``x0``/``inv_h`` of a uniform axis, ``map``/``b0``/``inv_hb``
of a mapped one), node values ``z`` (nx, ny),
``transform`` (None or ``times_p``: the grid holds value / p) and ``sat`` (keyword arguments of
:func:`gen.arith.evaluate` for the saturation helper S(p), or None).

Run-time steps, each rounded to the format, no fused multiply-add, in this order:
NaN in gives NaN out; p is clamped to [p_lo, p_hi]; S = helper(p); the second coordinate y as
above (absolute limits clamp v first in the offset coordinate) clamped to [y_lo, y_hi]; cell
index on each axis (binary search on ``free``; ``i = map[(int)((c - b0) * inv_hb)]`` then
``while (i < n - 2 && c >= lines[i + 1]) i++`` on ``mapped``; ``(int)((c - x0) * inv_h)`` on
``uniform``); then
bilinear: ``a = z00 + t*(z10 - z00); b = z01 + t*(z11 - z01); y = a + u*(b - a)``, or bicubic:
four-node Lagrange weights per axis and the 4x4 sum row by row.
"""

import numpy as np

try:
    from . import arith as _one
except ImportError:
    # inside a generated module: the one-input run time was defined just above, in this file
    import types
    _one = types.SimpleNamespace(**globals())

#: status code: the point is on the other side of the saturation line (as the helper sees it)
WRONG_SIDE = 4


def _ft(fmt):
    return _one.FORMATS[fmt]


def _clamp(a, lo, hi):
    """``if (a < lo) a = lo; else if (a > hi) a = hi;`` for non-NaN ``a``."""
    return np.where(a < lo, lo, np.where(a > hi, hi, a))


def _madd(acc, a, b, fused, ft):
    """acc + a*b rounded after each operation, or once (as a fused multiply-add)."""
    if fused:
        return (acc.astype(np.float64) + a.astype(np.float64) * b.astype(np.float64)).astype(ft)
    return acc + a * b


def _search(c, lines, n):
    """Largest i in [0, n-2] with lines[i] <= c (binary search in the C)."""
    return np.searchsorted(lines[1:n - 1], c, side="right").astype(np.int64)


def _uniform_cell(c, ax, ft):
    u = (c - ax["x0"]) * ax["inv_h"]
    i = np.minimum(u.astype(np.int64), ax["n"] - 2)
    return i, u


def map_bin(c, b0, inv_hb, nbins):
    """Bin of a ``mapped`` axis: ``k = (int)((c - b0) * inv_hb)``, at most nbins - 1."""
    u = (c - b0) * inv_hb
    return np.minimum(u.astype(np.int64), nbins - 1)


def _free_cell(c, ax):
    """Cell of a free axis (binary search) or of a mapped one: start at the bin's cell and
    step up while ``c >= lines[i + 1]`` (the same cell; the map never starts past it)."""
    i = _search(c, ax["lines"], ax["n"])
    if ax["layout"] == "mapped":
        k = map_bin(c, ax["b0"], ax["inv_hb"], ax["map"].size)
        i = np.maximum(ax["map"][k].astype(np.int64), i)
    return i


def cell_index(c, ax, fmt):
    """Cell ``i`` (0..n-2) and local variable ``t`` of run-time coordinates ``c`` on axis ``ax``."""
    ft = _ft(fmt)
    if ax["layout"] in ("free", "mapped"):
        i = _free_cell(c, ax)
        t = (c - ax["lines"][i]) * ax["iw"][i]
    else:
        i, u = _uniform_cell(c, ax, ft)
        t = u - i.astype(ft)
    return i, t


#: weights of four-node Lagrange interpolation on nodes 0, 1, 2, 3 at tau
_W6 = 1.0 / 6.0


def cubic_weights(c, ax, fmt):
    """First stencil node ``s`` (0..n-4) and the four-node Lagrange weights at ``c``.

    The stencil of cell i is nodes i-1..i+2, moved inward at both ends. ``free``:
    ``d_m = c - x[s+m]``, ``w0 = (d1*(d2*d3))*r0``, ``w1 = (d0*(d2*d3))*r1``,
    ``w2 = ((d0*d1)*d3)*r2``, ``w3 = ((d0*d1)*d2)*r3`` with stored reciprocal denominators r.
    ``uniform``: ``tau = u - s``, the same products of ``tau - m`` times -1/6, 1/2, -1/2, 1/6.
    """
    ft = _ft(fmt)
    n = ax["n"]
    if ax["layout"] in ("free", "mapped"):
        lines = ax["lines"]
        i = _free_cell(c, ax)
        s = np.clip(i - 1, 0, n - 4)
        d0 = c - lines[s]
        d1 = c - lines[s + 1]
        d2 = c - lines[s + 2]
        d3 = c - lines[s + 3]
        r = ax["den"][s]
        p01 = d0 * d1
        p23 = d2 * d3
        w0 = (d1 * p23) * r[:, 0]
        w1 = (d0 * p23) * r[:, 1]
        w2 = (p01 * d3) * r[:, 2]
        w3 = (p01 * d2) * r[:, 3]
    else:
        i, u = _uniform_cell(c, ax, ft)
        s = np.clip(i - 1, 0, n - 4)
        tau = u - s.astype(ft)
        a = tau - ft(1.0)
        b = tau - ft(2.0)
        e = tau - ft(3.0)
        p01 = tau * a
        p23 = b * e
        w0 = (a * p23) * ft(-_W6)
        w1 = (tau * p23) * ft(0.5)
        w2 = (p01 * e) * ft(-0.5)
        w3 = (p01 * b) * ft(_W6)
    return s, (w0, w1, w2, w3)


def _limits(S, tab, ft):
    """Near and far limits of the second input at this pressure (run-time values)."""
    side = tab["side"]
    near, far = ft(tab["near"]), ft(tab["far"])
    if tab["near_rel"]:
        near = S + near if side > 0 else S - near
    if tab["far_rel"]:
        far = S + far if side > 0 else S - far
    return near, far


def coordinates2d(p, v, tab):
    """Run-time coordinates of finite inputs: (clamped p, saturation value S or None, y)."""
    ft = _ft(tab["fmt"])
    pf = np.asarray(p).astype(ft)
    vf = np.asarray(v).astype(ft)
    pc = _clamp(pf, ft(tab["p_lo"]), ft(tab["p_hi"]))
    S = None
    if tab["sat"] is not None:
        S = _one.evaluate(pc, **tab["sat"]).reshape(pc.shape)
    coord, side = tab["coord"], tab["side"]
    y_lo, y_hi = ft(tab["y_lo"]), ft(tab["y_hi"])
    if coord == "raw":
        y = vf
        if side != 0:
            near, far = _limits(S, tab, ft)
            low, high = (far, near) if side < 0 else (near, far)
            y = np.where(vf < low, low, np.where(vf > high, high, vf))
    elif coord == "offset":
        vc = vf
        if side > 0:
            if not tab["near_rel"]:
                vc = np.where(vc < ft(tab["near"]), ft(tab["near"]), vc)
            if not tab["far_rel"]:
                vc = np.where(vc > ft(tab["far"]), ft(tab["far"]), vc)
            y = vc - S
        else:
            if not tab["near_rel"]:
                vc = np.where(vc > ft(tab["near"]), ft(tab["near"]), vc)
            if not tab["far_rel"]:
                vc = np.where(vc < ft(tab["far"]), ft(tab["far"]), vc)
            y = S - vc
    elif coord == "normalized":
        near, far = _limits(S, tab, ft)
        with np.errstate(invalid="ignore", over="ignore"):
            y = (vf - near) / (far - near)
    else:
        raise ValueError(f"unknown coordinate {coord!r}")
    y = _clamp(y, y_lo, y_hi)
    return pc, S, y


def interpolate2d(x, y, tab, fused=False):
    """The grid's value at run-time coordinates ``x`` (clamped p) and ``y`` (clamped)."""
    fmt = tab["fmt"]
    ft = _ft(fmt)
    z = tab["z"]
    if tab["method"] == "bilinear":
        i, t = cell_index(x, tab["x"], fmt)
        j, u = cell_index(y, tab["y"], fmt)
        z00 = z[i, j]
        z01 = z[i, j + 1]
        z10 = z[i + 1, j]
        z11 = z[i + 1, j + 1]
        a = _madd(z00, t, z10 - z00, fused, ft)
        b = _madd(z01, t, z11 - z01, fused, ft)
        out = _madd(a, u, b - a, fused, ft)
    elif tab["method"] == "bicubic":
        si, wx = cubic_weights(x, tab["x"], fmt)
        sj, wy = cubic_weights(y, tab["y"], fmt)
        rows = []
        for a in range(4):
            r = z[si + a, sj] * wy[0]
            for b in range(1, 4):
                r = _madd(r, z[si + a, sj + b], wy[b], fused, ft)
            rows.append(r)
        out = rows[0] * wx[0]
        for a in range(1, 4):
            out = _madd(out, rows[a], wx[a], fused, ft)
    else:
        raise ValueError(f"unknown method {tab['method']!r}")
    if tab["transform"] == "times_p":
        out = out * x
    return out


def _inputs(p, v, fmt):
    ft = _ft(fmt)
    pf, vf = np.broadcast_arrays(np.atleast_1d(np.asarray(p).astype(ft)),
                                 np.atleast_1d(np.asarray(v).astype(ft)))
    return pf, vf


def status2d(p, v, tab):
    """Status code: NOT_A_NUMBER, then BELOW/ABOVE for p, then WRONG_SIDE, then BELOW/ABOVE for
    the second input against its limits at this p (in its own order: a liquid table's "above"
    is the warm side), else IN_RANGE. Computed in the format like the C."""
    ft = _ft(tab["fmt"])
    pf, vf = _inputs(p, v, tab["fmt"])
    nan = np.isnan(pf) | np.isnan(vf)
    ps = np.where(nan, ft(tab["p_lo"]), pf)
    vs = np.where(nan, ft(0.0), vf)
    pc = _clamp(ps, ft(tab["p_lo"]), ft(tab["p_hi"]))
    S = None
    if tab["sat"] is not None:
        S = _one.evaluate(pc, **tab["sat"]).reshape(pc.shape)
    near, far = _limits(S, tab, ft)
    side = tab["side"]
    low, high = (far, near) if side < 0 else (near, far)
    st = np.full(pf.shape, _one.IN_RANGE, dtype=np.int32)
    st = np.where(vs > high, _one.ABOVE, st)
    st = np.where(vs < low, _one.BELOW, st)
    if side > 0:
        st = np.where(vs < S, WRONG_SIDE, st)
    elif side < 0:
        st = np.where(vs > S, WRONG_SIDE, st)
    st = np.where(ps > ft(tab["p_hi"]), _one.ABOVE, st)
    st = np.where(ps < ft(tab["p_lo"]), _one.BELOW, st)
    st = np.where(nan, _one.NOT_A_NUMBER, st)
    return st.astype(np.int32)


def evaluate2d(p, v, tab, fused=False):
    """The emitted two-input function at (p, v), exactly as the target computes it.

    ``fused=True`` models a compiler that contracts each ``a + b*c`` into one fused
    multiply-add (product and sum formed in float64, rounded once to the format)."""
    ft = _ft(tab["fmt"])
    pf, vf = _inputs(p, v, tab["fmt"])
    nan = np.isnan(pf) | np.isnan(vf)
    ps = np.where(nan, ft(tab["p_lo"]), pf)
    vs = np.where(nan, ft(tab["y_lo"]) if tab["coord"] == "raw" else ft(0.0), vf)
    with np.errstate(invalid="ignore", over="ignore"):
        x, _, y = coordinates2d(ps, vs, tab)
        out = interpolate2d(x, y, tab, fused)
    if tab["policy"] == "nan":
        out = np.where(status2d(ps, vs, tab) != _one.IN_RANGE, ft(np.nan), out)
    return np.where(nan, np.where(np.isnan(pf), pf, vf), out)
