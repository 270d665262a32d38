"""scripts/gen_catalog.py: deterministic, unique, importable synthetic catalogs with real trends."""

from __future__ import annotations

import importlib.util
import math
import sys
import tempfile
from pathlib import Path

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from partpick.catalog.columns import read_columns
from partpick.catalog.importer import import_catalog

SCRIPT = Path(__file__).parents[1] / "scripts" / "gen_catalog.py"
KINDS = ("inductor", "capacitor", "diode", "mosfet")
# IEC 60063:2015, the E12 series (one decade); E6 is every other member
E12 = (1.0, 1.2, 1.5, 1.8, 2.2, 2.7, 3.3, 3.9, 4.7, 5.6, 6.8, 8.2)


def load_generator():
    spec = importlib.util.spec_from_file_location("gen_catalog", SCRIPT)
    module = importlib.util.module_from_spec(spec)
    sys.modules["gen_catalog"] = module
    spec.loader.exec_module(module)
    return module


gen = load_generator()


def is_e12(value: float) -> bool:
    mantissa = value / 10 ** math.floor(math.log10(value) + 1e-9)
    return any(math.isclose(mantissa, s, rel_tol=1e-6) for s in E12)


@pytest.mark.parametrize("kind", KINDS)
@pytest.mark.parametrize("layout", ["clean", "messy"])
def test_same_seed_same_frame_other_seed_other_frame(kind, layout):
    first = gen.generate(kind, 300, seed=5, layout=layout)
    again = gen.generate(kind, 300, seed=5, layout=layout)
    other = gen.generate(kind, 300, seed=6, layout=layout)
    assert first.equals(again)
    assert not first.equals(other)


@pytest.mark.parametrize("kind", KINDS)
def test_part_numbers_are_unique(kind):
    frame = gen.generate(kind, 50_000, seed=1, layout="messy")
    assert frame.iloc[:, 0].is_unique
    assert (frame.iloc[:, 0].str.len() > 8).all()


@pytest.mark.parametrize("kind", KINDS)
def test_clean_and_messy_files_of_one_seed_share_no_identity(kind):
    clean = set(gen.generate(kind, 2000, seed=3, layout="clean").iloc[:, 0])
    messy = set(gen.generate(kind, 2000, seed=3, layout="messy").iloc[:, 0])
    assert clean.isdisjoint(messy)


@pytest.fixture(scope="module")
def imported(tmp_path_factory):
    """Module scope: 3000 messy and 3000 clean rows per kind, imported into one catalog."""
    folder = tmp_path_factory.mktemp("gen")
    db = str(folder / "gen.db")
    reports = {}
    for layout in ("messy", "clean"):
        for kind in KINDS:
            path = gen.write_catalog(gen.generate(kind, 3000, 11, layout),
                                     folder / f"{layout}-{kind}.csv", layout)  # fmt: skip
            reports[layout, kind] = import_catalog(db, [path], kind)[0]
    return db, reports


@pytest.mark.parametrize("layout", ["clean", "messy"])
@pytest.mark.parametrize("kind", KINDS)
def test_generated_files_import_without_a_reject(imported, layout, kind):
    report = imported[1][layout, kind]
    assert (report.rows, report.added, report.rejected) == (3000, 3000, 0)
    assert report.unrecognised == (("Warehouse Bin",) if layout == "messy" else ())
    assert report.delimiter == (";" if layout == "messy" else ",")


def test_generated_inductances_and_capacitances_are_e_series_values(imported):
    l_h = read_columns(imported[0], "inductor", ["inductance_h"])["inductance_h"]
    c_f = read_columns(imported[0], "capacitor", ["capacitance_f"])["capacitance_f"]
    assert all(is_e12(v) for v in np.unique(l_h))
    assert all(is_e12(v) for v in np.unique(c_f))


def test_generated_inductors_follow_the_size_trends(imported):
    # Within one body size Isat falls as 1/sqrt(L) and DCR rises with L (fixed stored
    # energy per core, turns squared): common practice, no published source.
    cols = read_columns(imported[0], "inductor", ["package", "inductance_h", "isat_a", "dcr_ohm"])
    for package in np.unique(cols["package"].astype(str)):
        rows = (cols["package"] == package) & ~np.isnan(cols["isat_a"])
        log_l = np.log(cols["inductance_h"][rows])
        assert np.corrcoef(log_l, np.log(cols["isat_a"][rows]))[0, 1] < -0.9, package
        ok = rows & ~np.isnan(cols["dcr_ohm"])
        log_l = np.log(cols["inductance_h"][ok])
        assert np.corrcoef(log_l, np.log(cols["dcr_ohm"][ok]))[0, 1] > 0.9, package


def test_generated_capacitors_cover_every_dielectric_and_order_esr(imported):
    cols = read_columns(imported[0], "capacitor", ["dielectric", "esr_ohm"])
    diel, esr = cols["dielectric"].astype(str), cols["esr_ohm"]
    assert len(set(diel)) == 12
    ceramic = np.isin(diel, ["c0g", "x5r", "x7r", "x7s", "x6s", "x8r", "y5v"])
    # electrolytics have high ESR, ceramics low: common practice, no published source
    assert np.nanmedian(esr[diel == "al-electrolytic"]) > 10 * np.nanmedian(esr[ceramic])


def test_generated_diodes_schottky_low_vf_and_low_vrrm(imported):
    cols = read_columns(imported[0], "diode", ["diode_type", "vf_v", "vrrm_v"])
    kind = cols["diode_type"].astype(str)
    schottky = kind == "schottky"
    assert np.nanmax(cols["vrrm_v"][schottky]) <= 200
    assert np.nanmedian(cols["vf_v"][schottky]) < np.nanmedian(cols["vf_v"][kind == "fast"])


def test_generated_mosfets_have_some_p_channel_and_rds_rising_with_vds(imported):
    cols = read_columns(imported[0], "mosfet", ["channel", "vds_v", "rds_on_ohm", "package"])
    assert 0.05 < np.mean(cols["channel"] == "p") < 0.25
    n_to220 = (cols["channel"] == "n") & (cols["package"] == "TO-220")
    low = np.median(cols["rds_on_ohm"][n_to220 & (cols["vds_v"] <= 40)])
    high = np.median(cols["rds_on_ohm"][n_to220 & (cols["vds_v"] >= 200)])
    # Rds(on)*area ~ BV^2.4..2.5: Baliga, Fundamentals of Power Semiconductor Devices,
    # ch. 6 (from memory); 40 V to 200 V is a factor of 5^2.4 = 48 in the silicon part
    assert high > 10 * low


@pytest.mark.parametrize("kind", KINDS)
def test_some_cells_are_missing_but_not_many(imported, kind):
    core = {"inductor": "isat_a", "capacitor": "esr_ohm", "diode": "theta_ja_degc_w",
            "mosfet": "qgd_c"}[kind]  # fmt: skip
    share = np.mean(np.isnan(read_columns(imported[0], kind, [core])[core]))
    assert 0.002 < share < 0.1


@pytest.mark.parametrize("kind", KINDS)
def test_planted_bad_rows_are_exactly_the_rejects(tmp_path, kind):
    frame = gen.generate(kind, 4000, seed=2, layout="messy", bad_fraction=0.01)
    bad = frame.attrs["bad_rows"]
    assert 10 < len(bad) < 80
    path = gen.write_catalog(frame, tmp_path / "bad.csv", "messy")
    report = import_catalog(str(tmp_path / "bad.db"), [path], kind)[0]
    # the header is line 1, so row i of the frame is line i + 2
    assert sorted({r.line for r in report.rejects}) == [int(i) + 2 for i in bad]
    assert report.added == 4000 - len(bad)


def test_messy_cells_mix_spellings():
    frame = gen.generate("inductor", 5000, seed=4, layout="messy")
    cells = frame["Inductance [uH]"]
    for marker in (" uH", "µH", " nH", " mH"):
        assert cells.str.contains(marker, regex=False).any(), marker
    assert cells.str.fullmatch(r"\d+u\d+").any()  # IEC 60062 letter code such as 4u7
    assert frame["DCR (mΩ)"].str.contains("Ω", regex=False).any()
    assert frame["Qty Available"].str.contains(",", regex=False).any()


@pytest.mark.parametrize(
    "argv",
    [
        ["--kind", "inductor", "--rows", "10"],  # no --out
        ["--all", "--rows-per-kind", "10"],  # no --out-dir
        ["--kind", "resistor", "--rows", "10", "--out", "x.csv"],
        ["--kind", "diode", "--rows", "10", "--out", "x.csv", "--layout", "tidy"],
    ],
)
def test_cli_refuses_incomplete_or_unknown_options(argv):
    with pytest.raises(SystemExit) as stop:
        gen.main(argv)
    assert stop.value.code == 2


def test_cli_all_writes_one_file_per_kind(tmp_path):
    assert gen.main(["--all", "--rows-per-kind", "50", "--out-dir", str(tmp_path)]) == 0
    for kind in KINDS:
        lines = (tmp_path / f"{kind}s.csv").read_text(encoding="utf-8-sig").splitlines()
        assert len(lines) == 51


@settings(max_examples=12, deadline=None)
@given(
    kind=st.sampled_from(KINDS),
    layout=st.sampled_from(["clean", "messy"]),
    seed=st.integers(0, 2**31 - 1),
)
def test_any_seed_gives_a_file_the_importer_takes_whole(kind, layout, seed):
    with tempfile.TemporaryDirectory() as folder:
        path = gen.write_catalog(gen.generate(kind, 400, seed, layout), Path(folder) / "g.csv",
                                 layout)  # fmt: skip
        report = import_catalog(str(Path(folder) / "g.db"), [path], kind)[0]
    assert (report.added, report.rejected) == (400, 0), report.rejects[:3]
