"""Full pick output a slice at a time: ``--format json``, ``--format jsonl`` and ``--messages``."""

from __future__ import annotations

import io
import json
import math
from pathlib import Path

import pytest
from typer.testing import CliRunner

from partpick.catalog.importer import import_catalog
from partpick.cli import app
from partpick.design.spec import load_spec
from partpick.render import pick_stream
from partpick.render.exports import tidy_number
from partpick.screening.pick import pick, rank_role
from partpick.screening.profiles import load_profile

DATA = Path(__file__).parent / "data" / "screening"
SPEC = str(DATA / "spec.toml")
runner = CliRunner()


@pytest.fixture(scope="module")
def db(tmp_path_factory) -> str:
    """A file database with the invented inductors and capacitors (module scope)."""
    path = str(tmp_path_factory.mktemp("pickstream") / "parts.db")
    import_catalog(path, [DATA / "inductors.csv"], "inductor")
    import_catalog(path, [DATA / "capacitors.csv"], "capacitor")
    return path


def run(*args: str):
    return runner.invoke(app, ["pick", SPEC, *args])


def _refuse(constant: str):
    raise AssertionError(f"{constant} in the JSON output")


def _number(value):
    """The figure as the JSON writers print it: 12 significant digits, NaN as null."""
    return None if value is None or not math.isfinite(value) else tidy_number(value)


@pytest.mark.parametrize("role", ["inductor", "output-cap"])
def test_streamed_entries_match_the_outcomes(db, role, monkeypatch):
    # two parts a slice, so every list crosses slice boundaries
    monkeypatch.setattr(pick_stream, "SLICE", 2)
    spec, profile = load_spec(SPEC), load_profile("standard")
    out = io.BytesIO()
    pick_stream.write_pick_json(rank_role(db, spec, role, profile=profile), out)
    data = json.loads(out.getvalue(), parse_constant=_refuse)  # NaN or Infinity is not JSON
    result = pick(db, spec, role, profile=profile)
    for name in ("passed", "unverified"):
        outcomes = getattr(result, name)
        assert [e["mpn"] for e in data[name]] == [o.mpn for o in outcomes]
        for entry, o in zip(data[name], outcomes, strict=True):
            assert entry["count"] == o.count
            assert entry["notes"] == list(o.notes)
            assert [c["rule"] for c in entry["checks"]] == [c.rule for c in o.checks]
            assert [c["stress"] for c in entry["checks"]] == [_number(c.stress) for c in o.checks]
            assert entry.get("missing", []) == list(o.missing)
    assert [e["mpn"] for e in data["failed"]] == [o.mpn for o in result.failed]
    for entry, o in zip(data["failed"], result.failed, strict=True):
        assert [r["rule"] for r in entry["reasons"]] == [c.rule for c in o.failing]
        assert [r["limit"] for r in entry["reasons"]] == [_number(c.limit) for c in o.failing]
    assert data["counts"] == result.counts and data["total"] == result.total


def test_messages_option_adds_the_sentences(db):
    plain = json.loads(run("--role", "inductor", "--db", db, "--format", "json").output)
    result = run("--role", "inductor", "--db", db, "--format", "json", "--messages")
    assert result.exit_code == 0, result.output
    worded = json.loads(result.output)
    b_plain = next(e for e in plain["failed"] if e["mpn"] == "QM-220-B")
    b_worded = next(e for e in worded["failed"] if e["mpn"] == "QM-220-B")
    assert "message" not in b_plain["reasons"][0]
    # B's sentence: needs 3.5051/0.8 = 4.38 A, part has 4.3 A (hand-worked in test_pick)
    assert "needs Isat ≥ 4.38 A" in b_worded["reasons"][0]["message"]
    assert all(c.get("message") for e in worded["passed"] for c in e["checks"])


def test_jsonl_is_one_part_a_line(db):
    result = run("--role", "inductor", "--db", db, "--format", "jsonl")
    assert result.exit_code == 0, result.output
    lines = [json.loads(line) for line in result.output.splitlines()]
    assert len(lines) == 8  # the eight invented inductors of tests/data/screening
    assert [line["status"] for line in lines] == ["passed"] * 3 + ["unverified"] + ["failed"] * 4
    whole = json.loads(run("--role", "inductor", "--db", db, "--format", "json").output)
    listed = [e["mpn"] for key in ("passed", "unverified", "failed") for e in whole[key]]
    assert [line["mpn"] for line in lines] == listed


def test_jsonl_top_cuts_each_list(db):
    result = run("--role", "inductor", "--db", db, "--format", "jsonl", "--top", "1")
    assert result.exit_code == 0, result.output
    statuses = [json.loads(line)["status"] for line in result.output.splitlines()]
    assert statuses == ["passed", "unverified", "failed"]


def test_empty_lists_stay_valid_json(tmp_path):
    from partpick.catalog.store import open_engine

    empty = str(tmp_path / "empty.db")
    open_engine(empty)  # a catalog with its tables and no parts
    result = run("--role", "diode", "--db", empty, "--format", "json")
    assert result.exit_code == 0, result.output
    data = json.loads(result.output)
    assert data["passed"] == data["unverified"] == data["failed"] == []
    assert data["total"] == 0
