"""IAPWS-IF97 region 3: the basic equation f(rho, T), R7-97(2012) eq. 28, Table 30.

Offers
------
``props_rhoT(rho, T)``      all properties (dict, keys of ``props.KEYS`` plus ``p``) at rho, T
``pressure_rhoT(rho, T)``   pressure, Pa
``pressure_drho_rhoT(rho, T)``  (p, (dp/drho)_T) in Pa and Pa m^3/kg
``phi_rhoT(rho, T)``        (delta, tau, phi, phi_d, phi_dd, phi_t, phi_tt, phi_dt)

phi(delta, tau) = f/(RT) = n_1 ln(delta) + sum_{i=2..40} n_i delta^I_i tau^J_i with
delta = rho/RHOC and tau = TC/T.  Inputs broadcast; scalars give 0-d arrays.  SI units throughout.
"""

import numpy as np

from .constants import R, RHOC, TC
from .props import from_helmholtz
from .series import Series

# IAPWS R7-97(2012) Table 30: coefficient of the logarithmic term (i = 1)
N1 = 1.0658070028513

# IAPWS R7-97(2012) Table 30, i = 2..40: (I_i, J_i, n_i)
TABLE30 = (
    (0, 0, -15.732845290239),
    (0, 1, 20.944396974307),
    (0, 2, -7.6867707878716),
    (0, 7, 2.6185947787954),
    (0, 10, -2.808078114862),
    (0, 12, 1.2053369696517),
    (0, 23, -0.0084566812812502),
    (1, 2, -1.2654315477714),
    (1, 6, -1.1524407806681),
    (1, 15, 0.88521043984318),
    (1, 17, -0.64207765181607),
    (2, 0, 0.38493460186671),
    (2, 2, -0.85214708824206),
    (2, 6, 4.8972281541877),
    (2, 7, -3.0502617256965),
    (2, 22, 0.039420536879154),
    (2, 26, 0.12558408424308),
    (3, 0, -0.2799932969871),
    (3, 2, 1.389979956946),
    (3, 4, -2.018991502357),
    (3, 16, -0.0082147637173963),
    (3, 26, -0.47596035734923),
    (4, 0, 0.0439840744735),
    (4, 2, -0.44476435428739),
    (4, 4, 0.90572070719733),
    (4, 26, 0.70522450087967),
    (5, 1, 0.10770512626332),
    (5, 3, -0.32913623258954),
    (5, 26, -0.50871062041158),
    (6, 0, -0.022175400873096),
    (6, 2, 0.094260751665092),
    (6, 26, 0.16436278447961),
    (7, 2, -0.013503372241348),
    (8, 26, -0.014834345352472),
    (9, 2, 0.00057922953628084),
    (9, 26, 0.0032308904703711),
    (10, 0, 8.0964802996215e-05),
    (10, 1, -0.00016557679795037),
    (11, 26, -4.4923899061815e-05),
)

_SERIES = Series([r[0] for r in TABLE30], [r[1] for r in TABLE30], [r[2] for r in TABLE30])


def _reduced(rho, T):
    rho = np.asarray(rho, dtype=float)
    T = np.asarray(T, dtype=float)
    return rho, T, rho / RHOC, TC / T


def phi_rhoT(rho, T):
    """Reduced Helmholtz energy phi and its derivatives in delta (d) and tau (t)."""
    rho, T, delta, tau = _reduced(rho, T)
    s = _SERIES.value
    phi = N1 * np.log(delta) + s(delta, tau)
    phi_d = N1 / delta + s(delta, tau, 1, 0)
    phi_dd = -N1 / (delta * delta) + s(delta, tau, 2, 0)
    phi_t = s(delta, tau, 0, 1)
    phi_tt = s(delta, tau, 0, 2)
    phi_dt = s(delta, tau, 1, 1)
    return delta, tau, phi, phi_d, phi_dd, phi_t, phi_tt, phi_dt


def props_rhoT(rho, T):
    """All properties at density rho (kg/m^3) and temperature T (K); SI units."""
    rho, T, _, _ = _reduced(rho, T)
    delta, tau, f, f_d, f_dd, f_t, f_tt, f_dt = phi_rhoT(rho, T)
    return from_helmholtz(rho, T, delta, tau, f, f_d, f_dd, f_t, f_tt, f_dt)


def pressure_rhoT(rho, T):
    """Pressure p = rho R T delta phi_delta, Pa."""
    rho, T, delta, tau = _reduced(rho, T)
    phi_d = N1 / delta + _SERIES.value(delta, tau, 1, 0)
    RT = R * T
    return rho * RT * delta * phi_d


def pressure_drho_rhoT(rho, T):
    """Pressure (Pa) and its isothermal density derivative (dp/drho)_T (Pa m^3/kg)."""
    rho, T, delta, tau = _reduced(rho, T)
    phi_d = N1 / delta + _SERIES.value(delta, tau, 1, 0)
    phi_dd = -N1 / (delta * delta) + _SERIES.value(delta, tau, 2, 0)
    RT = R * T
    p = rho * RT * delta * phi_d
    dpdrho = RT * (2.0 * delta * phi_d + delta * delta * phi_dd)
    return p, dpdrho
