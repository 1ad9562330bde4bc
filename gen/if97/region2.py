"""IAPWS-IF97 region 2 (superheated vapour), IAPWS R7-97(2012) section 6.

Offers, all in SI units (Pa, K, J/kg, J/(kg K), kg/m^3), numpy arrays in and out with
broadcasting (scalars give 0-d results):

* ``gibbs_derivs(p, T)``       gamma = gamma_o + gamma_r (eqs. 15-17) and its derivatives,
  as a dict with the keyword names of ``props.from_gibbs``
* ``props(p, T)``              property dict (keys v rho u h s cp cv w kappa drhodp), eq. 15
* ``gibbs_derivs_metastable(p, T)``, ``props_metastable(p, T)``   the same for the
  metastable-vapour equation, eqs. 18-19
* ``density(p, T)``            density only, from gamma_r_pi; lean and fast, for bulk work
* ``h_2bc(p)``, ``p_2bc(h)``   the B2bc boundary between subregions 2b and 2c, eqs. 20-21
* ``subregion_ph(p, h)``, ``subregion_ps(p, s)``   'a', 'b', 'c' codes as arrays of 1, 2, 3
* ``temperature_ph(p, h, refine=True)``   backward T(p, h), eqs. 22-24 by subregion
* ``temperature_ps(p, s, refine=True)``   backward T(p, s), eqs. 25-27 by subregion

Subregions: 2a for p <= 4 MPa; above, T(p, h) uses 2b where h >= h_2bc(p) and 2c below it,
and T(p, s) uses 2b where s >= 5.85 kJ/(kg K) and 2c below. With ``refine=False`` the
backward functions return the raw backward equations (to check the release's tables); with
``refine=True`` a few vectorized Newton steps on eq. 15 make forward(backward(x)) == x to
round-off.

Validity (release): 273.15 K <= T <= 623.15 K for 0 < p <= p_sat(T); 623.15 K < T <= 863.15 K
for 0 < p <= p_B23(T); 863.15 K < T <= 1073.15 K for 0 < p <= 100 MPa. The metastable
equation holds from the saturated-vapour line to the 5 % equilibrium-moisture line for
p <= 10 MPa. Nothing here masks points outside these ranges.
"""

import numpy as np

from .constants import R
from .props import from_gibbs
from .series import BlockSeries, flat_pair, newton

#: reducing pressure p*, Pa, and temperature T*, K (R7-97(2012) eq. 15)
P_STAR = 1e6
T_STAR = 540.0

# IAPWS R7-97(2012) Table 10: coefficients and exponents of the ideal-gas part gamma_o, eq. 16
J0 = [0, 1, -5, -4, -3, -2, -1, 2, 3]
n0 = [-0.96927686500217e1, 0.10086655968018e2, -0.56087911283020e-2, 0.71452738081455e-1,
      -0.40710498223928, 0.14240819171444e1, -0.43839511319450e1, -0.28408632460772,
      0.21268463753307e-1]

# IAPWS R7-97(2012) Table 11: coefficients and exponents of the residual part gamma_r, eq. 17
I = [1, 1, 1, 1, 1, 2, 2, 2, 2, 2, 3, 3, 3, 3, 3, 4, 4, 4, 5, 6, 6, 6, 7, 7, 7, 8, 8, 9, 10,
     10, 10, 16, 16, 18, 20, 20, 20, 21, 22, 23, 24, 24, 24]
J = [0, 1, 2, 3, 6, 1, 2, 4, 7, 36, 0, 1, 3, 6, 35, 1, 2, 3, 7, 3, 16, 35, 0, 11, 25, 8, 36,
     13, 4, 10, 14, 29, 50, 57, 20, 35, 48, 21, 53, 39, 26, 40, 58]
n = [-0.17731742473213e-2, -0.17834862292358e-1, -0.45996013696365e-1, -0.57581259083432e-1,
     -0.50325278727930e-1, -0.33032641670203e-4, -0.18948987516315e-3, -0.39392777243355e-2,
     -0.43797295650573e-1, -0.26674547914087e-4, 0.20481737692309e-7, 0.43870667284435e-6,
     -0.32277677238570e-4, -0.15033924542148e-2, -0.40668253562649e-1, -0.78847309559367e-9,
     0.12790717852285e-7, 0.48225372718507e-6, 0.22922076337661e-5, -0.16714766451061e-10,
     -0.21171472321355e-2, -0.23895741934104e2, -0.59059564324270e-17, -0.12621808899101e-5,
     -0.38946842435739e-1, 0.11256211360459e-10, -0.82311340897998e1, 0.19809712802088e-7,
     0.10406965210174e-18, -0.10234747095929e-12, -0.10018179379511e-8, -0.80882908646985e-10,
     0.10693031879409, -0.33662250574171, 0.89185845355421e-24, 0.30629316876232e-12,
     -0.42002467698208e-5, -0.59056029685639e-25, 0.37826947613457e-5, -0.12768608934681e-14,
     0.73087610595061e-28, 0.55414715350778e-16, -0.94369707241210e-6]

# IAPWS R7-97(2012) eq. 18: metastable-vapour ideal-gas part, n0_1 and n0_2 replace Table 10's
n0_META = [-0.96937268393049e1, 0.10087275970006e2] + n0[2:]

# IAPWS R7-97(2012) Table 16: coefficients and exponents of the metastable residual part, eq. 19
I_META = [1, 1, 1, 1, 2, 2, 2, 3, 3, 4, 4, 5, 5]
J_META = [0, 2, 5, 11, 1, 7, 16, 4, 16, 7, 10, 9, 10]
n_META = [-0.73362260186506e-2, -0.88223831943146e-1, -0.72334555213245e-1,
          -0.40813178534455e-2, 0.20097803380207e-2, -0.53045921898642e-1,
          -0.76190409086970e-2, -0.63498037657313e-2, -0.86043093028588e-1,
          0.75321581522770e-2, -0.79238375446139e-2, -0.22888160778447e-3,
          -0.26456501482810e-2]

# IAPWS R7-97(2012) Table 19: coefficients of the B2bc equation, eqs. 20-21
N_BC = [0.90584278514723e3, -0.67955786399241, 0.12809002730136e-3, 0.26526571908428e4,
        0.45257578905948e1]

# IAPWS R7-97(2012) Table 20: backward equation T(p, h) for subregion 2a, eq. 22
I_TPH_A = [0, 0, 0, 0, 0, 0, 1, 1, 1, 1, 1, 1, 1, 1, 1, 2, 2, 2, 2, 2, 2, 2, 2, 3, 3, 4, 4, 4,
           5, 5, 5, 6, 6, 7]
J_TPH_A = [0, 1, 2, 3, 7, 20, 0, 1, 2, 3, 7, 9, 11, 18, 44, 0, 2, 7, 36, 38, 40, 42, 44, 24,
           44, 12, 32, 44, 32, 36, 42, 34, 44, 28]
n_TPH_A = [0.10898952318288e4, 0.84951654495535e3, -0.10781748091826e3, 0.33153654801263e2,
           -0.74232016790248e1, 0.11765048724356e2, 0.18445749355790e1, -0.41792700549624e1,
           0.62478196935812e1, -0.17344563108114e2, -0.20058176862096e3, 0.27196065473796e3,
           -0.45511318285818e3, 0.30919688604755e4, 0.25226640357872e6, -0.61707422868339e-2,
           -0.31078046629583, 0.11670873077107e2, 0.12812798404046e9, -0.98554909623276e9,
           0.28224546973002e10, -0.35948971410703e10, 0.17227349913197e10,
           -0.13551334240775e5, 0.12848734664650e8, 0.13865724283226e1, 0.23598832556514e6,
           -0.13105236545054e8, 0.73999835474766e4, -0.55196697030060e6, 0.37154085996233e7,
           0.19127729239660e5, -0.41535164835634e6, -0.62459855192507e2]

# IAPWS R7-97(2012) Table 21: backward equation T(p, h) for subregion 2b, eq. 23
I_TPH_B = [0, 0, 0, 0, 0, 0, 0, 0, 1, 1, 1, 1, 1, 1, 1, 1, 2, 2, 2, 2, 3, 3, 3, 3, 4, 4, 4, 4,
           4, 4, 5, 5, 5, 6, 7, 7, 9, 9]
J_TPH_B = [0, 1, 2, 12, 18, 24, 28, 40, 0, 2, 6, 12, 18, 24, 28, 40, 2, 8, 18, 40, 1, 2, 12,
           24, 2, 12, 18, 24, 28, 40, 18, 24, 40, 28, 2, 28, 1, 40]
n_TPH_B = [0.14895041079516e4, 0.74307798314034e3, -0.97708318797837e2, 0.24742464705674e1,
           -0.63281320016026, 0.11385952129658e1, -0.47811863648625, 0.85208123431544e-2,
           0.93747147377932, 0.33593118604916e1, 0.33809355601454e1, 0.16844539671904,
           0.73875745236695, -0.47128737436186, 0.15020273139707, -0.21764114219750e-2,
           -0.21810755324761e-1, -0.10829784403677, -0.46333324635812e-1, 0.71280351959551e-4,
           0.11032831789999e-3, 0.18955248387902e-3, 0.30891541160537e-2, 0.13555504554949e-2,
           0.28640237477456e-6, -0.10779857357512e-4, -0.76462712454814e-4,
           0.14052392818316e-4, -0.31083814331434e-4, -0.10302738212103e-5,
           0.28217281635040e-6, 0.12704902271945e-5, 0.73803353468292e-7,
           -0.11030139238909e-7, -0.81456365207833e-13, -0.25180545682962e-10,
           -0.17565233969407e-17, 0.86934156344163e-14]

# IAPWS R7-97(2012) Table 22: backward equation T(p, h) for subregion 2c, eq. 24
I_TPH_C = [-7, -7, -6, -6, -5, -5, -2, -2, -1, -1, 0, 0, 1, 1, 2, 6, 6, 6, 6, 6, 6, 6, 6]
J_TPH_C = [0, 4, 0, 2, 0, 2, 0, 1, 0, 2, 0, 1, 4, 8, 4, 0, 1, 4, 10, 12, 16, 20, 22]
n_TPH_C = [-0.32368398555242e13, 0.73263350902181e13, 0.35825089945447e12,
           -0.58340131851590e12, -0.10783068217470e11, 0.20825544563171e11, 0.61074783564516e6,
           0.85977722535580e6, -0.25745723604170e5, 0.31081088422714e5, 0.12082315865936e4,
           0.48219755109255e3, 0.37966001272486e1, -0.10842984880077e2, -0.45364172676660e-1,
           0.14559115658698e-12, 0.11261597407230e-11, -0.17804982240686e-10,
           0.12324579690832e-6, -0.11606921130984e-5, 0.27846367088554e-4,
           -0.59270038474176e-3, 0.12918582991878e-2]

# IAPWS R7-97(2012) Table 25: backward equation T(p, s) for subregion 2a, eq. 25
# (the exponents I are quarter-integers; the code uses 4 I on pi**(1/4))
I_TPS_A = [-1.5, -1.5, -1.5, -1.5, -1.5, -1.5, -1.25, -1.25, -1.25, -1.0, -1.0, -1.0, -1.0,
           -1.0, -1.0, -0.75, -0.75, -0.5, -0.5, -0.5, -0.5, -0.25, -0.25, -0.25, -0.25, 0.25,
           0.25, 0.25, 0.25, 0.5, 0.5, 0.5, 0.5, 0.5, 0.5, 0.5, 0.75, 0.75, 0.75, 0.75, 1.0,
           1.0, 1.25, 1.25, 1.5, 1.5]
J_TPS_A = [-24, -23, -19, -13, -11, -10, -19, -15, -6, -26, -21, -17, -16, -9, -8, -15, -14,
           -26, -13, -9, -7, -27, -25, -11, -6, 1, 4, 8, 11, 0, 1, 5, 6, 10, 14, 16, 0, 4, 9,
           17, 7, 18, 3, 15, 5, 18]
n_TPS_A = [-0.39235983861984e6, 0.51526573827270e6, 0.40482443161048e5, -0.32193790923902e3,
           0.96961424218694e2, -0.22867846371773e2, -0.44942914124357e6, -0.50118336020166e4,
           0.35684463560015, 0.44235335848190e5, -0.13673388811708e5, 0.42163260207864e6,
           0.22516925837475e5, 0.47442144865646e3, -0.14931130797647e3, -0.19781126320452e6,
           -0.23554399470760e5, -0.19070616302076e5, 0.55375669883164e5, 0.38293691437363e4,
           -0.60391860580567e3, 0.19363102620331e4, 0.42660643698610e4, -0.59780638872718e4,
           -0.70401463926862e3, 0.33836784107553e3, 0.20862786635187e2, 0.33834172656196e-1,
           -0.43124428414893e-4, 0.16653791356412e3, -0.13986292055898e3, -0.78849547999872,
           0.72132411753872e-1, -0.59754839398283e-2, -0.12141358953904e-4,
           0.23227096733871e-6, -0.10538463566194e2, 0.20718925496502e1, -0.72193155260427e-1,
           0.20749887081120e-6, -0.18340657911379e-1, 0.29036272348696e-6, 0.21037527893619,
           0.25681239729999e-3, -0.12799002933781e-1, -0.82198102652018e-5]

# IAPWS R7-97(2012) Table 26: backward equation T(p, s) for subregion 2b, eq. 26
I_TPS_B = [-6, -6, -5, -5, -4, -4, -4, -3, -3, -3, -3, -2, -2, -2, -2, -1, -1, -1, -1, -1, 0,
           0, 0, 0, 0, 0, 0, 1, 1, 1, 1, 1, 1, 2, 2, 2, 3, 3, 3, 4, 4, 5, 5, 5]
J_TPS_B = [0, 11, 0, 11, 0, 1, 11, 0, 1, 11, 12, 0, 1, 6, 10, 0, 1, 5, 8, 9, 0, 1, 2, 4, 5, 6,
           9, 0, 1, 2, 3, 7, 8, 0, 1, 5, 0, 1, 3, 0, 1, 0, 1, 2]
n_TPS_B = [0.31687665083497e6, 0.20864175881858e2, -0.39859399803599e6, -0.21816058518877e2,
           0.22369785194242e6, -0.27841703445817e4, 0.99207436071480e1, -0.75197512299157e5,
           0.29708605951158e4, -0.34406878548526e1, 0.38815564249115, 0.17511295085750e5,
           -0.14237112854449e4, 0.10943803364167e1, 0.89971619308495, -0.33759740098958e4,
           0.47162885818355e3, -0.19188241993679e1, 0.41078580492196, -0.33465378172097,
           0.13870034777505e4, -0.40663326195838e3, 0.41727347159610e2, 0.21932549434532e1,
           -0.10320050009077e1, 0.35882943516703, 0.52511453726066e-2, 0.12838916450705e2,
           -0.28642437219381e1, 0.56912683664855, -0.99962954584931e-1, -0.32632037778459e-2,
           0.23320922576723e-3, -0.15334809857450, 0.29072288239902e-1, 0.37534702741167e-3,
           0.17296691702411e-2, -0.38556050844504e-3, -0.35017712292608e-4,
           -0.14566393631492e-4, 0.56420857267269e-5, 0.41286150074605e-7,
           -0.20684671118824e-7, 0.16409393674725e-8]

# IAPWS R7-97(2012) Table 27: backward equation T(p, s) for subregion 2c, eq. 27
I_TPS_C = [-2, -2, -1, 0, 0, 0, 0, 1, 1, 1, 1, 2, 2, 2, 3, 3, 3, 4, 4, 4, 5, 5, 5, 6, 6, 7, 7,
           7, 7, 7]
J_TPS_C = [0, 1, 0, 0, 1, 2, 3, 0, 1, 3, 4, 0, 1, 2, 0, 1, 5, 0, 1, 4, 0, 1, 2, 0, 1, 0, 1, 3,
           4, 5]
n_TPS_C = [0.90968501005365e3, 0.24045667088420e4, -0.59162326387130e3, 0.54145404128074e3,
           -0.27098308411192e3, 0.97976525097926e3, -0.46966772959435e3, 0.14399274604723e2,
           -0.19104204230429e2, 0.53299167111971e1, -0.21252975375934e2, -0.31147334413760,
           0.60334840894623, -0.42764839702509e-1, 0.58185597255259e-2, -0.14597008284753e-1,
           0.56631175631027e-2, -0.76155864584577e-4, 0.22440342919332e-3,
           -0.12561095013413e-4, 0.63323132660934e-6, -0.20541989675375e-5,
           0.36405370390082e-7, -0.29759897789215e-8, 0.10136618529763e-7,
           0.59925719692351e-11, -0.20677870105164e-10, -0.20874278181886e-10,
           0.10162166825089e-9, -0.16429828281347e-9]

#: pressure of the 2a / 2b,2c split, Pa, and entropy of the 2b / 2c split for T(p, s), J/(kg K)
P_AB = 4e6
S_BC = 5.85e3

#: below this pressure (Pa) the refined T(p, s) starts from eq. 25 at P_LOW_S with s shifted by
#: the ideal-gas term R ln(p / P_LOW_S): eq. 25 itself loses accuracy below ~600 Pa
P_LOW_S = 1e3

_GAMMA0 = BlockSeries(J0, None, n0)
_GAMMA0_META = BlockSeries(J0, None, n0_META)
_GAMMAR = BlockSeries(I, J, n)
_GAMMAR_META = BlockSeries(I_META, J_META, n_META)
# pi * gamma_r_pi = sum n I pi**I (tau - 0.5)**J, for the lean density
_PI_GAMMAR_PI = BlockSeries(I, J, [c * i for i, c in zip(I, n)])

_TPH_A = BlockSeries(I_TPH_A, J_TPH_A, n_TPH_A)
_TPH_B = BlockSeries(I_TPH_B, J_TPH_B, n_TPH_B)
_TPH_C = BlockSeries(I_TPH_C, J_TPH_C, n_TPH_C)
_TPS_A = BlockSeries([int(round(4 * i)) for i in I_TPS_A], J_TPS_A, n_TPS_A)
_TPS_B = BlockSeries(I_TPS_B, J_TPS_B, n_TPS_B)
_TPS_C = BlockSeries(I_TPS_C, J_TPS_C, n_TPS_C)

_ALL = [(0, 0), (1, 0), (2, 0), (0, 1), (0, 2), (1, 1)]


# ---------------------------------------------------------------------------------------------
# basic equation and metastable-vapour equation


def _gibbs(p, T, ideal, residual):
    pi = np.asarray(p, dtype=float) / P_STAR
    tau = T_STAR / np.asarray(T, dtype=float)
    g0, g0t, g0tt = ideal.values(tau, None, [(0, 0), (1, 0), (2, 0)])
    gr, grp, grpp, grt, grtt, grpt = residual.values(pi, tau - 0.5, _ALL)
    return {"pi": pi, "tau": tau,
            "g": np.log(pi) + g0 + gr,
            "g_p": 1.0 / pi + grp,
            "g_pp": -1.0 / (pi * pi) + grpp,
            "g_t": g0t + grt,
            "g_tt": g0tt + grtt,
            "g_pt": grpt}


def gibbs_derivs(p, T):
    """gamma(pi, tau) of eq. 15 and its derivatives at p (Pa), T (K); dict with keys
    pi tau g g_p g_pp g_t g_tt g_pt."""
    return _gibbs(p, T, _GAMMA0, _GAMMAR)


def gibbs_derivs_metastable(p, T):
    """As ``gibbs_derivs`` for the metastable-vapour equation, eqs. 18-19."""
    return _gibbs(p, T, _GAMMA0_META, _GAMMAR_META)


def props(p, T):
    """Region 2 properties at p (Pa), T (K): dict with keys v rho u h s cp cv w kappa drhodp."""
    return from_gibbs(np.asarray(p, dtype=float), np.asarray(T, dtype=float),
                      p_star=P_STAR, **gibbs_derivs(p, T))


def props_metastable(p, T):
    """Metastable-vapour properties (eqs. 18-19) at p (Pa), T (K); same keys as ``props``."""
    return from_gibbs(np.asarray(p, dtype=float), np.asarray(T, dtype=float),
                      p_star=P_STAR, **gibbs_derivs_metastable(p, T))


def density(p, T):
    """Region 2 density (kg/m^3) at p (Pa), T (K), from gamma_r_pi only (fast path):
    rho = p / (R T (1 + pi gamma_r_pi))."""
    shape, pf, Tf = flat_pair(p, T)
    x = np.divide(pf, P_STAR)
    y = np.divide(T_STAR, Tf)
    y -= 0.5
    out = np.empty(pf.shape)
    _PI_GAMMAR_PI.evaluate(x, y, [out], [(0, 0)])
    out += 1.0
    out *= Tf
    out *= R
    np.divide(pf, out, out=out)
    return out.reshape(shape)[()]


# ---------------------------------------------------------------------------------------------
# B2bc boundary and backward equations


def h_2bc(p):
    """Specific enthalpy (J/kg) on the B2bc boundary at pressure p (Pa), eq. 21."""
    pi = np.asarray(p, dtype=float) / 1e6
    return (N_BC[3] + np.sqrt((pi - N_BC[4]) / N_BC[2])) * 1e3


def p_2bc(h):
    """Pressure (Pa) on the B2bc boundary at specific enthalpy h (J/kg), eq. 20."""
    eta = np.asarray(h, dtype=float) / 1e3
    return (N_BC[0] + N_BC[1] * eta + N_BC[2] * eta * eta) * 1e6


def subregion_ph(p, h):
    """Subregion of T(p, h) as int array: 1 = 2a (p <= 4 MPa), 3 = 2c (p > 4 MPa and
    h < h_2bc(p)), 2 = 2b (the other points above 4 MPa, including those below
    p = n5 = 4.53 MPa where eq. 21 has no value; B2bc itself starts at 6.55 MPa)."""
    p, h = np.broadcast_arrays(np.asarray(p, dtype=float), np.asarray(h, dtype=float))
    high = p > P_AB
    hbc = h_2bc(np.where(high & (p >= N_BC[4] * 1e6), p, 100e6))
    hbc = np.where(p >= N_BC[4] * 1e6, hbc, -np.inf)
    return np.where(high, np.where(h < hbc, 3, 2), 1)[()]


def subregion_ps(p, s):
    """Subregion of T(p, s) as int array: 1 = 2a (p <= 4 MPa), 2 = 2b (p > 4 MPa and
    s >= 5.85 kJ/(kg K)), 3 = 2c (p > 4 MPa and s < 5.85 kJ/(kg K))."""
    p, s = np.broadcast_arrays(np.asarray(p, dtype=float), np.asarray(s, dtype=float))
    return np.where(p > P_AB, np.where(s >= S_BC, 2, 3), 1)[()]


def _tph_raw(sub, p, h):
    pi = p / 1e6
    eta = h / 2000e3
    T = np.empty(p.shape)
    for code, series, dp, de in ((1, _TPH_A, 0.0, -2.1), (2, _TPH_B, -2.0, -2.6),
                                 (3, _TPH_C, 25.0, -1.8)):
        m = sub == code
        if m.any():
            T[m] = series.value(pi[m] + dp, eta[m] + de)
    return T


def _tps_raw(sub, p, s):
    pi = p / 1e6
    T = np.empty(p.shape)
    m = sub == 1
    if m.any():
        T[m] = _TPS_A.value(np.sqrt(np.sqrt(pi[m])), s[m] / 2000.0 - 2.0)
    m = sub == 2
    if m.any():
        T[m] = _TPS_B.value(pi[m], 10.0 - s[m] / 785.3)
    m = sub == 3
    if m.any():
        T[m] = _TPS_C.value(pi[m], 2.0 - s[m] / 2925.1)
    return T


def temperature_ph(p, h, refine=True):
    """Temperature (K) from pressure p (Pa) and specific enthalpy h (J/kg), eqs. 22-24.

    ``refine=False`` returns the backward equation of the point's subregion; ``refine=True``
    (default) then applies Newton steps T <- T - (h(p, T) - h) / cp(p, T) on eq. 15.
    """
    shape, pf, hf = flat_pair(p, h)
    T = _tph_raw(subregion_ph(pf, hf), pf, hf)
    if refine:
        pi = pf / P_STAR

        def correction(T):
            tau = T_STAR / T
            g0t, g0tt = _GAMMA0.values(tau, None, [(1, 0), (2, 0)])
            grt, grtt = _GAMMAR.values(pi, tau - 0.5, [(0, 1), (0, 2)])
            # h = R T* gamma_tau ; cp = -R tau^2 gamma_tautau
            return (R * T_STAR * (g0t + grt) - hf) / (-R * tau * tau * (g0tt + grtt))
        T = newton(T, correction)
    return T.reshape(shape)[()]


def temperature_ps(p, s, refine=True):
    """Temperature (K) from pressure p (Pa) and specific entropy s (J/(kg K)), eqs. 25-27.

    ``refine=False`` returns the backward equation of the point's subregion; ``refine=True``
    (default) then applies Newton steps T <- T - (s(p, T) - s) T / cp(p, T) on eq. 15,
    starting below ``P_LOW_S`` from eq. 25 at ``P_LOW_S`` with s shifted by R ln(p / P_LOW_S)
    (ideal-gas behaviour), since eq. 25 itself degrades below ~600 Pa.
    """
    shape, pf, sf = flat_pair(p, s)
    if not refine:
        return _tps_raw(subregion_ps(pf, sf), pf, sf).reshape(shape)[()]
    # start: eq. 25-27, below P_LOW_S at P_LOW_S with the ideal-gas entropy shift
    low = pf < P_LOW_S
    p0 = np.where(low, P_LOW_S, pf)
    with np.errstate(divide="ignore", invalid="ignore"):
        s0 = np.where(low, sf + R * np.log(pf / P_LOW_S), sf)
    T = _tps_raw(subregion_ps(p0, s0), p0, s0)
    pi = pf / P_STAR
    lnpi = np.log(pi)

    def correction(T):
        tau = T_STAR / T
        g0, g0t, g0tt = _GAMMA0.values(tau, None, [(0, 0), (1, 0), (2, 0)])
        gr, grt, grtt = _GAMMAR.values(pi, tau - 0.5, [(0, 0), (0, 1), (0, 2)])
        # s = R (tau gamma_tau - gamma) ; ds/dT = cp / T
        sT = R * (tau * (g0t + grt) - (lnpi + g0 + gr))
        return (sT - sf) * T / (-R * tau * tau * (g0tt + grtt))
    return newton(T, correction).reshape(shape)[()]
