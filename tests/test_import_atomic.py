"""Atomicity: a failure or an interruption at any point of an import leaves the catalog as it was.

Each test fills a catalog, takes a full dump (every table, every column), injects a failure
inside a later import and compares the dump afterwards.
"""

from __future__ import annotations

import pytest

from partpick.catalog import merge, reading
from partpick.catalog.importer import import_catalog
from tests.conftest import CATALOG_DATA

SMALL = CATALOG_DATA / "inductors_small.csv"


class Injected(RuntimeError):
    """The failure the tests inject."""


def _changed_copy(write_csv):
    text = SMALL.read_text(encoding="utf-8").replace("4.6 A", "4.9 A")
    text += "QM-680-1040,Quillmark Magnetics,choke,68 uH,±20%,2.4 A,2.1 A,150 mOhm,,1040,"
    text += "10.5 mm,10.0 mm,4.0 mm,Yes,0.55,100,Active\n"
    return write_csv(text, "changed.csv")


def _fail_on_call(monkeypatch, module, name, call_number, error=Injected):
    original = getattr(module, name)
    calls = {"n": 0}

    def failing(*args, **kwargs):
        calls["n"] += 1
        if calls["n"] == call_number:
            raise error("injected failure")
        return original(*args, **kwargs)

    monkeypatch.setattr(module, name, failing)
    return calls


@pytest.mark.parametrize(
    ("module", "name", "call_number"),
    [
        (merge, "upsert_rows", 2),  # after the first chunk went into the parts table
        (merge.DuplicateFinder, "split", 3),  # while checking a later chunk
        (merge, "count_changes", 1),  # after every chunk was written
        (merge, "_upsert_sql", 2),  # building the statement of the second chunk
        (reading, "_validate", 3),  # while reading a later chunk
    ],
)
def test_failure_midway_leaves_the_catalog_unchanged(
    db_file, write_csv, catalog_dump, monkeypatch, module, name, call_number
):
    import_catalog(db_file, [SMALL], "inductor")
    before = catalog_dump(db_file)
    changed = _changed_copy(write_csv)
    calls = _fail_on_call(monkeypatch, module, name, call_number)
    with pytest.raises(Injected):
        import_catalog(db_file, [changed], "inductor", chunk_rows=2)
    assert calls["n"] >= call_number  # the failure really happened midway
    assert catalog_dump(db_file) == before


def test_interruption_leaves_the_catalog_unchanged(db_file, write_csv, catalog_dump, monkeypatch):
    import_catalog(db_file, [SMALL], "inductor")
    before = catalog_dump(db_file)
    _fail_on_call(monkeypatch, merge, "upsert_rows", 2, KeyboardInterrupt)
    with pytest.raises(KeyboardInterrupt):
        import_catalog(db_file, [_changed_copy(write_csv)], "inductor", chunk_rows=2)
    assert catalog_dump(db_file) == before


def test_failure_in_the_second_file_undoes_the_first(db_file, write_csv, catalog_dump, monkeypatch):
    before = catalog_dump(db_file)
    # count_changes runs once per file; the second call fails after the first file is written
    _fail_on_call(monkeypatch, merge, "count_changes", 2)
    with pytest.raises(Injected):
        import_catalog(db_file, [SMALL, _changed_copy(write_csv)], "inductor")
    assert catalog_dump(db_file) == before


def test_after_a_failure_the_same_import_succeeds(db_file, write_csv, monkeypatch):
    import_catalog(db_file, [SMALL], "inductor")
    changed = _changed_copy(write_csv)
    _fail_on_call(monkeypatch, merge, "upsert_rows", 1)
    with pytest.raises(Injected):
        import_catalog(db_file, [changed], "inductor")
    monkeypatch.undo()
    (report,) = import_catalog(db_file, [changed], "inductor")
    assert (report.added, report.updated, report.unchanged) == (1, 1, 5)


def test_failure_during_a_bulk_load_restores_the_identity_index(
    db_file, write_csv, catalog_dump, monkeypatch
):
    import sqlite3

    import_catalog(db_file, [CATALOG_DATA / "capacitors_small.csv"], "capacitor")
    before = catalog_dump(db_file)  # no inductors yet: the next import is a bulk load
    _fail_on_call(monkeypatch, merge, "insert_rows", 2)
    with pytest.raises(Injected):
        import_catalog(db_file, [SMALL], "inductor", chunk_rows=2)
    assert catalog_dump(db_file) == before
    names = {row[0] for row in sqlite3.connect(db_file).execute(
        "SELECT name FROM sqlite_master WHERE type = 'index'")}  # fmt: skip
    assert "uq_inductor_identity" in names


def test_failure_while_rebuilding_the_index_leaves_the_catalog_unchanged(
    db_file, catalog_dump, monkeypatch
):
    before = catalog_dump(db_file)
    _fail_on_call(monkeypatch, merge, "rebuild_identity_index", 1)
    with pytest.raises(Injected):
        import_catalog(db_file, [SMALL], "inductor")
    assert catalog_dump(db_file) == before
