"""``partpick stress`` and the shared spec options: table, JSON, overrides, bad input."""

from __future__ import annotations

import json
from io import StringIO
from pathlib import Path

import pytest
import typer
from rich.console import Console
from typer.testing import CliRunner

from partpick.cli import app
from partpick.cli.common import friendly_errors
from partpick.cli.spec_options import option_flag, with_spec_options
from partpick.design.spec import SPEC_KEYS, Spec
from partpick.design.topologies import analyse
from partpick.render.stress import render_stress

DATA = Path(__file__).parent / "data" / "design"
LOGGER = str(DATA / "logger.toml")
BAD_FILES = sorted((DATA / "bad").glob("*.toml"))
ISSUE_3_JSON_KEYS = [
    "duty_min", "duty_max", "l_min_h", "l_max_h", "l_recommended_h",
    "il_avg_max_a", "il_ripple_max_a", "il_peak_max_a", "il_rms_max_a",
    "isw_rms_max_a", "vsw_max_v", "id_avg_a", "id_peak_max_a", "vd_reverse_max_v",
    "icout_rms_max_a", "cout_min_f", "esr_max_ohm", "icin_rms_max_a", "ccm", "cautions",
]  # fmt: skip
FULL_COMMAND_LINE = [
    "--vin-min", "6.0 V", "--vin-max", "8.4 V", "--vout", "24 V", "--iout", "0.8 A",
    "--fsw", "400 kHz", "--vout-ripple", "120 mV",
]  # fmt: skip

runner = CliRunner()


def run(*args: str):
    return runner.invoke(app, ["stress", *args], env={"COLUMNS": "120"})


def run_json(*args: str) -> dict:
    result = run(*args, "--format", "json")
    assert result.exit_code == 0, result.output
    return json.loads(result.stdout)


def test_table_groups_figures_and_shows_cautions():
    result = run(LOGGER)
    assert result.exit_code == 0, result.output
    for heading in ["Inductor", "Switch", "Diode", "Output capacitor", "Input capacitor"]:
        assert heading in result.stdout
    assert "peak current at l_min" in result.stdout
    assert "4.37 A" in result.stdout  # hand-worked in tests/test_boost.py: 4.3676 A at 6 V
    assert "9.8 µH" in result.stdout  # l_min = 9.797 µH
    assert "Cautions" in result.stdout
    assert "qualified engineer" in result.stdout
    assert "Warnings" in result.stdout  # iout_min = 50 mA runs in DCM
    assert "DCM" in result.stdout


def test_json_has_the_issue_3_keys_in_si_units():
    data = run_json(LOGGER)
    for key in ISSUE_3_JSON_KEYS:
        assert key in data, key
    # Hand-worked in tests/test_boost.py (Texas Instruments SLVA372 forms).
    assert data["l_min_h"] == pytest.approx(9.797e-6, rel=2e-4)
    assert data["cout_min_f"] == pytest.approx(13.125e-6, rel=1e-9)
    assert data["duty_max"] == pytest.approx(0.7875, rel=1e-9)
    # smallest E12 L with L·(1 − 0.2) ≥ 9.797 µH (the default ±20 %): 15 µH
    assert data["l_recommended_h"] == pytest.approx(15e-6)
    assert data["ccm"] is True
    assert isinstance(data["cautions"], list) and all(isinstance(c, str) for c in data["cautions"])
    assert data["worst_vin_v"]["il_peak_max_a"] == pytest.approx(6.0)
    assert data["units"]["cout_min_f"] == "F"
    assert data["spec"]["fsw_hz"] == 400e3


def test_cli_overrides_win_over_the_file():
    # D_max = 1 - 5·0.85/24 = 0.822917 once vin_min is overridden to 5 V (SLVA372 duty form).
    data = run_json(LOGGER, "--vin-min", "5", "--ripple-ratio", "0.3,0.5")
    assert data["duty_max"] == pytest.approx(1 - 5 * 0.85 / 24, rel=1e-12)
    assert data["spec"]["vin_min_v"] == 5.0
    assert data["spec"]["ripple_ratio_lo"] == 0.3
    assert data["spec"]["vout_v"] == 24.0  # from the file


def test_spec_entirely_on_the_command_line():
    data = run_json(*FULL_COMMAND_LINE)
    assert data["cout_min_f"] == pytest.approx(13.125e-6, rel=1e-9)
    assert data["spec"]["source"] is None


def test_hazardous_voltage_in_json():
    # IEC 62368-1 ES1 limit 60 V DC
    data = run_json(*FULL_COMMAND_LINE, "--vout", "100 V")
    assert any("60 V" in text and "IEC 62368-1" in text for text in data["cautions"])


def test_high_duty_warning_is_visible_in_the_table():
    # 2 V to 48 V at η = 0.85: D = 0.965 (above 0.9, common practice)
    result = run(*FULL_COMMAND_LINE, "--vin-min", "2", "--vin-max", "3", "--vout", "48")
    assert result.exit_code == 0, result.output
    assert "Warnings" in result.stdout and "duty cycle reaches 0.965" in result.stdout


@pytest.mark.parametrize("path", BAD_FILES, ids=[p.stem for p in BAD_FILES])
def test_bad_spec_files_exit_2_naming_the_key(path):
    key = path.read_text(encoding="utf-8").splitlines()[0].removeprefix("# expect:")
    key = key.split("|")[0].strip()
    result = run(str(path))
    assert result.exit_code == 2, result.output
    assert f"'{key}'" in result.stderr
    assert "Traceback" not in result.output
    assert result.stderr.count("\n") == 1  # one line


@pytest.mark.parametrize(
    ("args", "key"),
    [
        (["--vin-min", "6"], "vin_max"),
        ([LOGGER, "--vout", "7"], "vout"),
        ([LOGGER, "--efficiency", "1.5"], "efficiency"),
        ([LOGGER, "--ripple-ratio", "0.5"], "ripple_ratio"),
        ([LOGGER, "--fsw", "400 kV"], "fsw"),
        ([str(DATA / "missing.toml")], "(file)"),
    ],
)
def test_bad_options_exit_2_naming_the_key(args, key):
    result = run(*args)
    assert result.exit_code == 2, result.output
    assert f"'{key}'" in result.stderr
    assert "Traceback" not in result.output


def test_help_lists_every_spec_option():
    result = run("--help")
    assert result.exit_code == 0, result.output
    for key in SPEC_KEYS:
        assert option_flag(key) in result.stdout, key


def test_rendered_table_at_fixed_width():
    console = Console(file=StringIO(), width=100, color_system=None)
    render_stress(analyse(_spec_from_file()), console)
    text = console.file.getvalue()
    assert "il_peak_max_a" in text  # wide enough for the JSON key column
    assert "6 V" in text  # the Vin where the peak is worst


def _spec_from_file() -> Spec:
    from partpick.design.spec import load_spec

    return load_spec(LOGGER)


def test_another_command_takes_a_spec_with_one_decorator():
    toy = typer.Typer()
    seen: dict[str, object] = {}

    @toy.callback()
    def main() -> None:
        """A toy app with two commands, as partpick has."""

    @toy.command("probe")
    @friendly_errors
    @with_spec_options
    def probe(role: str, spec: Spec, top: int = 3) -> None:
        seen.update(role=role, spec=spec, top=top)

    result = CliRunner().invoke(toy, ["probe", "inductor", LOGGER, "--fsw", "1 MHz", "--top", "5"])
    assert result.exit_code == 0, result.output
    assert seen["role"] == "inductor" and seen["top"] == 5
    assert isinstance(seen["spec"], Spec) and seen["spec"].fsw_hz == 1e6
    bad = CliRunner().invoke(toy, ["probe", "inductor", LOGGER, "--vout", "1"])
    assert bad.exit_code == 2 and "'vout'" in bad.stderr


def test_the_ripple_at_l_min_is_one_row():
    # The ripple at l_min is, by the sizing, hi·IL(vin_min) (Erickson & Maksimovic ch. 2,
    # inductor ripple; issue 3's window): one figure, printed once.
    from partpick.design.spec import load_spec
    from partpick.design.topologies import analyse

    spec = load_spec(Path(__file__).parents[1] / "catalogs" / "scenarios" / "field-logger.toml")
    labels = [fig.label for fig in analyse(spec).figures.values()]
    assert sum("ripple" in label and "l_min" in label for label in labels) == 1
