"""C view of a two-input grid: the dict ``templates/c_grid2d.j2`` renders, and the plain
strings that describe the grid in C comments, the Python module and the report.

Offers ``grid_c_context(gt, function, name)``, ``grid_summary(gt)``.
"""

import numpy as np

from .. import arith
from ..fit.grid2d import INPUT_WORDS, describe_domain
from .common import (c_comment, decimal, error_text, hex_lines, hex_literal, num_text,
                     tolerance_text)


def _lit(v, fmt):
    return {"lit": hex_literal(arith.to_format(v, fmt), fmt), "dec": decimal(v, fmt)}


def _axis_context(ax, method, fmt, unit):
    d = {"layout": ax.layout, "n": ax.n, "lo": _lit(ax.lo, fmt), "hi": _lit(ax.hi, fmt),
         "unit": c_comment(unit)}
    if ax.layout == "mapped":
        d["nbins"] = int(np.asarray(ax.map).size)
        d["b0"] = _lit(ax.b0, fmt)
        d["inv_hb"] = _lit(ax.inv_hb, fmt)
        d["mtype"] = "uint8_t" if ax.map_itemsize == 1 else "uint16_t"
        m = [f"{int(k)}u" for k in np.asarray(ax.map)]
        d["map"] = [", ".join(m[i:i + 16]) for i in range(0, len(m), 16)]
        d["steps"] = ax.steps
    if ax.layout == "uniform":
        d["x0"] = _lit(ax.x0, fmt)
        d["inv_h"] = _lit(ax.inv_h, fmt)
    elif method == "bilinear":
        d["nlines"] = ax.n - 1
        d["lines"] = hex_lines(np.asarray(ax.lines)[:-1], fmt)
        d["iw"] = hex_lines(ax.iw, fmt)
    else:
        d["nlines"] = ax.n
        d["lines"] = hex_lines(ax.lines, fmt)
        d["den"] = [", ".join(hex_lines(r, fmt, 4)) for r in np.asarray(ax.den)]
    return d


def grid_summary(gt):
    """Plain strings describing a two-input table, for the C error block and the report."""
    dom, g, v = gt.domain, gt.grid, gt.verification
    tol = tolerance_text(gt.tol_kind, gt.tol, dom.out_unit)

    def err(e):
        return error_text(gt.tol_kind, e, dom.out_unit)

    at = v["at"]
    raw = (f"{INPUT_WORDS[dom.second]} itself" if not g.side else
           f"{INPUT_WORDS[dom.second]} itself on a box over the raw inputs, clamped first to its "
           f"limits at p" + ("; nodes beyond saturation from the phase's own equation continued "
                             "past it" if (g.near_rel or g.far_rel) else ""))
    coord = {"raw": raw,
             "offset": (f"{'superheat' if dom.side > 0 else 'subcooling'} "
                        f"y = {'v - S(p)' if dom.side > 0 else 'S(p) - v'} in {dom.v_unit}"
                        + ("" if dom.near_rel and dom.far_rel else
                           "; absolute limits clamp v first, so part of the grid is not "
                           "reached")),
             "normalized": "y = (v - near(p)) / (far(p) - near(p)), one division"}[g.coord]
    method = {"bilinear": "bilinear interpolation of node values",
              "bicubic": "four-node Lagrange interpolation per axis over 4x4 node values "
                         "(continuous, not smooth, across cell edges)"}[g.method]
    lay = {"free": "free lines, binary search", "uniform": "equal spacing, index computed",
           "mapped": "free lines, cell from a bin table and at most a few steps"}
    ctype = "float" if g.fmt == "float32" else "double"
    hb = g.helper.storage_bytes if g.helper is not None else 0
    return {
        "quantity": dom.quantity.replace("_", " "),
        "output_unit": dom.out_unit,
        "p_unit": dom.p_unit,
        "second": INPUT_WORDS[dom.second],
        "v_unit": dom.v_unit,
        "domain": describe_domain(dom),
        "tolerance": tol,
        "max_error": err(v["max_error"]),
        "max_error_at": f"p = {num_text(at[0])} {dom.p_unit}, {INPUT_WORDS[dom.second]} = {num_text(at[1])} "
                        f"{dom.v_unit}",
        "points": v["points"],
        "verified": (f"{err(v['max_error'])} at p = {num_text(at[0])} {dom.p_unit}, "
                     f"{INPUT_WORDS[dom.second]} = {num_text(at[1])} {dom.v_unit}, the largest of "
                     f"{v['points']} sampled points (edges and corner neighbours, grid lines "
                     f"and neighbours, cell interiors, seeded random; none a node or check point "
                     f"of the fit) of the whole function in {g.fmt} emulation against the IF97 "
                     f"core; a sampled maximum, not a bound"),
        "fused": None if v.get("max_error_fused") is None else err(v["max_error_fused"]),
        "method": (f"{method} on {g.nx} x {g.ny} nodes; pressure: {lay[g.x.layout]}; "
                   f"second coordinate: {lay[g.y.layout]}"),
        "coordinate": coord,
        "storage": (f"{g.storage_bytes} bytes ({g.stored_values()} {ctype} values, of which "
                    f"the saturation helper {hb} bytes)"),
        "policy": {"clamp": "inputs outside the range are clamped to it (the second input to "
                            "its limits at the clamped pressure); NaN gives NaN",
                   "nan": "inputs outside the range give NaN; NaN gives NaN"}[g.policy],
        "wrong_side": ("a point on the other side of the saturation line (as the helper sees "
                       "it) gets the value at the nearest limit, and status WRONG_SIDE"
                       if g.side else "no saturation inside"),
    }


def grid_c_context(gt, function, name=None):
    """The dict the ``grid2d`` macro of ``templates/c_grid2d.j2`` renders, for table
    ``gt`` (:class:`GridTable`) as C function ``function``; private names use ``name`` (the
    table's name, as the one-input tables do: ``prefix__name``)."""
    from .c import table_context
    g, dom, fmt = gt.grid, gt.domain, gt.grid.fmt
    name = name or function
    priv = (function[:len(function) - len(name) - 1] + "__" + name
            if function.endswith("_" + name) else function + "__")
    s = {k: (c_comment(v) if isinstance(v, str) else v) for k, v in grid_summary(gt).items()}
    sat = None
    if g.helper is not None:
        sat = table_context(gt.helper)
        sat["fn"] = priv + "_sat"
        sat["priv"] = priv + "_sat"
        sat["UP"] = sat["fn"].upper()
    rows = []
    pl = np.asarray(g.x.lines)
    for i in range(g.nx):
        z = np.asarray(g.z)[i]
        decs = [decimal(v, fmt) for v in z]
        rows.append({"lines": hex_lines(z, fmt, 4),
                     "decs": [", ".join(decs[k:k + 4]) for k in range(0, len(decs), 4)],
                     "note": f"p = {decimal(pl[i], fmt)} {c_comment(dom.p_unit)}"})
    ctx = {
        "s": s, "fn": function, "priv": priv, "UP": function.upper(), "fmt": fmt,
        "ctype": "float" if fmt == "float32" else "double",
        "method": g.method, "coord": g.coord, "side": g.side, "policy": g.policy,
        "transform": g.transform, "near_rel": g.near_rel, "far_rel": g.far_rel,
        "near": _lit(g.near, fmt), "far": _lit(g.far, fmt),
        "p_lo": _lit(g.x.lo, fmt), "p_hi": _lit(g.x.hi, fmt),
        "y_lo": _lit(g.y.lo, fmt), "y_hi": _lit(g.y.hi, fmt),
        "x": _axis_context(g.x, g.method, fmt, dom.p_unit),
        "y": _axis_context(g.y, g.method, fmt, {"offset": dom.v_unit, "raw": dom.v_unit,
                                                 "normalized": "1"}[g.coord]),
        "nx": g.nx, "ny": g.ny, "z_rows": rows, "sat": sat,
        "one": hex_literal(1.0, fmt), "two": hex_literal(2.0, fmt),
        "three": hex_literal(3.0, fmt), "half": hex_literal(0.5, fmt),
        "m_half": hex_literal(-0.5, fmt),
        "sixth": hex_literal(arith.to_format(1.0 / 6.0, fmt), fmt),
        "m_sixth": hex_literal(arith.to_format(-1.0 / 6.0, fmt), fmt),
        "needs_string": g.helper is not None and g.helper.layout == "binade",
        "needs_math": g.policy == "nan",
    }
    return ctx
