"""``plait name``: which table knot or link is this, with a move path as proof."""

from __future__ import annotations

import argparse
import math

from plait.cli import add_input_arguments, emit_json, load_input
from plait.errors import InputError

NAME = "name"
HELP = ("name a knot or link from the KnotInfo tables (knots up to 13 crossings, links up to "
        "11): candidates whose invariants match, certified by diagram moves to the table's "
        "PD code or a move path to its plat")
ORDER = 37


def configure(p: argparse.ArgumentParser) -> None:
    add_input_arguments(p)
    p.add_argument("--time", type=float, default=30.0, metavar="SECONDS",
                   help="time budget for reducing and proving (default 30)")
    p.add_argument("--seed", type=int, default=0, metavar="N", help="random seed (default 0)")
    p.add_argument("--out", metavar="DIR",
                   help="folder for the certificates (default: a new folder under runs/)")
    p.add_argument("--json", action="store_true", help="print one JSON object")
    p.add_argument("--quiet", action="store_true", help="no notes on stderr")


def run(args: argparse.Namespace) -> int:
    from plait.names import TABLE_SOURCE, load_table, name_plat

    if not math.isfinite(args.time) or args.time <= 0:
        raise InputError(f"--time must be a positive number of seconds, got {args.time}")
    load_table()  # without database-knotinfo: exit 2 with the install hint
    pres = load_input(args)
    res = name_plat(pres, time=args.time, seed=args.seed, out_dir=args.out)
    if args.json:
        emit_json(res.to_json())
        return 0
    cert = res.certified
    if not res.candidates:
        print(f"no match in the table ({TABLE_SOURCE}); reduced plat: "
              f"{res.reduced.bridges} bridges, {res.reduced.length} crossings")
        return 0
    for c in cert:
        print(f"{c.label()} — certified, {c.moves} moves")
        print(f"certificate: {c.certificate}")
    if not cert:
        print("candidates: " + ", ".join(c.label() for c in res.candidates))
        for c in res.candidates:
            if c.note:
                print(f"  {c.label()}: not certified ({c.note})")
    checked = res.candidates[0].checked
    print(f"invariants checked: {', '.join(checked)}")
    if res.ruled_out:
        print("ruled out: " + "; ".join(f"{c.label()} ({c.note.removeprefix('ruled out: ')})"
                                        for c in res.ruled_out))
    return 0
