"""``plait random-plats``: seeded random plats (the random plat model) as JSON Lines."""

from __future__ import annotations

import argparse
import json
import sys

from plait.atomic import write_text_atomic
from plait.search.randomplat import parse_range, random_plats

NAME = "random-plats"
HELP = "write seeded random plats (uniform random words in B_2n) as JSON Lines with ids"
ORDER = 62


def configure(p: argparse.ArgumentParser) -> None:
    p.add_argument("--count", type=int, default=10, metavar="N", help="how many (default 10)")
    p.add_argument("--bridges", default="3", metavar="N|LO-HI",
                   help="bridges n (2n strands), or a range drawn uniformly (default 3)")
    p.add_argument("--length", default="20", metavar="N|LO-HI",
                   help="letters per word, or a range drawn uniformly (default 20)")
    p.add_argument("--seed", type=int, default=0, metavar="N", help="seed (default 0)")
    p.add_argument("--knot", action="store_true",
                   help="keep only words whose plat closure is a knot (rejection sampling)")
    p.add_argument("--prefix", default="rp-", metavar="TEXT", help="id prefix (default rp-)")
    p.add_argument("--out", metavar="FILE", help="write to FILE (default: standard output)")


def run(args: argparse.Namespace) -> int:
    bridges = parse_range(args.bridges, "--bridges")
    length = parse_range(args.length, "--length")
    lines = []
    for ident, plat in random_plats(args.count, bridges=bridges, length=length,
                                    seed=args.seed, knot=args.knot, prefix=args.prefix):
        lines.append(json.dumps({"id": ident, "plat": list(plat.word), "strands": plat.strands},
                                separators=(",", ":")) + "\n")
    if args.out:
        write_text_atomic(args.out, "".join(lines))
    else:
        sys.stdout.writelines(lines)
    return 0
