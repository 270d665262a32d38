"""Open the catalog database and answer the small questions about it (batches, counts).

The database is named by ``--db``, else ``$PARTPICK_DB``, else ``./partpick.db``. A plain path
becomes an SQLite URL; anything with ``://`` is taken as an SQLAlchemy URL. SQLite runs in WAL
mode, so a reader never sees a half-finished import. A ``postgresql://`` URL opens a team
catalog on a PostgreSQL server through psycopg 3 (:mod:`partpick.catalog.postgres`); the
schema is the same. Opening a catalog creates its tables, upgrades an older schema in place
(:mod:`partpick.catalog.migrations`) and adds the columns of fields added since.
"""

from __future__ import annotations

import uuid
from dataclasses import dataclass

import sqlalchemy as sa
from sqlalchemy import event, func, select

from partpick.catalog import migrations, postgres
from partpick.catalog.integrity import inspect_catalog
from partpick.catalog.location import resolve_db_url, sqlite_file
from partpick.catalog.schema import PARTS_TABLES, catalog_meta, import_batches, metadata
from partpick.catalog.sqlite_light import apply_pragmas
from partpick.catalog.tables import SCHEMA_VERSION
from partpick.errors import DatabaseError
from partpick.fields import KINDS

__all__ = ["Batch", "count_parts", "list_batches", "open_engine", "resolve_db_url", "sqlite_file"]


@dataclass(frozen=True)
class Batch:
    """One imported file, as recorded in ``import_batches``."""

    id: int
    file: str
    sha256: str
    imported_at: str
    kind: str
    rows: int
    added: int
    updated: int
    unchanged: int
    rejected: int
    imported_by: str | None = None


def open_engine(db: str | None) -> sa.Engine:
    """Return an engine on the catalog with its tables created (SQLite in WAL mode).

    Engines are cached per URL, so repeated calls in one process share one pool.
    """
    url = resolve_db_url(db)
    if url not in _ENGINES:
        _ENGINES[url] = _new_engine(url)
    return _ENGINES[url]


_ENGINES: dict[str, sa.Engine] = {}


def _new_engine(url: str) -> sa.Engine:
    try:
        engine = _postgres_engine(url) if postgres.is_postgres(url) else _sqlite_engine(url)
    except (sa.exc.ArgumentError, sa.exc.NoSuchModuleError, ImportError, ValueError) as exc:
        raise DatabaseError(url, f"not a usable database URL ({exc})") from None
    try:
        _create_schema(engine)
    except sa.exc.DatabaseError as exc:
        engine.dispose()
        if engine.dialect.name == "postgresql":
            raise DatabaseError(url, postgres.connection_reason(exc)) from None
        raise DatabaseError(url, f"cannot be opened ({exc.orig})") from None
    except BaseException:
        engine.dispose()
        raise
    return engine


def _sqlite_engine(url: str) -> sa.Engine:
    path = sqlite_file(url)
    if path is not None and not path.parent.is_dir():
        raise DatabaseError(url, f"the folder {path.parent} does not exist")
    if path is not None:
        inspect_catalog(url, path, for_import=True)  # another program's database is refused
    options: dict = {}
    if path is None and url.startswith("sqlite"):
        # an in-memory catalog lives as long as its one connection: keep exactly one
        options = {"poolclass": sa.pool.StaticPool,
                   "connect_args": {"check_same_thread": False}}  # fmt: skip
    engine = sa.create_engine(url, **options)
    if engine.dialect.name == "sqlite":
        event.listen(engine, "connect", _sqlite_pragmas)
    return engine


def _postgres_engine(url: str) -> sa.Engine:
    reason = postgres.missing_driver_reason()
    if reason is not None:
        raise DatabaseError(url, reason)
    return postgres.create_engine(url)


def _sqlite_pragmas(dbapi_connection, _record) -> None:
    apply_pragmas(dbapi_connection)


def _create_schema(engine: sa.Engine) -> None:
    with engine.begin() as conn:
        if conn.dialect.name == "postgresql":  # one process at a time creates or upgrades
            postgres.lock(conn, postgres.SCHEMA_LOCK)
        metadata.create_all(conn)
        known = dict(conn.execute(select(catalog_meta.c.key, catalog_meta.c.value)).all())
        version = known.get("schema_version", SCHEMA_VERSION)
        if version != SCHEMA_VERSION:
            migrations.upgrade(conn, engine.url.render_as_string(), version)
        _add_missing_columns(conn)
        defaults = {
            "generation": "0",
            "db_uuid": uuid.uuid4().hex,
            "schema_version": SCHEMA_VERSION,
        }
        missing = [{"key": k, "value": v} for k, v in defaults.items() if k not in known]
        if missing:
            conn.execute(catalog_meta.insert(), missing)


def _add_missing_columns(conn: sa.Connection) -> None:
    """Add columns for fields added to the data dictionary since the database was made.

    On PostgreSQL this runs under the schema lock; the ALTER TABLE waits for running imports
    of that kind (it happens once, after partpick gained a field).
    """
    inspector = sa.inspect(conn)
    for table in PARTS_TABLES.values():
        present = {c["name"] for c in inspector.get_columns(table.name)}
        for column in table.columns:
            if column.name not in present:
                kind = column.type.compile(dialect=conn.dialect)
                conn.exec_driver_sql(f'ALTER TABLE {table.name} ADD COLUMN "{column.name}" {kind}')


def upgrade_schema(db: str | None) -> sa.Engine:
    """Add the columns of fields added since the catalog was made; return its engine."""
    engine = open_engine(db)
    with engine.begin() as conn:
        _add_missing_columns(conn)
    return engine


def dispose_engines() -> None:
    """Close every cached engine (tests use this between databases)."""
    from partpick.catalog.reader import dispose_readers

    while _ENGINES:
        _ENGINES.popitem()[1].dispose()
    dispose_readers()


def list_batches(db: str | None) -> list[Batch]:
    """Return every import batch, oldest first."""
    from partpick.catalog.reader import open_reader

    with open_reader(db).connect() as conn:
        rows = conn.execute(select(import_batches).order_by(import_batches.c.id)).mappings()
        return [Batch(**row) for row in rows]


def count_parts(db: str | None) -> dict[str, int]:
    """Return the number of parts of each kind, in the order of :data:`partpick.fields.KINDS`."""
    from partpick.catalog.reader import open_reader

    with open_reader(db).connect() as conn:
        return {
            kind: conn.execute(select(func.count()).select_from(PARTS_TABLES[kind])).scalar_one()
            for kind in KINDS
        }
