"""Verification of gen/if97/transport.py against the check values printed in the IAPWS releases.

Every expected number is written as the release prints it (as a string, so that trailing zeros
count) and is checked to the last printed digit: |computed - printed| <= half a unit of the
last printed place. Sources, by table:

    R12-08      Table 4   viscosity at (T, rho), mu2 = 1                      11 values
    R15-11      Table 4   lambda at (T, rho) where lambda2 = 0                 4 values
    R15-11      Table 5   lambda0(647.35 K) and lambda1 at 8 densities         9 values
                          (the lambda2 and lambda columns of Table 5 need IAPWS-95 and the
                          scientific reference state, so they are not checked here)
    R15-11      Table 7   industrial formulation, region 1, (T, p)            2 x 4 values
    R15-11      Table 8   industrial formulation, region 2, (T, p)            2 values
    R15-11      Table 9   industrial formulation, region 3, (T, rho)          2 values
    R1-76(2014) Table 1   surface tension, selected temperatures             20 values

cp, cv and (d rho/d p)_T for the industrial-formulation tables (7-9) come from IF97:

* ``source="iapws"``: the ``iapws`` package's IF97 (``iapws.IAPWS97`` for (T, p) points,
  its region-3 function for (T, rho) points). This checks transport.py on its own.
* ``source="gen"``: this package's IF97 modules (gen/if97/region1.py, region2.py,
  region3.py), for Tables 7 (region 1), 8 (region 2) and 9 (region 3).
"""

import importlib
import importlib.util

import numpy as np
import pytest

from printed import assert_printed
from gen.if97 import transport as tr
from gen.if97.constants import TC

#: regions whose gen/if97 module feeds the industrial-formulation checks
GEN_IF97_REGIONS = (1, 2, 3)




# ----------------------------------------------------------------------------------------------
# IF97 inputs for the critical enhancement: rho, cp, cv, drhodp in SI
# ----------------------------------------------------------------------------------------------

def _if97_iapws(region, T, p=None, rho=None):
    """From the iapws package's IF97 (test-only dependency)."""
    if region == 3:
        from iapws.iapws97 import _Region3

        d = _Region3(rho, T)
        # kt is the isothermal compressibility in 1/MPa: (d rho/d p)_T = rho * kt
        return rho, d["cp"] * 1e3, d["cv"] * 1e3, rho * d["kt"] * 1e-6
    from iapws import IAPWS97

    s = IAPWS97(T=T, P=p * 1e-6)
    assert s.region == region
    return s.rho, s.cp * 1e3, s.cv * 1e3, s.drhodP_T * 1e-6


def _if97_gen(region, T, p=None, rho=None):
    """From this package's IF97 region modules (skip if the module is not there yet)."""
    name = f"gen.if97.region{region}"
    if importlib.util.find_spec(name) is None:
        pytest.skip(f"{name} does not exist yet")
    mod = importlib.import_module(name)
    d = mod.props_rhoT(rho, T) if region == 3 else mod.props(p, T)
    return float(d["rho"]), float(d["cp"]), float(d["cv"]), float(d["drhodp"])


def if97_inputs(source, region, T, p=None, rho=None):
    if source == "iapws":
        return _if97_iapws(region, T, p, rho)
    if region not in GEN_IF97_REGIONS:
        pytest.skip(f"gen IF97 region {region} not switched on (GEN_IF97_REGIONS)")
    return _if97_gen(region, T, p, rho)


SOURCES = ("iapws", "gen")


# ----------------------------------------------------------------------------------------------
# R12-08 viscosity
# ----------------------------------------------------------------------------------------------

# R12-08 Table 4: sample points for computer-program verification of Eq. (10) with mu2 = 1.
# T [K], rho [kg/m^3], mu [micro Pa s]
R12_TABLE4 = [
    (298.15, 998.0, "889.735100"),
    (298.15, 1200.0, "1437.649467"),
    (373.15, 1000.0, "307.883622"),
    (433.15, 1.0, "14.538324"),
    (433.15, 1000.0, "217.685358"),
    (873.15, 1.0, "32.619287"),
    (873.15, 100.0, "35.802262"),
    (873.15, 600.0, "77.430195"),
    (1173.15, 1.0, "44.217245"),
    (1173.15, 100.0, "47.640433"),
    (1173.15, 400.0, "64.154608"),
]


@pytest.mark.parametrize("T,rho,mu", R12_TABLE4)
def test_viscosity_r12_table4(T, rho, mu):
    assert_printed(tr.viscosity(rho, T), mu, unit=1e-6)  # R12-08 Table 4


def test_viscosity_r12_table4_vectorized():
    T = np.array([r[0] for r in R12_TABLE4])
    rho = np.array([r[1] for r in R12_TABLE4])
    mu = tr.viscosity(rho, T)
    assert mu.shape == T.shape
    for m, (_, _, printed) in zip(mu, R12_TABLE4):
        assert_printed(m, printed, unit=1e-6)  # R12-08 Table 4


# ----------------------------------------------------------------------------------------------
# R15-11 thermal conductivity: the parts that need no equation of state
# ----------------------------------------------------------------------------------------------

# R15-11 Table 4: sample points for Eq. (10) at which lambda2 = 0. T [K], rho, lambda [mW/(m K)]
R15_TABLE4 = [
    (298.15, 0.0, "18.4341883"),
    (298.15, 998.0, "607.712868"),
    (298.15, 1200.0, "799.038144"),
    (873.15, 0.0, "79.1034659"),
]


@pytest.mark.parametrize("T,rho,lam", R15_TABLE4)
def test_conductivity_r15_table4_background(T, rho, lam):
    # lambda0 * lambda1 only: Table 4 is printed with lambda2 = 0. cp/cv/drhodp are dummies.
    lam0, lam1, _ = tr.thermal_conductivity_terms(rho, T, 4000.0, 3000.0, 0.0)
    assert_printed(lam0 * lam1, lam, unit=1e-3)  # R15-11 Table 4


def test_conductivity_r15_table4_zero_density_has_no_enhancement():
    # at rho = 0, Eq. (18) is proportional to rho bar, so the full function must give Table 4
    lam = tr.thermal_conductivity(0.0, 298.15, 1900.0, 1400.0, 1e-5)
    assert_printed(lam, "18.4341883", unit=1e-3)  # R15-11 Table 4


# R15-11 Table 5: lambda0 bar(647.35 K) = 51.5764797 for all rows, and lambda1 bar at
# T = 647.35 K. rho [kg/m^3], lambda1 bar [1]
R15_TABLE5_LAMBDA0 = "51.5764797"
R15_TABLE5_LAMBDA1 = [
    (1.0, "1.0068497"),
    (122.0, "2.1445173"),
    (222.0, "3.4840736"),
    (272.0, "4.2233708"),
    (322.0, "4.9681953"),
    (372.0, "5.6961250"),
    (422.0, "6.3973429"),
    (750.0, "11.5870532"),
]


@pytest.mark.parametrize("rho,lam1", R15_TABLE5_LAMBDA1)
def test_conductivity_r15_table5_lambda0_lambda1(rho, lam1):
    lam0, l1, _ = tr.thermal_conductivity_terms(rho, 647.35, 4000.0, 3000.0, 0.0)
    assert_printed(lam0, R15_TABLE5_LAMBDA0, unit=1e-3)  # R15-11 Table 5, lambda0 bar
    assert_printed(l1, lam1)  # R15-11 Table 5, lambda1 bar


# ----------------------------------------------------------------------------------------------
# R15-11 industrial formulation (Tables 7-9): lambda2 with IF97 cp, cv, drhodp
# ----------------------------------------------------------------------------------------------

# R15-11 Table 7: industrial formulation, region 1. T [K], p [Pa],
# lambda [mW/(m K)], lambda0 bar, lambda1 bar, lambda2 bar
R15_TABLE7 = [
    (620.0, 20e6, "481.485195", "48.4911627", "9.66869008", "12.6391714"),
    (620.0, 50e6, "545.038940", "48.4911627", "11.1212177", "5.75816285"),
]

# R15-11 Table 8: industrial formulation, region 2. T [K], p [Pa], lambda [mW/(m K)]
R15_TABLE8 = [
    (650.0, 0.3e6, "52.2311024"),
    (800.0, 50e6, "177.709914"),
]

# R15-11 Table 9: industrial formulation, region 3. T [K], rho [kg/m^3], lambda [mW/(m K)]
R15_TABLE9 = [
    (647.35, 222.0, "366.879411"),
    (647.35, 322.0, "1241.82415"),
]


@pytest.mark.parametrize("source", SOURCES)
@pytest.mark.parametrize("T,p,lam,lam0,lam1,lam2", R15_TABLE7)
def test_conductivity_r15_table7_region1(source, T, p, lam, lam0, lam1, lam2):
    rho, cp, cv, drhodp = if97_inputs(source, 1, T, p=p)
    t0, t1, t2 = tr.thermal_conductivity_terms(rho, T, cp, cv, drhodp)
    assert_printed(t0, lam0, unit=1e-3)  # R15-11 Table 7, lambda0 bar
    assert_printed(t1, lam1)  # R15-11 Table 7, lambda1 bar
    assert_printed(t2, lam2, unit=1e-3)  # R15-11 Table 7, lambda2 bar
    assert_printed(tr.thermal_conductivity(rho, T, cp, cv, drhodp), lam, unit=1e-3)  # Table 7


@pytest.mark.parametrize("source", SOURCES)
@pytest.mark.parametrize("T,p,lam", R15_TABLE8)
def test_conductivity_r15_table8_region2(source, T, p, lam):
    rho, cp, cv, drhodp = if97_inputs(source, 2, T, p=p)
    assert_printed(tr.thermal_conductivity(rho, T, cp, cv, drhodp), lam, unit=1e-3)  # Table 8


@pytest.mark.parametrize("source", SOURCES)
@pytest.mark.parametrize("T,rho,lam", R15_TABLE9)
def test_conductivity_r15_table9_region3(source, T, rho, lam):
    rho_, cp, cv, drhodp = if97_inputs(source, 3, T, rho=rho)
    assert rho_ == rho
    assert_printed(tr.thermal_conductivity(rho, T, cp, cv, drhodp), lam, unit=1e-3)  # Table 9


def test_conductivity_industrial_tables_vectorized():
    # all six industrial points in one call, inputs from the iapws package's IF97
    pts = [(1, T, p, None, lam) for T, p, lam, *_ in R15_TABLE7]
    pts += [(2, T, p, None, lam) for T, p, lam in R15_TABLE8]
    pts += [(3, T, None, rho, lam) for T, rho, lam in R15_TABLE9]
    cols = np.array([if97_inputs("iapws", reg, T, p=p, rho=rho) for reg, T, p, rho, _ in pts])
    T = np.array([pt[1] for pt in pts])
    lam = tr.thermal_conductivity(cols[:, 0], T, cols[:, 1], cols[:, 2], cols[:, 3])
    assert lam.shape == T.shape
    for value, pt in zip(lam, pts):
        assert_printed(value, pt[4], unit=1e-3)  # R15-11 Tables 7, 8, 9


# ----------------------------------------------------------------------------------------------
# R1-76(2014) surface tension
# ----------------------------------------------------------------------------------------------

# R1-76(2014) Table 1 (selected rows): t [deg C], sigma [mN/m]
R1_TABLE1 = [
    (0.01, "75.65"), (10.0, "74.22"), (20.0, "72.74"), (30.0, "71.19"), (40.0, "69.60"),
    (50.0, "67.94"), (60.0, "66.24"), (70.0, "64.48"), (80.0, "62.67"), (90.0, "60.82"),
    (100.0, "58.91"), (120.0, "54.97"), (140.0, "50.86"), (160.0, "46.59"), (180.0, "42.19"),
    (200.0, "37.67"), (250.0, "26.04"), (300.0, "14.36"), (350.0, "3.67"), (370.0, "0.39"),
]


@pytest.mark.parametrize("t,sigma", R1_TABLE1)
def test_surface_tension_r1_table1(t, sigma):
    assert_printed(tr.surface_tension(t + 273.15), sigma, unit=1e-3)  # R1-76(2014) Table 1


def test_surface_tension_vectorized_and_range():
    T = np.array([t for t, _ in R1_TABLE1]) + 273.15
    s = tr.surface_tension(T, check=True)
    for value, (_, printed) in zip(s, R1_TABLE1):
        assert_printed(value, printed, unit=1e-3)  # R1-76(2014) Table 1
    # ends of the range: zero at the critical point, finite at -25 C, NaN outside
    assert float(tr.surface_tension(TC)) == 0.0
    assert np.isfinite(tr.surface_tension(248.15))
    out = tr.surface_tension(np.array([248.0, 647.2, 700.0, np.nan]))
    assert np.all(np.isnan(out))


@pytest.mark.parametrize("T", [647.2, 200.0, np.nan])
def test_surface_tension_check_raises(T):
    with pytest.raises(ValueError) as e:
        tr.surface_tension(np.array([300.0, T]), check=True)
    msg = str(e.value)
    assert "T =" in msg and "248.15" in msg and "647.096" in msg
    assert repr(float(T)) in msg


# ----------------------------------------------------------------------------------------------
# Array behaviour
# ----------------------------------------------------------------------------------------------

def test_scalars_and_broadcasting():
    rho = np.array([[1.0], [100.0], [600.0]])
    T = np.array([433.15, 873.15, 1173.15, 650.0])
    mu = tr.viscosity(rho, T)
    assert mu.shape == (3, 4)
    for i in range(3):
        for j in range(4):
            assert mu[i, j] == float(tr.viscosity(float(rho[i, 0]), float(T[j])))
    assert np.ndim(tr.viscosity(998.0, 298.15)) == 0
    assert np.ndim(tr.thermal_conductivity(998.0, 298.15, 4180.0, 4130.0, 4.5e-7)) == 0
    lam = tr.thermal_conductivity(rho, T, 4000.0, 3000.0, 1e-6)
    assert lam.shape == (3, 4)
    assert np.ndim(tr.surface_tension(300.0)) == 0


def test_reference_compressibility_table6_ranges_join_closely():
    # R15-11 Table 6 is piecewise in density; the pieces should meet closely at the bounds
    # (a property check, not a release number: guards the column selection).
    for bound in (0.310559006, 0.776397516, 1.242236025, 1.863354037):
        rho = bound * 322.0
        below = float(tr.drhodp_reference(rho))  # rho bar == bound -> lower column
        above = float(tr.drhodp_reference(rho * (1.0 + 1e-12)))
        assert below > 0.0 and above > 0.0
        assert abs(below / above - 1.0) < 5e-3


def test_conductivity_cp_limit_policy():
    # Policy, not a release number: c_p bar < 0 or > 1e13 is replaced by 1e13 (R15-11 text,
    # from memory; no R15-11 check value exercises it). Result must stay finite and equal the
    # value at c_p = 1e13 R.
    args = (322.0, 647.35)
    limit = tr.thermal_conductivity(*args, 1e13 * tr.R_LAMBDA, 3000.0, 1e-3)
    for cp in (-50.0, 1e20):
        lam = tr.thermal_conductivity(*args, cp, 3000.0, 1e-3)
        assert np.isfinite(lam) and lam == limit
