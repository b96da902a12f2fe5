"""Plat words and closed braid words: the data model every other module works on."""

from __future__ import annotations

from collections.abc import Iterable, Sequence
from dataclasses import dataclass, field

from plait.errors import InputError

__all__ = ["PlatWord", "ClosedBraid", "MAX_STRANDS", "MAX_LENGTH", "min_strands"]

# Absurd sizes are refused with a clear message rather than left to exhaust memory.
MAX_STRANDS = 64
MAX_LENGTH = 200_000


def min_strands(word: Sequence[int], *, even: bool) -> int:
    """Least number of strands on which every generator of ``word`` acts.

    Parameters
    ----------
    word : sequence of int
        Artin generators, ``k`` for sigma_k and ``-k`` for its inverse.
    even : bool
        Round up to an even number (plats live on an even number of strands).

    Returns
    -------
    int
        ``max |g| + 1`` (at least 2), rounded up to even when asked.
    """
    top = max((abs(g) for g in word), default=0)
    m = max(top + 1, 2)
    if even and m % 2:
        m += 1
    return m


def _check_word(word: Sequence[int], strands: int, kind: str) -> tuple[int, ...]:
    if isinstance(strands, bool) or not isinstance(strands, int):
        raise InputError(f"{kind}: strands must be an integer, got {strands!r}")
    if strands > MAX_STRANDS:
        raise InputError(f"{kind}: {strands} strands is over the limit of {MAX_STRANDS}")
    if len(word) > MAX_LENGTH:
        raise InputError(f"{kind}: word of length {len(word)} is over the limit of {MAX_LENGTH}")
    out = []
    for i, g in enumerate(word):
        if isinstance(g, bool) or not isinstance(g, int):
            raise InputError(f"{kind}: letter {i + 1} is {g!r}, not a nonzero integer")
        if g == 0:
            raise InputError(f"{kind}: letter {i + 1} is 0; generators are nonzero integers")
        if abs(g) >= strands:
            raise InputError(
                f"{kind}: generator {g} (letter {i + 1}) is out of range for {strands} strands "
                f"(|g| must be at most {strands - 1})"
            )
        out.append(int(g))
    return tuple(out)


@dataclass(frozen=True)
class PlatWord:
    """A braid word on ``2n`` strands read as a plat (an ``n``-bridge presentation).

    The plat closure joins positions ``(2i-1, 2i)`` by a cap above the word and by a
    cup below it, ``i = 1..n``. Letter ``k`` is the Artin generator sigma_k on
    positions ``k, k+1`` (1-based) in which the strand entering at ``k+1`` passes over
    and leaves at ``k``; ``-k`` is its inverse. Letters are read top to bottom.

    Parameters
    ----------
    strands : int
        Number of strands, even and at least 2.
    word : tuple of int
        Nonzero generators with ``|g| < strands``.

    Examples
    --------
    >>> p = PlatWord(4, (2, -1, 2))
    >>> p.bridges, p.length
    (2, 3)
    """

    strands: int
    word: tuple[int, ...] = field(default=())

    def __post_init__(self) -> None:
        if isinstance(self.strands, bool) or not isinstance(self.strands, int):
            raise InputError(f"plat: strands must be an integer, got {self.strands!r}")
        if self.strands < 2 or self.strands % 2:
            raise InputError(f"plat: strands must be even and at least 2, got {self.strands}")
        object.__setattr__(self, "word", _check_word(tuple(self.word), self.strands, "plat"))

    # -- construction ------------------------------------------------------------------
    @classmethod
    def from_word(cls, word: Iterable[int], strands: int | None = None) -> PlatWord:
        """Plat word with the given letters; default strands is the least even fit."""
        w = tuple(word)
        return cls(min_strands(w, even=True) if strands is None else strands, w)

    # -- basic properties ----------------------------------------------------------------
    @property
    def bridges(self) -> int:
        """Number of bridges ``n`` (= strands / 2)."""
        return self.strands // 2

    @property
    def length(self) -> int:
        """Number of letters (crossings of the plat diagram)."""
        return len(self.word)

    def __len__(self) -> int:
        return len(self.word)

    def permutation(self) -> tuple[int, ...]:
        """Where each top position ends at the bottom.

        Returns
        -------
        tuple of int
            ``perm[p - 1] = q`` when the strand entering at top position ``p`` leaves at
            bottom position ``q`` (1-based values).
        """
        # at[q] = top position of the strand currently at position q (0-based)
        at = list(range(self.strands))
        for g in self.word:
            k = abs(g) - 1
            at[k], at[k + 1] = at[k + 1], at[k]
        perm = [0] * self.strands
        for q, p in enumerate(at):
            perm[p] = q + 1
        return tuple(perm)

    def component_labels(self) -> tuple[int, ...]:
        """Component index (0-based, numbered by first cap) of the cap of each pair ``i``.

        Every component of a plat closure passes through at least one cap, so the
        labels of the ``n`` caps determine the components.
        """
        return _components_by_union(self.permutation(), self.bridges)

    @property
    def components(self) -> int:
        """Number of components of the plat closure."""
        labels = self.component_labels()
        return (max(labels) + 1) if labels else 0

    # -- operations ----------------------------------------------------------------------
    def inverse(self) -> PlatWord:
        """The inverse braid word: letters reversed and inverted (the diagram turned over
        top to bottom and mirrored, read as a plat)."""
        return PlatWord(self.strands, tuple(-g for g in reversed(self.word)))

    def mirror(self) -> PlatWord:
        """Mirror image: every crossing changed."""
        return PlatWord(self.strands, tuple(-g for g in self.word))

    def __add__(self, other: PlatWord) -> PlatWord:
        if not isinstance(other, PlatWord):
            return NotImplemented
        if other.strands != self.strands:
            raise InputError(
                f"cannot concatenate plat words on {self.strands} and {other.strands} strands"
            )
        return PlatWord(self.strands, self.word + other.word)

    def with_word(self, word: Iterable[int]) -> PlatWord:
        """Same strands, new letters."""
        return PlatWord(self.strands, tuple(word))

    def to_dict(self) -> dict:
        """JSON-ready summary (the contract of ``plait show --json``)."""
        return {
            "strands": self.strands,
            "word": list(self.word),
            "bridges": self.bridges,
            "length": self.length,
            "components": self.components,
        }

    def __str__(self) -> str:
        return " ".join(str(g) for g in self.word)


def _components_by_union(perm: tuple[int, ...], n: int) -> tuple[int, ...]:
    # Union-find over the n caps: the two top positions of cap i are joined by the cap;
    # the strand from top p ends at bottom perm[p]; the cup joins bottom q with its
    # partner; the partner's strand runs up to some top position whose cap is merged.
    parent = list(range(n))

    def find(a: int) -> int:
        while parent[a] != a:
            parent[a] = parent[parent[a]]
            a = parent[a]
        return a

    top_of_bottom = [0] * (2 * n + 1)
    for p, q in enumerate(perm, start=1):
        top_of_bottom[q] = p
    for p in range(1, 2 * n + 1):
        q = perm[p - 1]
        q_partner = q + 1 if q % 2 else q - 1
        p2 = top_of_bottom[q_partner]
        a, b = find((p - 1) // 2), find((p2 - 1) // 2)
        if a != b:
            parent[max(a, b)] = min(a, b)
    roots: dict[int, int] = {}
    labels = []
    for i in range(n):
        r = find(i)
        if r not in roots:
            roots[r] = len(roots)
        labels.append(roots[r])
    return tuple(labels)


@dataclass(frozen=True)
class ClosedBraid:
    """A braid word on ``m`` strands read as a closed braid.

    Parameters
    ----------
    strands : int
        Number of strands ``m >= 1``.
    word : tuple of int
        Nonzero generators with ``|g| < m``.
    """

    strands: int
    word: tuple[int, ...] = field(default=())

    def __post_init__(self) -> None:
        if isinstance(self.strands, bool) or not isinstance(self.strands, int):
            raise InputError(f"braid: strands must be an integer, got {self.strands!r}")
        if self.strands < 1:
            raise InputError(f"braid: strands must be at least 1, got {self.strands}")
        if 2 * self.strands > MAX_STRANDS:
            raise InputError(
                f"braid: {self.strands} strands is over the limit of {MAX_STRANDS // 2} "
                f"(its plat needs twice as many)"
            )
        object.__setattr__(self, "word", _check_word(tuple(self.word), self.strands, "braid"))

    @classmethod
    def from_word(cls, word: Iterable[int], strands: int | None = None) -> ClosedBraid:
        """Closed braid with the given letters; default strands is ``max |g| + 1``.

        An empty word names no strand count, so it needs ``strands``: the trivial
        ``strands``-braid, whose closure is the ``strands``-component unlink.
        """
        w = tuple(word)
        if not w and strands is None:
            raise InputError("braid: an empty word needs a strand count (--strands N gives "
                             "the trivial N-braid, whose closure is the N-component unlink)")
        return cls(min_strands(w, even=False) if strands is None else strands, w)

    @property
    def length(self) -> int:
        return len(self.word)

    def to_plat(self) -> PlatWord:
        """The plat on ``2m`` strands with the same closure.

        Old strand ``i`` sits at position ``2i-1`` and its return strand at ``2i``; the
        braid strands always pass in front of the return strands, so sigma_i^e becomes
        sigma_{2i} sigma_{2i-1}^e sigma_{2i}^-1.

        References
        ----------
        .. [1] J. S. Birman, "On the stable equivalence of plat representations of knots
           and links", Canad. J. Math. 28 (1976): every closed m-braid is an m-plat.
        """
        out: list[int] = []
        for g in self.word:
            i = abs(g)
            e = 1 if g > 0 else -1
            out.extend((2 * i, e * (2 * i - 1), -2 * i))
        return PlatWord(2 * self.strands, tuple(out))
