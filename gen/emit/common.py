"""What every emitter shares: literal formatting, escaping of spec text, the per-table summary.

Offers ``hex_literal``, ``c_comment``, ``py_comment``, ``summary(table)``, ``CAUTION``,
``template_env()``, ``provenance(spec)``, ``table_kind(t)``, ``tolerance_text``,
``error_text``, ``bits_literal``, ``ref_literal``.
"""

import math
from pathlib import Path

import jinja2
import numpy as np

from .. import __version__, arith

CAUTION = ("CAUTION: not for safety functions (relief, trips, low-water cut-offs). Local codes, "
           "the equipment standards and licensed engineers decide what may be used where.")

TEMPLATES = Path(__file__).resolve().parent.parent.parent / "templates"


def template_env():
    """The jinja2 environment over ``templates/`` (layout only; no maths in templates)."""
    root = TEMPLATES if TEMPLATES.is_dir() else Path(__file__).resolve().parent / "templates"
    env = jinja2.Environment(loader=jinja2.FileSystemLoader(str(root)),
                             undefined=jinja2.StrictUndefined, keep_trailing_newline=True,
                             trim_blocks=True, lstrip_blocks=True, autoescape=False)
    env.filters["c_comment"] = c_comment
    env.filters["py_comment"] = py_comment
    return env


def hex_literal(value, fmt):
    """Exact C99 hexadecimal floating literal of ``value`` (already in ``fmt``)."""
    v = float(value)
    if math.isnan(v) or math.isinf(v):
        raise ValueError("no literal for non-finite coefficients")
    h = v.hex()  # e.g. '-0x1.8000000000000p+3'
    sign = "-" if h.startswith("-") else ""
    h = h.lstrip("-")
    mant, exp = h[2:].split("p")
    if "." in mant:
        head, frac = mant.split(".")
        frac = frac.rstrip("0")
        mant = head + ("." + frac if frac else "")
    lit = f"{sign}0x{mant}p{exp}"
    return lit + ("f" if fmt == "float32" else "")


def decimal(value, fmt):
    """Shortest decimal that rounds back to the same ``fmt`` value (for comments)."""
    ft = arith.FORMATS[fmt]
    return np.format_float_positional(ft(value), unique=True, trim="-") if abs(float(value)) >= 1e-4 \
        and abs(float(value)) < 1e7 else np.format_float_scientific(ft(value), unique=True, trim="-")


def _ascii_line(s):
    s = " ".join(str(s).split())
    return "".join(ch if 32 <= ord(ch) < 127 else "?" for ch in s)


def c_comment(s):
    """Text that is safe inside a C block comment: one line, ASCII, no '*/', no trigraphs."""
    s = _ascii_line(s)
    while "*/" in s or "/*" in s or "??" in s:
        s = s.replace("*/", "* /").replace("/*", "/ *").replace("??", "? ?")
    return s


def py_comment(s):
    """Text that is safe after '#' in Python: one line, ASCII."""
    return _ascii_line(s)


def generator_digest():
    """sha256 over the generator's own sources (package and templates), so that 'check' can
    tell a changed generator from a changed platform even within one version number."""
    import hashlib
    h = hashlib.sha256()
    pkg = Path(__file__).resolve().parent.parent
    files = sorted(list(pkg.rglob("*.py")) + list(pkg.rglob("*.json"))
                   + list(TEMPLATES.glob("*.j2")))
    for p in files:
        rel = p.relative_to(pkg.parent).as_posix()
        h.update(rel.encode() + b"\0" + p.read_bytes().replace(b"\r\n", b"\n") + b"\0")
    return h.hexdigest()


def provenance(spec):
    return {"version": __version__, "spec_name": c_comment(spec.source_name),
            "spec_sha256": spec.sha256, "command": c_comment(spec.command or f"h2olut build {spec.source_name}")}


def num_text(v, digits=6):
    """A number for comments and prose: ``digits`` significant digits."""
    return f"{float(v):.{digits}g}"



def hex_lines(values, fmt, per_line=4):
    """Hex literals of ``values`` in ``fmt``, ``per_line`` to a line, comma-separated."""
    lits = [hex_literal(v, fmt) for v in values]
    return [", ".join(lits[i:i + per_line]) for i in range(0, len(lits), per_line)]


def tolerance_text(kind, value, unit):
    """'0.02 degC' or '0.1 % of the value' (a dimensionless unit is left out)."""
    sp = f" {unit}" if unit else ""
    return f"{num_text(value)}{sp}" if kind == "abs" else f"{num_text(value * 100)} % of the value"


def error_text(kind, e, unit):
    """A verified error in the tolerance's terms: '0.0065 degC' or '0.0239 %'."""
    sp = f" {unit}" if unit else ""
    return f"{e:.3g}{sp}" if kind == "abs" else f"{e * 100:.3g} %"


def bits_literal(y, fmt):
    """C literals of the bit patterns of ``y`` in ``fmt`` ('0x3f800000u')."""
    ft = arith.FORMATS[fmt]
    utype = np.uint32 if fmt == "float32" else np.uint64
    width = 8 if fmt == "float32" else 16
    return [f"0x{int(b):0{width}x}u" for b in np.asarray(y).astype(ft).view(utype).ravel()]


def ref_literal(r):
    """A reference value as a C double literal (NAN where the core has none)."""
    return "(double)NAN" if np.isnan(r) else repr(float(r))


def _n(count, word):
    return f"{count} {word}" + ("" if count == 1 else "s")


def summary(table):
    """Plain strings describing one table, the same for every emitter and the report."""
    ts = table.spec
    pw = table.piecewise
    v = table.verification
    inp = ts.inputs[0]
    tol = tolerance_text(ts.tol_kind, ts.tol_value, ts.output_unit)
    err = error_text(ts.tol_kind, v["max_error"], ts.output_unit)
    gauge = " (gauge, atmosphere {:g} Pa)".format(inp.atmosphere) if inp.atmosphere else ""
    if pw.layout == "closed_form":
        eq = "eq. 31" if pw.kind == "temperature" else "eq. 30"
        roots = "3 square roots" if pw.kind == "temperature" else "1 square root"
        method = (f"IF97 saturation-line equation (IAPWS R7-97(2012) {eq}) evaluated in "
                  f"{pw.fmt}: {roots}, 2 divisions, no table")
        coefficients = (f"n1..n10 of IAPWS R7-97(2012) Table 34 rounded to {pw.fmt}, and the "
                        f"unit conversion constants")
    else:
        method = {
            "free": f"{_n(pw.nseg, 'segment')} of degree {pw.degree} on free breakpoints "
                    f"(binary search)",
            "uniform": f"{_n(pw.nseg, 'equal segment')} of degree {pw.degree} (index computed, "
                       f"O(1))",
            "binade": f"{_n(pw.nseg, 'segment')} of degree {pw.degree}, {2 ** pw.k} per octave "
                      f"of the input (index from the float's bits, O(1))",
        }[pw.layout]
        coefficients = ("Chebyshev-Lobatto interpolation of the IF97 core at "
                        f"{pw.degree + 1} nodes per segment, rounded to {pw.fmt}")
    ctype = "float" if pw.fmt == "float32" else "double"
    return {
        "name": ts.name,
        "function": ts.function,
        "quantity": ts.quantity.replace("_", " "),
        "description": ts.description,
        "input": inp.quantity,
        "input_unit": inp.unit,
        "range": f"{num_text(inp.lo)} to {num_text(inp.hi)} {inp.unit}{gauge}",
        "output_unit": ts.output_unit,
        "tolerance": tol,
        "max_error": err,
        "max_error_at": f"{num_text(v['at'], 8)} {inp.unit}",
        "points": v["points"],
        "verified": (f"{err} at {num_text(v['at'], 8)} {inp.unit}, the largest of {v['points']} sampled "
                     f"points (ends, breakpoints and neighbours, per-segment worst, seeded random) "
                     f"evaluated in {pw.fmt} emulation against the IF97 core; a sampled maximum, "
                     f"not a bound"),
        "fused": (None if "max_error_fused" not in v else
                  error_text(ts.tol_kind, v["max_error_fused"], ts.output_unit)),
        "method": method,
        "storage": f"{pw.storage_bytes} bytes ({pw.stored_values()} {ctype} values)",
        "policy": {"clamp": "inputs outside the range are clamped to it; NaN gives NaN",
                   "nan": "inputs outside the range give NaN; NaN gives NaN"}[pw.policy],
        "arithmetic": pw.fmt,
        "ctype": ctype,
        "coefficients": coefficients,
    }


def table_kind(t):
    """``one``, ``grid`` or ``wet``: which view renders the built table ``t``."""
    if getattr(t, "gt", None) is not None:
        return "grid"
    if getattr(t, "combine", None) is not None:
        return "wet"
    return "one"
