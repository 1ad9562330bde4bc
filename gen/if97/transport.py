"""Transport properties and surface tension of ordinary water, for use with IAPWS-IF97.

SI units at every function boundary: Pa, K, kg/m^3, J/(kg K), Pa s, W/(m K), N/m.
Every function takes numpy arrays (or scalars) and broadcasts them against each other; a
scalar-only call returns a 0-d numpy array (use ``float()`` on it if a Python float is needed).

Offers
------
viscosity(rho, T)
    Dynamic viscosity, Pa s. IAPWS R12-08, Eq. (10), in the form the release recommends for
    industrial use with IF97: mu = mu* mu0(T) mu1(T, rho), critical enhancement mu2 = 1.
thermal_conductivity(rho, T, cp, cv, drhodp)
    Thermal conductivity, W/(m K). IAPWS R15-11, Eq. (10), industrial formulation:
    lambda = lambda* (lambda0 lambda1 + lambda2), with the critical enhancement lambda2 of
    Eqs. (18)-(24) evaluated from the caller's IF97 cp, cv and (d rho/d p)_T, and the
    reference-temperature compressibility zeta(T_R, rho) from Eq. (25) and Table 6.
thermal_conductivity_terms(rho, T, cp, cv, drhodp)
    The same, split into (lambda0 [W/(m K)], lambda1 [1], lambda2 [W/(m K)]) so that
    lambda = lambda0 * lambda1 + lambda2; the split R15-11 prints in its Tables 7-9.
drhodp_reference(rho)
    (d rho/d p)_T at the reference temperature T_R = 1.5 T* as a function of density,
    kg/(m^3 Pa): R15-11 Eq. (25), Table 6 (industrial formulation only).
surface_tension(T, check=False)
    Surface tension of water against its vapour, N/m. IAPWS R1-76(2014).

The functions are pure: they see only their arguments. The caller evaluates rho, cp, cv and
(d rho/d p)_T from IF97 at the state of interest and passes them in.

Validity
--------
viscosity
    R12-08 gives the correlation for the stable fluid from the melting (or sublimation) curve
    to 1173.15 K for p <= 300 MPa, with lower upper temperatures at higher pressure
    (873.15 K to 350 MPa, 433.15 K to 500 MPa, 373.15 K to 1000 MPa), and it extrapolates
    reasonably into the metastable regions. With IF97 the usable range is IF97's own
    (273.15 K - 1073.15 K at p <= 100 MPa; region 5 to 2273.15 K at p <= 50 MPa, where
    T > 1173.15 K is extrapolation). Setting mu2 = 1 (as R12-08 prescribes for industrial
    use) changes mu by more than about 2 % only in a small neighbourhood of the critical
    point (roughly 645.91 K < T < 650.77 K and 245.8 < rho < 405.3 kg/m^3).
    [These range figures are from memory of the R12-08 text, not re-checked against it.]
thermal_conductivity
    R15-11 gives the correlation for the stable fluid from the melting (or sublimation)
    curve to 1173.15 K for p <= 100 MPa, with lower upper temperatures at higher pressure
    (874 K to 250 MPa, 573 K to 687 MPa, 403 K to 785 MPa, 348 K to 1000 MPa); with IF97
    the usable range is therefore IF97 regions 1-3 (273.15 K - 1073.15 K, p <= 100 MPa) and
    region 5 only up to 1173.15 K. Very close to the critical point the industrial lambda2
    departs from the scientific one (R15-11 Table 9 vs Table 5: 1241.8 vs 1443.8 mW/(m K)
    at 647.35 K, 322 kg/m^3), because IF97 region 3 is less accurate there than IAPWS-95.
    [The pressure-dependent range figures are from memory of the R15-11 text.]
surface_tension
    R1-76(2014): from the triple point 273.16 K to the critical temperature 647.096 K, and
    it extrapolates reasonably into supercooled liquid down to 248.15 K (-25 C). Outside
    248.15 K <= T <= 647.096 K this module returns NaN (with ``check=True`` it raises
    ValueError instead). At T = 647.096 K it is exactly 0.

NaN inputs propagate to NaN outputs everywhere.
"""

import numpy as np

from .constants import PC, RHOC, TC

__all__ = [
    "viscosity",
    "thermal_conductivity",
    "thermal_conductivity_terms",
    "drhodp_reference",
    "surface_tension",
]

# ---------------------------------------------------------------------------------------------
# Reference constants. R12-08 Eqs. (1)-(4) and R15-11 Eqs. (1)-(5) use the same T*, rho*, p*
# as the critical constants of IF97 (R7-97(2012) Eqs. (3)-(5)), so they are taken from there.
# ---------------------------------------------------------------------------------------------
#: reference temperature T* = 647.096 K (R12-08 Eq. (1), R15-11 Eq. (1))
T_STAR = TC
#: reference density rho* = 322 kg/m^3 (R12-08 Eq. (2), R15-11 Eq. (2))
RHO_STAR = RHOC
#: reference pressure p* = 22.064 MPa, in Pa (R12-08 Eq. (3), R15-11 Eq. (3))
P_STAR = PC
#: reference viscosity mu* = 1e-6 Pa s (R12-08 Eq. (4), R15-11 Eq. (5))
MU_STAR = 1.0e-6
#: reference thermal conductivity lambda* = 1e-3 W/(m K) (R15-11 Eq. (4))
LAMBDA_STAR = 1.0e-3
#: specific gas constant used by R15-11 for c_p bar, J/(kg K) (R15-11 Eq. (6)). This is NOT
#: IF97's R = 461.526 J/(kg K); the release fixes 0.46151805 kJ/(kg K) for Eq. (18).
R_LAMBDA = 461.51805

# ---------------------------------------------------------------------------------------------
# R12-08 coefficients
# ---------------------------------------------------------------------------------------------
# R12-08 Table 1: coefficients H_i of mu0, Eq. (11), i = 0..3
_H_I = (1.67752, 2.20462, 0.6366564, -0.241605)

# R12-08 Table 2: coefficients H_ij of mu1, Eq. (12); row i = 0..5, column j = 0..6
_H_IJ = (
    (5.20094e-1, 2.22531e-1, -2.81378e-1, 1.61913e-1, -3.25372e-2, 0.0, 0.0),
    (8.50895e-2, 9.99115e-1, -9.06851e-1, 2.57399e-1, 0.0, 0.0, 0.0),
    (-1.08374, 1.88797, -7.72479e-1, 0.0, 0.0, 0.0, 0.0),
    (-2.89555e-1, 1.26613, -4.89837e-1, 0.0, 6.98452e-2, 0.0, -4.35673e-3),
    (0.0, 0.0, -2.57040e-1, 0.0, 0.0, 8.72102e-3, 0.0),
    (0.0, 1.20573e-1, 0.0, 0.0, 0.0, 0.0, -5.93264e-4),
)

# ---------------------------------------------------------------------------------------------
# R15-11 coefficients
# ---------------------------------------------------------------------------------------------
# R15-11 Table 1: coefficients L_k of lambda0, Eq. (16), k = 0..4
_L_K = (2.443221e-3, 1.323095e-2, 6.770357e-3, -3.454586e-3, 4.096266e-4)

# R15-11 Table 2: coefficients L_ij of lambda1, Eq. (17); row i = 0..4, column j = 0..5
_L_IJ = (
    (1.60397357, -0.646013523, 0.111443906, 0.102997357, -0.0504123634, 0.00609859258),
    (2.33771842, -2.78843778, 1.53616167, -0.463045512, 0.0832827019, -0.00719201245),
    (2.19650529, -4.54580785, 3.55777244, -1.40944978, 0.275418278, -0.0205938816),
    (-1.21051378, 1.60812989, -0.621178141, 0.0716373224, 0.0, 0.0),
    (-2.7203370, 4.57586331, -3.18369245, 1.1168348, -0.19268305, 0.012913842),
)

# R15-11 Table 3: critical-region constants
_CAPITAL_LAMBDA = 177.8514  # Lambda, Eq. (18)
_QD_INV = 0.40  # q_D^-1, nm, Eq. (20)
_NU = 0.630  # nu, Eq. (22)
_GAMMA = 1.239  # gamma, Eq. (22)
_XI0 = 0.13  # xi_0, nm, Eq. (22)
_GAMMA0 = 0.06  # Gamma_0, Eq. (22)
_TR_BAR = 1.5  # T_R bar = T_R / T*, Eq. (23)

# R15-11 Table 6: coefficients A_ij of Eq. (25) for zeta(T_R, rho); row i = 0..5 (power of
# rho bar), column j = 0..4 (density range, see _A_RHO_BOUNDS)
_A_IJ = (
    (6.53786807199516, 6.52717759281799, 5.35500529896124, 1.55225959906681,
     1.11999926419994),
    (-5.61149954923348, -6.30816983387575, -3.96415689925446, 0.464621290821181,
     0.595748562571649),
    (3.39624167361325, 8.08379285492595, 8.91990208918795, 8.93237374861479,
     9.88952565078920),
    (-2.27492629730878, -9.82240510197603, -12.0338729505790, -11.0321960061126,
     -10.3255051147040),
    (10.2631854662709, 12.1358413791395, 9.19494865194302, 6.16780999933360,
     4.66861294457414),
    (1.97815050331519, -5.54349664571295, -2.16866274479712, -0.965458722086812,
     -0.503243546373828),
)
# R15-11 Table 6 column heads: column j applies for rho bar <= bound[j] (and above the
# previous bound); column 4 for rho bar > 1.863354037. (100, 250, 400 and 600 kg/m^3.)
_A_RHO_BOUNDS = np.array([0.310559006, 0.776397516, 1.242236025, 1.863354037])

# R15-11, critical enhancement: c_p bar is replaced by 1e13 where the equation of state gives
# a negative value or one above 1e13 (IF97 region 3 can, very near the critical point).
# [from memory of the R15-11 text; no check value exercises it]
_CP_BAR_MAX = 1.0e13
# R15-11, text to Eq. (19): Z(y) = 0 for y < 1.2e-7 [from memory of the R15-11 text]
_Y_MIN = 1.2e-7

# ---------------------------------------------------------------------------------------------
# R1-76(2014) coefficients
# ---------------------------------------------------------------------------------------------
# R1-76(2014) Eq. (1): sigma = B tau^mu (1 + b tau), tau = 1 - T/T_c; B in N/m
_SIGMA_B = 235.8e-3
_SIGMA_b = -0.625
_SIGMA_MU = 1.256
#: lowest temperature R1-76(2014) accepts (extrapolation into supercooled liquid), K
T_MIN_SIGMA = 248.15
#: triple-point temperature, the lower end of the stable range of R1-76(2014), K
T_TRIPLE_SIGMA = 273.16


def _horner(coeffs, x):
    """sum_k coeffs[k] * x**k by Horner's rule (coeffs in increasing power)."""
    acc = np.full(np.shape(x), coeffs[-1], dtype=float)
    for c in coeffs[-2::-1]:
        acc = acc * x + c
    return acc


def _double_horner(table, x, y):
    """sum_i x**i sum_j table[i][j] y**j, both sums by Horner's rule."""
    acc = _horner(table[-1], y)
    for row in table[-2::-1]:
        acc = acc * x + _horner(row, y)
    return acc


def _mu_bar(rho_bar, T_bar):
    """mu0 * mu1 of R12-08 Eqs. (11)-(12), dimensionless (mu / mu*)."""
    inv_T = 1.0 / T_bar
    mu0 = 100.0 * np.sqrt(T_bar) / _horner(_H_I, inv_T)
    mu1 = np.exp(rho_bar * _double_horner(_H_IJ, inv_T - 1.0, rho_bar - 1.0))
    return mu0 * mu1


def viscosity(rho, T):
    """Dynamic viscosity of water, Pa s, IAPWS R12-08 industrial form (mu2 = 1).

    ``rho`` density in kg/m^3, ``T`` temperature in K (broadcast against each other).
    mu = mu* mu0(T bar) mu1(T bar, rho bar), R12-08 Eqs. (10)-(12), with mu2 = 1.
    See the module docstring for the range of validity.
    """
    rho = np.asarray(rho, dtype=float)
    T = np.asarray(T, dtype=float)
    return MU_STAR * _mu_bar(rho / RHO_STAR, T / T_STAR)


def _zeta_reference(rho_bar):
    """zeta(T_R, rho) = 1 / sum_i A_ij rho_bar**i, R15-11 Eq. (25), Table 6; dimensionless."""
    j = np.searchsorted(_A_RHO_BOUNDS, rho_bar, side="left")  # column: rho_bar <= bound[j]
    A = np.asarray(_A_IJ)  # shape (6, 5): power i by density column j
    acc = A[-1][j]
    for row in A[-2::-1]:  # Horner over i, coefficients picked per point
        acc = acc * rho_bar + row[j]
    return 1.0 / acc


def drhodp_reference(rho):
    """(d rho/d p)_T at T_R = 1.5 T*, kg/(m^3 Pa), from R15-11 Eq. (25) and Table 6.

    zeta(T_R, rho) = (d rho bar/d p bar)_T = 1 / sum_i A_ij rho_bar**i, the column j chosen
    by the density range; returned in SI as zeta * rho*/p*. This is the industrial
    formulation's replacement for evaluating the equation of state at T_R.
    """
    rho_bar = np.asarray(rho, dtype=float) / RHO_STAR
    return _zeta_reference(rho_bar) * (RHO_STAR / P_STAR)


def _lambda2_bar(rho_bar, T_bar, cp, cv, drhodp, mu_bar):
    """Critical enhancement lambda2 / lambda*, R15-11 Eqs. (18)-(24), industrial form."""
    cp_bar = cp / R_LAMBDA
    cp_bar = np.where((cp_bar < 0.0) | (cp_bar > _CP_BAR_MAX), _CP_BAR_MAX, cp_bar)
    kappa_inv = cv / (cp_bar * R_LAMBDA)  # 1/kappa = cv/cp, with the limited cp

    zeta = drhodp * (P_STAR / RHO_STAR)  # Eq. (24): (d rho bar/d p bar)_T at (T, rho)
    dchi = rho_bar * (zeta - _zeta_reference(rho_bar) * (_TR_BAR / T_bar))  # Eq. (23)
    dchi = np.where(dchi < 0.0, 0.0, dchi)  # negative -> 0; NaN stays NaN

    xi = _XI0 * np.power(dchi / _GAMMA0, _NU / _GAMMA)  # Eq. (22), nm
    y = xi / _QD_INV  # Eq. (20), y = q_D xi

    small = y < _Y_MIN
    ys = np.where(small, 1.0, y)
    rs = np.where(small, 1.0, rho_bar)
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        Z = 2.0 / (np.pi * ys) * (
            ((1.0 - kappa_inv) * np.arctan(ys) + kappa_inv * ys)
            - (1.0 - np.exp(-1.0 / (1.0 / ys + ys * ys / (3.0 * rs * rs))))
        )  # Eq. (19)
    Z = np.where(small, 0.0, Z)

    return _CAPITAL_LAMBDA * rho_bar * cp_bar * T_bar / mu_bar * Z  # Eq. (18)


def thermal_conductivity_terms(rho, T, cp, cv, drhodp):
    """R15-11 industrial thermal conductivity split as (lambda0, lambda1, lambda2).

    Returns ``lambda0`` in W/(m K) (Eq. (16) times lambda*), ``lambda1`` dimensionless
    (Eq. (17)) and ``lambda2`` in W/(m K) (Eq. (18) times lambda*), so that
    ``lambda = lambda0 * lambda1 + lambda2``. Arguments as for :func:`thermal_conductivity`.
    """
    rho = np.asarray(rho, dtype=float)
    T = np.asarray(T, dtype=float)
    cp = np.asarray(cp, dtype=float)
    cv = np.asarray(cv, dtype=float)
    drhodp = np.asarray(drhodp, dtype=float)
    rho, T, cp, cv, drhodp = np.broadcast_arrays(rho, T, cp, cv, drhodp)

    rho_bar = rho / RHO_STAR
    T_bar = T / T_STAR
    inv_T = 1.0 / T_bar
    lam0 = np.sqrt(T_bar) / _horner(_L_K, inv_T)  # Eq. (16)
    lam1 = np.exp(rho_bar * _double_horner(_L_IJ, inv_T - 1.0, rho_bar - 1.0))  # Eq. (17)
    # Viscosity in Eq. (18): R12-08 with mu2 = 1 for the industrial formulation.
    lam2 = _lambda2_bar(rho_bar, T_bar, cp, cv, drhodp, _mu_bar(rho_bar, T_bar))
    return LAMBDA_STAR * lam0, lam1, LAMBDA_STAR * lam2


def thermal_conductivity(rho, T, cp, cv, drhodp):
    """Thermal conductivity of water, W/(m K), IAPWS R15-11 industrial formulation.

    ``rho`` density, kg/m^3; ``T`` temperature, K; ``cp`` and ``cv`` specific isobaric and
    isochoric heat capacities, J/(kg K); ``drhodp`` = (d rho/d p)_T, kg/(m^3 Pa); all at the
    same state and all from IF97 (the caller's job). Inputs broadcast against each other.

    lambda = lambda* (lambda0 lambda1 + lambda2), R15-11 Eq. (10). lambda2 uses the viscosity
    of R12-08 with mu2 = 1 and the reference compressibility of Eq. (25) / Table 6.
    See the module docstring for the range of validity.
    """
    lam0, lam1, lam2 = thermal_conductivity_terms(rho, T, cp, cv, drhodp)
    return lam0 * lam1 + lam2


def surface_tension(T, check=False):
    """Surface tension of water against its vapour, N/m, IAPWS R1-76(2014) Eq. (1).

    ``T`` temperature in K. Valid from 273.16 K to T_c = 647.096 K, with reasonable
    extrapolation into supercooled liquid down to 248.15 K. Outside 248.15 K <= T <= T_c
    the result is NaN; with ``check=True`` a ValueError naming the variable, the offending
    value and the valid range is raised instead (NaN inputs also raise when checked).
    """
    T = np.asarray(T, dtype=float)
    ok = (T >= T_MIN_SIGMA) & (T <= TC)
    if check and not np.all(ok):
        bad = T[~ok] if T.ndim else T
        first = float(np.ravel(bad)[0])
        n = int(np.size(bad))
        raise ValueError(
            f"surface_tension: T = {first!r} K is outside the valid range "
            f"{T_MIN_SIGMA} K <= T <= {TC} K (IAPWS R1-76(2014))"
            + (f"; {n} of {T.size} values out of range" if n > 1 else "")
        )
    tau = 1.0 - np.where(ok, T, TC) / TC
    sigma = _SIGMA_B * np.power(tau, _SIGMA_MU) * (1.0 + _SIGMA_b * tau)
    return np.where(ok, sigma, np.nan)
