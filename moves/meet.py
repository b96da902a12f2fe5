"""Meet-in-the-middle search for a move path between two plats, over canonical forms."""

from __future__ import annotations

import time as _time
from collections.abc import Iterable

from plait.moves.canonical import canonical_with_moves
from plait.moves.graph import apply_move, neighbor_deltas
from plait.moves.invert import invert_path
from plait.moves.records import DEFAULT_KINDS, MoveRecord
from plait.word import PlatWord

__all__ = ["meet_in_the_middle", "connect"]

#: Kinds tried at every state: far commutation is left out, since the canonical form
#: already identifies words that differ by it.
MEET_KINDS = (DEFAULT_KINDS | frozenset({"turn", "flype"})) - frozenset({"commute"})

Key = tuple[int, tuple[int, ...]]


def _key(p: PlatWord) -> Key:
    return (p.strands, p.word)


def _path(parent: dict[Key, tuple[Key | None, list[MoveRecord]]], k: Key) -> list[MoveRecord]:
    chunks = []
    cur: Key | None = k
    while cur is not None:
        prev, recs = parent[cur]
        chunks.append(recs)
        cur = prev
    out: list[MoveRecord] = []
    for c in reversed(chunks):
        out.extend(c)
    return out


def _steps(p: PlatWord, ks: frozenset[str], max_len: int, compound: bool):
    # (records, plat) for every move of the given kinds, and, when ``compound``, every
    # insertion of a cancelling pair x x^-1 followed by a braid relation that uses one of
    # the inserted letters (alone, an insertion is undone by the canonical form)
    for rec, length in neighbor_deltas(p, ks):
        if length <= max_len + 4:
            yield [rec], apply_move(p, rec)
    if not compound or p.length + 2 > max_len + 2:
        return
    for rec, _len in neighbor_deltas(p, ("insert",)):
        q = apply_move(p, rec)
        pos = rec.args[0]
        for b, _l in neighbor_deltas(q, ("braid",)):
            t = b.args[0]
            if t + 2 >= pos and t <= pos + 1:
                yield [rec, b], apply_move(q, b)


def meet_in_the_middle(
    a: PlatWord,
    b: PlatWord,
    *,
    time_limit: float = 10.0,
    max_states: int = 200_000,
    slack: int = 2,
    kinds: Iterable[str] | None = None,
    compound: bool = True,
    roots_a: list[MoveRecord] | None = None,
    roots_b: list[MoveRecord] | None = None,
) -> tuple[list[MoveRecord], list[MoveRecord]] | None:
    """Search from both plats at once until their canonical forms meet.

    Each side grows a breadth-first tree whose nodes are canonical words
    (:func:`plait.moves.canonical`): a node's children are the canonical forms of its
    neighbours in the move graph. Words longer than the longer start plus ``slack`` and
    plats with more bridges than the larger start are not visited. The side with the
    smaller frontier is expanded next. ``roots_a`` (``roots_b``) is a path from ``a``
    (``b``): every word along it is a root of that side's tree as well (its length not
    limited by ``slack``).

    Returns
    -------
    (list of MoveRecord, list of MoveRecord) or None
        Paths from ``a`` and from ``b`` to a common word, or None when the budget ran out
        (``time_limit`` seconds or ``max_states`` nodes on both sides together).

    References
    ----------
    .. [1] I. Pohl, "Bi-directional search", Machine Intelligence 6 (1971).
    .. [2] J. S. Birman, "On the stable equivalence of plat representations of knots and
       links", Canad. J. Math. 28 (1976).
    """
    ks = MEET_KINDS if kinds is None else frozenset(kinds)
    deadline = _time.monotonic() + time_limit
    # parent[s][key] = (parent key or None at a root, records from the parent's word
    # (from the start plat at a root) to this canonical word)
    parent: list[dict[Key, tuple[Key | None, list[MoveRecord]]]] = [{}, {}]
    frontier: list[list[PlatWord]] = [[], []]
    ends: list[PlatWord] = []  # the canonical form at the end of each side's path
    for side, (start, extra) in enumerate(((a, roots_a), (b, roots_b))):
        # every word along a known path from the start is a root too
        roots = [(start, [])]
        if extra:
            cur, done = start, []
            for rec in extra:
                cur = apply_move(cur, rec)
                done.append(rec)
                roots.append((cur, list(done)))
        for plat, recs in roots:
            c, rc = canonical_with_moves(plat)
            k = _key(c)
            if k not in parent[side]:
                parent[side][k] = (None, [*recs, *rc])
                frontier[side].append(c)
        ends.append(frontier[side][-1])
    common = [k for k in parent[0] if k in parent[1]]
    if common:
        return _path(parent[0], common[0]), _path(parent[1], common[0])
    max_len = max(e.length for e in ends) + slack
    max_strands = max(e.strands for e in ends)
    frontier = [[p for p in f if p.length <= max_len and p.strands <= max_strands]
                for f in frontier]
    checks = 0
    while frontier[0] and frontier[1]:
        s = 0 if len(frontier[0]) <= len(frontier[1]) else 1
        mine, other = parent[s], parent[1 - s]
        nxt: list[PlatWord] = []
        for p in frontier[s]:
            pk = _key(p)
            for recs, q in _steps(p, ks, max_len, compound):
                checks += 1
                if checks % 256 == 0 and _time.monotonic() > deadline:
                    return None
                if q.strands > max_strands:
                    continue
                cq, rq = canonical_with_moves(q)
                if cq.length > max_len:
                    continue
                k = _key(cq)
                if k in mine:
                    continue
                mine[k] = (pk, [*recs, *rq])
                if k in other:
                    pa = _path(parent[0], k)
                    pb = _path(parent[1], k)
                    return pa, pb
                nxt.append(cq)
                if len(parent[0]) + len(parent[1]) >= max_states:
                    return None
        frontier[s] = nxt
    return None


def connect(a: PlatWord, b: PlatWord, **options) -> list[MoveRecord] | None:  # noqa: D417
    """Records taking ``a`` to ``b`` (forward moves from ``a`` to the meeting word, then
    the inverted moves of ``b``'s side; ``options`` go to :func:`meet_in_the_middle`),
    or None when
    :func:`meet_in_the_middle` finds no meeting within its budget."""
    found = meet_in_the_middle(a, b, **options)
    if found is None:
        return None
    pa, pb = found
    return pa + invert_path(b, pb)
