"""Search strategies over the move graph, run folders, and batches."""

from __future__ import annotations

__all__ = ["reduce", "resume", "ReduceResult"]


def __getattr__(name: str):
    # Imported on first use so that ``import plait.search.<module>`` stays light.
    if name in __all__:
        from plait.search import api

        return getattr(api, name)
    raise AttributeError(f"module 'plait.search' has no attribute {name!r}")
