"""The bridge report beyond the tables: families whose bridge number a theorem gives.

Usage::

    .venv/bin/python bench/beyond.py [--cases 6] [--time 5] [--budget 5] [--seed 0]
                                     [--families torus,sum2,...] [--table13 [--limit N]]
                                     [--family-cases twisted5=2,...] [--speed N] [--verbose]

One row per family, each case run through the real :func:`plait.bridge.bridge_report`
(search ``--time`` seconds, lower bounds within ``--budget`` seconds each time they are
computed). The cases are drawn from ``--seed``:

* ``torus``: ``T(p, q)`` as the closure of the ``q``-braid ``(sigma_1 .. sigma_{q-1})^p``,
  ``2 <= p < q``, coprime; ``b = p`` (Schubert 1954).
* ``sum2``, ``sum3``: connected sums of two or three KnotInfo knots (3 to 9 crossings,
  known bridge index) as one closed braid; ``b = b_1 + ... + b_k - (k - 1)``
  (Schubert 1954). Source of the factors: KnotInfo via database-knotinfo.
* ``2bridge``: Schubert's 4-plat of ``S(p, q)`` for a random odd ``p`` from 1001 to 19999,
  scrambled by random moves (stabilizations included); ``b = 2`` (Schubert 1956).
* ``twisted3``, ``twisted4``, ``twisted5``: highly twisted ``2m``-plats (every twist
  region ``|exponent| >= 3``, ``4m(m-2) + 1`` rows); ``b = m`` (Johnson–Moriah, Algebr.
  Geom. Topol. 16 (2016)).

Columns: cases; ``upper = b %`` (the report's plat has ``b`` bridges); ``certified %``
(lower = upper = ``b``); contradictions (lower > ``b`` or upper < ``b``: must be 0);
median wall seconds per case. ``--table13`` runs the 13-crossing KnotInfo knots of bridge
index 4 from their PD codes (``--limit`` of them, evenly spaced through the table; all 468
by default) and prints the same row. ``--speed N`` adds a table of CPU seconds of the
lower bounds alone on 4-bridge plats of about 500 letters, without a budget and with
``--budget``.
"""

from __future__ import annotations

import argparse
import datetime
import os
import random
import statistics
import sys
import tempfile
import time
from collections.abc import Callable, Iterator
from math import gcd

sys.path.insert(0, os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "tests"))

from kidata import knots  # noqa: E402

from plait.bridge import bridge_report  # noqa: E402
from plait.diagrams.pd import validate_pd  # noqa: E402
from plait.search.families import (  # noqa: E402
    connected_sum_braid,
    scrambled_two_bridge,
    torus_braid,
    twisted_plat,
)
from plait.word import ClosedBraid  # noqa: E402

FAMILIES = ("torus", "sum2", "sum3", "2bridge", "twisted3", "twisted4", "twisted5")

# one case: (label, presentation, bridge number by the theorem)
Case = tuple[str, object, int]


def _table_factors() -> list:
    # source: KnotInfo via database-knotinfo (braid notation and bridge index)
    return [r for r in knots(9, 3) if r.bridge_index in (2, 3) and r.braid]


def torus_cases(rng: random.Random, n: int) -> Iterator[Case]:
    pairs = [(p, q) for p in range(2, 5) for q in range(p + 1, p + 4) if gcd(p, q) == 1]
    for _ in range(n):
        p, q = rng.choice(pairs)
        yield f"T({p},{q})", torus_braid(p, q), p  # Schubert 1954


def sum_cases(k: int) -> Callable[[random.Random, int], Iterator[Case]]:
    def gen(rng: random.Random, n: int) -> Iterator[Case]:
        table = _table_factors()
        for _ in range(n):
            rows = [rng.choice(table) for _ in range(k)]
            braid = connected_sum_braid([ClosedBraid.from_word(r.braid) for r in rows])
            b = sum(r.bridge_index for r in rows) - (k - 1)  # Schubert 1954
            yield "#".join(r.name for r in rows), braid, b
    return gen


def two_bridge_cases(rng: random.Random, n: int) -> Iterator[Case]:
    for _ in range(n):
        p = rng.randrange(1001, 20_000, 2)
        q = rng.randrange(1, p)
        while gcd(p, q) != 1:
            q = rng.randrange(1, p)
        seed = rng.randrange(1 << 30)
        yield f"S({p},{q})", scrambled_two_bridge(p, q, seed), 2  # Schubert 1956


def twisted_cases(m: int) -> Callable[[random.Random, int], Iterator[Case]]:
    def gen(rng: random.Random, n: int) -> Iterator[Case]:
        for i in range(n):
            plat = twisted_plat(m, rng)
            yield f"twisted{m}#{i}", plat, m  # Johnson–Moriah 2016
    return gen


GENERATORS: dict[str, Callable[[random.Random, int], Iterator[Case]]] = {
    "torus": torus_cases, "sum2": sum_cases(2), "sum3": sum_cases(3),
    "2bridge": two_bridge_cases, "twisted3": twisted_cases(3),
    "twisted4": twisted_cases(4), "twisted5": twisted_cases(5),
}


def table13_cases(limit: int | None) -> Iterator[Case]:
    # source: KnotInfo via database-knotinfo (PD code, bridge index 4)
    rows = [r for r in knots(13, 13) if r.bridge_index == 4 and r.pd]
    if limit is not None and limit < len(rows):
        rows = rows[::len(rows) // limit][:limit]  # evenly spaced through the table
    for r in rows:
        yield r.name, validate_pd(r.pd), 4


def run_case(pres: object, b: int, args: argparse.Namespace,
             root: str) -> tuple[bool, bool, bool, float, str]:
    """(upper = b, certified at b, contradiction, wall seconds, note)."""
    t0 = time.monotonic()
    rep = bridge_report(pres, time=args.time, seed=args.seed, quiet=True,
                        handle_signals=False, runs_root=root, budget=args.budget,
                        wirtinger_time=args.time)
    dt = time.monotonic() - t0
    contradiction = rep.lower > b or rep.upper < b
    note = f"{rep.lower}..{rep.upper}"
    return rep.upper == b, rep.certified and rep.upper == b, contradiction, dt, note


def row(name: str, cases: Iterator[Case], args: argparse.Namespace, root: str) -> str:
    ups = certs = bad = 0
    times: list[float] = []
    notes: list[str] = []
    for label, pres, b in cases:
        up, cert, contra, dt, note = run_case(pres, b, args, root)
        ups += up
        certs += cert
        bad += contra
        times.append(dt)
        if args.verbose:
            print(f"  {name} {label}: b={b} report {note} {dt:.1f}s", flush=True)
        if contra:
            notes.append(f"{label}: b={b}, report {note}")
    n = len(times)
    line = (f"{name:<10} {n:>5} {100 * ups / n if n else 0:>10.1f} "
            f"{100 * certs / n if n else 0:>11.1f} {bad:>14} "
            f"{statistics.median(times) if times else 0:>8.2f}")
    for s in notes:
        line += f"\n    contradiction {s}"
    return line


def _clear_caches() -> None:
    """Empty the memo caches of the invariant modules, so each timing starts cold."""
    import importlib
    import pkgutil

    import plait.scoring as pkg

    for info in pkgutil.iter_modules(pkg.__path__):
        mod = importlib.import_module(f"plait.scoring.{info.name}")
        for obj in vars(mod).values():
            if callable(getattr(obj, "cache_clear", None)):
                obj.cache_clear()


def speed_table(n: int, budget: float, seed: int) -> None:
    """CPU seconds of :func:`plait.scoring.bounds.bridge_lower_bound` on 4-bridge plats of
    about 500 letters, without a budget and with ``budget`` (issue: within 5 s)."""
    from plait.scoring.bounds import bridge_lower_bound
    from plait.search.randomplat import random_plat

    kinds = {
        "random 4-bridge knot, 500 letters":
            lambda r: random_plat(4, 500, r, knot=True),
        "twisted 8-plat, 41 rows (~500 letters)":
            lambda r: twisted_plat(4, r, rows=41),
    }
    head = (f"{'plats':<40} {'n':>3} {'letters':>7} {'no budget: median s':>20} "
            f"{'max s':>6} {f'budget {budget:g} s: median s':>24} {'max s':>6} "
            f"{'not tried':>9} {'same bound':>10}")
    print(head)
    print("-" * len(head))
    for name, make in kinds.items():
        rng = random.Random(f"{seed}:speed:{name}")
        free, capped, lengths = [], [], []
        skipped = same = 0
        for _ in range(n):
            plat = make(rng)
            lengths.append(plat.length)
            _clear_caches()
            t0 = time.process_time()
            a = bridge_lower_bound(plat)
            free.append(time.process_time() - t0)
            _clear_caches()
            t0 = time.process_time()
            b = bridge_lower_bound(plat, budget)
            capped.append(time.process_time() - t0)
            skipped += any(r.startswith("not tried:") for r in b.reasons)
            same += a.value == b.value
        print(f"{name:<40} {n:>3} {statistics.median(lengths):>7.0f} "
              f"{statistics.median(free):>20.2f} {max(free):>6.2f} "
              f"{statistics.median(capped):>24.2f} {max(capped):>6.2f} {skipped:>9} {same:>10}",
              flush=True)


def main(argv: list[str] | None = None) -> int:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--cases", type=int, default=6, help="cases per family (default 6)")
    ap.add_argument("--time", type=float, default=5.0, help="search seconds per case")
    ap.add_argument("--budget", type=float, default=5.0,
                    help="seconds for each computation of the lower bounds")
    ap.add_argument("--seed", type=int, default=0)
    ap.add_argument("--family-cases", default="", metavar="F=N,...",
                    help="cases for single families, e.g. twisted5=2 (overrides --cases)")
    ap.add_argument("--families", default=",".join(FAMILIES),
                    help=f"comma-separated subset of {','.join(FAMILIES)}")
    ap.add_argument("--table13", action="store_true",
                    help="also run the 13-crossing KnotInfo knots of bridge index 4")
    ap.add_argument("--limit", type=int, default=None,
                    help="with --table13: only the first N of the 468 knots")
    ap.add_argument("--verbose", action="store_true", help="one line per case")
    ap.add_argument("--speed", type=int, default=0, metavar="N",
                    help="also time the lower bounds alone on N 4-bridge plats of about 500 "
                         "letters of each kind (CPU s, without and with --budget)")
    args = ap.parse_args(argv)
    fams = [f for f in args.families.split(",") if f]
    bad = [f for f in fams if f not in GENERATORS]
    if bad:
        ap.error(f"unknown family {bad[0]!r}")
    counts = dict.fromkeys(fams, args.cases)
    for item in filter(None, args.family_cases.split(",")):
        name, _, n = item.partition("=")
        if name not in GENERATORS or not n.isdigit():
            ap.error(f"--family-cases: expected FAMILY=N, got {item!r}")
        counts[name] = int(n)

    print("command: " + " ".join([os.path.basename(sys.executable), "bench/beyond.py"]
                                 + sys.argv[1:]))
    print(f"date:    {datetime.datetime.now(datetime.timezone.utc):%Y-%m-%d %H:%M} UTC")
    head = (f"{'family':<10} {'cases':>5} {'upper = b %':>10} {'certified %':>11} "
            f"{'contradictions':>14} {'median s':>8}")
    print(head)
    print("-" * len(head))
    with tempfile.TemporaryDirectory() as root:
        for f in fams:
            rng = random.Random(f"{args.seed}:{f}")
            print(row(f, GENERATORS[f](rng, counts[f]), args, root), flush=True)
        if args.table13:
            print(row("table13", table13_cases(args.limit), args, root), flush=True)
    if args.speed:
        print()
        speed_table(args.speed, args.budget, args.seed)
    return 0


if __name__ == "__main__":
    sys.exit(main())
