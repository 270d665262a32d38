"""``partpick verify``: the steady-state waveforms and losses of a chosen set of parts."""

from __future__ import annotations

import math
from enum import StrEnum
from pathlib import Path
from typing import Annotated

import typer

from partpick.cli.common import EXIT_STRICT_REJECTS, DbOption, echo_data, friendly_errors
from partpick.cli.spec_options import with_spec_options
from partpick.design.spec import Spec
from partpick.errors import ParameterError, UnitError
from partpick.render.console import make_console
from partpick.render.exports import json_text
from partpick.units import parse_quantity
from partpick.verify.stage import LOSS_PARAMETERS, PARAMETERS  # light: no scipy yet

PARTS_PANEL = "Parts (name each, or give --bom)"
OVERRIDES_PANEL = "Overrides of catalog figures"
POINTS_PANEL = "Operating points"


class VerifyFormat(StrEnum):
    """Output forms of ``partpick verify``."""

    table = "table"
    json = "json"


def _part(flag: str, what: str):
    return Annotated[
        str | None,
        typer.Option(
            flag, metavar="MPN", help=f"Part number of the {what}.", rich_help_panel=PARTS_PANEL
        ),
    ]


def _override(flag: str, example: str, what: str):
    return Annotated[
        str | None,
        typer.Option(
            flag,
            help=f'{what}, overriding the catalog (e.g. {flag} "{example}").',
            rich_help_panel=OVERRIDES_PANEL,
            show_default=False,
        ),
    ]


_EXAMPLES = {p.option: p.example for p in PARAMETERS + LOSS_PARAMETERS}
_OVERRIDE_FIELDS = {p.option: (p.field, p.unit) for p in PARAMETERS + LOSS_PARAMETERS}


def _quantity(text: str, unit: str, option: str) -> float:
    """Return ``text`` parsed in ``unit``; a bad value is an error naming ``option``."""
    try:
        value = parse_quantity(text, unit)
    except UnitError as exc:
        raise ParameterError(option, f"cannot be read: {exc}") from None
    if not math.isfinite(value):
        raise ParameterError(option, "must be a finite number", value=text)
    return value


def _override_value(flag: str, text: str) -> float:
    """Return an override in SI, refused outside its field's plausibility range."""
    import numpy as np

    from partpick.ranges import outside_field_range, unusual_field_value

    field, unit = _OVERRIDE_FIELDS[flag]
    value = _quantity(text, unit, flag)
    if outside_field_range(field, np.array([value]))[0]:
        sentence = unusual_field_value(field, value, unit).sentence()
        raise ParameterError(flag, f"is implausible: {sentence}", value=text)
    return value


def register(app: typer.Typer) -> None:
    """Add the ``verify`` command to ``app``."""
    app.command("verify")(verify_command)


@friendly_errors
@with_spec_options
def verify_command(
    spec: Spec,
    inductor: _part("--inductor", "inductor") = None,
    output_cap: _part("--output-cap", "output capacitor") = None,
    output_count: Annotated[
        int | None,
        typer.Option(
            "--output-count",
            min=1,
            help="Output capacitors in parallel (default 1, or the BOM's).",
            rich_help_panel=PARTS_PANEL,
        ),
    ] = None,
    diode: _part("--diode", "rectifier diode") = None,
    switch: _part("--switch", "low-side MOSFET") = None,
    bom: Annotated[
        Path | None,
        typer.Option(
            "--bom",
            metavar="BOM.json",
            help="Take every part from a BOM saved by partpick bom --format json.",
            rich_help_panel=PARTS_PANEL,
            dir_okay=False,
        ),
    ] = None,
    profile: Annotated[
        str | None,
        typer.Option(
            "--profile",
            help="Derating profile for the hot factor and effective capacitance "
            "(default: the BOM's, else standard).",
        ),
    ] = None,
    vin: Annotated[
        list[str] | None,
        typer.Option(
            "--vin", help="Add an input voltage (repeatable).", rich_help_panel=POINTS_PANEL
        ),
    ] = None,
    load: Annotated[
        list[str] | None,
        typer.Option(
            "--load", help="Add a load current (repeatable).", rich_help_panel=POINTS_PANEL
        ),
    ] = None,
    duty: Annotated[
        str | None,
        typer.Option(
            "--duty",
            help="Run open loop at this duty instead of regulating vout.",
            rich_help_panel=POINTS_PANEL,
        ),
    ] = None,
    inductance: _override("--inductance", _EXAMPLES["--inductance"], "Inductance") = None,
    dcr: _override("--dcr", _EXAMPLES["--dcr"], "Inductor DC resistance") = None,
    capacitance: _override(
        "--capacitance", _EXAMPLES["--capacitance"], "Nominal capacitance of one output capacitor"
    ) = None,
    esr: _override("--esr", _EXAMPLES["--esr"], "ESR of one output capacitor") = None,
    rds_on: _override("--rds-on", _EXAMPLES["--rds-on"], "Switch Rds(on) at 25 °C") = None,
    qgd: _override("--qgd", _EXAMPLES["--qgd"], "Switch gate-drain charge") = None,
    coss: _override("--coss", _EXAMPLES["--coss"], "Switch output capacitance") = None,
    vf: _override("--vf", _EXAMPLES["--vf"], "Diode forward drop") = None,
    rd: _override("--rd", _EXAMPLES["--rd"], "Diode series resistance") = None,
    qrr: _override("--qrr", _EXAMPLES["--qrr"], "Diode reverse recovery charge") = None,
    qg: _override("--qg", _EXAMPLES["--qg"], "Switch total gate charge") = None,
    cj: _override("--cj", _EXAMPLES["--cj"], "Diode junction capacitance") = None,
    strict: Annotated[
        bool,
        typer.Option("--strict", help="Exit 1 when any rating is violated at any point."),
    ] = False,
    output_format: Annotated[
        VerifyFormat,
        typer.Option("--format", help="table for people, json (SI units) for scripts."),
    ] = VerifyFormat.table,
    plot: Annotated[
        Path | None,
        typer.Option(
            "--plot",
            metavar="FILE",
            help="Also draw the waveforms and efficiency curves (.png or .svg).",
            dir_okay=False,
        ),
    ] = None,
    db: DbOption = None,
) -> None:
    """Solve the exact steady state of the chosen parts at each operating point.

    Example: partpick verify catalogs/scenarios/field-logger.toml --inductor HCW-PR1265-150M
    --output-cap OPC-1210S-106M50 --output-count 3 --diode TS-ZK40-3A0B --switch TS-QN40-8Q
    --plot stage.png
    """
    if plot is not None:  # checked before the solve, not after it
        from partpick.outputs import resolve_output
        from partpick.render.plot import plot_format  # matplotlib only when a plot is asked for

        plot_format(plot)
        resolve_output(plot, "--plot")
    given = {
        "--inductance": inductance,
        "--dcr": dcr,
        "--capacitance": capacitance,
        "--esr": esr,
        "--rds-on": rds_on,
        "--qgd": qgd,
        "--coss": coss,
        "--vf": vf,
        "--rd": rd,
        "--qrr": qrr,
        "--qg": qg,
        "--cj": cj,
    }
    overrides = {
        _OVERRIDE_FIELDS[flag][0]: _override_value(flag, text)
        for flag, text in given.items()
        if text is not None
    }
    from partpick.render.verify import render_verify
    from partpick.verify.parts import verify_selection

    result = verify_selection(
        spec,
        db=db,
        mpns={"inductor": inductor, "output-cap": output_cap, "diode": diode, "switch": switch},
        bom_file=bom,
        output_count=output_count,
        profile_name=profile,
        overrides=overrides,
        extra_vin_v=[_quantity(v, "V", "--vin") for v in vin or ()],
        extra_iout_a=[_quantity(i, "A", "--load") for i in load or ()],
        duty=_quantity(duty, "fraction", "--duty") if duty is not None else None,
    )
    if plot is not None:
        from partpick.render.plot import save_plot

        save_plot(plot, result)
        typer.echo(f"wrote {plot}", err=True)
    if output_format is VerifyFormat.json:
        echo_data(json_text(result.to_dict()), nl=False)
    else:
        render_verify(result, make_console())
    if strict and result.violations:
        raise typer.Exit(EXIT_STRICT_REJECTS)
