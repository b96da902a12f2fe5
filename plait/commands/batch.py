"""``plait batch``: reduce every presentation of a file, resumably, in parallel."""

from __future__ import annotations

import argparse
import math
import sys

from plait.errors import InputError
from plait.search.batch import run_batch
from plait.search.batch_files import format_summary
from plait.search.batch_shards import parse_shard

NAME = "batch"
HELP = "reduce every presentation of a JSON Lines or text file into a results table"
ORDER = 60


def configure(p: argparse.ArgumentParser) -> None:
    p.add_argument("file", nargs="?", metavar="FILE",
                   help="JSON Lines ({'id': ..., 'plat'|'braid'|'pd': ...} per line) or text "
                        "(one presentation per line); optional with --resume")
    p.add_argument("--out", required=True, metavar="DIR",
                   help="batch folder: results.jsonl, results.csv, summary.json, runs/")
    b = p.add_argument_group("budget per item (default --time 10)")
    b.add_argument("--time", type=float, metavar="SECONDS", help="time budget per item")
    b.add_argument("--steps", type=int, metavar="N",
                   help="step budget per item (reproducible results)")
    p.add_argument("--seed", type=int, metavar="N",
                   help="batch seed; each item's seed is derived from it and the id (default 0)")
    p.add_argument("--strategy", metavar="NAME", help="search strategy (default auto)")
    p.add_argument("--bridge", action="store_true",
                   help="run the bridge-number report instead of the plain reduction")
    p.add_argument("--name", action="store_true",
                   help="also name each result from the KnotInfo tables (columns name, "
                        "name_mirror, name_certified, name_candidates; needs plait[tables])")
    p.add_argument("--hunt", type=float, metavar="SECONDS",
                   help="with --bridge: seconds per item for the hunt (plait bridge --hunt)")
    p.add_argument("--workers", type=int, metavar="N",
                   help="worker processes on this machine (default: number of cores)")
    p.add_argument("--shard", metavar="K/N",
                   help="process only shard K of N (0-based; stable assignment by id)")
    p.add_argument("--dask", metavar="ADDRESS",
                   help="run items on a running dask.distributed scheduler, e.g. "
                        "tcp://head:8786 (needs plait[cluster] and a shared DIR)")
    p.add_argument("--resume", action="store_true",
                   help="continue the batch in DIR (after a crash, kill or Ctrl-C)")
    p.add_argument("--quiet", action="store_true", help="no progress bar")


def run(args: argparse.Namespace) -> int:
    if args.hunt is not None and not args.bridge:
        raise InputError("--hunt needs --bridge")
    if args.hunt is not None and not (args.hunt > 0 and math.isfinite(args.hunt)):
        raise InputError(f"--hunt must be a positive, finite number of seconds, got {args.hunt}")
    opts = None if args.hunt is None else {"hunt": args.hunt}
    extra = {}
    if args.name:
        from plait.names import load_table, named_search_item

        load_table()  # without database-knotinfo: exit 2 with the install hint
        extra["item_fn"] = named_search_item
    outcome = run_batch(args.file, args.out, seed=args.seed, steps=args.steps, time=args.time,
                        strategy=args.strategy, bridge=args.bridge or None,
                        workers=args.workers, shard=parse_shard(args.shard),
                        resume=args.resume, dask=args.dask, quiet=args.quiet,
                        search_options=opts, **extra)
    s = outcome.summary
    title = f"batch {outcome.out}"
    if outcome.written == 0 and s["complete"]:
        title += " (already complete, nothing to do)"
    print(format_summary(s, title))
    if outcome.unfinished or not s["complete"]:
        sys.stderr.write(f"plait batch: {s['items'] - s['done']} items unfinished; "
                         "run again with --resume\n")
        return 1
    return 0
