"""Checking a computed value against a number as a release's verification table prints it."""

from decimal import Decimal

import numpy as np


def half_unit(printed):
    """Half a unit of the last printed digit of a value printed like '0.353658941e-2'."""
    return 0.5 * 10.0 ** Decimal(printed).as_tuple().exponent


def assert_printed(value, printed, unit=1.0):
    """``value / unit`` rounds to the string ``printed`` (``unit``: SI size of the printed
    unit, e.g. 1e6 for MPa). The 1e-12 relative slack is for the binary representation of the
    printed number itself."""
    v = float(np.asarray(value)) / unit
    ref = float(printed)
    tol = half_unit(printed) * (1 + 1e-9) + 1e-12 * abs(ref)
    assert abs(v - ref) <= tol, f"{v!r} does not round to printed {printed} (tol {tol:.3g})"
