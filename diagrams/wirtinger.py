"""Wirtinger number of a knot diagram: fewest seed arcs from which the coloring rule colors all."""

from __future__ import annotations

import itertools
from collections import deque
from dataclasses import dataclass

from plait.diagrams.pd import PDCode, pd_orientation
from plait.errors import InputError

__all__ = [
    "DiagramArcs",
    "ColoringStep",
    "Wirtinger",
    "diagram_arcs",
    "occurrence_roles",
    "color_closure",
    "coloring_steps",
    "wirtinger",
    "wirtinger_exhaustive",
    "wirtinger_cpsat",
]


@dataclass(frozen=True)
class DiagramArcs:
    """The arcs of a PD diagram: an arc runs from one under-crossing to the next.

    Attributes
    ----------
    arcs : tuple of tuple of int
        Edge labels of each arc in the order of the PD orientation. Over-crossings do not
        cut an arc, so a knot with ``m`` crossings has ``m`` arcs.
    closed : tuple of bool
        ``closed[a]`` is true when arc ``a`` is a whole component that never passes under
        anything (it has no ends).
    component : tuple of int
        Component index of each arc (components numbered by their smallest label).
    start, end : tuple of int
        Crossing at which arc ``a`` begins (its tail under-point) and ends (its head
        under-point); ``-1`` for a closed arc.
    over, under_in, under_out : tuple of int
        For crossing ``j``: the arc passing over it, the arc ending at it (slot 0) and the
        arc starting at it (slot 2).
    """

    arcs: tuple[tuple[int, ...], ...]
    closed: tuple[bool, ...]
    component: tuple[int, ...]
    start: tuple[int, ...]
    end: tuple[int, ...]
    over: tuple[int, ...]
    under_in: tuple[int, ...]
    under_out: tuple[int, ...]

    @property
    def components(self) -> int:
        return (max(self.component) + 1) if self.component else 0

    def __len__(self) -> int:
        return len(self.arcs)


@dataclass(frozen=True)
class ColoringStep:
    """One step of a coloring sequence: at ``crossing`` (0-based), whose over-arc ``over``
    and under-arc ``source`` are colored, the other under-arc ``arc`` gets colored."""

    step: int
    crossing: int
    arc: int
    source: int
    over: int

    def to_dict(self) -> dict:
        return {"step": self.step, "crossing": self.crossing, "arc": self.arc,
                "source": self.source, "over": self.over}


@dataclass(frozen=True)
class Wirtinger:
    """A seed set of a diagram with its coloring sequence.

    Attributes
    ----------
    number : int
        Number of seeds (the Wirtinger number of the diagram when ``proven_minimal``).
    seeds : tuple of int
        Seed arc indices into ``arcs.arcs``.
    steps : tuple of ColoringStep
        The coloring sequence: every non-seed arc exactly once.
    proven_minimal : bool
        True when no smaller seed set exists (solver optimum or exhaustive search).
    method : str
        ``"cpsat"``, ``"exhaustive"`` or ``"greedy"``.
    arcs : DiagramArcs
        The diagram's arcs.
    """

    number: int
    seeds: tuple[int, ...]
    steps: tuple[ColoringStep, ...]
    proven_minimal: bool
    method: str
    arcs: DiagramArcs

    def to_dict(self) -> dict:
        """JSON-ready summary: seeds are given by their edge labels too."""
        return {
            "number": self.number,
            "seeds": list(self.seeds),
            "seed_arcs": [list(self.arcs.arcs[a]) for a in self.seeds],
            "proven_minimal": self.proven_minimal,
            "method": self.method,
            "steps": [s.to_dict() for s in self.steps],
        }


def occurrence_roles(pd: PDCode) -> dict[tuple[int, int], int]:
    """Direction of every edge end: ``(crossing, slot) -> +1`` (enters) or ``-1`` (leaves).

    Follows :func:`plait.diagrams.pd.pd_orientation`; when both ends of an edge sit at the same
    crossing, slot 0 is the entering end and slot 2 the leaving one.
    """
    orient = pd_orientation(pd)
    role: dict[tuple[int, int], int] = {}
    where: dict[int, list[tuple[int, int]]] = {}
    for j, c in enumerate(pd.crossings):
        for s, x in enumerate(c):
            where.setdefault(x, []).append((j, s))
    for x, occ in where.items():
        tail, head = orient[x]
        if tail != head:
            for j, s in occ:
                role[(j, s)] = 1 if j == head else -1
            continue
        (j0, s0), (j1, s1) = occ
        # a kink edge: both ends at one crossing; decide by the under slots
        if s0 == 0 or s1 == 2:
            r0 = 1
        elif s0 == 2:
            r0 = -1
        else:  # pragma: no cover - impossible in a planar diagram (odd intersection)
            raise InputError(f"pd: edge {x} runs over crossing {j0 + 1} on both sides")
        role[(j0, s0)] = r0
        role[(j1, s1)] = -r0
    return role


def strand_walks(pd: PDCode) -> list[list[tuple[int, tuple[int, int], tuple[int, int]]]]:
    """Each component as a cyclic list of ``(label, leaving end, entering end)``.

    Ends are ``(crossing, slot)``. Components are numbered by their smallest label and
    each walk starts with the edge that leaves an under-crossing, when there is one.
    """
    role = occurrence_roles(pd)
    other: dict[tuple[int, int], tuple[int, int]] = {}
    where: dict[int, list[tuple[int, int]]] = {}
    for j, c in enumerate(pd.crossings):
        for s, x in enumerate(c):
            where.setdefault(x, []).append((j, s))
    for occ in where.values():
        other[occ[0]], other[occ[1]] = occ[1], occ[0]
    # through[(j, s)] for an entering end = the leaving end of the same strand at j
    through = {(j, s): (j, (s + 2) % 4) for j in range(pd.length) for s in range(4)}
    seen: set[int] = set()
    walks = []
    for x in sorted(where):
        if x in seen:
            continue
        # walk once round the component to find a leaving under end (slot 2)
        a, b = where[x]
        out = a if role[a] == -1 else b
        cyc = []
        cur = out
        while True:
            nxt = other[cur]
            cyc.append((pd.crossings[cur[0]][cur[1]], cur, nxt))
            cur = through[nxt]
            if cur == out:
                break
        k = next((i for i, (_x, lv, _e) in enumerate(cyc) if lv[1] == 2), 0)
        cyc = cyc[k:] + cyc[:k]
        seen.update(lab for lab, _l, _e in cyc)
        walks.append(cyc)
    return walks


def diagram_arcs(pd: PDCode) -> DiagramArcs:
    """Split a PD diagram into arcs (see :class:`DiagramArcs`)."""
    m = pd.length
    arcs: list[tuple[int, ...]] = []
    closed: list[bool] = []
    comp: list[int] = []
    start: list[int] = []
    end: list[int] = []
    over = [-1] * m
    under_in = [-1] * m
    under_out = [-1] * m
    for ci, walk in enumerate(strand_walks(pd)):
        if not any(lv[1] == 2 for _x, lv, _e in walk):
            a = len(arcs)
            arcs.append(tuple(x for x, _l, _e in walk))
            closed.append(True)
            comp.append(ci)
            start.append(-1)
            end.append(-1)
            for _x, _lv, (j, _s) in walk:
                over[j] = a
            continue
        cur: list[int] = []
        for x, (j0, s0), (j1, s1) in walk:
            if s0 == 2:
                cur = []
                start.append(j0)
                under_out[j0] = len(arcs)
            cur.append(x)
            if s1 == 0:
                a = len(arcs)
                arcs.append(tuple(cur))
                closed.append(False)
                comp.append(ci)
                end.append(j1)
                under_in[j1] = a
            else:
                over[j1] = len(arcs)
    return DiagramArcs(tuple(arcs), tuple(closed), tuple(comp), tuple(start), tuple(end),
                       tuple(over), tuple(under_in), tuple(under_out))


def color_closure(arcs: DiagramArcs, seeds) -> tuple[set[int], list[ColoringStep]]:
    """Apply the coloring rule from ``seeds`` until it stops.

    Returns the colored arcs and the steps taken, in order. A queue of crossings to look
    at is fed with the crossings touching each newly colored arc (crossings first in
    index order), so the cost is linear in the number of crossings.
    """
    colored = set(seeds)
    steps: list[ColoringStep] = []
    # touching[a] = crossings where arc a is the over-arc or an under-arc
    touching: dict[int, list[int]] = {}
    for j in range(len(arcs.over)):
        for a in {arcs.over[j], arcs.under_in[j], arcs.under_out[j]}:
            touching.setdefault(a, []).append(j)
    queue = deque(range(len(arcs.over)))
    while queue:
        j = queue.popleft()
        o, i, u = arcs.over[j], arcs.under_in[j], arcs.under_out[j]
        if o not in colored or (i in colored) == (u in colored):
            continue
        new, src = (u, i) if i in colored else (i, u)
        colored.add(new)
        steps.append(ColoringStep(len(steps) + 1, j, new, src, o))
        queue.extend(touching.get(new, ()))
    return colored, steps


def coloring_steps(arcs: DiagramArcs, seeds) -> list[ColoringStep] | None:
    """The coloring sequence from ``seeds``, or None when they do not color every arc."""
    colored, steps = color_closure(arcs, seeds)
    return steps if len(colored) == len(arcs) else None


def _lower_bound(arcs: DiagramArcs) -> int:
    # every component needs a seed of its own (coloring never leaves a component)
    return arcs.components


def _forced(arcs: DiagramArcs) -> list[int]:
    # a closed arc has no under-crossing, so nothing can color it
    return [a for a in range(len(arcs)) if arcs.closed[a]]


def _greedy(arcs: DiagramArcs) -> list[int]:
    seeds = _forced(arcs)
    colored, _ = color_closure(arcs, seeds)
    while len(colored) < len(arcs):
        best, best_size = -1, -1
        for a in range(len(arcs)):
            if a in colored:
                continue
            size = len(color_closure(arcs, seeds + [a])[0])
            if size > best_size:
                best, best_size = a, size
        seeds.append(best)
        colored, _ = color_closure(arcs, seeds)
    return sorted(seeds)


def _result(arcs: DiagramArcs, seeds, proven: bool, method: str) -> Wirtinger:
    seeds = tuple(sorted(seeds))
    steps = coloring_steps(arcs, seeds)
    if steps is None:  # pragma: no cover - guarded by construction
        raise AssertionError("seed set does not color the diagram")
    return Wirtinger(len(seeds), seeds, tuple(steps), proven, method, arcs)


def wirtinger_exhaustive(pd: PDCode, *, arcs: DiagramArcs | None = None) -> Wirtinger:
    """Wirtinger number by trying every seed set of each size in turn (a test oracle).

    The cost grows like ``C(m, k)``; meant for diagrams of up to a dozen crossings.

    References
    ----------
    .. [1] R. Blair, A. Kjuchukova, R. Velazquez, P. Villanueva, "Wirtinger systems of
       generators of knot groups", Comm. Anal. Geom. 28 (2020).
    """
    arcs = diagram_arcs(pd) if arcs is None else arcs
    forced = _forced(arcs)
    free = [a for a in range(len(arcs)) if a not in forced]
    for k in range(max(_lower_bound(arcs), len(forced)), len(arcs) + 1):
        for extra in itertools.combinations(free, k - len(forced)):
            seeds = forced + list(extra)
            if len(color_closure(arcs, seeds)[0]) == len(arcs):
                return _result(arcs, seeds, True, "exhaustive")
    return _result(arcs, [], True, "exhaustive")  # only the empty diagram gets here


def wirtinger_cpsat(pd: PDCode, *, time_limit: float = 10.0, seed: int = 0,
                    arcs: DiagramArcs | None = None) -> Wirtinger:
    """Wirtinger number by CP-SAT, stopped after ``time_limit`` (deterministic) seconds.

    Model (an ordering formulation): a Boolean ``seed[a]`` and an integer time
    ``t[a] in [0, m]`` per arc, and a Boolean ``y[j, a]`` for "arc ``a`` is colored at
    crossing ``j``" for each under-arc ``a`` of ``j``. Every arc is a seed (time 0) or
    colored at exactly one of its two end crossings, strictly after that crossing's
    over-arc and its other under-arc. Minimise the number of seeds. The greedy seed
    set is given as a hint. When the limit stops the solver, the best seed set found is
    returned with ``proven_minimal=False``.

    References
    ----------
    .. [1] R. Blair, A. Kjuchukova, R. Velazquez, P. Villanueva, "Wirtinger systems of
       generators of knot groups", Comm. Anal. Geom. 28 (2020).
    """
    from ortools.sat.python import cp_model

    arcs = diagram_arcs(pd) if arcs is None else arcs
    n = len(arcs)
    greedy = _greedy(arcs)
    lb = max(_lower_bound(arcs), len(_forced(arcs)))
    if n == 0 or len(greedy) <= lb:
        return _result(arcs, greedy, True, "cpsat")
    model = cp_model.CpModel()
    seed_v = [model.NewBoolVar(f"seed{a}") for a in range(n)]
    t = [model.NewIntVar(0, n, f"t{a}") for a in range(n)]
    # ways[a] = Booleans "a is colored at crossing j" for the crossings ending/starting a
    ways: list[list] = [[] for _ in range(n)]
    for j in range(len(arcs.over)):
        o, i, u = arcs.over[j], arcs.under_in[j], arcs.under_out[j]
        for new, src in ((u, i), (i, u)):
            if new == src or new == o:
                continue
            y = model.NewBoolVar(f"y{j}_{new}")
            model.Add(t[new] >= t[o] + 1).OnlyEnforceIf(y)
            model.Add(t[new] >= t[src] + 1).OnlyEnforceIf(y)
            ways[new].append(y)
    for a in range(n):
        model.AddExactlyOne([seed_v[a], *ways[a]])
        model.Add(t[a] == 0).OnlyEnforceIf(seed_v[a])
        if arcs.closed[a]:
            model.Add(seed_v[a] == 1)
    for c in range(arcs.components):
        model.AddBoolOr([seed_v[a] for a in range(n) if arcs.component[a] == c])
    model.Add(sum(seed_v) >= lb)
    model.Add(sum(seed_v) <= len(greedy))
    model.Minimize(sum(seed_v))
    gset = set(greedy)
    for a in range(n):
        model.AddHint(seed_v[a], int(a in gset))
    solver = cp_model.CpSolver()
    # the deterministic limit makes results repeatable; the wall-clock one (three times
    # longer) only stops a solver starved by a loaded machine
    solver.parameters.max_deterministic_time = float(time_limit)
    solver.parameters.max_time_in_seconds = 3.0 * float(time_limit)
    solver.parameters.num_workers = 1
    solver.parameters.random_seed = int(seed)
    status = solver.Solve(model)
    if status == cp_model.OPTIMAL:
        seeds = [a for a in range(n) if solver.Value(seed_v[a])]
        return _result(arcs, seeds, True, "cpsat")
    if status == cp_model.FEASIBLE:
        seeds = [a for a in range(n) if solver.Value(seed_v[a])]
        if len(seeds) < len(greedy):
            return _result(arcs, seeds, False, "cpsat")
    return _result(arcs, greedy, False, "greedy")


def wirtinger(pd: PDCode, *, method: str = "cpsat", time_limit: float = 10.0,
              seed: int = 0) -> Wirtinger:
    """Seeds and coloring sequence of a PD diagram with as few seeds as found.

    Parameters
    ----------
    pd : PDCode
        The diagram.
    method : {"cpsat", "exhaustive", "greedy"}
        Exact solver with a time limit, the exhaustive oracle, or the greedy heuristic.
    time_limit : float
        Seconds for the CP-SAT solver.
    seed : int
        Random seed of the solver.

    Returns
    -------
    Wirtinger
        Seeds, coloring sequence, and whether the number is proven minimal.

    References
    ----------
    .. [1] R. Blair, A. Kjuchukova, R. Velazquez, P. Villanueva, "Wirtinger systems of
       generators of knot groups", Comm. Anal. Geom. 28 (2020).
    .. [2] R. Blair, A. Kjuchukova, M. Ozawa, "The incompatibility of crossing number and
       bridge number for knot diagrams", Discrete Math. 344 (2021): the Wirtinger number
       of a diagram is its perpendicular bridge number.
    """
    if method == "cpsat":
        return wirtinger_cpsat(pd, time_limit=time_limit, seed=seed)
    if method == "exhaustive":
        return wirtinger_exhaustive(pd)
    if method == "greedy":
        arcs = diagram_arcs(pd)
        return _result(arcs, _greedy(arcs), False, "greedy")
    raise InputError(f"wirtinger: unknown method {method!r} (cpsat, exhaustive, greedy)")
