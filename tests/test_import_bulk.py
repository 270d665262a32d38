"""The bulk load into an empty table takes short cuts; each must store what the plain path does.

* Only the columns a file has are bound (a field it lacks is left to the column's NULL).
* Identity columns are checked for cleaning with substring scans instead of one regular
  expression; both must give the same answer on any text.
* The snapshot is written from the import's own columns (partly from spill files, while
  the import commits), not read back: it must equal the one rebuilt from the table.
* A new catalog file is loaded in rollback-journal mode, and must end in WAL mode.
"""

from __future__ import annotations

import contextlib
import sqlite3
from pathlib import Path

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from partpick.catalog import cells as cells_module
from partpick.catalog import columns, identity, sqlite_light
from partpick.catalog.importer import import_catalog
from partpick.catalog.location import snapshot_file
from partpick.errors import StrictImportError

DATA = Path(__file__).parent / "data" / "catalog"
SMALL = DATA / "inductors_small.csv"


def _stored(db: Path, skip_mpn: str | None = None) -> list[tuple]:
    """Return every stored inductor (all columns but the row id and batch), by part number."""
    conn = sqlite3.connect(db)
    names = [r[1] for r in conn.execute("PRAGMA table_info(parts_inductor)")]
    kept = [n for n in names if n not in ("id", "batch_id")]
    rows = conn.execute(
        f"SELECT {', '.join(kept)} FROM parts_inductor ORDER BY mpn, manufacturer"
    ).fetchall()
    conn.close()
    return [r for r in rows if r[kept.index("mpn")] != skip_mpn]


def test_bulk_load_stores_what_the_upsert_stores(tmp_path):
    # The small file lacks every core-loss field, so the bulk load leaves them out of its
    # INSERT; the upsert (a table that already holds a part) binds them as NULL.
    bulk, upsert = tmp_path / "bulk.db", tmp_path / "upsert.db"
    other = tmp_path / "other.csv"
    other.write_text("Part Number,Manufacturer,Inductance\nZZ-OTHER-1,Otherwise Coils,1 uH\n")
    (loaded,) = import_catalog(str(bulk), [SMALL], "inductor")
    import_catalog(str(upsert), [other], "inductor")
    (merged,) = import_catalog(str(upsert), [SMALL], "inductor")
    assert loaded.added == merged.added > 0
    assert loaded.rejects == merged.rejects
    rows = _stored(bulk)
    assert rows == _stored(upsert, skip_mpn="ZZ-OTHER-1")
    names = [r[1] for r in sqlite3.connect(bulk).execute("PRAGMA table_info(parts_inductor)")]
    assert all(row[names.index("core_k") - 1] is None for row in rows)  # id is not selected


def _by_regex(column: np.ndarray) -> bool:
    """The definition the fast check must agree with: ASCII text the regex finds untidy."""
    texts = column.tolist()
    if not all(isinstance(t, str) for t in texts):
        return False
    joined = "\x00".join(texts)
    return joined.isascii() and identity._LOOSE_SPACE_RE.search(joined) is None


_CELLS = st.text(alphabet=" \t\n\r\x0b\x0c\x1c\x1d\x1e\x1f\x85\xa0AZ-9ü", max_size=6)


@settings(max_examples=400, deadline=None)
@given(st.lists(st.one_of(_CELLS, st.none()), max_size=6))
def test_fast_tidy_check_agrees_with_the_regex(cells):
    column = np.empty(len(cells), dtype=object)
    column[:] = cells
    assert identity._plain_ascii(column) == _by_regex(column)


def test_fast_tidy_check_examples():
    def tidy(*cells):
        column = np.empty(len(cells), dtype=object)
        column[:] = cells
        return identity._plain_ascii(column)

    assert tidy("Acme", "Acme Coils") and tidy()
    assert not tidy("Acme ", "B") and not tidy("A", " B") and not tidy("Acme  Coils")
    assert not tidy("A\tB") and not tidy("A\nB")
    assert tidy("A\x1fB") and not tidy("A\x1f", "B") and not tidy("A", "\x1fB")  # \s matches
    assert not tidy("Müller") and not tidy("A", None)


def _factorize_by_dict(cells: list) -> tuple[list, list]:
    """The definition: codes by first appearance, as a dict keyed by the cells gives them."""
    uniques = list(dict.fromkeys(cells))
    index = {cell: code for code, cell in enumerate(uniques)}
    return [index[c] for c in cells], uniques


@settings(max_examples=300, deadline=None)
@given(st.lists(st.one_of(st.text(max_size=4), st.none(), st.just(float("nan"))), max_size=12))
def test_factorize_with_pandas_loaded_agrees_with_the_dict(cells):
    import pandas  # noqa: F401 - loaded, as a large file's reading loads it

    column = np.empty(len(cells), dtype=object)
    column[:] = cells
    codes, uniques = cells_module.factorize(column)
    expected_codes, expected_uniques = _factorize_by_dict(cells)
    assert codes.tolist() == expected_codes
    assert len(uniques) == len(expected_uniques)
    assert all(a is b or a == b for a, b in zip(uniques, expected_uniques, strict=True))


def _snapshot_arrays(db: Path) -> dict[str, np.ndarray]:
    with np.load(snapshot_file(db, "inductor")) as archive:
        return {name: archive[name] for name in archive.files}


@pytest.mark.parametrize("chunk_rows", [50_000, 2])  # one chunk held; three, two of them spilled
def test_the_builders_snapshot_is_the_one_rebuilt_from_the_table(tmp_path, chunk_rows):
    db = tmp_path / "c.db"
    import_catalog(str(db), [SMALL], "inductor", chunk_rows=chunk_rows)
    built = _snapshot_arrays(db)
    columns.write_snapshot(f"sqlite:///{db}", "inductor")
    rebuilt = _snapshot_arrays(db)
    assert built.keys() == rebuilt.keys()
    for name, array in built.items():
        assert array.dtype == rebuilt[name].dtype, name
        assert np.array_equal(array, rebuilt[name], equal_nan=array.dtype.kind == "f"), name
    assert [p.name for p in snapshot_file(db, "inductor").parent.iterdir()] == ["inductor.npz"]


def _mode_during_load(db: Path, **options) -> str:
    """Return the journal mode a second connection sees while the import is uncommitted."""
    seen = []

    def look(_reports):
        with contextlib.closing(sqlite3.connect(db)) as other:
            seen.append(other.execute("PRAGMA journal_mode").fetchone()[0])

    import_catalog(str(db), [SMALL], "inductor", before_commit=look, **options)
    return seen[0]


def test_a_new_file_is_loaded_in_rollback_mode_and_left_in_wal_mode(tmp_path, monkeypatch):
    db = tmp_path / "new.db"
    assert _mode_during_load(db) == "delete"  # a new file: each page is written once
    assert sqlite3.connect(db).execute("PRAGMA journal_mode").fetchone()[0] == "wal"
    assert not Path(f"{db}-journal").exists()
    assert _mode_during_load(db, strict=False) == "wal"  # an existing catalog keeps WAL
    large = tmp_path / "large.db"
    monkeypatch.setattr(sqlite_light, "ROLLBACK_LOAD_MAX_BYTES", 10)
    assert _mode_during_load(large) == "wal"  # too large to load inside the page cache


def test_a_failed_bulk_import_leaves_no_snapshot_files(tmp_path):
    db = tmp_path / "c.db"
    bad = tmp_path / "bad.csv"
    bad.write_text(SMALL.read_text() + "QM-BAD-1,Quillmark Magnetics,x,lots,,,,,,,,,,,,,\n")
    with pytest.raises(StrictImportError):
        import_catalog(str(db), [bad], "inductor", chunk_rows=2, strict=True)
    folder = snapshot_file(db, "inductor").parent
    assert not folder.exists() or list(folder.iterdir()) == []
