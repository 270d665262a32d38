"""Write an SQLite catalog file through the standard ``sqlite3`` driver, without SQLAlchemy.

Importing SQLAlchemy costs about 0.2 s of every ``partpick import`` (measured with
``python -X importtime``), more than a small file's whole work, and the bulk path never
needed it: :mod:`partpick.catalog.merge` sends plain SQL. :class:`LightConnection` offers the
few calls the importer makes of an SQLAlchemy connection (``exec_driver_sql``, ``begin``,
``begin_nested``, ``dialect.name``) on a bare ``sqlite3`` connection, with the same pragmas
as :mod:`partpick.catalog.store`.

A new catalog file gets its tables from :func:`create_statements`, made from the same data
dictionary as the SQLAlchemy tables of :mod:`partpick.catalog.schema` (a test checks both
give the same tables, columns and indexes). A catalog of another schema version, or one that
lacks a column added to the dictionary since, is brought up to date by
:func:`partpick.catalog.store.open_engine` first, as every other command does.
"""

from __future__ import annotations

import contextlib
import sqlite3
import uuid
from collections.abc import Iterator
from dataclasses import dataclass
from pathlib import Path

from partpick.catalog.tables import (
    IDENTITY_KEY_ORDER,
    SCHEMA_VERSION,
    identity_index_name,
    stored_fields,
    table_name,
)
from partpick.errors import DatabaseError
from partpick.fields import KINDS, Field

_SQL_TYPES = {"float": "FLOAT", "int": "INTEGER", "bool": "BOOLEAN"}  # else TEXT


def apply_pragmas(connection: sqlite3.Connection, *, wal: bool = True) -> None:
    """Set WAL mode and the pragmas every partpick connection to an SQLite catalog uses.

    ``wal=False`` leaves a new file in SQLite's rollback-journal mode, for the first load
    of a new catalog (see :func:`connect`).
    """
    cursor = connection.cursor()
    if wal:
        cursor.execute("PRAGMA journal_mode=WAL")
    # NORMAL in WAL mode: a commit does not wait for fsync, the checkpoint does (WAL, then
    # the database file). The catalog cannot be corrupted, and an application crash loses
    # nothing; only a power cut or OS crash before the next checkpoint can undo the last
    # import(s), which leaves the catalog as it was before them. Imports are re-runnable, so
    # this is the standard trade-off taken (FULL would fsync the WAL on every commit).
    cursor.execute("PRAGMA synchronous=NORMAL")
    cursor.execute("PRAGMA foreign_keys=ON")
    # Up to 64 MiB of page cache (default 2 MiB): a bulk import spills far less to the WAL.
    cursor.execute("PRAGMA cache_size=-65536")
    cursor.close()


class LightResult:
    """The rows of one statement, read the way the importer reads SQLAlchemy results."""

    def __init__(self, cursor: sqlite3.Cursor) -> None:
        self._cursor = cursor

    def scalar(self):
        row = self._cursor.fetchone()
        return None if row is None else row[0]

    def scalar_one(self):
        row = self._cursor.fetchone()
        if row is None:
            raise LookupError("the statement returned no row")
        return row[0]

    def all(self) -> list[tuple]:
        return self._cursor.fetchall()


@dataclass(frozen=True)
class _Dialect:
    name: str


class LightConnection:
    """A bare ``sqlite3`` connection with the SQLAlchemy calls the importer makes of one."""

    dialect = _Dialect("sqlite")
    binds_lists = True  # executemany takes each parameter set as a list (no tuple copy)

    def __init__(self, connection: sqlite3.Connection, *, in_wal: bool = True) -> None:
        self.raw = connection
        self.in_wal = in_wal  # False: a new file loaded in rollback-journal mode

    def exec_driver_sql(self, sql: str, parameters=None) -> LightResult:
        """Run ``sql`` (qmark or named parameters); a list of parameter sets runs it per set."""
        if isinstance(parameters, list):
            return LightResult(self.raw.executemany(sql, parameters))
        return LightResult(self.raw.execute(sql, () if parameters is None else parameters))

    @contextlib.contextmanager
    def begin(self) -> Iterator[LightConnection]:
        """Run the block in one transaction: committed at its end, rolled back on any error."""
        self.raw.execute("BEGIN")
        try:
            yield self
        except BaseException:
            self.raw.execute("ROLLBACK")
            raise
        self.raw.execute("COMMIT")

    @contextlib.contextmanager
    def begin_nested(self) -> Iterator[LightConnection]:
        """Run the block in a savepoint: undone alone if it fails, the transaction goes on."""
        self.raw.execute("SAVEPOINT nested")
        try:
            yield self
        except BaseException:
            self.raw.execute("ROLLBACK TO nested")
            self.raw.execute("RELEASE nested")
            raise
        self.raw.execute("RELEASE nested")

    def settle(self) -> None:
        """After the commit: leave the file alone holding the catalog, in WAL mode.

        WAL mode: copy the WAL into the file, so that a teammate reading from a folder
        they cannot write, who opens it as immutable, sees every part. A new file loaded in
        rollback mode is switched to WAL, as every other connection would. A busy reader
        only makes the checkpoint partial or leaves the switch to the next connection.
        """
        statement = "PRAGMA wal_checkpoint(TRUNCATE)" if self.in_wal else "PRAGMA journal_mode=WAL"
        with contextlib.suppress(sqlite3.Error):
            self.raw.execute(statement)

    def close(self) -> None:
        self.raw.close()


# A new catalog file whose first load is at most this many bytes of CSV is loaded in
# rollback-journal mode (``connect(..., first_load_bytes=...)``). In WAL mode every page is
# written twice, to the WAL at the commit and again into the file at the checkpoint; in
# rollback mode a page of a new file is written once, as there is nothing old to keep. That
# saved 0.05 s of a 1.1 s import of 100,000 inductors (15 MiB, measured, whole process).
# The bound keeps the load inside the 64 MiB page cache (a catalog file takes about twice
# its CSV's size): rollback mode must lock readers out while it spills pages to the file,
# so a larger load keeps WAL, where readers are never locked out.
ROLLBACK_LOAD_MAX_BYTES = 24 * 2**20


def connect(url: str, path: Path, *, first_load_bytes: int | None = None) -> LightConnection:
    """Return a connection to the catalog file ``path``, its tables created if it has none.

    ``first_load_bytes``: the size of what is about to be loaded. When ``path`` does not
    exist yet and that is at most :data:`ROLLBACK_LOAD_MAX_BYTES`, the file stays in
    rollback-journal mode until :meth:`LightConnection.settle` (after the commit).

    Raises DatabaseError when the file is not a catalog partpick can write.
    """
    if not path.parent.is_dir():
        raise DatabaseError(url, f"the folder {path.parent} does not exist")
    rollback = (
        first_load_bytes is not None
        and first_load_bytes <= ROLLBACK_LOAD_MAX_BYTES
        and not path.exists()
    )
    try:
        raw = sqlite3.connect(path, isolation_level=None)
    except sqlite3.Error as exc:
        raise DatabaseError(url, f"cannot be opened ({exc})") from None
    try:
        apply_pragmas(raw, wal=not rollback)
        if not _is_current(raw):
            _prepare(url, raw)
    except sqlite3.DatabaseError as exc:
        raw.close()
        raise DatabaseError(url, f"cannot be opened ({exc})") from None
    except BaseException:
        raw.close()
        raise
    return LightConnection(raw, in_wal=not rollback)


def _is_current(raw: sqlite3.Connection) -> bool:
    """Return True when the catalog has this version's tables, each with every column."""
    try:
        meta = dict(raw.execute("SELECT key, value FROM catalog_meta").fetchall())
    except sqlite3.OperationalError:  # no catalog_meta table: a new (or foreign) file
        return False
    if meta.get("schema_version") != SCHEMA_VERSION or "db_uuid" not in meta:
        return False
    for kind in KINDS:
        present = {row[1] for row in raw.execute(f"PRAGMA table_info({table_name(kind)})")}
        if not set(parts_columns(kind)) <= present:
            return False
    return True


def _prepare(url: str, raw: sqlite3.Connection) -> None:
    """Create the tables of a new catalog file; leave any other catalog to open_engine."""
    tables = raw.execute("SELECT count(*) FROM sqlite_master WHERE type = 'table'").fetchone()
    if tables[0] == 0:
        raw.execute("BEGIN")
        for statement in create_statements():
            raw.execute(statement)
        defaults = {"generation": "0", "db_uuid": uuid.uuid4().hex,
                    "schema_version": SCHEMA_VERSION}  # fmt: skip
        raw.executemany("INSERT INTO catalog_meta (key, value) VALUES (?, ?)", defaults.items())
        raw.execute("COMMIT")
        return
    from partpick.catalog.store import open_engine  # checks the version, adds columns

    open_engine(url)


def parts_columns(kind: str) -> dict[str, str]:
    """Return column name -> SQL declaration of the parts table of ``kind``, in table order."""
    columns = {"id": "INTEGER NOT NULL", "kind": "VARCHAR(16) NOT NULL",
               "manufacturer": "TEXT NOT NULL", "mpn": "TEXT NOT NULL"}  # fmt: skip
    columns.update({f.name: _sql_type(f) for f in stored_fields(kind)})
    columns.update({"extra": "TEXT", "source_line": "INTEGER", "batch_id": "INTEGER"})
    return columns


def _sql_type(f: Field) -> str:
    return _SQL_TYPES.get(f.type, "TEXT")


def create_statements() -> list[str]:
    """Return the CREATE statements of a new catalog (as schema.py's tables on SQLite)."""
    statements = [
        "CREATE TABLE import_batches (id INTEGER NOT NULL, file TEXT NOT NULL, "
        "sha256 VARCHAR(64) NOT NULL, imported_at VARCHAR(32) NOT NULL, "
        "kind VARCHAR(16) NOT NULL, rows INTEGER NOT NULL, added INTEGER NOT NULL, "
        "updated INTEGER NOT NULL, unchanged INTEGER NOT NULL, rejected INTEGER NOT NULL, "
        "imported_by TEXT, PRIMARY KEY (id))",
        'CREATE TABLE catalog_meta ("key" VARCHAR(32) NOT NULL, value TEXT NOT NULL, '
        'PRIMARY KEY ("key"))',
    ]
    for kind in KINDS:
        columns = ", ".join(f"{name} {sql}" for name, sql in parts_columns(kind).items())
        statements.append(
            f"CREATE TABLE {table_name(kind)} ({columns}, PRIMARY KEY (id), "
            "FOREIGN KEY(batch_id) REFERENCES import_batches (id))"
        )
        statements.append(
            f"CREATE UNIQUE INDEX {identity_index_name(kind)} ON {table_name(kind)} "
            f"({', '.join(IDENTITY_KEY_ORDER)})"
        )
    return statements
