#!/usr/bin/env python3
"""Benchmark ``partpick import`` against a bare pandas + sqlite3 load of the same file.

    python scripts/bench_import.py                  # 100,000 rows, 3 rounds, memory check
    python scripts/bench_import.py --rows 20000 --rounds 1 --no-memory

1. ``scripts/gen_catalog.py`` writes N invented inductor rows (messy layout by default).
2. Each round times, on that same file, partpick's import (sniff, header matching, every
   cell parsed and checked, upsert in one transaction, columnar snapshot) and the baseline:
   ``pandas.read_csv(dtype=str)`` + ``DataFrame.to_sql`` through a plain ``sqlite3``
   connection, with no parsing at all. Rounds alternate, and the best of each is compared
   (the least disturbed by other work on the machine). Goal: ratio <= 1.5.
3. Peak RSS of an import of N rows and of 10 x N rows, each in a fresh subprocess, measured
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

_CHILD = """
import json, resource, sys, time
from partpick.catalog.importer import import_catalog
start = time.perf_counter()
(report,) = import_catalog(sys.argv[1], [sys.argv[2]], "inductor")
seconds = time.perf_counter() - start
peak_kib = resource.getrusage(resource.RUSAGE_SELF).ru_maxrss
print(json.dumps({"seconds": seconds, "peak_kib": peak_kib, "added": report.added}))
"""


def generate(rows: int, out: Path, layout: str) -> None:
    """Write ``rows`` inductors with the data team's generator."""
    command = [sys.executable, str(GENERATOR), "--kind", "inductor", "--rows", str(rows)]
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


def compare(csv: Path, work: Path, rounds: int) -> dict:
    """Time both loaders ``rounds`` times, alternating; return the figures."""
    from partpick.catalog.sniff import sniff_file

    fmt = sniff_file(csv)  # the baseline is told the layout, so it does no detection at all
    ours, bare = [], []
    for _ in range(rounds):
        bare.append(time_baseline(csv, work / "baseline.db", fmt.delimiter, fmt.encoding))
        ours.append(time_partpick(csv, work / "partpick.db"))
        print(f"  round: baseline {bare[-1]:.3f} s, partpick {ours[-1]:.3f} s", flush=True)
    return {
        "baseline_best_s": min(bare),
        "baseline_median_s": statistics.median(bare),
        "partpick_best_s": min(ours),
        "partpick_median_s": statistics.median(ours),
        "ratio_best": min(ours) / min(bare),
        "ratio_median": statistics.median(ours) / statistics.median(bare),
    }


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
    parser.add_argument("--rounds", type=int, default=3)
    parser.add_argument("--layout", choices=("messy", "clean"), default="messy")
    parser.add_argument("--no-memory", action="store_true", help="skip the RSS comparison")
    parser.add_argument("--keep", help="keep the work files in this folder")
    args = parser.parse_args(argv)
    work = Path(args.keep or tempfile.mkdtemp(prefix="partpick-bench-"))
    work.mkdir(parents=True, exist_ok=True)
    try:
        small = work / f"inductors_{args.rows}.csv"
        generate(args.rows, small, args.layout)
        print(f"{args.rows} rows, {small.stat().st_size / 2**20:.1f} MiB ({args.layout})")
        figures = compare(small, work, args.rounds)
        print(
            f"baseline read_csv+to_sql: best {figures['baseline_best_s']:.3f} s "
            f"(median {figures['baseline_median_s']:.3f} s)\n"
            f"partpick import:          best {figures['partpick_best_s']:.3f} s "
            f"(median {figures['partpick_median_s']:.3f} s)\n"
            f"ratio (best/best): {figures['ratio_best']:.2f}  (goal <= 1.5), "
            f"median/median: {figures['ratio_median']:.2f}"
        )
        if not args.no_memory:
            big = work / f"inductors_{args.rows * 10}.csv"
            generate(args.rows * 10, big, args.layout)
            low = peak_rss(small, work / "rss_small.db")
            high = peak_rss(big, work / "rss_big.db")
            print(
                f"peak RSS, {args.rows} rows: {low['peak_mib']:.0f} MiB "
                f"(psutil poll {low['polled_mib']:.0f} MiB, {low['seconds']:.2f} s)\n"
                f"peak RSS, {args.rows * 10} rows: {high['peak_mib']:.0f} MiB "
                f"(psutil poll {high['polled_mib']:.0f} MiB, {high['seconds']:.2f} s)\n"
                f"RSS ratio: {high['peak_mib'] / low['peak_mib']:.2f}  (goal <= 1.5)"
            )
    finally:
        if not args.keep:
            shutil.rmtree(work, ignore_errors=True)
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
