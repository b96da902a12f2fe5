"""Seeded families of knots whose bridge number a theorem gives: torus, sums, twisted plats."""

from __future__ import annotations

import random
from collections.abc import Sequence
from math import gcd

from plait.errors import InputError
from plait.word import ClosedBraid, PlatWord

__all__ = [
    "torus_braid",
    "connected_sum_braid",
    "twisted_plat",
    "twisted_rows",
    "scrambled_two_bridge",
]


def torus_braid(p: int, q: int) -> ClosedBraid:
    """The torus link ``T(p, q)`` as the closure of the ``q``-strand braid
    ``(sigma_1 ... sigma_{q-1})^p``.

    Its bridge number is ``min(p, q)`` (Schubert 1954); with ``q > p`` the closed braid,
    read as a plat, has ``q`` bridges, so a search must find ``q - p`` fewer. A knot
    when ``gcd(p, q) = 1``.

    References
    ----------
    .. [1] H. Schubert, "Über eine numerische Knoteninvariante", Math. Z. 61 (1954).
    """
    if p < 1 or q < 2:
        raise InputError(f"torus link: need p >= 1 and q >= 2, got p={p}, q={q}")
    return ClosedBraid(q, tuple(range(1, q)) * p)


def connected_sum_braid(factors: Sequence[ClosedBraid]) -> ClosedBraid:
    """The connected sum of the closures of ``factors`` (knots) as one closed braid.

    Factor ``i`` (on ``n_i`` strands) is shifted to the strands ``s_i .. s_i + n_i - 1``
    with ``s_1 = 1`` and ``s_{i+1} = s_i + n_i - 1``: consecutive factors share one
    strand, and the closure of the product is the connected sum (common practice: the
    shared strand is the band of the sum). Its bridge number is
    ``b_1 + ... + b_k - (k - 1)`` (Schubert 1954).

    References
    ----------
    .. [1] H. Schubert, "Über eine numerische Knoteninvariante", Math. Z. 61 (1954):
       ``b(K1 # K2) = b(K1) + b(K2) - 1``.
    """
    word: list[int] = []
    offset = 0
    for f in factors:
        if f.to_plat().components != 1:
            raise InputError("connected sum: every factor must be a knot")
        word += [(abs(g) + offset) * (1 if g > 0 else -1) for g in f.word]
        offset += f.strands - 1
    return ClosedBraid(max(offset + 1, 2), tuple(word))


def twisted_rows(m: int) -> int:
    """The number of rows of twist regions used by :func:`twisted_plat`: ``4m(m-2) + 1``,
    more than Johnson–Moriah's ``4m(m-2)``."""
    return 4 * m * (m - 2) + 1


def twisted_plat(m: int, rng: random.Random, rows: int | None = None,
                 min_twist: int = 3, max_twist: int = 4, knot: bool = True,
                 max_tries: int = 1000) -> PlatWord:
    """A highly twisted ``2m``-plat.

    ``rows`` rows of twist regions (default :func:`twisted_rows`), alternating between
    regions on ``sigma_2, sigma_4, ..., sigma_{2m-2}`` (first and last row) and regions on
    ``sigma_1, sigma_3, ..., sigma_{2m-1}``; every region is ``sigma_k^e`` with
    ``min_twist <= |e| <= max_twist`` and a random sign. With ``m >= 3``, ``min_twist >=
    3`` and more than ``4m(m-2)`` rows, Johnson and Moriah prove that the plat's bridge
    sphere is the unique minimal one, so the bridge number is ``m``.

    Parameters
    ----------
    m : int
        Bridges, at least 3.
    rng : random.Random
    rows : int, optional
    min_twist, max_twist : int
    knot : bool
        Redraw until the closure is a knot.
    max_tries : int

    References
    ----------
    .. [1] J. Johnson and Y. Moriah, "Bridge distance and plat projections", Algebr.
       Geom. Topol. 16 (2016).
    """
    if m < 3:
        raise InputError(f"twisted plat: m must be at least 3, got {m}")
    if min_twist < 3 or max_twist < min_twist:
        raise InputError(f"twisted plat: need 3 <= min_twist <= max_twist, got "
                         f"{min_twist}, {max_twist}")
    rows = twisted_rows(m) if rows is None else rows
    for _ in range(max_tries):
        word: list[int] = []
        for r in range(rows):
            gens = range(2, 2 * m - 1, 2) if r % 2 == 0 else range(1, 2 * m, 2)
            for k in gens:
                e = rng.randint(min_twist, max_twist) * rng.choice((1, -1))
                word += [k if e > 0 else -k] * abs(e)
        plat = PlatWord(2 * m, tuple(word))
        if not knot or plat.components == 1:
            return plat
    raise InputError(f"twisted plat: no knot in {max_tries} draws")


def scrambled_two_bridge(p: int, q: int, seed: int, length_factor: float = 3,
                         stabilizations: int = 2) -> PlatWord:
    """The 2-bridge link ``S(p, q)`` (Schubert's 4-plat) hidden by random moves
    (:func:`plait.moves.walk.scramble`): stabilizations, pairing-subgroup factors,
    cancelling pairs and braid relations. Its bridge number is 2 (1 for ``p = 1``).

    References
    ----------
    .. [1] H. Schubert, "Knoten mit zwei Brücken", Math. Z. 65 (1956).
    .. [2] J. S. Birman, "On the stable equivalence of plat representations of knots and
       links", Canad. J. Math. 28 (1976): the moves keep the link type.
    """
    from plait.moves.walk import scramble
    from plait.scoring.twobridge import two_bridge_plat

    if gcd(p, q) != 1:
        raise InputError(f"two-bridge: q={q} is not coprime to p={p}")
    plat, _ = scramble(two_bridge_plat(p, q), seed, length_factor, stabilizations)
    return plat
