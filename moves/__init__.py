"""The move graph of plat presentations: pairing-subgroup moves, rewrites, stabilization."""

from plait.moves.canonical import canonical, canonical_with_moves
from plait.moves.certificate import load_certificate, verify_certificate, write_certificate
from plait.moves.graph import apply_move, handle_shorten, neighbor_deltas, neighbors
from plait.moves.pairing import artin_action, generator_word, in_pairing_subgroup
from plait.moves.records import (
    BOTTOM,
    BRIDGE_REDUCING_KINDS,
    DEFAULT_KINDS,
    GROWING_KINDS,
    LENGTH_REDUCING_KINDS,
    MOVE_KINDS,
    NEUTRAL_KINDS,
    PAIRING_KINDS,
    TOP,
    MoveRecord,
)
from plait.moves.replay import ReplayResult, replay
from plait.moves.stabilize import (
    destab_sites,
    destabilize_all,
    isolating_moves,
    seek_destabilization,
)
from plait.moves.walk import random_walk, scramble

__all__ = [
    "MoveRecord",
    "MOVE_KINDS",
    "PAIRING_KINDS",
    "NEUTRAL_KINDS",
    "LENGTH_REDUCING_KINDS",
    "BRIDGE_REDUCING_KINDS",
    "GROWING_KINDS",
    "DEFAULT_KINDS",
    "TOP",
    "BOTTOM",
    "neighbors",
    "neighbor_deltas",
    "apply_move",
    "handle_shorten",
    "replay",
    "ReplayResult",
    "canonical",
    "canonical_with_moves",
    "destab_sites",
    "destabilize_all",
    "isolating_moves",
    "seek_destabilization",
    "write_certificate",
    "load_certificate",
    "verify_certificate",
    "random_walk",
    "scramble",
    "generator_word",
    "in_pairing_subgroup",
    "artin_action",
]
