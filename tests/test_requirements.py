"""What a part would need: the per-role requirements and the single figure that fixes a failure.

Hand working for the bundled field-logger scenario (catalogs/scenarios/field-logger.toml, whose
comments work its envelope by hand with the TI SLVA372 and Erickson & Maksimovic ch. 2/5
forms): l_min = 9.80 µH, l_max = 19.59 µH; at l_min the peak is 4.368 A and the RMS 3.781 A;
switch RMS 3.355 A; diode voltage 24.06 V, switch voltage 24.76 V (plus the spec's default 0.7 V
diode drop); output-cap RMS 1.548 A; duty_max 0.7875.
The standard profile's figures (from memory, see partpick/screening/profiles/standard.toml):
Isat use 0.8, Irms use 0.9, tolerance 20 %, reverse-voltage use 0.8, forward-current use 0.7,
drain-voltage use 0.8, drain-current use 0.6, thermal margin 25 °C, hot factor 1.5, class II
ceramic voltage use 0.5, ripple-current use 1.0, max_parallel 4.
"""

from __future__ import annotations

import json
from pathlib import Path

import pytest

from partpick.catalog.importer import import_catalog
from partpick.cli import app
from partpick.design.spec import load_spec
from partpick.design.topologies import get_topology
from partpick.render.requirements import fixes_text, requirements_line, safe_value
from partpick.screening.checks import Requirement
from partpick.screening.pick import pick
from partpick.screening.profiles import load_profile
from partpick.screening.requirements import role_requirements

ROOT = Path(__file__).resolve().parent.parent
LOGGER = ROOT / "catalogs" / "scenarios" / "field-logger.toml"
BOM_DATA = Path(__file__).parent / "data" / "bom"


def _requirements(role: str) -> dict[tuple[str, str], float]:
    spec, profile = load_spec(LOGGER), load_profile("standard")
    topology = get_topology(spec.topology)
    found = role_requirements(role, spec, topology.envelope(spec), topology, profile, 4)
    return {(r.field, r.comparison): r.value for r in found}


@pytest.mark.parametrize(
    ("role", "field", "comparison", "expected"),
    [
        # L·(1 − 0.2) ≥ l_min: 9.80/0.8 = 12.25 µH; at most l_max = 19.59 µH
        ("inductor", "inductance_h", ">=", 9.80e-6 / 0.8),
        ("inductor", "inductance_h", "<=", 19.59e-6),
        ("inductor", "isat_a", ">=", 4.368 / 0.8),  # peak at l_min / 0.8 = 5.46 A
        ("inductor", "irms_a", ">=", 3.781 / 0.9),  # RMS at l_min / 0.9 = 4.20 A
        ("switch", "vds_v", ">=", 24.76 / 0.8),  # 31.0 V, as the scenario works it
        ("switch", "id_a", ">=", 4.368 / 0.6),  # 7.28 A
        # (150 − 25 − 60) °C / (3.355² A² · 1.5) = 3.85 Ω·°C/W
        ("switch", "rds_on_theta_ja", "<=", 65.0 / (3.355**2 * 1.5)),
        ("diode", "vrrm_v", ">=", 24.06 / 0.8),
        ("diode", "if_avg_a", ">=", 0.8 / 0.7),  # 1.14 A
        ("diode", "vf_theta_ja", "<=", 65.0 / 0.8),  # 81.25 V·°C/W
        ("output-cap", "voltage_v", ">=", 24.06 / 0.5),  # 48.1 V, the 50 V ceramic class
        ("output-cap", "ripple_a", ">=", 1.548 / 4),  # four parts share 1.548 A
        # half of 120 mV each: 0.8·0.7875/(400e3·4·0.06) = 6.56 µF; 4·0.06/4.368 = 54.9 mΩ
        ("output-cap", "c_eff_f", ">=", 0.8 * 0.7875 / (400e3 * 4 * 0.06)),
        ("output-cap", "esr_ohm", "<=", 4 * 0.06 / 4.368),
        ("output-cap", "count", "<=", 4),
        ("input-cap", "voltage_v", ">=", 8.4 / 0.5),  # 16.8 V
        ("input-cap", "ripple_a", ">=", 0.435 / 4),
    ],
)
def test_requirements_match_the_hand_working(role, field, comparison, expected):
    assert _requirements(role)[(field, comparison)] == pytest.approx(expected, rel=2e-3)


@pytest.mark.parametrize(
    ("value", "comparison", "shown"),
    # rounding towards safety: a minimum never drops below what is needed, a maximum never
    # rises above what is allowed (common practice, no published source)
    [(5.4012, ">=", 5.41), (5.46, ">=", 5.46), (0.0549, "<=", 0.0549), (41.96, "<=", 41.9),
     (30.075, ">=", 30.1), (12.25e-6, ">=", 12.3e-6)],
)  # fmt: skip
def test_a_pasted_figure_is_rounded_towards_safety(value, comparison, shown):
    assert safe_value(value, comparison) == pytest.approx(shown, rel=1e-12)


def test_the_inductor_requirements_read_as_one_search_line():
    reqs = [
        Requirement("inductance_h", ">=", 12.25e-6, "H", "inductance"),
        Requirement("inductance_h", "<=", 19.59e-6, "H", "inductance"),
        Requirement("isat_a", ">=", 5.46, "A", "saturation"),
        Requirement("irms_a", ">=", 4.2011, "A", "rms"),
    ]
    assert requirements_line(reqs) == "L 12.3–19.5 µH, Isat ≥ 5.46 A, Irms ≥ 4.21 A"


def _run(runner, *args):
    return runner.invoke(app, [str(a) for a in args])


@pytest.fixture
def bundled_db(tmp_path) -> str:
    db = str(tmp_path / "parts.db")
    for kind, name in [("inductor", "inductors"), ("capacitor", "capacitors"),
                       ("diode", "diodes"), ("mosfet", "mosfets")]:  # fmt: skip
        import_catalog(db, [ROOT / "catalogs" / f"{name}.csv"], kind)
    return db


def test_pick_json_lists_the_requirements_when_nothing_passes(runner, bundled_db):
    # 3 A out from 5 V in: the switch peak is far above every bundled part's ID
    result = _run(runner, "pick", LOGGER, "--role", "switch", "--iout", "3A", "--vin-min", "5V",
                  "--db", bundled_db, "--format", "json")  # fmt: skip
    assert result.exit_code == 0, result.output
    data = json.loads(result.output)
    assert data["counts"]["passed"] == 0
    fields = {(r["field"], r["comparison"]) for r in data["requirements"]}
    assert {("vds_v", ">="), ("id_a", ">="), ("rds_on_theta_ja", "<=")} <= fields
    for r in data["requirements"]:
        assert set(r) >= {"field", "comparison", "value", "unit"} and r["value"] > 0


def test_pick_table_prints_the_search_line_when_nothing_passes(runner, bundled_db):
    result = _run(runner, "pick", LOGGER, "--role", "switch", "--iout", "3A", "--vin-min", "5V",
                  "--db", bundled_db)  # fmt: skip
    assert result.exit_code == 0, result.output
    assert "A part would need: VDS ≥" in result.output


def test_bom_json_gives_each_empty_role_its_requirements(runner, bundled_db):
    result = _run(runner, "bom", LOGGER, "--iout", "3A", "--vin-min", "5V", "--db", bundled_db,
                  "--format", "json", "--no-verify")  # fmt: skip
    assert result.exit_code == 3, result.output
    data = json.loads(result.output)
    empty = [line for line in data["lines"] if line["status"] == "no part"]
    assert empty
    for line in empty:
        assert line["requirements"], line["role"]
        assert all(r["comparison"] in (">=", "<=") for r in line["requirements"])


def test_a_thermal_failure_names_the_theta_ja_and_vf_that_would_pass(tmp_path):
    # Invented Schottky diode: VF 0.5 V, θJA 200 °C/W, Tjmax 150 °C, at 0.8 A and 60 °C.
    # P = 0.5·0.8 = 0.4 W (Erickson & Maksimovic ch. 3, conduction as a constant drop);
    # Tj = 60 + 0.4·200 = 140 °C, over the 150 − 25 = 125 °C limit. Alone, θJA ≤ 65/0.4 =
    # 162.5 °C/W would pass, or VF ≤ 65/200/0.8 = 0.40625 V.
    csv_path = tmp_path / "hot.csv"
    csv_path.write_text(
        "Mfr Part Number,Manufacturer,Diode Type,Reverse Voltage (Vrrm),Average Forward Current,"
        "Forward Voltage,Reverse Recovery Charge,Max Junction Temperature,"
        "Thermal Resistance Theta JA\n"
        "BT-ZK40-HOT,Brackwater Test Semis,Schottky,40 V,3 A,0.5 V,0 nC,150 °C,200 °C/W\n",
        encoding="utf-8",
    )
    db = str(tmp_path / "hot.db")
    import_catalog(db, [csv_path], "diode")
    result = pick(db, load_spec(BOM_DATA / "spec.toml"), "diode", profile=load_profile("standard"))
    (outcome,) = result.failed
    thermal = outcome.check("thermal")
    fixes = {f.field: f.value for f in thermal.fixes}
    assert fixes["theta_ja_degc_w"] == pytest.approx(162.5, rel=1e-9)
    assert fixes["vf_v"] == pytest.approx(0.40625, rel=1e-9)
    assert fixes_text(thermal.fixes) == "θJA ≤ 162 °C/W, or VF ≤ 406 mV"


def test_pick_json_gives_a_thermal_failure_its_fixes(runner, bundled_db):
    # 3 A through a Schottky at 60 °C: the losses (Erickson & Maksimovic ch. 3, VF·I) push the
    # closest diodes over their junction limit; each such failure names the θJA (and the VF)
    # that alone would pass.
    result = _run(runner, "pick", LOGGER, "--role", "diode", "--iout", "3A", "--db", bundled_db,
                  "--format", "json")  # fmt: skip
    assert result.exit_code == 0, result.output
    thermal = [
        (entry["mpn"], reason)
        for entry in json.loads(result.output)["failed"]
        for reason in entry["reasons"]
        if reason["rule"] == "thermal"
    ]
    assert thermal
    for _mpn, reason in thermal:
        fields = {f["field"] for f in reason["fixes"]}
        assert "theta_ja_degc_w" in fields
        assert all(f["comparison"] == "<=" and f["value"] > 0 for f in reason["fixes"])
