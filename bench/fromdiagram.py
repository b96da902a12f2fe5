"""KnotInfo PD diagrams to plats: bridges, chirality, word length and time, in one run.

Usage::

    .venv/bin/python bench/fromdiagram.py [--max-crossings 12] [--min-crossings 3]
                                          [--every 1] [--time-limit 10] [--vogel]

For every KnotInfo knot in the crossing range (every ``--every``-th one), converts the
table's ``pd_notation`` with :func:`plait.diagrams.fromdiagram.diagram_to_plat` and prints one table
per crossing number: knots, bridges equal to KnotInfo's ``bridge_index`` (%), Wirtinger
number proven minimal (%), Jones polynomial equal to KnotInfo's (%), median and largest
plat length / crossing number, median and 95th-percentile seconds per knot (CPU time of
this process, guard included). With ``--vogel`` it adds the same columns for the Vogel
route (strands = Seifert circles, so its bridge rate is not expected to be 100%).
Source of the table values: KnotInfo via database-knotinfo.
"""

from __future__ import annotations

import argparse
import os
import statistics
import sys
import time

sys.path.insert(0, os.path.join(os.path.dirname(__file__), "..", "tests"))

from kidata import knots  # noqa: E402

from plait.diagrams.fromdiagram import diagram_to_plat  # noqa: E402
from plait.diagrams.pd import validate_pd  # noqa: E402
from plait.diagrams.pdjones import plat_jones  # noqa: E402


def _p95(xs: list[float]) -> float:
    xs = sorted(xs)
    return xs[min(len(xs) - 1, int(0.95 * len(xs)))]


def run(rows, method: str, time_limit: float) -> dict[int, dict]:
    by_c: dict[int, dict] = {}
    for k in rows:
        pd = validate_pd(k.pd)
        t0 = time.process_time()
        d = diagram_to_plat(pd, method=method, time_limit=time_limit)
        dt = time.process_time() - t0
        s = by_c.setdefault(k.crossings, {"n": 0, "bridges": 0, "proven": 0, "jones": 0,
                                          "ratio": [], "time": []})
        s["n"] += 1
        s["bridges"] += d.plat.bridges == k.bridge_index
        s["proven"] += bool(d.wirtinger and d.wirtinger.proven_minimal)
        s["jones"] += plat_jones(d.plat) == k.jones
        s["ratio"].append(d.plat.length / k.crossings)
        s["time"].append(dt)
    return by_c


def table(title: str, by_c: dict[int, dict]) -> None:
    print(title)
    print(f"{'cr':>3} {'knots':>6} {'b=table%':>9} {'proven%':>8} {'jones%':>7} "
          f"{'len/cr med':>10} {'max':>5} {'t med s':>8} {'t p95 s':>8}")
    tot = {"n": 0, "bridges": 0, "proven": 0, "jones": 0, "ratio": [], "time": []}
    for c in sorted(by_c):
        s = by_c[c]
        for key in ("n", "bridges", "proven", "jones", "ratio", "time"):
            tot[key] += s[key]
        _row(str(c), s)
    _row("all", tot)


def _row(label: str, s: dict) -> None:
    n = s["n"]
    print(f"{label:>3} {n:>6} {100 * s['bridges'] / n:>9.1f} {100 * s['proven'] / n:>8.1f} "
          f"{100 * s['jones'] / n:>7.1f} {statistics.median(s['ratio']):>10.2f} "
          f"{max(s['ratio']):>5.2f} {statistics.median(s['time']):>8.3f} "
          f"{_p95(s['time']):>8.3f}")


def main(argv: list[str] | None = None) -> int:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--max-crossings", type=int, default=12)
    ap.add_argument("--min-crossings", type=int, default=3)
    ap.add_argument("--every", type=int, default=1, help="take every k-th knot")
    ap.add_argument("--time-limit", type=float, default=10.0, help="CP-SAT seconds")
    ap.add_argument("--vogel", action="store_true", help="also run the Vogel route")
    args = ap.parse_args(argv)
    rows = knots(args.max_crossings, args.min_crossings)[:: args.every]
    table("Wirtinger route (plait.diagrams.fromdiagram.diagram_to_plat, method='auto')",
          run(rows, "auto", args.time_limit))
    if args.vogel:
        print()
        table("Vogel route (method='vogel')", run(rows, "vogel", args.time_limit))
    return 0


if __name__ == "__main__":
    sys.exit(main())
