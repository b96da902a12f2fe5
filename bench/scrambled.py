"""Scrambled benchmark: hide each table knot's plat in a longer one and let the search recover it.

For every KnotInfo knot up to ``--max-crossings`` crossings (source: KnotInfo via
database-knotinfo), its braid notation becomes a plat (the "clean" plat), which
:func:`plait.moves.scramble` hides in a presentation about 5 times as long with two more
bridges. Each strategy then gets ``--time`` seconds per knot. A result counts when its
bridges (length) are at most the clean plat's; every certificate is replayed and every
guard must pass. Lengths are also compared with KnotInfo's crossing number, which no
plat of the knot goes below. One table per run, one row per strategy (``--resume`` with
every row already in ``--out`` prints the table of that file again).

Usage::

    .venv/bin/python bench/scrambled.py                    # all 249 knots, 10 s, 4 strategies
    .venv/bin/python bench/scrambled.py --limit 20 --time 3 --strategies auto,beam
"""

from __future__ import annotations

import argparse
import json
import statistics
import sys
import tempfile
import time
from concurrent.futures import ProcessPoolExecutor
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parent.parent / "tests"))


def _one(job: tuple) -> dict:
    """Run one (knot, strategy) item; returns a row of measurements."""
    name, braid, bridge_index, index, strategy, seconds, seed, root = job
    import plait.moves as moves
    from plait.errors import GuardViolation
    from plait.search import reduce
    from plait.word import ClosedBraid

    clean = ClosedBraid.from_word(braid).to_plat()
    scr, _ = moves.scramble(clean, seed=index, length_factor=5, stabilizations=2)
    run_dir = Path(root) / f"{strategy}-{name}"
    row = {"knot": name, "strategy": strategy, "clean": [clean.bridges, clean.length],
           "scrambled": [scr.bridges, scr.length], "bridge_index": bridge_index}
    t0 = time.monotonic()
    try:
        res = reduce(scr, strategy=strategy, time=seconds, seed=seed, run_dir=run_dir)
    except GuardViolation as exc:
        row.update(guard=False, error=str(exc), wall=time.monotonic() - t0)
        return row
    row["wall"] = time.monotonic() - t0
    r = res.result
    row.update(result=[r.bridges, r.length], guard=res.guards == "passed",
               certificate=bool(moves.verify_certificate(res.certificate).ok),
               lower=res.lower, steps=res.steps, explored=res.explored)
    # time to the final best: the first "best" event of the run's log with its score
    to_best = None
    for line in (run_dir / "log.jsonl").read_text().splitlines():
        ev = json.loads(line)
        if (ev.get("event") == "best" and to_best is None
                and [ev["bridges"], ev["length"]] == row["result"]):
            to_best = ev.get("found", ev.get("elapsed"))
    row["to_best"] = to_best if to_best is not None else row["wall"]
    return row


def _table(rows: list[dict], strategies: list[str], crossings: dict[str, int]) -> str:
    # crossings: KnotInfo's crossing number of each knot (the length no plat goes below)
    head = ("strategy", "knots", "bridges<=clean", "length<=clean", "bridges=KnotInfo",
            "median length ratio", "median length/crossing number",
            "length=crossing number", "median time to best (s)", "median wall (s)",
            "certificates ok", "guards ok")
    lines = ["| " + " | ".join(head) + " |", "|" + "---|" * len(head)]
    for s in strategies:
        rs = [r for r in rows if r["strategy"] == s]
        if not rs:
            continue
        n = len(rs)
        done = [r for r in rs if "result" in r]
        bok = sum(r["result"][0] <= r["clean"][0] for r in done)
        lok = sum(r["result"][1] <= r["clean"][1] for r in done)
        bki = sum(r["bridge_index"] is not None and r["result"][0] == r["bridge_index"]
                  for r in done)
        ratio = statistics.median(r["result"][1] / max(1, r["clean"][1]) for r in done) \
            if done else float("nan")
        per_cr = [r["result"][1] / crossings[r["knot"]] for r in done]
        med_cr = statistics.median(per_cr) if done else float("nan")
        at_cr = sum(r["result"][1] == crossings[r["knot"]] for r in done)
        tb = statistics.median(r["to_best"] for r in done) if done else float("nan")
        wall = statistics.median(r["wall"] for r in rs)
        cok = sum(bool(r.get("certificate")) for r in rs)
        gok = sum(bool(r.get("guard")) for r in rs)
        lines.append(f"| {s} | {n} | {bok}/{n} ({100 * bok / n:.1f}%) | "
                     f"{lok}/{n} ({100 * lok / n:.1f}%) | {bki}/{n} | {ratio:.3f} | "
                     f"{med_cr:.3f} | "
                     f"{at_cr}/{n} ({100 * at_cr / n:.1f}%) | "
                     f"{tb:.2f} | {wall:.2f} | {cok}/{n} | {gok}/{n} |")
    return "\n".join(lines)


def main(argv: list[str] | None = None) -> int:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--time", type=float, default=10.0, help="seconds per knot and strategy")
    ap.add_argument("--strategies", default="auto,beam,astar,anneal",
                    help="comma-separated strategies (default: auto,beam,astar,anneal)")
    ap.add_argument("--limit", type=int, default=None,
                    help="only this many knots, spread evenly over the table")
    ap.add_argument("--max-crossings", type=int, default=10)
    ap.add_argument("--seed", type=int, default=0, help="search seed")
    ap.add_argument("--jobs", type=int, default=1, help="worker processes (default 1)")
    ap.add_argument("--out", help="also write one JSON line per (knot, strategy) here")
    ap.add_argument("--run-root", help="keep the run folders here (default: a temp folder)")
    ap.add_argument("--resume", action="store_true",
                    help="keep the rows already in --out and run only the missing ones")
    args = ap.parse_args(argv)
    if args.resume and not args.out:
        ap.error("--resume needs --out")

    from kidata import knots  # source: KnotInfo via database-knotinfo

    rows_k = list(knots(args.max_crossings))
    if args.limit is not None and args.limit < len(rows_k):
        step = len(rows_k) / args.limit
        rows_k = [rows_k[int(i * step)] for i in range(args.limit)]
    strategies = [s for s in args.strategies.split(",") if s]
    root = args.run_root or tempfile.mkdtemp(prefix="plait-bench-")
    all_rows = list(knots(args.max_crossings))
    index = {k.name: i for i, k in enumerate(all_rows)}
    jobs = [(k.name, k.braid, k.bridge_index, index[k.name], s, args.time, args.seed, root)
            for k in rows_k for s in strategies]
    results = _kept_rows(args.out, {(j[0], j[4]) for j in jobs}) if args.resume else []
    done = {(r["knot"], r["strategy"]) for r in results}
    jobs = [j for j in jobs if (j[0], j[4]) not in done]
    t0 = time.monotonic()
    out = open(args.out, "a" if args.resume else "w") if args.out else None
    try:
        if args.jobs > 1:
            with ProcessPoolExecutor(args.jobs) as ex:
                for row in ex.map(_one, jobs):
                    results.append(row)
                    _progress(row, out)
        else:
            for job in jobs:
                row = _one(job)
                results.append(row)
                _progress(row, out)
    finally:
        if out:
            out.close()
    print()
    print(f"scrambled benchmark: {len(rows_k)} knots <= {args.max_crossings} crossings, "
          f"{args.time:g} s per knot, seed {args.seed}, {args.jobs} job(s), "
          f"{time.monotonic() - t0:.0f} s in all, {time.strftime('%Y-%m-%d')}"
          + (f" ({len(done)} rows kept from {args.out})" if done else ""))
    print(_table(results, strategies, {k.name: k.crossings for k in all_rows}))
    return 0


def _kept_rows(path: str, wanted: set[tuple[str, str]]) -> list[dict]:
    """Rows of an earlier, interrupted run in ``path`` that this run asks for (a torn last
    line is dropped and rewritten)."""
    try:
        with open(path, encoding="utf-8") as fh:
            lines = fh.readlines()
    except FileNotFoundError:
        return []
    rows = []
    for line in lines:
        try:
            row = json.loads(line)
        except json.JSONDecodeError:
            break
        if (row["knot"], row["strategy"]) in wanted:
            rows.append(row)
    with open(path, "w", encoding="utf-8") as fh:
        fh.writelines(json.dumps(r) + "\n" for r in rows)
    return rows


def _progress(row: dict, out) -> None:
    res = row.get("result", "GUARD " + row.get("error", ""))
    print(f"{row['strategy']:7} {row['knot']:8} clean={row['clean']} "
          f"scrambled={row['scrambled']} -> {res} ({row['wall']:.1f} s)",
          file=sys.stderr, flush=True)
    if out:
        out.write(json.dumps(row) + "\n")
        out.flush()


if __name__ == "__main__":
    sys.exit(main())
