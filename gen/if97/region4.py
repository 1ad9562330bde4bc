"""IAPWS-IF97 region 4 (saturation line), IAPWS R7-97(2012) section 8.

Offers, in SI units, numpy arrays in and out (scalars give 0-d results):

* ``saturation_pressure(T)``      p_sat (Pa) at temperature T (K), eq. 30
* ``saturation_temperature(p)``   T_sat (K) at pressure p (Pa), eq. 31
* ``dpsat_dT(T)``                 d p_sat / d T (Pa/K), the analytic derivative of eq. 30

Eqs. 30 and 31 are the two solutions of one quadratic (eq. 29), so they invert each other
to round-off. Validity (release): 273.15 K <= T <= 647.096 K, i.e. 611.213 Pa <= p <=
22.064 MPa; nothing here masks points outside it.
"""

import numpy as np

# IAPWS R7-97(2012) Table 34: coefficients n1..n10 of the saturation-line equation, eqs. 28-31
N = [0.11670521452767e4, -0.72421316703206e6, -0.17073846940092e2, 0.12020824702470e5,
     -0.32325550322333e7, 0.14915108613530e2, -0.48232657361591e4, 0.40511340542057e6,
     -0.23855557567849, 0.65017534844798e3]
n1, n2, n3, n4, n5, n6, n7, n8, n9, n10 = N


def _abc(T):
    """theta (eq. 29b) and A, B, C of eq. 30 with their derivatives in theta."""
    T = np.asarray(T, dtype=float)
    d = T - n10
    theta = T + n9 / d
    A = (theta + n1) * theta + n2
    B = (n3 * theta + n4) * theta + n5
    C = (n6 * theta + n7) * theta + n8
    return T, d, theta, A, B, C


def saturation_pressure(T):
    """Saturation pressure (Pa) at temperature T (K), eq. 30."""
    T, d, theta, A, B, C = _abc(T)
    x = 2.0 * C / (-B + np.sqrt(B * B - 4.0 * A * C))
    x2 = x * x
    return x2 * x2 * 1e6


def dpsat_dT(T):
    """d p_sat / d T (Pa/K) at temperature T (K): the exact derivative of eq. 30."""
    T, d, theta, A, B, C = _abc(T)
    dA = 2.0 * theta + n1
    dB = 2.0 * n3 * theta + n4
    dC = 2.0 * n6 * theta + n7
    root = np.sqrt(B * B - 4.0 * A * C)
    den = -B + root
    dden = -dB + (B * dB - 2.0 * (dA * C + A * dC)) / root
    x = 2.0 * C / den
    dx = 2.0 * (dC * den - C * dden) / (den * den)   # d x / d theta
    dtheta = 1.0 - n9 / (d * d)                       # d theta / d T
    return 4.0 * x * x * x * dx * dtheta * 1e6


def saturation_temperature(p):
    """Saturation temperature (K) at pressure p (Pa), eq. 31.

    Evaluated in algebraically identical, cancellation-free forms: D as the root of
    E D^2 + F D + G = 0 that avoids subtracting like-signed terms, and the discriminant
    (n10 + D)^2 - 4 (n9 + n10 D) as (D - n10)^2 - 4 n9 (n9 < 0), which keeps full precision
    near the critical point where the two roots of eq. 31 nearly coincide.
    """
    beta = np.sqrt(np.sqrt(np.asarray(p, dtype=float) / 1e6))
    E = (beta + n3) * beta + n6
    F = (n1 * beta + n4) * beta + n7
    G = (n2 * beta + n5) * beta + n8
    root = np.sqrt(F * F - 4.0 * E * G)
    with np.errstate(divide="ignore", invalid="ignore"):
        D = np.where(F >= 0.0, 2.0 * G / (-F - root), (root - F) / (2.0 * E))
    dn = D - n10
    return 0.5 * (n10 + D - np.sqrt(dn * dn - 4.0 * n9))
