"""Objectives, knot invariants used as guards, and bounds on the bridge number."""

from plait.scoring.alexander import (
    alexander,
    alexander_matrix,
    determinant,
    fox_coloring_dimension,
    fox_matrix,
    invariant_factor_count,
    nakanishi_lower_bound,
)
from plait.scoring.fingerprint import Fingerprint, fingerprint, guard, same_up_to_mirror
from plait.scoring.jones import bracket, jones, mirror_jones
from plait.scoring.orientation import crossing_signs, linking_matrix, trace, writhe

__all__ = [
    "alexander",
    "alexander_matrix",
    "bracket",
    "crossing_signs",
    "determinant",
    "Fingerprint",
    "fingerprint",
    "fox_coloring_dimension",
    "fox_matrix",
    "guard",
    "invariant_factor_count",
    "jones",
    "linking_matrix",
    "mirror_jones",
    "nakanishi_lower_bound",
    "same_up_to_mirror",
    "trace",
    "writhe",
]
