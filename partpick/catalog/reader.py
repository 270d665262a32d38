"""Open the catalog for a reading command (``parts``, ``batches``): checked, and read-only.

:func:`partpick.catalog.store.open_engine` creates a catalog where there is none; that is
right for ``import`` and wrong for everything else. :func:`open_reader` makes the checks of
:mod:`partpick.catalog.integrity` first, then opens an SQLite file read-only, so reading
needs no write access and never changes the file. One exception: a catalog missing columns
for fields added to partpick since it was made gets them added when the file is writable
(as the import would); a read-only one is read without them where possible.
"""

from __future__ import annotations

import sqlalchemy as sa

from partpick.catalog.integrity import CatalogFile, can_write, connect_read_only, inspect_catalog
from partpick.catalog.location import resolve_db_url, sqlite_file
from partpick.catalog.pg_columns import require_catalog
from partpick.catalog.postgres import is_postgres
from partpick.catalog.schema import metadata
from partpick.catalog.store import open_engine, upgrade_schema
from partpick.errors import DatabaseError

_READERS: dict[str, sa.Engine] = {}


def open_reader(db: str | None) -> sa.Engine:
    """Return an engine for reading the catalog ``db``; raises if there is no catalog there."""
    url = resolve_db_url(db)
    path = sqlite_file(url)
    if path is None:
        if is_postgres(url):
            require_catalog(url)  # as for a file: only import creates a catalog
        return open_engine(db)  # in-memory and server catalogs: the store's own checks
    found = inspect_catalog(url, path)
    lacking = missing_columns(found)
    if lacking and can_write(path):
        return upgrade_schema(db)  # adds the columns, as an import would
    if lacking:
        table, names = next(iter(lacking.items()))
        raise DatabaseError(
            url,
            f"{table} lacks the columns {', '.join(names)} (made by an older partpick); "
            "open it once with write access, e.g. by importing into it, to add them",
        )
    if url not in _READERS:
        _READERS[url] = sa.create_engine(
            "sqlite://", creator=lambda: connect_read_only(path), poolclass=sa.pool.NullPool
        )
    return _READERS[url]


def missing_columns(found: CatalogFile) -> dict[str, list[str]]:
    """Return, per table, the columns this partpick expects that the file lacks."""
    missing = {}
    for table in metadata.sorted_tables:
        present = set(found.columns_of(table.name))
        lacking = [c.name for c in table.columns if c.name not in present]
        if lacking:
            missing[table.name] = lacking
    return missing


def dispose_readers() -> None:
    """Close every cached reading engine (tests use this between databases)."""
    while _READERS:
        _READERS.popitem()[1].dispose()
