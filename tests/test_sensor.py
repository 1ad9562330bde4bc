"""The error budget: sensor-caused output uncertainty beside the table's own error."""

import json

import numpy as np
import pytest
from click.testing import CliRunner

from gen.build import build_table, core_function
from gen.cli import main
from gen.if97 import core
from gen.sensor import RATIO_LIMIT, Sensor, slope
from gen.spec import parse_spec

SPEC = """
name = "budget"
prefix = "bg"
[[table]]
name = "tsat"
quantity = "saturation_temperature"
output_unit = "K"
tolerance = { abs = 0.02 }
pressure = { unit = "MPa", min = 0.2, max = 1.6 }
sensor = { of_span = 0.001, span = [0.0, 1.6] }
[[table]]
name = "hl"
quantity = "saturated_liquid_enthalpy"
output_unit = "kJ/kg"
tolerance = { abs = 0.05 }
temperature = { unit = "degC", min = 20, max = 180 }
sensor = { fixed = 0.15, of_reading = 0.002 }
"""


def test_uncertainty_model():
    s = Sensor(fixed=0.15, of_reading=0.002)
    assert s.uncertainty(100.0) == pytest.approx(0.35)      # +-(0.15 + 0.002*100) degC
    s = Sensor(of_span=0.001, span=(0.0, 16.0))
    assert np.allclose(s.uncertainty([1.0, 15.0]), 0.016)   # 0.1 % of a 16 bar span


def test_slope_against_finite_difference():
    spec = parse_spec(SPEC, "budget.toml")
    for ts in spec.tables:
        f = core_function(ts)
        x = np.linspace(ts.inputs[0].lo * 1.1, ts.inputs[0].hi * 0.9, 25)
        h = 1e-5 * (ts.inputs[0].hi - ts.inputs[0].lo)
        fd = (f(x + h) - f(x - h)) / (2 * h)
        assert np.allclose(slope(ts, x), fd, rtol=1e-6)


def test_hand_worked_dtsat_dp_at_1_mpa():
    """Clausius-Clapeyron, dp/dT = h_fg / (T (v'' - v')), with the saturated states at 1 MPa.

    Inputs (IF97 at 1 MPa, from the core): T_s = 453.035632 K (R7-97(2012) Table 36),
    h_fg = h'' - h', v'' and v'. The IF97 saturation equation and the region 1/2 equations are
    consistent to well under 1e-3 here, which bounds the comparison.
    """
    T = 453.035632  # K, R7-97(2012) Table 36 at 1 MPa
    liq, vap = core.saturated_states(T)
    dpdT = (vap["h"] - liq["h"]) / (T * (vap["v"] - liq["v"]))
    spec = parse_spec(SPEC, "budget.toml")
    ts = spec.tables[0]  # input in MPa, output in K
    assert float(slope(ts, 1.0)) == pytest.approx(1e6 / dpdT, rel=1e-3)  # K/MPa
    # a 0.1 % of 1.6 MPa transmitter (1.6 kPa) then causes about 0.07 K at 1 MPa
    u = float(slope(ts, 1.0)) * 0.0016
    assert 0.06 < u < 0.08


def test_budget_in_report_and_flag():
    spec = parse_spec(SPEC, "budget.toml")
    t = build_table(spec.tables[0])
    b = t.budget
    assert b["ratio_limit"] == RATIO_LIMIT and "common practice" in b["rule"]
    assert b["output_uncertainty_min"] > 0
    assert 0 < b["ratio_max"] <= b["table_error_max"] / b["output_uncertainty_min"]
    assert b["flag"] == (b["ratio_max"] > RATIO_LIMIT)
    # a tolerance as large as the sensor's effect must be flagged
    loose = parse_spec(SPEC.replace("abs = 0.02", "abs = 0.05").replace("of_span = 0.001", "of_span = 0.0002"), "b.toml")
    assert build_table(loose.tables[0]).budget["flag"]


def test_sensor_spec_errors(tmp_path):
    for bad, needle in [("sensor = { of_span = 0.001 }", "sensor.span"),
                        ("sensor = { fixed = -1 }", "sensor.fixed"),
                        ("sensor = { accuracy = 1 }", "sensor.accuracy"),
                        ("sensor = { of_reading = 2.0 }", "fractions")]:
        text = SPEC.split("[[table]]\nname = \"hl\"")[0].replace(
            "sensor = { of_span = 0.001, span = [0.0, 1.6] }", bad)
        p = tmp_path / "s.toml"
        p.write_text(text)
        r = CliRunner().invoke(main, ["build", str(p), "--out", str(tmp_path / "o")])
        assert r.exit_code == 2 and needle in r.output and r.output.count("\n") == 1, r.output


def test_report_json_carries_budget(tmp_path):
    p = tmp_path / "budget.toml"
    p.write_text(SPEC)
    r = CliRunner().invoke(main, ["build", str(p), "--out", str(tmp_path / "o")])
    assert r.exit_code == 0, r.output
    doc = json.loads((tmp_path / "o" / "report.json").read_text())
    assert all("sensor_budget" in t for t in doc["tables"])
    md = (tmp_path / "o" / "report.md").read_text()
    assert "sensor-caused uncertainty" in md


# --- two inputs ---------------------------------------------------------------------------

SPEC_2D = """
name = "budget2"
prefix = "b2"
[[table]]
name = "rho"
quantity = "density"
phase = "vapor"
output_unit = "kg/m^3"
tolerance = { rel = 0.001 }
verify_points = 20000
pressure = { unit = "bar", min = 2.0, max = 16.0 }
temperature = { unit = "degC", min_above_saturation = 5.0, max = 300.0 }
sensor = { pressure = { of_span = 0.001, span = [0, 16] }, temperature = { fixed = 0.15, of_reading = 0.002 } }
[[table]]
name = "h"
quantity = "specific_enthalpy"
phase = "vapor"
output_unit = "kJ/kg"
tolerance = { abs = 0.5 }
verify_points = 20000
pressure = { unit = "bar", min = 2.0, max = 16.0 }
temperature = { unit = "degC", min_above_saturation = 5.0, max = 300.0 }
sensor = { temperature = { fixed = 0.15 } }
[[table]]
name = "x"
quantity = "quality"
phase = "wet"
tolerance = { abs = 0.002 }
verify_points = 20000
pressure = { unit = "bar", min = 1.0, max = 12.0 }
specific_enthalpy = { unit = "kJ/kg" }
sensor = { specific_enthalpy = { fixed = 5.0 } }
"""


@pytest.fixture(scope="module")
def built_2d():
    spec = parse_spec(SPEC_2D, "budget2.toml")
    return [build_table(ts) for ts in spec.tables]


def test_two_input_partials_against_thermodynamic_identities(built_2d):
    """dh/dT at constant p is cp, and drho/dp at constant T is the core's (drho/dp)_T: both
    are thermodynamic identities, computed by the core from the Gibbs function directly."""
    from gen.sensor import partials
    rho_t, h_t, _ = built_2d
    rng = np.random.default_rng(3)
    P = rng.uniform(2.0, 16.0, 200)
    Tsat = core.saturation_temperature(P * 1e5) - 273.15
    T = rng.uniform(Tsat + 5.0, 300.0)
    d = core.props_pT(P * 1e5, T + 273.15)
    fp, fv = partials(rho_t.gt.domain.core, P, T, -1, 1, 1.4e-6, 3e-5)
    assert np.allclose(fp, d["drhodp"] * 1e5, rtol=1e-5)        # per bar
    fp, fv = partials(h_t.gt.domain.core, P, T, -1, 1, 1.4e-6, 3e-5)
    assert np.allclose(fv, d["cp"] / 1e3, rtol=1e-5)            # kJ/(kg K)


def test_two_input_budget_hand_worked_at_10_bar_200_degc(built_2d):
    """Steam density at 10 bar, 200 degC from a 0.1 %-of-16-bar transmitter (0.016 bar) and a
    +-(0.15 + 0.002 |t|) degC sensor (0.55 K). With the logarithmic slopes of the core there,
    (p/rho)(drho/dp)_T = 1.06678 (from the core's (drho/dp)_T, a Gibbs-function identity)
    and (T/rho)(drho/dT)_p = -1.28715 (core, 0.01 K difference), the relative uncertainty is
    sqrt((1.06678 * 0.016/10)^2 + (1.28715 * 0.55/473.15)^2) = 2.2698e-3. The ideal-gas
    slopes 1 and -1 (textbook) give 1.98e-3: 13 % lower, 20 K from saturation."""
    from gen.sensor import compare_2d, partials
    rho_t = built_2d[0]
    f = rho_t.gt.domain.core
    P, T = np.array([10.0]), np.array([200.0])
    fp, fv = partials(f, P, T, -1, 1, 1e-6, 2e-5)
    b = compare_2d(rho_t.spec.sensor, ("bar", "degC"), ["pressure", "temperature"], P, T,
                   np.array([0.0]), fp, fv, f(P, T), "rel")
    assert b["output_uncertainty_max"] == pytest.approx(2.2698e-3, rel=2e-4)
    assert b["output_uncertainty_max"] == pytest.approx(1.98e-3, rel=0.2)


def test_two_input_budget_in_the_report(built_2d):
    rho_t, h_t, x_t = built_2d
    b = rho_t.budget
    assert b["points"] >= 10_000 and set(b["from_each_input_max"]) == {"pressure", "temperature"}
    # the table's own error against the sensors' at the same points
    assert b["table_error_max"] <= rho_t.spec.tol_value
    assert 0 < b["ratio_max"] <= b["table_error_max"] / b["output_uncertainty_min"] * (1 + 1e-12)
    assert set(h_t.budget["from_each_input_max"]) == {"temperature"}
    # quality from enthalpy: dx/dh = 1 / (h'' - h'), so 5 kJ/kg gives 5 / (h'' - h')
    liq, vap = core.saturated_states(core.saturation_temperature(np.array([1e5, 12e5])))
    L = (vap["h"] - liq["h"]) / 1e3
    assert x_t.budget["output_uncertainty_min"] == pytest.approx(5.0 / L.max(), rel=0.01)
    assert x_t.budget["output_uncertainty_max"] == pytest.approx(5.0 / L.min(), rel=0.01)
    from gen.outputs import render_outputs
    files = render_outputs(parse_spec(SPEC_2D, "budget2.toml"), built_2d)
    doc = json.loads(files["report.json"])
    assert all("sensor_budget" in r for r in doc["tables"])
    assert "root sum of squares" in files["report.md"].decode()


@pytest.mark.parametrize("sensor,needle", [
    ('{ temperatur = { fixed = 0.1 } }', "'sensor.temperatur'"),
    ('{ pressure = { fixed = -1 } }', "'sensor.pressure.fixed'"),
    ('{ fixed = 0.1 }', "one sensor per input"),
])
def test_two_input_sensor_errors(tmp_path, sensor, needle):
    text = SPEC_2D.split("[[table]]")[0] + "[[table]]" + SPEC_2D.split("[[table]]")[1]
    text = text.replace(
        "sensor = { pressure = { of_span = 0.001, span = [0, 16] }, temperature = { fixed = "
        "0.15, of_reading = 0.002 } }", f"sensor = {sensor}")
    spec = tmp_path / "bad.toml"
    spec.write_text(text)
    r = CliRunner().invoke(main, ["build", str(spec), "--out", str(tmp_path / "o")])
    assert r.exit_code == 2 and needle in r.output and "\n" not in r.output.strip(), r.output
