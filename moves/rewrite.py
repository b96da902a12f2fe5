"""Rewrites inside the braid group: cancellation, far commutation, braid relation, handles."""

from __future__ import annotations

import heapq
from collections.abc import Sequence

__all__ = [
    "braid_triple",
    "commutes",
    "raag_reduce",
    "lex_normal",
    "letter_key",
    "front_absorbable",
    "back_absorbable",
    "handle_end",
    "reduce_handle",
    "take_block",
]


def commutes(a: int, b: int) -> bool:
    """Far commutation: sigma_i and sigma_j commute when ``|i - j| >= 2``."""
    d = abs(a) - abs(b)
    return d >= 2 or d <= -2


def braid_triple(a: int, b: int, c: int) -> tuple[int, int, int] | None:
    """The other side of a braid relation whose one side is ``a b c``, or None.

    With ``x = sigma_i``, ``y = sigma_j`` and ``|i - j| = 1``, the relations used are
    ``x y x = y x y`` and its forms with mixed signs, all of the shape
    ``x^e1 y^e2 x^e3 = y^e3 x^e2 y^e1`` for ``(e1, e2, e3)`` with ``e1 = e2 = e3`` or
    ``e1 != e3`` (e.g. ``x y x^-1 = y^-1 x y``). ``x y^-1 x`` has no such form.

    References
    ----------
    .. [1] E. Artin, "Theory of braids", Ann. of Math. 48 (1947).
    """
    i, j = abs(a), abs(b)
    if abs(c) != i or (i - j != 1 and j - i != 1):
        return None
    e1, e2, e3 = (a > 0), (b > 0), (c > 0)
    if e1 == e3 and e1 != e2:
        return None
    s1, s2, s3 = (1 if e1 else -1), (1 if e2 else -1), (1 if e3 else -1)
    return (s3 * j, s2 * i, s1 * j)


def raag_reduce(word: Sequence[int]) -> list[int]:
    """Free reduction modulo far commutation.

    Deletes every pair ``x ... x^-1`` whose letters in between all commute with ``x``
    (the reduction of the right-angled Artin group with the far-commutation relations).
    One stack of live positions per generator index gives O(1) work per letter: a new
    letter ``x`` on index ``k`` cancels the last live letter on index ``k`` when that is
    ``x^-1`` and no live letter on index ``k - 1`` or ``k + 1`` comes after it.

    References
    ----------
    .. [1] G. X. Viennot, "Heaps of pieces, I", Combinatoire énumérative (1986);
       P. Cartier and D. Foata, "Problèmes combinatoires de commutation et
       réarrangements", LNM 85 (1969).
    """
    top = max((abs(g) for g in word), default=0) + 2
    # stacks[k] = positions (into ``out``) of live letters on generator index k
    stacks: list[list[int]] = [[] for _ in range(top + 1)]
    out: list[int] = []
    alive: list[bool] = []
    for x in word:
        k = abs(x)
        st = stacks[k]
        if st:
            q = st[-1]
            if out[q] == -x:
                lo, hi = stacks[k - 1], stacks[k + 1]
                if (not lo or lo[-1] < q) and (not hi or hi[-1] < q):
                    st.pop()
                    alive[q] = False
                    continue
        st.append(len(out))
        out.append(x)
        alive.append(True)
    return [x for x, a in zip(out, alive, strict=True) if a]


def letter_key(x: int) -> int:
    """Order of letters for normal forms: ``1 < -1 < 2 < -2 < ...``."""
    return 2 * x if x > 0 else -2 * x + 1


def lex_normal(word: Sequence[int]) -> list[int]:
    """Lexicographically least word equal to ``word`` modulo far commutation.

    The dependence graph links each letter to the last earlier letter on each of the
    indices ``k - 1``, ``k``, ``k + 1``; taking the least available letter first (a heap)
    gives the lexicographic normal form of the trace in O(L log L).

    References
    ----------
    .. [1] A. V. Anisimov and D. E. Knuth, "Inhomogeneous sorting", Int. J. Comput. Inf.
       Sci. 8 (1979); P. Cartier and D. Foata, LNM 85 (1969).
    """
    L = len(word)
    top = max((abs(g) for g in word), default=0) + 2
    last = [-1] * (top + 1)
    succ: list[list[int]] = [[] for _ in range(L)]
    indeg = [0] * L
    for t, x in enumerate(word):
        k = abs(x)
        for kk in (k - 1, k, k + 1):
            q = last[kk]
            if q >= 0:
                succ[q].append(t)
                indeg[t] += 1
        last[k] = t
    heap = [(letter_key(word[t]), t) for t in range(L) if indeg[t] == 0]
    heapq.heapify(heap)
    out = []
    while heap:
        _, t = heapq.heappop(heap)
        out.append(word[t])
        for s in succ[t]:
            indeg[s] -= 1
            if indeg[s] == 0:
                heapq.heappush(heap, (letter_key(word[s]), s))
    return out


def front_absorbable(word: Sequence[int], sequential: bool = False) -> list[int]:
    """Positions of odd letters (twists) that commute up to the top of the word.

    A letter on index ``k`` reaches the top when no earlier letter lies on ``k - 1``,
    ``k`` or ``k + 1``. With ``sequential`` the earlier letters reported are taken as
    already deleted (the closure used by canonicalization: delete them first to last);
    otherwise each position is a valid single move on ``word`` as it is.
    """
    blocked: set[int] = set()
    out = []
    for p, x in enumerate(word):
        k = abs(x)
        if k % 2 and k not in blocked:
            out.append(p)
            if sequential:
                continue
        blocked.update((k - 1, k, k + 1))
    return out


def back_absorbable(word: Sequence[int], sequential: bool = False) -> list[int]:
    """Positions of odd letters that commute down to the bottom of the word, last first."""
    L = len(word)
    return [L - 1 - p for p in front_absorbable(word[::-1], sequential)]


def handle_end(word: Sequence[int], p: int) -> int | None:
    """End of the handle that starts at letter ``p``, or None.

    A handle is ``x^e u x^-e`` with ``x = sigma_k`` where ``u`` has no letter on index
    ``k`` or ``k - 1`` (Dehornoy 1997).
    """
    x = word[p]
    k = abs(x)
    for q in range(p + 1, len(word)):
        y = word[q]
        a = abs(y)
        if a == k:
            return q if y == -x else None
        if a == k - 1:
            return None
    return None


def reduce_handle(word: Sequence[int], p: int, q: int) -> list[int]:
    """Letters replacing ``word[p:q+1]`` when the handle there is reduced.

    ``x^e u x^-e`` becomes ``u`` with every ``sigma_{k+1}^d`` replaced by
    ``sigma_{k+1}^-e sigma_k^d sigma_{k+1}^e``, then freely reduced; this is the same braid
    because ``sigma_k^e sigma_{k+1}^d sigma_k^-e = sigma_{k+1}^-e sigma_k^d sigma_{k+1}^e``.

    References
    ----------
    .. [1] P. Dehornoy, "A fast method for comparing braids", Adv. Math. 125 (1997).
    """
    x = word[p]
    k = abs(x)
    e = 1 if x > 0 else -1
    out: list[int] = []
    for y in word[p + 1 : q]:
        if abs(y) == k + 1:
            piece: tuple[int, ...] = (-e * (k + 1), (k if y > 0 else -k), e * (k + 1))
        else:
            piece = (y,)
        for z in piece:
            if out and out[-1] == -z:
                out.pop()
            else:
                out.append(z)
    return out


def take_block(word: Sequence[int], block: Sequence[int]) -> list[int] | None:
    """Positions of a subword equal to ``block`` that commutes up to the top, or None.

    Letters of ``block`` are matched one after the other: each must be the first
    remaining letter on its index, with no remaining letter on a neighbouring index
    before it. Deleting the returned positions leaves ``word`` with ``block`` removed
    from its front modulo far commutation.
    """
    taken: list[int] = []
    used: set[int] = set()
    for b in block:
        k = abs(b)
        hit = None
        for p, x in enumerate(word):
            if p in used:
                continue
            a = abs(x)
            if a == k:
                hit = p if x == b else None
                break
            if a == k - 1 or a == k + 1:
                break
        if hit is None:
            return None
        used.add(hit)
        taken.append(hit)
    return taken
