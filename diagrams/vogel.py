"""Vogel's algorithm: an oriented PD diagram to a closed braid by Reidemeister II moves."""

from __future__ import annotations

from plait.diagrams.pd import PDCode
from plait.diagrams.wirtinger import occurrence_roles
from plait.errors import InputError
from plait.word import ClosedBraid

__all__ = ["pd_to_closed_braid", "seifert_circles", "faces"]

# A working diagram is a list of crossings (4-lists of edge labels, counterclockwise from
# the incoming under-strand, as in a PD code) and ``role[(j, s)]``: +1 when the edge at
# slot s of crossing j enters j, -1 when it leaves. Roles are carried along explicitly so
# that the orientation never has to be re-derived from labels.


def _ends(cs: list[list[int]]) -> dict[int, list[tuple[int, int]]]:
    where: dict[int, list[tuple[int, int]]] = {}
    for j, c in enumerate(cs):
        for s, x in enumerate(c):
            where.setdefault(x, []).append((j, s))
    return where


def seifert_circles(cs: list[list[int]], role: dict) -> dict[int, int]:
    """Seifert circle index of every edge label.

    The oriented smoothing at a crossing joins the entering under-edge to the leaving
    over-edge, and the entering over-edge to the leaving under-edge.
    """
    parent: dict[int, int] = {}

    def find(a: int) -> int:
        while parent.setdefault(a, a) != a:
            parent[a] = parent[parent[a]]
            a = parent[a]
        return a

    for j, c in enumerate(cs):
        over_out = 1 if role[(j, 1)] == -1 else 3
        over_in = 4 - over_out
        for a, b in ((c[0], c[over_out]), (c[over_in], c[2])):
            ra, rb = find(a), find(b)
            if ra != rb:
                parent[ra] = rb
    roots: dict[int, int] = {}
    return {x: roots.setdefault(find(x), len(roots)) for x in sorted(parent)}


def faces(cs: list[list[int]]) -> list[list[tuple[int, int]]]:
    """Faces of the diagram as cycles of darts ``(crossing, slot)``.

    A dart leaves its crossing along the edge at that slot; the face lies on its left.
    Arriving at slot ``s`` of a crossing, the face continues out of slot ``s - 1``
    (the next edge clockwise).
    """
    where = _ends(cs)
    other = {}
    for occ in where.values():
        other[occ[0]], other[occ[1]] = occ[1], occ[0]
    seen: set[tuple[int, int]] = set()
    out = []
    for j in range(len(cs)):
        for s in range(4):
            if (j, s) in seen:
                continue
            cyc = []
            d = (j, s)
            while d not in seen:
                seen.add(d)
                cyc.append(d)
                j2, s2 = other[d]
                d = (j2, (s2 - 1) % 4)
            out.append(cyc)
    return out


def _defect(cs: list[list[int]], role: dict):
    # a face with two edges on different Seifert circles, both with the face on the same
    # side (left or right of the edge's orientation): the diagram is not yet braided there
    circ = seifert_circles(cs, role)
    for cyc in faces(cs):
        seen: dict[tuple[int, bool], int] = {}
        for j, s in cyc:
            x = cs[j][s]
            left = role[(j, s)] == -1  # traversed along its orientation: face on its left
            for (c2, l2), y in seen.items():
                if l2 == left and c2 != circ[x]:
                    return y, x, left
            seen.setdefault((circ[x], left), x)
    return None


def _vogel_move(cs: list[list[int]], role: dict, a: int, b: int, left: bool) -> None:
    # Reidemeister II move pushing edge a over edge b across their common face.
    # Picture for a face on the left of both: a runs east along the bottom of the face,
    # b runs west along its top; a rises across b at X1 (west), turns, and comes back
    # down across b at X2 (east). a -> a1 a2 a3, b -> b1 b2 b3 in the order of travel.
    # For a face on the right of both, the same picture mirrored east-west.
    top = max(x for c in cs for x in c)
    a1, a2, a3, b1, b2, b3 = a, top + 1, top + 2, b, top + 3, top + 4
    for x, last in ((a, a3), (b, b3)):
        for j, c in enumerate(cs):
            for s in range(4):
                if c[s] == x and role[(j, s)] == 1:
                    c[s] = last
                    break
            else:
                continue
            break
    j1, j2 = len(cs), len(cs) + 1
    if left:
        cs.append([b2, a2, b3, a1])  # X1: a goes south -> north (slot 3 in, slot 1 out)
        cs.append([b1, a2, b2, a3])  # X2: a goes north -> south (slot 1 in, slot 3 out)
        r1 = {0: 1, 1: -1, 2: -1, 3: 1}
        r2 = {0: 1, 1: 1, 2: -1, 3: -1}
    else:
        cs.append([b2, a1, b3, a2])  # X1: a goes south -> north (slot 1 in, slot 3 out)
        cs.append([b1, a3, b2, a2])  # X2: a goes north -> south (slot 3 in, slot 1 out)
        r1 = {0: 1, 1: 1, 2: -1, 3: -1}
        r2 = {0: 1, 1: -1, 2: -1, 3: 1}
    for s in range(4):
        role[(j1, s)] = r1[s]
        role[(j2, s)] = r2[s]


def _read_braid(cs: list[list[int]], role: dict) -> ClosedBraid:
    # In a braided diagram the Seifert circles are coherently nested, so the Seifert graph
    # is a path C_1 - ... - C_s. A cut from the inside out crosses each circle once, at an
    # edge e_i; consecutive cut edges share a face. Each circle's crossings, read along
    # its orientation from its cut edge, are chains; any common linear extension is the
    # braid word, crossing between C_i and C_i+1 being sigma_i to the power of its sign.
    circ = seifert_circles(cs, role)
    ns = max(circ.values()) + 1
    where = _ends(cs)
    # the two Seifert circles at each crossing: the entering and leaving under-edges
    pairs = [(circ[c[0]], circ[c[2]]) for c in cs]
    adj: dict[int, set[int]] = {i: set() for i in range(ns)}
    for p, q in pairs:
        if p == q:  # pragma: no cover - the two Seifert arcs at a crossing differ
            raise AssertionError("crossing on a single Seifert circle")
        adj[p].add(q)
        adj[q].add(p)
    ends_ = [i for i in range(ns) if len(adj[i]) <= 1]
    if any(len(v) > 2 for v in adj.values()) or not ends_:
        raise InputError("pd: Vogel moves did not braid the diagram")
    order = [ends_[0]]
    while len(order) < ns:
        nxt = [v for v in adj[order[-1]] if v not in order]
        if not nxt:
            raise InputError("pd: Vogel moves did not braid the diagram")
        order.append(nxt[0])
    level = {c: i for i, c in enumerate(order)}
    # the faces on each side of every edge label
    face_of: dict[tuple[int, int], int] = {}
    fcs = faces(cs)
    for fi, cyc in enumerate(fcs):
        for d in cyc:
            face_of[d] = fi
    sides = {x: [face_of[o] for o in occ] for x, occ in where.items()}
    face_edges: list[set[int]] = [{cs[j][s] for j, s in cyc} for cyc in fcs]
    # cut edges: start on the innermost circle with an edge whose face meets the next one
    cut: list[int] = []
    for i, c in enumerate(order):
        cand = sorted(x for x in circ if circ[x] == c)
        if i == 0:
            if ns == 1:
                cut.append(cand[0])
                break
            nxt = order[1]
            pick = next(x for x in cand
                        if any(circ[y] == nxt for f in sides[x] for y in face_edges[f]))
        else:
            prev = cut[-1]
            f_prev = [f for f in sides[prev] if any(circ[y] == c for y in face_edges[f])]
            pick = next(x for x in cand if set(sides[x]) & set(f_prev))
        cut.append(pick)
    # chains of crossings along each circle, starting at the head of its cut edge
    head = {}
    for x, occ in where.items():
        for j, s in occ:
            if role[(j, s)] == 1:
                head[x] = (j, s)
    out_edge = {}
    for j, c in enumerate(cs):
        over_out = 1 if role[(j, 1)] == -1 else 3
        out_edge[(j, 0)] = c[over_out]
        out_edge[(j, 4 - over_out)] = c[2]
    chains = []
    for i in range(ns):
        x = cut[i]
        seq = []
        while True:
            j, s = head[x]
            seq.append(j)
            x = out_edge[(j, s)]
            if x == cut[i]:
                break
        chains.append(seq)
    # common linear extension (Kahn's algorithm over the union of the chains)
    succ: dict[int, set[int]] = {j: set() for j in range(len(cs))}
    indeg = [0] * len(cs)
    for seq in chains:
        for u, v in zip(seq, seq[1:], strict=False):
            if v not in succ[u]:
                succ[u].add(v)
                indeg[v] += 1
    ready = [j for j in range(len(cs)) if indeg[j] == 0]
    word = []
    while ready:
        j = min(ready)
        ready.remove(j)
        lo = min(level[pairs[j][0]], level[pairs[j][1]])
        hi = max(level[pairs[j][0]], level[pairs[j][1]])
        if hi != lo + 1:
            raise InputError("pd: Vogel moves did not braid the diagram")
        sign = 1 if role[(j, 3)] == 1 else -1
        word.append(sign * (lo + 1))
        for v in succ[j]:
            indeg[v] -= 1
            if indeg[v] == 0:
                ready.append(v)
    if len(word) != len(cs):
        raise InputError("pd: Vogel moves did not braid the diagram")
    return ClosedBraid(ns, tuple(word))


def pd_to_closed_braid(pd: PDCode, *, max_moves: int | None = None) -> ClosedBraid:
    """A closed braid with the same oriented closure as the PD diagram.

    While some face has two edges on different Seifert circles lying on the same side of
    both (an incoherent face), push one edge over the other across the face (a
    Reidemeister II move). When no such face is left the Seifert circles are coherently
    nested and the braid is read around their common axis. The number of strands is the
    number of Seifert circles of the diagram.

    Raises
    ------
    InputError
        For the empty diagram, or when the moves do not end (a safety limit).

    References
    ----------
    .. [1] P. Vogel, "Representation of links by braids: a new algorithm", Comment. Math.
       Helv. 65 (1990).
    """
    if pd.length == 0:
        raise InputError("pd: the empty diagram is the unknot; it has no crossings to braid")
    role = dict(occurrence_roles(pd))
    cs = [list(c) for c in pd.crossings]
    ns = len(set(seifert_circles(cs, role).values()))
    limit = max_moves if max_moves is not None else ns * ns + 10
    for _ in range(limit + 1):
        bad = _defect(cs, role)
        if bad is None:
            return _read_braid(cs, role)
        a, b, left = bad
        _vogel_move(cs, role, a, b, left)
    raise InputError("pd: Vogel moves did not braid the diagram within the move limit")
