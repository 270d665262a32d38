#!/usr/bin/env python3
"""Write synthetic, invented part catalogs of any size, in a clean or a messy CSV layout.

Every manufacturer name and part number is invented. Values follow the IEC 60063 E-series
and the usual physical trends of each kind (see the modules of ``scripts/catalog_gen/``,
one per kind), with a few missing cells, so the catalogs look like real exports to the
importer and the screening engine.

    python scripts/gen_catalog.py --kind inductor --rows 100000 --out /tmp/ind.csv
    python scripts/gen_catalog.py --kind capacitor --rows 1000 --out c.csv --layout clean
    python scripts/gen_catalog.py --all --rows-per-kind 250000 --out-dir /tmp/cat --seed 7

Layouts:

* ``clean``: comma separated UTF-8, one unit spelling per column ("10 uH", "6.2 A").
* ``messy``: semicolon separated UTF-8 with a byte-order mark, units in some headers
  ("DCR (mΩ)", "Isat, A"), mixed cell spellings ("4u7", "4700 nH", "0.028 Ω", "6200 mA"),
  mixed missing markers ("", "-", "N/A"), thousands separators in stock, an extra column
  partpick does not know. Every cell is still a valid value (unless ``bad_fraction`` > 0).

Library use (benchmarks): ``generate(kind, rows, seed, layout) -> pandas.DataFrame`` whose
columns are the CSV headers and whose cells are the CSV text; ``write_catalog`` writes it.
Both live in the ``catalog_gen`` package beside this file and are re-exported here, so
callers that load this file by path or put ``scripts/`` on ``sys.path`` keep working.
"""

from __future__ import annotations

import argparse
import sys
import time
from collections.abc import Sequence
from pathlib import Path

# Callers load this file by path (importlib) as well as run it, so make the package beside
# it importable either way.
_HERE = str(Path(__file__).resolve().parent)
if _HERE not in sys.path:
    sys.path.insert(0, _HERE)

from catalog_gen import KINDS, LAYOUTS, generate, write_catalog  # noqa: E402

__all__ = ["KINDS", "LAYOUTS", "generate", "main", "write_catalog"]


def _parse_args(argv: Sequence[str] | None) -> argparse.Namespace:
    parser = argparse.ArgumentParser(description=__doc__.split("\n\n")[0])
    target = parser.add_mutually_exclusive_group(required=True)
    target.add_argument("--kind", choices=KINDS, help="part kind to generate")
    target.add_argument("--all", action="store_true", help="generate all four kinds")
    parser.add_argument("--rows", type=int, help="rows to write (with --kind)")
    parser.add_argument("--out", help="output CSV file (with --kind)")
    parser.add_argument("--rows-per-kind", type=int, help="rows per kind (with --all)")
    parser.add_argument("--out-dir", help="output folder (with --all): <kind>s.csv inside")
    parser.add_argument("--seed", type=int, default=0, help="random seed (default 0)")
    parser.add_argument("--layout", choices=LAYOUTS, default="messy", help="default messy")
    parser.add_argument(
        "--bad-fraction",
        type=float,
        default=0.0,
        help="share of rows given one bad cell (default 0)",
    )
    args = parser.parse_args(argv)
    if args.kind and (args.rows is None or args.out is None):
        parser.error("--kind needs --rows and --out")
    if args.all and (args.rows_per_kind is None or args.out_dir is None):
        parser.error("--all needs --rows-per-kind and --out-dir")
    if (args.rows or args.rows_per_kind or 0) < 0 or not 0 <= args.bad_fraction <= 1:
        parser.error("rows must be 0 or more and --bad-fraction within [0, 1]")
    return args


def main(argv: Sequence[str] | None = None) -> int:
    args = _parse_args(argv)
    jobs = (
        [(args.kind, args.rows, Path(args.out))]
        if args.kind
        else [(k, args.rows_per_kind, Path(args.out_dir) / f"{k}s.csv") for k in KINDS]
    )
    for kind, rows, path in jobs:
        start = time.perf_counter()
        frame = generate(kind, rows, args.seed, args.layout, args.bad_fraction)
        built = time.perf_counter() - start
        write_catalog(frame, path, args.layout)
        total = time.perf_counter() - start
        print(
            f"{path}: {rows} {kind} rows ({args.layout}); built in {built:.2f} s, "
            f"written in {total - built:.2f} s",
            file=sys.stderr,
        )
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
