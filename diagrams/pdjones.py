"""Kauffman bracket and Jones polynomial computed directly from a PD code."""

from __future__ import annotations

from fractions import Fraction

from plait.diagrams.pd import PDCode, plat_to_pd
from plait.diagrams.wirtinger import occurrence_roles, strand_walks
from plait.word import PlatWord

__all__ = [
    "pd_bracket",
    "pd_crossing_signs",
    "pd_jones",
    "pd_jones_all_orientations",
    "plat_jones",
    "plat_jones_all_orientations",
]

# Laurent polynomials in A are dicts {exponent: coefficient} with no zero coefficients.
Poly = dict[int, int]


def _mul(p: Poly, q: Poly) -> Poly:
    out: Poly = {}
    for e1, c1 in p.items():
        for e2, c2 in q.items():
            out[e1 + e2] = out.get(e1 + e2, 0) + c1 * c2
    return {e: c for e, c in out.items() if c}


def _add_into(acc: Poly, p: Poly) -> None:
    for e, c in p.items():
        v = acc.get(e, 0) + c
        if v:
            acc[e] = v
        else:
            acc.pop(e, None)


_LOOP: Poly = {2: -1, -2: -1}  # d = -A^2 - A^-2


def _div_loop(p: Poly) -> Poly:
    # exact division by d = -A^2 - A^-2 = -A^-2 (A^4 + 1), from the top degree down
    p = dict(p)
    out: Poly = {}
    while p:
        top = max(p)
        c = p[top]
        q = -c  # leading term of d is -A^2
        out[top - 2] = q
        for e, dc in _LOOP.items():
            v = p.get(top - 2 + e, 0) - q * dc
            if v:
                p[top - 2 + e] = v
            else:
                p.pop(top - 2 + e, None)
    return out


def _order(pd: PDCode) -> list[int]:
    # greedy order keeping the set of open edge ends small
    left = set(range(pd.length))
    open_: set[int] = set()
    order = []
    while left:
        j = max(left, key=lambda j: (sum(x in open_ for x in pd.crossings[j]), -j))
        left.remove(j)
        order.append(j)
        for x in pd.crossings[j]:
            if x in open_:
                open_.remove(x)
            else:
                open_.add(x)
    return order


def pd_bracket(pd: PDCode) -> Poly:
    """Kauffman bracket of the diagram, normalised so that a crossingless circle is 1.

    The state sum is contracted crossing by crossing: a partial state is the matching of
    the open edge ends it leaves, with the polynomial collected so far. At a crossing
    ``(a, b, c, d)`` (counterclockwise from the incoming under-strand) the A-smoothing
    joins ``a-b`` and ``c-d`` and the B-smoothing joins ``a-d`` and ``b-c``.

    References
    ----------
    .. [1] L. H. Kauffman, "State models and the Jones polynomial", Topology 26 (1987).
    """
    if pd.length == 0:
        return {0: 1}
    # states: matching (frozenset of (end, end) pairs, keyed by partner dict) -> poly
    states: dict[frozenset, Poly] = {frozenset(): {0: 1}}
    for j in _order(pd):
        a, b, c, d = pd.crossings[j]
        new: dict[frozenset, Poly] = {}
        for key, poly in states.items():
            for weight, arcs in (({1: 1}, ((a, b), (c, d))), ({-1: 1}, ((a, d), (b, c)))):
                partner = dict(key)
                loops = 0
                for p, q in arcs:
                    if p == q:
                        # both ends of edge p sit here and are joined: a closed loop
                        if p in partner:  # pragma: no cover - an edge has two ends
                            raise AssertionError("edge end used twice")
                        loops += 1
                        continue
                    pp = partner.pop(p, None)
                    qq = partner.pop(q, None)
                    if pp is not None and pp == q:
                        loops += 1
                        continue
                    if pp is not None:
                        partner.pop(pp, None)
                    if qq is not None:
                        partner.pop(qq, None)
                    e1 = p if pp is None else pp
                    e2 = q if qq is None else qq
                    partner[e1] = e2
                    partner[e2] = e1
                term = weight
                for _ in range(loops):
                    term = _mul(term, _LOOP)
                k = frozenset(partner.items())
                acc = new.setdefault(k, {})
                _add_into(acc, _mul(poly, term))
        states = {k: v for k, v in new.items() if v}
    total = states.get(frozenset(), {})
    return _div_loop(total)


def pd_crossing_signs(pd: PDCode) -> list[int]:
    """Sign of every crossing under the PD's own orientation
    (:func:`plait.diagrams.pd.pd_orientation`).

    The over-strand entering at slot 3 makes a positive (right-handed) crossing.
    """
    role = occurrence_roles(pd)
    return [1 if role[(j, 3)] == 1 else -1 for j in range(pd.length)]


def _edge_components(pd: PDCode) -> dict[int, int]:
    comp = {}
    for ci, walk in enumerate(strand_walks(pd)):
        for x, _l, _e in walk:
            comp[x] = ci
    return comp


def _jones_from(bracket: Poly, writhe: int) -> dict[Fraction, int]:
    # f = (-A^3)^(-w) <D>, then A = t^(-1/4)
    sign = -1 if writhe % 2 else 1
    return {Fraction(-(e - 3 * writhe), 4): sign * c for e, c in bracket.items()}


def pd_jones(pd: PDCode) -> dict[Fraction, int]:
    """Jones polynomial ``{exponent of t: coefficient}`` of the oriented PD diagram.

    References
    ----------
    .. [1] L. H. Kauffman, "State models and the Jones polynomial", Topology 26 (1987).
    """
    return _jones_from(pd_bracket(pd), sum(pd_crossing_signs(pd)))


def pd_jones_all_orientations(pd: PDCode) -> list[dict[Fraction, int]]:
    """Jones polynomials of the diagram under every reorientation of its components.

    Component 0 keeps its orientation (reversing all components changes nothing).
    Reversing a component flips the sign of each crossing between it and another one.
    """
    br = pd_bracket(pd)
    signs = pd_crossing_signs(pd)
    comp = _edge_components(pd)
    ncomp = max(comp.values(), default=0) + 1
    pairs = [(comp[c[0]], comp[c[1]]) for c in pd.crossings]
    out = []
    for mask in range(1 << max(ncomp - 1, 0)):
        flip = [0] + [(mask >> i) & 1 for i in range(ncomp - 1)]
        w = sum(s * (-1 if flip[u] != flip[o] else 1)
                for s, (u, o) in zip(signs, pairs, strict=True))
        out.append(_jones_from(br, w))
    return out


def _strip_split_unknots(plat: PlatWord) -> tuple[PlatWord | None, int]:
    # cap pairs whose positions no letter touches are split unknotted components
    touched = {abs(g) for g in plat.word} | {abs(g) + 1 for g in plat.word}
    free = [i for i in range(1, plat.bridges + 1)
            if 2 * i - 1 not in touched and 2 * i not in touched]
    keep = [p for p in range(1, plat.strands + 1) if (p + 1) // 2 not in free]
    new_pos = {p: k + 1 for k, p in enumerate(keep)}
    word = tuple((1 if g > 0 else -1) * new_pos[abs(g)] for g in plat.word)
    return (PlatWord(len(keep), word) if word else None), len(free)


def _times_loops(v: dict[Fraction, int], k: int) -> dict[Fraction, int]:
    loop = {Fraction(1, 2): -1, Fraction(-1, 2): -1}  # -t^(1/2) - t^(-1/2)
    for _ in range(k):
        out: dict[Fraction, int] = {}
        for e1, c1 in v.items():
            for e2, c2 in loop.items():
                out[e1 + e2] = out.get(e1 + e2, 0) + c1 * c2
        v = {e: c for e, c in out.items() if c}
    return v


def plat_jones(plat: PlatWord) -> dict[Fraction, int]:
    """Jones polynomial of a plat closure (plait's orientation: each component from its
    first cap, going down), through its PD code.

    A cap pair whose positions no letter touches is a split unknotted component, which
    has no PD code; each one multiplies the rest by ``-t^(1/2) - t^(-1/2)``.
    """
    rest, free = _strip_split_unknots(plat)
    if rest is None:
        return _times_loops({Fraction(0): 1}, free - 1)
    return _times_loops(pd_jones(plat_to_pd(rest)), free)


def plat_jones_all_orientations(plat: PlatWord) -> list[dict[Fraction, int]]:
    """Jones polynomials of the plat closure under every reorientation of components."""
    rest, free = _strip_split_unknots(plat)
    if rest is None:
        return [_times_loops({Fraction(0): 1}, free - 1)]
    return [_times_loops(v, free) for v in pd_jones_all_orientations(plat_to_pd(rest))]
