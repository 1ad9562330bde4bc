"""Reading and checking a TOML spec into plain dataclasses; units become SI maps here only.

A spec names the output set and holds one ``[[table]]`` per generated function::

    name = "plant_steam"            # base name of the output files
    prefix = "plant"                # C symbol prefix
    [[table]]
    name = "tsat"                   # C function plant_tsat
    quantity = "saturation_temperature"
    output_unit = "degC"
    tolerance = { abs = 0.02 }      # in the output unit; or { rel = 1e-4 }
    pressure = { unit = "bar", min = 0.5, max = 16 }

See the README for every key. Every problem raises :class:`SpecError` whose text is one line
naming the file, the table and the key, and what is allowed.

Offers ``load_spec(path)``, ``parse_spec(text, source)``, ``Spec``, ``TableSpec``,
``InputSpec``, ``SpecError``, ``C_KEYWORDS``.
"""

import hashlib
import math
import re

import numpy as np
from dataclasses import dataclass
from pathlib import Path

try:
    import tomllib
except ModuleNotFoundError:  # Python < 3.11
    import tomli as tomllib

from . import quantities as Q
from . import units as U

C_KEYWORDS = frozenset("""auto break case char const continue default do double else enum extern
float for goto if inline int long register restrict return short signed sizeof static struct
switch typedef union unsigned void volatile while _Bool _Complex _Imaginary _Alignas _Alignof
_Atomic _Generic _Noreturn _Static_assert _Thread_local bool true false NULL asm""".split())

_IDENT = re.compile(r"^[A-Za-z_][A-Za-z0-9_]*$")
_FILE_NAME = re.compile(r"^[A-Za-z0-9_][A-Za-z0-9_.-]*$")

ARITHMETIC = ("float32", "float64")
POLICIES = ("clamp", "nan")
GOALS = ("smallest", "fastest")
LAYOUTS = ("free", "uniform", "binade", "closed_form")
DEGREES = (1, 2, 3, 4, 5)
DEFAULT_VERIFY_POINTS = 100_000
MAX_VERIFY_POINTS = 5_000_000

_TOP_KEYS = {"name", "prefix", "description", "table", "verify_points"}
_TABLE_KEYS = {"name", "quantity", "description", "output_unit", "tolerance", "arithmetic",
               "out_of_range", "goal", "degree", "layout", "verify_points", "sensor", "phase"}
_INPUT_KEYS = {"unit", "min", "max", "atmosphere"}
_RELATIVE_KEYS = {"min_above_saturation", "max_above_saturation", "min_below_saturation",
                  "max_below_saturation"}
PHASES = ("vapor", "liquid", "supercritical", "wet")


class SpecError(ValueError):
    """A spec problem; ``str()`` is the one-line message."""


@dataclass(frozen=True)
class InputSpec:
    quantity: str
    unit: str
    lo: float            # in ``unit``
    hi: float
    scale: float         # SI = value * scale + offset (gauge reference included)
    offset: float
    atmosphere: float = None   # SI atmospheric reference when the input is gauge pressure

    def to_si(self, x):
        return x * self.scale + self.offset


@dataclass(frozen=True)
class TableSpec:
    name: str
    function: str
    quantity: str
    description: str
    inputs: tuple
    output_unit: str
    out_scale: float
    out_offset: float
    tol_kind: str         # "abs" (output unit) or "rel" (fraction)
    tol_value: float
    arithmetic: str
    policy: str
    goal: str
    degree: int = None
    layout: str = None
    verify_points: int = DEFAULT_VERIFY_POINTS
    sensor: object = None     # gen.sensor.Sensor feeding the input (two inputs: a dict of
                              # them by input name), or None
    domain: object = None     # gen.fit.grid2d.Domain2D for a two-input table, else None
    phase: str = None

    @property
    def output_kind(self):
        return Q.CATALOGUE[self.quantity].kind


@dataclass(frozen=True)
class Spec:
    source: str           # file name as given (for messages)
    source_name: str      # base name written into outputs
    sha256: str
    name: str
    prefix: str
    description: str
    tables: tuple
    command: str = ""     # how to regenerate, written into outputs (set by the caller)


def _where(source, table=None, key=None):
    s = f"{source}:"
    if table is not None:
        s += f" table {table!r}:"
    if key is not None:
        s += f" key {key!r}:"
    return s


def _err(source, table, key, msg):
    raise SpecError(f"{_where(source, table, key)} {msg}")


def _number(source, table, key, v):
    if isinstance(v, bool) or not isinstance(v, (int, float)) or not math.isfinite(v):
        _err(source, table, key, f"must be a finite number, not {v!r}")
    return float(v)


def _choice(source, table, key, v, allowed):
    if v not in allowed:
        _err(source, table, key, f"must be one of {', '.join(map(str, allowed))}, not {v!r}")
    return v


def _fmt(v):
    return f"{v:.6g}"


def load_spec(path):
    """Read and check the spec file at ``path``."""
    p = Path(path)
    try:
        data = p.read_bytes()
    except OSError as e:
        raise SpecError(f"{path}: cannot read the spec file ({e.strerror})") from None
    return parse_spec(data, str(path))


def parse_spec(data, source="<spec>"):
    """Check spec bytes (or text) and return a :class:`Spec`."""
    if isinstance(data, str):
        data = data.encode("utf-8")
    try:
        text = data.decode("utf-8")
    except UnicodeDecodeError:
        raise SpecError(f"{source}: the spec file is not UTF-8 text") from None
    try:
        doc = tomllib.loads(text)
    except tomllib.TOMLDecodeError as e:
        raise SpecError(f"{source}: TOML syntax error: {e}") from None
    for k in doc:
        if k not in _TOP_KEYS:
            _err(source, None, k, f"unknown key; allowed at top level: {', '.join(sorted(_TOP_KEYS))}")
    name = doc.get("name")
    if not isinstance(name, str) or not _FILE_NAME.match(name) or len(name) > 64:
        _err(source, None, "name", "must be a file base name of letters, digits, '_', '-', '.' "
             f"(at most 64), not {name!r}")
    prefix = doc.get("prefix")
    if not isinstance(prefix, str) or not _IDENT.match(prefix) or prefix in C_KEYWORDS:
        _err(source, None, "prefix", f"must be a C identifier that is not a C keyword, not {prefix!r}")
    if prefix.startswith("__") or (prefix.startswith("_") and prefix[1:2].isupper()):
        _err(source, None, "prefix", "must not start with '__' or '_' and a capital (reserved in C)")
    description = doc.get("description", "")
    if not isinstance(description, str):
        _err(source, None, "description", "must be a string")
    vp = doc.get("verify_points", DEFAULT_VERIFY_POINTS)
    vp = _verify_points(source, None, vp)
    raw_tables = doc.get("table")
    if not isinstance(raw_tables, list) or not raw_tables:
        _err(source, None, "table", "the spec needs at least one [[table]]")
    tables, seen = [], set()
    for i, t in enumerate(raw_tables):
        ts = _table(source, i, t, prefix, vp)
        if ts.name in seen:
            _err(source, ts.name, "name", "is used by two tables; names must be unique")
        seen.add(ts.name)
        tables.append(ts)
    return Spec(source=source, source_name=Path(source).name,
                sha256=hashlib.sha256(data).hexdigest(), name=name, prefix=prefix,
                description=description, tables=tuple(tables))


def _verify_points(source, table, v):
    if isinstance(v, bool) or not isinstance(v, int) or not (1000 <= v <= MAX_VERIFY_POINTS):
        _err(source, table, "verify_points", f"must be a whole number from 1000 to {MAX_VERIFY_POINTS}, not {v!r}")
    return v


def _table(source, index, t, prefix, default_vp):
    if not isinstance(t, dict):
        _err(source, f"#{index + 1}", None, "each [[table]] must be a table of keys")
    tname = t.get("name")
    label = tname if isinstance(tname, str) else f"#{index + 1}"
    if not isinstance(tname, str) or not _IDENT.match(tname):
        _err(source, label, "name", f"must be a C identifier (letters, digits, '_'), not {tname!r}")
    function = f"{prefix}_{tname}"
    if function in C_KEYWORDS or len(function) > 63:
        _err(source, label, "name", f"makes the C name {function!r}, which is not usable")
    qid = t.get("quantity")
    if qid not in Q.CATALOGUE:
        _err(source, label, "quantity", f"unknown quantity {qid!r}; known: {', '.join(sorted(Q.CATALOGUE))}")
    q = Q.CATALOGUE[qid]
    input_names = [n for n in Q.INPUT_KIND if n in t]
    for k in t:
        if k not in _TABLE_KEYS and k not in Q.INPUT_KIND:
            _err(source, label, k, f"unknown key; allowed: {', '.join(sorted(_TABLE_KEYS | set(Q.INPUT_KIND)))}")
    if t.get("phase") == "wet" or q.family == "wet":
        return _table_wet(source, label, t, qid, input_names, function, tname, default_vp)
    match = [tup for tup in q.inputs if set(tup) == set(input_names)]
    if not match:
        want = " or ".join("[" + ", ".join(tup) + "]" for tup in q.inputs)
        _err(source, label, "inputs", f"{qid} takes {want} as input tables; got [{', '.join(input_names)}]")
    order = match[0]
    if q.family != "saturation":
        return _table2d(source, label, t, qid, order, function, tname, default_vp)
    if "phase" in t:
        _err(source, label, "phase", "is for two-input tables; a saturation table has none")
    inputs = tuple(_input(source, label, qid, n, t[n]) for n in order)
    (description, out_unit, oscale, ooffset, kind, value, arithmetic, policy,
     goal) = _common(source, label, t, qid)
    degree = t.get("degree")
    if degree is not None:
        if isinstance(degree, bool) or degree not in DEGREES:
            _err(source, label, "degree", f"must be one of 1, 2, 3, 4, 5, not {degree!r}")
    layout = t.get("layout")
    if layout is not None:
        _choice(source, label, "layout", layout, LAYOUTS)
        if layout == "binade" and inputs[0].lo <= 0:
            _err(source, label, "layout", "binade needs a positive input range (min > 0)")
        if layout == "closed_form" and qid not in ("saturation_temperature", "saturation_pressure"):
            _err(source, label, "layout", "closed_form exists for saturation_temperature and "
                 "saturation_pressure only (IF97's saturation-line equation)")
        if layout == "closed_form" and degree is not None:
            _err(source, label, "degree", "a closed_form has no degree; drop one of the two keys")
    vp = _verify_points(source, label, t.get("verify_points", default_vp))
    sensor = None
    if "sensor" in t:
        from .sensor import SensorError, parse_sensor
        try:
            sensor = parse_sensor(t["sensor"], f"{_where(source, label)} ")
        except SensorError as e:
            raise SpecError(str(e)) from None
    return TableSpec(name=tname, function=function, quantity=qid, description=description,
                     inputs=inputs, output_unit=out_unit, out_scale=oscale, out_offset=ooffset,
                     tol_kind=kind, tol_value=value, arithmetic=arithmetic, policy=policy,
                     goal=goal, degree=degree, layout=layout, verify_points=vp, sensor=sensor)


def _unit(source, label, name, t):
    """(unit, scale, offset) of input ``name`` from its table ``t`` (default: the SI unit)."""
    kind = Q.INPUT_KIND[name]
    unit = t.get("unit", U.DIMENSIONS[kind])
    if not isinstance(unit, str):
        _err(source, label, f"{name}.unit", "must be a unit name string")
    try:
        scale, offset = U.to_si_map(unit, kind)
    except U.UnitError as e:
        _err(source, label, f"{name}.unit", str(e))
    return unit, scale, offset


def _input(source, label, qid, name, t, check_range=True):
    key = name
    if not isinstance(t, dict):
        _err(source, label, key, "must be a table like { unit = \"bar\", min = 1, max = 16 }")
    for k in t:
        if k not in _INPUT_KEYS:
            _err(source, label, f"{key}.{k}", f"unknown key; allowed: {', '.join(sorted(_INPUT_KEYS))}")
    unit, scale, offset = _unit(source, label, name, t)
    for k in ("min", "max"):
        if k not in t:
            _err(source, label, f"{key}.{k}", "is required")
    lo = _number(source, label, f"{key}.min", t["min"])
    hi = _number(source, label, f"{key}.max", t["max"])
    if lo >= hi:
        _err(source, label, f"{key}.min", f"must be below {key}.max (got {_fmt(lo)} >= {_fmt(hi)})")
    atm = None
    if "atmosphere" in t:
        if name != "pressure":
            _err(source, label, f"{key}.atmosphere", "only a pressure input can be gauge pressure")
        try:
            atm = U.parse_quantity(t["atmosphere"], "pressure")
        except U.UnitError as e:
            _err(source, label, f"{key}.atmosphere", str(e))
        if not (50e3 <= atm <= 110e3):
            _err(source, label, f"{key}.atmosphere", f"must be an atmospheric pressure between 50 and 110 kPa, not {_fmt(atm)} Pa")
        offset += atm
    vlo, vhi = Q.input_range(qid, (name,))[name]
    slo, shi = lo * scale + offset, hi * scale + offset
    if check_range and slo < vlo * (1 - 1e-12) or shi > vhi * (1 + 1e-12):
        ulo, uhi = (vlo - offset) / scale, (vhi - offset) / scale
        which = "min" if slo < vlo * (1 - 1e-12) else "max"
        what = "IF97's saturation range (273.15 K up to the critical point)" \
            if Q.CATALOGUE[qid].family == "saturation" else "IF97's validity"
        gauge = " gauge" if atm is not None else ""
        _err(source, label, f"{key}.{which}",
             f"{key} {_fmt(lo)} to {_fmt(hi)} {unit}{gauge} leaves {what}; "
             f"valid: {_fmt(ulo)} to {_fmt(uhi)} {unit}{gauge}")
    return InputSpec(quantity=name, unit=unit, lo=lo, hi=hi, scale=scale, offset=offset,
                     atmosphere=atm)


def _common(source, label, t, qid):
    """Keys every table shares: description, output unit, tolerance, arithmetic, policy, goal."""
    q = Q.CATALOGUE[qid]
    description = t.get("description", "")
    if not isinstance(description, str):
        _err(source, label, "description", "must be a string")
    out_unit = t.get("output_unit", U.DIMENSIONS[q.kind])
    if not isinstance(out_unit, str):
        _err(source, label, "output_unit", "must be a unit name string")
    try:
        oscale, ooffset = U.to_si_map(out_unit, q.kind)
    except U.UnitError as e:
        _err(source, label, "output_unit", str(e))
    tol = t.get("tolerance")
    if not isinstance(tol, dict) or len(tol) != 1 or next(iter(tol)) not in ("abs", "rel"):
        _err(source, label, "tolerance", "must be { abs = X } in the output unit or { rel = X } as a fraction")
    kind, value = next(iter(tol.items()))
    value = _number(source, label, f"tolerance.{kind}", value)
    if value <= 0:
        _err(source, label, f"tolerance.{kind}", f"must be positive, not {_fmt(value)}")
    if kind == "rel" and value >= 0.5:
        _err(source, label, "tolerance.rel", f"is a fraction and must be below 0.5, not {_fmt(value)}")
    arithmetic = _choice(source, label, "arithmetic", t.get("arithmetic", "float32"), ARITHMETIC)
    policy = _choice(source, label, "out_of_range", t.get("out_of_range", "clamp"), POLICIES)
    goal = _choice(source, label, "goal", t.get("goal", "smallest"), GOALS)
    return description, out_unit, oscale, ooffset, kind, value, arithmetic, policy, goal


def _table2d(source, label, t, qid, order, function, tname, default_vp):
    """A two-input table: pressure and a second input on one side of saturation."""
    from .fit.grid2d import DomainError, make_domain
    for k in ("degree", "layout"):
        if k in t:
            _err(source, label, k, "is for one-input tables; a two-input table chooses its grid itself")
    phase = t.get("phase")
    if phase not in PHASES:
        _err(source, label, "phase", f"a two-input table needs phase = one of {', '.join(PHASES)}, not {phase!r}")
    (description, out_unit, oscale, ooffset, kind, value, arithmetic, policy,
     goal) = _common(source, label, t, qid)
    vp = _verify_points(source, label, t.get("verify_points", default_vp))
    pin = _input(source, label, qid, "pressure", t["pressure"], check_range=False)
    second = order[1]
    d = t[second]
    if not isinstance(d, dict):
        _err(source, label, second, "must be a table like { unit = \"degC\", min = 100, max = 300 }")
    for k in d:
        if k not in _INPUT_KEYS - {"atmosphere"} and k not in _RELATIVE_KEYS:
            _err(source, label, f"{second}.{k}", f"unknown key; allowed: "
                 f"{', '.join(sorted((_INPUT_KEYS - {'atmosphere'}) | _RELATIVE_KEYS))}")
    vunit, vscale, voffset = _unit(source, label, second, d)
    # the limit nearest saturation ("near") and the other one ("far"): a key for a distance
    # from saturation, or an absolute one, for each
    ends = {"vapor": (("min_above_saturation", "min"), ("max_above_saturation", "max")),
            "liquid": (("min_below_saturation", "max"), ("max_below_saturation", "min")),
            "supercritical": ((None, "min"), (None, "max"))}[phase]
    allowed = {k for pair in ends for k in pair if k}
    for k in d:
        if k in _RELATIVE_KEYS and k not in allowed:
            _err(source, label, f"{second}.{k}", f"does not fit phase = {phase!r}; use "
                 f"{' or '.join(sorted(allowed & _RELATIVE_KEYS)) or 'absolute min and max'}")

    def limit(rel_key, abs_key):
        if rel_key and rel_key in d:
            if abs_key in d:
                _err(source, label, f"{second}.{abs_key}", f"give {abs_key} or {rel_key}, not both")
            v = _number(source, label, f"{second}.{rel_key}", d[rel_key])
            if v < 0:
                _err(source, label, f"{second}.{rel_key}", f"is a distance from saturation and "
                     f"must be >= 0, not {_fmt(v)}")
            return v, True
        if abs_key not in d:
            _err(source, label, f"{second}.{abs_key}", "is required"
                 + (f" (or {rel_key})" if rel_key else ""))
        return _number(source, label, f"{second}.{abs_key}", d[abs_key]), False

    (near, near_rel), (far, far_rel) = limit(*ends[0]), limit(*ends[1])
    if near_rel and far_rel and not near < far:
        _err(source, label, f"{second}.{ends[0][0]}", f"must be below {ends[1][0]} "
             f"(got {_fmt(near)} >= {_fmt(far)})")
    if not near_rel and not far_rel:
        lo_, hi_ = (near, far) if phase != "liquid" else (far, near)
        if not lo_ < hi_:
            _err(source, label, f"{second}.min", f"must be below {second}.max "
                 f"(got {_fmt(lo_)} >= {_fmt(hi_)})")
    lo = float(d.get("min", np.nan)) if "min" in d else np.nan
    hi = float(d.get("max", np.nan)) if "max" in d else np.nan
    try:
        dom = make_domain(qid, phase, pin.lo, pin.hi, near, far, near_rel=near_rel,
                          far_rel=far_rel, second=second, p_unit=pin.unit, v_unit=vunit,
                          out_unit=out_unit)
    except DomainError as e:
        _err(source, label, second, str(e))
    vin = InputSpec(quantity=second, unit=vunit, lo=lo, hi=hi, scale=vscale, offset=voffset)
    return TableSpec(name=tname, function=function, quantity=qid, description=description,
                     inputs=(pin, vin), output_unit=out_unit, out_scale=oscale,
                     out_offset=ooffset, tol_kind=kind, tol_value=value,
                     arithmetic=arithmetic, policy=policy, goal=goal, verify_points=vp,
                     domain=dom, phase=phase,
                     sensor=_sensors(source, label, t, ("pressure", second)))


def _sensors(source, label, t, inputs):
    """The optional per-input sensors of a two-input table, or None."""
    if "sensor" not in t:
        return None
    from .sensor import SensorError, parse_sensors
    try:
        return parse_sensors(t["sensor"], f"{_where(source, label)} ", list(inputs))
    except SensorError as e:
        raise SpecError(str(e)) from None


def _table_wet(source, label, t, qid, input_names, function, tname, default_vp):
    """A wet-steam table: quality or a mixture property from pressure and specific enthalpy
    (or entropy); its second input's range is the two-phase dome itself."""
    from .wet import OUTPUTS, P_WET_MAX
    if t.get("phase", "wet") != "wet":
        _err(source, label, "phase", f"{qid} is a wet-steam quantity: phase must be 'wet', "
             f"not {t['phase']!r}")
    if qid not in OUTPUTS:
        _err(source, label, "quantity", f"a wet-steam table gives one of "
             f"{', '.join(sorted(OUTPUTS))}, not {qid!r}")
    for k in ("degree", "layout"):
        if k in t:
            _err(source, label, k, "is for one-input tables; a wet-steam table chooses its "
                 "saturation tables itself")
    want = [["pressure", "specific_enthalpy"], ["pressure", "specific_entropy"]]
    if sorted(input_names) not in [sorted(w) for w in want]:
        _err(source, label, "inputs", f"wet steam takes [pressure, specific_enthalpy] or "
             f"[pressure, specific_entropy] as input tables; got [{', '.join(input_names)}]")
    second = next(n for n in input_names if n != "pressure")
    if qid == "specific_enthalpy" and second == "specific_enthalpy" or \
            qid == "specific_entropy" and second == "specific_entropy":
        _err(source, label, "quantity", f"{qid} is the input itself; choose another output")
    (description, out_unit, oscale, ooffset, kind, value, arithmetic, policy,
     goal) = _common(source, label, t, qid)
    if qid == "quality" and kind != "abs":
        _err(source, label, "tolerance", "quality runs from 0 to 1: give { abs = X } "
             "(0.001 is a tenth of a percent of steam), not a relative tolerance")
    if qid == "quality" and value >= 0.1:
        _err(source, label, "tolerance.abs", f"must be below 0.1 for quality, not {_fmt(value)}")
    vp = _verify_points(source, label, t.get("verify_points", default_vp))
    pin = _input(source, label, qid, "pressure", t["pressure"])
    hi_si = pin.hi * pin.scale + pin.offset
    if hi_si > P_WET_MAX * (1 + 1e-12):
        gauge = " gauge" if pin.atmosphere is not None else ""
        _err(source, label, "pressure.max", f"{_fmt(pin.hi)} {pin.unit}{gauge} is too close "
             f"to the critical point for wet steam (quality is ill-conditioned there); "
             f"valid: {_fmt(Q.P_SAT_MIN)} to {_fmt(P_WET_MAX)} Pa, i.e. up to "
             f"{_fmt((P_WET_MAX - pin.offset) / pin.scale)} {pin.unit}{gauge}")
    d = t[second]
    if not isinstance(d, dict):
        _err(source, label, second, "must be a table like { unit = \"kJ/kg\" }")
    for k in d:
        if k != "unit":
            _err(source, label, f"{second}.{k}", "a wet-steam table takes only 'unit' here: "
                 "its range is the dome itself (saturated liquid to saturated vapour at each "
                 "pressure)")
    vunit, vscale, voffset = _unit(source, label, second, d)
    p = np.linspace(pin.lo, pin.hi, 257) * pin.scale + pin.offset
    side = "enthalpy" if second == "specific_enthalpy" else "entropy"
    a_lo = float(np.min(Q.evaluate(f"saturated_liquid_{side}", pressure=p)))
    a_hi = float(np.max(Q.evaluate(f"saturated_vapor_{side}", pressure=p)))
    vin = InputSpec(quantity=second, unit=vunit, lo=(a_lo - voffset) / vscale,
                    hi=(a_hi - voffset) / vscale, scale=vscale, offset=voffset)
    return TableSpec(name=tname, function=function, quantity=qid, description=description,
                     inputs=(pin, vin), output_unit=out_unit, out_scale=oscale,
                     out_offset=ooffset, tol_kind=kind, tol_value=value,
                     arithmetic=arithmetic, policy=policy, goal=goal, verify_points=vp,
                     phase="wet", sensor=_sensors(source, label, t, ("pressure", second)))
