"""Orientation of a plat closure: components, crossing signs, writhe and linking numbers."""

from __future__ import annotations

from dataclasses import dataclass
from functools import lru_cache

from plait.diagrams.pd import trace_plat
from plait.word import PlatWord

__all__ = [
    "PlatTrace",
    "trace",
    "crossing_signs",
    "writhe",
    "linking_matrix",
    "linking_numbers",
]


@dataclass(frozen=True)
class PlatTrace:
    """The oriented plat closure, crossing by crossing.

    Attributes
    ----------
    components : int
        Number of components of the closure.
    over_direction : tuple of int
        For letter ``j``, ``+1`` when its over-strand runs down the word, ``-1`` up.
    under_direction : tuple of int
        The same for the under-strand.
    over_component, under_component : tuple of int
        Component index (0-based, numbered by first cap as in :func:`plait.diagrams.pd.trace_plat`)
        of the over- and under-strand of letter ``j``.
    signs : tuple of int
        Sign of each crossing (``+1`` positive, ``-1`` negative).

    Notes
    -----
    Letter ``k`` (sigma_k) is positive when both strands run down; reversing one strand
    changes the sign, so ``sign = sign(letter) * over_direction * under_direction``.
    """

    components: int
    over_direction: tuple[int, ...]
    under_direction: tuple[int, ...]
    over_component: tuple[int, ...]
    under_component: tuple[int, ...]
    signs: tuple[int, ...]


def trace(plat: PlatWord) -> PlatTrace:
    """Orient every strand of the plat closure and sign every crossing.

    The orientation is plait's convention (:func:`plait.diagrams.pd.trace_plat`): each component
    starts at the left end of its first cap, going down.

    Parameters
    ----------
    plat : PlatWord

    Returns
    -------
    PlatTrace
    """
    return _trace(plat.strands, plat.word)


@lru_cache(maxsize=256)
def _trace(strands: int, word: tuple[int, ...]) -> PlatTrace:
    plat = PlatWord(strands, word)
    L = len(word)
    over_dir = [0] * L
    under_dir = [0] * L
    over_comp = [0] * L
    under_comp = [0] * L
    comps = trace_plat(plat)
    for c, path in enumerate(comps):
        for j, direction, p, _q in path:
            k = abs(word[j])
            # sigma_k: the strand entering at k+1 from above (leaving at k+1 from below
            # when travelling up) is the over-strand; for sigma_k^-1 it is the one at k.
            top_pos = p if direction == 1 else _q
            over = (top_pos == k + 1) if word[j] > 0 else (top_pos == k)
            if over:
                over_dir[j], over_comp[j] = direction, c
            else:
                under_dir[j], under_comp[j] = direction, c
    signs = tuple((1 if g > 0 else -1) * over_dir[j] * under_dir[j]
                  for j, g in enumerate(word))
    return PlatTrace(
        components=len(comps),
        over_direction=tuple(over_dir),
        under_direction=tuple(under_dir),
        over_component=tuple(over_comp),
        under_component=tuple(under_comp),
        signs=signs,
    )


def crossing_signs(plat: PlatWord) -> tuple[int, ...]:
    """Sign of every crossing of the oriented plat closure, in word order."""
    return trace(plat).signs


def writhe(plat: PlatWord) -> int:
    """Writhe of the plat diagram: the sum of all crossing signs.

    References
    ----------
    .. [1] L. H. Kauffman, "State models and the Jones polynomial", Topology 26 (1987):
       the writhe normalises the bracket into an isotopy invariant.
    """
    return sum(trace(plat).signs)


def linking_matrix(plat: PlatWord) -> list[list[int]]:
    """Pairwise linking numbers of the components (zero diagonal).

    ``lk(i, j)`` is half the sum of the signs of the crossings between components
    ``i`` and ``j``; components are numbered by their first cap.

    Returns
    -------
    list of list of int
        Symmetric ``c x c`` matrix, ``c`` the number of components.
    """
    tr = trace(plat)
    c = tr.components
    twice = [[0] * c for _ in range(c)]
    for s, a, b in zip(tr.signs, tr.over_component, tr.under_component, strict=True):
        if a != b:
            twice[a][b] += s
            twice[b][a] += s
    return [[v // 2 for v in row] for row in twice]


def linking_numbers(plat: PlatWord) -> dict[tuple[int, int], int]:
    """Linking number of every pair ``i < j`` of components."""
    m = linking_matrix(plat)
    return {(i, j): m[i][j] for i in range(len(m)) for j in range(i + 1, len(m))}
