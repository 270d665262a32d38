"""``partpick verify`` end to end, on a small invented catalog imported through ``partpick import``.

Every manufacturer and part number in tests/data/verify/ is invented.
"""

from __future__ import annotations

import json
from pathlib import Path

import pytest
from typer.testing import CliRunner

from partpick.cli import app

DATA = Path(__file__).parent / "data" / "verify"
SPEC = str(DATA / "logger.toml")
PARTS = [
    "--inductor",
    "QM-150-1265",
    "--output-cap",
    "BRV-106-X7R-50",
    "--output-count",
    "3",
    "--diode",
    "SLV-ZK40-3A0",
    "--switch",
    "NTV-QN40-20",
]
POINT_KEYS = {
    "vin_v",
    "iout_a",
    "duty",
    "vout_avg_v",
    "vout_ripple_v",
    "il_min_a",
    "il_max_a",
    "il_rms_a",
    "mode",
    "efficiency",
    "losses_w",
}


@pytest.fixture
def catalog(tmp_path: Path) -> str:
    """Function scope: a catalog file holding the invented parts of tests/data/verify/."""
    db = str(tmp_path / "verify.db")
    runner = CliRunner()
    for kind, name in (
        ("inductor", "inductors.csv"),
        ("capacitor", "capacitors.csv"),
        ("diode", "diodes.csv"),
        ("mosfet", "mosfets.csv"),
    ):
        result = runner.invoke(app, ["import", str(DATA / name), "--kind", kind, "--db", db])
        assert result.exit_code == 0, result.output
    return db


def run(*args: str):
    return CliRunner().invoke(app, ["verify", *args])


def test_named_parts_json_has_every_key(catalog):
    result = run(SPEC, *PARTS, "--db", catalog, "--format", "json")
    assert result.exit_code == 0, result.output
    document = json.loads(result.output)
    points = document["points"]
    # defaults: vin_min, midpoint, vin_max, each at full load and at iout_min
    assert [(p["vin_v"], p["iout_a"]) for p in points] == [
        (6.0, 0.8),
        (6.0, 0.05),
        (7.2, 0.8),
        (7.2, 0.05),
        (8.4, 0.8),
        (8.4, 0.05),
    ]
    for point in points:
        assert POINT_KEYS <= set(point)
        assert point["vout_avg_v"] == pytest.approx(24.0, rel=1e-6)
        assert point["mode"] in ("ccm", "dcm")
        assert 0.0 < point["efficiency"] < 1.0
    assert isinstance(document["warnings"], list)
    # Erickson & Maksimovic, ch. 5: at 50 mA (R = 480 Ω) K = 2·15 µH·400 kHz/480 Ω = 0.025,
    # below Kcrit = D(1−D)² ≈ 0.036..0.062 over this input range, so light load is DCM.
    assert {p["mode"] for p in points if p["iout_a"] == 0.05} == {"dcm"}
    assert {p["mode"] for p in points if p["iout_a"] == 0.8} == {"ccm"}


def test_table_shows_one_row_per_point_and_the_warnings(catalog):
    # One 10 µF X7R part keeps 10·0.9·0.6 = 5.4 µF; the charge ripple alone is about
    # Iout·D/(fsw·C) = 0.8·0.76/(400 kHz·5.4 µF) = 0.28 V, far above the 120 mV limit.
    args = [a if a != "3" else "1" for a in PARTS]
    result = run(SPEC, *args, "--db", catalog, "--vin", "7", "--load", "0.4")
    assert result.exit_code == 0, result.output
    text = result.output
    assert "Warnings" in text
    assert "above the 120 mV limit" in text
    for vin in ("6 V", "7 V", "7.2 V", "8.4 V"):
        assert vin in text
    assert text.count("CCM") + text.count("DCM") == 12  # 4 input voltages × 3 loads


def test_missing_parasitic_names_the_field_and_can_be_overridden(catalog):
    args = ["--inductor", "QM-100-0630-NODCR", *PARTS[2:]]
    result = run(SPEC, *args, "--db", catalog)
    assert result.exit_code == 2
    assert "dcr_ohm" in result.output
    assert "QM-100-0630-NODCR" in result.output
    assert "--dcr" in result.output
    assert "Traceback" not in result.output
    fixed = run(SPEC, *args, "--db", catalog, "--dcr", "45 mOhm", "--format", "json")
    assert fixed.exit_code == 0, fixed.output
    # the override reaches the model: DCR loss = iL_rms² · 45 mΩ
    point = json.loads(fixed.output)["points"][0]
    assert point["losses_w"]["dcr"] == pytest.approx(point["il_rms_a"] ** 2 * 0.045, rel=1e-9)


def test_missing_esr_is_a_clear_error(catalog):
    args = [*PARTS[:2], "--output-cap", "BRV-476-POLY-35", *PARTS[4:]]
    result = run(SPEC, *args, "--db", catalog)
    assert result.exit_code == 2
    assert "esr_ohm" in result.output and "--esr" in result.output


@pytest.mark.parametrize(
    ("args", "message"),
    [
        (["--inductor", "QM-150-1265"], "--output-cap"),
        ([*PARTS[:-1], "NO-SUCH-PART"], "NO-SUCH-PART"),
        ([*PARTS, "--duty", "1.5"], "--duty"),
        ([*PARTS, "--vin", "-3"], "--vin"),
        ([*PARTS, "--plot", "stage.pdf"], ".png or .svg"),
        ([*PARTS, "--dcr", "lots"], "lots"),
        ([*PARTS, "--bom", "bom.json"], "--bom"),
        (["--bom", "missing.json"], "missing.json"),
    ],
)
def test_bad_input_exits_2_with_one_line(catalog, args, message, tmp_path, monkeypatch):
    monkeypatch.chdir(tmp_path)
    result = run(SPEC, *args, "--db", catalog)
    assert result.exit_code == 2, result.output
    assert message in result.output
    assert "Traceback" not in result.output


def test_open_loop_duty(catalog):
    result = run(SPEC, *PARTS, "--db", catalog, "--duty", "0.7", "--format", "json")
    assert result.exit_code == 0, result.output
    points = json.loads(result.output)["points"]
    assert {p["duty"] for p in points} == {0.7}
    # Erickson & Maksimovic ch. 2: in CCM Vout is close to Vin/(1 − D) (less the losses);
    # 6 V at D = 0.7 gives at most 20 V.
    full_load_6v = next(p for p in points if p["vin_v"] == 6.0 and p["iout_a"] == 0.8)
    assert 17.0 < full_load_6v["vout_avg_v"] < 20.0


def _bom_document(with_part_fields: bool) -> dict:
    """A BOM document in the shape ``partpick bom --format json`` writes (issue 5)."""
    lines = [
        {"role": "inductor", "designator": "L1", "qty": 1, "mpn": "QM-150-1265"},
        {"role": "input-cap", "designator": "CIN", "qty": 2, "mpn": "BRV-106-X7R-50"},
        {"role": "output-cap", "designator": "COUT", "qty": 3, "mpn": "BRV-106-X7R-50"},
        {"role": "diode", "designator": "D1", "qty": 1, "mpn": "SLV-ZK40-3A0"},
        {"role": "switch", "designator": "Q1", "qty": 1, "mpn": "NTV-QN40-20"},
    ]
    for line in lines:
        line["manufacturer"] = "invented"
        line["status"] = "passed"
    if with_part_fields:
        lines[0]["part"] = {"inductance_h": 15e-6, "dcr_ohm": 0.018, "tolerance": 0.2}
    return {"lines": lines, "efficiency": 0.95, "profile": "standard"}


@pytest.mark.parametrize("with_part_fields", [False, True])
def test_bom_file_gives_the_same_answer_as_named_parts(catalog, tmp_path, with_part_fields):
    bom = tmp_path / "bom.json"
    bom.write_text(json.dumps(_bom_document(with_part_fields)), encoding="utf-8")
    from_bom = run(SPEC, "--bom", str(bom), "--db", catalog, "--format", "json")
    assert from_bom.exit_code == 0, from_bom.output
    named = run(SPEC, *PARTS, "--db", catalog, "--format", "json")
    assert named.exit_code == 0, named.output
    bom_points = json.loads(from_bom.output)["points"]
    named_points = json.loads(named.output)["points"]
    for a, b in zip(bom_points, named_points, strict=True):
        assert a["vout_ripple_v"] == pytest.approx(b["vout_ripple_v"], rel=1e-9)
        assert a["efficiency"] == pytest.approx(b["efficiency"], rel=1e-9)


def test_bom_without_a_role_is_a_clear_error(catalog, tmp_path):
    document = _bom_document(False)
    document["lines"] = [line for line in document["lines"] if line["role"] != "diode"]
    bom = tmp_path / "bom.json"
    bom.write_text(json.dumps(document), encoding="utf-8")
    result = run(SPEC, "--bom", str(bom), "--db", catalog)
    assert result.exit_code == 2
    assert "diode" in result.output


def test_not_a_bom_file(catalog, tmp_path):
    bom = tmp_path / "bom.json"
    bom.write_text("{not json", encoding="utf-8")
    result = run(SPEC, "--bom", str(bom), "--db", catalog)
    assert result.exit_code == 2
    assert "not a BOM JSON file" in result.output


@pytest.mark.parametrize(
    ("name", "magic"), [("stage.png", b"\x89PNG\r\n\x1a\n"), ("stage.svg", b"<svg")]
)
def test_plot_writes_png_and_svg(catalog, tmp_path, name, magic):
    target = tmp_path / "plots" / name
    missing_folder = run(SPEC, *PARTS, "--db", catalog, "--plot", str(target))
    assert missing_folder.exit_code == 2  # refused before the solve, not made on the fly
    assert "does not exist" in missing_folder.output
    target.parent.mkdir()
    result = run(SPEC, *PARTS, "--db", catalog, "--plot", str(target))
    assert result.exit_code == 0, result.output
    data = target.read_bytes()
    assert magic in data[:400]
    assert not list(target.parent.glob(".*.tmp"))  # the temporary file was renamed away


# ---------------------------------------------------------------- the renderer


def _result_with_warnings():
    from partpick.design.spec import Spec
    from partpick.verify.stage import Stage
    from partpick.verify.sweep import OperatingPoint, verify_design

    spec = Spec(
        vin_min_v=6.0, vin_max_v=8.4, vout_v=24.0, iout_a=0.8, fsw_hz=400e3, vout_ripple_v=0.12
    )
    # one 5.4 µF part: about 0.28 V of charge ripple (Iout·D/(fsw·C)), over the 120 mV limit
    stage = Stage(
        inductance_h=15e-6,
        dcr_ohm=0.018,
        rds_on_ohm=0.007,
        hot_factor=1.5,
        diode_vf_v=0.47,
        cout_f=5.4e-6,
        esr_ohm=0.004,
        fsw_hz=400e3,
    )
    points = [OperatingPoint(6.0, 0.8), OperatingPoint(2.0, 0.2)]
    return verify_design(spec, stage, points, efficiency_estimate=0.995)


def test_render_shows_each_point_and_every_warning_as_a_sentence():
    from io import StringIO

    from rich.console import Console

    from partpick.render.verify import render_verify, warning_sentence

    result = _result_with_warnings()
    codes = {w.code for w in result.warnings}
    assert {"ripple-above-limit", "high-duty", "efficiency-below-estimate"} <= codes
    buffer = StringIO()
    render_verify(result, Console(file=buffer, width=100, color_system=None))
    text = buffer.getvalue()
    assert "6 V" in text and "2 V" in text
    assert "Losses per term in mW" in text
    for warning in result.warnings:
        sentence = warning_sentence(warning)
        assert sentence.split(":")[0] in text
        assert warning.code not in sentence  # sentences, not codes
