#!/usr/bin/env python3
"""Benchmark the PostgreSQL team catalog with whole ``partpick`` processes.

    scripts/pg-throwaway .venv/bin/python scripts/bench_postgres.py
    .venv/bin/python scripts/bench_postgres.py --url postgresql://me@host/db --rounds 3

The server is ``--url`` or ``$PARTPICK_TEST_PG_URL`` (``scripts/pg-throwaway`` sets it); its
user must be allowed to create databases: each round gets a fresh one.

1. **Import.** N (100,000) messy inductor rows from ``scripts/gen_catalog.py`` through
   ``partpick import`` into an empty catalog, against a bare process that reads the same file
   with ``pandas.read_csv(dtype=str)`` and COPYs it into a table of text columns (no
   parsing, no checks, no identity). Goal: ratio <= 1.5.
2. **Pick.** ``partpick pick --role inductor`` over P (250,000) parts on PostgreSQL against
   the same pick on an SQLite file. Warm: the user's snapshot is cached (the usual case).
   Cold: the cache folder is emptied first (the first pick after someone imported). Beside
   them, a bare process that only fetches the columns the inductor rules read by binary COPY,
   the alternative to a cached snapshot. Goal: warm PostgreSQL <= 1.5 x SQLite.
3. **Two importers.** Two processes import N different rows each into one new, empty
   catalog at once (so they also race to create its tables).
   Goal: both succeed and the catalog holds every distinct part of the two files.

Rounds alternate between the contenders and the best of each is compared (least disturbed
by other work on the machine). This is a benchmark, not a test: it prints figures and
asserts nothing.
"""

from __future__ import annotations

import argparse
import os
import shutil
import subprocess
import sys
import tempfile
import time
import uuid
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]
GENERATOR = ROOT / "scripts" / "gen_catalog.py"
SPEC = ROOT / "catalogs" / "scenarios" / "field-logger.toml"
PARTPICK = [sys.executable, "-c", "from partpick.cli import main; main()"]

_BASELINE_IMPORT = """
import sys
import pandas as pd
import psycopg
url, csv, sep, encoding = sys.argv[1:5]
frame = pd.read_csv(csv, sep=sep, encoding=encoding, dtype=str)
columns = ", ".join(f'c{i} text' for i in range(len(frame.columns)))
with psycopg.connect(url) as conn:
    conn.execute(f"CREATE TABLE bare ({columns})")
    with conn.cursor().copy("COPY bare FROM STDIN (FORMAT csv)") as copy:
        copy.write(frame.to_csv(index=False, header=False))
"""

_BARE_FETCH = """
import sys
import numpy as np
import psycopg
url, names = sys.argv[1], sys.argv[2].split(",")
query = f"COPY (SELECT {', '.join(names)} FROM parts_inductor ORDER BY id) TO STDOUT"
query += " (FORMAT BINARY)"
with psycopg.connect(url) as conn, conn.cursor().copy(query) as copy:
    copy.set_types(["text", "text"] + ["float8"] * (len(names) - 2))
    columns = list(zip(*copy.rows()))
arrays = [np.asarray(c, dtype=float) for c in columns[2:]]
print(len(columns[0]))
"""

INDUCTOR_RULE_FIELDS = ("mpn", "manufacturer", "inductance_h", "tolerance", "isat_a", "irms_a",
                        "dcr_ohm", "unit_price", "length_mm", "width_mm", "height_mm")  # fmt: skip


def run(args: list[str], env: dict | None = None) -> float:
    """Run one whole process; return its wall time (raises if it fails)."""
    start = time.perf_counter()
    done = subprocess.run(args, capture_output=True, text=True, env=env)
    seconds = time.perf_counter() - start
    if done.returncode not in (0, 3):
        raise RuntimeError(f"{args[3:6]} failed ({done.returncode}): {done.stderr.strip()}")
    return seconds


def generate(kind: str, rows: int, out: Path, layout: str, seed: int) -> None:
    command = [sys.executable, str(GENERATOR), "--kind", kind, "--rows", str(rows)]
    command += ["--out", str(out), "--layout", layout, "--seed", str(seed)]
    subprocess.run(command, check=True, capture_output=True)


class Server:
    """Fresh databases on the benchmark server, dropped at the end."""

    def __init__(self, url: str) -> None:
        import sqlalchemy as sa

        self.url = sa.make_url(url).set(drivername="postgresql")
        self.names: list[str] = []

    def _admin(self):
        import psycopg

        return psycopg.connect(self.url.render_as_string(hide_password=False), autocommit=True)

    def new(self) -> str:
        name = f"ppbench_{uuid.uuid4().hex[:10]}"
        with self._admin() as conn:
            conn.execute(f'CREATE DATABASE "{name}"')
        self.names.append(name)
        return self.url.set(database=name).render_as_string(hide_password=False)

    def drop_all(self) -> None:
        with self._admin() as conn:
            for name in self.names:
                conn.execute(f'DROP DATABASE IF EXISTS "{name}" WITH (FORCE)')


def bench_import(server: Server, csv: Path, work: Path, rounds: int) -> None:
    sys.path.insert(0, str(ROOT))
    from partpick.catalog.sniff import sniff_file

    fmt = sniff_file(csv)  # the baseline is told the layout: it does no detection at all
    ours, bare, lite = [], [], []
    for n in range(rounds):
        bare.append(run([sys.executable, "-c", _BASELINE_IMPORT, server.new(), str(csv),
                         fmt.delimiter, fmt.encoding]))  # fmt: skip
        db = server.new()
        ours.append(run([*PARTPICK, "import", str(csv), "--kind", "inductor", "--db", db]))
        db = str(work / f"import-{n}.db")  # the same import into SQLite, for scale
        lite.append(run([*PARTPICK, "import", str(csv), "--kind", "inductor", "--db", db]))
        print(f"  round: bare read_csv+COPY {bare[-1]:.2f} s, partpick import {ours[-1]:.2f} s"
              f" (into SQLite {lite[-1]:.2f} s)")  # fmt: skip
    print(f"import: best bare {min(bare):.2f} s, best partpick {min(ours):.2f} s, "
          f"ratio {min(ours) / min(bare):.2f} (goal <= 1.5); the same import into SQLite "
          f"{min(lite):.2f} s")  # fmt: skip


def bench_pick(server: Server, csv: Path, work: Path, rounds: int) -> None:
    pg, lite = server.new(), str(work / "pick.db")
    for db in (pg, lite):
        run([*PARTPICK, "import", str(csv), "--kind", "inductor", "--db", db])
    cache = work / "cache"
    env = {**os.environ, "XDG_CACHE_HOME": str(cache)}
    pick = [*PARTPICK, "pick", str(SPEC), "--role", "inductor", "--top", "5"]
    fetch = [sys.executable, "-c", _BARE_FETCH, pg, ",".join(INDUCTOR_RULE_FIELDS)]
    times: dict[str, list[float]] = {"sqlite": [], "pg warm": [], "pg cold": [], "bare COPY": []}
    run([*pick, "--db", lite], env)
    for _ in range(rounds):
        times["sqlite"].append(run([*pick, "--db", lite], env))
        shutil.rmtree(cache, ignore_errors=True)
        times["pg cold"].append(run([*pick, "--db", pg], env))
        times["pg warm"].append(run([*pick, "--db", pg], env))
        times["bare COPY"].append(run(fetch, env))
        print("  round: " + ", ".join(f"{k} {v[-1]:.2f} s" for k, v in times.items()))
    best = {k: min(v) for k, v in times.items()}
    print(f"pick: best SQLite {best['sqlite']:.2f} s, PostgreSQL warm {best['pg warm']:.2f} s "
          f"(ratio {best['pg warm'] / best['sqlite']:.2f}, goal <= 1.5), cold "
          f"{best['pg cold']:.2f} s; bare binary COPY of the rule columns alone "
          f"{best['bare COPY']:.2f} s")  # fmt: skip


def bench_two_importers(server: Server, first: Path, second: Path) -> None:
    import pandas as pd

    db = server.new()
    # no tables yet: the two also race to create them (the schema lock makes one wait)
    expected = set()
    for path in (first, second):
        frame = pd.read_csv(path, dtype=str, keep_default_na=False)
        expected |= set(zip(frame.iloc[:, 1], frame.iloc[:, 0], strict=True))
    command = [*PARTPICK, "import", "--kind", "inductor", "--db", db]
    start = time.perf_counter()
    runs = [
        subprocess.Popen([*command, str(p)], stdout=subprocess.DEVNULL, stderr=subprocess.PIPE)
        for p in (first, second)
    ]
    codes = [r.wait() for r in runs]
    seconds = time.perf_counter() - start
    import psycopg

    with psycopg.connect(db) as conn:
        stored, distinct = conn.execute(
            "SELECT count(*), count(DISTINCT (manufacturer, mpn)) FROM parts_inductor"
        ).fetchone()
    print(f"two importers at once: exit codes {codes}, {seconds:.2f} s in all, {stored} parts "
          f"stored, {distinct} distinct, {len(expected)} distinct in the two files")  # fmt: skip


def main(argv: list[str] | None = None) -> int:
    parser = argparse.ArgumentParser(description=__doc__.split("\n\n")[0])
    parser.add_argument("--url", default=os.environ.get("PARTPICK_TEST_PG_URL"))
    parser.add_argument("--rows", type=int, default=100_000)
    parser.add_argument("--pick-rows", type=int, default=250_000)
    parser.add_argument("--rounds", type=int, default=3)
    args = parser.parse_args(argv)
    if not args.url:
        parser.error("no server: give --url or run under scripts/pg-throwaway")
    work = Path(tempfile.mkdtemp(prefix="partpick-pgbench-"))
    server = Server(args.url)
    try:
        messy = work / "messy.csv"
        generate("inductor", args.rows, messy, "messy", 0)
        print(f"{args.rows} messy rows, {messy.stat().st_size / 2**20:.1f} MiB")
        bench_import(server, messy, work, args.rounds)
        big = work / "big.csv"
        generate("inductor", args.pick_rows, big, "clean", 1)
        bench_pick(server, big, work, args.rounds)
        first, second = work / "a.csv", work / "b.csv"
        generate("inductor", args.rows, first, "clean", 2)
        generate("inductor", args.rows, second, "clean", 3)
        bench_two_importers(server, first, second)
    finally:
        server.drop_all()
        shutil.rmtree(work, ignore_errors=True)
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
