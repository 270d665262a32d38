"""Schema versions and the steps that upgrade a catalog in place, on SQLite and PostgreSQL.

The version is kept in ``catalog_meta`` (key ``schema_version``). Opening a catalog of an
older version that a step leads from upgrades it inside the opening transaction (on
PostgreSQL under the schema advisory lock, so two processes never upgrade at once); every
part is kept. A field added to the data dictionary needs no step: its column is added on
open. A step is for what that cannot do (a new column outside the parts tables, a changed
index, moved data).

History:

* 2: identity as a named unique index (droppable for bulk loads), no CHECK constraints.
* 3: file, sha256 and import time live only in ``import_batches``; parts keep line and batch.
* 4: the identity index is (mpn, manufacturer), the kind being one per table.
* 5: ``import_batches.imported_by``: who imported the file (the database user on a server,
  the login on SQLite), for a catalog a team shares; on PostgreSQL, whole-number fields are
  ``bigint`` (64 bits, as SQLite's INTEGER).
"""

from __future__ import annotations

from collections.abc import Callable

import sqlalchemy as sa

from partpick.catalog.schema import PARTS_TABLES, catalog_meta
from partpick.catalog.tables import SCHEMA_VERSION, version_refusal
from partpick.errors import DatabaseError
from partpick.fields import fields_of


def _add_imported_by(conn: sa.Connection) -> None:
    """Schema 5: record who imported; on PostgreSQL, whole-number fields become bigint."""
    conn.exec_driver_sql("ALTER TABLE import_batches ADD COLUMN imported_by TEXT")
    if conn.dialect.name != "postgresql":
        return  # SQLite's INTEGER is 64 bits already
    inspector = sa.inspect(conn)
    for kind, table in PARTS_TABLES.items():
        present = {c["name"] for c in inspector.get_columns(table.name)}
        for name in (f.name for f in fields_of(kind) if f.type == "int" and f.name in present):
            conn.exec_driver_sql(f'ALTER TABLE {table.name} ALTER COLUMN "{name}" TYPE bigint')


# version -> (the step upgrading a catalog of that version, the version it leads to)
STEPS: dict[str, tuple[Callable[[sa.Connection], None], str]] = {
    "4": (_add_imported_by, "5"),
}


def upgrade(conn: sa.Connection, url: str, version: str) -> list[str]:
    """Upgrade a catalog of schema ``version`` to :data:`SCHEMA_VERSION`; return the steps run.

    Runs in the caller's transaction, so an upgrade that fails leaves the catalog as it was.
    Raises DatabaseError for a version no chain of steps leads from, or a newer one.
    """
    chain: list[tuple[Callable[[sa.Connection], None], str]] = []
    while version != SCHEMA_VERSION:
        if version not in STEPS:
            raise DatabaseError(url, version_refusal(version) or f"no step from schema {version}")
        chain.append(STEPS[version])
        version = chain[-1][1]
    # The version row is written first: Python's sqlite3 opens its transaction only at a
    # data change, so DDL issued before one would be committed on its own, step by step.
    conn.execute(
        catalog_meta.update()
        .where(catalog_meta.c.key == "schema_version")
        .values(value=SCHEMA_VERSION)
    )
    for step, _target in chain:
        step(conn)
    return [target for _step, target in chain]
