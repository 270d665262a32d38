"""Stage one file's rows in a temporary table, then merge them into the parts table in SQL.

Staging lets SQLite do the heavy work in C: duplicates inside the file, the added / updated /
unchanged counts, and the upsert are each one statement over the whole file. Everything runs
on the caller's connection, inside the caller's one transaction.
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass

import sqlalchemy as sa

from partpick.catalog.schema import stored_fields, table_name

STAGE = "temp.partpick_stage"


@dataclass(frozen=True)
class MergeCounts:
    """What merging one file did to the catalog."""

    added: int
    updated: int
    unchanged: int


def value_columns(kind: str) -> tuple[str, ...]:
    """Return the columns compared to decide whether a part changed: its fields and ``extra``."""
    return tuple(f.name for f in stored_fields(kind)) + ("extra",)


def stage_columns(kind: str) -> tuple[str, ...]:
    """Return the columns of the staging table, in insert order."""
    return ("manufacturer", "mpn") + value_columns(kind) + ("source_line",)


def create_stage(conn: sa.Connection, kind: str) -> None:
    """Create an empty staging table for ``kind`` (dropping a leftover one)."""
    conn.exec_driver_sql(f"DROP TABLE IF EXISTS {STAGE}")
    columns = ", ".join(f'"{name}"' for name in stage_columns(kind))
    conn.exec_driver_sql(f"CREATE TEMP TABLE partpick_stage ({columns})")


def stage_rows(conn: sa.Connection, kind: str, rows: Sequence[tuple]) -> None:
    """Insert rows (tuples in :func:`stage_columns` order) with one DBAPI executemany."""
    if not rows:
        return
    names = stage_columns(kind)
    marks = ", ".join("?" for _ in names)
    conn.exec_driver_sql(f"INSERT INTO {STAGE} VALUES ({marks})", list(rows))


def find_duplicates(conn: sa.Connection) -> list[tuple[int, str, str, int]]:
    """Return (line, manufacturer, mpn, first line) for every repeat of a part inside the file."""
    conn.exec_driver_sql(
        "CREATE INDEX temp.partpick_stage_identity "
        "ON partpick_stage (manufacturer, mpn, source_line)"
    )
    rows = conn.exec_driver_sql(
        f"SELECT s.source_line, s.manufacturer, s.mpn, min(f.source_line) FROM {STAGE} s "
        f"JOIN {STAGE} f ON f.manufacturer = s.manufacturer AND f.mpn = s.mpn "
        "AND f.source_line < s.source_line GROUP BY s.source_line ORDER BY s.source_line"
    ).all()
    return [tuple(row) for row in rows]


def drop_lines(conn: sa.Connection, lines: Sequence[int]) -> None:
    """Remove staged rows by line number (the repeats found by :func:`find_duplicates`)."""
    if lines:
        conn.exec_driver_sql(
            f"DELETE FROM {STAGE} WHERE source_line = ?", [(line,) for line in lines]
        )


def merge_stage(
    conn: sa.Connection, kind: str, *, batch_id: int, source: tuple[str, str, str]
) -> MergeCounts:
    """Upsert the staged rows into the parts table of ``kind``; return what changed.

    ``source`` is (file name, sha256, import time) for the provenance of new and changed rows.
    Unchanged rows keep the provenance of the import that last changed them.
    """
    table = table_name(kind)
    staged = conn.exec_driver_sql(f"SELECT count(*) FROM {STAGE}").scalar_one()
    has_parts = conn.exec_driver_sql(f"SELECT EXISTS (SELECT 1 FROM {table})").scalar_one()
    matched = unchanged = 0
    if has_parts:
        matched, unchanged = _count_matches(conn, kind)
    _upsert(conn, kind, batch_id, source)
    conn.exec_driver_sql(f"DROP TABLE {STAGE}")
    return MergeCounts(added=staged - matched, updated=matched - unchanged, unchanged=unchanged)


def _same_values(left: str, right: str, kind: str) -> str:
    return " AND ".join(f'{left}."{c}" IS {right}."{c}"' for c in value_columns(kind))


def _count_matches(conn: sa.Connection, kind: str) -> tuple[int, int]:
    join = (
        f"FROM {STAGE} s JOIN {table_name(kind)} m ON m.kind = ? "
        "AND m.manufacturer = s.manufacturer AND m.mpn = s.mpn"
    )
    row = conn.exec_driver_sql(
        f"SELECT count(*), coalesce(sum({_same_values('m', 's', kind)}), 0) {join}", (kind,)
    ).one()
    return int(row[0]), int(row[1])


def _upsert(conn: sa.Connection, kind: str, batch_id: int, source: tuple[str, str, str]) -> None:
    table = table_name(kind)
    values = value_columns(kind)
    provenance = ("source_file", "source_sha256", "imported_at", "batch_id")
    target = ("kind", "manufacturer", "mpn") + values + ("source_line",) + provenance
    quoted = ", ".join(f'"{c}"' for c in target)
    picked = ", ".join(f's."{c}"' for c in ("manufacturer", "mpn") + values + ("source_line",))
    updates = ", ".join(f'"{c}" = excluded."{c}"' for c in values + ("source_line",) + provenance)
    # "WHERE true" resolves the parsing ambiguity of INSERT ... SELECT ... ON CONFLICT in SQLite.
    conn.exec_driver_sql(
        f"INSERT INTO {table} ({quoted}) SELECT ?, {picked}, ?, ?, ?, ? FROM {STAGE} s "
        "WHERE true ORDER BY s.source_line "
        f"ON CONFLICT (kind, manufacturer, mpn) DO UPDATE SET {updates} "
        f"WHERE NOT ({_same_values(table, 'excluded', kind)})",
        (kind, *source, batch_id),
    )
