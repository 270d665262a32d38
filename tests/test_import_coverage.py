"""Import coverage: every field a rule reads that a file lacks, and what that costs its parts."""

from __future__ import annotations

import json
from pathlib import Path

import pytest

from partpick.catalog.importer import import_catalog
from partpick.cli import app
from partpick.design.spec import load_spec
from partpick.fields import fields_of
from partpick.render.catalog import coverage_sentences
from partpick.screening.coverage import coverage_gaps
from partpick.screening.pick import ROLE_RULES, screen_role
from partpick.screening.profiles import load_profile
from tests.conftest import BUNDLED_CATALOGS

SCREENING = Path(__file__).parent / "data" / "screening"
NO_IRMS = "MPN,Inductance,Isat,DCR,SRF,Lifecycle\n" + "".join(
    f"TC-{i},{i} uH,3 A,10 mOhm,40 MHz,active\n" for i in range(1, 13)
)
NO_SRF = "MPN,Inductance,Isat,Irms,DCR,Lifecycle\n" + "".join(
    f"TC-{i},{i} uH,3 A,2 A,10 mOhm,active\n" for i in range(1, 13)
)


def _sentences(db_file, path, kind) -> list[str]:
    (report,) = import_catalog(db_file, [path], kind)
    gaps = coverage_gaps(kind, report.fields_present)
    return coverage_sentences(gaps, report.added + report.updated + report.unchanged)


def test_a_file_without_a_core_field_leaves_every_part_unverified(db_file, write_csv):
    assert _sentences(db_file, write_csv(NO_IRMS), "inductor") == [
        "no column for irms_a: all 12 parts will be unverified for the inductor role (rms check)"
    ]


def test_a_file_without_a_check_only_field_skips_that_check(db_file, write_csv):
    assert _sentences(db_file, write_csv(NO_SRF), "inductor") == [
        "no column for srf_hz: the srf check is skipped for these 12 parts"
    ]


def test_a_capacitor_file_without_esr_costs_both_capacitor_roles(db_file, write_csv):
    text = "MPN,Capacitance,Voltage,Ripple Current\nTC-1,10 uF,50 V,2 A\n"
    sentences = _sentences(db_file, write_csv(text), "capacitor")
    assert sentences[0] == (
        "no column for esr_ohm: the one part will be unverified for the input-cap and "
        "output-cap roles (ripple-voltage check)"
    )


MOSFETS_NO_CHANNEL = (
    "MPN,Description,VDS,ID,Rds(on),Qgd,Tj max,Theta JA,Lifecycle\n"
    "TQ-1,N-channel 30 V trench switch,30 V,10 A,9 mOhm,3 nC,150,60,active\n"
    "TQ-2,30 V switch P-CH,30 V,10 A,9 mOhm,3 nC,150,60,active\n"
    "TQ-3,30 V trench switch,30 V,10 A,9 mOhm,3 nC,150,60,active\n"
)


def test_a_channel_the_descriptions_state_is_no_gap_for_those_parts(db_file, write_csv):
    (report,) = import_catalog(db_file, [write_csv(MOSFETS_NO_CHANNEL)], "mosfet")
    assert dict(report.inferred) == {"channel": 2}  # TQ-1 and TQ-2 say it; TQ-3 does not
    gaps = coverage_gaps("mosfet", report.fields_present, report.inferred)
    assert coverage_sentences(gaps, 3) == [
        "no column for channel: read from the description for 2 of 3 parts; the other part "
        "will be unverified for the switch role (channel check)"
    ]


def test_a_channel_every_description_states_costs_nothing(db_file, write_csv):
    text = MOSFETS_NO_CHANNEL.replace("30 V trench switch,30 V", "NMOS 30 V,30 V")
    (report,) = import_catalog(db_file, [write_csv(text)], "mosfet")
    gaps = coverage_gaps("mosfet", report.fields_present, report.inferred)
    assert coverage_sentences(gaps, 3) == [
        "no column for channel: read from the description for every part"
    ]


def test_map_file_constants_count_as_columns(db_file, write_csv, tmp_path):
    map_path = tmp_path / "m.toml"
    map_path.write_text('[constants]\nlifecycle = "active"\n', encoding="utf-8")
    (report,) = import_catalog(db_file, [write_csv(NO_SRF)], "inductor", map_file=map_path)
    assert "lifecycle" not in {g.field for g in coverage_gaps("inductor", report.fields_present)}


@pytest.fixture(scope="module")
def bundled_db(tmp_path_factory) -> str:
    path = str(tmp_path_factory.mktemp("bundled") / "bundled.db")
    for kind, name in (("inductor", "inductors"), ("capacitor", "capacitors"),
                       ("diode", "diodes"), ("mosfet", "mosfets")):  # fmt: skip
        import_catalog(path, [BUNDLED_CATALOGS / f"{name}.csv"], kind)
    return path


@pytest.mark.parametrize("role", sorted(ROLE_RULES))
def test_the_declared_rule_fields_are_what_the_rules_report_missing(bundled_db, role):
    """The coverage report reads each rule module's RULES; they must match its rules."""
    rules = ROLE_RULES[role]
    declared = {needs.rule: set(needs.fields) for needs in rules.rules}
    known = {f.name for f in fields_of(rules.kind)}
    assert all(names <= known for names in declared.values())
    spec = load_spec(SCREENING / "spec.toml", {"vin_ripple": "20 mV"})  # every rule made
    screen, _ = screen_role(bundled_db, spec, role, profile=load_profile("standard"))
    for result in screen.rules:
        if result.rule == "data":  # core fields no other rule reads
            continue
        assert result.rule in declared, result.rule
        assert {name for name, _mask in result.missing} <= declared[result.rule], result.rule


def test_import_json_gives_columns_unread_hints_missing_fields_and_counts(
    runner, db_file, write_csv
):
    text = "MPN,Inductance,Rated Current,DCR (mΩ),Bin\nTC-1,1 uH,3 A,10,x\nTC-2,2 uH,2 A,20,y\n"
    args = ["import", str(write_csv(text)), "--kind", "inductor", "--db", db_file]
    result = runner.invoke(app, [*args, "--format", "json"])
    assert result.exit_code == 0, result.output
    (doc,) = json.loads(result.output)
    assert doc["counts"]["parts"] == 2 and doc["counts"]["added"] == 2
    assert {c["header"]: c["field"] for c in doc["columns"]} == {
        "MPN": "mpn", "Inductance": "inductance_h", "DCR (mΩ)": "dcr_ohm"
    }  # fmt: skip
    dcr = next(c for c in doc["columns"] if c["field"] == "dcr_ohm")
    assert dcr["unit"] == "mΩ" and dcr["scale"] == pytest.approx(1e-3)
    unread = {u["header"]: u for u in doc["unread"]}
    assert unread["Rated Current"]["candidates"] == ["isat_a", "irms_a"]
    assert unread["Rated Current"]["map_line"] == "'Rated Current' = \"isat_a\""
    assert unread["Bin"]["candidates"] == []
    missing = {m["field"]: m for m in doc["missing"]}
    assert missing["isat_a"]["unverified_roles"] == ["inductor"]
    assert missing["srf_hz"]["rules"] == [{"role": "inductor", "rule": "srf", "optional": True}]
    assert "skipped for these 2 parts" in missing["srf_hz"]["consequence"]


def test_the_import_table_says_what_the_missing_columns_cost(runner, db_file, write_csv):
    args = ["import", str(write_csv(NO_IRMS)), "--kind", "inductor", "--db", db_file]
    result = runner.invoke(app, args, terminal_width=200)
    assert result.exit_code == 0, result.output
    assert "no column for irms_a: all 12 parts will be unverified" in result.output


def test_fields_lists_units_rules_and_wordings(runner):
    result = runner.invoke(app, ["fields", "--kind", "inductor", "--format", "json"])
    assert result.exit_code == 0, result.output
    entries = {e["field"]: e for e in json.loads(result.output)}
    assert set(entries) == {f.name for f in fields_of("inductor")}
    assert entries["isat_a"]["unit"] == "A"
    assert entries["isat_a"]["rules"] == [
        {"role": "inductor", "rule": "saturation", "optional": False}
    ]
    assert "Saturation Current (Isat)" in entries["isat_a"]["wordings"]
    assert "Rated Current" in entries["irms_a"]["ambiguous_wordings"]


def test_fields_table_and_an_unknown_kind(runner):
    result = runner.invoke(app, ["fields"], terminal_width=200)
    assert result.exit_code == 0, result.output
    assert "mosfet fields" in result.output and "Miller Charge" in result.output
    bad = runner.invoke(app, ["fields", "--kind", "resistor"])
    assert bad.exit_code == 2 and "no part kind 'resistor'" in bad.output
