"""Batch workers: one item as a task and a row, and the local pool of worker processes."""

from __future__ import annotations

import multiprocessing
import os
import signal
import time
from collections import deque
from collections.abc import Callable, Iterator
from concurrent.futures import FIRST_COMPLETED, ProcessPoolExecutor, wait
from concurrent.futures.process import BrokenProcessPool
from dataclasses import dataclass
from pathlib import Path

from plait.errors import InputError, PlaitError
from plait.formats import BatchItem, presentation_from_obj

__all__ = ["ItemTask", "search_item", "execute_task", "input_error_row", "run_local",
           "raise_on_sigterm", "restore_sigterm"]


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


def input_error_row(item: BatchItem, seed: int) -> dict:
    return {"id": item.id, "line": item.line, "seed": seed, "elapsed": 0.0,
            "error": item.error}


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


def run_local(tasks: Iterator[ItemTask], workers: int, item_fn, on_row, _on_lost) -> None:
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


def raise_on_sigterm():
    """Make SIGTERM behave like Ctrl-C in the parent (stop workers, keep rows)."""
    def handler(signum, frame):  # noqa: ARG001
        raise KeyboardInterrupt

    try:
        return signal.signal(signal.SIGTERM, handler)
    except ValueError:  # not the main thread
        return None


def restore_sigterm(old) -> None:
    if old is not None:
        try:
            signal.signal(signal.SIGTERM, old)
        except ValueError:
            pass
