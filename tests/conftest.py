"""Shared fixtures: the demo spec built once per session, and a C compiler helper."""

import shutil
import subprocess
from pathlib import Path

import pytest

from gen.cli import _demo_path
from gen.outputs import build_spec, render_outputs
from gen.spec import load_spec

STRICT_CFLAGS = ["-std=c99", "-O2", "-Wall", "-Wextra", "-Wpedantic", "-Wconversion",
                 "-Wdouble-promotion", "-Werror"]


@pytest.fixture(scope="session")
def demo_build():
    """(spec, tables, files) of the built-in demo spec."""
    spec = load_spec(_demo_path())
    tables = build_spec(spec)
    return spec, tables, render_outputs(spec, tables)


def cc():
    exe = shutil.which("cc") or shutil.which("gcc")
    if exe is None:
        pytest.fail("no C compiler on PATH (CI installs gcc)")
    return exe


def compile_c(workdir, sources, out, extra=()):
    """Compile with the strict warning set; fail the test with the compiler's text."""
    cmd = [cc(), *STRICT_CFLAGS, *extra, *[str(s) for s in sources], "-o", str(out), "-lm"]
    r = subprocess.run(cmd, cwd=workdir, capture_output=True, text=True)
    assert r.returncode == 0, f"compile failed: {' '.join(cmd)}\n{r.stderr}"
    return Path(out)


def write_files(directory, files):
    d = Path(directory)
    d.mkdir(parents=True, exist_ok=True)
    for name, data in files.items():
        (d / name).write_bytes(data)
    return d
