"""Two-bridge links S(p, q) as 4-plats, and the candidates for a given determinant."""

from __future__ import annotations

from functools import cache
from math import gcd

from plait.errors import InputError
from plait.word import PlatWord

__all__ = ["continued_fraction", "two_bridge_plat", "two_bridge_classes", "candidates"]

#: Determinants above this are refused (the candidate list has about p/2 entries).
MAX_DETERMINANT = 100_000


def continued_fraction(p: int, q: int) -> tuple[int, ...]:
    """Continued fraction ``p/q = a1 + 1/(a2 + 1/(a3 + ...))`` with positive terms and an
    odd number of them.

    Parameters
    ----------
    p, q : int
        ``p >= 2`` and ``0 < q < p``.

    Returns
    -------
    tuple of int
        ``(a1, ..., am)`` with ``m`` odd and every ``ai >= 1``. The usual expansion is
        adjusted at its end, using ``[..., a] = [..., a - 1, 1]``.

    Examples
    --------
    >>> continued_fraction(5, 2)
    (2, 1, 1)
    >>> continued_fraction(7, 3)
    (2, 2, 1)
    """
    if not 0 < q < p:
        raise InputError(f"continued fraction: need 0 < q < p, got p={p}, q={q}")
    terms = []
    a, b = p, q
    while b:
        terms.append(a // b)
        a, b = b, a % b
    if len(terms) % 2 == 0:
        # the last term is at least 2 here, since a/b with b | a ends with a // b >= 2
        terms[-1] -= 1
        terms.append(1)
    return tuple(terms)


def two_bridge_plat(p: int, q: int) -> PlatWord:
    """The 4-plat of the two-bridge link S(p, q) (Schubert's normal form).

    With ``p/q = [a1, ..., am]`` (``m`` odd, see :func:`continued_fraction`), the word is
    ``sigma_2^a1 sigma_1^-a2 sigma_2^a3 ... sigma_2^am`` on four strands: an alternating
    diagram with ``a1 + ... + am`` crossings. ``q`` is read modulo ``p``; ``S(p, -q)`` is
    the mirror image of ``S(p, q)``. ``S(1, q)`` is the unknot (returned as the empty
    1-bridge plat) and ``S(0, 1)`` the two-component unlink (the empty 4-plat).

    Parameters
    ----------
    p : int
        The determinant, ``p >= 0``.
    q : int
        Coprime to ``p``.

    Returns
    -------
    PlatWord
        A knot when ``p`` is odd, a two-component link when ``p`` is even.

    References
    ----------
    .. [1] H. Schubert, "Knoten mit zwei Brücken", Math. Z. 65 (1956).
    .. [2] J. H. Conway, "An enumeration of knots and links, and some of their algebraic
       properties", in Computational Problems in Abstract Algebra (1970): rational
       tangles and their continued fractions.
    """
    if p < 0:
        raise InputError(f"two-bridge: p must be at least 0, got {p}")
    if gcd(p, q) != 1:
        raise InputError(f"two-bridge: q={q} is not coprime to p={p}")
    if p == 0:
        return PlatWord(4, ())
    if p == 1:
        return PlatWord(2, ())
    word: list[int] = []
    for i, a in enumerate(continued_fraction(p, q % p)):
        word.extend([2] * a if i % 2 == 0 else [-1] * a)
    return PlatWord(4, tuple(word))


def _inverse_mod(q: int, p: int) -> int:
    return pow(q, -1, p)


def two_bridge_classes(p: int) -> tuple[int, ...]:
    """Representatives ``q`` of the two-bridge links with determinant ``p``, mirrors apart.

    By Schubert's classification ``S(p, q)`` and ``S(p, q')`` are the same unoriented link
    exactly when ``q' = q^(+-1) mod p``; the mirror of ``S(p, q)`` is ``S(p, -q)``. The
    representatives are the least element of each class ``{q, q^-1}`` of units mod ``p``
    in ``1..p-1``, so both chiralities appear. For ``p = 1`` (unknot) and ``p = 0``
    (unlink) the only class is ``(0,)`` resp. ``(1,)``.

    References
    ----------
    .. [1] H. Schubert, "Knoten mit zwei Brücken", Math. Z. 65 (1956).
    """
    if p < 0:
        raise InputError(f"two-bridge: p must be at least 0, got {p}")
    if p > MAX_DETERMINANT:
        raise InputError(f"two-bridge: determinant {p} is over the limit of {MAX_DETERMINANT}")
    if p == 0:
        return (1,)
    if p == 1:
        return (0,)
    return tuple(q for q in range(1, p) if gcd(p, q) == 1 and q <= _inverse_mod(q, p))


@cache
def candidates(p: int) -> tuple[tuple[int, PlatWord], ...]:
    """Every two-bridge link of determinant ``p`` (both chiralities), as ``(q, plat)``.

    A knot or link with determinant ``p`` and bridge number at most 2 is one of these
    (Schubert 1956; det S(p, q) = p), so ruling out each of them by an invariant proves
    the bridge number is at least 3. Cached by ``p``.
    """
    return tuple((q, two_bridge_plat(p, q)) for q in two_bridge_classes(p))
