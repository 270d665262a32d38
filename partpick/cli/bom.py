"""``partpick bom``: one consistent set of parts for the whole stage, with derating notes."""

from __future__ import annotations

import io
from enum import StrEnum
from pathlib import Path
from typing import Annotated

import typer

from partpick.cli.common import (
    EXIT_NO_PART,
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


class BomFormat(StrEnum):
    """Output forms of ``partpick bom``."""

    table = "table"
    csv = "csv"
    md = "md"
    json = "json"


def register(app: typer.Typer) -> None:
    """Add the ``bom`` command to ``app``."""
    app.command("bom")(bom_command)


@friendly_errors
@with_spec_options
def bom_command(
    spec: Spec,
    profile: ProfileOption = "standard",
    rank: RankOption = Rank.loss,
    alternates: Annotated[
        int, typer.Option("--alternates", min=0, max=10, help="Passed alternates listed per role.")
    ] = 2,
    max_parallel: MaxParallelOption = None,
    output_format: Annotated[
        BomFormat,
        typer.Option("--format", help="table (terminal), md (review report), csv or json."),
    ] = BomFormat.table,
    output: Annotated[
        Path | None,
        typer.Option(
            "--output",
            help="Write to this file (atomically) instead of the terminal.",
            dir_okay=False,
        ),
    ] = None,
    verify: Annotated[
        bool,
        typer.Option(
            "--verify/--no-verify", help="Add the steady-state verification of the chosen set."
        ),
    ] = True,
    build_qty: Annotated[
        int,
        typer.Option(
            "--build-qty",
            min=1,
            metavar="N",
            help="Boards to build: each line gets its order quantity and price for N boards.",
        ),
    ] = 1,
    brief: BriefOption = False,
    verbose: VerboseOption = False,
    db: DbOption = None,
) -> None:
    """Choose one part per role, estimate the losses of that set, and print the BOM.

    Exits 3 when some role has no part at all, after printing what came closest.

    Example: partpick bom catalogs/scenarios/field-logger.toml --format md --output review.md
    """
    from partpick.bom import build_bom
    from partpick.outputs import check_own_file, report_plot_path, resolve_output
    from partpick.render import bom_report
    from partpick.render.exports import write_atomically
    from partpick.screening.profiles import load_profile

    plot_path = None
    if output is not None:  # every path is checked before any work is done
        resolve_output(output, "--output")
        if output_format is BomFormat.md and verify:
            plot_path = report_plot_path(output)
            resolve_output(plot_path, "--output (its plot)")
            check_own_file(plot_path, "--output (its plot)")
    detail = detail_level(brief, verbose)
    policy = load_profile(profile)
    bom = build_bom(
        db,
        spec,
        profile=policy,
        rank=rank.value,
        alternates=alternates,
        max_parallel=max_parallel if max_parallel is not None else policy.max_parallel,
        verify=verify,
        build_qty=build_qty,
    )
    written: list[Path] = []
    plot_name = None
    if plot_path is not None and bom.verification is not None:
        plot_name = _write_plot(bom, plot_path)
        written.append(plot_path)
    if output is None:
        if output_format is BomFormat.table:
            from partpick.render.bom import render_bom_table
            from partpick.render.console import make_console

            render_bom_table(bom, make_console(), detail)
        else:
            echo_data(_rendered(bom, output_format, plot_name, bom_report, detail), nl=False)
    else:
        write_atomically(output, _rendered(bom, output_format, plot_name, bom_report, detail))
        written.insert(0, output)
    if written:
        typer.echo(f"wrote {' and '.join(str(path) for path in written)}", err=True)
    if not bom.complete:
        raise typer.Exit(EXIT_NO_PART)


def _rendered(bom, output_format: BomFormat, plot_name: str | None, report, detail: str) -> str:
    if output_format is BomFormat.json:
        return report.bom_json(bom)
    if output_format is BomFormat.csv:
        return report.bom_csv(bom)
    if output_format is BomFormat.md:
        return report.bom_markdown(bom, plot_name)
    from partpick.render.bom import render_bom_table
    from partpick.render.console import make_console

    buffer = io.StringIO()
    render_bom_table(bom, make_console(file=buffer, width=120), detail)
    return buffer.getvalue()


def _write_plot(bom, path: Path) -> str:
    """Write the verification plot beside the report; return its name for the Markdown link."""
    from urllib.parse import quote

    from partpick.render.plot import save_plot

    save_plot(path, bom.verification, "--output (its plot)")
    return quote(path.name)  # a space or bracket in the name must not break the link
