#!/usr/bin/env python3
"""Benchmark ``partpick pick`` as whole processes against a bare read_sql + numpy process.

Builds 250,000 invented parts of each kind with ``scripts/gen_catalog.py`` (clean layout)
and imports them, then runs, interleaved in one loop of ``--repeat`` rounds (all as whole
processes, spawn to exit):

* the baseline: a ``python -c`` process doing ``pandas.read_sql`` of the inductor table
  through a plain ``sqlite3`` connection plus one boolean numpy mask of the same checks;
* ``partpick pick SPEC --role inductor --top 10`` (the table a person reads);
* ``partpick pick SPEC --role inductor --format json`` (every part, to a file);
* ``partpick pick SPEC --role inductor --format jsonl`` (every part, one a line).

It prints medians, the spread and the median/median ratios, the peak RSS of each process,
and in-process figures beside them. ``--million`` adds a catalog of 1,000,000 inductors
(one role) and times the table pick there against the same baseline.

Goals (issue 14): table pick <= 1 s and >= 3x faster than the baseline; full JSON no slower
than the baseline (ratio <= 1); 1M inductors, table pick <= 2 s.

    .venv/bin/python scripts/bench_pick.py                  # builds in a temporary folder
    .venv/bin/python scripts/bench_pick.py --keep /tmp/bench --repeat 5 --million

This is a benchmark, not a test: it prints figures and asserts nothing.
"""

from __future__ import annotations

import argparse
import json
import shutil
import sys
import tempfile
import time
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parent))
from bench_process import (  # noqa: E402 - a sibling script module
    Timings,
    partpick_command,
    python_command,
    ratio_line,
    run_process,
)

SPEC_TEXT = """\
# invented benchmark scenario: a 2-cell pack boosted to 24 V
name = "bench rail"
vin_min = "6.0 V"
vin_max = "8.4 V"
vout = "24 V"
iout = "0.8 A"
fsw = "400 kHz"
vout_ripple = "120 mV"
ambient_max = 60
"""
KIND_FILES = {"inductor": "inductors", "capacitor": "capacitors", "diode": "diodes",
              "mosfet": "mosfets"}  # fmt: skip
# The bare job: every inductor row into pandas through sqlite3, then the inductor checks at
# vin_min (where a boost's peak and RMS currents are worst) as one numpy mask.
BASELINE = """\
import sqlite3, sys
import numpy as np
import pandas as pd
db, l_min, l_max, vin, duty, iout, fsw = sys.argv[1], *map(float, sys.argv[2:])
frame = pd.read_sql("SELECT * FROM parts_inductor", sqlite3.connect(db))
l_nom = frame["inductance_h"].to_numpy(dtype=float)
l_part = l_nom * (1.0 - np.nan_to_num(frame["tolerance"].to_numpy(dtype=float), nan=0.2))
il = iout / (1.0 - duty)
ripple = vin * duty / (fsw * l_part)
passed = ((l_nom >= l_min) & (l_nom <= l_max)
          & (il + ripple / 2.0 <= 0.8 * frame["isat_a"].to_numpy(dtype=float))
          & (np.sqrt(il**2 + ripple**2 / 12.0) <= 0.9 * frame["irms_a"].to_numpy(dtype=float))
          & (frame["lifecycle"].to_numpy() != "obsolete"))
print(int(passed.sum()))
"""


def build_catalog(folder: Path, rows: int, seed: int, kinds=tuple(KIND_FILES)) -> Path:
    """Generate and import ``rows`` parts of each of ``kinds``; return the database path."""
    import gen_catalog  # noqa: PLC0415 - a sibling script, not a package

    from partpick.catalog.importer import import_catalog

    db = folder / "bench.db"
    for kind in kinds:
        start = time.perf_counter()
        frame = gen_catalog.generate(kind, rows, seed, "clean")
        csv_path = gen_catalog.write_catalog(frame, folder / f"{KIND_FILES[kind]}.csv", "clean")
        del frame
        generated = time.perf_counter() - start
        start = time.perf_counter()
        report = import_catalog(str(db), [csv_path], kind)[0]
        csv_path.unlink()
        print(f"  {kind:9s} {rows:,} rows: generated in {generated:.1f} s, imported in "
              f"{time.perf_counter() - start:.1f} s ({report.added:,} added)")  # fmt: skip
    return db


def baseline_args(db: Path, spec_path: Path) -> list[str]:
    """Return the baseline command, given the design window partpick computes for the spec."""
    from partpick.design.spec import load_spec
    from partpick.design.topologies import analyse

    spec = load_spec(spec_path)
    env = analyse(spec)
    figures = (env.value("l_min_h"), env.value("l_max_h"), spec.vin_min_v,
               env.value("duty_max"), spec.iout_a, spec.fsw_hz)  # fmt: skip
    return python_command(BASELINE, str(db), *map(repr, figures))


def in_process_s(db: Path, spec_path: Path) -> dict[str, float]:
    """Return warm in-process figures (s): read_columns, pick() top 10, rank_role + JSON."""
    from partpick.design.spec import load_spec
    from partpick.render.pick_stream import write_pick_json
    from partpick.screening.pick import ROLE_RULES, pick, rank_role, read_role_columns
    from partpick.screening.profiles import load_profile

    spec, profile = load_spec(spec_path), load_profile("standard")
    pick(str(db), spec, "inductor", profile=profile, top=10)  # warm
    figures = {}
    start = time.perf_counter()
    read_role_columns(str(db), ROLE_RULES["inductor"])
    figures["read_columns"] = time.perf_counter() - start
    start = time.perf_counter()
    pick(str(db), spec, "inductor", profile=profile, top=10)
    figures["pick() top 10"] = time.perf_counter() - start
    start = time.perf_counter()
    with open(db.with_name("inprocess.json"), "wb") as out:
        write_pick_json(rank_role(str(db), spec, "inductor", profile=profile), out)
    figures["rank_role + write_pick_json"] = time.perf_counter() - start
    return figures


def check_outputs(folder: Path, table_args: list[str], rows: int) -> str:
    """Run the JSON and JSONL picks once to files; return a line saying they count every part."""
    json_file, jsonl_file = folder / "pick.json", folder / "pick.jsonl"
    run_process(table_args[:-2] + ["--format", "json"], stdout=json_file)
    run_process(table_args[:-2] + ["--format", "jsonl"], stdout=jsonl_file)
    data = json.loads(json_file.read_bytes())
    listed = sum(len(data[k]) for k in ("passed", "unverified", "failed"))
    with open(jsonl_file, "rb") as lines:
        jsonl_lines = sum(1 for _ in lines)
    ok = listed == sum(data["counts"].values()) == data["total"] == jsonl_lines == rows
    size = json_file.stat().st_size / 2**20
    verdict = "every part listed" if ok else "PARTS MISSING"
    return (f"JSON lists {listed:,} parts ({size:.0f} MiB), JSONL {jsonl_lines:,} lines, "
            f"counts {data['counts']}: {verdict}")  # fmt: skip


def measure(folder: Path, db: Path, repeat: int, formats: tuple[str, ...]) -> dict:
    """Run the baseline and the picks interleaved ``repeat`` times; return their Timings."""
    spec_path = folder / "spec.toml"
    table = partpick_command("pick", str(spec_path), "--role", "inductor", "--db", str(db),
                             "--top", "10")  # fmt: skip
    commands = {"baseline": baseline_args(db, spec_path), "table": table}
    for fmt in formats:
        commands[fmt] = table[:-2] + ["--format", fmt]
    labels = {"baseline": "baseline: read_sql(sqlite3) + numpy mask",
              "table": "partpick pick --top 10 (table)",
              "json": "partpick pick --format json (every part)",
              "jsonl": "partpick pick --format jsonl (every part)"}  # fmt: skip
    timings = {name: Timings(labels[name]) for name in commands}
    for name, args in commands.items():  # warm the file cache once
        run_process(args, stdout=folder / f"out.{name}")
    for _ in range(repeat):
        for name, args in commands.items():
            seconds, peak = run_process(args, stdout=folder / f"out.{name}")
            timings[name].seconds.append(seconds)
            timings[name].peak_mib.append(peak)
    return timings


def report(timings: dict, heading: str, name: str, table_goal_s: float = 1.0) -> list[str]:
    """Print the figures and ratios; return the goals missed."""
    print(heading)
    for t in timings.values():
        print("  " + t.line())
    base, table = timings["baseline"], timings["table"]
    print("  " + ratio_line("table / baseline", table, base, "<= 0.33 (>= 3x faster)"))
    missed = []
    if table.median > table_goal_s or base.median / table.median < 3.0:
        missed.append(f"table pick <= {table_goal_s:g} s and >= 3x ({name})")
    if "json" in timings:
        print("  " + ratio_line("json / baseline", timings["json"], base, "<= 1"))
        if timings["json"].median > base.median:
            missed.append("full JSON <= baseline")
    if "jsonl" in timings:
        print("  " + ratio_line("jsonl / baseline", timings["jsonl"], base, "<= 1"))
    return missed


def main(argv: list[str] | None = None) -> int:
    parser = argparse.ArgumentParser(description=__doc__.split("\n\n")[0])
    parser.add_argument("--rows", type=int, default=250_000, help="parts per kind")
    parser.add_argument("--seed", type=int, default=7)
    parser.add_argument("--repeat", type=int, default=5, help="interleaved rounds")
    parser.add_argument("--million", action="store_true", help="also 1,000,000 inductors")
    parser.add_argument("--keep", help="build (or reuse) the catalogs in this folder")
    opts = parser.parse_args(argv)
    folder = Path(opts.keep) if opts.keep else Path(tempfile.mkdtemp(prefix="bench_pick_"))
    folder.mkdir(parents=True, exist_ok=True)
    try:
        return _run(opts, folder)
    finally:
        if not opts.keep:
            shutil.rmtree(folder, ignore_errors=True)


def _run(opts, folder: Path) -> int:
    (folder / "spec.toml").write_text(SPEC_TEXT)
    db = folder / "bench.db"
    if not db.exists():
        print(f"building {4 * opts.rows:,} parts in {folder}")
        build_catalog(folder, opts.rows, opts.seed)
    timings = measure(folder, db, opts.repeat, ("json", "jsonl"))
    heading = (f"{opts.rows:,} inductors (of {4 * opts.rows:,} parts), whole processes, "
               f"{opts.repeat} interleaved rounds:")  # fmt: skip
    missed = report(timings, heading, f"{opts.rows:,} inductors")
    table_args = partpick_command("pick", str(folder / "spec.toml"), "--role", "inductor",
                                  "--db", str(db), "--top", "10")  # fmt: skip
    print("  " + check_outputs(folder, table_args, opts.rows))
    start, _peak = run_process(python_command("import partpick.cli"))
    print(f"  start-up alone (python + import partpick.cli): {start:.3f} s")
    print("  in process, warm: " + ", ".join(
        f"{k} {v:.3f} s" for k, v in in_process_s(db, folder / "spec.toml").items()))  # fmt: skip
    if opts.million:
        big = folder / "million"
        big.mkdir(exist_ok=True)
        (big / "spec.toml").write_text(SPEC_TEXT)
        if not (big / "bench.db").exists():
            print("building 1,000,000 inductors")
            build_catalog(big, 1_000_000, opts.seed, kinds=("inductor",))
        million = measure(big, big / "bench.db", opts.repeat, ())
        missed += report(
            million, "1,000,000 inductors, whole processes:", "1M inductors", table_goal_s=2.0
        )
    print("goals met" if not missed else "goals NOT met: " + "; ".join(missed))
    return 0 if not missed else 1


if __name__ == "__main__":
    sys.exit(main())
