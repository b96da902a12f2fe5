"""Simulated annealing on the move graph with restarts from the best plat."""

from __future__ import annotations

import math
from dataclasses import asdict, dataclass, field

import plait.moves as _moves
from plait.scoring.objective import isolation
from plait.search.engine import SearchContext
from plait.word import PlatWord

__all__ = ["AnnealParams", "Annealer"]


@dataclass
class AnnealParams:
    """Tuning of :class:`Annealer`.

    Parameters
    ----------
    t_start, t_end : float
        Temperature at the start and at the end of each segment between restarts; it
        falls geometrically in between (Kirkpatrick et al. 1983).
    segment : int
        Proposals per segment; after a segment the walk restarts from the best plat.
    batch : int
        Proposals per step (the ``--steps`` budget counts steps).
    iso_weight : float
        Energy of each letter touching the most isolated pair while bridges exceed the
        lower bound (pulls the walk toward a stabilization pattern).
    mix : dict
        Relative weight of each move kind when a proposal is drawn (kinds not named get
        weight 1; weight 0 removes a kind). By default stabilizations are left out.
    """

    t_start: float = 1.5
    t_end: float = 0.05
    segment: int = 3000
    batch: int = 32
    iso_weight: float = 0.4
    mix: dict = field(default_factory=dict)


def _bridge_change(kind: str) -> int:
    """How a move of this kind changes the bridge count."""
    if kind in _moves.BRIDGE_REDUCING_KINDS:
        return -1
    return 1 if kind == "stab" else 0


class Annealer:
    """Simulated annealing: propose a random move, accept it with the Metropolis rule.

    Energy ``E = objective.energy(bridges, length) + iso_weight * isolation`` (the last
    term only while the bridges exceed the certified lower bound). A proposal of energy
    change ``dE`` is accepted when ``dE <= 0`` or with probability ``exp(-dE / T)``. The
    temperature falls geometrically from ``t_start`` to ``t_end`` over a segment; then
    the walk restarts from the best plat (the restart rule keeps the search near good
    regions). Moves come from :func:`plait.moves.neighbor_deltas` (record and new length
    without building the word) when the move graph offers it; the chosen one is applied
    with :func:`plait.moves.apply_move`. Every accepted state is put in canonical form
    once per step, and revisits of a word within a segment cut the loop out of the path
    so certificates stay short.

    References
    ----------
    .. [1] S. Kirkpatrick, C. D. Gelatt, M. P. Vecchi, "Optimization by simulated
       annealing", Science 220 (1983).
    .. [2] N. Metropolis, A. W. Rosenbluth, M. N. Rosenbluth, A. H. Teller, E. Teller,
       "Equation of state calculations by fast computing machines", J. Chem. Phys. 21
       (1953).
    """

    name = "anneal"

    def __init__(self, ctx: SearchContext, params: AnnealParams | None = None,
                 state: dict | None = None) -> None:
        self.ctx = ctx
        self.p = params or AnnealParams()
        if state is None:
            self.cur, self.node = ctx.best, ctx.best_node
            self.k = 0            # proposals made in this segment
            self.restarts = 0
            self.accepted = 0
        else:
            self.cur = PlatWord(state["strands"], tuple(state["word"]))
            self.node = state["node"]
            self.k = state["k"]
            self.restarts = state["restarts"]
            self.accepted = state["accepted"]
        # loop erasure within a segment: word -> node first reached there (not saved:
        # it only shortens certificates, never changes the walk)
        self._seen: dict[tuple[int, tuple], int] = {}
        self._deltas: list | None = None

    def live_nodes(self) -> list[int]:
        # the loop-erasure table points at nodes the walk may return to: keep them
        return [self.node, *self._seen.values()]

    def state(self) -> dict:
        return {
            "params": asdict(self.p),
            "strands": self.cur.strands,
            "word": list(self.cur.word),
            "node": self.node,
            "k": self.k,
            "restarts": self.restarts,
            "accepted": self.accepted,
        }

    def temperature(self) -> float:
        frac = min(1.0, self.k / max(1, self.p.segment))
        return self.p.t_start * (self.p.t_end / self.p.t_start) ** frac

    def _energy(self, plat: PlatWord) -> float:
        e = self.ctx.objective.energy(plat.bridges, plat.length)
        if self.p.iso_weight and plat.bridges > self.ctx.lower_bound:
            e += self.p.iso_weight * isolation(plat)
        return e

    def _proposals(self) -> list:
        """(record, new length, weight) of the current plat's moves, by the move mix."""
        if self._deltas is None:
            fn = getattr(_moves, "neighbor_deltas", None)
            ctx = self.ctx
            if fn is not None:
                pairs = list(fn(self.cur, kinds=ctx.kinds))
                ctx.explored += len(pairs)
            else:
                pairs = [(rec, nb.length) for rec, nb in ctx.neighbors(self.cur)]
            mix = self.p.mix
            growing = _moves.GROWING_KINDS
            out = []
            for rec, new_len in pairs:
                w = mix.get(rec.kind, 0.0 if rec.kind in growing else 1.0)
                if w > 0:
                    out.append((rec, new_len, w))
            self._deltas = out
        return self._deltas

    def _pick(self, props: list) -> tuple:
        total = sum(w for *_, w in props)
        x = self.ctx.rng.random() * total
        for rec, new_len, w in props:
            x -= w
            if x < 0:
                return rec, new_len
        return props[-1][0], props[-1][1]

    def step(self) -> None:
        ctx = self.ctx
        ctx.steps += 1
        e_cur = self._energy(self.cur)
        for _ in range(self.p.batch):
            if self.k >= self.p.segment:
                self._restart()
                e_cur = self._energy(self.cur)
            self.k += 1
            props = self._proposals()
            if not props:
                self._restart()
                e_cur = self._energy(self.cur)
                continue
            rec, new_len = self._pick(props)
            bridges = self.cur.bridges + _bridge_change(rec.kind)
            if self.p.iso_weight and max(bridges, self.cur.bridges) > ctx.lower_bound:
                new = ctx.apply(self.cur, rec)  # the isolation term needs the word
                e_new = self._energy(new)
            else:
                # incremental: the energy follows from the record and the new length,
                # the word is built only for an accepted move
                new = None
                e_new = ctx.objective.energy(bridges, new_len)
            de = e_new - e_cur
            if de > 0 and ctx.rng.random() >= math.exp(-de / self.temperature()):
                continue
            if new is None:
                new = ctx.apply(self.cur, rec)
            self.accepted += 1
            self.cur, e_cur = new, e_new
            self._deltas = None
            key = (new.strands, new.word)
            prev = self._seen.get(key)
            self.node = prev if prev is not None else ctx.paths.add(self.node, rec, new)
            self._seen.setdefault(key, self.node)
            ctx.offer(new, self.node)
        # once per step: canonical form and any visible destabilization
        can, node = ctx.canonical(self.cur, self.node)
        can, node = ctx.destabilize(can, node)
        if can.word != self.cur.word or can.strands != self.cur.strands:
            self.cur, self.node = can, node
            self._deltas = None
            self._seen.setdefault((can.strands, can.word), node)
            ctx.offer(can, node)

    def _restart(self) -> None:
        self.restarts += 1
        self.k = 0
        self.cur, self.node = self.ctx.best, self.ctx.best_node
        self._seen = {}
        self._deltas = None
