"""``plait show``: summarise a presentation as a plat."""

from __future__ import annotations

import argparse

from plait.cli import add_input_arguments, emit_json, load_input
from plait.convert import to_plat
from plait.diagrams.pd import plat_to_pd
from plait.errors import InputError

NAME = "show"
HELP = "convert a presentation to a plat and summarise it"
ORDER = 10


def configure(p: argparse.ArgumentParser) -> None:
    add_input_arguments(p)
    p.add_argument("--json", action="store_true", help="print one JSON object")
    p.add_argument("--pd-out", action="store_true", help="also print the plat's PD code")


def run(args: argparse.Namespace) -> int:
    pres = load_input(args)
    plat = to_plat(pres)
    info = plat.to_dict()
    info["permutation"] = list(plat.permutation())
    pd_note = ""
    if args.pd_out:
        try:
            info["pd"] = plat_to_pd(plat).to_list()
        except InputError as exc:  # a crossingless component: no PD code exists
            info["pd"] = None
            pd_note = str(exc).removeprefix("pd: ")
    if args.json:
        emit_json(info)
        return 0
    comp = info["components"]
    print(f"plat on {plat.strands} strands: {plat.bridges} bridge{'s' * (plat.bridges != 1)}, "
          f"{plat.length} crossing{'s' * (plat.length != 1)}, "
          f"{comp} component{'s' * (comp != 1)}")
    print(f"word: {plat if plat.word else '(empty)'}")
    if args.pd_out:
        print(f"pd: {plat_to_pd(plat)}" if info["pd"] is not None else f"pd: none ({pd_note})")
    return 0
