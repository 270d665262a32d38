"""Every command checks the catalog the same way; reading needs no write access."""

from __future__ import annotations

import os
import sqlite3
import stat
import time
from pathlib import Path

import pytest
from typer.testing import CliRunner

from partpick.catalog.location import snapshot_file
from partpick.cli import app
from tests.test_outputs import needs_nobody, open_tmp, run_as_nobody  # noqa: F401

BOM_DATA = Path(__file__).parent / "data" / "bom"
SPEC = BOM_DATA / "spec.toml"
READERS = (
    ("parts", "--kind", "inductor"),
    ("batches",),
    ("pick", str(SPEC), "--role", "inductor"),
    ("bom", str(SPEC)),
    ("verify", str(SPEC), "--inductor", "BT-L150A", "--output-cap", "BT-C106A50",
     "--diode", "BT-D340", "--switch", "BT-N4020"),
)  # fmt: skip


def invoke(*args: str):
    return CliRunner().invoke(app, list(args))


def imported(db: str, kinds=("inductor", "capacitor", "diode", "mosfet")) -> str:
    names = {"inductor": "inductors", "capacitor": "capacitors", "diode": "diodes",
             "mosfet": "mosfets"}  # fmt: skip
    for kind in kinds:
        result = invoke("import", str(BOM_DATA / f"{names[kind]}.csv"), "--kind", kind, "--db", db)
        assert result.exit_code == 0, result.output
    return db


@pytest.mark.parametrize("command", READERS, ids=lambda c: c[0])
def test_a_missing_catalog_is_refused_and_not_created(tmp_path, command):
    db = tmp_path / "typo.db"
    result = invoke(*command, "--db", str(db))
    assert result.exit_code == 2, result.output
    assert f"no catalog at {db}" in result.output and "import first" in result.output
    assert not db.exists()


@pytest.mark.parametrize(
    "command",
    [*READERS, ("import", str(BOM_DATA / "inductors.csv"), "--kind", "inductor")],
    ids=lambda c: c[0],
)
def test_another_programs_database_is_left_alone(tmp_path, command):
    db = tmp_path / "crm.db"
    with sqlite3.connect(db) as conn:
        conn.execute("CREATE TABLE customers (id INTEGER PRIMARY KEY, name TEXT)")
    result = invoke(*command, "--db", str(db))
    assert result.exit_code == 2, result.output
    assert "holds other tables (customers)" in result.output
    with sqlite3.connect(db) as conn:
        tables = [r[0] for r in conn.execute("SELECT name FROM sqlite_master WHERE type='table'")]
    assert tables == ["customers"]


@pytest.mark.parametrize("command", READERS, ids=lambda c: c[0])
def test_a_catalog_of_another_schema_version_is_refused_by_every_reader(tmp_path, command):
    db = imported(str(tmp_path / "old.db"))
    with sqlite3.connect(db) as conn:
        conn.execute("UPDATE catalog_meta SET value = '3' WHERE key = 'schema_version'")
    result = invoke(*command, "--db", db)
    assert result.exit_code == 2, result.output
    assert "schema 3" in result.output


def test_a_file_that_is_no_database_is_a_message(tmp_path):
    db = tmp_path / "notes.db"
    db.write_text("just some text, not SQLite")
    result = invoke("pick", str(SPEC), "--role", "inductor", "--db", str(db))
    assert result.exit_code == 2
    assert "not a readable SQLite catalog" in result.output


def test_a_snapshot_of_another_column_list_is_rebuilt(tmp_path):
    db = imported(str(tmp_path / "cat.db"), kinds=("inductor",))
    invoke("pick", str(SPEC), "--role", "inductor", "--db", db)  # snapshot written
    with sqlite3.connect(db) as conn:  # a hand edit: drop a column, same generation
        conn.execute("ALTER TABLE parts_inductor DROP COLUMN description")
    result = invoke("pick", str(SPEC), "--role", "inductor", "--db", db)
    assert result.exit_code == 0, result.output
    with sqlite3.connect(db) as conn:  # the column was put back (the file is writable)
        columns = [r[1] for r in conn.execute("PRAGMA table_info(parts_inductor)")]
    assert "description" in columns


def test_a_bad_stored_value_is_a_message_naming_the_part(tmp_path):
    db = imported(str(tmp_path / "cat.db"), kinds=("inductor",))
    with sqlite3.connect(db) as conn:
        conn.execute("UPDATE parts_inductor SET isat_a = 'lots' WHERE mpn = 'BT-L150A'")
    snapshot_file(Path(db), "inductor").unlink()  # a hand edit bumps no generation
    result = invoke("pick", str(SPEC), "--role", "inductor", "--db", db)
    assert result.exit_code == 2, result.output
    assert "'BT-L150A'" in result.output and "isat_a" in result.output
    assert "Traceback" not in result.output


def test_snapshots_follow_the_catalog_files_mode(tmp_path):
    db = tmp_path / "cat.db"
    imported(str(db), kinds=("inductor",))
    db.chmod(0o640)
    imported(str(db), kinds=("inductor",))  # re-import: the snapshot is rewritten
    snapshot = snapshot_file(db, "inductor")
    assert stat.S_IMODE(snapshot.stat().st_mode) == 0o640
    db.chmod(0o644)
    with sqlite3.connect(db) as conn:  # a new generation: the reader rewrites the snapshot
        conn.execute("UPDATE catalog_meta SET value = value + 1 WHERE key = 'generation.inductor'")
    assert invoke("parts", "--kind", "inductor", "--db", str(db)).exit_code == 0
    assert invoke("pick", str(SPEC), "--role", "inductor", "--db", str(db)).exit_code == 0
    assert stat.S_IMODE(snapshot.stat().st_mode) == 0o644


def test_a_killed_imports_spill_folder_is_swept_at_the_next_open(tmp_path):
    db = tmp_path / "cat.db"
    imported(str(db), kinds=("inductor",))
    leftover = snapshot_file(db, "inductor").parent / ".inductor-build-dead1234"
    leftover.mkdir()
    (leftover / "isat_a").write_bytes(b"\0" * 1024)
    old = time.time() - 3600
    os.utime(leftover, (old, old))
    result = invoke("pick", str(SPEC), "--role", "inductor", "--db", str(db))
    assert result.exit_code == 0, result.output
    assert not leftover.exists()


@needs_nobody
def test_a_catalog_in_a_read_only_folder_can_be_read_by_a_teammate(open_tmp):  # noqa: F811
    folder = open_tmp / "shared"
    folder.mkdir()
    db = folder / "team.db"
    imported(str(db))
    for path in [db, *folder.rglob("*")]:
        path.chmod(0o755 if path.is_dir() else 0o644)
    spec = open_tmp / "spec.toml"
    spec.write_bytes(SPEC.read_bytes())
    spec.chmod(0o644)
    snapshot = snapshot_file(db, "inductor")
    snapshot.unlink()  # the teammate must build it in memory: the folder is not theirs
    folder.chmod(0o555)
    try:
        pick = run_as_nobody("pick", str(spec), "--role", "inductor", "--db", str(db),
                             cwd=open_tmp)  # fmt: skip
        assert pick.returncode == 0, pick.stderr
        assert "BT-L150A" in pick.stdout
        parts = run_as_nobody("parts", "--kind", "diode", "--db", str(db), cwd=open_tmp)
        assert parts.returncode == 0, parts.stderr
        assert "BT-D340" in parts.stdout
        denied = run_as_nobody("import", str(BOM_DATA / "inductors.csv"), "--kind", "inductor",
                               "--db", str(db), cwd=open_tmp)  # fmt: skip
        assert denied.returncode == 2, denied.stderr
        assert "Traceback" not in denied.stderr
    finally:
        folder.chmod(0o755)
