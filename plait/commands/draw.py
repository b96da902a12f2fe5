"""``plait draw``: a picture of a plat, of a run folder, or of a batch folder's results."""

from __future__ import annotations

import argparse
from pathlib import Path

from plait.cli import add_input_arguments, load_input
from plait.errors import InputError

NAME = "draw"
HELP = "draw a plat (or a run folder's best plat, or a batch summary) as SVG or PNG"
ORDER = 60


def configure(p: argparse.ArgumentParser) -> None:
    add_input_arguments(p)
    p.epilog = ("PATH may also be a run folder (draws best.json, notes the certificate's "
                "moves by kind) or a batch output folder (draws the summary of "
                "results.jsonl).")
    p.add_argument("--out", required=True, metavar="FILE",
                   help="picture to write: FILE.svg, or FILE.png when matplotlib is installed")
    p.add_argument("--positions", action="store_true", help="number the strand positions")
    p.add_argument("--letters", action="store_true",
                   help="label every row with its letter index and generator")
    p.add_argument("--arrows", action="store_true",
                   help="mark each component's orientation with an arrowhead")
    p.add_argument("--rows", type=int, metavar="N",
                   help="rows per column before the word wraps (default 50)")
    p.add_argument("--compact", action="store_true",
                   help="let a letter share the row of the letter before it when their "
                        "positions are at least two apart")
    p.add_argument("--title", metavar="TEXT", help="heading of the picture")
    p.add_argument("--before-after", dest="before_after", action="store_true",
                   help="for a run folder: draw the start plat and the best plat side by side")


def run(args: argparse.Namespace) -> int:
    from plait.pictures.draw import draw_compare, draw_plat
    from plait.pictures.runfolder import read_run_folder
    from plait.pictures.svg import save_drawing

    out = Path(args.out)
    if out.suffix.lower() not in (".svg", ".png"):
        raise InputError(f"--out must end in .svg or .png, got {args.out!r}")
    if args.rows is not None and args.rows < 1:
        raise InputError(f"--rows must be at least 1, got {args.rows}")
    folder = Path(args.input) if args.input is not None else None
    opts = dict(positions=args.positions, letters=args.letters, arrows=args.arrows,
                max_rows=args.rows, compact=args.compact)
    if folder is not None and folder.is_dir():
        if any(v is not None for v in (args.plat, args.braid, args.pd, args.file)):
            raise InputError("give either a folder or one of --plat, --braid, --pd, --file")
        if args.strands is not None:
            raise InputError("--strands does not apply to a folder")
        if (folder / "results.jsonl").is_file() and not (folder / "best.json").is_file():
            return _batch(folder, out, args)
        if not (folder / "best.json").is_file():
            raise InputError(f"{folder} is neither a run folder (no best.json) nor a batch "
                             f"output folder (no results.jsonl)")
        rf = read_run_folder(folder)
        notes = [rf.certificate_note()]
        if args.before_after:
            if rf.start is None:
                raise InputError(f"{folder}: no readable start plat (input.json) to compare")
            drawing = draw_compare(rf.start, rf.best, notes=notes, heading=args.title, **opts)
            what = f"{_summary(rf.start)} -> {_summary(rf.best)}"
        else:
            drawing = draw_plat(rf.best, title=args.title, notes=notes, **opts)
            what = _summary(rf.best)
        save_drawing(drawing, out)
        print(f"wrote {out}: {what}; {notes[0]}")
        return 0
    if args.before_after:
        raise InputError("--before-after needs a run folder")
    from plait.convert import to_plat

    plat = to_plat(load_input(args))
    save_drawing(draw_plat(plat, title=args.title, **opts), out)
    print(f"wrote {out}: {_summary(plat)}")
    return 0


def _summary(plat) -> str:
    b, n, c = plat.bridges, plat.length, plat.components
    return (f"{b} bridge{'s' * (b != 1)}, {n} crossing{'s' * (n != 1)}, "
            f"{c} component{'s' * (c != 1)}")


def _batch(folder: Path, out: Path, args: argparse.Namespace) -> int:
    from plait.pictures.batch import batch_summary_svg, read_results

    if (args.before_after or args.positions or args.letters or args.arrows or args.rows
            or args.compact):
        raise InputError("plat drawing options do not apply to a batch summary")
    rows, bad = read_results(folder / "results.jsonl")
    info = batch_summary_svg(rows, out, unreadable=bad,
                             title=args.title or f"batch summary: {folder.name}")
    print(f"wrote {out}: {info['plotted']} items plotted, {info['skipped']} with errors "
          f"skipped" + (f", {bad} unreadable lines" if bad else ""))
    return 0
