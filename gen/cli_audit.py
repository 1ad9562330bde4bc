"""The ``h2olut audit`` command: the true error and the defects of a table already shipped.

Register it on the main group with ``main.add_command(audit)``. Exit status: 0 when the table
is within the tolerance (or none was given), 1 when it is out of tolerance (the error over the
span, or where the firmware uses it beyond the span), 2 for bad input (one line, nothing
written).
"""

import shlex
import sys

import click

from .audit import ARITHMETICS, INT_DIVISIONS, INTERPOLATIONS, OUT_OF_RANGE


class AuditInputError(click.ClickException):
    """Bad input to an audit: one line, exit status 2."""
    exit_code = 2


def _given(ctx):
    """Options given on the command line (not left at their defaults), in declaration order."""
    from click.core import ParameterSource
    return [p for p in ctx.command.params
            if p.name != "table" and ctx.get_parameter_source(p.name) != ParameterSource.DEFAULT]


def _command_line(ctx, table):
    """The command that reruns this audit, from its parameters (the table by its file name)."""
    from pathlib import Path
    words = ["h2olut", "audit", Path(table).name]
    for p in _given(ctx):
        if p.name == "outdir":
            continue
        value = ctx.params[p.name]
        flag = p.opts[-1] if p.opts[-1].startswith("--") else p.opts[0]
        if p.is_flag:
            words.append(flag)
            continue
        for v in (value if p.multiple else [value]):
            words += [flag, f"{v:g}" if isinstance(v, float) else str(v)]
    return " ".join(shlex.quote(w) for w in words)


def _write(outdir, files):
    from .outputs import write_outputs
    try:
        write_outputs(outdir, files)
    except OSError as e:
        raise AuditInputError(f"{outdir}: cannot write the report ({e.strerror})") from None


def _generated(table, options_given):
    """Re-verify h2olut's own output from its report.json and Python module."""
    from .audit import AuditError, audit_generated
    if options_given:
        raise AuditInputError(f"{table}: a report.json brings its own table description; "
                              f"give no table options with it")
    try:
        results = audit_generated(table)
    except AuditError as e:
        raise AuditInputError(str(e)) from None
    bad = 0
    for r in results:
        if "skipped" in r:
            click.echo(f"{r['function']}: skipped, {r['skipped']}")
            continue
        at = ", ".join(f"{a!r}" for a in r["measured_at"])
        same = "same as reported" if r["same"] else (
            f"DIFFERS from the reported {r['reported']!r} at {r['reported_at']}")
        within = "within" if r["within"] else "OUT OF"
        click.echo(f"{r['function']}: max error {r['measured']!r} ({r['kind']}) at "
                   f"{at} on {r['points']} points, {same}; {within} "
                   f"tolerance {r['tolerance']:g}")
        bad += (not r["same"]) or (not r["within"])
    if bad:
        sys.exit(1)


def _sensor(fixed, of_reading, of_span, span):
    """The sensor described by the --sensor-* options, or None."""
    from .sensor import SensorError, parse_sensor
    d = {k: v for k, v in (("fixed", fixed), ("of_reading", of_reading), ("of_span", of_span))
         if v is not None}
    if span:
        d["span"] = list(span)
    if not d:
        return None
    try:
        return parse_sensor(d, "")
    except SensorError as e:
        import re
        m = re.match(r"key '([^']+)': (.*)", str(e))
        key, rest = (m.group(1), m.group(2)) if m else ("sensor", str(e))
        option = "--" + key.replace("sensor.", "sensor-").replace("_", "-")
        if option == "--sensor":
            option = "--sensor-*"
        raise AuditInputError(f"{option}: {rest}") from None


@click.command()
@click.argument("table", type=click.Path(dir_okay=False))
@click.option("--quantity", "-q", help="Quantity id of the output, e.g. saturation_temperature.")
@click.option("--input", "inputs", multiple=True,
              help="Input quantity (pressure, temperature); twice for a grid, first column's "
                   "input first.")
@click.option("--input-unit", "input_units", multiple=True,
              help="Unit of each input as pint spells it (bar, kPa, degC, ...); default SI.")
@click.option("--output-unit", help="Unit of the output column; default SI.")
@click.option("--atmosphere", help='Gauge pressure input: the atmospheric reference, e.g. '
                                   '"1.01325 bar".')
@click.option("--interpolation", type=click.Choice(INTERPOLATIONS), default="linear",
              show_default=True, help="How the firmware reads the table.")
@click.option("--arithmetic", type=click.Choice(ARITHMETICS), default="float32",
              show_default=True, help="Number format of the stored values and the arithmetic.")
@click.option("--scale-in", "scale_in", multiple=True, type=float,
              help="Integer tables: value = raw * scale of each input, in its unit.")
@click.option("--scale-out", type=float, help="Integer tables: value = raw * scale of the "
                                              "output, in its unit.")
@click.option("--int-division", type=click.Choice(INT_DIVISIONS), default="truncate",
              show_default=True, help="Integer tables: how the firmware divides.")
@click.option("--tolerance-abs", type=float, help="Tolerance in the output unit.")
@click.option("--tolerance-rel", type=float, help="Tolerance as a fraction of the value.")
@click.option("--used-min", type=float, help="Lowest input the firmware feeds the table.")
@click.option("--used-max", type=float, help="Highest input the firmware feeds the table.")
@click.option("--out-of-range", type=click.Choice(OUT_OF_RANGE), default="clamp",
              show_default=True, help="What the firmware does beyond the table's span.")
@click.option("--points", type=int, default=100_000, show_default=True,
              help="Verification points.")
@click.option("--no-replacement", is_flag=True,
              help="Skip building the table h2olut would generate instead.")
@click.option("--sensor-fixed", type=float, help="Sensor uncertainty: fixed part, in the input "
                                                 "unit (1-D tables).")
@click.option("--sensor-of-reading", type=float, help="Sensor uncertainty: fraction of the "
                                                      "reading (0.002 for 0.2 %).")
@click.option("--sensor-of-span", type=float, help="Sensor uncertainty: fraction of the span "
                                                   "given by --sensor-span.")
@click.option("--sensor-span", type=float, nargs=2, help="The sensor's span MIN MAX, input unit.")
@click.option("--out", "outdir", type=click.Path(file_okay=False),
              help="Folder for report.json, report.md and the error plot (default: print only).")
def audit(table, quantity, inputs, input_units, output_unit, atmosphere, interpolation,
          arithmetic, scale_in, scale_out, int_division, tolerance_abs, tolerance_rel, used_min,
          used_max, out_of_range, points, no_replacement, sensor_fixed, sensor_of_reading,
          sensor_of_span, sensor_span, outdir):
    """Measure the true error of TABLE (CSV) against the IF97 core, in the firmware's arithmetic.

    \b
    One input: two columns, input and output (a header row allowed).
    Two inputs: a grid; first row = second input's values, first column = first input's.
    Names defects by row (a value in the wrong unit, a typo, a non-monotone pair, a range
    that stops short of --used-min/--used-max) and says what h2olut would generate instead.

    \b
    Examples:
      h2olut audit tsat.csv -q saturation_temperature --input-unit bar --output-unit degC \\
          --tolerance-abs 0.1 --used-max 20 --out audit/
      h2olut audit rho.csv -q density --input pressure --input temperature \\
          --input-unit bar --input-unit degC --output-unit kg/m^3 --interpolation bilinear
      h2olut audit out/report.json      (re-verify h2olut's own output)

    Exit 1 when a given tolerance is exceeded, 2 for bad input. Not for safety functions.
    """
    from .audit import AuditError, audit_file, audit_files, audit_spec, summary_lines, verdict_line
    ctx = click.get_current_context()
    if str(table).endswith(".json"):
        _generated(table, [p.name for p in _given(ctx) if p.name != "outdir"])
        return
    if quantity is None:
        raise AuditInputError("--quantity: give the quantity the table holds, e.g. "
                              "saturation_temperature")
    try:
        spec = audit_spec(quantity, inputs, input_units, output_unit, interpolation,
                          arithmetic, scale_in, scale_out, int_division, tolerance_abs,
                          tolerance_rel, used_min, used_max, out_of_range, points, atmosphere,
                          suggest=not no_replacement,
                          command=_command_line(ctx, table))
        result = audit_file(table, spec)
        sensor = _sensor(sensor_fixed, sensor_of_reading, sensor_of_span, sensor_span)
        if sensor is not None:
            result.add_sensor(sensor)
        files = audit_files(result) if outdir else None
    except AuditError as e:
        raise AuditInputError(str(e)) from None
    for line in summary_lines(result):
        click.echo(line)
    for d in result.findings:
        click.echo(f"  defect ({d['kind'].replace('_', ' ')}): {d['text']}")
    if not result.findings:
        click.echo("  no defects found")
    for n in result.notes:
        click.echo(f"  note: {n}")
    if result.replacement:
        click.echo(f"  replacement: {result.replacement['line']}")
    click.echo(verdict_line(result))
    if files:
        _write(outdir, files)
        click.echo(f"wrote {len(files)} files to {outdir}")
    if result.within is False:
        sys.exit(1)
