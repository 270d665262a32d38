"""Catalog and spec text is data, never markup: make it safe for the terminal and Markdown.

A distributor export, a vendor file or a spec's ``name`` can hold anything: rich markup
(``[/]``, ``[link=…]``), terminal escape sequences (``ESC [2J`` clears the screen), HTML
(``<img src=x onerror=…>``) or Markdown (``# heading``, ``|`` that splits a table cell).

* :func:`plain_text` replaces every control character but newline and tab with a visible
  stand-in of the same length: C0 codes and DEL by their Unicode control pictures (ESC
  shows as ␛), C1 codes and the bidirectional overrides (which can reorder what a reader
  sees) by U+FFFD. Keeping the length keeps the styled spans of a rich ``Text`` in place.
* :class:`Table` is rich's table, except that a ``str`` cell, title or caption is plain
  text (never parsed as markup) and every cell goes through :func:`plain_text`.
* :class:`SafeConsole` runs :func:`plain_text` over every segment it prints, so nothing a
  renderer forgot can reach the terminal as an escape sequence.
* :func:`markdown_text` escapes text for a Markdown/HTML report: HTML special characters
  become entities, Markdown punctuation is backslash-escaped and line breaks become spaces.
"""

from __future__ import annotations

import html
import re

from rich.console import Console
from rich.segment import Segment
from rich.table import Table as RichTable
from rich.text import Text

_PICTURES = {code: 0x2400 + code for code in range(0x20) if code not in (0x09, 0x0A)}
_PICTURES[0x7F] = 0x2421
_REPLACED = {code: 0xFFFD for code in range(0x80, 0xA0)}
_BIDI = (*range(0x202A, 0x202F), *range(0x2066, 0x206A), 0x200E, 0x200F, 0x061C)
_REPLACED.update({code: 0xFFFD for code in _BIDI})
_TRANSLATION = {**_PICTURES, **_REPLACED}
_UNSAFE_RE = re.compile("[" + "".join(re.escape(chr(c)) for c in _TRANSLATION) + "]")


def has_control(text: str) -> bool:
    """Return True if ``text`` holds a character :func:`plain_text` would replace."""
    return _UNSAFE_RE.search(text) is not None


def plain_text(value: object) -> str:
    """Return ``value`` as text with its control characters made visible (same length)."""
    text = "" if value is None else str(value)
    return text.translate(_TRANSLATION) if has_control(text) else text


def safe_renderable(value: object) -> object:
    """Return a table cell: text as a plain rich ``Text``, other renderables sanitised."""
    if isinstance(value, Text):
        if has_control(value.plain):
            value = value.copy()
            value.plain = plain_text(value.plain)
        return value
    if isinstance(value, str):
        return Text(plain_text(value))
    return value


class Table(RichTable):
    """A rich table whose text cells, title and caption are plain text, never markup."""

    def __init__(self, *headers, title=None, caption=None, **options) -> None:
        super().__init__(
            *(safe_renderable(h) if isinstance(h, str) else h for h in headers),
            title=safe_renderable(title) if title is not None else None,
            caption=safe_renderable(caption) if caption is not None else None,
            **options,
        )

    def add_row(self, *renderables, **options) -> None:
        """Add a row; ``str`` cells are shown as they are, markup and all."""
        super().add_row(*(safe_renderable(r) for r in renderables), **options)


class SafeConsole(Console):
    """A console that never emits a control character it did not make itself."""

    def render(self, renderable, options=None):
        for segment in super().render(renderable, options):
            if segment.control or not has_control(segment.text):
                yield segment
            else:
                yield Segment(plain_text(segment.text), segment.style)


_MARKDOWN_PUNCTUATION_RE = re.compile(r"([\\`*_{}\[\]#|~])")
_LINE_BREAK_RE = re.compile(r"\s*[\r\n\u2028\u2029]+\s*")


def markdown_text(value: object) -> str:
    """Return ``value`` safe inside a Markdown paragraph, heading or table cell.

    ``<script>`` becomes ``&lt;script&gt;``, ``# x`` becomes ``\\# x``, ``a|b`` becomes
    ``a\\|b`` and a line break becomes a space, so text can neither start a heading, split a
    table cell nor inject HTML.
    """
    text = _LINE_BREAK_RE.sub(" ", plain_text(value))
    text = html.escape(text, quote=False)
    return _MARKDOWN_PUNCTUATION_RE.sub(r"\\\1", text)
