"""``partpick pick``: check every catalog part for one role and rank the ones that pass.

The screening core and the renderer are imported inside the command, so starting the CLI
costs neither; the pick path itself needs only numpy (no pandas, no SQLAlchemy) on an SQLite
catalog.
"""

from __future__ import annotations

import sys
from enum import StrEnum
from typing import Annotated

import typer

from partpick.cli.common import (
    BriefOption,
    DbOption,
    MaxParallelOption,
    ProfileOption,
    Rank,
    RankOption,
    VerboseOption,
    detail_level,
    echo_data,
    friendly_errors,
)
from partpick.cli.spec_options import with_spec_options
from partpick.design.spec import Spec
from partpick.screening.roles import ROLES

TABLE_TOP_DEFAULT = 10
"""Parts per list in the table view when --top is not given (JSON lists every part)."""


class PickFormat(StrEnum):
    """Output forms of ``partpick pick``."""

    table = "table"
    json = "json"
    jsonl = "jsonl"


RoleOption = Annotated[
    str,
    typer.Option("--role", help=f"Role to fill: {', '.join(ROLES)}.", show_default=False),
]
TopOption = Annotated[
    int | None,
    typer.Option(
        "--top",
        min=1,
        help=f"Parts per list (default: {TABLE_TOP_DEFAULT} in the table, all in JSON).",
        show_default=False,
    ),
]
FormatOption = Annotated[
    PickFormat,
    typer.Option(
        "--format",
        help="table for people; json (one object, SI units) or jsonl (one part per line) "
        "for scripts.",
    ),
]
MessagesOption = Annotated[
    bool,
    typer.Option(
        "--messages",
        help="In json/jsonl, add the sentence of each failing check to its figures.",
    ),
]
ExplainOption = Annotated[
    list[str] | None,
    typer.Option(
        "--explain",
        help="Show every check of this part (by mpn); repeat it to compare parts side by side.",
        metavar="MPN",
    ),
]


def register(app: typer.Typer) -> None:
    """Add the ``pick`` command to ``app``."""
    app.command("pick")(pick_command)


@friendly_errors
@with_spec_options
def pick_command(
    spec: Spec,
    role: RoleOption,
    profile: ProfileOption = "standard",
    rank: RankOption = Rank.loss,
    top: TopOption = None,
    max_parallel: MaxParallelOption = None,
    output_format: FormatOption = PickFormat.table,
    explain_mpn: ExplainOption = None,
    messages: MessagesOption = False,
    brief: BriefOption = False,
    verbose: VerboseOption = False,
    db: DbOption = None,
) -> None:
    """Check every catalog part for one role against the design's stresses and rank the passes.

    Example: partpick pick catalogs/scenarios/field-logger.toml --role inductor --rank cost --top 5
    """
    from partpick.render.console import make_console
    from partpick.screening.pick import explain, pick, rank_role, role_rules
    from partpick.screening.profiles import load_profile

    role_rules(role)  # an unknown role is bad input before any work is done
    policy = load_profile(profile)
    parallel = max_parallel if max_parallel is not None else policy.max_parallel
    detail = detail_level(brief, verbose)
    if explain_mpn:
        found = [
            explain(db, spec, role, mpn, profile=policy, max_parallel=parallel)
            for mpn in dict.fromkeys(explain_mpn)
        ]
        _show_explanation(found, output_format, make_console)
        return
    if output_format is not PickFormat.table:
        ranked = rank_role(
            db, spec, role, profile=policy, rank=rank.value, max_parallel=parallel, top=top
        )
        _write_stream(ranked, output_format, messages)
        return
    shown = top if top is not None else TABLE_TOP_DEFAULT
    result = pick(db, spec, role, profile=policy, rank=rank.value, max_parallel=parallel, top=shown)
    from partpick.render.pick import render_pick

    render_pick(result, make_console(), near_misses=shown, detail=detail)


def _write_stream(ranked, output_format: PickFormat, messages: bool) -> None:
    """Write every listed part to stdout as it is converted (no whole document in memory)."""
    from partpick.render.pick_stream import write_pick_json, write_pick_jsonl

    sys.stdout.flush()
    out = sys.stdout.buffer
    write = write_pick_json if output_format is PickFormat.json else write_pick_jsonl
    write(ranked, out, messages=messages)
    out.flush()


def _show_explanation(found, output_format: PickFormat, make_console) -> None:
    from partpick.render.explain import explanations_json, render_explanations
    from partpick.render.exports import json_text

    if output_format is not PickFormat.table:
        echo_data(json_text(explanations_json(found)), nl=False)
    else:
        render_explanations(found, make_console())
