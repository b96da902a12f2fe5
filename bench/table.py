"""``plait bridge`` over the KnotInfo table: bounds, certification, word length and time.

Usage::

    .venv/bin/python bench/table.py [--max-crossings 12] [--min-crossings 3] [--every 1]
                                    [--steps 200] [--time SECONDS]

For every KnotInfo knot in the crossing range (every ``--every``-th one) runs
:func:`plait.bridge.bridge_report` on the table's ``pd_notation`` with the given search
budget (``--steps``, or ``--time`` seconds per knot) and prints one row per crossing
number and a total: knots, upper bound equal to KnotInfo's ``bridge_index`` (%, target
100), certified lower = upper (%, target >= 95), contradictions (a lower bound above the
table value or an upper bound below it; must be 0), median length / crossing number of
the returned plat (target <= 1.3), median and 95th-percentile CPU seconds per knot
(target median <= 2 s). Knots whose table bridge index is a range are skipped.
Source of the table values: KnotInfo via database-knotinfo.
"""

from __future__ import annotations

import argparse
import os
import statistics
import sys
import tempfile
import time

sys.path.insert(0, os.path.join(os.path.dirname(__file__), "..", "tests"))

from kidata import knots  # noqa: E402

from plait.bridge import bridge_report  # noqa: E402
from plait.diagrams.pd import validate_pd  # noqa: E402


def _p95(xs: list[float]) -> float:
    xs = sorted(xs)
    return xs[min(len(xs) - 1, int(0.95 * len(xs)))]


def _row(label: str, s: dict) -> None:
    n = s["n"]
    print(f"{label:>4} {n:>6} {100 * s['upper'] / n:>8.1f} {100 * s['cert'] / n:>8.1f} "
          f"{s['contra']:>7} {statistics.median(s['ratio']):>10.2f} "
          f"{statistics.median(s['time']):>8.3f} {_p95(s['time']):>8.3f}")


def main(argv: list[str] | None = None) -> int:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--max-crossings", type=int, default=12)
    ap.add_argument("--min-crossings", type=int, default=3)
    ap.add_argument("--every", type=int, default=1, help="take every k-th knot")
    ap.add_argument("--steps", type=int, default=200, help="search steps per knot")
    ap.add_argument("--time", type=float, default=None, help="search seconds per knot")
    args = ap.parse_args(argv)
    rows = [k for k in knots(args.max_crossings, args.min_crossings)[:: args.every]
            if k.bridge_index is not None]
    steps = None if args.time is not None else args.steps
    by_c: dict[int, dict] = {}
    with tempfile.TemporaryDirectory(prefix="plait-bench-table-") as tmp:
        for i, k in enumerate(rows):
            t0 = time.process_time()
            r = bridge_report(validate_pd(k.pd), steps=steps, time=args.time,
                              run_dir=os.path.join(tmp, str(i)), handle_signals=False)
            dt = time.process_time() - t0
            s = by_c.setdefault(k.crossings, {"n": 0, "upper": 0, "cert": 0, "contra": 0,
                                              "ratio": [], "time": []})
            s["n"] += 1
            s["upper"] += r.upper == k.bridge_index
            s["cert"] += r.certified
            s["contra"] += r.lower > k.bridge_index or r.upper < k.bridge_index
            s["ratio"].append(r.result.length / k.crossings)
            s["time"].append(dt)
    print(f"{'cr':>4} {'knots':>6} {'upper=%':>8} {'cert%':>8} {'contra':>7} "
          f"{'len/cr med':>10} {'t med s':>8} {'t p95 s':>8}")
    tot = {"n": 0, "upper": 0, "cert": 0, "contra": 0, "ratio": [], "time": []}
    for c in sorted(by_c):
        for key in tot:
            tot[key] += by_c[c][key]
        _row(str(c), by_c[c])
    _row("all", tot)
    return 0


if __name__ == "__main__":
    sys.exit(main())
