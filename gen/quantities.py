"""The catalogue: every property a user can ask for, and the one entry point to the core.

``evaluate(quantity, **inputs)`` takes and returns SI units (Pa, K, kg/m^3, J/kg, J/(kg K), m/s,
Pa s, W/(m K), N/m); numpy arrays broadcast, scalars work.

Out-of-range points raise :class:`OutOfRange` by default, with a message naming the variable, the
value and the valid range. With ``mask=True`` they give NaN instead (nothing is raised).

Single-phase quantities take ``phase="liquid"`` or ``"vapor"`` for points on the saturation line.

Offers
    ``CATALOGUE``          id -> :class:`Quantity`
    ``evaluate(quantity, *, mask=False, phase=None, **inputs)``
    ``input_range(quantity, inputs)``  SI validity box of the inputs
    ``OutOfRange``
"""

from dataclasses import dataclass

import numpy as np

from .if97 import constants as K


class OutOfRange(ValueError):
    """A state outside the validity range of the formulation."""


@dataclass(frozen=True)
class Quantity:
    id: str
    kind: str            # unit kind of the output (see gen.units.DIMENSIONS)
    inputs: tuple        # allowed input tuples, e.g. (("pressure",), ("temperature",))
    text: str            # plain description
    family: str          # "saturation", "single_phase", "backward"


_SAT_IN = (("pressure",), ("temperature",))
_PT = (("pressure", "temperature"),)

CATALOGUE = {q.id: q for q in [
    Quantity("saturation_temperature", "temperature", (("pressure",),),
             "saturation temperature", "saturation"),
    Quantity("saturation_pressure", "pressure", (("temperature",),),
             "saturation pressure", "saturation"),
    Quantity("saturated_liquid_density", "density", _SAT_IN,
             "density of saturated liquid", "saturation"),
    Quantity("saturated_vapor_density", "density", _SAT_IN,
             "density of saturated vapour", "saturation"),
    Quantity("saturated_liquid_enthalpy", "specific_energy", _SAT_IN,
             "specific enthalpy of saturated liquid", "saturation"),
    Quantity("saturated_vapor_enthalpy", "specific_energy", _SAT_IN,
             "specific enthalpy of saturated vapour", "saturation"),
    Quantity("latent_heat", "specific_energy", _SAT_IN,
             "latent heat of vaporization (h'' - h')", "saturation"),
    Quantity("saturated_liquid_entropy", "specific_entropy", _SAT_IN,
             "specific entropy of saturated liquid", "saturation"),
    Quantity("saturated_vapor_entropy", "specific_entropy", _SAT_IN,
             "specific entropy of saturated vapour", "saturation"),
    Quantity("saturated_liquid_volume", "specific_volume", _SAT_IN,
             "specific volume of saturated liquid", "saturation"),
    Quantity("saturated_vapor_volume", "specific_volume", _SAT_IN,
             "specific volume of saturated vapour", "saturation"),
    Quantity("surface_tension", "surface_tension", _SAT_IN,
             "surface tension of water against its vapour", "saturation"),
    Quantity("density", "density", _PT, "density", "single_phase"),
    Quantity("specific_volume", "specific_volume", _PT, "specific volume", "single_phase"),
    Quantity("specific_enthalpy", "specific_energy", _PT, "specific enthalpy", "single_phase"),
    Quantity("specific_entropy", "specific_entropy", _PT, "specific entropy", "single_phase"),
    Quantity("specific_internal_energy", "specific_energy", _PT, "specific internal energy",
             "single_phase"),
    Quantity("isobaric_heat_capacity", "specific_entropy", _PT,
             "specific isobaric heat capacity", "single_phase"),
    Quantity("isochoric_heat_capacity", "specific_entropy", _PT,
             "specific isochoric heat capacity", "single_phase"),
    Quantity("speed_of_sound", "speed", _PT, "speed of sound", "single_phase"),
    Quantity("isentropic_exponent", "dimensionless", _PT, "isentropic exponent",
             "single_phase"),
    Quantity("dynamic_viscosity", "dynamic_viscosity", _PT, "dynamic viscosity",
             "single_phase"),
    Quantity("thermal_conductivity", "thermal_conductivity", _PT, "thermal conductivity",
             "single_phase"),
    Quantity("temperature", "temperature",
             (("pressure", "specific_enthalpy"), ("pressure", "specific_entropy")),
             "temperature (backward)", "backward"),
    Quantity("quality", "dimensionless",
             (("pressure", "specific_enthalpy"), ("pressure", "specific_entropy")),
             "quality (vapour mass fraction, 0 to 1)", "wet"),
]}

#: input kind of each input name
INPUT_KIND = {"pressure": "pressure", "temperature": "temperature",
              "specific_enthalpy": "specific_energy", "specific_entropy": "specific_entropy"}

#: single-phase property key in the core's property dictionaries
_PROP_KEY = {"density": "rho", "specific_volume": "v", "specific_enthalpy": "h",
             "specific_entropy": "s", "specific_internal_energy": "u",
             "isobaric_heat_capacity": "cp", "isochoric_heat_capacity": "cv",
             "speed_of_sound": "w", "isentropic_exponent": "kappa",
             "dynamic_viscosity": "mu", "thermal_conductivity": "lambda"}

_SAT_KEY = {"saturated_liquid_density": ("liquid", "rho"),
            "saturated_vapor_density": ("vapor", "rho"),
            "saturated_liquid_enthalpy": ("liquid", "h"),
            "saturated_vapor_enthalpy": ("vapor", "h"),
            "saturated_liquid_entropy": ("liquid", "s"),
            "saturated_liquid_volume": ("liquid", "v"),
            "saturated_vapor_volume": ("vapor", "v"),
            "saturated_vapor_entropy": ("vapor", "s")}

def _p_sat(T):
    from .if97 import region4
    return float(region4.saturation_pressure(T))


P_SAT_MIN = _p_sat(K.T_MIN)  # p_sat(273.15 K) = 611.2127 Pa (IAPWS R7-97(2012) eq. 30)
#: eq. 30 at TC gives 22.064 MPa + 0.3 mPa: the pressure limit is the larger of the two, so that
#: p_sat(TC) and PC are both inside
P_SAT_MAX = max(K.PC, _p_sat(K.TC))

#: SI validity of saturation inputs (IF97 region 4: 273.15 K to the critical point)
SATURATION_RANGE = {"pressure": (P_SAT_MIN, P_SAT_MAX), "temperature": (K.T_MIN, K.TC)}

#: lines where the core switches equations along saturation (a breakpoint goes there):
#: 623.15 K, the region 1|3 and 2|3 split, and its saturation pressure (R7-97(2012) eq. 30)
SATURATION_SWITCH = {"temperature": K.T_13, "pressure": _p_sat(K.T_13)}


def on_upper_equation(name, si):
    """True where the core evaluates a saturation state with the region-3 equation
    (saturation temperature above 623.15 K); ``name`` is the input, ``si`` its SI values."""
    from .if97 import core
    si = np.asarray(si, dtype=np.float64)
    T = si if name == "temperature" else core.saturation_temperature(si)
    return T > K.T_13


def input_range(quantity, names):
    """SI (lo, hi) of each input of ``quantity`` (a box; single phase needs more checks)."""
    q = CATALOGUE[quantity]
    if q.family == "saturation":
        return {n: SATURATION_RANGE[n] for n in names}
    if q.family == "wet":
        return {n: SATURATION_RANGE.get(n, (-np.inf, np.inf)) for n in names}
    box = {"pressure": (0.0, K.P_MAX), "temperature": (K.T_MIN, K.T_MAX)}
    return {n: box.get(n, (-np.inf, np.inf)) for n in names}


def _fmt(v):
    return f"{v:.9g}"


#: relative slack at the ends of a saturation range: values within it are taken as the end
#: (eq. 30 and eq. 31 map the ends onto each other only to round-off)
END_SLACK = 1e-12


def _check_range(name, value, lo, hi, mask):
    v = np.asarray(value, dtype=np.float64)
    bad = ~((v >= lo * (1 - END_SLACK)) & (v <= hi * (1 + END_SLACK)))
    if not mask and np.any(bad):
        first = v[bad].flat[0] if v.ndim else float(v)
        unit = {"pressure": "Pa", "temperature": "K"}.get(name, "SI")
        raise OutOfRange(f"{name} = {_fmt(first)} {unit} is outside the valid range "
                         f"{_fmt(lo)} to {_fmt(hi)} {unit}")
    return bad


def _saturation(quantity, inputs, mask):
    from .if97 import core
    (name, value), = inputs.items()
    lo, hi = SATURATION_RANGE[name]
    x = np.asarray(value, dtype=np.float64)
    bad = _check_range(name, x, lo, hi, mask)
    xs = np.where(bad, lo, np.clip(x, lo, hi))
    if quantity == "saturation_temperature":
        out = core.saturation_temperature(xs)
    elif quantity == "saturation_pressure":
        out = core.saturation_pressure(xs)
    else:
        T = xs if name == "temperature" else core.saturation_temperature(xs)
        if quantity == "surface_tension":
            out = core.surface_tension(T)
        else:
            liq, vap = core.saturated_states(T)
            if quantity == "latent_heat":
                out = vap["h"] - liq["h"]
            else:
                side, key = _SAT_KEY[quantity]
                out = (liq if side == "liquid" else vap)[key]
    out = np.where(bad, np.nan, out)
    return out[()] if np.ndim(out) == 0 else out


def _quality(p, inputs, mask):
    from .if97 import core
    if "specific_enthalpy" in inputs:
        name, a, unit = "specific_enthalpy", inputs["specific_enthalpy"], "J/kg"
        x = core.quality_ph(p, a)
    else:
        name, a, unit = "specific_entropy", inputs["specific_entropy"], "J/(kg K)"
        x = core.quality_ps(p, a)
    if not mask and np.any(np.isnan(x)):
        pb, ab = np.broadcast_arrays(p, np.asarray(a, dtype=np.float64))
        i = np.flatnonzero(np.isnan(np.asarray(x)).ravel())[0]
        raise OutOfRange(f"{name} = {_fmt(ab.ravel()[i])} {unit} at pressure = "
                         f"{_fmt(pb.ravel()[i])} Pa is not wet steam (outside the two-phase "
                         f"region between saturated liquid and vapour, which ends below "
                         f"{_fmt(K.PC)} Pa)")
    return x[()] if np.ndim(x) == 0 else x


def evaluate(quantity, *, mask=False, phase=None, **inputs):
    """Evaluate ``quantity`` of the core at the given SI inputs (see module docstring)."""
    if quantity not in CATALOGUE:
        raise KeyError(f"unknown quantity {quantity!r}; known: {', '.join(sorted(CATALOGUE))}")
    q = CATALOGUE[quantity]
    names = tuple(inputs)
    if not any(set(names) == set(t) for t in q.inputs):
        want = " or ".join("(" + ", ".join(t) + ")" for t in q.inputs)
        raise TypeError(f"{quantity} takes {want}, not ({', '.join(names)})")
    try:
        return _evaluate(q, quantity, inputs, mask, phase)
    except OutOfRange:
        raise
    except ValueError as e:
        # the core's own range checks: same class and one readable line
        raise OutOfRange(" ".join(str(e).split())) from None


def _evaluate(q, quantity, inputs, mask, phase):
    if q.family == "saturation":
        return _saturation(quantity, inputs, mask)
    from .if97 import core
    p = np.asarray(inputs["pressure"], dtype=np.float64)
    if q.family == "wet":
        return _quality(p, inputs, mask)
    if q.family == "backward":
        if "specific_enthalpy" in inputs:
            out = core.temperature_ph(p, inputs["specific_enthalpy"], mask=mask)
        else:
            out = core.temperature_ps(p, inputs["specific_entropy"], mask=mask)
        return out[()] if np.ndim(out) == 0 else out
    T = np.asarray(inputs["temperature"], dtype=np.float64)
    props = core.props_pT(p, T, phase=phase, mask=mask,
                          transport=quantity in ("dynamic_viscosity", "thermal_conductivity"))
    out = props[_PROP_KEY[quantity]]
    return out[()] if np.ndim(out) == 0 else out
