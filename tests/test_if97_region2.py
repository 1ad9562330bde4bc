"""Region 2 of IAPWS-IF97: basic and metastable-vapour equations, lean density, B2bc, and the
backward equations T(p,h), T(p,s) of subregions 2a, 2b, 2c.

Printed values are those of the computer-program verification tables of IAPWS R7-97(2012)
(Tables 15, 18, 24, 29 and the B2bc check value after eq. 21), taken from verbatim public
transcriptions of the release's tables (the release text itself could not be retrieved here);
two independent transcriptions agree, and so do the iapws package's docstrings where they
quote them. Each value is checked to half a unit of its last printed digit.
"""

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from printed import assert_printed, half_unit  # noqa: F401
from gen.if97 import b23, region2, region4






TO_TABLE_UNIT = {"v": 1.0, "h": 1e-3, "u": 1e-3, "s": 1e-3, "cp": 1e-3, "w": 1.0}

# IAPWS R7-97(2012) Table 15: region 2 at (T/K, p/MPa); v m3/kg, h u kJ/kg, s cp kJ/(kg K), w m/s
TABLE15_POINTS = [(300.0, 0.0035), (700.0, 0.0035), (700.0, 30.0)]
TABLE15 = {
    "v": ("0.394913866e2", "0.923015898e2", "0.542946619e-2"),
    "h": ("0.254991145e4", "0.333568375e4", "0.263149474e4"),
    "u": ("0.241169160e4", "0.301262819e4", "0.246861076e4"),
    "s": ("0.852238967e1", "0.101749996e2", "0.517540298e1"),
    "cp": ("0.191300162e1", "0.208141274e1", "0.103505092e2"),
    "w": ("0.427920172e3", "0.644289068e3", "0.480386523e3"),
}

# IAPWS R7-97(2012) Table 18: metastable vapour at (T/K, p/MPa), same units as Table 15
TABLE18_POINTS = [(450.0, 1.0), (440.0, 1.0), (450.0, 1.5)]
TABLE18 = {
    "v": ("0.192516540", "0.186212297", "0.121685206"),
    "h": ("0.276881115e4", "0.274015123e4", "0.272134539e4"),
    "u": ("0.257629461e4", "0.255393894e4", "0.253881758e4"),
    "s": ("0.656660377e1", "0.650218759e1", "0.629170440e1"),
    "cp": ("0.276349265e1", "0.298166443e1", "0.362795578e1"),
    "w": ("0.498408101e3", "0.489363295e3", "0.481941819e3"),
}

# IAPWS R7-97(2012) Table 24: backward T(p, h); (subregion, p/MPa, h/(kJ/kg), printed T/K)
TABLE24 = [(1, 0.001, 3000.0, "0.534433241e3"), (1, 3.0, 3000.0, "0.575373370e3"),
           (1, 3.0, 4000.0, "0.101077577e4"), (2, 5.0, 3500.0, "0.801299102e3"),
           (2, 5.0, 4000.0, "0.101531583e4"), (2, 25.0, 3500.0, "0.875279054e3"),
           (3, 40.0, 2700.0, "0.743056411e3"), (3, 60.0, 2700.0, "0.791137067e3"),
           (3, 60.0, 3200.0, "0.882756860e3")]

# IAPWS R7-97(2012) Table 29: backward T(p, s); (subregion, p/MPa, s/(kJ/(kg K)), printed T/K)
TABLE29 = [(1, 0.1, 7.5, "0.399517097e3"), (1, 0.1, 8.0, "0.514127081e3"),
           (1, 2.5, 8.0, "0.103984917e4"), (2, 8.0, 6.0, "0.600484040e3"),
           (2, 8.0, 7.5, "0.106495556e4"), (2, 90.0, 6.0, "0.103801126e4"),
           (3, 20.0, 5.75, "0.697992849e3"), (3, 80.0, 5.25, "0.854011484e3"),
           (3, 80.0, 5.75, "0.949017998e3")]


@pytest.mark.parametrize("key", sorted(TABLE15))
@pytest.mark.parametrize("col", range(3))
def test_table15_region2_properties(key, col):
    T, p_mpa = TABLE15_POINTS[col]
    d = region2.props(p_mpa * 1e6, T)
    assert_printed(d[key] * TO_TABLE_UNIT[key], TABLE15[key][col])  # R7-97(2012) Table 15


@pytest.mark.parametrize("key", sorted(TABLE18))
@pytest.mark.parametrize("col", range(3))
def test_table18_metastable_vapour_properties(key, col):
    T, p_mpa = TABLE18_POINTS[col]
    d = region2.props_metastable(p_mpa * 1e6, T)
    assert_printed(d[key] * TO_TABLE_UNIT[key], TABLE18[key][col])  # R7-97(2012) Table 18


@pytest.mark.parametrize("sub,p_mpa,h_kj,printed", TABLE24)
def test_table24_backward_T_ph(sub, p_mpa, h_kj, printed):
    p, h = p_mpa * 1e6, h_kj * 1e3
    assert region2.subregion_ph(p, h) == sub  # Table 24 lists 2a, 2b, 2c points in turn
    assert_printed(region2.temperature_ph(p, h, refine=False), printed)  # R7-97(2012) Table 24


@pytest.mark.parametrize("sub,p_mpa,s_kj,printed", TABLE29)
def test_table29_backward_T_ps(sub, p_mpa, s_kj, printed):
    p, s = p_mpa * 1e6, s_kj * 1e3
    assert region2.subregion_ps(p, s) == sub  # Table 29 lists 2a, 2b, 2c points in turn
    assert_printed(region2.temperature_ps(p, s, refine=False), printed)  # R7-97(2012) Table 29


def test_b2bc_check_values():
    # R7-97(2012), check value after eq. 21: p = 0.100000000e3 MPa <-> h = 0.3516004323e4 kJ/kg
    assert_printed(region2.h_2bc(100e6) / 1e3, "0.3516004323e4")
    assert_printed(region2.p_2bc(3516.004323e3) / 1e6, "0.100000000e3")


# --------------------------------------------------------------------------------------------
# consistency of the refined backward functions, density, shapes


def p_upper(T):
    """Upper pressure of region 2 at T: p_sat, then B23, then 100 MPa."""
    T = np.asarray(T, dtype=float)
    return np.where(T <= 623.15, region4.saturation_pressure(np.minimum(T, 623.15)),
                    np.where(T <= 863.15, b23.b23_pressure(np.clip(T, 623.15, 863.15)),
                             100e6))


def region2_points(n, seed=1):
    """Random (p, T) in region 2, p log-uniform over six decades below the upper pressure."""
    rng = np.random.default_rng(seed)
    T = rng.uniform(273.15, 1073.15, n)
    p = p_upper(T) * 10.0 ** rng.uniform(-6.0, 0.0, n)
    return p, T


def test_refined_T_ph_reproduces_h_to_round_off():
    p, T = region2_points(20000)
    h = region2.props(p, T)["h"]
    T_back = region2.temperature_ph(p, h)
    assert np.all(np.abs(region2.props(p, T_back)["h"] - h) <= 1e-14 * h)
    assert np.all(np.abs(T_back - T) <= 1e-12 * T)


def test_refined_T_ps_reproduces_s_to_round_off():
    p, T = region2_points(20000, seed=2)
    s = region2.props(p, T)["s"]
    T_back = region2.temperature_ps(p, s)
    assert np.all(np.abs(region2.props(p, T_back)["s"] - s) <= 1e-14 * s)
    assert np.all(np.abs(T_back - T) <= 1e-12 * T)


def test_raw_backward_equations_within_release_tolerance():
    # Permitted differences of the region 2 backward equations from eq. 15 (from memory of
    # R7-97(2012) section 6.3: 10 mK where s >= 5.85 kJ/(kg K), i.e. 2a and 2b, and 25 mK in
    # 2c). Measured here: 2a 9.3 mK, 2b 9.5 mK, 2c 23.7 mK for T(p,h). Checked from 1 kPa up:
    # far below the triple-point pressure eq. 25 (2a T(p,s)) departs by kelvins.
    p, T = region2_points(50000, seed=3)
    keep = p >= 1e3
    p, T = p[keep], T[keep]
    d = region2.props(p, T)
    tol_h = np.where(region2.subregion_ph(p, d["h"]) == 3, 25e-3, 10e-3)
    tol_s = np.where(region2.subregion_ps(p, d["s"]) == 3, 25e-3, 10e-3)
    assert np.all(np.abs(region2.temperature_ph(p, d["h"], refine=False) - T) < tol_h)
    assert np.all(np.abs(region2.temperature_ps(p, d["s"], refine=False) - T) < tol_s)


def test_refined_T_ps_at_very_low_pressure():
    # eq. 25 alone is far off at 1 mPa; the refined value starts from the ideal-gas shift
    p = np.array([1e-3, 0.1, 10.0, 300.0])
    T = np.array([280.0, 400.0, 700.0, 1000.0])
    s = region2.props(p, T)["s"]
    assert np.allclose(region2.temperature_ps(p, s), T, rtol=1e-13, atol=0)


def test_subregion_boundaries():
    # 2a up to and including 4 MPa; above it B2bc splits T(p,h), s = 5.85 kJ/(kg K) T(p,s)
    assert region2.subregion_ph(4e6, 2800e3) == 1
    # just above 4 MPa everything is 2b: eq. 21 has no value below n5 = 4.53 MPa and B2bc
    # itself begins on the saturation line at 6.55 MPa
    assert region2.subregion_ph(np.nextafter(4e6, 5e6), 2800e3) == 2
    assert region2.subregion_ph(4.2e6, 2000e3) == 2
    hb = region2.h_2bc(50e6)
    assert region2.subregion_ph(50e6, hb) == 2
    assert region2.subregion_ph(50e6, np.nextafter(hb, 0.0)) == 3
    assert region2.subregion_ps(4e6, 5.0e3) == 1
    assert region2.subregion_ps(50e6, 5.85e3) == 2
    assert region2.subregion_ps(50e6, np.nextafter(5.85e3, 0.0)) == 3


def test_b2bc_equations_invert_each_other():
    # eq. 20 cancels 40- to 300-fold (near 6.5 MPa: 905.8 - 1888 + 988.7), hence 1e-11
    p = np.linspace(6.5467e6, 100e6, 50)
    assert np.allclose(region2.p_2bc(region2.h_2bc(p)), p, rtol=1e-11, atol=0)


def test_density_matches_props():
    p, T = region2_points(50000, seed=4)
    assert np.max(np.abs(region2.density(p, T) / region2.props(p, T)["rho"] - 1.0)) < 1e-14


def test_scalars_and_broadcasting():
    assert np.ndim(region2.density(1e5, 500.0)) == 0
    assert region2.props(1e5, 500.0)["h"].shape == ()
    assert region2.props_metastable(1e6, 450.0)["w"].shape == ()
    assert np.ndim(region2.temperature_ph(1e5, 2900e3)) == 0
    assert np.ndim(region2.temperature_ps(1e5, 7.5e3, refine=False)) == 0
    grid = region2.density(np.array([1e4, 1e5, 1e6])[:, None], np.array([600.0, 700.0]))
    assert grid.shape == (3, 2)
    assert grid[2, 0] == region2.density(1e6, 600.0)
    # one call mixing subregions 2a, 2b and 2c keeps the input's shape and order
    p = np.array([[0.001, 5.0, 40.0], [3.0, 25.0, 60.0]]) * 1e6
    h = np.array([[3000.0, 3500.0, 2700.0], [3000.0, 3500.0, 2700.0]]) * 1e3
    T = region2.temperature_ph(p, h, refine=False)
    assert T.shape == (2, 3)
    assert T[1, 2] == region2.temperature_ph(60e6, 2700e3, refine=False)


def test_drhodp_matches_numerical_derivative():
    p, T = region2_points(200, seed=5)
    dp = 1e-5 * p
    num = (region2.density(p + dp, T) - region2.density(p - dp, T)) / (2 * dp)
    assert np.allclose(region2.props(p, T)["drhodp"], num, rtol=1e-6, atol=0)


def test_cross_check_iapws_package():
    from iapws.iapws97 import _Region2, _Region2_meta

    p, T = region2_points(40, seed=6)
    d = region2.props(p, T)
    for k in range(p.size):
        ref = _Region2(T[k], p[k] / 1e6)
        for key, scale in (("v", 1.0), ("h", 1e3), ("s", 1e3), ("cp", 1e3), ("cv", 1e3),
                           ("w", 1.0)):
            assert d[key][k] == pytest.approx(ref[key] * scale, rel=1e-12)
    pm = np.array([1e5, 5e5, 1e6, 5e6, 10e6])
    Tm = region4.saturation_temperature(pm) - 5.0  # slightly subcooled vapour
    dm = region2.props_metastable(pm, Tm)
    for k in range(pm.size):
        ref = _Region2_meta(Tm[k], pm[k] / 1e6)
        for key, scale in (("v", 1.0), ("h", 1e3), ("s", 1e3), ("cp", 1e3), ("w", 1.0)):
            assert dm[key][k] == pytest.approx(ref[key] * scale, rel=1e-12)


def test_coefficients_match_an_independent_transcription():
    # The 9-digit verification tables cannot see a slip in a coefficient's last digits, so
    # every table is also compared exactly with the iapws package's independent transcription
    # of R7-97(2012) Tables 10, 11, 16, 20-22 and 25-27 (and eq. 18's n0_1, n0_2).
    import iapws._iapws97Constants as C

    r = region2
    for mine, theirs in ((r.J0, C.Region2_cp0_Jo), (r.n0, C.Region2_cp0_no),
                         (r.n0_META, C.Region2_cp0_no_meta),
                         (r.I, C.Region2_Li), (r.J, C.Region2_Lj), (r.n, C.Region2_n),
                         (r.I_META, C.Region2_Ir_m), (r.J_META, C.Region2_Jr_m),
                         (r.n_META, C.Region2_nr_m),
                         (r.I_TPH_A, C.Backward2a_T_Ph_Li), (r.J_TPH_A, C.Backward2a_T_Ph_Lj),
                         (r.n_TPH_A, C.Backward2a_T_Ph_n),
                         (r.I_TPH_B, C.Backward2b_T_Ph_Li), (r.J_TPH_B, C.Backward2b_T_Ph_Lj),
                         (r.n_TPH_B, C.Backward2b_T_Ph_n),
                         (r.I_TPH_C, C.Backward2c_T_Ph_Li), (r.J_TPH_C, C.Backward2c_T_Ph_Lj),
                         (r.n_TPH_C, C.Backward2c_T_Ph_n),
                         (r.I_TPS_A, C.Backward2a_T_Ps_Li), (r.J_TPS_A, C.Backward2a_T_Ps_Lj),
                         (r.n_TPS_A, C.Backward2a_T_Ps_n),
                         (r.I_TPS_B, C.Backward2b_T_Ps_Li), (r.J_TPS_B, C.Backward2b_T_Ps_Lj),
                         (r.n_TPS_B, C.Backward2b_T_Ps_n),
                         (r.I_TPS_C, C.Backward2c_T_Ps_Li), (r.J_TPS_C, C.Backward2c_T_Ps_Lj),
                         (r.n_TPS_C, C.Backward2c_T_Ps_n)):
        assert np.array_equal(np.asarray(mine, dtype=float), np.asarray(theirs, dtype=float))


def test_b2bc_coefficients_are_consistent():
    # eqs. 20 and 21 invert each other: n4 = -n2 / (2 n3), n5 = n1 - n2^2 / (4 n3) to the
    # printed digits; and eq. 20 / 21 agree with the iapws package to round-off
    from iapws.iapws97 import _hbc_P, _P_2bc

    n1, n2, n3, n4, n5 = region2.N_BC
    assert -n2 / (2 * n3) == pytest.approx(n4, rel=1e-14)
    assert n1 - n2 * n2 / (4 * n3) == pytest.approx(n5, rel=5e-12)  # n1 has 1e-11 digits
    h = np.linspace(2.7e6, 3.6e6, 50)
    assert np.allclose(region2.p_2bc(h), [_P_2bc(x / 1e3) * 1e6 for x in h], rtol=1e-13, atol=0)
    p = np.linspace(6.6e6, 100e6, 50)
    assert np.allclose(region2.h_2bc(p), [_hbc_P(x / 1e6) * 1e3 for x in p], rtol=1e-15, atol=0)


# --------------------------------------------------------------------------------------------
# property-based


@settings(max_examples=200, deadline=None)
@given(st.floats(273.15, 1073.15), st.floats(-6.0, 0.0))
def test_hypothesis_round_trip_T_h_T(T, decades):
    p = float(p_upper(T)) * 10.0 ** decades
    h = region2.props(p, T)["h"]
    assert abs(region2.temperature_ph(p, h) - T) <= 1e-9 * T
