"""The files of a batch folder: its items read in, its rows written out and summarized."""

from __future__ import annotations

import csv
import hashlib
import io
import json
import os
import statistics
from collections.abc import Iterable
from pathlib import Path

from plait.atomic import FolderLock, write_json_atomic, write_text_atomic
from plait.errors import InputError
from plait.formats import BatchItem, input_file_errors, iter_batch_lines

__all__ = [
    "BATCH_FORMAT",
    "SUMMARY_FORMAT",
    "read_items",
    "read_rows",
    "flatten_row",
    "rows_to_csv",
    "ordered_rows",
    "summarize",
    "format_summary",
    "write_outputs",
    "strip_volatile",
    "batch_lock",
    "sha256_file",
]

#: ``format`` tag of ``DIR/batch.json``, the batch configuration.
BATCH_FORMAT = "plait-batch/1"
#: ``format`` tag of ``DIR/summary.json``.
SUMMARY_FORMAT = "plait-batch-summary/1"

# Files of a batch folder DIR:
#   batch.json     the configuration (input path and sha256, seed, budgets, shard, counts)
#   results.jsonl  one row per finished item, appended by the parent process only; the
#                  row is the proof that the item is done
#   results.csv    the same rows flattened, rewritten atomically from results.jsonl
#   summary.json   counts and histograms, written when the batch (or this shard) is done
#   summary.svg    the batch plot, when plait.pictures.batch is available
#   runs/NAME/     the run folder of each item (resumable mid-item)
#   .lock          held (flock) by the one process that writes the folder
CONFIG_FILE = "batch.json"
RESULTS_FILE = "results.jsonl"
CSV_FILE = "results.csv"
SUMMARY_FILE = "summary.json"
SVG_FILE = "summary.svg"
RUNS_DIR = "runs"

# Row fields that depend on the clock or on where the batch folder lives; everything
# else in a row is a function of (input line, seed, step budget).
VOLATILE_FIELDS = ("elapsed", "run_dir", "certificate")


def read_rows(path: str | os.PathLike, *, repair: bool = False) -> list[dict]:
    """Rows of a ``results.jsonl``.

    The file is only ever appended to, one complete line per write, so after a crash
    only its last line can be torn (no trailing newline). Such a line is ignored, and
    with ``repair`` cut off the file so that the next row starts on a fresh line.

    Raises
    ------
    InputError
        When a complete line is not a JSON object with an ``id``.
    """
    path = Path(path)
    if not path.exists():
        return []
    data = path.read_bytes()
    end = data.rfind(b"\n") + 1
    if end < len(data) and repair:
        with open(path, "r+b") as fh:
            fh.truncate(end)
            fh.flush()
            os.fsync(fh.fileno())
    rows = []
    for no, raw in enumerate(data[:end].splitlines(), start=1):
        if not raw.strip():
            continue
        try:
            row = json.loads(raw)
        except (json.JSONDecodeError, UnicodeDecodeError):
            raise InputError(f"{path}: line {no} is not JSON; the file was edited or "
                             "damaged") from None
        if not isinstance(row, dict) or "id" not in row:
            raise InputError(f"{path}: line {no} is not a results row")
        rows.append(row)
    return rows


def _flat_value(v: object) -> object:
    if v is None:
        return ""
    if isinstance(v, bool):
        return "true" if v else "false"
    if isinstance(v, list):
        if all(isinstance(x, int) and not isinstance(x, bool) for x in v):
            return " ".join(str(x) for x in v)
        if all(isinstance(x, (str, float, int)) for x in v):
            return "; ".join(str(x) for x in v)
        return json.dumps(v)
    return v


def flatten_row(row: dict, prefix: str = "") -> dict:
    """One CSV record of a row: nested objects become dotted columns
    (``result.bridges``), lists of integers (words) space-separated text, other lists
    of scalars ``"; "``-separated text, ``None`` an empty cell."""
    out: dict = {}
    for k, v in row.items():
        key = f"{prefix}{k}"
        if isinstance(v, dict):
            out.update(flatten_row(v, key + "."))
        else:
            out[key] = _flat_value(v)
    return out


def rows_to_csv(rows: Iterable[dict]) -> str:
    """CSV text of rows: columns ``id, line, seed``, then every other column in order of
    first appearance, then ``elapsed, error``."""
    flat = [flatten_row(r) for r in rows]
    seen: dict[str, int] = {}
    for f in flat:
        for k in f:
            seen.setdefault(k, len(seen))
    head = ["id", "line", "seed"]
    tail = ["elapsed", "error"]
    cols = [c for c in head if c in seen]
    cols += sorted((c for c in seen if c not in head and c not in tail), key=seen.__getitem__)
    cols += [c for c in tail if c in seen]
    buf = io.StringIO()
    w = csv.DictWriter(buf, fieldnames=cols, lineterminator="\n", extrasaction="ignore")
    w.writeheader()
    for f in flat:
        w.writerow(f)
    return buf.getvalue()


def ordered_rows(rows: Iterable[dict]) -> list[dict]:
    return sorted(rows, key=lambda r: (r.get("line") or 0, str(r["id"])))


# -- summary ----------------------------------------------------------------------------
def improved(row: dict) -> bool:
    res, inp = row.get("result"), row.get("input")
    if row.get("error") or not isinstance(res, dict) or not isinstance(inp, dict):
        return False
    try:
        return (res["bridges"], res["length"]) < (inp["bridges"], inp["length"])
    except (KeyError, TypeError):
        return False


def _median(xs: list[float]) -> float | None:
    return statistics.median(xs) if xs else None


def summarize(rows: list[dict], items: int | None = None, wall: float | None = None) -> dict:
    """Counts and histograms of a batch's rows.

    Parameters
    ----------
    rows : list of dict
        Results rows (``error`` null for finished searches).
    items : int, optional
        Number of items the batch (or shard) holds; default ``len(rows)``.
    wall : float, optional
        Wall-clock seconds of the run that produced the summary.

    Returns
    -------
    dict
        ``items``, ``done``, ``ok``, ``errors``, ``improved``, ``complete``;
        ``bridges`` (histogram ``"before->after"``), ``length_reduction_median``
        (letters), ``length_ratio_median`` (after / before), ``certified`` and
        ``certified_fraction`` (of ok rows), ``time_per_item`` (median, mean, max
        seconds) and ``wall_time``.
    """
    items = len(rows) if items is None else items
    ok = [r for r in rows if not r.get("error")]
    hist: dict[tuple[int, int], int] = {}
    reductions, ratios, certified = [], [], 0
    for r in ok:
        res, inp = r.get("result") or {}, r.get("input") or {}
        if "bridges" in res and "bridges" in inp:
            key = (int(inp["bridges"]), int(res["bridges"]))
            hist[key] = hist.get(key, 0) + 1
        if "length" in res and "length" in inp:
            reductions.append(inp["length"] - res["length"])
            if inp["length"]:
                ratios.append(res["length"] / inp["length"])
        if (r.get("bridge_bounds") or {}).get("certified"):
            certified += 1
    times = [float(r.get("elapsed") or 0.0) for r in rows if not r.get("error")]
    return {
        "format": SUMMARY_FORMAT,
        "items": items,
        "done": len(rows),
        "ok": len(ok),
        "errors": len(rows) - len(ok),
        "improved": sum(improved(r) for r in ok),
        "complete": len(rows) >= items,
        "bridges": {f"{a}->{b}": n for (a, b), n in sorted(hist.items())},
        "length_reduction_median": _median(reductions),
        "length_ratio_median": None if not ratios else round(_median(ratios), 4),
        "certified": certified,
        "certified_fraction": round(certified / len(ok), 4) if ok else None,
        "time_per_item": {
            "median": None if not times else round(_median(times), 3),
            "mean": None if not times else round(sum(times) / len(times), 3),
            "max": None if not times else round(max(times), 3),
        },
        "wall_time": None if wall is None else round(wall, 2),
    }


def format_summary(summary: dict, title: str = "batch") -> str:
    """The summary as a small text table (what ``plait batch`` prints at the end)."""
    s = summary
    lines = [f"{title}: {s['done']}/{s['items']} items, {s['ok']} ok, {s['errors']} errors, "
             f"{s['improved']} improved" + ("" if s["complete"] else "  (incomplete)")]
    hist = {tuple(int(x) for x in k.split("->")): v for k, v in s["bridges"].items()}
    if hist:
        before = sorted({a for a, _ in hist})
        after = sorted({b for _, b in hist})
        width = max(5, *(len(str(v)) + 1 for v in hist.values()))
        lines.append("bridges before -> after (rows: before, columns: after)")
        lines.append("  before |" + "".join(f"{b:>{width}}" for b in after))
        lines.append("  -------+" + "-" * (width * len(after)))
        for a in before:
            cells = "".join(f"{hist.get((a, b), '.'):>{width}}" for b in after)
            lines.append(f"  {a:>6} |{cells}")
    if s["length_reduction_median"] is not None:
        ratio = s["length_ratio_median"]
        lines.append(f"median length reduction: {s['length_reduction_median']:g} letters"
                     + (f" (after/before {ratio:.2f})" if ratio is not None else ""))
    if s["certified_fraction"] is not None:
        lines.append(f"bridge number certified: {s['certified']}/{s['ok']} "
                     f"({100 * s['certified_fraction']:.0f}%)")
    t = s["time_per_item"]
    if t["median"] is not None:
        lines.append(f"time per item: median {t['median']:.2f} s, mean {t['mean']:.2f} s, "
                     f"max {t['max']:.2f} s")
    if s.get("wall_time") is not None:
        lines.append(f"wall time of this run: {s['wall_time']:.1f} s")
    return "\n".join(lines)


def write_outputs(out: Path, rows: list[dict], summary: dict | None) -> None:
    ordered = ordered_rows(rows)
    write_text_atomic(out / CSV_FILE, rows_to_csv(ordered))
    if summary is None:
        return
    write_json_atomic(out / SUMMARY_FILE, summary)
    try:
        from plait.pictures.batch import batch_summary_svg  # type: ignore[import-not-found]
    except ImportError:
        return
    batch_summary_svg(ordered, out / SVG_FILE)


def sha256_file(path: Path) -> str:
    h = hashlib.sha256()
    with open(path, "rb") as fh:
        for block in iter(lambda: fh.read(1 << 20), b""):
            h.update(block)
    return h.hexdigest()


def read_items(path: Path) -> list[BatchItem]:
    with input_file_errors(path):
        items = list(iter_batch_lines(path))
    first: dict[str, int] = {}
    for it in items:
        if it.id in first:
            raise InputError(f"{path}: id {it.id!r} appears on lines {first[it.id]} and "
                             f"{it.line}; ids must be unique")
        first[it.id] = it.line
    return items


def batch_lock(folder: Path) -> FolderLock:
    """The batch folder's writer lock (see :class:`plait.atomic.FolderLock`)."""
    return FolderLock(folder, "another plait batch is writing this folder")


def strip_volatile(row: dict) -> dict:
    """A row without its timing and path fields (for comparing two runs of a batch)."""
    return {k: v for k, v in row.items() if k not in VOLATILE_FIELDS}
