"""Meridional-rank bounds b ≥ 4 from finite quotients on KnotInfo's bridge-index-4 knots.

Usage::

    nice -n 10 .venv/bin/python bench/rank.py [--set open12 | --set c13] [--every 1]
        [--seconds 60] [--max-class 420]

``--set open12`` (default): the KnotInfo knots up to 12 crossings with bridge index 4 whose
lower bound from the other methods of :func:`plait.scoring.bounds.bridge_lower_bound`
(everything but the meridional-rank search) and meridians to transpositions of S5 and
S6 (the bound before this module) stays below 4 — the 35 knots of docs/bounds.md.
``--set c13``: every ``--every``-th 13-crossing knot of bridge index 4. ``--set low``:
the knots of bridge index 2 and 3 (soundness: a bound above the table is a contradiction),
optionally with ``--names`` to pick targets.
Source of the table values: KnotInfo via database-knotinfo.

For each knot the plat of the table's braid notation is searched with
:func:`plait.scoring.meridional.meridional_rank_bound` (want = 4) over all targets, with
``--seconds`` of wall time per knot. One row per knot: the bound reached, the target that
proved it, the image class size, seconds; then a summary line. A bound above the table's
bridge index would be a contradiction and is counted (must be 0).
"""

from __future__ import annotations

import argparse
import os
import statistics
import sys
import time
from dataclasses import dataclass

sys.path.insert(0, os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "tests"))

from kidata import knots  # noqa: E402

from plait.scoring import meridional as M  # noqa: E402
from plait.word import ClosedBraid  # noqa: E402


@dataclass(frozen=True)
class _Row:
    name: str
    braid: tuple[int, ...]
    bridge_index: int


def _thirteen() -> list[_Row]:
    """13-crossing knots of bridge index 4 (source: KnotInfo via database-knotinfo); read
    here directly, since tests/kidata.py does not parse every 13-crossing polynomial."""
    import json

    from database_knotinfo import link_list

    out = []
    for k in link_list():
        if str(k.get("crossing_number")) != "13" or str(k.get("bridge_index")) != "4":
            continue
        braid = json.loads(k["braid_notation"].replace("{", "[").replace("}", "]"))
        if braid and isinstance(braid[0], list):
            braid = braid[0]
        out.append(_Row(k["name"], tuple(braid), 4))
    return out


def _other_bound(plat) -> int:
    """The bound of bridge_lower_bound without its meridional-rank search."""
    from plait.scoring import bounds

    saved = bounds._meridional
    bounds._meridional = lambda *a, **k: M.RankResult(0, None, (), ())
    try:
        bounds.bridge_lower_bound.cache_clear()
        return bounds.bridge_lower_bound(plat).value
    finally:
        bounds._meridional = saved
        bounds.bridge_lower_bound.cache_clear()


def _old_bound(plat) -> int:
    """The bound before this module: the other methods, then meridians to transpositions
    of S5 and S6 (plait.scoring.quotients.meridional_rank_witness, the former
    RANK_TARGETS)."""
    from plait.scoring.quotients import meridional_rank_witness

    best = _other_bound(plat)
    if best >= 3:
        for name in ("S5/transposition", "S6/transposition"):
            w = meridional_rank_witness(plat, name, 3_000_000)
            if w is not None:
                best = max(best, w[0])
    return best


def _low(args) -> int:
    """Soundness sweep: knots of bridge index 2 and 3; any bound above it is counted."""
    names = (args.names.split(";") if args.names else
             [n for n in M.target_names() if M._size_hint(n) <= args.max_class])
    rows = [k for k in knots(args.max_crossings)[:: args.every] if k.bridge_index in (2, 3)]
    contra, n, t0 = [], 0, time.monotonic()
    for k in rows:
        plat = ClosedBraid.from_word(k.braid).to_plat()
        res = M.meridional_rank_bound(plat, k.bridge_index + 1,
                                      deadline=time.monotonic() + args.seconds, names=names,
                                      stop_at=k.bridge_index + 1)
        n += 1
        if res.value > k.bridge_index:
            contra.append((k.name, res.value, res.witness.target))
    print(f"low: {n} knots of bridge index 2 or 3 up to {args.max_crossings} crossings "
          f"(every {args.every}), {len(names)} targets, {args.seconds} s each: "
          f"contradictions {len(contra)} {contra[:5]}; {time.monotonic() - t0:.0f} s; "
          f"{time.strftime('%Y-%m-%d')}")
    return 0


def main(argv: list[str] | None = None) -> int:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--set", choices=("open12", "c13", "low"), default="open12")
    ap.add_argument("--max-crossings", type=int, default=12)
    ap.add_argument("--names", default=None,
                    help="targets separated by semicolons (default: all up to --max-class)")
    ap.add_argument("--every", type=int, default=1)
    ap.add_argument("--seconds", type=float, default=60.0)
    ap.add_argument("--max-class", type=int, default=420)
    ap.add_argument("--proofs", default=None,
                    help="folder to write a rank proof file for every knot reaching 4")
    args = ap.parse_args(argv)
    if args.set == "low":
        return _low(args)
    if args.set == "open12":
        rows = [k for k in knots(12) if k.bridge_index == 4]
    else:
        rows = _thirteen()[:: args.every]
    t_build = time.process_time()
    names = [n for n in M.target_names() if M._size_hint(n) <= args.max_class]
    t_build = time.process_time() - t_build
    print(f"{len(names)} targets (class ≤ {args.max_class}), built in {t_build:.1f} s CPU")
    print(f"{'knot':12} {'plat b':>6} {'other':>5} {'mr ≥':>5} {'target':34} {'|image|':>7} "
          f"{'s':>7} {'tried':>5} {'cut':>4}")
    reached, total, contra, times = 0, 0, 0, []
    for k in rows:
        plat = ClosedBraid.from_word(k.braid).to_plat()
        old = _old_bound(plat)
        if args.set == "open12" and old >= 4:
            continue
        total += 1
        t0 = time.monotonic()
        res = M.meridional_rank_bound(plat, 4, deadline=t0 + args.seconds, names=names,
                                      stop_at=4)
        dt = time.monotonic() - t0
        times.append(dt)
        w = res.witness
        reached += res.value >= 4
        if args.proofs and w is not None and res.value >= 4:
            from plait.atomic import write_json_atomic

            os.makedirs(args.proofs, exist_ok=True)
            note = (f"{k.name} from KnotInfo's braid notation; KnotInfo bridge_index "
                    f"{k.bridge_index}")
            write_json_atomic(os.path.join(args.proofs, f"{k.name}.json"),
                              M.rank_proof(plat, w, note))
        contra += res.value > k.bridge_index
        print(f"{k.name:12} {plat.bridges:>6} {old:>5} {res.value:>5} "
              f"{(w.target if w else '-'):34} {(w.image_size if w else 0):>7} {dt:>7.1f} "
              f"{len(res.tried):>5} {len(res.skipped):>4}", flush=True)
    med = statistics.median(times) if times else 0.0
    print(f"{args.set}: b ≥ 4 proved for {reached} of {total}; contradictions {contra}; "
          f"median {med:.1f} s per knot; {time.strftime('%Y-%m-%d')}")
    return 0


if __name__ == "__main__":
    sys.exit(main())
