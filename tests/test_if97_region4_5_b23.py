"""IAPWS-IF97 saturation line (region 4), region 5 and the B23 boundary.

Printed values are those of the computer-program verification tables of IAPWS R7-97(2012)
(Tables 35, 36, 42 and the B23 check value after eq. 6), taken from verbatim public
transcriptions of the release's tables (the release text itself could not be retrieved here);
two independent transcriptions agree, and so do the iapws package's docstrings where they
quote them. Each value is checked to half a unit of its last printed digit.
"""

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from printed import assert_printed, half_unit  # noqa: F401
from gen.if97 import b23, region1, region2, region4, region5






# --------------------------------------------------------------------------------------------
# region 4

# IAPWS R7-97(2012) Table 35: saturation pressure; (T/K, printed p_sat/MPa)
TABLE35 = [(300.0, "0.353658941e-2"), (500.0, "0.263889776e1"), (600.0, "0.123443146e2")]
# IAPWS R7-97(2012) Table 36: saturation temperature; (p/MPa, printed T_sat/K)
TABLE36 = [(0.1, "0.372755919e3"), (1.0, "0.453035632e3"), (10.0, "0.584149488e3")]


@pytest.mark.parametrize("T,printed", TABLE35)
def test_table35_saturation_pressure(T, printed):
    assert_printed(region4.saturation_pressure(T) / 1e6, printed)  # R7-97(2012) Table 35


@pytest.mark.parametrize("p_mpa,printed", TABLE36)
def test_table36_saturation_temperature(p_mpa, printed):
    assert_printed(region4.saturation_temperature(p_mpa * 1e6), printed)  # R7-97(2012) Table 36


def test_dpsat_dT_matches_numerical_derivative():
    T = np.linspace(273.15, 647.0, 300)
    h = 1e-3
    ps = region4.saturation_pressure
    # fourth-order central difference
    num = (8 * (ps(T + h) - ps(T - h)) - (ps(T + 2 * h) - ps(T - 2 * h))) / (12 * h)
    assert np.allclose(region4.dpsat_dT(T), num, rtol=1e-8, atol=0)


def test_dpsat_dT_agrees_with_clausius_clapeyron():
    # regions 1 and 2 meet the saturation line only within IF97's consistency tolerances,
    # so Clapeyron's dp/dT = (s'' - s') / (v'' - v') holds to ~1e-4 relative
    T = np.linspace(280.0, 620.0, 35)
    p = region4.saturation_pressure(T)
    liq, vap = region1.props(p, T), region2.props(p, T)
    clapeyron = (vap["s"] - liq["s"]) / (vap["v"] - liq["v"])
    assert np.allclose(region4.dpsat_dT(T), clapeyron, rtol=2e-3, atol=0)


def test_region4_scalars_and_shapes():
    assert np.ndim(region4.saturation_pressure(300.0)) == 0
    assert np.ndim(region4.saturation_temperature(1e5)) == 0
    assert np.ndim(region4.dpsat_dT(300.0)) == 0
    assert region4.saturation_pressure(np.full((2, 3), 400.0)).shape == (2, 3)


def test_saturation_round_trip_over_the_line():
    # 1 ulp of T moves p_sat by up to (d ln p / d ln T ~ 10) * 1.1e-16 near the critical point;
    # eq. 31 here is within 2.5e-15 of exact, so the round trip keeps p to ~2e-14
    p = np.geomspace(611.213, 22.064e6, 20000)
    back = region4.saturation_pressure(region4.saturation_temperature(p))
    assert np.max(np.abs(back / p - 1.0)) < 3e-14
    T = np.linspace(273.15, 647.096, 20000)
    assert np.max(np.abs(region4.saturation_temperature(region4.saturation_pressure(T)) / T - 1)) \
        < 3e-15


def test_saturation_coefficients_against_an_independent_implementation():
    # Eqs. 30 and 31 invert each other for any coefficients and the 9-digit Tables 35/36 miss
    # last-digit slips; the iapws package's p_sat agrees to 8e-15, while a 1e-14 relative
    # slip in any of n1..n8 moves p_sat by 8e-14 or more (one in n9 or n10 stays below 1 ulp)
    from iapws.iapws97 import _PSat_T, _TSat_P

    T = np.linspace(273.15, 647.096, 400)
    ref = np.array([_PSat_T(t) for t in T]) * 1e6
    assert np.max(np.abs(region4.saturation_pressure(T) / ref - 1)) < 4e-14
    p = np.geomspace(611.3, 22.06e6, 200)
    ref = np.array([_TSat_P(x / 1e6) for x in p])
    assert np.max(np.abs(region4.saturation_temperature(p) / ref - 1)) < 1e-13


@settings(max_examples=200, deadline=None)
@given(st.floats(np.log(611.213), np.log(22.064e6)))
def test_hypothesis_psat_of_tsat_is_identity(logp):
    p = float(np.exp(logp))
    assert abs(region4.saturation_pressure(region4.saturation_temperature(p)) / p - 1) < 3e-14


# --------------------------------------------------------------------------------------------
# B23

def test_b23_check_values():
    # R7-97(2012), check values after eq. 6: T = 0.623150000e3 K <-> p = 0.165291643e2 MPa
    assert_printed(b23.b23_pressure(623.15) / 1e6, "0.165291643e2")
    assert_printed(b23.b23_temperature(0.165291643e2 * 1e6), "0.623150000e3")


def test_b23_coefficients_are_consistent():
    # eq. 6 inverts eq. 5: n4 = -n2 / (2 n3), n5 = n1 - n2^2 / (4 n3) to the printed digits;
    # eq. 5 agrees with the iapws package's B23 to round-off (n1..n3)
    from iapws.iapws97 import _P23_T

    n1, n2, n3, n4, n5 = b23.N
    assert -n2 / (2 * n3) == pytest.approx(n4, rel=5e-14)
    assert n1 - n2 * n2 / (4 * n3) == pytest.approx(n5, rel=2e-12)
    T = np.linspace(623.15, 863.15, 50)
    assert np.allclose(b23.b23_pressure(T), [_P23_T(t) * 1e6 for t in T], rtol=1e-14, atol=0)


def test_b23_equations_invert_each_other():
    # exact inverses only to the 14 digits of Table 1, and eq. 5 cancels ~45-fold at 623 K
    T = np.linspace(623.15, 863.15, 200)
    assert np.allclose(b23.b23_temperature(b23.b23_pressure(T)), T, rtol=1e-11, atol=0)
    assert b23.b23_pressure(863.15) == pytest.approx(100e6, rel=1e-4)


# --------------------------------------------------------------------------------------------
# region 5

TO_TABLE_UNIT = {"v": 1.0, "h": 1e-3, "u": 1e-3, "s": 1e-3, "cp": 1e-3, "w": 1.0}

# IAPWS R7-97(2012) Table 42: region 5 at (T/K, p/MPa); v m3/kg, h u kJ/kg, s cp kJ/(kg K), w m/s
TABLE42_POINTS = [(1500.0, 0.5), (1500.0, 30.0), (2000.0, 30.0)]
TABLE42 = {
    "v": ("0.138455090e1", "0.230761299e-1", "0.311385219e-1"),
    "h": ("0.521976855e4", "0.516723514e4", "0.657122604e4"),
    "u": ("0.452749310e4", "0.447495124e4", "0.563707038e4"),
    "s": ("0.965408875e1", "0.772970133e1", "0.853640523e1"),
    "cp": ("0.261609445e1", "0.272724317e1", "0.288569882e1"),
    "w": ("0.917068690e3", "0.928548002e3", "0.106736948e4"),
}


@pytest.mark.parametrize("key", sorted(TABLE42))
@pytest.mark.parametrize("col", range(3))
def test_table42_region5_properties(key, col):
    T, p_mpa = TABLE42_POINTS[col]
    d = region5.props(p_mpa * 1e6, T)
    assert_printed(d[key] * TO_TABLE_UNIT[key], TABLE42[key][col])  # R7-97(2012) Table 42


def test_region5_coefficients_match_an_independent_transcription():
    # R7-97(2012) Tables 37 and 38 compared exactly with the iapws package's transcription
    import iapws._iapws97Constants as C

    for mine, theirs in ((region5.J0, C.Region5_cp0_Jo), (region5.n0, C.Region5_cp0_no),
                         (region5.I, C.Region5_Li), (region5.J, C.Region5_Lj),
                         (region5.n, C.Region5_n)):
        assert np.array_equal(np.asarray(mine, dtype=float), np.asarray(theirs, dtype=float))


def region5_points(n, seed=1):
    rng = np.random.default_rng(seed)
    return 10.0 ** rng.uniform(2.0, np.log10(50e6), n), rng.uniform(1073.15, 2273.15, n)


def test_region5_density_matches_props():
    p, T = region5_points(50000)
    assert np.max(np.abs(region5.density(p, T) / region5.props(p, T)["rho"] - 1)) < 1e-14
    assert np.ndim(region5.density(1e6, 1500.0)) == 0
    assert region5.props(np.array([1e6, 2e6])[:, None], np.array([1500.0, 2000.0]))[
        "w"].shape == (2, 2)


def test_region5_cross_check_iapws_package():
    from iapws.iapws97 import _Region5

    p, T = region5_points(30, seed=2)
    d = region5.props(p, T)
    for k in range(p.size):
        ref = _Region5(T[k], p[k] / 1e6)
        for key, scale in (("v", 1.0), ("h", 1e3), ("s", 1e3), ("cp", 1e3), ("cv", 1e3),
                           ("w", 1.0)):
            assert d[key][k] == pytest.approx(ref[key] * scale, rel=1e-12)
