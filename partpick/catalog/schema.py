"""SQLAlchemy tables, generated from the data dictionary in :mod:`partpick.fields`.

One parts table per kind (``parts_inductor``, ``parts_capacitor`` ...): each kind has its own
fields, and a table per kind keeps every column meaningful and every read a plain scan.
Enum and kind values are checked by the importer, not by CHECK constraints: those doubled the
cost of a bulk insert (measured, 100,000 rows) for no gain, since only the importer writes.
Each table holds the identity (``kind``, ``manufacturer``, ``mpn``; with one kind per table,
(``mpn``, ``manufacturer``) is unique), the
kind's canonical fields as SI floats, ``extra`` (JSON text of the columns the importer did
not recognise) and the provenance of the row: its ``source_line`` and the ``batch_id`` of the
import that last changed it. The file, its sha256 and the import time are kept once per
batch in ``import_batches`` (not repeated on 100,000 rows, which cut a row's size by a third) and
joined back where parts are read (:func:`partpick.catalog.query.list_parts`).

``import_batches`` records every imported file; ``catalog_meta`` holds the generation counter
that the columnar snapshot (:mod:`partpick.catalog.columns`) checks for freshness.
"""

from __future__ import annotations

from sqlalchemy import (
    BigInteger,
    Boolean,
    Column,
    Float,
    ForeignKey,
    Index,
    Integer,
    MetaData,
    String,
    Table,
    Text,
)

from partpick.catalog.tables import (  # noqa: F401 - re-exported for the modules using them
    IDENTITY_COLUMNS,
    IDENTITY_KEY_ORDER,
    identity_index_name,
    stored_fields,
    table_name,
)
from partpick.fields import KINDS, Field

metadata = MetaData()
# SQLite's INTEGER holds 64 bits; PostgreSQL's integer only 32, so count fields use bigint there.
WHOLE_NUMBER = Integer().with_variant(BigInteger(), "postgresql")

import_batches = Table(
    "import_batches",
    metadata,
    Column("id", Integer, primary_key=True),
    Column("file", Text, nullable=False),
    Column("sha256", String(64), nullable=False),
    Column("imported_at", String(32), nullable=False),
    Column("kind", String(16), nullable=False),
    Column("rows", Integer, nullable=False),
    Column("added", Integer, nullable=False),
    Column("updated", Integer, nullable=False),
    Column("unchanged", Integer, nullable=False),
    Column("rejected", Integer, nullable=False),
    Column("imported_by", Text),  # the database user (server) or login (SQLite); schema 5
)

catalog_meta = Table(
    "catalog_meta",
    metadata,
    Column("key", String(32), primary_key=True),
    Column("value", Text, nullable=False),
)


def _column_for(f: Field) -> Column:
    if f.type == "float":
        return Column(f.name, Float, comment=f"{f.description} [{f.unit}]")
    if f.type == "int":  # 64 bits on both back-ends (a stock count can pass 2**31)
        return Column(f.name, WHOLE_NUMBER, comment=f.description)
    if f.type == "bool":
        return Column(f.name, Boolean, comment=f.description)
    return Column(f.name, Text, comment=f.description)


def _parts_table(kind: str) -> Table:
    return Table(
        table_name(kind),
        metadata,
        Column("id", Integer, primary_key=True),
        Column("kind", String(16), nullable=False),
        Column("manufacturer", Text, nullable=False, default=""),
        Column("mpn", Text, nullable=False),
        *(_column_for(f) for f in stored_fields(kind)),
        Column("extra", Text),
        Column("source_line", Integer),
        Column("batch_id", Integer, ForeignKey("import_batches.id")),
        # A named unique index rather than a table constraint, so a bulk load into an empty
        # table can drop it and rebuild it in one sorted pass (same transaction). The part
        # number leads: it tells rows apart soonest (the kind is one value per table), which
        # builds the index in about half the time (measured, 100,000 rows).
        Index(identity_index_name(kind), *IDENTITY_KEY_ORDER, unique=True),
    )


PARTS_TABLES: dict[str, Table] = {kind: _parts_table(kind) for kind in KINDS}


def parts_table(kind: str) -> Table:
    """Return the parts table of ``kind``; raises KeyError for an unknown kind."""
    return PARTS_TABLES[kind]
