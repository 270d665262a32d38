"""The fast read path of a PostgreSQL catalog: a columnar snapshot per kind, cached per user.

A pick over 250,000 parts must not fetch 250,000 rows from the server each time. Each user
keeps the same ``.npz`` snapshot an SQLite catalog keeps beside its file
(:mod:`partpick.catalog.snapshot`), in the platform cache folder (``$XDG_CACHE_HOME``, else
``~/.cache``, then ``partpick/pg-<key>/<kind>.npz``), the key being a hash of the server,
port, database, user and options of the URL (never the password). The snapshot is stamped
with the catalog's ``db_uuid`` and the kind's generation, which every import bumps in its
transaction; a pick reads the stamp with one query and uses the snapshot while it matches.
Otherwise the rows and the stamp are read in one read-only REPEATABLE READ transaction (a
reader never waits for an import and never sees half of one) and the snapshot is rewritten.

Measured on 250,000 inductors (``scripts/bench_postgres.py``): reading the fresh snapshot
beats fetching the needed columns from the server on every pick, so this is what is kept.
psycopg and numpy only: neither SQLAlchemy nor pandas is imported on the way.
"""

from __future__ import annotations

import hashlib
import os
from pathlib import Path
from urllib.parse import parse_qsl, urlsplit

import numpy as np

from partpick.catalog import postgres
from partpick.catalog.location import generation_key
from partpick.catalog.snapshot import META, encode_rows, meta_array, save_members
from partpick.errors import DatabaseError, NoCatalogError, mask_url
from partpick.fields import Field, fields_of


def cache_folder(url: str) -> Path:
    """Return this user's snapshot folder for the catalog at ``url``."""
    parts = urlsplit(postgres.libpq_url(url))
    query = sorted((k, v) for k, v in parse_qsl(parts.query) if k != "password")
    identity = repr((parts.hostname, parts.port, parts.path, parts.username, query))
    key = hashlib.sha256(identity.encode("utf-8")).hexdigest()[:20]
    base = os.environ.get("XDG_CACHE_HOME") or str(Path.home() / ".cache")
    return Path(base) / "partpick" / f"pg-{key}"


def read_arrays(url: str, kind: str, wanted: list[Field], load_snapshot) -> dict[str, np.ndarray]:
    """Return the encoded snapshot arrays of ``kind`` (``load_snapshot`` checks a cached file)."""
    import psycopg

    with _connect(url) as conn:
        file = cache_folder(url) / f"{kind}.npz"
        stamp = _stamp(conn, url, kind)
        if stamp is None:
            raise _no_catalog(url)
        arrays = load_snapshot(file, stamp, wanted)
        if arrays is not None:
            return arrays
        try:
            return _rebuild(conn, kind, file)
        except (psycopg.errors.UndefinedTable, psycopg.errors.UndefinedColumn):
            pass  # a field added since the tables were made: widen them first
        except psycopg.Error as exc:
            raise DatabaseError(url, postgres.connection_reason(exc)) from None
    _prepare(url)  # upgrade or widen the tables, as any other command does
    with _connect(url) as conn:
        return _rebuild(conn, kind, file)


def require_catalog(url: str) -> None:
    """Raise NoCatalogError unless the database at ``url`` holds a partpick catalog.

    Only ``import`` creates one, as with SQLite files, so a reading command pointed at the
    wrong database leaves it untouched.
    """
    with _connect(url) as conn:
        if _stamp(conn, url, "inductor") is None:
            raise _no_catalog(url)


def _no_catalog(url: str) -> NoCatalogError:
    return NoCatalogError(mask_url(url), "the database holds no partpick catalog")


def _connect(url: str):
    try:
        import psycopg
    except ImportError:
        raise DatabaseError(url, postgres.missing_driver_reason() or "no psycopg") from None
    try:
        return psycopg.connect(
            postgres.libpq_url(url), autocommit=True, **postgres.connect_options(url)
        )
    except psycopg.Error as exc:
        raise DatabaseError(url, postgres.connection_reason(exc)) from None
    except ValueError as exc:  # a URL that cannot even be split into its parts
        raise DatabaseError(url, f"not a usable database URL ({exc})") from None


def _stamp(conn, url: str, kind: str) -> tuple[str, str] | None:
    """Return (db_uuid, kind's generation), or None when the catalog has no tables yet."""
    import psycopg

    try:
        rows = dict(conn.execute("SELECT key, value FROM catalog_meta").fetchall())
    except psycopg.errors.UndefinedTable:
        return None
    except psycopg.Error as exc:
        raise DatabaseError(url, postgres.connection_reason(exc)) from None
    if "db_uuid" not in rows:
        return None
    return rows["db_uuid"], rows.get(generation_key(kind), "0")


def _prepare(url: str) -> None:
    from partpick.catalog.store import open_engine

    open_engine(url)


def _rebuild(conn, kind: str, file: Path) -> dict[str, np.ndarray]:
    """Read every part of ``kind`` and its stamp in one snapshot; cache and return the arrays."""
    fields = fields_of(kind)
    names = ", ".join(f'"{f.name}"' for f in fields)
    with conn.transaction():
        conn.execute("SET TRANSACTION ISOLATION LEVEL REPEATABLE READ, READ ONLY")
        meta = dict(conn.execute("SELECT key, value FROM catalog_meta").fetchall())
        cursor = conn.cursor(binary=True)
        rows = cursor.execute(f"SELECT {names} FROM parts_{kind} ORDER BY id").fetchall()
    arrays = encode_rows(fields, rows)
    arrays[META] = meta_array((meta["db_uuid"], meta.get(generation_key(kind), "0")))
    try:
        file.parent.mkdir(mode=0o700, parents=True, exist_ok=True)
        save_members(file, arrays.items())
    except OSError:
        pass  # a read-only cache folder: the pick still works, from the server each time
    return arrays
