"""The PostgreSQL test server and fresh catalogs on either back-end, for conftest and tests.

A module of its own (not conftest.py) so that tests importing :func:`new_catalog` share the
one server object the ``pg_server`` fixture set up.
"""

from __future__ import annotations

import uuid
from pathlib import Path

from partpick.catalog.store import dispose_engines

PG_URL_ENV = "PARTPICK_TEST_PG_URL"


class PgServer:
    """The test server of ``PARTPICK_TEST_PG_URL``: one fresh database per catalog."""

    def __init__(self, url: str) -> None:
        self.url = url
        self.created: list[str] = []

    def admin(self):
        import psycopg

        return psycopg.connect(self.url.replace("postgresql+psycopg://", "postgresql://"),
                               autocommit=True)  # fmt: skip

    def admin_of(self, name: str):
        """Return an autocommit connection to database ``name`` as the server's owner."""
        import psycopg

        url = self.url_of(name).replace("postgresql+psycopg://", "postgresql://")
        return psycopg.connect(url, autocommit=True)

    def new_database(self) -> str:
        """Create an empty database and return its URL."""
        name = f"pptest_{uuid.uuid4().hex[:12]}"
        with self.admin() as conn:
            conn.execute(f'CREATE DATABASE "{name}"')
        self.created.append(name)
        return self.url_of(name)

    def url_of(self, name: str, user: str | None = None, password: str | None = None) -> str:
        """Return the URL of database ``name`` on the server, as ``user`` if given."""
        import sqlalchemy as sa

        url = sa.make_url(self.url).set(database=name)
        if user is not None:
            url = url.set(username=user, password=password)
        return url.render_as_string(hide_password=False)

    def drop_all(self) -> None:
        dispose_engines()
        with self.admin() as conn:
            for name in self.created:
                conn.execute(f'DROP DATABASE IF EXISTS "{name}" WITH (FORCE)')


SERVER: list[PgServer] = []  # the session's server, once the pg_server fixture ran


def new_catalog(backend: str, folder: Path, name: str = "catalog.db") -> str:
    """Return a fresh, empty catalog on ``backend``: a file in ``folder``, or a PG database."""
    if backend == "sqlite":
        return str(folder / name)
    if not SERVER:
        raise RuntimeError("request the catalog_backend or pg_server fixture first")
    return SERVER[0].new_database()
