"""Machinery shared by the search strategies: move paths, the best plat so far, guards."""

from __future__ import annotations

import hashlib
import random
from array import array
from collections import OrderedDict
from collections.abc import Callable, Iterable, Iterator

import plait.moves as _moves
from plait.scoring.objective import Objective, isolation
from plait.word import PlatWord

#: Deterministic seconds of CP-SAT per Wirtinger number computed inside a search.
OMEGA_TIME = 0.5
#: Diagram steps are tried on plats of at most this many letters per bridge.
OMEGA_LENGTH_FACTOR = 4
#: Letters allowed on top of ``OMEGA_LENGTH_FACTOR`` per bridge.
OMEGA_LENGTH_SLACK = 12
#: Steps of the budget charged per diagram step tried.
OMEGA_STEP_COST = 25
#: Steps of Reidemeister simplification (plait.diagrams.isotopy.simplify_pd) tried on a
#: plat's diagram before its Wirtinger coloring (the diagram step's redraw).
OMEGA_REDRAW = 40
#: Seed sets of the Wirtinger number's size whose words a diagram step compares
#: (plait.moves.rebridge.construct): the solver's coloring and up to this many minus one
#: others; the step keeps the shortest word.
OMEGA_SEED_SETS = 8

__all__ = [
    "OMEGA_TIME",
    "word_hash",
    "PathStore",
    "SearchContext",
    "BoundedSet",
    "rng_state_to_json",
    "rng_state_from_json",
    "record_to_json",
    "record_from_json",
]


def word_hash(plat: PlatWord) -> int:
    """A 63-bit hash of (strands, word), the same in every process (Python's own
    ``hash`` of a tuple is too, but spelling it out keeps run folders portable)."""
    # letters fit a signed byte (|g| < 64 strands); array packs them at C speed
    data = array("b", (plat.strands,)).tobytes() + array("b", plat.word).tobytes()
    return int.from_bytes(hashlib.blake2b(data, digest_size=8).digest(), "big") >> 1


def record_to_json(rec) -> object:
    """JSON form of a move record."""
    return rec.to_json()


def record_from_json(obj) -> object:
    """A move record from its JSON form."""
    return _moves.MoveRecord.from_json(obj)


def rng_state_to_json(rng: random.Random) -> list:
    """``random.Random.getstate()`` as JSON (a version, 625 ints, the Gauss cache)."""
    version, internal, gauss = rng.getstate()
    return [version, list(internal), gauss]


def rng_state_from_json(obj: list) -> random.Random:
    """A generator in the state saved by :func:`rng_state_to_json`."""
    rng = random.Random()
    version, internal, gauss = obj
    rng.setstate((version, tuple(internal), gauss))
    return rng


class BoundedSet:
    """A set of ints that forgets its oldest members past ``cap`` (first in, first out),
    so the visited sets of a search stay small enough to checkpoint.

    The insertion order is part of the saved state, so a resumed search forgets exactly
    what an uninterrupted one would.
    """

    def __init__(self, cap: int, items: Iterable[int] = ()) -> None:
        self.cap = cap
        self._d: OrderedDict[int, None] = OrderedDict()
        for x in items:
            self.add(x)

    def __contains__(self, x: int) -> bool:
        return x in self._d

    def __len__(self) -> int:
        return len(self._d)

    def add(self, x: int) -> None:
        if x in self._d:
            return
        self._d[x] = None
        while len(self._d) > self.cap:
            self._d.popitem(last=False)

    def to_json(self) -> list[int]:
        return list(self._d)


class PathStore:
    """Move paths from the start plat to every live search state, as a tree.

    Data structure: ``nodes[id] = (parent_id, record, word_hash)``. Node 0 is the start
    (no parent, no record). A state of a strategy holds one node id; the moves from the
    start to it are read by walking parents. ``word_hash`` is the hash of the word the
    search believes the record produced (``None`` inside a multi-move chain); replay
    compares it with what the record really produces, which pins down a wrong move.
    Ids are handed out in order, so a resumed search numbers nodes as the original did.
    """

    def __init__(self, start: PlatWord) -> None:
        self.nodes: dict[int, tuple[int, object, int | None]] = {0: (-1, None, word_hash(start))}
        self.next_id = 1

    def add(self, parent: int, rec, plat: PlatWord | None) -> int:
        """New node reached from ``parent`` by ``rec`` (``plat`` = its result)."""
        i = self.next_id
        self.next_id += 1
        self.nodes[i] = (parent, rec, None if plat is None else word_hash(plat))
        return i

    def extend(self, parent: int, recs: list, plat: PlatWord) -> int:
        """Chain of nodes for ``recs`` ending at ``plat``; returns the last node."""
        node = parent
        for j, rec in enumerate(recs):
            node = self.add(node, rec, plat if j == len(recs) - 1 else None)
        return node

    def path(self, node: int) -> list[tuple]:
        """``(record, word hash or None)`` for each move from the start to ``node``."""
        out = []
        while node > 0:
            parent, rec, h = self.nodes[node]
            out.append((rec, h))
            node = parent
        out.reverse()
        return out

    def records(self, node: int) -> list:
        """Move records from the start to ``node``."""
        return [rec for rec, _ in self.path(node)]

    def depth(self, node: int) -> int:
        d = 0
        while node > 0:
            node = self.nodes[node][0]
            d += 1
        return d

    def prune(self, live: Iterable[int]) -> None:
        """Forget every node not on the path to a live node."""
        keep = set()
        for node in live:
            while node >= 0 and node not in keep:
                keep.add(node)
                node = self.nodes[node][0]
        self.nodes = {k: v for k, v in self.nodes.items() if k in keep}

    def to_json(self, live: Iterable[int]) -> dict:
        """Saved form: only the nodes on paths to ``live`` nodes."""
        self.prune(live)
        return {
            "next_id": self.next_id,
            "nodes": [[k, p, None if r is None else record_to_json(r), h]
                      for k, (p, r, h) in sorted(self.nodes.items())],
        }

    @classmethod
    def from_json(cls, start: PlatWord, obj: dict) -> PathStore:
        store = cls(start)
        store.next_id = int(obj["next_id"])
        store.nodes = {int(k): (int(p), None if r is None else record_from_json(r), h)
                       for k, p, r, h in obj["nodes"]}
        return store


class SearchContext:
    """Everything the strategies share: the objective, the move graph access, the random
    generator, the path tree, counters and the best plat found.

    Parameters
    ----------
    start : PlatWord
        The plat every path starts from.
    objective : Objective
        What to minimise.
    rng : random.Random
        The run's only source of randomness (its state is checkpointed).
    lower_bound : int
        Certified lower bound on the bridge number.
    kinds : tuple of str or None
        Move kinds allowed (None: all).

    Notes
    -----
    There is no global state: two contexts in one process never interact, which is
    what lets a batch run many searches side by side.
    """

    def __init__(self, start: PlatWord, objective: Objective, rng: random.Random,
                 lower_bound: int = 1, kinds: tuple[str, ...] | None = None) -> None:
        self.start = start
        self.objective = objective
        self.rng = rng
        self.lower_bound = max(1, int(lower_bound))
        self.kinds = kinds
        self.paths = PathStore(start)
        self.best = start
        self.best_node = 0
        self.best_key = objective.key(start)
        self.best_step = 0
        self.steps = 0          # work units done (the --steps budget counts these)
        self.explored = 0       # neighbours generated
        self.improvements = 0   # number of new bests
        self.length_lower = 0   # no plat of the link has fewer letters (plait.scoring.lengthbound)
        self.on_best: Callable[[PlatWord, int], None] | None = None
        # the diagram step (plait.moves.rebridge): omega[word hash of a canonical plat]
        # = (seed count found for its diagram, the step or None); first in, first out.
        # Not checkpointed: a resumed run recomputes the same values (the solver runs
        # on one worker with a deterministic time limit).
        self.omega_cache: OrderedDict[int, tuple[int, object]] = OrderedDict()
        self.omega_cap = 4096
        self.omega_time = OMEGA_TIME  # deterministic seconds per CP-SAT call
        self.omega_directions = 2     # projection directions tried per seed set
        self.omega_seed_sets = OMEGA_SEED_SETS  # colorings compared per construction
        self.omega_calls = 0          # solver calls made (cache misses)
        self.diagram_steps = 0        # diagram steps taken
        # called with the plat before each Wirtinger computation (the run logs it)
        self.on_diagram: Callable[[PlatWord], None] | None = None

    # -- the move graph, always looked up at call time (tests monkeypatch it) ------------
    def neighbors(self, plat: PlatWord, kinds=None) -> Iterator[tuple[object, PlatWord]]:
        """Lazily the (record, neighbour) pairs of ``plat``; counts them as explored."""
        k = kinds if kinds is not None else self.kinds
        for rec, nb in _moves.neighbors(plat, kinds=k):
            self.explored += 1
            yield rec, nb

    def canonical(self, plat: PlatWord, node: int) -> tuple[PlatWord, int]:
        """Canonical form of ``plat`` with the moves that reach it added to the paths."""
        can, recs = _moves.canonical_with_moves(plat)
        if not recs:
            return plat, node
        return can, self.paths.extend(node, list(recs), can)

    def destabilize(self, plat: PlatWord, node: int, seek: int = 0) -> tuple[PlatWord, int]:
        """Remove every stabilization the move graph can see, recording the moves; with
        ``seek > 0`` also take up to that many greedy isolating moves looking for one."""
        fn = getattr(_moves, "destabilize_all", None)
        if fn is None or plat.bridges <= self.lower_bound:
            return plat, node
        if not seek and not _moves.destab_sites(plat.word, plat.strands):
            return plat, node  # nothing visible: skip the second canonical form
        new, recs = fn(plat, seek=seek) if seek else fn(plat)
        if not recs:
            return plat, node
        return new, self.paths.extend(node, list(recs), new)

    def apply(self, plat: PlatWord, rec) -> PlatWord:
        return _moves.apply_move(plat, rec)

    # -- the diagram step ---------------------------------------------------------------
    def omega(self, plat: PlatWord) -> int | None:
        """The cached Wirtinger bound of ``plat``'s diagram (an upper bound on the bridge
        number one diagram step away), or None when it was not computed."""
        hit = self.omega_cache.get(word_hash(plat))
        return None if hit is None else hit[0]

    def _omega_entry(self, plat: PlatWord) -> tuple[int, object]:
        from plait.moves.rebridge import construct

        h = word_hash(plat)
        hit = self.omega_cache.get(h)
        if hit is None:
            self.omega_calls += 1
            if self.on_diagram is not None:
                self.on_diagram(plat)
            hit = construct(plat, time_limit=self.omega_time, directions=self.omega_directions,
                            redraw=OMEGA_REDRAW, seed_sets=self.omega_seed_sets)
            self.omega_cache[h] = hit
            while len(self.omega_cache) > self.omega_cap:
                self.omega_cache.popitem(last=False)
        return hit

    def diagram_step(self, plat: PlatWord, node: int,
                     length_factor: int | None = None) -> tuple[PlatWord, int] | None:
        """The diagram step from ``plat`` (at path ``node``) when its diagram's Wirtinger
        number is below its bridge count: the rebuilt plat in canonical form with
        visible stabilizations removed, and its path node; else None. Plats longer than
        ``length_factor`` (default :data:`OMEGA_LENGTH_FACTOR`) letters per bridge are
        skipped (plus :data:`OMEGA_LENGTH_SLACK`): the construction's cost grows with the
        length.

        References
        ----------
        .. [1] R. Blair, A. Kjuchukova, M. Ozawa, "The incompatibility of crossing number
           and bridge number for knot diagrams", Discrete Math. 344 (2021).
        """
        if plat.bridges <= self.lower_bound or "rebridge" not in self._allowed():
            return None
        factor = OMEGA_LENGTH_FACTOR if length_factor is None else length_factor
        if plat.length > factor * plat.bridges + OMEGA_LENGTH_SLACK:
            return None  # long diagrams cost seconds and rarely color from fewer seeds
        # a solver call costs about as much time as this many expansions; charged on a
        # cache hit too, so a resumed run (empty cache) counts exactly like the original
        self.steps += OMEGA_STEP_COST
        _number, data = self._omega_entry(plat)
        if data is None:
            return None
        from plait.moves.rebridge import encode

        self.diagram_steps += 1
        new = data.result
        node = self.paths.add(node, encode(data), new)
        new, node = self.canonical(new, node)
        new, node = self.destabilize(new, node)
        return new, node

    def _allowed(self) -> frozenset:
        return _moves.MOVE_KINDS if self.kinds is None else frozenset(self.kinds)

    # -- scoring --------------------------------------------------------------------------
    def key(self, plat: PlatWord) -> tuple:
        return self.objective.key(plat)

    def guide_key(self, plat: PlatWord) -> tuple:
        """Key of the bridge-seeking lane: the Wirtinger bound of the plat's diagram when
        it is cached (else the bridges), then fewest bridges, then the most isolated pair
        (a stabilization becomes visible at isolation 1), then length."""
        om = self.omega(plat)
        b = plat.bridges if om is None else min(om, plat.bridges)
        return (b, plat.bridges, isolation(plat), plat.length)

    def at_optimum(self) -> bool:
        """True when nothing can beat the best: its bridges meet the certified lower bound
        and its length meets ``length_lower`` (the Jones-span bound, 0 when unknown; one
        bridge and no letters for the unknot)."""
        return (self.best.bridges <= self.lower_bound
                and self.best.length <= self.length_lower)

    def offer(self, plat: PlatWord, node: int) -> bool:
        """Record ``plat`` (reached at path ``node``) as the best when its key is
        smaller. Returns True on a new best."""
        k = self.objective.key(plat)
        if k < self.best_key:
            self.best, self.best_node, self.best_key = plat, node, k
            self.best_step = self.steps
            self.improvements += 1
            if self.on_best is not None:
                self.on_best(plat, node)
            return True
        return False

    def random_neighbor(self, plat: PlatWord, kinds=None) -> tuple[object, PlatWord] | None:
        """A neighbour chosen uniformly with the run's generator (None if there is none)."""
        nbs = list(self.neighbors(plat, kinds))
        if not nbs:
            return None
        return nbs[self.rng.randrange(len(nbs))]
