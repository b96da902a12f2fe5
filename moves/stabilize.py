"""Stabilization and destabilization of plats at any pair position, and ways to find them."""

from __future__ import annotations

from collections.abc import Iterator, Sequence

from plait.moves.records import MoveRecord, fast_plat
from plait.word import PlatWord

__all__ = [
    "stabilize_word",
    "destabilize_word",
    "stab_letters",
    "pair_touch",
    "destab_sites",
    "destabilize_all",
    "isolating_moves",
    "seek_destabilization",
]


def stab_letters(j: int, strands: int) -> tuple[int, ...]:
    """Letters allowed for a stabilization that creates pair ``j`` on ``strands + 2``
    strands: sigma_{2j-2}^{+-1} (with the left neighbour) and sigma_{2j}^{+-1} (right)."""
    n_new = strands // 2 + 1
    out: list[int] = []
    if j >= 2:
        out += [2 * j - 2, -(2 * j - 2)]
    if j <= n_new - 1:
        out += [2 * j, -2 * j]
    return tuple(out)


def stabilize_word(word: Sequence[int], strands: int, j: int, p: int, g: int) -> tuple[int, ...]:
    """Letters after a stabilization creating pair ``j`` with crossing ``g`` at ``p``.

    The new pair occupies strands ``2j-1, 2j``; old generators on index ``>= 2j-1`` move
    up by two. The new pair's two strands run straight from its cap to its cup except
    for the one crossing ``g`` with a neighbouring strand, so the pair bounds a kink
    (a Reidemeister I loop): the closure is unchanged. For ``j = n + 1`` and ``g`` on
    index ``2n`` this is Birman's stabilization ``b -> b sigma_{2n}^{+-1}`` (at ``p = L``);
    for an inner ``j`` no old letter may sit on index ``2j - 2`` (caller checks).

    References
    ----------
    .. [1] J. S. Birman, "On the stable equivalence of plat representations of knots and
       links", Canad. J. Math. 28 (1976).
    """
    lo = 2 * j - 1
    shifted = [x + 2 if x >= lo else (x - 2 if x <= -lo else x) for x in word]
    shifted.insert(p, g)
    return tuple(shifted)


def destabilize_word(word: Sequence[int], strands: int, j: int, p: int) -> tuple[int, ...]:
    """Letters after removing pair ``j`` whose only crossing is letter ``p`` (see
    :func:`destab_sites`); generators above the pair move down by two."""
    hi = 2 * j + 1
    out = []
    for q, x in enumerate(word):
        if q == p:
            continue
        out.append(x - 2 if x >= hi else (x + 2 if x <= -hi else x))
    return tuple(out)


def pair_touch(word: Sequence[int], strands: int) -> tuple[list[int], list[int]]:
    """For every pair ``j`` (index ``j - 1``): how many letters touch its strands, and
    the position of the last such letter (-1 if none).

    Letter sigma_k touches the strands ``k`` and ``k + 1``, so an odd ``k`` touches pair
    ``(k + 1) / 2`` and an even ``k`` touches pairs ``k / 2`` and ``k / 2 + 1``.
    """
    n = strands // 2
    count = [0] * (n + 2)
    last = [-1] * (n + 2)
    for p, x in enumerate(word):
        k = x if x > 0 else -x
        if k & 1:
            j = (k + 1) >> 1
            count[j] += 1
            last[j] = p
        else:
            j = k >> 1
            count[j] += 1
            last[j] = p
            count[j + 1] += 1
            last[j + 1] = p
    return count[1 : n + 1], last[1 : n + 1]


def destab_sites(word: Sequence[int], strands: int) -> list[tuple[int, int]]:
    """Every ``(j, p)`` where pair ``j`` can be removed by a destabilization.

    Pattern: exactly one letter touches the strands of pair ``j`` and it is
    sigma_{2j-2}^{+-1} or sigma_{2j}^{+-1}. Then the pair's cap, its two strands and its
    cup form a kink on the neighbouring strand, whatever the other letters are; removing
    it is the inverse of :func:`stabilize_word`. A plat with one pair is never reduced.
    """
    if strands < 4:
        return []
    count, last = pair_touch(word, strands)
    out = []
    for j0, c in enumerate(count):
        if c == 1:
            p = last[j0]
            if not word[p] & 1:
                out.append((j0 + 1, p))
    return out


def destabilize_all(
    plat: PlatWord, seek: int = 0, explore: int = 0
) -> tuple[PlatWord, list[MoveRecord]]:
    """Canonicalize and destabilize until no stabilization pattern is left.

    Each round puts the word in canonical form (free reduction, end absorption, far
    commutation normal form; recorded as moves) and removes the first pair found by
    :func:`destab_sites`. With ``seek > 0``, up to that many greedy steps of
    :func:`isolating_moves` are also taken when no pattern is present, each strictly
    lowering (fewest letters touching a pair, length). With ``explore > 0``, when no
    greedy step helps, :func:`seek_destabilization` looks through up to that many words
    for one with a stabilization pattern; a success counts as one of the ``seek`` steps.

    Returns
    -------
    (PlatWord, list of MoveRecord)
        The final plat and the moves from ``plat`` to it.
    """
    from plait.moves.canonical import canonical_with_moves

    records: list[MoveRecord] = []
    cur, rec = canonical_with_moves(plat)
    records += rec
    steps_left = seek
    while True:
        sites = destab_sites(cur.word, cur.strands)
        if sites:
            j, p = sites[0]
            records.append(MoveRecord("destab", (j, p)))
            cur = fast_plat(cur.strands - 2, destabilize_word(cur.word, cur.strands, j, p))
            cur, rec = canonical_with_moves(cur)
            records += rec
            continue
        if steps_left <= 0:
            break
        best = next(iter(isolating_moves(cur)), None)
        if best is None and explore > 0:
            found = seek_destabilization(cur, budget=explore)
            if found is not None:
                best = (found[0], found[1], None)
        if best is None:
            break
        steps_left -= 1
        recs, cur, _key = best
        records += recs
    return cur, records


def _isolation_key(word: Sequence[int], strands: int) -> tuple[int, int]:
    count, _ = pair_touch(word, strands)
    touched = [c for c in count if c > 0]
    return (min(touched) if touched else 0, len(word))


def isolating_moves(
    plat: PlatWord, kinds: frozenset[str] | None = None
) -> Iterator[tuple[list[MoveRecord], PlatWord, tuple[int, int]]]:
    """Moves that bring some pair closer to the stabilization pattern, best first.

    Each single move of the given kinds (default: pairing-subgroup multiplications at
    both ends, braid relations and handle reductions) is followed by canonicalization;
    the result is kept when its key ``(fewest letters touching one pair, length)`` is
    lexicographically smaller than that of ``plat``. A pair touched by one even letter
    can be destabilized (:func:`destab_sites`), so lowering the first entry works towards
    removing a bridge, and multiplying by a pairing-subgroup generator at an end is
    what pushes crossings off a pair through end absorption.

    Yields
    ------
    (list of MoveRecord, PlatWord, (int, int))
        The move followed by its canonicalization records, the new plat and its key,
        in increasing key order.
    """
    from plait.moves.canonical import canonical_with_moves
    from plait.moves.graph import apply_move, neighbor_deltas
    from plait.moves.records import PAIRING_KINDS

    if kinds is None:
        kinds = PAIRING_KINDS | {"braid", "handle"}
    base = _isolation_key(plat.word, plat.strands)
    found = []
    seen = set()
    for rec, _len in neighbor_deltas(plat, kinds):
        nxt = apply_move(plat, rec)
        can, crec = canonical_with_moves(nxt)
        if can.word in seen:
            continue
        seen.add(can.word)
        key = _isolation_key(can.word, can.strands)
        if key < base:
            found.append((key, len(found), [rec, *crec], can))
    found.sort(key=lambda t: (t[0], t[1]))
    for key, _, recs, can in found:
        yield recs, can, key


def _seek_key(word: Sequence[int], strands: int) -> tuple[int, int, int]:
    # (fewest letters on one touched pair, the two fewest together, length)
    count, _ = pair_touch(word, strands)
    t = sorted(c for c in count if c > 0)
    return (t[0] if t else 0, sum(t[:2]), len(word))


def seek_destabilization(
    plat: PlatWord,
    budget: int = 2000,
    slack: int = 8,
    kinds: frozenset[str] | None = None,
) -> tuple[list[MoveRecord], PlatWord] | None:
    """Best-first search for a nearby word with a stabilization pattern.

    Greedy isolation can stall: a destabilization is often reached only through words
    that are longer and no more isolated (for the figure-eight knot's 3-bridge plat
    ``2 4 -3 2 -3 -4``, a pair-threading factor, a handle reduction and a braid relation
    lead to the kink ``-2 -2 4 3 -2``). Words are compared in canonical form and
    expanded in order of ``(fewest letters touching one pair, the two fewest together,
    length)``, by moves of the given kinds (default: pairing-subgroup factors, braid
    relations, handle reductions); words more than ``slack`` letters longer than
    ``plat`` are dropped, and at most ``budget`` distinct words are generated.

    Returns
    -------
    (list of MoveRecord, PlatWord) or None
        The moves (each followed by its canonicalization records) to a canonical word
        where :func:`destab_sites` finds a pair, or None.
    """
    import heapq

    from plait.moves.canonical import canonical, canonical_with_moves
    from plait.moves.graph import apply_move, neighbor_deltas
    from plait.moves.records import PAIRING_KINDS

    if kinds is None:
        kinds = PAIRING_KINDS | {"braid", "handle"}
    if plat.strands < 4:
        return None
    start = canonical(plat)
    # parent[word] = (parent word, move) along the first path that reached the word
    parent: dict[tuple[int, ...], tuple[tuple[int, ...], MoveRecord] | None] = {
        start.word: None
    }
    heap = [(_seek_key(start.word, start.strands), 0, start)]
    cap = plat.length + slack
    goal = None
    tick = 0
    while heap and goal is None and len(parent) < budget:
        _, _, p = heapq.heappop(heap)
        for rec, _L in neighbor_deltas(p, kinds):
            c = canonical(apply_move(p, rec))
            if c.word in parent or c.length > cap:
                continue
            parent[c.word] = (p.word, rec)
            if destab_sites(c.word, c.strands):
                goal = c
                break
            tick += 1
            heapq.heappush(heap, (_seek_key(c.word, c.strands), tick, c))
            if len(parent) >= budget:
                break
    if goal is None:
        return None
    path = []
    w = goal.word
    while parent[w] is not None:
        pw, rec = parent[w]
        path.append(rec)
        w = pw
    records: list[MoveRecord] = []
    cur, crec = canonical_with_moves(plat)
    records += crec
    for rec in reversed(path):
        cur, crec = canonical_with_moves(apply_move(cur, rec))
        records += [rec, *crec]
    return records, cur
