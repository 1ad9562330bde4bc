"""Units: parsing unit names and quantities with pint, and the linear map to SI.

pint is used because unit strings come from people ("bar", "degC", "kJ/(kg*K)", "psi") and the
offset units (degC, degF) and gauge pressure are easy to get subtly wrong by hand.

Offers
    ``DIMENSIONS``               SI unit of each kind of quantity
    ``to_si_map(unit, kind)``    (scale, offset) with SI = value * scale + offset
    ``parse_quantity(text, kind)`` "10 bar" -> value in SI
    ``UnitError``                raised with a one-line message
"""

import functools

#: kind -> SI unit the core uses
DIMENSIONS = {
    "pressure": "Pa",
    "temperature": "K",
    "density": "kg/m^3",
    "specific_volume": "m^3/kg",
    "specific_energy": "J/kg",
    "specific_entropy": "J/(kg*K)",
    "speed": "m/s",
    "dimensionless": "",
    "dynamic_viscosity": "Pa*s",
    "thermal_conductivity": "W/(m*K)",
    "surface_tension": "N/m",
}


class UnitError(ValueError):
    """A unit that pint does not know or that does not fit the quantity."""


@functools.lru_cache(maxsize=None)
def _registry():
    import pint
    return pint.UnitRegistry(autoconvert_offset_to_baseunit=True)


@functools.lru_cache(maxsize=None)
def to_si_map(unit, kind):
    """(scale, offset) such that SI = value * scale + offset for values in ``unit``."""
    ureg = _registry()
    si = DIMENSIONS[kind]
    try:
        u = ureg.Unit(unit) if unit else ureg.dimensionless
        target = ureg.Unit(si) if si else ureg.dimensionless
    except Exception:
        raise UnitError(f"unknown unit {unit!r}") from None
    if u.dimensionality != target.dimensionality:
        raise UnitError(f"unit {unit!r} is not a unit of {kind.replace('_', ' ')} "
                        f"(expected something like {si or '1'})")
    q0 = ureg.Quantity(0.0, u).to(target).magnitude
    q1 = ureg.Quantity(1.0, u).to(target).magnitude
    return float(q1 - q0), float(q0)


def parse_quantity(text, kind):
    """Parse "10 bar" or "180 degC" into an SI value; a bare number is taken as SI."""
    s = str(text).strip()
    try:
        return float(s)
    except ValueError:
        pass
    parts = s.split(None, 1)
    if len(parts) != 2:
        raise UnitError(f"cannot read {text!r}: write a number and a unit, e.g. '10 bar'")
    try:
        value = float(parts[0])
    except ValueError:
        raise UnitError(f"cannot read {text!r}: {parts[0]!r} is not a number") from None
    scale, offset = to_si_map(parts[1].strip(), kind)
    return value * scale + offset


def from_si(value, unit, kind):
    scale, offset = to_si_map(unit, kind)
    return (value - offset) / scale
