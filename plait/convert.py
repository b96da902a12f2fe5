"""Conversions between presentations: closed braid and PD code to plat."""

from __future__ import annotations

from plait.diagrams.pd import PDCode
from plait.errors import InputError
from plait.formats import Presentation
from plait.word import ClosedBraid, PlatWord

__all__ = ["to_plat"]


def to_plat(p: Presentation, **options) -> PlatWord:
    """Plat word with the same closure as the presentation ``p``.

    A plat is returned as is; a closed braid goes through
    :meth:`ClosedBraid.to_plat`; a PD code goes through
    :func:`plait.diagrams.fromdiagram.pd_to_plat` (keyword ``options`` are passed on).
    """
    if isinstance(p, PlatWord):
        return p
    if isinstance(p, ClosedBraid):
        return p.to_plat()
    if isinstance(p, PDCode):
        from plait.diagrams.fromdiagram import pd_to_plat

        return pd_to_plat(p, **options)
    raise InputError(f"not a presentation: {type(p).__name__}")
