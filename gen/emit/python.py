"""Python view of fitted tables: a standalone module (numpy only) that evaluates the stored
tables with the generator's own run-time code, :mod:`gen.arith`, copied in verbatim.

Offers ``render_python(spec, tables, base)`` -> {file: text}.
"""

from pathlib import Path

import numpy as np

from .. import arith
from .c import table_view
from .common import CAUTION, provenance, table_kind, template_env


def _hex_list(values, per_line=3):
    lits = [f'"{float(v).hex()}",' for v in values]
    return [" ".join(lits[i:i + per_line]) for i in range(0, len(lits), per_line)]


def _py_table(t):
    pw = t.piecewise
    hx = lambda v: f'float.fromhex("{float(v).hex()}")'  # noqa: E731
    if pw.layout == "closed_form":
        return {"lo": hx(pw.lo), "hi": hx(pw.hi), "k_lines": _hex_list(pw.constants())}
    tab = {"lo": hx(pw.lo), "hi": hx(pw.hi), "coef_lines": _hex_list(pw.coef.ravel()),
           "x": "None", "inv_w": "None", "x0": "None", "inv_h": "None", "k": pw.k,
           "key0": pw.key0}
    if pw.layout == "free":
        tab["x"] = "_table([" + " ".join(f'"{float(v).hex()}",' for v in pw.x[:-1]) + \
            f'], "{pw.fmt}")'
        tab["inv_w"] = "_table([" + " ".join(f'"{float(v).hex()}",' for v in pw.inv_w) + \
            f'], "{pw.fmt}")'
    elif pw.layout == "uniform":
        tab["x0"] = f'FORMATS["{pw.fmt}"]({hx(pw.x0)})'
        tab["inv_h"] = f'FORMATS["{pw.fmt}"]({hx(pw.inv_h)})'
    return tab


def py_literal(value, fmt, indent=8):
    """Python source for a run-time value: dicts, arrays in the format (hex strings), numbers."""
    pad = " " * indent
    if isinstance(value, dict):
        items = [f"{pad}{k!r}: {py_literal(v, fmt, indent + 4)}," for k, v in value.items()]
        return "{\n" + "\n".join(items) + "\n" + " " * (indent - 4) + "}"
    if value is None or isinstance(value, (bool, str)):
        return repr(value)
    if isinstance(value, (int, np.integer)):
        return repr(int(value))
    a = np.asarray(value)
    if a.ndim == 0:
        if a.dtype.kind == "f":
            return f'FORMATS["{fmt}"](float.fromhex("{float(a).hex()}"))' if a.dtype != np.float64 \
                else f'float.fromhex("{float(a).hex()}")'
        return repr(a.item())
    if a.dtype.kind in "iu":
        return f"np.array({a.tolist()!r}, dtype=np.int64)"
    dt = "float32" if a.dtype == np.float32 else "float64"
    lines = _hex_list(a.ravel(), per_line=3)
    body = ("\n" + pad).join(lines)
    return f"_table([\n{pad}{body}\n{pad}], {dt!r}).reshape({a.shape!r})"


def render_python(spec, tables, base):
    env = template_env()
    runtime = Path(arith.__file__).read_text(encoding="utf-8").rstrip() + "\n"
    ctxs = []
    kinds = set()
    for t in tables:
        kinds.add(table_kind(t))
        c = table_view(t)
        if c["is_grid"]:
            c["py_tab"] = py_literal(t.gt.grid.runtime(), t.gt.grid.fmt)
        elif c["is_wet"]:
            c["py_tab"] = py_literal(t.runtime(), t.fmt)
        else:
            c["py"] = _py_table(t)
        ctxs.append(c)
    from .. import arith2d, arith_wet
    for kind, mod in (("grid", arith2d), ("wet", arith_wet)):
        if kind in kinds:
            runtime += "\n\n" + Path(mod.__file__).read_text(encoding="utf-8").rstrip() + "\n"
    ctx = {"p": provenance(spec), "caution": CAUTION, "base": base, "tables": ctxs,
           "runtime": runtime}
    return {f"{base}.py": env.get_template("python_module.py.j2").render(ctx)}
