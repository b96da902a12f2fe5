"""Canonical form of a plat word for deduplication, recorded as replayable moves."""

from __future__ import annotations

from functools import cache

from plait.moves.pairing import generator_word
from plait.moves.records import BOTTOM, TOP, MoveRecord, fast_plat
from plait.moves.rewrite import (
    back_absorbable,
    front_absorbable,
    lex_normal,
    raag_reduce,
    take_block,
)
from plait.word import PlatWord

__all__ = ["canonical", "canonical_with_moves", "canonical_word"]

_BLOCK_KINDS = ("swap", "lthread", "rthread")


@cache
def _blocks(strands: int) -> dict[int, tuple[tuple[str, int, int, tuple[int, ...]], ...]]:
    # four-letter generators grouped by their first letter
    out: dict[int, list] = {}
    for i in range(1, strands // 2):
        for kind in _BLOCK_KINDS:
            for e in (1, -1):
                h = generator_word(kind, i, e, strands)
                out.setdefault(h[0], []).append((kind, i, e, h))
    return {k: tuple(v) for k, v in out.items()}


def _find_block(word: list[int], strands: int) -> tuple[str, int, int, list[int]] | None:
    # a four-letter pairing-subgroup generator that commutes up to the top of ``word``;
    # its first letter must be a letter that reaches the top by itself
    blocks = _blocks(strands)
    blocked: set[int] = set()
    firsts = []
    for x in word:
        k = abs(x)
        if k not in blocked and not k & 1:
            firsts.append(x)
        blocked.update((k - 1, k, k + 1))
        if len(blocked) >= strands + 1:
            break
    for x in firsts:
        for kind, i, e, h in blocks.get(x, ()):
            pos = take_block(word, h)
            if pos is not None:
                return kind, i, e, pos
    return None


def _reduce_record(old, new) -> MoveRecord:
    # replace only the window where the words differ: equal modulo commutation and
    # cancellation as whole words exactly when the windows are (the group cancels)
    a = 0
    m = min(len(old), len(new))
    while a < m and old[a] == new[a]:
        a += 1
    b = 0
    while b < m - a and old[len(old) - 1 - b] == new[len(new) - 1 - b]:
        b += 1
    return MoveRecord("reduce", (a, len(old) - b, *new[a : len(new) - b]))


def canonical_word(word, strands: int, record: list[MoveRecord] | None = None) -> list[int]:
    """Canonical letters of a plat word; appends the moves that derive them to ``record``.

    Steps: free reduction modulo far commutation; end absorption, repeated until nothing
    changes, of twists (odd letters) and of four-letter pairing-subgroup generators that
    commute to either end; then the lexicographically least word of the far-commutation
    class. Every step keeps the plat closure (Birman 1976), and the result depends only
    on the far-commutation class of the input, so the map is idempotent.
    """
    w = raag_reduce(word)
    if record is not None and tuple(w) != tuple(word):
        record.append(_reduce_record(tuple(word), w))
    while True:
        changed = False
        front = front_absorbable(w, sequential=True)
        if front:
            drop = set(front)
            if record is not None:
                record.extend(MoveRecord("absorb", (TOP, p - t)) for t, p in enumerate(front))
            w = [x for p, x in enumerate(w) if p not in drop]
            changed = True
        back = back_absorbable(w, sequential=True)
        if back:
            drop = set(back)
            if record is not None:
                record.extend(MoveRecord("absorb", (BOTTOM, p)) for p in back)
            w = [x for p, x in enumerate(w) if p not in drop]
            changed = True
        for side in (TOP, BOTTOM):
            old = w
            probe = w if side == TOP else w[::-1]
            hit = _find_block(probe, strands)
            if hit is None:
                continue
            kind, i, e, pos = hit
            taken = set(pos)
            rest = [x for p, x in enumerate(probe) if p not in taken]
            # the taken letters equal the generator word modulo far commutation; put the
            # literal word at the end so that the inverse factor cancels it letter by letter
            h = list(generator_word(kind, i, e, strands))
            if side == TOP:
                moved, w = h + rest, rest
            else:  # reversed, a generator word is the same modulo far commutation
                moved, w = rest[::-1] + h, rest[::-1]
            if record is not None:
                record.append(_reduce_record(old, moved))
                record.append(MoveRecord(kind, (side, i, -e)))
            changed = True
            break
        if not changed:
            break
        w2 = raag_reduce(w)
        if record is not None and w2 != w:
            record.append(_reduce_record(w, w2))
        w = w2
    out = lex_normal(w)
    if record is not None and out != w:
        record.append(_reduce_record(w, out))
    return out


def canonical(plat: PlatWord) -> PlatWord:
    """Canonical representative of a plat word for deduplication.

    Free reduction, end absorption of pairing-subgroup generators and the lexicographic
    normal form modulo far commutation; idempotent, and equal for words that differ by
    far commutations. Cost O(L log L) plus O(n L) per absorbed block.

    References
    ----------
    .. [1] J. S. Birman, "On the stable equivalence of plat representations of knots and
       links", Canad. J. Math. 28 (1976).
    .. [2] A. V. Anisimov and D. E. Knuth, "Inhomogeneous sorting", Int. J. Comput. Inf.
       Sci. 8 (1979).
    """
    return fast_plat(plat.strands, tuple(canonical_word(plat.word, plat.strands)))


def canonical_with_moves(plat: PlatWord) -> tuple[PlatWord, list[MoveRecord]]:
    """:func:`canonical` together with the move records that derive it from ``plat``."""
    rec: list[MoveRecord] = []
    w = canonical_word(plat.word, plat.strands, rec)
    return fast_plat(plat.strands, tuple(w)), rec
