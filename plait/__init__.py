"""plait: find minimal plat (bridge) presentations of knots and links.

The Python API mirrors the command line. The core data model:

- :class:`PlatWord` — a braid word on ``2n`` strands read as a plat (``n`` bridges);
- :class:`ClosedBraid` — a braid word read as a closed braid, with ``to_plat()``;
- :class:`PDCode` — a validated planar diagram code.

Parsing: :func:`parse_word`, :func:`parse_pd`, :func:`parse_presentation`,
:func:`read_presentation_file`. Conversion: :func:`to_plat`, :func:`plat_to_pd`.
"""

from plait.convert import to_plat
from plait.diagrams.pd import PDCode, plat_to_pd, validate_pd
from plait.errors import GuardViolation, InputError, PlaitError
from plait.formats import (
    parse_pd,
    parse_presentation,
    parse_word,
    presentation_from_obj,
    presentation_to_obj,
    read_presentation_file,
)
from plait.word import ClosedBraid, PlatWord

__version__ = "0.1.0"

__all__ = [
    "PlatWord",
    "ClosedBraid",
    "PDCode",
    "parse_word",
    "parse_pd",
    "parse_presentation",
    "presentation_from_obj",
    "presentation_to_obj",
    "read_presentation_file",
    "to_plat",
    "plat_to_pd",
    "validate_pd",
    "InputError",
    "GuardViolation",
    "PlaitError",
]
