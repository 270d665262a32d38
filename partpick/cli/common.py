"""What every command shares: the error mapping, the ``--db`` option and the format choice."""

from __future__ import annotations

import functools
from collections.abc import Callable
from enum import StrEnum
from typing import Annotated, Any, TypeVar

import typer

from partpick.errors import ImportInterrupted, PartpickError
from partpick.render.safe_text import plain_text

F = TypeVar("F", bound=Callable[..., Any])

EXIT_OK = 0
EXIT_STRICT_REJECTS = 1
EXIT_BAD_INPUT = 2
EXIT_NO_PART = 3
EXIT_INTERRUPTED = 130

DbOption = Annotated[
    str | None,
    typer.Option(
        "--db",
        help="Catalog database: a path or an SQLAlchemy URL. "
        "Default: $PARTPICK_DB, else ./partpick.db.",
        show_default=False,
    ),
]


def echo_data(text: str, nl: bool = True) -> None:
    """Print machine-readable output (CSV, JSON, Markdown): exactly as it is into a pipe or
    file (``typer.echo`` would strip escape sequences there, changing the data), with control
    characters made visible on a terminal, where they would act as commands."""
    import sys

    if sys.stdout.isatty():
        typer.echo(plain_text(text), nl=nl)
        return
    sys.stdout.write(text + ("\n" if nl else ""))
    sys.stdout.flush()


def friendly_errors(command: F) -> F:
    """Wrap a command so a PartpickError prints one line on stderr and exits with its code."""

    @functools.wraps(command)
    def wrapper(*args: Any, **kwargs: Any) -> Any:
        try:
            return command(*args, **kwargs)
        except PartpickError as exc:  # its text may quote a file's bytes: no escapes
            typer.echo(f"error: {plain_text(exc)}", err=True)
            raise typer.Exit(exc.exit_code) from None
        except ImportInterrupted as exc:
            typer.echo(f"error: {exc}", err=True)
            raise typer.Exit(EXIT_INTERRUPTED) from None
        except KeyboardInterrupt:
            typer.echo("interrupted; nothing was changed", err=True)
            raise typer.Exit(EXIT_INTERRUPTED) from None

    return wrapper  # type: ignore[return-value]


class Rank(StrEnum):
    """What the passes of a role are ranked by (ties by cost, then mpn)."""

    loss = "loss"
    cost = "cost"
    size = "size"


AllowUnusualOption = Annotated[
    bool,
    typer.Option(
        "--allow-unusual",
        help="Accept values outside the plausibility ranges (with a warning) "
        "instead of refusing them.",
    ),
]
ProfileOption = Annotated[
    str,
    typer.Option(
        "--profile", help="Derating profile: standard, high-rel, or a TOML file extending one."
    ),
]
RankOption = Annotated[Rank, typer.Option("--rank", help="Rank passes by loss, cost or size.")]
MaxParallelOption = Annotated[
    int | None,
    typer.Option(
        "--max-parallel",
        min=1,
        help="Most identical capacitors in parallel (default: the profile's max_parallel).",
        show_default=False,
    ),
]
BriefOption = Annotated[
    bool,
    typer.Option("--brief", help="Shortest view: no operating point, policy or alternates."),
]
VerboseOption = Annotated[
    bool,
    typer.Option("--verbose", help="Show everything: the full operating point, policy and notes."),
]


def detail_level(brief: bool, verbose: bool) -> str:
    """Return "brief", "normal" or "verbose"; both flags at once is bad input."""
    if brief and verbose:
        raise typer.BadParameter("--brief and --verbose exclude each other")
    return "brief" if brief else "verbose" if verbose else "normal"
