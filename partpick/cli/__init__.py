"""The ``partpick`` command: one typer app; each command group lives in its own module.

A command parses its options, calls one core function, hands the result to a renderer, and
lets :func:`partpick.cli.common.friendly_errors` turn a :class:`~partpick.errors.PartpickError`
into one line on stderr and its exit code.
"""

from __future__ import annotations

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


def main() -> None:
    """Entry point of the ``partpick`` console script."""
    app()
