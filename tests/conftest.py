"""Shared fixtures: catalog databases (in memory and on disk), CSV writers and a CLI runner.

Every test runs with ``PARTPICK_DB`` pointing into its own temporary folder, so no test can
touch a user's ``./partpick.db``.
"""

from __future__ import annotations

import uuid
from collections.abc import Callable, Iterator
from pathlib import Path

import pytest
from typer.testing import CliRunner

from partpick.catalog.store import dispose_engines

CATALOG_DATA = Path(__file__).parent / "data" / "catalog"
BUNDLED_CATALOGS = Path(__file__).parents[1] / "catalogs"


@pytest.fixture(autouse=True)
def _isolated_catalog(tmp_path: Path, monkeypatch: pytest.MonkeyPatch) -> Iterator[None]:
    """Function scope: point the default catalog at a temporary file; close engines after."""
    monkeypatch.setenv("PARTPICK_DB", str(tmp_path / "default-partpick.db"))
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


@pytest.fixture
def catalog_dump() -> Callable[[str], dict[str, list[tuple]]]:
    """Function scope: the :func:`dump_catalog` helper."""
    return dump_catalog
