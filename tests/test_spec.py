"""Loading and validating converter specs: TOML, unit-bearing values, overrides, bad input."""

from __future__ import annotations

import dataclasses
from pathlib import Path

import pytest

from partpick.design.spec import SPEC_KEYS, Spec, load_spec
from partpick.errors import SpecError

DATA = Path(__file__).parent / "data" / "design"
LOGGER = DATA / "logger.toml"
BAD_FILES = sorted((DATA / "bad").glob("*.toml"))

REQUIRED_ONLY = {
    "vin_min": "6.0 V",
    "vin_max": "8.4 V",
    "vout": "24 V",
    "iout": "0.8 A",
    "fsw": "400 kHz",
    "vout_ripple": "120 mV",
}


def expectation(path: Path) -> tuple[str, str]:
    """Return (key, message fragment) from a bad file's first line ``# expect: key | text``."""
    first = path.read_text(encoding="utf-8").splitlines()[0]
    key, fragment = first.removeprefix("# expect:").split("|", 1)
    return key.strip(), fragment.strip()


def test_load_the_field_logger_file():
    spec = load_spec(LOGGER)
    assert (spec.vin_min_v, spec.vin_max_v, spec.vout_v, spec.iout_a) == (6.0, 8.4, 24.0, 0.8)
    assert spec.fsw_hz == pytest.approx(400e3)
    assert spec.vout_ripple_v == pytest.approx(0.12)
    assert spec.vin_ripple_v == pytest.approx(0.05)
    assert spec.iout_min_a == pytest.approx(0.05)
    assert (spec.ripple_ratio_lo, spec.ripple_ratio_hi) == (0.2, 0.4)
    assert spec.ambient_max_degc == 60.0
    assert spec.name == "field logger 24 V rail"
    assert spec.source == str(LOGGER)


def test_defaults_of_issue_3():
    spec = load_spec(None, REQUIRED_ONLY)
    assert spec.efficiency == 0.85
    assert (spec.ripple_ratio_lo, spec.ripple_ratio_hi) == (0.2, 0.4)
    assert spec.ambient_max_degc == 50.0
    assert spec.topology == "boost"
    assert spec.vin_ripple_v is None and spec.iout_min_a is None
    assert spec.source is None


def test_spec_keys_cover_issue_3_in_order():
    assert list(SPEC_KEYS)[:1] == ["topology"]
    issue_3_keys = (
        "vin_min vin_max vout iout fsw efficiency ripple_ratio vout_ripple vin_ripple "
        "ambient_max iout_min name notes"
    ).split()
    assert set(issue_3_keys) <= set(SPEC_KEYS)
    assert SPEC_KEYS["fsw"].unit == "Hz" and SPEC_KEYS["fsw"].attribute == "fsw_hz"


@pytest.mark.parametrize(
    ("key", "value", "attribute", "expected"),
    [
        ("fsw", "0.4 MHz", "fsw_hz", 400e3),
        ("fsw", "400kHz", "fsw_hz", 400e3),
        ("fsw", 400000, "fsw_hz", 400e3),
        ("vout_ripple", "120 mV", "vout_ripple_v", 0.12),
        ("iout", "800 mA", "iout_a", 0.8),
        ("vin_min", "5.5", "vin_min_v", 5.5),
        ("efficiency", "85 %", "efficiency", 0.85),
        ("efficiency", "1", "efficiency", 1.0),
        ("efficiency", 0.9, "efficiency", 0.9),
        ("ambient_max", "85 °C", "ambient_max_degc", 85.0),
        ("ambient_max", -20, "ambient_max_degc", -20.0),
        ("vin_ripple", "50 mV", "vin_ripple_v", 0.05),
        ("gate_drive_a", "2 A", "gate_drive_a", 2.0),
        ("name", "bench rail", "name", "bench rail"),
        ("topology", " Boost", "topology", "boost"),
    ],
)
def test_values_with_units(key, value, attribute, expected):
    spec = load_spec(None, {**REQUIRED_ONLY, key: value})
    actual = getattr(spec, attribute)
    if isinstance(expected, str):
        assert actual == expected
    else:
        assert actual == pytest.approx(expected)


@pytest.mark.parametrize(
    ("value", "expected"),
    [
        ([0.25, 0.45], (0.25, 0.45)),
        ((0.25, 0.45), (0.25, 0.45)),
        ("0.2,0.4", (0.2, 0.4)),
        ("20 %, 40 %", (0.2, 0.4)),
        ("0.3..1.2", (0.3, 1.2)),
        ("0.3; 1.5", (0.3, 1.5)),
    ],
)
def test_ripple_ratio_forms(value, expected):
    spec = load_spec(None, {**REQUIRED_ONLY, "ripple_ratio": value})
    assert (spec.ripple_ratio_lo, spec.ripple_ratio_hi) == pytest.approx(expected)


def test_overrides_win_over_the_file():
    spec = load_spec(LOGGER, {"vin_min": "5 V", "fsw": "1 MHz", "ripple-ratio": "0.3,0.5"})
    assert spec.vin_min_v == 5.0 and spec.fsw_hz == 1e6
    assert (spec.ripple_ratio_lo, spec.ripple_ratio_hi) == (0.3, 0.5)
    assert spec.vout_v == 24.0  # untouched keys come from the file


def test_none_overrides_mean_not_given():
    assert load_spec(LOGGER, {"vin_min": None}).vin_min_v == 6.0


@pytest.mark.parametrize("path", BAD_FILES, ids=[p.stem for p in BAD_FILES])
def test_bad_spec_files(path):
    key, fragment = expectation(path)
    with pytest.raises(SpecError) as info:
        load_spec(path)
    assert info.value.key == key
    assert fragment in str(info.value)
    assert info.value.file == str(path)
    assert f"'{key}'" in str(info.value)  # the message names the key


@pytest.mark.parametrize(
    ("overrides", "key", "fragment"),
    [
        ({"vin_min": "0 V"}, "vin_min", "positive"),
        ({"vin_max": "-8 V"}, "vin_max", "positive"),
        ({"vout": "7 V"}, "vout", "cannot step down"),
        ({"efficiency": "110 %"}, "efficiency", "(0, 1]"),
        ({"ripple_ratio": "0.4,0.2"}, "ripple_ratio", "lo must be below hi"),
        ({"ripple_ratio": "0.2,0.4,0.6"}, "ripple_ratio", "two numbers"),
        ({"ripple_ratio": "0.2,2"}, "ripple_ratio", "(0, 2)"),
        ({"fsw": "fast"}, "fsw", "not a number"),
        ({"iout": "0.8 V"}, "iout", "unit of voltage"),
        ({"vout_ripple": "30 V"}, "vout_ripple", "below vout"),
        ({"vin_nominal": "7 V"}, "vin_nominal", "unknown key"),
        ({"topology": "sepic"}, "topology", "unknown topology"),
    ],
)
def test_bad_overrides(overrides, key, fragment):
    with pytest.raises(SpecError) as info:
        load_spec(LOGGER, overrides)
    assert info.value.key == key
    assert fragment in str(info.value)


def test_missing_file():
    with pytest.raises(SpecError) as info:
        load_spec(DATA / "no-such-spec.toml")
    assert "no such spec file" in str(info.value)


def test_missing_key_with_nothing_given_names_the_first_required_key():
    with pytest.raises(SpecError) as info:
        load_spec(None)
    assert info.value.key == "vin_min"
    assert "--vin-min" in str(info.value)


@pytest.mark.parametrize(
    ("changes", "key"),
    [
        ({"vin_min_v": -1.0}, "vin_min"),
        ({"efficiency": 1.01}, "efficiency"),
        ({"ripple_ratio_lo": 0.5, "ripple_ratio_hi": 0.4}, "ripple_ratio"),
        ({"vout_v": 8.0}, "vout"),
        ({"fsw_hz": "400 kHz"}, "fsw"),  # text is parsed by load_spec, never by Spec
        ({"iout_min_a": -0.1}, "iout_min"),
    ],
)
def test_spec_validates_itself(changes, key):
    values = dict(vin_min_v=6.0, vin_max_v=8.4, vout_v=24.0, iout_a=0.8, fsw_hz=400e3,
                  vout_ripple_v=0.12)  # fmt: skip
    Spec(**values)
    with pytest.raises(SpecError) as info:
        Spec(**{**values, **changes})
    assert info.value.key == key


def test_spec_is_frozen_and_with_efficiency_validates():
    spec = load_spec(LOGGER)
    with pytest.raises(dataclasses.FrozenInstanceError):
        spec.vout_v = 12.0  # type: ignore[misc]
    assert spec.with_efficiency(0.9).efficiency == 0.9
    assert spec.with_efficiency(0.9).vout_v == spec.vout_v
    with pytest.raises(SpecError):
        spec.with_efficiency(1.5)


def test_integers_become_floats():
    spec = Spec(vin_min_v=6, vin_max_v=8, vout_v=24, iout_a=1, fsw_hz=400_000, vout_ripple_v=1)
    assert isinstance(spec.vin_min_v, float) and isinstance(spec.fsw_hz, float)
