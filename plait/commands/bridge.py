"""``plait bridge``: bounds on the bridge number of a link, each with its reason."""

from __future__ import annotations

import argparse
import math
import sys

from plait.cli import (
    add_bounds_time_argument,
    add_input_arguments,
    add_search_arguments,
    emit_json,
    load_input,
)
from plait.errors import EXIT_INTERRUPTED, InputError

NAME = "bridge"
HELP = "estimate the bridge number: certified value or lower and upper bounds"
ORDER = 35


def configure(p: argparse.ArgumentParser) -> None:
    add_input_arguments(p)
    add_search_arguments(p, steps_help="search step budget (0: bounds only); reproducible "
                                       "with --seed")
    add_bounds_time_argument(p)
    p.add_argument("--hunt", type=float, metavar="SECONDS",
                   help="when the bounds differ, spend this many more seconds on both sides: "
                        "diagram moves looking for one bridge fewer, and the lower bounds")
    p.add_argument("--hunt-dir", metavar="DIR",
                   help="checkpoint folder of the hunt (default RUN_DIR/hunt); running "
                        "again with the same folder continues the hunt")


def run(args: argparse.Namespace) -> int:
    from plait.bridge import bridge_report
    from plait.scoring.bounds import check_budget

    if args.time is not None and not math.isfinite(args.time):
        raise InputError(f"--time must be a finite number of seconds, got {args.time}")
    if args.hunt is not None and not (args.hunt > 0 and math.isfinite(args.hunt)):
        raise InputError(f"--hunt must be a positive, finite number of seconds, got {args.hunt}")
    if args.hunt_dir is not None and args.hunt is None:
        raise InputError("--hunt-dir needs --hunt SECONDS")
    budget = check_budget(args.bounds_time, "--bounds-time")
    pres = load_input(args)
    rep = bridge_report(pres, time=args.time, steps=args.steps, seed=args.seed,
                        run_dir=args.run_dir, quiet=args.quiet or args.json, budget=budget,
                        hunt=args.hunt, hunt_dir=args.hunt_dir)
    if args.json:
        emit_json(rep.to_json())
    else:
        if rep.certified:
            print(f"bridge number = {rep.upper} (certified)")
        else:
            print(f"{rep.lower} ≤ bridge number ≤ {rep.upper}")
        for r in rep.lower_reasons:
            print(f"lower:  {r}")
        for r in rep.upper_reasons:
            print(f"upper:  {r}")
        p = rep.result
        print(f"plat:   {p.strands} strands, {p.length} crossings: "
              f"{p if p.word else '(empty)'}")
        print(f"certificate: {rep.search.get('certificate', '')}")
        pd = rep.to_json()["pd"]
        if pd is not None:
            print("pd:     [" + ",".join("[" + ",".join(map(str, c)) + "]" for c in pd) + "]")
        for i, f in enumerate(rep.factors, start=1):
            b = (f"b = {f.upper} (certified)" if f.certified
                 else f"{f.lower} ≤ b ≤ {f.upper}")
            print(f"factor {i}: {b}; plat {f.plat.strands} strands, {f.plat.length} "
                  f"crossings: {f.plat if f.plat.word else '(empty)'}; pd {f.pd}")
            for r in f.lower_reasons:
                print(f"  lower:  {r}")
    hunt = rep.search.get("hunt") or {}
    if not args.json and hunt and "status" in hunt:
        print(f"hunt:   {hunt['evaluated']} diagrams in {hunt['elapsed']:.0f} s, "
              f"fewest arcs left by {hunt['target']} seeds: {hunt['best_deficit']} "
              f"({hunt['status']}; state {hunt['state_dir']})")
    if hunt.get("status") == "interrupted":
        sys.stderr.write(f"plait: hunt interrupted; continue it with --hunt-dir "
                         f"{hunt['state_dir']}\n")
        return EXIT_INTERRUPTED
    if rep.search.get("status") == "interrupted":
        sys.stderr.write(f"plait: interrupted; the search can be continued with: plait resume "
                         f"{rep.search.get('run_dir')}\n")
        return EXIT_INTERRUPTED
    return 0
