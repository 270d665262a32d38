"""The shared console and the named styles every terminal renderer uses."""

from __future__ import annotations

import sys

from partpick.render.safe_text import SafeConsole

STYLE_PASS = "green"
STYLE_FAIL = "red"
STYLE_UNVERIFIED = "yellow"
STYLE_CAUTION = "bold yellow"
STYLE_HEADING = "bold"
STYLE_MUTED = "dim"


def make_console(file=None, width: int | None = None) -> SafeConsole:
    """Return a console on ``file`` (stdout by default); plain text when not a terminal.

    It never prints a control character from the data (see :mod:`partpick.render.safe_text`).
    """
    target = file if file is not None else sys.stdout
    return SafeConsole(file=target, width=width, highlight=False, soft_wrap=False)
