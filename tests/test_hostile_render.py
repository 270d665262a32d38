"""Catalog and spec text is data: every renderer gets a hostile corpus and prints it inert."""

from __future__ import annotations

import csv
import io
import json
import re
from pathlib import Path

import pytest
from rich.console import Console
from typer.testing import CliRunner

from partpick.cli import app
from partpick.render.safe_text import markdown_text, plain_text

BOM_DATA = Path(__file__).parent / "data" / "bom"
KINDS = {"inductor": "inductors", "capacitor": "capacitors", "diode": "diodes",
         "mosfet": "mosfets"}  # fmt: skip

HOSTILE = (
    "[/]",
    "[b]bold[/b]",
    "[link=https://example.invalid]hidden[/link]",
    "\x1b[2J\x1b[31mclear",
    "\x9b2Jcsi",
    "<img src=x onerror=alert(1)>",
    "<script>alert(1)</script>",
    "# heading",
    "pipe|and\nnewline",
    "\u202erevo",
)
RAW_CONTROLS = ("\x1b", "\x9b", "\u202e")


def _hostile_csv(source: Path, target: Path) -> None:
    """Copy a test catalog, giving every part a hostile maker and a hostile mpn suffix."""
    rows = list(csv.reader(io.StringIO(source.read_text(encoding="utf-8"))))
    out = io.StringIO()
    writer = csv.writer(out)
    writer.writerow(rows[0])
    for i, row in enumerate(rows[1:]):
        row[0] = f"{row[0]}{HOSTILE[i % len(HOSTILE)]}"
        row[1] = HOSTILE[(i + 3) % len(HOSTILE)]
        writer.writerow(row)
    target.write_text(out.getvalue(), encoding="utf-8")


@pytest.fixture
def hostile(tmp_path: Path) -> tuple[str, Path]:
    db = str(tmp_path / "hostile.db")
    for kind, name in KINDS.items():
        path = tmp_path / f"{name}.csv"
        _hostile_csv(BOM_DATA / f"{name}.csv", path)
        result = CliRunner().invoke(app, ["import", str(path), "--kind", kind, "--db", db])
        assert result.exit_code == 0, result.output
        assert not any(c in result.output for c in RAW_CONTROLS)
    spec = tmp_path / "spec.toml"
    text = (BOM_DATA / "spec.toml").read_text(encoding="utf-8")
    name = json.dumps("# heading <script>alert(1)</script> [b]x[/b] \x1b[2J")
    notes = json.dumps("\n# injected\n<img src=x onerror=alert(1)>|cell")
    text = text.replace('name = "bom test stage"', f"name = {name}\nnotes = {notes}")
    spec.write_text(text, encoding="utf-8")
    return db, spec


def run(*args: str):
    return CliRunner().invoke(app, list(args), env={"COLUMNS": "400"})


def assert_inert_terminal(output: str) -> None:
    assert "Traceback" not in output
    for control in RAW_CONTROLS:
        assert control not in output, repr(control)


def test_parts_table_prints_markup_and_escapes_as_text(hostile):
    db, _ = hostile
    result = run("parts", "--kind", "inductor", "--db", db)
    assert result.exit_code == 0, result.output
    assert_inert_terminal(result.output)
    assert "[/]" in result.output
    assert "[b]bold[/b]" in result.output
    assert "[link=https://example.invalid]hidden[/link]" in result.output
    assert "␛[2J" in result.output  # the escape is shown, not obeyed


@pytest.mark.parametrize("role", ["inductor", "output-cap", "diode", "switch"])
def test_pick_and_explain_are_inert(hostile, role):
    db, spec = hostile
    result = run("pick", str(spec), "--role", role, "--db", db)
    assert result.exit_code == 0, result.output
    assert_inert_terminal(result.output)
    mpn = {"inductor": "BT-L150A[/]", "output-cap": "BT-C106A50[/]",
           "diode": "BT-D340[/]", "switch": "BT-N4020[/]"}[role]  # fmt: skip
    explained = run("pick", str(spec), "--role", role, "--db", db, "--explain", mpn)
    assert explained.exit_code == 0, explained.output
    assert_inert_terminal(explained.output)


def test_bom_table_and_stress_are_inert(hostile):
    db, spec = hostile
    result = run("bom", str(spec), "--db", db)
    assert result.exit_code in (0, 3), result.output
    assert_inert_terminal(result.output)
    assert "[/]" in result.output
    stress = run("stress", str(spec))
    assert stress.exit_code == 0, stress.output
    assert_inert_terminal(stress.output)
    assert "[b]x[/b]" in stress.output


def test_markdown_report_carries_no_html_or_headings_from_data(hostile, tmp_path):
    db, spec = hostile
    out = tmp_path / "review.md"
    result = run("bom", str(spec), "--db", db, "--format", "md", "--output", str(out))
    assert result.exit_code in (0, 3), result.output
    text = out.read_text(encoding="utf-8")
    assert "<img" not in text and "<script" not in text
    assert "&lt;script&gt;" in text
    headings = [line for line in text.splitlines() if line.startswith("#")]
    assert not any("heading" in h or "injected" in h for h in headings[1:])
    assert headings[0].startswith("# Design review: \\# heading")
    widths: list[int] = []  # unescaped pipes per row of the current table
    for line in text.splitlines() + [""]:
        if line.startswith("|"):
            widths.append(len(re.findall(r"(?<!\\)\|", line)))
        elif widths:  # a table ended: every row kept the header's cell count
            assert set(widths) == {widths[0]}, widths
            widths = []


def test_every_renderer_survives_a_plain_rich_console(hostile):
    """Library users pass their own Console: markup in the data must still be text."""
    from partpick.bom import build_bom
    from partpick.catalog.query import list_parts
    from partpick.design.spec import load_spec
    from partpick.render.bom import render_bom_table
    from partpick.render.catalog import render_parts_table
    from partpick.screening.profiles import load_profile

    db, spec = hostile
    buffer = io.StringIO()
    console = Console(file=buffer, width=300, color_system=None)
    render_parts_table(console, "capacitor", list_parts(db, "capacitor", ()))
    bom = build_bom(db, load_spec(spec), profile=load_profile("standard"))
    render_bom_table(bom, console)
    assert "[/]" in buffer.getvalue()


@pytest.mark.parametrize("text", HOSTILE)
def test_the_escapers_leave_nothing_live(text):
    shown = plain_text(text)
    assert len(shown) == len(text)  # same length: styled spans stay in place
    assert not any(c in shown for c in RAW_CONTROLS)
    md = markdown_text(text)
    assert "<" not in md and "\n" not in md
    assert not md.startswith("#")
    assert "|" not in md.replace("\\|", "")


class _Terminal(io.StringIO):
    def isatty(self) -> bool:
        return True


def test_machine_output_is_inert_on_a_terminal_and_exact_in_a_pipe(monkeypatch):
    from partpick.cli.common import echo_data

    data = 'mpn,manufacturer\nX-1,"\x1b[2Jclear"\n'
    terminal = _Terminal()
    monkeypatch.setattr("sys.stdout", terminal)
    echo_data(data, nl=False)
    assert "\x1b" not in terminal.getvalue() and "␛[2J" in terminal.getvalue()
    pipe = io.StringIO()
    monkeypatch.setattr("sys.stdout", pipe)
    echo_data(data, nl=False)
    assert pipe.getvalue() == data  # a pipe or file gets the data byte for byte
