"""kill -9 at five points of a 300,000-row import: all or nothing, intact, nothing left behind.

The kill points are events, not times, so the test neither races a slow machine nor waits
on a fast one: the spill folder appears; it holds rows; the WAL has grown; the spill is
large; the transaction has committed. After each kill the catalog must pass SQLite's
integrity check and hold none or all of the batch, and the next command must leave no
spill folder behind.
"""

from __future__ import annotations

import contextlib
import signal
import sqlite3
import subprocess
import sys
import time
from collections.abc import Callable
from pathlib import Path

import pytest

ROWS = 300_000
SCRIPTS = Path(__file__).parents[1] / "scripts"
SPEC = Path(__file__).parent / "data" / "bom" / "spec.toml"
ENTRY = "import sys; from partpick.cli import main; sys.argv[0] = 'partpick'; main()"


def _spill_bytes(columns: Path) -> int | None:
    spills = list(columns.glob(".inductor-build-*")) if columns.is_dir() else []
    if not spills:
        return None
    return sum(f.stat().st_size for s in spills for f in s.glob("*") if f.is_file())


def _committed(db: Path) -> bool:
    with contextlib.suppress(sqlite3.Error), contextlib.closing(
        sqlite3.connect(f"file:{db}?mode=ro", uri=True)
    ) as conn:
        row = conn.execute("SELECT value FROM catalog_meta WHERE key = 'generation.inductor'")
        return (row.fetchone() or ("0",))[0] != "0"
    return False


def _wal_bytes(db: Path) -> int:
    wal = db.with_name(db.name + "-wal")
    return wal.stat().st_size if wal.exists() else 0


def kill_points(db: Path) -> list[tuple[str, Callable[[], bool]]]:
    columns = db.with_name(db.name + ".columns")
    return [
        ("spill folder made", lambda: _spill_bytes(columns) is not None),
        ("rows spilled", lambda: (_spill_bytes(columns) or 0) > 2_000_000),
        ("WAL grown", lambda: _wal_bytes(db) > 8_000_000),
        ("spill large", lambda: (_spill_bytes(columns) or 0) > 20_000_000),
        ("committed", lambda: _committed(db)),
    ]


def import_until(csv: Path, db: Path, event: Callable[[], bool]) -> bool:
    """Run the import and kill -9 it when ``event`` holds; return True if it was killed."""
    process = subprocess.Popen(
        [sys.executable, "-c", ENTRY, "import", str(csv), "--kind", "inductor", "--db", str(db)],
        stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL,
    )  # fmt: skip
    try:
        while process.poll() is None:
            if event():
                process.send_signal(signal.SIGKILL)
                process.wait()
                return True
            time.sleep(0.005)
        return False
    finally:
        if process.poll() is None:
            process.kill()
            process.wait()


def count_and_check(db: Path) -> int:
    with contextlib.closing(sqlite3.connect(db)) as conn:
        assert conn.execute("PRAGMA integrity_check").fetchone()[0] == "ok"
        return conn.execute("SELECT count(*) FROM parts_inductor").fetchone()[0]


@pytest.fixture(scope="module")
def big_catalog(tmp_path_factory) -> Path:
    """Module scope: an invented 300,000-row inductor catalog (scripts/gen_catalog.py)."""
    out = tmp_path_factory.mktemp("kill") / "inductors.csv"
    subprocess.run(
        [sys.executable, str(SCRIPTS / "gen_catalog.py"), "--kind", "inductor",
         "--rows", str(ROWS), "--layout", "clean", "--out", str(out)],
        check=True, capture_output=True,
    )  # fmt: skip
    return out


def test_kill_at_five_points_of_a_big_import(big_catalog, tmp_path):
    db = tmp_path / "catalog.db"
    # a committed catalog to start from, so the inductor import is a bulk load into it
    capacitors = tmp_path / "caps.csv"
    capacitors.write_text("Mfr Part Number,Capacitance,Voltage Rating\nKC-1,10 uF,50 V\n")
    seeded = subprocess.run([sys.executable, "-c", ENTRY, "import", str(capacitors), "--kind",
                             "capacitor", "--db", str(db)], capture_output=True)  # fmt: skip
    assert seeded.returncode == 0, seeded.stderr
    for name, event in kill_points(db):
        killed = import_until(big_catalog, db, event)
        count = count_and_check(db)
        assert count in (0, ROWS), (name, count)  # all of the batch or none of it
        if name == "committed":
            assert count == ROWS
        elif killed:
            assert count == 0, name
        # the next command sweeps what the killed import left
        pick = subprocess.run(
            [sys.executable, "-c", ENTRY, "pick", str(SPEC), "--role", "inductor", "--top", "1",
             "--db", str(db)], capture_output=True, text=True,
        )  # fmt: skip
        assert pick.returncode == 0, (name, pick.stderr)
        assert "Traceback" not in pick.stderr
        columns = db.with_name(db.name + ".columns")
        assert not list(columns.glob(".inductor-build-*")), name


@pytest.mark.parametrize("point", ["rows spilled", "committed"])
def test_ctrl_c_says_whether_the_import_was_committed(big_catalog, tmp_path, point):
    db = tmp_path / "catalog.db"
    event = dict(kill_points(db))[point]
    process = subprocess.Popen(
        [sys.executable, "-c", ENTRY, "import", str(big_catalog), "--kind", "inductor",
         "--db", str(db)], stdout=subprocess.DEVNULL, stderr=subprocess.PIPE, text=True,
    )  # fmt: skip
    while process.poll() is None and not event():
        time.sleep(0.005)
    if process.poll() is None:
        process.send_signal(signal.SIGINT)
    _, stderr = process.communicate(timeout=120)
    assert "Traceback" not in stderr
    count = count_and_check(db)
    if process.returncode == 130:
        if count == ROWS:
            assert "after the import was committed" in stderr
        else:
            assert count == 0 and "the catalog was not changed" in stderr
    else:  # the import finished before the signal landed
        assert process.returncode == 0 and count == ROWS
    if point == "rows spilled":
        assert process.returncode == 130 and count == 0
