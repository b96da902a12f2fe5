"""Seeded random walks on the move graph, and the scrambler used by the benchmarks."""

from __future__ import annotations

import random
from collections.abc import Iterable

from plait.moves.graph import _generators, apply_move, neighbor_deltas
from plait.moves.records import (
    BOTTOM,
    MOVE_KINDS,
    PAIRING_KINDS,
    TOP,
    MoveRecord,
)
from plait.moves.stabilize import stab_letters
from plait.word import MAX_STRANDS, PlatWord

__all__ = ["random_walk", "scramble", "random_move", "WALK_KINDS"]

#: Kinds a walk draws from by default, with their weights.
WALK_KINDS = {
    "twist": 1.0, "swap": 1.0, "lthread": 1.0, "rthread": 1.0,
    "insert": 1.0, "commute": 1.5, "braid": 1.5, "cancel": 1.0, "absorb": 0.5,
    "handle": 0.3, "stab": 0.3, "destab": 0.5,
}


def random_move(
    plat: PlatWord, rng: random.Random, kind: str, max_bridges: int | None = None
) -> MoveRecord | None:
    """A uniformly chosen valid move of one kind at ``plat``, or None if there is none.

    Moves with a parameter space (pairing-subgroup factors, insertions, stabilizations)
    are drawn directly; pattern moves are drawn from :func:`neighbor_deltas`.
    """
    s, L = plat.strands, plat.length
    if kind in PAIRING_KINDS:
        gens = [g for g in _generators(s) if g[0] == kind]
        if not gens:
            return None
        k, i, e, _h = rng.choice(gens)
        return MoveRecord(k, (rng.choice((TOP, BOTTOM)), i, e))
    if kind == "insert":
        g = rng.randrange(1, s) * rng.choice((1, -1))
        return MoveRecord("insert", (rng.randrange(L + 1), g))
    if kind == "stab":
        n = s // 2
        if s + 2 > MAX_STRANDS or (max_bridges is not None and n + 1 > max_bridges):
            return None
        j = rng.choice((1, n + 1))  # the end positions are always free
        return MoveRecord("stab", (j, rng.randrange(L + 1), rng.choice(stab_letters(j, s))))
    options = [rec for rec, _ in neighbor_deltas(plat, (kind,))]
    return rng.choice(options) if options else None


def random_walk(
    plat: PlatWord,
    steps: int,
    seed: int,
    kinds: Iterable[str] | dict[str, float] | None = None,
    max_bridges: int | None = None,
) -> tuple[PlatWord, list[MoveRecord]]:
    """A seeded random walk of ``steps`` moves on the move graph.

    Each step draws a move kind (weights :data:`WALK_KINDS`, or equal weights for a given
    set of kinds) and then a uniform valid move of that kind; kinds with no move at the
    current word are redrawn. Every move keeps the link type (Birman 1976).

    Parameters
    ----------
    plat : PlatWord
    steps : int
    seed : int
    kinds : iterable of str or dict of str to float, optional
    max_bridges : int, optional
        Stabilizations are skipped beyond this many bridges.

    Returns
    -------
    (PlatWord, list of MoveRecord)
        The end word and the moves taken (replayable with :func:`plait.moves.replay`).
    """
    rng = random.Random(seed)
    if kinds is None:
        weights = dict(WALK_KINDS)
    elif isinstance(kinds, dict):
        weights = dict(kinds)
    else:
        weights = dict.fromkeys(kinds, 1.0)
    bad = set(weights) - MOVE_KINDS - {"reduce"}
    if bad or "reduce" in weights:
        raise ValueError(f"walks cannot draw the kinds {sorted(bad | ({'reduce'} & set(weights)))}")
    names = sorted(weights)
    w = [weights[k] for k in names]
    records: list[MoveRecord] = []
    cur = plat
    for _ in range(steps):
        for _attempt in range(4 * len(names) + 4):
            kind = rng.choices(names, w)[0]
            rec = random_move(cur, rng, kind, max_bridges)
            if rec is not None:
                break
        else:
            break
        cur = apply_move(cur, rec)
        records.append(rec)
    return cur, records


def scramble(
    plat: PlatWord, seed: int, length_factor: float = 5, stabilizations: int = 2
) -> tuple[PlatWord, list[MoveRecord]]:
    """Hide a plat inside a longer presentation of the same link.

    First ``stabilizations`` stabilizations at the left or right end (at random heights),
    then pairing-subgroup factors at both ends, inserted cancelling pairs, braid
    relations and far commutations, until the word is ``length_factor`` times as long
    (at least 10 letters longer). Used by the scrambled benchmark and for demo data.

    Returns
    -------
    (PlatWord, list of MoveRecord)
    """
    rng = random.Random(seed)
    records: list[MoveRecord] = []
    cur = plat
    for _ in range(stabilizations):
        rec = random_move(cur, rng, "stab")
        if rec is None:
            break
        cur = apply_move(cur, rec)
        records.append(rec)
    target = max(int(length_factor * plat.length), plat.length + 10)
    mix = {"twist": 1.0, "swap": 2.0, "lthread": 1.5, "rthread": 1.5, "insert": 1.0,
           "braid": 3.0, "commute": 1.0}
    names = sorted(mix)
    wts = [mix[k] for k in names]
    guard = 50 * target + 100
    while cur.length < target and guard > 0:
        guard -= 1
        rec = random_move(cur, rng, rng.choices(names, wts)[0])
        if rec is None:
            continue
        cur = apply_move(cur, rec)
        records.append(rec)
    # a last pass of braid relations so the inserted material is interleaved
    for _ in range(cur.length // 2):
        rec = random_move(cur, rng, rng.choice(("braid", "commute")))
        if rec is not None:
            cur = apply_move(cur, rec)
            records.append(rec)
    return cur, records
