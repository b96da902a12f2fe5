"""Throughput of ``plait batch`` on random plats with 1 and 2 worker processes, in one run.

Usage::

    .venv/bin/python bench/batch.py [--items 1000] [--steps 100] [--workers 1,2]
                                    [--bridges 2-3] [--length 8-20] [--seed 1]

Prints one table: workers, items, wall time, items per hour and the speed-up over the
first worker count. Every configuration runs the same items with the same seeds and step
budget, so they do the same work; the script also checks that their rows agree.
"""

from __future__ import annotations

import argparse
import json
import sys
import tempfile
import time
from pathlib import Path

from plait.search.batch import run_batch
from plait.search.batch_files import read_rows, strip_volatile
from plait.search.randomplat import parse_range, random_plats


def main(argv: list[str] | None = None) -> int:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--items", type=int, default=1000)
    ap.add_argument("--steps", type=int, default=100, help="step budget per item")
    ap.add_argument("--workers", default="1,2", help="comma-separated worker counts")
    ap.add_argument("--bridges", default="2-3")
    ap.add_argument("--length", default="8-20")
    ap.add_argument("--seed", type=int, default=1)
    ap.add_argument("--strategy", default=None)
    args = ap.parse_args(argv)
    counts = [int(x) for x in args.workers.split(",")]
    with tempfile.TemporaryDirectory(prefix="plait-bench-batch-") as tmp:
        src = Path(tmp) / "items.jsonl"
        with open(src, "w", encoding="utf-8") as fh:
            for ident, plat in random_plats(args.items, bridges=parse_range(args.bridges, "b"),
                                            length=parse_range(args.length, "l"),
                                            seed=args.seed):
                fh.write(json.dumps({"id": ident, "plat": list(plat.word),
                                     "strands": plat.strands}) + "\n")
        results = []
        reference = None
        for w in counts:
            out = Path(tmp) / f"out-{w}"
            t0 = time.perf_counter()
            outcome = run_batch(src, out, steps=args.steps, seed=args.seed, workers=w,
                                strategy=args.strategy, quiet=True)
            wall = time.perf_counter() - t0
            rows = {r["id"]: strip_volatile(r) for r in read_rows(out / "results.jsonl")}
            same = reference is None or rows == reference
            reference = reference or rows
            results.append((w, outcome.summary, wall, same))
    base = results[0][2]
    print(f"plait batch: {args.items} random plats ({args.bridges} bridges, length "
          f"{args.length}), --steps {args.steps} per item, seed {args.seed}")
    print(f"{'workers':>7}  {'items':>6}  {'errors':>6}  {'wall s':>8}  {'items/hour':>11}  "
          f"{'speed-up':>8}  {'rows equal':>10}")
    for w, s, wall, same in results:
        print(f"{w:>7}  {s['done']:>6}  {s['errors']:>6}  {wall:>8.1f}  "
              f"{3600 * s['done'] / wall:>11,.0f}  {base / wall:>7.2f}x  {str(same):>10}")
    return 0 if all(same for *_, same in results) else 1


if __name__ == "__main__":
    sys.exit(main())
