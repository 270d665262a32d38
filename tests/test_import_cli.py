"""The import and batches commands: output, exit codes, the rejects file."""

from __future__ import annotations

import csv
import io
from pathlib import Path

import pytest
from rich.console import Console

from partpick.catalog.importer import import_catalog
from partpick.catalog.store import count_parts
from partpick.cli import app
from partpick.render.catalog import neutralise_cell, render_import_reports
from tests.conftest import CATALOG_DATA

SMALL = CATALOG_DATA / "inductors_small.csv"
WITH_REJECTS = (
    "Part Number,Inductance,Saturation Current,Bin\n"
    "QM-1,4.7 uH,4.6 A,R1\n"
    "=HYPERLINK(1),10 uF,3 A,R2\n"  # a formula-looking part number with a bad value
    "QM-3,10 uH,@SUM(A1),R3\n"
    "QM-4,22 uH,2.1 A,R4\n"
)


def test_import_prints_a_summary(runner, db_file):
    result = runner.invoke(app, ["import", str(SMALL), "--kind", "inductor", "--db", db_file])
    assert result.exit_code == 0, result.output
    assert "Import summary" in result.output and "inductors_small.csv" in result.output
    for word in ("added", "updated", "unchanged", "rejected"):
        assert word in result.output
    assert count_parts(db_file)["inductor"] == 6


def test_import_lists_unrecognised_columns_and_first_rejects(runner, db_file, write_csv):
    path = write_csv(WITH_REJECTS)
    result = runner.invoke(app, ["import", str(path), "--kind", "inductor", "--db", db_file])
    assert result.exit_code == 0, result.output
    assert "unrecognised columns" in result.output and "'Bin'" in result.output
    assert "First rejects" in result.output and "capacitance" in result.output


def test_rejects_file_has_the_four_columns_and_neutralised_cells(
    runner, db_file, write_csv, tmp_path
):
    out = tmp_path / "rejects.csv"
    args = ["import", str(write_csv(WITH_REJECTS)), "--kind", "inductor", "--db", db_file]
    result = runner.invoke(app, [*args, "--rejects", str(out)])
    assert result.exit_code == 0, result.output
    rows = list(csv.reader(io.StringIO(out.read_text(encoding="utf-8"))))
    assert rows[0] == ["line", "column", "value", "reason"]
    assert [(r[0], r[1], r[2]) for r in rows[1:]] == [
        ("3", "Inductance", "10 uF"),
        ("4", "Saturation Current", "'@SUM(A1)"),  # OWASP CSV injection: quoted
    ]


@pytest.mark.parametrize(
    ("text", "safe"),
    [("=1+2", "'=1+2"), ("+1", "'+1"), ("-1", "'-1"), ("@A1", "'@A1"), ("\tx", "'\tx"),
     ("\rx", "'\rx"), ("QM-1", "QM-1"), ("", "")],
)  # fmt: skip
def test_neutralise_cell(text, safe):
    assert neutralise_cell(text) == safe


def test_strict_exits_1_imports_nothing_and_still_writes_rejects(
    runner, db_file, write_csv, tmp_path
):
    out = tmp_path / "rejects.csv"
    args = ["import", str(write_csv(WITH_REJECTS)), "--kind", "inductor", "--db", db_file]
    result = runner.invoke(app, [*args, "--strict", "--rejects", str(out)])
    assert result.exit_code == 1, result.output
    assert "nothing was imported" in result.output and "Traceback" not in result.output
    assert count_parts(db_file)["inductor"] == 0
    assert len(list(csv.reader(io.StringIO(out.read_text(encoding="utf-8"))))) == 3


@pytest.mark.parametrize(
    ("args", "message"),
    [
        (["--kind", "resistor"], "no part kind 'resistor'"),
        ([], "--kind"),
        (["--kind", "inductor", "--map", "/nonexistent/map.toml"], "file not found"),
    ],
)
def test_import_bad_options_exit_2(runner, db_file, args, message):
    result = runner.invoke(app, ["import", str(SMALL), *args, "--db", db_file])
    assert result.exit_code == 2, result.output
    assert message in result.output and "Traceback" not in result.output


def test_database_in_a_missing_folder_exits_2(runner, tmp_path):
    db = str(tmp_path / "no" / "such" / "folder" / "c.db")
    result = runner.invoke(app, ["import", str(SMALL), "--kind", "inductor", "--db", db])
    assert result.exit_code == 2 and "does not exist" in result.output


def test_batches_lists_every_import(runner, db_file):
    for _ in range(2):
        runner.invoke(app, ["import", str(SMALL), "--kind", "inductor", "--db", db_file])
    result = runner.invoke(app, ["batches", "--db", db_file])
    assert result.exit_code == 0, result.output
    assert "Import batches" in result.output and result.output.count("inductor") >= 2


def test_batches_on_an_empty_catalog_says_how_to_start(runner, db_file):
    missing = runner.invoke(app, ["batches", "--db", db_file])
    assert missing.exit_code == 2 and "no catalog at" in missing.output
    assert "partpick import" in missing.output
    assert not Path(db_file).exists()  # only import creates a catalog
    from partpick.catalog.store import open_engine

    open_engine(db_file)
    result = runner.invoke(app, ["batches", "--db", db_file])
    assert result.exit_code == 0 and "partpick import" in result.output


def test_default_database_comes_from_the_environment(runner, tmp_path, monkeypatch):
    db = tmp_path / "from-env.db"
    monkeypatch.setenv("PARTPICK_DB", str(db))
    result = runner.invoke(app, ["import", str(SMALL), "--kind", "inductor"])
    assert result.exit_code == 0, result.output
    assert count_parts(str(db))["inductor"] == 6


def test_summary_renders_at_fixed_width(db_file):
    reports = import_catalog(db_file, [SMALL], "inductor")
    out = io.StringIO()
    render_import_reports(Console(file=out, width=100, color_system=None), reports)
    text = out.getvalue()
    assert (
        "│ inductors_small.csv │ inductor │    6 │     6 │       0 │         0 │        0 │" in text
    )
    assert "Saturation Current (Isat) → isat_a" in text


@pytest.mark.parametrize("command", ["import", "parts", "batches"])
def test_every_catalog_command_has_help(runner, command):
    result = runner.invoke(app, [command, "--help"])
    assert result.exit_code == 0, result.output
    assert "--db" in result.output


def test_progress_bar_only_on_a_terminal_for_big_files(db_file):
    from partpick.render.catalog import import_progress

    with import_progress(Console(file=io.StringIO()), 10**8) as hook:
        assert hook is None  # not a terminal: no bar
    out = io.StringIO()
    terminal = Console(file=out, force_terminal=True, width=100)
    with import_progress(terminal, 10) as hook:
        assert hook is None  # a small file needs no bar
    with import_progress(terminal, 10**8) as hook:
        import_catalog(db_file, [SMALL], "inductor", progress=hook)
    assert "importing inductors_small.csv" in out.getvalue()


def test_catalog_commands_load_pandas_and_sqlalchemy_only_when_run():
    import json
    import subprocess
    import sys

    code = (
        "import sys, json\n"
        "import partpick.cli.catalog, partpick.render.catalog\n"
        "print(json.dumps(['pandas' in sys.modules, 'sqlalchemy' in sys.modules]))\n"
    )
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True)
    assert out.returncode == 0, out.stderr
    assert json.loads(out.stdout) == [False, False]  # so `partpick pick` starts fast


def test_a_locked_catalog_is_a_clear_error(runner, db_file, monkeypatch):
    import sqlite3

    import sqlalchemy as sa

    from partpick.catalog import merge

    def locked(*args, **kwargs):
        raise sa.exc.OperationalError("INSERT", {}, sqlite3.OperationalError("database is locked"))

    monkeypatch.setattr(merge, "insert_rows", locked)
    result = runner.invoke(app, ["import", str(SMALL), "--kind", "inductor", "--db", db_file])
    assert result.exit_code == 2, result.output
    assert "database is locked" in result.output and "Traceback" not in result.output
    assert count_parts(db_file)["inductor"] == 0


def test_repeated_header_names_are_both_kept(db_file, write_csv):
    import json
    import sqlite3

    text = "MPN,Inductance,Bin,Bin\nQM-1,1 uH,A1,B2\n"
    (report,) = import_catalog(db_file, [write_csv(text)], "inductor")
    assert report.unrecognised == ("Bin", "Bin (2)")
    (extra,) = sqlite3.connect(db_file).execute("SELECT extra FROM parts_inductor").fetchone()
    assert json.loads(extra) == {"Bin": "A1", "Bin (2)": "B2"}


def test_the_console_script_keeps_exit_codes_output_and_a_whole_catalog(tmp_path):
    """main() ends the process without interpreter teardown; nothing may be lost by that."""
    import sqlite3
    import subprocess
    import sys

    db = tmp_path / "c.db"

    def run(*args: str) -> subprocess.CompletedProcess:
        code = "import sys; from partpick.cli import main; sys.argv[0] = 'partpick'; main()"
        return subprocess.run(
            [sys.executable, "-c", code, *args], capture_output=True, text=True, check=False
        )

    imported = run("import", str(SMALL), "--kind", "inductor", "--db", str(db))
    assert imported.returncode == 0, imported.stderr
    assert "inductors_small.csv" in imported.stdout
    listed = run("parts", "--kind", "inductor", "--format", "csv", "--db", str(db))
    assert listed.returncode == 0, listed.stderr
    with sqlite3.connect(db) as conn:
        stored = conn.execute("SELECT count(*) FROM parts_inductor").fetchone()[0]
    assert stored > 0
    assert len(listed.stdout.strip().splitlines()) == stored + 1  # every part, and the header
    missing = run("parts", "--kind", "inductor", "--db", str(tmp_path / "none.db"))
    assert missing.returncode == 2 and "import first" in missing.stderr  # pinned exit codes
