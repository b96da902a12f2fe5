"""Proofs of b ≥ 4 for KnotInfo's open 13-crossing entries (bridge index listed as [3,4]).

Usage::

    nice -n 10 .venv/bin/python bench/open13_rank.py [--shard I/N] [--seconds 20] [--only A,B]
        [--out bench/results/open13-rank-proofs]

For every 13-crossing knot whose KnotInfo bridge_index is the range [3,4] (source: KnotInfo
via database-knotinfo; every ``N``-th one from the ``I``-th with ``--shard``), search the
plat of the table's braid notation with
:func:`plait.scoring.meridional.meridional_rank_bound` (want = 4) over the targets of
:data:`PRIORITY` for ``--seconds``; when that fails (or with ``--route pd``), the plat
built from the table's PD code (as many bridges as that diagram's Wirtinger number,
:func:`plait.diagrams.fromdiagram.pd_to_plat`) gets the same budget. Each proof found is written to
``OUT/NAME.json`` (format plait-rank-proof/1) and re-checked at once by the independent
checker :func:`plait.scoring.rankproof.check_rank_proof`. Knots with a proof file already
in ``OUT`` are skipped, so the script resumes. One row per knot, then a summary line.
"""

from __future__ import annotations

import argparse
import json
import os
import sys
import time

from plait.atomic import write_json_atomic
from plait.scoring import meridional as M
from plait.scoring.quandles import LONG_TARGETS
from plait.scoring.rankproof import check_rank_proof
from plait.word import ClosedBraid

#: Targets tried, most productive first (measured on the first knots of the list).
PRIORITY = LONG_TARGETS  # plait.scoring.quandles: most productive first


def open_entries() -> list[tuple[str, list[int], list]]:
    """(name, braid, PD code) of the 13-crossing knots with bridge_index [3,4]."""
    from database_knotinfo import link_list

    out = []
    for k in link_list():
        if str(k.get("crossing_number")) != "13" or str(k.get("bridge_index")) != "[3,4]":
            continue
        braid = json.loads(k["braid_notation"].replace("{", "[").replace("}", "]"))
        if braid and isinstance(braid[0], list):
            braid = braid[0]
        pd = json.loads(k["pd_notation"].replace("{", "[").replace("}", "]"))
        out.append((k["name"], braid, pd))
    return out


def main(argv: list[str] | None = None) -> int:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--shard", default="0/1")
    ap.add_argument("--seconds", type=float, default=20.0)
    ap.add_argument("--route", choices=("braid", "pd", "both"), default="both",
                    help="plats tried: the braid notation's, the PD code's, or both in turn")
    ap.add_argument("--out", default=os.path.join("bench", "results", "open13-rank-proofs"))
    ap.add_argument("--only", default="", help="comma-separated knot names (default: all)")
    args = ap.parse_args(argv)
    i, n = (int(x) for x in args.shard.split("/"))
    rows = open_entries()
    if args.only:
        only = set(args.only.split(","))
        rows = [r for r in rows if r[0] in only]
    print(f"{len(rows)} open entries; shard {i}/{n}", flush=True)
    os.makedirs(args.out, exist_ok=True)
    found = done = 0
    t_all = time.monotonic()
    for name, braid, pd in rows[i::n]:
        path = os.path.join(args.out, f"{name}.json")
        if os.path.exists(path):
            continue
        done += 1
        t0 = time.monotonic()
        route = "braid"
        plat = ClosedBraid.from_word(braid).to_plat()
        res = M.RankResult(0, None, (), ())
        if args.route != "pd":
            res = M.meridional_rank_bound(plat, 4, deadline=time.monotonic() + args.seconds,
                                          names=PRIORITY, stop_at=4)
        if res.value < 4 and args.route != "braid":
            from plait.diagrams.fromdiagram import pd_to_plat
            from plait.diagrams.pd import validate_pd

            route = "pd"
            plat = pd_to_plat(validate_pd(pd), time_limit=3.0)
            res = M.meridional_rank_bound(plat, 4, deadline=time.monotonic() + args.seconds,
                                          names=PRIORITY, stop_at=4)
        ok = ""
        if res.value >= 4:
            src = "braid notation" if route == "braid" else "PD code (Wirtinger-number plat)"
            proof = M.rank_proof(plat, res.witness,
                                 f"{name}: plat from KnotInfo's {src}; KnotInfo bridge_index "
                                 "[3,4]")
            check = check_rank_proof(proof)
            ok = "checked" if check.ok and check.bound >= 4 else "CHECK FAILED"
            if check.ok and check.bound >= 4:
                write_json_atomic(path, proof)
                found += 1
        w = res.witness
        print(f"{name:10} {route:5} {plat.bridges:>2} {plat.length:>4} {res.value:>2} "
              f"{(w.target if w else '-'):28} {time.monotonic() - t0:6.1f} {ok}", flush=True)
    print(f"shard {i}/{n}: b ≥ 4 proved for {found} of {done} tried; "
          f"{time.monotonic() - t_all:.0f} s; {time.strftime('%Y-%m-%d')}")
    return 0


if __name__ == "__main__":
    sys.exit(main())
