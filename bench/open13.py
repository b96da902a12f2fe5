"""The open 13-crossing entries: tally hunt batch rows, and run the index-4 control set.

Usage:
    python bench/open13.py tally bench/results/open13-*/results.jsonl \
        [--proofs bench/results/open13-rank-proofs]
    python bench/open13.py trim runs/open13-s0of5/results.jsonl \
        bench/results/open13-s0of5/results.jsonl
    python bench/open13.py control --count 20 --seconds 10 [--out FILE]
    python bench/open13.py settled [bench/results/open13-rank-proofs]

``tally`` prints, over the rows of ``plait batch --bridge --hunt`` runs, how many
entries were settled up (a 3-bridge plat), settled down (a lower bound of 4), are
still open, and the time spent. ``control`` runs the same hunt on KnotInfo's knots of
13 crossings whose bridge index the table gives as 4: a diagram with Wirtinger number
3 there would contradict the table, so the expected count is zero. ``settled``
re-checks every rank proof file and prints the Markdown table of docs/open13.md.
"""

from __future__ import annotations

import argparse
import json
import sys
import time
from collections import Counter
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parents[1]))


def _hunt_seconds(h: dict) -> float:
    # the hunt's own seconds: its lower side (wall) then the diagram hunt
    return h.get("lower_seconds", 0) + h.get("elapsed", 0)


def tally(paths: list[str], proofs: str | None = None) -> dict:
    """Counts over batch rows (a later file's row replaces an earlier one of the same
    knot); with ``proofs``, the knots settled down also by a rank proof file there."""
    import statistics

    by_id: dict = {}
    for p in paths:
        with open(p, encoding="utf-8") as fh:
            for line in fh:
                if line.strip():
                    r = json.loads(line)
                    by_id[r["id"]] = r
    rows = list(by_id.values())
    ok = [r for r in rows if not r.get("error")]
    up = [r["id"] for r in ok if r["bridge_bounds"]["upper"] <= 3]
    down = [r["id"] for r in ok if r["bridge_bounds"]["lower"] >= 4]
    errors = [r["id"] for r in rows if r.get("error")]
    hunts = [r.get("hunt") or {} for r in ok]
    hunted = [h for h in hunts if h.get("evaluated")]
    files = set()
    if proofs:
        files = {q.stem for q in Path(proofs).glob("*.json")}
    settled_down = sorted(set(down) | files)
    el = [r.get("elapsed", 0) for r in rows]
    open_ids = [r["id"] for r in ok if r["id"] not in set(up) | set(settled_down)]
    return {
        "rows": len(rows),
        "settled_up": up,
        "settled_down_batch": down,
        "settled_down_files": len(files),
        "settled_down": settled_down,
        "open": len(open_ids),
        "open_hunted_30s": sum(1 for r in ok if r["id"] in set(open_ids)
                               and _hunt_seconds(r.get("hunt") or {}) >= 29.5),
        "errors": errors,
        "seconds": round(sum(el), 1),
        "per_knot": {"min": min(el, default=0), "median": statistics.median(el) if el else 0,
                     "max": max(el, default=0)},
        "hunt_seconds": round(sum(_hunt_seconds(h) for h in hunts), 1),
        "hunted": len(hunted),
        "diagrams": sum(h.get("evaluated", 0) for h in hunts),
        "best_deficit": dict(sorted(Counter(h.get("best_deficit") for h in hunted).items(),
                                    key=lambda kv: (kv[0] is None, kv[0]))),
    }


#: Row fields kept by ``trim`` (the rest, words and PD codes, is reproducible from the seed).
KEEP = ("id", "line", "seed", "bridge_bounds", "result", "hunt", "status", "elapsed", "error")


def trim(src: str, dst: str) -> int:
    """Copy batch rows without their plat words and PD codes (committed results stay
    small); the hunt's best diagram is kept only when it was found."""
    from plait.atomic import write_text_atomic

    out = []
    with open(src, encoding="utf-8") as fh:
        for line in fh:
            if not line.strip():
                continue
            r = json.loads(line)
            t = {k: r[k] for k in KEEP if k in r}
            if isinstance(t.get("result"), dict):
                t["result"] = {k: t["result"][k] for k in ("bridges", "length")
                               if k in t["result"]}
                if r.get("bridge_bounds", {}).get("upper", 4) <= 3:
                    t["result"] = r["result"]  # a settled knot keeps its plat
            h = t.get("hunt")
            if isinstance(h, dict) and not h.get("found"):
                t["hunt"] = {k: v for k, v in h.items() if k != "diagram"}
            out.append(json.dumps(t, separators=(",", ":")))
    write_text_atomic(dst, "".join(x + "\n" for x in out))
    return len(out)


def control(count: int, seconds: float, seed: int) -> dict:
    from database_knotinfo import link_list

    from plait.diagrams.pd import validate_pd
    from plait.search.hunt import hunt

    rows = [r for r in link_list()
            if r.get("crossing_number") == "13" and r.get("bridge_index") == "4"]
    step = max(1, len(rows) // count)
    sample = rows[::step][:count]
    found, diagrams, deficits = [], 0, Counter()
    t0 = time.monotonic()
    for r in sample:
        res = hunt(validate_pd(json.loads(r["pd_notation"])), seconds=seconds, seed=seed,
                   handle_signals=False)
        diagrams += res.evaluated
        deficits[res.best_deficit] += 1
        if res.found:
            found.append(r["name"])
    return {"index4_total": len(rows), "sampled": len(sample), "seconds_each": seconds,
            "found_three_seeds": found, "diagrams": diagrams,
            "best_deficit": dict(sorted(deficits.items())),
            "wall": round(time.monotonic() - t0, 1)}


def settled(folder: str) -> str:
    """A Markdown table of the knots settled at b = 4 by the rank proof files in ``folder``:
    name, group and class, size of the image class, and the file. Each file is re-checked
    by :func:`plait.scoring.rankproof.check_rank_proof` first; a file that does not check is
    listed as such, not as settled."""
    from plait.scoring.rankproof import check_rank_proof

    lines = ["| knot | quotient (meridians to) | meridian images | proof file |",
             "|---|---|---|---|"]
    bad = []
    for path in sorted(Path(folder).glob("*.json")):
        obj = json.loads(path.read_text(encoding="utf-8"))
        res = check_rank_proof(obj)
        if not (res.ok and res.bound == 4 and obj.get("pd")):
            bad.append(path.name)
            continue
        group, klass = obj["class"]["target"].split("/", 1)
        lines.append(f"| {path.stem} | {group} ({klass}s) | {obj['image_class_size']} | "
                     f"`{path.name}` |")
    lines.append("")
    lines.append(f"{len(lines) - 3} knots settled at b = 4"
                 + (f"; files that do not check: {', '.join(bad)}" if bad else ""))
    return "\n".join(lines)


def main(argv: list[str] | None = None) -> int:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    sub = ap.add_subparsers(dest="cmd", required=True)
    t = sub.add_parser("tally")
    t.add_argument("rows", nargs="+")
    t.add_argument("--proofs", help="folder of rank proof files (settled down as well)")
    tr = sub.add_parser("trim")
    tr.add_argument("src")
    tr.add_argument("dst")
    c = sub.add_parser("control")
    c.add_argument("--count", type=int, default=20)
    c.add_argument("--seconds", type=float, default=10.0)
    c.add_argument("--seed", type=int, default=0)
    c.add_argument("--out")
    st = sub.add_parser("settled")
    st.add_argument("folder", nargs="?",
                    default=str(Path("bench") / "results" / "open13-rank-proofs"))
    a = ap.parse_args(argv)
    if a.cmd == "settled":
        print(settled(a.folder))
        return 0
    if a.cmd == "tally":
        s = tally(a.rows, a.proofs)
        print(f"rows {s['rows']}: settled up {len(s['settled_up'])} {s['settled_up']}, "
              f"settled down {len(s['settled_down'])} (by the batch "
              f"{len(s['settled_down_batch'])}, proof files {s['settled_down_files']}), "
              f"open {s['open']} ({s['open_hunted_30s']} of them hunted >= 30 s), "
              f"errors {len(s['errors'])}")
        pk = s["per_knot"]
        print(f"time {s['seconds']} s ({s['hunt_seconds']} s hunting, {s['hunted']} knots "
              f"hunted), per knot min {pk['min']:.1f} / median {pk['median']:.1f} / max "
              f"{pk['max']:.1f} s, {s['diagrams']} diagrams scored")
        print(f"fewest arcs left by 3 seeds (knots per value): {s['best_deficit']}")
        return 0
    if a.cmd == "trim":
        Path(a.dst).parent.mkdir(parents=True, exist_ok=True)
        print(f"{a.dst}: {trim(a.src, a.dst)} rows")
        return 0
    s = control(a.count, a.seconds, a.seed)
    print(json.dumps(s))
    if a.out:
        from plait.atomic import write_json_atomic

        write_json_atomic(a.out, s)
    return 0


if __name__ == "__main__":
    sys.exit(main())
