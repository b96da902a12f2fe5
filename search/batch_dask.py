"""Batch items on a Dask cluster through dask.distributed's futures interface."""

from __future__ import annotations

import os
from collections.abc import Iterator

from plait.errors import InputError
from plait.search.batch_pool import ItemTask, execute_task
from plait.search.batch_shards import run_folder_name

__all__ = ["run_dask"]


def run_dask(tasks: Iterator[ItemTask], address, item_fn, on_row, on_lost) -> None:
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
