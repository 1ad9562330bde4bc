"""The target arithmetic of a wet-steam function, operation by operation.

This module is the single definition of what an emitted wet-steam function computes; the C
template ``templates/c_wet.j2`` spells the same steps in the same order. It needs numpy and the
one-input run time (:mod:`gen.arith`) for its saturation tables. The generated Python module
carries this source verbatim after that of ``gen/arith.py``; the import below then finds the
one-input functions in the module itself.

Offers
    ``SUBCOOLED``, ``SUPERHEATED``   status: the point lies outside the two-phase dome
    ``quality_wet(p, a, tab)``      run-time pressure (clamped) and quality (not clamped)
    ``evaluate_wet(p, a, tab)``     the whole function: policy, quality, output
    ``status_wet(p, a, tab)``       the status code of the ``NAME_status`` variant

``tab`` is a plain dict (see ``gen.wet.WetTable.runtime``): ``fmt``, ``policy`` (``clamp`` or
``nan``), ``combine`` (what the output is), ``p_lo``/``p_hi`` and the keyword arguments of
:func:`gen.arith.evaluate` for each one-input saturation table of pressure: ``liq``/``vap``
(the input's saturated-liquid and saturated-vapour values a'(p), a''(p)), and ``out_liq``/
``out_vap`` (b'(p), b''(p)) or ``tsat`` where the output needs them.

Run-time steps, each rounded to the format, in this order: NaN in either input gives NaN out;
p is clamped to [p_lo, p_hi]; al = a'(p); av = a''(p); x = (a - al) / (av - al); the status is
SUBCOOLED where x < 0 and SUPERHEATED where x > 1 (for a pressure inside its range), and x is
clamped to [0, 1]; then by ``combine``:
``quality`` y = x; ``lever`` y = bl + x*(bv - bl); ``inverse_lever`` w = bl + x*(bv - bl),
y = 1 / w; ``saturation`` y = tsat(p). With policy ``nan`` every status but IN_RANGE gives NaN.
"""

import numpy as np

try:
    from . import arith as _one
except ImportError:
    # inside a generated module: the one-input run time was defined just above, in this file
    import types
    _one = types.SimpleNamespace(**globals())

#: status codes: the point is compressed liquid (x < 0) or superheated vapour (x > 1)
SUBCOOLED = 5
SUPERHEATED = 6

COMBINES = ("quality", "lever", "inverse_lever", "saturation")


def _wet_inputs(p, a, fmt):
    ft = _one.FORMATS[fmt]
    p, a = np.broadcast_arrays(np.atleast_1d(np.asarray(p).astype(ft)),
                               np.atleast_1d(np.asarray(a).astype(ft)))
    return p.ravel(), a.ravel()


def _wet_table(pc, kw):
    return _one.evaluate(pc, **kw).reshape(pc.shape)


def quality_wet(p, a, tab, fused=False):
    """(p, a, clamped p, quality x before clamping, NaN-in mask), flattened, in the format."""
    ft = _one.FORMATS[tab["fmt"]]
    p, a = _wet_inputs(p, a, tab["fmt"])
    nan_in = np.isnan(p) | np.isnan(a)
    lo, hi = ft(tab["p_lo"]), ft(tab["p_hi"])
    pc = np.where(nan_in, lo, p)
    pc = np.where(pc < lo, lo, np.where(pc > hi, hi, pc)).astype(ft)
    liq = dict(tab["liq"], fused=fused)
    vap = dict(tab["vap"], fused=fused)
    al = _wet_table(pc, liq)
    av = _wet_table(pc, vap)
    with np.errstate(invalid="ignore", divide="ignore", over="ignore"):
        x = ((a - al).astype(ft) / (av - al).astype(ft)).astype(ft)
    return p, a, pc, x, nan_in


def evaluate_wet(p, a, tab, fused=False):
    """The emitted function's value at (p, a), exactly as the target computes it.
    ``fused=True`` models a compiler that contracts ``x*(bv - bl) + bl`` (and the tables'
    multiply-adds) into fused operations (float32 only)."""
    fmt = tab["fmt"]
    ft = _one.FORMATS[fmt]
    p, a, pc, x, nan_in = quality_wet(p, a, tab, fused)
    xc = np.where(x < 0, ft(0), np.where(x > 1, ft(1), x)).astype(ft)
    combine = tab["combine"]
    if combine == "quality":
        y = xc
    elif combine == "saturation":
        y = _wet_table(pc, dict(tab["tsat"], fused=fused))
    else:
        bl = _wet_table(pc, dict(tab["out_liq"], fused=fused))
        bv = _wet_table(pc, dict(tab["out_vap"], fused=fused))
        d = (bv - bl).astype(ft)
        if fused and fmt == "float32":
            y = (xc.astype(np.float64) * d + bl).astype(ft)
        else:
            y = ((xc * d).astype(ft) + bl).astype(ft)
        if combine == "inverse_lever":
            with np.errstate(divide="ignore"):
                y = (ft(1) / y).astype(ft)
    if tab["policy"] == "nan":
        out = (p < ft(tab["p_lo"])) | (p > ft(tab["p_hi"])) | (x < 0) | (x > 1)
        y = np.where(out, ft(np.nan), y)
    return np.where(nan_in, ft(np.nan), y).astype(ft)


def status_wet(p, a, tab):
    """NOT_A_NUMBER, BELOW or ABOVE (the pressure), SUBCOOLED or SUPERHEATED (outside the
    dome, as the run time sees it), else IN_RANGE; the first that applies, in this order."""
    ft = _one.FORMATS[tab["fmt"]]
    p, a, pc, x, nan_in = quality_wet(p, a, tab)
    st = np.full(p.shape, _one.IN_RANGE, dtype=np.int64)
    st = np.where(x > 1, SUPERHEATED, st)
    st = np.where(x < 0, SUBCOOLED, st)
    st = np.where(p > ft(tab["p_hi"]), _one.ABOVE, st)
    st = np.where(p < ft(tab["p_lo"]), _one.BELOW, st)
    return np.where(nan_in, _one.NOT_A_NUMBER, st)
