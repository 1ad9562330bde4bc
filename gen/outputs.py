"""The output set of a spec: render every file in memory, write them atomically, compare.

Offers ``render_outputs(spec, tables)`` -> {file name: bytes}, ``write_outputs(outdir, files)``,
``compare_outputs(outdir, files, spec)`` -> list of (file, problem), ``build_spec(spec)``.
"""

import json
import os
import tempfile
from pathlib import Path

from . import __version__
from .build import build_table, core_function, error_scale
from .emit.c import render_c
from .emit.common import generator_digest, table_kind
from .emit.python import render_python
from .report import error_map, error_map_wet, error_plot, report_json, report_markdown


def build_spec(spec, progress=None):
    """Fit and verify every table of ``spec``."""
    tables = []
    for i, ts in enumerate(spec.tables):
        if progress:
            progress(f"[{i + 1}/{len(spec.tables)}] {ts.name}")
        tables.append(build_table(ts, progress=progress))
    return tables


def render_outputs(spec, tables):
    """Every output file's bytes. Same spec and generator version give the same bytes."""
    base = spec.name
    refs = {t.name: core_function(t.spec) for t in tables if table_kind(t) == "one"}
    files = {}
    for name, text in render_c(spec, tables, base, refs).items():
        files[name] = text.encode("utf-8")
    for name, text in render_python(spec, tables, base).items():
        files[name] = text.encode("utf-8")
    plots = {}
    for t in tables:
        png = f"{base}_{t.name}_error.png"
        if table_kind(t) == "grid":
            files[png] = error_map(t)
        elif table_kind(t) == "wet":
            files[png] = error_map_wet(t)
        else:
            files[png] = error_plot(t, refs[t.name], error_scale(t.spec.tol_kind))
        plots[t.name] = png
    files["report.json"] = report_json(spec, tables).encode("utf-8")
    files["report.md"] = report_markdown(spec, tables, plots).encode("utf-8")
    return files


def write_outputs(outdir, files):
    """Write all files atomically: every file goes to a temporary name first, then all are
    renamed into place, so a failure leaves the previous outputs untouched."""
    out = Path(outdir)
    out.mkdir(parents=True, exist_ok=True)
    temps = []
    try:
        for name, data in sorted(files.items()):
            fd, tmp = tempfile.mkstemp(prefix=f".{name}.", suffix=".tmp", dir=out)
            temps.append((tmp, out / name))
            with os.fdopen(fd, "wb") as fh:
                fh.write(data)
                fh.flush()
                os.fsync(fh.fileno())
            os.chmod(tmp, 0o644)
        for tmp, final in temps:
            os.replace(tmp, final)
        temps = []
    finally:
        for tmp, _ in temps:
            try:
                os.unlink(tmp)
            except OSError:
                pass


def _committed_inputs(outdir):
    try:
        doc = json.loads((Path(outdir) / "report.json").read_text(encoding="utf-8"))
        gen = doc["generator"]
        return doc["spec"]["sha256"], gen["version"], gen.get("source_sha256"), doc
    except (OSError, ValueError, KeyError, TypeError):
        return None, None, None, None


def compare_outputs(outdir, files, spec):
    """Files in ``outdir`` that differ from ``files``, each with a one-line reason."""
    sha, version, source, doc = _committed_inputs(outdir)
    same_source = source == generator_digest()
    same_inputs = sha == spec.sha256 and version == __version__ and same_source
    problems = []
    for name, data in sorted(files.items()):
        path = Path(outdir) / name
        if not path.is_file():
            problems.append((name, "missing"))
            continue
        if path.read_bytes() == data:
            continue
        if same_inputs:
            problems.append((name, "same spec and generator version, different bits "
                                   "(another numerical platform?)"))
        elif sha != spec.sha256:
            problems.append((name, "stale: the spec changed"))
        elif version != __version__:
            problems.append((name, f"stale: written by h2olut {version}, this is {__version__}"))
        else:
            problems.append((name, "stale: the generator's sources changed since it was written"))
    if problems and same_inputs and doc is not None:
        new = json.loads(files["report.json"])
        for old_t, new_t in zip(doc.get("tables", []), new["tables"]):
            kind = next(iter(new_t["tolerance"]))
            tol = new_t["tolerance"][kind]
            a = old_t.get("max_error", {}).get(kind)
            b = new_t["max_error"][kind]
            problems.append((f"  {new_t['name']}", f"committed max error {a:.3g}, rebuilt "
                             f"{b:.3g}, tolerance {tol:g}: "
                             f"{'both within' if a is not None and a <= tol and b <= tol else 'NOT both within'}"))
    return problems
