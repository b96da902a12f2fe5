"""Batches of presentations: one run folder and one results row per item, written exactly once."""

from __future__ import annotations

import csv
import hashlib
import io
import json
import math
import multiprocessing
import os
import re
import signal
import statistics
import sys
import time
from collections import deque
from collections.abc import Callable, Iterable, Iterator
from concurrent.futures import FIRST_COMPLETED, ProcessPoolExecutor, wait
from concurrent.futures.process import BrokenProcessPool
from dataclasses import dataclass
from pathlib import Path

from plait.atomic import FolderLock, append_line_durable, write_json_atomic, write_text_atomic
from plait.errors import InputError, PlaitError
from plait.formats import (
    BatchItem,
    input_file_errors,
    iter_batch_lines,
    presentation_from_obj,
    presentation_to_obj,
)

__all__ = [
    "BATCH_FORMAT",
    "ItemTask",
    "BatchOutcome",
    "item_seed",
    "shard_of",
    "parse_shard",
    "run_folder_name",
    "read_rows",
    "flatten_row",
    "rows_to_csv",
    "summarize",
    "format_summary",
    "execute_task",
    "search_item",
    "run_batch",
    "merge_batches",
    "strip_volatile",
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
#   summary.svg    the batch plot, when plait.batchplot is available
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


CSV_EVERY = 60.0  # seconds between rewrites of results.csv while a batch runs


# -- stable assignment of seeds, shards and folders ----------------------------------------
def _digest(*parts: object) -> int:
    h = hashlib.sha256("\x00".join(str(p) for p in parts).encode("utf-8")).digest()
    return int.from_bytes(h[:8], "big")


def item_seed(seed: int, ident: str) -> int:
    """Seed of one item, derived from the batch seed and the item's id only.

    The value is the first 63 bits of SHA-256 of ``"seed\\0id"``; it does not depend on
    the number of workers, the order of completion or the shard, so every way of running
    a batch gives each item the same search.
    """
    return _digest("seed", seed, ident) >> 1


def shard_of(ident: str, count: int) -> int:
    """Shard (``0 .. count-1``) that owns the item ``ident``: SHA-256 of the id modulo
    ``count``. Stable across machines and Python runs (unlike the built-in ``hash``)."""
    if count < 1:
        raise InputError(f"shard count must be at least 1, got {count}")
    return _digest("shard", ident) % count


def parse_shard(text: str | None) -> tuple[int, int] | None:
    """``"K/N"`` (``0 <= K < N``) as ``(K, N)``; ``None`` stays ``None``."""
    if text is None:
        return None
    m = re.fullmatch(r"\s*(\d+)\s*/\s*(\d+)\s*", str(text))
    if not m:
        raise InputError(f"--shard: expected K/N such as 0/4, got {text!r}")
    k, n = int(m.group(1)), int(m.group(2))
    if n < 1 or not 0 <= k < n:
        raise InputError(f"--shard: need 0 <= K < N, got {k}/{n}")
    return k, n


def run_folder_name(ident: str) -> str:
    """Folder name of an item's run folder: the id made file-name safe (at most 40
    characters) plus 10 hex digits of its SHA-256, so distinct ids never share a folder."""
    safe = re.sub(r"[^A-Za-z0-9._-]+", "_", ident).strip("._")[:40] or "item"
    return f"{safe}-{hashlib.sha256(ident.encode('utf-8')).hexdigest()[:10]}"


# -- one item ---------------------------------------------------------------------------
@dataclass(frozen=True)
class ItemTask:
    """Everything a worker needs for one item; plain data, so it pickles for processes
    and for Dask.

    ``presentation`` is the JSON object of :func:`plait.formats.presentation_to_obj`.
    """

    id: str
    line: int
    seed: int
    presentation: dict
    run_dir: str
    steps: int | None
    time: float | None
    strategy: str
    bridge: bool
    options: dict | None = None


def _resumable(run_dir: Path) -> bool:
    return run_dir.is_dir() and any(run_dir.iterdir())


def search_item(task: ItemTask) -> dict:
    """Reduce one item with :func:`plait.search.api.reduce` (or the bridge report with
    ``bridge``), continuing its run folder when an earlier attempt left one.

    Returns the JSON object of ``plait reduce --json`` (or ``plait bridge --json``).
    Signals are left to the batch (``handle_signals=False``): a worker never returns a
    half-finished search as a result.
    """
    from plait.search.api import reduce, resume

    pres = presentation_from_obj(task.presentation)
    run_dir = Path(task.run_dir)
    if task.bridge:
        # the report's diagram steps keep no checkpoint: an interrupted item starts again
        if _resumable(run_dir):
            _clear_folder(run_dir)
        # a hunt (search option "hunt") keeps its checkpoint beside the run folder
        hunt = (task.options or {}).get("hunt")
        extra = {} if not hunt else {"hunt": hunt, "hunt_dir": f"{run_dir}.hunt"}
        res = _bridge_function()(pres, time=task.time, steps=task.steps, seed=task.seed,
                                 run_dir=run_dir, quiet=True, handle_signals=False, **extra)
        return res.to_json()
    if _resumable(run_dir):
        try:
            return resume(run_dir, quiet=True, handle_signals=False).to_json()
        except InputError:
            # killed before the run's first checkpoint (no state.json yet): start afresh
            _clear_folder(run_dir)
    res = reduce(pres, strategy=task.strategy, time=task.time, steps=task.steps,
                 seed=task.seed, run_dir=run_dir, quiet=True, handle_signals=False,
                 **(task.options or {}))
    return res.to_json()


def _bridge_function() -> Callable:
    try:
        from plait.bridge import bridge_report
    except ImportError:
        raise InputError("--bridge needs the bridge report (plait.bridge), "
                         "which this installation lacks") from None
    return bridge_report


def _clear_folder(folder: Path) -> None:
    for p in sorted(folder.rglob("*"), key=lambda q: len(q.parts), reverse=True):
        if p.is_dir() and not p.is_symlink():
            p.rmdir()
        else:
            p.unlink()


def execute_task(task: ItemTask, item_fn: Callable[[ItemTask], dict] = search_item) -> dict:
    """Run ``item_fn`` on one task and build its results row: ``id``, ``line``,
    ``seed``, the item function's object, ``elapsed`` (seconds) and ``error`` (``None``
    or the message). Exceptions become error rows; ``BaseException`` (an interrupted
    worker) propagates, so no row is written for an unfinished item."""
    t0 = time.perf_counter()
    row: dict = {"id": task.id, "line": task.line, "seed": task.seed}
    error = None
    try:
        out = item_fn(task)
        row.update({k: v for k, v in out.items() if k not in ("id", "line", "seed")})
    except PlaitError as exc:
        error = str(exc)
    except Exception as exc:  # noqa: BLE001 - any failure of one item is that item's row
        error = f"{type(exc).__name__}: {exc}"
    row.pop("elapsed", None)
    row.pop("error", None)
    row["elapsed"] = round(time.perf_counter() - t0, 3)
    row["error"] = error
    return row


def _input_error_row(item: BatchItem, seed: int) -> dict:
    return {"id": item.id, "line": item.line, "seed": seed, "elapsed": 0.0,
            "error": item.error}


# -- results files ----------------------------------------------------------------------
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


def _ordered(rows: Iterable[dict]) -> list[dict]:
    return sorted(rows, key=lambda r: (r.get("line") or 0, str(r["id"])))


# -- summary ----------------------------------------------------------------------------
def _improved(row: dict) -> bool:
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
        "improved": sum(_improved(r) for r in ok),
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


def _write_outputs(out: Path, rows: list[dict], summary: dict | None) -> None:
    ordered = _ordered(rows)
    write_text_atomic(out / CSV_FILE, rows_to_csv(ordered))
    if summary is None:
        return
    write_json_atomic(out / SUMMARY_FILE, summary)
    try:
        from plait.batchplot import batch_summary_svg  # type: ignore[import-not-found]
    except ImportError:
        return
    batch_summary_svg(ordered, out / SVG_FILE)


# -- the batch folder -------------------------------------------------------------------
@dataclass
class BatchOutcome:
    """What :func:`run_batch` did: the summary, the rows written by this call, and the
    items it could not finish (lost Dask workers; run ``--resume`` again)."""

    summary: dict
    written: int
    unfinished: int
    out: str


def _sha256_file(path: Path) -> str:
    h = hashlib.sha256()
    with open(path, "rb") as fh:
        for block in iter(lambda: fh.read(1 << 20), b""):
            h.update(block)
    return h.hexdigest()


def _read_items(path: Path) -> list[BatchItem]:
    with input_file_errors(path):
        items = list(iter_batch_lines(path))
    first: dict[str, int] = {}
    for it in items:
        if it.id in first:
            raise InputError(f"{path}: id {it.id!r} appears on lines {first[it.id]} and "
                             f"{it.line}; ids must be unique")
        first[it.id] = it.line
    return items


def _batch_lock(folder: Path) -> FolderLock:
    """The batch folder's writer lock (see :class:`plait.atomic.FolderLock`)."""
    return FolderLock(folder, "another plait batch is writing this folder")


def _config(out: Path, input_path: Path | None, *, seed, steps, time_budget, strategy, bridge,
            shard, search_options, resume: bool) -> tuple[dict, list[BatchItem]]:
    """Create (new batch) or load and check (``resume``) ``DIR/batch.json``."""
    cfg_path = out / CONFIG_FILE
    if not resume:
        if cfg_path.exists() or (out / RESULTS_FILE).exists():
            raise InputError(f"{out} already holds a batch: add --resume to continue it, "
                             "or choose another --out")
        if (out / "config.json").exists() and (out / "best.json").exists():
            raise InputError(f"{out} is the run folder of a plait reduce run, not a batch "
                             "folder: choose another --out")
        if input_path is None:
            raise InputError("batch: give the input FILE")
        items = _read_items(input_path)
        if steps is None and time_budget is None:
            time_budget = 10.0
        cfg = {
            "format": BATCH_FORMAT,
            "input": str(input_path),
            "input_sha256": _sha256_file(input_path),
            "seed": 0 if seed is None else int(seed),
            "steps": steps,
            "time": time_budget,
            "strategy": strategy or "auto",
            "search_options": search_options or None,
            "bridge": bool(bridge),
            "shard": None if shard is None else list(shard),
            "items_total": len(items),
            "items": sum(1 for it in items if _in_shard(it.id, shard)),
        }
        write_json_atomic(cfg_path, cfg)
        return cfg, items
    if not cfg_path.exists():
        raise InputError(f"{out}: no batch to resume (no {CONFIG_FILE})")
    try:
        cfg = json.loads(cfg_path.read_text(encoding="utf-8"))
    except (OSError, json.JSONDecodeError) as exc:
        raise InputError(f"{cfg_path}: unreadable ({exc})") from None
    if cfg.get("format") != BATCH_FORMAT:
        raise InputError(f"{cfg_path}: not a plait batch ({cfg.get('format')!r})")
    if cfg.get("merged_from") is not None:
        raise InputError(f"{out} holds merged shards; resume the shard folders instead")
    given = {"seed": seed, "steps": steps, "time": time_budget, "strategy": strategy,
             "bridge": bridge or None, "shard": None if shard is None else list(shard),
             "search_options": search_options or None}
    for key, val in given.items():
        if val is not None and val != cfg.get(key):
            raise InputError(f"--resume: --{key} {val} differs from the batch's "
                             f"{cfg.get(key)}; omit it to keep the batch's value")
    path = input_path if input_path is not None else Path(cfg["input"])
    if not path.exists():
        raise InputError(f"--resume: input file {path} is missing; give it as FILE")
    if _sha256_file(path) != cfg["input_sha256"]:
        raise InputError(f"--resume: {path} changed since the batch started "
                         "(sha256 differs); start a new batch")
    return cfg, _read_items(path)


def _in_shard(ident: str, shard) -> bool:
    return shard is None or shard_of(ident, shard[1]) == shard[0]


# -- executors --------------------------------------------------------------------------
def _worker_init() -> None:
    """Worker processes: die with the parent (Linux PR_SET_PDEATHSIG, so a kill -9 of
    the batch leaves no orphan writing a run folder), leave the terminal's process group
    (Ctrl-C reaches only the parent, which then stops the workers), ignore SIGINT."""
    try:
        import ctypes

        libc = ctypes.CDLL(None, use_errno=True)
        libc.prctl(1, int(signal.SIGKILL))  # PR_SET_PDEATHSIG
        if os.getppid() == 1:  # the parent died before prctl took effect
            os._exit(1)
    except (OSError, AttributeError):
        pass
    try:
        os.setpgrp()
    except OSError:
        pass
    signal.signal(signal.SIGINT, signal.SIG_IGN)


def _run_local(tasks: Iterator[ItemTask], workers: int, item_fn, on_row, _on_lost) -> None:
    """Run tasks on a pool of ``workers`` processes, at most ``2 * workers`` in flight.

    When a worker process dies (out of memory, a crash in native code) the pool breaks
    and every item in flight is lost. Those items are then retried one at a time; an
    item that breaks the pool while alone in it gets an error row.
    """
    ctx = multiprocessing.get_context("spawn")
    suspects: deque[ItemTask] = deque()
    source = iter(tasks)

    def next_task(quarantine: bool) -> ItemTask | None:
        if quarantine:
            return suspects.popleft() if suspects else None
        return next(source, None)

    exhausted = False
    while not exhausted or suspects:
        ex = ProcessPoolExecutor(max_workers=workers, mp_context=ctx, initializer=_worker_init)
        inflight: dict = {}
        lost: list[ItemTask] = []
        try:
            while True:
                quarantine = bool(suspects)
                limit = 1 if quarantine else 2 * workers
                while len(inflight) < limit:
                    t = next_task(quarantine)
                    if t is None:
                        if not quarantine:
                            exhausted = True
                        break
                    inflight[ex.submit(execute_task, t, item_fn)] = t
                if not inflight:
                    break
                done, _ = wait(inflight, return_when=FIRST_COMPLETED)
                for f in done:
                    t = inflight.pop(f)
                    try:
                        row = f.result()
                    except BrokenProcessPool:
                        lost.append(t)
                        continue
                    except (Exception, SystemExit) as exc:  # noqa: BLE001
                        # raised outside the item function's own error handling (a
                        # sys.exit in the item, a result that does not pickle)
                        row = {"id": t.id, "line": t.line, "seed": t.seed, "elapsed": 0.0,
                               "error": f"worker: {type(exc).__name__}: {exc}"}
                    on_row(row)
                if lost:
                    lost.extend(inflight.values())
                    inflight.clear()
                    break
        except BaseException:
            _stop_pool(ex)
            raise
        ex.shutdown(wait=True, cancel_futures=True)
        if len(lost) == 1:
            t = lost[0]
            on_row({"id": t.id, "line": t.line, "seed": t.seed, "elapsed": 0.0,
                    "error": "the worker process died while running this item"})
        else:
            suspects.extend(lost)


def _stop_pool(ex: ProcessPoolExecutor) -> None:
    procs = list(getattr(ex, "_processes", {}).values())
    for p in procs:
        try:
            p.terminate()
        except (OSError, AttributeError):
            pass
    ex.shutdown(wait=False, cancel_futures=True)
    for p in procs:
        p.join(timeout=5)


def _run_dask(tasks: Iterator[ItemTask], address, item_fn, on_row, on_lost) -> None:
    """Run tasks on a dask.distributed cluster through its futures interface, with at
    most twice the cluster's thread count in flight. An item whose task fails in Dask
    itself (a lost worker) gets no row: it is counted by ``on_lost`` and ``--resume``
    runs it again."""
    try:
        from distributed import Client, as_completed
    except ImportError:
        raise InputError("--dask needs dask.distributed: pip install 'plait[cluster]'") \
            from None
    own = not hasattr(address, "submit")
    try:
        client = Client(address, timeout="20s") if own else address
    except (OSError, TimeoutError, ValueError) as exc:
        raise InputError(f"--dask: cannot connect to {address}: {exc}") from None
    try:
        threads = sum(client.nthreads().values()) or 1
        source = iter(tasks)
        futures: dict = {}
        ac = as_completed()

        def submit_next() -> None:
            t = next(source, None)
            if t is not None:
                f = client.submit(execute_task, t, item_fn, pure=False,
                                  key=f"plait-item-{run_folder_name(t.id)}-{os.urandom(4).hex()}")
                futures[f] = t
                ac.add(f)

        for _ in range(2 * threads):
            submit_next()
        for f in ac:
            t = futures.pop(f)
            if f.status == "finished":
                on_row(f.result())
            else:
                on_lost(t, f.exception())
            f.release()
            submit_next()
    finally:
        if own:
            client.close()


# -- the batch --------------------------------------------------------------------------
def run_batch(input_path: str | os.PathLike | None, out: str | os.PathLike, *,
              seed: int | None = None, steps: int | None = None, time: float | None = None,
              strategy: str | None = None, bridge: bool = False, workers: int | None = None,
              shard: tuple[int, int] | str | None = None, resume: bool = False,
              dask: object = None, quiet: bool = False, search_options: dict | None = None,
              item_fn: Callable[[ItemTask], dict] = search_item) -> BatchOutcome:
    """Run (or continue) a batch: every item of ``input_path`` in this shard gets a run
    folder under ``out/runs`` and exactly one row in ``out/results.jsonl``.

    Parameters
    ----------
    input_path : path or None
        JSON Lines or plain text, read by :func:`plait.formats.iter_batch_lines`. With
        ``resume`` it may be ``None`` (the path stored in ``batch.json``); it must hold
        the same bytes as when the batch started.
    out : path
        The batch folder.
    seed, steps, time, strategy, bridge : optional
        Batch seed (each item's seed is :func:`item_seed`), step and time budget per
        item (default ``time=10`` when neither is given), search strategy, and whether
        to run the bridge report instead of the plain reduction. On ``resume`` they are
        read from ``batch.json``; a given value must agree with it.
    workers : int, optional
        Worker processes (default: the number of cores).
    shard : (K, N) or "K/N", optional
        Process only the items with :func:`shard_of` ``(id, N) == K``.
    resume : bool
        Continue the batch in ``out``; rows already written are kept, a torn last line
        is cut, items with a run folder continue from it.
    dask : str or distributed.Client, optional
        Scheduler address (or a client): run items on that cluster instead of local
        processes. Workers must see ``out`` at the same path (a shared file system).
    quiet : bool
        No progress bar.
    search_options : dict, optional
        Extra keyword arguments of :func:`plait.search.api.reduce` for every item (for
        example ``objective``, ``params``, ``checkpoint_every``); kept in ``batch.json``.
        Not used with ``bridge``.
    item_fn : callable
        ``ItemTask -> dict``; :func:`search_item` (the search) by default. Must be a
        module-level function (it is pickled to the workers).

    Returns
    -------
    BatchOutcome

    Raises
    ------
    InputError
        For a bad input file, duplicate ids, a folder that already holds a batch
        (without ``resume``) or options that disagree with the batch being resumed.

    Notes
    -----
    Exactly once: only this (parent) process appends to ``results.jsonl``, one line per
    ``write`` followed by fsync, and an item counts as done exactly when its row is in
    the file. After a kill at any moment, the rows present are complete items, the torn
    tail (if any) is discarded, and ``resume`` runs the rest. Workers never write rows,
    so a worker killed mid-item leaves only its run folder, which the next attempt
    continues.
    """
    started = _now()
    shard = parse_shard(shard) if isinstance(shard, str) else shard
    if workers is not None and workers < 1:
        raise InputError(f"--workers must be at least 1, got {workers}")
    if steps is not None and steps < 0:
        raise InputError(f"--steps must be non-negative, got {steps}")
    if time is not None and not (time > 0 and math.isfinite(time)):
        raise InputError(f"--time must be a positive number of seconds, got {time}")
    if item_fn is search_item:
        _check_search_options(strategy, search_options)
    out = Path(out).resolve()
    if out.exists() and not out.is_dir():
        raise InputError(f"--out {out} is a file, not a folder")
    inp = None if input_path is None else Path(input_path).resolve()
    if resume and not (out / CONFIG_FILE).exists():
        raise InputError(f"{out}: no batch to resume (no {CONFIG_FILE})")
    if inp is not None and not inp.is_file():
        raise InputError(f"file not found: {input_path}" if not inp.exists()
                         else f"{input_path} is not a file")
    out.mkdir(parents=True, exist_ok=True)
    with _batch_lock(out):
        cfg, items = _config(out, inp, seed=seed, steps=steps, time_budget=time,
                             strategy=strategy, bridge=bridge, shard=shard,
                             search_options=search_options, resume=resume)
        shard = None if cfg["shard"] is None else tuple(cfg["shard"])
        share = [it for it in items if _in_shard(it.id, shard)]
        results = out / RESULTS_FILE
        rows = read_rows(results, repair=True)
        done = {r["id"] for r in rows}
        todo = [it for it in share if it.id not in done]
        if not todo:
            summary_path = out / SUMMARY_FILE
            if summary_path.exists() and (out / CSV_FILE).exists():
                try:
                    summary = json.loads(summary_path.read_text(encoding="utf-8"))
                    if summary.get("complete") and summary.get("done") == len(rows):
                        return BatchOutcome(summary, 0, 0, str(out))
                except (OSError, json.JSONDecodeError):
                    pass
            summary = summarize(rows, len(share), _now() - started)
            _write_outputs(out, rows, summary)
            return BatchOutcome(summary, 0, 0, str(out))
        return _execute(cfg, out, todo, share, rows, workers=workers, dask=dask, quiet=quiet,
                        item_fn=item_fn, started=started)


def _check_search_options(strategy: str | None, options: dict | None) -> None:
    """Refuse a strategy name or a search option that every item would fail on."""
    import inspect

    from plait.search.api import reduce
    from plait.search.portfolio import STRATEGY_NAMES

    if strategy is not None and strategy not in STRATEGY_NAMES:
        raise InputError(f"--strategy: unknown name {strategy!r} (choose from "
                         f"{', '.join(STRATEGY_NAMES)})")
    own = {"presentation", "strategy", "time", "steps", "seed", "run_dir", "quiet",
           "handle_signals"}
    allowed = (set(inspect.signature(reduce).parameters) - own) | {"hunt"}  # hunt: --bridge
    for key in options or {}:
        if key not in allowed:
            raise InputError(f"search option {key!r} is not one of {', '.join(sorted(allowed))}")


def _now() -> float:
    return time.monotonic()


def _execute(cfg: dict, out: Path, todo: list[BatchItem], share: list[BatchItem],
             rows: list[dict], *, workers, dask, quiet, item_fn, started) -> BatchOutcome:
    from tqdm import tqdm

    results = out / RESULTS_FILE
    runs = out / RUNS_DIR
    runs.mkdir(exist_ok=True)
    state = {"written": 0, "improved": sum(_improved(r) for r in rows),
             "errors": sum(1 for r in rows if r.get("error")), "lost": 0,
             "csv_at": _now()}
    bar = tqdm(total=len(share), initial=len(rows), unit="item", desc="batch",
               disable=True if quiet else None,  # None: off when stderr is no terminal
               dynamic_ncols=True, file=sys.stderr, smoothing=0.1)

    def on_row(row: dict) -> None:
        append_line_durable(results, json.dumps(row, separators=(", ", ": ")))
        rows.append(row)
        state["written"] += 1
        state["improved"] += _improved(row)
        state["errors"] += bool(row.get("error"))
        bar.set_postfix(improved=state["improved"], errors=state["errors"], refresh=False)
        bar.update(1)
        if _now() - state["csv_at"] > CSV_EVERY:
            write_text_atomic(out / CSV_FILE, rows_to_csv(_ordered(rows)))
            state["csv_at"] = _now()

    def on_lost(task: ItemTask, exc: BaseException | None) -> None:
        state["lost"] += 1
        bar.write(f"plait batch: item {task.id!r} did not finish ({exc!r}); "
                  "run with --resume to retry it")

    def tasks() -> Iterator[ItemTask]:
        for it in todo:
            s = item_seed(cfg["seed"], it.id)
            if it.presentation is None:
                on_row(_input_error_row(it, s))
                continue
            yield ItemTask(id=it.id, line=it.line, seed=s,
                           presentation=presentation_to_obj(it.presentation),
                           run_dir=str(runs / run_folder_name(it.id)), steps=cfg["steps"],
                           time=cfg["time"], strategy=cfg["strategy"], bridge=cfg["bridge"],
                           options=cfg.get("search_options"))

    old_term = _raise_on_sigterm()
    try:
        if dask is not None:
            _run_dask(tasks(), dask, item_fn, on_row, on_lost)
        else:
            _run_local(tasks(), workers or os.cpu_count() or 1, item_fn, on_row, on_lost)
    finally:
        bar.close()
        _restore_sigterm(old_term)
    summary = summarize(rows, len(share), _now() - started)
    _write_outputs(out, rows, summary)
    return BatchOutcome(summary, state["written"], state["lost"], str(out))


def _raise_on_sigterm():
    """Make SIGTERM behave like Ctrl-C in the parent (stop workers, keep rows)."""
    def handler(signum, frame):  # noqa: ARG001
        raise KeyboardInterrupt

    try:
        return signal.signal(signal.SIGTERM, handler)
    except ValueError:  # not the main thread
        return None


def _restore_sigterm(old) -> None:
    if old is not None:
        try:
            signal.signal(signal.SIGTERM, old)
        except ValueError:
            pass


# -- merging shards ---------------------------------------------------------------------
def merge_batches(folders: list[str | os.PathLike], out: str | os.PathLike) -> dict:
    """Combine the folders of the shards of one batch into ``out``: ``results.jsonl`` and
    ``results.csv`` in input order, ``summary.json`` (and ``summary.svg``), and a
    ``batch.json`` naming the shards. Run folders stay where they are (rows keep their
    paths).

    Raises
    ------
    InputError
        When the folders are not shards of one batch (different input, seed, budgets or
        shard count), a shard appears twice, or two shards hold the same id.
    """
    if not folders:
        raise InputError("batch-merge: give at least one shard folder")
    out = Path(out).resolve()
    cfgs, all_rows, seen_shards = [], {}, set()
    keys = ("input_sha256", "seed", "steps", "time", "strategy", "bridge", "search_options",
            "items_total")
    for folder in folders:
        folder = Path(folder).resolve()
        cfg_path = folder / CONFIG_FILE
        try:
            cfg = json.loads(cfg_path.read_text(encoding="utf-8"))
        except FileNotFoundError:
            raise InputError(f"{folder}: not a batch folder (no {CONFIG_FILE})") from None
        except (OSError, json.JSONDecodeError) as exc:
            raise InputError(f"{cfg_path}: unreadable ({exc})") from None
        if cfg.get("format") != BATCH_FORMAT or cfg.get("merged_from") is not None:
            raise InputError(f"{folder}: not a shard folder of a plait batch")
        if cfgs:
            for k in keys:
                if cfg.get(k) != cfgs[0].get(k):
                    raise InputError(f"{folder}: {k} = {cfg.get(k)!r} differs from "
                                     f"{folders[0]} ({cfgs[0].get(k)!r}); not one batch")
        shard = tuple(cfg["shard"]) if cfg.get("shard") is not None else (0, 1)
        if cfgs and shard[1] != (tuple(cfgs[0]["shard"]) if cfgs[0].get("shard") else (0, 1))[1]:
            raise InputError(f"{folder}: shard {shard[0]}/{shard[1]} is from another split")
        if shard in seen_shards:
            raise InputError(f"{folder}: shard {shard[0]}/{shard[1]} given twice")
        seen_shards.add(shard)
        cfgs.append(cfg)
        for row in read_rows(folder / RESULTS_FILE):
            if row["id"] in all_rows:
                raise InputError(f"{folder}: id {row['id']!r} is also in another shard")
            all_rows[row["id"]] = row
    if out in {Path(f).resolve() for f in folders}:
        raise InputError("batch-merge: --out must be a new folder, not one of the shards")
    out_cfg = out / CONFIG_FILE
    if out_cfg.exists():
        try:
            old = json.loads(out_cfg.read_text(encoding="utf-8"))
        except (OSError, json.JSONDecodeError):
            old = {}
        if old.get("merged_from") is None:
            raise InputError(f"{out} holds a batch that is not a merge; choose another --out")
    elif (out / RESULTS_FILE).exists():
        raise InputError(f"{out} holds results; choose another --out")
    n = cfgs[0]["shard"][1] if cfgs[0].get("shard") else 1
    merged = {k: cfgs[0].get(k) for k in ("format", "input") + keys}
    merged.update({"shard": None, "items": cfgs[0]["items_total"],
                   "merged_from": [str(Path(f).resolve()) for f in folders],
                   "shards_present": sorted(k for k, _ in seen_shards), "shard_count": n})
    rows = _ordered(all_rows.values())
    out.mkdir(parents=True, exist_ok=True)
    with _batch_lock(out):
        write_json_atomic(out_cfg, merged)
        write_text_atomic(out / RESULTS_FILE,
                          "".join(json.dumps(r, separators=(", ", ": ")) + "\n" for r in rows))
        summary = summarize(rows, cfgs[0]["items_total"])
        summary["shards_present"] = merged["shards_present"]
        summary["shard_count"] = n
        _write_outputs(out, rows, summary)
    return summary


def strip_volatile(row: dict) -> dict:
    """A row without its timing and path fields (for comparing two runs of a batch)."""
    return {k: v for k, v in row.items() if k not in VOLATILE_FIELDS}
