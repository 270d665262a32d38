"""Invented part numbers stay invented, and every help example runs on the bundled catalogs.

A designer who meets "SB340" or "2N7002" in a BOM may take it for the real part. The bundled
catalogs, the test data, the generators and the help texts therefore use this project's own
scheme (``TS-ZK40-3A0B``: maker, family letters, voltage, current, package letter) and this
file rejects the common real rectifier and transistor type-code patterns in all of them.
"""

from __future__ import annotations

import re
import shlex
import shutil
import sys
from pathlib import Path

import pytest
from typer.main import get_command

from partpick.catalog.importer import import_catalog
from partpick.cli import app

ROOT = Path(__file__).resolve().parent.parent
sys.path.insert(0, str(ROOT / "scripts"))

# Common real type-code families, written as patterns a part number may not contain.
# common practice, no published source: the prefixes below are the widely sold rectifier and
# small-signal / power transistor families (JEDEC 1N/2N registrations, the SMA/SMB "S1A" and
# "SS34" rectifier codes, "SB340"-style Schottky codes, "MBR" and the vendor MOSFET prefixes).
REAL_TYPE_CODES = [
    r"1N\d{3,4}",  # JEDEC diode registrations: 1N4148, 1N5819
    r"2N\d{3,4}",  # JEDEC transistor registrations: 2N7002, 2N3904
    r"(?<![A-Z])S[1-3][A-M](?![A-Z])",  # S1A ... S3M rectifiers
    r"(?<![A-Z])[ERU]S[1-3][A-M]",  # ES1D, RS2J, US1M
    r"SS\d{2}",  # SS14, SS34
    r"SK\d{2}",  # SK24, SK34
    r"SB\d{2,}",  # SB340, SB3040, SB5100
    r"(?<![A-Z])B[1-5]\d0(?!\d)",  # B340, B540
    r"MBR",
    r"MUR\d",
    r"STPS",
    r"SBR\d",
    r"PMEG",
    r"(?<![A-Z])UF\d",  # UF4007
    r"(?<![A-Z])FR\d",  # FR107, FR2J
    r"HER\d",
    r"(?<![A-Z])GP\d",  # GP10
    r"(?<![A-Z])SR\d{2}",  # SR260
    r"BA[STVW]\d",  # BAT54, BAS16, BAV99, BAW56
    r"BS[SCZ]\d",  # BSS138, BSC010
    r"IR[FL]",  # IRF540, IRLML2502
    r"AO[NDI]?\d{3,4}",  # AO3400, AON6260
    r"SI[RS]?\d{4}",  # SI2302, SIR826
    r"FD[NSDMP]\d",  # FDN337, FDS6680
    r"DM[NPG]\d",  # DMN3404, DMG2302
    r"NT[RDM]\d",  # NTR4003, NTD5867
    r"PMV\d",
    r"CSD\d",
    r"BUK\d",
    r"(?<![A-Z])IP[DPB]\d",  # IPD, IPP, IPB
    r"(?<![A-Z])ST[PDFN]\d",  # STP, STD, STF, STN
]
PATTERN = re.compile("|".join(f"(?:{p})" for p in REAL_TYPE_CODES), re.IGNORECASE)


def read_any(path: Path) -> str:
    """Return a text file's contents in whichever of the bundled encodings it uses."""
    data = path.read_bytes()
    for encoding in ("utf-8", "utf-16", "cp1252"):
        try:
            return data.decode(encoding)
        except UnicodeDecodeError:
            continue
    raise AssertionError(f"{path} is in none of the expected encodings")


def part_numbers(text: str) -> list[str]:
    """Return every token of a text that looks like a part number (letters and digits)."""
    tokens = re.findall(r"[A-Za-z0-9][A-Za-z0-9._/-]*", text)
    return [t for t in tokens if re.search(r"\d", t) and re.search(r"[A-Za-z]", t)]


def offenders(text: str) -> list[str]:
    return sorted({t for t in part_numbers(text) if PATTERN.search(t)})


DATA_FILES = sorted(
    p
    for folder in (ROOT / "catalogs", ROOT / "tests" / "data")
    for p in folder.rglob("*")
    if p.is_file() and p.suffix in {".csv", ".tsv", ".toml", ".md"} and "broken" not in p.parts
) + [ROOT / "README.md", ROOT / "DEVELOPERS.md"]


@pytest.mark.parametrize(
    "text",
    [
        "SB340",
        "TS-SB3040B",
        "KD-S1A60W",
        "SS34",
        "1N5819",
        "MBRS340",
        "ES1D",
        "US1M",
        "BAT54S",
        "2N7002",
        "BSS138",
        "IRLML2502",
        "AO3400A",
        "SI2302",
        "NTR-N40 NTR4003",
    ],
)
def test_the_patterns_catch_real_type_codes(text):
    # the example codes are the issue's own list of families to reject
    assert offenders(text), text


@pytest.mark.parametrize(
    "text",
    [
        "TS-ZK40-3A0B",
        "OM-ZC1200-10AT",
        "TS-QN40-8Q",
        "HCW-PR1265-150M",
        "OPC-1210S-106M50",
        "SOD-123F",
        "SOT-23-6",
        "DFN3x3",
        "TO-252",
        "40 V 3 A SMB",
    ],
)
def test_the_patterns_leave_the_project_scheme_alone(text):
    assert not offenders(text), text


@pytest.mark.parametrize("path", DATA_FILES, ids=lambda p: str(p.relative_to(ROOT)))
def test_no_bundled_or_test_part_number_contains_a_real_type_code(path):
    assert offenders(read_any(path)) == []


@pytest.mark.parametrize("kind", ["inductor", "capacitor", "diode", "mosfet"])
def test_generated_catalogs_use_the_project_scheme(kind):
    from catalog_gen import generate

    frame = generate(kind, rows=3000, seed=7)
    # the last six characters are a scrambled serial that only makes numbers unique
    schemes = {m[:-6] for m in frame[frame.columns[0]].astype(str)}
    assert sorted(s for s in schemes if PATTERN.search(s)) == []


def help_examples() -> list[tuple[str, str]]:
    """Return (command, example line) for each "Example:" in a command's help text."""
    found = []
    for name, command in get_command(app).commands.items():  # type: ignore[attr-defined]
        text = " ".join((command.help or "").split())
        for example in re.findall(r"Example: (partpick .*?)(?:$|(?= [A-Z][a-z]))", text):
            found.append((name, example))
    return found


def test_every_help_text_example_has_no_real_type_code():
    examples = help_examples()
    assert {name for name, _ in examples} >= {"stress", "pick", "bom", "verify"}
    assert offenders(" ".join(e for _, e in examples)) == []


@pytest.fixture(scope="module")
def bundled_db(tmp_path_factory) -> str:
    db = str(tmp_path_factory.mktemp("bundled") / "parts.db")
    for kind, name in [
        ("inductor", "inductors"),
        ("capacitor", "capacitors"),
        ("diode", "diodes"),
        ("mosfet", "mosfets"),
    ]:
        import_catalog(db, [ROOT / "catalogs" / f"{name}.csv"], kind)
    return db


@pytest.mark.parametrize("name,example", help_examples(), ids=lambda v: str(v)[:40])
def test_every_help_example_runs_on_the_bundled_catalogs(
    name, example, bundled_db, runner, tmp_path, monkeypatch
):
    shutil.copytree(ROOT / "catalogs" / "scenarios", tmp_path / "catalogs" / "scenarios")
    monkeypatch.chdir(tmp_path)
    monkeypatch.setenv("PARTPICK_DB", bundled_db)
    result = runner.invoke(app, shlex.split(example)[1:])
    assert result.exit_code == 0, result.output
    for written in re.findall(r"--(?:output|plot) (\S+)", example):
        assert (tmp_path / written).stat().st_size > 0, written
