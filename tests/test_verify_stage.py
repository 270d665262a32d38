"""Building the verified stage from catalog fields, and the verification's points and warnings.

Part numbers and manufacturers are invented.
"""

from __future__ import annotations

import numpy as np
import pytest

from partpick.design.spec import Spec
from partpick.errors import ParameterError
from partpick.screening.profiles import load_profile
from partpick.verify.stage import effective_capacitance_f, stage_from_parts
from partpick.verify.sweep import (
    OperatingPoint,
    default_points,
    verify_design,
    verify_parts,
    waveforms,
)
from partpick.verify.terms import not_included_terms

SPEC = Spec(
    vin_min_v=6.0,
    vin_max_v=8.4,
    vout_v=24.0,
    iout_a=0.8,
    fsw_hz=400e3,
    vout_ripple_v=0.12,
    iout_min_a=0.05,
)


def parts(**changes: dict) -> dict[str, dict[str, object]]:
    chosen = {
        "inductor": {"mpn": "QM-150-1265", "inductance_h": 15e-6, "dcr_ohm": 0.018},
        "output-cap": {
            "mpn": "BRV-106-X7R-50",
            "capacitance_f": 10e-6,
            "tolerance": 0.1,
            "dielectric": "x7r",
            "voltage_v": 50.0,
            "esr_ohm": 0.004,
        },
        "diode": {"mpn": "SLV-ZK40-3A0", "diode_type": "schottky", "vf_v": 0.47, "qrr_c": None},
        "switch": {"mpn": "NTV-QN40-20", "rds_on_ohm": 0.007, "qgd_c": 2.5e-9, "coss_f": 200e-12},
    }
    for role, fields in changes.items():
        chosen[role.replace("_", "-")] = {**chosen[role.replace("_", "-")], **fields}
    return chosen


def build(chosen=None, **kwargs):
    options = {"hot_factor": 1.5, "output_count": 3, **kwargs}
    return stage_from_parts(SPEC, chosen or parts(), **options)


@pytest.mark.parametrize(
    ("capacitance_f", "tolerance", "dielectric", "rated_v", "expected_f"),
    [
        # C × (1 − tol) × k_bias(24 V / V_rated), k_bias linear between the standard
        # profile's DC-bias points (from memory): x7r 25 % 0.78, 50 % 0.50; x5r 25 % 0.70,
        # 50 % 0.42; y5v 80 % 0.15, 100 % 0.12
        (10e-6, 0.1, "x7r", 50.0, 10e-6 * 0.9 * (0.78 - 0.28 * 23 / 25)),  # 48 %: 4.70 µF
        (10e-6, None, "x5r", 100.0, 10e-6 * 0.8 * (0.88 - 0.18 * 14 / 15)),  # 24 %, tol 0.2
        (1e-6, 0.2, "y5v", 25.0, 1e-6 * 0.8 * (0.15 - 0.03 * 16 / 20)),  # 96 %
        (47e-6, 0.2, "al-polymer", 35.0, 47e-6 * 0.8),  # keeps all: 37.6 µF
        (100e-9, 0.05, "c0g", 50.0, 95e-9),
    ],
)
def test_effective_capacitance(capacitance_f, tolerance, dielectric, rated_v, expected_f):
    part = {"voltage_v": rated_v}
    got = effective_capacitance_f(capacitance_f, tolerance, dielectric, working_v=24.0, part=part)
    assert got == pytest.approx(expected_f)
    # the standard profile file holds the same figures
    profile = load_profile("standard")
    got = effective_capacitance_f(
        capacitance_f, tolerance, dielectric, profile, working_v=24.0, part=part
    )
    assert got == pytest.approx(expected_f)


def test_effective_capacitance_without_a_working_voltage_takes_the_rating():
    # the standard x7r table's point at 100 % of the rating is 0.26 (from memory)
    got = effective_capacitance_f(10e-6, 0.1, "x7r", part={"voltage_v": 50.0})
    assert got == pytest.approx(10e-6 * 0.9 * 0.26)


def test_stage_takes_every_figure_from_the_parts():
    stage = build()
    assert stage.inductance_h == 15e-6
    assert stage.dcr_ohm == 0.018
    assert stage.rds_on_ohm == 0.007 and stage.hot_factor == 1.5
    assert stage.rds_on_hot_ohm == pytest.approx(0.0105)  # 7 mΩ × 1.5
    # 10 µF ±10 % X7R 50 V at Vout = 24 V (48 % of its rating): the standard DC-bias table
    # (from memory) keeps 0.78 − 0.28·23/25 = 0.5224, so 10·0.9·0.5224 = 4.70 µF
    assert stage.cout_f == pytest.approx(10e-6 * 0.9 * 0.5224) and stage.output_count == 3
    assert stage.fsw_hz == 400e3 and stage.gate_drive_a == 1.0
    # a Schottky has no stored charge: a missing Qrr is 0, with a note saying so
    assert stage.qrr_c == 0.0
    assert any("SLV-ZK40-3A0" in note for note in stage.notes)


@pytest.mark.parametrize(
    ("role", "field", "option", "attribute", "value", "expected"),
    [
        ("inductor", "dcr_ohm", "--dcr", "dcr_ohm", 0.045, 0.045),
        ("inductor", "inductance_h", "--inductance", "inductance_h", 10e-6, 10e-6),
        ("output_cap", "esr_ohm", "--esr", "esr_ohm", 0.01, 0.01),
        # 22 µF ±10 % X7R 50 V at 24 V: 22·0.9·0.5224 = 10.34 µF (DC-bias table, from memory)
        ("output_cap", "capacitance_f", "--capacitance", "cout_f", 22e-6, 22e-6 * 0.9 * 0.5224),
        ("diode", "vf_v", "--vf", "diode_vf_v", 0.5, 0.5),
        ("switch", "rds_on_ohm", "--rds-on", "rds_on_ohm", 0.02, 0.02),
    ],
)
def test_missing_parasitic_names_field_part_and_option(
    role, field, option, attribute, value, expected
):
    chosen = parts(**{role: {field: float("nan")}})
    with pytest.raises(ParameterError) as caught:
        build(chosen)
    error = caught.value
    assert error.field == field
    assert error.part == chosen[role.replace("_", "-")]["mpn"]
    assert option in str(error) and field in str(error)
    # the override fills the gap
    stage = build(chosen, overrides={field: value})
    assert getattr(stage, attribute) == pytest.approx(expected)


@pytest.mark.parametrize(
    ("role", "field", "option", "attribute", "value", "term"),
    [
        ("switch", "qgd_c", "--qgd", "qgd_c", 3e-9, "switching"),
        ("switch", "coss_f", "--coss", "coss_f", 150e-12, "coss"),
        ("switch", "qg_c", "--qg", "qg_c", 9e-9, "gate_drive"),
        ("diode", "cj_f", "--cj", "cj_f", 80e-12, "diode_cj"),
    ],
)
def test_missing_loss_only_figure_leaves_its_term_out(role, field, option, attribute, value, term):
    # issue 11: the waveforms do not depend on a loss-only figure, so the stage still builds;
    # the term is listed as not included and a note names the option that supplies it
    chosen = parts(**{role: {field: float("nan")}})
    stage = build(chosen)
    assert getattr(stage, attribute) is None
    assert any(option in note and chosen[role]["mpn"] in note for note in stage.notes)
    assert term in {n.term for n in not_included_terms(stage)}
    filled = build(chosen, overrides={field: value})
    assert getattr(filled, attribute) == pytest.approx(value)
    assert term not in {n.term for n in not_included_terms(filled)}


def test_missing_recovery_charge_of_a_fast_diode_is_not_included():
    # Erickson & Maksimovic ch. 4: only a Schottky has no stored charge; a fast diode's
    # missing Qrr cannot be taken as zero, so its recovery loss is left out and said so
    stage = build(parts(diode={"diode_type": "fast"}))
    assert stage.qrr_c is None
    assert "recovery" in {n.term for n in not_included_terms(stage)}


def test_overrides_win_over_the_catalog():
    stage = build(overrides={"dcr_ohm": 0.045, "esr_ohm": 0.01})
    assert stage.dcr_ohm == 0.045 and stage.esr_ohm == 0.01


def test_unknown_override_is_refused():
    with pytest.raises(ParameterError, match="isat_a"):
        build(overrides={"isat_a": 5.0})


# ---------------------------------------------------------------- points and warnings


def test_default_points():
    points = default_points(SPEC, extra_vin_v=[7.0], extra_iout_a=[0.4, 0.8])
    vins = sorted({p.vin_v for p in points})
    loads = sorted({p.iout_a for p in points})
    assert vins == [6.0, 7.0, 7.2, 8.4]
    assert loads == [0.05, 0.4, 0.8]
    assert len(points) == 12


@pytest.mark.parametrize(
    ("changes", "kwargs", "code"),
    [
        # one 10 µF X7R part: charge ripple ≈ 0.8·0.76/(400 kHz·5.4 µF) = 0.28 V > 0.12 V
        ({}, {"output_count": 1}, "ripple-above-limit"),
        # 1 µH at full load: K = 2·1 µH·400 kHz/30 Ω = 0.027 < Kcrit(0.76) = 0.044 → DCM
        ({"inductor": {"inductance_h": 1e-6}}, {}, "dcm-where-ccm-assumed"),
        # 0.5 Ω of DCR caps the boost ratio below 4 (Erickson & Maksimovic ch. 3)
        ({"inductor": {"dcr_ohm": 0.5}}, {}, "vout-unreachable"),
    ],
)
def test_warnings(changes, kwargs, code):
    stage = build(parts(**changes), **kwargs)
    result = verify_design(SPEC, stage)
    assert code in {w.code for w in result.warnings}


def test_high_duty_warning():
    # 2 V to 24 V needs D ≥ 1 − 2/24 = 0.92 even without losses ([EM] ch. 2)
    result = verify_design(SPEC, build(), [OperatingPoint(2.0, 0.2)])
    codes = {w.code for w in result.warnings}
    assert "high-duty" in codes


def test_efficiency_below_the_estimate_is_flagged_at_full_load_only():
    # issue 11: an estimate above the verified efficiency underestimates the design's
    # currents (I_in = P_out/(η·Vin), Erickson & Maksimovic ch. 3), so it is flagged ...
    result = verify_design(SPEC, build(), efficiency_estimate=0.995)
    flagged = [w for w in result.warnings if w.code == "efficiency-below-estimate"]
    assert flagged and all(w.iout_a == SPEC.iout_a for w in flagged)
    # ... while an estimate below it (the design is conservative) never is
    quiet = verify_design(SPEC, build(), efficiency_estimate=0.6)
    assert "efficiency-below-estimate" not in {w.code for w in quiet.warnings}


def test_efficiency_advice_points_to_the_conservative_side():
    from partpick.render.verify import warning_sentence

    result = verify_design(SPEC, build(), efficiency_estimate=0.995)
    warning = next(w for w in result.warnings if w.code == "efficiency-below-estimate")
    sentence = warning_sentence(warning)
    # the advice names a figure at or below the verified efficiency, never the estimate
    advised = float(sentence.split("--efficiency ")[1].split("%")[0]) / 100.0
    assert advised <= warning.value < warning.limit
    assert "or lower" in sentence


def test_verify_parts_for_the_bom():
    result = verify_parts(SPEC, parts(), hot_factor=1.5, output_count=3)
    assert [(p.point.vin_v, p.point.iout_a) for p in result.points] == [(6.0, 0.8), (8.4, 0.8)]
    assert all(p.state.regulated for p in result.points)
    assert result.to_dict()["points"][0]["vout_avg_v"] == pytest.approx(24.0, rel=1e-6)


def test_waveforms_repeat_every_period_and_agree_with_the_figures():
    result = verify_design(SPEC, build(), [OperatingPoint(6.0, 0.8)])
    state = result.points[0].state
    wave = waveforms(state, periods=2, samples=200)
    period = 1.0 / SPEC.fsw_hz
    assert wave.time_s[0] == 0.0 and wave.time_s[-1] == pytest.approx(2 * period)
    assert np.all(np.diff(wave.time_s) >= 0.0)
    half = wave.time_s.size // 2
    assert np.allclose(wave.il_a[:half], wave.il_a[half:], rtol=1e-9, atol=1e-9)
    assert wave.il_a.max() == pytest.approx(state.il_max_a, rel=1e-6)
    assert wave.il_a.min() == pytest.approx(state.il_min_a, rel=1e-6)
    assert wave.vout_v.max() - wave.vout_v.min() == pytest.approx(state.vout_ripple_v, rel=1e-3)
