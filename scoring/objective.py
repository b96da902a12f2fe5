"""Objectives for plat search: what "simpler" means, and cheap hints of reductions to come."""

from __future__ import annotations

from dataclasses import dataclass

from plait.errors import InputError
from plait.word import PlatWord

__all__ = [
    "Objective",
    "make_objective",
    "OBJECTIVE_NAMES",
    "cancel_potential",
    "sign_mix",
    "writhe_imbalance",
    "pair_touches",
    "isolation",
]

#: Names accepted by :func:`make_objective` (``weighted`` also as ``weighted:W``).
OBJECTIVE_NAMES = ("bridges", "length", "weighted")

# Default price of one bridge in letters for the ``weighted`` objective: a bridge is worth
# more than any plausible length change of one search phase.
DEFAULT_BRIDGE_WEIGHT = 8.0


@dataclass(frozen=True)
class Objective:
    """A total preorder on plats: :meth:`key` is smaller for simpler plats.

    Parameters
    ----------
    name : str
        ``"bridges"`` orders by (bridges, length) lexicographically (the default of the
        tool: fewest bridges first, then fewest crossings); ``"length"`` by (length,
        bridges); ``"weighted"`` by ``bridge_weight * bridges + length`` then the
        lexicographic pair.
    bridge_weight : float
        Price of one bridge, in letters, for ``"weighted"``.

    Notes
    -----
    Keys are tuples of numbers, compared lexicographically; every strategy minimises the
    same key so a portfolio can compare their answers. :meth:`key_from` gives the key from
    (bridges, length) alone, so a move that reports only its new length is scored
    without building the new word (the incremental path).
    """

    name: str = "bridges"
    bridge_weight: float = DEFAULT_BRIDGE_WEIGHT

    def key_from(self, bridges: int, length: int) -> tuple:
        """The key of a plat with ``bridges`` bridges and ``length`` letters."""
        if self.name == "bridges":
            return (bridges, length)
        if self.name == "length":
            return (length, bridges)
        return (self.bridge_weight * bridges + length, bridges, length)

    def key(self, plat: PlatWord) -> tuple:
        """The key of ``plat`` (smaller is better)."""
        return self.key_from(plat.bridges, plat.length)

    def energy(self, bridges: int, length: int) -> float:
        """A scalar version of the key for annealing (lower is better); for the
        lexicographic objectives a bridge is priced at ``bridge_weight`` letters."""
        if self.name == "length":
            return float(length) + 1e-3 * bridges
        return self.bridge_weight * bridges + float(length)

    def spec(self) -> str:
        """The text form accepted by :func:`make_objective`."""
        if self.name == "weighted":
            return f"weighted:{self.bridge_weight:g}"
        return self.name


def make_objective(spec: str | Objective | None) -> Objective:
    """Parse an objective name: ``bridges`` (default), ``length``, ``weighted`` or
    ``weighted:W`` (W = price of a bridge in letters).

    Raises
    ------
    InputError
        For an unknown name or a bad weight.
    """
    if isinstance(spec, Objective):
        return spec
    if spec is None or spec == "":
        return Objective()
    if not isinstance(spec, str):
        raise InputError(f"objective: expected a name, got {spec!r}")
    name, _, arg = spec.partition(":")
    if name not in OBJECTIVE_NAMES:
        raise InputError(f"objective: unknown name {name!r} (choose from "
                         f"{', '.join(OBJECTIVE_NAMES)})")
    if name != "weighted":
        if arg:
            raise InputError(f"objective: {name!r} takes no weight")
        return Objective(name)
    if not arg:
        return Objective("weighted")
    try:
        w = float(arg)
    except ValueError:
        raise InputError(f"objective: weight {arg!r} is not a number") from None
    if not (w >= 0 and w < 1e9):
        raise InputError(f"objective: weight {arg!r} must be a number from 0 up to (not "
                         f"including) 1e9 letters per bridge")
    return Objective("weighted", w)


# -- tie-breakers: cheap predictions of future reductions ----------------------------------
# They never decide between plats of different keys; among plats of equal key the search
# prefers the one with more visible room for reduction.


def cancel_potential(word: tuple[int, ...], window: int = 12) -> int:
    """Count pairs of letters that could cancel after far commutation, and (at half
    weight, rounded down) pairs blocked by exactly one adjacent-index letter that a braid
    relation might move.

    Parameters
    ----------
    word : tuple of int
        A braid word.
    window : int
        How far to look to the right of each letter (keeps the cost linear).

    Returns
    -------
    int
        ``2 * free + blocked_once`` where ``free`` counts letters ``g`` followed, after
        letters that commute with it (index distance at least 2), by ``-g``.

    References
    ----------
    .. [1] E. Artin, "Theory of braids", Ann. of Math. 48 (1947): the far commutation
       and braid relations of the braid group.
    """
    free = blocked = 0
    n = len(word)
    for p, g in enumerate(word):
        a = abs(g)
        obstacles = 0
        for q in range(p + 1, min(n, p + 1 + window)):
            h = word[q]
            if h == -g:
                if obstacles == 0:
                    free += 1
                else:
                    blocked += 1
                break
            if h == g:
                break
            if abs(abs(h) - a) < 2:
                obstacles += 1
                if obstacles > 1:
                    break
    return 2 * free + blocked


def sign_mix(word: tuple[int, ...]) -> int:
    """Sum over generator indices k of min(#sigma_k, #sigma_k^-1): crossings of opposite
    sign on the same pair of positions, the raw material of every cancellation."""
    pos: dict[int, int] = {}
    neg: dict[int, int] = {}
    for g in word:
        if g > 0:
            pos[g] = pos.get(g, 0) + 1
        else:
            neg[-g] = neg.get(-g, 0) + 1
    return sum(min(c, neg.get(k, 0)) for k, c in pos.items())


def writhe_imbalance(word: tuple[int, ...]) -> int:
    """``length - |sum of signs|``: zero for a word of one sign (which no cancellation
    inside the braid group can shorten), larger when signs are mixed."""
    s = sum(1 if g > 0 else -1 for g in word)
    return len(word) - abs(s)


def pair_touches(plat: PlatWord) -> list[int]:
    """For each pair ``i`` (positions ``2i-1, 2i``) the number of letters acting on
    one of its positions: generators ``2i-2``, ``2i-1`` and ``2i``.

    A pair touched by exactly one letter, and that letter a connecting generator
    (``2i-2`` or ``2i``), is a stabilization: the strand at one of its positions runs
    straight from cap to cup and the other crosses once. This is the pattern a bridge
    search has to create before it can remove a bridge (Birman 1976).
    """
    n = plat.bridges
    counts = [0] * n
    for g in plat.word:
        a = abs(g)
        if a % 2:  # 2i-1: the twist of pair i
            counts[(a - 1) // 2] += 1
        else:  # 2i: between pair i and pair i+1
            counts[a // 2 - 1] += 1
            counts[a // 2] += 1
    return counts


def isolation(plat: PlatWord) -> int:
    """Fewest letters touching any one pair (see :func:`pair_touches`; untouched pairs
    are ignored); 1 means a stabilization may be visible, and small values mean a pair
    is nearly isolated.

    References
    ----------
    .. [1] J. S. Birman, "On the stable equivalence of plat representations of knots
       and links", Canad. J. Math. 28 (1976): stabilization b -> b sigma_2n^(+-1).
    """
    if plat.bridges < 2:
        return 0
    touched = [c for c in pair_touches(plat) if c > 0]
    # a pair no letter touches is a split unknotted component, not a bridge to remove
    return min(touched) if touched else 0


def tiebreak(plat: PlatWord) -> tuple[int, int]:
    """Secondary key among plats of equal objective key (smaller is better): more
    cancellable pairs first, then more mixed signs."""
    return (-cancel_potential(plat.word), -sign_mix(plat.word))


__all__.append("tiebreak")
