"""The store: where the catalog lives, WAL mode, batches, counts, and the fast column reader."""

from __future__ import annotations

import json
import os
import sqlite3
import subprocess
import sys
from pathlib import Path

import numpy as np
import pytest

from partpick.catalog.columns import read_columns
from partpick.catalog.importer import import_catalog
from partpick.catalog.location import snapshot_file
from partpick.catalog.query import list_parts
from partpick.catalog.snapshot import SNAPSHOT_VERSION
from partpick.catalog.store import (
    count_parts,
    dispose_engines,
    list_batches,
    open_engine,
    resolve_db_url,
)
from partpick.errors import DatabaseError, NoCatalogError, NotFoundError
from tests.conftest import CATALOG_DATA

SMALL = CATALOG_DATA / "inductors_small.csv"


def test_db_option_wins(monkeypatch, tmp_path):
    monkeypatch.setenv("PARTPICK_DB", str(tmp_path / "env.db"))
    assert resolve_db_url(str(tmp_path / "opt.db")) == f"sqlite:///{tmp_path / 'opt.db'}"


def test_environment_comes_next(monkeypatch, tmp_path):
    monkeypatch.setenv("PARTPICK_DB", str(tmp_path / "env.db"))
    assert resolve_db_url(None) == f"sqlite:///{tmp_path / 'env.db'}"


def test_default_is_partpick_db_in_the_working_folder(monkeypatch, tmp_path):
    monkeypatch.delenv("PARTPICK_DB")
    monkeypatch.chdir(tmp_path)
    assert resolve_db_url(None) == f"sqlite:///{tmp_path.resolve() / 'partpick.db'}"


@pytest.mark.parametrize("url", ["sqlite://", "sqlite:////abs/x.db", "postgresql://u@h/db"])
def test_urls_are_kept(url):
    assert resolve_db_url(url) == url


def test_relative_path_becomes_absolute(monkeypatch, tmp_path):
    monkeypatch.chdir(tmp_path)
    assert resolve_db_url("sub/c.db") == f"sqlite:///{tmp_path.resolve() / 'sub' / 'c.db'}"


def test_file_catalog_runs_in_wal_mode(db_file):
    open_engine(db_file)
    mode = sqlite3.connect(db_file).execute("PRAGMA journal_mode").fetchone()[0]
    assert mode == "wal"


def test_in_memory_catalog_works_end_to_end(memory_db):
    (report,) = import_catalog(memory_db, [SMALL], "inductor")
    assert report.added == 6 and count_parts(memory_db)["inductor"] == 6
    columns = read_columns(memory_db, "inductor", ["isat_a"])  # the SQL fallback
    assert sorted(columns["isat_a"]) == pytest.approx([1.9, 3.1, 4.4, 4.6, 6.8, 9.5])


def test_a_file_that_is_no_database_is_a_database_error(tmp_path):
    bad = tmp_path / "notes.db"
    bad.write_text("these are my notes, not a database\n" * 100)
    with pytest.raises(DatabaseError):
        open_engine(str(bad))


def test_a_bad_url_is_a_database_error():
    with pytest.raises(DatabaseError):
        open_engine("nosuchdialect://x/y")


def test_batches_record_file_hash_time_and_counts(db_file):
    import hashlib

    import_catalog(db_file, [SMALL], "inductor")
    (batch,) = list_batches(db_file)
    assert batch.file == str(SMALL.resolve())
    assert batch.sha256 == hashlib.sha256(SMALL.read_bytes()).hexdigest()
    assert (batch.kind, batch.rows, batch.added, batch.rejected) == ("inductor", 6, 6, 0)
    assert batch.imported_at.endswith("+00:00")


def test_parts_carry_their_provenance(db_file):
    import hashlib

    import_catalog(db_file, [SMALL], "inductor")
    (part,) = list_parts(db_file, "inductor", ["mpn=QM-4R7-0630"], provenance=True)
    assert part["source_file"] == "inductors_small.csv"
    assert part["source_sha256"] == hashlib.sha256(SMALL.read_bytes()).hexdigest()
    assert part["imported_at"] == list_batches(db_file)[0].imported_at
    assert part["source_line"] == 4  # line 4 of the file: the header is line 1
    row = sqlite3.connect(db_file).execute(
        "SELECT kind, batch_id FROM parts_inductor WHERE mpn = 'QM-4R7-0630'"
    )
    assert row.fetchone() == ("inductor", 1)


def test_provenance_is_kept_once_per_batch_not_per_part(db_file):
    import_catalog(db_file, [SMALL], "inductor")
    columns = {r[1] for r in sqlite3.connect(db_file).execute("PRAGMA table_info(parts_inductor)")}
    assert {"source_line", "batch_id"} <= columns
    assert not {"source_file", "source_sha256", "imported_at"} & columns


def test_identity_is_unique_in_the_schema(db_file):
    import_catalog(db_file, [SMALL], "inductor")
    conn = sqlite3.connect(db_file)
    with pytest.raises(sqlite3.IntegrityError):
        conn.execute(
            "INSERT INTO parts_inductor (kind, manufacturer, mpn) "
            "VALUES ('inductor', 'Quillmark Magnetics', 'QM-4R7-0630')"
        )


def test_a_field_added_to_the_dictionary_is_added_to_an_old_catalog(db_file):
    open_engine(db_file)
    dispose_engines()
    conn = sqlite3.connect(db_file)
    conn.execute("ALTER TABLE parts_inductor DROP COLUMN srf_hz")  # an older schema
    conn.commit()
    conn.close()
    import_catalog(db_file, [SMALL], "inductor")
    assert read_columns(db_file, "inductor", ["srf_hz"])["srf_hz"][2] == pytest.approx(38e6)


# --- read_columns ----------------------------------------------------------------------


def test_read_columns_types_and_missing_values(db_file):
    import_catalog(db_file, [SMALL], "inductor")
    cols = read_columns(db_file, "inductor")
    assert list(cols)[:2] == ["mpn", "manufacturer"]
    assert cols["mpn"].dtype == object and cols["mpn"][0] == "QM-1R0-0630"  # file order
    assert cols["isat_a"].dtype == np.float64
    assert cols["stock"].dtype == np.float64 and np.isnan(cols["stock"][5])  # "N/A"
    assert cols["shielded"].dtype == object and cols["shielded"][5] is False
    assert cols["lifecycle"][3] == "nrnd" and cols["package"].dtype == object
    assert np.isnan(cols["srf_hz"][5]) and cols["srf_hz"][2] == pytest.approx(38e6)


def test_missing_values_are_none_in_object_columns(db_file, write_csv):
    import_catalog(
        db_file, [write_csv("MPN,Inductance,Shielded,Package\nQM-1,1 uH,,\n")], "inductor"
    )
    cols = read_columns(db_file, "inductor", ["shielded", "package", "lifecycle"])
    assert cols["shielded"][0] is None and cols["package"][0] is None
    assert cols["lifecycle"][0] is None and cols["manufacturer"][0] == ""


def test_snapshot_is_written_at_import_and_used(db_file):
    import_catalog(db_file, [SMALL], "inductor")
    snapshot = snapshot_file(Path(db_file), "inductor")
    assert snapshot.exists()
    stamp = np.load(snapshot)["__meta__"].tolist()
    generation = (
        sqlite3.connect(db_file)
        .execute("SELECT value FROM catalog_meta WHERE key = 'generation.inductor'")
        .fetchone()[0]
    )
    assert stamp[1] == generation


def test_importing_one_kind_leaves_the_other_kinds_snapshots_fresh(db_file, write_csv, monkeypatch):
    import_catalog(db_file, [SMALL], "inductor")
    inductor_snapshot = snapshot_file(Path(db_file), "inductor").read_bytes()
    import_catalog(
        db_file, [write_csv("MPN,Capacitance,Voltage Rating\nOC-1,10 uF,50 V\n")], "capacitor"
    )
    assert snapshot_file(Path(db_file), "inductor").read_bytes() == inductor_snapshot
    from partpick.catalog import columns

    def no_rebuild(*args):
        raise AssertionError("the inductor snapshot was taken for stale")

    monkeypatch.setattr(columns, "write_snapshot", no_rebuild)
    assert len(read_columns(db_file, "inductor")["mpn"]) == 6  # the rows of inductors_small.csv


def test_stale_snapshot_is_rebuilt(db_file, write_csv, monkeypatch):
    import_catalog(db_file, [SMALL], "inductor")
    from partpick.catalog import importer

    monkeypatch.setattr(importer, "_refresh_snapshot", lambda *args: None)  # leave it stale
    text = SMALL.read_text(encoding="utf-8").replace("4.6 A", "5.0 A")
    import_catalog(db_file, [write_csv(text)], "inductor")
    assert read_columns(db_file, "inductor", ["isat_a"])["isat_a"][2] == pytest.approx(5.0)


def test_snapshot_of_another_database_is_not_reused(db_file, write_csv):
    import_catalog(db_file, [SMALL], "inductor")
    snapshot = snapshot_file(Path(db_file), "inductor")
    kept = snapshot.read_bytes()
    dispose_engines()
    for suffix in ("", "-wal", "-shm"):
        Path(db_file + suffix).unlink(missing_ok=True)
    import_catalog(db_file, [write_csv("MPN,Inductance\nQM-9,9 uH\n")], "inductor")
    snapshot.write_bytes(kept)  # same generation number, different catalog
    assert list(read_columns(db_file, "inductor")["mpn"]) == ["QM-9"]


@pytest.mark.parametrize("damage", ["delete", "garbage"])
def test_missing_or_damaged_snapshot_is_rebuilt(db_file, damage):
    import_catalog(db_file, [SMALL], "inductor")
    snapshot = snapshot_file(Path(db_file), "inductor")
    if damage == "delete":
        snapshot.unlink()
    else:
        snapshot.write_bytes(b"not an npz file")
    assert len(read_columns(db_file, "inductor")["mpn"]) == 6
    meta = list(np.load(snapshot)["__meta__"])
    assert meta[1:3] == ["1", SNAPSHOT_VERSION] and {"mpn", "isat_a"} <= set(meta[3:])


def test_read_columns_of_a_catalog_that_does_not_exist_is_refused(tmp_path):
    with pytest.raises(NoCatalogError, match="import first"):
        read_columns(str(tmp_path / "absent.db"), "capacitor", ["esr_ohm"])
    assert not (tmp_path / "absent.db").exists()


@pytest.mark.parametrize(("kind", "names"), [("resistor", None), ("inductor", ["esr_ohm"])])
def test_read_columns_refuses_unknown_kinds_and_fields(db_file, kind, names):
    with pytest.raises(NotFoundError):
        read_columns(db_file, kind, names)


def test_fresh_snapshot_read_imports_neither_pandas_nor_sqlalchemy(db_file):
    import_catalog(db_file, [SMALL], "inductor")
    code = (
        "import sys, json\n"
        "from partpick.catalog.columns import read_columns\n"
        f"cols = read_columns({db_file!r}, 'inductor', ['isat_a'])\n"
        "print(json.dumps([len(cols['mpn']), 'pandas' in sys.modules, "
        "'sqlalchemy' in sys.modules]))\n"
    )
    env = {**os.environ, "PYTHONPATH": str(Path(__file__).parents[1])}
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, env=env)
    assert out.returncode == 0, out.stderr
    assert json.loads(out.stdout) == [6, False, False]


def _same_columns(left: dict, right: dict) -> bool:
    if list(left) != list(right):
        return False
    for name in left:
        a, b = left[name], right[name]
        if a.dtype != b.dtype or len(a) != len(b):
            return False
        if a.dtype == np.float64:
            if not np.array_equal(a, b, equal_nan=True):
                return False
        elif list(a) != list(b):
            return False
    return True


@pytest.mark.parametrize(
    "extra_lines",
    [
        "",  # a clean bulk load: the snapshot comes from the import's own columns
        "QM-1R0-0630,Quillmark Magnetics,again,1.0 uH,±20%,9.5 A,8.0 A,8.5 mOhm,90 MHz,0630,"
        "7.0 mm,6.6 mm,3.0 mm,Yes,$0.31,5200,Active\n",  # a repeat: rebuilt from the table
    ],
)
def test_snapshot_written_at_import_equals_one_rebuilt_from_the_table(
    db_file, write_csv, extra_lines
):
    path = write_csv(SMALL.read_text(encoding="utf-8") + extra_lines)
    import_catalog(db_file, [path], "inductor", chunk_rows=4)
    from_import = read_columns(db_file, "inductor")
    snapshot_file(Path(db_file), "inductor").unlink()
    rebuilt = read_columns(db_file, "inductor")
    assert len(rebuilt["mpn"]) == 6
    assert _same_columns(from_import, rebuilt)


def test_no_spill_files_are_left_behind(db_file, write_csv):
    import_catalog(db_file, [SMALL], "inductor")
    folder = snapshot_file(Path(db_file), "inductor").parent
    assert [p.name for p in folder.iterdir()] == ["inductor.npz"]


def test_a_catalog_of_another_schema_version_is_refused(db_file):
    open_engine(db_file)
    dispose_engines()
    conn = sqlite3.connect(db_file)
    conn.execute("UPDATE catalog_meta SET value = '1' WHERE key = 'schema_version'")
    conn.commit()
    conn.close()
    with pytest.raises(DatabaseError) as caught:
        open_engine(db_file)
    assert "new catalog file" in caught.value.reason
