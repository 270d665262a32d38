"""The light import path: an SQLite catalog file written through sqlite3, small files read
without pandas. The tables it creates must be the SQLAlchemy schema's, and the result the
same as through SQLAlchemy."""

from __future__ import annotations

import sqlite3
import subprocess
import sys
from pathlib import Path

from typer.testing import CliRunner

from partpick.catalog import sqlite_light
from partpick.catalog.importer import import_catalog
from partpick.catalog.query import list_parts
from partpick.catalog.store import dispose_engines, open_engine
from partpick.cli import app

DATA = Path(__file__).parent / "data" / "catalog"
SMALL = DATA / "inductors_small.csv"


def _layout(path: Path) -> dict:
    """Return every table's columns (name, type, not null, pk), indexes and foreign keys."""
    conn = sqlite3.connect(path)
    tables = [r[0] for r in conn.execute("SELECT name FROM sqlite_master WHERE type='table'")]
    layout = {}
    for table in sorted(tables):
        columns = [tuple(r[1:4]) + (r[5],) for r in conn.execute(f"PRAGMA table_info({table})")]
        indexes = sorted(
            (r[1], r[2], tuple(c[2] for c in conn.execute(f"PRAGMA index_info({r[1]})")))
            for r in conn.execute(f"PRAGMA index_list({table})")
        )
        keys = [tuple(r[2:5]) for r in conn.execute(f"PRAGMA foreign_key_list({table})")]
        layout[table] = (columns, indexes, keys)
    conn.close()
    return layout


def test_new_catalog_has_the_sqlalchemy_schema(tmp_path):
    by_sqlalchemy, by_sqlite3 = tmp_path / "a.db", tmp_path / "b.db"
    open_engine(str(by_sqlalchemy))
    dispose_engines()
    sqlite_light.connect(f"sqlite:///{by_sqlite3}", by_sqlite3).close()
    assert _layout(by_sqlite3) == _layout(by_sqlalchemy)
    meta = dict(sqlite3.connect(by_sqlite3).execute("SELECT key, value FROM catalog_meta"))
    assert (
        meta["schema_version"]
        == dict(sqlite3.connect(by_sqlalchemy).execute("SELECT key, value FROM catalog_meta"))[
            "schema_version"
        ]
    )


def test_file_catalog_and_in_memory_catalog_get_the_same_parts(tmp_path):
    # the file goes through sqlite3, the in-memory catalog through SQLAlchemy
    file_db = str(tmp_path / "c.db")
    memory_db = "sqlite://"
    (on_file,) = import_catalog(file_db, [SMALL], "inductor")
    (in_memory,) = import_catalog(memory_db, [SMALL], "inductor")
    assert (on_file.added, on_file.rejected) == (in_memory.added, in_memory.rejected)
    assert on_file.rejects == in_memory.rejects
    assert list_parts(file_db, "inductor") == list_parts(memory_db, "inductor")
    (again,) = import_catalog(file_db, [SMALL], "inductor")  # the upsert path, through sqlite3
    assert (again.added, again.updated, again.unchanged) == (0, 0, on_file.added)
    dispose_engines()


def test_an_import_opens_a_catalog_made_by_sqlalchemy(tmp_path):
    db = str(tmp_path / "d.db")
    open_engine(db)  # as any other command would create it
    dispose_engines()
    (report,) = import_catalog(db, [SMALL], "inductor")
    assert report.added > 0


def test_small_import_loads_neither_pandas_nor_sqlalchemy(tmp_path):
    # a fresh interpreter, as `partpick import` runs: a new catalog, then a re-import
    code = (
        "import sys\n"
        "from partpick.cli import app\n"
        f"for _ in range(2):\n"
        f"    try:\n"
        f"        app(['import', {str(SMALL)!r}, '--kind', 'inductor', '--db', "
        f"{str(tmp_path / 'e.db')!r}])\n"
        "    except SystemExit as done:\n"
        "        assert not done.code, done.code\n"
        "print(sorted(m for m in ('pandas', 'sqlalchemy') if m in sys.modules), file=sys.stderr)\n"
    )
    done = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True)
    assert done.returncode == 0, done.stderr
    assert done.stderr.strip().splitlines()[-1] == "[]"


def test_import_into_a_file_that_is_not_a_catalog_exits_2(tmp_path):
    db = tmp_path / "notes.db"
    db.write_text("these are my notes, not a database\n" * 100)
    result = CliRunner().invoke(app, ["import", str(SMALL), "--kind", "inductor", "--db", str(db)])
    assert result.exit_code == 2, result.output
    assert "cannot be opened" in result.output
