"""The output set: byte-identical rebuilds, 'check', the report and its schema."""

import json
from importlib import resources

import jsonschema
from click.testing import CliRunner

from gen.cli import main
from gen.outputs import build_spec, render_outputs
from gen.spec import parse_spec

from conftest import write_files

SPEC = """
name = "plantx"
prefix = "px"
[[table]]
name = "tsat"
quantity = "saturation_temperature"
output_unit = "K"
tolerance = { abs = 0.05 }
pressure = { unit = "kPa", min = 20, max = 900 }
"""


def test_same_spec_same_bytes():
    spec = parse_spec(SPEC, "plantx.toml")
    a = render_outputs(spec, build_spec(spec))
    b = render_outputs(spec, build_spec(spec))
    assert a.keys() == b.keys()
    for k in a:
        assert a[k] == b[k], k


def test_demo_outputs_have_every_file(demo_build):
    spec, tables, files = demo_build
    base = spec.name
    for name in (f"{base}.h", f"{base}.c", f"{base}_vectors.c", f"{base}.py", "report.json",
                 "report.md"):
        assert name in files
    for t in tables:
        assert f"{base}_{t.name}_error.png" in files
        assert files[f"{base}_{t.name}_error.png"][:8] == b"\x89PNG\r\n\x1a\n"
    for name in (f"{base}.h", f"{base}.c", f"{base}_vectors.c", f"{base}.py", "report.md"):
        assert b"not for safety functions" in files[name], name
    assert spec.sha256.encode() in files[f"{base}.h"]


def test_report_json_follows_schema_and_contract(demo_build):
    spec, tables, files = demo_build
    doc = json.loads(files["report.json"])
    schema = json.loads(resources.files("gen").joinpath("schema", "report.schema.json").read_text())
    jsonschema.validate(doc, schema)
    assert doc["schema"] == "h2olut-report/1"
    for rec, t in zip(doc["tables"], tables):
        kind = t.spec.tol_kind
        assert rec["function"] == t.spec.function
        assert rec["max_error"][kind] <= rec["tolerance"][kind]
        assert rec["verification_points"] >= 100_000
        assert rec["storage_bytes"] == t.piecewise.storage_bytes
        assert rec["inputs"][0]["min"] < rec["inputs"][0]["max"]


def test_check_passes_then_names_stale_file(tmp_path):
    spec_path = tmp_path / "plantx.toml"
    spec_path.write_text(SPEC)
    out = tmp_path / "out"
    runner = CliRunner()
    r = runner.invoke(main, ["build", str(spec_path), "--out", str(out)])
    assert r.exit_code == 0, r.output
    r = runner.invoke(main, ["check", str(spec_path), "--out", str(out)])
    assert r.exit_code == 0, r.output
    snapshot = {p.name: p.stat().st_mtime_ns for p in out.iterdir()}
    # a spec edit makes every file stale
    spec_path.write_text(SPEC.replace("abs = 0.05", "abs = 0.04"))
    r = runner.invoke(main, ["check", str(spec_path), "--out", str(out)])
    assert r.exit_code == 1
    assert "plantx.c: stale: the spec changed" in r.output
    # check writes nothing
    assert {p.name: p.stat().st_mtime_ns for p in out.iterdir()} == snapshot
    # a hand edit with the same spec is named as different bits
    spec_path.write_text(SPEC)
    c = out / "plantx.c"
    c.write_bytes(c.read_bytes().replace(b"0x1", b"0x2", 1))
    r = runner.invoke(main, ["check", str(spec_path), "--out", str(out)])
    assert r.exit_code == 1
    assert "plantx.c: same spec and generator version, different bits" in r.output
    (out / "plantx.h").unlink()
    r = runner.invoke(main, ["check", str(spec_path), "--out", str(out)])
    assert "plantx.h: missing" in r.output


def test_markdown_report_embeds_plots_and_says_sampled(demo_build):
    spec, tables, files = demo_build
    md = files["report.md"].decode()
    for t in tables:
        assert f"]({spec.name}_{t.name}_error.png)" in md
    assert "sampled" in md and "not a proof" in md


def test_written_files_match_rendered(tmp_path, demo_build):
    spec, tables, files = demo_build
    d = write_files(tmp_path / "o", files)
    assert sorted(p.name for p in d.iterdir()) == sorted(files)
