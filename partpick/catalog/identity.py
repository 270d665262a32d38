"""A part's identity (manufacturer, part number) compares as people read it.

Two spellings that a person reads as the same maker or the same part number must not make
two parts. Before a chunk's rows are stored:

* Manufacturer and part number are put in Unicode NFC (a "ü" typed as u + combining
  diaeresis is the same letter as the precomposed one) with surrounding whitespace
  removed and inner runs of whitespace made one space.
* A manufacturer takes the spelling the catalog (or this import) already has for it,
  compared with case folded: "acme" after "Acme" is the same maker, stored as "Acme".
* A part number keeps its spelling, but a new row whose part number differs from a stored
  one of the same maker only in letter case is removed and rejected after the load.
* A cell that reads as mojibake, UTF-8 bytes decoded as Windows-1252 ("MÃ¼ller" for
  "Müller"), is rejected: the file mixes encodings, and storing the cell would make a
  second maker that is the first one garbled.
"""

from __future__ import annotations

import dataclasses
import re
import unicodedata

import numpy as np

from partpick.catalog.reading import Chunk, Reject
from partpick.catalog.tables import table_name
from partpick.fields import KINDS

IDENTITY_FIELDS = ("manufacturer", "mpn")
_SPACES_RE = re.compile(r"\s+")
# UTF-8 lead bytes (0xC2-0xF4) read as Windows-1252, followed by a continuation byte's
# reading: the shape of mojibake. Only cells matching it are tried by decoding.
_MOJIBAKE_HINT_RE = re.compile("[\u00c2-\u00f4][\u0080-\u00bf\u2018-\u203a\u0152-\u0178\u20ac]")


def clean_identity(text: str) -> str:
    """Return ``text`` in NFC with its whitespace trimmed and inner runs made one space."""
    if text.isascii():
        return " ".join(text.split()) if _SPACES_RE.search(text) else text
    return _SPACES_RE.sub(" ", unicodedata.normalize("NFC", text)).strip()


def fold_identity(text: str) -> str:
    """Return the comparison key of a manufacturer or part number: clean, case folded."""
    return clean_identity(text).casefold()


def mojibake_reading(text: str) -> str | None:
    """Return what ``text`` meant if it is UTF-8 read as Windows-1252, else None."""
    if text.isascii() or not _MOJIBAKE_HINT_RE.search(text):
        return None
    try:
        meant = text.encode("cp1252").decode("utf-8")
    except (UnicodeEncodeError, UnicodeDecodeError):
        return None
    return meant if meant != text else None


class MakerSpellings:
    """The one spelling of each manufacturer, by folded key: the catalog's, else the first."""

    def __init__(self, known: list[str] | None = None) -> None:
        self._by_key: dict[str, str] = {}
        for name in known or ():
            self._by_key.setdefault(fold_identity(name), name)

    def spell(self, names: np.ndarray) -> np.ndarray:
        """Return ``names`` with each maker in its one spelling."""
        distinct = {name: self._spelling(name) for name in set(names.tolist())}
        if all(k == v for k, v in distinct.items()):
            return names
        out = np.empty(len(names), dtype=object)
        out[:] = [distinct[name] for name in names.tolist()]
        return out

    def _spelling(self, name: str) -> str:
        clean = clean_identity(name)
        return self._by_key.setdefault(clean.casefold(), clean)


def stored_makers(conn, kind: str) -> list[str]:
    """Return the manufacturer spellings the catalog already holds for ``kind``."""
    if kind not in KINDS:  # the kind becomes SQL text: only the data dictionary's kinds
        raise KeyError(kind)
    result = conn.exec_driver_sql(f"SELECT DISTINCT manufacturer FROM {table_name(kind)}")
    return [row[0] for row in result.all() if isinstance(row[0], str)]


def normalise_chunk(chunk: Chunk, makers: MakerSpellings, headers: dict[str, str]) -> Chunk:
    """Return ``chunk`` with clean identities; rows whose identity reads as mojibake rejected.

    ``headers`` maps ``manufacturer`` and ``mpn`` to the file's column names, for rejects.
    """
    values = dict(chunk.values)
    bad = np.zeros(len(chunk.lines), dtype=bool)
    rejects: list[Reject] = []
    for name in IDENTITY_FIELDS:
        column = values[name]
        if _plain_ascii(column):
            continue  # the common case, checked in one pass: nothing to clean or reject
        header = headers.get(name, name)
        for row, text in enumerate(column.tolist()):
            meant = mojibake_reading(text) if isinstance(text, str) else None
            if meant is not None and not bad[row]:
                bad[row] = True
                rejects.append(_mojibake_reject(chunk.lines[row], header, text, meant))
        values[name] = _cleaned(column)
    values["manufacturer"] = makers.spell(values["manufacturer"])
    if not bad.any():
        return dataclasses.replace(chunk, values=values)
    good = ~bad
    kept = {name: column[good] for name, column in values.items()}
    return dataclasses.replace(
        chunk, values=kept, lines=chunk.lines[good], rejects=chunk.rejects + rejects
    )


_LOOSE_SPACE_RE = re.compile(r"(?:^|\x00)\s|\s(?:\x00|$)|\s\s|[\t\n\r\x0b\x0c]")
# What _LOOSE_SPACE_RE finds in ASCII text without the separators \x1c-\x1f (which \s also
# matches), as plain substring searches: an untidy space, or any other whitespace at all.
_LOOSE_SPACES = ("\x00 ", " \x00", "  ", "\t", "\n", "\r", "\x0b", "\x0c")
_SEPARATORS = ("\x1c", "\x1d", "\x1e", "\x1f")


def _plain_ascii(column: np.ndarray) -> bool:
    """Return True if every cell is ASCII text with tidy spaces (no cleaning can change it).

    The cells are joined by NUL and searched with ``in``, a fast scan each: the regular
    expression took 0.12 s on 200,000 identities (measured); it decides only when a cell
    holds one of the rare separator characters.
    """
    try:
        joined = "\x00".join(column.tolist())
    except TypeError:  # a cell that is not text
        return False
    if not joined.isascii():
        return False
    if any(sep in joined for sep in _SEPARATORS):
        return _LOOSE_SPACE_RE.search(joined) is None
    ends = joined.startswith(" ") or joined.endswith(" ")
    return not ends and not any(loose in joined for loose in _LOOSE_SPACES)


def _cleaned(column: np.ndarray) -> np.ndarray:
    texts = column.tolist()
    cleaned = [clean_identity(t) if isinstance(t, str) else t for t in texts]
    if cleaned == texts:
        return column
    out = np.empty(len(cleaned), dtype=object)
    out[:] = cleaned
    return out


def _mojibake_reject(line, header: str, text: str, meant: str) -> Reject:
    reason = (
        f"reads as {meant!r} in UTF-8: the file mixes text encodings; "
        "save it in one encoding (UTF-8) and import it again"
    )
    return Reject(int(line), header, text, reason)


def remove_case_variants(conn, kind: str, batch_id: int) -> list[tuple[int, str, str]]:
    """Remove this batch's new rows whose part number differs from another's only in case.

    Returns (line, mpn, reason) of each row removed. The part stored first (lowest id: an
    earlier import's, or the earlier line of this file) stays. Cheap when no part number of
    the kind has a lower-case letter, since then no two can differ only in case; else one
    grouping pass in SQL. SQLite only (``upper`` folds ASCII, as part numbers are).
    """
    if conn.dialect.name != "sqlite" or kind not in KINDS:
        return []
    table = table_name(kind)
    mixed = conn.exec_driver_sql(f"SELECT EXISTS (SELECT 1 FROM {table} WHERE mpn <> upper(mpn))")
    if not mixed.scalar():
        return []
    rows = conn.exec_driver_sql(
        f"SELECT id, batch_id, source_line, manufacturer, mpn FROM {table} "
        f"WHERE (manufacturer, upper(mpn)) IN (SELECT manufacturer, upper(mpn) FROM {table} "
        "GROUP BY 1, 2 HAVING count(*) > 1) ORDER BY id"
    ).all()
    first: dict[tuple[str, str], tuple] = {}
    removed = []
    for row_id, batch, line, maker, mpn in rows:
        key = (maker, mpn.upper())
        if key not in first:
            first[key] = (batch, line, mpn)
            continue
        if batch != batch_id:
            continue  # two earlier parts: not this import's to settle
        kept_batch, kept_line, kept_mpn = first[key]
        where = f"line {kept_line}" if kept_batch == batch_id else f"the catalog's {kept_mpn!r}"
        conn.exec_driver_sql(f"DELETE FROM {table} WHERE id = ?", (row_id,))
        removed.append((int(line), mpn, f"same manufacturer and part number as {where} "
                        "(they differ only in letter case)"))  # fmt: skip
    return removed
