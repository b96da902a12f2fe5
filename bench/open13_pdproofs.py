"""Carry each stored open-13 rank proof over to KnotInfo's own PD diagram.

Usage::

    nice -n 10 .venv/bin/python bench/open13_pdproofs.py [--dir bench/results/open13-rank-proofs]
        [--redo]

A proof file of ``bench/open13_rank.py`` gives a homomorphism of the knot group on a plat
whose link to KnotInfo's knot is only its Jones polynomial. This script finds a
homomorphism on the Wirtinger presentation of KnotInfo's ``pd_notation`` (source: KnotInfo
via database-knotinfo) whose arc images lie in the proof's image class Q' (or in its
inverses, when the plat has the other orientation), adds it to the file as ``pd`` /
``pd_arcs`` / ``pd_convention``, and re-checks the file with the independent checker
:func:`plait.scoring.rankproof.check_rank_proof`, which then checks the PD homomorphism
and the rank argument on its image class.

Search: Q' is one orbit of the image group G' (all meridians are conjugate), so the
homomorphism may be conjugated until the first Wirtinger seed arc of the diagram maps to
Q'[0]; the other seeds run over Q', the coloring sequence gives every other arc by
conjugation, and the crossings outside the sequence are checked. Conjugation is a table
lookup on the indices of Q' (Q' is closed under conjugation by its own elements). The
first labelling whose file passes the checker is kept. One row per knot, then a summary.
"""

from __future__ import annotations

import argparse
import itertools
import json
import os
import sys
import time

sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))

from open13_rank import open_entries  # noqa: E402

from plait.atomic import write_json_atomic  # noqa: E402
from plait.diagrams.pd import validate_pd  # noqa: E402
from plait.diagrams.wirtinger import wirtinger  # noqa: E402
from plait.scoring.rankproof import (  # noqa: E402
    _check_plat,
    _image_class,
    check_rank_proof,
    pd_arcs,
)


def _as_json(x: tuple) -> list:
    return [list(r) for r in x] if x and isinstance(x[0], tuple) else list(x)


def pd_labelling(obj: dict, pd: list[list[int]]) -> dict | None:
    """Fields ``pd``, ``pd_arcs``, ``pd_convention`` making ``obj`` a proof on ``pd``,
    or None when no labelling in the image class (or its inverses) passes the checker."""
    G, caps, _n = _check_plat(obj, None)
    q, _index = _image_class(G, caps, 0)
    arcs, crossings = pd_arcs(pd)
    w = wirtinger(validate_pd(pd), method="exhaustive")
    # map the Wirtinger module's arcs to the checker's arc order (by edge label)
    arc_of = {x: i for i, a in enumerate(arcs) for x in a}
    seeds = [arc_of[w.arcs.arcs[a][0]] for a in w.seeds]
    steps = [(s.crossing, arc_of[w.arcs.arcs[s.arc][0]]) for s in w.steps]
    used = {c for c, _a in steps}
    rest = [c for c in range(len(crossings)) if c not in used]
    for inverted in (False, True):
        elems = [G.inv(a) for a in q] if inverted else list(q)
        idx = {a: i for i, a in enumerate(elems)}
        m = len(elems)
        # fwd[a][b] = index of a b a^-1, bwd[a][b] = index of a^-1 b a
        inv = [G.inv(a) for a in elems]
        pairs = list(zip(elems, inv, strict=True))
        fwd = [[idx[G.mul(G.mul(a, b), ai)] for b in elems] for a, ai in pairs]
        bwd = [[idx[G.mul(G.mul(ai, b), a)] for b in elems] for a, ai in pairs]
        for conv in (1, -1):
            for tail in itertools.product(range(m), repeat=len(seeds) - 1):
                lab = [-1] * len(arcs)
                lab[seeds[0]] = 0
                for s, v in zip(seeds[1:], tail, strict=True):
                    lab[s] = v
                for c, new in steps:
                    o, i, k, sign = crossings[c]
                    e = sign * conv
                    if new == k:
                        lab[k] = (fwd if e > 0 else bwd)[lab[o]][lab[i]]
                    else:
                        lab[i] = (bwd if e > 0 else fwd)[lab[o]][lab[k]]
                if any((fwd if crossings[c][3] * conv > 0 else bwd)
                       [lab[crossings[c][0]]][lab[crossings[c][1]]] != lab[crossings[c][2]]
                       for c in rest):
                    continue
                fields = {"pd": pd, "pd_arcs": [_as_json(elems[v]) for v in lab],
                          "pd_convention": conv}
                if check_rank_proof({**obj, **fields}).ok:
                    return fields
    return None


def main(argv: list[str] | None = None) -> int:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--dir", default=os.path.join("bench", "results", "open13-rank-proofs"))
    ap.add_argument("--redo", action="store_true", help="recompute files that have a pd")
    args = ap.parse_args(argv)
    pds = {name: pd for name, _braid, pd in open_entries()}
    names = sorted(f[:-5] for f in os.listdir(args.dir) if f.endswith(".json"))
    print(f"{len(names)} proof files in {args.dir}", flush=True)
    found = missing = 0
    t_all = time.monotonic()
    for name in names:
        path = os.path.join(args.dir, f"{name}.json")
        with open(path, encoding="utf-8") as fh:
            obj = json.load(fh)
        if "pd" in obj and not args.redo:
            found += 1
            continue
        obj = {k: v for k, v in obj.items() if k not in ("pd", "pd_arcs", "pd_convention")}
        t0 = time.monotonic()
        fields = pd_labelling(obj, pds[name])
        status = "none found"
        if fields is not None:
            obj.update(fields)
            extra = "; the homomorphism is also given on KnotInfo's PD code (pd_arcs)"
            if extra not in obj.get("note", ""):
                obj["note"] = obj.get("note", "") + extra
            check = check_rank_proof(obj)
            status = "checked" if check.ok and check.bound >= 4 else "CHECK FAILED"
            if check.ok:
                write_json_atomic(path, obj)
                found += 1
        if status != "checked":
            missing += 1
        conv = fields["pd_convention"] if fields else 0
        print(f"{name:10} {obj['class']['target']:28} conv {conv:+d} "
              f"{time.monotonic() - t0:6.1f} s {status}", flush=True)
    print(f"PD-level proofs: {found} of {len(names)}; {missing} without; "
          f"{time.monotonic() - t_all:.0f} s; {time.strftime('%Y-%m-%d')}")
    return 0


if __name__ == "__main__":
    sys.exit(main())
