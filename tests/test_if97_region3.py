"""Region 3 forward equation f(rho, T): verification values and basic behaviour."""

import numpy as np
import pytest

from printed import assert_printed
from gen.if97 import region3
from gen.if97.constants import PC, RHOC, TC






# IAPWS R7-97(2012) Table 33: properties from Eq. (28) at (T, rho); p MPa, h u kJ/kg,
# s cp kJ/(kg K), w m/s
TABLE33 = [
    # T/K, rho/(kg/m^3), p, h, u, s, cp, w
    (650.0, 500.0, "0.255837018e2", "0.186343019e4", "0.181226279e4", "0.405427273e1",
     "0.138935717e2", "0.502005554e3"),  # R7-97(2012) Table 33
    (650.0, 200.0, "0.222930643e2", "0.237512401e4", "0.226365868e4", "0.485438792e1",
     "0.446579342e2", "0.383444594e3"),  # R7-97(2012) Table 33
    (750.0, 500.0, "0.783095639e2", "0.225868845e4", "0.210206932e4", "0.446971906e1",
     "0.634165359e1", "0.760696041e3"),  # R7-97(2012) Table 33
]


@pytest.mark.parametrize("row", TABLE33, ids=lambda r: f"T{r[0]:g}-rho{r[1]:g}")
def test_table33(row):
    T, rho, p, h, u, s, cp, w = row
    d = region3.props_rhoT(rho, T)
    assert_printed(d["p"], p, 1e6)
    assert_printed(d["h"], h, 1e3)
    assert_printed(d["u"], u, 1e3)
    assert_printed(d["s"], s, 1e3)
    assert_printed(d["cp"], cp, 1e3)
    assert_printed(d["w"], w)


def test_table33_vectorized_and_pressure_functions():
    T = np.array([r[0] for r in TABLE33])
    rho = np.array([r[1] for r in TABLE33])
    d = region3.props_rhoT(rho, T)
    for i, row in enumerate(TABLE33):
        assert_printed(d["p"][i], row[2], 1e6)
    np.testing.assert_array_equal(region3.pressure_rhoT(rho, T), d["p"])
    p, dpdrho = region3.pressure_drho_rhoT(rho, T)
    np.testing.assert_array_equal(p, d["p"])
    np.testing.assert_allclose(dpdrho, 1.0 / d["drhodp"], rtol=1e-14)


def test_scalars_and_broadcasting():
    d = region3.props_rhoT(500.0, 650.0)
    assert np.ndim(d["p"]) == 0
    rho = np.linspace(150.0, 700.0, 7)[:, None]
    T = np.linspace(630.0, 850.0, 5)[None, :]
    dd = region3.props_rhoT(rho, T)
    assert dd["h"].shape == (7, 5)
    assert region3.pressure_rhoT(rho, T).shape == (7, 5)
    np.testing.assert_allclose(dd["p"][2, 3], region3.pressure_rhoT(rho[2, 0], T[0, 3]),
                               rtol=1e-15)


def test_derivative_matches_finite_difference():
    rho = np.array([150.0, 322.0, 500.0, 700.0])
    T = np.array([640.0, 700.0, 650.0, 800.0])
    p, dp = region3.pressure_drho_rhoT(rho, T)
    h = 1e-5 * rho
    fd = (region3.pressure_rhoT(rho + h, T) - region3.pressure_rhoT(rho - h, T)) / (2 * h)
    np.testing.assert_allclose(dp, fd, rtol=1e-7)


def test_critical_point():
    # Eq. (28) reproduces the critical point: p(RHOC, TC) = PC and (dp/drho)_T = 0 there
    p, dp = region3.pressure_drho_rhoT(RHOC, TC)
    assert abs(p - PC) / PC < 1e-8
    assert abs(dp) * RHOC / PC < 1e-8


def test_against_iapws_package():
    iapws97 = pytest.importorskip("iapws.iapws97")
    rng = np.random.default_rng(3)
    rho = rng.uniform(100.0, 750.0, 40)
    T = rng.uniform(623.15, 863.15, 40)
    d = region3.props_rhoT(rho, T)
    for i in range(len(rho)):
        ref = iapws97._Region3(rho[i], T[i])
        assert d["p"][i] == pytest.approx(ref["P"] * 1e6, rel=1e-12)
        assert d["h"][i] == pytest.approx(ref["h"] * 1e3, rel=1e-12)
        assert d["s"][i] == pytest.approx(ref["s"] * 1e3, rel=1e-12)
        assert d["cv"][i] == pytest.approx(ref["cv"] * 1e3, rel=1e-11)
        assert d["w"][i] == pytest.approx(ref["w"], rel=1e-11)
