"""Views of a wet-steam table: the plain strings that describe it (C comments, the Python
module, the report) and the dict ``templates/c_wet.j2`` renders.

Offers ``wet_summary(wt)``, ``wet_c_context(wt)``.
"""

from .. import arith
from .common import c_comment, decimal, error_text, hex_literal, num_text, tolerance_text


def _second_word(ts):
    return ts.inputs[1].quantity.replace("_", " ")


def wet_summary(wt):
    """Plain strings describing a wet-steam table, for the C comments and the report."""
    ts, v = wt.spec, wt.verification
    pin, ain = ts.inputs
    unit = ts.output_unit or "1"
    tol = tolerance_text(ts.tol_kind, ts.tol_value, ts.output_unit)

    def err(e):
        return error_text(ts.tol_kind, e, ts.output_unit)

    at = v["at"]
    out = {"quality": "quality x", "saturation": "saturation temperature at p",
           "lever": f"{ts.quantity.replace('_', ' ')} b' + x (b'' - b')",
           "inverse_lever": "density 1 / (v' + x (v'' - v'))"}[wt.combine]
    tables = ", ".join(f"{t.spec.quantity.replace('_', ' ')} ({t.piecewise.nseg} x degree "
                       f"{t.piecewise.degree}, {t.piecewise.layout}, {t.piecewise.storage_bytes} "
                       f"B)" for t in wt.members.values())
    ctype = "float" if wt.fmt == "float32" else "double"
    return {
        "quantity": ts.quantity.replace("_", " "),
        "description": ts.description,
        "output_unit": unit,
        "p_unit": pin.unit,
        "second": _second_word(ts),
        "v_unit": ain.unit,
        "domain": (f"wet steam, pressure {num_text(pin.lo)} to {num_text(pin.hi)} {pin.unit}, "
                   f"{_second_word(ts)} between saturated liquid and saturated vapour"),
        "tolerance": tol,
        "max_error": err(v["max_error"]),
        "max_error_at": f"p = {num_text(at[0])} {pin.unit}, {_second_word(ts)} = {num_text(at[1])} {ain.unit}",
        "points": v["points"],
        "verified": (f"{err(v['max_error'])} at p = {num_text(at[0])} {pin.unit}, "
                     f"{_second_word(ts)} = {num_text(at[1])} {ain.unit}, the largest of "
                     f"{v['points']} sampled points inside the dome (member breakpoints and "
                     f"neighbours, dome edges, seeded random) of the whole function in "
                     f"{wt.fmt} emulation against the IF97 core; a sampled maximum, not a bound"),
        "fused": None if v.get("max_error_fused") is None else err(v["max_error_fused"]),
        "quality_error": f"{v['quality_max_error']:.2g}",
        "method": (f"quality x = (a - a'(p)) / (a''(p) - a'(p)) from saturation tables of "
                   f"pressure, clamped to [0, 1]; output {out}. Tables: {tables}"),
        "storage": f"{wt.storage_bytes} bytes ({wt.stored_values()} {ctype} values)",
        "policy": {"clamp": "a pressure outside the range is clamped to it, a point outside "
                            "the dome gets the value at its edge; NaN gives NaN",
                   "nan": "a pressure outside the range or a point outside the dome gives "
                          "NaN; NaN gives NaN"}[wt.policy],
        "dome": (f"SUBCOOLED where the run time's quality is below 0, SUPERHEATED "
                 f"above 1; the run time's quality is within {v['quality_max_error']:.2g} of "
                 f"the core's, so the status can be wrong only that close to the dome's edge"),
    }


def wet_c_context(wt):
    """The dict the ``wet`` macro of ``templates/c_wet.j2`` renders."""
    from .c import table_context
    ts = wt.spec
    fn = ts.function
    priv = fn[:len(fn) - len(ts.name) - 1] + "__" + ts.name
    s = {k: (c_comment(v) if isinstance(v, str) else v) for k, v in wet_summary(wt).items()}
    mems = []
    for role, t in wt.members.items():
        c = table_context(t)
        c["fn"] = c["priv"] = f"{priv}_{role}"
        c["UP"] = c["fn"].upper()
        mems.append(c)
    ctx = {"s": s, "fn": fn, "priv": priv, "UP": fn.upper(), "fmt": wt.fmt,
           "ctype": "float" if wt.fmt == "float32" else "double",
           "combine": wt.combine, "policy": wt.policy, "members": mems,
           "roles": {role: f"{priv}_{role}" for role in wt.members},
           "p_lo": {"lit": hex_literal(arith.to_format(wt.p_lo, wt.fmt), wt.fmt),
                    "dec": decimal(wt.p_lo, wt.fmt)},
           "p_hi": {"lit": hex_literal(arith.to_format(wt.p_hi, wt.fmt), wt.fmt),
                    "dec": decimal(wt.p_hi, wt.fmt)},
           "zero": hex_literal(0.0, wt.fmt), "one": hex_literal(1.0, wt.fmt),
           "needs_string": any(t.piecewise.layout == "binade" for t in wt.members.values()),
           "needs_math": True}
    return ctx


