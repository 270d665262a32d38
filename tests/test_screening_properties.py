"""Property tests: a worse part or a harder duty never turns a failure into a pass.

Parts are random arrays fed straight to each role's rules (no database), against the real
boost model of a fixed invented spec.
"""

from __future__ import annotations

from dataclasses import replace

import numpy as np
from hypothesis import given, settings
from hypothesis import strategies as st

from partpick.design.spec import load_spec
from partpick.design.topologies import get_topology
from partpick.screening.checks import FAIL, limit_rule, thermal_rule, use_rule
from partpick.screening.pick import ROLE_RULES, classify, with_core_data
from partpick.screening.profiles import load_profile

SPEC = load_spec(
    None,
    {
        "vin_min": "6 V",
        "vin_max": "9 V",
        "vout": "18 V",
        "iout": "1 A",
        "fsw": "200 kHz",
        "vout_ripple": "100 mV",
        "vin_ripple": "50 mV",
        "ambient_max": 50,
    },
)
PROFILE = load_profile("standard")
FAILED = 2

# field -> (low, high) of plausible values; NaN is drawn too (a missing figure)
RANGES = {
    "inductance_h": (5e-6, 60e-6),
    "tolerance": (0.0, 0.3),
    "isat_a": (1.0, 8.0),
    "irms_a": (1.0, 8.0),
    "dcr_ohm": (1e-3, 0.1),
    "srf_hz": (1e6, 1e8),
    "capacitance_f": (1e-6, 200e-6),
    "voltage_v": (6.3, 100.0),
    "esr_ohm": (1e-3, 0.3),
    "ripple_a": (0.1, 4.0),
    "temp_max_degc": (40.0, 150.0),
    "vrrm_v": (10.0, 100.0),
    "if_avg_a": (0.5, 5.0),
    "vf_v": (0.3, 1.2),
    "qrr_c": (0.0, 100e-9),
    "tj_max_degc": (100.0, 175.0),
    "theta_ja_degc_w": (10.0, 200.0),
    "vds_v": (10.0, 100.0),
    "id_a": (1.0, 30.0),
    "rds_on_ohm": (2e-3, 0.2),
    "qgd_c": (1e-9, 30e-9),
    "coss_f": (50e-12, 1e-9),
}
ENUMS = {
    "dielectric": (None, "c0g", "x7r", "x5r", "y5v", "al-polymer", "al-electrolytic", "film"),
    "lifecycle": (None, "active", "nrnd", "obsolete"),
    "diode_type": (None, "schottky", "fast", "standard", "sic"),
    "channel": (None, "n", "p"),
}
# a datasheet DC-bias point ties C to an absolute voltage, not to the rating: its own
# properties are in tests/test_dc_bias.py, so these draws leave it out
NOT_DRAWN = ("capacitance_at_bias_f", "bias_v")
# ratings: lower is worse. loss-raising part figures: higher is worse.
RATINGS = {
    "inductor": ("isat_a", "irms_a", "srf_hz"),
    "output-cap": ("capacitance_f", "voltage_v", "ripple_a", "temp_max_degc"),
    "input-cap": ("capacitance_f", "voltage_v", "ripple_a", "temp_max_degc"),
    "diode": ("vrrm_v", "if_avg_a", "tj_max_degc"),
    "switch": ("vds_v", "id_a", "tj_max_degc"),
}
STRESSORS = {
    "inductor": (),
    "output-cap": ("esr_ohm",),
    "input-cap": ("esr_ohm",),
    "diode": ("vf_v", "qrr_c", "theta_ja_degc_w"),
    "switch": ("rds_on_ohm", "qgd_c", "coss_f", "theta_ja_degc_w"),
}


@st.composite
def catalogs(draw, role: str):
    """Draw columns for 1..12 parts of the role's kind."""
    n = draw(st.integers(1, 12))
    columns: dict[str, np.ndarray] = {
        "mpn": np.array([f"INV-{i:03d}" for i in range(n)], dtype=object),
        "manufacturer": np.array(["Quillmark Magnetics"] * n, dtype=object),
        "unit_price": np.ones(n),
        "length_mm": np.full(n, 5.0),
        "width_mm": np.full(n, 5.0),
    }
    for name in ROLE_RULES[role].fields:
        if name in NOT_DRAWN:
            columns[name] = np.full(n, np.nan)
        elif name in ENUMS:
            values = draw(st.lists(st.sampled_from(ENUMS[name]), min_size=n, max_size=n))
            columns[name] = np.array(values, dtype=object)
        else:
            low, high = RANGES[name]
            number = st.one_of(st.floats(low, high), st.just(float("nan")))
            columns[name] = np.array(draw(st.lists(number, min_size=n, max_size=n)))
    return columns


def outcome_codes(role: str, columns, spec=SPEC) -> np.ndarray:
    rules = ROLE_RULES[role]
    topology = get_topology(spec.topology)
    envelope = topology.envelope(spec)
    screen = rules.screen(columns, spec, envelope, topology, PROFILE, 4)
    return classify(with_core_data(screen, rules.core))


def _changed(columns, names, factor: float):
    out = dict(columns)
    for name in names:
        out[name] = columns[name] * factor
    return out


def _never_unfails(before: np.ndarray, after: np.ndarray) -> None:
    # a failed part stays failed; nothing that failed may be passed or unverified now
    assert np.all(after[before == FAILED] == FAILED)


def _role_case(role: str):
    return st.tuples(catalogs(role), st.floats(0.3, 1.0), st.sampled_from(RATINGS[role]))


@settings(max_examples=40, deadline=None)
@given(data=st.data(), role=st.sampled_from(sorted(RATINGS)))
def test_lowering_a_rating_never_turns_a_failure_into_a_pass(data, role):
    columns, factor, rating = data.draw(_role_case(role))
    before = outcome_codes(role, columns)
    after = outcome_codes(role, _changed(columns, (rating,), factor))
    _never_unfails(before, after)


@settings(max_examples=40, deadline=None)
@given(data=st.data(), role=st.sampled_from(["output-cap", "input-cap", "diode", "switch"]))
def test_raising_a_part_stress_never_turns_a_failure_into_a_pass(data, role):
    columns = data.draw(catalogs(role))
    factor = data.draw(st.floats(1.0, 3.0))
    stressor = data.draw(st.sampled_from(STRESSORS[role]))
    before = outcome_codes(role, columns)
    after = outcome_codes(role, _changed(columns, (stressor,), factor))
    _never_unfails(before, after)


@settings(max_examples=30, deadline=None)
@given(data=st.data(), role=st.sampled_from(sorted(RATINGS)))
def test_a_hotter_ambient_never_turns_a_failure_into_a_pass(data, role):
    columns = data.draw(catalogs(role))
    rise = data.draw(st.floats(0.0, 60.0))
    hot_spec = replace(SPEC, ambient_max_degc=50.0 + rise)
    _never_unfails(outcome_codes(role, columns), outcome_codes(role, columns, hot_spec))


finite = st.floats(0.01, 1e3)


@settings(max_examples=200, deadline=None)
@given(stress=finite, rating=finite, use=st.floats(0.1, 1.0), down=st.floats(0.01, 1.0))
def test_use_rule_monotone(stress, rating, use, down):
    def status(s, r):
        return use_rule("x", "A", np.array([s]), np.array([r]), use).status[0]

    if status(stress, rating) == FAIL:
        assert status(stress, rating * down) == FAIL  # a lower rating
        assert status(stress / down, rating) == FAIL  # a higher stress


@settings(max_examples=200, deadline=None)
@given(stress=finite, limit=finite, up=st.floats(1.0, 100.0))
def test_limit_rule_monotone(stress, limit, up):
    def status(s, lim):
        return limit_rule("x", "V", np.array([s]), np.array([lim]), 1).status[0]

    if status(stress, limit) == FAIL:
        assert status(stress * up, limit) == FAIL
        assert status(stress, limit / up) == FAIL


@settings(max_examples=200, deadline=None)
@given(
    rise=st.floats(0.0, 200.0),
    tj_max=st.floats(80.0, 200.0),
    margin=st.floats(0.0, 50.0),
    more=st.floats(0.0, 100.0),
)
def test_thermal_rule_monotone(rise, tj_max, margin, more):
    def status(r, tmax):
        return thermal_rule(
            "thermal", np.array([50.0 + r]), np.array([tmax]), np.array([tmax - margin]), 50.0
        ).status[0]

    if status(rise, tj_max) == FAIL:
        assert status(rise + more, tj_max) == FAIL
        assert status(rise, tj_max - more) == FAIL
