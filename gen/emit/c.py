"""C99 view of fitted tables: header, source and a test-vector program.

The maths is fixed by :mod:`gen.arith`; this module only turns a table into the strings the
templates lay out (hex-float literals with their decimal value in a comment, sizes, names).

Offers ``c_context(spec, tables, base)``, ``render_c(spec, tables, base)`` -> {file: text},
``vector_points(table, n_random)``.
"""

import numpy as np

from .. import arith
from .common import CAUTION, c_comment, decimal, hex_literal, provenance, summary, template_env

#: random points per table in the C test-vector program (besides the directed ones)
RANDOM_VECTORS = 500


def _rows(coef, fmt, starts, unit):
    rows = []
    for i, c in enumerate(coef):
        lits = ", ".join(hex_literal(v, fmt) for v in c)
        rows.append({"lits": lits, "note": f"segment {i}: from {starts[i]:.8g} {c_comment(unit)}"})
    return rows


def _list(values, fmt, per_line=4):
    lits = [hex_literal(v, fmt) for v in values]
    lines = [", ".join(lits[i:i + per_line]) for i in range(0, len(lits), per_line)]
    return lines


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
        ctx["x_lines"] = _list(pw.x[:-1], fmt)
        ctx["iw_lines"] = _list(pw.inv_w, fmt)
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
    bits = y.astype(ft).view(utype)
    rows = []
    for xi, bi, ri in zip(x, bits, ref):
        rows.append({"x": hex_literal(xi, fmt),
                     "bits": f"0x{int(bi):0{8 if fmt == 'float32' else 16}x}u",
                     "ref": "(double)NAN" if np.isnan(ri) else repr(float(ri))})
    specials = [{"x": "INFINITY", "expect": "hi" if pw.policy == "clamp" else "nan"},
                {"x": "-INFINITY", "expect": "lo" if pw.policy == "clamp" else "nan"},
                {"x": "NAN", "expect": "nan"}]
    y_lo, y_hi = pw(np.array([pw.lo, pw.hi]))
    return {"rows": rows, "specials": specials, "count": len(rows),
            "tol_kind": ts.tol_kind, "tol": repr(float(ts.tol_value)),
            "y_lo_bits": f"0x{int(np.asarray(y_lo, ft).view(utype)):x}u",
            "y_hi_bits": f"0x{int(np.asarray(y_hi, ft).view(utype)):x}u"}


def render_c(spec, tables, base, references):
    """Render NAME.h, NAME.c and NAME_vectors.c; ``references[name]`` is the core in user units."""
    env = template_env()
    guard = "".join(ch if ch.isalnum() else "_" for ch in base).upper() + "_H"
    ctx = {"p": provenance(spec), "caution": CAUTION, "base": base, "guard": guard,
           "PRE": spec.prefix.upper(), "pre": spec.prefix,
           "spec_description": c_comment(spec.description),
           "tables": [table_context(t) for t in tables]}
    for tc, t in zip(ctx["tables"], tables):
        tc["vec"] = vectors_context(t, references[t.name])
    ctx["needs_string"] = any(t.piecewise.layout == "binade" for t in tables)
    ctx["needs_math"] = any(t.piecewise.policy == "nan" or t.piecewise.layout == "closed_form"
                            for t in tables)
    return {f"{base}.h": env.get_template("c_header.h.j2").render(ctx),
            f"{base}.c": env.get_template("c_source.c.j2").render(ctx),
            f"{base}_vectors.c": env.get_template("c_vectors.c.j2").render(ctx)}
