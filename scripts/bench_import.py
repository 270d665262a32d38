#!/usr/bin/env python3
"""Benchmark ``partpick import`` as a whole process against a bare pandas + sqlite3 process.

    python scripts/bench_import.py                  # 100,000 rows, 5 rounds, memory check
    python scripts/bench_import.py --rows 20000 --rounds 1 --no-memory

1. ``scripts/gen_catalog.py`` writes N invented inductor rows (messy layout by default,
   ``--bad-fraction`` to add bad cells) and a one-row file of the same layout.
2. Each round runs, interleaved, as whole processes (spawn to exit): the baseline
   ``python -c`` doing ``pandas.read_csv(dtype=str)`` + ``DataFrame.to_sql`` through a
   plain ``sqlite3`` connection (no parsing, no checks), then ``partpick import`` of the
   same file into a fresh catalog (sniff, header matching, every cell parsed and checked,
   the load in one transaction, the columnar snapshot, the summary). Then the one-row file:
   ``partpick import`` against ``python -c "import pandas, sqlalchemy"``. Medians, spread
   and median/median ratios are printed. Goals: ratio <= 1.5; one-row import < 0.5 s.
3. The same import in process (imports not timed), for comparison.
4. Peak RSS of an import of N rows and of 10 x N rows, each in a fresh subprocess, measured
   by the child (``ru_maxrss``) and by polling it with psutil. Goal: ratio <= 1.5, which
   only chunked reading gives.

This is a benchmark, not a test: it prints figures and asserts nothing.
"""

from __future__ import annotations

import argparse
import json
import shutil
import sqlite3
import statistics
import subprocess
import sys
import tempfile
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]
GENERATOR = ROOT / "scripts" / "gen_catalog.py"
sys.path.insert(0, str(ROOT / "scripts"))
from bench_process import (  # noqa: E402 - a sibling script module
    Timings,
    partpick_command,
    python_command,
    ratio_line,
    run_process,
)

# The bare job: the file's text into a table, every cell as it stands.
BASELINE = """\
import sqlite3, sys
import pandas as pd
csv, db, sep, encoding = sys.argv[1:]
frame = pd.read_csv(csv, sep=sep, encoding=encoding, dtype=str)
with sqlite3.connect(db) as conn:
    frame.to_sql("parts", conn, index=False)
"""

_CHILD = """
import json, resource, sys, time
from partpick.catalog.importer import import_catalog
start = time.perf_counter()
(report,) = import_catalog(sys.argv[1], [sys.argv[2]], "inductor")
seconds = time.perf_counter() - start
peak_kib = resource.getrusage(resource.RUSAGE_SELF).ru_maxrss
print(json.dumps({"seconds": seconds, "peak_kib": peak_kib, "added": report.added}))
"""


def generate(rows: int, out: Path, layout: str, bad_fraction: float = 0.0) -> None:
    """Write ``rows`` inductors with the data team's generator."""
    command = [sys.executable, str(GENERATOR), "--kind", "inductor", "--rows", str(rows)]
    command += ["--bad-fraction", str(bad_fraction)]
    subprocess.run([*command, "--out", str(out), "--layout", layout], check=True)


def fresh(db: Path) -> None:
    """Remove a database, its WAL files and its snapshot folder."""
    for suffix in ("", "-wal", "-shm"):
        Path(f"{db}{suffix}").unlink(missing_ok=True)
    shutil.rmtree(f"{db}.columns", ignore_errors=True)


def time_partpick(csv: Path, db: Path) -> float:
    """Return the seconds partpick's import of ``csv`` into a fresh ``db`` takes."""
    from partpick.catalog.importer import import_catalog
    from partpick.catalog.store import dispose_engines

    dispose_engines()
    fresh(db)
    start = time.perf_counter()
    import_catalog(str(db), [csv], "inductor")
    return time.perf_counter() - start


def time_baseline(csv: Path, db: Path, sep: str, encoding: str) -> float:
    """Return the seconds of a bare read_csv + to_sql of ``csv`` (no parsing, no checks)."""
    import pandas as pd

    fresh(db)
    start = time.perf_counter()
    frame = pd.read_csv(csv, sep=sep, encoding=encoding, dtype=str)
    with sqlite3.connect(db) as conn:
        frame.to_sql("parts", conn, index=False)
    return time.perf_counter() - start


def in_process(csv: Path, work: Path, rounds: int) -> dict:
    """Time both loaders ``rounds`` times in this process, alternating; return medians."""
    from partpick.catalog.sniff import sniff_file

    fmt = sniff_file(csv)  # the baseline is told the layout, so it does no detection at all
    ours, bare = [], []
    for _ in range(rounds):
        bare.append(time_baseline(csv, work / "baseline.db", fmt.delimiter, fmt.encoding))
        ours.append(time_partpick(csv, work / "partpick.db"))
    return {"baseline_s": statistics.median(bare), "partpick_s": statistics.median(ours)}


def whole_processes(csv: Path, one_row: Path, work: Path, rounds: int) -> dict[str, Timings]:
    """Run the four commands interleaved ``rounds`` times (fresh catalogs); return Timings."""
    from partpick.catalog.sniff import sniff_file

    fmt = sniff_file(csv)
    db = work / "process.db"
    commands = {
        "baseline": python_command(BASELINE, str(csv), str(db), fmt.delimiter, fmt.encoding),
        "partpick": partpick_command("import", str(csv), "--kind", "inductor", "--db", str(db)),
        "imports": python_command("import pandas, sqlalchemy"),
        "one_row": partpick_command(
            "import", str(one_row), "--kind", "inductor", "--db", str(db)
        ),  # fmt: skip
    }
    labels = {"baseline": "baseline: read_csv + to_sql(sqlite3)",
              "partpick": f"partpick import ({csv.name})",
              "imports": 'python -c "import pandas, sqlalchemy"',
              "one_row": "partpick import (one-row file)"}  # fmt: skip
    timings = {name: Timings(labels[name]) for name in commands}
    for _ in range(rounds):
        for name, args in commands.items():
            fresh(db)
            seconds, peak = run_process(args)
            timings[name].seconds.append(seconds)
            timings[name].peak_mib.append(peak)
            print(f"  {name} {seconds:.3f} s", end="", flush=True)
        print()
    fresh(db)
    return timings


def peak_rss(csv: Path, db: Path) -> dict:
    """Import ``csv`` in a fresh subprocess; return its peak RSS (child and psutil view)."""
    import psutil

    fresh(db)
    child = subprocess.Popen(
        [sys.executable, "-c", _CHILD, str(db), str(csv)], stdout=subprocess.PIPE, text=True
    )
    watched = psutil.Process(child.pid)
    polled = 0
    while child.poll() is None:
        try:
            polled = max(polled, watched.memory_info().rss)
        except psutil.NoSuchProcess:
            break
        time.sleep(0.01)
    out, _ = child.communicate()
    result = json.loads(out.strip().splitlines()[-1])
    result["peak_mib"] = result.pop("peak_kib") / 1024  # Linux ru_maxrss is in KiB
    result["polled_mib"] = polled / 2**20
    return result


def main(argv: list[str] | None = None) -> int:
    parser = argparse.ArgumentParser(description=__doc__.split("\n\n")[0])
    parser.add_argument("--rows", type=int, default=100_000)
    parser.add_argument("--rounds", type=int, default=5)
    parser.add_argument("--layout", choices=("messy", "clean"), default="messy")
    parser.add_argument("--bad-fraction", type=float, default=0.0, help="rows given a bad cell")
    parser.add_argument("--no-memory", action="store_true", help="skip the RSS comparison")
    parser.add_argument("--keep", help="keep the work files in this folder")
    args = parser.parse_args(argv)
    work = Path(args.keep or tempfile.mkdtemp(prefix="partpick-bench-"))
    work.mkdir(parents=True, exist_ok=True)
    try:
        _run(args, work)
    finally:
        if not args.keep:
            shutil.rmtree(work, ignore_errors=True)
    return 0


def _run(args, work: Path) -> None:
    small = work / f"inductors_{args.rows}.csv"
    generate(args.rows, small, args.layout, args.bad_fraction)
    one_row = work / "inductors_1.csv"
    generate(1, one_row, args.layout)
    print(f"{args.rows} rows, {small.stat().st_size / 2**20:.1f} MiB ({args.layout}); "
          f"{args.rounds} interleaved rounds of whole processes:")  # fmt: skip
    timings = whole_processes(small, one_row, work, args.rounds)
    for t in timings.values():
        print("  " + t.line())
    print("  " + ratio_line("import / baseline", timings["partpick"], timings["baseline"],
                            "<= 1.5"))  # fmt: skip
    one = timings["one_row"].median
    print(f"  one-row import: median {one:.3f} s (goal < 0.5 s)")
    figures = in_process(small, work, min(args.rounds, 3))
    print(f"  in process (imports not timed): baseline {figures['baseline_s']:.3f} s, "
          f"partpick {figures['partpick_s']:.3f} s, ratio "
          f"{figures['partpick_s'] / figures['baseline_s']:.2f}")  # fmt: skip
    if not args.no_memory:
        big = work / f"inductors_{args.rows * 10}.csv"
        generate(args.rows * 10, big, args.layout, args.bad_fraction)
        low = peak_rss(small, work / "rss_small.db")
        high = peak_rss(big, work / "rss_big.db")
        print(
            f"  peak RSS, {args.rows} rows: {low['peak_mib']:.0f} MiB "
            f"(psutil poll {low['polled_mib']:.0f} MiB, {low['seconds']:.2f} s)\n"
            f"  peak RSS, {args.rows * 10} rows: {high['peak_mib']:.0f} MiB "
            f"(psutil poll {high['polled_mib']:.0f} MiB, {high['seconds']:.2f} s)\n"
            f"  RSS ratio: {high['peak_mib'] / low['peak_mib']:.2f}  (goal <= 1.5)"
        )


if __name__ == "__main__":
    raise SystemExit(main())
