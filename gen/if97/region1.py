"""IAPWS-IF97 region 1 (compressed liquid), IAPWS R7-97(2012) section 5.

Offers, all in SI units (Pa, K, J/kg, J/(kg K), kg/m^3), numpy arrays in and out with
broadcasting (scalars give 0-d results):

* ``gibbs_derivs(p, T)``   dimensionless Gibbs free energy gamma(pi, tau) and its derivatives,
  as a dict with the keyword names of ``props.from_gibbs``
* ``props(p, T)``          property dict (keys v rho u h s cp cv w kappa drhodp), eq. 7
* ``density(p, T)``        density only, from gamma_pi; lean and fast, for bulk table work
* ``temperature_ph(p, h, refine=True)``   backward equation T(p, h), eq. 11
* ``temperature_ps(p, s, refine=True)``   backward equation T(p, s), eq. 13

With ``refine=False`` the backward functions return the raw backward equation (to check
against the release's tables); with ``refine=True`` a few vectorized Newton steps on the
basic equation (``series.newton``, at most ``series.MAX_NEWTON_STEPS``) make
``h(p, temperature_ph(p, h)) == h`` to round-off.

Validity (release): 273.15 K <= T <= 623.15 K, p_sat(T) <= p <= 100 MPa. Nothing here masks
points outside it; region selection lives in ``regions``.

"""

import numpy as np

from .constants import R
from .props import from_gibbs
from .series import BlockSeries, flat_pair, newton

#: reducing pressure p*, Pa, and temperature T*, K (R7-97(2012) eq. 7)
P_STAR = 16.53e6
T_STAR = 1386.0

# IAPWS R7-97(2012) Table 2: coefficients and exponents of gamma, eq. 7
I = [0, 0, 0, 0, 0, 0, 0, 0, 1, 1, 1, 1, 1, 1, 2, 2, 2, 2, 2, 3, 3, 3, 4, 4, 4,
     5, 8, 8, 21, 23, 29, 30, 31, 32]
J = [-2, -1, 0, 1, 2, 3, 4, 5, -9, -7, -1, 0, 1, 3, -3, 0, 1, 3, 17, -4, 0, 6,
     -5, -2, 10, -8, -11, -6, -29, -31, -38, -39, -40, -41]
n = [0.14632971213167, -0.84548187169114, -0.37563603672040e1, 0.33855169168385e1,
     -0.95791963387872, 0.15772038513228, -0.16616417199501e-1, 0.81214629983568e-3,
     0.28319080123804e-3, -0.60706301565874e-3, -0.18990068218419e-1,
     -0.32529748770505e-1, -0.21841717175414e-1, -0.52838357969930e-4,
     -0.47184321073267e-3, -0.30001780793026e-3, 0.47661393906987e-4,
     -0.44141845330846e-5, -0.72694996297594e-15, -0.31679644845054e-4,
     -0.28270797985312e-5, -0.85205128120103e-9, -0.22425281908000e-5,
     -0.65171222895601e-6, -0.14341729937924e-12, -0.40516996860117e-6,
     -0.12734301741641e-8, -0.17424871230634e-9, -0.68762131295531e-18,
     0.14478307828521e-19, 0.26335781662795e-22, -0.11947622640071e-22,
     0.18228094581404e-23, -0.93537087292458e-25]

# IAPWS R7-97(2012) Table 6: coefficients and exponents of the backward equation T(p, h), eq. 11
I_TPH = [0, 0, 0, 0, 0, 0, 1, 1, 1, 1, 1, 1, 1, 2, 2, 3, 3, 4, 5, 6]
J_TPH = [0, 1, 2, 6, 22, 32, 0, 1, 2, 3, 4, 10, 32, 10, 32, 10, 32, 32, 32, 32]
n_TPH = [-0.23872489924521e3, 0.40421188637945e3, 0.11349746881718e3, -0.58457616048039e1,
         -0.15285482413140e-3, -0.10866707695377e-5, -0.13391744872602e2, 0.43211039183559e2,
         -0.54010067170506e2, 0.30535892203916e2, -0.65964749423638e1, 0.93965400878363e-2,
         0.11573647505340e-6, -0.25858641282073e-4, -0.40644363084799e-8,
         0.66456186191635e-7, 0.80670734103027e-10, -0.93477771213947e-12,
         0.58265442020601e-14, -0.15020185953503e-16]

# IAPWS R7-97(2012) Table 8: coefficients and exponents of the backward equation T(p, s), eq. 13
I_TPS = [0, 0, 0, 0, 0, 0, 1, 1, 1, 1, 1, 1, 2, 2, 2, 2, 2, 3, 3, 4]
J_TPS = [0, 1, 2, 3, 11, 31, 0, 1, 2, 3, 12, 31, 0, 1, 2, 9, 31, 10, 32, 32]
n_TPS = [0.17478268058307e3, 0.34806930892873e2, 0.65292584978455e1, 0.33039981775489,
         -0.19281382923196e-6, -0.24909197244573e-22, -0.26107636489332, 0.22592965981586,
         -0.64256463395226e-1, 0.78876289270526e-2, 0.35672110607366e-9,
         0.17332496994895e-23, 0.56608900654837e-3, -0.32635483139717e-3,
         0.44778286690632e-4, -0.51322156908507e-9, -0.42522657042207e-25,
         0.26400441360689e-12, 0.78124600459723e-28, -0.30732199903668e-30]

_GAMMA = BlockSeries(I, J, n)
_TPH = BlockSeries(I_TPH, J_TPH, n_TPH)
_TPS = BlockSeries(I_TPS, J_TPS, n_TPS)

_ALL = [(0, 0), (1, 0), (2, 0), (0, 1), (0, 2), (1, 1)]


# ---------------------------------------------------------------------------------------------
# basic equation


def _xy(p, T):
    pi = np.asarray(p, dtype=float) / P_STAR
    tau = T_STAR / np.asarray(T, dtype=float)
    return pi, tau, 7.1 - pi, tau - 1.222


def gibbs_derivs(p, T):
    """gamma(pi, tau) of eq. 7 and its first and second derivatives at pressure p (Pa) and
    temperature T (K); returns a dict with keys pi tau g g_p g_pp g_t g_tt g_pt."""
    pi, tau, x, y = _xy(p, T)
    g, gx, gxx, gy, gyy, gxy = _GAMMA.values(x, y, _ALL)
    # d/d pi = -d/dx
    return {"pi": pi, "tau": tau, "g": g, "g_p": -gx, "g_pp": gxx, "g_t": gy, "g_tt": gyy,
            "g_pt": -gxy}


def props(p, T):
    """Region 1 properties at p (Pa), T (K): dict with keys v rho u h s cp cv w kappa drhodp."""
    d = gibbs_derivs(p, T)
    return from_gibbs(np.asarray(p, dtype=float), np.asarray(T, dtype=float),
                      p_star=P_STAR, **d)


def density(p, T):
    """Region 1 density (kg/m^3) at p (Pa), T (K), from gamma_pi only (fast path)."""
    shape, pf, Tf = flat_pair(p, T)
    x = np.divide(pf, P_STAR)
    np.subtract(7.1, x, out=x)
    y = np.divide(T_STAR, Tf)
    y -= 1.222
    out = np.empty(pf.shape)
    _GAMMA.evaluate(x, y, [out], [(1, 0)])
    # rho = p / (R T pi gamma_pi) = p_star / (R T (-d gamma/dx))
    out *= Tf
    np.divide(-P_STAR / R, out, out=out)
    return out.reshape(shape)[()]


# ---------------------------------------------------------------------------------------------
# backward equations


def temperature_ph(p, h, refine=True):
    """Temperature (K) from pressure p (Pa) and specific enthalpy h (J/kg), eq. 11.

    ``refine=False`` returns the backward equation itself; ``refine=True`` (default) then
    applies Newton steps T <- T - (h(p, T) - h) / cp(p, T) on eq. 7.
    """
    p = np.asarray(p, dtype=float)
    h = np.asarray(h, dtype=float)
    T = _TPH.value(p / 1e6, h / 2500e3 + 1.0)
    if refine:
        def correction(T):
            pi, tau, x, y = _xy(p, T)
            gt, gtt = _GAMMA.values(x, y, [(0, 1), (0, 2)])
            # h = R T tau gamma_tau = R T* gamma_tau ; cp = -R tau^2 gamma_tautau
            return (R * T_STAR * gt - h) / (-R * tau * tau * gtt)
        T = newton(T, correction)
    return T[()]


def temperature_ps(p, s, refine=True):
    """Temperature (K) from pressure p (Pa) and specific entropy s (J/(kg K)), eq. 13.

    ``refine=False`` returns the backward equation itself; ``refine=True`` (default) then
    applies Newton steps T <- T - (s(p, T) - s) T / cp(p, T) on eq. 7.
    """
    p = np.asarray(p, dtype=float)
    s = np.asarray(s, dtype=float)
    T = _TPS.value(p / 1e6, s / 1e3 + 2.0)
    if refine:
        def correction(T):
            pi, tau, x, y = _xy(p, T)
            g, gt, gtt = _GAMMA.values(x, y, [(0, 0), (0, 1), (0, 2)])
            # s = R (tau gamma_tau - gamma) ; ds/dT = cp / T = -R tau^2 gamma_tautau / T
            return (R * (tau * gt - g) - s) * T / (-R * tau * tau * gtt)
        T = newton(T, correction)
    return T[()]
