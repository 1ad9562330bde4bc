"""C99 view of fitted tables: header, source and a test-vector program.

The maths is fixed by :mod:`gen.arith`; this module only turns a table into the strings the
templates lay out (hex-float literals with their decimal value in a comment, sizes, names).

Offers ``table_view(t)``, ``render_c(spec, tables, base)`` -> {file: text},
``vector_points(table, n_random)``.
"""

import numpy as np

from .. import arith
from .common import (CAUTION, bits_literal, c_comment, decimal, hex_lines, hex_literal,
                     provenance, ref_literal, summary, table_kind, template_env)

#: random points per table in the C test-vector program (besides the directed ones)
RANDOM_VECTORS = 500


def _rows(coef, fmt, starts, unit):
    """One row of hex literals per segment, with the segment's start and the decimal value
    of every literal for the comment above it."""
    rows = []
    for i, c in enumerate(coef):
        lits = ", ".join(hex_literal(v, fmt) for v in c)
        rows.append({"lits": lits, "note": f"segment {i}: from {starts[i]:.8g} {c_comment(unit)}",
                     "decs": ", ".join(decimal(v, fmt) for v in c)})
    return rows


def table_context(table):
    pw = table.piecewise
    ts = table.spec
    fmt = pw.fmt
    b = pw.breakpoints()
    up = ts.function.upper()
    ctx = {
        "s": {k: (c_comment(v) if isinstance(v, str) else v) for k, v in summary(table).items()},
        "fn": ts.function,
        "priv": ts.function[:len(ts.function) - len(ts.name) - 1] + "__" + ts.name,
        "UP": up,
        "layout": pw.layout,
        "fmt": fmt,
        "ctype": "float" if fmt == "float32" else "double",
        "utype": "uint32_t" if fmt == "float32" else "uint64_t",
        "usuf": "u" if fmt == "float32" else "ull",
        "mant": 23 if fmt == "float32" else 52,
        "twobias": 254 if fmt == "float32" else 2046,
        "nseg": pw.nseg,
        "degree": pw.degree,
        "ncoef": pw.degree + 1,
        "lo": hex_literal(arith.to_format(pw.lo, fmt), fmt),
        "hi": hex_literal(arith.to_format(pw.hi, fmt), fmt),
        "lo_dec": decimal(pw.lo, fmt),
        "hi_dec": decimal(pw.hi, fmt),
        "policy": pw.policy,
        "needs_string": pw.layout == "binade",
        "needs_math": pw.policy == "nan" or pw.layout == "closed_form",
    }
    if pw.layout == "closed_form":
        names = [f"n{i}" for i in range(1, 11)] + ["a", "b", "c", "d"]
        ctx["kind"] = pw.kind
        ctx["consts"] = [{"name": nm, "lit": hex_literal(v, fmt), "dec": decimal(v, fmt)}
                         for nm, v in zip(names, pw.constants())]
        ctx["ncon"] = len(names)
        return ctx
    ctx.update({
        "coef_rows": _rows(pw.coef, fmt, b, ts.inputs[0].unit),
        "horner": [f"c[{j}]" for j in range(1, pw.degree + 1)],
        "formula": "y = " + "(" * (pw.degree - 1) + "c[0]*t" + "".join(
            f" + c[{j}])*t" if j < pw.degree else f" + c[{j}]" for j in range(1, pw.degree + 1)),
    })
    if pw.layout == "free":
        ctx["x_lines"] = hex_lines(pw.x[:-1], fmt)
        ctx["iw_lines"] = hex_lines(pw.inv_w, fmt)
    elif pw.layout == "uniform":
        ctx["x0"] = hex_literal(arith.to_format(pw.x0, fmt), fmt)
        ctx["inv_h"] = hex_literal(arith.to_format(pw.inv_h, fmt), fmt)
        ctx["x0_dec"] = decimal(pw.x0, fmt)
        ctx["inv_h_dec"] = decimal(pw.inv_h, fmt)
    else:
        ctx["k"] = pw.k
        ctx["key0"] = pw.key0
    return ctx


def vector_points(table, n_random=RANDOM_VECTORS):
    """Directed and random inputs for the C test vectors (finite ones; specials added apart)."""
    pw = table.piecewise
    ft = arith.FORMATS[pw.fmt]
    b = pw.breakpoints().astype(ft)
    pts = [np.array([pw.lo, pw.hi], dtype=ft), b, np.nextafter(b, ft(-np.inf)),
           np.nextafter(b, ft(np.inf)), np.array([table.verification["at"]]).astype(ft)]
    span = float(pw.hi) - float(pw.lo)
    pts.append(np.array([float(pw.lo) - 0.25 * span, float(pw.hi) + 0.25 * span]).astype(ft))
    rng = np.random.default_rng(table.verification["seed"] ^ 0x5EED)
    pts.append(rng.uniform(float(pw.lo), float(pw.hi), n_random).astype(ft))
    x = np.concatenate(pts)
    _, idx = np.unique(x, return_index=True)
    return x[np.sort(idx)]


def vectors_context(table, reference):
    """Rows (x, expected bits, reference, tolerance) for one table's test vectors."""
    pw = table.piecewise
    ts = table.spec
    fmt = pw.fmt
    ft = arith.FORMATS[fmt]
    x = vector_points(table)
    y = pw(x)
    xr = np.clip(x.astype(np.float64), float(pw.lo), float(pw.hi))
    ref = reference(xr)
    if pw.policy == "nan":
        ref = np.where((x < ft(pw.lo)) | (x > ft(pw.hi)), np.nan, ref)
    utype = np.uint32 if fmt == "float32" else np.uint64
    rows = [{"x": hex_literal(xi, fmt), "bits": bi, "ref": ref_literal(ri)}
            for xi, bi, ri in zip(x, bits_literal(y, fmt), ref)]
    specials = [{"x": "INFINITY", "expect": "hi" if pw.policy == "clamp" else "nan"},
                {"x": "-INFINITY", "expect": "lo" if pw.policy == "clamp" else "nan"},
                {"x": "NAN", "expect": "nan"}]
    y_lo, y_hi = pw(np.array([pw.lo, pw.hi]))
    return {"rows": rows, "specials": specials, "count": len(rows),
            "tol_kind": ts.tol_kind, "tol": repr(float(ts.tol_value)),
            "y_lo_bits": f"0x{int(np.asarray(y_lo, ft).view(utype)):x}u",
            "y_hi_bits": f"0x{int(np.asarray(y_hi, ft).view(utype)):x}u"}


def vector_points_2d(table, n_random=RANDOM_VECTORS):
    """Inputs for a two-input table's vectors: the corners and edges of the domain at every
    grid pressure, cell centres, seeded random points inside, and points on the wrong side."""
    gt = table.gt
    dom, g = gt.domain, gt.grid
    ft = arith.FORMATS[g.fmt]
    pl = np.asarray(g.x.lines, dtype=np.float64)
    pc = 0.5 * (pl[:-1] + pl[1:])
    ps = np.concatenate([pl, pc])
    near, far = dom.limits(ps)
    mid = 0.5 * (near + far)
    P = [ps, ps, ps]
    V = [near, far, mid]
    rng = np.random.default_rng(table.verification["seed"] ^ 0x5EED)
    pr = rng.uniform(dom.p_lo, dom.p_hi, n_random)
    a, b = dom.limits(pr)
    P.append(pr)
    V.append(a + (b - a) * rng.uniform(0.0, 1.0, n_random))
    P, V = np.concatenate(P), np.concatenate(V)
    # inside the domain only (in the format): the reference is the core there
    P, V = P.astype(ft).astype(np.float64), V.astype(ft).astype(np.float64)
    a, b = dom.limits(P)
    lo, hi = np.minimum(a, b), np.maximum(a, b)
    keep = (V >= lo) & (V <= hi) & (P >= dom.p_lo) & (P <= dom.p_hi)
    return P[keep], V[keep]


def vectors_context_2d(table):
    gt = table.gt
    dom, g = gt.domain, gt.grid
    fmt = g.fmt
    ft = arith.FORMATS[fmt]
    P, V = vector_points_2d(table)
    ref = dom.core(P, V)
    rows = [{"p": hex_literal(p, fmt), "v": hex_literal(v, fmt), "bits": bi,
             "ref": ref_literal(r)}
            for p, v, bi, r in zip(P, V, bits_literal(g(P, V), fmt), ref)]
    wrong = []
    if dom.side:
        # a point a little on the other side of saturation, at mid pressure
        pm = np.array([0.5 * (dom.p_lo + dom.p_hi)])
        sv = dom.sat(pm)[0]
        step = max(abs(sv) * 1e-3, 1.0 * (1.0 if dom.second == "temperature" else 10.0))
        wv = sv - dom.side * step
        wrong = [{"p": hex_literal(ft(pm[0]), fmt), "v": hex_literal(ft(wv), fmt)}]
    return {"rows": rows, "count": len(rows), "tol_kind": gt.tol_kind, "tol": repr(float(gt.tol)),
            "wrong": wrong}


def vectors_context_wet(table):
    """Rows (p, a, expected bits and status, reference) for a wet-steam table's vectors."""
    from ..wet import reference, wet_vector_points
    fmt = table.fmt
    ft = arith.FORMATS[fmt]
    P, A = wet_vector_points(table)
    y = table(P, A).astype(ft)
    st = table.status(P, A)
    _, ref = reference(table.spec, P, A)
    lo, hi = float(table.p_lo), float(table.p_hi)
    ref = np.where((P < lo) | (P > hi), np.nan, ref)
    rows = [{"p": hex_literal(p, fmt), "a": hex_literal(a, fmt), "bits": bi, "status": int(s),
             "is_nan": int(np.isnan(yi)), "ref": ref_literal(r)}
            for p, a, bi, s, yi, r in zip(P, A, bits_literal(y, fmt), st, y, ref)]
    return {"rows": rows, "count": len(rows), "tol_kind": table.spec.tol_kind,
            "tol": repr(float(table.spec.tol_value))}


def table_view(t):
    """The template context of any built table (one input, grid or wet steam), with the
    flags ``is_grid`` and ``is_wet`` the templates branch on."""
    from .grid2d import grid_c_context
    from .wet import wet_c_context
    kind = table_kind(t)
    if kind == "grid":
        c = grid_c_context(t.gt, t.spec.function, t.spec.name)
    elif kind == "wet":
        c = wet_c_context(t)
    else:
        c = table_context(t)
    c["is_grid"] = kind == "grid"
    c["is_wet"] = kind == "wet"
    return c


def render_c(spec, tables, base, references):
    """Render NAME.h, NAME.c and NAME_vectors.c; ``references[name]`` is the core in user units."""
    env = template_env()
    guard = "".join(ch if ch.isalnum() else "_" for ch in base).upper() + "_H"
    ctxs = []
    for t in tables:
        c = table_view(t)
        c["vec"] = (vectors_context_2d(t) if c["is_grid"] else vectors_context_wet(t)
                    if c["is_wet"] else vectors_context(t, references[t.name]))
        ctxs.append(c)
    ctx = {"p": provenance(spec), "caution": CAUTION, "base": base, "guard": guard,
           "PRE": spec.prefix.upper(), "pre": spec.prefix,
           "spec_description": c_comment(spec.description), "tables": ctxs,
           "any_two": any(c["is_grid"] for c in ctxs),
           "any_wet": any(c["is_wet"] for c in ctxs),
           "needs_string": any(c["needs_string"] for c in ctxs),
           "needs_math": any(c["needs_math"] for c in ctxs)}
    return {f"{base}.h": env.get_template("c_header.h.j2").render(ctx),
            f"{base}.c": env.get_template("c_source.c.j2").render(ctx),
            f"{base}_vectors.c": env.get_template("c_vectors.c.j2").render(ctx)}
