"""``plait reduce``: search for the simplest plat of a link, with guards and a certificate."""

from __future__ import annotations

import argparse
import sys

from plait.cli import add_input_arguments, add_search_arguments, emit_json, load_input
from plait.errors import EXIT_INTERRUPTED

NAME = "reduce"
HELP = "search for a plat with fewest bridges, then fewest crossings"
ORDER = 30


def configure(p: argparse.ArgumentParser) -> None:
    add_input_arguments(p)
    from plait.search.portfolio import STRATEGY_NAMES

    p.add_argument("--strategy", choices=STRATEGY_NAMES, default="auto",
                   help="search strategy (default: auto, a portfolio of the others)")
    add_search_arguments(p, steps_help="step budget; with --seed the run is reproducible bit "
                                       "for bit")
    p.add_argument("--objective", default="bridges", metavar="NAME",
                   help="bridges (default: fewest bridges, then length), length, "
                        "or weighted[:W] (W letters per bridge)")
    p.add_argument("--checkpoint-every", type=float, default=3.0, metavar="SECONDS",
                   help="seconds between checkpoints of the search state (default 3)")


def report(res, as_json: bool) -> int:
    """Print a result (shared with ``plait resume``); return the exit code."""
    if as_json:
        emit_json(res.to_json())
    else:
        r, i = res.result, res.input
        lb = res.lower
        status = "certified minimal" if lb == r.bridges else f"lower bound {lb}"
        print(f"input:  {i.bridges} bridges, {i.length} crossings")
        print(f"result: {r.bridges} bridges ({status}), {r.length} crossings")
        print(f"word:   {r if r.word else '(empty)'}  (strands {r.strands})")
        for reason in res.reasons:
            print(f"bound:  {reason}")
        proved = "; the length is proved minimal for plats" if res.length_minimal else ""
        print(f"length: at least {res.length_lower} crossings: {res.length_reason}{proved}")
        print(f"guards: {res.guards}; certificate: {res.certificate}"
              + (f" ({res.diagram_steps} diagram step{'s' * (res.diagram_steps != 1)})"
                 if res.diagram_steps else ""))
        print(f"run:    {res.run_dir} ({res.steps} steps, {res.explored} states, "
              f"{res.elapsed:.1f} s)")
        if lb < r.bridges and r.bridges >= 3:
            # the search (diagram steps included) may stop above the bridge number
            print("hint:   not proved minimal; a longer --time gives the search and its "
                  "diagram steps more tries")
    if res.status == "interrupted":
        sys.stderr.write(f"plait: interrupted; continue with: plait resume {res.run_dir}\n")
        return EXIT_INTERRUPTED
    return 0


def run(args: argparse.Namespace) -> int:
    from plait.search import reduce

    pres = load_input(args)
    res = reduce(pres, strategy=args.strategy, time=args.time, steps=args.steps,
                 seed=args.seed, run_dir=args.run_dir, quiet=args.quiet or args.json,
                 objective=args.objective, checkpoint_every=args.checkpoint_every)
    return report(res, args.json)
