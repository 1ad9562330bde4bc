"""The generated C: warning-free under the strict flags, bit-identical to the emulation, and its
own test-vector program passes."""

import subprocess

import numpy as np
import pytest

from gen.build import core_function, error_scale
from gen.verify import verification_points

from conftest import compile_c, write_files

HARNESS = r"""
#include <stdio.h>
#include <stdint.h>
#include <string.h>
#include "%(base)s.h"
/* reads float32 inputs from stdin, writes the function's float32 results to stdout */
int main(int argc, char **argv)
{
    float x, y;
    int which;
    if (argc < 2) {
        return 3;
    }
    which = argv[1][0] - 'a';
    while (fread(&x, sizeof x, 1, stdin) == 1) {
        switch (which) {
%(cases)s
        default:
            return 4;
        }
        fwrite(&y, sizeof y, 1, stdout);
    }
    return 0;
}
"""


@pytest.fixture(scope="module")
def compiled(demo_build, tmp_path_factory):
    spec, tables, files = demo_build
    d = write_files(tmp_path_factory.mktemp("demo_c"), files)
    cases = "\n".join(f"        case {i}: y = {t.spec.function}(x); break;"
                      for i, t in enumerate(tables))
    (d / "harness.c").write_text(HARNESS % {"base": spec.name, "cases": cases})
    exe = compile_c(d, [f"{spec.name}.c", "harness.c"], d / "harness")
    return d, exe, spec, tables


def test_vectors_program_passes(demo_build, tmp_path):
    spec, tables, files = demo_build
    d = write_files(tmp_path, files)
    exe = compile_c(d, [f"{spec.name}.c", f"{spec.name}_vectors.c"], d / "vectors")
    r = subprocess.run([str(exe)], capture_output=True, text=True)
    assert r.returncode == 0, r.stdout
    assert "0 out of tolerance, 0 bit differences" in r.stdout


def test_vectors_program_fails_on_a_corrupted_table(demo_build, tmp_path):
    spec, tables, files = demo_build
    d = write_files(tmp_path, files)
    src = (d / f"{spec.name}.c").read_text()
    # nudge the first coefficient of the first table: bits differ and the value moves
    i = src.index("_c[")
    j = src.index("{ ", src.index("{", i) + 1) + 2
    k = src.index(",", j)
    lit = src[j:k]
    src = src[:j] + f"({lit} * 1.01f)" + src[k:]
    (d / f"{spec.name}.c").write_text(src)
    exe = compile_c(d, [f"{spec.name}.c", f"{spec.name}_vectors.c"], d / "vectors")
    r = subprocess.run([str(exe)], capture_output=True, text=True)
    assert r.returncode != 0


def test_compiled_equals_emulation_bit_for_bit(compiled):
    d, exe, spec, tables = compiled
    for i, t in enumerate(tables):
        pw = t.piecewise
        x, _ = verification_points(pw, t.spec.verify_points, t.verification["seed"])
        specials = np.array([np.nan, np.inf, -np.inf, pw.lo - 1.0, pw.hi + 1.0, 0.0, -0.0])
        x32 = np.concatenate([x, specials]).astype(np.float32)
        r = subprocess.run([str(exe), chr(ord("a") + i)], input=x32.tobytes(), capture_output=True)
        assert r.returncode == 0
        got = np.frombuffer(r.stdout, dtype=np.float32)
        want = pw(x32).astype(np.float32)
        assert got.size == x32.size
        same = (got.view(np.uint32) == want.view(np.uint32)) | (np.isnan(got) & np.isnan(want))
        assert same.all(), (t.name, x32[~same][:5], got[~same][:5], want[~same][:5])


def test_compiled_within_tolerance_on_fresh_points(compiled):
    """Points never used to fit or verify (another seed), against the core."""
    d, exe, spec, tables = compiled
    rng = np.random.default_rng(20261201)
    for i, t in enumerate(tables):
        pw = t.piecewise
        x32 = rng.uniform(pw.lo, pw.hi, 20000).astype(np.float32)
        x32 = x32[(x32 >= np.float32(pw.lo)) & (x32 <= np.float32(pw.hi))]
        r = subprocess.run([str(exe), chr(ord("a") + i)], input=x32.tobytes(), capture_output=True)
        y = np.frombuffer(r.stdout, dtype=np.float32).astype(np.float64)
        fx = core_function(t.spec)(x32.astype(np.float64))
        err = np.abs(y - fx) / error_scale(t.spec.tol_kind)(fx)
        assert err.max() <= t.spec.tol_value, (t.name, err.max())


def test_header_compiles_as_cpp(demo_build, tmp_path):
    import shutil
    cxx = shutil.which("g++") or shutil.which("c++")
    if cxx is None:
        pytest.skip("no C++ compiler")
    spec, tables, files = demo_build
    d = write_files(tmp_path, files)
    (d / "use.cpp").write_text(f'#include "{spec.name}.h"\nint main() {{ return 0; }}\n')
    r = subprocess.run([cxx, "-Wall", "-Wextra", "-Werror", "-c", "use.cpp"], cwd=d,
                       capture_output=True, text=True)
    assert r.returncode == 0, r.stderr


def test_no_heap_no_recursion_const_tables(demo_build):
    spec, tables, files = demo_build
    src = files[f"{spec.name}.c"].decode()
    for word in ("malloc", "calloc", "realloc", "free(", "double "):
        if word == "double " and all(t.piecewise.fmt == "float32" for t in tables):
            assert word not in src.split("*/", 1)[1].replace("(double)", "")
        elif word != "double ":
            assert word not in src
    assert src.count("static const float") == sum(
        1 + (2 if t.piecewise.layout == "free" else 0) for t in tables)
