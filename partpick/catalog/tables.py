"""Names of the catalog's tables and indexes, and which fields are plain columns.

Standard library only: the SQLite import path (:mod:`partpick.catalog.sqlite_light`) and the
bulk loader (:mod:`partpick.catalog.merge`) use these names without importing SQLAlchemy;
:mod:`partpick.catalog.schema` builds its SQLAlchemy tables from the same names.
"""

from __future__ import annotations

from partpick.fields import Field, fields_of

# The history, and the steps upgrading an older catalog in place: catalog/migrations.py.
SCHEMA_VERSION = "5"
OLDEST_UPGRADABLE = "4"  # a catalog of this version or later is upgraded on open


def version_refusal(version: str) -> str | None:
    """Return why a catalog of schema ``version`` cannot be used, or None when it can.

    The current version and every older one from :data:`OLDEST_UPGRADABLE` on can (the older
    ones are upgraded in place when the catalog is opened for writing).
    """
    if not version.isdigit():
        return f"holds an unknown schema version {version!r}; import into a new catalog"
    if int(version) > int(SCHEMA_VERSION):
        return (
            f"made by a newer partpick (schema {version}, this one reads up to "
            f"{SCHEMA_VERSION}); upgrade partpick to use it"
        )
    if int(version) < int(OLDEST_UPGRADABLE):
        return (
            f"made by an early partpick (schema {version}; this one upgrades schema "
            f"{OLDEST_UPGRADABLE} and later); import your CSV files into a new catalog file "
            "or database"
        )
    return None


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
