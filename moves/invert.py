"""Inverse move paths: the records that undo a replayable path, checked step by step."""

from __future__ import annotations

from collections.abc import Iterable, Sequence

from plait.moves.records import PAIRING_KINDS, MoveRecord
from plait.moves.replay import StepError, check_step, same_modulo_commutation
from plait.word import PlatWord

__all__ = ["expand_handle", "invert_path", "path_words"]


def _reduce_to(cur: list[int], target: Sequence[int]) -> MoveRecord:
    # one ``reduce`` macro rewriting the differing window of cur into target
    a = 0
    m = min(len(cur), len(target))
    while a < m and cur[a] == target[a]:
        a += 1
    b = 0
    while b < m - a and cur[len(cur) - 1 - b] == target[len(target) - 1 - b]:
        b += 1
    return MoveRecord("reduce", (a, len(cur) - b, *target[a: len(target) - b]))


def expand_handle(word: Sequence[int], strands: int, p: int, q: int) -> list[MoveRecord]:
    """A Dehornoy handle reduction at letters ``p..q`` written as ``reduce`` macros (far
    commutation, insertion of ``x^-1 x``, cancellation) and braid relations, each of
    which has an inverse of the same kind.

    The handle ``x u x^-1`` (``x = sigma_k^e``) is undone one letter of index ``k+1`` at
    a time: ``x u1 y`` becomes ``u1 (x y x^-1) x`` and the braid relation turns
    ``x y x^-1`` into ``sigma_{k+1}^-e sigma_k^f sigma_{k+1}^e``; at the end ``x v x^-1``
    with ``v`` commuting with ``x`` cancels.

    References
    ----------
    .. [1] P. Dehornoy, "A fast method for comparing braids", Adv. Math. 125 (1997).
    """
    cur = list(word)
    recs: list[MoveRecord] = []
    target, _ = check_step(list(word), strands, MoveRecord("handle", (p, q)))
    x = cur[p]
    k = abs(x)
    a, b = p, q

    def do(rec: MoveRecord) -> None:
        nonlocal cur
        cur, _s = check_step(cur, strands, rec)
        recs.append(rec)

    while True:
        r = next((t for t in range(a + 1, b) if abs(cur[t]) == k + 1), None)
        if r is None:
            new = cur[a + 1: b]
            do(MoveRecord("reduce", (a, b + 1, *new)))
            break
        y = cur[r]
        u1 = cur[a + 1: r]
        do(MoveRecord("reduce", (a, r + 1, *u1, x, y, -x, x)))
        s = a + len(u1)
        do(MoveRecord("braid", (s,)))
        a, b = s + 3, b + 2
    if cur != list(target):
        do(_reduce_to(cur, target))
    return recs


def path_words(start: PlatWord, records: Iterable[MoveRecord]) -> list[tuple[list[int], int]]:
    """The words (and strand counts) along a path, start included, checked by replay."""
    w, s = list(start.word), start.strands
    out = [(w, s)]
    for rec in records:
        w, s = check_step(w, s, rec)
        out.append((w, s))
    return out


def _inverse_step(prev: list[int], sp: int, rec: MoveRecord, nxt: list[int],
                  sn: int) -> list[MoveRecord]:
    # records taking nxt (on sn strands) back to prev (on sp strands)
    kind, a = rec.kind, rec.args
    if prev == nxt and sp == sn:
        return []
    tries: list[MoveRecord] = []
    if kind in PAIRING_KINDS:
        side, i, e = a
        tries = [MoveRecord(kind, (side, i, -e))]
    elif kind in ("braid", "turn", "flype"):
        # involutions: a braid relation, a half turn, a flype at the same cut
        tries = [rec]
    elif kind == "stab":
        j, p, _g = a
        tries = [MoveRecord("destab", (j, p))]
    elif kind == "destab":
        j, p = a
        tries = [MoveRecord("stab", (j, p, prev[p]))]
    elif kind == "absorb":
        side, p = a
        x = prev[p]
        tries = [MoveRecord("twist", (side, (abs(x) + 1) // 2, 1 if x > 0 else -1))]
    elif kind == "handle":
        fwd = expand_handle(prev, sp, a[0], a[1])
        return invert_path(PlatWord(sp, tuple(prev)), fwd)
    out: list[MoveRecord] = []
    cur, s = nxt, sn
    for t in tries:
        try:
            cur2, s2 = check_step(cur, s, t)
        except StepError:
            continue
        out.append(t)
        cur, s = cur2, s2
        break
    if cur != prev:
        if s != sp or not same_modulo_commutation(cur, prev):
            raise ValueError(f"cannot invert {rec}")
        out.append(_reduce_to(cur, prev))
    return out


def invert_path(start: PlatWord, records: Sequence[MoveRecord]) -> list[MoveRecord]:
    """Records taking the end of the path ``start --records-->`` back to ``start``.

    Each move is undone by its own kind where one exists (a pairing factor by its
    inverse, a braid relation by itself, stabilization by destabilization and back, end
    absorption of a twist by multiplying the twist back), followed where needed by a
    ``reduce`` macro (far commutation and free cancellation); rewrites that keep the word
    modulo far commutation and cancellation are undone by one ``reduce``; a handle
    reduction is first written out by :func:`expand_handle`. Every step is checked with
    the replay rules.

    Raises
    ------
    ValueError
        When a step cannot be inverted (a path that does not replay).

    References
    ----------
    .. [1] J. S. Birman, "On the stable equivalence of plat representations of knots and
       links", Canad. J. Math. 28 (1976).
    """
    words = path_words(start, records)
    out: list[MoveRecord] = []
    for t in range(len(records) - 1, -1, -1):
        (prev, sp), (nxt, sn) = words[t], words[t + 1]
        out.extend(_inverse_step(prev, sp, records[t], nxt, sn))
    return out
