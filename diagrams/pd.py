"""PD codes: validation against their own rotation system, and export of plat closures."""

from __future__ import annotations

import bisect
from collections import Counter
from collections.abc import Iterable, Sequence
from dataclasses import dataclass

import networkx as nx

from plait.errors import InputError
from plait.word import PlatWord

__all__ = [
    "PDCode",
    "validate_pd",
    "planar_embedding",
    "plat_to_pd",
    "pd_components",
    "pd_orientation",
    "MAX_CROSSINGS",
]

MAX_CROSSINGS = 5_000


@dataclass(frozen=True)
class PDCode:
    """A planar diagram code: one 4-tuple of edge labels per crossing.

    Each tuple lists the four edges at a crossing counterclockwise, starting from the
    incoming under-strand (so positions 0 and 2 are the under-strand, 0 entering and 2
    leaving; positions 1 and 3 are the over-strand). This is the trade's convention and
    the one KnotInfo's ``pd_notation`` uses. Construct through :func:`validate_pd`.
    """

    crossings: tuple[tuple[int, int, int, int], ...]

    @property
    def length(self) -> int:
        return len(self.crossings)

    def to_list(self) -> list[list[int]]:
        return [list(c) for c in self.crossings]

    def __str__(self) -> str:
        return "[" + ",".join("[" + ",".join(map(str, c)) + "]" for c in self.crossings) + "]"


def validate_pd(crossings: Iterable[Sequence[int]], planar: bool = True) -> PDCode:
    """Check a PD code and return it as a :class:`PDCode`.

    Checks: each crossing has four integer labels; every label appears exactly twice;
    the under-strand of every crossing is consistently oriented (each label is the
    outgoing under-end at most once and the incoming under-end at most once); and the
    code's own rotation system (the counterclockwise order at each crossing) is a planar
    embedding. ``planar=False`` skips that last check (for searches that only make moves
    known to keep planarity, and check their results again later).

    Raises
    ------
    InputError
        With a one-line message naming the crossing or label at fault.
    """
    cs: list[tuple[int, int, int, int]] = []
    for ci, c in enumerate(crossings):
        if isinstance(c, (str, bytes)) or not isinstance(c, Sequence):
            raise InputError(f"pd: crossing {ci + 1} is {c!r}, not a list of four labels")
        if len(c) != 4:
            raise InputError(f"pd: crossing {ci + 1} has {len(c)} labels, expected 4")
        for x in c:
            if isinstance(x, bool) or not isinstance(x, int):
                raise InputError(f"pd: crossing {ci + 1} has label {x!r}, not an integer")
        cs.append((int(c[0]), int(c[1]), int(c[2]), int(c[3])))
        if len(cs) > MAX_CROSSINGS:
            raise InputError(f"pd: more than {MAX_CROSSINGS} crossings is over the limit")
    counts = Counter(x for c in cs for x in c)
    for label, k in sorted(counts.items()):
        if k != 2:
            raise InputError(f"pd: label {label} appears {k} time{'s' if k != 1 else ''}, "
                             f"expected exactly 2")
    into = Counter(c[0] for c in cs)
    outof = Counter(c[2] for c in cs)
    for label in sorted(counts):
        if into[label] > 1:
            raise InputError(f"pd: label {label} enters two crossings as the under-strand")
        if outof[label] > 1:
            raise InputError(f"pd: label {label} leaves two crossings as the under-strand")
    pd = PDCode(tuple(cs))
    if planar:
        emb = planar_embedding(pd)
        ok, why = _is_planar_embedding(emb)
        if not ok:
            raise InputError(f"pd: the code's rotation system is not planar ({why})")
    # orientation must be consistent along every component
    pd_orientation(pd)
    return pd


def planar_embedding(pd: PDCode) -> nx.PlanarEmbedding:
    """The embedding given by the PD code's own rotation system.

    Each edge label ``e`` is subdivided twice, into vertices ``("e", e, 0)`` and
    ``("e", e, 1)``, so the graph is simple even with kinks and multiple edges; a
    crossing ``j`` is vertex ``("x", j)`` whose neighbours are listed counterclockwise
    in the order of its tuple. The result is a ``networkx.PlanarEmbedding`` that has not
    been checked (see :func:`validate_pd`).
    """
    # where[label] = the two (crossing, slot) occurrences of the label, in order met
    where: dict[int, list[tuple[int, int]]] = {}
    for j, c in enumerate(pd.crossings):
        for s, x in enumerate(c):
            where.setdefault(x, []).append((j, s))
    # nbr[(crossing, slot)] = subdivision vertex joined to that crossing at that slot
    nbr: dict[tuple[int, int], tuple] = {}
    emb = nx.PlanarEmbedding()
    for x, ((j0, s0), (j1, s1)) in where.items():
        a, b = ("e", x, 0), ("e", x, 1)
        nbr[(j0, s0)] = a
        nbr[(j1, s1)] = b
        emb.add_half_edge_first(a, ("x", j0))
        emb.add_half_edge_cw(a, b, ("x", j0))
        emb.add_half_edge_first(b, a)
        emb.add_half_edge_cw(b, ("x", j1), a)
    for j in range(len(pd.crossings)):
        v = ("x", j)
        ring = [nbr[(j, s)] for s in range(4)]
        emb.add_half_edge_first(v, ring[0])
        for s in range(1, 4):
            emb.add_half_edge_ccw(v, ring[s], ring[s - 1])
    return emb


def _is_planar_embedding(emb: nx.PlanarEmbedding) -> tuple[bool, str]:
    # Euler's formula per connected component: V - E + F = 2 for a sphere.
    try:
        emb.check_structure()
    except nx.NetworkXException as exc:
        msg = str(exc)
        if "Euler" in msg:
            return False, "faces, edges and crossings violate Euler's formula V - E + F = 2"
        return False, msg.rstrip(".")
    return True, ""


def pd_orientation(pd: PDCode) -> dict[int, tuple[int, int]]:
    """Orientation of every edge: ``label -> (tail crossing, head crossing)``.

    Under-strands carry the orientation (slot 0 enters, slot 2 leaves); it is propagated
    along edges and through over-strands. A component that never passes under anything
    is oriented by increasing labels (the usual labelling convention).

    Raises
    ------
    InputError
        When the orientations along one component disagree.
    """
    # role[(j, s)] = +1 if the edge at slot s of crossing j enters j, -1 if it leaves
    where: dict[int, list[tuple[int, int]]] = {}
    for j, c in enumerate(pd.crossings):
        for s, x in enumerate(c):
            where.setdefault(x, []).append((j, s))
    role: dict[tuple[int, int], int] = {}
    stack: list[tuple[int, int]] = []

    def assign(occ: tuple[int, int], r: int) -> None:
        old = role.get(occ)
        if old is None:
            role[occ] = r
            stack.append(occ)
        elif old != r:
            x = pd.crossings[occ[0]][occ[1]]
            raise InputError(f"pd: label {x} is oriented inconsistently at crossing {occ[0] + 1}")

    for j in range(len(pd.crossings)):
        assign((j, 0), 1)
        assign((j, 2), -1)
    pending = list(range(len(pd.crossings)))
    while True:
        while stack:
            j, s = stack.pop()
            x = pd.crossings[j][s]
            for other in where[x]:
                if other != (j, s):
                    assign(other, -role[(j, s)])
            if s in (1, 3):
                assign((j, 4 - s), -role[(j, s)])
        pending = [j for j in pending if (j, 1) not in role]
        if not pending:
            break
        j = pending[0]
        b, d = pd.crossings[j][1], pd.crossings[j][3]
        assign((j, 1), 1 if (d == b + 1 or b > d + 1) else -1)
    head: dict[int, int] = {}
    tail: dict[int, int] = {}
    for (j, s), r in role.items():
        x = pd.crossings[j][s]
        (head if r == 1 else tail)[x] = j
    return {x: (tail[x], head[x]) for x in where}


def pd_components(pd: PDCode) -> list[list[int]]:
    """Edge labels of each component, in the order of the orientation."""
    orient = pd_orientation(pd)
    # nxt[x] = the edge that follows x through x's head crossing on the same strand
    nxt: dict[int, int] = {}
    for x, (_t, h) in orient.items():
        c = pd.crossings[h]
        if c[0] == x and c[2] != x:
            nxt[x] = c[2]
        elif c[1] == x and orient[c[3]][0] == h:
            nxt[x] = c[3]
        elif c[3] == x and orient[c[1]][0] == h:
            nxt[x] = c[1]
        else:
            nxt[x] = c[2]
    seen: set[int] = set()
    comps = []
    for x in sorted(orient):
        if x in seen:
            continue
        comp = []
        y = x
        while y not in seen:
            seen.add(y)
            comp.append(y)
            y = nxt[y]
        comps.append(comp)
    return comps


# -- plat closure -> PD ---------------------------------------------------------------


def trace_plat(plat: PlatWord) -> list[list[tuple[int, int, int, int]]]:
    """Trace every component of the plat closure through the word.

    Returns
    -------
    list of list of (letter index, direction, entry position, exit position)
        One list per component in order of travel. Direction is ``+1`` moving down the
        word and ``-1`` moving up; positions are 1-based. Components are numbered by
        their first cap, and each is started at the left end of that cap, going down —
        the orientation convention of plait.
    """
    n2 = plat.strands
    word = plat.word
    L = len(word)
    # at_level[j][p] lists, for each position, the next letter index at or below level j
    # that touches p; computed lazily as jumps: down_next[j][p] and up_prev.
    touches: list[list[int]] = [[] for _ in range(n2 + 1)]
    for j, g in enumerate(word):
        k = abs(g)
        touches[k].append(j)
        touches[k + 1].append(j)

    visited_cap = [False] * (n2 // 2)
    comps = []
    for cap in range(n2 // 2):
        if visited_cap[cap]:
            continue
        path: list[tuple[int, int, int, int]] = []
        pos, level, direction = 2 * cap + 1, 0, 1  # at top position, about to go down
        start = (pos, level, direction)
        visited_cap[cap] = True
        while True:
            lst = touches[pos]
            if direction == 1:
                i = bisect.bisect_left(lst, level)
                if i < len(lst):
                    j = lst[i]
                    k = abs(word[j])
                    q = k + 1 if pos == k else k
                    path.append((j, 1, pos, q))
                    pos, level = q, j + 1
                    continue
                # reach the cup, turn up at the partner position
                pos = pos + 1 if pos % 2 else pos - 1
                level, direction = L, -1
            else:
                i = bisect.bisect_left(lst, level) - 1
                if i >= 0:
                    j = lst[i]
                    k = abs(word[j])
                    q = k + 1 if pos == k else k
                    path.append((j, -1, pos, q))
                    pos, level = q, j
                    continue
                # reach a cap, turn down at the partner position
                visited_cap[(pos - 1) // 2] = True
                pos = pos + 1 if pos % 2 else pos - 1
                level, direction = 0, 1
            if (pos, level, direction) == start:
                break
        comps.append(path)
    return comps


def plat_to_pd(plat: PlatWord) -> PDCode:
    """PD code of the plat closure's diagram, in the trade's convention.

    Edges are labelled 1, 2, ... along each component in the order of travel (see
    :func:`trace_plat` for the orientation), components one after another. Crossings
    are listed in word order. A crossingless component cannot be written as a PD code
    unless it is the whole diagram (the unknot, empty code).

    Raises
    ------
    InputError
        For a split crossingless component in a diagram that has crossings, and for a
        crossingless plat of several components (the empty code is the unknot).
    """
    if not plat.word and plat.components > 1:
        raise InputError(f"pd: the {plat.components}-component unlink without crossings has "
                         "no PD code (the empty code is the unknot)")
    comps = trace_plat(plat)
    # ends[j] maps a corner ("TL","TR","BL","BR") of crossing j to its edge label,
    # and under_in[j] is the corner where the under-strand enters.
    ends: list[dict[str, int]] = [{} for _ in plat.word]
    under_in: list[str] = [""] * len(plat.word)
    label = 1
    for path in comps:
        if not path:
            if plat.word:
                raise InputError("pd: a component without crossings cannot be exported")
            continue
        first = label
        m = len(path)
        for i, (j, direction, p, q) in enumerate(path):
            k = abs(plat.word[j])
            lab_in = first + i
            lab_out = first + i + 1 if i + 1 < m else first
            side_p = "L" if p == k else "R"
            side_q = "L" if q == k else "R"
            if direction == 1:
                c_in, c_out = "T" + side_p, "B" + side_q
            else:
                c_in, c_out = "B" + side_p, "T" + side_q
            ends[j][c_in] = lab_in
            ends[j][c_out] = lab_out
            # under-strand: for sigma_k it runs TL-BR, for sigma_k^-1 it runs TR-BL
            under = {"TL", "BR"} if plat.word[j] > 0 else {"TR", "BL"}
            if c_in in under:
                under_in[j] = c_in
        label = first + m
    ccw = ["TL", "BL", "BR", "TR"]  # counterclockwise around a crossing
    out = []
    for j in range(len(plat.word)):
        s = ccw.index(under_in[j])
        out.append(tuple(ends[j][ccw[(s + t) % 4]] for t in range(4)))
    return PDCode(tuple(out))
