"""pick() over a small invented catalog, imported through the real importer.

The spec (tests/data/screening/spec.toml) is lossless (η = 1) so every stress can be worked by
hand from the boost equations of issue 3 (Erickson & Maksimovic, *Fundamentals of Power
Electronics*, 3rd ed., ch. 2; TI SLVA372):

  Vin 6–9 V, Vout 18 V, Iout 1 A, fsw 200 kHz, ripple band 0.2–0.4, vout_ripple 100 mV.
  At 6 V: D = 1 − 6/18 = 2/3, IL = 1/(1 − D) = 3 A. At 9 V: D = 0.5, IL = 2 A.
  Vin·D is largest at Vin* = Vout/2 = 9 V: 9·0.5 = 4.5 V.
  l_min = 4.5/(200e3 · 0.4 · 3) = 18.75 µH;  l_max = 4.5/(200e3 · 0.2 · 3) = 37.5 µH.
  At 6 V, ΔIL = 6·(2/3)/(200e3·L) = 2e-5/L, and the peak 3 + 1e-5/L is worst there.
"""

from __future__ import annotations

from pathlib import Path

import pytest

from partpick.catalog.importer import import_catalog
from partpick.design.spec import load_spec
from partpick.errors import NotFoundError
from partpick.screening.pick import ROLES, explain, pick
from partpick.screening.profiles import load_profile

DATA = Path(__file__).parent / "data" / "screening"


@pytest.fixture(scope="module")
def catalog(tmp_path_factory) -> str:
    """A file database holding the invented inductors and capacitors (module scope)."""
    db = str(tmp_path_factory.mktemp("pick") / "parts.db")
    import_catalog(db, [DATA / "inductors.csv"], "inductor")
    import_catalog(db, [DATA / "capacitors.csv"], "capacitor")
    return db


@pytest.fixture(scope="module")
def spec():
    return load_spec(DATA / "spec.toml")


def names(outcomes):
    return [o.mpn for o in outcomes]


def test_inductor_outcome_written_out_by_hand(catalog, spec):
    # Each part's minimum L is L·(1 − tol); it must reach l_min, and Isat ≥ peak/0.8 and
    # Irms ≥ RMS/0.9 at it.
    #   A 22 µH ±10 % → 19.8 µH ≥ 18.75 µH: ΔIL 1.0101 A, peak 3.5051 A → Isat ≥ 4.381 A
    #     (has 4.6, passes); RMS √(9 + 1.0101²/12) = 3.0141 A → Irms ≥ 3.349 A (has 3.5).
    #     Loss 3.0141²·20 mΩ = 0.1817 W.
    #   B as A but Isat 4.3 A < 4.381 A → fails saturation only (3.5051/3.44 = 1.9 % over).
    #   C 33 µH ±10 % → 29.7 µH: peak 3.3367 A → Isat ≥ 4.171 A (4.5); RMS 3.0063 A → Irms
    #     ≥ 3.340 A (3.4). Loss 9.0378·30 mΩ = 0.2711 W.
    #   D 15 µH ±20 % → 12 µH < l_min 18.75 µH → fails the window only (load 18.75/12 =
    #     1.5625; its currents fit 5 A / 4 A).
    #   E no Isat → unverified, missing isat_a.
    #   F 27 µH obsolete → fails lifecycle only.
    #   G 47 µH > l_max, Isat 2 A and Irms 2 A → fails inductance, saturation and rms.
    #   H 22 µH ±10 % nrnd, Isat 5 A, Irms 4 A: passes with a note; loss 9.0850·25 mΩ
    #     = 0.2271 W.
    result = pick(catalog, spec, "inductor", profile=load_profile("standard"))
    assert result.total == 8
    assert names(result.passed) == ["QM-220-A", "VT-220-H", "QM-330-C"]
    assert [o.loss_w for o in result.passed] == pytest.approx([0.18170, 0.22713, 0.27113], rel=1e-3)
    assert names(result.unverified) == ["VT-220-E"]
    assert result.unverified[0].missing == ("isat_a",)
    # closest to passing first: one failing rule, smallest overshoot (B 1.019, D 1.5625,
    # F a yes/no rule), then G with three failing rules
    assert names(result.failed) == ["QM-220-B", "QM-150-D", "VT-270-F", "VT-470-G"]
    assert [c.rule for c in result.failed[3].failing] == ["inductance", "saturation", "rms"]
    assert result.fail_counts == {
        "inductance": 2,
        "saturation": 2,
        "rms": 1,
        "srf": 0,
        "lifecycle": 1,
    }
    assert result.counts == {"passed": 3, "unverified": 1, "failed": 4}
    h = result.passed[1]
    assert any("nrnd" in note for note in h.notes)


def test_saturation_check_numbers(catalog, spec):
    a = pick(catalog, spec, "inductor", profile=load_profile("standard")).passed[0]
    sat = a.check("saturation")
    # peak at 19.8 µH: 3 + 1e-5/19.8e-6 = 3.5051 A, at Vin = 6 V; limit 0.8 · 4.6 = 3.68 A
    assert sat.stress == pytest.approx(3.5051, rel=1e-4)
    assert sat.worst_vin_v == pytest.approx(6.0)
    assert sat.limit == pytest.approx(3.68)
    assert sat.utilisation == pytest.approx(3.5051 / 4.6, rel=1e-4)
    assert sat.derating == 0.8


@pytest.mark.parametrize(
    ("rank", "expected"),
    [
        ("loss", ["QM-220-A", "VT-220-H", "QM-330-C"]),  # 0.182, 0.227, 0.271 W
        ("cost", ["QM-220-A", "QM-330-C", "VT-220-H"]),  # 0.50, 0.60, 0.65
        ("size", ["VT-220-H", "QM-220-A", "QM-330-C"]),  # 16, 25, 36 mm²
    ],
)
def test_rank(catalog, spec, rank, expected):
    result = pick(catalog, spec, "inductor", profile=load_profile("standard"), rank=rank)
    assert names(result.passed) == expected


def test_output_cap_counts_in_parallel(catalog, spec):
    # D_max = 2/3, I_peak(l_min) = 3 + 1e-5/18.75e-6 = 3.5333 A; ripple =
    # 1·(2/3)/(200e3·n·C_eff) + (ESR/n)·3.5333 ≤ 100 mV; voltage 18.05 V ≤ u·V_rated.
    #   Y 47 µF polymer, C_eff 37.6 µF, 10 mΩ: n=1 0.0887 + 0.0353 = 124 mV; n=2 62 mV → 2.
    #   Z 100 µF electrolytic, C_eff 80 µF, 100 mΩ: n=3 13.9 + 117.8 = 132 mV; n=4 98.8 mV → 4.
    #   X 10 µF x7r 50 V at Vout = 18 V (36 % of its rating): the standard DC-bias table
    #     (from memory) keeps 0.78 − 0.28·11/25 = 0.6568, C_eff = 10·0.9·0.6568 = 5.911 µF:
    #     n=4 141.0 + 4.4 = 145.4 mV → fails at 4.
    #   W 22 µF x5r 16 V: 18.05 V > 0.5·16 = 8 V → fails voltage; at 113 % of its rating it
    #     keeps the table's last point 0.22, C_eff = 3.87 µF, so its ripple fails too.
    #   V polymer without ESR: the charge term alone (88.7 mV) fits at n=1 → unverified.
    # Loss I_rms²·ESR/n with I_rms ≈ 1.4253 A: Y 2.0316·0.01/2 = 10.2 mW, Z 50.8 mW.
    result = pick(catalog, spec, "output-cap", profile=load_profile("standard"))
    assert names(result.passed) == ["BP-476-Y", "BE-107-Z"]
    assert [o.count for o in result.passed] == [2, 4]
    assert names(result.unverified) == ["BP-476-V"]
    assert result.unverified[0].missing == ("esr_ohm",)
    assert names(result.failed) == ["OP-106-X", "OP-226-W"]
    assert result.failed[0].count == 4
    assert [c.rule for c in result.failed[0].failing] == ["ripple-voltage"]
    assert [c.rule for c in result.failed[1].failing] == ["voltage", "ripple-voltage"]
    assert result.failed[0].part["capacitance_eff_f"] == pytest.approx(5.9112e-6)


def test_max_parallel_limits_the_count(catalog, spec):
    # with at most 2 in parallel Z (needs 4) fails its ripple; Y (needs 2) still passes
    result = pick(catalog, spec, "output-cap", profile=load_profile("standard"), max_parallel=2)
    assert names(result.passed) == ["BP-476-Y"]
    assert "BE-107-Z" in names(result.failed)


def test_input_cap(catalog, spec):
    # I_cin,rms = ΔIL/√12 = 1.2/3.4641 = 0.3464 A, so one part carries it; 9 V ≤ u·V_rated.
    # Loss 0.12 A²·ESR: X 0.6 mW, Y 1.2 mW, Z 12 mW. W: 9 V > 0.5·16 V. V has no ESR: no
    # check reads it without vin_ripple, but it is a core field, so V is unverified.
    result = pick(catalog, spec, "input-cap", profile=load_profile("standard"))
    assert names(result.passed) == ["OP-106-X", "BP-476-Y", "BE-107-Z"]
    assert [o.loss_w for o in result.passed] == pytest.approx([0.0006, 0.0012, 0.012], rel=1e-3)
    assert names(result.unverified) == ["BP-476-V"]
    assert names(result.failed) == ["OP-226-W"]


def test_high_rel_is_stricter(catalog, spec):
    # high-rel uses 0.7 of Isat and 0.8 of Irms: A now needs Isat ≥ 3.5051/0.7 = 5.007 A
    # (has 4.6) and Irms ≥ 3.0141/0.8 = 3.768 A (has 3.5); H needs the same (has 5 A, 4 A:
    # fails saturation only); C needs 3.337/0.7 = 4.767 A (has 4.5). Nothing passes.
    result = pick(catalog, spec, "inductor", profile=load_profile("high-rel"))
    assert result.counts["passed"] == 0
    failed = {o.mpn: [c.rule for c in o.failing] for o in result.failed}
    assert failed["QM-220-A"] == ["saturation", "rms"]
    assert failed["VT-220-H"] == ["saturation"]


def test_top_cuts_lists_but_counts_everything(catalog, spec):
    result = pick(catalog, spec, "inductor", profile=load_profile("standard"), top=1)
    assert names(result.passed) == ["QM-220-A"]
    assert names(result.failed) == ["QM-220-B"]
    assert result.total == 8
    assert result.counts == {"passed": 3, "unverified": 1, "failed": 4}
    assert sum(result.fail_counts.values()) == 6


@pytest.mark.parametrize("role", ROLES)
def test_every_part_in_exactly_one_list(catalog, spec, role):
    result = pick(catalog, spec, role, profile=load_profile("standard"))
    listed = names(result.passed) + names(result.unverified) + names(result.failed)
    assert len(listed) == result.total == len(set(listed))


def test_explain_one_part(catalog, spec):
    found = explain(catalog, spec, "inductor", "VT-470-G", profile=load_profile("standard"))
    assert found.outcome.status == "failed"
    assert {c.rule for c in found.outcome.checks} >= {"inductance", "saturation", "rms"}


def test_explain_unknown_part(catalog, spec):
    with pytest.raises(NotFoundError):
        explain(catalog, spec, "inductor", "NO-SUCH-PART", profile=load_profile("standard"))


def test_unknown_role(catalog, spec):
    with pytest.raises(NotFoundError, match="Roles are"):
        pick(catalog, spec, "resistor", profile=load_profile("standard"))


def test_empty_kind(catalog, spec):
    result = pick(catalog, spec, "diode", profile=load_profile("standard"))
    assert (result.total, result.passed, result.failed) == (0, [], [])


def test_input_cap_with_vin_ripple(catalog):
    # vin_ripple 20 mV: ΔIL/(8·fsw·n·C_eff) + (ESR/n)·ΔIL with ΔIL = 1.2 A, fsw = 200 kHz
    #   Y C_eff 37.6 µF, 10 mΩ: n=1 19.95 + 12 = 31.9 mV; n=2 9.97 + 6 = 16.0 mV → 2 parts
    #   V no ESR: charge term alone 19.95 mV ≤ 20 mV at n=1 → unverified (missing esr_ohm)
    #   X 10 µF x7r 50 V at vin_max = 9 V (18 %): the DC-bias table (from memory) keeps
    #     0.92 − 0.14·8/15 = 0.8453, C_eff 7.608 µF: n=4 24.6 + 1.5 = 26.1 mV → fails (1.31)
    #   Z C_eff 80 µF, 100 mΩ: n=4 2.3 + 30 = 32.3 mV → fails (load 1.62)
    #   W 22 µF x5r 16 V at 56 %: keeps 0.42 − 0.15·6.25/30 = 0.3888, C_eff 6.842 µF: n=4
    #     27.4 + 0.9 = 28.3 mV → fails ripple, and 9 V > 0.5·16 V → fails voltage
    spec = load_spec(DATA / "spec.toml", {"vin_ripple": "20 mV"})
    result = pick(catalog, spec, "input-cap", profile=load_profile("standard"))
    assert [(o.mpn, o.count) for o in result.passed] == [("BP-476-Y", 2)]
    assert names(result.unverified) == ["BP-476-V"]
    assert result.unverified[0].missing == ("esr_ohm",)
    assert names(result.failed) == ["OP-106-X", "BE-107-Z", "OP-226-W"]
    assert result.failed[0].check("ripple-voltage").stress == pytest.approx(0.026145, rel=1e-4)
