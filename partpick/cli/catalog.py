"""Catalog commands: ``import`` CSV files, browse ``parts``, list import ``batches``.

The catalog core is imported inside each command: it pulls in pandas and SQLAlchemy, and
every other command (``pick`` above all) should not pay for them at start-up.
"""

from __future__ import annotations

from enum import StrEnum
from pathlib import Path
from typing import Annotated

import typer

from partpick.cli.common import AllowUnusualOption, DbOption, echo_data, friendly_errors
from partpick.errors import ImportInterrupted, StrictImportError
from partpick.outputs import resolve_output
from partpick.render.catalog import (
    fields_json,
    import_json,
    import_progress,
    parts_csv,
    parts_json,
    render_batches,
    render_fields_table,
    render_import_reports,
    render_parts_table,
    write_rejects_csv,
)
from partpick.render.console import make_console


class ImportFormat(StrEnum):
    table = "table"
    json = "json"


class PartsFormat(StrEnum):
    table = "table"
    csv = "csv"
    json = "json"


KindOption = Annotated[
    str | None,
    typer.Option("--kind", help="Part kind: inductor, capacitor, diode or mosfet."),
]


@friendly_errors
def import_command(
    files: Annotated[list[Path], typer.Argument(help="CSV files to import.", show_default=False)],
    kind: KindOption = None,
    map_file: Annotated[
        Path | None, typer.Option("--map", help="Map file (TOML) describing the CSV layout.")
    ] = None,
    rejects: Annotated[
        Path | None, typer.Option("--rejects", help="Write rejected rows to this CSV file.")
    ] = None,
    strict: Annotated[
        bool, typer.Option("--strict", help="Import nothing if any row is rejected (exit 1).")
    ] = False,
    output: Annotated[
        ImportFormat,
        typer.Option(
            "--format",
            help="table, or json: per file the header map, unread headers with hints, "
            "missing fields with the rules they cost, and the counts.",
        ),
    ] = ImportFormat.table,
    allow_unusual: AllowUnusualOption = False,
    db: DbOption = None,
) -> None:
    """Import CSV catalog files; every file of one call goes in one transaction."""
    from partpick.catalog.importer import import_catalog  # pandas and SQLAlchemy: load late
    from partpick.screening.coverage import coverage_gaps

    if rejects is not None:  # a bad rejects path is refused before anything is imported
        resolve_output(rejects, "--rejects")
    console = make_console()
    total = sum(p.stat().st_size for p in files if p.is_file())

    def save_rejects(reports) -> None:  # inside the transaction: a failure stores nothing
        if rejects is not None:
            write_rejects_csv(rejects, [r for report in reports for r in report.rejects])

    try:
        with import_progress(console, total) as hook:
            reports = import_catalog(
                db, files, kind, map_file=map_file, strict=strict, progress=hook,
                before_commit=save_rejects, allow_unusual=allow_unusual,
            )  # fmt: skip
    except StrictImportError as exc:
        if rejects is not None:
            write_rejects_csv(rejects, exc.rejects)
            typer.echo(f"wrote {rejects}", err=True)
        raise
    try:
        gaps = [coverage_gaps(r.kind, r.fields_present, r.inferred) for r in reports]
        if output is ImportFormat.json:
            echo_data(import_json(reports, gaps))
        else:
            render_import_reports(console, reports, gaps=gaps)
        if rejects is not None:
            typer.echo(f"wrote {rejects}", err=True)
    except KeyboardInterrupt:
        raise ImportInterrupted(committed=True) from None


@friendly_errors
def parts_command(
    kind: Annotated[
        str, typer.Option("--kind", help="Part kind: inductor, capacitor, diode or mosfet.")
    ],
    where: Annotated[
        list[str] | None,
        typer.Option(
            "--where",
            help='Condition FIELD OP VALUE, such as "isat_a>=3A" or "dielectric=x7r"; repeatable.',
        ),
    ] = None,
    output: Annotated[
        PartsFormat,
        typer.Option(
            "--format", help="table, csv or json (SI values; json adds each part's source)."
        ),
    ] = PartsFormat.table,
    db: DbOption = None,
) -> None:
    """List catalog parts of one kind, optionally filtered."""
    from partpick.catalog.query import list_parts

    json_out = output is PartsFormat.json
    parts = list_parts(db, kind, where or (), provenance=json_out)
    if json_out:
        echo_data(parts_json(parts))
    elif output is PartsFormat.csv:
        echo_data(parts_csv(kind, parts), nl=False)
    else:
        render_parts_table(make_console(), kind, parts)


@friendly_errors
def batches_command(db: DbOption = None) -> None:
    """List the import batches: file, hash, time and counts."""
    from partpick.catalog.store import list_batches

    render_batches(make_console(), list_batches(db))


@friendly_errors
def fields_command(
    kind: KindOption = None,
    output: Annotated[
        ImportFormat, typer.Option("--format", help="table or json.")
    ] = ImportFormat.table,
) -> None:
    """List the data dictionary: each field's unit, the rules that use it, its header wordings."""
    from partpick.errors import NotFoundError
    from partpick.fields import KINDS
    from partpick.screening.coverage import field_entries

    if kind is not None and kind not in KINDS:
        raise NotFoundError("part kind", kind, f"Choose one of {', '.join(KINDS)}.")
    entries = field_entries(kind)
    if output is ImportFormat.json:
        typer.echo(fields_json(entries))
    else:
        render_fields_table(make_console(), entries)


def register(app: typer.Typer) -> None:
    """Add the catalog commands to ``app``."""
    app.command("import")(import_command)
    app.command("fields")(fields_command)
    app.command("parts")(parts_command)
    app.command("batches")(batches_command)
