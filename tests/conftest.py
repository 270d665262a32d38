"""Shared fixtures: catalog databases (in memory, on disk, on PostgreSQL), CSV writers, a runner.

Every test runs with ``PARTPICK_DB`` pointing into its own temporary folder, so no test can
touch a user's ``./partpick.db``.

Catalog-level tests take ``catalog_db`` (or build one with :func:`new_catalog` on the
back-end of ``catalog_backend``) and so run once on SQLite and once on PostgreSQL. The
PostgreSQL runs carry the ``postgres`` marker and need a server: ``PARTPICK_TEST_PG_URL``
names a database whose user may create databases (``scripts/pg-throwaway`` starts a
throwaway server and sets it). Without it they are skipped, except in CI (``CI`` set), where
a skipped PostgreSQL test fails the run: CI must prove both back-ends.
"""

from __future__ import annotations

import os
import uuid
from collections.abc import Callable, Iterator
from pathlib import Path

import pytest
from typer.testing import CliRunner

from partpick.catalog.store import dispose_engines
from tests.backends import PG_URL_ENV, SERVER, PgServer, new_catalog

CATALOG_DATA = Path(__file__).parent / "data" / "catalog"
BUNDLED_CATALOGS = Path(__file__).parents[1] / "catalogs"
BACKENDS = [pytest.param("sqlite"), pytest.param("postgres", marks=pytest.mark.postgres)]


@pytest.fixture(scope="session")
def pg_server() -> Iterator[PgServer]:
    """Session scope: the PostgreSQL test server; skips the test when none is configured."""
    url = os.environ.get(PG_URL_ENV)
    if not url:
        pytest.skip(f"no PostgreSQL server: set {PG_URL_ENV} (see scripts/pg-throwaway)")
    server = PgServer(url)
    SERVER.append(server)
    yield server
    SERVER.clear()
    server.drop_all()


@pytest.fixture(scope="module", params=BACKENDS)
def catalog_backend(request: pytest.FixtureRequest) -> str:
    """Module scope: "sqlite", then "postgres" (skipped without a server)."""
    if request.param == "postgres":
        request.getfixturevalue("pg_server")
    return request.param


@pytest.fixture
def catalog_db(catalog_backend: str, tmp_path: Path) -> str:
    """Function scope: a fresh catalog on each back-end (a file path, or a PostgreSQL URL)."""
    return new_catalog(catalog_backend, tmp_path)


# --- CI must not skip the PostgreSQL tests ------------------------------------------------
_PG_TESTS: set[str] = set()
_SKIPPED_PG: list[str] = []


def pytest_collection_modifyitems(items: list[pytest.Item]) -> None:
    _PG_TESTS.update(item.nodeid for item in items if item.get_closest_marker("postgres"))


def pytest_runtest_logreport(report: pytest.TestReport) -> None:
    if report.skipped and report.nodeid in _PG_TESTS:
        _SKIPPED_PG.append(report.nodeid)


def pytest_sessionfinish(session: pytest.Session, exitstatus: int) -> None:
    if os.environ.get("CI") and _SKIPPED_PG:
        session.exitstatus = pytest.ExitCode.TESTS_FAILED


def pytest_terminal_summary(terminalreporter) -> None:
    if os.environ.get("CI") and _SKIPPED_PG:
        terminalreporter.write_line(
            f"FAILED: {len(_SKIPPED_PG)} PostgreSQL test(s) skipped in CI, e.g. "
            f"{_SKIPPED_PG[0]}; run CI through .ci/run, which starts a server",
            red=True,
        )


@pytest.fixture(autouse=True)
def _isolated_catalog(tmp_path: Path, monkeypatch: pytest.MonkeyPatch) -> Iterator[None]:
    """Function scope: the default catalog and the cache folder in tmp_path; close engines after."""
    monkeypatch.setenv("PARTPICK_DB", str(tmp_path / "default-partpick.db"))
    monkeypatch.setenv("XDG_CACHE_HOME", str(tmp_path / "cache"))
    yield
    dispose_engines()


@pytest.fixture
def db_file(tmp_path: Path) -> str:
    """Function scope: the path of a fresh SQLite catalog file (created on first use)."""
    return str(tmp_path / "catalog.db")


@pytest.fixture
def memory_db() -> str:
    """Function scope: the URL of a fresh shared-cache in-memory SQLite catalog."""
    return f"sqlite:///file:partpick-{uuid.uuid4().hex}?mode=memory&cache=shared&uri=true"


@pytest.fixture
def write_csv(tmp_path: Path) -> Callable[..., Path]:
    """Function scope: write text to a CSV file in a given encoding and return its path."""

    def write(text: str, name: str = "parts.csv", encoding: str = "utf-8") -> Path:
        path = tmp_path / name
        path.write_bytes(text.encode(encoding))
        return path

    return write


@pytest.fixture
def runner() -> CliRunner:
    """Function scope: a CLI runner for ``partpick.cli.app``."""
    return CliRunner()


def dump_catalog(db: str) -> dict[str, list[tuple]]:
    """Return every row of every catalog table, sorted, for before/after comparisons."""
    import sqlalchemy as sa

    from partpick.catalog.schema import metadata
    from partpick.catalog.store import open_engine

    with open_engine(db).connect() as conn:
        return {
            table.name: sorted(tuple(map(repr, row)) for row in conn.execute(sa.select(table)))
            for table in metadata.sorted_tables
        }


def sql_rows(db: str, query: str) -> list[tuple]:
    """Return the rows of a plain SQL query on the catalog ``db`` (either back-end)."""
    import sqlalchemy as sa

    from partpick.catalog.store import open_engine

    with open_engine(db).connect() as conn:
        return [tuple(row) for row in conn.execute(sa.text(query))]


@pytest.fixture
def catalog_dump() -> Callable[[str], dict[str, list[tuple]]]:
    """Function scope: the :func:`dump_catalog` helper."""
    return dump_catalog
