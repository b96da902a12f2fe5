"""Weighted best-first (A*) search toward a target score on the move graph."""

from __future__ import annotations

import heapq
from dataclasses import asdict, dataclass

from plait.scoring.objective import isolation
from plait.search.engine import BoundedSet, SearchContext, word_hash
from plait.word import PlatWord

__all__ = ["AStarParams", "AStarSearch", "heuristic"]


@dataclass
class AStarParams:
    """Tuning of :class:`AStarSearch`.

    Parameters
    ----------
    weight : float
        ``w`` in ``f = g + w * h``; 1 is plain A*, larger is greedier.
    max_drop : int
        Assumed largest length drop of one move (the length part of ``h`` divides by it;
        see :func:`heuristic` for when it makes ``h`` admissible).
    iso_weight : float
        Weight of the (inadmissible) isolation hint while bridges exceed the lower bound.
    max_open : int
        The open list is cut back to this many best entries when it doubles.
    closed_cap : int
        How many canonical words the closed set remembers.
    omega_every : int
        Every this many expansions of a state with bridges above the lower bound (0:
        never), the Wirtinger number of its diagram is computed (cached by canonical
        word); where it is below the bridge count the diagram step is pushed as a
        neighbour, and the heuristic of that state's children uses it.
    """

    weight: float = 3.0
    max_drop: int = 2
    iso_weight: float = 0.5
    max_open: int = 1500
    closed_cap: int = 20000
    omega_every: int = 150


def heuristic(plat: PlatWord, lower_bound: int, target_length: int, max_drop: int,
              iso_weight: float = 0.0, omega: int | None = None) -> float:
    """Estimated number of moves from ``plat`` to the target score.

    ``h = max(bridges - lower_bound, (length - target_length) / max_drop)``, both parts
    clipped at 0, plus ``iso_weight * (isolation - 1)`` while bridges exceed the bound.
    With ``omega`` (a Wirtinger number of a diagram at most one move away) the bridge
    part is at most ``1 + omega - lower_bound``: one diagram step reaches ``omega``
    bridges.

    Admissibility (never overestimating the true number of moves):

    - ``bridges - lower_bound`` IS admissible for reaching a plat with ``lower_bound``
      bridges: every move changes the strand count by at most two (one bridge), and the
      lower bound is certified (no plat of the knot has fewer bridges).
    - ``(length - target_length) / max_drop`` is admissible only if no move shortens the
      word by more than ``max_drop`` letters. A cancellation drops 2, an end absorption or
      a destabilization 1, a braid relation or commutation 0, a pairing-subgroup factor
      meeting its inverse at an end up to 4 (the factor's length), and a handle
      reduction or the canonical form arbitrarily many. So the length part is admissible
      with ``max_drop = 4`` for the single moves without handle reduction; the default
      ``max_drop = 2`` is NOT admissible, it is a guide that values a letter more.
    - The maximum of two admissible estimates is admissible; their sum would not be.
    - The isolation hint is NOT admissible (a pair can become removable in one move
      from any isolation); it is a guide, off when ``iso_weight`` is 0.
    - With ``weight > 1`` the search is weighted A*: even with an admissible ``h`` the
      path it finds is at most ``weight`` times longer than the shortest (Pohl 1970).

    The target itself is a moving guess: the current best length minus one, so the
    search always aims at an improvement whose size is unknown.

    References
    ----------
    .. [1] P. E. Hart, N. J. Nilsson, B. Raphael, "A formal basis for the heuristic
       determination of minimum cost paths", IEEE Trans. SSC 4 (1968).
    .. [2] I. Pohl, "Heuristic search viewed as path finding in a graph", Artificial
       Intelligence 1 (1970).
    """
    hb = max(0, plat.bridges - lower_bound)
    if omega is not None and omega < plat.bridges:
        hb = min(hb, 1 + max(0, omega - lower_bound))
    hl = max(0.0, (plat.length - target_length) / max_drop)
    h = max(float(hb), hl)
    if iso_weight and hb > 0:
        h += iso_weight * max(0, isolation(plat) - 1)
    return h


class AStarSearch:
    """Weighted A* from the best plat toward (certified lower bound, best length - 1).

    The cost ``g`` of a state is its number of moves from the state the search started
    at; ``f = g + weight * h`` (see :func:`heuristic`). One step pops the open entry of
    least ``(f, h, counter)``, puts it in canonical form, skips it when its canonical
    word is closed, and pushes its neighbours. When a new best is found the target moves
    and every open entry is rescored. When the open list empties the search restarts
    from the best plat.

    References
    ----------
    .. [1] P. E. Hart, N. J. Nilsson, B. Raphael, "A formal basis for the heuristic
       determination of minimum cost paths", IEEE Trans. SSC 4 (1968).
    """

    name = "astar"

    def __init__(self, ctx: SearchContext, params: AStarParams | None = None,
                 state: dict | None = None) -> None:
        self.ctx = ctx
        self.p = params or AStarParams()
        # open entries: [f, h, counter, g, node, strands, word]; counter makes the order
        # total and deterministic.
        if state is None:
            self.counter = 0
            self.open: list[list] = []
            self.closed = BoundedSet(self.p.closed_cap)
            self.target_length = ctx.best.length - 1
            self.restarts = 0
            self.expanded_above = 0  # expansions of states above the lower bound
            self._push(ctx.best, ctx.best_node, 0)
        else:
            self.counter = state["counter"]
            self.open = [list(e) for e in state["open"]]
            heapq.heapify(self.open)
            self.closed = BoundedSet(self.p.closed_cap, state["closed"])
            self.target_length = state["target_length"]
            self.restarts = state["restarts"]
            self.expanded_above = state.get("expanded_above", 0)

    def live_nodes(self) -> list[int]:
        return [e[4] for e in self.open]

    def state(self) -> dict:
        return {
            "params": asdict(self.p),
            "counter": self.counter,
            "open": [[e[0], e[1], e[2], e[3], e[4], e[5], list(e[6])]
                     for e in sorted(self.open)],
            "closed": self.closed.to_json(),
            "target_length": self.target_length,
            "restarts": self.restarts,
            "expanded_above": self.expanded_above,
        }

    def _h(self, plat: PlatWord, omega: int | None = None) -> float:
        return heuristic(plat, self.ctx.lower_bound, self.target_length, self.p.max_drop,
                         self.p.iso_weight, omega)

    def _push(self, plat: PlatWord, node: int, g: int, omega: int | None = None) -> None:
        h = self._h(plat, omega)
        self.counter += 1
        heapq.heappush(self.open, [g + self.p.weight * h, h, self.counter, g, node,
                                   plat.strands, plat.word])

    def _retarget(self) -> None:
        self.target_length = self.ctx.best.length - 1
        for e in self.open:
            h = self._h(PlatWord(e[5], e[6]))
            e[0], e[1] = e[3] + self.p.weight * h, h
        heapq.heapify(self.open)

    def step(self) -> None:
        ctx = self.ctx
        ctx.steps += 1
        while self.open:
            _, _, _, g, node, strands, word = heapq.heappop(self.open)
            plat, node = ctx.canonical(PlatWord(strands, tuple(word)), node)
            plat, node = ctx.destabilize(plat, node)
            h = word_hash(plat)
            if h in self.closed:
                continue
            self.closed.add(h)
            break
        else:
            self._restart()
            return
        improved = ctx.offer(plat, node)
        # the diagram step, every omega_every expansions of a state above the bound
        om = None
        if self.p.omega_every and plat.bridges > ctx.lower_bound:
            self.expanded_above += 1
            if self.expanded_above % self.p.omega_every == 1 or self.p.omega_every == 1:
                got = ctx.diagram_step(plat, node)
                if got is not None:
                    if ctx.offer(*got):
                        improved = True
                    self._push(got[0], got[1], g + 1)
            om = ctx.omega(plat)
        for rec, nb in ctx.neighbors(plat):
            if nb.bridges > plat.bridges:
                continue  # stabilizations only widen the search; A* keeps to the others
            child = ctx.paths.add(node, rec, nb)
            if ctx.offer(nb, child):
                improved = True
            # a neighbour is one move from plat, whose diagram step reaches om bridges
            self._push(nb, child, g + 1, None if om is None else om + 1)
        if improved:
            self._retarget()
        if len(self.open) > 2 * self.p.max_open:
            self.open = heapq.nsmallest(self.p.max_open, self.open)
            heapq.heapify(self.open)

    def _restart(self) -> None:
        self.restarts += 1
        self.open = []
        self.target_length = self.ctx.best.length - 1
        # forget the closed set: the search has seen everything reachable under its
        # cut-offs, a second pass with a clean slate can take other branches
        self.closed = BoundedSet(self.p.closed_cap)
        self._push(self.ctx.best, self.ctx.best_node, 0)
