"""Signature of a plat closure by the Gordon–Litherland formula on a Goeritz matrix."""

from __future__ import annotations

from collections.abc import Sequence
from fractions import Fraction

from plait.diagrams.pd import trace_plat
from plait.word import PlatWord

__all__ = ["signature", "goeritz_matrix", "symmetric_inertia", "plat_regions"]


def plat_regions(plat: PlatWord) -> tuple[int, list[tuple[int, int, int, int]]]:
    """The regions of the plat diagram around each crossing.

    Between positions ``j`` and ``j+1`` lies gap ``j`` (gap ``0`` left of everything, gap
    ``2n`` right of everything). Going down the word, a letter on positions ``k, k+1``
    pinches gap ``k``: the region of that gap above the crossing ends and a new one starts
    below it, while gaps ``k-1`` and ``k+1`` pass by on its left and right. Above the caps
    and below the cups every even gap opens onto the outer region; the odd gap ``2i-1`` is
    closed by cap ``i`` at the top and by cup ``i`` at the bottom.

    Returns
    -------
    count, crossings
        The number of regions (numbered ``0..count-1``, region ``0`` the outer one) and for
        each letter ``(top, bottom, left, right)`` region numbers. Regions of odd gaps are
        shaded: they form the checkerboard surface; even gaps are unshaded.
    """
    n2 = plat.strands
    parent: list[int] = []

    def new() -> int:
        parent.append(len(parent))
        return len(parent) - 1

    def find(a: int) -> int:
        while parent[a] != a:
            parent[a] = parent[parent[a]]
            a = parent[a]
        return a

    outer = new()
    gap = [outer if j % 2 == 0 else new() for j in range(n2 + 1)]
    around = []
    for g in plat.word:
        k = abs(g)
        top = gap[k]
        gap[k] = new()
        around.append((top, gap[k], gap[k - 1], gap[k + 1]))
    for j in range(0, n2 + 1, 2):
        a, b = find(gap[j]), find(outer)
        if a != b:
            parent[max(a, b)] = min(a, b)
    # renumber the union-find roots 0..count-1 with the outer region first
    names: dict[int, int] = {find(outer): 0}
    for x in range(len(parent)):
        names.setdefault(find(x), len(names))
    return len(names), [tuple(names[find(x)] for x in c) for c in around]


def _crossing_data(plat: PlatWord) -> list[tuple[int, bool]]:
    """For each letter: its Goeritz sign eta (+-1) and whether it is of type II.

    The unshaded regions at a letter on gap ``k`` are its top and bottom when ``k`` is
    even and its left and right when ``k`` is odd, so the picture at an odd gap is the one
    at an even gap turned by a quarter turn, which flips the incidence number:
    eta = -sign(letter) * (-1)^k. The shaded band at the crossing joins top and bottom
    (``k`` odd) or left and right (``k`` even). The crossing is of type II when the
    oriented smoothing joins the two shaded regions: both strands run the same way along
    the word (the smoothing is vertical) and the band is vertical, or they run opposite
    ways (the smoothing is horizontal) and the band is horizontal. The overall sign of
    eta is the one for which the signature agrees with KnotInfo's convention.
    """
    word = plat.word
    dirs: list[list[int]] = [[] for _ in word]
    for path in trace_plat(plat):
        for j, direction, _p, _q in path:
            dirs[j].append(direction)
    out = []
    for j, g in enumerate(word):
        k = abs(g)
        eta = (1 if g > 0 else -1) * (1 if k % 2 == 1 else -1)
        same = dirs[j][0] == dirs[j][1]
        type2 = same if k % 2 == 1 else not same
        out.append((eta, type2))
    return out


def goeritz_matrix(plat: PlatWord) -> list[list[int]]:
    """Goeritz matrix of the plat diagram on its unshaded regions, outer region deleted.

    Entry ``(i, j)``, ``i != j``, is minus the sum of the incidence numbers eta of the
    crossings where unshaded regions ``i`` and ``j`` meet; diagonal entries make every
    row of the full matrix sum to zero.

    References
    ----------
    .. [1] L. Goeritz, "Knoten und quadratische Formen", Math. Z. 36 (1933).
    .. [2] C. McA. Gordon and R. A. Litherland, "On the signature of a link",
       Invent. Math. 47 (1978).
    """
    count, around = plat_regions(plat)
    data = _crossing_data(plat)
    unshaded: dict[int, int] = {}
    pairs = []
    for j, (top, bottom, left, right) in enumerate(around):
        k = abs(plat.word[j])
        a, b = (top, bottom) if k % 2 == 0 else (left, right)
        pairs.append((a, b, data[j][0]))
        for r in (a, b):
            unshaded.setdefault(r, len(unshaded))
    unshaded.setdefault(0, len(unshaded))
    # index 0 of the full matrix is reserved for the outer region, which is deleted
    order = [0] + [r for r in unshaded if r != 0]
    index = {r: i for i, r in enumerate(order)}
    m = len(order)
    full = [[0] * m for _ in range(m)]
    for a, b, eta in pairs:
        if a == b:
            continue
        i, j = index[a], index[b]
        full[i][j] -= eta
        full[j][i] -= eta
    for i in range(m):
        full[i][i] = -sum(full[i][j] for j in range(m) if j != i)
    return [row[1:] for row in full[1:]]


def symmetric_inertia(matrix: Sequence[Sequence[int]]) -> tuple[int, int, int]:
    """Numbers of positive, negative and zero eigenvalues of a symmetric rational matrix.

    Exact congruence diagonalisation (Sylvester's law of inertia): pivot on a nonzero
    diagonal entry; if the remaining diagonal is zero but an off-diagonal entry ``a_ij``
    is not, replace row and column ``i`` by their sum with row and column ``j``, which
    makes the pivot ``2 a_ij`` nonzero.

    References
    ----------
    .. [1] J. J. Sylvester, "A demonstration of the theorem that every homogeneous
       quadratic polynomial is reducible by real orthogonal substitutions to the form of a
       sum of positive and negative squares", Philos. Mag. 4 (1852).
    """
    a = [[Fraction(x) for x in row] for row in matrix]
    m = len(a)
    pos = neg = 0
    live = list(range(m))
    while live:
        piv = next((i for i in live if a[i][i] != 0), None)
        if piv is None:
            pair = next(((i, j) for i in live for j in live if a[i][j] != 0), None)
            if pair is None:
                break
            i, j = pair
            for r in live:
                a[i][r] += a[j][r]
            for r in live:
                a[r][i] += a[r][j]
            piv = i
        p = a[piv][piv]
        if p > 0:
            pos += 1
        else:
            neg += 1
        live.remove(piv)
        col = {r: a[r][piv] for r in live if a[r][piv] != 0}
        for r, f in col.items():
            q = f / p
            row_r, row_p = a[r], a[piv]
            for c in live:
                if row_p[c]:
                    row_r[c] -= q * row_p[c]
    return pos, neg, m - pos - neg


def signature(plat: PlatWord) -> int:
    """Signature of the oriented link closing the plat (orientation of
    :func:`plait.diagrams.pd.trace_plat`), in KnotInfo's convention: the right-handed trefoil,
    closure of the braid ``1 1 1``, has signature ``-2``.

    Computed as ``sign(G) - mu`` where ``G`` is the Goeritz matrix of the checkerboard
    colouring whose shaded regions are the odd gaps of the plat (the discs under the
    caps), and ``mu`` sums the incidence numbers of the type II crossings.

    References
    ----------
    .. [1] C. McA. Gordon and R. A. Litherland, "On the signature of a link",
       Invent. Math. 47 (1978), Theorem 6 and Corollary 6'.
    """
    pos, neg, _ = symmetric_inertia(goeritz_matrix(plat))
    mu = sum(eta for eta, type2 in _crossing_data(plat) if type2)
    return pos - neg - mu
