"""The ``plait`` command line: a thin layer over the Python API, one module per subcommand."""

from __future__ import annotations

import argparse
import importlib
import json
import os
import pkgutil
import sys
from collections.abc import Sequence

from plait.errors import EXIT_GUARD, EXIT_INPUT, GuardViolation, InputError
from plait.formats import Presentation, parse_presentation, read_presentation_file

__all__ = ["main", "add_input_arguments", "add_search_arguments", "load_input", "emit_json",
           "build_parser"]


class _Parser(argparse.ArgumentParser):
    """Argument parser whose errors are one line on stderr and exit code 2."""

    def error(self, message: str) -> None:  # type: ignore[override]
        sys.stderr.write(f"{self.prog}: error: {message}\n")
        raise SystemExit(EXIT_INPUT)


def add_input_arguments(parser: argparse.ArgumentParser, *, required: bool = True) -> None:
    """The presentation options shared by every subcommand that takes one: exactly one of
    ``--plat``, ``--braid``, ``--pd``, ``--dt``, ``--gauss``, ``--file`` (or a positional
    file path)."""
    g = parser.add_argument_group("input (exactly one)")
    g.add_argument("--plat", metavar="WORD", help="plat word, e.g. '2 -1 2' or '[2,-1,2]'")
    g.add_argument("--braid", metavar="WORD", help="closed braid word, e.g. '1 1 1'")
    g.add_argument("--pd", metavar="CODE", help="PD code, e.g. '[[1,5,2,4],[3,1,4,6],[5,3,6,2]]'")
    g.add_argument("--dt", metavar="CODE",
                   help="DT code of a knot, e.g. '4 6 2' or '[4, 8, -12, 2, -14, -16, -6, -10]' "
                        "(negative: the crossing breaks the alternating pattern). A DT code fixes "
                        "a prime knot only up to mirror image: plait builds the diagram whose "
                        "first crossing is positive (for KnotInfo's codes up to 12 crossings, "
                        "the chirality KnotInfo lists)")
    g.add_argument("--gauss", metavar="CODE",
                   help="Gauss code: '1 -2 3 -1 2 -3' (+ over, - under; read up to mirror image "
                        "when planarity fixes the diagram, the first crossing made positive) or "
                        "with crossing signs 'O1+ U2+ O3+ U1+ O2+ U3+' (exact)")
    g.add_argument("--file", metavar="PATH", help="a presentation file (JSON or text)")
    g.add_argument("--strands", type=int, metavar="N",
                   help="strands for --plat/--braid (default: least that fits)")
    parser.add_argument("input", nargs="?", metavar="PATH",
                        help="a presentation file (same as --file)")
    parser.set_defaults(_input_required=required)


def load_input(args: argparse.Namespace) -> Presentation:
    """The presentation named by the input options.

    Raises
    ------
    InputError
        When none or several are given, or the input is malformed.
    """
    file_path = args.file
    if getattr(args, "input", None) is not None:
        if file_path is not None:
            raise InputError("give the file either as PATH or with --file, not both")
        file_path = args.input
    given = [(k, v) for k, v in (("plat", args.plat), ("braid", args.braid), ("pd", args.pd),
                                 ("dt", getattr(args, "dt", None)),
                                 ("gauss", getattr(args, "gauss", None)),
                                 ("file", file_path)) if v is not None]
    if len(given) != 1:
        names = ", ".join("--" + k for k, _ in given)
        raise InputError("give exactly one of --plat, --braid, --pd, --dt, --gauss, --file"
                         + (f" (got {names})" if given else ""))
    kind, value = given[0]
    if args.strands is not None and kind not in ("plat", "braid"):
        raise InputError("--strands applies only to --plat and --braid")
    if kind == "file":
        return read_presentation_file(value)
    if kind in ("dt", "gauss"):
        from plait.formats import realize_code

        real = realize_code(kind, value)
        if real.mirror_chosen and not getattr(args, "quiet", False):
            sys.stderr.write(f"plait: {kind}: {real.note()}\n")
        return real.pd
    return parse_presentation(kind, value, args.strands)


def add_search_arguments(parser: argparse.ArgumentParser, *, steps_help: str) -> None:
    """The budget and run options shared by the commands that run a search: ``--time``,
    ``--steps``, ``--seed``, ``--run-dir``, ``--json``, ``--quiet``."""
    parser.add_argument("--time", type=float, metavar="SECONDS",
                        help="time budget in seconds (default 10 when --steps is not given)")
    parser.add_argument("--steps", type=int, metavar="N", help=steps_help)
    parser.add_argument("--seed", type=int, default=0, metavar="N",
                        help="random seed (default 0)")
    parser.add_argument("--run-dir", metavar="DIR",
                        help="run folder (default: a new folder under runs/)")
    parser.add_argument("--json", action="store_true", help="print one JSON object")
    parser.add_argument("--quiet", action="store_true", help="no progress bar")


def add_bounds_time_argument(parser: argparse.ArgumentParser) -> None:
    """``--bounds-time SECONDS``: the time budget of the lower bounds
    (:func:`plait.scoring.bounds.bridge_lower_bound`); slow methods that do not fit are
    reported as "not tried"."""
    parser.add_argument("--bounds-time", type=float, metavar="SECONDS",
                        help="seconds for the lower bounds; slow methods that do not fit "
                             "are reported as 'not tried' (default: no limit)")


def emit_json(obj: object) -> None:
    """Print one JSON object on stdout."""
    sys.stdout.write(json.dumps(obj) + "\n")


def build_parser() -> argparse.ArgumentParser:
    """The full parser; subcommands are the modules of :mod:`plait.commands`, each of
    which defines ``NAME``, ``HELP``, ``configure(parser)`` and ``run(args) -> int``."""
    parser = _Parser(prog="plait", description="Find minimal plat presentations of knots "
                     "and links.")
    sub = parser.add_subparsers(dest="command", metavar="COMMAND", parser_class=_Parser)
    import plait.commands as pkg

    mods = []
    for info in pkgutil.iter_modules(pkg.__path__):
        if info.name.startswith("_"):
            continue
        mods.append(importlib.import_module(f"plait.commands.{info.name}"))
    for mod in sorted(mods, key=lambda m: getattr(m, "ORDER", 50)):
        p = sub.add_parser(mod.NAME, help=mod.HELP, description=mod.HELP)
        mod.configure(p)
        p.set_defaults(_run=mod.run)
    return parser


def main(argv: Sequence[str] | None = None) -> int:
    """Entry point of the ``plait`` command. Returns the exit code: 0 success, 1 a
    negative answer (e.g. a certificate that does not verify), 2 bad input, 3 a guard
    failure, 130 interrupted."""
    parser = build_parser()
    try:
        args = parser.parse_args(argv)
    except SystemExit as exc:
        return int(exc.code or 0)
    if not getattr(args, "_run", None):
        parser.print_help()
        return EXIT_INPUT
    try:
        return int(args._run(args) or 0)
    except InputError as exc:
        sys.stderr.write(f"plait: error: {exc}\n")
        return EXIT_INPUT
    except GuardViolation as exc:
        sys.stderr.write(f"plait: {exc}\n")
        return EXIT_GUARD
    except KeyboardInterrupt:
        sys.stderr.write("plait: interrupted\n")
        return 130
    except BrokenPipeError:
        return 0
    except OSError as exc:  # a path the user named cannot be read or written
        where = f": {exc.filename}" if exc.filename else ""
        sys.stderr.write(f"plait: error: {exc.strerror or exc}{where}\n")
        return EXIT_INPUT
    except RecursionError:  # e.g. JSON nested thousands deep in some file
        sys.stderr.write("plait: error: input nested too deeply\n")
        return EXIT_INPUT
    except Exception as exc:  # a bug, not bad input: one line unless debugging
        if os.environ.get("PLAIT_DEBUG"):
            raise
        sys.stderr.write(f"plait: internal error: {type(exc).__name__}: {exc} "
                         f"(set PLAIT_DEBUG=1 for details)\n")
        return 1


def _entry() -> None:
    sys.exit(main())


if __name__ == "__main__":
    _entry()
