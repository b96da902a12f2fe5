"""Local generators of the pairing (Hilden) subgroup and a free-group membership oracle."""

from __future__ import annotations

from collections.abc import Iterator, Sequence

from plait.errors import InputError

__all__ = [
    "generator_word",
    "pairing_generators",
    "artin_action",
    "free_reduce",
    "in_pairing_subgroup",
]


def generator_word(kind: str, i: int, e: int, strands: int) -> tuple[int, ...]:
    """Braid word of a local generator of the pairing subgroup, or of its inverse.

    Parameters
    ----------
    kind : {"twist", "swap", "lthread", "rthread"}
        ``twist``: sigma_{2i-1} (pair ``i`` turns half a turn);
        ``swap``: sigma_{2i} sigma_{2i-1} sigma_{2i+1} sigma_{2i} (pairs ``i`` and ``i+1``
        exchange places); ``lthread``: sigma_{2i} sigma_{2i-1}^2 sigma_{2i} (pair ``i``
        passes through the arch of pair ``i+1``); ``rthread``: sigma_{2i} sigma_{2i+1}^2
        sigma_{2i} (pair ``i+1`` passes through the arch of pair ``i``).
    i : int
        Pair index, 1-based (``i < n`` for the three two-pair generators).
    e : {1, -1}
        The generator or its inverse.
    strands : int
        Number of strands ``2n``.

    Raises
    ------
    InputError
        When the pair index or sign is out of range.

    References
    ----------
    .. [1] H. M. Hilden, "Generators for two groups related to the braid group",
       Pacific J. Math. 59 (1975).
    """
    n = strands // 2
    if e not in (1, -1):
        raise InputError(f"{kind}: sign must be 1 or -1, got {e}")
    if kind == "twist":
        if not 1 <= i <= n:
            raise InputError(f"twist: pair {i} out of range 1..{n}")
        w: tuple[int, ...] = (2 * i - 1,)
    else:
        if not 1 <= i <= n - 1:
            raise InputError(f"{kind}: pair {i} out of range 1..{n - 1}")
        a, b, c = 2 * i - 1, 2 * i, 2 * i + 1
        if kind == "swap":
            w = (b, a, c, b)
        elif kind == "lthread":
            w = (b, a, a, b)
        elif kind == "rthread":
            w = (b, c, c, b)
        else:
            raise InputError(f"not a pairing-subgroup generator kind: {kind!r}")
    if e == -1:
        w = tuple(-g for g in reversed(w))
    return w


def pairing_generators(strands: int) -> Iterator[tuple[str, int, int, tuple[int, ...]]]:
    """Every local generator and inverse on ``strands`` strands as ``(kind, i, e, word)``."""
    n = strands // 2
    for kind in ("twist", "swap", "lthread", "rthread"):
        top = n if kind == "twist" else n - 1
        for i in range(1, top + 1):
            for e in (1, -1):
                yield kind, i, e, generator_word(kind, i, e, strands)


def free_reduce(word: Sequence[int]) -> tuple[int, ...]:
    """Free reduction of a word in a free group (letters ``k`` / ``-k``)."""
    out: list[int] = []
    for x in word:
        if out and out[-1] == -x:
            out.pop()
        else:
            out.append(x)
    return tuple(out)


def artin_action(braid: Sequence[int], element: Sequence[int]) -> tuple[int, ...]:
    """Image of a free-group element under the Artin action of a braid word.

    The generator sigma_i acts on F = <x_1, x_2, ...> by ``x_i -> x_i x_{i+1} x_i^-1``,
    ``x_{i+1} -> x_i`` and fixes the other generators; the letters of ``braid`` are
    applied first to last as successive substitutions (a right action). Free-group
    elements are words of nonzero integers, ``k`` for x_k and ``-k`` for its inverse.

    References
    ----------
    .. [1] E. Artin, "Theory of braids", Ann. of Math. 48 (1947).
    """
    cur = free_reduce(element)
    for g in braid:
        i = abs(g)
        if g > 0:
            img = {i: (i, i + 1, -i), i + 1: (i,)}
        else:  # inverse: x_i -> x_{i+1}, x_{i+1} -> x_{i+1}^-1 x_i x_{i+1}
            img = {i: (i + 1,), i + 1: (-(i + 1), i, i + 1)}
        out: list[int] = []
        for x in cur:
            a = abs(x)
            piece = img.get(a, (a,))
            if x < 0:
                piece = tuple(-y for y in reversed(piece))
            for y in piece:
                if out and out[-1] == -y:
                    out.pop()
                else:
                    out.append(y)
        cur = tuple(out)
    return cur


def half_twist(strands: int) -> tuple[int, ...]:
    """The positive half twist ``D = (s_1 ... s_{m-1})(s_1 ... s_{m-2}) ... (s_1)`` on
    ``m = strands`` strands; ``D s_k D^-1 = s_{m-k}`` (Garside 1969)."""
    return tuple(k for top in range(strands - 1, 0, -1) for k in range(1, top + 1))


def turned(word: Sequence[int], strands: int) -> tuple[int, ...]:
    """``s_k -> s_{strands-k}`` letter by letter (signs kept): conjugation by the half twist."""
    return tuple((strands - x) if x > 0 else -(strands + x) for x in word)


def flype_allowed(word: Sequence[int], strands: int, cut: int) -> bool:
    """Whether the letters from ``cut`` on, ``B``, satisfy ``B^-1 D B`` in the pairing
    subgroup (so ``A B`` and ``turned(A) B`` have the same plat closure)."""
    b = tuple(word[cut:])
    return in_pairing_subgroup(tuple(-x for x in reversed(b)) + half_twist(strands) + b,
                               strands)


def in_pairing_subgroup(braid: Sequence[int], strands: int) -> bool:
    """Whether a braid word lies in the pairing subgroup K_{2n} of B_{2n}.

    Handlebody test: with the Artin action of :func:`artin_action` and the map
    ``phi: F_{2n} -> F_n`` sending ``x_{2i-1} -> y_i`` and ``x_{2i} -> y_i^-1``, the braid
    ``b`` lies in K_{2n} exactly when ``phi(b(x_{2i-1} x_{2i})) = 1`` for every pair ``i``
    (the loops around the two feet of every cap stay null-homotopic in the complement of
    the cap arcs). Cost grows with the free-group image, so keep it to short words.

    References
    ----------
    .. [1] H. M. Hilden, "Generators for two groups related to the braid group",
       Pacific J. Math. 59 (1975).
    .. [2] J. S. Birman, "On the stable equivalence of plat representations of knots and
       links", Canad. J. Math. 28 (1976).
    """
    for g in braid:
        if g == 0 or abs(g) >= strands:
            raise InputError(f"generator {g} is out of range for {strands} strands")
    for i in range(1, strands // 2 + 1):
        image = artin_action(braid, (2 * i - 1, 2 * i))
        projected = []
        for x in image:
            a = abs(x)
            y = (a + 1) // 2 * (1 if a % 2 else -1)
            projected.append(y if x > 0 else -y)
        if free_reduce(projected):
            return False
    return True
