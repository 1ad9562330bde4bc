"""Thermodynamic properties from the dimensionless Gibbs (regions 1, 2, 5) or Helmholtz
(region 3) free energy and its derivatives, as in IAPWS R7-97(2012) Tables 3, 12, 29 and 39.

All functions take and return SI units. The dictionary keys are the package's property keys:

=========  ===================================================  ===========
key        property                                             unit
=========  ===================================================  ===========
v          specific volume                                      m^3/kg
rho        density                                              kg/m^3
u          specific internal energy                             J/kg
h          specific enthalpy                                    J/kg
s          specific entropy                                     J/(kg K)
cp         specific isobaric heat capacity                      J/(kg K)
cv         specific isochoric heat capacity                     J/(kg K)
w          speed of sound                                       m/s
kappa      isentropic exponent  -(v/p)(dp/dv)_s = w^2 rho / p    1
drhodp     (d rho / d p)_T, used by thermal conductivity         kg/(m^3 Pa)
=========  ===================================================  ===========
"""

import numpy as np

from .constants import R

KEYS = ("v", "rho", "u", "h", "s", "cp", "cv", "w", "kappa", "drhodp")


def from_gibbs(p, T, pi, tau, g, g_p, g_pp, g_t, g_tt, g_pt, p_star):
    """Properties from gamma(pi, tau) = g/(RT) and its derivatives; pi = p/p_star.

    ``g_p`` = d gamma/d pi, ``g_pp`` = d2/d pi2, ``g_t`` = d/d tau, ``g_tt``, ``g_pt`` likewise.
    """
    RT = R * T
    v = RT / p * pi * g_p
    h = RT * tau * g_t
    u = RT * (tau * g_t - pi * g_p)
    s = R * (tau * g_t - g)
    cp = -R * tau * tau * g_tt
    a = g_p - tau * g_pt
    cv = R * (-tau * tau * g_tt + a * a / g_pp)
    w2 = RT * g_p * g_p / (a * a / (tau * tau * g_tt) - g_pp)
    w = np.sqrt(w2)
    rho = 1.0 / v
    # (dv/dp)_T = RT / p_star**2 * g_pp ; (drho/dp)_T = -rho**2 (dv/dp)_T
    drhodp = -rho * rho * RT / (p_star * p_star) * g_pp
    return {"v": v, "rho": rho, "u": u, "h": h, "s": s, "cp": cp, "cv": cv, "w": w,
            "kappa": w2 * rho / p, "drhodp": drhodp}


def from_helmholtz(rho, T, delta, tau, f, f_d, f_dd, f_t, f_tt, f_dt):
    """Properties from phi(delta, tau) = f/(RT) and its derivatives (R7-97(2012) Table 31)."""
    RT = R * T
    p = rho * RT * delta * f_d
    u = RT * tau * f_t
    h = RT * (tau * f_t + delta * f_d)
    s = R * (tau * f_t - f)
    cv = -R * tau * tau * f_tt
    b = delta * f_d - delta * tau * f_dt
    c = 2.0 * delta * f_d + delta * delta * f_dd
    cp = R * (-tau * tau * f_tt + b * b / c)
    w2 = RT * (c - b * b / (tau * tau * f_tt))
    w = np.sqrt(w2)
    # (dp/drho)_T = RT (2 delta phi_d + delta^2 phi_dd)
    drhodp = 1.0 / (RT * c)
    return {"v": 1.0 / rho, "rho": rho, "p": p, "u": u, "h": h, "s": s, "cp": cp, "cv": cv,
            "w": w, "kappa": w2 * rho / p, "drhodp": drhodp}
