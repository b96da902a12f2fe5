"""Jones polynomial of a plat closure through the Kauffman bracket on Temperley-Lieb states."""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass
from fractions import Fraction
from functools import cache, lru_cache

import numpy as np

from plait.errors import InputError
from plait.scoring.orientation import writhe
from plait.word import PlatWord

__all__ = [
    "MAX_JONES_BRIDGES",
    "bracket",
    "jones",
    "jones_from_bracket",
    "mirror_jones",
    "bracket_state_sum",
    "jones_state_sum",
    "bracket_state_sum_pd",
    "jones_state_sum_pd",
    "pd_writhe",
]

# Catalan(11) = 58786 states: the largest state space built on request.
MAX_JONES_BRIDGES = 11

# When a bound on the int64 entries of the state vector may reach this, carries are
# propagated between 32-bit limbs (and a limb is added), so every coefficient stays exact.
_INT64_SAFE = 1 << 62

Poly = dict  # {exponent: coefficient}, exponents int (A) or Fraction (t), no zero values


# -- the Temperley-Lieb state space ----------------------------------------------------


@dataclass(frozen=True)
class _Space:
    """Crossingless matchings of ``2n`` points and the action of each ``e_k`` on them.

    ``states[s]`` is a partner tuple: ``states[s][p]`` is the point matched with ``p``
    (0-based, points left to right on a horizontal line, arcs above the line).
    ``loop[k][s]`` says whether ``e_k`` (acting on points ``k-1, k``) closes a loop on
    state ``s`` (the two points are matched to each other). For the other states,
    ``layers[k]`` is a list of ``(src, dst)`` index arrays: ``e_k`` sends state ``src[i]``
    to ``dst[i]``, and within one layer the ``dst`` are distinct, so a layer can be added
    with one fancy-indexed ``+=``. ``growth[k]`` bounds how many terms add into one entry.
    ``cup_loops[s]`` is the number of loops made by closing state ``s`` with the cups
    ``(2i-1, 2i)``.
    """

    n: int
    states: tuple[tuple[int, ...], ...]
    start: int
    loop: tuple[np.ndarray, ...]
    layers: tuple[tuple[tuple[np.ndarray, np.ndarray], ...], ...]
    growth: tuple[int, ...]
    cup_loops: np.ndarray


def _matchings(m: int) -> list[tuple[int, ...]]:
    # Noncrossing perfect matchings of points 0..m-1: point 0 is matched with an odd
    # point j, splitting the rest into the inside (1..j-1) and the outside (j+1..m-1).
    @cache
    def rec(lo: int, hi: int) -> tuple[tuple[tuple[int, int], ...], ...]:
        if lo >= hi:
            return ((),)
        out = []
        for j in range(lo + 1, hi, 2):
            for a in rec(lo + 1, j):
                for b in rec(j + 1, hi):
                    out.append(((lo, j),) + a + b)
        return tuple(out)

    res = []
    for pairs in rec(0, m):
        partner = [0] * m
        for a, b in pairs:
            partner[a], partner[b] = b, a
        res.append(tuple(partner))
    return res


@lru_cache(maxsize=16)
def _space(n: int) -> _Space:
    m = 2 * n
    states = _matchings(m)
    index = {s: i for i, s in enumerate(states)}
    start = index[tuple(p + 1 if p % 2 == 0 else p - 1 for p in range(m))]
    loops, layers, growth = [np.zeros(0, bool)], [()], [0]  # generator 0 unused
    for k in range(1, m):
        a, b = k - 1, k
        is_loop = np.zeros(len(states), dtype=bool)
        by_dst: dict[int, list[int]] = {}
        for i, s in enumerate(states):
            if s[a] == b:
                is_loop[i] = True
                continue
            # e_k joins points a and b above the line: their partners become matched,
            # and the new points a, b (below the generator) are matched to each other.
            t = list(s)
            pa, pb = s[a], s[b]
            t[pa], t[pb] = pb, pa
            t[a], t[b] = b, a
            by_dst.setdefault(index[tuple(t)], []).append(i)
        depth = max((len(v) for v in by_dst.values()), default=0)
        lay = []
        for level in range(depth):
            pairs = [(v[level], d) for d, v in by_dst.items() if len(v) > level]
            lay.append((np.array([p[0] for p in pairs], dtype=np.intp),
                        np.array([p[1] for p in pairs], dtype=np.intp)))
        loops.append(is_loop)
        layers.append(tuple(lay))
        # the targets of e_k are the loop states: each keeps its (kink-factor) term and
        # gets at most `depth` incoming terms
        growth.append(1 + depth)
    cup_loops = np.array([_count_cup_loops(s) for s in states], dtype=np.int64)
    return _Space(n, tuple(states), start, tuple(loops), tuple(layers), tuple(growth),
                  cup_loops)


def _count_cup_loops(s: tuple[int, ...]) -> int:
    # Loops of the union of matching s (above) and the cup matching (2i, 2i+1) (below).
    seen = [False] * len(s)
    count = 0
    for p in range(len(s)):
        if seen[p]:
            continue
        count += 1
        q = p
        while not seen[q]:
            seen[q] = True
            r = s[q]
            seen[r] = True
            q = r + 1 if r % 2 == 0 else r - 1
    return count


# -- the bracket -------------------------------------------------------------------------


def bracket(plat: PlatWord) -> dict[int, int]:
    """Kauffman bracket of the plat diagram as ``{exponent of A: coefficient}``.

    A vector over the crossingless matchings of the ``2n`` points (at most Catalan(n)
    entries, each a Laurent polynomial in ``A``) starts at the cap matching and is carried
    down the word with ``<sigma_k> = A id + A^-1 e_k`` and ``<sigma_k^-1> = A^-1 id + A e_k``;
    the cups close it, each state contributing ``d^(loops - 1)`` with ``d = -A^2 - A^-2``,
    so that the crossingless unknot has bracket 1.

    Parameters
    ----------
    plat : PlatWord
        At most :data:`MAX_JONES_BRIDGES` bridges.

    Returns
    -------
    dict
        Nonzero coefficients by exponent of ``A``; exact integers.

    Raises
    ------
    InputError
        When the plat has more than :data:`MAX_JONES_BRIDGES` bridges.

    Notes
    -----
    Cost is ``O(length * Catalan(n) * width * limbs)`` with ``width`` the spread of
    exponents: linear in the word length for fixed ``n`` and bounded polynomials. The
    factor ``A^(sum of letter signs)`` is kept aside, so a letter leaves the states whose
    two points are not yet joined unchanged, multiplies those already joined by the kink
    factor ``-A^(-4 eps)`` and adds ``A^(-2 eps)`` times the images under ``e_k``: every
    update is in place on one integer array whose column ``c`` holds an even relative
    exponent. Large coefficients are split into int64 limbs of 32 bits, carried whenever a
    bound on the entries nears 2^62, so the arithmetic is exact and stays vectorised.

    References
    ----------
    .. [1] L. H. Kauffman, "State models and the Jones polynomial", Topology 26 (1987).
    .. [2] V. F. R. Jones, "Hecke algebra representations of braid groups and link
       polynomials", Ann. of Math. 126 (1987): the Temperley-Lieb representation.
    """
    n = plat.bridges
    if n > MAX_JONES_BRIDGES:
        raise InputError(f"jones: {n} bridges is over the limit of {MAX_JONES_BRIDGES} "
                         f"for the Temperley-Lieb state vector")
    sp = _space(n)
    S = len(sp.states)
    # The common factor A^(sum of letter signs) is kept aside, so the id term of a letter
    # leaves a state alone. Relative to it, e_k multiplies by A^(-2 eps) and a state whose
    # points k, k+1 are already joined is multiplied by A^(-eps) d / A^eps + 1 = -A^(-4 eps)
    # (the kink factor). Every relative exponent is even.
    # V[k, s, c]: limb k of the coefficient of A^(2 (c - off)) in state s; the coefficient
    # is sum_k V[k, s, c] * 2^(32 k). All operations are additions, so limbs are added
    # independently and carried only when a bound on |entries| nears 2^62. Columns
    # clo..chi-1 are live; the buffer is re-centred when they reach its edges.
    width = 64
    V = np.zeros((1, S, width), dtype=np.int64)
    off = clo = width // 2
    chi = clo + 1
    V[0, sp.start, off] = 1
    total_eps = 0
    bound = 1  # bound on max |entry| of V
    for j, g in enumerate(plat.word):
        k = abs(g)
        eps = 1 if g > 0 else -1
        total_eps += eps
        growth = sp.growth[k]
        if bound * growth >= _INT64_SAFE:
            V, bound = _carry(V)
        if clo < 2 or chi + 2 > V.shape[2] or (j & 31) == 31:
            V, off, clo, chi = _recentre(V, off, clo, chi)
            if V is None:
                return {}
        lp = sp.loop[k]
        VL = V[:, lp, clo:chi]
        if eps == 1:  # loop states: new[c] = -old[c + 2]
            V[:, lp, chi - 2:chi] = 0
            V[:, lp, clo - 2:chi - 2] = -VL
            for src, dst in sp.layers[k]:
                V[:, dst, clo - 1:chi - 1] += V[:, src, clo:chi]
            clo -= 2
        else:  # loop states: new[c] = -old[c - 2]
            V[:, lp, clo:clo + 2] = 0
            V[:, lp, clo + 2:chi + 2] = -VL
            for src, dst in sp.layers[k]:
                V[:, dst, clo + 1:chi + 1] += V[:, src, clo:chi]
            chi += 2
        bound *= growth
    V, off, clo, chi = _recentre(V, off, clo, chi)
    if V is None:
        return {}
    lo = total_eps + 2 * (clo - off)
    V = V[:, :, clo:chi]
    # combine the limbs into Python integers
    X = V[0].astype(object)
    for k in range(1, V.shape[0]):
        X = X + (V[k].astype(object) << (_LIMB * k))
    # close with the cups: sum the rows by loop count, times d^(loops - 1)
    out: dict[int, int] = {}
    for c in np.unique(sp.cup_loops):
        total = X[sp.cup_loops == c].sum(axis=0).tolist()
        dpow = _d_power(int(c) - 1)
        for col, coeff in enumerate(total):
            if coeff:
                e = lo + 2 * col
                for de, dc in dpow.items():
                    out[e + de] = out.get(e + de, 0) + int(coeff) * dc
    return {e: c for e, c in sorted(out.items()) if c}


_LIMB = 32
_TOP_SPLIT = 1 << 40


def _recentre(V: np.ndarray, off: int, clo: int, chi: int):
    # Trim all-zero columns from the live window and place it in the middle of a buffer
    # with room to grow. Returns (None, ...) when the vector is zero.
    nz = np.flatnonzero(V[:, :, clo:chi].any(axis=(0, 1)))
    if len(nz) == 0:
        return None, off, clo, chi
    a, b = clo + int(nz[0]), clo + int(nz[-1]) + 1
    live = b - a
    width = max(64, 2 * live + 64)
    if width <= V.shape[2] and a >= 2 and b + 2 <= V.shape[2] and \
            min(a, V.shape[2] - b) >= (V.shape[2] - live) // 4:
        return V, off, a, b  # enough room on both sides already
    W = np.zeros((V.shape[0], V.shape[1], width), dtype=np.int64)
    start = (width - live) // 2
    W[:, :, start:start + live] = V[:, :, a:b]
    return W, off + start - a, start, start + live


def _carry(V: np.ndarray) -> tuple[np.ndarray, int]:
    # Propagate carries so limbs 0..K-2 lie in [0, 2^32); split the top limb when it is
    # large. Returns the new array and a bound on its entries.
    V = V.copy()
    K = V.shape[0]
    for k in range(K - 1):
        c = V[k] >> _LIMB
        V[k] -= c << _LIMB
        V[k + 1] += c
    top = int(np.abs(V[K - 1]).max())
    if top >= _TOP_SPLIT:
        c = V[K - 1] >> _LIMB
        V[K - 1] -= c << _LIMB
        V = np.concatenate([V, c[None]], axis=0)
        top = int(np.abs(c).max())
    return V, max(top, 1 << _LIMB)


@lru_cache(maxsize=64)
def _d_power_items(m: int) -> tuple[tuple[int, int], ...]:
    # d^m = (-1)^m (A^2 + A^-2)^m = (-1)^m sum_i C(m, i) A^(2m - 4i)
    from math import comb

    sign = -1 if m % 2 else 1
    return tuple((2 * m - 4 * i, sign * comb(m, i)) for i in range(m + 1))


def _d_power(m: int) -> dict[int, int]:
    return dict(_d_power_items(m))


def jones_from_bracket(br: dict[int, int], w: int) -> dict[Fraction, int]:
    """Jones polynomial from a bracket and the writhe.

    ``f = (-A^3)^(-w) <L>`` and ``V(t) = f(A = t^(-1/4))``; exponents of ``t`` are
    integers for links with an odd number of components and half-integers otherwise.
    """
    sign = -1 if w % 2 else 1
    return {Fraction(-(e - 3 * w), 4): sign * c for e, c in sorted(br.items(), reverse=True)}


def jones(plat: PlatWord) -> dict[Fraction, int]:
    """Jones polynomial of the plat closure as ``{exponent of t: coefficient}``.

    Parameters
    ----------
    plat : PlatWord

    Returns
    -------
    dict
        Exponents are ``Fraction`` (half-integers for an even number of components),
        sorted increasingly; coefficients are exact integers.

    References
    ----------
    .. [1] L. H. Kauffman, "State models and the Jones polynomial", Topology 26 (1987):
       ``V(t) = (-A^3)^(-w) <L>`` at ``A = t^(-1/4)``.

    Examples
    --------
    >>> from plait.word import ClosedBraid
    >>> jones(ClosedBraid.from_word([1, 1, 1]).to_plat())
    {Fraction(1, 1): 1, Fraction(3, 1): 1, Fraction(4, 1): -1}
    """
    return jones_from_bracket(bracket(plat), writhe(plat))


def mirror_jones(v: dict[Fraction, int]) -> dict[Fraction, int]:
    """The Jones polynomial of the mirror image: ``V(1/t)``."""
    return {-e: c for e, c in sorted(v.items(), key=lambda kv: -kv[0])}


# -- state-sum oracles (tests and bench only) ---------------------------------------------


def _uf_count(parent: list[int], unions: Sequence[tuple[int, int]]) -> int:
    p = list(parent)

    def find(x: int) -> int:
        while p[x] != x:
            p[x] = p[p[x]]
            x = p[x]
        return x

    comps = len(p)
    for a, b in unions:
        ra, rb = find(a), find(b)
        if ra != rb:
            p[ra] = rb
            comps -= 1
    return comps


def bracket_state_sum(plat: PlatWord) -> dict[int, int]:
    """Kauffman bracket by the full state sum over ``2^length`` smoothings (an oracle).

    Every crossing is smoothed the ``id`` way or the ``e_k`` way and the loops of the
    resulting diagram are counted with a union-find over the segments of the plat.
    Independent of the Temperley-Lieb code; exponential, for tests and benchmarks.

    References
    ----------
    .. [1] L. H. Kauffman, "State models and the Jones polynomial", Topology 26 (1987).
    """
    m, word, L = plat.strands, plat.word, plat.length
    # segment (level, position) -> node id; level j lies between letters j-1 and j
    seg = [[lvl * m + p for p in range(m)] for lvl in range(L + 1)]
    fixed: list[tuple[int, int]] = []
    for i in range(0, m, 2):
        fixed.append((seg[0][i], seg[0][i + 1]))
        fixed.append((seg[L][i], seg[L][i + 1]))
    choices = []
    for j, g in enumerate(word):
        a = abs(g) - 1
        for p in range(m):
            if p not in (a, a + 1):
                fixed.append((seg[j][p], seg[j + 1][p]))
        vertical = ((seg[j][a], seg[j + 1][a]), (seg[j][a + 1], seg[j + 1][a + 1]))
        horizontal = ((seg[j][a], seg[j][a + 1]), (seg[j + 1][a], seg[j + 1][a + 1]))
        eps = 1 if g > 0 else -1
        choices.append(((eps, vertical), (-eps, horizontal)))
    # contract the fixed unions once: nodes become their roots
    base = list(range((L + 1) * m))
    p = base

    def find(x: int) -> int:
        while p[x] != x:
            p[x] = p[p[x]]
            x = p[x]
        return x

    for a, b in fixed:
        ra, rb = find(a), find(b)
        if ra != rb:
            p[ra] = rb
    roots = sorted({find(x) for x in range(len(p))})
    rid = {r: i for i, r in enumerate(roots)}
    ch = [tuple((e, tuple((rid[find(a)], rid[find(b)]) for a, b in un)) for e, un in c)
          for c in choices]
    start = list(range(len(roots)))
    out: dict[int, int] = {}
    for mask in range(1 << L):
        expo = 0
        unions: list[tuple[int, int]] = []
        for j in range(L):
            e, un = ch[j][(mask >> j) & 1]
            expo += e
            unions.extend(un)
        loops = _uf_count(start, unions)
        for de, dc in _d_power_items(loops - 1):
            out[expo + de] = out.get(expo + de, 0) + dc
    return {e: c for e, c in sorted(out.items()) if c}


def jones_state_sum(plat: PlatWord) -> dict[Fraction, int]:
    """Jones polynomial from :func:`bracket_state_sum` (an oracle for tests and bench)."""
    return jones_from_bracket(bracket_state_sum(plat), writhe(plat))


def bracket_state_sum_pd(crossings: Sequence[Sequence[int]]) -> dict[int, int]:
    """Kauffman bracket of a PD code by the full state sum (an oracle).

    At a crossing ``(a, b, c, d)`` (counterclockwise from the incoming under-strand) the
    A-smoothing joins ``a`` with ``b`` and ``c`` with ``d``; the B-smoothing joins ``a``
    with ``d`` and ``b`` with ``c``.

    References
    ----------
    .. [1] L. H. Kauffman, "State models and the Jones polynomial", Topology 26 (1987).
    """
    labels = sorted({x for c in crossings for x in c})
    if not labels:
        return {0: 1}
    idx = {x: i for i, x in enumerate(labels)}
    ch = [(((idx[a], idx[b]), (idx[c], idx[d])), ((idx[a], idx[d]), (idx[b], idx[c])))
          for a, b, c, d in crossings]
    start = list(range(len(labels)))
    L = len(ch)
    out: dict[int, int] = {}
    for mask in range(1 << L):
        unions: list[tuple[int, int]] = []
        expo = 0
        for j in range(L):
            bit = (mask >> j) & 1
            expo += -1 if bit else 1
            unions.extend(ch[j][bit])
        loops = _uf_count(start, unions)
        for de, dc in _d_power_items(loops - 1):
            out[expo + de] = out.get(expo + de, 0) + dc
    return {e: c for e, c in sorted(out.items()) if c}


def pd_writhe(crossings: Sequence[Sequence[int]]) -> int:
    """Writhe of a PD code: a crossing ``(a, b, c, d)`` is positive when its over-strand
    runs from ``d`` to ``b``. The orientation comes from
    :func:`plait.diagrams.pd.pd_orientation`."""
    from plait.diagrams.pd import PDCode, pd_orientation

    pd = PDCode(tuple(tuple(c) for c in crossings))
    orient = pd_orientation(pd)
    w = 0
    for j, (_a, b, _c, d) in enumerate(pd.crossings):
        tb, hb = orient[b]
        td, hd = orient[d]
        if tb != hb:  # b leaves j: the over-strand runs d -> b
            positive = tb == j
        elif td != hd:  # b is a one-edge loop at j; look at d instead
            positive = hd == j
        else:  # both are loops: labels increase along the strand
            positive = b - d == 1 or d - b > 1
        w += 1 if positive else -1
    return w


def jones_state_sum_pd(crossings: Sequence[Sequence[int]]) -> dict[Fraction, int]:
    """Jones polynomial of a PD code by the state sum (an oracle for tests)."""
    return jones_from_bracket(bracket_state_sum_pd(crossings), pd_writhe(crossings))
