"""Python view of fitted tables: a standalone module (numpy only) that evaluates the stored
tables with the generator's own run-time code, :mod:`gen.arith`, copied in verbatim.

Offers ``render_python(spec, tables, base)`` -> {file: text}.
"""

from pathlib import Path

from .. import arith
from .c import table_context
from .common import CAUTION, provenance, template_env


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


def render_python(spec, tables, base):
    env = template_env()
    runtime = Path(arith.__file__).read_text(encoding="utf-8").rstrip() + "\n"
    ctxs = []
    for t in tables:
        c = table_context(t)
        c["py"] = _py_table(t)
        ctxs.append(c)
    ctx = {"p": provenance(spec), "caution": CAUTION, "base": base, "tables": ctxs,
           "runtime": runtime}
    return {f"{base}.py": env.get_template("python_module.py.j2").render(ctx)}
