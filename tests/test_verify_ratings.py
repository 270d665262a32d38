"""``partpick verify`` on partial data, and its ratings checked at every operating point.

References used here:
* Erickson & Maksimovic, *Fundamentals of Power Electronics*, 3rd ed.: ch. 2 (CCM boost,
  ΔiL = Vin·D/(fsw·L)), ch. 3 (diode conduction V_F·I_avg, I_avg = Iout by charge balance),
  ch. 5 (DCM boost ratio M = (1 + √(1 + 4D²/K))/2, K = 2L/(R·Ts)).
* The steady junction Tj = T_amb + θJA·P of every data sheet's thermal resistance.

Every manufacturer and part number in tests/data/verify/ is invented.
"""

from __future__ import annotations

import json
import math
from dataclasses import replace

import pytest

from partpick.design.spec import Spec
from partpick.verify.ratings import Ratings
from partpick.verify.stage import Stage
from partpick.verify.sweep import OperatingPoint, verify_design
from tests.test_verify_cli import DATA, PARTS, SPEC, run


@pytest.fixture
def catalog(tmp_path) -> str:
    """Function scope: a catalog file holding the invented parts of tests/data/verify/."""
    from typer.testing import CliRunner

    from partpick.cli import app

    db = str(tmp_path / "verify.db")
    for kind, name in (("inductor", "inductors.csv"), ("capacitor", "capacitors.csv"),
                       ("diode", "diodes.csv"), ("mosfet", "mosfets.csv")):  # fmt: skip
        result = CliRunner().invoke(app, ["import", str(DATA / name), "--kind", kind, "--db", db])
        assert result.exit_code == 0, result.output
    return db


NO_COSS = [*PARTS[:-1], "NTV-QN40-21"]  # the same switch without a Coss figure
FAST_NO_QRR = [*PARTS[:-3], "SLV-ZF60-2A0", *PARTS[-2:]]


def test_a_switch_without_coss_still_verifies_and_says_what_is_left_out(catalog):
    result = run(SPEC, *NO_COSS, "--db", catalog)
    assert result.exit_code == 0, result.output
    assert "not included: Coss" in result.output and "NTV-QN40-21" in result.output
    assert "≤ " in result.output  # the efficiency is marked an upper bound
    document = json.loads(run(SPEC, *NO_COSS, "--db", catalog, "--format", "json").output)
    for point in document["points"]:
        assert point["losses_w"]["coss"] == 0.0
        assert {"term": "coss", "role": "switch", "part": "NTV-QN40-21"}.items() <= next(
            n for n in point["not_included"] if n["term"] == "coss"
        ).items()
        assert point["efficiency_is_upper_bound"] is True
    # ... and warns, naming the option that fills the gap
    warned = [w for w in document["warnings"] if w["code"] == "loss-not-included"]
    assert {"term": "coss", "role": "switch", "part": "NTV-QN40-21"}.items() <= next(
        w["detail"] for w in warned if w["detail"]["term"] == "coss"
    ).items()
    assert "--coss" in result.output and "Warnings" in result.output


def test_a_fast_diode_without_qrr_still_verifies(catalog):
    # Erickson & Maksimovic ch. 4: a fast diode has stored charge, so the missing Qrr cannot
    # be taken as zero: the recovery term is left out and named, the waveforms still solve
    result = run(SPEC, *FAST_NO_QRR, "--db", catalog, "--format", "json")
    assert result.exit_code == 0, result.output
    terms = {n["term"] for p in json.loads(result.output)["points"] for n in p["not_included"]}
    assert "recovery" in terms


def test_a_missing_waveform_figure_is_still_an_error_naming_the_option(catalog):
    result = run(SPEC, *PARTS, "--db", catalog, "--inductor", "QM-100-0630-NODCR")
    assert result.exit_code == 2
    assert "--dcr" in result.output


def test_the_nominal_design_violates_nothing_and_strict_passes(catalog):
    result = run(SPEC, *PARTS, "--db", catalog, "--strict")
    assert result.exit_code == 0, result.output
    assert "no violation at any point" in result.output


def _violations(output: str) -> list[dict]:
    return json.loads(output)["violations"]


def test_an_overdriven_open_loop_duty_lists_its_violations_and_strict_fails(catalog):
    # D = 0.8 open loop at 20 mA (R = 1200 Ω): K = 2·15 µH/(1200 Ω·2.5 µs) = 0.01, so
    # M = (1 + √(1 + 4·0.64/0.01))/2 = (1 + 16.03)/2 = 8.52 and Vout ≈ 8.52·8.4 V = 71.5 V
    # before losses (Erickson & Maksimovic ch. 5): above the 50 V X7R part's derated 25 V
    # (standard profile, u = 0.5), the 40 V diode's 32 V and the 60 V hazard level.
    args = (SPEC, *PARTS, "--db", catalog, "--duty", "0.8", "--load", "20 mA")
    loose = run(*args, "--format", "json")
    assert loose.exit_code == 0, loose.output
    found = _violations(loose.output)
    assert found and {"point", "rule", "value", "limit"} <= set(found[0])
    at_light = {v["rule"]: v for v in found if v["point"] == {"vin_v": 8.4, "iout_a": 0.02}}
    assert {"output-voltage", "hazard-voltage", "reverse-voltage", "drain-voltage"} <= set(at_light)
    assert at_light["output-voltage"]["limit"] == pytest.approx(25.0)
    assert 60.0 < at_light["hazard-voltage"]["value"] < 71.5
    strict = run(*args, "--strict")
    assert strict.exit_code == 1
    assert "Ratings exceeded" in strict.output and "hazard" in strict.output


def test_ambient_max_applies_to_the_junction_checks(catalog):
    # the diode at 120 °C ambient: Tj = 120 + 60 °C/W·(0.47 V·0.8 A) = 142.56 °C
    # (Erickson & Maksimovic ch. 3, charge balance: the diode's average current is Iout),
    # above its 150 − 25 = 125 °C limit (standard profile)
    result = run(SPEC, *PARTS, "--db", catalog, "--ambient-max", "120", "--format", "json")
    assert result.exit_code == 0, result.output
    hot = [v for v in _violations(result.output) if v["rule"] == "diode-thermal"]
    full = [v for v in hot if v["point"]["iout_a"] == 0.8]
    assert full and all(v["value"] == pytest.approx(142.56, abs=0.05) for v in full)
    assert all(v["limit"] == pytest.approx(125.0) for v in hot)


# ---------------------------------------------------------------- the saturation check

STAGE = Stage(
    inductance_h=15e-6, dcr_ohm=0.0, rds_on_ohm=0.0, diode_vf_v=0.0, cout_f=100e-6,
    esr_ohm=0.0, fsw_hz=400e3, output_count=1,
)  # fmt: skip
RATINGS = Ratings(
    cap_voltage_v=None, cap_voltage_use=0.5, vds_v=None, vds_use=0.8, vrrm_v=None,
    vrrm_use=0.8, isat_a=4.0, isat_use=0.8, inductance_tolerance=0.2,
    switch_tj_max_degc=None, switch_theta_ja_degc_w=None, switch_margin_degc=25.0,
    switch_ceiling_degc=math.inf, diode_tj_max_degc=None, diode_theta_ja_degc_w=None,
    diode_margin_degc=25.0, diode_ceiling_degc=math.inf, ambient_degc=25.0, spec_vout_v=24.0,
    parts={"inductor": "QM-150-1265"},
)  # fmt: skip
SPEC_OBJ = Spec(vin_min_v=6.0, vin_max_v=8.4, vout_v=24.0, iout_a=0.8, fsw_hz=400e3,
                vout_ripple_v=0.12)  # fmt: skip


def test_saturation_is_checked_at_the_low_end_of_the_inductance_tolerance():
    # An ideal (lossless) stage at D = 0.75 from 6 V: Vout = 24 V, I_L = 0.8/0.25 = 3.2 A
    # (Erickson & Maksimovic ch. 2). At L·(1 − 0.2) = 12 µH the ripple is
    # 6·0.75/(400 kHz·12 µH) = 0.9375 A, so the peak is 3.2 + 0.46875 = 3.66875 A; at the
    # nominal 15 µH it would be 3.575 A. Both are above 0.8·4 A = 3.2 A.
    result = verify_design(SPEC_OBJ, STAGE, [OperatingPoint(6.0, 0.8)], duty=0.75,
                           ratings=RATINGS)  # fmt: skip
    saturation = [v for v in result.violations if v.rule == "saturation"]
    assert len(saturation) == 1
    assert saturation[0].value == pytest.approx(3.66875, rel=2e-3)
    assert saturation[0].limit == pytest.approx(3.2)
    # with more Isat the same point passes
    roomy = verify_design(SPEC_OBJ, STAGE, [OperatingPoint(6.0, 0.8)], duty=0.75,
                          ratings=replace(RATINGS, isat_a=4.6))  # fmt: skip
    assert not roomy.violations


def test_a_leakage_that_runs_away_is_a_violation_not_a_number():
    # a hand-built Schottky leaking 5 mA at 25 °C behind 150 °C/W: at 60 °C ambient the
    # leakage alone, 5 mA·2^3.5·~18 V ≈ 1 W, would lift the junction by 150 °C, which
    # raises the leakage further: no steady Tj (leakage doubling per 10 °C, from memory)
    stage = replace(STAGE, ir_a=5e-3, diode_theta_ja_degc_w=150.0, diode_tj_max_degc=150.0,
                    ambient_degc=60.0)  # fmt: skip
    ratings = replace(RATINGS, diode_tj_max_degc=150.0, diode_theta_ja_degc_w=150.0,
                      ambient_degc=60.0, isat_a=None)  # fmt: skip
    result = verify_design(SPEC_OBJ, stage, [OperatingPoint(6.0, 0.8)], duty=0.75,
                           ratings=ratings)  # fmt: skip
    assert result.points[0].state.thermal_runaway
    assert [v.rule for v in result.violations] == ["thermal-runaway"]
    assert result.to_dict()["violations"][0]["rule"] == "thermal-runaway"
    # a part leaking a thousand times less settles (the same iteration converges)
    calm = verify_design(SPEC_OBJ, replace(stage, ir_a=5e-6), [OperatingPoint(6.0, 0.8)],
                         duty=0.75, ratings=ratings)  # fmt: skip
    assert not calm.points[0].state.thermal_runaway
    assert calm.points[0].state.losses_w["leakage"] > 0.0


def test_core_loss_from_imported_steinmetz_data(catalog):
    # QM-150-1265S (invented): k = 3.0, α = 1.45, β = 2.6, Ve = 600 mm³, Ae = 20 mm², N = 12.
    # Its triangular current swings ΔI = iL max − iL min with duty D, so ΔB = L·ΔI/(N·Ae)
    # and the iGSE gives P = Ve·k_i·ΔB^β·f^α·(D^(1−α) + (1 − D)^(1−α)) (Venkatachalam et al.
    # 2002, the two-segment case), k_i = k/((2π)^(α−1)·∫|cos θ|^α dθ·2^(β−α)).
    from scipy.integrate import quad

    with_core = [PARTS[0], "QM-150-1265S", *PARTS[2:]]
    result = run(SPEC, *with_core, "--db", catalog, "--format", "json")
    assert result.exit_code == 0, result.output
    document = json.loads(result.output)
    assert "core" not in {n["term"] for n in document["not_included"]}
    integral, _ = quad(lambda theta: abs(math.cos(theta)) ** 1.45, 0.0, 2.0 * math.pi, limit=200)
    k_i = 3.0 / ((2.0 * math.pi) ** 0.45 * integral * 2.0**1.15)
    for point in (p for p in document["points"] if p["mode"] == "ccm"):
        swing_t = 15e-6 * (point["il_max_a"] - point["il_min_a"]) / (12 * 20e-6)
        duty = point["duty"]
        shape = duty**-0.45 + (1.0 - duty) ** -0.45
        expected_w = 600e-9 * k_i * swing_t**2.6 * 400e3**1.45 * shape
        assert point["losses_w"]["core"] == pytest.approx(expected_w, rel=1e-3)
        assert point["losses_w"]["core"] > 1e-3  # a real term: milliwatts, not rounding
