"""pick() on the bundled invented catalogs and scenarios, and the light import path.

The outcome of every part is not written out here (tests/test_pick.py does that on a small
catalog); these tests check that each role finds parts on the bundled data, that every
outcome is consistent with its own checks, and that the pick path stays free of pandas and
SQLAlchemy on an SQLite catalog.
"""

from __future__ import annotations

import subprocess
import sys
from pathlib import Path

import pytest

from partpick.catalog.importer import import_catalog
from partpick.design.spec import load_spec
from partpick.screening.pick import ROLES, pick
from partpick.screening.profiles import load_profile
from tests.backends import new_catalog

ROOT = Path(__file__).resolve().parent.parent
CATALOGS = ROOT / "catalogs"
FILES = {
    "inductor": "inductors.csv",
    "capacitor": "capacitors.csv",
    "diode": "diodes.csv",
    "mosfet": "mosfets.csv",
}
SCENARIOS = sorted((CATALOGS / "scenarios").glob("*.toml"))


@pytest.fixture(scope="module")
def bundled(tmp_path_factory, catalog_backend) -> str:
    """A catalog with the four bundled catalogs, on each back-end (module scope)."""
    missing = [name for name in FILES.values() if not (CATALOGS / name).exists()]
    if missing:
        pytest.skip(f"bundled catalogs not present: {missing}")
    db = new_catalog(catalog_backend, tmp_path_factory.mktemp("bundled"))
    for kind, name in FILES.items():
        import_catalog(db, [CATALOGS / name], kind)
    return db


def _consistent(outcome) -> None:
    statuses = [c.status for c in outcome.checks]
    if outcome.status == "passed":
        assert set(statuses) == {"pass"}, outcome
        for c in outcome.checks:
            if c.stress is not None and c.limit is not None and c.rule != "inductance":
                assert c.stress <= c.limit, c
    elif outcome.status == "unverified":
        assert "fail" not in statuses and "unverified" in statuses
        assert outcome.missing
    else:
        assert outcome.failing
        for c in outcome.failing:
            if c.stress is not None and c.limit is not None and c.rule != "inductance":
                assert c.stress > c.limit, c


@pytest.mark.parametrize("scenario", SCENARIOS, ids=lambda p: p.stem)
@pytest.mark.parametrize("role", ROLES)
def test_every_role_picks_on_bundled_data(bundled, scenario, role):
    spec = load_spec(scenario)
    result = pick(bundled, spec, role, profile=load_profile("standard"))
    assert result.total > 0
    assert result.passed or result.unverified, f"nothing for {role} in {scenario.name}"
    listed = result.passed + result.unverified + result.failed
    assert len(listed) == result.total
    for outcome in listed:
        _consistent(outcome)
    assert sum(result.counts.values()) == result.total


def test_pick_path_imports_neither_pandas_nor_sqlalchemy(bundled):
    # a fresh interpreter: screening plus the columnar read, as `partpick pick` runs them
    code = (
        "import sys\n"
        "from partpick.design.spec import load_spec\n"
        "from partpick.screening.pick import pick\n"
        "from partpick.screening.profiles import load_profile\n"
        f"spec = load_spec({str(SCENARIOS[0])!r})\n"
        "for role in ('inductor', 'input-cap', 'output-cap', 'diode', 'switch'):\n"
        f"    pick({bundled!r}, spec, role, profile=load_profile('standard'), top=3)\n"
        "print(sorted(m for m in ('pandas', 'sqlalchemy') if m in sys.modules))\n"
    )
    done = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True)
    assert done.returncode == 0, done.stderr
    assert done.stdout.strip() == "[]"
