"""``partpick stress``: the worst-case stresses every part of a design must survive."""

from __future__ import annotations

from enum import StrEnum
from typing import Annotated

import typer

from partpick.cli.common import echo_data, friendly_errors
from partpick.cli.spec_options import with_spec_options
from partpick.design.spec import Spec
from partpick.design.topologies import analyse
from partpick.render.console import make_console
from partpick.render.exports import json_text
from partpick.render.stress import render_stress


class StressFormat(StrEnum):
    """Output forms of ``partpick stress``."""

    table = "table"
    json = "json"


FormatOption = Annotated[
    StressFormat,
    typer.Option("--format", help="table for people, json (one object, SI units) for scripts."),
]


def register(app: typer.Typer) -> None:
    """Add the ``stress`` command to ``app``."""
    app.command("stress")(stress_command)


@friendly_errors
@with_spec_options
def stress_command(spec: Spec, output_format: FormatOption = StressFormat.table) -> None:
    """Show the worst-case stresses of a design over its input range (SPEC.toml and/or options).

    Example: partpick stress catalogs/scenarios/field-logger.toml --vin-min 5.5 --format json
    """
    envelope = analyse(spec)
    if output_format is StressFormat.json:
        echo_data(json_text(envelope.to_dict()), nl=False)
        return
    render_stress(envelope, make_console())
