"""--explain lists every rule of the role, the ones that made no check included, and why."""

from __future__ import annotations

import json
from pathlib import Path

from partpick.catalog.importer import import_catalog
from partpick.cli import app
from partpick.design.spec import load_spec
from partpick.screening.pick import Unchecked, explain
from partpick.screening.profiles import load_profile

SCREENING = Path(__file__).parent / "data" / "screening"
INDUCTOR = (
    "MPN,Manufacturer,Inductance,Tolerance,Isat,Irms,DCR\n"
    "QM-220-A,Quillmark Magnetics,22 uH,10%,4.6 A,3.5 A,20 mOhm\n"
)
DIODE = (
    "MPN,Manufacturer,Diode Type,VRRM,IF(AV),VF,Tj max,RθJA\n"
    "TS-ZK40-3A0X,Tessaly Semiconductor,schottky,40 V,3 A,0.5 V,150,60\n"
)
CAPACITOR = (
    "MPN,Manufacturer,Capacitance,Voltage,Dielectric,ESR,Ripple Current\n"
    "OPC-1210-106,Orrin Passives,10 uF,50 V,x7r,5 mOhm,3 A\n"
)


def _explain(db_file, write_csv, text, kind, role, mpn):
    import_catalog(db_file, [write_csv(text)], kind)
    spec = load_spec(SCREENING / "spec.toml")  # no vin_ripple: no input ripple-voltage rule
    return explain(db_file, spec, role, mpn, profile=load_profile("standard"))


def test_an_optional_rule_without_its_field_is_listed_with_the_field(db_file, write_csv):
    found = _explain(db_file, write_csv, INDUCTOR, "inductor", "inductor", "QM-220-A")
    assert Unchecked("srf", ("srf_hz",), "missing") in found.unchecked
    assert "srf" not in {c.rule for c in found.outcome.checks}


def test_a_rule_that_does_not_apply_to_the_part_is_listed(db_file, write_csv):
    found = _explain(db_file, write_csv, DIODE, "diode", "diode", "TS-ZK40-3A0X")
    assert Unchecked("recovery", (), "not applicable") in found.unchecked  # a Schottky


def test_a_rule_the_spec_does_not_ask_for_is_listed(db_file, write_csv):
    found = _explain(db_file, write_csv, CAPACITOR, "capacitor", "input-cap", "OPC-1210-106")
    assert Unchecked("ripple-voltage", (), "not made for this spec") in found.unchecked


def test_the_explain_screen_and_json_show_the_unchecked_rules(runner, db_file, write_csv):
    import_catalog(db_file, [write_csv(INDUCTOR)], "inductor")
    args = ["pick", str(SCREENING / "spec.toml"), "--role", "inductor", "--db", db_file]
    shown = runner.invoke(app, [*args, "--explain", "qm-220-a"], terminal_width=200)
    assert shown.exit_code == 0, shown.output
    assert "srf: not checked, no srf_hz given" in shown.output
    as_json = runner.invoke(app, [*args, "--explain", "QM-220-A", "--format", "json"])
    assert as_json.exit_code == 0, as_json.output
    (entry,) = json.loads(as_json.output)["not_checked"]
    assert entry["rule"] == "srf" and entry["missing"] == ["srf_hz"]
