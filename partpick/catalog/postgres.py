"""PostgreSQL specifics of the catalog: the engine, connection errors and advisory locks.

The schema and the import pipeline are the same as on SQLite; the bulk load is in
:mod:`partpick.catalog.pg_merge`, beside the SQLite one of :mod:`partpick.catalog.merge`.

* **Two importers at once.** An import takes a transaction-scoped advisory lock on its kind
  (``pg_advisory_xact_lock``) before it reads anything. A second importer of the same kind
  waits for the first to commit, then merges against what the first wrote, so both land and
  nothing is lost or duplicated (chosen over a serialisable retry: an import is long, and
  redoing it after a conflict would waste all of its work). Importers of other kinds do not
  wait. The lock is released with the transaction, also on a crash or a cancelled import.
* **Readers never wait.** Nothing here locks a table against readers: no index is dropped
  or rebuilt and no table is truncated, so ``pick`` and ``parts`` read the committed catalog
  (old or new, never half) while an import runs.
"""

from __future__ import annotations

import re
from typing import TYPE_CHECKING
from urllib.parse import urlsplit

if TYPE_CHECKING:
    import sqlalchemy as sa

SCHEMA_LOCK = "partpick.schema"
DRIVER = "postgresql+psycopg"
CONNECT_TIMEOUT_S = 10
# The staging table of an import lives in the session's temporary buffers; the default 8 MB
# spills a 100,000-row file to temporary files. The setting is a per-session ceiling, used
# only as far as needed, and can only be given before a session touches a temporary table.
SESSION_OPTIONS = "-c temp_buffers=64MB"


def is_postgres(url: str) -> bool:
    """Return True for a PostgreSQL URL (``postgresql://``, ``postgres://``, ``postgresql+...``)."""
    scheme = url.partition("://")[0].lower()
    return scheme.split("+")[0] in ("postgresql", "postgres")


def engine_url(url: str) -> str:
    """Return the SQLAlchemy URL using psycopg 3 (plain ``postgresql://`` means psycopg2).

    Raises ValueError for another driver: the bulk load speaks psycopg 3's COPY.
    """
    scheme, _, rest = url.partition("://")
    driver = scheme.partition("+")[2]
    if driver not in ("", "psycopg"):
        raise ValueError(f"partpick reaches PostgreSQL through psycopg 3, not {driver}; "
                         "write postgresql://...")  # fmt: skip
    return f"{DRIVER}://{rest}"


def libpq_url(url: str) -> str:
    """Return the URL as libpq reads it (``postgresql://``, without a driver name)."""
    return "postgresql://" + url.partition("://")[2]


def connect_options(url: str) -> dict:
    """Return the connection options partpick adds unless the URL sets them itself."""
    query = urlsplit(url).query
    options: dict = {}
    if "options=" not in query:
        options["options"] = SESSION_OPTIONS
    if "connect_timeout=" not in query:
        options["connect_timeout"] = CONNECT_TIMEOUT_S
    return options


def create_engine(url: str) -> sa.Engine:
    """Return an engine on a PostgreSQL catalog (no connection is made yet)."""
    import sqlalchemy as sa

    return sa.create_engine(engine_url(url), connect_args=connect_options(url))


def missing_driver_reason() -> str | None:
    """Return why PostgreSQL URLs cannot be used here, or None when psycopg is installed."""
    try:
        import psycopg  # noqa: F401
    except ImportError:
        return 'PostgreSQL support is not installed; run pip install "partpick[postgres]"'
    return None


# --- connection errors ------------------------------------------------------------------
# libpq's messages span lines and vary between versions; each known cause gets one plain
# line. The password is never part of any of them (DatabaseError masks the URL as well).
_CAUSES: tuple[tuple[str, str], ...] = (
    (r"password authentication failed|no password supplied|authentication failed",
     "the server refused the user name or password"),
    (r'role "([^"]*)" does not exist', 'the server has no user (role) "{0}"'),
    (r'database "([^"]*)" does not exist',
     'the server has no database "{0}"; create it first (see "Team catalog" in the README)'),
    (r"Connection refused", "no server answers there (connection refused); is it running?"),
    (r"could not translate host name|Name or service not known|nodename nor servname",
     "the server's host name is unknown"),
    (r"timeout expired", f"the server did not answer within {CONNECT_TIMEOUT_S} s"),
    (r"permission denied", "permission denied ({line}); see the grants in the README"),
)  # fmt: skip


def connection_reason(exc: BaseException) -> str:
    """Return one line saying why a PostgreSQL connection or statement failed."""
    text = str(getattr(exc, "orig", None) or exc)
    lines = [line.strip() for line in text.splitlines() if line.strip()]
    first = lines[0] if lines else type(exc).__name__
    for pattern, reason in _CAUSES:
        match = re.search(pattern, text)
        if match:
            return reason.format(*match.groups(), line=first)
    return first


# --- locks ------------------------------------------------------------------------------


def lock(conn: sa.Connection, name: str) -> None:
    """Wait for the transaction-scoped advisory lock ``name`` (released at commit/rollback)."""
    conn.exec_driver_sql("SELECT pg_advisory_xact_lock(hashtext(%(name)s))", {"name": name})


def lock_kind_for_import(conn: sa.Connection, kind: str) -> None:
    """Serialise importers of ``kind``: the second waits for the first one's commit."""
    lock(conn, f"partpick.import.{kind}")
