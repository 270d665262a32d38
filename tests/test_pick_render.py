"""Sentences and views of the pick renderer, made from Check data alone."""

from __future__ import annotations

from io import StringIO

import pytest
from rich.console import Console

from partpick.render.pick import check_sentence, margin_text
from partpick.screening.checks import Check, Outcome


def make(rule, stress, limit, rating, derating, status, unit="A", vin=None, missing=()):
    util = stress / rating if stress is not None and rating else None
    return Check(rule, stress, limit, rating, derating, util, vin, unit, status, missing)


@pytest.mark.parametrize(
    ("check", "count", "sentence"),
    [
        # issue 4's example: 2.68 A peak at 10.8 V, u = 0.8 → needs 2.68/0.8 = 3.35 A
        (
            make("saturation", 2.68, 0.8 * 3.22, 3.22, 0.8, "fail", vin=10.8),
            1,
            "saturation: needs Isat ≥ 3.35 A (2.68 A peak at 10.8 V in, 80 % use); part has 3.22 A",
        ),
        # 36.1 V on a 60 V part: 36.1/60 = 60 % use, limit 80 %
        (
            make("reverse-voltage", 36.1, 48.0, 60.0, 0.8, "pass", unit="V"),
            1,
            "reverse-voltage: VRRM 60 V vs 36.1 V reverse: 60 % use, limit 80 %",
        ),
        (
            make("inductance", 22e-6, 19.6e-6, None, None, "fail", unit="H"),
            1,
            "inductance: 22 µH nominal is above the design's maximum 19.6 µH",
        ),
        (
            make("inductance", 8e-6, 9.8e-6, None, None, "fail", unit="H"),
            1,
            "inductance: 8 µH at its tolerance, L·(1 − tol), is below the design's minimum 9.8 µH",
        ),
        (
            make("inductance", 12e-6, 9.8e-6, None, None, "pass", unit="H"),
            1,
            "inductance: 12 µH at its tolerance, L·(1 − tol), is at least the design's minimum "
            "9.8 µH",
        ),
        (
            make("ripple-voltage", 0.133, 0.12, 0.12, 1.0, "fail", unit="V"),
            4,
            "ripple-voltage: 133 mV peak-to-peak with 4 parts in parallel, exceeds the "
            "120 mV allowed",
        ),
        (
            make("recovery", 400e3, 20e3, 20e3, 1.0, "fail", unit="Hz"),
            1,
            "recovery: a standard-recovery rectifier is limited to 20 kHz; the design "
            "switches at 400 kHz",
        ),
        (
            make("saturation", 2.68, None, None, 0.8, "unverified", missing=("isat_a",)),
            1,
            "saturation: not checked, missing isat_a",
        ),
        (
            make("channel", None, None, None, None, "fail", unit=""),
            1,
            "channel: a p-channel part cannot be the low-side switch of a boost",
        ),
    ],
)
def test_check_sentence(check, count, sentence):
    assert check_sentence(check, count) == sentence


def test_thermal_sentence():
    # Tj 151.1 °C vs limit 150 °C (Tjmax 175 − 25); rise 91.1 of 90 °C allowed = 101 %
    check = Check("thermal", 151.1, 150.0, 175.0, None, 91.1 / 90.0, None, "degC", "fail")
    assert check_sentence(check) == (
        "thermal: estimated Tj 151 °C, above the 150 °C limit (Tjmax 175 °C; 101 % of the "
        "allowed rise)"
    )


def test_tightest_margin_skips_the_window():
    checks = (
        make("inductance", 10e-6, 9.8e-6, None, None, "pass", unit="H"),  # 98 % of a bound
        make("saturation", 3.0, 4.0, 5.0, 0.8, "pass"),  # 75 % of its limit
        make("rms", 2.0, 4.5, 5.0, 0.9, "pass"),  # 44 %
    )
    outcome = Outcome("QM-1", "Quillmark Magnetics", "inductor", "passed", 1, 0.1, 1.0, 1.0,
                      None, checks, (), ())  # fmt: skip
    assert margin_text(outcome) == "saturation 75 %"


def test_render_pick_on_a_fixed_console(tmp_path):
    from pathlib import Path

    from partpick.catalog.importer import import_catalog
    from partpick.design.spec import load_spec
    from partpick.render.pick import render_pick
    from partpick.screening.pick import pick
    from partpick.screening.profiles import load_profile

    data = Path(__file__).parent / "data" / "screening"
    db = str(tmp_path / "parts.db")
    import_catalog(db, [data / "inductors.csv"], "inductor")
    result = pick(db, load_spec(data / "spec.toml"), "inductor", profile=load_profile("standard"))
    out = StringIO()
    render_pick(result, Console(file=out, width=200, color_system=None))
    text = out.getvalue()
    # the policy is visible, with the figures the rules used
    assert "saturation_use 80 %" in text
    # B misses saturation: needs 3.5051/0.8 = 4.38 A at 6 V in; part has 4.3 A
    assert "needs Isat ≥ 4.38 A (3.51 A peak at 6 V in, 80 % use); part has 4.3 A" in text
    assert "3 passed, 1 unverified, 4 failed" in text


def test_a_near_miss_never_reads_as_if_the_part_were_enough():
    # 3.781 A at 90 % use needs 4.2011 A; with three digits both would print "4.2 A"
    from partpick.render.pick import check_sentence
    from partpick.screening.checks import Check

    check = Check("rms", 3.781, 3.78, 4.2, 0.9, 0.9002, 6.0, "A", "fail")
    assert "needs Irms ≥ 4.201 A" in check_sentence(check)
    assert "part has 4.2 A" in check_sentence(check)
