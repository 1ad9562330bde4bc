"""Bad input: one line naming file, table and key; exit status 2; no traceback; nothing written."""

import pytest
from click.testing import CliRunner

from gen.cli import main

GOOD_TABLE = """
[[table]]
name = "tsat"
quantity = "saturation_temperature"
output_unit = "degC"
tolerance = { abs = 0.05 }
pressure = { unit = "bar", min = 1, max = 10 }
"""

HEAD = 'name = "t"\nprefix = "plant"\n'


def run_build(tmp_path, text):
    spec = tmp_path / "bad.toml"
    spec.write_text(text)
    out = tmp_path / "out"
    r = CliRunner().invoke(main, ["build", str(spec), "--out", str(out)])
    return r, out


CASES = [
    ("unknown quantity", GOOD_TABLE.replace("saturation_temperature", "boiling_point"),
     ["'quantity'", "boiling_point", "saturation_temperature"]),
    ("unknown unit", GOOD_TABLE.replace('unit = "bar"', 'unit = "barr"'),
     ["'pressure.unit'", "barr"]),
    ("unit of the wrong kind", GOOD_TABLE.replace('unit = "bar"', 'unit = "degC"'),
     ["'pressure.unit'", "not a unit of pressure"]),
    ("min >= max", GOOD_TABLE.replace("min = 1, max = 10", "min = 10, max = 10"),
     ["'pressure.min'", "below pressure.max"]),
    ("past the critical point", GOOD_TABLE.replace("max = 10", "max = 250"),
     ["'pressure.max'", "valid: 0.00611213 to 220.64 bar"]),
    ("below the triple line", GOOD_TABLE.replace("min = 1", "min = 0.001"),
     ["'pressure.min'", "valid:"]),
    ("zero tolerance", GOOD_TABLE.replace("abs = 0.05", "abs = 0"),
     ["'tolerance.abs'", "must be positive"]),
    ("negative tolerance", GOOD_TABLE.replace("abs = 0.05", "rel = -1e-4"),
     ["'tolerance.rel'", "must be positive"]),
    ("tolerance below float32", GOOD_TABLE.replace("abs = 0.05", "abs = 1e-6"),
     ["'tolerance.abs'", "smallest feasible"]),
    ("unknown key", GOOD_TABLE.replace('output_unit = "degC"', 'output_unit = "degC"\ndegre = 3'),
     ["'degre'", "unknown key"]),
    ("bad degree", GOOD_TABLE.replace('output_unit = "degC"', 'output_unit = "degC"\ndegree = 9'),
     ["'degree'", "1, 2, 3, 4, 5"]),
    ("two-input quantity", GOOD_TABLE.replace("saturation_temperature", "density"),
     ["'inputs'", "density takes"]),
]


@pytest.mark.parametrize("label,table,needles", CASES, ids=[c[0] for c in CASES])
def test_bad_table_is_one_line_exit_2(tmp_path, label, table, needles):
    r, out = run_build(tmp_path, HEAD + table)
    assert r.exit_code == 2, r.output
    lines = [ln for ln in r.output.splitlines() if ln.strip()]
    assert len(lines) == 1, r.output
    assert lines[0].startswith("Error: ") and "bad.toml" in lines[0]
    assert "table 'tsat'" in lines[0] or label == "tolerance below float32" or "table" in lines[0]
    for n in needles:
        assert n in lines[0], (n, lines[0])
    assert "Traceback" not in r.output
    assert not out.exists(), "nothing may be written for a bad spec"


@pytest.mark.parametrize("prefix", ["int", "2fast", "my-prefix", "__x", "while"])
def test_bad_prefix(tmp_path, prefix):
    r, out = run_build(tmp_path, f'name = "t"\nprefix = "{prefix}"\n' + GOOD_TABLE)
    assert r.exit_code == 2
    assert "'prefix'" in r.output and r.output.count("\n") == 1
    assert not out.exists()


def test_toml_syntax_error(tmp_path):
    r, out = run_build(tmp_path, HEAD + "[[table]\nname = 1\n")
    assert r.exit_code == 2
    assert "TOML syntax error" in r.output and r.output.count("\n") == 1
    assert not out.exists()


def test_missing_spec_file(tmp_path):
    r = CliRunner().invoke(main, ["build", str(tmp_path / "nope.toml"), "--out", str(tmp_path / "o")])
    assert r.exit_code == 2 and "nope.toml" in r.output and "Traceback" not in r.output


def test_failed_build_leaves_previous_outputs(tmp_path):
    good = tmp_path / "good.toml"
    good.write_text(HEAD + GOOD_TABLE)
    out = tmp_path / "out"
    r = CliRunner().invoke(main, ["build", str(good), "--out", str(out)])
    assert r.exit_code == 0, r.output
    before = {p.name: p.read_bytes() for p in out.iterdir()}
    bad = tmp_path / "bad.toml"
    bad.write_text(HEAD + GOOD_TABLE.replace("abs = 0.05", "abs = 1e-7"))
    r = CliRunner().invoke(main, ["build", str(bad), "--out", str(out)])
    assert r.exit_code == 2
    after = {p.name: p.read_bytes() for p in out.iterdir()}
    assert after == before


def test_description_cannot_end_a_c_comment(tmp_path):
    text = HEAD + GOOD_TABLE.replace(
        'output_unit = "degC"', 'output_unit = "degC"\ndescription = "evil */ int x; /* ??/ end"')
    spec = tmp_path / "desc.toml"
    spec.write_text(text)
    out = tmp_path / "out"
    r = CliRunner().invoke(main, ["build", str(spec), "--out", str(out)])
    assert r.exit_code == 0, r.output
    for name in ("t.h", "t.c", "t_vectors.c"):
        src = (out / name).read_text()
        assert "evil */" not in src and "??/" not in src
        # every comment opened is closed exactly once: no stray code from the description
        assert "int x;" not in src.replace("evil * / int x; / * ? ?/ end", "")


def test_state_outside_validity_is_exit_2():
    r = CliRunner().invoke(main, ["state", "--pressure", "2000 bar", "--temperature", "300 K"])
    assert r.exit_code == 2
    assert r.output.startswith("Error: ") and r.output.count("\n") == 1


def test_state_bad_unit_is_exit_2():
    r = CliRunner().invoke(main, ["state", "--pressure", "10 bananas"])
    assert r.exit_code == 2 and "bananas" in r.output
