"""Write validated rows into the parts table: duplicates inside a file, then one bulk upsert.

Each chunk goes in with one DBAPI ``executemany`` of ``INSERT ... ON CONFLICT DO UPDATE``,
straight into the parts table, inside the caller's one transaction. A row that matches a
stored part and carries the same values changes nothing. The counts come from SQLite itself:
rows added are the new row ids, rows updated are the remaining changes. Into an empty table
the rows go by plain multi-row INSERTs instead, and the identity index is built once at the
end (see "bulk load" below).

``conn`` is an SQLAlchemy connection or, for an SQLite file,
:class:`~partpick.catalog.sqlite_light.LightConnection`: only plain SQL is sent, and neither
pandas nor SQLAlchemy is imported here.
"""

from __future__ import annotations

import itertools
import sqlite3
import sys
from collections.abc import Sequence
from dataclasses import dataclass
from typing import TYPE_CHECKING

import numpy as np

from partpick.catalog.tables import (
    IDENTITY_KEY_ORDER,
    identity_index_name,
    stored_fields,
    table_name,
)
from partpick.fields import KINDS

if TYPE_CHECKING:
    import sqlalchemy as sa

# The file, hash and time of a row's import are kept once, in its import_batches row.
PROVENANCE = ("source_line", "batch_id")


@dataclass(frozen=True)
class MergeCounts:
    """What merging one file did to the catalog."""

    added: int
    updated: int
    unchanged: int


@dataclass(frozen=True)
class Duplicate:
    """A row repeating the identity of an earlier row of the same file."""

    line: int
    mpn: str
    first_line: int


def value_columns(kind: str) -> tuple[str, ...]:
    """Return the columns compared to decide whether a part changed: its fields and ``extra``."""
    return tuple(f.name for f in stored_fields(kind)) + ("extra",)


def insert_columns(kind: str) -> tuple[str, ...]:
    """Return the columns bound per upserted row, in tuple order.

    ``kind`` and ``batch_id`` are the same on every row of a statement, so they are written
    into it as literals (see :func:`_insert_head`) rather than bound 100,000 times.
    """
    return ("manufacturer", "mpn") + value_columns(kind) + ("source_line",)


def _insert_head(
    kind: str, batch_id: int, rows: int = 1, bound: tuple[str, ...] | None = None
) -> str:
    """Return ``INSERT INTO table (...) VALUES (...), ...`` taking ``rows`` insert tuples.

    ``bound``: the columns each tuple holds (default :func:`insert_columns`, all of them).
    """
    if kind not in KINDS:  # the kind becomes SQL text: only the data dictionary's kinds
        raise KeyError(kind)
    bound = insert_columns(kind) if bound is None else bound
    if not set(bound) <= set(insert_columns(kind)):  # column names become SQL text too
        raise KeyError(bound)
    names = ("kind", "batch_id") + bound
    quoted = ", ".join(f'"{c}"' for c in names)
    marks = ", ".join("?" for _ in bound)
    one = f"('{kind}', {int(batch_id)}, {marks})"
    return f"INSERT INTO {table_name(kind)} ({quoted}) VALUES {', '.join([one] * rows)}"


class DuplicateFinder:
    """Find rows of one file whose (manufacturer, mpn) an earlier row already had.

    Inside a chunk the check is exact (a dict of the chunk's identities). Across chunks,
    64-bit hashes of every kept identity are remembered (8 bytes a row, so memory stays
    small); a hash hit is confirmed against the rows this batch already wrote, so a hash
    collision never rejects a row.
    """

    def __init__(self, kind: str, batch_id: int) -> None:
        self.kind = kind
        self.batch_id = batch_id
        self._seen = np.empty(0, dtype=np.int64)

    def split(
        self, conn: sa.Connection, manufacturer: np.ndarray, mpn: np.ndarray, lines: np.ndarray
    ) -> tuple[np.ndarray, list[Duplicate]]:
        """Return a keep-mask for the chunk's rows and the duplicates it found."""
        identities = list(zip(manufacturer.tolist(), mpn.tolist(), strict=True))
        first_row: dict[tuple, int] = {}
        repeated = np.zeros(len(identities), dtype=bool)
        duplicates: list[Duplicate] = []
        for i, identity in enumerate(identities):
            first = first_row.setdefault(identity, i)
            if first != i:
                repeated[i] = True
                duplicates.append(Duplicate(int(lines[i]), mpn[i], int(lines[first])))
        hashes = np.fromiter(map(hash, identities), dtype=np.int64, count=len(identities))
        candidates = ~repeated & np.isin(hashes, self._seen)
        for i in np.flatnonzero(candidates):
            first_line = self._stored_line(conn, manufacturer[i], mpn[i])
            if first_line is None:
                candidates[i] = False  # a hash collision, not a repeat
            else:
                duplicates.append(Duplicate(int(lines[i]), mpn[i], first_line))
        keep = ~(repeated | candidates)
        self._seen = np.union1d(self._seen, hashes[keep])
        return keep, duplicates

    def _stored_line(self, conn: sa.Connection, manufacturer: str, mpn: str) -> int | None:
        return conn.exec_driver_sql(
            f"SELECT source_line FROM {table_name(self.kind)} "
            "WHERE kind = ? AND manufacturer = ? AND mpn = ? AND batch_id = ?",
            (self.kind, manufacturer, mpn, self.batch_id),
        ).scalar()


def last_row_id(conn: sa.Connection, kind: str) -> int:
    """Return the highest row id of the parts table (0 when empty)."""
    return conn.exec_driver_sql(f"SELECT coalesce(max(id), 0) FROM {table_name(kind)}").scalar_one()


def upsert_rows(conn: sa.Connection, kind: str, batch_id: int, rows: Sequence[tuple]) -> int:
    """Upsert rows (tuples in :func:`insert_columns` order); return the rows inserted or changed."""
    if not rows:
        return 0
    before = conn.exec_driver_sql("SELECT total_changes()").scalar_one()
    conn.exec_driver_sql(_upsert_sql(kind, batch_id), list(rows))
    return conn.exec_driver_sql("SELECT total_changes()").scalar_one() - before


def _upsert_sql(kind: str, batch_id: int) -> str:
    table = table_name(kind)
    updates = ", ".join(f'"{c}" = excluded."{c}"' for c in value_columns(kind) + PROVENANCE)
    same = " AND ".join(f'{table}."{c}" IS excluded."{c}"' for c in value_columns(kind))
    return (
        f"{_insert_head(kind, batch_id)} "
        f"ON CONFLICT ({', '.join(IDENTITY_KEY_ORDER)}) DO UPDATE SET {updates} WHERE NOT ({same})"
    )


def row_tuples(kind: str, values: dict[str, np.ndarray], lines: np.ndarray) -> list[tuple]:
    """Return the upsert tuples of validated columns (in :func:`insert_columns` order)."""
    columns: list = [values["manufacturer"].tolist(), values["mpn"].tolist()]
    for name in value_columns(kind):
        column = values.get(name)
        columns.append(itertools.repeat(None) if column is None else column.tolist())
    columns.append(lines.tolist())
    return list(zip(*columns, strict=False))


def count_changes(
    conn: sa.Connection, kind: str, after_id: int, changed: int, kept: int
) -> MergeCounts:
    """Return added / updated / unchanged for a file whose rows got ids above ``after_id``."""
    added = conn.exec_driver_sql(
        f"SELECT count(*) FROM {table_name(kind)} WHERE id > ?", (after_id,)
    ).scalar_one()
    return MergeCounts(added=added, updated=changed - added, unchanged=kept - changed)


# --- bulk load into an empty table ------------------------------------------------------
# With no stored part to match, rows go in by plain INSERT without the identity index, and
# the index is rebuilt at the end in one sorted pass: far cheaper than keeping a B-tree in
# order row by row. Repeats inside the file are found and removed in SQL before the rebuild.


def is_empty(conn: sa.Connection, kind: str) -> bool:
    """Return True when the parts table of ``kind`` holds no part."""
    return not conn.exec_driver_sql(f"SELECT EXISTS (SELECT 1 FROM {table_name(kind)})").scalar()


def drop_identity_index(conn: sa.Connection, kind: str) -> None:
    """Drop the identity index for a bulk load (rolled back with the transaction)."""
    conn.exec_driver_sql(f"DROP INDEX IF EXISTS {identity_index_name(kind)}")


def create_identity_index(conn: sa.Connection, kind: str) -> None:
    """Rebuild the unique identity index after a bulk load."""
    conn.exec_driver_sql(
        f"CREATE UNIQUE INDEX IF NOT EXISTS {identity_index_name(kind)} "
        f"ON {table_name(kind)} ({', '.join(IDENTITY_KEY_ORDER)})"
    )


# Rows per INSERT of a bulk load: one statement step then stores many rows, which cuts the
# per-row cost of executemany (bind, step, reset) by about a quarter (measured, 100,000
# inductors); 64 x 20 parameters stays far below SQLite's limit of 32,766 per statement.
ROWS_PER_STATEMENT = 64


def insert_rows(
    conn: sa.Connection, kind: str, batch_id: int, values: dict[str, np.ndarray], lines: np.ndarray
) -> int:
    """Insert validated columns (as for :func:`row_tuples`) as new rows; return how many.

    The cells are laid into one 2-d object array, a column assignment per field (in C, no
    tuple per row). Viewed as groups of :data:`ROWS_PER_STATEMENT` rows, its lines are the
    parameters of a multi-row ``VALUES`` executemany; the remainder goes one row a statement.
    Only the columns the chunk has are bound (see :func:`_bound_columns`).
    """
    count = len(lines)
    names = _bound_columns(kind, values)
    block = np.empty((count, len(names)), dtype=object)
    flags = {f.name for f in stored_fields(kind) if f.type == "bool"}
    for j, name in enumerate(names):
        column = lines if name == "source_line" else values[name]
        block[:, j] = _as_integers(column) if name in flags else column
    group = ROWS_PER_STATEMENT
    whole = count - count % group
    if whole:
        params = block[:whole].reshape(-1, group * len(names)).tolist()
        head = _insert_head(kind, batch_id, group, names)
        conn.exec_driver_sql(head, _parameter_sets(conn, params))
    if whole < count:
        rest = block[whole:].tolist()
        conn.exec_driver_sql(_insert_head(kind, batch_id, 1, names), _parameter_sets(conn, rest))
    return count


def _as_integers(flags: np.ndarray) -> list:
    """Return yes/no cells as 1 / 0 (None stays None), as SQLite stores them anyway.

    The sqlite3 driver binds an int at once but looks for an adapter for each bool (measured:
    about 0.02 s per 100,000 rows).
    """
    return [_FLAG_INTEGERS.get(v, v) for v in flags.tolist()]


_FLAG_INTEGERS = {True: 1, False: 0}


def _bound_columns(kind: str, values: dict[str, np.ndarray]) -> tuple[str, ...]:
    """Return the insert columns a chunk has values for, in :func:`insert_columns` order.

    A field the file lacks is left out of the INSERT, so it is stored as NULL (the parts
    tables have no column defaults) without binding None into every row: the sqlite3 driver
    looks for an adapter for each None it binds, which made 9 absent inductor fields cost
    more than half of the bulk insert (0.63 s against 0.27 s for 100,000 rows, measured).
    """
    present = [n for n in insert_columns(kind) if n == "source_line" or values.get(n) is not None]
    return tuple(present)


def _parameter_sets(conn, rows: list[list]) -> list:
    """Return ``rows`` as the driver takes them: sqlite3 binds lists, SQLAlchemy wants tuples.

    Skipping the tuple copy saves about a tenth of a second per 100,000 rows (measured).
    """
    return rows if getattr(conn, "binds_lists", False) else list(map(tuple, rows))


def remove_repeats(conn: sa.Connection, kind: str, batch_id: int) -> list[Duplicate]:
    """Delete the later rows of every identity the batch inserted twice; return them."""
    table = table_name(kind)
    rows = conn.exec_driver_sql(
        f"SELECT t.id, t.source_line, t.mpn, f.first FROM {table} t JOIN ("
        f"SELECT manufacturer, mpn, min(source_line) AS first FROM {table} WHERE batch_id = ? "
        "GROUP BY manufacturer, mpn HAVING count(*) > 1) f "
        "ON t.manufacturer = f.manufacturer AND t.mpn = f.mpn "
        "WHERE t.batch_id = ? AND t.source_line > f.first ORDER BY t.source_line",
        (batch_id, batch_id),
    ).all()
    if rows:
        conn.exec_driver_sql(f"DELETE FROM {table} WHERE id = ?", [(r[0],) for r in rows])
    return [Duplicate(int(line), mpn, int(first)) for _id, line, mpn, first in rows]


def rebuild_identity_index(conn: sa.Connection, kind: str, batch_id: int) -> list[Duplicate]:
    """Rebuild the identity index after a bulk load; return the repeats it had to remove.

    The index is tried first (one sorted pass); only when the file repeated an identity does
    the slower search for repeats run, after which the index is built again.
    """
    try:
        with conn.begin_nested():
            create_identity_index(conn, kind)
        return []
    except _integrity_errors():
        repeats = remove_repeats(conn, kind, batch_id)
        create_identity_index(conn, kind)
        return repeats


def _integrity_errors() -> tuple[type[Exception], ...]:
    """Return the exception types of a broken unique index on either kind of connection."""
    errors: tuple[type[Exception], ...] = (sqlite3.IntegrityError,)
    if "sqlalchemy" in sys.modules:  # an SQLAlchemy connection wraps the driver's error
        errors += (sys.modules["sqlalchemy"].exc.IntegrityError,)
    return errors
