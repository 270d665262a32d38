"""The fast read path: every part of one kind as numpy columns.

Screening reads a whole kind at once (250,000 inductors must arrive in a few tens of ms), so
each kind has a columnar snapshot beside an SQLite catalog (``partpick.db.columns/inductor.npz``,
no pickles). The snapshot records the catalog's ``db_uuid`` and ``generation`` from
``catalog_meta``; every import bumps the generation in its transaction, so a stale or foreign
snapshot is detected with one stdlib ``sqlite3`` query and rebuilt. A PostgreSQL catalog
keeps the same snapshots in each user's cache folder (:mod:`partpick.catalog.pg_columns`).
This module imports neither pandas nor SQLAlchemy while the snapshot is fresh (an in-memory
SQLite catalog is read through SQLAlchemy).
"""

from __future__ import annotations

import contextlib
import sqlite3
import zipfile
from collections.abc import Sequence
from pathlib import Path

import numpy as np

from partpick.catalog import pg_columns
from partpick.catalog.integrity import CatalogFile, can_write, connect_read_only, inspect_catalog
from partpick.catalog.location import generation_key, resolve_db_url, snapshot_file, sqlite_file
from partpick.catalog.postgres import is_postgres
from partpick.catalog.snapshot import (
    META,
    MISSING,
    decode_field,
    encode_rows,
    meta_array,
    save_members,
    sweep_leftovers,
)
from partpick.errors import DatabaseError, NotFoundError
from partpick.fields import KINDS, Field, fields_of


def read_columns(
    db: str | None, kind: str, names: Sequence[str] | None = None
) -> dict[str, np.ndarray]:
    """Return every part of ``kind`` as columns keyed by field name, in catalog order.

    Keys are ``mpn``, ``manufacturer`` and ``names`` (default: every field of the kind).
    Float and int fields are float64 with NaN where missing; text, enum and bool fields are
    object arrays with None where missing, except ``manufacturer``, which is "" where the
    catalog does not know it (it is part of the identity). An SQLite file or PostgreSQL
    catalog is read from its snapshot, rebuilt first if stale; an in-memory one through SQL.
    """
    wanted = _wanted_fields(kind, names)
    url = resolve_db_url(db)
    path = sqlite_file(url)
    if path is None and is_postgres(url):
        arrays = pg_columns.read_arrays(url, kind, wanted, _load_snapshot)
        return {f.name: decode_field(arrays, f) for f in wanted}
    if path is None:
        return _from_sql(url, kind, wanted)
    found = _checked_catalog(url, path)
    sweep_leftovers(snapshot_file(path, kind).parent)  # what a killed import left behind
    columns = found.columns_of(f"parts_{kind}")
    stamp = (found.meta["db_uuid"], found.meta.get(generation_key(kind), "0"), *columns)
    arrays = _load_snapshot(snapshot_file(path, kind), stamp, wanted)
    if arrays is None:
        arrays = write_snapshot(url, kind)
    return {f.name: decode_field(arrays, f) for f in wanted}


def _checked_catalog(url: str, path: Path) -> CatalogFile:
    """Return the checked catalog file; add columns new fields need where it is writable."""
    found = inspect_catalog(url, path)
    expected = ("id", "kind", "manufacturer", "mpn")
    for kind in KINDS:
        present = found.columns_of(f"parts_{kind}")
        lacking = [f.name for f in fields_of(kind) if f.name not in present]
        if (lacking or any(c not in present for c in expected)) and can_write(path):
            _upgrade_tables(url)
            return inspect_catalog(url, path)
    return found


def _wanted_fields(kind: str, names: Sequence[str] | None) -> list[Field]:
    if kind not in KINDS:
        raise NotFoundError("part kind", kind, f"Choose one of {', '.join(KINDS)}.")
    by_name = {f.name: f for f in fields_of(kind)}
    chosen = ["mpn", "manufacturer"] + [
        n for n in (names or by_name) if n not in ("mpn", "manufacturer")
    ]
    for name in chosen:
        if name not in by_name:
            raise NotFoundError(f"{kind} field", name, "See partpick.fields for the field names.")
    return [by_name[n] for n in chosen]


def _empty(f: Field) -> np.ndarray:
    return np.empty(0, dtype=float if f.type in ("float", "int") else object)


def _upgrade_tables(url: str) -> None:
    from partpick.catalog.store import upgrade_schema

    upgrade_schema(url)


def _load_snapshot(file: Path, stamp: tuple[str, ...], wanted: list[Field]) -> dict | None:
    """Return the snapshot's arrays if it was made from this catalog, generation and table."""
    try:
        archive = np.load(file, allow_pickle=False)
    except (OSError, ValueError, EOFError, zipfile.BadZipFile):
        return None
    with archive:
        try:
            meta = archive[META].tolist() if META in archive.files else []
        except (OSError, ValueError, zipfile.BadZipFile):
            return None
        if meta != meta_array(stamp).tolist():
            return None
        keys = [f.name for f in wanted] + [MISSING + f.name for f in wanted]
        if any(f.name not in archive.files for f in wanted):
            return None
        return {k: archive[k] for k in keys if k in archive.files}


def write_snapshot(url: str, kind: str) -> dict[str, np.ndarray]:
    """Rebuild the snapshot of ``kind`` from the catalog; return its arrays (encoded form).

    Rows and the stamp are read in one read transaction, so they belong together. The file
    is written beside the database and renamed into place, so readers see old or new, whole.
    """
    path = sqlite_file(url)
    if path is None:
        raise DatabaseError(url, "a columnar snapshot needs an SQLite file database")
    fields = fields_of(kind)
    try:
        meta, present, rows = _read_rows(path, kind, fields)
    except sqlite3.Error as exc:
        raise DatabaseError(url, f"cannot be read ({exc})") from None
    arrays = _encoded(url, fields, rows)
    generation = meta.get(generation_key(kind), "0")
    arrays[META] = meta_array((meta["db_uuid"], generation, *present))
    with contextlib.suppress(OSError):  # a reader without write access reads from SQL each time
        save_members(snapshot_file(path, kind), arrays.items())
    return arrays


def _read_rows(path: Path, kind: str, fields: list[Field]) -> tuple[dict, list[str], list]:
    """Return the meta rows, the table's columns and every row, in one read transaction."""
    with contextlib.closing(connect_read_only(path)) as conn:
        conn.execute("BEGIN")
        meta = dict(conn.execute("SELECT key, value FROM catalog_meta").fetchall())
        present = [r[1] for r in conn.execute(f"PRAGMA table_info(parts_{kind})")]
        # a column the file lacks (a read-only catalog made before the field) reads as missing
        names = ", ".join(f'"{f.name}"' if f.name in present else "NULL" for f in fields)
        rows = conn.execute(f"SELECT {names} FROM parts_{kind} ORDER BY id").fetchall()
        conn.execute("COMMIT")
    return meta, present, rows


def _encoded(url: str, fields: list[Field], rows: list[tuple]) -> dict[str, np.ndarray]:
    """Return the snapshot arrays of ``rows``; a stored value of the wrong type is an error."""
    try:
        return encode_rows(fields, rows)
    except (TypeError, ValueError):
        pass
    for f in fields:
        if f.type not in ("float", "int"):
            continue
        for row in rows:
            value = row[fields.index(f)]
            if value is not None and not isinstance(value, (int, float)):
                raise DatabaseError(
                    url,
                    f"part {row[0]!r} holds {value!r} in {f.name}, not a number; "
                    "the file was changed outside partpick: re-import its catalog",
                )
    raise DatabaseError(url, "holds values partpick cannot read; re-import its catalogs")


def _from_sql(url: str, kind: str, wanted: list[Field]) -> dict[str, np.ndarray]:
    """Read the columns through SQLAlchemy (in-memory and non-SQLite catalogs)."""
    import sqlalchemy as sa

    from partpick.catalog.schema import parts_table
    from partpick.catalog.store import open_engine

    table = parts_table(kind)
    query = sa.select(*(table.c[f.name] for f in wanted)).order_by(table.c.id)
    with open_engine(url).connect() as conn:
        rows = [tuple(r) for r in conn.execute(query)]
    arrays = encode_rows(wanted, rows)
    return {f.name: decode_field(arrays, f) for f in wanted}


def mpn_hits(numbers: np.ndarray, mpn: str) -> np.ndarray:
    """Return the indices of the parts whose number is ``mpn``.

    An exact match first; without one, case and surrounding spaces do not matter
    ("  ts-zk40-3a0b " finds TS-ZK40-3A0B). Several indices mean several parts match.
    """
    hits = np.flatnonzero(numbers == mpn)
    if hits.size:
        return hits
    wanted = mpn.strip().casefold()
    folded = np.array([str(n).strip().casefold() for n in numbers.tolist()], dtype=object)
    return np.flatnonzero(folded == wanted)


def describe_parts(numbers: np.ndarray, makers: np.ndarray, hits: np.ndarray) -> str:
    """Return "TS-1 (Tessaly), ts-1 (Orrin)": the parts at ``hits``, for a message."""
    listed = [f"{numbers[i]} ({makers[i] or 'no manufacturer'})" for i in hits.tolist()]
    return ", ".join(sorted(listed))
