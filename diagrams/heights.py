"""Bridge position of a diagram from a Wirtinger coloring, read off as a plat by exact sweeping."""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass
from fractions import Fraction

import networkx as nx

from plait.diagrams.pd import PDCode, planar_embedding
from plait.diagrams.wirtinger import Wirtinger, strand_walks
from plait.errors import InputError
from plait.word import PlatWord

__all__ = ["Lift", "drawing", "lift", "sweep_plat", "Degenerate", "DIRECTIONS"]

# Candidate horizontal viewing directions (a, b): the plat's left-right axis is
# a*x + b*y. Small coprime pairs far from the grid axes and diagonals.
DIRECTIONS: tuple[tuple[int, int], ...] = (
    (7, 3), (3, -8), (11, 5), (5, -13), (2, 9), (13, -4), (9, 14), (17, -6),
    (4, 15), (19, 7), (8, -21), (23, 10), (6, 25), (29, -11), (12, 31), (27, 16),
)


class Degenerate(Exception):
    """The chosen projection direction is not generic; pick another."""


@dataclass(frozen=True)
class Lift:
    """A diagram lifted to R^3 in bridge position.

    Attributes
    ----------
    loops : tuple of tuple of (int, int, int)
        Each component as a closed polygon of integer points ``(x, y, z)``: ``(x, y)`` is
        the planar drawing of the diagram, ``z`` the height. At every crossing the over
        strand is higher. Heights rise to exactly ``bridges`` maxima, all at height 0,
        and fall to ``bridges`` minima, all at the lowest height; every other vertex lies
        strictly between, and ``z`` changes along every polygon edge.
    bridges : int
        Number of maxima.
    """

    loops: tuple[tuple[tuple[int, int, int], ...], ...]
    bridges: int


def _angle_key(v: tuple[int, int]) -> tuple:
    # exact angular order of a nonzero vector, counterclockwise from the positive x axis:
    # the half-plane [0, pi) or [pi, 2 pi), then -cot(angle), which increases with the
    # angle inside a half-plane (a vector on the x axis comes first in its half)
    x, y = v
    half = 0 if (y > 0 or (y == 0 and x > 0)) else 1
    return (half, 0, 0) if y == 0 else (half, 1, Fraction(-x, y))


def _ccw_sorted(vecs: Sequence[tuple[int, int]]) -> list[int]:
    return sorted(range(len(vecs)), key=lambda i: _angle_key(vecs[i]))


def drawing(pd: PDCode) -> dict:
    """Straight-line integer drawing of the PD diagram's subdivided graph.

    Uses the planar embedding given by the code's own rotation system
    (:func:`plait.diagrams.pd.planar_embedding`) and networkx's grid drawing. The drawing is
    reflected when needed so that the four edges at every crossing appear
    counterclockwise in the order of the PD tuple, as the convention demands.

    References
    ----------
    .. [1] M. Chrobak, T. H. Payne, "A linear-time algorithm for drawing a planar graph
       on a grid", Inform. Process. Lett. 54 (1995) (the networkx drawing).
    """
    emb = planar_embedding(pd)
    pos = {v: (int(p[0]), int(p[1])) for v, p in nx.combinatorial_embedding_to_pos(emb).items()}
    orient = 0
    for j in range(pd.length):
        cx, cy = pos[("x", j)]
        ring = list(emb.neighbors_cw_order(("x", j)))[::-1]  # counterclockwise order
        # ring starts at an arbitrary neighbour; rotate so that slot 0 comes first
        vecs = [(pos[u][0] - cx, pos[u][1] - cy) for u in ring]
        order = _ccw_sorted(vecs)
        k = order.index(0)
        rot = order[k:] + order[:k]
        if rot == [0, 1, 2, 3]:
            o = 1
        elif rot == [0, 3, 2, 1]:
            o = -1
        else:  # pragma: no cover - networkx drawings respect the embedding
            raise AssertionError("planar drawing does not respect the rotation system")
        if orient == 0:
            orient = o
        elif o != orient:  # pragma: no cover
            raise AssertionError("planar drawing has mixed orientations")
    if orient == -1:
        pos = {v: (-x, y) for v, (x, y) in pos.items()}
    return pos


def _edge_nodes(pd: PDCode) -> dict[tuple[int, int], list]:
    # the subdivision vertices of each edge listed from a given end (crossing, slot)
    first: dict[int, tuple[int, int]] = {}
    for j, c in enumerate(pd.crossings):
        for s, x in enumerate(c):
            first.setdefault(x, (j, s))
    out: dict[tuple[int, int], list] = {}
    for j, c in enumerate(pd.crossings):
        for s, x in enumerate(c):
            a, b = ("e", x, 0), ("e", x, 1)
            out[(j, s)] = [a, b] if first[x] == (j, s) else [b, a]
    return out


def lift(pd: PDCode, wirt: Wirtinger, pos: dict | None = None) -> Lift:
    """Lift the diagram to a bridge position with ``wirt.number`` maxima.

    Heights (integers): with ``M`` larger than the number of vertices on any arc, the
    under-point of the crossing where step ``t`` of the coloring happened sits at
    ``-t*M``; the under-point of a crossing where no step happened (a junction) sits at
    the bottom ``-B``. An arc colored at step ``t`` leaves its coloring crossing at
    ``-t*M`` and falls by 1 per vertex until its far end (the under-point of a later
    step, or a junction). A seed arc has its maximum, height 0, at its middle vertex and
    falls by 1 per vertex to either side. A component that never passes under anything
    is a seed with its maximum and its minimum (at ``-B``) on opposite subdivision
    vertices. At a step-``t`` crossing the over-arc was colored at a step before ``t``, so
    it passes above ``-t*M``; junctions are below everything. Hence the lift has the
    diagram's crossings, and its maxima (the seeds) lie above its minima (the junctions).

    References
    ----------
    .. [1] R. Blair, A. Kjuchukova, M. Ozawa, "The incompatibility of crossing number and
       bridge number for knot diagrams", Discrete Math. 344 (2021): a coloring sequence
       from ``k`` seeds gives a bridge position of the diagram with ``k`` maxima.
    """
    if pd.length == 0:
        raise InputError("pd: the empty diagram has no crossings to lift")
    pos = drawing(pd) if pos is None else pos
    arcs = wirt.arcs
    ends = _edge_nodes(pd)
    # node lists of every arc, from its start under-point to its end under-point
    arc_nodes: list[list] = []
    walks = strand_walks(pd)
    for walk in walks:
        # a walk starts by leaving an under-crossing, unless the component has none
        nodes: list = []
        for _x, (j0, s0), (j1, s1) in walk:
            if not nodes:
                nodes = [("x", j0)]
            nodes.extend(ends[(j0, s0)])
            nodes.append(("x", j1))
            if s1 == 0:
                arc_nodes.append(nodes)
                nodes = []
        if nodes:  # a closed arc: the last node repeats the first
            arc_nodes.append(nodes[:-1])
    if len(arc_nodes) != len(arcs.arcs):  # pragma: no cover
        raise AssertionError("arc count mismatch")
    M = max(len(n) for n in arc_nodes) + 2
    nsteps = len(wirt.steps)
    B = (nsteps + 2) * M
    step_at = {s.crossing: s for s in wirt.steps}
    colored_by = {s.arc: s for s in wirt.steps}

    def under_height(j: int) -> int:
        s = step_at.get(j)
        return -s.step * M if s is not None else -B

    arc_z: list[list[int]] = []
    for a, nodes in enumerate(arc_nodes):
        L = len(nodes) - 1
        if arcs.closed[a]:
            # maximum at p and minimum at q, subdivision vertices about half-way apart;
            # heights fall by 1 per vertex along both paths from p to q
            n = len(nodes)
            subs = [i for i, v in enumerate(nodes) if v[0] == "e"]
            p = subs[0]
            q = min(subs[1:], key=lambda i: abs((i - p) % n - n // 2))
            dq = (q - p) % n
            z = [-((i - p) % n) if (i - p) % n < dq else -(n - (i - p) % n)
                 for i in range(n)]
            z[q] = -B
            arc_z.append(z)
            continue
        st = colored_by.get(a)
        if st is None:
            p = L // 2
            z = [-abs(i - p) for i in range(L + 1)]
        elif arcs.start[a] == st.crossing and arcs.under_out[st.crossing] == a:
            z = [-(st.step * M + i) for i in range(L + 1)]
        else:
            z = [-(st.step * M + (L - i)) for i in range(L + 1)]
        z[0] = under_height(arcs.start[a])
        z[L] = under_height(arcs.end[a])
        arc_z.append(z)
    # stitch the arcs of each component into closed polygons
    loops = []
    a = 0
    for walk in walks:
        pts: list[tuple[int, int, int]] = []
        count = sum(1 for _x, _l, (j1, s1) in walk if s1 == 0) or 1
        for b in range(a, a + count):
            nodes, z = arc_nodes[b], arc_z[b]
            rng = range(len(nodes)) if arcs.closed[b] else range(len(nodes) - 1)
            for i in rng:
                pts.append((pos[nodes[i]][0], pos[nodes[i]][1], z[i]))
        a += count
        loops.append(tuple(pts))
    return Lift(tuple(loops), wirt.number)


def _chains(lf: Lift) -> tuple[list[list[tuple[int, int, int]]], list[int], list[int]]:
    # Split every polygon into monotone chains from a maximum down to a minimum.
    # Returns the chains (points with strictly falling z), and for each chain the
    # index of its maximum and of its minimum (global numbering).
    chains: list[list[tuple[int, int, int]]] = []
    cap: list[int] = []
    cup: list[int] = []
    nmax = nmin = 0
    for pts in lf.loops:
        n = len(pts)
        zs = [p[2] for p in pts]
        for i in range(n):
            if zs[i] == zs[(i + 1) % n]:  # pragma: no cover - guaranteed by the lift
                raise AssertionError("flat polygon edge")
        maxima = [i for i in range(n) if zs[i] > zs[i - 1] and zs[i] > zs[(i + 1) % n]]
        minima = {i for i in range(n) if zs[i] < zs[i - 1] and zs[i] < zs[(i + 1) % n]}
        min_id = {}
        for i in maxima:
            for step in (1, -1):
                ch = [pts[i]]
                k = i
                while True:
                    k = (k + step) % n
                    ch.append(pts[k])
                    if k in minima:
                        break
                if k not in min_id:
                    min_id[k] = nmin
                    nmin += 1
                chains.append(ch)
                cap.append(nmax)
                cup.append(min_id[k])
            nmax += 1
    return chains, cap, cup


def sweep_plat(lf: Lift, direction: tuple[int, int]) -> PlatWord:
    """Read the plat of a lift projected along a horizontal direction.

    The plat's left-right coordinate is ``v = a*x + b*y`` and its depth (towards the
    viewer) is ``w = b*x - a*y`` for ``direction = (a, b)``, so ``(v, z, w)`` is a
    right-handed frame like ``(x, y, z)``. Sweeping ``z`` downward, the maxima are the
    caps, every transverse crossing of two projected strands is one letter (the strand
    in front is over), and the minima are the cups. All decisions use exact integers
    and fractions.

    Raises
    ------
    Degenerate
        When the direction is not generic: two maxima or minima at one ``v``, a
        crossing at a vertex height, two crossings at one height, or equal depths.
    """
    a, b = direction
    chains, cap, cup = _chains(lf)
    if lf.bridges != max(cap) + 1 or lf.bridges != max(cup) + 1:  # pragma: no cover
        raise AssertionError("maxima and minima do not pair up")
    # projected chains: lists of (z, v, w) with z falling
    proj = [[(p[2], a * p[0] + b * p[1], b * p[0] - a * p[1]) for p in ch] for ch in chains]
    levels = sorted({q[0] for ch in proj for q in ch}, reverse=True)
    top, bottom = levels[0], levels[-1]
    for ch in proj:
        if ch[0][0] != top or ch[-1][0] != bottom:  # pragma: no cover
            raise AssertionError("extrema are not at the top and bottom levels")
    nc = len(proj)

    # value of v and w of every chain at every level, exact
    def at_levels(ch: list[tuple[int, int, int]]) -> list[tuple[Fraction, Fraction]]:
        out = []
        k = 0
        for zl in levels:
            while ch[k + 1][0] > zl:
                k += 1
            z0, v0, w0 = ch[k]
            z1, v1, w1 = ch[k + 1]
            if zl == z0:
                out.append((Fraction(v0), Fraction(w0)))
            else:
                f = Fraction(zl - z0, z1 - z0)
                out.append((v0 + (v1 - v0) * f, w0 + (w1 - w0) * f))
        return out

    vals = [at_levels(ch) for ch in proj]
    # initial order: by v at the top, then by v one level down (the two legs of a cap)
    order = sorted(range(nc), key=lambda c: (vals[c][0][0], vals[c][1][0]))
    tops = [vals[c][0][0] for c in order]
    for i in range(0, nc, 2):
        c1, c2 = order[i], order[i + 1]
        if cap[c1] != cap[c2] or (i + 2 < nc and tops[i + 1] == tops[i + 2]):
            raise Degenerate("maxima overlap in this projection")
    word: list[int] = []
    for s in range(len(levels) - 1):
        events = []
        for i in range(nc):
            vi_hi, vi_lo = vals[i][s][0], vals[i][s + 1][0]
            for j in range(i + 1, nc):
                d_hi = vi_hi - vals[j][s][0]
                d_lo = vi_lo - vals[j][s + 1][0]
                if d_hi == 0:
                    if s == 0 and cap[i] == cap[j]:
                        continue
                    raise Degenerate("two strands meet at a vertex height")
                if d_lo == 0:
                    if s + 1 == len(levels) - 1 and cup[i] == cup[j]:
                        continue
                    raise Degenerate("two strands meet at a vertex height")
                if (d_hi > 0) == (d_lo > 0):
                    continue
                f = d_hi / (d_hi - d_lo)  # fraction of the way down the slab
                wi = vals[i][s][1] + (vals[i][s + 1][1] - vals[i][s][1]) * f
                wj = vals[j][s][1] + (vals[j][s + 1][1] - vals[j][s][1]) * f
                if wi == wj:
                    raise Degenerate("two strands meet in space")
                events.append((f, i, j, wi > wj))
        events.sort()
        for e in range(1, len(events)):
            if events[e][0] == events[e - 1][0]:
                raise Degenerate("two crossings at one height")
        where = {c: k for k, c in enumerate(order)}
        for _f, i, j, i_front in events:
            pi, pj = where[i], where[j]
            if abs(pi - pj) != 1:  # pragma: no cover - exact sweep keeps crossings adjacent
                raise Degenerate("crossing of non-adjacent strands")
            left, right = (i, j) if pi < pj else (j, i)
            k = min(pi, pj)  # 0-based position of the left strand
            right_front = i_front if right == i else not i_front
            word.append((k + 1) if right_front else -(k + 1))
            order[k], order[k + 1] = right, left
            where[left], where[right] = k + 1, k
    for i in range(0, nc, 2):
        if cup[order[i]] != cup[order[i + 1]]:
            raise Degenerate("minima overlap in this projection")
    bots = [vals[c][-1][0] for c in order]
    for i in range(1, nc - 1, 2):
        if bots[i] == bots[i + 1]:
            raise Degenerate("minima overlap in this projection")
    return PlatWord(nc, tuple(word))
