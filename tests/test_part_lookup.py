"""Part-number lookups (--explain, verify --inductor ...) ignore case and surrounding spaces."""

from __future__ import annotations

from pathlib import Path

import numpy as np
import pytest

from partpick.catalog.columns import mpn_hits
from partpick.catalog.importer import import_catalog
from partpick.design.spec import load_spec
from partpick.errors import NotFoundError
from partpick.screening.pick import explain
from partpick.screening.profiles import load_profile
from partpick.verify.parts import find_part

SCREENING = Path(__file__).parent / "data" / "screening"
TWO_MAKERS = (
    "MPN,Manufacturer,Inductance,Isat,Irms,DCR\n"
    "QX-100,Quillmark Magnetics,10 uH,6 A,5 A,20 mOhm\n"
    "QX-100,Pellworth Inductive,10 uH,5 A,4 A,25 mOhm\n"
    "QX-220,Pellworth Inductive,22 uH,4 A,3 A,40 mOhm\n"
)


@pytest.mark.parametrize(
    ("wanted", "hits"),
    [
        ("QX-1", [0]),
        ("qx-1", [0]),
        ("  Qx-1 ", [0]),
        ("qx-10", []),
        ("QX-2", [1]),  # an exact match wins over case-folded ones
        ("Qx-2", [1, 2]),  # two parts differ only in case: both match
    ],
)
def test_mpn_hits(wanted, hits):
    numbers = np.array(["QX-1", "QX-2", "qx-2"], dtype=object)
    assert mpn_hits(numbers, wanted).tolist() == hits


@pytest.fixture
def catalog(db_file, write_csv) -> str:
    import_catalog(db_file, [write_csv(TWO_MAKERS)], "inductor")
    return db_file


def test_explain_finds_a_part_whatever_its_case_and_spaces(catalog):
    spec = load_spec(SCREENING / "spec.toml")
    found = explain(catalog, spec, "inductor", "  qx-220 ", profile=load_profile("standard"))
    assert found.outcome.mpn == "QX-220"


def test_explain_names_every_part_when_several_match(catalog):
    spec = load_spec(SCREENING / "spec.toml")
    with pytest.raises(NotFoundError) as caught:
        explain(catalog, spec, "inductor", "qx-100", profile=load_profile("standard"))
    assert "2 parts match" in caught.value.hint
    assert "QX-100 (Pellworth Inductive)" in caught.value.hint
    assert "QX-100 (Quillmark Magnetics)" in caught.value.hint


def test_verify_part_lookup_ignores_case_and_lists_several_matches(catalog):
    assert find_part(catalog, "inductor", " qx-220")["mpn"] == "QX-220"
    with pytest.raises(NotFoundError) as caught:
        find_part(catalog, "inductor", "QX-100")
    assert "QX-100 (Pellworth Inductive), QX-100 (Quillmark Magnetics)" in caught.value.hint
