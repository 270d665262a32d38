"""Derating profiles: the built-ins, company files that extend them, and bad files."""

from __future__ import annotations

import math

import pytest

from partpick.errors import ProfileError
from partpick.screening.profiles import SCHEMA, load_profile

# Issue 4's "standard" profile, figure by figure (common practice, from memory).
STANDARD = {
    "inductor.saturation_use": 0.8,
    "inductor.rms_use": 0.9,
    "inductor.tolerance_default": 0.2,
    "capacitor.tolerance_default": 0.2,
    "capacitor.voltage_use.c0g": 0.8,
    "capacitor.voltage_use.x5r": 0.5,
    "capacitor.voltage_use.x7r": 0.5,
    "capacitor.voltage_use.x7s": 0.5,
    "capacitor.voltage_use.x6s": 0.5,
    "capacitor.voltage_use.x8r": 0.5,
    "capacitor.voltage_use.y5v": 0.5,
    "capacitor.voltage_use.al-electrolytic": 0.8,
    "capacitor.voltage_use.al-polymer": 0.8,
    "capacitor.voltage_use.ta-mno2": 0.5,
    "capacitor.voltage_use.ta-polymer": 0.8,
    "capacitor.voltage_use.film": 0.7,
    "diode.reverse_voltage_use": 0.8,
    "diode.forward_current_use": 0.7,
    "diode.thermal_margin_degc": 25.0,
    "diode.standard_recovery_max_hz": 20e3,
    "switch.drain_voltage_use": 0.8,
    "switch.drain_current_use": 0.6,
    "switch.thermal_margin_degc": 25.0,
    "switch.hot_factor": 1.5,
    "max_parallel": 4,
}


@pytest.mark.parametrize(("key", "value"), sorted(STANDARD.items()))
def test_standard_profile_is_issue_4(key, value):
    assert load_profile("standard").figures[key] == value


@pytest.mark.parametrize("dielectric", ["c0g", "al-electrolytic", "al-polymer", "film"])
def test_stable_dielectrics_keep_their_capacitance(dielectric):
    assert load_profile("standard").kept_fraction(dielectric) == 1.0


def test_standard_says_it_is_common_practice_from_memory():
    with open(_builtin("standard")) as handle:
        head = handle.read(600)
    assert "common practice" in head and "from memory" in head
    assert "from memory" in load_profile("standard").description


def test_high_rel_follows_ecss_junction_rule():
    # ECSS-Q-ST-30-11: Tj <= min(110 °C, Tjmax − 40 °C), as quoted in issue 4 (from memory)
    hr = load_profile("high-rel")
    for part in ("diode", "switch"):
        assert hr.value(f"{part}.tj_ceiling_degc") == 110.0
        assert hr.value(f"{part}.thermal_margin_degc") == 40.0
    assert math.isinf(load_profile("standard").value("switch.tj_ceiling_degc"))


@pytest.mark.parametrize("key", [k for k, (_u, kind) in SCHEMA.items() if kind == "use"])
def test_high_rel_is_never_looser(key):
    std, hr = load_profile("standard"), load_profile("high-rel")
    if key in std.figures:
        assert hr.figures[key] <= std.figures[key]


def test_builtin_files_mark_unchecked_values():
    with open(_builtin("high-rel")) as handle:
        text = handle.read()
    for source in ("MIL-DTL-917", "NAVSEA SD-18", "EEE-INST-002", "ECSS-Q-ST-30-11"):
        assert source in text
    # every figure line cites a basis or says it is from memory / common practice
    for line in text.splitlines():
        if "=" in line and not line.lstrip().startswith(("#", "[", "name", "description")):
            assert "memory" in line or "common practice" in line or "as in" in line, line


def _builtin(name):
    from partpick.screening.profiles import BUILTIN_DIR

    return str(BUILTIN_DIR / f"{name}.toml")


def test_company_file_overrides_single_values(tmp_path):
    path = tmp_path / "acme.toml"
    path.write_text(
        'extends = "standard"\nname = "acme"\n[inductor]\nsaturation_use = 0.7\n'
        "[capacitor.voltage_use]\nx7r = 0.4\n"
    )
    prof = load_profile(str(path))
    assert prof.name == "acme"
    assert prof.extends == "standard"
    assert prof.value("inductor.saturation_use") == 0.7
    assert prof.voltage_use("x7r") == 0.4
    # everything else is inherited
    assert prof.value("inductor.rms_use") == 0.9
    assert prof.voltage_use("x5r") == 0.5
    assert prof.value("switch.hot_factor") == 1.5


def test_extends_a_company_file(tmp_path):
    (tmp_path / "base.toml").write_text(
        'extends = "high-rel"\n[diode]\nforward_current_use = 0.4\n'
    )
    (tmp_path / "site.toml").write_text('extends = "base.toml"\nmax_parallel = 6\n')
    prof = load_profile(str(tmp_path / "site.toml"))
    assert prof.value("diode.forward_current_use") == 0.4
    assert prof.max_parallel == 6
    assert prof.value("switch.tj_ceiling_degc") == 110.0


@pytest.mark.parametrize(
    ("body", "key"),
    [
        ('extends = "standard"\n[inductor]\nsaturaton_use = 0.7\n', "inductor.saturaton_use"),
        ('extends = "standard"\n[capacitor.voltage_use]\nx9z = 0.5\n', "capacitor.voltage_use.x9z"),
        ('extends = "standard"\n[inductor]\nrms_use = 1.2\n', "inductor.rms_use"),
        ('extends = "standard"\n[inductor]\nrms_use = "high"\n', "inductor.rms_use"),
        ('extends = "standard"\nmax_parallel = 0\n', "max_parallel"),
        ('extends = "standard"\nmax_parallel = 2.5\n', "max_parallel"),
        ('extends = "standard"\n[switch]\nhot_factor = 0.9\n', "switch.hot_factor"),
        ('extends = "standard"\n[diode]\nthermal_margin_degc = -5\n', "diode.thermal_margin_degc"),
        ("[inductor]\nrms_use = 0.9\n", "max_parallel"),  # a full profile must give everything
        ("extends = 3\n", "extends"),
        ('extends = "standard"\nname = 7\n', "name"),
    ],
)
def test_bad_company_file_names_the_key(tmp_path, body, key):
    path = tmp_path / "bad.toml"
    path.write_text(body)
    with pytest.raises(ProfileError) as info:
        load_profile(str(path))
    assert info.value.key == key
    assert key in str(info.value)


@pytest.mark.parametrize("name", ["no-such-profile", "missing.toml"])
def test_unknown_profile(name):
    with pytest.raises(ProfileError, match="not found"):
        load_profile(name)


def test_extends_loop(tmp_path):
    (tmp_path / "a.toml").write_text('extends = "b.toml"\n')
    (tmp_path / "b.toml").write_text('extends = "a.toml"\n')
    with pytest.raises(ProfileError, match="loop"):
        load_profile(str(tmp_path / "a.toml"))


def test_not_toml(tmp_path):
    (tmp_path / "x.toml").write_text("this is = = not toml")
    with pytest.raises(ProfileError, match="not valid TOML"):
        load_profile(str(tmp_path / "x.toml"))


def test_profile_is_frozen():
    prof = load_profile("standard")
    with pytest.raises(TypeError):
        prof.figures["inductor.rms_use"] = 1.0  # type: ignore[index]


def test_a_misspelt_profile_key_is_answered_with_the_valid_keys(tmp_path):
    # common practice, no published source: an error names what would have been accepted
    path = tmp_path / "company.toml"
    path.write_text('extends = "standard"\n[inductor]\nsaturaton_use = 0.7\n', encoding="utf-8")
    with pytest.raises(ProfileError) as caught:
        load_profile(str(path))
    text = str(caught.value)
    assert "did you mean 'inductor.saturation_use'?" in text
    assert "valid keys in [inductor]: rms_use, saturation_use" in text
    path.write_text('extends = "standard"\n[inductr]\nx = 1\n', encoding="utf-8")
    with pytest.raises(ProfileError, match="valid sections: capacitor, diode, inductor, switch"):
        load_profile(str(path))
