"""Connected sums of table knots: does ``plait bridge`` find the factors and certify the sum?

Cases are built from seeded random choices of KnotInfo knots up to ``--max-crossings``
crossings with a known bridge index (source: KnotInfo via database-knotinfo). The bridge
number of a sum of ``k`` knots is ``b1 + ... + bk - (k - 1)`` (Schubert 1954). Families:

* ``2 factors, PD`` / ``3 factors, PD``: KnotInfo's PD codes joined by
  :func:`plait.diagrams.composite.pd_connected_sum`;
* ``2 factors, plat``: the factors' braid notations as plats joined by
  :func:`plait.diagrams.composite.connected_sum`;
* ``2 factors, scrambled plat``: that plat hidden by :func:`plait.moves.scramble`
  (length x3, one stabilization); the circle must be found in a diagram the search
  visits.

One row per family: cases, upper = b %, factors found %, certified %, certified among
the cases whose factors were all certified, cases where Schubert's sum raised the
knot's own lower bound, contradictions (lower > b or upper < b), median seconds.

Usage::

    nice -n 10 .venv/bin/python bench/composite.py                 # 12 cases per family
    nice -n 10 .venv/bin/python bench/composite.py --cases 4 --steps 0
"""

from __future__ import annotations

import argparse
import random
import statistics
import sys
import tempfile
import time
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parent.parent / "tests"))

# family key -> row label
FAMILIES = {"pd2": "2 factors, PD", "pd3": "3 factors, PD", "plat2": "2 factors, plat",
            "scrambled2": "2 factors, scrambled plat"}


def _case(family: str, rows: list, rng: random.Random):
    import plait.moves as moves
    from plait.diagrams.composite import connected_sum, pd_connected_sum
    from plait.diagrams.pd import validate_pd
    from plait.word import ClosedBraid

    k = 3 if family.endswith("3") else 2
    picks = [rng.choice(rows) for _ in range(k)]
    b = sum(r.bridge_index for r in picks) - (k - 1)  # Schubert 1954
    if family.startswith("pd"):
        pd = validate_pd(picks[0].pd)
        for r in picks[1:]:
            pd = pd_connected_sum(pd, validate_pd(r.pd))
        pres = pd
    else:
        pres = connected_sum([ClosedBraid.from_word(r.braid).to_plat() for r in picks])
        if family.startswith("scrambled"):
            pres, _ = moves.scramble(pres, seed=rng.randrange(10**6), length_factor=3,
                                     stabilizations=1)
    return [r.name for r in picks], b, pres


def main(argv: list[str] | None = None) -> int:
    from kidata import knots

    from plait.bridge import bridge_report

    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--cases", type=int, default=12, help="cases per family (default 12)")
    ap.add_argument("--max-crossings", type=int, default=8)
    ap.add_argument("--steps", type=int, default=200, help="search steps per run")
    ap.add_argument("--seed", type=int, default=1)
    ap.add_argument("--families", default=",".join(FAMILIES),
                    help=f"comma-separated keys from {', '.join(FAMILIES)}")
    ap.add_argument("--verbose", action="store_true")
    a = ap.parse_args(argv)
    rows = [r for r in knots(a.max_crossings) if r.bridge_index is not None]
    rng = random.Random(a.seed)
    print(f"# connected sums of KnotInfo knots with 3..{a.max_crossings} crossings, "
          f"{a.cases} per family, --steps {a.steps}, seed {a.seed}")
    print(f"{'family':28} {'cases':>5} {'upper=b':>8} {'factors':>8} {'certified':>9} "
          f"{'cert|fac':>9} {'Schubert':>8} {'contra':>6} {'median s':>8}")
    with tempfile.TemporaryDirectory() as tmp:
        for fam in a.families.split(","):
            if fam not in FAMILIES:
                ap.error(f"unknown family {fam!r}")
            n = up = found = cert = fcert = fcert_ok = raised = contra = 0
            secs = []
            for i in range(a.cases):
                names, b, pres = _case(fam, rows, rng)
                t0 = time.monotonic()
                rep = bridge_report(pres, steps=a.steps, seed=a.seed, quiet=True,
                                    handle_signals=False, wirtinger_time=5.0,
                                    run_dir=Path(tmp) / f"{fam}-{i}")
                secs.append(time.monotonic() - t0)
                n += 1
                up += rep.upper == b
                k = len(names)
                found += len(rep.factors) == k
                cert += rep.certified
                if rep.factors and all(f.certified for f in rep.factors):
                    fcert += 1
                    fcert_ok += rep.certified
                own = rep.search.get("bridge_bounds", {}).get("lower", rep.lower)
                raised += rep.lower > own
                contra += rep.lower > b or rep.upper < b
                if a.verbose:
                    print(f"  {' # '.join(names):24} b={b} lower={rep.lower} (own {own}) "
                          f"upper={rep.upper} factors={len(rep.factors)} "
                          f"{secs[-1]:.1f}s", flush=True)

            def pct(x: int, d: int) -> str:
                return f"{100 * x / d:.0f}%" if d else "-"

            print(f"{FAMILIES[fam]:28} {n:>5} {pct(up, n):>8} {pct(found, n):>8} {pct(cert, n):>9} "
                  f"{pct(fcert_ok, fcert) + f' /{fcert}':>9} {raised:>8} {contra:>6} "
                  f"{statistics.median(secs):>8.1f}", flush=True)
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
