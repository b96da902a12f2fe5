"""Neighbour enumeration on the move graph: the fast path used by the search."""

from __future__ import annotations

from collections.abc import Iterable, Iterator
from functools import cache

from plait.moves.pairing import flype_allowed, generator_word, turned
from plait.moves.records import (
    BOTTOM,
    DEFAULT_KINDS,
    MOVE_KINDS,
    PAIRING_KINDS,
    TOP,
    MoveRecord,
    fast_plat,
)
from plait.moves.rewrite import (
    back_absorbable,
    braid_triple,
    front_absorbable,
    reduce_handle,
)
from plait.moves.stabilize import destab_sites, destabilize_word, stab_letters, stabilize_word
from plait.word import PlatWord

__all__ = ["apply_move", "neighbor_deltas", "neighbors", "multiply", "handle_shorten"]

#: Longest tail ``B`` for which :func:`neighbor_deltas` offers a flype.
FLYPE_TAIL = 12


@cache
def _generators(strands: int) -> tuple[tuple[str, int, int, tuple[int, ...]], ...]:
    # every (kind, pair, sign, letters) of the local pairing-subgroup generators
    out = []
    n = strands // 2
    for kind in ("twist", "swap", "lthread", "rthread"):
        for i in range(1, (n if kind == "twist" else n - 1) + 1):
            for e in (1, -1):
                out.append((kind, i, e, generator_word(kind, i, e, strands)))
    return tuple(out)


def _overlap_top(h: tuple[int, ...], w: tuple[int, ...]) -> int:
    # letters cancelled when h is put above w: h[-1-t] against w[t]
    m = 0
    lh, lw = len(h), len(w)
    while m < lh and m < lw and h[lh - 1 - m] == -w[m]:
        m += 1
    return m


def _overlap_bottom(w: tuple[int, ...], h: tuple[int, ...]) -> int:
    m = 0
    lh, lw = len(h), len(w)
    while m < lh and m < lw and w[lw - 1 - m] == -h[m]:
        m += 1
    return m


def multiply(word: tuple[int, ...], h: tuple[int, ...], side: int) -> tuple[int, ...]:
    """``h * word`` (side TOP) or ``word * h`` (side BOTTOM), freely reduced where they meet."""
    if side == TOP:
        m = _overlap_top(h, word)
        return h[: len(h) - m] + word[m:]
    m = _overlap_bottom(word, h)
    return word[: len(word) - m] + h[m:]


def apply_move(plat: PlatWord, record: MoveRecord) -> PlatWord:
    """The plat after one move, assuming the move is valid (no checks: fast path).

    See :mod:`plait.moves.records` for the meaning of each kind; checked replay is
    :func:`plait.moves.replay.replay`.
    """
    w = plat.word
    s = plat.strands
    kind = record.kind
    a = record.args
    if kind in PAIRING_KINDS:
        side, i, e = a
        return fast_plat(s, multiply(w, generator_word(kind, i, e, s), side))
    if kind == "commute":
        p = a[0]
        return fast_plat(s, w[:p] + (w[p + 1], w[p]) + w[p + 2 :])
    if kind == "braid":
        p = a[0]
        return fast_plat(s, w[:p] + braid_triple(w[p], w[p + 1], w[p + 2]) + w[p + 3 :])
    if kind == "cancel":
        p = a[0]
        return fast_plat(s, w[:p] + w[p + 2 :])
    if kind == "absorb":
        p = a[1]
        return fast_plat(s, w[:p] + w[p + 1 :])
    if kind == "insert":
        p, g = a
        return fast_plat(s, w[:p] + (g, -g) + w[p:])
    if kind == "handle":
        p, q = a
        return fast_plat(s, w[:p] + tuple(reduce_handle(w, p, q)) + w[q + 1 :])
    if kind == "reduce":
        lo, hi = a[0], a[1]
        return fast_plat(s, w[:lo] + tuple(a[2:]) + w[hi:])
    if kind == "stab":
        j, p, g = a
        return fast_plat(s + 2, stabilize_word(w, s, j, p, g))
    if kind == "destab":
        j, p = a
        return fast_plat(s - 2, destabilize_word(w, s, j, p))
    if kind == "turn":
        axis = a[0]
        v = turned(w, s) if axis in (0, 2) else w
        return fast_plat(s, v[::-1] if axis in (1, 2) else v)
    if kind == "flype":
        c = a[0]
        return fast_plat(s, turned(w[:c], s) + w[c:])
    if kind == "rebridge":
        from plait.moves.rebridge import decode

        return decode(a).result  # the recorded construction (checked by replay)
    raise ValueError(f"unknown move kind {kind!r}")


def neighbor_deltas(
    plat: PlatWord, kinds: Iterable[str] | None = None
) -> Iterator[tuple[MoveRecord, int]]:
    """Every move available at ``plat`` with the length of the word it leads to.

    Nothing is rebuilt: each move's effect on the length is computed from the letters
    around it (the overlap of a pairing-subgroup factor with the end of the word, the
    handle's contents, ...). Destabilizations also lower the bridge count by one.

    Parameters
    ----------
    plat : PlatWord
    kinds : iterable of str, optional
        Move kinds to enumerate (default :data:`DEFAULT_KINDS`: all but ``insert``,
        ``stab`` and the ``reduce`` macro).

    Yields
    ------
    (MoveRecord, int)
        A valid move and the new word length.
    """
    ks = DEFAULT_KINDS if kinds is None else frozenset(kinds)
    unknown = ks - MOVE_KINDS
    if unknown:
        raise ValueError(f"unknown move kinds: {sorted(unknown)}")
    w = plat.word
    s = plat.strands
    L = len(w)
    R = MoveRecord
    if ks & PAIRING_KINDS:
        for kind, i, e, h in _generators(s):
            if kind not in ks:
                continue
            lh = len(h)
            mt = _overlap_top(h, w)
            yield R(kind, (TOP, i, e)), L + lh - 2 * mt
            mb = _overlap_bottom(w, h)
            yield R(kind, (BOTTOM, i, e)), L + lh - 2 * mb
    if "cancel" in ks:
        for p in range(L - 1):
            if w[p] == -w[p + 1]:
                yield R("cancel", (p,)), L - 2
    if "commute" in ks:
        for p in range(L - 1):
            d = abs(w[p]) - abs(w[p + 1])
            if d >= 2 or d <= -2:
                yield R("commute", (p,)), L
    if "braid" in ks:
        for p in range(L - 2):
            a, c = w[p], w[p + 2]
            if (a == c or a == -c) and braid_triple(a, w[p + 1], c) is not None:
                yield R("braid", (p,)), L
    if "absorb" in ks:
        for p in front_absorbable(w):
            yield R("absorb", (TOP, p)), L - 1
        for p in back_absorbable(w):
            yield R("absorb", (BOTTOM, p)), L - 1
    if "handle" in ks and L >= 2:
        # nxt[k] = next position after p whose letter is on index k (L if none)
        nxt = [L] * (s + 1)
        for p in range(L - 1, -1, -1):
            x = w[p]
            k = x if x > 0 else -x
            q = nxt[k]
            if q < L and w[q] == -x and q < nxt[k - 1]:
                yield R("handle", (p, q)), L - (q - p + 1) + len(reduce_handle(w, p, q))
            nxt[k] = p
    if "destab" in ks:
        for j, p in destab_sites(w, s):
            yield R("destab", (j, p)), L - 1
    if "insert" in ks:
        for p in range(L + 1):
            for g in range(1, s):
                yield R("insert", (p, g)), L + 2
                yield R("insert", (p, -g)), L + 2
    if "turn" in ks and L:
        for axis in (0, 1, 2):
            yield R("turn", (axis,)), L
    if "flype" in ks:
        # only short tails: the membership test grows with the word
        for c in range(max(1, L - FLYPE_TAIL), L):
            if flype_allowed(w, s, c):
                yield R("flype", (c,)), L
    if "stab" in ks and s + 2 <= 64:
        n = s // 2
        for j in range(1, n + 2):
            if 2 <= j <= n and any(abs(x) == 2 * j - 2 for x in w):
                continue
            for g in stab_letters(j, s):
                for p in range(L + 1):
                    yield R("stab", (j, p, g)), L + 1


def neighbors(
    plat: PlatWord, kinds: Iterable[str] | None = None
) -> Iterator[tuple[MoveRecord, PlatWord]]:
    """Lazily yield ``(move record, new plat)`` for every move of the given kinds.

    Same moves and order as :func:`neighbor_deltas`; each new word is built only when
    the consumer asks for it.
    """
    for rec, _len in neighbor_deltas(plat, kinds):
        yield rec, apply_move(plat, rec)


def handle_shorten(plat: PlatWord, max_steps: int = 10_000) -> tuple[PlatWord, list[MoveRecord]]:
    """Shorten a word by handle reductions and cancellations that lower its length.

    A length-reducing macro built from Dehornoy's handle reduction: at each step the
    handle reduction or free cancellation giving the shortest word is applied, as long as
    it is strictly shorter. The braid (not only its plat closure) never changes.

    Returns
    -------
    (PlatWord, list of MoveRecord)

    References
    ----------
    .. [1] P. Dehornoy, "A fast method for comparing braids", Adv. Math. 125 (1997).
    """
    cur = plat
    records: list[MoveRecord] = []
    for _ in range(max_steps):
        best = None
        for rec, L in neighbor_deltas(cur, ("handle", "cancel")):
            if L < cur.length and (best is None or L < best[1]):
                best = (rec, L)
        if best is None:
            break
        cur = apply_move(cur, best[0])
        records.append(best[0])
    return cur, records
