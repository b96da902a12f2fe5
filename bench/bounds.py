"""Bridge lower bounds on the KnotInfo table: how many bridge-index-3 knots get b ≥ 3, and how fast.

Usage::

    .venv/bin/python bench/bounds.py [--max-crossings 12] [--min-crossings 3]

For every KnotInfo knot in the crossing range (source: KnotInfo via database-knotinfo),
the plat is built from the table's braid notation (``ClosedBraid.to_plat``) and
:func:`plait.scoring.bounds.bridge_lower_bound` is computed. One row per crossing number:
the knots with bridge index 2, 3 and 4 in the table; how many bridge-index-3 knots were
proved ``b ≥ 3`` (and bridge-index-4 knots ``b ≥ 4``); how many bounds are wrong (larger
than the table's bridge index — must be 0); which method proved ``b ≥ 3``; and the CPU
milliseconds per knot (mean and max, ``time.process_time``; the two-bridge candidates are
cached by determinant across knots, as in a long run). Knots whose bridge index is 3 but
whose bound stayed below 3 are listed at the end with the report's last reason.
"""

from __future__ import annotations

import argparse
import os
import sys
import time
from collections import Counter

sys.path.insert(0, os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "tests"))

from kidata import knots  # noqa: E402

from plait.scoring.bounds import bridge_lower_bound  # noqa: E402
from plait.word import ClosedBraid  # noqa: E402

METHODS = ("fox", "nakanishi", "not-2-bridge", "meridional-rank")


def main(argv: list[str] | None = None) -> int:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--max-crossings", type=int, default=12)
    ap.add_argument("--min-crossings", type=int, default=3)
    args = ap.parse_args(argv)

    head = (f"{'c':>3} {'knots':>6} {'b=2':>5} {'b=3':>5} {'≥3 proved':>10} {'%':>6} "
            f"{'b=4':>4} {'≥4':>4} {'wrong':>5} "
            + " ".join(f"{m:>13}" for m in METHODS) + f" {'ms/knot':>8} {'max ms':>7}")
    print(head)
    print("-" * len(head))
    left: list[tuple[str, str]] = []
    total = Counter()
    times_all: list[float] = []
    for c in range(args.min_crossings, args.max_crossings + 1):
        row = Counter()
        times = []
        for r in knots(c, c):
            plat = ClosedBraid.from_word(r.braid).to_plat()
            t0 = time.process_time()
            lb = bridge_lower_bound(plat)
            times.append(time.process_time() - t0)
            b = r.bridge_index
            row["knots"] += 1
            row[f"b={b}"] += 1
            if b is not None and lb.value > b:
                row["wrong"] += 1
            if b == 3:
                if lb.value >= 3:
                    row["proved3"] += 1
                    row[lb.method] += 1
                else:
                    left.append((r.name, lb.reasons[-1]))
            if b == 4 and lb.value >= 4:
                row["proved4"] += 1
        total.update(row)
        times_all += times
        print(_line(str(c), row, times))
    print("-" * len(head))
    print(_line("all", total, times_all))
    if left:
        print(f"\nbridge index 3 but bound < 3 ({len(left)}):")
        for name, why in left:
            print(f"  {name}: {why}")
    return 1 if total["wrong"] else 0


def _line(label: str, row: Counter, times: list[float]) -> str:
    n3 = row["b=3"]
    pct = f"{100 * row['proved3'] / n3:.1f}" if n3 else "-"
    mean = 1000 * sum(times) / len(times) if times else 0.0
    mx = 1000 * max(times) if times else 0.0
    return (f"{label:>3} {row['knots']:>6} {row['b=2']:>5} {n3:>5} {row['proved3']:>10} "
            f"{pct:>6} {row['b=4']:>4} {row['proved4']:>4} {row['wrong']:>5} "
            + " ".join(f"{row[m]:>13}" for m in METHODS) + f" {mean:>8.1f} {mx:>7.0f}")


if __name__ == "__main__":
    sys.exit(main())
