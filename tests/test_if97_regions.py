"""Region selection of IAPWS-IF97 in (p, T): region_pT, valid_pT and the out-of-range text."""

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from gen.if97 import b23, region4, regions
from gen.if97.regions import region_pT, valid_pT


def test_verification_table_points_land_in_their_regions():
    # the state points of R7-97(2012) Tables 5, 15, 33 (region 3: p from rho, T) and 42
    assert list(region_pT(np.array([3e6, 80e6, 3e6]), np.array([300.0, 300.0, 500.0]))) == [1] * 3
    assert list(region_pT(np.array([3500.0, 3500.0, 30e6]),
                          np.array([300.0, 700.0, 700.0]))) == [2] * 3
    assert list(region_pT(np.array([25.5837018e6, 22.2930643e6, 78.3095639e6]),
                          np.array([650.0, 650.0, 750.0]))) == [3] * 3
    assert list(region_pT(np.array([0.5e6, 30e6, 30e6]),
                          np.array([1500.0, 1500.0, 2000.0]))) == [5] * 3


def test_saturation_line_phase_rule():
    T = np.array([273.15, 300.0, 373.15, 500.0, 623.15])
    ps = region4.saturation_pressure(T)
    assert np.all(region_pT(ps, T) == 1)                     # default: liquid side
    assert np.all(region_pT(ps, T, phase="liquid") == 1)
    assert np.all(region_pT(ps, T, phase="vapor") == 2)
    assert np.all(region_pT(ps, T, phase="vapour") == 2)
    above, below = np.nextafter(ps, np.inf), np.nextafter(ps, 0.0)
    for phase in (None, "liquid", "vapor"):                  # off the line phase is ignored
        assert np.all(region_pT(above, T, phase=phase) == 1)
        assert np.all(region_pT(below, T, phase=phase) == 2)
    with pytest.raises(ValueError, match="phase"):
        region_pT(1e5, 300.0, phase="solid")


def test_boundaries_623_863_1073():
    # T = 623.15 K belongs to region 1 above p_sat; just above it region 3 starts at B23
    assert region_pT(50e6, 623.15) == 1
    assert region_pT(10e6, 623.15) == 2
    T = np.nextafter(623.15, 700.0)
    assert region_pT(50e6, T) == 3
    pb = b23.b23_pressure(700.0)
    assert region_pT(pb, 700.0) == 3                         # on B23: region 3
    assert region_pT(np.nextafter(pb, 0.0), 700.0) == 2
    # B23 gives 100.00000003 MPa at 863.15 K, so (100 MPa, 863.15 K) is still region 2
    assert region_pT(100e6, 863.15) == 2
    assert region_pT(100e6, 862.0) == 3
    assert region_pT(100e6, np.nextafter(863.15, 900.0)) == 2
    assert region_pT(100e6, 1073.15) == 2
    assert region_pT(50e6, np.nextafter(1073.15, 2000.0)) == 5
    assert region_pT(np.nextafter(50e6, 1e9), 1500.0) == 0
    assert region_pT(50e6, 2273.15) == 5
    assert region_pT(1e5, np.nextafter(2273.15, 3000.0)) == 0


def test_validity_limits():
    p = np.array([1e5, 100e6, np.nextafter(100e6, 1e9), 0.0, -1.0, 1e-3, 1e5, np.nan, 1e5])
    T = np.array([273.15, 300.0, 300.0, 300.0, 300.0, 500.0, 273.14, 300.0, np.inf])
    assert list(valid_pT(p, T)) == [True, True, False, False, False, True, False, False, False]
    assert list(region_pT(p, T)) == [1, 1, 0, 0, 0, 2, 0, 0, 0]
    assert region_pT(1e5, 300.0).shape == ()
    assert region_pT(np.full((2, 3), 1e5), 300.0).shape == (2, 3)
    assert region_pT(np.array([1e5, 1e6]), np.array([[300.0], [800.0]])).shape == (2, 2)


def test_out_of_range_message_names_variable_value_and_range():
    assert regions.out_of_range_message([1e5, 1e6], [300.0, 500.0]) == ""
    msg = regions.out_of_range_message(np.array([1e5, 150e6, 60e6, 1e5, -5.0]),
                                       np.array([250.0, 300.0, 1500.0, 3000.0, 300.0]))
    lines = msg.splitlines()
    assert len(lines) == 5
    assert lines[0] == "point 0: T = 250 K is outside 273.15 K <= T <= 2273.15 K"
    assert lines[1].startswith("point 1: p = 1.5e+08 Pa (150 MPa) is above 100 MPa")
    assert "p = 6e+07 Pa (60 MPa)" in lines[2] and "50 MPa" in lines[2] and "1073.15 K" in lines[2]
    assert lines[3].startswith("point 3: T = 3000 K")
    assert lines[4].startswith("point 4: p = -5 Pa") and "0 < p" in lines[4]
    grid = regions.out_of_range_message(np.array([[1e5, 1e9]]), 300.0)
    assert grid.startswith("point (0, 1): p = 1e+09 Pa")
    scalar = regions.out_of_range_message(-5.0, 300.0)
    assert scalar.startswith("p = -5 Pa") and "0 < p" in scalar
    many = regions.out_of_range_message(np.full(15, 1e9), 300.0, max_points=3)
    assert many.splitlines()[-1] == "... and 12 more points outside IF97's range"
    with pytest.raises(ValueError, match="T = 200 K"):
        regions.check_pT(1e5, 200.0)
    regions.check_pT(1e5, 300.0)


# --------------------------------------------------------------------------------------------
# property-based: a returned region never lies outside that region's boundaries


@settings(max_examples=200, deadline=None)
@given(st.floats(200.0, 2400.0), st.floats(-1.0, np.log10(120e6)),
       st.sampled_from([None, "liquid", "vapor"]))
def test_hypothesis_region_respects_its_boundaries(T, logp, phase):
    p = 10.0 ** logp
    r = int(region_pT(p, T, phase=phase))
    if r == 0:
        assert not valid_pT(p, T)
        return
    assert valid_pT(p, T)
    if r == 1:
        assert 273.15 <= T <= 623.15 and region4.saturation_pressure(T) <= p <= 100e6
    elif r == 2:
        assert 273.15 <= T <= 1073.15 and p <= 100e6
        if T <= 623.15:
            assert p <= region4.saturation_pressure(T)
        elif T <= 863.15:
            assert p < b23.b23_pressure(T)
    elif r == 3:
        assert 623.15 < T <= 863.15 and b23.b23_pressure(T) <= p <= 100e6
    elif r == 5:
        assert 1073.15 < T <= 2273.15 and p <= 50e6
    else:
        raise AssertionError(f"unexpected region {r}")
