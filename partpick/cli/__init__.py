"""The ``partpick`` command: one typer app; each command group lives in its own module.

A command parses its options, calls one core function, hands the result to a renderer, and
lets :func:`partpick.cli.common.friendly_errors` turn a :class:`~partpick.errors.PartpickError`
into one line on stderr and its exit code.
"""

from __future__ import annotations

import os
import sys
from typing import NoReturn

import typer

from partpick.cli import bom, catalog, design, selection, verify

app = typer.Typer(
    name="partpick",
    help="Check catalog parts against a DC-DC boost design and shortlist a bill of materials.",
    no_args_is_help=True,
    add_completion=False,
    pretty_exceptions_enable=False,
)

for _module in (catalog, design, selection, bom, verify):
    _module.register(app)


def _show_version(value: bool) -> None:
    if value:
        from partpick import __version__

        typer.echo(f"partpick {__version__}")
        raise typer.Exit()


@app.callback()
def _root(
    version: bool = typer.Option(
        False, "--version", callback=_show_version, is_eager=True, help="Show the version."
    ),
) -> None:
    """Check catalog parts against a DC-DC boost design and shortlist a bill of materials."""


def main() -> NoReturn:
    """Entry point of the ``partpick`` console script: run the command, then end the process."""
    try:
        app()
    except SystemExit as exc:
        end_process(exc.code)
    end_process(0)


def end_process(code: int | str | None) -> NoReturn:
    """End the process with ``code`` once the command is done, skipping interpreter teardown.

    Every file partpick writes is closed and renamed into place before its command returns,
    so what is left is freeing modules and objects one by one: 0.1–0.2 s after an import of
    100,000 rows, which the user would wait for. Catalog connections are closed first (an
    SQLite writer checkpoints its WAL on close) and standard output is flushed; a reader that
    has gone away (``partpick parts … | head``) is no error.
    """
    if isinstance(code, str):  # SystemExit("message"): Python prints it and exits 1
        print(code, file=sys.stderr)
        code = 1
    store = sys.modules.get("partpick.catalog.store")
    if store is not None:
        store.dispose_engines()
    for stream in (sys.stdout, sys.stderr):
        try:
            stream.flush()
        except (OSError, ValueError):  # a closed pipe or stream: nothing more can be said
            pass
    os._exit(code or 0)
