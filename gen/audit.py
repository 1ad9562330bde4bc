"""Audit of a lookup table that is already shipped: its true error against the core, its
defects named by row, and what h2olut would generate for the same job.

A table comes as CSV. One input: two columns, input then output, one row per breakpoint, a
header row allowed. Two inputs: a grid whose first row holds the second input's values (its
first cell is a label or empty) and whose first column holds the first input's values. Lines
that are blank or start with ``#`` are skipped. Rows and columns in messages are the file's
line number and the 1-based column, as ``FILE:ROW:COLUMN: ...``.

How the firmware is modelled. ``x[i], y[i]`` are the stored rows, ``i`` the largest index with
``x[i] <= x`` (the last interval at the top end), the input clamped to ``[x[0], x[n-1]]``
unless extrapolation is asked for:

    step           y = y[i]                       (y[n-1] at x = x[n-1])
    nearest        y = y[i] if (x - x[i]) < (x[i+1] - x) else y[i+1]
    linear         t = (x - x[i]) / (x[i+1] - x[i]);   y = y[i] + t * (y[i+1] - y[i])
    linear-in-log  the table stores u[i] = ln x[i] in place of x[i] (computed in float64 and
                   rounded once); at run time u = ln x (modelled correctly rounded; a good libm
                   is within one ULP), the interval is found in u, then linear in u
    cubic-spline   natural cubic spline: the second derivatives m[i] are solved in float64 from
                   the stored rows (m[0] = m[n-1] = 0), rounded once and stored as a third
                   column, as table generators precompute them; at run time
                       h = x[i+1] - x[i];  a = (x[i+1] - x) / h;  b = (x - x[i]) / h
                       y = (a*y[i] + b*y[i+1]) + ((((a*a)*a - a)*m[i] + ((b*b)*b - b)*m[i+1]) * (h*h)) / 6
    bilinear       t, s the linear weights along the first and second input:
                       y0 = z[i,j] + t*(z[i+1,j] - z[i,j]);  y1 = z[i,j+1] + t*(z[i+1,j+1] - z[i,j+1])
                       y = y0 + s*(y1 - y0)

Floating point (float32, float64): every operation in the target format in the order written,
no fused multiply-add. For float32 a second measurement contracts each ``a*b + c`` into one
fused operation, as Cortex-M4F or ``-march=native`` builds do. Decimal cells round once to the
target format, as a C compiler rounds a literal.

Integers (int16, uint16, int32, uint32): the cells hold raw values, value = raw * scale
(``scale_in`` per input, ``scale_out`` for the output). The input reaches the firmware as a
raw integer X (a real input is rounded to the nearest raw value), and

    step      Y = y[i]
    nearest   Y = y[i] if 2*(X - x[i]) < (x[i+1] - x[i]) else y[i+1]
    linear    Y = y[i] + div((y[i+1] - y[i]) * (X - x[i]), x[i+1] - x[i])
    bilinear  Y0 = z[i,j] + div((z[i+1,j] - z[i,j]) * (X - x[i]), x[i+1] - x[i]), Y1 likewise
              at j+1, then Y = Y0 + div((Y1 - Y0) * (S - s[j]), s[j+1] - s[j])

with the product formed exactly and ``div`` C99's ``/`` (truncation toward zero), or with
``int_division="nearest"`` rounding half away from zero, ``(n + sign(n)*(d/2)) / d``. A
product that does not fit in 32 bits is reported as a defect: firmware that multiplies in
``int`` overflows there. The error is measured at raw inputs, every one of them when there are
at most ``verify_points``; the rounding of a real input to a raw one belongs to the sensor and
is stated as a note.

One-input float tables are verified by :func:`gen.verify.verify_table` itself, on the same kinds
of points as generated tables (ends, every row with its float neighbours, the worst point of a
fine grid in each interval, seeded random points). A sampled maximum is a measurement, not a
bound.

Offers
    ``AuditError``                       bad CSV or options; one line, names file, row, column
    ``audit_spec(...)`` -> ``AuditSpec``  checked options
    ``read_table(data, source, spec)``  CSV bytes -> ``Lookup1D`` or ``Grid2D`` (+ row map)
    ``Lookup1D``, ``Grid2D``             stored tables, callable like ``Piecewise1D``
    ``audit_file(path, spec)``, ``audit_bytes(data, source, spec)`` -> ``Audit``
    ``verify_grid(...)``, ``verify_integer(...)``  the 2-D and integer verifications
    ``suggest_replacement(...)``         what h2olut would build for the same range and tolerance
    ``audit_piecewise(table)``           re-verify a table h2olut built (same points, same result)
    ``audit_generated(report_path)``     re-verify h2olut's output from report.json + NAME.py,
                                         running the module's own run-time code
    ``GeneratedFunction``                one function of a generated module, for verify_table
    ``audit_record``, ``audit_report_json``, ``audit_report_markdown``, ``audit_error_plot``,
    ``audit_files(audit)`` -> {file name: bytes}
"""

import csv
import decimal
import hashlib
import importlib.util
import io
import json
import math
import re
from dataclasses import dataclass, field
from fractions import Fraction
from pathlib import Path

import numpy as np

from . import __version__
from . import quantities as Q
from . import units as U
from .build import core_function, error_scale, format_floor, monotone_sign as _monotone
from .emit.common import error_text
from .report import md_escape, verification_block
from .verify import verify_table
from .wet import WetFunction

INTERPOLATIONS = ("step", "nearest", "linear", "linear-in-log", "cubic-spline", "bilinear")
FLOAT_FORMATS = {"float32": np.float32, "float64": np.float64}
#: integer storage types: (smallest raw value, largest raw value, bytes)
INT_FORMATS = {"int16": (-(1 << 15), (1 << 15) - 1, 2), "uint16": (0, (1 << 16) - 1, 2),
               "int32": (-(1 << 31), (1 << 31) - 1, 4), "uint32": (0, (1 << 32) - 1, 4)}
ARITHMETICS = tuple(FLOAT_FORMATS) + tuple(INT_FORMATS)
INT_DIVISIONS = ("truncate", "nearest")
OUT_OF_RANGE = ("clamp", "extrapolate")
DEFAULT_POINTS = 100_000
#: core evaluations spent on the per-cell fine grid of a 2-D audit
FINE_2D = 300_000
INT32_MAX = (1 << 31) - 1
#: the atmosphere a gauge reading is suspected against when no --atmosphere is given
STANDARD_ATMOSPHERE = 101325.0

#: units a wrong row may be written in, per kind (pint spellings)
UNIT_CHOICES = {
    "temperature": ["K", "degC", "degF", "degR"],
    "pressure": ["Pa", "hPa", "kPa", "MPa", "bar", "mbar", "psi", "atm"],
    "density": ["kg/m^3", "g/cm^3", "lb/ft^3"],
    "specific_volume": ["m^3/kg", "L/kg", "ft^3/lb"],
    "specific_energy": ["J/kg", "kJ/kg", "BTU/lb", "kcal/kg"],
    "specific_entropy": ["J/(kg*K)", "kJ/(kg*K)", "BTU/(lb*degR)", "kcal/(kg*K)"],
    "speed": ["m/s", "ft/s", "km/h"],
    "dynamic_viscosity": ["Pa*s", "mPa*s", "uPa*s"],
    "thermal_conductivity": ["W/(m*K)", "mW/(m*K)"],
    "surface_tension": ["N/m", "mN/m", "dyn/cm"],
    "dimensionless": [],
}


class AuditError(ValueError):
    """Bad input to an audit (CSV or options); ``str()`` is the one-line message."""


# ------------------------------------------------------------------------------------------
# options


@dataclass(frozen=True)
class AuditInput:
    quantity: str
    unit: str
    scale: float          # SI = value * scale + offset (gauge reference included)
    offset: float
    atmosphere: float = None


@dataclass(frozen=True)
class AuditSpec:
    """What the firmware does with the table: checked options of an audit."""
    quantity: str
    inputs: tuple                 # of AuditInput, in the table's order
    output_unit: str
    out_scale: float
    out_offset: float
    interpolation: str = "linear"
    arithmetic: str = "float32"
    scale_in: tuple = ()          # integer tables: value = raw * scale, per input
    scale_out: float = None
    int_division: str = "truncate"
    tol_kind: str = None          # "abs", "rel" or None
    tol_value: float = None
    used_min: float = None        # where the firmware uses the table, in the input unit
    used_max: float = None
    out_of_range: str = "clamp"
    verify_points: int = DEFAULT_POINTS
    suggest: bool = True
    command: str = ""             # how to rerun this audit, written into the report

    @property
    def integer(self):
        return self.arithmetic in INT_FORMATS

    @property
    def error_kind(self):
        return self.tol_kind or "abs"

    @property
    def output_kind(self):
        return Q.CATALOGUE[self.quantity].kind


def _fmt(v):
    return f"{v:.6g}"


def audit_spec(quantity, inputs=(), input_units=(), output_unit=None, interpolation="linear",
               arithmetic="float32", scale_in=(), scale_out=None, int_division="truncate",
               tolerance_abs=None, tolerance_rel=None, used_min=None, used_max=None,
               out_of_range="clamp", verify_points=DEFAULT_POINTS, atmosphere=None,
               suggest=True, command=""):
    """Check the options of an audit (named as the command line spells them) into an
    :class:`AuditSpec`; raises :class:`AuditError` with a one-line message."""
    if quantity not in Q.CATALOGUE:
        raise AuditError(f"--quantity: unknown quantity {quantity!r}; known: "
                         f"{', '.join(sorted(Q.CATALOGUE))}")
    q = Q.CATALOGUE[quantity]
    if interpolation not in INTERPOLATIONS:
        raise AuditError(f"--interpolation: must be one of {', '.join(INTERPOLATIONS)}, "
                         f"not {interpolation!r}")
    two = interpolation == "bilinear"
    if two and not any(len(t) == 2 for t in q.inputs):
        raise AuditError(f"--interpolation: bilinear is for two-input grids; {quantity} has "
                         f"one input ({' or '.join(t[0] for t in q.inputs)})")
    if not two and not any(len(t) == 1 for t in q.inputs):
        raise AuditError(f"--interpolation: {quantity} has two inputs; audit it as a grid "
                         f"with --interpolation bilinear")
    inputs = tuple(inputs)
    if not inputs:
        fitting = [t for t in q.inputs if (len(t) == 2) == two]
        if len(fitting) != 1:
            want = " or ".join(" ".join(f"--input {n}" for n in t) for t in q.inputs)
            raise AuditError(f"--input: {quantity} takes {want}; say which")
        inputs = fitting[0]
    if not any(set(inputs) == set(t) and len(inputs) == len(t) for t in q.inputs):
        want = " or ".join("(" + ", ".join(t) + ")" for t in q.inputs)
        raise AuditError(f"--input: {quantity} takes {want}, not ({', '.join(inputs)})")
    if two and len(inputs) != 2:
        raise AuditError(f"--interpolation: bilinear is for two-input grids; {quantity} from "
                         f"{inputs[0]} is a one-input table")
    if not two and len(inputs) != 1:
        raise AuditError(f"--interpolation: {quantity} has two inputs; audit it as a grid "
                         f"with --interpolation bilinear")
    input_units = tuple(input_units)
    if input_units and len(input_units) != len(inputs):
        raise AuditError(f"--input-unit: give one per input ({len(inputs)}), not "
                         f"{len(input_units)}")
    ins = []
    for k, name in enumerate(inputs):
        kind = Q.INPUT_KIND[name]
        unit = input_units[k] if input_units else U.DIMENSIONS[kind]
        try:
            sc, off = U.to_si_map(unit, kind)
        except U.UnitError as e:
            raise AuditError(f"--input-unit: {e}") from None
        atm = None
        if atmosphere is not None and name == "pressure":
            try:
                atm = U.parse_quantity(atmosphere, "pressure")
            except U.UnitError as e:
                raise AuditError(f"--atmosphere: {e}") from None
            if not (50e3 <= atm <= 110e3):
                raise AuditError(f"--atmosphere: must be an atmospheric pressure between 50 "
                                 f"and 110 kPa, not {_fmt(atm)} Pa")
            off += atm
        ins.append(AuditInput(name, unit, sc, off, atm))
    if atmosphere is not None and "pressure" not in inputs:
        raise AuditError("--atmosphere: only a pressure input can be gauge pressure")
    out_unit = output_unit if output_unit is not None else U.DIMENSIONS[q.kind]
    try:
        osc, ooff = U.to_si_map(out_unit, q.kind)
    except U.UnitError as e:
        raise AuditError(f"--output-unit: {e}") from None
    if arithmetic not in ARITHMETICS:
        raise AuditError(f"--arithmetic: must be one of {', '.join(ARITHMETICS)}, "
                         f"not {arithmetic!r}")
    scale_in = tuple(float(s) for s in scale_in)
    if arithmetic in INT_FORMATS:
        if interpolation in ("linear-in-log", "cubic-spline"):
            raise AuditError(f"--interpolation: {interpolation} is not modelled in integer "
                             f"arithmetic; audit it as float32 or float64")
        if len(scale_in) != len(inputs):
            raise AuditError(f"--scale-in: an integer table needs one input scale per input "
                             f"(value = raw * scale), got {len(scale_in)}")
        if scale_out is None:
            raise AuditError("--scale-out: an integer table needs the output scale "
                             "(value = raw * scale)")
        for s, opt in [*((s, "--scale-in") for s in scale_in), (scale_out, "--scale-out")]:
            if not (math.isfinite(s) and s > 0):
                raise AuditError(f"{opt}: must be a positive number, not {_fmt(s)}")
        if int_division not in INT_DIVISIONS:
            raise AuditError(f"--int-division: must be one of {', '.join(INT_DIVISIONS)}")
    elif scale_in or scale_out is not None:
        raise AuditError(f"--scale-in/--scale-out: for integer tables only; {arithmetic} "
                         f"cells hold the values themselves")
    if tolerance_abs is not None and tolerance_rel is not None:
        raise AuditError("--tolerance-abs/--tolerance-rel: give one of them, not both")
    tol_kind = tol_value = None
    if tolerance_abs is not None or tolerance_rel is not None:
        tol_kind = "abs" if tolerance_abs is not None else "rel"
        tol_value = float(tolerance_abs if tolerance_abs is not None else tolerance_rel)
        opt = f"--tolerance-{tol_kind}"
        if not (math.isfinite(tol_value) and tol_value > 0):
            raise AuditError(f"{opt}: must be positive, not {_fmt(tol_value)}")
        if tol_kind == "rel" and tol_value >= 0.5:
            raise AuditError(f"{opt}: is a fraction and must be below 0.5, not {_fmt(tol_value)}")
    if (used_min is not None or used_max is not None) and two:
        raise AuditError("--used-min/--used-max: for one-input tables only")
    if used_min is not None and used_max is not None and not used_min < used_max:
        raise AuditError(f"--used-min: must be below --used-max (got {_fmt(used_min)} >= "
                         f"{_fmt(used_max)})")
    if out_of_range not in OUT_OF_RANGE:
        raise AuditError(f"--out-of-range: must be one of {', '.join(OUT_OF_RANGE)}")
    if isinstance(verify_points, bool) or not (1000 <= int(verify_points) <= 5_000_000):
        raise AuditError(f"--points: must be a whole number from 1000 to 5000000, "
                         f"not {verify_points!r}")
    spec = AuditSpec(quantity=quantity, inputs=tuple(ins), output_unit=out_unit,
                     out_scale=osc, out_offset=ooff, interpolation=interpolation,
                     arithmetic=arithmetic, scale_in=scale_in,
                     scale_out=None if scale_out is None else float(scale_out),
                     int_division=int_division, tol_kind=tol_kind, tol_value=tol_value,
                     used_min=used_min, used_max=used_max, out_of_range=out_of_range,
                     verify_points=int(verify_points), suggest=suggest, command=command)
    for v, opt in ((used_min, "--used-min"), (used_max, "--used-max")):
        if v is not None:
            _check_valid(spec, 0, v, opt)
    return spec


def _valid_range(spec, k):
    inp = spec.inputs[k]
    return Q.input_range(spec.quantity, (inp.quantity,))[inp.quantity]


def _invalid(spec, k, value):
    """Why ``value`` (input unit of input ``k``) leaves the core's validity, or None."""
    inp = spec.inputs[k]
    vlo, vhi = _valid_range(spec, k)
    si = value * inp.scale + inp.offset
    if si < vlo * (1 - 1e-12) or si > vhi * (1 + 1e-12) or not math.isfinite(si):
        what = ("IF97's saturation range (273.15 K up to the critical point)"
                if Q.CATALOGUE[spec.quantity].family == "saturation" else "IF97's validity")
        ulo, uhi = (vlo - inp.offset) / inp.scale, (vhi - inp.offset) / inp.scale
        return (f"{inp.quantity} {_fmt(value)} {inp.unit} is outside {what}; "
                f"valid: {_fmt(ulo)} to {_fmt(uhi)} {inp.unit}")
    return None


def _check_valid(spec, k, value, where):
    why = _invalid(spec, k, value)
    if why:
        raise AuditError(f"{where}: {why}")


# ------------------------------------------------------------------------------------------
# the stored tables and their run-time evaluation


def _fma(a, b, c, ft):
    """a*b + c with one rounding to ``ft`` (the product is exact in float64 for float32)."""
    return (a.astype(np.float64) * b + c).astype(ft)


def _div(n, d, mode):
    """Integer n / d (d > 0) as the firmware divides: truncation toward zero or nearest."""
    s = np.sign(n)
    a = np.abs(n)
    if mode == "nearest":
        return s * ((a + d // 2) // d)
    return s * (a // d)


def natural_spline_m(x, y):
    """Second derivatives of the natural cubic spline through (x, y), float64, m[0] = m[-1] = 0.

    A tridiagonal solve by elimination in a fixed order (no BLAS)."""
    x = np.asarray(x, dtype=np.float64)
    y = np.asarray(y, dtype=np.float64)
    n = x.size
    m = np.zeros(n)
    if n < 3:
        return m
    h = np.diff(x)
    slope = np.diff(y) / h
    diag = 2.0 * (h[:-1] + h[1:])
    rhs = 6.0 * (slope[1:] - slope[:-1])
    sub = h[:-1].copy()        # coefficient of m[i-1] in equation i
    sup = h[1:].copy()         # coefficient of m[i+1]
    k = n - 2
    c = np.zeros(k)
    d = np.zeros(k)
    c[0] = sup[0] / diag[0]
    d[0] = rhs[0] / diag[0]
    for i in range(1, k):
        den = diag[i] - sub[i] * c[i - 1]
        c[i] = sup[i] / den if i < k - 1 else 0.0
        d[i] = (rhs[i] - sub[i] * d[i - 1]) / den
    inner = np.zeros(k)
    inner[-1] = d[-1]
    for i in range(k - 2, -1, -1):
        inner[i] = d[i] - c[i] * inner[i + 1]
    m[1:-1] = inner
    return m


@dataclass(frozen=True, eq=False)
class Lookup1D:
    """A one-input table as the firmware stores it, with the way it interpolates.

    ``x``, ``y``: the stored rows, in the target format for floating point, raw values (int64)
    for integers; ``m`` the stored spline second derivatives, ``u`` the stored ln x of a
    linear-in-log table. Called with inputs in the input unit (float64) it returns what the
    firmware returns, in the output unit; ``breakpoints()`` gives the rows' inputs in the input
    unit. ``lo``, ``hi`` and ``fmt`` make it a drop-in for :func:`gen.verify.verify_table`.
    """
    interpolation: str
    fmt: str
    x: np.ndarray
    y: np.ndarray
    scale_in: float = 1.0
    scale_out: float = 1.0
    int_division: str = "truncate"
    policy: str = "clamp"
    m: np.ndarray = None
    u: np.ndarray = None

    def __repr__(self):
        return (f"Lookup1D(interpolation={self.interpolation!r}, fmt={self.fmt!r}, "
                f"rows={self.rows}, lo={self.lo!r}, hi={self.hi!r})")

    @property
    def rows(self):
        return int(self.x.size)

    @property
    def integer(self):
        return self.fmt in INT_FORMATS

    @property
    def lo(self):
        return float(self.x[0]) * (self.scale_in if self.integer else 1.0)

    @property
    def hi(self):
        return float(self.x[-1]) * (self.scale_in if self.integer else 1.0)

    @property
    def itemsize(self):
        return INT_FORMATS[self.fmt][2] if self.integer else np.dtype(FLOAT_FORMATS[self.fmt]).itemsize

    @property
    def stored_values(self):
        return self.rows * (3 if self.interpolation == "cubic-spline" else 2)

    @property
    def storage_bytes(self):
        return self.stored_values * self.itemsize

    def row_inputs(self):
        """The stored rows' inputs in the input unit, float64."""
        return self.x.astype(np.float64) * (self.scale_in if self.integer else 1.0)

    def breakpoints(self):
        """Inputs where the run-time formula changes: the rows, and for ``nearest`` also the
        midpoints where it switches from one row's value to the next (float64, increasing)."""
        x = self.row_inputs()
        if self.interpolation == "nearest":
            return np.unique(np.concatenate([x, 0.5 * (x[:-1] + x[1:])]))
        return x

    def with_policy(self, policy):
        return Lookup1D(self.interpolation, self.fmt, self.x, self.y, self.scale_in,
                        self.scale_out, self.int_division, policy, self.m, self.u)

    def __call__(self, xin, fused=False):
        xa = np.asarray(xin, dtype=np.float64)
        flat = np.atleast_1d(xa).ravel()
        out = self._integer(flat) if self.integer else self._float(flat, fused)
        return out.reshape(xa.shape) if xa.ndim else out

    def _index(self, grid, key, last):
        return np.clip(np.searchsorted(grid, key, side="right") - 1, 0, last)

    def _float(self, xin, fused):
        ft = FLOAT_FORMATS[self.fmt]
        x, y = self.x, self.y
        n = x.size
        xf = xin.astype(ft)
        nan = np.isnan(xf)
        xs = np.where(nan, x[0], xf)
        if self.policy == "clamp":
            xs = np.minimum(np.maximum(xs, x[0]), x[-1])
        kind = self.interpolation
        if kind == "step":
            out = y[self._index(x, xs, n - 1)]
        elif kind == "nearest":
            i = self._index(x, xs, n - 2)
            d = xs - x[i]
            e = x[i + 1] - xs
            out = np.where(d < e, y[i], y[i + 1])
        elif kind in ("linear", "linear-in-log"):
            if kind == "linear-in-log":
                with np.errstate(invalid="ignore", divide="ignore"):
                    key = np.log(xs.astype(np.float64)).astype(ft)
                g = self.u
            else:
                key, g = xs, x
            i = self._index(g, key, n - 2)
            t = (key - g[i]) / (g[i + 1] - g[i])
            dy = y[i + 1] - y[i]
            out = _fma(t, dy, y[i], ft) if fused else y[i] + t * dy
        elif kind == "cubic-spline":
            m = self.m
            i = self._index(x, xs, n - 2)
            h = x[i + 1] - x[i]
            a = (x[i + 1] - xs) / h
            b = (xs - x[i]) / h
            hh = h * h
            six = ft(6)
            if fused:
                s = _fma(b, y[i + 1], a * y[i], ft)
                ca = _fma(a * a, a, -a, ft)
                cb = _fma(b * b, b, -b, ft)
                uv = _fma(cb, m[i + 1], ca * m[i], ft)
            else:
                s = a * y[i] + b * y[i + 1]
                ca = (a * a) * a - a
                cb = (b * b) * b - b
                uv = ca * m[i] + cb * m[i + 1]
            out = s + (uv * hh) / six
        else:
            raise ValueError(f"no one-input interpolation {kind!r}")
        return np.where(nan, ft(np.nan), out)

    def _integer(self, xin):
        x, y = self.x, self.y
        n = x.size
        X = np.rint(xin / self.scale_in)
        nan = ~np.isfinite(X)
        Xi = np.where(nan, x[0], np.clip(np.where(nan, 0, X), -(1 << 62), 1 << 62)).astype(np.int64)
        if self.policy == "clamp":
            Xi = np.clip(Xi, x[0], x[-1])
        kind = self.interpolation
        if kind == "step":
            Y = y[self._index(x, Xi, n - 1)]
        else:
            i = self._index(x, Xi, n - 2)
            w = x[i + 1] - x[i]
            if kind == "nearest":
                Y = np.where(2 * (Xi - x[i]) < w, y[i], y[i + 1])
            else:
                Y = y[i] + _div((y[i + 1] - y[i]) * (Xi - x[i]), w, self.int_division)
        return np.where(nan, np.nan, Y.astype(np.float64) * self.scale_out)


@dataclass(frozen=True, eq=False)
class Grid2D:
    """A two-input grid as the firmware stores it (bilinear interpolation).

    ``a`` (first input, the CSV's first column), ``b`` (second input, its first row) and
    ``z[i, j]`` at (a[i], b[j]): target format, or raw int64 values with scales.
    """
    fmt: str
    a: np.ndarray
    b: np.ndarray
    z: np.ndarray
    scale_in: tuple = (1.0, 1.0)
    scale_out: float = 1.0
    int_division: str = "truncate"
    policy: str = "clamp"
    interpolation: str = "bilinear"

    def __repr__(self):
        return f"Grid2D(fmt={self.fmt!r}, shape={self.z.shape})"

    @property
    def integer(self):
        return self.fmt in INT_FORMATS

    @property
    def shape(self):
        return tuple(self.z.shape)

    @property
    def rows(self):
        return int(self.z.size)

    @property
    def itemsize(self):
        return INT_FORMATS[self.fmt][2] if self.integer else np.dtype(FLOAT_FORMATS[self.fmt]).itemsize

    @property
    def stored_values(self):
        return int(self.a.size + self.b.size + self.z.size)

    @property
    def storage_bytes(self):
        return self.stored_values * self.itemsize

    def axes(self):
        """Both axes in the input units, float64."""
        if self.integer:
            return (self.a.astype(np.float64) * self.scale_in[0],
                    self.b.astype(np.float64) * self.scale_in[1])
        return self.a.astype(np.float64), self.b.astype(np.float64)

    def box(self):
        A, B = self.axes()
        return (float(A[0]), float(A[-1])), (float(B[0]), float(B[-1]))

    def __call__(self, pin, qin, fused=False):
        pa = np.asarray(pin, dtype=np.float64)
        qa = np.asarray(qin, dtype=np.float64)
        pa, qa = np.broadcast_arrays(pa, qa)
        shape = pa.shape
        p, q = np.atleast_1d(pa).ravel(), np.atleast_1d(qa).ravel()
        out = self._integer(p, q) if self.integer else self._float(p, q, fused)
        return out.reshape(shape) if len(shape) else out

    def _locate(self, g, v):
        return np.clip(np.searchsorted(g, v, side="right") - 1, 0, g.size - 2)

    def _float(self, p, q, fused):
        ft = FLOAT_FORMATS[self.fmt]
        a, b, z = self.a, self.b, self.z
        pf, qf = p.astype(ft), q.astype(ft)
        nan = np.isnan(pf) | np.isnan(qf)
        ps = np.where(nan, a[0], pf)
        qs = np.where(nan, b[0], qf)
        if self.policy == "clamp":
            ps = np.minimum(np.maximum(ps, a[0]), a[-1])
            qs = np.minimum(np.maximum(qs, b[0]), b[-1])
        i = self._locate(a, ps)
        j = self._locate(b, qs)
        t = (ps - a[i]) / (a[i + 1] - a[i])
        s = (qs - b[j]) / (b[j + 1] - b[j])
        z00, z10, z01, z11 = z[i, j], z[i + 1, j], z[i, j + 1], z[i + 1, j + 1]
        if fused:
            y0 = _fma(t, z10 - z00, z00, ft)
            y1 = _fma(t, z11 - z01, z01, ft)
            out = _fma(s, y1 - y0, y0, ft)
        else:
            y0 = z00 + t * (z10 - z00)
            y1 = z01 + t * (z11 - z01)
            out = y0 + s * (y1 - y0)
        return np.where(nan, ft(np.nan), out)

    def _integer(self, p, q):
        a, b, z = self.a, self.b, self.z
        P = np.rint(p / self.scale_in[0])
        S = np.rint(q / self.scale_in[1])
        nan = ~(np.isfinite(P) & np.isfinite(S))
        P = np.where(nan, a[0], np.where(nan, 0, P)).astype(np.int64)
        S = np.where(nan, b[0], np.where(nan, 0, S)).astype(np.int64)
        if self.policy == "clamp":
            P = np.clip(P, a[0], a[-1])
            S = np.clip(S, b[0], b[-1])
        i = self._locate(a, P)
        j = self._locate(b, S)
        wa = a[i + 1] - a[i]
        wb = b[j + 1] - b[j]
        mode = self.int_division
        y0 = z[i, j] + _div((z[i + 1, j] - z[i, j]) * (P - a[i]), wa, mode)
        y1 = z[i, j + 1] + _div((z[i + 1, j + 1] - z[i, j + 1]) * (P - a[i]), wa, mode)
        Y = y0 + _div((y1 - y0) * (S - b[j]), wb, mode)
        return np.where(nan, np.nan, Y.astype(np.float64) * self.scale_out)


# ------------------------------------------------------------------------------------------
# reading the CSV


@dataclass
class Cells:
    """Where each stored value came from: its text, line and column in the file."""
    text: np.ndarray          # object array of cell strings, the stored values' shape
    line: np.ndarray          # line number of each value
    column: np.ndarray        # 1-based column of each value
    header: list = field(default_factory=list)


def _err(source, row, col, msg):
    raise AuditError(f"{source}:{row}:{col}: {msg}")


_INT_TEXT = re.compile(r"^[+-]?\d+$")


def _parse_number(text, integer):
    """float value of a cell, or None when it is not a finite number (of the right kind)."""
    s = text.strip()
    if integer:
        return float(int(s)) if _INT_TEXT.match(s) else None
    try:
        v = float(s)
    except ValueError:
        return None
    if not math.isfinite(v) or s.lower().lstrip("+-") in ("inf", "infinity", "nan"):
        return None
    return v


def _rows(data, source):
    """(line, cells) of every non-blank, non-comment row."""
    if isinstance(data, str):
        text = data
    else:
        try:
            text = bytes(data).decode("utf-8-sig")
        except UnicodeDecodeError:
            raise AuditError(f"{source}:1:1: the table is not UTF-8 text") from None
    out = []
    reader = csv.reader(io.StringIO(text, newline=""))
    try:
        for cells in reader:
            line = reader.line_num
            if not cells or all(not c.strip() for c in cells):
                continue
            if cells[0].lstrip().startswith("#"):
                continue
            out.append((line, [c.strip() for c in cells]))
    except csv.Error as e:
        raise AuditError(f"{source}:{reader.line_num}:1: CSV syntax: {e}") from None
    if not out:
        raise AuditError(f"{source}:1:1: the table is empty")
    return out


def _numbers(source, rows, integer, first_col=0):
    """Check every cell from ``first_col`` on is a number; returns a float64 array."""
    kind = "an integer (raw value)" if integer else "a finite number"
    vals = np.empty((len(rows), len(rows[0][1]) - first_col))
    for r, (line, cells) in enumerate(rows):
        for c in range(first_col, len(cells)):
            s = cells[c]
            if not s:
                _err(source, line, c + 1, "empty cell")
            v = _parse_number(s, integer)
            if v is None:
                _err(source, line, c + 1, f"{s!r} is not {kind}")
            vals[r, c - first_col] = v
    return vals


def _check_ragged(source, rows, want, what):
    for line, cells in rows:
        if len(cells) != want:
            col = min(len(cells), want) + 1
            _err(source, line, col, f"this row has {len(cells)} cells, {what} has {want}")


def _round_decimal(texts, values, fmt):
    """Decimal cells rounded once to ``fmt`` (float64 parsing is already correctly rounded;
    for float32 the one ambiguous case, a float64 value exactly halfway between two float32
    neighbours, is decided on the exact decimal)."""
    if fmt != "float32":
        return values.astype(np.float64)
    v32 = values.astype(np.float32)
    up = np.nextafter(v32, np.float32(np.inf)).astype(np.float64)
    down = np.nextafter(v32, np.float32(-np.inf)).astype(np.float64)
    c = v32.astype(np.float64)
    tie = (values == (c + up) / 2) | (values == (c + down) / 2)
    for k in np.flatnonzero(tie.ravel()):
        exact = Fraction(texts.ravel()[k])
        cand = [np.float32(c.ravel()[k]), np.float32(up.ravel()[k]), np.float32(down.ravel()[k])]
        cand.sort(key=lambda f: (abs(Fraction(float(f)) - exact),
                                 int(np.array(f).view(np.uint32)) & 1))
        v32.ravel()[k] = cand[0]
    return v32


def _alt_units(unit, kind):
    """Other units of ``kind`` a value may have been written in: [(name, scale, offset)]."""
    own = U.to_si_map(unit, kind)
    seen = {own}
    out = []
    for u in UNIT_CHOICES.get(kind, []):
        try:
            m = U.to_si_map(u, kind)
        except U.UnitError:
            continue
        if any(abs(m[0] - s[0]) <= 1e-12 * abs(s[0]) and abs(m[1] - s[1]) <= 1e-9 for s in seen):
            continue
        seen.add(m)
        out.append((u, m[0], m[1]))
    return out


def _unit_hint(spec, k, value, lo, hi):
    """Text saying which unit would put ``value`` strictly between ``lo`` and ``hi`` (input
    unit of input ``k``), or ''."""
    inp = spec.inputs[k]
    kind = Q.INPUT_KIND[inp.quantity]
    for u, sc, off in _alt_units(inp.unit, kind):
        conv = ((value * sc + off) - inp.offset) / inp.scale
        if lo < conv < hi:
            return (f"; it would fit as {_fmt(value)} {u} = {_fmt(conv)} {inp.unit} "
                    f"(written in {u}?)")
    return ""


def _check_axis(source, spec, k, vals, lines, cols, integer, scale):
    """An input axis must increase and lie in the core's validity."""
    x = vals * (scale if integer else 1.0)
    for r in range(1, x.size):
        if x[r] > x[r - 1]:
            continue
        prev = x[r - 2] if r >= 2 else -np.inf
        nxt = x[r + 1] if r + 1 < x.size else np.inf
        # the row above may be the odd one (it sits above both neighbours), or this one
        hint = _unit_hint(spec, k, x[r - 1], prev, x[r]) if x[r] > prev else ""
        if hint:
            _err(source, lines[r - 1], cols[r - 1],
                 f"inputs must increase: {_fmt(x[r - 1])} is above the next row's "
                 f"{_fmt(x[r])}{hint}")
        hint = _unit_hint(spec, k, x[r], x[r - 1], nxt)
        what = (f"repeats the input of the row above ({_fmt(x[r])})" if x[r] == x[r - 1]
                else f"is not above the row above ({_fmt(x[r - 1])})")
        _err(source, lines[r], cols[r], f"inputs must increase: {_fmt(x[r])} {what}{hint}")
    for r in range(x.size):
        why = _invalid(spec, k, float(x[r]))
        if why:
            lo_n = x[r - 1] if r else -np.inf
            hi_n = x[r + 1] if r + 1 < x.size else np.inf
            _err(source, lines[r], cols[r], why + _unit_hint(spec, k, x[r], lo_n, hi_n))


def _int_range(source, spec, vals, lines, cols):
    """Raw values must fit the storage type; ``vals``, ``lines``, ``cols`` are 2-D alike."""
    lo, hi, _ = INT_FORMATS[spec.arithmetic]
    bad = (vals < lo) | (vals > hi)
    if bad.any():
        r, c = np.argwhere(bad)[0]
        _err(source, lines[r, c], cols[r, c],
             f"{int(vals[r, c])} does not fit in {spec.arithmetic}_t ({lo} to {hi})")


_HEADER_UNIT = re.compile(r"[\[(]\s*([^\])]+?)\s*[\])]")


def _header_notes(spec, header):
    """Units written in the header (``p [kPa]``, ``T (degF)``) that disagree with the options."""
    notes = []
    names = [(i.unit, Q.INPUT_KIND[i.quantity]) for i in spec.inputs] + \
        [(spec.output_unit, spec.output_kind)]
    for cell, (unit, kind) in zip(header, names):
        m = _HEADER_UNIT.search(cell)
        if not m:
            continue
        try:
            said = U.to_si_map(m.group(1), kind)
        except U.UnitError:
            continue
        if said != U.to_si_map(unit, kind):
            notes.append(f"the header says {cell!r} but the table is read in {unit}")
    return notes


def read_table(data, source, spec):
    """Parse and check CSV ``data`` for ``spec``; returns (table, Cells).

    Raises :class:`AuditError` naming ``source``, the row and the column of the first problem.
    """
    rows = _rows(data, source)
    integer = spec.integer
    if len(spec.inputs) == 1:
        return _read_1d(source, spec, rows, integer)
    return _read_2d(source, spec, rows, integer)


def _read_1d(source, spec, rows, integer):
    header = []
    first = rows[0][1]
    if all(_parse_number(c, False) is None for c in first):
        header = first
        if len(rows) == 1:
            _err(source, rows[0][0], 1, "the table has a header and no rows")
        rows = rows[1:]
    line0, cells0 = rows[0]
    if len(cells0) != 2:
        _err(source, line0, 3 if len(cells0) > 2 else 2,
             f"a one-input table has 2 columns (input, output); this row has {len(cells0)}")
    _check_ragged(source, rows, 2, "a one-input table")
    if header and len(header) != 2:
        _err(source, 1, 3 if len(header) > 2 else 2,
             f"the header has {len(header)} cells; a one-input table has 2 columns")
    vals = _numbers(source, rows, integer)
    lines = np.array([ln for ln, _ in rows])
    texts = np.array([c for _, c in rows], dtype=object)
    minrows = 2
    if len(rows) < minrows:
        _err(source, lines[0], 1, f"a table needs at least {minrows} rows, this one has "
                                  f"{len(rows)}")
    cols1 = np.ones(len(rows), dtype=int)
    if integer:
        _int_range(source, spec, vals, np.stack([lines, lines], 1),
                   np.stack([cols1, cols1 + 1], 1))
    scale = spec.scale_in[0] if integer else 1.0
    _check_axis(source, spec, 0, vals[:, 0], lines, cols1, integer, scale)
    if spec.interpolation == "linear-in-log" and vals[0, 0] <= 0:
        _err(source, lines[0], 1, "linear-in-log needs positive inputs")
    cells = Cells(text=texts[:, 1], line=lines, column=np.full(len(rows), 2), header=header)
    if integer:
        x = vals[:, 0].astype(np.int64)
        y = vals[:, 1].astype(np.int64)
        table = Lookup1D(spec.interpolation, spec.arithmetic, x, y, spec.scale_in[0],
                         spec.scale_out, spec.int_division, spec.out_of_range)
        return table, cells
    ft = FLOAT_FORMATS[spec.arithmetic]
    x = _round_decimal(texts[:, 0], vals[:, 0], spec.arithmetic).astype(ft)
    y = _round_decimal(texts[:, 1], vals[:, 1], spec.arithmetic).astype(ft)
    bad = np.nonzero(np.diff(x) <= 0)[0]
    if bad.size:
        r = int(bad[0]) + 1
        _err(source, lines[r], 1, f"inputs {texts[r - 1, 0]} and {texts[r, 0]} are the same "
                                  f"number in {spec.arithmetic}")
    m = u = None
    if spec.interpolation == "cubic-spline":
        m = natural_spline_m(x, y).astype(ft)
    if spec.interpolation == "linear-in-log":
        u = np.log(x.astype(np.float64)).astype(ft)
        if np.any(np.diff(u) <= 0):
            r = int(np.nonzero(np.diff(u) <= 0)[0][0]) + 1
            _err(source, lines[r], 1, f"ln of inputs {texts[r - 1, 0]} and {texts[r, 0]} is "
                                      f"the same in {spec.arithmetic}")
    table = Lookup1D(spec.interpolation, spec.arithmetic, x, y, 1.0, 1.0, spec.int_division,
                     spec.out_of_range, m, u)
    return table, cells


def _read_2d(source, spec, rows, integer):
    line0, top = rows[0]
    if len(top) < 3:
        _err(source, line0, len(top) + 1, f"a grid's first row holds the second input's values "
                                          f"after a label cell; this one has {len(top)} cells")
    body = rows[1:]
    if len(body) < 2:
        _err(source, line0, 1, f"a grid needs at least 2 rows of values below its first row, "
                               f"this one has {len(body)}")
    _check_ragged(source, rows, len(top), "the grid's first row")
    bvals = _numbers(source, [(line0, top)], integer, first_col=1)[0]
    vals = _numbers(source, body, integer)
    lines = np.array([ln for ln, _ in body])
    avals = vals[:, 0]
    zvals = vals[:, 1:]
    texts = np.array([c for _, c in body], dtype=object)
    nb = bvals.size
    zlines = np.repeat(lines[:, None], nb, axis=1)
    zcols = np.repeat(np.arange(2, nb + 2)[None, :], lines.size, axis=0)
    if integer:
        _int_range(source, spec, bvals[None, :], np.full((1, nb), line0),
                   np.arange(2, nb + 2)[None, :])
        _int_range(source, spec, vals, np.repeat(lines[:, None], nb + 1, 1),
                   np.repeat(np.arange(1, nb + 2)[None, :], lines.size, 0))
    sa = spec.scale_in[0] if integer else 1.0
    sb = spec.scale_in[1] if integer else 1.0
    _check_axis(source, spec, 0, avals, lines, np.ones(lines.size, dtype=int), integer, sa)
    _check_axis(source, spec, 1, bvals, np.full(nb, line0), np.arange(2, nb + 2), integer, sb)
    if integer:
        grid = Grid2D(spec.arithmetic, avals.astype(np.int64), bvals.astype(np.int64),
                      zvals.astype(np.int64), tuple(spec.scale_in), spec.scale_out,
                      spec.int_division, spec.out_of_range)
    else:
        ft = FLOAT_FORMATS[spec.arithmetic]
        a = _round_decimal(texts[:, 0], avals, spec.arithmetic).astype(ft)
        b = _round_decimal(np.array(top[1:], dtype=object), bvals, spec.arithmetic).astype(ft)
        z = _round_decimal(texts[:, 1:], zvals, spec.arithmetic).astype(ft)
        for g, ln, cl, what in ((a, lines, np.ones(lines.size, int), "inputs"),
                                (b, np.full(nb, line0), np.arange(2, nb + 2), "inputs")):
            bad = np.nonzero(np.diff(g) <= 0)[0]
            if bad.size:
                r = int(bad[0]) + 1
                _err(source, ln[r], cl[r], f"{what} of this cell and the one before are the "
                                           f"same number in {spec.arithmetic}")
        grid = Grid2D(spec.arithmetic, a, b, z, (1.0, 1.0), 1.0, spec.int_division,
                      spec.out_of_range)
    # every node must have a core value (a rectangle whose nodes are valid is valid inside)
    A, B = grid.axes()
    f = core_function(spec)
    fz = f(A[:, None], B[None, :])
    nan = ~np.isfinite(fz)
    if nan.any():
        r, c = np.argwhere(nan)[0]
        n0, n1 = spec.inputs[0], spec.inputs[1]
        _err(source, lines[r], c + 2,
             f"the core has no value at {n0.quantity} {_fmt(A[r])} {n0.unit}, {n1.quantity} "
             f"{_fmt(B[c])} {n1.unit} (outside IF97)")
    cells = Cells(text=texts[:, 1:], line=zlines, column=zcols, header=[top[0]])
    return grid, cells


# ------------------------------------------------------------------------------------------
# verification


def _neighbours(v, fmt, integer, scale=1.0):
    """Each value and its two neighbours in the stored format (raw +-1 for integers), float64
    in the input unit."""
    if integer:
        r = np.asarray(v, dtype=np.float64)
        return np.concatenate([r, r - 1, r + 1]) * scale
    ft = FLOAT_FORMATS[fmt]
    s = np.asarray(v).astype(ft)
    return np.concatenate([s, np.nextafter(s, ft(-np.inf)), np.nextafter(s, ft(np.inf))]
                          ).astype(np.float64)


def _random_axis(rng, lo, hi, m):
    if lo > 0 and hi / lo > 1.5:
        m1 = m // 2
        r = np.concatenate([rng.uniform(lo, hi, m1),
                            np.exp(rng.uniform(np.log(lo), np.log(hi), m - m1))])
        rng.shuffle(r)
    else:
        r = rng.uniform(lo, hi, m)
    return np.clip(r, lo, hi)


def _reversals(xs, ys, monotone, steps=()):
    """Order reversals of ys along sorted xs where the property is monotone (+1 or -1)."""
    if not monotone:
        return None
    order = np.argsort(xs, kind="stable")
    xk = xs[order]
    keep = np.concatenate([[True], np.diff(xk) > 0])
    xk = xk[keep]
    yk = ys[order][keep]
    rev = np.diff(yk) * monotone < 0
    for s in steps:
        rev &= ~((xk[:-1] < s) & (xk[1:] >= s))
    return int(np.sum(rev))


def _result(points, e, counts, seed, e_fused=None):
    ae = np.abs(e)
    i = int(np.argmax(ae))
    res = {"points": int(ae.size), "max_error": float(ae[i]), "at": points[i],
           "signed_error_at_max": float(e[i]), "rms_error": float(np.sqrt(np.mean(e * e))),
           "counts": counts, "seed": int(seed)}
    if e_fused is not None:
        res["max_error_fused"] = float(np.max(np.abs(e_fused)))
    return res


def verify_integer(table, f, scale, n, seed, monotone=0, steps=()):
    """Verify an integer :class:`Lookup1D` at raw inputs: every raw input when there are at
    most ``n``, else the rows and their raw neighbours, every raw input within one step of
    the worst point of a 257-point grid in each interval, and seeded random raw inputs."""
    xr = table.x
    sc = table.scale_in
    total = int(xr[-1] - xr[0] + 1)
    if total <= n:
        X = np.arange(xr[0], xr[-1] + 1, dtype=np.int64)
        counts = {"directed": 0, "random": 0, "segment_worst": 0, "exhaustive": total}
    else:
        g = np.linspace(0.0, 1.0, 257)
        xa, xb = xr[:-1].astype(np.float64), xr[1:].astype(np.float64)
        fine = np.rint(xa[:, None] + (xb - xa)[:, None] * g[None, :])
        xf = fine.ravel() * sc
        ff = f(xf)
        ee = np.abs((table(xf) - ff) / scale(ff)).reshape(fine.shape)
        worst = fine[np.arange(fine.shape[0]), np.argmax(ee, axis=1)]
        # every raw input within one fine-grid step of each interval's worst
        reach = int(np.ceil(np.max(xb - xa) / 256.0))
        around = (worst[:, None] + np.arange(-reach, reach + 1)[None, :]).ravel()
        d = np.concatenate([_neighbours(xr, "", True), around])
        d = np.unique(d[(d >= xr[0]) & (d <= xr[-1])])
        rng = np.random.default_rng(seed)
        m = max(n - d.size, 0)
        r = rng.integers(int(xr[0]), int(xr[-1]) + 1, m)
        X = np.concatenate([d, r]).astype(np.int64)
        counts = {"directed": int(d.size), "random": int(m), "segment_worst": int(worst.size)}
    x = X.astype(np.float64) * sc
    fx = f(x)
    y = table(x)
    res = _result(x, (y - fx) / scale(fx), counts, seed)
    res["at"] = float(res["at"])
    b = xr[1:-1]
    if b.size:
        right = b.astype(np.float64) * sc
        left = (b - 1).astype(np.float64) * sc
        step = np.abs(table(right) - table(left)) - np.abs(f(right) - f(left))
        res["max_breakpoint_step"] = float(np.max(np.maximum(step, 0.0) / scale(f(right))))
    else:
        res["max_breakpoint_step"] = 0.0
    if monotone:
        res["monotone_reversals"] = _reversals(x, y, monotone, steps)
    return res


def verify_grid(grid, f, scale, n, seed):
    """Verify a :class:`Grid2D` on: every node with its neighbours in both inputs (the stored
    format's, raw +-1 for integers), the worst point of a fine grid inside each cell with its
    neighbours, and seeded random points (at least ``n // 2``, half log-uniform in an input
    that spans more than 1.5x). Returns (result dict, per-cell maximum error array)."""
    A, B = grid.axes()
    (alo, ahi), (blo, bhi) = grid.box()
    integer = grid.integer
    fmt = grid.fmt
    sa, sb = grid.scale_in if integer else (1.0, 1.0)
    an = _neighbours(grid.a, fmt, integer, sa)
    bn = _neighbours(grid.b, fmt, integer, sb)
    an = np.unique(an[(an >= alo) & (an <= ahi)])
    bn = np.unique(bn[(bn >= blo) & (bn <= bhi)])
    pa, pb = np.meshgrid(an, bn, indexing="ij")
    pa, pb = pa.ravel(), pb.ravel()
    na, nb = A.size - 1, B.size - 1
    k = int(min(16, max(2, math.isqrt(max(1, FINE_2D // (na * nb))))))
    g = np.linspace(0.0, 1.0, k + 2)[1:-1]
    ga = A[:-1, None] + (A[1:] - A[:-1])[:, None] * g[None, :]           # (na, k)
    gb = B[:-1, None] + (B[1:] - B[:-1])[:, None] * g[None, :]           # (nb, k)
    if integer:
        ga = np.rint(ga / sa) * sa
        gb = np.rint(gb / sb) * sb
    fa = np.broadcast_to(ga[:, None, :, None], (na, nb, k, k))
    fb = np.broadcast_to(gb[None, :, None, :], (na, nb, k, k))
    fa, fb = fa.reshape(na, nb, k * k), fb.reshape(na, nb, k * k)
    ff = f(fa.ravel(), fb.ravel())
    ef = np.abs((grid(fa.ravel(), fb.ravel()) - ff) / scale(ff)).reshape(na, nb, k * k)
    ef = np.nan_to_num(ef, nan=np.inf)
    jw = np.argmax(ef, axis=2)
    cell_max = np.take_along_axis(ef, jw[:, :, None], axis=2)[:, :, 0]
    wa = np.take_along_axis(fa, jw[:, :, None], axis=2).ravel()
    wb = np.take_along_axis(fb, jw[:, :, None], axis=2).ravel()
    if integer:
        na3 = np.concatenate([wa, wa - sa, wa + sa, wa, wa])
        nb3 = np.concatenate([wb, wb, wb, wb - sb, wb + sb])
    else:
        ft = FLOAT_FORMATS[fmt]
        wa32, wb32 = wa.astype(ft), wb.astype(ft)
        na3 = np.concatenate([wa32, np.nextafter(wa32, ft(-np.inf)), np.nextafter(wa32, ft(np.inf)),
                              wa32, wa32]).astype(np.float64)
        nb3 = np.concatenate([wb32, wb32, wb32, np.nextafter(wb32, ft(-np.inf)),
                              np.nextafter(wb32, ft(np.inf))]).astype(np.float64)
    inside = (na3 >= alo) & (na3 <= ahi) & (nb3 >= blo) & (nb3 <= bhi)
    da = np.concatenate([pa, na3[inside]])
    db = np.concatenate([pb, nb3[inside]])
    rng = np.random.default_rng(seed)
    m = max(n - da.size, n // 2)
    ra = _random_axis(rng, alo, ahi, m)
    rb = _random_axis(rng, blo, bhi, m)
    if integer:
        ra, rb = np.rint(ra / sa) * sa, np.rint(rb / sb) * sb
    xa = np.concatenate([da, ra])
    xb = np.concatenate([db, rb])
    fx = f(xa, xb)
    if not np.all(np.isfinite(fx)):
        i = int(np.nonzero(~np.isfinite(fx))[0][0])
        raise AuditError(f"the core has no value at ({_fmt(xa[i])}, {_fmt(xb[i])}) inside the "
                         f"grid")
    counts = {"directed": int(da.size), "random": int(m), "segment_worst": int(na * nb),
              "fine_grid_per_cell": k * k}
    e = (grid(xa, xb) - fx) / scale(fx)
    ef2 = None
    if fmt == "float32":
        ef2 = (grid(xa, xb, fused=True) - fx) / scale(fx)
    res = _result(np.stack([xa, xb], axis=1), e, counts, seed, ef2)
    res["at"] = [float(v) for v in res["at"]]
    res["max_breakpoint_step"] = 0.0
    return res, cell_max


def _format_floor_1d(table, f, scale):
    if table.integer:
        x = table.row_inputs()
        return float(np.max(0.5 * table.scale_out / scale(f(x))))
    return format_floor(f, scale, table.lo, table.hi, table.fmt)


def _format_floor_2d(grid, f, scale):
    A, B = grid.axes()
    pa, pb = np.meshgrid(A, B, indexing="ij")
    pa, pb = pa.ravel(), pb.ravel()
    fz = f(pa, pb)
    if grid.integer:
        return float(np.max(0.5 * grid.scale_out / scale(fz)))
    ft = FLOAT_FORMATS[grid.fmt]
    ha = np.maximum(np.abs(pa), 1.0) * 1e-7
    hb = np.maximum(np.abs(pb), 1.0) * 1e-7
    (alo, ahi), (blo, bhi) = grid.box()
    a1, a2 = np.clip(pa - ha, alo, ahi), np.clip(pa + ha, alo, ahi)
    b1, b2 = np.clip(pb - hb, blo, bhi), np.clip(pb + hb, blo, bhi)
    da = (f(a2, pb) - f(a1, pb)) / (a2 - a1)
    db = (f(pa, b2) - f(pa, b1)) / (b2 - b1)
    ulp_a = np.spacing(pa.astype(ft)).astype(np.float64)
    ulp_b = np.spacing(pb.astype(ft)).astype(np.float64)
    ulp_o = np.spacing(np.abs(fz).astype(ft)).astype(np.float64)
    fl = (0.5 * ulp_o + 0.5 * np.abs(da) * ulp_a + 0.5 * np.abs(db) * ulp_b) / scale(fz)
    return float(np.nanmax(fl))


def _steps(spec, lo, hi, f):
    """Inputs inside the span where the core itself steps (IF97 switching to its region-3
    equation along saturation at 623.15 K, for the quantities that jump there)."""
    inp = spec.inputs[0]
    sw = Q.SATURATION_SWITCH.get(inp.quantity)
    if sw is None or Q.CATALOGUE[spec.quantity].family != "saturation":
        return []
    xb = (sw - inp.offset) / inp.scale
    if not lo < xb < hi:
        return []
    eps = 1e-9
    a, b = xb * (1 - eps), xb * (1 + eps)
    fa, fb = f(np.array([a, b]))
    slope = abs(float(f(np.array([xb * 1.001]))[0] - f(np.array([xb * 0.999]))[0])) / (0.002 * abs(xb))
    return [xb] if abs(fb - fa) > 100 * slope * (b - a) + 1e-12 * abs(fa) else []


# ------------------------------------------------------------------------------------------
# defects


def _resolution(text, integer, scale_out):
    """Half a unit in the last printed digit of a cell (in the value's unit)."""
    if integer:
        return 0.5 * scale_out
    try:
        exp = decimal.Decimal(text.strip()).as_tuple().exponent
    except decimal.InvalidOperation:
        return 0.0
    return 0.5 * 10.0 ** int(exp)


def _digit_variants(text):
    """(value, how) for one-slip edits of a decimal cell: two adjacent digits swapped, one
    digit changed, the decimal point one place off, a digit dropped or doubled."""
    s = text.strip()
    mant, _, expo = s.partition("e") if "e" in s else s.partition("E")
    tail = ("e" + expo) if expo else ""
    pos = [i for i, ch in enumerate(mant) if ch.isdigit()]
    out = []

    def add(m, how, rank):
        try:
            v = float(m + tail)
        except ValueError:
            return
        if m != mant and math.isfinite(v):
            out.append((v, how, rank))

    for a, b in zip(pos[:-1], pos[1:]):
        if b == a + 1 and mant[a] != mant[b]:
            m = mant[:a] + mant[b] + mant[a] + mant[b + 1:]
            add(m, f"digits {mant[a]} and {mant[b]} transposed", 0)
    for a in pos:
        for dch in "0123456789":
            if dch != mant[a]:
                add(mant[:a] + dch + mant[a + 1:], f"digit {mant[a]} where {dch} belongs", 1)
    if "." in mant:
        p = mant.index(".")
        bare = mant.replace(".", "")
        for q in (p - 1, p + 1):
            if 0 < q < len(bare) + 1:
                add(bare[:q] + "." + bare[q:], "decimal point one place off", 2)
    for a in pos:
        add(mant[:a] + mant[a + 1:], f"a digit {mant[a]} dropped", 3)
        add(mant[:a] + mant[a] + mant[a:], f"a digit {mant[a]} doubled", 3)
    return out


def _unit_explanation(y, true, res, crit, unit, kind, atmosphere):
    """How another unit (or a gauge reading) explains ``y`` where the core gives ``true``
    (both in ``unit``); returns (text, unit) or None."""
    osc, ooff = U.to_si_map(unit, kind)
    si = true * osc + ooff
    best = None
    for u, sc, off in _alt_units(unit, kind):
        expect = (si - off) / sc
        z = abs(y - expect) / max(res, 1e-300)
        if z <= crit and (best is None or z < best[0]):
            a = osc / sc
            b = (ooff - off) / sc
            factor = f"x{a:.6g}" + (f" {'+' if b > 0 else '-'} {abs(b):.6g}" if abs(b) > 1e-9 * max(1, abs(a)) else "")
            best = (z, f"{_fmt(y)} is the core's {_fmt(true)} {unit} written in {u} "
                       f"({_fmt(expect)} {u}; {unit} to {u} is {factor})", u)
    if kind == "pressure":
        atm = atmosphere or STANDARD_ATMOSPHERE
        expect = (si - atm - ooff) / osc
        z = abs(y - expect) / max(res, 1e-300)
        if z <= crit and (best is None or z < best[0]):
            best = (z, f"{_fmt(y)} is the core's {_fmt(true)} {unit} as a gauge reading "
                       f"({_fmt(expect)} {unit}: {_fmt(atm / osc)} {unit} of atmosphere taken "
                       f"off)", f"{unit} gauge")
    return None if best is None else best[1:]


def _node_defects(values, true, cells, integer, scale_out, fmt, spec, where_text):
    """Rows whose stored value is an outlier against the core, each named and explained.

    ``values``, ``true`` flat arrays in the output unit; ``where_text(k)`` describes entry k.
    Returns (findings, outlier mask, criterion)."""
    r = values - true
    texts = cells.text.ravel()
    res = np.array([_resolution(t, integer, scale_out) for t in texts])
    if not integer:
        ft = FLOAT_FORMATS[fmt]
        res = np.maximum(res, 0.5 * np.spacing(np.abs(values).astype(ft)).astype(np.float64))
    res = np.maximum(res, 1e-300)
    z = np.abs(r) / res
    med = float(np.median(z))
    crit = max(2.0, 3.0 * med)
    outlier = z > max(8.0, 6.0 * med)
    findings = []
    unit, kind = spec.output_unit, spec.output_kind
    atm = next((i.atmosphere for i in spec.inputs if i.atmosphere), None)
    for k in np.flatnonzero(outlier):
        line, col = int(cells.line.ravel()[k]), int(cells.column.ravel()[k])
        base = {"row": line, "column": col, "at": where_text(k)[1], "value": float(values[k]),
                "core": float(true[k]), "error": float(r[k])}
        ex = _unit_explanation(float(values[k]), float(true[k]), float(res[k]), crit, unit, kind,
                               atm)
        if ex is not None:
            findings.append({"kind": "wrong_unit", **base, "unit": ex[1],
                             "text": f"row {line}, column {col} ({where_text(k)[0]}): {ex[0]}; "
                                     f"this row is in another unit than the rest"})
            continue
        best = None
        if not integer:
            for v, how, rank in _digit_variants(texts[k]):
                zv = abs(v - true[k]) / res[k]
                if zv <= crit and (best is None or (rank, zv) < (best[2], best[3])):
                    best = (v, how, rank, zv)
        else:
            for v, how, rank in _digit_variants(texts[k]):
                zv = abs(v * scale_out - true[k]) / res[k]
                if zv <= crit and (best is None or (rank, zv) < (best[2], best[3])):
                    best = (v * scale_out, how, rank, zv)
        if best is not None:
            findings.append({"kind": "typo", **base, "likely": float(best[0]),
                             "text": f"row {line}, column {col} ({where_text(k)[0]}): "
                                     f"{texts[k]} looks like a typo of {_fmt(best[0])} "
                                     f"({best[1]}); the core gives {_fmt(true[k])} {unit}"})
            continue
        ok = np.abs(r[~outlier])
        near = float(np.max(ok)) if ok.size else 0.0
        findings.append({"kind": "spike", **base,
                         "text": f"row {line}, column {col} ({where_text(k)[0]}): {texts[k]} "
                                 f"is off by {r[k]:+.4g} {unit} from the core's "
                                 f"{_fmt(true[k])}, where the other rows are within "
                                 f"{near:.2g}: a local error spike (a mistyped value?)"})
    return findings, outlier, crit, res


def _order_defects(values, true, res, crit, cells, monotone, what, steps_between=(),
                   outlier=None):
    """Adjacent rows whose values reverse the order the core has along a line."""
    findings = []
    if not monotone:
        return findings, set()
    swapped = set()
    lines, cols = cells.line.ravel(), cells.column.ravel()
    texts = cells.text.ravel()
    for k in range(values.size - 1):
        if k in steps_between:
            continue
        if (values[k + 1] - values[k]) * monotone >= 0:
            continue
        a, b = k, k + 1
        z_sw = max(abs(values[b] - true[a]) / res[a], abs(values[a] - true[b]) / res[b])
        where = (f"rows {lines[a]} and {lines[b]}" if lines[a] != lines[b]
                 else f"row {lines[a]}, columns {cols[a]} and {cols[b]}")
        word = "rises" if monotone > 0 else "falls"
        base = {"row": int(lines[a]), "column": int(cols[a]), "rows": [int(lines[a]), int(lines[b])],
                "columns": [int(cols[a]), int(cols[b])], "value": float(values[a]),
                "core": float(true[a]), "error": float(values[a] - true[a])}
        if z_sw <= crit:
            swapped.update((a, b))
            findings.append({"kind": "swapped_rows", **base,
                             "text": f"{where}: the values {texts[a]} and {texts[b]} are swapped "
                                     f"(the core gives {_fmt(true[a])} and {_fmt(true[b])}); "
                                     f"{what} {word} monotonically, the table does not"})
        else:
            odd = [lines[r] if lines[a] != lines[b] else cols[r] for r in (a, b)
                   if outlier is not None and outlier[r]]
            cause = ""
            if odd:
                cause = (f" (the value in {'row' if lines[a] != lines[b] else 'column'} "
                         f"{odd[0]} is the odd one)")
            findings.append({"kind": "non_monotone", **base,
                             "text": f"{where}: {texts[a]} then {texts[b]} reverses the order "
                                     f"where {what} {word} monotonically over the span{cause}"})
    return findings, swapped


#: order of findings on one row: what explains a value before what it causes
_KIND_RANK = {"wrong_unit": 0, "typo": 1, "spike": 2, "swapped_rows": 3, "non_monotone": 4,
              "int_overflow": 5, "crosses_saturation": 6, "short_range": 7}


def _finding_order(d):
    return (d["row"] if d["row"] is not None else 1 << 30, _KIND_RANK.get(d["kind"], 9),
            d.get("column") or 0)


def _overflow_1d(table):
    if not table.integer or table.interpolation != "linear":
        return []
    prod = np.abs(np.diff(table.y)) * (np.diff(table.x) - 1)
    k = int(np.argmax(prod))
    if prod[k] <= INT32_MAX:
        return []
    return [k, int(prod[k])]


# ------------------------------------------------------------------------------------------
# the audit


@dataclass
class Audit:
    """Everything one audit found: the value the report and the command read."""
    source: str
    name: str
    sha256: str
    spec: AuditSpec
    table: object                 # Lookup1D or Grid2D
    cells: Cells
    verification: dict
    monotone: int
    floor: float
    findings: list
    used: dict = None
    replacement: dict = None
    notes: list = field(default_factory=list)
    cell_max: np.ndarray = None   # 2-D: sampled maximum error per cell
    budget: dict = None           # sensor error budget (gen.sensor.compare), 1-D only

    def add_sensor(self, sensor):
        """Put the sensor-caused output uncertainty beside this table's error (1-D tables)."""
        from .sensor import compare, slope_fd
        if isinstance(self.table, Grid2D):
            raise AuditError(f"{self.source}:1:1: a sensor budget is for one-input tables")
        lo, hi = float(self.table.lo), float(self.table.hi)
        x = np.linspace(lo, hi, 2001)
        f = self.core()
        fx = f(x)
        err = np.asarray(self.table(x), dtype=np.float64) - fx
        self.budget = compare(sensor, self.spec.inputs[0].unit, x, err,
                              slope_fd(f, lo, hi, x), fx, self.spec.error_kind)

    @property
    def within(self):
        """True/False against the tolerance (max error over the span and, when the firmware
        uses the table beyond it, the error there under its out-of-range policy); None when
        no tolerance was given."""
        if self.spec.tol_kind is None:
            return None
        worst = self.verification["max_error"]
        if self.used:
            worst = max(worst, self.used["max_error_policy"])
        return bool(worst <= self.spec.tol_value)

    def core(self):
        """The core in the table's units."""
        return core_function(self.spec)


def _seed(data, spec):
    h = hashlib.sha256(bytes(data) + repr((spec.quantity, spec.inputs, spec.output_unit,
                                          spec.interpolation, spec.arithmetic,
                                          spec.error_kind)).encode()).digest()
    return int.from_bytes(h[:8], "little")


def _stem(source):
    return Path(str(source)).stem or "table"


def audit_file(path, spec):
    """Audit the CSV table at ``path`` (see the module docstring)."""
    try:
        data = Path(path).read_bytes()
    except OSError as e:
        raise AuditError(f"{path}:1:1: cannot read the table ({e.strerror})") from None
    return audit_bytes(data, str(path), spec)


def audit_bytes(data, source, spec):
    """Audit CSV ``data``; ``source`` names it in messages and the report."""
    if isinstance(data, str):
        data = data.encode("utf-8")
    table, cells = read_table(data, source, spec)
    seed = _seed(data, spec)
    name = _stem(source)
    sha = hashlib.sha256(data).hexdigest()
    if isinstance(table, Grid2D):
        return _audit_2d(source, name, sha, spec, table, cells, seed)
    return _audit_1d(source, name, sha, spec, table, cells, seed)


def _audit_1d(source, name, sha, spec, table, cells, seed):
    f = core_function(spec)
    scale = error_scale(spec.error_kind)
    lo, hi = table.lo, table.hi
    xs = np.unique(np.concatenate([np.linspace(lo, hi, 4097), table.row_inputs()]))
    monotone = _monotone(f(xs))
    steps = _steps(spec, lo, hi, f)
    n = spec.verify_points
    if table.integer:
        v = verify_integer(table, f, scale, n, seed, monotone, steps)
    else:
        v = verify_table(table, f, scale, n, seed, monotone, steps)
    v = {**v, "at": float(v["at"])}
    floor = _format_floor_1d(table, f, scale)
    findings, notes = [], []
    xb = table.row_inputs()
    yv = table.y.astype(np.float64) * (table.scale_out if table.integer else 1.0)
    true = f(xb)
    inp = spec.inputs[0]

    def where(k):
        return f"{_fmt(xb[k])} {inp.unit}", [float(xb[k])]

    node, outlier, crit, res = _node_defects(yv, true, cells, table.integer,
                                             table.scale_out, table.fmt, spec, where)
    between = set()
    for s in steps:
        between.update(int(k) for k in np.nonzero((xb[:-1] < s) & (xb[1:] >= s))[0])
    qtext = Q.CATALOGUE[spec.quantity].text
    order, swapped = _order_defects(yv, true, res, crit, cells, monotone,
                                    f"{qtext} (from the core)", between, outlier)
    findings += order
    findings += [d for d in node if not any(r == d["row"] for k in swapped
                                           for r in [int(cells.line[k])])]
    findings.sort(key=_finding_order)
    ov = _overflow_1d(table)
    if ov:
        k, prod = ov
        findings.append({"kind": "int_overflow", "row": int(cells.line[k]), "column": 2,
                         "at": [float(xb[k])], "product": prod,
                         "text": f"rows {int(cells.line[k])}-{int(cells.line[k + 1])}: the "
                                 f"product (y[i+1] - y[i]) * (x - x[i]) reaches {prod}, beyond "
                                 f"a 32-bit int; firmware that multiplies in int overflows "
                                 f"(cast to int64_t)"})
    if table.integer:
        dfdx = np.abs(np.gradient(true, xb)) if xb.size > 2 else np.abs(np.diff(true) / np.diff(xb))
        notes.append(f"Measured at raw inputs. Rounding a real {inp.quantity} to the raw step of "
                     f"{_fmt(table.scale_in)} {inp.unit} adds up to "
                     f"{_fmt(float(np.max(dfdx)) * table.scale_in / 2)} {spec.output_unit} "
                     f"before the table is consulted.")
    for s in steps:
        notes.append(f"IF97 switches to its region-3 equation along saturation at 623.15 K "
                     f"({_fmt(s)} {inp.unit}) and the core's value steps there; a reversal "
                     f"across that input is not counted.")
    notes += _header_notes(spec, cells.header)
    used = _used_range(spec, table, f, scale)
    if used:
        findings += used.pop("findings")
    audit = Audit(source=source, name=name, sha256=sha, spec=spec, table=table, cells=cells,
                  verification=v, monotone=monotone, floor=floor, findings=findings, used=used,
                  notes=notes)
    if spec.suggest:
        audit.replacement = suggest_replacement(audit)
    return audit


def _used_range(spec, table, f, scale):
    """Error where the firmware uses the table beyond its span (clamped and extrapolated)."""
    lo, hi = table.lo, table.hi
    umin = spec.used_min if spec.used_min is not None else lo
    umax = spec.used_max if spec.used_max is not None else hi
    if spec.used_min is None and spec.used_max is None:
        return None
    inp = spec.inputs[0]
    out = {"min": float(umin), "max": float(umax), "sides": [], "findings": [],
           "policy": spec.out_of_range}
    worst_policy = 0.0
    span = hi - lo
    for side, a, b in (("below", umin, lo), ("above", hi, umax)):
        if not a < b:
            continue
        x = np.linspace(a, b, 2001)
        x = x[(x < lo) | (x > hi)]
        if x.size == 0:
            continue
        fx = f(x)
        ec = np.abs((table.with_policy("clamp")(x) - fx) / scale(fx))
        ee = np.abs((table.with_policy("extrapolate")(x) - fx) / scale(fx))
        ic, ie = int(np.argmax(ec)), int(np.argmax(ee))
        e_pol = ec if spec.out_of_range == "clamp" else ee
        worst_policy = max(worst_policy, float(np.max(e_pol)))
        short = b - a
        end = lo if side == "below" else hi
        use = umin if side == "below" else umax
        rec = {"side": side, "short_by": float(short), "short_by_percent": float(100 * short / span),
               "max_error_clamped": float(ec[ic]), "at_clamped": float(x[ic]),
               "max_error_extrapolated": float(ee[ie]), "at_extrapolated": float(x[ie])}
        out["sides"].append(rec)
        k = 100.0 if spec.error_kind == "rel" else 1.0
        u = "%" if spec.error_kind == "rel" else spec.output_unit
        verb = "starts" if side == "below" else "stops"
        out["findings"].append({
            "kind": "short_range", "row": None, "column": None, "at": [float(use)],
            "side": side, "short_by": float(short),
            "text": f"the table {verb} at {_fmt(end)} {inp.unit}, the firmware uses it "
                    f"{'down' if side == 'below' else 'up'} to {_fmt(use)} {inp.unit}: "
                    f"{_fmt(short)} {inp.unit} short ({100 * short / span:.3g} % of the span); "
                    f"clamped there the error reaches {ec[ic] * k:.3g} {u} at {_fmt(x[ic])} "
                    f"{inp.unit}, extrapolating the end interval {ee[ie] * k:.3g} {u} at "
                    f"{_fmt(x[ie])} {inp.unit}"})
    out["max_error_policy"] = worst_policy
    if not out["sides"]:
        out["note"] = "the used range lies within the table's span"
    return out


def _audit_2d(source, name, sha, spec, grid, cells, seed):
    f = core_function(spec)
    scale = error_scale(spec.error_kind)
    v, cell_max = verify_grid(grid, f, scale, spec.verify_points, seed)
    floor = _format_floor_2d(grid, f, scale)
    A, B = grid.axes()
    zv = grid.z.astype(np.float64) * (grid.scale_out if grid.integer else 1.0)
    true = f(A[:, None], B[None, :])
    n0, n1 = spec.inputs

    def where(k):
        i, j = divmod(int(k), B.size)
        return (f"{n0.quantity} {_fmt(A[i])} {n0.unit}, {n1.quantity} {_fmt(B[j])} {n1.unit}",
                [float(A[i]), float(B[j])])

    node, outlier, crit, res = _node_defects(zv.ravel(), true.ravel(), cells, grid.integer,
                                             grid.scale_out, grid.fmt, spec, where)
    res = res.reshape(zv.shape)
    out2 = outlier.reshape(zv.shape)
    findings = list(node)
    qtext = Q.CATALOGUE[spec.quantity].text
    # order along each line of the grid where the core is monotone along it; the core along
    # every line of both directions in two evaluations
    xb = np.linspace(B[0], B[-1], 8 * B.size)
    xa = np.linspace(A[0], A[-1], 8 * A.size)
    along = {1: f(A[:, None], xb[None, :]), 0: f(xa[None, :], B[:, None])}
    for axis in (1, 0):
        lines = zv.shape[0] if axis == 1 else zv.shape[1]
        for L in range(lines):
            mono = _monotone(along[axis][L])
            if axis == 1:
                vals, tr, rr = zv[L], true[L], res[L]
                sub = Cells(cells.text[L], cells.line[L], cells.column[L])
                what = f"{qtext} along {n1.quantity} at {n0.quantity} {_fmt(A[L])} {n0.unit}"
            else:
                vals, tr, rr = zv[:, L], true[:, L], res[:, L]
                sub = Cells(cells.text[:, L], cells.line[:, L], cells.column[:, L])
                what = f"{qtext} along {n0.quantity} at {n1.quantity} {_fmt(B[L])} {n1.unit}"
            fnd, _ = _order_defects(vals, tr, rr, crit, sub, mono, what,
                                    outlier=out2[L] if axis == 1 else out2[:, L])
            findings += fnd
    cross = _saturation_cells(spec, grid, cell_max)
    if cross:
        findings.append(cross)
    if grid.integer:
        findings += _overflow_2d(grid, cells)
    findings.sort(key=_finding_order)
    notes = []
    if grid.integer:
        notes.append("Measured at raw inputs; the rounding of real inputs to raw ones is not "
                     "counted.")
    notes.append("No replacement is suggested for a grid in this version: a generated "
                 "two-input table is gridded on one side of saturation, so the audited box "
                 "would first have to be split by phase.")
    return Audit(source=source, name=name, sha256=sha, spec=spec, table=grid, cells=cells,
                 verification=v, monotone=0, floor=floor, findings=findings, notes=notes,
                 cell_max=cell_max)


def _saturation_cells(spec, grid, cell_max):
    """Cells of a (pressure, temperature) grid that straddle the saturation line."""
    names = [i.quantity for i in spec.inputs]
    if set(names) != {"pressure", "temperature"}:
        return None
    A, B = grid.axes()
    ip = names.index("pressure")
    P, T = (A, B) if ip == 0 else (B, A)
    pin, tin = spec.inputs[ip], spec.inputs[1 - ip]
    psi = P * pin.scale + pin.offset
    tsi = T * tin.scale + tin.offset
    plo, phi = Q.SATURATION_RANGE["pressure"]
    pc = np.clip(psi, plo, phi)
    ts = Q.evaluate("saturation_temperature", pressure=pc)
    lo_t, hi_t = ts[:-1], ts[1:]
    below = psi[1:] <= plo          # wholly below the triple point pressure: no liquid line
    above = psi[:-1] >= phi         # wholly supercritical
    live = ~(below | above)
    cross = (live[:, None] & (hi_t[:, None] >= tsi[None, :-1]) & (lo_t[:, None] <= tsi[None, 1:]))
    if ip == 1:
        cross = cross.T
    count = int(cross.sum())
    if not count:
        return None
    inside = float(np.max(cell_max[cross]))
    outside = float(np.max(cell_max[~cross])) if (~cross).any() else 0.0
    k = 100.0 if spec.error_kind == "rel" else 1.0
    u = "%" if spec.error_kind == "rel" else spec.output_unit
    i, j = np.argwhere(cross)[0]
    return {"kind": "crosses_saturation", "row": None, "column": None,
            "at": [float(A[i]), float(B[j])], "cells": count, "max_error_in": inside,
            "max_error_elsewhere": outside,
            "text": f"{count} of {cross.size} cells straddle the saturation line (liquid on "
                    f"one side, vapour on the other): bilinear interpolation across it errs "
                    f"by up to {inside * k:.3g} {u} there, the other cells by up to "
                    f"{outside * k:.3g} {u} (sampled per cell); grid such a quantity in "
                    f"superheat or subcooling instead"}


def _overflow_2d(grid, cells):
    z = grid.z
    pa = np.abs(np.diff(z, axis=0)) * (np.diff(grid.a) - 1)[:, None]
    corner = np.maximum.reduce([np.abs(z[:-1, 1:] - z[:-1, :-1]), np.abs(z[1:, 1:] - z[1:, :-1]),
                                np.abs(z[:-1, 1:] - z[1:, :-1]), np.abs(z[1:, 1:] - z[:-1, :-1])])
    pb = corner * (np.diff(grid.b) - 1)[None, :]
    worst = max(int(pa.max()), int(pb.max()))
    if worst <= INT32_MAX:
        return []
    src = pa if int(pa.max()) >= int(pb.max()) else pb
    i, j = np.unravel_index(int(np.argmax(src)), src.shape)
    return [{"kind": "int_overflow", "row": int(cells.line[i, j]), "column": int(cells.column[i, j]),
             "at": None, "product": worst,
             "text": f"row {int(cells.line[i, j])}, column {int(cells.column[i, j])}: an "
                     f"interpolation product reaches {worst}, beyond a 32-bit int; firmware "
                     f"that multiplies in int overflows (cast to int64_t)"}]


# ------------------------------------------------------------------------------------------
# the replacement h2olut would build


def _ident(stem):
    s = re.sub(r"[^A-Za-z0-9_]", "_", stem)
    if not s or s[0].isdigit():
        s = "t_" + s
    from .spec import C_KEYWORDS
    if s in C_KEYWORDS:
        s += "_table"
    return s[:40]


def _floor2(v):
    """``v`` rounded down to two significant digits (a tolerance at least as tight)."""
    if v <= 0:
        return v
    e = math.floor(math.log10(v)) - 1
    q = math.floor(v / 10.0 ** e)
    t = q * 10.0 ** e
    return float(f"{t:.2g}")


def estimated_ops_table(table):
    """Rough operation count of one call of the audited table (compares, loads, arithmetic),
    counted the way :func:`gen.build.estimated_ops` counts a generated one; a run-time log is
    one operation here although it costs tens to hundreds of cycles."""
    if isinstance(table, Grid2D):
        na, nb = table.shape
        search = 3 * (max(1, math.ceil(math.log2(max(na - 1, 2))))
                      + max(1, math.ceil(math.log2(max(nb - 1, 2)))))
        return 4 + search + 3 + 16
    search = 3 * max(1, math.ceil(math.log2(max(table.rows - 1, 2))))
    body = {"step": 1, "nearest": 4, "linear": 7, "linear-in-log": 8,
            "cubic-spline": 22}[table.interpolation]
    return 4 + search + 3 + body


def suggest_replacement(audit):
    """What h2olut would generate for the table's range (and the range the firmware uses) at
    the audit's tolerance, or at the table's own measured max error when none was given."""
    from .build import BuildError, build_table, estimated_ops
    from .spec import SpecError, parse_spec
    spec = audit.spec
    table = audit.table
    inp = spec.inputs[0]
    lo = min(table.lo, spec.used_min if spec.used_min is not None else table.lo)
    hi = max(table.hi, spec.used_max if spec.used_max is not None else table.hi)
    kind = spec.error_kind
    own = spec.tol_kind is None
    tol = spec.tol_value if not own else _floor2(audit.verification["max_error"])
    fmt = spec.arithmetic if spec.arithmetic in FLOAT_FORMATS else "float32"
    ident = _ident(audit.name)
    atm = f', atmosphere = "{inp.atmosphere!r} Pa"' if inp.atmosphere else ""
    toml = "\n".join([
        f'name = "{ident}_h2olut"',
        'prefix = "fw"',
        "",
        "[[table]]",
        f'name = "{ident}"',
        f'quantity = "{spec.quantity}"',
        f'output_unit = "{spec.output_unit}"',
        f"tolerance = {{ {kind} = {tol!r} }}",
        f'arithmetic = "{fmt}"',
        f'{inp.quantity} = {{ unit = "{inp.unit}", min = {float(lo)!r}, max = {float(hi)!r}{atm} }}',
        ""])
    rec = {"spec_toml": toml, "tolerance": {kind: tol}, "tolerance_from": "measured max error"
           if own else "given tolerance", "arithmetic": fmt, "min": float(lo), "max": float(hi)}
    if not (tol > 0) or (kind == "rel" and tol >= 0.5):
        rec.update(built=False, line=f"no replacement: the table's error ({tol:g}) is no "
                                     f"target to aim for")
        return rec
    try:
        s = parse_spec(toml, "<replacement>")
        t = build_table(s.tables[0])
    except (SpecError, BuildError) as e:
        why = str(e)
        rec.update(built=False, why=why,
                   line=f"h2olut would not build this as asked: {why.split(': ', 1)[-1]}")
        return rec
    pw = t.piecewise
    ops = estimated_ops(pw)
    k = 100.0 if kind == "rel" else 1.0
    u = "%" if kind == "rel" else spec.output_unit
    word = {"free": "free breakpoints", "uniform": "equal segments",
            "binade": "segments by octave"}[pw.layout]
    note = "" if spec.arithmetic in FLOAT_FORMATS else " (float32: h2olut does not generate integer tables yet)"
    rec.update(built=True, layout=pw.layout, segments=pw.nseg, degree=pw.degree,
               storage_bytes=pw.storage_bytes, estimated_ops=ops,
               max_error=t.verification["max_error"], verification_points=t.verification["points"],
               line=(f"h2olut would generate {pw.nseg} segments of degree {pw.degree} ({word}) "
                     f"for {_fmt(lo)} to {_fmt(hi)} {inp.unit} within {tol * k:g} {u}: "
                     f"{pw.storage_bytes} bytes against this table's {table.storage_bytes}, "
                     f"about {ops} operations per call against about "
                     f"{estimated_ops_table(table)}, verified max error "
                     f"{t.verification['max_error'] * k:.3g} {u}{note}"))
    return rec


# ------------------------------------------------------------------------------------------
# verification of what h2olut built, independent of how it was made


def audit_piecewise(table, n=None, seed=None):
    """Re-verify a :class:`gen.build.Table` on the same points as its build (same seed and
    count unless given): the same :func:`gen.verify.verify_table` result."""
    from .build import core_function as build_core, error_scale as build_scale
    ts = table.spec
    return verify_table(table.piecewise, build_core(ts), build_scale(ts.tol_kind),
                        n or ts.verify_points,
                        table.verification["seed"] if seed is None else seed,
                        table.monotone, table.forced_breaks)


def _load_module(path):
    name = f"_h2olut_audited_{hashlib.sha256(str(path).encode()).hexdigest()[:12]}"
    spec = importlib.util.spec_from_file_location(name, str(path))
    if spec is None or spec.loader is None:
        raise AuditError(f"{path}:1:1: cannot load the generated Python module")
    mod = importlib.util.module_from_spec(spec)
    try:
        spec.loader.exec_module(mod)
    except Exception as e:  # a broken module is bad input, not a crash
        raise AuditError(f"{path}:1:1: the generated Python module does not load "
                         f"({type(e).__name__}: {str(e).splitlines()[0] if str(e) else ''})") from None
    return mod


class GeneratedFunction:
    """One function of a generated Python module, evaluated by the module's own copy of the
    run-time code on its stored values; ``lo``, ``hi``, ``fmt``, ``breakpoints()`` and
    ``__call__(x, fused)`` make it a drop-in for :func:`gen.verify.verify_table`."""

    def __init__(self, module, function, breakpoints):
        self.module = module
        self.function = function
        self.tab = getattr(module, f"_{function}")
        self.fmt = self.tab["fmt"]
        self.layout = self.tab["layout"]
        self.lo = float(self.tab["lo"])
        self.hi = float(self.tab["hi"])
        self.policy = self.tab["policy"]
        self._breakpoints = np.asarray(breakpoints, dtype=np.float64)

    def __repr__(self):
        return f"GeneratedFunction({self.function!r}, layout={self.layout!r}, fmt={self.fmt!r})"

    def breakpoints(self):
        return self._breakpoints

    def __call__(self, xin, fused=False):
        t, m = self.tab, self.module
        if self.layout == "closed_form":
            k = t["k"]
            return m.evaluate_saturation_line(xin, t["fmt"], t["kind"], k[:10], k[10], k[11],
                                              k[12], k[13], t["lo"], t["hi"], t["policy"],
                                              fused=fused)
        return m.evaluate(xin, t["fmt"], t["layout"], t["lo"], t["hi"], t["policy"], t["coef"],
                          x=t["x"], inv_w=t["inv_w"], x0=t["x0"], inv_h=t["inv_h"], k=t["k"],
                          key0=t["key0"], fused=fused)


def _upper_switches(quantity, inp, breakpoints, fmt):
    """Interior breakpoints that are the first ``fmt`` input on IF97's region-3 equation along
    saturation (where the core itself may step); monotonicity is not asked across them."""
    if Q.CATALOGUE[quantity].family != "saturation" or inp.quantity not in Q.SATURATION_SWITCH:
        return []
    ft = FLOAT_FORMATS[fmt]
    out = []
    for b in breakpoints[1:-1]:
        below = float(np.nextafter(ft(b), ft(-np.inf)))
        si = np.array([b, below]) * inp.scale + inp.offset
        up = Q.on_upper_equation(inp.quantity, si)
        if bool(up[0]) and not bool(up[1]):
            out.append(float(b))
    return out


def audit_generated(report_path, module_path=None):
    """Re-verify every table of an h2olut output set from its ``report.json`` and the
    generated Python module beside it (``NAME.py``), with :func:`gen.verify.verify_table` on
    the report's seed and point count. Returns one dict per table: name, function, kind,
    reported and measured max error and where, ``same`` (equal to the bit) and ``within``.

    The function is evaluated by the module's own run-time code on its stored values (see
    :class:`GeneratedFunction`); the verification points come from the report's breakpoints,
    seed and count, so the result depends on what was shipped, not on how it was made."""
    rp = Path(report_path)
    try:
        doc = json.loads(rp.read_text(encoding="utf-8"))
        base = doc["spec"]["name"]
        tables = doc["tables"]
    except OSError as e:
        raise AuditError(f"{report_path}:1:1: cannot read the report ({e.strerror})") from None
    except (ValueError, KeyError, TypeError):
        raise AuditError(f"{report_path}:1:1: not an h2olut report.json") from None
    mp = Path(module_path) if module_path else rp.parent / f"{base}.py"
    if not mp.is_file():
        raise AuditError(f"{mp}:1:1: the generated Python module is missing")
    mod = _load_module(mp)
    out = []
    for rec in tables:
        fn = rec["function"]
        if not hasattr(mod, f"_{fn}"):
            raise AuditError(f"{mp}:1:1: no stored table for {fn}")
        kind_of = (rec.get("method") or {}).get("kind")
        if kind_of == "grid":
            out.append({"name": rec["name"], "function": fn, "skipped":
                        "a two-input grid: re-verification from report.json covers one-input "
                        "and wet-steam tables in this version ('h2olut check' still compares "
                        "its bits)"})
            continue
        if kind_of == "wet_steam":
            out.append(_reverify_wet(mod, rec, report_path))
            continue
        b = _record_basics(rec, report_path)
        try:
            brk = rec["method"]["breakpoints"]
        except (KeyError, TypeError):
            raise AuditError(_lacks(rec, report_path)) from None
        ai = b["inputs"][0]
        spec = AuditSpec(quantity=rec["quantity"], inputs=(ai,), output_unit=b["out_unit"],
                         out_scale=b["out_scale"], out_offset=b["out_offset"],
                         tol_kind=b["kind"], tol_value=b["tol"])
        g = GeneratedFunction(mod, fn, brk)
        steps = _upper_switches(rec["quantity"], ai, g.breakpoints(), g.fmt)
        v = verify_table(g, core_function(spec), error_scale(b["kind"]), b["points"],
                         b["seed"], int(rec["verification"].get("monotone", 0)), steps)
        out.append(_comparison(rec, b, v, [v["at"]]))
    return out


def _lacks(rec, report_path):
    return (f"{report_path}:1:1: table {rec.get('name')!r} lacks what a re-verification needs "
            f"(tolerance, inputs, units, seed, breakpoints)")


def _record_basics(rec, report_path):
    """What a re-verification reads from a report record: tolerance, inputs (as
    :class:`AuditInput`, gauge reference included), output unit map, seed and point count."""
    try:
        kind, tol = next(iter(rec["tolerance"].items()))
        inputs = []
        for inp in rec["inputs"]:
            sc, off = U.to_si_map(inp["unit"], Q.INPUT_KIND[inp["quantity"]])
            atm = inp.get("atmosphere_pa")
            inputs.append(AuditInput(inp["quantity"], inp["unit"], sc, off + (atm or 0.0), atm))
        osc, ooff = U.to_si_map(rec["output"]["unit"], Q.CATALOGUE[rec["quantity"]].kind)
        return {"kind": kind, "tol": tol, "inputs": inputs, "out_unit": rec["output"]["unit"],
                "out_scale": osc, "out_offset": ooff, "seed": int(rec["verification"]["seed"]),
                "points": int(rec["verification_points"])}
    except (KeyError, TypeError, StopIteration, AttributeError, U.UnitError):
        raise AuditError(_lacks(rec, report_path)) from None


def _comparison(rec, b, v, at):
    """The re-verification's result beside the report's: equal to the bit, and within."""
    reported = rec["max_error"][b["kind"]]
    same = v["max_error"] == reported and at == rec.get("max_error_at")
    return {"name": rec["name"], "function": rec["function"], "kind": b["kind"],
            "tolerance": b["tol"], "reported": reported, "reported_at": rec.get("max_error_at"),
            "measured": v["max_error"], "measured_at": at, "points": v["points"],
            "same": bool(same), "within": bool(v["max_error"] <= b["tol"]), "verification": v}


class GeneratedWet(WetFunction):
    """A wet-steam function of a generated Python module, evaluated by the module's own run
    time on its stored tables, with what :func:`gen.wet.verify_wet` asks of a table."""

    def __init__(self, module, function, spec, breakpoints):
        self.run = module
        self.function = function
        self.tab = getattr(module, f"_{function}")
        self.spec = spec
        self.fmt = self.tab["fmt"]
        self.policy = self.tab["policy"]
        self.p_lo = float(self.tab["p_lo"])
        self.p_hi = float(self.tab["p_hi"])
        self._breakpoints = np.asarray(breakpoints, dtype=np.float64)

    def breakpoints(self):
        return self._breakpoints


def _reverify_wet(mod, rec, report_path):
    """Re-verify one wet-steam record on its seed and point count (see audit_generated)."""
    from .spec import InputSpec, TableSpec
    from .wet import verify_wet
    b = _record_basics(rec, report_path)
    try:
        brk = [x for m in rec["method"]["tables"] for x in m["method"]["breakpoints"]]
        inputs = tuple(InputSpec(quantity=i.quantity, unit=i.unit, lo=r["min"], hi=r["max"],
                                 scale=i.scale, offset=i.offset, atmosphere=i.atmosphere)
                       for i, r in zip(b["inputs"], rec["inputs"]))
        policy, goal = rec["method"]["out_of_range"], rec["method"].get("goal", "smallest")
    except (KeyError, TypeError):
        raise AuditError(_lacks(rec, report_path)) from None
    ts = TableSpec(name=rec["name"], function=rec["function"], quantity=rec["quantity"],
                   description="", inputs=inputs, output_unit=b["out_unit"],
                   out_scale=b["out_scale"], out_offset=b["out_offset"], tol_kind=b["kind"],
                   tol_value=b["tol"], arithmetic=rec["arithmetic"], policy=policy, goal=goal,
                   verify_points=b["points"], phase="wet")
    v = verify_wet(GeneratedWet(mod, rec["function"], ts, np.unique(brk)), b["points"],
                   b["seed"])
    return _comparison(rec, b, v, [float(v["at"][0]), float(v["at"][1])])


# ------------------------------------------------------------------------------------------
# the report


def _input_records(audit):
    t = audit.table
    spec = audit.spec
    recs = []
    if isinstance(t, Grid2D):
        (alo, ahi), (blo, bhi) = t.box()
        spans = [(alo, ahi), (blo, bhi)]
    else:
        spans = [(t.lo, t.hi)]
    for k, (inp, (lo, hi)) in enumerate(zip(spec.inputs, spans)):
        r = {"quantity": inp.quantity, "unit": inp.unit, "min": float(lo), "max": float(hi)}
        if inp.atmosphere:
            r["atmosphere_pa"] = inp.atmosphere
        if t.integer:
            r["ctype"] = f"{spec.arithmetic}_t"
            r["scale"] = spec.scale_in[k]
        recs.append(r)
    return recs


def audit_record(audit):
    """The per-table record of an audit's report.json: the keys of
    :func:`gen.report.table_record`, with ``method.kind = "audited_table"``."""
    spec, t, v = audit.spec, audit.table, audit.verification
    kind = spec.error_kind
    two = isinstance(t, Grid2D)
    out = {"quantity": spec.quantity, "unit": spec.output_unit}
    if t.integer:
        out.update(ctype=f"{spec.arithmetic}_t", scale=spec.scale_out)
    method = {"kind": "audited_table", "layout": spec.interpolation,
              "interpolation": spec.interpolation,
              "rows": (t.shape[0] if two else t.rows), "stored_values": t.stored_values,
              "out_of_range": spec.out_of_range, "estimated_ops": estimated_ops_table(t)}
    if two:
        method["columns"] = t.shape[1]
    else:
        method["breakpoints"] = [float(b) for b in t.row_inputs()]
    if t.integer:
        method["int_division"] = spec.int_division
    exhaustive = "exhaustive" in v["counts"]
    rec = {
        "name": audit.name,
        "function": audit.name,
        "quantity": spec.quantity,
        "description": f"audited table {Path(audit.source).name}",
        "inputs": _input_records(audit),
        "output": out,
        "arithmetic": "integer" if t.integer else spec.arithmetic,
        "tolerance": None if spec.tol_kind is None else {spec.tol_kind: spec.tol_value},
        "storage_bytes": int(t.storage_bytes),
        "max_error": {kind: v["max_error"]},
        "max_error_at": v["at"] if two else [v["at"]],
        "verification_points": v["points"],
        "verification": dict(verification_block(
            v, audit.floor, max_breakpoint_step=v.get("max_breakpoint_step", 0.0),
            monotone=audit.monotone, monotone_reversals=v.get("monotone_reversals")),
            method="exhaustive" if exhaustive else "sampled"),
        "method": method,
        "within_tolerance": audit.within,
        "defects": [{k: val for k, val in d.items()} for d in audit.findings],
        "used_range": audit.used,
        "replacement": audit.replacement,
        "candidates": [],
        "notes": audit.notes,
    }
    if audit.budget is not None:
        rec["sensor_budget"] = audit.budget
    return rec


def audit_report_json(audit):
    from .emit.common import CAUTION
    from .report import SCHEMA_VERSION
    doc = {
        "schema": SCHEMA_VERSION,
        "generator": {"name": "h2olut", "version": __version__},
        "spec": {"file": Path(audit.source).name, "sha256": audit.sha256, "name": audit.name,
                 "prefix": ""},
        "caution": CAUTION,
        "audit": {"command": audit.spec.command, "table_file": Path(audit.source).name},
        "tables": [audit_record(audit)],
    }
    return json.dumps(doc, indent=2, sort_keys=False, allow_nan=False) + "\n"


def _err_text(spec, e):
    return error_text(spec.error_kind, e, spec.output_unit)


def _at_text(audit):
    v = audit.verification
    ins = audit.spec.inputs
    at = v["at"] if isinstance(v["at"], list) else [v["at"]]
    return ", ".join(f"{i.quantity} {a:.8g} {i.unit}" for i, a in zip(ins, at))


def summary_lines(audit):
    """Plain lines the command prints and the Markdown repeats."""
    spec, t, v = audit.spec, audit.table, audit.verification
    q = Q.CATALOGUE[spec.quantity].text
    ins = " and ".join(f"{i.quantity} [{i.unit}]" for i in spec.inputs)
    size = (f"{t.shape[0]} x {t.shape[1]} grid" if isinstance(t, Grid2D) else f"{t.rows} rows")
    how = "every raw input" if "exhaustive" in v["counts"] else "sampled"
    lines = [f"{Path(audit.source).name}: {q} [{spec.output_unit}] from {ins}, {size}, "
             f"{spec.interpolation}, {spec.arithmetic}, {t.storage_bytes} bytes",
             f"max error {_err_text(spec, v['max_error'])} at {_at_text(audit)} ({how}, "
             f"{v['points']} points"
             + (f"; with fused multiply-add {_err_text(spec, v['max_error_fused'])}"
                if v.get("max_error_fused") is not None else "") + ")"]
    b = audit.budget
    if b is not None:
        lines.append(
            f"sensor {b['sensor']}: causes {_err_text(spec, b['output_uncertainty_min'])} to "
            f"{_err_text(spec, b['output_uncertainty_max'])}; table error / that at most "
            f"{b['ratio_max']:.3g}" + (" - FLAGGED (above 1/4, a 4:1 ratio; common practice, "
                                       "no source)" if b["flag"] else " (below 1/4)"))
    return lines


def verdict_line(audit):
    spec = audit.spec
    if audit.within is None:
        return "verdict: no tolerance given"
    tol = _err_text(spec, spec.tol_value)
    worst = audit.verification["max_error"]
    if audit.used:
        worst = max(worst, audit.used["max_error_policy"])
    if audit.within:
        return f"verdict: within tolerance ({_err_text(spec, worst)} <= {tol})"
    return f"verdict: OUT OF TOLERANCE ({_err_text(spec, worst)} > {tol})"


def audit_report_markdown(audit, plot_name=None):
    from .emit.common import CAUTION
    spec, v = audit.spec, audit.verification
    lines = [f"# h2olut audit: {md_escape(Path(audit.source).name)}", "",
             f"Audited by h2olut {__version__}: `{md_escape(Path(audit.source).name)}` (sha256 "
             f"`{audit.sha256[:16]}…`)." + (f" Rerun with `{spec.command}`." if spec.command
                                          else ""),
             "", f"> {CAUTION}", ""]
    lines += [f"- {md_escape(s)}" for s in summary_lines(audit)]
    tol = "none given" if spec.tol_kind is None else _err_text(spec, spec.tol_value)
    lines += [f"- tolerance: {md_escape(tol)}", f"- {md_escape(verdict_line(audit))}",
              f"- format floor (rounding of input and output alone): "
              f"{md_escape(_err_text(spec, audit.floor))}",
              f"- points: {v['counts'].get('directed', 0)} directed (ends, rows and their "
              f"neighbours, per-interval worst), {v['counts'].get('random', 0)} seeded random"
              + (f", every one of {v['counts']['exhaustive']} raw inputs"
                 if "exhaustive" in v["counts"] else ""),
              "", "The maximum is measured on the emulated firmware arithmetic against the IF97 "
              "core" + ("; over every raw input it is complete for the table, not a bound on "
                        "the sensor." if "exhaustive" in v["counts"] else
                        ": a sampled measurement, not a proof of a bound."), ""]
    lines += ["## Defects", ""]
    if audit.findings:
        lines += [f"- {d['kind'].replace('_', ' ')}: {md_escape(d['text'])}" for d in audit.findings]
    else:
        lines.append("None found.")
    lines.append("")
    if audit.used:
        lines += ["## Where the firmware uses it", ""]
        if audit.used.get("note"):
            lines.append(md_escape(audit.used["note"]))
        for s in audit.used["sides"]:
            lines.append(f"- {s['side']} the span: {_fmt(s['short_by'])} "
                         f"{md_escape(spec.inputs[0].unit)} short; clamped "
                         f"{md_escape(_err_text(spec, s['max_error_clamped']))}, extrapolated "
                         f"{md_escape(_err_text(spec, s['max_error_extrapolated']))}")
        lines.append("")
    lines += ["## Replacement", ""]
    r = audit.replacement
    if r:
        lines += [md_escape(r["line"]), "", "```toml", r["spec_toml"].rstrip(), "```", ""]
    else:
        lines += ["None suggested.", ""]
    for n in audit.notes:
        lines.append(f"- note: {md_escape(n)}")
    if plot_name:
        lines += ["", f"![error of {md_escape(audit.name)}]({plot_name})"]
    lines.append("")
    return "\n".join(lines)


def audit_error_plot(audit):
    """PNG bytes: 1-D, the signed error across the span (and beyond it where the firmware
    uses it) with the tolerance band, rows and defects marked; 2-D, the sampled maximum error
    of each cell."""
    import matplotlib
    matplotlib.use("Agg")
    from matplotlib.figure import Figure

    spec, t = audit.spec, audit.table
    f = core_function(spec)
    scale = error_scale(spec.error_kind)
    k = 100.0 if spec.error_kind == "rel" else 1.0
    unit = "%" if spec.error_kind == "rel" else spec.output_unit
    fig = Figure(figsize=(8, 3.8), dpi=100)
    ax = fig.add_subplot(1, 1, 1)
    if isinstance(t, Grid2D):
        A, B = t.axes()
        cm = np.where(np.isfinite(audit.cell_max), audit.cell_max, np.nan) * k
        mesh = ax.pcolormesh(B, A, np.log10(np.maximum(cm, 1e-30)), shading="flat",
                             cmap="viridis")
        cb = fig.colorbar(mesh, ax=ax)
        cb.set_label(f"log10 max error per cell [{unit}]", fontsize=8)
        names = [i.quantity for i in spec.inputs]
        if set(names) == {"pressure", "temperature"}:
            ip = names.index("pressure")
            pin, tin = spec.inputs[ip], spec.inputs[1 - ip]
            P = np.linspace(*(t.box()[ip]), 400)
            psi = P * pin.scale + pin.offset
            plo, phi = Q.SATURATION_RANGE["pressure"]
            ok = (psi >= plo) & (psi <= phi)
            if ok.any():
                ts = (Q.evaluate("saturation_temperature", pressure=psi[ok]) - tin.offset) / tin.scale
                if ip == 0:
                    ax.plot(ts, P[ok], color="w", lw=1.0, ls="--", label="saturation line")
                else:
                    ax.plot(P[ok], ts, color="w", lw=1.0, ls="--", label="saturation line")
                ax.set_xlim(B[0], B[-1])
                ax.set_ylim(A[0], A[-1])
                ax.legend(loc="upper right", fontsize=7)
        ax.set_xlabel(f"{spec.inputs[1].quantity} [{spec.inputs[1].unit}]")
        ax.set_ylabel(f"{spec.inputs[0].quantity} [{spec.inputs[0].unit}]")
        ax.set_title(f"{audit.name}: {spec.arithmetic} bilinear {t.shape[0]} x {t.shape[1]}",
                     fontsize=9)
    else:
        lo, hi = t.lo, t.hi
        a = min(lo, spec.used_min) if spec.used_min is not None else lo
        b = max(hi, spec.used_max) if spec.used_max is not None else hi
        logx = a > 0 and b / a > 20
        x = np.geomspace(a, b, 4001) if logx else np.linspace(a, b, 4001)
        x = np.unique(np.concatenate([x, t.breakpoints()]))
        fx = f(x)
        e = (t(x).astype(np.float64) - fx) / scale(fx) * k
        inside = (x >= lo) & (x <= hi)
        ax.plot(x[inside], e[inside], lw=0.6, color="#1f4e79", label="error of the table")
        if (~inside).any():
            ax.plot(np.where(inside, np.nan, x), np.where(inside, np.nan, e), lw=0.8,
                    color="#d2691e", ls="--", label=f"beyond the span ({spec.out_of_range})")
            if a < lo:
                ax.axvspan(a, lo, color="#f5deb3", alpha=0.5, lw=0)
            if b > hi:
                ax.axvspan(hi, b, color="#f5deb3", alpha=0.5, lw=0)
        if spec.tol_kind is not None:
            ax.axhline(spec.tol_value * k, color="#b22222", lw=1.0, ls="--", label="tolerance")
            ax.axhline(-spec.tol_value * k, color="#b22222", lw=1.0, ls="--")
        if t.rows <= 200:
            for xb in t.row_inputs():
                ax.axvline(xb, color="0.85", lw=0.4)
        xb = t.row_inputs()
        yb = (t.y.astype(np.float64) * (t.scale_out if t.integer else 1.0) - f(xb)) / scale(f(xb)) * k
        row_of = {int(ln): i for i, ln in enumerate(audit.cells.line)}
        for d in audit.findings:
            if d.get("row") in row_of:
                i = row_of[d["row"]]
                ax.plot([xb[i]], [yb[i]], "x", color="#b22222", ms=6)
                ax.annotate(f"row {d['row']}", (xb[i], yb[i]), fontsize=7, color="#b22222",
                            xytext=(3, 3), textcoords="offset points")
        if logx:
            ax.set_xscale("log")
        ax.set_xlabel(f"{spec.inputs[0].quantity} [{spec.inputs[0].unit}]")
        ax.set_ylabel(f"error [{unit}]")
        ax.set_title(f"{audit.name}: {spec.arithmetic} {spec.interpolation}, {t.rows} rows "
                     f"(grey lines)", fontsize=9)
        ax.legend(loc="upper right", fontsize=7)
    fig.tight_layout()
    buf = io.BytesIO()
    fig.savefig(buf, format="png", metadata={"Software": None})
    return buf.getvalue()


def audit_files(audit):
    """{file name: bytes} of an audit's report: report.json, report.md and the error plot."""
    png = f"{audit.name}_audit_error.png"
    return {"report.json": audit_report_json(audit).encode("utf-8"),
            "report.md": audit_report_markdown(audit, png).encode("utf-8"),
            png: audit_error_plot(audit)}
