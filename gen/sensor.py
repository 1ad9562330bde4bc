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

Offers ``Sensor``, ``parse_sensor(d, where)``, ``slope(ts, x)``, ``slope_fd(f, lo, hi, x)``,
``compare(...)`` (the budget record), ``budget(table, f, x)`` for generated tables.
"""

from dataclasses import dataclass

import numpy as np

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


def parse_sensor(d, where):
    """Check a spec's ``sensor`` table; ``where`` prefixes messages ("file: table 'x': ")."""
    if not isinstance(d, dict):
        raise SensorError(f"{where}key 'sensor': must be a table like "
                          "{ fixed = 0.15, of_reading = 0.002 }")
    for k in d:
        if k not in _KEYS:
            raise SensorError(f"{where}key 'sensor.{k}': unknown key; allowed: "
                              f"{', '.join(sorted(_KEYS))}")
    vals = {}
    for k in ("fixed", "of_reading", "of_span"):
        v = d.get(k, 0.0)
        if isinstance(v, bool) or not isinstance(v, (int, float)) or not np.isfinite(v) or v < 0:
            raise SensorError(f"{where}key 'sensor.{k}': must be a number >= 0, not {v!r}")
        vals[k] = float(v)
    if vals["of_reading"] >= 1 or vals["of_span"] >= 1:
        raise SensorError(f"{where}key 'sensor': of_reading and of_span are fractions (0.001 "
                          "for 0.1 %) and must be below 1")
    span = d.get("span")
    if vals["of_span"] and span is None:
        raise SensorError(f"{where}key 'sensor.span': of_span needs span = [min, max]")
    if span is not None:
        if (not isinstance(span, list) or len(span) != 2
                or not all(isinstance(s, (int, float)) and not isinstance(s, bool) for s in span)
                or not span[0] < span[1]):
            raise SensorError(f"{where}key 'sensor.span': must be [min, max] with min < max, "
                              f"not {span!r}")
        span = (float(span[0]), float(span[1]))
    if not any(vals.values()):
        raise SensorError(f"{where}key 'sensor': give at least one of fixed, of_reading, "
                          "of_span (> 0)")
    label = d.get("label", "")
    if not isinstance(label, str):
        raise SensorError(f"{where}key 'sensor.label': must be a string")
    return Sensor(span=span, label=label, **vals)


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
    return {
        "sensor": sensor.describe(input_unit),
        "output_uncertainty_min": float(uy.min()),
        "output_uncertainty_max": float(uy.max()),
        "table_error_max": float(e.max()),
        "ratio_max": float(ratio[i]),
        "ratio_max_at": float(x[i]),
        "ratio_limit": RATIO_LIMIT,
        "flag": bool(ratio[i] > RATIO_LIMIT),
        "rule": "table error below 1/4 of the sensor-caused output uncertainty everywhere "
                "(a 4:1 ratio; common practice, no source)",
        "points": int(np.size(x)),
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
