"""The error budget: what the measurement feeding a table costs, beside the table's own error.

A sensor is described in the table's input unit as

    u(x) = fixed + of_reading * |x| + of_span * (span_max - span_min)

which covers the usual datasheet forms: a pressure transmitter of +-0.1 % of a 0-16 bar span is
``{ of_span = 0.001, span = [0, 16] }``; a temperature sensor of +-(0.15 + 0.002 |t|) degC is
``{ fixed = 0.15, of_reading = 0.002 }`` with the input in degC.

The output uncertainty that the sensor alone causes is |df/dx| * u(x), with the slope of the
core (analytic for saturation temperature and pressure, a five-point central difference
otherwise).

Rule used to flag a table: the table's own error should stay below a quarter of the
sensor-caused output uncertainty everywhere in the range (a 4:1 ratio; common practice, no
source).

For a two-input table (a grid or wet steam) each input may have its sensor,
``sensor = { pressure = {...}, temperature = {...} }``; the sensors are taken as independent and
their contributions are combined as a root sum of squares, u_y = sqrt((df/dp u_p)^2 +
(df/dv u_v)^2) (the law of propagation of uncertainty for uncorrelated inputs, JCGM 100:2008
(GUM) eq. 10, equation number from memory). The partial derivatives are one-sided
second-order differences of the core pointing away from the saturation line, so they never
reach into the other phase.

Offers ``Sensor``, ``parse_sensor(d, where)``, ``parse_sensors(d, where, inputs)``,
``slope(ts, x)``, ``slope_fd(f, lo, hi, x)``, ``compare(...)`` (the budget record),
``budget(table, f, x)`` for generated one-input tables, ``budget_2d(table)`` for two-input
ones, ``partials(f, P, V, ...)``.
"""

from dataclasses import dataclass

import numpy as np

from .fit.grid2d import away_from_saturation, partials  # noqa: F401  (partials: offered here)

#: the largest table-error / sensor-uncertainty ratio that is not flagged (common practice)
RATIO_LIMIT = 0.25

_KEYS = {"fixed", "of_reading", "of_span", "span", "label"}


class SensorError(ValueError):
    pass


@dataclass(frozen=True)
class Sensor:
    fixed: float = 0.0
    of_reading: float = 0.0
    of_span: float = 0.0
    span: tuple = None
    label: str = ""

    def uncertainty(self, x):
        """u(x) in the input unit."""
        x = np.asarray(x, dtype=np.float64)
        span = 0.0 if self.span is None else self.span[1] - self.span[0]
        return self.fixed + self.of_reading * np.abs(x) + self.of_span * span

    def describe(self, unit):
        parts = []
        if self.fixed:
            parts.append(f"{self.fixed:g} {unit}")
        if self.of_reading:
            parts.append(f"{self.of_reading * 100:g} % of reading")
        if self.of_span:
            parts.append(f"{self.of_span * 100:g} % of the {self.span[0]:g} to {self.span[1]:g} "
                         f"{unit} span")
        text = "+-(" + " + ".join(parts) + ")"
        return f"{self.label}: {text}" if self.label else text


def parse_sensor(d, where, key="sensor"):
    """Check a spec's ``sensor`` table; ``where`` prefixes messages ("file: table 'x': "),
    ``key`` is the key's name in them."""
    if not isinstance(d, dict):
        raise SensorError(f"{where}key '{key}': must be a table like "
                          "{ fixed = 0.15, of_reading = 0.002 }")
    for k in d:
        if k not in _KEYS:
            raise SensorError(f"{where}key '{key}.{k}': unknown key; allowed: "
                              f"{', '.join(sorted(_KEYS))}")
    vals = {}
    for k in ("fixed", "of_reading", "of_span"):
        v = d.get(k, 0.0)
        if isinstance(v, bool) or not isinstance(v, (int, float)) or not np.isfinite(v) or v < 0:
            raise SensorError(f"{where}key '{key}.{k}': must be a number >= 0, not {v!r}")
        vals[k] = float(v)
    if vals["of_reading"] >= 1 or vals["of_span"] >= 1:
        raise SensorError(f"{where}key '{key}': of_reading and of_span are fractions (0.001 "
                          "for 0.1 %) and must be below 1")
    span = d.get("span")
    if vals["of_span"] and span is None:
        raise SensorError(f"{where}key '{key}.span': of_span needs span = [min, max]")
    if span is not None:
        if (not isinstance(span, list) or len(span) != 2
                or not all(isinstance(s, (int, float)) and not isinstance(s, bool) for s in span)
                or not span[0] < span[1]):
            raise SensorError(f"{where}key '{key}.span': must be [min, max] with min < max, "
                              f"not {span!r}")
        span = (float(span[0]), float(span[1]))
    if not any(vals.values()):
        raise SensorError(f"{where}key '{key}': give at least one of fixed, of_reading, "
                          "of_span (> 0)")
    label = d.get("label", "")
    if not isinstance(label, str):
        raise SensorError(f"{where}key '{key}.label': must be a string")
    return Sensor(span=span, label=label, **vals)


def parse_sensors(d, where, inputs):
    """A two-input table's ``sensor`` table: one sensor per input name (``inputs``), at least
    one of them; returns {input name: Sensor}."""
    if not isinstance(d, dict) or not d or any(not isinstance(v, dict) for v in d.values()):
        raise SensorError(f"{where}key 'sensor': a two-input table takes one sensor per input, "
                          f"like {{ {inputs[0]} = {{ of_span = 0.001, span = [0, 16] }}, "
                          f"{inputs[1]} = {{ fixed = 0.15 }} }}")
    out = {}
    for k, v in d.items():
        if k not in inputs:
            raise SensorError(f"{where}key 'sensor.{k}': not an input of this table; allowed: "
                              f"{', '.join(inputs)}")
        out[k] = parse_sensor(v, where, key=f"sensor.{k}")
    return out


def slope_fd(f, lo, hi, x):
    """df/dx by a five-point central difference of ``f``, kept inside [lo, hi]."""
    x = np.asarray(x, dtype=np.float64)
    h = 1e-6 * (hi - lo)
    xc = np.clip(x, lo + 2 * h, hi - 2 * h)
    return (8 * (f(xc + h) - f(xc - h)) - (f(xc + 2 * h) - f(xc - 2 * h))) / (12 * h)


def slope(ts, x):
    """df/dx of the table's quantity in the user's units (output unit per input unit)."""
    from .if97 import core
    inp = ts.inputs[0]
    x = np.asarray(x, dtype=np.float64)
    si = x * inp.scale + inp.offset
    if ts.quantity == "saturation_temperature":
        dsi = 1.0 / core.dpsat_dT(core.saturation_temperature(si))
        return dsi * inp.scale / ts.out_scale
    if ts.quantity == "saturation_pressure":
        return core.dpsat_dT(si) * inp.scale / ts.out_scale
    from .build import core_function
    return slope_fd(core_function(ts), inp.lo, inp.hi, x)


def compare(sensor, input_unit, x, error, dfdx, fx, kind):
    """The budget record: sensor-caused output uncertainty |df/dx| u(x) beside the table's
    own |error| at the same inputs ``x`` (both relative to |f| when ``kind`` is "rel")."""
    uy = np.abs(dfdx) * sensor.uncertainty(x)
    e = np.abs(error)
    if kind == "rel":
        e = e / np.abs(fx)
        uy = uy / np.abs(fx)
    ratio = e / uy
    i = int(np.argmax(ratio))
    return {"sensor": sensor.describe(input_unit), **_verdict(e, uy, ratio, i, kind),
            "ratio_max_at": float(x[i])}


def _verdict(e, uy, ratio, i, kind):
    """The keys every budget record shares: the spread of the sensor-caused uncertainty, the
    table's error, their largest ratio and the 4:1 flag."""
    return {
        "output_uncertainty_min": float(uy.min()),
        "output_uncertainty_max": float(uy.max()),
        "table_error_max": float(e.max()),
        "ratio_max": float(ratio[i]),
        "ratio_limit": RATIO_LIMIT,
        "flag": bool(ratio[i] > RATIO_LIMIT),
        "rule": "table error below 1/4 of the sensor-caused output uncertainty everywhere "
                "(a 4:1 ratio; common practice, no source)",
        "points": int(np.size(e)),
        "kind": kind,
    }


def budget(table, f, x=None):
    """Sensor-caused output uncertainty beside a generated table's own error, across the range."""
    ts = table.spec
    pw = table.piecewise
    if x is None:
        x = np.linspace(float(pw.lo), float(pw.hi), 2001)
    fx = f(x)
    err = pw(x).astype(np.float64) - fx
    return compare(ts.sensor, ts.inputs[0].unit, x, err, slope(ts, x), fx, ts.tol_kind)


def compare_2d(sensors, units, names, P, V, error, fp, fv, fx, kind):
    """The budget record of a two-input table: root-sum-square of the sensors'
    contributions beside the table's own |error| at the same points."""
    zero = np.zeros(np.shape(P))
    up = np.abs(fp) * sensors[names[0]].uncertainty(P) if names[0] in sensors else zero
    uv = np.abs(fv) * sensors[names[1]].uncertainty(V) if names[1] in sensors else zero
    uy = np.sqrt(up * up + uv * uv)
    e = np.abs(error)
    if kind == "rel":
        e, uy, up, uv = e / np.abs(fx), uy / np.abs(fx), up / np.abs(fx), uv / np.abs(fx)
    ratio = e / uy
    i = int(np.argmax(ratio))
    text = "; ".join(f"{n.replace('_', ' ')} {sensors[n].describe(u)}"
                     for n, u in zip(names, units) if n in sensors)
    return {"sensor": text, **_verdict(e, uy, ratio, i, kind),
            "ratio_max_at": [float(P[i]), float(V[i])],
            "from_each_input_max": {n: float(c.max()) for n, c in zip(names, (up, uv))
                                    if n in sensors},
            "combination": "root sum of squares of independent sensors (JCGM 100:2008 eq. 10, "
                           "equation number from memory)"}


#: points of the domain where a two-input budget is evaluated
BUDGET_POINTS_2D = 20_000


def budget_2d(table, n=BUDGET_POINTS_2D, seed=20261202):
    """Sensor-caused output uncertainty beside a two-input table's own error (a grid or wet
    steam), at ``n`` seeded points of its domain."""
    ts = table.spec
    rng = np.random.default_rng(seed)
    names = [i.quantity for i in ts.inputs]
    if getattr(table, "gt", None) is not None:
        dom, g = table.gt.domain, table.gt.grid
        P = rng.uniform(dom.p_lo, dom.p_hi, n)
        a, b = dom.limits(P)
        V = a + rng.uniform(0.0, 1.0, n) * (b - a)
        f, y = dom.core, g(P, V)
        hp = 1e-7 * (dom.p_hi - dom.p_lo)
        hv = 1e-7 * float(np.max(np.abs(b - a)))
        p_dir, v_dir = away_from_saturation(dom, P, V, hp)
        units = (dom.p_unit, dom.v_unit)
    else:
        from .wet import _dome, reference
        P = rng.uniform(table.p_lo, table.p_hi, n)
        al, av = _dome(ts, P)
        V = al + rng.uniform(1e-3, 1.0 - 1e-3, n) * (av - al)
        y = table(P, V)

        def f(p, v):
            return reference(ts, p, v)[1]
        p_dir = v_dir = 0
        hp = 1e-7 * (table.p_hi - table.p_lo)
        hv = 1e-8 * float(np.max(av - al))
        units = (ts.inputs[0].unit, ts.inputs[1].unit)
    fx = f(P, V)
    fp, fv = partials(f, P, V, p_dir, v_dir, hp, hv)
    err = np.asarray(y, dtype=np.float64) - fx
    return compare_2d(ts.sensor, units, names, P, V, err, fp, fv, fx, ts.tol_kind)
