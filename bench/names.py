"""Naming benchmark: DT and Gauss codes over KnotInfo, and ``plait name`` on scrambled plats.

Part 1 (source: KnotInfo via database-knotinfo): every knot up to ``--max-codes``
crossings is read from its ``dt_notation`` and from its ``gauss_notation``; the Jones
polynomial of the PD code built must equal the table's up to mirror image.

Part 2: a seeded sample of knots up to ``--max-knot`` crossings (and of 2-component links
up to ``--max-link`` crossings): the table's braid notation becomes a plat, which
:func:`plait.moves.scramble` hides in one about 5 times as long with two more bridges
(as in bench/scrambled.py); :func:`plait.names.name_plat` gets ``--time`` seconds. Counted:
a unique candidate that is the right name, and a certified right name (the certificate is
replayed with :func:`plait.moves.verify_certificate`).

Usage::

    nice -n 10 .venv/bin/python bench/names.py                       # defaults below
    .venv/bin/python bench/names.py --max-codes 8 --knots 4 --links 2 --time 10
"""

from __future__ import annotations

import argparse
import random
import re
import statistics
import tempfile
import time
from concurrent.futures import ProcessPoolExecutor


def _code_job(job: tuple) -> tuple[str, str, str]:
    name, kind, code, want = job
    from plait.diagrams.dtgauss import dt_to_pd, gauss_to_pd
    from plait.diagrams.pdjones import pd_jones
    from plait.names import _key2, _mirror2

    try:
        real = dt_to_pd(code) if kind == "dt" else gauss_to_pd(code)
    except Exception as exc:  # noqa: BLE001 - counted as a failure
        return name, kind, f"refused: {exc}"
    v = _key2(pd_jones(real.pd))
    if v == want:
        return name, kind, "exact"
    if _mirror2(v) == want:
        return name, kind, "mirror"
    return name, kind, "differs"


def part_codes(max_c: int, workers: int) -> list[str]:
    from database_knotinfo import link_list

    from plait.names import load_table

    table = {e.name: e for e in load_table() if e.components == 1}
    jobs = []
    for k in link_list():
        name = k["name"]
        e = table.get(name)
        if e is None or not 3 <= e.crossings <= max_c:
            continue
        jobs.append((name, "dt", k["dt_notation"], e.jones2))
        jobs.append((name, "gauss", k["gauss_notation"], e.jones2))
    t0 = time.monotonic()
    with ProcessPoolExecutor(workers) as ex:
        res = list(ex.map(_code_job, jobs, chunksize=20))
    wall = time.monotonic() - t0
    lines = ["| code | knots | Jones = KnotInfo up to mirror | exactly (not mirrored) | "
             "refused or different |", "|---|---|---|---|---|"]
    for kind in ("dt", "gauss"):
        rs = [r for r in res if r[1] == kind]
        ok = sum(r[2] in ("exact", "mirror") for r in rs)
        ex_ = sum(r[2] == "exact" for r in rs)
        bad = [r for r in rs if r[2] not in ("exact", "mirror")]
        lines.append(f"| {kind} | {len(rs)} | {ok} ({100 * ok / max(1, len(rs)):.1f}%) | "
                     f"{ex_} | {len(bad)}{' e.g. ' + bad[0][0] + ': ' + bad[0][2] if bad else ''}"
                     " |")
    lines.append(f"\nknots 3..{max_c} crossings, {workers} workers, {wall:.0f} s wall")
    return lines


def _braid(text: str) -> list[int]:
    # KnotInfo: "[1,1,1]" or "[[...],[...]]" (first); LinkInfo: "{2, {-1, -1}}"
    nums = [int(x) for x in re.findall(r"-?\d+", text)]
    if text.strip().startswith("{"):
        return nums[1:]
    if text.strip().startswith("[["):
        first = re.match(r"\[\[([^\]]*)\]", text.strip()).group(1)
        return [int(x) for x in re.findall(r"-?\d+", first)]
    return nums


def _name_job(job: tuple) -> dict:
    name, family, braid, index, seconds, root = job
    import plait.moves as moves
    from plait.names import name_plat
    from plait.word import ClosedBraid

    clean = ClosedBraid.from_word(braid).to_plat()
    scr, _ = moves.scramble(clean, seed=index, length_factor=5, stabilizations=2)
    t0 = time.monotonic()
    r = name_plat(scr, time=seconds, seed=index, out_dir=f"{root}/{name}")
    wall = time.monotonic() - t0
    fams = {c.name for c in r.candidates}
    cert = [c for c in r.certified if c.name == family]
    ok_cert = bool(cert) and moves.verify_certificate(cert[0].certificate).ok
    return {"name": name, "scrambled": [scr.bridges, scr.length],
            "reduced": [r.reduced.bridges, r.reduced.length], "candidates": len(r.candidates),
            "unique": fams == {family}, "found": family in fams, "certified": ok_cert,
            "moves": cert[0].moves if cert else None, "wall": wall}


def part_names(rows: list[tuple], seconds: float, workers: int, title: str) -> list[str]:
    with tempfile.TemporaryDirectory(prefix="bench-names-") as root:
        jobs = [(n, f, b, i, seconds, root) for i, (n, f, b) in enumerate(rows)]
        with ProcessPoolExecutor(workers) as ex:
            res = list(ex.map(_name_job, jobs))
    n = len(res)
    uniq = sum(r["unique"] for r in res)
    found = sum(r["found"] for r in res)
    cert = sum(r["certified"] for r in res)
    mv = [r["moves"] for r in res if r["moves"]]
    lines = [f"### {title}", "",
             "| items | right name among candidates | unique candidate (right) | "
             "certified right name | median moves | median wall (s) |",
             "|---|---|---|---|---|---|",
             f"| {n} | {found} ({100 * found / n:.0f}%) | {uniq} ({100 * uniq / n:.0f}%) | "
             f"{cert} ({100 * cert / n:.0f}%) | {statistics.median(mv) if mv else '-'} | "
             f"{statistics.median(r['wall'] for r in res):.1f} |", ""]
    miss = [r["name"] for r in res if not r["certified"]]
    lines.append("not certified: " + (", ".join(miss) if miss else "none"))
    amb = [f"{r['name']} ({r['candidates']})" for r in res if not r["unique"]]
    lines.append("not a unique right candidate: " + (", ".join(amb) if amb else "none"))
    return lines


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__.split("\n")[0])
    ap.add_argument("--max-codes", type=int, default=12)
    ap.add_argument("--max-knot", type=int, default=10)
    ap.add_argument("--max-link", type=int, default=9)
    ap.add_argument("--knots", type=int, default=24, help="sampled knots (0: all)")
    ap.add_argument("--links", type=int, default=6, help="sampled 2-component links (0: all)")
    ap.add_argument("--time", type=float, default=30.0)
    ap.add_argument("--seed", type=int, default=1)
    ap.add_argument("--workers", type=int, default=2)
    args = ap.parse_args()
    from database_knotinfo import link_list

    stamp = time.strftime("%Y-%m-%d %H:%M UTC", time.gmtime())
    out = [f"## bench/names.py (seed {args.seed}, {stamp})", ""]
    out += ["### DT and Gauss codes of KnotInfo knots", ""]
    out += part_codes(args.max_codes, args.workers)
    print("\n".join(out), flush=True)
    rng = random.Random(args.seed)
    knots = []
    for k in link_list():
        try:
            c = int(k["crossing_number"])
        except (TypeError, ValueError):
            continue
        if 3 <= c <= args.max_knot and k["braid_notation"]:
            knots.append((k["name"], k["name"], _braid(k["braid_notation"])))
    if args.knots:
        knots = sorted(rng.sample(knots, min(args.knots, len(knots))))
    links = []
    for k in link_list(proper_links=True):
        try:
            c, comps = int(k["crossing_number"]), int(k["components"])
        except (TypeError, ValueError):
            continue
        if comps == 2 and c <= args.max_link and k["braid_notation"] and k["name"].endswith("{0}"):
            links.append((k["name"], k["name_unoriented"] or k["name"][:-3],
                          _braid(k["braid_notation"])))
    links = sorted(rng.sample(links, min(args.links, len(links)))) if args.links else \
        sorted(links)
    print("", flush=True)
    print("\n".join(part_names(knots, args.time, args.workers,
                               f"scrambled knots ≤ {args.max_knot} crossings, "
                               f"{len(knots)} sampled, {args.time:.0f} s each")), flush=True)
    print("", flush=True)
    print("\n".join(part_names(links, args.time, args.workers,
                               f"scrambled 2-component links ≤ {args.max_link} crossings, "
                               f"{len(links)} sampled, {args.time:.0f} s each")), flush=True)


if __name__ == "__main__":
    main()
