"""The checks every command makes before it trusts an SQLite catalog file.

Standard library only, so the fast read path (``pick``) pays nothing for them.

* A reading command needs a catalog that exists: a missing file is "no catalog at …;
  import first" (only ``import`` creates a catalog, so a mistyped ``--db`` never leaves an
  empty file behind).
* A database that holds tables but no partpick catalog belongs to another program and is
  refused, by reading commands and by ``import`` alike.
* A catalog written by a newer schema version, or one too old to upgrade, is refused.
* Reading needs no write access: the file is opened read-only, and in a folder nobody may
  write (so no import can be running) it is opened as immutable, since SQLite could not
  create the WAL index file there.
"""

from __future__ import annotations

import contextlib
import os
import sqlite3
from dataclasses import dataclass
from pathlib import Path

from partpick.catalog.tables import SCHEMA_VERSION, version_refusal
from partpick.errors import DatabaseError, NoCatalogError

_OWN_TABLES = ("catalog_meta", "import_batches")


@dataclass(frozen=True)
class CatalogFile:
    """What the checks found: the file, its meta rows and each table's columns."""

    path: Path
    meta: dict[str, str]
    tables: dict[str, tuple[str, ...]]

    def columns_of(self, table: str) -> tuple[str, ...]:
        """Return the columns of ``table`` in the file (empty if it has no such table)."""
        return self.tables.get(table, ())


def read_only_uri(path: Path) -> str:
    """Return the SQLite URI opening ``path`` read-only.

    In a folder this process cannot write, SQLite cannot make the WAL index it needs, so
    the file is opened as immutable: safe there, as no import can write beside it either,
    and complete, as every import ends with a checkpoint that empties the WAL.
    """
    wal = path.with_name(path.name + "-wal")
    unwritable = not os.access(path.parent, os.W_OK)
    immutable = "&immutable=1" if unwritable and (not wal.exists() or _empty(wal)) else ""
    return f"file:{path}?mode=ro{immutable}"


def _empty(path: Path) -> bool:
    try:
        return path.stat().st_size == 0
    except OSError:
        return True


def connect_read_only(path: Path) -> sqlite3.Connection:
    """Return a read-only connection to the catalog file ``path``."""
    conn = sqlite3.connect(read_only_uri(path), uri=True, isolation_level=None)
    conn.execute("PRAGMA query_only=ON")
    return conn


def inspect_catalog(url: str, path: Path, *, for_import: bool = False) -> CatalogFile | None:
    """Return what the catalog file ``path`` holds, after every check above.

    For an import, a missing or empty file is fine (None: the import creates the catalog).
    Raises NoCatalogError or DatabaseError with a sentence saying what to do.
    """
    if path.is_dir():
        raise DatabaseError(url, "is a folder, not a catalog file")
    if path.is_symlink() and not path.exists():
        raise DatabaseError(url, "is a symlink to nothing (or a loop), not a catalog file")
    if path.exists() and not path.is_file():
        raise DatabaseError(url, "is a device or a FIFO, not a catalog file")
    if not path.exists():
        if for_import:
            return None
        raise NoCatalogError(str(path))
    try:
        with contextlib.closing(connect_read_only(path)) as conn:
            found = _read_file(conn, path)
    except sqlite3.DatabaseError as exc:
        raise DatabaseError(url, f"is not a readable SQLite catalog ({exc})") from None
    if not found.tables:
        if for_import:
            return None
        raise NoCatalogError(str(path), "the database is empty")
    _check_ownership(url, found)
    return found


def _read_file(conn: sqlite3.Connection, path: Path) -> CatalogFile:
    names = [r[0] for r in conn.execute("SELECT name FROM sqlite_master WHERE type = 'table'")]
    tables = {
        name: tuple(r[1] for r in conn.execute(f'PRAGMA table_info("{name}")'))
        for name in names
        if not name.startswith("sqlite_")
    }
    meta: dict[str, str] = {}
    if "catalog_meta" in tables:
        meta = dict(conn.execute("SELECT key, value FROM catalog_meta").fetchall())
    return CatalogFile(path, meta, tables)


def _check_ownership(url: str, found: CatalogFile) -> None:
    if "catalog_meta" not in found.tables or "db_uuid" not in found.meta:
        listed = ", ".join(sorted(found.tables)[:5])
        raise DatabaseError(
            url,
            f"holds other tables ({listed}) and no partpick catalog; "
            "give --db a new file for the catalog",
        )
    refusal = version_refusal(found.meta.get("schema_version", SCHEMA_VERSION))
    if refusal is not None:  # an older version it can upgrade is upgraded when opened
        raise DatabaseError(url, refusal)


def can_write(path: Path) -> bool:
    """Return True if this process may change the catalog file (and its folder)."""
    return os.access(path, os.W_OK) and os.access(path.parent, os.W_OK | os.X_OK)
