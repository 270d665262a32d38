"""Names of the catalog's tables and indexes, and which fields are plain columns.

Standard library only: the SQLite import path (:mod:`partpick.catalog.sqlite_light`) and the
bulk loader (:mod:`partpick.catalog.merge`) use these names without importing SQLAlchemy;
:mod:`partpick.catalog.schema` builds its SQLAlchemy tables from the same names.
"""

from __future__ import annotations

from partpick.fields import Field, fields_of

# 2: identity as a named unique index (droppable for bulk loads), no CHECK constraints.
# 3: file, sha256 and import time live only in import_batches; parts keep line and batch.
# 4: the identity index is (mpn, manufacturer), the kind being one per table.
SCHEMA_VERSION = "4"

IDENTITY_COLUMNS: tuple[str, ...] = ("kind", "manufacturer", "mpn")
# The unique index holds (mpn, manufacturer): each table holds one kind, so this is the
# identity (kind, manufacturer, mpn); leaving the constant kind out makes the index smaller
# and quicker to build (measured, 100,000 inductors).
IDENTITY_KEY_ORDER: tuple[str, ...] = ("mpn", "manufacturer")


def table_name(kind: str) -> str:
    """Return the name of the parts table of ``kind``."""
    return f"parts_{kind}"


def identity_index_name(kind: str) -> str:
    """Return the name of the unique identity index (mpn, manufacturer) of ``kind``'s table."""
    return f"uq_{kind}_identity"


def stored_fields(kind: str) -> tuple[Field, ...]:
    """Return the fields of ``kind`` stored as plain columns (all but the identity)."""
    return tuple(f for f in fields_of(kind) if f.name not in IDENTITY_COLUMNS)
