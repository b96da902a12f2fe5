"""``plait bridge`` over the KnotInfo table: bounds, certification, word length and time.

Usage::

    .venv/bin/python bench/table.py [--max-crossings 12] [--min-crossings 3] [--every 1]
                                    [--steps 200] [--time SECONDS] [--sample N --seed S]
                                    [--shard K/N] [--out ROWS.jsonl]
    .venv/bin/python bench/table.py --tally ROWS.jsonl [ROWS2.jsonl ...]

For every KnotInfo knot in the crossing range (every ``--every``-th one) runs
:func:`plait.bridge.bridge_report` on the table's ``pd_notation`` with the given search
budget (``--steps``, or ``--time`` seconds per knot) and prints one row per crossing
number and a total: knots, upper bound equal to KnotInfo's ``bridge_index`` (%, target
100), certified lower = upper (%, target >= 95), contradictions (a lower bound above the
table value or an upper bound below it; must be 0), median length / crossing number of
the returned plat (target <= 1.3) and its 90th percentile, the share of plats whose
length equals the crossing number, the share proved minimal by the Jones span
(``length_lower``), median and 95th-percentile CPU seconds per knot
(target median <= 2 s). Knots whose table bridge index is a range are skipped.
``--sample N`` takes N knots drawn at random (``--seed``) from the range instead.
``--shard K/N`` runs every N-th knot from the K-th, and ``--out`` keeps one JSON line per
knot (a rerun skips those already there), so the whole table can be run in pieces across
sessions and tallied with ``--tally``.
Source of the table values: KnotInfo via database-knotinfo.
"""

from __future__ import annotations

import argparse
import json
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


def _p90(xs: list[float]) -> float:
    xs = sorted(xs)
    return xs[min(len(xs) - 1, int(0.9 * len(xs)))]


def _row(label: str, s: dict) -> None:
    n = s["n"]
    print(f"{label:>4} {n:>6} {100 * s['upper'] / n:>8.1f} {100 * s['cert'] / n:>8.1f} "
          f"{s['contra']:>7} {statistics.median(s['ratio']):>10.3f} {_p90(s['ratio']):>8.3f} "
          f"{100 * s['exact'] / n:>8.1f} {100 * s['proved'] / n:>8.1f} "
          f"{statistics.median(s['time']):>8.3f} {_p95(s['time']):>8.3f}")


def _run(k, args, steps, tmp: str, i: int) -> dict:
    t0 = time.process_time()
    r = bridge_report(validate_pd(k.pd), steps=steps, time=args.time, seed=args.seed,
                      run_dir=os.path.join(tmp, str(i)), handle_signals=False)
    assert r.search.get("length_lower", 0) <= k.crossings, k.name  # KMT 1987
    return {"name": k.name, "crossings": k.crossings, "bridge_index": k.bridge_index,
            "lower": r.lower, "upper": r.upper, "certified": r.certified,
            "length": r.result.length, "length_minimal": bool(r.search.get("length_minimal")),
            "cpu": round(time.process_time() - t0, 3)}


def _table(rows: list[dict], title: str) -> None:
    by_c: dict[int, dict] = {}
    for r in rows:
        s = by_c.setdefault(r["crossings"], {"n": 0, "upper": 0, "cert": 0, "contra": 0,
                                             "ratio": [], "time": [], "exact": 0,
                                             "proved": 0})
        s["exact"] += r["length"] == r["crossings"]
        s["proved"] += r["length_minimal"]
        s["n"] += 1
        s["upper"] += r["upper"] == r["bridge_index"]
        s["cert"] += r["certified"]
        s["contra"] += r["lower"] > r["bridge_index"] or r["upper"] < r["bridge_index"]
        s["ratio"].append(r["length"] / r["crossings"])
        s["time"].append(r["cpu"])
    print(title)
    print(f"{'cr':>4} {'knots':>6} {'upper=%':>8} {'cert%':>8} {'contra':>7} "
          f"{'len/cr med':>10} {'p90':>8} {'len=cr%':>8} {'proved%':>8} "
          f"{'t med s':>8} {'t p95 s':>8}")
    tot = {"n": 0, "upper": 0, "cert": 0, "contra": 0, "ratio": [], "time": [], "exact": 0,
           "proved": 0}
    for c in sorted(by_c):
        for key in tot:
            tot[key] += by_c[c][key]
        _row(str(c), by_c[c])
    if tot["n"]:
        _row("all", tot)
        # how the ratios spread past the quantiles: the share of plats within each bound
        ratios = tot["ratio"]
        n = len(ratios)
        shares = ", ".join(f"<= {b:.2f}: {100 * sum(x <= b + 1e-12 for x in ratios) / n:.1f}%"
                           for b in (1.0, 1.1, 1.2, 1.25))
        print(f"length / crossing number {shares}; largest {max(ratios):.3f}")


def main(argv: list[str] | None = None) -> int:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--max-crossings", type=int, default=12)
    ap.add_argument("--min-crossings", type=int, default=3)
    ap.add_argument("--every", type=int, default=1, help="take every k-th knot")
    ap.add_argument("--steps", type=int, default=200, help="search steps per knot")
    ap.add_argument("--time", type=float, default=None, help="search seconds per knot")
    ap.add_argument("--sample", type=int, default=None,
                    help="only N knots drawn at random from the range")
    ap.add_argument("--seed", type=int, default=0, help="seed of --sample and the search")
    ap.add_argument("--shard", default="0/1", metavar="K/N", help="only knots K, K+N, ...")
    ap.add_argument("--out", help="append one JSON line per knot here; knots already in "
                                  "the file are skipped (so a run resumes)")
    ap.add_argument("--tally", nargs="+", metavar="FILE",
                    help="print the table of the rows in these --out files, run nothing")
    args = ap.parse_args(argv)
    if args.tally:
        rows_out: dict[str, dict] = {}
        for path in args.tally:
            with open(path, encoding="utf-8") as fh:
                for line in fh:
                    if line.strip():
                        r = json.loads(line)
                        rows_out[r["name"]] = r
        _table(list(rows_out.values()), f"table benchmark: {len(rows_out)} knots from "
                                        f"{len(args.tally)} file(s)")
        return 0
    rows = [k for k in knots(args.max_crossings, args.min_crossings)[:: args.every]
            if k.bridge_index is not None]
    if args.sample is not None and args.sample < len(rows):
        import random

        pick = sorted(random.Random(args.seed).sample(range(len(rows)), args.sample))
        rows = [rows[i] for i in pick]
    kk, nn = (int(x) for x in args.shard.split("/"))
    rows = rows[kk::nn]
    done: set[str] = set()
    if args.out and os.path.exists(args.out):
        with open(args.out, encoding="utf-8") as fh:
            done = {json.loads(line)["name"] for line in fh if line.strip()}
    steps = None if args.time is not None else args.steps
    got: list[dict] = []
    with tempfile.TemporaryDirectory(prefix="plait-bench-table-") as tmp:
        for i, k in enumerate(rows):
            if k.name in done:
                continue
            row = _run(k, args, steps, tmp, i)
            got.append(row)
            if args.out:
                with open(args.out, "a", encoding="utf-8") as fh:
                    fh.write(json.dumps(row) + "\n")
                    fh.flush()
                    os.fsync(fh.fileno())
    what = (f"a sample of {len(rows)} knots (seed {args.seed})" if args.sample is not None
            else f"{len(rows)} knots")
    budget = f"{args.time:g} s" if args.time is not None else f"{steps} steps"
    _table(got, f"table benchmark: {what} (shard {args.shard}, {len(got)} run now), "
                f"{args.min_crossings}..{args.max_crossings} crossings, {budget} per knot, "
                f"{time.strftime('%Y-%m-%d %H:%M')}")
    return 0


if __name__ == "__main__":
    sys.exit(main())
