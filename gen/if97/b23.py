"""Boundary between IAPWS-IF97 regions 2 and 3 (the B23 equation), IAPWS R7-97(2012) section 4.

Offers, in SI units, numpy arrays in and out (scalars give 0-d results):

* ``b23_pressure(T)``      pressure (Pa) on the boundary at temperature T (K), eq. 5
* ``b23_temperature(p)``   temperature (K) on the boundary at pressure p (Pa), eq. 6

The boundary runs from 623.15 K, 16.5292 MPa to 863.15 K, 100 MPa. The two equations are
inverses of each other to the digits of Table 1 (n4 = -n2 / (2 n3) and n5 = n1 - n2**2 /
(4 n3) hold to the 14 printed digits); eq. 5 cancels about 45-fold near 623 K, so the round
trip T -> p -> T keeps T to ~1e-12 relative.
"""

import numpy as np

# IAPWS R7-97(2012) Table 1: coefficients n1..n5 of the B23 equation, eqs. 5-6
N = [0.34805185628969e3, -0.11671859879975e1, 0.10192970039326e-2, 0.57254459862746e3,
     0.13918839778870e2]


def b23_pressure(T):
    """Pressure (Pa) on the region 2/3 boundary at temperature T (K), eq. 5."""
    theta = np.asarray(T, dtype=float)
    return (N[0] + theta * (N[1] + theta * N[2])) * 1e6


def b23_temperature(p):
    """Temperature (K) on the region 2/3 boundary at pressure p (Pa), eq. 6."""
    pi = np.asarray(p, dtype=float) / 1e6
    return N[3] + np.sqrt((pi - N[4]) / N[2])
