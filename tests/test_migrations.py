"""Schema upgrades in place: a catalog of an older version opens, upgrades and keeps every part.

The version-4 catalogs in ``tests/data/catalog/v4/`` were written by partpick with schema 4
(see the README there); each test runs on SQLite and on PostgreSQL.
"""

from __future__ import annotations

import sqlite3
from pathlib import Path

import pytest

from partpick.catalog import migrations
from partpick.catalog.columns import read_columns
from partpick.catalog.importer import import_catalog
from partpick.catalog.store import SCHEMA_VERSION, dispose_engines, list_batches, open_engine
from partpick.errors import DatabaseError
from tests.backends import new_catalog
from tests.conftest import CATALOG_DATA, sql_rows

V4 = CATALOG_DATA.parent / "catalog" / "v4"
V4_INDUCTORS = 6  # inductors_small.csv: six parts
V4_CAPACITORS = 4  # capacitors_small.csv: four parts


def _v4_catalog(backend: str, folder: Path) -> str:
    """Return a catalog restored from the version-4 dump of ``backend``, not yet opened."""
    db = new_catalog(backend, folder)
    if backend == "sqlite":
        with sqlite3.connect(db) as conn:
            conn.executescript((V4 / "catalog.sqlite.sql").read_text(encoding="utf-8"))
        return db
    from tests.backends import SERVER

    with SERVER[0].admin_of(db.rsplit("/", 1)[1]) as conn:
        conn.execute((V4 / "catalog.postgres.sql").read_text(encoding="utf-8"))
    return db


def _parts(db: str) -> dict[str, list[tuple]]:
    return {
        table: sorted(tuple(map(repr, row)) for row in sql_rows(db, f"SELECT * FROM {table}"))
        for table in ("parts_inductor", "parts_capacitor")
    }


def _version(db: str) -> str:
    (row,) = sql_rows(db, "SELECT value FROM catalog_meta WHERE key = 'schema_version'")
    return row[0]


def test_the_dumps_really_are_version_4(catalog_backend, tmp_path):
    db = _v4_catalog(catalog_backend, tmp_path)
    if catalog_backend == "sqlite":
        with sqlite3.connect(db) as conn:
            (version,) = conn.execute(
                "SELECT value FROM catalog_meta WHERE key = 'schema_version'"
            ).fetchone()
            columns = {r[1] for r in conn.execute("PRAGMA table_info(import_batches)")}
        assert version == "4" and "imported_by" not in columns
    else:
        text = (V4 / "catalog.postgres.sql").read_text(encoding="utf-8")
        assert "('schema_version', '4')" in text and "imported_by" not in text


def test_step_4_to_5_upgrades_in_place_and_keeps_every_part(catalog_backend, tmp_path):
    db = _v4_catalog(catalog_backend, tmp_path)
    first = open_engine(db)  # opening upgrades
    assert _version(db) == SCHEMA_VERSION == "5"
    parts = _parts(db)
    assert len(parts["parts_inductor"]) == V4_INDUCTORS
    assert len(parts["parts_capacitor"]) == V4_CAPACITORS
    assert [b.imported_by for b in list_batches(db)] == [None, None]  # unknown before 5
    assert sorted(read_columns(db, "inductor", ["isat_a"])["isat_a"]) == pytest.approx(
        [1.9, 3.1, 4.4, 4.6, 6.8, 9.5]  # the Isat column of inductors_small.csv
    )
    dispose_engines()
    assert open_engine(db) is not first and _version(db) == "5"  # a second open: no step
    assert _parts(db) == parts


def test_an_upgraded_catalog_takes_new_imports(catalog_backend, tmp_path):
    db = _v4_catalog(catalog_backend, tmp_path)
    (report,) = import_catalog(db, [CATALOG_DATA / "inductors_small.csv"], "inductor")
    # the same six parts: matched in place (a value parsed more exactly today may update)
    assert report.added == 0 and report.updated + report.unchanged == V4_INDUCTORS
    assert len(_parts(db)["parts_inductor"]) == V4_INDUCTORS
    assert list_batches(db)[-1].imported_by  # who imported it is now recorded


def test_a_failing_step_leaves_the_version_4_catalog_as_it_was(
    catalog_backend, tmp_path, monkeypatch
):
    db = _v4_catalog(catalog_backend, tmp_path)
    step, target = migrations.STEPS["4"]

    def failing(conn):
        step(conn)
        raise RuntimeError("injected failure after the step's DDL")

    monkeypatch.setitem(migrations.STEPS, "4", (failing, target))
    with pytest.raises(RuntimeError):
        open_engine(db)
    dispose_engines()
    monkeypatch.undo()
    open_engine(db)  # the real step then runs on the untouched catalog
    assert _version(db) == "5" and len(_parts(db)["parts_inductor"]) == V4_INDUCTORS


@pytest.mark.parametrize(
    ("version", "wording"),
    [("3", "early partpick"), ("1", "early partpick"), ("6", "newer partpick")],
)
def test_a_version_without_a_path_is_refused(catalog_backend, tmp_path, version, wording):
    db = new_catalog(catalog_backend, tmp_path)
    engine = open_engine(db)
    with engine.begin() as conn:
        conn.exec_driver_sql(
            f"UPDATE catalog_meta SET value = '{version}' WHERE key = 'schema_version'"
        )
    dispose_engines()
    with pytest.raises(DatabaseError) as caught:
        open_engine(db)
    assert wording in caught.value.reason


@pytest.mark.postgres
def test_step_4_to_5_widens_whole_numbers_on_the_server(pg_server, tmp_path):
    db = _v4_catalog("postgres", tmp_path)
    query = (
        "SELECT data_type FROM information_schema.columns "
        "WHERE table_name = 'parts_inductor' AND column_name = 'stock'"
    )
    assert sql_rows(db, query) == [("bigint",)]  # sql_rows opens the catalog: upgraded
    (report,) = import_catalog(db, [CATALOG_DATA / "inductors_small.csv"], "inductor")
    assert report.added == 0
