"""Rerouting an over-arc (or under-arc) of a PD code along a shortest path through the faces."""

from __future__ import annotations

from collections import deque

from plait.diagrams.pd import PDCode
from plait.diagrams.wirtinger import occurrence_roles
from plait.errors import InputError

__all__ = ["arc_reroutes", "reroute_arc", "switch_crossings"]

# Data model. Conventions of plait.diagrams.pdmoves: crossing j of a PD code is a 4-tuple
# of edge labels counterclockwise from the incoming under-strand; an occurrence (j, s) is
# slot s of crossing j; a face's sides are the occurrences at which its boundary leaves a
# crossing, with the face on the left. An over-arc starts at a crossing u0 whose
# under-strand leaves along slot 2, passes over crossings x1..xm (m >= 1) and ends where
# it enters a crossing u1 as the under-strand. Lying above the whole diagram, it may be
# lifted and laid down again along any path between its two ends (an isotopy: R2 and R3
# moves, and R1 where it turns about its own ends): along a shortest path
# in the dual graph it crosses d edges, and when d < m the diagram loses m - d crossings.
# The path is found by breadth-first search over the faces of the diagram without the
# arc, in a fixed order, so the move replays from (kind, crossing u0, over/under) alone.


def switch_crossings(pd: PDCode) -> list[tuple[int, int, int, int]]:
    """Every crossing changed (the mirror image through the plane of the diagram): the
    over-strand becomes the under-strand, read from its incoming end."""
    role = occurrence_roles(pd)
    out = []
    for j, (a, b, c, d) in enumerate(pd.crossings):
        out.append((b, c, d, a) if role[(j, 1)] == 1 else (d, a, b, c))
    return out


def _arc(pd: PDCode, u0: int):
    # the over-arc leaving crossing u0 along slot 2: its edges, crossings passed over, end
    from plait.diagrams.pdmoves import _where

    cs = pd.crossings
    where = _where(cs)  # label -> its two occurrences (crossing, slot)
    edges, over = [], []
    occ = (u0, 2)
    while True:
        x = cs[occ[0]][occ[1]]
        a, b = where[x]
        nxt = b if a == occ else a
        edges.append(x)
        j, s = nxt
        if s == 0:
            return edges, over, j, where
        if s == 2 or j in over or j == u0:
            return None  # leaves a crossing as under-strand at its entry: not an arc end
        over.append(j)
        occ = (j, (s + 2) % 4)
        if len(edges) > len(cs) + 1:  # pragma: no cover - a closed over-only loop
            return None


def _plan(pd: PDCode, u0: int):
    """(edges of the arc, crossings passed over, end crossing, dual path) or None."""
    from plait.diagrams.pdmoves import _faces

    got = _arc(pd, u0)
    if got is None:
        return None
    edges, over, u1, where = got
    if not over or u1 == u0 or u1 in over:
        return None
    role = occurrence_roles(pd)
    fs = _faces(pd)
    face_of = {side: i for i, f in enumerate(fs) for side in f}
    parent = list(range(len(fs)))

    def find(i: int) -> int:
        while parent[i] != i:
            parent[i] = parent[parent[i]]
            i = parent[i]
        return i

    def sides(x: int) -> tuple[int, int]:
        # (face on the left, face on the right) of edge x along its orientation
        (j0, s0), (j1, s1) = where[x]
        tail = (j0, s0) if role[(j0, s0)] == -1 else (j1, s1)
        head = (j1, s1) if tail == (j0, s0) else (j0, s0)
        return face_of[tail], face_of[head]

    arc = set(edges)
    for x in edges:
        a, b = sides(x)
        parent[find(a)] = find(b)
    start, goal = find(sides(edges[0])[0]), find(sides(edges[-1])[0])
    # breadth-first over merged faces; crossing edge x from face f to face g costs 1
    adj: dict[int, list[tuple[int, int, int]]] = {}
    for x in sorted(where):
        if x in arc:
            continue
        a, b = sides(x)
        fa, fb = find(a), find(b)
        if fa == fb:
            continue
        adj.setdefault(fa, []).append((fb, x, 1))  # left to right
        adj.setdefault(fb, []).append((fa, x, 0))  # right to left
    prev: dict[int, tuple[int, int, int] | None] = {start: None}
    queue = deque([start])
    while queue and goal not in prev:
        f = queue.popleft()
        for g, x, ltr in adj.get(f, ()):
            if g not in prev:
                prev[g] = (f, x, ltr)
                queue.append(g)
    if goal not in prev:  # pragma: no cover - the merged dual graph is connected
        return None
    path = []
    f = goal
    while prev[f] is not None:
        p, x, ltr = prev[f]
        path.append((x, ltr))
        f = p
    return edges, over, u1, path[::-1]


def arc_reroutes(pd: PDCode) -> list[tuple[int, int, int]]:
    """``(u0, under, gain)`` for every arc whose rerouting removes crossings: over-arcs
    (``under = 0``) and under-arcs (``under = 1``, rerouted with all crossings switched)."""
    out = []
    for under in (0, 1):
        d = PDCode(tuple(switch_crossings(pd))) if under else pd
        for u0 in range(d.length):
            plan = _plan(d, u0)
            if plan is not None and len(plan[3]) < len(plan[1]):
                out.append((u0, under, len(plan[1]) - len(plan[3])))
    return out


def reroute_arc(pd: PDCode, u0: int, under: int = 0) -> list[tuple[int, int, int, int]]:
    """The crossings after rerouting the arc that leaves crossing ``u0`` as its
    under-strand (an over-arc, or with ``under=1`` an under-arc) along a shortest path
    through the faces. Crossings passed over are removed (their under-strands run
    straight through); new crossings, one per edge of the path, are appended.

    Raises
    ------
    InputError
        When no arc leaves ``u0`` or its rerouting would not remove a crossing.
    """
    d = PDCode(tuple(switch_crossings(pd))) if under else pd
    plan = _plan(d, u0)
    if plan is None or len(plan[3]) >= len(plan[1]):
        raise InputError(f"pd move reroute: no arc from crossing {u0} that a reroute "
                         f"shortens")
    edges, over, u1, path = plan
    cs = d.crossings
    gone = set(over)
    role = occurrence_roles(d)
    fresh = max(x for c in cs for x in c) + 1
    # labels at the two ends of every old edge: tail[x], head[x] (they differ once a new
    # crossing splits x: the part before it gets a fresh label, the part after keeps x)
    tail = {x: x for c in cs for x in c}
    head = dict(tail)
    arc_labels = list(range(fresh, fresh + len(path) + 1))  # the new arc, u0 to u1
    fresh += len(path) + 1
    new_cross = []
    for i, (x, ltr) in enumerate(path):
        tail[x] = fresh
        s_in, s_out = arc_labels[i], arc_labels[i + 1]
        # x points "north", its left is west; counterclockwise from the incoming
        # under-end (south): east, north, west
        new_cross.append([fresh, s_out, x, s_in] if ltr else [fresh, s_in, x, s_out])
        fresh += 1
    # an under-strand runs straight through a removed crossing: its incoming edge's head
    # and its outgoing edge's tail become one edge
    parent: dict[int, int] = {}

    def find(x: int) -> int:
        while x in parent:
            x = parent[x]
        return x

    for j in over:
        a, c = find(head[cs[j][0]]), find(tail[cs[j][2]])
        if a != c:
            parent[c] = a
    out = []
    for j, c in enumerate(cs):
        if j in gone:
            continue
        row = []
        for s_, x in enumerate(c):
            if (j, s_) == (u0, 2):
                row.append(arc_labels[0])
            elif (j, s_) == (u1, 0):
                row.append(arc_labels[-1])
            else:
                row.append(find(tail[x] if role[(j, s_)] == -1 else head[x]))
        out.append(tuple(row))
    out += [tuple(find(y) for y in c) for c in new_cross]
    from plait.diagrams.pd import pd_components

    if len(pd_components(PDCode(tuple(out)))) != len(pd_components(d)):
        raise InputError("pd move reroute: a component would lose all its crossings")
    if under:
        return switch_crossings(PDCode(tuple(out)))
    return out
