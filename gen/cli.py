"""The ``h2olut`` command: build, check and spot-check states.

Bad input is a one-line ``Error: ...`` on stderr and exit status 2; a stale output set is exit
status 1 from ``check``; nothing is written unless the whole build succeeded.
"""

import dataclasses
import sys
from importlib import resources
from pathlib import Path

import click
import numpy as np

from . import __version__

DEMO_SPEC = "larkspur_creamery.toml"


class InputError(click.ClickException):
    """Bad input: one line, exit status 2."""
    exit_code = 2


def _demo_path():
    return Path(str(resources.files("gen").joinpath("demo", DEMO_SPEC)))


def _load(spec_path):
    from .spec import SpecError, load_spec
    try:
        if spec_path is None:
            spec = load_spec(_demo_path())
            return dataclasses.replace(spec, command="h2olut build")
        spec = load_spec(spec_path)
        return dataclasses.replace(spec, command=f"h2olut build {Path(spec_path).name}")
    except SpecError as e:
        raise InputError(str(e)) from None


def _progress():
    if not sys.stderr.isatty():
        return None

    def say(msg):
        sys.stderr.write("\r\x1b[K" + msg[:100])
        sys.stderr.flush()
    return say


def _build(spec):
    from .build import BuildError
    from .outputs import build_spec, render_outputs
    say = _progress()
    try:
        tables = build_spec(spec, progress=say)
        files = render_outputs(spec, tables)
    except BuildError as e:
        if say:
            sys.stderr.write("\r\x1b[K")
        raise InputError(f"{spec.source}: {e}") from None
    if say:
        sys.stderr.write("\r\x1b[K")
    return tables, files


@click.group(context_settings={"help_option_names": ["-h", "--help"]})
@click.version_option(__version__, "--version", prog_name="h2olut")
def main():
    """h2olut: verified water/steam property tables (IAPWS-IF97) for firmware.

    \b
    Examples:
      h2olut build                      build the built-in demo spec into ./out
      h2olut build plant.toml --out fw/steam
      h2olut check plant.toml --out fw/steam   (exit 1 if stale; writes nothing)
      h2olut state --pressure "10 bar" --temperature "180 degC"

    Not for safety functions (relief, trips, low-water cut-offs).
    """


@main.command()
@click.argument("spec", required=False, type=click.Path(dir_okay=False))
@click.option("--out", "outdir", default="out", show_default=True, type=click.Path(file_okay=False),
              help="Folder for the generated files.")
def build(spec, outdir):
    """Fit, verify and write the tables of SPEC (default: the built-in demo spec).

    Writes NAME.h, NAME.c, NAME_vectors.c, NAME.py, report.json, report.md and one error plot
    per table. All files are written to temporary names and renamed at the end.
    """
    from .outputs import write_outputs
    s = _load(spec)
    tables, files = _build(s)
    try:
        write_outputs(outdir, files)
    except OSError as e:
        raise InputError(f"{outdir}: cannot write the outputs ({e.strerror})") from None
    for t in tables:
        ts, v = t.spec, t.verification
        if ts.tol_kind == "abs":
            unit = f" {ts.output_unit}" if ts.output_unit else ""
            err = f"{v['max_error']:.3g}{unit} (tolerance {ts.tol_value:g})"
        else:
            err = f"{v['max_error'] * 100:.3g} % (tolerance {ts.tol_value * 100:g} %)"
        if getattr(t, "gt", None) is not None:
            g = t.gt.grid
            click.echo(f"{ts.function}: {g.nx} x {g.ny} {g.method} grid, {g.storage_bytes} "
                       f"bytes, max error {err} on {v['points']} points")
            continue
        if getattr(t, "combine", None) is not None:
            click.echo(f"{ts.function}: wet steam from {len(t.members)} saturation tables, "
                       f"{t.storage_bytes} bytes, max error {err} on {v['points']} points")
            continue
        click.echo(f"{ts.function}: {t.piecewise.nseg} x degree {t.piecewise.degree} "
                   f"({t.piecewise.layout}), {t.piecewise.storage_bytes} bytes, max error "
                   f"{err} on {v['points']} points")
    click.echo(f"wrote {len(files)} files to {outdir}")


@main.command()
@click.argument("spec", required=False, type=click.Path(dir_okay=False))
@click.option("--out", "outdir", default="out", show_default=True, type=click.Path(file_okay=False),
              help="Folder holding the committed outputs.")
def check(spec, outdir):
    """Exit 0 if OUT holds exactly what 'build' would write for SPEC, else 1 and name the files.

    Writes nothing.
    """
    from .outputs import compare_outputs
    s = _load(spec)
    _, files = _build(s)
    problems = compare_outputs(outdir, files, s)
    if not problems:
        click.echo(f"{outdir}: up to date ({len(files)} files)")
        return
    for name, why in problems:
        click.echo(f"{name}: {why}")
    click.echo(f"{outdir}: out of date; run '{s.command}' with --out {outdir}", err=True)
    sys.exit(1)


_STATE_UNITS = {
    "si": {"pressure": "Pa", "temperature": "K", "density": "kg/m^3", "specific_energy": "J/kg",
           "specific_entropy": "J/(kg*K)", "speed": "m/s", "dynamic_viscosity": "Pa*s",
           "thermal_conductivity": "W/(m*K)", "surface_tension": "N/m",
           "specific_volume": "m^3/kg", "dimensionless": ""},
    "engineering": {"pressure": "bar", "temperature": "degC", "density": "kg/m^3",
                    "specific_energy": "kJ/kg", "specific_entropy": "kJ/(kg*K)", "speed": "m/s",
                    "dynamic_viscosity": "uPa*s", "thermal_conductivity": "mW/(m*K)",
                    "surface_tension": "mN/m", "specific_volume": "m^3/kg", "dimensionless": ""},
}

_SINGLE = ["density", "specific_volume", "specific_enthalpy", "specific_internal_energy",
           "specific_entropy", "isobaric_heat_capacity", "isochoric_heat_capacity",
           "speed_of_sound", "isentropic_exponent", "dynamic_viscosity", "thermal_conductivity"]
_SAT = ["saturated_liquid_density", "saturated_vapor_density", "saturated_liquid_enthalpy",
        "saturated_vapor_enthalpy", "latent_heat", "saturated_liquid_entropy",
        "saturated_vapor_entropy", "surface_tension"]


@main.command()
@click.option("--pressure", "-p", help='Pressure with unit, e.g. "10 bar" (a bare number is Pa).')
@click.option("--temperature", "-t", help='Temperature with unit, e.g. "180 degC" (bare: K).')
@click.option("--enthalpy", help='Specific enthalpy with unit, e.g. "2000 kJ/kg" (bare: J/kg); '
              'with --pressure.')
@click.option("--entropy", help='Specific entropy with unit, e.g. "6 kJ/(kg*K)" (bare: '
              'J/(kg K)); with --pressure.')
@click.option("--phase", type=click.Choice(["liquid", "vapor"]),
              help="Side of the saturation line for a point exactly on it.")
@click.option("--units", "system", type=click.Choice(["engineering", "si"]), default="engineering",
              show_default=True, help="Units of the printed values.")
def state(pressure, temperature, enthalpy, entropy, phase, system):
    """Print every IF97 property at one state, for spot checks.

    Both --pressure and --temperature: the single-phase state. Only one of them: the
    saturation state at that pressure or temperature. --pressure with --enthalpy or --entropy:
    wet steam (quality and mixture properties) inside the two-phase dome, else the
    single-phase state at the temperature they give.
    """
    from . import quantities as Q
    from . import units as U
    if pressure is None and temperature is None:
        raise InputError("give --pressure, --temperature or both")
    if (enthalpy is not None or entropy is not None) and (
            pressure is None or temperature is not None or None not in (enthalpy, entropy)):
        raise InputError("--enthalpy or --entropy goes with --pressure alone (one of the two)")
    try:
        p = U.parse_quantity(pressure, "pressure") if pressure is not None else None
        T = U.parse_quantity(temperature, "temperature") if temperature is not None else None
        second = None
        if enthalpy is not None:
            second = ("specific_enthalpy", U.parse_quantity(enthalpy, "specific_energy"), enthalpy)
        elif entropy is not None:
            second = ("specific_entropy", U.parse_quantity(entropy, "specific_entropy"), entropy)
    except U.UnitError as e:
        raise InputError(str(e)) from None
    units = _STATE_UNITS[system]
    rows = []

    def show(qid, value):
        kind = Q.CATALOGUE[qid].kind
        unit = units[kind]
        v = U.from_si(float(value), unit, kind) if unit else float(value)
        rows.append((Q.CATALOGUE[qid].text, f"{v:.10g}", unit))

    try:
        if second is not None:
            from .if97 import core
            name, a, text = second
            x = float(Q.evaluate("quality", mask=True, pressure=p, **{name: a}))
            if np.isfinite(x):
                m = core.mixture_p(p, x)
                head = f"wet steam at p = {pressure}, {name.replace('_', ' ')} = {text}"
                show("quality", x)
                show("saturation_temperature", Q.evaluate("saturation_temperature", pressure=p))
                for qid, key in (("density", "rho"), ("specific_volume", "v"),
                                 ("specific_enthalpy", "h"), ("specific_internal_energy", "u"),
                                 ("specific_entropy", "s")):
                    show(qid, m[key])
            else:
                T = float(Q.evaluate("temperature", pressure=p, **{name: a}))
                region = int(core.props_pT(p, T)["region"])
                head = (f"state at p = {pressure}, {name.replace('_', ' ')} = {text}: not wet "
                        f"steam, IF97 region {region}")
                show("temperature", T)
                for qid in _SINGLE:
                    show(qid, Q.evaluate(qid, pressure=p, temperature=T))
        elif p is not None and T is not None:
            from .if97 import core
            props = core.props_pT(p, T, phase=phase, transport=True)
            region = int(props["region"])
            head = f"state at p = {pressure}, T = {temperature}: IF97 region {region}"
            for qid in _SINGLE:
                show(qid, Q.evaluate(qid, pressure=p, temperature=T, phase=phase))
        elif p is not None:
            Ts = Q.evaluate("saturation_temperature", pressure=p)
            head = f"saturation at p = {pressure}"
            show("saturation_temperature", Ts)
            for qid in _SAT:
                show(qid, Q.evaluate(qid, pressure=p))
        else:
            ps = Q.evaluate("saturation_pressure", temperature=T)
            head = f"saturation at T = {temperature}"
            show("saturation_pressure", ps)
            for qid in _SAT:
                show(qid, Q.evaluate(qid, temperature=T))
    except ValueError as e:
        raise InputError(" ".join(str(e).split())) from None
    click.echo(head)
    width = max(len(r[0]) for r in rows)
    for name, val, unit in rows:
        click.echo(f"  {name:<{width}}  {val:>16}  {unit}")
    click.echo("IAPWS-IF97 (R7-97(2012)); transport: R12-08, R15-11; surface tension: R1-76(2014)")


from .cli_audit import audit  # noqa: E402  (registered after the group exists)

main.add_command(audit)

if __name__ == "__main__":  # pragma: no cover
    main()
