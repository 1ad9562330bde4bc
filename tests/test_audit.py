"""Audit of shipped tables: flawed tables made from the core are found out row by row, the
measured error matches independent recomputations, bad CSV is one line with exit 2, the
tolerance decides exit 0 or 1, and re-verifying h2olut's own output gives its report's figure.

Every table here is computed from the h2olut IF97 core (never invented values); the flaws are
applied to its printed cells. The independent recomputations are written here with plain
numpy / scipy and do not call the audit's evaluators.
"""

import json
import re
from fractions import Fraction
from pathlib import Path

import click
import numpy as np
import pytest
from click.testing import CliRunner
from hypothesis import given, settings
from hypothesis import strategies as st

from gen import audit as A
from gen import quantities as Q
from gen.cli_audit import audit as audit_command
from gen.outputs import build_spec, render_outputs
from gen.report import table_record
from gen.spec import parse_spec
from gen.verify import verification_points

SCHEMA = Path(__file__).resolve().parent.parent / "gen" / "schema" / "report.schema.json"
P_BAR = np.arange(1.0, 21.0)                    # the coarse table: 1 to 20 bar, 1-bar steps


def tsat_degc(p_bar):
    """Saturation temperature from the core, degC, at pressures in bar."""
    return Q.evaluate("saturation_temperature", pressure=np.asarray(p_bar) * 1e5) - 273.15


def tsat_cells(p=P_BAR, decimals=3):
    """[[p text, T text], ...] printed from the core."""
    return [[f"{a:g}", f"{b:.{decimals}f}"] for a, b in zip(p, tsat_degc(p))]


def csv_text(cells, header="pressure [bar],saturation temperature [degC]"):
    lines = ([header] if header else []) + [",".join(r) for r in cells]
    return "\n".join(lines) + "\n"


def line_of(p_bar, header=True):
    """File line of the row at ``p_bar`` in a table built from P_BAR."""
    return int(np.nonzero(P_BAR == p_bar)[0][0]) + 1 + (1 if header else 0)


def tsat_spec(**kw):
    opts = dict(quantity="saturation_temperature", inputs=["pressure"], input_units=["bar"],
                output_unit="degC", interpolation="linear", arithmetic="float32", suggest=False)
    opts.update(kw)
    return A.audit_spec(**opts)


@pytest.fixture()
def cli():
    """A click group carrying only the audit command (as gen.cli will register it)."""
    @click.group()
    def group():
        pass
    group.add_command(audit_command)
    return group


def run(cli, tmp_path, text, *args, name="table.csv"):
    path = tmp_path / name
    path.write_text(text)
    out = tmp_path / "audit_out"
    r = CliRunner().invoke(cli, ["audit", str(path), *args, "--out", str(out)])
    return r, out, path


TSAT_ARGS = ["-q", "saturation_temperature", "--input", "pressure", "--input-unit", "bar",
             "--output-unit", "degC", "--interpolation", "linear", "--arithmetic", "float32",
             "--no-replacement"]


# --------------------------------------------------------------------------------------------
# the measured error against independent recomputations


def firmware_linear(xp, fp, x, ft):
    """The documented linear formula, written independently: every operation rounded to ft."""
    xp, fp = xp.astype(ft), fp.astype(ft)
    xq = np.clip(x.astype(ft), xp[0], xp[-1])
    i = np.clip(np.searchsorted(xp, xq, side="right") - 1, 0, xp.size - 2)
    t = ft(xq - xp[i]) / ft(xp[i + 1] - xp[i])
    return fp[i] + ft(t * ft(fp[i + 1] - fp[i]))


def test_clean_float64_linear_matches_np_interp():
    """float64 audit = numpy's np.interp to rounding, at the audit's own points and on an
    independent dense grid (np.interp forms (dy/dx)*(x - x0) + y0; the audit t*dy + y0)."""
    cells = tsat_cells()
    spec = tsat_spec(arithmetic="float64")
    a = A.audit_bytes(csv_text(cells), "tsat.csv", spec)
    xp = np.array([float(c[0]) for c in cells])
    fp = np.array([float(c[1]) for c in cells])
    f = A.core_function(spec)
    x, _ = verification_points(a.table, spec.verify_points, a.verification["seed"], f,
                               A.error_scale("abs"))
    assert np.max(np.abs(a.table(x) - np.interp(x, xp, fp))) < 1e-12     # degC, ~20 ulp
    e_np = np.max(np.abs(np.interp(x, xp, fp) - f(x)))
    assert abs(a.verification["max_error"] - e_np) < 1e-12
    dense = np.linspace(1.0, 20.0, 400_001)
    e_dense = np.max(np.abs(np.interp(dense, xp, fp) - f(dense)))
    # the dense grid's maximum and the audit's (per-interval worst + random) agree to the
    # curvature of the error near its peak
    assert abs(a.verification["max_error"] - e_dense) <= 1e-5 * e_dense
    assert 1.3 < e_dense < 1.6          # K; the 1-2 bar interval, where T_sat bends most


def test_clean_float32_linear_matches_independent_model():
    cells = tsat_cells()
    spec = tsat_spec()
    a = A.audit_bytes(csv_text(cells), "tsat.csv", spec)
    xp = np.array([float(c[0]) for c in cells])
    fp = np.array([float(c[1]) for c in cells])
    f = A.core_function(spec)
    x, _ = verification_points(a.table, spec.verify_points, a.verification["seed"], f,
                               A.error_scale("abs"))
    y = firmware_linear(xp, fp, x, np.float32)
    assert np.array_equal(a.table(x), y)                        # bit for bit
    assert a.verification["max_error"] == float(np.max(np.abs(y.astype(np.float64) - f(x))))
    assert a.verification["points"] >= 100_000
    assert a.findings == []


@pytest.mark.parametrize("kind", ["step", "nearest", "linear-in-log", "cubic-spline"])
def test_other_interpolations_match_scipy(kind):
    """float64 step/nearest against scipy's interp1d('previous'/'nearest'), linear-in-log
    against np.interp on ln p, the natural spline against scipy's CubicSpline(bc_type=
    'natural'); all on a dense grid of inputs the audit never saw."""
    from scipy.interpolate import CubicSpline, interp1d
    cells = tsat_cells(decimals=4)
    xp = np.array([float(c[0]) for c in cells])
    fp = np.array([float(c[1]) for c in cells])
    a = A.audit_bytes(csv_text(cells), "t.csv", tsat_spec(arithmetic="float64", interpolation=kind))
    x = np.linspace(1.0, 20.0, 50_001)
    mid = 0.5 * (xp[:-1] + xp[1:])
    x = x[np.min(np.abs(x[:, None] - mid[None, :]), axis=1) > 1e-9]   # no nearest ties
    got = a.table(x)
    if kind == "step":
        ref = interp1d(xp, fp, kind="previous")(x)
        assert np.array_equal(got, ref)
    elif kind == "nearest":
        ref = interp1d(xp, fp, kind="nearest")(x)
        assert np.array_equal(got, ref)
    elif kind == "linear-in-log":
        ref = np.interp(np.log(x), np.log(xp), fp)
        assert np.max(np.abs(got - ref)) < 1e-11
    else:
        ref = CubicSpline(xp, fp, bc_type="natural")(x)
        assert np.max(np.abs(got - ref)) < 1e-10
    assert a.findings == []


def test_float32_spline_second_derivatives_are_float64_then_rounded():
    cells = tsat_cells(decimals=4)
    from scipy.interpolate import CubicSpline
    a = A.audit_bytes(csv_text(cells), "t.csv", tsat_spec(interpolation="cubic-spline"))
    xp = np.array([float(c[0]) for c in cells]).astype(np.float32).astype(np.float64)
    fp = np.array([float(c[1]) for c in cells]).astype(np.float32).astype(np.float64)
    m = CubicSpline(xp, fp, bc_type="natural")(xp, 2)        # scipy's second derivatives
    assert np.array_equal(a.table.m, m.astype(np.float32)) or \
        np.max(np.abs(a.table.m.astype(np.float64) - m)) <= 2 * np.max(np.spacing(np.abs(m).astype(np.float32)))


# --------------------------------------------------------------------------------------------
# defects, each at its row


def flawed_cells():
    """The coarse table with one flaw of each kind (all values from the core):
    8 bar in degF, 12 bar with two digits transposed, 15/16 bar swapped."""
    cells = tsat_cells()
    T = tsat_degc(P_BAR)
    k8 = int(np.nonzero(P_BAR == 8)[0][0])
    cells[k8][1] = f"{T[k8] * 1.8 + 32:.3f}"                  # degF = degC * 1.8 + 32
    k12 = int(np.nonzero(P_BAR == 12)[0][0])
    s = cells[k12][1]                                          # e.g. 187.965
    dot = s.index(".")
    cells[k12][1] = s[:dot + 1] + s[dot + 2] + s[dot + 1] + s[dot + 3:]   # 187.695
    assert cells[k12][1] != s
    k15 = int(np.nonzero(P_BAR == 15)[0][0])
    cells[k15][1], cells[k15 + 1][1] = cells[k15 + 1][1], cells[k15][1]
    return cells, s


def kinds_by_row(a):
    out = {}
    for d in a.findings:
        out.setdefault(d["row"], set()).add(d["kind"])
    return out


def test_each_flaw_found_at_its_row():
    cells, true12 = flawed_cells()
    a = A.audit_bytes(csv_text(cells), "flawed.csv", tsat_spec(used_max=22.0))
    rows = kinds_by_row(a)
    assert "wrong_unit" in rows[line_of(8)]
    unit = next(d for d in a.findings if d["kind"] == "wrong_unit")
    assert unit["unit"] == "degF" and "x1.8 + 32" in unit["text"] and unit["column"] == 2
    typo = next(d for d in a.findings if d["kind"] == "typo")
    assert typo["row"] == line_of(12) and "transposed" in typo["text"]
    assert f"{typo['likely']:.3f}" == true12
    sw = next(d for d in a.findings if d["kind"] == "swapped_rows")
    assert sw["rows"] == [line_of(15), line_of(16)]
    short = next(d for d in a.findings if d["kind"] == "short_range")
    assert short["short_by"] == pytest.approx(2.0)
    # the 8 bar row in degF also breaks the order with the row after it: named, with its cause
    nm = [d for d in a.findings if d["kind"] == "non_monotone"]
    assert [d["rows"] for d in nm] == [[line_of(8), line_of(9)]]
    assert f"row {line_of(8)} is the odd one" in nm[0]["text"]
    # nothing else is flagged: the other rows are within their printed rounding of the core
    flagged = {d["row"] for d in a.findings if d["row"] is not None}
    assert flagged == {line_of(8), line_of(12), line_of(15)}


def test_flawed_max_error_matches_independent_recomputation():
    cells, _ = flawed_cells()
    spec = tsat_spec(arithmetic="float64")
    a = A.audit_bytes(csv_text(cells), "flawed.csv", spec)
    xp = np.array([float(c[0]) for c in cells])
    fp = np.array([float(c[1]) for c in cells])
    dense = np.unique(np.concatenate([np.linspace(1, 20, 200_001), xp]))
    e = np.abs(np.interp(dense, xp, fp) - tsat_degc(dense))
    assert a.verification["max_error"] == pytest.approx(float(e.max()), rel=1e-12)
    assert a.verification["at"] == 8.0                         # the degF row
    # the degF row's own error: 1.8 T + 32 - T = 0.8 T + 32, at T_sat(8 bar)
    t8 = float(tsat_degc(8.0))
    assert a.verification["max_error"] == pytest.approx(0.8 * t8 + 32, abs=1e-3)


def test_kpa_row_among_bar_in_a_pressure_table():
    """Saturation pressure in bar from temperature in degC, one row written in kPa."""
    T = np.arange(100.0, 201.0, 10.0)
    p = Q.evaluate("saturation_pressure", temperature=T + 273.15) / 1e5
    cells = [[f"{a:g}", f"{b:.5f}"] for a, b in zip(T, p)]
    cells[4][1] = f"{p[4] * 100:.3f}"
    spec = A.audit_spec("saturation_pressure", ["temperature"], ["degC"], "bar",
                        suggest=False, tolerance_rel=1e-3)
    a = A.audit_bytes(csv_text(cells, header="T [degC],p [bar]"), "psat.csv", spec)
    d = next(d for d in a.findings if d["kind"] == "wrong_unit")
    assert d["row"] == 6 and d["unit"] == "kPa" and "x100" in d["text"]


def test_gauge_reading_among_absolute():
    T = np.arange(100.0, 201.0, 10.0)
    p = Q.evaluate("saturation_pressure", temperature=T + 273.15) / 1e5
    cells = [[f"{a:g}", f"{b:.5f}"] for a, b in zip(T, p)]
    cells[7][1] = f"{p[7] - 1.01325:.5f}"                      # standard atmosphere taken off
    spec = A.audit_spec("saturation_pressure", ["temperature"], ["degC"], "bar", suggest=False)
    a = A.audit_bytes(csv_text(cells, header=""), "psat.csv", spec)
    d = next(d for d in a.findings if d["row"] == 8)
    assert d["kind"] == "wrong_unit" and d["unit"] == "bar gauge"


def test_short_range_error_is_the_clamped_difference():
    p = np.arange(1.0, 19.0)                                   # stops at 18 bar
    cells = tsat_cells(p)
    a = A.audit_bytes(csv_text(cells), "short.csv", tsat_spec(used_max=20.0, used_min=0.5))
    sides = {s["side"]: s for s in a.used["sides"]}
    # clamped at 20 bar the table returns its 18 bar value: the error is the core's rise
    rise = float(tsat_degc(20.0) - float(cells[-1][1]))
    assert sides["above"]["max_error_clamped"] == pytest.approx(rise, abs=1e-4)
    assert sides["above"]["at_clamped"] == 20.0
    fall = float(float(cells[0][1]) - tsat_degc(0.5))
    assert sides["below"]["max_error_clamped"] == pytest.approx(fall, abs=1e-4)
    assert sides["above"]["short_by"] == 2.0 and sides["below"]["short_by"] == 0.5
    kinds = [d["kind"] for d in a.findings]
    assert kinds.count("short_range") == 2


def test_no_false_alarms_on_clean_tables():
    for dec in (2, 3, 5):
        a = A.audit_bytes(csv_text(tsat_cells(decimals=dec)), "t.csv", tsat_spec())
        assert a.findings == [], (dec, a.findings)


# --------------------------------------------------------------------------------------------
# integer tables


def c_div(n, d, mode="truncate"):
    """C99 integer division (truncation toward zero), or rounding half away from zero."""
    q = (abs(n) + (d // 2 if mode == "nearest" else 0)) // d
    return q if n >= 0 else -q


INT_CASES = [
    # quantity, output unit, raw output step, rises with pressure
    ("saturation_temperature", "degC", 0.01, "truncate"),
    ("latent_heat", "kJ/kg", 0.1, "truncate"),          # falls with pressure: n < 0
    ("latent_heat", "kJ/kg", 0.1, "nearest"),
]


@pytest.mark.parametrize("qid,unit,step,mode", INT_CASES)
def test_integer_linear_exhaustive_matches_python_ints(qid, unit, step, mode):
    """Raw pressure in 0.01 bar, raw output in ``step`` (values from the core, rounded to the
    raw step); every raw input is checked, against plain Python integer arithmetic."""
    xr = np.arange(100, 2001, 100)
    f = A.core_function(A.audit_spec(qid, ["pressure"], ["bar"], unit, suggest=False))
    yr = np.rint(f(xr * 0.01) / step).astype(int)
    spec = A.audit_spec(qid, ["pressure"], ["bar"], unit, "linear", "int32", scale_in=[0.01],
                        scale_out=step, int_division=mode, suggest=False)
    a = A.audit_bytes("\n".join(f"{x},{y}" for x, y in zip(xr, yr)), "tint.csv", spec)
    assert a.verification["counts"]["exhaustive"] == 1901
    X = list(range(100, 2001))
    ref = []
    for v in X:
        i = min(int(np.searchsorted(xr, v, side="right")) - 1, len(xr) - 2)
        ref.append(int(yr[i]) + c_div((int(yr[i + 1]) - int(yr[i])) * (v - int(xr[i])),
                                      int(xr[i + 1]) - int(xr[i]), mode))
    x = np.array(X) * 0.01
    assert np.array_equal(a.table(x), np.array(ref) * step)
    e = np.max(np.abs(np.array(ref) * step - f(x)))
    assert a.verification["max_error"] == pytest.approx(e, rel=1e-12)
    rec = A.audit_record(a)
    assert rec["verification"]["method"] == "exhaustive"
    assert rec["inputs"][0]["ctype"] == "int32_t" and rec["output"]["scale"] == step
    assert a.findings == []


def test_integer_overflow_of_32_bit_products_is_named():
    xr = np.arange(10_000, 210_001, 20_000)                    # 1e-4 bar, 2-bar rows
    yr = np.rint(tsat_degc(xr * 1e-4) * 1e4).astype(np.int64)  # 1e-4 degC
    spec = tsat_spec(arithmetic="int32", scale_in=[1e-4], scale_out=1e-4, verify_points=1000)
    a = A.audit_bytes("\n".join(f"{x},{y}" for x, y in zip(xr, yr)), "big.csv", spec)
    d = next(d for d in a.findings if d["kind"] == "int_overflow")
    assert d["row"] == 1 and d["product"] > 2 ** 31 - 1


# --------------------------------------------------------------------------------------------
# grids


def density_grid(p_bar, t_degc, fmt="{:.6g}"):
    z = Q.evaluate("density", pressure=p_bar[:, None] * 1e5, temperature=t_degc[None, :] + 273.15)
    lines = ["p/T," + ",".join(f"{t:g}" for t in t_degc)]
    lines += [f"{p:g}," + ",".join(fmt.format(v) for v in row) for p, row in zip(p_bar, z)]
    return lines, z


def grid_spec(**kw):
    opts = dict(quantity="density", inputs=["pressure", "temperature"], input_units=["bar", "degC"],
                output_unit="kg/m^3", interpolation="bilinear", arithmetic="float64")
    opts.update(kw)
    return A.audit_spec(**opts)


def test_bilinear_grid_matches_scipy():
    """Superheated steam, 1-10 bar x 200-400 degC: the float64 audit against scipy's
    RegularGridInterpolator (method 'linear') on the same parsed cells."""
    from scipy.interpolate import RegularGridInterpolator
    p, t = np.linspace(1, 10, 10), np.linspace(200, 400, 11)
    lines, _ = density_grid(p, t)
    a = A.audit_bytes("\n".join(lines), "rho.csv", grid_spec(tolerance_rel=1e-3))
    z = np.array([[float(c) for c in ln.split(",")[1:]] for ln in lines[1:]])
    rgi = RegularGridInterpolator((p, t), z, method="linear")
    rng = np.random.default_rng(7)
    pa, ta = rng.uniform(1, 10, 200_000), rng.uniform(200, 400, 200_000)
    assert np.max(np.abs(a.table(pa, ta) - rgi(np.stack([pa, ta], 1))) / z.max()) < 1e-13
    f = A.core_function(a.spec)
    e_ind = np.max(np.abs(rgi(np.stack([pa, ta], 1)) / f(pa, ta) - 1))
    assert e_ind <= a.verification["max_error"] * (1 + 1e-9)
    assert a.verification["max_error"] <= 1.02 * e_ind
    at = a.verification["at"]
    assert abs(rgi([at])[0] / f(at[0], at[1]) - 1) == pytest.approx(a.verification["max_error"], rel=1e-9)
    assert a.findings == []
    assert A.audit_record(a)["max_error_at"] == at


def test_grid_across_saturation_and_a_wrong_unit_cell():
    p, t = np.linspace(1, 10, 10), np.linspace(100, 300, 21)
    lines, z = density_grid(p, t)
    cells = [ln.split(",") for ln in lines]
    cells[3][5] = f"{z[2, 4] * 0.0624279606:.6g}"             # lb/ft^3 = kg/m^3 * 0.0624279606
    text = "\n".join(",".join(c) for c in cells)
    a = A.audit_bytes(text, "rho.csv", grid_spec(arithmetic="float32", tolerance_rel=1e-3))
    d = next(d for d in a.findings if d["kind"] == "wrong_unit")
    assert (d["row"], d["column"], d["unit"]) == (4, 6, "lb/ft^3")     # cells[3][5]
    cross = next(d for d in a.findings if d["kind"] == "crosses_saturation")
    ts = tsat_degc(p)
    expect = sum(1 for i in range(9) for j in range(20)
                 if ts[i + 1] >= t[j] and ts[i] <= t[j + 1])
    assert cross["cells"] == expect
    assert a.within is False


def test_integer_sampled_finds_the_exhaustive_maximum():
    """190,001 raw inputs: sampled on 20,000 points, the maximum equals the one over all."""
    xr = np.arange(10_000, 200_001, 10_000)
    yr = np.rint(tsat_degc(xr * 1e-4) * 1e4).astype(np.int64)
    text = "\n".join(f"{x},{y}" for x, y in zip(xr, yr))
    few = A.audit_bytes(text, "b.csv", tsat_spec(arithmetic="int32", scale_in=[1e-4],
                                                 scale_out=1e-4, verify_points=20_000))
    every = A.audit_bytes(text, "b.csv", tsat_spec(arithmetic="int32", scale_in=[1e-4],
                                                   scale_out=1e-4, verify_points=200_000))
    assert "exhaustive" not in few.verification["counts"]
    assert every.verification["counts"]["exhaustive"] == 190_001
    assert few.verification["max_error"] == every.verification["max_error"]


def test_integer_bilinear_matches_python_ints():
    """Raw pressure 0.01 bar, raw temperature 0.1 degC, raw density 0.001 kg/m^3 (from the
    core); the documented integer bilinear formula in plain Python ints at random raw inputs."""
    pr = np.arange(100, 1001, 100)
    tr = np.arange(2000, 4001, 250)
    z = Q.evaluate("density", pressure=pr[:, None] * 0.01 * 1e5,
                   temperature=tr[None, :] * 0.1 + 273.15)
    zr = np.rint(z / 0.001).astype(int)
    lines = ["p/T," + ",".join(str(v) for v in tr)]
    lines += [f"{a}," + ",".join(str(v) for v in row) for a, row in zip(pr, zr)]
    spec = grid_spec(arithmetic="int32", scale_in=[0.01, 0.1], scale_out=0.001)
    a = A.audit_bytes("\n".join(lines), "rint.csv", spec)
    rng = np.random.default_rng(3)
    P = rng.integers(100, 1001, 2000)
    S = rng.integers(2000, 4001, 2000)
    ref = []
    for x, y in zip(P.tolist(), S.tolist()):
        i = min(int(np.searchsorted(pr, x, side="right")) - 1, pr.size - 2)
        j = min(int(np.searchsorted(tr, y, side="right")) - 1, tr.size - 2)
        wa, wb = int(pr[i + 1] - pr[i]), int(tr[j + 1] - tr[j])
        y0 = int(zr[i, j]) + c_div((int(zr[i + 1, j]) - int(zr[i, j])) * (x - int(pr[i])), wa)
        y1 = int(zr[i, j + 1]) + c_div((int(zr[i + 1, j + 1]) - int(zr[i, j + 1]))
                                       * (x - int(pr[i])), wa)
        ref.append(y0 + c_div((y1 - y0) * (y - int(tr[j])), wb))
    assert np.array_equal(a.table(P * 0.01, S * 0.1), np.array(ref) * 0.001)
    assert a.findings == []


def test_header_unit_disagreeing_with_the_options_is_noted():
    cells = tsat_cells()
    a = A.audit_bytes(csv_text(cells, header="p [kPa],T [degC]"), "t.csv", tsat_spec())
    assert a.notes == ["the header says 'p [kPa]' but the table is read in bar"]


# --------------------------------------------------------------------------------------------
# the command: exit status, files, bad CSV


def test_exit_1_when_tolerance_exceeded_and_0_when_met(cli, tmp_path):
    text = csv_text(tsat_cells())
    r, out, _ = run(cli, tmp_path, text, *TSAT_ARGS, "--tolerance-abs", "0.5")
    assert r.exit_code == 1, r.output
    assert "OUT OF TOLERANCE" in r.output and (out / "report.json").is_file()
    r, out, _ = run(cli, tmp_path, text, *TSAT_ARGS, "--tolerance-abs", "2")
    assert r.exit_code == 0, r.output
    assert "within tolerance" in r.output
    r, _, _ = run(cli, tmp_path, text, *TSAT_ARGS)
    assert r.exit_code == 0 and "no tolerance given" in r.output
    # within over the span, but the firmware reads it at 25 bar: clamping there is out
    r, _, _ = run(cli, tmp_path, text, *TSAT_ARGS, "--tolerance-abs", "2", "--used-max", "25")
    assert r.exit_code == 1 and "short range" in r.output


def test_report_files_and_schema(cli, tmp_path):
    cells, _ = flawed_cells()
    r, out, _ = run(cli, tmp_path, csv_text(cells), *TSAT_ARGS[:-1], "--tolerance-abs", "0.5",
                    "--used-max", "22", name="flawed.csv")
    assert r.exit_code == 1
    doc = json.loads((out / "report.json").read_text())
    png = (out / "flawed_audit_error.png").read_bytes()
    md = (out / "report.md").read_text()
    assert png[:8] == b"\x89PNG\r\n\x1a\n"
    assert "## Defects" in md and f"row {line_of(12)}" in md and "```toml" in md
    rec = doc["tables"][0]
    assert rec["method"]["kind"] == "audited_table" and rec["function"] == "flawed"
    assert rec["storage_bytes"] == 20 * 2 * 4
    assert rec["replacement"]["built"] and "h2olut would generate" in rec["replacement"]["line"]
    # the same per-table keys as a generated table's record
    spec = parse_spec(REPLACEMENT_CHECK, "x.toml")
    t = build_spec(spec)[0]
    assert set(table_record(t)) <= set(rec)
    import jsonschema
    jsonschema.validate(doc, schema_for_audits())


REPLACEMENT_CHECK = """name = "x"
prefix = "x"
[[table]]
name = "t"
quantity = "saturation_temperature"
output_unit = "degC"
tolerance = { abs = 0.5 }
pressure = { unit = "bar", min = 1, max = 22 }
"""


def schema_for_audits():
    """The report schema, which covers audited tables (null tolerance, integer arithmetic,
    exhaustive checks, extrapolation)."""
    return json.loads(SCHEMA.read_text())


def test_replacement_is_what_the_spec_snippet_builds():
    a = A.audit_bytes(csv_text(tsat_cells()), "tsat.csv", tsat_spec(suggest=True, tolerance_abs=0.1))
    r = a.replacement
    assert r["built"] and r["tolerance"] == {"abs": 0.1}
    from gen.build import build_table
    t = build_table(parse_spec(r["spec_toml"], "snippet.toml").tables[0])
    assert (t.piecewise.storage_bytes, t.piecewise.nseg, t.piecewise.degree) == \
        (r["storage_bytes"], r["segments"], r["degree"])
    assert r["max_error"] <= 0.1
    # without a tolerance: aim at the table's own measured error, rounded down
    b = A.audit_bytes(csv_text(tsat_cells()), "tsat.csv", tsat_spec(suggest=True))
    tol = b.replacement["tolerance"]["abs"]
    assert 0.9 * b.verification["max_error"] <= tol <= b.verification["max_error"]


BAD = [
    ("non-numeric", lambda c: c[3].__setitem__(1, "1O5.2"), 5, 2, "not a finite number"),
    ("empty cell", lambda c: c[5].__setitem__(1, ""), 7, 2, "empty cell"),
    ("unsorted", lambda c: c.__setitem__(6, [c[6][0], c[6][1]]) or c[6].__setitem__(0, "5.5"),
     8, 1, "inputs must increase"),
    ("duplicated", lambda c: c[9].__setitem__(0, c[8][0]), 11, 1, "repeats"),
    ("kPa among bar", lambda c: c[4].__setitem__(0, "500"), 6, 1, "500 kPa = 5 bar"),
    ("ragged", lambda c: c[2].append("99"), 4, 3, "this row has 3 cells"),
    ("outside IF97", lambda c: c[-1].__setitem__(0, "250"), 21, 1, "valid: 0.00611213 to 220.64"),
]


@pytest.mark.parametrize("label,flaw,row,col,needle", BAD, ids=[b[0] for b in BAD])
def test_bad_csv_is_one_line_exit_2(cli, tmp_path, label, flaw, row, col, needle):
    cells = tsat_cells()
    flaw(cells)
    r, out, path = run(cli, tmp_path, csv_text(cells), *TSAT_ARGS, name="bad.csv")
    assert r.exit_code == 2, r.output
    lines = [ln for ln in r.output.splitlines() if ln.strip()]
    assert len(lines) == 1, r.output
    assert lines[0].startswith(f"Error: {path}:{row}:{col}: "), lines[0]
    assert needle in lines[0], lines[0]
    assert "Traceback" not in r.output
    assert not out.exists()


def test_bad_csv_more_cases(cli, tmp_path):
    cases = [
        ("wrong number of columns", "1,99.6,1\n2,120.2,1\n", TSAT_ARGS, "1:3:", "2 columns"),
        ("integer cell with a point", "100,9961\n200,1202.5\n",
         ["-q", "saturation_temperature", "--input-unit", "bar", "--output-unit", "degC",
          "--arithmetic", "int16", "--scale-in", "0.01", "--scale-out", "0.1"], "2:2:",
         "not an integer"),
        ("does not fit int16", "100,99606\n200,120210\n",
         ["-q", "saturation_temperature", "--input-unit", "bar", "--output-unit", "degC",
          "--arithmetic", "int16", "--scale-in", "0.01", "--scale-out", "0.001"], "1:2:",
         "does not fit in int16_t"),
        ("grid with a ragged row", "p,200,300\n1,0.46,0.38\n2,0.93\n",
         ["-q", "density", "--interpolation", "bilinear", "--input", "pressure", "--input",
          "temperature", "--input-unit", "bar", "--input-unit", "degC"], "3:3:", "cells"),
        ("grid axis not numeric", "p,200,3OO\n1,0.46,0.38\n2,0.93,0.76\n",
         ["-q", "density", "--interpolation", "bilinear", "--input-unit", "bar",
          "--input-unit", "degC"], "1:3:", "not a finite number"),
        ("header only", "p,T\n", TSAT_ARGS, "1:1:", "no rows"),
    ]
    for label, text, args, where, needle in cases:
        r, out, path = run(cli, tmp_path, text, *args, name="bad.csv")
        assert r.exit_code == 2, (label, r.output)
        line = r.output.strip()
        assert "\n" not in line and line.startswith(f"Error: {path}:{where}"), (label, line)
        assert needle in line, (label, line)
        assert not out.exists()


def test_bad_options_exit_2(cli, tmp_path):
    text = csv_text(tsat_cells())
    for args, needle in [
        (["-q", "boiling_point"], "--quantity"),
        (["-q", "saturation_temperature", "--interpolation", "bilinear"], "--interpolation"),
        (["-q", "saturation_temperature", "--input-unit", "degC"], "--input-unit"),
        (["-q", "saturation_temperature", "--arithmetic", "int32"], "--scale-in"),
        (["-q", "saturation_temperature", "--scale-out", "0.1"], "integer tables only"),
        (["-q", "saturation_temperature", "--tolerance-abs", "0.1", "--tolerance-rel", "0.1"],
         "not both"),
        (["-q", "saturation_temperature", "--used-max", "300"], "--used-max"),
        (["-q", "latent_heat"], "--input"),
    ]:
        r, out, _ = run(cli, tmp_path, text, *args)
        assert r.exit_code == 2, (args, r.output)
        assert needle in r.output and r.output.count("\n") == 1, (args, r.output)
        assert not out.exists()


def test_registers_on_the_main_group():
    from gen.cli import main
    if "audit" not in main.commands:
        main.add_command(audit_command)
    r = CliRunner().invoke(main, ["audit", "--help"])
    assert r.exit_code == 0 and "--used-max" in r.output


# --------------------------------------------------------------------------------------------
# re-verifying what h2olut built


SELF_SPEC = """name = "selfcheck"
prefix = "sc"
[[table]]
name = "tsat"
quantity = "saturation_temperature"
output_unit = "degC"
tolerance = { abs = 0.05 }
pressure = { unit = "bar", min = 1, max = 20 }
[[table]]
name = "latent"
quantity = "latent_heat"
output_unit = "kJ/kg"
tolerance = { abs = 0.5 }
pressure = { unit = "bar", min = 100, max = 200 }
"""


@pytest.fixture(scope="module")
def self_build(tmp_path_factory):
    spec = parse_spec(SELF_SPEC, "selfcheck.toml")
    tables = build_spec(spec)
    files = render_outputs(spec, tables)
    d = tmp_path_factory.mktemp("selfcheck")
    for k, v in files.items():
        (d / k).write_bytes(v)
    return tables, d


def test_self_audit_gives_the_build_report_figure(self_build):
    tables, d = self_build
    doc = json.loads((d / "report.json").read_text())
    results = A.audit_generated(d / "report.json")
    assert len(results) == 2
    for res, rec, t in zip(results, doc["tables"], tables):
        kind = next(iter(rec["tolerance"]))
        assert res["measured"] == rec["max_error"][kind] == t.verification["max_error"]
        assert res["measured_at"] == rec["max_error_at"]
        assert res["same"] and res["within"]
        assert A.audit_piecewise(t) == t.verification
    # the 100-200 bar latent heat table crosses 623.15 K: a forced breakpoint, reproduced too
    assert tables[1].forced_breaks


def test_self_audit_command_and_a_tampered_module(cli, self_build, tmp_path):
    _, d = self_build
    r = CliRunner().invoke(cli, ["audit", str(d / "report.json")])
    assert r.exit_code == 0 and r.output.count("same as reported") == 2, r.output
    # change one stored coefficient's last hex digit: the re-verification must notice
    bad = tmp_path / "tampered"
    bad.mkdir()
    for f in d.iterdir():
        (bad / f.name).write_bytes(f.read_bytes())
    py = (bad / "selfcheck.py").read_text()
    start = py.index('"coef": _table([')
    end = py.index("])", start)

    def nudge(m):
        # the fifth hex digit after the point: mantissa bits 17-20, kept by float32
        d = "0123456789abcdef"
        return m.group(1) + d[(d.index(m.group(2)) + 1) % 16]
    block = re.sub(r'("-?0x1\.[0-9a-f]{4})([0-9a-f])', nudge, py[start:end])
    assert block != py[start:end]
    (bad / "selfcheck.py").write_text(py[:start] + block + py[end:])
    r = CliRunner().invoke(cli, ["audit", str(bad / "report.json")])
    assert r.exit_code == 1 and "DIFFERS" in r.output, r.output


# --------------------------------------------------------------------------------------------
# decimal cells round once


@settings(max_examples=50, deadline=None, derandomize=True)
@given(st.integers(min_value=1, max_value=10 ** 12), st.integers(min_value=-6, max_value=6))
def test_decimal_cells_round_once_to_float32(mant, exp):
    text = f"{mant}e{exp}"
    got = A._round_decimal(np.array([text], dtype=object), np.array([float(text)]), "float32")[0]
    exact = Fraction(mant) * Fraction(10) ** exp
    c = [got, np.nextafter(got, np.float32(np.inf)), np.nextafter(got, np.float32(-np.inf))]
    d = [abs(Fraction(float(v)) - exact) for v in c]
    assert d[0] <= d[1] and d[0] <= d[2]
    if d[0] == min(d[1], d[2]):        # a true tie goes to the even mantissa
        assert int(np.array(got).view(np.uint32)) & 1 == 0


def test_float32_halfway_double_is_decided_on_the_decimal():
    """1 + 2**-24 is exactly halfway between float32 1 and its successor; a decimal a hair
    above it rounds to the nearest double 1 + 2**-24 (a tie) but must go up."""
    text = "1.000000059604644775390625000001"
    assert float(text) == 1 + 2 ** -24
    got = A._round_decimal(np.array([text], dtype=object), np.array([float(text)]), "float32")[0]
    assert got == np.nextafter(np.float32(1), np.float32(2))
    assert np.float32(float(text)) == np.float32(1)           # the double rounding it avoids


def test_audit_command_is_registered_with_a_sensor_budget(tmp_path):
    """`h2olut audit` on the main group; a 0.1 %-of-span transmitter beside a coarse table.

    Check of the budget: the sensor-caused uncertainty is |dT_sat/dp| * 0.02 bar, with the
    slope recomputed here by a central difference of the core (independent of gen.sensor)."""
    from click.testing import CliRunner
    from gen.cli import main
    from gen.if97 import core
    p = np.arange(1.0, 21.0)
    T = core.saturation_temperature(p * 1e5) - 273.15
    path = tmp_path / "tsat.csv"
    path.write_text("p,t\n" + "".join(f"{a:g},{b:.3f}\n" for a, b in zip(p, T)))
    r = CliRunner().invoke(main, ["audit", str(path), "-q", "saturation_temperature",
                                  "--input-unit", "bar", "--output-unit", "degC",
                                  "--sensor-of-span", "0.001", "--sensor-span", "0", "20",
                                  "--out", str(tmp_path / "o")])
    assert r.exit_code == 0, r.output
    assert "FLAGGED" in r.output
    b = json.loads((tmp_path / "o" / "report.json").read_text())["tables"][0]["sensor_budget"]
    x = np.array([1.0, 20.0])
    h = 1e-4
    slope = (core.saturation_temperature((x + h) * 1e5) - core.saturation_temperature((x - h) * 1e5)) / (2 * h)
    u = np.abs(slope) * 0.02
    # the budget's difference stays 4e-6 of the span inside the range: 1e-4 relative here
    assert b["output_uncertainty_max"] == pytest.approx(u[0], rel=1e-4)
    assert b["output_uncertainty_min"] == pytest.approx(u[1], rel=1e-4)
    assert b["ratio_max"] > 1 and b["flag"]
    bad = CliRunner().invoke(main, ["audit", str(path), "-q", "saturation_temperature",
                                    "--input-unit", "bar", "--sensor-of-span", "0.001"])
    assert bad.exit_code == 2 and "--sensor-span" in bad.output
