"""The two CSV readers agree: the csv module (small files, no pandas) and pandas (large files).

Every catalog file of the repository, the broken ones included, and generated messy files
with bad rows are read both ways, in chunks of a few rows so chunk edges are crossed too;
the rows, their values, their line numbers and the rejects must be the same, or both readers
must refuse the file with the same message.
"""

from __future__ import annotations

import importlib.util
import sys
from pathlib import Path

import numpy as np
import pytest

from partpick.catalog import reading
from partpick.catalog.headers import load_map
from partpick.errors import CatalogFormatError
from partpick.fields import KINDS

ROOT = Path(__file__).parents[1]
FILES = sorted(
    [*(ROOT / "tests" / "data").rglob("*.csv"), *(ROOT / "catalogs").glob("*.csv")],
    key=str,
)
MAPPED = [
    (ROOT / "catalogs" / "messy" / "vendor_inductors_export.csv",
     ROOT / "catalogs" / "maps" / "vendor_inductors.toml"),
    (ROOT / "catalogs" / "messy" / "distributor_capacitors.tsv",
     ROOT / "catalogs" / "maps" / "distributor_capacitors.toml"),
]  # fmt: skip


def read_both_ways(path: Path, kind: str, mapping, monkeypatch) -> tuple[object, object]:
    """Return what each reader gives for the file: (chunks, rejects) or the error text."""
    results = []
    for limit in (1 << 40, -1):  # everything small (csv module), then nothing small (pandas)
        monkeypatch.setattr(reading, "SMALL_FILE_BYTES", limit)
        try:
            item = reading.prepare_file(path, kind, mapping)
            chunks = list(reading.read_chunks(item, chunk_rows=3))
        except CatalogFormatError as exc:
            results.append(("refused", str(exc)))
            continue
        results.append(_comparable(chunks))
    return results[0], results[1]


def _comparable(chunks) -> tuple:
    values: dict[str, list] = {}
    lines, rejects, rows = [], [], 0
    for chunk in chunks:
        for name, column in chunk.values.items():
            values.setdefault(name, []).extend(_cells(column))
        lines.extend(chunk.lines.tolist())
        rejects.extend(chunk.rejects)
        rows += chunk.row_count
    return values, lines, sorted(rejects, key=lambda r: (r.line, r.column)), rows


def _cells(column: np.ndarray) -> list:
    if column.dtype.kind == "f":  # NaN != NaN: compare missing numbers as None
        return [None if v != v else v for v in column.tolist()]
    return column.tolist()


def _kinds_for(path: Path) -> list[str]:
    """Return the kinds whose header matching accepts the file (all kinds if none does)."""
    kinds = []
    for kind in KINDS:
        try:
            reading.prepare_file(path, kind, None)
        except CatalogFormatError:
            continue
        kinds.append(kind)
    return kinds or list(KINDS)


@pytest.mark.parametrize("path", FILES, ids=lambda p: str(p.relative_to(ROOT)))
def test_readers_agree_on_every_catalog_file(path, monkeypatch):
    for kind in _kinds_for(path):
        small, large = read_both_ways(path, kind, None, monkeypatch)
        assert small == large, kind


@pytest.mark.parametrize(("path", "map_path"), MAPPED, ids=lambda p: p.name)
def test_readers_agree_with_map_files(path, map_path, monkeypatch):
    mapping = load_map(map_path)
    small, large = read_both_ways(path, mapping.kind, mapping, monkeypatch)
    assert small == large
    assert small[0]["mpn"]  # the file has parts


def _generator():
    script = ROOT / "scripts" / "gen_catalog.py"
    spec = importlib.util.spec_from_file_location("gen_catalog", script)
    module = importlib.util.module_from_spec(spec)
    sys.modules["gen_catalog"] = module
    spec.loader.exec_module(module)
    return module


@pytest.mark.parametrize("kind", KINDS)
def test_readers_agree_on_generated_messy_files_with_bad_rows(kind, tmp_path, monkeypatch):
    gen = _generator()
    frame = gen.generate(kind, 300, 11, "messy", bad_fraction=0.1)
    path = gen.write_catalog(frame, tmp_path / f"{kind}.csv", "messy")
    with open(path, "a", encoding="utf-8") as handle:  # a row with one field too many
        handle.write(";".join(["X"] * (len(frame.columns) + 1)) + "\n\n")
    small, large = read_both_ways(path, kind, None, monkeypatch)
    assert small == large
    values, _lines, rejects, _rows = small
    assert rejects and any(r.column == reading.WHOLE_ROW for r in rejects)
    assert len(values["mpn"]) > 200
