"""The committed demo outputs (out/, out/grids/) compile under the strict flags and pass their
own test vectors; CI's 'h2olut check' separately proves they are what the generator writes."""

import shutil
import subprocess
from pathlib import Path

import pytest

from conftest import compile_c

ROOT = Path(__file__).resolve().parent.parent


@pytest.mark.parametrize("folder,base", [("out", "larkspur_steam"),
                                         ("out/grids", "larkspur_grids")])
def test_committed_c_compiles_and_passes_its_vectors(tmp_path, folder, base):
    src = ROOT / folder
    for name in (f"{base}.h", f"{base}.c", f"{base}_vectors.c"):
        shutil.copy(src / name, tmp_path / name)
    exe = compile_c(tmp_path, [f"{base}.c", f"{base}_vectors.c"], tmp_path / "vectors")
    r = subprocess.run([str(exe)], capture_output=True, text=True)
    assert r.returncode == 0, r.stdout
    assert "0 out of tolerance, 0 bit differences" in r.stdout
