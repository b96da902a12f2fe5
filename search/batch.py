"""Batches of presentations: one run folder and one results row per item, written exactly once."""

from __future__ import annotations

import json
import math
import os
import sys
import time
from collections.abc import Callable, Iterator
from dataclasses import dataclass
from pathlib import Path

from plait.atomic import append_line_durable, write_json_atomic, write_text_atomic
from plait.errors import InputError
from plait.formats import BatchItem, presentation_to_obj
from plait.search.batch_dask import run_dask
from plait.search.batch_files import (
    BATCH_FORMAT,
    CONFIG_FILE,
    CSV_FILE,
    RESULTS_FILE,
    RUNS_DIR,
    SUMMARY_FILE,
    batch_lock,
    improved,
    ordered_rows,
    read_items,
    read_rows,
    rows_to_csv,
    sha256_file,
    summarize,
    write_outputs,
)
from plait.search.batch_pool import (
    ItemTask,
    input_error_row,
    raise_on_sigterm,
    restore_sigterm,
    run_local,
    search_item,
)
from plait.search.batch_shards import in_shard, item_seed, parse_shard, run_folder_name

__all__ = [
    "BatchOutcome",
    "run_batch",
]

CSV_EVERY = 60.0  # seconds between rewrites of results.csv while a batch runs


# -- the batch folder -------------------------------------------------------------------
@dataclass
class BatchOutcome:
    """What :func:`run_batch` did: the summary, the rows written by this call, and the
    items it could not finish (lost Dask workers; run ``--resume`` again)."""

    summary: dict
    written: int
    unfinished: int
    out: str


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
        items = read_items(input_path)
        if steps is None and time_budget is None:
            time_budget = 10.0
        cfg = {
            "format": BATCH_FORMAT,
            "input": str(input_path),
            "input_sha256": sha256_file(input_path),
            "seed": 0 if seed is None else int(seed),
            "steps": steps,
            "time": time_budget,
            "strategy": strategy or "auto",
            "search_options": search_options or None,
            "bridge": bool(bridge),
            "shard": None if shard is None else list(shard),
            "items_total": len(items),
            "items": sum(1 for it in items if in_shard(it.id, shard)),
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
    if sha256_file(path) != cfg["input_sha256"]:
        raise InputError(f"--resume: {path} changed since the batch started "
                         "(sha256 differs); start a new batch")
    return cfg, read_items(path)


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
    with batch_lock(out):
        cfg, items = _config(out, inp, seed=seed, steps=steps, time_budget=time,
                             strategy=strategy, bridge=bridge, shard=shard,
                             search_options=search_options, resume=resume)
        shard = None if cfg["shard"] is None else tuple(cfg["shard"])
        share = [it for it in items if in_shard(it.id, shard)]
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
            write_outputs(out, rows, summary)
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
    state = {"written": 0, "improved": sum(improved(r) for r in rows),
             "errors": sum(1 for r in rows if r.get("error")), "lost": 0,
             "csv_at": _now()}
    bar = tqdm(total=len(share), initial=len(rows), unit="item", desc="batch",
               disable=True if quiet else None,  # None: off when stderr is no terminal
               dynamic_ncols=True, file=sys.stderr, smoothing=0.1)

    def on_row(row: dict) -> None:
        append_line_durable(results, json.dumps(row, separators=(", ", ": ")))
        rows.append(row)
        state["written"] += 1
        state["improved"] += improved(row)
        state["errors"] += bool(row.get("error"))
        bar.set_postfix(improved=state["improved"], errors=state["errors"], refresh=False)
        bar.update(1)
        if _now() - state["csv_at"] > CSV_EVERY:
            write_text_atomic(out / CSV_FILE, rows_to_csv(ordered_rows(rows)))
            state["csv_at"] = _now()

    def on_lost(task: ItemTask, exc: BaseException | None) -> None:
        state["lost"] += 1
        bar.write(f"plait batch: item {task.id!r} did not finish ({exc!r}); "
                  "run with --resume to retry it")

    def tasks() -> Iterator[ItemTask]:
        for it in todo:
            s = item_seed(cfg["seed"], it.id)
            if it.presentation is None:
                on_row(input_error_row(it, s))
                continue
            yield ItemTask(id=it.id, line=it.line, seed=s,
                           presentation=presentation_to_obj(it.presentation),
                           run_dir=str(runs / run_folder_name(it.id)), steps=cfg["steps"],
                           time=cfg["time"], strategy=cfg["strategy"], bridge=cfg["bridge"],
                           options=cfg.get("search_options"))

    old_term = raise_on_sigterm()
    try:
        if dask is not None:
            run_dask(tasks(), dask, item_fn, on_row, on_lost)
        else:
            run_local(tasks(), workers or os.cpu_count() or 1, item_fn, on_row, on_lost)
    finally:
        bar.close()
        restore_sigterm(old_term)
    summary = summarize(rows, len(share), _now() - started)
    write_outputs(out, rows, summary)
    return BatchOutcome(summary, state["written"], state["lost"], str(out))
