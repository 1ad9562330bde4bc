"""Region 1 of IAPWS-IF97: basic equation, lean density, backward equations T(p,h), T(p,s).

Printed values are those of the computer-program verification tables of IAPWS R7-97(2012)
(Tables 5, 7, 9), taken from verbatim public transcriptions of the release's tables (the
release text itself could not be retrieved here); two independent transcriptions agree, and
so do the iapws package's docstrings where they quote them. Each value is checked to half a
unit of its last printed digit.
"""

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from printed import assert_printed, half_unit  # noqa: F401
from gen.if97 import region1, region4






# --------------------------------------------------------------------------------------------
# IAPWS R7-97(2012) Table 5: region 1 at (T/K, p/MPa); v m3/kg, h u kJ/kg, s cp kJ/(kg K), w m/s
TABLE5_POINTS = [(300.0, 3.0), (300.0, 80.0), (500.0, 3.0)]
TABLE5 = {
    "v": ("0.100215168e-2", "0.971180894e-3", "0.120241800e-2"),
    "h": ("0.115331273e3", "0.184142828e3", "0.975542239e3"),
    "u": ("0.112324818e3", "0.106448356e3", "0.971934985e3"),
    "s": ("0.392294792", "0.368563852", "0.258041912e1"),
    "cp": ("0.417301218e1", "0.401008987e1", "0.465580682e1"),
    "w": ("0.150773921e4", "0.163469054e4", "0.124071337e4"),
}
# factor from SI (this package) to the table's unit
TO_TABLE_UNIT = {"v": 1.0, "h": 1e-3, "u": 1e-3, "s": 1e-3, "cp": 1e-3, "w": 1.0}


@pytest.mark.parametrize("key", sorted(TABLE5))
@pytest.mark.parametrize("col", range(3))
def test_table5_region1_properties(key, col):
    T, p_mpa = TABLE5_POINTS[col]
    d = region1.props(p_mpa * 1e6, T)
    assert_printed(d[key] * TO_TABLE_UNIT[key], TABLE5[key][col])  # R7-97(2012) Table 5


# IAPWS R7-97(2012) Table 7: backward T(p, h), region 1; (p/MPa, h/(kJ/kg), printed T/K)
TABLE7 = [(3.0, 500.0, "0.391798509e3"), (80.0, 500.0, "0.378108626e3"),
          (80.0, 1500.0, "0.611041229e3")]

# IAPWS R7-97(2012) Table 9: backward T(p, s), region 1; (p/MPa, s/(kJ/(kg K)), printed T/K)
TABLE9 = [(3.0, 0.5, "0.307842258e3"), (80.0, 0.5, "0.309979785e3"),
          (80.0, 3.0, "0.565899909e3")]


@pytest.mark.parametrize("p_mpa,h_kj,printed", TABLE7)
def test_table7_backward_T_ph(p_mpa, h_kj, printed):
    T = region1.temperature_ph(p_mpa * 1e6, h_kj * 1e3, refine=False)
    assert_printed(T, printed)  # R7-97(2012) Table 7


@pytest.mark.parametrize("p_mpa,s_kj,printed", TABLE9)
def test_table9_backward_T_ps(p_mpa, s_kj, printed):
    T = region1.temperature_ps(p_mpa * 1e6, s_kj * 1e3, refine=False)
    assert_printed(T, printed)  # R7-97(2012) Table 9


# --------------------------------------------------------------------------------------------
# consistency of the refined backward functions, density, shapes


def region1_points(n, seed=1):
    """Random (p, T) inside region 1: 273.15 K <= T <= 623.15 K, p_sat(T) <= p <= 100 MPa."""
    rng = np.random.default_rng(seed)
    T = rng.uniform(273.15, 623.15, n)
    ps = region4.saturation_pressure(T)
    p = ps + rng.uniform(0.0, 1.0, n) * (100e6 - ps)
    return p, T


def test_refined_T_ph_reproduces_h_to_round_off():
    p, T = region1_points(20000)
    h = region1.props(p, T)["h"]
    T_back = region1.temperature_ph(p, h)
    h_back = region1.props(p, T_back)["h"]
    # round-off of h itself: near saturation at 615-623 K the terms of gamma_tau cancel to
    # about 1/50 of their size, so h carries ~1e-14 relative noise (h is near 0 at 273 K)
    assert np.all(np.abs(h_back - h) <= 5e-14 * np.abs(h) + 1e-9)
    assert np.all(np.abs(T_back - T) <= 1e-12 * T)


def test_refined_T_ps_reproduces_s_to_round_off():
    p, T = region1_points(20000, seed=2)
    s = region1.props(p, T)["s"]
    T_back = region1.temperature_ps(p, s)
    s_back = region1.props(p, T_back)["s"]
    assert np.all(np.abs(s_back - s) <= 5e-14 * np.abs(s) + 1e-11)
    assert np.all(np.abs(T_back - T) <= 1e-12 * T)


def test_raw_backward_equations_within_release_tolerance():
    # R7-97(2012): T(p,h) and T(p,s) of region 1 agree with eq. 7 within 25 mK
    p, T = region1_points(20000, seed=3)
    d = region1.props(p, T)
    assert np.max(np.abs(region1.temperature_ph(p, d["h"], refine=False) - T)) < 25e-3
    assert np.max(np.abs(region1.temperature_ps(p, d["s"], refine=False) - T)) < 25e-3


def test_density_matches_props():
    p, T = region1_points(50000, seed=4)
    rho = region1.density(p, T)
    # same sum, powers built by different multiplication chains; the ~50-fold cancellation
    # of gamma_pi near 620 K turns their few-ulp differences into up to ~2e-14
    assert np.max(np.abs(rho / region1.props(p, T)["rho"] - 1.0)) < 5e-14


def test_scalars_and_broadcasting():
    rho = region1.density(3e6, 300.0)
    assert np.ndim(rho) == 0
    assert region1.props(3e6, 300.0)["h"].shape == ()
    assert np.ndim(region1.temperature_ph(3e6, 500e3)) == 0
    assert np.ndim(region1.temperature_ps(3e6, 500.0)) == 0
    grid = region1.density(np.array([1e6, 5e6, 50e6])[:, None], np.array([280.0, 350.0]))
    assert grid.shape == (3, 2)
    assert grid[1, 1] == region1.density(5e6, 350.0)
    assert region1.props(np.array([1e6, 2e6])[:, None], np.array([300.0, 310.0, 320.0]))[
        "cp"].shape == (2, 3)
    assert region1.temperature_ph(np.full((2, 3), 3e6), 500e3).shape == (2, 3)


def test_drhodp_matches_numerical_derivative():
    p, T = region1_points(200, seed=5)
    dp = 1e-3 * p + 1e3  # liquid: truncation error small, an absolute floor keeps round-off off
    num = (region1.density(p + dp, T) - region1.density(p - dp, T)) / (2 * dp)
    assert np.allclose(region1.props(p, T)["drhodp"], num, rtol=1e-6, atol=0)


def test_cross_check_iapws_package():
    from iapws.iapws97 import _Region1

    p, T = region1_points(40, seed=6)
    d = region1.props(p, T)
    for k in range(p.size):
        ref = _Region1(T[k], p[k] / 1e6)
        for key, scale in (("v", 1.0), ("h", 1e3), ("s", 1e3), ("cp", 1e3), ("cv", 1e3),
                           ("w", 1.0)):
            assert d[key][k] == pytest.approx(ref[key] * scale, rel=1e-12, abs=1e-9)


def test_coefficients_match_an_independent_transcription():
    # The 9-digit verification tables cannot see a slip in a coefficient's last digits (a
    # 1e-14 change of one n passes Tables 5, 7, 9), so every table is also compared exactly
    # with the iapws package's independent transcription of R7-97(2012) Tables 2, 6 and 8.
    import iapws._iapws97Constants as C

    for mine, theirs in ((region1.I, C.Region1_Li), (region1.J, C.Region1_Lj),
                         (region1.n, C.Region1_n),
                         (region1.I_TPH, C.Backward1_T_Ph_Li), (region1.J_TPH, C.Backward1_T_Ph_Lj),
                         (region1.n_TPH, C.Backward1_T_Ph_n),
                         (region1.I_TPS, C.Backward1_T_Ps_Li), (region1.J_TPS, C.Backward1_T_Ps_Lj),
                         (region1.n_TPS, C.Backward1_T_Ps_n)):
        assert np.array_equal(np.asarray(mine, dtype=float), np.asarray(theirs, dtype=float))


# --------------------------------------------------------------------------------------------
# property-based


@settings(max_examples=200, deadline=None)
@given(st.floats(273.15, 623.15), st.floats(0.0, 1.0))
def test_hypothesis_round_trip_T_h_T(T, u):
    ps = float(region4.saturation_pressure(T))
    p = ps + u * (100e6 - ps)
    h = region1.props(p, T)["h"]
    assert abs(region1.temperature_ph(p, h) - T) <= 1e-9 * T
