"""After an upsert import the snapshot is patched, not rebuilt, and equals a full rebuild."""

from __future__ import annotations

from pathlib import Path

import numpy as np
import pytest

from partpick.catalog import columns
from partpick.catalog.columns import read_columns
from partpick.catalog.importer import import_catalog
from partpick.catalog.location import resolve_db_url, snapshot_file

SMALL = Path(__file__).parent / "data" / "catalog" / "inductors_small.csv"


def _edited_copy(folder: Path) -> Path:
    """Return the small catalog with one part's Isat changed, one missing value and a new part."""
    lines = SMALL.read_text(encoding="utf-8").splitlines()
    lines[1] = lines[1].replace("9.5 A", "9.1 A")  # QM-1R0-0630 changes in place
    lines[2] = lines[2].replace("16 mOhm", "")  # QM-2R2-0630 loses its DCR
    new = lines[3].replace("QM-4R7-0630", "QM-4R7-0631").replace("32 mOhm", "30 mOhm")
    edited = folder / "edited.csv"
    edited.write_text("\n".join([*lines, new]) + "\n", encoding="utf-8")
    return edited


def _members(file: Path) -> dict[str, np.ndarray]:
    with np.load(file, allow_pickle=False) as archive:
        return {name: archive[name] for name in archive.files}


def test_patched_snapshot_equals_a_rebuild(tmp_path, monkeypatch):
    db = str(tmp_path / "c.db")
    import_catalog(db, [SMALL], "inductor")
    edited = _edited_copy(tmp_path)

    def no_rebuild(*_args, **_kwargs):
        raise AssertionError("the snapshot was rebuilt from the table")

    with monkeypatch.context() as patched:
        patched.setattr(columns, "write_snapshot", no_rebuild)
        (report,) = import_catalog(db, [edited], "inductor")
    assert (report.added, report.updated) == (1, 2)
    file = snapshot_file(tmp_path / "c.db", "inductor")
    patched_members = _members(file)
    columns.write_snapshot(resolve_db_url(db), "inductor")  # the full rebuild, same file
    rebuilt = _members(file)
    assert sorted(patched_members) == sorted(rebuilt)
    for name, array in rebuilt.items():
        np.testing.assert_array_equal(patched_members[name], array, err_msg=name)
    parts = read_columns(db, "inductor", ["isat_a", "dcr_ohm"])
    at = {mpn: i for i, mpn in enumerate(parts["mpn"].tolist())}
    assert parts["isat_a"][at["QM-1R0-0630"]] == pytest.approx(9.1)  # the edited figure, in A
    assert np.isnan(parts["dcr_ohm"][at["QM-2R2-0630"]])
    assert parts["dcr_ohm"][at["QM-4R7-0631"]] == pytest.approx(0.030)  # 30 mOhm, in ohm


def test_without_the_previous_snapshot_it_is_rebuilt(tmp_path):
    db = str(tmp_path / "c.db")
    import_catalog(db, [SMALL], "inductor")
    snapshot_file(tmp_path / "c.db", "inductor").unlink()
    import_catalog(db, [_edited_copy(tmp_path)], "inductor")
    parts = read_columns(db, "inductor", ["isat_a"])
    assert len(parts["mpn"]) == 7  # six parts of the small catalog and the new one
    assert "QM-4R7-0631" in parts["mpn"].tolist()


def test_only_new_parts_are_appended_as_a_rebuild_would(tmp_path, monkeypatch):
    db = str(tmp_path / "c.db")
    import_catalog(db, [SMALL], "inductor")
    lines = SMALL.read_text(encoding="utf-8").splitlines()
    added = tmp_path / "added.csv"
    added.write_text(
        "\n".join([lines[0], lines[1].replace("QM-1R0-0630", "QM-1R0-0631")]) + "\n",
        encoding="utf-8",
    )
    with monkeypatch.context() as patched:
        patched.setattr(columns, "write_snapshot", _refuse_rebuild)
        (report,) = import_catalog(db, [added], "inductor")
    assert (report.added, report.updated) == (1, 0)
    file = snapshot_file(tmp_path / "c.db", "inductor")
    appended = _members(file)
    columns.write_snapshot(resolve_db_url(db), "inductor")
    for name, array in _members(file).items():
        np.testing.assert_array_equal(appended[name], array, err_msg=name)


def _refuse_rebuild(*_args, **_kwargs):
    raise AssertionError("the snapshot was rebuilt from the table")
