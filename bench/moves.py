"""Benchmark of the move graph: neighbour evaluations and canonicalizations per second."""

from __future__ import annotations

import argparse
import random
import time

from plait.moves import canonical, neighbor_deltas, neighbors
from plait.word import PlatWord


def random_plat(n: int, length: int, rng: random.Random) -> PlatWord:
    s = 2 * n
    return PlatWord(s, tuple(rng.choice((1, -1)) * rng.randrange(1, s) for _ in range(length)))


def rate(fn, plats, min_time: float) -> tuple[float, float]:
    """(items per second, calls per second) of ``fn`` over the plats, for >= min_time s."""
    items = calls = 0
    t0 = time.perf_counter()
    while True:
        for p in plats:
            items += fn(p)
            calls += 1
        dt = time.perf_counter() - t0
        if dt >= min_time:
            return items / dt, calls / dt


def count_deltas(p: PlatWord) -> int:
    k = 0
    for _ in neighbor_deltas(p):
        k += 1
    return k


def count_neighbors(p: PlatWord) -> int:
    k = 0
    for _ in neighbors(p):
        k += 1
    return k


def canon(p: PlatWord) -> int:
    canonical(p)
    return 1


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__)
    ap.add_argument("--bridges", default="2,3,4,5,6,7,8")
    ap.add_argument("--lengths", default="50,100,200,500")
    ap.add_argument("--time", type=float, default=0.3, help="seconds per cell")
    ap.add_argument("--seed", type=int, default=1)
    args = ap.parse_args()
    rng = random.Random(args.seed)
    print("random plats, default move kinds (all but insert/stab/reduce); one core")
    print(f"{'n':>2} {'length':>6} {'moves/word':>10} {'deltas/s':>10} {'neighbors/s':>11} "
          f"{'canon/s':>8}")
    for n in map(int, args.bridges.split(",")):
        for L in map(int, args.lengths.split(",")):
            plats = [random_plat(n, L, rng) for _ in range(8)]
            per = sum(count_deltas(p) for p in plats) / len(plats)
            d, _ = rate(count_deltas, plats, args.time)
            nb, _ = rate(count_neighbors, plats, args.time)
            c, _ = rate(canon, plats, args.time)
            print(f"{n:>2} {L:>6} {per:>10.0f} {d:>10,.0f} {nb:>11,.0f} {c:>8,.0f}", flush=True)


if __name__ == "__main__":
    main()
