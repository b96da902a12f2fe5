"""Seeded random plats: uniform random words in the braid group B_2n read as plats."""

from __future__ import annotations

import hashlib
import random
from collections.abc import Iterator

from plait.errors import InputError
from plait.word import MAX_LENGTH, MAX_STRANDS, PlatWord

__all__ = ["random_plat", "random_plats", "item_rng", "parse_range"]

#: Rejection tries before giving up on a knot of the requested size.
MAX_TRIES = 10_000


def item_rng(seed: int, index: int) -> random.Random:
    """Random generator of item ``index`` of a seeded family: seeded by SHA-256 of
    ``"seed:index"``, so item ``i`` is the same whatever ``count`` is asked for."""
    h = hashlib.sha256(f"randomplat:{seed}:{index}".encode()).digest()
    return random.Random(int.from_bytes(h[:16], "big"))


def random_plat(bridges: int, length: int, rng: random.Random, *, knot: bool = False,
                max_tries: int = MAX_TRIES) -> PlatWord:
    """A plat in the random plat model.

    The word has ``length`` letters drawn independently and uniformly from the
    ``2 (2n - 1)`` generators ``±1, …, ±(2n - 1)`` of ``B_2n`` (``n = bridges``), and is
    read as a plat on ``2n`` strands. With ``knot``, words are redrawn until the plat
    closure has one component (rejection sampling: the result is uniform among the words
    of that length whose closure is a knot).

    Parameters
    ----------
    bridges : int
        ``n >= 1``.
    length : int
        Number of letters, ``>= 0``.
    rng : random.Random
        Source of randomness.
    knot : bool
        Condition on one component.
    max_tries : int
        Words drawn before giving up when conditioning.

    Returns
    -------
    PlatWord

    Raises
    ------
    InputError
        For sizes out of range, or when no knot turned up in ``max_tries`` words.

    References
    ----------
    The random plat model of random knots and links: plat closures of random words in
    ``B_2n`` (field notes of this project); studied for instance by K. Ichihara and J. Ma,
    "A random link via bridge position is hyperbolic", Topology Appl. (2018) (from
    memory).
    """
    if isinstance(bridges, bool) or not isinstance(bridges, int) or bridges < 1:
        raise InputError(f"bridges must be an integer >= 1, got {bridges!r}")
    if isinstance(length, bool) or not isinstance(length, int) or length < 0:
        raise InputError(f"length must be an integer >= 0, got {length!r}")
    if 2 * bridges > MAX_STRANDS:
        raise InputError(f"{bridges} bridges is over the limit of {MAX_STRANDS // 2}")
    if length > MAX_LENGTH:
        raise InputError(f"length {length} is over the limit of {MAX_LENGTH} letters")
    strands = 2 * bridges
    top = strands - 1
    for _ in range(max_tries if knot else 1):
        # one draw: a generator index in 1..2n-1 and a sign, both uniform
        word = tuple(rng.randint(1, top) * rng.choice((1, -1)) for _ in range(length))
        plat = PlatWord(strands, word)
        if not knot or plat.components == 1:
            return plat
    raise InputError(f"no knot among {max_tries} random words of length {length} on "
                     f"{strands} strands")


def parse_range(text: str | int, what: str) -> tuple[int, int]:
    """``"4-6"`` or ``"5"`` as an inclusive range ``(lo, hi)``."""
    parts = str(text).strip().split("-")
    try:
        lo, hi = (int(parts[0]), int(parts[-1]))
    except ValueError:
        raise InputError(f"{what}: expected N or LO-HI, got {text!r}") from None
    if len(parts) > 2 or lo > hi or lo < 0:
        raise InputError(f"{what}: expected N or LO-HI with LO <= HI, got {text!r}")
    return lo, hi


def random_plats(count: int, *, bridges: tuple[int, int] = (4, 6),
                 length: tuple[int, int] = (40, 80), seed: int = 0, knot: bool = False,
                 prefix: str = "rp-") -> Iterator[tuple[str, PlatWord]]:
    """``count`` seeded random plats with ids ``prefix0001, prefix0002, …``.

    Item ``i`` draws its number of bridges uniformly from ``bridges`` and its length
    uniformly from ``length`` (inclusive ranges), then its word with
    :func:`random_plat`, all from :func:`item_rng` ``(seed, i)``.
    """
    if count < 0:
        raise InputError(f"count must be >= 0, got {count}")
    width = max(4, len(str(count)))
    for i in range(1, count + 1):
        rng = item_rng(seed, i)
        n = rng.randint(*bridges)
        ell = rng.randint(*length)
        yield f"{prefix}{i:0{width}d}", random_plat(n, ell, rng, knot=knot)
