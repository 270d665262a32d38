"""Where the catalog lives: ``--db``, else ``$PARTPICK_DB``, else ``./partpick.db``.

Standard library only, so the fast read path (:mod:`partpick.catalog.columns`) can find the
database without importing SQLAlchemy.
"""

from __future__ import annotations

import os
from pathlib import Path

DEFAULT_DB = "partpick.db"
ENV_DB = "PARTPICK_DB"


def resolve_db_url(db: str | None) -> str:
    """Return the SQLAlchemy URL of the catalog: ``db``, else ``$PARTPICK_DB``, else ./partpick.db.

    A plain path becomes ``sqlite:///`` plus its absolute path; a value with ``://`` is kept.
    """
    value = db or os.environ.get(ENV_DB) or DEFAULT_DB
    if "://" in value:
        return value
    try:
        return "sqlite:///" + str(Path(value).expanduser().resolve())
    except (RuntimeError, OSError):  # a symlink loop: the integrity check names the problem
        return "sqlite:///" + os.path.abspath(os.path.expanduser(value))


def sqlite_file(url: str) -> Path | None:
    """Return the file of an SQLite URL; None for in-memory and non-SQLite databases."""
    scheme, _, rest = url.partition("://")
    if scheme.split("+")[0] != "sqlite" or not rest.startswith("/"):
        return None
    name, _, query = rest[1:].partition("?")
    if not name or name == ":memory:" or name.startswith("file:") or "mode=memory" in query:
        return None
    return Path(name)


def snapshot_file(db_file: Path, kind: str) -> Path:
    """Return the columnar snapshot of ``kind`` kept beside the database file."""
    return db_file.with_name(db_file.name + ".columns") / f"{kind}.npz"


def generation_key(kind: str) -> str:
    """Return the catalog_meta key of one kind's generation counter (snapshots are per kind)."""
    return f"generation.{kind}"
