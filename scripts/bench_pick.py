#!/usr/bin/env python3
"""Benchmark ``partpick pick`` on a catalog of 1,000,000 synthetic invented parts.

Builds 250,000 parts of each kind with ``scripts/gen_catalog.py`` (clean layout), imports
them through partpick, then times, in the same run:

* ``partpick pick SPEC --role inductor --top 10`` as a whole process (subprocess, wall time,
  best and median of ``--repeat`` runs), plus one ``--format json`` run whose counts must add
  up to every inductor;
* the bare baseline: ``pandas.read_sql`` of the inductor table through SQLAlchemy plus one
  boolean numpy mask of the same checks (in process, imports not timed, so the baseline is
  flattered rather than the tool).

Goals (issue 4): the whole command ≤ 1 s and ≥ 3× faster than the baseline, with every part
classified and counted. It also reports which heavy modules a pick process imports.

    .venv/bin/python scripts/bench_pick.py            # builds in a temporary folder
    .venv/bin/python scripts/bench_pick.py --keep /tmp/bench --rows 250000
"""

from __future__ import annotations

import argparse
import json
import os
import statistics
import subprocess
import sys
import tempfile
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
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
# what-if probe: the same command with the catalog commands' module replaced by an empty
# stand-in, to show what importing pandas/SQLAlchemy there at start-up costs every command
WHAT_IF = (
    "import sys, types\n"
    "stub = types.ModuleType('partpick.cli.catalog'); stub.register = lambda app: None\n"
    "sys.modules['partpick.cli.catalog'] = stub\n"
)
PROBE = (
    "import sys\nfrom partpick.cli import app\n"
    "try:\n    app(sys.argv[1:])\n"
    "except SystemExit:\n    pass\n"
    "heavy = [m for m in ('pandas', 'sqlalchemy', 'scipy', 'matplotlib') if m in sys.modules]\n"
    "print('HEAVY=' + ','.join(heavy), file=sys.stderr)\n"
)


def build_catalog(folder: Path, rows: int, seed: int) -> str:
    """Generate and import ``rows`` parts of each kind; return the database path."""
    sys.path.insert(0, str(ROOT / "scripts"))
    import gen_catalog  # noqa: PLC0415 - a sibling script, not a package

    from partpick.catalog.importer import import_catalog

    db = str(folder / "bench.db")
    for kind, stem in KIND_FILES.items():
        start = time.perf_counter()
        frame = gen_catalog.generate(kind, rows, seed, "clean")
        csv_path = gen_catalog.write_catalog(frame, folder / f"{stem}.csv", "clean")
        generated = time.perf_counter() - start
        start = time.perf_counter()
        report = import_catalog(db, [csv_path], kind)[0]
        print(
            f"  {kind:9s} {rows:,} rows: generated in {generated:.1f} s, imported in "
            f"{time.perf_counter() - start:.1f} s ({report.added:,} added, "
            f"{report.rejected:,} rejected)"
        )
    return db


def time_command(args: list[str], repeat: int) -> tuple[list[float], str, str]:
    """Return (wall times in s, stdout of the last run, stderr of the last run)."""
    times, out, err = [], "", ""
    for _ in range(repeat):
        start = time.perf_counter()
        done = subprocess.run(args, capture_output=True, text=True, check=False)
        times.append(time.perf_counter() - start)
        if done.returncode != 0:
            raise SystemExit(f"command failed ({done.returncode}): {' '.join(args)}\n{done.stderr}")
        out, err = done.stdout, done.stderr
    return times, out, err


def baseline_s(db: str, spec_path: Path) -> tuple[float, int]:
    """Time read_sql of the inductor table plus one mask of the inductor checks."""
    import numpy as np
    import pandas as pd

    from partpick.catalog.schema import table_name
    from partpick.catalog.store import open_engine
    from partpick.design.spec import load_spec
    from partpick.design.topologies import analyse

    spec = load_spec(spec_path)
    env = analyse(spec)
    engine = open_engine(db)
    start = time.perf_counter()
    frame = pd.read_sql(f"SELECT * FROM {table_name('inductor')}", engine)
    l_nom = frame["inductance_h"].to_numpy(dtype=float)
    tol = np.nan_to_num(frame["tolerance"].to_numpy(dtype=float), nan=0.2)
    l_part = l_nom * (1.0 - tol)
    # the same checks at vin_min, where a boost's peak and RMS currents are worst
    vin, duty = spec.vin_min_v, env.value("duty_max")
    il = spec.iout_a / (1.0 - duty)
    ripple = vin * duty / (spec.fsw_hz * l_part)
    peak = il + ripple / 2.0
    rms = np.sqrt(il**2 + ripple**2 / 12.0)
    passed = (
        (l_nom >= env.value("l_min_h"))
        & (l_nom <= env.value("l_max_h"))
        & (peak <= 0.8 * frame["isat_a"].to_numpy(dtype=float))
        & (rms <= 0.9 * frame["irms_a"].to_numpy(dtype=float))
        & (frame["lifecycle"].to_numpy() != "obsolete")
    )
    elapsed = time.perf_counter() - start
    return elapsed, int(passed.sum())


def in_process_s(db: str, spec_path: Path) -> tuple[float, float]:
    """Return (read_columns, whole pick() with top=10) in s, warm, in this process."""
    from partpick.design.spec import load_spec
    from partpick.screening.pick import ROLE_RULES, pick, read_role_columns
    from partpick.screening.profiles import load_profile

    spec, profile = load_spec(spec_path), load_profile("standard")
    pick(db, spec, "inductor", profile=profile, top=10)  # warm
    start = time.perf_counter()
    read_role_columns(db, ROLE_RULES["inductor"])
    read_s = time.perf_counter() - start
    start = time.perf_counter()
    pick(db, spec, "inductor", profile=profile, top=10)
    return read_s, time.perf_counter() - start


def main(argv: list[str] | None = None) -> int:
    parser = argparse.ArgumentParser(description=__doc__.split("\n\n")[0])
    parser.add_argument("--rows", type=int, default=250_000, help="parts per kind")
    parser.add_argument("--seed", type=int, default=7)
    parser.add_argument("--repeat", type=int, default=5, help="timed runs of the command")
    parser.add_argument("--keep", help="build (or reuse) the catalog in this folder")
    opts = parser.parse_args(argv)

    folder = Path(opts.keep) if opts.keep else Path(tempfile.mkdtemp(prefix="bench_pick_"))
    folder.mkdir(parents=True, exist_ok=True)
    db = folder / "bench.db"
    if not db.exists():
        print(f"building {4 * opts.rows:,} parts in {folder}")
        build_catalog(folder, opts.rows, opts.seed)
    spec_path = folder / "spec.toml"
    spec_path.write_text(SPEC_TEXT)

    exe = str(Path(sys.executable).with_name("partpick"))
    args = [exe, "pick", str(spec_path), "--role", "inductor", "--db", str(db), "--top", "10"]
    env = dict(os.environ)
    subprocess.run(args, capture_output=True, check=False, env=env)  # warm the file cache
    table_times, _out, _err = time_command(args, opts.repeat)
    json_times, out, _err = time_command(args + ["--format", "json", "--top", "1"], 1)
    data = json.loads(out)
    counted = sum(data["counts"].values())
    probe = [sys.executable, "-c", PROBE] + args[1:]
    _t, _o, err = time_command(probe, 1)
    heavy = next((line[6:] for line in err.splitlines() if line.startswith("HEAVY=")), "?")

    startup, _o, _e = time_command([sys.executable, "-c", "import partpick.cli"], 3)
    empty_args = args[:5] + ["--db", str(folder / "empty.db"), "--top", "10"]
    empty, _o, _e = time_command(empty_args, 3)
    what_if, _o, _e = time_command([sys.executable, "-c", WHAT_IF + PROBE] + args[1:], 3)
    read_s, core_s = in_process_s(str(db), spec_path)
    base, base_passed = baseline_s(str(db), spec_path)
    best, median = min(table_times), statistics.median(table_times)
    print(f"inductors in catalog:              {data['total']:,}")
    print(f"classified and counted:            {counted:,} {data['counts']}")
    print(f"partpick pick (whole process):     best {best:.3f} s, median {median:.3f} s "
          f"over {opts.repeat} runs")  # fmt: skip
    print(f"partpick pick --format json:       {json_times[0]:.3f} s")
    print(f"baseline read_sql + numpy mask:    {base:.3f} s ({base_passed:,} pass its mask)")
    print(f"speed-up (baseline / best):        {base / best:.1f}x")
    print(f"heavy modules imported by pick:    {heavy or 'none'}")
    print(f"  of which: python + import partpick.cli {min(startup):.3f} s; the same command "
          f"on an empty catalog {min(empty):.3f} s")  # fmt: skip
    print(f"  what-if, catalog commands' module not loaded at start-up: best {min(what_if):.3f} s")
    print(f"  in process (warm): read_columns {read_s:.3f} s, whole pick() {core_s:.3f} s")
    ok = best <= 1.0 and base / best >= 3.0 and counted == data["total"] == opts.rows
    print("goals met" if ok else "goals NOT met (<= 1 s, >= 3x, every part counted)")
    return 0 if ok else 1


if __name__ == "__main__":
    sys.exit(main())
