"""Two-input tables through the whole pipeline: spec, build, C, Python module, vectors, report.

Numbers are checked against the core here (the grid engine's own tests in test_grid2d.py also
check against CoolProp's IF97 backend and IF97 verification values).
"""

import importlib.util
import json
import subprocess
from importlib import resources

import jsonschema
import numpy as np
import pytest
from click.testing import CliRunner

from gen.cli import main

from conftest import compile_c

SPEC = """
name = "grids"
prefix = "gd"
[[table]]
name = "tsat"
quantity = "saturation_temperature"
output_unit = "degC"
tolerance = { abs = 0.05 }
pressure = { unit = "bar", min = 1, max = 40 }
[[table]]
name = "steam_rho"
quantity = "density"
phase = "vapor"
output_unit = "kg/m^3"
tolerance = { rel = 0.002 }
verify_points = 20000
pressure = { unit = "bar", min = 1, max = 40 }
temperature = { unit = "degC", min_above_saturation = 5, max = 400 }
"""


@pytest.fixture(scope="module")
def built(tmp_path_factory):
    d = tmp_path_factory.mktemp("grids")
    spec = d / "grids.toml"
    spec.write_text(SPEC)
    r = CliRunner().invoke(main, ["build", str(spec), "--out", str(d / "out")])
    assert r.exit_code == 0, r.output
    return d, d / "out"


def test_build_writes_every_file_and_checks_clean(built):
    d, out = built
    names = sorted(p.name for p in out.iterdir())
    assert names == sorted(["grids.h", "grids.c", "grids_vectors.c", "grids.py", "report.json",
                            "report.md", "grids_tsat_error.png", "grids_steam_rho_error.png"])
    r = CliRunner().invoke(main, ["check", str(d / "grids.toml"), "--out", str(out)])
    assert r.exit_code == 0, r.output


def test_c_compiles_strict_and_vectors_pass(built):
    d, out = built
    exe = compile_c(out, ["grids.c", "grids_vectors.c"], out / "vectors")
    r = subprocess.run([str(exe)], capture_output=True, text=True)
    assert r.returncode == 0, r.stdout
    assert "0 out of tolerance, 0 bit differences" in r.stdout


def test_python_module_within_tolerance_and_wrong_side(built):
    d, out = built
    s = importlib.util.spec_from_file_location("grids", out / "grids.py")
    mod = importlib.util.module_from_spec(s)
    s.loader.exec_module(mod)
    from gen.quantities import evaluate
    rng = np.random.default_rng(11)
    p = rng.uniform(1.0, 40.0, 3000)
    ts = evaluate("saturation_temperature", pressure=p * 1e5) - 273.15
    T = ts + 5.0 + (400.0 - ts - 5.0) * rng.uniform(0, 1, p.size)
    p32, T32 = p.astype(np.float32), T.astype(np.float32)
    y = mod.gd_steam_rho(p32, T32).astype(np.float64)
    ref = evaluate("density", pressure=p32.astype(np.float64) * 1e5,
                   temperature=T32.astype(np.float64) + 273.15, phase="vapor")
    inside = T32.astype(np.float64) >= ts + 5.0 + 1e-3   # the helper's own rounding near the limit
    assert np.max(np.abs(y / ref - 1)[inside]) <= 0.002
    # a liquid state (below saturation) is flagged, never given a liquid value
    v, st = mod.gd_steam_rho_status(np.float32(10.0), np.float32(150.0))
    assert st == mod.WRONG_SIDE
    assert float(v) < 10.0  # a vapour density (liquid water would be ~917 kg/m^3)


def test_report_lists_both_inputs_and_follows_schema(built):
    d, out = built
    doc = json.loads((out / "report.json").read_text())
    schema = json.loads(resources.files("gen").joinpath("schema", "report.schema.json").read_text())
    jsonschema.validate(doc, schema)
    rec = doc["tables"][1]
    assert [i["quantity"] for i in rec["inputs"]] == ["pressure", "temperature"]
    assert len(rec["max_error_at"]) == 2
    assert rec["max_error"]["rel"] <= rec["tolerance"]["rel"]
    md = (out / "report.md").read_text()
    assert "grids_steam_rho_error.png" in md and "Candidates tried" in md


BAD = [
    ('phase = "vapor"\n', "", "'phase'"),
    ('min_above_saturation = 5', 'min_below_saturation = 5', "does not fit phase"),
    ('min_above_saturation = 5', 'min_above_saturation = 5, min = 100', "not both"),
    ('phase = "vapor"\n', 'phase = "vapor"\ndegree = 3\n', "'degree'"),
    ('max = 400 }', 'max = 400, maxx = 3 }', "unknown key"),
    ('min_above_saturation = 5', 'min = 100', "saturation"),   # absolute min below T_sat(40 bar)
]


@pytest.mark.parametrize("old,new,needle", BAD)
def test_bad_two_input_specs_are_one_line_exit_2(tmp_path, old, new, needle):
    text = SPEC.replace(old, new, 1)
    assert text != SPEC
    p = tmp_path / "bad.toml"
    p.write_text(text)
    r = CliRunner().invoke(main, ["build", str(p), "--out", str(tmp_path / "o")])
    assert r.exit_code == 2, r.output
    assert r.output.count("\n") == 1 and needle in r.output and "Traceback" not in r.output
    assert not (tmp_path / "o").exists()
