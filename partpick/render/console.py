"""The shared console and the named styles every terminal renderer uses."""

from __future__ import annotations

import sys

from rich.console import Console

STYLE_PASS = "green"
STYLE_FAIL = "red"
STYLE_UNVERIFIED = "yellow"
STYLE_CAUTION = "bold yellow"
STYLE_HEADING = "bold"
STYLE_MUTED = "dim"


def make_console(file=None, width: int | None = None) -> Console:
    """Return a console on ``file`` (stdout by default); plain text when not a terminal."""
    target = file if file is not None else sys.stdout
    return Console(file=target, width=width, highlight=False, soft_wrap=False)
