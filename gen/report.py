"""The report: ``report.json`` (versioned, documented by ``gen/schema/report.schema.json``),
``report.md`` for a reviewer, and one error plot per table.

Offers ``SCHEMA_VERSION``, ``report_json(spec, tables)``, ``report_markdown(spec, tables,
plots)``, ``error_plot(table, f, path_name)`` -> PNG bytes.
"""

import io
import json

import numpy as np

from . import __version__
from .emit.common import CAUTION, generator_digest, summary, table_kind

SCHEMA_VERSION = "h2olut-report/1"


def _tol(ts):
    return {ts.tol_kind: ts.tol_value}


def table_record(table):
    """The per-table record of report.json (audited tables will use the same keys)."""
    ts = table.spec
    pw = table.piecewise
    v = table.verification
    inp = ts.inputs[0]
    rec = _head(ts, [{"quantity": inp.quantity, "unit": inp.unit, "min": inp.lo, "max": inp.hi,
                      **({"atmosphere_pa": inp.atmosphere} if inp.atmosphere else {})}],
                pw.fmt, pw.storage_bytes, v, [v["at"]])
    rec.update({
        "verification": verification_block(
            v, table.floor, max_breakpoint_step=v["max_breakpoint_step"],
            monotone=table.monotone, monotone_reversals=v.get("monotone_reversals")),
        "method": {
            "kind": "closed_form" if pw.layout == "closed_form" else "piecewise_polynomial",
            "layout": pw.layout,
            "segments": pw.nseg,
            "degree": pw.degree,
            "stored_values": pw.stored_values(),
            "breakpoints": [float(b) for b in pw.breakpoints()],
            "out_of_range": pw.policy,
            "goal": ts.goal,
        },
        "candidates": table.candidates,
        "notes": table.notes,
    })
    if table.budget is not None:
        rec["sensor_budget"] = table.budget
    return rec


def _head(ts, inputs, fmt, storage, v, at):
    """The keys every table record starts with (see the machine contract)."""
    return {
        "name": ts.name,
        "function": ts.function,
        "quantity": ts.quantity,
        "description": ts.description,
        "inputs": inputs,
        "output": {"quantity": ts.quantity, "unit": ts.output_unit},
        "arithmetic": fmt,
        "tolerance": _tol(ts),
        "storage_bytes": storage,
        "max_error": {ts.tol_kind: v["max_error"]},
        "max_error_at": at,
        "verification_points": v["points"],
    }


def verification_block(v, floor, **extra):
    """The ``verification`` block: how the maximum error was measured."""
    out = {"method": "sampled", "reference": "h2olut IF97 core (float64)",
           "counts": v["counts"], "seed": v["seed"], "rms_error": v["rms_error"],
           "max_error_with_fma": v.get("max_error_fused")}
    out.update(extra)
    out["format_floor"] = floor
    return out


def _is_two(t):
    return getattr(t, "gt", None) is not None


def table_record_2d(table):
    """The per-table record of a two-input table (same keys as one-input ones)."""
    from .fit.grid2d import describe_domain
    ts, gt = table.spec, table.gt
    dom, g, v = gt.domain, gt.grid, gt.verification
    pl = np.linspace(dom.p_lo, dom.p_hi, 257)
    near, far = dom.limits(pl)
    vmin, vmax = float(np.min(np.minimum(near, far))), float(np.max(np.maximum(near, far)))
    second = {"quantity": ts.inputs[1].quantity, "unit": dom.v_unit, "min": vmin, "max": vmax}
    for k, val, rel in (("near", dom.near, dom.near_rel), ("far", dom.far, dom.far_rel)):
        second[f"{k}_limit"] = {"value": float(val), "from_saturation": bool(rel)}
    rec = _head(ts, [{"quantity": "pressure", "unit": dom.p_unit, "min": dom.p_lo,
                      "max": dom.p_hi}, second], g.fmt, g.storage_bytes, v,
                [float(v["at"][0]), float(v["at"][1])])
    rec.update({
        "verification": verification_block(v, gt.floor, max_by_kind=v.get("max_by_kind"),
                                      order_reversals=v.get("reversals"),
                                      points_requested=v.get("requested"),
                                      left_out_as_fit_points=v.get("left_out")),
        "method": {
            "kind": "grid",
            "layout": f"{g.x.layout}/{g.y.layout}",
            "interpolation": g.method,
            "coordinate": g.coord,
            "phase": dom.phase,
            "domain": describe_domain(dom),
            "nx": g.nx,
            "ny": g.ny,
            "stored_values": g.stored_values(),
            "saturation_helper_bytes": 0 if g.helper is None else g.helper.storage_bytes,
            "out_of_range": g.policy,
            "goal": gt.goal,
        },
        "candidates": _clean(gt.candidates),
        "notes": list(gt.notes),
    })
    if table.budget is not None:
        rec["sensor_budget"] = table.budget
    return rec


def table_record_wet(table):
    """The per-table record of a wet-steam table (same keys as the others), with its member
    saturation tables, the run time's quality error and how the dome status behaved."""
    ts, wt, v = table.spec, table, table.verification
    pin, ain = ts.inputs
    inputs = [{"quantity": "pressure", "unit": pin.unit, "min": float(wt.p_lo),
               "max": float(wt.p_hi),
               **({"atmosphere_pa": pin.atmosphere} if pin.atmosphere else {})},
              {"quantity": ain.quantity, "unit": ain.unit, "min": float(ain.lo),
               "max": float(ain.hi), "range": "saturated liquid to saturated vapour"}]
    rec = _head(ts, inputs, wt.fmt, wt.storage_bytes, v, [float(v["at"][0]), float(v["at"][1])])
    rec.update({
        "verification": verification_block(
            v, wt.floor, quality_max_error=v["quality_max_error"],
            dome_status={k: v[k] for k in (
                "inside_flagged_outside", "inside_flagged_max_depth", "outside_points",
                "outside_missed", "outside_missed_max_depth")}),
        "method": {
            "kind": "wet_steam",
            "combine": wt.combine,
            "phase": "wet",
            "stored_values": wt.stored_values(),
            "out_of_range": wt.policy,
            "goal": ts.goal,
            "tables": [{"role": role, **table_record(t)} for role, t in wt.members.items()],
        },
        "candidates": _clean(wt.candidates),
        "notes": list(wt.notes),
    })
    for m in rec["method"]["tables"]:
        for k in ("description", "candidates", "notes"):
            m.pop(k, None)
    if table.budget is not None:
        rec["sensor_budget"] = table.budget
    return rec


def _clean(rows):
    """Candidate rows as plain JSON values, without timings (the report must not depend on
    how fast the machine was)."""
    out = []
    for r in rows:
        out.append({k: (float(v) if isinstance(v, (np.floating,)) else
                        int(v) if isinstance(v, np.integer) else v) for k, v in r.items()
                    if k != "seconds"})
    return out


def report_json(spec, tables):
    doc = {
        "schema": SCHEMA_VERSION,
        "generator": {"name": "h2olut", "version": __version__,
                      "source_sha256": generator_digest()},
        "spec": {"file": spec.source_name, "sha256": spec.sha256, "name": spec.name,
                 "prefix": spec.prefix},
        "caution": CAUTION,
        "tables": [{"grid": table_record_2d, "wet": table_record_wet,
                    "one": table_record}[table_kind(t)](t) for t in tables],
    }
    return json.dumps(doc, indent=2, sort_keys=False, allow_nan=False) + "\n"


def md_escape(s):
    s = " ".join(str(s).split())
    for ch in "\\`*_[]<>|#":
        s = s.replace(ch, "\\" + ch)
    return s


def report_markdown(spec, tables, plots):
    lines = [f"# h2olut report: {md_escape(spec.name)}", "",
             f"Generated by h2olut {__version__} from `{md_escape(spec.source_name)}` "
             f"(sha256 `{spec.sha256[:16]}…`). Regenerate with "
             f"`{spec.command or 'h2olut build ' + spec.source_name}`.",
             "", f"> {CAUTION}", ""]
    if spec.description:
        lines += [md_escape(spec.description), ""]
    lines += ["| function | quantity | input range | tolerance | verified max error | points | storage | method |",
              "|---|---|---|---|---|---|---|---|"]
    for t in tables:
        if table_kind(t) == "wet":
            from .emit.wet import wet_summary
            g = wet_summary(t)
            lines.append(f"| `{t.spec.function}` | {md_escape(t.spec.quantity)} [{md_escape(g['output_unit'])}] | "
                         f"{md_escape(g['domain'])} | {md_escape(g['tolerance'])} | {md_escape(g['max_error'])} | "
                         f"{g['points']} | {md_escape(g['storage'])} | wet steam from saturation "
                         f"tables |")
            continue
        if _is_two(t):
            from .emit.grid2d import grid_summary
            g = grid_summary(t.gt)
            lines.append(f"| `{t.spec.function}` | {md_escape(t.spec.quantity)} [{md_escape(g['output_unit'])}] | "
                         f"{md_escape(g['domain'])} | {md_escape(g['tolerance'])} | {md_escape(g['max_error'])} | "
                         f"{g['points']} | {md_escape(g['storage'])} | {md_escape(g['method'])} |")
            continue
        s = summary(t)
        lines.append(f"| `{s['function']}` | {md_escape(s['quantity'])} [{md_escape(s['output_unit'])}] | "
                     f"{md_escape(s['range'])} | {md_escape(s['tolerance'])} | {md_escape(s['max_error'])} | "
                     f"{s['points']} | {s['storage']} | {md_escape(s['method'])} |")
    lines += ["", "Every error figure is the largest of the sampled verification points, measured "
              "on the emulated target arithmetic against the IF97 core. It is a measurement, not "
              "a proof of a bound.", ""]
    for t in tables:
        if table_kind(t) == "wet":
            lines += _markdown_wet(t, plots.get(t.name))
            continue
        if _is_two(t):
            lines += _markdown_2d(t, plots.get(t.name))
            continue
        s = summary(t)
        v = t.verification
        lines += [f"## `{s['function']}`: {md_escape(s['quantity'])}", ""]
        if s["description"]:
            lines += [md_escape(s["description"]), ""]
        lines += [
            f"- input: {md_escape(s['input'])} in {md_escape(s['input_unit'])}, {md_escape(s['range'])}",
            f"- output: {md_escape(s['quantity'])} in {md_escape(s['output_unit'])}, {s['arithmetic']}",
            f"- tolerance: {md_escape(s['tolerance'])}",
            f"- verified: {md_escape(s['verified'])}",
            f"- with fused multiply-add (emulated): {md_escape(s['fused']) if s['fused'] else 'not modelled for this format'}",
            f"- format floor (input and output rounding alone): {t.floor:.3g}"
            f"{' ' + md_escape(s['output_unit']) if t.spec.tol_kind == 'abs' else ' (relative)'}",
            f"- method: {md_escape(s['method'])}; storage {s['storage']}",
            f"- coefficients: {md_escape(s['coefficients'])}",
            f"- outside the range: {md_escape(s['policy'])}",
            f"- points: {v['counts']['directed']} directed (ends, breakpoints and their float "
            f"neighbours, per-segment worst), {v['counts']['random']} seeded random",
            f"- largest step at a breakpoint beyond the core's own: {v['max_breakpoint_step']:.3g}",
        ]
        if t.monotone:
            word = "increasing" if t.monotone > 0 else "decreasing"
            lines.append(f"- the property is {word} over the range; order reversals found among "
                         f"the sorted verification points: {v.get('monotone_reversals')}")
        for n in t.notes:
            lines.append(f"- note: {md_escape(n)}")
        if t.budget is not None:
            b = t.budget
            k, u = (100.0, "%") if b["kind"] == "rel" else (1.0, t.spec.output_unit)
            verdict = ("FLAGGED: the table's error is not small against the sensor's"
                       if b["flag"] else "the table's error is small against the sensor's")
            lines += [
                f"- sensor: {md_escape(b['sensor'])}; it alone causes an output uncertainty of "
                f"{b['output_uncertainty_min'] * k:.3g} to {b['output_uncertainty_max'] * k:.3g} "
                f"{md_escape(u)} across the range (slope of the core times the sensor's uncertainty)",
                f"- table error / sensor-caused uncertainty: at most {b['ratio_max']:.3g} "
                f"(at {b['ratio_max_at']:.6g} {md_escape(t.spec.inputs[0].unit)}); {verdict} "
                f"(rule: {md_escape(b['rule'])})",
            ]
        lines += ["", "Candidates tried:", "",
                  "| layout | degree | met | segments | storage bytes | est. operations |",
                  "|---|---|---|---|---|---|"]
        for c in t.candidates:
            mark = " (chosen)" if c.get("chosen") else ""
            met = "yes" if c["met"] else ("no: " + c.get("why", ""))
            if c.get("full_verification"):
                met += f" (passed over: {c['full_verification']} on the full verification)"
            lines.append(f"| {c['layout']}{mark} | {c['degree']} | {md_escape(met)} | "
                         f"{c.get('segments', '')} | {c.get('storage_bytes', '')} | "
                         f"{c.get('estimated_ops', '')} |")
        if t.name in plots:
            lines += ["", f"![error of {s['function']}]({plots[t.name]})"]
        lines.append("")
    return "\n".join(lines)


def _two_input_head(t, g, what, fmt):
    """Heading, description and the domain-to-FMA lines of a two-input table's section."""
    lines = [f"## `{t.spec.function}`: {md_escape(g['quantity'])}{what} from pressure and "
             f"{md_escape(g['second'])}", ""]
    if t.spec.description:
        lines += [md_escape(t.spec.description), ""]
    fused = md_escape(g['fused']) if g['fused'] else 'not modelled for this format'
    return lines + [
        f"- domain: {md_escape(g['domain'])}",
        f"- output: {md_escape(g['quantity'])} in {md_escape(g['output_unit'])}, {fmt}",
        f"- tolerance: {md_escape(g['tolerance'])}",
        f"- verified: {md_escape(g['verified'])}",
        f"- with fused multiply-add (emulated): {fused}",
    ]


def _markdown_2d(t, plot):
    from .emit.grid2d import grid_summary
    g = grid_summary(t.gt)
    v = t.gt.verification
    lines = _two_input_head(t, g, "", t.gt.grid.fmt) + [
        f"- method: {md_escape(g['method'])}; second coordinate: {md_escape(g['coordinate'])}",
        f"- storage: {md_escape(g['storage'])}",
        f"- outside the range: {md_escape(g['policy'])}; {md_escape(g['wrong_side'])}",
        f"- points: {md_escape(', '.join(f'{k} {n}' for k, n in v['counts'].items()))}",
    ]
    for n in t.gt.notes:
        lines.append(f"- note: {md_escape(n)}")
    lines += _budget_lines_2d(t, g["output_unit"])
    lines += ["", "Candidates tried:", "",
              "| interpolation | axes | coordinate | met | nodes | storage bytes | est. operations | max error |",
              "|---|---|---|---|---|---|---|---|"]
    for c in t.gt.candidates:
        mark = " (chosen)" if c.get("chosen") else ""
        met = "yes" if c["met"] else "no: " + str(c.get("why", ""))
        nodes = f"{c['nx']} x {c['ny']}" if c.get("nx") else ""
        err = c.get("max_error")
        lines.append(f"| {c['method']}{mark} | {c['x_layout']}/{c['y_layout']} | {c['coord']} | "
                     f"{md_escape(met)} | {nodes} | {c.get('storage_bytes', '')} | "
                     f"{c.get('estimated_ops', '')} | {'' if err is None else f'{err:.3g}'} |")
    if plot:
        lines += ["", f"![error of {t.spec.function}]({plot})"]
    lines.append("")
    return lines


def _budget_lines_2d(t, unit):
    """The sensor budget of a two-input table as report lines (none without sensors)."""
    b = t.budget
    if b is None:
        return []
    k, u = (100.0, "%") if b["kind"] == "rel" else (1.0, "" if unit in ("1", "") else unit)
    u = f" {md_escape(u)}" if u else ""
    each = ", ".join(f"{md_escape(n.replace('_', ' '))} up to {v * k:.3g}{u}"
                     for n, v in b["from_each_input_max"].items())
    verdict = ("FLAGGED: the table's error is not small against the sensors'" if b["flag"]
               else "the table's error is small against the sensors'")
    at = b["ratio_max_at"]
    return [
        f"- sensors: {md_escape(b['sensor'])}; together they cause an output uncertainty of "
        f"{b['output_uncertainty_min'] * k:.3g} to {b['output_uncertainty_max'] * k:.3g}"
        f"{u} over {b['points']} points of the domain ({each}; "
        f"{md_escape(b['combination'])})",
        f"- table error / sensor-caused uncertainty: at most {b['ratio_max']:.3g} (at "
        f"{at[0]:.6g}, {at[1]:.6g}); {verdict} (rule: {md_escape(b['rule'])})",
    ]


def _markdown_wet(t, plot):
    from .emit.wet import wet_summary
    g = wet_summary(t)
    v = t.verification
    lines = _two_input_head(t, g, " of wet steam", t.fmt) + [
        f"- method: {md_escape(g['method'])}",
        f"- storage: {md_escape(g['storage'])}",
        f"- outside: {md_escape(g['policy'])}",
        f"- dome status: {md_escape(g['dome'])}",
        f"- points: {md_escape(', '.join(f'{k} {n}' for k, n in v['counts'].items()))}; "
        f"{v['outside_points']} more outside the dome for the status",
    ]
    for n in t.notes:
        lines.append(f"- note: {md_escape(n)}")
    lines += _budget_lines_2d(t, g["output_unit"])
    lines += ["", "Saturation tables inside it:", "",
              "| role | quantity | tolerance | verified | segments | degree | layout | bytes |",
              "|---|---|---|---|---|---|---|---|"]
    for role, m in t.members.items():
        s = summary(m)
        lines.append(f"| {role} | {md_escape(s['quantity'])} [{md_escape(s['output_unit'])}] | "
                     f"{md_escape(s['tolerance'])} | {md_escape(s['max_error'])} | {m.piecewise.nseg} | "
                     f"{m.piecewise.degree} | {m.piecewise.layout} | {m.piecewise.storage_bytes} |")
    lines += ["", "Builds tried (each tightens the saturation tables when the whole function "
              "missed):", "", "| try | storage bytes | est. operations | max error | met |",
              "|---|---|---|---|---|"]
    for c in t.candidates:
        err = c.get("max_error", c["quick_max_error"])
        lines.append(f"| {c['attempt']}{' (chosen)' if c.get('chosen') else ''} | "
                     f"{c['storage_bytes']} | {c['estimated_ops']} | {err:.3g} | "
                     f"{'yes' if c['met'] else 'no'} |")
    if plot:
        lines += ["", f"![error of {t.spec.function}]({plot})"]
    lines.append("")
    return lines


def error_map_wet(table):
    """PNG bytes: a wet-steam table's error over the dome (heat map in tolerance units) in
    (pressure, second input), with the saturated-liquid and saturated-vapour lines drawn."""
    import matplotlib
    matplotlib.use("Agg")
    from matplotlib.figure import Figure
    from .wet import _dome, reference

    ts, wt = table.spec, table
    pin, ain = ts.inputs
    lo, hi = float(wt.p_lo), float(wt.p_hi)
    logp = lo > 0 and hi / lo > 20
    P1 = np.geomspace(lo, hi, 241) if logp else np.linspace(lo, hi, 241)
    al, av = _dome(ts, P1)
    A1 = np.linspace(float(al.min()), float(av.max()), 241)
    P, A = np.meshgrid(P1, A1, indexing="ij")
    _, truth = reference(ts, P.ravel(), A.ravel())
    inside = np.isfinite(truth)
    E = np.full(P.size, np.nan)
    sc = np.abs(truth[inside]) if ts.tol_kind == "rel" else 1.0
    E[inside] = (wt(P.ravel()[inside], A.ravel()[inside]).astype(np.float64)
                 - truth[inside]) / sc / ts.tol_value
    E = E.reshape(P.shape)
    fig = Figure(figsize=(8, 4.2), dpi=100)
    ax = fig.add_subplot(1, 1, 1)
    m = ax.pcolormesh(P, A, E, shading="auto", cmap="coolwarm", vmin=-1, vmax=1)
    fig.colorbar(m, ax=ax, label="error / tolerance")
    ax.plot(P1, al, color="k", lw=1.2, label="saturated liquid")
    ax.plot(P1, av, color="k", lw=1.2, ls="--", label="saturated vapour")
    if logp:
        ax.set_xscale("log")
    ax.set_xlim(lo, hi)
    ax.set_xlabel(f"pressure [{pin.unit}]")
    ax.set_ylabel(f"{ain.quantity.replace('_', ' ')} [{ain.unit}]")
    ax.set_title(f"{ts.function}: wet steam, {len(wt.members)} saturation tables, {wt.fmt}",
                 fontsize=9)
    ax.legend(loc="lower right", fontsize=7)
    fig.subplots_adjust(left=0.1, right=0.98, top=0.9, bottom=0.13)
    buf = io.BytesIO()
    fig.savefig(buf, format="png", metadata={"Software": None})
    return buf.getvalue()


def error_map(table):
    """PNG bytes: the two-input table's error over its domain (a heat map in tolerance units),
    with the saturation line and the grid's pressure lines drawn."""
    import matplotlib
    matplotlib.use("Agg")
    from matplotlib.figure import Figure

    gt = table.gt
    dom, g = gt.domain, gt.grid
    P1 = np.geomspace(dom.p_lo, dom.p_hi, 241) if dom.p_hi / dom.p_lo > 20 else \
        np.linspace(dom.p_lo, dom.p_hi, 241)
    near, far = dom.limits(P1)
    a, b = np.minimum(near, far), np.maximum(near, far)
    vlo, vhi = float(a.min()), float(b.max())
    if dom.side:
        vlo = min(vlo, float(np.min(dom.sat(P1))))
        vhi = max(vhi, float(np.max(dom.sat(P1))))
    V1 = np.linspace(vlo, vhi, 241)
    P, V = np.meshgrid(P1, V1, indexing="ij")
    inside = (V >= a[:, None]) & (V <= b[:, None])
    E = np.full(P.shape, np.nan)
    pi, vi = P[inside], V[inside]
    truth = dom.core(pi, vi)
    sc = np.abs(truth) if gt.tol_kind == "rel" else 1.0
    E[inside] = (g(pi, vi).astype(np.float64) - truth) / sc / gt.tol
    fig = Figure(figsize=(8, 4.2), dpi=100)
    ax = fig.add_subplot(1, 1, 1)
    m = ax.pcolormesh(P, V, E, shading="auto", cmap="coolwarm", vmin=-1, vmax=1)
    fig.colorbar(m, ax=ax, label="error / tolerance")
    if dom.side:
        ax.plot(P1, dom.sat(P1), color="k", lw=1.2, label="saturation")
    for pl in np.asarray(g.x.lines, dtype=np.float64):
        ax.axvline(pl, color="0.6", lw=0.4, zorder=0)
    if dom.p_hi / dom.p_lo > 20:
        ax.set_xscale("log")
    ax.set_xlim(dom.p_lo, dom.p_hi)
    ax.set_xlabel(f"pressure [{dom.p_unit}]")
    ax.set_ylabel(f"{table.spec.inputs[1].quantity.replace('_', ' ')} [{dom.v_unit}]")
    ax.set_title(f"{table.spec.function}: {g.method}, {g.nx} x {g.ny} nodes, {g.fmt} "
                 f"(pressure lines grey)", fontsize=9)
    if dom.side:
        ax.legend(loc="upper left", fontsize=7)
    fig.subplots_adjust(left=0.1, right=0.98, top=0.9, bottom=0.13)
    buf = io.BytesIO()
    fig.savefig(buf, format="png", metadata={"Software": None})
    return buf.getvalue()


def error_plot(table, f, scale):
    """PNG bytes: signed error across the range, tolerance band, breakpoints marked."""
    import matplotlib
    matplotlib.use("Agg")
    from matplotlib.figure import Figure

    ts = table.spec
    pw = table.piecewise
    lo, hi = float(pw.lo), float(pw.hi)
    logx = lo > 0 and hi / lo > 20
    x = np.geomspace(lo, hi, 2001) if logx else np.linspace(lo, hi, 2001)
    fx = f(x)
    e = (pw(x).astype(np.float64) - fx) / scale(fx)
    tol = ts.tol_value
    k = 100.0 if ts.tol_kind == "rel" else 1.0
    unit = "%" if ts.tol_kind == "rel" else ts.output_unit
    fig = Figure(figsize=(8, 3.6), dpi=100)
    ax = fig.add_subplot(1, 1, 1)
    ax.plot(x, e * k, lw=0.6, color="#1f4e79", label="error of the emitted code")
    ax.axhline(tol * k, color="#b22222", lw=1.0, ls="--", label="tolerance")
    ax.axhline(-tol * k, color="#b22222", lw=1.0, ls="--")
    if ts.sensor is not None:
        from .sensor import slope
        uy = np.abs(slope(ts, x)) * ts.sensor.uncertainty(x)
        if ts.tol_kind == "rel":
            uy = uy / np.abs(fx)
        ax.fill_between(x, -uy * k, uy * k, color="#f2c14e", alpha=0.35, lw=0,
                        label="caused by the sensor alone")
    for b in pw.breakpoints()[1:-1]:
        ax.axvline(b, color="0.75", lw=0.5, zorder=0)
    lim = 1.4 * max(tol, float(np.nanmax(np.abs(e)))) * k
    ax.set_ylim(-lim, lim)  # the sensor band may run past it: the table error stays readable
    ax.set_xlim(lo, hi)
    if logx:
        ax.set_xscale("log")
    ax.set_xlabel(f"{ts.inputs[0].quantity} [{ts.inputs[0].unit}]")
    ax.set_ylabel(f"error [{unit}]")
    if pw.layout == "closed_form":
        ax.set_title(f"{ts.function}: {pw.fmt}, IF97 saturation-line equation", fontsize=9)
    else:
        ax.set_title(f"{ts.function}: {pw.fmt}, {pw.nseg} segments (grey lines), "
                     f"degree {pw.degree}", fontsize=9)
    ax.legend(loc="upper right", fontsize=7)
    fig.subplots_adjust(left=0.1, right=0.98, top=0.9, bottom=0.15)
    buf = io.BytesIO()
    fig.savefig(buf, format="png", metadata={"Software": None})
    return buf.getvalue()
