"""Fuzz the CLI: hypothesis builds argument lists and spec values; none may crash.

A run passes when no traceback appears and every exit code is one partpick documents:
0 (done), 1 (--strict rejects), 2 (bad input) or 3 (a BOM role has no part). Every path
the fuzz can name lies in its own temporary folder (or is /dev/null, which must be refused).
"""

from __future__ import annotations

import os
import tempfile
from pathlib import Path

import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st
from typer.testing import CliRunner

from partpick.cli import app
from partpick.design.spec import SPEC_KEYS

DATA = Path(__file__).parent / "data"
BOM_KINDS = (("inductor", "inductors"), ("capacitor", "capacitors"), ("diode", "diodes"),
             ("mosfet", "mosfets"))  # fmt: skip
ALLOWED_EXITS = {0, 1, 2, 3}
# CI gives the fuzz about a minute (eight times the examples); a developer's run stays short.
SCALE = 8 if os.environ.get("CI") else 1

NASTY = st.sampled_from(
    ["", " ", "-", "--", "nan", "inf", "-inf", "1e308", "-1e308", "0", "-0", "1e-320",
     "400 mHz", "400 kHz", "4u7", "3 A", "1,5", "[/]", "[b]x", "\x1b[2J", "\u202e", "µ",
     "300 K", "1 MH", "Ω", "1..2", "0.2,0.4", "NaN V", "12 V @ 3 A", "±20%", "null", "0x10"]
)
NUMBER_TEXT = st.one_of(
    NASTY,
    st.floats(allow_nan=True, allow_infinity=True).map(repr),
    st.integers(-(10**30), 10**30).map(str),
    st.tuples(st.floats(1e-15, 1e15), st.sampled_from(["", " V", " A", " Hz", " kHz", " mV",
                                                     " %", " uH", " °C", " K", "X"])).map(
        lambda t: f"{t[0]:g}{t[1]}"
    ),
    st.text(max_size=12),
)


@pytest.fixture(scope="module")
def world():
    """Module scope: a folder with an imported test catalog and a few hostile paths."""
    folder = Path(tempfile.mkdtemp(prefix="partpick-fuzz-"))
    db = folder / "c.db"
    for kind, name in BOM_KINDS:
        result = CliRunner().invoke(
            app, ["import", str(DATA / "bom" / f"{name}.csv"), "--kind", kind, "--db", str(db)]
        )
        assert result.exit_code == 0, result.output
    (folder / "text.db").write_text("not a database")
    (folder / "sub").mkdir()
    return folder


def _paths(world: Path):
    return st.sampled_from([str(world / "out.txt"), str(world / "sub"), "/dev/null",
                            str(world / "missing" / "x.csv"), str(world / "out.md"),
                            str(world / "p.png"), str(world / "p.gif")])  # fmt: skip


def _dbs(world: Path):
    return st.sampled_from([str(world / "c.db"), str(world / "nope.db"), str(world / "text.db"),
                            str(world / "sub")])  # fmt: skip


def _spec_options():
    keys = [k for k in SPEC_KEYS if k not in ("name", "notes", "topology")]
    return st.lists(
        st.tuples(st.sampled_from(keys), NUMBER_TEXT).map(
            lambda kv: ["--" + kv[0].replace("_", "-"), kv[1]]
        ),
        max_size=4,
    ).map(lambda pairs: [a for pair in pairs for a in pair])


def _command(world: Path):
    spec = st.sampled_from([str(DATA / "bom" / "spec.toml"), str(world / "sub"),
                            str(world / "text.db"), str(world / "none.toml")])  # fmt: skip
    role = st.sampled_from(["inductor", "output-cap", "diode", "switch", "resistor", "[/]"])
    pick = st.tuples(spec, role, _spec_options(), _dbs(world)).map(
        lambda t: ["pick", t[0], "--role", t[1], *t[2], "--db", t[3]]
    )
    stress = st.tuples(spec, _spec_options()).map(lambda t: ["stress", t[0], *t[1]])
    bom = st.tuples(spec, _spec_options(), _dbs(world), st.sampled_from(["table", "csv", "md",
                    "json"]), st.none() | _paths(world)).map(  # fmt: skip
        lambda t: ["bom", t[0], *t[1], "--db", t[2], "--format", t[3], "--no-verify",
                   *(["--output", t[4]] if t[4] else [])]  # fmt: skip
    )
    parts = st.tuples(st.sampled_from(["inductor", "diode", "mosfet", "capacitor", "x"]),
                      NUMBER_TEXT, _dbs(world)).map(  # fmt: skip
        lambda t: ["parts", "--kind", t[0], "--where", f"isat_a>={t[1]}", "--db", t[2]]
    )
    verify = st.tuples(spec, NUMBER_TEXT, NUMBER_TEXT, _dbs(world)).map(
        lambda t: ["verify", t[0], "--inductor", "BT-L150A", "--output-cap", "BT-C106A50",
                   "--diode", "BT-D340", "--switch", "BT-N4020", "--dcr", t[1], "--vin", t[2],
                   "--db", t[3]]  # fmt: skip
    )
    return st.one_of(stress, stress, pick, pick, parts, bom, verify)


def _csv_rows():
    cell = st.one_of(NUMBER_TEXT, st.text(alphabet=st.characters(codec="utf-8"), max_size=8))
    return st.lists(st.lists(cell, min_size=1, max_size=5), max_size=6)


@settings(max_examples=200 * SCALE, deadline=None, derandomize=True,
          suppress_health_check=[HealthCheck.function_scoped_fixture, HealthCheck.too_slow,
                                 HealthCheck.data_too_large])  # fmt: skip
@given(data=st.data())
def test_no_command_crashes(world, data):
    args = data.draw(_command(world))
    result = CliRunner().invoke(app, args)
    _assert_clean(args, result)


@settings(max_examples=80 * SCALE, deadline=None, derandomize=True,
          suppress_health_check=[HealthCheck.function_scoped_fixture, HealthCheck.too_slow])
@given(rows=_csv_rows(), kind=st.sampled_from(["inductor", "capacitor", "diode", "mosfet"]))
def test_no_catalog_file_crashes_the_import(world, rows, kind):
    header = "Mfr Part Number,Manufacturer,Inductance,Capacitance,Reverse Voltage (Vrrm)\n"
    body = "\n".join(",".join(row) for row in rows)
    path = world / "fuzz.csv"
    path.write_bytes((header + body).encode("utf-8", errors="surrogatepass"))
    args = ["import", str(path), "--kind", kind, "--db", str(world / "scratch.db")]
    _assert_clean(args, CliRunner().invoke(app, args))


def _assert_clean(args, result) -> None:
    exception = result.exception
    if exception is not None and not isinstance(exception, SystemExit):
        raise AssertionError(f"{args!r} raised {exception!r}") from exception
    assert result.exit_code in ALLOWED_EXITS, (args, result.exit_code, result.output)
    assert "Traceback" not in result.output, (args, result.output)
