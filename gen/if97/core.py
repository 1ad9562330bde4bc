"""The core's front door: IF97 properties by state, with region dispatch, in SI units.

Offers
    ``saturation_pressure(T)``, ``saturation_temperature(p)``, ``dpsat_dT(T)``
    ``saturated_states(T)`` -> (liquid dict, vapour dict) along saturation up to TC
    ``props_pT(p, T, phase=None, mask=False, transport=False)`` -> dict incl. ``region``
    ``temperature_ph(p, h, mask=False)``, ``temperature_ps(p, s, mask=False)``
    ``quality_ph(p, h)``  vapour mass fraction in the wet region, NaN outside it
    ``mixture_T(T, x)``, ``mixture_p(p, x)``  wet-steam v, rho, u, h, s from quality
    ``surface_tension(T)``

Property dictionaries use the keys of :mod:`gen.if97.props`, plus ``mu`` (Pa s) and
``lambda`` (W/(m K)) when ``transport=True``.

Along saturation below 623.15 K the liquid is region 1 and the vapour region 2; from 623.15 K to
TC both are region 3 at the densities where p(rho, T) equals the region-4 saturation pressure.
"""

import numpy as np

from . import region1, region2, region3, region4, region5, regions, transport
from . import region3_backward as r3b
from .constants import P_MAX, PC, T_13, T_MAX, T_MAX_25, TC
from .props import KEYS

saturation_pressure = region4.saturation_pressure
saturation_temperature = region4.saturation_temperature
dpsat_dT = region4.dpsat_dT
surface_tension = transport.surface_tension

#: relative tolerance within which a (p, h) or (p, s) on a region 1|3 or 2|3 boundary value is
#: taken as the region 1 or 2 state
BOUNDARY_SLACK = 1e-11

#: saturation pressure at 623.15 K, Pa (where the region-3 part of the saturation line starts)
P_13 = float(region4.saturation_pressure(T_13))


def _merge(parts, shape):
    """Combine {key: values-on-subset} dicts from several masks into full arrays of the
    property keys (``props.KEYS``; NaN where no part has a value)."""
    out = {k: np.full(shape, np.nan) for k in KEYS}
    for m, d in parts:
        for k in KEYS:
            out[k][m] = d[k]
    return out


def saturated_states(T):
    """Saturated liquid and vapour property dicts at temperature(s) ``T`` (273.15 K to TC)."""
    T = np.asarray(T, dtype=np.float64)
    shape = T.shape
    Tf = np.atleast_1d(T).ravel()
    low = Tf <= T_13
    high = ~low
    liq_parts, vap_parts = [], []
    if low.any():
        t = Tf[low]
        p = region4.saturation_pressure(t)
        liq_parts.append((low, region1.props(p, t)))
        vap_parts.append((low, region2.props(p, t)))
    if high.any():
        t = Tf[high]
        rl, rv = r3b.saturated_densities(t)
        liq_parts.append((high, region3.props_rhoT(rl, t)))
        vap_parts.append((high, region3.props_rhoT(rv, t)))
    n = Tf.shape
    liq = {k: v.reshape(shape) for k, v in _merge(liq_parts, n).items()}
    vap = {k: v.reshape(shape) for k, v in _merge(vap_parts, n).items()}
    return liq, vap


def props_pT(p, T, phase=None, mask=False, transport=False):
    """Single-phase properties at (p, T); raises on invalid points unless ``mask``."""
    p, T = np.broadcast_arrays(np.asarray(p, dtype=np.float64), np.asarray(T, dtype=np.float64))
    shape = p.shape
    pf, Tf = p.ravel(), T.ravel()
    if not mask:
        regions.check_pT(pf, Tf)
    reg = regions.region_pT(pf, Tf, phase=phase)
    parts = []
    for r, fn in ((1, region1.props), (2, region2.props), (5, region5.props)):
        m = reg == r
        if m.any():
            parts.append((m, fn(pf[m], Tf[m])))
    m3 = reg == 3
    if m3.any():
        parts.append((m3, r3b.props_pT(pf[m3], Tf[m3], phase=phase)))
    out = _merge(parts, pf.shape)
    if transport:
        out["mu"] = transport_viscosity(out["rho"], Tf)
        out["lambda"] = transport_conductivity(out["rho"], Tf, out["cp"], out["cv"],
                                               out["drhodp"])
    out["region"] = reg.astype(float)
    return {k: v.reshape(shape) for k, v in out.items()}


def transport_viscosity(rho, T):
    return transport.viscosity(rho, T)


def transport_conductivity(rho, T, cp, cv, drhodp):
    return transport.thermal_conductivity(rho, T, cp, cv, drhodp)


def _backward(p, y, key, mask):
    """Temperature from (p, h) or (p, s): region by comparison with boundary values."""
    p, y = np.broadcast_arrays(np.asarray(p, dtype=np.float64), np.asarray(y, dtype=np.float64))
    shape = p.shape
    pf, yf = p.ravel().copy(), y.ravel().copy()
    out = np.full(pf.shape, np.nan)
    ok = (pf > 0) & (pf <= P_MAX) & np.isfinite(yf)
    # boundary values of y along the region limits
    Ts = np.where(ok & (pf <= PC),
                  region4.saturation_temperature(np.clip(pf, 611.212677, PC)), np.nan)
    y_min = region1.props(np.where(ok, pf, 1e5), np.full(pf.shape, 273.15))[key]
    y_max = region2.props(np.where(ok, pf, 1e5), np.full(pf.shape, T_MAX_25))[key]
    ok &= (yf >= y_min - BOUNDARY_SLACK * np.abs(y_min)) & (yf <= y_max * (1 + BOUNDARY_SLACK))
    below13 = ok & (pf <= P_13)
    # below 16.53 MPa: 1 | two-phase | 2 split by the saturated states
    if below13.any():
        liq, vap = saturated_states(Ts[below13])
        yl, yv = liq[key], vap[key]
        sub = np.nonzero(below13)[0]
        r1 = yf[sub] <= yl
        r2 = yf[sub] >= yv
        wet = ~r1 & ~r2
        fn1 = region1.temperature_ph if key == "h" else region1.temperature_ps
        fn2 = region2.temperature_ph if key == "h" else region2.temperature_ps
        if r1.any():
            out[sub[r1]] = fn1(pf[sub[r1]], yf[sub[r1]])
        if r2.any():
            out[sub[r2]] = fn2(pf[sub[r2]], yf[sub[r2]])
        out[sub[wet]] = Ts[sub[wet]]
    above = ok & (pf > P_13)
    if above.any():
        sub = np.nonzero(above)[0]
        ps = pf[sub]
        y13 = region1.props(ps, np.full(ps.shape, T_13))[key]
        from .b23 import b23_temperature
        tb = b23_temperature(ps)
        y23 = region2.props(ps, tb)[key]
        # ties within round-off of a boundary value go to region 1 or 2, whose equations
        # define the boundary state (IF97 is not exactly continuous there: region 3 would
        # give a T a few mK off, outside region 3). The slack covers the round-off of h or s
        # (~1e-14 relative, cancelling near 623.15 K) and of inverting B23 (up to ~2e-10 K at its
        # low-pressure end, ~1e-12 relative in h)
        r1 = yf[sub] <= y13 + BOUNDARY_SLACK * np.abs(y13)
        r2 = ~r1 & (yf[sub] >= y23 - BOUNDARY_SLACK * np.abs(y23))
        r3 = ~r1 & ~r2
        fn1 = region1.temperature_ph if key == "h" else region1.temperature_ps
        fn2 = region2.temperature_ph if key == "h" else region2.temperature_ps
        fn3 = r3b.temperature_ph if key == "h" else r3b.temperature_ps
        if r1.any():
            out[sub[r1]] = fn1(ps[r1], yf[sub][r1])
        if r2.any():
            out[sub[r2]] = fn2(ps[r2], yf[sub][r2])
        if r3.any():
            i3 = sub[r3]
            p3, y3 = pf[i3], yf[i3]
            T3 = np.full(p3.shape, np.nan)
            wet = np.zeros(p3.shape, dtype=bool)
            sat = p3 < PC
            if sat.any():
                liq, vap = saturated_states(Ts[i3][sat])
                w = (y3[sat] > liq[key]) & (y3[sat] < vap[key])
                wet[np.nonzero(sat)[0][w]] = True
            T3[wet] = Ts[i3][wet]
            if (~wet).any():
                T3[~wet] = fn3(p3[~wet], y3[~wet])
            out[i3] = T3
    if not mask and not ok.all():
        i = int(np.nonzero(~ok)[0][0])
        name = "specific enthalpy" if key == "h" else "specific entropy"
        unit = "J/kg" if key == "h" else "J/(kg K)"
        raise ValueError(f"(pressure = {pf[i]:.9g} Pa, {name} = {yf[i]:.9g} {unit}) is outside "
                         f"IF97 regions 1-3 (0 < p <= 100 MPa, 273.15 K <= T <= 1073.15 K)")
    return out.reshape(shape)


def temperature_ph(p, h, mask=False):
    """Temperature from pressure and specific enthalpy, regions 1-3 and the wet region."""
    return _backward(p, h, "h", mask)


def temperature_ps(p, s, mask=False):
    """Temperature from pressure and specific entropy, regions 1-3 and the wet region."""
    return _backward(p, s, "s", mask)


def quality_ph(p, h):
    """Vapour mass fraction x = (h - h') / (h'' - h') in the wet region; NaN outside it."""
    return _quality(p, h, "h")


def quality_ps(p, s):
    """Vapour mass fraction x = (s - s') / (s'' - s') in the wet region; NaN outside it."""
    return _quality(p, s, "s")


def _quality(p, a, key):
    p, a = np.broadcast_arrays(np.asarray(p, dtype=np.float64), np.asarray(a, dtype=np.float64))
    ok = (p >= 611.212677) & (p < PC)
    T = region4.saturation_temperature(np.where(ok, p, 1e5))
    liq, vap = saturated_states(T)
    x = (a - liq[key]) / (vap[key] - liq[key])
    return np.where(ok & (x >= 0) & (x <= 1), x, np.nan)


def mixture_T(T, x):
    """Two-phase mixture at saturation temperature ``T`` and quality ``x`` (0 liquid, 1 vapour):
    v, u, h, s are mass-weighted (lever rule), rho = 1/v. NaN where x is outside [0, 1]."""
    T, x = np.broadcast_arrays(np.asarray(T, dtype=np.float64), np.asarray(x, dtype=np.float64))
    liq, vap = saturated_states(T)
    ok = (x >= 0) & (x <= 1)
    out = {}
    for k in ("v", "u", "h", "s"):
        out[k] = np.where(ok, (1.0 - x) * liq[k] + x * vap[k], np.nan)
    out["rho"] = 1.0 / out["v"]
    return out


def mixture_p(p, x):
    """Two-phase mixture at saturation pressure ``p`` and quality ``x``."""
    return mixture_T(region4.saturation_temperature(p), x)


__all__ = ["saturation_pressure", "saturation_temperature", "dpsat_dT", "saturated_states",
           "props_pT", "temperature_ph", "temperature_ps", "quality_ph", "quality_ps",
           "mixture_T", "mixture_p", "surface_tension",
           "T_MAX", "TC"]
