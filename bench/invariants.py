"""Times of the Jones and Alexander polynomials of random plats, and the ratio to the state sum.

Usage::

    .venv/bin/python bench/invariants.py [--bridges 2-8] [--lengths 50,100,200,500,1000]
                                         [--crossings 12,14,16,18,20] [--seed 1]

Prints two tables in one run. The first gives, for each number of bridges ``n`` and word
length, the seconds taken by :func:`plait.scoring.jones` (Temperley-Lieb state vector)
and :func:`plait.scoring.alexander` (bridge-presentation matrix and its minor) on one
seeded random plat (letters uniform among the ``+-k``). The second compares the Jones
polynomial with the ``2^c`` Kauffman state sum (:func:`plait.scoring.jones.jones_state_sum`)
on random 3-bridge plats of ``c`` crossings, checks that they agree, and prints the ratio.
Targets (issue 3): n = 6, length 500: Jones < 1 s, Alexander < 0.2 s; at least 1000 times
faster than the state sum at 20 crossings. Times are CPU seconds of this process
(``time.process_time``), so other load on the machine matters less.
"""

from __future__ import annotations

import argparse
import random
import sys
import time

from plait.scoring import alexander, jones
from plait.scoring.jones import _space, jones_state_sum
from plait.word import PlatWord


def random_plat(n: int, length: int, rnd: random.Random) -> PlatWord:
    """A plat on ``2n`` strands with ``length`` letters uniform among ``+-1 .. +-(2n-1)``."""
    return PlatWord(2 * n, tuple(rnd.choice((1, -1)) * rnd.randint(1, 2 * n - 1)
                                 for _ in range(length)))


def _timed(f, *args):
    t0 = time.process_time()
    out = f(*args)
    return out, time.process_time() - t0


def _range(text: str) -> list[int]:
    if "-" in text:
        a, b = text.split("-")
        return list(range(int(a), int(b) + 1))
    return [int(x) for x in text.split(",")]


def main(argv: list[str] | None = None) -> int:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--bridges", default="2-8")
    ap.add_argument("--lengths", default="50,100,200,500,1000")
    ap.add_argument("--crossings", default="12,14,16,18,20")
    ap.add_argument("--seed", type=int, default=1)
    args = ap.parse_args(argv)
    bridges, lengths, crossings = (_range(args.bridges), _range(args.lengths),
                                   _range(args.crossings))

    print(f"Jones / Alexander CPU seconds on one random plat per cell (seed {args.seed})")
    head = "  ".join(f"{'L=' + str(L):>17}" for L in lengths)
    print(f"{'bridges':>7}  {head}")
    for n in bridges:
        _space(n)  # the state space is built once per n and cached; not timed
        jones(random_plat(n, 5, random.Random(0)))  # warm-up
        cells = []
        for L in lengths:
            rnd = random.Random(args.seed * 1_000_003 + 1000 * n + L)
            p = random_plat(n, L, rnd)
            _, tj = _timed(jones, p)
            _, ta = _timed(alexander, p)
            cells.append(f"{tj:8.4f}/{ta:8.4f}")
        print(f"{n:>7}  " + "  ".join(f"{c:>17}" for c in cells), flush=True)

    print()
    print("Jones: Temperley-Lieb state vector vs 2^c state sum, 3-bridge random plats")
    print(f"{'crossings':>9}  {'state sum s':>11}  {'TL s':>9}  {'ratio':>9}  agree")
    for c in crossings:
        rnd = random.Random(args.seed * 7919 + c)
        p = random_plat(3, c, rnd)
        fast, tf = _timed(jones, p)
        reps = 1
        while tf < 0.05 and reps < 10_000:  # repeat short runs for a stable time
            reps *= 10
            t0 = time.process_time()
            for _ in range(reps):
                jones(p)
            tf = (time.process_time() - t0) / reps
        slow, ts = _timed(jones_state_sum, p)
        print(f"{c:>9}  {ts:>11.3f}  {tf:>9.5f}  {ts / tf:>9.0f}  {fast == slow}", flush=True)
        if fast != slow:
            return 1
    return 0


if __name__ == "__main__":
    sys.exit(main())
