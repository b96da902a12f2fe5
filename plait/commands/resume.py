"""``plait resume``: continue a ``plait reduce`` run from its run folder."""

from __future__ import annotations

import argparse

NAME = "resume"
HELP = "continue an interrupted reduce run from its run folder"
ORDER = 31


def configure(p: argparse.ArgumentParser) -> None:
    p.add_argument("run_dir", metavar="RUN_DIR", help="the run folder of a plait reduce run")
    p.add_argument("--json", action="store_true", help="print one JSON object")
    p.add_argument("--quiet", action="store_true", help="no progress bar")


def run(args: argparse.Namespace) -> int:
    from plait.commands.reduce import report
    from plait.search import resume

    res = resume(args.run_dir, quiet=args.quiet or args.json)
    return report(res, args.json)
