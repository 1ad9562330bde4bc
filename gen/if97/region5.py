"""IAPWS-IF97 region 5 (high-temperature steam), IAPWS R7-97(2012) section 9.

Offers, in SI units (Pa, K, J/kg, J/(kg K), kg/m^3), numpy arrays in and out with
broadcasting (scalars give 0-d results):

* ``gibbs_derivs(p, T)``   gamma = gamma_o + gamma_r (eqs. 32-34) and its derivatives, as a
  dict with the keyword names of ``props.from_gibbs``
* ``props(p, T)``          property dict (keys v rho u h s cp cv w kappa drhodp), eq. 32
* ``density(p, T)``        density only, rho = p / (R T (1 + pi gamma_r_pi)) (fast path)

Validity (release): 1073.15 K <= T <= 2273.15 K, 0 < p <= 50 MPa; not masked here.
"""

import numpy as np

from .constants import R
from .props import from_gibbs
from .series import BlockSeries, flat_pair

#: reducing pressure p*, Pa, and temperature T*, K (R7-97(2012) eq. 32)
P_STAR = 1e6
T_STAR = 1000.0

# IAPWS R7-97(2012) Table 37: coefficients and exponents of the ideal-gas part gamma_o, eq. 33
J0 = [0, 1, -3, -2, -1, 2]
n0 = [-0.13179983674201e2, 0.68540841634434e1, -0.24805148933466e-1, 0.36901534980333,
      -0.31161318213925e1, -0.32961626538917]

# IAPWS R7-97(2012) Table 38: coefficients and exponents of the residual part gamma_r, eq. 34
I = [1, 1, 1, 2, 2, 3]
J = [1, 2, 3, 3, 9, 7]
n = [0.15736404855259e-2, 0.90153761673944e-3, -0.50270077677648e-2, 0.22440037409485e-5,
     -0.41163275453471e-5, 0.37919454822955e-7]

_GAMMA0 = BlockSeries(J0, None, n0)
_GAMMAR = BlockSeries(I, J, n)
_PI_GAMMAR_PI = BlockSeries(I, J, [c * i for i, c in zip(I, n)])
_ALL = [(0, 0), (1, 0), (2, 0), (0, 1), (0, 2), (1, 1)]


def gibbs_derivs(p, T):
    """gamma(pi, tau) of eq. 32 and its derivatives at p (Pa), T (K); dict with keys
    pi tau g g_p g_pp g_t g_tt g_pt."""
    pi = np.asarray(p, dtype=float) / P_STAR
    tau = T_STAR / np.asarray(T, dtype=float)
    g0, g0t, g0tt = _GAMMA0.values(tau, None, [(0, 0), (1, 0), (2, 0)])
    gr, grp, grpp, grt, grtt, grpt = _GAMMAR.values(pi, tau, _ALL)
    return {"pi": pi, "tau": tau,
            "g": np.log(pi) + g0 + gr,
            "g_p": 1.0 / pi + grp,
            "g_pp": -1.0 / (pi * pi) + grpp,
            "g_t": g0t + grt,
            "g_tt": g0tt + grtt,
            "g_pt": grpt}


def props(p, T):
    """Region 5 properties at p (Pa), T (K): dict with keys v rho u h s cp cv w kappa drhodp."""
    return from_gibbs(np.asarray(p, dtype=float), np.asarray(T, dtype=float),
                      p_star=P_STAR, **gibbs_derivs(p, T))


def density(p, T):
    """Region 5 density (kg/m^3) at p (Pa), T (K), from gamma_r_pi only."""
    shape, pf, Tf = flat_pair(p, T)
    x = np.divide(pf, P_STAR)
    y = np.divide(T_STAR, Tf)
    out = np.empty(pf.shape)
    _PI_GAMMAR_PI.evaluate(x, y, [out], [(0, 0)])
    out += 1.0
    out *= Tf
    out *= R
    np.divide(pf, out, out=out)
    return out.reshape(shape)[()]
