"""``plait batch-merge``: combine the folders of a sharded batch into one results table."""

from __future__ import annotations

import argparse
import sys

from plait.search.batch_files import format_summary
from plait.search.batch_shards import merge_batches

NAME = "batch-merge"
HELP = "combine the output folders of 'plait batch --shard K/N' runs"
ORDER = 61


def configure(p: argparse.ArgumentParser) -> None:
    p.add_argument("folders", nargs="+", metavar="DIR", help="shard folders of one batch")
    p.add_argument("--out", required=True, metavar="DIR", help="folder for the merged results")


def run(args: argparse.Namespace) -> int:
    s = merge_batches(args.folders, args.out)
    print(format_summary(s, f"merged {len(args.folders)} of {s['shard_count']} shards"))
    missing = sorted(set(range(s["shard_count"])) - set(s["shards_present"]))
    if missing or not s["complete"]:
        sys.stderr.write("plait batch-merge: incomplete"
                         + (f": shards {', '.join(map(str, missing))} missing" if missing else "")
                         + f"; {s['items'] - s['done']} items without a row\n")
        return 1
    return 0
