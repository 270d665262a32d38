"""The hostile-input corpus: every file in tests/data/hostile/ is one bad input or fault.

Each case is a TOML file (see tests/data/hostile/README.md) naming the command to run, the
files to set up, the exit code expected and a fragment of the message. Every case also
checks that no traceback appears and that nothing it marks as precious was changed.
"""

from __future__ import annotations

import json
import os
import sqlite3
import threading
import tomllib
from pathlib import Path

import pytest
from typer.testing import CliRunner

from partpick.cli import app

DATA = Path(__file__).parent / "data"
CASES = sorted((DATA / "hostile").glob("*.toml"))
BOM_KINDS = (("inductor", "inductors"), ("capacitor", "capacitors"), ("diode", "diodes"),
             ("mosfet", "mosfets"))  # fmt: skip


def test_the_corpus_is_large_enough():
    assert len(CASES) >= 60


def _fill(text: str, tmp: Path) -> str:
    return (
        text.replace("{tmp}", str(tmp))
        .replace("{db}", str(tmp / "c.db"))
        .replace("{data}", str(DATA))
        .replace("{spec}", str(DATA / "bom" / "spec.toml"))
    )


def _generated(kind: str) -> bytes:
    """Return the bytes of a generated file: ``wide:N`` columns or ``long:N`` bytes a cell."""
    what, _, size = kind.partition(":")
    count = int(size)
    if what == "wide":
        header = ["Mfr Part Number", "Inductance"] + [f"c{i}" for i in range(count - 2)]
        return (",".join(header) + "\nX-1,10 uH" + ",a" * (count - 2) + "\n").encode()
    if what == "long":
        return b"Mfr Part Number,Inductance,Description\nX-1,10 uH," + b"a" * count + b"\n"
    raise ValueError(kind)


def _set_up(case: dict, tmp: Path) -> None:
    runner = CliRunner()
    if case.get("catalog") == "bom":
        for kind, name in BOM_KINDS:
            result = runner.invoke(app, ["import", str(DATA / "bom" / f"{name}.csv"),
                                         "--kind", kind, "--db", str(tmp / "c.db")])  # fmt: skip
            assert result.exit_code == 0, result.output
    for name, text in case.get("files", {}).items():
        (tmp / name).write_text(_fill(text, tmp), encoding="utf-8")
    for name, text in case.get("files_cp1252", {}).items():
        (tmp / name).write_bytes(text.encode("cp1252"))
    for name, text in case.get("files_utf16", {}).items():
        (tmp / name).write_bytes(text.encode("utf-16"))
    for name, hexed in case.get("files_hex", {}).items():
        (tmp / name).write_bytes(bytes.fromhex(hexed))
    for name, kind in case.get("generate", {}).items():
        (tmp / name).write_bytes(_generated(kind))
    for name in case.get("folders", []):
        (tmp / name).mkdir()
    for name in case.get("fifos", []):
        os.mkfifo(tmp / name)
    for link, target in case.get("symlinks", {}).items():
        (tmp / link).symlink_to(_fill(target, tmp))
    for step in case.get("before", []):
        result = runner.invoke(app, [_fill(a, tmp) for a in step])
        assert result.exit_code in (0, 3), result.output
    _edit(case, tmp)


def _edit(case: dict, tmp: Path) -> None:
    for statement in case.get("sql", []):
        with sqlite3.connect(tmp / "c.db") as conn:
            conn.execute(statement)
    for edit in case.get("json_edit", []):
        path = tmp / edit["file"]
        document = json.loads(path.read_text(encoding="utf-8"))
        target = document
        if "role" in edit:
            line = next(x for x in document["lines"] if x["role"] == edit["role"])
            target = line["part"] if "field" in edit else line
        key = edit.get("field", edit.get("key"))
        if edit.get("delete"):
            target.pop(key, None)
        else:
            target[key] = edit["value"]
        path.write_text(json.dumps(document), encoding="utf-8")
    for name, mode in case.get("chmod", {}).items():
        (tmp / name).chmod(int(mode, 8))


def _feed_fifos(case: dict, tmp: Path) -> list[threading.Thread]:
    threads = []
    for name, text in case.get("fifo_input", {}).items():
        thread = threading.Thread(target=_write_fifo, args=(tmp / name, text), daemon=True)
        thread.start()
        threads.append(thread)
    return threads


def _write_fifo(path: Path, text: str) -> None:
    with open(path, "wb") as out:  # blocks until the import opens the FIFO
        out.write(text.encode())


def _snapshot(case: dict, tmp: Path) -> dict[str, bytes]:
    return {name: (tmp / name).read_bytes() for name in case.get("unchanged", [])}


@pytest.mark.parametrize("path", CASES, ids=lambda p: p.stem)
def test_hostile_case(path: Path, tmp_path: Path):
    case = tomllib.loads(path.read_text(encoding="utf-8"))
    assert case.get("about"), "every case says what it probes"
    _set_up(case, tmp_path)
    kept = _snapshot(case, tmp_path)
    threads = _feed_fifos(case, tmp_path)
    args = [_fill(a, tmp_path) for a in case["args"]]
    result = CliRunner().invoke(app, args, input=case.get("stdin"), env={"COLUMNS": "300"})
    for thread in threads:
        thread.join(timeout=5)
    output = result.output
    if result.exception is not None and not isinstance(result.exception, SystemExit):
        raise AssertionError(f"uncaught {result.exception!r}\n{output}") from result.exception
    assert result.exit_code == case["exit"], output
    for fragment in _list(case.get("message")):
        assert _fill(fragment, tmp_path) in output, output
    for fragment in ["Traceback", "\x1b", *_list(case.get("forbid"))]:
        assert _fill(fragment, tmp_path) not in output, output
    for name, before in kept.items():
        assert (tmp_path / name).read_bytes() == before, f"{name} was changed"
    for name in case.get("absent", []):
        assert not (tmp_path / name).exists(), f"{name} should not exist"
    for name, checks in case.get("expect_file", {}).items():
        text = (tmp_path / name).read_text(encoding="utf-8")
        for fragment in checks.get("contains", []):
            assert fragment in text, text
        for fragment in checks.get("forbid", []):
            assert fragment not in text, text


def _list(value) -> list[str]:
    if value is None:
        return []
    return [value] if isinstance(value, str) else list(value)
