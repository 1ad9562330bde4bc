"""The generated Python module: standalone, same bits as the emulation, scalar and array calls."""

import importlib.util
import subprocess
import sys

import numpy as np

from conftest import write_files


def load(path, name):
    s = importlib.util.spec_from_file_location(name, path)
    mod = importlib.util.module_from_spec(s)
    s.loader.exec_module(mod)
    return mod


def test_python_module_matches_emulation(demo_build, tmp_path):
    spec, tables, files = demo_build
    d = write_files(tmp_path, files)
    mod = load(d / f"{spec.name}.py", spec.name)
    for t in tables:
        fn = getattr(mod, t.spec.function)
        pw = t.piecewise
        x = np.linspace(pw.lo - 1, pw.hi + 1, 5001)
        a = fn(x)
        b = pw(x)
        assert a.dtype == np.float32
        assert np.array_equal(a.view(np.uint32), b.view(np.uint32))
        assert np.ndim(fn(float(pw.lo))) == 0
        v, s = getattr(mod, t.spec.function + "_status")(np.array([pw.lo - 1, pw.hi + 1, np.nan]))
        assert list(s) == [mod.BELOW, mod.ABOVE, mod.NOT_A_NUMBER]


def test_python_module_imports_nothing_from_the_generator(demo_build, tmp_path):
    spec, tables, files = demo_build
    d = write_files(tmp_path, {f"{spec.name}.py": files[f"{spec.name}.py"]})
    code = (f"import sys; sys.modules['gen'] = None; sys.path.insert(0, {str(d)!r}); "
            f"import {spec.name} as m; print(m.{tables[0].spec.function}(1.0))")
    r = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, cwd=d)
    assert r.returncode == 0, r.stderr
    assert "gen" not in files[f"{spec.name}.py"].decode().split("import numpy")[0][-200:]
