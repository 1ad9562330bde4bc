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
