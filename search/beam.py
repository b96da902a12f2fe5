"""Beam search over the move graph with lanes that keep the beam diverse."""

from __future__ import annotations

from dataclasses import asdict, dataclass

from plait.search.engine import BoundedSet, SearchContext, word_hash
from plait.word import PlatWord

__all__ = ["BeamParams", "BeamSearch"]


@dataclass
class BeamParams:
    """Tuning of :class:`BeamSearch`.

    Parameters
    ----------
    width : int
        States kept per generation.
    objective_share, bridge_share : float
        Fractions of the width filled by the objective lane (best key first) and by the
        bridge-seeking lane (fewest bridges, then the most isolated pair, then length);
        the rest is drawn at random from the remaining children (the diversity lane).
    per_parent : int
        At most this many children of one parent per generation, so the beam does not
        collapse onto one family.
    slack : int
        The bridge lane considers children at most this many letters longer than their
        parent (isolating a pair often costs a few letters first).
    patience : int
        Generations without a new best before a restart from the best plat.
    depth : int
        Generations after which the beam restarts from the best plat even while it is
        improving (0: no limit); bounds how far one beam drifts from the best.
    kick : int
        Random moves applied to each restart state (perturbation).
    visited_cap : int
        How many canonical words the visited set remembers.
    lookahead : int
        Greedy isolating moves tried (:func:`plait.moves.destabilize_all` with ``seek``)
        from the most isolated state of a generation while bridges exceed the lower
        bound; 0 turns the lookahead off.
    lookahead_every : int
        Generations between two lookaheads.
    omega_every : int
        Generations between two diagram steps (0: never): the Wirtinger number of the
        diagrams of the ``omega_top`` states of the new beam first in the bridge lane's
        order is computed (cached by canonical word), and where it is below the bridge
        count the rebuilt plat joins the beam in front.
    omega_top : int
        States looked at per diagram step.
    """

    width: int = 24
    objective_share: float = 0.5
    bridge_share: float = 0.3
    per_parent: int = 6
    slack: int = 3
    patience: int = 8
    depth: int = 0
    kick: int = 6
    visited_cap: int = 20000
    lookahead: int = 6
    lookahead_every: int = 2
    omega_every: int = 15
    omega_top: int = 1


class BeamSearch:
    """Beam search: expand every state of the beam, keep ``width`` children.

    A generation counts ``len(beam)`` steps (one per expanded state). The next beam is
    filled from three lanes: the objective lane (children in order of the objective key,
    then word), the bridge lane (children in order of (bridges, isolation, length), which
    drives a pair towards the stabilization pattern), and a random lane drawn with the
    run's generator. Children are put in canonical form before deduplication against a
    bounded visited set. When the beam empties or no new best came for ``patience``
    generations, it restarts from the best plat plus randomly kicked copies of it.

    References
    ----------
    .. [1] B. T. Lowerre, "The HARPY speech recognition system", PhD thesis, Carnegie
       Mellon University (1976): beam search.
    .. [2] J. S. Birman, "On the stable equivalence of plat representations of knots
       and links", Canad. J. Math. 28 (1976): the moves.
    """

    name = "beam"

    def __init__(self, ctx: SearchContext, params: BeamParams | None = None,
                 state: dict | None = None) -> None:
        self.ctx = ctx
        self.p = params or BeamParams()
        if state is None:
            self.beam: list[tuple[PlatWord, int]] = [(ctx.best, ctx.best_node)]
            self.visited = BoundedSet(self.p.visited_cap, [word_hash(ctx.best)])
            self.generation = 0
            self.stale = 0
            self.restarts = 0
            self.depth = 0
        else:
            self.beam = [(PlatWord(s, tuple(w)), node) for s, w, node in state["beam"]]
            self.visited = BoundedSet(self.p.visited_cap, state["visited"])
            self.generation = state["generation"]
            self.stale = state["stale"]
            self.restarts = state["restarts"]
            self.depth = state.get("depth", 0)

    # -- checkpoint -------------------------------------------------------------------
    def live_nodes(self) -> list[int]:
        return [node for _, node in self.beam]

    def state(self) -> dict:
        return {
            "params": asdict(self.p),
            "beam": [[p.strands, list(p.word), node] for p, node in self.beam],
            "visited": self.visited.to_json(),
            "generation": self.generation,
            "stale": self.stale,
            "restarts": self.restarts,
            "depth": self.depth,
        }

    # -- one generation ---------------------------------------------------------------
    def step(self) -> None:
        ctx = self.ctx
        ctx.steps += max(1, len(self.beam))
        improved_before = ctx.improvements
        # children[i] = (key, word, strands, parent index, record, plat)
        children = []
        seen: set[int] = set()
        for pi, (plat, _node) in enumerate(self.beam):
            for rec, nb in ctx.neighbors(plat):
                h = word_hash(nb)
                if h in seen or h in self.visited:
                    continue
                seen.add(h)
                children.append((ctx.key(nb), nb.word, nb.strands, pi, rec, nb))
        children.sort(key=lambda c: (c[0], c[2], c[1]))
        new_beam: list[tuple[PlatWord, int]] = []
        taken_hashes: set[int] = set()
        per_parent = [0] * len(self.beam)
        used = [False] * len(children)
        w = self.p.width
        n_obj = max(1, int(round(w * self.p.objective_share)))
        n_bridge = int(round(w * self.p.bridge_share))

        def take(idx: int) -> bool:
            _, _, _, pi, rec, nb = children[idx]
            used[idx] = True
            if per_parent[pi] >= self.p.per_parent:
                return False
            parent_plat, parent_node = self.beam[pi]
            node = ctx.paths.add(parent_node, rec, nb)
            can, node = ctx.canonical(nb, node)
            can, node = ctx.destabilize(can, node)
            h = word_hash(can)
            if h in taken_hashes or h in self.visited:
                return False
            taken_hashes.add(h)
            per_parent[pi] += 1
            new_beam.append((can, node))
            ctx.offer(can, node)
            return True

        # objective lane
        for i in range(len(children)):
            if len(new_beam) >= n_obj:
                break
            take(i)
        # bridge lane: only when a bridge might still go
        if n_bridge and self.beam and max(p.bridges for p, _ in self.beam) > ctx.lower_bound:
            pool = []
            for i, c in enumerate(children):
                if used[i]:
                    continue
                parent = self.beam[c[3]][0]
                nb = c[5]
                if nb.bridges <= parent.bridges and nb.length <= parent.length + self.p.slack:
                    pool.append((ctx.guide_key(nb), nb.strands, nb.word, i))
            pool.sort()
            target = len(new_beam) + n_bridge
            for *_, i in pool:
                if len(new_beam) >= target:
                    break
                take(i)
        # random lane
        rest = [i for i in range(len(children)) if not used[i]]
        while len(new_beam) < w and rest:
            j = ctx.rng.randrange(len(rest))
            rest[j], rest[-1] = rest[-1], rest[j]
            take(rest.pop())
        self._lookahead(new_beam)
        self._diagram(new_beam)
        for p, _ in new_beam:
            self.visited.add(word_hash(p))
        self.generation += 1
        self.depth += 1
        self.stale = 0 if ctx.improvements > improved_before else self.stale + 1
        if (not new_beam or self.stale >= self.p.patience
                or (self.p.depth and self.depth >= self.p.depth)):
            self._restart()
        else:
            self.beam = new_beam

    def _diagram(self, new_beam: list[tuple[PlatWord, int]]) -> None:
        """Diagram steps from the states of the new beam that lead the bridge lane (see
        :meth:`SearchContext.diagram_step`); a state with fewer bridges joins in front."""
        ctx = self.ctx
        if (not self.p.omega_every or self.generation % self.p.omega_every
                or not new_beam):
            return
        cands = sorted((ctx.guide_key(p), p.strands, p.word, i)
                       for i, (p, _) in enumerate(new_beam) if p.bridges > ctx.lower_bound)
        front = []
        for *_, i in cands[: self.p.omega_top]:
            plat, node = new_beam[i]
            got = ctx.diagram_step(plat, node)
            if got is not None and word_hash(got[0]) not in self.visited:
                front.append(got)
                ctx.offer(*got)
        new_beam[:0] = front

    def _lookahead(self, new_beam: list[tuple[PlatWord, int]]) -> None:
        """Seek a destabilization from the most isolated state of the new beam: greedy
        moves that leave fewer letters on some pair, until the stabilization pattern
        shows (then it is removed). A success joins the beam in front."""
        ctx = self.ctx
        if (not self.p.lookahead or self.generation % self.p.lookahead_every
                or not new_beam):
            return
        cands = [(ctx.guide_key(p), p.strands, p.word, i) for i, (p, _) in enumerate(new_beam)
                 if p.bridges > ctx.lower_bound]
        if not cands:
            return
        *_, i = min(cands)
        plat, node = new_beam[i]
        new, node2 = ctx.destabilize(plat, node, seek=self.p.lookahead)
        if new.bridges < plat.bridges and word_hash(new) not in self.visited:
            new_beam.insert(0, (new, node2))
            ctx.offer(new, node2)

    def _restart(self) -> None:
        """New beam: the best plat and copies of it kicked by random moves."""
        ctx = self.ctx
        self.restarts += 1
        self.stale = 0
        self.depth = 0
        beam = [(ctx.best, ctx.best_node)]
        for _ in range(max(0, min(self.p.width, 4) - 1)):
            plat, node = ctx.best, ctx.best_node
            for _ in range(self.p.kick):
                pick = ctx.random_neighbor(plat)
                if pick is None:
                    break
                rec, plat = pick
                node = ctx.paths.add(node, rec, plat)
            plat, node = ctx.canonical(plat, node)
            beam.append((plat, node))
        self.beam = beam
